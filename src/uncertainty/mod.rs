/*!
Method §13: uncertainty and rank robustness (`--samples N`).

The deterministic run (§0–§11 on median inputs, §12 sizing and the budget plan) is left as
it is; this stage re-runs the class, score and order N times with the lognormal factors of
§13 ([`sample::Factors`]), drawn with the portable generator of [`draws`], and summarises
per building (p_class, p_deficit, score and rank quantiles, p_top_k, survey_value) and for
the stock (class 1–2 count quantiles, "survey next", expected occupants protected per plan).

Layout (memory ≈ 13·B·N bytes for B buildings and N samples, plus one evaluator per
building): the samples are evaluated building by building in parallel (each building's
factor-independent part stays in cache for its N samples) into a class (u8) and a score
(f64) per building and sample; then each sample's §11 order of the whole stock is sorted
(in parallel over samples) into a rank (u32) per building and sample. Every value depends on
the building, the sample index and the seed only, so the results are the same for any
thread count and run.
*/

use std::collections::{BTreeMap, HashMap};

use rayon::prelude::*;

use crate::engine::BuildingInput;
use crate::results::{
    BudgetPlan, BuildingResult, BuildingUncertainty, ClassShares, Quantiles, StockUncertainty,
};
use crate::settings::Settings;

pub mod draws;
pub mod quantiles;
pub mod sample;

pub use sample::{Evaluator, Factors, Sample};

/// Number of samples `demo` draws (method §13: N = 200): the bundled demo settings
/// (`inventories/demo-settings.toml`, and so the demo workbook's settings sheet) set it, so
/// that the demo command and a plain `screen` of the demo files agree.
pub const DEMO_SAMPLES: u32 = 200;

/// Bytes the stage holds per building and sample: class (u8), score (f64), rank (u32).
pub const BYTES_PER_BUILDING_SAMPLE: u64 = 13;
/// Largest sample store `screen` accepts (4 GiB): beyond it the run is refused up front
/// instead of failing an allocation (which aborts the process).
pub const MAX_STORE_BYTES: u64 = 4 << 30;

/// The bytes of the per-building, per-sample store for `buildings` × `samples`.
pub fn store_bytes(buildings: usize, samples: u32) -> u64 {
    (buildings as u64)
        .saturating_mul(u64::from(samples))
        .saturating_mul(BYTES_PER_BUILDING_SAMPLE)
}

/// Number of buildings named under "survey next" (method §13).
pub const SURVEY_NEXT: usize = 10;

/// The canonical name under which a defaulted concrete strength is listed.
const FC_KEY: &str = "fc_mpa";
/// The canonical name under which a defaulted floor weight is listed.
const W_KEY: &str = "floor_weight_kpa";

/// The five standard normal draws of a building in one sample, in the order of method §13
/// (z_D, z_Cw, z_Cc, z_F, z_W), from the stream key(id).
pub fn building_normals(id: &str, seed: u64, sample: u64) -> [f64; 5] {
    let mut st = draws::Stream::new(draws::key(id), seed, sample);
    [
        st.next_normal(),
        st.next_normal(),
        st.next_normal(),
        st.next_normal(),
        st.next_normal(),
    ]
}

/// The draw z_H of a district (name as the JSON writes it; "" for none) in one sample.
pub fn district_normal(district: &str, seed: u64, sample: u64) -> f64 {
    draws::Stream::new(draws::district_key(district), seed, sample).next_normal()
}

/// The dispersions of one building: (β_F, β_W) by whether fc and w were defaulted
/// (listed in `defaults_used`; an era-table fc counts as defaulted).
pub fn material_betas(defaults_used: &[String], s: &Settings) -> (f64, f64) {
    let has = |k: &str| defaults_used.iter().any(|d| d == k);
    (
        if has(FC_KEY) {
            s.beta_fc_default
        } else {
            s.beta_fc_given
        },
        if has(W_KEY) {
            s.beta_weight_default
        } else {
            s.beta_weight_given
        },
    )
}

/// Lognormal factors X = exp(β·z) from the building's five draws and its district's z_H.
pub fn factors(z: &[f64; 5], z_h: f64, beta_f: f64, beta_w: f64, s: &Settings) -> Factors {
    Factors {
        d: (s.beta_demand * z[0]).exp(),
        cw: (s.beta_capacity * z[1]).exp(),
        cc: (s.beta_capacity * z[2]).exp(),
        f: (beta_f * z[3]).exp(),
        w: (beta_w * z[4]).exp(),
        h: (s.beta_hazard * z_h).exp(),
    }
}

