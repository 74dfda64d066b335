/*!
Retrofit and replacement cost, and the replace-instead recommendation (`method.md` §12).
Currency-neutral: the unit costs are the user's local prices (no built-in values).
*/

use crate::model::PerDir;
use crate::results::Retrofit;
use crate::settings::Settings;

/// The three unit costs of the settings, all set.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct UnitCosts {
    /// `unit_cost_wall_m3`: new RC wall, per m³ of wall.
    pub wall_m3: f64,
    /// `unit_cost_floor_m2`: finishes, foundations and the like, per m² of floor area.
    pub floor_m2: f64,
    /// `replacement_cost_m2`: demolition and new building, per m² of floor area.
    pub replacement_m2: f64,
}

impl UnitCosts {
    /// The unit costs when all three are set, else `None` (method §12: without them costs
    /// stay empty and no budget plan can be made).
    pub fn from_settings(settings: &Settings) -> Option<Self> {
        Some(UnitCosts {
            wall_m3: settings.unit_cost_wall_m3?,
            floor_m2: settings.unit_cost_floor_m2?,
            replacement_m2: settings.replacement_cost_m2?,
        })
    }
}

/// The unit-cost keys that are not set, in the interface's order.
pub fn missing_unit_costs(settings: &Settings) -> Vec<&'static str> {
    let mut out = Vec::new();
    if settings.unit_cost_wall_m3.is_none() {
        out.push("unit_cost_wall_m3");
    }
    if settings.unit_cost_floor_m2.is_none() {
        out.push("unit_cost_floor_m2");
    }
    if settings.replacement_cost_m2.is_none() {
        out.push("replacement_cost_m2");
    }
    out
}

/// Wall and floor terms of the retrofit cost (method §12):
/// unit_cost_wall_m3 · Σ_d ΔA_d · H + unit_cost_floor_m2 · A_fl, both only when walls are
/// added (Σ ΔA_d > 0), else 0. ΔA_d is the added ground-storey wall area (m²) of direction
/// d, carried over the full height H (m); A_fl the total floor area (m²).
pub fn wall_cost(added_m2: PerDir<f64>, height_m: f64, floor_area_m2: f64, u: &UnitCosts) -> f64 {
    let added = added_m2.x + added_m2.y;
    if added > 0.0 {
        u.wall_m3 * added * height_m + u.floor_m2 * floor_area_m2
    } else {
        0.0
    }
}

/// Column term of the retrofit cost (method §12): unit_cost_short_column_m2 · A_plan (m² of
/// ground-storey plan) with `column_remedy`, 0 without; `None` when the remedy is needed and
/// `unit_cost_short_column_m2` is not set (no built-in price).
pub fn column_remedy_cost(
    column_remedy: bool,
    plan_area_m2: f64,
    unit_cost_short_column_m2: Option<f64>,
) -> Option<f64> {
    if column_remedy {
        unit_cost_short_column_m2.map(|c| c * plan_area_m2)
    } else {
        Some(0.0)
    }
}

/// Retrofit cost (method §12) = [`wall_cost`] + [`column_remedy_cost`]; `None` when the
/// column remedy has no price.
pub fn retrofit_cost(
    added_m2: PerDir<f64>,
    height_m: f64,
    floor_area_m2: f64,
    plan_area_m2: f64,
    column_remedy: bool,
    u: &UnitCosts,
    unit_cost_short_column_m2: Option<f64>,
) -> Option<f64> {
    let columns = column_remedy_cost(column_remedy, plan_area_m2, unit_cost_short_column_m2)?;
    Some(wall_cost(added_m2, height_m, floor_area_m2, u) + columns)
}

/// Replacement cost = replacement_cost_m2 · A_fl (method §12).
pub fn replacement_cost(floor_area_m2: f64, u: &UnitCosts) -> f64 {
    u.replacement_m2 * floor_area_m2
}

/// Replacement recommended (method §12): retrofit cost > `replace_ratio` · replacement
/// cost, or no wall solution within the cap (`cost` = `None`).
pub fn replace_recommended(cost: Option<f64>, replacement: f64, replace_ratio: f64) -> bool {
    match cost {
        Some(c) => c > replace_ratio * replacement,
        None => true,
    }
}

/// Note of a captive-column remedy without a price (method §12).
pub const COLUMN_REMEDY_UNPRICED: &str =
    "column remedy not costed: unit_cost_short_column_m2 is not set (no built-in price)";

