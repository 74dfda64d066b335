//! Tests: retrofit sizing, cost and the budget walk (method §12).

use std::cell::RefCell;

use proptest::prelude::*;
use seistriage::engine::{self, BuildingInput, NewWalls};
use seistriage::model::{BuildingRecord, Dir, PerDir, Use};
use seistriage::results::{BuildingResult, Governing, Group, Retrofit};
use seistriage::retrofit::{self, budget, cost, sizing};
use seistriage::settings::{CapacityModel, Level, Settings};

// ---------------------------------------------------------------------------------------
// The bisection loop (method §12), on synthetic monotone curves.

proptest! {
    /// On a monotone non-increasing curve DCR(a) = d0·exp(−a/s) the loop of method §12
    /// reports a feasible area within one tolerance above the exact root, evaluates only
    /// points inside [lo, hi], keeps the bracket (every point moved to hi is feasible,
    /// every point moved to lo is not), and the reported area never grows when the target
    /// is relaxed (monotone).
    #[test]
    fn bisection_on_monotone_curves(
        d0 in 1.01f64..5.0,
        s in 0.5f64..50.0,
        lo in 0.1f64..3.0,
        span in 0.5f64..60.0,
        tol in 0.001f64..0.5,
        target in 0.5f64..1.5,
    ) {
        let hi = lo + span;
        let dcr = |a: f64| d0 * (-a / s).exp();
        let calls = RefCell::new(Vec::new());
        let r = sizing::bisect(lo, hi, tol, 60, |a| { calls.borrow_mut().push(a); dcr(a) }, target);
        for &a in calls.borrow().iter() {
            prop_assert!(a >= lo && a <= hi);
        }
        let root = s * (d0 / target).ln(); // dcr(root) = target
        match r {
            None => prop_assert!(dcr(hi) > target),
            Some(a) => {
                prop_assert!(dcr(a) <= target);
                if root <= lo {
                    prop_assert_eq!(a, lo);
                } else {
                    prop_assert!(a >= root - 1e-9 && a - root <= tol + 1e-9, "{} vs {}", a, root);
                }
                // relaxing the target never asks for more wall
                let relaxed = sizing::bisect(lo, hi, tol, 60, dcr, target * 1.1);
                prop_assert!(relaxed.is_some_and(|b| b <= a + 1e-12));
            }
        }
    }
}

#[test]
fn bisection_every_branch() {
    // one wall suffices → lo
    assert_eq!(
        sizing::bisect(1.25, 15.0, 0.075, 60, |_| 0.7, 1.0),
        Some(1.25)
    );
    // cap not enough → None
    assert_eq!(sizing::bisect(1.25, 15.0, 0.075, 60, |_| 1.2, 1.0), None);
    // one wall exceeds the cap → None
    assert_eq!(sizing::bisect(1.25, 0.75, 0.01, 60, |_| 0.0, 1.0), None);
    // loop, traced by hand: threshold 5.3, lo 1, hi 9, tol 0.5 → 5, 7, 6, 5.5 → 5.5
    let r = sizing::bisect(1.0, 9.0, 0.5, 60, |a| if a >= 5.3 { 0.9 } else { 1.1 }, 1.0);
    assert_eq!(r, Some(5.5));
    // iteration guard: tol 0 stops after max_iter halvings (hi − 0.3 ≤ 1/2^5)
    let r = sizing::bisect(0.0, 1.0, 0.0, 5, |a| if a >= 0.3 { 0.0 } else { 2.0 }, 1.0);
    assert!(r.is_some_and(|h| h >= 0.3 && h - 0.3 <= 1.0 / 32.0));
}

// ---------------------------------------------------------------------------------------
// Cost arithmetic on a hand example (method §12).

