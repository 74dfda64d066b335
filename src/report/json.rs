//! The JSON results of `interface.md` (`--json FILE`).
//!
//! Numbers are written at full precision; non-finite numbers are written as `null` (serde_json
//! writes NaN and ±infinity as null), so the file never holds `NaN`. The document is streamed
//! to a buffered temporary file and renamed when complete; above
//! [`COMPACT_FROM`] buildings it is written compact (about 40 % smaller than indented).

use std::path::Path;

use super::ReportError;
use super::atomic::write_atomic;
use crate::results::Report;

/// From this many buildings (exclusive) the JSON is written compact.
pub const COMPACT_FROM: usize = 100_000;

/// Writes the report as JSON (full precision; never NaN: non-finite numbers become null).
pub fn write(report: &Report, path: &Path) -> Result<(), ReportError> {
    let compact = report.buildings.len() > COMPACT_FROM;
    write_atomic(path, |w| {
        if compact {
            serde_json::to_writer(&mut *w, report)?;
        } else {
            serde_json::to_writer_pretty(&mut *w, report)?;
        }
        Ok(())
    })
}
