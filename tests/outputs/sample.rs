//! Hand-built reports: every kind of value the writers must handle (formula-like text, long
//! text, missing and non-finite numbers, flags, walls, retrofits, a budget plan, rows not
//! screened and input problems). The numbers are invented, not engineering results.

use seistriage::model::{Dir, FaultDistance, NotScreened, PerDir, Problem, Severity, Use};
use seistriage::results::{
    BudgetPlan, BuildingDetail, BuildingResult, Counts, DefaultValue, DirectionDetail,
    DirectionResult, Excluded, Flag, FlagCode, FlagDetail, FundingPlan, Governing, Group, Groups,
    InputInfo, Levels, Retrofit, Screening, SoftStorey, SpectrumShape, StoreyData, WallResult,
};
use seistriage::settings::{GroundType, Level, Settings};

/// Names that a spreadsheet would run as formulas if they were not written as text.
pub const HOSTILE_NAMES: [&str; 4] = ["=1+1", "+SUM(A1:A2)", "-2+3", "@cmd"];

fn direction(i: usize, d: Dir, class: u8) -> DirectionResult {
    let k = i as f64;
    let dcr = match class {
        1 => 2.0 + 0.01 * k,
        2 => 1.2,
        3 => 0.8,
        _ => 0.3,
    } * if d == Dir::X { 1.0 } else { 0.9 };
    DirectionResult {
        wall_index_pct: 0.2 + 0.013 * k + if d == Dir::Y { 0.05 } else { 0.0 },
        column_index_pct: 0.1 + 0.007 * k,
        priority_index_pct: 0.3 + 0.02 * k,
        period_s: 0.3 + 0.01 * k,
        roof_drift_demand: 0.004 + 0.0001 * k,
        drift_demand: Groups {
            walls: (!i.is_multiple_of(3)).then_some(0.004 + 0.0001 * k),
            columns: Some(0.006 + 0.0001 * k),
        },
        capacity: Groups {
            walls: (!i.is_multiple_of(3)).then_some(Levels {
                io: 0.003,
                ls: 0.006,
                cp: 0.008,
            }),
            columns: Some(Levels {
                io: 0.004,
                ls: 0.009,
                cp: 0.012,
            }),
        },
        dcr: Levels {
            io: dcr * 1.6,
            ls: dcr,
            cp: dcr * 0.75,
        },
        frame_alone: None,
        group_dcr: Default::default(),
        detail: DirectionDetail {
            rc_wall_area_m2: 1.5,
            infill_area_m2: 4.0,
            rc_wall_index_pct: 0.15,
            strength_walls: 0.2,
            strength_columns: 0.1,
            alpha1: 0.7,
            strength_coefficient: 0.27,
            period_frame_s: 0.41,
            period_wall_s: (i.is_multiple_of(2)).then_some(0.33),
            ac_m2: 1.2,
            period_source: "formula",
            se_g: 0.72,
            sde_m: 0.0447,
            gamma: 1.3,
            say_g: 0.35,
            qu: 2.05,
            n2_branch: "short-period",
            dt_star_m: 0.05,
            roof_displacement_m: 0.065,
            kappa: 1.35,
            tc_s: 0.6,
            ..Default::default()
        },
    }
}

