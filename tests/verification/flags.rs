//! Verification: flags (method §10) and classes/ranking (method §11) against their sources:
//! ACI 318-19 §18.10.6.2, ASCE 7-16 Table 12.3-2, EN 1998-1 §4.2.3.2(6). Thresholds are
//! tested on both sides; tolerances are exact comparisons unless stated.

use approx::assert_abs_diff_eq;
use seistriage::engine::flags::{
    Soft, beta1, boundary_c_limit_m, boundary_required, neutral_axis_m, soft_storey, weak_storey,
};
use seistriage::engine::rank::{class, rank};
use seistriage::engine::torsion::{PlanWall, check, footprint};
use seistriage::model::{Dir, FootprintVertex, NearFault, SiteInfo, YesNo};
use seistriage::results::Levels;
use seistriage::settings::Settings;

use super::bldg::{Case, has_flag, record, storey, wall};

#[test]
fn aci_318_19_boundary_displacement_check_both_sides() {
    // ACI 318-19 §18.10.6.2(a): special boundary elements when c ≥ lw/(600·1.5·δu/hw),
    // δu/hw ≥ 0.005, applied to walls with hw/lw ≥ 2. lw 4 m, drift 0.01:
    // c_lim = 4/(600·1.5·0.01) = 0.4444 m.
    let s = Settings::default();
    let c_lim = boundary_c_limit_m(4.0, 0.01, &s);
    assert_abs_diff_eq!(c_lim, 4.0 / 9.0, epsilon = 1e-12);
    assert!(boundary_required(12.0, 4.0, c_lim, c_lim, &s)); // c = limit: required (≥)
    assert!(!boundary_required(12.0, 4.0, c_lim * 0.999, c_lim, &s)); // just below
    assert!(!boundary_required(7.96, 4.0, c_lim * 2.0, c_lim, &s)); // hw/lw 1.99 < 2
    assert!(boundary_required(8.0, 4.0, c_lim * 2.0, c_lim, &s)); // hw/lw = 2
    // Drift floor 0.005: a drift of 0.001 uses 0.005.
    assert_abs_diff_eq!(
        boundary_c_limit_m(4.0, 0.001, &s),
        4.0 / 4.5,
        epsilon = 1e-12
    );
    // c estimate (method §10, mem): c = lw(ν + ω_v)/(0.85·β1 + 2ω_v); fc 20, fy 420,
    // ρv 0.25 % → ω_v = 0.0525; β1 = 0.85 (ACI 318-19 Table 22.2.2.4.3, fc ≤ 28 MPa).
    let c = neutral_axis_m(4.0, 0.1, 0.0025, 420.0, 20.0);
    assert_abs_diff_eq!(c, 4.0 * 0.1525 / (0.85 * 0.85 + 0.105), epsilon = 1e-12);
    // β1 (ACI 318-19 Table 22.2.2.4.3): 0.85 ≤ 28 MPa, 0.85 − 0.05(fc − 28)/7, ≥ 0.65.
    assert_abs_diff_eq!(beta1(28.0), 0.85, epsilon = 1e-12);
    assert_abs_diff_eq!(beta1(42.0), 0.75, epsilon = 1e-12);
    assert_abs_diff_eq!(beta1(70.0), 0.65, epsilon = 1e-12);
}

#[test]
fn boundary_needed_flag_in_screening() {
    // High axial load drives c above the limit (ACI 318-19 §18.10.6.2): lw 4 m, H 12 m.
    let mut rec = record("F1");
    rec.floor_weight_kpa = Some(20.0);
    rec.column_area_m2 = 0.5;
    let s = Settings::default();
    let r = Case::new(rec.clone()).screen(&s);
    assert!(
        has_flag(&r, "boundary-needed", Some(Dir::X)),
        "{:?}",
        r.flags
    );
    // With boundary elements recorded the check is satisfied.
    rec.boundary_elements = Some(YesNo::Yes);
    let r = Case::new(rec).screen(&s);
    assert!(!has_flag(&r, "boundary-needed", Some(Dir::X)));
}

