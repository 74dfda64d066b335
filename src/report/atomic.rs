//! Write-then-rename: an output never exists half-written under its final name.

use std::fs::File;
use std::io::{BufWriter, Write};
use std::path::{Path, PathBuf};

use super::ReportError;

/// The temporary name used beside `path` while it is being written.
pub fn temp_path(path: &Path) -> PathBuf {
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_default();
    path.with_file_name(format!(".{name}.{}.partial", std::process::id()))
}

/// Writes `path` through a temporary file in the same folder, renamed when `fill` succeeds;
/// on failure the temporary file is removed and `path` is left as it was.
pub fn write_atomic<F>(path: &Path, fill: F) -> Result<(), ReportError>
where
    F: FnOnce(&mut BufWriter<File>) -> Result<(), ReportError>,
{
    let tmp = temp_path(path);
    let result = (|| {
        let mut w = BufWriter::new(File::create(&tmp)?);
        fill(&mut w)?;
        w.flush()?;
        w.get_ref().sync_all()?;
        Ok(())
    })();
    match result {
        Ok(()) => {
            std::fs::rename(&tmp, path).inspect_err(|_| {
                let _ = std::fs::remove_file(&tmp);
            })?;
            Ok(())
        }
        Err(e) => {
            let _ = std::fs::remove_file(&tmp);
            Err(e)
        }
    }
}
