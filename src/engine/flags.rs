/*!
Method §10: the flags. Each test is a small function (soft / weak storey, boundary-element
displacement check, thresholds); [`raise`] applies them to one screened building and returns
one typed flag (`results::Flag`) per code and direction with the numbers that triggered it
(walls named by id) and the limits in force. The engine writes no wording: the report layer
does (`report::flag_text`).
*/

use crate::model::{Dir, PerDir, YesNo};
use crate::results::{
    BoundaryHit, BoundaryNeeded, BoundaryRecord, BrittleWall, CalibrationRange, CalibrationWall,
    DefaultValue, DirectionResult, Exceeds, Flag, FlagCode, FlagDetail, NearFault, SoftStorey,
    StoreyData, Torsion, WallDiscontinued, WallRatios, WallRef, WallResult, WeakStorey,
};
use crate::settings::Settings;

use super::BuildingInput;
use super::capacity::MemberCapacity;
use super::resolve::{Resolved, StoreyAreas, StoreySource, WallSpec};
use super::strength::storey_strength;
use super::torsion;

/// Lateral stiffness proxy of storey i in d: k = (A_cw + w_m·A_mw + A_col/2)/h_i (m²/m;
/// method §10 [screening]).
pub fn stiffness_proxy(s: &StoreyAreas, d: Dir, added_m2: f64, infill_weight: f64) -> f64 {
    let a =
        *s.rc_wall_m2.get(d) + added_m2 + infill_weight * *s.infill_m2.get(d) + s.column_m2 / 2.0;
    if s.height_m > 0.0 {
        a / s.height_m
    } else {
        0.0
    }
}

/// Soft-storey outcome.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Soft {
    /// Regular.
    None,
    /// ASCE 7-16 Table 12.3-2 type 1a.
    Soft,
    /// ASCE 7-16 Table 12.3-2 type 1b.
    Extreme,
}

/// ASCE 7-16 Table 12.3-2 types 1a/1b on the stiffness proxies k (ground first):
/// soft when k1 < 0.70·k2 or (with ≥ 4 storeys known) k1 < 0.80·mean(k2, k3, k4);
/// extreme with 0.60 / 0.70. Returns the outcome and the ratios (k1/k2, k1/mean).
pub fn soft_storey(k: &[f64], s: &Settings) -> (Soft, Option<f64>, Option<f64>) {
    let (Some(&k1), Some(&k2)) = (k.first(), k.get(1)) else {
        return (Soft::None, None, None);
    };
    let r2 = (k2 > 0.0).then(|| k1 / k2);
    let r3 = if k.len() >= 4 {
        let mean = (k[1] + k[2] + k[3]) / 3.0;
        (mean > 0.0).then(|| k1 / mean)
    } else {
        None
    };
    let below = |r: Option<f64>, lim: f64| r.is_some_and(|r| r < lim);
    let out = if below(r2, s.extreme_soft_ratio) || below(r3, s.extreme_soft_ratio_mean) {
        Soft::Extreme
    } else if below(r2, s.soft_ratio) || below(r3, s.soft_ratio_mean) {
        Soft::Soft
    } else {
        Soft::None
    };
    (out, r2, r3)
}

/// Weak storey, ASCE 7-16 Table 12.3-2 type 5a: ground-storey strength below 80 % of the
/// storey above. Returns (flag, ratio S1/S2).
pub fn weak_storey(s1: f64, s2: f64, s: &Settings) -> (bool, Option<f64>) {
    if s2 > 0.0 {
        let r = s1 / s2;
        (r < s.weak_ratio, Some(r))
    } else {
        (false, None)
    }
}

/// ACI 318-19 §22.2.2.4.3 β1: 0.85 for fc ≤ 28 MPa, minus 0.05 per 7 MPa above, not less
/// than 0.65.
pub fn beta1(fc_mpa: f64) -> f64 {
    (0.85 - 0.05 * (fc_mpa - 28.0) / 7.0).clamp(0.65, 0.85)
}

