/*!
Inventing the demo town and invented inventories of any size.

Everything here is invented: the town of Karsavel, its four districts, its two fault traces
and its buildings. The town is placed at about 35.0° N 18.0° E — open sea in reality — so
that no real place or building is implied. All output is a pure function of the seed:
random numbers come from PCG-64 (`rand_pcg::Pcg64Mcg`, whose output sequence that crate
keeps value-stable) mapped to ranges by the fixed rules of [`Dice`], so a workbook made
today is made the same tomorrow.
*/

use geo::{Contains, Coord, LineString, Point, Polygon};
use rand_pcg::Pcg64Mcg;
use rand_pcg::rand_core::{Rng, SeedableRng};

use crate::model::{BuildingRecord, FootprintVertex, StoreyRecord, Use, WallRecord, YesNo};

/// Deterministic random numbers for invented data: PCG-64 (MCG variant) with fixed
/// mappings — `unit` takes the top 53 bits of a 64-bit draw as a fraction in [0, 1).
#[derive(Debug, Clone)]
pub struct Dice(Pcg64Mcg);

impl Dice {
    /// A generator for a seed.
    pub fn new(seed: u64) -> Self {
        Self(Pcg64Mcg::seed_from_u64(seed))
    }
    /// Uniform in [0, 1).
    pub fn unit(&mut self) -> f64 {
        (self.0.next_u64() >> 11) as f64 * (1.0 / (1u64 << 53) as f64)
    }
    /// Uniform in [lo, hi).
    pub fn range(&mut self, lo: f64, hi: f64) -> f64 {
        lo + (hi - lo) * self.unit()
    }
    /// Uniform whole number in [lo, hi].
    pub fn int(&mut self, lo: i64, hi: i64) -> i64 {
        let span = (hi - lo + 1).max(1) as f64;
        lo + ((self.unit() * span).floor() as i64).min(hi - lo)
    }
    /// True with probability `p`.
    pub fn chance(&mut self, p: f64) -> bool {
        self.unit() < p
    }
}

/// `v` rounded to `decimals` decimal places (invented values are stored rounded).
pub fn round(v: f64, decimals: i32) -> f64 {
    let k = 10f64.powi(decimals);
    (v * k).round() / k
}

/// One invented district: name, outer ring and holes (longitude, latitude), hazard.
#[derive(Debug, Clone, Copy)]
pub struct DemoDistrict {
    /// District name.
    pub name: &'static str,
    /// Outer ring, closed (first = last), (longitude, latitude).
    pub ring: &'static [(f64, f64)],
    /// Holes, closed.
    pub holes: &'static [&'static [(f64, f64)]],
    /// Hazard override agR (g).
    pub agr_g: Option<f64>,
    /// Hazard override ground type.
    pub ground_type: Option<&'static str>,
    /// Share of the town's buildings (weights, any scale).
    pub weight: f64,
}

/// The four invented districts of Karsavel. They tile the box 18.00–18.06° E,
/// 35.00–35.05° N; Harbour Ward has a hole (the harbour basin, no buildings).
pub const DISTRICTS: [DemoDistrict; 4] = [
    DemoDistrict {
        name: "Harbour Ward",
        ring: &[
            (18.000, 35.000),
            (18.030, 35.000),
            (18.030, 35.022),
            (18.000, 35.025),
            (18.000, 35.000),
        ],
        holes: &[&[
            (18.008, 35.004),
            (18.016, 35.004),
            (18.016, 35.009),
            (18.008, 35.009),
            (18.008, 35.004),
        ]],
        agr_g: None,
        ground_type: None,
        weight: 0.3,
    },
    DemoDistrict {
        name: "Quarry Rise",
        ring: &[
            (18.030, 35.000),
            (18.060, 35.000),
            (18.060, 35.020),
            (18.030, 35.022),
            (18.030, 35.000),
        ],
        holes: &[],
        agr_g: None,
        ground_type: Some("B"),
        weight: 0.2,
    },
    DemoDistrict {
        name: "Lintel Heights",
        ring: &[
            (18.000, 35.025),
            (18.030, 35.022),
            (18.032, 35.050),
            (18.000, 35.050),
            (18.000, 35.025),
        ],
        holes: &[],
        agr_g: None,
        ground_type: None,
        weight: 0.25,
    },
    DemoDistrict {
        name: "Orchard Flats",
        ring: &[
            (18.030, 35.022),
            (18.060, 35.020),
            (18.060, 35.050),
            (18.032, 35.050),
            (18.030, 35.022),
        ],
        holes: &[],
        agr_g: Some(0.30),
        ground_type: Some("D"),
        weight: 0.25,
    },
];

