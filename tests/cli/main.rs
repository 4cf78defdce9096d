//! The one integration-test crate: every test module links the library once (a change to the
//! library relinks one test binary, not one per file). Modules by topic; `common` holds the
//! helpers that run the real binary.

mod bands;
mod batch_integrity;
mod batch_stream;
mod check;
mod check_structure;
mod cli_robustness;
mod common;
mod crossover;
mod data;
mod demo;
mod diagram;
mod engine;
mod evans;
mod fit_bands;
mod fuzz;
mod golden;
mod levels;
mod limits;
mod magnetism;
mod moment;
mod output;
mod plots;
mod predict;
mod sco;
mod screen;
mod screen_fast;
mod structure;
mod structure_field;
mod susceptibility;
mod tetragonal_fit;
mod zeeman_paths;
