//! Property tests of the screening engine (method §0-§11): monotonicity of the DCRs in wall
//! area and hazard, ordered capacity levels, determinism under row order and thread count,
//! and finite numbers everywhere. Case counts are modest so the suite stays fast in debug.

use proptest::prelude::*;
use seistriage::engine::{BuildingInput, screen_all, screen_building};
use seistriage::model::{BuildingRecord, Dir, GroundType, Use, YesNo};
use seistriage::results::{BuildingResult, Levels};
use seistriage::settings::{CapacityModel, Settings, Spectrum};

fn input(r: &BuildingRecord) -> BuildingInput<'_> {
    BuildingInput {
        record: r,
        walls: vec![],
        storeys: vec![],
        footprint: vec![],
        site: None,
    }
}

prop_compose! {
    fn building()(
        n in 1u32..=15,
        h in 2.6f64..4.0,
        h1 in 2.6f64..5.5,
        plan in 60.0f64..1500.0,
        col in 0.0f64..0.03,
        wx in prop_oneof![Just(0.0f64), 0.0005f64..0.03],
        wy in prop_oneof![Just(0.0f64), 0.0005f64..0.03],
        mx in 0.0f64..0.05,
        my in 0.0f64..0.05,
        lw in 1.5f64..9.0,
        fc in 8.0f64..45.0,
        fy in 220.0f64..520.0,
        agr in 0.02f64..0.6,
        g in 0usize..5,
        be in 0usize..3,
        year in 1950i32..2020,
        occ in proptest::option::of(0u64..500),
        use_i in 0usize..5,
        period in proptest::option::of(0.1f64..2.5),
    ) -> BuildingRecord {
        let col = if wx == 0.0 || wy == 0.0 { col.max(0.002) } else { col };
        BuildingRecord {
            row: 2,
            id: String::new(),
            use_: Some(Use::ALL[use_i]),
            year_built: Some(year),
            storeys: n,
            storey_height_m: Some(h),
            ground_storey_height_m: Some(h1),
            plan_area_m2: plan,
            column_area_m2: col * plan,
            column_depth_m: Some(0.4),
            rc_wall_area_x_m2: Some(wx * plan),
            rc_wall_area_y_m2: Some(wy * plan),
            wall_length_x_m: Some(lw),
            wall_length_y_m: Some(lw * 0.8),
            wall_thickness_m: Some(0.25),
            infill_area_x_m2: Some(mx * plan),
            infill_area_y_m2: Some(my * plan),
            boundary_elements: Some([YesNo::Yes, YesNo::No, YesNo::Unknown][be]),
            short_columns: Some(YesNo::No),
            fc_mpa: Some(fc),
            fy_mpa: Some(fy),
            floor_weight_kpa: Some(12.0),
            occupants: occ,
            ground_type: Some([GroundType::A, GroundType::B, GroundType::C, GroundType::D, GroundType::E][g]),
            agr_g: Some(agr),
            period_x_s: period,
            ..Default::default()
        }
    }
}

fn settings_for(model: usize, spectrum: usize) -> Settings {
    Settings {
        capacity_model: [
            CapacityModel::Eurocode,
            CapacityModel::Asce41,
            CapacityModel::LowerOfBoth,
        ][model],
        spectrum: [Spectrum::Ec8Type1, Spectrum::Ec8Type2][spectrum],
        boundary_elements_from_year: Some(1990),
        seismic_detailing_from_year: Some(2000),
        ..Settings::default()
    }
}

fn capacity_levels(r: &BuildingResult) -> Vec<Levels> {
    let mut v = Vec::new();
    for d in Dir::BOTH {
        let x = r.directions.get(d);
        v.extend(x.capacity.walls);
        v.extend(x.capacity.columns);
    }
    v.extend(r.walls.iter().map(|w| w.capacity));
    v
}

