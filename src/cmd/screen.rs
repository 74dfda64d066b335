//! `seistriage screen`: screen an inventory and write the outputs.

use std::path::{Path, PathBuf};
use std::process::ExitCode;

use anyhow::{Context, bail};
use seistriage::pipeline::{self, RunOptions, Sink, sinks};
use seistriage::report;
use seistriage::report::terminal::ProgressLine;
use std::io::Write;

/// Options of `screen` (and of `demo`, which calls it).
#[derive(Debug, Clone)]
pub struct Options {
    /// Inventory path.
    pub inventory: PathBuf,
    /// Input options.
    pub run: RunOptions,
    /// Workbook path (default output/<stem>-screening.xlsx).
    pub out: Option<PathBuf>,
    /// JSON path.
    pub json: Option<PathBuf>,
    /// CSV path.
    pub csv: Option<PathBuf>,
    /// GeoJSON path.
    pub geojson: Option<PathBuf>,
    /// Officials' brief (HTML); `None`: beside the workbook when the stock has coordinates
    /// or a budget plan.
    pub brief: Option<PathBuf>,
    /// Always write the brief (demo), at `brief` or beside the workbook.
    pub brief_always: bool,
    /// A previous run's JSON to compare with (`Changes` sheet, brief section).
    pub previous: Option<PathBuf>,
    /// Worker threads.
    pub threads: Option<usize>,
    /// Print only errors.
    pub quiet: bool,
}

fn same_file(a: &Path, b: &Path) -> bool {
    match (std::fs::canonicalize(a), std::fs::canonicalize(b)) {
        (Ok(x), Ok(y)) => x == y,
        _ => a == b,
    }
}

/// Whether an output path is `-` (standard output).
fn is_stdout(p: &Path) -> bool {
    p.as_os_str() == "-"
}

/// Runs `screen`. `--json -`, `--csv -` or `--geojson -` write that output to standard
/// output (through a registered scratch file, so that the writers and their
/// write-then-rename stay the same); the terminal summary then goes to standard error.
pub fn run(o: &Options) -> anyhow::Result<ExitCode> {
    let dashes = [o.json.as_deref(), o.csv.as_deref(), o.geojson.as_deref()]
        .into_iter()
        .flatten()
        .filter(|p| is_stdout(p))
        .count();
    if dashes > 1 {
        eprintln!(
            "error: only one output can go to standard output (`-`); give the others a file name"
        );
        return Ok(ExitCode::from(2));
    }
    if dashes == 0 {
        return run_files(o, None);
    }
    let ext = if o.json.as_deref().is_some_and(is_stdout) {
        "json"
    } else if o.csv.as_deref().is_some_and(is_stdout) {
        "csv"
    } else {
        "geojson"
    };
    let scratch =
        std::env::temp_dir().join(format!("seistriage-stdout-{}.{ext}", std::process::id()));
    let (guard, file) = report::atomic::TempFile::create_at(scratch.clone())
        .with_context(|| format!("creating {}", scratch.display()))?;
    drop(file);
    let swap = |p: &Option<PathBuf>| {
        p.as_ref().map(|p| {
            if is_stdout(p) {
                scratch.clone()
            } else {
                p.clone()
            }
        })
    };
    let inner = Options {
        json: swap(&o.json),
        csv: swap(&o.csv),
        geojson: swap(&o.geojson),
        ..o.clone()
    };
    let code = run_files(&inner, Some(&scratch))?;
    if code == ExitCode::SUCCESS {
        let mut f = std::fs::File::open(guard.path())
            .with_context(|| format!("reading {}", scratch.display()))?;
        let mut stdout = std::io::stdout().lock();
        std::io::copy(&mut f, &mut stdout)
            .and_then(|_| stdout.flush())
            .context("writing to standard output")?;
    }
    drop(guard);
    Ok(code)
}

