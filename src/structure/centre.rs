//! Everything reported for one metal centre, and the comparison of one centre across
//! structures (a variable-temperature series).

use super::distortion::{octahedral_distortion, OctahedralDistortion};
use super::shape::{shape_measure, IdealShape};
use super::sphere::Sphere;
use super::Structure;
use crate::check::evidence::classify_mean;
use crate::check::Support;
use crate::measured::Measured;
use crate::tables::bond_lengths::BondLengthTable;
use nalgebra::Vector3;

/// One metal–donor bond.
#[derive(Debug, Clone, PartialEq)]
pub struct Bond {
    /// The donor's label; a symmetry image carries its operator, e.g. "N1 [-x,-y,-z+(1,1,1)]".
    pub donor: String,
    pub element: String,
    /// Å.
    pub distance: f64,
}

/// The mean bond length to the donors of one element and what it says about the spin state.
#[derive(Debug, Clone, PartialEq)]
pub struct ElementMean {
    pub element: String,
    pub count: usize,
    /// Å.
    pub mean_distance: f64,
    /// Low- and high-spin reference ranges (Å), when the table has them.
    pub reference: Option<((f64, f64), (f64, f64))>,
    /// High, Low, Mixture, Both, Neither, or Nothing (no reference).
    pub supports: Support,
    pub detail: String,
}

/// The report of one centre.
#[derive(Debug, Clone, PartialEq)]
pub struct Centre {
    pub metal: String,
    pub label: String,
    /// 1-based position of the metal among the file's atoms.
    pub index: usize,
    pub oxidation_state: Option<i32>,
    /// Cartesian position of the metal (Å).
    pub position: Vector3<f64>,
    /// Donor positions (Å), in the order of `bonds`.
    pub donor_positions: Vec<Vector3<f64>>,
    pub bonds: Vec<Bond>,
    pub means: Vec<ElementMean>,
    /// Mean of all metal–donor distances (Å).
    pub mean_distance: Option<f64>,
    /// Σ, Θ, ζ for six-coordinate centres.
    pub distortion: Option<OctahedralDistortion>,
    /// Shape measures against the ideal shapes with as many vertices as donors.
    pub shapes: Vec<(IdealShape, f64)>,
    pub best_shape: Option<IdealShape>,
    /// The combined bond-length verdict (see [`spin_state_from_bonds`]).
    pub spin_state_from_bonds: BondVerdict,
    pub notes: Vec<String>,
}

impl Centre {
    pub fn coordination_number(&self) -> usize {
        self.bonds.len()
    }

    /// The named geometry closest to the centre's shape (a trigonal prism counts as
    /// octahedral), for the composition estimate; None when no shape was measured.
    pub fn named_geometry(&self) -> Option<crate::engine::Geometry> {
        use crate::engine::Geometry;
        match self.best_shape? {
            IdealShape::Octahedron | IdealShape::TrigonalPrism => Some(Geometry::Octahedral),
            IdealShape::Tetrahedron => Some(Geometry::Tetrahedral),
            IdealShape::SquarePlane => Some(Geometry::SquarePlanar),
            IdealShape::SquarePyramid => Some(Geometry::SquarePyramidal),
            IdealShape::TrigonalBipyramid => Some(Geometry::TrigonalBipyramidal),
        }
    }
}

/// The bond-length verdict of a centre, all donor elements taken together.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum BondVerdict {
    /// Every element with a reference supports this (Nothing when none has one).
    Agreed(Support),
    /// The donor elements disagree.
    Conflicting,
}

impl BondVerdict {
    /// The name of the agreed [`Support`], or "conflicting".
    pub fn name(self) -> &'static str {
        match self {
            BondVerdict::Agreed(s) => s.name(),
            BondVerdict::Conflicting => "conflicting",
        }
    }

    /// True for a verdict on one side or a mixture (high-spin, low-spin, mixture).
    fn is_a_state(self) -> bool {
        matches!(
            self,
            BondVerdict::Agreed(Support::High | Support::Low | Support::Mixture)
        )
    }
}

impl std::fmt::Display for BondVerdict {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(self.name())
    }
}

/// Combines the verdicts of each donor element: the common one when all elements with a
/// reference agree, conflicting when they do not, Nothing ("none") when no element has a
/// reference.
pub fn spin_state_from_bonds(means: &[ElementMean]) -> BondVerdict {
    let decided: Vec<Support> = means
        .iter()
        .map(|m| m.supports)
        .filter(|s| *s != Support::Nothing)
        .collect();
    match decided.first() {
        None => BondVerdict::Agreed(Support::Nothing),
        Some(&first) if decided.iter().all(|&s| s == first) => BondVerdict::Agreed(first),
        Some(_) => BondVerdict::Conflicting,
    }
}

