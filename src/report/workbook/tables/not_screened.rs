//! The Not screened table: the rows the engine could not screen and why.

use super::table;
use crate::model::NotScreened;

table! {
    /// Columns of the Not screened table.
    columns NOT_SCREENED;
    /// One Not screened row.
    fn not_screened_cells(n: &NotScreened) target(t) {}
    "Sheet", "sheet", Text, 12.0 => &n.sheet;
    "Row", "row", Int, 8.0 => n.row;
    "Id", "id", Text, 14.0 => &n.id;
    "Reasons", "reasons", Text, 100.0 => n.reasons.join("; ");
}
