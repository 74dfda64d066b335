/*!
The Summary sheet (what was screened, counts, the ten highest priorities, the budget line,
districts) and its three native charts, whose series live on the hidden `Chart data` sheet.
*/

use std::collections::BTreeMap;
use std::path::PathBuf;

use rust_xlsxwriter::{
    Chart, ChartFont, ChartFormat, ChartLine, ChartLineDashType, ChartMarker, ChartMarkerType,
    ChartPoint, ChartSolidFill, ChartType, ExcelDateTime, Worksheet,
};

use super::style::{CLASS_CHART_FILL, CLASS_FILL, Styles};
use super::tables::{CLASS_NAMES, CellKind, TableId, class_name, funding_cost};
use super::{Layout, ReportError, cut};
use crate::results::Screening;

/// Name of the hidden sheet holding the chart series.
pub const CHART_DATA: &str = "Chart data";
/// Most points per class in the wall-index / column-index chart (highest priorities first).
pub const SCATTER_POINTS_PER_CLASS: usize = 5_000;
/// Summary rows up to which the sheet is printed on one page (beyond, one page wide).
const SUMMARY_ONE_PAGE_ROWS: u32 = 110;
/// Bars in the governing-DCR chart.
pub const TOP_BARS: usize = 30;
/// Most points on the cumulative-cost curve (evenly thinned beyond this).
const CURVE_POINTS: usize = 2_000;

/// Where the chart series were written on the chart-data sheet.
#[derive(Debug, Clone, Default)]
pub struct ChartRanges {
    /// Per class 1–4: number of scatter points (columns 2k, 2k+1, rows 1..=n).
    scatter: [usize; 4],
    /// Bars written (columns 9–11).
    bars: usize,
    /// Cumulative-cost points (columns 13–14), funded-walk points (15–16), budget (17–18).
    curve: usize,
    walk: usize,
    budget: bool,
}

fn num(ws: &mut Worksheet, r: u32, c: u16, v: f64) -> Result<(), ReportError> {
    if v.is_finite() {
        ws.write_number(r, c, v)?;
    }
    Ok(())
}

