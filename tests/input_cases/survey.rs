//! Issue 14, "Never misread a survey", through the BUILT BINARY: header units converted or
//! refused, unit-mistake limits, survey text in numeric cells, blank wall areas in
//! `defaults_used`, swapped coordinates, `check` = screen's resolution, the command line
//! (`-` outputs, `--budget`, `--out`, settings keys), the demo on its own. For each tolerant
//! reading a dirty inventory and its clean twin give identical results (the JSON
//! `buildings` array compared as a whole).
//!
//! Conversion factors are the SI definitions (1 mm = 0.001 m, 1 cm² = 1e-4 m², 1 N/mm² =
//! 1 MPa, 1 kN/m² = 1 kPa); 9.81 m/s² per g is the value inventory.md prescribes. The
//! twins are chosen so that the converted value is the same double as the clean one
//! (e.g. 250 / 1000 = 0.25), so the results are compared exactly.

use std::path::{Path, PathBuf};
use std::process::{Command, Output};

use serde_json::Value;

use super::*;

fn run(dir: &Path, args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_seistriage"))
        .current_dir(dir)
        .args(args)
        .output()
        .unwrap()
}

fn text(o: &Output) -> String {
    format!(
        "{}\n--- stderr ---\n{}",
        String::from_utf8_lossy(&o.stdout),
        String::from_utf8_lossy(&o.stderr)
    )
}

/// Screens `inventory` (in `dir`) with `extra` options; returns the run and its JSON.
fn screen(dir: &Path, inventory: &str, extra: &[&str]) -> (Output, Value) {
    let stem = inventory.replace('.', "_");
    let json = format!("{stem}.json");
    let out = format!("{stem}.xlsx");
    let mut args = vec![
        "screen",
        inventory,
        "--out",
        out.as_str(),
        "--json",
        json.as_str(),
        "--quiet",
    ];
    args.extend_from_slice(extra);
    let o = run(dir, &args);
    assert!(o.status.success(), "{}", text(&o));
    let v: Value = serde_json::from_slice(&std::fs::read(dir.join(&json)).unwrap()).unwrap();
    (o, v)
}

fn problems(v: &Value) -> Vec<(String, Option<u64>, String, String, String)> {
    v["problems"]
        .as_array()
        .unwrap()
        .iter()
        .map(|p| {
            (
                p["sheet"].as_str().unwrap_or("").to_string(),
                p["row"].as_u64(),
                p["column"].as_str().unwrap_or("").to_string(),
                p["severity"].as_str().unwrap_or("").to_string(),
                p["message"].as_str().unwrap_or("").to_string(),
            )
        })
        .collect()
}

fn has_problem(v: &Value, column: &str, severity: &str, needle: &str) -> bool {
    problems(v)
        .iter()
        .any(|(_, _, c, s, m)| c == column && s == severity && m.contains(needle))
}

fn not_screened(v: &Value) -> Vec<(String, String)> {
    v["not_screened"]
        .as_array()
        .unwrap()
        .iter()
        .map(|n| {
            (
                n["id"].as_str().unwrap_or("").to_string(),
                n["reasons"]
                    .as_array()
                    .unwrap()
                    .iter()
                    .map(|r| r.as_str().unwrap_or("").to_string())
                    .collect::<Vec<_>>()
                    .join("; "),
            )
        })
        .collect()
}

fn write(dir: &Path, name: &str, body: &str) -> PathBuf {
    let p = dir.join(name);
    std::fs::write(&p, body).unwrap();
    p
}

const HAZARD: &str = "agr_g = 0.25\n";

