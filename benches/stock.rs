//! Whole-run benchmark of large invented stocks (issue "scale"): reading, engine, writing
//! and the whole `screen` run, against the floor of reading the same file without screening
//! plus writing the same number of cells without computing — all measured in one run, so
//! that the figures can be reported as ratios on a noisy machine.
//!
//! Not a criterion bench: each size runs once (a 1,000,000-row run takes minutes).
//!
//!     cargo bench --bench stock                       # 10,000 buildings, .xlsx
//!     STOCK_SIZES=10000:xlsx,100000:xlsx,1000000:csv cargo bench --bench stock
//!
//! The first pass of the streaming path alone, before (the whole chunked read, every row
//! parsed and validated, as that pass ran until the ids-only reader) and after
//! ([`stream::repeated_ids`]), alternated twice in one run on the file given:
//!
//!     STOCK_FIRST_PASS=output/bench/stock.csv cargo bench --bench stock
//!
//! Two writing floors are measured, both at the writer's zip level and both filling their
//! sheets in parallel over the threads as the real writer does:
//! - `floor-w` (like for like): the very cells of the written workbook (numbers as numbers,
//!   text as text, read back with calamine beforehand, untimed) written again without
//!   formats in constant-memory mode, plus the per-row CSV files of a large stock copied
//!   record by record (copy time less a read-only pass);
//! - `syn-w` (synthetic): the same sheet shapes filled with short synthetic numbers (the
//!   CSV tables counted as sheet cells) — cheaper than real output, whose numbers carry
//!   full precision and whose tables hold text.
//!
//! `whole/floor` = whole run / (read + floor-w); `whole/syn` = whole run / (read + syn-w).
//!
//! Peak resident memory of the whole run is read from /proc/<pid>/status (VmHWM) of the
//! `seistriage screen` child process.

#![allow(clippy::unwrap_used, clippy::expect_used)]

use std::path::{Path, PathBuf};
use std::process::Command;
use std::time::{Duration, Instant};

use calamine::{Data, Range, Reader, open_workbook_auto};
use rayon::prelude::*;
use rust_xlsxwriter::{Workbook, Worksheet};
use seistriage::geography::{self, Geography};
use seistriage::input::{ReadOptions, read_csv_chunks, read_inventory};
use seistriage::pipeline::{self, RunOptions};
use seistriage::report::workbook;
use seistriage::{engine, retrofit, stream};
use std::collections::HashMap;

fn secs(d: Duration) -> f64 {
    d.as_secs_f64()
}

/// Sheet name and (rows, columns) of every sheet of a written workbook.
fn sheet_shapes(path: &Path) -> Vec<(String, usize, usize)> {
    let mut wb = open_workbook_auto(path).expect("open written workbook");
    let names = wb.sheet_names().to_vec();
    names
        .into_iter()
        .filter_map(|n| {
            let r = wb.worksheet_range(&n).ok()?;
            let (h, w) = r.get_size();
            Some((n, h, w))
        })
        .collect()
}

/// Fills standalone constant-memory sheets in parallel, spread over the threads by cell
/// count with the writer's own rule ([`workbook::balance`]), adds them in order and saves:
/// the cheapest way rust_xlsxwriter writes these cells on this machine, as the real writer
/// does it.
fn fill_and_save<T: Sync>(
    wb: &mut Workbook,
    sheets: &[(String, T)],
    cells: impl Fn(&T) -> u64,
    fill: impl Fn(&mut Worksheet, &T) + Sync,
    out: &Path,
) {
    let mut ws: Vec<Worksheet> = sheets
        .iter()
        .map(|(name, _)| {
            let mut w = wb.new_worksheet_with_constant_memory().unwrap();
            w.set_name(name).unwrap();
            w
        })
        .collect();
    let weights: Vec<u64> = sheets.iter().map(|(_, t)| cells(t)).collect();
    let threads = rayon::current_num_threads().max(1);
    let mut bins: Vec<Vec<(&mut Worksheet, &T)>> = (0..threads).map(|_| Vec::new()).collect();
    for ((w, (_, t)), bin) in ws
        .iter_mut()
        .zip(sheets)
        .zip(workbook::balance(&weights, threads))
    {
        bins[bin].push((w, t));
    }
    bins.into_par_iter().for_each(|bin| {
        for (w, t) in bin {
            fill(w, t);
        }
    });
    for w in ws {
        wb.push_worksheet(w);
    }
    wb.save(out).unwrap();
}

