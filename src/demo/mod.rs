/*!
The bundled invented demo inventory and the generator of invented inventories of any size.

- `inventories/demo.xlsx`, `demo-districts.geojson`, `demo-faults.geojson` are made by
  [`demo_workbook`], [`demo_districts_geojson`] and [`demo_faults_geojson`] from a fixed
  seed and committed; `inventories/demo-settings.toml` is written by hand. All four are
  embedded in the binary, so `seistriage demo` works from any folder. A test regenerates
  them and checks the committed files still match (set `SEISTRIAGE_BLESS=1` when
  running that test to rewrite them after a deliberate change).
- The demo is an invented town (Karsavel, four districts, two fault traces; see
  [`invent`]) of 64 buildings — schools and apartment blocks from the 1960s to the 2010s,
  some with walls listed one by one with plan positions and footprints, some with storey
  data (a few soft ground storeys) — plus a few deliberately faulty rows so that the
  problem report shows: text in a numeric cell, 2.5 storeys, a duplicated id, a negative
  column area and a blank row.
- [`write_generated`] writes `n` invented buildings (buildings sheet only, all valid) as
  CSV (streamed row by row) or .xlsx (constant-memory worksheet), for benchmarks.
*/

pub mod invent;

use std::io::Write;
use std::path::{Path, PathBuf};

use rust_xlsxwriter::{DocProperties, ExcelDateTime, Format, Workbook, Worksheet};

use crate::model::{BuildingRecord, FootprintVertex, StoreyRecord, WallRecord, YesNo};
use invent::{BuildingType, DISTRICTS, Dice, FAULTS, Layout};

