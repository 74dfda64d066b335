//! The Directions table: one row per building and direction, every intermediate number of
//! method.md in method order (§0 building quantities, §1 indices, … §9 DCRs and the
//! frame-alone bound).

use super::table;
use crate::model::Dir;
use crate::results::BuildingResult;

/// The levels at which the frame-alone bound governs, as shown.
fn frame_alone_governs(fa: Option<crate::results::FrameAlone>) -> &'static str {
    match fa.map(|f| (f.governs.ls, f.governs.cp)) {
        None => "",
        Some((true, true)) => "LS, CP",
        Some((true, false)) => "LS",
        Some((false, true)) => "CP",
        Some((false, false)) => "no",
    }
}

table! {
    /// Columns of the Directions table: every intermediate number of method.md, in method
    /// order.
    columns DIRECTIONS;
    /// One Directions row (building `b`, direction `d`).
    fn direction_cells(b: &BuildingResult, d: Dir) target(t) {
        let r = b.directions.get(d);
        let det = &r.detail;
        let bd = &b.detail;
        let cw = r.capacity.walls;
        let cc = r.capacity.columns;
        let fa = r.frame_alone;
    }
    "Rank", "rank", Int, 7.0 => b.rank;
    "Id", "id", Text, 12.0 => &b.id;
    "Name", "name", Text, 24.0 => &b.name;
    "Class", "class", Class, 26.0 => b.class;
    "Direction", "direction", Text, 9.0 => d.code();
    "Governs", "governs", Text, 8.0 => b.governing.direction == d;
    "Storeys", "storeys", Int, 8.0 => bd.storeys;
    "Height H (m)", "height_m", Dec2, 9.0 => bd.height_m;
    "Floor area A_fl (m²)", "floor_area_m2", Dec2, 11.0 => bd.floor_area_m2;
    "Seismic weight W (kN)", "weight_kn", Thousands, 11.0 => bd.weight_kn;
    "fc used (MPa)", "fc_mpa", Dec2, 9.0 => bd.fc_mpa;
    "fy used (MPa)", "fy_mpa", Dec2, 9.0 => bd.fy_mpa;
    "Column area A_col (m²)", "column_area_m2", Dec3, 10.0 => bd.column_area_m2;
    "Boundary elements (effective)", "boundary_elements", Text, 10.0 => bd.boundary_elements;
    "Columns detailed (effective)", "columns_detailed", Text, 10.0 => bd.columns_detailed;
    "RC wall area A_cw (m²)", "rc_wall_area_m2", Dec3, 10.0 => det.rc_wall_area_m2;
    "Infill area A_mw (m²)", "infill_area_m2", Dec3, 10.0 => det.infill_area_m2;
    "RC wall index WIrc (%)", "rc_wall_index_pct", Pct, 10.0 => det.rc_wall_index_pct;
    "Wall index WI (%)", "wall_index_pct", Pct, 10.0 => r.wall_index_pct;
    "Column index CI (%)", "column_index_pct", Pct, 10.0 => r.column_index_pct;
    "Priority index PI (%)", "priority_index_pct", Pct, 10.0 => r.priority_index_pct;
    "Axial load ratio ν (-)", "axial_load_ratio", Dec3, 10.0 => b.axial_load_ratio;
    "Strength factor β (-)", "beta", Dec3, 9.0 => bd.beta;
    "Wall strength C_w (-)", "strength_walls", Dec3, 10.0 => det.strength_walls;
    "Column strength C_c (-)", "strength_columns", Dec3, 10.0 => det.strength_columns;
    "α1 (-)", "alpha1", Dec2, 7.0 => det.alpha1;
    "Strength coefficient C_y (-)", "strength_coefficient", Dec3, 11.0 => det.strength_coefficient;
    "Period, frame formula (s)", "period_frame_s", Dec3, 10.0 => det.period_frame_s;
    "Ac (m²)", "ac_m2", Dec3, 9.0 => det.ac_m2;
    "Period, wall formula (s)", "period_wall_s", Dec3, 10.0 => det.period_wall_s;
    "Formula period before factor (s)", "period_formula_s", Dec3, 11.0 => det.period_formula_s;
    "Period source", "period_source", Text, 10.0 => det.period_source;
    "Period used T (s)", "period_s", Dec3, 9.0 => r.period_s;
    "agR (g)", "agr_g", Dec3, 8.0 => bd.agr_g;
    "agR from", "agr_source", Text, 10.0 => bd.agr_source;
    "Ground type", "ground_type", Text, 8.0 => &bd.ground_type;
    "Importance γI (-)", "gamma_i", Dec2, 9.0 => bd.gamma_i;
    "ag = γI·agR (g)", "ag_g", Dec3, 9.0 => bd.ag_g;
    "Spectrum parameters", "spectrum", Text, 30.0 => crate::report::flag_text::spectrum_text(&bd.spectrum);
    "Factor on spectrum (-)", "spectrum_factor", Dec2, 9.0 => bd.spectrum_factor;
    "η (-)", "eta", Dec3, 7.0 => bd.eta;
    "Corner period TC (s)", "tc_s", Dec3, 9.0 => det.tc_s;
    "Se(T) (g)", "se_g", Dec3, 9.0 => det.se_g;
    "SDe(T) (m)", "sde_m", Dec4, 9.0 => det.sde_m;
    "Γ (-)", "gamma", Dec3, 8.0 => det.gamma;
    "S_ay (g)", "say_g", Dec3, 8.0 => det.say_g;
    "qu (-)", "qu", Dec3, 8.0 => det.qu;
    "N2 branch", "n2_branch", Text, 18.0 => det.n2_branch;
    "dt* (m)", "dt_star_m", Dec4, 9.0 => det.dt_star_m;
    "Roof displacement d_t (m)", "roof_displacement_m", Dec4, 11.0 => det.roof_displacement_m;
    "Roof drift δ_r (%)", "roof_drift_demand", Ratio, 10.0 => r.roof_drift_demand;
    "Soft or weak storey", "soft_or_weak", Text, 9.0 => det.soft_or_weak;
    "κ (-)", "kappa", Dec2, 7.0 => det.kappa;
    "Drift demand, walls (%)", "drift_demand_walls", Ratio, 10.0 => r.drift_demand.walls;
    "Drift demand, columns (%)", "drift_demand_columns", Ratio, 10.0 => r.drift_demand.columns;
    "Wall shear span Lv (m)", "wall_shear_span_m", Dec2, 10.0 => bd.wall_shear_span_m;
    "Column shear span Lv (m)", "column_shear_span_m", Dec2, 10.0 => bd.column_shear_span_m;
    "Column θy (%)", "column_theta_y", Ratio, 9.0 => bd.column_theta_y;
    "Column θum (%)", "column_theta_um", Ratio, 9.0 => bd.column_theta_um;
    "Wall capacity IO (%)", "capacity_walls_io", Ratio, 10.0 => cw.map(|c| c.io);
    "Wall capacity LS (%)", "capacity_walls_ls", Ratio, 10.0 => cw.map(|c| c.ls);
    "Wall capacity CP (%)", "capacity_walls_cp", Ratio, 10.0 => cw.map(|c| c.cp);
    "Column capacity IO (%)", "capacity_columns_io", Ratio, 10.0 => cc.map(|c| c.io);
    "Column capacity LS (%)", "capacity_columns_ls", Ratio, 10.0 => cc.map(|c| c.ls);
    "Column capacity CP (%)", "capacity_columns_cp", Ratio, 10.0 => cc.map(|c| c.cp);
    "DCR IO (-)", "dcr_io", Dcr, 8.0 => r.dcr.io;
    "DCR LS (-)", "dcr_ls", Dcr, 8.0 => r.dcr.ls;
    "DCR CP (-)", "dcr_cp", Dcr, 8.0 => r.dcr.cp;
    "Frame alone: period (s)", "frame_alone_period_s", Dec3, 10.0 => fa.map(|f| f.period_s);
    "Frame alone: roof drift (%)", "frame_alone_roof_drift_demand", Ratio, 10.0 => fa.map(|f| f.roof_drift_demand);
    "Frame alone: DCR LS (-)", "frame_alone_dcr_ls", Dcr, 9.0 => fa.map(|f| f.dcr.ls);
    "Frame alone: DCR CP (-)", "frame_alone_dcr_cp", Dcr, 9.0 => fa.map(|f| f.dcr.cp);
    "Frame alone governs at", "frame_alone_governs", Text, 10.0 => frame_alone_governs(fa);
}
