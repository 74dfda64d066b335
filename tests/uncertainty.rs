//! Method §13: the sampler against the engine (bit-identical with every factor 1, each factor
//! acting exactly where §13 says), the stage's invariants (β = 0, the demand dispersion
//! property, thread count and rerun identity) and the outputs through the built binary.

use std::path::PathBuf;

use proptest::prelude::*;
use seistriage::engine::{self, BuildingInput, screen_building};
use seistriage::model::{BuildingRecord, Dir, GroundType, Use, YesNo};
use seistriage::pipeline::{self, Loaded, RunOptions};
use seistriage::results::{BuildingResult, Levels, Screening};
use seistriage::settings::{CapacityModel, Settings, Spectrum};
use seistriage::uncertainty::{BuildingSamples, Evaluator, Factors, Sample};

fn inventories() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("inventories")
}

/// The bundled invented demo town with its districts, faults and settings, plus `extra`
/// settings lines.
fn demo(extra: &str) -> Loaded {
    let dir = tempfile::tempdir().unwrap();
    let base = std::fs::read_to_string(inventories().join("demo-settings.toml")).unwrap();
    let settings = dir.path().join("s.toml");
    // Scalar keys must come before the [[era]] tables of the demo file; a key of `extra`
    // replaces the demo file's line.
    let keys: Vec<&str> = extra
        .lines()
        .filter_map(|l| l.split('=').next())
        .map(str::trim)
        .collect();
    let base: String = base
        .lines()
        .filter(|l| !keys.contains(&l.split('=').next().unwrap_or("").trim()))
        .map(|l| format!("{l}\n"))
        .collect();
    std::fs::write(&settings, format!("{extra}\n{base}")).unwrap();
    pipeline::load(
        &inventories().join("demo.xlsx"),
        &RunOptions {
            settings_file: Some(settings),
            districts: Some(inventories().join("demo-districts.geojson")),
            faults: Some(inventories().join("demo-faults.geojson")),
            ..Default::default()
        },
    )
    .unwrap()
}

fn levels_bits(l: &Levels) -> [u64; 3] {
    [l.io.to_bits(), l.ls.to_bits(), l.cp.to_bits()]
}

/// The sample with every factor 1 against the engine's result, bit for bit.
fn assert_same(det: &BuildingResult, smp: &Sample) {
    assert_eq!(det.class, smp.class, "{}", det.id);
    assert_eq!(det.score.to_bits(), smp.score.to_bits(), "{}", det.id);
    assert_eq!(
        det.axial_load_ratio.to_bits(),
        smp.axial_load_ratio.to_bits()
    );
    for d in Dir::BOTH {
        let (a, b) = (det.directions.get(d), smp.directions.get(d));
        assert_eq!(levels_bits(&a.dcr), levels_bits(&b.dcr), "{} {d:?}", det.id);
        assert_eq!(a.roof_drift_demand.to_bits(), b.roof_drift.to_bits());
        assert_eq!(a.drift_demand.walls, b.drift_walls);
        assert_eq!(a.drift_demand.columns, b.drift_columns);
        assert_eq!(a.capacity.walls, b.capacity_walls);
        assert_eq!(a.capacity.columns, b.capacity_columns);
        assert_eq!(a.detail.kappa.to_bits(), b.kappa.to_bits());
        assert_eq!(
            a.detail.strength_coefficient.to_bits(),
            b.strength_coefficient.to_bits()
        );
        // The frame-alone bound of §9, where it applies.
        assert_eq!(
            a.frame_alone
                .map(|f| (f.dcr.ls.to_bits(), f.dcr.cp.to_bits())),
            b.frame_alone_dcr
                .map(|(ls, cp)| (ls.to_bits(), cp.to_bits())),
            "{} {d:?}",
            det.id
        );
    }
}