/// One invented fault trace: name, magnitude, vertices (longitude, latitude).
#[derive(Debug, Clone, Copy)]
pub struct DemoFault {
    /// Trace name.
    pub name: &'static str,
    /// Moment magnitude.
    pub mw: f64,
    /// Vertices (longitude, latitude).
    pub trace: &'static [(f64, f64)],
}

/// Two invented traces: an Mw 7.1 trace 12–20 km south-west of the town (the south-west
/// third lies within its 15 km) and an Mw 6.4 trace 7–15 km north-east (the north-east
/// corner lies within its 10 km).
pub const FAULTS: [DemoFault; 2] = [
    DemoFault {
        name: "Karsavel Ridge fault",
        mw: 7.1,
        trace: &[(17.7516, 35.0509), (17.9000, 34.9300), (18.0620, 34.7965)],
    },
    DemoFault {
        name: "Orlin Valley fault",
        mw: 6.4,
        trace: &[(18.04, 35.165), (18.11, 35.105), (18.19, 35.05)],
    },
];

fn polygon_of(d: &DemoDistrict) -> Polygon<f64> {
    let ring =
        |pts: &[(f64, f64)]| LineString::new(pts.iter().map(|&(x, y)| Coord { x, y }).collect());
    Polygon::new(ring(d.ring), d.holes.iter().map(|h| ring(h)).collect())
}

/// Picks a district by weight and a point strictly inside it (not on an edge, not in a
/// hole), rounded to 6 decimals (about 0.1 m). Returns (district index, lat, lon).
pub fn invented_site(dice: &mut Dice, polygons: &[Polygon<f64>]) -> (usize, f64, f64) {
    let total: f64 = DISTRICTS.iter().map(|d| d.weight).sum();
    let mut pick = dice.range(0.0, total);
    let mut index = 0;
    for (i, d) in DISTRICTS.iter().enumerate() {
        index = i;
        if pick < d.weight {
            break;
        }
        pick -= d.weight;
    }
    let Some(poly) = polygons.get(index) else {
        return (0, 35.01, 18.02);
    };
    let (mut lo_x, mut lo_y, mut hi_x, mut hi_y) = (f64::MAX, f64::MAX, f64::MIN, f64::MIN);
    for c in poly.exterior().coords() {
        lo_x = lo_x.min(c.x);
        lo_y = lo_y.min(c.y);
        hi_x = hi_x.max(c.x);
        hi_y = hi_y.max(c.y);
    }
    for _ in 0..1000 {
        let lon = round(dice.range(lo_x, hi_x), 6);
        let lat = round(dice.range(lo_y, hi_y), 6);
        if poly.contains(&Point::new(lon, lat)) {
            return (index, lat, lon);
        }
    }
    // Unreachable in practice (the districts are far from thin); the ring's first vertex
    // nudged inwards is a safe fallback.
    (index, lo_y + 0.001, lo_x + 0.001)
}

/// The district polygons as geo shapes, in [`DISTRICTS`] order.
pub fn district_polygons() -> Vec<Polygon<f64>> {
    DISTRICTS.iter().map(polygon_of).collect()
}

/// Kinds of invented building.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum BuildingType {
    /// Apartment block.
    Apartments,
    /// School.
    School,
    /// Health centre (hospital use).
    Health,
    /// Office block.
    Office,
    /// Community hall (other use).
    Hall,
}

