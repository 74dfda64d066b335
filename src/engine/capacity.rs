/*!
Method §8: chord-rotation capacity of walls and columns by EN 1998-3:2005 Annex A —
ultimate rotation θum (eq. A.1), yield rotation θy (eqs. A.10b / A.11b), and the three
performance levels (DL = θy, SD = 0.75·θum, NC = θum; §A.3.2) named IO / LS / CP.
*/

use crate::results::Levels;
use crate::settings::Settings;

/// Constants of EN 1998-3 eq. (A.1): θum = (1/γel)·0.016·0.3^ν·[…]^0.225·(Lv/h)^0.35
/// ·25^(α·ρsx·fyw/fc)·1.25^(100·ρd).
pub mod a1 {
    /// Leading coefficient.
    pub const COEFF: f64 = 0.016;
    /// Base of the axial-load term.
    pub const AXIAL_BASE: f64 = 0.3;
    /// Floor on the mechanical steel ratios ω, ω'.
    pub const OMEGA_MIN: f64 = 0.01;
    /// Exponent of the steel/concrete bracket.
    pub const BRACKET_EXP: f64 = 0.225;
    /// Exponent of the shear-span ratio.
    pub const SHEAR_SPAN_EXP: f64 = 0.35;
    /// Base of the confinement term.
    pub const CONFINEMENT_BASE: f64 = 25.0;
    /// Base of the diagonal-bar term.
    pub const DIAGONAL_BASE: f64 = 1.25;
}

/// Constants of the yield rotation, EN 1998-3 eqs. (A.10b) columns / (A.11b) walls.
pub mod theta_y_const {
    /// Shear-span third: φy·Lv/3.
    pub const FLEXURE_DIVISOR: f64 = 3.0;
    /// Shear term of walls: 0.002·(1 − 0.125·Lv/h).
    pub const WALL_SHEAR: f64 = 0.002;
    /// Slope of the wall shear term.
    pub const WALL_SHEAR_SLOPE: f64 = 0.125;
    /// Shear term of columns: 0.0013·(1 + 1.5·h/Lv).
    pub const COLUMN_SHEAR: f64 = 0.0013;
    /// Slope of the column shear term.
    pub const COLUMN_SHEAR_SLOPE: f64 = 1.5;
    /// Bar-slip term: 0.13·φy·db·fy/√fc.
    pub const SLIP: f64 = 0.13;
}

/// Inputs of eq. (A.1) for one member (strengths already divided by the confidence factor
/// where it applies).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct A1Input {
    /// Axial load ratio ν.
    pub nu: f64,
    /// Mechanical ratio of tension steel ω = ρ·fy/fc.
    pub omega: f64,
    /// Mechanical ratio of compression steel ω'.
    pub omega_c: f64,
    /// Concrete strength fc (MPa).
    pub fc_mpa: f64,
    /// Shear span Lv (m).
    pub lv_m: f64,
    /// Section depth h (m).
    pub h_m: f64,
    /// Confinement effectiveness α.
    pub alpha: f64,
    /// Transverse steel ratio ρsx (ratio, not %).
    pub rho_sx: f64,
    /// Transverse steel yield strength fyw (MPa).
    pub fyw_mpa: f64,
    /// Diagonal steel ratio ρd (0 here).
    pub rho_d: f64,
}

/// θum of EN 1998-3 eq. (A.1) before the member-type factors (rad):
/// (1/γel)·0.016·0.3^ν·[max(0.01,ω')/max(0.01,ω)·fc]^0.225·(Lv/h)^0.35·25^(α·ρsx·fyw/fc)
/// ·1.25^(100·ρd).
pub fn theta_um_a1(i: &A1Input, gamma_el: f64) -> f64 {
    let bracket = i.omega_c.max(a1::OMEGA_MIN) / i.omega.max(a1::OMEGA_MIN) * i.fc_mpa;
    let lv_h = if i.h_m > 0.0 { i.lv_m / i.h_m } else { 0.0 };
    let conf = if i.fc_mpa > 0.0 {
        i.alpha * i.rho_sx * i.fyw_mpa / i.fc_mpa
    } else {
        0.0
    };
    1.0 / gamma_el
        * a1::COEFF
        * a1::AXIAL_BASE.powf(i.nu)
        * bracket.max(0.0).powf(a1::BRACKET_EXP)
        * lv_h.max(0.0).powf(a1::SHEAR_SPAN_EXP)
        * a1::CONFINEMENT_BASE.powf(conf)
        * a1::DIAGONAL_BASE.powf(100.0 * i.rho_d)
}

