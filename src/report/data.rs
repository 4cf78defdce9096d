//! Report of `spinstate data`: the chemistry tables as loaded (bundled or from `--data DIR`).

use super::Render;
use super::{fmt_num, new_table};
use crate::tables::{Ion, Ligand};
use serde::Serialize;

/// One ion row (energies in cm⁻¹).
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct IonRow {
    pub symbol: String,
    /// Oxidation state of the metal (formal charge, e.g. 2).
    pub oxidation_state: i32,
    /// Name with Roman numeral, e.g. "Fe(II)".
    pub ion: String,
    /// d-electron count (group − oxidation state).
    pub dn: usize,
    /// "3d", "4d" or "5d".
    pub series: String,
    /// Free-ion Racah B₀ (cm⁻¹).
    pub b0: Option<f64>,
    /// Free-ion Racah C₀ (cm⁻¹).
    pub c0: Option<f64>,
    /// One-electron spin–orbit constant ζ (cm⁻¹).
    pub zeta: Option<f64>,
    /// Jørgensen g (cm⁻¹).
    pub g: Option<f64>,
    /// Jørgensen k (dimensionless).
    pub k: Option<f64>,
    pub caution: Option<String>,
    pub source: String,
}

impl From<&Ion> for IonRow {
    fn from(i: &Ion) -> Self {
        IonRow {
            symbol: i.symbol.clone(),
            oxidation_state: i.oxidation_state,
            ion: i.name(),
            dn: i.dn,
            series: i.series.name().to_string(),
            b0: i.b0,
            c0: i.c0,
            zeta: i.zeta,
            g: i.g,
            k: i.k,
            caution: i.caution.clone(),
            source: i.source.clone(),
        }
    }
}

/// One ligand row.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct LigandRow {
    pub name: String,
    pub aliases: Vec<String>,
    /// Donor atoms (element symbols); their number is the denticity.
    pub donors: Vec<String>,
    /// Donor atoms bound per ligand (a count).
    pub denticity: usize,
    /// Charge of the free ligand (elementary charges).
    pub charge: i32,
    /// Jørgensen f (dimensionless).
    pub f: f64,
    /// How f was obtained: "printed", "derived" (from a named published Δ) or "series".
    pub f_from: String,
    /// Jørgensen h (dimensionless).
    pub h: Option<f64>,
    /// Angular overlap e_σ for Cr(III) (cm⁻¹).
    pub e_sigma: Option<f64>,
    /// Angular overlap e_π for Cr(III) (cm⁻¹).
    pub e_pi: Option<f64>,
    /// "acceptor", "donor" or "none".
    pub pi: String,
    /// Geometries the ligand can occupy.
    pub binds: Vec<String>,
    pub caution: Option<String>,
    pub source: String,
}

impl From<&Ligand> for LigandRow {
    fn from(l: &Ligand) -> Self {
        LigandRow {
            name: l.name.clone(),
            aliases: l.aliases.clone(),
            donors: l.donors.clone(),
            denticity: l.denticity(),
            charge: l.charge,
            f: l.f,
            f_from: l.f_from.name().to_string(),
            h: l.h,
            e_sigma: l.e_sigma,
            e_pi: l.e_pi,
            pi: l.pi.name().to_string(),
            binds: l.binds.iter().map(|g| g.name().to_string()).collect(),
            caution: l.caution.clone(),
            source: l.source.clone(),
        }
    }
}

/// `spinstate data ions`.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct IonsReport {
    /// "bundled" or the `--data` directory.
    pub origin: String,
    pub ions: Vec<IonRow>,
}

/// `spinstate data ligands`.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct LigandsReport {
    /// "bundled" or the `--data` directory.
    pub origin: String,
    pub ligands: Vec<LigandRow>,
}

fn opt(x: Option<f64>, d: usize) -> String {
    x.map_or(String::new(), |v| fmt_num(v, d))
}

impl Render for IonsReport {
    type Figure = ();

    /// Human table.
    fn table(&self) -> String {
        let mut t = new_table([
            "ion",
            "d^n",
            "series",
            "B0 (cm⁻¹)",
            "C0 (cm⁻¹)",
            "ζ (cm⁻¹)",
            "g (cm⁻¹)",
            "k",
            "source",
        ]);
        for r in &self.ions {
            t.add_row(vec![
                r.ion.clone(),
                r.dn.to_string(),
                r.series.clone(),
                opt(r.b0, 0),
                opt(r.c0, 0),
                opt(r.zeta, 0),
                opt(r.g, 0),
                opt(r.k, 2),
                r.source.clone(),
            ]);
        }
        format!(
            "{} ions ({}); d^n = group − oxidation state\n{t}\n",
            self.ions.len(),
            self.origin
        )
    }
}