#[test]
fn every_factor_one_reproduces_the_engine_bit_for_bit() {
    // The demo town holds listed walls, storeys sheets, soft storeys, short columns, frames
    // without walls, districts and near-fault sites; run it under every capacity model,
    // both EN 1998-1 types, the two-parameter spectrum and a confidence factor.
    let variants = [
        "",
        "capacity_model = \"asce41\"",
        "capacity_model = \"lower-of-both\"\nconfidence_factor = 1.35",
        "spectrum = \"ec8-type2\"\nranking_level = \"cp\"",
        "spectrum = \"two-parameter\"\nsds_g = 0.8\nsd1_g = 0.35\ntl_s = 4.0\nranking_level = \"io\"",
    ];
    let mut checked = 0;
    let mut bounded = 0;
    for v in variants {
        let loaded = demo(v);
        let inputs = engine::building_inputs(&loaded.inventory, &loaded.sites);
        for i in &inputs {
            let Ok(det) = screen_building(i, &loaded.settings) else {
                continue;
            };
            let ev = Evaluator::new(i, &loaded.settings).unwrap();
            assert_same(&det, &ev.evaluate(&Factors::NEUTRAL, &loaded.settings));
            checked += 1;
            bounded += Dir::BOTH
                .iter()
                .filter(|d| det.directions.get(**d).frame_alone.is_some())
                .count();
        }
    }
    assert!(checked >= 5 * 55, "{checked}");
    assert!(
        bounded > 50,
        "the frame-alone bound is exercised: {bounded}"
    );
}

/// A 5-storey invented building with every input given, walls in X only, columns, infill
/// and a taller ground storey.
fn record() -> BuildingRecord {
    BuildingRecord {
        row: 2,
        id: "U-1".into(),
        use_: Some(Use::Residential),
        year_built: Some(1980),
        storeys: 5,
        storey_height_m: Some(3.0),
        ground_storey_height_m: Some(3.6),
        plan_area_m2: 300.0,
        column_area_m2: 3.0,
        column_depth_m: Some(0.4),
        rc_wall_area_x_m2: Some(3.0),
        rc_wall_area_y_m2: Some(0.0),
        wall_length_x_m: Some(4.0),
        wall_length_y_m: Some(4.0),
        wall_thickness_m: Some(0.25),
        infill_area_x_m2: Some(6.0),
        infill_area_y_m2: Some(6.0),
        upper_infill_area_x_m2: Some(12.0),
        upper_infill_area_y_m2: Some(12.0),
        boundary_elements: Some(YesNo::No),
        short_columns: Some(YesNo::No),
        fc_mpa: Some(18.0),
        fy_mpa: Some(420.0),
        floor_weight_kpa: Some(12.0),
        ground_type: Some(GroundType::C),
        agr_g: Some(0.25),
        occupants: Some(60),
        ..Default::default()
    }
}

fn input(r: &BuildingRecord) -> BuildingInput<'_> {
    BuildingInput {
        record: r,
        walls: vec![],
        storeys: vec![],
        footprint: vec![],
        site: None,
    }
}

fn only(f: impl FnOnce(&mut Factors)) -> Factors {
    let mut x = Factors::NEUTRAL;
    f(&mut x);
    x
}

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() <= 1e-12 * a.abs().max(b.abs()).max(1e-300)
}

fn scaled(l: &Levels, k: f64) -> Levels {
    Levels {
        io: l.io * k,
        ls: l.ls * k,
        cp: l.cp * k,
    }
}

#[test]
fn demand_factor_scales_d_t_and_every_drift_demand_only() {
    // method §13: D multiplies d_t after the §6 clamp, so every drift demand; κ and the
    // capacities are untouched. d_t exact (the same product); drifts to 1e-12 relative
    // (d_t·D/H against (d_t/H)·D: one rounding apart).
    let r = record();
    let s = Settings::default();
    let ev = Evaluator::new(&input(&r), &s).unwrap();
    let base = ev.evaluate(&Factors::NEUTRAL, &s);
    let d = 1.37;
    let smp = ev.evaluate(&only(|f| f.d = d), &s);
    for dir in Dir::BOTH {
        let (a, b) = (base.directions.get(dir), smp.directions.get(dir));
        assert_eq!(b.roof_displacement_m, a.roof_displacement_m * d);
        assert!(close(b.roof_drift, a.roof_drift * d));
        assert!(close(
            b.drift_columns.unwrap(),
            a.drift_columns.unwrap() * d
        ));
        if let Some(w) = a.drift_walls {
            assert!(close(b.drift_walls.unwrap(), w * d));
        }
        assert_eq!(a.kappa, b.kappa);
        assert_eq!(a.capacity_walls, b.capacity_walls);
        assert_eq!(a.capacity_columns, b.capacity_columns);
        assert_eq!(a.strength_coefficient, b.strength_coefficient);
    }
    assert!(close(smp.score, base.score * d));
    // The frame-alone bound (X has walls and columns): its d_t is scaled too.
    let (a, b) = (&base.directions.x, &smp.directions.x);
    assert_eq!(
        b.frame_alone_roof_displacement_m.unwrap(),
        a.frame_alone_roof_displacement_m.unwrap() * d
    );
    let (fa, fb) = (a.frame_alone_dcr.unwrap(), b.frame_alone_dcr.unwrap());
    assert!(close(fb.0, fa.0 * d) && close(fb.1, fa.1 * d));
}