#[test]
fn header_units_are_converted_with_a_warning_and_give_the_clean_twins_results() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    write(d, "h.toml", HAZARD);
    let dirty_head = [
        "id",
        "storeys",
        "Storey height (cm)",
        "Plan area [cm²]",
        "column area m2",
        "RC wall area X (m²)",
        "rc_wall_area_y_m2",
        "Wall thickness (mm)",
        "fc (N/mm²)",
        "Floor weight (kN/m²)",
        "agR [m/s²]",
    ];
    let clean_head = [
        "id",
        "storeys",
        "storey_height_m",
        "plan_area_m2",
        "column_area_m2",
        "rc_wall_area_x_m2",
        "rc_wall_area_y_m2",
        "wall_thickness_m",
        "fc_mpa",
        "floor_weight_kpa",
        "agr_g",
    ];
    // 310 cm = 3.1 m; 4,000,000 cm² = 400 m²; 250 mm = 0.25 m; 2.4525 m/s² = 0.25 g.
    let dirty = [
        S("U1"),
        N(5.0),
        N(310.0),
        N(4_000_000.0),
        N(4.0),
        N(6.0),
        N(5.0),
        N(250.0),
        N(20.0),
        N(12.0),
        N(2.4525),
    ];
    let clean = [
        S("U1"),
        N(5.0),
        N(3.1),
        N(400.0),
        N(4.0),
        N(6.0),
        N(5.0),
        N(0.25),
        N(20.0),
        N(12.0),
        N(0.25),
    ];
    let heads = |h: &[&'static str]| h.iter().map(|t| S(t)).collect::<Vec<_>>();
    workbook(
        d,
        "dirty.xlsx",
        &[("buildings", vec![heads(&dirty_head), dirty.to_vec()])],
    );
    workbook(
        d,
        "clean.xlsx",
        &[("buildings", vec![heads(&clean_head), clean.to_vec()])],
    );
    let (_, a) = screen(d, "dirty.xlsx", &[]);
    let (_, b) = screen(d, "clean.xlsx", &[]);
    assert_eq!(a["buildings"], b["buildings"]);
    assert_eq!(a["buildings"].as_array().unwrap().len(), 1);
    // One warning on the header row per conversion, naming it.
    for needle in [
        "\"Storey height (cm)\" is in cm: its values are converted to m (÷ 100)",
        "\"Plan area [cm²]\" is in cm²: its values are converted to m² (÷ 10000)",
        "\"Wall thickness (mm)\" is in mm: its values are converted to m (÷ 1000)",
        "\"agR [m/s²]\" is in m/s²: its values are converted to g (÷ 9.81)",
    ] {
        assert!(
            problems(&a).iter().any(|(s, r, _, sev, m)| s == "buildings"
                && *r == Some(1)
                && sev == "warning"
                && m.contains(needle)),
            "{needle}: {:#?}",
            problems(&a)
        );
    }
    // N/mm² is MPa and kN/m² is kPa: the canonical unit, no conversion, no warning.
    assert!(!problems(&a).iter().any(|p| p.4.contains("N/mm²")));
}

#[test]
fn an_unknown_or_wrong_kind_header_unit_is_an_error_and_the_column_is_not_used() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    write(d, "h.toml", HAZARD);
    let mut h = head();
    h.push(S("fc (psi)"));
    h.push(S("Wall thickness (kPa)"));
    let mut r = good("K1");
    r.push(N(3000.0));
    r.push(N(250.0));
    workbook(d, "k.xlsx", &[("buildings", vec![h, r])]);
    let (_, v) = screen(d, "k.xlsx", &["--settings", "h.toml"]);
    assert!(has_problem(
        &v,
        "fc_mpa",
        "error",
        "\"psi\", which the reader does not know"
    ));
    assert!(has_problem(
        &v,
        "wall_thickness_m",
        "error",
        "kPa, which is a stress"
    ));
    // Not used: the building is screened with the defaults, and says so.
    let b = &v["buildings"][0];
    let defaults: Vec<&str> = b["defaults_used"]
        .as_array()
        .unwrap()
        .iter()
        .filter_map(Value::as_str)
        .collect();
    assert!(
        defaults.contains(&"fc_mpa") && defaults.contains(&"wall_thickness_m"),
        "{defaults:?}"
    );
    // A required column with an unknown unit: one fatal line naming file, sheet, column.
    let mut h = head();
    h[3] = S("Plan area (ft²)");
    workbook(d, "f.xlsx", &[("buildings", vec![h, good("F1")])]);
    let o = run(d, &["screen", "f.xlsx", "--settings", "h.toml"]);
    let err = String::from_utf8_lossy(&o.stderr);
    assert_eq!(o.status.code(), Some(1), "{err}");
    assert_eq!(err.trim().lines().count(), 1, "{err}");
    assert!(
        err.contains("f.xlsx: sheet buildings: the required column(s) plan_area_m2 cannot be used")
            && err.contains("\"ft²\""),
        "{err}"
    );
}

