/*!
The screening engine: `method.md` §0–§11 as pure functions on typed values (§12 is
`crate::retrofit`, §13 the uncertainty stage). No text is composed here: flags come out as
typed numbers (`results::Flag`) and the report layer words them (`report::flag_text`).

Where each clause of `method.md` lives (file → function; one step from a formula to its code):

| Clause | What | File → function |
|---|---|---|
| §0 | quantities per building: heights, areas, fc/fy (eras, defaults), hazard, detailing rules, walls (listed or representative), storey data | `resolve.rs` → [`resolve::resolve`], [`resolve::boundary_present`], [`resolve::columns_detailed`], [`resolve::storey_data`]; the value a default took: [`flags::default_value`] |
| §1 | column, wall and priority indices CI, WI_d, PI_d, WIrc_d | `indices.rs` → [`indices::column_index_pct`], [`indices::wall_index_pct`], [`indices::priority_index_pct`], [`indices::rc_wall_index_pct`] |
| §2 | axial load ratio ν | `resolve.rs` → [`resolve::axial_load_ratio`]; capacity ν: [`capacity::capacity_axial_ratio`] |
| §3 | strength coefficient C_y (β, τ, α1, C_m + max(C_rc + α1·C_c, C_c)); storey strength proxy | `strength.rs` → [`strength::beta`], [`strength::strength_coefficient`], [`strength::storey_strength`] |
| §4 | period (eq. 4.6/4.7, Ac, period factor, input period) | `period.rs` → [`period::period_frame_s`], [`period::period_wall_s`], [`period::formula_period_s`]; frame alone: [`building::frame_period_s`] |
| §5 | elastic spectrum (EN 1998-1 Types 1/2, η; ASCE 7 two-parameter) | `spectrum.rs` → [`spectrum::se_ec8_g`], [`spectrum::sa_two_parameter_g`], [`spectrum::eta`]; per building: [`building::demand_spectrum`] |
| §6 | N2: Γ, S_ay, q_u, d_t*, roof drift | `n2.rs` → [`n2::participation_factor`], [`n2::yield_acceleration_g`], [`n2::target_displacement_m`], [`n2::roof_drift`]; chained: [`building::demand_chain`] |
| §7 | drift demand per group, κ (graded, soft/weak, retrofit) | `demand.rs` → [`demand::kappa`], [`demand::kappa_retrofit`], [`demand::wall_drift`], [`demand::column_drift`] |
| §8 | chord-rotation capacity (EN 1998-3 A.1, θy; ASCE 41 tables) | `capacity.rs` → [`capacity::wall_capacity`], [`capacity::column_capacity`], [`capacity::levels`]; `asce41.rs` → [`asce41::wall_levels`] |
| §9 | DCRs, frame-alone bound, governing group and direction | `dcr.rs` → [`dcr::group_dcr`], [`dcr::direction_dcr`], [`dcr::apply_frame_alone`], [`dcr::governing_direction`] |
| §10 | flags (soft/weak storey, boundary elements, ν, slender/squat, torsion, calibration, near fault, period range, brittle, defaults) | `flags.rs` → [`flags::raise`], [`flags::storey_state`], [`flags::soft_storey`], [`flags::weak_storey`]; `torsion.rs` → [`torsion::check`]; wording: `report/flag_text.rs` |
| §11 | classes and the priority order | `rank.rs` → [`rank::class`], [`rank::class_name`], [`rank::priority_order`], [`rank::rank`] |
| §12 | retrofit sizing, cost, budget plan | `retrofit/sizing.rs` → `size_building`, `bisect`; `retrofit/cost.rs` → `apply`, `funding_cost`; `retrofit/budget.rs` → `plans`; `retrofit/mod.rs` → `size_all`, `budget_plan` |
| §13 | uncertainty and rank robustness (`--samples N`) | `uncertainty/mod.rs` → `run`, `factors`, `material_betas`, `survey_value`; `uncertainty/sample.rs` → `Evaluator` (re-runs §2–§11 per sample from `building::prepare`/`direction`); `uncertainty/draws.rs`, `quantiles.rs` |

One building end to end: [`building::prepare`] (§0, §2, §5 spectrum, §8 column capacity)
then [`building::direction`] per direction (§1, §3–§9) then [`building::screen`] (§9
governing, §10, §11 class); [`screen_all`] screens a stock in parallel and ranks it.
*/

use std::collections::HashMap;

use crate::model::{
    BuildingRecord, FootprintVertex, Inventory, NotScreened, PerDir, SiteInfo, StoreyRecord,
    WallRecord,
};
use rayon::iter::Either;
use rayon::prelude::*;

use crate::results::BuildingResult;
use crate::settings::Settings;

