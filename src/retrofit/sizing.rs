/*!
Wall-retrofit sizing (`method.md` §12): for each direction whose life-safety demand/capacity
ratio exceeds the target, the smallest added RC wall area (ground-storey cross-section, m²)
that brings it to the target, found by the bisection loop of §12 over the full screening
method with the new walls added as their own element group.

The screening itself is passed in as a closure (`screen`), so that this module stays a pure
function of its inputs and can be tested with synthetic demand/capacity curves; the
production closure is [`crate::engine::screen_building_with`].
*/

use crate::engine::NewWalls;
use crate::model::{Dir, PerDir};
use crate::results::{BuildingResult, FlagCode, Retrofit};
use crate::settings::Settings;

/// Most bisection steps taken (method §12: "at most 60 iterations"). A loop guard, not an
/// engineering coefficient: with the default tolerance the loop ends after about 8 steps.
pub const MAX_BISECTION_ITERATIONS: u32 = 60;

/// The soft/weak storey flag codes that the new walls can remove (method §10, §12).
pub const STOREY_FLAG_CODES: [FlagCode; 3] = [
    FlagCode::SoftStorey,
    FlagCode::SoftStoreyExtreme,
    FlagCode::WeakStorey,
];

/// Note when a direction has no wall solution within the cap (method §12).
pub const NO_SOLUTION_NOTE: &str =
    "no wall solution within the cap — detailed study or replacement";

/// DCR ≤ target (method §12); false when the DCR is not a number.
pub fn meets(dcr: f64, target: f64) -> bool {
    dcr <= target
}

/// The bisection loop of method §12, exactly:
///
/// lo = one wall, hi = cap; if DCR(lo) ≤ target report lo; if DCR(hi) > target report
/// null; while hi − lo > tol: mid = (lo + hi)/2; if DCR(mid) ≤ target then hi = mid else
/// lo = mid; report hi.
///
/// Guards of this implementation: `lo > hi` (one wall already exceeds the cap) reports
/// `None` without evaluating anything (method §12: "also when one wall exceeds the cap");
/// the loop stops after `max_iter` halvings; a DCR that is not a number counts as above the
/// target (the comparisons are written as `DCR ≤ target`, which is false for NaN). The
/// reported value is always a point at which `dcr` was evaluated and found ≤ target, so the
/// result is feasible even where `dcr` is not monotone (ASCE 41 capacity model, §8–§12).
pub fn bisect(
    lo: f64,
    hi: f64,
    tol: f64,
    max_iter: u32,
    mut dcr: impl FnMut(f64) -> f64,
    target: f64,
) -> Option<f64> {
    let one_wall_within_cap = lo <= hi;
    if !one_wall_within_cap {
        return None;
    }
    if meets(dcr(lo), target) {
        return Some(lo);
    }
    if !meets(dcr(hi), target) {
        return None;
    }
    let (mut lo, mut hi) = (lo, hi);
    let mut iterations = 0;
    while hi - lo > tol && iterations < max_iter {
        let mid = (lo + hi) / 2.0;
        if meets(dcr(mid), target) {
            hi = mid;
        } else {
            lo = mid;
        }
        iterations += 1;
    }
    Some(hi)
}

/// Area of one new wall, tw·lw (m²) (method §12; settings `new_wall_thickness_m`,
/// `new_wall_length_m`).
pub fn one_wall_m2(settings: &Settings) -> f64 {
    settings.new_wall_thickness_m * settings.new_wall_length_m
}

/// The cap on added wall area per direction, `max_added_wall_index_pct`·A_fl/100 (m²)
/// (method §12). `floor_area_m2` is A_fl, the total floor area above the base.
pub fn cap_m2(floor_area_m2: f64, settings: &Settings) -> f64 {
    settings.max_added_wall_index_pct * floor_area_m2 / 100.0
}

/// Bisection tolerance (m²): the larger of `bisection_tolerance_pct_of_cap` % of the cap
/// and `bisection_tolerance_m2` (method §12: 0.5 % of the cap and 0.01 m² by default).
pub fn tolerance_m2(cap_m2: f64, settings: &Settings) -> f64 {
    (settings.bisection_tolerance_pct_of_cap * cap_m2 / 100.0).max(settings.bisection_tolerance_m2)
}

/// True when the building gets a retrofit sizing: class 1 or 2, or DCR_LS above
/// `retrofit_target_dcr` in either direction (method §12).
pub fn needs_retrofit(base: &BuildingResult, settings: &Settings) -> bool {
    matches!(base.class, 1 | 2)
        || Dir::BOTH
            .iter()
            .any(|&d| base.directions.get(d).dcr.ls > settings.retrofit_target_dcr)
}