#[test]
fn unit_mistakes_are_errors_naming_the_likely_unit_and_rare_values_are_warnings() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    write(d, "h.toml", HAZARD);
    let mut h = head();
    for c in [
        "storey_height_m",
        "wall_thickness_m",
        "agr_g",
        "floor_weight_kpa",
        "column_depth_m",
        "wall_length_x_m",
    ] {
        h.push(S(c));
    }
    let row = |id: &'static str, vals: [C; 6]| {
        let mut r = good(id);
        r.extend(vals);
        r
    };
    let rows = vec![
        h,
        row("M1", [N(3100.0), B, B, B, B, B]),
        row("M2", [B, N(400.0), B, B, B, B]),
        row("M3", [B, B, N(2.943), B, B, B]),
        row("M4", [B, B, B, N(1200.0), B, B]),
        row("M5", [B, B, B, B, N(40.0), B]),
        row("M6", [B, B, B, B, B, N(400.0)]),
        // Rare but real: used, with a warning.
        row("W1", [N(6.5), B, B, N(25.0), B, B]),
    ];
    workbook(d, "m.xlsx", &[("buildings", rows)]);
    let (_, v) = screen(d, "m.xlsx", &["--settings", "h.toml"]);
    let ns = not_screened(&v);
    let reason = |id: &str| {
        ns.iter()
            .find(|(i, _)| i == id)
            .map(|(_, r)| r.clone())
            .unwrap_or_default()
    };
    for (id, needle) in [
        (
            "M1",
            "storey height from 1.5 to 12 m, found 3100 m: it looks like mm (3.1 m)",
        ),
        ("M2", "it looks like mm (0.4 m)"),
        ("M3", "it looks like m/s² (0.3 g)"),
        ("M4", "floor weight from 2 to 40 kPa"),
        (
            "M5",
            "column depth from 0.1 to 3 m, found 40 m: it looks like cm (0.4 m)",
        ),
        // 400 mm = 0.4 m is a plausible wall length too; the first plausible unit is named.
        ("M6", "it looks like mm (0.4 m)"),
    ] {
        assert!(reason(id).contains(needle), "{id}: {}", reason(id));
    }
    assert_eq!(ns.len(), 6, "{ns:?}");
    let ids: Vec<&str> = v["buildings"]
        .as_array()
        .unwrap()
        .iter()
        .filter_map(|b| b["id"].as_str())
        .collect();
    assert_eq!(ids, ["W1"]);
    assert!(has_problem(
        &v,
        "storey_height_m",
        "warning",
        "unusual but possible"
    ));
    assert!(has_problem(
        &v,
        "floor_weight_kpa",
        "warning",
        "unusual but possible"
    ));
}

#[test]
fn storey_heights_of_the_storeys_sheet_get_the_buildings_rows_checks() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    write(d, "h.toml", HAZARD);
    let storeys = vec![
        vec![S("building_id"), S("storey"), S("height_m")],
        vec![S("S1"), N(1.0), N(3100.0)],
        vec![S("S2"), N(1.0), N(6.5)],
    ];
    workbook(
        d,
        "s.xlsx",
        &[
            ("buildings", vec![head(), good("S1"), good("S2")]),
            ("storeys", storeys),
        ],
    );
    let (_, v) = screen(d, "s.xlsx", &["--settings", "h.toml"]);
    assert_eq!(not_screened(&v).len(), 1, "{:?}", not_screened(&v));
    assert_eq!(not_screened(&v)[0].0, "S1");
    assert!(problems(&v).iter().any(|(s, r, c, sev, m)| s == "storeys"
        && *r == Some(2)
        && c == "height_m"
        && sev == "error"
        && m.contains("looks like mm (3.1 m)")));
    assert!(problems(&v).iter().any(|(s, r, _, sev, m)| s == "storeys"
        && *r == Some(3)
        && sev == "warning"
        && m.contains("unusual but possible")));
}

const SURVEY_HEAD: &str = "id,storeys,storey_height_m,plan_area_m2,column_area_m2,rc_wall_area_x_m2,rc_wall_area_y_m2,fc_mpa,floor_weight_kpa,year_built,wall_thickness_m\n";

