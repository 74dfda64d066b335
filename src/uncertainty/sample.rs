/*!
One building re-run through method §2–§11 with the random factors of §13 (D, Cw, Cc, F, W,
H): only what the class, the score and the order need.

[`Evaluator::new`] takes the engine's own deterministic preparation of the building
([`engine::building::prepare`] and [`engine::building::direction`] without new walls) and
keeps what does not depend on the factors: periods, the mode shape and Γ, shear spans,
areas, the spectrum's shape, the soft-storey outcome (stiffness proxies hold no fc, w or
agR). [`Evaluator::evaluate`] then recomputes per sample, with the engine's formula
functions, everything that does: fc·F and w·W (ν, β, C_y, the weak-storey proxy and so κ,
every θ), agR·H (Se, SDe, Ts, qu, the N2 target displacement), d_t·D after the §6 clamp,
and Cw, Cc on the final θ_IO/LS/CP of the wall and column groups. With every factor 1 it
reproduces the deterministic DCRs, class and score bit for bit (tested), so that the engine
and the sampler cannot drift apart unnoticed.
*/

use crate::engine::building::{self, DemandSpectrum, PreparedBuilding};
use crate::engine::resolve::{Hazard, StoreyAreas, WallSpec};
use crate::engine::{BuildingInput, capacity, dcr, demand, flags, n2, rank, strength};
use crate::engine::{indices, resolve};
use crate::model::{Dir, PerDir, YesNo};
use crate::results::Levels;
use crate::settings::Settings;

/// The random factors of one building in one sample (method §13), each lognormal with
/// median 1.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Factors {
    /// D on the target displacement d_t.
    pub d: f64,
    /// Cw on θ_IO, θ_LS, θ_CP of the wall group.
    pub cw: f64,
    /// Cc on θ_IO, θ_LS, θ_CP of the column group.
    pub cc: f64,
    /// F on the mean fc (building and existing walls).
    pub f: f64,
    /// W on the seismic weight per floor area w.
    pub w: f64,
    /// H on agR (or SDS and SD1).
    pub h: f64,
}

impl Factors {
    /// Every factor 1: the deterministic run.
    pub const NEUTRAL: Factors = Factors {
        d: 1.0,
        cw: 1.0,
        cc: 1.0,
        f: 1.0,
        w: 1.0,
        h: 1.0,
    };
}

/// What one direction of one sample gives.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct SampleDirection {
    /// Strength coefficient C_y,d.
    pub strength_coefficient: f64,
    /// Se(T_d) (g).
    pub se_g: f64,
    /// Roof displacement d_t (m), D included.
    pub roof_displacement_m: f64,
    /// Roof drift ratio δ_r.
    pub roof_drift: f64,
    /// κ.
    pub kappa: f64,
    /// Wall drift demand (None without walls).
    pub drift_walls: Option<f64>,
    /// Column drift demand (None without columns).
    pub drift_columns: Option<f64>,
    /// Wall group capacity, per-level minimum, Cw included.
    pub capacity_walls: Option<Levels>,
    /// Column capacity, Cc included.
    pub capacity_columns: Option<Levels>,
    /// DCR per level (the frame-alone bound applied at LS and CP).
    pub dcr: Levels,
    /// The frame-alone bound's DCR at LS and CP (D and Cc included), where it applies.
    pub frame_alone_dcr: Option<(f64, f64)>,
    /// The frame-alone bound's roof displacement d_t (m, D included), where it applies.
    pub frame_alone_roof_displacement_m: Option<f64>,
}

/// One sample of one building.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Sample {
    /// Class 1–4 (§11, short-column rule included).
    pub class: u8,
    /// Score: governing DCR at the ranking level.
    pub score: f64,
    /// Axial load ratio ν of the sample.
    pub axial_load_ratio: f64,
    /// Per direction.
    pub directions: PerDir<SampleDirection>,
}

/// The factor-independent part of one direction.
#[derive(Debug, Clone)]
struct DirectionBase {
    period_s: f64,
    /// Period of the frame alone (§9), when the building has columns.
    frame_period_s: Option<f64>,
    rc_wall_m2: f64,
    infill_m2: f64,
    rc_wall_index_pct: f64,
    soft: bool,
    walls: Vec<WallSpec>,
}

/// A building ready to be sampled (see the module comment).
#[derive(Debug, Clone)]
pub struct Evaluator {
    fc_mpa: f64,
    fy_mpa: f64,
    weight_kn: f64,
    vertical_area_m2: f64,
    n: u32,
    gamma: f64,
    phi: Vec<f64>,
    height_m: f64,
    spectrum: DemandSpectrum,
    lv_wall: f64,
    lv_col: f64,
    column_area_m2: f64,
    column_depth_m: f64,
    columns_detailed: bool,
    short_column: bool,
    storeys: Option<[StoreyAreas; 2]>,
    directions: [DirectionBase; 2],
}

