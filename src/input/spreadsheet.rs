/*!
Workbook sources via calamine. `.xlsx`/`.xlsm` are streamed cell by cell (a huge declared
range from one stray far-away cell costs nothing: only the cells present are read, counted
against the cell budget); `.xls`/`.ods` are read whole by calamine, so their file size, the
uncompressed size of the `.ods` zip entries and the extent of the sheet grid are checked
against the budget first. Formulas without a cached value and error cells are kept as such.
*/

use std::io::{Read, Seek};
use std::path::Path;

use calamine::{Data, DataRef, Ods, Reader, Xls, Xlsx};

use super::InputError;
use super::raw::{Budget, CellCounter, MAX_CELL_CHARS, RawCell, RawRow};

/// Largest row and column count of a worksheet (.xlsx format limits).
pub const MAX_SHEET_ROWS: u32 = 1_048_576;
/// Largest column count of a worksheet.
pub const MAX_SHEET_COLS: u32 = 16_384;

/// Which workbook format a file holds.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum WorkbookKind {
    /// Office Open XML (.xlsx, .xlsm).
    Xlsx,
    /// BIFF (.xls).
    Xls,
    /// OpenDocument (.ods).
    Ods,
}

fn unreadable(path: &str, message: impl std::fmt::Display) -> InputError {
    InputError::Unreadable {
        path: path.to_string(),
        message: message.to_string(),
    }
}

/// Checks the zip directory: total uncompressed size and compression ratios (zip bombs).
/// Returns the workbook kind found inside (xlsx or ods).
pub fn check_zip<R: Read + Seek>(
    reader: R,
    path: &str,
    budget: &Budget,
) -> Result<WorkbookKind, InputError> {
    let mut zip = zip::ZipArchive::new(reader).map_err(|e| {
        unreadable(
            path,
            format!("not a readable workbook (broken zip container: {e})"),
        )
    })?;
    let mut total: u64 = 0;
    let mut kind = None;
    let mut shared_strings = Vec::new();
    for i in 0..zip.len() {
        let f = zip
            .by_index_raw(i)
            .map_err(|e| unreadable(path, format!("broken zip entry: {e}")))?;
        let name = f.name().map(|n| n.into_owned()).unwrap_or_default();
        let size = f.size();
        let packed = f.compressed_size().max(1);
        total = total.saturating_add(size);
        if size > (1 << 20) && size / packed > budget.max_compression_ratio {
            return Err(InputError::TooLarge {
                path: path.to_string(),
                message: format!(
                    "zip entry {} expands {} times ({} bytes from {}); more than {} times is refused as a zip bomb",
                    name,
                    size / packed,
                    size,
                    packed,
                    budget.max_compression_ratio
                ),
            });
        }
        if name == "xl/sharedStrings.xml" && size > budget.max_shared_strings_bytes {
            return Err(InputError::TooLarge {
                path: path.to_string(),
                message: format!(
                    "the shared text of the workbook expands to {size} bytes, more than the budget of {} bytes",
                    budget.max_shared_strings_bytes
                ),
            });
        }
        if name
            .replace('\\', "/")
            .to_ascii_lowercase()
            .ends_with("sharedstrings.xml")
        {
            shared_strings.push((i, size));
        }
        match name.as_str() {
            "xl/workbook.xml" => kind = Some(WorkbookKind::Xlsx),
            "xl/workbook.bin" => {
                return Err(unreadable(
                    path,
                    "binary .xlsb workbooks are not read; save it as .xlsx",
                ));
            }
            "content.xml" if kind.is_none() => kind = Some(WorkbookKind::Ods),
            _ => {}
        }
    }
    if total > budget.max_uncompressed_bytes {
        return Err(InputError::TooLarge {
            path: path.to_string(),
            message: format!(
                "the workbook expands to {total} bytes, more than the budget of {} bytes",
                budget.max_uncompressed_bytes
            ),
        });
    }
    let kind = kind.ok_or_else(|| {
        unreadable(
            path,
            "a zip file but not a spreadsheet (no xl/workbook.xml or content.xml inside)",
        )
    })?;
    if kind == WorkbookKind::Xlsx {
        for (i, size) in shared_strings {
            let part = zip
                .by_index(i)
                .map_err(|e| unreadable(path, format!("broken zip entry: {e}")))?;
            if let Some(n) = declared_string_count(part)
                && n > size / MIN_SHARED_STRING_BYTES + 1
            {
                return Err(unreadable(
                    path,
                    format!(
                        "not a readable workbook (its shared-text part declares {n} texts in {size} bytes; a damaged file)"
                    ),
                ));
            }
        }
    }
    Ok(kind)
}

