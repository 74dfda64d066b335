/*!
Geography: district polygons and fault traces (GeoJSON), giving each building its district,
district hazard overrides and its distance to the nearest fault trace (inventory.md,
"Companion geography"; method §10 `near-fault`).

- Districts: a building without a `district` gets the first district, in file order, whose
  polygon covers its point — edges and vertices included. (geo's `Contains` is false on the
  boundary, so the test is `Intersects` of the point with the polygon, which is the
  "covers" predicate for a point.) Candidates come from an R-tree of polygon bounding boxes,
  so a lookup costs O(log n) plus the few polygons whose box holds the point. Polygon edges
  are straight lines in longitude/latitude, as GeoJSON prescribes (RFC 7946 §3.1.1).
  Districts across the antimeridian: cut into a MultiPolygon at ±180° (RFC 7946 §3.1.9) they
  need nothing more; an unsplit ring is shifted to continuous longitudes up to 360°
  ([`antimeridian`]) and a point is then also tested at its longitude + 360°.
- Hazard: the district whose `name` equals the building's district (given or assigned)
  lends its `agr_g`, `ground_type`, `sds_g`, `sd1_g`; the engine applies them where the row
  gives none. Names are compared trimmed; an exact match wins, else a case-insensitive one.
- Faults: the Haversine distance (mean Earth radius 6 371 008.8 m) to the closest point of
  the trace's great-circle segments ([`sphere`]). Traces are cut into pieces of a few
  segments whose longitude/latitude boxes (poleward bulge of the arcs included) form an
  R-tree; a building measures only the pieces whose box meets the box around a spherical
  cap about it, so the cost per building does not grow with the number of traces.
- Bad input never stops the screening: bad features are reported (feature number and what
  is wrong) and skipped; buildings outside every district or without coordinates are
  reported and still screened.
*/

pub mod antimeridian;
pub mod features;
pub mod sphere;

use std::collections::HashMap;
use std::path::Path;

use geo::{BoundingRect, Intersects, Point};
use rayon::prelude::*;
use rstar::RTree;
use rstar::primitives::{GeomWithData, Rectangle};

pub use features::{District, DistrictHazard, FaultTrace};
pub use sphere::{LatLon, MEAN_EARTH_RADIUS_M};

use crate::model::{BuildingRecord, FaultDistance, NearFault, Problem, Severity, SiteInfo};
use crate::settings::Settings;

/// Segments per piece of a trace (each piece is one entry of the trace R-tree).
const PIECE_SEGMENTS: usize = 4;

/// A run of consecutive segments of one polyline of a trace.
#[derive(Debug, Clone)]
struct Piece {
    /// Trace index.
    trace: usize,
    /// Polyline index within the trace.
    part: usize,
    /// First vertex index.
    first: usize,
    /// Last vertex index (inclusive).
    last: usize,
}

/// A fault trace with its vertices as unit vectors.
#[derive(Debug, Clone)]
struct IndexedTrace {
    trace: FaultTrace,
    vectors: Vec<Vec<sphere::Vec3>>,
}

/// Splits a trace into pieces of at most [`PIECE_SEGMENTS`] segments, each with its
/// longitude/latitude box (holding the great-circle arcs, poleward bulge included; the
/// whole longitude range for a piece crossing the antimeridian).
fn trace_pieces(index: usize, t: &IndexedTrace) -> Vec<(Piece, [f64; 4])> {
    let mut out = Vec::new();
    for (k, (part, vecs)) in t.trace.parts.iter().zip(&t.vectors).enumerate() {
        if part.is_empty() {
            continue;
        }
        let mut first = 0;
        loop {
            let last = (first + PIECE_SEGMENTS).min(part.len() - 1);
            let (mut lo_lon, mut lo_lat, mut hi_lon, mut hi_lat) =
                (f64::MAX, f64::MAX, f64::MIN, f64::MIN);
            for p in part.get(first..=last).unwrap_or_default() {
                lo_lon = lo_lon.min(p.lon);
                hi_lon = hi_lon.max(p.lon);
                lo_lat = lo_lat.min(p.lat);
                hi_lat = hi_lat.max(p.lat);
            }
            for w in vecs.get(first..=last).unwrap_or_default().windows(2) {
                if let [a, b] = w {
                    let (lo, hi) = sphere::arc_lat_range(*a, *b);
                    lo_lat = lo_lat.min(lo);
                    hi_lat = hi_lat.max(hi);
                }
            }
            let crosses_antimeridian = part
                .get(first..=last)
                .unwrap_or_default()
                .windows(2)
                .any(|w| matches!(w, [a, b] if (a.lon - b.lon).abs() > 180.0));
            if crosses_antimeridian {
                (lo_lon, hi_lon) = (-180.0, 180.0);
            }
            out.push((
                Piece {
                    trace: index,
                    part: k,
                    first,
                    last,
                },
                [lo_lon, lo_lat, hi_lon, hi_lat],
            ));
            if last + 1 >= part.len() {
                break;
            }
            first = last;
        }
    }
    out
}

