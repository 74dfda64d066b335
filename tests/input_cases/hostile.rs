//! Hostile input: arbitrary bytes and mutated valid workbooks / CSV files never make the
//! reader panic (bounded case counts so the suite stays quick).

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
