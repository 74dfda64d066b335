//! The GeoJSON district and fault readers, then placing buildings with what was read (district
//! polygons, nearest fault trace, near-fault limits). The same text is given as the districts
//! file and as the faults file (polygons are districts, lines are fault traces).
#![no_main]

use std::sync::OnceLock;

use libfuzzer_sys::fuzz_target;
use seistriage::geography::{Geography, locate};
use seistriage::model::BuildingRecord;
use seistriage::settings::Settings;

fn buildings() -> &'static [BuildingRecord] {
    static B: OnceLock<Vec<BuildingRecord>> = OnceLock::new();
    B.get_or_init(|| {
        let points: [(Option<f64>, Option<f64>, Option<&str>); 9] = [
            (Some(35.01), Some(18.01), None),
            (Some(35.0), Some(18.0), None),
            (Some(0.0), Some(0.0), None),
            (Some(90.0), Some(0.0), None),
            (Some(-90.0), Some(180.0), None),
            (Some(10.0), Some(-180.0), None),
            (Some(-33.3), Some(179.999), Some("Harbour")),
            (None, None, Some("Old Town")),
            (None, None, None),
        ];
        points
            .iter()
            .enumerate()
            .map(|(i, (lat, lon, district))| BuildingRecord {
                row: i + 2,
                id: format!("B{i}"),
                latitude: *lat,
                longitude: *lon,
                district: district.map(str::to_string),
                storeys: 3,
                plan_area_m2: 200.0,
                column_area_m2: 2.0,
                ..Default::default()
            })
            .collect()
    })
}

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    if let Ok((geo, _problems)) = Geography::from_geojson_str(Some(text), Some(text)) {
        let _ = locate(buildings(), &geo, &Settings::default());
    }
});
