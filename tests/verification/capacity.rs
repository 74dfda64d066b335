//! Verification: chord-rotation capacity (method §8) against EN 1998-3:2005 Annex A,
//! eq. (A.1) for θum, eqs. (A.10b)/(A.11b) for θy, §A.3.2 limit states. Worked calculations
//! below are written out step by step; the reference values are hand calculations (double
//! precision) printed to 13 digits, compared at 1e-12 relative (pure arithmetic), and at
//! 1e-6 against the rounded numbers in the comments. No published worked example of
//! eq. (A.1) with its inputs could be transcribed (see mod.rs).

use approx::{assert_abs_diff_eq, assert_relative_eq};
use seistriage::engine::capacity::{
    A1Input, column_capacity, levels, theta_um_a1, theta_um_member, theta_y_column, theta_y_wall,
    wall_capacity,
};
use seistriage::settings::Settings;

use super::bldg::{Case, record};

#[test]
fn column_worked_example_eq_a1_and_a10b() {
    // Column, no seismic detailing (EN 1998-3 eq. A.1, then ÷1.2 per §A.3.2.2(2) [mem]):
    //   fc 20 MPa, fy 420 MPa, ν 0.1, h 0.40 m, Lv = h1/2 = 1.5 m, ρl 1 %:
    //   ω = ω' = 0.5·0.01·420/20 = 0.105 → bracket (ω'/ω·fc)^0.225 = 20^0.225 = 1.962148
    //   0.3^ν = 0.3^0.1 = 0.886568
    //   (Lv/h)^0.35 = 3.75^0.35 = 1.588221
    //   α·ρsx·fyw/fc = 0.2·0.001·420/20 = 0.0042 → 25^0.0042 = 1.013611
    //   θum(A.1) = (1/1.5)·0.016·0.886568·1.962148·1.588221·1.013611 = 0.0298714
    //   ÷1.2 (not detailed) = 0.0248928
    // θy (eq. A.10b, αV = 0): εy = 420/200000 = 0.0021; φy = 2.1·εy/0.40 = 0.011025 1/m
    //   φy·Lv/3 = 0.0055125; 0.0013·(1 + 1.5·0.4/1.5) = 0.00182;
    //   0.13·φy·db·fy/√fc = 0.13·0.011025·0.016·420/√20 = 0.0021537 → θy = 0.0094862
    let s = Settings::default();
    let c = column_capacity(0.1, 20.0, 420.0, 0.40, 1.5, false, &s);
    assert_abs_diff_eq!(c.theta_um, 0.0248928, epsilon = 1e-6);
    assert_abs_diff_eq!(c.theta_y, 0.0094862, epsilon = 1e-6);
    // detailed (α 0.5, ρsx 0.006: 25^(0.5·0.006·21) = 25^0.063), no ÷1.2:
    //   θum = (1/1.5)·0.016·0.3^0.1·20^0.225·3.75^0.35·25^0.063 = 3.609 555 819 970e-2
    //   (hand calculation, double precision; 1e-12 relative)
    let d = column_capacity(0.1, 20.0, 420.0, 0.40, 1.5, true, &s);
    assert_relative_eq!(d.theta_um, 3.609_555_819_970e-2, max_relative = 1e-12);
}

#[test]
fn wall_worked_example_with_1_6_divisor_and_a11b() {
    // Wall, 4 storeys × 3 m: Lv = Σz²/Σz = 270/30 = 9 m; lw 4 m, fc 20, fy 420, ν 0.1,
    // boundary elements present (α 0.5, ρsx 0.006), boundary steel 1 % (ω = ω' → bracket 20^0.225):
    //   (Lv/lw)^0.35 = 2.25^0.35 = 1.328201; 25^(0.5·0.006·420/20) = 25^0.063 = 1.224814
    //   θum(A.1) = (1/1.5)·0.016·0.886568·1.962148·1.328201·1.224814 = 0.0301861
    //   ÷ 1.6 (walls, EN 1998-3:2005 §A.3.2.2(2) [mem]; the ×0.58 of later papers gave
    //   0.0175079 before revision 6) = 0.0188663
    // θy (eq. A.11b): φy = 2.0·0.0021/4 = 0.00105; φy·Lv/3 = 0.00315;
    //   0.002·(1 − 0.125·9/4) = 0.0014375; 0.13·0.00105·0.016·420/√20 = 0.00020511
    //   → θy = 0.0047926
    let s = Settings::default();
    let w = wall_capacity(0.1, 20.0, 420.0, 4.0, 9.0, true, 1.0, 0.016, &s);
    assert_abs_diff_eq!(w.theta_um, 0.0188663, epsilon = 1e-6);
    assert_abs_diff_eq!(w.theta_y, 0.0047926, epsilon = 1e-6);
    // Without boundary elements: α 0.2, ρsx 0.001 and ÷1.2.
    //   θum(A.1) = (1/1.5)·0.016·0.3^0.1·20^0.225·2.25^0.35·25^0.0042 = 2.498 088 542 408e-2,
    //   ÷ 1.6 ÷ 1.2 = 1.301 087 782 504e-2 (hand calculation, double precision; 1e-12
    //   relative; the 0.58 of later papers would give 1.207e-2)
    let n = wall_capacity(0.1, 20.0, 420.0, 4.0, 9.0, false, 1.0, 0.016, &s);
    assert_relative_eq!(n.theta_um, 1.301_087_782_504e-2, max_relative = 1e-12);
}

