/*!
The per-row tables of the results workbook (Priority, Retrofit plan, Directions, Walls,
Flags, Not screened, Input problems), described once as columns plus a row function, so that
the same table can be written to a worksheet or, for large stocks and `--csv`, to a CSV file
with the same columns.
*/

use std::borrow::Cow;

use crate::model::{Dir, NotScreened, Problem, Severity};
use crate::results::{BuildingResult, Screening, WallResult};
use crate::settings::Level;

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

const fn col(header: &'static str, key: &'static str, kind: CellKind, width: f64) -> Column {
    Column {
        header,
        key,
        kind,
        width,
    }
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

impl<'a> Cell<'a> {
    fn opt(v: Option<f64>) -> Cell<'a> {
        v.map_or(Cell::Blank, Cell::Num)
    }
    fn text(s: &'a str) -> Cell<'a> {
        Cell::Text(Cow::Borrowed(s))
    }
    fn owned(s: String) -> Cell<'a> {
        Cell::Text(Cow::Owned(s))
    }
    fn yes_no(b: bool) -> Cell<'a> {
        Cell::text(if b { "yes" } else { "no" })
    }
    fn opt_yes_no(b: Option<bool>) -> Cell<'a> {
        b.map_or(Cell::Blank, Cell::yes_no)
    }
}

/// Where a row goes: a few texts read better with spaces in the workbook.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Target {
    /// A worksheet.
    Sheet,
    /// A CSV file.
    Csv,
}

/// The class names live with the classes (method §11, `engine::rank`).
pub use crate::engine::rank::{CLASS_NAMES, class_name};

fn max_dcr(b: &BuildingResult, level: Level) -> f64 {
    b.directions
        .x
        .dcr
        .at(level)
        .max(b.directions.y.dcr.at(level))
}

fn group_code(g: crate::results::Group) -> &'static str {
    match g {
        crate::results::Group::Walls => "walls",
        crate::results::Group::Columns => "columns",
    }
}

// ------------------------------------------------------------------------------------------
// Priority

/// Columns of the Priority table; the keys are the `--csv` column names of `interface.md`.
pub const PRIORITY: &[Column] = &[
    col("Rank", "rank", CellKind::Int, 7.0),
    col("Id", "id", CellKind::Text, 12.0),
    col("Name", "name", CellKind::Text, 28.0),
    col("District", "district", CellKind::Text, 16.0),
    col("Use", "use", CellKind::Text, 12.0),
    col("Occupants", "occupants", CellKind::Thousands, 11.0),
    col("Class", "class", CellKind::Class, 26.0),
    col("Score (governing DCR)", "score", CellKind::Dcr, 12.0),
    col(
        "Governing direction",
        "governing_direction",
        CellKind::Text,
        11.0,
    ),
    col("Governing group", "governing_group", CellKind::Text, 11.0),
    col("DCR IO (max of x, y)", "dcr_io", CellKind::Dcr, 10.0),
    col("DCR LS (max of x, y)", "dcr_ls", CellKind::Dcr, 10.0),
    col("DCR CP (max of x, y)", "dcr_cp", CellKind::Dcr, 10.0),
    col(
        "Priority index, weaker direction (%)",
        "priority_index_min_pct",
        CellKind::Pct,
        13.0,
    ),
    col("Flags (codes)", "flags", CellKind::Text, 36.0),
    col("Retrofit cost", "retrofit_cost", CellKind::Thousands, 14.0),
    // `funded` = Plan A, kept for compatibility; the sheet hides it (PRIORITY_HIDDEN).
    col("Funded (= Plan A)", "funded", CellKind::Text, 10.0),
    col("Latitude (deg)", "latitude", CellKind::Coord, 12.0),
    col("Longitude (deg)", "longitude", CellKind::Coord, 12.0),
    col(
        "Nearest fault (m)",
        "fault_distance_m",
        CellKind::Thousands,
        12.0,
    ),
    col(
        "Funded by Plan A: in priority order",
        "funded_plan_a",
        CellKind::Text,
        15.0,
    ),
    col(
        "Funded by Plan B: most people protected",
        "funded_plan_b",
        CellKind::Text,
        15.0,
    ),
];

/// Priority columns hidden on the sheet (still in CSV and GeoJSON): `funded`, the same as
/// `funded_plan_a`.
pub const PRIORITY_HIDDEN: &[&str] = &["funded"];

