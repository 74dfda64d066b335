//! Outputs: the results workbook, CSV, GeoJSON, JSON and the terminal summary, tested on
//! hand-built reports (every sheet and rule of interface.md, independent of the engine) and
//! on the built binary run over inventories the tests generate.

pub mod binary;
mod brief;
mod changes;
pub mod exports;
mod print;
mod sample;
pub mod streaming;
pub mod workbook;
