/*!
The streaming path of `screen` for a large CSV stock: bounded memory instead of holding every
record and every full result.

Used for a `.csv` inventory with no sibling sheet files (`<stem>.walls.csv`, …) and more
lines than a threshold ([`STREAM_FROM_ROWS`], overridable with the `SEISTRIAGE_STREAM_FROM`
environment variable for tests). The steps:
1. a first pass over the file: id → rows, kept only for ids on more than one row, so that a
   repeated id is refused on every one of its rows as in the whole-file read;
2. a second pass in chunks of [`CHUNK_ROWS`] rows: validate (with the duplicates of step 1),
   place (geography), screen, size retrofits; the Directions, Walls and Flags rows are
   appended to their `<out stem>.<sheet>.csv` files as each chunk completes, in FILE order
   (the ranks are known only at the end, so their rank column is left empty; every row
   carries the building id), and one compact row per building is kept;
3. the compact rows are ranked with the order of method §11 ([`rank::key_order`], the same
   order as the whole-stock path), the budget plan is made on them, the Priority and Retrofit
   plan CSV files are written in rank order and the workbook gets Summary, the first
   [`LARGE_PRIORITY_ROWS`] Priority rows, Not screened, Input problems and Assumptions
   (interface.md, large stocks). The Summary's charts and per-district figures are built from
   those first rows only (it says so); its counts cover every row.

`--json` is streamed too: in step 2 each building's object is serialised (the same
serialisation as the whole-stock path) to a spill file beside the JSON output, and in step 3
the objects are copied into the document in rank order, with the rank and the budget plan's
`funded` mark filled in ([`json::Spill`]); the spill file is removed afterwards (also on an
error). `--geojson` is written in step 3 from the compact rows (its properties are the
Priority columns). Both give the same bytes as the whole-stock path.
*/

use std::collections::HashMap;
use std::fs::File;
use std::io::{BufWriter, Read, Write};
use std::path::{Path, PathBuf};

use crate::engine::{self, rank};
use crate::geography::{self, Geography};
use crate::input::{self, InputError};
use crate::model::{Dir, FaultDistance, Inventory, PerDir, Problem, Severity, Use};
use crate::pipeline::{self, PipelineError, RunOptions};
use crate::report::ReportError;
use crate::report::atomic::TempFile;
use crate::report::json::{self, Placed, Spill};
use crate::report::workbook::tables::{self, RowCounts, TableId, Target};
use crate::report::workbook::{self, LARGE_PRIORITY_ROWS, Layout};
use crate::results::{
    BuildingDetail, BuildingResult, Counts, DirectionResult, Flag, FlagCode, FlagDetail, Governing,
    InputInfo, Levels, Retrofit, Screening,
};
use crate::retrofit::{self, Fundable};

/// Inventories with more lines than this are screened on the streaming path: from here on
/// the Directions sheet (two rows per building plus its header) would pass the sheet row
/// limit (lines count the header: 524,288 lines = 524,287 buildings still fit), so interface.md's large-stock rule sends the per-row tables to CSV files anyway
/// and the streamed outputs have the same shape as the whole-stock path's. Below it the
/// whole-stock path keeps every table in the workbook (at the cost of memory that grows
/// with the stock: about 0.63 GB at 100,000 buildings).
pub const STREAM_FROM_ROWS: usize = workbook::SHEET_ROWS / 2;

/// Rows per chunk.
pub const CHUNK_ROWS: usize = 20_000;

/// Environment variable that overrides [`STREAM_FROM_ROWS`] (tests).
pub const STREAM_FROM_ENV: &str = "SEISTRIAGE_STREAM_FROM";

/// Environment variable that overrides [`CHUNK_ROWS`] (tests, to cross chunk boundaries).
pub const CHUNK_ENV: &str = "SEISTRIAGE_STREAM_CHUNK";

/// Rows per chunk in force: [`CHUNK_ENV`] when set to a positive number, else [`CHUNK_ROWS`].
pub fn chunk_rows() -> usize {
    std::env::var(CHUNK_ENV)
        .ok()
        .and_then(|v| v.trim().parse().ok())
        .filter(|n| *n > 0)
        .unwrap_or(CHUNK_ROWS)
}

