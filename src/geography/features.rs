/*!
Reading the companion GeoJSON files into checked district polygons and fault traces.

Each feature is read on its own (the `geojson` crate's `Feature`), validated, and either
kept or reported as a [`Problem`] naming the feature (its number, 1-based in file order,
shown as the `row`, and its 0-based index in the `features` list) and what is wrong with
it; a bad feature never stops the others. Problems use the
sheet names `districts` and `faults`.
*/

use geo::{Coord, LineString, MultiPolygon, Polygon};
use geojson::{Feature, GeometryValue, JsonObject, JsonValue, Position};

use super::sphere::LatLon;
use crate::model::{GroundType, Problem, Severity};
use crate::settings::SettingValue;

/// Hazard properties a district may carry (inventory.md, companion geography).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct DistrictHazard {
    /// Reference PGA on rock agR (g).
    pub agr_g: Option<f64>,
    /// Ground type A–E.
    pub ground_type: Option<GroundType>,
    /// Two-parameter SDS (g).
    pub sds_g: Option<f64>,
    /// Two-parameter SD1 (g).
    pub sd1_g: Option<f64>,
}

/// One district polygon (or multipolygon) with its name and hazard properties.
#[derive(Debug, Clone, PartialEq)]
pub struct District {
    /// Feature number in the file (1-based).
    pub feature: usize,
    /// Property `name`.
    pub name: String,
    /// Shape in longitude (x) / latitude (y) degrees. Edges are straight lines in those
    /// coordinates, as RFC 7946 §3.1.1 prescribes for GeoJSON. A polygon that crosses the
    /// antimeridian without being cut has 360° added to its negative longitudes (so x may
    /// reach 360; [`super::antimeridian`]).
    pub shape: MultiPolygon<f64>,
    /// Hazard properties.
    pub hazard: DistrictHazard,
}

/// One fault trace (LineString or MultiLineString) with its name and magnitude.
#[derive(Debug, Clone, PartialEq)]
pub struct FaultTrace {
    /// Feature number in the file (1-based).
    pub feature: usize,
    /// Property `name`.
    pub name: String,
    /// Property `mw` (moment magnitude), if given and numeric.
    pub mw: Option<f64>,
    /// The trace's polylines; consecutive vertices are joined by great-circle segments.
    pub parts: Vec<Vec<LatLon>>,
}

/// Where a feature problem is reported.
#[derive(Debug, Clone, Copy)]
pub(crate) struct FeatureAt<'a> {
    /// Sheet name used in problems (`districts` or `faults`).
    pub sheet: &'a str,
    /// Feature number (1-based).
    pub feature: usize,
    /// The feature's name, if it has one (for the message).
    pub name: Option<&'a str>,
}

impl FeatureAt<'_> {
    /// Parses the feature; one that does not parse is reported as an error (the `what` is
    /// skipped) and gives `None`.
    fn parsed(
        &self,
        value: &JsonValue,
        what: &str,
        problems: &mut Vec<Problem>,
    ) -> Option<Feature> {
        match parse_feature(value) {
            Ok(f) => Some(f),
            Err(m) => {
                problems.push(self.problem(
                    "geometry",
                    format!("{m}; {what} skipped"),
                    Severity::Error,
                ));
                None
            }
        }
    }

    pub(crate) fn problem(&self, column: &str, message: String, severity: Severity) -> Problem {
        let index = self.feature.saturating_sub(1);
        let who = match self.name {
            Some(n) => format!("feature {} (index {index}, \"{n}\")", self.feature),
            None => format!("feature {} (index {index})", self.feature),
        };
        Problem {
            sheet: self.sheet.to_string(),
            row: Some(self.feature),
            column: column.to_string(),
            message: format!("{who}: {message}"),
            severity,
        }
    }
}

