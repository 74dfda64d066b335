//! Hidden `seistriage generate`: an invented inventory of any size, for benchmarks.

use std::path::Path;
use std::process::ExitCode;

/// Writes `n` invented buildings to `out` (.csv or .xlsx).
pub fn run(n: usize, out: &Path, seed: u64) -> anyhow::Result<ExitCode> {
    seistriage::demo::write_generated(n, out, seed)?;
    println!("{n} invented buildings written to {}", out.display());
    Ok(ExitCode::SUCCESS)
}
