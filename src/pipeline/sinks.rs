/*!
Today's writers as [`Sink`]s of the one screening flow ([`super::run`]). Each sink calls the
writer's public function under `crate::report`; the writers stay as they are.

Whole-stock sinks write at [`Sink::finish`] from [`Ranked::screening`], which holds every
building in rank order when the source keeps its results.
*/

use std::cell::OnceCell;
use std::path::{Path, PathBuf};

use super::flow::{Chunk, Ranked, Sink, SinkError, Written};
use crate::report;
use crate::report::changes::{Changes, Previous};
use crate::report::terminal::ProgressLine;

/// The "screening" progress line: rows screened chunk by chunk; removed at the first
/// [`Sink::finish`] (put it first), before the writers show their own.
#[derive(Debug)]
pub struct ProgressSink {
    line: ProgressLine,
    done: u64,
}

impl ProgressSink {
    /// A spinner with `message` (hidden when `quiet` or stderr is not a terminal).
    pub fn new(quiet: bool, message: &str) -> Self {
        ProgressSink {
            line: ProgressLine::spinner(quiet, message),
            done: 0,
        }
    }
}

impl Sink for ProgressSink {
    fn on_chunk(&mut self, chunk: &Chunk<'_>) -> Result<(), SinkError> {
        self.done += chunk.rows as u64;
        self.line.set(self.done);
        Ok(())
    }
    fn finish(&mut self, _ranked: &Ranked<'_>) -> Result<Written, SinkError> {
        self.line.finish();
        Ok(Written::new())
    }
}

impl Drop for ProgressSink {
    fn drop(&mut self) {
        self.line.finish();
    }
}

/// `--previous`: the comparison with a previous run, made once at the end for the workbook's
/// Changes sheet and the brief (both hold the same cell).
#[derive(Debug)]
pub struct ChangesSink<'a> {
    previous: Option<Previous>,
    into: &'a OnceCell<Changes>,
}

impl<'a> ChangesSink<'a> {
    /// Compares with `previous` into `into` (put it before the sinks that read `into`).
    pub fn new(previous: Previous, into: &'a OnceCell<Changes>) -> Self {
        ChangesSink {
            previous: Some(previous),
            into,
        }
    }
}

impl Sink for ChangesSink<'_> {
    fn finish(&mut self, ranked: &Ranked<'_>) -> Result<Written, SinkError> {
        if let Some(p) = self.previous.take() {
            let _ = self.into.set(report::changes::compare(p, ranked.screening));
        }
        Ok(Written::new())
    }
}

/// The results workbook (with its large-stock CSV files when a table passes the sheet
/// limit, and the Changes sheet when `changes` holds a comparison).
#[derive(Debug)]
pub struct WorkbookSink<'a> {
    out: PathBuf,
    changes: Option<&'a OnceCell<Changes>>,
    quiet: bool,
}

impl<'a> WorkbookSink<'a> {
    /// The workbook at `out`.
    pub fn new(out: &Path, changes: Option<&'a OnceCell<Changes>>, quiet: bool) -> Self {
        WorkbookSink {
            out: out.to_path_buf(),
            changes,
            quiet,
        }
    }
}

impl Sink for WorkbookSink<'_> {
    fn finish(&mut self, ranked: &Ranked<'_>) -> Result<Written, SinkError> {
        let report = ranked.screening;
        let progress = ProgressLine::spinner(self.quiet, "writing the workbook");
        let total = report::workbook::tables::RowCounts::of(report);
        progress.rows(
            (total.priority
                + total.retrofit
                + total.directions
                + total.walls
                + total.flags
                + total.not_screened
                + total.problems) as u64,
            "writing the workbook",
        );
        let changes = self.changes.and_then(OnceCell::get);
        let extra =
            report::workbook::write_with_changes(report, &self.out, changes, &|n| progress.set(n));
        progress.finish();
        let extra = extra.map_err(SinkError::at(&self.out))?;
        let mut written = vec![("workbook".to_string(), self.out.clone())];
        written.extend(extra);
        Ok(written)
    }
}

/// `--json`.
#[derive(Debug)]
pub struct JsonSink {
    path: PathBuf,
}

impl JsonSink {
    /// The JSON document at `path`.
    pub fn new(path: &Path) -> Self {
        JsonSink {
            path: path.to_path_buf(),
        }
    }
}

impl Sink for JsonSink {
    fn finish(&mut self, ranked: &Ranked<'_>) -> Result<Written, SinkError> {
        report::json::write(ranked.screening, &self.path).map_err(SinkError::at(&self.path))?;
        Ok(vec![("JSON".into(), self.path.clone())])
    }
}

/// `--csv`: the Priority table as CSV.
#[derive(Debug)]
pub struct PriorityCsvSink {
    path: PathBuf,
}

impl PriorityCsvSink {
    /// The Priority CSV at `path`.
    pub fn new(path: &Path) -> Self {
        PriorityCsvSink {
            path: path.to_path_buf(),
        }
    }
}

