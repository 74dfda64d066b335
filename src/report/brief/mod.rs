/*!
The officials' brief (`screen --brief FILE.html`): one self-contained HTML page (inline CSS
and SVG, no script, no network) that a mayor's office or a ministry directorate can read in
five minutes and print (A4 or Letter; print stylesheet, a page per major section; readable
in greyscale: every class is told by shape, shade and words).

A sink fed from the same [`Screening`] as the other writers, plus the map layers (district
polygons and fault traces, when given) and, with `--previous`, the comparison with an
earlier run. Contents, in the order of issue 16:
1. the screening caution, the date, the inventory and its checksum (small print);
2. three to five plain sentences (screened, deficits and their people, cost to fix them,
   what the budget funds, the gap);
3. the map ([`map`]);
4. the two budget plans side by side under their plain names — "Plan A: in priority
   order" (JSON `priority_walk`) and "Plan B: most people protected" (JSON
   `max_occupants`) — and one sentence on why they differ;
5. per district: buildings, counts per class, people in class 1–2 buildings, cost to fix
   them;
6. the 20 highest priorities ([`TOP_COLUMNS`]: one entry per column, so a column such as
   the probability of a deficit is one more entry);
7. with `--previous`, what changed;
8. what the numbers rest on.

Numbers are people-facing: 4 significant digits ([`crate::report::people`]); counts are
exact; a number that could not be computed is said in words, never "null".
*/

pub mod html;
pub mod map;

use std::collections::{BTreeMap, HashMap};
use std::fmt::Write as _;
use std::path::Path;

use super::ReportError;
use super::atomic::write_atomic;
use super::changes::{ChangeKind, Changes};
use super::people::{count, sig4_grouped};
use super::workbook::tables::{class_name, funding_cost};
use crate::results::{BuildingResult, Screening};
use html::esc;
pub use map::MapLayers;

/// Plain name of the priority walk (JSON `budget_plan.priority_walk`).
pub const PLAN_A: &str = "Plan A: in priority order";
/// Plain name of the max-occupants plan (JSON `budget_plan.max_occupants`).
pub const PLAN_B: &str = "Plan B: most people protected";
/// Buildings in the priority table.
pub const TOP: usize = 20;
/// Most buildings listed under each plan (the rest are counted).
pub const PLAN_LISTED: usize = 25;
/// Most rows listed per kind of change.
pub const CHANGES_LISTED: usize = 30;

/// Everything the brief is made of.
#[derive(Debug, Clone, Copy)]
pub struct Brief<'a> {
    /// The screening run.
    pub report: &'a Screening,
    /// District polygons and fault traces (`None`: none given).
    pub layers: Option<&'a MapLayers>,
    /// Comparison with a previous run (`--previous`).
    pub changes: Option<&'a Changes>,
    /// File name of the results workbook, for the pointers to its sheets.
    pub workbook: Option<&'a str>,
    /// When the brief was made (Unix seconds).
    pub made_at: i64,
}

/// Whether `screen` writes a brief by default: the stock has coordinates or a budget plan.
pub fn wanted_by_default(report: &Screening) -> bool {
    report.budget_plan.is_some()
        || report
            .buildings
            .iter()
            .any(|b| map::coordinates(b.latitude, b.longitude).is_some())
}

/// Writes the brief to `path` (temporary file, renamed when complete).
pub fn write(brief: &Brief<'_>, path: &Path) -> Result<(), ReportError> {
    let text = render(brief);
    write_atomic(path, |w| {
        use std::io::Write as _;
        w.write_all(text.as_bytes())?;
        Ok(())
    })
}

/// A money amount (4 significant digits, thousands separators).
fn money(v: f64) -> String {
    sig4_grouped(v).unwrap_or_else(|| "not computed".into())
}

fn plural(n: usize, one: &str, many: &str) -> String {
    if n == 1 {
        format!("1 {one}")
    } else {
        format!("{} {many}", count(n as u64))
    }
}

