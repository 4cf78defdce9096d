//! spinstate: spin states of d-block complexes from a full d^n ligand-field calculation.

pub mod calibration;
pub mod check;
pub mod complex;
pub mod csv_input;
pub mod engine;
pub mod error;
pub mod estimate;
pub mod formula;
pub mod input_file;
pub mod least_squares;
pub mod magnetism;
pub mod measured;
pub mod param;
#[doc = include_str!("manual.md")]
pub mod manual {}
pub mod predict;
pub mod report;
pub mod sco;
pub mod screen;
pub mod spectra;
pub mod structure;
pub mod tables;
pub mod units;

pub use error::{Error, NameKind, Result};
pub use param::Param;
pub mod plot;
