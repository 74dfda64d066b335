//! Verification: the wall yield curvature of method §8, φy = 2.0·εy/lw (Priestley, Calvi &
//! Kowalsky 2007, "Displacement-Based Seismic Design of Structures", IUSS Press, §4.2,
//! eq. 4.57b for rectangular walls — equation number from memory), against an independent
//! fibre moment–curvature analysis of the same rectangular wall section by the maintained
//! section library `concreteproperties` (PyPI, pinned in tests/section/requirements.txt,
//! installed by `bash tests/section/setup.sh` into target/pyenv; the script is
//! tests/section/wall_phi_y.py, which states its section and material model).
//!
//! Section (the issue's): lw × tw = 0.25 m; boundary steel 1 % (the contract's default
//! `boundary_steel_ratio`) over 0.1·lw at each end; web steel 0.25 % (the default
//! `web_steel_ratio` of the `boundary-needed` check, §10); fy 420 MPa; fc, ν and lw over the
//! corners and the middle of fc 20–30 MPa, ν 0.05–0.3, lw 3–8 m. Yield curvature from the
//! library: first yield (extreme tension bar at εy, or extreme concrete fibre at 0.002)
//! extrapolated to the nominal moment (concrete 0.004 or steel 0.015), φy = φ'y·Mn/M'y —
//! the bilinear idealisation of Priestley et al. (2007) §4.2 (limit strains from memory).
//!
//! Tolerance 20 % (the issue's). The scatter it rests on: Priestley et al. (2007) report
//! that their dimensionless yield curvature φy·lw/εy of rectangular walls stays within
//! about ±10 % of 2.0 over the usual range of axial load and reinforcement (from memory);
//! the remaining margin covers the differences of the section model (unconfined modified
//! Mander concrete without tension, elastic–perfectly plastic steel, lumped bar lines).
//! Measured when written (φy·lw/εy of the fibre analysis; 2.0·εy/lw over it):
//!   lw 3 m, fc 20, ν 0.05: 1.72, 1.16    lw 8 m, fc 20, ν 0.05: 1.69, 1.18
//!   lw 5 m, fc 25, ν 0.15: 1.81, 1.10    lw 3 m, fc 30, ν 0.30: 2.00, 1.00
//!   lw 8 m, fc 30, ν 0.30: 1.98, 1.01
//! so the approximation holds at moderate axial load and overestimates φy by up to 18 % at
//! low axial load with elastic–perfectly plastic steel (no strain hardening lowers Mn and
//! with it the extrapolated φy): inside the band, but near its edge there.
//!
//! A second test checks the neutral-axis estimate of the `boundary-needed` check (§10)
//! against the same library's ultimate analysis.
//!
//! The tests need the local environment: when it is missing the test FAILS and says how to
//! install it (no silent skip). The yield-curvature test takes
//! one to two and a half minutes (two worker processes), the neutral-axis test seconds.

use std::io::Write;
use std::path::PathBuf;
use std::process::{Command, Stdio};

use seistriage::engine::capacity::phi_y;
use seistriage::engine::flags::neutral_axis_m;
use seistriage::settings::Settings;

/// The contract's default ratios (method §8 boundary steel, §10 web steel).
const RHO_BOUNDARY: f64 = 0.01;
const RHO_WEB: f64 = 0.0025;
const FY_MPA: f64 = 420.0;
const TW_M: f64 = 0.25;
/// The agreement band (see the module doc for the published scatter).
const TOL: f64 = 0.20;

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

fn python() -> PathBuf {
    root().join("target/pyenv/bin/python")
}

/// (lw m, fc MPa, ν): corners of the ranges and one middle case.
const CASES: [(f64, f64, f64); 5] = [
    (3.0, 20.0, 0.05),
    (8.0, 20.0, 0.05),
    (5.0, 25.0, 0.15),
    (3.0, 30.0, 0.30),
    (8.0, 30.0, 0.30),
];