/// Fills `cost`, `replacement_cost` and `replace` of a sized retrofit when all three unit
/// costs are set; leaves them `None` otherwise. A retrofit with a direction without a
/// solution gets no retrofit cost and `replace = true` (replacement also removes the
/// captive columns). A captive-column remedy (`column_remedy`) without
/// `unit_cost_short_column_m2` gets `cost` and `replace` `None` (interface.md), so the
/// building has no amount to fund.
pub fn apply(
    r: &mut Retrofit,
    height_m: f64,
    floor_area_m2: f64,
    plan_area_m2: f64,
    settings: &Settings,
) {
    let add_note = |r: &mut Retrofit, msg: &str| {
        if r.note.is_empty() {
            r.note = msg.to_string();
        } else {
            r.note = format!("{}; {msg}", r.note);
        }
    };
    let Some(u) = UnitCosts::from_settings(settings) else {
        r.cost = None;
        r.replacement_cost = None;
        r.replace = None;
        let msg = format!(
            "costs not computed: set {}",
            missing_unit_costs(settings).join(", ")
        );
        add_note(r, &msg);
        return;
    };
    let replacement = replacement_cost(floor_area_m2, &u);
    r.replacement_cost = Some(replacement);
    let (Some(x), Some(y)) = (r.added_wall_area_m2.x, r.added_wall_area_m2.y) else {
        r.cost = None;
        r.replace = Some(replace_recommended(
            None,
            replacement,
            settings.replace_ratio,
        ));
        return;
    };
    let cost = retrofit_cost(
        PerDir { x, y },
        height_m,
        floor_area_m2,
        plan_area_m2,
        r.column_remedy,
        &u,
        settings.unit_cost_short_column_m2,
    );
    r.cost = cost;
    match cost {
        Some(c) => {
            r.replace = Some(replace_recommended(
                Some(c),
                replacement,
                settings.replace_ratio,
            ))
        }
        None => {
            r.replace = None;
            add_note(r, COLUMN_REMEDY_UNPRICED);
        }
    }
}

/// What funding a building costs in the budget plan (method §12): its replacement cost
/// where replacement is recommended, else its retrofit cost; `None` without costs. The one
/// place this is computed (the workbook, the streaming path and the plan call it).
pub fn funding_cost(r: &Retrofit) -> Option<f64> {
    match r.replace? {
        true => r.replacement_cost,
        false => r.cost,
    }
}