pub mod asce41;
pub mod building;
pub mod capacity;
pub mod dcr;
pub mod demand;
pub mod flags;
pub mod indices;
pub mod n2;
pub mod period;
pub mod rank;
pub mod resolve;
pub mod spectrum;
pub mod strength;
pub mod torsion;

/// Everything the engine needs about one building.
#[derive(Debug, Clone)]
pub struct BuildingInput<'a> {
    /// The buildings-sheet row.
    pub record: &'a BuildingRecord,
    /// Its rows of the walls sheet.
    pub walls: Vec<&'a WallRecord>,
    /// Its rows of the storeys sheet.
    pub storeys: Vec<&'a StoreyRecord>,
    /// Its footprint vertices, in vertex order.
    pub footprint: Vec<&'a FootprintVertex>,
    /// District and fault information, when geography was given.
    pub site: Option<&'a SiteInfo>,
}

/// Retrofit walls added to a building (method §12): new RC wall area per direction (m²).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct NewWalls {
    /// Added ground-storey wall area per direction (m²).
    pub area_m2: PerDir<f64>,
}

/// Screens one building; `Err` holds the reasons it cannot be screened.
pub fn screen_building(
    input: &BuildingInput<'_>,
    settings: &Settings,
) -> Result<BuildingResult, Vec<String>> {
    building::screen(input, settings, &NewWalls::default())
}

/// Screens one building with retrofit walls added (method §12): the new walls form their
/// own element group (new_wall_* settings, ν_new, boundary elements and seismic detailing,
/// no confidence factor), add β(fc_new)·τ_w·ΔA_d to the strength (α1 = 0.7), shorten the
/// period by the ratio of the formula periods with and without them, and enter κ by the
/// `min_new_wall_index_pct` rule. The soft/weak storey flags of the result are re-evaluated
/// with the new walls.
pub fn screen_building_with(
    input: &BuildingInput<'_>,
    settings: &Settings,
    new: &NewWalls,
) -> Result<BuildingResult, Vec<String>> {
    building::screen(input, settings, new)
}

/// Groups an inventory's rows per building, in file order.
pub fn building_inputs<'a>(
    inv: &'a Inventory,
    sites: &'a HashMap<String, SiteInfo>,
) -> Vec<BuildingInput<'a>> {
    let mut walls: HashMap<&str, Vec<&WallRecord>> = HashMap::new();
    for w in &inv.walls {
        walls.entry(w.building_id.as_str()).or_default().push(w);
    }
    let mut storeys: HashMap<&str, Vec<&StoreyRecord>> = HashMap::new();
    for s in &inv.storeys {
        storeys.entry(s.building_id.as_str()).or_default().push(s);
    }
    let mut fp: HashMap<&str, Vec<&FootprintVertex>> = HashMap::new();
    for v in &inv.footprints {
        fp.entry(v.building_id.as_str()).or_default().push(v);
    }
    inv.buildings
        .iter()
        .map(|b| {
            let mut footprint = fp.remove(b.id.as_str()).unwrap_or_default();
            footprint.sort_by(|a, c| a.vertex.total_cmp(&c.vertex));
            let mut st = storeys.remove(b.id.as_str()).unwrap_or_default();
            st.sort_by_key(|s| s.storey);
            BuildingInput {
                record: b,
                walls: walls.remove(b.id.as_str()).unwrap_or_default(),
                storeys: st,
                footprint,
                site: sites.get(&b.id),
            }
        })
        .collect()
}

/// Result of screening a whole inventory.
#[derive(Debug, Clone, Default)]
pub struct Screening {
    /// Screened buildings, ranked (method §11).
    pub buildings: Vec<BuildingResult>,
    /// Buildings the engine could not screen (e.g. no hazard given), in file order.
    pub not_screened: Vec<NotScreened>,
}

/// Screens every building in parallel (rayon) and ranks them (method §11). The result does
/// not depend on row order or thread count: each building is screened independently and the
/// order is the total order of [`rank::priority_order`].
pub fn screen_all(inputs: &[BuildingInput<'_>], settings: &Settings) -> Screening {
    // Split straight into results and not-screened rows (order kept), so that a large stock
    // never holds two vectors of results at once.
    let (buildings, not_screened): (Vec<BuildingResult>, Vec<NotScreened>) = inputs
        .par_iter()
        .map(|i| (i, screen_building(i, settings)))
        .partition_map(|(i, r)| match r {
            Ok(r) => Either::Left(r),
            Err(reasons) => Either::Right(NotScreened {
                sheet: "buildings".into(),
                row: i.record.row,
                id: i.record.id.clone(),
                reasons,
            }),
        });
    let mut out = Screening {
        buildings,
        not_screened,
    };
    rank::rank(&mut out.buildings);
    out.not_screened.sort_by_key(|n| n.row);
    out
}
