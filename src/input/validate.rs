/*!
Checks across rows and sheets, after every sheet is read: duplicated ids, rows of the
optional sheets that refer to unknown buildings (reported and ignored) or that carry errors
(their building is not screened), a building with no vertical structure, and the data
consistency warning between listed walls and the `rc_wall_area_*` columns. No engineering:
wall areas are summed only where the thickness is given in the inventory.
*/

use std::collections::{HashMap, HashSet};

use crate::model::{
    BuildingRecord, Dir, FootprintVertex, Inventory, NotScreened, Problem, Severity, StoreyRecord,
    WallRecord,
};

use super::raw::format_number;

/// Rows read from every sheet, each with its own problems, before cross-checks.
#[derive(Debug, Default)]
pub struct Collected {
    /// Buildings rows (accepted or not: the split happens in [`finish`], in place).
    pub buildings: Vec<BuildingRecord>,
    /// Problems of the buildings rows, in row order.
    pub building_problems: Vec<Problem>,
    /// Walls rows.
    pub walls: Vec<(WallRecord, Vec<Problem>)>,
    /// Storeys rows.
    pub storeys: Vec<(StoreyRecord, Vec<Problem>)>,
    /// Footprint rows.
    pub footprints: Vec<(FootprintVertex, Vec<Problem>)>,
    /// Era rows (`eras` sheet).
    pub eras: Vec<(crate::settings::Era, Vec<Problem>)>,
    /// Sheet-level problems, in order.
    pub sheet_problems: Vec<Problem>,
    /// Settings rows.
    pub settings_rows: Vec<(String, String)>,
    /// The spreadsheet row of each settings row.
    pub settings_row_numbers: Vec<usize>,
    /// Blank rows of the buildings sheet.
    pub blank_rows: usize,
}

fn has_error(p: &[Problem]) -> bool {
    p.iter().any(|p| p.severity == Severity::Error)
}

fn reason(p: &Problem) -> String {
    if p.column.is_empty() {
        p.message.clone()
    } else {
        format!("{}: {}", p.column, p.message)
    }
}

fn err(sheet: &str, row: usize, column: &str, message: String) -> Problem {
    Problem {
        sheet: sheet.into(),
        row: Some(row),
        column: column.into(),
        message,
        severity: Severity::Error,
    }
}

fn warning(sheet: &str, row: usize, column: &str, message: String) -> Problem {
    Problem {
        severity: Severity::Warning,
        ..err(sheet, row, column, message)
    }
}

/// Optional-sheet rows: unknown ids are reported and dropped; rows with errors are dropped
/// and make their building not screened. Returns the accepted rows.
fn sort_out<T>(
    sheet: &str,
    rows: Vec<(T, Vec<Problem>)>,
    id_of: impl Fn(&T) -> &str,
    row_of: impl Fn(&T) -> usize,
    known: &HashMap<String, Vec<usize>>,
    extra: &mut HashMap<String, Vec<Problem>>,
    problems: &mut Vec<Problem>,
) -> Vec<T> {
    let mut out = Vec::new();
    for (rec, probs) in rows {
        let id = id_of(&rec).to_string();
        let bad = has_error(&probs);
        problems.extend(probs);
        if id.is_empty() {
            continue;
        }
        if !known.contains_key(&id) {
            problems.push(warning(
                sheet,
                row_of(&rec),
                "building_id",
                format!(
                    "expected an id of the buildings sheet, found \"{id}\"; the row is ignored"
                ),
            ));
            continue;
        }
        if bad {
            extra.entry(id).or_default().push(err(
                "buildings",
                0,
                "",
                format!("{sheet} row {} has errors", row_of(&rec)),
            ));
            continue;
        }
        out.push(rec);
    }
    out
}

/// Cross-checks and the final split into accepted and not-screened rows. The accepted
/// rows stay in the vector they were read into (no second copy of a large stock).
pub fn finish(c: Collected, wall_area_mismatch_pct: f64) -> Inventory {
    finish_with_ids(c, wall_area_mismatch_pct, None)
}

