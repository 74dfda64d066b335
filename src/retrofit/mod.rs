/*!
Retrofit sizing, cost and the budget plan (`method.md` §12).

- [`sizing`]: the added RC wall area per direction that brings DCR_LS to the target
  (bisection over the full screening method with the new walls as their own group);
- [`cost`]: retrofit and replacement cost, replace-instead recommendation;
- [`budget`]: the priority walk and the max-occupants knapsack.

Officials fund a list that fits a budget, not a ranking: this module turns the ranking into
such lists. Screening-level sizes and costs only: a retrofit is designed by a licensed
engineer after a detailed evaluation.
*/

pub mod budget;
pub mod cost;
pub mod sizing;

use std::collections::HashMap;

use rayon::prelude::*;

use crate::engine::{self, BuildingInput, NewWalls};
use crate::model::{Dir, PerDir};
use crate::results::{BudgetPlan, BuildingResult, Excluded, Retrofit};
use crate::settings::Settings;

/// Sizes the wall retrofit of every building that needs one and fills `retrofit` (method
/// §12): classes 1–2 and any building with DCR_LS above `retrofit_target_dcr`. Results are
/// matched to inputs by id (and spreadsheet row where ids repeat); `inputs` are in file
/// order, `results` in rank order. Costs are filled when all three unit costs are set.
pub fn size_all(results: &mut [BuildingResult], inputs: &[BuildingInput<'_>], settings: &Settings) {
    let mut by_id: HashMap<&str, Vec<&BuildingInput<'_>>> = HashMap::new();
    for i in inputs {
        by_id.entry(i.record.id.as_str()).or_default().push(i);
    }
    results.par_iter_mut().for_each(|r| {
        let input = by_id.get(r.id.as_str()).and_then(|cands| {
            cands
                .iter()
                .find(|i| i.record.row == r.row)
                .or_else(|| cands.first())
                .copied()
        });
        r.retrofit = size_one(r, input, settings);
    });
}

/// The engine as [`sizing::Rescreen`]: the building prepared once (§0 and its building-wide
/// terms), each bisection step re-running only the direction being sized
/// ([`engine::building::direction`]) — the same function the full screening runs, so the
/// DCR is the one a full re-screening gives (tested), for a fraction of the work; the check
/// with both directions' walls takes the storey codes from the directions' storey states
/// ([`engine::flags::storey_codes`]) instead of raising every flag (tested against the full
/// re-screening's flags).
pub struct Rescreener<'a> {
    /// The prepared building.
    pub prepared: engine::building::PreparedBuilding<'a>,
    /// Settings.
    pub settings: &'a Settings,
}

impl sizing::Rescreen for Rescreener<'_> {
    fn screen(&self, new: &NewWalls) -> Result<BuildingResult, Vec<String>> {
        engine::screen_building_with(self.prepared.input, self.settings, new)
    }

    fn dcr_ls(&self, d: Dir, area: f64) -> Result<f64, Vec<String>> {
        let (result, _, _) = engine::building::direction(&self.prepared, self.settings, d, area);
        Ok(result.dcr.ls)
    }

    fn after(
        &self,
        new: &NewWalls,
    ) -> Result<(PerDir<f64>, Vec<crate::results::FlagCode>), Vec<String>> {
        let mut dcr = PerDir { x: 0.0, y: 0.0 };
        let mut states: PerDir<Option<engine::flags::StoreyState>> = PerDir::default();
        for d in Dir::BOTH {
            let (result, _, state) =
                engine::building::direction(&self.prepared, self.settings, d, *new.area_m2.get(d));
            *dcr.get_mut(d) = result.dcr.ls;
            states.get_mut(d).replace(state);
        }
        Ok((dcr, engine::flags::storey_codes(&states)))
    }
}

