/*!
Untyped cells and rows as they come out of a workbook or CSV file, the reading budgets, and
the per-sheet state machine that finds the header row, maps columns, skips and counts blank
rows and hands each data row (in canonical column order) to a consumer.
*/

use super::InputError;
use super::columns::SheetSpec;
use super::header::{HeaderMap, map_headers};
use crate::model::{Problem, Severity};

/// Most characters a spreadsheet cell can hold; longer text is cut with a warning.
pub const MAX_CELL_CHARS: usize = 32_767;
/// Rows looked at for the header row when it is found automatically.
pub const HEADER_SCAN_ROWS: usize = 30;

/// One cell as read, before typing.
#[derive(Debug, Clone, PartialEq, Default)]
pub enum RawCell {
    /// Blank.
    #[default]
    Empty,
    /// Text (CSV fields are always text).
    Text(String),
    /// A number.
    Number(f64),
    /// TRUE / FALSE.
    Bool(bool),
    /// A date cell: the spreadsheet serial and whether the workbook uses the 1904 epoch.
    Date {
        /// Serial day number.
        serial: f64,
        /// 1904 date system.
        is_1904: bool,
    },
    /// An ISO 8601 date text from an .ods file.
    DateIso(String),
    /// An error cell (#DIV/0!, #N/A, …).
    Error(String),
    /// A formula saved without a cached value.
    FormulaNoValue(String),
}

impl RawCell {
    /// Blank (or whitespace-only text).
    pub fn is_blank(&self) -> bool {
        match self {
            RawCell::Empty => true,
            RawCell::Text(t) => t.trim().is_empty(),
            _ => false,
        }
    }
    /// The cell as header / key text.
    pub fn as_text(&self) -> String {
        match self {
            RawCell::Empty => String::new(),
            RawCell::Text(t) | RawCell::DateIso(t) => t.clone(),
            RawCell::Number(v) => format_number(*v),
            RawCell::Bool(b) => b.to_string(),
            RawCell::Date { serial, .. } => format_number(*serial),
            RawCell::Error(e) => e.clone(),
            RawCell::FormulaNoValue(_) => String::new(),
        }
    }
}

/// A number as a person would type it (100.0 → "100").
pub fn format_number(v: f64) -> String {
    if v.fract() == 0.0 && v.abs() < 1e15 {
        format!("{}", v as i64)
    } else {
        format!("{v}")
    }
}

/// One row: its spreadsheet row number (1-based) and its non-empty cells by 0-based column.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct RawRow {
    /// Row a person sees (1-based).
    pub row: usize,
    /// (0-based column, cell), ascending by column.
    pub cells: Vec<(usize, RawCell)>,
}

/// Limits enforced while reading, before anything large is allocated. The defaults allow a
/// national stock of two million buildings (about 1.5 GB of typed records) and refuse
/// anything larger with the numbers in the message; `.xls`/`.ods` sheets, which the
/// spreadsheet library expands into a dense grid, are held to ten million grid cells.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Budget {
    /// Largest file accepted (bytes).
    pub max_file_bytes: u64,
    /// Largest total uncompressed size of a workbook's zip entries (bytes).
    pub max_uncompressed_bytes: u64,
    /// Largest compression ratio of a zip entry above 1 MiB (zip-bomb guard).
    pub max_compression_ratio: u64,
    /// Largest uncompressed shared-strings part of an .xlsx (it is held in memory).
    pub max_shared_strings_bytes: u64,
    /// Most non-empty cells read from one file.
    pub max_cells: u64,
    /// Most data rows in one sheet.
    pub max_rows: u64,
    /// Most cells of a dense sheet grid, and of all grids of one file together (.xls/.ods
    /// are read whole, every sheet at once, not streamed).
    pub max_dense_cells: u64,
    /// Largest .xls / .ods file (read whole into memory).
    pub max_dense_file_bytes: u64,
}

impl Default for Budget {
    fn default() -> Self {
        Self {
            max_file_bytes: 2 << 30,
            max_uncompressed_bytes: 4 << 30,
            max_compression_ratio: 1000,
            max_shared_strings_bytes: 512 << 20,
            max_cells: 100_000_000,
            max_rows: 2_000_000,
            max_dense_cells: 10_000_000,
            max_dense_file_bytes: 256 << 20,
        }
    }
}

