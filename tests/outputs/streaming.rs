//! The streaming path of `screen` for a large CSV stock (`seistriage::stream`), forced with a
//! small threshold and small chunks, against the whole-stock path on the same inventory: the
//! Priority CSV (ranks, budget marks) and the counts must be identical.

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

#[test]
fn streaming_path_refuses_json_with_a_clear_message() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    inventory(d);
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
    assert!(err.contains("--json") && err.contains("--csv"), "{err}");
    assert!(!d.join("s/r.json").exists());
}
