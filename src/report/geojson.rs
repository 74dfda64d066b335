/*!
Buildings with coordinates as an RFC 7946 FeatureCollection of Points (`--geojson FILE`),
streamed feature by feature. Coordinates are `[longitude, latitude]` (WGS84, RFC 7946
§3.1.1); the properties carry the Priority columns under the `--csv` names, so the same
script reads either file. Non-finite numbers are written as null; buildings without both
coordinates (or with coordinates outside the WGS84 ranges) are left out.
*/

use std::borrow::Borrow;
use std::path::Path;

use geojson::{Feature, FeatureWriter, Geometry, JsonObject, JsonValue};

use super::ReportError;
use super::atomic::write_atomic;
use super::workbook::tables::{Cell, PRIORITY, Target, priority_row};
use crate::results::{BuildingResult, Screening};

/// Properties that are whole numbers in the JSON (written without a decimal point).
const WHOLE: &[&str] = &["rank", "class", "occupants", "rank_p05", "rank_p95"];

fn json_number(key: &str, v: f64) -> JsonValue {
    if !v.is_finite() {
        return JsonValue::Null;
    }
    if WHOLE.contains(&key) && v.fract() == 0.0 && v.abs() < 9.0e15 {
        return JsonValue::from(v as i64);
    }
    serde_json::Number::from_f64(v).map_or(JsonValue::Null, JsonValue::Number)
}

/// The GeoJSON feature of one building, or `None` without usable coordinates.
pub fn feature(b: &BuildingResult) -> Option<Feature> {
    let (lat, lon) = (b.latitude?, b.longitude?);
    if !(lat.is_finite() && lon.is_finite() && lat.abs() <= 90.0 && lon.abs() <= 180.0) {
        return None;
    }
    let mut cells = Vec::with_capacity(PRIORITY.len());
    priority_row(b, Target::Csv, &mut cells);
    let mut props = JsonObject::new();
    for (c, cell) in PRIORITY.iter().zip(cells) {
        let v = match cell {
            Cell::Blank => JsonValue::Null,
            Cell::Num(v) => json_number(c.key, v),
            Cell::Text(t) => JsonValue::String(t.into_owned()),
        };
        props.insert(c.key.to_string(), v);
    }
    if b.uncertainty.is_some() {
        for (key, cell) in super::csv::SAMPLE_COLUMNS
            .iter()
            .zip(super::csv::sample_cells(b))
        {
            let v = match cell {
                Cell::Num(v) => json_number(key, v),
                _ => JsonValue::Null,
            };
            props.insert((*key).to_string(), v);
        }
    }
    Some(Feature {
        bbox: None,
        geometry: Some(Geometry::new_point([lon, lat])),
        id: None,
        properties: Some(props),
        foreign_members: None,
    })
}

/// Writes the buildings with coordinates as GeoJSON points.
pub fn write(report: &Screening, path: &Path) -> Result<(), ReportError> {
    write_buildings(&report.buildings, path)
}

/// Writes `buildings` (in rank order) that have coordinates as GeoJSON points: [`write`], and
/// the streaming path from its compact rows (`crate::stream`).
pub fn write_buildings<I>(buildings: I, path: &Path) -> Result<(), ReportError>
where
    I: IntoIterator,
    I::Item: Borrow<BuildingResult>,
{
    write_atomic(path, |w| {
        let mut fw = FeatureWriter::from_writer(w);
        for b in buildings {
            if let Some(f) = feature(b.borrow()) {
                fw.write_feature(&f)?;
            }
        }
        fw.finish()?;
        fw.flush()?;
        Ok(())
    })
}
