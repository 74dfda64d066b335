//! The `seistriage` command line: a thin layer over the library (one command per file in
//! `cmd/`). Exit codes: 0 done, 1 the input could not be screened at all, 2 usage errors,
//! 130 interrupted (Ctrl-C or SIGTERM; temporary files removed, no output left half-written).

mod cmd;

use std::path::PathBuf;
use std::process::ExitCode;

use clap::{Args, Parser, Subcommand, ValueEnum};

/// Seismic screening of existing reinforced-concrete building stocks: drift demand against
/// wall and column drift capacity, configuration flags, retrofit priority and a budget plan.
///
/// Screening only: not a substitute for a detailed evaluation by a licensed engineer under
/// the local code.
#[derive(Parser, Debug)]
#[command(name = "seistriage", version, about, long_about = None, after_help = seistriage::input::HEADER_RULE_HELP)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

/// Performance level for ranking.
#[derive(ValueEnum, Clone, Copy, Debug)]
enum LevelArg {
    /// Immediate Occupancy.
    Io,
    /// Life Safety.
    Ls,
    /// Collapse Prevention.
    Cp,
}

impl From<LevelArg> for seistriage::settings::Level {
    fn from(l: LevelArg) -> Self {
        match l {
            LevelArg::Io => Self::Io,
            LevelArg::Ls => Self::Ls,
            LevelArg::Cp => Self::Cp,
        }
    }
}

/// Input options shared by screen, check and explain.
#[derive(Args, Debug, Clone)]
struct InputArgs {
    /// Settings file (TOML); see templates/settings.toml.
    #[arg(long, value_name = "FILE.toml")]
    settings: Option<PathBuf>,
    /// 1-based row holding the column names (default: found by looking for the required names).
    #[arg(long, value_name = "N", value_parser = clap::value_parser!(u32).range(1..))]
    header_row: Option<u32>,
    /// District polygons (GeoJSON, property `name`).
    #[arg(long, value_name = "FILE.geojson")]
    districts: Option<PathBuf>,
    /// Fault traces (GeoJSON LineString/MultiLineString, properties `name`, optional `mw`).
    #[arg(long, value_name = "FILE.geojson")]
    faults: Option<PathBuf>,
    /// Performance level whose DCR ranks the stock.
    #[arg(long, value_enum)]
    level: Option<LevelArg>,
}

impl InputArgs {
    fn run_options(&self, budget: Option<f64>) -> seistriage::pipeline::RunOptions {
        seistriage::pipeline::RunOptions {
            read: seistriage::input::ReadOptions {
                header_row: self.header_row.map(|n| n as usize),
                ..Default::default()
            },
            settings_file: self.settings.clone(),
            districts: self.districts.clone(),
            faults: self.faults.clone(),
            level: self.level.map(Into::into),
            budget,
            ..Default::default()
        }
    }
}

/// Sampling options of method §13 (screen and explain).
#[derive(Args, Debug, Clone, Copy)]
struct SampleArgs {
    /// Number of samples of the uncertainty stage (method §13; 0 = none, the default).
    #[arg(long, value_name = "N")]
    samples: Option<u32>,
    /// Seed of the portable draws (unsigned 64-bit integer; default 1).
    #[arg(long, value_name = "S")]
    seed: Option<u64>,
}

impl SampleArgs {
    fn apply(self, o: seistriage::pipeline::RunOptions) -> seistriage::pipeline::RunOptions {
        seistriage::pipeline::RunOptions {
            samples: self.samples,
            seed: self.seed,
            ..o
        }
    }
}

#[derive(Subcommand, Debug)]
enum Command {
    /// Screen an inventory and write the results workbook (and JSON/CSV/GeoJSON on request).
    Screen(ScreenArgs),
    /// Validate an inventory with screen's resolution (hazard, districts, faults, defaults);
    /// list every problem and every row screen would leave out. Exit 1 when no row can be
    /// screened (with --strict: on any error), else 0.
    Check {
        /// Inventory (.xlsx, .xlsm, .xls, .ods or .csv).
        inventory: PathBuf,
        #[command(flatten)]
        input: InputArgs,
        /// Exit 1 on any error, not only when no row can be screened (for pipelines).
        #[arg(long)]
        strict: bool,
    },
    /// Show every step of the method for one building, with numbers, defaults and sources.
    Explain {
        /// Inventory.
        inventory: PathBuf,
        /// Building id.
        id: String,
        /// Numbers at full precision (default: 4 significant digits).
        #[arg(long)]
        full: bool,
        #[command(flatten)]
        input: InputArgs,
        #[command(flatten)]
        sampling: SampleArgs,
    },
    /// Write the blank inventory workbook (and, with --settings, the documented settings file).
    Template {
        /// Output workbook.
        #[arg(
            long,
            default_value = "output/inventory-template.xlsx",
            value_name = "FILE.xlsx"
        )]
        out: PathBuf,
        /// Also write the documented settings file (every key with its default and source).
        #[arg(long, value_name = "FILE.toml")]
        settings: Option<PathBuf>,
    },
    /// Write and screen the bundled invented demo inventory.
    Demo {
        /// Output folder.
        #[arg(long, default_value = "output", value_name = "DIR")]
        out: PathBuf,
        /// Print only errors.
        #[arg(long)]
        quiet: bool,
    },
    /// Generate an invented inventory of any size (for benchmarks).
    #[command(hide = true)]
    Generate {
        /// Number of buildings.
        #[arg(long)]
        buildings: usize,
        /// Output file (.xlsx or .csv).
        #[arg(long)]
        out: PathBuf,
        /// Random seed.
        #[arg(long, default_value_t = 1)]
        seed: u64,
    },
}

