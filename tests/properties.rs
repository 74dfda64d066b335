//! Tests: properties (see DEVELOPERS.md).
