//! One test per reading case of inventory.md / issue 2.

use rust_xlsxwriter::{ExcelDateTime, Format, Formula};
use seistriage::input::{Budget, InputError, ReadOptions, read_inventory};
use seistriage::model::{Severity, Use, YesNo};

use super::*;

#[test]
fn header_row_below_a_merged_title_is_found_by_the_required_names() {
    let dir = tempfile::tempdir().unwrap();
    let path = workbook_with(dir.path(), "t.xlsx", |ws| {
        ws.merge_range(
            0,
            0,
            0,
            7,
            "Invented district: RC building inventory",
            &Format::new(),
        )
        .unwrap();
        ws.merge_range(1, 0, 1, 3, "surveyed 2026", &Format::new())
            .unwrap();
        fill(ws, 2, &[head(), good("A1"), good("A2")]);
    });
    let inv = read(&path);
    assert_eq!(inv.buildings.len(), 2, "{:#?}", inv.problems);
    assert_eq!(inv.buildings[0].row, 4, "row numbers count the title rows");
    assert_eq!(inv.buildings[1].id, "A2");
    assert!(inv.problems.is_empty(), "{:#?}", inv.problems);
}

#[test]
fn header_row_option_overrides_the_search() {
    let dir = tempfile::tempdir().unwrap();
    // 35 note rows push the header beyond the automatic search window.
    let mut rows: Vec<Vec<C>> = (0..35).map(|_| vec![S("note")]).collect();
    rows.push(head());
    rows.push(good("B1"));
    let path = workbook(dir.path(), "h.xlsx", &[("buildings", rows)]);
    let auto = read_inventory(&path, &ReadOptions::default()).unwrap_err();
    assert!(auto.to_string().contains("use --header-row N"), "{auto}");
    let opts = ReadOptions {
        header_row: Some(36),
        ..Default::default()
    };
    let inv = read_inventory(&path, &opts).unwrap();
    assert_eq!(inv.buildings.len(), 1, "{:#?}", inv.problems);
    assert_eq!(inv.buildings[0].row, 37);
}

#[test]
fn header_names_match_across_case_spacing_separators_and_units() {
    let dir = tempfile::tempdir().unwrap();
    let rows = vec![
        vec![
            S("ID"),
            S("Storeys"),
            S("Plan Area [m2]"),
            S("column-area (m²)"),
            S("FC [MPa]"),
            S("Year  Built"),
            S("RC_WALL_AREA_X_M2"),
        ],
        vec![
            S("C1"),
            N(4.0),
            N(300.0),
            N(3.0),
            N(25.0),
            N(1990.0),
            N(2.5),
        ],
    ];
    let inv = read(&workbook(dir.path(), "n.xlsx", &[("Buildings", rows)]));
    let b = &inv.buildings[0];
    assert_eq!(
        (b.storeys, b.plan_area_m2, b.column_area_m2),
        (4, 300.0, 3.0)
    );
    assert_eq!(
        (b.fc_mpa, b.year_built, b.rc_wall_area_x_m2),
        (Some(25.0), Some(1990), Some(2.5))
    );
}

#[test]
fn unknown_columns_give_one_warning_naming_them() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = head();
    h.push(S("colour"));
    h.push(S("surveyor notes"));
    let mut r = good("D1");
    r.push(S("red"));
    r.push(S("fine"));
    let inv = read(&workbook(
        dir.path(),
        "u.xlsx",
        &[("buildings", vec![h, r])],
    ));
    let w: Vec<_> = inv
        .problems
        .iter()
        .filter(|p| p.message.contains("not in the inventory format"))
        .collect();
    assert_eq!(w.len(), 1);
    assert!(w[0].message.contains("\"colour\"") && w[0].message.contains("\"surveyor notes\""));
    assert_eq!(w[0].severity, Severity::Warning);
    assert_eq!(inv.buildings.len(), 1);
}

#[test]
fn text_in_a_numeric_cell_rejects_the_row_with_sheet_row_column_message() {
    let dir = tempfile::tempdir().unwrap();
    let mut bad = good("E2");
    bad[3] = S("four hundred");
    let inv = read(&workbook(
        dir.path(),
        "x.xlsx",
        &[("buildings", vec![head(), good("E1"), bad])],
    ));
    assert_eq!(rejected_rows(&inv), vec![3]);
    let p = problems_at(&inv, 3, "plan_area_m2", Severity::Error);
    assert_eq!(p.len(), 1);
    assert_eq!(
        p[0].to_string(),
        "error: buildings, row 3, plan_area_m2: expected a number, found the text \"four hundred\"; write the number alone (digits, with a decimal point)"
    );
    assert_counts(&inv);
}

#[test]
fn error_cells_are_errors() {
    let dir = tempfile::tempdir().unwrap();
    let path = workbook_with(dir.path(), "e.xlsx", |ws| {
        fill(ws, 0, &[head(), good("F1"), good("F2")]);
        ws.write_formula(1, 3, Formula::new("1/0").set_result("#DIV/0!"))
            .unwrap();
        ws.write_formula(2, 4, Formula::new("NA()").set_result("#N/A"))
            .unwrap();
    });
    let inv = read(&path);
    assert_eq!(rejected_rows(&inv), vec![2, 3]);
    assert!(
        problems_at(&inv, 2, "plan_area_m2", Severity::Error)[0]
            .message
            .contains("#DIV/0!")
    );
    assert!(
        problems_at(&inv, 3, "column_area_m2", Severity::Error)[0]
            .message
            .contains("#N/A")
    );
}

