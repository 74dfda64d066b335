//! Tests: the bundled invented demo (committed files current, geography consistent) and
//! the generator of invented inventories.
//!
//! Set `SEISTRIAGE_BLESS=1` when running `committed_demo_files_are_current` to rewrite
//! `inventories/demo.xlsx`, `demo-districts.geojson` and `demo-faults.geojson` after a
//! deliberate change to `src/demo/`.

use std::io::Cursor;
use std::path::PathBuf;

use calamine::{Data, Reader, Xlsx, open_workbook_from_rs};
use seistriage::demo::{self, BUILDING_COLUMNS, Cell};
use seistriage::geography::{Geography, locate};
use seistriage::model::BuildingRecord;
use seistriage::settings::Settings;

fn inventories() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("inventories")
}

/// Every sheet of an .xlsx as (name, cells).
fn sheets(bytes: &[u8]) -> Vec<(String, calamine::Range<Data>)> {
    let mut wb: Xlsx<_> = open_workbook_from_rs(Cursor::new(bytes.to_vec())).expect("xlsx");
    let names = wb.sheet_names();
    names
        .into_iter()
        .map(|n| {
            let r = wb.worksheet_range(&n).expect("sheet");
            (n, r)
        })
        .collect()
}

#[test]
fn committed_demo_files_are_current() {
    let dir = inventories();
    let workbook = demo::demo_workbook().unwrap();
    let districts = demo::demo_districts_geojson();
    let faults = demo::demo_faults_geojson();
    if std::env::var_os("SEISTRIAGE_BLESS").is_some() {
        std::fs::write(dir.join(demo::INVENTORY_FILE), &workbook).unwrap();
        std::fs::write(dir.join(demo::DISTRICTS_FILE), &districts).unwrap();
        std::fs::write(dir.join(demo::FAULTS_FILE), &faults).unwrap();
    }
    let committed = std::fs::read(dir.join(demo::INVENTORY_FILE)).unwrap();
    assert_eq!(
        sheets(&committed),
        sheets(&workbook),
        "inventories/demo.xlsx is stale: rerun this test with SEISTRIAGE_BLESS=1"
    );
    let normalise = |s: String| s.replace("\r\n", "\n");
    let read = |name: &str| normalise(std::fs::read_to_string(dir.join(name)).unwrap());
    assert_eq!(read(demo::DISTRICTS_FILE), districts);
    assert_eq!(read(demo::FAULTS_FILE), faults);
}

#[test]
fn demo_workbook_has_the_canonical_sheets_and_headers() {
    let book = sheets(&demo::demo_workbook().unwrap());
    let names: Vec<_> = book.iter().map(|(n, _)| n.as_str()).collect();
    assert_eq!(
        names,
        [
            "buildings",
            "walls",
            "storeys",
            "footprints",
            "eras",
            "settings"
        ]
    );
    let (_, buildings) = &book[0];
    let header: Vec<String> = buildings
        .rows()
        .next()
        .unwrap()
        .iter()
        .map(|c| c.to_string())
        .collect();
    assert_eq!(header, BUILDING_COLUMNS);
    let expected: [&[&str]; 3] = [
        &demo::WALL_COLUMNS,
        &demo::STOREY_COLUMNS,
        &demo::FOOTPRINT_COLUMNS,
    ];
    for ((_, sheet), cols) in book[1..].iter().zip(expected) {
        let header: Vec<String> = sheet
            .rows()
            .next()
            .unwrap()
            .iter()
            .map(|c| c.to_string())
            .collect();
        assert_eq!(header, cols);
    }
}

/// The demo's building rows as minimal records (id, coordinates, district), read from the
/// generated cells (independent of the inventory reader).
fn demo_points() -> Vec<BuildingRecord> {
    let [buildings, ..] = demo::demo_tables();
    let col = |name: &str| BUILDING_COLUMNS.iter().position(|c| *c == name).unwrap();
    buildings
        .rows
        .iter()
        .filter(|r| !r.is_empty())
        .enumerate()
        .map(|(i, r)| {
            let n = |c: &Cell| match c {
                Cell::Number(v) => Some(*v),
                _ => None,
            };
            BuildingRecord {
                row: i + 2,
                id: format!("row{i}"),
                latitude: n(&r[col("latitude")]),
                longitude: n(&r[col("longitude")]),
                district: match &r[col("district")] {
                    Cell::Text(s) => Some(s.clone()),
                    _ => None,
                },
                ..BuildingRecord::default()
            }
        })
        .collect()
}

