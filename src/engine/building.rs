/*!
One building through method §0–§11 (and the retrofit walls of §12): resolves the inputs,
runs each direction through strength, period, spectrum, N2, drift demand, capacity and DCR,
raises the flags and sets class and score. The rank is set by [`super::screen_all`].
*/

use crate::model::{Dir, PerDir, YesNo};
use crate::results::{
    BuildingDetail, BuildingResult, DirectionDetail, DirectionResult, Governing, Groups, Levels,
    WallResult,
};
use crate::settings::{CapacityModel, Settings};

use super::resolve::{self, Hazard, Resolved, StoreyAreas, WallSpec};
use super::{
    BuildingInput, NewWalls, asce41, capacity, dcr, demand, flags, indices, n2, period, rank,
    spectrum, strength,
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
pub fn storey_strength(
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

/// Everything of one building that does not depend on new retrofit walls: the resolved
/// inputs (§0) and the building-wide terms of §2–§8 (axial load ratio, β, spectrum, mode
/// shape, shear spans, column capacity, column strength). Retrofit sizing prepares a
/// building once and re-runs only [`direction`] for each trial wall area.
#[derive(Debug, Clone)]
pub struct Prepared<'a> {
    /// The building's input.
    pub input: &'a BuildingInput<'a>,
    /// Resolved inputs (§0).
    pub res: Resolved,
    /// Axial load ratio ν of the walls (or of the vertical elements when no wall is listed).
    pub nu: f64,
    /// Concrete strength factor β of the existing structure (§3).
    pub beta: f64,
    /// β of new retrofit walls (§3, `new_wall_fc_mpa`).
    pub beta_new: f64,
    /// The building's spectrum (§5).
    pub spec: DemandSpectrum,
    /// Corner period TC (s).
    pub tc: f64,
    /// Mode shape φ (§6).
    pub phi: Vec<f64>,
    /// Participation factor Γ (§6).
    pub gamma: f64,
    /// Wall shear span Lv (m, §8).
    pub lv_wall: f64,
    /// Column shear span Lv (m, §8).
    pub lv_col: f64,
    /// Column capacity (§8), when the building has columns.
    pub column_cap: Option<capacity::MemberCapacity>,
    /// Column strength term of C_y (§3).
    pub cc: f64,
}

/// Resolves a building and computes its building-wide terms (see [`Prepared`]).
pub fn prepare<'a>(
    input: &'a BuildingInput<'a>,
    s: &Settings,
) -> Result<Prepared<'a>, Vec<String>> {
    let res = resolve::resolve(input, s)?;
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
    let column_cap = (res.column_area_m2 > 0.0).then(|| {
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
    Ok(Prepared {
        input,
        res,
        nu,
        beta,
        beta_new,
        spec,
        tc,
        phi,
        gamma,
        lv_wall,
        lv_col,
        column_cap,
        cc,
    })
}

/// One direction of a prepared building through §1 and §3–§9 with `added` m² of new walls
/// in it (0 for none): its result, its walls' results (new wall group last) and its
/// soft/weak storey state after the new walls. A direction depends on its own new walls
/// only, so re-screening with walls in one direction changes that direction alone.
pub fn direction(
    p: &Prepared<'_>,
    s: &Settings,
    d: Dir,
    added: f64,
) -> (DirectionResult, Vec<WallResult>, flags::StoreyState) {
    let res = &p.res;
    let added = added.max(0.0);
    let added = if added.is_finite() { added } else { 0.0 };
    let has_columns = res.column_area_m2 > 0.0;
    let a_cw = *res.rc_wall_area_m2.get(d);
    let a_mw = *res.infill_area_m2.get(d);
    // §1
    let ci = indices::column_index_pct(res.column_area_m2, res.floor_area_m2);
    let wi = indices::wall_index_pct(a_cw, a_mw, s.infill_weight, res.floor_area_m2);
    let pi = indices::priority_index_pct(wi, ci);
    let wirc = indices::rc_wall_index_pct(a_cw, res.floor_area_m2);
    // §3
    let cw = strength::wall_strength(
        p.beta,
        s.tau_wall_mpa,
        a_cw,
        strength::tau_infill_mpa(s),
        a_mw,
        res.weight_kn,
    ) + strength::new_wall_strength(p.beta_new, s.tau_wall_mpa, added, res.weight_kn);
    let a1 = strength::alpha1(a_cw + added > 0.0, s);
    let cy = strength::strength_coefficient(cw, a1, p.cc);
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
    let se = p.spec.se_g(t);
    let sde = spectrum::sde_m(se, t);
    // §6
    let say = n2::yield_acceleration_g(cy, res.n, p.gamma, &p.phi);
    let qu = n2::strength_ratio(se, say);
    let (dt_star, branch) = n2::target_displacement_m(sde, qu, t, p.tc);
    let dt = n2::roof_displacement_m(p.gamma, dt_star);
    let drift = n2::roof_drift(dt, res.height_m);
    // §7 (soft/weak state before and after new walls)
    let before = flags::storey_state(res, d, p.beta, p.beta_new, 0.0, s);
    let after = flags::storey_state(res, d, p.beta, p.beta_new, added, s);
    let kappa_before = demand::kappa(wirc, before.any(), s);
    let kappa = if added > 0.0 {
        let added_pct = indices::rc_wall_index_pct(added, res.floor_area_m2);
        let wirc_new = indices::rc_wall_index_pct(a_cw + added, res.floor_area_m2);
        demand::kappa_retrofit(kappa_before, added_pct, wirc_new, after.any(), s)
    } else {
        kappa_before
    };
    let soft_or_weak = after.any();
    let has_walls = a_cw + added > 0.0;
    let delta_w = has_walls.then(|| demand::wall_drift(drift));
    let delta_c = has_columns.then(|| demand::column_drift(kappa, drift));
    // §8
    let mut group: Vec<WallSpec> = res.walls_in(d).cloned().collect();
    if added > 0.0 {
        group.push(new_wall_group(d, added, s));
    }
    let walls: Vec<WallResult> = group
        .iter()
        .map(|w| wall_result(w, p.lv_wall, se, cy, s))
        .collect();
    let wall_cap = min_levels(walls.iter().map(|w| &w.capacity));
    let col_levels = p.column_cap.map(|c| c.levels);
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
    let result = DirectionResult {
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
            strength_columns: p.cc,
            alpha1: a1,
            strength_coefficient: cy,
            period_frame_s: t_frame,
            period_wall_s: t_wall,
            ac_m2: ac,
            period_source: source,
            se_g: se,
            sde_m: sde,
            gamma: p.gamma,
            say_g: say,
            qu: qu.unwrap_or(0.0),
            n2_branch: branch.name(),
            dt_star_m: dt_star,
            roof_displacement_m: dt,
            kappa,
            tc_s: p.tc,
            added_wall_area_m2: added,
            period_formula_s: t_formula,
            soft_or_weak,
        },
    };
    (result, walls, after)
}