#[test]
fn cost_hand_example() {
    // ΔA_x = 2.5, ΔA_y = 1.25 m²; H = 12 m; A_fl = 4·300 = 1200 m².
    // Wall volume 3.75·12 = 45 m³ → 45·900 = 40 500; floor 1200·60 = 72 000;
    // retrofit cost 112 500. Replacement 1200·700 = 840 000; 0.40·840 000 = 336 000.
    let s = Settings {
        unit_cost_wall_m3: Some(900.0),
        unit_cost_floor_m2: Some(60.0),
        replacement_cost_m2: Some(700.0),
        ..Settings::default()
    };
    let mut r = Retrofit {
        added_wall_area_m2: PerDir {
            x: Some(2.5),
            y: Some(1.25),
        },
        ..Retrofit::default()
    };
    cost::apply(&mut r, 12.0, 1200.0, 300.0, &s);
    assert!((r.cost.unwrap() - 112_500.0).abs() < 1e-6);
    assert!((r.replacement_cost.unwrap() - 840_000.0).abs() < 1e-6);
    assert_eq!(r.replace, Some(false));
    // replace_ratio 0.10 → 84 000 < 112 500 → replace
    let s2 = Settings {
        replace_ratio: 0.10,
        ..s
    };
    cost::apply(&mut r, 12.0, 1200.0, 300.0, &s2);
    assert_eq!(r.replace, Some(true));
    assert_eq!(cost::funding_cost(&r), Some(840_000.0));
}

// ---------------------------------------------------------------------------------------
// The budget walk: skip what does not fit, keep walking.

fn ranked(rank: usize, class: u8, occupants: u64, cost: f64) -> BuildingResult {
    BuildingResult {
        id: format!("B{rank}"),
        name: String::new(),
        district: String::new(),
        use_: Use::Residential,
        occupants: Some(occupants),
        latitude: None,
        longitude: None,
        fault: None,
        rank,
        class,
        score: 1.5,
        governing: Governing {
            direction: Dir::X,
            group: Group::Walls,
            level: Level::Ls,
            frame_alone: false,
        },
        axial_load_ratio: 0.1,
        strength_coefficient: PerDir { x: 0.2, y: 0.2 },
        directions: PerDir::default(),
        flags: Vec::new(),
        defaults_used: Vec::new(),
        retrofit: Some(Retrofit {
            added_wall_area_m2: PerDir {
                x: Some(1.25),
                y: Some(0.0),
            },
            cost: Some(cost),
            replacement_cost: Some(10.0 * cost),
            replace: Some(false),
            ..Retrofit::default()
        }),
        uncertainty: None,
        row: rank + 1,
        detail: Default::default(),
        walls: Vec::new(),
    }
}

#[test]
fn budget_walk_skips_and_continues() {
    let s = Settings {
        unit_cost_wall_m3: Some(1.0),
        unit_cost_floor_m2: Some(1.0),
        replacement_cost_m2: Some(1.0),
        budget: Some(1000.0),
        ..Settings::default()
    };
    let mut rs = vec![
        ranked(1, 1, 50, 700.0),
        ranked(2, 1, 80, 400.0), // 700 + 400 > 1000: skipped
        ranked(3, 2, 10, 250.0), // fits: 950
        ranked(4, 3, 0, 100.0),  // does not fit (1050)
        ranked(5, 4, 0, 50.0),   // fits exactly: 1000
    ];
    // a class 4 building without a retrofit is not in the walk
    rs.push(ranked(6, 4, 0, 1.0));
    rs[5].retrofit = None;
    let plan = retrofit::budget_plan(&mut rs, &s).unwrap();
    assert_eq!(plan.priority_walk.funded, vec!["B1", "B3", "B5"]);
    assert_eq!(plan.priority_walk.cost, 1000.0);
    assert_eq!(plan.priority_walk.occupants_protected, 60);
    let funded: Vec<Option<bool>> = rs
        .iter()
        .map(|r| r.retrofit.as_ref().and_then(|f| f.funded))
        .collect();
    assert_eq!(
        funded,
        vec![
            Some(true),
            Some(false),
            Some(true),
            Some(false),
            Some(true),
            None
        ]
    );
    // max occupants: B2 + B3 (650, 90 occupants) beats the walk's 60
    assert_eq!(plan.max_occupants.funded, vec!["B2", "B3"]);
    assert_eq!(plan.max_occupants.occupants_protected, 90);
    assert!(
        plan.max_occupants
            .method
            .as_deref()
            .unwrap()
            .contains("knapsack")
    );
    let json = serde_json::to_value(&plan).unwrap();
    assert!(json["priority_walk"].get("method").is_none());
    assert!(json["max_occupants"]["method"].is_string());
}

