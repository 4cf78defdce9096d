//! Where candidates come from: the ions and pool ligands prepared from the tables, candidate rows
//! and the rows that cannot be used.

use super::*;
use crate::engine::{crossover, Crossover, Geometry};
use crate::error::{Error, Result};
use crate::estimate::{self, SpinGeometry, CALIBRATION};
use crate::param::Param;
use crate::tables::{DataSet, Ion, Ligand, LigandTable};
use std::fmt;

/// A pool ligand prepared for screening.
#[derive(Debug, Clone)]
pub struct PoolLigand {
    pub ligand: Ligand,
    /// Row of the ligand in the table (pools are ordered by it).
    pub table_index: usize,
    pub denticity: usize,
    /// Jørgensen f.
    pub f: f64,
    /// h used: the published h, or the donor-atom default that `resolve` uses.
    pub h: Option<f64>,
    /// True when `h` is a default.
    pub h_defaulted: bool,
    /// π-acceptor term π = −4e_π/g(Cr³⁺) ([`estimate::ligand_terms`]).
    pub pi: f64,
    /// (c·d)·f, (c·d)·π and (c·d)·h for c = 0..=MAX_SITES, as `resolve` forms them.
    pub(super) f_terms: [f64; MAX_SITES + 1],
    pub(super) pi_terms: [f64; MAX_SITES + 1],
    pub(super) h_terms: [f64; MAX_SITES + 1],
    /// Donor atoms counted in 4-bit fields, one per element of the donor filter plus "other".
    pub(super) donor_key: u32,
}

/// An ion prepared for screening, with its crossover computed once.
#[derive(Debug, Clone)]
pub struct ScreenIon {
    pub ion: Ion,
    /// Jørgensen g (cm⁻¹).
    pub g: f64,
    /// Free-ion B₀ (cm⁻¹).
    pub b0: f64,
    /// Jørgensen k (None: β = 1).
    pub k: Option<f64>,
    /// C/B used (C₀/B₀ or the Tanabe–Sugano ratio).
    pub c_over_b: f64,
    pub crossover: Crossover,
    /// Crossover Δ/B (the engine found one; ions without one are rejected).
    pub crossover_delta_over_b: f64,
    /// d(E_HS − E_LS)/dΔ at the crossover.
    pub slope: f64,
    /// How the two spin states' fields differ ([`SpinGeometry`]).
    pub spin_geometry: SpinGeometry,
}

/// A candidate row of a file that could not be used.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct RejectedCandidate {
    /// Data row number (1 = first row after the header).
    pub row: usize,
    /// Line number in the file.
    pub line: usize,
    pub column: String,
    pub message: String,
}

impl fmt::Display for RejectedCandidate {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(
            f,
            "row {} (line {}), column {}: {}",
            self.row, self.line, self.column, self.message
        )
    }
}

/// Where the candidates of a screen come from.
#[derive(Debug, Clone)]
pub(super) enum Source {
    /// Every multiset of the pool that fills the geometry.
    Pool,
    /// Rows of a candidates file, sorted by (sphere, name).
    Rows(Vec<(Sphere, Option<String>)>),
}

/// Compiled filters (pool indices and keys).
#[derive(Debug, Clone, Default)]
pub(super) struct Compiled {
    pub(super) require: Vec<u8>,
    pub(super) forbid: Vec<u8>,
    pub(super) max_abs_charge: Option<i32>,
    pub(super) donor_key: Option<u32>,
    pub(super) size: Option<SizeRange>,
    pub(super) kinds: Option<SizeRange>,
}

impl Compiled {
    /// No filter that looks at the sphere (every sphere passes `Screen::passes`).
    pub(super) fn is_open(&self) -> bool {
        self.require.is_empty()
            && self.forbid.is_empty()
            && self.donor_key.is_none()
            && self.size.is_none()
            && self.kinds.is_none()
    }
}

