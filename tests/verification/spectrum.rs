//! Verification: elastic spectrum (method §5) against EN 1998-1:2004 §3.2.2.2 and
//! ASCE 7-16 §11.4.6. Tolerance 1e-12 (exact arithmetic on tabulated values) unless stated.

use approx::assert_abs_diff_eq;
use seistriage::engine::spectrum::{
    Ec8Params, corner_ts, ec8_params, eta, sa_two_parameter_g, sde_m, se_ec8_g,
};
use seistriage::settings::GroundType::{self, A, B, C, D, E};

const TOL: f64 = 1e-12;

fn check_row(g: GroundType, type2: bool, s: f64, tb: f64, tc: f64, td: f64) {
    let p = ec8_params(g, type2);
    assert_eq!(p, Ec8Params { s, tb, tc, td }, "ground {g} type2 {type2}");
}

#[test]
fn table_3_2_type_1_all_ground_types() {
    // EN 1998-1:2004 Table 3.2 (recommended Type 1 values): S, TB, TC, TD.
    check_row(A, false, 1.00, 0.15, 0.40, 2.0);
    check_row(B, false, 1.20, 0.15, 0.50, 2.0);
    check_row(C, false, 1.15, 0.20, 0.60, 2.0);
    check_row(D, false, 1.35, 0.20, 0.80, 2.0);
    check_row(E, false, 1.40, 0.15, 0.50, 2.0);
}

#[test]
fn table_3_3_type_2_all_ground_types() {
    // EN 1998-1:2004 Table 3.3 (recommended Type 2 values): S, TB, TC, TD.
    check_row(A, true, 1.00, 0.05, 0.25, 1.2);
    check_row(B, true, 1.35, 0.05, 0.25, 1.2);
    check_row(C, true, 1.50, 0.10, 0.25, 1.2);
    check_row(D, true, 1.80, 0.10, 0.30, 1.2);
    check_row(E, true, 1.60, 0.05, 0.25, 1.2);
}

#[test]
fn se_on_each_branch_and_at_each_corner() {
    // EN 1998-1 eqs. (3.2)-(3.5), ground C Type 1 (S 1.15, TB 0.2, TC 0.6, TD 2.0), ag 0.3 g,
    // eta 1. Plateau = ag·S·eta·2.5 = 0.8625 g.
    let p = ec8_params(C, false);
    let ag = 0.3;
    let plateau = 0.3 * 1.15 * 2.5;
    // T = 0: eq. (3.2) gives ag·S.
    assert_abs_diff_eq!(se_ec8_g(0.0, ag, &p, 1.0), 0.345, epsilon = TOL);
    // T = 0.1 (mid of rising branch): ag·S·(1 + 0.5·1.5) = 0.345·1.75.
    assert_abs_diff_eq!(se_ec8_g(0.1, ag, &p, 1.0), 0.345 * 1.75, epsilon = TOL);
    // T = TB and T = TC: plateau, eq. (3.3).
    assert_abs_diff_eq!(se_ec8_g(0.2, ag, &p, 1.0), plateau, epsilon = TOL);
    assert_abs_diff_eq!(se_ec8_g(0.4, ag, &p, 1.0), plateau, epsilon = TOL);
    assert_abs_diff_eq!(se_ec8_g(0.6, ag, &p, 1.0), plateau, epsilon = TOL);
    // T = 1.2: eq. (3.4) plateau·TC/T = plateau/2.
    assert_abs_diff_eq!(se_ec8_g(1.2, ag, &p, 1.0), plateau / 2.0, epsilon = TOL);
    // T = TD: both (3.4) and (3.5) give plateau·0.6/2.
    assert_abs_diff_eq!(se_ec8_g(2.0, ag, &p, 1.0), plateau * 0.3, epsilon = TOL);
    // T = 3: eq. (3.5) plateau·TC·TD/T² = plateau·1.2/9.
    assert_abs_diff_eq!(
        se_ec8_g(3.0, ag, &p, 1.0),
        plateau * 1.2 / 9.0,
        epsilon = TOL
    );
    // Continuity just either side of each corner (1e-9 relative: the branches meet).
    for tcorner in [p.tb, p.tc, p.td] {
        let lo = se_ec8_g(tcorner - 1e-10, ag, &p, 1.0);
        let hi = se_ec8_g(tcorner + 1e-10, ag, &p, 1.0);
        assert_abs_diff_eq!(lo, hi, epsilon = 1e-8);
    }
}

