//! Verification: capacity.
