/*!
The per-row tables of the results workbook (Priority, Retrofit plan, Directions, Walls,
Flags, Not screened, Input problems), one file per table. Each table declares its columns
once with the function that fills each cell (header, CSV/machine key, kind, width,
value) through the [`table!`] macro, so the header list and the row can never fall out of
step. A row is written into a [`CellSink`]: the worksheet (`workbook::SheetSink`), the CSV
writer (`report::csv::CsvSink`), the streamed sheet XML of large workbooks
(`workbook::xml`), or a [`Cell`] list ([`CellVec`], for GeoJSON and tests). The same
declaration therefore drives every writer.

Domain values have one place each: the funding cost is [`crate::retrofit::cost::funding_cost`],
the retrofit note is the retrofit's own (`retrofit::sizing`, `retrofit::cost`), and the class
names live with the classes (`engine::rank`).
*/

use std::borrow::Cow;

use crate::model::Dir;
use crate::results::{BuildingResult, Screening};

use super::super::ReportError;

mod directions;
mod flags;
mod not_screened;
mod priority;
mod problems;
mod retrofit;
mod walls;

pub use directions::{DIRECTIONS, direction_cells};
pub use flags::{FLAGS, flag_cells};
pub use not_screened::{NOT_SCREENED, not_screened_cells};
pub use priority::{PRIORITY, PRIORITY_HIDDEN, priority_cells};
pub use problems::{PROBLEMS, problem_cells};
pub use retrofit::{RETROFIT, funding_cost, retrofit_cells, retrofit_rows};
pub use walls::{WALLS, wall_cells};

/// How a column is shown in the workbook (number format and alignment).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum CellKind {
    /// Free text.
    Text,
    /// Whole number (`0`).
    Int,
    /// Thousands-separated whole number (`#,##0`): occupants, costs, distances.
    Thousands,
    /// Demand/capacity ratio, two decimals.
    Dcr,
    /// A ratio shown as a percentage (drifts, rotations): the cell holds 0.012, shown 1.20 %.
    Ratio,
    /// A value already in percent (indices), two decimals.
    Pct,
    /// Two decimals (areas, lengths, MPa).
    Dec2,
    /// Three decimals (periods, g, coefficients).
    Dec3,
    /// Four decimals (small coefficients and displacements in m).
    Dec4,
    /// Six decimals (coordinates).
    Coord,
    /// The class 1–4 (number, formatted by class).
    Class,
}

/// One column: workbook header (with units), CSV/machine name, kind and width.
#[derive(Debug, Clone, Copy)]
pub struct Column {
    /// Header in the workbook, units in brackets.
    pub header: &'static str,
    /// Machine name (CSV header).
    pub key: &'static str,
    /// Display kind.
    pub kind: CellKind,
    /// Column width in characters.
    pub width: f64,
}

/// One cell value. Non-finite numbers are written as blanks by every sink.
#[derive(Debug, Clone, PartialEq)]
pub enum Cell<'a> {
    /// Empty cell.
    Blank,
    /// A number.
    Num(f64),
    /// Text (always written as a string, never as a formula).
    Text(Cow<'a, str>),
}

/// Where a row goes: a few texts read better with spaces in the workbook.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Target {
    /// A worksheet.
    Sheet,
    /// A CSV file.
    Csv,
}

impl Target {
    /// Separator of a list of codes in one cell ("a; b" on a sheet, "a;b" in CSV).
    pub fn list_sep(self) -> &'static str {
        match self {
            Target::Sheet => "; ",
            Target::Csv => ";",
        }
    }
}

/// Where the cells of a row go, one call per cell, left to right. A writer implements it
/// without allocating per cell; errors are kept by the sink and returned by
/// [`CellSink::end_row`].
pub trait CellSink {
    /// The kind of output (a few texts differ between a sheet and CSV).
    fn target(&self) -> Target;
    /// A text cell (written as a string, never as a formula).
    fn text(&mut self, text: &str);
    /// A number cell shown as `kind`; a non-finite number is written as a blank.
    fn number(&mut self, value: f64, kind: CellKind);
    /// A whole-number cell shown as `kind` (the same cell as `number(value as f64, kind)`).
    fn int(&mut self, value: i64, kind: CellKind) {
        self.number(value as f64, kind);
    }
    /// An empty cell.
    fn blank(&mut self);
    /// Ends the row; returns the first error met while writing it.
    fn end_row(&mut self) -> Result<(), ReportError>;
}

