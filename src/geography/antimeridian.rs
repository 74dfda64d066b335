/*!
District polygons that cross the antimeridian (±180° longitude).

RFC 7946 §3.1.9 says a geometry crossing the antimeridian SHOULD be cut into a
MultiPolygon whose parts meet at ±180°; such a cut district needs nothing here (a point at
exactly ±180° lies on an edge of one of the parts and is covered). Producers do not always
cut: a ring then jumps from, say, 179.9° to −179.9° between consecutive vertices, and read
as plane coordinates its edges would run the long way round the globe (the polygon would
cover every longitude *except* the 0.2° it is meant to cover).

Such a polygon is normalised by adding 360° to its negative longitudes (every ring of the
polygon, holes included, so that a hole stays inside its outer ring): its longitudes then
run continuously through 180° (up to 360°). A point is tested at its longitude and at its
longitude + 360° ([`Geography::district_at`](super::Geography::district_at)), and the R-tree
holds the shifted boxes as they are. A consecutive-vertex jump is taken as a crossing when it
exceeds 180°: no straight edge of a district is that long.

Not handled: a polygon that, once shifted, still jumps by more than 180° (it would reach
round the globe, e.g. one holding a pole); it is reported and skipped by the reader.
*/

use geo::{Coord, LineString, Polygon};

/// Longitude step between consecutive vertices above which a ring is taken to cross the
/// antimeridian (degrees): half the globe, RFC 7946 §3.1.9.
const JUMP_DEG: f64 = 180.0;

/// Full turn of longitude (degrees).
const TURN_DEG: f64 = 360.0;

/// True when two consecutive vertices of the ring are more than 180° of longitude apart.
pub fn jumps(ring: &LineString<f64>) -> bool {
    ring.0
        .windows(2)
        .any(|w| matches!(w, [a, b] if (a.x - b.x).abs() > JUMP_DEG))
}

fn shift_ring(ring: &LineString<f64>) -> LineString<f64> {
    ring.0
        .iter()
        .map(|c| Coord {
            x: if c.x < 0.0 { c.x + TURN_DEG } else { c.x },
            y: c.y,
        })
        .collect()
}

/// A polygon whose rings do not jump is returned as it is; one that crosses the
/// antimeridian unsplit gets 360° added to its negative longitudes (every ring). `Err` says
/// why a polygon cannot be made continuous that way.
pub fn unwrap_polygon(p: &Polygon<f64>) -> Result<Polygon<f64>, String> {
    let rings = || std::iter::once(p.exterior()).chain(p.interiors());
    if !rings().any(jumps) {
        return Ok(p.clone());
    }
    let exterior = shift_ring(p.exterior());
    let interiors: Vec<_> = p.interiors().iter().map(shift_ring).collect();
    if std::iter::once(&exterior).chain(&interiors).any(jumps) {
        return Err(
            "a ring jumps by more than 180° of longitude even with its negative longitudes \
             shifted by 360° (a polygon reaching round the globe or holding a pole); cut it \
             into a MultiPolygon at ±180° (RFC 7946 §3.1.9)"
                .into(),
        );
    }
    Ok(Polygon::new(exterior, interiors))
}

#[cfg(test)]
mod tests {
    use super::*;
    use geo::{Area, Intersects, Point};

    fn ring(lons_lats: &[(f64, f64)]) -> LineString<f64> {
        lons_lats.iter().map(|&(x, y)| Coord { x, y }).collect()
    }

    /// 2° wide box from 179° E to 179° W, latitudes −41…−40.
    fn across() -> Polygon<f64> {
        Polygon::new(
            ring(&[
                (179.0, -41.0),
                (-179.0, -41.0),
                (-179.0, -40.0),
                (179.0, -40.0),
                (179.0, -41.0),
            ]),
            vec![],
        )
    }

    #[test]
    fn a_ring_that_crosses_unsplit_is_made_continuous() {
        let p = unwrap_polygon(&across()).unwrap();
        let xs: Vec<f64> = p.exterior().0.iter().map(|c| c.x).collect();
        assert_eq!(xs, vec![179.0, 181.0, 181.0, 179.0, 179.0]);
        // 2° × 1° in plane degrees, not 358° × 1°.
        assert!((p.unsigned_area() - 2.0).abs() < 1e-12);
        assert!(p.intersects(&Point::new(-179.5 + 360.0, -40.5)));
        assert!(p.intersects(&Point::new(179.5, -40.5)));
        assert!(!p.intersects(&Point::new(0.0, -40.5)));
    }

    #[test]
    fn a_polygon_away_from_the_antimeridian_is_unchanged() {
        let p = Polygon::new(
            ring(&[
                (-10.0, 0.0),
                (10.0, 0.0),
                (10.0, 5.0),
                (-10.0, 5.0),
                (-10.0, 0.0),
            ]),
            vec![],
        );
        assert_eq!(unwrap_polygon(&p).unwrap(), p);
    }

    #[test]
    fn holes_move_with_their_outer_ring() {
        let hole = ring(&[
            (-179.8, -40.8),
            (-179.2, -40.8),
            (-179.2, -40.2),
            (-179.8, -40.2),
            (-179.8, -40.8),
        ]);
        let p = Polygon::new(across().exterior().clone(), vec![hole]);
        let p = unwrap_polygon(&p).unwrap();
        assert!(!p.intersects(&Point::new(-179.5 + 360.0, -40.5)));
        assert!(p.intersects(&Point::new(-179.1 + 360.0, -40.5)));
    }

    #[test]
    fn a_ring_round_the_globe_is_refused() {
        // Vertices every 120° round a parallel: jumps remain whatever the shift.
        let p = Polygon::new(
            ring(&[
                (-170.0, 80.0),
                (170.0, 80.0),
                (50.0, 80.0),
                (-50.0, 80.0),
                (-170.0, 80.0),
            ]),
            vec![],
        );
        assert!(unwrap_polygon(&p).is_err());
    }
}