/// Sizes and costs one building; `input` `None` reports the sizing as failed.
fn size_one(
    r: &BuildingResult,
    input: Option<&BuildingInput<'_>>,
    settings: &Settings,
) -> Option<crate::results::Retrofit> {
    let prepared = input.and_then(|i| engine::building::prepare(i, settings).ok());
    let mut rf = match prepared {
        Some(prepared) => sizing::size_building(r, settings, Rescreener { prepared, settings }),
        None => sizing::size_building(r, settings, |new: &NewWalls| match input {
            Some(i) => engine::screen_building_with(i, settings, new),
            None => Err(vec![format!("no input found for building {}", r.id)]),
        }),
    }?;
    cost::apply(
        &mut rf,
        r.detail.height_m,
        r.detail.floor_area_m2,
        r.detail.plan_area_m2,
        settings,
    );
    Some(rf)
}

/// Why no budget plan can be made although a budget is set: the unit costs that are
/// missing (method §12: "a budget plan cannot be made (say so)"). `None` when there is no
/// budget or all three unit costs are set.
pub fn budget_plan_unavailable(settings: &Settings) -> Option<String> {
    settings.budget?;
    let missing = cost::missing_unit_costs(settings);
    if missing.is_empty() {
        return None;
    }
    Some(format!(
        "no budget plan: it needs unit_cost_wall_m3, unit_cost_floor_m2 and replacement_cost_m2 (missing: {}); retrofit wall areas are still sized",
        missing.join(", ")
    ))
}

/// Makes the budget plan (priority walk and max-occupants knapsack, method §12) and marks
/// `funded` (walk) and `funded_best` (max-occupants plan) on every retrofit. `None` without
/// a budget or without all three unit costs (see [`budget_plan_unavailable`]).
pub fn budget_plan<T: Fundable>(results: &mut [T], settings: &Settings) -> Option<BudgetPlan> {
    let amount = settings.budget?;
    cost::UnitCosts::from_settings(settings)?;
    let mut order: Vec<usize> = (0..results.len())
        .filter(|&i| results[i].retrofit().is_some())
        .collect();
    order.sort_by_key(|&i| (results[i].rank(), i));
    let items: Vec<budget::Item> = order
        .iter()
        .filter_map(|&i| {
            let r = &results[i];
            let c = cost::funding_cost(r.retrofit()?)?;
            if cost::unfunded_reason(r.retrofit()?, settings).is_some() {
                return None;
            }
            Some(budget::Item {
                index: i,
                id: r.id().to_string(),
                rank: r.rank(),
                cost: c,
                occupants: r.occupants().unwrap_or(0),
                life_safety: matches!(r.class(), 1 | 2),
            })
        })
        .collect();
    let mut excluded: Vec<Excluded> = Vec::new();
    for &i in &order {
        let r = &mut results[i];
        let id = r.id().to_string();
        let Some(rf) = r.retrofit_mut() else { continue };
        rf.excluded = cost::unfunded_reason(rf, settings);
        if let Some(reason) = &rf.excluded {
            excluded.push(Excluded {
                id,
                reason: reason.clone(),
            });
        }
    }
    let plans = budget::plans(&items, amount, settings.knapsack_resolution);
    for r in results.iter_mut() {
        if let Some(rf) = r.retrofit_mut() {
            rf.funded = Some(false);
            rf.funded_best = Some(false);
        }
    }
    for (sel, best) in [(&plans.walk, false), (&plans.best, true)] {
        for &m in &sel.members {
            let Some(it) = items.get(m) else { continue };
            if let Some(rf) = results.get_mut(it.index).and_then(|r| r.retrofit_mut()) {
                if best {
                    rf.funded_best = Some(true);
                } else {
                    rf.funded = Some(true);
                }
            }
        }
    }
    Some(BudgetPlan {
        budget: amount,
        priority_walk: budget::funding_plan(&items, &plans.walk, None),
        max_occupants: budget::funding_plan(&items, &plans.best, Some(plans.method)),
        excluded,
    })
}

