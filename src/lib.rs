//! spinstate: spin states of d-block complexes from a full d^n ligand-field calculation.

pub mod complex;
pub mod engine;
pub mod error;
pub mod predict;
pub mod report;
pub mod tables;

pub use error::{Error, Result};
