/*!
The results workbook of `interface.md`: Summary, Priority, Retrofit plan, Directions, Walls,
Flags, Not screened, Input problems, Assumptions (in that order), plus a hidden `Chart data`
sheet placed last that holds the series of the Summary charts.

Everything is written as values (no formulas); non-finite numbers become blank cells; text
from the inventory is always written as a string and cut at the cell limit (32,767 UTF-16
units). Above [`CONSTANT_MEMORY_FROM`] buildings the per-row sheets are streamed
(rust_xlsxwriter constant-memory mode); when the Directions sheet would pass the row limit,
the per-row tables go to CSV files beside the workbook (`<out stem>.<sheet>.csv`) and the
workbook keeps the Summary, the first [`LARGE_PRIORITY_ROWS`] Priority rows, Not screened,
Input problems and Assumptions, saying so on the Summary.

The file is saved under a temporary name in the target folder and renamed when complete.
*/

mod assumptions;
mod changes_sheet;
pub mod confidence;
pub mod style;
mod summary;
pub use summary::budget_line;
pub mod tables;

use std::fs::File;
use std::io::BufWriter;
use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicU64, Ordering};

use rayon::prelude::*;
use rust_xlsxwriter::{DocProperties, ExcelDateTime, Workbook, Worksheet};

use super::ReportError;
use super::atomic::write_atomic;
use super::changes::Changes;
use crate::results::Screening;
use style::{Print, Styles};
use tables::{CellKind, CellSink, RowCounts, TableId, Target};

/// Rows of a worksheet, header included (Excel and LibreOffice limit).
pub const SHEET_ROWS: usize = 1_048_576;
/// From this many screened buildings (exclusive) the per-row sheets use constant-memory mode.
/// In normal mode rust_xlsxwriter holds every cell until the file is saved (at 100,000
/// buildings, 17 million cells: about 4 GB resident and a third of the run spent in page
/// faults); constant-memory mode streams each row to a temporary file and measured as fast
/// or faster (10,000 buildings, release build: 1.52 s and 70 MB peak for the whole run
/// against 1.72 s and 445 MB in normal mode). Below the threshold normal mode is kept for
/// its shared-string table (smaller files); the chart series are always on a normal sheet.
pub const CONSTANT_MEMORY_FROM: usize = 1_000;
/// Priority rows kept in the workbook when the per-row tables go to CSV.
pub const LARGE_PRIORITY_ROWS: usize = 10_000;
/// Longest text a cell holds (UTF-16 code units).
pub const CELL_TEXT_LIMIT: usize = 32_767;
/// Zip compression level of the package. Compressing is the one step of writing that runs on
/// a single thread (rust_xlsxwriter deflates each sheet as it packs the file), so its speed
/// bounds a large run. Measured on the Directions sheet of a 100,000-building run (667 MB
/// of XML, release build, zlib-rs, one thread): level 1 deflates at 432 MB/s to 0.258 of
/// the size, level 2 at 268 MB/s to 0.193, level 3 at 207 MB/s to 0.185, level 6 (the
/// library default) at 92 MB/s to 0.156. Level 1 halves the compressing time of level 3
/// for a file about 1.4 times as large (the XML a spreadsheet application parses on opening
/// is the same).
pub const ZIP_LEVEL: u8 = 1;

/// Generous estimate of the XML bytes of one cell (measured about 43 for full-precision
/// numbers with a style).
const BYTES_PER_CELL: f64 = 64.0;
/// Sheet size (uncompressed estimate) from which Zip64 is switched on; the zip limit without
/// it is 4 GiB per part, and Zip64 is only used when needed because some older readers lack it.
const ZIP64_FROM_BYTES: f64 = 2_147_483_648.0;

