//! One test per bug found, named after it.

use seistriage::input::{ReadOptions, read_inventory};

fn read_csv_text(text: &str) -> seistriage::model::Inventory {
    let dir = tempfile::tempdir().unwrap();
    let p = dir.path().join("r.csv");
    std::fs::write(&p, text).unwrap();
    read_inventory(&p, &ReadOptions::default()).unwrap()
}

/// The csv crate skips blank lines and gives the next record the position where reading
/// started (the blank line), so row numbers came out one short after each blank line.
#[test]
fn csv_record_after_a_blank_line_keeps_its_own_row_number() {
    let inv = read_csv_text("id,storeys,plan_area_m2,column_area_m2\nA,3,200,2\n\n\nB,3,200,2\n");
    let rows: Vec<_> = inv.buildings.iter().map(|b| b.row).collect();
    assert_eq!(rows, vec![2, 5]);
    assert_eq!(inv.blank_rows, 2);
}

/// Same with CRLF line ends: the LF of a CRLF pair must not be counted as a blank line.
#[test]
fn csv_crlf_line_ends_are_not_counted_as_blank_lines() {
    let inv = read_csv_text(
        "id,storeys,plan_area_m2,column_area_m2\r\nA,3,200,2\r\nB,3,200,2\r\n\r\nC,3,200,2\r\n",
    );
    let rows: Vec<_> = inv.buildings.iter().map(|b| b.row).collect();
    assert_eq!(rows, vec![2, 3, 5]);
    assert_eq!(inv.blank_rows, 1);
}

/// A quoted field spanning two lines is one record: the next record is the next row.
#[test]
fn csv_multi_line_quoted_field_is_one_row() {
    let inv = read_csv_text(
        "id,name,storeys,plan_area_m2,column_area_m2\nA,\"two\nlines\",3,200,2\nB,x,3,200,2\n",
    );
    let rows: Vec<_> = inv.buildings.iter().map(|b| b.row).collect();
    assert_eq!(rows, vec![2, 3]);
    assert_eq!(inv.blank_rows, 0);
}

