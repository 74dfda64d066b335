/*!
The Assumptions sheet: every effective setting with its value, source tag and meaning, the
construction-era table, the simplifications of the method in plain words, and the caution.
*/

use rust_xlsxwriter::Worksheet;

use super::style::Styles;
use super::{ReportError, cut};
use crate::results::Screening;
use crate::settings::KEYS;

/// The simplifications of `method.md`, in plain words.
pub const SIMPLIFICATIONS: &[&str] = &[
    "The period of the equivalent single-degree-of-freedom system T* is taken equal to the \
     building period T (N2 method, EN 1998-1 Annex B).",
    "The code period formulas (EN 1998-1 §4.3.3.2.2) give short, uncracked and infilled \
     periods, so the drift demand of buildings with periods above the corner period TC is \
     biased low. The setting period_factor is the lever (cracked-stiffness practice is about \
     1.3 to 1.5).",
    "Storey stiffness and strength are judged from cross-section areas divided by storey \
     height (RC walls, infill at 1/10, columns at 1/2), not from an analysis model.",
    "The building deforms in an inverted-triangle first mode with equal floor masses. Walls \
     see the roof drift; columns see the roof drift times a storey-drift concentration \
     factor κ.",
    "Gravity load is shared by all vertical elements at a uniform stress: one axial load \
     ratio for walls and columns.",
    "Member capacities are chord rotations from EN 1998-3 Annex A (or ASCE 41-17 Table \
     10-19 for walls when chosen) with assumed reinforcement ratios and detailing; shear \
     failure, lap splices, foundations and non-structural elements are not assessed (short \
     columns only raise the class).",
    "Walls are either listed one by one or represented by one representative wall per \
     direction with the typical length and thickness.",
    "Inputs left blank take the defaults named in each building's defaults; they are \
     assumptions, not survey data.",
    "Classes follow the demand/capacity ratios at 1.0: class 1 at Collapse Prevention, 2 at \
     Life Safety, 3 at Immediate Occupancy, 4 within screening limits.",
    "Retrofit sizing adds continuous new RC walls only; costs are currency-neutral and use \
     the unit costs given (no built-in prices).",
];

/// The method corrections of revision 6 (issue 13), in plain words: what changed in the
/// numbers since earlier runs.
pub const METHOD_CORRECTIONS: &[&str] = &[
    "Strength (§3): C_y = C_m + max(C_rc + 0.7·C_c, C_c), the larger of the wall-governed and \
     the column-governed strength; a token wall no longer lowers the strength (before: any \
     wall switched the columns to 70 %). The weak-storey check uses the same form.",
    "Frame-alone bound (§9): where a direction has columns and RC walls, its DCR at Life \
     Safety and Collapse Prevention is never above that of its frame alone (walls removed, \
     frame period, κ 1.5 or 2.5 with a surveyed soft/weak storey). At Immediate Occupancy a \
     wall's damage is damage. The Directions sheet shows the bound; where it governs, the \
     governing group is columns.",
    "Walls (§8): θum of EN 1998-3 eq. (A.1) is divided by wall_rotation_divisor = 1.6 \
     (EN 1998-3:2005 §A.3.2.2(2)); before, it was multiplied by 0.58 (later papers).",
    "Confidence factor (§8): inside the capacity formulas existing members take fc/CF, fy/CF \
     and ν·CF (eq. A.1, the ASCE 41 Q, the outside-calibration check); the axial-load flags \
     keep ν with the mean fc.",
    "Soft/weak storey data (§10), per building: the storeys sheet when it has a row for \
     storey 2; else the upper_* cells; else storey 2 repeats the ground storey but takes the \
     listed walls standing in storey 2 and its own height. The flag says which data it used.",
    "Captive columns (§12): walls do not cure short columns. A short-column building gets a \
     column remedy costed at unit_cost_short_column_m2 per m² of plan; the floor-area cost is \
     charged only when walls are added. Without that unit cost the building has no cost and \
     is left out of both budget plans (listed with the reason on the Retrofit plan).",
];

