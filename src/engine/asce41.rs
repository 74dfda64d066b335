/*!
Method §8 alternative: ASCE 41-17 Table 10-19, RC shear walls controlled by flexure —
plastic hinge rotation acceptance criteria at IO / LS / CP, interpolated on the axial term Q
and the shear stress v, clamped outside the table.
*/

use crate::results::Levels;

/// One row of ASCE 41-17 Table 10-19: (a, b, c, IO, LS, CP).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Row {
    /// Modelling parameter a (rad).
    pub a: f64,
    /// Modelling parameter b (rad).
    pub b: f64,
    /// Residual strength ratio c.
    pub c: f64,
    /// Plastic rotation at IO (rad).
    pub io: f64,
    /// Plastic rotation at LS (rad).
    pub ls: f64,
    /// Plastic rotation at CP (rad).
    pub cp: f64,
}

const fn r(a: f64, b: f64, c: f64, io: f64, ls: f64, cp: f64) -> Row {
    Row {
        a,
        b,
        c,
        io,
        ls,
        cp,
    }
}

/// ASCE 41-17 Table 10-19, confined boundary = Yes: [Q≤0.1][v≤4, v≥6], [Q≥0.25][v≤4, v≥6].
pub const CONFINED: [[Row; 2]; 2] = [
    [
        r(0.015, 0.020, 0.75, 0.005, 0.015, 0.020),
        r(0.010, 0.015, 0.40, 0.004, 0.010, 0.015),
    ],
    [
        r(0.009, 0.012, 0.60, 0.003, 0.009, 0.012),
        r(0.005, 0.010, 0.30, 0.0015, 0.005, 0.010),
    ],
];

/// ASCE 41-17 Table 10-19, confined boundary = No.
pub const UNCONFINED: [[Row; 2]; 2] = [
    [
        r(0.008, 0.015, 0.60, 0.002, 0.008, 0.015),
        r(0.006, 0.010, 0.30, 0.002, 0.006, 0.010),
    ],
    [
        r(0.003, 0.005, 0.25, 0.001, 0.003, 0.005),
        r(0.002, 0.004, 0.20, 0.001, 0.002, 0.004),
    ],
];

/// Table breakpoints: Q = 0.1 and 0.25; v = 4 and 6 (√psi units).
pub const Q_LO: f64 = 0.1;
/// Upper Q breakpoint.
pub const Q_HI: f64 = 0.25;
/// Lower v breakpoint (√psi).
pub const V_LO: f64 = 4.0;
/// Upper v breakpoint (√psi).
pub const V_HI: f64 = 6.0;
/// √145.04: converts V/(tw·lw·√fc) from MPa^0.5 to psi^0.5 (1 MPa = 145.04 psi).
pub const SQRT_PSI_PER_MPA: f64 = 12.04;

/// Shear stress term v = 12.04·V/(tw·lw·√fc) in √psi units (V MN, tw lw m, fc MPa).
pub fn shear_stress_psi(v_mn: f64, tw_m: f64, lw_m: f64, fc_mpa: f64) -> f64 {
    let den = tw_m * lw_m * fc_mpa.max(0.0).sqrt();
    if den > 0.0 {
        SQRT_PSI_PER_MPA * v_mn / den
    } else {
        0.0
    }
}

fn frac(x: f64, lo: f64, hi: f64) -> f64 {
    ((x - lo) / (hi - lo)).clamp(0.0, 1.0)
}

fn lerp(a: f64, b: f64, t: f64) -> f64 {
    a + (b - a) * t
}

/// Table 10-19 row at (Q, v): bilinear interpolation between the corners, clamped outside
/// 0.1 ≤ Q ≤ 0.25 and 4 ≤ v ≤ 6 (ASCE 41-17 Table 10-19 note: linear interpolation).
pub fn table_row(q: f64, v: f64, confined: bool) -> Row {
    let t = if confined { &CONFINED } else { &UNCONFINED };
    let tq = frac(q, Q_LO, Q_HI);
    let tv = frac(v, V_LO, V_HI);
    let f = |g: fn(&Row) -> f64| {
        let lo = lerp(g(&t[0][0]), g(&t[0][1]), tv);
        let hi = lerp(g(&t[1][0]), g(&t[1][1]), tv);
        lerp(lo, hi, tq)
    };
    Row {
        a: f(|r| r.a),
        b: f(|r| r.b),
        c: f(|r| r.c),
        io: f(|r| r.io),
        ls: f(|r| r.ls),
        cp: f(|r| r.cp),
    }
}

/// Wall chord-rotation capacity = θy + θp(level) (method §8, ASCE 41 model).
pub fn wall_levels(theta_y: f64, q: f64, v: f64, confined: bool) -> Levels {
    let row = table_row(q, v, confined);
    Levels {
        io: theta_y + row.io,
        ls: theta_y + row.ls,
        cp: theta_y + row.cp,
    }
}

/// Wall shear V_i = min(1, Se(T)/C_y)·β_i·τ_w·A_i (MN; τ_w MPa, A_i m², Se g), its strength
/// share of the base-shear demand (method §8).
pub fn wall_shear_mn(se_g: f64, cy: f64, beta_i: f64, tau_w_mpa: f64, area_m2: f64) -> f64 {
    let share = if cy > 0.0 { (se_g / cy).min(1.0) } else { 1.0 };
    share * beta_i * tau_w_mpa * area_m2
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn corner_and_middle() {
        let c = table_row(0.0, 0.0, true);
        assert_eq!(c, CONFINED[0][0]);
        let m = table_row(0.175, 5.0, false);
        assert!((m.cp - (0.015 + 0.010 + 0.005 + 0.004) / 4.0).abs() < 1e-12);
    }
}
