//! Report of `predict --structure`: the donors' angular-overlap parameters, the d-orbital
//! energies, the lowest levels, the ground spin and its margin.

use super::Render;
use crate::engine::PointGroup;
use crate::structure::spin::StructureSpin;
use serde::Serialize;

/// One donor of the field.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct DonorRow {
    pub donor: String,
    pub element: String,
    /// The ligand the donor was assigned to.
    pub ligand: String,
    /// Å.
    pub distance: f64,
    /// cm⁻¹.
    pub e_sigma: f64,
    /// cm⁻¹.
    pub e_pi: f64,
}

/// One level: label, 2S and energy above the ground level (cm⁻¹).
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct LevelRow {
    pub label: String,
    /// Twice the total spin, 2S.
    pub two_s: i32,
    /// cm⁻¹ above the ground level.
    pub energy: f64,
}

#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct StructureSpinReport {
    pub centre: String,
    pub composition: String,
    /// Point group of the labels (Oh, Td, D4h or C1).
    pub point_group: String,
    /// The field was averaged to the point group's form.
    pub symmetrised: bool,
    /// Largest deviation (cm⁻¹) from the nearest supported group's form, with that group.
    pub nearest_group: Option<(String, f64)>,
    pub donors: Vec<DonorRow>,
    /// d-orbital energies, barycentred, ascending (cm⁻¹).
    pub orbital_energies: [f64; 5],
    pub levels: Vec<LevelRow>,
    pub ground: String,
    /// Total spin S of the ground level.
    pub spin: f64,
    /// Factor by which the field must be scaled for the ground spin to change (None: not
    /// within 1/4..4; dimensionless).
    pub margin_field_scale: Option<f64>,
    /// 2S of the spin state the field scaling would reach; null with the scale.
    pub margin_two_s: Option<i32>,
    pub spin_state_from_bonds: String,
    pub notes: Vec<String>,
}

/// Short name of a point group, e.g. "D4h".
pub fn group_name(g: PointGroup) -> &'static str {
    match g {
        PointGroup::Oh => "Oh",
        PointGroup::Td => "Td",
        PointGroup::D4h => "D4h",
        PointGroup::C1 => "C1",
    }
}

impl StructureSpinReport {
    pub fn new(
        centre: &str,
        composition: String,
        s: &StructureSpin,
        bonds_verdict: crate::structure::centre::BondVerdict,
        notes: Vec<String>,
    ) -> Self {
        let f = &s.field;
        let ground = s.levels.first().map(|l| l.label()).unwrap_or_default();
        StructureSpinReport {
            centre: centre.to_string(),
            composition,
            point_group: group_name(f.group).into(),
            symmetrised: f.symmetrised,
            nearest_group: f.nearest.map(|(g, d)| (group_name(g).to_string(), d)),
            donors: f
                .donors
                .iter()
                .map(|d| DonorRow {
                    donor: d.donor.clone(),
                    element: d.element.clone(),
                    ligand: d.ligand.clone(),
                    distance: d.distance,
                    e_sigma: d.e_sigma,
                    e_pi: d.e_pi,
                })
                .collect(),
            orbital_energies: f.orbital_energies,
            levels: s
                .levels
                .iter()
                .map(|l| LevelRow {
                    label: l.label(),
                    two_s: l.two_s,
                    energy: l.energy,
                })
                .collect(),
            ground,
            spin: s.two_s as f64 / 2.0,
            margin_field_scale: s.margin.map(|m| m.0),
            margin_two_s: s.margin.map(|m| m.1),
            spin_state_from_bonds: bonds_verdict.to_string(),
            notes,
        }
    }
}

impl Render for StructureSpinReport {
    type Figure = ();

    fn table(&self) -> String {
        let mut out = format!(
            "{}  {}  field from the structure (angular overlap model), labels in {}{}\n",
            self.centre,
            self.composition,
            self.point_group,
            if self.symmetrised {
                " (field averaged to that form)"
            } else {
                ""
            }
        );
        let mut t = super::new_table([
            "donor",
            "element",
            "ligand",
            "r (Å)",
            "e_σ (cm⁻¹)",
            "e_π (cm⁻¹)",
        ]);
        for d in &self.donors {
            t.add_row(vec![
                d.donor.clone(),
                d.element.clone(),
                d.ligand.clone(),
                format!("{:.3}", d.distance),
                format!("{:.0}", d.e_sigma),
                format!("{:.0}", d.e_pi),
            ]);
        }
        out.push_str(&format!("{t}\n"));
        out.push_str(&format!(
            "d-orbital energies (cm⁻¹): {}\n",
            self.orbital_energies
                .iter()
                .map(|e| format!("{e:.0}"))
                .collect::<Vec<_>>()
                .join(", ")
        ));
        if let Some((g, d)) = &self.nearest_group {
            out.push_str(&format!(
                "largest deviation from the {g} form: {d:.0} cm⁻¹\n"
            ));
        }
        out.push_str(&format!(
            "ground level: {} (S = {}); lowest levels (cm⁻¹): {}\n",
            self.ground,
            self.spin,
            self.levels
                .iter()
                .take(6)
                .map(|l| format!("{} {:.0}", l.label, l.energy))
                .collect::<Vec<_>>()
                .join(", ")
        ));
        match (self.margin_field_scale, self.margin_two_s) {
            (Some(x), Some(s)) => out.push_str(&format!(
                "spin-state margin: the ground spin changes to S = {} when the field is scaled by {x:.3} ({:+.1} %)\n",
                s as f64 / 2.0,
                100.0 * (x - 1.0)
            )),
            _ => out.push_str("spin-state margin: no change of the ground spin with the field scaled from 1/4 to 4\n"),
        }
        out.push_str(&format!(
            "spin state from the bond lengths: {}\n",
            self.spin_state_from_bonds
        ));
        if !self.notes.is_empty() {
            out.push_str("notes:\n");
            for n in &self.notes {
                out.push_str(&format!("- {n}\n"));
            }
        }
        out
    }
}
