/*!
Reading inventories: workbooks (.xlsx, .xlsm, .xls, .ods via calamine) and CSV files into
typed records ([`crate::model::Inventory`]) and problems. No engineering happens here:
optional cells that are blank stay `None` and the engine resolves their defaults.

Layout: [`columns`] is the one table of canonical columns, [`header`] the header-matching
rule, [`raw`] untyped cells, budgets and the per-sheet state machine, [`xlsx`] and [`csv`]
the sources ([`xls_scan`] sizes an `.xls` before calamine expands it), [`parse`] typed
records per row, [`validate`] checks across rows and sheets, [`guard`] turns a panic of the
spreadsheet library on a malformed file into an ordinary error.

Only the buildings sheet's header row follows `--header-row`; every other sheet (and every
sibling CSV file) finds its own header row by its required names.
*/

pub mod columns;
pub mod csv;
pub mod guard;
pub mod header;
pub mod parse;
pub mod raw;
pub mod spreadsheet;
pub mod validate;
pub mod xls_scan;

use std::cell::RefCell;
use std::path::Path;

use crate::model::{Inventory, Problem, Severity};
use columns::{BUILDINGS, ERAS, FOOTPRINTS, SETTINGS, STOREYS, SheetSpec, WALLS};
pub use parse::Limits;
pub use raw::Budget;
use raw::{CellCounter, DataRow, RawRow, SheetReader, column_letters};
use spreadsheet::{Workbook, WorkbookKind};
use validate::Collected;

/// Options of the reading layer.
#[derive(Debug, Clone, Default)]
pub struct ReadOptions {
    /// 1-based header row of the buildings sheet (or the CSV file); `None` = find it by the
    /// required names. The optional sheets always find theirs.
    pub header_row: Option<usize>,
    /// Size limits enforced before allocation.
    pub budget: Budget,
    /// Plausibility limits of single values.
    pub limits: Limits,
}

/// Failures that stop the whole file from being read.
#[derive(Debug, thiserror::Error)]
pub enum InputError {
    /// The file cannot be opened or read, or is not a spreadsheet.
    #[error("{path}: cannot read the file: {message}")]
    Unreadable {
        /// Path.
        path: String,
        /// Why.
        message: String,
    },
    /// Password-protected (encrypted) workbook.
    #[error(
        "{path}: the workbook is password-protected; save a copy without a password and read that"
    )]
    Protected {
        /// Path.
        path: String,
    },
    /// Above a reading budget (or a zip bomb).
    #[error("{path}: refused: {message}")]
    TooLarge {
        /// Path.
        path: String,
        /// The numbers.
        message: String,
    },
    /// A fatal problem of a sheet's header (a required column missing or unusable, no
    /// header row): one line naming the file, the sheet and what is missing.
    #[error("{path}: sheet {sheet}: {message}")]
    MissingColumns {
        /// Path.
        path: String,
        /// Sheet name as found in the file.
        sheet: String,
        /// What is missing.
        message: String,
    },
    /// The caller of [`read_inventory_settled`] refused the settings (its own error says
    /// why); the other sheets were not read.
    #[error("{path}: reading stopped: the settings were refused")]
    SettingsRefused {
        /// Path.
        path: String,
    },
}

/// What [`read_inventory_settled`] asks its caller once the `settings` sheet is read (and
/// before any other sheet is): given the sheet's (key, value) rows and their spreadsheet
/// rows, the plausibility limits of the effective settings — or `None` to stop reading.
pub type Settle<'a> = dyn FnMut(&[(String, String)], &[usize]) -> Option<Limits> + 'a;

const ZIP_MAGIC: [u8; 4] = [0x50, 0x4B, 0x03, 0x04];
const CFB_MAGIC: [u8; 8] = [0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1];

fn unreadable(path: &str, message: impl std::fmt::Display) -> InputError {
    InputError::Unreadable {
        path: path.to_string(),
        message: message.to_string(),
    }
}

/// Everything one sheet contributes.
struct SheetRun<'c> {
    spec: &'static SheetSpec,
    decimal_comma: bool,
    limits: Limits,
    collected: &'c RefCell<Collected>,
}

