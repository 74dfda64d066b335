//! `--csv`, `--geojson`, `--json` and the terminal summary on hand-built reports.

use seistriage::report;

use super::sample;

/// The `--csv` column names of interface.md, in order.
pub const CSV_COLUMNS: [&str; 22] = [
    "rank",
    "id",
    "name",
    "district",
    "use",
    "occupants",
    "class",
    "score",
    "governing_direction",
    "governing_group",
    "dcr_io",
    "dcr_ls",
    "dcr_cp",
    "priority_index_min_pct",
    "flags",
    "retrofit_cost",
    "funded",
    "latitude",
    "longitude",
    "fault_distance_m",
    "funded_plan_a",
    "funded_plan_b",
];

#[test]
fn csv_has_the_contract_columns_and_full_precision_numbers() {
    let report = sample::report(16);
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("p.csv");
    report::csv::write_priority(&report, &path).unwrap();
    let mut r = csv::Reader::from_path(&path).unwrap();
    assert_eq!(r.headers().unwrap().iter().collect::<Vec<_>>(), CSV_COLUMNS);
    let rows: Vec<csv::StringRecord> = r.records().map(Result::unwrap).collect();
    assert_eq!(rows.len(), report.buildings.len());
    for (row, b) in rows.iter().zip(&report.buildings) {
        assert_eq!(row[0].parse::<usize>().unwrap(), b.rank);
        assert_eq!(row[6].parse::<u8>().unwrap(), b.class);
        assert_eq!(row[7].parse::<f64>().unwrap(), b.score);
        assert_eq!(row[14], b.flag_codes().join(";"));
        assert_eq!(row[5].is_empty(), b.occupants.is_none());
        // `funded` stays for compatibility and means Plan A (interface.md).
        assert_eq!(row[16], row[20]);
        let yn = |v: Option<bool>| v.map_or("", |v| if v { "yes" } else { "no" });
        let rf = b.retrofit.as_ref();
        assert_eq!(&row[20], yn(rf.and_then(|r| r.funded)));
        assert_eq!(&row[21], yn(rf.and_then(|r| r.funded_best)));
    }
}

#[test]
fn csv_guards_text_that_a_spreadsheet_would_run_as_a_formula() {
    let mut report = sample::report(8);
    report.buildings[4].name = "\tTabbed".into();
    report.buildings[5].name = "\rReturn".into();
    report.buildings[6].district = "=cmd|' /C calc'!A0".into();
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("p.csv");
    report::csv::write_priority(&report, &path).unwrap();
    let rows: Vec<csv::StringRecord> = csv::Reader::from_path(&path)
        .unwrap()
        .records()
        .map(Result::unwrap)
        .collect();
    assert_eq!(&rows[0][2], "'=1+1");
    assert_eq!(&rows[1][2], "'+SUM(A1:A2)");
    assert_eq!(&rows[2][2], "'-2+3");
    assert_eq!(&rows[3][2], "'@cmd");
    assert_eq!(&rows[4][2], "'\tTabbed");
    assert_eq!(&rows[5][2], "'\rReturn");
    assert_eq!(&rows[6][3], "'=cmd|' /C calc'!A0");
    // Ordinary text is untouched, and negative numbers stay numbers.
    assert_eq!(&rows[7][2], "Invented block 7");
}

#[test]
fn csv_never_writes_non_finite_numbers() {
    let mut report = sample::report(4);
    report.buildings[0].score = f64::NAN;
    report.buildings[1].latitude = Some(f64::INFINITY);
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("p.csv");
    report::csv::write_priority(&report, &path).unwrap();
    let text = std::fs::read_to_string(&path).unwrap();
    assert!(!text.contains("NaN") && !text.contains("inf"));
}

#[test]
fn geojson_is_an_rfc7946_feature_collection_of_points_lon_lat() {
    let report = sample::report(16);
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("b.geojson");
    report::geojson::write(&report, &path).unwrap();
    let text = std::fs::read_to_string(&path).unwrap();
    let gj: geojson::GeoJson = text.parse().unwrap();
    let geojson::GeoJson::FeatureCollection(fc) = gj else {
        panic!("not a FeatureCollection")
    };
    let with_coords: Vec<_> = report
        .buildings
        .iter()
        .filter(|b| b.latitude.is_some() && b.longitude.is_some())
        .collect();
    assert!(
        with_coords.len() < report.buildings.len(),
        "sample lacks a building without coordinates"
    );
    assert_eq!(fc.features.len(), with_coords.len());
    for (f, b) in fc.features.iter().zip(with_coords) {
        let geom = f.geometry.as_ref().unwrap();
        // RFC 7946 §3.1.1: position = [longitude, latitude].
        match &geom.value {
            geojson::GeometryValue::Point { coordinates } => {
                assert_eq!(
                    coordinates.as_slice(),
                    &[b.longitude.unwrap(), b.latitude.unwrap()]
                );
            }
            other => panic!("not a point: {other:?}"),
        }
        let props = f.properties.as_ref().unwrap();
        let keys: Vec<&str> = props.keys().map(String::as_str).collect();
        let mut expected = super::exports::CSV_COLUMNS.to_vec();
        expected.sort_unstable();
        let mut got = keys.clone();
        got.sort_unstable();
        assert_eq!(got, expected);
        assert_eq!(props["id"], b.id.as_str());
        assert_eq!(props["rank"], b.rank as u64);
        assert_eq!(props["score"].as_f64(), Some(b.score));
        // Names are data here, not formulas: kept as given.
        assert_eq!(props["name"], b.name.as_str());
    }
}

