/*!
Method §2–§3: base-shear strength coefficient after the JBDPA (2001) first-level screening
form. (The axial load ratio of §2 is [`super::resolve::axial_load_ratio`].)
*/

use crate::settings::Settings;

/// Strength factor β = fc/fc_ref if fc ≤ fc_ref, else √(fc/fc_ref) (fc, fc_ref in MPa;
/// fc_ref = 20 MPa). JBDPA 2001 (linear branch); square-root branch from memory.
pub fn beta(fc_mpa: f64, fc_reference_mpa: f64) -> f64 {
    if fc_reference_mpa <= 0.0 {
        return 1.0;
    }
    if fc_mpa <= fc_reference_mpa {
        fc_mpa / fc_reference_mpa
    } else {
        (fc_mpa / fc_reference_mpa).sqrt()
    }
}

/// Infill shear strength τ_m = infill_weight·τ_w (MPa), consistent with the 1/10 weight of
/// method §1 [screening].
pub fn tau_infill_mpa(s: &Settings) -> f64 {
    s.infill_weight * s.tau_wall_mpa
}

/// RC wall part C_rc,d = β·τ_w·A_cw,d·1000 / W (JBDPA 2001 first-level form; τ_w MPa, A m²,
/// W kN). Existing walls only; new walls are [`new_wall_strength`].
pub fn rc_wall_strength(beta: f64, tau_w: f64, rc_wall_m2: f64, weight_kn: f64) -> f64 {
    if weight_kn > 0.0 {
        beta * tau_w * rc_wall_m2 * 1000.0 / weight_kn
    } else {
        0.0
    }
}

/// Infill part C_m,d = β·τ_m·A_mw,d·1000 / W (method §3; τ_m MPa, A m², W kN).
pub fn infill_strength(beta: f64, tau_m: f64, infill_m2: f64, weight_kn: f64) -> f64 {
    if weight_kn > 0.0 {
        beta * tau_m * infill_m2 * 1000.0 / weight_kn
    } else {
        0.0
    }
}

/// Strength added by new walls β(fc_new)·τ_w·ΔA_d·1000 / W (method §12; τ MPa, ΔA m², W kN).
pub fn new_wall_strength(beta_new: f64, tau_w: f64, added_m2: f64, weight_kn: f64) -> f64 {
    if weight_kn > 0.0 {
        beta_new * tau_w * added_m2 * 1000.0 / weight_kn
    } else {
        0.0
    }
}

/// Column part C_c = β·τ_c·A_col·1000 / W (JBDPA 2001; τ_c MPa for 2 < h0/D ≤ 6).
pub fn column_strength(beta: f64, tau_c: f64, column_m2: f64, weight_kn: f64) -> f64 {
    if weight_kn > 0.0 {
        beta * tau_c * column_m2 * 1000.0 / weight_kn
    } else {
        0.0
    }
}

/// The strength coefficient and which combination gave it (method §3).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Combination {
    /// C_y,d.
    pub cy: f64,
    /// True when the wall-governed combination C_rc + α1·C_c is the larger (strictly).
    pub wall_governed: bool,
    /// The column factor of the larger combination: α1 when wall-governed, else 1.
    pub column_factor: f64,
}

/// C_y,d = C_m,d + max(C_rc,d + α1·C_c, C_c) (method §3, revision 6): the larger of the
/// wall-governed strength (walls plus α1 = 0.7 of the columns, which have not reached
/// their strength at the walls' ultimate drift; JBDPA 2001, from memory) and the
/// column-governed one (columns alone) [screening: continuous with the no-wall case, after
/// the JBDPA practice of taking the larger of its combinations]. A token wall never lowers
/// the strength; with no RC wall C_y = C_m + C_c. Ground storey, (n+1)/(n+i) = 1.
/// `c_rc` holds existing and new RC walls.
pub fn strength_coefficient(c_m: f64, c_rc: f64, alpha1: f64, c_c: f64) -> Combination {
    let wall_governed = c_rc + alpha1 * c_c;
    if wall_governed > c_c {
        Combination {
            cy: c_m + wall_governed,
            wall_governed: true,
            column_factor: alpha1,
        }
    } else {
        Combination {
            cy: c_m + c_c,
            wall_governed: false,
            column_factor: 1.0,
        }
    }
}

