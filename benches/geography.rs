//! Benchmark: placing 100,000 buildings against 200 district polygons and 50 fault traces
//! (geography issue), with the indexed lookup of `seistriage::geography::locate`, and a
//! linear scan (every polygon, every trace, no lower bound) on 10,000 buildings for
//! comparison. Run: `cargo bench --bench geography`.
#![allow(clippy::unwrap_used, clippy::expect_used)]

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use geo::Intersects;
use seistriage::geography::sphere::point_polyline_distance_m;
use seistriage::geography::{Geography, LatLon, MEAN_EARTH_RADIUS_M, locate};
use seistriage::model::BuildingRecord;
use seistriage::settings::Settings;

/// Deterministic pseudo-random numbers in [0, 1) (64-bit LCG, Knuth's MMIX constants).
struct Lcg(u64);
impl Lcg {
    fn next(&mut self) -> f64 {
        self.0 = self
            .0
            .wrapping_mul(6_364_136_223_846_793_005)
            .wrapping_add(1_442_695_040_888_963_407);
        (self.0 >> 11) as f64 / (1u64 << 53) as f64
    }
}

/// 200 twelve-sided districts tiling a 2° × 1° region (20 × 10 square cells, each edge
/// split in three), and 50 traces of 20 vertices; either part may be left out.
fn geography(with_districts: bool, with_faults: bool) -> Geography {
    let mut feats = Vec::new();
    for i in 0..20 {
        for j in 0..10 {
            let (x0, y0) = (30.0 + f64::from(i) * 0.1, 38.0 + f64::from(j) * 0.1);
            let mut ring = Vec::new();
            for k in 0..3 {
                ring.push((x0 + 0.1 * f64::from(k) / 3.0, y0));
            }
            for k in 0..3 {
                ring.push((x0 + 0.1, y0 + 0.1 * f64::from(k) / 3.0));
            }
            for k in 0..3 {
                ring.push((x0 + 0.1 - 0.1 * f64::from(k) / 3.0, y0 + 0.1));
            }
            for k in 0..3 {
                ring.push((x0, y0 + 0.1 - 0.1 * f64::from(k) / 3.0));
            }
            ring.push((x0, y0));
            let coords: Vec<String> = ring.iter().map(|(x, y)| format!("[{x},{y}]")).collect();
            feats.push(format!(
                r#"{{"type":"Feature","properties":{{"name":"D{i}-{j}"}},"geometry":{{"type":"Polygon","coordinates":[[{}]]}}}}"#,
                coords.join(",")
            ));
        }
    }
    let mut rng = Lcg(7);
    let mut traces = Vec::new();
    for t in 0..50 {
        let (mut x, mut y) = (29.5 + rng.next() * 3.0, 37.5 + rng.next() * 2.0);
        let mut coords = Vec::new();
        for _ in 0..20 {
            coords.push(format!("[{x},{y}]"));
            x += (rng.next() - 0.3) * 0.05;
            y += (rng.next() - 0.5) * 0.05;
        }
        let mw = 5.5 + rng.next() * 2.0;
        traces.push(format!(
            r#"{{"type":"Feature","properties":{{"name":"F{t}","mw":{mw}}},"geometry":{{"type":"LineString","coordinates":[{}]}}}}"#,
            coords.join(",")
        ));
    }
    let fc = |f: &[String]| {
        format!(
            r#"{{"type":"FeatureCollection","features":[{}]}}"#,
            f.join(",")
        )
    };
    let d = fc(&feats);
    let f = fc(&traces);
    let (g, problems) = Geography::from_geojson_str(
        with_districts.then_some(d.as_str()),
        with_faults.then_some(f.as_str()),
    )
    .unwrap();
    assert!(problems.is_empty());
    g
}

fn buildings(n: usize) -> Vec<BuildingRecord> {
    let mut rng = Lcg(11);
    (0..n)
        .map(|i| BuildingRecord {
            row: i + 2,
            id: format!("B{i}"),
            latitude: Some(38.0 + rng.next()),
            longitude: Some(30.0 + rng.next() * 2.0),
            storeys: 3,
            plan_area_m2: 300.0,
            column_area_m2: 3.0,
            ..BuildingRecord::default()
        })
        .collect()
}

/// The linear scan: every polygon in file order, every trace in full.
fn linear(bs: &[BuildingRecord], g: &Geography) -> usize {
    let mut found = 0;
    for b in bs {
        let (lat, lon) = (b.latitude.unwrap(), b.longitude.unwrap());
        let p = geo::Point::new(lon, lat);
        if g.districts().iter().any(|d| d.shape.intersects(&p)) {
            found += 1;
        }
        let d = g
            .faults()
            .flat_map(|f| f.parts.iter())
            .map(|part| point_polyline_distance_m(LatLon::new(lat, lon), part, MEAN_EARTH_RADIUS_M))
            .fold(f64::INFINITY, f64::min);
        black_box(d);
    }
    found
}

fn bench(c: &mut Criterion) {
    let g = geography(true, true);
    let districts_only = geography(true, false);
    let faults_only = geography(false, true);
    let settings = Settings::default();
    let big = buildings(100_000);
    let small = buildings(10_000);
    let mut group = c.benchmark_group("geography");
    group.sample_size(10);
    group.bench_function("locate 100k buildings, 200 districts, 50 traces", |b| {
        b.iter(|| black_box(locate(&big, &g, &settings)))
    });
    group.bench_function("locate 10k buildings (indexed)", |b| {
        b.iter(|| black_box(locate(&small, &g, &settings)))
    });
    group.bench_function("locate 10k buildings, districts only", |b| {
        b.iter(|| black_box(locate(&small, &districts_only, &settings)))
    });
    group.bench_function("locate 10k buildings, faults only", |b| {
        b.iter(|| black_box(locate(&small, &faults_only, &settings)))
    });
    group.bench_function("linear scan 10k buildings (no index, no bound)", |b| {
        b.iter(|| black_box(linear(&small, &g)))
    });
    group.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
