//! Helpers shared by the integration tests.

#![allow(dead_code)]

use std::path::PathBuf;
use std::process::{Command, Output};

/// Path of the built `seistriage` binary.
pub fn bin() -> PathBuf {
    PathBuf::from(env!("CARGO_BIN_EXE_seistriage"))
}

/// Runs the binary with arguments in a working directory.
pub fn run_in(dir: &std::path::Path, args: &[&str]) -> Output {
    Command::new(bin())
        .current_dir(dir)
        .args(args)
        .output()
        .expect("run seistriage")
}
