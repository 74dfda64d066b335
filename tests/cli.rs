//! Command-line behaviour of the built binary: exit codes (0 done, 1 the input could not be
//! screened, 2 usage errors, 130 interrupted), refusing to overwrite the input, a closed
//! stdout, and an interrupt in the middle of writing.

use std::io::Read;
use std::process::{Command, Stdio};

use crate::common::{bin, run_in};
use crate::outputs::binary::write_xlsx;

#[test]
fn usage_errors_exit_2() {
    let dir = tempfile::tempdir().unwrap();
    for args in [
        vec![],
        vec!["screen"],
        vec!["screen", "a.xlsx", "--no-such-option"],
        vec!["screen", "a.xlsx", "--level", "xx"],
        vec!["no-such-command"],
    ] {
        let o = run_in(dir.path(), &args);
        assert_eq!(o.status.code(), Some(2), "{args:?}");
    }
}

#[test]
fn a_missing_input_exits_1_and_writes_nothing() {
    let dir = tempfile::tempdir().unwrap();
    let o = run_in(dir.path(), &["screen", "missing.xlsx", "--out", "r.xlsx"]);
    assert_eq!(o.status.code(), Some(1));
    assert!(!String::from_utf8_lossy(&o.stderr).is_empty());
    assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 0);
}

#[test]
fn an_unreadable_input_exits_1_and_writes_nothing() {
    let dir = tempfile::tempdir().unwrap();
    std::fs::write(dir.path().join("junk.xlsx"), b"this is not a spreadsheet").unwrap();
    let o = run_in(dir.path(), &["screen", "junk.xlsx", "--out", "r.xlsx"]);
    assert_eq!(o.status.code(), Some(1));
    let left: Vec<_> = std::fs::read_dir(dir.path())
        .unwrap()
        .flatten()
        .map(|e| e.file_name())
        .collect();
    assert_eq!(left, vec![std::ffi::OsString::from("junk.xlsx")]);
}

#[test]
fn an_output_over_the_input_is_refused_and_the_input_left_untouched() {
    let dir = tempfile::tempdir().unwrap();
    let inv = dir.path().join("inv.xlsx");
    write_xlsx(&inv);
    let before = std::fs::read(&inv).unwrap();
    for flag in ["--out", "--json", "--csv", "--geojson"] {
        let o = run_in(dir.path(), &["screen", "inv.xlsx", flag, "inv.xlsx"]);
        assert_eq!(o.status.code(), Some(1), "{flag}");
        assert!(String::from_utf8_lossy(&o.stderr).contains("input file"));
        assert_eq!(std::fs::read(&inv).unwrap(), before, "{flag}");
    }
    // The same file under another spelling is refused too.
    let o = run_in(dir.path(), &["screen", "inv.xlsx", "--out", "./inv.xlsx"]);
    assert_eq!(o.status.code(), Some(1));
    assert_eq!(std::fs::read(&inv).unwrap(), before);
}

#[test]
fn two_outputs_to_one_file_are_refused() {
    let dir = tempfile::tempdir().unwrap();
    write_xlsx(&dir.path().join("inv.xlsx"));
    let o = run_in(
        dir.path(),
        &["screen", "inv.xlsx", "--out", "r.xlsx", "--json", "r.xlsx"],
    );
    assert_eq!(o.status.code(), Some(1));
    assert!(!dir.path().join("r.xlsx").exists());
}

#[test]
fn a_closed_stdout_exits_0() {
    let dir = tempfile::tempdir().unwrap();
    write_xlsx(&dir.path().join("inv.xlsx"));
    let mut child = Command::new(bin())
        .current_dir(dir.path())
        .args(["screen", "inv.xlsx", "--out", "r.xlsx"])
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    // Close the reading end before the summary is written: the write meets a broken pipe.
    drop(child.stdout.take());
    let status = child.wait().unwrap();
    let mut err = String::new();
    child
        .stderr
        .take()
        .unwrap()
        .read_to_string(&mut err)
        .unwrap();
    assert_eq!(status.code(), Some(0), "{err}");
    assert!(dir.path().join("r.xlsx").exists());
}

/// Ctrl-C (SIGINT) or SIGTERM while an output is being written: the run ends with exit code
/// 130 and leaves neither the output under its final name nor its hidden temporary file.
/// The test-only hook `SEISTRIAGE_TEST_HOLD_BEFORE_RENAME` (src/report/atomic.rs) makes the
/// first writer wait, its temporary file complete, until the named file appears (it never
/// does here); the signal is sent once the writer says it is waiting, so the moment is
/// mid-write by construction, not by timing.
#[cfg(unix)]
#[test]
fn an_interrupt_mid_write_leaves_neither_the_output_nor_a_temporary_file() {
    for signal in ["-INT", "-TERM"] {
        let dir = tempfile::tempdir().unwrap();
        write_xlsx(&dir.path().join("inv.xlsx"));
        let out = dir.path().join("out");
        std::fs::create_dir(&out).unwrap();
        let release = dir.path().join("release");
        let ready = dir.path().join("release.ready");
        let mut child = Command::new(bin())
            .current_dir(dir.path())
            .env("SEISTRIAGE_TEST_HOLD_BEFORE_RENAME", &release)
            .args([
                "screen",
                "inv.xlsx",
                "--out",
                "out/r.xlsx",
                "--json",
                "out/r.json",
                "--quiet",
            ])
            .stdout(Stdio::null())
            .stderr(Stdio::piped())
            .spawn()
            .unwrap();
        while !ready.exists() {
            if let Some(status) = child.try_wait().unwrap() {
                let mut err = String::new();
                child
                    .stderr
                    .take()
                    .unwrap()
                    .read_to_string(&mut err)
                    .unwrap();
                panic!("the run ended before writing: {status:?} {err}");
            }
            std::thread::sleep(std::time::Duration::from_millis(5));
        }
        // Held before the rename: exactly one file in the folder, the temporary one.
        let names = |d: &std::path::Path| -> Vec<String> {
            std::fs::read_dir(d)
                .unwrap()
                .flatten()
                .map(|e| e.file_name().to_string_lossy().into_owned())
                .collect()
        };
        let held = names(&out);
        assert_eq!(held.len(), 1, "{held:?}");
        assert!(
            held[0].starts_with(".r.") && held[0].ends_with(".partial"),
            "{held:?}"
        );
        let kill = Command::new("kill")
            .args([signal, &child.id().to_string()])
            .status()
            .unwrap();
        assert!(kill.success());
        let status = child.wait().unwrap();
        assert_eq!(status.code(), Some(130), "{signal}: {status:?}");
        assert_eq!(names(&out), Vec::<String>::new(), "{signal}");
    }
}