#[test]
fn asce7_table_12_3_2_soft_storey_thresholds_both_sides() {
    // ASCE 7-16 Table 12.3-2 type 1a: k1 < 0.70·k2 or < 0.80·mean(k2..k4); type 1b: 0.60/0.70.
    let s = Settings::default();
    assert_eq!(soft_storey(&[0.70, 1.0], &s).0, Soft::None); // exactly 70 %: regular
    assert_eq!(soft_storey(&[0.6999, 1.0], &s).0, Soft::Soft);
    assert_eq!(soft_storey(&[0.60, 1.0], &s).0, Soft::Soft); // exactly 60 %: soft, not extreme
    assert_eq!(soft_storey(&[0.5999, 1.0], &s).0, Soft::Extreme);
    // mean test (needs storeys 2-4): k1/k2 = 0.8 passes 1a ratio, mean 1.0 → 0.8 not < 0.8.
    assert_eq!(soft_storey(&[0.80, 1.0, 1.0, 1.0, 1.0], &s).0, Soft::None);
    assert_eq!(soft_storey(&[0.79, 1.0, 1.0, 1.0], &s).0, Soft::Soft);
    // mean test for extreme: k = [0.69, 0.9, 1.0, 1.1]: k1/k2 = 0.767 (no 1a ratio hit),
    // mean 1.0 → 0.69 < 0.70: extreme.
    assert_eq!(soft_storey(&[0.69, 0.9, 1.0, 1.1], &s).0, Soft::Extreme);
    // with 3 storeys the mean test does not apply.
    assert_eq!(soft_storey(&[0.79, 1.0, 1.0], &s).0, Soft::None);
}

#[test]
fn asce7_table_12_3_2_weak_storey_both_sides() {
    // ASCE 7-16 Table 12.3-2 type 5a: strength < 80 % of the storey above.
    let s = Settings::default();
    assert!(!weak_storey(0.80, 1.0, &s).0);
    assert!(weak_storey(0.7999, 1.0, &s).0);
}

#[test]
fn soft_and_weak_storey_from_the_storeys_sheet_raise_kappa() {
    // Open ground storey: infill removed and taller ground storey. k_i = (A_cw + A_mw/10 + A_col/2)/h.
    // storey 1: (4 + 0 + 1)/4.5 = 1.111; storeys 2-4: (4 + 0.8 + 1)/3 = 1.933 → ratio 0.575.
    let mut rec = record("F2");
    rec.ground_storey_height_m = Some(4.5);
    rec.infill_area_x_m2 = Some(0.0);
    let mut c = Case::new(rec);
    c.storeys = vec![
        storey(1, 4.5, 2.0, 4.0, 0.0, 0.0, 8.0),
        storey(2, 3.0, 2.0, 4.0, 0.0, 8.0, 8.0),
        storey(3, 3.0, 2.0, 4.0, 0.0, 8.0, 8.0),
        storey(4, 3.0, 2.0, 4.0, 0.0, 8.0, 8.0),
    ];
    let s = Settings::default();
    let r = c.screen(&s);
    assert!(
        has_flag(&r, "soft-storey-extreme", Some(Dir::X)),
        "{:?}",
        r.flags
    );
    assert!(
        !has_flag(&r, "soft-storey", Some(Dir::X)),
        "extreme replaces soft"
    );
    assert!(!has_flag(&r, "soft-storey", Some(Dir::Y)));
    assert_abs_diff_eq!(r.directions.x.detail.kappa, s.kappa_soft, epsilon = 1e-15);
    assert_eq!(
        r.directions.x.drift_demand.columns.unwrap(),
        2.5 * r.directions.x.roof_drift_demand
    );
}

#[test]
fn wall_discontinued_and_short_column() {
    // Method §10: walls sheet start storey > 1 → wall-discontinued (ids named);
    // short columns recorded → class 2 at least (method §11).
    let mut rec = record("F3");
    rec.short_columns = Some(YesNo::Yes);
    rec.agr_g = Some(0.01);
    let mut c = Case::new(rec);
    c.walls = vec![
        wall("W1", Dir::X, 4.0, 0.0, 4.0),
        wall("W2", Dir::X, 4.0, 0.0, -4.0),
    ];
    let mut up = wall("W9", Dir::Y, 4.0, 5.0, 0.0);
    up.start_storey = Some(2);
    c.walls.push(up);
    let r = c.screen(&Settings::default());
    let f = r
        .flags
        .iter()
        .find(|f| f.code == "wall-discontinued")
        .unwrap();
    assert_eq!(f.direction, Some(Dir::Y));
    assert!(f.detail.contains("W9"));
    assert!(has_flag(&r, "short-column", None));
    assert!(r.directions.x.dcr.io < 1.0 && r.directions.y.dcr.io < 1.0);
    assert_eq!(r.class, 2);
}

