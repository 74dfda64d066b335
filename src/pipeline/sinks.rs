/*!
Today's writers as [`Sink`]s of the one screening flow ([`super::run`]). Each sink calls the
writer's public function under `crate::report`; the writers stay as they are.

Whole-stock sinks write at [`Sink::finish`] from [`Ranked::screening`], which holds every
building in rank order when the source keeps its results.
*/

use std::cell::{OnceCell, RefCell};
use std::fs::File;
use std::io::{BufWriter, Write};
use std::path::{Path, PathBuf};

use super::flow::{Chunk, Ranked, RankedBuilding, Sink, SinkError, Written};
use crate::model::{Dir, FaultDistance, PerDir, Use};
use crate::report;
use crate::report::atomic::TempFile;
use crate::report::changes::{Changes, Previous};
use crate::report::json::{self, Placed, Spill};
use crate::report::terminal::ProgressLine;
use crate::report::workbook::tables::{self, RowCounts, TableId, Target};
use crate::report::workbook::{self, LARGE_PRIORITY_ROWS, Layout};
use crate::results::{
    BuildingDetail, BuildingResult, DirectionResult, Flag, FlagCode, FlagDetail, Governing, Levels,
    Screening,
};

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
pub struct TerminalSink<'a> {
    /// An output path shown as "standard output" (the scratch file of `--json -` etc.).
    pub stdout_scratch: Option<PathBuf>,
    /// On a chunked stock: the report of the first buildings ([`LargeWorkbookSink`]), for
    /// the ten highest priorities.
    pub top: Option<&'a OnceCell<Screening>>,
    /// The summary, after [`Sink::finish`].
    pub text: Option<String>,
}

impl Sink for TerminalSink<'_> {
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
        let report = match self.top.and_then(OnceCell::get) {
            Some(top) if !ranked.whole() => top,
            _ => ranked.screening,
        };
        self.text = Some(report::terminal::summary(report, &shown));
        Ok(Written::new())
    }
}

// ------------------------------------------------------------------------------------------
// Large stocks (a chunked source): the per-row tables are written as the chunks come, the
// ranked tables at the end from compact rows.
// ------------------------------------------------------------------------------------------

/// What the Priority and Retrofit plan rows, the GeoJSON and the Summary read of a building
/// besides its [`RankedBuilding`] (which holds its keys, rank and marked retrofit): a few
/// hundred bytes instead of a full result, kept by slot.
#[derive(Debug, Clone)]
struct StockRow {
    name: String,
    district: String,
    use_: Use,
    latitude: Option<f64>,
    longitude: Option<f64>,
    fault: Option<FaultDistance>,
    governing: Governing,
    dcr: PerDir<Levels>,
    priority_index_pct: PerDir<f64>,
    /// The distinct flag codes (what Priority shows; the details are in the Flags file).
    flag_codes: Vec<FlagCode>,
    floor_area_m2: f64,
}

impl StockRow {
    fn of(b: &BuildingResult) -> Self {
        let mut flag_codes: Vec<FlagCode> = Vec::new();
        for f in &b.flags {
            if !flag_codes.contains(&f.code) {
                flag_codes.push(f.code);
            }
        }
        StockRow {
            name: b.name.clone(),
            district: b.district.clone(),
            use_: b.use_,
            latitude: b.latitude,
            longitude: b.longitude,
            fault: b.fault.clone(),
            governing: b.governing,
            dcr: PerDir {
                x: b.directions.x.dcr,
                y: b.directions.y.dcr,
            },
            priority_index_pct: PerDir {
                x: b.directions.x.priority_index_pct,
                y: b.directions.y.priority_index_pct,
            },
            flag_codes,
            floor_area_m2: b.detail.floor_area_m2,
        }
    }

