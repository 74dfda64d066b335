//! templates/settings.toml and the settings struct stay in step. Regenerate the file after
//! adding a key with `SEISTRIAGE_BLESS=1 cargo test --test integration settings_file`.

use std::collections::BTreeSet;
use std::path::PathBuf;

use seistriage::settings::{KEYS, Settings};

fn committed() -> (PathBuf, String) {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("templates/settings.toml");
    if std::env::var_os("SEISTRIAGE_BLESS").is_some() {
        std::fs::write(&path, seistriage::template::settings_toml()).unwrap();
    }
    let text = std::fs::read_to_string(&path).unwrap();
    (path, text)
}

#[test]
fn the_settings_file_lists_every_key_and_no_other() {
    let (path, text) = committed();
    let listed: BTreeSet<String> = text
        .lines()
        .filter_map(|l| l.strip_prefix("# "))
        .filter_map(|l| l.split_once(" = ").map(|(k, _)| k.trim().to_string()))
        .collect();
    let keys: BTreeSet<String> = KEYS.iter().map(|k| k.key.to_string()).collect();
    let missing: Vec<_> = keys.difference(&listed).collect();
    let extra: Vec<_> = listed.difference(&keys).collect();
    assert!(
        missing.is_empty() && extra.is_empty(),
        "{}: missing {missing:?}, not in the table {extra:?}; regenerate with SEISTRIAGE_BLESS=1",
        path.display()
    );
    for k in KEYS {
        assert!(
            text.contains(k.tag) && text.contains(k.doc),
            "{}: tag or doc out of step",
            k.key
        );
    }
    assert!(text.contains("[[era]]"));
}

#[test]
fn uncommenting_every_key_gives_the_built_in_defaults() {
    let (_, text) = committed();
    let uncommented: String = text
        .lines()
        .filter_map(|l| l.strip_prefix("# "))
        .map(|l| format!("{l}\n"))
        .collect();
    let mut s = Settings::default();
    s.apply_toml(&uncommented).unwrap();
    assert_eq!(s, Settings::default());
    // And the file is exactly what the table renders.
    assert_eq!(
        text,
        seistriage::template::settings_toml(),
        "regenerate with SEISTRIAGE_BLESS=1"
    );
}

#[test]
fn a_changed_default_in_the_file_would_be_caught() {
    // The comparison above can fail: a file with one default edited parses to other settings.
    let edited =
        seistriage::template::settings_toml().replace("# gamma_el = 1.5", "# gamma_el = 1.25");
    let uncommented: String = edited
        .lines()
        .filter_map(|l| l.strip_prefix("# "))
        .map(|l| format!("{l}\n"))
        .collect();
    let mut s = Settings::default();
    s.apply_toml(&uncommented).unwrap();
    assert_ne!(s, Settings::default());
}
