//! The Priority table (sheet "Priority", `--csv`, the GeoJSON properties): one row per
//! building in rank order; the keys are the `--csv` column names of `interface.md`.

use super::table;
use crate::results::{BuildingResult, Group};
use crate::settings::Level;

/// The larger DCR of the two directions at a level.
fn max_dcr(b: &BuildingResult, level: Level) -> f64 {
    b.directions
        .x
        .dcr
        .at(level)
        .max(b.directions.y.dcr.at(level))
}

fn group_code(g: Group) -> &'static str {
    match g {
        Group::Walls => "walls",
        Group::Columns => "columns",
    }
}

/// Priority columns hidden on the sheet (still in CSV and GeoJSON): `funded`, the same as
/// `funded_plan_a`.
pub const PRIORITY_HIDDEN: &[&str] = &["funded"];

table! {
    /// Columns of the Priority table.
    columns PRIORITY;
    /// One Priority row.
    fn priority_cells(b: &BuildingResult) target(t) {
        let sep = t.list_sep();
    }
    "Rank", "rank", Int, 7.0 => b.rank;
    "Id", "id", Text, 12.0 => &b.id;
    "Name", "name", Text, 28.0 => &b.name;
    "District", "district", Text, 16.0 => &b.district;
    "Use", "use", Text, 12.0 => b.use_.code();
    "Occupants", "occupants", Thousands, 11.0 => b.occupants;
    "Class", "class", Class, 26.0 => b.class;
    "Score (governing DCR)", "score", Dcr, 12.0 => b.score;
    "Governing direction", "governing_direction", Text, 11.0 => b.governing.direction.code();
    "Governing group", "governing_group", Text, 11.0 => group_code(b.governing.group);
    "DCR IO (max of x, y)", "dcr_io", Dcr, 10.0 => max_dcr(b, Level::Io);
    "DCR LS (max of x, y)", "dcr_ls", Dcr, 10.0 => max_dcr(b, Level::Ls);
    "DCR CP (max of x, y)", "dcr_cp", Dcr, 10.0 => max_dcr(b, Level::Cp);
    "Priority index, weaker direction (%)", "priority_index_min_pct", Pct, 13.0 => b.min_priority_index_pct();
    "Flags (codes)", "flags", Text, 36.0 => b.flag_codes().join(sep);
    "Retrofit cost", "retrofit_cost", Thousands, 14.0 => b.retrofit.as_ref().and_then(|r| r.cost);
    // `funded` = Plan A, kept for compatibility; the sheet hides it (PRIORITY_HIDDEN).
    "Funded (= Plan A)", "funded", Text, 10.0 => b.retrofit.as_ref().and_then(|r| r.funded);
    "Latitude (deg)", "latitude", Coord, 12.0 => b.latitude;
    "Longitude (deg)", "longitude", Coord, 12.0 => b.longitude;
    "Nearest fault (m)", "fault_distance_m", Thousands, 12.0 => b.fault.as_ref().map(|f| f.distance_m);
    "Funded by Plan A: in priority order", "funded_plan_a", Text, 15.0 => b.retrofit.as_ref().and_then(|r| r.funded);
    "Funded by Plan B: most people protected", "funded_plan_b", Text, 15.0 => b.retrofit.as_ref().and_then(|r| r.funded_best);
}