    /// A result holding what the Priority and Retrofit plan rows, the GeoJSON and the
    /// Summary read (other numbers are zero: they are in the per-row files).
    fn result(&self, key: &RankedBuilding) -> BuildingResult {
        let dir = |d: Dir| DirectionResult {
            priority_index_pct: *self.priority_index_pct.get(d),
            dcr: *self.dcr.get(d),
            ..Default::default()
        };
        BuildingResult {
            id: key.id.to_string(),
            name: self.name.clone(),
            district: self.district.clone(),
            use_: self.use_,
            occupants: key.occupants,
            latitude: self.latitude,
            longitude: self.longitude,
            fault: self.fault.clone(),
            rank: key.rank,
            class: key.class,
            score: key.score,
            governing: self.governing,
            axial_load_ratio: 0.0,
            strength_coefficient: PerDir::default(),
            directions: PerDir {
                x: dir(Dir::X),
                y: dir(Dir::Y),
            },
            flags: self
                .flag_codes
                .iter()
                .map(|&c| Flag::new(None, FlagDetail::CodeOnly(c)))
                .collect(),
            defaults_used: Vec::new(),
            retrofit: key.retrofit.as_deref().cloned(),
            uncertainty: None,
            row: key.row,
            detail: BuildingDetail {
                floor_area_m2: self.floor_area_m2,
                ..Default::default()
            },
            walls: Vec::new(),
        }
    }
}

/// The compact rows of a chunked stock, by slot, shared by the large-stock sinks (filled by
/// [`StockRowsSink`], which goes before them).
#[derive(Debug, Default)]
pub struct StockRows(RefCell<Vec<StockRow>>);

impl StockRows {
    /// The results for the ranked tables, in rank order.
    fn results<'r>(
        &'r self,
        order: &'r [RankedBuilding],
    ) -> impl Iterator<Item = BuildingResult> + 'r {
        let rows = self.0.borrow();
        order
            .iter()
            .filter_map(move |k| rows.get(k.slot).map(|r| r.result(k)))
    }
}

/// Keeps the compact row of every building of a chunked stock ([`StockRows`]).
#[derive(Debug)]
pub struct StockRowsSink<'a> {
    /// Where they go.
    pub rows: &'a StockRows,
}

impl Sink for StockRowsSink<'_> {
    fn on_chunk(&mut self, chunk: &Chunk<'_>) -> Result<(), SinkError> {
        let mut rows = self.rows.0.borrow_mut();
        debug_assert_eq!(rows.len(), chunk.first_slot);
        rows.extend(chunk.buildings.iter().map(StockRow::of));
        Ok(())
    }
    fn finish(&mut self, _ranked: &Ranked<'_>) -> Result<Written, SinkError> {
        Ok(Written::new())
    }
}

/// A per-row CSV file written chunk by chunk under a temporary name.
struct RowFile {
    table: TableId,
    path: PathBuf,
    tmp: TempFile,
    w: BufWriter<File>,
}

impl std::fmt::Debug for RowFile {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("RowFile").field("path", &self.path).finish()
    }
}

impl RowFile {
    fn create(out: &Path, table: TableId) -> Result<Self, SinkError> {
        let path = workbook::csv_path(out, table);
        let (tmp, f) = TempFile::create(&path).map_err(|e| SinkError::at(&path)(e.into()))?;
        let mut w = BufWriter::new(f);
        let mut header = ::csv::Writer::from_writer(&mut w);
        report::csv::write_header(table, &mut header).map_err(SinkError::at(&path))?;
        header.flush().map_err(|e| SinkError::at(&path)(e.into()))?;
        drop(header);
        Ok(RowFile {
            table,
            path,
            tmp,
            w,
        })
    }

    /// Flushes and renames the file. A file not finished (an error on the way) leaves
    /// nothing behind: its [`TempFile`] removes the temporary name when dropped.
    fn finish(mut self) -> Result<PathBuf, SinkError> {
        let path = self.path.clone();
        self.w.flush().map_err(|e| SinkError::at(&path)(e.into()))?;
        report::atomic::test_hold_before_rename();
        self.tmp
            .persist(&path)
            .map_err(|e| SinkError::at(&path)(e.into()))?;
        Ok(path)
    }
}

/// The workbook of a large stock (interface.md, large stocks): Directions, Walls and Flags
/// appended to `<out stem>.<sheet>.csv` as each chunk comes, in FILE order (the ranks are
/// known only at the end, so their rank column is left empty; every row carries the
/// building id); at the end the Priority and Retrofit plan CSV files in rank order and the
/// workbook with Summary, the first [`LARGE_PRIORITY_ROWS`] Priority rows, Not screened,
/// Input problems and Assumptions. The Summary's charts and per-district figures are built
/// from those first rows only (it says so); its counts cover every row. The report it
/// wrote from goes to `top` (the terminal summary's).
#[derive(Debug)]
pub struct LargeWorkbookSink<'a> {
    out: PathBuf,
    files: Vec<RowFile>,
    counts: RowCounts,
    rows: &'a StockRows,
    top: &'a OnceCell<Screening>,
}

