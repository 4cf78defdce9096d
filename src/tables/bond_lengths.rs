//! Metal–donor bond lengths of the low-spin and high-spin states, `data/bond_lengths.csv`.
//! This module alone knows the CSV layout.
//!
//! Columns: `metal` (element symbol), `oxidation_state`, `donor` (element symbol of the donor
//! atom), `donor_class` (`any`, or a kind of donor such as `imine`, `amine`, `phenolate` when the
//! published values are per donor type), `ls_min_a`, `ls_max_a`, `hs_min_a`, `hs_max_a` (Å; the
//! low-spin and high-spin ranges, a single published value as min = max, all four empty when the
//! source gives only the change), `delta_r_a` (Å, high spin minus low spin), `what`, `source`.
//!
//! Several rows may share metal, oxidation state, donor and class (a typical range and a
//! published example): [`BondLengthTable::reference`] then joins their ranges.

use crate::error::{Error, Result};
use std::path::Path;

/// File name of the table, bundled and in a `--data` directory.
pub const FILE: &str = "bond_lengths.csv";
const BUNDLED: &str = include_str!("../../data/bond_lengths.csv");
const HEADER: [&str; 11] = [
    "metal",
    "oxidation_state",
    "donor",
    "donor_class",
    "ls_min_a",
    "ls_max_a",
    "hs_min_a",
    "hs_max_a",
    "delta_r_a",
    "what",
    "source",
];
/// Bond lengths outside this range (Å) are rejected as typing errors.
pub const SENSIBLE_A: (f64, f64) = (1.5, 3.0);

/// One row: a published range or example.
#[derive(Debug, Clone, PartialEq)]
pub struct BondLengthRow {
    pub metal: String,
    pub oxidation_state: i32,
    /// Donor element, e.g. "N".
    pub donor: String,
    /// "any" or a donor type such as "imine".
    pub donor_class: String,
    /// Low-spin range (Å), when given.
    pub low_spin: Option<(f64, f64)>,
    /// High-spin range (Å), when given.
    pub high_spin: Option<(f64, f64)>,
    /// Change of the bond length from low to high spin (Å), when given.
    pub delta_r: Option<f64>,
    pub what: String,
    pub source: String,
}

/// The joined reference ranges for one metal, oxidation state and donor element.
#[derive(Debug, Clone, PartialEq)]
pub struct Reference {
    /// Low-spin range (Å): the smallest range holding every row's low-spin range.
    pub low_spin: (f64, f64),
    /// High-spin range (Å).
    pub high_spin: (f64, f64),
    /// The rows joined.
    pub rows: Vec<BondLengthRow>,
}

/// The whole table.
#[derive(Debug, Clone)]
pub struct BondLengthTable {
    rows: Vec<BondLengthRow>,
}

impl BondLengthTable {
    /// The table bundled with the program.
    pub fn bundled() -> Result<Self> {
        Self::from_csv(BUNDLED)
    }

    /// DIR/bond_lengths.csv when `data_dir` is given and holds that file, else the bundled one.
    pub fn load(data_dir: Option<&Path>) -> Result<Self> {
        if let Some(dir) = data_dir {
            let path = dir.join(FILE);
            if path.is_file() {
                let text = crate::input_file::read_text(&path).map_err(|e| Error::Data {
                    table: path.display().to_string(),
                    message: format!("cannot be read: {e}"),
                })?;
                return Self::from_csv(&text).map_err(|e| match e {
                    Error::Data { message, .. } => Error::Data {
                        table: path.display().to_string(),
                        message,
                    },
                    other => other,
                });
            }
        }
        Self::bundled()
    }