/// What the budget plan needs of a ranked building: a [`BuildingResult`], or the compact row
/// of the streaming path of a large stock.
pub trait Fundable {
    /// Rank 1..N.
    fn rank(&self) -> usize;
    /// Building id.
    fn id(&self) -> &str;
    /// Occupants.
    fn occupants(&self) -> Option<u64>;
    /// Class 1–4.
    fn class(&self) -> u8;
    /// The sized retrofit.
    fn retrofit(&self) -> Option<&Retrofit>;
    /// The sized retrofit, to mark it funded.
    fn retrofit_mut(&mut self) -> Option<&mut Retrofit>;
}

impl Fundable for BuildingResult {
    fn rank(&self) -> usize {
        self.rank
    }
    fn id(&self) -> &str {
        &self.id
    }
    fn occupants(&self) -> Option<u64> {
        self.occupants
    }
    fn class(&self) -> u8 {
        self.class
    }
    fn retrofit(&self) -> Option<&Retrofit> {
        self.retrofit.as_ref()
    }
    fn retrofit_mut(&mut self) -> Option<&mut Retrofit> {
        self.retrofit.as_mut()
    }
}

/// Ids funded by one plan and not by the other: (walk only, max-occupants only), in rank
/// order ("report how it differs from the walk", method §12).
pub fn plan_differences(plan: &BudgetPlan) -> (Vec<String>, Vec<String>) {
    let walk = &plan.priority_walk.funded;
    let best = &plan.max_occupants.funded;
    (
        walk.iter()
            .filter(|id| !best.contains(id))
            .cloned()
            .collect(),
        best.iter()
            .filter(|id| !walk.contains(id))
            .cloned()
            .collect(),
    )
}

/// Builders of synthetic results for unit tests.
#[cfg(test)]
pub(crate) mod test_support {
    use crate::model::{Dir, PerDir, Use};
    use crate::results::{BuildingResult, Governing, Group};
    use crate::settings::Level;

    /// A screened building of `class` with DCR_LS per direction, A_fl and H.
    pub(crate) fn result_with(
        class: u8,
        dcr_x: f64,
        dcr_y: f64,
        floor_area_m2: f64,
        height_m: f64,
    ) -> BuildingResult {
        let mut r = BuildingResult {
            id: "T1".into(),
            name: String::new(),
            district: String::new(),
            use_: Use::Residential,
            occupants: Some(10),
            latitude: None,
            longitude: None,
            fault: None,
            rank: 1,
            class,
            score: dcr_x.max(dcr_y),
            governing: Governing {
                direction: Dir::X,
                group: Group::Walls,
                level: Level::Ls,
                frame_alone: false,
            },
            axial_load_ratio: 0.1,
            strength_coefficient: PerDir { x: 0.2, y: 0.2 },
            directions: PerDir::default(),
            flags: Vec::new(),
            defaults_used: Vec::new(),
            retrofit: None,
            uncertainty: None,
            row: 2,
            detail: Default::default(),
            walls: Vec::new(),
        };
        r.directions.x.dcr.ls = dcr_x;
        r.directions.y.dcr.ls = dcr_y;
        r.detail.floor_area_m2 = floor_area_m2;
        r.detail.height_m = height_m;
        r
    }
}

#[cfg(test)]
mod tests {
    use super::test_support::result_with;
    use super::*;
    use crate::model::PerDir;
    use crate::results::Retrofit;

    fn priced(budget: f64) -> Settings {
        Settings {
            unit_cost_wall_m3: Some(1000.0),
            unit_cost_floor_m2: Some(10.0),
            replacement_cost_m2: Some(500.0),
            budget: Some(budget),
            knapsack_resolution: 100.0,
            ..Settings::default()
        }
    }

    fn with_retrofit(rank: usize, class: u8, occ: u64, cost: f64) -> BuildingResult {
        let mut r = result_with(class, 1.5, 0.5, 1000.0, 9.0);
        r.id = format!("B{rank}");
        r.rank = rank;
        r.occupants = Some(occ);
        r.retrofit = Some(Retrofit {
            added_wall_area_m2: PerDir {
                x: Some(1.0),
                y: Some(0.0),
            },
            cost: Some(cost),
            replacement_cost: Some(500_000.0),
            replace: Some(false),
            ..Retrofit::default()
        });
        r
    }

