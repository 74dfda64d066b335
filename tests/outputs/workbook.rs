//! The results workbook read back with calamine and opened as a zip package.

use std::io::Read;
use std::path::Path;

use calamine::{Data, Range, Reader, Xlsx, open_workbook};
use seistriage::report::workbook::{
    self, CELL_TEXT_LIMIT, LARGE_PRIORITY_ROWS, Layout, tables::TableId,
};
use seistriage::settings::KEYS;

use super::sample;

pub const SHEETS: [&str; 10] = [
    "Summary",
    "Priority",
    "Retrofit plan",
    "Directions",
    "Walls",
    "Flags",
    "Not screened",
    "Input problems",
    "Assumptions",
    "Chart data",
];

pub fn open(path: &Path) -> Xlsx<std::io::BufReader<std::fs::File>> {
    open_workbook(path).expect("open workbook")
}

pub fn sheet(path: &Path, name: &str) -> Range<Data> {
    open(path).worksheet_range(name).expect(name)
}

/// A cell as a number (calamine reads whole numbers as floats from xlsx).
pub fn num(r: &Range<Data>, row: usize, col: usize) -> Option<f64> {
    match r.get((row, col))? {
        Data::Float(v) => Some(*v),
        Data::Int(v) => Some(*v as f64),
        _ => None,
    }
}

pub fn text(r: &Range<Data>, row: usize, col: usize) -> Option<String> {
    match r.get((row, col))? {
        Data::String(s) => Some(s.clone()),
        _ => None,
    }
}

/// Column index of a header in row 0.
pub fn col(r: &Range<Data>, header: &str) -> usize {
    (0..r.width())
        .find(|c| text(r, 0, *c).as_deref() == Some(header))
        .unwrap_or_else(|| panic!("no column {header}"))
}

/// The files of the xlsx package with their text.
pub fn package(path: &Path) -> Vec<(String, String)> {
    let f = std::fs::File::open(path).unwrap();
    let mut z = zip::ZipArchive::new(f).unwrap();
    (0..z.len())
        .map(|i| {
            let mut e = z.by_index(i).unwrap();
            let mut s = String::new();
            let _ = e.read_to_string(&mut s);
            (e.name().unwrap().to_string(), s)
        })
        .collect()
}

fn write(report: &seistriage::results::Screening) -> (tempfile::TempDir, std::path::PathBuf) {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("results.xlsx");
    let extra = workbook::write(report, &out).unwrap();
    assert!(extra.is_empty());
    (dir, out)
}

#[test]
fn sheets_come_in_the_contract_order() {
    let (_d, out) = write(&sample::report(24));
    assert_eq!(open(&out).sheet_names(), SHEETS);
}

#[test]
fn priority_has_one_row_per_screened_building_with_the_report_numbers() {
    let report = sample::report(24);
    let (_d, out) = write(&report);
    let p = sheet(&out, "Priority");
    assert_eq!(p.height(), report.buildings.len() + 1);
    let (rank, id, class, score) = (
        col(&p, "Rank"),
        col(&p, "Id"),
        col(&p, "Class"),
        col(&p, "Score (governing DCR)"),
    );
    let (io, ls, cp) = (
        col(&p, "DCR IO (max of x, y)"),
        col(&p, "DCR LS (max of x, y)"),
        col(&p, "DCR CP (max of x, y)"),
    );
    let pi = col(&p, "Priority index, weaker direction (%)");
    let cost = col(&p, "Retrofit cost");
    let lat = col(&p, "Latitude (deg)");
    let occ = col(&p, "Occupants");
    for (i, b) in report.buildings.iter().enumerate() {
        let r = i + 1;
        assert_eq!(num(&p, r, rank), Some(b.rank as f64));
        assert_eq!(text(&p, r, id).as_deref(), Some(b.id.as_str()));
        assert_eq!(num(&p, r, class), Some(f64::from(b.class)));
        // Full precision: the cell holds exactly the report's number.
        assert_eq!(num(&p, r, score), Some(b.score));
        let max = |f: fn(&seistriage::results::Levels) -> f64| {
            f(&b.directions.x.dcr).max(f(&b.directions.y.dcr))
        };
        assert_eq!(num(&p, r, io), Some(max(|l| l.io)));
        assert_eq!(num(&p, r, ls), Some(max(|l| l.ls)));
        assert_eq!(num(&p, r, cp), Some(max(|l| l.cp)));
        assert_eq!(num(&p, r, pi), Some(b.min_priority_index_pct()));
        assert_eq!(num(&p, r, cost), b.retrofit.as_ref().and_then(|x| x.cost));
        assert_eq!(num(&p, r, lat), b.latitude);
        assert_eq!(num(&p, r, occ), b.occupants.map(|o| o as f64));
    }
}