/// Failures while writing demo files.
#[derive(Debug, thiserror::Error)]
pub enum DemoError {
    /// File system error.
    #[error("{0}")]
    Io(#[from] std::io::Error),
    /// Workbook writer error.
    #[error("workbook: {0}")]
    Xlsx(#[from] rust_xlsxwriter::XlsxError),
    /// CSV writer error.
    #[error("csv: {0}")]
    Csv(#[from] csv::Error),
    /// Output file type not supported.
    #[error("{0}: the output must end in .csv or .xlsx")]
    Extension(String),
}

/// The demo files written by [`write_demo_files`].
#[derive(Debug, Clone)]
pub struct DemoFiles {
    /// Inventory workbook.
    pub inventory: PathBuf,
    /// District polygons, if bundled.
    pub districts: Option<PathBuf>,
    /// Fault traces, if bundled.
    pub faults: Option<PathBuf>,
    /// Settings file, if bundled.
    pub settings: Option<PathBuf>,
}

/// File names of the bundled demo, as committed under `inventories/`.
pub const INVENTORY_FILE: &str = "demo.xlsx";
/// District polygons file name.
pub const DISTRICTS_FILE: &str = "demo-districts.geojson";
/// Fault traces file name.
pub const FAULTS_FILE: &str = "demo-faults.geojson";
/// Settings file name.
pub const SETTINGS_FILE: &str = "demo-settings.toml";

/// The committed demo workbook.
pub static BUNDLED_INVENTORY: &[u8] = include_bytes!("../../inventories/demo.xlsx");
/// The committed demo districts.
pub static BUNDLED_DISTRICTS: &[u8] = include_bytes!("../../inventories/demo-districts.geojson");
/// The committed demo fault traces.
pub static BUNDLED_FAULTS: &[u8] = include_bytes!("../../inventories/demo-faults.geojson");
/// The committed demo settings.
pub static BUNDLED_SETTINGS: &[u8] = include_bytes!("../../inventories/demo-settings.toml");

/// Seed of the demo town (any fixed number; changing it changes every invented value).
pub const DEMO_SEED: u64 = 20_261_201;

/// Copies the bundled demo inventory (and geography, settings) into `dir`.
pub fn write_demo_files(dir: &Path) -> Result<DemoFiles, DemoError> {
    std::fs::create_dir_all(dir)?;
    let write = |name: &str, bytes: &[u8]| -> Result<PathBuf, DemoError> {
        let path = dir.join(name);
        std::fs::write(&path, bytes)?;
        Ok(path)
    };
    Ok(DemoFiles {
        inventory: write(INVENTORY_FILE, BUNDLED_INVENTORY)?,
        districts: Some(write(DISTRICTS_FILE, BUNDLED_DISTRICTS)?),
        faults: Some(write(FAULTS_FILE, BUNDLED_FAULTS)?),
        settings: Some(write(SETTINGS_FILE, BUNDLED_SETTINGS)?),
    })
}

/// Canonical columns of the `buildings` sheet (inventory.md), in the template's order.
pub const BUILDING_COLUMNS: [&str; 39] = [
    "id",
    "name",
    "use",
    "year_built",
    "latitude",
    "longitude",
    "district",
    "storeys",
    "storey_height_m",
    "ground_storey_height_m",
    "plan_area_m2",
    "plan_length_x_m",
    "plan_length_y_m",
    "column_area_m2",
    "column_depth_m",
    "rc_wall_area_x_m2",
    "rc_wall_area_y_m2",
    "wall_length_x_m",
    "wall_length_y_m",
    "wall_thickness_m",
    "infill_area_x_m2",
    "infill_area_y_m2",
    "upper_rc_wall_area_x_m2",
    "upper_rc_wall_area_y_m2",
    "upper_infill_area_x_m2",
    "upper_infill_area_y_m2",
    "upper_column_area_m2",
    "boundary_elements",
    "short_columns",
    "fc_mpa",
    "fy_mpa",
    "floor_weight_kpa",
    "occupants",
    "ground_type",
    "agr_g",
    "sds_g",
    "sd1_g",
    "period_x_s",
    "period_y_s",
];

/// Canonical columns of the `walls` sheet.
pub const WALL_COLUMNS: [&str; 13] = [
    "building_id",
    "wall_id",
    "direction",
    "length_m",
    "thickness_m",
    "x_m",
    "y_m",
    "boundary_elements",
    "boundary_steel_pct",
    "web_steel_pct",
    "bar_diameter_mm",
    "start_storey",
    "end_storey",
];

/// Canonical columns of the `storeys` sheet.
pub const STOREY_COLUMNS: [&str; 8] = [
    "building_id",
    "storey",
    "height_m",
    "column_area_m2",
    "rc_wall_area_x_m2",
    "rc_wall_area_y_m2",
    "infill_area_x_m2",
    "infill_area_y_m2",
];

/// Canonical columns of the `footprints` sheet.
pub const FOOTPRINT_COLUMNS: [&str; 4] = ["building_id", "vertex", "x_m", "y_m"];

/// One spreadsheet cell of an invented table.
#[derive(Debug, Clone, PartialEq)]
pub enum Cell {
    /// Text.
    Text(String),
    /// Number.
    Number(f64),
    /// Empty.
    Blank,
}

fn num(v: Option<f64>) -> Cell {
    v.map_or(Cell::Blank, Cell::Number)
}

fn text(s: &str) -> Cell {
    Cell::Text(s.to_string())
}

fn yes_no(v: Option<YesNo>) -> Cell {
    match v {
        Some(YesNo::Yes) => text("yes"),
        Some(YesNo::No) => text("no"),
        Some(YesNo::Unknown) => text("unknown"),
        None => Cell::Blank,
    }
}

/// A building record as (column, cell) pairs in [`BUILDING_COLUMNS`] order.
pub fn building_pairs(b: &BuildingRecord) -> [(&'static str, Cell); 39] {
    [
        ("id", text(&b.id)),
        ("name", text(&b.name)),
        ("use", b.use_.map_or(Cell::Blank, |u| text(u.code()))),
        ("year_built", num(b.year_built.map(f64::from))),
        ("latitude", num(b.latitude)),
        ("longitude", num(b.longitude)),
        ("district", b.district.as_deref().map_or(Cell::Blank, text)),
        ("storeys", Cell::Number(f64::from(b.storeys))),
        ("storey_height_m", num(b.storey_height_m)),
        ("ground_storey_height_m", num(b.ground_storey_height_m)),
        ("plan_area_m2", Cell::Number(b.plan_area_m2)),
        ("plan_length_x_m", num(b.plan_length_x_m)),
        ("plan_length_y_m", num(b.plan_length_y_m)),
        ("column_area_m2", Cell::Number(b.column_area_m2)),
        ("column_depth_m", num(b.column_depth_m)),
        ("rc_wall_area_x_m2", num(b.rc_wall_area_x_m2)),
        ("rc_wall_area_y_m2", num(b.rc_wall_area_y_m2)),
        ("wall_length_x_m", num(b.wall_length_x_m)),
        ("wall_length_y_m", num(b.wall_length_y_m)),
        ("wall_thickness_m", num(b.wall_thickness_m)),
        ("infill_area_x_m2", num(b.infill_area_x_m2)),
        ("infill_area_y_m2", num(b.infill_area_y_m2)),
        ("upper_rc_wall_area_x_m2", num(b.upper_rc_wall_area_x_m2)),
        ("upper_rc_wall_area_y_m2", num(b.upper_rc_wall_area_y_m2)),
        ("upper_infill_area_x_m2", num(b.upper_infill_area_x_m2)),
        ("upper_infill_area_y_m2", num(b.upper_infill_area_y_m2)),
        ("upper_column_area_m2", num(b.upper_column_area_m2)),
        ("boundary_elements", yes_no(b.boundary_elements)),
        ("short_columns", yes_no(b.short_columns)),
        ("fc_mpa", num(b.fc_mpa)),
        ("fy_mpa", num(b.fy_mpa)),
        ("floor_weight_kpa", num(b.floor_weight_kpa)),
        ("occupants", num(b.occupants.map(|o| o as f64))),
        (
            "ground_type",
            b.ground_type
                .map_or(Cell::Blank, |g| Cell::Text(g.to_string())),
        ),
        ("agr_g", num(b.agr_g)),
        ("sds_g", num(b.sds_g)),
        ("sd1_g", num(b.sd1_g)),
        ("period_x_s", num(b.period_x_s)),
        ("period_y_s", num(b.period_y_s)),
    ]
}

fn building_cells(b: &BuildingRecord) -> Vec<Cell> {
    building_pairs(b).into_iter().map(|(_, c)| c).collect()
}

fn wall_cells(w: &WallRecord) -> Vec<Cell> {
    vec![
        text(&w.building_id),
        text(&w.wall_id),
        w.direction
            .map_or(Cell::Blank, |d| text(&d.code().to_uppercase())),
        Cell::Number(w.length_m),
        num(w.thickness_m),
        num(w.x_m),
        num(w.y_m),
        yes_no(w.boundary_elements),
        num(w.boundary_steel_pct),
        num(w.web_steel_pct),
        num(w.bar_diameter_mm),
        num(w.start_storey.map(f64::from)),
        num(w.end_storey.map(f64::from)),
    ]
}

fn storey_cells(s: &StoreyRecord) -> Vec<Cell> {
    vec![
        text(&s.building_id),
        Cell::Number(f64::from(s.storey)),
        num(s.height_m),
        num(s.column_area_m2),
        num(s.rc_wall_area_x_m2),
        num(s.rc_wall_area_y_m2),
        num(s.infill_area_x_m2),
        num(s.infill_area_y_m2),
    ]
}

fn footprint_cells(v: &FootprintVertex) -> Vec<Cell> {
    vec![
        text(&v.building_id),
        Cell::Number(v.vertex),
        Cell::Number(v.x_m),
        Cell::Number(v.y_m),
    ]
}

/// One sheet of invented data: name, header and rows (an empty row is a blank row).
#[derive(Debug, Clone, PartialEq)]
pub struct InventedSheet {
    /// Sheet name.
    pub sheet: &'static str,
    /// Header (canonical column names).
    pub columns: &'static [&'static str],
    /// Rows of cells, in column order.
    pub rows: Vec<Vec<Cell>>,
}

/// What a demo building is used to show.
#[derive(Debug, Clone, Copy, PartialEq)]
enum Role {
    Plain,
    Walls(Layout, bool),
    Storeys(bool),
    SoftUpper,
    TextArea,
    HalfStorey,
    NegativeColumn,
    DuplicateFirst,
    DuplicateSecond,
    RowHazard,
    AnalysedPeriod,
}

/// The demo town's buildings: kind, year and role (before the deterministic shuffle).
fn demo_plan() -> Vec<(BuildingType, i32, Role)> {
    let mut plan = Vec::new();
    let school_years = [
        1962, 1968, 1971, 1975, 1979, 1983, 1988, 1993, 1997, 2001, 2005, 2009, 2013, 2016,
    ];
    for y in school_years {
        let role = match y {
            1971 => Role::Walls(Layout::Eccentric, true),
            1993 => Role::Walls(Layout::Balanced, true),
            2009 => Role::Walls(Layout::Balanced, false),
            _ => Role::Plain,
        };
        plan.push((BuildingType::School, y, role));
    }
    for k in 0..46_i32 {
        let year = 1960 + k * 59 / 45;
        let role = match k {
            2 => Role::Walls(Layout::Eccentric, true),
            12 => Role::Walls(Layout::Discontinued, true),
            28 => Role::Walls(Layout::Balanced, false),
            36 => Role::Walls(Layout::Discontinued, false),
            42 => Role::Walls(Layout::Balanced, true),
            5 | 20 => Role::Storeys(true),
            31 | 44 => Role::Storeys(false),
            8 | 15 | 24 | 33 => Role::SoftUpper,
            10 => Role::TextArea,
            18 => Role::HalfStorey,
            26 => Role::NegativeColumn,
            22 => Role::DuplicateFirst,
            39 => Role::DuplicateSecond,
            30 => Role::RowHazard,
            40 => Role::AnalysedPeriod,
            _ => Role::Plain,
        };
        plan.push((BuildingType::Apartments, year, role));
    }
    plan.push((BuildingType::Health, 1985, Role::Plain));
    plan.push((BuildingType::Office, 1978, Role::Plain));
    plan.push((BuildingType::Office, 2004, Role::Plain));
    plan.push((BuildingType::Hall, 1966, Role::Plain));
    plan
}

/// Row (0-based among data rows) after which the deliberate blank row is left.
const BLANK_AFTER: usize = 30;

/// The demo inventory's four sheets, as cells.
pub fn demo_tables() -> [InventedSheet; 4] {
    let mut dice = Dice::new(DEMO_SEED);
    let polygons = invent::district_polygons();
    let mut plan = demo_plan();
    // Deterministic Fisher–Yates shuffle so kinds, eras and roles mix along the sheet.
    for i in (1..plan.len()).rev() {
        let j = usize::try_from(dice.int(0, i as i64)).unwrap_or(0);
        plan.swap(i, j);
    }
    let mut buildings = Vec::new();
    let mut walls = Vec::new();
    let mut storeys = Vec::new();
    let mut footprints = Vec::new();
    let mut duplicate_id = String::new();
    let mut pending_duplicate: Option<usize> = None;
    let mut counters = [0usize; 5];
    for (i, (kind, year, role)) in plan.into_iter().enumerate() {
        let (d, lat, lon) = invent::invented_site(&mut dice, &polygons);
        let district = DISTRICTS.get(d).map_or("Karsavel", |x| x.name);
        let slot = match kind {
            BuildingType::Apartments => 0,
            BuildingType::School => 1,
            BuildingType::Health => 2,
            BuildingType::Office => 3,
            BuildingType::Hall => 4,
        };
        if let Some(c) = counters.get_mut(slot) {
            *c += 1;
        }
        let k = counters.get(slot).copied().unwrap_or(1);
        let id = format!("KV-{:03}", i + 1);
        let name = invent::invented_name(kind, district, k);
        let mut b = invent::invent_building(&mut dice, id, name, kind, year, (lat, lon));
        if i % 5 == 0 {
            b.district = Some(district.to_string());
        }
        let mut cells_fix: Option<(&str, Cell)> = None;
        match role {
            Role::Plain => {}
            Role::Walls(layout, with_footprint) => {
                let cut = if with_footprint {
                    let (vertices, cut) = invent::l_footprint(&mut dice, &mut b);
                    footprints.extend(vertices);
                    Some(cut)
                } else {
                    None
                };
                walls.extend(invent::invent_walls(&mut dice, &mut b, layout, cut));
            }
            Role::Storeys(soft) => {
                let rows = invent::invent_storeys(&mut dice, &b, soft);
                // The row's ground-storey values agree with storey 1 of the storeys sheet.
                if let Some(ground) = rows.first() {
                    if soft {
                        b.ground_storey_height_m = ground.height_m;
                    }
                    b.infill_area_x_m2 = ground.infill_area_x_m2;
                    b.infill_area_y_m2 = ground.infill_area_y_m2;
                }
                storeys.extend(rows);
            }
            Role::SoftUpper => invent::make_soft_ground_storey(&mut dice, &mut b),
            Role::TextArea => cells_fix = Some(("plan_area_m2", text("approx. 420"))),
            Role::HalfStorey => cells_fix = Some(("storeys", Cell::Number(2.5))),
            Role::NegativeColumn => cells_fix = Some(("column_area_m2", Cell::Number(-2.4))),
            Role::DuplicateFirst => duplicate_id = b.id.clone(),
            Role::DuplicateSecond => pending_duplicate = Some(buildings.len()),
            Role::RowHazard => b.ground_type = Some(crate::model::GroundType::B),
            Role::AnalysedPeriod => {
                b.period_x_s = Some(0.52);
                b.period_y_s = Some(0.47);
            }
        }
        let mut cells = building_cells(&b);
        if let Some((col, cell)) = cells_fix
            && let Some(pos) = BUILDING_COLUMNS.iter().position(|c| *c == col)
            && let Some(slot) = cells.get_mut(pos)
        {
            *slot = cell;
        }
        buildings.push(cells);
    }
    // The duplicate: the second building carries the first one's id (whichever comes first
    // in the sheet, both rows end up with the same id).
    if let Some(row) = pending_duplicate
        && !duplicate_id.is_empty()
        && let Some(cell) = buildings.get_mut(row).and_then(|r| r.first_mut())
    {
        *cell = Cell::Text(duplicate_id);
    }
    if BLANK_AFTER <= buildings.len() {
        buildings.insert(BLANK_AFTER, Vec::new());
    }
    [
        InventedSheet {
            sheet: "buildings",
            columns: &BUILDING_COLUMNS,
            rows: buildings,
        },
        InventedSheet {
            sheet: "walls",
            columns: &WALL_COLUMNS,
            rows: walls.iter().map(wall_cells).collect(),
        },
        InventedSheet {
            sheet: "storeys",
            columns: &STOREY_COLUMNS,
            rows: storeys.iter().map(storey_cells).collect(),
        },
        InventedSheet {
            sheet: "footprints",
            columns: &FOOTPRINT_COLUMNS,
            rows: footprints.iter().map(footprint_cells).collect(),
        },
    ]
}

/// Pinned document properties: the same bytes of metadata on every run.
fn pinned_properties(title: &str) -> Result<DocProperties, DemoError> {
    Ok(DocProperties::new()
        .set_title(title)
        .set_author("seistriage")
        .set_comment("Invented data: no real place, building or person.")
        .set_creation_datetime(&ExcelDateTime::from_ymd(2026, 1, 1)?))
}

fn write_cell(ws: &mut Worksheet, row: u32, col: u16, cell: &Cell) -> Result<(), DemoError> {
    match cell {
        Cell::Text(s) => {
            ws.write_string(row, col, s)?;
        }
        Cell::Number(v) => {
            ws.write_number(row, col, *v)?;
        }
        Cell::Blank => {}
    }
    Ok(())
}

fn write_table(
    ws: &mut Worksheet,
    table: &InventedSheet,
    header: &Format,
) -> Result<(), DemoError> {
    ws.set_name(table.sheet)?;
    for (c, name) in table.columns.iter().enumerate() {
        let c = u16::try_from(c).unwrap_or(u16::MAX);
        ws.write_string_with_format(0, c, *name, header)?;
        let width = (name.len() as f64 + 2.0).max(10.0);
        ws.set_column_width(c, width)?;
    }
    ws.set_freeze_panes(1, 0)?;
    for (r, row) in table.rows.iter().enumerate() {
        let r = u32::try_from(r + 1).unwrap_or(u32::MAX);
        for (c, cell) in row.iter().enumerate() {
            write_cell(ws, r, u16::try_from(c).unwrap_or(u16::MAX), cell)?;
        }
    }
    Ok(())
}

/// The demo workbook, generated from [`demo_tables`] with pinned document properties.
pub fn demo_workbook() -> Result<Vec<u8>, DemoError> {
    let mut wb = Workbook::new();
    wb.set_properties(&pinned_properties(
        "seistriage demo inventory: the invented town of Karsavel",
    )?);
    let header = Format::new().set_bold();
    for table in demo_tables() {
        let ws = wb.add_worksheet();
        write_table(ws, &table, &header)?;
    }
    let (eras, settings) = demo_settings_tables()?;
    for table in [eras, settings] {
        let ws = wb.add_worksheet();
        write_table(ws, &table, &header)?;
    }
    Ok(wb.save_to_buffer()?)
}

/// Columns of the demo's `eras` sheet (inventory.md).
const ERA_COLUMNS: [&str; 4] = ["from_year", "to_year", "fc_mpa", "fy_mpa"];
/// Columns of the demo's `settings` sheet.
const SETTINGS_COLUMNS: [&str; 2] = ["key", "value"];

/// The demo's `eras` and `settings` sheets, from the bundled settings file
/// (`inventories/demo-settings.toml`: its `[[era]]` rows and its scalar keys), so that
/// `seistriage screen inventories/demo.xlsx` needs no option to screen the demo.
pub fn demo_settings_tables() -> Result<(InventedSheet, InventedSheet), DemoError> {
    let text = String::from_utf8_lossy(BUNDLED_SETTINGS);
    let table: toml::Table = toml::from_str(&text)
        .map_err(|e| DemoError::Io(std::io::Error::other(format!("demo settings: {e}"))))?;
    let value_cell = |v: &toml::Value| match v {
        toml::Value::String(s) => Cell::Text(s.clone()),
        toml::Value::Integer(i) => Cell::Number(*i as f64),
        toml::Value::Float(f) => Cell::Number(*f),
        other => Cell::Text(other.to_string()),
    };
    let mut eras = Vec::new();
    let mut settings = Vec::new();
    for (key, value) in &table {
        if key == "era" {
            for era in value.as_array().into_iter().flatten() {
                let get = |k: &str| era.get(k).map_or(Cell::Blank, value_cell);
                eras.push(ERA_COLUMNS.iter().map(|k| get(k)).collect());
            }
        } else {
            settings.push(vec![Cell::Text(key.clone()), value_cell(value)]);
        }
    }
    Ok((
        InventedSheet {
            sheet: "eras",
            columns: &ERA_COLUMNS,
            rows: eras,
        },
        InventedSheet {
            sheet: "settings",
            columns: &SETTINGS_COLUMNS,
            rows: settings,
        },
    ))
}

fn ring_json(ring: &[(f64, f64)]) -> serde_json::Value {
    serde_json::Value::Array(
        ring.iter()
            .map(|&(x, y)| serde_json::json!([x, y]))
            .collect(),
    )
}

/// The demo district polygons as GeoJSON text.
pub fn demo_districts_geojson() -> String {
    let features: Vec<_> = DISTRICTS
        .iter()
        .map(|d| {
            let mut rings = vec![ring_json(d.ring)];
            rings.extend(d.holes.iter().map(|h| ring_json(h)));
            let mut props = serde_json::Map::new();
            props.insert("name".into(), d.name.into());
            if let Some(a) = d.agr_g {
                props.insert("agr_g".into(), a.into());
            }
            if let Some(g) = d.ground_type {
                props.insert("ground_type".into(), g.into());
            }
            serde_json::json!({
                "type": "Feature",
                "properties": props,
                "geometry": {"type": "Polygon", "coordinates": rings},
            })
        })
        .collect();
    let doc = serde_json::json!({
        "type": "FeatureCollection",
        "name": "Karsavel districts (invented)",
        "features": features,
    });
    format!(
        "{}\n",
        serde_json::to_string_pretty(&doc).unwrap_or_default()
    )
}

/// The demo fault traces as GeoJSON text.
pub fn demo_faults_geojson() -> String {
    let features: Vec<_> = FAULTS
        .iter()
        .map(|f| {
            serde_json::json!({
                "type": "Feature",
                "properties": {"name": f.name, "mw": f.mw},
                "geometry": {"type": "LineString", "coordinates": ring_json(f.trace)},
            })
        })
        .collect();
    let doc = serde_json::json!({
        "type": "FeatureCollection",
        "name": "Karsavel fault traces (invented)",
        "features": features,
    });
    format!(
        "{}\n",
        serde_json::to_string_pretty(&doc).unwrap_or_default()
    )
}

/// The `n`-th invented building of a generated inventory (pure in `dice`).
fn generated_building(dice: &mut Dice, polygons: &[geo::Polygon<f64>], i: usize) -> BuildingRecord {
    let (d, lat, lon) = invent::invented_site(dice, polygons);
    let district = DISTRICTS.get(d).map_or("Karsavel", |x| x.name);
    let kind = match dice.int(0, 99) {
        0..=17 => BuildingType::School,
        18..=19 => BuildingType::Office,
        20 => BuildingType::Health,
        21 => BuildingType::Hall,
        _ => BuildingType::Apartments,
    };
    let year = i32::try_from(dice.int(1955, 2020)).unwrap_or(1980);
    let id = format!("G{:07}", i + 1);
    let name = invent::invented_name(kind, district, i + 1);
    let mut b = invent::invent_building(dice, id, name, kind, year, (lat, lon));
    if kind == BuildingType::Apartments && dice.chance(0.1) {
        invent::make_soft_ground_storey(dice, &mut b);
    }
    b
}

/// Writes `path` through a temporary file beside it, renamed on success (an interrupted
/// run leaves no half-written file under the final name).
fn write_via_temp(
    path: &Path,
    fill: impl FnOnce(&Path) -> Result<(), DemoError>,
) -> Result<(), DemoError> {
    // Registered, so that an interrupt removes it too; dropped (removed) on failure.
    let tmp = crate::report::atomic::TempFile::register(path);
    fill(tmp.path())?;
    tmp.persist(path).map_err(DemoError::Io)
}

/// Writes `n` invented buildings to `out` (.csv or .xlsx), deterministic for a seed.
///
/// Buildings sheet only, every row valid, the canonical header; coordinates inside the
/// demo districts (use `inventories/demo-districts.geojson` and `demo-faults.geojson` to
/// exercise geography). CSV is streamed row by row and .xlsx uses a constant-memory
/// worksheet, so memory stays bounded for any `n`.
pub fn write_generated(n: usize, out: &Path, seed: u64) -> Result<(), DemoError> {
    let ext = out
        .extension()
        .map(|e| e.to_string_lossy().to_lowercase())
        .unwrap_or_default();
    let polygons = invent::district_polygons();
    let mut dice = Dice::new(seed);
    match ext.as_str() {
        "csv" => write_via_temp(out, |tmp| {
            let file = std::io::BufWriter::with_capacity(1 << 16, std::fs::File::create(tmp)?);
            let mut w = csv::Writer::from_writer(file);
            w.write_record(BUILDING_COLUMNS)?;
            let mut record: Vec<String> = Vec::with_capacity(BUILDING_COLUMNS.len());
            for i in 0..n {
                let b = generated_building(&mut dice, &polygons, i);
                record.clear();
                record.extend(building_pairs(&b).into_iter().map(|(_, c)| match c {
                    Cell::Text(s) => s,
                    Cell::Number(v) => format!("{v}"),
                    Cell::Blank => String::new(),
                }));
                w.write_record(&record)?;
            }
            let mut file = w.into_inner().map_err(|e| DemoError::Io(e.into_error()))?;
            file.flush()?;
            Ok(())
        }),
        "xlsx" => write_via_temp(out, |tmp| {
            let mut wb = Workbook::new();
            wb.set_properties(&pinned_properties(
                "seistriage generated inventory (invented)",
            )?);
            wb.use_zip_large_file(true);
            let header = Format::new().set_bold();
            let ws = wb.add_worksheet_with_constant_memory()?;
            ws.set_name("buildings")?;
            for (c, name) in BUILDING_COLUMNS.iter().enumerate() {
                ws.write_string_with_format(0, u16::try_from(c).unwrap_or(0), *name, &header)?;
            }
            for i in 0..n {
                let b = generated_building(&mut dice, &polygons, i);
                let r = u32::try_from(i + 1).unwrap_or(u32::MAX);
                for (c, (_, cell)) in building_pairs(&b).iter().enumerate() {
                    write_cell(ws, r, u16::try_from(c).unwrap_or(0), cell)?;
                }
            }
            wb.save(tmp)?;
            Ok(())
        }),
        _ => Err(DemoError::Extension(out.display().to_string())),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn building_pairs_follow_the_canonical_column_order() {
        let names: Vec<_> = building_pairs(&BuildingRecord::default())
            .iter()
            .map(|(k, _)| *k)
            .collect();
        assert_eq!(names, BUILDING_COLUMNS);
    }

    #[test]
    fn demo_has_50_to_80_buildings_a_blank_row_and_the_planted_faults() {
        let [buildings, walls, storeys, footprints] = demo_tables();
        let data: Vec<_> = buildings.rows.iter().filter(|r| !r.is_empty()).collect();
        assert!((50..=80).contains(&data.len()), "{}", data.len());
        assert_eq!(buildings.rows.len() - data.len(), 1, "one blank row");
        let col = |name: &str| BUILDING_COLUMNS.iter().position(|c| *c == name).unwrap();
        assert!(
            data.iter()
                .any(|r| matches!(&r[col("plan_area_m2")], Cell::Text(_)))
        );
        assert!(data.iter().any(|r| r[col("storeys")] == Cell::Number(2.5)));
        assert!(
            data.iter()
                .any(|r| r[col("column_area_m2")] == Cell::Number(-2.4))
        );
        let mut ids: Vec<_> = data.iter().map(|r| r[0].clone()).collect();
        let all = ids.len();
        ids.sort_by_key(|c| format!("{c:?}"));
        ids.dedup();
        assert_eq!(all - ids.len(), 1, "exactly one duplicated id");
        assert!(!walls.rows.is_empty() && !storeys.rows.is_empty() && !footprints.rows.is_empty());
    }

    #[test]
    fn demo_is_deterministic() {
        assert_eq!(demo_tables(), demo_tables());
        assert_eq!(demo_districts_geojson(), demo_districts_geojson());
    }
}
