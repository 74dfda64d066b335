/*!
Method §4: fundamental period by EN 1998-1 §4.3.3.2.2, eqs. (4.6)–(4.8).
*/

/// EN 1998-1 eq. (4.6): T = Ct·H^0.75 (s; H in m, Ct = 0.075 for RC frames).
pub fn period_frame_s(ct: f64, height_m: f64) -> f64 {
    ct * height_m.max(0.0).powf(0.75)
}

/// EN 1998-1 eq. (4.8) term of one wall: A_i·(0.2 + min(lw_i/H, 0.9))² (m²).
pub fn ac_term_m2(area_m2: f64, lw_m: f64, height_m: f64) -> f64 {
    let ratio = if height_m > 0.0 {
        (lw_m / height_m).min(0.9)
    } else {
        0.9
    };
    area_m2 * (0.2 + ratio).powi(2)
}

/// EN 1998-1 eq. (4.7): T = (Ct/√Ac)·H^0.75 (s), Ct = 0.075, Ac in m². `None` when Ac ≤ 0.
pub fn period_wall_s(ct: f64, ac_m2: f64, height_m: f64) -> Option<f64> {
    (ac_m2 > 0.0).then(|| ct / ac_m2.sqrt() * height_m.max(0.0).powf(0.75))
}

/// Method §4 screening rule: T = min(T_frame, T_wall) when walls give Ac > 0, else T_frame.
pub fn formula_period_s(t_frame: f64, t_wall: Option<f64>) -> f64 {
    t_wall.map_or(t_frame, |tw| t_frame.min(tw))
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn eq_4_6_and_4_7() {
        // H = 16 m: 16^0.75 = 8 exactly.
        assert!((period_frame_s(0.075, 16.0) - 0.6).abs() < 1e-12);
        assert!((period_wall_s(0.075, 4.0, 16.0).unwrap() - 0.3).abs() < 1e-12);
        assert!(period_wall_s(0.075, 0.0, 16.0).is_none());
        assert!((ac_term_m2(1.0, 16.0, 16.0) - 1.21).abs() < 1e-12);
    }
}
