/*!
The blank inventory workbook (`seistriage template`).
*/

use std::path::Path;

/// Failures while writing the template.
#[derive(Debug, thiserror::Error)]
pub enum TemplateError {
    /// Workbook writer error.
    #[error("workbook: {0}")]
    Xlsx(#[from] rust_xlsxwriter::XlsxError),
}

/// Writes the blank inventory workbook to `path`.
pub fn write_template(_path: &Path) -> Result<(), TemplateError> {
    Ok(())
}
