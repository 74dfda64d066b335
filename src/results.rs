/*!
What the engine returns for each building: the typed results behind the JSON of
`interface.md` (serialised field names are the contract), plus the intermediate numbers
(`#[serde(skip)]`) that the Directions and Walls sheets and `explain` show.
*/

use serde::Serialize;

use crate::model::{Dir, FaultDistance, NotScreened, PerDir, Problem, Use};
use crate::settings::{GroundType, Level, Settings};

mod flag;
pub use flag::*;

/// A value at the three performance levels.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize)]
pub struct Levels {
    /// Immediate Occupancy.
    pub io: f64,
    /// Life Safety.
    pub ls: f64,
    /// Collapse Prevention.
    pub cp: f64,
}

impl Levels {
    /// The value at one level.
    pub fn at(&self, l: Level) -> f64 {
        match l {
            Level::Io => self.io,
            Level::Ls => self.ls,
            Level::Cp => self.cp,
        }
    }
}

/// Element group of a direction.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Group {
    /// RC walls (existing; new retrofit walls are reported with the walls).
    Walls,
    /// Columns.
    Columns,
}

/// Per element group values: `None` where the group is absent.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize)]
pub struct Groups<T> {
    /// RC walls of the direction.
    pub walls: Option<T>,
    /// Columns.
    pub columns: Option<T>,
}

/// The results of one direction (JSON `directions.x` / `directions.y`).
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
pub struct DirectionResult {
    /// Wall index WI_d (%), Hassan & Sozen.
    pub wall_index_pct: f64,
    /// Column index CI (%).
    pub column_index_pct: f64,
    /// Priority index PI_d = WI_d + CI (%).
    pub priority_index_pct: f64,
    /// Fundamental period used (s).
    pub period_s: f64,
    /// Roof drift ratio demand.
    pub roof_drift_demand: f64,
    /// Drift demand on each element group.
    pub drift_demand: Groups<f64>,
    /// Chord-rotation capacity of each group (walls: per-level minimum over the walls).
    pub capacity: Groups<Levels>,
    /// Demand/capacity ratios (the frame-alone bound of method §9 applied at LS and CP).
    pub dcr: Levels,
    /// The frame-alone bound of method §9; `None` where it does not apply (no columns, or
    /// no RC walls in the direction).
    pub frame_alone: Option<FrameAlone>,
    /// DCR of each element group before the frame-alone bound (walls: per-level minimum
    /// capacity, new walls included); `None` where the group is absent.
    #[serde(skip)]
    pub group_dcr: Groups<Levels>,
    /// Every intermediate number of the method for this direction.
    #[serde(skip)]
    pub detail: DirectionDetail,
}

/// A value at the two levels the frame-alone bound applies to.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize)]
pub struct LsCp<T> {
    /// Life Safety.
    pub ls: T,
    /// Collapse Prevention.
    pub cp: T,
}

/// The frame-alone bound of one direction (method §9; JSON `directions.d.frame_alone`):
/// §3–§7 run with the direction's RC walls removed (existing and new), κ_frame or κ_soft
/// from the as-surveyed soft/weak storey flags, the building's own column capacities.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize)]
pub struct FrameAlone {
    /// Period of the frame alone (s).
    pub period_s: f64,
    /// Roof drift demand of the frame alone.
    pub roof_drift_demand: f64,
    /// Column drift demand κ·δ_r,frame.
    pub drift_demand_columns: f64,
    /// DCR_frame at LS and CP.
    pub dcr: LsCp<f64>,
    /// C_y of the frame alone = C_m + C_c.
    #[serde(skip)]
    pub strength_coefficient: f64,
    /// Se(T) of the frame alone (g).
    #[serde(skip)]
    pub se_g: f64,
    /// κ used (κ_frame or κ_soft).
    #[serde(skip)]
    pub kappa: f64,
    /// Whether the bound governs (is strictly lower than the DCR with the walls).
    #[serde(skip)]
    pub governs: LsCp<bool>,
}