/// Flag codes in words, for officials (the codes of method §10 and their reasons stay on
/// the workbook's Flags sheet).
pub fn flag_words(code: &str) -> String {
    match code {
        "soft-storey" => "soft storey".into(),
        "soft-storey-extreme" => "extremely soft storey".into(),
        "weak-storey" => "weak storey".into(),
        "wall-discontinued" => "walls stop above the ground storey".into(),
        "boundary-missing" => "wall ends not confined".into(),
        "boundary-unknown" => "wall end confinement unknown".into(),
        "boundary-needed" => "walls need confined ends".into(),
        "high-axial-wall" => "walls heavily loaded".into(),
        "high-axial-column" => "columns heavily loaded".into(),
        "slender-wall" => "slender walls".into(),
        "squat-wall" => "squat walls".into(),
        "short-column" => "short (captive) columns".into(),
        "outside-calibration" => "outside the method's range".into(),
        "near-fault" => "near a fault".into(),
        "period-range" => "period outside the formulas' range".into(),
        "low-priority-index" => "few walls and columns".into(),
        "defaults-used" => "survey values missing (defaults used)".into(),
        other => other.replace('-', " "),
    }
}

/// Optional inventory inputs in words (the canonical names of `defaults_used`).
fn input_words(key: &str) -> String {
    match key {
        "use" => "use".into(),
        "storey_height_m" => "storey height".into(),
        "ground_storey_height_m" => "ground-storey height".into(),
        "column_depth_m" => "column depth".into(),
        "wall_length_x_m" | "wall_length_y_m" => "wall length".into(),
        "wall_thickness_m" => "wall thickness".into(),
        "boundary_elements" => "confined wall ends".into(),
        "fc_mpa" => "concrete strength".into(),
        "fy_mpa" => "steel strength".into(),
        "floor_weight_kpa" => "floor weight".into(),
        "ground_type" => "ground type".into(),
        "rc_wall_area_x_m2" | "rc_wall_area_y_m2" => "RC wall area".into(),
        other => esc(&other.replace('_', " ")),
    }
}

/// Figures of the class 1–2 buildings (or of any subset).
#[derive(Debug, Default, Clone, Copy)]
struct Severe {
    buildings: usize,
    people: u64,
    people_unknown: usize,
    cost: f64,
    cost_unknown: usize,
}

impl Severe {
    fn add(&mut self, b: &BuildingResult) {
        if b.class > 2 {
            return;
        }
        self.buildings += 1;
        match b.occupants {
            Some(o) => self.people += o,
            None => self.people_unknown += 1,
        }
        match funding_cost(b).filter(|c| c.is_finite()) {
            Some(c) => self.cost += c,
            None => self.cost_unknown += 1,
        }
    }
}

/// Renders the whole page.
pub fn render(brief: &Brief<'_>) -> String {
    let r = brief.report;
    let file = Path::new(&r.input.file).file_name().map_or_else(
        || r.input.file.clone(),
        |n| n.to_string_lossy().into_owned(),
    );
    let mut o = String::with_capacity(64 * 1024);
    let _ = write!(
        o,
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n\
         <meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n\
         <title>Seismic screening brief: {}</title>\n<style>{}</style>\n</head>\n<body>\n",
        esc(&file),
        html::CSS
    );
    // 1. Caution, date, inventory.
    let _ = write!(
        o,
        "<header>\n<p class=\"caution\" id=\"caution\">{}</p>\n<p class=\"meta\">Screened on {} \
         with seistriage {} · inventory <b>{}</b> · SHA-256 {}</p>\n</header>\n",
        esc(crate::CAUTION),
        html::date_utc(brief.made_at),
        esc(r.version),
        esc(&r.input.file),
        esc(&r.input.sha256)
    );
    // 2. Plain sentences.
    o.push_str("<section id=\"summary\" class=\"lead\">\n<h1>Seismic screening brief</h1>\n");
    for s in sentences(r) {
        let _ = writeln!(o, "<p>{s}</p>");
    }
    o.push_str("</section>\n");
    map_section(&mut o, brief);
    plans_section(&mut o, r);
    districts_section(&mut o, r);
    top_section(&mut o, r);
    if let Some(c) = brief.changes {
        changes_section(&mut o, c);
    }
    basis_section(&mut o, brief);
    o.push_str("</body>\n</html>\n");
    o
}