/// How sizing re-screens a building with new walls: the whole building (for `flags_after`),
/// and the DCR_LS of one direction with new walls in it alone (each bisection step). A
/// closure `Fn(&NewWalls) -> Result<BuildingResult, _>` is one, re-screening the whole
/// building for both; the engine's own ([`super::Rescreener`]) re-runs only the direction.
pub trait Rescreen {
    /// The building re-screened with `new` walls (or why it could not be).
    fn screen(&self, new: &NewWalls) -> Result<BuildingResult, Vec<String>>;

    /// DCR_LS of direction `d` re-screened with `area` m² of new walls in `d` alone.
    fn dcr_ls(&self, d: Dir, area: f64) -> Result<f64, Vec<String>> {
        self.screen(&walls_in(d, area))
            .map(|r| r.directions.get(d).dcr.ls)
    }

    /// With `new` walls in both directions: each direction's DCR_LS and the soft/weak storey
    /// codes among the flags ([`storey_flag_codes`]), for `flags_after`.
    fn after(&self, new: &NewWalls) -> Result<(PerDir<f64>, Vec<FlagCode>), Vec<String>> {
        self.screen(new).map(|r| {
            let dcr = PerDir {
                x: r.directions.x.dcr.ls,
                y: r.directions.y.dcr.ls,
            };
            (dcr, storey_flag_codes(&r))
        })
    }
}

impl<F> Rescreen for F
where
    F: Fn(&NewWalls) -> Result<BuildingResult, Vec<String>>,
{
    fn screen(&self, new: &NewWalls) -> Result<BuildingResult, Vec<String>> {
        self(new)
    }
}

/// New walls of `area` (m²) in direction `d` only.
pub fn walls_in(d: Dir, area: f64) -> NewWalls {
    let mut area_m2 = PerDir { x: 0.0, y: 0.0 };
    *area_m2.get_mut(d) = area;
    NewWalls { area_m2 }
}

/// Sizes one direction (method §12): `Some(0.0)` when its DCR_LS is already at or below
/// the target, `Some(ΔA_d)` from [`bisect`], `None` when no area within the cap suffices.
/// `dcr(area)` is the direction's DCR_LS re-screened with `area` of new walls in it alone.
///
/// Under the EN 1998-3 capacity model DCR_LS,d is non-increasing in ΔA_d on
/// [one wall, cap] (method §12), so the result is the smallest area within the tolerance.
/// Under `capacity_model` = asce41 or lower-of-both it need not be (the wall shear demand
/// of ASCE 41-17 Table 10-19 can rise as the period shortens); the reported area is then
/// still one at which the DCR was evaluated and found ≤ target (see [`bisect`]), i.e. the
/// reported area itself is checked, though a smaller feasible area may exist.
pub fn size_direction(
    base_dcr_ls: f64,
    floor_area_m2: f64,
    settings: &Settings,
    dcr: impl FnMut(f64) -> f64,
) -> Option<f64> {
    let target = settings.retrofit_target_dcr;
    if base_dcr_ls <= target {
        return Some(0.0);
    }
    let cap = cap_m2(floor_area_m2, settings);
    bisect(
        one_wall_m2(settings),
        cap,
        tolerance_m2(cap, settings),
        MAX_BISECTION_ITERATIONS,
        dcr,
        target,
    )
}

/// Flag code of captive columns recorded by the surveyor (method §10).
pub const SHORT_COLUMN: FlagCode = FlagCode::ShortColumn;

/// True when the building carries the `short-column` flag: walls do not cure captive
/// columns, the retrofit record gets `column_remedy` (method §12).
pub fn has_short_columns(result: &BuildingResult) -> bool {
    result.flags.iter().any(|f| f.code == SHORT_COLUMN)
}

/// The soft/weak storey codes among a result's flags, each once, in flag order.
pub fn storey_flag_codes(result: &BuildingResult) -> Vec<FlagCode> {
    let mut codes: Vec<FlagCode> = Vec::new();
    for f in &result.flags {
        if STOREY_FLAG_CODES.contains(&f.code) && !codes.contains(&f.code) {
            codes.push(f.code);
        }
    }
    codes
}

