/*!
Typed inventory records: what the reading layer produces and the engine consumes.

Optional inputs stay `Option` here: the engine resolves defaults (and records which ones it
used), so that `defaults_used` and `explain` can say exactly what came from where. Every
record carries the spreadsheet row a person sees (1-based, header and title rows included).
*/

use serde::{Deserialize, Serialize};

pub use crate::settings::GroundType;

/// Building use (selects the importance factor).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum Use {
    /// Apartment blocks and houses.
    Residential,
    /// Schools.
    School,
    /// Hospitals.
    Hospital,
    /// Offices.
    Office,
    /// Anything else.
    Other,
}

impl Use {
    /// The inventory's spelling.
    pub fn code(self) -> &'static str {
        match self {
            Use::Residential => "residential",
            Use::School => "school",
            Use::Hospital => "hospital",
            Use::Office => "office",
            Use::Other => "other",
        }
    }
    /// Every use, in the template's order.
    pub const ALL: [Use; 5] = [
        Use::Residential,
        Use::School,
        Use::Hospital,
        Use::Office,
        Use::Other,
    ];
}

/// A surveyor's yes / no / unknown answer.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum YesNo {
    /// Recorded present.
    Yes,
    /// Recorded absent.
    No,
    /// Not known.
    Unknown,
}

/// Plan direction.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord, Serialize, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum Dir {
    /// Plan axis X.
    X,
    /// Plan axis Y.
    Y,
}

impl Dir {
    /// Both directions, X first.
    pub const BOTH: [Dir; 2] = [Dir::X, Dir::Y];
    /// Lower-case code (`x`, `y`).
    pub fn code(self) -> &'static str {
        match self {
            Dir::X => "x",
            Dir::Y => "y",
        }
    }
}

/// A pair of values, one per plan direction.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
pub struct PerDir<T> {
    /// Direction X.
    pub x: T,
    /// Direction Y.
    pub y: T,
}

impl<T> PerDir<T> {
    /// The value for one direction.
    pub fn get(&self, d: Dir) -> &T {
        match d {
            Dir::X => &self.x,
            Dir::Y => &self.y,
        }
    }
    /// Mutable access for one direction.
    pub fn get_mut(&mut self, d: Dir) -> &mut T {
        match d {
            Dir::X => &mut self.x,
            Dir::Y => &mut self.y,
        }
    }
}

/// One row of the `buildings` sheet, typed. `None` = blank cell (a default applies).
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
pub struct BuildingRecord {
    /// Spreadsheet row (1-based, as a person sees it).
    pub row: usize,
    /// Unique id, kept as text exactly ("0100" stays "0100").
    pub id: String,
    /// Name.
    pub name: String,
    /// Use; `None` = default residential.
    pub use_: Option<Use>,
    /// Year built.
    pub year_built: Option<i32>,
    /// Latitude (WGS84 degrees).
    pub latitude: Option<f64>,
    /// Longitude (WGS84 degrees).
    pub longitude: Option<f64>,
    /// District name as given.
    pub district: Option<String>,
    /// Storeys above the base (whole, 1..=60).
    pub storeys: u32,
    /// Typical storey height (m).
    pub storey_height_m: Option<f64>,
    /// Ground-storey height (m).
    pub ground_storey_height_m: Option<f64>,
    /// Typical storey plan area (m²).
    pub plan_area_m2: f64,
    /// Plan length along X (m).
    pub plan_length_x_m: Option<f64>,
    /// Plan length along Y (m).
    pub plan_length_y_m: Option<f64>,
    /// Ground-storey column area, total (m²).
    pub column_area_m2: f64,
    /// Column depth (m).
    pub column_depth_m: Option<f64>,
    /// Ground-storey RC wall area parallel to X (m²).
    pub rc_wall_area_x_m2: Option<f64>,
    /// Ground-storey RC wall area parallel to Y (m²).
    pub rc_wall_area_y_m2: Option<f64>,
    /// Typical wall length along X (m).
    pub wall_length_x_m: Option<f64>,
    /// Typical wall length along Y (m).
    pub wall_length_y_m: Option<f64>,
    /// Wall thickness (m).
    pub wall_thickness_m: Option<f64>,
    /// Ground-storey infill area parallel to X (m²).
    pub infill_area_x_m2: Option<f64>,
    /// Ground-storey infill area parallel to Y (m²).
    pub infill_area_y_m2: Option<f64>,
    /// Storey-2 RC wall area parallel to X (m²).
    pub upper_rc_wall_area_x_m2: Option<f64>,
    /// Storey-2 RC wall area parallel to Y (m²).
    pub upper_rc_wall_area_y_m2: Option<f64>,
    /// Storey-2 infill area parallel to X (m²).
    pub upper_infill_area_x_m2: Option<f64>,
    /// Storey-2 infill area parallel to Y (m²).
    pub upper_infill_area_y_m2: Option<f64>,
    /// Storey-2 column area (m²).
    pub upper_column_area_m2: Option<f64>,
    /// Boundary elements recorded.
    pub boundary_elements: Option<YesNo>,
    /// Short (captive) columns recorded.
    pub short_columns: Option<YesNo>,
    /// Concrete strength (MPa).
    pub fc_mpa: Option<f64>,
    /// Steel yield strength (MPa).
    pub fy_mpa: Option<f64>,
    /// Seismic weight per floor area (kPa).
    pub floor_weight_kpa: Option<f64>,
    /// Occupants.
    pub occupants: Option<u64>,
    /// Ground type A–E.
    pub ground_type: Option<GroundType>,
    /// Reference PGA on rock (g).
    pub agr_g: Option<f64>,
    /// Two-parameter SDS (g).
    pub sds_g: Option<f64>,
    /// Two-parameter SD1 (g).
    pub sd1_g: Option<f64>,
    /// Analysed period along X (s).
    pub period_x_s: Option<f64>,
    /// Analysed period along Y (s).
    pub period_y_s: Option<f64>,
}

