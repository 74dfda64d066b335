/*!
Method §1: Hassan & Sozen (1997) column, wall and priority indices (ACI Structural
Journal 94(1)). Denominator: total floor area above the base.
*/

/// Column index CI = 0.5·A_col / A_fl · 100 (%). A_col, A_fl in m². Hassan & Sozen 1997.
pub fn column_index_pct(column_area_m2: f64, floor_area_m2: f64) -> f64 {
    if floor_area_m2 > 0.0 {
        0.5 * column_area_m2 / floor_area_m2 * 100.0
    } else {
        0.0
    }
}

/// Wall index WI_d = (A_cw,d + infill_weight·A_mw,d) / A_fl · 100 (%). Hassan & Sozen 1997
/// (infill weight 1/10 by default, setting `infill_weight`).
pub fn wall_index_pct(
    rc_wall_m2: f64,
    infill_m2: f64,
    infill_weight: f64,
    floor_area_m2: f64,
) -> f64 {
    if floor_area_m2 > 0.0 {
        (rc_wall_m2 + infill_m2 * infill_weight) / floor_area_m2 * 100.0
    } else {
        0.0
    }
}

/// Priority index PI_d = WI_d + CI (%). Hassan & Sozen 1997; lower = more vulnerable.
pub fn priority_index_pct(wall_index_pct: f64, column_index_pct: f64) -> f64 {
    wall_index_pct + column_index_pct
}

/// RC wall index WIrc,d = A_cw,d / A_fl · 100 (%) (method §7).
pub fn rc_wall_index_pct(rc_wall_m2: f64, floor_area_m2: f64) -> f64 {
    if floor_area_m2 > 0.0 {
        rc_wall_m2 / floor_area_m2 * 100.0
    } else {
        0.0
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn indices_by_hand() {
        // 4 storeys x 200 m2 = 800 m2; columns 2 m2; walls 4 m2; infill 8 m2.
        assert!((column_index_pct(2.0, 800.0) - 0.125).abs() < 1e-12);
        assert!((wall_index_pct(4.0, 8.0, 0.1, 800.0) - 0.6).abs() < 1e-12);
        assert!((priority_index_pct(0.6, 0.125) - 0.725).abs() < 1e-12);
        assert_eq!(column_index_pct(1.0, 0.0), 0.0);
    }
}
