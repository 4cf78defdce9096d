//! A complex described by its composition (metal, oxidation state, geometry, ligands) and the
//! ligand-field parameters estimated from it, or given by the user in their place.
//!
//! [`ComplexSpec`] is what a user types; [`ComplexSpec::resolve`] checks it against the data
//! tables and returns a [`ResolvedComplex`] whose Δ, B and C are each a [`Parameter`] that records the
//! estimate, the given value and which one is used. Commands that need a complex from its
//! composition (predict, moment comparison, screening) should all go through `resolve`.
//!
//! # The estimate
//! The policy lives in [`crate::estimate`] (the one estimator every command uses): Δ of each
//! spin state at its own bond length from Jørgensen's factors with a back-bonding term, B from
//! the nephelauxetic factors, the spin state from the engine's crossover and slope, and the
//! uncertainties in [`Reliability`]. This module checks the composition against the tables,
//! fills defaults (an h missing from the table takes the mean h of the ligands with the same
//! donor atom; a missing C₀ takes the Tanabe–Sugano C/B), applies the values a user gives in
//! place of the estimates, and records every such choice in `notes`.

use crate::engine::{
    crossover, tanabe_sugano_c_over_b, Calculation, Crossover, Geometry, LigandField, PointGroup,
};
use crate::error::{Error, Result};
use crate::estimate::{
    self, BondChange, Calibration, Reliability, SpinDecision, SpinGeometry, CALIBRATION,
};
use crate::param::Param;
use crate::tables::{
    DataSet, FieldBasis, Ion, Ligand, Provenance, ReferenceState, TransitionSeries,
};

use std::str::FromStr;

/// One ligand of a complex and how many of it are bound, parsed from `NAME[:COUNT]`.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct LigandCount {
    /// Name or alias as in ligands.csv.
    pub name: String,
    /// Number of ligands (not donor atoms), ≥ 1.
    pub count: usize,
}

/// Most ligands of one kind in a sphere: no coordination number above 12 is known (common
/// practice), so every later donor sum stays small and cannot wrap.
pub const MAX_LIGAND_COUNT: usize = 12;

impl std::fmt::Display for LigandCount {
    /// `NAME:COUNT`, which [`FromStr`] reads back.
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}:{}", self.name, self.count)
    }
}

impl FromStr for LigandCount {
    type Err = Error;

    /// `NAME` (one ligand) or `NAME:COUNT`, e.g. `py:4`.
    fn from_str(s: &str) -> Result<Self> {
        let (name, count) = match s.rsplit_once(':') {
            Some((n, c)) => {
                let count: usize = c.trim().parse().map_err(|_| {
                    Error::invalid(
                        Param::LigandCount,
                        format!("'{c}' in '{s}'"),
                        "a whole number from 1 to 12 after the colon, as in py:4",
                    )
                })?;
                (n.trim(), count)
            }
            None => (s.trim(), 1),
        };
        if name.is_empty() {
            return Err(Error::invalid(
                Param::Ligand,
                format!("'{s}'"),
                "NAME or NAME:COUNT, as in NCS:2",
            ));
        }
        if count == 0 || count > MAX_LIGAND_COUNT {
            return Err(Error::invalid(
                Param::LigandCount,
                format!("{count} in '{s}'"),
                "a whole number from 1 to 12 (a coordination sphere holds at most 12 donor atoms)",
            ));
        }
        Ok(LigandCount {
            name: name.to_string(),
            count,
        })
    }
}

/// Measured values that replace the estimates, in cm⁻¹ (Δ in the geometry's convention: Δo for
/// oct, Δt for tet, the octahedral 10Dq of the same ligands for sqpl).
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct Overrides {
    pub delta: Option<f64>,
    pub b: Option<f64>,
    pub c: Option<f64>,
}

/// A complex as a user describes it.
#[derive(Debug, Clone, PartialEq)]
pub struct ComplexSpec {
    /// Element symbol, any case ("Fe", "fe").
    pub metal: String,
    pub oxidation_state: i32,
    /// oct, tet or sqpl.
    pub geometry: Geometry,
    pub ligands: Vec<LigandCount>,
    pub overrides: Overrides,
}

/// Where a parameter's value comes from.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Origin {
    /// Estimated from the data tables.
    Estimated,
    /// Given by the user (measured).
    Given,
    /// A placeholder that no result depends on (B and C of d⁰, d¹, d⁹, d¹⁰; Δ of d⁰, d¹⁰).
    Nominal,
}

impl Origin {
    /// "estimated", "given" or "nominal".
    pub fn name(self) -> &'static str {
        match self {
            Origin::Estimated => "estimated",
            Origin::Given => "given",
            Origin::Nominal => "nominal",
        }
    }
}