/// The features of a GeoJSON document: a FeatureCollection's `features`, a single Feature,
/// or a bare geometry (taken as one feature without properties). `Err` says why the
/// document holds no features at all.
pub(crate) fn feature_values(doc: JsonValue) -> Result<Vec<JsonValue>, String> {
    let JsonValue::Object(mut obj) = doc else {
        return Err("expected a GeoJSON object (a FeatureCollection)".into());
    };
    let kind = obj
        .get("type")
        .and_then(JsonValue::as_str)
        .unwrap_or_default()
        .to_string();
    match kind.as_str() {
        "FeatureCollection" => match obj.remove("features") {
            Some(JsonValue::Array(items)) => Ok(items),
            Some(_) => Err("`features` of the FeatureCollection is not a list".into()),
            None => Err("the FeatureCollection has no `features` list".into()),
        },
        "Feature" => Ok(vec![JsonValue::Object(obj)]),
        "Point" | "MultiPoint" | "LineString" | "MultiLineString" | "Polygon" | "MultiPolygon"
        | "GeometryCollection" => {
            let mut f = JsonObject::new();
            f.insert("type".into(), JsonValue::from("Feature"));
            f.insert("geometry".into(), JsonValue::Object(obj));
            f.insert("properties".into(), JsonValue::Object(JsonObject::new()));
            Ok(vec![JsonValue::Object(f)])
        }
        "" => Err("expected a GeoJSON object with a `type` (a FeatureCollection)".into()),
        other => Err(format!(
            "expected a GeoJSON FeatureCollection, found type `{other}`"
        )),
    }
}

/// Reads one feature value into a `geojson::Feature`, with a plain-words reason when the
/// value is not a valid feature (missing geometry or coordinates, malformed positions).
fn parse_feature(value: &JsonValue) -> Result<Feature, String> {
    let JsonValue::Object(obj) = value else {
        return Err("is not a JSON object".into());
    };
    if obj.get("type").and_then(JsonValue::as_str) != Some("Feature") {
        return Err("is not a GeoJSON Feature (its `type` is not \"Feature\")".into());
    }
    match obj.get("geometry") {
        None | Some(JsonValue::Null) => return Err("missing geometry".into()),
        Some(JsonValue::Object(g)) => {
            let is_collection =
                g.get("type").and_then(JsonValue::as_str) == Some("GeometryCollection");
            if !is_collection && !g.contains_key("coordinates") {
                return Err("missing coordinates (the geometry has no `coordinates`)".into());
            }
            if g.get("coordinates").is_some_and(JsonValue::is_null) {
                return Err("missing coordinates (`coordinates` is null)".into());
            }
        }
        Some(_) => return Err("`geometry` is not a GeoJSON geometry object".into()),
    }
    serde_json::from_value::<Feature>(value.clone())
        .map_err(|e| format!("malformed geometry or coordinates: {e}"))
}

/// A position's longitude/latitude, checked: two finite numbers, latitude within ±90°,
/// longitude within ±180°.
fn lon_lat(p: &Position) -> Result<Coord<f64>, String> {
    let s = p.as_slice();
    let (Some(&lon), Some(&lat)) = (s.first(), s.get(1)) else {
        return Err(format!(
            "missing coordinates: a position needs longitude and latitude, found {} number(s)",
            s.len()
        ));
    };
    if !lon.is_finite() || !lat.is_finite() {
        return Err("a coordinate is not a finite number".into());
    }
    if !(-90.0..=90.0).contains(&lat) {
        return Err(format!(
            "latitude {lat} outside ±90° (GeoJSON positions are [longitude, latitude])"
        ));
    }
    if !(-180.0..=180.0).contains(&lon) {
        return Err(format!("longitude {lon} outside ±180°"));
    }
    Ok(Coord { x: lon, y: lat })
}

/// A polygon ring: at least four positions, first equal to last (RFC 7946 §3.1.6).
fn ring(positions: &[Position], which: &str) -> Result<LineString<f64>, String> {
    let coords = positions
        .iter()
        .map(lon_lat)
        .collect::<Result<Vec<_>, _>>()?;
    if coords.len() < 4 {
        return Err(format!(
            "{which} has {} position(s); a closed ring needs at least 4",
            coords.len()
        ));
    }
    match (coords.first(), coords.last()) {
        (Some(f), Some(l)) if f == l => Ok(LineString::new(coords)),
        (Some(f), Some(l)) => Err(format!(
            "{which} is not closed: it starts at [{}, {}] and ends at [{}, {}]",
            f.x, f.y, l.x, l.y
        )),
        _ => Err(format!("{which} is empty")),
    }
}