fn rect(lx: f64, ly: f64) -> Vec<(f64, f64)> {
    vec![
        (-lx / 2.0, -ly / 2.0),
        (lx / 2.0, -ly / 2.0),
        (lx / 2.0, ly / 2.0),
        (-lx / 2.0, ly / 2.0),
    ]
}

fn pw(dir: Dir, x: f64, y: f64) -> PlanWall {
    PlanWall {
        dir,
        lw: 4.0,
        tw: 0.25,
        x,
        y,
    }
}

#[test]
fn en1998_1_4_2_3_2_torsion_symmetric_plan() {
    // 20 × 10 m plan: l_s = √((20² + 10²)/12) = 6.455 m. X walls at y = ±4, Y walls at x = ±8,
    // k = 0.25·4³ = 16 each: K_x = K_y = 32, K_θ = 32·16 + 32·64 = 2560,
    // r_x = r_y = √80 = 8.944 m ≥ l_s; e0 = 0 → regular (eqs. 4.1a, 4.1b).
    let fp = footprint(&rect(20.0, 10.0)).unwrap();
    assert_abs_diff_eq!(fp.ip, 20.0 * 10.0 * (400.0 + 100.0) / 12.0, epsilon = 1e-9);
    let walls = [
        pw(Dir::X, 0.0, 4.0),
        pw(Dir::X, 0.0, -4.0),
        pw(Dir::Y, 8.0, 0.0),
        pw(Dir::Y, -8.0, 0.0),
    ];
    let t = check(&walls, &fp, 0.30);
    assert_abs_diff_eq!(t.rx.unwrap(), 80.0f64.sqrt(), epsilon = 1e-12);
    assert_abs_diff_eq!(t.ls, (500.0f64 / 12.0).sqrt(), epsilon = 1e-12);
    assert!(!t.fails_x && !t.fails_y);
}

#[test]
fn en1998_1_4_2_3_2_torsion_eccentric_plan() {
    // X walls moved to y = 4 and y = 2: y_s = 3, e0y = 3 m; K_θ = 16·1 + 16·1 + 2048 = 2080,
    // r_y = √(2080/32) = 8.062 m; 0.30·r_y = 2.419 m < 3 → direction X irregular (eq. 4.1a).
    // Direction Y: e0x = 0 and r_x = 8.062 ≥ l_s 6.455 → regular.
    let fp = footprint(&rect(20.0, 10.0)).unwrap();
    let walls = [
        pw(Dir::X, 0.0, 4.0),
        pw(Dir::X, 0.0, 2.0),
        pw(Dir::Y, 8.0, 0.0),
        pw(Dir::Y, -8.0, 0.0),
    ];
    let t = check(&walls, &fp, 0.30);
    assert_abs_diff_eq!(t.ys.unwrap(), 3.0, epsilon = 1e-12);
    assert_abs_diff_eq!(t.ry.unwrap(), 65.0f64.sqrt(), epsilon = 1e-12);
    assert!(t.fails_x && !t.fails_y);
    // A small eccentricity passes: walls at y = 4.2 / −3.8 → e0y = 0.2 m, K_θ = 2·16·16 + 2048
    // = 2560, r_y = 8.944 m, 0.30·r_y = 2.683 m > 0.2 m.
    let walls = [
        pw(Dir::X, 0.0, 4.2),
        pw(Dir::X, 0.0, -3.8),
        pw(Dir::Y, 8.0, 0.0),
        pw(Dir::Y, -8.0, 0.0),
    ];
    assert!(!check(&walls, &fp, 0.30).fails_x);
    // Screening: the same eccentric walls listed with a footprint raise `torsion` in X only.
    let mut c = Case::new(record("T1"));
    c.walls = vec![
        wall("X1", Dir::X, 4.0, 0.0, 4.0),
        wall("X2", Dir::X, 4.0, 0.0, 2.0),
        wall("Y1", Dir::Y, 4.0, 8.0, 0.0),
        wall("Y2", Dir::Y, 4.0, -8.0, 0.0),
    ];
    c.footprint = rect(20.0, 10.0)
        .into_iter()
        .enumerate()
        .map(|(i, (x, y))| FootprintVertex {
            row: i + 2,
            building_id: "T1".into(),
            vertex: i as f64,
            x_m: x,
            y_m: y,
        })
        .collect();
    let r = c.screen(&Settings::default());
    assert!(has_flag(&r, "torsion", Some(Dir::X)), "{:?}", r.flags);
    assert!(!has_flag(&r, "torsion", Some(Dir::Y)));
}

