/*!
The terminal side of `screen`: the short summary printed on stdout (counts per class, the ten
highest priorities, not-screened count, the budget line, where each output went, the
caution) and a progress indicator on stderr, hidden when stderr is not a terminal or with
`--quiet`.
*/

use std::fmt::Write as _;
use std::io::IsTerminal;
use std::path::PathBuf;
use std::time::Duration;

use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};

use super::workbook::tables::class_name;
use crate::results::{Group, Screening};

/// Inventory text made safe for a terminal: control characters (escape sequences included)
/// are shown as `?`, and long text is cut to `max` characters with `…`.
pub fn clean(text: &str, max: usize) -> String {
    let mut out: String = text
        .chars()
        .take(max)
        .map(|c| if c.is_control() { '?' } else { c })
        .collect();
    if text.chars().nth(max).is_some() {
        out.pop();
        out.push('…');
    }
    out
}

/// The summary text: counts per class, the top ten, not-screened count, outputs, caution.
pub fn summary(report: &Screening, written: &[(String, PathBuf)]) -> String {
    let c = &report.counts;
    let mut s = String::new();
    let _ = writeln!(
        s,
        "{} {}: screened {} of {} rows ({} not screened, {} blank rows skipped); ranking level {}",
        report.tool,
        report.version,
        c.screened,
        c.rows,
        c.not_screened,
        c.blank_rows,
        report.settings.ranking_level.code().to_uppercase()
    );
    let _ = writeln!(s);
    let by = [c.by_class.c1, c.by_class.c2, c.by_class.c3, c.by_class.c4];
    for (k, n) in by.iter().enumerate() {
        let class = (k + 1) as u8;
        let _ = writeln!(s, "  class {class} {:<26} {n:>9}", class_name(class));
    }
    if !report.buildings.is_empty() {
        let _ = writeln!(s);
        let _ = writeln!(s, "Ten highest priorities");
        let _ = writeln!(
            s,
            "  {:>5}  {:<14} {:<34} {:>5}  {:>6}  governing",
            "rank", "id", "name", "class", "score"
        );
        for b in report.buildings.iter().take(10) {
            let score = if b.score.is_finite() {
                format!("{:.2}", b.score)
            } else {
                "-".into()
            };
            let _ = writeln!(
                s,
                "  {:>5}  {:<14} {:<34} {:>5}  {:>6}  {} {} {}",
                b.rank,
                clean(&b.id, 14),
                clean(&b.name, 34),
                b.class,
                score,
                b.governing.direction.code(),
                match b.governing.group {
                    Group::Walls => "walls",
                    Group::Columns => "columns",
                },
                b.governing.level.code().to_uppercase()
            );
        }
    }
    let _ = writeln!(s);
    if c.not_screened > 0 {
        let _ = writeln!(
            s,
            "Not screened: {} rows (reasons on the workbook's Not screened sheet)",
            c.not_screened
        );
    } else {
        let _ = writeln!(s, "Not screened: 0 rows");
    }
    // Never silently left out of the map (inventory.md, "Coordinates"). The streaming path
    // keeps no building objects in the report: nothing to count there.
    let no_coordinates = report
        .buildings
        .iter()
        .filter(|b| b.latitude.is_none() || b.longitude.is_none())
        .count();
    if no_coordinates > 0 {
        let _ = writeln!(
            s,
            "{no_coordinates} buildings without coordinates are not in the GeoJSON or on the map"
        );
    }
    if report.budget_plan.is_some() || report.settings.budget.is_some() {
        let _ = writeln!(s, "{}", super::workbook::budget_line(report));
    }
    if let Some(u) = &report.uncertainty {
        s.push_str(&uncertainty_lines(u));
    }
    if !written.is_empty() {
        let _ = writeln!(s);
        if written.iter().any(|(what, _)| what.ends_with("(CSV)")) {
            let _ = writeln!(
                s,
                "Some tables were written as CSV files beside the workbook (listed below): too \
                 long for a spreadsheet sheet ({} rows), or a large stock screened in chunks.",
                super::workbook::SHEET_ROWS
            );
        }
        let _ = writeln!(s, "Outputs");
        for (what, p) in written {
            let _ = writeln!(s, "  {what}: {}", clean(&p.display().to_string(), 4096));
        }
    }
    let _ = writeln!(s);
    s.push_str(crate::CAUTION);
    s.push('\n');
    s
}

/// The method §13 lines of the summary: the class 1–2 count interval and "survey next".
pub fn uncertainty_lines(u: &crate::results::StockUncertainty) -> String {
    let c = &u.class_1_2_count;
    let mut s = format!(
        "Uncertainty ({} samples, seed {}): class 1–2 buildings {} to {} (p05–p95, median {})\n",
        u.samples, u.seed, c.p05, c.p95, c.p50
    );
    if u.survey_next.is_empty() {
        s.push_str("Survey next: none (no building's deficit hangs on uncertain inputs)\n");
    } else {
        let ids: Vec<String> = u.survey_next.iter().map(|id| clean(id, 40)).collect();
        let _ = writeln!(s, "Survey next: {}", ids.join(", "));
    }
    s
}

/// A progress indicator on stderr; draws nothing when stderr is not a terminal or when quiet.
#[derive(Debug)]
pub struct ProgressLine {
    bar: ProgressBar,
}

impl ProgressLine {
    /// A spinner with a message (for phases without a known length).
    pub fn spinner(quiet: bool, message: &str) -> Self {
        let bar = if quiet || !std::io::stderr().is_terminal() {
            ProgressBar::hidden()
        } else {
            let b = ProgressBar::new_spinner();
            b.set_draw_target(ProgressDrawTarget::stderr());
            b.enable_steady_tick(Duration::from_millis(120));
            b
        };
        bar.set_message(message.to_string());
        ProgressLine { bar }
    }

    /// Switches to a bar of `total` rows with a message, showing rows per second.
    pub fn rows(&self, total: u64, message: &str) {
        if self.bar.is_hidden() {
            return;
        }
        self.bar.set_length(total);
        self.bar.set_position(0);
        if let Ok(style) = ProgressStyle::with_template(
            "{msg} [{bar:30}] {human_pos}/{human_len} rows ({per_sec}, {eta} left)",
        ) {
            self.bar.set_style(style.progress_chars("=> "));
        }
        self.bar.set_message(message.to_string());
    }

    /// Changes the message.
    pub fn message(&self, message: &str) {
        self.bar.set_message(message.to_string());
    }

    /// Sets the position (rows done).
    pub fn set(&self, done: u64) {
        self.bar.set_position(done);
    }

    /// Removes the indicator from the terminal.
    pub fn finish(&self) {
        self.bar.finish_and_clear();
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn clean_removes_escape_sequences_and_cuts() {
        assert_eq!(clean("a\x1b[31mb", 20), "a?[31mb");
        assert_eq!(clean("abcdef", 4), "abc…");
        assert_eq!(clean("abcd", 4), "abcd");
    }
}
