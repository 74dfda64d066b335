/*!
Wording of the engine's typed results for users: each flag's plain-words reason
(`flags[].detail` of the JSON, the Flags sheet, `explain`), the value a defaulted input took,
and the spectrum's parameters. The engine returns numbers only (`results::FlagDetail`); the
limits printed here are the ones the flag carries, copied from the settings the engine
screened with, so a text always shows the setting in force (`infill_weight`,
`torsion_eccentricity_ratio` and every threshold).
*/

use serde::ser::{Serialize, SerializeStruct, Serializer};

use crate::results::{
    BoundaryRecord, CalibrationRange, DefaultValue, Flag, FlagDetail, SoftStorey, SpectrumShape,
    StoreyData, WallRef,
};

/// A flag serialises as `{"code", "direction", "detail"}` (`interface.md`), its detail worded
/// by [`detail`].
impl Serialize for Flag {
    fn serialize<S: Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        let mut st = serializer.serialize_struct("Flag", 3)?;
        st.serialize_field("code", &self.code)?;
        st.serialize_field("direction", &self.direction)?;
        st.serialize_field("detail", &detail(self))?;
        st.end()
    }
}

/// How a wall is named: "the representative X wall" or "wall W3".
pub fn wall_name(w: &WallRef) -> String {
    if w.representative {
        format!("the representative {} wall", w.dir.code().to_uppercase())
    } else {
        format!("wall {}", w.id)
    }
}

fn names(ws: &[WallRef]) -> String {
    ws.iter().map(wall_name).collect::<Vec<_>>().join(", ")
}

/// The infill term of the stiffness proxy with weight w: "A_mw/10" for w = 0.1 (and
/// "A_mw/n" for any w = 1/n), else "w·A_mw".
pub fn infill_term(w: f64) -> String {
    let n = (1.0 / w).round();
    if w > 0.0 && n >= 2.0 && (n * w - 1.0).abs() < 1e-12 {
        format!("A_mw/{n}")
    } else if w == 1.0 {
        "A_mw".into()
    } else {
        format!("{w}·A_mw")
    }
}

/// A ratio as a factor: two decimals when that is exact ("0.30"), else in full.
fn factor_text(r: f64) -> String {
    if ((r * 100.0).round() - r * 100.0).abs() < 1e-9 {
        format!("{r:.2}")
    } else {
        format!("{r}")
    }
}

/// Plain words for the storey data a soft/weak storey flag used (method §10).
pub fn data_text(d: StoreyData) -> &'static str {
    match d {
        StoreyData::Sheet => "data from the storeys sheet",
        StoreyData::UpperColumns => "data from the upper_* cells (storey 2)",
        StoreyData::Derived { walls_sheet: true } => "data from the walls sheet and storey heights",
        StoreyData::Derived { walls_sheet: false } => {
            "data from the storey heights (storey 2 repeats the ground storey)"
        }
        StoreyData::None => "one storey: no data",
    }
}

fn soft_text(f: &SoftStorey, table_type: &str) -> String {
    let mut ratios = String::new();
    if let Some(r2) = f.r2 {
        ratios.push_str(&format!("k1/k2 = {r2:.3}"));
    }
    if let Some(rm) = f.r_mean {
        ratios.push_str(&format!(", k1/mean(k2..k4) = {rm:.3}"));
    }
    let with = if f.added_m2 > 0.0 {
        format!(", with {:.3} m² of new walls", f.added_m2)
    } else {
        String::new()
    };
    format!(
        "ground-storey stiffness proxy (A_cw + {} + A_col/2)/h: {ratios} (limits {} / {}, ASCE 7-16 Table 12.3-2 type {table_type}; {}{with})",
        infill_term(f.infill_weight),
        f.limit,
        f.limit_mean,
        data_text(f.data)
    )
}

fn year_text(y: Option<i32>, none: &str) -> String {
    y.map_or(none.into(), |y| y.to_string())
}

fn boundary_missing_text(b: &BoundaryRecord) -> String {
    format!(
        "no boundary elements in {} (recorded \"no\", or \"unknown\" with year built {} before boundary_elements_from_year {})",
        names(&b.walls),
        year_text(b.year, "-"),
        year_text(b.from_year, "-")
    )
}

fn boundary_unknown_text(b: &BoundaryRecord) -> String {
    format!(
        "boundary elements of {} are unknown and cannot be inferred (year built {}, boundary_elements_from_year {}); treated as absent",
        names(&b.walls),
        year_text(b.year, "unknown"),
        year_text(b.from_year, "not set")
    )
}

