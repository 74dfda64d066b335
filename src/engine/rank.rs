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

/// Names of the four classes of method §11, most severe first (the contract's names).
pub const CLASS_NAMES: [&str; 4] = [
    "collapse-level deficit",
    "life-safety deficit",
    "damage-level deficit",
    "within screening limits",
];

/// The name of a class 1–4 ("" for anything else).
pub fn class_name(class: u8) -> &'static str {
    match class {
        1..=4 => CLASS_NAMES[usize::from(class - 1)],
        _ => "",
    }
}

/// The keys of the priority order (method §11) of one building, so that the order can be
/// applied to a compact row as well as to a [`BuildingResult`] (the streaming path of a large
/// stock ranks compact rows with exactly this order).
#[derive(Debug, Clone, Copy)]
pub struct RankKey<'a> {
    /// Class 1–4.
    pub class: u8,
    /// Score.
    pub score: f64,
    /// Occupants (missing = 0).
    pub occupants: u64,
    /// Smaller priority index of the two directions (%).
    pub min_pi_pct: f64,
    /// Building id.
    pub id: &'a str,
    /// Spreadsheet row (last tie-break: ids can repeat in rows that are screened apart).
    pub row: usize,
}

impl<'a> RankKey<'a> {
    /// The keys of a result.
    pub fn of(b: &'a BuildingResult) -> Self {
        RankKey {
            class: b.class,
            score: b.score,
            occupants: b.occupants.unwrap_or(0),
            min_pi_pct: b.min_priority_index_pct(),
            id: &b.id,
            row: b.row,
        }
    }
}

/// Priority order on keys (method §11): class ascending, score descending, occupants
/// descending (missing = 0), min PI ascending, id by UTF-8 bytes, then row.
pub fn key_order(a: &RankKey<'_>, b: &RankKey<'_>) -> Ordering {
    a.class
        .cmp(&b.class)
        .then_with(|| b.score.total_cmp(&a.score))
        .then_with(|| b.occupants.cmp(&a.occupants))
        .then_with(|| a.min_pi_pct.total_cmp(&b.min_pi_pct))
        .then_with(|| a.id.as_bytes().cmp(b.id.as_bytes()))
        .then_with(|| a.row.cmp(&b.row))
}

/// Priority order (method §11): class ascending, score descending, occupants descending
/// (missing = 0), min PI ascending, id by UTF-8 bytes.
pub fn priority_order(a: &BuildingResult, b: &BuildingResult) -> Ordering {
    key_order(&RankKey::of(a), &RankKey::of(b))
}

/// Sorts into priority order and numbers the ranks 1..N.
///
/// The order is found on references (a stable sort, so the same order as sorting the
/// results themselves) and then applied by following the permutation's cycles: each result
/// is moved at most once instead of O(N log N) times (a result is over a kilobyte; at
/// 1,000,000 buildings sorting them in place spent seconds moving memory).
pub fn rank(buildings: &mut [BuildingResult]) {
    let mut refs: Vec<(usize, &BuildingResult)> = buildings.iter().enumerate().collect();
    refs.sort_by(|a, b| priority_order(a.1, b.1));
    let order: Vec<usize> = refs.into_iter().map(|(i, _)| i).collect();
    apply_order(buildings, &order);
    for (i, b) in buildings.iter_mut().enumerate() {
        b.rank = i + 1;
    }
}

/// Rearranges `items` so that position k holds the item that was at `order[k]`
/// (`order` is a permutation of `0..items.len()`), with one swap per misplaced item.
pub fn apply_order<T>(items: &mut [T], order: &[usize]) {
    let mut done = vec![false; items.len()];
    for start in 0..items.len() {
        if done[start] {
            continue;
        }
        // The item of `start` travels along the cycle until the position that wants it.
        let mut k = start;
        loop {
            done[k] = true;
            let src = order[k];
            if src == start {
                break;
            }
            items.swap(k, src);
            k = src;
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn apply_order_moves_each_item_to_its_place() {
        // Permutations with fixed points, one long cycle and several short ones.
        for order in [
            vec![0, 1, 2, 3, 4, 5],
            vec![5, 4, 3, 2, 1, 0],
            vec![1, 2, 3, 4, 5, 0],
            vec![2, 0, 1, 3, 5, 4],
            vec![3, 1, 4, 0, 2, 5],
        ] {
            let mut items: Vec<char> = "abcdef".chars().collect();
            let want: Vec<char> = order.iter().map(|&i| items[i]).collect();
            apply_order(&mut items, &order);
            assert_eq!(items, want, "{order:?}");
        }
    }

    #[test]
    fn rank_equals_a_stable_sort_of_the_results() {
        let mut buildings: Vec<BuildingResult> = (0..200)
            .map(|i: usize| {
                // Few distinct keys, so that every tie-break of §11 (and the row) is used.
                BuildingResult {
                    id: format!("B{:03}", (i * 37) % 101),
                    name: String::new(),
                    district: String::new(),
                    use_: crate::model::Use::Residential,
                    occupants: (!i.is_multiple_of(3)).then_some(((i * 11) % 5) as u64),
                    latitude: None,
                    longitude: None,
                    fault: None,
                    rank: 0,
                    class: (1 + (i * 7) % 4) as u8,
                    score: ((i * 13) % 9) as f64 / 4.0,
                    governing: crate::results::Governing {
                        direction: crate::model::Dir::X,
                        group: crate::results::Group::Walls,
                        level: crate::settings::Level::Ls,
                        frame_alone: false,
                    },
                    axial_load_ratio: 0.1,
                    strength_coefficient: Default::default(),
                    directions: Default::default(),
                    flags: Vec::new(),
                    defaults_used: Vec::new(),
                    retrofit: None,
                    uncertainty: None,
                    row: i + 2,
                    detail: Default::default(),
                    walls: Vec::new(),
                }
            })
            .collect();
        let mut want = buildings.clone();
        want.sort_by(priority_order);
        rank(&mut buildings);
        let got: Vec<usize> = buildings.iter().map(|b| b.row).collect();
        let want: Vec<usize> = want.iter().map(|b| b.row).collect();
        assert_eq!(got, want);
        assert!(buildings.iter().enumerate().all(|(i, b)| b.rank == i + 1));
    }
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
