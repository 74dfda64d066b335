/*!
Retrofit sizing, cost and the budget plan (`method.md` §12).
*/

use crate::engine::BuildingInput;
use crate::results::{BudgetPlan, BuildingResult};
use crate::settings::Settings;

/// Sizes the wall retrofit of every building that needs one and fills `retrofit`.
pub fn size_all(
    _results: &mut [BuildingResult],
    _inputs: &[BuildingInput<'_>],
    _settings: &Settings,
) {
}

/// Makes the budget plan (priority walk and max-occupants knapsack) and marks `funded`.
pub fn budget_plan(_results: &mut [BuildingResult], _settings: &Settings) -> Option<BudgetPlan> {
    None
}
