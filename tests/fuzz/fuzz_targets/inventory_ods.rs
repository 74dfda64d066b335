//! The inventory reader on .ods bytes. Input starting with `PK` is the file itself; any
//! other input is the `content.xml` of a stored package.
#![no_main]

use libfuzzer_sys::fuzz_target;
use seistriage_fuzz::{load_and_screen, ods_from_content, write_file};

fuzz_target!(|data: &[u8]| {
    let bytes = if data.starts_with(b"PK") {
        data.to_vec()
    } else {
        ods_from_content(data)
    };
    load_and_screen(&write_file("in.ods", &bytes));
});
