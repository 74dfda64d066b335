//! Tests: input_cases (see DEVELOPERS.md).