/// [`finish`] for one chunk of a streamed file: `duplicates` (ids on more than one row of the
/// whole file → their rows, from a first pass) replaces the chunk's own id → rows map for
/// those ids, so a repeated id is refused on all its rows even when they fall in different
/// chunks, with the same message as the whole-file read.
pub fn finish_with_ids(
    mut c: Collected,
    wall_area_mismatch_pct: f64,
    duplicates: Option<&HashMap<String, Vec<usize>>>,
) -> Inventory {
    let mut inv = Inventory {
        settings_rows: std::mem::take(&mut c.settings_rows),
        settings_row_numbers: std::mem::take(&mut c.settings_row_numbers),
        blank_rows: c.blank_rows,
        rows: c.buildings.len(),
        ..Default::default()
    };
    let mut problems = std::mem::take(&mut c.sheet_problems);
    let mut row_problems = std::mem::take(&mut c.building_problems);
    // Ids → rows.
    let mut ids: HashMap<String, Vec<usize>> = HashMap::new();
    for b in &c.buildings {
        if !b.id.is_empty() {
            ids.entry(b.id.clone()).or_default().push(b.row);
        }
    }
    if let Some(dups) = duplicates {
        for (id, rows) in ids.iter_mut() {
            if let Some(all) = dups.get(id) {
                rows.clone_from(all);
            }
        }
    }
    let mut extra: HashMap<String, Vec<Problem>> = HashMap::new();
    let mut later = Vec::new();
    let walls = sort_out(
        "walls",
        std::mem::take(&mut c.walls),
        |w| &w.building_id,
        |w| w.row,
        &ids,
        &mut extra,
        &mut later,
    );
    // A storey listed twice for one building cannot be told apart: both rows are errors.
    let mut seen: HashMap<(String, u32), Vec<usize>> = HashMap::new();
    for (s, _) in &c.storeys {
        if !s.building_id.is_empty() && s.storey > 0 {
            seen.entry((s.building_id.clone(), s.storey))
                .or_default()
                .push(s.row);
        }
    }
    for (s, probs) in &mut c.storeys {
        if let Some(rows) = seen.get(&(s.building_id.clone(), s.storey))
            && rows.len() > 1
        {
            let list = join_rows(rows);
            probs.push(err(
                "storeys",
                s.row,
                "storey",
                format!(
                    "expected each storey once per building, found storey {} of \"{}\" in rows {list}",
                    s.storey, s.building_id
                ),
            ));
        }
    }
    let storeys = sort_out(
        "storeys",
        std::mem::take(&mut c.storeys),
        |s| &s.building_id,
        |s| s.row,
        &ids,
        &mut extra,
        &mut later,
    );
    let footprints = sort_out(
        "footprints",
        std::mem::take(&mut c.footprints),
        |f| &f.building_id,
        |f| f.row,
        &ids,
        &mut extra,
        &mut later,
    );
    // Storey-1 rows of the storeys sheet, per building (method §10: checked against the
    // buildings row below).
    let storey_one: HashMap<&str, &StoreyRecord> = storeys
        .iter()
        .filter(|st| st.storey == 1)
        .map(|st| (st.building_id.as_str(), st))
        .collect();
    // Ground-storey walls per building: (any listed, sum X, sum Y, sums complete).
    let mut ground: HashMap<&str, (bool, [f64; 2], [bool; 2])> = HashMap::new();
    let thickness: HashMap<&str, Option<f64>> = c
        .buildings
        .iter()
        .map(|b| (b.id.as_str(), b.wall_thickness_m))
        .collect();
    for w in &walls {
        if w.start_storey.unwrap_or(1) != 1 {
            continue;
        }
        let e = ground
            .entry(w.building_id.as_str())
            .or_insert((false, [0.0; 2], [true; 2]));
        e.0 |= w.length_m > 0.0;
        let i = match w.direction {
            Some(Dir::X) => 0,
            Some(Dir::Y) => 1,
            None => continue,
        };
        let t = w
            .thickness_m
            .or_else(|| thickness.get(w.building_id.as_str()).copied().flatten());
        match t {
            Some(t) => e.1[i] += w.length_m * t,
            None => e.2[i] = false,
        }
    }
    let mut bad: HashSet<usize> = row_problems
        .iter()
        .filter(|p| p.severity == Severity::Error)
        .filter_map(|p| p.row)
        .collect();
    for b in &c.buildings {
        if let Some(rows) = ids.get(&b.id)
            && rows.len() > 1
        {
            let list = join_rows(rows);
            row_problems.push(err(
                "buildings",
                b.row,
                "id",
                format!("expected a unique id, found \"{}\" in rows {list}; none of these rows is screened", b.id),
            ));
            bad.insert(b.row);
        }
        if !bad.contains(&b.row) {
            let walls_here = ground.get(b.id.as_str());
            let listed = walls_here.is_some_and(|g| g.0);
            let wall_cols = b.rc_wall_area_x_m2.unwrap_or(0.0) + b.rc_wall_area_y_m2.unwrap_or(0.0);
            if b.column_area_m2 == 0.0 && !listed && wall_cols == 0.0 {
                row_problems.push(err(
                    "buildings",
                    b.row,
                    "column_area_m2",
                    "expected column area plus RC wall area above 0, found 0 (a building with no vertical structure)".into(),
                ));
                bad.insert(b.row);
            }
            if let Some((true, sums, complete)) = walls_here {
                for (i, d, col) in [(0, "X", "rc_wall_area_x_m2"), (1, "Y", "rc_wall_area_y_m2")] {
                    let given = if i == 0 {
                        b.rc_wall_area_x_m2
                    } else {
                        b.rc_wall_area_y_m2
                    };
                    let (Some(given), true) = (given, complete[i]) else {
                        continue;
                    };
                    let sum = sums[i];
                    let off = if given > 0.0 {
                        (sum - given).abs() / given * 100.0
                    } else if sum > 0.0 {
                        f64::INFINITY
                    } else {
                        0.0
                    };
                    if off > wall_area_mismatch_pct {
                        row_problems.push(warning(
                            "buildings",
                            b.row,
                            col,
                            format!(
                                "expected the listed ground-storey walls along {d} ({} m²) to agree within {} % with this column, found {} m²; the walls sheet is used",
                                format_number((sum * 1e4).round() / 1e4),
                                format_number(wall_area_mismatch_pct),
                                format_number(given)
                            ),
                        ));
                    }
                }
            }
        }
        if !bad.contains(&b.row)
            && let Some(st) = storey_one.get(b.id.as_str())
        {
            storey_one_check(
                b,
                st,
                ground.get(b.id.as_str()),
                wall_area_mismatch_pct,
                &mut later,
            );
        }
        if let Some(more) = extra.get(&b.id) {
            for m in more {
                row_problems.push(err("buildings", b.row, "", m.message.clone()));
            }
            bad.insert(b.row);
        }
    }
    row_problems.sort_by_key(|p| p.row);
    if !bad.is_empty() {
        let mut reasons: HashMap<usize, Vec<String>> = HashMap::new();
        for p in row_problems
            .iter()
            .filter(|p| p.severity == Severity::Error)
        {
            if let Some(r) = p.row {
                let list = reasons.entry(r).or_default();
                let text = reason(p);
                if !list.contains(&text) {
                    list.push(text);
                }
            }
        }
        for b in c.buildings.iter().filter(|b| bad.contains(&b.row)) {
            inv.not_screened.push(NotScreened {
                sheet: "buildings".into(),
                row: b.row,
                id: b.id.clone(),
                reasons: reasons.remove(&b.row).unwrap_or_default(),
            });
        }
        c.buildings.retain(|b| !bad.contains(&b.row));
    }
    problems.extend(row_problems);
    problems.extend(later);
    // The eras sheet: rows with errors are left out (reported); the rest replace the
    // settings' era table (pipeline).
    for (era, probs) in std::mem::take(&mut c.eras) {
        let bad = has_error(&probs);
        problems.extend(probs);
        if !bad {
            inv.eras.push(era);
        }
    }
    inv.buildings = c.buildings;
    inv.walls = walls;
    inv.storeys = storeys;
    inv.footprints = footprints;
    inv.problems = problems;
    inv
}

