/*!
The brief's map: an inline SVG in a local equirectangular projection around the stock
(x = Δλ·cos φ0·R, y = Δφ·R with R the mean Earth radius 6,371.0088 km, IUGG; φ0, λ0 the
centre of the buildings' extent). Over a town or a province (tens of km) the distortion of
distances is well under 1 % (common practice for local maps; the scale bar is drawn at the
centre latitude). No tiles, no network.

Layers, bottom to top: district polygons (pale fill, names at their centroids), fault
traces (thick dark dashes, names), buildings by class (class 4 first so that the severe
classes are on top; shape AND fill encode the class), rank labels of the ten highest
priorities, scale bar in km, north arrow. Every building symbol is a `<g>` with
`data-id="<id>"` and a `<title>` (id, name, class): a browser shows it as a tooltip, and
tests count the symbols.
*/

use std::fmt::Write as _;

use geo::Centroid;

use super::html::esc;
use crate::geography::Geography;
use crate::report::workbook::style::CLASS_CHART_FILL;
use crate::report::workbook::tables::class_name;
use crate::results::Screening;

/// Mean Earth radius (km), IUGG.
const EARTH_RADIUS_KM: f64 = 6_371.008_8;
/// Drawing width (SVG user units = CSS px).
const WIDTH: f64 = 680.0;
/// Least and most drawing height.
const MIN_HEIGHT: f64 = 320.0;
const MAX_HEIGHT: f64 = 560.0;
/// Margin around the buildings' extent (fraction of the extent on each side).
const PAD: f64 = 0.08;
/// Smallest extent shown (km): one building alone still gets a readable map.
const MIN_SPAN_KM: f64 = 1.0;
/// Half size of a building symbol (px).
pub const SYMBOL: f64 = 7.0;
/// Height of the band below the map (scale bar, north arrow).
const BAND: f64 = 30.0;
/// Buildings labelled by rank.
const LABELLED: usize = 10;

/// A list of (longitude, latitude) points in degrees.
pub type Line = Vec<(f64, f64)>;

/// One district of the map.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct DistrictShape {
    /// Name.
    pub name: String,
    /// Rings (outer and holes), each a closed line.
    pub rings: Vec<Line>,
    /// Where the name goes (the shape's centroid).
    pub centroid: Option<(f64, f64)>,
}

/// One fault trace of the map.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct FaultLine {
    /// Name.
    pub name: String,
    /// Polylines.
    pub parts: Vec<Line>,
}

/// District polygons and fault traces for the map, in longitude/latitude degrees.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct MapLayers {
    /// Districts.
    pub districts: Vec<DistrictShape>,
    /// Fault traces.
    pub faults: Vec<FaultLine>,
}

impl MapLayers {
    /// The layers of a loaded geography.
    pub fn from_geography(g: &Geography) -> Self {
        let districts = g
            .districts()
            .iter()
            .map(|d| {
                let mut rings = Vec::new();
                for p in &d.shape.0 {
                    rings.push(p.exterior().coords().map(|c| (c.x, c.y)).collect());
                    for i in p.interiors() {
                        rings.push(i.coords().map(|c| (c.x, c.y)).collect());
                    }
                }
                DistrictShape {
                    name: d.name.clone(),
                    rings,
                    centroid: d.shape.centroid().map(|c| (c.x(), c.y())),
                }
            })
            .collect();
        let faults = g
            .faults()
            .map(|f| FaultLine {
                name: f.name.clone(),
                parts: f
                    .parts
                    .iter()
                    .map(|p| p.iter().map(|q| (q.lon, q.lat)).collect())
                    .collect(),
            })
            .collect();
        MapLayers { districts, faults }
    }
}

/// Usable coordinates of a building (the GeoJSON writer's rule).
pub fn coordinates(lat: Option<f64>, lon: Option<f64>) -> Option<(f64, f64)> {
    let (lat, lon) = (lat?, lon?);
    (lat.is_finite() && lon.is_finite() && lat.abs() <= 90.0 && lon.abs() <= 180.0)
        .then_some((lon, lat))
}

