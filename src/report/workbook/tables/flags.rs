//! The Flags table: one row per flag, worded by `report::flag_text` from the settings in
//! force.

use super::table;
use crate::model::Dir;
use crate::results::{BuildingResult, Flag};

table! {
    /// Columns of the Flags table.
    columns FLAGS;
    /// One Flags row.
    fn flag_cells(b: &BuildingResult, f: &Flag) target(t) {}
    "Rank", "rank", Int, 7.0 => b.rank;
    "Id", "id", Text, 12.0 => &b.id;
    "Name", "name", Text, 24.0 => &b.name;
    "Class", "class", Class, 26.0 => b.class;
    "Flag", "code", Text, 20.0 => f.code.as_str();
    "Direction", "direction", Text, 9.0 => f.direction.map(Dir::code);
    "Reason", "detail", Text, 90.0 => crate::report::flag_text::detail(f);
}
