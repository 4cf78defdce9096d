//! Crystal structures (CIF) and coordinates (XYZ): metal centres, their coordination spheres
//! and the spin-state evidence in their geometry.
//!
//! - [`cif`], [`xyz`]: readers (text in, [`Structure`] out; the CLI reads the file).
//! - [`lattice`]: the cell metric and the symmetry operators.
//! - [`sphere`]: the donor atoms of each metal from covalent radii, symmetry images included.
//! - [`shape`]: continuous shape measures against ideal polyhedra.
//! - [`distortion`]: the octahedral distortion parameters Σ, Θ and ζ.
//! - [`centre`]: everything reported for one centre, and the comparison of two structures.
//! - [`field`]: the angular-overlap field of a centre at its real geometry.
//! - [`spin`]: the spin state that field gives, and its distance from a spin change.

pub mod centre;
pub mod cif;
pub mod distortion;
pub mod field;
pub mod lattice;
pub mod shape;
pub mod sphere;
pub mod spin;
pub mod xyz;

use crate::error::{Error, Result};
use crate::param::Param;
use lattice::{Cell, SymOp};
use mendeleev::Element;
use nalgebra::Vector3;

/// One atom: for a CIF an atom site of the asymmetric unit, for XYZ one line.
#[derive(Debug, Clone, PartialEq)]
pub struct Atom {
    /// The CIF label (e.g. "Fe1"), or element and running number for XYZ.
    pub label: String,
    /// Element symbol, e.g. "Fe".
    pub element: String,
    /// Cartesian position (Å).
    pub position: Vector3<f64>,
    /// Fractional coordinates (CIF only).
    pub fract: Option<Vector3<f64>>,
    pub occupancy: f64,
    /// CIF disorder group, when the site belongs to one.
    pub disorder_group: Option<String>,
    /// Line of the file the atom was read from.
    pub line: usize,
}

/// The periodic frame of a crystal structure.
#[derive(Debug, Clone, PartialEq)]
pub struct Lattice {
    pub cell: Cell,
    pub ops: Vec<SymOp>,
}

/// A structure as read: its atoms, the lattice of a crystal, and notes on what was done to the
/// input (disorder resolved, partial occupancies, assumed symmetry).
#[derive(Debug, Clone, PartialEq)]
pub struct Structure {
    pub name: String,
    pub atoms: Vec<Atom>,
    pub lattice: Option<Lattice>,
    pub notes: Vec<String>,
    /// Temperature of the data collection (K), from `_diffrn_ambient_temperature` or
    /// `_cell_measurement_temperature` of a CIF; None when not stated (always for XYZ).
    pub temperature: Option<f64>,
}

/// The file formats read.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FileFormat {
    Cif,
    Xyz,
}

impl FileFormat {
    /// The format from a file name's extension (.cif or .xyz, any case).
    pub fn from_name(name: &str) -> Result<Self> {
        let ext = std::path::Path::new(name)
            .extension()
            .and_then(|e| e.to_str())
            .map(|e| e.to_ascii_lowercase());
        match ext.as_deref() {
            Some("cif") => Ok(FileFormat::Cif),
            Some("xyz") => Ok(FileFormat::Xyz),
            _ => Err(Error::invalid(
                Param::StructureFile,
                name,
                "a file ending in .cif (crystal structure) or .xyz (coordinates)",
            )),
        }
    }
}

/// Reads a structure from text; `name` (the file name) picks the format and labels messages.
pub fn read(text: &str, name: &str) -> Result<Structure> {
    match FileFormat::from_name(name)? {
        FileFormat::Cif => cif::read(text, name),
        FileFormat::Xyz => xyz::read(text, name),
    }
}

/// The element named by an atom label or type symbol: "Fe1" → Fe, "FE" → Fe, "Fe2+" → Fe,
/// "N1A" → N. Two-letter symbols win over one-letter ones when both exist ("Co1" is Co).
pub fn element_from_label(label: &str) -> Option<String> {
    let letters: String = label
        .chars()
        .take_while(|c| c.is_ascii_alphabetic())
        .take(2)
        .collect();
    let known = |s: &str| Element::iter().any(|e| e.symbol() == s);
    let cap = |s: &str| {
        let mut c = s.chars();
        c.next().map_or(String::new(), |f| {
            f.to_ascii_uppercase().to_string() + &c.as_str().to_ascii_lowercase()
        })
    };
    if letters.len() == 2 {
        let two = cap(&letters);
        // A label such as "NA1" (an N atom, site A) keeps the one-letter element when the second
        // letter is upper case and the label goes on; "Na1" and "NA" alone read as sodium.
        let second_upper = letters
            .chars()
            .nth(1)
            .is_some_and(|c| c.is_ascii_uppercase());
        let longer = label.chars().count() > 2;
        if known(&two) && !(second_upper && longer && known(&cap(&letters[..1]))) {
            return Some(two);
        }
    }
    let one = cap(letters.get(..1)?);
    known(&one).then_some(one)
}