impl SheetRun<'_> {
    fn consume(&self, row: DataRow) {
        let mut c = self.collected.borrow_mut();
        match self.spec.name {
            "buildings" => {
                let (b, problems) = parse::building(&row, self.decimal_comma, &self.limits);
                c.buildings.push(b);
                c.building_problems.extend(problems);
            }
            "walls" => {
                let r = parse::wall_with(&row, self.decimal_comma, &self.limits);
                c.walls.push(r);
            }
            "storeys" => {
                let r = parse::storey_with(&row, self.decimal_comma, &self.limits);
                c.storeys.push(r);
            }
            "footprints" => {
                let r = parse::footprint(&row, self.decimal_comma);
                c.footprints.push(r);
            }
            "eras" => {
                let r = parse::era(&row, self.decimal_comma, &self.limits);
                c.eras.push(r);
            }
            _ => {
                let key = row.cells.first().map(|c| c.as_text()).unwrap_or_default();
                let value = row.cells.get(1).map(|c| c.as_text()).unwrap_or_default();
                // Keys are matched like headers: "Floor Weight kPa" is floor_weight_kpa.
                let key = header::normalise(&key);
                if !key.is_empty() {
                    c.settings_rows.push((key, value.trim().to_string()));
                    c.settings_row_numbers.push(row.row);
                }
            }
        }
    }
}

fn truncation_problems(spec: &SheetSpec, row: &RawRow, cols: &[usize]) -> Vec<Problem> {
    cols.iter()
        .map(|col| Problem {
            sheet: spec.name.into(),
            row: Some(row.row),
            column: column_letters(*col),
            message: format!(
                "expected at most {} characters in a cell, found more; the text is cut",
                raw::MAX_CELL_CHARS
            ),
            severity: Severity::Warning,
        })
        .collect()
}

/// Runs one sheet through the state machine, given a function that streams its rows.
#[allow(clippy::too_many_arguments)]
fn run_sheet(
    spec: &'static SheetSpec,
    sheet_name: &str,
    decimal_comma: bool,
    opts: &ReadOptions,
    path: &str,
    collected: &RefCell<Collected>,
    stream: impl FnOnce(
        &mut dyn FnMut(RawRow, &[usize]) -> Result<(), InputError>,
    ) -> Result<(), InputError>,
) -> Result<(), InputError> {
    let run = SheetRun {
        spec,
        decimal_comma,
        limits: opts.limits,
        collected,
    };
    let mut cut = Vec::new();
    // `--header-row` names the buildings sheet's header; the other sheets find theirs.
    let header_row = if spec.name == BUILDINGS.name {
        opts.header_row
    } else {
        None
    };
    let mut reader = SheetReader::new(spec, sheet_name, header_row, &opts.budget, path, |row| {
        run.consume(row)
    });
    stream(&mut |row: RawRow, truncated: &[usize]| {
        if !truncated.is_empty() {
            cut.extend(truncation_problems(spec, &row, truncated));
        }
        reader.push(row)
    })?;
    let summary = reader.finish()?;
    let mut c = collected.borrow_mut();
    c.sheet_problems.extend(summary.problems);
    c.sheet_problems.extend(cut);
    if spec.name == "buildings" {
        c.blank_rows = summary.blank_rows;
    }
    Ok(())
}

/// Reads an inventory file (workbook or CSV) into typed records and problems, checking the
/// rows against `opts.limits` whatever the file's `settings` sheet says (see
/// [`read_inventory_settled`] for limits that follow the effective settings).
///
/// The kind is decided by the file's content (zip → .xlsx/.ods, compound file → .xls or an
/// encrypted workbook), else a `.csv`/`.txt`/`.tsv` extension means CSV; anything else is
/// refused as not a spreadsheet.
pub fn read_inventory(path: &Path, opts: &ReadOptions) -> Result<Inventory, InputError> {
    let limits = opts.limits;
    read_inventory_settled(path, opts, &mut |_, _| Some(limits))
}