/// `screen` with every output a file; `stdout_scratch`: the scratch file that stands for
/// standard output (the summary then goes to stderr and names it "standard output").
fn run_files(o: &Options, stdout_scratch: Option<&Path>) -> anyhow::Result<ExitCode> {
    let summary_to_stderr = stdout_scratch.is_some();
    let stem = o
        .inventory
        .file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_else(|| "inventory".into());
    let out = o
        .out
        .clone()
        .unwrap_or_else(|| PathBuf::from("output").join(format!("{stem}-screening.xlsx")));
    let outputs: Vec<&PathBuf> = [
        Some(&out),
        o.json.as_ref(),
        o.csv.as_ref(),
        o.geojson.as_ref(),
        o.brief.as_ref(),
    ]
    .into_iter()
    .flatten()
    .collect();
    for (i, p) in outputs.iter().enumerate() {
        if same_file(p, &o.inventory) {
            bail!(
                "refusing to write an output over the input file {}",
                o.inventory.display()
            );
        }
        if i == 0
            && report::workbook::tables::TableId::ALL
                .iter()
                .any(|t| same_file(&report::workbook::csv_path(p, *t), &o.inventory))
        {
            bail!(
                "refusing to write an output over the input file {} (a large-stock CSV of {} would take its name)",
                o.inventory.display(),
                p.display()
            );
        }
        if outputs.iter().skip(i + 1).any(|q| same_file(p, q)) {
            bail!(
                "two outputs would be written to the same file {}",
                p.display()
            );
        }
    }
    if let Some(n) = o.threads {
        // A global pool can only be built once per process; a second call is harmless.
        let _ = rayon::ThreadPoolBuilder::new()
            .num_threads(n)
            .build_global();
    }
    // A large CSV stock is read in chunks (bounded memory; per-row tables as CSV files
    // beside the workbook): the same flow with the large-stock sink variants.
    let from = seistriage::stream::threshold();
    let chunked = seistriage::stream::applies(&o.inventory, from);
    let mut previous = None;
    let source = if chunked {
        if o.brief.is_some() || o.previous.is_some() {
            eprintln!(
                "seistriage: warning: --brief and --previous are not available for a stock \
                 screened in chunks (a CSV of more than {from} lines); they are left out"
            );
        }
        // Method §13 on a streamed stock needs per-sample ranks over the whole stock, about
        // 13·B·N bytes in memory (README, Performance): not offered on this path.
        let settings = pipeline::settle_settings(&[], &mut Vec::new(), &o.run)?;
        if settings.samples > 0 {
            bail!(
                "{}: --samples (method §13) is not available for a stock this large (more than {} CSV lines, screened in chunks): \
                 the per-sample ranks of the whole stock would not fit in bounded memory; \
                 run without --samples (or samples = 0), or screen the stock in parts",
                o.inventory.display(),
                from
            );
        }
        pipeline::Source::CsvChunks {
            path: &o.inventory,
            rows: seistriage::stream::chunk_rows(),
        }
    } else {
        // Read the previous run first: a wrong file is found before the screening runs.
        previous = o
            .previous
            .as_ref()
            .map(|p| {
                report::changes::read_previous(p)
                    .with_context(|| format!("reading the previous run {}", p.display()))
            })
            .transpose()?;
        let progress = ProgressLine::spinner(o.quiet, "reading the inventory");
        let loaded = pipeline::load(&o.inventory, &o.run);
        progress.finish();
        let loaded = loaded?;
        if loaded.inventory.buildings.is_empty() {
            const SHOWN: usize = 20;
            for p in loaded.inventory.problems.iter().take(SHOWN) {
                eprintln!("{p}");
            }
            if loaded.inventory.problems.len() > SHOWN {
                eprintln!(
                    "… and {} more problems (`seistriage check` lists them all)",
                    loaded.inventory.problems.len() - SHOWN
                );
            }
            eprintln!(
                "seistriage: {}: no valid building row; nothing to screen",
                o.inventory.display()
            );
            return Ok(ExitCode::from(1));
        }
        let store = seistriage::uncertainty::store_bytes(
            loaded.inventory.buildings.len(),
            loaded.settings.samples,
        );
        if store > seistriage::uncertainty::MAX_STORE_BYTES {
            bail!(
                "{}: --samples {} on {} buildings would hold about {:.1} GiB of samples (13 bytes per building and sample; at most {} GiB): use fewer samples or screen the stock in parts",
                o.inventory.display(),
                loaded.settings.samples,
                loaded.inventory.buildings.len(),
                store as f64 / f64::from(1u32 << 30),
                seistriage::uncertainty::MAX_STORE_BYTES >> 30
            );
        }
        pipeline::Source::Loaded(std::borrow::Cow::Owned(loaded))
    };
    for p in [
        Some(&out),
        o.json.as_ref(),
        o.csv.as_ref(),
        o.geojson.as_ref(),
    ]
    .into_iter()
    .flatten()
    {
        if let Some(parent) = p.parent().filter(|p| !p.as_os_str().is_empty()) {
            std::fs::create_dir_all(parent)
                .with_context(|| format!("creating {}", parent.display()))?;
        }
    }
    // The sinks, in the order they finish. A whole file is one chunk and its sinks write at
    // the end from every result; a chunked stock takes the large-stock variants, which write
    // the per-row tables (and the JSON spill) as the chunks come.
    let changes = std::cell::OnceCell::new();
    let top = std::cell::OnceCell::new();
    let rows = sinks::StockRows::default();
    let mut progress = sinks::ProgressSink::new(
        o.quiet,
        if chunked {
            "screening in chunks"
        } else {
            "screening"
        },
    );
    let mut compare = previous.map(|p| sinks::ChangesSink::new(p, &changes));
    let with_changes = compare.as_ref().map(|_| &changes);
    let mut keep_rows = chunked.then_some(sinks::StockRowsSink { rows: &rows });
    let mut workbook = None;
    let mut large_workbook = None;
    let mut json = None;
    let mut spilled_json = None;
    let mut csv = None;
    let mut copied_csv = None;
    let mut geojson = None;
    let mut stock_geojson = None;
    let mut brief = None;
    if chunked {
        large_workbook = Some(sinks::LargeWorkbookSink::new(&out, &rows, &top)?);
        if let Some(p) = o.json.as_deref() {
            spilled_json = Some(sinks::SpilledJsonSink::new(p)?);
        }
        copied_csv = o.csv.clone().map(|path| sinks::CopiedPriorityCsvSink {
            from: report::workbook::csv_path(&out, report::workbook::tables::TableId::Priority),
            path,
        });
        stock_geojson = o
            .geojson
            .clone()
            .map(|path| sinks::StockGeoJsonSink { path, rows: &rows });
    } else {
        workbook = Some(sinks::WorkbookSink::new(&out, with_changes, o.quiet));
        json = o.json.as_deref().map(sinks::JsonSink::new);
        csv = o.csv.as_deref().map(sinks::PriorityCsvSink::new);
        geojson = o.geojson.as_deref().map(sinks::GeoJsonSink::new);
        brief = Some(sinks::BriefSink {
            path: o.brief.clone(),
            workbook: out.clone(),
            always: o.brief_always,
            inventory: o.inventory.clone(),
            districts: o.run.districts.clone(),
            faults: o.run.faults.clone(),
            changes: with_changes,
        });
    }
    let mut terminal = sinks::TerminalSink {
        stdout_scratch: stdout_scratch.map(Path::to_path_buf),
        top: Some(&top),
        text: None,
    };
    let mut all: Vec<&mut dyn Sink> = vec![&mut progress];
    fn add<'s, 'a, S: Sink + 'a>(all: &mut Vec<&'s mut (dyn Sink + 'a)>, s: &'s mut Option<S>) {
        if let Some(s) = s.as_mut() {
            all.push(s);
        }
    }
    add(&mut all, &mut compare);
    add(&mut all, &mut keep_rows);
    add(&mut all, &mut workbook);
    add(&mut all, &mut large_workbook);
    add(&mut all, &mut json);
    add(&mut all, &mut spilled_json);
    add(&mut all, &mut csv);
    add(&mut all, &mut copied_csv);
    add(&mut all, &mut geojson);
    add(&mut all, &mut stock_geojson);
    add(&mut all, &mut brief);
    all.push(&mut terminal);
    let outcome = pipeline::run(source, &o.run, &mut all)?;
    drop(all);
    if outcome.screening.counts.screened == 0 {
        return Ok(nothing_screened(&outcome.screening, &o.inventory));
    }
    if let (false, Some(text)) = (o.quiet, terminal.text.as_deref()) {
        print_summary(text, summary_to_stderr)?;
    }
    Ok(ExitCode::SUCCESS)
}

