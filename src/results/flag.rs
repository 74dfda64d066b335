/*!
Typed flags (method §10): a [`FlagCode`] and, per flag, the numbers that triggered it
together with the limits it was compared against (copied from the settings the engine
screened with, so a flag's wording can never disagree with the settings in force). The
engine (`engine::flags`) builds these and composes no text; the report layer words them
(`report::flag_text`, which also serialises a [`Flag`] as `{code, direction, detail}`).
*/

use serde::Serialize;

use crate::model::{Dir, GroundType, Use};

/// The code of a flag (method §10), serialised as the contract's kebab-case code.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum FlagCode {
    /// Soft ground storey (ASCE 7-16 Table 12.3-2 type 1a).
    SoftStorey,
    /// Extremely soft ground storey (type 1b).
    SoftStoreyExtreme,
    /// Weak ground storey (type 5a).
    WeakStorey,
    /// Walls present above the ground storey but missing or reduced at it.
    WallDiscontinued,
    /// Boundary elements recorded "no", or "unknown" before the year rule.
    BoundaryMissing,
    /// Boundary elements unknown and not inferable.
    BoundaryUnknown,
    /// ACI 318-19 §18.10.6.2 requires special boundary elements.
    BoundaryNeeded,
    /// Wall axial load ratio above the DCM limit.
    HighAxialWall,
    /// Column axial load ratio above the DCM limit.
    HighAxialColumn,
    /// H/lw above the slender limit.
    SlenderWall,
    /// Lv/lw below the squat limit.
    SquatWall,
    /// Short (captive) columns recorded.
    ShortColumn,
    /// Torsional sensitivity (EN 1998-1 §4.2.3.2(6)).
    Torsion,
    /// Capacity equations extrapolated.
    OutsideCalibration,
    /// Near a fault trace.
    NearFault,
    /// Height outside the period formula's range.
    PeriodRange,
    /// θum < θy.
    Brittle,
    /// Priority index below the user's threshold.
    LowPriorityIndex,
    /// Blank inputs took defaults.
    DefaultsUsed,
}

impl FlagCode {
    /// Every code, in method order.
    pub const ALL: [FlagCode; 19] = [
        FlagCode::SoftStorey,
        FlagCode::SoftStoreyExtreme,
        FlagCode::WeakStorey,
        FlagCode::WallDiscontinued,
        FlagCode::BoundaryMissing,
        FlagCode::BoundaryUnknown,
        FlagCode::BoundaryNeeded,
        FlagCode::HighAxialWall,
        FlagCode::HighAxialColumn,
        FlagCode::SlenderWall,
        FlagCode::SquatWall,
        FlagCode::ShortColumn,
        FlagCode::Torsion,
        FlagCode::OutsideCalibration,
        FlagCode::NearFault,
        FlagCode::PeriodRange,
        FlagCode::Brittle,
        FlagCode::LowPriorityIndex,
        FlagCode::DefaultsUsed,
    ];

    /// The contract's code (`interface.md`), e.g. `soft-storey`.
    pub fn as_str(self) -> &'static str {
        match self {
            FlagCode::SoftStorey => "soft-storey",
            FlagCode::SoftStoreyExtreme => "soft-storey-extreme",
            FlagCode::WeakStorey => "weak-storey",
            FlagCode::WallDiscontinued => "wall-discontinued",
            FlagCode::BoundaryMissing => "boundary-missing",
            FlagCode::BoundaryUnknown => "boundary-unknown",
            FlagCode::BoundaryNeeded => "boundary-needed",
            FlagCode::HighAxialWall => "high-axial-wall",
            FlagCode::HighAxialColumn => "high-axial-column",
            FlagCode::SlenderWall => "slender-wall",
            FlagCode::SquatWall => "squat-wall",
            FlagCode::ShortColumn => "short-column",
            FlagCode::Torsion => "torsion",
            FlagCode::OutsideCalibration => "outside-calibration",
            FlagCode::NearFault => "near-fault",
            FlagCode::PeriodRange => "period-range",
            FlagCode::Brittle => "brittle",
            FlagCode::LowPriorityIndex => "low-priority-index",
            FlagCode::DefaultsUsed => "defaults-used",
        }
    }

    /// The code of `text`, if it is one.
    pub fn parse(text: &str) -> Option<FlagCode> {
        FlagCode::ALL.into_iter().find(|c| c.as_str() == text)
    }

    /// Whether `text` starts with this code's text.
    pub fn starts_with(self, text: &str) -> bool {
        self.as_str().starts_with(text)
    }
}

