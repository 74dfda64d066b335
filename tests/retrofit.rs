//! Tests: retrofit (see DEVELOPERS.md).
