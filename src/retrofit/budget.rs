/*!
The budget plan (`method.md` §12): a funding walk down the priority order, and the 0/1
knapsack that protects the most occupants of class 1–2 buildings within the same budget.

Both plans work on [`Item`]s: one per building that has a retrofit and a funding cost (its
retrofit cost, or its replacement cost where replacement is recommended), in rank order.

Order between two funded sets (used by the knapsack and to choose between the knapsack's
set and the walk's): more occupants protected first; then the lower total cost; then the
better ranks, defined as: walk both sets in rank order, and the set that holds the
best-ranked building on which the two sets differ wins. This is a total order on sets, so
the answer is unique.
*/

use std::cmp::Ordering;

use crate::results::FundingPlan;

/// Relative slack when testing whether a cost fits the remaining budget, so that costs
/// which add up to the budget exactly are not refused for floating-point noise. A numeric
/// guard, not an engineering coefficient.
pub const FIT_RELATIVE_SLACK: f64 = 1e-12;

/// Relative slack when rounding a cost up to whole knapsack steps: a cost that is a whole
/// number of steps up to floating-point noise counts as that number. A numeric guard.
pub const STEP_RELATIVE_SLACK: f64 = 1e-9;

/// One building in the budget plan.
#[derive(Debug, Clone, PartialEq)]
pub struct Item {
    /// The caller's index of the building (e.g. its position in the results).
    pub index: usize,
    /// Its id.
    pub id: String,
    /// Its rank (1 = highest priority).
    pub rank: usize,
    /// Funding cost: replacement cost where replacement is recommended, else retrofit cost.
    pub cost: f64,
    /// Occupants (missing = 0).
    pub occupants: u64,
    /// True for classes 1–2: only these count as occupants protected and enter the
    /// knapsack.
    pub life_safety: bool,
}

/// A set of funded items, as positions in the item list (ascending = rank order).
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Selection {
    /// Positions in the item list, ascending.
    pub members: Vec<usize>,
    /// Total cost, summed in rank order.
    pub cost: f64,
    /// Occupants of members in classes 1–2.
    pub occupants: u64,
}

impl Selection {
    /// The selection of `members` (positions, any order) of `items`.
    pub fn of(items: &[Item], mut members: Vec<usize>) -> Self {
        members.sort_unstable();
        members.dedup();
        let mut cost = 0.0;
        let mut occupants = 0u64;
        for &m in &members {
            if let Some(it) = items.get(m) {
                cost += it.cost;
                if it.life_safety {
                    occupants = occupants.saturating_add(it.occupants);
                }
            }
        }
        Selection {
            members,
            cost,
            occupants,
        }
    }
}

/// Rank order between two sets given as ascending positions: `Less` when `a` holds the
/// best-ranked item on which the sets differ.
pub fn compare_ranks(a: &[usize], b: &[usize]) -> Ordering {
    let (mut i, mut j) = (0, 0);
    loop {
        match (a.get(i), b.get(j)) {
            (None, None) => return Ordering::Equal,
            (Some(_), None) => return Ordering::Less,
            (None, Some(_)) => return Ordering::Greater,
            (Some(x), Some(y)) => match x.cmp(y) {
                Ordering::Equal => {
                    i += 1;
                    j += 1;
                }
                Ordering::Less => return Ordering::Less,
                Ordering::Greater => return Ordering::Greater,
            },
        }
    }
}

/// The order of the module doc: `Less` when `a` is the better set (more occupants, then
/// lower cost, then better ranks).
pub fn compare_selections(a: &Selection, b: &Selection) -> Ordering {
    b.occupants
        .cmp(&a.occupants)
        .then(a.cost.total_cmp(&b.cost))
        .then_with(|| compare_ranks(&a.members, &b.members))
}

/// True when `cost` still fits: `spent + cost ≤ budget` (up to [`FIT_RELATIVE_SLACK`]).
pub fn fits(spent: f64, cost: f64, budget: f64) -> bool {
    spent + cost <= budget + budget.abs() * FIT_RELATIVE_SLACK
}

/// Priority walk (method §12): in rank order, fund each item whose cost still fits the
/// remaining budget; one that does not fit is skipped and the walk goes on.
pub fn priority_walk(items: &[Item], budget: f64) -> Selection {
    let mut spent = 0.0;
    let mut members = Vec::new();
    for (k, it) in items.iter().enumerate() {
        if it.cost.is_finite() && fits(spent, it.cost, budget) {
            spent += it.cost;
            members.push(k);
        }
    }
    Selection::of(items, members)
}