/// Bytes of the shortest entry of a shared-strings part (`<si/>`).
const MIN_SHARED_STRING_BYTES: u64 = 5;

/// The `uniqueCount` of a shared-strings part's `<sst>` element, read as calamine reads it
/// (it reserves that many texts up front, before reading any: found by fuzzing, an 1 kB
/// .xlsx declaring 33 billion texts made it request 800 GB). `None` when absent or not a
/// number (calamine then reserves nothing).
fn declared_string_count(part: impl Read) -> Option<u64> {
    use quick_xml::events::Event;
    let mut xml = quick_xml::Reader::from_reader(std::io::BufReader::new(part));
    let config = xml.config_mut();
    config.check_end_names = false;
    config.trim_text(false);
    config.check_comments = false;
    config.expand_empty_elements = true;
    let mut buf = Vec::new();
    loop {
        buf.clear();
        match xml.read_event_into(&mut buf).ok()? {
            Event::Start(e) if e.local_name().as_ref() == "sst" => {
                let value = e
                    .attributes()
                    .with_checks(false)
                    .map_while(Result::ok)
                    .find(|a| a.key.as_ref() == "uniqueCount")?
                    .value;
                let value = value.as_bytes();
                let digits = value.strip_prefix(b"+").unwrap_or(value);
                if digits.is_empty() || !digits.iter().all(u8::is_ascii_digit) {
                    return None;
                }
                return Some(digits.iter().fold(0u64, |n, d| {
                    n.saturating_mul(10).saturating_add(u64::from(d - b'0'))
                }));
            }
            Event::Eof => return None,
            _ => {}
        }
    }
}

/// Whether an .xlsx asks to be fully recalculated on opening (`<calcPr fullCalcOnLoad="1">`):
/// then its cached formula results of 0 were never calculated.
pub fn asks_recalc<R: Read + Seek>(reader: R) -> bool {
    let Ok(mut zip) = zip::ZipArchive::new(reader) else {
        return false;
    };
    let Ok(f) = zip.by_name("xl/workbook.xml") else {
        return false;
    };
    let mut text = String::new();
    if f.take(4 << 20).read_to_string(&mut text).is_err() {
        return false;
    }
    text.contains("fullCalcOnLoad=\"1\"") || text.contains("fullCalcOnLoad=\"true\"")
}

/// Days since 1970-01-01 → civil year (proleptic Gregorian).
fn year_from_unix_days(z: i64) -> i64 {
    let z = z + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z - era * 146_097;
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let y = yoe + era * 400;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    if m <= 2 { y + 1 } else { y }
}

/// The calendar year of a spreadsheet date serial.
pub fn year_of_serial(serial: f64, is_1904: bool) -> Option<i32> {
    if !serial.is_finite() || !(0.0..=2_958_466.0).contains(&serial) {
        return None;
    }
    let days = serial.floor() as i64;
    let unix = if is_1904 {
        days - 24_107
    } else if days < 61 {
        return Some(1900);
    } else {
        days - 25_569
    };
    i32::try_from(year_from_unix_days(unix)).ok()
}

fn text_cell(mut s: String, truncated: &mut Vec<usize>, col: usize) -> RawCell {
    if s.chars().count() > MAX_CELL_CHARS {
        s = s.chars().take(MAX_CELL_CHARS).collect();
        truncated.push(col);
    }
    RawCell::Text(s)
}