fn polygon(rings: &[Vec<Position>], label: &str) -> Result<Polygon<f64>, String> {
    let Some((outer, holes)) = rings.split_first() else {
        return Err(format!("{label}has no rings (missing coordinates)"));
    };
    let exterior = ring(outer, &format!("{label}outer ring"))?;
    let interiors = holes
        .iter()
        .enumerate()
        .map(|(i, h)| ring(h, &format!("{label}hole {}", i + 1)))
        .collect::<Result<Vec<_>, _>>()?;
    // An unsplit ring across ±180° is made continuous (RFC 7946 §3.1.9; [`super::antimeridian`]).
    super::antimeridian::unwrap_polygon(&Polygon::new(exterior, interiors))
        .map_err(|m| format!("{label}{m}"))
}

fn polyline(positions: &[Position], label: &str) -> Result<Vec<LatLon>, String> {
    let coords = positions
        .iter()
        .map(lon_lat)
        .collect::<Result<Vec<_>, _>>()?;
    if coords.len() < 2 {
        return Err(format!(
            "{label}has {} position(s); a trace needs at least 2",
            coords.len()
        ));
    }
    Ok(coords.into_iter().map(|c| LatLon::new(c.y, c.x)).collect())
}

/// A numeric property: a JSON number, or text holding one (decimal comma accepted).
/// `Ok(None)` when absent or null; `Err` with what was found when not numeric.
fn number_property(props: Option<&JsonObject>, key: &str) -> Result<Option<f64>, String> {
    match props.and_then(|p| p.get(key)) {
        None | Some(JsonValue::Null) => Ok(None),
        Some(JsonValue::Number(n)) => match n.as_f64() {
            Some(v) if v.is_finite() => Ok(Some(v)),
            _ => Err(format!("`{key}`: expected a number, found {n}")),
        },
        Some(JsonValue::String(s)) if s.trim().is_empty() => Ok(None),
        Some(JsonValue::String(s)) => match s.trim().replace(',', ".").parse::<f64>() {
            Ok(v) if v.is_finite() => Ok(Some(v)),
            _ => Err(format!("`{key}`: expected a number, found \"{s}\"")),
        },
        Some(other) => Err(format!("`{key}`: expected a number, found {other}")),
    }
}

fn name_property(props: Option<&JsonObject>) -> Option<String> {
    match props.and_then(|p| p.get("name")) {
        Some(JsonValue::String(s)) if !s.trim().is_empty() => Some(s.trim().to_string()),
        Some(JsonValue::Number(n)) => Some(n.to_string()),
        _ => None,
    }
}

/// Reads the district features. Bad geometry: the feature is skipped (error). Missing
/// name: `district N` is used (warning). A non-numeric or out-of-range hazard property is
/// ignored (warning); the polygon is still used for assignment.
pub(crate) fn districts(values: &[JsonValue], problems: &mut Vec<Problem>) -> Vec<District> {
    let mut out = Vec::new();
    for (i, value) in values.iter().enumerate() {
        let number = i + 1;
        let raw_props = value.get("properties").and_then(JsonValue::as_object);
        let name = name_property(raw_props);
        let at = FeatureAt {
            sheet: "districts",
            feature: number,
            name: name.as_deref(),
        };
        let Some(feature) = at.parsed(value, "feature", problems) else {
            continue;
        };
        let shape = match feature.geometry.as_ref().map(|g| &g.value) {
            Some(GeometryValue::Polygon { coordinates }) => {
                polygon(coordinates, "").map(|p| MultiPolygon::new(vec![p]))
            }
            Some(GeometryValue::MultiPolygon { coordinates }) => coordinates
                .iter()
                .enumerate()
                .map(|(k, p)| polygon(p, &format!("polygon {}: ", k + 1)))
                .collect::<Result<Vec<_>, _>>()
                .map(MultiPolygon::new),
            Some(other) => Err(format!(
                "wrong geometry type {}: a district must be a Polygon or MultiPolygon",
                other.type_name()
            )),
            None => Err("missing geometry".into()),
        };
        let shape = match shape {
            Ok(s) => s,
            Err(m) => {
                problems.push(at.problem(
                    "geometry",
                    format!("{m}; feature skipped"),
                    Severity::Error,
                ));
                continue;
            }
        };
        let props = feature.properties.as_ref();
        let name = match &name {
            Some(n) => n.clone(),
            None => {
                let fallback = format!("district {number}");
                problems.push(at.problem(
                    "name",
                    format!("no `name` property; called \"{fallback}\""),
                    Severity::Warning,
                ));
                fallback
            }
        };
        let mut hazard = DistrictHazard::default();
        let positive = |key: &str, problems: &mut Vec<Problem>| match number_property(props, key) {
            Ok(Some(v)) if v > 0.0 => Some(v),
            Ok(Some(v)) => {
                problems.push(at.problem(
                    key,
                    format!("`{key}`: expected a positive number, found {v}; ignored"),
                    Severity::Warning,
                ));
                None
            }
            Ok(None) => None,
            Err(m) => {
                problems.push(at.problem(key, format!("{m}; ignored"), Severity::Warning));
                None
            }
        };
        hazard.agr_g = positive("agr_g", problems);
        hazard.sds_g = positive("sds_g", problems);
        hazard.sd1_g = positive("sd1_g", problems);
        hazard.ground_type = match props.and_then(|p| p.get("ground_type")) {
            None | Some(JsonValue::Null) => None,
            Some(JsonValue::String(s)) if s.trim().is_empty() => None,
            Some(v) => {
                let text = v.as_str().map_or_else(|| v.to_string(), str::to_string);
                let parsed = GroundType::parse_text(&text);
                if parsed.is_none() {
                    problems.push(at.problem(
                        "ground_type",
                        format!("`ground_type`: expected one of A–E, found {v}; ignored"),
                        Severity::Warning,
                    ));
                }
                parsed
            }
        };
        out.push(District {
            feature: number,
            name,
            shape,
            hazard,
        });
    }
    out
}