#[test]
fn damping_correction_eq_3_6() {
    // EN 1998-1 eq. (3.6): eta = sqrt(10/(5+xi)) >= 0.55; xi 5 % -> 1; xi 10 % -> sqrt(2/3).
    assert_abs_diff_eq!(eta(5.0, 0.55), 1.0, epsilon = TOL);
    assert_abs_diff_eq!(eta(10.0, 0.55), (10.0f64 / 15.0).sqrt(), epsilon = TOL);
    assert_abs_diff_eq!(eta(40.0, 0.55), 0.55, epsilon = TOL);
}

#[test]
fn displacement_spectrum_eq_3_7() {
    // EN 1998-1 eq. (3.7) SDe = Se·(T/2π)²; method §5 check: Se 0.72 g at 0.5 s → 0.0447 m
    // (tolerance 5e-5 m: the check value is printed to 3 significant figures).
    assert_abs_diff_eq!(sde_m(0.72, 0.5), 0.0447, epsilon = 5e-5);
    // Exact: 0.72·9.81·(0.5/2π)².
    let exact = 0.72 * 9.81 * (0.5 / (2.0 * std::f64::consts::PI)).powi(2);
    assert_abs_diff_eq!(sde_m(0.72, 0.5), exact, epsilon = TOL);
}

#[test]
fn two_parameter_shape_asce7_11_4_6() {
    // ASCE 7-16 §11.4.6: SDS 1.0, SD1 0.6 → Ts 0.6, T0 0.12; TL 4 s.
    let (sds, sd1, tl) = (1.0, 0.6, Some(4.0));
    assert_abs_diff_eq!(corner_ts(sds, sd1), 0.6, epsilon = TOL);
    // eq. (11.4-5): T = 0 → 0.4·SDS; T = T0/2 → SDS(0.4 + 0.3).
    assert_abs_diff_eq!(sa_two_parameter_g(0.0, sds, sd1, tl), 0.4, epsilon = TOL);
    assert_abs_diff_eq!(sa_two_parameter_g(0.06, sds, sd1, tl), 0.7, epsilon = TOL);
    // plateau between T0 and Ts.
    assert_abs_diff_eq!(sa_two_parameter_g(0.12, sds, sd1, tl), 1.0, epsilon = TOL);
    assert_abs_diff_eq!(sa_two_parameter_g(0.6, sds, sd1, tl), 1.0, epsilon = TOL);
    // eq. (11.4-6): SD1/T.
    assert_abs_diff_eq!(sa_two_parameter_g(1.2, sds, sd1, tl), 0.5, epsilon = TOL);
    assert_abs_diff_eq!(sa_two_parameter_g(4.0, sds, sd1, tl), 0.15, epsilon = TOL);
    // eq. (11.4-7): SD1·TL/T².
    assert_abs_diff_eq!(
        sa_two_parameter_g(8.0, sds, sd1, tl),
        0.6 * 4.0 / 64.0,
        epsilon = TOL
    );
    // no TL: SD1/T continues.
    assert_abs_diff_eq!(
        sa_two_parameter_g(8.0, sds, sd1, None),
        0.075,
        epsilon = TOL
    );
}

#[test]
fn importance_factor_and_type_2_in_screening() {
    // EN 1998-1 Table 4.3 recommended γI (school 1.2) scales ag = γI·agR (method §5).
    use super::bldg::{Case, record};
    use seistriage::model::Use;
    use seistriage::settings::{Settings, Spectrum};
    let mut rec = record("S1");
    rec.use_ = Some(Use::School);
    let r = Case::new(rec).screen(&Settings::default());
    assert_abs_diff_eq!(r.detail.gamma_i, 1.2, epsilon = TOL);
    assert_abs_diff_eq!(r.detail.ag_g, 0.36, epsilon = TOL);
    let s2 = Settings {
        spectrum: Spectrum::Ec8Type2,
        ..Settings::default()
    };
    let r2 = Case::new(record("S2")).screen(&s2);
    assert_abs_diff_eq!(r2.directions.x.detail.tc_s, 0.25, epsilon = TOL);
}
