/*!
When `screen` takes the large-stock path, and its first pass. A `.csv` inventory with no
sibling sheet files (`<stem>.walls.csv`, …) and more lines than a threshold
([`STREAM_FROM_ROWS`], overridable with the `SEISTRIAGE_STREAM_FROM` environment variable for
tests) is screened in chunks of [`CHUNK_ROWS`] rows through the one screening flow
([`crate::pipeline::run`] with [`crate::pipeline::Source::CsvChunks`]) and the large-stock
sinks ([`crate::pipeline::sinks`]): bounded memory instead of holding every record and every
full result. Before the chunks, [`repeated_ids`] finds the ids on more than one row, so that
a repeated id is refused on every one of its rows as in the whole-file read.
*/

use std::collections::HashMap;
use std::fs::File;
use std::io::Read;
use std::path::Path;

use crate::input::{self, InputError};
use crate::report::workbook;

/// Inventories with more lines than this are screened on the streaming path: from here on
/// the Directions sheet (two rows per building plus its header) would pass the sheet row
/// limit (lines count the header: 524,288 lines = 524,287 buildings still fit), so interface.md's large-stock rule sends the per-row tables to CSV files anyway
/// and the streamed outputs have the same shape as the whole-stock path's. Below it the
/// whole-stock path keeps every table in the workbook (at the cost of memory that grows
/// with the stock: about 0.63 GB at 100,000 buildings).
pub const STREAM_FROM_ROWS: usize = workbook::SHEET_ROWS / 2;

/// Rows per chunk.
pub const CHUNK_ROWS: usize = 20_000;

/// Environment variable that overrides [`STREAM_FROM_ROWS`] (tests).
pub const STREAM_FROM_ENV: &str = "SEISTRIAGE_STREAM_FROM";

/// Environment variable that overrides [`CHUNK_ROWS`] (tests, to cross chunk boundaries).
pub const CHUNK_ENV: &str = "SEISTRIAGE_STREAM_CHUNK";

/// Rows per chunk in force: [`CHUNK_ENV`] when set to a positive number, else [`CHUNK_ROWS`].
pub fn chunk_rows() -> usize {
    std::env::var(CHUNK_ENV)
        .ok()
        .and_then(|v| v.trim().parse().ok())
        .filter(|n| *n > 0)
        .unwrap_or(CHUNK_ROWS)
}

/// The threshold in force: [`STREAM_FROM_ENV`] when set to a number, else
/// [`STREAM_FROM_ROWS`].
pub fn threshold() -> usize {
    std::env::var(STREAM_FROM_ENV)
        .ok()
        .and_then(|v| v.trim().parse().ok())
        .unwrap_or(STREAM_FROM_ROWS)
}

/// Whether `path` is screened on the streaming path: a `.csv` file with no sibling sheet
/// files and more lines than `from_rows` (lines, counted without parsing: the header and any
/// blank lines count too, so this is a cheap upper bound of the data rows).
pub fn applies(path: &Path, from_rows: usize) -> bool {
    let is_csv = path
        .extension()
        .is_some_and(|e| e.to_string_lossy().eq_ignore_ascii_case("csv"));
    if !is_csv || input::csv_has_siblings(path) {
        return false;
    }
    let Ok(mut f) = File::open(path) else {
        return false;
    };
    let mut buf = vec![0u8; 1 << 16];
    let mut lines = 0usize;
    loop {
        match f.read(&mut buf) {
            Ok(0) | Err(_) => break,
            Ok(n) => {
                lines += buf.iter().take(n).filter(|b| **b == b'\n').count();
                if lines > from_rows {
                    return true;
                }
            }
        }
    }
    false
}

/// Step 1: the ids on more than one building row of a CSV stock → their rows (ascending),
/// from a pass that reads only the id column ([`input::csv::read_ids`]; the rows and their
/// numbers are those the chunked read validates). Every id's first row is kept in one map;
/// only a repeated id gets a list.
pub fn repeated_ids(
    path: &Path,
    read: &input::ReadOptions,
) -> Result<HashMap<String, Vec<usize>>, InputError> {
    let mut first: HashMap<Box<str>, usize> = HashMap::new();
    let mut duplicates: HashMap<String, Vec<usize>> = HashMap::new();
    input::csv::read_ids(path, read.header_row, &read.budget, &mut |id, row| {
        if id.is_empty() {
            return;
        }
        match first.get(id) {
            Some(&at) => duplicates
                .entry(id.to_string())
                .or_insert_with(|| vec![at])
                .push(row),
            None => {
                first.insert(Box::from(id), row);
            }
        }
    })?;
    for rows in duplicates.values_mut() {
        rows.sort_unstable();
    }
    duplicates.shrink_to_fit();
    Ok(duplicates)
}

#[cfg(test)]
mod tests {
    #![allow(clippy::unwrap_used, clippy::expect_used)]

    use super::*;

