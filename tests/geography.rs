//! Tests: geography — districts (point in polygon, shared borders, holes, hazard
//! overrides), fault traces (nearest trace, near-fault limits of method §10) and bad
//! GeoJSON input (reported by feature, never fatal to the other features).

use seistriage::geography::{Geography, LatLon, MEAN_EARTH_RADIUS_M, locate};
use seistriage::model::{BuildingRecord, GroundType, Severity};
use seistriage::settings::Settings;

/// Metres per degree of arc on the contract's sphere: R = 6 371 008.8 m (inventory.md), written
/// out here rather than taken from the program's constant, so that a wrong radius in the
/// program fails the distance checks below (along a meridian a sphere's great-circle
/// distance is exactly R·Δφ).
fn m_per_deg() -> f64 {
    6_371_008.8 * std::f64::consts::PI / 180.0
}

#[test]
fn the_earth_radius_is_the_contracts() {
    // inventory.md: sphere of mean radius 6 371 008.8 m (IUGG mean radius R1 of WGS84).
    assert_eq!(MEAN_EARTH_RADIUS_M, 6_371_008.8);
}

fn collection(features: &[String]) -> String {
    format!(
        r#"{{"type":"FeatureCollection","features":[{}]}}"#,
        features.join(",")
    )
}

fn feature(props: &str, geometry: &str) -> String {
    format!(r#"{{"type":"Feature","properties":{{{props}}},"geometry":{geometry}}}"#)
}

/// Square district with a square hole: outer 0..4 × 0..4 (lon × lat), hole 1..2 × 1..2.
fn holed_square() -> String {
    feature(
        r#""name":"Holed","agr_g":0.3,"ground_type":"B""#,
        r#"{"type":"Polygon","coordinates":[
            [[0,0],[4,0],[4,4],[0,4],[0,0]],
            [[1,1],[2,1],[2,2],[1,2],[1,1]]]}"#,
    )
}

fn holed() -> Geography {
    let (g, problems) = Geography::from_geojson_str(Some(&collection(&[holed_square()])), None)
        .expect("valid geojson");
    assert!(problems.is_empty(), "{problems:?}");
    g
}

#[test]
fn point_inside_the_polygon() {
    assert_eq!(
        holed().district_at(LatLon::new(3.0, 3.0)).unwrap().name,
        "Holed"
    );
}

#[test]
fn point_outside_the_polygon() {
    assert!(holed().district_at(LatLon::new(3.0, 5.0)).is_none());
    assert!(holed().district_at(LatLon::new(-0.001, 2.0)).is_none());
}

#[test]
fn point_on_an_edge_is_covered() {
    // geo's Contains is false on the boundary; the district test must use covers/intersects.
    assert_eq!(
        holed().district_at(LatLon::new(0.0, 2.5)).unwrap().name,
        "Holed"
    );
    assert_eq!(
        holed().district_at(LatLon::new(2.5, 4.0)).unwrap().name,
        "Holed"
    );
}

#[test]
fn point_on_a_vertex_is_covered() {
    assert_eq!(
        holed().district_at(LatLon::new(4.0, 4.0)).unwrap().name,
        "Holed"
    );
    assert_eq!(
        holed().district_at(LatLon::new(0.0, 0.0)).unwrap().name,
        "Holed"
    );
}

#[test]
fn point_in_a_hole_is_outside() {
    assert!(holed().district_at(LatLon::new(1.5, 1.5)).is_none());
    // The hole's edge is the polygon's boundary: covered.
    assert!(holed().district_at(LatLon::new(1.0, 1.5)).is_some());
}