/// One ligand-field parameter (cm⁻¹) with its estimate and the value given in its place.
#[derive(Debug, Clone, PartialEq)]
pub struct Parameter {
    /// The value used (cm⁻¹).
    pub value: f64,
    /// The estimate from the tables, when one could be made (cm⁻¹).
    pub estimate: Option<f64>,
    /// The value given by the user, if any (cm⁻¹).
    pub given: Option<f64>,
    pub origin: Origin,
    /// Relative uncertainty assumed for `value` (0.1 = 10 %); 0 for nominal values.
    pub relative_uncertainty: f64,
}

impl Parameter {
    fn choose(
        estimate: Option<f64>,
        given: Option<f64>,
        estimated_uncertainty: f64,
    ) -> Option<Parameter> {
        match (given, estimate) {
            (Some(v), _) => Some(Parameter {
                value: v,
                estimate,
                given,
                origin: Origin::Given,
                relative_uncertainty: GIVEN_UNCERTAINTY,
            }),
            (None, Some(v)) => Some(Parameter {
                value: v,
                estimate,
                given,
                origin: Origin::Estimated,
                relative_uncertainty: estimated_uncertainty,
            }),
            (None, None) => None,
        }
    }

    fn nominal(value: f64) -> Parameter {
        Parameter {
            value,
            estimate: None,
            given: None,
            origin: Origin::Nominal,
            relative_uncertainty: 0.0,
        }
    }
}

/// Relative uncertainty of a given (measured) Δ or B.
pub const GIVEN_UNCERTAINTY: f64 = 0.05;

/// B used for one-electron and one-hole ions (d¹, d⁹) and for d⁰, d¹⁰ when the table has no B₀:
/// their level energies do not depend on B or C, so the value only lets the engine run.
pub const NOMINAL_B: f64 = 1000.0;

/// A ligand as bound in a complex, with the nephelauxetic factor used for it.
#[derive(Debug, Clone, PartialEq)]
pub struct BoundLigand {
    pub ligand: Ligand,
    /// Number of these ligands.
    pub count: usize,
    /// h used in the average (the published h, or the donor-atom default).
    pub h_used: Option<f64>,
    /// True when `h_used` is a default rather than the ligand's own value.
    pub h_defaulted: bool,
}

/// A complex resolved against the data tables: the ion, its ligands and its Δ, B, C.
#[derive(Debug, Clone, PartialEq)]
pub struct ResolvedComplex {
    pub ion: Ion,
    pub geometry: Geometry,
    pub ligands: Vec<BoundLigand>,
    /// Overall charge: oxidation state plus the ligand charges.
    pub charge: i32,
    /// Number of donor atoms (equals the geometry's coordination number).
    pub donor_count: usize,
    /// Donor-averaged Jørgensen f.
    pub mean_f: Option<f64>,
    /// Donor-averaged Jørgensen h (with defaults for missing h).
    pub mean_h: Option<f64>,
    /// Nephelauxetic ratio β = 1 − h̄k used for the estimate (1 when k is unknown).
    pub beta: Option<f64>,
    /// Donor-averaged π-acceptor term π̄ = −4ē_π/g(Cr³⁺) (0 without π acceptors).
    pub mean_pi: f64,
    /// Ligand-field splitting in the geometry's convention (cm⁻¹): Δo (oct), Δt (tet), or 3e_σ
    /// (sqpl), of the predicted ground state: Δ_LS when the low-spin state is the ground state
    /// at low temperature, Δ_HS otherwise.
    pub delta: Parameter,
    /// Δ of the high-spin state at its own bond length (cm⁻¹).
    pub delta_high_spin: Parameter,
    /// Δ of the low-spin state at its own bond length (cm⁻¹); equal to `delta_high_spin` when
    /// the spin cannot change or Δ was given.
    pub delta_low_spin: Parameter,
    /// Racah B (cm⁻¹).
    pub b: Parameter,
    /// Racah C (cm⁻¹).
    pub c: Parameter,
    /// The engine's crossover for this d^n, geometry and C/B.
    pub crossover: Crossover,
    /// How the two spin states differ in bond length and field.
    pub spin_geometry: SpinGeometry,
    /// The spin state the two fields imply; None when the spin cannot change (or Δ is nominal).
    pub spin_choice: Option<SpinDecision>,
    /// The model constants used.
    pub calibration: Calibration,
    /// True when π back-bonding was added to f̄ (π acceptors on an ion below +3, Δ not given).
    pub back_bonding: bool,
    /// How defaults were filled in and where the estimate is weak, one sentence each.
    pub notes: Vec<String>,
    /// Handling cautions for the metal and ligands (empty when none apply).
    pub cautions: Vec<String>,
}

impl ComplexSpec {
    /// Checks the composition against the tables and estimates Δ, B and C (see the module
    /// docs), replacing each by the given value where one is given.
    ///
    /// Errors (all bad input, exit code 2): unknown metal or oxidation state, unknown ligand,
    /// a ligand that cannot bind in the geometry, a donor count that does not fill the geometry,
    /// a non-finite or non-positive override, or a parameter that can be neither estimated nor
    /// was given.
    pub fn resolve(&self, tables: &DataSet) -> Result<ResolvedComplex> {
        self.resolve_with(tables, &CALIBRATION)
    }

