//! The Walls table: one row per surveyed wall (method §8 capacities).

use super::table;
use crate::model::Dir;
use crate::results::{BuildingResult, WallResult};

table! {
    /// Columns of the Walls table.
    columns WALLS;
    /// One Walls row.
    fn wall_cells(b: &BuildingResult, w: &WallResult) target(t) {}
    "Rank", "rank", Int, 7.0 => b.rank;
    "Building id", "building_id", Text, 12.0 => &b.id;
    "Wall id", "wall_id", Text, 14.0 => &w.wall_id;
    "Direction", "direction", Text, 9.0 => w.direction.map(Dir::code);
    "Representative", "representative", Text, 10.0 => w.representative;
    "Walls represented", "count", Dec2, 10.0 => w.count;
    "Length lw (m)", "length_m", Dec2, 9.0 => w.length_m;
    "Thickness tw (m)", "thickness_m", Dec3, 9.0 => w.thickness_m;
    "Boundary elements", "boundary_elements", Text, 10.0 => w.boundary_elements;
    "Axial load ratio ν (-)", "axial_load_ratio", Dec3, 10.0 => w.axial_load_ratio;
    "Shear span Lv (m)", "shear_span_m", Dec2, 9.0 => w.shear_span_m;
    "Yield rotation θy (%)", "theta_y", Ratio, 10.0 => w.theta_y;
    "Ultimate rotation θum (%)", "theta_um", Ratio, 11.0 => w.theta_um;
    "Capacity IO (%)", "capacity_io", Ratio, 10.0 => w.capacity.io;
    "Capacity LS (%)", "capacity_ls", Ratio, 10.0 => w.capacity.ls;
    "Capacity CP (%)", "capacity_cp", Ratio, 10.0 => w.capacity.cp;
}