#[test]
fn formula_like_inventory_text_comes_back_as_text_and_no_cell_is_a_formula() {
    let report = sample::report(12);
    let (_d, out) = write(&report);
    let p = sheet(&out, "Priority");
    let name = col(&p, "Name");
    for (i, hostile) in sample::HOSTILE_NAMES.iter().enumerate() {
        assert_eq!(text(&p, i + 1, name).as_deref(), Some(*hostile));
    }
    let ns = sheet(&out, "Not screened");
    assert_eq!(text(&ns, 1, 2).as_deref(), Some("=HYPERLINK(\"x\")"));
    for (name, xml) in package(&out) {
        if name.starts_with("xl/worksheets/") {
            assert!(
                !xml.contains("<f>") && !xml.contains("<f "),
                "{name} holds a formula"
            );
        }
    }
}

#[test]
fn text_longer_than_a_cell_is_cut_at_the_cell_limit() {
    let report = sample::report(12);
    let (_d, out) = write(&report);
    let p = sheet(&out, "Priority");
    // Building 5 (rank 5) has a 40,000-character name.
    let name = text(&p, 5, col(&p, "Name")).unwrap();
    assert_eq!(name.encode_utf16().count(), CELL_TEXT_LIMIT);
}

#[test]
fn non_finite_numbers_leave_blank_cells() {
    let mut report = sample::report(8);
    report.buildings[1].score = f64::NAN;
    report.buildings[1].directions.x.dcr.io = f64::INFINITY;
    report.buildings[1].directions.y.dcr.io = f64::NEG_INFINITY;
    report.buildings[1].directions.x.period_s = f64::NAN;
    let (_d, out) = write(&report);
    let p = sheet(&out, "Priority");
    assert_eq!(
        p.get((2, col(&p, "Score (governing DCR)"))),
        Some(&Data::Empty)
    );
    assert_eq!(
        p.get((2, col(&p, "DCR IO (max of x, y)"))),
        Some(&Data::Empty)
    );
    let d = sheet(&out, "Directions");
    // Building 2, direction x is Directions row 3.
    assert_eq!(d.get((3, col(&d, "Period used T (s)"))), Some(&Data::Empty));
    for (name, xml) in package(&out) {
        assert!(!xml.contains("NaN") && !xml.contains(">inf<"), "{name}");
    }
}

#[test]
fn the_three_charts_are_in_the_package_with_their_series() {
    let (_d, out) = write(&sample::report(40));
    let files = package(&out);
    let chart = |n: usize| {
        files
            .iter()
            .find(|(f, _)| f == &format!("xl/charts/chart{n}.xml"))
            .map(|(_, x)| x.clone())
            .unwrap_or_else(|| panic!("chart{n}.xml missing"))
    };
    let scatter = chart(1);
    assert!(scatter.contains("<c:scatterChart>"));
    // One series per class (all four classes present in the sample).
    assert_eq!(scatter.matches("<c:ser>").count(), 4);
    assert!(scatter.contains("'Chart data'!"));
    let bars = chart(2);
    assert!(bars.contains("<c:barChart>"));
    let cost = chart(3);
    assert_eq!(
        cost.matches("<c:ser>").count(),
        3,
        "cost, funded walk, budget"
    );
    assert!(files.iter().any(|(f, _)| f == "xl/drawings/drawing1.xml"));
}

#[test]
fn scatter_series_hold_at_most_5000_points_per_class_highest_priorities_first() {
    // 3 classes of 5,400 buildings: each series is capped at 5,000 points.
    let mut report = sample::report(4);
    let base = report.buildings[0].clone();
    report.buildings = (0..16_200)
        .map(|i| {
            let mut b = base.clone();
            b.rank = i + 1;
            b.id = format!("S{i:05}");
            b.name = format!("n{i}");
            b.class = (i / 5_400) as u8 + 1;
            b.directions.x.column_index_pct = i as f64;
            b
        })
        .collect();
    let (_d, out) = write(&report);
    let cd = sheet(&out, "Chart data");
    for k in 0..3usize {
        let ci: Vec<f64> = (1..cd.height())
            .filter_map(|r| num(&cd, r, 2 * k))
            .collect();
        assert_eq!(ci.len(), 5_000, "class {}", k + 1);
        // Highest priorities first: the first 5,000 of the class in rank order.
        assert_eq!(ci[0], (k * 5_400) as f64);
        assert_eq!(ci[4_999], (k * 5_400 + 4_999) as f64);
    }
}