#[test]
fn budget_walk_is_pure_rank_order() {
    let items: Vec<budget::Item> = [(900.0, 5), (200.0, 50), (100.0, 1)]
        .iter()
        .enumerate()
        .map(|(k, &(c, o))| budget::Item {
            index: k,
            id: format!("B{}", k + 1),
            rank: k + 1,
            cost: c,
            occupants: o,
            life_safety: true,
        })
        .collect();
    let w = budget::priority_walk(&items, 1000.0);
    assert_eq!(w.members, vec![0, 2]);
}

// ---------------------------------------------------------------------------------------
// Sizing over the full method (needs the engine).

fn record(
    storeys: u32,
    plan_area: f64,
    col_area: f64,
    wall_x: f64,
    wall_y: f64,
    agr: f64,
) -> BuildingRecord {
    BuildingRecord {
        row: 2,
        id: "R1".into(),
        name: "Invented block".into(),
        storeys,
        plan_area_m2: plan_area,
        column_area_m2: col_area,
        rc_wall_area_x_m2: Some(wall_x),
        rc_wall_area_y_m2: Some(wall_y),
        agr_g: Some(agr),
        occupants: Some(40),
        ..BuildingRecord::default()
    }
}

fn input(rec: &BuildingRecord) -> BuildingInput<'_> {
    BuildingInput {
        record: rec,
        walls: Vec::new(),
        storeys: Vec::new(),
        footprint: Vec::new(),
        site: None,
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(40))]

    /// Method §12: under each capacity model (the ASCE 41 one need not be monotone: the
    /// reported area itself is checked), whenever a wall area is reported for a direction,
    /// re-screening the building with the sized walls of both directions gives
    /// DCR_LS ≤ target in that direction (the bisection reports the feasible end of its
    /// bracket, so no tolerance is needed on the DCR itself; 1e-9 covers re-computation
    /// noise); an area is at least one new wall and at most the cap; a null direction is
    /// infeasible at the cap.
    #[test]
    fn sized_walls_meet_the_target(
        storeys in 2u32..10,
        plan_area in 150.0f64..900.0,
        col_pct in 0.15f64..1.2,
        wall_x_pct in 0.0f64..0.6,
        wall_y_pct in 0.0f64..0.6,
        agr in 0.25f64..0.5,
        model in prop::sample::select(vec![
            CapacityModel::Eurocode,
            CapacityModel::Asce41,
            CapacityModel::LowerOfBoth,
        ]),
    ) {
        let rec = record(
            storeys,
            plan_area,
            col_pct / 100.0 * plan_area,
            wall_x_pct / 100.0 * plan_area,
            wall_y_pct / 100.0 * plan_area,
            agr,
        );
        let inp = input(&rec);
        let s = Settings { capacity_model: model, ..Settings::default() };
        let base = engine::screen_building(&inp, &s).unwrap();
        let mut rs = vec![base.clone()];
        retrofit::size_all(&mut rs, std::slice::from_ref(&inp), &s);
        let rf = rs[0].retrofit.clone();
        prop_assert_eq!(rf.is_some(), sizing::needs_retrofit(&base, &s));
        let Some(rf) = rf else { return Ok(()) };
        let fl = base.detail.floor_area_m2;
        let cap = sizing::cap_m2(fl, &s);
        let walls = NewWalls { area_m2: PerDir {
            x: rf.added_wall_area_m2.x.unwrap_or(0.0),
            y: rf.added_wall_area_m2.y.unwrap_or(0.0),
        }};
        let after = engine::screen_building_with(&inp, &s, &walls).unwrap();
        for d in Dir::BOTH {
            match *rf.added_wall_area_m2.get(d) {
                Some(0.0) => {
                    prop_assert!(base.directions.get(d).dcr.ls <= s.retrofit_target_dcr);
                }
                Some(a) => {
                    prop_assert!(a >= sizing::one_wall_m2(&s) && a <= cap + 1e-9);
                    let dcr = after.directions.get(d).dcr.ls;
                    prop_assert!(dcr <= s.retrofit_target_dcr + 1e-9, "{:?}: {} with {}", d, dcr, a);
                }
                None => {
                    let at_cap = engine::screen_building_with(&inp, &s, &sizing::walls_in(d, cap)).unwrap();
                    prop_assert!(
                        sizing::one_wall_m2(&s) > cap
                            || at_cap.directions.get(d).dcr.ls > s.retrofit_target_dcr
                    );
                    prop_assert!(rf.note.contains("no wall solution within the cap"));
                }
            }
        }
        // no unit costs in the settings → no costs
        prop_assert!(rf.cost.is_none() && rf.replacement_cost.is_none() && rf.replace.is_none());
    }
}

