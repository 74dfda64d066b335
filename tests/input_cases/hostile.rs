//! Hostile input: arbitrary bytes, mutated valid workbooks (raw bytes, and XML parts
//! mutated then re-zipped), mutated compound files (.xls) and mutated CSV files never make
//! the reader panic, and when a file is read the counts add up. The suite runs 48 cases per
//! property; a fuzzing session is the same tests with more cases:
//!
//!     PROPTEST_CASES=20000 cargo test --test integration hostile
//!
//! Sessions of 2026-12-01 (debug build, 2 shared cores): 20,000 cases per property (5.5
//! minutes), 20,000 more on the streamed CSV reader (1.5 minutes) and 10,000 per property
//! with the own-panic check (4 minutes): nothing escaped and no panic in our own code.
//! Found earlier: two panics inside calamine (an .xlsx dimension
//! ending before it starts; a compound file cut inside a FAT sector) — now caught by
//! `input::guard` and kept as tests in tests/regression.rs; proptest keeps their seeds in
//! hostile.proptest-regressions, replayed first on every run.

use proptest::prelude::*;
use seistriage::input::{ReadOptions, read_inventory};

use super::*;

fn cases() -> u32 {
    std::env::var("PROPTEST_CASES")
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(48)
}

fn valid_xlsx() -> Vec<u8> {
    static BYTES: std::sync::OnceLock<Vec<u8>> = std::sync::OnceLock::new();
    BYTES.get_or_init(make_valid_xlsx).clone()
}

/// The parts of the valid workbook, unzipped (name, bytes).
fn valid_parts() -> Vec<(String, Vec<u8>)> {
    let bytes = valid_xlsx();
    let mut z = zip::ZipArchive::new(std::io::Cursor::new(bytes)).unwrap();
    (0..z.len())
        .map(|i| {
            let mut f = z.by_index(i).unwrap();
            let mut b = Vec::new();
            std::io::Read::read_to_end(&mut f, &mut b).unwrap();
            (f.name().unwrap().to_string(), b)
        })
        .collect()
}

fn rezip(parts: &[(String, Vec<u8>)]) -> Vec<u8> {
    use std::io::Write;
    let mut z = zip::ZipWriter::new(std::io::Cursor::new(Vec::new()));
    for (name, b) in parts {
        z.start_file(name.as_str(), zip::write::SimpleFileOptions::default())
            .unwrap();
        z.write_all(b).unwrap();
    }
    z.finish().unwrap().into_inner()
}

fn make_valid_xlsx() -> Vec<u8> {
    let dir = tempfile::tempdir().unwrap();
    let walls = vec![
        vec![S("building_id"), S("direction"), S("length_m")],
        vec![S("H1"), S("X"), N(4.0)],
    ];
    let p = workbook(
        dir.path(),
        "v.xlsx",
        &[
            ("buildings", vec![head(), good("H1"), good("H2")]),
            ("walls", walls),
        ],
    );
    std::fs::read(p).unwrap()
}

const VALID_CSV: &[u8] =
    b"id;storeys;plan_area_m2;column_area_m2;name\nA;3;200,5;2;\"x\"\"y\"\nB;4;300;3;z\n";

fn read_bytes(name: &str, bytes: &[u8]) {
    let dir = tempfile::tempdir().unwrap();
    let p = dir.path().join(name);
    std::fs::write(&p, bytes).unwrap();
    if let Ok(inv) = read_inventory(&p, &ReadOptions::default()) {
        assert_eq!(inv.rows, inv.buildings.len() + inv.not_screened.len());
    }
    assert_eq!(
        seistriage::input::guard::own_panics(),
        0,
        "a panic in our own code was caught"
    );
}

