//! templates/settings.toml and the settings struct stay in step.
