//! Hostile input: arbitrary bytes and mutated valid workbooks / CSV files never make the
//! reader panic (bounded case counts so the suite stays quick).

use proptest::prelude::*;
use seistriage::input::{ReadOptions, read_inventory};

use super::*;

fn valid_xlsx() -> Vec<u8> {
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
    #![proptest_config(ProptestConfig { cases: 48, .. ProptestConfig::default() })]

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
}