impl std::fmt::Display for FlagCode {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(self.as_str())
    }
}

impl PartialEq<str> for FlagCode {
    fn eq(&self, other: &str) -> bool {
        self.as_str() == other
    }
}

impl PartialEq<&str> for FlagCode {
    fn eq(&self, other: &&str) -> bool {
        self.as_str() == *other
    }
}

/// A wall named in a flag.
#[derive(Debug, Clone, PartialEq)]
pub struct WallRef {
    /// Its id (as surveyed; "representative" / "new" for generated walls).
    pub id: String,
    /// Its direction.
    pub dir: Dir,
    /// True for the representative wall of a direction (named by direction, not id).
    pub representative: bool,
}

/// Where the storey-by-storey data of the soft/weak storey tests came from (method §10
/// precedence).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum StoreyData {
    /// The storeys sheet.
    Sheet,
    /// The buildings row's `upper_*` cells (storey 2).
    UpperColumns,
    /// Derived: storey 2 from the walls sheet (`walls_sheet`) or repeating the ground
    /// storey, with the storey heights.
    Derived {
        /// The walls sheet gave storey 2's walls.
        walls_sheet: bool,
    },
    /// One storey: no data (no check).
    None,
}

/// Numbers of a soft / extremely soft storey flag (ASCE 7-16 Table 12.3-2 types 1a/1b).
#[derive(Debug, Clone, PartialEq)]
pub struct SoftStorey {
    /// k1/k2.
    pub r2: Option<f64>,
    /// k1/mean(k2..k4).
    pub r_mean: Option<f64>,
    /// Limit on k1/k2 (`soft_ratio` or `extreme_soft_ratio`).
    pub limit: f64,
    /// Limit on k1/mean (`soft_ratio_mean` or `extreme_soft_ratio_mean`).
    pub limit_mean: f64,
    /// Weight w_m of the infill area in the stiffness proxy (`infill_weight`).
    pub infill_weight: f64,
    /// Where the storey data came from.
    pub data: StoreyData,
    /// New wall area in the direction (m²; 0 without retrofit walls).
    pub added_m2: f64,
}

/// Numbers of a weak-storey flag (ASCE 7-16 Table 12.3-2 type 5a).
#[derive(Debug, Clone, PartialEq)]
pub struct WeakStorey {
    /// S1/S2.
    pub ratio: Option<f64>,
    /// Limit (`weak_ratio`).
    pub limit: f64,
    /// Where the storey data came from.
    pub data: StoreyData,
}

/// Numbers of a wall-discontinued flag.
#[derive(Debug, Clone, PartialEq)]
pub struct WallDiscontinued {
    /// Ids of walls starting above the ground storey.
    pub above: Vec<String>,
    /// RC wall area at storey 2 and at the ground storey (m²), when storey 2 has more.
    pub upper_m2: Option<(f64, f64)>,
}

/// Numbers of a boundary-missing or boundary-unknown flag.
#[derive(Debug, Clone, PartialEq)]
pub struct BoundaryRecord {
    /// The walls concerned.
    pub walls: Vec<WallRef>,
    /// Year built.
    pub year: Option<i32>,
    /// `boundary_elements_from_year`.
    pub from_year: Option<i32>,
}

/// One wall that needs special boundary elements (ACI 318-19 §18.10.6.2).
#[derive(Debug, Clone, PartialEq)]
pub struct BoundaryHit {
    /// The wall.
    pub wall: WallRef,
    /// hw/lw.
    pub aspect: f64,
    /// Neutral-axis depth c (m).
    pub c_m: f64,
    /// Limit lw/(600·1.5·δu/hw) (m).
    pub c_limit_m: f64,
}

