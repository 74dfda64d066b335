/*!
Method §10: flag tests as small functions (soft / weak storey, boundary-element displacement
check, thresholds). The engine in [`super`] assembles the flags of a building from them.
*/

use crate::model::Dir;
use crate::settings::Settings;

use super::resolve::StoreyAreas;

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