/// DCR_LS,d re-screened with ΔA in d alone is non-increasing over [one wall, cap] under the
/// default (EN 1998-3) capacity model: the premise of the bisection (method §12).
#[test]
fn dcr_is_non_increasing_in_added_wall_area() {
    let rec = record(6, 400.0, 4.0, 0.0, 2.0, 0.3);
    let inp = input(&rec);
    let s = Settings::default();
    let base = engine::screen_building(&inp, &s).unwrap();
    let fl = base.detail.floor_area_m2;
    let (lo, hi) = (sizing::one_wall_m2(&s), sizing::cap_m2(fl, &s));
    for d in Dir::BOTH {
        let mut prev = f64::INFINITY;
        for k in 0..=40 {
            let a = lo + (hi - lo) * f64::from(k) / 40.0;
            let r = engine::screen_building_with(&inp, &s, &sizing::walls_in(d, a)).unwrap();
            let dcr = r.directions.get(d).dcr.ls;
            assert!(
                dcr <= prev * (1.0 + 1e-12),
                "{d:?}: {dcr} after {prev} at {a}"
            );
            prev = dcr;
        }
    }
}

/// A bare frame at high hazard gets walls in both directions, with costs when priced.
#[test]
fn bare_frame_is_sized_and_priced() {
    let rec = record(5, 500.0, 1.5, 0.0, 0.0, 0.4);
    let inp = input(&rec);
    let s = Settings {
        unit_cost_wall_m3: Some(800.0),
        unit_cost_floor_m2: Some(40.0),
        replacement_cost_m2: Some(900.0),
        ..Settings::default()
    };
    let base = engine::screen_building(&inp, &s).unwrap();
    assert!(base.class <= 2, "class {}", base.class);
    let mut rs = vec![base.clone()];
    retrofit::size_all(&mut rs, std::slice::from_ref(&inp), &s);
    let rf = rs[0].retrofit.clone().unwrap();
    let h = base.detail.height_m;
    let fl = base.detail.floor_area_m2;
    if let (Some(x), Some(y)) = (rf.added_wall_area_m2.x, rf.added_wall_area_m2.y) {
        let expected = 800.0 * (x + y) * h + 40.0 * fl;
        assert!((rf.cost.unwrap() - expected).abs() < 1e-6 * expected);
        assert_eq!(rf.replace, Some(expected > 0.40 * 900.0 * fl));
    } else {
        assert_eq!(rf.cost, None);
        assert_eq!(rf.replace, Some(true));
    }
    assert!((rf.replacement_cost.unwrap() - 900.0 * fl).abs() < 1e-6);
}

// ---------------------------------------------------------------------------------------
// The whole pipeline with a budget (engine + sizing + plan).