/// One Priority row.
pub fn priority_row<'a>(b: &'a BuildingResult, target: Target, out: &mut Vec<Cell<'a>>) {
    out.clear();
    let sep = if target == Target::Sheet { "; " } else { ";" };
    out.extend([
        Cell::Num(b.rank as f64),
        Cell::text(&b.id),
        Cell::text(&b.name),
        Cell::text(&b.district),
        Cell::text(b.use_.code()),
        Cell::opt(b.occupants.map(|o| o as f64)),
        Cell::Num(f64::from(b.class)),
        Cell::Num(b.score),
        Cell::text(b.governing.direction.code()),
        Cell::text(group_code(b.governing.group)),
        Cell::Num(max_dcr(b, Level::Io)),
        Cell::Num(max_dcr(b, Level::Ls)),
        Cell::Num(max_dcr(b, Level::Cp)),
        Cell::Num(b.min_priority_index_pct()),
        Cell::owned(b.flag_codes().join(sep)),
        Cell::opt(b.retrofit.as_ref().and_then(|r| r.cost)),
        Cell::opt_yes_no(b.retrofit.as_ref().and_then(|r| r.funded)),
        Cell::opt(b.latitude),
        Cell::opt(b.longitude),
        Cell::opt(b.fault.as_ref().map(|f| f.distance_m)),
        Cell::opt_yes_no(b.retrofit.as_ref().and_then(|r| r.funded)),
        Cell::opt_yes_no(b.retrofit.as_ref().and_then(|r| r.funded_best)),
    ]);
}

// ------------------------------------------------------------------------------------------
// Retrofit plan

/// Columns of the Retrofit plan table.
pub const RETROFIT: &[Column] = &[
    col("Rank", "rank", CellKind::Int, 7.0),
    col("Id", "id", CellKind::Text, 12.0),
    col("Name", "name", CellKind::Text, 28.0),
    col("District", "district", CellKind::Text, 16.0),
    col("Class", "class", CellKind::Class, 26.0),
    col("Score (governing DCR)", "score", CellKind::Dcr, 12.0),
    col("Occupants", "occupants", CellKind::Thousands, 11.0),
    col(
        "Floor area (m²)",
        "floor_area_m2",
        CellKind::Thousands,
        11.0,
    ),
    col(
        "Added wall area X (m²)",
        "added_wall_area_x_m2",
        CellKind::Dec2,
        12.0,
    ),
    col(
        "Added wall area Y (m²)",
        "added_wall_area_y_m2",
        CellKind::Dec2,
        12.0,
    ),
    col("Column remedy", "column_remedy", CellKind::Text, 9.0),
    col("Retrofit cost", "cost", CellKind::Thousands, 14.0),
    col(
        "Replacement cost",
        "replacement_cost",
        CellKind::Thousands,
        14.0,
    ),
    col("Replace", "replace", CellKind::Text, 9.0),
    col(
        "Cost used for funding",
        "funding_cost",
        CellKind::Thousands,
        14.0,
    ),
    col(
        "Cumulative cost, rank order",
        "cumulative_cost",
        CellKind::Thousands,
        15.0,
    ),
    col("Flags after retrofit", "flags_after", CellKind::Text, 24.0),
    col(
        "Funded by Plan A: in priority order",
        "funded",
        CellKind::Text,
        15.0,
    ),
    col(
        "Funded by Plan B: most people protected",
        "funded_max_occupants",
        CellKind::Text,
        15.0,
    ),
    col(
        "Excluded from the budget plans (reason)",
        "excluded",
        CellKind::Text,
        44.0,
    ),
    col("Note", "note", CellKind::Text, 48.0),
];

/// The cost a building takes from the budget (method §12), computed by
/// [`crate::retrofit::cost::funding_cost`] (the one place).
pub fn funding_cost(b: &BuildingResult) -> Option<f64> {
    b.retrofit
        .as_ref()
        .and_then(crate::retrofit::cost::funding_cost)
}

