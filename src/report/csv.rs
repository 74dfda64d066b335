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

use rayon::prelude::*;

use super::ReportError;
use super::atomic::write_atomic;
use super::workbook::tables::{Cell, CellKind, CellSink, TableId, Target};
use crate::results::{BuildingResult, Screening};

/// The formula-injection guard: prefixes `'` to text that a spreadsheet would run as a
/// formula (leading `=`, `+`, `-`, `@`, tab or carriage return).
pub fn guard(text: &str) -> Cow<'_, str> {
    match text.chars().next() {
        Some('=' | '+' | '-' | '@' | '\t' | '\r') => Cow::Owned(format!("'{text}")),
        _ => Cow::Borrowed(text),
    }
}

/// Whole numbers below this magnitude are written as integers (exact in an f64).
const INTEGER_TEXT_BELOW: f64 = 1e15;

/// The shortest text that reads back to `v`: whole numbers as integers (`12`, not `12.0`),
/// other numbers by the Ryū algorithm (the standard library's float formatting took a sixth
/// of a 1,000,000-building run; Ryū writes an exponent below 1e-5 and from 1e16, e.g.
/// `1e-7`, which every CSV reader parses); non-finite numbers as nothing.
fn number_text(v: f64, buf: &mut String) {
    use std::fmt::Write as _;
    buf.clear();
    if !v.is_finite() {
        return;
    }
    if v == v.trunc() && v.abs() < INTEGER_TEXT_BELOW && !(v == 0.0 && v.is_sign_negative()) {
        let _ = write!(buf, "{}", v as i64);
    } else {
        let mut r = ryu::Buffer::new();
        buf.push_str(r.format_finite(v));
    }
}

/// Columns the Priority CSV (and the GeoJSON properties) add with `--samples` (method §13,
/// interface.md), after the Priority columns.
pub const SAMPLE_COLUMNS: [&str; 3] = ["p_deficit", "rank_p05", "rank_p95"];

/// The method §13 cells of one building (blank without samples).
pub fn sample_cells(b: &BuildingResult) -> [Cell<'static>; 3] {
    match &b.uncertainty {
        Some(u) => [
            Cell::Num(u.p_deficit),
            Cell::Num(u.rank.p05 as f64),
            Cell::Num(u.rank.p95 as f64),
        ],
        None => [Cell::Blank, Cell::Blank, Cell::Blank],
    }
}

/// The Priority table with the columns of [`SAMPLE_COLUMNS`] appended (a run with samples).
fn write_priority_with_samples<W: Write>(
    report: &Screening,
    limit: usize,
    out: W,
) -> Result<(), ReportError> {
    let mut w = ::csv::Writer::from_writer(out);
    w.write_record(
        TableId::Priority
            .columns()
            .iter()
            .map(|c| c.key)
            .chain(SAMPLE_COLUMNS),
    )?;
    let mut sink = CsvSink::new(&mut w, false);
    for b in report.buildings.iter().take(limit) {
        super::workbook::tables::priority_cells(b, &mut sink);
        for c in sample_cells(b) {
            match c {
                Cell::Num(v) => sink.number(v, CellKind::Dec3),
                _ => sink.blank(),
            }
        }
        sink.end_row()?;
    }
    w.flush()?;
    Ok(())
}

/// Writes one table as CSV (header = the columns' machine names) to a writer.
pub fn write_table<W: Write>(
    report: &Screening,
    table: TableId,
    limit: usize,
    out: W,
) -> Result<(), ReportError> {
    if table == TableId::Priority && report.uncertainty.is_some() {
        return write_priority_with_samples(report, limit, out);
    }
    let mut out = out;
    let mut w = ::csv::Writer::from_writer(&mut out);
    write_header(table, &mut w)?;
    w.flush()?;
    drop(w);
    write_rows(report, table, limit, false, &mut out)?;
    out.flush()?;
    Ok(())
}

/// Writes the header record of a table (the columns' machine names).
pub fn write_header<W: Write>(table: TableId, w: &mut ::csv::Writer<W>) -> Result<(), ReportError> {
    w.write_record(table.columns().iter().map(|c| c.key))?;
    Ok(())
}

/// Appends up to `limit` rows of a table, as CSV records, to `out`. With `blank_rank` the first column
/// (the rank, for the tables that start with it) is left empty: the streaming path of a large
/// stock writes Directions, Walls and Flags in file order, chunk by chunk, before the ranks
/// are known.
pub fn write_rows<W: Write>(
    report: &Screening,
    table: TableId,
    limit: usize,
    blank_rank: bool,
    out: &mut W,
) -> Result<(), ReportError> {
    if table.per_building() && limit == usize::MAX {
        // Every row of every building: formatted in parallel.
        return write_building_rows(&report.buildings, table, blank_rank, out);
    }
    let mut w = ::csv::Writer::from_writer(out);
    table.write_rows(report, limit, &mut CsvSink::new(&mut w, blank_rank))?;
    w.flush()?;
    Ok(())
}

/// Buildings whose rows one task formats (a few hundred kB of text for Directions).
const BUILDINGS_PER_TASK: usize = 512;
/// Tasks per thread formatted before their text is written out (bounds the text held).
const TASKS_PER_THREAD: usize = 4;