    /// The first pass as it was before the ids-only reader: the whole chunked read
    /// (every row parsed and validated), ids of accepted and refused rows alike.
    fn ids_of_full_read(
        path: &Path,
        read: &input::ReadOptions,
    ) -> Result<HashMap<String, Vec<usize>>, InputError> {
        let mut all: HashMap<String, Vec<usize>> = HashMap::new();
        input::read_csv_chunks(path, read, 7, &HashMap::new(), &mut |inv| {
            for (id, row) in inv
                .buildings
                .iter()
                .map(|b| (&b.id, b.row))
                .chain(inv.not_screened.iter().map(|n| (&n.id, n.row)))
            {
                if !id.is_empty() {
                    all.entry(id.clone()).or_default().push(row);
                }
            }
        })?;
        all.retain(|_, rows| rows.len() > 1);
        for rows in all.values_mut() {
            rows.sort_unstable();
        }
        Ok(all)
    }

    /// Generated rows (header first), as lines.
    fn generated(n: usize) -> Vec<String> {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("g.csv");
        crate::demo::write_generated(n, &p, 5).unwrap();
        std::fs::read_to_string(&p)
            .unwrap()
            .lines()
            .map(str::to_string)
            .collect()
    }

    fn with_id(line: &str, id: &str) -> String {
        let (_, rest) = line.split_once(',').unwrap();
        format!("{id},{rest}")
    }

    #[test]
    fn the_ids_only_pass_finds_the_rows_of_the_full_read() {
        let mut lines = generated(60);
        let id10 = lines[10].split(',').next().unwrap().to_string();
        let id20 = lines[20].split(',').next().unwrap().to_string();
        // The id of row 10 three times (once with spaces around it, once on a row that
        // cannot be screened), the id of row 20 twice, one row with its name spanning two
        // lines (quoted), one with a blank id, blank lines, and two title lines above the
        // header.
        let header: Vec<String> = lines[0].split(',').map(str::to_string).collect();
        let storeys = header.iter().position(|h| h == "storeys").unwrap();
        let mut bad: Vec<String> = with_id(&lines[30], &id10)
            .split(',')
            .map(str::to_string)
            .collect();
        bad[storeys] = "abc".into();
        lines[30] = bad.join(",");
        lines[40] = with_id(&lines[40], &format!("\"  {id10} \""));
        lines[50] = with_id(&lines[50], &id20);
        lines[15] = with_id(&lines[15], "");
        let mut quoted: Vec<String> = lines[25].split(',').map(str::to_string).collect();
        quoted[1] = "\"two\nlines\"".into();
        lines[25] = quoted.join(",");
        lines.insert(35, String::new());
        lines.insert(0, String::new());
        lines.insert(0, "Invented stock, for a test".into());
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("stock.csv");
        std::fs::write(&p, lines.join("\n") + "\n").unwrap();
        let read = input::ReadOptions::default();
        let fast = repeated_ids(&p, &read).unwrap();
        assert_eq!(fast, ids_of_full_read(&p, &read).unwrap());
        // Person rows: two title lines (1, 2), header 3, generated line k at k + 3; the
        // blank line inserted at 35 moves the lines after it one row down.
        assert_eq!(fast.get(&id10), Some(&vec![13, 33, 44]));
        assert_eq!(fast.get(&id20), Some(&vec![23, 54]));
        assert_eq!(fast.len(), 2);
    }

    #[test]
    fn the_ids_only_pass_reads_semicolons_a_bom_and_windows_1252_like_the_full_read() {
        let lines = generated(20);
        let mut text = b"\xEF\xBB\xBF".to_vec();
        for (i, line) in lines.iter().enumerate() {
            // `;` as delimiter; decimal commas do not matter to the ids.
            let mut l = line.replace(',', ";").replace('.', ",");
            if i == 3 || i == 12 {
                l = with_id(&l.replace(';', ","), "Bloc\u{e9}-1").replace(',', ";");
            }
            let bytes = encoding_rs::WINDOWS_1252.encode(&l).0.into_owned();
            text.extend(bytes);
            text.extend(b"\r\n");
        }
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("stock.csv");
        std::fs::write(&p, &text).unwrap();
        let read = input::ReadOptions::default();
        let fast = repeated_ids(&p, &read).unwrap();
        assert_eq!(fast, ids_of_full_read(&p, &read).unwrap());
        assert_eq!(fast.get("Bloc\u{e9}-1"), Some(&vec![4, 13]));
    }

    #[test]
    fn the_ids_only_pass_honours_the_header_row_and_refuses_a_bad_header_alike() {
        let mut lines = generated(12);
        let id = lines[2].split(',').next().unwrap().to_string();
        lines[9] = with_id(&lines[9], &id);
        // A row above the header that looks like data: only --header-row tells them apart.
        lines.insert(0, lines[5].clone());
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("stock.csv");
        std::fs::write(&p, lines.join("\n") + "\n").unwrap();
        let read = input::ReadOptions {
            header_row: Some(2),
            ..Default::default()
        };
        let fast = repeated_ids(&p, &read).unwrap();
        assert_eq!(fast, ids_of_full_read(&p, &read).unwrap());
        assert_eq!(fast.get(&id), Some(&vec![4, 11]));

        // No id column: the same refusal as the full read.
        let no_id: Vec<String> = lines[1..]
            .iter()
            .map(|l| l.split_once(',').unwrap().1.to_string())
            .collect();
        std::fs::write(&p, no_id.join("\n") + "\n").unwrap();
        let read = input::ReadOptions::default();
        let fast = repeated_ids(&p, &read).unwrap_err().to_string();
        assert_eq!(fast, ids_of_full_read(&p, &read).unwrap_err().to_string());
        assert!(fast.contains("id"), "{fast}");
    }
}
