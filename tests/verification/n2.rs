//! Verification: N2 displacement demand (method §6) against EN 1998-1:2004 Annex B
//! (eqs. B.3, B.7-B.8 and the 3·det* limit). Tolerance 1e-12 unless stated.

use approx::assert_abs_diff_eq;
use seistriage::engine::capacity::wall_shear_span_m;
use seistriage::engine::n2::{
    N2Branch, mode_shape, participation_factor, target_displacement_m, yield_acceleration_g,
};
use seistriage::settings::Settings;

use super::bldg::{Case, record};

const TOL: f64 = 1e-12;

#[test]
fn gamma_equal_storeys_is_3n_over_2n_plus_1() {
    // EN 1998-1 eq. (B.3) with Φ_i = i/n, equal masses: Γ = 3n/(2n+1) (closed form).
    for n in 1..=20u32 {
        let z: Vec<f64> = (1..=n).map(|i| 3.0 * f64::from(i)).collect();
        let g = participation_factor(&mode_shape(&z));
        assert_abs_diff_eq!(
            g,
            3.0 * f64::from(n) / (2.0 * f64::from(n) + 1.0),
            epsilon = TOL
        );
    }
}

#[test]
fn gamma_uses_actual_floor_heights() {
    // Tall ground storey: z = 4.5, 7.5, 10.5 → Φ = 3/7, 5/7, 1; Γ = ΣΦ/ΣΦ² = (15/7)/(83/49) = 105/83.
    let g = participation_factor(&mode_shape(&[4.5, 7.5, 10.5]));
    assert_abs_diff_eq!(g, 105.0 / 83.0, epsilon = TOL);
}

#[test]
fn wall_shear_span_equal_storeys() {
    // Method §8 check: Lv = Σz²/Σz = H·(2n+1)/(3n) for equal storeys.
    for n in 1..=12u32 {
        let z: Vec<f64> = (1..=n).map(|i| 2.8 * f64::from(i)).collect();
        let h = 2.8 * f64::from(n);
        let nf = f64::from(n);
        assert_abs_diff_eq!(
            wall_shear_span_m(&z),
            h * (2.0 * nf + 1.0) / (3.0 * nf),
            epsilon = 1e-9
        );
    }
}

#[test]
fn equal_displacement_rule_t_at_or_above_tc() {
    // EN 1998-1 eq. (B.7): T* ≥ TC → dt* = det* whatever qu is.
    assert_eq!(
        target_displacement_m(0.05, Some(3.0), 0.6, 0.6),
        (0.05, N2Branch::EqualDisplacement)
    );
    assert_eq!(
        target_displacement_m(0.05, Some(3.0), 0.9, 0.6),
        (0.05, N2Branch::EqualDisplacement)
    );
    // T < TC but qu ≤ 1 (elastic response): dt* = det* (eq. B.8 first case).
    assert_eq!(
        target_displacement_m(0.02, Some(1.0), 0.3, 0.6),
        (0.02, N2Branch::EqualDisplacement)
    );
}

#[test]
fn short_period_formula_and_cap() {
    // EN 1998-1 eq. (B.8): dt* = det*/qu·(1 + (qu−1)·TC/T*). det* 0.01 m, qu 2, TC 0.6, T 0.4:
    // 0.005·(1 + 1.5) = 0.0125 m.
    let (dt, b) = target_displacement_m(0.01, Some(2.0), 0.4, 0.6);
    assert_eq!(b, N2Branch::ShortPeriod);
    assert_abs_diff_eq!(dt, 0.0125, epsilon = TOL);
    // 3·det* limit (EN 1998-1 B.5): qu 10, T 0.05: 0.001·(1 + 9·12) = 0.109 → capped 0.03.
    let (dt, _) = target_displacement_m(0.01, Some(10.0), 0.05, 0.6);
    assert_abs_diff_eq!(dt, 0.03, epsilon = TOL);
    // Just below the cap: qu 1.5, T 0.1 → 0.01/1.5·(1 + 0.5·6) = 0.026667 (< 0.03, not capped).
    let (dt, _) = target_displacement_m(0.01, Some(1.5), 0.1, 0.6);
    assert_abs_diff_eq!(dt, 0.01 / 1.5 * 4.0, epsilon = TOL);
}

#[test]
fn yield_acceleration_from_cy() {
    // Method §6: S_ay = C_y·n/(Γ·ΣΦ). n = 4 equal storeys: ΣΦ = 2.5, Γ = 12/9 → S_ay = 1.2·C_y.
    let phi = mode_shape(&[3.0, 6.0, 9.0, 12.0]);
    let g = participation_factor(&phi);
    assert_abs_diff_eq!(yield_acceleration_g(0.5, 4, g, &phi), 0.6, epsilon = TOL);
}

#[test]
fn roof_drift_chain_in_a_screened_building() {
    // Method §6 chain on the hand building (ground C, T in direction Y = frame period 0.484 s
    // < TC 0.6): d_t = Γ·dt*, δ_r = d_t/H with H = 12 m and Γ = 12/9.
    let r = Case::new(record("N1")).screen(&Settings::default());
    let y = &r.directions.y;
    assert_abs_diff_eq!(y.detail.gamma, 12.0 / 9.0, epsilon = TOL);
    assert_abs_diff_eq!(
        y.detail.roof_displacement_m,
        12.0 / 9.0 * y.detail.dt_star_m,
        epsilon = TOL
    );
    assert_abs_diff_eq!(
        y.roof_drift_demand,
        y.detail.roof_displacement_m / 12.0,
        epsilon = TOL
    );
    assert_abs_diff_eq!(y.detail.qu, y.detail.se_g / y.detail.say_g, epsilon = TOL);
}