/// Knapsack cost step = budget / `knapsack_resolution` (method §12).
pub fn cost_step(budget: f64, resolution: f64) -> f64 {
    budget / resolution
}

/// Knapsack capacity in steps: ⌊`knapsack_resolution`⌋ (the budget is that many steps).
pub fn capacity_steps(resolution: f64) -> u64 {
    if resolution.is_finite() && resolution >= 1.0 {
        resolution.floor() as u64
    } else {
        0
    }
}

/// Most steps of the knapsack capacity: the programme keeps two numbers per step (16 bytes).
/// A memory guard, not an engineering coefficient (the default resolution is 2000).
pub const MAX_CAPACITY_STEPS: f64 = 1_000_000.0;

/// Most cells (items × steps) of the knapsack's choice table, one bit each (32 MB). A
/// memory guard, not an engineering coefficient.
pub const MAX_TABLE_CELLS: f64 = 268_435_456.0;

/// The resolution actually used: `knapsack_resolution`, reduced only where `n` items at
/// that resolution would pass [`MAX_CAPACITY_STEPS`] or [`MAX_TABLE_CELLS`] (the method
/// text then says so).
pub fn bounded_resolution(resolution: f64, n: usize) -> f64 {
    let by_cells = (MAX_TABLE_CELLS / (n.max(1) as f64)).floor();
    resolution.min(MAX_CAPACITY_STEPS).min(by_cells.max(1.0))
}

/// A cost rounded UP to whole steps (method §12); `None` when it cannot fit the capacity
/// (or is not a number). A cost of 0 (or less) takes 0 steps.
pub fn rounded_steps(cost: f64, step: f64, capacity: u64) -> Option<u64> {
    if cost <= 0.0 {
        return Some(0);
    }
    let q = cost / step;
    if !q.is_finite() {
        return None;
    }
    let near = q.round();
    let steps = if (q - near).abs() <= STEP_RELATIVE_SLACK * q.max(1.0) {
        near
    } else {
        q.ceil()
    };
    if steps <= capacity as f64 {
        Some(steps as u64)
    } else {
        None
    }
}

/// One item of the knapsack: rounded cost in steps (`None` = cannot fit), real cost and
/// value (occupants).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct KnapsackItem {
    /// Rounded cost in steps.
    pub steps: Option<u64>,
    /// Real cost (tie-break).
    pub cost: f64,
    /// Occupants (value).
    pub occupants: u64,
}

/// Exact 0/1 knapsack by dynamic programming (method §12): the set of `items` (given in
/// rank order) whose rounded costs sum to at most `capacity` steps and that is best in the
/// order of the module doc (most occupants, then lowest real cost, then best ranks).
/// Returns positions in `items`, ascending.
///
/// The programme runs over suffixes: f(i, c) is the best subset of items i.. within c
/// steps; f(i, c) = better of f(i+1, c) and {i} ∪ f(i+1, c − w_i). Among sets with equal
/// occupants and cost the one holding item i wins (i is then the best-ranked item on which
/// they differ), so the rank tie-break needs no extra state. Time O(n·C), memory O(n·C)
/// bits for the choices, C = min(capacity, Σ w_i).
pub fn knapsack(items: &[KnapsackItem], capacity: u64) -> Vec<usize> {
    let total: u64 = items
        .iter()
        .filter_map(|it| it.steps)
        .fold(0u64, |a, w| a.saturating_add(w));
    let cap = usize::try_from(capacity.min(total)).unwrap_or(usize::MAX);
    let width = cap + 1;
    let words = width.div_ceil(64);
    let n = items.len();
    let mut take = vec![0u64; n * words];
    // best[c] = (occupants, cost) of f(i+1, c), updated in place for i.
    let mut best: Vec<(u64, f64)> = vec![(0, 0.0); width];
    for i in (0..n).rev() {
        let it = &items[i];
        let Some(w) = it.steps.and_then(|w| usize::try_from(w).ok()) else {
            continue;
        };
        if w > cap || !it.cost.is_finite() {
            continue;
        }
        for c in (w..=cap).rev() {
            let (o, k) = best[c - w];
            let cand = (o.saturating_add(it.occupants), k + it.cost);
            let cur = best[c];
            if cand.0 > cur.0 || (cand.0 == cur.0 && cand.1 <= cur.1) {
                best[c] = cand;
                take[i * words + c / 64] |= 1u64 << (c % 64);
            }
        }
    }
    let mut out = Vec::new();
    let mut c = cap;
    for (i, it) in items.iter().enumerate() {
        if take[i * words + c / 64] & (1u64 << (c % 64)) != 0 {
            out.push(i);
            let w = it.steps.and_then(|w| usize::try_from(w).ok()).unwrap_or(0);
            c -= w;
        }
    }
    out
}