/// Invents a building of a kind and year: plausible RC proportions for the era (walls
/// scarce before the mid-1970s, common after the late 1990s), with some optional columns
/// left blank so that defaults show. Pure in `dice`.
pub fn invent_building(
    dice: &mut Dice,
    id: String,
    name: String,
    kind: BuildingType,
    year: i32,
    site: (f64, f64),
) -> BuildingRecord {
    let (storeys, plan_area, aspect, use_) = match kind {
        BuildingType::Apartments => {
            let n = match year {
                ..1970 => dice.int(3, 5),
                1970..1990 => dice.int(4, 7),
                1990..2000 => dice.int(5, 8),
                _ => dice.int(5, 10),
            };
            (
                n,
                dice.range(220.0, 560.0),
                dice.range(1.4, 2.6),
                Use::Residential,
            )
        }
        BuildingType::School => (
            dice.int(2, 4),
            dice.range(650.0, 1450.0),
            dice.range(2.8, 4.5),
            Use::School,
        ),
        BuildingType::Health => (
            3,
            dice.range(900.0, 1300.0),
            dice.range(2.0, 3.0),
            Use::Hospital,
        ),
        BuildingType::Office => (
            dice.int(4, 8),
            dice.range(400.0, 800.0),
            dice.range(1.2, 2.0),
            Use::Office,
        ),
        BuildingType::Hall => (
            2,
            dice.range(350.0, 600.0),
            dice.range(1.3, 1.8),
            Use::Other,
        ),
    };
    let plan_area = round(plan_area, 0);
    let lx = round((plan_area * aspect).sqrt(), 1);
    let ly = round(plan_area / lx, 1);
    let n = storeys as f64;
    let column_ratio = (0.0025 + 0.0012 * n) * dice.range(0.85, 1.15);
    let (wall_lo, wall_hi) = match year {
        ..1975 => (0.0, 0.25),
        1975..1998 => (0.15, 0.8),
        _ => (0.7, 1.8),
    };
    let wall_x = round(plan_area * dice.range(wall_lo, wall_hi) / 100.0, 2);
    let wall_y = round(plan_area * dice.range(wall_lo, wall_hi) / 100.0, 2);
    let infill = |dice: &mut Dice| round(plan_area * dice.range(1.2, 3.0) / 100.0, 1);
    let boundary = match year {
        ..1998 if dice.chance(0.5) => YesNo::No,
        ..1998 => YesNo::Unknown,
        _ if dice.chance(0.7) => YesNo::Yes,
        _ => YesNo::Unknown,
    };
    let short_columns = match (kind, year) {
        (BuildingType::School, ..1990) if dice.chance(0.5) => YesNo::Yes,
        _ if dice.chance(0.15) => YesNo::Unknown,
        _ => YesNo::No,
    };
    let with_materials = dice.chance(0.5);
    let (fc, fy) = match year {
        ..1976 => (dice.range(10.0, 16.0), 220.0),
        1976..1998 => (dice.range(15.0, 22.0), 420.0),
        _ => (dice.range(24.0, 32.0), 420.0),
    };
    let occupants = match kind {
        BuildingType::Apartments => (n * dice.range(8.0, 14.0)).round(),
        BuildingType::School => dice.range(220.0, 900.0).round(),
        BuildingType::Health => dice.range(120.0, 260.0).round(),
        BuildingType::Office => (plan_area * n / dice.range(12.0, 20.0)).round(),
        BuildingType::Hall => dice.range(80.0, 300.0).round(),
    };
    BuildingRecord {
        row: 0,
        id,
        name,
        use_: Some(use_),
        year_built: Some(year),
        latitude: Some(site.0),
        longitude: Some(site.1),
        district: None,
        storeys: u32::try_from(storeys).unwrap_or(1),
        storey_height_m: Some(round(dice.range(2.8, 3.1), 2)),
        ground_storey_height_m: None,
        plan_area_m2: plan_area,
        plan_length_x_m: Some(lx),
        plan_length_y_m: Some(ly),
        column_area_m2: round(plan_area * column_ratio, 2),
        column_depth_m: dice.chance(0.6).then(|| round(dice.range(0.3, 0.6), 2)),
        rc_wall_area_x_m2: Some(wall_x),
        rc_wall_area_y_m2: Some(wall_y),
        wall_length_x_m: (wall_x > 0.0).then(|| round(dice.range(3.0, 6.0), 1)),
        wall_length_y_m: (wall_y > 0.0).then(|| round(dice.range(3.0, 6.0), 1)),
        wall_thickness_m: (wall_x + wall_y > 0.0).then(|| round(dice.range(0.2, 0.3), 2)),
        infill_area_x_m2: Some(infill(dice)),
        infill_area_y_m2: Some(infill(dice)),
        boundary_elements: Some(boundary),
        short_columns: Some(short_columns),
        fc_mpa: with_materials.then(|| round(fc, 1)),
        fy_mpa: with_materials.then_some(fy),
        floor_weight_kpa: dice.chance(0.4).then(|| round(dice.range(10.5, 13.5), 1)),
        occupants: Some(occupants.max(1.0) as u64),
        ..BuildingRecord::default()
    }
}

