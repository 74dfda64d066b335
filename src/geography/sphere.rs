/*!
Distances on the sphere: the Haversine great-circle distance between two points and the
distance from a point to the closest point of a great-circle segment, plus a bounding cap
that gives a cheap lower bound of the distance to a whole fault trace.

All angles in and out are decimal degrees (WGS84 latitude/longitude taken on a sphere);
all distances are metres on a sphere of the radius passed in (the contract's mean Earth
radius [`MEAN_EARTH_RADIUS_M`]).
*/

/// Mean Earth radius R1 = (2a + b)/3 of the Geodetic Reference System 1980 (m)
/// (Moritz 2000, "Geodetic Reference System 1980", J. Geodesy 74; the IUGG mean radius),
/// the radius fixed by inventory.md (companion geography) for all fault distances.
pub const MEAN_EARTH_RADIUS_M: f64 = 6_371_008.8;

/// A geographic position in decimal degrees.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct LatLon {
    /// Latitude (degrees, north positive).
    pub lat: f64,
    /// Longitude (degrees, east positive).
    pub lon: f64,
}

impl LatLon {
    /// A position from latitude and longitude in degrees.
    pub const fn new(lat: f64, lon: f64) -> Self {
        Self { lat, lon }
    }
}

/// An earth-centred vector (unit length for positions).
pub type Vec3 = [f64; 3];

fn dot(a: Vec3, b: Vec3) -> f64 {
    a[0] * b[0] + a[1] * b[1] + a[2] * b[2]
}

fn cross(a: Vec3, b: Vec3) -> Vec3 {
    [
        a[1] * b[2] - a[2] * b[1],
        a[2] * b[0] - a[0] * b[2],
        a[0] * b[1] - a[1] * b[0],
    ]
}

fn norm(a: Vec3) -> f64 {
    dot(a, a).sqrt()
}

fn scale(a: Vec3, k: f64) -> Vec3 {
    [a[0] * k, a[1] * k, a[2] * k]
}

fn sub(a: Vec3, b: Vec3) -> Vec3 {
    [a[0] - b[0], a[1] - b[1], a[2] - b[2]]
}

/// Unit vector (earth-centred, x towards 0°/0°, z towards the north pole) of a position.
pub fn unit(p: LatLon) -> Vec3 {
    let (phi, lam) = (p.lat.to_radians(), p.lon.to_radians());
    [phi.cos() * lam.cos(), phi.cos() * lam.sin(), phi.sin()]
}

/// Position of a (not necessarily unit) earth-centred vector.
pub fn position(v: Vec3) -> LatLon {
    LatLon {
        lat: v[2].atan2(v[0].hypot(v[1])).to_degrees(),
        lon: v[1].atan2(v[0]).to_degrees(),
    }
}

/// Angle between two vectors (rad), by atan2 of |a×b| and a·b: accurate at every angle.
pub fn angle(a: Vec3, b: Vec3) -> f64 {
    norm(cross(a, b)).atan2(dot(a, b))
}

/// Haversine great-circle distance (m) between two positions (Sinnott 1984, "Virtues of
/// the Haversine", Sky & Telescope 68(2):159):
///     a = sin²(Δφ/2) + cos φ1 · cos φ2 · sin²(Δλ/2)
///     d = 2 R · atan2(√a, √(1 − a))
pub fn haversine_m(p: LatLon, q: LatLon, radius_m: f64) -> f64 {
    let (phi1, phi2) = (p.lat.to_radians(), q.lat.to_radians());
    let d_phi = phi2 - phi1;
    let d_lam = (q.lon - p.lon).to_radians();
    let a = (d_phi / 2.0).sin().powi(2) + phi1.cos() * phi2.cos() * (d_lam / 2.0).sin().powi(2);
    let a = a.clamp(0.0, 1.0);
    2.0 * radius_m * a.sqrt().atan2((1.0 - a).sqrt())
}

/// The closest point to `p` on the minor great-circle arc from `a` to `b`.
///
/// The foot of the perpendicular from `p` to the arc's great circle (the cross-track point
/// of the Aviation Formulary, E. Williams) is the answer when it lies between `a` and `b`
/// (its along-track position is inside the arc); otherwise the nearer end point is. See
/// [`segment_foot`] for the vector form.
pub fn closest_point_on_segment(p: LatLon, a: LatLon, b: LatLon) -> LatLon {
    let (foot, _) = segment_foot(unit(p), unit(a), unit(b));
    position(foot)
}