/// Failures of the streaming path.
#[derive(Debug, thiserror::Error)]
pub enum StreamError {
    /// Reading, settings or geography.
    #[error(transparent)]
    Pipeline(#[from] PipelineError),
    /// Writing an output.
    #[error("writing {path}: {source}")]
    Write {
        /// Output path.
        path: String,
        /// What failed.
        source: ReportError,
    },
}

impl From<InputError> for StreamError {
    fn from(e: InputError) -> Self {
        StreamError::Pipeline(PipelineError::Input(e))
    }
}

fn write_err(path: &Path) -> impl Fn(ReportError) -> StreamError + '_ {
    move |source| StreamError::Write {
        path: path.display().to_string(),
        source,
    }
}

/// The threshold in force: [`STREAM_FROM_ENV`] when set to a number, else
/// [`STREAM_FROM_ROWS`].
pub fn threshold() -> usize {
    std::env::var(STREAM_FROM_ENV)
        .ok()
        .and_then(|v| v.trim().parse().ok())
        .unwrap_or(STREAM_FROM_ROWS)
}

/// Whether `path` is screened on the streaming path: a `.csv` file with no sibling sheet
/// files and more lines than `from_rows` (lines, counted without parsing: the header and any
/// blank lines count too, so this is a cheap upper bound of the data rows).
pub fn applies(path: &Path, from_rows: usize) -> bool {
    let is_csv = path
        .extension()
        .is_some_and(|e| e.to_string_lossy().eq_ignore_ascii_case("csv"));
    if !is_csv || input::csv_has_siblings(path) {
        return false;
    }
    let Ok(mut f) = File::open(path) else {
        return false;
    };
    let mut buf = vec![0u8; 1 << 16];
    let mut lines = 0usize;
    loop {
        match f.read(&mut buf) {
            Ok(0) | Err(_) => break,
            Ok(n) => {
                lines += buf.iter().take(n).filter(|b| **b == b'\n').count();
                if lines > from_rows {
                    return true;
                }
            }
        }
    }
    false
}

/// One building kept between the chunks and the end: what the Priority and Retrofit plan
/// rows, the ranking and the budget plan need (a few hundred bytes instead of a full result).
#[derive(Debug, Clone)]
struct Compact {
    id: String,
    name: String,
    district: String,
    use_: Use,
    occupants: Option<u64>,
    latitude: Option<f64>,
    longitude: Option<f64>,
    fault: Option<FaultDistance>,
    rank: usize,
    class: u8,
    score: f64,
    governing: Governing,
    row: usize,
    dcr: PerDir<Levels>,
    priority_index_pct: PerDir<f64>,
    /// The distinct flag codes (what Priority shows; the details are in the Flags file).
    flag_codes: Vec<FlagCode>,
    floor_area_m2: f64,
    retrofit: Option<Box<Retrofit>>,
    /// Position in file order (the slot of its object in the JSON spill).
    slot: usize,
}

impl Compact {
    fn of(b: BuildingResult, slot: usize) -> Self {
        // Flag details are in the Flags file already; the codes are what Priority shows.
        let mut flag_codes: Vec<FlagCode> = Vec::new();
        for f in &b.flags {
            if !flag_codes.contains(&f.code) {
                flag_codes.push(f.code);
            }
        }
        Compact {
            priority_index_pct: PerDir {
                x: b.directions.x.priority_index_pct,
                y: b.directions.y.priority_index_pct,
            },
            dcr: PerDir {
                x: b.directions.x.dcr,
                y: b.directions.y.dcr,
            },
            id: b.id,
            name: b.name,
            district: b.district,
            use_: b.use_,
            occupants: b.occupants,
            latitude: b.latitude,
            longitude: b.longitude,
            fault: b.fault,
            rank: b.rank,
            class: b.class,
            score: b.score,
            governing: b.governing,
            row: b.row,
            flag_codes,
            floor_area_m2: b.detail.floor_area_m2,
            retrofit: b.retrofit.map(Box::new),
            slot,
        }
    }