impl Render for LigandsReport {
    type Figure = ();

    /// Human table.
    fn table(&self) -> String {
        let mut t = new_table([
            "ligand", "aliases", "donors", "charge", "f", "h", "π", "binds", "source",
        ]);
        for r in &self.ligands {
            t.add_row(vec![
                r.name.clone(),
                r.aliases.join(", "),
                r.donors.join(" "),
                r.charge.to_string(),
                format!("{} ({})", super::fmt_num(r.f, 2), r.f_from),
                opt(r.h, 1),
                r.pi.clone(),
                r.binds.join(" "),
                r.source.clone(),
            ]);
        }
        format!("{} ligands ({})\n{t}\n", self.ligands.len(), self.origin)
    }
}

/// One row of `spinstate data pascal` (χ in 10⁻⁶ cm³ mol⁻¹, cgs).
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct PascalRow {
    /// "atom", "cation", "anion", "ligand", "solvent" or "bond" (constitutive correction).
    pub kind: String,
    pub name: String,
    /// Increment in 10⁻⁶ cm³ mol⁻¹.
    pub value_1e6_cm3_per_mol: f64,
    pub source: String,
}

/// `spinstate data pascal`.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct PascalReport {
    pub origin: String,
    pub entries: Vec<PascalRow>,
}

impl Render for PascalReport {
    type Figure = ();

    fn table(&self) -> String {
        let mut t = new_table(["kind", "entry", "χ (10⁻⁶ cm³/mol)", "source"]);
        for r in &self.entries {
            t.add_row(vec![
                r.kind.clone(),
                r.name.clone(),
                fmt_num(r.value_1e6_cm3_per_mol, 2),
                r.source.clone(),
            ]);
        }
        format!("Pascal increments ({}):\n{t}\n", self.origin)
    }
}

/// One row of `spinstate data moment-ranges`.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct MomentRangeRow {
    /// Number of d electrons.
    pub dn: usize,
    pub geometry: String,
    /// Spin multiplicity 2S+1 of the state.
    pub multiplicity: i32,
    pub ground_term: String,
    /// Lower end of the typical room-temperature μ_eff (μB).
    pub mu_min: f64,
    /// Upper end of the typical room-temperature μ_eff (μB).
    pub mu_max: f64,
    pub examples: String,
    pub source: String,
}

/// `spinstate data moment-ranges`.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct MomentRangesReport {
    pub origin: String,
    pub ranges: Vec<MomentRangeRow>,
}

impl Render for MomentRangesReport {
    type Figure = ();

    fn table(&self) -> String {
        let mut t = new_table([
            "d^n",
            "geometry",
            "2S+1",
            "ground term",
            "μ_eff (μB)",
            "examples",
            "source",
        ]);
        for r in &self.ranges {
            t.add_row(vec![
                format!("d{}", r.dn),
                r.geometry.clone(),
                r.multiplicity.to_string(),
                r.ground_term.clone(),
                format!("{:.1}–{:.1}", r.mu_min, r.mu_max),
                r.examples.clone(),
                r.source.clone(),
            ]);
        }
        format!("Typical room-temperature moments ({}):\n{t}\n", self.origin)
    }
}

/// One row of `spinstate data bond-lengths` (Å).
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct BondLengthDataRow {
    pub metal: String,
    /// Oxidation state of the metal (formal charge).
    pub oxidation_state: i32,
    pub donor: String,
    pub donor_class: String,
    /// Low-spin range (Å), if tabulated.
    pub low_spin: Option<(f64, f64)>,
    /// High-spin range (Å), if tabulated.
    pub high_spin: Option<(f64, f64)>,
    /// Published change LS → HS (Å), if tabulated.
    pub delta_r: Option<f64>,
    pub what: String,
    pub source: String,
}

/// `spinstate data bond-lengths`.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct BondLengthsReport {
    pub origin: String,
    pub rows: Vec<BondLengthDataRow>,
}

impl Render for BondLengthsReport {
    type Figure = ();

    fn table(&self) -> String {
        let range =
            |r: Option<(f64, f64)>| r.map_or(String::new(), |(a, b)| format!("{a:.3}–{b:.3}"));
        let mut t = new_table([
            "ion", "donor", "LS (Å)", "HS (Å)", "Δr (Å)", "what", "source",
        ]);
        for r in &self.rows {
            t.add_row(vec![
                format!("{}({})", r.metal, r.oxidation_state),
                format!("{} {}", r.donor, r.donor_class),
                range(r.low_spin),
                range(r.high_spin),
                opt(r.delta_r, 2),
                r.what.clone(),
                r.source.clone(),
            ]);
        }
        format!("Metal–donor bond lengths ({}):\n{t}\n", self.origin)
    }
}
