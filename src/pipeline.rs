/*!
The whole job, from an inventory path to a [`Screening`]: read, settle the settings, place the
buildings ([`load`]), then the one screening flow ([`run`], `flow.rs`): screen, size
retrofits, rank, plan the budget, and hand every chunk and the ranked summary to the outputs
([`Sink`]s; today's writers as sinks are in [`sinks`]). `docs/one-flow.md` describes it.
*/

use std::collections::HashMap;
use std::path::{Path, PathBuf};

use sha2::Digest;

use crate::engine;
use crate::geography::{GeoError, Geography};
use crate::input::{self, InputError, ReadOptions};
use crate::model::{Inventory, Problem, Severity, SiteInfo};
use crate::results::{InputInfo, Screening};
use crate::settings::{Level, Settings, SettingsError};

pub mod flow;
pub mod sinks;

pub use flow::{
    Chunk, Outcome, Ranked, RankedBuilding, RunError, Sink, SinkError, Source, Written, run,
};

/// Input options shared by `screen`, `check` and `explain`.
#[derive(Debug, Clone, Default)]
pub struct RunOptions {
    /// Reader options (header row).
    pub read: ReadOptions,
    /// `--settings FILE.toml`.
    pub settings_file: Option<PathBuf>,
    /// `--districts FILE.geojson`.
    pub districts: Option<PathBuf>,
    /// `--faults FILE.geojson`.
    pub faults: Option<PathBuf>,
    /// `--level`.
    pub level: Option<Level>,
    /// `--budget`.
    pub budget: Option<f64>,
    /// `--samples` (method §13).
    pub samples: Option<u32>,
    /// `--seed` (method §13).
    pub seed: Option<u64>,
}