/// Writes the Assumptions sheet.
pub fn write(ws: &mut Worksheet, report: &Screening, styles: &Styles) -> Result<(), ReportError> {
    ws.set_name("Assumptions")?;
    for (c, w) in [30.0, 18.0, 44.0, 90.0].iter().enumerate() {
        ws.set_column_width(c as u16, *w)?;
    }
    ws.set_freeze_panes(1, 0)?;
    let headers = ["Setting", "Value", "Source", "Meaning"];
    for (i, h) in headers.iter().enumerate() {
        ws.write_string_with_format(0, i as u16, *h, &styles.header)?;
    }
    let mut r = 1u32;
    for k in KEYS {
        ws.write_string(r, 0, k.key)?;
        let v = report.settings.value_text(k.key).unwrap_or_default();
        ws.write_string(r, 1, if v.is_empty() { "(empty)" } else { cut(&v) })?;
        // Wrapped: a tag can say in words that its value is not verified against its source.
        // Spreadsheet applications do not grow a row for wrapped text on their own, so the
        // row gets the height of its longer text (about 40 characters a line in the Source
        // column, 85 in Meaning).
        ws.write_string_with_format(r, 2, k.tag, &styles.wrap)?;
        ws.write_string_with_format(r, 3, k.doc, &styles.wrap)?;
        let lines = (k.tag.chars().count().div_ceil(40)).max(k.doc.chars().count().div_ceil(85));
        if lines > 1 {
            ws.set_row_height(r, 15.0 * lines as f64)?;
        }
        r += 1;
    }
    ws.autofilter(0, 0, r - 1, 3)?;

    r += 1;
    ws.write_string_with_format(r, 0, "Construction-era table", &styles.section)?;
    r += 1;
    for (i, h) in ["From year", "To year", "fc (MPa)", "fy (MPa)"]
        .iter()
        .enumerate()
    {
        ws.write_string_with_format(r, i as u16, *h, &styles.header)?;
    }
    r += 1;
    if report.settings.era.is_empty() {
        ws.write_string(
            r,
            0,
            "(empty: default_fc_mpa and default_fy_mpa apply where a row gives no strength)",
        )?;
        r += 1;
    }
    for e in &report.settings.era {
        let cells = [
            e.from_year.map(f64::from),
            e.to_year.map(f64::from),
            e.fc_mpa,
            e.fy_mpa,
        ];
        for (i, v) in cells.iter().enumerate() {
            match v {
                Some(v) if v.is_finite() => {
                    ws.write_number(r, i as u16, *v)?;
                }
                _ => {
                    ws.write_string(r, i as u16, "(open)")?;
                }
            }
        }
        r += 1;
    }

    r += 1;
    ws.write_string_with_format(r, 0, "Simplifications of the method", &styles.section)?;
    r += 1;
    for (i, s) in SIMPLIFICATIONS.iter().enumerate() {
        ws.write_number(r, 0, (i + 1) as f64)?;
        ws.merge_range(r, 1, r, 3, s, &styles.wrap)?;
        ws.set_row_height(r, 32)?;
        r += 1;
    }

    r += 1;
    ws.write_string_with_format(r, 0, "Method corrections (revision 6)", &styles.section)?;
    r += 1;
    for (i, s) in METHOD_CORRECTIONS.iter().enumerate() {
        ws.write_number(r, 0, (i + 1) as f64)?;
        ws.merge_range(r, 1, r, 3, s, &styles.wrap)?;
        ws.set_row_height(r, 45)?;
        r += 1;
    }

    r += 1;
    ws.write_string_with_format(r, 0, "Source tags", &styles.section)?;
    r += 1;
    for (tag, meaning) in [
        ("[src]", "a published source named beside the value"),
        (
            "[mem], [mem-H]",
            "recalled from memory: verify before relying on it",
        ),
        ("[practice]", "common practice with no single source"),
        ("[screening]", "an assumption of this method, stated openly"),
        (
            "[project]",
            "a choice of this tool, with no engineering meaning",
        ),
    ] {
        ws.write_string(r, 0, tag)?;
        ws.merge_range(r, 1, r, 3, meaning, &styles.text)?;
        r += 1;
    }

    r += 1;
    ws.write_string_with_format(r, 0, "The method", &styles.label)?;
    ws.merge_range(
        r,
        1,
        r,
        3,
        "docs/method.md, shipped with seistriage: what each step computes, its source and its \
         limits; `seistriage explain INVENTORY ID` shows every number for one building",
        &styles.wrap,
    )?;
    r += 2;
    ws.merge_range(r, 0, r + 1, 3, crate::CAUTION, &styles.caution)?;
    Ok(())
}
