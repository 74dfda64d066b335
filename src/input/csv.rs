/*!
CSV source via the csv crate: delimiter sniffed from the first non-blank line (`,`, `;` or
tab; with `;` a decimal comma is accepted in numbers), UTF-8 BOM stripped, CRLF or LF line
ends, text that is not UTF-8 read as Windows-1252 with a warning. Row numbers are the
record numbers a person sees when opening the file in a spreadsheet (header = 1, blank lines
counted).
*/

use std::io::Read;
use std::path::Path;

use super::InputError;
use super::raw::{Budget, CellCounter, HEADER_SCAN_ROWS, MAX_CELL_CHARS, RawCell, RawRow};

/// What the CSV source found out about the file.
#[derive(Debug, Clone, Default)]
pub struct CsvInfo {
    /// The delimiter used.
    pub delimiter: u8,
    /// Numbers may use a decimal comma (`;`-delimited files).
    pub decimal_comma: bool,
    /// The file was not UTF-8 and was decoded as Windows-1252.
    pub windows_1252: bool,
    /// The head of the file is not UTF-8: every field is read as Windows-1252.
    whole_1252: bool,
}

fn unreadable(path: &str, message: impl std::fmt::Display) -> InputError {
    InputError::Unreadable {
        path: path.to_string(),
        message: message.to_string(),
    }
}

/// The delimiter of a CSV text, sniffed from its first non-blank line (BOM ignored).
pub fn delimiter_of(text: &[u8]) -> u8 {
    sniff_delimiter(text.strip_prefix(b"\xEF\xBB\xBF").unwrap_or(text))
}

fn sniff_delimiter(text: &[u8]) -> u8 {
    // Count candidates outside quotes over the first lines (title lines above the header
    // hold none, so one line alone can mislead).
    let mut counts = [0usize; 3];
    for line in text.split(|b| *b == b'\n').take(HEADER_SCAN_ROWS) {
        let mut quoted = false;
        for b in line {
            match b {
                b'"' => quoted = !quoted,
                b',' if !quoted => counts[0] += 1,
                b';' if !quoted => counts[1] += 1,
                b'\t' if !quoted => counts[2] += 1,
                _ => {}
            }
        }
    }
    if counts[1] > counts[0] && counts[1] >= counts[2] {
        b';'
    } else if counts[2] > counts[0] && counts[2] > counts[1] {
        b'\t'
    } else {
        b','
    }
}

/// Whether a head of a file is UTF-8 (a multi-byte sequence cut at the end is allowed).
fn head_is_utf8(head: &[u8]) -> bool {
    match std::str::from_utf8(head) {
        Ok(_) => true,
        Err(e) => e.error_len().is_none(),
    }
}

/// Reads a CSV file row by row into `sink`, streaming (the file is never held whole).
pub fn read_csv(
    path: &Path,
    budget: &Budget,
    counter: &mut CellCounter,
    sink: &mut super::spreadsheet::RowSink<'_>,
) -> Result<CsvInfo, InputError> {
    let mut truncated = Vec::new();
    scan_records(path, budget, &mut |person_row, record, info| {
        let mut row = RawRow {
            row: person_row,
            cells: Vec::new(),
        };
        truncated.clear();
        for (col, field) in record.iter().enumerate() {
            let Some(s) = cell_text(field, info) else {
                continue;
            };
            let (s, cut) = s.capped();
            if cut {
                truncated.push(col);
            }
            counter.count()?;
            row.cells.push((col, RawCell::Text(s)));
        }
        if !row.cells.is_empty() {
            sink(row, &truncated)?;
        }
        Ok(Flow::More)
    })
}

/// Whether [`scan_records`] goes on after a record.
pub(crate) enum Flow {
    More,
    Stop,
}

/// A field's text as the reader keeps it: `None` when blank (only spaces), Windows-1252
/// decoded when the file (or this field) is not UTF-8 (noted in `info`).
fn cell_text<'f>(field: &'f [u8], info: &mut CsvInfo) -> Option<Cell<'f>> {
    let s = match std::str::from_utf8(field) {
        Ok(t) if !info.whole_1252 => std::borrow::Cow::Borrowed(t),
        _ => {
            info.windows_1252 = true;
            encoding_rs::WINDOWS_1252
                .decode_without_bom_handling(field)
                .0
        }
    };
    (!s.trim().is_empty()).then_some(Cell(s))
}