fn assert_finite(r: &BuildingResult) {
    let mut nums = vec![
        r.score,
        r.axial_load_ratio,
        r.strength_coefficient.x,
        r.strength_coefficient.y,
    ];
    for d in Dir::BOTH {
        let x = r.directions.get(d);
        let dd = &x.detail;
        nums.extend([
            x.wall_index_pct,
            x.column_index_pct,
            x.priority_index_pct,
            x.period_s,
            x.roof_drift_demand,
            dd.strength_walls,
            dd.strength_columns,
            dd.alpha1,
            dd.strength_coefficient,
            dd.period_frame_s,
            dd.ac_m2,
            dd.se_g,
            dd.sde_m,
            dd.gamma,
            dd.say_g,
            dd.qu,
            dd.dt_star_m,
            dd.roof_displacement_m,
            dd.kappa,
            dd.tc_s,
        ]);
        nums.extend(x.drift_demand.walls);
        nums.extend(x.drift_demand.columns);
        nums.extend(dd.period_wall_s);
    }
    for l in capacity_levels(r)
        .iter()
        .chain([r.directions.x.dcr, r.directions.y.dcr].iter())
    {
        nums.extend([l.io, l.ls, l.cp]);
    }
    for w in &r.walls {
        nums.extend([w.theta_y, w.theta_um, w.count, w.shear_span_m]);
    }
    for (i, v) in nums.iter().enumerate() {
        assert!(v.is_finite(), "number {i} of {} is {v}", r.id);
    }
    // serde_json writes non-finite numbers as null: the numbers that always exist are numbers.
    let json = serde_json::to_value(r).unwrap();
    assert!(json["score"].is_number());
    for d in ["x", "y"] {
        let x = &json["directions"][d];
        for k in [
            "wall_index_pct",
            "column_index_pct",
            "priority_index_pct",
            "period_s",
            "roof_drift_demand",
        ] {
            assert!(x[k].is_number(), "{d}.{k}");
        }
        for l in ["io", "ls", "cp"] {
            assert!(x["dcr"][l].is_number(), "{d}.dcr.{l}");
        }
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 64, failure_persistence: None, .. ProptestConfig::default() })]

    /// Scaling up the RC wall area of a direction that already has walls (same lengths and
    /// detailing) never raises a DCR in that direction (Eurocode capacity model).
    #[test]
    fn more_wall_area_never_raises_dcr(b in building(), k in 1.0f64..4.0, sp in 0usize..2) {
        let mut b = b;
        // a direction that already has walls
        b.rc_wall_area_x_m2 = Some(b.rc_wall_area_x_m2.unwrap_or(0.0).max(0.002 * b.plan_area_m2));
        b.period_x_s = None;
        let s = settings_for(0, sp);
        let r0 = screen_building(&input(&b), &s).unwrap();
        let mut b2 = b.clone();
        b2.rc_wall_area_x_m2 = b.rc_wall_area_x_m2.map(|a| a * k);
        let r1 = screen_building(&input(&b2), &s).unwrap();
        let (d0, d1) = (r0.directions.x.dcr, r1.directions.x.dcr);
        let tol = 1e-9;
        prop_assert!(d1.io <= d0.io * (1.0 + tol) + tol, "io {} -> {}", d0.io, d1.io);
        prop_assert!(d1.ls <= d0.ls * (1.0 + tol) + tol, "ls {} -> {}", d0.ls, d1.ls);
        prop_assert!(d1.cp <= d0.cp * (1.0 + tol) + tol, "cp {} -> {}", d0.cp, d1.cp);
    }

    /// Retrofit sizing's shortcut (the building prepared once, only the sized direction
    /// re-run) gives the DCR_LS of a full re-screening with the same new walls, bit for bit,
    /// under every capacity model and spectrum.
    #[test]
    fn sizing_shortcut_equals_full_rescreening(
        b in building(), area in 0.0f64..40.0, m in 0usize..3, sp in 0usize..2, dy in any::<bool>()
    ) {
        use seistriage::retrofit::{Rescreener, sizing::{Rescreen, walls_in}};
        let s = settings_for(m, sp);
        let inp = input(&b);
        let d = if dy { Dir::Y } else { Dir::X };
        let full = seistriage::engine::screen_building_with(&inp, &s, &walls_in(d, area))
            .unwrap()
            .directions
            .get(d)
            .dcr
            .ls;
        let prepared = seistriage::engine::building::prepare(&inp, &s).unwrap();
        let quick = Rescreener { prepared, settings: &s }.dcr_ls(d, area).unwrap();
        prop_assert_eq!(full.to_bits(), quick.to_bits(), "full {} quick {}", full, quick);
    }

    /// The check with both directions' new walls (`flags_after` and the DCR re-check of
    /// retrofit sizing) gives, through the shortcut, the DCR_LS of both directions and the
    /// soft/weak storey codes that a full re-screening with every flag raised gives.
    #[test]
    fn sizing_after_check_equals_full_rescreening(
        b in building(), ax in 0.0f64..40.0, ay in 0.0f64..40.0, m in 0usize..3, sp in 0usize..2
    ) {
        use seistriage::engine::NewWalls;
        use seistriage::model::PerDir;
        use seistriage::retrofit::{Rescreener, sizing::Rescreen};
        let s = settings_for(m, sp);
        let inp = input(&b);
        let new = NewWalls { area_m2: PerDir { x: ax, y: ay } };
        let full = |n: &NewWalls| seistriage::engine::screen_building_with(&inp, &s, n);
        let (dcr_full, codes_full) = full.after(&new).unwrap();
        let prepared = seistriage::engine::building::prepare(&inp, &s).unwrap();
        let (dcr_quick, codes_quick) = Rescreener { prepared, settings: &s }.after(&new).unwrap();
        prop_assert_eq!(dcr_full.x.to_bits(), dcr_quick.x.to_bits());
        prop_assert_eq!(dcr_full.y.to_bits(), dcr_quick.y.to_bits());
        prop_assert_eq!(codes_full, codes_quick);
    }

    /// Raising agR never lowers a DCR (every capacity model).
    #[test]
    fn higher_agr_never_lowers_dcr(b in building(), k in 1.0f64..3.0, m in 0usize..3, sp in 0usize..2) {
        let s = settings_for(m, sp);
        let r0 = screen_building(&input(&b), &s).unwrap();
        let mut b2 = b.clone();
        b2.agr_g = b.agr_g.map(|a| a * k);
        let r1 = screen_building(&input(&b2), &s).unwrap();
        for d in Dir::BOTH {
            let (d0, d1) = (r0.directions.get(d).dcr, r1.directions.get(d).dcr);
            let tol = 1e-9;
            prop_assert!(d1.io >= d0.io * (1.0 - tol) - tol);
            prop_assert!(d1.ls >= d0.ls * (1.0 - tol) - tol);
            prop_assert!(d1.cp >= d0.cp * (1.0 - tol) - tol);
        }
        prop_assert!(r1.class <= r0.class);
    }

    /// IO ≤ LS ≤ CP for every member and group; every number finite.
    #[test]
    fn levels_ordered_and_numbers_finite(b in building(), m in 0usize..3, sp in 0usize..2) {
        let s = settings_for(m, sp);
        let r = screen_building(&input(&b), &s).unwrap();
        for l in &capacity_levels(&r) {
            prop_assert!(l.io <= l.ls && l.ls <= l.cp, "{l:?}");
        }
        for w in &r.walls {
            prop_assert!(w.capacity.io <= w.capacity.ls && w.capacity.ls <= w.capacity.cp);
        }
        assert_finite(&r);
        // DCR levels reversed: capacity IO ≤ LS ≤ CP → DCR IO ≥ LS ≥ CP.
        for d in Dir::BOTH {
            let x = r.directions.get(d).dcr;
            prop_assert!(x.io >= x.ls && x.ls >= x.cp);
        }
    }

    /// Shuffling the input order and changing the thread count leave the JSON identical.
    #[test]
    fn order_and_threads_do_not_matter(bs in proptest::collection::vec(building(), 2..12), seed in any::<u64>()) {
        let recs: Vec<BuildingRecord> = bs.into_iter().enumerate().map(|(i, mut b)| {
            b.id = format!("B{:03}", (i * 7) % 100);
            b.row = i + 2;
            if i % 3 == 0 { b.occupants = None; }
            b
        }).collect();
        // ids are unique: i·7 mod 100 is distinct for i < 100 (7 and 100 coprime).
        let s = settings_for(0, 0);
        let run = |recs: &[BuildingRecord], threads: usize| {
            let inputs: Vec<BuildingInput<'_>> = recs.iter().map(input).collect();
            let pool = rayon::ThreadPoolBuilder::new().num_threads(threads).build().unwrap();
            let out = pool.install(|| screen_all(&inputs, &s));
            let stripped: Vec<BuildingResult> = out.buildings.into_iter().map(|mut b| { b.row = 0; b }).collect();
            serde_json::to_string(&stripped).unwrap()
        };
        let a = run(&recs, 1);
        let mut shuffled = recs.clone();
        // deterministic shuffle from the seed
        let mut x = seed | 1;
        for i in (1..shuffled.len()).rev() {
            x ^= x << 13; x ^= x >> 7; x ^= x << 17;
            let j = (x % (i as u64 + 1)) as usize;
            shuffled.swap(i, j);
        }
        let b = run(&shuffled, 2);
        prop_assert_eq!(a, b);
    }
}

