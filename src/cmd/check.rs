//! `seistriage check`: read and validate an inventory with `screen`'s resolution; list every
//! problem and every row `screen` would leave out.

use std::io::Write;
use std::path::Path;
use std::process::ExitCode;

use seistriage::model::Severity;
use seistriage::pipeline::{self, RunOptions};

/// Runs `check`: the same reading, settings, geography and resolution as `screen` (hazard
/// from row, district or settings; every default), so every row `screen` would leave out is
/// listed with the same reason. Exit 1 when no row can be screened, or with `strict` when
/// there is any error; else 0.
pub fn run(inventory: &Path, opts: &RunOptions, strict: bool) -> anyhow::Result<ExitCode> {
    let loaded = pipeline::load(inventory, opts)?;
    let unresolved = pipeline::unresolved(&loaded);
    let inv = &loaded.inventory;
    let mut out = std::io::stdout().lock();
    for p in &inv.problems {
        writeln!(out, "{p}")?;
    }
    for n in &unresolved {
        writeln!(
            out,
            "error: {}, row {}: {}: not screened: {}",
            n.sheet,
            n.row,
            n.id,
            n.reasons.join("; ")
        )?;
    }
    let errors = inv
        .problems
        .iter()
        .filter(|p| p.severity == Severity::Error)
        .count()
        + unresolved.len();
    let warnings = inv
        .problems
        .iter()
        .filter(|p| p.severity == Severity::Warning)
        .count();
    let screened = inv.buildings.len() - unresolved.len();
    let not = inv.not_screened.len() + unresolved.len();
    let no_coordinates = inv
        .buildings
        .iter()
        .filter(|b| b.latitude.is_none() || b.longitude.is_none())
        .count();
    writeln!(
        out,
        "{}: {} rows: {screened} rows will be screened, {not} will not ({} with errors in the inventory, {} at resolution), {} blank rows skipped; {errors} errors, {warnings} warnings",
        inventory.display(),
        inv.rows,
        inv.not_screened.len(),
        unresolved.len(),
        inv.blank_rows,
    )?;
    if no_coordinates > 0 {
        writeln!(
            out,
            "{no_coordinates} buildings without coordinates will not be in the GeoJSON or on the map"
        )?;
    }
    if screened == 0 {
        writeln!(
            out,
            "no row can be screened: `screen` would refuse this inventory"
        )?;
        return Ok(ExitCode::from(1));
    }
    if strict && errors > 0 {
        writeln!(out, "--strict: {errors} errors")?;
        return Ok(ExitCode::from(1));
    }
    Ok(ExitCode::SUCCESS)
}
