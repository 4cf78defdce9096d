//! Typical observed room-temperature effective moments by d^n, geometry and spin state,
//! `data/moment_ranges.csv`. This module alone knows the CSV layout.
//!
//! Columns: `dn`, `geometry` (oct, tet, sqpl), `multiplicity` (2S+1 of the ground term),
//! `ground_term` (label as the engine prints it, e.g. "5Eg"), `mu_min_bm`, `mu_max_bm` (μB),
//! `examples`, `source`.

use crate::error::{Error, Result};
use std::path::Path;

/// File name of the table, bundled and in a `--data` directory.
pub const FILE: &str = "moment_ranges.csv";
const BUNDLED: &str = include_str!("../../data/moment_ranges.csv");
const HEADER: [&str; 8] = [
    "dn",
    "geometry",
    "multiplicity",
    "ground_term",
    "mu_min_bm",
    "mu_max_bm",
    "examples",
    "source",
];
const GEOMETRIES: [&str; 3] = ["oct", "tet", "sqpl"];

/// One published range of μ_eff.
#[derive(Debug, Clone, PartialEq)]
pub struct MomentRange {
    pub dn: usize,
    /// Geometry short name (oct, tet, sqpl), as in [`crate::engine::Geometry::name`].
    pub geometry: String,
    /// Spin multiplicity 2S+1.
    pub multiplicity: i32,
    /// Ground term label, e.g. "5Eg".
    pub ground_term: String,
    /// Lower end of the typical range (μB).
    pub mu_min: f64,
    /// Upper end of the typical range (μB).
    pub mu_max: f64,
    pub examples: String,
    pub source: String,
}

/// The whole table.
#[derive(Debug, Clone)]
pub struct MomentRangeTable {
    rows: Vec<MomentRange>,
}

impl MomentRangeTable {
    /// The table bundled with the program.
    pub fn bundled() -> Result<Self> {
        Self::from_csv(BUNDLED)
    }

    /// DIR/moment_ranges.csv when `data_dir` is given and holds that file, else the bundled one.
    pub fn load(data_dir: Option<&Path>) -> Result<Self> {
        match super::read_override(data_dir, FILE)? {
            Some(text) => Self::from_csv(&text),
            None => Self::bundled(),
        }
    }

    /// Parses and validates CSV text in the layout described in the module docs.
    pub fn from_csv(text: &str) -> Result<Self> {
        let data_err = |message: String| Error::Data {
            table: FILE.to_string(),
            message,
        };
        let mut rows: Vec<MomentRange> = Vec::new();
        for (row, record) in super::records(FILE, text, &HEADER)? {
            let cell = |col: usize| record.get(col).unwrap_or("").to_string();
            let at = |col: usize, msg: String| {
                data_err(format!("row {row}, column {}: {msg}", HEADER[col]))
            };
            let number = |col: usize| -> Result<f64> {
                cell(col)
                    .parse::<f64>()
                    .ok()
                    .filter(|x| x.is_finite() && *x >= 0.0)
                    .ok_or_else(|| at(col, format!("'{}' is not a number ≥ 0", cell(col))))
            };
            let dn: usize = cell(0)
                .parse()
                .ok()
                .filter(|d| *d <= 10)
                .ok_or_else(|| at(0, format!("'{}' is not in 0..=10", cell(0))))?;
            let geometry = cell(1);
            if !GEOMETRIES.contains(&geometry.as_str()) {
                return Err(at(1, format!("'{geometry}' (accepted: oct, tet, sqpl)")));
            }
            let multiplicity: i32 = cell(2)
                .parse()
                .ok()
                .filter(|m| (1..=6).contains(m))
                .ok_or_else(|| at(2, format!("'{}' is not in 1..=6", cell(2))))?;
            let ground_term = cell(3);
            if !ground_term.starts_with(&multiplicity.to_string()) {
                return Err(at(
                    3,
                    format!("'{ground_term}' does not start with the multiplicity {multiplicity}"),
                ));
            }
            let mu_min = number(4)?;
            let mu_max = number(5)?;
            if mu_max < mu_min {
                return Err(at(5, format!("{mu_max} is below mu_min_bm {mu_min}")));
            }
            let source = cell(7);
            if source.is_empty() {
                return Err(at(7, "every row needs a source".into()));
            }
            if rows
                .iter()
                .any(|r| r.dn == dn && r.geometry == geometry && r.multiplicity == multiplicity)
            {
                return Err(at(
                    0,
                    format!("duplicate row for d{dn} {geometry} 2S+1 = {multiplicity}"),
                ));
            }
            rows.push(MomentRange {
                dn,
                geometry,
                multiplicity,
                ground_term,
                mu_min,
                mu_max,
                examples: cell(6),
                source,
            });
        }
        Ok(MomentRangeTable { rows })
    }

    /// All rows in file order.
    pub fn rows(&self) -> &[MomentRange] {
        &self.rows
    }

    /// The range for d^n in a geometry (short name) with ground multiplicity 2S+1.
    pub fn find(&self, dn: usize, geometry: &str, multiplicity: i32) -> Option<&MomentRange> {
        self.rows
            .iter()
            .find(|r| r.dn == dn && r.geometry == geometry && r.multiplicity == multiplicity)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bundled_table_loads() {
        let t = MomentRangeTable::bundled().unwrap();
        let r = t.find(8, "oct", 3).unwrap();
        assert_eq!(r.ground_term, "3A2g");
        // Ni(II) octahedral 2.9–3.3 μB (Figgis & Lewis 1960, from memory).
        assert_eq!((r.mu_min, r.mu_max), (2.9, 3.3));
        assert!(t.find(8, "oct", 1).is_none());
        for r in t.rows() {
            assert!(r.source.starts_with("[M]") || r.source.starts_with("[S]"));
        }
    }

    #[test]
    fn bad_rows_are_reported() {
        let head = "dn,geometry,multiplicity,ground_term,mu_min_bm,mu_max_bm,examples,source\n";
        let e =
            MomentRangeTable::from_csv(&format!("{head}11,oct,3,3A2g,2.9,3.3,,x\n")).unwrap_err();
        assert!(e.to_string().contains("row 2, column dn"), "{e}");
        let e =
            MomentRangeTable::from_csv(&format!("{head}8,oct,3,3A2g,3.3,2.9,,x\n")).unwrap_err();
        assert!(e.to_string().contains("below"), "{e}");
        let e =
            MomentRangeTable::from_csv(&format!("{head}8,hex,3,3A2g,2.9,3.3,,x\n")).unwrap_err();
        assert!(e.to_string().contains("accepted: oct"), "{e}");
        let e = MomentRangeTable::from_csv(&format!("{head}8,oct,3,3A2g,2.9,3.3,,\n")).unwrap_err();
        assert!(e.to_string().contains("source"), "{e}");
    }
}
