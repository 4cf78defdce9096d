//! The coordination sphere of each metal: the atoms bonded to it, symmetry images included.
//!
//! A metal–atom contact is a bond when d ≤ r_M + r_X + [`BOND_TOLERANCE`], with single-bond
//! covalent radii (Cordero et al., *Dalton Trans.* 2008, 2832; `data/covalent_radii.csv`), or
//! when d ≤ a cutoff the user gives. Other d-block atoms are never donors (metal–metal
//! contacts are not part of the ligand field).

use super::{is_d_block, Neighbour, Structure};
use crate::error::{Error, Result};
use crate::param::Param;
use crate::tables::covalent_radii::CovalentRadii;

/// Added to the sum of the covalent radii (Å) to allow for longer bonds than single bonds
/// (common practice).
pub const BOND_TOLERANCE: f64 = 0.35;
/// Two atoms closer than this (Å) are taken to overlap (a disorder left unresolved or a
/// duplicated atom; common practice: no real bond is this short except X–H, which is ≥ 0.7 Å).
pub const OVERLAP: f64 = 0.5;
/// Largest cutoff accepted (Å).
pub const MAX_CUTOFF: f64 = 4.0;

/// How bonds are recognised.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Cutoff {
    /// Sum of covalent radii plus [`BOND_TOLERANCE`].
    CovalentRadii,
    /// Every atom within this distance (Å).
    Distance(f64),
}

impl Cutoff {
    /// A cutoff from the user's distance (Å), checked.
    pub fn distance(r: f64) -> Result<Cutoff> {
        if !(r.is_finite() && r > OVERLAP && r <= MAX_CUTOFF) {
            return Err(Error::invalid(
                Param::Cutoff,
                format!("{r} Å"),
                format!("a metal–donor distance in {OVERLAP}..={MAX_CUTOFF} Å"),
            ));
        }
        Ok(Cutoff::Distance(r))
    }
}

/// One metal and its donor atoms.
#[derive(Debug, Clone, PartialEq)]
pub struct Sphere {
    /// Index of the metal in [`Structure::atoms`].
    pub metal: usize,
    /// Donors, nearest first.
    pub donors: Vec<Neighbour>,
}

fn radius(radii: &CovalentRadii, element: &str) -> Result<f64> {
    radii.radius(element).ok_or_else(|| Error::Data {
        table: <CovalentRadii as crate::tables::Table>::FILE.into(),
        message: format!("has no covalent radius for {element}; add a row for it"),
    })
}

/// The coordination sphere of the metal at `metal`.
pub fn sphere(
    s: &Structure,
    metal: usize,
    radii: &CovalentRadii,
    cutoff: Cutoff,
) -> Result<Sphere> {
    let m = &s.atoms[metal];
    let r_m = radius(radii, &m.element)?;
    let search = match cutoff {
        Cutoff::Distance(r) => r,
        Cutoff::CovalentRadii => (r_m + 2.5 + BOND_TOLERANCE).min(MAX_CUTOFF + 1.0),
    };
    let near = s.neighbours(metal, search);
    // Overlapping atoms make every distance below meaningless.
    if let Some(n) = near.iter().find(|n| n.distance < OVERLAP) {
        return Err(Error::Parse(format!(
            "atom {} is {:.3} Å from {} (closer than {OVERLAP} Å): atoms on top of each other; remove the duplicate or mark the alternatives with disorder groups",
            n.label, n.distance, m.label
        )));
    }
    for (i, a) in near.iter().enumerate() {
        for b in &near[i + 1..] {
            let d = (a.position - b.position).norm();
            if d < OVERLAP {
                return Err(Error::Parse(format!(
                    "atoms {} and {} near {} are {:.3} Å apart (closer than {OVERLAP} Å): atoms on top of each other; remove the duplicate or mark the alternatives with disorder groups",
                    a.label, b.label, m.label, d
                )));
            }
        }
    }
    let mut donors = Vec::new();
    for n in near {
        if is_d_block(&n.element) {
            continue;
        }
        let limit = match cutoff {
            Cutoff::Distance(r) => r,
            Cutoff::CovalentRadii => r_m + radius(radii, &n.element)? + BOND_TOLERANCE,
        };
        if n.distance <= limit {
            donors.push(n);
        }
    }
    Ok(Sphere { metal, donors })
}