impl<'a> LargeWorkbookSink<'a> {
    /// Creates the per-row files beside `out` (temporary names until the end).
    pub fn new(
        out: &Path,
        rows: &'a StockRows,
        top: &'a OnceCell<Screening>,
    ) -> Result<Self, SinkError> {
        let mut files = Vec::new();
        for t in [TableId::Directions, TableId::Walls, TableId::Flags] {
            files.push(RowFile::create(out, t)?);
        }
        Ok(LargeWorkbookSink {
            out: out.to_path_buf(),
            files,
            counts: RowCounts {
                priority: 0,
                retrofit: 0,
                directions: 0,
                walls: 0,
                flags: 0,
                not_screened: 0,
                problems: 0,
            },
            rows,
            top,
        })
    }
}

impl Sink for LargeWorkbookSink<'_> {
    fn on_chunk(&mut self, chunk: &Chunk<'_>) -> Result<(), SinkError> {
        for f in &mut self.files {
            report::csv::write_building_rows(chunk.buildings, f.table, true, &mut f.w)
                .map_err(SinkError::at(&f.path))?;
        }
        let b = chunk.buildings;
        self.counts.directions += 2 * b.len();
        self.counts.walls += b.iter().map(|b| b.walls.len()).sum::<usize>();
        self.counts.flags += b.iter().map(|b| b.flags.len()).sum::<usize>();
        Ok(())
    }

    fn finish(&mut self, ranked: &Ranked<'_>) -> Result<Written, SinkError> {
        let out = self.out.clone();
        let mut counts = self.counts;
        // Priority and Retrofit plan in rank order.
        let priority_path = workbook::csv_path(&out, TableId::Priority);
        let retrofit_path = workbook::csv_path(&out, TableId::Retrofit);
        write_ranked(
            self.rows,
            ranked.order,
            &priority_path,
            &retrofit_path,
            &mut counts,
        )?;
        for f in std::mem::take(&mut self.files) {
            f.finish()?;
        }
        let head = ranked.screening;
        counts.priority = ranked.order.len();
        counts.not_screened = head.not_screened.len();
        counts.problems = head.problems.len();
        let report = Screening {
            tool: head.tool,
            version: head.version,
            input: head.input.clone(),
            settings: head.settings.clone(),
            counts: head.counts.clone(),
            buildings: self
                .rows
                .results(&ranked.order[..ranked.order.len().min(LARGE_PRIORITY_ROWS)])
                .collect(),
            budget_plan: head.budget_plan.clone(),
            uncertainty: head.uncertainty.clone(),
            not_screened: head.not_screened.clone(),
            problems: head.problems.clone(),
        };
        let mut layout = Layout::plan(counts, ranked.order.len()).large_stock();
        layout.streamed = true;
        let extra = workbook::write_with_layout_except(
            &report,
            &out,
            &layout,
            &[
                TableId::Priority,
                TableId::Retrofit,
                TableId::Directions,
                TableId::Walls,
                TableId::Flags,
            ],
            &|_| {},
        )
        .map_err(SinkError::at(&out))?;
        let _ = self.top.set(report);
        let mut written = vec![("workbook".to_string(), out)];
        written.extend(extra);
        Ok(written)
    }
}