/// Vector form of [`closest_point_on_segment`] on unit vectors: returns the closest point
/// of the arc `a`–`b` to `p` (a vector, not necessarily of unit length) and its angular
/// distance from `p` (rad). n = a × b is the circle's pole; the foot is p minus its
/// component along n; it lies on the arc when (a × foot)·n ≥ 0 and (foot × b)·n ≥ 0.
/// Degenerate arcs (a = b, or a and b antipodal so that the arc is undefined) and a point at
/// the circle's pole fall back to the nearer end point.
pub fn segment_foot(p: Vec3, a: Vec3, b: Vec3) -> (Vec3, f64) {
    let nearer_end = || {
        let (da, db) = (angle(p, a), angle(p, b));
        if da <= db { (a, da) } else { (b, db) }
    };
    let n = cross(a, b);
    let nn = norm(n);
    if nn < 1e-15 {
        return nearer_end();
    }
    let n_hat = scale(n, 1.0 / nn);
    let s = dot(p, n_hat);
    let foot = sub(p, scale(n_hat, s));
    let foot_len = norm(foot);
    if foot_len < 1e-15 {
        return nearer_end();
    }
    if dot(cross(a, foot), n) >= 0.0 && dot(cross(foot, b), n) >= 0.0 {
        // Cross-track angle: atan2(|p·n̂|, |foot|).
        (foot, s.abs().atan2(foot_len))
    } else {
        nearer_end()
    }
}

/// Distance (m) from `p` to the closest point of the great-circle segment `a`–`b`: the
/// Haversine distance from `p` to [`closest_point_on_segment`]. Not the distance to the
/// infinite great circle (the closest point is kept inside the segment), not planar degrees.
pub fn point_segment_distance_m(p: LatLon, a: LatLon, b: LatLon, radius_m: f64) -> f64 {
    haversine_m(p, closest_point_on_segment(p, a, b), radius_m)
}

/// Distance (m) from `p` to the closest point of a polyline of great-circle segments
/// (a single vertex counts as a point). `f64::INFINITY` for an empty polyline.
pub fn point_polyline_distance_m(p: LatLon, line: &[LatLon], radius_m: f64) -> f64 {
    match line {
        [] => f64::INFINITY,
        [only] => haversine_m(p, *only, radius_m),
        _ => line
            .windows(2)
            .map(|w| match w {
                [a, b] => point_segment_distance_m(p, *a, *b, radius_m),
                _ => f64::INFINITY,
            })
            .fold(f64::INFINITY, f64::min),
    }
}

/// A spherical cap holding every point of a set of great-circle polylines: a centre and an
/// angular radius below 90°. A cap of radius below 90° is convex on the sphere (the minor
/// arc between two of its points stays inside it), so a cap around the vertices holds the
/// whole polyline — which a latitude/longitude box around the vertices does not (great-
/// circle arcs bulge towards the pole). The triangle inequality on the sphere then gives a
/// lower bound of the distance from any point to the polylines.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct BoundingCap {
    centre: Vec3,
    radius_rad: f64,
}

