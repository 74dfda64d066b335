//! The one integration-test binary: verification against published sources, command-line
//! tests that drive the built binary, input-reading cases, properties and regressions.
#![allow(clippy::unwrap_used, clippy::expect_used, clippy::float_cmp)]

mod common;

mod cli;
mod demo;
mod geography;
mod input_cases;
mod outputs;
mod properties;
mod regression;
mod retrofit;
mod uncertainty;
mod verification;