/// Writes the Priority and Retrofit plan CSV files in rank order (through temporary files).
fn write_ranked(
    rows: &StockRows,
    order: &[RankedBuilding],
    priority_path: &Path,
    retrofit_path: &Path,
    counts: &mut RowCounts,
) -> Result<(), SinkError> {
    use crate::report::csv::{write_cells, write_header};
    let mut num = String::new();
    report::atomic::write_atomic(priority_path, |w| {
        let mut w = ::csv::Writer::from_writer(w);
        write_header(TableId::Priority, &mut w)?;
        for b in rows.results(order) {
            let mut cells = Vec::with_capacity(TableId::Priority.columns().len());
            tables::priority_row(&b, Target::Csv, &mut cells);
            write_cells(&cells, false, &mut num, &mut w)?;
        }
        w.flush()?;
        Ok(())
    })
    .map_err(SinkError::at(priority_path))?;
    let mut n = 0usize;
    report::atomic::write_atomic(retrofit_path, |w| {
        let mut w = ::csv::Writer::from_writer(w);
        write_header(TableId::Retrofit, &mut w)?;
        // The running total as in the whole-stock Retrofit plan table.
        let mut cumulative = 0.0;
        let mut cum_known = true;
        for b in rows.results(order).filter(|b| b.retrofit.is_some()) {
            let cost = tables::funding_cost(&b);
            match cost {
                Some(v) if cum_known => cumulative += v,
                _ => cum_known = false,
            }
            let cum = (cum_known && cost.is_some()).then_some(cumulative);
            let mut cells = Vec::with_capacity(TableId::Retrofit.columns().len());
            tables::retrofit_row(&b, cum, Target::Csv, &mut cells);
            write_cells(&cells, false, &mut num, &mut w)?;
            n += 1;
        }
        w.flush()?;
        Ok(())
    })
    .map_err(SinkError::at(retrofit_path))?;
    counts.retrofit = n;
    Ok(())
}

/// `--json` on a chunked stock: each building's object is serialised as its chunk comes
/// (the same serialisation as the whole-stock document) to a spill file beside the output,
/// and at the end the objects are copied into the document in rank order with the rank
/// and the budget plan's `funded` mark filled in ([`json::Spill`]); the same bytes as the
/// whole-stock path. The spill file is removed afterwards (also on an error).
#[derive(Debug)]
pub struct SpilledJsonSink {
    path: PathBuf,
    spill: Option<Spill>,
}

impl SpilledJsonSink {
    /// The spill beside `path`.
    pub fn new(path: &Path) -> Result<Self, SinkError> {
        Ok(SpilledJsonSink {
            path: path.to_path_buf(),
            spill: Some(Spill::create(path).map_err(SinkError::at(path))?),
        })
    }
}

impl Sink for SpilledJsonSink {
    fn on_chunk(&mut self, chunk: &Chunk<'_>) -> Result<(), SinkError> {
        if let Some(s) = self.spill.as_mut() {
            for b in chunk.buildings {
                s.push(b).map_err(SinkError::at(&self.path))?;
            }
        }
        Ok(())
    }
    fn finish(&mut self, ranked: &Ranked<'_>) -> Result<Written, SinkError> {
        let Some(s) = self.spill.take() else {
            return Ok(Written::new());
        };
        let order = ranked.order.iter().map(|c| Placed {
            slot: c.slot,
            rank: c.rank,
            funded: c.retrofit.as_ref().and_then(|r| r.funded),
        });
        s.write_document(
            ranked.screening,
            order,
            json::is_compact(ranked.order.len()),
            &self.path,
        )
        .map_err(SinkError::at(&self.path))?;
        Ok(vec![("JSON".into(), self.path.clone())])
    }
}

/// `--csv` on a chunked stock: a copy of the Priority CSV the [`LargeWorkbookSink`] wrote
/// (put it after that sink).
#[derive(Debug)]
pub struct CopiedPriorityCsvSink {
    /// The large workbook's Priority CSV.
    pub from: PathBuf,
    /// `--csv FILE`.
    pub path: PathBuf,
}

impl Sink for CopiedPriorityCsvSink {
    fn finish(&mut self, _ranked: &Ranked<'_>) -> Result<Written, SinkError> {
        std::fs::copy(&self.from, &self.path).map_err(|e| SinkError::at(&self.path)(e.into()))?;
        Ok(vec![("CSV (Priority)".into(), self.path.clone())])
    }
}

/// `--geojson` on a chunked stock: written at the end from the compact rows in rank order
/// (its properties are the Priority columns).
#[derive(Debug)]
pub struct StockGeoJsonSink<'a> {
    /// Output path.
    pub path: PathBuf,
    /// The compact rows ([`StockRowsSink`]).
    pub rows: &'a StockRows,
}

impl Sink for StockGeoJsonSink<'_> {
    fn finish(&mut self, ranked: &Ranked<'_>) -> Result<Written, SinkError> {
        report::geojson::write_buildings(self.rows.results(ranked.order), &self.path)
            .map_err(SinkError::at(&self.path))?;
        Ok(vec![("GeoJSON".into(), self.path.clone())])
    }
}
