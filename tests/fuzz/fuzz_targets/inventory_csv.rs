//! The inventory reader on CSV bytes: the whole-file reader (with sibling sheet files) and
//! the chunked reader of the streaming path. Input starting with a 0x00 byte is split at the
//! next 0x00 bytes into the buildings file and its `walls`, `storeys`, `footprints` and
//! `settings` siblings; any other input is the buildings file alone.
#![no_main]

use std::collections::HashMap;

use libfuzzer_sys::fuzz_target;
use seistriage::input::{ReadOptions, read_csv_chunks};
use seistriage_fuzz::{load_and_screen, work_dir, write_file};

const SIBLINGS: [&str; 4] = ["walls", "storeys", "footprints", "settings"];

fuzz_target!(|data: &[u8]| {
    let mut parts: Vec<&[u8]> = match data.strip_prefix(b"\0") {
        Some(rest) => rest.splitn(5, |&b| b == 0).collect(),
        None => vec![data],
    };
    parts.resize(5, b"");
    let path = write_file("in.csv", parts[0]);
    let mut siblings = false;
    for (name, bytes) in SIBLINGS.iter().zip(&parts[1..]) {
        let p = work_dir().join(format!("in.{name}.csv"));
        if data.starts_with(b"\0") && !bytes.is_empty() {
            std::fs::write(&p, bytes).unwrap();
            siblings = true;
        } else {
            let _ = std::fs::remove_file(&p);
        }
    }
    load_and_screen(&path);
    if !siblings {
        let mut chunks = 0usize;
        let mut rows = 0usize;
        if let Ok(rest) = read_csv_chunks(
            &path,
            &ReadOptions::default(),
            2,
            &HashMap::new(),
            &mut |inv| {
                chunks += 1;
                rows += inv.rows;
            },
        ) {
            assert_eq!(rest.rows, rows);
        }
    }
});