/// Sizes the wall retrofit of one screened building (method §12), or `None` when it needs
/// none. `screen(new)` re-screens the building with new walls added. Costs are not filled
/// here (see [`super::cost::apply`]).
///
/// Each direction is sized independently (new walls in that direction only). `flags_after`
/// comes from one more screening with both directions' sized walls added (a direction
/// without a solution adds none: the flags describe the walls actually proposed); that
/// screening also re-checks each sized direction against the target.
pub fn size_building(
    base: &BuildingResult,
    settings: &Settings,
    screen: impl Rescreen,
) -> Option<Retrofit> {
    if !needs_retrofit(base, settings) {
        return None;
    }
    let target = settings.retrofit_target_dcr;
    let floor_area = base.detail.floor_area_m2;
    let mut failures: Vec<String> = Vec::new();
    let mut areas = PerDir { x: None, y: None };
    for d in Dir::BOTH {
        let dcr = |area: f64| match screen.dcr_ls(d, area) {
            Ok(v) => v,
            Err(reasons) => {
                for r in reasons {
                    if !failures.contains(&r) {
                        failures.push(r);
                    }
                }
                f64::NAN
            }
        };
        *areas.get_mut(d) =
            size_direction(base.directions.get(d).dcr.ls, floor_area, settings, dcr);
    }

    let mut notes: Vec<String> = Vec::new();
    let proposed = NewWalls {
        area_m2: PerDir {
            x: areas.x.unwrap_or(0.0),
            y: areas.y.unwrap_or(0.0),
        },
    };
    let flags_after = if proposed.area_m2.x > 0.0 || proposed.area_m2.y > 0.0 {
        match screen.after(&proposed) {
            Ok((dcr_after, codes)) => {
                for d in Dir::BOTH {
                    let dcr = *dcr_after.get(d);
                    if *proposed.area_m2.get(d) > 0.0 && !meets(dcr, target) {
                        notes.push(format!(
                            "with both directions' walls added DCR_LS,{} = {dcr:.3} is above the target {target}",
                            d.code()
                        ));
                    }
                }
                codes
            }
            Err(reasons) => {
                for r in reasons {
                    if !failures.contains(&r) {
                        failures.push(r);
                    }
                }
                storey_flag_codes(base)
            }
        }
    } else {
        storey_flag_codes(base)
    };

    if !failures.is_empty() {
        notes.insert(
            0,
            format!(
                "re-screening with new walls failed: {}",
                failures.join("; ")
            ),
        );
    }
    let unsolved: Vec<&str> = Dir::BOTH
        .iter()
        .filter(|d| areas.get(**d).is_none())
        .map(|d| d.code())
        .collect();
    if !unsolved.is_empty() {
        notes.insert(
            0,
            format!("{NO_SOLUTION_NOTE} (direction {})", unsolved.join(" and ")),
        );
    } else if areas.x == Some(0.0) && areas.y == Some(0.0) {
        if has_short_columns(base) {
            notes.push(format!(
                "no added walls needed: DCR_LS is at or below the target {target} in both directions; the captive columns need their own remedy (separating the infill from the columns, or jacketing them)"
            ));
        } else {
            notes.push(format!(
                "no added walls needed: DCR_LS is at or below the target {target} in both directions (class {} for other reasons — detailed study)",
                base.class
            ));
        }
    } else if has_short_columns(base) {
        notes.push(
            "the captive columns need their own remedy besides the walls (separating the infill from the columns, or jacketing them)".into(),
        );
    }
    Some(Retrofit {
        added_wall_area_m2: areas,
        cost: None,
        replacement_cost: None,
        replace: None,
        flags_after,
        column_remedy: has_short_columns(base),
        funded: None,
        funded_best: None,
        excluded: None,
        note: notes.join("; "),
    })
}

#[cfg(test)]
mod tests {
    use super::super::test_support::result_with;
    use super::*;
    use std::cell::RefCell;

    /// Synthetic monotone curve: DCR(a) = 2·exp(−a/10).
    fn curve(a: f64) -> f64 {
        2.0 * (-a / 10.0).exp()
    }

    #[test]
    fn bisect_reports_lo_when_one_wall_suffices() {
        let calls = RefCell::new(Vec::new());
        let r = bisect(
            1.25,
            30.0,
            0.1,
            60,
            |a| {
                calls.borrow_mut().push(a);
                0.5
            },
            1.0,
        );
        assert_eq!(r, Some(1.25));
        assert_eq!(*calls.borrow(), vec![1.25], "only DCR(lo) is evaluated");
    }

    #[test]
    fn bisect_reports_none_when_cap_is_not_enough() {
        let calls = RefCell::new(Vec::new());
        let r = bisect(
            1.25,
            30.0,
            0.1,
            60,
            |a| {
                calls.borrow_mut().push(a);
                1.5
            },
            1.0,
        );
        assert_eq!(r, None);
        assert_eq!(*calls.borrow(), vec![1.25, 30.0]);
    }

