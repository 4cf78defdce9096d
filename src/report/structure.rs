//! Report of `spinstate structure`: the metal centres of one or more structures, and the
//! changes between consecutive structures.
//!
//! JSON contract (a top-level object; fields are only ever added):
//! `{"files": [...], "notes": [...], "centres": [{"file", "metal", "label", "index",
//! "oxidation_state", "coordination_number", "bonds": [{"donor", "element", "distance"}],
//! "means_by_element": [{"element", "count", "mean_distance", "low_spin_range",
//! "high_spin_range", "supports", "detail"}], "mean_distance", "sigma", "theta", "zeta",
//! "shapes": [{"name", "measure"}], "best_shape", "spin_state_from_bonds", "notes"}],
//! "changes": [{"label", "from", "to", "delta_r", "delta_sigma", "state_from", "state_to",
//! "switched"}]}`. Units: distances and ranges in Å, Σ and Θ in degrees, ζ in Å, shape
//! measures dimensionless (0–100).

use super::Render;
use super::{fmt_num, new_table};
use crate::structure::centre::{Centre, CentreChange};
use serde::Serialize;

/// One metal–donor bond.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct BondRow {
    /// Donor label; a symmetry image carries its operator and lattice translation in brackets.
    pub donor: String,
    pub element: String,
    /// Metal–donor distance (Å).
    pub distance: f64,
}

/// The mean over the donors of one element.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct ElementMeanRow {
    pub element: String,
    /// Donor atoms of this element (a count).
    pub count: usize,
    /// Å.
    pub mean_distance: f64,
    /// Reference low-spin range [min, max] (Å) from data/bond_lengths.csv; null without one.
    pub low_spin_range: Option<[f64; 2]>,
    /// Reference high-spin range [min, max] (Å); null without one.
    pub high_spin_range: Option<[f64; 2]>,
    /// "high-spin", "low-spin", "mixture", "both", "neither" or "none".
    pub supports: String,
    pub detail: String,
}

/// One shape measure.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct ShapeRow {
    /// "octahedron", "trigonal-prism", "tetrahedron", "square-plane", "square-pyramid" or
    /// "trigonal-bipyramid".
    pub name: String,
    /// Continuous shape measure, 0 (ideal) to 100.
    pub measure: f64,
}

/// One metal centre.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct CentreRow {
    /// The structure file.
    pub file: String,
    /// Element symbol.
    pub metal: String,
    /// Atom label (CIF label, or element and running number for XYZ).
    pub label: String,
    /// 1-based position of the metal among the file's atoms (`--metal-index`).
    pub index: usize,
    /// As given with --ox; null when not given.
    pub oxidation_state: Option<i32>,
    /// Donor atoms bound to the metal (a count).
    pub coordination_number: usize,
    pub bonds: Vec<BondRow>,
    pub means_by_element: Vec<ElementMeanRow>,
    /// Mean metal–donor distance over all donors (Å); null without donors.
    pub mean_distance: Option<f64>,
    /// Σ, the sum of |90° − φ| over the 12 cis angles (degrees); six-coordinate only.
    pub sigma: Option<f64>,
    /// Θ, the sum of |60° − θ| over the 24 trigonal twist angles (degrees); six-coordinate only.
    pub theta: Option<f64>,
    /// ζ, the sum of |dᵢ − d̄| over the six bonds (Å); six-coordinate only.
    pub zeta: Option<f64>,
    pub shapes: Vec<ShapeRow>,
    /// The shape with the smallest measure; null when none applies.
    pub best_shape: Option<String>,
    /// What the bond lengths support: "high-spin", "low-spin", "mixture", "both", "neither",
    /// "conflicting" (donor elements disagree) or "none" (no reference or no --ox).
    pub spin_state_from_bonds: String,
    pub notes: Vec<String>,
}

impl CentreRow {
    pub fn new(file: &str, c: &Centre) -> Self {
        CentreRow {
            file: file.to_string(),
            metal: c.metal.clone(),
            label: c.label.clone(),
            index: c.index,
            oxidation_state: c.oxidation_state,
            coordination_number: c.coordination_number(),
            bonds: c
                .bonds
                .iter()
                .map(|b| BondRow {
                    donor: b.donor.clone(),
                    element: b.element.clone(),
                    distance: b.distance,
                })
                .collect(),
            means_by_element: c
                .means
                .iter()
                .map(|m| ElementMeanRow {
                    element: m.element.clone(),
                    count: m.count,
                    mean_distance: m.mean_distance,
                    low_spin_range: m.reference.map(|r| [r.0 .0, r.0 .1]),
                    high_spin_range: m.reference.map(|r| [r.1 .0, r.1 .1]),
                    supports: m.supports.name().to_string(),
                    detail: m.detail.clone(),
                })
                .collect(),
            mean_distance: c.mean_distance,
            sigma: c.distortion.map(|d| d.sigma),
            theta: c.distortion.map(|d| d.theta),
            zeta: c.distortion.map(|d| d.zeta),
            shapes: c
                .shapes
                .iter()
                .map(|(s, m)| ShapeRow {
                    name: s.name().to_string(),
                    measure: *m,
                })
                .collect(),
            best_shape: c.best_shape.map(|s| s.name().to_string()),
            spin_state_from_bonds: c.spin_state_from_bonds.to_string(),
            notes: c.notes.clone(),
        }
    }
}

