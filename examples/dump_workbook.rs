//! Prints every sheet of a workbook as tab-separated cell values, one `== sheet ==` header
//! per sheet (numbers in Rust's shortest round-trip form): for comparing two results
//! workbooks whose packages differ only by their timestamps (`docs/byte-identity.md`).
//!
//!     cargo run --release --example dump_workbook -- FILE.xlsx > FILE.tsv

use calamine::{Data, Reader, open_workbook_auto};

fn main() -> Result<(), Box<dyn std::error::Error>> {
    let path = std::env::args()
        .nth(1)
        .ok_or("usage: dump_workbook FILE.xlsx")?;
    let mut wb = open_workbook_auto(&path)?;
    for name in wb.sheet_names() {
        println!("== {name} ==");
        let range = wb.worksheet_range(&name)?;
        for row in range.rows() {
            let cells: Vec<String> = row
                .iter()
                .map(|c| match c {
                    Data::Empty => String::new(),
                    Data::Float(f) => format!("{f:?}"),
                    other => other.to_string(),
                })
                .collect();
            println!("{}", cells.join("\t"));
        }
    }
    Ok(())
}