#[test]
fn formulas_without_a_cached_value_are_errors_and_cached_ones_are_read() {
    let dir = tempfile::tempdir().unwrap();
    let path = workbook_with(dir.path(), "f.xlsx", |ws| {
        ws.set_formula_result_default("");
        fill(ws, 0, &[head(), good("G1"), good("G2")]);
        ws.write_formula(1, 3, Formula::new("20*20")).unwrap();
        ws.write_formula(2, 3, Formula::new("20*25").set_result("500"))
            .unwrap();
    });
    let inv = read(&path);
    assert_eq!(rejected_rows(&inv), vec![2]);
    let p = problems_at(&inv, 2, "plan_area_m2", Severity::Error);
    assert!(
        p[0].message.contains("formula without a cached value"),
        "{p:?}"
    );
    assert_eq!(inv.buildings[0].plan_area_m2, 500.0);
}

#[test]
fn formulas_a_writer_never_calculated_read_as_zero_are_errors() {
    // Library writers store 0 as the result and set fullCalcOnLoad: the 0 is not a value.
    let dir = tempfile::tempdir().unwrap();
    let path = workbook_with(dir.path(), "f0.xlsx", |ws| {
        fill(ws, 0, &[head(), good("G3"), good("G4")]);
        ws.write_formula(1, 4, Formula::new("2+2")).unwrap();
        ws.write_formula(2, 6, Formula::new("B1*0")).unwrap();
    });
    let inv = read(&path);
    assert_eq!(rejected_rows(&inv), vec![2, 3]);
    assert_eq!(
        problems_at(&inv, 2, "column_area_m2", Severity::Error).len(),
        1
    );
    assert_eq!(
        problems_at(&inv, 3, "rc_wall_area_y_m2", Severity::Error).len(),
        1
    );
}

#[test]
fn year_built_as_a_date_cell_gives_its_year_and_a_bare_number_is_a_year() {
    let dir = tempfile::tempdir().unwrap();
    let path = workbook_with(dir.path(), "y.xlsx", |ws| {
        fill(ws, 0, &[head(), good("H1"), good("H2"), good("H3")]);
        let d = ExcelDateTime::from_ymd(1972, 5, 1).unwrap();
        ws.write_datetime_with_format(1, 7, &d, &date_format())
            .unwrap();
        // 1968 typed into a date-formatted column: a year, never serial 1968 (= 1905).
        ws.write_number_with_format(2, 7, 1968.0, &date_format())
            .unwrap();
        ws.write_number(3, 7, 1983.0).unwrap();
    });
    let inv = read(&path);
    let years: Vec<_> = inv.buildings.iter().map(|b| b.year_built).collect();
    assert_eq!(years, vec![Some(1972), Some(1968), Some(1983)]);
    assert_eq!(
        problems_at(&inv, 2, "year_built", Severity::Warning).len(),
        1
    );
    assert_eq!(
        problems_at(&inv, 3, "year_built", Severity::Warning).len(),
        1
    );
    assert!(problems_at(&inv, 4, "year_built", Severity::Warning).is_empty());
}

#[test]
fn whole_numbers_stored_as_floats_are_whole_and_two_and_a_half_storeys_is_an_error() {
    let dir = tempfile::tempdir().unwrap();
    let mut half = good("I2");
    half[2] = N(2.5);
    let mut text = good("I3");
    text[2] = S("7");
    let inv = read(&workbook(
        dir.path(),
        "w.xlsx",
        &[("buildings", vec![head(), good("I1"), half, text])],
    ));
    assert_eq!(
        inv.buildings.iter().map(|b| b.storeys).collect::<Vec<_>>(),
        vec![5, 7]
    );
    assert_eq!(rejected_rows(&inv), vec![3]);
    assert!(
        problems_at(&inv, 3, "storeys", Severity::Error)[0]
            .message
            .contains("whole number, found 2.5")
    );
}

#[test]
fn implausible_values_are_refused() {
    let dir = tempfile::tempdir().unwrap();
    let h = {
        let mut h = head();
        h.push(S("fc_mpa"));
        h.push(S("fy_mpa"));
        h
    };
    let row = |id: &'static str, col: usize, v: f64| {
        let mut r = good(id);
        r.push(N(25.0));
        r.push(N(420.0));
        r[col] = N(v);
        r
    };
    let rows = vec![
        h,
        row("J0", 2, 5.0),   // fine
        row("J1", 2, 61.0),  // storeys > 60
        row("J2", 2, 0.0),   // storeys < 1
        row("J3", 3, 0.0),   // plan area 0
        row("J4", 3, -10.0), // plan area < 0
        row("J5", 4, -1.0),  // column area < 0
        row("J6", 4, 500.0), // column area > plan area
        row("J7", 5, 401.0), // wall area > plan area
        row("J8", 8, 300.0), // fc in kPa?
        row("J9", 9, 42.0),  // fy in the wrong unit
        row("J10", 8, 4.0),  // fc below 5
    ];
    let inv = read(&workbook(dir.path(), "v.xlsx", &[("buildings", rows)]));
    assert_eq!(inv.buildings.len(), 1, "{:#?}", inv.buildings);
    assert_eq!(rejected_rows(&inv), (3..=12).collect::<Vec<_>>());
    for (row, col) in [
        (3, "storeys"),
        (4, "storeys"),
        (5, "plan_area_m2"),
        (6, "plan_area_m2"),
        (7, "column_area_m2"),
        (8, "column_area_m2"),
        (9, "rc_wall_area_x_m2"),
        (10, "fc_mpa"),
        (11, "fy_mpa"),
        (12, "fc_mpa"),
    ] {
        assert_eq!(
            problems_at(&inv, row, col, Severity::Error).len(),
            1,
            "row {row} {col}: {:#?}",
            inv.problems
        );
    }
}