/// Screens one building with (possibly zero) retrofit walls.
pub fn screen(
    input: &BuildingInput<'_>,
    s: &Settings,
    new: &NewWalls,
) -> Result<BuildingResult, Vec<String>> {
    let p = prepare(input, s)?;
    let Prepared {
        res,
        nu,
        beta,
        spec,
        lv_wall,
        lv_col,
        column_cap,
        ..
    } = &p;
    let (res, nu, beta, lv_wall, lv_col, column_cap) =
        (res, *nu, *beta, *lv_wall, *lv_col, *column_cap);
    let r = input.record;
    let mut directions: PerDir<DirectionResult> = PerDir::default();
    let mut wall_results: Vec<WallResult> = Vec::new();
    let mut states_after: PerDir<Option<flags::StoreyState>> = PerDir::default();
    let mut strength_coefficient = PerDir { x: 0.0, y: 0.0 };
    for d in Dir::BOTH {
        let (result, walls, after) = direction(&p, s, d, *new.area_m2.get(d));
        *strength_coefficient.get_mut(d) = result.detail.strength_coefficient;
        states_after.get_mut(d).replace(after);
        wall_results.extend(walls);
        *directions.get_mut(d) = result;
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
    let fl = flags::raise(&flags::Context {
        res,
        input,
        s,
        directions: &directions,
        states: &states_after,
        nu,
        lv_wall,
        lv_col,
        column_cap,
        walls: &wall_results,
        spectrum_factor: spec.factor,
    });

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
        uncertainty: None,
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
