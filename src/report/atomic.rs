/*!
Write-then-rename: an output never exists half-written under its final name.

Every temporary file of an output is a [`TempFile`], registered in a process-wide list while
it exists (created under the list's lock, unregistered when renamed or dropped). An
interrupt (Ctrl-C, SIGTERM: the binary installs the handler) calls
[`remove_temp_files_and_exit`], which removes every registered file and ends the process
while still holding the lock, so that no new temporary file can appear in between. An
interrupted run therefore leaves neither a partial file under the final name nor a hidden
`.NAME.PID.partial` file beside it. (The constant-memory worksheet files of the workbook
writer are unnamed temporary files, which the operating system removes with the process.)
*/

use std::fs::File;
use std::io::{BufWriter, Write};
use std::path::{Path, PathBuf};
use std::sync::{Mutex, MutexGuard, PoisonError};

use super::ReportError;

/// Temporary files that exist now (or are about to be created by a library writing to a
/// path), removed by [`remove_temp_files_and_exit`].
static LIVE: Mutex<Vec<PathBuf>> = Mutex::new(Vec::new());

fn live() -> MutexGuard<'static, Vec<PathBuf>> {
    // A panic while holding the lock leaves the list itself intact: keep using it.
    LIVE.lock().unwrap_or_else(PoisonError::into_inner)
}

/// The temporary name used beside `path` while it is being written.
pub fn temp_path(path: &Path) -> PathBuf {
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_default();
    path.with_file_name(format!(".{name}.{}.partial", std::process::id()))
}

/// A registered temporary file: removed from disk and from the list when dropped unless
/// [`TempFile::persist`]ed onto its final name first.
#[derive(Debug)]
pub struct TempFile {
    path: PathBuf,
}

impl TempFile {
    /// Creates (truncates) the temporary file beside `final_path` and registers it, both under
    /// the list's lock.
    pub fn create(final_path: &Path) -> std::io::Result<(TempFile, File)> {
        Self::create_at(temp_path(final_path))
    }

    /// Creates (truncates) and registers a temporary file under the given name (a scratch
    /// file that is never renamed, such as the streaming path's JSON spill).
    pub fn create_at(path: PathBuf) -> std::io::Result<(TempFile, File)> {
        let mut list = live();
        let file = File::create(&path)?;
        list.push(path.clone());
        Ok((TempFile { path }, file))
    }

    /// Registers the temporary name of `final_path` for a writer that creates the file itself
    /// (given the path). Register before the file is created.
    pub fn register(final_path: &Path) -> TempFile {
        let path = temp_path(final_path);
        live().push(path.clone());
        TempFile { path }
    }

    /// The temporary file's path.
    pub fn path(&self) -> &Path {
        &self.path
    }

    /// Renames the temporary file onto `final_path` (it is then no longer registered); on
    /// failure the temporary file is removed.
    pub fn persist(self, final_path: &Path) -> std::io::Result<()> {
        std::fs::rename(&self.path, final_path)
        // `self` drops here: a failed rename removes the file, a done one finds nothing.
    }
}

impl Drop for TempFile {
    fn drop(&mut self) {
        let mut list = live();
        let _ = std::fs::remove_file(&self.path);
        if let Some(i) = list.iter().rposition(|p| *p == self.path) {
            list.swap_remove(i);
        }
    }
}

/// The temporary files registered now.
pub fn live_temp_files() -> Vec<PathBuf> {
    live().clone()
}

/// Removes every registered temporary file and ends the process with `code`, holding the
/// list's lock until the end so that no other thread creates a new one meanwhile. For the
/// interrupt handler of the binary (exit code 130 by convention: 128 + SIGINT).
pub fn remove_temp_files_and_exit(code: i32) -> ! {
    let list = live();
    for p in list.iter() {
        let _ = std::fs::remove_file(p);
    }
    std::process::exit(code)
}

