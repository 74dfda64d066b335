/*!
One building through method §0–§11 (and the retrofit walls of §12): resolves the inputs,
runs each direction through strength, period, spectrum, N2, drift demand, capacity and DCR,
raises the flags and sets class and score. The rank is set by [`super::screen_all`].
*/

use crate::model::{Dir, PerDir, YesNo};
use crate::results::{
    BuildingDetail, BuildingResult, DirectionDetail, DirectionResult, FrameAlone, Governing, Group,
    Groups, Levels, LsCp, SpectrumShape, WallResult,
};
use crate::settings::{CapacityModel, Settings};

use super::resolve::{self, Hazard, Resolved, WallSpec};
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
    /// The spectrum's shape and parameters (worded by the report layer).
    pub fn shape(&self) -> SpectrumShape {
        match &self.hazard {
            Hazard::Ec8 { type2, ground, .. } => {
                let p = spectrum::ec8_params(*ground, *type2);
                SpectrumShape::Ec8 {
                    type2: *type2,
                    ground: *ground,
                    s: p.s,
                    tb_s: p.tb,
                    tc_s: p.tc,
                    td_s: p.td,
                }
            }
            Hazard::TwoParameter {
                sds_g, sd1_g, tl_s, ..
            } => SpectrumShape::TwoParameter {
                sds_g: *sds_g,
                sd1_g: *sd1_g,
                ts_s: spectrum::corner_ts(*sds_g, *sd1_g),
                tl_s: *tl_s,
            },
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

/// Capacity of one wall under the selected model (method §8), from its mean concrete
/// strength `fc_mean` (MPa; the sampling stage of §13 passes F·fc) and its axial load
/// ratio `nu` (§2). Existing members take fc/CF and fy/CF (EN 1998-3 §3.5) and ν × CF inside
/// (A.1) and the ASCE 41 Q (method §8, confidence factor scope); new walls take their
/// properties as given. The ASCE 41 wall-shear share β_i takes the mean fc. Returns the
/// EN 1998-3 member capacity (θy, θum) and the levels of the selected model.
pub fn wall_capacity_levels(
    w: &WallSpec,
    fc_mean: f64,
    nu: f64,
    lv: f64,
    se_g: f64,
    cy: f64,
    s: &Settings,
) -> (capacity::MemberCapacity, Levels) {
    let (fc, fy) = if w.existing {
        (
            fc_mean / s.confidence_factor,
            w.fy_mpa / s.confidence_factor,
        )
    } else {
        (fc_mean, w.fy_mpa)
    };
    let nu_cap = capacity::capacity_axial_ratio(nu, w.existing, s);
    let ec = capacity::wall_capacity(
        nu_cap,
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
            strength::beta(fc_mean, s.fc_reference_mpa),
            s.tau_wall_mpa,
            area_i,
        );
        let v = asce41::shear_stress_psi(v_mn, w.tw, w.lw, fc);
        asce41::wall_levels(ec.theta_y, nu_cap, v, w.boundary)
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
    (ec, cap)
}

/// Capacity of one wall under the selected model (method §8), as the Walls sheet reports it.
fn wall_result(w: &WallSpec, lv: f64, se_g: f64, cy: f64, s: &Settings) -> WallResult {
    let (ec, cap) = wall_capacity_levels(w, w.fc_mpa, w.nu, lv, se_g, cy, s);
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
        new: w.new,
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

/// Everything of one building that does not depend on new retrofit walls: the resolved
/// inputs (§0) and the building-wide terms of §2–§8 (axial load ratio, β, spectrum, mode
/// shape, shear spans, column capacity, column strength). Retrofit sizing prepares a
/// building once and re-runs only [`direction`] for each trial wall area.
#[derive(Debug, Clone)]
pub struct PreparedBuilding<'a> {
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
    /// Soft/weak storey state of each direction as surveyed (before any retrofit, §10).
    pub surveyed: PerDir<flags::StoreyState>,
    /// Frame-alone bound of each direction (§9), when the building has columns; applied
    /// only where RC walls (existing or new) act in the direction. One number per
    /// direction and level: it does not depend on the new walls.
    pub frame_alone: PerDir<Option<FrameAlone>>,
}

/// §5–§6 for one strength coefficient and period: spectrum, N2 target displacement, roof
/// drift.
#[derive(Debug, Clone, Copy)]
pub struct DemandChain {
    /// Se(T) (g).
    pub se_g: f64,
    /// SDe(T) (m).
    pub sde_m: f64,
    /// S_ay (g).
    pub say_g: f64,
    /// qu (None when S_ay is not positive).
    pub qu: Option<f64>,
    /// dt* (m).
    pub dt_star_m: f64,
    /// N2 branch.
    pub branch: n2::N2Branch,
    /// d_t = Γ·dt* (m).
    pub dt_m: f64,
    /// δ_r = d_t/H.
    pub roof_drift: f64,
}

/// Method §5–§6 for a prepared building with strength coefficient `cy` and period `t` (s).
pub fn demand_chain(p: &PreparedBuilding<'_>, cy: f64, t: f64) -> DemandChain {
    let res = &p.res;
    let se = p.spec.se_g(t);
    let sde = spectrum::sde_m(se, t);
    let say = n2::yield_acceleration_g(cy, res.n, p.gamma, &p.phi);
    let qu = n2::strength_ratio(se, say);
    let (dt_star, branch) = n2::target_displacement_m(sde, qu, t, p.tc);
    let dt = n2::roof_displacement_m(p.gamma, dt_star);
    DemandChain {
        se_g: se,
        sde_m: sde,
        say_g: say,
        qu,
        dt_star_m: dt_star,
        branch,
        dt_m: dt,
        roof_drift: n2::roof_drift(dt, res.height_m),
    }
}

/// Formula periods of direction d with the existing walls (§4): (T_frame, Ac, T_wall,
/// T_formula).
fn formula_periods(res: &Resolved, s: &Settings, d: Dir) -> (f64, f64, Option<f64>, f64) {
    let t_frame = period::period_frame_s(s.ct_period, res.height_m);
    let ac: f64 = res
        .walls_in(d)
        .map(|w| period::ac_term_m2(w.area_m2(), w.lw, res.height_m))
        .fold(0.0, |a, b| a + b);
    let t_wall = period::period_wall_s(s.ct_period, ac, res.height_m);
    let t_formula = period::formula_period_s(t_frame, t_wall);
    (t_frame, ac, t_wall, t_formula)
}

/// Period of the frame alone (method §9): the frame period of §4 through the same order of
/// rules — T_frame × `period_factor`, or an input period × T_frame/T_formula (T_formula of
/// the building with its walls); no new-wall scaling (the new walls are removed too).
pub fn frame_period_s(
    t_frame: f64,
    t_formula: f64,
    period_input_s: Option<f64>,
    period_factor: f64,
) -> f64 {
    match period_input_s {
        Some(t_in) if t_formula > 0.0 => t_in * t_frame / t_formula,
        Some(t_in) => t_in,
        None => t_frame * period_factor,
    }
}

/// κ of the frame alone (method §9): κ_soft when the building as surveyed carries a soft,
/// extreme-soft or weak storey flag in d (not re-evaluated), else κ_frame.
pub fn frame_kappa(soft_or_weak_surveyed: bool, s: &Settings) -> f64 {
    if soft_or_weak_surveyed {
        s.kappa_soft
    } else {
        s.kappa_frame
    }
}

/// The frame-alone bound of direction d (method §9) before it is compared: §3–§7 with the
/// RC walls of d removed (existing and new; infill and storey heights kept), C_y = C_m +
/// C_c, the frame period ([`frame_period_s`]), κ ([`frame_kappa`]), the building's own
/// column capacities; DCR_frame,L = κ·δ_r,frame/θ_c,L at LS and CP. `None` without columns.
fn frame_alone_bound(
    p: &PreparedBuilding<'_>,
    s: &Settings,
    d: Dir,
    soft_or_weak_surveyed: bool,
) -> Option<FrameAlone> {
    let res = &p.res;
    let cap = p.column_cap?;
    let cm = strength::infill_strength(
        p.beta,
        strength::tau_infill_mpa(s),
        *res.infill_area_m2.get(d),
        res.weight_kn,
    );
    let cy = strength::strength_coefficient(cm, 0.0, s.alpha1_with_walls, p.cc).cy;
    let (t_frame, _, _, t_formula) = formula_periods(res, s, d);
    let t = frame_period_s(
        t_frame,
        t_formula,
        *res.period_input_s.get(d),
        s.period_factor,
    );
    let chain = demand_chain(p, cy, t);
    let kappa = frame_kappa(soft_or_weak_surveyed, s);
    let dc = demand::column_drift(kappa, chain.roof_drift);
    Some(FrameAlone {
        period_s: t,
        roof_drift_demand: chain.roof_drift,
        drift_demand_columns: dc,
        dcr: LsCp {
            ls: dcr::ratio(dc, cap.levels.ls),
            cp: dcr::ratio(dc, cap.levels.cp),
        },
        strength_coefficient: cy,
        se_g: chain.se_g,
        kappa,
        governs: LsCp::default(),
    })
}

/// Resolves a building and computes its building-wide terms (see [`PreparedBuilding`]).
pub fn prepare<'a>(
    input: &'a BuildingInput<'a>,
    s: &Settings,
) -> Result<PreparedBuilding<'a>, Vec<String>> {
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
            capacity::capacity_axial_ratio(nu, true, s),
            res.fc_mpa / s.confidence_factor,
            res.fy_mpa / s.confidence_factor,
            res.column_depth_m,
            lv_col,
            res.columns_detailed,
            s,
        )
    });
    let cc = strength::column_strength(beta, s.tau_column_mpa, res.column_area_m2, res.weight_kn);
    let surveyed = PerDir {
        x: flags::storey_state(&res, Dir::X, beta, beta_new, 0.0, s),
        y: flags::storey_state(&res, Dir::Y, beta, beta_new, 0.0, s),
    };
    let mut p = PreparedBuilding {
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
        surveyed,
        frame_alone: PerDir::default(),
    };
    for d in Dir::BOTH {
        let soft = p.surveyed.get(d).any();
        *p.frame_alone.get_mut(d) = frame_alone_bound(&p, s, d, soft);
    }
    Ok(p)
}