    #[test]
    fn budget_plan_marks_funded_and_best() {
        let mut rs = vec![
            with_retrofit(1, 1, 10, 60.0),
            with_retrofit(2, 2, 20, 50.0),
            with_retrofit(3, 2, 20, 50.0),
        ];
        let plan = budget_plan(&mut rs, &priced(100.0)).unwrap();
        assert_eq!(plan.priority_walk.funded, vec!["B1"]);
        assert_eq!(plan.max_occupants.funded, vec!["B2", "B3"]);
        assert_eq!(plan.max_occupants.occupants_protected, 40);
        let f: Vec<_> = rs
            .iter()
            .map(|r| {
                let rf = r.retrofit.as_ref().unwrap();
                (rf.funded, rf.funded_best)
            })
            .collect();
        assert_eq!(
            f,
            vec![
                (Some(true), Some(false)),
                (Some(false), Some(true)),
                (Some(false), Some(true))
            ]
        );
        let (walk_only, best_only) = plan_differences(&plan);
        assert_eq!(walk_only, vec!["B1"]);
        assert_eq!(best_only, vec!["B2", "B3"]);
    }

    #[test]
    fn unpriced_column_remedy_and_nothing_to_fund_are_excluded_from_both_plans() {
        // B2: captive columns, no unit_cost_short_column_m2 → cost and replace null;
        // B3: no walls, no remedy → cost 0, nothing to fund. Both listed in `excluded`,
        // neither funded although the budget would hold them.
        let mut rs = vec![
            with_retrofit(1, 1, 10, 60.0),
            with_retrofit(2, 2, 500, 0.0),
            with_retrofit(3, 2, 400, 0.0),
        ];
        if let Some(rf) = rs[1].retrofit.as_mut() {
            rf.column_remedy = true;
            rf.cost = None;
            rf.replace = None;
        }
        let plan = budget_plan(&mut rs, &priced(1000.0)).unwrap();
        assert_eq!(plan.priority_walk.funded, vec!["B1"]);
        assert_eq!(plan.max_occupants.funded, vec!["B1"]);
        let ex: Vec<&str> = plan.excluded.iter().map(|e| e.id.as_str()).collect();
        assert_eq!(ex, vec!["B2", "B3"]);
        assert!(
            plan.excluded[0]
                .reason
                .contains("unit_cost_short_column_m2")
        );
        assert!(plan.excluded[1].reason.starts_with("nothing to fund"));
        assert_eq!(
            rs[1].retrofit.as_ref().unwrap().excluded,
            Some(plan.excluded[0].reason.clone())
        );
        assert_eq!(rs[0].retrofit.as_ref().unwrap().excluded, None);
        let json = serde_json::to_value(&plan).unwrap();
        assert_eq!(json["excluded"][0]["id"], "B2");
        assert!(json["excluded"][0]["reason"].is_string());
    }

    #[test]
    fn replacement_cost_is_funded_where_replace() {
        let mut rs = vec![with_retrofit(1, 1, 10, 60.0)];
        if let Some(rf) = rs[0].retrofit.as_mut() {
            rf.replace = Some(true);
            rf.replacement_cost = Some(90.0);
        }
        let plan = budget_plan(&mut rs, &priced(100.0)).unwrap();
        assert_eq!(plan.priority_walk.cost, 90.0);
    }

    #[test]
    fn no_plan_without_budget_or_unit_costs() {
        let mut rs = vec![with_retrofit(1, 1, 10, 60.0)];
        let mut s = priced(100.0);
        s.budget = None;
        assert!(budget_plan(&mut rs, &s).is_none());
        assert!(budget_plan_unavailable(&s).is_none());
        let mut s = priced(100.0);
        s.unit_cost_floor_m2 = None;
        assert!(budget_plan(&mut rs, &s).is_none());
        let msg = budget_plan_unavailable(&s).unwrap();
        assert!(msg.contains("missing: unit_cost_floor_m2"), "{msg}");
        assert_eq!(rs[0].retrofit.as_ref().unwrap().funded, None);
    }
}
