//! Verification: the max-occupants budget plan (method §12).
//!
//! Reference: exhaustive enumeration of every subset on the same rounded costs (the
//! definition of the 0/1 knapsack optimum), with the tie-break of method §12 (lower cost,
//! then the set holding the best-ranked building where the sets differ) implemented
//! independently here on bit masks. Exact comparison: costs are whole numbers, so every
//! sum is exact in f64 and the sets must agree exactly.

use proptest::prelude::*;
use seistriage::retrofit::budget::{
    Item, capacity_steps, cost_step, plans, priority_walk, rounded_steps,
};

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

/// Exhaustive enumeration: the best set of class 1–2 items whose rounded costs fit,
/// returned as ascending positions in `items`.
fn brute_force(items: &[Item], budget: f64, resolution: f64) -> Vec<usize> {
    let step = cost_step(budget, resolution);
    let capacity = capacity_steps(resolution);
    // eligible items: class 1–2 with a rounded cost that can fit
    let el: Vec<(usize, u64)> = items
        .iter()
        .enumerate()
        .filter(|(_, it)| it.life_safety)
        .filter_map(|(k, it)| rounded_steps(it.cost, step, capacity).map(|w| (k, w)))
        .collect();
    let n = el.len();
    let size = 1usize << n;
    let mut w = vec![0u64; size];
    let mut c = vec![0f64; size];
    let mut o = vec![0u64; size];
    let mut best: usize = 0;
    for mask in 1..size {
        let low = mask.trailing_zeros() as usize;
        let prev = mask & (mask - 1);
        let (k, wk) = el[low];
        w[mask] = w[prev] + wk;
        c[mask] = c[prev] + items[k].cost;
        o[mask] = o[prev] + items[k].occupants;
        if w[mask] > capacity {
            continue;
        }
        let better = if o[mask] != o[best] {
            o[mask] > o[best]
        } else if c[mask] != c[best] {
            c[mask] < c[best]
        } else {
            // bit i = position el[i], ascending with rank: the lowest differing bit is the
            // best-ranked building on which the sets differ
            let diff = mask ^ best;
            diff != 0 && mask & (diff & diff.wrapping_neg()) != 0
        };
        if better {
            best = mask;
        }
    }
    (0..n)
        .filter(|i| best & (1 << i) != 0)
        .map(|i| el[i].0)
        .collect()
}

fn portfolio() -> impl Strategy<Value = (Vec<Item>, f64, f64)> {
    (
        prop::collection::vec((0u32..60, 0u64..120, prop::bool::weighted(0.8)), 0..=18),
        0u32..300,
        prop::sample::select(vec![3.0, 7.0, 10.0, 25.0, 100.0, 2000.0]),
    )
        .prop_map(|(raw, budget, res)| {
            let items = raw
                .into_iter()
                .enumerate()
                .map(|(k, (c, o, ls))| item(k + 1, f64::from(c), o, ls))
                .collect();
            (items, f64::from(budget), res)
        })
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(96))]

    /// Method §12: the knapsack equals brute force on the same rounded costs, and the
    /// reported max-occupants plan never protects fewer occupants than the walk.
    #[test]
    fn knapsack_equals_exhaustive_enumeration((items, budget, res) in portfolio()) {
        let p = plans(&items, budget, res);
        let reference = brute_force(&items, budget, res);
        prop_assert_eq!(&p.knapsack.members, &reference);
        prop_assert!(p.best.occupants >= p.walk.occupants);
        prop_assert!(p.best.occupants >= p.knapsack.occupants);
        // every reported set fits the real budget
        prop_assert!(p.best.cost <= budget + 1e-9);
        prop_assert!(p.walk.cost <= budget + 1e-9);
    }

    /// With real-valued costs ties are not exact, so only the optimum's occupants are
    /// compared with exhaustive enumeration.
    #[test]
    fn knapsack_optimum_occupants_with_real_costs(
        raw in prop::collection::vec((0.0f64..60.0, 0u64..120), 0..=14),
        budget in 0.0f64..300.0,
    ) {
        let items: Vec<Item> = raw.into_iter().enumerate()
            .map(|(k, (c, o))| item(k + 1, c, o, true)).collect();
        let p = plans(&items, budget, 50.0);
        let reference = brute_force(&items, budget, 50.0);
        let ref_occ: u64 = reference.iter().map(|&k| items[k].occupants).sum();
        prop_assert_eq!(p.knapsack.occupants, ref_occ);
        prop_assert!(p.best.occupants >= p.walk.occupants);
    }
}

/// Hand-worked example. Budget 1000, knapsack_resolution 10 → step 100.
/// Buildings in rank order (cost, occupants, class): B1 450/40/1 (5 steps), B2 320/35/1
/// (4), B3 300/30/2 (3), B4 240/25/2 (3), B5 180/5/3 (class 3: not in the knapsack).
/// Walk: B1 (550 left), B2 (230 left), B3 skipped, B4 skipped, B5 (50 left) → cost 950,
/// occupants protected 40 + 35 = 75 (B5 is class 3).
/// Knapsack within 10 steps: {B1,B2} 9 steps 75; {B1,B3} 70; {B1,B4} 65; {B2,B3,B4}
/// 10 steps 90 (cost 860); no other set fits with more → {B2,B3,B4}, 90 occupants.
#[test]
fn hand_worked_example() {
    let items = vec![
        item(1, 450.0, 40, true),
        item(2, 320.0, 35, true),
        item(3, 300.0, 30, true),
        item(4, 240.0, 25, true),
        item(5, 180.0, 5, false),
    ];
    let walk = priority_walk(&items, 1000.0);
    assert_eq!(walk.members, vec![0, 1, 4]);
    assert_eq!(walk.cost, 950.0);
    assert_eq!(walk.occupants, 75);
    let p = plans(&items, 1000.0, 10.0);
    assert_eq!(p.best.members, vec![1, 2, 3]);
    assert_eq!(p.best.cost, 860.0);
    assert_eq!(p.best.occupants, 90);
    assert_eq!(brute_force(&items, 1000.0, 10.0), vec![1, 2, 3]);
}

/// Hand-worked tie-break: budget 6, resolution 6 (step 1). B1 cost 6 / 10 occupants,
/// B2 cost 3 / 5, B3 cost 3 / 5, B4 cost 2 / 10. Best occupants 15: {B1} is 10; {B2,B4},
/// {B3,B4} cost 5 → 15; {B4, B2 or B3} tie on occupants and cost → better ranks: the sets
/// differ at B2 (rank 2) vs B3 → {B2,B4}.
#[test]
fn hand_worked_tie_break() {
    let items = vec![
        item(1, 6.0, 10, true),
        item(2, 3.0, 5, true),
        item(3, 3.0, 5, true),
        item(4, 2.0, 10, true),
    ];
    let p = plans(&items, 6.0, 6.0);
    assert_eq!(p.knapsack.members, vec![1, 3]);
    assert_eq!(p.best.occupants, 15);
    // the walk funds B1 only (10 occupants)
    assert_eq!(p.walk.members, vec![0]);
}
