//! A complex described by its composition (metal, oxidation state, geometry, ligands) and the
//! ligand-field parameters estimated from it, or given by the user in their place.
//!
//! [`ComplexSpec`] is what a user types; [`ComplexSpec::resolve`] checks it against the data
//! tables and returns a [`ResolvedComplex`] whose Δ, B and C are each a [`Parameter`] that records the
//! estimate, the given value and which one is used. Commands that need a complex from its
//! composition (predict, moment comparison, screening) should all go through `resolve`.
//!
//! # The estimate
//! - **Δ.** Jørgensen's factor rule Δo = f·g (C. K. Jørgensen, *Absorption Spectra and Chemical
//!   Bonding in Complexes*, 1962; *Modern Aspects of Ligand Field Theory*, 1971). For a mixed
//!   ligand set the rule of average environment is applied per donor atom: f̄ = Σ nᵢ dᵢ fᵢ / Σ nᵢ dᵢ
//!   with nᵢ the number of ligands and dᵢ their denticity, so a bidentate ligand weighs twice.
//!   - `oct`: Δ = Δo = f̄·g.
//!   - `tet`: Δ = Δt = (4/9) f̄·g, the angular overlap ratio for the same ligands (Δt =
//!     (4/9)(3e_σ − 4e_π) against Δo = 3e_σ − 4e_π).
//!   - `sqpl`: Δ is the octahedral 10Dq = f̄·g of the same ligands, read as 3e_σ of a σ-only
//!     angular overlap model (e_π = 0, so e_σ = f̄·g/3 for every donor). The four donors on ±x, ±y
//!     then give x²−y² = 3e_σ, z² = e_σ and xz, yz, xy = 0 (C. E. Schäffer, C. K. Jørgensen,
//!     *Mol. Phys.* 1965; E. Larsen, G. N. La Mar, *J. Chem. Educ.* 1974), built with [`LigandField::angular_overlap`]. All donors get the averaged e_σ, so the
//!     field keeps its fourfold axis and D4h labels; cis/trans isomers are not told apart.
//! - **B.** B = B₀ β with β = 1 − h̄ k (Jørgensen), h̄ averaged over donor atoms like f̄. A ligand
//!   with no published h takes the mean h of the ligands in the table with the same (first) donor
//!   atom, or of all ligands if none shares it; an ion with no k keeps B = B₀ (β = 1, an upper
//!   bound on B, so Δ/B is then a lower bound). Each such default is reported in the notes.
//! - **C.** C = C₀ β (scaled by the same ratio as B). When the table has no C₀, C = r·B with r the
//!   C/B ratio of the Tanabe–Sugano diagram for that d^n (Y. Tanabe, S. Sugano, *J. Phys. Soc.
//!   Jpn.* 1954; values from memory).
//!
//! # Uncertainty assumed for the spin-state margin
//! The relative uncertainties are judged from how well the factor rules reproduce spectra
//! (Δo within about 3 % for the Cr(III), Ni(II) and Co(III) aqua and ammine ions, but 18 % off for
//! [Fe(H₂O)₆]²⁺ with Jørgensen's printed g; B within 0.5–15 %; see data/README.md):
//! - Δ estimated: 10 %; 25 % when a (strong) π-acceptor ligand is bound to an ion in oxidation
//!   state ≤ 2, where f·g is known to underestimate Δ; 50 % for square planar, where the σ-only
//!   model built from octahedral data leaves out d–s mixing and the shorter planar bonds.
//!   Δ given: 5 % (reading a broad d–d band maximum).
//! - B estimated: 10 %; 15 % when an h or k had to be defaulted; 25 % for 4d/5d ions, whose B₀
//!   is an assumed value. B given: 5 %.

use crate::engine::{Calculation, Geometry, LigandField, PointGroup};
use crate::error::{Error, Result};
use crate::tables::{Ion, Ligand, PiRole, Tables, TransitionSeries};
use nalgebra::Vector3;
use std::str::FromStr;

/// One ligand of a complex and how many of it are bound, parsed from `NAME[:COUNT]`.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct LigandCount {
    /// Name or alias as in ligands.csv.
    pub name: String,
    /// Number of ligands (not donor atoms), ≥ 1.
    pub count: usize,
}

impl FromStr for LigandCount {
    type Err = Error;

