/*!
The one screening flow (issue 12, `docs/one-flow.md`): a [`Source`] gives the inventory as
chunks (a whole file is one chunk), [`run`] screens and sizes each chunk, hands it to every
[`Sink`] ([`Sink::on_chunk`]), keeps one compact [`RankedBuilding`] per building, ranks them
(method §11), makes the budget plan (method §12; the only call of
[`retrofit::budget_plan`]) and gives every sink the [`Ranked`] summary ([`Sink::finish`]).

The whole-stock path and the large-stock path are the same driver with different sources
and sinks: a whole file keeps its full results ([`Source::keeps_results`]), so
[`Ranked::screening`] holds every building in rank order (and the §13 uncertainty stage runs
on them); a chunked source keeps only the compact keys, and its sinks write as the chunks
come (per-row CSV files, the JSON spill).
*/

use std::borrow::Cow;
use std::path::{Path, PathBuf};

use std::collections::HashMap;

use crate::engine::{self, BuildingInput, rank};
use crate::geography::Geography;
use crate::input::{self, InputError};
use crate::model::{Inventory, NotScreened, Problem, Severity};
use crate::report::ReportError;
use crate::results::{BuildingResult, Counts, InputInfo, Retrofit, Screening};
use crate::retrofit::{self, Fundable};
use crate::settings::Settings;

use super::{Loaded, PipelineError, RunOptions};

/// Files written, each with the label the terminal summary shows.
pub type Written = Vec<(String, PathBuf)>;

/// One output (or later stage) of a screening run. Sinks are called in the order given to
/// [`run`]: every chunk goes to every sink, then every sink gets [`Sink::finish`].
pub trait Sink {
    /// One screened chunk (buildings sized, not yet ranked across the stock). The default
    /// does nothing: a whole-stock writer writes everything at [`Sink::finish`].
    fn on_chunk(&mut self, chunk: &Chunk<'_>) -> Result<(), SinkError> {
        let _ = chunk;
        Ok(())
    }

    /// The ranked summary of the whole stock; returns the files written (label, path).
    /// Not called when no building could be screened (nothing is written then).
    fn finish(&mut self, ranked: &Ranked<'_>) -> Result<Written, SinkError>;
}

/// A sink failed: which file, and why.
#[derive(Debug, thiserror::Error)]
#[error("writing {path}: {error}")]
pub struct SinkError {
    /// The output's path.
    pub path: String,
    /// What failed (not a `source`: the message holds it once, not twice).
    pub error: ReportError,
}

impl SinkError {
    /// `error` while writing `path`.
    pub fn at(path: &Path) -> impl Fn(ReportError) -> SinkError + '_ {
        move |error| SinkError {
            path: path.display().to_string(),
            error,
        }
    }
}

/// One screened chunk, as every sink sees it.
#[derive(Debug)]
pub struct Chunk<'a> {
    /// The chunk's screened buildings in file order (ascending row), retrofits sized, with
    /// their typed flags. `rank` and the budget marks are not final (see [`Ranked`]).
    pub buildings: &'a [BuildingResult],
    /// The chunk's inputs (one per building row read, screened or not; match a result to
    /// its input by `record.row`).
    pub inputs: &'a [BuildingInput<'a>],
    /// Rows of this chunk that were not screened (read or engine refusals), file order.
    pub not_screened: &'a [NotScreened],
    /// The slot of `buildings[0]`: slots number the screened buildings of the whole stock
    /// in the order the chunks gave them ([`RankedBuilding::slot`]).
    pub first_slot: usize,
    /// Inventory rows read in this chunk (progress).
    pub rows: usize,
    /// The settings in force.
    pub settings: &'a Settings,
}

/// What the driver keeps of one screened building between the chunks and the end: the
/// keys of method §11's order, its slot, and its retrofit for the budget plan.
#[derive(Debug, Clone)]
pub struct RankedBuilding {
    /// Building id.
    pub id: Box<str>,
    /// Class 1–4.
    pub class: u8,
    /// Score.
    pub score: f64,
    /// Occupants.
    pub occupants: Option<u64>,
    /// Smaller priority index of the two directions (%).
    pub min_pi_pct: f64,
    /// Spreadsheet row.
    pub row: usize,
    /// Position in the order the chunks gave the buildings (see [`Chunk::first_slot`]).
    pub slot: usize,
    /// Rank 1..N (set by [`run`] after all chunks).
    pub rank: usize,
    /// The sized retrofit; after the budget plan its `funded`, `funded_best` and
    /// `excluded` are final (the other fields are the chunk's).
    pub retrofit: Option<Box<Retrofit>>,
}

