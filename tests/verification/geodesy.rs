//! Verification: geodesy.