/// Intermediate numbers of one direction, in method order (for the Directions sheet and
/// `explain`).
#[derive(Debug, Clone, PartialEq, Default)]
pub struct DirectionDetail {
    /// Ground-storey RC wall area A_cw,d (m²), existing walls.
    pub rc_wall_area_m2: f64,
    /// Ground-storey infill area A_mw,d (m²).
    pub infill_area_m2: f64,
    /// RC wall index WIrc,d = A_cw,d / A_fl (%).
    pub rc_wall_index_pct: f64,
    /// Wall part of the strength coefficient C_w,d = C_rc,d + C_m,d (RC walls, new walls
    /// included, and infill).
    pub strength_walls: f64,
    /// Infill part C_m,d (included in `strength_walls`).
    pub strength_infill: f64,
    /// True when the wall-governed combination C_rc + α1·C_c gives C_y (method §3).
    pub wall_governed: bool,
    /// Column part C_c (before alpha1).
    pub strength_columns: f64,
    /// Column factor of the combination that gives C_y: α1 (wall-governed) or 1 (column-governed).
    pub alpha1: f64,
    /// C_y,d.
    pub strength_coefficient: f64,
    /// EN 1998-1 eq. (4.6) period (s).
    pub period_frame_s: f64,
    /// EN 1998-1 eq. (4.7) period (s), when Ac > 0.
    pub period_wall_s: Option<f64>,
    /// Ac of eq. (4.8) (m²).
    pub ac_m2: f64,
    /// Where the period came from: "formula" or "input".
    pub period_source: &'static str,
    /// Elastic spectral acceleration Se(T) (g).
    pub se_g: f64,
    /// Elastic spectral displacement SDe(T) = det* (m).
    pub sde_m: f64,
    /// Modal participation factor Γ.
    pub gamma: f64,
    /// Yield spectral acceleration S_ay (g).
    pub say_g: f64,
    /// Strength ratio qu.
    pub qu: f64,
    /// N2 branch used: "equal-displacement" or "short-period".
    pub n2_branch: &'static str,
    /// SDOF target displacement dt* (m).
    pub dt_star_m: f64,
    /// Roof displacement d_t (m).
    pub roof_displacement_m: f64,
    /// Storey-drift concentration factor κ.
    pub kappa: f64,
    /// Corner period TC (or Ts for the two-parameter spectrum) (s).
    pub tc_s: f64,
    /// Retrofit wall area added in this direction ΔA_d (m²; 0 without retrofit).
    pub added_wall_area_m2: f64,
    /// Formula period before `period_factor` and any input period (s), existing walls.
    pub period_formula_s: f64,
    /// Soft, extreme-soft or weak storey flag in this direction (drives κ).
    pub soft_or_weak: bool,
}

/// The shape of a building's elastic spectrum and its parameters (method §5).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub enum SpectrumShape {
    /// EN 1998-1 §3.2.2.2, Type 1 (Table 3.2) or Type 2 (Table 3.3).
    Ec8 {
        /// Type 2 (else Type 1).
        type2: bool,
        /// Ground type.
        ground: GroundType,
        /// Soil factor S.
        s: f64,
        /// TB (s).
        tb_s: f64,
        /// TC (s).
        tc_s: f64,
        /// TD (s).
        td_s: f64,
    },
    /// ASCE 7-16 §11.4.6 two-parameter spectrum.
    TwoParameter {
        /// SDS (g).
        sds_g: f64,
        /// SD1 (g).
        sd1_g: f64,
        /// Ts = SD1/SDS (s).
        ts_s: f64,
        /// TL (s), when given.
        tl_s: Option<f64>,
    },
    /// Not screened (placeholder results).
    #[default]
    None,
}

