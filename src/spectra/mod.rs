//! Electronic spectra of d^n complexes: units of band positions, spin-allowed transitions and
//! their strong-field configurations, the fit of Dq, B and C to observed band maxima with
//! assignment search, the tetragonal (Dq, Ds, Dt) fit of split bands, and the band-count check.
//!
//! Everything here works in cm⁻¹ and calls the engine; nothing does IO.

pub mod assign;
pub mod configuration;
pub mod count;
pub mod fit;
pub mod tetragonal;
pub mod transitions;
pub mod units;

pub use count::{count_bands, BandCount, CountRequest};
pub use fit::{fit_bands, BandFit, FitOutcome, FitRequest};
pub use transitions::{SpinCandidate, SpinChoice, SpinKind, Transition, TransitionKey};
pub use units::EnergyUnit;