#[test]
fn multipolygon_district_covers_both_parts() {
    let f = feature(
        r#""name":"Islands""#,
        r#"{"type":"MultiPolygon","coordinates":[
            [[[0,0],[1,0],[1,1],[0,1],[0,0]]],
            [[[5,5],[6,5],[6,6],[5,6],[5,5]]]]}"#,
    );
    let (g, p) = Geography::from_geojson_str(Some(&collection(&[f])), None).unwrap();
    assert!(p.is_empty());
    assert!(g.district_at(LatLon::new(0.5, 0.5)).is_some());
    assert!(g.district_at(LatLon::new(5.5, 5.5)).is_some());
    assert!(g.district_at(LatLon::new(3.0, 3.0)).is_none());
}

#[test]
fn overlap_and_shared_border_go_to_the_first_district_in_file_order() {
    let first = feature(
        r#""name":"First""#,
        r#"{"type":"Polygon","coordinates":[[[0,0],[2,0],[2,2],[0,2],[0,0]]]}"#,
    );
    let second = feature(
        r#""name":"Second""#,
        r#"{"type":"Polygon","coordinates":[[[2,0],[4,0],[4,2],[2,2],[2,0]]]}"#,
    );
    // Order 1: First, Second. Border x = 2 goes to First.
    let (g, _) =
        Geography::from_geojson_str(Some(&collection(&[first.clone(), second.clone()])), None)
            .unwrap();
    assert_eq!(g.district_at(LatLon::new(1.0, 2.0)).unwrap().name, "First");
    // Order 2: Second, First. The same border point goes to Second.
    let (g, _) = Geography::from_geojson_str(Some(&collection(&[second, first])), None).unwrap();
    assert_eq!(g.district_at(LatLon::new(1.0, 2.0)).unwrap().name, "Second");
}

fn building(
    id: &str,
    lat: Option<f64>,
    lon: Option<f64>,
    district: Option<&str>,
) -> BuildingRecord {
    BuildingRecord {
        row: 2,
        id: id.into(),
        storeys: 3,
        plan_area_m2: 200.0,
        column_area_m2: 2.0,
        latitude: lat,
        longitude: lon,
        district: district.map(str::to_string),
        ..BuildingRecord::default()
    }
}

#[test]
fn locate_assigns_district_and_its_hazard_and_reports_outsiders() {
    let g = holed();
    let mut outside = building("out", Some(10.0), Some(10.0), None);
    outside.row = 7;
    let buildings = vec![
        building("in", Some(3.0), Some(3.0), None),
        outside,
        building("given", Some(50.0), Some(50.0), Some("holed")),
        building("elsewhere", Some(3.0), Some(3.0), Some("Nowhere")),
    ];
    let (sites, problems) = locate(&buildings, &g, &Settings::default());
    assert_eq!(sites.len(), 4, "every building is placed, none dropped");
    let s = &sites["in"];
    assert_eq!(s.district, "Holed");
    assert_eq!(s.agr_g, Some(0.3));
    assert_eq!(s.ground_type, Some(GroundType::B));
    assert_eq!(s.sds_g, None);
    // Outside every district: kept, reported as a warning on its row.
    assert_eq!(sites["out"].district, "");
    let p = problems
        .iter()
        .find(|p| p.row == Some(7))
        .expect("outsider reported");
    assert_eq!(p.severity, Severity::Warning);
    assert!(
        p.message.contains("outside every district"),
        "{}",
        p.message
    );
    // A given district wins over the polygons; its hazard comes by (case-insensitive) name.
    assert_eq!(sites["given"].district, "holed");
    assert_eq!(sites["given"].agr_g, Some(0.3));
    // A given district not in the file: kept, no hazard, reported.
    assert_eq!(sites["elsewhere"].district, "Nowhere");
    assert_eq!(sites["elsewhere"].agr_g, None);
    assert!(
        problems
            .iter()
            .any(|p| p.message.contains("\"Nowhere\" is not in"))
    );
}

#[test]
fn locate_without_geography_keeps_the_given_district_and_reports_nothing() {
    let buildings = vec![
        building("a", None, None, Some("Old Quarter")),
        building("b", Some(1.0), Some(1.0), None),
    ];
    let (sites, problems) = locate(&buildings, &Geography::default(), &Settings::default());
    assert!(problems.is_empty());
    assert_eq!(sites["a"].district, "Old Quarter");
    assert_eq!(sites["b"].district, "");
    assert!(sites["b"].fault.is_none());
}

