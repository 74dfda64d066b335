//! The JSON results of `interface.md` (`--json FILE`).
//!
//! Numbers are written at full precision; non-finite numbers are written as `null` (serde_json
//! writes NaN and ±infinity as null), so the file never holds `NaN`. The document is streamed
//! to a buffered temporary file and renamed when complete; above
//! [`COMPACT_FROM`] buildings it is written compact (about 40 % smaller than indented).
//!
//! The streaming path (`crate::stream`) never holds every building's full result, so it
//! writes the same document from a [`Spill`]: while the chunks are screened, each building's
//! object is serialised (compact, by the same `Serialize` as [`write`]) to a temporary file
//! beside the output, with its offset and length kept; at the end the objects are copied in
//! rank order into the `buildings` array of a report that holds everything else
//! ([`Spill::write_document`]). Two values of a building are only known after the whole stock
//! is ranked: `rank` and `retrofit.funded` (the budget plan); they are filled in as each
//! object is copied. Below [`COMPACT_FROM`] buildings the copied objects are re-indented to
//! the layout of `serde_json`'s pretty printer, so both paths give the same bytes.

use std::fs::File;
use std::io::{self, BufWriter, Read, Seek, SeekFrom, Write};
use std::path::Path;

use super::ReportError;
use super::atomic::{TempFile, write_atomic};
use crate::results::{BuildingResult, Screening};

/// From this many buildings (exclusive) the JSON is written compact.
pub const COMPACT_FROM: usize = 100_000;

/// Whether a document of `buildings` buildings is written compact (else indented).
pub fn is_compact(buildings: usize) -> bool {
    buildings > COMPACT_FROM
}

/// Writes the report as JSON (full precision; never NaN: non-finite numbers become null).
pub fn write(report: &Screening, path: &Path) -> Result<(), ReportError> {
    let compact = is_compact(report.buildings.len());
    write_atomic(path, |w| {
        if compact {
            serde_json::to_writer(&mut *w, report)?;
        } else {
            serde_json::to_writer_pretty(&mut *w, report)?;
        }
        Ok(())
    })
}

/// One building's object as [`write`] serialises it inside `buildings`, compact, appended to
/// `out`.
pub fn building_compact(b: &BuildingResult, out: &mut Vec<u8>) -> Result<(), ReportError> {
    serde_json::to_writer(out, b)?;
    Ok(())
}

/// Indentation unit of `serde_json`'s pretty printer.
const INDENT: &[u8] = b"  ";

/// Nesting depth of a building object in the document (top-level object, then the array).
const BUILDING_DEPTH: usize = 2;

fn newline(out: &mut Vec<u8>, depth: usize) {
    out.push(b'\n');
    for _ in 0..depth {
        out.extend_from_slice(INDENT);
    }
}

/// Re-indents compact JSON (as `serde_json::to_writer` writes it: no whitespace outside
/// strings) to the layout of `serde_json::to_writer_pretty` for a value nested `depth` levels
/// deep: a newline and indentation after an opening bracket of a non-empty container, after
/// each comma and before a closing bracket; `": "` between key and value; empty containers
/// stay `[]` / `{}`. Strings are copied untouched (a quote inside a string is escaped, so
/// the state machine cannot lose its place).
fn pretty(compact: &[u8], mut depth: usize, out: &mut Vec<u8>) {
    let mut in_string = false;
    let mut escaped = false;
    let mut bytes = compact.iter().copied().peekable();
    while let Some(c) = bytes.next() {
        if in_string {
            out.push(c);
            if escaped {
                escaped = false;
            } else if c == b'\\' {
                escaped = true;
            } else if c == b'"' {
                in_string = false;
            }
            continue;
        }
        match c {
            b'"' => {
                in_string = true;
                out.push(c);
            }
            b'{' | b'[' => {
                let close = if c == b'{' { b'}' } else { b']' };
                out.push(c);
                if bytes.peek() == Some(&close) {
                    bytes.next();
                    out.push(close);
                } else {
                    depth += 1;
                    newline(out, depth);
                }
            }
            b'}' | b']' => {
                depth = depth.saturating_sub(1);
                newline(out, depth);
                out.push(c);
            }
            b',' => {
                out.push(c);
                newline(out, depth);
            }
            b':' => out.extend_from_slice(b": "),
            _ => out.push(c),
        }
    }
}

