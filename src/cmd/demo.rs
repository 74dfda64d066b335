//! `seistriage demo`: write and screen the bundled invented inventory.

use std::path::Path;
use std::process::ExitCode;

/// Writes the demo inventory (and its geography) into `out` and screens it.
pub fn run(out: &Path, quiet: bool) -> anyhow::Result<ExitCode> {
    let files = seistriage::demo::write_demo_files(out)?;
    super::screen::run(&super::screen::Options {
        inventory: files.inventory.clone(),
        run: seistriage::pipeline::RunOptions {
            districts: files.districts.clone(),
            faults: files.faults.clone(),
            settings_file: files.settings.clone(),
            ..Default::default()
        },
        out: Some(out.join("demo-screening.xlsx")),
        json: Some(out.join("demo-screening.json")),
        csv: Some(out.join("demo-priority.csv")),
        geojson: Some(out.join("demo-buildings.geojson")),
        brief: Some(out.join("demo-brief.html")),
        brief_always: true,
        previous: None,
        threads: None,
        quiet,
    })
}
