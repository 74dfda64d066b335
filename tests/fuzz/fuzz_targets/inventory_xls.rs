//! The inventory reader on .xls bytes (and the .xls extent pre-scan). Input starting with
//! the compound-file signature is the file itself; any other input is the BIFF8 `Workbook`
//! stream of a minimal compound file.
#![no_main]

use libfuzzer_sys::fuzz_target;
use seistriage::input::xls_scan;
use seistriage_fuzz::{compound_file, load_and_screen, write_file};

const CFB: [u8; 8] = [0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1];

fuzz_target!(|data: &[u8]| {
    let bytes = if data.starts_with(&CFB) {
        data.to_vec()
    } else {
        compound_file(data)
    };
    let _ = xls_scan::sheet_extents(&bytes);
    load_and_screen(&write_file("in.xls", &bytes));
});