    fn key(&self) -> rank::RankKey<'_> {
        rank::RankKey {
            class: self.class,
            score: self.score,
            occupants: self.occupants.unwrap_or(0),
            min_pi_pct: self.priority_index_pct.x.min(self.priority_index_pct.y),
            id: &self.id,
            row: self.row,
        }
    }

    /// A result holding what the Priority and Retrofit plan rows and the Summary read
    /// (other numbers are zero: they are in the per-row files).
    fn result(&self) -> BuildingResult {
        let dir = |d: Dir| DirectionResult {
            priority_index_pct: *self.priority_index_pct.get(d),
            dcr: *self.dcr.get(d),
            ..Default::default()
        };
        BuildingResult {
            id: self.id.clone(),
            name: self.name.clone(),
            district: self.district.clone(),
            use_: self.use_,
            occupants: self.occupants,
            latitude: self.latitude,
            longitude: self.longitude,
            fault: self.fault.clone(),
            rank: self.rank,
            class: self.class,
            score: self.score,
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
            retrofit: self.retrofit.as_deref().cloned(),
            uncertainty: None,
            row: self.row,
            detail: BuildingDetail {
                floor_area_m2: self.floor_area_m2,
                ..Default::default()
            },
            walls: Vec::new(),
        }
    }
}

impl Fundable for Compact {
    fn rank(&self) -> usize {
        self.rank
    }
    fn id(&self) -> &str {
        &self.id
    }
    fn occupants(&self) -> Option<u64> {
        self.occupants
    }
    fn class(&self) -> u8 {
        self.class
    }
    fn retrofit(&self) -> Option<&Retrofit> {
        self.retrofit.as_deref()
    }
    fn retrofit_mut(&mut self) -> Option<&mut Retrofit> {
        self.retrofit.as_deref_mut()
    }
}

/// A per-row CSV file written chunk by chunk under a temporary name.
struct RowFile {
    table: TableId,
    path: PathBuf,
    tmp: TempFile,
    w: BufWriter<File>,
}

impl RowFile {
    fn create(out: &Path, table: TableId) -> Result<Self, StreamError> {
        let path = workbook::csv_path(out, table);
        let (tmp, f) = TempFile::create(&path).map_err(|e| write_err(&path)(ReportError::Io(e)))?;
        let mut w = BufWriter::new(f);
        let mut header = ::csv::Writer::from_writer(&mut w);
        crate::report::csv::write_header(table, &mut header).map_err(write_err(&path))?;
        header
            .flush()
            .map_err(|e| write_err(&path)(ReportError::Io(e)))?;
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
    fn finish(mut self) -> Result<PathBuf, StreamError> {
        let path = self.path.clone();
        self.w
            .flush()
            .map_err(|e| write_err(&path)(ReportError::Io(e)))?;
        crate::report::atomic::test_hold_before_rename();
        self.tmp
            .persist(&path)
            .map_err(|e| write_err(&path)(ReportError::Io(e)))?;
        Ok(path)
    }
}

/// What the streaming path produced: a report of the first [`LARGE_PRIORITY_ROWS`] buildings
/// in rank order with the counts, budget plan, not-screened rows and problems of the whole
/// stock (for the terminal summary), and the files written.
#[derive(Debug)]
pub struct Streamed {
    /// Screening with the top buildings only (its counts cover the whole stock).
    pub report: Screening,
    /// Files written, with a label.
    pub written: Vec<(String, PathBuf)>,
}

/// The outputs asked for besides the workbook and its per-row CSV files.
#[derive(Debug, Clone, Copy, Default)]
pub struct Extras<'a> {
    /// `--csv`: the Priority CSV.
    pub priority_csv: Option<&'a Path>,
    /// `--json`.
    pub json: Option<&'a Path>,
    /// `--geojson`.
    pub geojson: Option<&'a Path>,
}

/// Step 1: the ids on more than one building row of a CSV stock → their rows (ascending),
/// from a pass that reads only the id column ([`input::csv::read_ids`]; the rows and their
/// numbers are those the chunked read validates). Every id's first row is kept in one map;
/// only a repeated id gets a list.
pub fn repeated_ids(
    path: &Path,
    read: &input::ReadOptions,
) -> Result<HashMap<String, Vec<usize>>, InputError> {
    let mut first: HashMap<Box<str>, usize> = HashMap::new();
    let mut duplicates: HashMap<String, Vec<usize>> = HashMap::new();
    input::csv::read_ids(path, read.header_row, &read.budget, &mut |id, row| {
        if id.is_empty() {
            return;
        }
        match first.get(id) {
            Some(&at) => duplicates
                .entry(id.to_string())
                .or_insert_with(|| vec![at])
                .push(row),
            None => {
                first.insert(Box::from(id), row);
            }
        }
    })?;
    for rows in duplicates.values_mut() {
        rows.sort_unstable();
    }
    duplicates.shrink_to_fit();
    Ok(duplicates)
}

