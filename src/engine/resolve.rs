/*!
Method §0: the quantities of one building, with every default resolved and recorded.

[`resolve`] turns a [`BuildingInput`] (typed rows, blanks as `None`) into a [`Resolved`]
building: storey heights and floor heights z_i, areas, material strengths, hazard, the
effective detailing rule and the RC walls of each direction (listed one by one, or one
representative wall). Every optional input that was blank and took a default is listed in
`defaults_used` under its canonical name (interface.md).
*/

use crate::model::{Dir, PerDir, Use, YesNo};
use crate::settings::{GroundType, Settings, Spectrum};

use super::BuildingInput;

/// Standard gravity g (m/s²), the unit of accelerations in method.md.
pub const G: f64 = 9.81;

/// Hazard of one building after the precedence row > district > settings (method §0, §5).
#[derive(Debug, Clone, PartialEq)]
pub enum Hazard {
    /// EN 1998-1 spectrum (Type 1 or 2).
    Ec8 {
        /// Spectrum type: true = Type 2 (Table 3.3), false = Type 1 (Table 3.2).
        type2: bool,
        /// Reference peak ground acceleration on rock agR (g).
        agr_g: f64,
        /// Where agR came from: "row", "district" or "settings".
        agr_source: &'static str,
        /// Ground type A–E.
        ground: GroundType,
        /// Where the ground type came from: "row", "district" or "settings".
        ground_source: &'static str,
    },
    /// ASCE 7-16 §11.4.6 two-parameter spectrum.
    TwoParameter {
        /// SDS (g).
        sds_g: f64,
        /// SD1 (g).
        sd1_g: f64,
        /// TL (s); `None` = no long-period corner.
        tl_s: Option<f64>,
        /// Where SDS/SD1 came from: "row", "district" or "settings".
        source: &'static str,
    },
}

/// One RC wall (or a representative wall standing for several) as the engine uses it.
#[derive(Debug, Clone, PartialEq)]
pub struct WallSpec {
    /// Wall id ("representative" / "new" for the generated ones).
    pub id: String,
    /// Direction its length is parallel to.
    pub dir: Dir,
    /// Length lw (m).
    pub lw: f64,
    /// Thickness tw (m).
    pub tw: f64,
    /// Number of walls the row stands for (1 for listed walls).
    pub count: f64,
    /// True for a representative wall.
    pub representative: bool,
    /// True for a retrofit wall (method §12).
    pub new: bool,
    /// The recorded boundary-element answer after the wall > building rule (None = blank).
    pub boundary_recorded: Option<YesNo>,
    /// Boundary elements present by the rule of method §0.
    pub boundary: bool,
    /// Boundary steel ratio (%).
    pub boundary_steel_pct: f64,
    /// Web steel ratio (%).
    pub web_steel_pct: f64,
    /// Longitudinal bar diameter db (m).
    pub db_m: f64,
    /// Plan position (m), when listed.
    pub position: Option<(f64, f64)>,
    /// Concrete strength (MPa, mean).
    pub fc_mpa: f64,
    /// Steel strength (MPa, mean).
    pub fy_mpa: f64,
    /// Axial load ratio ν.
    pub nu: f64,
    /// True when the mean strengths are divided by the confidence factor (existing walls).
    pub existing: bool,
}

impl WallSpec {
    /// Cross-section area of the whole row, count·lw·tw (m²).
    pub fn area_m2(&self) -> f64 {
        self.count * self.lw * self.tw
    }
}

/// Areas of one storey used by the soft/weak storey flags (method §10).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StoreyAreas {
    /// Storey height h_i (m).
    pub height_m: f64,
    /// Column area (m²).
    pub column_m2: f64,
    /// RC wall area per direction (m²).
    pub rc_wall_m2: PerDir<f64>,
    /// Infill area per direction (m²).
    pub infill_m2: PerDir<f64>,
}

/// Where the storey-by-storey data for the soft/weak flags came from (method §10, per
/// building, in this order of precedence).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum StoreySource {
    /// (1) The building's storeys-sheet rows (it has a row for storey 2): storeys 2–4 while
    /// rows exist; storey 1 is the buildings row (and its listed walls).
    Sheet,
    /// (2) The `upper_*` cells (at least one filled): storey 2 only, blanks take the ground
    /// storey's values.
    Upper,
    /// (3) Neither: storey 2 repeats the ground storey's columns and infill, takes the walls
    /// standing in storey 2 and its own height h_2.
    Derived {
        /// True when the walls come from the walls sheet (start ≤ 2 ≤ end), false when they
        /// are the ground storey's wall areas (no walls sheet).
        walls_sheet: bool,
    },
    /// One storey: no soft/weak storey check.
    None,
}

