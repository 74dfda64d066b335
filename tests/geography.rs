//! Tests: geography — districts (point in polygon, shared borders, holes, hazard
//! overrides), fault traces (nearest trace, near-fault limits of method §10) and bad
//! GeoJSON input (reported by feature, never fatal to the other features).

use seistriage::geography::{Geography, LatLon, MEAN_EARTH_RADIUS_M, locate};
use seistriage::model::{BuildingRecord, GroundType, Severity};
use seistriage::settings::Settings;

/// Metres per degree of arc on the contract's sphere.
fn m_per_deg() -> f64 {
    MEAN_EARTH_RADIUS_M * std::f64::consts::PI / 180.0
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
    assert!(
        (fault.distance_m - km * 1000.0).abs() < 0.5,
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
    assert!((f.distance_m - 0.05 * m_per_deg()).abs() < 1.0);
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
    assert!(p.message.starts_with("feature 2"), "{}", p.message);
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