fn from_ref(v: &DataRef<'_>, is_1904: bool, truncated: &mut Vec<usize>, col: usize) -> RawCell {
    match v {
        DataRef::Int(i) => RawCell::Number(*i as f64),
        DataRef::Float(f) => RawCell::Number(*f),
        DataRef::String(s) => text_cell(s.clone(), truncated, col),
        DataRef::SharedString(s) => text_cell((*s).to_string(), truncated, col),
        DataRef::Bool(b) => RawCell::Bool(*b),
        DataRef::DateTime(d) => RawCell::Date {
            serial: d.as_f64(),
            is_1904,
        },
        DataRef::DateTimeIso(s) => RawCell::DateIso(s.clone()),
        DataRef::DurationIso(s) => RawCell::Text(s.clone()),
        DataRef::Error(e) => RawCell::Error(e.to_string()),
        DataRef::Empty => RawCell::Empty,
    }
}

fn from_data(v: &Data, truncated: &mut Vec<usize>, col: usize) -> RawCell {
    match v {
        Data::Int(i) => RawCell::Number(*i as f64),
        Data::Float(f) => RawCell::Number(*f),
        Data::String(s) => text_cell(s.clone(), truncated, col),
        Data::Bool(b) => RawCell::Bool(*b),
        Data::DateTime(d) => RawCell::Date {
            serial: d.as_f64(),
            is_1904: false,
        },
        Data::DateTimeIso(s) => RawCell::DateIso(s.clone()),
        Data::DurationIso(s) => RawCell::Text(s.clone()),
        Data::Error(e) => RawCell::Error(e.to_string()),
        Data::Empty => RawCell::Empty,
    }
}

/// An opened workbook of any supported kind.
pub enum Workbook<R: Read + Seek> {
    /// Streamed; the flag says the file asks to be recalculated on opening (its cached
    /// formula values were not computed by the program that wrote it).
    Xlsx(Box<Xlsx<R>>, bool),
    /// Read whole.
    Xls(Box<Xls<R>>),
    /// Read whole.
    Ods(Box<Ods<R>>),
}

/// Rows of a sheet are handed to `sink`; cut cells are reported as (row, col) in `truncated`.
pub type RowSink<'a> = dyn FnMut(RawRow, &[usize]) -> Result<(), InputError> + 'a;

impl<R: Read + Seek> Workbook<R> {
    /// Marks an .xlsx whose `workbook.xml` asks for a full recalculation on opening.
    pub fn set_recalc(&mut self, recalc: bool) {
        if let Workbook::Xlsx(_, flag) = self {
            *flag = recalc;
        }
    }

    /// Opens a workbook of a known kind.
    pub fn open(reader: R, kind: WorkbookKind, path: &str) -> Result<Self, InputError> {
        let map = |e: String| {
            if e.contains("password") {
                InputError::Protected {
                    path: path.to_string(),
                }
            } else {
                unreadable(path, format!("not a readable workbook ({e})"))
            }
        };
        Ok(match kind {
            WorkbookKind::Xlsx => Workbook::Xlsx(
                Box::new(Xlsx::new(reader).map_err(|e| map(e.to_string()))?),
                false,
            ),
            WorkbookKind::Xls => {
                Workbook::Xls(Box::new(Xls::new(reader).map_err(|e| map(e.to_string()))?))
            }
            WorkbookKind::Ods => {
                Workbook::Ods(Box::new(Ods::new(reader).map_err(|e| map(e.to_string()))?))
            }
        })
    }

    /// Sheet names in workbook order.
    pub fn sheet_names(&self) -> Vec<String> {
        match self {
            Workbook::Xlsx(w, _) => w.sheet_names(),
            Workbook::Xls(w) => w.sheet_names(),
            Workbook::Ods(w) => w.sheet_names(),
        }
    }

    /// Reads one sheet row by row into `sink`.
    pub fn read_sheet(
        &mut self,
        name: &str,
        path: &str,
        budget: &Budget,
        counter: &mut CellCounter,
        sink: &mut RowSink<'_>,
    ) -> Result<(), InputError> {
        match self {
            Workbook::Xlsx(w, recalc) => stream_xlsx(w, *recalc, name, path, counter, sink),
            Workbook::Xls(w) => {
                let values = w
                    .worksheet_range(name)
                    .map_err(|e| unreadable(path, format!("sheet {name}: {e}")))?;
                let formulas = w.worksheet_formula(name).ok();
                dense(values, formulas, name, path, budget, counter, sink)
            }
            Workbook::Ods(w) => {
                let values = w
                    .worksheet_range(name)
                    .map_err(|e| unreadable(path, format!("sheet {name}: {e}")))?;
                let formulas = w.worksheet_formula(name).ok();
                dense(values, formulas, name, path, budget, counter, sink)
            }
        }
    }
}