#[test]
fn near_fault_flag_and_demand_factor() {
    // Method §10 near-fault (ASCE 7-16 §11.4.1 [mem-H]): the site names the triggering trace;
    // near_fault_demand_factor multiplies the spectrum.
    let mut c = Case::new(record("NF"));
    c.site = Some(SiteInfo {
        near_fault: Some(NearFault {
            name: "Invented Ridge".into(),
            distance_m: 4200.0,
            mw: Some(6.6),
            limit_km: 10.0,
        }),
        ..SiteInfo::default()
    });
    let s = Settings {
        near_fault_demand_factor: 1.3,
        ..Settings::default()
    };
    let r = c.screen(&s);
    let f = r.flags.iter().find(|f| f.code == "near-fault").unwrap();
    assert!(
        f.detail.contains("Invented Ridge")
            && f.detail.contains("4.20 km")
            && f.detail.contains("6.6")
    );
    // By hand, EN 1998-1 §3.2.2.2 eq. (3.3): direction Y, T = 0.075·12^0.75 = 0.4836 s on
    // the plateau TB 0.2 ≤ T ≤ TC 0.6 of ground C, Type 1 (Table 3.2, S = 1.15):
    // Se = agR·γI·S·η·2.5 = 0.3·1.0·1.15·1·2.5 = 0.8625 g, × 1.3 = 1.12125 g.
    assert_abs_diff_eq!(r.directions.y.detail.se_g, 1.121_25, epsilon = 1e-12);
}

#[test]
fn class_boundaries_method_11() {
    // Method §11: 1 DCR_CP ≥ 1; 2 DCR_LS ≥ 1; 3 DCR_IO ≥ 1; else 4; short column → ≤ 2.
    let l = |io, ls, cp| Levels { io, ls, cp };
    assert_eq!(class(&l(4.0, 1.5, 1.0), false), 1);
    assert_eq!(class(&l(4.0, 1.5, 0.9999), false), 2);
    assert_eq!(class(&l(2.0, 1.0, 0.8), false), 2);
    assert_eq!(class(&l(2.0, 0.9999, 0.8), false), 3);
    assert_eq!(class(&l(1.0, 0.7, 0.5), false), 3);
    assert_eq!(class(&l(0.9999, 0.7, 0.5), false), 4);
    assert_eq!(class(&l(0.5, 0.4, 0.3), true), 2);
    assert_eq!(class(&l(1.2, 0.4, 0.3), true), 2);
    assert_eq!(class(&l(3.0, 2.0, 1.2), true), 1);
}

#[test]
fn ranking_ties_are_deterministic() {
    // Method §11 order: class, score desc, occupants desc (missing = 0), min PI asc, id bytes.
    let s = Settings::default();
    let mk = |id: &str, occ: Option<u64>| {
        let mut rec = record(id);
        rec.occupants = occ;
        Case::new(rec).screen(&s)
    };
    let mut v = vec![
        mk("b", Some(10)),
        mk("a", None),
        mk("B", None),
        mk("c", Some(0)),
        mk("d", Some(50)),
    ];
    rank(&mut v);
    let ids: Vec<&str> = v.iter().map(|b| b.id.as_str()).collect();
    // identical engineering: occupants 50, 10 first; then 0/missing tie broken by id bytes
    // ("B" 0x42 < "a" 0x61 < "c").
    assert_eq!(ids, ["d", "b", "B", "a", "c"]);
    assert_eq!(
        v.iter().map(|b| b.rank).collect::<Vec<_>>(),
        [1, 2, 3, 4, 5]
    );
    // A higher score outranks occupants; a lower PI breaks a score tie.
    let mut hi = record("z");
    hi.agr_g = Some(0.5);
    let mut v2 = vec![mk("y", Some(1000)), Case::new(hi).screen(&s)];
    rank(&mut v2);
    // agR 0.5 > 0.3 can only raise the DCRs: "z" has a class no worse and a higher score.
    assert_eq!(v2[0].id, "z");
    assert!(v2[0].score > v2[1].score);
}