/// True for the d-block elements (groups 3–12), the metals whose centres are reported.
pub fn is_d_block(element: &str) -> bool {
    Element::iter()
        .find(|e| e.symbol() == element)
        .and_then(|e| e.group())
        .is_some_and(|g| (3..=12).contains(&g.group_number()))
}

/// One atom near a centre, possibly a symmetry image.
#[derive(Debug, Clone, PartialEq)]
pub struct Neighbour {
    /// Index into [`Structure::atoms`].
    pub atom: usize,
    pub label: String,
    pub element: String,
    /// Cartesian position (Å).
    pub position: Vector3<f64>,
    /// Distance from the centre (Å).
    pub distance: f64,
    /// The symmetry operator and lattice translation that made this image, e.g.
    /// "-x,-y,-z+(1,1,1)"; None for the atom itself.
    pub symmetry: Option<String>,
}

/// Positions closer than this (Å) are the same image (special positions).
const SAME_POSITION: f64 = 1e-3;

impl Structure {
    /// Indices of the d-block atoms, in file order.
    pub fn metals(&self) -> Vec<usize> {
        (0..self.atoms.len())
            .filter(|&i| is_d_block(&self.atoms[i].element))
            .collect()
    }

    /// Every atom (with its symmetry images for a crystal) within `radius` Å of atom `centre`,
    /// nearest first. The centre itself is left out, its own images are kept.
    pub fn neighbours(&self, centre: usize, radius: f64) -> Vec<Neighbour> {
        let c = &self.atoms[centre];
        let mut out: Vec<Neighbour> = Vec::new();
        match &self.lattice {
            None => {
                for (j, a) in self.atoms.iter().enumerate() {
                    if j == centre {
                        continue;
                    }
                    let d = (a.position - c.position).norm();
                    if d <= radius {
                        out.push(Neighbour {
                            atom: j,
                            label: a.label.clone(),
                            element: a.element.clone(),
                            position: a.position,
                            distance: d,
                            symmetry: None,
                        });
                    }
                }
            }
            Some(lat) => {
                let fc = c.fract.unwrap_or_default();
                let reach = lat.cell.fractional_reach(radius);
                for (j, a) in self.atoms.iter().enumerate() {
                    let fa = a.fract.unwrap_or_default();
                    for op in &lat.ops {
                        let image = op.apply(&fa);
                        let delta = image - fc;
                        let lo = [0, 1, 2].map(|k| (-delta[k] - reach[k]).ceil() as i64);
                        let hi = [0, 1, 2].map(|k| (-delta[k] + reach[k]).floor() as i64);
                        for nx in lo[0]..=hi[0] {
                            for ny in lo[1]..=hi[1] {
                                for nz in lo[2]..=hi[2] {
                                    let t = Vector3::new(nx as f64, ny as f64, nz as f64);
                                    let p = lat.cell.to_cartesian(&(image + t));
                                    let d = (p - c.position).norm();
                                    if d > radius {
                                        continue;
                                    }
                                    if j == centre && d < SAME_POSITION {
                                        continue;
                                    }
                                    if out.iter().any(|n| {
                                        n.atom == j && (n.position - p).norm() < SAME_POSITION
                                    }) {
                                        continue;
                                    }
                                    let identity = op.is_identity() && t == Vector3::zeros();
                                    out.push(Neighbour {
                                        atom: j,
                                        label: a.label.clone(),
                                        element: a.element.clone(),
                                        position: p,
                                        distance: d,
                                        symmetry: (!identity).then(|| {
                                            if t == Vector3::zeros() {
                                                op.text.clone()
                                            } else {
                                                format!("{} +({nx},{ny},{nz})", op.text)
                                            }
                                        }),
                                    });
                                }
                            }
                        }
                    }
                }
            }
        }
        out.sort_by(|a, b| a.distance.total_cmp(&b.distance));
        out
    }