/// Running count of cells against the budget.
#[derive(Debug, Clone)]
pub struct CellCounter {
    /// Cells read so far.
    pub cells: u64,
    /// Limit.
    pub max: u64,
    /// File (for messages).
    pub path: String,
}

impl CellCounter {
    /// Counts one more non-empty cell; refuses above the budget.
    pub fn count(&mut self) -> Result<(), InputError> {
        self.cells += 1;
        if self.cells > self.max {
            return Err(InputError::TooLarge {
                path: self.path.clone(),
                message: format!(
                    "more than {} non-empty cells (the cell budget); split the inventory",
                    self.max
                ),
            });
        }
        Ok(())
    }
}

/// A data row in canonical column order (one cell per column of the sheet spec).
#[derive(Debug, Clone, Default)]
pub struct DataRow {
    /// Row a person sees.
    pub row: usize,
    /// Cells, one per column of the spec (Empty where the column is absent).
    pub cells: Vec<RawCell>,
    /// Per column of the spec, the factor from the header's unit to the canonical unit
    /// (shared by every row of the sheet; empty or missing = 1, the canonical unit).
    pub scale: std::sync::Arc<[super::columns::Factor]>,
}

enum State {
    Searching(Vec<RawRow>),
    Data(HeaderMap),
}

/// Per-sheet state machine: header row, column map, blank rows, data rows.
pub struct SheetReader<'s> {
    spec: &'static SheetSpec,
    /// Sheet name as found in the file (for messages).
    pub sheet: String,
    header_row: Option<usize>,
    state: State,
    /// The header row found (1-based), once known.
    pub found_header_row: Option<usize>,
    last_row: usize,
    pending_blank: usize,
    /// Blank rows between data rows.
    pub blank_rows: usize,
    /// Non-blank data rows.
    pub data_rows: u64,
    max_rows: u64,
    path: String,
    /// Problems of the sheet as a whole (header, unknown columns, stray cells).
    pub problems: Vec<Problem>,
    consumer: Box<dyn FnMut(DataRow) + 's>,
    /// Spec position of each 0-based sheet column (None = not a known column).
    slots: Vec<Option<usize>>,
    /// Header-unit factor per spec column.
    scale: std::sync::Arc<[super::columns::Factor]>,
    /// A fatal problem of the header (a required column missing or unusable): one line.
    fatal: Option<String>,
}

impl<'s> SheetReader<'s> {
    /// A reader for one sheet; `header_row` = `--header-row`.
    pub fn new(
        spec: &'static SheetSpec,
        sheet: &str,
        header_row: Option<usize>,
        budget: &Budget,
        path: &str,
        consumer: impl FnMut(DataRow) + 's,
    ) -> Self {
        Self {
            spec,
            sheet: sheet.to_string(),
            header_row,
            state: State::Searching(Vec::new()),
            found_header_row: None,
            last_row: 0,
            pending_blank: 0,
            blank_rows: 0,
            data_rows: 0,
            max_rows: budget.max_rows,
            path: path.to_string(),
            problems: Vec::new(),
            consumer: Box::new(consumer),
            slots: Vec::new(),
            scale: std::sync::Arc::from(Vec::new()),
            fatal: None,
        }
    }

    fn sheet_problem(&mut self, row: Option<usize>, message: String, severity: Severity) {
        self.problems.push(Problem {
            sheet: self.spec.name.to_string(),
            row,
            column: String::new(),
            message,
            severity,
        });
    }

    fn fatal_error(&self, message: &str) -> InputError {
        InputError::MissingColumns {
            path: self.path.clone(),
            sheet: self.sheet.clone(),
            message: message.to_string(),
        }
    }

    /// The 0-based sheet column holding the spec column `name`, once the header is known
    /// and usable (`None` before, or when the header is refused).
    pub fn column_of(&self, name: &str) -> Option<usize> {
        if self.fatal.is_some() || !matches!(self.state, State::Data(_)) {
            return None;
        }
        let pos = self.spec.columns.iter().position(|c| c.name == name)?;
        self.slots.iter().position(|s| *s == Some(pos))
    }

    /// Whether the header was refused (the next [`Self::push`] or [`Self::finish`] fails).
    pub fn is_fatal(&self) -> bool {
        self.fatal.is_some()
    }