#[test]
fn capacity_factors_scale_the_three_levels_of_their_own_group() {
    // method §13: Cw on θ_IO, θ_LS, θ_CP of the wall group, Cc on those of the columns;
    // demands untouched. Exact: the same product.
    let r = record();
    let s = Settings::default();
    let ev = Evaluator::new(&input(&r), &s).unwrap();
    let base = ev.evaluate(&Factors::NEUTRAL, &s);
    let w = ev.evaluate(&only(|f| f.cw = 0.8), &s);
    let c = ev.evaluate(&only(|f| f.cc = 1.25), &s);
    let (bx, wx, cx) = (&base.directions.x, &w.directions.x, &c.directions.x);
    assert_eq!(
        wx.capacity_walls,
        Some(scaled(&bx.capacity_walls.unwrap(), 0.8))
    );
    assert_eq!(wx.capacity_columns, bx.capacity_columns);
    assert_eq!(
        cx.capacity_columns,
        Some(scaled(&bx.capacity_columns.unwrap(), 1.25))
    );
    assert_eq!(cx.capacity_walls, bx.capacity_walls);
    assert_eq!(wx.roof_drift, bx.roof_drift);
    assert_eq!(cx.drift_columns, bx.drift_columns);
    // The frame-alone bound sees the column levels with Cc.
    let (fa, fc) = (bx.frame_alone_dcr.unwrap(), cx.frame_alone_dcr.unwrap());
    assert!(close(fc.0, fa.0 / 1.25) && close(fc.1, fa.1 / 1.25));
    assert_eq!(wx.frame_alone_dcr, bx.frame_alone_dcr);
    // Y has no walls: Cw changes nothing there.
    assert_eq!(w.directions.y, base.directions.y);
}

/// The engine's screening of a modified record, against the sample with one factor.
fn assert_sample_is_engine_on(r2: &BuildingRecord, smp: &Sample, s: &Settings) {
    let det = screen_building(&input(r2), s).unwrap();
    assert_eq!(det.class, smp.class);
    assert!(close(det.score, smp.score), "{} {}", det.score, smp.score);
    for d in Dir::BOTH {
        let (a, b) = (det.directions.get(d), smp.directions.get(d));
        for l in [a.dcr.io, a.dcr.ls, a.dcr.cp]
            .iter()
            .zip([b.dcr.io, b.dcr.ls, b.dcr.cp])
        {
            assert!(close(*l.0, l.1), "{d:?} {} {}", l.0, l.1);
        }
        assert!(close(a.roof_drift_demand, b.roof_drift));
        assert!(close(a.detail.strength_coefficient, b.strength_coefficient));
    }
}

#[test]
fn concrete_factor_acts_on_the_mean_fc_before_the_confidence_factor() {
    // method §13: F multiplies the mean fc of the building and its walls before CF divides
    // it, wherever fc enters (§2 ν, §3 β, §8 θ, §10 weak storey). So the sample equals the
    // engine on the record with fc·F, with CF 1.35 in force (F after CF would differ).
    // Tolerance 1e-12 relative: the same operations, compared through one division.
    let r = record();
    let s = Settings {
        confidence_factor: 1.35,
        ..Default::default()
    };
    for f in [0.7, 1.3] {
        let ev = Evaluator::new(&input(&r), &s).unwrap();
        let smp = ev.evaluate(&only(|x| x.f = f), &s);
        let mut r2 = r.clone();
        r2.fc_mpa = Some(r.fc_mpa.unwrap() * f);
        assert_sample_is_engine_on(&r2, &smp, &s);
        assert!(close(
            smp.axial_load_ratio,
            screen_building(&input(&r), &s).unwrap().axial_load_ratio / f
        ));
    }
}

