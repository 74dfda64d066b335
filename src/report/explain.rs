/*!
`explain`: every step of the method for one building, as text an engineer can redo by hand.

The numbers are those of the command's own screening run (the ranked [`Screening`] it computed
once, with `crate::pipeline::screen`, passed in; this module runs no pipeline): the building
is looked up in it, so class, rank and every intermediate number are exactly what `screen`
writes. The inputs are listed from the engine's own resolution, each default marked.
*/

use std::fmt::Write as _;

use crate::engine::{self, resolve};
use crate::model::Dir;
use crate::pipeline::Loaded;
use crate::results::{BuildingResult, Levels, Screening};

/// How `explain` prints its numbers (`interface.md`): 4 significant digits for people by
/// default, full precision (shortest round-trip text, for hand checks) with `--full`.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Precision {
    /// 4 significant digits ([`crate::report::people`]).
    #[default]
    People,
    /// Full precision.
    Full,
}

/// One number; a number that could not be computed is said in words, never "null" or NaN.
fn num(v: f64, p: Precision) -> String {
    if !v.is_finite() {
        return "not computed".into();
    }
    match p {
        Precision::Full => format!("{v}"),
        Precision::People => super::people::sig4(v).unwrap_or_else(|| "not computed".into()),
    }
}

/// A list of numbers `[a, b, …]`.
fn list(v: &[f64], p: Precision) -> String {
    let items: Vec<String> = v.iter().map(|x| num(*x, p)).collect();
    format!("[{}]", items.join(", "))
}

/// The explanation of one building of `loaded` as `report` (the screening of `loaded`) found
/// it, at 4 significant digits, or `None` when the id is not in the inventory.
pub fn explain(loaded: &Loaded, report: &Screening, id: &str) -> Option<String> {
    explain_with(loaded, report, id, Precision::People)
}

/// [`explain`] at a chosen precision (`explain --full`: [`Precision::Full`]).
pub fn explain_with(
    loaded: &Loaded,
    report: &Screening,
    id: &str,
    precision: Precision,
) -> Option<String> {
    let in_inventory = loaded.inventory.buildings.iter().any(|b| b.id == id);
    let rejected = loaded.inventory.not_screened.iter().find(|n| n.id == id);
    if !in_inventory {
        return rejected.map(|ns| {
            format!(
                "Building {id} (buildings sheet, row {}) could not be screened:\n{}\n",
                ns.row,
                ns.reasons
                    .iter()
                    .map(|r| format!("  - {r}"))
                    .collect::<Vec<_>>()
                    .join("\n")
            )
        });
    }
    let Some(b) = report.buildings.iter().find(|b| b.id == id) else {
        let ns = report.not_screened.iter().find(|n| n.id == id);
        let reasons = ns.map_or_else(Vec::new, |n| n.reasons.clone());
        return Some(format!(
            "Building {id} could not be screened:\n{}\n",
            reasons
                .iter()
                .map(|r| format!("  - {r}"))
                .collect::<Vec<_>>()
                .join("\n")
        ));
    };
    let inputs = engine::building_inputs(&loaded.inventory, &loaded.sites);
    let input = inputs.iter().find(|i| i.record.id == id)?;
    let res = resolve::resolve(input, &loaded.settings).ok()?;
    Some(render(
        b,
        &res,
        input,
        loaded,
        report.buildings.len(),
        precision,
    ))
}

