//! The streaming path of `screen` for a large CSV stock (`seistriage::stream`), forced with a
//! small threshold and small chunks, against the whole-stock path on the same inventory: the
//! Priority CSV (ranks, budget marks), the counts, the JSON and the GeoJSON must be identical.

use std::path::Path;
use std::process::{Command, Output};

use crate::common::bin;

fn screen(dir: &Path, stream_from: &str, chunk: &str, args: &[&str]) -> Output {
    Command::new(bin())
        .current_dir(dir)
        .env("SEISTRIAGE_STREAM_FROM", stream_from)
        .env("SEISTRIAGE_STREAM_CHUNK", chunk)
        .arg("screen")
        .args(args)
        .output()
        .expect("run seistriage")
}

/// A generated stock of 300 buildings with a row that cannot be read (text storeys), a blank
/// line, and an id repeated near the end (so its rows fall in different chunks).
fn inventory(dir: &Path) {
    let out = Command::new(bin())
        .current_dir(dir)
        .args([
            "generate",
            "--buildings",
            "300",
            "--out",
            "stock.csv",
            "--seed",
            "3",
        ])
        .output()
        .expect("run generate");
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let text = std::fs::read_to_string(dir.join("stock.csv")).unwrap();
    let mut lines: Vec<String> = text.lines().map(str::to_string).collect();
    let header: Vec<&str> = lines[0].split(',').collect();
    let storeys = header.iter().position(|h| *h == "storeys").unwrap();
    let mut bad: Vec<String> = lines[50].split(',').map(str::to_string).collect();
    bad[storeys] = "abc".into();
    lines[50] = bad.join(",");
    let repeated = lines[10].clone();
    lines.push(repeated);
    lines.insert(100, String::new());
    std::fs::write(dir.join("stock.csv"), lines.join("\n") + "\n").unwrap();
    std::fs::write(
        dir.join("s.toml"),
        "agr_g = 0.25\nunit_cost_wall_m3 = 800\nunit_cost_floor_m2 = 50\n\
         replacement_cost_m2 = 900\nbudget = 2000000\n",
    )
    .unwrap();
}

/// The terminal summary up to the list of outputs (counts, top ten, not screened, budget).
fn summary_head(out: &Output) -> String {
    let text = String::from_utf8_lossy(&out.stdout).into_owned();
    let end = text
        .find("Some tables were written")
        .or_else(|| text.find("Outputs"))
        .unwrap_or(text.len());
    text[..end].to_string()
}

#[test]
fn streaming_path_gives_the_same_priority_csv_and_counts_as_the_whole_stock_path() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    inventory(d);
    let whole = screen(
        d,
        "1000000",
        "20000",
        &[
            "stock.csv",
            "--settings",
            "s.toml",
            "--out",
            "w/out.xlsx",
            "--csv",
            "w/p.csv",
        ],
    );
    assert!(
        whole.status.success(),
        "{}",
        String::from_utf8_lossy(&whole.stderr)
    );
    assert!(
        !d.join("w/out.directions.csv").exists(),
        "whole-stock path expected"
    );
    let streamed = screen(
        d,
        "10",
        "37",
        &[
            "stock.csv",
            "--settings",
            "s.toml",
            "--out",
            "s/out.xlsx",
            "--csv",
            "s/p.csv",
        ],
    );
    assert!(
        streamed.status.success(),
        "{}",
        String::from_utf8_lossy(&streamed.stderr)
    );
    let a = std::fs::read_to_string(d.join("w/p.csv")).unwrap();
    let b = std::fs::read_to_string(d.join("s/p.csv")).unwrap();
    assert_eq!(a, b, "Priority CSV differs between the paths");
    assert_eq!(
        b,
        std::fs::read_to_string(d.join("s/out.priority.csv")).unwrap()
    );
    // The budget marks are there (so the comparison covers the budget plan).
    assert!(b.lines().skip(1).any(|l| l.contains(",yes,")));
    let head = summary_head(&whole);
    assert!(head.contains("Not screened: 3 rows"), "{head}");
    assert_eq!(head, summary_head(&streamed));

    // The per-row files: every screened building twice in Directions, in file order, rank
    // column empty; the repeated id nowhere.
    let screened = b.lines().count() - 1;
    let dirs = std::fs::read_to_string(d.join("s/out.directions.csv")).unwrap();
    let rows: Vec<&str> = dirs.lines().skip(1).collect();
    assert_eq!(rows.len(), 2 * screened);
    assert!(rows.iter().all(|r| r.starts_with(',')));
    let ids: Vec<&str> = rows.iter().map(|r| r.split(',').nth(1).unwrap()).collect();
    let mut sorted = ids.clone();
    sorted.sort();
    assert_eq!(
        ids, sorted,
        "Directions expected in file order (ids ascend in this stock)"
    );
    assert!(!ids.contains(&"G0000010"));
    assert!(!b.contains("G0000010"));
    assert!(d.join("s/out.retrofit-plan.csv").exists());
    assert!(d.join("s/out.walls.csv").exists());
    assert!(d.join("s/out.flags.csv").exists());
}

/// Files in `dir` whose names start with a dot (temporary and spill files).
fn hidden_files(dir: &Path) -> Vec<String> {
    std::fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .filter(|n| n.starts_with('.'))
        .collect()
}