/// Where each table goes.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Layout {
    /// Row counts of every table.
    pub counts: RowCounts,
    /// Tables written as CSV files beside the workbook.
    pub csv: Vec<TableId>,
    /// Per-row sheets streamed in constant-memory mode.
    pub constant_memory: bool,
    /// Zip64 extensions on: some sheet may pass 4 GiB uncompressed.
    pub zip64: bool,
    /// The inventory was screened in chunks (the streaming path of a large CSV stock): the
    /// Directions, Walls and Flags CSV files are in file order with the rank column empty.
    pub streamed: bool,
}

impl Layout {
    /// Decides the layout for a report.
    pub fn of(report: &Screening) -> Self {
        Self::plan(RowCounts::of(report), report.buildings.len())
    }

    /// Decides the layout from the row counts of the tables and the number of buildings:
    /// the large-stock rule of `interface.md` when the Directions sheet would pass the row
    /// limit (the Retrofit plan goes with the per-row tables), and any other table too long
    /// for a sheet to CSV as well.
    pub fn plan(counts: RowCounts, buildings: usize) -> Self {
        let fits = |t: TableId| t.rows(&counts) < SHEET_ROWS;
        let mut layout = Layout {
            counts,
            csv: Vec::new(),
            constant_memory: buildings > CONSTANT_MEMORY_FROM,
            zip64: false,
            streamed: false,
        };
        if !fits(TableId::Directions) {
            layout = layout.large_stock();
        }
        for t in TableId::ALL {
            if !fits(t) && !layout.csv.contains(&t) {
                layout.csv.push(t);
            }
        }
        layout.zip64 = TableId::ALL.iter().any(|t| {
            let rows = layout.sheet_rows(*t).unwrap_or(0) as f64;
            rows * t.columns().len() as f64 * BYTES_PER_CELL > ZIP64_FROM_BYTES
        });
        layout
    }

    /// The same layout with the large-stock rule applied (per-row tables to CSV).
    pub fn large_stock(mut self) -> Self {
        for t in TableId::ALL.into_iter().filter(|t| t.per_row()) {
            if !self.csv.contains(&t) {
                self.csv.push(t);
            }
        }
        self
    }

    /// True when the per-row tables were moved to CSV files (the large-stock rule).
    pub fn large(&self) -> bool {
        self.csv.contains(&TableId::Directions)
    }

    /// Rows of a table written in the workbook (`None`: the sheet is left out).
    pub fn sheet_rows(&self, t: TableId) -> Option<usize> {
        if t == TableId::Priority && self.large() {
            return Some(self.counts.priority.min(LARGE_PRIORITY_ROWS));
        }
        if self.csv.contains(&t) {
            None
        } else {
            Some(t.rows(&self.counts))
        }
    }
}

/// The path of a table's CSV file beside the workbook: `<out stem>.<sheet>.csv`.
pub fn csv_path(out: &Path, t: TableId) -> PathBuf {
    let stem = out
        .file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_else(|| "screening".into());
    out.with_file_name(format!("{stem}.{}.csv", t.file_tag()))
}

/// Text cut to what a cell can hold (at a character boundary).
pub fn cut(text: &str) -> &str {
    if text.len() <= CELL_TEXT_LIMIT {
        // UTF-16 length never exceeds the UTF-8 length.
        return text;
    }
    let mut units = 0usize;
    for (i, ch) in text.char_indices() {
        units += ch.len_utf16();
        if units > CELL_TEXT_LIMIT {
            return text.get(..i).unwrap_or("");
        }
    }
    text
}

/// Whether a column of this kind carries its number format as a column format (every
/// numeric kind but the class, whose format depends on the value). A number written without
/// a format in such a column takes the column's format; this saves rust_xlsxwriter hashing
/// the whole `Format` on every cell (measured an eighth of the whole run at 100,000
/// buildings).
fn column_formatted(kind: CellKind) -> bool {
    !matches!(kind, CellKind::Text | CellKind::Class)
}

/// The worksheet as a [`CellSink`]: each cell is written at the next column of the current
/// row; non-finite numbers and blanks leave the cell empty; text is cut at the cell limit.
/// With `fit_rows` a row holding wrapped text gets the height of its longest text.
pub(crate) struct SheetSink<'w, 's> {
    ws: &'w mut Worksheet,
    styles: &'s Styles,
    cols: &'static [tables::Column],
    row: u32,
    col: u16,
    fit_rows: bool,
    lines: usize,
    err: Option<ReportError>,
}

