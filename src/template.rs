/*!
The blank inventory workbook (`seistriage template`) and the commented settings file
(`templates/settings.toml`), both rendered from the one column table
([`crate::input::columns`]) and the one settings table ([`crate::settings::KEYS`]) so that
they cannot drift from what the reader and the engine accept. Document properties are
pinned so that regenerating gives the same workbook.
*/

use std::path::Path;

use rust_xlsxwriter::{
    DataValidation, DocProperties, ExcelDateTime, Format, FormatBorder, Note, Workbook, Worksheet,
};

use crate::input::HEADER_RULE_HELP;
use crate::input::columns::{Column, SHEETS, SheetSpec, ValueKind};
use crate::model::Use;
use crate::settings::{KEYS, Settings};

/// Failures while writing the template.
#[derive(Debug, thiserror::Error)]
pub enum TemplateError {
    /// Workbook writer error.
    #[error("workbook: {0}")]
    Xlsx(#[from] rust_xlsxwriter::XlsxError),
    /// File system error.
    #[error("{0}")]
    Io(#[from] std::io::Error),
    /// Writing the file.
    #[error("{0}")]
    Write(#[from] crate::report::ReportError),
}

/// Last row (0-based) that drop-down lists cover.
const LAST_ROW: u32 = 1_048_575;

/// The allowed values of a closed-set column, if it is one.
pub fn allowed_values(kind: ValueKind) -> Option<Vec<&'static str>> {
    match kind {
        ValueKind::Use => Some(Use::ALL.iter().map(|u| u.code()).collect()),
        ValueKind::YesNo => Some(vec!["yes", "no", "unknown"]),
        ValueKind::Ground => Some(vec!["A", "B", "C", "D", "E"]),
        ValueKind::Direction => Some(vec!["X", "Y"]),
        _ => None,
    }
}

fn note_text(c: &Column) -> String {
    let req = if c.required { "required" } else { "optional" };
    format!(
        "{}\nUnit / values: {}\n{req}; default: {}",
        c.meaning, c.unit, c.default
    )
}

fn write_sheet(ws: &mut Worksheet, spec: &SheetSpec, bold: &Format) -> Result<(), TemplateError> {
    ws.set_name(spec.name)?;
    for (i, c) in spec.columns.iter().enumerate() {
        let col = u16::try_from(i).unwrap_or(u16::MAX);
        ws.write_string_with_format(0, col, c.name, bold)?;
        ws.set_column_width(col, (c.name.len() as f64 + 4.0).max(10.0))?;
        let note = Note::new(note_text(c))
            .set_author("seistriage")
            .set_width(320)
            .set_height(110);
        ws.insert_note(0, col, &note)?;
        if let Some(values) = allowed_values(c.kind) {
            let dv = DataValidation::new()
                .allow_list_strings(&values)?
                .set_input_title(c.name)?
                .set_input_message(values.join(", "))?;
            ws.add_data_validation(1, col, LAST_ROW, col, &dv)?;
        }
    }
    ws.set_freeze_panes(1, 0)?;
    Ok(())
}

fn write_readme(ws: &mut Worksheet, bold: &Format, wrap: &Format) -> Result<(), TemplateError> {
    ws.set_name("read-me")?;
    // Printed (or converted to PDF) one page wide, landscape: the rules stay readable.
    ws.set_landscape();
    ws.set_print_fit_to_pages(1, 0);
    ws.set_column_width(0, 14)?;
    ws.set_column_width(1, 26)?;
    ws.set_column_width(2, 30)?;
    ws.set_column_width(3, 10)?;
    ws.set_column_width(4, 30)?;
    ws.set_column_width(5, 70)?;
    let mut r = 0u32;
    let lines = [
        "seistriage blank inventory workbook",
        "Fill one row per building in the sheet 'buildings'. The sheets walls, storeys, footprints, eras and settings are optional; delete the ones you do not use.",
        "A title row above the header row is allowed: the header row is found by the required column names (or give --header-row N).",
        HEADER_RULE_HELP,
        crate::input::SURVEY_TEXT_HELP,
        "Blank optional cells take the default listed below; every default used is reported per building.",
        crate::CAUTION,
    ];
    for (i, line) in lines.iter().enumerate() {
        if i == 0 {
            ws.write_string_with_format(r, 0, *line, bold)?;
        } else {
            // Long rules wrap across the table's width (about 190 characters a line).
            ws.merge_range(r, 0, r, 5, line, wrap)?;
            let lines = (line.chars().count() / 190 + 1) as f64;
            ws.set_row_height(r, 15.0 * lines)?;
        }
        r += 1;
    }
    r += 1;
    for (i, h) in [
        "sheet",
        "column",
        "unit / values",
        "required",
        "default",
        "meaning",
    ]
    .iter()
    .enumerate()
    {
        ws.write_string_with_format(r, i as u16, *h, bold)?;
    }
    r += 1;
    for spec in SHEETS {
        for c in spec.columns {
            ws.write_string(r, 0, spec.name)?;
            ws.write_string(r, 1, c.name)?;
            ws.write_string_with_format(r, 2, c.unit, wrap)?;
            ws.write_string(r, 3, if c.required { "yes" } else { "no" })?;
            ws.write_string_with_format(r, 4, c.default, wrap)?;
            let mut meaning = c.meaning.to_string();
            if !c.aliases.is_empty() {
                meaning.push_str(&format!(" Also accepted as: {}.", c.aliases.join(", ")));
            }
            ws.write_string_with_format(r, 5, meaning, wrap)?;
            r += 1;
        }
    }
    Ok(())
}

/// Builds the blank inventory workbook in memory.
pub fn template_workbook() -> Result<Workbook, TemplateError> {
    let mut wb = Workbook::new();
    let created = ExcelDateTime::from_ymd(2026, 1, 1)?;
    wb.set_properties(
        &DocProperties::new()
            .set_title("seistriage blank inventory")
            .set_author("seistriage")
            .set_creation_datetime(&created),
    );
    let bold = Format::new()
        .set_bold()
        .set_border_bottom(FormatBorder::Thin);
    let wrap = Format::new().set_text_wrap();
    write_readme(wb.add_worksheet(), &bold, &wrap)?;
    for spec in SHEETS {
        write_sheet(wb.add_worksheet(), spec, &bold)?;
    }
    Ok(wb)
}

/// Writes the blank inventory workbook to `path` (creating its folder).
pub fn write_template(path: &Path) -> Result<(), TemplateError> {
    if let Some(dir) = path.parent().filter(|d| !d.as_os_str().is_empty()) {
        std::fs::create_dir_all(dir)?;
    }
    let mut wb = template_workbook()?;
    // Written beside the target and renamed when complete: never half-written.
    crate::report::atomic::write_atomic(path, |w| {
        wb.save_to_writer(w)?;
        Ok(())
    })?;
    Ok(())
}

fn toml_value(text: &str) -> String {
    let is_number = !text.is_empty()
        && text.parse::<f64>().is_ok_and(f64::is_finite)
        && !text.contains(['i', 'n', 'N']);
    if is_number {
        text.to_string()
    } else {
        format!("\"{}\"", text.replace('\\', "\\\\").replace('"', "\\\""))
    }
}

/// The commented settings file: every key of [`KEYS`] with its meaning, source tag and
/// default, all commented out (`# key = default`), then the `[[era]]` table explained.
pub fn settings_toml() -> String {
    let defaults = Settings::default();
    let mut out = String::from(
        "## seistriage settings file (TOML). Generated from the settings table; keep in step with\n\
         ## `cargo test` (a test compares this file with the table).\n\
         ## Every key is commented out and shows its built-in default. Uncomment a line and edit\n\
         ## the value to change it. An empty string (\"\") means \"no value\".\n\
         ## Precedence: command-line flags > this file (--settings) > the inventory's settings\n\
         ## sheet > built-in defaults. Source tags: [src] published source named, [mem] from\n\
         ## memory (verify before relying on it), [practice] common practice, [screening] an\n\
         ## assumption of this method, [project] a choice of this tool.\n",
    );
    for k in KEYS {
        let value = defaults.value_text(k.key).unwrap_or_default();
        out.push_str(&format!(
            "\n## {}\n## {}\n# {} = {}\n",
            k.doc,
            k.tag,
            k.key,
            toml_value(&value)
        ));
    }
    out.push_str(
        "\n## Construction-era table (TOML only): default fc / fy by year built, used when a row\n\
         ## gives no fc_mpa / fy_mpa. Empty by default [screening]: the local code history decides.\n\
         ## One [[era]] block per era; from_year / to_year inclusive, either may be left out.\n\
         ## The numbers below are a format example only, not a default:\n\
         ## [[era]]\n\
         ## from_year = 1950\n\
         ## to_year = 1979\n\
         ## fc_mpa = 14\n\
         ## fy_mpa = 220\n",
    );
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_closed_set_column_has_a_drop_down() {
        for spec in SHEETS {
            for c in spec.columns {
                let closed = matches!(
                    c.kind,
                    ValueKind::Use | ValueKind::YesNo | ValueKind::Ground | ValueKind::Direction
                );
                assert_eq!(allowed_values(c.kind).is_some(), closed, "{}", c.name);
            }
        }
    }
}