    #[test]
    fn bisect_reports_none_when_one_wall_exceeds_the_cap() {
        let calls = RefCell::new(0);
        let r = bisect(
            5.0,
            4.0,
            0.1,
            60,
            |_| {
                *calls.borrow_mut() += 1;
                0.0
            },
            1.0,
        );
        assert_eq!(r, None);
        assert_eq!(*calls.borrow(), 0, "nothing evaluated");
    }

    #[test]
    fn bisect_equal_ends_follow_the_two_checks() {
        assert_eq!(bisect(2.0, 2.0, 0.1, 60, |_| 0.9, 1.0), Some(2.0));
        assert_eq!(bisect(2.0, 2.0, 0.1, 60, |_| 1.1, 1.0), None);
    }

    #[test]
    fn bisect_exactly_at_target_is_feasible() {
        // "≤ target": equality counts as meeting the target.
        assert_eq!(bisect(1.0, 8.0, 0.1, 60, |_| 1.0, 1.0), Some(1.0));
        // feasible only at the cap: every mid is infeasible, lo climbs, hi stays the cap
        assert_eq!(
            bisect(1.0, 8.0, 0.1, 60, |a| if a >= 8.0 { 1.0 } else { 2.0 }, 1.0),
            Some(8.0)
        );
    }

    #[test]
    fn bisect_follows_the_loop_step_by_step() {
        // Reference: the loop of method §12 traced by hand on a step function whose
        // threshold is 5.3 (DCR ≤ 1 for a ≥ 5.3): lo=1, hi=9, tol=0.5.
        // mid 5 → infeasible → lo=5; mid 7 → hi=7; mid 6 → hi=6; mid 5.5 → hi=5.5;
        // hi−lo = 0.5, not > tol → stop; report 5.5.
        let calls = RefCell::new(Vec::new());
        let r = bisect(
            1.0,
            9.0,
            0.5,
            60,
            |a| {
                calls.borrow_mut().push(a);
                if a >= 5.3 { 0.9 } else { 1.1 }
            },
            1.0,
        );
        assert_eq!(r, Some(5.5));
        assert_eq!(*calls.borrow(), vec![1.0, 9.0, 5.0, 7.0, 6.0, 5.5]);
    }

    #[test]
    fn bisect_stops_after_max_iterations() {
        let calls = RefCell::new(0u32);
        let r = bisect(
            0.0,
            1.0,
            0.0,
            5,
            |a| {
                *calls.borrow_mut() += 1;
                if a >= 0.3 { 0.0 } else { 2.0 }
            },
            1.0,
        );
        // two end checks + 5 halvings
        assert_eq!(*calls.borrow(), 7);
        let hi = r.unwrap();
        assert!(hi >= 0.3 && hi - 0.3 <= 1.0 / 32.0, "{hi}");
    }

    #[test]
    fn bisect_treats_nan_as_infeasible() {
        assert_eq!(bisect(1.0, 2.0, 0.1, 60, |_| f64::NAN, 1.0), None);
        let r = bisect(
            1.0,
            2.0,
            0.01,
            60,
            |a| if a < 1.5 { f64::NAN } else { 0.5 },
            1.0,
        )
        .unwrap();
        assert!((1.5..=1.51).contains(&r), "{r}");
    }

    #[test]
    fn bisect_on_a_monotone_curve_brackets_the_root_within_tolerance() {
        // Root of 2·exp(−a/10) = 1 is a = 10·ln 2.
        let root = 10.0 * 2f64.ln();
        let r = bisect(1.0, 30.0, 0.01, 60, curve, 1.0).unwrap();
        assert!(curve(r) <= 1.0);
        assert!(r >= root && r - root <= 0.01, "{r} vs {root}");
    }

    #[test]
    fn tolerance_and_cap_come_from_settings() {
        let s = Settings::default();
        // cap = 1.5 % of 1000 m² = 15 m²; tol = max(0.5 % of 15, 0.01) = 0.075 m²
        assert!((cap_m2(1000.0, &s) - 15.0).abs() < 1e-12);
        assert!((tolerance_m2(15.0, &s) - 0.075).abs() < 1e-12);
        // small cap: the absolute floor of 0.01 m² governs
        assert!((tolerance_m2(1.0, &s) - 0.01).abs() < 1e-12);
        assert!((one_wall_m2(&s) - 1.25).abs() < 1e-12);
    }