/// Reads the fault-trace features. Bad geometry: the trace is skipped (error). A
/// non-numeric `mw` is reported and the trace is kept as a trace without magnitude
/// (`near_fault_km` then applies). Missing name: `fault N` (warning).
pub(crate) fn faults(values: &[JsonValue], problems: &mut Vec<Problem>) -> Vec<FaultTrace> {
    let mut out = Vec::new();
    for (i, value) in values.iter().enumerate() {
        let number = i + 1;
        let raw_props = value.get("properties").and_then(JsonValue::as_object);
        let name = name_property(raw_props);
        let at = FeatureAt {
            sheet: "faults",
            feature: number,
            name: name.as_deref(),
        };
        let Some(feature) = at.parsed(value, "trace", problems) else {
            continue;
        };
        let parts = match feature.geometry.as_ref().map(|g| &g.value) {
            Some(GeometryValue::LineString { coordinates }) => {
                polyline(coordinates, "").map(|l| vec![l])
            }
            Some(GeometryValue::MultiLineString { coordinates }) => coordinates
                .iter()
                .enumerate()
                .map(|(k, l)| polyline(l, &format!("line {}: ", k + 1)))
                .collect::<Result<Vec<_>, _>>(),
            Some(other) => Err(format!(
                "wrong geometry type {}: a fault trace must be a LineString or MultiLineString",
                other.type_name()
            )),
            None => Err("missing geometry".into()),
        };
        let parts = match parts {
            Ok(p) if !p.is_empty() => p,
            Ok(_) => {
                problems.push(at.problem(
                    "geometry",
                    "missing coordinates (no lines); trace skipped".into(),
                    Severity::Error,
                ));
                continue;
            }
            Err(m) => {
                problems.push(at.problem(
                    "geometry",
                    format!("{m}; trace skipped"),
                    Severity::Error,
                ));
                continue;
            }
        };
        let props = feature.properties.as_ref();
        let mw = match number_property(props, "mw") {
            Ok(v) => v,
            Err(m) => {
                problems.push(at.problem(
                    "mw",
                    format!("{m}; the trace is kept as a trace without magnitude"),
                    Severity::Warning,
                ));
                None
            }
        };
        let name = match &name {
            Some(n) => n.clone(),
            None => {
                let fallback = format!("fault {number}");
                problems.push(at.problem(
                    "name",
                    format!("no `name` property; called \"{fallback}\""),
                    Severity::Warning,
                ));
                fallback
            }
        };
        out.push(FaultTrace {
            feature: number,
            name,
            mw,
            parts,
        });
    }
    out
}