/// A workbook at the real writer's zip level.
fn floor_workbook() -> Workbook {
    let mut wb = Workbook::new();
    wb.set_zip_compression_level(workbook::ZIP_LEVEL);
    wb.use_zip_large_file(true);
    wb
}

/// The writing floor: the same sheets with the same shapes, filled with numbers that need
/// no computing, in constant-memory mode, at the zip compression level of the real writer.
fn write_floor(shapes: &[(String, usize, usize)], out: &Path) -> Duration {
    let t = Instant::now();
    let sheets: Vec<(String, (usize, usize))> = shapes
        .iter()
        .map(|(n, r, c)| (n.clone(), (*r, *c)))
        .collect();
    fill_and_save(
        &mut floor_workbook(),
        &sheets,
        |(r, c)| (*r * *c) as u64,
        |ws, (rows, cols)| {
            for r in 0..*rows {
                for c in 0..*cols {
                    ws.write_number(r as u32, c as u16, (r * 7 + c) as f64 * 0.001)
                        .unwrap();
                }
            }
        },
        out,
    );
    t.elapsed()
}

/// The like-for-like writing floor: every sheet of the written workbook `written`, cell for
/// cell, written again without formats in constant-memory mode at the writer's zip level
/// (reading the cells back is not timed).
fn write_same_cells(written: &Path, out: &Path) -> Duration {
    let mut source = open_workbook_auto(written).expect("open written workbook");
    let names = source.sheet_names().to_vec();
    let sheets: Vec<(String, Range<Data>)> = names
        .into_iter()
        .filter_map(|n| source.worksheet_range(&n).ok().map(|r| (n, r)))
        .collect();
    let t = Instant::now();
    fill_and_save(
        &mut floor_workbook(),
        &sheets,
        |range| {
            let (h, w) = range.get_size();
            (h * w) as u64
        },
        |ws, range| {
            let (r0, c0) = range.start().unwrap_or((0, 0));
            for (r, row) in range.rows().enumerate() {
                for (c, cell) in row.iter().enumerate() {
                    let (r, c) = (r0 + r as u32, (c0 as usize + c) as u16);
                    match cell {
                        Data::Empty => {}
                        Data::Float(v) => {
                            ws.write_number(r, c, *v).unwrap();
                        }
                        Data::Int(v) => {
                            ws.write_number(r, c, *v as f64).unwrap();
                        }
                        Data::String(v) => {
                            ws.write_string(r, c, v).unwrap();
                        }
                        Data::Bool(v) => {
                            ws.write_boolean(r, c, *v).unwrap();
                        }
                        other => {
                            ws.write_string(r, c, other.to_string()).unwrap();
                        }
                    }
                }
            }
        },
        out,
    );
    t.elapsed()
}

/// The like-for-like floor of a large stock's CSV table: its records copied to another CSV
/// file, less the time of reading them alone.
fn copy_csv(from: &Path, to: &Path) -> Duration {
    let t = Instant::now();
    let mut r = csv::Reader::from_path(from).unwrap();
    let mut n = 0usize;
    let mut rec = csv::ByteRecord::new();
    while r.read_byte_record(&mut rec).unwrap() {
        n += rec.len();
    }
    std::hint::black_box(n);
    let read_only = t.elapsed();
    let t = Instant::now();
    let mut r = csv::Reader::from_path(from).unwrap();
    let mut w = csv::Writer::from_path(to).unwrap();
    w.write_byte_record(r.byte_headers().unwrap()).unwrap();
    while r.read_byte_record(&mut rec).unwrap() {
        w.write_byte_record(&rec).unwrap();
    }
    w.flush().unwrap();
    drop(w);
    t.elapsed().saturating_sub(read_only)
}

