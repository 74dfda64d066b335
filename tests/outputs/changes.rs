//! `screen --previous OLD.json`: two runs of an inventory that differ by known edits (a
//! building removed, one added, one given many more walls); the `Changes` sheet and the
//! brief's section list exactly what the two JSON results say changed.

use std::collections::{HashMap, HashSet};
use std::path::Path;

use calamine::Data;
use serde_json::Value;

use super::binary::write_csv;
use super::workbook::sheet;
use crate::common::run_in;

const SETTINGS: &str = "changes_rank_threshold = 2\nunit_cost_wall_m3 = 900\n\
    unit_cost_floor_m2 = 60\nreplacement_cost_m2 = 1400\n";

fn screen(dir: &Path, tag: &str, previous: Option<&str>) -> Value {
    let json = format!("{tag}.json");
    let out = format!("{tag}.xlsx");
    let brief = format!("{tag}.html");
    let mut args = vec![
        "screen",
        "stock.csv",
        "--settings",
        "s.toml",
        "--budget",
        "150000",
        "--out",
        &out,
        "--json",
        &json,
        "--brief",
        &brief,
        "--quiet",
    ];
    if let Some(p) = previous {
        args.extend(["--previous", p]);
    }
    let o = run_in(dir, &args);
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    serde_json::from_slice(&std::fs::read(dir.join(json)).unwrap()).unwrap()
}

type Row = (String, u8, usize, bool, bool);

fn rows(v: &Value) -> HashMap<String, Row> {
    let plan = |k: &str| -> HashSet<String> {
        v["budget_plan"][k]["funded"]
            .as_array()
            .map(|a| a.iter().map(|x| x.as_str().unwrap().to_string()).collect())
            .unwrap_or_default()
    };
    let (a, b) = (plan("priority_walk"), plan("max_occupants"));
    v["buildings"]
        .as_array()
        .unwrap()
        .iter()
        .map(|x| {
            let id = x["id"].as_str().unwrap().to_string();
            let r = (
                x["name"].as_str().unwrap().to_string(),
                x["class"].as_u64().unwrap() as u8,
                x["rank"].as_u64().unwrap() as usize,
                a.contains(&id),
                b.contains(&id),
            );
            (id, r)
        })
        .collect()
}

#[test]
fn changes_sheet_lists_what_moved_between_two_runs() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    std::fs::write(d.join("s.toml"), SETTINGS).unwrap();
    write_csv(&d.join("stock.csv"));
    let old = screen(d, "old", None);

    // Known edits: T012 removed; T013 added (a copy of T005 under a new id); T002 given
    // 25 m² of RC walls in each direction (from 1.6 / 1.28).
    let text = std::fs::read_to_string(d.join("stock.csv")).unwrap();
    let mut lines: Vec<String> = text.lines().map(str::to_string).collect();
    let header: Vec<&str> = lines[0].split(',').collect();
    let wx = header
        .iter()
        .position(|c| *c == "rc_wall_area_x_m2")
        .unwrap();
    let wy = header
        .iter()
        .position(|c| *c == "rc_wall_area_y_m2")
        .unwrap();
    let t005 = lines
        .iter()
        .find(|l| l.starts_with("T005,"))
        .unwrap()
        .clone();
    lines.retain(|l| !l.starts_with("T012,"));
    for l in lines.iter_mut().filter(|l| l.starts_with("T002,")) {
        let mut cells: Vec<String> = l.split(',').map(str::to_string).collect();
        cells[wx] = "25".into();
        cells[wy] = "25".into();
        *l = cells.join(",");
    }
    lines.push(t005.replacen("T005,", "T013,", 1));
    std::fs::write(d.join("stock.csv"), lines.join("\n") + "\n").unwrap();
    let new = screen(d, "new", Some("old.json"));

    let (before, now) = (rows(&old), rows(&new));
    assert_ne!(
        before["T002"].1, now["T002"].1,
        "the edit must change T002's class for this test to mean something"
    );
    // What the two JSON results say changed, by kind.
    let mut expected: Vec<(String, String)> = Vec::new();
    let mut ids: Vec<&String> = now.keys().collect();
    ids.sort_by_key(|id| now[*id].2);
    for kind in [
        "class changed",
        "rank moved",
        "new building",
        "plan membership changed",
    ] {
        for id in &ids {
            let n = &now[*id];
            let hit = match before.get(*id) {
                None => kind == "new building",
                Some(b) => match kind {
                    "class changed" => b.1 != n.1,
                    "rank moved" => b.2.abs_diff(n.2) > 2,
                    "plan membership changed" => (b.3, b.4) != (n.3, n.4),
                    _ => false,
                },
            };
            if hit {
                expected.push((kind.to_string(), (*id).clone()));
            }
        }
        if kind == "new building" {
            let mut gone: Vec<(&String, &Row)> = before
                .iter()
                .filter(|(id, _)| !now.contains_key(*id))
                .collect();
            gone.sort_by_key(|(_, r)| r.2);
            for (id, _) in gone {
                expected.push(("no longer screened".into(), id.clone()));
            }
        }
    }
    assert!(expected.contains(&("new building".into(), "T013".into())));
    assert!(expected.contains(&("no longer screened".into(), "T012".into())));
    assert!(expected.contains(&("class changed".into(), "T002".into())));

    let ch = sheet(&d.join("new.xlsx"), "Changes");
    let cell = |r: usize, c: usize| match ch.get((r, c)) {
        Some(Data::String(s)) => s.clone(),
        Some(Data::Float(f)) => f.to_string(),
        _ => String::new(),
    };
    assert_eq!(cell(2, 0), "Change");
    assert!(cell(0, 0).contains("old.json"));
    assert!(cell(1, 0).contains("more than 2 places"));
    let got: Vec<(String, String)> = (3..ch.height())
        .map(|r| (cell(r, 0), cell(r, 1)))
        .filter(|(k, _)| !k.is_empty())
        .collect();
    assert_eq!(got, expected);
    // The T002 class row carries the classes before and now.
    let r = (3..ch.height())
        .find(|r| cell(*r, 0) == "class changed" && cell(*r, 1) == "T002")
        .unwrap();
    assert_eq!(cell(r, 3), before["T002"].1.to_string());
    assert_eq!(cell(r, 4), now["T002"].1.to_string());

    // Sheet order: Changes right after Priority.
    let names = calamine::Reader::sheet_names(&super::workbook::open(&d.join("new.xlsx")));
    let p = names.iter().position(|n| n == "Priority").unwrap();
    assert_eq!(names[p + 1], "Changes");
    // Without --previous there is no Changes sheet.
    assert!(
        !calamine::Reader::sheet_names(&super::workbook::open(&d.join("old.xlsx")))
            .contains(&"Changes".to_string())
    );

    // The brief's section names the same buildings.
    let html = std::fs::read_to_string(d.join("new.html")).unwrap();
    let section = &html[html.find("id=\"changes\"").expect("changes section")..];
    for id in ["T002", "T012", "T013"] {
        assert!(section.contains(id), "{id}");
    }
}