/// One building with every quantity of method §0 resolved.
#[derive(Debug, Clone, PartialEq)]
pub struct Resolved {
    /// Storeys n.
    pub n: u32,
    /// Storey heights h_i (m), ground first.
    pub heights_m: Vec<f64>,
    /// Floor heights z_i (m).
    pub z_m: Vec<f64>,
    /// Total height H = z_n (m).
    pub height_m: f64,
    /// Typical plan area A_plan (m²).
    pub plan_area_m2: f64,
    /// Total floor area A_fl = n·A_plan (m²).
    pub floor_area_m2: f64,
    /// Ground-storey column area A_col (m²).
    pub column_area_m2: f64,
    /// Column depth h_c (m).
    pub column_depth_m: f64,
    /// Ground-storey RC wall area per direction A_cw,d (m²), existing walls.
    pub rc_wall_area_m2: PerDir<f64>,
    /// Ground-storey infill area per direction A_mw,d (m²).
    pub infill_area_m2: PerDir<f64>,
    /// Mean concrete strength fc (MPa).
    pub fc_mpa: f64,
    /// Mean steel strength fy (MPa).
    pub fy_mpa: f64,
    /// Seismic weight per floor area w (kPa).
    pub floor_weight_kpa: f64,
    /// Seismic weight W = w·A_fl (kN).
    pub weight_kn: f64,
    /// Use (after default).
    pub use_: Use,
    /// Importance factor γI.
    pub gamma_i: f64,
    /// Hazard.
    pub hazard: Hazard,
    /// Building-level boundary elements present by the rule of §0.
    pub boundary_elements: bool,
    /// Columns seismically detailed by the rule of §0.
    pub columns_detailed: bool,
    /// RC walls reaching the ground (listed or representative), X first.
    pub walls: Vec<WallSpec>,
    /// True when the walls sheet lists this building's walls.
    pub walls_listed: bool,
    /// Ids of listed walls starting above the ground storey, per direction.
    pub walls_above_ground: PerDir<Vec<String>>,
    /// Storey-by-storey areas for the soft/weak flags (ground first).
    pub storeys: Vec<StoreyAreas>,
    /// Where `storeys` came from.
    pub storey_source: StoreySource,
    /// Input period per direction (s).
    pub period_input_s: PerDir<Option<f64>>,
    /// Canonical names of optional inputs that took a default.
    pub defaults_used: Vec<String>,
}

impl Resolved {
    /// RC walls of one direction.
    pub fn walls_in(&self, d: Dir) -> impl Iterator<Item = &WallSpec> {
        self.walls.iter().filter(move |w| w.dir == d)
    }
}

/// Effective boundary elements (method §0): "yes" → present, "no" → absent, "unknown"
/// (or blank) → present only when year built and `boundary_elements_from_year` are both
/// known and year ≥ that year.
pub fn boundary_present(
    recorded: Option<YesNo>,
    year: Option<i32>,
    from_year: Option<i32>,
) -> bool {
    match recorded {
        Some(YesNo::Yes) => true,
        Some(YesNo::No) => false,
        Some(YesNo::Unknown) | None => matches!((year, from_year), (Some(y), Some(f)) if y >= f),
    }
}

/// Columns seismically detailed (method §0): year built and `seismic_detailing_from_year`
/// both known and year ≥ it.
pub fn columns_detailed(year: Option<i32>, from_year: Option<i32>) -> bool {
    matches!((year, from_year), (Some(y), Some(f)) if y >= f)
}

/// Axial load ratio ν = W / ((A_col + A_cw,X + A_cw,Y)·fc·1000) (method §2; W kN, A m²,
/// fc MPa). Returns 0 when there is no vertical structure (guarded; such rows are refused
/// by the reader).
pub fn axial_load_ratio(weight_kn: f64, total_vertical_area_m2: f64, fc_mpa: f64) -> f64 {
    let denom = total_vertical_area_m2 * fc_mpa * 1000.0;
    if denom > 0.0 { weight_kn / denom } else { 0.0 }
}

/// Default material strengths from the era table: the first row whose year range holds the
/// year built.
fn era_strength(settings: &Settings, year: Option<i32>) -> (Option<f64>, Option<f64>) {
    let Some(y) = year else {
        return (None, None);
    };
    for e in &settings.era {
        let after = e.from_year.is_none_or(|f| y >= f);
        let before = e.to_year.is_none_or(|t| y <= t);
        if after && before {
            return (e.fc_mpa, e.fy_mpa);
        }
    }
    (None, None)
}

fn positive(v: Option<f64>) -> Option<f64> {
    v.filter(|x| x.is_finite() && *x > 0.0)
}

