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
    sink: &mut super::xlsx::Sink<'_>,
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
    let whole_1252 = !head_is_utf8(body_head);
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
        let inner = record
            .iter()
            .map(|f| f.iter().filter(|b| **b == b'\n').count() as u64)
            .sum::<u64>();
        // The csv crate counts a line end at the end of the file too, so every record ends
        // one line further on.
        let terminator = 1;
        let first_line = end.line().saturating_sub(inner + terminator);
        let blanks = first_line.saturating_sub(prev_end_line);
        prev_end_line = end.line();
        person_row += blanks as usize + 1;
        let mut row = RawRow {
            row: person_row,
            cells: Vec::new(),
        };
        let mut truncated = Vec::new();
        for (col, field) in record.iter().enumerate() {
            let mut s = match std::str::from_utf8(field) {
                Ok(t) if !whole_1252 => t.to_string(),
                _ => {
                    info.windows_1252 = true;
                    encoding_rs::WINDOWS_1252
                        .decode_without_bom_handling(field)
                        .0
                        .into_owned()
                }
            };
            if s.trim().is_empty() {
                continue;
            }
            if s.chars().count() > MAX_CELL_CHARS {
                s = s.chars().take(MAX_CELL_CHARS).collect();
                truncated.push(col);
            }
            counter.count()?;
            row.cells.push((col, RawCell::Text(s)));
        }
        if !row.cells.is_empty() {
            sink(row, &truncated)?;
        }
    }
    Ok(info)
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
