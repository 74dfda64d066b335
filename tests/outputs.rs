//! Tests: outputs (see DEVELOPERS.md).