/// Found by the hostile-input property test (corpus in
/// tests/input_cases/hostile.proptest-regressions): calamine subtracts the start of an .xlsx
/// `<dimension ref>` from its end and panicked on `A9:D3`. Now one "cannot read" error.
#[test]
fn xlsx_dimension_ending_before_it_starts_is_unreadable_not_a_panic() {
    use std::io::{Read, Write};
    let dir = tempfile::tempdir().unwrap();
    let src = dir.path().join("ok.xlsx");
    let mut wb = rust_xlsxwriter::Workbook::new();
    one_building_sheet(&mut wb);
    wb.save(&src).unwrap();
    let mut z = zip::ZipArchive::new(std::fs::File::open(&src).unwrap()).unwrap();
    let bad = dir.path().join("bad.xlsx");
    let mut out = zip::ZipWriter::new(std::fs::File::create(&bad).unwrap());
    for i in 0..z.len() {
        let mut f = z.by_index(i).unwrap();
        let name = f.name().unwrap().to_string();
        let mut b = Vec::new();
        f.read_to_end(&mut b).unwrap();
        if name == "xl/worksheets/sheet1.xml" {
            let t = String::from_utf8(b).unwrap();
            assert!(t.contains(r#"<dimension ref="A1:D2"/>"#), "{t}");
            b = t
                .replace(r#"<dimension ref="A1:D2"/>"#, r#"<dimension ref="A9:D3"/>"#)
                .into_bytes();
        }
        out.start_file(name.as_str(), zip::write::SimpleFileOptions::default())
            .unwrap();
        out.write_all(&b).unwrap();
    }
    out.finish().unwrap();
    let e = read_inventory(&bad, &ReadOptions::default());
    // Either calamine reads it (release builds wrap the subtraction) or it is one clear error.
    if let Err(e) = e {
        assert!(e.to_string().contains("cannot read the file"), "{e}");
    }
}

/// Found by the hostile-input property test: a compound file (.xls) cut inside a sector made
/// calamine panic on a sector whose length is not a multiple of 4.
#[test]
fn truncated_compound_file_is_unreadable_not_a_panic() {
    let wb = crate::input_cases::cases::biff_workbook(&[(0, 0), (3, 2)]);
    let mut b = crate::input_cases::cases::compound_file(&[("Workbook", wb)]);
    b.truncate(512 + 301); // inside the FAT sector
    let dir = tempfile::tempdir().unwrap();
    let p = dir.path().join("cut.xls");
    std::fs::write(&p, &b).unwrap();
    let e = read_inventory(&p, &ReadOptions::default()).unwrap_err();
    assert!(e.to_string().contains("cannot read the file"), "{e}");
}

/// The delimiter was sniffed from the first non-blank line only: a title line above a
/// `;`-separated header made the whole file read as one column (no header found).
#[test]
fn csv_title_line_above_a_semicolon_header_does_not_hide_the_delimiter() {
    let inv = read_csv_text(
        "Invented district inventory\n\nid;storeys;plan_area_m2;column_area_m2\nA;3;212,5;2\n",
    );
    assert_eq!(inv.buildings.len(), 1, "{:#?}", inv.problems);
    assert_eq!(inv.buildings[0].plan_area_m2, 212.5);
    assert_eq!(inv.buildings[0].row, 4);
}

/// An inventory CSV with a sibling settings file, and the problems `load` reports.
fn load_with_settings_csv(
    buildings: &str,
    settings: &str,
    toml: Option<&str>,
) -> seistriage::pipeline::Loaded {
    let dir = tempfile::tempdir().unwrap();
    let p = dir.path().join("town.csv");
    std::fs::write(&p, buildings).unwrap();
    std::fs::write(dir.path().join("town.settings.csv"), settings).unwrap();
    let mut opts = seistriage::pipeline::RunOptions::default();
    if let Some(t) = toml {
        let f = dir.path().join("s.toml");
        std::fs::write(&f, t).unwrap();
        opts.settings_file = Some(f);
    }
    seistriage::pipeline::load(&p, &opts).unwrap()
}

/// Settings-sheet problems (unknown key, unreadable value, value out of range) carried no
/// row, unlike every other input problem: now the sheet row a person sees (CSV: record
/// number, header = 1; inventory.md, "Bad input").
#[test]
fn settings_sheet_problems_carry_their_sheet_row() {
    let loaded = load_with_settings_csv(
        "id,storeys,plan_area_m2,column_area_m2\nA,3,200,2\n",
        "key,value\nagr_g,0.25\nno_such_key,1\nfloor_weight_kpa,heavy\n\ngamma_el,-1\n",
        None,
    );
    let rows: Vec<_> = loaded
        .inventory
        .problems
        .iter()
        .filter(|p| p.sheet == "settings")
        .map(|p| (p.row, p.column.as_str()))
        .collect();
    assert_eq!(
        rows,
        vec![
            (Some(3), "no_such_key"),
            (Some(4), "floor_weight_kpa"),
            (Some(6), "gamma_el")
        ],
        "{:#?}",
        loaded.inventory.problems
    );
    // The refused rows leave the built-in defaults in force; the good row applies.
    assert_eq!(loaded.settings.agr_g, Some(0.25));
    assert_eq!(loaded.settings.floor_weight_kpa, 12.0);
    assert_eq!(loaded.settings.gamma_el, 1.5);
}

/// The same in a workbook whose settings sheet has a title row above its header: the row is
/// the spreadsheet's, title and header included.
#[test]
fn settings_sheet_problems_in_a_workbook_carry_the_spreadsheet_row() {
    let dir = tempfile::tempdir().unwrap();
    let p = dir.path().join("w.xlsx");
    let mut wb = rust_xlsxwriter::Workbook::new();
    one_building_sheet(&mut wb);
    let ws = wb.add_worksheet();
    ws.set_name("settings").unwrap();
    ws.write_string(0, 0, "Invented project settings").unwrap();
    ws.write_string(1, 0, "key").unwrap();
    ws.write_string(1, 1, "value").unwrap();
    ws.write_string(2, 0, "agr_g").unwrap();
    ws.write_number(2, 1, 0.2).unwrap();
    ws.write_string(3, 0, "spectrum").unwrap();
    ws.write_string(3, 1, "type-9").unwrap();
    wb.save(&p).unwrap();
    let loaded = seistriage::pipeline::load(&p, &Default::default()).unwrap();
    let bad: Vec<_> = loaded
        .inventory
        .problems
        .iter()
        .filter(|p| p.sheet == "settings")
        .collect();
    assert_eq!(bad.len(), 1, "{bad:#?}");
    assert_eq!(bad[0].row, Some(4));
    assert!(
        bad[0]
            .to_string()
            .starts_with("warning: settings, row 4, spectrum: "),
        "{}",
        bad[0]
    );
}

/// 70 storeys; storey height 6.5 m and floor weight 22 kPa (both beyond the default warning
/// ranges of inventory.md).
const TALL: &str = "id,storeys,storey_height_m,floor_weight_kpa,plan_area_m2,column_area_m2\n\
                    T,70,6.5,22,900,40\nS,5,3,12,200,2\n";

fn storey_and_range_problems(loaded: &seistriage::pipeline::Loaded) -> Vec<String> {
    loaded
        .inventory
        .problems
        .iter()
        .filter(|p| {
            p.sheet == "buildings"
                && ["storeys", "storey_height_m", "floor_weight_kpa"].contains(&p.column.as_str())
        })
        .map(|p| p.column.clone())
        .collect()
}

/// The reader's plausibility limits (max_storeys, storey_height_min/max_m,
/// floor_weight_min/max_kpa) are settings keys, but the rows were checked against the
/// built-in defaults: overrides in the settings sheet or the --settings file never reached
/// them. Precedence: defaults < settings sheet < settings file (inventory.md).
#[test]
fn settings_overrides_of_the_plausibility_limits_reach_the_row_checks() {
    let toml_limits = "max_storeys = 80\nstorey_height_max_m = 7\nfloor_weight_max_kpa = 25\n";
    // Defaults: 70 storeys refused, 6.5 m and 22 kPa warned.
    let d = load_with_settings_csv(TALL, "key,value\n", None);
    assert_eq!(d.inventory.buildings.len(), 1);
    assert_eq!(
        storey_and_range_problems(&d),
        vec!["storeys", "storey_height_m", "floor_weight_kpa"]
    );
    // From the settings file.
    let f = load_with_settings_csv(TALL, "key,value\n", Some(toml_limits));
    assert_eq!(
        f.inventory.buildings.len(),
        2,
        "{:#?}",
        f.inventory.problems
    );
    assert!(storey_and_range_problems(&f).is_empty());
    // From the settings sheet.
    let s = load_with_settings_csv(
        TALL,
        "key,value\nmax_storeys,80\nstorey_height_max_m,7\nfloor_weight_max_kpa,25\n",
        None,
    );
    assert_eq!(
        s.inventory.buildings.len(),
        2,
        "{:#?}",
        s.inventory.problems
    );
    assert!(storey_and_range_problems(&s).is_empty());
    // The file wins over the sheet.
    let both = load_with_settings_csv(
        TALL,
        "key,value\nmax_storeys,80\n",
        Some("max_storeys = 65\n"),
    );
    assert_eq!(both.settings.max_storeys, 65.0);
    assert_eq!(both.inventory.buildings.len(), 1);
    assert!(
        both.inventory
            .problems
            .iter()
            .any(|p| p.column == "storeys" && p.message.contains("from 1 to 65")),
        "{:#?}",
        both.inventory.problems
    );
}

/// `check` and the streaming path of `screen` use the same effective limits as the
/// whole-stock path.
#[test]
fn settings_overrides_of_the_plausibility_limits_reach_check_and_the_streaming_path() {
    let dir = tempfile::tempdir().unwrap();
    std::fs::write(dir.path().join("tall.csv"), TALL).unwrap();
    std::fs::write(
        dir.path().join("s.toml"),
        "agr_g = 0.2\nmax_storeys = 80\nstorey_height_max_m = 7\nfloor_weight_max_kpa = 25\n",
    )
    .unwrap();
    let out = crate::common::run_in(dir.path(), &["check", "tall.csv", "--settings", "s.toml"]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(out.status.success(), "{text}");
    assert!(text.contains("2 accepted, 0 rejected"), "{text}");
    assert!(text.contains("0 errors, 0 warnings"), "{text}");
    let out = std::process::Command::new(crate::common::bin())
        .current_dir(dir.path())
        .env("SEISTRIAGE_STREAM_FROM", "1")
        .env("SEISTRIAGE_STREAM_CHUNK", "1")
        .args([
            "screen",
            "tall.csv",
            "--settings",
            "s.toml",
            "--out",
            "o.xlsx",
            "--csv",
            "p.csv",
            "--quiet",
        ])
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    // The per-row files beside the workbook show that the streaming path ran.
    assert!(dir.path().join("o.directions.csv").exists());
    let csv = std::fs::read_to_string(dir.path().join("p.csv")).unwrap();
    assert!(
        csv.lines().any(|l| l.split(',').nth(1) == Some("T")),
        "{csv}"
    );
}

/// A district ring that crosses the antimeridian without being cut (RFC 7946 §3.1.9 says
/// SHOULD cut; producers do not always) jumps from 179° to −179° and, read as plane
/// coordinates, covered every longitude except its own 2°. Now the ring is made continuous
/// and a building is found in it on either side of ±180°; a district cut into a
/// MultiPolygon at ±180° covers both sides too, and the R-tree lookup keeps file order.
#[test]
fn district_ring_crossing_the_antimeridian_unsplit_covers_its_own_side() {
    use seistriage::geography::{Geography, LatLon};
    let unsplit = r#"{"type":"Feature","properties":{"name":"Dateline"},"geometry":
        {"type":"Polygon","coordinates":[[[179,-41],[-179,-41],[-179,-40],[179,-40],[179,-41]]]}}"#;
    let cut = r#"{"type":"Feature","properties":{"name":"Cut"},"geometry":
        {"type":"MultiPolygon","coordinates":[
          [[[170,-31],[180,-31],[180,-30],[170,-30],[170,-31]]],
          [[[-180,-31],[-170,-31],[-170,-30],[-180,-30],[-180,-31]]]]}}"#;
    let plain = r#"{"type":"Feature","properties":{"name":"Plain"},"geometry":
        {"type":"Polygon","coordinates":[[[-10,-41],[10,-41],[10,-40],[-10,-40],[-10,-41]]]}}"#;
    // A later district overlapping Dateline east of 180°: Dateline comes first in the file.
    let later = r#"{"type":"Feature","properties":{"name":"Later"},"geometry":
        {"type":"Polygon","coordinates":[[[-179.6,-41],[-170,-41],[-170,-40],[-179.6,-40],[-179.6,-41]]]}}"#;
    let text =
        format!(r#"{{"type":"FeatureCollection","features":[{unsplit},{cut},{plain},{later}]}}"#);
    let (g, problems) = Geography::from_geojson_str(Some(&text), None).unwrap();
    assert!(problems.is_empty(), "{problems:?}");
    let name = |lat: f64, lon: f64| g.district_at(LatLon::new(lat, lon)).map(|d| d.name.clone());
    let some = |s: &str| Some(s.to_string());
    // Either side of ±180°, and on the antimeridian itself.
    assert_eq!(name(-40.5, 179.5), some("Dateline"));
    assert_eq!(name(-40.5, -179.5), some("Dateline"));
    assert_eq!(name(-40.5, 180.0), some("Dateline"));
    assert_eq!(name(-40.5, -180.0), some("Dateline"));
    // Not the long way round: the prime meridian belongs to Plain, 178° E to nobody.
    assert_eq!(name(-40.5, 0.0), some("Plain"));
    assert_eq!(name(-40.5, 178.0), None);
    assert_eq!(name(-40.5, -178.0), some("Later"));
    // The cut MultiPolygon covers both parts and the cut line.
    assert_eq!(name(-30.5, 175.0), some("Cut"));
    assert_eq!(name(-30.5, -175.0), some("Cut"));
    assert_eq!(name(-30.5, 180.0), some("Cut"));
    assert_eq!(name(-30.5, -180.0), some("Cut"));
    assert_eq!(name(-30.5, 0.0), None);
}

/// A `buildings` sheet with the required columns and one building (A: 3 storeys, 200 m²,
/// 2 m² of columns).
fn one_building_sheet(wb: &mut rust_xlsxwriter::Workbook) {
    let ws = wb.add_worksheet();
    ws.set_name("buildings").unwrap();
    for (c, h) in ["id", "storeys", "plan_area_m2", "column_area_m2"]
        .iter()
        .enumerate()
    {
        ws.write_string(0, c as u16, *h).unwrap();
    }
    ws.write_string(1, 0, "A").unwrap();
    ws.write_number(1, 1, 3.0).unwrap();
    ws.write_number(1, 2, 200.0).unwrap();
    ws.write_number(1, 3, 2.0).unwrap();
}
