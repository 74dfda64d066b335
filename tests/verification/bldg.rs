//! Test support: hand-made buildings for the engine verification tests (invented data).

#![allow(dead_code)]

use seistriage::engine::{BuildingInput, NewWalls, screen_building, screen_building_with};
use seistriage::model::{
    BuildingRecord, FootprintVertex, GroundType, SiteInfo, StoreyRecord, Use, WallRecord, YesNo,
};
use seistriage::results::BuildingResult;
use seistriage::settings::Settings;

/// A 4-storey, 3 m storey, 200 m² plan building with every input given (no defaults):
/// columns 2 m², RC walls 4 m² along X only (lw 4 m, tw 0.25 m), infill 8 m² each way,
/// fc 20 MPa, fy 420 MPa, w 12 kPa, ground C, agR 0.3 g, no boundary elements.
pub fn record(id: &str) -> BuildingRecord {
    BuildingRecord {
        row: 2,
        id: id.into(),
        name: format!("Invented block {id}"),
        use_: Some(Use::Residential),
        year_built: Some(1980),
        storeys: 4,
        storey_height_m: Some(3.0),
        ground_storey_height_m: Some(3.0),
        plan_area_m2: 200.0,
        column_area_m2: 2.0,
        column_depth_m: Some(0.4),
        rc_wall_area_x_m2: Some(4.0),
        rc_wall_area_y_m2: Some(0.0),
        wall_length_x_m: Some(4.0),
        wall_length_y_m: Some(4.0),
        wall_thickness_m: Some(0.25),
        infill_area_x_m2: Some(8.0),
        infill_area_y_m2: Some(8.0),
        boundary_elements: Some(YesNo::No),
        short_columns: Some(YesNo::No),
        fc_mpa: Some(20.0),
        fy_mpa: Some(420.0),
        floor_weight_kpa: Some(12.0),
        ground_type: Some(GroundType::C),
        agr_g: Some(0.3),
        ..Default::default()
    }
}

/// A building with its optional tables.
#[derive(Debug, Clone, Default)]
pub struct Case {
    pub rec: BuildingRecord,
    pub walls: Vec<WallRecord>,
    pub storeys: Vec<StoreyRecord>,
    pub footprint: Vec<FootprintVertex>,
    pub site: Option<SiteInfo>,
}

impl Case {
    pub fn new(rec: BuildingRecord) -> Self {
        Case {
            rec,
            ..Default::default()
        }
    }
    pub fn input(&self) -> BuildingInput<'_> {
        BuildingInput {
            record: &self.rec,
            walls: self.walls.iter().collect(),
            storeys: self.storeys.iter().collect(),
            footprint: self.footprint.iter().collect(),
            site: self.site.as_ref(),
        }
    }
    pub fn screen(&self, s: &Settings) -> BuildingResult {
        screen_building(&self.input(), s).expect("screened")
    }
    pub fn try_screen(&self, s: &Settings) -> Result<BuildingResult, Vec<String>> {
        screen_building(&self.input(), s)
    }
    pub fn with(&self, s: &Settings, x: f64, y: f64) -> BuildingResult {
        let mut nw = NewWalls::default();
        nw.area_m2.x = x;
        nw.area_m2.y = y;
        screen_building_with(&self.input(), s, &nw).expect("screened")
    }
}

/// A listed wall.
pub fn wall(id: &str, dir: seistriage::model::Dir, lw: f64, x: f64, y: f64) -> WallRecord {
    WallRecord {
        row: 2,
        building_id: "B".into(),
        wall_id: id.into(),
        direction: Some(dir),
        length_m: lw,
        thickness_m: Some(0.25),
        x_m: Some(x),
        y_m: Some(y),
        boundary_elements: Some(YesNo::No),
        ..Default::default()
    }
}

/// A storeys-sheet row.
pub fn storey(i: u32, h: f64, col: f64, wx: f64, wy: f64, mx: f64, my: f64) -> StoreyRecord {
    StoreyRecord {
        row: 1 + i as usize,
        building_id: "B".into(),
        storey: i,
        height_m: Some(h),
        column_area_m2: Some(col),
        rc_wall_area_x_m2: Some(wx),
        rc_wall_area_y_m2: Some(wy),
        infill_area_x_m2: Some(mx),
        infill_area_y_m2: Some(my),
    }
}

/// Flag codes of a result in one direction (None = building-wide).
pub fn has_flag(r: &BuildingResult, code: &str, dir: Option<seistriage::model::Dir>) -> bool {
    r.flags.iter().any(|f| f.code == code && f.direction == dir)
}