impl<'w, 's> SheetSink<'w, 's> {
    /// A sink writing rows from `row` on.
    pub(crate) fn new(
        ws: &'w mut Worksheet,
        styles: &'s Styles,
        cols: &'static [tables::Column],
        row: u32,
        fit_rows: bool,
    ) -> Self {
        SheetSink {
            ws,
            styles,
            cols,
            row,
            col: 0,
            fit_rows,
            lines: 1,
            err: None,
        }
    }

    fn keep(&mut self, r: Result<(), rust_xlsxwriter::XlsxError>) {
        if let Err(e) = r
            && self.err.is_none()
        {
            self.err = Some(e.into());
        }
    }
}

impl CellSink for SheetSink<'_, '_> {
    fn target(&self) -> Target {
        Target::Sheet
    }
    fn text(&mut self, text: &str) {
        let (row, col) = (self.row, self.col);
        self.col += 1;
        if self.fit_rows
            && let Some(c) = self.cols.get(usize::from(col))
            && c.kind == CellKind::Text
            && c.width >= WRAP_FROM_WIDTH
        {
            // Spreadsheet applications do not all size rows to wrapped text when they open a
            // file (LibreOffice keeps the default height): set the height from the text.
            self.lines = self.lines.max(wrapped_lines(text, c.width));
        }
        let r = self.ws.write_string(row, col, cut(text)).map(|_| ());
        self.keep(r);
    }
    fn number(&mut self, value: f64, kind: CellKind) {
        let (row, col) = (self.row, self.col);
        self.col += 1;
        if !value.is_finite() {
            return;
        }
        let r = if column_formatted(kind) {
            self.ws.write_number(row, col, value)
        } else {
            let f = if kind == CellKind::Class {
                self.styles.class_format(value)
            } else {
                self.styles.kind(kind)
            };
            self.ws.write_number_with_format(row, col, value, f)
        }
        .map(|_| ());
        self.keep(r);
    }
    fn blank(&mut self) {
        self.col += 1;
    }
    fn end_row(&mut self) -> Result<(), ReportError> {
        if self.lines > 1 {
            let h = ROW_HEIGHT_PT * self.lines.min(MAX_ROW_LINES) as f64;
            let r = self.ws.set_row_height(self.row, h).map(|_| ());
            self.keep(r);
        }
        self.lines = 1;
        self.row += 1;
        self.col = 0;
        self.err.take().map_or(Ok(()), Err)
    }
}

/// Writes one cell (a [`tables::Cell`] of a small sheet outside the per-row tables) the way
/// [`SheetSink`] writes it.
fn put(
    ws: &mut Worksheet,
    row: u32,
    col: u16,
    cell: &tables::Cell<'_>,
    kind: CellKind,
    styles: &Styles,
) -> Result<(), ReportError> {
    let mut sink = SheetSink::new(ws, styles, &[], row, false);
    sink.col = col;
    match cell {
        tables::Cell::Blank => sink.blank(),
        tables::Cell::Num(v) => sink.number(*v, kind),
        tables::Cell::Text(t) => sink.text(t),
    }
    sink.err.map_or(Ok(()), Err)
}

/// Text columns at least this wide (characters) wrap their text.
const WRAP_FROM_WIDTH: f64 = 24.0;
/// Height of one line of 11 pt text (points), the spreadsheet default row height.
const ROW_HEIGHT_PT: f64 = 15.0;
/// Most lines a wrapped row is sized for (longer text is cut at the cell's bottom).
const MAX_ROW_LINES: usize = 8;