/// Writes the chart series to the (hidden) chart-data sheet.
pub fn write_chart_data(
    ws: &mut Worksheet,
    report: &Screening,
) -> Result<ChartRanges, ReportError> {
    ws.set_name(CHART_DATA)?;
    ws.set_hidden(true);
    let mut ranges = ChartRanges::default();
    // Wall index (weaker direction) against column index, per class, in rank order.
    for k in 0..4u16 {
        ws.write_string(0, 2 * k, format!("Class {} column index (%)", k + 1))?;
        ws.write_string(0, 2 * k + 1, format!("Class {} wall index (%)", k + 1))?;
    }
    for b in &report.buildings {
        let k = usize::from(b.class.clamp(1, 4) - 1);
        let Some(n) = ranges.scatter.get_mut(k) else {
            continue;
        };
        if *n >= SCATTER_POINTS_PER_CLASS {
            continue;
        }
        let wi = b
            .directions
            .x
            .wall_index_pct
            .min(b.directions.y.wall_index_pct);
        let ci = b.directions.x.column_index_pct;
        if !(wi.is_finite() && ci.is_finite()) {
            continue;
        }
        *n += 1;
        let row = *n as u32;
        ws.write_number(row, 2 * k as u16, ci)?;
        ws.write_number(row, 2 * k as u16 + 1, wi)?;
    }
    // Governing DCR of the highest priorities.
    ws.write_string(0, 9, "Id")?;
    ws.write_string(0, 10, "Score (governing DCR)")?;
    ws.write_string(0, 11, "Class")?;
    for (i, b) in report.buildings.iter().take(TOP_BARS).enumerate() {
        let r = i as u32 + 1;
        ws.write_string(r, 9, cut(&format!("{} {}", b.rank, b.id)))?;
        num(ws, r, 10, b.score)?;
        ws.write_number(r, 11, f64::from(b.class))?;
        ranges.bars += 1;
    }
    // Cumulative funding cost in rank order over the buildings that need a retrofit.
    ws.write_string(0, 13, "Buildings, rank order")?;
    ws.write_string(0, 14, "Cumulative cost")?;
    ws.write_string(0, 15, "Buildings funded (priority walk)")?;
    ws.write_string(0, 16, "Cumulative cost funded")?;
    ws.write_string(0, 17, "Buildings")?;
    ws.write_string(0, 18, "Budget")?;
    let costs: Vec<f64> = report
        .buildings
        .iter()
        .filter(|b| b.retrofit.is_some())
        .filter_map(funding_cost)
        .filter(|c| c.is_finite())
        .collect();
    if !costs.is_empty() {
        let step = costs.len().div_ceil(CURVE_POINTS).max(1);
        let mut cum = 0.0;
        ws.write_number(1, 13, 0.0)?;
        ws.write_number(1, 14, 0.0)?;
        ranges.curve = 1;
        for (i, c) in costs.iter().enumerate() {
            cum += c;
            if (i + 1) % step == 0 || i + 1 == costs.len() {
                ranges.curve += 1;
                let r = ranges.curve as u32;
                ws.write_number(r, 13, (i + 1) as f64)?;
                ws.write_number(r, 14, cum)?;
            }
        }
        let funded: Vec<f64> = report
            .buildings
            .iter()
            .filter(|b| b.retrofit.as_ref().and_then(|r| r.funded) == Some(true))
            .filter_map(funding_cost)
            .filter(|c| c.is_finite())
            .collect();
        if !funded.is_empty() {
            let step = funded.len().div_ceil(CURVE_POINTS).max(1);
            let mut cum = 0.0;
            ws.write_number(1, 15, 0.0)?;
            ws.write_number(1, 16, 0.0)?;
            ranges.walk = 1;
            for (i, c) in funded.iter().enumerate() {
                cum += c;
                if (i + 1) % step == 0 || i + 1 == funded.len() {
                    ranges.walk += 1;
                    let r = ranges.walk as u32;
                    ws.write_number(r, 15, (i + 1) as f64)?;
                    ws.write_number(r, 16, cum)?;
                }
            }
        }
        if let Some(budget) = report
            .budget_plan
            .as_ref()
            .map(|p| p.budget)
            .filter(|b| b.is_finite())
        {
            ws.write_number(1, 17, 0.0)?;
            ws.write_number(1, 18, budget)?;
            ws.write_number(2, 17, costs.len() as f64)?;
            ws.write_number(2, 18, budget)?;
            ranges.budget = true;
        }
    }
    Ok(ranges)
}

fn fill(rgb: u32) -> ChartFormat {
    let mut f = ChartFormat::new();
    f.set_solid_fill(ChartSolidFill::new().set_color(rgb))
        .set_border(ChartLine::new().set_color(0x30_30_30).set_width(0.5));
    f
}

fn scatter_chart(ranges: &ChartRanges) -> Option<Chart> {
    if ranges.scatter.iter().all(|n| *n == 0) {
        return None;
    }
    let markers = [
        ChartMarkerType::Diamond,
        ChartMarkerType::Square,
        ChartMarkerType::Triangle,
        ChartMarkerType::Circle,
    ];
    let mut chart = Chart::new(ChartType::Scatter);
    for k in 0..4usize {
        let n = ranges.scatter.get(k).copied().unwrap_or(0);
        if n == 0 {
            continue;
        }
        let (c, r) = (2 * k as u16, n as u32);
        chart
            .add_series()
            .set_name(&format!(
                "Class {} {}",
                k + 1,
                CLASS_NAMES.get(k).copied().unwrap_or("")
            ))
            .set_categories((CHART_DATA, 1, c, r, c))
            .set_values((CHART_DATA, 1, c + 1, r, c + 1))
            .set_marker(
                ChartMarker::new()
                    .set_type(markers.get(k).copied().unwrap_or(ChartMarkerType::Circle))
                    .set_size(6)
                    .set_format(&mut fill(
                        CLASS_CHART_FILL.get(k).copied().unwrap_or(0x80_80_80),
                    )),
            );
    }
    chart
        .title()
        .set_name("Wall index against column index, by class");
    chart.x_axis().set_name("Column index CI (%)").set_min(0);
    chart
        .y_axis()
        .set_name("Wall index WI, weaker direction (%)")
        .set_min(0);
    chart.set_width(640).set_height(400);
    Some(chart)
}