#[test]
fn defaults_used_canonical_names() {
    // interface.md: canonical names of blank optional inputs.
    let mut rec = record("D1");
    rec.fc_mpa = None;
    rec.floor_weight_kpa = None;
    rec.ground_type = None;
    rec.wall_length_x_m = None;
    rec.use_ = None;
    rec.column_depth_m = None;
    let r = Case::new(rec).screen(&Settings::default());
    for k in [
        "fc_mpa",
        "floor_weight_kpa",
        "ground_type",
        "wall_length_x_m",
        "use",
        "column_depth_m",
    ] {
        assert!(
            r.defaults_used.iter().any(|d| d == k),
            "{k} in {:?}",
            r.defaults_used
        );
    }
    assert!(
        !r.defaults_used.iter().any(|d| d == "wall_length_y_m"),
        "no Y walls: Y length unused"
    );
    assert!(has_flag(&r, "defaults-used", None));
}

#[test]
fn not_screened_reasons() {
    // Method §0: no hazard → not screened; a direction without walls or columns → not screened.
    let mut rec = record("N1");
    rec.agr_g = None;
    let e = Case::new(rec).try_screen(&Settings::default()).unwrap_err();
    assert!(e.iter().any(|m| m.contains("no hazard given")));
    let mut rec = record("N2");
    rec.column_area_m2 = 0.0;
    let e = Case::new(rec).try_screen(&Settings::default()).unwrap_err();
    assert!(e.iter().any(|m| m.contains("direction Y")), "{e:?}");
    let s = Settings {
        spectrum: seistriage::settings::Spectrum::TwoParameter,
        sds_g: Some(1.0),
        ..Settings::default()
    };
    let e = Case::new(record("N3")).try_screen(&s).unwrap_err();
    assert!(e.iter().any(|m| m.contains("no hazard given")));
}

#[test]
fn wall_geometry_axial_and_calibration_flags_both_sides() {
    // Method §10 thresholds: slender-wall H/lw > 12 [practice]; squat-wall Lv/lw < 1.5
    // [practice]; high-axial-wall ν > 0.40 and high-axial-column ν > 0.65 (EN 1998-1
    // §5.4.3.4.1 / §5.4.3.2.1, DCM, mem-H); outside-calibration ν > 0.5, boundary steel outside
    // 0.5–4 %, Lv/h outside 1–8 [practice].
    let s = Settings::default();
    // H = 12 m (4 × 3 m), Lv = 9 m. lw = 1.0 → H/lw = 12 (not > 12); lw 0.99 → 12.12.
    let mut c = Case::new(record("G1"));
    c.walls = vec![
        wall("A", Dir::X, 1.0, 0.0, 0.0),
        wall("B", Dir::Y, 6.0, 0.0, 0.0),
    ];
    let r = c.screen(&s);
    assert!(!has_flag(&r, "slender-wall", Some(Dir::X)));
    // lw 6 → Lv/lw = 1.5 (not < 1.5); Lv/h for wall A = 9 > 8 → outside calibration.
    assert!(!has_flag(&r, "squat-wall", Some(Dir::Y)));
    let oc = r
        .flags
        .iter()
        .find(|f| f.code == "outside-calibration" && f.direction == Some(Dir::X))
        .unwrap();
    assert!(oc.detail.contains("wall A"), "{}", oc.detail);
    assert!(!has_flag(&r, "outside-calibration", Some(Dir::Y)));
    c.walls = vec![
        wall("A", Dir::X, 0.99, 0.0, 0.0),
        wall("B", Dir::Y, 6.01, 0.0, 0.0),
    ];
    let r = c.screen(&s);
    let f = r.flags.iter().find(|f| f.code == "slender-wall").unwrap();
    assert_eq!(f.direction, Some(Dir::X));
    assert!(f.detail.contains("wall A"));
    assert!(has_flag(&r, "squat-wall", Some(Dir::Y)));
    // Boundary steel 4 % is inside, 4.1 % outside.
    let mut w = wall("B", Dir::Y, 4.0, 0.0, 0.0);
    w.boundary_steel_pct = Some(4.0);
    c.walls = vec![wall("A", Dir::X, 4.0, 0.0, 0.0), w.clone()];
    assert!(!has_flag(
        &c.screen(&s),
        "outside-calibration",
        Some(Dir::Y)
    ));
    w.boundary_steel_pct = Some(4.1);
    c.walls = vec![wall("A", Dir::X, 4.0, 0.0, 0.0), w];
    assert!(has_flag(&c.screen(&s), "outside-calibration", Some(Dir::Y)));
    // Axial ratio: ν = W/((A_col + A_cw)·fc·1000) with W = 12·800 = 9600 kN, fc 20.
    // A_col + A_cw = 1.2 m² → ν = 0.40 (not > 0.40); 1.19 → 0.4034.
    let nu_case = |col: f64| {
        let mut rec = record("G2");
        rec.column_area_m2 = col;
        rec.rc_wall_area_x_m2 = Some(0.2);
        rec.rc_wall_area_y_m2 = Some(0.0);
        Case::new(rec).screen(&s)
    };
    let r = nu_case(1.0);
    assert_abs_diff_eq!(r.axial_load_ratio, 0.40, epsilon = 1e-12);
    assert!(!has_flag(&r, "high-axial-wall", None));
    let r = nu_case(0.99);
    assert!(has_flag(&r, "high-axial-wall", None));
    assert!(!has_flag(&r, "high-axial-column", None));
    // ν = 0.65 at A = 9600/13000 = 0.73846 m²; just below that area the column flag appears.
    let r = nu_case(9600.0 / 13000.0 - 0.2 + 1e-9);
    assert!(!has_flag(&r, "high-axial-column", None));
    let r = nu_case(9600.0 / 13000.0 - 0.2 - 1e-3);
    assert!(has_flag(&r, "high-axial-column", None));
    assert!(
        has_flag(&r, "outside-calibration", None),
        "columns with ν > 0.5"
    );
}