/// One Retrofit plan row; `cumulative` is the running funding cost in rank order.
pub fn retrofit_row<'a>(
    b: &'a BuildingResult,
    cumulative: Option<f64>,
    target: Target,
    out: &mut Vec<Cell<'a>>,
) {
    out.clear();
    let Some(r) = b.retrofit.as_ref() else {
        return;
    };
    let sep = if target == Target::Sheet { "; " } else { ";" };
    out.extend([
        Cell::Num(b.rank as f64),
        Cell::text(&b.id),
        Cell::text(&b.name),
        Cell::text(&b.district),
        Cell::Num(f64::from(b.class)),
        Cell::Num(b.score),
        Cell::opt(b.occupants.map(|o| o as f64)),
        Cell::Num(b.detail.floor_area_m2),
        Cell::opt(r.added_wall_area_m2.x),
        Cell::opt(r.added_wall_area_m2.y),
        Cell::yes_no(r.column_remedy),
        Cell::opt(r.cost),
        Cell::opt(r.replacement_cost),
        Cell::opt_yes_no(r.replace),
        Cell::opt(funding_cost(b)),
        Cell::opt(cumulative),
        Cell::owned(
            r.flags_after
                .iter()
                .map(|c| c.as_str())
                .collect::<Vec<_>>()
                .join(sep),
        ),
        Cell::opt_yes_no(r.funded),
        Cell::opt_yes_no(r.funded_best),
        Cell::text(r.excluded.as_deref().unwrap_or("")),
        // The note is the retrofit's own (method §12: `retrofit::sizing` and `retrofit::cost`).
        Cell::text(&r.note),
    ]);
}

// ------------------------------------------------------------------------------------------
// Directions

