/*!
Distances on the sphere: the Haversine great-circle distance between two points, the
distance from a point to the closest point of a great-circle segment, and the boxes used to
index fault traces (latitude range of an arc, box around a spherical cap).

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
    if on_arc(a, b, n, foot) {
        // Cross-track angle: atan2(|p·n̂|, |foot|).
        (foot, s.abs().atan2(foot_len))
    } else {
        nearer_end()
    }
}

/// True when `q` (a vector in the plane of the great circle through `a` and `b`, whose pole
/// is `n` = a × b) lies on the minor arc from `a` to `b`.
fn on_arc(a: Vec3, b: Vec3, n: Vec3, q: Vec3) -> bool {
    dot(cross(a, q), n) >= 0.0 && dot(cross(q, b), n) >= 0.0
}

/// Latitude range (degrees) of the minor great-circle arc between unit vectors `a` and `b`,
/// including its poleward bulge: a great circle's northernmost point is the north pole's
/// direction projected on the circle's plane (its southernmost the opposite point), and it
/// counts when it lies on the arc. (An east-west arc between two points at 70° N reaches
/// beyond 70° N, so a box around the vertices alone would not hold the arc.)
pub fn arc_lat_range(a: Vec3, b: Vec3) -> (f64, f64) {
    let (la, lb) = (position(a).lat, position(b).lat);
    let (mut lo, mut hi) = (la.min(lb), la.max(lb));
    let n = cross(a, b);
    let nn = norm(n);
    if nn < 1e-15 {
        return (lo, hi);
    }
    let n_hat = scale(n, 1.0 / nn);
    let north = [0.0, 0.0, 1.0];
    let top = sub(north, scale(n_hat, dot(north, n_hat)));
    if norm(top) < 1e-15 {
        return (lo, hi);
    }
    for q in [top, scale(top, -1.0)] {
        if on_arc(a, b, n, q) {
            let l = position(q).lat;
            lo = lo.min(l);
            hi = hi.max(l);
        }
    }
    (lo, hi)
}

/// A longitude/latitude box (degrees: min lon, min lat, max lon, max lat) holding every
/// point within angular distance `delta_rad` of `p` (a spherical cap). Latitude ± δ; the
/// widest longitude of the cap is asin(sin δ / cos φ) (right spherical triangle); the box is
/// the whole longitude range when the cap reaches a pole or the antimeridian.
pub fn cap_box(p: LatLon, delta_rad: f64) -> [f64; 4] {
    let d = delta_rad.to_degrees();
    let (lat_lo, lat_hi) = ((p.lat - d).max(-90.0), (p.lat + d).min(90.0));
    let ratio = delta_rad.sin() / p.lat.to_radians().cos();
    let full = [-180.0, lat_lo, 180.0, lat_hi];
    if delta_rad >= std::f64::consts::FRAC_PI_2 || lat_lo <= -90.0 || lat_hi >= 90.0 || ratio >= 1.0
    {
        return full;
    }
    let dlon = ratio.asin().to_degrees();
    let (lon_lo, lon_hi) = (p.lon - dlon, p.lon + dlon);
    if lon_lo < -180.0 || lon_hi > 180.0 {
        return full;
    }
    [lon_lo, lat_lo, lon_hi, lat_hi]
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

    /// Segments across the antimeridian are the short (minor) arc through ±180°, never the
    /// long way round. Hand-computed values: abreast of an equatorial segment the closest
    /// point is on the point's own meridian, so the Haversine formula (Sinnott 1984) has
    /// Δλ = 0 and reduces to d = R·Δφ: 0.3° → 6 371 008.8 × 0.3 × π/180 = 33 358.524 m;
    /// past the segment's end d = R·0.5° = 55 597.540 m to the end point; abreast of a
    /// meridian segment sin d = cos φ · sin Δλ (right spherical triangle, Napier's rules),
    /// φ = 0.5°, Δλ = 0.2° → 22 238.169 m. Tolerance 1 mm: the vector arithmetic is exact
    /// to about 1e-12 relative; the literals are rounded to the millimetre.
    #[test]
    fn segments_across_the_antimeridian_take_the_short_way() {
        let (a, b) = (LatLon::new(0.0, 179.5), LatLon::new(0.0, -179.5));
        for (p, expected) in [
            (LatLon::new(0.3, 180.0), 33_358.524),
            (LatLon::new(0.3, -180.0), 33_358.524),
            (LatLon::new(-0.3, -179.8), 33_358.524),
            (LatLon::new(0.3, 179.8), 33_358.524),
            // Beyond the western end: the long way round would pass through this point.
            (LatLon::new(0.0, 179.0), 55_597.540),
            (LatLon::new(0.0, -179.0), 55_597.540),
        ] {
            for (x, y) in [(a, b), (b, a)] {
                let d = point_segment_distance_m(p, x, y, R);
                assert!((d - expected).abs() < 1e-3, "{p:?}: {d}");
            }
        }
        let c = closest_point_on_segment(LatLon::new(0.3, -179.8), a, b);
        assert!(c.lat.abs() < 1e-12 && (c.lon + 179.8).abs() < 1e-9, "{c:?}");
        // The meridian ±180° written with both signs is one meridian, not 360° of longitude.
        let d = point_segment_distance_m(
            LatLon::new(0.5, -179.8),
            LatLon::new(-1.0, -180.0),
            LatLon::new(1.0, 180.0),
            R,
        );
        assert!((d - 22_238.169).abs() < 1e-3, "{d}");
        // The polyline form, and the Haversine of two points either side of ±180°:
        // Δλ = 0.2° on the equator → R·0.2° = 22 239.016 m (not 359.8°).
        let line = [a, b];
        let d = point_polyline_distance_m(LatLon::new(0.3, 180.0), &line, R);
        assert!((d - 33_358.524).abs() < 1e-3, "{d}");
        let d = haversine_m(LatLon::new(0.0, 179.9), LatLon::new(0.0, -179.9), R);
        assert!((d - 22_239.016).abs() < 1e-3, "{d}");
    }

    #[test]
    fn arc_latitude_range_includes_the_poleward_bulge() {
        let (a, b) = (
            unit(LatLon::new(70.0, -20.0)),
            unit(LatLon::new(70.0, 20.0)),
        );
        let (lo, hi) = arc_lat_range(a, b);
        assert_eq!(lo, 70.0);
        // The arc's midpoint: tan φ = tan 70° / cos 20° (Napier's rules) → 71.1°.
        let expected = (70f64.to_radians().tan() / 20f64.to_radians().cos())
            .atan()
            .to_degrees();
        assert!((hi - expected).abs() < 1e-9, "{hi} {expected}");
        // A meridian arc has no bulge.
        let (lo, hi) = arc_lat_range(unit(LatLon::new(10.0, 5.0)), unit(LatLon::new(12.0, 5.0)));
        assert!((lo - 10.0).abs() < 1e-12 && (hi - 12.0).abs() < 1e-12);
    }

    #[test]
    fn cap_box_holds_points_at_the_cap_radius() {
        let p = LatLon::new(60.0, 10.0);
        let delta = 50_000.0 / R;
        let bx = cap_box(p, delta);
        // Points 50 km away in many directions lie inside the box.
        for k in 0..36 {
            let theta = f64::from(k) * 10f64.to_radians();
            let (phi1, lam1) = (p.lat.to_radians(), p.lon.to_radians());
            let phi2 = (phi1.sin() * delta.cos() + phi1.cos() * delta.sin() * theta.cos()).asin();
            let lam2 = lam1
                + (theta.sin() * delta.sin() * phi1.cos())
                    .atan2(delta.cos() - phi1.sin() * phi2.sin());
            let (lat, lon) = (phi2.to_degrees(), lam2.to_degrees());
            assert!(
                lon >= bx[0] - 1e-9 && lon <= bx[2] + 1e-9,
                "{k}: {lon} {bx:?}"
            );
            assert!(
                lat >= bx[1] - 1e-9 && lat <= bx[3] + 1e-9,
                "{k}: {lat} {bx:?}"
            );
        }
        assert_eq!(cap_box(LatLon::new(89.9, 0.0), delta)[0], -180.0);
        assert_eq!(cap_box(LatLon::new(0.0, 179.9), delta)[2], 180.0);
    }
}