/// Numbers of a boundary-needed flag.
#[derive(Debug, Clone, PartialEq)]
pub struct BoundaryNeeded {
    /// Roof drift demand δu/hw.
    pub drift: f64,
    /// The walls.
    pub walls: Vec<BoundaryHit>,
}

/// A value above (or below) a limit.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Exceeds {
    /// The value.
    pub value: f64,
    /// The limit (from the settings).
    pub limit: f64,
}

/// Walls with a ratio beyond a limit (slender: H/lw; squat: Lv/lw).
#[derive(Debug, Clone, PartialEq)]
pub struct WallRatios {
    /// The limit (from the settings).
    pub limit: f64,
    /// Each wall with its ratio.
    pub walls: Vec<(WallRef, f64)>,
}

/// Numbers of a torsion flag in one direction (EN 1998-1 §4.2.3.2(6)): direction X is
/// checked with the y coordinates and r_y, direction Y with x and r_x.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Torsion {
    /// Stiffness centre coordinate (m).
    pub stiffness_centre_m: f64,
    /// Mass centre coordinate (m).
    pub mass_centre_m: f64,
    /// Torsional radius (m).
    pub radius_m: f64,
    /// Ratio of the eccentricity limit to the radius (`torsion_eccentricity_ratio`).
    pub ratio: f64,
    /// Radius of gyration of the floor l_s (m).
    pub ls_m: f64,
}

/// The calibration ranges of the capacity equations (from the settings).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CalibrationRange {
    /// `calibration_axial_max`.
    pub axial_max: f64,
    /// `calibration_steel_min_pct`.
    pub steel_min_pct: f64,
    /// `calibration_steel_max_pct`.
    pub steel_max_pct: f64,
    /// `calibration_shear_span_min`.
    pub shear_span_min: f64,
    /// `calibration_shear_span_max`.
    pub shear_span_max: f64,
}

/// Why one wall is outside the calibration range (each `Some` is outside).
#[derive(Debug, Clone, PartialEq)]
pub struct CalibrationWall {
    /// The wall.
    pub wall: WallRef,
    /// ν, when above the range.
    pub nu: Option<f64>,
    /// Boundary steel (%), when outside the range.
    pub steel_pct: Option<f64>,
    /// Lv/h, when outside the range.
    pub shear_span: Option<f64>,
}

/// Numbers of a near-fault flag.
#[derive(Debug, Clone, PartialEq)]
pub struct NearFault {
    /// Name of the trace.
    pub name: String,
    /// Distance (m).
    pub distance_m: f64,
    /// Its magnitude, when given.
    pub mw: Option<f64>,
    /// The near-fault distance that applied (km).
    pub limit_km: f64,
    /// Factor applied to the spectrum.
    pub factor: f64,
}

/// One wall that fails before it yields.
#[derive(Debug, Clone, PartialEq)]
pub struct BrittleWall {
    /// The wall.
    pub wall: WallRef,
    /// θum.
    pub theta_um: f64,
    /// θy.
    pub theta_y: f64,
}

/// The value a blank input defaulted to (method §0), typed.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum DefaultValue {
    /// A length (m).
    Metres(f64),
    /// A strength (MPa).
    MPa(f64),
    /// A pressure (kPa).
    KPa(f64),
    /// A use.
    Use(Use),
    /// A ground type.
    Ground(GroundType),
    /// Boundary elements: present by the year rule (true) or treated as absent.
    Boundary(bool),
    /// A blank RC wall area: 0 m², no RC walls in that direction.
    NoRcWalls,
    /// A key with no value to show.
    None,
}