fn bundled_geography() -> Geography {
    let text = |b: &[u8]| String::from_utf8(b.to_vec()).unwrap();
    let (g, problems) = Geography::from_geojson_str(
        Some(&text(demo::BUNDLED_DISTRICTS)),
        Some(&text(demo::BUNDLED_FAULTS)),
    )
    .unwrap();
    assert!(problems.is_empty(), "{problems:?}");
    g
}

#[test]
fn demo_buildings_lie_in_the_bundled_districts_and_near_fault_varies() {
    let g = bundled_geography();
    assert!((3..=5).contains(&g.districts().len()));
    assert!(g.districts().iter().any(|d| d.hazard.agr_g.is_some()));
    assert_eq!(g.faults().count(), 2);
    assert!(g.faults().all(|f| f.mw.is_some()));
    let points = demo_points();
    let (sites, problems) = locate(&points, &g, &Settings::default());
    assert!(
        problems.is_empty(),
        "every demo building is inside a district: {problems:?}"
    );
    for b in &points {
        let site = &sites[&b.id];
        assert!(!site.district.is_empty());
        // A given district agrees with the polygon the point lies in.
        if let (Some(given), Some(lat), Some(lon)) = (&b.district, b.latitude, b.longitude) {
            let at = g
                .district_at(seistriage::geography::LatLon::new(lat, lon))
                .unwrap();
            assert_eq!(&at.name, given);
        }
    }
    let flagged_by = |name: &str| {
        sites
            .values()
            .filter(|s| s.near_fault.as_ref().is_some_and(|n| n.name == name))
            .count()
    };
    let not_flagged = sites.values().filter(|s| s.near_fault.is_none()).count();
    assert!(flagged_by("Karsavel Ridge fault") > 0);
    assert!(flagged_by("Orlin Valley fault") > 0);
    assert!(not_flagged > 0);
    let districts_used: std::collections::BTreeSet<_> =
        sites.values().map(|s| s.district.clone()).collect();
    assert_eq!(
        districts_used.len(),
        g.districts().len(),
        "{districts_used:?}"
    );
}

#[test]
fn demo_settings_file_is_valid_and_sets_the_demo_keys() {
    let mut s = Settings::default();
    s.apply_toml(std::str::from_utf8(demo::BUNDLED_SETTINGS).unwrap())
        .unwrap();
    s.validate().unwrap();
    assert_eq!(s.agr_g, Some(0.24));
    assert_eq!(s.era.len(), 3);
    assert!(s.boundary_elements_from_year.is_some());
    assert!(s.seismic_detailing_from_year.is_some());
    assert!(s.unit_cost_wall_m3.is_some() && s.unit_cost_floor_m2.is_some());
    assert!(s.budget.is_some());
}

#[test]
fn write_demo_files_copies_the_bundled_files() {
    let dir = tempfile::tempdir().unwrap();
    let files = demo::write_demo_files(&dir.path().join("out")).unwrap();
    assert_eq!(
        std::fs::read(&files.inventory).unwrap(),
        demo::BUNDLED_INVENTORY
    );
    for (p, bytes) in [
        (files.districts.unwrap(), demo::BUNDLED_DISTRICTS),
        (files.faults.unwrap(), demo::BUNDLED_FAULTS),
        (files.settings.unwrap(), demo::BUNDLED_SETTINGS),
    ] {
        assert_eq!(std::fs::read(p).unwrap(), bytes);
    }
}

#[test]
fn generated_csv_is_deterministic_canonical_and_complete() {
    let dir = tempfile::tempdir().unwrap();
    let (a, b, c) = (
        dir.path().join("a.csv"),
        dir.path().join("b.csv"),
        dir.path().join("c.csv"),
    );
    demo::write_generated(500, &a, 7).unwrap();
    demo::write_generated(500, &b, 7).unwrap();
    demo::write_generated(500, &c, 8).unwrap();
    assert_eq!(std::fs::read(&a).unwrap(), std::fs::read(&b).unwrap());
    assert_ne!(std::fs::read(&a).unwrap(), std::fs::read(&c).unwrap());
    let mut r = csv::Reader::from_path(&a).unwrap();
    let header: Vec<String> = r.headers().unwrap().iter().map(str::to_string).collect();
    assert_eq!(header, BUILDING_COLUMNS);
    let rows: Vec<_> = r.records().map(Result::unwrap).collect();
    assert_eq!(rows.len(), 500);
    let ids: std::collections::HashSet<_> = rows.iter().map(|r| r[0].to_string()).collect();
    assert_eq!(ids.len(), 500, "ids are unique");
    // No partial file is left beside the output.
    let leftovers = std::fs::read_dir(dir.path())
        .unwrap()
        .filter(|e| {
            e.as_ref()
                .unwrap()
                .file_name()
                .to_string_lossy()
                .ends_with(".partial")
        })
        .count();
    assert_eq!(leftovers, 0);
}