/// Building-wide intermediate numbers (for `explain` and the Directions sheet).
#[derive(Debug, Clone, PartialEq, Default)]
pub struct BuildingDetail {
    /// Storeys n.
    pub storeys: u32,
    /// Floor heights z_i (m).
    pub floor_heights_m: Vec<f64>,
    /// Total height H (m).
    pub height_m: f64,
    /// Total floor area A_fl (m²).
    pub floor_area_m2: f64,
    /// Typical storey plan area A_plan (m²).
    pub plan_area_m2: f64,
    /// Seismic weight W (kN).
    pub weight_kn: f64,
    /// Concrete strength used (MPa).
    pub fc_mpa: f64,
    /// Steel strength used (MPa).
    pub fy_mpa: f64,
    /// Ground-storey column area (m²).
    pub column_area_m2: f64,
    /// β strength factor.
    pub beta: f64,
    /// agR used (g) and where it came from ("row", "district", "settings").
    pub agr_g: f64,
    /// Source of agR.
    pub agr_source: &'static str,
    /// Ground type used.
    pub ground_type: String,
    /// Importance factor γI.
    pub gamma_i: f64,
    /// Design ground acceleration ag = γI·agR (g).
    pub ag_g: f64,
    /// Spectrum shape and parameters (worded by the report layer).
    pub spectrum: SpectrumShape,
    /// Damping correction η.
    pub eta: f64,
    /// Boundary elements present by the rule of method §0.
    pub boundary_elements: bool,
    /// Columns seismically detailed by the rule of method §0.
    pub columns_detailed: bool,
    /// Wall shear span Lv (m).
    pub wall_shear_span_m: f64,
    /// Column shear span Lv = h1/2 (m).
    pub column_shear_span_m: f64,
    /// Column yield rotation θy (None without columns).
    pub column_theta_y: Option<f64>,
    /// Column ultimate rotation θum after factors (None without columns).
    pub column_theta_um: Option<f64>,
    /// Factor applied to the spectrum (near-fault demand factor, else 1).
    pub spectrum_factor: f64,
    /// Governing DCR at each level (maximum over directions).
    pub dcr_max: Levels,
}

/// Capacity of one wall (Walls sheet).
#[derive(Debug, Clone, PartialEq, Default)]
pub struct WallResult {
    /// Wall id ("representative" for the representative wall, "new" for retrofit walls).
    pub wall_id: String,
    /// Direction.
    pub direction: Option<Dir>,
    /// True for the representative wall of a direction.
    pub representative: bool,
    /// Number of walls this row stands for (representative walls: A_cw/(lw·tw)).
    pub count: f64,
    /// Length lw (m).
    pub length_m: f64,
    /// Thickness tw (m).
    pub thickness_m: f64,
    /// Boundary elements present (effective).
    pub boundary_elements: bool,
    /// Axial load ratio ν.
    pub axial_load_ratio: f64,
    /// Shear span Lv (m).
    pub shear_span_m: f64,
    /// Yield chord rotation θy.
    pub theta_y: f64,
    /// Ultimate chord rotation θum (after factors).
    pub theta_um: f64,
    /// Capacity used at each level (after the capacity model).
    pub capacity: Levels,
    /// True for the generated wall standing for the retrofit walls (method §12).
    pub new: bool,
}

/// Which direction, group and level governs the score.
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct Governing {
    /// Direction.
    pub direction: Dir,
    /// Element group.
    pub group: Group,
    /// Ranking level.
    pub level: Level,
    /// True when the frame-alone bound of method §9 gives the score.
    pub frame_alone: bool,
}

/// Retrofit sizing of one building (method §12).
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
pub struct Retrofit {
    /// Added wall area per direction (m²): 0 = not needed, `None` = no solution within the cap.
    pub added_wall_area_m2: PerDir<Option<f64>>,
    /// Retrofit cost, when unit costs are set and a solution exists.
    pub cost: Option<f64>,
    /// Replacement cost, when unit costs are set.
    pub replacement_cost: Option<f64>,
    /// Replacement recommended (None when costs are not set).
    pub replace: Option<bool>,
    /// Soft/weak storey codes that remain with the new walls.
    pub flags_after: Vec<FlagCode>,
    /// Short-column flag: the captive columns need their own remedy (method §12).
    pub column_remedy: bool,
    /// Funded by the priority walk (None without a budget plan).
    pub funded: Option<bool>,
    /// Funded by the max-occupants plan (None without a budget plan).
    #[serde(skip)]
    pub funded_best: Option<bool>,
    /// Why the building is left out of both budget plans (`budget_plan.excluded`), when a
    /// plan was made and it has no amount to fund.
    #[serde(skip)]
    pub excluded: Option<String>,
    /// Plain-words note ("no wall solution within the cap — detailed study or replacement").
    #[serde(skip)]
    pub note: String,
}