/// [`read_inventory`] with the rows checked against the limits of the effective settings:
/// the `settings` sheet (or `<stem>.settings.csv`) is read first and handed to `settle`,
/// whose limits (in place of `opts.limits`) then apply to every other sheet. `settle`
/// returning `None` stops the read with [`InputError::SettingsRefused`].
pub fn read_inventory_settled(
    path: &Path,
    opts: &ReadOptions,
    settle: &mut Settle<'_>,
) -> Result<Inventory, InputError> {
    let p = path.display().to_string();
    let meta = std::fs::metadata(path).map_err(|e| unreadable(&p, e))?;
    if meta.is_dir() {
        return Err(unreadable(&p, "a folder, not an inventory file"));
    }
    if meta.len() > opts.budget.max_file_bytes {
        return Err(InputError::TooLarge {
            path: p,
            message: format!(
                "the file has {} bytes, more than the budget of {} bytes",
                meta.len(),
                opts.budget.max_file_bytes
            ),
        });
    }
    let ext = path
        .extension()
        .map(|e| e.to_string_lossy().to_ascii_lowercase())
        .unwrap_or_default();
    let head = spreadsheet::sniff(path).map_err(|e| unreadable(&p, e))?;
    let kind = match head {
        Some(h) if h.starts_with(&ZIP_MAGIC) => {
            let f = std::fs::File::open(path).map_err(|e| unreadable(&p, e))?;
            let kind = guarded_read(&p, || {
                spreadsheet::check_zip(std::io::BufReader::new(f), &p, &opts.budget)
            })?;
            if kind == WorkbookKind::Ods {
                let f = std::fs::File::open(path).map_err(|e| unreadable(&p, e))?;
                guarded_read(&p, || {
                    spreadsheet::check_ods_extent(std::io::BufReader::new(f), &p, &opts.budget)
                })?;
            }
            Some(kind)
        }
        Some(h) if h == CFB_MAGIC => Some(if matches!(ext.as_str(), "xlsx" | "xlsm") {
            WorkbookKind::Xlsx
        } else {
            guarded_read(&p, || check_xls_extent(path, &opts.budget))?;
            WorkbookKind::Xls
        }),
        _ => None,
    };
    if matches!(kind, Some(WorkbookKind::Xls | WorkbookKind::Ods))
        && meta.len() > opts.budget.max_dense_file_bytes
    {
        return Err(InputError::TooLarge {
            path: p,
            message: format!(
                "the .xls/.ods file has {} bytes, more than the budget of {} bytes for workbooks read whole (save it as .xlsx, which is streamed)",
                meta.len(),
                opts.budget.max_dense_file_bytes
            ),
        });
    }
    let collected = RefCell::new(Collected::default());
    let mut counter = CellCounter {
        cells: 0,
        max: opts.budget.max_cells,
        path: p.clone(),
    };
    let limits = match kind {
        Some(kind) => guarded_read(&p, || {
            read_workbook(path, kind, opts, settle, &collected, &mut counter)
        })?,
        None if matches!(ext.as_str(), "csv" | "txt" | "tsv") => {
            read_csv_files(path, opts, settle, &collected, &mut counter)?
        }
        None => {
            return Err(unreadable(
                &p,
                "not a spreadsheet (expected .xlsx, .xlsm, .xls, .ods or .csv content)",
            ));
        }
    };
    Ok(validate::finish(
        collected.into_inner(),
        limits.wall_area_mismatch_pct,
    ))
}

/// After the settings sheet (if any) is read: asks `settle` for the limits and moves that
/// sheet's own sheet-level problems aside (they are put back after the other sheets', the
/// order of the file's sheets). Returns the options for the other sheets.
fn settled_options(
    path: &str,
    opts: &ReadOptions,
    settle: &mut Settle<'_>,
    collected: &RefCell<Collected>,
    settings_sheet_problems: &mut Vec<Problem>,
) -> Result<ReadOptions, InputError> {
    let mut c = collected.borrow_mut();
    *settings_sheet_problems = std::mem::take(&mut c.sheet_problems);
    let limits = settle(&c.settings_rows, &c.settings_row_numbers).ok_or_else(|| {
        InputError::SettingsRefused {
            path: path.to_string(),
        }
    })?;
    Ok(ReadOptions {
        limits,
        ..opts.clone()
    })
}