fn loaded(records: Vec<BuildingRecord>, settings: Settings) -> seistriage::pipeline::Loaded {
    let n = records.len();
    seistriage::pipeline::Loaded {
        input: Default::default(),
        inventory: seistriage::model::Inventory {
            buildings: records,
            rows: n,
            ..Default::default()
        },
        settings,
        sites: Default::default(),
    }
}

fn stock() -> Vec<BuildingRecord> {
    // Invented stock: bare frames and walled blocks of various sizes at agR 0.3 g.
    let mut out = Vec::new();
    for k in 0..8u32 {
        let mut r = record(
            2 + k % 5,
            200.0 + 60.0 * f64::from(k),
            (200.0 + 60.0 * f64::from(k)) * (0.002 + 0.001 * f64::from(k)),
            if k % 3 == 0 { 3.0 } else { 0.0 },
            if k % 2 == 0 { 2.0 } else { 0.0 },
            0.45,
        );
        r.row = 2 + k as usize;
        r.id = format!("INV-{k:02}");
        r.occupants = Some(u64::from(10 + 7 * k));
        out.push(r);
    }
    // a tall bare frame with very little column area: beyond what the cap can fix
    let mut r = record(12, 300.0, 0.45, 0.0, 0.0, 0.5);
    r.row = 10;
    r.id = "INV-08".into();
    r.occupants = Some(90);
    out.push(r);
    out
}

#[test]
fn pipeline_budget_plan_with_both_plans() {
    let s = Settings {
        unit_cost_wall_m3: Some(1200.0),
        unit_cost_floor_m2: Some(80.0),
        replacement_cost_m2: Some(1000.0),
        budget: Some(600_000.0),
        ..Settings::default()
    };
    let report = seistriage::pipeline::screen(&loaded(stock(), s.clone()));
    assert!(!report.buildings.is_empty());
    let plan = report.budget_plan.clone().expect("a budget plan");
    assert!(!plan.priority_walk.funded.is_empty());
    // the walk skips what does not fit and keeps walking: some building after a skipped
    // one is funded
    let walk_flags: Vec<bool> = report
        .buildings
        .iter()
        .filter_map(|b| b.retrofit.as_ref().and_then(|r| r.funded))
        .collect();
    let first_skip = walk_flags
        .iter()
        .position(|f| !f)
        .expect("a skipped building");
    assert!(
        walk_flags[first_skip..].iter().any(|f| *f),
        "{walk_flags:?}"
    );
    // the tall bare frame cannot be fixed within the cap: replacement
    let tall = report.buildings.iter().find(|b| b.id == "INV-08").unwrap();
    let rf = tall.retrofit.as_ref().unwrap();
    assert_eq!(rf.added_wall_area_m2, PerDir { x: None, y: None });
    assert_eq!((rf.cost, rf.replace), (None, Some(true)));
    assert!(
        rf.note
            .starts_with("no wall solution within the cap — detailed study or replacement")
    );
    // walk: funded ids in rank order, cost within the budget and equal to the sum of the
    // funding costs; occupants of class 1–2 funded buildings
    let mut sum = 0.0;
    let mut occ = 0;
    let mut last_rank = 0;
    for id in &plan.priority_walk.funded {
        let b = report.buildings.iter().find(|b| &b.id == id).unwrap();
        assert!(b.rank > last_rank);
        last_rank = b.rank;
        let rf = b.retrofit.as_ref().unwrap();
        assert_eq!(rf.funded, Some(true));
        sum += cost::funding_cost(rf).unwrap();
        if b.class <= 2 {
            occ += b.occupants.unwrap_or(0);
        }
    }
    assert!((sum - plan.priority_walk.cost).abs() < 1e-6);
    assert!(plan.priority_walk.cost <= 600_000.0 + 1e-6);
    assert_eq!(plan.priority_walk.occupants_protected, occ);
    assert!(plan.max_occupants.occupants_protected >= plan.priority_walk.occupants_protected);
    assert!(plan.max_occupants.cost <= 600_000.0 + 1e-6);
    for b in &report.buildings {
        match &b.retrofit {
            Some(rf) => {
                assert!(rf.funded.is_some() && rf.funded_best.is_some());
                assert_eq!(
                    rf.funded_best == Some(true),
                    plan.max_occupants.funded.contains(&b.id)
                );
            }
            None => assert!(!sizing::needs_retrofit(b, &s)),
        }
    }
    let json = serde_json::to_value(&report).unwrap();
    assert!(json["budget_plan"]["max_occupants"]["method"].is_string());
}