fn calibration_walls_text(
    r: &CalibrationRange,
    walls: &[crate::results::CalibrationWall],
) -> String {
    let hits: Vec<String> = walls
        .iter()
        .map(|w| {
            let mut why: Vec<String> = Vec::new();
            if let Some(nu) = w.nu {
                why.push(format!("ν = {nu:.3}"));
            }
            if let Some(p) = w.steel_pct {
                why.push(format!("boundary steel {p} %"));
            }
            if let Some(l) = w.shear_span {
                why.push(format!("Lv/h = {l:.2}"));
            }
            format!("{} ({})", wall_name(&w.wall), why.join(", "))
        })
        .collect();
    format!(
        "capacity equations extrapolated (calibrated for ν ≤ {}, boundary steel {}–{} %, Lv/h {}–{}): {}",
        r.axial_max,
        r.steel_min_pct,
        r.steel_max_pct,
        r.shear_span_min,
        r.shear_span_max,
        hits.join("; ")
    )
}

fn calibration_columns_text(r: &CalibrationRange, nu: Option<f64>, lvh: Option<f64>) -> String {
    let mut why: Vec<String> = Vec::new();
    if let Some(nu) = nu {
        why.push(format!("ν = {nu:.3} > {}", r.axial_max));
    }
    if let Some(lvh) = lvh {
        why.push(format!(
            "Lv/h = {lvh:.2} outside {}–{}",
            r.shear_span_min, r.shear_span_max
        ));
    }
    format!("column capacity equations extrapolated: {}", why.join(", "))
}

/// The plain-words reason of a flag with the numbers that triggered it.
pub fn detail(f: &Flag) -> String {
    match &f.detail {
        FlagDetail::SoftStorey(x) => soft_text(x, "1a"),
        FlagDetail::SoftStoreyExtreme(x) => soft_text(x, "1b"),
        FlagDetail::WeakStorey(x) => format!(
            "ground-storey strength is {:.1} % of the storey above (limit {:.0} %, ASCE 7-16 Table 12.3-2 type 5a; {})",
            x.ratio.unwrap_or(0.0) * 100.0,
            x.limit * 100.0,
            data_text(x.data)
        ),
        FlagDetail::WallDiscontinued(x) => {
            let mut why: Vec<String> = Vec::new();
            if !x.above.is_empty() {
                why.push(format!(
                    "walls starting above the ground storey: {}",
                    x.above.join(", ")
                ));
            }
            if let Some((u, ground)) = x.upper_m2 {
                why.push(format!(
                    "RC wall area at storey 2 ({u:.3} m²) exceeds the ground storey's ({ground:.3} m²)"
                ));
            }
            why.join("; ")
        }
        FlagDetail::BoundaryMissing(x) => boundary_missing_text(x),
        FlagDetail::BoundaryUnknown(x) => boundary_unknown_text(x),
        FlagDetail::BoundaryNeeded(x) => {
            let hits: Vec<String> = x
                .walls
                .iter()
                .map(|h| {
                    format!(
                        "{} (hw/lw = {:.2}, c = {:.3} m ≥ lw/(600·1.5·δu/hw) = {:.3} m)",
                        wall_name(&h.wall),
                        h.aspect,
                        h.c_m,
                        h.c_limit_m
                    )
                })
                .collect();
            format!(
                "ACI 318-19 §18.10.6.2 requires special boundary elements at roof drift {:.4}: {}",
                x.drift,
                hits.join("; ")
            )
        }
        FlagDetail::HighAxialWall(x) => format!(
            "axial load ratio ν = {:.3} > {} (EN 1998-1 §5.4.3.4.1, DCM walls)",
            x.value, x.limit
        ),
        FlagDetail::HighAxialColumn(x) => format!(
            "axial load ratio ν = {:.3} > {} (EN 1998-1 §5.4.3.2.1, DCM columns)",
            x.value, x.limit
        ),
        FlagDetail::SlenderWall(x) => {
            let hits: Vec<String> = x
                .walls
                .iter()
                .map(|(w, r)| format!("{} (H/lw = {r:.1})", wall_name(w)))
                .collect();
            format!(
                "H/lw above {}: {}; little test evidence for such walls",
                x.limit,
                hits.join(", ")
            )
        }
        FlagDetail::SquatWall(x) => {
            let hits: Vec<String> = x
                .walls
                .iter()
                .map(|(w, r)| format!("{} (Lv/lw = {r:.2})", wall_name(w)))
                .collect();
            format!(
                "Lv/lw below {}: {}; shear controls and the flexural rotation capacity is not reliable",
                x.limit,
                hits.join(", ")
            )
        }
        FlagDetail::ShortColumn => "short (captive) columns recorded by the surveyor: shear failure before the drift capacities are reached; class 2 at least".into(),
        FlagDetail::Torsion(x) => {
            // Direction X is checked with the y coordinates and r_y, Y with x and r_x.
            let (c, r) = match f.direction {
                Some(crate::model::Dir::Y) => ("x", "r_x"),
                _ => ("y", "r_y"),
            };
            format!(
                "e0{c} = |{c}_s − {c}_m| = |{:.2} − {:.2}| = {:.2} m vs {}·{r} = {:.2} m; {r} = {:.2} m vs l_s = {:.2} m (EN 1998-1 §4.2.3.2(6), eqs. 4.1a/4.1b)",
                x.stiffness_centre_m,
                x.mass_centre_m,
                (x.stiffness_centre_m - x.mass_centre_m).abs(),
                factor_text(x.ratio),
                x.ratio * x.radius_m,
                x.radius_m,
                x.ls_m
            )
        }
        FlagDetail::CalibrationWalls(r, walls) => calibration_walls_text(r, walls),
        FlagDetail::CalibrationColumns(r, nu, lvh) => calibration_columns_text(r, *nu, *lvh),
        FlagDetail::NearFault(x) => format!(
            "fault trace \"{}\" at {:.2} km ({}) is within the {} km near-fault distance (ASCE 7-16 §11.4.1); spectrum × {}",
            x.name,
            x.distance_m / 1000.0,
            x.mw.map_or("no magnitude given".to_string(), |m| format!("Mw {m}")),
            x.limit_km,
            x.factor
        ),
        FlagDetail::PeriodRange(x) => format!(
            "height H = {:.1} m above {} m: the EN 1998-1 §4.3.3.2.2 period formula is outside its range",
            x.value, x.limit
        ),
        FlagDetail::BrittleWalls(walls) => {
            let hits: Vec<String> = walls
                .iter()
                .map(|w| {
                    format!(
                        "{} (θum = {:.5} < θy = {:.5})",
                        wall_name(&w.wall),
                        w.theta_um,
                        w.theta_y
                    )
                })
                .collect();
            format!("fails before it yields: {}", hits.join(", "))
        }
        FlagDetail::BrittleColumns(um, y) => {
            format!("columns fail before they yield (θum = {um:.5} < θy = {y:.5})")
        }
        FlagDetail::LowPriorityIndex(x) => format!(
            "priority index PI = {:.3} % below the threshold {} %",
            x.value, x.limit
        ),
        FlagDetail::DefaultsUsed(values) => {
            let parts: Vec<String> = values
                .iter()
                .map(|(k, v)| format!("{k} = {}", default_value_text(v)))
                .collect();
            format!("blank inputs took defaults: {}", parts.join(", "))
        }
        FlagDetail::CodeOnly(_) => String::new(),
    }
}