    /// Feeds the next row (rows arrive in ascending order; absent rows are blank).
    pub fn push(&mut self, row: RawRow) -> Result<(), InputError> {
        if let Some(f) = &self.fatal {
            return Err(self.fatal_error(f));
        }
        match &mut self.state {
            State::Searching(buf) => {
                if let Some(h) = self.header_row {
                    if row.row == h {
                        self.take_header(row);
                    } else if row.row > h {
                        // The header row was blank.
                        self.take_header(RawRow {
                            row: h,
                            cells: Vec::new(),
                        });
                        return self.push(row);
                    }
                    return Ok(());
                }
                if row.cells.iter().all(|(_, c)| c.is_blank()) {
                    return Ok(());
                }
                let map = map_headers(self.spec, &header_texts(&row));
                if map.missing_required.is_empty() && map.score() > 0 {
                    self.take_header(row);
                    return Ok(());
                }
                buf.push(row);
                if buf.len() >= HEADER_SCAN_ROWS {
                    self.settle_best()?;
                }
                Ok(())
            }
            State::Data(_) => self.data(row),
        }
    }

    /// Picks the buffered row with the most canonical names as header and replays the rest.
    fn settle_best(&mut self) -> Result<(), InputError> {
        let State::Searching(buf) = &mut self.state else {
            return Ok(());
        };
        let buf = std::mem::take(buf);
        let best = buf
            .iter()
            .enumerate()
            .map(|(i, r)| (i, map_headers(self.spec, &header_texts(r)).score()))
            .filter(|(_, s)| *s > 0)
            .max_by(|a, b| a.1.cmp(&b.1).then(b.0.cmp(&a.0)));
        match best {
            Some((i, _)) => {
                let mut rest = buf.into_iter().skip(i);
                if let Some(h) = rest.next() {
                    self.take_header(h);
                }
                for r in rest {
                    self.data(r)?;
                }
            }
            None => {
                self.state = State::Data(HeaderMap::default());
                let req = self.spec.required_names().join(", ");
                let message = format!(
                    "expected a header row naming the columns ({req}) within the first {HEADER_SCAN_ROWS} rows, found none; use --header-row N if it is further down"
                );
                if self.spec.required {
                    self.fatal = Some(message);
                } else {
                    self.sheet_problem(None, message, Severity::Error);
                }
            }
        }
        Ok(())
    }

    fn take_header(&mut self, row: RawRow) {
        let map = map_headers(self.spec, &header_texts(&row));
        self.found_header_row = Some(row.row);
        self.last_row = row.row;
        if !map.unknown.is_empty() {
            let names = map
                .unknown
                .iter()
                .map(|n| format!("\"{n}\""))
                .collect::<Vec<_>>()
                .join(", ");
            self.sheet_problem(
                Some(row.row),
                format!("columns not in the inventory format, kept and ignored: {names}"),
                Severity::Warning,
            );
        }
        for (name, texts) in &map.duplicates {
            let t = texts.join("\", \"");
            self.sheet_problem(
                Some(row.row),
                format!("columns \"{t}\" all mean {name}; the first one is used"),
                Severity::Warning,
            );
        }
        for (_, _, note) in &map.conversions {
            self.sheet_problem(Some(row.row), note.clone(), Severity::Warning);
        }
        for (name, e) in &map.unit_errors {
            if !map.missing_required.contains(name) {
                self.problems.push(Problem {
                    sheet: self.spec.name.to_string(),
                    row: Some(row.row),
                    column: (*name).to_string(),
                    message: e.clone(),
                    severity: Severity::Error,
                });
            }
        }
        if !map.missing_required.is_empty() {
            let m = map.missing_required.join(", ");
            let why: Vec<&str> = map
                .unit_errors
                .iter()
                .filter(|(n, _)| map.missing_required.contains(n))
                .map(|(_, e)| e.as_str())
                .collect();
            let found = header_texts(&row)
                .into_iter()
                .map(|(_, t)| t.trim().to_string())
                .filter(|t| !t.is_empty())
                .map(|t| format!("\"{t}\""))
                .collect::<Vec<_>>()
                .join(", ");
            self.fatal = Some(if why.is_empty() {
                format!(
                    "the required column(s) {m} are missing from the header row (row {}; found {}); add them (names and units: `seistriage template`)",
                    row.row,
                    if found.is_empty() {
                        "no names".to_string()
                    } else {
                        found
                    }
                )
            } else {
                format!(
                    "the required column(s) {m} cannot be used (header row {}): {}",
                    row.row,
                    why.join("; ")
                )
            });
        }
        let scale: Vec<super::columns::Factor> = self
            .spec
            .columns
            .iter()
            .map(|c| map.factor(c.name))
            .collect();
        self.scale = std::sync::Arc::from(scale);
        let width = map.matched.iter().map(|(i, _)| i + 1).max().unwrap_or(0);
        let mut slots = vec![None; width];
        for (i, name) in &map.matched {
            if let Some(slot) = slots.get_mut(*i) {
                *slot = self.spec.columns.iter().position(|c| c.name == *name);
            }
        }
        self.slots = slots;
        self.state = State::Data(map);
    }

