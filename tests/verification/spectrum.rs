//! Verification: spectrum.