/// The three to five sentences of the summary (HTML, escaped).
fn sentences(r: &Screening) -> Vec<String> {
    let mut out = Vec::new();
    let c = &r.counts;
    let mut first = format!(
        "{} {} screened",
        plural(c.screened, "building", "buildings"),
        if c.screened == 1 { "was" } else { "were" }
    );
    if c.not_screened > 0 {
        let _ = write!(
            first,
            "; {} of the inventory could not be screened (reasons on the workbook's Not \
             screened sheet)",
            plural(c.not_screened, "row", "rows")
        );
    }
    first.push('.');
    out.push(first);
    let mut sev = Severe::default();
    for b in &r.buildings {
        sev.add(b);
    }
    let (n1, n2) = (c.by_class.c1, c.by_class.c2);
    if sev.buildings == 0 {
        out.push(
            "None shows a collapse-level or life-safety deficit at the screening's demand.".into(),
        );
    } else {
        let mut s = format!(
            "{} {} a collapse-level deficit (class 1) and {} a life-safety deficit \
             (class 2); {} used by {} people",
            count(n1 as u64),
            if n1 == 1 { "shows" } else { "show" },
            count(n2 as u64),
            if sev.buildings == 1 {
                "it is"
            } else {
                "together they are"
            },
            count(sev.people)
        );
        if sev.people_unknown > 0 {
            let _ = write!(
                s,
                " (occupants not given for {} of them)",
                count(sev.people_unknown as u64)
            );
        }
        s.push('.');
        out.push(s);
        let costs_set = r.settings.unit_cost_wall_m3.is_some()
            && r.settings.unit_cost_floor_m2.is_some()
            && r.settings.replacement_cost_m2.is_some();
        if !costs_set {
            out.push(
                "What fixing them would cost is not computed: the unit costs \
                 (unit_cost_wall_m3, unit_cost_floor_m2, replacement_cost_m2) are not set."
                    .into(),
            );
        } else {
            let mut s = format!(
                "Fixing all of them (retrofit, or replacement where retrofit costs more than \
                 {} of replacement) would cost about {}",
                pct(r.settings.replace_ratio),
                money(sev.cost)
            );
            if sev.cost_unknown > 0 {
                let _ = write!(
                    s,
                    ", not counting {} without a cost (no wall solution within the cap, or a \
                     captive-column remedy without its unit cost)",
                    plural(sev.cost_unknown, "building", "buildings")
                );
            }
            s.push('.');
            out.push(s);
        }
    }
    match &r.budget_plan {
        Some(p) => {
            let a = &p.priority_walk;
            let b = &p.max_occupants;
            out.push(format!(
                "The budget of {} funds {} under {} ({} people protected in class 1–2 \
                 buildings), or {} under {} ({} people protected).",
                money(p.budget),
                plural(a.funded.len(), "building", "buildings"),
                esc(PLAN_A),
                count(a.occupants_protected),
                plural(b.funded.len(), "building", "buildings"),
                esc(PLAN_B),
                count(b.occupants_protected)
            ));
            if sev.buildings > 0 && sev.cost_unknown < sev.buildings {
                let gap = sev.cost - p.budget;
                out.push(if gap > 0.0 {
                    format!(
                        "Fixing every class 1–2 building would need about {} more than the \
                         budget.",
                        money(gap)
                    )
                } else {
                    "The budget covers the cost of fixing every class 1–2 building that has a \
                     cost."
                        .to_string()
                });
            }
        }
        None => out.push(esc(&super::workbook::budget_line(r))),
    }
    out
}

fn pct(ratio: f64) -> String {
    super::people::sig4(ratio * 100.0).map_or_else(|| "a set share".into(), |s| format!("{s} %"))
}

fn map_section(o: &mut String, brief: &Brief<'_>) {
    let r = brief.report;
    o.push_str("<section id=\"map\" class=\"keep\">\n<h2>Where the buildings are</h2>\n");
    let located = r
        .buildings
        .iter()
        .filter(|b| map::coordinates(b.latitude, b.longitude).is_some())
        .count();
    match map::svg(r, brief.layers) {
        Some(svg) => {
            o.push_str("<div class=\"map-wrap\">");
            o.push_str(&svg);
            o.push_str("</div>\n<div class=\"legend\">");
            let by = [
                r.counts.by_class.c1,
                r.counts.by_class.c2,
                r.counts.by_class.c3,
                r.counts.by_class.c4,
            ];
            for (k, n) in by.iter().enumerate() {
                let class = (k + 1) as u8;
                let _ = write!(
                    o,
                    "<span>{}class {} {} ({})</span>",
                    map::symbol_icon(class),
                    class,
                    class_name(class),
                    count(*n as u64)
                );
            }
            o.push_str(
                "<span><svg class=\"icon\" width=\"26\" height=\"10\" aria-hidden=\"true\">\
                 <path d=\"M1 5H25\" stroke=\"#222\" stroke-width=\"2.4\" stroke-dasharray=\"10 4 2 4\"/></svg>fault trace</span>\
                 <span><b>7</b> rank (the ten highest priorities)</span></div>\n",
            );
            let _ = writeln!(
                o,
                "<p class=\"note\">{} of {} buildings have coordinates and are drawn; local \
                 equirectangular projection, north up.{}</p>",
                count(located as u64),
                count(r.buildings.len() as u64),
                if brief.layers.is_none_or(|l| l.districts.is_empty()) {
                    " No district polygons were given (--districts)."
                } else {
                    ""
                }
            );
        }
        None => o.push_str(
            "<p>No building has coordinates (latitude and longitude), so no map can be drawn. \
             Add them to the inventory to see the buildings on a map.</p>\n",
        ),
    }
    o.push_str("</section>\n");
}