    /// [`ComplexSpec::resolve`] with other model constants (used by the calibration fit).
    pub fn resolve_with(&self, tables: &DataSet, cal: &Calibration) -> Result<ResolvedComplex> {
        let ion = tables
            .ions()?
            .find(&self.metal, self.oxidation_state)?
            .clone();
        let geometry = self.geometry;
        if !geometry.estimable() {
            return Err(Error::invalid(
                Param::Geometry,
                "tetragonal",
                "oct, tet or sqpl (a tetragonal field needs Ds and Dt: use `spinstate levels`)",
            ));
        }
        if self.ligands.is_empty() {
            return Err(Error::invalid(
                Param::Ligands,
                "none",
                "at least one ligand as NAME[:COUNT], e.g. H2O:6",
            ));
        }
        let mut bound: Vec<BoundLigand> = Vec::new();
        for lc in &self.ligands {
            let ligand = tables.ligands()?.find(&lc.name)?;
            if !ligand.binds_in(geometry) {
                let can: Vec<&str> = ligand.binds.iter().map(|g| g.name()).collect();
                return Err(Error::invalid(
                    Param::NamedLigand(ligand.name.clone()),
                    format!(
                        "{} in a {} complex",
                        denticity_word(ligand),
                        geometry.name()
                    ),
                    format!("a geometry it can bind in: {}", can.join(", ")),
                ));
            }
            match bound.iter_mut().find(|b| b.ligand.name == ligand.name) {
                Some(b) => b.count = b.count.saturating_add(lc.count),
                None => bound.push(BoundLigand {
                    ligand: ligand.clone(),
                    count: lc.count,
                    h_used: None,
                    h_defaulted: false,
                }),
            }
        }
        // Saturating: a count built in code (not parsed) may be huge; the check below refuses it.
        let donor_count: usize = bound.iter().fold(0, |n, b| {
            n.saturating_add(b.count.saturating_mul(b.ligand.denticity()))
        });
        let needed = geometry.coordination_number();
        if donor_count != needed {
            let parts: Vec<String> = bound
                .iter()
                .map(|b| format!("{} {} × {}", b.count, b.ligand.name, b.ligand.denticity()))
                .collect();
            return Err(Error::invalid(
                Param::DonorAtomCount,
                format!("{donor_count} ({})", parts.join(" + ")),
                format!("exactly {needed} for {}", geometry.name()),
            ));
        }
        let charge = ion.oxidation_state
            + bound
                .iter()
                .map(|b| b.count as i32 * b.ligand.charge)
                .sum::<i32>();
        let mut notes = Vec::new();
        match geometry {
            Geometry::SquarePyramidal => notes.push(
                "sqpy: ideal square pyramid, metal in the basal plane, angular-overlap field (σ only, e_σ = 10Dq/3, d–s mixing); the d-orbital field of C4v has D4h symmetry, so levels carry D4h labels: drop the g for C4v".to_string(),
            ),
            Geometry::TrigonalBipyramidal => notes.push(
                "tbp: ideal trigonal bipyramid, angular-overlap field (σ only, e_σ = 10Dq/3, d–s mixing); D3h is not among the groups the engine labels, so levels are labelled A (C1)".to_string(),
            ),
            Geometry::Octahedral
            | Geometry::Tetrahedral
            | Geometry::SquarePlanar
            | Geometry::Tetragonal => {}
        }

        // Δ
        for (name, v) in [
            (Param::Delta, self.overrides.delta),
            (Param::RacahB, self.overrides.b),
            (Param::RacahC, self.overrides.c),
        ] {
            if let Some(v) = v {
                if !v.is_finite() || v <= 0.0 || v > 200_000.0 {
                    return Err(Error::invalid(
                        name,
                        v,
                        "a value in cm⁻¹ above 0 and below 200000",
                    ));
                }
            }
        }
        let mean_f = per_donor(&bound, |b| b.ligand.f);
        let mean_pi = per_donor(&bound, |b| estimate::ligand_terms(&b.ligand).1);
        let back_bonding = mean_pi > 0.0 && estimate::back_bonding_steps(ion.oxidation_state) > 0.0;
        let delta_reference = ion.g.map(|g| {
            estimate::reference_delta(mean_f, mean_pi, g, ion.oxidation_state, geometry, cal)
        });
        let worst_f = bound
            .iter()
            .fold(FieldBasis::Printed, |w, b| w.max(b.ligand.f_from));
        if delta_reference.is_none()
            && self.overrides.delta.is_none()
            && ion.dn != 0
            && ion.dn != 10
        {
            return Err(Error::invalid(
                Param::Delta,
                format!("unknown (no Jørgensen g for {} in ions.csv)", ion.name()),
                "a measured Δ in cm⁻¹ (e.g. from a band fit), or g added to an edited copy of ions.csv in a data directory",
            )
            .needing([Param::DataDir]));
        }
        let back_bonding_added = back_bonding && self.overrides.delta.is_none();
        if back_bonding_added {
            let acceptors: Vec<&str> = bound
                .iter()
                .filter(|b| estimate::ligand_terms(&b.ligand).1 > 0.0)
                .map(|b| b.ligand.name.as_str())
                .collect();
            notes.push(format!(
                "back-bonding: the π acceptors ({}) on a {} ion add {:.2} to f̄ ({:.1} × {} step(s) below +3 × π̄ = {:.3}, π = −4e_π/g(Cr³⁺))",
                acceptors.join(", "),
                ion.name(),
                cal.back_bonding * estimate::back_bonding_steps(ion.oxidation_state) * mean_pi,
                cal.back_bonding,
                estimate::back_bonding_steps(ion.oxidation_state),
                mean_pi
            ));
        }
        for b in &bound {
            if b.ligand.f_from == FieldBasis::Series {
                notes.push(format!(
                    "f of {} is placed by its position in the spectrochemical series (no published Δ): wider uncertainty",
                    b.ligand.name
                ));
            }
        }

        // B and C
        let mut h_defaulted = false;
        for b in &mut bound {
            match b.ligand.h {
                Some(h) => b.h_used = Some(h),
                None => {
                    let donor = b.ligand.donors.first().map(String::as_str).unwrap_or("");
                    let (h, names, what) = match tables.ligands()?.mean_h_for_donor(donor) {
                        Some((h, names)) => (h, names, format!("{donor}-donor ligands")),
                        None => match tables.ligands()?.mean_h() {
                            Some((h, names)) => (h, names, "all ligands".to_string()),
                            None => continue,
                        },
                    };
                    b.h_used = Some(h);
                    b.h_defaulted = true;
                    h_defaulted = true;
                    notes.push(format!(
                        "no published h for {}: used {h:.2}, the mean h of the {what} with one ({})",
                        b.ligand.name,
                        names.join(", ")
                    ));
                }
            }
        }
        let mean_h = bound
            .iter()
            .all(|b| b.h_used.is_some())
            .then(|| per_donor(&bound, |b| b.h_used.unwrap_or(0.0)));
        let k_used = match ion.k {
            Some(k) => Some(k),
            None => {
                let d = estimate::default_k(tables.ions()?, ion.series);
                if let Some((k, from)) = &d {
                    if ion.b0.is_some() && self.overrides.b.is_none() && !one_electron(ion.dn) {
                        notes.push(format!(
                            "no Jørgensen k for {}: k = {k:.2}, the mean printed k of {} ions ({})",
                            ion.name(),
                            ion.series.name(),
                            from.join(", ")
                        ));
                    }
                }
                d.map(|(k, _)| k)
            }
        };
        let beta = match (k_used, mean_h) {
            (Some(k), Some(h)) => {
                let (beta, floored) = estimate::nephelauxetic_ratio(h, k);
                if floored && self.overrides.b.is_none() {
                    notes.push(format!(
                        "β = 1 − h̄k = {:.2} (h̄ = {h:.2}, k = {k:.2}) is below the range of the factor rule: β = {} is used (the most covalent measured complexes)",
                        1.0 - h * k,
                        estimate::BETA_FLOOR
                    ));
                }
                Some(beta)
            }
            (None, _) => Some(1.0),
            (Some(_), None) => None,
        };
        let b_estimate = match (ion.b0, beta) {
            (Some(b0), Some(beta)) => Some(b0 * beta),
            _ => None,
        };
        let reliability = Reliability {
            worst_f,
            g: ion.provenance_of("g"),
            b0: ion.provenance_of("b0"),
            back_bonding,
            b_defaulted: h_defaulted || ion.k.is_none(),
            heavy: ion.series != TransitionSeries::ThreeD,
            geometry,
        };
        let b_uncertainty = reliability.b();
        let b =
            match Parameter::choose(b_estimate, self.overrides.b, b_uncertainty) {
                Some(p) => p,
                None if one_electron(ion.dn) || ion.dn == 0 || ion.dn == 10 => {
                    Parameter::nominal(NOMINAL_B)
                }
                None => return Err(Error::invalid(
                    Param::RacahB,
                    format!("unknown (no free-ion B0 for {} in ions.csv)", ion.name()),
                    "a measured B in cm⁻¹ (and C, or C/B is taken from the Tanabe–Sugano ratio)",
                )
                .needing([Param::RacahC])),
            };
        let c_over_b = match (ion.c0, ion.b0) {
            (Some(c0), Some(b0)) => c0 / b0,
            _ => {
                if !one_electron(ion.dn)
                    && ion.dn != 0
                    && ion.dn != 10
                    && self.overrides.c.is_none()
                {
                    notes.push(format!(
                        "no free-ion C0 for {}: C = {:.3}·B, the Tanabe–Sugano C/B for d{}",
                        ion.name(),
                        tanabe_sugano_c_over_b(ion.dn),
                        ion.dn
                    ));
                }
                tanabe_sugano_c_over_b(ion.dn)
            }
        };
        let c_estimate = (b.origin != Origin::Nominal).then_some(c_over_b * b.value);
        let c = Parameter::choose(c_estimate, self.overrides.c, b.relative_uncertainty)
            .unwrap_or_else(|| Parameter::nominal(c_over_b * NOMINAL_B));

        if matches!(
            ion.provenance_of("b0"),
            Provenance::Assumed | Provenance::Rule
        ) && self.overrides.b.is_none()
        {
            notes.push(format!(
                "the free-ion B0 of {} in ions.csv is an assumed typical value (no published free-ion fit): B ±{:.0} %",
                ion.name(),
                100.0 * b_uncertainty
            ));
        }

        // Each spin state at its own bond length, and the spin state they imply.
        // The C/B that set C (exactly the screen's per-ion value) unless C itself was given.
        let cross_c_over_b = match c.origin {
            Origin::Given => c.value / b.value,
            Origin::Estimated | Origin::Nominal => c_over_b,
        };
        let cross = crossover(ion.dn, geometry, cross_c_over_b)?;
        let spin_geometry = SpinGeometry::new(&ion, geometry, &cross, cal);
        let delta_uncertainty = reliability.delta();
        let (delta_high_spin, delta_low_spin) = match (self.overrides.delta, delta_reference) {
            (Some(_), _) => {
                if cross.low_spin.is_some() {
                    notes.push(
                        "a measured Δ belongs to the geometry of the spin state the complex is in: both spin states are compared at it (one geometry)"
                            .to_string(),
                    );
                }
                let p = Parameter::choose(delta_reference, self.overrides.delta, delta_uncertainty)
                    .unwrap_or_else(|| Parameter::nominal(0.0));
                (p.clone(), p)
            }
            (None, Some(d)) => (
                Parameter::choose(
                    Some(d * spin_geometry.high_spin_factor),
                    None,
                    delta_uncertainty,
                )
                .unwrap_or_else(|| Parameter::nominal(0.0)),
                Parameter::choose(
                    Some(d * spin_geometry.low_spin_factor),
                    None,
                    delta_uncertainty,
                )
                .unwrap_or_else(|| Parameter::nominal(0.0)),
            ),
            (None, None) => (Parameter::nominal(0.0), Parameter::nominal(0.0)),
        };
        let spin_choice = if delta_high_spin.origin == Origin::Nominal {
            None
        } else {
            estimate::choose_spin(
                delta_high_spin.value / b.value,
                delta_low_spin.value / b.value,
                b.value,
                &cross,
                cal,
            )
        };
        if cross.low_spin.is_some() && self.overrides.delta.is_none() {
            if let Some(d) = delta_reference {
                notes.push(format!(
                    "spin-state geometries: Δ_ref = {d:.0} cm⁻¹ belongs to the {} state (g of {} measured on {} complexes); Δr = {:.3} Å ({}) and Δ ∝ r^-{} give Δ_LS/Δ_HS = {:.2}",
                    match spin_geometry.reference {
                        ReferenceState::LowSpin => "low-spin",
                        ReferenceState::HighSpin | ReferenceState::Any => "high-spin",
                    },
                    ion.name(),
                    match spin_geometry.reference {
                        ReferenceState::LowSpin => "low-spin",
                        ReferenceState::HighSpin => "high-spin",
                        ReferenceState::Any => "single-state",
                    },
                    spin_geometry.delta_r,
                    match spin_geometry.delta_r_from {
                        BondChange::Table => "ions.csv",
                        BondChange::Rule | BondChange::None => "0.1 Å per e_g electron for M(I)/M(II), 0.075 Å above",
                    },
                    cal.distance_exponent,
                    spin_geometry.ratio
                ));
            }
        }
        let delta = match spin_choice.map(|c| c.state) {
            Some(s) if s.low_spin_ground() => delta_low_spin.clone(),
            _ => delta_high_spin.clone(),
        };

        let mut cautions: Vec<String> = Vec::new();
        if let Some(c) = &ion.caution {
            cautions.push(format!("{}: {c}", ion.symbol));
        }
        for b in &bound {
            if let Some(c) = &b.ligand.caution {
                cautions.push(format!("{}: {c}", b.ligand.name));
            }
        }

        Ok(ResolvedComplex {
            ion,
            geometry,
            ligands: bound,
            charge,
            donor_count,
            mean_f: Some(mean_f),
            mean_pi,
            mean_h,
            beta,
            delta,
            delta_high_spin,
            delta_low_spin,
            b,
            c,
            crossover: cross,
            spin_geometry,
            spin_choice,
            calibration: *cal,
            back_bonding: back_bonding_added,
            notes,
            cautions,
        })
    }
}