/// The local projection and the drawing frame.
struct Frame {
    lon0: f64,
    lat0: f64,
    cos0: f64,
    /// Pixels per km.
    scale: f64,
    /// Centre of the view in km.
    cx: f64,
    cy: f64,
    height: f64,
}

impl Frame {
    fn km(&self, lon: f64, lat: f64) -> (f64, f64) {
        let dlon = (lon - self.lon0 + 540.0).rem_euclid(360.0) - 180.0;
        let k = EARTH_RADIUS_KM * std::f64::consts::PI / 180.0;
        (dlon * self.cos0 * k, (lat - self.lat0) * k)
    }
    fn px(&self, lon: f64, lat: f64) -> (f64, f64) {
        let (x, y) = self.km(lon, lat);
        (
            WIDTH / 2.0 + (x - self.cx) * self.scale,
            self.height / 2.0 - (y - self.cy) * self.scale,
        )
    }
    fn inside(&self, (x, y): (f64, f64)) -> bool {
        (0.0..=WIDTH).contains(&x) && (0.0..=self.height).contains(&y)
    }
}

fn frame(points: &[(f64, f64)]) -> Option<Frame> {
    let &(lon_first, _) = points.first()?;
    // Longitudes relative to the first building (a stock across the antimeridian stays
    // together), then the centre of the extent.
    let rel: Vec<(f64, f64)> = points
        .iter()
        .map(|&(lon, lat)| ((lon - lon_first + 540.0).rem_euclid(360.0) - 180.0, lat))
        .collect();
    let (mut x0, mut x1, mut y0, mut y1) = (f64::MAX, f64::MIN, f64::MAX, f64::MIN);
    for &(x, y) in &rel {
        x0 = x0.min(x);
        x1 = x1.max(x);
        y0 = y0.min(y);
        y1 = y1.max(y);
    }
    let lat0 = (y0 + y1) / 2.0;
    let lon0 = lon_first + (x0 + x1) / 2.0;
    let mut f = Frame {
        lon0,
        lat0,
        cos0: lat0.to_radians().cos().max(0.01),
        scale: 1.0,
        cx: 0.0,
        cy: 0.0,
        height: MIN_HEIGHT,
    };
    let a = f.km(lon_first + x0, y0);
    let b = f.km(lon_first + x1, y1);
    let span_x = ((b.0 - a.0) * (1.0 + 2.0 * PAD)).max(MIN_SPAN_KM);
    let span_y = ((b.1 - a.1) * (1.0 + 2.0 * PAD)).max(MIN_SPAN_KM);
    f.height = (WIDTH * span_y / span_x).clamp(MIN_HEIGHT, MAX_HEIGHT);
    f.scale = (WIDTH / span_x).min(f.height / span_y);
    f.cx = (a.0 + b.0) / 2.0;
    f.cy = (a.1 + b.1) / 2.0;
    Some(f)
}

/// The symbol of a class centred at (x, y), half size `s`: class 1 diamond, 2 square,
/// 3 triangle, 4 circle (the shapes of the workbook's chart markers), filled with the
/// class shade and outlined dark, so that classes differ in greyscale by shape and shade.
pub fn symbol(class: u8, x: f64, y: f64, s: f64) -> String {
    let fill = CLASS_CHART_FILL
        .get(usize::from(class.clamp(1, 4) - 1))
        .copied()
        .unwrap_or(0x80_80_80);
    let stroke = (s * 0.15).clamp(0.3, 0.9);
    let style = format!("fill=\"#{fill:06x}\" stroke=\"#111\" stroke-width=\"{stroke:.2}\"");
    match class {
        1 => format!(
            "<path d=\"M{x:.1} {:.1}L{:.1} {y:.1}L{x:.1} {:.1}L{:.1} {y:.1}Z\" {style}/>",
            y - s * 1.25,
            x + s * 1.25,
            y + s * 1.25,
            x - s * 1.25
        ),
        2 => format!(
            "<rect x=\"{:.1}\" y=\"{:.1}\" width=\"{:.1}\" height=\"{:.1}\" {style}/>",
            x - s * 0.9,
            y - s * 0.9,
            s * 1.8,
            s * 1.8
        ),
        3 => format!(
            "<path d=\"M{x:.1} {:.1}L{:.1} {:.1}L{:.1} {:.1}Z\" {style}/>",
            y - s * 1.1,
            x + s,
            y + s * 0.8,
            x - s,
            y + s * 0.8
        ),
        _ => format!(
            "<circle cx=\"{x:.1}\" cy=\"{y:.1}\" r=\"{:.1}\" {style}/>",
            s * 0.85
        ),
    }
}