/// Why a building with a retrofit record has no amount to fund and stays out of both
/// budget plans (interface.md `budget_plan.excluded`), or `None` when it has one: a
/// captive-column remedy without `unit_cost_short_column_m2`, costs not set, or nothing to
/// fund (no walls added, no column remedy).
pub fn unfunded_reason(r: &Retrofit, settings: &Settings) -> Option<String> {
    match funding_cost(r) {
        Some(c) if c > 0.0 => None,
        Some(_) => Some(
            "nothing to fund: no added walls needed and no column remedy (detailed study)".into(),
        ),
        None if r.column_remedy && settings.unit_cost_short_column_m2.is_none() => {
            Some("column remedy without a price (unit_cost_short_column_m2 not set)".into())
        }
        None => Some(format!(
            "costs not computed: set {}",
            missing_unit_costs(settings).join(", ")
        )),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn priced() -> Settings {
        Settings {
            unit_cost_wall_m3: Some(1000.0),
            unit_cost_floor_m2: Some(50.0),
            replacement_cost_m2: Some(800.0),
            ..Settings::default()
        }
    }

    #[test]
    fn cost_hand_example() {
        // Hand example: ΔA = 3.0 + 1.25 m², H = 15 m, A_fl = 2000 m².
        // walls 1000·4.25·15 = 63 750; floor 50·2000 = 100 000; total 163 750.
        // replacement 800·2000 = 1 600 000; 0.40·1.6e6 = 640 000 > 163 750 → retrofit.
        let mut r = Retrofit {
            added_wall_area_m2: PerDir {
                x: Some(3.0),
                y: Some(1.25),
            },
            ..Retrofit::default()
        };
        apply(&mut r, 15.0, 2000.0, 400.0, &priced());
        assert!((r.cost.unwrap() - 163_750.0).abs() < 1e-6);
        assert!((r.replacement_cost.unwrap() - 1_600_000.0).abs() < 1e-6);
        assert_eq!(r.replace, Some(false));
        assert_eq!(funding_cost(&r), r.cost);
    }

    #[test]
    fn replace_above_ratio_and_when_no_solution() {
        assert!(replace_recommended(Some(641.0), 1600.0, 0.4));
        assert!(
            !replace_recommended(Some(640.0), 1600.0, 0.4),
            "equal is not above"
        );
        assert!(replace_recommended(None, 1600.0, 0.4));
        let mut r = Retrofit {
            added_wall_area_m2: PerDir {
                x: None,
                y: Some(0.0),
            },
            ..Retrofit::default()
        };
        apply(&mut r, 15.0, 2000.0, 400.0, &priced());
        assert_eq!(r.cost, None);
        assert_eq!(r.replace, Some(true));
        assert_eq!(funding_cost(&r), Some(1_600_000.0));
    }

    #[test]
    fn no_costs_without_all_three_unit_costs() {
        let mut s = priced();
        s.replacement_cost_m2 = None;
        let mut r = Retrofit {
            added_wall_area_m2: PerDir {
                x: Some(2.0),
                y: Some(0.0),
            },
            ..Retrofit::default()
        };
        apply(&mut r, 15.0, 2000.0, 400.0, &s);
        assert_eq!((r.cost, r.replacement_cost, r.replace), (None, None, None));
        assert_eq!(funding_cost(&r), None);
        assert_eq!(r.note, "costs not computed: set replacement_cost_m2");
        assert_eq!(missing_unit_costs(&s), vec!["replacement_cost_m2"]);
        assert_eq!(missing_unit_costs(&Settings::default()).len(), 3);
    }

    #[test]
    fn floor_term_only_when_walls_are_added() {
        // Hand example: no walls added, no column remedy → cost 0 (before revision 6 the
        // floor term 50·2000 = 100 000 was charged alone); nothing to fund.
        let mut r = Retrofit {
            added_wall_area_m2: PerDir {
                x: Some(0.0),
                y: Some(0.0),
            },
            ..Retrofit::default()
        };
        apply(&mut r, 15.0, 2000.0, 400.0, &priced());
        assert_eq!(r.cost, Some(0.0));
        assert_eq!(r.replace, Some(false));
        assert!(
            unfunded_reason(&r, &priced())
                .unwrap()
                .starts_with("nothing to fund")
        );
        // One direction with walls: both terms.
        let u = UnitCosts::from_settings(&priced()).unwrap();
        assert!((wall_cost(PerDir { x: 0.0, y: 2.0 }, 15.0, 2000.0, &u) - 130_000.0).abs() < 1e-6);
        assert_eq!(wall_cost(PerDir { x: 0.0, y: 0.0 }, 15.0, 2000.0, &u), 0.0);
    }

    #[test]
    fn column_remedy_term_and_its_missing_price() {
        // Hand example: A_plan 400 m², unit_cost_short_column_m2 = 120 → 48 000; with walls
        // ΔA_x = 2 m² also 1000·2·15 + 50·2000 = 130 000 → 178 000.
        let mut s = priced();
        s.unit_cost_short_column_m2 = Some(120.0);
        let mut r = Retrofit {
            added_wall_area_m2: PerDir {
                x: Some(0.0),
                y: Some(0.0),
            },
            column_remedy: true,
            ..Retrofit::default()
        };
        apply(&mut r, 15.0, 2000.0, 400.0, &s);
        assert!((r.cost.unwrap() - 48_000.0).abs() < 1e-6);
        assert_eq!(r.replace, Some(false));
        assert_eq!(unfunded_reason(&r, &s), None);
        r.added_wall_area_m2.x = Some(2.0);
        apply(&mut r, 15.0, 2000.0, 400.0, &s);
        assert!((r.cost.unwrap() - 178_000.0).abs() < 1e-6);
        assert_eq!(column_remedy_cost(false, 400.0, Some(120.0)), Some(0.0));
        // Without the price: cost and replace null, excluded with the reason.
        let mut r = Retrofit {
            added_wall_area_m2: PerDir {
                x: Some(2.0),
                y: Some(0.0),
            },
            column_remedy: true,
            ..Retrofit::default()
        };
        apply(&mut r, 15.0, 2000.0, 400.0, &priced());
        assert_eq!((r.cost, r.replace), (None, None));
        assert_eq!(r.replacement_cost, Some(1_600_000.0));
        assert_eq!(funding_cost(&r), None);
        assert!(
            unfunded_reason(&r, &priced())
                .unwrap()
                .contains("unit_cost_short_column_m2")
        );
        assert!(r.note.contains("unit_cost_short_column_m2"), "{}", r.note);
        // No wall solution: replacement, whatever the column price.
        r.added_wall_area_m2.x = None;
        r.note.clear();
        apply(&mut r, 15.0, 2000.0, 400.0, &priced());
        assert_eq!((r.cost, r.replace), (None, Some(true)));
        assert_eq!(funding_cost(&r), Some(1_600_000.0));
        assert_eq!(unfunded_reason(&r, &priced()), None);
    }
}
