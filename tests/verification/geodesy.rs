//! Verification: geodesy — distance from a building to a fault trace.
//!
//! Invented trace A (38.00 N, 23.00 E) → B (38.30 N, 23.60 E) → C (38.45 N, 23.95 E).
//! Reference values were computed by hand (calculator, double precision) with:
//! - the Haversine formula, Sinnott (1984), "Virtues of the Haversine", Sky & Telescope
//!   68(2):159, on the sphere of mean radius R = 6 371 008.8 m (inventory.md);
//! - the cross-track and along-track distance formulas of the Aviation Formulary
//!   (E. Williams, "Aviation Formulary V1.47"):
//!   XTD = asin(sin d13 · sin(θ13 − θ12)),  ATD = acos(cos d13 / cos XTD),
//!   with the initial course θ = atan2(sin Δλ cos φ2, cos φ1 sin φ2 − sin φ1 cos φ2 cos Δλ);
//!   the closest point is abreast of the segment when 0 ≤ ATD ≤ segment length, otherwise
//!   it is the nearer end (then the Haversine distance to that end).
//!
//! Tolerance: 1e-9 relative for the spherical quantities (the reference values below are
//! given to 1 µm, recomputed in double precision with the formulas above and R = 6 371 008.8 m;
//! the program computes the same spherical quantity by vector algebra, so the two agree to
//! rounding). That is what the method can promise, and it fails a wrong Earth radius: the
//! WGS84 equatorial radius 6 378 137 m instead of the mean radius changes every distance by
//! 0.11 % (checked below). The sphere-versus-ellipsoid difference is a separate, stated
//! tolerance of 0.5 %, checked last against the WGS84 geodesic of Karney (2013, "Algorithms
//! for geodesics", J. Geodesy 87) as implemented by `geo::Geodesic`.

use approx::assert_relative_eq;
use geo::{Distance, Geodesic, Point};
use seistriage::geography::sphere::{
    LatLon, MEAN_EARTH_RADIUS_M, closest_point_on_segment, haversine_m, point_polyline_distance_m,
};

/// Spherical quantities against the independent spherical reference values (see the doc).
const TOL: f64 = 1e-9;
/// Sphere against the WGS84 ellipsoid: a few tenths of a percent at mid latitudes.
const ELLIPSOID_TOL: f64 = 0.005;
/// The contract's radius (inventory.md: mean Earth radius R1 of IUGG/WGS84, 6 371 008.8 m).
const CONTRACT_RADIUS_M: f64 = 6_371_008.8;

fn trace() -> [LatLon; 3] {
    [
        LatLon::new(38.00, 23.00),
        LatLon::new(38.30, 23.60),
        LatLon::new(38.45, 23.95),
    ]
}

fn dist(lat: f64, lon: f64) -> f64 {
    point_polyline_distance_m(LatLon::new(lat, lon), &trace(), MEAN_EARTH_RADIUS_M)
}

#[test]
fn haversine_segment_length_ab() {
    // Haversine (Sinnott 1984) on R = 6 371 008.8 m: |AB| = 62 172.732 213 m.
    assert_eq!(MEAN_EARTH_RADIUS_M, CONTRACT_RADIUS_M);
    let d = haversine_m(trace()[0], trace()[1], MEAN_EARTH_RADIUS_M);
    assert_relative_eq!(d, 62_172.732_213, max_relative = TOL);
}

#[test]
fn point_beyond_the_start_of_the_trace() {
    // P = (37.90 N, 22.80 E): along-track on AB = −20 764.4 m (< 0), so the closest point
    // is A; Haversine P–A = 20 764.701 845 m. The distance to AB's infinite
    // great circle would be only 115.0 m (Aviation Formulary XTD) — must not be returned.
    let d = dist(37.90, 22.80);
    assert_relative_eq!(d, 20_764.701_845, max_relative = TOL);
    assert!(d > 10.0 * 115.0);
}

#[test]
fn point_beyond_the_end_of_the_trace() {
    // P = (38.55 N, 24.10 E): along-track on BC = 51 549.7 m > |BC| = 34 771.9 m, so the
    // closest point is C; Haversine P–C = 17 147.379 649 m. The cross-track
    // distance to AB's great circle is only 396.0 m (Aviation Formulary XTD).
    assert_relative_eq!(dist(38.55, 24.10), 17_147.379_649, max_relative = TOL);
}

