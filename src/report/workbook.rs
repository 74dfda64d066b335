//! The results workbook of `interface.md`.

use std::path::{Path, PathBuf};

use super::ReportError;
use crate::results::Report;

/// Writes the results workbook; returns any extra files written (large-stock CSVs).
pub fn write(_report: &Report, _path: &Path) -> Result<Vec<(String, PathBuf)>, ReportError> {
    Ok(Vec::new())
}