/// A small inline SVG of a class symbol (legend and tables).
pub fn symbol_icon(class: u8) -> String {
    format!(
        "<svg class=\"icon\" width=\"16\" height=\"16\" viewBox=\"0 0 16 16\" aria-hidden=\"true\">{}</svg>",
        symbol(class, 8.0, 8.0, 5.5)
    )
}

fn nice_length(max_km: f64) -> f64 {
    let e = 10f64.powf(max_km.log10().floor());
    for m in [5.0, 2.0, 1.0] {
        if m * e <= max_km {
            return m * e;
        }
    }
    e
}

fn path_of(f: &Frame, pts: &[(f64, f64)], close: bool) -> String {
    let mut d = String::new();
    for (i, &(lon, lat)) in pts.iter().enumerate() {
        let (x, y) = f.px(lon, lat);
        let _ = write!(d, "{}{x:.1} {y:.1}", if i == 0 { "M" } else { "L" });
    }
    if close && !d.is_empty() {
        d.push('Z');
    }
    d
}

/// The map section's SVG, or `None` when no building has coordinates.
pub fn svg(report: &Screening, layers: Option<&MapLayers>) -> Option<String> {
    let located: Vec<(&crate::results::BuildingResult, (f64, f64))> = report
        .buildings
        .iter()
        .filter_map(|b| coordinates(b.latitude, b.longitude).map(|p| (b, p)))
        .collect();
    let pts: Vec<(f64, f64)> = located.iter().map(|(_, p)| *p).collect();
    let f = frame(&pts)?;
    let h = f.height;
    let mut s = String::new();
    let _ = write!(
        s,
        "<svg class=\"map\" xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 {WIDTH} {:.0}\" \
         role=\"img\" aria-label=\"Map of the screened buildings by class\">\
         <defs><clipPath id=\"frame\"><rect width=\"{WIDTH}\" height=\"{h:.0}\"/></clipPath></defs>\
         <rect width=\"{WIDTH}\" height=\"{h:.0}\" fill=\"#fff\" stroke=\"#333\"/>\
         <g clip-path=\"url(#frame)\">",
        h + BAND
    );
    if let Some(l) = layers {
        s.push_str("<g class=\"districts\">");
        for DistrictShape { name, rings, .. } in &l.districts {
            let d: String = rings.iter().map(|r| path_of(&f, r, true)).collect();
            let _ = write!(
                s,
                "<path d=\"{d}\" fill=\"#f1f1ee\" stroke=\"#8a8a8a\" stroke-width=\"1.2\" \
                 fill-rule=\"evenodd\"><title>District {}</title></path>",
                esc(name)
            );
        }
        for DistrictShape { name, centroid, .. } in &l.districts {
            if let Some((lon, lat)) = centroid {
                let p = f.px(*lon, *lat);
                if f.inside(p) {
                    let _ = write!(
                        s,
                        "<text x=\"{:.1}\" y=\"{:.1}\" class=\"dname\" text-anchor=\"middle\">{}</text>",
                        p.0,
                        p.1,
                        esc(name)
                    );
                }
            }
        }
        s.push_str("</g><g class=\"faults\">");
        for FaultLine { name, parts } in &l.faults {
            for part in parts {
                let _ = write!(
                    s,
                    "<path d=\"{}\" fill=\"none\" stroke=\"#222\" stroke-width=\"2.4\" \
                     stroke-dasharray=\"10 4 2 4\"><title>Fault trace {}</title></path>",
                    path_of(&f, part, false),
                    esc(name)
                );
            }
            // The name at the first vertex inside the view.
            if let Some(p) = parts
                .iter()
                .flatten()
                .map(|&(lon, lat)| f.px(lon, lat))
                .find(|p| f.inside(*p) && p.0 < WIDTH - 60.0 && p.1 > 14.0)
            {
                let _ = write!(
                    s,
                    "<text x=\"{:.1}\" y=\"{:.1}\" class=\"fname\">{}</text>",
                    p.0 + 4.0,
                    p.1 - 5.0,
                    esc(name)
                );
            }
        }
        s.push_str("</g>");
    }
    s.push_str("<g class=\"buildings\">");
    // Symbols shrink where buildings are dense (about a third of the spacing of an even
    // spread over the map, between 1.6 and 7 px); the ten highest priorities keep the full
    // size and are drawn last, on top.
    let size = (0.35 * (WIDTH * h / located.len().max(1) as f64).sqrt()).clamp(1.6, SYMBOL);
    let draw = |s: &mut String, b: &crate::results::BuildingResult, lon: f64, lat: f64, size| {
        let (x, y) = f.px(lon, lat);
        let _ = write!(
            s,
            "<g data-id=\"{}\"><title>{} — {} — class {} {}</title>{}</g>",
            esc(&b.id),
            esc(&b.id),
            esc(&b.name),
            b.class,
            class_name(b.class),
            symbol(b.class, x, y, size)
        );
    };
    for class in [4u8, 3, 2, 1] {
        for (b, (lon, lat)) in located
            .iter()
            .filter(|(b, _)| b.class == class && b.rank > LABELLED)
        {
            draw(&mut s, b, *lon, *lat, size);
        }
    }
    let mut top: Vec<_> = located.iter().filter(|(b, _)| b.rank <= LABELLED).collect();
    top.sort_by_key(|(b, _)| std::cmp::Reverse(b.rank));
    for (b, (lon, lat)) in top {
        draw(&mut s, b, *lon, *lat, SYMBOL);
    }
    s.push_str("</g><g class=\"ranks\">");
    for (b, (lon, lat)) in located.iter().filter(|(b, _)| b.rank <= LABELLED) {
        let (x, y) = f.px(*lon, *lat);
        let _ = write!(
            s,
            "<text x=\"{:.1}\" y=\"{:.1}\" class=\"rank\">{}</text>",
            x + SYMBOL + 2.0,
            y - SYMBOL + 2.0,
            b.rank
        );
    }
    s.push_str("</g>");
    if let Some(l) = layers {
        off_map_faults(&mut s, &f, l);
    }
    s.push_str("</g>");
    // Below the map: scale bar (left) and north arrow (right), clear of the buildings.
    let km = nice_length(WIDTH / f.scale / 4.0);
    let len = km * f.scale;
    let (x0, y0) = (12.0, h + BAND - 10.0);
    let label = if km >= 1.0 {
        format!("{km} km")
    } else {
        format!("{} m", (km * 1000.0).round())
    };
    let _ = write!(
        s,
        "<g class=\"scale\"><path d=\"M{x0:.1} {:.1}V{y0:.1}H{:.1}V{:.1}\" fill=\"none\" \
         stroke=\"#111\" stroke-width=\"2\"/><text x=\"{:.1}\" y=\"{:.1}\">{label}</text></g>",
        y0 - 7.0,
        x0 + len,
        y0 - 7.0,
        x0 + len + 6.0,
        y0,
    );
    let (nx, ny) = (WIDTH - 20.0, h + 4.0);
    let _ = write!(
        s,
        "<g class=\"north\"><path d=\"M{nx} {ny}L{:.1} {:.1}L{nx} {:.1}L{:.1} {:.1}Z\" fill=\"#111\"/>\
         <text x=\"{:.1}\" y=\"{:.1}\" font-weight=\"bold\" text-anchor=\"end\">north ↑ N</text></g>",
        nx + 7.0,
        ny + 22.0,
        ny + 17.0,
        nx - 7.0,
        ny + 22.0,
        nx - 12.0,
        ny + 17.0
    );
    s.push_str("</svg>");
    Some(s)
}