/// A non-blank field's text.
struct Cell<'f>(std::borrow::Cow<'f, str>);

impl Cell<'_> {
    /// Cut to [`MAX_CELL_CHARS`] characters (and whether it was cut), owned.
    fn capped(self) -> (String, bool) {
        if self.0.chars().count() > MAX_CELL_CHARS {
            (self.0.chars().take(MAX_CELL_CHARS).collect(), true)
        } else {
            (self.0.into_owned(), false)
        }
    }

    /// The same cut, borrowed where no cut is needed.
    fn capped_str(&self) -> std::borrow::Cow<'_, str> {
        match self.0.char_indices().nth(MAX_CELL_CHARS) {
            Some((at, _)) => std::borrow::Cow::Borrowed(&self.0[..at]),
            None => std::borrow::Cow::Borrowed(&self.0),
        }
    }
}

/// Opens a CSV file (size budget, binary content refused, delimiter sniffed, BOM skipped)
/// and hands every record to `on_record` with the row number a person sees (blank lines
/// counted), in one reused [`csv::ByteRecord`].
pub(crate) fn scan_records(
    path: &Path,
    budget: &Budget,
    on_record: &mut dyn FnMut(usize, &csv::ByteRecord, &mut CsvInfo) -> Result<Flow, InputError>,
) -> Result<CsvInfo, InputError> {
    let p = path.display().to_string();
    let meta = std::fs::metadata(path).map_err(|e| unreadable(&p, e))?;
    if meta.len() > budget.max_file_bytes {
        return Err(InputError::TooLarge {
            path: p,
            message: format!(
                "the file has {} bytes, more than the budget of {} bytes",
                meta.len(),
                budget.max_file_bytes
            ),
        });
    }
    let mut file = std::fs::File::open(path).map_err(|e| unreadable(&p, e))?;
    let mut head = Vec::new();
    (&mut file)
        .take(64 * 1024)
        .read_to_end(&mut head)
        .map_err(|e| unreadable(&p, e))?;
    if head.iter().take(8192).any(|b| *b == 0) {
        return Err(unreadable(
            &p,
            "not a CSV text file (binary content); give a .csv, .xlsx, .xlsm, .xls or .ods inventory",
        ));
    }
    let bom = head.starts_with(b"\xEF\xBB\xBF");
    let body_head = if bom {
        head.get(3..).unwrap_or(&[])
    } else {
        &head[..]
    };
    let mut info = CsvInfo {
        delimiter: sniff_delimiter(body_head),
        ..Default::default()
    };
    info.decimal_comma = info.delimiter == b';';
    info.whole_1252 = !head_is_utf8(body_head);
    drop(file);
    let file = std::fs::File::open(path).map_err(|e| unreadable(&p, e))?;
    let body =
        std::io::BufReader::with_capacity(1 << 16, file).bytes_after(if bom { 3 } else { 0 });
    let mut rdr = csv::ReaderBuilder::new()
        .has_headers(false)
        .flexible(true)
        .delimiter(info.delimiter)
        .from_reader(body);
    let mut record = csv::ByteRecord::new();
    let mut person_row = 0usize;
    let mut prev_end_line = 1u64;
    loop {
        let more = rdr
            .read_byte_record(&mut record)
            .map_err(|e| unreadable(&p, format!("CSV cannot be read: {e}")))?;
        if !more {
            break;
        }
        // The csv crate skips blank lines silently. The line a record starts on follows from
        // where reading stopped after it, less the line ends inside its quoted fields; the
        // lines between the end of the previous record and that start are blank rows.
        let end = rdr.position();
        let inner = record.as_slice().iter().filter(|b| **b == b'\n').count() as u64;
        // The csv crate counts a line end at the end of the file too, so every record ends
        // one line further on.
        let terminator = 1;
        let first_line = end.line().saturating_sub(inner + terminator);
        let blanks = first_line.saturating_sub(prev_end_line);
        prev_end_line = end.line();
        person_row += blanks as usize + 1;
        if let Flow::Stop = on_record(person_row, &record, &mut info)? {
            break;
        }
    }
    Ok(info)
}