#[test]
fn survey_text_is_read_with_a_warning_and_gives_the_clean_twins_results() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    write(d, "h.toml", HAZARD);
    write(
        d,
        "dirty.csv",
        &format!(
            "{SURVEY_HEAD}T1,5,\"3,2\",1 200,\"12,5\",6,5,20 MPa,12 kPa,c. 1960,250 mm\n\
             T2,4,3.1 m,1\u{a0}200.5,\"1.200,5\",6,5,\"20,0\",\"12,000\",ca 1975,0.25\n\
             T3,4,\"3,100\",1'200,10,6,5,25,12,~1980,25 cm\n\
             T4,4,3,400,10,6,5,25,12,\"1,980\",0.25\n"
        ),
    );
    write(
        d,
        "clean.csv",
        &format!(
            "{SURVEY_HEAD}T1,5,3.2,1200,12.5,6,5,20,12,1960,0.25\n\
             T2,4,3.1,1200.5,1200.5,6,5,20,12,1975,0.25\n\
             T3,4,3.1,1200,10,6,5,25,12,1980,0.25\n\
             T4,4,3,400,10,6,5,25,12,1980,0.25\n"
        ),
    );
    let (_, a) = screen(d, "dirty.csv", &["--settings", "h.toml"]);
    let (_, b) = screen(d, "clean.csv", &["--settings", "h.toml"]);
    assert_eq!(a["not_screened"], b["not_screened"]);
    assert_eq!(a["buildings"], b["buildings"]);
    assert_eq!(a["buildings"].as_array().unwrap().len(), 4);
    for (row, column, needle) in [
        (
            2,
            "storey_height_m",
            "read \"3,2\" as 3.2: the decimal comma is read as a decimal point (use a decimal point)",
        ),
        (
            2,
            "plan_area_m2",
            "the digit grouping (spaces or apostrophes) is removed",
        ),
        (2, "fc_mpa", "the unit \"MPa\" after the number is removed"),
        (
            2,
            "year_built",
            "the circa year \"c. 1960\" is read as the year",
        ),
        (
            2,
            "wall_thickness_m",
            "the value in mm is converted to m (÷ 1000)",
        ),
        (3, "column_area_m2", "both separators"),
        (
            3,
            "storey_height_m",
            "the unit \"m\" after the number is removed",
        ),
        (
            3,
            "floor_weight_kpa",
            "read \"12,000\" as 12 (decimal comma): the other reading, 12000, is refused",
        ),
        (
            4,
            "storey_height_m",
            "read \"3,100\" as 3.1 (decimal comma): the other reading, 3100, is refused",
        ),
        (4, "year_built", "~1980"),
        (
            5,
            "year_built",
            "the comma is read as a thousands separator (1.98 is not a year)",
        ),
    ] {
        assert!(
            problems(&a).iter().any(|(_, r, c, s, m)| *r == Some(row)
                && c == column
                && s == "warning"
                && m.contains(needle)),
            "row {row} {column}: {needle}\n{:#?}",
            problems(&a)
        );
    }
}

#[test]
fn an_ambiguous_comma_is_refused_showing_both_readings_or_settled_by_the_checks() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    write(d, "h.toml", HAZARD);
    write(
        d,
        "amb.csv",
        "id,storeys,plan_area_m2,column_area_m2,floor_weight_kpa\n\
         A1,4,\"1,200\",10,12\n\
         A2,4,400,10,\"12,000\"\n\
         A3,\"1,200\",400,10,12\n\
         A4,4,\"1.200.000\",10,12\n",
    );
    let (_, v) = screen(d, "amb.csv", &["--settings", "h.toml"]);
    let ns = not_screened(&v);
    let reason = |id: &str| {
        ns.iter()
            .find(|(i, _)| i == id)
            .map(|(_, r)| r.clone())
            .unwrap_or_default()
    };
    // Both plausible: refused, showing both.
    assert!(
        reason("A1")
            .contains("\"1,200\" is ambiguous: 1.2 (decimal comma) or 1200 (thousands separator)"),
        "{}",
        reason("A1")
    );
    // 12,000 kPa is refused, 12.000 kPa passes: used with a warning.
    assert!(has_problem(
        &v,
        "floor_weight_kpa",
        "warning",
        "read \"12,000\" as 12 (decimal comma)"
    ));
    // Storeys: 1.2 is not whole and 1200 is above 60: both readings refused, both shown.
    assert!(
        reason("A3").contains("reads as 1.2 (decimal comma)")
            && reason("A3").contains("1200 (thousands separator)"),
        "{}",
        reason("A3")
    );
    // A period alone is always the decimal mark: two of them are refused, with what to do.
    assert!(
        reason("A4").contains("write the number without thousands separators"),
        "{}",
        reason("A4")
    );
    assert_eq!(ns.len(), 3, "{ns:?}");
}

#[test]
fn a_unit_of_another_kind_in_a_cell_is_refused_with_what_to_do() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    write(d, "h.toml", HAZARD);
    write(
        d,
        "u.csv",
        "id,storeys,storey_height_m,plan_area_m2,column_area_m2,fc_mpa\n\
         C1,4,3 kPa,400,10,20\n\
         C2,4,3,400,10,20 psi\n\
         C3,4,3,400,10,20\n",
    );
    let (_, v) = screen(d, "u.csv", &["--settings", "h.toml"]);
    assert!(has_problem(
        &v,
        "storey_height_m",
        "error",
        "write the number without its unit"
    ));
    assert!(has_problem(
        &v,
        "fc_mpa",
        "error",
        "\"psi\", which the reader does not know"
    ));
    assert!(has_problem(
        &v,
        "fc_mpa",
        "error",
        "leave it blank for the default"
    ));
}