/// Runs a workbook read inside the panic guard (calamine can panic on malformed files).
fn guarded_read<T>(path: &str, f: impl FnOnce() -> Result<T, InputError>) -> Result<T, InputError> {
    guard::guarded(f).unwrap_or_else(|panic| {
        Err(unreadable(
            path,
            format!("not a readable workbook (malformed content: {panic})"),
        ))
    })
}

/// Refuses an `.xls` whose sheets would expand to more cells than the dense budget, before
/// calamine reads it (calamine expands every sheet when the workbook is opened).
fn check_xls_extent(path: &Path, budget: &Budget) -> Result<(), InputError> {
    let p = path.display().to_string();
    let bytes = std::fs::read(path).map_err(|e| unreadable(&p, e))?;
    if xls_scan::chains_loop(&bytes) {
        return Err(unreadable(
            &p,
            "not a readable workbook (a sector chain of the compound file loops back on itself: a damaged file)",
        ));
    }
    let extents = xls_scan::sheet_extents(&bytes).unwrap_or_default();
    for (i, e) in extents.iter().enumerate() {
        let cells = e.rows.saturating_mul(e.cols);
        if cells > budget.max_dense_cells {
            return Err(InputError::TooLarge {
                path: p,
                message: format!(
                    "sheet {} spans {} rows × {} columns = {cells} cells, more than the budget of {} for .xls (save it as .xlsx, which is streamed, or delete stray far-away cells)",
                    i + 1,
                    e.rows,
                    e.cols,
                    budget.max_dense_cells
                ),
            });
        }
    }
    // calamine holds every sheet's grid at once: the budget is for all of them together.
    let total = extents
        .iter()
        .fold(0u64, |t, e| t.saturating_add(e.rows.saturating_mul(e.cols)));
    if total > budget.max_dense_cells {
        return Err(InputError::TooLarge {
            path: p,
            message: format!(
                "its {} sheets span {total} cells together, more than the budget of {} for .xls (save it as .xlsx, which is streamed)",
                extents.len(),
                budget.max_dense_cells
            ),
        });
    }
    Ok(())
}

