//! The JSON results of `interface.md` (`--json FILE`).

use std::path::Path;

use super::ReportError;
use super::atomic::write_atomic;
use crate::results::Report;

/// Writes the report as JSON (full precision; never NaN: non-finite numbers become null).
pub fn write(report: &Report, path: &Path) -> Result<(), ReportError> {
    write_atomic(path, |w| {
        serde_json::to_writer_pretty(&mut *w, report)?;
        Ok(())
    })
}