/// The value a defaulted input took, as text ("3 m", "25 MPa", "present by year rule").
pub fn default_value_text(v: &DefaultValue) -> String {
    match v {
        DefaultValue::Metres(x) => format!("{x} m"),
        DefaultValue::MPa(x) => format!("{x} MPa"),
        DefaultValue::KPa(x) => format!("{x} kPa"),
        DefaultValue::Use(u) => u.code().to_string(),
        DefaultValue::Ground(g) => g.to_string(),
        DefaultValue::Boundary(true) => "present by year rule".into(),
        DefaultValue::Boundary(false) => "treated as absent".into(),
        DefaultValue::NoRcWalls => "0 m² (no RC walls)".into(),
        DefaultValue::None => String::new(),
    }
}

/// The spectrum's shape and parameters as text (explain, Directions sheet).
pub fn spectrum_text(sp: &SpectrumShape) -> String {
    match sp {
        SpectrumShape::Ec8 {
            type2,
            ground,
            s,
            tb_s,
            tc_s,
            td_s,
        } => format!(
            "EN 1998-1 Type {} (Table {}), ground type {}: S = {}, TB = {} s, TC = {} s, TD = {} s",
            if *type2 { 2 } else { 1 },
            if *type2 { "3.3" } else { "3.2" },
            ground,
            s,
            tb_s,
            tc_s,
            td_s
        ),
        SpectrumShape::TwoParameter {
            sds_g,
            sd1_g,
            ts_s,
            tl_s,
        } => format!(
            "ASCE 7-16 §11.4.6 two-parameter: SDS = {sds_g} g, SD1 = {sd1_g} g, Ts = {ts_s} s, TL = {}",
            tl_s.map_or("none".to_string(), |t| format!("{t} s"))
        ),
        SpectrumShape::None => String::new(),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_infill_term_prints_the_weight_in_force() {
        assert_eq!(infill_term(0.1), "A_mw/10");
        assert_eq!(infill_term(0.25), "A_mw/4");
        assert_eq!(infill_term(0.3), "0.3·A_mw");
        assert_eq!(infill_term(1.0), "A_mw");
        assert_eq!(infill_term(0.0), "0·A_mw");
    }

    #[test]
    fn the_torsion_factor_prints_the_ratio_in_force() {
        assert_eq!(factor_text(0.3), "0.30");
        assert_eq!(factor_text(0.25), "0.25");
        assert_eq!(factor_text(0.333), "0.333");
    }
}
