//! Verification against published sources: one test per worked example or table row, each
//! citing its source beside the check and stating its tolerance.

mod asce41;
mod audit;
mod bldg;
mod capacity;
mod flags;
mod geodesy;
mod indices;
mod knapsack;
mod n2;
mod period;
mod spectrum;