impl RankedBuilding {
    /// The compact row of a sized result at `slot`.
    pub fn of(b: &BuildingResult, slot: usize) -> Self {
        RankedBuilding {
            id: b.id.as_str().into(),
            class: b.class,
            score: b.score,
            occupants: b.occupants,
            min_pi_pct: b.min_priority_index_pct(),
            row: b.row,
            slot,
            rank: 0,
            retrofit: b.retrofit.clone().map(Box::new),
        }
    }

    /// Method §11's key.
    pub fn key(&self) -> rank::RankKey<'_> {
        rank::RankKey {
            class: self.class,
            score: self.score,
            occupants: self.occupants.unwrap_or(0),
            min_pi_pct: self.min_pi_pct,
            id: &self.id,
            row: self.row,
        }
    }

    /// Writes the final rank and budget marks into the full result of this building.
    pub fn mark(&self, b: &mut BuildingResult) {
        b.rank = self.rank;
        if let (Some(to), Some(from)) = (b.retrofit.as_mut(), self.retrofit.as_deref()) {
            to.funded = from.funded;
            to.funded_best = from.funded_best;
            to.excluded.clone_from(&from.excluded);
        }
    }
}

impl Fundable for RankedBuilding {
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

/// The ranked summary every sink gets at the end.
#[derive(Debug)]
pub struct Ranked<'a> {
    /// Every screened building's compact row, in rank order (`order[k].rank == k + 1`;
    /// `order[k].slot` is its slot in the chunks).
    pub order: &'a [RankedBuilding],
    /// The report: tool, input, settings, counts (whole stock), budget plan, uncertainty,
    /// not-screened rows (sorted by sheet and row) and problems. `buildings` holds every
    /// building in rank order, final marks included, when the source keeps its results
    /// ([`Ranked::whole`]); it is empty on a chunked source.
    pub screening: &'a Screening,
    /// The files the sinks before this one wrote (for the terminal summary).
    pub written: &'a [(String, PathBuf)],
}

impl Ranked<'_> {
    /// Whether [`Ranked::screening`] holds every building (a source that keeps results).
    pub fn whole(&self) -> bool {
        self.screening.buildings.len() == self.order.len()
    }
}

/// Where the chunks come from. One place to add a source: a variant here, its reading in
/// [`Source::read`] (and, when it does not keep its results, nothing else).
// One value per run: the size of its largest variant costs nothing.
#[allow(clippy::large_enum_variant)]
#[derive(Debug)]
pub enum Source<'a> {
    /// A whole inventory read, settled and placed by [`super::load`]: one chunk; its full
    /// results are kept (whole-stock outputs, the §13 stage).
    Loaded(Cow<'a, Loaded>),
    /// A large CSV stock (no sibling sheet files, no settings sheet) read in chunks of
    /// `rows` rows ([`input::read_csv_chunks`], one chunk read ahead on a thread of its
    /// own), after a first pass that finds the ids on more than one row
    /// ([`crate::stream::repeated_ids`]); only the compact rows are kept.
    CsvChunks {
        /// The CSV file.
        path: &'a Path,
        /// Rows per chunk.
        rows: usize,
    },
}

/// What the driver does with each chunk a source reads (its inventory part and inputs).
type ChunkFn<'f> = dyn FnMut(&Inventory, &[BuildingInput<'_>]) -> Result<(), SinkError> + 'f;

/// What a source settled before its chunks: the settings and the input file.
struct Settled {
    settings: Settings,
    input: InputInfo,
    /// Problems of the settings and the geography files (chunked sources).
    problems: Vec<Problem>,
    /// The geography (chunked sources place each chunk).
    geography: Option<Geography>,
}

/// What a source knows after its last chunk.
struct Rest {
    /// Inventory rows (buildings sheet), blank rows among them.
    rows: usize,
    blank_rows: usize,
    /// Every problem (reading, settings, geography), in the order the outputs list them.
    problems: Vec<Problem>,
}