#[test]
fn blank_wall_areas_are_listed_in_defaults_used_and_on_the_flags_rows() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    write(d, "h.toml", HAZARD);
    write(
        d,
        "w.csv",
        "id,storeys,plan_area_m2,column_area_m2,rc_wall_area_x_m2,rc_wall_area_y_m2\n\
         F1,4,400,10,,\n\
         F2,4,400,10,5,\n\
         F3,4,400,10,0,0\n",
    );
    let (_, v) = screen(d, "w.csv", &["--settings", "h.toml"]);
    let defaults = |id: &str| -> Vec<String> {
        v["buildings"]
            .as_array()
            .unwrap()
            .iter()
            .find(|b| b["id"] == id)
            .unwrap()["defaults_used"]
            .as_array()
            .unwrap()
            .iter()
            .map(|s| s.as_str().unwrap().to_string())
            .collect()
    };
    let has = |id: &str, name: &str| defaults(id).iter().any(|d| d == name);
    assert!(has("F1", "rc_wall_area_x_m2") && has("F1", "rc_wall_area_y_m2"));
    assert!(!has("F2", "rc_wall_area_x_m2") && has("F2", "rc_wall_area_y_m2"));
    // 0 typed in the cell is a statement, not a default.
    assert!(!has("F3", "rc_wall_area_x_m2") && !has("F3", "rc_wall_area_y_m2"));
    // The building's flags name the defaults (the Flags sheet reads them from the flags).
    let flags = v["buildings"]
        .as_array()
        .unwrap()
        .iter()
        .find(|b| b["id"] == "F1")
        .unwrap()["flags"]
        .to_string();
    assert!(flags.contains("rc_wall_area_x_m2"), "{flags}");
}

#[test]
fn coordinates_out_of_range_or_swapped_are_named_and_missing_ones_counted() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    write(d, "h.toml", HAZARD);
    // A district around latitude 40–41, longitude 20–21 (invented).
    write(
        d,
        "d.geojson",
        r#"{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"name":"North"},
        "geometry":{"type":"Polygon","coordinates":[[[20,40],[21,40],[21,41],[20,41],[20,40]]]}}]}"#,
    );
    write(
        d,
        "c.csv",
        "id,storeys,plan_area_m2,column_area_m2,latitude,longitude\n\
         G1,4,400,10,40.5,20.5\n\
         G2,4,400,10,20.5,40.5\n\
         G3,4,400,10,120,40\n\
         G4,4,400,10,,\n\
         G5,4,400,10,95,200\n\
         G6,4,400,10,\"40,500\",\"20,500\"\n",
    );
    let o = run(
        d,
        &[
            "screen",
            "c.csv",
            "--settings",
            "h.toml",
            "--districts",
            "d.geojson",
            "--json",
            "c.json",
            "--out",
            "c.xlsx",
        ],
    );
    let summary = String::from_utf8_lossy(&o.stdout);
    assert!(o.status.success(), "{}", text(&o));
    let v: Value = serde_json::from_slice(&std::fs::read(d.join("c.json")).unwrap()).unwrap();
    assert!(has_problem(
        &v,
        "latitude",
        "warning",
        "latitude and longitude look swapped"
    ));
    let ns = not_screened(&v);
    let g3 = ns.iter().find(|(i, _)| i == "G3").unwrap();
    assert!(
        g3.1.contains("between -90 and 90, found 120; latitude and longitude look swapped"),
        "{g3:?}"
    );
    let g5 = ns.iter().find(|(i, _)| i == "G5").unwrap();
    assert!(!g5.1.contains("swapped"), "{g5:?}");
    // G2 is used as given (and so falls in no district); G4 has no coordinates.
    // "40,500" as a coordinate: 40500° is no coordinate, so 40.5 is used (with a warning).
    let g6 = v["buildings"]
        .as_array()
        .unwrap()
        .iter()
        .find(|b| b["id"] == "G6")
        .unwrap();
    assert_eq!(
        (g6["latitude"].as_f64(), g6["longitude"].as_f64()),
        (Some(40.5), Some(20.5))
    );
    assert_eq!(g6["district"], "North");
    assert!(
        summary.contains("1 buildings without coordinates are not in the GeoJSON or on the map"),
        "{summary}"
    );
}