/// The change of one centre between two structures.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct ChangeRow {
    pub label: String,
    /// File of the first structure.
    pub from: String,
    /// File of the second structure.
    pub to: String,
    /// Change of the mean metal–donor distance, second minus first (Å).
    pub delta_r: Option<f64>,
    /// Change of Σ (degrees).
    pub delta_sigma: Option<f64>,
    pub state_from: String,
    pub state_to: String,
    /// True when the bond-length verdict changed between spin states (or a mixture).
    pub switched: bool,
}

impl ChangeRow {
    pub fn new(c: &CentreChange) -> Self {
        ChangeRow {
            label: c.label.clone(),
            from: c.from.clone(),
            to: c.to.clone(),
            delta_r: c.delta_r,
            delta_sigma: c.delta_sigma,
            state_from: c.state_from.to_string(),
            state_to: c.state_to.to_string(),
            switched: c.switched,
        }
    }
}

/// The whole report.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct StructureReport {
    pub files: Vec<String>,
    /// What was done to the input (disorder, partial occupancies, assumed symmetry), each
    /// prefixed with its file.
    pub notes: Vec<String>,
    pub centres: Vec<CentreRow>,
    pub changes: Vec<ChangeRow>,
}

impl Render for StructureReport {
    type Figure = ();

    fn table(&self) -> String {
        let opt = |x: Option<f64>, d: usize| x.map_or("—".to_string(), |v| fmt_num(v, d));
        let mut out = String::new();
        for c in &self.centres {
            out.push_str(&format!(
                "{}  {} (atom {}), {}-coordinate{}\n",
                c.file,
                c.label,
                c.index,
                c.coordination_number,
                c.best_shape
                    .as_ref()
                    .map_or(String::new(), |s| format!(", nearest ideal shape: {s}"))
            ));
            let mut t = new_table(["donor", "element", "M–donor (Å)"]);
            for b in &c.bonds {
                t.add_row(vec![
                    b.donor.clone(),
                    b.element.clone(),
                    fmt_num(b.distance, 3),
                ]);
            }
            out.push_str(&t.to_string());
            out.push('\n');
            let mut t = new_table([
                "donors",
                "n",
                "mean (Å)",
                "LS range (Å)",
                "HS range (Å)",
                "supports",
            ]);
            let range = |r: Option<[f64; 2]>| {
                r.map_or("—".to_string(), |r| format!("{:.3}–{:.3}", r[0], r[1]))
            };
            for m in &c.means_by_element {
                t.add_row(vec![
                    m.element.clone(),
                    m.count.to_string(),
                    fmt_num(m.mean_distance, 3),
                    range(m.low_spin_range),
                    range(m.high_spin_range),
                    m.supports.clone(),
                ]);
            }
            out.push_str(&t.to_string());
            out.push('\n');
            out.push_str(&format!(
                "mean M–donor {} Å   Σ {}°   Θ {}°   ζ {} Å\n",
                opt(c.mean_distance, 3),
                opt(c.sigma, 1),
                opt(c.theta, 1),
                opt(c.zeta, 3)
            ));
            if !c.shapes.is_empty() {
                let s: Vec<String> = c
                    .shapes
                    .iter()
                    .map(|s| format!("{} {}", s.name, fmt_num(s.measure, 2)))
                    .collect();
                out.push_str(&format!("shape measures (0 = ideal): {}\n", s.join(", ")));
            }
            out.push_str(&format!(
                "bond lengths support: {}\n",
                c.spin_state_from_bonds
            ));
            for m in &c.means_by_element {
                out.push_str(&format!("  {}: {}\n", m.element, m.detail));
            }
            for n in &c.notes {
                out.push_str(&format!("note: {n}\n"));
            }
            out.push('\n');
        }
        if !self.changes.is_empty() {
            let mut t = new_table([
                "centre",
                "from → to",
                "Δr (Å)",
                "ΔΣ (°)",
                "bond-length verdict",
                "switched",
            ]);
            for c in &self.changes {
                t.add_row(vec![
                    c.label.clone(),
                    format!("{} → {}", c.from, c.to),
                    c.delta_r.map_or("—".into(), |x| format!("{x:+.3}")),
                    c.delta_sigma.map_or("—".into(), |x| format!("{x:+.1}")),
                    format!("{} → {}", c.state_from, c.state_to),
                    if c.switched { "yes" } else { "no" }.to_string(),
                ]);
            }
            out.push_str(&t.to_string());
            out.push('\n');
        }
        for n in &self.notes {
            out.push_str(&format!("note: {n}\n"));
        }
        out
    }
}