impl Source<'_> {
    /// Whether the full results are kept until the end (one chunk: a whole file).
    pub fn keeps_results(&self) -> bool {
        match self {
            Source::Loaded(_) => true,
            Source::CsvChunks { .. } => false,
        }
    }

    /// Settles the settings and loads the geography, once.
    fn settle(&self, opts: &RunOptions) -> Result<Settled, PipelineError> {
        match self {
            // Settled and placed by `load` (which `check` and `explain` share).
            Source::Loaded(l) => Ok(Settled {
                settings: l.settings.clone(),
                input: l.input.clone(),
                problems: Vec::new(),
                geography: None,
            }),
            Source::CsvChunks { path, .. } => {
                let mut problems = Vec::new();
                // No settings sheet on this path (a CSV with sibling files is read whole).
                let settings = super::settle_settings(&[], &mut problems, opts)?;
                let (geo, geo_problems) = super::load_geography(opts)?;
                problems.extend(geo_problems);
                Ok(Settled {
                    settings,
                    input: InputInfo {
                        file: path.display().to_string(),
                        sha256: super::sha256_hex(path),
                    },
                    problems,
                    geography: Some(geo),
                })
            }
        }
    }

    /// Reads the chunks in order, placing each one's buildings, and gives each to `each`
    /// with its inputs.
    fn read(
        self,
        opts: &RunOptions,
        settled: &mut Settled,
        each: &mut ChunkFn<'_>,
    ) -> Result<Rest, RunError> {
        match self {
            Source::Loaded(l) => {
                let inputs = engine::building_inputs(&l.inventory, &l.sites);
                each(&l.inventory, &inputs)?;
                Ok(Rest {
                    rows: l.inventory.rows,
                    blank_rows: l.inventory.blank_rows,
                    problems: l.inventory.problems.clone(),
                })
            }
            Source::CsvChunks { path, rows } => {
                let settings = &settled.settings;
                let geo = settled.geography.take().unwrap_or_default();
                // The rows are checked against the limits of the effective settings, as in
                // `load`.
                let read = input::ReadOptions {
                    limits: input::Limits::from_settings(settings),
                    ..opts.read.clone()
                };
                let duplicates =
                    crate::stream::repeated_ids(path, &read).map_err(PipelineError::from)?;
                let mut row_problems = Vec::new();
                let mut site_problems = Vec::new();
                let mut failure: Option<SinkError> = None;
                let rest = read_chunks_ahead(path, &read, rows, &duplicates, &mut |mut inv| {
                    if failure.is_some() {
                        return;
                    }
                    let (sites, sp) = super::place(&inv.buildings, &geo, settings);
                    site_problems.extend(sp);
                    row_problems.append(&mut inv.problems);
                    let inputs = engine::building_inputs(&inv, &sites);
                    if let Err(e) = each(&inv, &inputs) {
                        failure = Some(e);
                    }
                })
                .map_err(PipelineError::from)?;
                if let Some(e) = failure {
                    return Err(e.into());
                }
                let mut problems = rest.problems;
                problems.extend(row_problems);
                problems.append(&mut settled.problems);
                problems.extend(site_problems);
                Ok(Rest {
                    rows: rest.rows,
                    blank_rows: rest.blank_rows,
                    problems,
                })
            }
        }
    }
}

