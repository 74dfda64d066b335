/*!
The `Confidence` sheet (only with `--samples`, placed after Priority): one row per building in
rank order with the outputs of method §13, the "survey next" list with the defaults each of
those buildings used, and a chart of the p05–p95 rank interval of the 30 highest priorities
(rank 1 on top). Its chart series sit in a small block of the sheet itself, under the
survey-next list. With the large-stock layout the rows also go to
`<out stem>.confidence.csv` and the sheet keeps the first rows.
*/

use std::path::{Path, PathBuf};

use rust_xlsxwriter::{
    Chart, ChartFont, ChartFormat, ChartLine, ChartSolidFill, ChartType, Worksheet,
};

use super::style::{CLASS_CHART_FILL, Styles};
use super::tables::{Cell, CellKind};
use super::{ReportError, cut, put};
use crate::results::{BuildingResult, Screening};

/// Sheet name (interface.md).
pub const SHEET: &str = "Confidence";
/// Buildings in the rank-interval chart.
pub const CHART_BUILDINGS: usize = 30;
/// File tag of the large-stock CSV: `<out stem>.confidence.csv`.
pub const FILE_TAG: &str = "confidence";

/// One column of the table: header (workbook), machine name (CSV), kind, width.
struct Col(&'static str, &'static str, CellKind, f64);

const COLUMNS: &[Col] = &[
    Col("Rank", "rank", CellKind::Int, 7.0),
    Col("Id", "id", CellKind::Text, 12.0),
    Col("Name", "name", CellKind::Text, 26.0),
    Col("Occupants", "occupants", CellKind::Thousands, 10.0),
    Col("Class", "class", CellKind::Class, 24.0),
    Col("Score (governing DCR)", "score", CellKind::Dcr, 10.0),
    Col("P(class 1)", "p_class_1", CellKind::Ratio, 9.0),
    Col("P(class 2)", "p_class_2", CellKind::Ratio, 9.0),
    Col("P(class 3)", "p_class_3", CellKind::Ratio, 9.0),
    Col("P(class 4)", "p_class_4", CellKind::Ratio, 9.0),
    Col("P(deficit) (class 1-2)", "p_deficit", CellKind::Ratio, 10.0),
    Col("Score p05", "score_p05", CellKind::Dcr, 9.0),
    Col("Score p50", "score_p50", CellKind::Dcr, 9.0),
    Col("Score p95", "score_p95", CellKind::Dcr, 9.0),
    Col("Rank p05", "rank_p05", CellKind::Int, 8.0),
    Col("Rank p50", "rank_p50", CellKind::Int, 8.0),
    Col("Rank p95", "rank_p95", CellKind::Int, 8.0),
    Col("P(rank <= k)", "p_top_k", CellKind::Ratio, 9.0),
    Col(
        "Survey value (occupants)",
        "survey_value",
        CellKind::Dec2,
        10.0,
    ),
    Col("Defaults used", "defaults_used", CellKind::Text, 34.0),
];

fn row(b: &BuildingResult) -> Vec<Cell<'_>> {
    let u = b.uncertainty.as_ref();
    let num = |f: &dyn Fn(&crate::results::BuildingUncertainty) -> f64| {
        u.map_or(Cell::Blank, |u| Cell::Num(f(u)))
    };
    vec![
        Cell::Num(b.rank as f64),
        Cell::Text(b.id.as_str().into()),
        Cell::Text(b.name.as_str().into()),
        b.occupants.map_or(Cell::Blank, |o| Cell::Num(o as f64)),
        Cell::Num(f64::from(b.class)),
        Cell::Num(b.score),
        num(&|u| u.p_class.c1),
        num(&|u| u.p_class.c2),
        num(&|u| u.p_class.c3),
        num(&|u| u.p_class.c4),
        num(&|u| u.p_deficit),
        num(&|u| u.score.p05),
        num(&|u| u.score.p50),
        num(&|u| u.score.p95),
        num(&|u| u.rank.p05 as f64),
        num(&|u| u.rank.p50 as f64),
        num(&|u| u.rank.p95 as f64),
        num(&|u| u.p_top_k),
        num(&|u| u.survey_value),
        Cell::Text(b.defaults_used.join("; ").into()),
    ]
}

/// The path of the large-stock CSV beside the workbook.
pub fn csv_path(out: &Path) -> PathBuf {
    let stem = out
        .file_stem()
        .map(|s| s.to_string_lossy().into_owned())
        .unwrap_or_else(|| "screening".into());
    out.with_file_name(format!("{stem}.{FILE_TAG}.csv"))
}

