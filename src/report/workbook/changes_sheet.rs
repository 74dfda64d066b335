/*!
The `Changes` sheet (`screen --previous OLD.json`): one row per change — class changes, rank
moves of more than `changes_rank_threshold` places, buildings new or gone, plan membership
changed — with the values before and now. Two lines above the table say what was compared.
*/

use rust_xlsxwriter::Worksheet;

use super::style::{self, Print, Styles};
use super::tables::CellKind;
use super::{ReportError, cut};
use crate::report::changes::Changes;
use crate::results::Screening;

/// Column headers and widths.
const COLUMNS: &[(&str, f64)] = &[
    ("Change", 22.0),
    ("Id", 12.0),
    ("Name", 28.0),
    ("Class before", 24.0),
    ("Class now", 24.0),
    ("Rank before", 8.0),
    ("Rank now", 8.0),
    ("Score before", 9.0),
    ("Score now", 9.0),
    ("Plan A before", 10.0),
    ("Plan A now", 10.0),
    ("Plan B before", 10.0),
    ("Plan B now", 10.0),
    ("What changed", 50.0),
];

/// Row of the table header (0-based); two lines of explanation above it.
const HEADER_ROW: u32 = 2;

fn plan_text(v: Option<bool>) -> &'static str {
    match v {
        Some(true) => "funded",
        Some(false) => "not funded",
        None => "",
    }
}

/// Writes the Changes sheet.
pub fn write(
    ws: &mut Worksheet,
    report: &Screening,
    changes: &Changes,
    styles: &Styles,
) -> Result<(), ReportError> {
    ws.set_name("Changes")?;
    for (i, (_, w)) in COLUMNS.iter().enumerate() {
        ws.set_column_width(i as u16, *w)?;
    }
    ws.set_column_format(2, &styles.wrap)?;
    ws.set_column_format(13, &styles.wrap)?;
    let p = &changes.previous;
    ws.write_string_with_format(
        0,
        0,
        cut(&format!(
            "Compared with the previous run {} (seistriage {}; inventory {}, SHA-256 {}). \
             {} buildings screened in both runs.",
            p.file,
            if p.version.is_empty() {
                "?"
            } else {
                &p.version
            },
            p.input_file,
            p.input_sha256,
            changes.in_both
        )),
        &styles.label,
    )?;
    ws.write_string(
        1,
        0,
        format!(
            "Listed: class changes, rank moves of more than {} places (setting \
             changes_rank_threshold), buildings new or no longer screened, Plan A / Plan B \
             membership changes. {} changes.",
            changes.rank_threshold,
            changes.rows.len()
        ),
    )?;
    ws.set_row_height(HEADER_ROW, 30)?;
    for (i, (h, _)) in COLUMNS.iter().enumerate() {
        ws.write_string_with_format(HEADER_ROW, i as u16, *h, &styles.header)?;
    }
    let mut r = HEADER_ROW + 1;
    for c in &changes.rows {
        let lines = super::wrapped_lines(&c.name, COLUMNS[2].1)
            .max(super::wrapped_lines(&c.what, COLUMNS[13].1));
        if lines > 1 {
            ws.set_row_height(r, 15.0 * lines.min(8) as f64)?;
        }
        ws.write_string(r, 0, c.kind.words())?;
        ws.write_string(r, 1, cut(&c.id))?;
        ws.write_string(r, 2, cut(&c.name))?;
        for (col, v) in [(3u16, c.class.0), (4, c.class.1)] {
            if let Some(v) = v {
                let v = f64::from(v);
                ws.write_number_with_format(r, col, v, styles.class_format(v))?;
            }
        }
        for (col, v) in [(5u16, c.rank.0), (6, c.rank.1)] {
            if let Some(v) = v {
                ws.write_number_with_format(r, col, v as f64, styles.kind(CellKind::Int))?;
            }
        }
        for (col, v) in [(7u16, c.score.0), (8, c.score.1)] {
            if let Some(v) = v.filter(|v| v.is_finite()) {
                ws.write_number_with_format(r, col, v, styles.kind(CellKind::Dcr))?;
            }
        }
        for (col, v) in [
            (9u16, c.plan_a.0),
            (10, c.plan_a.1),
            (11, c.plan_b.0),
            (12, c.plan_b.1),
        ] {
            ws.write_string(r, col, plan_text(v))?;
        }
        ws.write_string(r, 13, cut(&c.what))?;
        r += 1;
    }
    if changes.rows.is_empty() {
        ws.write_string(r, 0, "(no changes)")?;
    }
    let last_col = (COLUMNS.len() - 1) as u16;
    ws.autofilter(HEADER_ROW, 0, (r - 1).max(HEADER_ROW), last_col)?;
    ws.set_freeze_panes(HEADER_ROW + 1, 2)?;
    let file = std::path::Path::new(&report.input.file)
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_default();
    style::page_setup(
        ws,
        "Changes",
        &file,
        Print {
            repeat_rows: Some((HEADER_ROW, HEADER_ROW)),
            repeat_cols: Some((0, 1)),
            on_request: None,
        },
    )?;
    Ok(())
}