impl Sink for PriorityCsvSink {
    fn finish(&mut self, ranked: &Ranked<'_>) -> Result<Written, SinkError> {
        report::csv::write_priority(ranked.screening, &self.path)
            .map_err(SinkError::at(&self.path))?;
        Ok(vec![("CSV (Priority)".into(), self.path.clone())])
    }
}

/// `--geojson`.
#[derive(Debug)]
pub struct GeoJsonSink {
    path: PathBuf,
}

impl GeoJsonSink {
    /// The GeoJSON at `path`.
    pub fn new(path: &Path) -> Self {
        GeoJsonSink {
            path: path.to_path_buf(),
        }
    }
}

impl Sink for GeoJsonSink {
    fn finish(&mut self, ranked: &Ranked<'_>) -> Result<Written, SinkError> {
        report::geojson::write(ranked.screening, &self.path).map_err(SinkError::at(&self.path))?;
        Ok(vec![("GeoJSON".into(), self.path.clone())])
    }
}

/// The officials' brief (HTML): at `path` when given; else beside the workbook when
/// `always` or when the stock has coordinates or a budget plan.
#[derive(Debug)]
pub struct BriefSink<'a> {
    /// `--brief FILE`.
    pub path: Option<PathBuf>,
    /// The workbook path (the default brief goes beside it, named after it).
    pub workbook: PathBuf,
    /// Always write it (demo).
    pub always: bool,
    /// The inventory (a brief is never written over it).
    pub inventory: PathBuf,
    /// The map layers' files (the same the screening read).
    pub districts: Option<PathBuf>,
    /// Fault traces file.
    pub faults: Option<PathBuf>,
    /// The comparison with a previous run, when made ([`ChangesSink`]).
    pub changes: Option<&'a OnceCell<Changes>>,
}

fn same_file(a: &Path, b: &Path) -> bool {
    match (std::fs::canonicalize(a), std::fs::canonicalize(b)) {
        (Ok(x), Ok(y)) => x == y,
        _ => a == b,
    }
}

impl Sink for BriefSink<'_> {
    fn finish(&mut self, ranked: &Ranked<'_>) -> Result<Written, SinkError> {
        let report = ranked.screening;
        let out = &self.workbook;
        let Some(p) = self.path.clone().or_else(|| {
            (self.always || report::brief::wanted_by_default(report)).then(|| {
                let stem = out
                    .file_stem()
                    .map(|s| s.to_string_lossy().into_owned())
                    .unwrap_or_else(|| "screening".into());
                out.with_file_name(format!("{stem}-brief.html"))
            })
        }) else {
            return Ok(Written::new());
        };
        let at = SinkError::at(&p);
        if same_file(&p, &self.inventory) {
            return Err(at(report::ReportError::Io(std::io::Error::other(format!(
                "refusing to write the brief over the input file {}",
                self.inventory.display()
            )))));
        }
        if let Some(parent) = p.parent().filter(|p| !p.as_os_str().is_empty()) {
            std::fs::create_dir_all(parent).map_err(|e| at(e.into()))?;
        }
        // The map layers: the same files the screening read (their problems are already
        // on the Input problems sheet).
        let layers =
            crate::geography::Geography::load(self.districts.as_deref(), self.faults.as_deref())
                .ok()
                .map(|(g, _)| report::brief::MapLayers::from_geography(&g));
        let workbook_name = out.file_name().map(|n| n.to_string_lossy().into_owned());
        let brief = report::brief::Brief {
            report,
            layers: layers.as_ref(),
            changes: self.changes.and_then(OnceCell::get),
            workbook: workbook_name.as_deref(),
            made_at: std::time::SystemTime::now()
                .duration_since(std::time::UNIX_EPOCH)
                .map(|d| d.as_secs() as i64)
                .unwrap_or(0),
        };
        report::brief::write(&brief, &p).map_err(at)?;
        Ok(vec![("brief (HTML)".into(), p)])
    }
}

/// The terminal summary (counts per class, the ten highest priorities, the outputs of the
/// sinks before it, the caution): put it last. It keeps the text; the command prints it.
#[derive(Debug, Default)]
pub struct TerminalSink {
    /// An output path shown as "standard output" (the scratch file of `--json -` etc.).
    pub stdout_scratch: Option<PathBuf>,
    /// The summary, after [`Sink::finish`].
    pub text: Option<String>,
}

impl Sink for TerminalSink {
    fn finish(&mut self, ranked: &Ranked<'_>) -> Result<Written, SinkError> {
        let shown: Written = ranked
            .written
            .iter()
            .map(|(k, p)| {
                if Some(p) == self.stdout_scratch.as_ref() {
                    (k.clone(), PathBuf::from("standard output"))
                } else {
                    (k.clone(), p.clone())
                }
            })
            .collect();
        self.text = Some(report::terminal::summary(ranked.screening, &shown));
        Ok(Written::new())
    }
}