/// The byte range of the value of `key` (a quoted key followed by `:`) at its first
/// occurrence in compact JSON, up to the next `,` or `}`: for values without those bytes
/// (numbers, `true`, `false`, `null`). A quote inside a string is always escaped, so a
/// quoted name followed by `:` is a key, never text inside a value.
fn value_span(compact: &[u8], key: &[u8]) -> Option<std::ops::Range<usize>> {
    let start = compact
        .windows(key.len())
        .position(|w| w == key)
        .map(|p| p + key.len())?;
    let len = compact
        .get(start..)?
        .iter()
        .position(|c| matches!(c, b',' | b'}'))?;
    Some(start..start + len)
}

/// A building's compact object with its final `rank` and `retrofit.funded` (values that
/// are only known once the whole stock is ranked and the budget plan is made).
fn finish_building(
    compact: &[u8],
    rank: usize,
    funded: Option<bool>,
    out: &mut Vec<u8>,
) -> io::Result<()> {
    let missing = || io::Error::other("spilled building object without a rank");
    let rank_at = value_span(compact, b"\"rank\":").ok_or_else(missing)?;
    let funded_at = value_span(compact, b"\"funded\":").filter(|f| f.start > rank_at.end);
    out.extend_from_slice(compact.get(..rank_at.start).ok_or_else(missing)?);
    out.extend_from_slice(rank.to_string().as_bytes());
    match funded_at {
        Some(f) => {
            out.extend_from_slice(compact.get(rank_at.end..f.start).ok_or_else(missing)?);
            out.extend_from_slice(match funded {
                Some(true) => b"true",
                Some(false) => b"false",
                None => b"null",
            });
            out.extend_from_slice(compact.get(f.end..).ok_or_else(missing)?);
        }
        None => out.extend_from_slice(compact.get(rank_at.end..).ok_or_else(missing)?),
    }
    Ok(())
}

/// Where a spilled building goes in the document.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Placed {
    /// The number [`Spill::push`] returned for it.
    pub slot: usize,
    /// Its rank.
    pub rank: usize,
    /// Its `retrofit.funded` (ignored for a building without a retrofit).
    pub funded: Option<bool>,
}

/// Building objects spilled to a temporary file while a stock is screened in chunks, written
/// out in rank order at the end ([`Spill::write_document`]). The file is removed when the
/// spill is dropped (also on an error).
#[derive(Debug)]
pub struct Spill {
    /// The spill file, registered so that an interrupt removes it too.
    tmp: TempFile,
    w: Option<BufWriter<File>>,
    /// Offset and length of each object, by slot.
    index: Vec<(u64, u32)>,
    end: u64,
    buf: Vec<u8>,
}

impl Spill {
    /// A spill file beside `output` (a hidden temporary name in the same folder).
    pub fn create(output: &Path) -> Result<Self, ReportError> {
        let name = output
            .file_name()
            .map(|n| n.to_string_lossy().into_owned())
            .unwrap_or_default();
        let path = output.with_file_name(format!(".{name}.{}.spill", std::process::id()));
        let (tmp, file) = TempFile::create_at(path)?;
        let w = BufWriter::with_capacity(1 << 20, file);
        Ok(Spill {
            tmp,
            w: Some(w),
            index: Vec::new(),
            end: 0,
            buf: Vec::new(),
        })
    }

    /// Spills one building (its `rank` and `retrofit.funded` are replaced at the end);
    /// returns its slot.
    pub fn push(&mut self, b: &BuildingResult) -> Result<usize, ReportError> {
        self.buf.clear();
        building_compact(b, &mut self.buf)?;
        let len = u32::try_from(self.buf.len())
            .map_err(|_| io::Error::other("building object over 4 GB"))?;
        let w = self
            .w
            .as_mut()
            .ok_or_else(|| io::Error::other("spill already read"))?;
        w.write_all(&self.buf)?;
        self.index.push((self.end, len));
        self.end += u64::from(len);
        Ok(self.index.len() - 1)
    }

