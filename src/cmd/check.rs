//! `seistriage check`: read and validate an inventory; list every problem.

use std::io::Write;
use std::path::Path;
use std::process::ExitCode;

use seistriage::model::Severity;
use seistriage::pipeline::{self, RunOptions};

/// Runs `check`: exit 0 when screening can proceed (at least one valid row), else 1.
pub fn run(inventory: &Path, opts: &RunOptions) -> anyhow::Result<ExitCode> {
    let loaded = pipeline::load(inventory, opts)?;
    let inv = &loaded.inventory;
    let mut out = std::io::stdout().lock();
    for p in &inv.problems {
        writeln!(out, "{p}")?;
    }
    let errors = inv
        .problems
        .iter()
        .filter(|p| p.severity == Severity::Error)
        .count();
    let warnings = inv.problems.len() - errors;
    writeln!(
        out,
        "{}: {} rows: {} accepted, {} rejected, {} blank rows skipped; {} errors, {} warnings",
        inventory.display(),
        inv.rows,
        inv.buildings.len(),
        inv.not_screened.len(),
        inv.blank_rows,
        errors,
        warnings
    )?;
    if inv.buildings.is_empty() {
        writeln!(out, "no valid building row: screening cannot proceed")?;
        return Ok(ExitCode::from(1));
    }
    Ok(ExitCode::SUCCESS)
}
