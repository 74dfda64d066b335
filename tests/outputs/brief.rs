//! The officials' brief in a real headless browser (Chromium from the Debian packages,
//! installed by `.ci/run` when absent): rendered to PNG and PDF, it renders without errors,
//! its map has one symbol per building with coordinates, the PDF text holds both plan names
//! and the caution, and the PNG is not blank. Also the brief's text on hand-built reports
//! (escaping, no "null", the no-coordinates case) and `--previous`.

use std::path::{Path, PathBuf};
use std::process::Command;

use seistriage::report::brief::{self, Brief, PLAN_A, PLAN_B};

use super::sample;
use crate::common;

/// The setup command DEVELOPERS.md and `.ci/run` use.
const SETUP: &str =
    "apt-get update && apt-get install -y --no-install-recommends chromium poppler-utils";

fn on_path(name: &str) -> Option<PathBuf> {
    let path = std::env::var_os("PATH")?;
    std::env::split_paths(&path)
        .map(|d| d.join(name))
        .find(|p| p.is_file())
}

/// Chromium and pdftotext, or a loud failure naming the setup command (no silent skip).
fn tools() -> (PathBuf, PathBuf) {
    let chromium = on_path("chromium").unwrap_or_else(|| {
        panic!("chromium is not installed: the brief must be tested in a real browser. Run `{SETUP}` (bash .ci/run does this when it is missing)")
    });
    let pdftotext = on_path("pdftotext").unwrap_or_else(|| {
        panic!("pdftotext (poppler-utils) is not installed. Run `{SETUP}` (bash .ci/run does this when it is missing)")
    });
    (chromium, pdftotext)
}

/// Runs headless Chromium on a file with extra arguments; returns stdout and stderr.
fn chromium(exe: &Path, page: &Path, args: &[String]) -> (String, String) {
    let profile = tempfile::tempdir().unwrap();
    let out = Command::new(exe)
        .args([
            "--headless",
            "--no-sandbox",
            "--disable-gpu",
            "--no-first-run",
            "--hide-scrollbars",
            "--disable-extensions",
            "--allow-file-access-from-files",
        ])
        .arg(format!("--user-data-dir={}", profile.path().display()))
        .args(args)
        .arg(format!("file://{}", page.display()))
        .output()
        .expect("run chromium");
    let stdout = String::from_utf8_lossy(&out.stdout).into_owned();
    let stderr = String::from_utf8_lossy(&out.stderr).into_owned();
    assert!(
        out.status.success(),
        "chromium failed ({}): {stderr}",
        out.status
    );
    (stdout, stderr)
}

/// Errors a page can raise while loading: script errors and failed resource loads (the
/// brief needs neither script nor network, so any such line is a defect).
fn page_errors(stderr: &str) -> Vec<&str> {
    stderr
        .lines()
        .filter(|l| {
            l.contains("Uncaught")
                || l.contains("net::ERR")
                || l.contains("Failed to load resource")
                || l.contains("CONSOLE")
        })
        .collect()
}