/// Columns of the Directions table: every intermediate number of method.md, in method order.
pub const DIRECTIONS: &[Column] = &[
    col("Rank", "rank", CellKind::Int, 7.0),
    col("Id", "id", CellKind::Text, 12.0),
    col("Name", "name", CellKind::Text, 24.0),
    col("Class", "class", CellKind::Class, 26.0),
    col("Direction", "direction", CellKind::Text, 9.0),
    col("Governs", "governs", CellKind::Text, 8.0),
    // §0 building quantities
    col("Storeys", "storeys", CellKind::Int, 8.0),
    col("Height H (m)", "height_m", CellKind::Dec2, 9.0),
    col(
        "Floor area A_fl (m²)",
        "floor_area_m2",
        CellKind::Dec2,
        11.0,
    ),
    col(
        "Seismic weight W (kN)",
        "weight_kn",
        CellKind::Thousands,
        11.0,
    ),
    col("fc used (MPa)", "fc_mpa", CellKind::Dec2, 9.0),
    col("fy used (MPa)", "fy_mpa", CellKind::Dec2, 9.0),
    col(
        "Column area A_col (m²)",
        "column_area_m2",
        CellKind::Dec3,
        10.0,
    ),
    col(
        "Boundary elements (effective)",
        "boundary_elements",
        CellKind::Text,
        10.0,
    ),
    col(
        "Columns detailed (effective)",
        "columns_detailed",
        CellKind::Text,
        10.0,
    ),
    // §1
    col(
        "RC wall area A_cw (m²)",
        "rc_wall_area_m2",
        CellKind::Dec3,
        10.0,
    ),
    col(
        "Infill area A_mw (m²)",
        "infill_area_m2",
        CellKind::Dec3,
        10.0,
    ),
    col(
        "RC wall index WIrc (%)",
        "rc_wall_index_pct",
        CellKind::Pct,
        10.0,
    ),
    col("Wall index WI (%)", "wall_index_pct", CellKind::Pct, 10.0),
    col(
        "Column index CI (%)",
        "column_index_pct",
        CellKind::Pct,
        10.0,
    ),
    col(
        "Priority index PI (%)",
        "priority_index_pct",
        CellKind::Pct,
        10.0,
    ),
    // §2
    col(
        "Axial load ratio ν (-)",
        "axial_load_ratio",
        CellKind::Dec3,
        10.0,
    ),
    // §3
    col("Strength factor β (-)", "beta", CellKind::Dec3, 9.0),
    col(
        "Wall strength C_w (-)",
        "strength_walls",
        CellKind::Dec3,
        10.0,
    ),
    col(
        "Column strength C_c (-)",
        "strength_columns",
        CellKind::Dec3,
        10.0,
    ),
    col("α1 (-)", "alpha1", CellKind::Dec2, 7.0),
    col(
        "Strength coefficient C_y (-)",
        "strength_coefficient",
        CellKind::Dec3,
        11.0,
    ),
    // §4
    col(
        "Period, frame formula (s)",
        "period_frame_s",
        CellKind::Dec3,
        10.0,
    ),
    col("Ac (m²)", "ac_m2", CellKind::Dec3, 9.0),
    col(
        "Period, wall formula (s)",
        "period_wall_s",
        CellKind::Dec3,
        10.0,
    ),
    col(
        "Formula period before factor (s)",
        "period_formula_s",
        CellKind::Dec3,
        11.0,
    ),
    col("Period source", "period_source", CellKind::Text, 10.0),
    col("Period used T (s)", "period_s", CellKind::Dec3, 9.0),
    // §5
    col("agR (g)", "agr_g", CellKind::Dec3, 8.0),
    col("agR from", "agr_source", CellKind::Text, 10.0),
    col("Ground type", "ground_type", CellKind::Text, 8.0),
    col("Importance γI (-)", "gamma_i", CellKind::Dec2, 9.0),
    col("ag = γI·agR (g)", "ag_g", CellKind::Dec3, 9.0),
    col("Spectrum parameters", "spectrum", CellKind::Text, 30.0),
    col(
        "Factor on spectrum (-)",
        "spectrum_factor",
        CellKind::Dec2,
        9.0,
    ),
    col("η (-)", "eta", CellKind::Dec3, 7.0),
    col("Corner period TC (s)", "tc_s", CellKind::Dec3, 9.0),
    col("Se(T) (g)", "se_g", CellKind::Dec3, 9.0),
    col("SDe(T) (m)", "sde_m", CellKind::Dec4, 9.0),
    // §6
    col("Γ (-)", "gamma", CellKind::Dec3, 8.0),
    col("S_ay (g)", "say_g", CellKind::Dec3, 8.0),
    col("qu (-)", "qu", CellKind::Dec3, 8.0),
    col("N2 branch", "n2_branch", CellKind::Text, 18.0),
    col("dt* (m)", "dt_star_m", CellKind::Dec4, 9.0),
    col(
        "Roof displacement d_t (m)",
        "roof_displacement_m",
        CellKind::Dec4,
        11.0,
    ),
    col(
        "Roof drift δ_r (%)",
        "roof_drift_demand",
        CellKind::Ratio,
        10.0,
    ),
    // §7
    col("Soft or weak storey", "soft_or_weak", CellKind::Text, 9.0),
    col("κ (-)", "kappa", CellKind::Dec2, 7.0),
    col(
        "Drift demand, walls (%)",
        "drift_demand_walls",
        CellKind::Ratio,
        10.0,
    ),
    col(
        "Drift demand, columns (%)",
        "drift_demand_columns",
        CellKind::Ratio,
        10.0,
    ),
    // §8
    col(
        "Wall shear span Lv (m)",
        "wall_shear_span_m",
        CellKind::Dec2,
        10.0,
    ),
    col(
        "Column shear span Lv (m)",
        "column_shear_span_m",
        CellKind::Dec2,
        10.0,
    ),
    col("Column θy (%)", "column_theta_y", CellKind::Ratio, 9.0),
    col("Column θum (%)", "column_theta_um", CellKind::Ratio, 9.0),
    col(
        "Wall capacity IO (%)",
        "capacity_walls_io",
        CellKind::Ratio,
        10.0,
    ),
    col(
        "Wall capacity LS (%)",
        "capacity_walls_ls",
        CellKind::Ratio,
        10.0,
    ),
    col(
        "Wall capacity CP (%)",
        "capacity_walls_cp",
        CellKind::Ratio,
        10.0,
    ),
    col(
        "Column capacity IO (%)",
        "capacity_columns_io",
        CellKind::Ratio,
        10.0,
    ),
    col(
        "Column capacity LS (%)",
        "capacity_columns_ls",
        CellKind::Ratio,
        10.0,
    ),
    col(
        "Column capacity CP (%)",
        "capacity_columns_cp",
        CellKind::Ratio,
        10.0,
    ),
    // §9
    col("DCR IO (-)", "dcr_io", CellKind::Dcr, 8.0),
    col("DCR LS (-)", "dcr_ls", CellKind::Dcr, 8.0),
    col("DCR CP (-)", "dcr_cp", CellKind::Dcr, 8.0),
    // §9 frame-alone bound (RC walls of the direction removed)
    col(
        "Frame alone: period (s)",
        "frame_alone_period_s",
        CellKind::Dec3,
        10.0,
    ),
    col(
        "Frame alone: roof drift (%)",
        "frame_alone_roof_drift_demand",
        CellKind::Ratio,
        10.0,
    ),
    col(
        "Frame alone: DCR LS (-)",
        "frame_alone_dcr_ls",
        CellKind::Dcr,
        9.0,
    ),
    col(
        "Frame alone: DCR CP (-)",
        "frame_alone_dcr_cp",
        CellKind::Dcr,
        9.0,
    ),
    col(
        "Frame alone governs at",
        "frame_alone_governs",
        CellKind::Text,
        10.0,
    ),
];

