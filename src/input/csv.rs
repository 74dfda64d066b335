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
use super::raw::{Budget, CellCounter, MAX_CELL_CHARS, RawCell, RawRow};

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
    let line = text
        .split(|b| *b == b'\n')
        .find(|l| {
            l.iter()
                .any(|b| !b.is_ascii_whitespace() && *b != b',' && *b != b';')
        })
        .unwrap_or(&[]);
    let mut counts = [0usize; 3];
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
    if counts[1] > counts[0] && counts[1] >= counts[2] {
        b';'
    } else if counts[2] > counts[0] && counts[2] > counts[1] {
        b'\t'
    } else {
        b','
    }
}

/// Reads a CSV file row by row into `sink`.
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
    let mut bytes = Vec::new();
    std::fs::File::open(path)
        .and_then(|mut f| f.read_to_end(&mut bytes))
        .map_err(|e| unreadable(&p, e))?;
    if bytes.iter().take(8192).any(|b| *b == 0) {
        return Err(unreadable(
            &p,
            "not a CSV text file (binary content); give a .csv, .xlsx, .xlsm, .xls or .ods inventory",
        ));
    }
    let mut info = CsvInfo::default();
    let text: Vec<u8> = match std::str::from_utf8(&bytes) {
        Ok(_) => bytes,
        Err(_) => {
            info.windows_1252 = true;
            let (cow, _, _) = encoding_rs::WINDOWS_1252.decode(&bytes);
            cow.into_owned().into_bytes()
        }
    };
    let body = text.strip_prefix(b"\xEF\xBB\xBF").unwrap_or(&text);
    info.delimiter = sniff_delimiter(body);
    info.decimal_comma = info.delimiter == b';';
    let mut rdr = csv::ReaderBuilder::new()
        .has_headers(false)
        .flexible(true)
        .delimiter(info.delimiter)
        .from_reader(body);
    let mut record = csv::ByteRecord::new();
    let mut person_row = 0usize;
    loop {
        let more = rdr
            .read_byte_record(&mut record)
            .map_err(|e| unreadable(&p, format!("CSV cannot be read: {e}")))?;
        if !more {
            break;
        }
        // The csv crate skips blank lines silently; a record's position is where reading
        // started, so the line ends just before its first byte are the blank lines above it.
        let start = record
            .position()
            .map(|pos| pos.byte() as usize)
            .unwrap_or(0);
        let lead = body.get(start..).unwrap_or(&[]);
        let run = lead.iter().take_while(|b| matches!(b, b'\r' | b'\n'));
        let mut blanks = run.filter(|b| **b == b'\n').count();
        let glued =
            start > 0 && body.get(start - 1) == Some(&b'\r') && lead.first() == Some(&b'\n');
        if glued {
            blanks = blanks.saturating_sub(1);
        }
        person_row += blanks + 1;
        let mut row = RawRow {
            row: person_row,
            cells: Vec::new(),
        };
        let mut truncated = Vec::new();
        for (col, field) in record.iter().enumerate() {
            let mut s = String::from_utf8_lossy(field).into_owned();
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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn delimiter_is_sniffed_from_the_header_line() {
        assert_eq!(sniff_delimiter(b"id;storeys;plan_area_m2\n1;2;3,5\n"), b';');
        assert_eq!(sniff_delimiter(b"id,storeys\n"), b',');
        assert_eq!(sniff_delimiter(b"\n\nid\tstoreys\n"), b'\t');
        assert_eq!(sniff_delimiter(b"\"a;b\",c,d\n"), b',');
    }
}
