/*!
Reading inventories: workbooks (.xlsx, .xlsm, .xls, .ods via calamine) and CSV files into
typed records ([`crate::model::Inventory`]) and problems. No engineering happens here.
*/

use std::path::Path;

use crate::model::Inventory;

/// Options of the reading layer.
#[derive(Debug, Clone, Default)]
pub struct ReadOptions {
    /// 1-based header row of every sheet; `None` = find it by the required names.
    pub header_row: Option<usize>,
}

/// Failures that stop the whole file from being read.
#[derive(Debug, thiserror::Error)]
pub enum InputError {
    /// The file cannot be opened or read.
    #[error("{path}: cannot read the file: {message}")]
    Unreadable {
        /// Path.
        path: String,
        /// Why.
        message: String,
    },
}

/// Reads an inventory file (workbook or CSV, by extension) into typed records and problems.
pub fn read_inventory(path: &Path, _opts: &ReadOptions) -> Result<Inventory, InputError> {
    Err(InputError::Unreadable {
        path: path.display().to_string(),
        message: "not implemented yet".into(),
    })
}

/// The header-matching rule, printed in `--help` and on the template's read-me sheet.
pub const HEADER_RULE_HELP: &str = "Column names are matched after normalising: lower case; '²' -> '2'; brackets and \
parentheses removed; runs of spaces, '_' and '-' -> one '_'; then one trailing unit token \
(m, m2, mm, kn, kpa, mpa, g, s, pct, %, deg, year) is stripped. 'Plan Area [m2]', 'plan-area m²' \
and 'PLAN_AREA_M2' all match plan_area_m2.";