#[test]
fn pipeline_without_unit_costs_sizes_but_makes_no_plan() {
    let s = Settings {
        budget: Some(600_000.0),
        ..Settings::default()
    };
    let report = seistriage::pipeline::screen(&loaded(stock(), s));
    assert!(report.budget_plan.is_none());
    assert!(
        report
            .problems
            .iter()
            .any(|p| p.column == "budget" && p.message.contains("unit_cost_wall_m3"))
    );
    let sized: Vec<_> = report
        .buildings
        .iter()
        .filter_map(|b| b.retrofit.as_ref())
        .collect();
    assert!(
        !sized.is_empty(),
        "the invented stock has buildings to retrofit"
    );
    for rf in sized {
        assert!(rf.cost.is_none() && rf.replacement_cost.is_none() && rf.replace.is_none());
        assert!(rf.funded.is_none());
        assert!(
            rf.added_wall_area_m2.x.is_some()
                || rf.added_wall_area_m2.y.is_some()
                || rf.note.contains("no wall solution")
        );
    }
    let json = serde_json::to_value(&report).unwrap();
    assert!(json["budget_plan"].is_null());
}

/// Results (rank order) are matched to inputs (file order) by id: each building is sized
/// with its own input whatever the order.
#[test]
fn size_all_matches_results_to_inputs_by_id() {
    let mut weak = record(5, 500.0, 1.5, 0.0, 0.0, 0.4);
    weak.id = "WEAK".into();
    weak.row = 2;
    let mut strong = record(3, 500.0, 10.0, 5.0, 5.0, 0.1);
    strong.id = "STRONG".into();
    strong.row = 3;
    let inputs = vec![input(&strong), input(&weak)];
    let s = Settings::default();
    let w = engine::screen_building(&inputs[1], &s).unwrap();
    let st = engine::screen_building(&inputs[0], &s).unwrap();
    assert!(w.class <= 2 && st.class >= 3, "{} {}", w.class, st.class);
    let mut rs = vec![w.clone(), st];
    retrofit::size_all(&mut rs, &inputs, &s);
    assert!(rs[1].retrofit.is_none());
    let rf = rs[0].retrofit.clone().unwrap();
    // the same sizing as for the weak building alone
    let mut alone = vec![w];
    retrofit::size_all(&mut alone, &inputs[1..], &s);
    assert_eq!(alone[0].retrofit.as_ref(), Some(&rf));
    assert!(rf.added_wall_area_m2.x.is_some_and(|a| a > 0.0));
}