fn render(
    b: &BuildingResult,
    res: &resolve::Resolved,
    input: &engine::BuildingInput<'_>,
    loaded: &Loaded,
    total: usize,
    precision: Precision,
) -> String {
    let n = move |v: f64| num(v, precision);
    let opt = move |v: Option<f64>, why: &str| {
        v.map_or_else(|| format!("not computed ({why})"), |v| num(v, precision))
    };
    let lv = move |l: &Levels| format!("IO {} | LS {} | CP {}", n(l.io), n(l.ls), n(l.cp));
    let s = &loaded.settings;
    let d = &b.detail;
    let mark = |key: &str| {
        if b.defaults_used.iter().any(|k| k == key) {
            format!("  [default: {key}]")
        } else {
            String::new()
        }
    };
    let mut o = String::new();
    let _ = writeln!(
        o,
        "Building {} \"{}\" (buildings sheet, row {})",
        b.id, b.name, b.row
    );
    let _ = writeln!(o, "{}", crate::CAUTION);
    let _ = writeln!(o);
    let _ = writeln!(
        o,
        "RESULT: class {} ({}), rank {} of {}, score {} (DCR at {} in direction {}, {})",
        b.class,
        engine::rank::class_name(b.class),
        b.rank,
        total,
        n(b.score),
        b.governing.level.code().to_uppercase(),
        b.governing.direction.code(),
        match b.governing.group {
            crate::results::Group::Walls => "walls",
            crate::results::Group::Columns => "columns",
        }
    );
    let _ = writeln!(o);

    let _ = writeln!(
        o,
        "§0 Inputs and quantities (docs/method.md §0; the method step by step, shipped with seistriage)"
    );
    let _ = writeln!(
        o,
        "  use = {}{}; importance factor γI = {} (EN 1998-1 Table 4.3)",
        res.use_.code(),
        mark("use"),
        n(res.gamma_i)
    );
    let _ = writeln!(
        o,
        "  year built = {}",
        input
            .record
            .year_built
            .map_or("unknown".into(), |y| y.to_string())
    );
    let _ = writeln!(o, "  storeys n = {}", res.n);
    let _ = writeln!(
        o,
        "  storey heights h_i = {} m{}{}",
        list(&res.heights_m, precision),
        mark("ground_storey_height_m"),
        mark("storey_height_m")
    );
    let _ = writeln!(
        o,
        "  floor heights z_i = {} m; H = {} m",
        list(&d.floor_heights_m, precision),
        n(d.height_m)
    );
    let _ = writeln!(
        o,
        "  plan area A_plan = {} m²; total floor area A_fl = n·A_plan = {} m²",
        n(res.plan_area_m2),
        n(d.floor_area_m2)
    );
    let _ = writeln!(
        o,
        "  column area A_col = {} m²; column depth h_c = {} m{}",
        n(d.column_area_m2),
        n(res.column_depth_m),
        mark("column_depth_m")
    );
    for dir in Dir::BOTH {
        let dd = &b.directions.get(dir).detail;
        let _ = writeln!(
            o,
            "  direction {}: RC wall area A_cw = {} m², infill area A_mw = {} m²",
            dir.code(),
            n(dd.rc_wall_area_m2),
            n(dd.infill_area_m2)
        );
    }
    let _ = writeln!(
        o,
        "  fc = {} MPa{}; fy = {} MPa{}; Es = {} MPa; εy = fy/Es = {}",
        n(d.fc_mpa),
        mark("fc_mpa"),
        n(d.fy_mpa),
        mark("fy_mpa"),
        n(s.es_mpa),
        n(d.fy_mpa / s.es_mpa)
    );
    let _ = writeln!(
        o,
        "  confidence factor CF = {} (EN 1998-3 Table 3.1; divides existing members' strengths in §8)",
        n(s.confidence_factor)
    );
    let _ = writeln!(
        o,
        "  floor weight w = {} kPa{}; W = w·A_fl = {} kN",
        n(res.floor_weight_kpa),
        mark("floor_weight_kpa"),
        n(d.weight_kn)
    );
    let _ = writeln!(
        o,
        "  boundary elements (building rule of §0) = {}{}; columns seismically detailed = {}",
        if d.boundary_elements {
            "present"
        } else {
            "absent"
        },
        mark("boundary_elements"),
        if d.columns_detailed { "yes" } else { "no" }
    );
    match &res.hazard {
        resolve::Hazard::Ec8 {
            agr_g,
            agr_source,
            ground,
            ground_source,
            ..
        } => {
            let _ = writeln!(
                o,
                "  hazard: agR = {} g (from {}); ground type {} (from {}){}",
                n(*agr_g),
                agr_source,
                ground,
                ground_source,
                mark("ground_type")
            );
        }
        resolve::Hazard::TwoParameter {
            sds_g,
            sd1_g,
            source,
            ..
        } => {
            let _ = writeln!(
                o,
                "  hazard: SDS = {} g, SD1 = {} g (from {})",
                n(*sds_g),
                n(*sd1_g),
                source
            );
        }
    }
    let _ = writeln!(o, "  walls:");
    for w in &res.walls {
        let _ = writeln!(
            o,
            "    {} {}: lw = {} m{}, tw = {} m{}, count {}, boundary elements {}",
            w.dir.code(),
            w.id,
            n(w.lw),
            if w.representative {
                mark(if w.dir == Dir::X {
                    "wall_length_x_m"
                } else {
                    "wall_length_y_m"
                })
            } else {
                String::new()
            },
            n(w.tw),
            mark("wall_thickness_m"),
            n(w.count),
            if w.boundary { "present" } else { "absent" }
        );
    }
    if res.walls.is_empty() {
        let _ = writeln!(o, "    none");
    }
    if !b.defaults_used.is_empty() {
        let _ = writeln!(o, "  defaults used: {}", b.defaults_used.join(", "));
    }
    let _ = writeln!(o);

    let _ = writeln!(o, "§1 Indices (Hassan & Sozen 1997)");
    for dir in Dir::BOTH {
        let r = b.directions.get(dir);
        let _ = writeln!(
            o,
            "  {}: CI = 0.5·A_col/A_fl·100 = {} %; WI = (A_cw + {}·A_mw)/A_fl·100 = {} %; PI = WI + CI = {} %",
            dir.code(),
            n(r.column_index_pct),
            n(s.infill_weight),
            n(r.wall_index_pct),
            n(r.priority_index_pct)
        );
    }
    let _ = writeln!(
        o,
        "§2 Axial load ratio ν = W/((A_col + A_cw,X + A_cw,Y)·fc·1000) = {}",
        n(b.axial_load_ratio)
    );
    let _ = writeln!(
        o,
        "§3 Strength (JBDPA 2001 first-level form): β = {} (fc {} MPa vs {} MPa)",
        n(d.beta),
        n(d.fc_mpa),
        n(s.fc_reference_mpa)
    );
    for dir in Dir::BOTH {
        let dd = &b.directions.get(dir).detail;
        let _ = writeln!(
            o,
            "  {}: C_rc = β·τ_w·A_cw·1000/W = {} (τ_w {} MPa{}); C_m = β·τ_m·A_mw·1000/W = {} (τ_m {} MPa); C_c = β·τ_c·A_col·1000/W = {} (τ_c {} MPa); C_y = C_m + max(C_rc + {}·C_c, C_c) = {} ({})",
            dir.code(),
            n(dd.strength_walls - dd.strength_infill),
            n(s.tau_wall_mpa),
            if dd.added_wall_area_m2 > 0.0 {
                format!(", new walls {} m²", n(dd.added_wall_area_m2))
            } else {
                String::new()
            },
            n(dd.strength_infill),
            n(crate::engine::strength::tau_infill_mpa(s)),
            n(dd.strength_columns),
            n(s.tau_column_mpa),
            n(s.alpha1_with_walls),
            n(dd.strength_coefficient),
            if dd.wall_governed {
                "wall-governed"
            } else {
                "column-governed"
            }
        );
    }
    let _ = writeln!(o, "§4 Period (EN 1998-1 §4.3.3.2.2)");
    for dir in Dir::BOTH {
        let r = b.directions.get(dir);
        let dd = &r.detail;
        let _ = writeln!(
            o,
            "  {}: T_frame = {}·H^0.75 = {} s (eq. 4.6); Ac = Σ A_i(0.2 + min(lw_i/H, 0.9))² = {} m² (eq. 4.8); T_wall = {} s (eq. 4.7); formula T = {} s; period_factor {}; source {}; T used = {} s",
            dir.code(),
            n(s.ct_period),
            n(dd.period_frame_s),
            n(dd.ac_m2),
            opt(dd.period_wall_s, "no walls, Ac = 0"),
            n(dd.period_formula_s),
            n(s.period_factor),
            dd.period_source,
            n(r.period_s)
        );
    }
    let _ = writeln!(
        o,
        "§5 Spectrum: {}; ag = γI·agR = {} g; η = {}; spectrum factor {}",
        super::flag_text::spectrum_text(&d.spectrum),
        n(d.ag_g),
        n(d.eta),
        n(d.spectrum_factor)
    );
    for dir in Dir::BOTH {
        let dd = &b.directions.get(dir).detail;
        let _ = writeln!(
            o,
            "  {}: Se(T) = {} g; SDe(T) = Se·g·(T/2π)² = {} m (eq. 3.7)",
            dir.code(),
            n(dd.se_g),
            n(dd.sde_m)
        );
    }
    let _ = writeln!(
        o,
        "§6 N2 displacement demand (EN 1998-1 Annex B), Φ_i = z_i/H"
    );
    for dir in Dir::BOTH {
        let r = b.directions.get(dir);
        let dd = &r.detail;
        let _ = writeln!(
            o,
            "  {}: Γ = {}; S_ay = C_y·n/(Γ·ΣΦ) = {} g; qu = Se/S_ay = {}; TC = {} s; branch {}; dt* = {} m; d_t = Γ·dt* = {} m; roof drift δ_r = d_t/H = {}",
            dir.code(),
            n(dd.gamma),
            n(dd.say_g),
            n(dd.qu),
            n(dd.tc_s),
            dd.n2_branch,
            n(dd.dt_star_m),
            n(dd.roof_displacement_m),
            n(r.roof_drift_demand)
        );
    }
    let _ = writeln!(o, "§7 Drift demand per element group");
    for dir in Dir::BOTH {
        let r = b.directions.get(dir);
        let _ = writeln!(
            o,
            "  {}: WIrc = {} %; κ = {}{}; walls δ_w = δ_r = {}; columns δ_c = κ·δ_r = {}",
            dir.code(),
            n(r.detail.rc_wall_index_pct),
            n(r.detail.kappa),
            if r.detail.soft_or_weak {
                " (soft/weak storey)"
            } else {
                ""
            },
            opt(r.drift_demand.walls, "no walls"),
            opt(r.drift_demand.columns, "no columns")
        );
    }
    let _ = writeln!(
        o,
        "§8 Capacity (EN 1998-3 Annex A{}), chord rotations in rad",
        match s.capacity_model {
            crate::settings::CapacityModel::Eurocode => "".to_string(),
            crate::settings::CapacityModel::Asce41 =>
                "; walls by ASCE 41-17 Table 10-19".to_string(),
            crate::settings::CapacityModel::LowerOfBoth =>
                "; walls: lower of A.1 and ASCE 41-17 Table 10-19".to_string(),
        }
    );
    let _ = writeln!(
        o,
        "  wall shear span Lv = Σz²/Σz = {} m; column shear span Lv = h1/2 = {} m",
        n(d.wall_shear_span_m),
        n(d.column_shear_span_m)
    );
    for w in &b.walls {
        let _ = writeln!(
            o,
            "  wall {} ({}): lw {} m, ν {}, θy = {}, θum = {} → {}",
            w.wall_id,
            w.direction.map_or("-", |d| d.code()),
            n(w.length_m),
            n(w.axial_load_ratio),
            n(w.theta_y),
            n(w.theta_um),
            lv(&w.capacity)
        );
    }
    if let (Some(ty), Some(tu)) = (d.column_theta_y, d.column_theta_um) {
        let _ = writeln!(
            o,
            "  columns: θy = {} (eq. A.10b), θum = {} (eq. A.1{}) ",
            n(ty),
            n(tu),
            if d.columns_detailed {
                ""
            } else {
                ", ÷1.2 not detailed"
            }
        );
    }
    let _ = writeln!(o, "§9 Demand/capacity ratios");
    for dir in Dir::BOTH {
        let r = b.directions.get(dir);
        let _ = writeln!(
            o,
            "  {}: capacity walls {}; columns {}",
            dir.code(),
            r.capacity
                .walls
                .as_ref()
                .map_or("not computed (no walls)".into(), lv),
            r.capacity
                .columns
                .as_ref()
                .map_or("not computed (no columns)".into(), lv)
        );
        if let Some(g) = &r.group_dcr.walls {
            let _ = writeln!(o, "     walls δ_w/θ_w: {}", lv(g));
        }
        if let Some(g) = &r.group_dcr.columns {
            let _ = writeln!(o, "     columns δ_c/θ_c: {}", lv(g));
        }
        if let Some(f) = &r.frame_alone {
            let governs: Vec<&str> = [(f.governs.ls, "LS"), (f.governs.cp, "CP")]
                .into_iter()
                .filter_map(|(g, l)| g.then_some(l))
                .collect();
            let _ = writeln!(
                o,
                "     frame alone (RC walls removed): C_y = C_m + C_c = {}; T = {} s; Se = {} g; δ_r = {}; κ = {}; δ_c = {}; DCR LS {} CP {} — {}",
                n(f.strength_coefficient),
                n(f.period_s),
                n(f.se_g),
                n(f.roof_drift_demand),
                n(f.kappa),
                n(f.drift_demand_columns),
                n(f.dcr.ls),
                n(f.dcr.cp),
                if governs.is_empty() {
                    "does not govern".to_string()
                } else {
                    format!(
                        "governs at {} (never worse than the frame alone)",
                        governs.join(" and ")
                    )
                }
            );
        }
        let _ = writeln!(
            o,
            "     DCR = max over groups{}: {}",
            if r.frame_alone.is_some() {
                ", at LS and CP not above the frame alone"
            } else {
                ""
            },
            lv(&r.dcr)
        );
    }
    let _ = writeln!(o, "§10 Flags");
    if b.flags.is_empty() {
        let _ = writeln!(o, "  none");
    }
    for f in &b.flags {
        let _ = writeln!(
            o,
            "  {}{}: {}",
            f.code,
            f.direction
                .map_or(String::new(), |d| format!(" ({})", d.code())),
            super::flag_text::detail(f)
        );
    }
    let _ = writeln!(
        o,
        "§11 Class and rank: max DCR {}; class {} ({}); score = governing DCR at {} = {}; rank {} of {}",
        lv(&d.dcr_max),
        b.class,
        engine::rank::class_name(b.class),
        b.governing.level.code(),
        n(b.score),
        b.rank,
        total
    );
    if let Some(rf) = &b.retrofit {
        let _ = writeln!(
            o,
            "§12 Retrofit: added wall area x {} m², y {} m²; column remedy {}; cost {}; replacement cost {}; replace {}; flags after: {}{}",
            opt(rf.added_wall_area_m2.x, "no wall solution within the cap"),
            opt(rf.added_wall_area_m2.y, "no wall solution within the cap"),
            if rf.column_remedy { "yes" } else { "no" },
            opt(rf.cost, "no unit costs, or no wall solution"),
            opt(rf.replacement_cost, "no unit costs"),
            rf.replace
                .map_or("not decided (no unit costs)".into(), |v| if v {
                    "yes"
                } else {
                    "no"
                }
                .to_string()),
            if rf.flags_after.is_empty() {
                "none".into()
            } else {
                rf.flags_after
                    .iter()
                    .map(|c| c.as_str())
                    .collect::<Vec<_>>()
                    .join(", ")
            },
            if rf.note.is_empty() {
                String::new()
            } else {
                format!(" — {}", rf.note)
            }
        );
    }
    if let Some(u) = &b.uncertainty {
        uncertainty_section(&mut o, b, u, input, s, precision);
    }
    o
}

