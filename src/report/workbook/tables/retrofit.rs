//! The Retrofit plan table: one row per building with a retrofit, in rank order, with the
//! running funding cost (method §12).

use super::table;
use crate::results::{BuildingResult, Retrofit};

/// The cost a building takes from the budget (method §12), computed by
/// [`crate::retrofit::cost::funding_cost`] (the one place).
pub fn funding_cost(b: &BuildingResult) -> Option<f64> {
    b.retrofit
        .as_ref()
        .and_then(crate::retrofit::cost::funding_cost)
}

table! {
    /// Columns of the Retrofit plan table.
    columns RETROFIT;
    /// One Retrofit plan row (`r` is the building's retrofit); `cumulative` is the running
    /// funding cost in rank order. The note is the retrofit's own (method §12:
    /// `retrofit::sizing` and `retrofit::cost`).
    fn retrofit_cells(b: &BuildingResult, r: &Retrofit, cumulative: Option<f64>) target(t) {
        let sep = t.list_sep();
    }
    "Rank", "rank", Int, 7.0 => b.rank;
    "Id", "id", Text, 12.0 => &b.id;
    "Name", "name", Text, 28.0 => &b.name;
    "District", "district", Text, 16.0 => &b.district;
    "Class", "class", Class, 26.0 => b.class;
    "Score (governing DCR)", "score", Dcr, 12.0 => b.score;
    "Occupants", "occupants", Thousands, 11.0 => b.occupants;
    "Floor area (m²)", "floor_area_m2", Thousands, 11.0 => b.detail.floor_area_m2;
    "Added wall area X (m²)", "added_wall_area_x_m2", Dec2, 12.0 => r.added_wall_area_m2.x;
    "Added wall area Y (m²)", "added_wall_area_y_m2", Dec2, 12.0 => r.added_wall_area_m2.y;
    "Column remedy", "column_remedy", Text, 9.0 => r.column_remedy;
    "Retrofit cost", "cost", Thousands, 14.0 => r.cost;
    "Replacement cost", "replacement_cost", Thousands, 14.0 => r.replacement_cost;
    "Replace", "replace", Text, 9.0 => r.replace;
    "Cost used for funding", "funding_cost", Thousands, 14.0 => funding_cost(b);
    "Cumulative cost, rank order", "cumulative_cost", Thousands, 15.0 => cumulative;
    "Flags after retrofit", "flags_after", Text, 24.0 => r.flags_after.iter().map(|c| c.as_str()).collect::<Vec<_>>().join(sep);
    "Funded by Plan A: in priority order", "funded", Text, 15.0 => r.funded;
    "Funded by Plan B: most people protected", "funded_max_occupants", Text, 15.0 => r.funded_best;
    "Excluded from the budget plans (reason)", "excluded", Text, 44.0 => r.excluded.as_deref().unwrap_or("");
    "Note", "note", Text, 48.0 => &r.note;
}

/// The rows of the Retrofit plan in rank order: each building with a retrofit, its
/// retrofit and the running funding cost (unknown from the first building whose funding
/// cost is unknown on).
pub fn retrofit_rows(
    buildings: &[BuildingResult],
) -> impl Iterator<Item = (&BuildingResult, &Retrofit, Option<f64>)> {
    let mut cumulative = 0.0;
    let mut known = true;
    buildings.iter().filter_map(move |b| {
        let r = b.retrofit.as_ref()?;
        let cost = funding_cost(b);
        match cost {
            Some(c) if known => cumulative += c,
            _ => known = false,
        }
        Some((b, r, (known && cost.is_some()).then_some(cumulative)))
    })
}