#[test]
fn check_runs_screens_resolution_and_says_how_many_rows_will_be_screened() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    // No hazard anywhere: screen refuses every row; check says so and exits 1.
    workbook(
        d,
        "n.xlsx",
        &[("buildings", vec![head(), good("H1"), good("H2")])],
    );
    let o = run(d, &["check", "n.xlsx"]);
    let out = text(&o);
    assert_eq!(o.status.code(), Some(1), "{out}");
    assert!(
        out.contains("buildings, row 2: H1: not screened: no hazard given"),
        "{out}"
    );
    assert!(out.contains("0 rows will be screened"), "{out}");
    let s = run(d, &["screen", "n.xlsx", "--out", "n-out.xlsx"]);
    assert_eq!(s.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&s.stderr).contains("no hazard given"));
    // The hazard in one row: one row will be screened, exit 0; --strict: exit 1.
    let mut h = head();
    h.push(S("agr_g"));
    let mut r1 = good("H1");
    r1.push(N(0.2));
    let mut r2 = good("H2");
    r2.push(B);
    workbook(d, "o.xlsx", &[("buildings", vec![h, r1, r2])]);
    let o = run(d, &["check", "o.xlsx"]);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o));
    assert!(
        text(&o).contains("2 rows: 1 rows will be screened, 1 will not"),
        "{}",
        text(&o)
    );
    let o = run(d, &["check", "o.xlsx", "--strict"]);
    assert_eq!(o.status.code(), Some(1), "{}", text(&o));
    // The hazard in the settings sheet, as screen reads it.
    let settings = vec![vec![S("key"), S("value")], vec![S("agr_g"), S("0,2")]];
    workbook(
        d,
        "p.xlsx",
        &[
            ("buildings", vec![head(), good("H1")]),
            ("settings", settings),
        ],
    );
    let o = run(d, &["check", "p.xlsx", "--strict"]);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o));
    assert!(text(&o).contains("1 rows will be screened"), "{}", text(&o));
    assert!(
        text(&o).contains("warning: settings, row 2, agr_g: read \"0,2\" as 0.2"),
        "{}",
        text(&o)
    );
}

#[test]
fn a_workbook_without_a_buildings_sheet_is_read_from_its_first_sheet_or_refused_in_one_line() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    write(d, "h.toml", HAZARD);
    workbook(
        d,
        "first.xlsx",
        &[("Survey 2026", vec![head(), good("B1")])],
    );
    let o = run(d, &["check", "first.xlsx", "--settings", "h.toml"]);
    assert_eq!(o.status.code(), Some(0), "{}", text(&o));
    assert!(text(&o).contains("the first sheet \"Survey 2026\" is read as buildings"));
    workbook(
        d,
        "none.xlsx",
        &[
            ("Notes", vec![vec![S("hello")]]),
            ("Data", vec![head(), good("B1")]),
        ],
    );
    let o = run(d, &["check", "none.xlsx", "--settings", "h.toml"]);
    let err = String::from_utf8_lossy(&o.stderr);
    assert_eq!(o.status.code(), Some(1));
    assert_eq!(err.trim().lines().count(), 1, "{err}");
    assert!(
        err.contains("none.xlsx") && err.contains("sheets found: \"Notes\", \"Data\""),
        "{err}"
    );
    // A required column missing from the header: one line, not one per row.
    let mut h = head();
    h[2] = S("levels");
    let rows: Vec<Vec<C>> = std::iter::once(h)
        .chain((0..50).map(|_| good("R")))
        .collect();
    workbook(d, "miss.xlsx", &[("buildings", rows)]);
    let o = run(d, &["screen", "miss.xlsx", "--settings", "h.toml"]);
    let err = String::from_utf8_lossy(&o.stderr);
    assert_eq!(o.status.code(), Some(1));
    assert_eq!(err.trim().lines().count(), 1, "{err}");
    assert!(
        err.contains("miss.xlsx: sheet buildings: the required column(s) storeys are missing"),
        "{err}"
    );
}