impl Evaluator {
    /// Prepares a building the engine can screen (`Err`: the reasons it cannot).
    pub fn new(input: &BuildingInput<'_>, s: &Settings) -> Result<Self, Vec<String>> {
        let p = building::prepare(input, s)?;
        Ok(Self::from_prepared(&p, s))
    }

    /// From the engine's preparation of the building.
    pub fn from_prepared(p: &PreparedBuilding<'_>, s: &Settings) -> Self {
        let res = &p.res;
        let dir = |d: Dir| {
            let (r, _, _) = building::direction(p, s, d, 0.0);
            DirectionBase {
                period_s: r.period_s,
                frame_period_s: p.frame_alone.get(d).map(|f| f.period_s),
                rc_wall_m2: *res.rc_wall_area_m2.get(d),
                infill_m2: *res.infill_area_m2.get(d),
                rc_wall_index_pct: indices::rc_wall_index_pct(
                    *res.rc_wall_area_m2.get(d),
                    res.floor_area_m2,
                ),
                // The stiffness proxies hold no fc, w or agR: the soft-storey outcome of
                // the building as surveyed holds in every sample.
                soft: p.surveyed.get(d).soft != flags::Soft::None,
                walls: res.walls_in(d).cloned().collect(),
            }
        };
        let storeys = (res.storeys.len() >= 2).then(|| [res.storeys[0], res.storeys[1]]);
        Evaluator {
            fc_mpa: res.fc_mpa,
            fy_mpa: res.fy_mpa,
            weight_kn: res.weight_kn,
            vertical_area_m2: res.column_area_m2 + res.rc_wall_area_m2.x + res.rc_wall_area_m2.y,
            n: res.n,
            gamma: p.gamma,
            phi: p.phi.clone(),
            height_m: res.height_m,
            spectrum: p.spec.clone(),
            lv_wall: p.lv_wall,
            lv_col: p.lv_col,
            column_area_m2: res.column_area_m2,
            column_depth_m: res.column_depth_m,
            columns_detailed: res.columns_detailed,
            short_column: p.input.record.short_columns == Some(YesNo::Yes),
            storeys,
            directions: [dir(Dir::X), dir(Dir::Y)],
        }
    }

    /// The spectrum with agR (or SDS and SD1) multiplied by H (method §13).
    fn spectrum_with(&self, h: f64) -> DemandSpectrum {
        let mut spec = self.spectrum.clone();
        match &mut spec.hazard {
            Hazard::Ec8 { agr_g, .. } => *agr_g *= h,
            Hazard::TwoParameter { sds_g, sd1_g, .. } => {
                *sds_g *= h;
                *sd1_g *= h;
            }
        }
        spec
    }

    /// §5–§6 for one strength coefficient and period with the sample's spectrum: (Se, d_t
    /// with D applied after the clamp, δ_r) — the engine's `demand_chain` with H and D.
    fn demand(&self, spec: &DemandSpectrum, tc: f64, cy: f64, t: f64, d: f64) -> (f64, f64, f64) {
        let se = spec.se_g(t);
        let sde = crate::engine::spectrum::sde_m(se, t);
        let say = n2::yield_acceleration_g(cy, self.n, self.gamma, &self.phi);
        let qu = n2::strength_ratio(se, say);
        let (dt_star, _) = n2::target_displacement_m(sde, qu, t, tc);
        let dt = n2::roof_displacement_m(self.gamma, dt_star) * d;
        (se, dt, n2::roof_drift(dt, self.height_m))
    }

