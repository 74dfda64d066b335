/*!
Method §10 `torsion`: EN 1998-1 §4.2.3.2(6) regularity-in-plan check (eqs. 4.1a/4.1b) from
listed walls with plan positions. Footprint area and centroid come from the `geo` crate; the
polar second moment of area about the centroid is [`polar_moment_about_centroid`].
*/

use geo::{Area, Centroid, Coord, LineString, Polygon};

use crate::model::Dir;

/// A wall as the torsion check sees it: direction, lw, tw, plan position (m).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PlanWall {
    /// Direction its length is parallel to.
    pub dir: Dir,
    /// Length lw (m).
    pub lw: f64,
    /// Thickness tw (m).
    pub tw: f64,
    /// Centre x (m).
    pub x: f64,
    /// Centre y (m).
    pub y: f64,
}

/// Area (m²), centroid (m) and polar moment about the centroid I_p (m⁴) of a footprint.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Footprint {
    /// Area A (m²).
    pub area: f64,
    /// Centroid x.
    pub cx: f64,
    /// Centroid y.
    pub cy: f64,
    /// Polar second moment about the centroid I_p (m⁴).
    pub ip: f64,
}

/// Polar second moment of area of a simple polygon about its own centroid (m⁴), from the
/// shoelace-type sums I_x = (1/12)Σ c_i (y_i² + y_i y_{i+1} + y_{i+1}²),
/// I_y = (1/12)Σ c_i (x_i² + x_i x_{i+1} + x_{i+1}²), c_i = x_i y_{i+1} − x_{i+1} y_i, about
/// the origin, shifted to the centroid by the parallel-axis theorem. Orientation-independent.
pub fn polar_moment_about_centroid(pts: &[(f64, f64)]) -> f64 {
    let n = pts.len();
    if n < 3 {
        return 0.0;
    }
    let (mut a2, mut sx, mut sy, mut ix, mut iy) = (0.0, 0.0, 0.0, 0.0, 0.0);
    for i in 0..n {
        let (x0, y0) = pts[i];
        let (x1, y1) = pts[(i + 1) % n];
        let c = x0 * y1 - x1 * y0;
        a2 += c;
        sx += (x0 + x1) * c;
        sy += (y0 + y1) * c;
        ix += c * (y0 * y0 + y0 * y1 + y1 * y1);
        iy += c * (x0 * x0 + x0 * x1 + x1 * x1);
    }
    let area = a2 / 2.0;
    if area == 0.0 {
        return 0.0;
    }
    let cx = sx / (6.0 * area);
    let cy = sy / (6.0 * area);
    let ip_origin = (ix + iy) / 12.0;
    // Signs: for clockwise polygons every sum flips sign together.
    ((ip_origin - area * (cx * cx + cy * cy)) * area.signum()).abs()
}

/// Footprint properties: area and centroid by `geo`, I_p by [`polar_moment_about_centroid`].
/// `None` for fewer than three vertices or zero area.
pub fn footprint(pts: &[(f64, f64)]) -> Option<Footprint> {
    if pts.len() < 3 {
        return None;
    }
    let ring: LineString<f64> = pts.iter().map(|&(x, y)| Coord { x, y }).collect();
    let poly = Polygon::new(ring, vec![]);
    let area = poly.unsigned_area();
    if !(area > 0.0 && area.is_finite()) {
        return None;
    }
    let c = poly.centroid()?;
    Some(Footprint {
        area,
        cx: c.x(),
        cy: c.y(),
        ip: polar_moment_about_centroid(pts),
    })
}

/// The numbers of the torsion check.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TorsionCheck {
    /// Stiffness centre x_s (from Y walls), if any Y wall.
    pub xs: Option<f64>,
    /// Stiffness centre y_s (from X walls), if any X wall.
    pub ys: Option<f64>,
    /// Mass centre (footprint centroid).
    pub xm: f64,
    /// Mass centre y.
    pub ym: f64,
    /// Torsional radius r_x = √(K_θ/K_y) (m), if K_y > 0.
    pub rx: Option<f64>,
    /// Torsional radius r_y = √(K_θ/K_x) (m), if K_x > 0.
    pub ry: Option<f64>,
    /// Radius of gyration of the floor mass l_s = √(I_p/A) (m).
    pub ls: f64,
    /// Direction Y fails (e0x > 0.30·r_x or r_x < l_s).
    pub fails_y: bool,
    /// Direction X fails (e0y > 0.30·r_y or r_y < l_s).
    pub fails_x: bool,
}