/// Screens a large CSV stock in chunks and writes the workbook `out`, its per-row CSV files
/// beside it and the `extras` asked for (not the JSON and GeoJSON when no building could be
/// screened, as on the whole-stock path). `progress` gets rows screened.
pub fn screen_to_files(
    path: &Path,
    opts: &RunOptions,
    out: &Path,
    extras: Extras<'_>,
    chunk_rows: usize,
    progress: &dyn Fn(u64),
) -> Result<Streamed, StreamError> {
    let mut problems: Vec<Problem> = Vec::new();
    // No settings sheet on this path (a CSV with sibling files is read whole).
    let settings = pipeline::settle_settings(&[], &mut problems, opts)?;
    // The rows are checked against the limits of the effective settings, as in
    // `pipeline::load`.
    let read = input::ReadOptions {
        limits: input::Limits::from_settings(&settings),
        ..opts.read.clone()
    };
    let (geo, geo_problems) = Geography::load(opts.districts.as_deref(), opts.faults.as_deref())
        .map_err(PipelineError::from)?;

    // 1. Ids on more than one row.
    let duplicates = repeated_ids(path, &read)?;

    // 2. Chunks.
    let mut files = Vec::new();
    for t in [TableId::Directions, TableId::Walls, TableId::Flags] {
        files.push(RowFile::create(out, t)?);
    }
    let mut spill = match extras.json {
        Some(p) => Some(Spill::create(p).map_err(write_err(p))?),
        None => None,
    };
    let mut kept: Vec<Compact> = Vec::new();
    let mut not_screened = Vec::new();
    let mut row_problems = Vec::new();
    let mut site_problems = Vec::new();
    let mut rows_done = 0u64;
    let mut counts = RowCounts {
        priority: 0,
        retrofit: 0,
        directions: 0,
        walls: 0,
        flags: 0,
        not_screened: 0,
        problems: 0,
    };
    let mut failure: Option<StreamError> = None;
    let mut part = Screening {
        tool: "seistriage",
        version: env!("CARGO_PKG_VERSION"),
        input: InputInfo {
            file: path.display().to_string(),
            sha256: String::new(),
        },
        settings: settings.clone(),
        counts: Counts::tally(0, 0, 0, &[]),
        buildings: Vec::new(),
        budget_plan: None,
        uncertainty: None,
        not_screened: Vec::new(),
        problems: Vec::new(),
    };
    let rest = read_chunks_ahead(path, &read, chunk_rows, &duplicates, &mut |mut inv| {
        if failure.is_some() {
            return;
        }
        rows_done += inv.rows as u64;
        let (sites, sp) = geography::locate(&inv.buildings, &geo, &settings);
        site_problems.extend(sp);
        row_problems.append(&mut inv.problems);
        not_screened.append(&mut inv.not_screened);
        let inputs = engine::building_inputs(&inv, &sites);
        let screening = engine::screen_all(&inputs, &settings);
        let mut chunk = screening.buildings;
        retrofit::size_all(&mut chunk, &inputs, &settings);
        not_screened.extend(screening.not_screened);
        // File order for the per-row files (ranks come at the end).
        chunk.sort_by_key(|b| b.row);
        part.buildings = chunk;
        for f in &mut files {
            if let Err(e) =
                crate::report::csv::write_rows(&part, f.table, usize::MAX, true, &mut f.w)
            {
                failure = Some(write_err(&f.path)(e));
                return;
            }
        }
        counts.directions += 2 * part.buildings.len();
        counts.walls += part.buildings.iter().map(|b| b.walls.len()).sum::<usize>();
        counts.flags += part.buildings.iter().map(|b| b.flags.len()).sum::<usize>();
        for b in std::mem::take(&mut part.buildings) {
            if let (Some(s), Some(p)) = (spill.as_mut(), extras.json)
                && let Err(e) = s.push(&b)
            {
                failure = Some(write_err(p)(e));
                return;
            }
            let slot = kept.len();
            kept.push(Compact::of(b, slot));
        }
        progress(rows_done);
    })?;
    if let Some(e) = failure {
        return Err(e);
    }
    drop(duplicates);

    // 3. Rank, budget, write.
    // In place and without a buffer (the keys end with id and row, a total order, so an
    // unstable sort gives the same order as the stable one of the whole-stock path).
    let mut ranked = kept;
    ranked.sort_unstable_by(|a, b| rank::key_order(&a.key(), &b.key()));
    for (i, c) in ranked.iter_mut().enumerate() {
        c.rank = i + 1;
    }
    let budget_plan = retrofit::budget_plan(&mut ranked, &settings);
    not_screened.sort_by(|a, b| (a.sheet.as_str(), a.row).cmp(&(b.sheet.as_str(), b.row)));

    let mut all_problems = rest.problems;
    all_problems.extend(row_problems);
    all_problems.extend(problems);
    all_problems.extend(geo_problems);
    all_problems.extend(site_problems);
    if let Some(message) = retrofit::budget_plan_unavailable(&settings) {
        all_problems.push(Problem {
            sheet: "settings".into(),
            row: None,
            column: "budget".into(),
            message,
            severity: Severity::Warning,
        });
    }
    let mut by_class = [0usize; 4];
    for c in &ranked {
        let i = usize::from(c.class.clamp(1, 4)) - 1;
        if let Some(n) = by_class.get_mut(i) {
            *n += 1;
        }
    }
    let top: Vec<BuildingResult> = ranked
        .iter()
        .take(LARGE_PRIORITY_ROWS)
        .map(Compact::result)
        .collect();
    let mut report_counts = Counts::tally(rest.rows, rest.blank_rows, not_screened.len(), &top);
    report_counts.screened = ranked.len();
    report_counts.by_class.c1 = by_class[0];
    report_counts.by_class.c2 = by_class[1];
    report_counts.by_class.c3 = by_class[2];
    report_counts.by_class.c4 = by_class[3];

    let mut written = Vec::new();
    // Priority and Retrofit plan in rank order.
    let priority_path = workbook::csv_path(out, TableId::Priority);
    let retrofit_path = workbook::csv_path(out, TableId::Retrofit);
    write_ranked(&ranked, &priority_path, &retrofit_path, &mut counts)?;
    let mut moved = Vec::new();
    for f in files {
        moved.push(f.finish()?);
    }
    counts.priority = ranked.len();
    counts.not_screened = not_screened.len();
    counts.problems = all_problems.len();

    let mut report = Screening {
        tool: "seistriage",
        version: env!("CARGO_PKG_VERSION"),
        input: InputInfo {
            file: path.display().to_string(),
            sha256: crate::pipeline::sha256_hex(path),
        },
        settings,
        counts: report_counts,
        buildings: Vec::new(),
        budget_plan,
        uncertainty: None,
        not_screened,
        problems: all_problems,
    };
    // JSON and GeoJSON in rank order, while the compact rows are at hand.
    let mut late = Vec::new();
    if let (Some(p), Some(s)) = (extras.json, spill.take())
        && !ranked.is_empty()
    {
        let order = ranked.iter().map(|c| Placed {
            slot: c.slot,
            rank: c.rank,
            funded: c.retrofit.as_ref().and_then(|r| r.funded),
        });
        s.write_document(&report, order, json::is_compact(ranked.len()), p)
            .map_err(write_err(p))?;
        late.push(("JSON".to_string(), p.to_path_buf()));
    }
    if let Some(p) = extras.geojson
        && !ranked.is_empty()
    {
        crate::report::geojson::write_buildings(ranked.iter().map(Compact::result), p)
            .map_err(write_err(p))?;
    }
    report.buildings = top;
    let mut layout = Layout::plan(counts, ranked.len()).large_stock();
    layout.streamed = true;
    drop(ranked);
    let extra = workbook::write_with_layout_except(
        &report,
        out,
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
    .map_err(write_err(out))?;
    written.push(("workbook".to_string(), out.to_path_buf()));
    written.extend(extra);
    written.append(&mut late);
    if let Some(p) = extras.priority_csv {
        std::fs::copy(&priority_path, p).map_err(|e| write_err(p)(ReportError::Io(e)))?;
        written.push(("CSV (Priority)".into(), p.to_path_buf()));
    }
    if let Some(p) = extras.geojson
        && report.counts.screened > 0
    {
        written.push(("GeoJSON".into(), p.to_path_buf()));
    }
    Ok(Streamed { report, written })
}

/// [`input::read_csv_chunks`] on a thread of its own, one chunk ahead: while `on_chunk`
/// screens and writes a chunk on this thread, the next one is read (at most one read chunk
/// waits, so memory stays bounded). Chunks arrive in file order, as from the reader itself.
fn read_chunks_ahead(
    path: &Path,
    read: &input::ReadOptions,
    chunk_rows: usize,
    duplicates: &HashMap<String, Vec<usize>>,
    on_chunk: &mut dyn FnMut(Inventory),
) -> Result<Inventory, InputError> {
    std::thread::scope(|scope| {
        let (tx, rx) = std::sync::mpsc::sync_channel(1);
        let reader = scope.spawn(move || {
            input::read_csv_chunks(path, read, chunk_rows, duplicates, &mut |inv| {
                // A closed channel means the screening side has gone: nothing to deliver to.
                let _ = tx.send(inv);
            })
        });
        for inv in rx {
            on_chunk(inv);
        }
        reader
            .join()
            .unwrap_or_else(|panic| std::panic::resume_unwind(panic))
    })
}

/// Writes the Priority and Retrofit plan CSV files in rank order (through temporary files).
fn write_ranked(
    ranked: &[Compact],
    priority_path: &Path,
    retrofit_path: &Path,
    counts: &mut RowCounts,
) -> Result<(), StreamError> {
    use crate::report::csv::{write_cells, write_header};
    let mut num = String::new();
    crate::report::atomic::write_atomic(priority_path, |w| {
        let mut w = ::csv::Writer::from_writer(w);
        write_header(TableId::Priority, &mut w)?;
        for c in ranked {
            let b = c.result();
            let mut cells = Vec::with_capacity(TableId::Priority.columns().len());
            tables::priority_row(&b, Target::Csv, &mut cells);
            write_cells(&cells, false, &mut num, &mut w)?;
        }
        w.flush()?;
        Ok(())
    })
    .map_err(write_err(priority_path))?;
    let mut n = 0usize;
    crate::report::atomic::write_atomic(retrofit_path, |w| {
        let mut w = ::csv::Writer::from_writer(w);
        write_header(TableId::Retrofit, &mut w)?;
        // The running total as in the whole-stock Retrofit plan table.
        let mut cumulative = 0.0;
        let mut cum_known = true;
        for c in ranked.iter().filter(|c| c.retrofit.is_some()) {
            let b = c.result();
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
    .map_err(write_err(retrofit_path))?;
    counts.retrofit = n;
    Ok(())
}

#[cfg(test)]
mod tests {
    #![allow(clippy::unwrap_used, clippy::expect_used)]

    use super::*;

    /// The first pass as it was before the ids-only reader: the whole chunked read
    /// (every row parsed and validated), ids of accepted and refused rows alike.
    fn ids_of_full_read(
        path: &Path,
        read: &input::ReadOptions,
    ) -> Result<HashMap<String, Vec<usize>>, InputError> {
        let mut all: HashMap<String, Vec<usize>> = HashMap::new();
        input::read_csv_chunks(path, read, 7, &HashMap::new(), &mut |inv| {
            for (id, row) in inv
                .buildings
                .iter()
                .map(|b| (&b.id, b.row))
                .chain(inv.not_screened.iter().map(|n| (&n.id, n.row)))
            {
                if !id.is_empty() {
                    all.entry(id.clone()).or_default().push(row);
                }
            }
        })?;
        all.retain(|_, rows| rows.len() > 1);
        for rows in all.values_mut() {
            rows.sort_unstable();
        }
        Ok(all)
    }

    /// Generated rows (header first), as lines.
    fn generated(n: usize) -> Vec<String> {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("g.csv");
        crate::demo::write_generated(n, &p, 5).unwrap();
        std::fs::read_to_string(&p)
            .unwrap()
            .lines()
            .map(str::to_string)
            .collect()
    }

    fn with_id(line: &str, id: &str) -> String {
        let (_, rest) = line.split_once(',').unwrap();
        format!("{id},{rest}")
    }

    #[test]
    fn the_ids_only_pass_finds_the_rows_of_the_full_read() {
        let mut lines = generated(60);
        let id10 = lines[10].split(',').next().unwrap().to_string();
        let id20 = lines[20].split(',').next().unwrap().to_string();
        // The id of row 10 three times (once with spaces around it, once on a row that
        // cannot be screened), the id of row 20 twice, one row with its name spanning two
        // lines (quoted), one with a blank id, blank lines, and two title lines above the
        // header.
        let header: Vec<String> = lines[0].split(',').map(str::to_string).collect();
        let storeys = header.iter().position(|h| h == "storeys").unwrap();
        let mut bad: Vec<String> = with_id(&lines[30], &id10)
            .split(',')
            .map(str::to_string)
            .collect();
        bad[storeys] = "abc".into();
        lines[30] = bad.join(",");
        lines[40] = with_id(&lines[40], &format!("\"  {id10} \""));
        lines[50] = with_id(&lines[50], &id20);
        lines[15] = with_id(&lines[15], "");
        let mut quoted: Vec<String> = lines[25].split(',').map(str::to_string).collect();
        quoted[1] = "\"two\nlines\"".into();
        lines[25] = quoted.join(",");
        lines.insert(35, String::new());
        lines.insert(0, String::new());
        lines.insert(0, "Invented stock, for a test".into());
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("stock.csv");
        std::fs::write(&p, lines.join("\n") + "\n").unwrap();
        let read = input::ReadOptions::default();
        let fast = repeated_ids(&p, &read).unwrap();
        assert_eq!(fast, ids_of_full_read(&p, &read).unwrap());
        // Person rows: two title lines (1, 2), header 3, generated line k at k + 3; the
        // blank line inserted at 35 moves the lines after it one row down.
        assert_eq!(fast.get(&id10), Some(&vec![13, 33, 44]));
        assert_eq!(fast.get(&id20), Some(&vec![23, 54]));
        assert_eq!(fast.len(), 2);
    }

    #[test]
    fn the_ids_only_pass_reads_semicolons_a_bom_and_windows_1252_like_the_full_read() {
        let lines = generated(20);
        let mut text = b"\xEF\xBB\xBF".to_vec();
        for (i, line) in lines.iter().enumerate() {
            // `;` as delimiter; decimal commas do not matter to the ids.
            let mut l = line.replace(',', ";").replace('.', ",");
            if i == 3 || i == 12 {
                l = with_id(&l.replace(';', ","), "Bloc\u{e9}-1").replace(',', ";");
            }
            let bytes = encoding_rs::WINDOWS_1252.encode(&l).0.into_owned();
            text.extend(bytes);
            text.extend(b"\r\n");
        }
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("stock.csv");
        std::fs::write(&p, &text).unwrap();
        let read = input::ReadOptions::default();
        let fast = repeated_ids(&p, &read).unwrap();
        assert_eq!(fast, ids_of_full_read(&p, &read).unwrap());
        assert_eq!(fast.get("Bloc\u{e9}-1"), Some(&vec![4, 13]));
    }

    #[test]
    fn the_ids_only_pass_honours_the_header_row_and_refuses_a_bad_header_alike() {
        let mut lines = generated(12);
        let id = lines[2].split(',').next().unwrap().to_string();
        lines[9] = with_id(&lines[9], &id);
        // A row above the header that looks like data: only --header-row tells them apart.
        lines.insert(0, lines[5].clone());
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("stock.csv");
        std::fs::write(&p, lines.join("\n") + "\n").unwrap();
        let read = input::ReadOptions {
            header_row: Some(2),
            ..Default::default()
        };
        let fast = repeated_ids(&p, &read).unwrap();
        assert_eq!(fast, ids_of_full_read(&p, &read).unwrap());
        assert_eq!(fast.get(&id), Some(&vec![4, 11]));

        // No id column: the same refusal as the full read.
        let no_id: Vec<String> = lines[1..]
            .iter()
            .map(|l| l.split_once(',').unwrap().1.to_string())
            .collect();
        std::fs::write(&p, no_id.join("\n") + "\n").unwrap();
        let read = input::ReadOptions::default();
        let fast = repeated_ids(&p, &read).unwrap_err().to_string();
        assert_eq!(fast, ids_of_full_read(&p, &read).unwrap_err().to_string());
        assert!(fast.contains("id"), "{fast}");
    }
}