/// A value a column's fill expression gives, written into a sink as a cell of the column's
/// kind: numbers, whole numbers, text, `yes`/`no` for booleans, blank for `None`.
pub trait IntoCell {
    /// Writes the value as one cell.
    fn put<S: CellSink + ?Sized>(self, kind: CellKind, sink: &mut S);
}

/// An empty cell as a column value.
#[derive(Debug, Clone, Copy)]
pub struct Blank;

impl IntoCell for Blank {
    fn put<S: CellSink + ?Sized>(self, _: CellKind, sink: &mut S) {
        sink.blank();
    }
}
impl IntoCell for f64 {
    fn put<S: CellSink + ?Sized>(self, kind: CellKind, sink: &mut S) {
        sink.number(self, kind);
    }
}
macro_rules! into_cell_int {
    ($($t:ty),*) => {$(
        impl IntoCell for $t {
            fn put<S: CellSink + ?Sized>(self, kind: CellKind, sink: &mut S) {
                sink.int(self as i64, kind);
            }
        }
    )*};
}
into_cell_int!(u8, u32, u64, usize);
impl IntoCell for &str {
    fn put<S: CellSink + ?Sized>(self, _: CellKind, sink: &mut S) {
        sink.text(self);
    }
}
impl IntoCell for &String {
    fn put<S: CellSink + ?Sized>(self, _: CellKind, sink: &mut S) {
        sink.text(self);
    }
}
impl IntoCell for String {
    fn put<S: CellSink + ?Sized>(self, _: CellKind, sink: &mut S) {
        sink.text(&self);
    }
}
impl IntoCell for bool {
    fn put<S: CellSink + ?Sized>(self, _: CellKind, sink: &mut S) {
        sink.text(if self { "yes" } else { "no" });
    }
}
impl<T: IntoCell> IntoCell for Option<T> {
    fn put<S: CellSink + ?Sized>(self, kind: CellKind, sink: &mut S) {
        match self {
            Some(v) => v.put(kind, sink),
            None => sink.blank(),
        }
    }
}