fn yes(b: bool) -> &'static str {
    if b {
        "<span class=\"yes\">yes</span>"
    } else {
        "no"
    }
}

fn plans_section(o: &mut String, r: &Screening) {
    o.push_str("<section id=\"plans\" class=\"page\">\n<h2>What the budget buys</h2>\n");
    let Some(p) = &r.budget_plan else {
        let _ = writeln!(o, "<p>{}</p>", esc(&super::workbook::budget_line(r)));
        o.push_str("</section>\n");
        return;
    };
    let by_id: HashMap<&str, &BuildingResult> =
        r.buildings.iter().map(|b| (b.id.as_str(), b)).collect();
    let _ = writeln!(
        o,
        "<p>Budget: <b>{}</b>. Both plans spend at most this amount on the buildings that need \
         a retrofit; each building costs its retrofit, or its replacement where that is \
         recommended.</p>",
        money(p.budget)
    );
    o.push_str("<div class=\"plans\">\n");
    for (name, plan, how) in [
        (
            PLAN_A,
            &p.priority_walk,
            "Goes down the priority list and funds each building whose cost still fits.",
        ),
        (
            PLAN_B,
            &p.max_occupants,
            "Chooses, among the class 1–2 buildings, the set that protects the most people \
             within the budget.",
        ),
    ] {
        let _ = write!(
            o,
            "<div class=\"plan\"><h3>{}</h3><p class=\"note\">{}</p>\
             <p class=\"figures\"><b>{}</b> · cost <b>{}</b> · <b>{}</b> people protected</p>\
             <table><thead><tr><th class=\"n\">Rank</th><th>Building</th><th>Class</th>\
             <th class=\"n\">Cost</th><th class=\"n\">People</th></tr></thead><tbody>",
            esc(name),
            how,
            plural(plan.funded.len(), "building", "buildings"),
            money(plan.cost),
            count(plan.occupants_protected)
        );
        for id in plan.funded.iter().take(PLAN_LISTED) {
            let Some(b) = by_id.get(id.as_str()) else {
                continue;
            };
            let _ = write!(
                o,
                "<tr><td class=\"n\">{}</td><td>{} <span class=\"note\">{}</span></td>\
                 <td class=\"c\">{}{}</td><td class=\"n\">{}</td><td class=\"n\">{}</td></tr>",
                b.rank,
                esc(&b.name),
                esc(&b.id),
                map::symbol_icon(b.class),
                b.class,
                funding_cost(b).map_or_else(|| "—".into(), money),
                b.occupants.map_or_else(|| "not given".into(), count)
            );
        }
        if plan.funded.len() > PLAN_LISTED {
            let _ = write!(
                o,
                "<tr><td colspan=\"5\">… and {} more (Retrofit plan sheet of the workbook)</td></tr>",
                count((plan.funded.len() - PLAN_LISTED) as u64)
            );
        }
        if plan.funded.is_empty() {
            o.push_str("<tr><td colspan=\"5\">No building fits the budget.</td></tr>");
        }
        o.push_str("</tbody></table></div>\n");
    }
    o.push_str("</div>\n");
    let _ = writeln!(o, "<p>{}</p>", why_plans_differ(r));
    if !p.excluded.is_empty() {
        let listed: Vec<String> = p
            .excluded
            .iter()
            .take(PLAN_LISTED)
            .map(|e| {
                let name = by_id.get(e.id.as_str()).map_or("", |b| b.name.as_str());
                format!("{} {} ({})", esc(name), esc(&e.id), esc(&e.reason))
            })
            .collect();
        let more = p.excluded.len().saturating_sub(PLAN_LISTED);
        let _ = writeln!(
            o,
            "<p>Left out of both plans, with no amount to fund: {}{}.</p>",
            listed.join("; "),
            if more > 0 {
                format!("; and {} more (Retrofit plan sheet)", count(more as u64))
            } else {
                String::new()
            }
        );
    }
    o.push_str("</section>\n");
}

