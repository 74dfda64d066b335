//! Input-reading cases of inventory.md "Bad input" and issue 2: every case generates its
//! inventory (rust_xlsxwriter / csv) into a temporary folder and reads it back.

pub(crate) mod cases;
mod check_cli;
mod hostile;
mod settings_file;
mod survey;
mod template;

use std::path::{Path, PathBuf};

use rust_xlsxwriter::{Format, Workbook, Worksheet};
use seistriage::input::{ReadOptions, read_inventory};
use seistriage::model::{Inventory, Problem, Severity};

/// A cell to write.
#[derive(Debug, Clone)]
pub enum C {
    /// Text.
    S(&'static str),
    /// Number.
    N(f64),
    /// Blank.
    B,
}

pub use C::{B, N, S};

/// The header of a minimal valid buildings sheet.
pub const HEAD: [&str; 8] = [
    "id",
    "name",
    "storeys",
    "plan_area_m2",
    "column_area_m2",
    "rc_wall_area_x_m2",
    "rc_wall_area_y_m2",
    "year_built",
];

/// A valid buildings row for HEAD.
pub fn good(id: &'static str) -> Vec<C> {
    vec![
        S(id),
        S("Block"),
        N(5.0),
        N(400.0),
        N(4.0),
        N(6.0),
        N(5.0),
        N(1978.0),
    ]
}

/// Header cells as C.
pub fn head() -> Vec<C> {
    HEAD.iter().map(|h| S(h)).collect()
}

/// Writes rows (0-based from the top) into a worksheet.
pub fn fill(ws: &mut Worksheet, first_row: u32, rows: &[Vec<C>]) {
    for (r, row) in rows.iter().enumerate() {
        for (c, cell) in row.iter().enumerate() {
            let (r, c) = (first_row + r as u32, c as u16);
            match cell {
                S(s) => {
                    ws.write_string(r, c, *s).unwrap();
                }
                N(v) => {
                    ws.write_number(r, c, *v).unwrap();
                }
                B => {}
            }
        }
    }
}

/// Writes a workbook with the given sheets (name, rows from row 1) to `dir/name`.
pub fn workbook(dir: &Path, name: &str, sheets: &[(&str, Vec<Vec<C>>)]) -> PathBuf {
    let mut wb = Workbook::new();
    for (sheet, rows) in sheets {
        let ws = wb.add_worksheet();
        ws.set_name(*sheet).unwrap();
        fill(ws, 0, rows);
    }
    let path = dir.join(name);
    wb.save(&path).unwrap();
    path
}

/// Writes a workbook whose buildings sheet is built by a closure.
pub fn workbook_with(dir: &Path, name: &str, f: impl FnOnce(&mut Worksheet)) -> PathBuf {
    let mut wb = Workbook::new();
    let ws = wb.add_worksheet();
    ws.set_name("buildings").unwrap();
    f(ws);
    let path = dir.join(name);
    wb.save(&path).unwrap();
    path
}

/// A date format.
pub fn date_format() -> Format {
    Format::new().set_num_format("yyyy-mm-dd")
}

/// Reads with default options, panicking on a file-level error.
pub fn read(path: &Path) -> Inventory {
    read_inventory(path, &ReadOptions::default()).unwrap_or_else(|e| panic!("{e}"))
}

/// Problems in a column of a row, by severity.
pub fn problems_at(inv: &Inventory, row: usize, column: &str, sev: Severity) -> Vec<Problem> {
    inv.problems
        .iter()
        .filter(|p| p.row == Some(row) && p.column == column && p.severity == sev)
        .cloned()
        .collect()
}

/// The rows not screened.
pub fn rejected_rows(inv: &Inventory) -> Vec<usize> {
    inv.not_screened.iter().map(|n| n.row).collect()
}

/// The counts add up: rows = accepted + rejected.
pub fn assert_counts(inv: &Inventory) {
    assert_eq!(
        inv.rows,
        inv.buildings.len() + inv.not_screened.len(),
        "{inv:#?}"
    );
}

/// Writes a text file.
pub fn text_file(dir: &Path, name: &str, bytes: &[u8]) -> PathBuf {
    let p = dir.join(name);
    std::fs::write(&p, bytes).unwrap();
    p
}