/// An east-west trace along latitude 0 from lon −1 to lon 1, with optional `mw`.
fn ew_trace(name: &str, mw: &str) -> String {
    let mw = if mw.is_empty() {
        String::new()
    } else {
        format!(r#","mw":{mw}"#)
    };
    feature(
        &format!(r#""name":"{name}"{mw}"#),
        r#"{"type":"LineString","coordinates":[[-1,0],[1,0]]}"#,
    )
}

/// Near-fault for a building `km` north of the middle of a trace of magnitude `mw`.
fn near_fault_at(km: f64, mw: &str, settings: &Settings) -> Option<f64> {
    let (g, problems) =
        Geography::from_geojson_str(None, Some(&collection(&[ew_trace("T", mw)]))).unwrap();
    assert!(problems.is_empty(), "{problems:?}");
    let lat = km * 1000.0 / m_per_deg();
    let b = building("x", Some(lat), Some(0.0), None);
    let (sites, _) = locate(&[b], &g, settings);
    let site = &sites["x"];
    let fault = site.fault.as_ref().expect("distance reported");
    assert_eq!(fault.name, "T");
    // 1 mm: spherical arithmetic in double precision (a radius 0.11 % off is metres off).
    assert!(
        (fault.distance_m - km * 1000.0).abs() < 1e-3,
        "{}",
        fault.distance_m
    );
    site.near_fault.as_ref().map(|n| n.limit_km)
}

#[test]
fn near_fault_thresholds_of_method_section_10() {
    // method §10 (after ASCE 7-16 §11.4.1): Mw ≥ 7 within 15 km; 6 ≤ Mw < 7 within 10 km;
    // no Mw within near_fault_km (10 km); Mw < 6 never.
    let s = Settings::default();
    assert_eq!(near_fault_at(14.9, "7.0", &s), Some(15.0));
    assert_eq!(near_fault_at(15.1, "7.3", &s), None);
    assert_eq!(near_fault_at(9.9, "6.0", &s), Some(10.0));
    assert_eq!(near_fault_at(12.0, "6.9", &s), None);
    assert_eq!(near_fault_at(9.9, "", &s), Some(10.0));
    assert_eq!(near_fault_at(10.1, "", &s), None);
    assert_eq!(near_fault_at(0.5, "5.9", &s), None);
}

#[test]
fn near_fault_thresholds_come_from_settings() {
    let s = Settings {
        near_fault_km: 3.0,
        near_fault_km_large: 20.0,
        ..Settings::default()
    };
    assert_eq!(near_fault_at(4.0, "", &s), None);
    assert_eq!(near_fault_at(19.0, "7.5", &s), Some(20.0));
}

#[test]
fn nearest_of_several_traces_is_reported() {
    let far = feature(
        r#""name":"Far","mw":6.5"#,
        r#"{"type":"LineString","coordinates":[[-1,1],[1,1]]}"#,
    );
    let near = feature(
        r#""name":"Near","mw":6.5"#,
        r#"{"type":"MultiLineString","coordinates":[[[5,5],[6,5]],[[-1,0.05],[1,0.05]]]}"#,
    );
    let (g, _) = Geography::from_geojson_str(None, Some(&collection(&[far, near]))).unwrap();
    let (sites, _) = locate(
        &[building("x", Some(0.0), Some(0.0), None)],
        &g,
        &Settings::default(),
    );
    let f = sites["x"].fault.as_ref().unwrap();
    assert_eq!(f.name, "Near");
    // The great circle through (−1°, 0.05°) and (1°, 0.05°) passes lon 0 at
    // φ0 = atan(tan 0.05° / cos 1°) (Napier's rule for the right spherical triangle), a little
    // north of the parallel; the building at (0, 0) is R·φ0 from it. 1 mm.
    let phi0 = (0.05f64.to_radians().tan() / 1.0f64.to_radians().cos()).atan();
    assert!((f.distance_m - phi0.to_degrees() * m_per_deg()).abs() < 1e-3);
    assert_eq!(sites["x"].near_fault.as_ref().unwrap().name, "Near");
}

#[test]
fn building_without_coordinates_is_reported_when_faults_are_given() {
    let (g, _) =
        Geography::from_geojson_str(None, Some(&collection(&[ew_trace("T", "7")]))).unwrap();
    let (sites, problems) = locate(
        &[building("x", None, None, Some("D"))],
        &g,
        &Settings::default(),
    );
    assert!(sites["x"].fault.is_none());
    assert!(
        problems
            .iter()
            .any(|p| p.message.contains("no fault distance"))
    );
}

/// Loads `bad` between two good districts and returns the single problem it causes.
fn bad_district(bad: &str) -> seistriage::model::Problem {
    let good = |name: &str, x: i32| {
        feature(
            &format!(r#""name":"{name}""#),
            &format!(
                r#"{{"type":"Polygon","coordinates":[[[{x},0],[{x1},0],[{x1},1],[{x},1],[{x},0]]]}}"#,
                x1 = x + 1
            ),
        )
    };
    let text = collection(&[good("G1", 0), bad.to_string(), good("G3", 10)]);
    let (g, problems) = Geography::from_geojson_str(Some(&text), None).expect("file usable");
    // The good features around the bad one are kept.
    let names: Vec<_> = g.districts().iter().map(|d| d.name.as_str()).collect();
    assert!(names.contains(&"G1") && names.contains(&"G3"), "{names:?}");
    assert_eq!(problems.len(), 1, "{problems:?}");
    let p = problems.into_iter().next().unwrap();
    assert_eq!(p.sheet, "districts");
    assert_eq!(p.row, Some(2), "feature number in file order");
    assert!(p.message.starts_with("feature 2 (index 1"), "{}", p.message);
    p
}

#[test]
fn unclosed_ring_is_reported_by_feature() {
    let p = bad_district(&feature(
        r#""name":"Open""#,
        r#"{"type":"Polygon","coordinates":[[[3,0],[4,0],[4,1],[3,1]]]}"#,
    ));
    assert_eq!(p.severity, Severity::Error);
    assert!(p.message.contains("not closed"), "{}", p.message);
}

#[test]
fn missing_coordinates_are_reported_by_feature() {
    let p = bad_district(&feature(r#""name":"Empty""#, r#"{"type":"Polygon"}"#));
    assert!(p.message.contains("missing coordinates"), "{}", p.message);
    let p = bad_district(&feature(r#""name":"Null""#, "null"));
    assert!(p.message.contains("missing geometry"), "{}", p.message);
    let p = bad_district(&feature(
        r#""name":"Short""#,
        r#"{"type":"Polygon","coordinates":[[[3],[4,0],[4,1],[3,1],[3]]]}"#,
    ));
    assert!(
        p.message.contains("missing coordinates") || p.message.contains("two or more"),
        "{}",
        p.message
    );
}

#[test]
fn wrong_geometry_type_is_reported_by_feature() {
    let p = bad_district(&feature(
        r#""name":"Line""#,
        r#"{"type":"LineString","coordinates":[[3,0],[4,1]]}"#,
    ));
    assert!(
        p.message.contains("wrong geometry type LineString"),
        "{}",
        p.message
    );
}

#[test]
fn latitude_outside_90_is_reported_by_feature() {
    // Swapped coordinates ([lat, lon] instead of [lon, lat]) are the usual cause.
    let p = bad_district(&feature(
        r#""name":"Swapped""#,
        r#"{"type":"Polygon","coordinates":[[[0,120],[1,120],[1,121],[0,121],[0,120]]]}"#,
    ));
    assert!(
        p.message.contains("latitude 120 outside ±90"),
        "{}",
        p.message
    );
}

#[test]
fn non_numeric_hazard_property_is_a_warning_and_the_district_is_kept() {
    let text = collection(&[feature(
        r#""name":"D","agr_g":"high","ground_type":"Z""#,
        r#"{"type":"Polygon","coordinates":[[[0,0],[1,0],[1,1],[0,1],[0,0]]]}"#,
    )]);
    let (g, problems) = Geography::from_geojson_str(Some(&text), None).unwrap();
    assert_eq!(g.districts().len(), 1);
    assert_eq!(problems.len(), 2, "{problems:?}");
    assert!(problems.iter().all(|p| p.severity == Severity::Warning));
    assert!(problems.iter().any(|p| p.column == "agr_g"));
    assert!(problems.iter().any(|p| p.column == "ground_type"));
}

#[test]
fn bad_fault_features_are_reported_and_the_others_still_measure() {
    let text = collection(&[
        feature(
            r#""name":"Words","mw":"large""#,
            r#"{"type":"LineString","coordinates":[[-1,0],[1,0]]}"#,
        ),
        feature(
            r#""name":"Area""#,
            r#"{"type":"Polygon","coordinates":[[[0,0],[1,0],[1,1],[0,0]]]}"#,
        ),
        feature(
            r#""name":"OnePoint""#,
            r#"{"type":"LineString","coordinates":[[0,0]]}"#,
        ),
        feature(
            r#""name":"Pole""#,
            r#"{"type":"LineString","coordinates":[[0,95],[1,0]]}"#,
        ),
    ]);
    let (g, problems) = Geography::from_geojson_str(None, Some(&text)).unwrap();
    let find = |row: usize| problems.iter().find(|p| p.row == Some(row)).unwrap();
    // Non-numeric mw: warning, trace kept as a trace without magnitude.
    assert_eq!(find(1).severity, Severity::Warning);
    assert!(find(1).message.contains("\"large\""), "{}", find(1).message);
    assert!(find(2).message.contains("wrong geometry type Polygon"));
    assert!(find(3).message.contains("at least 2"));
    assert!(find(4).message.contains("latitude 95 outside ±90"));
    assert_eq!(g.faults().count(), 1);
    // Without a magnitude the trace flags within near_fault_km (10 km) — 5 km here.
    let lat = 5000.0 / m_per_deg();
    let (sites, _) = locate(
        &[building("x", Some(lat), Some(0.0), None)],
        &g,
        &Settings::default(),
    );
    assert_eq!(sites["x"].near_fault.as_ref().unwrap().name, "Words");
}

#[test]
fn a_file_that_is_not_geojson_is_one_clear_error() {
    let err = Geography::from_geojson_str(Some("this is not json"), None).unwrap_err();
    assert!(err.to_string().contains("not a GeoJSON file"), "{err}");
    let err = Geography::from_geojson_str(Some(r#"{"type":"Topology"}"#), None).unwrap_err();
    assert!(err.to_string().contains("Topology"), "{err}");
}

#[test]
fn load_reads_files_and_reports_unreadable_paths() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("d.geojson");
    std::fs::write(&path, collection(&[holed_square()])).unwrap();
    let (g, problems) = Geography::load(Some(&path), None).unwrap();
    assert!(problems.is_empty());
    assert_eq!(g.districts().len(), 1);
    let missing = dir.path().join("missing.geojson");
    let err = Geography::load(None, Some(&missing)).unwrap_err();
    assert!(err.to_string().contains("missing.geojson"), "{err}");
}

#[test]
fn many_buildings_many_districts_give_the_same_answer_as_a_linear_scan() {
    // 20 × 10 grid of 0.1° districts and 2,000 buildings on a pseudo-random walk: the
    // R-tree lookup must agree with testing every polygon in file order.
    let mut feats = Vec::new();
    for i in 0..20 {
        for j in 0..10 {
            let (x, y) = (f64::from(i) * 0.1, f64::from(j) * 0.1);
            feats.push(feature(
                &format!(r#""name":"D{i}-{j}""#),
                &format!(
                    r#"{{"type":"Polygon","coordinates":[[[{x},{y}],[{x1},{y}],[{x1},{y1}],[{x},{y1}],[{x},{y}]]]}}"#,
                    x1 = x + 0.1,
                    y1 = y + 0.1
                ),
            ));
        }
    }
    let (g, problems) = Geography::from_geojson_str(Some(&collection(&feats)), None).unwrap();
    assert!(problems.is_empty());
    let mut state = 12345_u64;
    let mut next = || {
        state = state
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (state >> 11) as f64 / (1u64 << 53) as f64
    };
    use geo::Intersects;
    for _ in 0..2000 {
        let (lon, lat) = (next() * 2.2 - 0.1, next() * 1.2 - 0.1);
        let linear = g
            .districts()
            .iter()
            .find(|d| d.shape.intersects(&geo::Point::new(lon, lat)))
            .map(|d| d.name.clone());
        let indexed = g.district_at(LatLon::new(lat, lon)).map(|d| d.name.clone());
        assert_eq!(indexed, linear, "{lat} {lon}");
    }
}

#[test]
fn pruned_fault_search_agrees_with_measuring_every_trace() {
    use seistriage::geography::near_fault_limit_km;
    use seistriage::geography::sphere::point_polyline_distance_m;
    let mut state = 99_u64;
    let mut next = || {
        state = state
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (state >> 11) as f64 / (1u64 << 53) as f64
    };
    let mut feats = Vec::new();
    for t in 0..25 {
        let (mut x, mut y) = (20.0 + next() * 1.0, 40.0 + next() * 0.8);
        let mut coords = Vec::new();
        for _ in 0..(2 + t % 11) {
            coords.push(format!("[{x},{y}]"));
            x += (next() - 0.5) * 0.08;
            y += (next() - 0.5) * 0.08;
        }
        let mw = if t % 4 == 0 {
            String::new()
        } else {
            format!(r#","mw":{}"#, 5.5 + next() * 2.0)
        };
        feats.push(feature(
            &format!(r#""name":"F{t}"{mw}"#),
            &format!(
                r#"{{"type":"LineString","coordinates":[{}]}}"#,
                coords.join(",")
            ),
        ));
    }
    let (g, problems) = Geography::from_geojson_str(None, Some(&collection(&feats))).unwrap();
    assert!(problems.is_empty());
    let s = Settings::default();
    let traces: Vec<_> = g.faults().cloned().collect();
    let mut triggered = 0;
    for _ in 0..400 {
        let p = LatLon::new(39.8 + next() * 1.2, 19.8 + next() * 1.4);
        let dist = |t: &seistriage::geography::FaultTrace| {
            t.parts
                .iter()
                .map(|part| point_polyline_distance_m(p, part, MEAN_EARTH_RADIUS_M))
                .fold(f64::INFINITY, f64::min)
        };
        let brute_nearest = traces
            .iter()
            .map(|t| (dist(t), t.name.clone()))
            .min_by(|a, b| a.0.total_cmp(&b.0))
            .unwrap();
        let brute_trigger = traces
            .iter()
            .filter_map(|t| {
                let d = dist(t);
                near_fault_limit_km(t.mw, &s)
                    .filter(|l| d <= l * 1000.0)
                    .map(|_| (d, t.name.clone()))
            })
            .min_by(|a, b| a.0.total_cmp(&b.0));
        let (fault, near) = g.faults_near(p, &s);
        let fault = fault.unwrap();
        assert_eq!(fault.name, brute_nearest.1);
        assert!((fault.distance_m - brute_nearest.0).abs() < 1e-3);
        triggered += usize::from(near.is_some());
        assert_eq!(near.map(|n| n.name), brute_trigger.map(|t| t.1));
    }
    // Both outcomes were exercised.
    assert!(triggered > 20 && triggered < 380, "{triggered}");
}

#[test]
fn a_trace_bulging_past_its_vertices_is_still_found_nearest() {
    // Trace A runs along the great circle from (70 N, 20 W) to (70 N, 20 E); its middle
    // reaches 71.1° N (tan φ = tan 70° / cos 20°, Napier's rules), north of both vertices.
    // A building on that middle point is 0 km from A, while a short trace B lies 5 km
    // north of it. An index built on the vertices' boxes alone would answer B.
    let top = (70f64.to_radians().tan() / 20f64.to_radians().cos())
        .atan()
        .to_degrees();
    let b_lat = top + 5000.0 / m_per_deg();
    let a = feature(
        r#""name":"A","mw":6.5"#,
        r#"{"type":"LineString","coordinates":[[-20,70],[20,70]]}"#,
    );
    let b = feature(
        r#""name":"B","mw":6.5"#,
        &format!(r#"{{"type":"LineString","coordinates":[[-0.01,{b_lat}],[0.01,{b_lat}]]}}"#),
    );
    let (g, _) = Geography::from_geojson_str(None, Some(&collection(&[b, a]))).unwrap();
    let (fault, near) = g.faults_near(LatLon::new(top, 0.0), &Settings::default());
    let fault = fault.unwrap();
    assert_eq!(fault.name, "A");
    assert!(fault.distance_m < 1.0, "{}", fault.distance_m);
    assert_eq!(near.unwrap().name, "A");
}

#[test]
fn far_from_every_trace_the_nearest_is_still_reported() {
    // 2,000 km away: no near-fault, but the nearest trace and its distance are given.
    let (g, _) =
        Geography::from_geojson_str(None, Some(&collection(&[ew_trace("T", "7.5")]))).unwrap();
    let (fault, near) = g.faults_near(LatLon::new(20.0, 0.0), &Settings::default());
    let fault = fault.unwrap();
    assert_eq!(fault.name, "T");
    assert!((fault.distance_m - 20.0 * m_per_deg()).abs() < 1e-3);
    assert!(near.is_none());
}

mod never_panics {
    use super::*;
    use proptest::prelude::*;

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(200))]

        /// Arbitrary text as a districts or faults file: an error or problems, never a panic.
        #[test]
        fn arbitrary_text(text in ".{0,400}") {
            let _ = Geography::from_geojson_str(Some(&text), Some(&text));
        }

        /// Arbitrary coordinates (huge, tiny, out of range, repeated points, degenerate
        /// rings and traces) load and place buildings without panicking.
        #[test]
        fn arbitrary_coordinates(
            ring in proptest::collection::vec((-400.0f64..400.0, -200.0f64..200.0), 0..8),
            line in proptest::collection::vec((-400.0f64..400.0, -200.0f64..200.0), 0..8),
            lat in -100.0f64..100.0,
            lon in -200.0f64..200.0,
        ) {
            let coords = |v: &[(f64, f64)]| {
                v.iter().map(|(x, y)| format!("[{x},{y}]")).collect::<Vec<_>>().join(",")
            };
            let mut closed = ring.clone();
            if let Some(first) = ring.first() {
                closed.push(*first);
            }
            let d = collection(&[feature(
                r#""name":"D""#,
                &format!(r#"{{"type":"Polygon","coordinates":[[{}]]}}"#, coords(&closed)),
            )]);
            let f = collection(&[feature(
                r#""name":"F","mw":7"#,
                &format!(r#"{{"type":"LineString","coordinates":[{}]}}"#, coords(&line)),
            )]);
            let (g, _) = Geography::from_geojson_str(Some(&d), Some(&f)).unwrap();
            let b = building("x", Some(lat), Some(lon), None);
            let (sites, _) = locate(&[b], &g, &Settings::default());
            prop_assert!(sites.contains_key("x"));
            if let Some(fault) = &sites["x"].fault {
                prop_assert!(fault.distance_m >= 0.0 && fault.distance_m.is_finite());
            }
        }
    }
}
