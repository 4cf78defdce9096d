//! The data tables of `data/*.csv`: metal ions, ligands, reported spin states, charge-transfer
//! onsets, Pascal constants, moment ranges, bond lengths and covalent radii.
//!
//! Each table module alone knows its CSV layout and implements [`Table`] once: file name,
//! header, row type and the validation of one row, with every cell checked by the shared
//! [`Cell`] helpers (a bad cell is one line naming the table, the line and the column). The
//! bundled copies are embedded in the binary with `include_str!`; [`DataSet`] holds every table
//! of a run, bundled or from a directory of edited copies (the CLI's global `--data DIR`, which
//! replaces the bundled files it contains), and parses each one at most once, on first use.
//! `data/README.md` gives the source and unit of every column.
//!
//! Reading a `--data` directory ([`DataSet::from_dir`]) is the only file access in the library.

pub mod bond_lengths;
mod cell;
pub mod charge_transfer;
pub mod covalent_radii;
mod data_set;
pub mod ions;
pub mod ligands;
pub mod moment_ranges;
pub mod pascal;
pub mod reported;
mod table;

pub use bond_lengths::BondLengthTable;
pub use cell::Cell;
pub use charge_transfer::{ChargeTransferKind, ChargeTransferOnset, ChargeTransferTable};
pub use covalent_radii::CovalentRadii;
pub use data_set::DataSet;
pub use ions::{Ion, IonTable, Provenance, ReferenceState, TransitionSeries};
pub use ligands::{FieldBasis, Ligand, LigandTable, PiRole};
pub use moment_ranges::MomentRangeTable;
pub use pascal::PascalTable;
pub use reported::{Category, ReportedComplex, ReportedSpin, ReportedTable};
pub use table::{Record, Table};