#[test]
fn no_vertical_structure_is_refused_but_zero_columns_with_walls_is_valid() {
    let dir = tempfile::tempdir().unwrap();
    let mut none = good("K1");
    none[4] = N(0.0);
    none[5] = B;
    none[6] = N(0.0);
    let mut tunnel = good("K2");
    tunnel[4] = N(0.0);
    let inv = read(&workbook(
        dir.path(),
        "k.xlsx",
        &[("buildings", vec![head(), none, tunnel])],
    ));
    assert_eq!(rejected_rows(&inv), vec![2]);
    assert_eq!(inv.buildings[0].id, "K2");
}

#[test]
fn duplicate_ids_reject_every_row_and_list_them_all() {
    let dir = tempfile::tempdir().unwrap();
    let rows = vec![
        head(),
        good("L1"),
        good("L2"),
        good("L1"),
        good("L3"),
        good("L1"),
    ];
    let inv = read(&workbook(dir.path(), "d.xlsx", &[("buildings", rows)]));
    assert_eq!(rejected_rows(&inv), vec![2, 4, 6]);
    for r in [2, 4, 6] {
        let p = problems_at(&inv, r, "id", Severity::Error);
        assert!(p[0].message.contains("rows 2, 4, 6"), "{p:?}");
    }
    assert_eq!(inv.buildings.len(), 2);
    assert_counts(&inv);
}

#[test]
fn blank_rows_are_skipped_and_counted_apart() {
    let dir = tempfile::tempdir().unwrap();
    let rows = vec![
        head(),
        good("M1"),
        vec![],
        good("M2"),
        vec![S("   ")],
        vec![],
        good("M3"),
        vec![],
        vec![],
    ];
    let inv = read(&workbook(dir.path(), "b.xlsx", &[("buildings", rows)]));
    assert_eq!(inv.rows, 3);
    assert_eq!(inv.blank_rows, 3, "interior blank rows only");
    assert_eq!(
        inv.buildings.iter().map(|b| b.row).collect::<Vec<_>>(),
        vec![2, 4, 7]
    );
}

#[test]
fn ids_stay_text_numeric_cells_lose_their_point_and_unicode_is_kept() {
    let dir = tempfile::tempdir().unwrap();
    let mut a = good("x");
    a[0] = S("0100");
    let mut b = good("x");
    b[0] = N(100.0);
    let mut c = good("x");
    c[0] = S("Okul-Ç-学校-7");
    let inv = read(&workbook(
        dir.path(),
        "i.xlsx",
        &[("buildings", vec![head(), a, b, c])],
    ));
    let ids: Vec<_> = inv.buildings.iter().map(|b| b.id.as_str()).collect();
    assert_eq!(ids, vec!["0100", "100", "Okul-Ç-学校-7"]);
}

#[test]
fn very_long_cells_are_cut_with_a_warning() {
    let dir = tempfile::tempdir().unwrap();
    let long = "é".repeat(40_000);
    let text = format!("id,name,storeys,plan_area_m2,column_area_m2\nN1,{long},3,200,2\n");
    let inv = read(&text_file(dir.path(), "long.csv", text.as_bytes()));
    assert_eq!(inv.buildings[0].name.chars().count(), 32_767);
    assert!(
        inv.problems
            .iter()
            .any(|p| p.severity == Severity::Warning && p.message.contains("32767 characters"))
    );
}

#[test]
fn a_stray_far_away_cell_is_streamed_not_allocated_and_reported() {
    let dir = tempfile::tempdir().unwrap();
    let path = workbook_with(dir.path(), "s.xlsx", |ws| {
        fill(ws, 0, &[head(), good("O1")]);
        ws.write_string(1_048_575, 16_383, "stray").unwrap();
    });
    let inv = read(&path);
    assert_eq!(inv.buildings.len(), 1);
    assert_eq!(inv.rows, 1);
    assert_eq!(inv.blank_rows, 0);
    assert!(
        inv.problems
            .iter()
            .any(|p| p.message.contains("XFD1048576")),
        "{:#?}",
        inv.problems
    );
}

#[test]
fn cell_and_row_budgets_refuse_with_the_numbers() {
    let dir = tempfile::tempdir().unwrap();
    let rows: Vec<Vec<C>> = std::iter::once(head())
        .chain((0..20).map(|_| good("P")))
        .collect();
    let path = workbook(dir.path(), "p.xlsx", &[("buildings", rows)]);
    let cells = ReadOptions {
        budget: Budget {
            max_cells: 50,
            ..Default::default()
        },
        ..Default::default()
    };
    let e = read_inventory(&path, &cells).unwrap_err();
    assert!(
        matches!(e, InputError::TooLarge { .. }) && e.to_string().contains("50 non-empty cells"),
        "{e}"
    );
    let rows = ReadOptions {
        budget: Budget {
            max_rows: 10,
            ..Default::default()
        },
        ..Default::default()
    };
    let e = read_inventory(&path, &rows).unwrap_err();
    assert!(e.to_string().contains("more than 10 data rows"), "{e}");
}