fn nonneg(v: Option<f64>) -> Option<f64> {
    v.filter(|x| x.is_finite() && *x >= 0.0)
}

/// Resolves the hazard: row > district > settings (method §0). `Err` = "no hazard given".
fn resolve_hazard(
    input: &BuildingInput<'_>,
    settings: &Settings,
    defaults: &mut Vec<String>,
) -> Result<Hazard, String> {
    let r = input.record;
    let site = input.site;
    match settings.spectrum {
        Spectrum::TwoParameter => {
            let pick = |row: Option<f64>, dist: Option<f64>, set: Option<f64>| {
                if let Some(v) = nonneg(row) {
                    Some((v, "row"))
                } else if let Some(v) = nonneg(dist) {
                    Some((v, "district"))
                } else {
                    nonneg(set).map(|v| (v, "settings"))
                }
            };
            let sds = pick(r.sds_g, site.and_then(|s| s.sds_g), settings.sds_g);
            let sd1 = pick(r.sd1_g, site.and_then(|s| s.sd1_g), settings.sd1_g);
            match (sds, sd1) {
                (Some((sds_g, src)), Some((sd1_g, _))) => Ok(Hazard::TwoParameter {
                    sds_g,
                    sd1_g,
                    tl_s: positive(settings.tl_s),
                    source: src,
                }),
                _ => Err("no hazard given: the two-parameter spectrum needs sds_g and sd1_g (row, district or settings)".into()),
            }
        }
        Spectrum::Ec8Type1 | Spectrum::Ec8Type2 => {
            let (agr_g, agr_source) = if let Some(v) = nonneg(r.agr_g) {
                (v, "row")
            } else if let Some(v) = nonneg(site.and_then(|s| s.agr_g)) {
                (v, "district")
            } else if let Some(v) = nonneg(settings.agr_g) {
                (v, "settings")
            } else {
                return Err(
                    "no hazard given: agr_g is missing from the row, its district and the settings"
                        .into(),
                );
            };
            let (ground, ground_source) = if let Some(g) = r.ground_type {
                (g, "row")
            } else if let Some(g) = site.and_then(|s| s.ground_type) {
                (g, "district")
            } else {
                defaults.push("ground_type".into());
                (settings.default_ground_type, "settings")
            };
            Ok(Hazard::Ec8 {
                type2: settings.spectrum == Spectrum::Ec8Type2,
                agr_g,
                agr_source,
                ground,
                ground_source,
            })
        }
    }
}

/// Storeys whose data the soft/weak storey flags read: 1 (ground) to at most 4 (the mean
/// test of ASCE 7-16 Table 12.3-2 uses storeys 2–4).
pub const STOREYS_FOR_FLAGS: u32 = 4;