/// One sentence on why the two plans differ (HTML, escaped).
fn why_plans_differ(r: &Screening) -> String {
    let Some(p) = &r.budget_plan else {
        return String::new();
    };
    let a = &p.priority_walk;
    let b = &p.max_occupants;
    let in_a: std::collections::HashSet<&String> = a.funded.iter().collect();
    let in_b: std::collections::HashSet<&String> = b.funded.iter().collect();
    let only_a: Vec<&String> = a.funded.iter().filter(|id| !in_b.contains(id)).collect();
    let only_b: Vec<&String> = b.funded.iter().filter(|id| !in_a.contains(id)).collect();
    if only_a.is_empty() && only_b.is_empty() {
        return "The two plans fund the same buildings: here, following the priority order \
                also protects the most people."
            .into();
    }
    let rank_of: HashMap<&str, usize> = r
        .buildings
        .iter()
        .map(|b| (b.id.as_str(), b.rank))
        .collect();
    let ranks = |ids: &[&String]| {
        let mut v: Vec<usize> = ids
            .iter()
            .filter_map(|id| rank_of.get(id.as_str()).copied())
            .collect();
        v.sort_unstable();
        let shown: Vec<String> = v.iter().take(6).map(|r| r.to_string()).collect();
        let more = if v.len() > 6 { ", …" } else { "" };
        format!("{}{more}", shown.join(", "))
    };
    let more_people = b.occupants_protected.saturating_sub(a.occupants_protected);
    format!(
        "They differ because Plan A spends the budget on the most severe buildings first, \
         however few people use them, while Plan B buys protection for the most people: Plan B \
         protects {} more people but leaves out {} that Plan A funds (rank {}) and funds {} \
         further down the list instead (rank {}). Which to follow is a policy choice.",
        count(more_people),
        plural(only_a.len(), "building", "buildings"),
        ranks(&only_a),
        plural(only_b.len(), "building", "buildings"),
        ranks(&only_b)
    )
}

fn districts_section(o: &mut String, r: &Screening) {
    o.push_str(
        "<section id=\"districts\" class=\"keep\">\n<h2>Per district</h2>\n<table>\
         <thead><tr><th>District</th><th class=\"n\">Buildings</th>",
    );
    for class in 1..=4u8 {
        let _ = write!(
            o,
            "<th class=\"n\">{}Class {}</th>",
            map::symbol_icon(class),
            class,
        );
    }
    o.push_str(
        "<th class=\"n\">People in class 1–2</th><th class=\"n\">Cost to fix class 1–2\
         </th></tr></thead><tbody>\n",
    );
    let mut d: BTreeMap<&str, ([usize; 4], Severe)> = BTreeMap::new();
    for b in &r.buildings {
        let e = d.entry(b.district.as_str()).or_default();
        if let Some(n) = e.0.get_mut(usize::from(b.class.clamp(1, 4) - 1)) {
            *n += 1;
        }
        e.1.add(b);
    }
    let costs_set = r.settings.unit_cost_wall_m3.is_some()
        && r.settings.unit_cost_floor_m2.is_some()
        && r.settings.replacement_cost_m2.is_some();
    for (name, (n, sev)) in &d {
        let _ = write!(
            o,
            "<tr><td>{}</td><td class=\"n\">{}</td>",
            if name.is_empty() {
                "(no district)".to_string()
            } else {
                esc(name)
            },
            count(n.iter().sum::<usize>() as u64)
        );
        for k in n {
            let _ = write!(o, "<td class=\"n\">{}</td>", count(*k as u64));
        }
        let people = if sev.people_unknown > 0 {
            format!(
                "{} <span class=\"note\">(+{} not given)</span>",
                count(sev.people),
                sev.people_unknown
            )
        } else {
            count(sev.people)
        };
        let cost = if sev.buildings == 0 {
            "0".to_string()
        } else if !costs_set {
            "not computed (no unit costs)".into()
        } else if sev.cost_unknown > 0 {
            format!(
                "{} <span class=\"note\">(+{} without a cost)</span>",
                money(sev.cost),
                sev.cost_unknown
            )
        } else {
            money(sev.cost)
        };
        let _ = writeln!(
            o,
            "<td class=\"n\">{people}</td><td class=\"n\">{cost}</td></tr>"
        );
    }
    o.push_str("</tbody></table>\n");
    o.push_str(&class_key());
    o.push_str("</section>\n");
}

/// The class key under a table: symbol, number and name of each class.
fn class_key() -> String {
    let mut k = String::from("<p class=\"legend\">");
    for class in 1..=4u8 {
        let _ = write!(
            k,
            "<span>{}class {} {}</span>",
            map::symbol_icon(class),
            class,
            class_name(class)
        );
    }
    k.push_str("</p>\n");
    k
}