prop_compose! {
    fn listed_walls()(
        ws in proptest::collection::vec((any::<bool>(), 0.5f64..10.0, 0.12f64..0.4, -15.0f64..15.0, -10.0f64..10.0, 1u32..3, 0usize..3), 0..8)
    ) -> Vec<seistriage::model::WallRecord> {
        ws.into_iter().enumerate().map(|(i, (x_dir, lw, tw, x, y, start, be))| seistriage::model::WallRecord {
            row: i + 2,
            building_id: "P".into(),
            wall_id: format!("W{i}"),
            direction: Some(if x_dir { Dir::X } else { Dir::Y }),
            length_m: lw,
            thickness_m: Some(tw),
            x_m: Some(x),
            y_m: Some(y),
            boundary_elements: Some([YesNo::Yes, YesNo::No, YesNo::Unknown][be]),
            start_storey: Some(start),
            ..Default::default()
        }).collect()
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 64, failure_persistence: None, .. ProptestConfig::default() })]

    /// Listed walls with positions, a storeys sheet and a footprint (torsion, soft/weak
    /// storey and discontinuity paths): every number finite, levels ordered, retrofit walls
    /// never raise κ below the index step.
    #[test]
    fn listed_walls_storeys_and_footprint_stay_finite(
        b in building(),
        walls in listed_walls(),
        hs in proptest::collection::vec((2.5f64..5.0, 0.0f64..0.03, 0.0f64..0.02, 0.0f64..0.02), 1..6),
        added in 0.0f64..30.0,
    ) {
        let mut b = b;
        b.column_area_m2 = b.column_area_m2.max(0.002 * b.plan_area_m2);
        b.plan_length_x_m = Some(30.0);
        b.plan_length_y_m = Some(20.0);
        let storeys: Vec<seistriage::model::StoreyRecord> = hs.iter().enumerate().map(|(i, &(h, c, wx, wy))| seistriage::model::StoreyRecord {
            row: i + 2,
            building_id: "P".into(),
            storey: i as u32 + 1,
            height_m: Some(h),
            column_area_m2: Some(c * b.plan_area_m2),
            rc_wall_area_x_m2: Some(wx * b.plan_area_m2),
            rc_wall_area_y_m2: Some(wy * b.plan_area_m2),
            infill_area_x_m2: None,
            infill_area_y_m2: Some(0.0),
        }).collect();
        let inp = BuildingInput {
            record: &b,
            walls: walls.iter().collect(),
            storeys: storeys.iter().collect(),
            footprint: vec![],
            site: None,
        };
        let s = settings_for(0, 0);
        let r = screen_building(&inp, &s).unwrap();
        assert_finite(&r);
        for l in &capacity_levels(&r) {
            prop_assert!(l.io <= l.ls && l.ls <= l.cp);
        }
        let mut nw = seistriage::engine::NewWalls::default();
        nw.area_m2.y = added;
        let rw = seistriage::engine::screen_building_with(&inp, &s, &nw).unwrap();
        assert_finite(&rw);
        let below = added / r.detail.floor_area_m2 * 100.0 < s.min_new_wall_index_pct;
        if below {
            prop_assert!(rw.directions.y.detail.kappa <= r.directions.y.detail.kappa + 1e-12);
        }
        prop_assert_eq!(&rw.directions.x, &r.directions.x);
    }
}