impl BoundingCap {
    /// The cap around all vertices, centred on their normalised mean; `None` when the
    /// vertices spread over 90° or more (no useful cap) or there are none.
    pub fn around<'a>(points: impl IntoIterator<Item = &'a LatLon> + Clone) -> Option<Self> {
        let mut sum = [0.0; 3];
        let mut count = 0usize;
        for p in points.clone() {
            let v = unit(*p);
            sum = [sum[0] + v[0], sum[1] + v[1], sum[2] + v[2]];
            count += 1;
        }
        let len = norm(sum);
        if count == 0 || len < 1e-12 {
            return None;
        }
        let centre = scale(sum, 1.0 / len);
        let radius_rad = points
            .into_iter()
            .map(|p| angle(centre, unit(*p)))
            .fold(0.0, f64::max);
        // Convexity needs a radius below 90°; a little slack covers rounding.
        let radius_rad = radius_rad * (1.0 + 1e-9) + 1e-12;
        (radius_rad < std::f64::consts::FRAC_PI_2).then_some(Self { centre, radius_rad })
    }

    /// A lower bound of the distance (m) from `p` to anything inside the cap:
    /// R · max(0, angle(p, centre) − cap radius).
    pub fn lower_bound_m(&self, p: LatLon, radius_m: f64) -> f64 {
        radius_m * self.lower_bound_rad(unit(p))
    }

    /// The same lower bound as an angle (rad), for a unit vector.
    pub fn lower_bound_rad(&self, p: Vec3) -> f64 {
        (angle(p, self.centre) - self.radius_rad).max(0.0)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    const R: f64 = MEAN_EARTH_RADIUS_M;

    /// One degree of arc on the sphere (m): R·π/180.
    fn deg_m() -> f64 {
        R * std::f64::consts::PI / 180.0
    }

    #[test]
    fn haversine_along_a_meridian_is_r_times_the_latitude_difference() {
        let d = haversine_m(LatLon::new(10.0, 20.0), LatLon::new(11.5, 20.0), R);
        assert_relative_eq!(d, 1.5 * deg_m(), max_relative = 1e-12);
    }

    #[test]
    fn haversine_is_symmetric_and_zero_on_itself() {
        let (p, q) = (LatLon::new(38.1, 23.7), LatLon::new(37.9, 24.2));
        assert_relative_eq!(
            haversine_m(p, q, R),
            haversine_m(q, p, R),
            max_relative = 1e-14
        );
        assert_eq!(haversine_m(p, p, R), 0.0);
    }

    #[test]
    fn abreast_of_an_equatorial_segment_the_distance_is_the_latitude() {
        // Segment on the equator from lon 0 to lon 2; the point at lon 1, lat 0.3 is
        // abreast of the interior: the closest point is (0, 1) and the distance R·0.3°.
        let d = point_segment_distance_m(
            LatLon::new(0.3, 1.0),
            LatLon::new(0.0, 0.0),
            LatLon::new(0.0, 2.0),
            R,
        );
        assert_relative_eq!(d, 0.3 * deg_m(), max_relative = 1e-9);
        let c = closest_point_on_segment(
            LatLon::new(0.3, 1.0),
            LatLon::new(0.0, 0.0),
            LatLon::new(0.0, 2.0),
        );
        assert!(c.lat.abs() < 1e-12 && (c.lon - 1.0).abs() < 1e-12);
    }

    #[test]
    fn beyond_the_end_the_distance_is_to_the_end_point_not_the_great_circle() {
        // Point on the equator's great circle but past the segment end: the great-circle
        // (cross-track) distance is 0, the segment distance is R·3°.
        let d = point_segment_distance_m(
            LatLon::new(0.0, 5.0),
            LatLon::new(0.0, 0.0),
            LatLon::new(0.0, 2.0),
            R,
        );
        assert_relative_eq!(d, 3.0 * deg_m(), max_relative = 1e-9);
    }

    #[test]
    fn segment_direction_does_not_matter() {
        let (p, a, b) = (
            LatLon::new(40.2, 22.9),
            LatLon::new(40.0, 22.0),
            LatLon::new(40.5, 23.4),
        );
        assert_relative_eq!(
            point_segment_distance_m(p, a, b, R),
            point_segment_distance_m(p, b, a, R),
            max_relative = 1e-9
        );
    }

    #[test]
    fn degenerate_segment_is_a_point() {
        let (p, a) = (LatLon::new(40.2, 22.9), LatLon::new(40.0, 22.0));
        assert_relative_eq!(
            point_segment_distance_m(p, a, a, R),
            haversine_m(p, a, R),
            max_relative = 1e-12
        );
    }

    #[test]
    fn polyline_distance_is_the_minimum_over_segments() {
        let line = [
            LatLon::new(0.0, 0.0),
            LatLon::new(0.0, 1.0),
            LatLon::new(1.0, 1.0),
        ];
        // Abreast of the second (meridian) segment, 0.2° of longitude east of it at
        // latitude 0.5°: right spherical triangle, sin d = cos φ · sin Δλ (Napier's rules).
        let d = point_polyline_distance_m(LatLon::new(0.5, 1.2), &line, R);
        let expected = R * (0.5_f64.to_radians().cos() * 0.2_f64.to_radians().sin()).asin();
        assert_relative_eq!(d, expected, max_relative = 1e-9);
        assert_eq!(
            point_polyline_distance_m(LatLon::new(0.0, 0.0), &[], R),
            f64::INFINITY
        );
    }

    #[test]
    fn cap_lower_bound_never_exceeds_the_true_distance() {
        // A high-latitude east-west trace, where the arc bulges north of its vertices.
        let line = [LatLon::new(70.0, -20.0), LatLon::new(70.0, 20.0)];
        let cap = BoundingCap::around(line.iter()).unwrap();
        for (lat, lon) in [
            (72.0, 0.0),
            (75.0, 0.0),
            (60.0, 0.0),
            (70.0, 40.0),
            (10.0, 5.0),
        ] {
            let p = LatLon::new(lat, lon);
            let exact = point_polyline_distance_m(p, &line, R);
            assert!(cap.lower_bound_m(p, R) <= exact + 1e-6, "{lat} {lon}");
        }
        // A far point gets a useful (non-zero) bound.
        assert!(cap.lower_bound_m(LatLon::new(10.0, 5.0), R) > 1.0e6);
    }

    #[test]
    fn no_cap_for_a_trace_spanning_half_the_globe() {
        let line = [
            LatLon::new(0.0, -100.0),
            LatLon::new(0.0, 0.0),
            LatLon::new(0.0, 100.0),
        ];
        assert!(BoundingCap::around(line.iter()).is_none());
    }
}