/// The first pass of the streaming path: every building row's id with its row number, in
/// file order, reading only the id column once the header is known (one reused
/// [`csv::ByteRecord`], no row parsed or validated). The header is found, and rows before
/// it are read, exactly as [`read_csv`] with the buildings sheet's reader does, so the ids
/// and row numbers are the ones the chunked read validates (trimmed text, cut to
/// [`MAX_CELL_CHARS`] characters, Windows-1252 decoded when the file is not UTF-8). A header
/// problem is the same error as in the full read.
pub fn read_ids(
    path: &Path,
    header_row: Option<usize>,
    budget: &Budget,
    on_id: &mut dyn FnMut(&str, usize),
) -> Result<(), InputError> {
    use super::columns::BUILDINGS;
    let p = path.display().to_string();
    let early: std::cell::RefCell<Vec<(String, usize)>> = std::cell::RefCell::new(Vec::new());
    let id_slot = BUILDINGS
        .columns
        .iter()
        .position(|c| c.name == "id")
        .unwrap_or(0);
    let mut reader = super::raw::SheetReader::new(
        &BUILDINGS,
        BUILDINGS.name,
        header_row,
        budget,
        &p,
        |row: super::raw::DataRow| {
            if let Some(RawCell::Text(t)) = row.cells.get(id_slot) {
                let t = t.trim();
                if !t.is_empty() {
                    early.borrow_mut().push((t.to_string(), row.row));
                }
            }
        },
    );
    let mut counter = CellCounter {
        cells: 0,
        max: budget.max_cells,
        path: p.clone(),
    };
    // Until the header is known: rows as `read_csv` gives them, through the sheet reader.
    let mut id_col = None;
    let mut rest_from = 0usize;
    scan_records(path, budget, &mut |person_row, record, info| {
        let mut row = RawRow {
            row: person_row,
            cells: Vec::new(),
        };
        for (col, field) in record.iter().enumerate() {
            if let Some(s) = cell_text(field, info) {
                counter.count()?;
                row.cells.push((col, RawCell::Text(s.capped().0)));
            }
        }
        if !row.cells.is_empty() {
            reader.push(row)?;
        }
        id_col = reader.column_of("id");
        rest_from = person_row;
        Ok(if id_col.is_some() || reader.is_fatal() {
            Flow::Stop
        } else {
            Flow::More
        })
    })?;
    let Some(col) = id_col else {
        // The file ended before the header was settled (a short file: its rows are replayed
        // now), or the header is unusable (the same error as the full read).
        reader.finish()?;
        for (id, row) in early.take() {
            on_id(&id, row);
        }
        return Ok(());
    };
    drop(reader);
    for (id, row) in early.take() {
        on_id(&id, row);
    }
    // After the header: the id field alone.
    scan_records(path, budget, &mut |person_row, record, info| {
        if person_row > rest_from
            && let Some(field) = record.get(col)
            && let Some(text) = cell_text(field, info)
        {
            let id = text.capped_str();
            on_id(id.trim(), person_row);
        }
        Ok(Flow::More)
    })?;
    Ok(())
}

/// Skips the first `n` bytes of a reader (the BOM).
trait BytesAfter: Read + Sized {
    fn bytes_after(self, n: u64) -> SkipReader<Self> {
        SkipReader {
            inner: self,
            skip: n,
        }
    }
}
impl<R: Read> BytesAfter for R {}

/// A reader that drops its first `skip` bytes.
struct SkipReader<R> {
    inner: R,
    skip: u64,
}

impl<R: Read> Read for SkipReader<R> {
    fn read(&mut self, buf: &mut [u8]) -> std::io::Result<usize> {
        while self.skip > 0 {
            let mut tmp = [0u8; 8];
            let want = usize::try_from(self.skip.min(8)).unwrap_or(8);
            let n = self.inner.read(&mut tmp[..want])?;
            if n == 0 {
                return Ok(0);
            }
            self.skip -= n as u64;
        }
        self.inner.read(buf)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn delimiter_is_sniffed_from_the_header_line() {
        assert_eq!(sniff_delimiter(b"id;storeys;plan_area_m2\n1;2;3,5\n"), b';');
        assert_eq!(sniff_delimiter(b"id,storeys\n"), b',');
        assert_eq!(sniff_delimiter(b"\n\nid\tstoreys\n"), b'\t');
        assert_eq!(sniff_delimiter(b"\"a;b\",c,d\n"), b',');
        assert_eq!(
            sniff_delimiter(b"Title, with a comma\n\nid;storeys;plan_area_m2\nA;3;2,5\n"),
            b';'
        );
    }
}