#[test]
fn streaming_path_writes_the_same_json_and_geojson_bytes_as_the_whole_stock_path() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    inventory(d);
    let run = |from: &str, chunk: &str, sub: &str| {
        let json = format!("{sub}/r.json");
        let geo = format!("{sub}/g.geojson");
        let out = format!("{sub}/out.xlsx");
        let o = screen(
            d,
            from,
            chunk,
            &[
                "stock.csv",
                "--settings",
                "s.toml",
                "--out",
                &out,
                "--json",
                &json,
                "--geojson",
                &geo,
            ],
        );
        assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
        let text = String::from_utf8_lossy(&o.stdout).into_owned();
        assert!(text.contains(&json) && text.contains(&geo), "{text}");
        (
            std::fs::read(d.join(&json)).unwrap(),
            std::fs::read(d.join(&geo)).unwrap(),
        )
    };
    let (whole_json, whole_geo) = run("1000000", "20000", "w");
    assert!(
        !d.join("w/out.directions.csv").exists(),
        "whole-stock path expected"
    );
    // Chunks of 37 rows: the repeated id's rows and the blank line fall in different chunks.
    let (json, geo) = run("10", "37", "s");
    assert!(
        d.join("s/out.directions.csv").exists(),
        "streaming path expected"
    );
    assert!(json == whole_json, "JSON differs between the paths");
    assert!(geo == whole_geo, "GeoJSON differs between the paths");
    assert_eq!(hidden_files(&d.join("s")), Vec::<String>::new());

    // What the comparison covers: a parsed document with the whole stock in rank order,
    // the budget's funded marks and the rows not screened.
    let v: serde_json::Value = serde_json::from_slice(&json).unwrap();
    let buildings = v["buildings"].as_array().unwrap();
    let priority = std::fs::read_to_string(d.join("s/out.priority.csv")).unwrap();
    assert_eq!(buildings.len(), priority.lines().count() - 1);
    assert_eq!(
        v["counts"]["screened"].as_u64(),
        Some(buildings.len() as u64)
    );
    assert_eq!(v["counts"]["not_screened"].as_u64(), Some(3));
    assert_eq!(v["not_screened"].as_array().unwrap().len(), 3);
    let by_class: u64 = (1..=4)
        .map(|c| v["counts"]["by_class"][c.to_string()].as_u64().unwrap())
        .sum();
    assert_eq!(by_class, buildings.len() as u64);
    for (i, (b, line)) in buildings.iter().zip(priority.lines().skip(1)).enumerate() {
        assert_eq!(b["rank"].as_u64(), Some(i as u64 + 1));
        assert_eq!(Some(b["id"].as_str().unwrap()), line.split(',').nth(1));
    }
    let funded: Vec<&str> = buildings
        .iter()
        .filter(|b| b["retrofit"]["funded"] == serde_json::Value::Bool(true))
        .map(|b| b["id"].as_str().unwrap())
        .collect();
    assert!(!funded.is_empty());
    let walk: Vec<&str> = v["budget_plan"]["priority_walk"]["funded"]
        .as_array()
        .unwrap()
        .iter()
        .map(|f| f.as_str().unwrap())
        .collect();
    assert_eq!(funded, walk);
    // The small stock is written indented, as on the whole-stock path.
    assert!(json.starts_with(b"{\n  \"tool\": \"seistriage\""));
    let g: serde_json::Value = serde_json::from_slice(&geo).unwrap();
    assert_eq!(g["type"], "FeatureCollection");
    assert!(!g["features"].as_array().unwrap().is_empty());
}

#[test]
fn a_failed_json_write_on_the_streaming_path_leaves_no_spill_or_partial_file() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    inventory(d);
    // The JSON's name is taken by a folder, so the final rename fails after the spill and
    // the temporary document have been written.
    std::fs::create_dir_all(d.join("s/r.json/inside")).unwrap();
    let out = screen(
        d,
        "10",
        "37",
        &[
            "stock.csv",
            "--settings",
            "s.toml",
            "--out",
            "s/out.xlsx",
            "--json",
            "s/r.json",
        ],
    );
    assert!(!out.status.success());
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("r.json"), "{err}");
    assert_eq!(hidden_files(&d.join("s")), Vec::<String>::new());
    assert!(d.join("s/r.json/inside").is_dir());
}

/// The spill, in both layouts, against the whole-report writer on a hand-built report: the
/// objects are spilled with a wrong rank and no funded mark, in reverse rank order, and the
/// document must still be the whole-report writer's bytes.
#[test]
fn spilled_buildings_make_the_same_document_as_the_whole_report_writer() {
    use seistriage::report::json::{self, Placed, Spill};
    let report = super::sample::report(12);
    assert!(
        report
            .buildings
            .iter()
            .any(|b| b.retrofit.as_ref().and_then(|r| r.funded) == Some(true))
    );
    let dir = tempfile::tempdir().unwrap();
    let whole = dir.path().join("whole.json");
    json::write(&report, &whole).unwrap();
    for compact in [false, true] {
        let path = dir.path().join(format!("spilled-{compact}.json"));
        let mut spill = Spill::create(&path).unwrap();
        let mut slots = Vec::new();
        for b in report.buildings.iter().rev() {
            let mut b = b.clone();
            b.rank = 0;
            if let Some(r) = b.retrofit.as_mut() {
                r.funded = None;
            }
            slots.push(spill.push(&b).unwrap());
        }
        slots.reverse();
        let mut head = report.clone();
        head.buildings.clear();
        let order = report
            .buildings
            .iter()
            .zip(&slots)
            .map(|(b, &slot)| Placed {
                slot,
                rank: b.rank,
                funded: b.retrofit.as_ref().and_then(|r| r.funded),
            });
        spill.write_document(&head, order, compact, &path).unwrap();
        let expected = if compact {
            serde_json::to_vec(&report).unwrap()
        } else {
            std::fs::read(&whole).unwrap()
        };
        assert!(
            std::fs::read(&path).unwrap() == expected,
            "spilled document differs (compact: {compact})"
        );
    }
    let mut left = hidden_files(dir.path());
    left.sort();
    assert_eq!(left, Vec::<String>::new(), "spill files left behind");
}