/// Lines a text takes wrapped in a column `width` characters wide: words are kept whole;
/// proportional text is about 1.15 characters per width unit (width units are widths of
/// the digit 0; common practice, measured on the rendered sheets).
pub(crate) fn wrapped_lines(text: &str, width: f64) -> usize {
    let per_line = ((width * 1.15).floor() as usize).max(1);
    let mut lines = 0usize;
    for para in text.split('\n') {
        let mut len = 0usize;
        lines += 1;
        for word in para.split_whitespace() {
            let w = word.chars().count();
            if len > 0 && len + 1 + w > per_line {
                lines += 1;
                len = w;
            } else {
                len += if len > 0 { 1 + w } else { w };
            }
        }
    }
    lines.max(1)
}

/// The inventory's file name (without its folder), for page headers.
fn input_file_name(report: &Screening) -> String {
    Path::new(&report.input.file)
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_else(|| report.input.file.clone())
}

/// Progress callback: called with the number of rows written so far (from whichever thread
/// is writing a sheet).
pub type Progress<'a> = &'a (dyn Fn(u64) + Sync);

/// Rows written between two progress calls.
const PROGRESS_EVERY: u64 = 4096;

fn write_table_sheet(
    ws: &mut Worksheet,
    report: &Screening,
    table: TableId,
    rows: usize,
    styles: &Styles,
    fit_rows: bool,
    (progress, done): (Progress<'_>, &AtomicU64),
) -> Result<(), ReportError> {
    let cols = table.columns();
    ws.set_name(table.sheet_name())?;
    for (i, c) in cols.iter().enumerate() {
        ws.set_column_width(i as u16, c.width)?;
        if column_formatted(c.kind) {
            ws.set_column_format(i as u16, styles.kind(c.kind))?;
        } else if c.kind == CellKind::Text && c.width >= WRAP_FROM_WIDTH {
            // Long text (names, flags, notes, reasons) wraps instead of running on.
            ws.set_column_format(i as u16, &styles.wrap)?;
        } else if c.kind == CellKind::Text {
            ws.set_column_format(i as u16, styles.kind(CellKind::Text))?;
        }
        if table == TableId::Priority && tables::PRIORITY_HIDDEN.contains(&c.key) {
            ws.set_column_hidden(i as u16)?;
        }
    }
    ws.set_row_height(0, 45)?;
    let freeze_cols = match table {
        TableId::Priority | TableId::Directions | TableId::Retrofit => 2,
        _ => 0,
    };
    ws.set_freeze_panes(1, freeze_cols)?;
    let last_col = cols.len().saturating_sub(1) as u16;
    style::page_setup(
        ws,
        table.sheet_name(),
        &input_file_name(report),
        Print {
            repeat_rows: Some((0, 0)),
            repeat_cols: (freeze_cols > 0 || table == TableId::Walls || table == TableId::Flags)
                .then_some((0, 1)),
            on_request: matches!(table, TableId::Directions | TableId::Walls | TableId::Flags)
                .then_some(last_col),
        },
    )?;
    ws.autofilter(0, 0, rows as u32, last_col)?;
    for (i, c) in cols.iter().enumerate() {
        ws.write_string_with_format(0, i as u16, c.header, &styles.header)?;
    }
    let mut sink = SheetSink::new(ws, styles, cols, 1, fit_rows);
    table.rows_into(report, rows, &mut sink, |s| {
        s.end_row()?;
        let n = done.fetch_add(1, Ordering::Relaxed) + 1;
        if n.is_multiple_of(PROGRESS_EVERY) {
            progress(n);
        }
        Ok::<(), ReportError>(())
    })?;
    Ok(())
}

/// Writes the results workbook; returns any extra files written (large-stock CSVs), each
/// with a label for the terminal summary.
pub fn write(report: &Screening, path: &Path) -> Result<Vec<(String, PathBuf)>, ReportError> {
    write_with_progress(report, path, &|_| {})
}

/// [`write`] with a progress callback (rows written).
pub fn write_with_progress(
    report: &Screening,
    path: &Path,
    progress: Progress<'_>,
) -> Result<Vec<(String, PathBuf)>, ReportError> {
    write_with_layout(report, path, &Layout::of(report), progress)
}

/// [`write`] with a given layout (tests and benchmarks force the large-stock layout or
/// constant-memory mode with this).
pub fn write_with_layout(
    report: &Screening,
    path: &Path,
    layout: &Layout,
    progress: Progress<'_>,
) -> Result<Vec<(String, PathBuf)>, ReportError> {
    write_with_layout_except(report, path, layout, &[], progress)
}

/// [`write_with_layout`] where the CSV files of the tables in `written` are already written
/// (the streaming path writes Directions, Walls and Flags chunk by chunk): they are listed on
/// Summary but not written again.
pub fn write_with_layout_except(
    report: &Screening,
    path: &Path,
    layout: &Layout,
    written: &[TableId],
    progress: Progress<'_>,
) -> Result<Vec<(String, PathBuf)>, ReportError> {
    write_inner(report, path, layout, written, None, progress)
}

/// [`write_with_progress`] with the comparison with a previous run (`--previous`): the
/// `Changes` sheet after Priority.
pub fn write_with_changes(
    report: &Screening,
    path: &Path,
    changes: Option<&Changes>,
    progress: Progress<'_>,
) -> Result<Vec<(String, PathBuf)>, ReportError> {
    write_inner(report, path, &Layout::of(report), &[], changes, progress)
}

fn write_inner(
    report: &Screening,
    path: &Path,
    layout: &Layout,
    written: &[TableId],
    changes: Option<&Changes>,
    progress: Progress<'_>,
) -> Result<Vec<(String, PathBuf)>, ReportError> {
    let mut extra = Vec::new();
    for t in &layout.csv {
        let p = csv_path(path, *t);
        if !written.contains(t) {
            crate::report::csv::write_table_file(report, *t, &p)?;
        }
        extra.push((format!("{} (CSV)", t.sheet_name()), p));
    }
    if report.uncertainty.is_some() && layout.large() {
        let p = confidence::csv_path(path);
        confidence::write_csv(report, &p)?;
        extra.push((format!("{} (CSV)", confidence::SHEET), p));
    }
    write_atomic(path, |w| {
        build_and_save(report, path, w, layout, &extra, changes, progress)
    })?;
    Ok(extra)
}

/// Spreads jobs of the given weights over `bins` workers, largest first onto the least loaded
/// (the longest-processing-time rule); returns each job's bin. The Directions sheet alone
/// holds about half the cells of a workbook, so on two threads it gets one to itself.
pub fn balance(weights: &[u64], bins: usize) -> Vec<usize> {
    let bins = bins.max(1);
    let mut order: Vec<usize> = (0..weights.len()).collect();
    order.sort_by_key(|&i| std::cmp::Reverse(weights.get(i).copied().unwrap_or(0)));
    let mut load = vec![0u64; bins];
    let mut bin_of = vec![0usize; weights.len()];
    for i in order {
        let (b, _) = load
            .iter()
            .enumerate()
            .min_by_key(|&(b, l)| (*l, b))
            .unwrap_or((0, &0));
        if let (Some(slot), Some(l)) = (bin_of.get_mut(i), load.get_mut(b)) {
            *slot = b;
            *l += weights.get(i).copied().unwrap_or(0);
        }
    }
    bin_of
}

/// Seconds since the Unix epoch, now.
fn now_timestamp() -> i64 {
    std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|d| d.as_secs() as i64)
        .unwrap_or(0)
}