    /// `NAME` (one ligand) or `NAME:COUNT`, e.g. `py:4`.
    fn from_str(s: &str) -> Result<Self> {
        let (name, count) = match s.rsplit_once(':') {
            Some((n, c)) => {
                let count: usize = c.trim().parse().map_err(|_| {
                    Error::invalid(
                        "ligand count",
                        format!("'{c}' in '{s}'"),
                        "a whole number ≥ 1 after the colon, as in py:4",
                    )
                })?;
                (n.trim(), count)
            }
            None => (s.trim(), 1),
        };
        if name.is_empty() {
            return Err(Error::invalid(
                "ligand",
                format!("'{s}'"),
                "NAME or NAME:COUNT, as in NCS:2",
            ));
        }
        if count == 0 {
            return Err(Error::invalid(
                "ligand count",
                format!("0 in '{s}'"),
                "a whole number ≥ 1",
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

/// C/B ratios of the Tanabe–Sugano diagrams for d² … d⁸ (Y. Tanabe, S. Sugano, *J. Phys. Soc.
/// Jpn.* 9, 753 and 766, 1954; the ratios printed on the usual reproductions, from memory).
pub const TANABE_SUGANO_C_OVER_B: [(usize, f64); 7] = [
    (2, 4.42),
    (3, 4.50),
    (4, 4.61),
    (5, 4.477),
    (6, 4.8),
    (7, 4.633),
    (8, 4.709),
];

/// C/B used when the table has no C₀: the Tanabe–Sugano ratio of d^n, or 4.5 (inside their
/// 4.42–4.8 range) for d⁰, d¹, d⁹, d¹⁰ where C does not enter any energy difference.
pub fn default_c_over_b(dn: usize) -> f64 {
    TANABE_SUGANO_C_OVER_B
        .iter()
        .find(|(n, _)| *n == dn)
        .map_or(4.5, |(_, r)| *r)
}

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
    /// Donor-averaged Jørgensen f, when every ligand has one.
    pub mean_f: Option<f64>,
    /// Donor-averaged Jørgensen h (with defaults for missing h).
    pub mean_h: Option<f64>,
    /// Nephelauxetic ratio β = 1 − h̄k used for the estimate (1 when k is unknown).
    pub beta: Option<f64>,
    /// Ligand-field splitting in the geometry's convention (cm⁻¹): Δo (oct), Δt (tet), or the
    /// octahedral 10Dq of the same ligands (sqpl).
    pub delta: Parameter,
    /// Racah B (cm⁻¹).
    pub b: Parameter,
    /// Racah C (cm⁻¹).
    pub c: Parameter,
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
    pub fn resolve(&self, tables: &Tables) -> Result<ResolvedComplex> {
        let ion = tables.ions.find(&self.metal, self.oxidation_state)?.clone();
        let geometry = self.geometry;
        if geometry == Geometry::Tetragonal {
            return Err(Error::invalid(
                "geometry",
                "tetragonal",
                "oct, tet or sqpl (a tetragonal field needs Ds and Dt: use `spinstate levels`)",
            ));
        }
        if self.ligands.is_empty() {
            return Err(Error::invalid(
                "ligands",
                "none",
                "at least one ligand as NAME[:COUNT], e.g. H2O:6",
            ));
        }
        let mut bound: Vec<BoundLigand> = Vec::new();
        for lc in &self.ligands {
            let ligand = tables.ligands.find(&lc.name)?;
            if !ligand.binds.contains(&geometry) {
                let can: Vec<&str> = ligand.binds.iter().map(|g| g.name()).collect();
                return Err(Error::invalid(
                    format!("ligand {}", ligand.name),
                    format!(
                        "{} in a {} complex",
                        denticity_word(ligand),
                        geometry.name()
                    ),
                    format!("a geometry it can bind in: {}", can.join(", ")),
                ));
            }
            match bound.iter_mut().find(|b| b.ligand.name == ligand.name) {
                Some(b) => b.count += lc.count,
                None => bound.push(BoundLigand {
                    ligand: ligand.clone(),
                    count: lc.count,
                    h_used: None,
                    h_defaulted: false,
                }),
            }
        }
        let donor_count: usize = bound.iter().map(|b| b.count * b.ligand.denticity()).sum();
        let needed = geometry.coordination_number();
        if donor_count != needed {
            let parts: Vec<String> = bound
                .iter()
                .map(|b| format!("{} {} × {}", b.count, b.ligand.name, b.ligand.denticity()))
                .collect();
            return Err(Error::invalid(
                "donor-atom count",
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

        // Δ
        for (name, v) in [
            ("--delta", self.overrides.delta),
            ("--b", self.overrides.b),
            ("--c", self.overrides.c),
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
        let missing_f: Vec<&str> = bound
            .iter()
            .filter(|b| b.ligand.f.is_none())
            .map(|b| b.ligand.name.as_str())
            .collect();
        let mean_f = missing_f
            .is_empty()
            .then(|| per_donor(&bound, |b| b.ligand.f.unwrap_or(0.0)));
        let delta_o = match (mean_f, ion.g) {
            (Some(f), Some(g)) => Some(f * g),
            _ => None,
        };
        let delta_estimate = delta_o.map(|d| match geometry {
            Geometry::Tetrahedral => 4.0 / 9.0 * d,
            _ => d,
        });
        let low_valent_acceptor =
            ion.oxidation_state <= 2 && bound.iter().any(|b| b.ligand.pi == PiRole::Acceptor);
        let delta_uncertainty = if geometry == Geometry::SquarePlanar {
            0.5
        } else if low_valent_acceptor {
            0.25
        } else {
            0.10
        };
        let delta = match Parameter::choose(delta_estimate, self.overrides.delta, delta_uncertainty)
        {
            Some(p) => p,
            None if ion.dn == 0 || ion.dn == 10 => Parameter::nominal(0.0),
            None => {
                let why = if !missing_f.is_empty() {
                    format!("no Jørgensen f for {} in ligands.csv", missing_f.join(", "))
                } else {
                    format!("no Jørgensen g for {} in ions.csv", ion.name())
                };
                return Err(Error::invalid(
                    "Δ",
                    format!("unknown ({why})"),
                    "a measured value: give --delta in cm⁻¹ (e.g. from a band fit)",
                ));
            }
        };
        if low_valent_acceptor && delta.origin == Origin::Estimated {
            let acceptors: Vec<&str> = bound
                .iter()
                .filter(|b| b.ligand.pi == PiRole::Acceptor)
                .map(|b| b.ligand.name.as_str())
                .collect();
            notes.push(format!(
                "f·g is known to underestimate Δ for π-acceptor ligands ({}) on ions in oxidation state ≤ 2: the real Δ is likely larger and a low-spin state more likely than predicted; give --delta from a spectrum",
                acceptors.join(", ")
            ));
        }

        if geometry == Geometry::SquarePlanar && delta.origin == Origin::Estimated {
            notes.push(
                "square planar: Δ is the octahedral f·g of the same ligands in a σ-only angular overlap model; this underestimates the planar splitting (planar bonds are shorter and d–s mixing lowers z², both left out), so the estimate leans to high spin; planar d8 complexes are low-spin in practice (a high-spin four-coordinate d8 ion usually goes tetrahedral); give --delta from a spectrum"
                    .to_string(),
            );
        }

        // B and C
        let mut h_defaulted = false;
        for b in &mut bound {
            match b.ligand.h {
                Some(h) => b.h_used = Some(h),
                None => {
                    let donor = b.ligand.donors.first().map(String::as_str).unwrap_or("");
                    let (h, names, what) = match tables.ligands.mean_h_for_donor(donor) {
                        Some((h, names)) => (h, names, format!("{donor}-donor ligands")),
                        None => match tables.ligands.mean_h() {
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
        let beta = match (ion.k, mean_h) {
            (Some(k), Some(h)) => Some(1.0 - h * k),
            (None, _) => {
                if ion.b0.is_some() && self.overrides.b.is_none() && !one_electron(ion.dn) {
                    notes.push(format!(
                        "no Jørgensen k for {}: B is taken as the free-ion B0 (β = 1, an upper bound on B), so Δ/B is a lower bound",
                        ion.name()
                    ));
                }
                Some(1.0)
            }
            (Some(_), None) => None,
        };
        if let Some(beta) = beta {
            if beta <= 0.0 {
                return Err(Error::invalid(
                    "β = 1 − h·k",
                    format!("{beta:.3} (h̄ = {:.2}, k = {:.2})", mean_h.unwrap_or(0.0), ion.k.unwrap_or(0.0)),
                    "a ratio above 0; the factor rule fails for this ion and ligand set, so give a measured --b in cm⁻¹",
                ));
            }
        }
        let b_estimate = match (ion.b0, beta) {
            (Some(b0), Some(beta)) => Some(b0 * beta),
            _ => None,
        };
        let b_uncertainty = if ion.series != TransitionSeries::ThreeD {
            0.25
        } else if h_defaulted || ion.k.is_none() {
            0.15
        } else {
            0.10
        };
        let b = match Parameter::choose(b_estimate, self.overrides.b, b_uncertainty) {
            Some(p) => p,
            None if one_electron(ion.dn) || ion.dn == 0 || ion.dn == 10 => {
                Parameter::nominal(NOMINAL_B)
            }
            None => {
                return Err(Error::invalid(
                    "B",
                    format!("unknown (no free-ion B0 for {} in ions.csv)", ion.name()),
                    "a measured value: give --b in cm⁻¹ (and --c, or C/B is taken from the Tanabe–Sugano ratio)",
                ))
            }
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
                        default_c_over_b(ion.dn),
                        ion.dn
                    ));
                }
                default_c_over_b(ion.dn)
            }
        };
        let c_estimate = (b.origin != Origin::Nominal).then_some(c_over_b * b.value);
        let c = Parameter::choose(c_estimate, self.overrides.c, b.relative_uncertainty)
            .unwrap_or_else(|| Parameter::nominal(c_over_b * NOMINAL_B));

        if ion.series != TransitionSeries::ThreeD {
            notes.push(format!(
                "{} ions are low-spin in practice: Δ is about 1.4–1.5 times larger for 4d than for 3d ions of the same charge and about 1.2 times larger again for 5d, while B is smaller (more diffuse d orbitals); the free-ion B0 of {} in ions.csv is an assumed typical value",
                ion.series.name(),
                ion.name()
            ));
        }

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
            mean_f,
            mean_h,
            beta,
            delta,
            b,
            c,
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

    /// The one-electron field (cm⁻¹). Square planar is built from the angular overlap model with
    /// four equal σ donors on ±x, ±y (see the module docs), the others from Dq.
    pub fn field(&self) -> Result<LigandField> {
        match self.geometry {
            Geometry::SquarePlanar => {
                let e_sigma = self.delta.value / 3.0;
                let donors: Vec<(Vector3<f64>, f64, f64)> =
                    [Vector3::x(), Vector3::y(), -Vector3::x(), -Vector3::y()]
                        .into_iter()
                        .map(|d| (d, e_sigma, 0.0))
                        .collect();
                Ok(LigandField::angular_overlap(&donors).barycentred())
            }
            g => g.field(self.dq(), 0.0, 0.0),
        }
    }

    /// Point group whose labels are used.
    pub fn point_group(&self) -> PointGroup {
        self.geometry.point_group(0.0, 0.0)
    }

    /// The engine calculation for this complex.
    pub fn calculation(&self) -> Result<Calculation> {
        Calculation::new(
            self.ion.dn,
            self.b.value,
            self.c.value,
            self.field()?,
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
        spec(metal, ox, geometry, ligands).resolve(Tables::bundled().unwrap())
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

    /// The square-planar AOM field equals the engine's σ-only square-planar field for the same
    /// octahedral Dq, and its x²−y² to xy gap is 10Dq = 3e_σ (Larsen & La Mar 1974).
    #[test]
    fn square_planar_field_is_the_sigma_only_aom() {
        let c = resolve("Ni", 2, "sqpl", &["CN:4"]).unwrap();
        let aom = c.field().unwrap();
        let engine = Geometry::SquarePlanar.field(c.dq(), 0.0, 0.0).unwrap();
        assert!((aom.matrix - engine.matrix).amax() < 1e-9 * c.delta.value);
        let mut e: Vec<f64> = aom
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
        let c = s.resolve(Tables::bundled().unwrap()).unwrap();
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
        let (h, _) = Tables::bundled()
            .unwrap()
            .ligands
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
        let e = resolve("Fe", 2, "oct", &["CO:6"]).unwrap_err().to_string();
        assert!(
            e.contains("no Jørgensen f for CO") && e.contains("--delta"),
            "{e}"
        );
        let e = resolve("Mn", 4, "oct", &["F:6"]).unwrap_err().to_string();
        assert!(e.contains("no free-ion B0") && e.contains("--b"), "{e}");
        let e = resolve("Fe", 2, "tetragonal", &["H2O:6"])
            .unwrap_err()
            .to_string();
        assert!(e.contains("levels"), "{e}");
        assert!("py:0".parse::<LigandCount>().is_err());
        assert!("py:x".parse::<LigandCount>().is_err());
        assert_eq!("py".parse::<LigandCount>().unwrap().count, 1);
    }

    #[test]
    fn one_electron_ions_need_no_b() {
        let c = resolve("Cu", 2, "oct", &["H2O:6"]).unwrap();
        assert_eq!(c.b.origin, Origin::Nominal);
        assert_abs_diff_eq!(c.delta.value, 12500.0, epsilon = 1e-9);
    }
}