    /// One sample with the given factors (method §13, "where each factor acts").
    pub fn evaluate(&self, f: &Factors, s: &Settings) -> Sample {
        // F on the mean fc before CF divides it; W on w (so W, masses and ν).
        let fc = self.fc_mpa * f.f;
        let weight = self.weight_kn * f.w;
        let nu = resolve::axial_load_ratio(weight, self.vertical_area_m2, fc);
        let beta = strength::beta(fc, s.fc_reference_mpa);
        let beta_new = strength::beta(s.new_wall_fc_mpa, s.fc_reference_mpa);
        let cc = strength::column_strength(beta, s.tau_column_mpa, self.column_area_m2, weight);
        let column = (self.column_area_m2 > 0.0).then(|| {
            let c = capacity::column_capacity(
                capacity::capacity_axial_ratio(nu, true, s),
                fc / s.confidence_factor,
                self.fy_mpa / s.confidence_factor,
                self.column_depth_m,
                self.lv_col,
                self.columns_detailed,
                s,
            );
            scale_levels(&c.levels, f.cc)
        });
        let spec = self.spectrum_with(f.h);
        let tc = spec.tc_s();
        let mut out = PerDir::<SampleDirection>::default();
        for (k, d) in Dir::BOTH.into_iter().enumerate() {
            let b = &self.directions[k];
            // §3
            let tau_m = strength::tau_infill_mpa(s);
            let cm = strength::infill_strength(beta, tau_m, b.infill_m2, weight);
            let crc = strength::rc_wall_strength(beta, s.tau_wall_mpa, b.rc_wall_m2, weight);
            let cy = strength::strength_coefficient(cm, crc, s.alpha1_with_walls, cc).cy;
            // §5–§6, D after the clamp.
            let (se, dt, drift) = self.demand(&spec, tc, cy, b.period_s, f.d);
            // §7: κ from the soft-storey outcome and the sample's weak-storey proxy.
            let weak = self.storeys.is_some_and(|st| {
                let proxy = |a: &StoreyAreas| {
                    strength::storey_strength(
                        beta,
                        beta_new,
                        *a.rc_wall_m2.get(d),
                        0.0,
                        *a.infill_m2.get(d),
                        a.column_m2,
                        s,
                    )
                };
                flags::weak_storey(proxy(&st[0]), proxy(&st[1]), s).0
            });
            let soft_or_weak = b.soft || weak;
            let kappa = demand::kappa(b.rc_wall_index_pct, soft_or_weak, s);
            let has_walls = b.rc_wall_m2 > 0.0;
            let delta_w = has_walls.then(|| demand::wall_drift(drift));
            let delta_c = column.is_some().then(|| demand::column_drift(kappa, drift));
            // §8: the wall group's per-level minimum, Cw on the final levels.
            let mut wall_cap: Option<Levels> = None;
            for w in &b.walls {
                let (_, l) =
                    building::wall_capacity_levels(w, w.fc_mpa * f.f, nu, self.lv_wall, se, cy, s);
                wall_cap = Some(match wall_cap {
                    None => l,
                    Some(a) => Levels {
                        io: a.io.min(l.io),
                        ls: a.ls.min(l.ls),
                        cp: a.cp.min(l.cp),
                    },
                });
            }
            let wall_cap = wall_cap.map(|l| scale_levels(&l, f.cw));
            // §9
            let wall_dcr = match (delta_w, wall_cap) {
                (Some(dw), Some(c)) => Some(dcr::group_dcr(dw, &c)),
                _ => None,
            };
            let col_dcr = match (delta_c, column) {
                (Some(dc), Some(c)) => Some(dcr::group_dcr(dc, &c)),
                _ => None,
            };
            let mut dcr_levels = dcr::direction_dcr(wall_dcr, col_dcr);
            // §9 frame-alone bound at LS and CP, where columns and RC walls act in d: the
            // RC walls of d removed (C_y = C_m + C_c), the frame period, κ_frame or κ_soft
            // of the sample's building (no retrofit in samples), D on its d_t, Cc on the
            // column levels.
            let mut frame = None;
            let mut frame_dt = None;
            if let (true, Some(col), Some(tf)) = (has_walls, column, b.frame_period_s) {
                let cy_f = strength::strength_coefficient(cm, 0.0, s.alpha1_with_walls, cc).cy;
                let (_, dt_f, drift_f) = self.demand(&spec, tc, cy_f, tf, f.d);
                let dc = demand::column_drift(building::frame_kappa(soft_or_weak, s), drift_f);
                let (ls, cp) = (dcr::ratio(dc, col.ls), dcr::ratio(dc, col.cp));
                dcr_levels.ls = dcr_levels.ls.min(ls);
                dcr_levels.cp = dcr_levels.cp.min(cp);
                frame = Some((ls, cp));
                frame_dt = Some(dt_f);
            }
            *out.get_mut(d) = SampleDirection {
                strength_coefficient: cy,
                se_g: se,
                roof_displacement_m: dt,
                roof_drift: drift,
                kappa,
                drift_walls: delta_w,
                drift_columns: delta_c,
                capacity_walls: wall_cap.filter(|_| has_walls),
                capacity_columns: column,
                dcr: dcr_levels,
                frame_alone_dcr: frame,
                frame_alone_roof_displacement_m: frame_dt,
            };
        }
        // §11
        let level = s.ranking_level;
        let gdir = dcr::governing_direction(&out.x.dcr, &out.y.dcr, level);
        let score = out.get(gdir).dcr.at(level);
        let dcr_max = Levels {
            io: out.x.dcr.io.max(out.y.dcr.io),
            ls: out.x.dcr.ls.max(out.y.dcr.ls),
            cp: out.x.dcr.cp.max(out.y.dcr.cp),
        };
        Sample {
            class: rank::class(&dcr_max, self.short_column),
            score,
            axial_load_ratio: nu,
            directions: out,
        }
    }
}

fn scale_levels(l: &Levels, k: f64) -> Levels {
    Levels {
        io: l.io * k,
        ls: l.ls * k,
        cp: l.cp * k,
    }
}
