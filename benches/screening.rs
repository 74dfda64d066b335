//! Benchmark: screening 10,000 synthetic buildings (engine + ranking, method §0-§11).

use criterion::{Criterion, Throughput, criterion_group, criterion_main};
use rayon::prelude::*;
use seistriage::engine::{BuildingInput, screen_all};
use seistriage::model::{BuildingRecord, GroundType, Use, YesNo};
use seistriage::settings::Settings;
use seistriage::uncertainty::{self, Evaluator};

/// 10,000 invented buildings with a deterministic spread of sizes, materials and hazard.
fn stock(n: usize) -> Vec<BuildingRecord> {
    (0..n)
        .map(|i| {
            let f = |k: usize, m: usize| ((i * k + 17) % m) as f64 / m as f64;
            let plan = 80.0 + 900.0 * f(37, 101);
            BuildingRecord {
                row: i + 2,
                id: format!("BLD-{i:05}"),
                name: format!("Invented block {i}"),
                use_: Some(Use::ALL[i % 5]),
                year_built: Some(1950 + (i % 70) as i32),
                storeys: 1 + (i % 12) as u32,
                storey_height_m: Some(2.8 + 0.4 * f(13, 7)),
                ground_storey_height_m: Some(3.0 + 1.5 * f(11, 5)),
                plan_area_m2: plan,
                column_area_m2: plan * (0.004 + 0.02 * f(7, 29)),
                column_depth_m: Some(0.3 + 0.3 * f(3, 11)),
                rc_wall_area_x_m2: Some(plan * 0.015 * f(19, 13)),
                rc_wall_area_y_m2: Some(plan * 0.015 * f(23, 17)),
                wall_length_x_m: Some(2.0 + 5.0 * f(5, 9)),
                wall_length_y_m: Some(2.0 + 5.0 * f(29, 9)),
                infill_area_x_m2: Some(plan * 0.03 * f(31, 19)),
                infill_area_y_m2: Some(plan * 0.03 * f(41, 23)),
                boundary_elements: Some([YesNo::Yes, YesNo::No, YesNo::Unknown][i % 3]),
                short_columns: Some(if i % 17 == 0 { YesNo::Yes } else { YesNo::No }),
                fc_mpa: Some(12.0 + 25.0 * f(43, 31)),
                fy_mpa: Some(if i % 2 == 0 { 420.0 } else { 280.0 }),
                occupants: Some((i % 300) as u64),
                ground_type: Some(
                    [
                        GroundType::A,
                        GroundType::B,
                        GroundType::C,
                        GroundType::D,
                        GroundType::E,
                    ][i % 5],
                ),
                agr_g: Some(0.1 + 0.3 * f(47, 37)),
                ..Default::default()
            }
        })
        .collect()
}

fn bench(c: &mut Criterion) {
    let recs = stock(10_000);
    let inputs: Vec<BuildingInput<'_>> = recs
        .iter()
        .map(|r| BuildingInput {
            record: r,
            walls: vec![],
            storeys: vec![],
            footprint: vec![],
            site: None,
        })
        .collect();
    let settings = Settings::default();
    let mut g = c.benchmark_group("screening");
    g.sample_size(10);
    g.bench_function("screen_all 10k buildings", |b| {
        b.iter(|| {
            let out = screen_all(&inputs, &settings);
            assert_eq!(out.buildings.len(), 10_000);
            out
        })
    });
    g.finish();

    // Method §13: building-samples per second of the sampler (draws, factors and the
    // re-run of class and score), on the same 10,000 buildings × 20 samples.
    let evaluators: Vec<(Evaluator, &str)> = inputs
        .iter()
        .filter_map(|i| Some((Evaluator::new(i, &settings).ok()?, i.record.id.as_str())))
        .collect();
    let mut g = c.benchmark_group("sampling");
    g.sample_size(10);
    const SAMPLES: u64 = 20;
    g.throughput(Throughput::Elements(evaluators.len() as u64 * SAMPLES));
    g.bench_function("building-samples (10k buildings x 20)", |b| {
        b.iter(|| {
            evaluators
                .par_iter()
                .map(|(ev, id)| {
                    let mut acc = 0.0;
                    for j in 1..=SAMPLES {
                        let z = uncertainty::building_normals(id, 1, j);
                        let f = uncertainty::factors(&z, 0.0, 0.2, 0.1, &settings);
                        acc += ev.evaluate(&f, &settings).score;
                    }
                    acc
                })
                .sum::<f64>()
        })
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
