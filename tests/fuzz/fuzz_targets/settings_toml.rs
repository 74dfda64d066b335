//! The settings TOML reader (`--settings FILE.toml`); settings that are accepted then screen
//! a small fixed stock, so that an accepted but extreme value cannot make the screening,
//! retrofit sizing or budget plan panic, hang or allocate without bound.
#![no_main]

use std::sync::OnceLock;

use libfuzzer_sys::fuzz_target;
use seistriage::pipeline::{self, Loaded, RunOptions};
use seistriage::settings::Settings;
use seistriage_fuzz::write_file;

const STOCK: &str = "id,storeys,plan_area_m2,column_area_m2,rc_wall_area_x_m2,rc_wall_area_y_m2,year_built,latitude,longitude,infill_area_x_m2,short_columns,boundary_elements,occupants
A,3,200,2,0.5,0.2,1965,35.01,18.01,4,yes,no,30
B,7,450,4.5,,3,1984,35.02,18.02,,no,yes,120
C,12,600,7,2,2.5,2001,35.03,18.03,9,unknown,unknown,300
";

fn base() -> &'static Loaded {
    static BASE: OnceLock<Loaded> = OnceLock::new();
    BASE.get_or_init(|| {
        let p = write_file("stock.csv", STOCK.as_bytes());
        pipeline::load(&p, &RunOptions::default()).unwrap()
    })
}

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    let mut settings = Settings::default();
    if settings.apply_toml(text).is_ok() {
        let mut loaded = base().clone();
        loaded.settings = settings;
        let _ = pipeline::screen(&loaded);
    }
});
