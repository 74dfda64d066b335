/*!
Method §7: drift demand on each element group (storey-drift concentration factor κ).
*/

use crate::settings::Settings;

/// Graded κ = κ_frame − (κ_frame − κ_wall)·min(1, WIrc/WI_ref) (method §7: 1.5 for a bare
/// frame to 1.2 when WIrc ≥ 0.5 %; end values practice/mem, grading screening).
pub fn kappa_graded(rc_wall_index_pct: f64, s: &Settings) -> f64 {
    let frac = if s.kappa_wall_index_pct > 0.0 {
        (rc_wall_index_pct / s.kappa_wall_index_pct).clamp(0.0, 1.0)
    } else {
        1.0
    };
    s.kappa_frame - (s.kappa_frame - s.kappa_wall) * frac
}

/// κ of an existing building: κ_soft (2.5) with a soft, extreme-soft or weak storey flag,
/// else the graded value (method §7).
pub fn kappa(rc_wall_index_pct: f64, soft_or_weak: bool, s: &Settings) -> f64 {
    if soft_or_weak {
        s.kappa_soft
    } else {
        kappa_graded(rc_wall_index_pct, s)
    }
}

/// κ with retrofit walls (method §12): once ΔA_d/A_fl·100 ≥ `min_new_wall_index_pct` the
/// graded value with the new walls; below, min(κ before, κ with the new walls).
pub fn kappa_retrofit(
    kappa_before: f64,
    added_index_pct: f64,
    rc_wall_index_with_new_pct: f64,
    soft_or_weak_after: bool,
    s: &Settings,
) -> f64 {
    if added_index_pct >= s.min_new_wall_index_pct && added_index_pct > 0.0 {
        kappa_graded(rc_wall_index_with_new_pct, s)
    } else {
        kappa_before.min(kappa(rc_wall_index_with_new_pct, soft_or_weak_after, s))
    }
}

/// Wall drift demand δ_w = δ_r (method §7: cantilever chord rotation ≈ roof drift).
pub fn wall_drift(roof_drift: f64) -> f64 {
    roof_drift
}

/// Column drift demand δ_c = κ·δ_r (method §7).
pub fn column_drift(kappa: f64, roof_drift: f64) -> f64 {
    kappa * roof_drift
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn kappa_grading() {
        let s = Settings::default();
        assert!((kappa_graded(0.0, &s) - 1.5).abs() < 1e-12);
        assert!((kappa_graded(0.25, &s) - 1.35).abs() < 1e-12);
        assert!((kappa_graded(2.0, &s) - 1.2).abs() < 1e-12);
        assert!((kappa(0.25, true, &s) - 2.5).abs() < 1e-12);
        // below the min index: never raised
        assert!((kappa_retrofit(1.3, 0.1, 0.3, true, &s) - 1.3).abs() < 1e-12);
        assert!((kappa_retrofit(2.5, 0.3, 0.6, true, &s) - 1.2).abs() < 1e-12);
    }
}