    /// Parses and validates CSV text in the layout described in the module docs.
    pub fn from_csv(text: &str) -> Result<Self> {
        let data_err = |message: String| Error::Data {
            table: FILE.to_string(),
            message,
        };
        if let Some(line) = crate::csv_input::unclosed_quote(text, None) {
            return Err(data_err(crate::csv_input::unclosed_message(line)));
        }
        let mut reader = csv::ReaderBuilder::new()
            .trim(csv::Trim::All)
            .from_reader(text.as_bytes());
        let header = reader
            .headers()
            .map_err(|e| data_err(format!("bad header: {e}")))?
            .clone();
        if header.iter().collect::<Vec<_>>() != HEADER {
            return Err(data_err(format!("header must be {}", HEADER.join(","))));
        }
        let mut rows = Vec::new();
        // "row N" is the line of the file (header = 1), true after CRLF and blank lines.
        let lines = crate::csv_input::LineIndex::new(text, None);
        for record in reader.records() {
            let record = record.map_err(|e| {
                let row = e.position().map_or(0, |p| lines.line_of(p.byte()));
                data_err(format!("row {row}: {e}"))
            })?;
            let row = record.position().map_or(0, |p| lines.line_of(p.byte()));
            let cell = |col: usize| record.get(col).unwrap_or("").to_string();
            let at = |col: usize, msg: String| {
                data_err(format!("row {row}, column {}: {msg}", HEADER[col]))
            };
            let length = |col: usize| -> Result<Option<f64>> {
                let text = cell(col);
                if text.is_empty() {
                    return Ok(None);
                }
                text.parse::<f64>()
                    .ok()
                    .filter(|x| (SENSIBLE_A.0..=SENSIBLE_A.1).contains(x))
                    .map(Some)
                    .ok_or_else(|| {
                        at(
                            col,
                            format!(
                                "'{text}' is not a bond length in {}..={} Å",
                                SENSIBLE_A.0, SENSIBLE_A.1
                            ),
                        )
                    })
            };
            let range = |lo: usize| -> Result<Option<(f64, f64)>> {
                match (length(lo)?, length(lo + 1)?) {
                    (None, None) => Ok(None),
                    (Some(a), Some(b)) if a <= b => Ok(Some((a, b))),
                    (Some(a), Some(b)) => {
                        Err(at(lo + 1, format!("{b} is below {} {a}", HEADER[lo])))
                    }
                    _ => Err(at(lo, "give both ends of the range, or neither".into())),
                }
            };
            let metal = cell(0);
            if metal.is_empty() {
                return Err(at(0, "is empty; an element symbol is required".into()));
            }
            let oxidation_state: i32 = cell(1)
                .parse()
                .ok()
                .filter(|o| (0..=8).contains(o))
                .ok_or_else(|| at(1, format!("'{}' is not an oxidation state 0..=8", cell(1))))?;
            let donor = cell(2);
            if donor.is_empty() {
                return Err(at(2, "is empty; a donor element symbol is required".into()));
            }
            let donor_class = cell(3);
            if donor_class.is_empty() {
                return Err(at(
                    3,
                    "is empty; use 'any' or a donor type such as imine".into(),
                ));
            }
            let low_spin = range(4)?;
            let high_spin = range(6)?;
            if low_spin.is_some() != high_spin.is_some() {
                return Err(at(
                    4,
                    "give both the low-spin and the high-spin range, or neither".into(),
                ));
            }
            // Relations between columns: the two ranges may touch but not overlap, or a bond
            // length inside both would be read as either spin state.
            if let (Some((ls_min, ls_max)), Some((hs_min, hs_max))) = (low_spin, high_spin) {
                if ls_min.max(hs_min) < ls_max.min(hs_max) {
                    return Err(at(
                        5,
                        format!(
                            "the low-spin range {ls_min}–{ls_max} Å overlaps the high-spin range {hs_min}–{hs_max} Å; the ranges may touch but not overlap"
                        ),
                    ));
                }
            }
            let delta_r = match cell(8) {
                t if t.is_empty() => None,
                t => Some(
                    t.parse::<f64>()
                        .ok()
                        .filter(|x| x.is_finite() && x.abs() <= 0.5)
                        .ok_or_else(|| at(8, format!("'{t}' is not a change in -0.5..=0.5 Å")))?,
                ),
            };
            // The change must go the way the ranges go (high spin minus low spin).
            if let (Some((ls_min, ls_max)), Some((hs_min, hs_max)), Some(dr)) =
                (low_spin, high_spin, delta_r)
            {
                let mid = (hs_min + hs_max - ls_min - ls_max) / 2.0;
                if dr * mid < 0.0 {
                    return Err(at(
                        8,
                        format!(
                            "{dr} Å has the opposite sign to the ranges (high-spin middle minus low-spin middle = {mid:.3} Å)"
                        ),
                    ));
                }
            }
            if low_spin.is_none() && delta_r.is_none() {
                return Err(at(
                    8,
                    "a row needs the two ranges or the change delta_r_a".into(),
                ));
            }
            let source = cell(10);
            if source.is_empty() {
                return Err(at(10, "every row needs a source".into()));
            }
            rows.push(BondLengthRow {
                metal,
                oxidation_state,
                donor,
                donor_class,
                low_spin,
                high_spin,
                delta_r,
                what: cell(9),
                source,
            });
        }
        if rows.is_empty() {
            return Err(data_err("has no rows".into()));
        }
        Ok(BondLengthTable { rows })
    }