fn bar_chart(report: &Screening, ranges: &ChartRanges) -> Option<Chart> {
    if ranges.bars == 0 {
        return None;
    }
    let r = ranges.bars as u32;
    let points: Vec<ChartPoint> = report
        .buildings
        .iter()
        .take(ranges.bars)
        .map(|b| {
            let k = usize::from(b.class.clamp(1, 4) - 1);
            ChartPoint::new().set_format(&mut fill(
                CLASS_CHART_FILL.get(k).copied().unwrap_or(0x80_80_80),
            ))
        })
        .collect();
    let mut chart = Chart::new(ChartType::Bar);
    chart
        .add_series()
        .set_name("Score (governing DCR)")
        .set_categories((CHART_DATA, 1, 9, r, 9))
        .set_values((CHART_DATA, 1, 10, r, 10))
        .set_points(&points)
        .set_gap(40);
    chart.title().set_name(&format!(
        "Governing DCR ({}) of the {} highest priorities",
        report.settings.ranking_level.code().to_uppercase(),
        ranges.bars
    ));
    // In a bar chart the category axis is the vertical one (`y_axis` here); reversed so that
    // rank 1 is on top.
    chart
        .y_axis()
        .set_reverse()
        .set_name("Rank and id")
        .set_label_interval(1)
        .set_font(ChartFont::new().set_size(8));
    chart
        .x_axis()
        .set_name("Governing DCR (1.0 = capacity reached)")
        .set_min(0);
    chart.legend().set_hidden();
    chart.set_width(640).set_height(680);
    Some(chart)
}

fn cost_chart(ranges: &ChartRanges) -> Option<Chart> {
    if ranges.curve == 0 {
        return None;
    }
    let mut chart = Chart::new(ChartType::ScatterStraight);
    let r = ranges.curve as u32;
    chart
        .add_series()
        .set_name("Cumulative cost, all retrofits in rank order")
        .set_categories((CHART_DATA, 1, 13, r, 13))
        .set_values((CHART_DATA, 1, 14, r, 14))
        .set_format(ChartLine::new().set_color(CLASS_FILL[1]).set_width(2.0));
    if ranges.walk > 0 {
        let r = ranges.walk as u32;
        chart
            .add_series()
            .set_name("Cumulative cost of the buildings funded (priority walk)")
            .set_categories((CHART_DATA, 1, 15, r, 15))
            .set_values((CHART_DATA, 1, 16, r, 16))
            .set_format(ChartLine::new().set_color(CLASS_FILL[0]).set_width(2.5));
    }
    if ranges.budget {
        chart
            .add_series()
            .set_name("Budget")
            .set_categories((CHART_DATA, 1, 17, 2, 17))
            .set_values((CHART_DATA, 1, 18, 2, 18))
            .set_format(
                ChartLine::new()
                    .set_color(0x40_40_40)
                    .set_width(1.5)
                    .set_dash_type(ChartLineDashType::Dash),
            );
    }
    chart
        .title()
        .set_name("Cumulative retrofit cost against buildings funded");
    chart.x_axis().set_name("Buildings (rank order)").set_min(0);
    chart
        .y_axis()
        .set_name("Cumulative cost (currency units)")
        .set_num_format("#,##0")
        .set_min(0);
    chart.set_width(640).set_height(400);
    Some(chart)
}

