//! Verification: indices.