#[test]
fn member_factors_1_6_and_1_2() {
    // EN 1998-3:2005 §A.3.2.2(2): walls ÷ 1.6; members without seismic detailing ÷ 1.2 [mem].
    let s = Settings::default();
    assert_abs_diff_eq!(
        theta_um_member(0.03, true, true, &s),
        0.01875,
        epsilon = 1e-15
    );
    assert_abs_diff_eq!(
        theta_um_member(0.03, false, false, &s),
        0.025,
        epsilon = 1e-15
    );
    assert_abs_diff_eq!(
        theta_um_member(0.03, true, false, &s),
        0.015625,
        epsilon = 1e-15
    );
    assert_abs_diff_eq!(
        theta_um_member(0.03, false, true, &s),
        0.03,
        epsilon = 1e-15
    );
}

#[test]
fn eq_a1_mechanical_ratios_floor_and_diagonal_term() {
    // EN 1998-3 eq. (A.1): max(0.01, ω') / max(0.01, ω); 1.25^(100·ρd).
    let base = A1Input {
        nu: 0.0,
        omega: 0.005,
        omega_c: 0.002,
        fc_mpa: 20.0,
        lv_m: 1.0,
        h_m: 1.0,
        alpha: 0.0,
        rho_sx: 0.0,
        fyw_mpa: 420.0,
        rho_d: 0.0,
    };
    // both floored at 0.01 → ratio 1: θ = 0.016·20^0.225 (γel = 1).
    assert_abs_diff_eq!(
        theta_um_a1(&base, 1.0),
        3.139_436_705_880e-2, // 0.016·20^0.225, by hand
        epsilon = 1e-14
    );
    let asym = A1Input {
        omega: 0.2,
        omega_c: 0.1,
        ..base
    };
    assert_abs_diff_eq!(
        theta_um_a1(&asym, 1.0),
        2.686_086_428_996e-2, // 0.016·(0.1/0.2·20)^0.225 = 0.016·10^0.225, by hand
        epsilon = 1e-14
    );
    let diag = A1Input {
        rho_d: 0.01,
        ..base
    };
    assert_abs_diff_eq!(
        theta_um_a1(&diag, 1.0),
        3.924_295_882_350e-2, // 0.016·20^0.225·1.25^(100·0.01), by hand
        epsilon = 1e-14
    );
}

#[test]
fn limit_states_sd_is_three_quarters_of_nc() {
    // EN 1998-3 §A.3.2.3: SD = 3/4·NC; DL = θy (method: IO = min(θy, LS)).
    let s = Settings::default();
    let l = levels(0.004, 0.02, &s);
    assert_abs_diff_eq!(l.cp, 0.02, epsilon = 1e-15);
    assert_abs_diff_eq!(l.ls, 0.015, epsilon = 1e-15);
    assert_abs_diff_eq!(l.io, 0.004, epsilon = 1e-15);
    let brittle = levels(0.02, 0.016, &s);
    assert_abs_diff_eq!(brittle.io, 0.012, epsilon = 1e-15);
}

#[test]
fn theta_y_clamp_for_slender_walls() {
    // Method §8 guard: 0.002·max(0, 1 − 0.125·Lv/h); Lv/h = 10 → 0 (EN 1998-3 A.11b would
    // give a negative term).
    let t = theta_y_wall(0.001, 10.0, 1.0, 0.0, 420.0, 20.0);
    assert_abs_diff_eq!(t, 0.001 * 10.0 / 3.0, epsilon = 1e-15);
    // Column: 0.0013·(1 + 1.5·h/Lv), h = Lv → 0.00325.
    let t = theta_y_column(0.0, 1.0, 1.0, 0.0, 420.0, 20.0);
    assert_abs_diff_eq!(t, 0.00325, epsilon = 1e-15);
}

#[test]
fn confidence_factor_divides_existing_strengths() {
    // EN 1998-3 §3.5 / Table 3.1 [mem-H]: mean strengths ÷ CF for existing members, and
    // ν × CF inside eq. (A.1) (method §8, confidence factor scope: ν = N/(A·fc/CF)).
    // Column of the hand building, CF 1.35 (KL1), by hand:
    //   θum = (1/1.5)·0.016·0.3^(0.08·1.35)·(20/1.35)^0.225·3.75^0.35·25^0.0042 / 1.2
    //       = 2.304 440 588 462e-2 (CF 1.00: 2.549 947 380 872e-2); see also `corrected`.
    let s2 = Settings {
        confidence_factor: 1.35,
        ..Settings::default()
    };
    let r2 = Case::new(record("C2")).screen(&s2);
    assert_relative_eq!(
        r2.directions.x.capacity.columns.unwrap().cp,
        2.304_440_588_462e-2,
        max_relative = 1e-9
    );
}
