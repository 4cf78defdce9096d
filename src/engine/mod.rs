//! The d^n ligand-field engine: determinant basis, electron repulsion, ligand field, spin–orbit
//! coupling, block diagonalisation, symmetry labels, crossover points and energy diagrams.
//!
//! The engine does no IO: it takes numbers and returns plain result structs.

pub mod angular;
pub mod basis;
pub mod crossover;
pub mod diagram;
pub mod field;
pub mod geometry;
pub mod hermitian;
pub mod labels;
pub mod levels;
pub mod operators;
pub mod projection;
pub mod shell;
pub mod spin_orbit;
pub mod symmetry;
pub mod terms;

pub use crossover::{
    crossover, ground_spin_map, spin_from_map, tanabe_sugano_c_over_b, Crossover, SpinGround,
};
pub use diagram::{diagram, Diagram, Series};
pub use field::LigandField;
pub use geometry::Geometry;
pub use labels::{Irrep, LevelLabel, Species, Term};
pub use levels::{Calculation, Level, Spectrum};
pub use spin_orbit::{SpinOrbitLevel, SpinOrbitSolution};
pub use symmetry::PointGroup;