/// Screening result of one building (JSON `buildings[]`).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BuildingResult {
    /// Id.
    pub id: String,
    /// Name.
    pub name: String,
    /// District (given or assigned), "" when none.
    pub district: String,
    /// Use.
    #[serde(rename = "use")]
    pub use_: Use,
    /// Occupants.
    pub occupants: Option<u64>,
    /// Latitude.
    pub latitude: Option<f64>,
    /// Longitude.
    pub longitude: Option<f64>,
    /// Nearest fault trace.
    pub fault: Option<FaultDistance>,
    /// Rank (1 = highest priority).
    pub rank: usize,
    /// Class 1–4.
    pub class: u8,
    /// Score: governing DCR at the ranking level.
    pub score: f64,
    /// What governs.
    pub governing: Governing,
    /// Axial load ratio ν.
    pub axial_load_ratio: f64,
    /// Base-shear strength coefficient per direction.
    pub strength_coefficient: PerDir<f64>,
    /// Per-direction results.
    pub directions: PerDir<DirectionResult>,
    /// Flags.
    pub flags: Vec<Flag>,
    /// Canonical names of optional inputs that took a default.
    pub defaults_used: Vec<String>,
    /// Retrofit sizing (None when none is needed).
    pub retrofit: Option<Retrofit>,
    /// Uncertainty and rank robustness (method §13); None when no samples were drawn.
    pub uncertainty: Option<BuildingUncertainty>,
    /// Spreadsheet row of the building.
    #[serde(skip)]
    pub row: usize,
    /// Building-wide intermediate numbers.
    #[serde(skip)]
    pub detail: BuildingDetail,
    /// Per-wall capacities.
    #[serde(skip)]
    pub walls: Vec<WallResult>,
}

impl BuildingResult {
    /// The smaller priority index of the two directions (%).
    pub fn min_priority_index_pct(&self) -> f64 {
        self.directions
            .x
            .priority_index_pct
            .min(self.directions.y.priority_index_pct)
    }
    /// The distinct flag codes (one per code, building order).
    pub fn flag_codes(&self) -> Vec<&'static str> {
        let mut codes: Vec<&'static str> = Vec::new();
        for f in &self.flags {
            if !codes.contains(&f.code.as_str()) {
                codes.push(f.code.as_str());
            }
        }
        codes
    }
}

/// A funding plan (JSON `budget_plan.priority_walk` / `max_occupants`).
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
pub struct FundingPlan {
    /// Funded building ids, in rank order.
    pub funded: Vec<String>,
    /// Total cost.
    pub cost: f64,
    /// Occupants of funded buildings that were in classes 1–2.
    pub occupants_protected: u64,
    /// How the set was found (max-occupants plan only).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub method: Option<String>,
    /// Σ p_deficit·occupants over the funded buildings (method §13; only with samples).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub expected_occupants_protected: Option<f64>,
}

/// The budget plan (JSON `budget_plan`).
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct BudgetPlan {
    /// The budget.
    pub budget: f64,
    /// Walk down the priority order.
    pub priority_walk: FundingPlan,
    /// 0/1 knapsack maximising occupants protected.
    pub max_occupants: FundingPlan,
    /// Buildings with a retrofit record and no amount to fund, with the reason (in rank order).
    pub excluded: Vec<Excluded>,
}

/// A building left out of both budget plans (JSON `budget_plan.excluded[]`).
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
pub struct Excluded {
    /// Building id.
    pub id: String,
    /// Why it has no amount to fund.
    pub reason: String,
}

/// Counts per class (JSON `counts.by_class`).
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
pub struct ClassCounts {
    /// Class 1.
    #[serde(rename = "1")]
    pub c1: usize,
    /// Class 2.
    #[serde(rename = "2")]
    pub c2: usize,
    /// Class 3.
    #[serde(rename = "3")]
    pub c3: usize,
    /// Class 4.
    #[serde(rename = "4")]
    pub c4: usize,
}

/// Row counts (JSON `counts`).
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
pub struct Counts {
    /// Non-blank rows of the buildings sheet.
    pub rows: usize,
    /// Buildings screened.
    pub screened: usize,
    /// Rows not screened.
    pub not_screened: usize,
    /// Blank rows skipped.
    pub blank_rows: usize,
    /// Screened buildings per class.
    pub by_class: ClassCounts,
}