/// Reads every sheet of a workbook, the settings sheet first; returns the limits used.
fn read_workbook(
    path: &Path,
    kind: WorkbookKind,
    opts: &ReadOptions,
    settle: &mut Settle<'_>,
    collected: &RefCell<Collected>,
    counter: &mut CellCounter,
) -> Result<Limits, InputError> {
    let p = path.display().to_string();
    let f = std::fs::File::open(path).map_err(|e| unreadable(&p, e))?;
    let mut wb = match Workbook::open(std::io::BufReader::new(f), kind, &p) {
        Ok(wb) => wb,
        Err(e) if kind == WorkbookKind::Xls => {
            // A password-protected .xlsx is a compound file too, whatever its extension.
            let f = std::fs::File::open(path).map_err(|e| unreadable(&p, e))?;
            match Workbook::open(std::io::BufReader::new(f), WorkbookKind::Xlsx, &p) {
                Err(protected @ InputError::Protected { .. }) => return Err(protected),
                _ => return Err(e),
            }
        }
        Err(e) => return Err(e),
    };
    if kind == WorkbookKind::Xlsx {
        let f = std::fs::File::open(path).map_err(|e| unreadable(&p, e))?;
        wb.set_recalc(spreadsheet::asks_recalc(std::io::BufReader::new(f)));
    }
    let names = wb.sheet_names();
    let find = |spec: &SheetSpec| {
        names
            .iter()
            .find(|n| header::normalise(n) == spec.name)
            .cloned()
    };
    let fallback = find(&BUILDINGS).is_none();
    let buildings = match find(&BUILDINGS) {
        Some(n) => n,
        None => {
            let Some(first) = names.first().cloned() else {
                return Err(unreadable(&p, "the workbook has no sheets"));
            };
            collected.borrow_mut().sheet_problems.push(Problem {
                sheet: "buildings".into(),
                row: None,
                column: String::new(),
                message: format!(
                    "expected a sheet named buildings, found sheets {}; the first sheet \"{first}\" is read as buildings",
                    names.iter().map(|n| format!("\"{n}\"")).collect::<Vec<_>>().join(", ")
                ),
                severity: Severity::Warning,
            });
            first
        }
    };
    let budget = opts.budget;
    // The settings sheet first: its rows settle the limits the other sheets are read with.
    // The "buildings" problem above (if any) is kept in front.
    let first_problems = std::mem::take(&mut collected.borrow_mut().sheet_problems);
    if let Some(name) = find(&SETTINGS).filter(|n| *n != buildings) {
        run_sheet(&SETTINGS, &name, false, opts, &p, collected, |sink| {
            wb.read_sheet(&name, &p, &budget, counter, sink)
        })?;
    }
    let mut settings_problems = Vec::new();
    let opts = &settled_options(&p, opts, settle, collected, &mut settings_problems)?;
    collected.borrow_mut().sheet_problems = first_problems;
    let sheets: [(&'static SheetSpec, Option<String>); 5] = [
        (&BUILDINGS, Some(buildings.clone())),
        (&WALLS, find(&WALLS).filter(|n| *n != buildings)),
        (&STOREYS, find(&STOREYS).filter(|n| *n != buildings)),
        (&FOOTPRINTS, find(&FOOTPRINTS).filter(|n| *n != buildings)),
        (&ERAS, find(&ERAS).filter(|n| *n != buildings)),
    ];
    for (spec, name) in sheets {
        let Some(name) = name else { continue };
        let read = run_sheet(spec, &name, false, opts, &p, collected, |sink| {
            wb.read_sheet(&name, &p, &budget, counter, sink)
        });
        match read {
            Err(InputError::MissingColumns { path, .. })
                if fallback && spec.name == "buildings" =>
            {
                return Err(InputError::MissingColumns {
                    path,
                    sheet: "buildings".into(),
                    message: format!(
                        "no sheet named buildings, and the first sheet \"{name}\" does not hold the required columns ({}); sheets found: {}",
                        BUILDINGS.required_names().join(", "),
                        names
                            .iter()
                            .map(|n| format!("\"{n}\""))
                            .collect::<Vec<_>>()
                            .join(", ")
                    ),
                });
            }
            r => r?,
        }
    }
    collected
        .borrow_mut()
        .sheet_problems
        .extend(settings_problems);
    Ok(opts.limits)
}

/// Reads a CSV inventory and its sibling files, the settings file first; returns the
/// limits used.
fn read_csv_files(
    path: &Path,
    opts: &ReadOptions,
    settle: &mut Settle<'_>,
    collected: &RefCell<Collected>,
    counter: &mut CellCounter,
) -> Result<Limits, InputError> {
    let stem = path
        .file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_default();
    let dir = path.parent().unwrap_or(Path::new("."));
    let sibling = |spec: &SheetSpec| {
        let file = dir.join(format!("{stem}.{}.csv", spec.name));
        file.is_file().then_some(file)
    };
    // The settings file first: its rows settle the limits the other files are read with.
    if let Some(file) = sibling(&SETTINGS) {
        read_one_csv(&SETTINGS, &file, opts, collected, counter)?;
    }
    let mut settings_problems = Vec::new();
    let p = path.display().to_string();
    let opts = &settled_options(&p, opts, settle, collected, &mut settings_problems)?;
    let mut files: Vec<(&'static SheetSpec, std::path::PathBuf)> =
        vec![(&BUILDINGS, path.to_path_buf())];
    for spec in [&WALLS, &STOREYS, &FOOTPRINTS, &ERAS] {
        if let Some(file) = sibling(spec) {
            files.push((spec, file));
        }
    }
    for (spec, file) in files {
        read_one_csv(spec, &file, opts, collected, counter)?;
    }
    collected
        .borrow_mut()
        .sheet_problems
        .extend(settings_problems);
    Ok(opts.limits)
}

/// Reads one CSV file of an inventory (the buildings file or a sibling).
fn read_one_csv(
    spec: &'static SheetSpec,
    file: &Path,
    opts: &ReadOptions,
    collected: &RefCell<Collected>,
    counter: &mut CellCounter,
) -> Result<(), InputError> {
    let fp = file.display().to_string();
    let mut info = None;
    // The delimiter is known only once the file is sniffed; numbers are parsed after.
    let bytes_info = csv_info(file, &opts.budget)?;
    run_sheet(spec, spec.name, bytes_info, opts, &fp, collected, |sink| {
        info = Some(csv::read_csv(file, &opts.budget, counter, sink)?);
        Ok(())
    })?;
    if let Some(i) = info
        && i.windows_1252
    {
        collected.borrow_mut().sheet_problems.push(Problem {
            sheet: spec.name.into(),
            row: None,
            column: String::new(),
            message: format!(
                "expected UTF-8 text in {fp}, found other bytes; read as Windows-1252 (save as CSV UTF-8 to be sure of accents)"
            ),
            severity: Severity::Warning,
        });
    }
    Ok(())
}

/// Whether a CSV inventory has sibling sheet files (`<stem>.walls.csv`, `.storeys.csv`,
/// `.footprints.csv`, `.settings.csv`) beside it.
pub fn csv_has_siblings(path: &Path) -> bool {
    let stem = path
        .file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_default();
    let dir = path.parent().unwrap_or(Path::new("."));
    [&WALLS, &STOREYS, &FOOTPRINTS, &ERAS, &SETTINGS]
        .iter()
        .any(|spec| dir.join(format!("{stem}.{}.csv", spec.name)).is_file())
}

/// Reads a CSV buildings file (no sibling sheets) in chunks of about `chunk_rows` rows for
/// the streaming path of a large stock. Every chunk is validated on its own except for the
/// id check, which uses `duplicates` (ids seen on more than one row of the whole file → those
/// rows, from a first pass) so that a repeated id is refused on every one of its rows as in
/// [`read_inventory`]. `on_chunk` gets each chunk as an [`Inventory`] (accepted buildings,
/// not-screened rows and the chunk's row problems; `rows` counts the chunk's rows), in file
/// order. Returns what is known only at the end: sheet-level problems and blank rows (its
/// `rows` is the total number of building rows).
pub fn read_csv_chunks(
    path: &Path,
    opts: &ReadOptions,
    chunk_rows: usize,
    duplicates: &std::collections::HashMap<String, Vec<usize>>,
    on_chunk: &mut dyn FnMut(Inventory),
) -> Result<Inventory, InputError> {
    let p = path.display().to_string();
    let meta = std::fs::metadata(path).map_err(|e| unreadable(&p, e))?;
    if meta.is_dir() {
        return Err(unreadable(&p, "a folder, not an inventory file"));
    }
    let collected = RefCell::new(Collected::default());
    let mut counter = CellCounter {
        cells: 0,
        max: opts.budget.max_cells,
        path: p.clone(),
    };
    let decimal_comma = csv_info(path, &opts.budget)?;
    let wall_pct = opts.limits.wall_area_mismatch_pct;
    let mut total_rows = 0usize;
    let mut hand_over = |collected: &RefCell<Collected>, at_least: usize| {
        let part = {
            let mut c = collected.borrow_mut();
            if c.buildings.len() < at_least.max(1) {
                return;
            }
            Collected {
                buildings: std::mem::take(&mut c.buildings),
                building_problems: std::mem::take(&mut c.building_problems),
                ..Default::default()
            }
        };
        total_rows += part.buildings.len();
        on_chunk(validate::finish_with_ids(part, wall_pct, Some(duplicates)));
    };
    let run = SheetRun {
        spec: &BUILDINGS,
        decimal_comma,
        limits: opts.limits,
        collected: &collected,
    };
    let mut cut = Vec::new();
    let info;
    {
        let mut reader = SheetReader::new(
            &BUILDINGS,
            BUILDINGS.name,
            opts.header_row,
            &opts.budget,
            &p,
            |row| run.consume(row),
        );
        info = csv::read_csv(
            path,
            &opts.budget,
            &mut counter,
            &mut |row: RawRow, truncated: &[usize]| {
                if !truncated.is_empty() {
                    cut.extend(truncation_problems(&BUILDINGS, &row, truncated));
                }
                reader.push(row)?;
                hand_over(&collected, chunk_rows);
                Ok(())
            },
        )?;
        let summary = reader.finish()?;
        let mut c = collected.borrow_mut();
        c.sheet_problems.extend(summary.problems);
        c.sheet_problems.extend(cut);
        c.blank_rows = summary.blank_rows;
    }
    hand_over(&collected, 1);
    let mut c = collected.into_inner();
    if info.windows_1252 {
        c.sheet_problems.push(Problem {
            sheet: BUILDINGS.name.into(),
            row: None,
            column: String::new(),
            message: format!(
                "expected UTF-8 text in {p}, found other bytes; read as Windows-1252 (save as CSV UTF-8 to be sure of accents)"
            ),
            severity: Severity::Warning,
        });
    }
    let mut rest = validate::finish(c, wall_pct);
    rest.rows = total_rows;
    Ok(rest)
}

/// Whether a CSV file uses `;` (and so decimal commas), read from its first line.
fn csv_info(file: &Path, budget: &Budget) -> Result<bool, InputError> {
    use std::io::Read;
    let p = file.display().to_string();
    let meta = std::fs::metadata(file).map_err(|e| unreadable(&p, e))?;
    if meta.len() > budget.max_file_bytes {
        return Err(InputError::TooLarge {
            path: p,
            message: format!(
                "the file has {} bytes, more than the budget of {} bytes",
                meta.len(),
                budget.max_file_bytes
            ),
        });
    }
    let mut head = Vec::new();
    std::fs::File::open(file)
        .and_then(|f| f.take(64 * 1024).read_to_end(&mut head))
        .map_err(|e| unreadable(&p, e))?;
    Ok(csv::delimiter_of(&head) == b';')
}

/// The header-matching rule, printed in `--help` and on the template's read-me sheet (kept
/// with the units and aliases in [`columns`]).
pub use columns::{HEADER_RULE_HELP, SURVEY_TEXT_HELP};

#[cfg(test)]
mod tests {
    use super::*;

    fn csv_with_settings(settings: &str) -> (tempfile::TempDir, std::path::PathBuf) {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("town.csv");
        std::fs::write(
            &p,
            "id,storeys,plan_area_m2,column_area_m2\nA,61,200,2\nB,3,200,2\n",
        )
        .unwrap();
        std::fs::write(dir.path().join("town.settings.csv"), settings).unwrap();
        (dir, p)
    }

    #[test]
    fn settle_sees_the_settings_rows_and_its_limits_check_the_buildings() {
        let (_dir, p) = csv_with_settings("key,value\nmax_storeys,61\nagr_g,0.2\n");
        let mut seen = Vec::new();
        let inv = read_inventory_settled(&p, &ReadOptions::default(), &mut |rows, numbers| {
            seen = rows
                .iter()
                .zip(numbers)
                .map(|((k, v), n)| (k.clone(), v.clone(), *n))
                .collect();
            Some(Limits {
                max_storeys: 61.0,
                ..Limits::default()
            })
        })
        .unwrap();
        assert_eq!(
            seen,
            vec![
                ("max_storeys".to_string(), "61".to_string(), 2),
                ("agr_g".to_string(), "0.2".to_string(), 3)
            ]
        );
        assert_eq!(inv.buildings.len(), 2, "{:#?}", inv.problems);
        assert_eq!(inv.settings_row_numbers, vec![2, 3]);
        // Without settle, the options' limits apply whatever the sheet says.
        let inv = read_inventory(&p, &ReadOptions::default()).unwrap();
        assert_eq!(inv.buildings.len(), 1);
    }

    #[test]
    fn settle_refusing_stops_the_read() {
        let (_dir, p) = csv_with_settings("key,value\n");
        let e = read_inventory_settled(&p, &ReadOptions::default(), &mut |_, _| None);
        assert!(
            matches!(e, Err(InputError::SettingsRefused { .. })),
            "{e:?}"
        );
    }
}