/// Method §13 for one building: its distribution over the samples (score quantiles, share
/// per class, rank interval in the stock) and which factor moves the score most (Spearman
/// rank correlation of each factor's draw with the score over the same samples).
fn uncertainty_section(
    o: &mut String,
    b: &BuildingResult,
    u: &crate::results::BuildingUncertainty,
    input: &engine::BuildingInput<'_>,
    s: &crate::settings::Settings,
    precision: Precision,
) {
    let n = move |v: f64| num(v, precision);
    use crate::uncertainty::{BuildingSamples, Evaluator, FACTOR_NAMES};
    let _ = writeln!(
        o,
        "§13 Uncertainty: {} samples, seed {}; score p05 {} | p50 {} | p95 {}; rank p05 {} | p50 {} | p95 {}",
        u.samples,
        s.seed,
        n(u.score.p05),
        n(u.score.p50),
        n(u.score.p95),
        u.rank.p05,
        u.rank.p50,
        u.rank.p95
    );
    let _ = writeln!(
        o,
        "  share of samples per class: 1 {} | 2 {} | 3 {} | 4 {}; p_deficit {}; p_top_k {}; survey value {}",
        n(u.p_class.c1),
        n(u.p_class.c2),
        n(u.p_class.c3),
        n(u.p_class.c4),
        n(u.p_deficit),
        n(u.p_top_k),
        n(u.survey_value)
    );
    let (bf, bw) = crate::uncertainty::material_betas(&b.defaults_used, s);
    let _ = writeln!(
        o,
        "  dispersions β: D {} | Cw, Cc {} | F {} ({}) | W {} ({}) | H {}",
        n(s.beta_demand),
        n(s.beta_capacity),
        n(bf),
        if b.defaults_used.iter().any(|d| d == "fc_mpa") {
            "fc defaulted"
        } else {
            "fc given"
        },
        n(bw),
        if b.defaults_used.iter().any(|d| d == "floor_weight_kpa") {
            "w defaulted"
        } else {
            "w given"
        },
        n(s.beta_hazard)
    );
    let Ok(ev) = Evaluator::new(input, s) else {
        return;
    };
    let draws = BuildingSamples::draw(&ev, &b.id, &b.district, &b.defaults_used, s);
    let corr = draws.correlations();
    let mut ranked: Vec<(usize, f64)> = corr
        .iter()
        .enumerate()
        .filter_map(|(k, c)| c.map(|c| (k, c)))
        .collect();
    ranked.sort_by(|a, b| b.1.abs().total_cmp(&a.1.abs()).then(a.0.cmp(&b.0)));
    let list: Vec<String> = ranked
        .iter()
        .map(|(k, c)| format!("{} {}", FACTOR_NAMES[*k], n(*c)))
        .collect();
    let _ = writeln!(
        o,
        "  rank correlation of each factor with the score (Spearman): {}",
        if list.is_empty() {
            "none (no factor varies)".to_string()
        } else {
            list.join(" | ")
        }
    );
    if let Some((k, _)) = ranked.first() {
        let _ = writeln!(o, "  moves the score most: {}", FACTOR_NAMES[*k]);
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::{BuildingRecord, GroundType, Inventory, NotScreened, Use, YesNo};
    use crate::results::InputInfo;
    use crate::settings::Settings;
    use std::collections::HashMap;

    fn rec(id: &str, agr: Option<f64>, row: usize) -> BuildingRecord {
        BuildingRecord {
            row,
            id: id.into(),
            name: "Invented".into(),
            use_: Some(Use::School),
            storeys: 3,
            storey_height_m: Some(3.0),
            plan_area_m2: 150.0,
            column_area_m2: 1.5,
            rc_wall_area_x_m2: Some(2.0),
            boundary_elements: Some(YesNo::Unknown),
            ground_type: Some(GroundType::B),
            agr_g: agr,
            occupants: Some(40),
            ..Default::default()
        }
    }

    fn loaded() -> Loaded {
        let inventory = Inventory {
            buildings: vec![
                rec("E1", Some(0.25), 2),
                rec("E2", None, 3),
                rec("E3", Some(0.4), 4),
            ],
            not_screened: vec![NotScreened {
                sheet: "buildings".into(),
                row: 5,
                id: "E4".into(),
                reasons: vec!["plan_area_m2 missing".into()],
            }],
            rows: 4,
            ..Default::default()
        };
        Loaded {
            input: InputInfo::default(),
            inventory,
            settings: Settings::default(),
            sites: HashMap::new(),
        }
    }

    #[test]
    fn explain_reproduces_screen_numbers() {
        let l = loaded();
        let report = crate::pipeline::screen(&l);
        let b = report.buildings.iter().find(|b| b.id == "E1").unwrap();
        let text = explain_with(&l, &report, "E1", Precision::Full).unwrap();
        if std::env::var_os("SHOW_EXPLAIN").is_some() {
            println!("{text}");
        }
        assert!(text.contains(&format!("score {}", b.score)), "{text}");
        assert!(text.contains(&format!("rank {} of 2", b.rank)));
        assert!(text.contains(&format!(
            "roof drift δ_r = d_t/H = {}",
            b.directions.x.roof_drift_demand
        )));
        assert!(text.contains("[default: "), "defaults are marked");
        assert!(text.contains("fc = 20 MPa  [default: fc_mpa]"));
        for step in [
            "§0", "§1", "§2", "§3", "§4", "§5", "§6", "§7", "§8", "§9", "§10", "§11",
        ] {
            assert!(text.contains(step), "{step}");
        }
    }

    #[test]
    fn explain_prints_four_significant_digits_by_default() {
        let l = loaded();
        let report = crate::pipeline::screen(&l);
        let b = report.buildings.iter().find(|b| b.id == "E1").unwrap();
        let text = explain(&l, &report, "E1").unwrap();
        let score = crate::report::people::sig4(b.score).unwrap();
        assert!(text.contains(&format!("score {score} ")), "{text}");
        let drift = crate::report::people::sig4(b.directions.x.roof_drift_demand).unwrap();
        assert!(text.contains(&format!("roof drift δ_r = d_t/H = {drift}")));
        assert!(!text.contains("null") && !text.contains("NaN"), "{text}");
        // No number in the text has more than 4 significant digits (method step numbers,
        // clause numbers and years aside, which are written without a decimal point).
        for word in text.split(|c: char| !(c.is_ascii_digit() || c == '.')) {
            let w = word.trim_matches('.');
            if w.contains('.') && w.chars().filter(|c| *c == '.').count() == 1 {
                let digits: String = w.chars().filter(char::is_ascii_digit).collect();
                let sig = digits.trim_start_matches('0');
                assert!(sig.len() <= 4, "{w} in {text}");
            }
        }
        // `--full` keeps full precision.
        let full = explain_with(&l, &report, "E1", Precision::Full).unwrap();
        assert!(full.contains(&format!("score {} ", b.score)));
    }

    #[test]
    fn explain_with_samples_shows_the_distribution_and_the_strongest_factor() {
        let mut l = loaded();
        l.settings.samples = 50;
        let report = crate::pipeline::screen(&l);
        let text = explain_with(&l, &report, "E1", Precision::Full).unwrap();
        let b = report.buildings.iter().find(|b| b.id == "E1").unwrap();
        let u = b.uncertainty.as_ref().unwrap();
        assert!(
            text.contains(&format!("score p05 {}", u.score.p05)),
            "{text}"
        );
        assert!(text.contains("share of samples per class"));
        // H has β = 0 by default: never named; the strongest factor is one that varies.
        assert!(text.contains("moves the score most: "), "{text}");
        assert!(!text.contains("moves the score most: H"), "{text}");
        assert!(
            !text.contains("H (hazard) "),
            "β_H = 0: no correlation listed"
        );
    }

    #[test]
    fn explain_says_why_not_screened() {
        let l = loaded();
        let report = crate::pipeline::screen(&l);
        let t = explain(&l, &report, "E2").unwrap();
        assert!(
            t.contains("could not be screened") && t.contains("no hazard given"),
            "{t}"
        );
        let t = explain(&l, &report, "E4").unwrap();
        assert!(t.contains("plan_area_m2 missing"));
        assert!(explain(&l, &report, "nope").is_none());
    }
}
