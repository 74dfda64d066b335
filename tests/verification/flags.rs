//! Verification: flags.