fn build_and_save(
    report: &Screening,
    path: &Path,
    out: &mut BufWriter<File>,
    layout: &Layout,
    extra: &[(String, PathBuf)],
    changes: Option<&Changes>,
    progress: Progress<'_>,
) -> Result<(), ReportError> {
    let styles = Styles::new();
    let mut wb = Workbook::new();
    wb.set_zip_compression_level(ZIP_LEVEL);
    wb.use_zip_large_file(layout.zip64);
    let now = ExcelDateTime::from_timestamp(now_timestamp())?;
    let file_name = Path::new(&report.input.file)
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_else(|| report.input.file.clone());
    let props = DocProperties::new()
        .set_title(format!("Seismic screening results: {file_name}"))
        .set_subject("Screening of existing RC buildings for seismic retrofit priority")
        .set_author(format!("seistriage {}", report.version))
        .set_category("Screening results")
        .set_keywords("seismic screening, retrofit priority, drift demand, drift capacity")
        .set_comment(crate::CAUTION)
        .set_creation_datetime(&now)
        .set_custom_property("Input file", report.input.file.as_str())
        .set_custom_property("Input SHA-256", report.input.sha256.as_str())
        .set_custom_property("Tool version", report.version)
        .set_custom_property("Ranking level", report.settings.ranking_level.code());
    wb.set_properties(&props);
    if layout.constant_memory {
        let dir = path
            .parent()
            .filter(|p| !p.as_os_str().is_empty())
            .unwrap_or(Path::new("."));
        wb.set_tempdir(dir)?;
    }

    // Summary first (a normal sheet, filled at the end when everything is known).
    wb.add_worksheet().set_name("Summary")?;
    // The table sheets are standalone worksheets filled in parallel, then added in the
    // contract's order. Constant-memory sheets created by the workbook share its format
    // table, so their cell styles are right whichever thread writes them.
    let mut sheets: Vec<(TableId, usize, Worksheet)> = Vec::new();
    for t in TableId::ALL {
        let Some(rows) = layout.sheet_rows(t) else {
            continue;
        };
        let ws = if layout.constant_memory && t.per_row() {
            wb.new_worksheet_with_constant_memory()?
        } else {
            Worksheet::new()
        };
        sheets.push((t, rows, ws));
    }
    let done = AtomicU64::new(0);
    // Row heights for wrapped text only below the constant-memory size (a stock that large
    // is not printed; the per-row sheets stay as fast as before).
    let fit_rows = !layout.constant_memory;
    let weights: Vec<u64> = sheets
        .iter()
        .map(|(t, rows, _)| *rows as u64 * t.columns().len() as u64)
        .collect();
    let threads = rayon::current_num_threads().max(1);
    let mut bins: Vec<Vec<&mut (TableId, usize, Worksheet)>> =
        (0..threads).map(|_| Vec::new()).collect();
    for (sheet, bin) in sheets.iter_mut().zip(balance(&weights, threads)) {
        if let Some(b) = bins.get_mut(bin) {
            b.push(sheet);
        }
    }
    bins.into_par_iter().try_for_each(|bin| {
        bin.into_iter().try_for_each(|(t, rows, ws)| {
            write_table_sheet(ws, report, *t, *rows, &styles, fit_rows, (progress, &done))
        })
    })?;
    for (t, _, ws) in sheets {
        wb.push_worksheet(ws);
        // Method §13: the Confidence sheet follows Priority (only with samples).
        if t == TableId::Priority && report.uncertainty.is_some() {
            let rows = layout
                .sheet_rows(TableId::Priority)
                .unwrap_or(report.buildings.len());
            confidence::write(wb.add_worksheet(), report, rows, &styles)?;
        }
        if t == TableId::Priority
            && let Some(c) = changes
        {
            changes_sheet::write(wb.add_worksheet(), report, c, &styles)?;
        }
    }
    let ws = wb.add_worksheet();
    assumptions::write(ws, report, &styles)?;
    style::page_setup(
        ws,
        "Assumptions",
        &input_file_name(report),
        Print {
            repeat_rows: Some((0, 0)),
            repeat_cols: None,
            on_request: None,
        },
    )?;
    let charts = summary::write_chart_data(wb.add_worksheet(), report)?;
    let summary_ws = wb.worksheet_from_name("Summary")?;
    summary::write(summary_ws, report, layout, extra, &styles, &now, &charts)?;
    summary_ws.set_active(true);
    progress(done.load(Ordering::Relaxed));
    wb.save_to_writer(out)?;
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn balance_gives_the_largest_sheet_a_worker_of_its_own() {
        // Directions-like job first in weight, the rest share the other worker.
        assert_eq!(
            balance(&[10, 3, 60, 20, 15, 1, 1], 2),
            vec![1, 1, 0, 1, 1, 1, 1]
        );
        // Longest-processing-time rule: 7,6,5,4 on two workers -> {7,4} and {6,5}.
        assert_eq!(balance(&[7, 6, 5, 4], 2), vec![0, 1, 1, 0]);
        // One worker takes everything; no workers behaves as one.
        assert_eq!(balance(&[3, 2], 1), vec![0, 0]);
        assert_eq!(balance(&[3, 2], 0), vec![0, 0]);
        assert!(balance(&[], 2).is_empty());
    }

    #[test]
    fn wrapped_lines_keep_words_whole() {
        // Width 10 holds 11 characters a line (10 × 1.15, rounded down).
        assert_eq!(wrapped_lines("", 10.0), 1);
        assert_eq!(wrapped_lines("short", 10.0), 1);
        assert_eq!(wrapped_lines("abcde fghij", 10.0), 1); // 11 characters
        assert_eq!(wrapped_lines("abcde fghijk", 10.0), 2);
        assert_eq!(wrapped_lines("one two three four five six", 10.0), 3);
        assert_eq!(wrapped_lines("a\nb", 10.0), 2);
    }

    #[test]
    fn cut_keeps_short_text_and_cuts_long_text_at_a_char_boundary() {
        assert_eq!(cut("abc"), "abc");
        let long = "é".repeat(40_000);
        let c = cut(&long);
        assert_eq!(c.encode_utf16().count(), CELL_TEXT_LIMIT);
        // Astral characters take two UTF-16 units: never split one.
        let astral = "😀".repeat(20_000);
        let c = cut(&astral);
        assert!(c.encode_utf16().count() <= CELL_TEXT_LIMIT);
        assert_eq!(c.chars().count(), CELL_TEXT_LIMIT / 2);
    }

    fn counts(buildings: usize, walls: usize) -> RowCounts {
        RowCounts {
            priority: buildings,
            retrofit: buildings / 2,
            directions: 2 * buildings,
            walls,
            flags: buildings,
            not_screened: 3,
            problems: 5,
        }
    }

    #[test]
    fn large_stock_rule_follows_the_directions_row_limit() {
        // 524,287 buildings give 1,048,574 direction rows + header = 1,048,575: fits.
        let l = Layout::plan(counts(524_287, 0), 524_287);
        assert!(!l.large());
        assert!(l.constant_memory);
        assert_eq!(l.sheet_rows(TableId::Directions), Some(1_048_574));
        // A full Directions sheet may pass 4 GiB uncompressed: Zip64 is on.
        assert!(l.zip64);
        // One more building passes the limit: the per-row tables go to CSV.
        let l = Layout::plan(counts(524_288, 0), 524_288);
        assert!(l.large());
        assert_eq!(l.sheet_rows(TableId::Priority), Some(LARGE_PRIORITY_ROWS));
        for t in [
            TableId::Directions,
            TableId::Walls,
            TableId::Flags,
            TableId::Retrofit,
        ] {
            assert_eq!(l.sheet_rows(t), None, "{t:?}");
        }
        assert_eq!(l.sheet_rows(TableId::NotScreened), Some(3));
        assert_eq!(l.sheet_rows(TableId::Problems), Some(5));
    }

    #[test]
    fn a_long_walls_table_alone_goes_to_csv() {
        let l = Layout::plan(counts(1_000, SHEET_ROWS), 1_000);
        assert!(!l.large());
        assert_eq!(l.csv, vec![TableId::Walls]);
        assert_eq!(l.sheet_rows(TableId::Priority), Some(1_000));
        assert!(!l.constant_memory);
        assert!(!l.zip64);
    }

    #[test]
    fn csv_path_sits_beside_the_workbook() {
        assert_eq!(
            csv_path(Path::new("out/a-screening.xlsx"), TableId::Directions),
            PathBuf::from("out/a-screening.directions.csv")
        );
    }
}