#[test]
fn per_row_sheets_have_one_row_per_item() {
    let report = sample::report(24);
    let (_d, out) = write(&report);
    let rows = |s: &str| sheet(&out, s).height() - 1;
    assert_eq!(rows("Directions"), 2 * report.buildings.len());
    assert_eq!(
        rows("Walls"),
        report
            .buildings
            .iter()
            .map(|b| b.walls.len())
            .sum::<usize>()
    );
    assert_eq!(
        rows("Flags"),
        report
            .buildings
            .iter()
            .map(|b| b.flags.len())
            .sum::<usize>()
    );
    assert_eq!(
        rows("Retrofit plan"),
        report
            .buildings
            .iter()
            .filter(|b| b.retrofit.is_some())
            .count()
    );
    assert_eq!(rows("Not screened"), report.not_screened.len());
    assert_eq!(rows("Input problems"), report.problems.len());
    let d = sheet(&out, "Directions");
    let b = &report.buildings[3];
    let r = 2 * 3 + 2; // building 4, direction y
    assert_eq!(text(&d, r, col(&d, "Direction")).as_deref(), Some("y"));
    assert_eq!(
        num(&d, r, col(&d, "Se(T) (g)")),
        Some(b.directions.y.detail.se_g)
    );
    assert_eq!(
        num(&d, r, col(&d, "κ (-)")),
        Some(b.directions.y.detail.kappa)
    );
    assert_eq!(
        num(&d, r, col(&d, "Roof drift δ_r (%)")),
        Some(b.directions.y.roof_drift_demand)
    );
    // A direction without walls has blank wall capacities (not zero).
    let r0 = 1; // building 1 (i = 0 has no walls), direction x
    assert_eq!(
        d.get((r0, col(&d, "Wall capacity LS (%)"))),
        Some(&Data::Empty)
    );
    let rp = sheet(&out, "Retrofit plan");
    // Building 6 (i = 5) has no solution in y: blank area and a note saying so.
    let row = (1..rp.height())
        .find(|r| text(&rp, *r, col(&rp, "Id")).as_deref() == Some("B0006"))
        .unwrap();
    assert_eq!(
        rp.get((row, col(&rp, "Added wall area Y (m²)"))),
        Some(&Data::Empty)
    );
    assert!(
        text(&rp, row, col(&rp, "Note"))
            .unwrap()
            .contains("no wall solution")
    );
    assert_eq!(text(&rp, row, col(&rp, "Replace")).as_deref(), Some("yes"));
}

#[test]
fn every_table_has_a_frozen_header_and_an_autofilter() {
    let (_d, out) = write(&sample::report(12));
    let files = package(&out);
    // sheet1 = Summary; sheets 2..=9 are the tables and Assumptions.
    for n in 2..=9 {
        let name = format!("xl/worksheets/sheet{n}.xml");
        let xml = &files.iter().find(|(f, _)| *f == name).unwrap().1;
        assert!(xml.contains("<autoFilter "), "{name}: no autofilter");
        assert!(
            xml.contains("state=\"frozen\""),
            "{name}: header not frozen"
        );
        assert!(xml.contains("<cols>"), "{name}: no column widths");
    }
    let styles = &files.iter().find(|(f, _)| f == "xl/styles.xml").unwrap().1;
    for name in seistriage::report::workbook::tables::CLASS_NAMES {
        assert!(styles.contains(name), "class format for {name}");
    }
}

#[test]
fn assumptions_list_every_setting_with_its_source_and_the_caution() {
    let report = sample::report(8);
    let (_d, out) = write(&report);
    let a = sheet(&out, "Assumptions");
    for k in KEYS {
        let row = (1..a.height())
            .find(|r| text(&a, *r, 0).as_deref() == Some(k.key))
            .unwrap_or_else(|| panic!("{} missing", k.key));
        assert_eq!(text(&a, row, 2).as_deref(), Some(k.tag));
        let v = report.settings.value_text(k.key).unwrap();
        let shown = text(&a, row, 1).unwrap();
        assert!(
            shown == v || (v.is_empty() && shown == "(empty)"),
            "{}",
            k.key
        );
    }
    let all: Vec<String> = a
        .cells()
        .filter_map(|(_, _, c)| match c {
            Data::String(s) => Some(s.clone()),
            _ => None,
        })
        .collect();
    assert!(all.iter().any(|s| s == seistriage::CAUTION));
    assert!(all.iter().any(|s| s.contains("T*")));
    assert!(all.iter().any(|s| s.contains("biased low")));
}