/// Declares one table: its column list (`$cols`, header, key, kind, width) and its fill
/// function (`$fill`), each column written beside the expression that gives its value, so
/// that the two cannot fall out of step. The fill function takes the row's arguments and a
/// sink; `target($t)` names the sink's [`Target`]; the `let` statements in braces run once
/// per row before the cells.
macro_rules! table {
    (
        $(#[$cm:meta])* columns $cols:ident;
        $(#[$fm:meta])* fn $fill:ident($($arg:ident: $ty:ty),* $(,)?) target($t:ident) {
            $($prelude:stmt;)*
        }
        $($h:literal, $k:literal, $kind:ident, $w:literal => $body:expr;)*
    ) => {
        $(#[$cm])*
        pub const $cols: &[$crate::report::workbook::tables::Column] = &[
            $($crate::report::workbook::tables::Column {
                header: $h,
                key: $k,
                kind: $crate::report::workbook::tables::CellKind::$kind,
                width: $w,
            }),*
        ];
        $(#[$fm])*
        #[allow(unused_variables)]
        pub fn $fill<S: $crate::report::workbook::tables::CellSink + ?Sized>(
            $($arg: $ty,)*
            sink: &mut S,
        ) {
            let $t = sink.target();
            $($prelude)*
            $($crate::report::workbook::tables::IntoCell::put(
                $body,
                $crate::report::workbook::tables::CellKind::$kind,
                sink,
            );)*
        }
    };
}
pub(crate) use table;

/// A sink that collects the cells of one row as [`Cell`]s (GeoJSON properties, tests, and
/// the row functions kept for callers that take a cell list).
#[derive(Debug, Clone)]
pub struct CellVec {
    /// The target the cells are made for.
    pub target: Target,
    /// The cells of the current row.
    pub cells: Vec<Cell<'static>>,
}

impl CellVec {
    /// An empty row for `target`.
    pub fn new(target: Target) -> Self {
        CellVec {
            target,
            cells: Vec::new(),
        }
    }
}

impl CellSink for CellVec {
    fn target(&self) -> Target {
        self.target
    }
    fn text(&mut self, text: &str) {
        self.cells.push(Cell::Text(Cow::Owned(text.to_owned())));
    }
    fn number(&mut self, value: f64, _: CellKind) {
        self.cells.push(Cell::Num(value));
    }
    fn blank(&mut self) {
        self.cells.push(Cell::Blank);
    }
    fn end_row(&mut self) -> Result<(), ReportError> {
        Ok(())
    }
}

/// The class names live with the classes (method §11, `engine::rank`).
pub use crate::engine::rank::{CLASS_NAMES, class_name};

/// Fills `out` with a row made by `fill` (the cell-list form of a table's fill function).
fn cells_of<'a>(target: Target, out: &mut Vec<Cell<'a>>, fill: impl FnOnce(&mut CellVec)) {
    let mut v = CellVec::new(target);
    fill(&mut v);
    out.clear();
    out.extend(v.cells);
}

/// One Priority row as cells.
pub fn priority_row<'a>(b: &'a BuildingResult, target: Target, out: &mut Vec<Cell<'a>>) {
    cells_of(target, out, |s| priority_cells(b, s));
}

/// One Retrofit plan row as cells (nothing for a building without a retrofit);
/// `cumulative` is the running funding cost in rank order.
pub fn retrofit_row<'a>(
    b: &'a BuildingResult,
    cumulative: Option<f64>,
    target: Target,
    out: &mut Vec<Cell<'a>>,
) {
    out.clear();
    if let Some(r) = b.retrofit.as_ref() {
        cells_of(target, out, |s| retrofit_cells(b, r, cumulative, s));
    }
}

/// One Directions row as cells (building `b`, direction `d`).
pub fn direction_row<'a>(b: &'a BuildingResult, d: Dir, out: &mut Vec<Cell<'a>>) {
    cells_of(Target::Sheet, out, |s| direction_cells(b, d, s));
}

/// One Walls row as cells.
pub fn wall_row<'a>(
    b: &'a BuildingResult,
    w: &'a crate::results::WallResult,
    out: &mut Vec<Cell<'a>>,
) {
    cells_of(Target::Sheet, out, |s| wall_cells(b, w, s));
}

/// One Flags row as cells.
pub fn flag_row<'a>(b: &'a BuildingResult, f: &'a crate::results::Flag, out: &mut Vec<Cell<'a>>) {
    cells_of(Target::Sheet, out, |s| flag_cells(b, f, s));
}

/// One Not screened row as cells.
pub fn not_screened_row<'a>(n: &'a crate::model::NotScreened, out: &mut Vec<Cell<'a>>) {
    cells_of(Target::Sheet, out, |s| not_screened_cells(n, s));
}

/// One Input problems row as cells.
pub fn problem_row<'a>(p: &'a crate::model::Problem, out: &mut Vec<Cell<'a>>) {
    cells_of(Target::Sheet, out, |s| problem_cells(p, s));
}

/// Number of rows each per-row table will have (without its header).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct RowCounts {
    /// Priority rows.
    pub priority: usize,
    /// Retrofit plan rows.
    pub retrofit: usize,
    /// Directions rows.
    pub directions: usize,
    /// Walls rows.
    pub walls: usize,
    /// Flags rows.
    pub flags: usize,
    /// Not screened rows.
    pub not_screened: usize,
    /// Input problems rows.
    pub problems: usize,
}

impl RowCounts {
    /// Counts the rows of every table of a report.
    pub fn of(report: &Screening) -> Self {
        RowCounts {
            priority: report.buildings.len(),
            retrofit: report
                .buildings
                .iter()
                .filter(|b| b.retrofit.is_some())
                .count(),
            directions: 2 * report.buildings.len(),
            walls: report.buildings.iter().map(|b| b.walls.len()).sum(),
            flags: report.buildings.iter().map(|b| b.flags.len()).sum(),
            not_screened: report.not_screened.len(),
            problems: report.problems.len(),
        }
    }
}

