//! One test per bug found, named after it.

use seistriage::input::{ReadOptions, read_inventory};

fn read_csv_text(text: &str) -> seistriage::model::Inventory {
    let dir = tempfile::tempdir().unwrap();
    let p = dir.path().join("r.csv");
    std::fs::write(&p, text).unwrap();
    read_inventory(&p, &ReadOptions::default()).unwrap()
}

/// The csv crate skips blank lines and gives the next record the position where reading
/// started (the blank line), so row numbers came out one short after each blank line.
#[test]
fn csv_record_after_a_blank_line_keeps_its_own_row_number() {
    let inv = read_csv_text("id,storeys,plan_area_m2,column_area_m2\nA,3,200,2\n\n\nB,3,200,2\n");
    let rows: Vec<_> = inv.buildings.iter().map(|b| b.row).collect();
    assert_eq!(rows, vec![2, 5]);
    assert_eq!(inv.blank_rows, 2);
}

/// Same with CRLF line ends: the LF of a CRLF pair must not be counted as a blank line.
#[test]
fn csv_crlf_line_ends_are_not_counted_as_blank_lines() {
    let inv = read_csv_text(
        "id,storeys,plan_area_m2,column_area_m2\r\nA,3,200,2\r\nB,3,200,2\r\n\r\nC,3,200,2\r\n",
    );
    let rows: Vec<_> = inv.buildings.iter().map(|b| b.row).collect();
    assert_eq!(rows, vec![2, 3, 5]);
    assert_eq!(inv.blank_rows, 1);
}

/// A quoted field spanning two lines is one record: the next record is the next row.
#[test]
fn csv_multi_line_quoted_field_is_one_row() {
    let inv = read_csv_text(
        "id,name,storeys,plan_area_m2,column_area_m2\nA,\"two\nlines\",3,200,2\nB,x,3,200,2\n",
    );
    let rows: Vec<_> = inv.buildings.iter().map(|b| b.row).collect();
    assert_eq!(rows, vec![2, 3]);
    assert_eq!(inv.blank_rows, 0);
}