    /// All rows in file order.
    pub fn rows(&self) -> &[BondLengthRow] {
        &self.rows
    }

    /// Every row for a metal (any case), oxidation state and donor element.
    pub fn rows_for(&self, metal: &str, oxidation_state: i32, donor: &str) -> Vec<&BondLengthRow> {
        self.rows
            .iter()
            .filter(|r| {
                r.metal.eq_ignore_ascii_case(metal)
                    && r.oxidation_state == oxidation_state
                    && r.donor.eq_ignore_ascii_case(donor)
            })
            .collect()
    }

    /// The joined ranges of the rows with donor class `any` and both ranges given; None when
    /// there are none (the table then has no reference range for this donor set).
    pub fn reference(&self, metal: &str, oxidation_state: i32, donor: &str) -> Option<Reference> {
        let rows: Vec<BondLengthRow> = self
            .rows_for(metal, oxidation_state, donor)
            .into_iter()
            .filter(|r| r.donor_class == "any" && r.low_spin.is_some())
            .cloned()
            .collect();
        let join = |pick: fn(&BondLengthRow) -> Option<(f64, f64)>| {
            rows.iter()
                .filter_map(pick)
                .fold(None, |acc: Option<(f64, f64)>, (a, b)| {
                    Some(acc.map_or((a, b), |(x, y)| (x.min(a), y.max(b))))
                })
        };
        let low_spin = join(|r| r.low_spin)?;
        let high_spin = join(|r| r.high_spin)?;
        Some(Reference {
            low_spin,
            high_spin,
            rows,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bundled_table_loads_with_sources() {
        let t = BondLengthTable::bundled().unwrap();
        assert!(t.rows().iter().all(|r| !r.source.is_empty()));
        // Fe(II)–N: the typical ranges 1.95–2.00 / 2.15–2.20 Å (Gütlich & Goodwin 2004; Guionneau
        // 2004; from memory) joined with [Fe(2-pic)3]Cl2·EtOH, 2.032 Å LS and 2.199 Å HS (IUPAC
        // Gold Book, "spin crossover").
        let r = t.reference("fe", 2, "N").unwrap();
        assert_eq!(r.low_spin, (1.95, 2.032));
        assert_eq!(r.high_spin, (2.15, 2.20));
        assert_eq!(r.rows.len(), 2);
        // Co(II)–N has only the change (Crystals 2018, 8, 155): no reference range.
        assert!(t.reference("Co", 2, "N").is_none());
        assert_eq!(t.rows_for("Co", 2, "N")[0].delta_r, Some(0.10));
        // Fe(III)–N is given per donor type, and as their union for a mean over N donors.
        assert_eq!(t.rows_for("Fe", 3, "N").len(), 3);
        let r = t.reference("Fe", 3, "N").unwrap();
        assert_eq!((r.low_spin, r.high_spin), ((1.92, 2.08), (2.09, 2.26)));
    }

    #[test]
    fn bad_rows_are_reported() {
        let head = HEADER.join(",");
        let e = BondLengthTable::from_csv(&format!("{head}\nFe,2,N,any,2.0,1.9,2.1,2.2,,x,src\n"))
            .unwrap_err();
        assert!(e.to_string().contains("row 2, column ls_max_a"), "{e}");
        let e = BondLengthTable::from_csv(&format!("{head}\nFe,2,N,any,1.9,2.0,2.1,2.2,,x,\n"))
            .unwrap_err();
        assert!(e.to_string().contains("source"), "{e}");
        let e = BondLengthTable::from_csv(&format!("{head}\nFe,2,N,any,19,20,2.1,2.2,,x,s\n"))
            .unwrap_err();
        assert!(e.to_string().contains("1.5..=3"), "{e}");
        let e = BondLengthTable::from_csv(&format!("{head}\nFe,2,N,any,,,,,,x,s\n")).unwrap_err();
        assert!(e.to_string().contains("delta_r_a"), "{e}");
        let e = BondLengthTable::from_csv(&format!("{head}\n")).unwrap_err();
        assert!(e.to_string().contains("no rows"), "{e}");
        let e = BondLengthTable::from_csv("metal,ox\nFe,2\n").unwrap_err();
        assert!(e.to_string().contains("header must be"), "{e}");
    }
}
