//! Verification: asce41.