/// Strength proxy of one storey in d for the weak-storey flag (method §10): the numerator
/// of C_y,d in the same form as [`strength_coefficient`] (kN/1000 = MPa·m²):
/// β·τ_m·A_mw + max(β·τ_w·A_cw + β_new·τ_w·ΔA + α1·β·τ_c·A_col, β·τ_c·A_col).
/// Areas in m² of that storey (ΔA = new walls, present at every storey), τ in MPa.
#[allow(clippy::too_many_arguments)]
pub fn storey_strength(
    beta: f64,
    beta_new: f64,
    rc_wall_m2: f64,
    added_m2: f64,
    infill_m2: f64,
    column_m2: f64,
    s: &Settings,
) -> f64 {
    let infill = beta * tau_infill_mpa(s) * infill_m2;
    let walls = beta * s.tau_wall_mpa * rc_wall_m2 + beta_new * s.tau_wall_mpa * added_m2;
    let columns = beta * s.tau_column_mpa * column_m2;
    infill + (walls + s.alpha1_with_walls * columns).max(columns)
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn beta_branches() {
        assert!((beta(16.0, 20.0) - 0.8).abs() < 1e-12);
        assert!((beta(20.0, 20.0) - 1.0).abs() < 1e-12);
        assert!((beta(45.0, 20.0) - 1.5).abs() < 1e-12);
    }
    #[test]
    fn strength_by_hand() {
        // W = 9600 kN, walls 4 m², infill 8 m², β 1: C_rc = 2·4·1000/9600 = 0.8333,
        // C_m = 0.2·8·1000/9600 = 0.1667, C_c = 1·4.8·1000/9600 = 0.5.
        let c_rc = rc_wall_strength(1.0, 2.0, 4.0, 9600.0);
        let c_m = infill_strength(1.0, 0.2, 8.0, 9600.0);
        assert!((c_rc - 8000.0 / 9600.0).abs() < 1e-12);
        assert!((c_m - 1600.0 / 9600.0).abs() < 1e-12);
        assert!((column_strength(1.0, 1.0, 4.8, 9600.0) - 0.5).abs() < 1e-12);
        // Wall-governed branch: 0.1667 + max(0.8333 + 0.35, 0.5) = 1.35.
        let c = strength_coefficient(c_m, c_rc, 0.7, 0.5);
        assert!((c.cy - 1.35).abs() < 1e-12);
        assert!(c.wall_governed);
        assert_eq!(c.column_factor, 0.7);
    }

    #[test]
    fn token_wall_takes_the_column_governed_branch() {
        // Column-governed branch: C_rc = 0.01 (a token wall), C_c = 0.5:
        // 0.01 + 0.7·0.5 = 0.36 < 0.5 → C_y = C_m + C_c = 0.1 + 0.5 = 0.6, as without walls.
        let c = strength_coefficient(0.1, 0.01, 0.7, 0.5);
        assert!((c.cy - 0.6).abs() < 1e-12);
        assert!(!c.wall_governed);
        assert_eq!(c.column_factor, 1.0);
        // No RC wall: C_y = C_m + C_c.
        assert!((strength_coefficient(0.1, 0.0, 0.7, 0.5).cy - 0.6).abs() < 1e-12);
        // The switch-over: C_rc = 0.3·C_c gives both branches equal (0.15 + 0.35 = 0.5).
        let c = strength_coefficient(0.0, 0.15, 0.7, 0.5);
        assert!((c.cy - 0.5).abs() < 1e-12);
        // Walls alone (no columns): C_y = C_m + C_rc.
        assert!((strength_coefficient(0.1, 0.4, 0.7, 0.0).cy - 0.5).abs() < 1e-12);
        // Never below the old form C_m + C_rc + 0.7·C_c, never below C_m + C_c.
        for c_rc in [0.0, 0.01, 0.1, 0.2, 0.5, 1.0] {
            let c = strength_coefficient(0.1, c_rc, 0.7, 0.5).cy;
            assert!(c >= 0.1 + c_rc + 0.35 - 1e-12 && c >= 0.6 - 1e-12);
        }
    }

    #[test]
    fn storey_strength_same_form_both_branches() {
        let s = Settings::default();
        // Token wall 0.01 m², columns 2 m², no infill, β = 1: max(0.02 + 1.4, 2) = 2.
        assert!((storey_strength(1.0, 1.0, 0.01, 0.0, 0.0, 2.0, &s) - 2.0).abs() < 1e-12);
        // Walls 4 m², columns 2 m², infill 8 m² (τ_m = 0.2): 1.6 + max(8 + 1.4, 2) = 11.0.
        assert!((storey_strength(1.0, 1.0, 4.0, 0.0, 8.0, 2.0, &s) - 11.0).abs() < 1e-12);
        // New walls 1 m² with β_new 1.5 add 1.5·2·1 = 3: 3 + 1.4 > 2 → 4.4.
        assert!((storey_strength(1.0, 1.5, 0.0, 1.0, 0.0, 2.0, &s) - 4.4).abs() < 1e-12);
    }
}