#[test]
fn zip_bombs_are_refused() {
    use std::io::Write;
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("bomb.xlsx");
    let mut z = zip::ZipWriter::new(std::fs::File::create(&path).unwrap());
    let opts = zip::write::SimpleFileOptions::default()
        .compression_method(zip::CompressionMethod::Deflated);
    z.start_file("xl/workbook.xml", opts).unwrap();
    z.write_all(b"<workbook/>").unwrap();
    z.start_file("xl/worksheets/sheet1.xml", opts).unwrap();
    z.write_all(&vec![b' '; 8 << 20]).unwrap();
    z.finish().unwrap();
    let e = read_inventory(&path, &ReadOptions::default()).unwrap_err();
    assert!(e.to_string().contains("zip bomb"), "{e}");
}

#[test]
fn csv_with_semicolons_and_decimal_commas() {
    let dir = tempfile::tempdir().unwrap();
    let text = "id;storeys;plan_area_m2;column_area_m2;fc_mpa\nQ1;4;312,5;3,25;22,5\n";
    let inv = read(&text_file(dir.path(), "q.csv", text.as_bytes()));
    let b = &inv.buildings[0];
    assert_eq!(
        (b.plan_area_m2, b.column_area_m2, b.fc_mpa),
        (312.5, 3.25, Some(22.5))
    );
}

#[test]
fn csv_with_bom_crlf_and_blank_lines_counts_rows_as_a_person_sees_them() {
    let dir = tempfile::tempdir().unwrap();
    let text = "\u{feff}id,storeys,plan_area_m2,column_area_m2\r\nR1,3,200,2\r\n\r\nR2,3,two hundred,2\r\n,,,\r\nR3,2,150,1.5\r\n";
    let inv = read(&text_file(dir.path(), "r.csv", text.as_bytes()));
    assert_eq!(
        inv.buildings
            .iter()
            .map(|b| (b.id.as_str(), b.row))
            .collect::<Vec<_>>(),
        vec![("R1", 2), ("R3", 6)]
    );
    assert_eq!(rejected_rows(&inv), vec![4]);
    assert_eq!(inv.blank_rows, 2);
}

#[test]
fn csv_that_is_not_utf8_is_read_as_windows_1252_with_a_warning() {
    let dir = tempfile::tempdir().unwrap();
    let mut bytes = b"id,name,storeys,plan_area_m2,column_area_m2\nS1,Caf".to_vec();
    bytes.push(0xE9); // é in Windows-1252
    bytes.extend_from_slice(b",3,200,2\n");
    let inv = read(&text_file(dir.path(), "s.csv", &bytes));
    assert_eq!(inv.buildings[0].name, "Café");
    assert!(
        inv.problems
            .iter()
            .any(|p| p.message.contains("Windows-1252"))
    );
}

#[test]
fn corrupt_and_non_spreadsheet_files_fail_with_one_clear_line() {
    let dir = tempfile::tempdir().unwrap();
    let good_path = workbook(
        dir.path(),
        "g.xlsx",
        &[("buildings", vec![head(), good("T1")])],
    );
    let bytes = std::fs::read(&good_path).unwrap();
    let cases = [
        text_file(dir.path(), "text.xlsx", b"this is not a workbook at all"),
        text_file(dir.path(), "cut.xlsx", &bytes[..bytes.len() / 2]),
        text_file(dir.path(), "pic.pdf", b"%PDF-1.7 binary"),
        text_file(dir.path(), "empty.ods", b""),
        text_file(dir.path(), "zip.xlsx", &{
            let mut b = bytes.clone();
            for x in b.iter_mut().skip(200).step_by(7) {
                *x ^= 0x5A;
            }
            b
        }),
    ];
    for c in &cases {
        let e = read_inventory(c, &ReadOptions::default());
        let msg = match e {
            Err(e) => e.to_string(),
            Ok(inv) => {
                // A mutated workbook may still open; then nothing valid may come out silently.
                assert_counts(&inv);
                continue;
            }
        };
        assert!(
            !msg.contains('\n') && msg.contains(&c.display().to_string()),
            "{msg}"
        );
    }
}