/// ACI 318-19 §22.2.2.4.1 equivalent stress block intensity 0.85·fc'.
pub const STRESS_BLOCK: f64 = 0.85;
/// ACI 318-19 §18.10.6.2(a): c ≥ lw / (600·(1.5·δu/hw)).
pub const ACI_600: f64 = 600.0;
/// ACI 318-19 §18.10.6.2(a) amplification 1.5 of δu/hw.
pub const ACI_DRIFT_AMP: f64 = 1.5;

/// Neutral-axis depth estimate c = lw·(ν + ω_v)/(0.85·β1 + 2·ω_v) (m), ω_v = ρ_v·fy/fc
/// (method §10, from memory: equilibrium with uniformly distributed web steel).
pub fn neutral_axis_m(lw: f64, nu: f64, rho_v: f64, fy: f64, fc: f64) -> f64 {
    let wv = if fc > 0.0 { rho_v * fy / fc } else { 0.0 };
    lw * (nu + wv) / (STRESS_BLOCK * beta1(fc) + 2.0 * wv)
}

/// ACI 318-19 §18.10.6.2(a) limit c_lim = lw / (600·1.5·max(δu/hw, 0.005)) (m).
pub fn boundary_c_limit_m(lw: f64, drift: f64, s: &Settings) -> f64 {
    lw / (ACI_600 * ACI_DRIFT_AMP * drift.max(s.boundary_drift_floor))
}

/// ACI 318-19 §18.10.6.2: special boundary elements required when hw/lw ≥ 2 and c ≥ c_lim.
pub fn boundary_required(hw: f64, lw: f64, c: f64, c_lim: f64, s: &Settings) -> bool {
    lw > 0.0 && hw / lw >= s.boundary_aspect_min && c >= c_lim
}

/// Soft / weak storey state of one direction.
#[derive(Debug, Clone)]
pub struct StoreyState {
    /// Soft-storey outcome.
    pub soft: Soft,
    /// k1/k2.
    pub r2: Option<f64>,
    /// k1/mean(k2..k4).
    pub r_mean: Option<f64>,
    /// Weak storey.
    pub weak: bool,
    /// S1/S2.
    pub weak_ratio: Option<f64>,
    /// Which storey data the checks used (method §10 precedence).
    pub source: StoreySource,
}

impl StoreyState {
    /// Any soft, extreme-soft or weak storey.
    pub fn any(&self) -> bool {
        self.soft != Soft::None || self.weak
    }
}

/// The storey data a soft/weak storey flag used (method §10 precedence), for its wording.
pub fn storey_data(source: StoreySource) -> StoreyData {
    match source {
        StoreySource::Sheet => StoreyData::Sheet,
        StoreySource::Upper => StoreyData::UpperColumns,
        StoreySource::Derived { walls_sheet } => StoreyData::Derived { walls_sheet },
        StoreySource::None => StoreyData::None,
    }
}

/// Soft/weak storey state of direction d with `added` m² of new walls at every storey, on
/// the storey data of [`super::resolve::storey_data`] (no check with one storey).
pub fn storey_state(
    res: &Resolved,
    d: Dir,
    beta: f64,
    beta_new: f64,
    added: f64,
    s: &Settings,
) -> StoreyState {
    if res.storeys.len() < 2 {
        return StoreyState {
            soft: Soft::None,
            r2: None,
            r_mean: None,
            weak: false,
            weak_ratio: None,
            source: res.storey_source,
        };
    }
    let k: Vec<f64> = res
        .storeys
        .iter()
        .map(|st| stiffness_proxy(st, d, added, s.infill_weight))
        .collect();
    let (soft, r2, r_mean) = soft_storey(&k, s);
    let strength = |st: &StoreyAreas| {
        storey_strength(
            beta,
            beta_new,
            *st.rc_wall_m2.get(d),
            added,
            *st.infill_m2.get(d),
            st.column_m2,
            s,
        )
    };
    let s1 = strength(&res.storeys[0]);
    let s2 = strength(&res.storeys[1]);
    let (weak, weak_ratio) = weak_storey(s1, s2, s);
    StoreyState {
        soft,
        r2,
        r_mean,
        weak,
        weak_ratio,
        source: res.storey_source,
    }
}