#[test]
fn summary_says_what_was_screened_and_lists_the_top_ten_and_budget() {
    let report = sample::report(24);
    let (_d, out) = write(&report);
    let s = sheet(&out, "Summary");
    let all: Vec<String> = s
        .cells()
        .filter_map(|(_, _, c)| match c {
            Data::String(s) => Some(s.clone()),
            _ => None,
        })
        .collect();
    assert!(all.contains(&report.input.file));
    assert!(all.contains(&report.input.sha256));
    assert!(all.iter().any(|x| x == seistriage::CAUTION));
    for b in report.buildings.iter().take(10) {
        assert!(all.contains(&b.id), "{} not in the top ten", b.id);
    }
    assert!(!all.contains(&report.buildings[10].id));
    assert!(
        all.iter()
            .any(|x| x.starts_with("Budget 500,000: Plan A (in priority order) funds"))
    );
    assert!(all.iter().any(|x| x == "Northfield"));
}

#[test]
fn large_stock_layout_writes_the_per_row_tables_as_csv_beside_the_workbook() {
    let report = sample::report(24);
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("big.xlsx");
    let layout = Layout::of(&report).large_stock();
    let extra = workbook::write_with_layout(&report, &out, &layout, &|_| {}).unwrap();
    let names: Vec<String> = extra
        .iter()
        .map(|(_, p)| p.file_name().unwrap().to_string_lossy().into_owned())
        .collect();
    for tag in ["priority", "retrofit-plan", "directions", "walls", "flags"] {
        assert!(
            names.contains(&format!("big.{tag}.csv")),
            "{tag}: {names:?}"
        );
    }
    assert_eq!(
        open(&out).sheet_names(),
        [
            "Summary",
            "Priority",
            "Not screened",
            "Input problems",
            "Assumptions",
            "Chart data"
        ]
    );
    let count = |tag: &str| {
        csv::Reader::from_path(dir.path().join(format!("big.{tag}.csv")))
            .unwrap()
            .records()
            .count()
    };
    assert_eq!(count("directions"), 2 * report.buildings.len());
    assert_eq!(count("priority"), report.buildings.len());
    let p = sheet(&out, "Priority");
    assert_eq!(
        p.height() - 1,
        report.buildings.len().min(LARGE_PRIORITY_ROWS)
    );
    let s = sheet(&out, "Summary");
    assert!(s.cells().any(|(_, _, c)| matches!(c, Data::String(t) if t.contains("Large stock") && t.contains("big.directions.csv"))));
    let _ = TableId::ALL;
}

#[test]
fn constant_memory_mode_writes_the_same_values() {
    let report = sample::report(30);
    let dir = tempfile::tempdir().unwrap();
    let a = dir.path().join("a.xlsx");
    let b = dir.path().join("b.xlsx");
    workbook::write(&report, &a).unwrap();
    let mut layout = Layout::of(&report);
    layout.constant_memory = true;
    workbook::write_with_layout(&report, &b, &layout, &|_| {}).unwrap();
    for s in ["Priority", "Directions", "Walls", "Flags", "Retrofit plan"] {
        assert_eq!(sheet(&a, s), sheet(&b, s), "{s}");
    }
    // No temporary files are left in the folder.
    let left: Vec<_> = std::fs::read_dir(dir.path()).unwrap().collect();
    assert_eq!(left.len(), 2);
}

#[test]
fn a_failed_write_leaves_nothing_under_the_final_name() {
    let report = sample::report(6);
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("missing-folder").join("r.xlsx");
    assert!(workbook::write(&report, &out).is_err());
    assert!(!out.exists());
    // An existing file is replaced only by a complete workbook.
    let out = dir.path().join("r.xlsx");
    std::fs::write(&out, b"old").unwrap();
    workbook::write(&report, &out).unwrap();
    assert_eq!(open(&out).sheet_names()[0], "Summary");
    let left: Vec<_> = std::fs::read_dir(dir.path()).unwrap().flatten().collect();
    assert_eq!(left.len(), 1, "{left:?}");
}

