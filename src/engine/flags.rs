/*!
Method §10: the flags. Each test is a small function (soft / weak storey, boundary-element
displacement check, thresholds); [`raise`] applies them to one screened building and writes
one flag per code and direction with its reason and triggering numbers (wall ids named).
*/

use crate::model::{Dir, PerDir, YesNo};
use crate::results::{DirectionResult, Flag, WallResult};
use crate::settings::Settings;

use super::BuildingInput;
use super::building::default_value_text;
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

/// Flag code of a soft ground storey (ASCE 7-16 Table 12.3-2 type 1a).
pub const SOFT_STOREY: &str = "soft-storey";
/// Flag code of an extremely soft ground storey (ASCE 7-16 Table 12.3-2 type 1b).
pub const SOFT_STOREY_EXTREME: &str = "soft-storey-extreme";
/// Flag code of a weak ground storey (ASCE 7-16 Table 12.3-2 type 5a).
pub const WEAK_STOREY: &str = "weak-storey";

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

/// Plain words for the storey data a soft/weak storey flag used (method §10).
pub fn storey_data_text(source: StoreySource) -> &'static str {
    match source {
        StoreySource::Sheet => "data from the storeys sheet",
        StoreySource::Upper => "data from the upper_* cells (storey 2)",
        StoreySource::Derived { walls_sheet: true } => {
            "data from the walls sheet and storey heights"
        }
        StoreySource::Derived { walls_sheet: false } => {
            "data from the storey heights (storey 2 repeats the ground storey)"
        }
        StoreySource::None => "one storey: no data",
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

fn fmt_ids(ids: &[String]) -> String {
    ids.join(", ")
}

fn wall_name(w: &WallSpec) -> String {
    if w.representative {
        format!("the representative {} wall", w.dir.code().to_uppercase())
    } else {
        format!("wall {}", w.id)
    }
}

fn names(ws: &[&WallSpec]) -> String {
    fmt_ids(&ws.iter().map(|w| wall_name(w)).collect::<Vec<_>>())
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
pub fn storey_codes(states: &PerDir<Option<StoreyState>>) -> Vec<String> {
    let soft = Dir::BOTH.into_iter().filter_map(|d| match states.get(d) {
        Some(st) if st.soft == Soft::Extreme => Some(SOFT_STOREY_EXTREME),
        Some(st) if st.soft == Soft::Soft => Some(SOFT_STOREY),
        _ => None,
    });
    let weak = Dir::BOTH.into_iter().filter_map(|d| match states.get(d) {
        Some(st) if st.weak => Some(WEAK_STOREY),
        _ => None,
    });
    let mut codes: Vec<String> = Vec::new();
    for c in soft.chain(weak) {
        if !codes.iter().any(|k| k == c) {
            codes.push(c.to_string());
        }
    }
    codes
}

/// Raises the flags of method §10 for one building, in method order, one per code and
/// direction, each with a plain-words reason and the numbers that triggered it.
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
    let push = |fl: &mut Vec<Flag>, code: &str, d: Option<Dir>, detail: String| {
        fl.push(Flag {
            code: code.into(),
            direction: d,
            detail,
        });
    };
    let src_text = storey_data_text(res.storey_source);
    for d in Dir::BOTH {
        let Some(st) = states_after.get(d) else {
            continue;
        };
        let added = directions.get(d).detail.added_wall_area_m2;
        let with = if added > 0.0 {
            format!(", with {added:.3} m² of new walls")
        } else {
            String::new()
        };
        let ratios = {
            let mut t = String::new();
            if let Some(r2) = st.r2 {
                t.push_str(&format!("k1/k2 = {r2:.3}"));
            }
            if let Some(rm) = st.r_mean {
                t.push_str(&format!(", k1/mean(k2..k4) = {rm:.3}"));
            }
            t
        };
        match st.soft {
            Soft::Extreme => push(
                &mut fl,
                SOFT_STOREY_EXTREME,
                Some(d),
                format!(
                    "ground-storey stiffness proxy (A_cw + A_mw/10 + A_col/2)/h: {ratios} (limits {} / {}, ASCE 7-16 Table 12.3-2 type 1b; {src_text}{with})",
                    s.extreme_soft_ratio, s.extreme_soft_ratio_mean
                ),
            ),
            Soft::Soft => push(
                &mut fl,
                SOFT_STOREY,
                Some(d),
                format!(
                    "ground-storey stiffness proxy (A_cw + A_mw/10 + A_col/2)/h: {ratios} (limits {} / {}, ASCE 7-16 Table 12.3-2 type 1a; {src_text}{with})",
                    s.soft_ratio, s.soft_ratio_mean
                ),
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
                WEAK_STOREY,
                Some(d),
                format!(
                    "ground-storey strength is {:.1} % of the storey above (limit {:.0} %, ASCE 7-16 Table 12.3-2 type 5a; {src_text})",
                    st.weak_ratio.unwrap_or(0.0) * 100.0,
                    s.weak_ratio * 100.0
                ),
            );
        }
    }
    for d in Dir::BOTH {
        let above = res.walls_above_ground.get(d);
        let ground = *res.rc_wall_area_m2.get(d);
        let upper = res.storeys.get(1).map(|st| *st.rc_wall_m2.get(d));
        let mut why: Vec<String> = Vec::new();
        if !above.is_empty() {
            why.push(format!(
                "walls starting above the ground storey: {}",
                fmt_ids(above)
            ));
        }
        if let Some(u) = upper
            && u > ground * (1.0 + 1e-9) + 1e-12
        {
            why.push(format!(
                "RC wall area at storey 2 ({u:.3} m²) exceeds the ground storey's ({ground:.3} m²)"
            ));
        }
        if !why.is_empty() {
            push(&mut fl, "wall-discontinued", Some(d), why.join("; "));
        }
    }
    let year = r.year_built;
    let from = s.boundary_elements_from_year;
    for d in Dir::BOTH {
        let ws: Vec<&WallSpec> = res.walls_in(d).collect();
        let missing: Vec<&WallSpec> = ws
            .iter()
            .copied()
            .filter(|w| match w.boundary_recorded {
                Some(YesNo::No) => true,
                Some(YesNo::Unknown) | None => matches!((year, from), (Some(y), Some(f)) if y < f),
                Some(YesNo::Yes) => false,
            })
            .collect();
        if !missing.is_empty() {
            push(
                &mut fl,
                "boundary-missing",
                Some(d),
                format!(
                    "no boundary elements in {} (recorded \"no\", or \"unknown\" with year built {} before boundary_elements_from_year {})",
                    names(&missing),
                    year.map_or("-".into(), |y| y.to_string()),
                    from.map_or("-".into(), |y| y.to_string())
                ),
            );
        }
        let unknown: Vec<&WallSpec> = ws
            .iter()
            .copied()
            .filter(|w| {
                matches!(w.boundary_recorded, Some(YesNo::Unknown) | None)
                    && (year.is_none() || from.is_none())
            })
            .collect();
        if !unknown.is_empty() {
            push(
                &mut fl,
                "boundary-unknown",
                Some(d),
                format!(
                    "boundary elements of {} are unknown and cannot be inferred (year built {}, boundary_elements_from_year {}); treated as absent",
                    names(&unknown),
                    year.map_or("unknown".into(), |y| y.to_string()),
                    from.map_or("not set".into(), |y| y.to_string())
                ),
            );
        }
    }
    for d in Dir::BOTH {
        let drift = directions.get(d).roof_drift_demand;
        let mut hits: Vec<String> = Vec::new();
        for w in res.walls_in(d).filter(|w| !w.boundary) {
            let c = neutral_axis_m(w.lw, w.nu, w.web_steel_pct / 100.0, w.fy_mpa, w.fc_mpa);
            let c_lim = boundary_c_limit_m(w.lw, drift, s);
            if boundary_required(res.height_m, w.lw, c, c_lim, s) {
                hits.push(format!(
                    "{} (hw/lw = {:.2}, c = {:.3} m ≥ lw/(600·1.5·δu/hw) = {:.3} m)",
                    wall_name(w),
                    res.height_m / w.lw,
                    c,
                    c_lim
                ));
            }
        }
        if !hits.is_empty() {
            push(
                &mut fl,
                "boundary-needed",
                Some(d),
                format!(
                    "ACI 318-19 §18.10.6.2 requires special boundary elements at roof drift {:.4}: {}",
                    drift,
                    hits.join("; ")
                ),
            );
        }
    }
    if !res.walls.is_empty() && nu > s.high_axial_wall {
        push(
            &mut fl,
            "high-axial-wall",
            None,
            format!(
                "axial load ratio ν = {nu:.3} > {} (EN 1998-1 §5.4.3.4.1, DCM walls)",
                s.high_axial_wall
            ),
        );
    }
    if has_columns && nu > s.high_axial_column {
        push(
            &mut fl,
            "high-axial-column",
            None,
            format!(
                "axial load ratio ν = {nu:.3} > {} (EN 1998-1 §5.4.3.2.1, DCM columns)",
                s.high_axial_column
            ),
        );
    }
    for d in Dir::BOTH {
        let hits: Vec<String> = res
            .walls_in(d)
            .filter(|w| w.lw > 0.0 && res.height_m / w.lw > s.slender_wall_ratio)
            .map(|w| format!("{} (H/lw = {:.1})", wall_name(w), res.height_m / w.lw))
            .collect();
        if !hits.is_empty() {
            push(
                &mut fl,
                "slender-wall",
                Some(d),
                format!(
                    "H/lw above {}: {}; little test evidence for such walls",
                    s.slender_wall_ratio,
                    hits.join(", ")
                ),
            );
        }
    }
    for d in Dir::BOTH {
        let hits: Vec<String> = res
            .walls_in(d)
            .filter(|w| w.lw > 0.0 && lv_wall / w.lw < s.squat_wall_ratio)
            .map(|w| format!("{} (Lv/lw = {:.2})", wall_name(w), lv_wall / w.lw))
            .collect();
        if !hits.is_empty() {
            push(
                &mut fl,
                "squat-wall",
                Some(d),
                format!(
                    "Lv/lw below {}: {}; shear controls and the flexural rotation capacity is not reliable",
                    s.squat_wall_ratio,
                    hits.join(", ")
                ),
            );
        }
    }
    if r.short_columns == Some(YesNo::Yes) {
        push(
            &mut fl,
            "short-column",
            None,
            "short (captive) columns recorded by the surveyor: shear failure before the drift capacities are reached; class 2 at least".into(),
        );
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
                    "torsion",
                    Some(Dir::X),
                    format!(
                        "e0y = |y_s − y_m| = |{ys:.2} − {:.2}| = {:.2} m vs 0.30·r_y = {:.2} m; r_y = {ry:.2} m vs l_s = {:.2} m (EN 1998-1 §4.2.3.2(6), eqs. 4.1a/4.1b)",
                        tc.ym,
                        (ys - tc.ym).abs(),
                        s.torsion_eccentricity_ratio * ry,
                        tc.ls
                    ),
                );
            }
            if tc.fails_y
                && let (Some(xs), Some(rx)) = (tc.xs, tc.rx)
            {
                push(
                    &mut fl,
                    "torsion",
                    Some(Dir::Y),
                    format!(
                        "e0x = |x_s − x_m| = |{xs:.2} − {:.2}| = {:.2} m vs 0.30·r_x = {:.2} m; r_x = {rx:.2} m vs l_s = {:.2} m (EN 1998-1 §4.2.3.2(6), eqs. 4.1a/4.1b)",
                        tc.xm,
                        (xs - tc.xm).abs(),
                        s.torsion_eccentricity_ratio * rx,
                        tc.ls
                    ),
                );
            }
        }
    }
    // Outside calibration.
    for d in Dir::BOTH {
        let mut hits: Vec<String> = Vec::new();
        for w in res.walls_in(d) {
            let mut why: Vec<String> = Vec::new();
            let nu_cap = super::capacity::capacity_axial_ratio(w.nu, w.existing, s);
            if nu_cap > s.calibration_axial_max {
                why.push(format!("ν = {nu_cap:.3}"));
            }
            if w.boundary_steel_pct < s.calibration_steel_min_pct
                || w.boundary_steel_pct > s.calibration_steel_max_pct
            {
                why.push(format!("boundary steel {} %", w.boundary_steel_pct));
            }
            let lvh = if w.lw > 0.0 { lv_wall / w.lw } else { 0.0 };
            if lvh < s.calibration_shear_span_min || lvh > s.calibration_shear_span_max {
                why.push(format!("Lv/h = {lvh:.2}"));
            }
            if !why.is_empty() {
                hits.push(format!("{} ({})", wall_name(w), why.join(", ")));
            }
        }
        if !hits.is_empty() {
            push(
                &mut fl,
                "outside-calibration",
                Some(d),
                format!(
                    "capacity equations extrapolated (calibrated for ν ≤ {}, boundary steel {}–{} %, Lv/h {}–{}): {}",
                    s.calibration_axial_max,
                    s.calibration_steel_min_pct,
                    s.calibration_steel_max_pct,
                    s.calibration_shear_span_min,
                    s.calibration_shear_span_max,
                    hits.join("; ")
                ),
            );
        }
    }
    if has_columns {
        let lvh = if res.column_depth_m > 0.0 {
            lv_col / res.column_depth_m
        } else {
            0.0
        };
        let mut why: Vec<String> = Vec::new();
        let nu_cap = super::capacity::capacity_axial_ratio(nu, true, s);
        if nu_cap > s.calibration_axial_max {
            why.push(format!("ν = {nu_cap:.3} > {}", s.calibration_axial_max));
        }
        if lvh < s.calibration_shear_span_min || lvh > s.calibration_shear_span_max {
            why.push(format!(
                "Lv/h = {lvh:.2} outside {}–{}",
                s.calibration_shear_span_min, s.calibration_shear_span_max
            ));
        }
        if !why.is_empty() {
            push(
                &mut fl,
                "outside-calibration",
                None,
                format!("column capacity equations extrapolated: {}", why.join(", ")),
            );
        }
    }
    if let Some(nf) = input.site.and_then(|x| x.near_fault.as_ref()) {
        push(
            &mut fl,
            "near-fault",
            None,
            format!(
                "fault trace \"{}\" at {:.2} km ({}) is within the {} km near-fault distance (ASCE 7-16 §11.4.1); spectrum × {}",
                nf.name,
                nf.distance_m / 1000.0,
                nf.mw
                    .map_or("no magnitude given".to_string(), |m| format!("Mw {m}")),
                nf.limit_km,
                spectrum_factor
            ),
        );
    }
    if res.height_m > s.period_height_limit_m {
        push(
            &mut fl,
            "period-range",
            None,
            format!(
                "height H = {:.1} m above {} m: the EN 1998-1 §4.3.3.2.2 period formula is outside its range",
                res.height_m, s.period_height_limit_m
            ),
        );
    }
    for d in Dir::BOTH {
        let hits: Vec<String> = wall_results
            .iter()
            .filter(|w| w.direction == Some(d) && w.wall_id != "new" && w.theta_um < w.theta_y)
            .map(|w| {
                let name = if w.representative {
                    format!("the representative {} wall", d.code().to_uppercase())
                } else {
                    format!("wall {}", w.wall_id)
                };
                format!("{name} (θum = {:.5} < θy = {:.5})", w.theta_um, w.theta_y)
            })
            .collect();
        if !hits.is_empty() {
            push(
                &mut fl,
                "brittle",
                Some(d),
                format!("fails before it yields: {}", hits.join(", ")),
            );
        }
    }
    if let Some(c) = column_cap
        && c.theta_um < c.theta_y
    {
        push(
            &mut fl,
            "brittle",
            None,
            format!(
                "columns fail before they yield (θum = {:.5} < θy = {:.5})",
                c.theta_um, c.theta_y
            ),
        );
    }
    if let Some(th) = s.pi_threshold_pct {
        for d in Dir::BOTH {
            let pi = directions.get(d).priority_index_pct;
            if pi < th {
                push(
                    &mut fl,
                    "low-priority-index",
                    Some(d),
                    format!("priority index PI = {pi:.3} % below the threshold {th} %"),
                );
            }
        }
    }
    if !res.defaults_used.is_empty() {
        let parts: Vec<String> = res
            .defaults_used
            .iter()
            .map(|k| format!("{k} = {}", default_value_text(k, res, s)))
            .collect();
        push(
            &mut fl,
            "defaults-used",
            None,
            format!("blank inputs took defaults: {}", parts.join(", ")),
        );
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
