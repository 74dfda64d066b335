/*!
Geography: district polygons and fault traces (GeoJSON), giving each building its district,
district hazard overrides and its distance to the nearest fault trace.
*/

use std::collections::HashMap;

use crate::model::{BuildingRecord, Problem, SiteInfo};
use crate::settings::Settings;

/// District polygons and fault traces, as loaded.
#[derive(Debug, Clone, Default)]
pub struct Geography {}

/// Places every building: district (given or assigned), district hazard, nearest fault and
/// near-fault trigger. Keyed by building id. Problems are reported, never fatal.
pub fn locate(
    buildings: &[BuildingRecord],
    _geo: &Geography,
    _settings: &Settings,
) -> (HashMap<String, SiteInfo>, Vec<Problem>) {
    let mut sites = HashMap::new();
    for b in buildings {
        sites.insert(
            b.id.clone(),
            SiteInfo {
                district: b.district.clone().unwrap_or_default(),
                ..SiteInfo::default()
            },
        );
    }
    (sites, Vec::new())
}

/// Failures that stop a geography file from being used at all.
#[derive(Debug, thiserror::Error)]
pub enum GeoError {
    /// The file cannot be read or is not GeoJSON.
    #[error("{path}: {message}")]
    Unreadable {
        /// Path.
        path: String,
        /// Why.
        message: String,
    },
}

impl Geography {
    /// Loads district polygons and/or fault traces. Bad features are reported as problems
    /// (sheet `districts` / `faults`, row = feature index + 1) and skipped.
    pub fn load(
        _districts: Option<&std::path::Path>,
        _faults: Option<&std::path::Path>,
    ) -> Result<(Geography, Vec<Problem>), GeoError> {
        Ok((Geography::default(), Vec::new()))
    }
}