#[test]
fn outputs_to_standard_output_and_their_usage_errors() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    write(d, "h.toml", HAZARD);
    workbook(
        d,
        "i.xlsx",
        &[("buildings", vec![head(), good("O1"), good("O2")])],
    );
    let to_stdout = |option: &str| {
        let o = run(
            d,
            &[
                "screen",
                "i.xlsx",
                "--settings",
                "h.toml",
                "--out",
                "r.xlsx",
                option,
                "-",
            ],
        );
        assert!(o.status.success(), "{option}: {}", text(&o));
        o
    };
    let o = to_stdout("--json");
    let v: Value = serde_json::from_slice(&o.stdout).expect("stdout is the JSON alone");
    assert_eq!(v["counts"]["screened"], 2);
    let err = String::from_utf8_lossy(&o.stderr);
    assert!(
        err.contains("JSON: standard output") && err.contains("CAUTION"),
        "{err}"
    );
    assert!(String::from_utf8_lossy(&to_stdout("--csv").stdout).starts_with("rank,id,"));
    assert!(String::from_utf8_lossy(&to_stdout("--geojson").stdout).contains("FeatureCollection"));
    let o = run(d, &["screen", "i.xlsx", "--json", "-", "--csv", "-"]);
    assert_eq!(o.status.code(), Some(2));
    assert!(String::from_utf8_lossy(&o.stderr).contains("only one output"));
    // A closed stdout: exit 0.
    let mut child = Command::new(env!("CARGO_BIN_EXE_seistriage"))
        .current_dir(d)
        .args([
            "screen",
            "i.xlsx",
            "--settings",
            "h.toml",
            "--out",
            "r.xlsx",
            "--json",
            "-",
        ])
        .stdout(std::process::Stdio::piped())
        .stderr(std::process::Stdio::null())
        .spawn()
        .unwrap();
    drop(child.stdout.take());
    assert_eq!(child.wait().unwrap().code(), Some(0));
}

#[test]
fn budget_and_out_are_checked_with_a_hint() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    write(d, "h.toml", HAZARD);
    workbook(d, "i.xlsx", &[("buildings", vec![head(), good("O1")])]);
    for ok in ["2000000", "2_000_000"] {
        let (_, v) = screen(d, "i.xlsx", &["--settings", "h.toml", "--budget", ok]);
        assert_eq!(v["settings"]["budget"], 2_000_000.0, "{ok}");
    }
    for (bad, hint) in [
        ("2,000,000", "without commas"),
        ("0", "positive"),
        ("=-5", "positive"),
        ("lots", "positive amount"),
    ] {
        let flag = if let Some(v) = bad.strip_prefix('=') {
            format!("--budget={v}")
        } else {
            format!("--budget={bad}")
        };
        let o = run(
            d,
            &["screen", "i.xlsx", "--settings", "h.toml", flag.as_str()],
        );
        assert_eq!(o.status.code(), Some(2), "{bad}");
        assert!(
            String::from_utf8_lossy(&o.stderr).contains(hint),
            "{bad}: {}",
            text(&o)
        );
    }
    let o = run(
        d,
        &[
            "screen",
            "i.xlsx",
            "--settings",
            "h.toml",
            "--out",
            "res.csv",
        ],
    );
    assert_eq!(o.status.code(), Some(2));
    assert!(
        String::from_utf8_lossy(&o.stderr).contains("use --csv FILE"),
        "{}",
        text(&o)
    );
    assert!(!d.join("res.csv").exists());
}

#[test]
fn unknown_settings_keys_are_reported_once_all_at_once_with_the_nearest_key() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    write(
        d,
        "bad.toml",
        "agr_g = 0.25\nbudjet = 100\nnear_falt_km = 5\n",
    );
    workbook(d, "i.xlsx", &[("buildings", vec![head(), good("O1")])]);
    let o = run(d, &["screen", "i.xlsx", "--settings", "bad.toml"]);
    let err = String::from_utf8_lossy(&o.stderr);
    assert_eq!(o.status.code(), Some(1));
    assert_eq!(err.trim().lines().count(), 1, "{err}");
    assert_eq!(err.matches("budjet").count(), 1, "{err}");
    assert!(err.contains("`budjet` (did you mean `budget`?)"), "{err}");
    assert!(
        err.contains("`near_falt_km` (did you mean `near_fault_km`?)"),
        "{err}"
    );
    // agR in m/s² in a settings file: refused with the hint.
    write(d, "ms.toml", "agr_g = 2.943\n");
    let o = run(d, &["check", "i.xlsx", "--settings", "ms.toml"]);
    let err = String::from_utf8_lossy(&o.stderr);
    assert_eq!(o.status.code(), Some(1));
    assert!(err.contains("it looks like m/s² (0.3 g)"), "{err}");
    // The same survey number rules in the file and in the sheet.
    write(d, "comma.toml", "agr_g = \"0,25\"\n");
    let (_, v) = screen(d, "i.xlsx", &["--settings", "comma.toml"]);
    assert_eq!(v["settings"]["agr_g"], 0.25);
    assert!(has_problem(&v, "agr_g", "warning", "read \"0,25\" as 0.25"));
}