/// One column of the priority table: header and cell (HTML, escaped), right-aligned or not.
pub struct TopColumn {
    /// Header.
    pub header: &'static str,
    /// Numeric (right-aligned).
    pub numeric: bool,
    /// Share of the table width (%), 0 = automatic.
    pub width: u8,
    /// Whether the column applies to a run (e.g. only with `--samples`).
    pub shown: fn(&Screening) -> bool,
    /// The cell of one building.
    pub cell: fn(&BuildingResult, &Screening) -> String,
}

fn plan_cell(b: &BuildingResult, r: &Screening, best: bool) -> String {
    if r.budget_plan.is_none() {
        return "no plan".into();
    }
    let f = b
        .retrofit
        .as_ref()
        .and_then(|rf| if best { rf.funded_best } else { rf.funded });
    match f {
        Some(v) => yes(v).into(),
        None if b.retrofit.is_none() => "not needed".into(),
        None => "no".into(),
    }
}

/// The columns of the priority table, in order.
pub const TOP_COLUMNS: &[TopColumn] = &[
    TopColumn {
        header: "Rank",
        shown: |_| true,
        width: 0,
        numeric: true,
        cell: |b, _| b.rank.to_string(),
    },
    TopColumn {
        header: "Building",
        shown: |_| true,
        width: 24,
        numeric: false,
        cell: |b, _| {
            format!(
                "{}<br><span class=\"note\">{} · {} · {}</span>",
                esc(&b.name),
                esc(&b.id),
                if b.district.is_empty() {
                    "no district".to_string()
                } else {
                    esc(&b.district)
                },
                esc(b.use_.code())
            )
        },
    },
    TopColumn {
        header: "Class",
        shown: |_| true,
        width: 0,
        numeric: false,
        cell: |b, _| format!("{}{}", map::symbol_icon(b.class), b.class),
    },
    TopColumn {
        header: "Score",
        shown: |_| true,
        width: 0,
        numeric: true,
        cell: |b, _| super::people::sig4(b.score).unwrap_or_else(|| "not computed".into()),
    },
    TopColumn {
        header: "People",
        shown: |_| true,
        width: 0,
        numeric: true,
        cell: |b, _| b.occupants.map_or_else(|| "not given".into(), count),
    },
    TopColumn {
        header: "Warning signs",
        shown: |_| true,
        width: 34,
        numeric: false,
        cell: |b, _| {
            let words: Vec<String> = b.flag_codes().iter().map(|c| esc(&flag_words(c))).collect();
            if words.is_empty() {
                "none".into()
            } else {
                words.join("; ")
            }
        },
    },
    TopColumn {
        header: "Cost",
        shown: |_| true,
        width: 12,
        numeric: true,
        cell: |b, r| match &b.retrofit {
            None => "not needed".into(),
            Some(rf) => match funding_cost(b) {
                Some(c) if c.is_finite() => {
                    let m = money(c);
                    if rf.replace == Some(true) {
                        format!("{m} <span class=\"note\">(replace)</span>")
                    } else {
                        m
                    }
                }
                _ if rf.excluded.is_some() => {
                    format!(
                        "not computed <span class=\"note\">({})</span>",
                        esc(rf.excluded.as_deref().unwrap_or(""))
                    )
                }
                _ if r.settings.unit_cost_wall_m3.is_none()
                    || r.settings.unit_cost_floor_m2.is_none()
                    || r.settings.replacement_cost_m2.is_none() =>
                {
                    "not computed (no unit costs)".into()
                }
                _ => "not computed (no wall solution)".into(),
            },
        },
    },
    TopColumn {
        header: "Chance of a deficit",
        shown: |r| r.uncertainty.is_some(),
        width: 0,
        numeric: true,
        cell: |b, _| {
            b.uncertainty
                .as_ref()
                .and_then(|u| super::people::sig4(100.0 * u.p_deficit))
                .map_or_else(|| "not computed".into(), |p| format!("{p} %"))
        },
    },
    TopColumn {
        header: "Plan A",
        shown: |_| true,
        width: 0,
        numeric: false,
        cell: |b, r| plan_cell(b, r, false),
    },
    TopColumn {
        header: "Plan B",
        shown: |_| true,
        width: 0,
        numeric: false,
        cell: |b, r| plan_cell(b, r, true),
    },
];