#[test]
fn weight_factor_acts_on_w() {
    // method §13: W multiplies w, so W, the masses and ν; the sample equals the engine on
    // the record with floor_weight_kpa·W (1e-12 relative, as above).
    let r = record();
    let s = Settings::default();
    let ev = Evaluator::new(&input(&r), &s).unwrap();
    for w in [0.8, 1.2] {
        let smp = ev.evaluate(&only(|x| x.w = w), &s);
        let mut r2 = r.clone();
        r2.floor_weight_kpa = Some(12.0 * w);
        assert_sample_is_engine_on(&r2, &smp, &s);
    }
}

#[test]
fn hazard_factor_acts_on_agr_or_on_sds_and_sd1() {
    // method §13: H multiplies agR, or SDS and SD1 of the two-parameter spectrum (so Ts is
    // unchanged and TL stays); the sample equals the engine on the scaled hazard.
    let r = record();
    let s = Settings::default();
    let ev = Evaluator::new(&input(&r), &s).unwrap();
    for h in [0.6, 1.5] {
        let smp = ev.evaluate(&only(|x| x.h = h), &s);
        let mut r2 = r.clone();
        r2.agr_g = Some(0.25 * h);
        assert_sample_is_engine_on(&r2, &smp, &s);
    }
    let s2 = Settings {
        spectrum: Spectrum::TwoParameter,
        tl_s: Some(4.0),
        ..Default::default()
    };
    let mut r = record();
    r.sds_g = Some(0.7);
    r.sd1_g = Some(0.3);
    let ev = Evaluator::new(&input(&r), &s2).unwrap();
    for h in [0.6, 1.5] {
        let smp = ev.evaluate(&only(|x| x.h = h), &s2);
        let mut r2 = r.clone();
        r2.sds_g = Some(0.7 * h);
        r2.sd1_g = Some(0.3 * h);
        assert_sample_is_engine_on(&r2, &smp, &s2);
    }
}

#[test]
fn asce41_walls_see_the_factors_through_shear_and_axial_load() {
    // Under ASCE 41 the wall levels depend on ν (Q) and the shear stress v (Se, C_y, fc):
    // F, W and H reach them as in the engine on the modified record.
    let r = record();
    let s = Settings {
        capacity_model: CapacityModel::LowerOfBoth,
        ..Default::default()
    };
    let ev = Evaluator::new(&input(&r), &s).unwrap();
    let smp = ev.evaluate(&only(|x| x.f = 0.75), &s);
    let mut r2 = r.clone();
    r2.fc_mpa = Some(18.0 * 0.75);
    assert_sample_is_engine_on(&r2, &smp, &s);
    let smp = ev.evaluate(&only(|x| x.h = 1.4), &s);
    let mut r3 = r.clone();
    r3.agr_g = Some(0.25 * 1.4);
    assert_sample_is_engine_on(&r3, &smp, &s);
}

fn screen_with(loaded: &Loaded) -> Screening {
    pipeline::screen(loaded)
}

