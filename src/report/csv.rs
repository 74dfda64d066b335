/*!
CSV output: the Priority table (`--csv FILE`, column names of `interface.md`) and, for large
stocks, the per-row tables of the workbook written beside it. Every text cell is passed
through the formula-injection guard: a text starting with `=`, `+`, `-`, `@`, tab or CR is
prefixed with `'`, so that a spreadsheet opening the file never runs it as a formula.
Numbers are written at full precision (shortest text that reads back to the same value);
non-finite numbers are written as empty cells.
*/

use std::borrow::Cow;
use std::io::Write;
use std::path::Path;

use super::ReportError;
use super::atomic::write_atomic;
use super::workbook::tables::{Cell, Table, Target};
use crate::results::Report;

/// The formula-injection guard: prefixes `'` to text that a spreadsheet would run as a
/// formula (leading `=`, `+`, `-`, `@`, tab or carriage return).
pub fn guard(text: &str) -> Cow<'_, str> {
    match text.chars().next() {
        Some('=' | '+' | '-' | '@' | '\t' | '\r') => Cow::Owned(format!("'{text}")),
        _ => Cow::Borrowed(text),
    }
}

fn number_text(v: f64, buf: &mut String) {
    buf.clear();
    if v.is_finite() {
        use std::fmt::Write as _;
        let _ = write!(buf, "{v}");
    }
}

/// Writes one table as CSV (header = the columns' machine names) to a writer.
pub fn write_table<W: Write>(
    report: &Report,
    table: Table,
    limit: usize,
    out: W,
) -> Result<(), ReportError> {
    let mut w = ::csv::Writer::from_writer(out);
    w.write_record(table.columns().iter().map(|c| c.key))?;
    let mut num = String::new();
    table.for_each_row(report, Target::Csv, limit, |cells| {
        for c in cells {
            match c {
                Cell::Blank => w.write_field("")?,
                Cell::Num(v) => {
                    number_text(*v, &mut num);
                    w.write_field(&num)?;
                }
                Cell::Text(t) => w.write_field(guard(t).as_ref())?,
            }
        }
        // Ends the record (the fields above were written one by one, without copies).
        w.write_record(None::<&[u8]>)?;
        Ok::<(), ReportError>(())
    })?;
    w.flush()?;
    Ok(())
}

/// Writes one table as a CSV file, through a temporary file renamed when complete.
pub fn write_table_file(report: &Report, table: Table, path: &Path) -> Result<(), ReportError> {
    write_atomic(path, |w| write_table(report, table, usize::MAX, w))
}

/// Writes the Priority table as CSV (`--csv FILE`).
pub fn write_priority(report: &Report, path: &Path) -> Result<(), ReportError> {
    write_table_file(report, Table::Priority, path)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn guard_prefixes_formula_starters_only() {
        for t in ["=1+1", "+1", "-2", "@SUM(A1)", "\tx", "\rx"] {
            assert_eq!(guard(t), format!("'{t}"), "{t:?}");
        }
        for t in ["", "plain", "1-2", "a=b", " =1", "'=1"] {
            assert_eq!(guard(t), t, "{t:?}");
        }
    }

    #[test]
    fn non_finite_numbers_become_empty() {
        let mut s = String::new();
        number_text(f64::NAN, &mut s);
        assert_eq!(s, "");
        number_text(f64::INFINITY, &mut s);
        assert_eq!(s, "");
        number_text(0.1 + 0.2, &mut s);
        assert_eq!(s.parse::<f64>().unwrap(), 0.1 + 0.2);
    }
}