/// Writes the sample workbook to `$SEISTRIAGE_SAMPLE_WORKBOOK` when set, for looking at it in
/// a spreadsheet application (see DEVELOPERS.md); otherwise checks it saves in a tempdir.
#[test]
fn sample_workbook_for_visual_check() {
    let report = sample::report(40);
    match std::env::var_os("SEISTRIAGE_SAMPLE_WORKBOOK") {
        Some(p) => {
            workbook::write(&report, Path::new(&p)).unwrap();
        }
        None => {
            let (_d, out) = write(&report);
            assert!(out.exists());
        }
    }
}

#[test]
fn progress_reports_every_row_written() {
    let report = sample::report(24);
    let dir = tempfile::tempdir().unwrap();
    // Sheets are written in parallel: the callback may come from any thread.
    let last = std::sync::atomic::AtomicU64::new(0);
    workbook::write_with_progress(&report, &dir.path().join("p.xlsx"), &|n| {
        last.store(n, std::sync::atomic::Ordering::Relaxed)
    })
    .unwrap();
    let c = workbook::tables::RowCounts::of(&report);
    let total =
        c.priority + c.retrofit + c.directions + c.walls + c.flags + c.not_screened + c.problems;
    assert_eq!(last.into_inner(), total as u64);
}

#[test]
fn summary_counts_the_buildings_per_flag() {
    let report = sample::report(24);
    let (_d, out) = write(&report);
    let s = sheet(&out, "Summary");
    let row = (0..s.height())
        .find(|r| text(&s, *r, 0).as_deref() == Some("soft-storey"))
        .unwrap();
    let with = report
        .buildings
        .iter()
        .filter(|b| b.flags.iter().any(|f| f.code == "soft-storey"))
        .count();
    let severe = report
        .buildings
        .iter()
        .filter(|b| b.class <= 2 && b.flags.iter().any(|f| f.code == "soft-storey"))
        .count();
    assert_eq!(num(&s, row, 1), Some(with as f64));
    assert_eq!(num(&s, row, 2), Some(severe as f64));
}

/// The `s` (style) attribute of an XML element's opening tag, if any.
fn style_attr(tag: &str) -> Option<u32> {
    let at = tag.find(" s=\"")? + 4;
    tag[at..].split('"').next()?.parse().ok()
}

/// The style index of the `<col>` range that covers a 1-based column.
fn col_style(xml: &str, col: u32) -> Option<u32> {
    xml.split("<col ").skip(1).find_map(|t| {
        let t = t.split('>').next()?;
        let attr = |name: &str| -> Option<u32> {
            let at = t.find(&format!("{name}=\""))? + name.len() + 2;
            t[at..].split('"').next()?.parse().ok()
        };
        let (min, max) = (attr("min")?, attr("max")?);
        (min..=max).contains(&col).then(|| attr("style")).flatten()
    })
}

#[test]
fn number_cells_carry_their_columns_number_format_in_both_modes() {
    // The numeric columns carry their number format as a column format and the cells are
    // written without one; the writer must still give every number cell that format.
    let report = sample::report(12);
    let dir = tempfile::tempdir().unwrap();
    for constant_memory in [false, true] {
        let out = dir.path().join(format!("f{constant_memory}.xlsx"));
        let mut layout = Layout::of(&report);
        layout.constant_memory = constant_memory;
        workbook::write_with_layout(&report, &out, &layout, &|_| {}).unwrap();
        let files = package(&out);
        // sheet2 = Priority; column H (8) is the score, a two-decimal DCR.
        let xml = &files
            .iter()
            .find(|(f, _)| f == "xl/worksheets/sheet2.xml")
            .unwrap()
            .1;
        let want = col_style(xml, 8).expect("score column has a format");
        assert_ne!(want, 0);
        let mut cells = 0;
        for r in 2..=(report.buildings.len() + 1) {
            let open = format!("<c r=\"H{r}\"");
            let at = xml.find(&open).unwrap_or_else(|| panic!("no cell H{r}"));
            let tag = xml[at..].split('>').next().unwrap();
            assert_eq!(style_attr(tag), Some(want), "H{r} ({constant_memory})");
            cells += 1;
        }
        assert_eq!(cells, 12);
    }
}