#[test]
fn optional_sheets_are_read_and_unknown_building_ids_reported_and_ignored() {
    let dir = tempfile::tempdir().unwrap();
    let walls = vec![
        vec![
            S("building_id"),
            S("wall_id"),
            S("direction"),
            S("length_m"),
            S("thickness_m"),
            S("start_storey"),
        ],
        vec![S("U1"), S("W1"), S("X"), N(4.0), N(0.25), N(1.0)],
        vec![S("U1"), S("W2"), S("y"), N(5.0), N(0.25), B],
        vec![S("NOPE"), S("W3"), S("X"), N(4.0), N(0.25), N(1.0)],
    ];
    let storeys = vec![
        vec![
            S("building_id"),
            S("storey"),
            S("height_m"),
            S("column_area_m2"),
        ],
        vec![S("U1"), N(1.0), N(4.0), N(4.0)],
        vec![S("U1"), N(2.0), N(3.0), N(3.5)],
    ];
    let fp = vec![
        vec![S("building_id"), S("vertex"), S("x_m"), S("y_m")],
        vec![S("U1"), N(1.0), N(0.0), N(0.0)],
        vec![S("U1"), N(2.0), N(20.0), N(0.0)],
        vec![S("U1"), N(3.0), N(20.0), N(20.0)],
    ];
    let settings = vec![
        vec![S("key"), S("value")],
        vec![S("agr_g"), N(0.3)],
        vec![S("Default Ground-Type"), S("B")],
    ];
    let mut u1 = good("U1");
    u1[5] = N(1.0); // 4 × 0.25 = 1.0 m² along X: agrees
    u1[6] = N(2.0); // 5 × 0.25 = 1.25 m² along Y: 37.5 % apart, a warning
    let path = workbook(
        dir.path(),
        "o.xlsx",
        &[
            ("buildings", vec![head(), u1]),
            ("walls", walls),
            ("storeys", storeys),
            ("footprints", fp),
            ("settings", settings),
        ],
    );
    let inv = read(&path);
    assert_eq!(inv.buildings.len(), 1, "{:#?}", inv.problems);
    assert_eq!(inv.walls.len(), 2);
    assert_eq!(inv.storeys.len(), 2);
    assert_eq!(inv.footprints.len(), 3);
    assert_eq!(
        inv.settings_rows,
        vec![
            ("agr_g".into(), "0.3".into()),
            ("default_ground_type".into(), "B".into())
        ]
    );
    assert_eq!(
        problems_at(&inv, 4, "building_id", Severity::Warning).len(),
        1
    );
    assert!(problems_at(&inv, 2, "rc_wall_area_x_m2", Severity::Warning).is_empty());
    assert_eq!(
        problems_at(&inv, 2, "rc_wall_area_y_m2", Severity::Warning).len(),
        1
    );
}

#[test]
fn a_bad_row_in_an_optional_sheet_stops_its_building_from_being_screened() {
    let dir = tempfile::tempdir().unwrap();
    let walls = vec![
        vec![S("building_id"), S("direction"), S("length_m")],
        vec![S("V1"), S("X"), S("long")],
    ];
    let inv = read(&workbook(
        dir.path(),
        "bw.xlsx",
        &[
            ("buildings", vec![head(), good("V1"), good("V2")]),
            ("walls", walls),
        ],
    ));
    assert_eq!(rejected_rows(&inv), vec![2]);
    assert!(
        inv.not_screened[0]
            .reasons
            .iter()
            .any(|r| r.contains("walls row 2"))
    );
}

#[test]
fn sibling_csv_files_are_the_optional_sheets() {
    let dir = tempfile::tempdir().unwrap();
    let main = text_file(
        dir.path(),
        "town.csv",
        b"id,storeys,plan_area_m2,column_area_m2\nW1,3,200,2\n",
    );
    text_file(
        dir.path(),
        "town.walls.csv",
        b"building_id,direction,length_m\nW1,X,4\nW9,Y,3\n",
    );
    text_file(
        dir.path(),
        "town.storeys.csv",
        b"building_id;storey;height_m\nW1;1;4,5\n",
    );
    text_file(
        dir.path(),
        "town.footprints.csv",
        b"building_id,vertex,x_m,y_m\nW1,1,0,0\nW1,2,10,0\nW1,3,10,20\n",
    );
    text_file(dir.path(), "town.settings.csv", b"key,value\nagr_g,0.25\n");
    let inv = read(&main);
    assert_eq!(inv.walls.len(), 1);
    assert_eq!(inv.storeys[0].height_m, Some(4.5));
    assert_eq!(inv.footprints.len(), 3);
    assert_eq!(
        inv.settings_rows,
        vec![("agr_g".to_string(), "0.25".to_string())]
    );
    assert!(
        inv.problems
            .iter()
            .any(|p| p.sheet == "walls" && p.message.contains("\"W9\""))
    );
}

#[test]
fn enumerations_are_read_case_insensitively_and_bad_ones_are_errors() {
    let dir = tempfile::tempdir().unwrap();
    let h = vec![
        S("id"),
        S("storeys"),
        S("plan_area_m2"),
        S("column_area_m2"),
        S("use"),
        S("short_columns"),
        S("ground_type"),
    ];
    let rows = vec![
        h,
        vec![
            S("X1"),
            N(2.0),
            N(100.0),
            N(1.0),
            S("School"),
            S("YES"),
            S("d"),
        ],
        vec![
            S("X2"),
            N(2.0),
            N(100.0),
            N(1.0),
            S("church"),
            S("no"),
            S("C"),
        ],
    ];
    let inv = read(&workbook(dir.path(), "en.xlsx", &[("buildings", rows)]));
    let b = &inv.buildings[0];
    assert_eq!(
        (b.use_, b.short_columns),
        (Some(Use::School), Some(YesNo::Yes))
    );
    assert_eq!(rejected_rows(&inv), vec![3]);
}