/// Failures of [`run`].
#[derive(Debug, thiserror::Error)]
pub enum RunError {
    /// Reading, settings or geography.
    #[error(transparent)]
    Pipeline(#[from] PipelineError),
    /// An output.
    #[error(transparent)]
    Sink(#[from] SinkError),
}

/// What a run gave back.
#[derive(Debug)]
pub struct Outcome {
    /// The report (every building in rank order when the source keeps its results; none on
    /// a chunked source), counts of the whole stock.
    pub screening: Screening,
    /// Files the sinks wrote, in sink order (empty when nothing could be screened).
    pub written: Written,
}

/// The one driver: reads the source's chunks, screens and sizes each (method §0–§12's
/// per-building part), gives it to every sink, ranks all buildings (§11), makes the budget
/// plan (§12), runs the §13 stage on a source that keeps its results, and finishes every
/// sink. When no building could be screened no sink is finished (nothing is written).
pub fn run(
    source: Source<'_>,
    opts: &RunOptions,
    sinks: &mut [&mut dyn Sink],
) -> Result<Outcome, RunError> {
    let mut settled = source.settle(opts)?;
    let settings = settled.settings.clone();
    let keep = source.keeps_results();
    let mut kept: Vec<BuildingResult> = Vec::new();
    let mut order: Vec<RankedBuilding> = Vec::new();
    let mut not_screened: Vec<NotScreened> = Vec::new();
    let mut uncertainty = None;
    let mut plan_done = None;
    let rest = source.read(opts, &mut settled, &mut |inv, inputs| {
        let screening = engine::screen_all(inputs, &settings);
        let mut buildings = screening.buildings;
        retrofit::size_all(&mut buildings, inputs, &settings);
        // File order (the engine ranked the chunk on its own): the order found on indices
        // and applied with one move per result (rows are unique).
        let mut by_row: Vec<usize> = (0..buildings.len()).collect();
        by_row.sort_unstable_by_key(|&i| buildings[i].row);
        rank::apply_order(&mut buildings, &by_row);
        let mut chunk_not_screened = inv.not_screened.clone();
        chunk_not_screened.extend(screening.not_screened);
        let first_slot = order.len();
        let chunk = Chunk {
            buildings: &buildings,
            inputs,
            not_screened: &chunk_not_screened,
            first_slot,
            rows: inv.rows,
            settings: &settings,
        };
        for s in sinks.iter_mut() {
            s.on_chunk(&chunk)?;
        }
        order.extend(
            buildings
                .iter()
                .enumerate()
                .map(|(i, b)| RankedBuilding::of(b, first_slot + i)),
        );
        not_screened.append(&mut chunk_not_screened);
        if keep {
            // Moved, not copied: a second buffer of every result would raise the peak.
            if kept.is_empty() {
                kept = std::mem::take(&mut buildings);
            } else {
                kept.append(&mut buildings);
            }
            // One chunk: rank, plan and the §13 stage while its inputs are at hand.
            let plan = rank_and_plan(&mut order, &settings);
            mark_and_order(&mut kept, &order);
            let mut plan = plan;
            uncertainty = crate::uncertainty::run(&mut kept, inputs, &settings, plan.as_mut());
            plan_done = Some(plan);
        }
        Ok(())
    })?;
    let budget_plan = match plan_done {
        Some(plan) => plan,
        None => rank_and_plan(&mut order, &settings),
    };
    not_screened.sort_by(|a, b| (a.sheet.as_str(), a.row).cmp(&(b.sheet.as_str(), b.row)));
    let counts = tally(rest.rows, rest.blank_rows, not_screened.len(), &order);
    let mut problems = rest.problems;
    if let Some(message) = retrofit::budget_plan_unavailable(&settings) {
        problems.push(Problem {
            sheet: "settings".into(),
            row: None,
            column: "budget".into(),
            message,
            severity: Severity::Warning,
        });
    }
    let screening = Screening {
        tool: "seistriage",
        version: env!("CARGO_PKG_VERSION"),
        input: settled.input,
        settings,
        counts,
        buildings: kept,
        budget_plan,
        uncertainty,
        not_screened,
        problems,
    };
    let mut written = Written::new();
    if !order.is_empty() {
        for s in sinks.iter_mut() {
            let ranked = Ranked {
                order: &order,
                screening: &screening,
                written: &written,
            };
            let mut w = s.finish(&ranked)?;
            written.append(&mut w);
        }
    }
    Ok(Outcome { screening, written })
}

/// Ranks the compact rows (method §11, [`rank::key_order`]: a total order, so an unstable
/// sort gives the one order) and makes the budget plan on them (method §12).
fn rank_and_plan(
    order: &mut [RankedBuilding],
    settings: &Settings,
) -> Option<crate::results::BudgetPlan> {
    order.sort_unstable_by(|a, b| rank::key_order(&a.key(), &b.key()));
    for (i, c) in order.iter_mut().enumerate() {
        c.rank = i + 1;
    }
    retrofit::budget_plan(order, settings)
}

/// Puts the kept full results (slot order) into rank order with their final marks.
fn mark_and_order(kept: &mut [BuildingResult], order: &[RankedBuilding]) {
    let slots: Vec<usize> = order.iter().map(|c| c.slot).collect();
    rank::apply_order(kept, &slots);
    for (b, c) in kept.iter_mut().zip(order) {
        c.mark(b);
    }
}

/// The counts of the whole stock from the compact rows (the rule of [`Counts::tally`]).
fn tally(rows: usize, blank_rows: usize, not_screened: usize, order: &[RankedBuilding]) -> Counts {
    let mut counts = Counts::tally(rows, blank_rows, not_screened, &[]);
    counts.screened = order.len();
    for c in order {
        match c.class {
            1 => counts.by_class.c1 += 1,
            2 => counts.by_class.c2 += 1,
            3 => counts.by_class.c3 += 1,
            _ => counts.by_class.c4 += 1,
        }
    }
    counts
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

#[cfg(test)]
mod tests {
    #![allow(clippy::unwrap_used, clippy::expect_used)]

    use super::*;

    /// What a recorded `finish` saw: the order (id, row, slot), whole or chunked, screened.
    type Finished = (Vec<(Box<str>, usize, usize)>, bool, usize);

    /// Records what the driver gives a sink.
    #[derive(Default)]
    struct Recorder {
        chunks: Vec<(usize, usize, Vec<usize>)>,
        finished: Option<Finished>,
    }

    impl Sink for Recorder {
        fn on_chunk(&mut self, chunk: &Chunk<'_>) -> Result<(), SinkError> {
            let rows: Vec<usize> = chunk.buildings.iter().map(|b| b.row).collect();
            // Every screened building has its input in the chunk.
            for b in chunk.buildings {
                assert!(chunk.inputs.iter().any(|i| i.record.row == b.row));
            }
            self.chunks
                .push((chunk.first_slot, chunk.buildings.len(), rows));
            Ok(())
        }
        fn finish(&mut self, ranked: &Ranked<'_>) -> Result<Written, SinkError> {
            let order = ranked
                .order
                .iter()
                .map(|k| (k.id.clone(), k.rank, k.slot))
                .collect();
            self.finished = Some((order, ranked.whole(), ranked.screening.counts.screened));
            Ok(vec![("test".into(), PathBuf::from("x"))])
        }
    }

    fn opts(dir: &Path) -> RunOptions {
        let s = dir.join("s.toml");
        std::fs::write(&s, "agr_g = 0.25\n").unwrap();
        RunOptions {
            settings_file: Some(s),
            ..Default::default()
        }
    }

    #[test]
    fn a_chunked_source_and_the_whole_file_give_the_same_ranked_order() {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("g.csv");
        crate::demo::write_generated(50, &p, 3).unwrap();
        let opts = opts(dir.path());

        let mut whole = Recorder::default();
        let loaded = super::super::load(&p, &opts).unwrap();
        let a = run(
            Source::Loaded(Cow::Owned(loaded)),
            &opts,
            &mut [&mut whole as &mut dyn Sink],
        )
        .unwrap();
        let mut chunked = Recorder::default();
        let b = run(
            Source::CsvChunks { path: &p, rows: 7 },
            &opts,
            &mut [&mut chunked as &mut dyn Sink],
        )
        .unwrap();

        // One chunk for the whole file, eight of at most 7 rows for the chunked source;
        // slots number the buildings in chunk order, each chunk in file order.
        assert_eq!(whole.chunks.len(), 1);
        assert_eq!(chunked.chunks.len(), 8);
        let mut next = 0;
        for (first, n, rows) in &chunked.chunks {
            assert_eq!(*first, next);
            next += n;
            assert!(rows.windows(2).all(|w| w[0] < w[1]), "{rows:?}");
        }
        let (wo, w_whole, w_n) = whole.finished.unwrap();
        let (co, c_whole, c_n) = chunked.finished.unwrap();
        assert!(w_whole && !c_whole);
        assert_eq!((w_n, c_n), (next, next));
        let ids = |o: &[(Box<str>, usize, usize)]| -> Vec<(Box<str>, usize)> {
            o.iter().map(|(id, r, _)| (id.clone(), *r)).collect()
        };
        assert_eq!(ids(&wo), ids(&co));
        assert!(co.iter().enumerate().all(|(i, (_, r, _))| *r == i + 1));
        // The kept results are in rank order with their ranks; the chunked report keeps none.
        assert!(
            a.screening
                .buildings
                .iter()
                .zip(&wo)
                .all(|(b, (id, r, _))| *b.id == **id && b.rank == *r)
        );
        assert!(b.screening.buildings.is_empty());
        assert_eq!(a.screening.counts, b.screening.counts);
        assert_eq!(a.screening.budget_plan, b.screening.budget_plan);
        assert_eq!(a.written.len(), 1);
    }
}
