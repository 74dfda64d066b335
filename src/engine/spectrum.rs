/*!
Method §5: elastic demand spectra. EN 1998-1 §3.2.2.2 (eqs. 3.2–3.5, Tables 3.2/3.3,
displacement eq. 3.7) and the ASCE 7-16 §11.4.6 two-parameter shape.
*/

use crate::settings::GroundType;

use super::resolve::G;

/// Spectrum shape parameters of one ground type: S, TB, TC, TD (s).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Ec8Params {
    /// Soil factor S.
    pub s: f64,
    /// TB (s).
    pub tb: f64,
    /// TC (s).
    pub tc: f64,
    /// TD (s).
    pub td: f64,
}

const fn p(s: f64, tb: f64, tc: f64, td: f64) -> Ec8Params {
    Ec8Params { s, tb, tc, td }
}

/// EN 1998-1:2004 Table 3.2 (Type 1 elastic spectrum, recommended values), ground types A–E.
pub const EC8_TYPE1: [Ec8Params; 5] = [
    p(1.00, 0.15, 0.40, 2.0),
    p(1.20, 0.15, 0.50, 2.0),
    p(1.15, 0.20, 0.60, 2.0),
    p(1.35, 0.20, 0.80, 2.0),
    p(1.40, 0.15, 0.50, 2.0),
];

/// EN 1998-1:2004 Table 3.3 (Type 2 elastic spectrum, recommended values), ground types A–E.
pub const EC8_TYPE2: [Ec8Params; 5] = [
    p(1.00, 0.05, 0.25, 1.2),
    p(1.35, 0.05, 0.25, 1.2),
    p(1.50, 0.10, 0.25, 1.2),
    p(1.80, 0.10, 0.30, 1.2),
    p(1.60, 0.05, 0.25, 1.2),
];

/// Spectral amplification of the plateau, EN 1998-1 eqs. (3.2)–(3.5).
pub const EC8_PLATEAU: f64 = 2.5;

/// EN 1998-1 Table 3.2 (Type 1) or 3.3 (Type 2) row of a ground type.
pub fn ec8_params(ground: GroundType, type2: bool) -> Ec8Params {
    let i = match ground {
        GroundType::A => 0,
        GroundType::B => 1,
        GroundType::C => 2,
        GroundType::D => 3,
        GroundType::E => 4,
    };
    if type2 { EC8_TYPE2[i] } else { EC8_TYPE1[i] }
}

/// Damping correction η = √(10/(5+ξ)) ≥ η_min (EN 1998-1 eq. 3.6; ξ in %, η_min = 0.55).
pub fn eta(damping_pct: f64, eta_min: f64) -> f64 {
    let v = 10.0 / (5.0 + damping_pct.max(0.0));
    v.sqrt().max(eta_min)
}

/// Elastic spectral acceleration Se(T) in g, EN 1998-1 eqs. (3.2)–(3.5); ag in g, T in s.
pub fn se_ec8_g(t: f64, ag_g: f64, p: &Ec8Params, eta: f64) -> f64 {
    let t = t.max(0.0);
    let plateau = ag_g * p.s * eta * EC8_PLATEAU;
    if t <= p.tb {
        // eq. (3.2)
        ag_g * p.s * (1.0 + t / p.tb * (eta * EC8_PLATEAU - 1.0))
    } else if t <= p.tc {
        // eq. (3.3)
        plateau
    } else if t <= p.td {
        // eq. (3.4)
        plateau * p.tc / t
    } else {
        // eq. (3.5)
        plateau * p.tc * p.td / (t * t)
    }
}

/// ASCE 7-16 §11.4.6 coefficients: Sa = SDS(0.4 + 0.6·T/T0) below T0 = 0.2·SD1/SDS.
pub const ASCE7_SA0: f64 = 0.4;
/// ASCE 7-16 §11.4.6 eq. (11.4-5) slope coefficient.
pub const ASCE7_SLOPE: f64 = 0.6;
/// ASCE 7-16 §11.4.6: T0 = 0.2·Ts.
pub const ASCE7_T0_RATIO: f64 = 0.2;

/// Two-parameter design spectrum Sa(T) in g, ASCE 7-16 §11.4.6 (SDS, SD1 in g, TL in s,
/// `None` = no long-period corner).
pub fn sa_two_parameter_g(t: f64, sds: f64, sd1: f64, tl: Option<f64>) -> f64 {
    let t = t.max(0.0);
    let ts = corner_ts(sds, sd1);
    let t0 = ASCE7_T0_RATIO * ts;
    if t < t0 {
        sds * (ASCE7_SA0 + ASCE7_SLOPE * t / t0)
    } else if t <= ts || t <= 0.0 {
        sds
    } else if tl.is_none_or(|tl| t <= tl) {
        sd1 / t
    } else {
        let tl = tl.unwrap_or(t);
        sd1 * tl / (t * t)
    }
}

/// Corner period Ts = SD1/SDS (s), ASCE 7-16 §11.4.6; 0 when SDS = 0.
pub fn corner_ts(sds: f64, sd1: f64) -> f64 {
    if sds > 0.0 { sd1 / sds } else { 0.0 }
}

/// Elastic displacement spectrum SDe(T) = Se(T)·g·(T/2π)² in m (EN 1998-1 eq. 3.7; Se in g,
/// g = 9.81 m/s²).
pub fn sde_m(se_g: f64, t: f64) -> f64 {
    se_g * G * (t / (2.0 * std::f64::consts::PI)).powi(2)
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn eta_five_percent() {
        assert!((eta(5.0, 0.55) - 1.0).abs() < 1e-12);
        assert!((eta(100.0, 0.55) - 0.55).abs() < 1e-12);
    }
    #[test]
    fn two_param_continuity() {
        let ts = corner_ts(1.0, 0.6);
        assert!((sa_two_parameter_g(ts, 1.0, 0.6, Some(4.0)) - 1.0).abs() < 1e-9);
        assert!((sa_two_parameter_g(0.0, 1.0, 0.6, None) - 0.4).abs() < 1e-12);
        assert!((sa_two_parameter_g(8.0, 1.0, 0.6, Some(4.0)) - 0.6 * 4.0 / 64.0).abs() < 1e-12);
        assert_eq!(sa_two_parameter_g(0.5, 0.0, 0.0, None), 0.0);
    }
}