/// Member-type factors on θum (EN 1998-3:2005 §A.3.2.2(2), wording and paragraph number
/// from memory: "in walls the value given by (A.1) is divided by 1.6"): walls ÷
/// `wall_rotation_divisor` (1.6; the ×0.58 of later papers, used before revision 6 of the
/// method, is not the standard's); members without seismic detailing ÷
/// `no_detailing_divisor` (1.2, same clause, from memory).
pub fn theta_um_member(theta_a1: f64, wall: bool, detailed: bool, s: &Settings) -> f64 {
    let mut t = theta_a1;
    if wall && s.wall_rotation_divisor > 0.0 {
        t /= s.wall_rotation_divisor;
    }
    if !detailed && s.no_detailing_divisor > 0.0 {
        t /= s.no_detailing_divisor;
    }
    t
}

/// Yield curvature φy = c·εy/h (1/m; Priestley, Calvi & Kowalsky 2007: c = 2.0 walls with
/// h = lw, 2.1 columns with h = section depth).
pub fn phi_y(coefficient: f64, eps_y: f64, depth_m: f64) -> f64 {
    if depth_m > 0.0 {
        coefficient * eps_y / depth_m
    } else {
        0.0
    }
}

/// Wall yield rotation, EN 1998-3 eq. (A.11b) with αV·z = 0 (rad):
/// θy = φy·Lv/3 + 0.002·max(0, 1 − 0.125·Lv/h) + 0.13·φy·db·fy/√fc
/// (the max(0, …) clamp is method §8's own guard; db m, fy fc MPa).
pub fn theta_y_wall(phi_y: f64, lv_m: f64, h_m: f64, db_m: f64, fy_mpa: f64, fc_mpa: f64) -> f64 {
    use theta_y_const as k;
    let lv_h = if h_m > 0.0 { lv_m / h_m } else { 0.0 };
    phi_y * lv_m / k::FLEXURE_DIVISOR
        + k::WALL_SHEAR * (1.0 - k::WALL_SHEAR_SLOPE * lv_h).max(0.0)
        + slip_term(phi_y, db_m, fy_mpa, fc_mpa)
}

/// Column yield rotation, EN 1998-3 eq. (A.10b) with αV·z = 0 (rad):
/// θy = φy·Lv/3 + 0.0013·(1 + 1.5·h/Lv) + 0.13·φy·db·fy/√fc.
pub fn theta_y_column(phi_y: f64, lv_m: f64, h_m: f64, db_m: f64, fy_mpa: f64, fc_mpa: f64) -> f64 {
    use theta_y_const as k;
    let h_lv = if lv_m > 0.0 { h_m / lv_m } else { 0.0 };
    phi_y * lv_m / k::FLEXURE_DIVISOR
        + k::COLUMN_SHEAR * (1.0 + k::COLUMN_SHEAR_SLOPE * h_lv)
        + slip_term(phi_y, db_m, fy_mpa, fc_mpa)
}

/// Bar-slip term 0.13·φy·db·fy/√fc of EN 1998-3 eqs. (A.10b)/(A.11b) (db m; fy, fc MPa).
pub fn slip_term(phi_y: f64, db_m: f64, fy_mpa: f64, fc_mpa: f64) -> f64 {
    if fc_mpa > 0.0 {
        theta_y_const::SLIP * phi_y * db_m * fy_mpa / fc_mpa.sqrt()
    } else {
        0.0
    }
}

/// Performance levels (EN 1998-3 §A.3.2): CP = θum, LS = 0.75·θum, IO = min(θy, LS), so
/// that IO ≤ LS ≤ CP always holds.
pub fn levels(theta_y: f64, theta_um: f64, s: &Settings) -> Levels {
    let cp = theta_um;
    let ls = s.ls_fraction_of_cp * theta_um;
    Levels {
        io: theta_y.min(ls),
        ls,
        cp,
    }
}

