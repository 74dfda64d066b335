/*!
One building through method §0–§11 (and the retrofit walls of §12): resolves the inputs,
runs each direction through strength, period, spectrum, N2, drift demand, capacity and DCR,
raises the flags and sets class and score. The rank is set by [`super::screen_all`].
*/

use crate::model::{Dir, PerDir, YesNo};
use crate::results::{
    BuildingDetail, BuildingResult, DirectionDetail, DirectionResult, Flag, Governing, Groups,
    Levels, WallResult,
};
use crate::settings::{CapacityModel, Settings};

use super::resolve::{self, Hazard, Resolved, StoreyAreas, StoreySource, WallSpec};
use super::{
    BuildingInput, NewWalls, asce41, capacity, dcr, demand, flags, indices, n2, period, rank,
    spectrum, strength, torsion,
};

/// The spectrum of one building: Se(T) in g (γI, damping and near-fault factor included)
/// and its corner period TC (Ts).
#[derive(Debug, Clone)]
pub struct DemandSpectrum {
    /// Hazard.
    pub hazard: Hazard,
    /// Importance factor γI.
    pub gamma_i: f64,
    /// Damping correction η (1 for the two-parameter shape).
    pub eta: f64,
    /// Near-fault demand factor (1 when not near a fault).
    pub factor: f64,
}

impl DemandSpectrum {
    /// Design ground acceleration ag = γI·agR (g); for the two-parameter spectrum γI·SDS·0.4.
    pub fn ag_g(&self) -> f64 {
        match &self.hazard {
            Hazard::Ec8 { agr_g, .. } => self.gamma_i * agr_g,
            Hazard::TwoParameter { sds_g, .. } => self.gamma_i * sds_g * spectrum::ASCE7_SA0,
        }
    }
    /// Se(T) in g.
    pub fn se_g(&self, t: f64) -> f64 {
        let v = match &self.hazard {
            Hazard::Ec8 { type2, ground, .. } => {
                let p = spectrum::ec8_params(*ground, *type2);
                spectrum::se_ec8_g(t, self.ag_g(), &p, self.eta)
            }
            Hazard::TwoParameter {
                sds_g, sd1_g, tl_s, ..
            } => self.gamma_i * spectrum::sa_two_parameter_g(t, *sds_g, *sd1_g, *tl_s),
        };
        v * self.factor
    }
    /// Corner period TC (EN 1998-1) or Ts = SD1/SDS (ASCE 7) (s).
    pub fn tc_s(&self) -> f64 {
        match &self.hazard {
            Hazard::Ec8 { type2, ground, .. } => spectrum::ec8_params(*ground, *type2).tc,
            Hazard::TwoParameter { sds_g, sd1_g, .. } => spectrum::corner_ts(*sds_g, *sd1_g),
        }
    }
    /// Parameters as text (for explain).
    pub fn describe(&self) -> String {
        match &self.hazard {
            Hazard::Ec8 { type2, ground, .. } => {
                let p = spectrum::ec8_params(*ground, *type2);
                format!(
                    "EN 1998-1 Type {} (Table {}), ground type {}: S = {}, TB = {} s, TC = {} s, TD = {} s",
                    if *type2 { 2 } else { 1 },
                    if *type2 { "3.3" } else { "3.2" },
                    ground,
                    p.s,
                    p.tb,
                    p.tc,
                    p.td
                )
            }
            Hazard::TwoParameter {
                sds_g, sd1_g, tl_s, ..
            } => format!(
                "ASCE 7-16 §11.4.6 two-parameter: SDS = {sds_g} g, SD1 = {sd1_g} g, Ts = {} s, TL = {}",
                spectrum::corner_ts(*sds_g, *sd1_g),
                tl_s.map_or("none".to_string(), |t| format!("{t} s"))
            ),
        }
    }
}