/// One Directions row (building `b`, direction `d`).
pub fn direction_row<'a>(b: &'a BuildingResult, d: Dir, out: &mut Vec<Cell<'a>>) {
    out.clear();
    let r = b.directions.get(d);
    let det = &r.detail;
    let bd = &b.detail;
    let cw = r.capacity.walls;
    let cc = r.capacity.columns;
    let fa = r.frame_alone;
    out.extend([
        Cell::Num(b.rank as f64),
        Cell::text(&b.id),
        Cell::text(&b.name),
        Cell::Num(f64::from(b.class)),
        Cell::text(d.code()),
        Cell::yes_no(b.governing.direction == d),
        Cell::Num(f64::from(bd.storeys)),
        Cell::Num(bd.height_m),
        Cell::Num(bd.floor_area_m2),
        Cell::Num(bd.weight_kn),
        Cell::Num(bd.fc_mpa),
        Cell::Num(bd.fy_mpa),
        Cell::Num(bd.column_area_m2),
        Cell::yes_no(bd.boundary_elements),
        Cell::yes_no(bd.columns_detailed),
        Cell::Num(det.rc_wall_area_m2),
        Cell::Num(det.infill_area_m2),
        Cell::Num(det.rc_wall_index_pct),
        Cell::Num(r.wall_index_pct),
        Cell::Num(r.column_index_pct),
        Cell::Num(r.priority_index_pct),
        Cell::Num(b.axial_load_ratio),
        Cell::Num(bd.beta),
        Cell::Num(det.strength_walls),
        Cell::Num(det.strength_columns),
        Cell::Num(det.alpha1),
        Cell::Num(det.strength_coefficient),
        Cell::Num(det.period_frame_s),
        Cell::Num(det.ac_m2),
        Cell::opt(det.period_wall_s),
        Cell::Num(det.period_formula_s),
        Cell::text(det.period_source),
        Cell::Num(r.period_s),
        Cell::Num(bd.agr_g),
        Cell::text(bd.agr_source),
        Cell::text(&bd.ground_type),
        Cell::Num(bd.gamma_i),
        Cell::Num(bd.ag_g),
        Cell::owned(crate::report::flag_text::spectrum_text(&bd.spectrum)),
        Cell::Num(bd.spectrum_factor),
        Cell::Num(bd.eta),
        Cell::Num(det.tc_s),
        Cell::Num(det.se_g),
        Cell::Num(det.sde_m),
        Cell::Num(det.gamma),
        Cell::Num(det.say_g),
        Cell::Num(det.qu),
        Cell::text(det.n2_branch),
        Cell::Num(det.dt_star_m),
        Cell::Num(det.roof_displacement_m),
        Cell::Num(r.roof_drift_demand),
        Cell::yes_no(det.soft_or_weak),
        Cell::Num(det.kappa),
        Cell::opt(r.drift_demand.walls),
        Cell::opt(r.drift_demand.columns),
        Cell::Num(bd.wall_shear_span_m),
        Cell::Num(bd.column_shear_span_m),
        Cell::opt(bd.column_theta_y),
        Cell::opt(bd.column_theta_um),
        Cell::opt(cw.map(|c| c.io)),
        Cell::opt(cw.map(|c| c.ls)),
        Cell::opt(cw.map(|c| c.cp)),
        Cell::opt(cc.map(|c| c.io)),
        Cell::opt(cc.map(|c| c.ls)),
        Cell::opt(cc.map(|c| c.cp)),
        Cell::Num(r.dcr.io),
        Cell::Num(r.dcr.ls),
        Cell::Num(r.dcr.cp),
        Cell::opt(fa.map(|f| f.period_s)),
        Cell::opt(fa.map(|f| f.roof_drift_demand)),
        Cell::opt(fa.map(|f| f.dcr.ls)),
        Cell::opt(fa.map(|f| f.dcr.cp)),
        Cell::text(match fa.map(|f| (f.governs.ls, f.governs.cp)) {
            None => "",
            Some((true, true)) => "LS, CP",
            Some((true, false)) => "LS",
            Some((false, true)) => "CP",
            Some((false, false)) => "no",
        }),
    ]);
}