    /// Writes the JSON document to `path` (write-then-rename): `head` supplies every key but
    /// `buildings` (its own `buildings` must be empty), and `order` lists the spilled
    /// buildings in document (rank) order; `compact` as [`is_compact`] of their number. The
    /// same bytes as [`write`] of the whole report.
    pub fn write_document<I>(
        mut self,
        head: &Screening,
        order: I,
        compact: bool,
        path: &Path,
    ) -> Result<(), ReportError>
    where
        I: Iterator<Item = Placed>,
    {
        if !head.buildings.is_empty() {
            return Err(io::Error::other("the head of a spilled document holds buildings").into());
        }
        if let Some(mut w) = self.w.take() {
            w.flush()?;
        }
        // Unbuffered: each object is one seek and one read of exactly its bytes (a buffered
        // reader would refill its whole buffer after every seek).
        let mut reader = File::open(self.tmp.path())?;
        let index = std::mem::take(&mut self.index);
        let mut order = order;
        let mut fill = |w: &mut dyn Write| -> io::Result<()> {
            let mut raw = Vec::new();
            let mut done = Vec::new();
            let mut out = Vec::new();
            let mut first = true;
            for p in order.by_ref() {
                let &(offset, len) = index
                    .get(p.slot)
                    .ok_or_else(|| io::Error::other("unknown spill slot"))?;
                raw.resize(len as usize, 0);
                reader.seek(SeekFrom::Start(offset))?;
                reader.read_exact(&mut raw)?;
                done.clear();
                finish_building(&raw, p.rank, p.funded, &mut done)?;
                if compact {
                    if !first {
                        w.write_all(b",")?;
                    }
                    w.write_all(&done)?;
                } else {
                    out.clear();
                    if !first {
                        out.push(b',');
                    }
                    newline(&mut out, BUILDING_DEPTH);
                    pretty(&done, BUILDING_DEPTH, &mut out);
                    w.write_all(&out)?;
                }
                first = false;
            }
            if !compact && !first {
                out.clear();
                newline(&mut out, BUILDING_DEPTH - 1);
                w.write_all(&out)?;
            }
            Ok(())
        };
        write_atomic(path, |w| {
            let marker: &[u8] = if compact {
                b"\"buildings\":["
            } else {
                b"\"buildings\": ["
            };
            let mut splice = Splice {
                inner: &mut *w,
                marker,
                matched: 0,
                fill: Some(&mut fill),
            };
            if compact {
                serde_json::to_writer(&mut splice, head)?;
            } else {
                serde_json::to_writer_pretty(&mut splice, head)?;
            }
            if splice.fill.is_some() {
                return Err(io::Error::other("no buildings array in the JSON head").into());
            }
            Ok(())
        })
    }
}

impl Drop for Spill {
    /// Closes the file; the [`TempFile`] then removes it (after the fields' drop order).
    fn drop(&mut self) {
        self.w = None;
    }
}

/// What a [`Splice`] calls to write the array's elements.
type Fill<'a> = &'a mut dyn FnMut(&mut dyn Write) -> io::Result<()>;

/// A writer that passes bytes through and, right after the first occurrence of `marker`,
/// lets `fill` write (the elements of the `buildings` array, after its `[`).
struct Splice<'a, W: Write> {
    inner: W,
    marker: &'a [u8],
    matched: usize,
    fill: Option<Fill<'a>>,
}

