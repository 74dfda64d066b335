//! Tests: regression (see DEVELOPERS.md).
