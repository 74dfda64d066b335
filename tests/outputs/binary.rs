//! The built binary on inventories the tests generate (canonical columns of inventory.md):
//! the workbook read back with calamine agrees with the JSON, number for number.

use std::path::{Path, PathBuf};

use calamine::{Data, Reader};
use serde_json::Value;

use super::workbook::{SHEETS, col, num, open, package, sheet, text};
use crate::common::run_in;

/// Canonical buildings-sheet columns written by the fixtures.
const COLUMNS: [&str; 17] = [
    "id",
    "name",
    "use",
    "year_built",
    "latitude",
    "longitude",
    "district",
    "storeys",
    "storey_height_m",
    "plan_area_m2",
    "column_area_m2",
    "rc_wall_area_x_m2",
    "rc_wall_area_y_m2",
    "infill_area_x_m2",
    "infill_area_y_m2",
    "occupants",
    "agr_g",
];

/// Invented buildings: text values as strings, numbers as numbers, `None` = blank cell.
pub fn fixture_rows() -> Vec<Vec<Option<String>>> {
    let mut rows = Vec::new();
    for i in 0..12usize {
        let s = |v: &str| Some(v.to_string());
        let name = match i {
            0 => "=1+1".to_string(),
            1 => "@SUM(1)".to_string(),
            _ => format!("Invented block {i}"),
        };
        let walls = if i.is_multiple_of(3) {
            0.0
        } else {
            1.0 + i as f64 * 0.6
        };
        rows.push(vec![
            s(&format!("T{:03}", i + 1)),
            Some(name),
            s(["residential", "school", "hospital", "office"][i % 4]),
            s(&(1965 + 3 * i).to_string()),
            (i % 4 != 3).then(|| format!("{}", 40.1 + 0.003 * i as f64)),
            (i % 4 != 3).then(|| format!("{}", 22.9 + 0.004 * i as f64)),
            s(["Northfield", "Riverside", "Hillcrest"][i % 3]),
            s(&(2 + i % 7).to_string()),
            s("3.0"),
            s(&format!("{}", 300.0 + 25.0 * i as f64)),
            s(&format!("{}", 1.2 + 0.15 * i as f64)),
            s(&format!("{walls}")),
            s(&format!("{}", walls * 0.8)),
            s("6.0"),
            s("4.0"),
            (!i.is_multiple_of(5)).then(|| (30 + 7 * i).to_string()),
            s("0.25"),
        ]);
    }
    rows
}

fn is_text_column(c: &str) -> bool {
    matches!(c, "id" | "name" | "use" | "district")
}

/// Writes the fixture as an .xlsx inventory (sheet `buildings`).
pub fn write_xlsx(path: &Path) {
    let mut wb = rust_xlsxwriter::Workbook::new();
    let ws = wb.add_worksheet().set_name("buildings").unwrap();
    for (c, name) in COLUMNS.iter().enumerate() {
        ws.write_string(0, c as u16, *name).unwrap();
    }
    for (r, row) in fixture_rows().iter().enumerate() {
        for (c, v) in row.iter().enumerate() {
            let Some(v) = v else { continue };
            let (r, c16) = (r as u32 + 1, c as u16);
            if is_text_column(COLUMNS[c]) {
                ws.write_string(r, c16, v).unwrap();
            } else {
                ws.write_number(r, c16, v.parse::<f64>().unwrap()).unwrap();
            }
        }
    }
    wb.save(path).unwrap();
}

/// Writes the fixture as a CSV inventory.
pub fn write_csv(path: &Path) {
    let mut w = csv::Writer::from_path(path).unwrap();
    w.write_record(COLUMNS).unwrap();
    for row in fixture_rows() {
        w.write_record(row.iter().map(|v| v.clone().unwrap_or_default()))
            .unwrap();
    }
    w.flush().unwrap();
}

struct Run {
    _dir: tempfile::TempDir,
    dir: PathBuf,
    out: PathBuf,
    json: Value,
    stdout: String,
    stderr: String,
}