fn too_far(path: &str, name: &str, row: u32, col: u32) -> InputError {
    InputError::TooLarge {
        path: path.to_string(),
        message: format!(
            "sheet {name} declares a cell at row {}, column {}, beyond the worksheet limits ({MAX_SHEET_ROWS} rows, {MAX_SHEET_COLS} columns)",
            u64::from(row) + 1,
            u64::from(col) + 1
        ),
    }
}

fn stream_xlsx<R: Read + Seek>(
    wb: &mut Xlsx<R>,
    recalc: bool,
    name: &str,
    path: &str,
    counter: &mut CellCounter,
    sink: &mut RowSink<'_>,
) -> Result<(), InputError> {
    let is_1904 = wb.has_1904_epoch();
    let mut reader = wb
        .worksheet_cells_reader(name)
        .map_err(|e| unreadable(path, format!("sheet {name}: {e}")))?;
    let dim = reader.dimensions();
    if dim.end.0 >= MAX_SHEET_ROWS || dim.end.1 >= MAX_SHEET_COLS {
        return Err(too_far(path, name, dim.end.0, dim.end.1));
    }
    let mut current = RawRow::default();
    let mut truncated = Vec::new();
    loop {
        let cell = reader
            .next_cell_with_formula()
            .map_err(|e| unreadable(path, format!("sheet {name}: {e}")))?;
        let Some(cell) = cell else { break };
        let (r, c) = cell.pos;
        if r >= MAX_SHEET_ROWS || c >= MAX_SHEET_COLS {
            return Err(too_far(path, name, r, c));
        }
        let row = r as usize + 1;
        let col = c as usize;
        if row != current.row {
            if !current.cells.is_empty() {
                let mut done = std::mem::take(&mut current);
                done.cells.sort_by_key(|(c, _)| *c);
                sink(done, &truncated)?;
            }
            truncated.clear();
            current.row = row;
        }
        let value = match (&cell.value, &cell.formula) {
            (DataRef::Empty, Some(f)) if !f.is_empty() => RawCell::FormulaNoValue(f.clone()),
            (DataRef::String(s), Some(f)) if s.is_empty() && !f.is_empty() => {
                RawCell::FormulaNoValue(f.clone())
            }
            // Writers that do not calculate store 0 and ask for recalculation on opening.
            (DataRef::Float(z), Some(f)) if recalc && *z == 0.0 && !f.is_empty() => {
                RawCell::FormulaNoValue(f.clone())
            }
            (DataRef::Int(0), Some(f)) if recalc && !f.is_empty() => {
                RawCell::FormulaNoValue(f.clone())
            }
            (v, _) => from_ref(v, is_1904, &mut truncated, col),
        };
        if matches!(value, RawCell::Empty) {
            continue;
        }
        counter.count()?;
        current.cells.push((col, value));
    }
    if !current.cells.is_empty() {
        current.cells.sort_by_key(|(c, _)| *c);
        sink(current, &truncated)?;
    }
    Ok(())
}