    /// Resolves disorder: when sites carry two or more disorder groups, the group with the
    /// largest mean occupancy (the major part) is kept and the others are dropped, with a note
    /// naming the atoms.
    pub fn keep_major_disorder_part(&mut self) {
        let mut groups: Vec<(String, f64, usize)> = Vec::new();
        for a in &self.atoms {
            if let Some(g) = &a.disorder_group {
                match groups.iter_mut().find(|(n, _, _)| n == g) {
                    Some(e) => {
                        e.1 += a.occupancy;
                        e.2 += 1;
                    }
                    None => groups.push((g.clone(), a.occupancy, 1)),
                }
            }
        }
        if groups.len() < 2 {
            if let Some((g, _, _)) = groups.first() {
                self.notes.push(format!(
                    "disorder group {g} has no alternative part in the file; its atoms are kept"
                ));
            }
            return;
        }
        let mean = |g: &(String, f64, usize)| g.1 / g.2 as f64;
        let major = groups
            .iter()
            .fold(&groups[0], |best, g| {
                if mean(g) > mean(best) + 1e-9 {
                    g
                } else {
                    best
                }
            })
            .clone();
        let dropped: Vec<String> = self
            .atoms
            .iter()
            .filter(|a| a.disorder_group.as_ref().is_some_and(|g| *g != major.0))
            .map(|a| a.label.clone())
            .collect();
        let kept: Vec<String> = self
            .atoms
            .iter()
            .filter(|a| a.disorder_group.as_ref() == Some(&major.0))
            .map(|a| a.label.clone())
            .collect();
        self.atoms
            .retain(|a| a.disorder_group.as_ref().is_none_or(|g| *g == major.0));
        self.notes.push(format!(
            "disorder: the major part (group {}, mean occupancy {:.2}: {}) is used; dropped the minor part {}",
            major.0,
            mean(&major),
            kept.join(" "),
            dropped.join(" ")
        ));
    }

    /// Notes the sites with occupancy below 1 that are not part of a resolved disorder.
    pub fn note_partial_occupancies(&mut self) {
        let partial: Vec<String> = self
            .atoms
            .iter()
            .filter(|a| a.occupancy < 0.99 && a.disorder_group.is_none())
            .map(|a| format!("{} ({:.2})", a.label, a.occupancy))
            .collect();
        if !partial.is_empty() {
            self.notes.push(format!(
                "partial occupancies without disorder groups: {}; these sites are used as if fully occupied",
                partial.join(", ")
            ));
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn elements_from_labels() {
        assert_eq!(element_from_label("Fe1").as_deref(), Some("Fe"));
        assert_eq!(element_from_label("FE").as_deref(), Some("Fe"));
        assert_eq!(element_from_label("Co2+").as_deref(), Some("Co"));
        assert_eq!(element_from_label("N1A").as_deref(), Some("N"));
        assert_eq!(element_from_label("NA1").as_deref(), Some("N"));
        assert_eq!(element_from_label("Na1").as_deref(), Some("Na"));
        assert_eq!(element_from_label("C12").as_deref(), Some("C"));
        assert_eq!(element_from_label("O"), Some("O".into()));
        assert_eq!(element_from_label("Q1"), None);
        assert!(is_d_block("Fe") && is_d_block("Zn") && !is_d_block("N") && !is_d_block("Na"));
    }
}

/// Which metal centres to report.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum MetalChoice {
    /// Every d-block atom.
    All,
    /// The atom at this 1-based position in the file.
    Index(usize),
    /// The atom with this label (case-insensitive).
    Label(String),
}

impl Structure {
    /// The metal atoms chosen (indices into `atoms`). Errors when the structure has no d-block
    /// atom, or the chosen atom does not exist or is not a d-block metal.
    pub fn select_metals(&self, choice: &MetalChoice) -> Result<Vec<usize>> {
        let metals = self.metals();
        if metals.is_empty() {
            return Err(Error::Parse(format!(
                "{}: no d-block metal atom (groups 3–12) in the structure",
                self.name
            )));
        }
        let labels = || {
            metals
                .iter()
                .map(|&i| format!("{} (atom {})", self.atoms[i].label, i + 1))
                .collect::<Vec<_>>()
                .join(", ")
        };
        match choice {
            MetalChoice::All => Ok(metals),
            MetalChoice::Index(n) => {
                let i = n.checked_sub(1).filter(|i| metals.contains(i));
                i.map(|i| vec![i]).ok_or_else(|| {
                    Error::invalid(
                        Param::MetalIndex,
                        n,
                        format!("the position of a metal atom in the file: {}", labels()),
                    )
                })
            }
            MetalChoice::Label(l) => metals
                .iter()
                .copied()
                .find(|&i| self.atoms[i].label.eq_ignore_ascii_case(l))
                .map(|i| vec![i])
                .ok_or_else(|| Error::Unknown {
                    kind: crate::error::NameKind::MetalLabel {
                        structure: self.name.clone(),
                        labels: labels(),
                    },
                    name: l.clone(),
                    suggestions: crate::error::closest_names(
                        l,
                        metals.iter().map(|&i| self.atoms[i].label.as_str()),
                    ),
                }),
        }
    }
}