fn screen(inventory: &str, quiet: bool) -> Run {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path().to_path_buf();
    if inventory.ends_with(".xlsx") {
        write_xlsx(&d.join(inventory));
    } else {
        write_csv(&d.join(inventory));
    }
    let mut args = vec![
        "screen",
        inventory,
        "--out",
        "r.xlsx",
        "--json",
        "r.json",
        "--csv",
        "r.csv",
        "--geojson",
        "r.geojson",
    ];
    if quiet {
        args.push("--quiet");
    }
    let o = run_in(&d, &args);
    assert!(
        o.status.success(),
        "exit {:?}\n{}",
        o.status.code(),
        String::from_utf8_lossy(&o.stderr)
    );
    let json: Value =
        serde_json::from_str(&std::fs::read_to_string(d.join("r.json")).unwrap()).unwrap();
    Run {
        out: d.join("r.xlsx"),
        dir: d,
        _dir: dir,
        json,
        stdout: String::from_utf8_lossy(&o.stdout).into_owned(),
        stderr: String::from_utf8_lossy(&o.stderr).into_owned(),
    }
}

fn f(v: &Value) -> Option<f64> {
    v.as_f64()
}

#[test]
fn workbook_from_the_binary_agrees_with_the_json() {
    let run = screen("inv.xlsx", true);
    let wb_sheets = open(&run.out).sheet_names();
    assert_eq!(wb_sheets, SHEETS);
    let buildings = run.json["buildings"].as_array().unwrap();
    assert!(!buildings.is_empty());
    assert_eq!(
        buildings.len() as u64,
        run.json["counts"]["screened"].as_u64().unwrap()
    );
    let p = sheet(&run.out, "Priority");
    assert_eq!(
        p.height() - 1,
        buildings.len(),
        "Priority rows = screened buildings"
    );
    for (i, b) in buildings.iter().enumerate() {
        let r = i + 1;
        assert_eq!(text(&p, r, col(&p, "Id")).as_deref(), b["id"].as_str());
        assert_eq!(num(&p, r, col(&p, "Rank")), f(&b["rank"]));
        assert_eq!(num(&p, r, col(&p, "Class")), f(&b["class"]));
        assert_eq!(num(&p, r, col(&p, "Score (governing DCR)")), f(&b["score"]));
        for (h, l) in [
            ("DCR IO (max of x, y)", "io"),
            ("DCR LS (max of x, y)", "ls"),
            ("DCR CP (max of x, y)", "cp"),
        ] {
            let x = f(&b["directions"]["x"]["dcr"][l]).unwrap();
            let y = f(&b["directions"]["y"]["dcr"][l]).unwrap();
            assert_eq!(num(&p, r, col(&p, h)), Some(x.max(y)), "{h}");
        }
        let pi = f(&b["directions"]["x"]["priority_index_pct"])
            .unwrap()
            .min(f(&b["directions"]["y"]["priority_index_pct"]).unwrap());
        assert_eq!(
            num(&p, r, col(&p, "Priority index, weaker direction (%)")),
            Some(pi)
        );
        assert_eq!(num(&p, r, col(&p, "Occupants")), f(&b["occupants"]));
        assert_eq!(num(&p, r, col(&p, "Latitude (deg)")), f(&b["latitude"]));
        assert_eq!(num(&p, r, col(&p, "Longitude (deg)")), f(&b["longitude"]));
        assert_eq!(
            text(&p, r, col(&p, "Governing direction")).as_deref(),
            b["governing"]["direction"].as_str()
        );
    }
    // Directions: every number of the JSON's directions, two rows per building.
    let d = sheet(&run.out, "Directions");
    assert_eq!(d.height() - 1, 2 * buildings.len());
    for (i, b) in buildings.iter().enumerate() {
        for (k, dir) in ["x", "y"].iter().enumerate() {
            let r = 1 + 2 * i + k;
            let j = &b["directions"][dir];
            assert_eq!(text(&d, r, col(&d, "Id")).as_deref(), b["id"].as_str());
            for (h, v) in [
                ("Wall index WI (%)", &j["wall_index_pct"]),
                ("Column index CI (%)", &j["column_index_pct"]),
                ("Priority index PI (%)", &j["priority_index_pct"]),
                ("Period used T (s)", &j["period_s"]),
                ("Roof drift δ_r (%)", &j["roof_drift_demand"]),
                ("Drift demand, walls (%)", &j["drift_demand"]["walls"]),
                ("Drift demand, columns (%)", &j["drift_demand"]["columns"]),
                ("Wall capacity LS (%)", &j["capacity"]["walls"]["ls"]),
                ("Column capacity CP (%)", &j["capacity"]["columns"]["cp"]),
                ("DCR IO (-)", &j["dcr"]["io"]),
                ("DCR LS (-)", &j["dcr"]["ls"]),
                ("DCR CP (-)", &j["dcr"]["cp"]),
                ("Axial load ratio ν (-)", &b["axial_load_ratio"]),
                (
                    "Strength coefficient C_y (-)",
                    &b["strength_coefficient"][dir],
                ),
            ] {
                assert_eq!(num(&d, r, col(&d, h)), f(v), "{} {dir} {h}", b["id"]);
            }
        }
    }
    // The inventory name `=1+1` comes back as text, wherever it ranks.
    let name_col = col(&p, "Name");
    let names: Vec<Data> = (1..p.height())
        .filter_map(|r| p.get((r, name_col)).cloned())
        .collect();
    assert!(names.contains(&Data::String("=1+1".into())), "{names:?}");
    assert!(names.contains(&Data::String("@SUM(1)".into())));
    // Charts exist in the package.
    let files = package(&run.out);
    for n in 1..=2 {
        assert!(
            files
                .iter()
                .any(|(f, _)| *f == format!("xl/charts/chart{n}.xml")),
            "chart{n}"
        );
    }
    // Flags sheet: one row per JSON flag.
    let flags: usize = buildings
        .iter()
        .map(|b| b["flags"].as_array().map_or(0, Vec::len))
        .sum();
    assert_eq!(sheet(&run.out, "Flags").height() - 1, flags);
}