/// Failures that stop a run (exit 1).
#[derive(Debug, thiserror::Error)]
pub enum PipelineError {
    /// The inventory cannot be read.
    #[error(transparent)]
    Input(#[from] InputError),
    /// The settings file is bad.
    #[error("{path}: {error}")]
    Settings {
        /// Settings file path.
        path: String,
        /// What is wrong (not a `source`: the message holds it once, not twice).
        error: SettingsError,
    },
    /// The settings file cannot be read.
    #[error("{path}: cannot read the settings file: {message}")]
    SettingsFile {
        /// Path.
        path: String,
        /// Why.
        message: String,
    },
    /// A geography file cannot be used.
    #[error(transparent)]
    Geography(#[from] GeoError),
}

/// An inventory read and prepared for screening.
#[derive(Debug, Clone)]
pub struct Loaded {
    /// Input file and its hash.
    pub input: InputInfo,
    /// The typed inventory (problems include settings-sheet and geography problems).
    pub inventory: Inventory,
    /// Effective settings.
    pub settings: Settings,
    /// District and fault data per building id.
    pub sites: HashMap<String, SiteInfo>,
}

/// Settles the settings: built-in defaults < inventory `settings` sheet < TOML file < flags.
/// Problems of the settings sheet are appended to `problems` (without row numbers; see
/// [`settle_sheet_settings`]).
pub fn settle_settings(
    inventory_rows: &[(String, String)],
    problems: &mut Vec<Problem>,
    opts: &RunOptions,
) -> Result<Settings, PipelineError> {
    settle_sheet_settings(inventory_rows, &[], problems, opts)
}

/// [`settle_settings`] with the spreadsheet row of each settings-sheet row (`row_numbers`,
/// same order as `inventory_rows`), which its problems carry.
///
/// A sheet row whose key is unknown, whose value cannot be read, or whose value is out of
/// range ([`Settings::validate`]) is reported as a warning and ignored: the value in force
/// before it (the built-in default, or an earlier row) stays. A bad `--settings` file or
/// flag stops the run.
pub fn settle_sheet_settings(
    inventory_rows: &[(String, String)],
    row_numbers: &[usize],
    problems: &mut Vec<Problem>,
    opts: &RunOptions,
) -> Result<Settings, PipelineError> {
    let mut settings = Settings::default();
    for (i, (key, value)) in inventory_rows.iter().enumerate() {
        let mut trial = settings.clone();
        match trial
            .set_from_text_noted(key.trim(), value)
            .and_then(|notes| trial.validate().map(|()| notes))
        {
            Ok(notes) => {
                settings = trial;
                for message in notes {
                    problems.push(Problem {
                        sheet: "settings".into(),
                        row: row_numbers.get(i).copied(),
                        column: key.clone(),
                        message,
                        severity: Severity::Warning,
                    });
                }
            }
            Err(e) => problems.push(Problem {
                sheet: "settings".into(),
                row: row_numbers.get(i).copied(),
                column: key.clone(),
                message: format!("{e}; the row is ignored"),
                severity: Severity::Warning,
            }),
        }
    }
    if let Some(path) = &opts.settings_file {
        let text = std::fs::read_to_string(path).map_err(|e| PipelineError::SettingsFile {
            path: path.display().to_string(),
            message: e.to_string(),
        })?;
        let notes = settings
            .apply_toml_noted(&text)
            .map_err(|error| PipelineError::Settings {
                path: path.display().to_string(),
                error,
            })?;
        for (key, message) in notes {
            problems.push(Problem {
                sheet: path.display().to_string(),
                row: None,
                column: key,
                message,
                severity: Severity::Warning,
            });
        }
    }
    if let Some(level) = opts.level {
        settings.ranking_level = level;
    }
    if let Some(budget) = opts.budget {
        settings.budget = Some(budget);
    }
    if let Some(samples) = opts.samples {
        settings.samples = samples;
    }
    if let Some(seed) = opts.seed {
        settings.seed = seed;
    }
    settings
        .validate()
        .map_err(|error| PipelineError::Settings {
            path: "settings".into(),
            error,
        })?;
    Ok(settings)
}

/// The inventory's `eras` sheet, when it has rows, replaces the settings' era table
/// (inventory.md, sheet `eras`); a warning says so when the settings had one too.
fn with_eras_sheet(
    mut settings: Settings,
    inventory: &Inventory,
    problems: &mut Vec<Problem>,
) -> Settings {
    if inventory.eras.is_empty() {
        return settings;
    }
    if !settings.era.is_empty() && settings.era != inventory.eras {
        problems.push(Problem {
            sheet: "eras".into(),
            row: None,
            column: String::new(),
            message: format!(
                "the eras sheet ({} rows) replaces the settings' era table ({} rows)",
                inventory.eras.len(),
                settings.era.len()
            ),
            severity: Severity::Warning,
        });
    }
    settings.era = inventory.eras.clone();
    settings
}

/// SHA-256 of a file, hex, read in blocks (an inventory may be gigabytes); empty when the
/// file cannot be read.
pub fn sha256_hex(path: &Path) -> String {
    use std::io::Read;
    let Ok(mut f) = std::fs::File::open(path) else {
        return String::new();
    };
    let mut h = sha2::Sha256::new();
    let mut buf = vec![0u8; 1 << 16];
    loop {
        match f.read(&mut buf) {
            Ok(0) => break,
            Ok(n) => h.update(buf.get(..n).unwrap_or(&[])),
            Err(_) => return String::new(),
        }
    }
    h.finalize().iter().map(|b| format!("{b:02x}")).collect()
}

/// The districts and fault traces of `--districts` / `--faults`, loaded once per run (with
/// the problems of their files): the one place the screening loads its geography.
pub fn load_geography(opts: &RunOptions) -> Result<(Geography, Vec<Problem>), PipelineError> {
    Ok(Geography::load(
        opts.districts.as_deref(),
        opts.faults.as_deref(),
    )?)
}

/// Places buildings (district, hazard, fault distance): the one place the screening does
/// (a whole file at once in [`load`], a chunked stock chunk by chunk in [`run`]).
pub fn place(
    buildings: &[crate::model::BuildingRecord],
    geo: &Geography,
    settings: &Settings,
) -> (HashMap<String, SiteInfo>, Vec<Problem>) {
    crate::geography::locate(buildings, geo, settings)
}

/// Reads the inventory, settles the settings and places the buildings. The settings are
/// settled as soon as the inventory's settings sheet is read, so the rows are checked
/// against the plausibility limits of the effective settings ([`input::Limits`]).
pub fn load(path: &Path, opts: &RunOptions) -> Result<Loaded, PipelineError> {
    let mut settled: Option<Result<Settings, PipelineError>> = None;
    let mut sheet_problems = Vec::new();
    let read = input::read_inventory_settled(path, &opts.read, &mut |rows, row_numbers| {
        let result = settle_sheet_settings(rows, row_numbers, &mut sheet_problems, opts);
        let limits = result.as_ref().ok().map(input::Limits::from_settings);
        settled = Some(result);
        limits
    });
    let (mut inventory, settings) = match (read, settled) {
        (_, Some(Err(e))) => return Err(e),
        (Err(e), _) => return Err(e.into()),
        (Ok(inventory), Some(Ok(settings))) => (inventory, settings),
        // The reader always asks before reading the buildings; kept for safety.
        (Ok(inventory), None) => {
            let settings = settle_sheet_settings(
                &inventory.settings_rows,
                &inventory.settings_row_numbers,
                &mut sheet_problems,
                opts,
            )?;
            (inventory, settings)
        }
    };
    let mut problems = std::mem::take(&mut inventory.problems);
    problems.append(&mut sheet_problems);
    let settings = with_eras_sheet(settings, &inventory, &mut problems);
    let (geo, geo_problems) = load_geography(opts)?;
    problems.extend(geo_problems);
    let (sites, site_problems) = place(&inventory.buildings, &geo, &settings);
    problems.extend(site_problems);
    inventory.problems = problems;
    Ok(Loaded {
        input: InputInfo {
            file: path.display().to_string(),
            sha256: sha256_hex(path),
        },
        inventory,
        settings,
        sites,
    })
}

/// The rows `screen` would leave out at resolution (method §0: hazard from the row, the
/// district or the settings; every default), with `screen`'s reasons, without the
/// computation: what `check` lists. The same function `screen` fails a building with
/// ([`engine::resolve::resolve`] is the only step of a building's screening that refuses).
pub fn unresolved(loaded: &Loaded) -> Vec<crate::model::NotScreened> {
    use rayon::prelude::*;
    let inputs = engine::building_inputs(&loaded.inventory, &loaded.sites);
    let mut out: Vec<crate::model::NotScreened> = inputs
        .par_iter()
        .filter_map(|i| {
            engine::resolve::resolve(i, &loaded.settings)
                .err()
                .map(|reasons| crate::model::NotScreened {
                    sheet: "buildings".into(),
                    row: i.record.row,
                    id: i.record.id.clone(),
                    reasons,
                })
        })
        .collect();
    out.sort_by_key(|n| n.row);
    out
}

/// Screens a loaded inventory: engine, retrofit sizing, budget plan, counts, the §13 stage
/// ([`run`] on the whole inventory as one chunk, with no sink).
pub fn screen(loaded: &Loaded) -> Screening {
    match run(
        Source::Loaded(std::borrow::Cow::Borrowed(loaded)),
        &RunOptions::default(),
        &mut [],
    ) {
        Ok(outcome) => outcome.screening,
        // A loaded inventory reads without error and there is no sink to fail.
        Err(e) => unreachable!("screening a loaded inventory without sinks failed: {e}"),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn rows(pairs: &[(&str, &str)]) -> Vec<(String, String)> {
        pairs
            .iter()
            .map(|(k, v)| ((*k).to_string(), (*v).to_string()))
            .collect()
    }

    #[test]
    fn settings_sheet_problems_name_their_row_and_the_row_is_ignored() {
        let sheet = rows(&[
            ("floor_weight_kpa", "10"),
            ("floor_weight_kpa", "0"),
            ("nonsense", "1"),
            ("max_storeys", "many"),
        ]);
        let mut problems = Vec::new();
        let s = settle_sheet_settings(&sheet, &[3, 4, 5, 6], &mut problems, &RunOptions::default())
            .unwrap();
        // Row 4's 0 kPa is out of range: row 3's 10 kPa stays in force.
        assert_eq!(s.floor_weight_kpa, 10.0);
        assert_eq!(s.max_storeys, 60.0);
        let at: Vec<_> = problems
            .iter()
            .map(|p| (p.row, p.column.as_str(), p.severity))
            .collect();
        assert_eq!(
            at,
            vec![
                (Some(4), "floor_weight_kpa", Severity::Warning),
                (Some(5), "nonsense", Severity::Warning),
                (Some(6), "max_storeys", Severity::Warning)
            ]
        );
    }

    #[test]
    fn the_settings_file_and_flags_win_over_the_sheet() {
        let dir = tempfile::tempdir().unwrap();
        let f = dir.path().join("s.toml");
        std::fs::write(&f, "max_storeys = 65\nranking_level = \"cp\"\n").unwrap();
        let opts = RunOptions {
            settings_file: Some(f),
            level: Some(Level::Io),
            ..Default::default()
        };
        let sheet = rows(&[("max_storeys", "80"), ("storey_height_max_m", "7")]);
        let s = settle_sheet_settings(&sheet, &[2, 3], &mut Vec::new(), &opts).unwrap();
        assert_eq!(s.max_storeys, 65.0);
        assert_eq!(s.storey_height_max_m, 7.0);
        assert_eq!(s.ranking_level, Level::Io);
    }
}