type BoxEntry = GeomWithData<Rectangle<[f64; 2]>, usize>;

/// District polygons and fault traces, as loaded and indexed.
#[derive(Debug, Clone, Default)]
pub struct Geography {
    districts: Vec<District>,
    district_boxes: RTree<BoxEntry>,
    by_name: HashMap<String, usize>,
    by_lower_name: HashMap<String, usize>,
    traces: Vec<IndexedTrace>,
    pieces: Vec<Piece>,
    piece_boxes: RTree<BoxEntry>,
    /// Some district has longitudes beyond 180° (shifted across the antimeridian), so points
    /// are also tested at longitude + 360°.
    wraps: bool,
    /// A districts file was given (even if none of its features was usable).
    districts_given: bool,
    /// A faults file was given.
    faults_given: bool,
}

/// Places every building: district (given or assigned), district hazard, nearest fault and
/// near-fault trigger. Keyed by building id. Problems are reported, never fatal.
pub fn locate(
    buildings: &[BuildingRecord],
    geo: &Geography,
    settings: &Settings,
) -> (HashMap<String, SiteInfo>, Vec<Problem>) {
    let max_limit_m = geo.max_limit_m(settings);
    let placed: Vec<(SiteInfo, Vec<Problem>)> = buildings
        .par_iter()
        .map(|b| geo.place(b, settings, max_limit_m))
        .collect();
    let mut sites = HashMap::with_capacity(buildings.len());
    let mut problems = Vec::new();
    for (b, (site, mut p)) in buildings.iter().zip(placed) {
        sites.insert(b.id.clone(), site);
        problems.append(&mut p);
    }
    (sites, problems)
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

/// The near-fault distance limit (km) of a trace of magnitude `mw`, or `None` when the
/// trace never flags (method §10 `near-fault`, after the ASCE 7-16 §11.4.1 near-fault site
/// definition): Mw ≥ `near_fault_mw_large` → `near_fault_km_large`; `near_fault_mw_small` ≤
/// Mw < `near_fault_mw_large` → `near_fault_km_small`; Mw < `near_fault_mw_small` → never;
/// no magnitude → `near_fault_km`.
pub fn near_fault_limit_km(mw: Option<f64>, s: &Settings) -> Option<f64> {
    match mw {
        None => Some(s.near_fault_km),
        Some(m) if m >= s.near_fault_mw_large => Some(s.near_fault_km_large),
        Some(m) if m >= s.near_fault_mw_small => Some(s.near_fault_km_small),
        Some(_) => None,
    }
}

/// Largest geography file read (bytes). A GeoJSON file is parsed whole into memory (several
/// times its size), so a bigger one is refused before reading; district and fault files are
/// normally a few megabytes.
pub const MAX_GEOJSON_BYTES: u64 = 256 << 20;

fn read_json(path: &Path) -> Result<Vec<geojson::JsonValue>, GeoError> {
    read_json_within(path, MAX_GEOJSON_BYTES)
}

fn read_json_within(path: &Path, max_bytes: u64) -> Result<Vec<geojson::JsonValue>, GeoError> {
    let unreadable = |message: String| GeoError::Unreadable {
        path: path.display().to_string(),
        message,
    };
    let len = std::fs::metadata(path)
        .map_err(|e| unreadable(format!("cannot read: {e}")))?
        .len();
    if len > max_bytes {
        return Err(unreadable(format!(
            "the file has {len} bytes, more than the budget of {max_bytes} bytes for a \
             geography file"
        )));
    }
    let bytes = std::fs::read(path).map_err(|e| unreadable(format!("cannot read: {e}")))?;
    let doc: geojson::JsonValue = serde_json::from_slice(&bytes)
        .map_err(|e| unreadable(format!("not a GeoJSON file (not valid JSON: {e})")))?;
    features::feature_values(doc).map_err(unreadable)
}

impl Geography {
    /// Loads district polygons and/or fault traces. Bad features are reported as problems
    /// (sheet `districts` / `faults`, row = feature number, 1-based in file order) and
    /// skipped; a file that cannot be read or is not GeoJSON is an error.
    pub fn load(
        districts: Option<&Path>,
        faults: Option<&Path>,
    ) -> Result<(Geography, Vec<Problem>), GeoError> {
        let d = districts.map(read_json).transpose()?;
        let f = faults.map(read_json).transpose()?;
        Ok(Self::from_feature_values(d.as_deref(), f.as_deref()))
    }

    /// Builds the geography from GeoJSON texts (`None` = file not given). A text that is
    /// not GeoJSON is an error naming `"districts"` or `"faults"`.
    pub fn from_geojson_str(
        districts: Option<&str>,
        faults: Option<&str>,
    ) -> Result<(Geography, Vec<Problem>), GeoError> {
        let parse = |text: &str, what: &str| {
            let unreadable = |message: String| GeoError::Unreadable {
                path: what.to_string(),
                message,
            };
            let doc: geojson::JsonValue = serde_json::from_str(text)
                .map_err(|e| unreadable(format!("not a GeoJSON file (not valid JSON: {e})")))?;
            features::feature_values(doc).map_err(unreadable)
        };
        let d = districts.map(|t| parse(t, "districts")).transpose()?;
        let f = faults.map(|t| parse(t, "faults")).transpose()?;
        Ok(Self::from_feature_values(d.as_deref(), f.as_deref()))
    }

    fn from_feature_values(
        districts: Option<&[geojson::JsonValue]>,
        faults: Option<&[geojson::JsonValue]>,
    ) -> (Geography, Vec<Problem>) {
        let mut problems = Vec::new();
        let d = districts
            .map(|v| features::districts(v, &mut problems))
            .unwrap_or_default();
        let f = faults
            .map(|v| features::faults(v, &mut problems))
            .unwrap_or_default();
        let mut geo = Self::new(d, f);
        geo.districts_given = districts.is_some();
        geo.faults_given = faults.is_some();
        (geo, problems)
    }

    /// Builds and indexes a geography from checked districts and traces (as if both files
    /// had been given).
    pub fn new(districts: Vec<District>, traces: Vec<FaultTrace>) -> Geography {
        // Districts made by hand (not read by `features`) get the same antimeridian
        // normalisation; a polygon that cannot be normalised is kept as given.
        let districts: Vec<District> = districts
            .into_iter()
            .map(|mut d| {
                for p in &mut d.shape.0 {
                    if let Ok(q) = antimeridian::unwrap_polygon(p) {
                        *p = q;
                    }
                }
                d
            })
            .collect();
        let wraps = districts
            .iter()
            .filter_map(|d| d.shape.bounding_rect())
            .any(|r| r.max().x > 180.0);
        let boxes = districts
            .iter()
            .enumerate()
            .filter_map(|(i, d)| {
                d.shape.bounding_rect().map(|r| {
                    GeomWithData::new(
                        Rectangle::from_corners([r.min().x, r.min().y], [r.max().x, r.max().y]),
                        i,
                    )
                })
            })
            .collect();
        let mut by_name = HashMap::new();
        let mut by_lower_name = HashMap::new();
        for (i, d) in districts.iter().enumerate() {
            by_name.entry(d.name.clone()).or_insert(i);
            by_lower_name.entry(d.name.to_lowercase()).or_insert(i);
        }
        let traces: Vec<IndexedTrace> = traces
            .into_iter()
            .map(|trace| {
                let vectors = trace
                    .parts
                    .iter()
                    .map(|part| part.iter().map(|p| sphere::unit(*p)).collect())
                    .collect();
                IndexedTrace { trace, vectors }
            })
            .collect();
        let mut pieces = Vec::new();
        let mut piece_boxes = Vec::new();
        for (i, t) in traces.iter().enumerate() {
            for (piece, [x0, y0, x1, y1]) in trace_pieces(i, t) {
                piece_boxes.push(GeomWithData::new(
                    Rectangle::from_corners([x0, y0], [x1, y1]),
                    pieces.len(),
                ));
                pieces.push(piece);
            }
        }
        Geography {
            districts,
            district_boxes: RTree::bulk_load(boxes),
            by_name,
            by_lower_name,
            traces,
            pieces,
            piece_boxes: RTree::bulk_load(piece_boxes),
            wraps,
            districts_given: true,
            faults_given: true,
        }
    }

    /// The usable districts, in file order.
    pub fn districts(&self) -> &[District] {
        &self.districts
    }

    /// The usable fault traces, in file order.
    pub fn faults(&self) -> impl Iterator<Item = &FaultTrace> {
        self.traces.iter().map(|t| &t.trace)
    }

    /// The first district in file order whose polygon covers the point (edges and vertices
    /// included; a point in a hole is outside). When a district was shifted across the
    /// antimeridian ([`antimeridian`]), the point is also tested at longitude + 360°.
    pub fn district_at(&self, p: LatLon) -> Option<&District> {
        let first_at = |lon: f64| {
            let point = Point::new(lon, p.lat);
            self.district_boxes
                .locate_all_at_point(&[lon, p.lat])
                .map(|entry| entry.data)
                .filter(|&i| {
                    self.districts
                        .get(i)
                        // Intersects, not Contains: a point on an edge or vertex is covered.
                        .is_some_and(|d| d.shape.intersects(&point))
                })
                .min()
        };
        let here = first_at(p.lon);
        let shifted = if self.wraps {
            first_at(p.lon + 360.0)
        } else {
            None
        };
        here.into_iter()
            .chain(shifted)
            .min()
            .and_then(|i| self.districts.get(i))
    }

    /// The district named `name` (trimmed; exact match first, else case-insensitive).
    pub fn district_named(&self, name: &str) -> Option<&District> {
        let name = name.trim();
        self.by_name
            .get(name)
            .or_else(|| self.by_lower_name.get(&name.to_lowercase()))
            .and_then(|&i| self.districts.get(i))
    }

    /// The largest near-fault limit (m) of any trace under these settings (0 when none).
    fn max_limit_m(&self, settings: &Settings) -> f64 {
        self.traces
            .iter()
            .filter_map(|t| near_fault_limit_km(t.trace.mw, settings))
            .fold(0.0, f64::max)
            * 1000.0
    }

    /// The nearest trace (ties: first in file order) and the trace that triggers the
    /// near-fault flag (the nearest among those within their limit), for a point.
    pub fn faults_near(
        &self,
        p: LatLon,
        settings: &Settings,
    ) -> (Option<FaultDistance>, Option<NearFault>) {
        self.faults_near_within(p, settings, self.max_limit_m(settings))
    }

    /// [`Self::faults_near`] with the largest near-fault limit precomputed.
    ///
    /// Search: the R-tree of trace pieces is asked for every piece whose box meets the box
    /// around the cap of radius D about the point ([`sphere::cap_box`]); that set holds every
    /// piece within D. Round 1 uses D = the largest near-fault limit: it settles the
    /// triggering trace, and the nearest trace when one lies within D. Otherwise the piece
    /// nearest in plain degrees (R-tree nearest neighbour) is measured; its distance bounds
    /// the true nearest distance from above, and round 2 with D = that bound finds the
    /// nearest. Distances are compared as angles; the reported distance is the Haversine
    /// distance from the point to the closest point found.
    fn faults_near_within(
        &self,
        p: LatLon,
        settings: &Settings,
        max_limit_m: f64,
    ) -> (Option<FaultDistance>, Option<NearFault>) {
        let r = MEAN_EARTH_RADIUS_M;
        if self.traces.is_empty() {
            return (None, None);
        }
        let vp = sphere::unit(p);
        // Round 1: every piece within the largest near-fault limit.
        let radius_m = max_limit_m.max(1000.0);
        let per_trace = self.traces_within(p, vp, radius_m);
        let mut trigger: Option<(f64, usize, sphere::Vec3, f64)> = None;
        for &(i, d, foot) in &per_trace {
            let limit = self
                .traces
                .get(i)
                .and_then(|t| near_fault_limit_km(t.trace.mw, settings))
                .map(|km| km * 1000.0);
            if let Some(l) = limit
                && d * r <= l
                && trigger.is_none_or(|(best, j, _, _)| (d, i) < (best, j))
            {
                trigger = Some((d, i, foot, l));
            }
        }
        let best_of = |v: &[(usize, f64, sphere::Vec3)]| {
            v.iter()
                .copied()
                .min_by(|a, b| a.1.total_cmp(&b.1).then(a.0.cmp(&b.0)))
        };
        let mut nearest = best_of(&per_trace).filter(|&(_, d, _)| d * r <= radius_m);
        if nearest.is_none() {
            // Round 2: the piece nearest in plain degrees gives an upper bound of the true
            // nearest distance; every piece within that bound is then measured.
            let upper = self
                .piece_boxes
                .nearest_neighbor(&[p.lon, p.lat])
                .and_then(|e| self.pieces.get(e.data))
                .and_then(|piece| self.piece_closest(piece, vp))
                .map(|(_, d)| d * r);
            if let Some(upper) = upper {
                nearest = best_of(&self.traces_within(p, vp, upper * (1.0 + 1e-9) + 1e-6));
            }
        }
        let nearest = nearest.map(|(i, d, foot)| (d, i, foot));
        let name_of = |i: usize| {
            self.traces
                .get(i)
                .map(|t| t.trace.name.clone())
                .unwrap_or_default()
        };
        let distance = |foot: sphere::Vec3| sphere::haversine_m(p, sphere::position(foot), r);
        let fault = nearest.map(|(_, i, foot)| FaultDistance {
            name: name_of(i),
            distance_m: distance(foot),
        });
        let near = trigger.map(|(_, i, foot, l)| NearFault {
            name: name_of(i),
            distance_m: distance(foot),
            mw: self.traces.get(i).and_then(|t| t.trace.mw),
            limit_km: l / 1000.0,
        });
        (fault, near)
    }

    /// Per trace met: (trace index, angle in rad, closest point), over every piece whose box
    /// meets the box around the cap of radius `radius_m` about `p` — which includes every
    /// piece within `radius_m` of `p`.
    fn traces_within(
        &self,
        p: LatLon,
        vp: sphere::Vec3,
        radius_m: f64,
    ) -> Vec<(usize, f64, sphere::Vec3)> {
        let mut per_trace: Vec<(usize, f64, sphere::Vec3)> = Vec::new();
        let [x0, y0, x1, y1] = sphere::cap_box(p, radius_m / MEAN_EARTH_RADIUS_M);
        let query = rstar::AABB::from_corners([x0, y0], [x1, y1]);
        for entry in self.piece_boxes.locate_in_envelope_intersecting(&query) {
            let Some(piece) = self.pieces.get(entry.data) else {
                continue;
            };
            let Some((foot, d)) = self.piece_closest(piece, vp) else {
                continue;
            };
            match per_trace.iter_mut().find(|(t, _, _)| *t == piece.trace) {
                Some(slot) if d < slot.1 => *slot = (piece.trace, d, foot),
                Some(_) => {}
                None => per_trace.push((piece.trace, d, foot)),
            }
        }
        per_trace
    }

    /// The closest point of one piece to the unit vector `p`, with its angle (rad).
    fn piece_closest(&self, piece: &Piece, p: sphere::Vec3) -> Option<(sphere::Vec3, f64)> {
        let vs = self
            .traces
            .get(piece.trace)?
            .vectors
            .get(piece.part)?
            .get(piece.first..=piece.last)?;
        if let [only] = vs {
            return Some((*only, sphere::angle(p, *only)));
        }
        vs.windows(2)
            .filter_map(|w| match w {
                [a, b] => Some(sphere::segment_foot(p, *a, *b)),
                _ => None,
            })
            .min_by(|a, b| a.1.total_cmp(&b.1))
    }

    /// District, hazard and fault data of one building, with the problems found.
    fn place(
        &self,
        b: &BuildingRecord,
        settings: &Settings,
        max_limit_m: f64,
    ) -> (SiteInfo, Vec<Problem>) {
        let mut problems = Vec::new();
        let warn = |column: &str, message: String| Problem {
            sheet: "buildings".into(),
            row: Some(b.row),
            column: column.into(),
            message,
            severity: Severity::Warning,
        };
        let uses_geography = self.districts_given || self.faults_given;
        let point = match (b.latitude, b.longitude) {
            (Some(lat), Some(lon)) => {
                if !(lat.is_finite() && (-90.0..=90.0).contains(&lat)) {
                    if uses_geography {
                        problems.push(warn(
                            "latitude",
                            format!("latitude {lat} outside ±90°: no district or fault lookup"),
                        ));
                    }
                    None
                } else if !(lon.is_finite() && (-180.0..=180.0).contains(&lon)) {
                    if uses_geography {
                        problems.push(warn(
                            "longitude",
                            format!("longitude {lon} outside ±180°: no district or fault lookup"),
                        ));
                    }
                    None
                } else {
                    Some(LatLon::new(lat, lon))
                }
            }
            _ => None,
        };
        let given = b
            .district
            .as_deref()
            .map(str::trim)
            .filter(|s| !s.is_empty());
        let mut site = SiteInfo::default();
        // inventory.md, "Coordinates": outside every district as given, inside one with
        // latitude and longitude swapped → they look swapped (the point is used as given).
        let swapped_into = point
            .filter(|_| self.districts_given)
            .filter(|p| self.district_at(*p).is_none())
            .filter(|p| (-90.0..=90.0).contains(&p.lon))
            .and_then(|p| self.district_at(LatLon::new(p.lon, p.lat)))
            .map(|d| d.name.clone());
        if let (Some(d), Some(p)) = (&swapped_into, point) {
            problems.push(warn(
                "latitude",
                format!(
                    "latitude and longitude look swapped: the point (latitude {}, longitude {}) lies outside every district polygon, but with the two swapped it lies in district \"{d}\"; the point is used as given: check the two columns",
                    p.lat, p.lon
                ),
            ));
        }
        match (given, point) {
            (Some(name), _) => site.district = name.to_string(),
            (None, Some(p)) if self.districts_given => match self.district_at(p) {
                Some(d) => site.district = d.name.clone(),
                None if swapped_into.is_some() => {}
                None => problems.push(warn(
                    "",
                    format!(
                        "the point (latitude {}, longitude {}) lies outside every district \
                         polygon: no district assigned; the building is still screened",
                        p.lat, p.lon
                    ),
                )),
            },
            (None, None) if self.districts_given && point_missing(b) => problems.push(warn(
                "",
                "no latitude/longitude and no district: no district assigned".into(),
            )),
            _ => {}
        }
        if self.districts_given && !site.district.is_empty() {
            match self.district_named(&site.district) {
                Some(d) => {
                    site.agr_g = d.hazard.agr_g;
                    site.ground_type = d.hazard.ground_type;
                    site.sds_g = d.hazard.sds_g;
                    site.sd1_g = d.hazard.sd1_g;
                }
                None => problems.push(warn(
                    "district",
                    format!(
                        "district \"{}\" is not in the districts file: no district hazard applies",
                        site.district
                    ),
                )),
            }
        }
        if self.faults_given {
            match point {
                Some(p) => {
                    let (fault, near) = self.faults_near_within(p, settings, max_limit_m);
                    site.fault = fault;
                    site.near_fault = near;
                }
                None if point_missing(b) => problems.push(warn(
                    "",
                    "no latitude/longitude: no fault distance, near-fault not assessed".into(),
                )),
                None => {}
            }
        }
        (site, problems)
    }
}

/// Latitude or longitude blank (as opposed to given but out of range, reported apart).
fn point_missing(b: &BuildingRecord) -> bool {
    b.latitude.is_none() || b.longitude.is_none()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_file_over_the_budget_is_refused_before_reading() {
        let dir = tempfile::tempdir().unwrap();
        let path = dir.path().join("big.geojson");
        std::fs::write(&path, r#"{"type":"FeatureCollection","features":[]}"#).unwrap();
        assert!(read_json_within(&path, 1000).is_ok());
        let err = read_json_within(&path, 10).unwrap_err().to_string();
        assert!(err.contains("more than the budget of 10 bytes"), "{err}");
    }

    #[test]
    fn near_fault_limits_follow_method_section_10() {
        let s = Settings::default();
        assert_eq!(
            near_fault_limit_km(Some(7.4), &s),
            Some(s.near_fault_km_large)
        );
        assert_eq!(
            near_fault_limit_km(Some(7.0), &s),
            Some(s.near_fault_km_large)
        );
        assert_eq!(
            near_fault_limit_km(Some(6.0), &s),
            Some(s.near_fault_km_small)
        );
        assert_eq!(
            near_fault_limit_km(Some(6.9), &s),
            Some(s.near_fault_km_small)
        );
        assert_eq!(near_fault_limit_km(Some(5.9), &s), None);
        assert_eq!(near_fault_limit_km(None, &s), Some(s.near_fault_km));
    }

    fn square(name: &str, x0: f64, y0: f64, size: f64) -> String {
        format!(
            r#"{{"type":"Feature","properties":{{"name":"{name}"}},"geometry":{{"type":"Polygon","coordinates":[[[{x0},{y0}],[{x1},{y0}],[{x1},{y1}],[{x0},{y1}],[{x0},{y0}]]]}}}}"#,
            x1 = x0 + size,
            y1 = y0 + size
        )
    }

    /// A trace across the antimeridian through the R-tree search (round 1 within the
    /// near-fault limit, round 2 beyond it). Hand-computed with the Haversine formula
    /// (Sinnott 1984) on the meridian through the point (Δλ = 0, d = R·Δφ, R = 6 371 008.8
    /// m): 0.05° → 5 559.754 m, 0.3° → 33 358.524 m; 0.5° to the end point → 55 597.540 m.
    /// Tolerance 1 mm (literals rounded to the millimetre).
    #[test]
    fn a_trace_across_the_antimeridian_is_measured_the_short_way() {
        let faults = r#"{"type":"FeatureCollection","features":[
            {"type":"Feature","properties":{"name":"Dateline"},"geometry":{"type":"LineString","coordinates":[[179.5,0],[-179.5,0]]}}]}"#;
        let (g, p) = Geography::from_geojson_str(None, Some(faults)).unwrap();
        assert!(p.is_empty(), "{p:?}");
        let s = Settings::default();
        // Within near_fault_km (10 km): nearest and trigger.
        let (fault, near) = g.faults_near(LatLon::new(0.05, -179.9), &s);
        let fault = fault.unwrap();
        assert!((fault.distance_m - 5_559.754).abs() < 1e-3, "{fault:?}");
        assert_eq!(near.unwrap().name, "Dateline");
        // Beyond it: nearest only.
        for (p, expected) in [
            (LatLon::new(0.3, 180.0), 33_358.524),
            (LatLon::new(-0.3, -180.0), 33_358.524),
            (LatLon::new(0.3, 179.9), 33_358.524),
            (LatLon::new(0.0, 179.0), 55_597.540),
            (LatLon::new(0.0, -179.0), 55_597.540),
        ] {
            let (fault, near) = g.faults_near(p, &s);
            let d = fault.unwrap().distance_m;
            assert!((d - expected).abs() < 1e-3, "{p:?}: {d}");
            assert!(near.is_none());
        }
        // On the far side of the globe the trace is half a turn away, not 0.
        let (fault, _) = g.faults_near(LatLon::new(0.0, 0.0), &s);
        let d = fault.unwrap().distance_m;
        assert!(
            (d - 179.5 * MEAN_EARTH_RADIUS_M.to_radians()).abs() < 1e-3,
            "{d}"
        );
    }

    /// A district built by hand (not read from GeoJSON) across the antimeridian is
    /// normalised by [`Geography::new`] too, and found through the R-tree.
    #[test]
    fn a_hand_made_district_across_the_antimeridian_is_found() {
        use geo::{LineString, MultiPolygon, Polygon};
        let ring: LineString<f64> = vec![
            (178.0, 10.0),
            (-178.0, 10.0),
            (-178.0, 12.0),
            (178.0, 12.0),
            (178.0, 10.0),
        ]
        .into();
        let d = District {
            feature: 1,
            name: "Hand".into(),
            shape: MultiPolygon::new(vec![Polygon::new(ring, vec![])]),
            hazard: DistrictHazard::default(),
        };
        let g = Geography::new(vec![d], vec![]);
        assert_eq!(
            g.district_at(LatLon::new(11.0, -179.0)).unwrap().name,
            "Hand"
        );
        assert_eq!(
            g.district_at(LatLon::new(11.0, 179.0)).unwrap().name,
            "Hand"
        );
        assert!(g.district_at(LatLon::new(11.0, 0.0)).is_none());
    }

    #[test]
    fn shared_border_goes_to_the_first_district_in_file_order() {
        let text = format!(
            r#"{{"type":"FeatureCollection","features":[{},{}]}}"#,
            square("West", 0.0, 0.0, 1.0),
            square("East", 1.0, 0.0, 1.0)
        );
        let (g, p) = Geography::from_geojson_str(Some(&text), None).unwrap();
        assert!(p.is_empty());
        let on_border = LatLon::new(0.5, 1.0);
        assert_eq!(g.district_at(on_border).unwrap().name, "West");
        assert_eq!(g.district_at(LatLon::new(0.5, 1.5)).unwrap().name, "East");
        assert!(g.district_at(LatLon::new(0.5, 2.5)).is_none());
    }

    #[test]
    fn nearest_and_trigger_can_be_different_traces() {
        // Trace A (Mw 5.5) passes 2 km away: nearest, but Mw < 6 never flags.
        // Trace B (Mw 7.2) passes ~13.3 km away: not nearest, but within 15 km → triggers.
        let km_deg = 1000.0 / (MEAN_EARTH_RADIUS_M * std::f64::consts::PI / 180.0);
        let faults = format!(
            r#"{{"type":"FeatureCollection","features":[
            {{"type":"Feature","properties":{{"name":"A","mw":5.5}},"geometry":{{"type":"LineString","coordinates":[[-1,{a}],[1,{a}]]}}}},
            {{"type":"Feature","properties":{{"name":"B","mw":7.2}},"geometry":{{"type":"LineString","coordinates":[[-1,{b}],[1,{b}]]}}}}]}}"#,
            a = 2.0 * km_deg,
            b = -13.3 * km_deg
        );
        let (g, p) = Geography::from_geojson_str(None, Some(&faults)).unwrap();
        assert!(p.is_empty(), "{p:?}");
        let (fault, near) = g.faults_near(LatLon::new(0.0, 0.0), &Settings::default());
        let fault = fault.unwrap();
        assert_eq!(fault.name, "A");
        assert!((fault.distance_m - 2000.0).abs() < 1.0);
        let near = near.unwrap();
        assert_eq!(near.name, "B");
        assert!((near.distance_m - 13_300.0).abs() < 5.0);
        assert_eq!(near.limit_km, 15.0);
        assert_eq!(near.mw, Some(7.2));
    }
}