fn top_section(o: &mut String, r: &Screening) {
    let _ = write!(
        o,
        "<section id=\"top\" class=\"page\">\n<h2>The {} highest priorities</h2>\n<table><thead><tr>",
        TOP.min(r.buildings.len())
    );
    let columns: Vec<&TopColumn> = TOP_COLUMNS.iter().filter(|c| (c.shown)(r)).collect();
    for c in &columns {
        let _ = write!(
            o,
            "<th{}{}>{}</th>",
            if c.numeric { " class=\"n\"" } else { "" },
            if c.width > 0 {
                format!(" style=\"width:{}%\"", c.width)
            } else {
                String::new()
            },
            c.header
        );
    }
    o.push_str("</tr></thead><tbody>\n");
    for b in r.buildings.iter().take(TOP) {
        o.push_str("<tr>");
        for c in &columns {
            let _ = write!(
                o,
                "<td{}>{}</td>",
                if c.numeric { " class=\"n\"" } else { "" },
                (c.cell)(b, r)
            );
        }
        o.push_str("</tr>\n");
    }
    o.push_str("</tbody></table>\n");
    o.push_str(&class_key());
    if let Some(u) = &r.uncertainty {
        let names: HashMap<&str, &BuildingResult> =
            r.buildings.iter().map(|b| (b.id.as_str(), b)).collect();
        let list: Vec<String> = u
            .survey_next
            .iter()
            .map(|id| match names.get(id.as_str()) {
                Some(b) => format!("{} {} (rank {})", esc(&b.name), esc(id), b.rank),
                None => esc(id),
            })
            .collect();
        let _ = writeln!(
            o,
            "<p><b>Survey next</b> (many people, and a deficit that hangs on uncertain inputs; \
             {} samples): {}.</p><p class=\"note\">Chance of a deficit: the share of the \
             samples in which the building is in class 1 or 2 (docs/method.md §13).</p>",
            count(u.samples as u64),
            if list.is_empty() {
                "none".to_string()
            } else {
                list.join("; ")
            }
        );
    }
    let _ = writeln!(
        o,
        "<p class=\"note\">Score: the largest ratio of drift demand to drift \
         capacity at the {} level; above 1 the building is expected to pass that level in the \
         design earthquake. The full list is the Priority sheet of the workbook.</p>",
        match r.settings.ranking_level {
            crate::settings::Level::Io => "Immediate Occupancy",
            crate::settings::Level::Ls => "Life Safety",
            crate::settings::Level::Cp => "Collapse Prevention",
        }
    );
    o.push_str("</section>\n");
}

fn changes_section(o: &mut String, c: &Changes) {
    let prev = &c.previous;
    let _ = write!(
        o,
        "<section id=\"changes\" class=\"page\">\n<h2>What changed since the previous run</h2>\n\
         <p>Compared with <b>{}</b>{}: {} screened in both runs; {} changed class, {} moved \
         more than {} places in rank, {} new, {} no longer screened, {} changed plan \
         membership.</p>\n",
        esc(&prev.file),
        if prev.input_sha256.is_empty() {
            String::new()
        } else {
            format!(
                " (inventory {}, SHA-256 {}…)",
                esc(&prev.input_file),
                esc(prev.input_sha256.get(..12).unwrap_or(""))
            )
        },
        plural(c.in_both, "building", "buildings"),
        count(c.count(ChangeKind::Class) as u64),
        count(c.count(ChangeKind::Rank) as u64),
        c.rank_threshold,
        count(c.count(ChangeKind::New) as u64),
        count(c.count(ChangeKind::Gone) as u64),
        count(c.count(ChangeKind::Plan) as u64),
    );
    if c.rows.is_empty() {
        o.push_str("<p>Nothing changed that the comparison lists.</p>\n</section>\n");
        return;
    }
    o.push_str(
        "<table><thead><tr><th>Change</th><th>Building</th><th>What</th></tr></thead><tbody>\n",
    );
    for kind in [
        ChangeKind::Class,
        ChangeKind::Rank,
        ChangeKind::New,
        ChangeKind::Gone,
        ChangeKind::Plan,
    ] {
        let n = c.count(kind);
        for ch in c.of_kind(kind).take(CHANGES_LISTED) {
            let _ = writeln!(
                o,
                "<tr><td>{}</td><td>{} <span class=\"note\">{}</span></td><td>{}</td></tr>",
                kind.words(),
                esc(&ch.name),
                esc(&ch.id),
                esc(&ch.what)
            );
        }
        if n > CHANGES_LISTED {
            let _ = writeln!(
                o,
                "<tr><td>{}</td><td colspan=\"2\">… and {} more (Changes sheet of the workbook)</td></tr>",
                kind.words(),
                count((n - CHANGES_LISTED) as u64)
            );
        }
    }
    o.push_str(
        "</tbody></table>\n<p class=\"note\">Changes come from new survey values, edits to \
         the inventory or changed settings; the Assumptions sheets of the two workbooks show \
         the settings of each run.</p>\n</section>\n",
    );
}