#[test]
fn generated_xlsx_has_every_row() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("g.xlsx");
    demo::write_generated(300, &out, 3).unwrap();
    let book = sheets(&std::fs::read(&out).unwrap());
    assert_eq!(book.len(), 1);
    let (name, range) = &book[0];
    assert_eq!(name, "buildings");
    assert_eq!(range.height(), 301);
    assert!(demo::write_generated(3, &dir.path().join("g.txt"), 3).is_err());
}

#[test]
fn listed_walls_lie_inside_their_footprints() {
    use geo::{Contains, Coord, LineString, Point, Polygon};
    let [_, walls, _, footprints] = demo::demo_tables();
    let text = |c: &Cell| match c {
        Cell::Text(s) => s.clone(),
        _ => String::new(),
    };
    let n = |c: &Cell| match c {
        Cell::Number(v) => *v,
        _ => f64::NAN,
    };
    let mut checked = 0;
    let ids: std::collections::BTreeSet<_> = footprints.rows.iter().map(|r| text(&r[0])).collect();
    for id in ids {
        let ring: Vec<Coord> = footprints
            .rows
            .iter()
            .filter(|r| text(&r[0]) == id)
            .map(|r| Coord {
                x: n(&r[2]),
                y: n(&r[3]),
            })
            .collect();
        let poly = Polygon::new(LineString::new(ring), vec![]);
        for w in walls.rows.iter().filter(|r| text(&r[0]) == id) {
            let (x, y) = (n(&w[5]), n(&w[6]));
            assert!(
                poly.contains(&Point::new(x, y)),
                "{id} wall {} at ({x}, {y})",
                text(&w[1])
            );
            checked += 1;
        }
    }
    assert!(checked >= 15, "{checked}");
}

#[test]
fn demo_command_screens_the_bundled_town_from_any_folder() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("demo-out");
    let run = crate::common::run_in(dir.path(), &["demo", "--out", "demo-out", "--quiet"]);
    assert!(
        run.status.success(),
        "{}",
        String::from_utf8_lossy(&run.stderr)
    );
    for f in [
        "demo.xlsx",
        "demo-districts.geojson",
        "demo-faults.geojson",
        "demo-settings.toml",
        "demo-screening.json",
    ] {
        assert!(out.join(f).exists(), "{f}");
    }
    let json: serde_json::Value =
        serde_json::from_slice(&std::fs::read(out.join("demo-screening.json")).unwrap()).unwrap();
    let buildings = json["buildings"].as_array().unwrap();
    // 64 rows, 5 planted faulty ones (a duplicated id counts twice).
    assert_eq!(buildings.len(), 59);
    assert!(
        buildings
            .iter()
            .all(|b| !b["district"].as_str().unwrap().is_empty())
    );
    assert!(
        buildings
            .iter()
            .all(|b| b["fault"]["distance_m"].as_f64().unwrap() > 0.0)
    );
    let near = buildings
        .iter()
        .filter(|b| {
            b["flags"]
                .as_array()
                .unwrap()
                .iter()
                .any(|f| f["code"] == "near-fault")
        })
        .count();
    assert!(near > 0 && near < buildings.len(), "{near}");
}

#[test]
fn generated_inventories_pass_check_without_problems() {
    let dir = tempfile::tempdir().unwrap();
    for file in ["g.csv", "g.xlsx"] {
        let args = [
            "generate",
            "--buildings",
            "40",
            "--out",
            file,
            "--seed",
            "5",
        ];
        let run = crate::common::run_in(dir.path(), &args);
        assert!(
            run.status.success(),
            "{}",
            String::from_utf8_lossy(&run.stderr)
        );
        // Generated rows carry no hazard: `check` resolves it as `screen` does.
        std::fs::write(dir.path().join("hazard.toml"), "agr_g = 0.25\n").unwrap();
        let check =
            crate::common::run_in(dir.path(), &["check", file, "--settings", "hazard.toml"]);
        let stdout = String::from_utf8_lossy(&check.stdout);
        assert!(check.status.success(), "{stdout}");
        let expected = "40 rows: 40 rows will be screened, 0 will not (0 with errors in the inventory, 0 at resolution), 0 blank rows skipped; 0 errors, 0 warnings";
        assert!(stdout.contains(expected), "{stdout}");
    }
}