/// The terminal summary, on stdout (or stderr when an output goes to stdout). A closed
/// stdout (`| head`) is a broken pipe: main maps it to exit 0.
fn print_summary(text: &str, to_stderr: bool) -> anyhow::Result<()> {
    if to_stderr {
        let mut err = std::io::stderr().lock();
        err.write_all(text.as_bytes())
            .and_then(|()| err.flush())
            .context("writing the summary to stderr")
    } else {
        let mut stdout = std::io::stdout().lock();
        stdout
            .write_all(text.as_bytes())
            .and_then(|()| stdout.flush())
            .context("writing the summary to stdout")
    }
}

/// Says why no building could be screened (the first reasons, then how many more rows) and
/// gives exit code 1; the same on the whole-stock and the streaming path.
fn nothing_screened(
    report: &seistriage::results::Screening,
    inventory: &std::path::Path,
) -> ExitCode {
    const SHOWN: usize = 20;
    for n in report.not_screened.iter().take(SHOWN) {
        eprintln!(
            "buildings, row {}: {}: {}",
            n.row,
            n.id,
            n.reasons.join("; ")
        );
    }
    if report.not_screened.len() > SHOWN {
        eprintln!(
            "… and {} more rows not screened (the first reasons above usually apply to them too)",
            report.not_screened.len() - SHOWN
        );
    }
    eprintln!(
        "seistriage: {}: no building could be screened",
        inventory.display()
    );
    ExitCode::from(1)
}