/// Storey-by-storey areas for the soft/weak storey flags of one building (method §10),
/// ground first, and where they came from. Precedence per building:
/// (1) its storeys-sheet rows when it has a row for storey 2 — storeys 2–4 while rows exist
///     (the mean test then needs n ≥ 4 and rows 2, 3 and 4); storey 1 is always `ground`
///     (the buildings row and its listed walls) with the storeys row's height (already in
///     `heights_m`); a blank cell of a storey row takes the storey below's value (walls:
///     the listed walls standing in that storey when walls are listed);
/// (2) else its `upper_*` cells when at least one is filled: storey 2, blank cells take the
///     ground storey's values, height h_2;
/// (3) else storey 2 repeats the ground storey's columns and infill, takes the listed walls
///     standing in storey 2 (start ≤ 2 ≤ end; defaults 1 and n) — without a walls sheet
///     the ground wall areas — and its own height h_2.
/// With n = 1 there is no check (one storey, [`StoreySource::None`]).
pub fn storey_data(
    input: &BuildingInput<'_>,
    n: u32,
    heights_m: &[f64],
    ground: StoreyAreas,
    walls_listed: bool,
    listed_wall_area_at: impl Fn(u32, Dir) -> f64,
) -> (Vec<StoreyAreas>, StoreySource) {
    if n < 2 {
        return (vec![ground], StoreySource::None);
    }
    let r = input.record;
    let height = |i: u32| {
        heights_m
            .get(i as usize - 1)
            .copied()
            .unwrap_or(ground.height_m)
    };
    let row_of = |i: u32| input.storeys.iter().find(|s| s.storey == i);
    if row_of(2).is_some() {
        let mut out = vec![ground];
        let mut below = ground;
        for i in 2..=n.min(STOREYS_FOR_FLAGS) {
            let Some(row) = row_of(i) else { break };
            let walls = |d: Dir, v: Option<f64>| {
                nonneg(v).unwrap_or_else(|| {
                    if walls_listed {
                        listed_wall_area_at(i, d)
                    } else {
                        *below.rc_wall_m2.get(d)
                    }
                })
            };
            let st = StoreyAreas {
                height_m: height(i),
                column_m2: nonneg(row.column_area_m2).unwrap_or(below.column_m2),
                rc_wall_m2: PerDir {
                    x: walls(Dir::X, row.rc_wall_area_x_m2),
                    y: walls(Dir::Y, row.rc_wall_area_y_m2),
                },
                infill_m2: PerDir {
                    x: nonneg(row.infill_area_x_m2).unwrap_or(below.infill_m2.x),
                    y: nonneg(row.infill_area_y_m2).unwrap_or(below.infill_m2.y),
                },
            };
            out.push(st);
            below = st;
        }
        return (out, StoreySource::Sheet);
    }
    let upper_given = r.upper_rc_wall_area_x_m2.is_some()
        || r.upper_rc_wall_area_y_m2.is_some()
        || r.upper_infill_area_x_m2.is_some()
        || r.upper_infill_area_y_m2.is_some()
        || r.upper_column_area_m2.is_some();
    if upper_given {
        let second = StoreyAreas {
            height_m: height(2),
            column_m2: nonneg(r.upper_column_area_m2).unwrap_or(ground.column_m2),
            rc_wall_m2: PerDir {
                x: nonneg(r.upper_rc_wall_area_x_m2).unwrap_or(ground.rc_wall_m2.x),
                y: nonneg(r.upper_rc_wall_area_y_m2).unwrap_or(ground.rc_wall_m2.y),
            },
            infill_m2: PerDir {
                x: nonneg(r.upper_infill_area_x_m2).unwrap_or(ground.infill_m2.x),
                y: nonneg(r.upper_infill_area_y_m2).unwrap_or(ground.infill_m2.y),
            },
        };
        return (vec![ground, second], StoreySource::Upper);
    }
    let walls = |d: Dir| {
        if walls_listed {
            listed_wall_area_at(2, d)
        } else {
            *ground.rc_wall_m2.get(d)
        }
    };
    let second = StoreyAreas {
        height_m: height(2),
        column_m2: ground.column_m2,
        rc_wall_m2: PerDir {
            x: walls(Dir::X),
            y: walls(Dir::Y),
        },
        infill_m2: ground.infill_m2,
    };
    (
        vec![ground, second],
        StoreySource::Derived {
            walls_sheet: walls_listed,
        },
    )
}