#[test]
fn json_writes_null_for_non_finite_numbers() {
    let mut report = sample::report(4);
    report.buildings[0].score = f64::NAN;
    report.buildings[0].directions.x.period_s = f64::INFINITY;
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("r.json");
    report::json::write(&report, &path).unwrap();
    let v: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(&path).unwrap()).unwrap();
    assert!(v["buildings"][0]["score"].is_null());
    assert!(v["buildings"][0]["directions"]["x"]["period_s"].is_null());
    assert_eq!(
        v["buildings"][1]["score"].as_f64(),
        Some(report.buildings[1].score)
    );
}

#[test]
fn terminal_summary_has_counts_top_ten_outputs_and_caution() {
    let report = sample::report(24);
    let written = vec![
        (
            "workbook".to_string(),
            std::path::PathBuf::from("out/r.xlsx"),
        ),
        ("JSON".to_string(), std::path::PathBuf::from("out/r.json")),
    ];
    let s = report::terminal::summary(&report, &written);
    let c = &report.counts.by_class;
    let count = |label: &str| -> usize {
        let line = s
            .lines()
            .find(|l| l.trim_start().starts_with(label))
            .unwrap();
        line.split_whitespace().last().unwrap().parse().unwrap()
    };
    assert_eq!(count("class 1 collapse-level deficit"), c.c1);
    assert_eq!(count("class 2 life-safety deficit"), c.c2);
    assert_eq!(count("class 3 damage-level deficit"), c.c3);
    assert_eq!(count("class 4 within screening limits"), c.c4);
    for b in report.buildings.iter().take(10) {
        assert!(s.contains(&b.id), "{}", b.id);
    }
    assert!(!s.contains(&report.buildings[10].id));
    assert!(s.contains("Not screened: 2 rows"));
    assert!(s.contains("workbook: out/r.xlsx"));
    assert!(s.contains("JSON: out/r.json"));
    assert!(s.contains(seistriage::CAUTION));
}

#[test]
fn terminal_summary_does_not_pass_escape_sequences_through() {
    let mut report = sample::report(4);
    report.buildings[0].name = "evil\x1b]0;title\x07".into();
    let s = report::terminal::summary(&report, &[]);
    assert!(!s.contains('\x1b') && !s.contains('\x07'));
}

#[test]
fn every_table_row_has_one_cell_per_column() {
    use seistriage::report::workbook::tables::TableId;
    let report = sample::report(24);
    for t in TableId::ALL {
        let mut buf = Vec::new();
        report::csv::write_table(&report, t, usize::MAX, &mut buf).unwrap();
        let mut r = csv::Reader::from_reader(buf.as_slice());
        let width = r.headers().unwrap().len();
        assert_eq!(width, t.columns().len(), "{t:?}");
        let mut n = 0;
        for rec in r.records() {
            let rec = rec.unwrap_or_else(|e| panic!("{t:?}: {e}"));
            assert_eq!(rec.len(), width, "{t:?}");
            n += 1;
        }
        assert!(n > 0, "{t:?} has no rows in the sample");
    }
}

/// The per-building CSV tables are formatted in parallel runs of buildings: the file must be
/// the one a sequential writer makes, row for row, whatever the thread count (enough
/// buildings for several runs and several batches).
#[test]
fn per_building_csv_rows_in_parallel_equal_the_sequential_rows() {
    use seistriage::report::workbook::tables::{TableId, Target};
    let report = sample::report(9_000);
    for table in [
        TableId::Priority,
        TableId::Directions,
        TableId::Walls,
        TableId::Flags,
    ] {
        let mut sequential = Vec::new();
        {
            let mut w = csv::Writer::from_writer(&mut sequential);
            let mut num = String::new();
            table
                .for_each_row(&report, Target::Csv, usize::MAX, |cells| {
                    report::csv::write_cells(cells, true, &mut num, &mut w)
                })
                .unwrap();
            w.flush().unwrap();
        }
        for threads in [1, 2, 3] {
            let pool = rayon::ThreadPoolBuilder::new()
                .num_threads(threads)
                .build()
                .unwrap();
            let mut parallel = Vec::new();
            pool.install(|| {
                report::csv::write_rows(&report, table, usize::MAX, true, &mut parallel)
            })
            .unwrap();
            assert!(!parallel.is_empty(), "{table:?}");
            assert!(
                parallel == sequential,
                "{table:?} with {threads} threads: {} bytes against {}",
                parallel.len(),
                sequential.len()
            );
        }
    }
}