/// The value a defaulted input took (method §0, for the defaults-used flag; worded by the
/// report layer).
pub fn default_value(key: &str, res: &Resolved, s: &Settings) -> DefaultValue {
    match key {
        "use" => DefaultValue::Use(res.use_),
        "storey_height_m" => DefaultValue::Metres(s.default_storey_height_m),
        "ground_storey_height_m" => {
            DefaultValue::Metres(res.heights_m.first().copied().unwrap_or(0.0))
        }
        "column_depth_m" => DefaultValue::Metres(res.column_depth_m),
        "wall_length_x_m" | "wall_length_y_m" => DefaultValue::Metres(s.default_wall_length_m),
        "wall_thickness_m" => DefaultValue::Metres(s.default_wall_thickness_m),
        "boundary_elements" => DefaultValue::Boundary(res.boundary_elements),
        "fc_mpa" => DefaultValue::MPa(res.fc_mpa),
        "fy_mpa" => DefaultValue::MPa(res.fy_mpa),
        "floor_weight_kpa" => DefaultValue::KPa(res.floor_weight_kpa),
        "ground_type" => DefaultValue::Ground(s.default_ground_type),
        "rc_wall_area_x_m2" | "rc_wall_area_y_m2" => DefaultValue::NoRcWalls,
        _ => DefaultValue::None,
    }
}

fn wall_ref(w: &WallSpec) -> WallRef {
    WallRef {
        id: w.id.clone(),
        dir: w.dir,
        representative: w.representative,
    }
}

/// Everything the flags of method §10 read from one screened building.
#[derive(Debug, Clone, Copy)]
pub struct Context<'a> {
    /// Resolved inputs.
    pub res: &'a Resolved,
    /// The building's rows.
    pub input: &'a BuildingInput<'a>,
    /// Settings.
    pub s: &'a Settings,
    /// Per-direction results.
    pub directions: &'a PerDir<DirectionResult>,
    /// Soft/weak storey state per direction (with any new walls).
    pub states: &'a PerDir<Option<StoreyState>>,
    /// Axial load ratio of the existing members.
    pub nu: f64,
    /// Wall shear span (m).
    pub lv_wall: f64,
    /// Column shear span (m).
    pub lv_col: f64,
    /// Column capacity, when columns exist.
    pub column_cap: Option<MemberCapacity>,
    /// Per-wall results.
    pub walls: &'a [WallResult],
    /// Factor applied to the spectrum (near-fault).
    pub spectrum_factor: f64,
}

/// The soft/weak ground-storey codes that [`raise`] raises for these states, each once, in
/// its order (the soft codes of X then Y, then weak): what retrofit sizing reports as
/// `flags_after` without raising every flag.
pub fn storey_codes(states: &PerDir<Option<StoreyState>>) -> Vec<FlagCode> {
    let soft = Dir::BOTH.into_iter().filter_map(|d| match states.get(d) {
        Some(st) if st.soft == Soft::Extreme => Some(FlagCode::SoftStoreyExtreme),
        Some(st) if st.soft == Soft::Soft => Some(FlagCode::SoftStorey),
        _ => None,
    });
    let weak = Dir::BOTH.into_iter().filter_map(|d| match states.get(d) {
        Some(st) if st.weak => Some(FlagCode::WeakStorey),
        _ => None,
    });
    let mut codes: Vec<FlagCode> = Vec::new();
    for c in soft.chain(weak) {
        if !codes.contains(&c) {
            codes.push(c);
        }
    }
    codes
}

