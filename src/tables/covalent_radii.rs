//! Single-bond covalent radii, `data/covalent_radii.csv`. This module alone knows the layout.
//!
//! Columns: `element` (symbol), `radius_a` (Å), `what` (which radius: for Mn, Fe and Co the
//! high-spin value, so that the longer bonds of high-spin centres are found), `source`.
//! The values are those of B. Cordero et al., "Covalent radii revisited", *Dalton Trans.* 2008,
//! 2832.

use super::{Record, Table};
use crate::error::Result;
use std::collections::HashMap;

/// Radii outside this range (Å) are rejected as typing errors.
pub const SENSIBLE_A: (f64, f64) = (0.2, 3.0);

/// The table: element symbol → radius (Å).
#[derive(Debug, Clone)]
pub struct CovalentRadii {
    radii: HashMap<String, f64>,
}

/// One row: an element and its radius (Å).
#[derive(Debug, Clone, PartialEq)]
pub struct CovalentRadius {
    pub element: String,
    pub radius: f64,
}

impl Table for CovalentRadii {
    const FILE: &'static str = "covalent_radii.csv";
    const HEADER: &'static [&'static str] = &["element", "radius_a", "what", "source"];
    const BUNDLED: &'static str = include_str!("../../data/covalent_radii.csv");
    type Row = CovalentRadius;
    type Context = ();

    fn row(record: &Record<'_>, _: &(), rows: &[CovalentRadius]) -> Result<CovalentRadius> {
        let element_cell = record.cell("element");
        let element = element_cell.required()?;
        let radius = record
            .cell("radius_a")
            .number(SENSIBLE_A.0..=SENSIBLE_A.1, " Å")?;
        record.cell("source").source()?;
        if rows.iter().any(|r| r.element == element) {
            return Err(element_cell.error(format!("element {element} is listed twice")));
        }
        Ok(CovalentRadius { element, radius })
    }

    fn from_rows(rows: Vec<CovalentRadius>) -> Self {
        CovalentRadii {
            radii: rows.into_iter().map(|r| (r.element, r.radius)).collect(),
        }
    }
}

impl CovalentRadii {
    /// The radius of an element (Å), by its symbol as written in the table (e.g. "Fe").
    pub fn radius(&self, element: &str) -> Option<f64> {
        self.radii.get(element).copied()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Cordero et al., Dalton Trans. 2008: N 0.71, O 0.66, high-spin Fe 1.52 Å (from memory).
    #[test]
    fn bundled_radii() {
        let t = CovalentRadii::parse(CovalentRadii::BUNDLED).unwrap();
        assert_eq!(t.radius("N"), Some(0.71));
        assert_eq!(t.radius("O"), Some(0.66));
        assert_eq!(t.radius("Fe"), Some(1.52));
        assert_eq!(t.radius("Xx"), None);
    }

    #[test]
    fn bad_rows_are_reported() {
        let e = CovalentRadii::parse("element,radius_a,what,source\nN,9,x,s\n").unwrap_err();
        assert!(e.to_string().contains("line 2, column radius_a"), "{e}");
        let e = CovalentRadii::parse("element,radius_a,what,source\nN,0.7,x,\n").unwrap_err();
        assert!(e.to_string().contains("source"), "{e}");
        let e = CovalentRadii::parse("element,radius_a,what,source\nN,0.7,x,s\nN,0.7,x,s\n")
            .unwrap_err();
        assert!(e.to_string().contains("twice"), "{e}");
    }
}