/// The engine as the streaming path runs it on a large CSV stock: chunks of
/// [`stream::CHUNK_ROWS`] rows placed, screened and sized one after another (reading is not
/// timed). The in-memory engine time of such a stock also pays for holding every result.
fn chunked_engine(inventory: &Path, run: &RunOptions) -> Duration {
    let mut problems = Vec::new();
    let settings = pipeline::settle_settings(&[], &mut problems, run).unwrap();
    let (geo, _) = Geography::load(None, None).unwrap();
    let mut total = Duration::ZERO;
    read_csv_chunks(
        inventory,
        &ReadOptions::default(),
        stream::CHUNK_ROWS,
        &HashMap::new(),
        &mut |inv| {
            let t = Instant::now();
            let (sites, _) = geography::locate(&inv.buildings, &geo, &settings);
            let inputs = engine::building_inputs(&inv, &sites);
            let mut results = engine::screen_all(&inputs, &settings).buildings;
            retrofit::size_all(&mut results, &inputs, &settings);
            total += t.elapsed();
            std::hint::black_box(results);
        },
    )
    .unwrap();
    total
}

/// Runs `seistriage screen` as a child and returns (wall time, peak RSS in MiB).
fn whole_run(bin: &Path, inventory: &Path, settings: &Path, out: &Path) -> (Duration, f64) {
    let t = Instant::now();
    let mut child = Command::new(bin)
        .args([
            "screen",
            inventory.to_str().unwrap(),
            "--quiet",
            "--out",
            out.to_str().unwrap(),
        ])
        .args(["--settings", settings.to_str().unwrap()])
        .spawn()
        .expect("spawn seistriage");
    let status_path = format!("/proc/{}/status", child.id());
    let mut peak_kib = 0u64;
    loop {
        if let Ok(s) = std::fs::read_to_string(&status_path) {
            for line in s.lines() {
                if let Some(v) = line.strip_prefix("VmHWM:") {
                    let kib: u64 = v.trim().trim_end_matches("kB").trim().parse().unwrap_or(0);
                    peak_kib = peak_kib.max(kib);
                }
            }
        }
        if let Some(status) = child.try_wait().unwrap() {
            assert!(status.success(), "screen failed");
            break;
        }
        std::thread::sleep(Duration::from_millis(20));
    }
    (t.elapsed(), peak_kib as f64 / 1024.0)
}

fn release_binary() -> PathBuf {
    let status = Command::new(env!("CARGO"))
        .args(["build", "--release", "--quiet", "--bin", "seistriage"])
        .status()
        .expect("cargo build --release");
    assert!(status.success());
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("target/release/seistriage")
}

/// The first pass as it ran before the ids-only reader: the whole chunked read.
fn first_pass_full_read(inventory: &Path) -> HashMap<String, Vec<usize>> {
    let mut all: HashMap<String, Vec<usize>> = HashMap::new();
    read_csv_chunks(
        inventory,
        &ReadOptions::default(),
        stream::CHUNK_ROWS,
        &HashMap::new(),
        &mut |inv| {
            for (id, row) in inv
                .buildings
                .iter()
                .map(|b| (&b.id, b.row))
                .chain(inv.not_screened.iter().map(|n| (&n.id, n.row)))
            {
                if !id.is_empty() {
                    all.entry(id.clone()).or_default().push(row);
                }
            }
        },
    )
    .unwrap();
    all.retain(|_, rows| rows.len() > 1);
    for rows in all.values_mut() {
        rows.sort_unstable();
    }
    all
}

/// `STOCK_FIRST_PASS=FILE`: the first pass before and after, alternated, same result.
fn first_pass(inventory: &Path) {
    let mut before = Vec::new();
    let mut after = Vec::new();
    for _ in 0..2 {
        let t = Instant::now();
        let old = first_pass_full_read(inventory);
        before.push(secs(t.elapsed()));
        let t = Instant::now();
        let new = stream::repeated_ids(inventory, &ReadOptions::default()).unwrap();
        after.push(secs(t.elapsed()));
        assert_eq!(old, new, "the ids-only pass differs from the full read");
    }
    for (b, a) in before.iter().zip(&after) {
        println!(
            "first pass of {}: full read {b:.2} s, ids only {a:.2} s, ratio {:.1}",
            inventory.display(),
            b / a
        );
    }
}