/// flags_after (method §10, §12): the new walls are added at every storey, so a soft ground
/// storey stays soft only if the stiffness ratio with the walls still fails. Hand check on
/// the area proxy of method §10: ground storey X has columns only (A_col/2 = 1.0 m²),
/// storey 2 adds m m² of infill (weight 1/10), equal heights, so
/// k1/k2 = (1 + ΔA_x)/(1 + m/10 + ΔA_x); extreme below 0.60, soft below 0.70 (ASCE 7-16
/// Table 12.3-2 types 1b/1a thresholds as adopted in method §10). Exact comparison of the
/// code present against the hand ratio (no case lies within 1e-6 of a threshold,
/// asserted below).
#[test]
fn flags_after_follow_the_stiffness_ratio_with_the_new_walls() {
    let mut outcomes = std::collections::BTreeSet::new();
    for m in [12.0, 16.0, 20.0, 25.0, 40.0] {
        for agr in [0.25, 0.3, 0.35, 0.4, 0.45, 0.5] {
            let mut rec = record(3, 400.0, 2.0, 0.0, 3.0, agr);
            rec.storey_height_m = Some(3.0);
            rec.ground_storey_height_m = Some(3.0);
            rec.upper_column_area_m2 = Some(2.0);
            rec.upper_rc_wall_area_x_m2 = Some(0.0);
            rec.upper_rc_wall_area_y_m2 = Some(3.0);
            rec.upper_infill_area_x_m2 = Some(m);
            rec.upper_infill_area_y_m2 = Some(0.0);
            rec.infill_area_x_m2 = Some(0.0);
            rec.infill_area_y_m2 = Some(0.0);
            let inp = input(&rec);
            let s = Settings::default();
            let base = engine::screen_building(&inp, &s).unwrap();
            assert!(
                base.flags.iter().any(|f| f.code.starts_with("soft-storey")),
                "{:?}",
                base.flags
            );
            let mut rs = vec![base];
            retrofit::size_all(&mut rs, std::slice::from_ref(&inp), &s);
            let Some(rf) = rs[0].retrofit.clone() else {
                continue;
            };
            let Some(dx) = rf.added_wall_area_m2.x else {
                continue;
            };
            let ratio = (1.0 + dx) / (1.0 + m / 10.0 + dx);
            assert!((ratio - 0.6).abs() > 1e-6 && (ratio - 0.7).abs() > 1e-6);
            let has = |c: &str| rf.flags_after.iter().any(|f| f == c);
            let extreme = has("soft-storey-extreme");
            let soft = has("soft-storey");
            assert_eq!(extreme, ratio < 0.6, "m {m}, ΔA {dx}: {:?}", rf.flags_after);
            assert_eq!(soft, (0.6..0.7).contains(&ratio), "m {m}, ΔA {dx}");
            outcomes.insert((extreme, soft));
        }
    }
    // the cases cover all three outcomes: extreme, soft, and cleared
    assert_eq!(outcomes.len(), 3, "{outcomes:?}");
}

/// The bundled demo (invented town) screened with its settings (unit costs and a budget)
/// shows both plans, each within the budget, the max-occupants plan protecting at least as
/// many occupants as the walk, and `funded` / `funded_best` marking exactly their sets.
#[test]
fn demo_with_a_budget_shows_both_plans() {
    let dir = tempfile::tempdir().unwrap();
    let files = seistriage::demo::write_demo_files(dir.path()).unwrap();
    let opts = seistriage::pipeline::RunOptions {
        districts: files.districts.clone(),
        faults: files.faults.clone(),
        settings_file: files.settings.clone(),
        ..Default::default()
    };
    let loaded = seistriage::pipeline::load(&files.inventory, &opts).unwrap();
    let report = seistriage::pipeline::screen(&loaded);
    let plan = report
        .budget_plan
        .clone()
        .expect("the demo sets a budget and unit costs");
    assert!(!plan.priority_walk.funded.is_empty());
    assert!(!plan.max_occupants.funded.is_empty());
    assert!(plan.priority_walk.cost <= plan.budget * (1.0 + 1e-12));
    assert!(plan.max_occupants.cost <= plan.budget * (1.0 + 1e-12));
    assert!(plan.max_occupants.occupants_protected >= plan.priority_walk.occupants_protected);
    assert!(plan.max_occupants.method.is_some());
    for b in &report.buildings {
        if let Some(rf) = &b.retrofit {
            assert_eq!(rf.funded, Some(plan.priority_walk.funded.contains(&b.id)));
            assert_eq!(
                rf.funded_best,
                Some(plan.max_occupants.funded.contains(&b.id))
            );
        }
    }
    let (walk_only, best_only) = retrofit::plan_differences(&plan);
    for id in &walk_only {
        assert!(!plan.max_occupants.funded.contains(id));
    }
    for id in &best_only {
        assert!(!plan.priority_walk.funded.contains(id));
    }
}
