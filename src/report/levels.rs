//! Report of `spinstate levels`: every level of one calculation.

use super::Render;
use super::{fmt_num, new_table};
use serde::Serialize;

/// One level as reported (energies in cm⁻¹, or in units of B when the input was given as ratios).
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct LevelRow {
    /// Energy above the ground level (cm⁻¹, or units of B in ratio mode).
    pub energy: f64,
    /// Spin multiplicity 2S+1 (from ⟨S²⟩).
    pub multiplicity: i32,
    /// Total spin S.
    pub spin: f64,
    /// Mulliken label with multiplicity, e.g. "4T1g"; for a free ion the term symbol; with
    /// spin–orbit coupling the double-group (Bethe) label, e.g. "Γ8g".
    pub label: String,
    /// Orbital degeneracy of a spin-free level; with spin–orbit coupling, the number of states.
    pub degeneracy: usize,
    /// Free-ion parent term (e.g. "4F").
    pub parent: String,
    /// Whether the transition from the ground level conserves spin (with spin–orbit coupling:
    /// whether the nearest pure spins agree).
    pub spin_allowed: bool,
    /// With spin–orbit coupling only: ⟨S²⟩ of the level (S(S+1) for a pure spin).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub s_squared: Option<f64>,
    /// With spin–orbit coupling only: the spin-free level with the largest weight, e.g. "4T1g".
    #[serde(skip_serializing_if = "Option::is_none")]
    pub from_level: Option<String>,
    /// With spin–orbit coupling only: weight (0..1) of that spin-free level.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub weight: Option<f64>,
}

/// The whole `levels` report.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct LevelsReport {
    /// Number of d electrons.
    pub dn: usize,
    pub geometry: String,
    /// Point group whose labels are used (Oh, Td, D4h).
    pub point_group: String,
    /// "cm-1" or "B" (energies in units of Racah B).
    pub energy_unit: String,
    /// Racah B (cm⁻¹; 1 in ratio mode, where energies are in units of B).
    pub b: f64,
    /// Racah C (cm⁻¹, or units of B in ratio mode).
    pub c: f64,
    /// Dq (cm⁻¹, or units of B in ratio mode).
    pub dq: f64,
    /// Δ = 10Dq.
    pub delta: f64,
    /// Tetragonal parameter Ds (cm⁻¹, or units of B in ratio mode).
    pub ds: f64,
    /// Tetragonal parameter Dt (cm⁻¹, or units of B in ratio mode).
    pub dt: f64,
    /// One-electron spin–orbit constant ζ (0 when spin–orbit coupling is off).
    pub zeta: f64,
    /// C/B (dimensionless).
    pub c_over_b: f64,
    /// Δ/B = 10Dq/B (dimensionless).
    pub delta_over_b: f64,
    pub ground: String,
    pub levels: Vec<LevelRow>,
}

impl Render for LevelsReport {
    type Figure = ();

    /// Human table.
    fn table(&self) -> String {
        let unit = if self.energy_unit == "B" {
            "E/B"
        } else {
            "E (cm⁻¹)"
        };
        let decimals = if self.energy_unit == "B" { 3 } else { 1 };
        let so = self.zeta != 0.0;
        let mut header = vec![
            unit,
            "2S+1",
            "label",
            "degeneracy",
            "parent",
            "spin-allowed",
        ];
        if so {
            header[3] = "states";
            header.push("from level");
            header.push("⟨S²⟩");
            header.push("weight");
        }
        let mut t = new_table(header);
        for l in &self.levels {
            let mut row = vec![
                fmt_num(l.energy, decimals),
                l.multiplicity.to_string(),
                l.label.clone(),
                l.degeneracy.to_string(),
                l.parent.clone(),
                if l.spin_allowed { "yes" } else { "no" }.to_string(),
            ];
            if so {
                row.push(l.from_level.clone().unwrap_or_default());
                row.push(fmt_num(l.s_squared.unwrap_or(f64::NAN), 3));
                row.push(fmt_num(l.weight.unwrap_or(f64::NAN), 3));
            }
            t.add_row(row);
        }
        let zeta = if self.zeta != 0.0 {
            format!(", ζ = {}", fmt_num(self.zeta, 1))
        } else {
            String::new()
        };
        format!(
            "d{} {} ({}): B = {}, C = {} (C/B = {}), Δ = 10Dq = {} (Δ/B = {}){}\nground level: {}\n{}\n",
            self.dn,
            self.geometry,
            self.point_group,
            fmt_num(self.b, 1),
            fmt_num(self.c, 1),
            fmt_num(self.c_over_b, 3),
            fmt_num(self.delta, 1),
            fmt_num(self.delta_over_b, 3),
            zeta,
            self.ground,
            t
        )
    }
}
