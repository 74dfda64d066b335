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

/// Retrofit cost (method §12):
/// cost = unit_cost_wall_m3 · Σ_d ΔA_d · H + unit_cost_floor_m2 · A_fl,
/// with ΔA_d the added ground-storey wall area (m²) of direction d, carried over the full
/// height H (m), and A_fl the total floor area (m²).
pub fn retrofit_cost(
    added_m2: PerDir<f64>,
    height_m: f64,
    floor_area_m2: f64,
    u: &UnitCosts,
) -> f64 {
    u.wall_m3 * (added_m2.x + added_m2.y) * height_m + u.floor_m2 * floor_area_m2
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

/// Fills `cost`, `replacement_cost` and `replace` of a sized retrofit when all three unit
/// costs are set; leaves them `None` otherwise. A retrofit with a direction without a
/// solution gets no retrofit cost and `replace = true`.
pub fn apply(r: &mut Retrofit, height_m: f64, floor_area_m2: f64, settings: &Settings) {
    let Some(u) = UnitCosts::from_settings(settings) else {
        r.cost = None;
        r.replacement_cost = None;
        r.replace = None;
        let msg = format!(
            "costs not computed: set {}",
            missing_unit_costs(settings).join(", ")
        );
        if r.note.is_empty() {
            r.note = msg;
        } else {
            r.note = format!("{}; {msg}", r.note);
        }
        return;
    };
    let cost = match (r.added_wall_area_m2.x, r.added_wall_area_m2.y) {
        (Some(x), Some(y)) => Some(retrofit_cost(PerDir { x, y }, height_m, floor_area_m2, &u)),
        _ => None,
    };
    let replacement = replacement_cost(floor_area_m2, &u);
    r.cost = cost;
    r.replacement_cost = Some(replacement);
    r.replace = Some(replace_recommended(
        cost,
        replacement,
        settings.replace_ratio,
    ));
}

/// What funding a building costs in the budget plan (method §12): its replacement cost
/// where replacement is recommended, else its retrofit cost; `None` without costs.
pub fn funding_cost(r: &Retrofit) -> Option<f64> {
    match r.replace? {
        true => r.replacement_cost,
        false => r.cost,
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
        apply(&mut r, 15.0, 2000.0, &priced());
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
        apply(&mut r, 15.0, 2000.0, &priced());
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
        apply(&mut r, 15.0, 2000.0, &s);
        assert_eq!((r.cost, r.replacement_cost, r.replace), (None, None, None));
        assert_eq!(funding_cost(&r), None);
        assert_eq!(r.note, "costs not computed: set replacement_cost_m2");
        assert_eq!(missing_unit_costs(&s), vec!["replacement_cost_m2"]);
        assert_eq!(missing_unit_costs(&Settings::default()).len(), 3);
    }
}
