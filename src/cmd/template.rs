//! `seistriage template`: write the blank inventory workbook.

use std::path::Path;
use std::process::ExitCode;

/// Writes the template workbook.
pub fn run(out: &Path) -> anyhow::Result<ExitCode> {
    seistriage::template::write_template(out)?;
    println!("blank inventory workbook written to {}", out.display());
    Ok(ExitCode::SUCCESS)
}