/// Makes the ground storey of `b` a soft storey (shops or pilotis): taller ground storey,
/// little ground-storey infill, the storey above fully infilled.
pub fn make_soft_ground_storey(dice: &mut Dice, b: &mut BuildingRecord) {
    let a = b.plan_area_m2;
    b.ground_storey_height_m = Some(round(dice.range(3.9, 4.6), 2));
    b.upper_infill_area_x_m2 = b.infill_area_x_m2;
    b.upper_infill_area_y_m2 = b.infill_area_y_m2;
    b.infill_area_x_m2 = Some(round(a * dice.range(0.1, 0.4) / 100.0, 1));
    b.infill_area_y_m2 = Some(round(a * dice.range(0.1, 0.4) / 100.0, 1));
    b.upper_rc_wall_area_x_m2 = b.rc_wall_area_x_m2;
    b.upper_rc_wall_area_y_m2 = b.rc_wall_area_y_m2;
    b.upper_column_area_m2 = Some(b.column_area_m2);
}

/// Plan shapes for buildings with listed walls.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Layout {
    /// Walls on both faces in both directions.
    Balanced,
    /// Y walls on the west face only (a stiffness centre far from the mass centre).
    Eccentric,
    /// As balanced, with one X wall starting at storey 2 (wall-discontinued).
    Discontinued,
}

/// Lists the RC walls of `b` one by one in the footprint frame (origin at the plan centre),
/// clears its `rc_wall_area_*` columns (the walls sheet replaces them) and returns the rows.
/// `cut` = (width, depth) of a corner cut away at the north-east of the plan rectangle (an
/// L-shaped footprint, see [`l_footprint`]): walls that would fall in it move to the
/// re-entrant faces, so every wall lies inside the footprint.
pub fn invent_walls(
    dice: &mut Dice,
    b: &mut BuildingRecord,
    layout: Layout,
    cut: Option<(f64, f64)>,
) -> Vec<WallRecord> {
    let lx = b.plan_length_x_m.unwrap_or(20.0);
    let ly = b.plan_length_y_m.unwrap_or(12.0);
    let t = round(dice.range(0.25, 0.3), 2);
    let new_boundary = b.boundary_elements;
    let mut walls = Vec::new();
    let mut push = |dir: crate::model::Dir, len: f64, x: f64, y: f64, start: u32| {
        let k = walls.len() + 1;
        walls.push(WallRecord {
            row: 0,
            building_id: b.id.clone(),
            wall_id: format!("W{k}"),
            direction: Some(dir),
            length_m: round(len, 2),
            thickness_m: Some(t),
            x_m: Some(round(x, 2)),
            y_m: Some(round(y, 2)),
            boundary_elements: new_boundary,
            boundary_steel_pct: Some(round(dice.range(0.6, 1.6), 2)),
            web_steel_pct: Some(0.25),
            bar_diameter_mm: Some(if b.year_built.unwrap_or(2000) < 1980 {
                14.0
            } else {
                16.0
            }),
            start_storey: Some(start),
            end_storey: None,
        });
    };
    use crate::model::Dir::{X, Y};
    let (hx, hy) = (lx / 2.0 - t / 2.0, ly / 2.0 - t / 2.0);
    let lwx = (lx / 5.0).clamp(3.0, 6.0);
    let lwy = (ly / 3.0).clamp(3.0, 6.0);
    // North face east of centre: on the re-entrant face when the corner is cut away.
    let north_east_y = cut.map_or(hy, |(_, c)| ly / 2.0 - c - t / 2.0);
    // East face: towards its south end when the corner is cut away.
    let east_y = cut.map_or(0.0, |_| -ly / 2.0 + lwy / 2.0 + 0.5);
    // X walls on the north and south faces.
    push(X, lwx, -lx / 4.0, -hy, 1);
    push(X, lwx, lx / 4.0, north_east_y, 1);
    match layout {
        Layout::Balanced | Layout::Discontinued => {
            push(X, lwx, lx / 4.0, -hy, 1);
            push(
                X,
                lwx,
                -lx / 4.0,
                hy,
                if layout == Layout::Discontinued { 2 } else { 1 },
            );
            push(Y, lwy, -hx, 0.0, 1);
            push(Y, lwy, hx, east_y, 1);
        }
        Layout::Eccentric => {
            push(Y, lwy, -hx, -ly / 4.0, 1);
            push(Y, lwy, -hx, ly / 4.0, 1);
            push(Y, lwy * 0.8, -lx / 3.0, 0.0, 1);
        }
    }
    b.rc_wall_area_x_m2 = None;
    b.rc_wall_area_y_m2 = None;
    b.wall_length_x_m = Some(round(lwx, 1));
    b.wall_length_y_m = Some(round(lwy, 1));
    b.wall_thickness_m = Some(t);
    walls
}

