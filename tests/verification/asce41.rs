//! Verification: ASCE 41-17 Table 10-19 (RC shear walls controlled by flexure), plastic
//! hinge rotations at IO/LS/CP with linear interpolation on Q and v, clamped outside the
//! table (method §8). Tolerance 1e-15 (tabulated values and linear interpolation).

use approx::assert_abs_diff_eq;
use seistriage::engine::asce41::{Row, shear_stress_psi, table_row, wall_levels, wall_shear_mn};
use seistriage::settings::{CapacityModel, Settings};

use super::bldg::{Case, record};

const TOL: f64 = 1e-15;

fn eq(a: Row, b: (f64, f64, f64, f64, f64, f64)) {
    assert_abs_diff_eq!(a.a, b.0, epsilon = TOL);
    assert_abs_diff_eq!(a.b, b.1, epsilon = TOL);
    assert_abs_diff_eq!(a.c, b.2, epsilon = TOL);
    assert_abs_diff_eq!(a.io, b.3, epsilon = TOL);
    assert_abs_diff_eq!(a.ls, b.4, epsilon = TOL);
    assert_abs_diff_eq!(a.cp, b.5, epsilon = TOL);
}

#[test]
fn all_eight_rows_at_their_corners() {
    // ASCE 41-17 Table 10-19, rows (a, b, c | IO, LS, CP):
    eq(
        table_row(0.1, 4.0, true),
        (0.015, 0.020, 0.75, 0.005, 0.015, 0.020),
    ); // Q≤0.1 v≤4 Yes
    eq(
        table_row(0.1, 6.0, true),
        (0.010, 0.015, 0.40, 0.004, 0.010, 0.015),
    ); // Q≤0.1 v≥6 Yes
    eq(
        table_row(0.25, 4.0, true),
        (0.009, 0.012, 0.60, 0.003, 0.009, 0.012),
    ); // Q≥.25 v≤4 Yes
    eq(
        table_row(0.25, 6.0, true),
        (0.005, 0.010, 0.30, 0.0015, 0.005, 0.010),
    ); // Q≥.25 v≥6 Yes
    eq(
        table_row(0.1, 4.0, false),
        (0.008, 0.015, 0.60, 0.002, 0.008, 0.015),
    ); // Q≤0.1 v≤4 No
    eq(
        table_row(0.1, 6.0, false),
        (0.006, 0.010, 0.30, 0.002, 0.006, 0.010),
    ); // Q≤0.1 v≥6 No
    eq(
        table_row(0.25, 4.0, false),
        (0.003, 0.005, 0.25, 0.001, 0.003, 0.005),
    ); // Q≥.25 v≤4 No
    eq(
        table_row(0.25, 6.0, false),
        (0.002, 0.004, 0.20, 0.001, 0.002, 0.004),
    ); // Q≥.25 v≥6 No
}

#[test]
fn clamped_outside_the_table() {
    // Table 10-19 gives "≤ 0.1", "≥ 0.25", "≤ 4", "≥ 6": values beyond are the edge rows.
    eq(
        table_row(0.0, 0.0, true),
        (0.015, 0.020, 0.75, 0.005, 0.015, 0.020),
    );
    eq(
        table_row(0.6, 20.0, true),
        (0.005, 0.010, 0.30, 0.0015, 0.005, 0.010),
    );
    eq(
        table_row(-1.0, 9.0, false),
        (0.006, 0.010, 0.30, 0.002, 0.006, 0.010),
    );
    eq(
        table_row(0.9, 1.0, false),
        (0.003, 0.005, 0.25, 0.001, 0.003, 0.005),
    );
}

#[test]
fn linear_interpolation_between_rows() {
    // ASCE 41-17 Table 10-19 note: linear interpolation between listed values.
    // v = 5 midway, Q = 0.1, confined: CP (0.020 + 0.015)/2 = 0.0175.
    assert_abs_diff_eq!(table_row(0.1, 5.0, true).cp, 0.0175, epsilon = TOL);
    // Q = 0.175 midway, v = 4, unconfined: LS (0.008 + 0.003)/2 = 0.0055.
    assert_abs_diff_eq!(table_row(0.175, 4.0, false).ls, 0.0055, epsilon = TOL);
    // Both midway, confined IO: (0.005 + 0.004 + 0.003 + 0.0015)/4 = 0.003375.
    assert_abs_diff_eq!(table_row(0.175, 5.0, true).io, 0.003375, epsilon = TOL);
    // Quarter points: Q = 0.1375 (t = 0.25), v = 4.5 (t = 0.25), unconfined CP:
    // lo = 0.015 + 0.25·(0.010 − 0.015) = 0.01375; hi = 0.005 + 0.25·(0.004 − 0.005) = 0.00475
    // → 0.01375 + 0.25·(0.00475 − 0.01375) = 0.0115.
    assert_abs_diff_eq!(table_row(0.1375, 4.5, false).cp, 0.0115, epsilon = 1e-12);
}

#[test]
fn capacity_is_yield_plus_plastic_rotation() {
    // Method §8: wall capacity = θy + θp(level).
    let l = wall_levels(0.004, 0.1, 4.0, true);
    assert_abs_diff_eq!(l.io, 0.009, epsilon = TOL);
    assert_abs_diff_eq!(l.ls, 0.019, epsilon = TOL);
    assert_abs_diff_eq!(l.cp, 0.024, epsilon = TOL);
}

#[test]
fn shear_stress_in_root_psi_units() {
    // v = V/(tw·lw·√fc') in psi units; 1 MPa = 145.04 psi, √145.04 = 12.04.
    // V = 1 MN, tw 0.25 m, lw 4 m, fc 25 MPa: 1/(1·5) = 0.2 √MPa → 0.2·12.04 = 2.408 √psi.
    assert_abs_diff_eq!(
        shear_stress_psi(1.0, 0.25, 4.0, 25.0),
        2.408,
        epsilon = 1e-12
    );
    // Method §8: V_i = min(1, Se/C_y)·β·τ_w·A_i (MN).
    assert_abs_diff_eq!(wall_shear_mn(0.5, 1.0, 1.0, 2.0, 1.0), 1.0, epsilon = TOL);
    assert_abs_diff_eq!(wall_shear_mn(2.0, 1.0, 1.0, 2.0, 1.0), 2.0, epsilon = TOL);
}

#[test]
fn model_selection_in_screening() {
    // asce41 walls: θy + table; lower-of-both: per-level minimum; columns keep A.1.
    let c = Case::new(record("A1"));
    let ec = c.screen(&Settings::default());
    let a = c.screen(&Settings {
        capacity_model: CapacityModel::Asce41,
        ..Settings::default()
    });
    let lb = c.screen(&Settings {
        capacity_model: CapacityModel::LowerOfBoth,
        ..Settings::default()
    });
    let (we, wa, wl) = (
        ec.directions.x.capacity.walls.unwrap(),
        a.directions.x.capacity.walls.unwrap(),
        lb.directions.x.capacity.walls.unwrap(),
    );
    assert_abs_diff_eq!(wl.cp, we.cp.min(wa.cp), epsilon = TOL);
    assert_abs_diff_eq!(wl.ls, we.ls.min(wa.ls), epsilon = TOL);
    assert_abs_diff_eq!(wl.io, we.io.min(wa.io), epsilon = TOL);
    assert_eq!(
        ec.directions.x.capacity.columns,
        a.directions.x.capacity.columns
    );
    // asce41 capacity exceeds θy by at least the smallest IO plastic rotation (0.001).
    let w = &a.walls[0];
    assert!(w.capacity.io >= w.theta_y + 0.001 - 1e-15);
}