proptest! {
    // 48 cases per property in the suite; `PROPTEST_CASES=N` runs a longer fuzzing session.
    #![proptest_config(ProptestConfig { cases: cases(), .. ProptestConfig::default() })]

    #[test]
    fn arbitrary_bytes_never_panic(bytes in proptest::collection::vec(any::<u8>(), 0..2048), ext in prop_oneof![Just("xlsx"), Just("csv"), Just("ods"), Just("xls")]) {
        read_bytes(&format!("a.{ext}"), &bytes);
    }

    #[test]
    fn arbitrary_bytes_behind_a_zip_or_compound_file_header_never_panic(bytes in proptest::collection::vec(any::<u8>(), 0..2048), cfb in any::<bool>()) {
        let mut b = if cfb { vec![0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1] } else { b"PK\x03\x04".to_vec() };
        b.extend(bytes);
        read_bytes("z.xlsx", &b);
    }

    #[test]
    fn mutated_workbooks_never_panic(edits in proptest::collection::vec((any::<prop::sample::Index>(), any::<u8>()), 1..8)) {
        let mut b = valid_xlsx();
        for (i, v) in edits {
            let k = i.index(b.len());
            b[k] = v;
        }
        read_bytes("m.xlsx", &b);
    }

    #[test]
    fn mutated_csv_never_panics(edits in proptest::collection::vec((any::<prop::sample::Index>(), any::<u8>()), 1..8), cut in any::<prop::sample::Index>()) {
        let mut b = VALID_CSV.to_vec();
        for (i, v) in edits {
            let k = i.index(b.len());
            b[k] = v;
        }
        b.truncate(cut.index(b.len() + 1));
        read_bytes("m.csv", &b);
    }

    #[test]
    fn workbooks_with_mutated_xml_parts_never_panic(
        part in 0usize..64,
        edits in proptest::collection::vec((any::<prop::sample::Index>(), prop_oneof![any::<u8>(), Just(b'<'), Just(b'"'), Just(b'9'), Just(b'>')]), 1..12),
        cut in proptest::option::of(any::<prop::sample::Index>()),
    ) {
        let mut parts = valid_parts();
        let k = part % parts.len();
        let b = &mut parts[k].1;
        for (i, v) in edits {
            let at = i.index(b.len());
            b[at] = v;
        }
        if let Some(c) = cut {
            let at = c.index(b.len() + 1);
            b.truncate(at);
        }
        read_bytes("x.xlsx", &rezip(&parts));
    }

    #[test]
    fn mutated_compound_files_never_panic(
        edits in proptest::collection::vec((any::<prop::sample::Index>(), any::<u8>()), 1..16),
        cut in proptest::option::of(any::<prop::sample::Index>()),
    ) {
        let wb = super::cases::biff_workbook(&[(0, 0), (3, 2), (700, 9)]);
        let mut b = super::cases::compound_file(&[("Workbook", wb)]);
        for (i, v) in edits {
            let at = i.index(b.len());
            b[at] = v;
        }
        if let Some(c) = cut {
            let at = c.index(b.len() + 1);
            b.truncate(at);
        }
        let _ = seistriage::input::xls_scan::sheet_extents(&b);
        read_bytes("c.xls", &b);
    }
}

/// The tolerant number reader of inventory.md ("Survey text in a numeric cell") on arbitrary
/// text: no panic; whatever it accepts passes the column's check (no silent acceptance of
/// an out-of-range value); an ambiguous text is never read without saying so.
mod survey_text {
    use proptest::prelude::*;
    use seistriage::input::columns::{Factor, find_unit};
    use seistriage::input::parse::{Checked, read_survey_text, survey_number, unit_mistake_check};

    fn cases() -> u32 {
        super::cases().max(256)
    }