/// The numbers behind one flag: one variant per check of method §10.
#[derive(Debug, Clone, PartialEq)]
pub enum FlagDetail {
    /// `soft-storey`.
    SoftStorey(SoftStorey),
    /// `soft-storey-extreme`.
    SoftStoreyExtreme(SoftStorey),
    /// `weak-storey`.
    WeakStorey(WeakStorey),
    /// `wall-discontinued`.
    WallDiscontinued(WallDiscontinued),
    /// `boundary-missing`.
    BoundaryMissing(BoundaryRecord),
    /// `boundary-unknown`.
    BoundaryUnknown(BoundaryRecord),
    /// `boundary-needed`.
    BoundaryNeeded(BoundaryNeeded),
    /// `high-axial-wall`: ν against `high_axial_wall`.
    HighAxialWall(Exceeds),
    /// `high-axial-column`: ν against `high_axial_column`.
    HighAxialColumn(Exceeds),
    /// `slender-wall`: H/lw.
    SlenderWall(WallRatios),
    /// `squat-wall`: Lv/lw.
    SquatWall(WallRatios),
    /// `short-column`.
    ShortColumn,
    /// `torsion`.
    Torsion(Torsion),
    /// `outside-calibration` of walls.
    CalibrationWalls(CalibrationRange, Vec<CalibrationWall>),
    /// `outside-calibration` of the columns: ν (when above the range) and Lv/h (when
    /// outside it).
    CalibrationColumns(CalibrationRange, Option<f64>, Option<f64>),
    /// `near-fault`.
    NearFault(NearFault),
    /// `period-range`: H against `period_height_limit_m`.
    PeriodRange(Exceeds),
    /// `brittle` walls.
    BrittleWalls(Vec<BrittleWall>),
    /// `brittle` columns: (θum, θy).
    BrittleColumns(f64, f64),
    /// `low-priority-index`: PI against `pi_threshold_pct`.
    LowPriorityIndex(Exceeds),
    /// `defaults-used`: each defaulted key with its value.
    DefaultsUsed(Vec<(String, DefaultValue)>),
    /// The code alone, its numbers not kept: the compact rows of the large-stock path
    /// (`crate::stream`), whose flag details are already in the Flags file. Worded as "".
    CodeOnly(FlagCode),
}

impl FlagDetail {
    /// The flag code of these numbers.
    pub fn code(&self) -> FlagCode {
        match self {
            FlagDetail::SoftStorey(_) => FlagCode::SoftStorey,
            FlagDetail::SoftStoreyExtreme(_) => FlagCode::SoftStoreyExtreme,
            FlagDetail::WeakStorey(_) => FlagCode::WeakStorey,
            FlagDetail::WallDiscontinued(_) => FlagCode::WallDiscontinued,
            FlagDetail::BoundaryMissing(_) => FlagCode::BoundaryMissing,
            FlagDetail::BoundaryUnknown(_) => FlagCode::BoundaryUnknown,
            FlagDetail::BoundaryNeeded(_) => FlagCode::BoundaryNeeded,
            FlagDetail::HighAxialWall(_) => FlagCode::HighAxialWall,
            FlagDetail::HighAxialColumn(_) => FlagCode::HighAxialColumn,
            FlagDetail::SlenderWall(_) => FlagCode::SlenderWall,
            FlagDetail::SquatWall(_) => FlagCode::SquatWall,
            FlagDetail::ShortColumn => FlagCode::ShortColumn,
            FlagDetail::Torsion(_) => FlagCode::Torsion,
            FlagDetail::CalibrationWalls(..) | FlagDetail::CalibrationColumns(..) => {
                FlagCode::OutsideCalibration
            }
            FlagDetail::NearFault(_) => FlagCode::NearFault,
            FlagDetail::PeriodRange(_) => FlagCode::PeriodRange,
            FlagDetail::BrittleWalls(_) | FlagDetail::BrittleColumns(..) => FlagCode::Brittle,
            FlagDetail::LowPriorityIndex(_) => FlagCode::LowPriorityIndex,
            FlagDetail::DefaultsUsed(_) => FlagCode::DefaultsUsed,
            FlagDetail::CodeOnly(c) => *c,
        }
    }
}

/// One flag raised on a building: its code, its direction (or none) and the numbers that
/// triggered it. Serialised (by `report::flag_text`) as `{code, direction, detail}` with
/// the detail worded.
#[derive(Debug, Clone, PartialEq)]
pub struct Flag {
    /// Code (always `detail.code()`).
    pub code: FlagCode,
    /// Direction, or `None` for building-wide flags.
    pub direction: Option<Dir>,
    /// The numbers that triggered it.
    pub detail: FlagDetail,
}

impl Flag {
    /// A flag with these numbers.
    pub fn new(direction: Option<Dir>, detail: FlagDetail) -> Self {
        Flag {
            code: detail.code(),
            direction,
            detail,
        }
    }
}
