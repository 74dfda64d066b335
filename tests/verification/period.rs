//! Verification: fundamental period (method §4) against EN 1998-1:2004 §4.3.3.2.2,
//! eqs. (4.6)-(4.8), on a hand-computed building. Tolerance 1e-12 s (closed forms).

use approx::assert_abs_diff_eq;
use seistriage::model::Dir;
use seistriage::settings::Settings;

use super::bldg::{Case, has_flag, record, wall};

const TOL: f64 = 1e-12;

#[test]
fn eq_4_6_frame_and_4_7_4_8_walls_by_hand() {
    // Building: 4 storeys × 3 m → H = 12 m; X walls: one representative wall group of 4 m²,
    // lw 4 m; Y: no RC walls.
    let r = Case::new(record("P1")).screen(&Settings::default());
    let h075 = 12.0f64.powf(0.75); // 6.4474...
    // EN 1998-1 eq. (4.6): T = 0.075·H^0.75.
    let t_frame = 0.075 * h075;
    assert_abs_diff_eq!(r.directions.y.period_s, t_frame, epsilon = TOL);
    assert_abs_diff_eq!(r.directions.x.detail.period_frame_s, t_frame, epsilon = TOL);
    // EN 1998-1 eq. (4.8): Ac = 4·(0.2 + 4/12)² = 4·0.28444 = 1.137777...
    let ac = 4.0 * (0.2f64 + 4.0 / 12.0).powi(2);
    assert_abs_diff_eq!(r.directions.x.detail.ac_m2, ac, epsilon = TOL);
    // EN 1998-1 eq. (4.7): T = 0.075/√Ac·H^0.75 (shorter than the frame period here).
    let t_wall = 0.075 / ac.sqrt() * h075;
    assert_abs_diff_eq!(r.directions.x.period_s, t_wall, epsilon = TOL);
    assert!(t_wall < t_frame);
}

#[test]
fn eq_4_8_clamps_lw_over_h_at_0_9() {
    // EN 1998-1 eq. (4.8): lw/H ≤ 0.9. Walls listed along Y: lw 16 m (16/12 → 0.9) and
    // lw 6 m (0.5). Ac = 4·(1.1)² + 1.5·(0.7)² = 4.84 + 0.735.
    let mut c = Case::new(record("P2"));
    c.walls = vec![
        wall("W1", Dir::Y, 16.0, 0.0, 0.0),
        wall("W2", Dir::Y, 6.0, 0.0, 0.0),
    ];
    c.walls.push(wall("WX", Dir::X, 4.0, 0.0, 0.0));
    let r = c.screen(&Settings::default());
    assert_abs_diff_eq!(
        r.directions.y.detail.ac_m2,
        4.0 * 1.21 + 1.5 * 0.49,
        epsilon = TOL
    );
}

#[test]
fn period_factor_input_period_and_new_wall_scaling() {
    // Method §4 order: formula × period_factor; input replaces the product; new walls scale
    // by T_formula(with)/T_formula(without).
    let s = Settings {
        period_factor: 1.4,
        ..Settings::default()
    };
    let base = Case::new(record("P3"));
    let r = base.screen(&s);
    let t_formula = r.directions.x.detail.period_formula_s;
    assert_abs_diff_eq!(r.directions.x.period_s, 1.4 * t_formula, epsilon = TOL);
    let mut rec = record("P4");
    rec.period_x_s = Some(0.9);
    let r_in = Case::new(rec.clone()).screen(&s);
    assert_abs_diff_eq!(r_in.directions.x.period_s, 0.9, epsilon = TOL);
    assert_eq!(r_in.directions.x.detail.period_source, "input");
    // Add 2 m² of new walls along X (lw 5 m): Ac' = Ac + 2·(0.2 + 5/12)².
    let r_new = Case::new(rec).with(&s, 2.0, 0.0);
    let ac = 4.0 * (0.2f64 + 4.0 / 12.0).powi(2);
    let ac_new = ac + 2.0 * (0.2f64 + 5.0 / 12.0).powi(2);
    let ratio = (1.0 / ac_new.sqrt()) / (1.0 / ac.sqrt());
    assert_abs_diff_eq!(r_new.directions.x.period_s, 0.9 * ratio, epsilon = TOL);
    // Y has no new walls: unchanged.
    assert_abs_diff_eq!(
        r_new.directions.y.period_s,
        1.4 * 0.075 * 12.0f64.powf(0.75),
        epsilon = TOL
    );
}

#[test]
fn period_range_flag_above_40_m() {
    // EN 1998-1 §4.3.3.2.2(3): the formula applies to buildings up to 40 m.
    let mut rec = record("P5");
    rec.storeys = 13;
    rec.storey_height_m = Some(3.0);
    rec.ground_storey_height_m = Some(3.0); // H = 39 m
    let r = Case::new(rec.clone()).screen(&Settings::default());
    assert!(!has_flag(&r, "period-range", None));
    rec.storeys = 14; // H = 42 m
    let r = Case::new(rec).screen(&Settings::default());
    assert!(has_flag(&r, "period-range", None));
}