// -------------------------------------------------------------------------------------------
// Issue 13, item 1 (method §3, §9): adding RC wall area never makes a building worse.

/// How wall area is added in one generated case.
#[derive(Debug, Clone)]
enum WallGrowth {
    /// More of the same walls in every storey alike (representative walls, no storey data
    /// given: storey 2 repeats the ground storey, method §10 case 3).
    EveryStorey,
    /// At the ground storey only, with the upper storeys' data given and fixed: the
    /// `upper_*` cells (method §10 case 2) ...
    GroundUpperCells { wall: f64, column: f64, infill: f64 },
    /// ... or storeys-sheet rows 2–4 (case 1).
    GroundStoreysSheet { rows: Vec<(f64, f64, f64)> },
}

prop_compose! {
    fn wall_growth()(
        kind in 0usize..3,
        wall in prop_oneof![Just(0.0f64), 0.0005f64..0.03],
        column in 0.4f64..1.3,
        infill in 0.0f64..0.05,
        rows in proptest::collection::vec((0.0f64..0.03, 0.4f64..1.3, 0.0f64..0.05), 1..4),
    ) -> WallGrowth {
        match kind {
            0 => WallGrowth::EveryStorey,
            1 => WallGrowth::GroundUpperCells { wall, column, infill },
            _ => WallGrowth::GroundStoreysSheet { rows },
        }
    }
}