#[test]
fn demo_brief_renders_in_a_headless_browser() {
    let (chrome, pdftotext) = tools();
    let dir = tempfile::tempdir().unwrap();
    let out = common::run_in(
        dir.path(),
        &["demo", "--out", dir.path().to_str().unwrap(), "--quiet"],
    );
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let page = dir.path().join("demo-brief.html");
    let html = std::fs::read_to_string(&page).unwrap();
    // Self-contained: no script, no external resource.
    assert!(!html.contains("<script"), "the brief needs no script");
    for external in ["http://", "https://", "src=", "<link"] {
        let allowed = external == "http://"
            && html.matches(external).count()
                == html.matches("xmlns=\"http://www.w3.org/2000/svg\"").count();
        assert!(
            allowed || !html.contains(external),
            "external resource: {external}"
        );
    }
    let json: serde_json::Value =
        serde_json::from_slice(&std::fs::read(dir.path().join("demo-screening.json")).unwrap())
            .unwrap();
    let located = json["buildings"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|b| b["latitude"].is_number() && b["longitude"].is_number())
        .count();
    assert!(located > 0, "the demo has coordinates");

    // The DOM as the browser parsed it: one symbol per building with coordinates in the map.
    let (dom, stderr) = chromium(&chrome, &page, &["--dump-dom".into()]);
    assert!(
        page_errors(&stderr).is_empty(),
        "{:?}",
        page_errors(&stderr)
    );
    let start = dom.find("<svg class=\"map\"").expect("map svg in the DOM");
    let end = start + dom[start..].find("</svg>\n").unwrap_or(dom.len() - start);
    let map = &dom[start..end];
    assert_eq!(map.matches("data-id=\"").count(), located);
    for b in json["buildings"].as_array().unwrap().iter().take(3) {
        let id = b["id"].as_str().unwrap();
        assert!(map.contains(&format!("data-id=\"{id}\"")), "{id}");
    }
    // Each symbol carries a title with id, name and class.
    assert_eq!(map.matches("<g data-id=\"").count(), located);
    let b0 = &json["buildings"][0];
    assert!(map.contains(&format!(
        "<title>{} — {} — class {}",
        b0["id"].as_str().unwrap(),
        b0["name"].as_str().unwrap(),
        b0["class"]
    )));

    // PNG: not blank. A blank or failed render is one colour; the brief has dark text, the
    // map's grey districts and the class shades, so many distinct grey levels and a clear
    // share of non-white pixels.
    let png_path = dir.path().join("brief.png");
    let (_, stderr) = chromium(
        &chrome,
        &page,
        &[
            format!("--screenshot={}", png_path.display()),
            "--window-size=1000,1600".into(),
        ],
    );
    assert!(
        page_errors(&stderr).is_empty(),
        "{:?}",
        page_errors(&stderr)
    );
    let (levels, dark_share, variance) = pixel_stats(&png_path);
    assert!(levels > 32, "only {levels} grey levels: a blank page?");
    assert!(
        dark_share > 0.01 && dark_share < 0.9,
        "share of non-white pixels {dark_share}"
    );
    assert!(variance > 100.0, "pixel variance {variance}");

    // PDF: both plan names and the caution are in its text.
    let pdf = dir.path().join("brief.pdf");
    let _ = chromium(
        &chrome,
        &page,
        &[
            format!("--print-to-pdf={}", pdf.display()),
            "--no-pdf-header-footer".into(),
        ],
    );
    let text = Command::new(&pdftotext)
        .arg(&pdf)
        .arg("-")
        .output()
        .expect("run pdftotext");
    assert!(text.status.success());
    let text = String::from_utf8_lossy(&text.stdout);
    let flat: String = text.split_whitespace().collect::<Vec<_>>().join(" ");
    for needle in [PLAN_A, PLAN_B, seistriage::CAUTION] {
        assert!(flat.contains(needle), "PDF text lacks {needle:?}");
    }
    assert!(!flat.contains("null") && !flat.contains("NaN"));
    assert!(flat.contains("What the numbers rest on"));
    // The demo samples (method §13): the chance of a deficit and the survey-next list.
    if json["uncertainty"].is_object() {
        assert!(flat.contains("Chance of a deficit") && flat.contains("Survey next"));
    }
    // More than one page (the print stylesheet breaks between sections), and not dozens.
    let pages = text.matches('\u{c}').count();
    assert!((2..=12).contains(&pages), "{pages} pages");
}

/// (distinct grey levels, share of pixels darker than near-white, variance of grey) of a PNG.
fn pixel_stats(path: &Path) -> (usize, f64, f64) {
    let decoder = png::Decoder::new(std::io::BufReader::new(std::fs::File::open(path).unwrap()));
    let mut reader = decoder.read_info().unwrap();
    let mut buf = vec![0; reader.output_buffer_size().unwrap()];
    let info = reader.next_frame(&mut buf).unwrap();
    let bytes = &buf[..info.buffer_size()];
    let channels = info.color_type.samples();
    assert_eq!(info.bit_depth, png::BitDepth::Eight);
    let mut seen = [false; 256];
    let (mut n, mut dark, mut sum, mut sum2) = (0usize, 0usize, 0.0f64, 0.0f64);
    for px in bytes.chunks(channels) {
        let grey = if channels >= 3 {
            (0.2126 * f64::from(px[0]) + 0.7152 * f64::from(px[1]) + 0.0722 * f64::from(px[2]))
                .round()
        } else {
            f64::from(px[0])
        };
        seen[grey as usize] = true;
        n += 1;
        if grey < 245.0 {
            dark += 1;
        }
        sum += grey;
        sum2 += grey * grey;
    }
    let mean = sum / n as f64;
    (
        seen.iter().filter(|s| **s).count(),
        dark as f64 / n as f64,
        sum2 / n as f64 - mean * mean,
    )
}

#[test]
fn brief_escapes_user_text_and_never_says_null() {
    let mut report = sample::report(12);
    report.buildings[0].name = "<script>alert('x')</script> & Co".into();
    report.buildings[1].id = "\"><img src=x>".into();
    report.buildings[2].district = "Ward <b>".into();
    let html = brief::render(&Brief {
        report: &report,
        layers: None,
        changes: None,
        workbook: Some("w.xlsx"),
        made_at: 1_798_761_600,
    });
    assert!(!html.contains("<script>"));
    assert!(!html.contains("<img"));
    assert!(!html.contains("<b>\""));
    assert!(html.contains("&lt;script&gt;alert(&#39;x&#39;)&lt;/script&gt; &amp; Co"));
    assert!(html.contains("Ward &lt;b&gt;"));
    assert!(html.contains("2027-01-01"));
    assert!(!html.contains("null") && !html.contains("NaN"));
    assert!(html.contains(seistriage::CAUTION));
}

#[test]
fn brief_without_coordinates_says_so() {
    let mut report = sample::report(6);
    for b in &mut report.buildings {
        b.latitude = None;
        b.longitude = None;
    }
    let html = brief::render(&Brief {
        report: &report,
        layers: None,
        changes: None,
        workbook: None,
        made_at: 0,
    });
    assert!(html.contains("No building has coordinates"));
    assert!(!html.contains("data-id="));
}