/// Writes every Confidence row as CSV (the large-stock layout).
pub fn write_csv(report: &Screening, path: &Path) -> Result<(), ReportError> {
    crate::report::atomic::write_atomic(path, |w| {
        let mut cw = ::csv::Writer::from_writer(w);
        cw.write_record(COLUMNS.iter().map(|c| c.1))?;
        let mut num = String::new();
        for b in &report.buildings {
            crate::report::csv::write_cells(&row(b), false, &mut num, &mut cw)?;
        }
        cw.flush()?;
        Ok(())
    })
}

/// Fills the Confidence sheet with at most `rows` building rows.
pub fn write(
    ws: &mut Worksheet,
    report: &Screening,
    rows: usize,
    styles: &Styles,
) -> Result<(), ReportError> {
    ws.set_name(SHEET)?;
    let Some(st) = &report.uncertainty else {
        return Ok(());
    };
    for (i, c) in COLUMNS.iter().enumerate() {
        ws.set_column_width(i as u16, c.3)?;
        // Numbers of these kinds are written without a cell format and take the column's.
        if super::column_formatted(c.2) {
            ws.set_column_format(i as u16, styles.kind(c.2))?;
        }
        ws.write_string_with_format(0, i as u16, c.0, &styles.header)?;
    }
    ws.set_row_height(0, 45)?;
    ws.set_freeze_panes(1, 2)?;
    ws.set_landscape();
    ws.set_repeat_rows(0, 0)?;
    let shown: Vec<&BuildingResult> = report.buildings.iter().take(rows).collect();
    ws.autofilter(0, 0, shown.len() as u32, (COLUMNS.len() - 1) as u16)?;
    for (r, b) in shown.iter().enumerate() {
        for (i, (cell, c)) in row(b).iter().zip(COLUMNS).enumerate() {
            put(ws, r as u32 + 1, i as u16, cell, c.2, styles)?;
        }
    }

    // The side block: what the columns mean, survey next, chart data, chart.
    let c0 = COLUMNS.len() as u16 + 1;
    for (k, w) in [8.0, 14.0, 28.0, 12.0, 12.0, 10.0, 40.0].iter().enumerate() {
        ws.set_column_width(c0 + k as u16, *w)?;
    }
    let mut r = 0u32;
    ws.write_string_with_format(
        r,
        c0,
        "How sure is the ranking? (method §13)",
        &styles.section,
    )?;
    r += 1;
    let lines: Vec<String> = [
        format!(
            "{} samples (seed {}) re-run the class, score and order with lognormal factors on drift demand, \
             wall and column capacity, concrete strength, floor weight and hazard; the retrofit and the \
             budget plan stay those of the median inputs.",
            st.samples, st.seed
        ),
        format!(
            "P(class n): share of samples in class n; P(deficit) = P(class 1) + P(class 2). Score and rank \
             p05/p50/p95: 5 %, 50 %, 95 % quantiles over the samples. P(rank <= k): share of samples with \
             rank at most k = {} ({}).",
            st.top_k, st.top_k_source
        ),
        format!(
            "Class 1-2 buildings per sample: {} to {} (p05-p95, median {}).",
            st.class_1_2_count.p05, st.class_1_2_count.p95, st.class_1_2_count.p50
        ),
    ]
    .into_iter()
    .chain(report.budget_plan.as_ref().map(|p| {
        let e = |f: &crate::results::FundingPlan| {
            f.expected_occupants_protected
                .map_or_else(|| "-".to_string(), |v| format!("{v:.1}"))
        };
        format!(
            "Expected occupants protected (sum of P(deficit) x occupants over the funded buildings): \
             priority walk {} (deterministic {}), max-occupants plan {} (deterministic {}).",
            e(&p.priority_walk),
            p.priority_walk.occupants_protected,
            e(&p.max_occupants),
            p.max_occupants.occupants_protected
        )
    }))
    .collect::<Vec<String>>();
    // One line each, overflowing into the empty cells to the right (the building rows
    // beside them keep their height).
    for l in &lines {
        ws.write_string(r, c0, l.as_str())?;
        r += 1;
    }
    r += 1;
    ws.write_string_with_format(
        r,
        c0,
        "Survey next: where a site survey would most change a funding decision for the most people",
        &styles.section,
    )?;
    r += 1;
    let heads = [
        "#",
        "Id",
        "Name",
        "Survey value (occupants)",
        "P(deficit)",
        "Occupants",
        "Defaults used (inputs a survey can firm up)",
    ];
    for (k, h) in heads.iter().enumerate() {
        ws.write_string_with_format(r, c0 + k as u16, *h, &styles.header)?;
    }
    r += 1;
    if st.survey_next.is_empty() {
        ws.write_string(
            r,
            c0,
            "none: no building's deficit hangs on uncertain inputs",
        )?;
        r += 1;
    }
    for (k, id) in st.survey_next.iter().enumerate() {
        let Some(b) = report.buildings.iter().find(|b| &b.id == id) else {
            continue;
        };
        let u = b.uncertainty.as_ref();
        ws.write_number(r, c0, (k + 1) as f64)?;
        ws.write_string(r, c0 + 1, cut(&b.id))?;
        ws.write_string(r, c0 + 2, cut(&b.name))?;
        ws.write_number_with_format(
            r,
            c0 + 3,
            u.map_or(0.0, |u| u.survey_value),
            styles.kind(CellKind::Dec2),
        )?;
        ws.write_number_with_format(
            r,
            c0 + 4,
            u.map_or(0.0, |u| u.p_deficit),
            styles.kind(CellKind::Ratio),
        )?;
        if let Some(o) = b.occupants {
            ws.write_number_with_format(r, c0 + 5, o as f64, styles.kind(CellKind::Thousands))?;
        }
        let defaults = if b.defaults_used.is_empty() {
            "none (every key input given)".to_string()
        } else {
            b.defaults_used.join("; ")
        };
        ws.write_string(r, c0 + 6, cut(&defaults))?;
        r += 1;
    }

    // Chart data: label, p05 (invisible bar), p95 − p05 (the visible interval).
    let bars = report.buildings.len().min(CHART_BUILDINGS);
    if bars == 0 {
        return Ok(());
    }
    r += 1;
    ws.write_string_with_format(
        r,
        c0,
        "Rank interval of the highest priorities (chart data)",
        &styles.section,
    )?;
    r += 1;
    for (k, h) in ["Rank", "Rank · id", "Rank p05", "p95 − p05", "Rank p95"]
        .iter()
        .enumerate()
    {
        ws.write_string_with_format(r, c0 + k as u16, *h, &styles.header)?;
    }
    r += 1;
    let first = r;
    for b in report.buildings.iter().take(bars) {
        let (lo, hi) = b
            .uncertainty
            .as_ref()
            .map_or((b.rank as f64, b.rank as f64), |u| {
                (u.rank.p05 as f64, u.rank.p95 as f64)
            });
        ws.write_number(r, c0, b.rank as f64)?;
        ws.write_string(r, c0 + 1, cut(&format!("{} · {}", b.rank, b.id)))?;
        // The interval starts at p05 − 0.5 and ends at p95 + 0.5, so a building whose
        // rank never moves still shows a bar one place wide.
        ws.write_number(r, c0 + 2, lo - 0.5)?;
        ws.write_number(r, c0 + 3, hi - lo + 1.0)?;
        ws.write_number(r, c0 + 4, hi)?;
        r += 1;
    }
    let last = r - 1;
    let mut chart = Chart::new(ChartType::BarStacked);
    let mut none = ChartFormat::new();
    none.set_no_fill().set_no_border();
    chart
        .add_series()
        .set_name("")
        .set_categories((SHEET, first, c0 + 1, last, c0 + 1))
        .set_values((SHEET, first, c0 + 2, last, c0 + 2))
        .set_format(&mut none)
        .set_gap(40);
    let mut bar = ChartFormat::new();
    bar.set_solid_fill(ChartSolidFill::new().set_color(CLASS_CHART_FILL[1]))
        .set_border(ChartLine::new().set_color(0x30_30_30).set_width(0.5));
    chart
        .add_series()
        .set_name("Rank p05 to p95")
        .set_categories((SHEET, first, c0 + 1, last, c0 + 1))
        .set_values((SHEET, first, c0 + 3, last, c0 + 3))
        .set_format(&mut bar);
    chart.title().set_name(&format!(
        "Rank interval (p05 to p95 over {} samples) of the {} highest priorities",
        st.samples, bars
    ));
    // The category axis of a bar chart is the vertical one: reversed, rank 1 on top.
    chart
        .y_axis()
        .set_reverse()
        .set_name("Rank and id (deterministic order)")
        .set_label_interval(1)
        .set_font(ChartFont::new().set_size(8));
    chart
        .x_axis()
        .set_name("Rank in the samples (1 = highest priority)")
        .set_min(0);
    chart.legend().set_hidden();
    chart.set_width(640).set_height(680);
    ws.insert_chart(r + 1, c0, &chart)?;
    Ok(())
}