fn basis_section(o: &mut String, brief: &Brief<'_>) {
    let r = brief.report;
    let s = &r.settings;
    let wb = brief.workbook.map_or_else(
        || "the results workbook".to_string(),
        |w| format!("the workbook {}", esc(w)),
    );
    let hazard = match s.agr_g {
        Some(a) => format!(
            "reference peak ground acceleration on rock {} g",
            super::people::sig4(a).unwrap_or_default()
        ),
        None => "peak ground acceleration from each building's row or district".into(),
    };
    let spectrum = s.value_text("spectrum").unwrap_or_default();
    let mut defaults: BTreeMap<&str, usize> = BTreeMap::new();
    for b in &r.buildings {
        for k in &b.defaults_used {
            *defaults.entry(k.as_str()).or_default() += 1;
        }
    }
    let mut defaults: Vec<(&str, usize)> = defaults.into_iter().collect();
    defaults.sort_by(|a, b| b.1.cmp(&a.1).then(a.0.cmp(b.0)));
    let defaults_text = if defaults.is_empty() {
        "none: every optional survey value was given".to_string()
    } else {
        defaults
            .iter()
            .take(5)
            .map(|(k, n)| {
                let v = s
                    .value_text(&format!("default_{k}"))
                    .or_else(|| s.value_text(k))
                    .filter(|v| !v.is_empty())
                    .map_or_else(String::new, |v| format!(" = {}", esc(&v)));
                format!(
                    "{} <span class=\"note\">({})</span>{v} (for {} of {})",
                    input_words(k),
                    esc(k),
                    count(*n as u64),
                    count(r.buildings.len() as u64)
                )
            })
            .collect::<Vec<_>>()
            .join("; ")
    };
    let _ = write!(
        o,
        "<section id=\"basis\" class=\"page\">\n<h2>What the numbers rest on</h2>\n<div class=\"box\"><ul>\n\
         <li><b>Hazard:</b> {hazard}; {} spectrum; default ground \
         type {}; damping {} %; importance factors by use (schools {}, hospitals {}).</li>\n\
         <li><b>Method:</b> wall and column indices of Hassan and Sozen (1997); period and \
         elastic spectrum of EN 1998-1 (§4.3.3.2.2, §3.2.2); drift demand by the N2 method \
         (Fajfar 2000; EN 1998-1 Annex B); drift capacity of walls and columns as chord \
         rotations of EN 1998-3 Annex A{}; classes from the ratio of demand to capacity at \
         Immediate Occupancy, Life Safety and Collapse Prevention; retrofit sized as added RC \
         walls.</li>\n\
         <li><b>Defaults most used</b> (survey values that were blank): {defaults_text}.</li>\n\
         <li><b>Not assessed:</b> shear failure, lap splices, foundations, non-structural \
         elements; the period formulas tend to give short periods.</li>\n\
         <li><b>Full assumptions:</b> every setting with its source is on the Assumptions sheet \
         of {wb}; the method step by step is in docs/method.md, shipped with seistriage; \
         <code>seistriage explain INVENTORY ID</code> shows every number for one building.</li>\n\
         </ul></div>\n<p class=\"caution\">{}</p>\n</section>\n",
        esc(&spectrum),
        esc(&s.value_text("default_ground_type").unwrap_or_default()),
        esc(&s.value_text("damping_pct").unwrap_or_default()),
        esc(&s.value_text("gamma_i_school").unwrap_or_default()),
        esc(&s.value_text("gamma_i_hospital").unwrap_or_default()),
        match s.value_text("capacity_model").as_deref() {
            Some("asce41") => " (walls: ASCE 41-17 Table 10-19 as chosen)",
            Some("lower-of-both") => " (walls: the lower of it and ASCE 41-17 Table 10-19)",
            _ => "",
        },
        esc(crate::CAUTION)
    );
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn flag_words_cover_unknown_codes() {
        assert_eq!(flag_words("soft-storey"), "soft storey");
        assert_eq!(flag_words("some-new-code"), "some new code");
    }
}
