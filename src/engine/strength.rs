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

/// Wall part C_w,d = β·(τ_w·A_cw,d + τ_m·A_mw,d)·1000 / W (JBDPA 2001; τ MPa, A m², W kN).
pub fn wall_strength(
    beta: f64,
    tau_w: f64,
    rc_wall_m2: f64,
    tau_m: f64,
    infill_m2: f64,
    weight_kn: f64,
) -> f64 {
    if weight_kn > 0.0 {
        beta * (tau_w * rc_wall_m2 + tau_m * infill_m2) * 1000.0 / weight_kn
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

/// Column participation α1: `alpha1_with_walls` (0.7) if any RC wall (existing or new) acts
/// in the direction, else 1.0 (JBDPA 2001, from memory).
pub fn alpha1(has_rc_walls: bool, s: &Settings) -> f64 {
    if has_rc_walls {
        s.alpha1_with_walls
    } else {
        1.0
    }
}

/// C_y,d = C_w,d + α1·C_c (JBDPA 2001; ground storey, (n+1)/(n+i) = 1).
pub fn strength_coefficient(c_walls: f64, alpha1: f64, c_columns: f64) -> f64 {
    c_walls + alpha1 * c_columns
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
        // W = 9600 kN, walls 4 m2, infill 8 m2, beta 1: (2*4 + 0.2*8)*1000/9600 = 1.0
        assert!((wall_strength(1.0, 2.0, 4.0, 0.2, 8.0, 9600.0) - 1.0).abs() < 1e-12);
        assert!((column_strength(1.0, 1.0, 4.8, 9600.0) - 0.5).abs() < 1e-12);
        assert!((strength_coefficient(1.0, 0.7, 0.5) - 1.35).abs() < 1e-12);
    }
}