/// The per-row tables, in sheet order.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum TableId {
    /// Priority.
    Priority,
    /// Retrofit plan.
    Retrofit,
    /// Directions.
    Directions,
    /// Walls.
    Walls,
    /// Flags.
    Flags,
    /// Not screened.
    NotScreened,
    /// Input problems.
    Problems,
}

impl TableId {
    /// Every table in sheet order.
    pub const ALL: [TableId; 7] = [
        TableId::Priority,
        TableId::Retrofit,
        TableId::Directions,
        TableId::Walls,
        TableId::Flags,
        TableId::NotScreened,
        TableId::Problems,
    ];
    /// Its columns.
    pub fn columns(self) -> &'static [Column] {
        match self {
            TableId::Priority => PRIORITY,
            TableId::Retrofit => RETROFIT,
            TableId::Directions => DIRECTIONS,
            TableId::Walls => WALLS,
            TableId::Flags => FLAGS,
            TableId::NotScreened => NOT_SCREENED,
            TableId::Problems => PROBLEMS,
        }
    }
    /// Its sheet name (interface.md).
    pub fn sheet_name(self) -> &'static str {
        match self {
            TableId::Priority => "Priority",
            TableId::Retrofit => "Retrofit plan",
            TableId::Directions => "Directions",
            TableId::Walls => "Walls",
            TableId::Flags => "Flags",
            TableId::NotScreened => "Not screened",
            TableId::Problems => "Input problems",
        }
    }

    /// A table with a row per building, direction, wall or flag (streamed in constant-memory
    /// mode for large stocks; moved to CSV by the large-stock rule).
    pub fn per_row(self) -> bool {
        matches!(
            self,
            TableId::Priority
                | TableId::Retrofit
                | TableId::Directions
                | TableId::Walls
                | TableId::Flags
        )
    }

    /// A table whose rows each belong to one building and depend on it alone (Priority,
    /// Directions, Walls, Flags): its rows can be made for any run of buildings, in
    /// parallel ([`TableId::building_rows`]).
    pub fn per_building(self) -> bool {
        matches!(
            self,
            TableId::Priority | TableId::Directions | TableId::Walls | TableId::Flags
        )
    }

    /// Writes the rows of one building in a per-building table (see
    /// [`TableId::per_building`]; nothing for the others) into `sink`, calling `end` after
    /// each row.
    pub fn building_rows<S: CellSink + ?Sized, E>(
        self,
        b: &BuildingResult,
        sink: &mut S,
        end: impl FnMut(&mut S) -> Result<(), E>,
    ) -> Result<(), E> {
        self.building_rows_upto(b, usize::MAX, sink, end)?;
        Ok(())
    }

    /// [`TableId::building_rows`], at most `max` rows; returns the rows written.
    fn building_rows_upto<S: CellSink + ?Sized, E>(
        self,
        b: &BuildingResult,
        max: usize,
        sink: &mut S,
        mut end: impl FnMut(&mut S) -> Result<(), E>,
    ) -> Result<usize, E> {
        let mut n = 0usize;
        macro_rules! row {
            ($fill:expr) => {{
                if n >= max {
                    return Ok(n);
                }
                $fill;
                end(sink)?;
                n += 1;
            }};
        }
        match self {
            TableId::Priority => row!(priority_cells(b, sink)),
            TableId::Directions => {
                for d in Dir::BOTH {
                    row!(direction_cells(b, d, sink));
                }
            }
            TableId::Walls => {
                for w in &b.walls {
                    row!(wall_cells(b, w, sink));
                }
            }
            TableId::Flags => {
                for f in &b.flags {
                    row!(flag_cells(b, f, sink));
                }
            }
            TableId::Retrofit | TableId::NotScreened | TableId::Problems => {}
        }
        Ok(n)
    }

    /// Writes the rows of one building in a per-building table into `sink`
    /// ([`TableId::building_rows`] ending each row with [`CellSink::end_row`]).
    pub fn write_building_rows<S: CellSink + ?Sized>(
        self,
        b: &BuildingResult,
        sink: &mut S,
    ) -> Result<(), ReportError> {
        self.building_rows(b, sink, |s| s.end_row())
    }

    /// Emits the rows of one building in a per-building table as cell lists (see
    /// [`TableId::per_building`]; nothing for the others). `buf` is scratch space.
    pub fn for_each_building_row<'a, E>(
        self,
        b: &'a BuildingResult,
        target: Target,
        buf: &mut Vec<Cell<'a>>,
        mut emit: impl FnMut(&[Cell<'a>]) -> Result<(), E>,
    ) -> Result<(), E> {
        let mut v = CellVec::new(target);
        buf.clear();
        self.building_rows(b, &mut v, |v| {
            let r = emit(&v.cells);
            v.cells.clear();
            r
        })
    }

    /// The `<sheet>` part of `<out stem>.<sheet>.csv`.
    pub fn file_tag(self) -> &'static str {
        match self {
            TableId::Priority => "priority",
            TableId::Retrofit => "retrofit-plan",
            TableId::Directions => "directions",
            TableId::Walls => "walls",
            TableId::Flags => "flags",
            TableId::NotScreened => "not-screened",
            TableId::Problems => "input-problems",
        }
    }
    /// Its number of data rows.
    pub fn rows(self, c: &RowCounts) -> usize {
        match self {
            TableId::Priority => c.priority,
            TableId::Retrofit => c.retrofit,
            TableId::Directions => c.directions,
            TableId::Walls => c.walls,
            TableId::Flags => c.flags,
            TableId::NotScreened => c.not_screened,
            TableId::Problems => c.problems,
        }
    }

    /// Writes the rows of the table (at most `limit`), in order, into `sink`, calling `end`
    /// after each row; returns the number of rows.
    pub fn rows_into<S: CellSink + ?Sized, E>(
        self,
        report: &Screening,
        limit: usize,
        sink: &mut S,
        mut end: impl FnMut(&mut S) -> Result<(), E>,
    ) -> Result<usize, E> {
        let mut n = 0usize;
        match self {
            TableId::Priority | TableId::Directions | TableId::Walls | TableId::Flags => {
                for b in &report.buildings {
                    if n >= limit {
                        break;
                    }
                    n += self.building_rows_upto(b, limit - n, sink, &mut end)?;
                }
            }
            TableId::Retrofit => {
                for (b, r, cum) in retrofit_rows(&report.buildings).take(limit) {
                    retrofit_cells(b, r, cum, sink);
                    end(sink)?;
                    n += 1;
                }
            }
            TableId::NotScreened => {
                for ns in report.not_screened.iter().take(limit) {
                    not_screened_cells(ns, sink);
                    end(sink)?;
                    n += 1;
                }
            }
            TableId::Problems => {
                for p in report.problems.iter().take(limit) {
                    problem_cells(p, sink);
                    end(sink)?;
                    n += 1;
                }
            }
        }
        Ok(n)
    }

    /// Writes the rows of the table (at most `limit`) into `sink`, each ended with
    /// [`CellSink::end_row`]; returns the number of rows.
    pub fn write_rows<S: CellSink + ?Sized>(
        self,
        report: &Screening,
        limit: usize,
        sink: &mut S,
    ) -> Result<usize, ReportError> {
        self.rows_into(report, limit, sink, |s| s.end_row())
    }

    /// Calls `emit` with each row of the table (at most `limit` rows), in order, as a cell
    /// list.
    pub fn for_each_row<E>(
        self,
        report: &Screening,
        target: Target,
        limit: usize,
        mut emit: impl FnMut(&[Cell<'_>]) -> Result<(), E>,
    ) -> Result<(), E> {
        let mut v = CellVec::new(target);
        self.rows_into(report, limit, &mut v, |v| {
            let r = emit(&v.cells);
            v.cells.clear();
            r
        })?;
        Ok(())
    }
}