pub(super) fn prepare_ion(
    tables: &DataSet,
    spec: &IonSpec,
    geometry: Geometry,
) -> Result<ScreenIon> {
    let ions = tables.ions()?;
    let ion = ions.find(&spec.metal, spec.oxidation_state)?.clone();
    let c_over_b = match (ion.c0, ion.b0) {
        (Some(c0), Some(b0)) => c0 / b0,
        _ => crate::engine::tanabe_sugano_c_over_b(ion.dn),
    };
    let cross = crossover(ion.dn, geometry, c_over_b)?;
    let (Some(xc), Some(slope)) = (cross.delta_over_b, cross.slope) else {
        return Err(Error::invalid(
            Param::MetalIon(ion.name()),
            format!(
                "d{} in {} (one ground spin at every Δ/B)",
                ion.dn,
                geometry.name(),
            ),
            "an ion whose ground spin can change in this geometry (d4–d7 for oct); a screen ranks by distance to the crossover",
        ));
    };
    let g = ion.g.ok_or_else(|| {
        Error::invalid(
            Param::MetalIon(ion.name()),
            "no Jørgensen g in ions.csv",
            "an ion with g (`spinstate data ions` lists them), or an edited copy of ions.csv in a data directory that adds it",
        )
    })?;
    let b0 = ion.b0.ok_or_else(|| {
        Error::invalid(
            Param::MetalIon(ion.name()),
            "no free-ion B0 in ions.csv",
            "an ion with B0 (`spinstate data ions` lists them), or an edited copy of ions.csv in a data directory that adds it",
        )
    })?;
    let spin_geometry = SpinGeometry::new(&ion, geometry, &cross, &CALIBRATION);
    let k = ion
        .k
        .or_else(|| estimate::default_k(ions, ion.series).map(|(k, _)| k));
    Ok(ScreenIon {
        g,
        b0,
        k,
        c_over_b,
        crossover: cross,
        crossover_delta_over_b: xc,
        slope,
        spin_geometry,
        ion,
    })
}

/// Why a ligand cannot take part in a screen of `geometry`, if it cannot.
pub(super) fn unusable(l: &Ligand, geometry: Geometry) -> Option<String> {
    if !l.binds_in(geometry) {
        let can: Vec<&str> = l.binds.iter().map(|g| g.name()).collect();
        return Some(format!(
            "{} does not bind in {} (it binds in: {})",
            l.name,
            geometry.name(),
            can.join(", ")
        ));
    }
    if l.denticity() > geometry.coordination_number() {
        return Some(format!(
            "{} has {} donor atoms, more than the {} sites of {}",
            l.name,
            l.denticity(),
            geometry.coordination_number(),
            geometry.name()
        ));
    }
    None
}

pub(super) fn table_index(ligands: &LigandTable, l: &Ligand) -> usize {
    ligands
        .rows
        .iter()
        .position(|r| r.name == l.name)
        .unwrap_or(usize::MAX)
}

/// The h that `resolve` uses for a ligand: its own, or the mean of ligands with the same first
/// donor atom, or of all ligands.
pub(super) fn h_used(ligands: &LigandTable, l: &Ligand) -> (Option<f64>, bool) {
    match l.h {
        Some(h) => (Some(h), false),
        None => {
            let donor = l.donors.first().map(String::as_str).unwrap_or("");
            match ligands.mean_h_for_donor(donor).or_else(|| ligands.mean_h()) {
                Some((h, _)) => (Some(h), true),
                None => (None, false),
            }
        }
    }
}

pub(super) fn donor_slots(filter: Option<&DonorSet>) -> Vec<String> {
    filter
        .map(|d| d.counts.iter().map(|(e, _)| e.clone()).collect())
        .unwrap_or_default()
}

/// 4-bit field per filter element, the field after them counts all other donor atoms.
pub(super) fn donor_key(atoms: &[String], slots: &[String]) -> u32 {
    atoms
        .iter()
        .map(|a| {
            let p = slots.iter().position(|s| s == a).unwrap_or(slots.len());
            1u32 << (4 * p)
        })
        .sum()
}

pub(super) fn pool_ligand(
    ligands: &LigandTable,
    l: &Ligand,
    ion_needs_h: bool,
    slots: &[String],
) -> Result<PoolLigand> {
    let (h, h_defaulted) = h_used(ligands, l);
    if h.is_none() && ion_needs_h {
        return Err(Error::invalid(
            Param::NamedLigand(l.name.clone()),
            "no h and no ligand in the table with one to default from",
            "a ligands.csv with Jørgensen h for at least one ligand",
        ));
    }
    let d = l.denticity();
    let (f, pi) = estimate::ligand_terms(l);
    let mut f_terms = [0.0; MAX_SITES + 1];
    let mut pi_terms = [0.0; MAX_SITES + 1];
    let mut h_terms = [0.0; MAX_SITES + 1];
    for c in 0..=MAX_SITES {
        // Exactly the product `per_donor` in complex.rs forms: (count·denticity) as f64 × value.
        f_terms[c] = (c * d) as f64 * f;
        pi_terms[c] = (c * d) as f64 * pi;
        h_terms[c] = (c * d) as f64 * h.unwrap_or(0.0);
    }
    Ok(PoolLigand {
        ligand: l.clone(),
        table_index: table_index(ligands, l),
        denticity: d,
        f,
        h,
        h_defaulted,
        pi,
        f_terms,
        pi_terms,
        h_terms,
        donor_key: donor_key(&l.donors, slots),
    })
}