#[test]
fn with_every_beta_zero_each_building_keeps_its_class_and_rank() {
    // method §13: with β = 0 every factor is exp(0) = 1, so every sample is the
    // deterministic run: p_class is 1 for the deterministic class and the rank interval is
    // the rank (exact).
    let loaded = demo(
        "samples = 12\nbeta_demand = 0\nbeta_capacity = 0\nbeta_fc_given = 0\nbeta_fc_default = 0\nbeta_weight_given = 0\nbeta_weight_default = 0\nbeta_hazard = 0",
    );
    let report = screen_with(&loaded);
    assert!(report.buildings.len() > 50);
    for b in &report.buildings {
        let u = b.uncertainty.as_ref().unwrap();
        assert_eq!(u.p_class.of(b.class), 1.0, "{}", b.id);
        assert_eq!(u.p_deficit, if b.class <= 2 { 1.0 } else { 0.0 });
        let r = b.rank as u64;
        assert_eq!((u.rank.p05, u.rank.p50, u.rank.p95), (r, r, r), "{}", b.id);
        assert_eq!((u.score.p05, u.score.p95), (b.score, b.score));
        assert_eq!(u.survey_value, 0.0);
    }
    let st = report.uncertainty.as_ref().unwrap();
    let c12 = (report.counts.by_class.c1 + report.counts.by_class.c2) as u64;
    assert_eq!((st.class_1_2_count.p05, st.class_1_2_count.p95), (c12, c12));
    assert!(st.survey_next.is_empty());
    // top_k default with a budget plan: the priority walk's funded count.
    let plan = report.budget_plan.as_ref().unwrap();
    assert_eq!(st.top_k, plan.priority_walk.funded.len() as u64);
    // Expected occupants protected = the class 1–2 occupants funded.
    assert_eq!(
        plan.priority_walk.expected_occupants_protected,
        Some(plan.priority_walk.occupants_protected as f64)
    );
}

#[test]
fn results_do_not_depend_on_thread_count_or_run() {
    let loaded = demo("samples = 40\nbeta_hazard = 0.3\nseed = 987654321");
    let run = |threads: usize| {
        rayon::ThreadPoolBuilder::new()
            .num_threads(threads)
            .build()
            .unwrap()
            .install(|| screen_with(&loaded))
    };
    let one = run(1);
    let two = run(2);
    let again = run(2);
    let u = |r: &Screening| -> Vec<_> {
        r.buildings
            .iter()
            .map(|b| (b.id.clone(), b.uncertainty.clone()))
            .collect()
    };
    assert_eq!(u(&one), u(&two));
    assert_eq!(u(&two), u(&again));
    assert_eq!(one.uncertainty, two.uncertainty);
    assert_eq!(one.budget_plan, two.budget_plan);
    // Another seed gives other samples.
    let other = demo("samples = 40\nbeta_hazard = 0.3\nseed = 5");
    assert_ne!(u(&screen_with(&other)), u(&one));
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(24))]
    #[test]
    fn raising_beta_demand_alone_never_lowers_the_score_spread(
        b1 in 0.01f64..0.8,
        step in 0.01f64..0.5,
        agr in 0.05f64..0.5,
        fc in 10.0f64..40.0,
        seed in 0u64..1000,
    ) {
        // With only β_D non-zero, score = D·score₀ (every DCR scales with d_t), so
        // p95/p05 = exp(β_D·(z95 − z05)) grows with β_D (method §13).
        let mut r = record();
        r.agr_g = Some(agr);
        r.fc_mpa = Some(fc);
        let ratio = |beta: f64| {
            let s = Settings {
                samples: 60,
                seed,
                beta_demand: beta,
                beta_capacity: 0.0,
                beta_fc_given: 0.0,
                beta_fc_default: 0.0,
                beta_weight_given: 0.0,
                beta_weight_default: 0.0,
                beta_hazard: 0.0,
                ..Default::default()
            };
            let ev = Evaluator::new(&input(&r), &s).unwrap();
            let q = BuildingSamples::draw(&ev, &r.id, "", &[], &s).score_quantiles().unwrap();
            q[2] / q[0]
        };
        prop_assert!(ratio(b1 + step) >= ratio(b1));
    }
}

