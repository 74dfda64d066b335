/*!
Changes since a previous run (`screen --previous OLD.json`): buildings whose class changed,
rank moves of more than `changes_rank_threshold` places, buildings new or gone, and plan
membership that changed. The previous run is read from its JSON results (`interface.md`
field names); only the fields compared here are read, so a JSON from an older version of the
tool with more or fewer fields still compares. The comparison feeds the workbook's `Changes`
sheet and the brief's section.
*/

use std::collections::{HashMap, HashSet};
use std::path::Path;

use serde::Deserialize;

use super::ReportError;
use crate::results::Screening;

#[derive(Debug, Deserialize)]
struct OldDoc {
    #[serde(default)]
    version: String,
    #[serde(default)]
    input: Option<OldInput>,
    #[serde(default)]
    buildings: Vec<OldBuilding>,
    #[serde(default)]
    budget_plan: Option<OldPlan>,
}

#[derive(Debug, Deserialize)]
struct OldInput {
    #[serde(default)]
    file: String,
    #[serde(default)]
    sha256: String,
}

#[derive(Debug, Deserialize)]
struct OldBuilding {
    id: String,
    #[serde(default)]
    name: String,
    class: u8,
    rank: usize,
    #[serde(default)]
    score: Option<f64>,
}

#[derive(Debug, Deserialize)]
struct OldPlan {
    priority_walk: OldFunded,
    max_occupants: OldFunded,
}

#[derive(Debug, Deserialize)]
struct OldFunded {
    #[serde(default)]
    funded: Vec<String>,
}

/// One building of the previous run.
#[derive(Debug, Clone, PartialEq)]
pub struct PreviousBuilding {
    /// Id.
    pub id: String,
    /// Name.
    pub name: String,
    /// Class 1–4.
    pub class: u8,
    /// Rank.
    pub rank: usize,
    /// Score (governing DCR), when it was a number.
    pub score: Option<f64>,
}

/// The previous run, as far as the comparison needs it.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Previous {
    /// The JSON file read.
    pub file: String,
    /// Tool version that wrote it.
    pub version: String,
    /// Its input file and checksum.
    pub input_file: String,
    /// SHA-256 of its input file.
    pub input_sha256: String,
    /// Its screened buildings.
    pub buildings: Vec<PreviousBuilding>,
    /// Plan A (priority walk) and Plan B (max occupants) of the previous run; `None` when
    /// it had no budget plan.
    pub plans: Option<(HashSet<String>, HashSet<String>)>,
}

/// Reads a previous run's JSON results.
pub fn read_previous(path: &Path) -> Result<Previous, ReportError> {
    let text = std::fs::read(path)?;
    let doc: OldDoc = serde_json::from_slice(&text)?;
    Ok(Previous {
        file: path.display().to_string(),
        version: doc.version,
        input_file: doc
            .input
            .as_ref()
            .map(|i| i.file.clone())
            .unwrap_or_default(),
        input_sha256: doc.input.map(|i| i.sha256).unwrap_or_default(),
        buildings: doc
            .buildings
            .into_iter()
            .map(|b| PreviousBuilding {
                id: b.id,
                name: b.name,
                class: b.class,
                rank: b.rank,
                score: b.score,
            })
            .collect(),
        plans: doc.budget_plan.map(|p| {
            (
                p.priority_walk.funded.into_iter().collect(),
                p.max_occupants.funded.into_iter().collect(),
            )
        }),
    })
}

/// What kind of change a row of the comparison is.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum ChangeKind {
    /// The class changed.
    Class,
    /// The rank moved by more than the threshold.
    Rank,
    /// In this run, not in the previous one.
    New,
    /// In the previous run, not screened in this one.
    Gone,
    /// Plan A or Plan B membership changed.
    Plan,
}

impl ChangeKind {
    /// Plain words for the workbook and the brief.
    pub fn words(self) -> &'static str {
        match self {
            ChangeKind::Class => "class changed",
            ChangeKind::Rank => "rank moved",
            ChangeKind::New => "new building",
            ChangeKind::Gone => "no longer screened",
            ChangeKind::Plan => "plan membership changed",
        }
    }
}

/// One change of one building.
#[derive(Debug, Clone, PartialEq)]
pub struct Change {
    /// Kind.
    pub kind: ChangeKind,
    /// Building id.
    pub id: String,
    /// Name (this run's, or the previous one's for a building gone).
    pub name: String,
    /// Class before and now.
    pub class: (Option<u8>, Option<u8>),
    /// Rank before and now.
    pub rank: (Option<usize>, Option<usize>),
    /// Score before and now.
    pub score: (Option<f64>, Option<f64>),
    /// Plan A membership before and now (`None` where that run had no plan).
    pub plan_a: (Option<bool>, Option<bool>),
    /// Plan B membership before and now.
    pub plan_b: (Option<bool>, Option<bool>),
    /// What changed, in words.
    pub what: String,
}