/// EN 1998-1 §4.2.3.2(6) with wall stiffness k_i ∝ tw·lw³ (method §10):
/// direction Y: e0x = |x_s − x_m| ≤ ratio·r_x and r_x ≥ l_s (eqs. 4.1a/4.1b);
/// direction X: e0y = |y_s − y_m| ≤ ratio·r_y and r_y ≥ l_s. A direction without walls is
/// not assessed (its `fails_*` stays false).
pub fn check(walls: &[PlanWall], fp: &Footprint, ratio: f64) -> TorsionCheck {
    let k = |w: &PlanWall| w.tw * w.lw.powi(3);
    let kx: f64 = walls
        .iter()
        .filter(|w| w.dir == Dir::X)
        .map(k)
        .fold(0.0, |a, b| a + b);
    let ky: f64 = walls
        .iter()
        .filter(|w| w.dir == Dir::Y)
        .map(k)
        .fold(0.0, |a, b| a + b);
    let ys = (kx > 0.0).then(|| {
        walls
            .iter()
            .filter(|w| w.dir == Dir::X)
            .map(|w| k(w) * w.y)
            .sum::<f64>()
            / kx
    });
    let xs = (ky > 0.0).then(|| {
        walls
            .iter()
            .filter(|w| w.dir == Dir::Y)
            .map(|w| k(w) * w.x)
            .sum::<f64>()
            / ky
    });
    let mut ktheta = 0.0;
    for w in walls {
        match (w.dir, xs, ys) {
            (Dir::X, _, Some(ys)) => ktheta += k(w) * (w.y - ys).powi(2),
            (Dir::Y, Some(xs), _) => ktheta += k(w) * (w.x - xs).powi(2),
            _ => {}
        }
    }
    let rx = (ky > 0.0).then(|| (ktheta / ky).sqrt());
    let ry = (kx > 0.0).then(|| (ktheta / kx).sqrt());
    let ls = if fp.area > 0.0 {
        (fp.ip / fp.area).sqrt()
    } else {
        0.0
    };
    let fails_y = match (xs, rx) {
        (Some(xs), Some(rx)) => (xs - fp.cx).abs() > ratio * rx || rx < ls,
        _ => false,
    };
    let fails_x = match (ys, ry) {
        (Some(ys), Some(ry)) => (ys - fp.cy).abs() > ratio * ry || ry < ls,
        _ => false,
    };
    TorsionCheck {
        xs,
        ys,
        xm: fp.cx,
        ym: fp.cy,
        rx,
        ry,
        ls,
        fails_y,
        fails_x,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    #[test]
    fn rectangle_polar_moment() {
        // b x d rectangle: Ip = b d (b² + d²)/12
        let pts = [(0.0, 0.0), (4.0, 0.0), (4.0, 2.0), (0.0, 2.0)];
        let ip = polar_moment_about_centroid(&pts);
        assert!((ip - 4.0 * 2.0 * (16.0 + 4.0) / 12.0).abs() < 1e-9);
        let rev: Vec<_> = pts.iter().rev().copied().collect();
        assert!((polar_moment_about_centroid(&rev) - ip).abs() < 1e-9);
        let fp = footprint(&pts).unwrap();
        assert!((fp.cx - 2.0).abs() < 1e-12 && (fp.cy - 1.0).abs() < 1e-12);
    }
    #[test]
    fn l_shape_polar_moment_by_parts() {
        // L: 2x1 rectangle [0,2]x[0,1] plus 1x1 square [0,1]x[1,2]; area 3, centroid (5/6, 5/6)
        let pts = [
            (0.0, 0.0),
            (2.0, 0.0),
            (2.0, 1.0),
            (1.0, 1.0),
            (1.0, 2.0),
            (0.0, 2.0),
        ];
        let c: f64 = 5.0 / 6.0;
        // part 1: 2x1 centre (1, 0.5): Ip = 2*(4+1)/12 + 2*((1-c)^2 + (0.5-c)^2)
        let p1 = 2.0 * 5.0 / 12.0 + 2.0 * ((1.0 - c).powi(2) + (0.5 - c).powi(2));
        // part 2: 1x1 centre (0.5, 1.5)
        let p2 = 2.0 / 12.0 + ((0.5 - c).powi(2) + (1.5 - c).powi(2));
        assert!((polar_moment_about_centroid(&pts) - (p1 + p2)).abs() < 1e-9);
    }
}