#[test]
fn boundary_missing_and_unknown_follow_the_rule_of_section_0() {
    // Method §0/§10: "unknown" is present only when year ≥ boundary_elements_from_year (both
    // known); older → boundary-missing; either unknown → boundary-unknown.
    let mut rec = record("H1");
    rec.boundary_elements = Some(YesNo::Unknown);
    rec.year_built = Some(1995);
    let c = Case::new(rec);
    let r = c.screen(&Settings::default());
    assert!(has_flag(&r, "boundary-unknown", Some(Dir::X)));
    assert!(!has_flag(&r, "boundary-missing", Some(Dir::X)));
    let s = Settings {
        boundary_elements_from_year: Some(1996),
        ..Settings::default()
    };
    let r = c.screen(&s);
    assert!(has_flag(&r, "boundary-missing", Some(Dir::X)));
    assert!(!has_flag(&r, "boundary-unknown", Some(Dir::X)));
    let s = Settings {
        boundary_elements_from_year: Some(1995),
        ..Settings::default()
    };
    let r = c.screen(&s);
    assert!(
        !has_flag(&r, "boundary-missing", Some(Dir::X))
            && !has_flag(&r, "boundary-unknown", Some(Dir::X))
    );
    assert!(
        r.walls[0].boundary_elements,
        "present by the year rule, also for capacity"
    );
    // A wall row's own value overrides the building's.
    let mut c2 = Case::new(record("H2"));
    let mut w = wall("W1", Dir::X, 4.0, 0.0, 0.0);
    w.boundary_elements = Some(YesNo::Yes);
    c2.walls = vec![w, wall("W2", Dir::X, 4.0, 0.0, 0.0)];
    let r = c2.screen(&Settings::default());
    let f = r
        .flags
        .iter()
        .find(|f| f.code == "boundary-missing")
        .unwrap();
    assert!(f.detail.contains("W2") && !f.detail.contains("W1"));
}

#[test]
fn brittle_flag_when_theta_um_below_theta_y() {
    // Method §8/§10: θum < θy → brittle. A heavily loaded, unconfined wall of low-strength
    // concrete in a tall building: ν high → 0.3^ν small.
    let mut rec = record("K1");
    rec.storeys = 12;
    rec.column_area_m2 = 1.0;
    rec.rc_wall_area_x_m2 = Some(3.0);
    rec.wall_length_x_m = Some(12.0);
    rec.fc_mpa = Some(8.0);
    let r = Case::new(rec).screen(&Settings::default());
    let w = &r.walls[0];
    assert!(w.theta_um < w.theta_y, "{} {}", w.theta_um, w.theta_y);
    assert!(has_flag(&r, "brittle", Some(Dir::X)));
    // IO = min(θy, LS) keeps the levels ordered.
    assert!(w.capacity.io <= w.capacity.ls);
    let ok = Case::new(record("K2")).screen(&Settings::default());
    assert!(!has_flag(&ok, "brittle", Some(Dir::X)));
}