/// Fault traces wholly outside the view: an arrow at the edge of the map pointing to the
/// trace's nearest vertex, with its name and distance from the map's centre.
fn off_map_faults(s: &mut String, f: &Frame, l: &MapLayers) {
    let (cx, cy) = (WIDTH / 2.0, f.height / 2.0);
    for FaultLine { name, parts } in &l.faults {
        let pts: Vec<(f64, f64)> = parts
            .iter()
            .flatten()
            .map(|&(lon, lat)| f.px(lon, lat))
            .collect();
        if pts.is_empty() || pts.iter().any(|p| f.inside(*p)) {
            continue;
        }
        let Some(&(px, py)) = pts.iter().min_by(|a, b| {
            let da = (a.0 - cx).hypot(a.1 - cy);
            let db = (b.0 - cx).hypot(b.1 - cy);
            da.total_cmp(&db)
        }) else {
            continue;
        };
        let (dx, dy) = (px - cx, py - cy);
        let dist_km = dx.hypot(dy) / f.scale;
        // Where the ray from the centre leaves the frame (8 px inside).
        let tx = if dx.abs() > 1e-9 {
            (cx - 8.0) / dx.abs()
        } else {
            f64::MAX
        };
        let ty = if dy.abs() > 1e-9 {
            (cy - 8.0) / dy.abs()
        } else {
            f64::MAX
        };
        let t = tx.min(ty);
        let (ex, ey) = (cx + dx * t, cy + dy * t);
        let (ux, uy) = (dx / dx.hypot(dy), dy / dx.hypot(dy));
        let (bx, by) = (ex - ux * 22.0, ey - uy * 22.0);
        let _ = write!(
            s,
            "<g class=\"offmap\"><path d=\"M{bx:.1} {by:.1}L{ex:.1} {ey:.1}\" stroke=\"#111\" \
             stroke-width=\"2.4\" stroke-dasharray=\"10 4 2 4\"/>\
             <path d=\"M{ex:.1} {ey:.1}L{:.1} {:.1}L{:.1} {:.1}Z\" fill=\"#111\"/>\
             <text x=\"{:.1}\" y=\"{:.1}\" class=\"fname\" text-anchor=\"{}\">{} {} km</text></g>",
            ex - ux * 9.0 - uy * 5.0,
            ey - uy * 9.0 + ux * 5.0,
            ex - ux * 9.0 + uy * 5.0,
            ey - uy * 9.0 - ux * 5.0,
            (bx - ux * 4.0).clamp(4.0, WIDTH - 4.0),
            (by - uy * 6.0 + 4.0).clamp(12.0, f.height - 4.0),
            if ux > 0.3 {
                "end"
            } else if ux < -0.3 {
                "start"
            } else {
                "middle"
            },
            esc(name),
            crate::report::people::sig(dist_km, 2, true).unwrap_or_default()
        );
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn projection_keeps_local_distances() {
        // 0.01° of latitude is 1.1119 km on a sphere of radius 6,371.0088 km
        // (2πR/36,000); 0.01° of longitude at 45° is that times cos 45° = 0.7862 km.
        let f = frame(&[(20.0, 44.99), (20.01, 45.01)]).expect("frame");
        let (x, y) = f.km(20.01, 45.0);
        let (x0, y0) = f.km(20.0, 44.99);
        assert!(((x - x0) - 0.7862).abs() < 1e-3, "{}", x - x0);
        assert!(((y - y0) - 1.1119).abs() < 1e-3, "{}", y - y0);
        // Across the antimeridian the two points stay 0.02° apart, not 359.98°.
        let f = frame(&[(179.99, 0.0), (-179.99, 0.0)]).expect("frame");
        let (a, _) = f.km(179.99, 0.0);
        let (b, _) = f.km(-179.99, 0.0);
        assert!(((b - a) - 2.0 * 1.1119).abs() < 1e-2, "{}", b - a);
    }

    #[test]
    fn scale_bar_lengths_are_round() {
        assert_eq!(nice_length(3.7), 2.0);
        assert_eq!(nice_length(0.6), 0.5);
        assert_eq!(nice_length(12.0), 10.0);
        assert_eq!(nice_length(55.0), 50.0);
    }
}
