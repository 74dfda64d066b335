/*!
Writing results: the workbook, JSON, CSV, GeoJSON, `explain` text and the terminal summary.
Every file is written to a temporary name in its target folder and renamed when complete.
*/

pub mod atomic;
pub mod brief;
pub mod changes;
pub mod csv;
pub mod explain;
pub mod geojson;
pub mod json;
pub mod people;
pub mod terminal;
pub mod workbook;

/// Failures while writing outputs.
#[derive(Debug, thiserror::Error)]
pub enum ReportError {
    /// File system error.
    #[error("{0}")]
    Io(#[from] std::io::Error),
    /// Workbook writer error.
    #[error("workbook: {0}")]
    Xlsx(#[from] rust_xlsxwriter::XlsxError),
    /// JSON error.
    #[error("json: {0}")]
    Json(#[from] serde_json::Error),
    /// CSV error.
    #[error("csv: {0}")]
    Csv(#[from] ::csv::Error),
    /// GeoJSON error.
    #[error("geojson: {0}")]
    GeoJson(#[from] ::geojson::Error),
}