/// The demand spectrum of a resolved building.
pub fn demand_spectrum(res: &Resolved, input: &BuildingInput<'_>, s: &Settings) -> DemandSpectrum {
    let near = input.site.and_then(|x| x.near_fault.as_ref()).is_some();
    DemandSpectrum {
        hazard: res.hazard.clone(),
        gamma_i: res.gamma_i,
        eta: match res.hazard {
            Hazard::Ec8 { .. } => spectrum::eta(s.damping_pct, s.eta_min),
            Hazard::TwoParameter { .. } => 1.0,
        },
        factor: if near {
            s.near_fault_demand_factor
        } else {
            1.0
        },
    }
}

/// The generated wall standing for the retrofit walls of one direction (method §12).
pub fn new_wall_group(d: Dir, added_m2: f64, s: &Settings) -> WallSpec {
    WallSpec {
        id: "new".into(),
        dir: d,
        lw: s.new_wall_length_m,
        tw: s.new_wall_thickness_m,
        count: added_m2 / (s.new_wall_length_m * s.new_wall_thickness_m),
        representative: true,
        new: true,
        boundary_recorded: Some(YesNo::Yes),
        boundary: true,
        boundary_steel_pct: s.boundary_steel_pct,
        web_steel_pct: s.web_steel_pct,
        db_m: s.default_bar_diameter_m,
        position: None,
        fc_mpa: s.new_wall_fc_mpa,
        fy_mpa: s.new_wall_fy_mpa,
        nu: s.new_wall_axial_ratio,
        existing: false,
    }
}

/// Strengths used for capacity: mean / CF for existing members (EN 1998-3 §3.5), as given
/// for new walls.
fn capacity_strengths(w: &WallSpec, s: &Settings) -> (f64, f64) {
    if w.existing {
        (
            w.fc_mpa / s.confidence_factor,
            w.fy_mpa / s.confidence_factor,
        )
    } else {
        (w.fc_mpa, w.fy_mpa)
    }
}

/// Capacity of one wall under the selected model (method §8).
fn wall_result(w: &WallSpec, lv: f64, se_g: f64, cy: f64, s: &Settings) -> WallResult {
    let (fc, fy) = capacity_strengths(w, s);
    let ec = capacity::wall_capacity(
        w.nu,
        fc,
        fy,
        w.lw,
        lv,
        w.boundary,
        w.boundary_steel_pct,
        w.db_m,
        s,
    );
    let asce = || {
        let area_i = (w.lw * w.tw).min(w.area_m2());
        let v_mn = asce41::wall_shear_mn(
            se_g,
            cy,
            strength::beta(w.fc_mpa, s.fc_reference_mpa),
            s.tau_wall_mpa,
            area_i,
        );
        let v = asce41::shear_stress_psi(v_mn, w.tw, w.lw, fc);
        asce41::wall_levels(ec.theta_y, w.nu, v, w.boundary)
    };
    let cap = match s.capacity_model {
        CapacityModel::Eurocode => ec.levels,
        CapacityModel::Asce41 => asce(),
        CapacityModel::LowerOfBoth => {
            let a = asce();
            Levels {
                io: a.io.min(ec.levels.io),
                ls: a.ls.min(ec.levels.ls),
                cp: a.cp.min(ec.levels.cp),
            }
        }
    };
    WallResult {
        wall_id: w.id.clone(),
        direction: Some(w.dir),
        representative: w.representative,
        count: w.count,
        length_m: w.lw,
        thickness_m: w.tw,
        boundary_elements: w.boundary,
        axial_load_ratio: w.nu,
        shear_span_m: lv,
        theta_y: ec.theta_y,
        theta_um: ec.theta_um,
        capacity: cap,
    }
}

/// Per-level minimum over walls.
fn min_levels<'a>(it: impl Iterator<Item = &'a Levels>) -> Option<Levels> {
    it.fold(None, |acc: Option<Levels>, l| {
        Some(match acc {
            None => *l,
            Some(a) => Levels {
                io: a.io.min(l.io),
                ls: a.ls.min(l.ls),
                cp: a.cp.min(l.cp),
            },
        })
    })
}