#[test]
fn the_binary_writes_consistent_uncertainty_fields() {
    let dir = tempfile::tempdir().unwrap();
    let inv = inventories();
    let args = |extra: &[&str]| -> Vec<String> {
        let mut v: Vec<String> = [
            "screen",
            inv.join("demo.xlsx").to_str().unwrap(),
            "--settings",
            inv.join("demo-settings.toml").to_str().unwrap(),
            "--districts",
            inv.join("demo-districts.geojson").to_str().unwrap(),
            "--out",
            "r.xlsx",
            "--json",
            "r.json",
            "--csv",
            "r.csv",
            "--quiet",
        ]
        .iter()
        .map(|s| s.to_string())
        .collect();
        v.extend(extra.iter().map(|s| s.to_string()));
        v
    };
    let a = args(&["--samples", "50", "--seed", "3"]);
    let a: Vec<&str> = a.iter().map(String::as_str).collect();
    let run = crate::common::run_in(dir.path(), &a);
    assert!(
        run.status.success(),
        "{}",
        String::from_utf8_lossy(&run.stderr)
    );
    let json: serde_json::Value =
        serde_json::from_slice(&std::fs::read(dir.path().join("r.json")).unwrap()).unwrap();
    assert_eq!(json["settings"]["samples"], 50);
    assert_eq!(json["uncertainty"]["samples"], 50);
    assert_eq!(json["uncertainty"]["seed"], 3);
    let n = json["buildings"].as_array().unwrap().len() as u64;
    for b in json["buildings"].as_array().unwrap() {
        let u = &b["uncertainty"];
        assert_eq!(u["samples"], 50);
        let p: f64 = ["1", "2", "3", "4"]
            .iter()
            .map(|k| u["p_class"][k].as_f64().unwrap())
            .sum();
        assert!((p - 1.0).abs() < 1e-12, "{p}");
        let pd = u["p_deficit"].as_f64().unwrap();
        assert!(
            (pd - u["p_class"]["1"].as_f64().unwrap() - u["p_class"]["2"].as_f64().unwrap()).abs()
                < 1e-12
        );
        for q in ["score", "rank"] {
            let (a, m, c) = (
                u[q]["p05"].as_f64().unwrap(),
                u[q]["p50"].as_f64().unwrap(),
                u[q]["p95"].as_f64().unwrap(),
            );
            assert!(a <= m && m <= c, "{q}: {a} {m} {c}");
        }
        assert!(u["rank"]["p05"].as_u64().unwrap() >= 1);
        assert!(u["rank"]["p95"].as_u64().unwrap() <= n);
        let t = u["p_top_k"].as_f64().unwrap();
        assert!((0.0..=1.0).contains(&t));
    }
    let st = &json["uncertainty"];
    assert!(st["class_1_2_count"]["p05"].as_u64() <= st["class_1_2_count"]["p95"].as_u64());
    assert!(st["survey_next"].as_array().unwrap().len() <= 10);
    for plan in ["priority_walk", "max_occupants"] {
        assert!(
            json["budget_plan"][plan]["expected_occupants_protected"]
                .as_f64()
                .is_some()
        );
    }
    let csv = std::fs::read_to_string(dir.path().join("r.csv")).unwrap();
    let header = csv.lines().next().unwrap();
    assert!(header.ends_with("p_deficit,rank_p05,rank_p95"), "{header}");
    // The CSV's rank interval is the JSON's.
    let first: Vec<&str> = csv.lines().nth(1).unwrap().split(',').collect();
    let b0 = &json["buildings"][0]["uncertainty"];
    assert_eq!(first[first.len() - 2], b0["rank"]["p05"].to_string());
    assert_eq!(first[first.len() - 1], b0["rank"]["p95"].to_string());
    // The workbook: Confidence right after Priority, one row per building in rank order.
    use calamine::Reader;
    let mut wb: calamine::Xlsx<_> = calamine::open_workbook(dir.path().join("r.xlsx")).unwrap();
    let names = wb.sheet_names();
    let at = names.iter().position(|n| n == "Priority").unwrap();
    assert_eq!(names[at + 1], "Confidence");
    let conf = wb.worksheet_range("Confidence").unwrap();
    for (k, b) in json["buildings"].as_array().unwrap().iter().enumerate() {
        let row = k as u32 + 1;
        assert_eq!(
            conf.get_value((row, 1)).unwrap().to_string(),
            b["id"].as_str().unwrap()
        );
        assert_eq!(
            conf.get_value((row, 10)),
            Some(&calamine::Data::Float(
                b["uncertainty"]["p_deficit"].as_f64().unwrap()
            ))
        );
    }
    // The rank-interval chart is in the package.
    let charts = crate::outputs::workbook::package(&dir.path().join("r.xlsx"))
        .iter()
        .filter(|(name, _)| name.starts_with("xl/charts/chart"))
        .count();
    assert!(charts >= 4, "{charts}");
    // With --samples 0 (the demo settings ask for 200): null fields, no CSV columns.
    let a = args(&["--samples", "0"]);
    let a: Vec<&str> = a.iter().map(String::as_str).collect();
    let run = crate::common::run_in(dir.path(), &a);
    assert!(run.status.success());
    let json: serde_json::Value =
        serde_json::from_slice(&std::fs::read(dir.path().join("r.json")).unwrap()).unwrap();
    assert!(json["uncertainty"].is_null());
    assert!(json["buildings"][0]["uncertainty"].is_null());
    assert!(
        json["budget_plan"]["priority_walk"]
            .get("expected_occupants_protected")
            .is_none()
    );
    let csv = std::fs::read_to_string(dir.path().join("r.csv")).unwrap();
    assert!(!csv.lines().next().unwrap().contains("p_deficit"));
    // A sample store beyond 4 GiB is refused up front (exit 1, one line), not aborted.
    let a = args(&["--samples", "4000000000"]);
    let a: Vec<&str> = a.iter().map(String::as_str).collect();
    let o = crate::common::run_in(dir.path(), &a);
    assert_eq!(o.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&o.stderr).contains("GiB of samples"));
    // A negative seed is a usage error.
    let a = args(&["--samples", "5", "--seed", "-1"]);
    let a: Vec<&str> = a.iter().map(String::as_str).collect();
    assert_eq!(crate::common::run_in(dir.path(), &a).status.code(), Some(2));
}

