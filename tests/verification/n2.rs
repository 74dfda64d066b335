//! Verification: n2.