/// Runs tests/section/wall_phi_y.py on `cases`; fails loudly when the environment is missing.
fn run_script(cases: &[serde_json::Value]) -> Vec<serde_json::Value> {
    let py = python();
    assert!(
        py.exists(),
        "the section library is not installed: {} is missing. Run `bash tests/section/setup.sh` \
         (creates target/pyenv with concreteproperties from PyPI; .ci/run does it before \
         cargo test)",
        py.display()
    );
    let mut child = Command::new(&py)
        .arg(root().join("tests/section/wall_phi_y.py"))
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("start the section script");
    child
        .stdin
        .take()
        .unwrap()
        .write_all(serde_json::to_string(&cases).unwrap().as_bytes())
        .unwrap();
    let out = child.wait_with_output().expect("section script");
    assert!(
        out.status.success(),
        "tests/section/wall_phi_y.py failed (is the environment complete? run `bash \
         tests/section/setup.sh`):\n{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let results: Vec<serde_json::Value> =
        serde_json::from_slice(&out.stdout).expect("JSON from the section script");
    assert_eq!(results.len(), cases.len());
    results
}

#[test]
fn wall_yield_curvature_against_fibre_section_analysis() {
    let cases: Vec<serde_json::Value> = CASES
        .iter()
        .map(|&(lw, fc, nu)| {
            serde_json::json!({
                "lw_m": lw, "tw_m": TW_M, "fc_mpa": fc, "fy_mpa": FY_MPA, "nu": nu,
                "rho_boundary": RHO_BOUNDARY, "rho_web": RHO_WEB,
            })
        })
        .collect();
    let results = run_script(&cases);

    let s = Settings::default();
    let mut report = String::new();
    let mut worst = 0.0f64;
    for (r, &(lw, fc, nu)) in results.iter().zip(CASES.iter()) {
        let fibre = r["phi_y"].as_f64().unwrap();
        let first = r["phi_y_first"].as_f64().unwrap();
        let engine = phi_y(s.phi_y_wall, FY_MPA / s.es_mpa, lw);
        // The library's analysis must be a real one: first yield before the extrapolated
        // yield, and a nominal moment above the first-yield moment.
        assert!(first > 0.0 && first <= fibre, "{r}");
        assert!(
            r["m_n_knm"].as_f64().unwrap() > r["m_y_first_knm"].as_f64().unwrap(),
            "{r}"
        );
        let ratio = engine / fibre;
        worst = worst.max((ratio - 1.0).abs());
        report.push_str(&format!(
            "lw {lw} m fc {fc} nu {nu}: fibre {fibre:.4e} 1/m (first yield {first:.4e}, by {}), \
             2.0 eps_y/lw {engine:.4e} 1/m, ratio {ratio:.3}\n",
            r["first_yield_by"]
        ));
    }
    println!("{report}");
    assert!(
        worst <= TOL,
        "φy = 2.0·εy/lw differs from the fibre analysis by more than 20 %:\n{report}"
    );
    // The check can fail: with a coefficient 30 % off (1.4 or 2.6 instead of 2.0) at least
    // one case of the grid falls outside the band.
    for wrong in [1.4, 2.6] {
        let worst_wrong = results
            .iter()
            .map(|r| {
                let e = phi_y(wrong, FY_MPA / s.es_mpa, r["lw_m"].as_f64().unwrap());
                (e / r["phi_y"].as_f64().unwrap() - 1.0).abs()
            })
            .fold(0.0f64, f64::max);
        assert!(
            worst_wrong > TOL,
            "coefficient {wrong} would pass: {worst_wrong}"
        );
    }
}

/// (lw m, fc MPa, ν) for the neutral-axis check.
const NA_CASES: [(f64, f64, f64); 3] = [(3.0, 25.0, 0.05), (4.0, 20.0, 0.10), (6.0, 30.0, 0.30)];

#[test]
fn boundary_check_neutral_axis_estimate_against_the_library() {
    // Method §10 `boundary-needed`: c = lw·(ν + ω_v)/(0.85·β1 + 2·ω_v), ω_v = ρ_v·fy/fc (the
    // closed form for a rectangular wall with uniformly distributed vertical steel, all bars
    // yielded; recalled from memory) against the neutral-axis depth of the library's ultimate
    // analysis with the ACI 318-19 §22.2 assumptions (stress block 0.85·fc over β1·c,
    // Table 22.2.2.4.3; εcu = 0.003; bar lines at about 250 mm). ρ_v = 0.25 % (ACI 318-19
    // §18.10.2.1 minimum, the default), fy 420 MPa. Tolerance 5 %: the closed form takes every
    // bar as yielded, the bars next to the neutral axis are not. Measured when written:
    // within 1.5 % (c = 0.338, 0.734, 2.581 m).
    let cases: Vec<serde_json::Value> = NA_CASES
        .iter()
        .map(|&(lw, fc, nu)| {
            serde_json::json!({
                "analysis": "neutral_axis", "lw_m": lw, "tw_m": TW_M, "fc_mpa": fc,
                "fy_mpa": FY_MPA, "nu": nu, "rho_web": RHO_WEB,
            })
        })
        .collect();
    let results = run_script(&cases);
    for (r, &(lw, fc, nu)) in results.iter().zip(NA_CASES.iter()) {
        let lib = r["c_m"].as_f64().unwrap();
        assert!(lib > 0.0 && lib < lw, "{r}");
        let engine = neutral_axis_m(lw, nu, RHO_WEB, FY_MPA, fc);
        assert!(
            (engine / lib - 1.0).abs() <= 0.05,
            "lw {lw} fc {fc} nu {nu}: estimate {engine} m, library {lib} m"
        );
    }
}
