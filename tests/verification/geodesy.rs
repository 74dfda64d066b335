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
//! Tolerance: 0.5 % (the requirement). The program computes the same spherical
//! quantity by vector algebra, so agreement is in fact far tighter; the 0.5 % bound is also
//! the size of the sphere-versus-ellipsoid difference, checked last against the WGS84
//! geodesic of Karney (2013, "Algorithms for geodesics", J. Geodesy 87) as implemented by
//! `geo::Geodesic`.

use approx::assert_relative_eq;
use geo::{Distance, Geodesic, Point};
use seistriage::geography::sphere::{
    LatLon, MEAN_EARTH_RADIUS_M, closest_point_on_segment, haversine_m, point_polyline_distance_m,
};

const TOL: f64 = 0.005;

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
    // Haversine (Sinnott 1984), hand-computed: |AB| = 62 172.73 m.
    let d = haversine_m(trace()[0], trace()[1], MEAN_EARTH_RADIUS_M);
    assert_relative_eq!(d, 62_172.73, max_relative = TOL);
}

#[test]
fn point_beyond_the_start_of_the_trace() {
    // P = (37.90 N, 22.80 E): along-track on AB = −20 764.4 m (< 0), so the closest point
    // is A; Haversine P–A = 20 764.70 m (hand-computed). The distance to AB's infinite
    // great circle would be only 115.0 m (Aviation Formulary XTD) — must not be returned.
    let d = dist(37.90, 22.80);
    assert_relative_eq!(d, 20_764.70, max_relative = TOL);
    assert!(d > 10.0 * 115.0);
}

#[test]
fn point_beyond_the_end_of_the_trace() {
    // P = (38.55 N, 24.10 E): along-track on BC = 51 549.7 m > |BC| = 34 771.9 m, so the
    // closest point is C; Haversine P–C = 17 147.38 m (hand-computed). The cross-track
    // distance to AB's great circle is only 396.0 m (Aviation Formulary XTD).
    assert_relative_eq!(dist(38.55, 24.10), 17_147.38, max_relative = TOL);
}

#[test]
fn point_abreast_of_the_first_segment() {
    // P = (38.10 N, 23.45 E): along-track on AB = 39 208.0 m within [0, 62 172.7];
    // |XTD| = 11 789.92 m (Aviation Formulary); the BC segment is farther (B at 25 814 m).
    assert_relative_eq!(dist(38.10, 23.45), 11_789.92, max_relative = TOL);
}

#[test]
fn point_abreast_of_the_second_segment() {
    // P = (38.40 N, 23.70 E): along-track on BC = 12 992.9 m within [0, 34 771.9];
    // |XTD| = 5 556.27 m (Aviation Formulary); B is at 14 131.07 m.
    assert_relative_eq!(dist(38.40, 23.70), 5_556.27, max_relative = TOL);
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
    // The planar midpoint (38.15, 23.30) is NOT on the great-circle arc: |XTD| = 64.75 m
    // (Aviation Formulary, hand-computed; ATD 31 109.1 m, inside AB) — the trace is made
    // of great-circle segments, not straight lines in degrees.
    assert_relative_eq!(dist(38.15, 23.30), 64.75, max_relative = TOL);
}

#[test]
fn closest_point_is_the_cross_track_foot() {
    // For P = (38.10 N, 23.45 E) the foot lies on AB at along-track 39 208.0 m from A
    // (Aviation Formulary ATD), i.e. Haversine A–foot = 39 208.0 m.
    let foot = closest_point_on_segment(LatLon::new(38.10, 23.45), trace()[0], trace()[1]);
    assert_relative_eq!(
        haversine_m(trace()[0], foot, MEAN_EARTH_RADIUS_M),
        39_208.01,
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
        assert_relative_eq!(dist(lat, lon), ellipsoid, max_relative = TOL);
    }
}