#[test]
fn template_settings_writes_the_documented_settings_file() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    let o = run(
        d,
        &["template", "--out", "t.xlsx", "--settings", "conf/s.toml"],
    );
    assert!(o.status.success(), "{}", text(&o));
    let written = std::fs::read_to_string(d.join("conf/s.toml")).unwrap();
    let committed = std::fs::read_to_string(
        PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("templates/settings.toml"),
    )
    .unwrap();
    assert_eq!(
        written.replace("\r\n", "\n"),
        committed.replace("\r\n", "\n")
    );
    // Uncommented, it is a valid settings file.
    let uncommented: String = written
        .lines()
        .map(|l| {
            l.strip_prefix("# ")
                .filter(|l| l.contains(" = "))
                .unwrap_or(l)
        })
        .map(|l| format!("{l}\n"))
        .collect();
    let mut s = seistriage::settings::Settings::default();
    s.apply_toml(&uncommented).unwrap_or_else(|e| panic!("{e}"));
}

#[test]
fn the_bundled_demo_screens_on_its_own_like_the_demo_command() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    let o = run(d, &["demo", "--out", "demo", "--quiet"]);
    assert!(o.status.success(), "{}", text(&o));
    let demo: Value =
        serde_json::from_slice(&std::fs::read(d.join("demo/demo-screening.json")).unwrap())
            .unwrap();
    // On its own (no option): hazard, prices, budget and era table from its own sheets.
    let (_, alone) = screen(d, "demo/demo.xlsx", &[]);
    // With only the districts and faults the demo command adds: the demo's results exactly.
    let (_, geo) = screen(
        d,
        "demo/demo.xlsx",
        &[
            "--districts",
            "demo/demo-districts.geojson",
            "--faults",
            "demo/demo-faults.geojson",
        ],
    );
    for k in [
        "buildings",
        "counts",
        "budget_plan",
        "not_screened",
        "settings",
    ] {
        assert_eq!(geo[k], demo[k], "{k}");
    }
    // On its own it equals the demo's settings file without the geography.
    let (_, file) = screen(
        d,
        "demo/demo.xlsx",
        &["--settings", "demo/demo-settings.toml"],
    );
    assert_eq!(alone["buildings"], file["buildings"]);
    assert_eq!(alone["settings"], demo["settings"]);
    assert_eq!(alone["counts"]["screened"], demo["counts"]["screened"]);
}

#[test]
fn a_settings_key_renamed_by_revision_6_is_accepted_with_a_warning_naming_the_new_key() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    // Revision 6 (method §8): the wall factor `wall_capacity_factor` (a multiplier) became
    // the divisor `wall_rotation_divisor`; 1 / 0.625 = 1.6 exactly.
    write(
        d,
        "old.toml",
        "agr_g = 0.25\nwall_capacity_factor = 0.625\n",
    );
    write(d, "new.toml", "agr_g = 0.25\nwall_rotation_divisor = 1.6\n");
    workbook(
        d,
        "i.xlsx",
        &[("buildings", vec![head(), good("R1"), good("R2")])],
    );
    let (_, old) = screen(d, "i.xlsx", &["--settings", "old.toml"]);
    let (_, new) = screen(d, "i.xlsx", &["--settings", "new.toml"]);
    assert_eq!(old["buildings"], new["buildings"]);
    assert_eq!(old["settings"]["wall_rotation_divisor"], 1.6);
    assert!(
        has_problem(
            &old,
            "wall_capacity_factor",
            "warning",
            "is now `wall_rotation_divisor`"
        ),
        "{:#?}",
        problems(&old)
    );
    // In the settings sheet too, with its row number.
    let settings = vec![
        vec![S("key"), S("value")],
        vec![S("agr_g"), N(0.25)],
        vec![S("wall_capacity_factor"), N(0.625)],
    ];
    workbook(
        d,
        "s.xlsx",
        &[
            ("buildings", vec![head(), good("R1"), good("R2")]),
            ("settings", settings),
        ],
    );
    let (_, sheet) = screen(d, "s.xlsx", &[]);
    assert_eq!(sheet["buildings"], new["buildings"]);
    assert!(
        problems(&sheet)
            .iter()
            .any(|(s, r, c, sev, m)| s == "settings"
                && *r == Some(3)
                && c == "wall_capacity_factor"
                && sev == "warning"
                && m.contains("wall_rotation_divisor"))
    );
}