/// One building result, rank `i + 1`, in the given class.
pub fn building(i: usize, class: u8) -> BuildingResult {
    let name = match i {
        0 => HOSTILE_NAMES[0].to_string(),
        1 => HOSTILE_NAMES[1].to_string(),
        2 => HOSTILE_NAMES[2].to_string(),
        3 => HOSTILE_NAMES[3].to_string(),
        4 => "x".repeat(40_000),
        _ => format!("Invented block {i}"),
    };
    let has_retrofit = class <= 2;
    BuildingResult {
        id: format!("B{:04}", i + 1),
        name,
        district: ["Northfield", "Riverside", ""][i % 3].to_string(),
        use_: [Use::Residential, Use::School, Use::Hospital, Use::Office][i % 4],
        occupants: (!i.is_multiple_of(5)).then_some(20 + i as u64),
        latitude: (i % 4 != 3).then_some(40.0 + 0.001 * i as f64),
        longitude: (i % 4 != 3).then_some(22.0 + 0.002 * i as f64),
        fault: (i.is_multiple_of(2)).then(|| FaultDistance {
            name: "Invented trace".into(),
            distance_m: 1234.5 + i as f64,
        }),
        rank: i + 1,
        class,
        score: direction(i, Dir::X, class).dcr.ls,
        governing: Governing {
            direction: Dir::X,
            group: if i.is_multiple_of(3) {
                Group::Columns
            } else {
                Group::Walls
            },
            level: Level::Ls,
            frame_alone: false,
        },
        axial_load_ratio: 0.12,
        strength_coefficient: PerDir { x: 0.27, y: 0.3 },
        directions: PerDir {
            x: direction(i, Dir::X, class),
            y: direction(i, Dir::Y, class),
        },
        flags: if i.is_multiple_of(2) {
            vec![
                Flag::new(
                    Some(Dir::X),
                    FlagDetail::SoftStorey(SoftStorey {
                        r2: Some(0.55),
                        r_mean: None,
                        limit: 0.7,
                        limit_mean: 0.8,
                        infill_weight: 0.1,
                        data: StoreyData::Sheet,
                        added_m2: 0.0,
                    }),
                ),
                Flag::new(
                    Some(Dir::Y),
                    FlagDetail::SoftStorey(SoftStorey {
                        r2: Some(0.62),
                        r_mean: None,
                        limit: 0.7,
                        limit_mean: 0.8,
                        infill_weight: 0.1,
                        data: StoreyData::Sheet,
                        added_m2: 0.0,
                    }),
                ),
                Flag::new(
                    None,
                    FlagDetail::DefaultsUsed(vec![("fc_mpa".into(), DefaultValue::MPa(20.0))]),
                ),
            ]
        } else {
            Vec::new()
        },
        defaults_used: vec!["fc_mpa".into()],
        retrofit: has_retrofit.then(|| Retrofit {
            added_wall_area_m2: PerDir {
                x: Some(2.5 + i as f64),
                y: if i == 5 { None } else { Some(0.0) },
            },
            cost: (i != 5).then_some(100_000.0 + 1000.0 * i as f64),
            replacement_cost: Some(900_000.0),
            replace: Some(i == 5),
            flags_after: if i.is_multiple_of(2) {
                vec![FlagCode::SoftStorey]
            } else {
                Vec::new()
            },
            column_remedy: i == 3,
            funded: Some(i < 6),
            funded_best: Some(i % 2 == 1),
            excluded: None,
            // The note is the retrofit's own (the sizing writes it; the writers copy it).
            note: if i == 5 {
                format!(
                    "{} (direction y)",
                    seistriage::retrofit::sizing::NO_SOLUTION_NOTE
                )
            } else {
                String::new()
            },
        }),
        uncertainty: None,
        row: i + 2,
        detail: BuildingDetail {
            storeys: 4,
            floor_heights_m: vec![3.0, 6.0, 9.0, 12.0],
            height_m: 12.0,
            floor_area_m2: 1200.0,
            weight_kn: 14_400.0,
            fc_mpa: 20.0,
            fy_mpa: 420.0,
            column_area_m2: 2.4,
            beta: 1.0,
            agr_g: 0.24,
            agr_source: "settings",
            ground_type: "C".into(),
            gamma_i: 1.0,
            ag_g: 0.24,
            spectrum: SpectrumShape::Ec8 {
                type2: false,
                ground: GroundType::C,
                s: 1.15,
                tb_s: 0.2,
                tc_s: 0.6,
                td_s: 2.0,
            },
            eta: 1.0,
            boundary_elements: false,
            columns_detailed: false,
            wall_shear_span_m: 8.75,
            ..Default::default()
        },
        walls: (0..(i % 3))
            .map(|w| WallResult {
                wall_id: format!("W{w}"),
                direction: Some(if w % 2 == 0 { Dir::X } else { Dir::Y }),
                representative: false,
                count: 1.0,
                length_m: 4.0,
                thickness_m: 0.25,
                boundary_elements: w == 0,
                axial_load_ratio: 0.12,
                shear_span_m: 8.75,
                theta_y: 0.0031,
                theta_um: 0.0105,
                capacity: Levels {
                    io: 0.0031,
                    ls: 0.0079,
                    cp: 0.0105,
                },
                new: false,
            })
            .collect(),
    }
}

/// A report of `n` buildings spread over the four classes in rank order.
pub fn report(n: usize) -> Screening {
    let buildings: Vec<BuildingResult> = (0..n)
        .map(|i| {
            let class = match i * 4 / n.max(1) {
                0 => 1,
                1 => 2,
                2 => 3,
                _ => 4,
            };
            building(i, class)
        })
        .collect();
    let settings = Settings {
        agr_g: Some(0.24),
        budget: Some(500_000.0),
        unit_cost_wall_m3: Some(800.0),
        unit_cost_floor_m2: Some(50.0),
        replacement_cost_m2: Some(750.0),
        ..Settings::default()
    };
    let walk: Vec<String> = buildings
        .iter()
        .filter(|b| b.retrofit.as_ref().and_then(|r| r.funded) == Some(true))
        .map(|b| b.id.clone())
        .collect();
    let not_screened = vec![
        NotScreened {
            sheet: "buildings".into(),
            row: 40,
            id: "=HYPERLINK(\"x\")".into(),
            reasons: vec!["storeys: expected a whole number, found 2.5".into()],
        },
        NotScreened {
            sheet: "buildings".into(),
            row: 41,
            id: String::new(),
            reasons: vec!["id missing".into(), "plan_area_m2 missing".into()],
        },
    ];
    let problems = vec![Problem {
        sheet: "buildings".into(),
        row: Some(7),
        column: "fc_mpa".into(),
        message: "blank; the default 20 MPa is used".into(),
        severity: Severity::Warning,
    }];
    let counts = Counts::tally(n + 2, 1, not_screened.len(), &buildings);
    Screening {
        tool: "seistriage",
        version: env!("CARGO_PKG_VERSION"),
        input: InputInfo {
            file: "invented-district.xlsx".into(),
            sha256: "ab".repeat(32),
        },
        settings,
        counts,
        budget_plan: Some(BudgetPlan {
            budget: 500_000.0,
            priority_walk: FundingPlan {
                funded: walk,
                cost: 420_000.0,
                occupants_protected: 120,
                method: None,
                expected_occupants_protected: None,
            },
            max_occupants: FundingPlan {
                funded: vec!["B0002".into()],
                cost: 101_000.0,
                occupants_protected: 21,
                method: Some("exact 0/1 knapsack".into()),
                expected_occupants_protected: None,
            },
            excluded: vec![Excluded {
                id: "B0007".into(),
                reason: "column remedy without a price (unit_cost_short_column_m2 not set)".into(),
            }],
        }),
        uncertainty: None,
        buildings,
        not_screened,
        problems,
    }
}