/// Resolves every quantity of method §0 for one building. `Err` holds the reasons the
/// building cannot be screened.
pub fn resolve(input: &BuildingInput<'_>, settings: &Settings) -> Result<Resolved, Vec<String>> {
    let r = input.record;
    let mut defaults: Vec<String> = Vec::new();
    let mut errors: Vec<String> = Vec::new();

    let n = r.storeys;
    if n == 0 {
        errors.push("storeys must be a whole number of at least 1".into());
    }
    if !(r.plan_area_m2.is_finite() && r.plan_area_m2 > 0.0) {
        errors.push(format!(
            "plan area must be above 0 m², found {}",
            r.plan_area_m2
        ));
    }

    let use_ = r.use_.unwrap_or_else(|| {
        defaults.push("use".into());
        Use::Residential
    });

    // Storey heights: storeys sheet first, else ground / typical heights.
    let sheet_height = |i: u32| {
        input
            .storeys
            .iter()
            .find(|s| s.storey == i)
            .and_then(|s| positive(s.height_m))
    };
    let all_sheet_heights = n > 0 && (1..=n).all(|i| sheet_height(i).is_some());
    let typical = positive(r.storey_height_m);
    let typical_h = typical.unwrap_or(settings.default_storey_height_m);
    let ground_h = positive(r.ground_storey_height_m).unwrap_or(typical_h);
    if !all_sheet_heights {
        let needs_typical = (2..=n).any(|i| sheet_height(i).is_none())
            || (sheet_height(1).is_none() && r.ground_storey_height_m.is_none());
        if typical.is_none() && needs_typical {
            defaults.push("storey_height_m".into());
        }
        if sheet_height(1).is_none() && positive(r.ground_storey_height_m).is_none() {
            defaults.push("ground_storey_height_m".into());
        }
    }
    let heights_m: Vec<f64> = (1..=n)
        .map(|i| sheet_height(i).unwrap_or(if i == 1 { ground_h } else { typical_h }))
        .collect();
    let mut z_m = Vec::with_capacity(heights_m.len());
    let mut acc = 0.0;
    for h in &heights_m {
        acc += h;
        z_m.push(acc);
    }
    let height_m = acc;

    let plan_area_m2 = r.plan_area_m2;
    let floor_area_m2 = f64::from(n) * plan_area_m2;
    let column_area_m2 = nonneg(Some(r.column_area_m2)).unwrap_or(0.0);

    // Materials.
    let (era_fc, era_fy) = era_strength(settings, r.year_built);
    let fc_mpa = positive(r.fc_mpa).unwrap_or_else(|| {
        defaults.push("fc_mpa".into());
        positive(era_fc).unwrap_or(settings.default_fc_mpa)
    });
    let fy_mpa = positive(r.fy_mpa).unwrap_or_else(|| {
        defaults.push("fy_mpa".into());
        positive(era_fy).unwrap_or(settings.default_fy_mpa)
    });
    let floor_weight_kpa = positive(r.floor_weight_kpa).unwrap_or_else(|| {
        defaults.push("floor_weight_kpa".into());
        settings.floor_weight_kpa
    });
    let weight_kn = floor_weight_kpa * floor_area_m2;

    let hazard = match resolve_hazard(input, settings, &mut defaults) {
        Ok(h) => Some(h),
        Err(e) => {
            errors.push(e);
            None
        }
    };

    let boundary_elements = boundary_present(
        r.boundary_elements,
        r.year_built,
        settings.boundary_elements_from_year,
    );
    let columns_detailed = columns_detailed(r.year_built, settings.seismic_detailing_from_year);

    // Walls.
    let listed: Vec<_> = input
        .walls
        .iter()
        .filter(|w| w.direction.is_some())
        .collect();
    let walls_listed = !listed.is_empty();
    let mut walls: Vec<WallSpec> = Vec::new();
    let mut walls_above_ground: PerDir<Vec<String>> = PerDir::default();
    let mut rc_wall_area_m2 = PerDir { x: 0.0, y: 0.0 };
    let mut thickness_defaulted = false;
    let mut boundary_defaulted = false;
    let wall_tw = positive(r.wall_thickness_m);
    if walls_listed {
        for w in &listed {
            let Some(dir) = w.direction else { continue };
            if !(w.length_m.is_finite() && w.length_m > 0.0) {
                continue;
            }
            let tw = positive(w.thickness_m).or(wall_tw).unwrap_or_else(|| {
                thickness_defaulted = true;
                settings.default_wall_thickness_m
            });
            if w.start_storey.unwrap_or(1) > 1 {
                walls_above_ground
                    .get_mut(dir)
                    .push(if w.wall_id.is_empty() {
                        format!("row {}", w.row)
                    } else {
                        w.wall_id.clone()
                    });
                continue;
            }
            let recorded = w.boundary_elements.or(r.boundary_elements);
            if recorded.is_none() {
                boundary_defaulted = true;
            }
            let id = if w.wall_id.is_empty() {
                format!("row {}", w.row)
            } else {
                w.wall_id.clone()
            };
            let spec = WallSpec {
                id,
                dir,
                lw: w.length_m,
                tw,
                count: 1.0,
                representative: false,
                new: false,
                boundary_recorded: recorded,
                boundary: boundary_present(
                    recorded,
                    r.year_built,
                    settings.boundary_elements_from_year,
                ),
                boundary_steel_pct: positive(w.boundary_steel_pct)
                    .unwrap_or(settings.boundary_steel_pct),
                web_steel_pct: positive(w.web_steel_pct).unwrap_or(settings.web_steel_pct),
                db_m: positive(w.bar_diameter_mm)
                    .map_or(settings.default_bar_diameter_m, |mm| mm / 1000.0),
                position: w.x_m.zip(w.y_m),
                fc_mpa,
                fy_mpa,
                nu: 0.0,
                existing: true,
            };
            *rc_wall_area_m2.get_mut(dir) += spec.area_m2();
            walls.push(spec);
        }
    } else {
        for d in Dir::BOTH {
            let area = match d {
                Dir::X => nonneg(r.rc_wall_area_x_m2),
                Dir::Y => nonneg(r.rc_wall_area_y_m2),
            }
            .unwrap_or(0.0);
            *rc_wall_area_m2.get_mut(d) = area;
            if area <= 0.0 {
                continue;
            }
            let given_lw = match d {
                Dir::X => positive(r.wall_length_x_m),
                Dir::Y => positive(r.wall_length_y_m),
            };
            let lw = given_lw.unwrap_or_else(|| {
                defaults.push(format!("wall_length_{}_m", d.code()));
                settings.default_wall_length_m
            });
            let tw = wall_tw.unwrap_or_else(|| {
                thickness_defaulted = true;
                settings.default_wall_thickness_m
            });
            if r.boundary_elements.is_none() {
                boundary_defaulted = true;
            }
            walls.push(WallSpec {
                id: "representative".into(),
                dir: d,
                lw,
                tw,
                count: area / (lw * tw),
                representative: true,
                new: false,
                boundary_recorded: r.boundary_elements,
                boundary: boundary_elements,
                boundary_steel_pct: settings.boundary_steel_pct,
                web_steel_pct: settings.web_steel_pct,
                db_m: settings.default_bar_diameter_m,
                position: None,
                fc_mpa,
                fy_mpa,
                nu: 0.0,
                existing: true,
            });
        }
    }
    // A blank wall-area cell is "no RC walls": say so (interface.md, defaults_used) when
    // neither the cell nor the walls sheet gives walls in that direction.
    for d in Dir::BOTH {
        let cell = match d {
            Dir::X => r.rc_wall_area_x_m2,
            Dir::Y => r.rc_wall_area_y_m2,
        };
        let listed_here = walls_listed && walls.iter().any(|w| w.dir == d);
        if cell.is_none() && !listed_here {
            defaults.push(format!("rc_wall_area_{}_m2", d.code()));
        }
    }
    if thickness_defaulted {
        defaults.push("wall_thickness_m".into());
    }
    if boundary_defaulted {
        defaults.push("boundary_elements".into());
    }

    let column_depth_m = match positive(r.column_depth_m) {
        Some(v) => v,
        None => {
            if column_area_m2 > 0.0 {
                defaults.push("column_depth_m".into());
            }
            settings.default_column_depth_m
        }
    };

    let infill_area_m2 = PerDir {
        x: nonneg(r.infill_area_x_m2).unwrap_or(0.0),
        y: nonneg(r.infill_area_y_m2).unwrap_or(0.0),
    };

    let nu = axial_load_ratio(
        weight_kn,
        column_area_m2 + rc_wall_area_m2.x + rc_wall_area_m2.y,
        fc_mpa,
    );
    for w in &mut walls {
        w.nu = nu;
    }

    for d in Dir::BOTH {
        if column_area_m2 <= 0.0 && *rc_wall_area_m2.get(d) <= 0.0 {
            errors.push(format!(
                "direction {} has neither RC walls nor columns at the ground storey: no lateral structure to screen",
                d.code().to_uppercase()
            ));
        }
    }

    // Storey-by-storey areas for the soft/weak storey flags (method §10).
    let ground = StoreyAreas {
        height_m: heights_m.first().copied().unwrap_or(typical_h),
        column_m2: column_area_m2,
        rc_wall_m2: rc_wall_area_m2,
        infill_m2: infill_area_m2,
    };
    let listed_wall_area_at = |i: u32, d: Dir| -> f64 {
        listed
            .iter()
            .filter(|w| w.direction == Some(d))
            .filter(|w| w.start_storey.unwrap_or(1) <= i && w.end_storey.unwrap_or(n) >= i)
            .map(|w| {
                w.length_m.max(0.0)
                    * positive(w.thickness_m)
                        .or(wall_tw)
                        .unwrap_or(settings.default_wall_thickness_m)
            })
            .fold(0.0, |a, b| a + b)
    };
    let (storeys, storey_source) = storey_data(
        input,
        n,
        &heights_m,
        ground,
        walls_listed,
        listed_wall_area_at,
    );

    if !errors.is_empty() {
        return Err(errors);
    }
    let Some(hazard) = hazard else {
        return Err(vec!["no hazard given".into()]);
    };
    Ok(Resolved {
        n,
        heights_m,
        z_m,
        height_m,
        plan_area_m2,
        floor_area_m2,
        column_area_m2,
        column_depth_m,
        rc_wall_area_m2,
        infill_area_m2,
        fc_mpa,
        fy_mpa,
        floor_weight_kpa,
        weight_kn,
        use_,
        gamma_i: settings.gamma_i(use_),
        hazard,
        boundary_elements,
        columns_detailed,
        walls,
        walls_listed,
        walls_above_ground,
        storeys,
        storey_source,
        period_input_s: PerDir {
            x: positive(r.period_x_s),
            y: positive(r.period_y_s),
        },
        defaults_used: defaults,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn boundary_rule_of_method_section_0() {
        assert!(boundary_present(Some(YesNo::Yes), None, None));
        assert!(!boundary_present(Some(YesNo::No), Some(2020), Some(2000)));
        assert!(!boundary_present(Some(YesNo::Unknown), Some(2020), None));
        assert!(!boundary_present(None, None, Some(2000)));
        assert!(boundary_present(
            Some(YesNo::Unknown),
            Some(2000),
            Some(2000)
        ));
        assert!(!boundary_present(
            Some(YesNo::Unknown),
            Some(1999),
            Some(2000)
        ));
        assert!(columns_detailed(Some(2001), Some(2000)));
        assert!(!columns_detailed(Some(1999), Some(2000)));
        assert!(!columns_detailed(None, Some(2000)));
    }

    #[test]
    fn axial_ratio_guarded() {
        assert!((axial_load_ratio(1000.0, 1.0, 20.0) - 0.05).abs() < 1e-12);
        assert_eq!(axial_load_ratio(1000.0, 0.0, 20.0), 0.0);
    }

    mod storey_data_precedence {
        //! Method §10 storey-data precedence, one test per case (hand-set areas; the
        //! thresholds are ASCE 7-16 Table 12.3-2 types 1a/5a as in the settings).
        use super::super::*;
        use crate::model::{BuildingRecord, StoreyRecord, WallRecord};

        fn rec(n: u32) -> BuildingRecord {
            BuildingRecord {
                row: 2,
                id: "S".into(),
                storeys: n,
                storey_height_m: Some(3.0),
                ground_storey_height_m: Some(3.0),
                plan_area_m2: 200.0,
                column_area_m2: 4.0,
                rc_wall_area_x_m2: Some(2.0),
                rc_wall_area_y_m2: Some(1.0),
                infill_area_x_m2: Some(10.0),
                infill_area_y_m2: Some(6.0),
                agr_g: Some(0.2),
                ..Default::default()
            }
        }

        fn input<'a>(
            r: &'a BuildingRecord,
            walls: &'a [WallRecord],
            storeys: &'a [StoreyRecord],
        ) -> BuildingInput<'a> {
            BuildingInput {
                record: r,
                walls: walls.iter().collect(),
                storeys: storeys.iter().collect(),
                footprint: vec![],
                site: None,
            }
        }

        fn storey(i: u32, col: Option<f64>, wx: Option<f64>) -> StoreyRecord {
            StoreyRecord {
                row: i as usize + 1,
                building_id: "S".into(),
                storey: i,
                height_m: Some(3.0),
                column_area_m2: col,
                rc_wall_area_x_m2: wx,
                ..Default::default()
            }
        }

        fn wall(id: &str, lw: f64, start: Option<u32>, end: Option<u32>) -> WallRecord {
            WallRecord {
                row: 2,
                building_id: "S".into(),
                wall_id: id.into(),
                direction: Some(Dir::X),
                length_m: lw,
                thickness_m: Some(0.25),
                start_storey: start,
                end_storey: end,
                ..Default::default()
            }
        }

        #[test]
        fn case_1_storeys_sheet_rows_2_to_4_while_rows_exist() {
            let r = rec(6);
            // Rows 2, 3 and 5: storey 4 has no row, so storeys 1–3 are used.
            let st = [
                storey(2, Some(5.0), None),
                storey(3, None, Some(3.0)),
                storey(5, Some(1.0), None),
            ];
            let res = resolve(&input(&r, &[], &st), &Settings::default()).unwrap();
            assert_eq!(res.storey_source, StoreySource::Sheet);
            assert_eq!(res.storeys.len(), 3);
            // Storey 1 is the buildings row.
            assert_eq!(res.storeys[0].column_m2, 4.0);
            assert_eq!(res.storeys[1].column_m2, 5.0);
            // Blank cells take the storey below's value.
            assert_eq!(res.storeys[1].rc_wall_m2.x, 2.0);
            assert_eq!(res.storeys[2].column_m2, 5.0);
            assert_eq!(res.storeys[2].rc_wall_m2.x, 3.0);
            assert_eq!(res.storeys[2].infill_m2.x, 10.0);
            // Rows 2, 3, 4 (and more): at most storeys 1–4 (the mean test).
            let st: Vec<StoreyRecord> = (2..=6).map(|i| storey(i, None, None)).collect();
            let res = resolve(&input(&r, &[], &st), &Settings::default()).unwrap();
            assert_eq!(res.storeys.len(), 4);
            // A row for storey 1 only is not storey data (falls through to case 3).
            let st = [storey(1, Some(9.0), None)];
            let res = resolve(&input(&r, &[], &st), &Settings::default()).unwrap();
            assert_eq!(
                res.storey_source,
                StoreySource::Derived { walls_sheet: false }
            );
            assert_eq!(res.storeys[0].column_m2, 4.0);
        }

        #[test]
        fn case_2_upper_cells_blanks_take_the_ground_values() {
            let mut r = rec(4);
            r.upper_column_area_m2 = Some(6.0);
            r.storey_height_m = Some(2.8);
            let w = [wall("W1", 4.0, None, None), wall("W2", 6.0, Some(2), None)];
            let res = resolve(&input(&r, &w, &[]), &Settings::default()).unwrap();
            assert_eq!(res.storey_source, StoreySource::Upper);
            assert_eq!(res.storeys.len(), 2);
            assert_eq!(res.storeys[1].column_m2, 6.0);
            // Blank upper wall cell: the ground storey's value (listed ground walls 1.0 m²),
            // not the walls standing in storey 2.
            assert_eq!(res.storeys[1].rc_wall_m2.x, 1.0);
            assert_eq!(res.storeys[1].infill_m2.y, 6.0);
            assert_eq!(res.storeys[1].height_m, 2.8);
        }

        #[test]
        fn case_3_walls_sheet_and_storey_heights() {
            let r = rec(4);
            // W1 stands in storey 1 only; W2 starts at storey 2; W3 in all storeys.
            let w = [
                wall("W1", 4.0, Some(1), Some(1)),
                wall("W2", 6.0, Some(2), None),
                wall("W3", 2.0, None, None),
            ];
            let res = resolve(&input(&r, &w, &[]), &Settings::default()).unwrap();
            assert_eq!(
                res.storey_source,
                StoreySource::Derived { walls_sheet: true }
            );
            assert_eq!(res.storeys[0].rc_wall_m2.x, (4.0 + 2.0) * 0.25);
            assert_eq!(res.storeys[1].rc_wall_m2.x, (6.0 + 2.0) * 0.25);
            assert_eq!(res.storeys[1].column_m2, 4.0);
            assert_eq!(res.storeys[1].infill_m2, res.storeys[0].infill_m2);
            // The flag says which data it used.
            let b =
                crate::engine::screen_building(&input(&r, &w, &[]), &Settings::default()).unwrap();
            let f = b
                .flags
                .iter()
                .find(|f| f.code == "weak-storey" || f.code.starts_with("soft-storey"));
            // Storey 2 X: walls 2.0 m² vs 1.5 m² at the ground: k1/k2 =
            // (1.5 + 1 + 2)/(2 + 1 + 2) = 0.9 (no soft flag); strength S1/S2 =
            // (2 + 2·1.5 + 0.7·4)/(2 + 2·2 + 0.7·4) = 7.8/8.8 = 0.886 (no weak flag).
            assert!(f.is_none(), "{f:?}");
        }

        #[test]
        fn case_3_without_walls_sheet_a_tall_ground_storey_is_found() {
            let mut r = rec(5);
            r.ground_storey_height_m = Some(4.5);
            let res = resolve(&input(&r, &[], &[]), &Settings::default()).unwrap();
            assert_eq!(
                res.storey_source,
                StoreySource::Derived { walls_sheet: false }
            );
            assert_eq!(res.storeys[1].height_m, 3.0);
            assert_eq!(res.storeys[1].rc_wall_m2, res.storeys[0].rc_wall_m2);
            // Equal areas: k1/k2 = h2/h1 = 3/4.5 = 0.667 < 0.70 → soft (not < 0.60).
            let b =
                crate::engine::screen_building(&input(&r, &[], &[]), &Settings::default()).unwrap();
            let f = b
                .flags
                .iter()
                .find(|f| f.code == "soft-storey" && f.direction == Some(Dir::X))
                .unwrap();
            assert!(f.detail.contains("k1/k2 = 0.667"), "{}", f.detail);
            assert!(
                f.detail.contains("data from the storey heights"),
                "{}",
                f.detail
            );
        }

        #[test]
        fn case_3_walls_starting_above_the_ground_make_a_weak_soft_storey() {
            let mut r = rec(4);
            r.infill_area_x_m2 = Some(0.0);
            let w = [wall("W2", 8.0, Some(2), None)];
            let b =
                crate::engine::screen_building(&input(&r, &w, &[]), &Settings::default()).unwrap();
            // Storey 2 X: 2 m² of wall, none at the ground: k1/k2 = 2/(2 + 2) = 0.5 < 0.6.
            let f = b
                .flags
                .iter()
                .find(|f| f.code == "soft-storey-extreme" && f.direction == Some(Dir::X))
                .unwrap();
            assert!(
                f.detail
                    .contains("data from the walls sheet and storey heights"),
                "{}",
                f.detail
            );
            // S1/S2 = 4/(2·2 + 0.7·4) = 4/6.8 = 0.588 < 0.80 → weak.
            assert!(b.flags.iter().any(|f| {
                f.code == "weak-storey"
                    && f.detail
                        .contains("data from the walls sheet and storey heights")
            }));
        }

        #[test]
        fn one_storey_no_check() {
            let r = rec(1);
            let res = resolve(&input(&r, &[], &[]), &Settings::default()).unwrap();
            assert_eq!(res.storey_source, StoreySource::None);
            assert_eq!(res.storeys.len(), 1);
        }
    }
}