/// One direction of a prepared building through §1 and §3–§9 with `added` m² of new walls
/// in it (0 for none): its result, its walls' results (new wall group last) and its
/// soft/weak storey state after the new walls. A direction depends on its own new walls
/// only, so re-screening with walls in one direction changes that direction alone.
pub fn direction(
    p: &PreparedBuilding<'_>,
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
    let cm = strength::infill_strength(p.beta, strength::tau_infill_mpa(s), a_mw, res.weight_kn);
    let crc = strength::rc_wall_strength(p.beta, s.tau_wall_mpa, a_cw, res.weight_kn)
        + strength::new_wall_strength(p.beta_new, s.tau_wall_mpa, added, res.weight_kn);
    let comb = strength::strength_coefficient(cm, crc, s.alpha1_with_walls, p.cc);
    let cy = comb.cy;
    // §4
    let (t_frame, ac, t_wall, t_formula) = formula_periods(res, s, d);
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
    // §5, §6
    let chain = demand_chain(p, cy, t);
    let (se, sde, say, qu, dt_star, branch, dt, drift) = (
        chain.se_g,
        chain.sde_m,
        chain.say_g,
        chain.qu,
        chain.dt_star_m,
        chain.branch,
        chain.dt_m,
        chain.roof_drift,
    );
    // §7 (soft/weak state before and after new walls)
    let before = p.surveyed.get(d);
    let after = if added > 0.0 {
        flags::storey_state(res, d, p.beta, p.beta_new, added, s)
    } else {
        before.clone()
    };
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
    let mut dcr_levels = dcr::direction_dcr(wall_dcr, col_dcr);
    // §9 frame-alone bound (LS and CP): where columns and RC walls act in d.
    let frame_alone = (has_walls && has_columns)
        .then(|| *p.frame_alone.get(d))
        .flatten()
        .map(|f| dcr::apply_frame_alone(&mut dcr_levels, f));
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
        frame_alone,
        group_dcr: Groups {
            walls: wall_dcr,
            columns: col_dcr,
        },
        detail: DirectionDetail {
            rc_wall_area_m2: a_cw,
            infill_area_m2: a_mw,
            rc_wall_index_pct: wirc,
            strength_walls: crc + cm,
            strength_infill: cm,
            wall_governed: comb.wall_governed,
            strength_columns: p.cc,
            alpha1: comb.column_factor,
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
    let PreparedBuilding {
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
    let frame_alone_governs = gd
        .frame_alone
        .is_some_and(|f| dcr::frame_alone_governs(&f, level));
    let ggroup = if frame_alone_governs {
        Group::Columns
    } else {
        dcr::governing_group(gd.group_dcr.walls, gd.group_dcr.columns, level)
    };
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
            frame_alone: frame_alone_governs,
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
            plan_area_m2: res.plan_area_m2,
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
            spectrum: spec.shape(),
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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::BuildingRecord;

    #[test]
    fn frame_period_follows_the_order_of_rules() {
        // Formula: T_frame × period_factor; input: T_in × T_frame/T_formula (method §9).
        assert!((frame_period_s(0.4, 0.3, None, 1.3) - 0.52).abs() < 1e-15);
        assert!((frame_period_s(0.4, 0.32, Some(0.6), 1.3) - 0.75).abs() < 1e-15);
        assert_eq!(frame_kappa(false, &Settings::default()), 1.5);
        assert_eq!(frame_kappa(true, &Settings::default()), 2.5);
    }

    fn record() -> BuildingRecord {
        BuildingRecord {
            row: 2,
            id: "F".into(),
            storeys: 5,
            storey_height_m: Some(3.0),
            ground_storey_height_m: Some(3.0),
            plan_area_m2: 400.0,
            column_area_m2: 5.0,
            rc_wall_area_x_m2: Some(4.0),
            rc_wall_area_y_m2: Some(0.0),
            wall_length_x_m: Some(6.0),
            infill_area_x_m2: Some(8.0),
            fc_mpa: Some(20.0),
            fy_mpa: Some(420.0),
            agr_g: Some(0.3),
            period_x_s: Some(0.5),
            ..Default::default()
        }
    }

    fn input(r: &BuildingRecord) -> BuildingInput<'_> {
        BuildingInput {
            record: r,
            walls: vec![],
            storeys: vec![],
            footprint: vec![],
            site: None,
        }
    }

    #[test]
    fn frame_alone_bound_by_hand_and_independent_of_new_walls() {
        let r = record();
        let s = Settings::default();
        let inp = input(&r);
        let p = prepare(&inp, &s).unwrap();
        let (x, _, _) = direction(&p, &s, Dir::X, 0.0);
        let f = x.frame_alone.unwrap();
        // Period: input 0.5 s × T_frame/T_formula of the building with its walls.
        let t_frame = period::period_frame_s(s.ct_period, 15.0);
        assert!((f.period_s - 0.5 * t_frame / x.detail.period_formula_s).abs() < 1e-12);
        // C_y = C_m + C_c = (0.2·8 + 1·5)·1000/(12·2000) = 0.275.
        assert!((f.strength_coefficient - 6600.0 / 24000.0).abs() < 1e-12);
        // κ_frame (no soft/weak storey), the building's own column capacity.
        assert_eq!(f.kappa, s.kappa_frame);
        let cap = p.column_cap.unwrap().levels;
        assert!((f.dcr.ls - f.drift_demand_columns / cap.ls).abs() < 1e-15);
        assert!((f.drift_demand_columns - 1.5 * f.roof_drift_demand).abs() < 1e-15);
        // DCR at LS and CP not above the bound; IO untouched by it.
        assert!(x.dcr.ls <= f.dcr.ls && x.dcr.cp <= f.dcr.cp);
        let io = x
            .group_dcr
            .walls
            .unwrap()
            .io
            .max(x.group_dcr.columns.unwrap().io);
        assert_eq!(x.dcr.io, io);
        // One number per direction and level: the same with new walls (sizing).
        let (x2, _, _) = direction(&p, &s, Dir::X, 6.0);
        let f2 = x2.frame_alone.unwrap();
        assert_eq!((f2.period_s, f2.dcr), (f.period_s, f.dcr));
        // No RC walls in Y and no new ones: no bound; with new walls in Y: the bound.
        let (y, _, _) = direction(&p, &s, Dir::Y, 0.0);
        assert!(y.frame_alone.is_none());
        let (y2, _, _) = direction(&p, &s, Dir::Y, 3.0);
        assert!(y2.frame_alone.is_some());
    }

    #[test]
    fn governing_group_is_columns_where_the_bound_governs() {
        // Long unconfined walls of weak concrete (fc 14, fy 220, lw 6 m; KV-038-like) reach
        // their capacity early; the frame alone carries the demand.
        let mut r = record();
        r.fc_mpa = Some(14.0);
        r.fy_mpa = Some(220.0);
        r.rc_wall_area_x_m2 = Some(1.5);
        r.rc_wall_area_y_m2 = Some(1.5);
        r.wall_length_y_m = Some(6.0);
        r.period_x_s = None;
        let b = screen(&input(&r), &Settings::default(), &NewWalls::default()).unwrap();
        let d = b.directions.get(b.governing.direction);
        let f = d.frame_alone.unwrap();
        assert!(f.governs.ls, "{:?} vs {:?}", d.group_dcr, f.dcr);
        assert!(b.governing.frame_alone);
        assert_eq!(b.governing.group, Group::Columns);
        assert_eq!(b.score, f.dcr.ls);
        let json = serde_json::to_value(&b).unwrap();
        assert_eq!(json["governing"]["frame_alone"], true);
        assert!(json["directions"]["x"]["frame_alone"]["dcr"]["ls"].is_number());
        assert!(
            json["directions"]["x"]["frame_alone"]["dcr"]
                .get("io")
                .is_none()
        );
    }
}
