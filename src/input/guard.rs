/*!
A safety net around the spreadsheet library: calamine can panic on some malformed files
(found by the hostile-input property tests: an `.xlsx` whose declared dimension ends before
it starts, a truncated compound file). Reading runs inside [`guarded`], which turns such a
panic into an ordinary "cannot read the file" error. While a guarded call runs on a thread,
the panic message of that thread is not printed (the error says what happened in one line);
panics anywhere else go to the previous panic hook unchanged.
*/

use std::cell::Cell;
use std::panic::{AssertUnwindSafe, catch_unwind};
use std::sync::Once;
use std::sync::atomic::{AtomicUsize, Ordering};

thread_local! {
    static GUARDED: Cell<bool> = const { Cell::new(false) };
}

static HOOK: Once = Once::new();

/// Guarded panics whose location is in this crate's own source (a bug of ours, not of the
/// spreadsheet library): the hostile-input tests require this to stay 0.
static OWN_PANICS: AtomicUsize = AtomicUsize::new(0);

/// How many guarded panics came from this crate's own code.
pub fn own_panics() -> usize {
    OWN_PANICS.load(Ordering::Relaxed)
}

/// Whether a panic location is in this crate's source: `src/...` when built in its own
/// workspace, the absolute path when built as a dependency (the fuzz crate, tests/fuzz).
fn is_own_source(file: &str) -> bool {
    file.starts_with("src/") || file.starts_with(concat!(env!("CARGO_MANIFEST_DIR"), "/src/"))
}

fn install_hook() {
    HOOK.call_once(|| {
        let previous = std::panic::take_hook();
        std::panic::set_hook(Box::new(move |info| {
            if !GUARDED.with(Cell::get) {
                previous(info);
            } else if info.location().is_some_and(|l| is_own_source(l.file())) {
                OWN_PANICS.fetch_add(1, Ordering::Relaxed);
            }
        }));
    });
}

/// Runs `f`; a panic inside it becomes `Err(message)`.
pub fn guarded<T>(f: impl FnOnce() -> T) -> Result<T, String> {
    install_hook();
    let was = GUARDED.with(|g| g.replace(true));
    let out = catch_unwind(AssertUnwindSafe(f));
    GUARDED.with(|g| g.set(was));
    out.map_err(|payload| {
        payload
            .downcast_ref::<&str>()
            .map(|s| (*s).to_string())
            .or_else(|| payload.downcast_ref::<String>().cloned())
            .unwrap_or_else(|| "unknown failure".into())
            .lines()
            .next()
            .unwrap_or_default()
            .to_string()
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_panic_becomes_an_error_and_values_pass_through() {
        assert_eq!(guarded(|| 7), Ok(7));
        let e = guarded(|| -> u8 { panic!("boom\nsecond line") });
        assert_eq!(e, Err("boom".to_string()));
        // The panic above is located in this crate's source, so it is counted as ours.
        assert!(own_panics() >= 1);
        assert!(is_own_source("src/input/xlsx.rs"));
        assert!(is_own_source(concat!(
            env!("CARGO_MANIFEST_DIR"),
            "/src/input/xlsx.rs"
        )));
        assert!(!is_own_source(
            "/root/.cargo/registry/src/calamine-0.38.0/src/xlsx/mod.rs"
        ));
    }
}
