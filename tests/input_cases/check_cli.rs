//! `seistriage check` driven through the built binary.

use std::process::Command;

use super::*;

/// `check` with a settings file giving the hazard (the fixture rows carry none).
fn check(path: &std::path::Path, extra: &[&str]) -> std::process::Output {
    let settings = path.with_file_name("hazard.toml");
    std::fs::write(&settings, "agr_g = 0.25\n").unwrap();
    Command::new(env!("CARGO_BIN_EXE_seistriage"))
        .arg("check")
        .arg(path)
        .arg("--settings")
        .arg(&settings)
        .args(extra)
        .output()
        .unwrap()
}

#[test]
fn check_lists_every_problem_and_exits_0_when_a_row_can_be_screened() {
    let dir = tempfile::tempdir().unwrap();
    let mut bad = good("Z2");
    bad[2] = N(2.5);
    let path = workbook(
        dir.path(),
        "c.xlsx",
        &[("buildings", vec![head(), good("Z1"), bad])],
    );
    let out = check(&path, &[]);
    let stdout = String::from_utf8_lossy(&out.stdout);
    assert_eq!(out.status.code(), Some(0), "{stdout}");
    assert!(
        stdout.contains("error: buildings, row 3, storeys: expected a whole number, found 2.5"),
        "{stdout}"
    );
    assert!(
        stdout.contains("2 rows: 1 rows will be screened, 1 will not"),
        "{stdout}"
    );
}

#[test]
fn check_exits_1_when_no_row_is_valid() {
    let dir = tempfile::tempdir().unwrap();
    let mut bad = good("Z3");
    bad[3] = N(-1.0);
    let path = workbook(dir.path(), "c1.xlsx", &[("buildings", vec![head(), bad])]);
    assert_eq!(check(&path, &[]).status.code(), Some(1));
}

#[test]
fn check_on_an_unreadable_file_prints_one_line_and_exits_1_without_panicking() {
    let dir = tempfile::tempdir().unwrap();
    for (name, bytes) in [
        ("junk.xlsx", &b"PK\x03\x04 broken"[..]),
        ("notes.docx", b"hello"),
        ("bin.csv", b"\0\0\0\x01"),
    ] {
        let path = text_file(dir.path(), name, bytes);
        let out = check(&path, &[]);
        let stderr = String::from_utf8_lossy(&out.stderr);
        assert_eq!(out.status.code(), Some(1), "{name}: {stderr}");
        assert_eq!(stderr.trim().lines().count(), 1, "{name}: {stderr}");
        assert!(!stderr.contains("panicked"), "{stderr}");
    }
}

#[test]
fn check_takes_the_header_row_option() {
    let dir = tempfile::tempdir().unwrap();
    let mut rows: Vec<Vec<C>> = (0..32).map(|_| vec![S("note")]).collect();
    rows.push(head());
    rows.push(good("Z5"));
    let path = workbook(dir.path(), "hr.xlsx", &[("buildings", rows)]);
    assert_eq!(check(&path, &[]).status.code(), Some(1));
    assert_eq!(check(&path, &["--header-row", "33"]).status.code(), Some(0));
}

#[test]
fn check_on_a_password_protected_workbook_says_so_and_exits_1() {
    let dir = tempfile::tempdir().unwrap();
    let path = text_file(dir.path(), "secret.xlsx", &super::cases::encrypted_ooxml());
    let out = check(&path, &[]);
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(1));
    assert_eq!(stderr.trim().lines().count(), 1, "{stderr}");
    assert!(stderr.contains("password-protected"), "{stderr}");
}

#[test]
fn check_on_a_file_that_makes_the_spreadsheet_library_fail_prints_one_line() {
    let dir = tempfile::tempdir().unwrap();
    let wb = super::cases::biff_workbook(&[(0, 0)]);
    let mut b = super::cases::compound_file(&[("Workbook", wb)]);
    b.truncate(512 + 301);
    let path = text_file(dir.path(), "cut.xls", &b);
    let out = check(&path, &[]);
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(1));
    assert_eq!(stderr.trim().lines().count(), 1, "{stderr}");
    assert!(!stderr.contains("panicked"), "{stderr}");
}