/// Wall shear span Lv = Σz_i² / Σz_i (m): height of the resultant of an inverted-triangle
/// load (method §8; equal storeys give H·(2n+1)/(3n)).
pub fn wall_shear_span_m(z_m: &[f64]) -> f64 {
    let s1: f64 = z_m.iter().sum();
    let s2: f64 = z_m.iter().map(|z| z * z).sum();
    if s1 > 0.0 { s2 / s1 } else { 0.0 }
}

/// Column shear span Lv = h1/2 (m; double curvature in the ground storey, method §8).
pub fn column_shear_span_m(ground_storey_height_m: f64) -> f64 {
    ground_storey_height_m / 2.0
}

/// Mechanical reinforcement ratio ω = ρ·fy/fc (ρ as a ratio; fy, fc MPa).
pub fn mechanical_ratio(rho: f64, fy_mpa: f64, fc_mpa: f64) -> f64 {
    if fc_mpa > 0.0 {
        rho * fy_mpa / fc_mpa
    } else {
        0.0
    }
}

/// Confinement parameters (α, ρsx as a ratio) by detailing (method §8 [screening]).
pub fn confinement(detailed: bool, s: &Settings) -> (f64, f64) {
    if detailed {
        (s.confined_alpha, s.confined_rho_sx_pct / 100.0)
    } else {
        (s.unconfined_alpha, s.unconfined_rho_sx_pct / 100.0)
    }
}

/// Axial load ratio inside the capacity formulas (method §8, confidence factor scope):
/// ν × CF for existing members (= N/(A·fc/CF), fc divided by the confidence factor like the
/// capacity's other terms), ν as given for new walls (known properties, no CF). Used in eq.
/// (A.1), the ASCE 41 Q and the `outside-calibration` check; §2's ν with the mean fc stays
/// for `high-axial-*` and the `boundary-needed` c.
pub fn capacity_axial_ratio(nu: f64, existing: bool, s: &Settings) -> f64 {
    if existing {
        nu * s.confidence_factor
    } else {
        nu
    }
}

/// Capacity of one member: θy, θum (after factors) and the levels.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MemberCapacity {
    /// Yield rotation θy.
    pub theta_y: f64,
    /// Ultimate rotation θum (after member factors).
    pub theta_um: f64,
    /// Levels (Eurocode model).
    pub levels: Levels,
    /// Shear span Lv (m).
    pub lv_m: f64,
    /// Depth h (m).
    pub h_m: f64,
}

/// Wall capacity by EN 1998-3 Annex A (method §8): h = lw, ω = ω' from the boundary steel,
/// confinement by boundary elements, fyw = fy, φy = 2.0·εy/lw.
#[allow(clippy::too_many_arguments)]
pub fn wall_capacity(
    nu: f64,
    fc_mpa: f64,
    fy_mpa: f64,
    lw_m: f64,
    lv_m: f64,
    boundary: bool,
    boundary_steel_pct: f64,
    db_m: f64,
    s: &Settings,
) -> MemberCapacity {
    let omega = mechanical_ratio(boundary_steel_pct / 100.0, fy_mpa, fc_mpa);
    let (alpha, rho_sx) = confinement(boundary, s);
    let inp = A1Input {
        nu,
        omega,
        omega_c: omega,
        fc_mpa,
        lv_m,
        h_m: lw_m,
        alpha,
        rho_sx,
        fyw_mpa: fy_mpa,
        rho_d: 0.0,
    };
    let theta_um = theta_um_member(theta_um_a1(&inp, s.gamma_el), true, boundary, s);
    let eps_y = fy_mpa / s.es_mpa;
    let phi = phi_y(s.phi_y_wall, eps_y, lw_m);
    let theta_y = theta_y_wall(phi, lv_m, lw_m, db_m, fy_mpa, fc_mpa);
    MemberCapacity {
        theta_y,
        theta_um,
        levels: levels(theta_y, theta_um, s),
        lv_m,
        h_m: lw_m,
    }
}

