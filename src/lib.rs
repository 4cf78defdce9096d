//! spinstate: spin states of d-block complexes from a full d^n ligand-field calculation.

pub mod engine;
pub mod error;
pub mod report;
pub mod spectra;

pub use error::{Error, Result};