    #[test]
    fn size_direction_not_needed_gives_zero() {
        let s = Settings::default();
        assert_eq!(
            size_direction(0.8, 1000.0, &s, |_| panic!("not called")),
            Some(0.0)
        );
        assert_eq!(
            size_direction(1.0, 1000.0, &s, |_| panic!("not called")),
            Some(0.0)
        );
    }

    #[test]
    fn size_direction_small_building_one_wall_exceeds_cap() {
        // A_fl = 50 m² → cap 0.75 m² < one wall 1.25 m²
        let s = Settings::default();
        assert_eq!(size_direction(1.5, 50.0, &s, |_| 0.0), None);
    }

    /// Fake screen: DCR_LS,d = base_d·exp(−ΔA_d/10); a soft storey in x while ΔA_x < 3.
    fn fake_screen(new: &NewWalls) -> Result<BuildingResult, Vec<String>> {
        let mut r = result_with(2, 1.8, 0.9, 1000.0, 9.0);
        r.directions.x.dcr.ls = 1.8 * (-new.area_m2.x / 10.0).exp();
        r.directions.y.dcr.ls = 0.9 * (-new.area_m2.y / 10.0).exp();
        if new.area_m2.x < 3.0 {
            r.flags.push(crate::results::Flag::new(
                Some(Dir::X),
                crate::results::FlagDetail::CodeOnly(FlagCode::SoftStorey),
            ));
        }
        Ok(r)
    }

    #[test]
    fn size_building_sizes_each_direction_and_reports_flags_after() {
        let s = Settings::default();
        let base = fake_screen(&NewWalls::default()).unwrap();
        let rf = size_building(&base, &s, fake_screen).unwrap();
        let ax = rf.added_wall_area_m2.x.unwrap();
        let root = 10.0 * 1.8f64.ln();
        let tol = tolerance_m2(cap_m2(1000.0, &s), &s);
        assert!(ax >= root && ax - root <= tol, "{ax} vs {root}");
        assert_eq!(rf.added_wall_area_m2.y, Some(0.0));
        assert!(
            rf.flags_after.is_empty(),
            "soft storey removed: {:?}",
            rf.flags_after
        );
        assert!(rf.cost.is_none() && rf.replace.is_none());
    }

    #[test]
    fn size_building_none_when_not_needed_and_null_when_cap_short() {
        let s = Settings::default();
        let fine = result_with(3, 0.9, 0.8, 1000.0, 9.0);
        assert!(size_building(&fine, &s, |_: &NewWalls| Ok(fine.clone())).is_none());
        // class 3 but above a lowered target → sized
        let s2 = Settings {
            retrofit_target_dcr: 0.85,
            ..Settings::default()
        };
        assert!(size_building(&fine, &s2, |_: &NewWalls| Ok(fine.clone())).is_some());
        // DCR does not fall at all → null, note, flags unchanged
        let bad = result_with(1, 3.0, 0.5, 1000.0, 9.0);
        let rf = size_building(&bad, &s, |_: &NewWalls| Ok(bad.clone())).unwrap();
        assert_eq!(rf.added_wall_area_m2.x, None);
        assert_eq!(rf.added_wall_area_m2.y, Some(0.0));
        assert!(rf.note.starts_with(NO_SOLUTION_NOTE), "{}", rf.note);
    }

    #[test]
    fn short_columns_get_a_column_remedy_even_without_walls() {
        // Method §12: class 2 from the short-column flag alone, DCR_LS below the target in
        // both directions → both added areas 0, column_remedy true.
        let s = Settings::default();
        let mut base = result_with(2, 0.6, 0.5, 1000.0, 9.0);
        base.flags.push(crate::results::Flag::new(
            None,
            crate::results::FlagDetail::ShortColumn,
        ));
        let rf = size_building(&base, &s, |_: &NewWalls| Ok(base.clone())).unwrap();
        assert!(rf.column_remedy);
        assert_eq!(rf.added_wall_area_m2.x, Some(0.0));
        assert_eq!(rf.added_wall_area_m2.y, Some(0.0));
        let plain = result_with(1, 1.8, 0.5, 1000.0, 9.0);
        let rf = size_building(&plain, &s, fake_screen).unwrap();
        assert!(!rf.column_remedy);
    }

    #[test]
    fn size_building_reports_screen_failures() {
        let s = Settings::default();
        let base = result_with(1, 3.0, 0.5, 1000.0, 9.0);
        let rf = size_building(&base, &s, |_: &NewWalls| Err(vec!["boom".into()])).unwrap();
        assert_eq!(rf.added_wall_area_m2.x, None);
        assert!(rf.note.contains("boom"), "{}", rf.note);
    }
}