#[test]
fn the_large_stock_layout_writes_the_confidence_rows_beside_the_workbook() {
    // interface.md, Large stocks: with --samples the Confidence rows go to
    // `<out stem>.confidence.csv` like the other per-row tables.
    use seistriage::report::workbook::{self, Layout};
    let report = screen_with(&demo("samples = 8"));
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("big.xlsx");
    let layout = Layout::of(&report).large_stock();
    let extra = workbook::write_with_layout(&report, &out, &layout, &|_| {}).unwrap();
    let csv_file = dir.path().join("big.confidence.csv");
    assert!(extra.iter().any(|(_, p)| p == &csv_file), "{extra:?}");
    let text = std::fs::read_to_string(&csv_file).unwrap();
    let mut lines = text.lines();
    let header = lines.next().unwrap();
    assert!(header.starts_with("rank,id,"), "{header}");
    assert!(header.contains("p_deficit") && header.contains("rank_p95"));
    assert_eq!(lines.count(), report.buildings.len());
}

#[test]
fn the_demo_draws_200_samples() {
    // method §13: `demo` runs the stage with N = 200 (through its bundled settings).
    let loaded = demo("");
    assert_eq!(
        loaded.settings.samples,
        seistriage::uncertainty::DEMO_SAMPLES
    );
    assert_eq!(seistriage::uncertainty::DEMO_SAMPLES, 200);
}

#[test]
fn the_binary_gives_the_same_samples_with_one_or_two_threads() {
    let dir = tempfile::tempdir().unwrap();
    let inv = inventories();
    let run = |threads: &str, json: &str| {
        let o = crate::common::run_in(
            dir.path(),
            &[
                "screen",
                inv.join("demo.xlsx").to_str().unwrap(),
                "--settings",
                inv.join("demo-settings.toml").to_str().unwrap(),
                "--out",
                "t.xlsx",
                "--json",
                json,
                "--samples",
                "30",
                "--seed",
                "11",
                "--threads",
                threads,
                "--quiet",
            ],
        );
        assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
        let v: serde_json::Value =
            serde_json::from_slice(&std::fs::read(dir.path().join(json)).unwrap()).unwrap();
        v
    };
    let one = run("1", "one.json");
    let two = run("2", "two.json");
    assert_eq!(one["uncertainty"], two["uncertainty"]);
    assert_eq!(one["buildings"], two["buildings"]);
    assert_eq!(one["budget_plan"], two["budget_plan"]);
}
