//! `seistriage explain`: every step of the method for one building.

use std::io::Write;
use std::path::Path;
use std::process::ExitCode;

use seistriage::pipeline::{self, RunOptions};

/// Runs `explain` for one building id.
pub fn run(inventory: &Path, id: &str, opts: &RunOptions) -> anyhow::Result<ExitCode> {
    let loaded = pipeline::load(inventory, opts)?;
    // Screened (and sized) once, here; the report layer only reads the result.
    let report = pipeline::screen(&loaded);
    let text = seistriage::report::explain::explain(&loaded, &report, id);
    match text {
        Some(t) => {
            std::io::stdout().lock().write_all(t.as_bytes())?;
            Ok(ExitCode::SUCCESS)
        }
        None => {
            eprintln!(
                "seistriage: no building with id `{id}` in {}",
                inventory.display()
            );
            Ok(ExitCode::from(1))
        }
    }
}