/// Method §10: "storey 1 is always the buildings row (and its listed walls) with the
/// storeys row's height, and a storey-1 row whose areas differ from the buildings row by
/// more than 5 % raises a warning" (`wall_area_mismatch_pct`, default 5). Compared: column
/// area; RC wall area per direction (the listed ground-storey walls when the walls sheet
/// lists the building's walls and their areas are known, else the buildings row's cell,
/// blank = 0); infill area per direction (blank = 0). A blank cell of the storey row is not
/// compared. One warning per differing cell, on the storeys sheet's row.
fn storey_one_check(
    b: &BuildingRecord,
    st: &StoreyRecord,
    walls: Option<&(bool, [f64; 2], [bool; 2])>,
    pct: f64,
    out: &mut Vec<Problem>,
) {
    let wall = |i: usize, cell: Option<f64>| match walls {
        Some((true, sums, complete)) => complete[i].then_some(sums[i]),
        _ => Some(cell.unwrap_or(0.0)),
    };
    let pairs = [
        ("column_area_m2", st.column_area_m2, Some(b.column_area_m2)),
        (
            "rc_wall_area_x_m2",
            st.rc_wall_area_x_m2,
            wall(0, b.rc_wall_area_x_m2),
        ),
        (
            "rc_wall_area_y_m2",
            st.rc_wall_area_y_m2,
            wall(1, b.rc_wall_area_y_m2),
        ),
        (
            "infill_area_x_m2",
            st.infill_area_x_m2,
            Some(b.infill_area_x_m2.unwrap_or(0.0)),
        ),
        (
            "infill_area_y_m2",
            st.infill_area_y_m2,
            Some(b.infill_area_y_m2.unwrap_or(0.0)),
        ),
    ];
    for (col, row_value, building_value) in pairs {
        let (Some(v), Some(g)) = (row_value, building_value) else {
            continue;
        };
        let off = if g > 0.0 {
            (v - g).abs() / g * 100.0
        } else if v > 0.0 {
            f64::INFINITY
        } else {
            0.0
        };
        if off > pct {
            out.push(warning(
                "storeys",
                st.row,
                col,
                format!(
                    "expected storey 1 of \"{}\" to agree within {} % with the buildings row ({} m²), found {} m²; storey 1 is the buildings row (method §10)",
                    b.id,
                    format_number(pct),
                    format_number((g * 1e4).round() / 1e4),
                    format_number(v)
                ),
            ));
        }
    }
}

/// Spreadsheet rows as "22, 29" for messages that name every row of a repeated key.
fn join_rows(rows: &[usize]) -> String {
    rows.iter()
        .map(|r| r.to_string())
        .collect::<Vec<_>>()
        .join(", ")
}