fn main() {
    if let Ok(file) = std::env::var("STOCK_FIRST_PASS") {
        first_pass(Path::new(&file));
        return;
    }
    let sizes = std::env::var("STOCK_SIZES").unwrap_or_else(|_| "10000:xlsx".into());
    let dir = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("output/bench");
    std::fs::create_dir_all(&dir).unwrap();
    let bin = release_binary();
    // The generated rows carry no hazard: one site-wide agR for the whole stock.
    let settings = dir.join("stock-settings.toml");
    std::fs::write(&settings, "agr_g = 0.25\n").unwrap();
    let run = RunOptions {
        settings_file: Some(settings.clone()),
        ..Default::default()
    };
    println!(
        "{:>9} {:>4} | {:>8} {:>8} {:>8} {:>8} | {:>8} {:>8} {:>8} | {:>11} {:>9} {:>9} | {:>8}",
        "buildings",
        "fmt",
        "read s",
        "engine s",
        "write s",
        "whole s",
        "floor-r",
        "floor-w",
        "syn-w",
        "whole/floor",
        "whole/syn",
        "eng/whole",
        "peak MiB"
    );
    for spec in sizes.split(',') {
        let (n, ext) = spec.split_once(':').unwrap_or((spec, "xlsx"));
        let n: usize = n.trim().parse().expect("size");
        let inv = dir.join(format!("stock-{n}.{ext}"));
        if !inv.exists() {
            seistriage::demo::write_generated(n, &inv, 7).expect("generate");
        }
        let out = dir.join(format!("stock-{n}-screening.xlsx"));
        // Phases in-process.
        let t = Instant::now();
        let inventory = read_inventory(&inv, &ReadOptions::default()).expect("read");
        let read = t.elapsed();
        drop(inventory);
        let loaded = pipeline::load(&inv, &run).expect("load");
        let t = Instant::now();
        let report = pipeline::screen(&loaded);
        let engine = t.elapsed();
        let t = Instant::now();
        let extra = workbook::write(&report, &out).expect("write");
        let write = t.elapsed();
        drop(report);
        drop(loaded);
        // Floor: reading the same file (measured above) plus writing the same cells.
        let mut shapes = sheet_shapes(&out);
        for (_, p) in &extra {
            // Large stocks: per-row sheets went to CSV; count them as cells of the floor.
            if let Ok(mut r) = csv::Reader::from_path(p) {
                let cols = r.headers().map(|h| h.len()).unwrap_or(0);
                let rows = r.records().count() + 1;
                shapes.push((format!("csv{}", shapes.len()), rows.min(1_048_576), cols));
            }
        }
        let syn_w = write_floor(&shapes, &dir.join("floor.xlsx"));
        let mut floor_w = write_same_cells(&out, &dir.join("floor-same.xlsx"));
        let copy = dir.join("floor-copy.csv");
        for (_, p) in &extra {
            floor_w += copy_csv(p, &copy);
        }
        let _ = std::fs::remove_file(&copy);
        // Whole run in a child process (time and peak memory).
        let (whole, peak) = whole_run(&bin, &inv, &settings, &out);
        // A CSV stock past the streaming threshold is screened in chunks by the whole run:
        // its engine share is that of the chunked engine.
        let streamed = ext == "csv" && stream::applies(&inv, stream::threshold());
        let engine = if streamed {
            let chunked = chunked_engine(&inv, &run);
            println!(
                "{n:>9} {ext:>4}: streaming path; in-memory engine {:.2} s, chunked engine {:.2} s (used below)",
                secs(engine),
                secs(chunked)
            );
            chunked
        } else {
            engine
        };
        let floor = read + floor_w;
        let syn = read + syn_w;
        println!(
            "{:>9} {:>4} | {:>8.2} {:>8.2} {:>8.2} {:>8.2} | {:>8.2} {:>8.2} {:>8.2} | {:>11.2} {:>9.2} {:>9.3} | {:>8.0}",
            n,
            ext,
            secs(read),
            secs(engine),
            secs(write),
            secs(whole),
            secs(read),
            secs(floor_w),
            secs(syn_w),
            secs(whole) / secs(floor),
            secs(whole) / secs(syn),
            secs(engine) / secs(whole),
            peak
        );
    }
}