/// One row of the `walls` sheet.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
pub struct WallRecord {
    /// Spreadsheet row.
    pub row: usize,
    /// Building id.
    pub building_id: String,
    /// Wall id (may be empty).
    pub wall_id: String,
    /// Direction its length is parallel to.
    pub direction: Option<Dir>,
    /// Length lw (m).
    pub length_m: f64,
    /// Thickness tw (m).
    pub thickness_m: Option<f64>,
    /// Centre x in the footprint frame (m).
    pub x_m: Option<f64>,
    /// Centre y in the footprint frame (m).
    pub y_m: Option<f64>,
    /// Boundary elements; `None` = the building's value.
    pub boundary_elements: Option<YesNo>,
    /// Boundary steel ratio (%).
    pub boundary_steel_pct: Option<f64>,
    /// Web steel ratio (%).
    pub web_steel_pct: Option<f64>,
    /// Bar diameter (mm).
    pub bar_diameter_mm: Option<f64>,
    /// First storey (1 = ground); `None` = 1.
    pub start_storey: Option<u32>,
    /// Last storey; `None` = top.
    pub end_storey: Option<u32>,
}

/// One row of the `storeys` sheet.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
pub struct StoreyRecord {
    /// Spreadsheet row.
    pub row: usize,
    /// Building id.
    pub building_id: String,
    /// Storey number (1 = ground).
    pub storey: u32,
    /// Storey height (m).
    pub height_m: Option<f64>,
    /// Column area (m²).
    pub column_area_m2: Option<f64>,
    /// RC wall area parallel to X (m²).
    pub rc_wall_area_x_m2: Option<f64>,
    /// RC wall area parallel to Y (m²).
    pub rc_wall_area_y_m2: Option<f64>,
    /// Infill area parallel to X (m²).
    pub infill_area_x_m2: Option<f64>,
    /// Infill area parallel to Y (m²).
    pub infill_area_y_m2: Option<f64>,
}

/// One vertex of the `footprints` sheet.
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
pub struct FootprintVertex {
    /// Spreadsheet row.
    pub row: usize,
    /// Building id.
    pub building_id: String,
    /// Vertex order.
    pub vertex: f64,
    /// x (m, local plan frame).
    pub x_m: f64,
    /// y (m, local plan frame).
    pub y_m: f64,
}

/// Severity of an input problem.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum Severity {
    /// The row (or file) cannot be screened.
    Error,
    /// The row is screened; something was defaulted or unusual.
    Warning,
}