impl<W: Write> Write for Splice<'_, W> {
    fn write(&mut self, buf: &[u8]) -> io::Result<usize> {
        if self.fill.is_none() {
            return self.inner.write(buf);
        }
        for (i, &c) in buf.iter().enumerate() {
            // The marker's first byte (a quote) occurs only at its start, so a mismatch
            // restarts the match at this byte.
            self.matched = if self.marker.get(self.matched) == Some(&c) {
                self.matched + 1
            } else {
                usize::from(self.marker.first() == Some(&c))
            };
            if self.matched == self.marker.len() {
                let (head, tail) = buf.split_at(i + 1);
                self.inner.write_all(head)?;
                if let Some(fill) = self.fill.take() {
                    fill(&mut self.inner)?;
                }
                self.inner.write_all(tail)?;
                return Ok(buf.len());
            }
        }
        self.inner.write_all(buf)?;
        Ok(buf.len())
    }

    fn flush(&mut self) -> io::Result<()> {
        self.inner.flush()
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use serde_json::json;

    /// Values with every layout case of the pretty printer: nested and empty containers,
    /// strings holding brackets, commas, colons, quotes and backslashes, numbers, literals.
    fn samples() -> Vec<serde_json::Value> {
        vec![
            json!({"a": 1, "b": [1, 2.5, -3e-7], "c": {}, "d": [], "e": null}),
            json!([[], [[]], {}, [{}], {"x": []}, {"y": {"z": [true, false]}}]),
            json!({"s": "a,b:c{d}[e]\"f\\g", "t": "\\", "u": "\\\"", "v": "é\n\t"}),
            json!([1]),
            json!({}),
            json!("plain"),
            json!({"k": [{"l": [{"m": 1}, 2]}, "{"]}),
        ]
    }

    #[test]
    fn re_indenting_compact_json_gives_the_pretty_printers_bytes() {
        for v in samples() {
            let compact = serde_json::to_vec(&v).unwrap();
            let mut out = Vec::new();
            pretty(&compact, 0, &mut out);
            assert_eq!(
                String::from_utf8(out).unwrap(),
                serde_json::to_string_pretty(&v).unwrap()
            );
        }
    }

    #[test]
    fn re_indenting_at_depth_two_matches_an_element_of_the_buildings_array() {
        // Inside {"b": [v]} the element starts at depth 2: its lines are the pretty printer's.
        for v in samples() {
            let doc = serde_json::to_string_pretty(&json!({ "b": [v.clone()] })).unwrap();
            let compact = serde_json::to_vec(&v).unwrap();
            let mut out = b"{\n  \"b\": [\n    ".to_vec();
            pretty(&compact, BUILDING_DEPTH, &mut out);
            out.extend_from_slice(b"\n  ]\n}");
            assert_eq!(String::from_utf8(out).unwrap(), doc);
        }
    }

    #[test]
    fn the_rank_and_funded_values_are_found_as_keys_not_inside_text() {
        let text = br#"{"id":"\"rank\":5","name":"x\\","rank":17,"retrofit":{"note":"\"funded\":1","funded":null}}"#;
        let mut out = Vec::new();
        finish_building(text, 3, Some(true), &mut out).unwrap();
        assert_eq!(
            String::from_utf8(out).unwrap(),
            r#"{"id":"\"rank\":5","name":"x\\","rank":3,"retrofit":{"note":"\"funded\":1","funded":true}}"#
        );
        // No retrofit: only the rank changes.
        let text = br#"{"rank":0,"retrofit":null}"#;
        let mut out = Vec::new();
        finish_building(text, 12, Some(false), &mut out).unwrap();
        assert_eq!(&out, br#"{"rank":12,"retrofit":null}"#);
        // No rank key at all: an error, not a silently wrong document.
        assert!(finish_building(b"{}", 1, None, &mut Vec::new()).is_err());
    }

    #[test]
    fn the_splice_writer_fills_after_the_first_marker_only_even_across_writes() {
        let mut got = Vec::new();
        let mut fill = |w: &mut dyn Write| w.write_all(b"X");
        {
            let mut s = Splice {
                inner: &mut got,
                marker: b"\"b\": [",
                matched: 0,
                fill: Some(&mut fill),
            };
            for piece in [
                &b"{\"a\": \"\\\"b\\\": [\", \"b"[..],
                b"\": [",
                b"], \"b\": []}",
            ] {
                s.write_all(piece).unwrap();
            }
            assert!(s.fill.is_none());
        }
        assert_eq!(
            String::from_utf8(got).unwrap(),
            r#"{"a": "\"b\": [", "b": [X], "b": []}"#
        );
    }
}