// ------------------------------------------------------------------------------------------
// Walls

/// Columns of the Walls table.
pub const WALLS: &[Column] = &[
    col("Rank", "rank", CellKind::Int, 7.0),
    col("Building id", "building_id", CellKind::Text, 12.0),
    col("Wall id", "wall_id", CellKind::Text, 14.0),
    col("Direction", "direction", CellKind::Text, 9.0),
    col("Representative", "representative", CellKind::Text, 10.0),
    col("Walls represented", "count", CellKind::Dec2, 10.0),
    col("Length lw (m)", "length_m", CellKind::Dec2, 9.0),
    col("Thickness tw (m)", "thickness_m", CellKind::Dec3, 9.0),
    col(
        "Boundary elements",
        "boundary_elements",
        CellKind::Text,
        10.0,
    ),
    col(
        "Axial load ratio ν (-)",
        "axial_load_ratio",
        CellKind::Dec3,
        10.0,
    ),
    col("Shear span Lv (m)", "shear_span_m", CellKind::Dec2, 9.0),
    col("Yield rotation θy (%)", "theta_y", CellKind::Ratio, 10.0),
    col(
        "Ultimate rotation θum (%)",
        "theta_um",
        CellKind::Ratio,
        11.0,
    ),
    col("Capacity IO (%)", "capacity_io", CellKind::Ratio, 10.0),
    col("Capacity LS (%)", "capacity_ls", CellKind::Ratio, 10.0),
    col("Capacity CP (%)", "capacity_cp", CellKind::Ratio, 10.0),
];

/// One Walls row.
pub fn wall_row<'a>(b: &'a BuildingResult, w: &'a WallResult, out: &mut Vec<Cell<'a>>) {
    out.clear();
    out.extend([
        Cell::Num(b.rank as f64),
        Cell::text(&b.id),
        Cell::text(&w.wall_id),
        w.direction.map_or(Cell::Blank, |d| Cell::text(d.code())),
        Cell::yes_no(w.representative),
        Cell::Num(w.count),
        Cell::Num(w.length_m),
        Cell::Num(w.thickness_m),
        Cell::yes_no(w.boundary_elements),
        Cell::Num(w.axial_load_ratio),
        Cell::Num(w.shear_span_m),
        Cell::Num(w.theta_y),
        Cell::Num(w.theta_um),
        Cell::Num(w.capacity.io),
        Cell::Num(w.capacity.ls),
        Cell::Num(w.capacity.cp),
    ]);
}

// ------------------------------------------------------------------------------------------
// Flags

/// Columns of the Flags table.
pub const FLAGS: &[Column] = &[
    col("Rank", "rank", CellKind::Int, 7.0),
    col("Id", "id", CellKind::Text, 12.0),
    col("Name", "name", CellKind::Text, 24.0),
    col("Class", "class", CellKind::Class, 26.0),
    col("Flag", "code", CellKind::Text, 20.0),
    col("Direction", "direction", CellKind::Text, 9.0),
    col("Reason", "detail", CellKind::Text, 90.0),
];

/// One Flags row.
pub fn flag_row<'a>(b: &'a BuildingResult, f: &'a crate::results::Flag, out: &mut Vec<Cell<'a>>) {
    out.clear();
    out.extend([
        Cell::Num(b.rank as f64),
        Cell::text(&b.id),
        Cell::text(&b.name),
        Cell::Num(f64::from(b.class)),
        Cell::text(f.code.as_str()),
        f.direction.map_or(Cell::Blank, |d| Cell::text(d.code())),
        Cell::owned(crate::report::flag_text::detail(f)),
    ]);
}

// ------------------------------------------------------------------------------------------
// Not screened and input problems

/// Columns of the Not screened table.
pub const NOT_SCREENED: &[Column] = &[
    col("Sheet", "sheet", CellKind::Text, 12.0),
    col("Row", "row", CellKind::Int, 8.0),
    col("Id", "id", CellKind::Text, 14.0),
    col("Reasons", "reasons", CellKind::Text, 100.0),
];