struct Rows<'w> {
    ws: &'w mut Worksheet,
    r: u32,
}

impl Rows<'_> {
    fn label(&mut self, label: &str, value: &str, styles: &Styles) -> Result<(), ReportError> {
        self.ws
            .write_string_with_format(self.r, 0, label, &styles.label)?;
        self.ws.write_string(self.r, 1, cut(value))?;
        self.r += 1;
        Ok(())
    }
    /// A label with a long value wrapped over columns B–H, `lines` lines tall.
    fn label_wrapped(
        &mut self,
        label: &str,
        value: &str,
        lines: u32,
        styles: &Styles,
    ) -> Result<(), ReportError> {
        self.ws
            .write_string_with_format(self.r, 0, label, &styles.label)?;
        self.ws
            .merge_range(self.r, 1, self.r, 7, cut(value), &styles.wrap)?;
        self.ws.set_row_height(self.r, 15 * lines)?;
        self.r += 1;
        Ok(())
    }
    fn label_num(
        &mut self,
        label: &str,
        value: f64,
        kind: CellKind,
        styles: &Styles,
    ) -> Result<(), ReportError> {
        self.ws
            .write_string_with_format(self.r, 0, label, &styles.label)?;
        if value.is_finite() {
            self.ws
                .write_number_with_format(self.r, 1, value, styles.kind(kind))?;
        }
        self.r += 1;
        Ok(())
    }
    fn section(&mut self, title: &str, styles: &Styles) -> Result<(), ReportError> {
        self.r += 1;
        self.ws
            .write_string_with_format(self.r, 0, title, &styles.section)?;
        for c in 1..8 {
            self.ws.write_blank(self.r, c, &styles.section)?;
        }
        self.r += 1;
        Ok(())
    }
    fn header(&mut self, names: &[&str], styles: &Styles) -> Result<(), ReportError> {
        self.ws.set_row_height(self.r, 45)?;
        for (i, n) in names.iter().enumerate() {
            self.ws
                .write_string_with_format(self.r, i as u16, *n, &styles.header)?;
        }
        self.r += 1;
        Ok(())
    }
}

/// Effective hazard and method settings shown on the Summary: (key, plain label).
const HAZARD_KEYS: &[(&str, &str)] = &[
    ("agr_g", "Reference PGA on rock agR (g)"),
    ("default_ground_type", "Default ground type"),
    ("spectrum", "Spectrum"),
    ("sds_g", "SDS (g), two-parameter spectrum"),
    ("sd1_g", "SD1 (g), two-parameter spectrum"),
    ("tl_s", "TL (s), two-parameter spectrum"),
    ("damping_pct", "Damping (%)"),
    ("period_factor", "Factor on the formula period"),
    ("capacity_model", "Wall capacity model"),
    ("confidence_factor", "Confidence factor CF"),
    ("ranking_level", "Ranking level"),
    ("near_fault_km", "Near-fault distance (km)"),
];

fn money(v: f64) -> String {
    if !v.is_finite() {
        return String::new();
    }
    let s = format!("{:.0}", v.abs());
    let mut out = String::new();
    for (i, ch) in s.chars().enumerate() {
        if i > 0 && (s.len() - i) % 3 == 0 {
            out.push(',');
        }
        out.push(ch);
    }
    if v < 0.0 { format!("-{out}") } else { out }
}

