//! Chemistry data tables: metal ions and ligands.
//!
//! This module alone knows the CSV layouts of `data/*.csv`. The bundled copies are embedded in
//! the binary with `include_str!` and parsed once; a directory of edited copies (the CLI's global
//! `--data DIR`) replaces them file by file. Every table is validated when it is parsed: each row
//! needs a non-empty `source`, numbers must lie in physically sensible ranges, and names must be
//! unique. `data/README.md` gives the source and unit of every column.
//!
//! Reading a `--data` directory ([`Tables::from_dir`]) is the only file access in the library.

pub mod bond_lengths;
pub mod charge_transfer;
pub mod covalent_radii;
pub mod ions;
pub mod ligands;
pub mod moment_ranges;
pub mod pascal;
pub mod reported;

pub use charge_transfer::{ChargeTransferKind, ChargeTransferOnset, ChargeTransferTable};
pub use ions::{Ion, IonTable, Provenance, ReferenceState, TransitionSeries};
pub use ligands::{FieldBasis, Ligand, LigandTable, PiRole};
pub use reported::{Category, ReportedComplex, ReportedSpin, ReportedTable};

use crate::error::{Error, Result};
use crate::param::Param;
use std::path::Path;
use std::sync::OnceLock;

/// File name of the ion table inside `data/` or a `--data` directory.
pub const IONS_FILE: &str = "ions.csv";
/// File name of the ligand table inside `data/` or a `--data` directory.
pub const LIGANDS_FILE: &str = "ligands.csv";
/// File name of the reported-spin-state table inside `data/` or a `--data` directory.
pub const REPORTED_FILE: &str = "reported_spin_states.csv";

const BUNDLED_IONS: &str = include_str!("../../data/ions.csv");
const BUNDLED_LIGANDS: &str = include_str!("../../data/ligands.csv");
const BUNDLED_REPORTED: &str = include_str!("../../data/reported_spin_states.csv");

/// All chemistry tables, parsed and validated.
#[derive(Debug, Clone)]
pub struct Tables {
    pub ions: IonTable,
    pub ligands: LigandTable,
    /// Literature spin states (validated against the ligand table).
    pub reported: ReportedTable,
    /// Charge-transfer onsets per ligand (`charge_transfer.csv`, validated against the ligand
    /// table).
    pub charge_transfer: ChargeTransferTable,
}

impl Tables {
    /// The tables bundled with the binary, parsed on first use.
    pub fn bundled() -> Result<&'static Tables> {
        static BUNDLED: OnceLock<Result<Tables>> = OnceLock::new();
        BUNDLED
            .get_or_init(|| Tables::parse(BUNDLED_IONS, BUNDLED_LIGANDS, BUNDLED_REPORTED))
            .as_ref()
            .map_err(Clone::clone)
    }

    /// Parses the ion and ligand tables from CSV text, with no reported spin states (for
    /// synthetic tables in tests and benchmarks).
    pub fn parse_chemistry(ions_csv: &str, ligands_csv: &str) -> Result<Tables> {
        Ok(Tables {
            ions: IonTable::parse(ions_csv)?,
            ligands: LigandTable::parse(ligands_csv)?,
            reported: ReportedTable::default(),
            charge_transfer: ChargeTransferTable::default(),
        })
    }

    /// Parses the tables from CSV text.
    pub fn parse(ions_csv: &str, ligands_csv: &str, reported_csv: &str) -> Result<Tables> {
        let ligands = LigandTable::parse(ligands_csv)?;
        Ok(Tables {
            ions: IonTable::parse(ions_csv)?,
            reported: ReportedTable::parse(reported_csv, &ligands)?,
            charge_transfer: ChargeTransferTable::parse(charge_transfer::BUNDLED, &ligands)?,
            ligands,
        })
    }

    /// The tables with every file present in `dir` ([`IONS_FILE`], [`LIGANDS_FILE`]) replacing
    /// the bundled copy; files that are absent keep the bundled data.
    pub fn from_dir(dir: &Path) -> Result<Tables> {
        if !dir.is_dir() {
            return Err(Error::invalid(
                Param::DataDir,
                dir.display(),
                "an existing directory holding edited copies of ions.csv and/or ligands.csv",
            ));
        }
        let read = |name: &str, bundled: &'static str| -> Result<String> {
            let path = dir.join(name);
            if path.exists() {
                crate::input_file::read_text(&path).map_err(|e| Error::Data {
                    table: path.display().to_string(),
                    message: format!("cannot be read: {e}"),
                })
            } else {
                Ok(bundled.to_string())
            }
        };
        let ions = read(IONS_FILE, BUNDLED_IONS)?;
        let ligands = read(LIGANDS_FILE, BUNDLED_LIGANDS)?;
        let reported = read(REPORTED_FILE, BUNDLED_REPORTED)?;
        let charge_transfer = read(charge_transfer::FILE, charge_transfer::BUNDLED)?;
        let ligands = LigandTable::parse(&ligands).map_err(|e| in_dir(e, dir, LIGANDS_FILE))?;
        Ok(Tables {
            ions: IonTable::parse(&ions).map_err(|e| in_dir(e, dir, IONS_FILE))?,
            reported: ReportedTable::parse(&reported, &ligands)
                .map_err(|e| in_dir(e, dir, REPORTED_FILE))?,
            charge_transfer: ChargeTransferTable::parse(&charge_transfer, &ligands)
                .map_err(|e| in_dir(e, dir, charge_transfer::FILE))?,
            ligands,
        })
    }
}