/// An L-shaped footprint for `b` (the north-east corner of the plan rectangle cut away),
/// centred on the rectangle's centre; sets the plan area to the L's area. Returns the
/// vertices in order from 1 and the cut (width along X, depth along Y).
pub fn l_footprint(dice: &mut Dice, b: &mut BuildingRecord) -> (Vec<FootprintVertex>, (f64, f64)) {
    let lx = b.plan_length_x_m.unwrap_or(20.0);
    let ly = b.plan_length_y_m.unwrap_or(12.0);
    let a = round(lx * dice.range(0.25, 0.4), 1);
    let c = round(ly * dice.range(0.3, 0.45), 1);
    let (x0, x1, y0, y1) = (-lx / 2.0, lx / 2.0, -ly / 2.0, ly / 2.0);
    let pts = [
        (x0, y0),
        (x1, y0),
        (x1, y1 - c),
        (x1 - a, y1 - c),
        (x1 - a, y1),
        (x0, y1),
    ];
    b.plan_area_m2 = round(lx * ly - a * c, 0);
    let vertices = pts
        .iter()
        .enumerate()
        .map(|(i, &(x, y))| FootprintVertex {
            row: 0,
            building_id: b.id.clone(),
            vertex: (i + 1) as f64,
            x_m: round(x, 2),
            y_m: round(y, 2),
        })
        .collect();
    (vertices, (a, c))
}

/// Storey-by-storey data for `b` (one row per storey); with `soft` the ground storey is
/// taller and has little infill.
pub fn invent_storeys(dice: &mut Dice, b: &BuildingRecord, soft: bool) -> Vec<StoreyRecord> {
    let a = b.plan_area_m2;
    let h = b.storey_height_m.unwrap_or(3.0);
    (1..=b.storeys)
        .map(|i| {
            let ground = i == 1;
            let taper = 1.0 - 0.06 * f64::from(i - 1);
            let infill = if ground && soft {
                dice.range(0.1, 0.4)
            } else {
                dice.range(1.5, 3.0)
            };
            StoreyRecord {
                row: 0,
                building_id: b.id.clone(),
                storey: i,
                height_m: Some(if ground && soft {
                    round(dice.range(4.0, 4.5), 2)
                } else {
                    h
                }),
                column_area_m2: Some(round(b.column_area_m2 * taper.max(0.5), 2)),
                rc_wall_area_x_m2: b.rc_wall_area_x_m2,
                rc_wall_area_y_m2: b.rc_wall_area_y_m2,
                infill_area_x_m2: Some(round(a * infill / 100.0, 1)),
                infill_area_y_m2: Some(round(a * infill * dice.range(0.8, 1.2) / 100.0, 1)),
            }
        })
        .collect()
}

/// Building names for the demo: invented, by kind and a running number.
pub fn invented_name(kind: BuildingType, district: &str, k: usize) -> String {
    match kind {
        BuildingType::Apartments => format!("{district} apartment block {k}"),
        BuildingType::School => {
            let level = ["Primary", "Secondary", "Vocational"];
            let l = level.get(k % level.len()).copied().unwrap_or("Primary");
            format!("{district} {l} School No. {k}")
        }
        BuildingType::Health => format!("{district} Health Centre"),
        BuildingType::Office => format!("Karsavel municipal offices, annex {k}"),
        BuildingType::Hall => format!("{district} community hall"),
    }
}
