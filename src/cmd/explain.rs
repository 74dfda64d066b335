//! `seistriage explain`: every step of the method for one building.

use std::io::Write;
use std::path::Path;
use std::process::ExitCode;

use seistriage::pipeline::{self, RunOptions};

/// Runs `explain` for one building id.
pub fn run(inventory: &Path, id: &str, opts: &RunOptions, full: bool) -> anyhow::Result<ExitCode> {
    let loaded = pipeline::load(inventory, opts)?;
    use seistriage::report::explain::{Precision, explain_with};
    let precision = if full {
        Precision::Full
    } else {
        Precision::People
    };
    let text = explain_with(&loaded, id, precision);
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