/// Names the file of a `--data` directory in a table error.
fn in_dir(e: Error, dir: &Path, file: &str) -> Error {
    match e {
        Error::Data { message, .. } => Error::Data {
            table: dir.join(file).display().to_string(),
            message,
        },
        other => other,
    }
}

/// The text of DIR/`file` when a `--data` directory is given and holds that file.
pub(crate) fn read_override(data_dir: Option<&Path>, file: &str) -> Result<Option<String>> {
    let Some(dir) = data_dir else {
        return Ok(None);
    };
    let path = dir.join(file);
    if !path.is_file() {
        return Ok(None);
    }
    crate::input_file::read_text(&path)
        .map(Some)
        .map_err(|e| Error::Data {
            table: path.display().to_string(),
            message: format!("cannot be read: {e}"),
        })
}

/// Reads the records of a CSV text with a header row, checking the header against `expected`
/// (same names, same order). Returns the records with their 1-based line numbers.
pub(crate) fn records(
    table: &str,
    text: &str,
    expected: &[&str],
) -> Result<Vec<(usize, csv::StringRecord)>> {
    if let Some(line) = crate::csv_input::unclosed_quote(text, None) {
        return Err(Error::Data {
            table: table.to_string(),
            message: crate::csv_input::unclosed_message(line),
        });
    }
    let mut reader = csv::ReaderBuilder::new()
        .has_headers(true)
        .trim(csv::Trim::All)
        .from_reader(text.as_bytes());
    let header = reader.headers().map_err(|e| data_error(table, e))?.clone();
    let found: Vec<&str> = header.iter().collect();
    if found != expected {
        return Err(Error::Data {
            table: table.to_string(),
            message: format!(
                "header is '{}'; expected '{}'",
                found.join(","),
                expected.join(",")
            ),
        });
    }
    let lines = crate::csv_input::LineIndex::new(text, None);
    let mut out = Vec::new();
    for rec in reader.records() {
        let rec = rec.map_err(|e| data_error(table, e))?;
        let line = rec.position().map_or(0, |p| lines.line_of(p.byte()));
        out.push((line, rec));
    }
    if out.is_empty() {
        return Err(Error::Data {
            table: table.to_string(),
            message: "has no rows".into(),
        });
    }
    Ok(out)
}

fn data_error(table: &str, e: csv::Error) -> Error {
    Error::Data {
        table: table.to_string(),
        message: e.to_string(),
    }
}

/// One cell of a record, with helpers that turn bad cells into errors naming line and column.
pub(crate) struct Cell<'a> {
    pub table: &'a str,
    pub line: usize,
    pub column: &'a str,
    pub text: &'a str,
}

impl<'a> Cell<'a> {
    pub fn of(
        table: &'a str,
        line: usize,
        rec: &'a csv::StringRecord,
        header: &[&'a str],
        column: &'a str,
    ) -> Self {
        let idx = header
            .iter()
            .position(|h| *h == column)
            .expect("column names come from the layout constant");
        Cell {
            table,
            line,
            column,
            text: rec.get(idx).unwrap_or(""),
        }
    }

    pub fn error(&self, what: impl std::fmt::Display) -> Error {
        Error::Data {
            table: self.table.to_string(),
            message: format!("line {}, column {}: {what}", self.line, self.column),
        }
    }

    /// A required, non-empty text.
    pub fn text(&self) -> Result<String> {
        if self.text.is_empty() {
            Err(self.error("is empty; a value is required"))
        } else {
            Ok(self.text.to_string())
        }
    }

    /// An optional text (empty → None).
    pub fn optional_text(&self) -> Option<String> {
        (!self.text.is_empty()).then(|| self.text.to_string())
    }

    /// A required integer in `range`.
    pub fn int(&self, range: std::ops::RangeInclusive<i32>) -> Result<i32> {
        let v: i32 = self
            .text
            .parse()
            .map_err(|_| self.error(format!("'{}' is not an integer", self.text)))?;
        if !range.contains(&v) {
            return Err(self.error(format!(
                "{v} is outside {}..={}",
                range.start(),
                range.end()
            )));
        }
        Ok(v)
    }

    /// A required number in `range`.
    pub fn number(&self, range: std::ops::RangeInclusive<f64>, unit: &str) -> Result<f64> {
        self.optional_number(range, unit)?
            .ok_or_else(|| self.error("is empty; a value is required"))
    }

    /// An optional number in `range` (empty → None).
    pub fn optional_number(
        &self,
        range: std::ops::RangeInclusive<f64>,
        unit: &str,
    ) -> Result<Option<f64>> {
        if self.text.is_empty() {
            return Ok(None);
        }
        let v: f64 = self
            .text
            .parse()
            .map_err(|_| self.error(format!("'{}' is not a number", self.text)))?;
        if !v.is_finite() || !range.contains(&v) {
            return Err(self.error(format!(
                "{v} is outside the sensible range {}..={}{unit}",
                range.start(),
                range.end()
            )));
        }
        Ok(Some(v))
    }
}
