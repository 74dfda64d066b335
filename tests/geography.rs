//! Tests: geography (see DEVELOPERS.md).
