//! Single-bond covalent radii, `data/covalent_radii.csv`. This module alone knows the layout.
//!
//! Columns: `element` (symbol), `radius_a` (Å), `what` (which radius: for Mn, Fe and Co the
//! high-spin value, so that the longer bonds of high-spin centres are found), `source`.
//! The values are those of B. Cordero et al., "Covalent radii revisited", *Dalton Trans.* 2008,
//! 2832.

use crate::error::{Error, Result};
use std::collections::HashMap;
use std::path::Path;

/// File name of the table, bundled and in a `--data` directory.
pub const FILE: &str = "covalent_radii.csv";
const BUNDLED: &str = include_str!("../../data/covalent_radii.csv");
const HEADER: [&str; 4] = ["element", "radius_a", "what", "source"];
/// Radii outside this range (Å) are rejected as typing errors.
pub const SENSIBLE_A: (f64, f64) = (0.2, 3.0);

/// The table: element symbol → radius (Å).
#[derive(Debug, Clone)]
pub struct CovalentRadii {
    radii: HashMap<String, f64>,
}

impl CovalentRadii {
    /// The table bundled with the program.
    pub fn bundled() -> Result<Self> {
        Self::from_csv(BUNDLED)
    }

    /// DIR/covalent_radii.csv when `data_dir` is given and holds that file, else the bundled one.
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
        let mut radii = HashMap::new();
        for (row, record) in super::records(FILE, text, &HEADER)? {
            let cell = |col: usize| record.get(col).unwrap_or("").to_string();
            let element = cell(0);
            if element.is_empty() {
                return Err(data_err(format!("row {row}, column element: is empty")));
            }
            let r: f64 = cell(1)
                .parse()
                .ok()
                .filter(|r| (SENSIBLE_A.0..=SENSIBLE_A.1).contains(r))
                .ok_or_else(|| {
                    data_err(format!(
                        "row {row}, column radius_a: '{}' is not a radius in {}..={} Å",
                        cell(1),
                        SENSIBLE_A.0,
                        SENSIBLE_A.1
                    ))
                })?;
            if cell(3).is_empty() {
                return Err(data_err(format!(
                    "row {row}, column source: every row needs a source"
                )));
            }
            if radii.insert(element.clone(), r).is_some() {
                return Err(data_err(format!(
                    "row {row}: element {element} is listed twice"
                )));
            }
        }
        Ok(CovalentRadii { radii })
    }

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
        let t = CovalentRadii::bundled().unwrap();
        assert_eq!(t.radius("N"), Some(0.71));
        assert_eq!(t.radius("O"), Some(0.66));
        assert_eq!(t.radius("Fe"), Some(1.52));
        assert_eq!(t.radius("Xx"), None);
    }

    #[test]
    fn bad_rows_are_reported() {
        let e = CovalentRadii::from_csv("element,radius_a,what,source\nN,9,x,s\n").unwrap_err();
        assert!(e.to_string().contains("row 2, column radius_a"), "{e}");
        let e = CovalentRadii::from_csv("element,radius_a,what,source\nN,0.7,x,\n").unwrap_err();
        assert!(e.to_string().contains("source"), "{e}");
        let e = CovalentRadii::from_csv("element,radius_a,what,source\nN,0.7,x,s\nN,0.7,x,s\n")
            .unwrap_err();
        assert!(e.to_string().contains("twice"), "{e}");
    }
}