/// Strength proxy of one storey in d (the C_y numerator, α1 included; method §10 weak storey).
fn storey_strength(
    st: &StoreyAreas,
    d: Dir,
    beta: f64,
    beta_new: f64,
    added: f64,
    s: &Settings,
) -> f64 {
    let walls = beta
        * (s.tau_wall_mpa * st.rc_wall_m2.get(d)
            + strength::tau_infill_mpa(s) * st.infill_m2.get(d))
        + beta_new * s.tau_wall_mpa * added;
    let a1 = strength::alpha1(*st.rc_wall_m2.get(d) + added > 0.0, s);
    walls + a1 * beta * s.tau_column_mpa * st.column_m2
}

/// Soft / weak storey state of one direction.
#[derive(Debug, Clone)]
struct StoreyState {
    soft: flags::Soft,
    r2: Option<f64>,
    r_mean: Option<f64>,
    weak: bool,
    weak_ratio: Option<f64>,
}

impl StoreyState {
    fn any(&self) -> bool {
        self.soft != flags::Soft::None || self.weak
    }
}

fn storey_state(
    res: &Resolved,
    d: Dir,
    beta: f64,
    beta_new: f64,
    added: f64,
    s: &Settings,
) -> StoreyState {
    if res.storey_source == StoreySource::None || res.storeys.len() < 2 {
        return StoreyState {
            soft: flags::Soft::None,
            r2: None,
            r_mean: None,
            weak: false,
            weak_ratio: None,
        };
    }
    let k: Vec<f64> = res
        .storeys
        .iter()
        .map(|st| flags::stiffness_proxy(st, d, added, s.infill_weight))
        .collect();
    let (soft, r2, r_mean) = flags::soft_storey(&k, s);
    let s1 = storey_strength(&res.storeys[0], d, beta, beta_new, added, s);
    let s2 = storey_strength(&res.storeys[1], d, beta, beta_new, added, s);
    let (weak, weak_ratio) = flags::weak_storey(s1, s2, s);
    StoreyState {
        soft,
        r2,
        r_mean,
        weak,
        weak_ratio,
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

/// Screens one building with (possibly zero) retrofit walls.
pub fn screen(
    input: &BuildingInput<'_>,
    s: &Settings,
    new: &NewWalls,
) -> Result<BuildingResult, Vec<String>> {
    let res = resolve::resolve(input, s)?;
    let r = input.record;
    let nu = res.walls.first().map_or_else(
        || {
            resolve::axial_load_ratio(
                res.weight_kn,
                res.column_area_m2 + res.rc_wall_area_m2.x + res.rc_wall_area_m2.y,
                res.fc_mpa,
            )
        },
        |w| w.nu,
    );
    let beta = strength::beta(res.fc_mpa, s.fc_reference_mpa);
    let beta_new = strength::beta(s.new_wall_fc_mpa, s.fc_reference_mpa);
    let spec = demand_spectrum(&res, input, s);
    let tc = spec.tc_s();
    let phi = n2::mode_shape(&res.z_m);
    let gamma = n2::participation_factor(&phi);
    let lv_wall = capacity::wall_shear_span_m(&res.z_m);
    let h1 = res.heights_m.first().copied().unwrap_or(0.0);
    let lv_col = capacity::column_shear_span_m(h1);
    let has_columns = res.column_area_m2 > 0.0;
    let column_cap = has_columns.then(|| {
        capacity::column_capacity(
            nu,
            res.fc_mpa / s.confidence_factor,
            res.fy_mpa / s.confidence_factor,
            res.column_depth_m,
            lv_col,
            res.columns_detailed,
            s,
        )
    });
    let cc = strength::column_strength(beta, s.tau_column_mpa, res.column_area_m2, res.weight_kn);

    let mut directions: PerDir<DirectionResult> = PerDir::default();
    let mut wall_results: Vec<WallResult> = Vec::new();
    let mut states_after: PerDir<Option<StoreyState>> = PerDir::default();
    let mut strength_coefficient = PerDir { x: 0.0, y: 0.0 };
    for d in Dir::BOTH {
        let added = new.area_m2.get(d).max(0.0);
        let added = if added.is_finite() { added } else { 0.0 };
        let a_cw = *res.rc_wall_area_m2.get(d);
        let a_mw = *res.infill_area_m2.get(d);
        // §1
        let ci = indices::column_index_pct(res.column_area_m2, res.floor_area_m2);
        let wi = indices::wall_index_pct(a_cw, a_mw, s.infill_weight, res.floor_area_m2);
        let pi = indices::priority_index_pct(wi, ci);
        let wirc = indices::rc_wall_index_pct(a_cw, res.floor_area_m2);
        // §3
        let cw = strength::wall_strength(
            beta,
            s.tau_wall_mpa,
            a_cw,
            strength::tau_infill_mpa(s),
            a_mw,
            res.weight_kn,
        ) + strength::new_wall_strength(beta_new, s.tau_wall_mpa, added, res.weight_kn);
        let a1 = strength::alpha1(a_cw + added > 0.0, s);
        let cy = strength::strength_coefficient(cw, a1, cc);
        *strength_coefficient.get_mut(d) = cy;
        // §4
        let t_frame = period::period_frame_s(s.ct_period, res.height_m);
        let ac: f64 = res
            .walls_in(d)
            .map(|w| period::ac_term_m2(w.area_m2(), w.lw, res.height_m))
            .fold(0.0, |a, b| a + b);
        let t_wall = period::period_wall_s(s.ct_period, ac, res.height_m);
        let t_formula = period::formula_period_s(t_frame, t_wall);
        let (mut t, source) = match res.period_input_s.get(d) {
            Some(t_in) => (*t_in, "input"),
            None => (t_formula * s.period_factor, "formula"),
        };
        if added > 0.0 {
            let ac_new = ac + period::ac_term_m2(added, s.new_wall_length_m, res.height_m);
            let t_with = period::formula_period_s(
                t_frame,
                period::period_wall_s(s.ct_period, ac_new, res.height_m),
            );
            if t_formula > 0.0 {
                t *= t_with / t_formula;
            }
        }
        // §5
        let se = spec.se_g(t);
        let sde = spectrum::sde_m(se, t);
        // §6
        let say = n2::yield_acceleration_g(cy, res.n, gamma, &phi);
        let qu = n2::strength_ratio(se, say);
        let (dt_star, branch) = n2::target_displacement_m(sde, qu, t, tc);
        let dt = n2::roof_displacement_m(gamma, dt_star);
        let drift = n2::roof_drift(dt, res.height_m);
        // §7 (soft/weak state before and after new walls)
        let before = storey_state(&res, d, beta, beta_new, 0.0, s);
        let after = storey_state(&res, d, beta, beta_new, added, s);
        let kappa_before = demand::kappa(wirc, before.any(), s);
        let kappa = if added > 0.0 {
            let added_pct = indices::rc_wall_index_pct(added, res.floor_area_m2);
            let wirc_new = indices::rc_wall_index_pct(a_cw + added, res.floor_area_m2);
            demand::kappa_retrofit(kappa_before, added_pct, wirc_new, after.any(), s)
        } else {
            kappa_before
        };
        let soft_or_weak = after.any();
        states_after.get_mut(d).replace(after);
        let has_walls = a_cw + added > 0.0;
        let delta_w = has_walls.then(|| demand::wall_drift(drift));
        let delta_c = has_columns.then(|| demand::column_drift(kappa, drift));
        // §8
        let mut group: Vec<WallSpec> = res.walls_in(d).cloned().collect();
        if added > 0.0 {
            group.push(new_wall_group(d, added, s));
        }
        let these: Vec<WallResult> = group
            .iter()
            .map(|w| wall_result(w, lv_wall, se, cy, s))
            .collect();
        let wall_cap = min_levels(these.iter().map(|w| &w.capacity));
        wall_results.extend(these);
        let col_levels = column_cap.map(|c| c.levels);
        // §9
        let wall_dcr = match (delta_w, wall_cap) {
            (Some(dw), Some(c)) => Some(dcr::group_dcr(dw, &c)),
            _ => None,
        };
        let col_dcr = match (delta_c, col_levels) {
            (Some(dc), Some(c)) => Some(dcr::group_dcr(dc, &c)),
            _ => None,
        };
        let dcr_levels = dcr::direction_dcr(wall_dcr, col_dcr);
        *directions.get_mut(d) = DirectionResult {
            wall_index_pct: wi,
            column_index_pct: ci,
            priority_index_pct: pi,
            period_s: t,
            roof_drift_demand: drift,
            drift_demand: Groups {
                walls: delta_w,
                columns: delta_c,
            },
            capacity: Groups {
                walls: wall_cap.filter(|_| has_walls),
                columns: col_levels,
            },
            dcr: dcr_levels,
            detail: DirectionDetail {
                rc_wall_area_m2: a_cw,
                infill_area_m2: a_mw,
                rc_wall_index_pct: wirc,
                strength_walls: cw,
                strength_columns: cc,
                alpha1: a1,
                strength_coefficient: cy,
                period_frame_s: t_frame,
                period_wall_s: t_wall,
                ac_m2: ac,
                period_source: source,
                se_g: se,
                sde_m: sde,
                gamma,
                say_g: say,
                qu: qu.unwrap_or(0.0),
                n2_branch: branch.name(),
                dt_star_m: dt_star,
                roof_displacement_m: dt,
                kappa,
                tc_s: tc,
                added_wall_area_m2: added,
                period_formula_s: t_formula,
                soft_or_weak,
            },
        };
    }

    // §9 governing and §11 class.
    let level = s.ranking_level;
    let gdir = dcr::governing_direction(&directions.x.dcr, &directions.y.dcr, level);
    let gd = directions.get(gdir);
    let wall_dcr_g = match (gd.drift_demand.walls, gd.capacity.walls) {
        (Some(dw), Some(c)) => Some(dcr::group_dcr(dw, &c)),
        _ => None,
    };
    let col_dcr_g = match (gd.drift_demand.columns, gd.capacity.columns) {
        (Some(dc), Some(c)) => Some(dcr::group_dcr(dc, &c)),
        _ => None,
    };
    let ggroup = dcr::governing_group(wall_dcr_g, col_dcr_g, level);
    let score = gd.dcr.at(level);
    let dcr_max = Levels {
        io: directions.x.dcr.io.max(directions.y.dcr.io),
        ls: directions.x.dcr.ls.max(directions.y.dcr.ls),
        cp: directions.x.dcr.cp.max(directions.y.dcr.cp),
    };

    // §10 flags.
    let mut fl: Vec<Flag> = Vec::new();
    let push = |fl: &mut Vec<Flag>, code: &str, d: Option<Dir>, detail: String| {
        fl.push(Flag {
            code: code.into(),
            direction: d,
            detail,
        });
    };
    let src_text = match res.storey_source {
        StoreySource::Sheet => "storeys sheet",
        StoreySource::Upper => "upper-storey columns (storey 2 only)",
        StoreySource::None => "",
    };
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
            flags::Soft::Extreme => push(
                &mut fl,
                "soft-storey-extreme",
                Some(d),
                format!(
                    "ground-storey stiffness proxy (A_cw + A_mw/10 + A_col/2)/h: {ratios} (limits {} / {}, ASCE 7-16 Table 12.3-2 type 1b; data: {src_text}{with})",
                    s.extreme_soft_ratio, s.extreme_soft_ratio_mean
                ),
            ),
            flags::Soft::Soft => push(
                &mut fl,
                "soft-storey",
                Some(d),
                format!(
                    "ground-storey stiffness proxy (A_cw + A_mw/10 + A_col/2)/h: {ratios} (limits {} / {}, ASCE 7-16 Table 12.3-2 type 1a; data: {src_text}{with})",
                    s.soft_ratio, s.soft_ratio_mean
                ),
            ),
            flags::Soft::None => {}
        }
    }
    for d in Dir::BOTH {
        let Some(st) = states_after.get(d) else {
            continue;
        };
        if st.weak {
            push(
                &mut fl,
                "weak-storey",
                Some(d),
                format!(
                    "ground-storey strength is {:.1} % of the storey above (limit {:.0} %, ASCE 7-16 Table 12.3-2 type 5a; data: {src_text})",
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
            let c = flags::neutral_axis_m(w.lw, w.nu, w.web_steel_pct / 100.0, w.fy_mpa, w.fc_mpa);
            let c_lim = flags::boundary_c_limit_m(w.lw, drift, s);
            if flags::boundary_required(res.height_m, w.lw, c, c_lim, s) {
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
            if w.nu > s.calibration_axial_max {
                why.push(format!("ν = {:.3}", w.nu));
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
        if nu > s.calibration_axial_max {
            why.push(format!("ν = {nu:.3} > {}", s.calibration_axial_max));
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
                spec.factor
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
            .map(|k| format!("{k} = {}", default_value_text(k, &res, s)))
            .collect();
        push(
            &mut fl,
            "defaults-used",
            None,
            format!("blank inputs took defaults: {}", parts.join(", ")),
        );
    }

    let short = r.short_columns == Some(YesNo::Yes);
    let class = rank::class(&dcr_max, short);

    let (agr_g, agr_source, ground_type) = match &res.hazard {
        Hazard::Ec8 {
            agr_g,
            agr_source,
            ground,
            ..
        } => (*agr_g, *agr_source, ground.to_string()),
        Hazard::TwoParameter { source, .. } => (0.0, *source, String::new()),
    };
    let district = input
        .site
        .map(|x| x.district.clone())
        .filter(|d| !d.is_empty())
        .or_else(|| r.district.clone())
        .unwrap_or_default();
    Ok(BuildingResult {
        id: r.id.clone(),
        name: r.name.clone(),
        district,
        use_: res.use_,
        occupants: r.occupants,
        latitude: r.latitude,
        longitude: r.longitude,
        fault: input.site.and_then(|x| x.fault.clone()),
        rank: 0,
        class,
        score,
        governing: Governing {
            direction: gdir,
            group: ggroup,
            level,
        },
        axial_load_ratio: nu,
        strength_coefficient,
        directions,
        flags: fl,
        defaults_used: res.defaults_used.clone(),
        retrofit: None,
        row: r.row,
        detail: BuildingDetail {
            storeys: res.n,
            floor_heights_m: res.z_m.clone(),
            height_m: res.height_m,
            floor_area_m2: res.floor_area_m2,
            weight_kn: res.weight_kn,
            fc_mpa: res.fc_mpa,
            fy_mpa: res.fy_mpa,
            column_area_m2: res.column_area_m2,
            beta,
            agr_g,
            agr_source,
            ground_type,
            gamma_i: res.gamma_i,
            ag_g: spec.ag_g(),
            spectrum: spec.describe(),
            eta: spec.eta,
            boundary_elements: res.boundary_elements,
            columns_detailed: res.columns_detailed,
            wall_shear_span_m: lv_wall,
            column_shear_span_m: lv_col,
            column_theta_y: column_cap.map(|c| c.theta_y),
            column_theta_um: column_cap.map(|c| c.theta_um),
            spectrum_factor: spec.factor,
            dcr_max,
        },
        walls: wall_results,
    })
}

/// The value a defaulted input took, as text (for the defaults-used flag and explain).
pub fn default_value_text(key: &str, res: &Resolved, s: &Settings) -> String {
    match key {
        "use" => res.use_.code().to_string(),
        "storey_height_m" => format!("{} m", s.default_storey_height_m),
        "ground_storey_height_m" => format!("{} m", res.heights_m.first().copied().unwrap_or(0.0)),
        "column_depth_m" => format!("{} m", res.column_depth_m),
        "wall_length_x_m" | "wall_length_y_m" => format!("{} m", s.default_wall_length_m),
        "wall_thickness_m" => format!("{} m", s.default_wall_thickness_m),
        "boundary_elements" => {
            if res.boundary_elements {
                "present by year rule".into()
            } else {
                "treated as absent".into()
            }
        }
        "fc_mpa" => format!("{} MPa", res.fc_mpa),
        "fy_mpa" => format!("{} MPa", res.fy_mpa),
        "floor_weight_kpa" => format!("{} kPa", res.floor_weight_kpa),
        "ground_type" => s.default_ground_type.to_string(),
        _ => String::new(),
    }
}
