//! The Input problems table: every error and warning of the reading layer.

use super::table;
use crate::model::{Problem, Severity};

/// The severity as written.
fn severity(s: Severity) -> &'static str {
    match s {
        Severity::Error => "error",
        Severity::Warning => "warning",
    }
}

table! {
    /// Columns of the Input problems table.
    columns PROBLEMS;
    /// One Input problems row.
    fn problem_cells(p: &Problem) target(t) {}
    "Severity", "severity", Text, 10.0 => severity(p.severity);
    "Sheet", "sheet", Text, 12.0 => &p.sheet;
    "Row", "row", Int, 8.0 => p.row;
    "Column", "column", Text, 22.0 => &p.column;
    "Problem", "message", Text, 100.0 => &p.message;
}