/// The budget line of the Summary (and of the terminal summary).
pub fn budget_line(report: &Screening) -> String {
    match &report.budget_plan {
        Some(p) => {
            let walk = &p.priority_walk;
            let best = &p.max_occupants;
            let n = |k: usize| {
                if k == 1 {
                    "1 building".to_string()
                } else {
                    format!("{k} buildings")
                }
            };
            let s = format!(
                "Budget {}: Plan A (in priority order) funds {} for {}, protecting {} \
                 occupants of class 1–2 buildings; Plan B (most people protected) funds {} for \
                 {}, protecting {} occupants",
                money(p.budget),
                n(walk.funded.len()),
                money(walk.cost),
                money(walk.occupants_protected as f64),
                n(best.funded.len()),
                money(best.cost),
                money(best.occupants_protected as f64)
            );
            let mut s = s;
            s.push('.');
            if !p.excluded.is_empty() {
                let shown: Vec<&str> = p.excluded.iter().take(10).map(|e| e.id.as_str()).collect();
                let more = p.excluded.len() - shown.len();
                s.push_str(&format!(
                    " Left out of both plans (no amount to fund; reasons on the Retrofit plan): {}{}.",
                    shown.join(", "),
                    if more > 0 {
                        format!(" and {more} more")
                    } else {
                        String::new()
                    }
                ));
            }
            s
        }
        None => {
            let st = &report.settings;
            let costs = st.unit_cost_wall_m3.is_some()
                && st.unit_cost_floor_m2.is_some()
                && st.replacement_cost_m2.is_some();
            match (st.budget, costs) {
                (Some(_), false) => "A budget is set, but no funding plan can be made without \
                    all three unit costs (unit_cost_wall_m3, unit_cost_floor_m2, \
                    replacement_cost_m2)."
                    .into(),
                (Some(_), true) => "A budget is set, but no building has a retrofit cost.".into(),
                (None, _) => "No budget given: set `budget` (and the three unit costs) for a \
                    funding plan."
                    .into(),
            }
        }
    }
}

/// The block an official decides on: counts, people, costs, the two plans by their plain
/// names (`interface.md`: Plan A "in priority order" = the priority walk, Plan B "most people
/// protected" = the max-occupants plan).
fn decision_block(
    w: &mut Rows<'_>,
    report: &Screening,
    styles: &Styles,
) -> Result<(), ReportError> {
    w.section("For the decision", styles)?;
    let c = &report.counts;
    let (mut people, mut people_unknown, mut cost, mut cost_unknown) = (0u64, 0usize, 0.0, 0usize);
    for b in report.buildings.iter().filter(|b| b.class <= 2) {
        match b.occupants {
            Some(o) => people += o,
            None => people_unknown += 1,
        }
        match funding_cost(b).filter(|v| v.is_finite()) {
            Some(v) => cost += v,
            None => cost_unknown += 1,
        }
    }
    w.label_num(
        "Buildings screened",
        c.screened as f64,
        CellKind::Thousands,
        styles,
    )?;
    w.label_num(
        &format!("Class 1 {}", class_name(1)),
        c.by_class.c1 as f64,
        CellKind::Thousands,
        styles,
    )?;
    w.label_num(
        &format!("Class 2 {}", class_name(2)),
        c.by_class.c2 as f64,
        CellKind::Thousands,
        styles,
    )?;
    w.label_num(
        "People in class 1–2 buildings",
        people as f64,
        CellKind::Thousands,
        styles,
    )?;
    if people_unknown > 0 {
        w.label(
            "",
            &format!("(occupants not given for {people_unknown} of these buildings)"),
            styles,
        )?;
    }
    let st = &report.settings;
    let costs_set = st.unit_cost_wall_m3.is_some()
        && st.unit_cost_floor_m2.is_some()
        && st.replacement_cost_m2.is_some();
    let severe = c.by_class.c1 + c.by_class.c2;
    if !costs_set {
        w.label(
            "Cost to fix all class 1–2 buildings",
            "not computed (no unit costs set)",
            styles,
        )?;
    } else {
        w.label_num(
            "Cost to fix all class 1–2 buildings",
            cost,
            CellKind::Thousands,
            styles,
        )?;
        if cost_unknown > 0 {
            w.label(
                "",
                &format!(
                    "(not counting {cost_unknown} of the {severe} buildings without a cost: see \
                     the Retrofit plan sheet's notes)"
                ),
                styles,
            )?;
        }
    }
    match &report.budget_plan {
        Some(p) => {
            w.label_num("Budget", p.budget, CellKind::Thousands, styles)?;
            for (name, plan) in [
                ("Plan A: in priority order", &p.priority_walk),
                ("Plan B: most people protected", &p.max_occupants),
            ] {
                w.label(
                    name,
                    &format!(
                        "{} buildings, cost {}, {} people protected",
                        money(plan.funded.len() as f64),
                        money(plan.cost),
                        money(plan.occupants_protected as f64)
                    ),
                    styles,
                )?;
            }
            if severe > 0 && cost_unknown < severe {
                w.label_num(
                    "Gap (class 1–2 cost beyond budget)",
                    (cost - p.budget).max(0.0),
                    CellKind::Thousands,
                    styles,
                )?;
            }
            w.label(
                "Which buildings",
                "Retrofit plan and Priority sheets: columns funded by Plan A and by Plan B",
                styles,
            )?;
        }
        None => {
            w.label("Budget", &budget_line(report), styles)?;
        }
    }
    Ok(())
}