/// The per-sample outcome store: class and score of building i in sample j at i·N + j.
struct Outcomes {
    n: usize,
    class: Vec<u8>,
    score: Vec<f64>,
}

/// Ordered bits of a double, so that integer order is `f64::total_cmp` order.
fn total_order_bits(x: f64) -> u64 {
    let b = x.to_bits();
    if b >> 63 == 1 { !b } else { b | (1 << 63) }
}

/// The sort key of a building in one sample: class ascending, score descending, then the
/// static tie-breaks of §11 (occupants, min PI, id, row) as one position.
fn order_key(class: u8, score: f64, static_pos: u32) -> u128 {
    (u128::from(class) << 96)
        | (u128::from(!total_order_bits(score)) << 32)
        | u128::from(static_pos)
}

/// Runs method §13 on a ranked, sized and planned stock: fills each building's
/// `uncertainty`, each plan's `expected_occupants_protected`, and returns the stock
/// outputs. `None` when N = 0 or nothing was screened. `inputs` are the buildings' rows (any
/// order; matched on the spreadsheet row).
pub fn run(
    buildings: &mut [BuildingResult],
    inputs: &[BuildingInput<'_>],
    s: &Settings,
    plan: Option<&mut BudgetPlan>,
) -> Option<StockUncertainty> {
    let n = s.samples as usize;
    if n == 0 || buildings.is_empty() {
        return None;
    }
    let by_row: HashMap<usize, &BuildingInput<'_>> =
        inputs.iter().map(|i| (i.record.row, i)).collect();
    let evaluators: Vec<Option<Evaluator>> = buildings
        .par_iter()
        .map(|b| by_row.get(&b.row).and_then(|i| Evaluator::new(i, s).ok()))
        .collect();
    // District draws: one per district and sample.
    let mut districts: BTreeMap<&str, usize> = BTreeMap::new();
    for b in buildings.iter() {
        let k = districts.len();
        districts.entry(b.district.as_str()).or_insert(k);
    }
    let district_of: Vec<usize> = buildings
        .iter()
        .map(|b| districts.get(b.district.as_str()).copied().unwrap_or(0))
        .collect();
    let mut z_h = vec![0.0; districts.len() * n];
    for (name, &k) in &districts {
        for j in 0..n {
            z_h[k * n + j] = district_normal(name, s.seed, j as u64 + 1);
        }
    }
    // Building-major evaluation.
    let mut out = Outcomes {
        n,
        class: vec![0; buildings.len() * n],
        score: vec![0.0; buildings.len() * n],
    };
    out.class
        .par_chunks_mut(n)
        .zip(out.score.par_chunks_mut(n))
        .enumerate()
        .for_each(|(i, (cls, sc))| {
            let b = &buildings[i];
            let Some(ev) = &evaluators[i] else {
                // Not re-screenable (cannot happen for a screened building): keep its
                // deterministic outcome in every sample.
                cls.fill(b.class);
                sc.fill(b.score);
                return;
            };
            let (bf, bw) = material_betas(&b.defaults_used, s);
            let dk = district_of[i];
            for j in 0..n {
                let z = building_normals(&b.id, s.seed, j as u64 + 1);
                let f = factors(&z, z_h[dk * n + j], bf, bw, s);
                let smp = ev.evaluate(&f, s);
                cls[j] = smp.class;
                sc[j] = smp.score;
            }
        });
    drop(evaluators);
    let ranks = sample_ranks(buildings, &out);
    let top_k = match s.top_k {
        Some(k) => (k.max(1), "setting top_k"),
        None => match plan.as_deref() {
            Some(p) => (
                (p.priority_walk.funded.len() as u64).max(1),
                "buildings funded by the priority walk",
            ),
            None => (
                (buildings.iter().filter(|b| b.class <= 2).count() as u64).max(1),
                "class 1-2 buildings of the deterministic run",
            ),
        },
    };
    let nb = buildings.len();
    let per: Vec<BuildingUncertainty> = (0..nb)
        .into_par_iter()
        .map(|i| {
            let cls = &out.class[i * n..(i + 1) * n];
            let mut scores = out.score[i * n..(i + 1) * n].to_vec();
            let mut rk: Vec<u32> = (0..n).map(|j| ranks[j * nb + i]).collect();
            summarise(
                cls,
                &mut scores,
                &mut rk,
                top_k.0,
                buildings[i].occupants,
                s.samples,
            )
        })
        .collect();
    let mut counts: Vec<u64> = (0..n)
        .map(|j| (0..nb).filter(|&i| out.class[i * n + j] <= 2).count() as u64)
        .collect();
    let [c05, c50, c95] = quantiles::p05_p50_p95_int(&mut counts)?;
    for (b, u) in buildings.iter_mut().zip(per) {
        b.uncertainty = Some(u);
    }
    let survey_next = survey_next(buildings);
    if let Some(plan) = plan {
        let pd: HashMap<&str, (f64, u64)> = buildings
            .iter()
            .rev()
            .map(|b| {
                (
                    b.id.as_str(),
                    (
                        b.uncertainty.as_ref().map_or(0.0, |u| u.p_deficit),
                        b.occupants.unwrap_or(0),
                    ),
                )
            })
            .collect();
        for p in [&mut plan.priority_walk, &mut plan.max_occupants] {
            p.expected_occupants_protected = Some(expected_protected(&p.funded, &pd));
        }
    }
    Some(StockUncertainty {
        samples: s.samples,
        seed: s.seed,
        top_k: top_k.0,
        class_1_2_count: Quantiles {
            p05: c05,
            p50: c50,
            p95: c95,
        },
        survey_next,
        top_k_source: top_k.1.to_string(),
    })
}

/// Σ p_deficit·occupants over a plan's funded ids (method §13).
fn expected_protected(funded: &[String], pd: &HashMap<&str, (f64, u64)>) -> f64 {
    funded
        .iter()
        .filter_map(|id| pd.get(id.as_str()))
        .map(|&(p, occ)| p * occ as f64)
        .sum()
}

/// Per sample, the §11 order of the whole stock: rank (1-based) of building i in sample j at
/// j·B + i.
fn sample_ranks(buildings: &[BuildingResult], out: &Outcomes) -> Vec<u32> {
    let nb = buildings.len();
    let n = out.n;
    // Static tie-breaks of §11 (occupants descending, min PI ascending, id, row) as one
    // position: the deterministic order with class and score left out.
    let mut idx: Vec<usize> = (0..nb).collect();
    idx.sort_by(|&a, &b| {
        let (x, y) = (&buildings[a], &buildings[b]);
        y.occupants
            .unwrap_or(0)
            .cmp(&x.occupants.unwrap_or(0))
            .then_with(|| {
                x.min_priority_index_pct()
                    .total_cmp(&y.min_priority_index_pct())
            })
            .then_with(|| x.id.as_bytes().cmp(y.id.as_bytes()))
            .then_with(|| x.row.cmp(&y.row))
    });
    let mut static_pos = vec![0u32; nb];
    for (p, &i) in idx.iter().enumerate() {
        static_pos[i] = p as u32;
    }
    let mut ranks = vec![0u32; nb * n];
    ranks.par_chunks_mut(nb).enumerate().for_each(|(j, rk)| {
        let mut keys: Vec<u128> = (0..nb)
            .map(|i| order_key(out.class[i * n + j], out.score[i * n + j], static_pos[i]))
            .collect();
        keys.sort_unstable();
        // The low 32 bits name the building through its static position.
        let mut at = vec![0usize; nb];
        for (i, &p) in static_pos.iter().enumerate() {
            at[p as usize] = i;
        }
        for (r, k) in keys.iter().enumerate() {
            let i = at[(*k & 0xFFFF_FFFF) as usize];
            rk[i] = r as u32 + 1;
        }
    });
    ranks
}

/// The outputs of one building from its N classes, scores and ranks.
fn summarise(
    classes: &[u8],
    scores: &mut [f64],
    ranks: &mut [u32],
    top_k: u64,
    occupants: Option<u64>,
    samples: u32,
) -> BuildingUncertainty {
    let n = classes.len().max(1) as f64;
    let mut c = [0usize; 4];
    for &k in classes {
        c[usize::from(k.clamp(1, 4)) - 1] += 1;
    }
    let p_class = ClassShares {
        c1: c[0] as f64 / n,
        c2: c[1] as f64 / n,
        c3: c[2] as f64 / n,
        c4: c[3] as f64 / n,
    };
    let p_deficit = (c[0] + c[1]) as f64 / n;
    let top = ranks.iter().filter(|&&r| u64::from(r) <= top_k).count() as f64 / n;
    let sq = quantiles::p05_p50_p95(scores).unwrap_or([0.0; 3]);
    let rq = quantiles::p05_p50_p95_int(ranks).unwrap_or([0; 3]);
    BuildingUncertainty {
        samples,
        p_class,
        p_deficit,
        score: Quantiles {
            p05: sq[0],
            p50: sq[1],
            p95: sq[2],
        },
        rank: Quantiles {
            p05: u64::from(rq[0]),
            p50: u64::from(rq[1]),
            p95: u64::from(rq[2]),
        },
        p_top_k: top,
        survey_value: survey_value(occupants, p_deficit),
    }
}

/// survey_value = occupants (missing = 0) · 2·min(p_deficit, 1 − p_deficit) (method §13).
pub fn survey_value(occupants: Option<u64>, p_deficit: f64) -> f64 {
    occupants.unwrap_or(0) as f64 * 2.0 * p_deficit.min(1.0 - p_deficit)
}

/// The ten highest survey values above 0, ties to the better deterministic rank
/// (`buildings` in rank order).
pub fn survey_next(buildings: &[BuildingResult]) -> Vec<String> {
    let mut c: Vec<(f64, usize, &str)> = buildings
        .iter()
        .filter_map(|b| {
            let v = b.uncertainty.as_ref()?.survey_value;
            (v > 0.0).then_some((v, b.rank, b.id.as_str()))
        })
        .collect();
    c.sort_by(|a, b| b.0.total_cmp(&a.0).then(a.1.cmp(&b.1)));
    c.into_iter()
        .take(SURVEY_NEXT)
        .map(|(_, _, id)| id.to_string())
        .collect()
}

/// One building's own distribution (for `explain --samples N`): its samples in order,
/// with the five draws and z_H of each.
#[derive(Debug, Clone)]
pub struct BuildingSamples {
    /// Per sample: the draws (z_D, z_Cw, z_Cc, z_F, z_W, z_H), the factors and the outcome.
    pub samples: Vec<([f64; 6], Factors, Sample)>,
}

/// Names of the six factors, in draw order.
pub const FACTOR_NAMES: [&str; 6] = [
    "D (demand)",
    "Cw (wall capacity)",
    "Cc (column capacity)",
    "F (concrete)",
    "W (weight)",
    "H (hazard)",
];

impl BuildingSamples {
    /// Draws and evaluates the N samples of one building (`district` as the JSON writes it).
    pub fn draw(
        ev: &Evaluator,
        id: &str,
        district: &str,
        defaults_used: &[String],
        s: &Settings,
    ) -> Self {
        let (bf, bw) = material_betas(defaults_used, s);
        let samples = (1..=u64::from(s.samples))
            .map(|j| {
                let z = building_normals(id, s.seed, j);
                let zh = district_normal(district, s.seed, j);
                let f = factors(&z, zh, bf, bw, s);
                ([z[0], z[1], z[2], z[3], z[4], zh], f, ev.evaluate(&f, s))
            })
            .collect();
        BuildingSamples { samples }
    }
    /// Score p05/p50/p95.
    pub fn score_quantiles(&self) -> Option<[f64; 3]> {
        let mut v: Vec<f64> = self.samples.iter().map(|x| x.2.score).collect();
        quantiles::p05_p50_p95(&mut v)
    }
    /// Share of samples per class 1–4.
    pub fn class_shares(&self) -> [f64; 4] {
        let n = self.samples.len().max(1) as f64;
        let mut c = [0.0; 4];
        for x in &self.samples {
            c[usize::from(x.2.class.clamp(1, 4)) - 1] += 1.0;
        }
        c.map(|v| v / n)
    }
    /// Spearman rank correlation of each factor's draw with the score (None where the
    /// factor's β is 0 or the score is constant).
    pub fn correlations(&self) -> [Option<f64>; 6] {
        let score: Vec<f64> = self.samples.iter().map(|x| x.2.score).collect();
        let mut out = [None; 6];
        for (k, o) in out.iter_mut().enumerate() {
            let fac: Vec<f64> = self
                .samples
                .iter()
                .map(|x| {
                    let f = &x.1;
                    [f.d, f.cw, f.cc, f.f, f.w, f.h][k]
                })
                .collect();
            *o = quantiles::spearman(&fac, &score);
        }
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn order_key_follows_total_cmp_descending_scores() {
        let xs = [-1.0, 0.0, 0.5, 1.0, 2.0, f64::INFINITY];
        for a in xs {
            for b in xs {
                let ka = order_key(2, a, 0);
                let kb = order_key(2, b, 1);
                // Higher score first.
                if a > b {
                    assert!(ka < kb, "{a} {b}");
                }
            }
        }
        assert!(order_key(1, 0.1, 5) < order_key(2, 9.0, 0));
        assert!(order_key(2, 1.0, 3) < order_key(2, 1.0, 4));
    }

    #[test]
    fn survey_value_peaks_at_even_odds() {
        assert_eq!(survey_value(Some(100), 0.5), 100.0);
        assert_eq!(survey_value(Some(100), 1.0), 0.0);
        assert_eq!(survey_value(Some(100), 0.0), 0.0);
        assert_eq!(survey_value(None, 0.5), 0.0);
        assert!((survey_value(Some(10), 0.25) - 5.0).abs() < 1e-12);
    }
}