/// Raises the flags of method §10 for one building, in method order, one per code and
/// direction (two for `outside-calibration` and `brittle`: walls per direction, columns),
/// each with the numbers that triggered it and the limits it was compared against. No text:
/// the report layer words them (`report::flag_text`).
pub fn raise(c: &Context<'_>) -> Vec<Flag> {
    let Context {
        res,
        input,
        s,
        directions,
        states: states_after,
        nu,
        lv_wall,
        lv_col,
        column_cap,
        walls: wall_results,
        spectrum_factor,
    } = *c;
    let r = input.record;
    let has_columns = res.column_area_m2 > 0.0;
    let mut fl: Vec<Flag> = Vec::new();
    let push = |fl: &mut Vec<Flag>, d: Option<Dir>, detail: FlagDetail| {
        fl.push(Flag::new(d, detail));
    };
    let data = storey_data(res.storey_source);
    for d in Dir::BOTH {
        let Some(st) = states_after.get(d) else {
            continue;
        };
        let added_m2 = directions.get(d).detail.added_wall_area_m2;
        let soft = |limit: f64, limit_mean: f64| SoftStorey {
            r2: st.r2,
            r_mean: st.r_mean,
            limit,
            limit_mean,
            infill_weight: s.infill_weight,
            data,
            added_m2,
        };
        match st.soft {
            Soft::Extreme => push(
                &mut fl,
                Some(d),
                FlagDetail::SoftStoreyExtreme(soft(
                    s.extreme_soft_ratio,
                    s.extreme_soft_ratio_mean,
                )),
            ),
            Soft::Soft => push(
                &mut fl,
                Some(d),
                FlagDetail::SoftStorey(soft(s.soft_ratio, s.soft_ratio_mean)),
            ),
            Soft::None => {}
        }
    }
    for d in Dir::BOTH {
        let Some(st) = states_after.get(d) else {
            continue;
        };
        if st.weak {
            push(
                &mut fl,
                Some(d),
                FlagDetail::WeakStorey(WeakStorey {
                    ratio: st.weak_ratio,
                    limit: s.weak_ratio,
                    data,
                }),
            );
        }
    }
    for d in Dir::BOTH {
        let above = res.walls_above_ground.get(d);
        let ground = *res.rc_wall_area_m2.get(d);
        let upper = res.storeys.get(1).map(|st| *st.rc_wall_m2.get(d));
        let upper_m2 = upper
            .filter(|&u| u > ground * (1.0 + 1e-9) + 1e-12)
            .map(|u| (u, ground));
        if !above.is_empty() || upper_m2.is_some() {
            push(
                &mut fl,
                Some(d),
                FlagDetail::WallDiscontinued(WallDiscontinued {
                    above: above.clone(),
                    upper_m2,
                }),
            );
        }
    }
    let year = r.year_built;
    let from = s.boundary_elements_from_year;
    for d in Dir::BOTH {
        let missing: Vec<WallRef> = res
            .walls_in(d)
            .filter(|w| match w.boundary_recorded {
                Some(YesNo::No) => true,
                Some(YesNo::Unknown) | None => matches!((year, from), (Some(y), Some(f)) if y < f),
                Some(YesNo::Yes) => false,
            })
            .map(wall_ref)
            .collect();
        if !missing.is_empty() {
            push(
                &mut fl,
                Some(d),
                FlagDetail::BoundaryMissing(BoundaryRecord {
                    walls: missing,
                    year,
                    from_year: from,
                }),
            );
        }
        let unknown: Vec<WallRef> = res
            .walls_in(d)
            .filter(|w| {
                matches!(w.boundary_recorded, Some(YesNo::Unknown) | None)
                    && (year.is_none() || from.is_none())
            })
            .map(wall_ref)
            .collect();
        if !unknown.is_empty() {
            push(
                &mut fl,
                Some(d),
                FlagDetail::BoundaryUnknown(BoundaryRecord {
                    walls: unknown,
                    year,
                    from_year: from,
                }),
            );
        }
    }
    for d in Dir::BOTH {
        let drift = directions.get(d).roof_drift_demand;
        let mut hits: Vec<BoundaryHit> = Vec::new();
        for w in res.walls_in(d).filter(|w| !w.boundary) {
            let c = neutral_axis_m(w.lw, w.nu, w.web_steel_pct / 100.0, w.fy_mpa, w.fc_mpa);
            let c_lim = boundary_c_limit_m(w.lw, drift, s);
            if boundary_required(res.height_m, w.lw, c, c_lim, s) {
                hits.push(BoundaryHit {
                    wall: wall_ref(w),
                    aspect: res.height_m / w.lw,
                    c_m: c,
                    c_limit_m: c_lim,
                });
            }
        }
        if !hits.is_empty() {
            push(
                &mut fl,
                Some(d),
                FlagDetail::BoundaryNeeded(BoundaryNeeded { drift, walls: hits }),
            );
        }
    }
    if !res.walls.is_empty() && nu > s.high_axial_wall {
        push(
            &mut fl,
            None,
            FlagDetail::HighAxialWall(Exceeds {
                value: nu,
                limit: s.high_axial_wall,
            }),
        );
    }
    if has_columns && nu > s.high_axial_column {
        push(
            &mut fl,
            None,
            FlagDetail::HighAxialColumn(Exceeds {
                value: nu,
                limit: s.high_axial_column,
            }),
        );
    }
    for d in Dir::BOTH {
        let walls: Vec<(WallRef, f64)> = res
            .walls_in(d)
            .filter(|w| w.lw > 0.0 && res.height_m / w.lw > s.slender_wall_ratio)
            .map(|w| (wall_ref(w), res.height_m / w.lw))
            .collect();
        if !walls.is_empty() {
            push(
                &mut fl,
                Some(d),
                FlagDetail::SlenderWall(WallRatios {
                    limit: s.slender_wall_ratio,
                    walls,
                }),
            );
        }
    }
    for d in Dir::BOTH {
        let walls: Vec<(WallRef, f64)> = res
            .walls_in(d)
            .filter(|w| w.lw > 0.0 && lv_wall / w.lw < s.squat_wall_ratio)
            .map(|w| (wall_ref(w), lv_wall / w.lw))
            .collect();
        if !walls.is_empty() {
            push(
                &mut fl,
                Some(d),
                FlagDetail::SquatWall(WallRatios {
                    limit: s.squat_wall_ratio,
                    walls,
                }),
            );
        }
    }
    if r.short_columns == Some(YesNo::Yes) {
        push(&mut fl, None, FlagDetail::ShortColumn);
    }
    // Torsion.
    let plan_walls: Vec<torsion::PlanWall> = res
        .walls
        .iter()
        .filter_map(|w| {
            w.position.map(|(x, y)| torsion::PlanWall {
                dir: w.dir,
                lw: w.lw,
                tw: w.tw,
                x,
                y,
            })
        })
        .collect();
    if !plan_walls.is_empty() {
        let pts: Vec<(f64, f64)> = if input.footprint.len() >= 3 {
            input.footprint.iter().map(|v| (v.x_m, v.y_m)).collect()
        } else if let (Some(lx), Some(ly)) = (r.plan_length_x_m, r.plan_length_y_m) {
            vec![
                (-lx / 2.0, -ly / 2.0),
                (lx / 2.0, -ly / 2.0),
                (lx / 2.0, ly / 2.0),
                (-lx / 2.0, ly / 2.0),
            ]
        } else {
            Vec::new()
        };
        if let Some(fp) = torsion::footprint(&pts) {
            let tc = torsion::check(&plan_walls, &fp, s.torsion_eccentricity_ratio);
            if tc.fails_x
                && let (Some(ys), Some(ry)) = (tc.ys, tc.ry)
            {
                push(
                    &mut fl,
                    Some(Dir::X),
                    FlagDetail::Torsion(Torsion {
                        stiffness_centre_m: ys,
                        mass_centre_m: tc.ym,
                        radius_m: ry,
                        ratio: s.torsion_eccentricity_ratio,
                        ls_m: tc.ls,
                    }),
                );
            }
            if tc.fails_y
                && let (Some(xs), Some(rx)) = (tc.xs, tc.rx)
            {
                push(
                    &mut fl,
                    Some(Dir::Y),
                    FlagDetail::Torsion(Torsion {
                        stiffness_centre_m: xs,
                        mass_centre_m: tc.xm,
                        radius_m: rx,
                        ratio: s.torsion_eccentricity_ratio,
                        ls_m: tc.ls,
                    }),
                );
            }
        }
    }
    // Outside calibration.
    let range = CalibrationRange {
        axial_max: s.calibration_axial_max,
        steel_min_pct: s.calibration_steel_min_pct,
        steel_max_pct: s.calibration_steel_max_pct,
        shear_span_min: s.calibration_shear_span_min,
        shear_span_max: s.calibration_shear_span_max,
    };
    let span_outside =
        |lvh: f64| lvh < s.calibration_shear_span_min || lvh > s.calibration_shear_span_max;
    for d in Dir::BOTH {
        let mut hits: Vec<CalibrationWall> = Vec::new();
        for w in res.walls_in(d) {
            let lvh = if w.lw > 0.0 { lv_wall / w.lw } else { 0.0 };
            let nu_cap = super::capacity::capacity_axial_ratio(w.nu, w.existing, s);
            let hit = CalibrationWall {
                wall: wall_ref(w),
                nu: (nu_cap > s.calibration_axial_max).then_some(nu_cap),
                steel_pct: (w.boundary_steel_pct < s.calibration_steel_min_pct
                    || w.boundary_steel_pct > s.calibration_steel_max_pct)
                    .then_some(w.boundary_steel_pct),
                shear_span: span_outside(lvh).then_some(lvh),
            };
            if hit.nu.is_some() || hit.steel_pct.is_some() || hit.shear_span.is_some() {
                hits.push(hit);
            }
        }
        if !hits.is_empty() {
            push(&mut fl, Some(d), FlagDetail::CalibrationWalls(range, hits));
        }
    }
    if has_columns {
        let lvh = if res.column_depth_m > 0.0 {
            lv_col / res.column_depth_m
        } else {
            0.0
        };
        let nu_cap = super::capacity::capacity_axial_ratio(nu, true, s);
        let nu_out = (nu_cap > s.calibration_axial_max).then_some(nu_cap);
        let span_out = span_outside(lvh).then_some(lvh);
        if nu_out.is_some() || span_out.is_some() {
            push(
                &mut fl,
                None,
                FlagDetail::CalibrationColumns(range, nu_out, span_out),
            );
        }
    }
    if let Some(nf) = input.site.and_then(|x| x.near_fault.as_ref()) {
        push(
            &mut fl,
            None,
            FlagDetail::NearFault(NearFault {
                name: nf.name.clone(),
                distance_m: nf.distance_m,
                mw: nf.mw,
                limit_km: nf.limit_km,
                factor: spectrum_factor,
            }),
        );
    }
    if res.height_m > s.period_height_limit_m {
        push(
            &mut fl,
            None,
            FlagDetail::PeriodRange(Exceeds {
                value: res.height_m,
                limit: s.period_height_limit_m,
            }),
        );
    }
    for d in Dir::BOTH {
        // The retrofit walls (`new`) are designed walls, not surveyed ones: not checked.
        let hits: Vec<BrittleWall> = wall_results
            .iter()
            .filter(|w| w.direction == Some(d) && !w.new && w.theta_um < w.theta_y)
            .map(|w| BrittleWall {
                wall: WallRef {
                    id: w.wall_id.clone(),
                    dir: d,
                    representative: w.representative,
                },
                theta_um: w.theta_um,
                theta_y: w.theta_y,
            })
            .collect();
        if !hits.is_empty() {
            push(&mut fl, Some(d), FlagDetail::BrittleWalls(hits));
        }
    }
    if let Some(c) = column_cap
        && c.theta_um < c.theta_y
    {
        push(
            &mut fl,
            None,
            FlagDetail::BrittleColumns(c.theta_um, c.theta_y),
        );
    }
    if let Some(th) = s.pi_threshold_pct {
        for d in Dir::BOTH {
            let pi = directions.get(d).priority_index_pct;
            if pi < th {
                push(
                    &mut fl,
                    Some(d),
                    FlagDetail::LowPriorityIndex(Exceeds {
                        value: pi,
                        limit: th,
                    }),
                );
            }
        }
    }
    if !res.defaults_used.is_empty() {
        let values: Vec<(String, DefaultValue)> = res
            .defaults_used
            .iter()
            .map(|k| (k.clone(), default_value(k, res, s)))
            .collect();
        push(&mut fl, None, FlagDetail::DefaultsUsed(values));
    }

    fl
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn beta1_branches() {
        assert!((beta1(20.0) - 0.85).abs() < 1e-12);
        assert!((beta1(35.0) - 0.80).abs() < 1e-12);
        assert!((beta1(60.0) - 0.65).abs() < 1e-12);
    }
}