/// Analyses one coordination sphere. `oxidation_state` is needed for the bond-length verdict
/// (the reference ranges are per metal and oxidation state).
pub fn analyse(
    s: &Structure,
    sphere: &Sphere,
    oxidation_state: Option<i32>,
    bond_lengths: &BondLengthTable,
) -> Centre {
    let m = &s.atoms[sphere.metal];
    let bonds: Vec<Bond> = sphere
        .donors
        .iter()
        .map(|n| Bond {
            donor: match &n.symmetry {
                Some(op) => format!("{} [{op}]", n.label),
                None => n.label.clone(),
            },
            element: n.element.clone(),
            distance: n.distance,
        })
        .collect();
    let donor_positions: Vec<Vector3<f64>> = sphere.donors.iter().map(|n| n.position).collect();
    let mut elements: Vec<String> = Vec::new();
    for b in &bonds {
        if !elements.contains(&b.element) {
            elements.push(b.element.clone());
        }
    }
    let mut notes = Vec::new();
    let means: Vec<ElementMean> = elements
        .iter()
        .map(|e| {
            let d: Vec<f64> = bonds
                .iter()
                .filter(|b| &b.element == e)
                .map(|b| b.distance)
                .collect();
            let mean = d.iter().sum::<f64>() / d.len() as f64;
            let reference =
                oxidation_state.and_then(|ox| bond_lengths.reference(&m.element, ox, e));
            let (supports, detail) = match (&reference, oxidation_state) {
                (Some(r), Some(ox)) => {
                    let ev = classify_mean(
                        Measured {
                            value: mean,
                            err: 0.0,
                        },
                        r,
                        format!("{}({})", m.element, roman(ox)),
                        e,
                    );
                    (ev.supports, ev.detail)
                }
                (None, Some(ox)) => (
                    Support::Nothing,
                    format!(
                        "data/bond_lengths.csv has no low- and high-spin range for {}({})–{e}",
                        m.element,
                        roman(ox)
                    ),
                ),
                (_, None) => (
                    Support::Nothing,
                    "no oxidation state given (the reference ranges are per oxidation state)"
                        .into(),
                ),
            };
            ElementMean {
                element: e.clone(),
                count: d.len(),
                mean_distance: mean,
                reference: reference.map(|r| (r.low_spin, r.high_spin)),
                supports,
                detail,
            }
        })
        .collect();
    if means.len() > 1 && oxidation_state.is_some() {
        notes.push(
            "mixed donor set: each donor element is compared with its own reference ranges".into(),
        );
    }
    let mean_distance = (!bonds.is_empty())
        .then(|| bonds.iter().map(|b| b.distance).sum::<f64>() / bonds.len() as f64);
    let shapes: Vec<(IdealShape, f64)> = IdealShape::with_vertices(bonds.len())
        .into_iter()
        .filter_map(|sh| shape_measure(&m.position, &donor_positions, sh).map(|x| (sh, x)))
        .collect();
    let best_shape = shapes
        .iter()
        .min_by(|a, b| a.1.total_cmp(&b.1))
        .map(|x| x.0);
    if shapes.is_empty() {
        notes.push(format!(
            "no ideal shape with {} vertices is measured (4, 5 and 6 are)",
            bonds.len()
        ));
    }
    let distortion = octahedral_distortion(&m.position, &donor_positions);
    Centre {
        metal: m.element.clone(),
        label: m.label.clone(),
        index: sphere.metal + 1,
        oxidation_state,
        position: m.position,
        donor_positions,
        spin_state_from_bonds: spin_state_from_bonds(&means),
        bonds,
        means,
        mean_distance,
        distortion,
        shapes,
        best_shape,
        notes,
    }
}

/// Roman numeral of an oxidation state, e.g. 2 → "II" (0 → "0", negative → "−I").
pub fn roman(n: i32) -> String {
    const R: [&str; 9] = ["0", "I", "II", "III", "IV", "V", "VI", "VII", "VIII"];
    let a = n.unsigned_abs() as usize;
    let r = R.get(a).copied().unwrap_or("?");
    if n < 0 {
        format!("−{r}")
    } else {
        r.to_string()
    }
}

/// How one centre changed from one structure to the next.
#[derive(Debug, Clone, PartialEq)]
pub struct CentreChange {
    pub label: String,
    pub from: String,
    pub to: String,
    /// Change of the mean metal–donor distance (Å).
    pub delta_r: Option<f64>,
    /// Change of Σ (degrees), six-coordinate centres.
    pub delta_sigma: Option<f64>,
    pub state_from: BondVerdict,
    pub state_to: BondVerdict,
    /// True when the bond-length verdict went from one spin state to the other (or to or from
    /// a mixture).
    pub switched: bool,
}

/// Compares the centres of two structures, matched by metal label (then by order).
pub fn compare(from: (&str, &[Centre]), to: (&str, &[Centre])) -> Vec<CentreChange> {
    let mut out = Vec::new();
    for (k, a) in from.1.iter().enumerate() {
        let b =
            to.1.iter()
                .find(|b| b.label == a.label && b.metal == a.metal)
                .or_else(|| to.1.get(k).filter(|b| b.metal == a.metal));
        let Some(b) = b else { continue };
        let delta_r = match (a.mean_distance, b.mean_distance) {
            (Some(x), Some(y)) => Some(y - x),
            _ => None,
        };
        let delta_sigma = match (a.distortion, b.distortion) {
            (Some(x), Some(y)) => Some(y.sigma - x.sigma),
            _ => None,
        };
        let switched = a.spin_state_from_bonds != b.spin_state_from_bonds
            && a.spin_state_from_bonds.is_a_state()
            && b.spin_state_from_bonds.is_a_state();
        out.push(CentreChange {
            label: a.label.clone(),
            from: from.0.to_string(),
            to: to.0.to_string(),
            delta_r,
            delta_sigma,
            state_from: a.spin_state_from_bonds,
            state_to: b.spin_state_from_bonds,
            switched,
        });
    }
    out
}