#[test]
fn a_workbook_without_a_buildings_sheet_reads_its_first_sheet_with_a_warning() {
    let dir = tempfile::tempdir().unwrap();
    let inv = read(&workbook(
        dir.path(),
        "s1.xlsx",
        &[("Sheet1", vec![head(), good("Y1")])],
    ));
    assert_eq!(inv.buildings.len(), 1);
    assert!(
        inv.problems
            .iter()
            .any(|p| p.message.contains("expected a sheet named buildings"))
    );
}

/// Writes a minimal .ods file whose first table is `buildings` with the given table XML body.
fn ods(dir: &std::path::Path, name: &str, rows_xml: &str) -> std::path::PathBuf {
    use std::io::Write;
    let path = dir.join(name);
    let mut z = zip::ZipWriter::new(std::fs::File::create(&path).unwrap());
    let stored =
        zip::write::SimpleFileOptions::default().compression_method(zip::CompressionMethod::Stored);
    z.start_file("mimetype", stored).unwrap();
    z.write_all(b"application/vnd.oasis.opendocument.spreadsheet")
        .unwrap();
    z.start_file("META-INF/manifest.xml", stored).unwrap();
    z.write_all(br#"<?xml version="1.0" encoding="UTF-8"?><manifest:manifest xmlns:manifest="urn:oasis:names:tc:opendocument:xmlns:manifest:1.0" manifest:version="1.2"><manifest:file-entry manifest:full-path="/" manifest:media-type="application/vnd.oasis.opendocument.spreadsheet"/><manifest:file-entry manifest:full-path="content.xml" manifest:media-type="text/xml"/></manifest:manifest>"#).unwrap();
    z.start_file("content.xml", stored).unwrap();
    write!(
        z,
        r#"<?xml version="1.0" encoding="UTF-8"?><office:document-content xmlns:office="urn:oasis:names:tc:opendocument:xmlns:office:1.0" xmlns:table="urn:oasis:names:tc:opendocument:xmlns:table:1.0" xmlns:text="urn:oasis:names:tc:opendocument:xmlns:text:1.0" office:version="1.2"><office:body><office:spreadsheet><table:table table:name="buildings">{rows_xml}</table:table></office:spreadsheet></office:body></office:document-content>"#
    )
    .unwrap();
    z.finish().unwrap();
    path
}

fn ods_row(cells: &[&str]) -> String {
    let mut s = String::from("<table:table-row>");
    for c in cells {
        let text_like = c.starts_with('0') && c.len() > 1 && !c.starts_with("0.");
        if let (Ok(v), false) = (c.parse::<f64>(), text_like) {
            s.push_str(&format!(r#"<table:table-cell office:value-type="float" office:value="{v}"><text:p>{c}</text:p></table:table-cell>"#));
        } else {
            s.push_str(&format!(r#"<table:table-cell office:value-type="string"><text:p>{c}</text:p></table:table-cell>"#));
        }
    }
    s.push_str("</table:table-row>");
    s
}

#[test]
fn ods_workbooks_are_read() {
    let dir = tempfile::tempdir().unwrap();
    let xml = [
        ods_row(&["id", "storeys", "plan_area_m2", "column_area_m2"]),
        ods_row(&["0100", "3", "200", "2"]),
        r#"<table:table-row table:number-rows-repeated="2"><table:table-cell/></table:table-row>"#
            .to_string(),
        ods_row(&["AA", "2.5", "200", "2"]),
    ]
    .concat();
    let inv = read(&ods(dir.path(), "a.ods", &xml));
    assert_eq!(
        inv.buildings
            .iter()
            .map(|b| (b.id.as_str(), b.row))
            .collect::<Vec<_>>(),
        vec![("0100", 2)]
    );
    assert_eq!(rejected_rows(&inv), vec![5]);
    assert_eq!(inv.blank_rows, 2);
}

#[test]
fn an_ods_stray_far_away_cell_is_refused_before_the_grid_is_allocated() {
    let dir = tempfile::tempdir().unwrap();
    let xml = [
        ods_row(&["id", "storeys", "plan_area_m2", "column_area_m2"]),
        ods_row(&["A", "3", "200", "2"]),
        r#"<table:table-row table:number-rows-repeated="1000000"><table:table-cell table:number-columns-repeated="1024"/></table:table-row>"#.to_string(),
        r#"<table:table-row><table:table-cell table:number-columns-repeated="200"/><table:table-cell office:value-type="string"><text:p>stray</text:p></table:table-cell></table:table-row>"#.to_string(),
    ]
    .concat();
    let e = read_inventory(&ods(dir.path(), "far.ods", &xml), &ReadOptions::default()).unwrap_err();
    let msg = e.to_string();
    assert!(msg.contains("1000003 rows × 201 columns"), "{msg}");
}

/// A minimal compound file (CFB v3, 512-byte sectors) holding the given streams in regular
/// sectors (streams shorter than 4096 bytes are padded to 4096 so that no mini stream is
/// needed). Layout from [MS-CFB] §2 (from memory).
pub fn compound_file(streams: &[(&str, Vec<u8>)]) -> Vec<u8> {
    let put16 =
        |f: &mut Vec<u8>, at: usize, v: u16| f[at..at + 2].copy_from_slice(&v.to_le_bytes());
    let put32 =
        |f: &mut Vec<u8>, at: usize, v: u32| f[at..at + 4].copy_from_slice(&v.to_le_bytes());
    let streams: Vec<(&str, Vec<u8>)> = streams
        .iter()
        .map(|(n, b)| {
            let mut b = b.clone();
            if b.len() < 4096 {
                b.resize(4096, 0);
            }
            (*n, b)
        })
        .collect();
    let data_sectors: Vec<usize> = streams.iter().map(|(_, b)| b.len().div_ceil(512)).collect();
    let total = 2 + data_sectors.iter().sum::<usize>();
    assert!(total <= 128, "one FAT sector only");
    let mut f = vec![0u8; 512 * (1 + total)];
    f[..8].copy_from_slice(&[0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1]);
    put16(&mut f, 24, 0x003E);
    put16(&mut f, 26, 3);
    put16(&mut f, 28, 0xFFFE);
    put16(&mut f, 30, 9);
    put16(&mut f, 32, 6);
    put32(&mut f, 44, 1); // one FAT sector
    put32(&mut f, 48, 1); // directory in sector 1
    put32(&mut f, 56, 4096);
    put32(&mut f, 60, 0xFFFF_FFFE);
    put32(&mut f, 68, 0xFFFF_FFFE);
    for i in 0..109 {
        put32(&mut f, 76 + 4 * i, if i == 0 { 0 } else { 0xFFFF_FFFF });
    }
    let fat = 512;
    for i in 0..128 {
        put32(&mut f, fat + 4 * i, 0xFFFF_FFFF);
    }
    put32(&mut f, fat, 0xFFFF_FFFD);
    put32(&mut f, fat + 4, 0xFFFF_FFFE);
    let mut next = 2usize;
    let mut starts = Vec::new();
    for ((_, b), n) in streams.iter().zip(&data_sectors) {
        starts.push(next);
        for k in 0..*n {
            let id = next + k;
            put32(
                &mut f,
                fat + 4 * id,
                if k + 1 == *n {
                    0xFFFF_FFFE
                } else {
                    (id + 1) as u32
                },
            );
        }
        let at = 512 * (1 + next);
        f[at..at + b.len()].copy_from_slice(b);
        next += n;
    }
    let mut entries = vec![("Root Entry", 5u8, 0xFFFF_FFFEu32, 0u32)];
    for ((n, b), s) in streams.iter().zip(&starts) {
        entries.push((n, 2u8, *s as u32, b.len() as u32));
    }
    assert!(entries.len() <= 4);
    for (k, (name, kind, start, size)) in entries.iter().enumerate() {
        let at = 1024 + 128 * k;
        let utf16: Vec<u8> = name.encode_utf16().flat_map(u16::to_le_bytes).collect();
        f[at..at + utf16.len()].copy_from_slice(&utf16);
        put16(&mut f, at + 64, (utf16.len() + 2) as u16);
        f[at + 66] = *kind;
        put32(&mut f, at + 68, 0xFFFF_FFFF);
        put32(
            &mut f,
            at + 72,
            if k >= 1 && k + 1 < entries.len() {
                (k + 1) as u32
            } else {
                0xFFFF_FFFF
            },
        );
        put32(&mut f, at + 76, if k == 0 { 1 } else { 0xFFFF_FFFF });
        put32(&mut f, at + 116, *start);
        put32(&mut f, at + 120, *size);
    }
    f
}

/// What a spreadsheet program writes for a password-protected .xlsx: a compound file with an
/// `EncryptedPackage` stream ([MS-OFFCRYPTO] §2.3.4.4, from memory).
pub fn encrypted_ooxml() -> Vec<u8> {
    compound_file(&[
        ("EncryptionInfo", vec![4, 0, 4, 0]),
        ("EncryptedPackage", vec![1; 64]),
    ])
}

/// BIFF8 records: globals BOF/EOF, then one worksheet with cells at the given positions.
pub fn biff_workbook(cells: &[(u16, u16)]) -> Vec<u8> {
    let rec = |typ: u16, data: &[u8]| -> Vec<u8> {
        let mut r = typ.to_le_bytes().to_vec();
        r.extend((data.len() as u16).to_le_bytes());
        r.extend(data);
        r
    };
    let bof = |dt: u16| {
        rec(
            0x0809,
            &[&0x0600u16.to_le_bytes()[..], &dt.to_le_bytes(), &[0u8; 12]].concat(),
        )
    };
    let mut w = bof(0x0005);
    w.extend(rec(0x000A, &[]));
    w.extend(bof(0x0010));
    for (r, c) in cells {
        let data = [
            &r.to_le_bytes()[..],
            &c.to_le_bytes(),
            &0u16.to_le_bytes(),
            &1.5f64.to_le_bytes(),
        ]
        .concat();
        w.extend(rec(0x0203, &data));
    }
    w.extend(rec(0x000A, &[]));
    w
}

#[test]
fn an_xls_stray_far_away_cell_is_refused_before_calamine_expands_it() {
    let dir = tempfile::tempdir().unwrap();
    let wb = biff_workbook(&[(0, 0), (1, 3), (65_535, 255)]);
    let bytes = compound_file(&[("Workbook", wb.clone())]);
    let ext = seistriage::input::xls_scan::sheet_extents(&bytes).unwrap();
    assert_eq!(
        ext,
        vec![seistriage::input::xls_scan::Extent {
            rows: 65_536,
            cols: 256
        }]
    );
    let path = text_file(dir.path(), "far.xls", &bytes);
    let e = read_inventory(&path, &ReadOptions::default()).unwrap_err();
    assert!(
        e.to_string()
            .contains("65536 rows × 256 columns = 16777216 cells"),
        "{e}"
    );
    // A small sheet passes the scan (calamine then reads or refuses it).
    let small = compound_file(&[("Workbook", biff_workbook(&[(0, 0), (9, 4)]))]);
    assert_eq!(
        seistriage::input::xls_scan::sheet_extents(&small).unwrap(),
        vec![seistriage::input::xls_scan::Extent { rows: 10, cols: 5 }]
    );
}

#[test]
fn password_protected_workbooks_are_refused_in_one_line() {
    let dir = tempfile::tempdir().unwrap();
    for name in ["secret.xlsx", "secret.xls"] {
        let path = text_file(dir.path(), name, &encrypted_ooxml());
        let e = read_inventory(&path, &ReadOptions::default()).unwrap_err();
        assert!(matches!(e, InputError::Protected { .. }), "{name}: {e}");
        assert!(e.to_string().contains("password-protected") && !e.to_string().contains('\n'));
    }
}

#[test]
fn csv_row_numbers_hold_for_a_last_line_without_a_line_end_and_multi_line_fields() {
    let dir = tempfile::tempdir().unwrap();
    let text = "id,name,storeys,plan_area_m2,column_area_m2\r\nA,\"two\r\nlines\",3,200,2\r\n\r\nB,x,3,200,2\r\n\r\n\r\nC,y,3,200,2";
    let inv = read(&text_file(dir.path(), "m.csv", text.as_bytes()));
    let rows: Vec<_> = inv
        .buildings
        .iter()
        .map(|b| (b.id.as_str(), b.row))
        .collect();
    assert_eq!(rows, vec![("A", 2), ("B", 4), ("C", 7)]);
    assert_eq!(inv.blank_rows, 3);
    assert_eq!(inv.buildings[0].name, "two\r\nlines");
}

#[test]
fn a_storey_listed_twice_stops_its_building_from_being_screened() {
    let dir = tempfile::tempdir().unwrap();
    let storeys = vec![
        vec![S("building_id"), S("storey"), S("height_m")],
        vec![S("ST1"), N(1.0), N(4.0)],
        vec![S("ST1"), N(1.0), N(3.0)],
        vec![S("ST2"), N(1.0), N(3.0)],
    ];
    let inv = read(&workbook(
        dir.path(),
        "st.xlsx",
        &[
            ("buildings", vec![head(), good("ST1"), good("ST2")]),
            ("storeys", storeys),
        ],
    ));
    assert_eq!(rejected_rows(&inv), vec![2]);
    assert_eq!(problems_at(&inv, 2, "storey", Severity::Error).len(), 1);
    assert!(
        problems_at(&inv, 2, "storey", Severity::Error)[0]
            .message
            .contains("rows 2, 3")
    );
    assert_eq!(inv.storeys.len(), 1);
}

#[test]
fn two_columns_meaning_the_same_give_a_warning_and_the_first_is_used() {
    let dir = tempfile::tempdir().unwrap();
    let mut h = head();
    h.push(S("Floors"));
    let mut r = good("DU1");
    r.push(N(9.0));
    let inv = read(&workbook(
        dir.path(),
        "du.xlsx",
        &[("buildings", vec![h, r])],
    ));
    assert_eq!(inv.buildings[0].storeys, 5);
    assert!(
        inv.problems
            .iter()
            .any(|p| p.severity == Severity::Warning && p.message.contains("all mean storeys"))
    );
}

#[test]
fn a_header_row_option_pointing_at_a_data_row_is_a_sheet_error() {
    let dir = tempfile::tempdir().unwrap();
    let path = workbook(
        dir.path(),
        "hw.xlsx",
        &[("buildings", vec![head(), good("HW1"), good("HW2")])],
    );
    let opts = ReadOptions {
        header_row: Some(2),
        ..Default::default()
    };
    // inventory.md: a required column missing from the header is ONE fatal line.
    let e = read_inventory(&path, &opts).unwrap_err().to_string();
    assert!(
        e.contains("hw.xlsx: sheet buildings: the required column(s) id, storeys, plan_area_m2, column_area_m2 are missing from the header row (row 2"),
        "{e}"
    );
    assert_eq!(e.lines().count(), 1, "{e}");
}

#[test]
fn ods_formulas_without_a_value_are_errors() {
    let dir = tempfile::tempdir().unwrap();
    let xml = [
        ods_row(&["id", "storeys", "plan_area_m2", "column_area_m2"]),
        r#"<table:table-row><table:table-cell office:value-type="string"><text:p>OF1</text:p></table:table-cell><table:table-cell office:value-type="float" office:value="3"><text:p>3</text:p></table:table-cell><table:table-cell table:formula="of:=20*20"/><table:table-cell office:value-type="float" office:value="2"><text:p>2</text:p></table:table-cell></table:table-row>"#.to_string(),
        ods_row(&["OF2", "3", "200", "2"]),
    ]
    .concat();
    let inv = read(&ods(dir.path(), "f.ods", &xml));
    assert_eq!(rejected_rows(&inv), vec![2], "{:#?}", inv.problems);
    let p = problems_at(&inv, 2, "plan_area_m2", Severity::Error);
    assert!(
        p[0].message.contains("formula without a cached value"),
        "{p:?}"
    );
}