prop_compose! {
    /// A building with columns, its X wall area before (`a0`, zero in about a third of the
    /// cases) and after (`a1 > a0`: a token 0.01 m², a small step, or several times more).
    fn wall_case()(
        b in building(),
        growth in wall_growth(),
        from_zero in 0usize..3,
        a0_frac in 0.0002f64..0.03,
        step in prop_oneof![Just(0.01f64), 0.001f64..1.0, 1.0f64..60.0],
        cf in 0usize..3,
        pf in 1.0f64..1.5,
    ) -> (BuildingRecord, WallGrowth, f64, f64, f64, f64) {
        let mut b = b;
        b.column_area_m2 = b.column_area_m2.max(0.002 * b.plan_area_m2);
        // An input period is a measured property of the building as it stands; adding walls
        // to it is not the same building with more walls (method §4), so none is given.
        b.period_x_s = None;
        let a0 = if from_zero == 0 { 0.0 } else { a0_frac * b.plan_area_m2 };
        let a1 = if step < 1.0 { a0 + step } else { a0.max(0.01) * step };
        (b, growth, a0, a1, [1.0, 1.2, 1.35][cf], pf)
    }
}

/// The building of one case with `area` m² of X walls at the ground storey.
fn with_x_walls(
    b: &BuildingRecord,
    growth: &WallGrowth,
    area: f64,
) -> (BuildingRecord, Vec<seistriage::model::StoreyRecord>) {
    let mut b = b.clone();
    b.rc_wall_area_x_m2 = Some(area);
    let plan = b.plan_area_m2;
    let mut storeys = Vec::new();
    match growth {
        WallGrowth::EveryStorey => {}
        WallGrowth::GroundUpperCells {
            wall,
            column,
            infill,
        } => {
            b.upper_rc_wall_area_x_m2 = Some(wall * plan);
            b.upper_column_area_m2 = Some(column * b.column_area_m2);
            b.upper_infill_area_x_m2 = Some(infill * plan);
        }
        WallGrowth::GroundStoreysSheet { rows } => {
            for (i, (w, c, m)) in rows.iter().enumerate() {
                storeys.push(seistriage::model::StoreyRecord {
                    row: i + 2,
                    building_id: String::new(),
                    storey: i as u32 + 2,
                    height_m: None,
                    column_area_m2: Some(c * b.column_area_m2),
                    rc_wall_area_x_m2: Some(w * plan),
                    rc_wall_area_y_m2: None,
                    infill_area_x_m2: Some(m * plan),
                    infill_area_y_m2: None,
                });
            }
        }
    }
    (b, storeys)
}

