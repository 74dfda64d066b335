//! Verification: period.
