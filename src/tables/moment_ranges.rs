//! Typical observed room-temperature effective moments by d^n, geometry and spin state,
//! `data/moment_ranges.csv`. This module alone knows the CSV layout.
//!
//! Columns: `dn`, `geometry` (oct, tet, sqpl), `multiplicity` (2S+1 of the ground term),
//! `ground_term` (label as the engine prints it, e.g. "5Eg"), `mu_min_bm`, `mu_max_bm` (μB),
//! `examples`, `source`.

use super::{Record, Table};
use crate::error::Result;

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

impl Table for MomentRangeTable {
    const FILE: &'static str = "moment_ranges.csv";
    const HEADER: &'static [&'static str] = &[
        "dn",
        "geometry",
        "multiplicity",
        "ground_term",
        "mu_min_bm",
        "mu_max_bm",
        "examples",
        "source",
    ];
    const BUNDLED: &'static str = include_str!("../../data/moment_ranges.csv");
    type Row = MomentRange;
    type Context = ();

    fn row(record: &Record<'_>, _: &(), rows: &[MomentRange]) -> Result<MomentRange> {
        let dn_cell = record.cell("dn");
        let dn = dn_cell.int(0..=10)? as usize;
        let geometry = record
            .cell("geometry")
            .one_of(&GEOMETRIES.map(|g| (g, g)))?
            .to_string();
        let multiplicity = record.cell("multiplicity").int(1..=6)?;
        let term_cell = record.cell("ground_term");
        let ground_term = term_cell.text().to_string();
        if !ground_term.starts_with(&multiplicity.to_string()) {
            return Err(term_cell.error(format!(
                "'{ground_term}' does not start with the multiplicity {multiplicity}"
            )));
        }
        let mu_min = record.cell("mu_min_bm").non_negative()?;
        let max_cell = record.cell("mu_max_bm");
        let mu_max = max_cell.non_negative()?;
        if mu_max < mu_min {
            return Err(max_cell.error(format!("{mu_max} is below mu_min_bm {mu_min}")));
        }
        let source = record.cell("source").source()?;
        if rows
            .iter()
            .any(|r| r.dn == dn && r.geometry == geometry && r.multiplicity == multiplicity)
        {
            return Err(dn_cell.error(format!(
                "duplicate row for d{dn} {geometry} 2S+1 = {multiplicity}"
            )));
        }
        Ok(MomentRange {
            dn,
            geometry,
            multiplicity,
            ground_term,
            mu_min,
            mu_max,
            examples: record.cell("examples").text().to_string(),
            source,
        })
    }

    fn from_rows(rows: Vec<MomentRange>) -> Self {
        MomentRangeTable { rows }
    }
}

impl MomentRangeTable {
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
        let t = MomentRangeTable::parse(MomentRangeTable::BUNDLED).unwrap();
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
        let e = MomentRangeTable::parse(&format!("{head}11,oct,3,3A2g,2.9,3.3,,x\n")).unwrap_err();
        assert!(e.to_string().contains("line 2, column dn"), "{e}");
        let e = MomentRangeTable::parse(&format!("{head}8,oct,3,3A2g,3.3,2.9,,x\n")).unwrap_err();
        assert!(e.to_string().contains("below"), "{e}");
        let e = MomentRangeTable::parse(&format!("{head}8,hex,3,3A2g,2.9,3.3,,x\n")).unwrap_err();
        assert!(e.to_string().contains("accepted: oct"), "{e}");
        let e = MomentRangeTable::parse(&format!("{head}8,oct,3,3A2g,2.9,3.3,,\n")).unwrap_err();
        assert!(e.to_string().contains("source"), "{e}");
    }
}