/// Column capacity by EN 1998-3 Annex A (method §8): square section of depth h_c,
/// ω = ω' = 0.5·ρl·fy/fc, Lv = h1/2, φy = 2.1·εy/h_c.
pub fn column_capacity(
    nu: f64,
    fc_mpa: f64,
    fy_mpa: f64,
    depth_m: f64,
    lv_m: f64,
    detailed: bool,
    s: &Settings,
) -> MemberCapacity {
    let omega = 0.5 * mechanical_ratio(s.column_steel_pct / 100.0, fy_mpa, fc_mpa);
    let (alpha, rho_sx) = confinement(detailed, s);
    let inp = A1Input {
        nu,
        omega,
        omega_c: omega,
        fc_mpa,
        lv_m,
        h_m: depth_m,
        alpha,
        rho_sx,
        fyw_mpa: fy_mpa,
        rho_d: 0.0,
    };
    let theta_um = theta_um_member(theta_um_a1(&inp, s.gamma_el), false, detailed, s);
    let eps_y = fy_mpa / s.es_mpa;
    let phi = phi_y(s.phi_y_column, eps_y, depth_m);
    let theta_y = theta_y_column(phi, lv_m, depth_m, db_or(s), fy_mpa, fc_mpa);
    MemberCapacity {
        theta_y,
        theta_um,
        levels: levels(theta_y, theta_um, s),
        lv_m,
        h_m: depth_m,
    }
}

fn db_or(s: &Settings) -> f64 {
    s.default_bar_diameter_m
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn levels_ordered() {
        let s = Settings::default();
        let l = levels(0.01, 0.008, &s);
        assert!(l.io <= l.ls && l.ls <= l.cp);
        assert!((l.io - 0.006).abs() < 1e-12);
    }
    #[test]
    fn wall_divisor_and_detailing_divisor() {
        // EN 1998-3:2005 §A.3.2.2(2): walls ÷ 1.6; not detailed ÷ 1.2 (both from memory).
        let s = Settings::default();
        assert!((theta_um_member(0.016, true, true, &s) - 0.01).abs() < 1e-15);
        assert!((theta_um_member(0.016, false, true, &s) - 0.016).abs() < 1e-15);
        assert!((theta_um_member(0.012, false, false, &s) - 0.01).abs() < 1e-15);
        assert!((theta_um_member(0.0192, true, false, &s) - 0.01).abs() < 1e-15);
        let s2 = Settings {
            wall_rotation_divisor: 2.0,
            ..Settings::default()
        };
        assert!((theta_um_member(0.016, true, true, &s2) - 0.008).abs() < 1e-15);
    }

    #[test]
    fn confidence_factor_scales_nu_of_existing_members_only() {
        let s = Settings {
            confidence_factor: 1.35,
            ..Settings::default()
        };
        assert!((capacity_axial_ratio(0.2, true, &s) - 0.27).abs() < 1e-15);
        assert_eq!(capacity_axial_ratio(0.05, false, &s), 0.05);
        assert_eq!(capacity_axial_ratio(0.2, true, &Settings::default()), 0.2);
        // In eq. (A.1) ν × CF lowers θum by 0.3^(ν·(CF − 1)) besides the fc/CF terms:
        // same fc/CF, ν 0.2 vs 0.27 → ratio 0.3^0.07.
        let a = wall_capacity(
            0.2,
            20.0 / 1.35,
            420.0 / 1.35,
            4.0,
            8.0,
            true,
            1.0,
            0.016,
            &s,
        );
        let b = wall_capacity(
            0.27,
            20.0 / 1.35,
            420.0 / 1.35,
            4.0,
            8.0,
            true,
            1.0,
            0.016,
            &s,
        );
        assert!((b.theta_um / a.theta_um - 0.3f64.powf(0.07)).abs() < 1e-12);
    }

    #[test]
    fn shear_span_equal_storeys() {
        let z = [3.0, 6.0, 9.0, 12.0];
        let lv = wall_shear_span_m(&z);
        assert!((lv - 12.0 * 9.0 / 12.0).abs() < 1e-12);
    }
}