fn dense(
    values: calamine::Range<Data>,
    formulas: Option<calamine::Range<String>>,
    name: &str,
    path: &str,
    budget: &Budget,
    counter: &mut CellCounter,
    sink: &mut RowSink<'_>,
) -> Result<(), InputError> {
    let (h, w) = values.get_size();
    let cells = (h as u64).saturating_mul(w as u64);
    if cells > budget.max_dense_cells {
        return Err(InputError::TooLarge {
            path: path.to_string(),
            message: format!(
                "sheet {name} spans {h} rows × {w} columns = {cells} cells, more than the budget of {} for .xls/.ods (save it as .xlsx, which is streamed, or delete stray far-away cells)",
                budget.max_dense_cells
            ),
        });
    }
    let Some((r0, c0)) = values.start() else {
        return Ok(());
    };
    let mut truncated = Vec::new();
    for (i, row_cells) in values.rows().enumerate() {
        let abs_row = r0 as usize + i;
        let mut row = RawRow {
            row: abs_row + 1,
            cells: Vec::new(),
        };
        for (j, v) in row_cells.iter().enumerate() {
            let abs_col = c0 as usize + j;
            let formula = formulas.as_ref().and_then(|f| {
                f.get_value((abs_row as u32, abs_col as u32))
                    .filter(|s| !s.is_empty())
            });
            let cell = match (v, formula) {
                (Data::Empty, Some(f)) => RawCell::FormulaNoValue(f.clone()),
                (Data::String(s), Some(f)) if s.is_empty() => RawCell::FormulaNoValue(f.clone()),
                (v, _) => from_data(v, &mut truncated, abs_col),
            };
            if matches!(cell, RawCell::Empty) {
                continue;
            }
            counter.count()?;
            row.cells.push((abs_col, cell));
        }
        if !row.cells.is_empty() {
            sink(row, &truncated)?;
            truncated.clear();
        }
    }
    Ok(())
}

/// Sniffs the workbook kind of a file from its first bytes.
pub fn sniff(path: &Path) -> std::io::Result<Option<[u8; 8]>> {
    let mut f = std::fs::File::open(path)?;
    let mut head = [0u8; 8];
    let mut n = 0;
    while n < 8 {
        let k = f.read(&mut head[n..])?;
        if k == 0 {
            break;
        }
        n += k;
    }
    Ok((n == 8).then_some(head))
}

fn repeat_attr(e: &quick_xml::events::BytesStart<'_>, name: &str) -> u64 {
    e.try_get_attribute(name)
        .ok()
        .flatten()
        .and_then(|a| a.value.trim().parse::<u64>().ok())
        .unwrap_or(1)
        .max(1)
}