/// One Not screened row.
pub fn not_screened_row<'a>(n: &'a NotScreened, out: &mut Vec<Cell<'a>>) {
    out.clear();
    out.extend([
        Cell::text(&n.sheet),
        Cell::Num(n.row as f64),
        Cell::text(&n.id),
        Cell::owned(n.reasons.join("; ")),
    ]);
}

/// Columns of the Input problems table.
pub const PROBLEMS: &[Column] = &[
    col("Severity", "severity", CellKind::Text, 10.0),
    col("Sheet", "sheet", CellKind::Text, 12.0),
    col("Row", "row", CellKind::Int, 8.0),
    col("Column", "column", CellKind::Text, 22.0),
    col("Problem", "message", CellKind::Text, 100.0),
];

/// One Input problems row.
pub fn problem_row<'a>(p: &'a Problem, out: &mut Vec<Cell<'a>>) {
    out.clear();
    out.extend([
        Cell::text(match p.severity {
            Severity::Error => "error",
            Severity::Warning => "warning",
        }),
        Cell::text(&p.sheet),
        Cell::opt(p.row.map(|r| r as f64)),
        Cell::text(&p.column),
        Cell::text(&p.message),
    ]);
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
    /// parallel ([`Table::for_each_building_row`]).
    pub fn per_building(self) -> bool {
        matches!(
            self,
            TableId::Priority | TableId::Directions | TableId::Walls | TableId::Flags
        )
    }

    /// Emits the rows of one building in a per-building table (see
    /// [`Table::per_building`]; nothing for the others). `buf` is scratch space.
    pub fn for_each_building_row<'a, E>(
        self,
        b: &'a BuildingResult,
        target: Target,
        buf: &mut Vec<Cell<'a>>,
        mut emit: impl FnMut(&[Cell<'a>]) -> Result<(), E>,
    ) -> Result<(), E> {
        match self {
            TableId::Priority => {
                priority_row(b, target, buf);
                emit(buf)?;
            }
            TableId::Directions => {
                for d in Dir::BOTH {
                    direction_row(b, d, buf);
                    emit(buf)?;
                }
            }
            TableId::Walls => {
                for w in &b.walls {
                    wall_row(b, w, buf);
                    emit(buf)?;
                }
            }
            TableId::Flags => {
                for f in &b.flags {
                    flag_row(b, f, buf);
                    emit(buf)?;
                }
            }
            TableId::Retrofit | TableId::NotScreened | TableId::Problems => {}
        }
        Ok(())
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

    /// Calls `emit` with each row of the table (at most `limit` rows), in order.
    pub fn for_each_row<E>(
        self,
        report: &Screening,
        target: Target,
        limit: usize,
        mut emit: impl FnMut(&[Cell<'_>]) -> Result<(), E>,
    ) -> Result<(), E> {
        let mut buf: Vec<Cell<'_>> = Vec::with_capacity(self.columns().len());
        let mut n = 0usize;
        macro_rules! push {
            () => {{
                if n >= limit {
                    return Ok(());
                }
                emit(&buf)?;
                n += 1;
            }};
        }
        match self {
            TableId::Priority | TableId::Directions | TableId::Walls | TableId::Flags => {
                for b in &report.buildings {
                    let mut full = false;
                    self.for_each_building_row(b, target, &mut buf, |cells| {
                        if n >= limit {
                            full = true;
                            return Ok(());
                        }
                        emit(cells)?;
                        n += 1;
                        Ok(())
                    })?;
                    if full {
                        return Ok(());
                    }
                }
            }
            TableId::Retrofit => {
                let mut cumulative = 0.0;
                let mut cum_known = true;
                for b in report.buildings.iter().filter(|b| b.retrofit.is_some()) {
                    match funding_cost(b) {
                        Some(c) if cum_known => cumulative += c,
                        _ => cum_known = false,
                    }
                    let cum = (cum_known && funding_cost(b).is_some()).then_some(cumulative);
                    retrofit_row(b, cum, target, &mut buf);
                    push!();
                }
            }
            TableId::NotScreened => {
                for ns in &report.not_screened {
                    not_screened_row(ns, &mut buf);
                    push!();
                }
            }
            TableId::Problems => {
                for p in &report.problems {
                    problem_row(p, &mut buf);
                    push!();
                }
            }
        }
        Ok(())
    }
}