/// The input file (JSON `input`).
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
pub struct InputInfo {
    /// Path as given.
    pub file: String,
    /// SHA-256 of the file's bytes, hex.
    pub sha256: String,
}

/// A whole screening run: the JSON document of `interface.md`.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct Screening {
    /// Always "seistriage".
    pub tool: &'static str,
    /// Crate version.
    pub version: &'static str,
    /// Input file.
    pub input: InputInfo,
    /// Every effective setting.
    pub settings: Settings,
    /// Counts.
    pub counts: Counts,
    /// Screened buildings in rank order.
    pub buildings: Vec<BuildingResult>,
    /// Budget plan, when a budget and unit costs are given.
    pub budget_plan: Option<BudgetPlan>,
    /// Stock-level uncertainty outputs (method §13); None when no samples were drawn.
    pub uncertainty: Option<StockUncertainty>,
    /// Rows not screened.
    pub not_screened: Vec<NotScreened>,
    /// Every input problem.
    pub problems: Vec<Problem>,
}

impl Counts {
    /// Counts for a set of ranked results.
    pub fn tally(
        rows: usize,
        blank_rows: usize,
        not_screened: usize,
        buildings: &[BuildingResult],
    ) -> Self {
        let mut by_class = ClassCounts::default();
        for b in buildings {
            match b.class {
                1 => by_class.c1 += 1,
                2 => by_class.c2 += 1,
                3 => by_class.c3 += 1,
                _ => by_class.c4 += 1,
            }
        }
        Counts {
            rows,
            screened: buildings.len(),
            not_screened,
            blank_rows,
            by_class,
        }
    }
}

/// p05 / p50 / p95 of a sampled quantity (method §13's quantile rule).
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize)]
pub struct Quantiles<T> {
    /// 5 % quantile.
    pub p05: T,
    /// 50 % quantile.
    pub p50: T,
    /// 95 % quantile.
    pub p95: T,
}

/// Share of samples in each class (JSON `uncertainty.p_class`).
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize)]
pub struct ClassShares {
    /// Class 1.
    #[serde(rename = "1")]
    pub c1: f64,
    /// Class 2.
    #[serde(rename = "2")]
    pub c2: f64,
    /// Class 3.
    #[serde(rename = "3")]
    pub c3: f64,
    /// Class 4.
    #[serde(rename = "4")]
    pub c4: f64,
}

impl ClassShares {
    /// The share of one class (1–4).
    pub fn of(&self, class: u8) -> f64 {
        match class {
            1 => self.c1,
            2 => self.c2,
            3 => self.c3,
            _ => self.c4,
        }
    }
}

/// Method §13 outputs of one building (JSON `buildings[].uncertainty`).
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
pub struct BuildingUncertainty {
    /// Number of samples N.
    pub samples: u32,
    /// Share of samples per class.
    pub p_class: ClassShares,
    /// p_class 1 + p_class 2.
    pub p_deficit: f64,
    /// Score quantiles (governing DCR at the ranking level).
    pub score: Quantiles<f64>,
    /// Rank quantiles among the screened buildings of each sample.
    pub rank: Quantiles<u64>,
    /// Share of samples with rank ≤ k.
    pub p_top_k: f64,
    /// occupants · 2·min(p_deficit, 1 − p_deficit).
    pub survey_value: f64,
}

/// Method §13 outputs of the stock (JSON top-level `uncertainty`).
#[derive(Debug, Clone, PartialEq, Default, Serialize)]
pub struct StockUncertainty {
    /// Number of samples N.
    pub samples: u32,
    /// Seed S.
    pub seed: u64,
    /// k of p_top_k.
    pub top_k: u64,
    /// Quantiles of the number of class 1–2 buildings per sample.
    pub class_1_2_count: Quantiles<u64>,
    /// Ids of the (at most ten) buildings where a survey would most change a decision.
    pub survey_next: Vec<String>,
    /// How k was chosen (for the Confidence sheet and the terminal).
    #[serde(skip)]
    pub top_k_source: String,
}