#[test]
fn csv_and_geojson_from_the_binary_agree_with_the_json() {
    let run = screen("inv.xlsx", true);
    let buildings = run.json["buildings"].as_array().unwrap();
    let mut r = csv::Reader::from_path(run.dir.join("r.csv")).unwrap();
    assert_eq!(
        r.headers().unwrap().iter().collect::<Vec<_>>(),
        super::exports::CSV_COLUMNS
    );
    let rows: Vec<csv::StringRecord> = r.records().map(Result::unwrap).collect();
    assert_eq!(rows.len(), buildings.len());
    for (row, b) in rows.iter().zip(buildings) {
        assert_eq!(row[7].parse::<f64>().ok(), f(&b["score"]));
        let name = b["name"].as_str().unwrap();
        if name.starts_with('=') || name.starts_with('@') {
            assert_eq!(row[2], format!("'{name}"));
        } else {
            assert_eq!(&row[2], name);
        }
    }
    let gj: geojson::GeoJson = std::fs::read_to_string(run.dir.join("r.geojson"))
        .unwrap()
        .parse()
        .unwrap();
    let geojson::GeoJson::FeatureCollection(fc) = gj else {
        panic!("not a FeatureCollection")
    };
    let with_coords = buildings
        .iter()
        .filter(|b| b["latitude"].is_number() && b["longitude"].is_number())
        .count();
    assert_eq!(fc.features.len(), with_coords);
    assert!(with_coords < buildings.len());
}

#[test]
fn csv_inventory_gives_the_same_results_as_the_workbook_inventory() {
    let a = screen("inv.xlsx", true);
    let b = screen("inv.csv", true);
    assert_eq!(a.json["buildings"], b.json["buildings"]);
}

#[test]
fn terminal_summary_names_the_outputs_and_the_caution() {
    let run = screen("inv.xlsx", false);
    assert!(
        run.stdout.contains("Ten highest priorities"),
        "{}",
        run.stdout
    );
    assert!(run.stdout.contains("workbook: r.xlsx"));
    assert!(run.stdout.contains("JSON: r.json"));
    assert!(run.stdout.contains(seistriage::CAUTION));
    let first = run.json["buildings"][0]["id"].as_str().unwrap();
    assert!(run.stdout.contains(first));
}

#[test]
fn quiet_prints_nothing_and_no_progress_reaches_a_non_terminal() {
    let run = screen("inv.xlsx", true);
    assert_eq!(run.stdout, "");
    let run = screen("inv.xlsx", false);
    // stderr is a pipe here: the progress indicator stays hidden (no carriage returns or
    // escape sequences).
    assert!(
        !run.stderr.contains('\r') && !run.stderr.contains('\x1b'),
        "{:?}",
        run.stderr
    );
}