/// Writes the Summary sheet and inserts the charts.
pub fn write(
    ws: &mut Worksheet,
    report: &Screening,
    layout: &Layout,
    extra: &[(String, PathBuf)],
    styles: &Styles,
    now: &ExcelDateTime,
    charts: &ChartRanges,
) -> Result<(), ReportError> {
    for (c, w) in [46.0, 22.0, 28.0, 16.0, 26.0, 14.0, 16.0, 12.0]
        .iter()
        .enumerate()
    {
        ws.set_column_width(c as u16, *w)?;
    }
    let file = std::path::Path::new(&report.input.file)
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_default();
    super::style::page_setup(
        ws,
        "Summary",
        &file,
        super::style::Print {
            repeat_rows: None,
            repeat_cols: None,
            on_request: None,
        },
    )?;
    ws.write_string_with_format(0, 0, "Seismic screening results", &styles.title)?;
    ws.merge_range(1, 0, 3, 7, crate::CAUTION, &styles.caution)?;
    let mut w = Rows { ws, r: 4 };

    decision_block(&mut w, report, styles)?;
    // The tool parameters come last (written below, after the tables).

    w.section("Counts", styles)?;
    let c = &report.counts;
    w.label_num(
        "Rows in the buildings sheet",
        c.rows as f64,
        CellKind::Thousands,
        styles,
    )?;
    w.label_num(
        "Buildings screened",
        c.screened as f64,
        CellKind::Thousands,
        styles,
    )?;
    w.label_num(
        "Rows not screened (see Not screened)",
        c.not_screened as f64,
        CellKind::Thousands,
        styles,
    )?;
    w.label_num(
        "Blank rows skipped",
        c.blank_rows as f64,
        CellKind::Thousands,
        styles,
    )?;
    w.label_num(
        "Input problems (see Input problems)",
        report.problems.len() as f64,
        CellKind::Thousands,
        styles,
    )?;
    if !layout.csv.is_empty() {
        let mut note = String::new();
        if layout.streamed {
            note.push_str(&format!(
                "Large stock, screened in chunks to bound memory: the per-row tables are \
                 written as CSV files beside this workbook, and the Priority sheet here holds \
                 only the first {} rows. The Priority and Retrofit plan files are in rank \
                 order; the Directions, Walls and Flags files are in file order (the order of \
                 the inventory rows) with the rank column left empty: join them to Priority \
                 on the building id. The charts and per-district figures of this workbook are \
                 built from those first {} buildings in rank order; the counts above cover \
                 every row.",
                money(super::LARGE_PRIORITY_ROWS as f64),
                money(super::LARGE_PRIORITY_ROWS as f64)
            ));
        } else if layout.large() {
            note.push_str(&format!(
                "Large stock: the Directions sheet would pass the spreadsheet row limit \
                 ({} rows), so the per-row tables are written as CSV files beside this \
                 workbook, and the Priority sheet here holds only the first {} rows.",
                money(super::SHEET_ROWS as f64),
                money(super::LARGE_PRIORITY_ROWS as f64)
            ));
        } else {
            note.push_str(
                "Tables too long for a sheet are written as CSV files beside this workbook.",
            );
        }
        for (what, p) in extra {
            let name = p.file_name().map_or_else(
                || p.display().to_string(),
                |n| n.to_string_lossy().into_owned(),
            );
            note.push_str(&format!(" {what}: {name}."));
        }
        w.r += 1;
        w.ws.merge_range(w.r, 0, w.r + 2, 7, cut(&note), &styles.caution)?;
        w.r += 3;
    }

    w.section("Buildings per class", styles)?;
    w.header(&["Class", "Buildings", "Share of screened (%)"], styles)?;
    let by = [c.by_class.c1, c.by_class.c2, c.by_class.c3, c.by_class.c4];
    for (k, n) in by.iter().enumerate() {
        let class = (k + 1) as f64;
        w.ws.write_number_with_format(w.r, 0, class, styles.class_format(class))?;
        w.ws.write_number_with_format(w.r, 1, *n as f64, styles.kind(CellKind::Thousands))?;
        if c.screened > 0 {
            w.ws.write_number_with_format(
                w.r,
                2,
                100.0 * *n as f64 / c.screened as f64,
                styles.kind(CellKind::Dec2),
            )?;
        }
        w.r += 1;
    }

    w.section("The ten highest priorities", styles)?;
    w.header(
        &[
            "Rank",
            "Id",
            "Name",
            "District",
            "Class",
            "Score (governing DCR)",
            "Governing",
            "Occupants",
        ],
        styles,
    )?;
    for b in report.buildings.iter().take(10) {
        let r = w.r;
        w.ws.write_number_with_format(r, 0, b.rank as f64, &styles.int_left)?;
        w.ws.write_string(r, 1, cut(&b.id))?;
        w.ws.write_string(r, 2, cut(&b.name))?;
        w.ws.write_string(r, 3, cut(&b.district))?;
        let class = f64::from(b.class);
        w.ws.write_number_with_format(r, 4, class, styles.class_format(class))?;
        if b.score.is_finite() {
            w.ws.write_number_with_format(r, 5, b.score, styles.kind(CellKind::Dcr))?;
        }
        w.ws.write_string_with_format(
            r,
            6,
            format!(
                "{} {} {}",
                b.governing.direction.code(),
                match b.governing.group {
                    crate::results::Group::Walls => "walls",
                    crate::results::Group::Columns => "columns",
                },
                b.governing.level.code().to_uppercase()
            ),
            &styles.indent,
        )?;
        if let Some(o) = b.occupants {
            w.ws.write_number_with_format(r, 7, o as f64, styles.kind(CellKind::Thousands))?;
        }
        w.r += 1;
    }
    w.label(
        "Full list",
        &format!("see the {} sheet", TableId::Priority.sheet_name()),
        styles,
    )?;

    w.section("Flags raised", styles)?;
    w.header(&["Flag", "Buildings", "Of which class 1–2"], styles)?;
    let mut flags: BTreeMap<&str, (usize, usize)> = BTreeMap::new();
    for b in &report.buildings {
        for code in b.flag_codes() {
            let e = flags.entry(code).or_default();
            e.0 += 1;
            if b.class <= 2 {
                e.1 += 1;
            }
        }
    }
    let mut flags: Vec<(&str, (usize, usize))> = flags.into_iter().collect();
    flags.sort_by(|a, b| b.1.0.cmp(&a.1.0).then(a.0.cmp(b.0)));
    if flags.is_empty() {
        w.ws.write_string(w.r, 0, "(none)")?;
        w.r += 1;
    }
    for (code, (n, severe)) in flags {
        w.ws.write_string(w.r, 0, cut(code))?;
        w.ws.write_number_with_format(w.r, 1, n as f64, styles.kind(CellKind::Thousands))?;
        w.ws.write_number_with_format(w.r, 2, severe as f64, styles.kind(CellKind::Thousands))?;
        w.r += 1;
    }
    w.label("Reasons", "see the Flags sheet", styles)?;

    w.section("Budget plans", styles)?;
    let line = budget_line(report);
    w.ws.merge_range(w.r, 0, w.r + 1, 7, &line, &styles.wrap)?;
    w.r += 2;

    w.section("Buildings per district", styles)?;
    w.header(
        &[
            "District",
            "Buildings",
            &format!("Class 1 {}", class_name(1)),
            &format!("Class 2 {}", class_name(2)),
            &format!("Class 3 {}", class_name(3)),
            &format!("Class 4 {}", class_name(4)),
        ],
        styles,
    )?;
    let mut districts: BTreeMap<&str, [usize; 4]> = BTreeMap::new();
    for b in &report.buildings {
        let e = districts.entry(b.district.as_str()).or_default();
        if let Some(n) = e.get_mut(usize::from(b.class.clamp(1, 4) - 1)) {
            *n += 1;
        }
    }
    for (d, n) in &districts {
        let r = w.r;
        w.ws.write_string(
            r,
            0,
            if d.is_empty() {
                "(no district)"
            } else {
                cut(d)
            },
        )?;
        w.ws.write_number_with_format(
            r,
            1,
            n.iter().sum::<usize>() as f64,
            styles.kind(CellKind::Thousands),
        )?;
        for (k, v) in n.iter().enumerate() {
            w.ws.write_number_with_format(
                r,
                2 + k as u16,
                *v as f64,
                styles.kind(CellKind::Thousands),
            )?;
        }
        w.r += 1;
    }

    w.section("Tool parameters", styles)?;
    w.label("Inventory file", &report.input.file, styles)?;
    w.label("SHA-256 of the file", &report.input.sha256, styles)?;
    w.ws.write_string_with_format(w.r, 0, "Screened on", &styles.label)?;
    w.ws.write_datetime_with_format(w.r, 1, now, &styles.datetime)?;
    w.r += 1;
    w.label(
        "Tool",
        &format!("{} {}", report.tool, report.version),
        styles,
    )?;
    for (key, label) in HAZARD_KEYS {
        let v = report.settings.value_text(key).unwrap_or_default();
        let v = if v.is_empty() {
            "(not set: per building row or district)".to_string()
        } else if *key == "ranking_level" {
            v.to_uppercase()
        } else {
            v
        };
        w.label(&format!("{label} [{key}]"), &v, styles)?;
    }
    w.label(
        "All settings",
        "see the Assumptions sheet (every value with its source)",
        styles,
    )?;

    if let Some(m) = report
        .budget_plan
        .as_ref()
        .and_then(|p| p.max_occupants.method.as_ref())
    {
        w.label_wrapped("How Plan B is found", m, 3, styles)?;
    }
    w.label_wrapped(
        "The method",
        "docs/method.md (shipped with seistriage): what each step computes, its source, its \
         limits; `seistriage explain INVENTORY ID` shows every number for one building",
        2,
        styles,
    )?;

    // A Summary of ordinary length prints on one page (a long district list runs on).
    if w.r <= SUMMARY_ONE_PAGE_ROWS {
        w.ws.set_print_fit_to_pages(1, 1);
    }

    // Charts to the right of the tables.
    let mut at = 1u32;
    if let Some(ch) = scatter_chart(charts) {
        w.ws.insert_chart(at, 9, &ch)?;
        at += 21;
    }
    if let Some(ch) = bar_chart(report, charts) {
        w.ws.insert_chart(at, 9, &ch)?;
        at += 35;
    }
    if let Some(ch) = cost_chart(charts) {
        w.ws.insert_chart(at, 9, &ch)?;
    }
    Ok(())
}