/// Both plans for a list of items in rank order (method §12).
#[derive(Debug, Clone, PartialEq)]
pub struct Plans {
    /// The priority walk.
    pub walk: Selection,
    /// The knapsack's own set (before comparing with the walk).
    pub knapsack: Selection,
    /// The max-occupants plan reported: the better of the knapsack's set and the walk's.
    pub best: Selection,
    /// How `best` was found, in plain words.
    pub method: String,
}

/// The walk, the knapsack over the class 1–2 items, and the better of the two as the
/// max-occupants plan. `items` must be in rank order.
pub fn plans(items: &[Item], budget: f64, resolution: f64) -> Plans {
    let walk = priority_walk(items, budget);
    let eligible: Vec<usize> = (0..items.len())
        .filter(|&k| items[k].life_safety && items[k].cost.is_finite())
        .collect();
    let used = bounded_resolution(resolution, eligible.len());
    let step = cost_step(budget, used);
    let capacity = capacity_steps(used);
    let ks: Vec<KnapsackItem> = eligible
        .iter()
        .map(|&k| KnapsackItem {
            steps: rounded_steps(items[k].cost, step, capacity),
            cost: items[k].cost,
            occupants: items[k].occupants,
        })
        .collect();
    let chosen: Vec<usize> = knapsack(&ks, capacity)
        .into_iter()
        .filter_map(|p| eligible.get(p).copied())
        .collect();
    let knapsack_sel = Selection::of(items, chosen);
    let reduced = if used < resolution {
        format!(
            " (knapsack_resolution {resolution} reduced to {used} to bound the programme's memory)"
        )
    } else {
        String::new()
    };
    let dp_method = format!(
        "exact 0/1 knapsack (dynamic programme) over the class 1–2 buildings with a cost, maximising occupants; costs rounded up to steps of {step} (budget / knapsack_resolution){reduced}; ties: lower cost, then the set holding the best-ranked building where the sets differ"
    );
    let (best, method) = match compare_selections(&walk, &knapsack_sel) {
        Ordering::Less => {
            let why = if walk.occupants > knapsack_sel.occupants {
                "it protects more occupants than the knapsack optimum on rounded costs (rounding costs up can exclude a set that fits)"
            } else if walk.cost < knapsack_sel.cost {
                "it protects as many occupants as the knapsack optimum at a lower cost"
            } else {
                "it protects as many occupants at the same cost with better-ranked buildings"
            };
            (walk.clone(), format!("priority walk's set: {why}"))
        }
        _ => (knapsack_sel.clone(), dp_method),
    };
    Plans {
        walk,
        knapsack: knapsack_sel,
        best,
        method,
    }
}