/// Writes every row of the buildings in a per-building table ([`Table::per_building`]):
/// runs of [`BUILDINGS_PER_TASK`] buildings are formatted in parallel into text, which is
/// appended in building order, so the file is the one a sequential writer makes. Formatting
/// numbers and text is most of the cost of a large stock's CSV files.
pub fn write_building_rows<W: Write>(
    buildings: &[BuildingResult],
    table: TableId,
    blank_rank: bool,
    out: &mut W,
) -> Result<(), ReportError> {
    let batch = BUILDINGS_PER_TASK * TASKS_PER_THREAD * rayon::current_num_threads().max(1);
    for group in buildings.chunks(batch) {
        let parts = group
            .par_chunks(BUILDINGS_PER_TASK)
            .map(|run| {
                let mut pw = ::csv::Writer::from_writer(Vec::new());
                let mut sink = CsvSink::new(&mut pw, blank_rank);
                for b in run {
                    table.write_building_rows(b, &mut sink)?;
                }
                pw.into_inner()
                    .map_err(|e| ReportError::from(e.into_error()))
            })
            .collect::<Result<Vec<Vec<u8>>, ReportError>>()?;
        for text in parts {
            out.write_all(&text)?;
        }
    }
    Ok(())
}

/// Writes one record of cells (`num` is a scratch buffer for number text); with
/// `blank_first` the first cell is written empty.
pub fn write_cells<W: Write>(
    cells: &[Cell<'_>],
    blank_first: bool,
    num: &mut String,
    w: &mut ::csv::Writer<W>,
) -> Result<(), ReportError> {
    for (i, c) in cells.iter().enumerate() {
        match c {
            _ if blank_first && i == 0 => w.write_field("")?,
            Cell::Blank => w.write_field("")?,
            Cell::Num(v) => {
                number_text(*v, num);
                w.write_field(&*num)?;
            }
            Cell::Text(t) => w.write_field(guard(t).as_ref())?,
        }
    }
    // Ends the record (the fields above were written one by one, without copies).
    w.write_record(None::<&[u8]>)?;
    Ok(())
}

/// A CSV writer as a [`CellSink`]: text through the formula-injection [`guard`], numbers
/// at full precision ([`number_text`]), blanks and non-finite numbers empty; with
/// `blank_first` the first cell of every row is written empty.
pub struct CsvSink<'w, W: Write> {
    w: &'w mut ::csv::Writer<W>,
    num: String,
    blank_first: bool,
    col: usize,
    err: Option<::csv::Error>,
}

impl<'w, W: Write> CsvSink<'w, W> {
    /// A sink writing records to `w`.
    pub fn new(w: &'w mut ::csv::Writer<W>, blank_first: bool) -> Self {
        CsvSink {
            w,
            num: String::new(),
            blank_first,
            col: 0,
            err: None,
        }
    }

    fn field(&mut self, text: Option<&str>) {
        let first = self.col == 0;
        self.col += 1;
        let t = if first && self.blank_first {
            ""
        } else {
            text.unwrap_or(&self.num)
        };
        if let Err(e) = self.w.write_field(t)
            && self.err.is_none()
        {
            self.err = Some(e);
        }
    }
}

impl<W: Write> CellSink for CsvSink<'_, W> {
    fn target(&self) -> Target {
        Target::Csv
    }
    fn text(&mut self, text: &str) {
        let g = guard(text);
        self.field(Some(&g));
    }
    fn number(&mut self, value: f64, _: CellKind) {
        let mut num = std::mem::take(&mut self.num);
        number_text(value, &mut num);
        self.num = num;
        self.field(None);
    }
    fn blank(&mut self) {
        self.field(Some(""));
    }
    fn end_row(&mut self) -> Result<(), ReportError> {
        self.col = 0;
        if let Some(e) = self.err.take() {
            return Err(e.into());
        }
        // Ends the record (the fields above were written one by one, without copies).
        self.w.write_record(None::<&[u8]>)?;
        Ok(())
    }
}

/// Writes one table as a CSV file, through a temporary file renamed when complete.
pub fn write_table_file(
    report: &Screening,
    table: TableId,
    path: &Path,
) -> Result<(), ReportError> {
    write_atomic(path, |w| write_table(report, table, usize::MAX, w))
}

/// Writes the Priority table as CSV (`--csv FILE`).
pub fn write_priority(report: &Screening, path: &Path) -> Result<(), ReportError> {
    write_table_file(report, TableId::Priority, path)
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

    #[test]
    fn numbers_read_back_exactly_and_whole_numbers_have_no_decimal_point() {
        let mut s = String::new();
        for (v, text) in [
            (12.0, "12"),
            (0.0, "0"),
            (-3.0, "-3"),
            (1500000.0, "1500000"),
        ] {
            number_text(v, &mut s);
            assert_eq!(s, text);
        }
        let mut x = 0.123_456_789_012_345_67_f64;
        for _ in 0..400 {
            for v in [
                x,
                -x,
                x * 1e-9,
                x * 1e12,
                x * 1e20,
                -0.0,
                f64::MIN_POSITIVE,
                f64::MAX,
            ] {
                number_text(v, &mut s);
                let back: f64 = s.parse().unwrap();
                assert_eq!(back.to_bits(), v.to_bits(), "{v:e} written as {s}");
                // Shortest: never longer than the standard library's shortest form in
                // scientific notation plus the exponent.
                assert!(
                    s.len() <= format!("{v:e}").len() + 2,
                    "{v:e} written as {s}"
                );
            }
            x = (x * 7.3 + 0.37).fract() * 10f64.powi((x * 13.0) as i32 % 9 - 4);
        }
    }
}