/// One problem found in the input: `sheet, row, column: message`.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Problem {
    /// Sheet name (or CSV file's sheet equivalent: `buildings`, `walls`, …).
    pub sheet: String,
    /// Spreadsheet row a person sees; `None` for whole-sheet problems.
    pub row: Option<usize>,
    /// Column (canonical name where known, else the header as found); "" when not a cell.
    pub column: String,
    /// What was expected and what was found.
    pub message: String,
    /// Error or warning.
    pub severity: Severity,
}

impl std::fmt::Display for Problem {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        let sev = match self.severity {
            Severity::Error => "error",
            Severity::Warning => "warning",
        };
        match (self.row, self.column.is_empty()) {
            (Some(r), false) => write!(
                f,
                "{sev}: {}, row {r}, {}: {}",
                self.sheet, self.column, self.message
            ),
            (Some(r), true) => write!(f, "{sev}: {}, row {r}: {}", self.sheet, self.message),
            (None, false) => write!(
                f,
                "{sev}: {}, {}: {}",
                self.sheet, self.column, self.message
            ),
            (None, true) => write!(f, "{sev}: {}: {}", self.sheet, self.message),
        }
    }
}

/// A row that will not be screened, with its reasons.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct NotScreened {
    /// Sheet (normally `buildings`).
    pub sheet: String,
    /// Spreadsheet row.
    pub row: usize,
    /// The id as found (may be empty).
    pub id: String,
    /// Reasons, in plain words.
    pub reasons: Vec<String>,
}

/// A whole inventory after reading and checking: accepted typed rows plus everything that
/// went wrong. `rows = buildings.len() + not_screened.len()` (blank rows counted apart).
#[derive(Debug, Clone, Default, PartialEq, Serialize, Deserialize)]
pub struct Inventory {
    /// Accepted building rows, in file order.
    pub buildings: Vec<BuildingRecord>,
    /// Accepted wall rows (unknown building ids already dropped and reported).
    pub walls: Vec<WallRecord>,
    /// Accepted storey rows.
    pub storeys: Vec<StoreyRecord>,
    /// Accepted footprint vertices.
    pub footprints: Vec<FootprintVertex>,
    /// Key/value rows of the `settings` sheet (key, value text), in order.
    pub settings_rows: Vec<(String, String)>,
    /// The spreadsheet row of each entry of `settings_rows` (same order; 1-based, title and
    /// header rows included; CSV: the record number, header = 1).
    #[serde(default)]
    pub settings_row_numbers: Vec<usize>,
    /// Building rows rejected by the reader, with reasons.
    pub not_screened: Vec<NotScreened>,
    /// Every problem found (errors and warnings).
    pub problems: Vec<Problem>,
    /// Non-blank data rows of the buildings sheet.
    pub rows: usize,
    /// Blank rows skipped in the buildings sheet.
    pub blank_rows: usize,
    /// Rows of the `eras` sheet (without errors): they replace the settings' era table
    /// when present (inventory.md).
    #[serde(default)]
    pub eras: Vec<crate::settings::Era>,
}

/// Hazard and district data that geography gives a building (method §0, geography issue).
#[derive(Debug, Clone, PartialEq, Default, Serialize, Deserialize)]
pub struct SiteInfo {
    /// District name (given or assigned); "" when none.
    pub district: String,
    /// District hazard override: agR (g).
    pub agr_g: Option<f64>,
    /// District hazard override: ground type.
    pub ground_type: Option<GroundType>,
    /// District hazard override: SDS (g).
    pub sds_g: Option<f64>,
    /// District hazard override: SD1 (g).
    pub sd1_g: Option<f64>,
    /// Nearest fault trace, if any faults were given.
    pub fault: Option<FaultDistance>,
    /// The trace that triggers near-fault (method §10), if any: (name, distance m, mw).
    pub near_fault: Option<NearFault>,
}

/// Nearest fault trace of a building.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FaultDistance {
    /// Trace name.
    pub name: String,
    /// Distance to the closest point of the trace (m).
    pub distance_m: f64,
}

/// The trace that triggers the near-fault flag.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct NearFault {
    /// Trace name.
    pub name: String,
    /// Distance (m).
    pub distance_m: f64,
    /// Moment magnitude, if the trace has one.
    pub mw: Option<f64>,
    /// The distance limit that applied (km).
    pub limit_km: f64,
}