/// Options of `screen`.
#[derive(Args, Debug)]
struct ScreenArgs {
    /// Inventory (.xlsx, .xlsm, .xls, .ods or .csv).
    inventory: PathBuf,
    #[command(flatten)]
    input: InputArgs,
    /// Results workbook (default output/<inventory stem>-screening.xlsx; must end in .xlsx).
    #[arg(long, value_name = "FILE.xlsx", value_parser = parse_xlsx_path)]
    out: Option<PathBuf>,
    /// JSON results (`-` = standard output).
    #[arg(long, value_name = "FILE")]
    json: Option<PathBuf>,
    /// Priority table as CSV (`-` = standard output).
    #[arg(long, value_name = "FILE")]
    csv: Option<PathBuf>,
    /// Buildings with coordinates as GeoJSON points (`-` = standard output).
    #[arg(long, value_name = "FILE")]
    geojson: Option<PathBuf>,
    /// Retrofit budget, a positive amount (currency-neutral): 2000000 or 2_000_000.
    #[arg(long, value_name = "AMOUNT", value_parser = parse_budget)]
    budget: Option<f64>,
    /// Officials' brief, one self-contained HTML page (default: <out stem>-brief.html beside
    /// the workbook when the stock has coordinates or a budget plan).
    #[arg(long, value_name = "FILE.html")]
    brief: Option<PathBuf>,
    /// Compare with a previous run's JSON results (a Changes sheet and a brief section).
    #[arg(long, value_name = "OLD.json")]
    previous: Option<PathBuf>,
    #[command(flatten)]
    sampling: SampleArgs,
    /// Worker threads (default: all cores).
    #[arg(long, value_name = "N", value_parser = clap::value_parser!(u32).range(1..))]
    threads: Option<u32>,
    /// Print only errors.
    #[arg(long)]
    quiet: bool,
}

/// `--budget`: a positive amount, digits optionally grouped by `_` (`2_000_000`); commas,
/// periods as thousands separators and spaces are refused with a hint (locale-ambiguous).
fn parse_budget(text: &str) -> Result<f64, String> {
    let t = text.trim();
    if t.contains(',') || t.contains(' ') || t.contains('\'') {
        return Err(format!(
            "expected a positive amount such as 2000000 or 2_000_000, found \"{t}\": write it without commas, spaces or apostrophes (a comma is a thousands separator in one locale and a decimal mark in another)"
        ));
    }
    let plain = t.replace('_', "");
    let ok_underscores = !t.starts_with('_') && !t.ends_with('_') && !t.contains("__");
    match plain.parse::<f64>() {
        Ok(v) if ok_underscores && v.is_finite() && v > 0.0 => Ok(v),
        Ok(v) if ok_underscores && v.is_finite() => Err(format!(
            "expected a positive amount, found {t}: leave --budget out for no budget plan"
        )),
        _ => Err(format!(
            "expected a positive amount such as 2000000 or 2_000_000, found \"{t}\""
        )),
    }
}

/// `--out`: a workbook path ending in .xlsx.
fn parse_xlsx_path(text: &str) -> Result<PathBuf, String> {
    let p = PathBuf::from(text);
    let is_xlsx = p
        .extension()
        .is_some_and(|e| e.eq_ignore_ascii_case("xlsx"));
    if is_xlsx {
        Ok(p)
    } else {
        Err(format!(
            "expected a workbook path ending in .xlsx, found \"{text}\": --out writes the results workbook; use --csv FILE for the Priority table as CSV, --json FILE for JSON, --geojson FILE for GeoJSON"
        ))
    }
}

/// Exit code of a run interrupted by Ctrl-C (SIGINT), SIGTERM or SIGHUP: 128 + 2, the
/// shell's convention for SIGINT (the handler is not told which signal came).
const INTERRUPTED: i32 = 130;

fn main() -> ExitCode {
    // An interrupt removes the temporary files of outputs being written, then exits; no
    // output is ever left half-written under its final name (write-then-rename).
    if let Err(e) =
        ctrlc::set_handler(|| seistriage::report::atomic::remove_temp_files_and_exit(INTERRUPTED))
    {
        eprintln!("seistriage: warning: cannot install the interrupt handler: {e}");
    }
    let cli = Cli::parse();
    let result = match cli.command {
        Command::Screen(a) => cmd::screen::run(&cmd::screen::Options {
            inventory: a.inventory.clone(),
            run: a.sampling.apply(a.input.run_options(a.budget)),
            out: a.out,
            json: a.json,
            csv: a.csv,
            geojson: a.geojson,
            brief: a.brief,
            brief_always: false,
            previous: a.previous,
            threads: a.threads.map(|n| n as usize),
            quiet: a.quiet,
        }),
        Command::Check {
            inventory,
            input,
            strict,
        } => cmd::check::run(&inventory, &input.run_options(None), strict),
        Command::Explain {
            inventory,
            id,
            full,
            input,
            sampling,
        } => cmd::explain::run(
            &inventory,
            &id,
            &sampling.apply(input.run_options(None)),
            full,
        ),
        Command::Template { out, settings } => cmd::template::run(&out, settings.as_deref()),
        Command::Demo { out, quiet } => cmd::demo::run(&out, quiet),
        Command::Generate {
            buildings,
            out,
            seed,
        } => cmd::generate::run(buildings, &out, seed),
    };
    match result {
        Ok(code) => code,
        Err(e) => {
            if cmd::is_broken_pipe(&e) {
                return ExitCode::SUCCESS;
            }
            eprintln!("seistriage: {e:#}");
            ExitCode::from(1)
        }
    }
}