/// Donor-weighted mean of a per-ligand value (rule of average environment).
fn per_donor(bound: &[BoundLigand], v: impl Fn(&BoundLigand) -> f64) -> f64 {
    let donors: usize = bound.iter().map(|b| b.count * b.ligand.denticity()).sum();
    bound
        .iter()
        .map(|b| (b.count * b.ligand.denticity()) as f64 * v(b))
        .sum::<f64>()
        / donors as f64
}

fn one_electron(dn: usize) -> bool {
    dn == 1 || dn == 9
}

fn denticity_word(l: &Ligand) -> &'static str {
    match l.denticity() {
        1 => "monodentate",
        2 => "bidentate",
        3 => "tridentate",
        4 => "tetradentate",
        _ => "polydentate",
    }
}

impl ResolvedComplex {
    /// The literature row for this complex in `reported_spin_states.csv`, if there is one
    /// (same metal, oxidation state, geometry and ligands, in any order); an error when the
    /// table cannot be read.
    pub fn reported<'t>(
        &self,
        tables: &'t DataSet,
    ) -> Result<Option<&'t crate::tables::ReportedComplex>> {
        let ligands: Vec<(String, usize)> = self
            .ligands
            .iter()
            .map(|b| (b.ligand.name.clone(), b.count))
            .collect();
        Ok(tables.reported()?.find(
            &self.ion.symbol,
            self.ion.oxidation_state,
            self.geometry,
            &ligands,
        ))
    }

    /// Dq = Δ/10 in the geometry's convention (cm⁻¹).
    pub fn dq(&self) -> f64 {
        self.delta.value / 10.0
    }

    /// C/B of the parameters used.
    pub fn c_over_b(&self) -> f64 {
        self.c.value / self.b.value
    }

    /// Δ/B of the parameters used.
    pub fn delta_over_b(&self) -> f64 {
        self.delta.value / self.b.value
    }

    /// Relative uncertainty of Δ/B: those of Δ and B added in quadrature.
    pub fn delta_over_b_uncertainty(&self) -> f64 {
        self.delta
            .relative_uncertainty
            .hypot(self.b.relative_uncertainty)
    }

    /// The one-electron field (cm⁻¹) at the ground state's Δ. Square planar is built from the
    /// angular overlap model with four equal σ donors on ±x, ±y, the others from Dq.
    pub fn field(&self) -> Result<LigandField> {
        self.field_at(self.delta.value)
    }

    /// The one-electron field (cm⁻¹) at a given Δ in the geometry's convention (square planar:
    /// the angular-overlap field with d–s mixing of [`LigandField::square_planar`]).
    pub fn field_at(&self, delta: f64) -> Result<LigandField> {
        self.geometry.field(delta / 10.0, 0.0, 0.0)
    }

    /// Point group whose labels are used.
    pub fn point_group(&self) -> PointGroup {
        self.geometry.point_group(0.0, 0.0)
    }

    /// The engine calculation for this complex (at the ground state's Δ).
    pub fn calculation(&self) -> Result<Calculation> {
        self.calculation_at(self.delta.value)
    }

    /// The engine calculation at a given Δ (cm⁻¹), e.g. one spin state's own Δ.
    pub fn calculation_at(&self, delta: f64) -> Result<Calculation> {
        Calculation::new(
            self.ion.dn,
            self.b.value,
            self.c.value,
            self.field_at(delta)?,
            self.point_group(),
        )
    }

    /// A formula such as "[Fe(NCS)2(py)4]" or "[CoCl4]2-" (ligands in the order given).
    pub fn formula(&self) -> String {
        let mut s = format!("[{}", self.ion.symbol);
        for b in &self.ligands {
            // A bare halide (the ligand is its own donor atom) needs no parentheses.
            if b.ligand.donors == [b.ligand.name.clone()] {
                s.push_str(&b.ligand.name);
            } else {
                s.push_str(&format!("({})", b.ligand.name));
            }
            if b.count > 1 {
                s.push_str(&b.count.to_string());
            }
        }
        s.push(']');
        match self.charge {
            0 => {}
            1 => s.push('+'),
            -1 => s.push('-'),
            q if q > 0 => s.push_str(&format!("{q}+")),
            q => s.push_str(&format!("{}-", -q)),
        }
        s
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    fn spec(metal: &str, ox: i32, geometry: &str, ligands: &[&str]) -> ComplexSpec {
        ComplexSpec {
            metal: metal.into(),
            oxidation_state: ox,
            geometry: geometry.parse().unwrap(),
            ligands: ligands.iter().map(|l| l.parse().unwrap()).collect(),
            overrides: Overrides::default(),
        }
    }

    fn resolve(metal: &str, ox: i32, geometry: &str, ligands: &[&str]) -> Result<ResolvedComplex> {
        spec(metal, ox, geometry, ligands).resolve(DataSet::bundled())
    }

    /// Worked examples of Jørgensen's rules with the tables of C. K. Jørgensen (1962, 1971, as
    /// reproduced) and B0 of W. L. Jolly, Modern Inorganic Chemistry (1989): [Cr(H2O)6]3+
    /// Δ = 1.00 × 17 400, β = 1 − 1.0 × 0.21 = 0.79, B = 0.79 × 918 = 725; [Cr(NH3)6]3+
    /// Δ = 21 750, β = 0.706, B = 648; [Ni(NH3)6]2+ Δ = 1.25 × 8 700 = 10 875, β = 0.832, B = 857;
    /// [Co(NH3)6]3+ Δ = 1.25 × 18 200 = 22 750, β = 0.51, B = 543.
    #[test]
    fn factor_rules_match_the_worked_examples() {
        for (m, ox, l, delta, beta, b) in [
            ("Cr", 3, "H2O:6", 17400.0, 0.79, 725.2),
            ("Cr", 3, "NH3:6", 21750.0, 0.706, 648.1),
            ("Ni", 2, "NH3:6", 10875.0, 0.832, 857.0),
            ("Co", 3, "NH3:6", 22750.0, 0.51, 543.2),
        ] {
            let c = resolve(m, ox, "oct", &[l]).unwrap();
            assert_abs_diff_eq!(c.delta.value, delta, epsilon = 1e-6);
            assert_abs_diff_eq!(c.beta.unwrap(), beta, epsilon = 1e-9);
            assert_abs_diff_eq!(c.b.value, b, epsilon = 0.1);
            assert_eq!(c.delta.origin, Origin::Estimated);
        }
    }

    /// Rule of average environment over donor atoms (common practice): [Ni(en)2(H2O)2]2+ has
    /// f̄ = (4 × 1.28 + 2 × 1.00)/6.
    /// π back-bonding is added to f̄ only for π acceptors on an ion below +3 (common practice):
    /// [Fe(CN)6]4− gets it, [Fe(H2O)6]2+ and [Co(CN)6]3− do not, and the flag agrees with the
    /// note that explains it.
    #[test]
    fn back_bonding_flag_follows_the_acceptors_and_the_charge() {
        for (m, ox, l, expected) in [
            ("Fe", 2, "CN:6", true),
            ("Fe", 2, "H2O:6", false),
            ("Co", 3, "CN:6", false),
        ] {
            let c = resolve(m, ox, "oct", &[l]).unwrap();
            assert_eq!(c.back_bonding, expected, "{m}({ox}) {l}");
            let noted = c.notes.iter().any(|n| n.starts_with("back-bonding"));
            assert_eq!(noted, expected, "{m}({ox}) {l}");
        }
    }

    #[test]
    fn average_environment_counts_donor_atoms() {
        let c = resolve("Ni", 2, "oct", &["en:2", "H2O:2"]).unwrap();
        let f = (4.0 * 1.28 + 2.0 * 1.00) / 6.0;
        assert_abs_diff_eq!(c.mean_f.unwrap(), f, epsilon = 1e-12);
        assert_abs_diff_eq!(c.delta.value, f * 8700.0, epsilon = 1e-9);
        let h = (4.0 * 1.5 + 2.0 * 1.0) / 6.0;
        assert_abs_diff_eq!(c.b.value, 1030.0 * (1.0 - h * 0.12), epsilon = 1e-9);
        assert_eq!(c.charge, 2);
    }

    /// Δt = (4/9) Δo for the same ligands (angular overlap model, Larsen & La Mar, J. Chem.
    /// Educ. 1974): [CoCl4]2− gives 4/9 × 0.78 × 9000.
    #[test]
    fn tetrahedral_is_four_ninths() {
        let c = resolve("Co", 2, "tet", &["Cl:4"]).unwrap();
        assert_abs_diff_eq!(c.delta.value, 4.0 / 9.0 * 0.78 * 9000.0, epsilon = 1e-9);
        assert_eq!(c.charge, -2);
        assert_eq!(c.formula(), "[CoCl4]2-");
    }

    /// The square-planar field: the angular overlap model of four σ donors on ±x, ±y (Larsen
    /// & La Mar 1974) with z² lowered by the d–s mixing e_ds; its x²−y² to xy gap is 10Dq = 3e_σ.
    #[test]
    fn square_planar_field_is_the_aom_with_d_s_mixing() {
        use nalgebra::Vector3;
        let c = resolve("Ni", 2, "sqpl", &["CN:4"]).unwrap();
        let e_sigma = c.delta.value / 3.0;
        let donors: Vec<(Vector3<f64>, f64, f64)> =
            [Vector3::x(), Vector3::y(), -Vector3::x(), -Vector3::y()]
                .into_iter()
                .map(|d| (d, e_sigma, 0.0))
                .collect();
        let mut aom = LigandField::angular_overlap(&donors).matrix;
        // Lower z² (real orbital index 0) by e_ds.
        aom[(0, 0)] -= crate::engine::field::DS_MIXING * e_sigma;
        let shift = aom.trace() / 5.0;
        for i in 0..5 {
            aom[(i, i)] -= shift;
        }
        let engine = c.field().unwrap();
        assert!((aom - engine.matrix).amax() < 1e-9 * c.delta.value);
        let mut e: Vec<f64> = engine
            .matrix
            .symmetric_eigen()
            .eigenvalues
            .iter()
            .copied()
            .collect();
        e.sort_by(f64::total_cmp);
        assert_abs_diff_eq!(e[4] - e[0], c.delta.value, epsilon = 1e-6);
    }

    #[test]
    fn overrides_replace_estimates_and_keep_them() {
        let mut s = spec("Fe", 2, "oct", &["H2O:6"]);
        s.overrides = Overrides {
            delta: Some(10400.0),
            b: Some(800.0),
            c: None,
        };
        let c = s.resolve(DataSet::bundled()).unwrap();
        assert_eq!(c.delta.origin, Origin::Given);
        assert_eq!(c.delta.value, 10400.0);
        assert_eq!(c.delta.estimate, Some(10400.0));
        assert_eq!(c.b.origin, Origin::Given);
        assert_abs_diff_eq!(c.b.estimate.unwrap(), 917.0 * 0.92, epsilon = 1e-9);
        // C follows the given B with the d6 Tanabe–Sugano ratio 4.8.
        assert_abs_diff_eq!(c.c.value, 4.8 * 800.0, epsilon = 1e-9);
        assert_eq!(c.c.origin, Origin::Estimated);
    }

    #[test]
    fn missing_h_takes_the_donor_mean() {
        let c = resolve("Fe", 2, "oct", &["NCS:2", "py:4"]).unwrap();
        assert!(c.ligands.iter().all(|b| b.h_defaulted));
        assert!(c.notes.iter().any(|n| n.contains("no published h for py")));
        let (h, _) = DataSet::bundled()
            .ligands()
            .unwrap()
            .mean_h_for_donor("N")
            .unwrap();
        assert_abs_diff_eq!(c.mean_h.unwrap(), h, epsilon = 1e-12);
    }

    #[test]
    fn bad_compositions_are_explained() {
        let e = resolve("Fe", 2, "oct", &["NCS:2", "py:6"])
            .unwrap_err()
            .to_string();
        assert!(
            e.contains("8 (2 NCS × 1 + 6 py × 1)") && e.contains("exactly 6"),
            "{e}"
        );
        let e = resolve("Ni", 2, "sqpl", &["tacn", "Cl"])
            .unwrap_err()
            .to_string();
        assert!(
            e.contains("tridentate in a sqpl complex") && e.contains("oct"),
            "{e}"
        );
        // A ligand in the table is never refused: CO has an f placed by the series.
        let co = resolve("Fe", 2, "oct", &["CO:6"]).unwrap();
        assert!(co
            .notes
            .iter()
            .any(|n| n.contains("placed by its position")));
        let e = resolve("Fe", 2, "tetragonal", &["H2O:6"])
            .unwrap_err()
            .to_string();
        assert!(e.contains("levels"), "{e}");
        assert!("py:0".parse::<LigandCount>().is_err());
        assert!("py:x".parse::<LigandCount>().is_err());
        assert_eq!("py".parse::<LigandCount>().unwrap().count, 1);
    }

    /// A ligand in the table is never refused: every ligand, in every geometry it binds in,
    /// filled up with water (or taken alone when it fills the geometry), resolves for Fe(II)
    /// and Ni(II).
    #[test]
    fn every_table_ligand_resolves() {
        let t = DataSet::bundled();
        let water = t.ligands().unwrap().find("H2O").unwrap().binds.clone();
        let mut checked = 0;
        for l in &t.ligands().unwrap().rows {
            for &g in &l.binds {
                let n = g.coordination_number();
                if l.denticity() > n || !water.contains(&g) {
                    continue;
                }
                let count = n / l.denticity();
                let rest = n - count * l.denticity();
                let mut ligands = vec![format!("{}:{count}", l.name)];
                if rest > 0 {
                    ligands.push(format!("H2O:{rest}"));
                }
                let refs: Vec<&str> = ligands.iter().map(String::as_str).collect();
                for (m, ox) in [("Fe", 2), ("Ni", 2)] {
                    let r = resolve(m, ox, g.name(), &refs);
                    assert!(r.is_ok(), "{m}({ox}) {g:?} {refs:?}: {:?}", r.err());
                    checked += 1;
                }
            }
        }
        assert!(checked >= 400, "{checked}");
    }

    #[test]
    fn one_electron_ions_need_no_b() {
        let c = resolve("Cu", 2, "oct", &["H2O:6"]).unwrap();
        assert_eq!(c.b.origin, Origin::Nominal);
        assert_abs_diff_eq!(c.delta.value, 12500.0, epsilon = 1e-9);
    }
}