/// Pre-scans an .ods `content.xml` (streamed from the zip, nothing expanded) for the grid
/// extent each table would take once calamine expands repeated rows and columns, and
/// refuses a table above the dense-cell budget before calamine allocates it.
pub fn check_ods_extent<R: Read + Seek>(
    reader: R,
    path: &str,
    budget: &Budget,
) -> Result<(), InputError> {
    use quick_xml::events::Event;
    let mut zip = zip::ZipArchive::new(reader)
        .map_err(|e| unreadable(path, format!("broken zip container: {e}")))?;
    let content = zip
        .by_name("content.xml")
        .map_err(|e| unreadable(path, format!("no content.xml: {e}")))?;
    let mut xml = quick_xml::Reader::from_reader(std::io::BufReader::new(content));
    let mut buf = Vec::new();
    let (mut name, mut cur_row, mut max_row, mut max_col) = (String::new(), 0u64, 0u64, 0u64);
    let (mut row_rep, mut cur_col, mut row_has, mut row_max_col) = (1u64, 0u64, false, 0u64);
    let (mut cell_rep, mut cell_has, mut in_cell) = (1u64, false, false);
    // Elements open now: calamine's table, row and annotation loops wait for their end tag
    // and never see the end of the file, so a content.xml cut inside an element would make
    // it loop forever (found by fuzzing). The end names are checked by the reader.
    let mut open = 0u64;
    let mut total = 0u64;
    loop {
        buf.clear();
        let ev = xml
            .read_event_into(&mut buf)
            .map_err(|e| unreadable(path, format!("content.xml: {e}")))?;
        let (e, empty) = match &ev {
            Event::Start(e) => {
                open += 1;
                (Some(e.clone()), false)
            }
            Event::Empty(e) => (Some(e.clone()), true),
            Event::End(end) => {
                open = open.saturating_sub(1);
                match end.name().as_ref() {
                    "table:table-cell" | "table:covered-table-cell" => {
                        if cell_has {
                            row_max_col = cur_col.saturating_add(cell_rep);
                            row_has = true;
                        }
                        cur_col = cur_col.saturating_add(cell_rep);
                        in_cell = false;
                    }
                    "table:table-row" => {
                        if row_has {
                            max_row = cur_row.saturating_add(row_rep);
                            max_col = max_col.max(row_max_col);
                        }
                        cur_row = cur_row.saturating_add(row_rep);
                    }
                    "table:table" => {
                        let cells = max_row.saturating_mul(max_col);
                        total = total.saturating_add(cells);
                        if cells > budget.max_dense_cells {
                            return Err(InputError::TooLarge {
                                path: path.to_string(),
                                message: format!(
                                    "sheet {name} spans {max_row} rows × {max_col} columns = {cells} cells, more than the budget of {} for .ods (save it as .xlsx, which is streamed, or delete stray far-away cells)",
                                    budget.max_dense_cells
                                ),
                            });
                        }
                        // calamine holds every table's grid at once.
                        if total > budget.max_dense_cells {
                            return Err(InputError::TooLarge {
                                path: path.to_string(),
                                message: format!(
                                    "its sheets span {total} cells together, more than the budget of {} for .ods (save it as .xlsx, which is streamed)",
                                    budget.max_dense_cells
                                ),
                            });
                        }
                    }
                    _ => {}
                }
                continue;
            }
            Event::Text(t) if in_cell && !t.trim().is_empty() => {
                cell_has = true;
                continue;
            }
            Event::Eof if open > 0 => {
                return Err(unreadable(
                    path,
                    format!(
                        "not a readable workbook (content.xml ends inside {open} unclosed element(s): a cut or damaged file)"
                    ),
                ));
            }
            Event::Eof => break,
            _ => continue,
        };
        let Some(e) = e else { continue };
        match e.name().as_ref() {
            "table:table" => {
                name = e
                    .try_get_attribute("table:name")
                    .ok()
                    .flatten()
                    .map(|a| a.value.into_owned())
                    .unwrap_or_default();
                (cur_row, max_row, max_col) = (0, 0, 0);
            }
            "table:table-row" => {
                row_rep = repeat_attr(&e, "table:number-rows-repeated");
                (cur_col, row_has, row_max_col) = (0, false, 0);
                if empty {
                    cur_row = cur_row.saturating_add(row_rep);
                }
            }
            "table:table-cell" | "table:covered-table-cell" => {
                cell_rep = repeat_attr(&e, "table:number-columns-repeated");
                cell_has = e
                    .try_get_attribute("office:value-type")
                    .ok()
                    .flatten()
                    .is_some();
                if empty {
                    if cell_has {
                        row_max_col = cur_col.saturating_add(cell_rep);
                        row_has = true;
                    }
                    cur_col = cur_col.saturating_add(cell_rep);
                } else {
                    in_cell = true;
                }
            }
            _ => {}
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_declared_shared_string_count_is_read_as_calamine_reads_it() {
        let count = |xml: &str| declared_string_count(xml.as_bytes());
        assert_eq!(
            count(r#"<?xml version="1.0"?><sst count="9" uniqueCount="7"><si/></sst>"#),
            Some(7)
        );
        assert_eq!(
            count(r#"<x:sst xmlns:x="u" uniqueCount="+0012"/>"#),
            Some(12)
        );
        assert_eq!(
            count(r#"<sst uniqueCount="99999999999999999999999"/>"#),
            Some(u64::MAX)
        );
        assert_eq!(count(r#"<sst uniqueCount="7x"/>"#), None);
        assert_eq!(count(r#"<sst count="7"/>"#), None);
        assert_eq!(count("not xml at all"), None);
    }

    #[test]
    fn serials_give_their_calendar_year() {
        // 1972-05-01 is serial 26420 in the 1900 system (spreadsheet convention).
        assert_eq!(year_of_serial(26420.0, false), Some(1972));
        assert_eq!(year_of_serial(25569.0, false), Some(1970));
        assert_eq!(year_of_serial(25568.0, false), Some(1969));
        assert_eq!(year_of_serial(24107.0, true), Some(1970));
        assert_eq!(year_of_serial(45658.0, false), Some(2025));
    }
}