    fn data(&mut self, row: RawRow) -> Result<(), InputError> {
        let State::Data(_) = &self.state else {
            return Ok(());
        };
        let gap = row.row.saturating_sub(self.last_row).saturating_sub(1);
        self.last_row = self.last_row.max(row.row);
        let mut cells = vec![RawCell::Empty; self.spec.columns.len()];
        let mut any_known = false;
        let mut any_other = None;
        for (col, cell) in row.cells {
            if cell.is_blank() {
                continue;
            }
            match self.slots.get(col).copied().flatten() {
                Some(pos) => {
                    if let Some(slot) = cells.get_mut(pos) {
                        *slot = cell;
                        any_known = true;
                    }
                }
                None => {
                    if any_other.is_none() {
                        any_other = Some(col);
                    }
                }
            }
        }
        if !any_known {
            self.pending_blank += gap + 1;
            if let Some(col) = any_other {
                let at = format!("{}{}", column_letters(col), row.row);
                self.sheet_problem(
                    Some(row.row),
                    format!("values only outside the known columns (first at {at}); the row is skipped as blank"),
                    Severity::Warning,
                );
            }
            return Ok(());
        }
        self.blank_rows += self.pending_blank + gap;
        self.pending_blank = 0;
        self.data_rows += 1;
        if self.data_rows > self.max_rows {
            return Err(InputError::TooLarge {
                path: self.path.clone(),
                message: format!(
                    "sheet {} has more than {} data rows (the row budget); split the inventory",
                    self.sheet, self.max_rows
                ),
            });
        }
        (self.consumer)(DataRow {
            row: row.row,
            cells,
            scale: self.scale.clone(),
        });
        Ok(())
    }

    /// Ends the sheet.
    pub fn finish(mut self) -> Result<SheetSummary, InputError> {
        if let State::Searching(buf) = &self.state {
            if self.header_row.is_some() || buf.is_empty() {
                let message = if let Some(h) = self.header_row {
                    format!(
                        "expected the header row at row {h} (--header-row), found the sheet ends before it"
                    )
                } else {
                    "expected a header row and data, found an empty sheet".to_string()
                };
                if self.spec.required {
                    return Err(self.fatal_error(&message));
                }
                self.sheet_problem(self.header_row, message, Severity::Error);
            } else {
                self.settle_best()?;
            }
        }
        if let Some(f) = &self.fatal {
            return Err(self.fatal_error(f));
        }
        let missing = match &self.state {
            State::Data(m) => m.missing_required.clone(),
            State::Searching(_) => self.spec.required_names(),
        };
        Ok(SheetSummary {
            header_row: self.found_header_row,
            blank_rows: self.blank_rows,
            problems: self.problems,
            missing_required: missing,
        })
    }
}

/// What a finished sheet tells the caller.
#[derive(Debug, Clone)]
pub struct SheetSummary {
    /// Header row found.
    pub header_row: Option<usize>,
    /// Blank rows between data rows.
    pub blank_rows: usize,
    /// Sheet-level problems.
    pub problems: Vec<Problem>,
    /// Required columns not found.
    pub missing_required: Vec<&'static str>,
}

fn header_texts(row: &RawRow) -> Vec<(usize, String)> {
    row.cells.iter().map(|(i, c)| (*i, c.as_text())).collect()
}

/// Spreadsheet column letters of a 0-based index (0 → A, 16383 → XFD).
pub fn column_letters(mut col: usize) -> String {
    let mut out = Vec::new();
    loop {
        out.push(b'A' + (col % 26) as u8);
        if col < 26 {
            break;
        }
        col = col / 26 - 1;
    }
    out.reverse();
    String::from_utf8(out).unwrap_or_default()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn column_letters_match_spreadsheets() {
        assert_eq!(column_letters(0), "A");
        assert_eq!(column_letters(25), "Z");
        assert_eq!(column_letters(26), "AA");
        assert_eq!(column_letters(16383), "XFD");
    }
}
