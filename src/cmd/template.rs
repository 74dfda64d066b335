//! `seistriage template`: write the blank inventory workbook (and the settings file).

use std::path::Path;
use std::process::ExitCode;

use anyhow::Context;

/// Writes the template workbook and, when asked, the documented settings file.
pub fn run(out: &Path, settings: Option<&Path>) -> anyhow::Result<ExitCode> {
    seistriage::template::write_template(out)?;
    println!("blank inventory workbook written to {}", out.display());
    if let Some(p) = settings {
        if let Some(parent) = p.parent().filter(|p| !p.as_os_str().is_empty()) {
            std::fs::create_dir_all(parent)
                .with_context(|| format!("creating {}", parent.display()))?;
        }
        let text = seistriage::template::settings_toml();
        seistriage::report::atomic::write_atomic(p, |w| {
            std::io::Write::write_all(w, text.as_bytes())?;
            Ok(())
        })
        .with_context(|| format!("writing {}", p.display()))?;
        println!("documented settings file written to {}", p.display());
    }
    Ok(ExitCode::SUCCESS)
}
