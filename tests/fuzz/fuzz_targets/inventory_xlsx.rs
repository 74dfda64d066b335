//! The inventory reader on .xlsx bytes. Input starting with `PK` is the file itself; any
//! other input is the worksheet XML of a one-sheet package, optionally followed by a 0xFF
//! byte and the shared-strings XML (so that mutations reach calamine's XML reading and our
//! cell handling, not only the zip framing).
#![no_main]

use libfuzzer_sys::fuzz_target;
use seistriage_fuzz::{load_and_screen, write_file, xlsx_from_parts};

fuzz_target!(|data: &[u8]| {
    let bytes = if data.starts_with(b"PK") {
        data.to_vec()
    } else {
        let (sheet, shared) = match data.iter().position(|&b| b == 0xFF) {
            Some(i) => (&data[..i], &data[i + 1..]),
            None => (data, &b""[..]),
        };
        xlsx_from_parts(sheet, shared)
    };
    load_and_screen(&write_file("in.xlsx", &bytes));
});