/// The comparison of this run with a previous one.
#[derive(Debug, Clone, PartialEq)]
pub struct Changes {
    /// The previous run.
    pub previous: Previous,
    /// Rank moves of more than this many places are listed (`changes_rank_threshold`).
    pub rank_threshold: usize,
    /// Every change, in the order: class changes, rank moves, new, gone, plan membership;
    /// within a kind, by this run's rank (buildings gone by their previous rank).
    pub rows: Vec<Change>,
    /// Buildings compared (in both runs).
    pub in_both: usize,
}

impl Changes {
    /// The changes of one kind.
    pub fn of_kind(&self, kind: ChangeKind) -> impl Iterator<Item = &Change> {
        self.rows.iter().filter(move |c| c.kind == kind)
    }
    /// Count of changes of one kind.
    pub fn count(&self, kind: ChangeKind) -> usize {
        self.of_kind(kind).count()
    }
}

fn yes_no(b: Option<bool>) -> &'static str {
    match b {
        Some(true) => "funded",
        Some(false) => "not funded",
        None => "no plan",
    }
}

/// Compares this run with a previous one.
pub fn compare(previous: Previous, report: &Screening) -> Changes {
    // Validated as not negative; a fraction of a place rounds down.
    let threshold = report.settings.changes_rank_threshold.max(0.0).floor() as usize;
    let old: HashMap<&str, &PreviousBuilding> = previous
        .buildings
        .iter()
        .map(|b| (b.id.as_str(), b))
        .collect();
    let now_ids: HashSet<&str> = report.buildings.iter().map(|b| b.id.as_str()).collect();
    let old_plan = |id: &str| {
        previous
            .plans
            .as_ref()
            .map(|(a, b)| (a.contains(id), b.contains(id)))
    };
    let now_plan = report.budget_plan.is_some();
    let mut rows = Vec::new();
    let mut in_both = 0;
    for b in &report.buildings {
        let plan_now = now_plan.then(|| {
            let r = b.retrofit.as_ref();
            (
                r.and_then(|r| r.funded) == Some(true),
                r.and_then(|r| r.funded_best) == Some(true),
            )
        });
        let base = |kind: ChangeKind, what: String, o: Option<&PreviousBuilding>| Change {
            kind,
            id: b.id.clone(),
            name: b.name.clone(),
            class: (o.map(|o| o.class), Some(b.class)),
            rank: (o.map(|o| o.rank), Some(b.rank)),
            score: (o.and_then(|o| o.score), Some(b.score)),
            plan_a: (old_plan(&b.id).map(|p| p.0), plan_now.map(|p| p.0)),
            plan_b: (old_plan(&b.id).map(|p| p.1), plan_now.map(|p| p.1)),
            what,
        };
        let Some(o) = old.get(b.id.as_str()).copied() else {
            rows.push(base(
                ChangeKind::New,
                format!(
                    "not in the previous run; now class {}, rank {}",
                    b.class, b.rank
                ),
                None,
            ));
            continue;
        };
        in_both += 1;
        if o.class != b.class {
            rows.push(base(
                ChangeKind::Class,
                format!("class {} → {}", o.class, b.class),
                Some(o),
            ));
        }
        if o.rank.abs_diff(b.rank) > threshold {
            let dir = if b.rank < o.rank { "up" } else { "down" };
            rows.push(base(
                ChangeKind::Rank,
                format!(
                    "rank {} → {} ({dir} {} places)",
                    o.rank,
                    b.rank,
                    o.rank.abs_diff(b.rank)
                ),
                Some(o),
            ));
        }
        let before = old_plan(&b.id);
        if before.is_some() || plan_now.is_some() {
            let (a0, b0) = (before.map(|p| p.0), before.map(|p| p.1));
            let (a1, b1) = (plan_now.map(|p| p.0), plan_now.map(|p| p.1));
            let mut what = Vec::new();
            if a0 != a1 {
                what.push(format!("Plan A: {} → {}", yes_no(a0), yes_no(a1)));
            }
            if b0 != b1 {
                what.push(format!("Plan B: {} → {}", yes_no(b0), yes_no(b1)));
            }
            if !what.is_empty() {
                rows.push(base(ChangeKind::Plan, what.join("; "), Some(o)));
            }
        }
    }
    let mut gone: Vec<&PreviousBuilding> = previous
        .buildings
        .iter()
        .filter(|b| !now_ids.contains(b.id.as_str()))
        .collect();
    gone.sort_by_key(|b| b.rank);
    for o in gone {
        let p = old_plan(&o.id);
        rows.push(Change {
            kind: ChangeKind::Gone,
            id: o.id.clone(),
            name: o.name.clone(),
            class: (Some(o.class), None),
            rank: (Some(o.rank), None),
            score: (o.score, None),
            plan_a: (p.map(|p| p.0), None),
            plan_b: (p.map(|p| p.1), None),
            what: format!(
                "in the previous run (class {}, rank {}); not screened in this run",
                o.class, o.rank
            ),
        });
    }
    // Stable sort: within a kind the order above (this run's rank, or the previous rank).
    rows.sort_by_key(|c| c.kind);
    Changes {
        previous,
        rank_threshold: threshold,
        rows,
        in_both,
    }
}