/// A [`FundingPlan`] (ids in rank order) from a selection.
pub fn funding_plan(items: &[Item], sel: &Selection, method: Option<String>) -> FundingPlan {
    FundingPlan {
        funded: sel
            .members
            .iter()
            .filter_map(|&m| items.get(m).map(|it| it.id.clone()))
            .collect(),
        cost: sel.cost,
        occupants_protected: sel.occupants,
        method,
        expected_occupants_protected: None,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn item(rank: usize, cost: f64, occupants: u64, life_safety: bool) -> Item {
        Item {
            index: rank - 1,
            id: format!("B{rank}"),
            rank,
            cost,
            occupants,
            life_safety,
        }
    }

    #[test]
    fn walk_skips_what_does_not_fit_and_keeps_walking() {
        let items = vec![
            item(1, 60.0, 10, true),
            item(2, 50.0, 100, true), // 60 + 50 > 100: skipped
            item(3, 40.0, 5, true),   // 60 + 40 = 100: fits exactly
            item(4, 1.0, 5, true),    // nothing left
        ];
        let w = priority_walk(&items, 100.0);
        assert_eq!(w.members, vec![0, 2]);
        assert_eq!(w.cost, 100.0);
        assert_eq!(w.occupants, 15);
    }

    #[test]
    fn walk_counts_only_class_1_2_occupants() {
        let items = vec![item(1, 10.0, 10, true), item(2, 10.0, 99, false)];
        let w = priority_walk(&items, 100.0);
        assert_eq!(w.members, vec![0, 1]);
        assert_eq!(w.occupants, 10);
    }

    #[test]
    fn rounding_up_with_noise_guard() {
        // step = 100 / 2000 = 0.05
        let step = cost_step(100.0, 2000.0);
        assert_eq!(rounded_steps(0.05, step, 2000), Some(1));
        assert_eq!(rounded_steps(0.051, step, 2000), Some(2));
        assert_eq!(rounded_steps(100.0, step, 2000), Some(2000));
        assert_eq!(rounded_steps(100.01, step, 2000), None);
        assert_eq!(rounded_steps(0.0, step, 2000), Some(0));
        // zero budget: only zero costs fit
        assert_eq!(rounded_steps(1.0, cost_step(0.0, 2000.0), 2000), None);
    }

    #[test]
    fn hand_worked_knapsack() {
        // Hand-worked example (budget 10, resolution 10 → step 1):
        // A rank 1: cost 6, 30 occupants; B rank 2: cost 5, 20; C rank 3: cost 5, 20.
        // Walk: A (6), B does not fit (11), C does not fit → 30 occupants.
        // Knapsack: {B, C} cost 10 → 40 occupants (best); {A} 30; {A,B} infeasible.
        let items = vec![
            item(1, 6.0, 30, true),
            item(2, 5.0, 20, true),
            item(3, 5.0, 20, true),
        ];
        let p = plans(&items, 10.0, 10.0);
        assert_eq!(p.walk.members, vec![0]);
        assert_eq!(p.best.members, vec![1, 2]);
        assert_eq!(p.best.occupants, 40);
        assert!(p.method.starts_with("exact 0/1 knapsack"));
    }

    #[test]
    fn ties_go_to_lower_cost_then_better_ranks() {
        // B1 (rank1) cost 4, 10 occ; B2 cost 3, 10 occ; B3 cost 3, 10 occ; budget 4.
        // Any single building protects 10; lower cost → B2 or B3 (3); better rank → B2.
        let items = vec![
            item(1, 4.0, 10, true),
            item(2, 3.0, 10, true),
            item(3, 3.0, 10, true),
        ];
        let p = plans(&items, 4.0, 4.0);
        assert_eq!(p.knapsack.members, vec![1]);
        // the walk funds B1 (cost 4): same occupants, higher cost → knapsack kept
        assert_eq!(p.walk.members, vec![0]);
        assert_eq!(p.best.members, vec![1]);
        // equal cost everywhere → best rank wins
        let items = vec![
            item(1, 3.0, 10, true),
            item(2, 3.0, 10, true),
            item(3, 3.0, 10, true),
        ];
        let p = plans(&items, 4.0, 4.0);
        assert_eq!(p.knapsack.members, vec![0]);
    }

    #[test]
    fn rank_order_of_sets() {
        assert_eq!(compare_ranks(&[0, 5], &[1, 2]), Ordering::Less);
        assert_eq!(compare_ranks(&[1, 2], &[1, 3]), Ordering::Less);
        assert_eq!(compare_ranks(&[1, 2], &[1, 2, 3]), Ordering::Greater);
        assert_eq!(compare_ranks(&[1, 2], &[1, 2]), Ordering::Equal);
    }

    #[test]
    fn walk_set_reported_when_rounding_excludes_it() {
        // step = 10/3: costs 5 → 2 steps each (6.67 > 5); capacity 3 → only one fits in
        // the knapsack, but the walk funds both (10 ≤ 10).
        let items = vec![item(1, 5.0, 10, true), item(2, 5.0, 10, true)];
        let p = plans(&items, 10.0, 3.0);
        assert_eq!(p.knapsack.occupants, 10);
        assert_eq!(p.walk.occupants, 20);
        assert_eq!(p.best.members, vec![0, 1]);
        assert!(p.method.starts_with("priority walk's set"), "{}", p.method);
    }

    #[test]
    fn resolution_is_bounded_only_when_huge() {
        assert_eq!(bounded_resolution(2000.0, 100_000), 2000.0);
        assert_eq!(bounded_resolution(1e12, 1), MAX_CAPACITY_STEPS);
        assert_eq!(
            bounded_resolution(1e6, 1_000),
            (MAX_TABLE_CELLS / 1000.0).floor()
        );
        let items = vec![item(1, 5.0, 10, true), item(2, 5.0, 10, true)];
        let p = plans(&items, 10.0, 1e15);
        assert_eq!(p.knapsack.members, vec![0, 1]);
        assert!(p.method.contains("reduced to"), "{}", p.method);
    }

    #[test]
    fn knapsack_ignores_class_3_4_items() {
        let items = vec![item(1, 1.0, 1000, false), item(2, 1.0, 1, true)];
        let p = plans(&items, 1.0, 10.0);
        assert_eq!(p.knapsack.members, vec![1]);
        assert_eq!(p.walk.members, vec![0]);
        assert_eq!(p.walk.occupants, 0);
        assert_eq!(p.best.members, vec![1]);
    }
}
