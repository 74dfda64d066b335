/*!
Method §11: classes and the deterministic priority order.
*/

use std::cmp::Ordering;

use crate::results::{BuildingResult, Levels};

/// Class from the governing DCRs (max over directions) at each level (method §11):
/// 1 CP ≥ 1, 2 LS ≥ 1, 3 IO ≥ 1, else 4; a short-column flag raises 3 or 4 to 2.
pub fn class(dcr: &Levels, short_column: bool) -> u8 {
    let c = if dcr.cp >= 1.0 {
        1
    } else if dcr.ls >= 1.0 {
        2
    } else if dcr.io >= 1.0 {
        3
    } else {
        4
    };
    if short_column { c.min(2) } else { c }
}

/// Plain-words name of a class.
pub fn class_name(class: u8) -> &'static str {
    match class {
        1 => "collapse-level deficit",
        2 => "life-safety deficit",
        3 => "damage-level deficit",
        _ => "within screening limits",
    }
}

/// Priority order (method §11): class ascending, score descending, occupants descending
/// (missing = 0), min PI ascending, id by UTF-8 bytes.
pub fn priority_order(a: &BuildingResult, b: &BuildingResult) -> Ordering {
    a.class
        .cmp(&b.class)
        .then_with(|| b.score.total_cmp(&a.score))
        .then_with(|| b.occupants.unwrap_or(0).cmp(&a.occupants.unwrap_or(0)))
        .then_with(|| {
            a.min_priority_index_pct()
                .total_cmp(&b.min_priority_index_pct())
        })
        .then_with(|| a.id.as_bytes().cmp(b.id.as_bytes()))
        .then_with(|| a.row.cmp(&b.row))
}

/// Sorts into priority order and numbers the ranks 1..N.
pub fn rank(buildings: &mut [BuildingResult]) {
    buildings.sort_by(priority_order);
    for (i, b) in buildings.iter_mut().enumerate() {
        b.rank = i + 1;
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn class_boundaries() {
        let l = |io, ls, cp| Levels { io, ls, cp };
        assert_eq!(class(&l(3.0, 2.0, 1.0), false), 1);
        assert_eq!(class(&l(3.0, 1.0, 0.99), false), 2);
        assert_eq!(class(&l(1.0, 0.9, 0.5), false), 3);
        assert_eq!(class(&l(0.99, 0.9, 0.5), false), 4);
        assert_eq!(class(&l(0.5, 0.4, 0.3), true), 2);
        assert_eq!(class(&l(3.0, 2.0, 1.0), true), 1);
    }
}