fn screen_x(
    b: &BuildingRecord,
    storeys: &[seistriage::model::StoreyRecord],
    s: &Settings,
) -> Levels {
    let inp = BuildingInput {
        record: b,
        walls: vec![],
        storeys: storeys.iter().collect(),
        footprint: vec![],
        site: None,
    };
    screen_building(&inp, s).unwrap().directions.x.dcr
}

fn not_raised(before: f64, after: f64) -> bool {
    after <= before * (1.0 + 1e-9) + 1e-12
}

proptest! {
    // 10,000 generated cases, as issue 13 asks (2.7 s in a debug build, measured once on the
    // shared 2-core machine; see docs/journal.md).
    #![proptest_config(ProptestConfig { cases: 10_000, failure_persistence: None, .. ProptestConfig::default() })]

    /// Method §3 and §9 (issue 13, item 1): with the EN 1998-3 capacity model, adding RC wall
    /// area (more of the same walls in every storey alike, or at the ground storey with the
    /// upper storeys' data given and fixed), from zero or from any amount, never raises
    /// DCR_LS or DCR_CP, and never raises DCR_IO once the building has walls; with the ASCE
    /// 41 model (whose wall capacity legitimately falls as a shorter period raises the wall
    /// shear) a first wall never raises DCR_LS or DCR_CP.
    #[test]
    fn adding_rc_wall_area_never_makes_a_building_worse(
        (b, growth, a0, a1, cf, pf) in wall_case(), sp in 0usize..2,
    ) {
        let eurocode = Settings { confidence_factor: cf, period_factor: pf, ..settings_for(0, sp) };
        let (b0, st0) = with_x_walls(&b, &growth, a0);
        let (b1, st1) = with_x_walls(&b, &growth, a1);
        let (d0, d1) = (screen_x(&b0, &st0, &eurocode), screen_x(&b1, &st1, &eurocode));
        prop_assert!(not_raised(d0.ls, d1.ls), "eurocode LS {} -> {} ({a0} -> {a1} m², {growth:?})", d0.ls, d1.ls);
        prop_assert!(not_raised(d0.cp, d1.cp), "eurocode CP {} -> {} ({a0} -> {a1} m², {growth:?})", d0.cp, d1.cp);
        if a0 > 0.0 {
            prop_assert!(not_raised(d0.io, d1.io), "eurocode IO {} -> {} ({a0} -> {a1} m², {growth:?})", d0.io, d1.io);
        }
        let asce = Settings { confidence_factor: cf, period_factor: pf, ..settings_for(1, sp) };
        let (bz, stz) = with_x_walls(&b, &growth, 0.0);
        let (z0, z1) = (screen_x(&bz, &stz, &asce), screen_x(&b1, &st1, &asce));
        prop_assert!(not_raised(z0.ls, z1.ls), "asce41 first wall LS {} -> {} (0 -> {a1} m², {growth:?})", z0.ls, z1.ls);
        prop_assert!(not_raised(z0.cp, z1.cp), "asce41 first wall CP {} -> {} (0 -> {a1} m², {growth:?})", z0.cp, z1.cp);
    }
}