    /// Text made of the characters surveys use in numbers, units and years.
    fn survey_like() -> impl Strategy<Value = String> {
        proptest::collection::vec(
            prop_oneof![
                Just("0"),
                Just("1"),
                Just("2"),
                Just("3"),
                Just("9"),
                Just(","),
                Just("."),
                Just(" "),
                Just("\u{a0}"),
                Just("\u{202f}"),
                Just("'"),
                Just("-"),
                Just("+"),
                Just("e"),
                Just("m"),
                Just("mm"),
                Just("cm"),
                Just("kPa"),
                Just("MPa"),
                Just("m/s²"),
                Just("g"),
                Just("%"),
                Just("c. "),
                Just("~"),
                Just("ca "),
                Just("x"),
                Just("²"),
            ],
            0..12,
        )
        .prop_map(|v| v.concat())
    }

    proptest! {
        #![proptest_config(ProptestConfig::with_cases(cases()))]

        #[test]
        fn arbitrary_text_never_panics(t in "\\PC{0,40}", dc in any::<bool>(), circa in any::<bool>()) {
            let _ = survey_number(&t, dc, circa);
        }

        #[test]
        fn an_accepted_reading_always_passes_the_columns_check(t in survey_like(), dc in any::<bool>()) {
            let check = unit_mistake_check("a storey height", "m", (1.5, 12.0), &[]);
            let m = find_unit("m");
            match read_survey_text(&t, dc, false, "storey_height_m", m, Factor::ONE, &check) {
                Checked::Value(v, note) => {
                    prop_assert!(check(v).is_ok(), "{t:?} -> {v}");
                    prop_assert!(v.is_finite());
                    // Anything but a plain number says what was done.
                    let plain = t.trim().parse::<f64>().is_ok();
                    prop_assert!(plain || dc || note.is_some(), "{t:?} read silently as {v}");
                }
                Checked::Refused(e) => prop_assert!(!e.is_empty()),
            }
        }

        #[test]
        fn the_reader_never_accepts_an_out_of_range_value_from_survey_text(
            height in survey_like(), thickness in survey_like(), agr in survey_like(),
            weight in survey_like(), semicolon in any::<bool>(),
        ) {
            let dir = tempfile::tempdir().unwrap();
            let sep = if semicolon { ';' } else { ',' };
            let q = |t: &str| format!("\"{}\"", t.replace('"', ""));
            let body = format!(
                "id{sep}storeys{sep}plan_area_m2{sep}column_area_m2{sep}storey_height_m{sep}wall_thickness_m{sep}agr_g{sep}floor_weight_kpa\n\
                 P1{sep}4{sep}400{sep}10{sep}{}{sep}{}{sep}{}{sep}{}\n",
                q(&height), q(&thickness), q(&agr), q(&weight)
            );
            let p = dir.path().join("p.csv");
            std::fs::write(&p, body).unwrap();
            let inv = seistriage::input::read_inventory(&p, &seistriage::input::ReadOptions::default()).unwrap();
            prop_assert_eq!(inv.rows, inv.buildings.len() + inv.not_screened.len());
            for b in &inv.buildings {
                if let Some(h) = b.storey_height_m { prop_assert!((1.5..=12.0).contains(&h), "{height:?} -> {h}"); }
                if let Some(t) = b.wall_thickness_m { prop_assert!((0.05..=1.5).contains(&t), "{thickness:?} -> {t}"); }
                if let Some(a) = b.agr_g { prop_assert!((0.0..=1.5).contains(&a), "{agr:?} -> {a}"); }
                if let Some(w) = b.floor_weight_kpa { prop_assert!((2.0..=40.0).contains(&w), "{weight:?} -> {w}"); }
            }
        }

        #[test]
        fn an_ambiguous_comma_is_never_taken_silently(a in 1u32..1000, b in 0u32..1000) {
            let t = format!("{a},{b:03}");
            let n = survey_number(&t, false, false).unwrap();
            prop_assert_eq!(n.alternative, Some(f64::from(a * 1000 + b)));
            // Both readings pass a check that takes everything: refused, showing both.
            let r = read_survey_text(&t, false, false, "x", None, Factor::ONE, &|_| Ok(()));
            prop_assert!(matches!(r, Checked::Refused(_)), "{t}");
        }
    }
}
