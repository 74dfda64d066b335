//! The terminal summary of `screen`.

use std::path::PathBuf;

use crate::results::Report;

/// The summary text: counts per class, the top ten, not-screened count, outputs, caution.
pub fn summary(report: &Report, written: &[(String, PathBuf)]) -> String {
    let mut s = format!(
        "screened {} of {} rows\n",
        report.counts.screened, report.counts.rows
    );
    for (what, p) in written {
        s.push_str(&format!("{what}: {}\n", p.display()));
    }
    s.push_str(crate::CAUTION);
    s.push('\n');
    s
}