#[test]
fn point_abreast_of_the_first_segment() {
    // P = (38.10 N, 23.45 E): along-track on AB = 39 208.0 m within [0, 62 172.7];
    // |XTD| = 11 789.921 757 m (Aviation Formulary); the BC segment is farther (B at 25 814 m).
    assert_relative_eq!(dist(38.10, 23.45), 11_789.921_757, max_relative = TOL);
}

#[test]
fn point_abreast_of_the_second_segment() {
    // P = (38.40 N, 23.70 E): along-track on BC = 12 992.9 m within [0, 34 771.9];
    // |XTD| = 5 556.267 297 m (Aviation Formulary); B is at 14 131.07 m.
    assert_relative_eq!(dist(38.40, 23.70), 5_556.267_297, max_relative = TOL);
}

#[test]
fn point_on_the_trace() {
    // On a vertex (B) and on the great-circle arc AB at fractions 0.3 and 0.5 (intermediate
    // point formula of the Aviation Formulary: (38.090320 N, 23.179482 E) and
    // (38.150382 N, 23.299383 E)): distance 0. Absolute tolerance 0.01 m (a relative one
    // is meaningless at 0; double-precision rounding of the inputs is below 1 mm).
    assert!(dist(38.30, 23.60) < 0.01);
    assert!(dist(38.090_320_077, 23.179_482_072) < 0.01);
    assert!(dist(38.150_381_527, 23.299_383_055) < 0.01);
    // The planar midpoint (38.15, 23.30) is NOT on the great-circle arc: |XTD| = 64.745 781 m (1e-7 relative: 6.5 µm, the reference value's last digit)
    // (Aviation Formulary, hand-computed; ATD 31 109.1 m, inside AB) — the trace is made
    // of great-circle segments, not straight lines in degrees.
    assert_relative_eq!(dist(38.15, 23.30), 64.745_781, max_relative = 1e-7);
}

#[test]
fn closest_point_is_the_cross_track_foot() {
    // For P = (38.10 N, 23.45 E) the foot lies on AB at along-track 39 208.0 m from A
    // (Aviation Formulary ATD), i.e. Haversine A–foot = 39 208.0 m.
    let foot = closest_point_on_segment(LatLon::new(38.10, 23.45), trace()[0], trace()[1]);
    assert_relative_eq!(
        haversine_m(trace()[0], foot, MEAN_EARTH_RADIUS_M),
        39_208.008_313,
        max_relative = TOL
    );
}

#[test]
fn spherical_distances_agree_with_the_wgs84_geodesic_within_half_a_percent() {
    // Karney (2013) geodesic on the WGS84 ellipsoid (geo::Geodesic) from each test point to
    // the closest point found on the sphere: the sphere's error at these mid-latitude,
    // tens-of-km distances is a few tenths of a percent, inside the 0.5 % tolerance.
    for (lat, lon) in [
        (37.90, 22.80),
        (38.55, 24.10),
        (38.10, 23.45),
        (38.40, 23.70),
    ] {
        let p = LatLon::new(lat, lon);
        let t = trace();
        let foot = [(t[0], t[1]), (t[1], t[2])]
            .into_iter()
            .map(|(a, b)| closest_point_on_segment(p, a, b))
            .min_by(|x, y| {
                haversine_m(p, *x, MEAN_EARTH_RADIUS_M).total_cmp(&haversine_m(
                    p,
                    *y,
                    MEAN_EARTH_RADIUS_M,
                ))
            })
            .unwrap();
        let ellipsoid = Geodesic.distance(Point::new(lon, lat), Point::new(foot.lon, foot.lat));
        assert_relative_eq!(dist(lat, lon), ellipsoid, max_relative = ELLIPSOID_TOL);
    }
}

#[test]
fn a_wrong_earth_radius_fails_these_checks() {
    // The WGS84 equatorial radius a = 6 378 137 m (a plausible slip for the mean radius)
    // gives |AB| = 62 242.294 m (same haversine), 0.11 % off: far outside TOL, inside the
    // 0.5 % that these tests used to allow.
    let wrong = haversine_m(trace()[0], trace()[1], 6_378_137.0);
    assert_relative_eq!(wrong, 62_242.294_144, max_relative = TOL);
    assert!((wrong / 62_172.732_213 - 1.0).abs() > 1000.0 * TOL);
    assert!((wrong / 62_172.732_213 - 1.0).abs() < ELLIPSOID_TOL);
}
