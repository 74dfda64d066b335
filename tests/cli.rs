//! Tests: cli (see DEVELOPERS.md).