/// Test-only hook for the interrupt test (tests/cli.rs): when the environment variable
/// `SEISTRIAGE_TEST_HOLD_BEFORE_RENAME` names a file, a writer that has completely written
/// its temporary file creates `<that file>.ready` and then waits (up to ten minutes) for the
/// named file to appear before renaming, so that a signal can be sent at a moment known to
/// be mid-write. Unset in every normal run.
pub fn test_hold_before_rename() {
    let Some(release) = std::env::var_os("SEISTRIAGE_TEST_HOLD_BEFORE_RENAME") else {
        return;
    };
    let release = PathBuf::from(release);
    let mut ready = release.clone().into_os_string();
    ready.push(".ready");
    let _ = File::create(PathBuf::from(ready));
    for _ in 0..60_000 {
        if release.exists() {
            return;
        }
        std::thread::sleep(std::time::Duration::from_millis(10));
    }
}

/// Writes `path` through a temporary file in the same folder, renamed when `fill` succeeds;
/// on failure the temporary file is removed and `path` is left as it was.
pub fn write_atomic<F>(path: &Path, fill: F) -> Result<(), ReportError>
where
    F: FnOnce(&mut BufWriter<File>) -> Result<(), ReportError>,
{
    let (tmp, file) = TempFile::create(path)?;
    let mut w = BufWriter::new(file);
    fill(&mut w)?;
    w.flush()?;
    w.get_ref().sync_all()?;
    drop(w);
    test_hold_before_rename();
    tmp.persist(path)?;
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn registered(p: &Path) -> bool {
        live_temp_files().iter().any(|q| q == p)
    }

    #[test]
    fn a_temporary_file_is_registered_while_it_exists_and_renamed_onto_the_final_name() {
        let dir = tempfile::tempdir().unwrap();
        let out = dir.path().join("a.json");
        let (tmp, mut f) = TempFile::create(&out).unwrap();
        let p = tmp.path().to_path_buf();
        assert_eq!(p, temp_path(&out));
        assert!(p.exists() && registered(&p));
        f.write_all(b"{}").unwrap();
        drop(f);
        tmp.persist(&out).unwrap();
        assert!(!p.exists() && !registered(&p));
        assert_eq!(std::fs::read(&out).unwrap(), b"{}");
    }

    #[test]
    fn a_dropped_temporary_file_is_removed_and_unregistered() {
        let dir = tempfile::tempdir().unwrap();
        let out = dir.path().join("b.csv");
        let (tmp, _f) = TempFile::create(&out).unwrap();
        let p = tmp.path().to_path_buf();
        drop(tmp);
        assert!(!p.exists() && !registered(&p));
        assert!(!out.exists());
        // A registered name whose file a library creates itself is removed the same way.
        let reg = TempFile::register(&out);
        let p = reg.path().to_path_buf();
        assert!(registered(&p));
        std::fs::write(&p, b"x").unwrap();
        drop(reg);
        assert!(!p.exists() && !registered(&p));
    }

    #[test]
    fn a_failed_fill_leaves_neither_the_final_nor_the_temporary_file() {
        let dir = tempfile::tempdir().unwrap();
        let out = dir.path().join("c.json");
        let e = write_atomic(&out, |w| {
            w.write_all(b"half")?;
            Err(ReportError::Io(std::io::Error::other("disk full")))
        });
        assert!(e.is_err());
        assert!(!out.exists() && !temp_path(&out).exists());
        assert!(!registered(&temp_path(&out)));
        assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 0);
        write_atomic(&out, |w| Ok(w.write_all(b"whole")?)).unwrap();
        assert_eq!(std::fs::read(&out).unwrap(), b"whole");
        assert!(!registered(&temp_path(&out)));
    }

    #[test]
    fn a_failed_rename_removes_the_temporary_file() {
        let dir = tempfile::tempdir().unwrap();
        // The final name is a non-empty folder: the rename fails.
        let out = dir.path().join("d.json");
        std::fs::create_dir(&out).unwrap();
        std::fs::write(out.join("keep"), b"").unwrap();
        let e = write_atomic(&out, |w| Ok(w.write_all(b"x")?));
        assert!(e.is_err());
        assert!(!temp_path(&out).exists() && !registered(&temp_path(&out)));
    }
}
