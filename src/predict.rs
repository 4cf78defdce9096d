//! Spin-state prediction for a resolved [`ResolvedComplex`]: which spin the ground state has, how far
//! the complex sits from the crossover, its ground term, moments and spin-allowed bands.
//!
//! The spin state compares the complex's Δ/B with the engine's crossover Δ/B for the same d^n,
//! geometry and C/B ([`crate::engine::crossover`]). The ground term, its free-ion parent and the
//! bands come from a full d^n calculation at the complex's own Δ, B and C.
//!
//! The comparison uses one geometry for both spin states. In a real complex the high-spin state
//! has longer metal–ligand bonds and a smaller Δ than the low-spin state (for Fe(II) about
//! 1.75 times smaller: A. Hauser, *Top. Curr. Chem.* 233, 49, 2004), so near the crossover the
//! prediction is a rough guide; the margin and its `borderline` flag say how rough.

use crate::complex::{Origin, ResolvedComplex};
use crate::engine::levels::L_LETTERS;
use crate::engine::{crossover, Crossover, Level, PointGroup, Spectrum};
use crate::error::{Error, Result};

/// Predicted ground-state spin.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SpinState {
    /// Below the crossover: the weak-field (high-spin) ground state.
    High,
    /// Above the crossover: the strong-field (low-spin) ground state.
    Low,
    /// The ground spin does not change with Δ for this d^n and geometry (up to the engine's
    /// search limit).
    Fixed,
}

impl SpinState {
    /// "high", "low" or "fixed".
    pub fn name(self) -> &'static str {
        match self {
            SpinState::High => "high",
            SpinState::Low => "low",
            SpinState::Fixed => "fixed",
        }
    }
}

/// Distance of the complex from the crossover.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Margin {
    /// Δ/B of the complex minus the crossover Δ/B (dimensionless; negative = high-spin side).
    pub delta_over_b: f64,
    /// The same difference in percent of the crossover Δ/B.
    pub percent: f64,
    /// Relative uncertainty assumed for the complex's Δ/B, in percent (see
    /// [`ResolvedComplex::delta_over_b_uncertainty`]).
    pub uncertainty_percent: f64,
    /// True when |Δ/B − crossover| is within that uncertainty: the spin state cannot be told
    /// from these parameters.
    pub borderline: bool,
}

/// One spin-allowed d–d transition.
#[derive(Debug, Clone, PartialEq)]
pub struct Band {
    /// Label of the upper level, e.g. "4T1g".
    pub to: String,
    /// Free-ion parent of the upper level, e.g. "4P".
    pub to_parent: String,
    /// Transition energy (cm⁻¹).
    pub energy: f64,
    /// Wavelength (nm) = 10⁷ / energy.
    pub wavelength_nm: f64,
}

/// The spin-allowed bands of one spin state, from its lowest level.
#[derive(Debug, Clone, PartialEq)]
pub struct SpinBands {
    /// Twice the spin.
    pub two_s: i32,
    /// Label of the lowest level of this spin, e.g. "5T2g".
    pub from: String,
    /// Energy of that level above the ground level (cm⁻¹); 0 when it is the ground level.
    pub from_energy: f64,
    pub bands: Vec<Band>,
}

/// Everything `predict` says about a complex.
#[derive(Debug, Clone, PartialEq)]
pub struct Prediction {
    pub complex: ResolvedComplex,
    pub crossover: Crossover,
    pub spin_state: SpinState,
    /// None for [`SpinState::Fixed`].
    pub margin: Option<Margin>,
    /// The ground level at the complex's parameters.
    pub ground: Level,
    /// Total spin S of the ground level.
    pub spin: f64,
    /// Unpaired electrons n = 2S.
    pub unpaired: usize,
    /// Spin-only moment √(n(n+2)) (μB).
    pub spin_only_moment: f64,
    /// Spin-plus-orbital moment of the free-ion parent term, √(4S(S+1) + L(L+1)) (μB).
    pub orbital_moment: f64,
    /// Whether the ground term carries first-order orbital angular momentum (T terms of O_h and
    /// T_d, E terms of D_4h): moments then lie above spin-only and depend on temperature.
    pub first_order_orbital: bool,
    /// Whether the ground term is an orbital doublet E of O_h or T_d (Jahn–Teller active).
    pub jahn_teller: bool,
    /// Bands of the high-spin (weak-field) state.
    pub bands_high_spin: SpinBands,
    /// Bands of the low-spin state; None when the spin cannot change.
    pub bands_low_spin: Option<SpinBands>,
    /// Explanations: the complex's estimate notes, then notes on the prediction.
    pub notes: Vec<String>,
}

/// Spin-only moment √(n(n+2)) in μB for n unpaired electrons (g = 2).
pub fn spin_only_moment(unpaired: usize) -> f64 {
    let n = unpaired as f64;
    (n * (n + 2.0)).sqrt()
}

/// Spin-plus-orbital moment √(4S(S+1) + L(L+1)) in μB (no quenching), for 2S and L.
pub fn spin_orbital_moment(two_s: i32, l: usize) -> f64 {
    let s = two_s as f64 / 2.0;
    let l = l as f64;
    (4.0 * s * (s + 1.0) + l * (l + 1.0)).sqrt()
}

/// L of a free-ion term symbol such as "5D".
pub fn term_l(term: &str) -> Option<usize> {
    let letter = term.chars().find(|c| c.is_ascii_alphabetic())?;
    L_LETTERS.iter().position(|&c| c == letter)
}

fn spin_bands(spectrum: &Spectrum, two_s: i32) -> Option<SpinBands> {
    let lowest = spectrum.lowest_of_spin(two_s)?;
    let bands = spectrum
        .levels
        .iter()
        .filter(|l| l.two_s == two_s && l.energy > lowest.energy + 1e-6)
        .map(|l| {
            let energy = l.energy - lowest.energy;
            Band {
                to: l.label(),
                to_parent: l.parent.clone(),
                energy,
                wavelength_nm: 1e7 / energy,
            }
        })
        .collect();
    Some(SpinBands {
        two_s,
        from: lowest.label(),
        from_energy: lowest.energy,
        bands,
    })
}

/// Predicts the spin state of a resolved complex.
pub fn predict(complex: &ResolvedComplex) -> Result<Prediction> {
    let dn = complex.ion.dn;
    let c_over_b = complex.c_over_b();
    let cross = crossover(dn, complex.geometry, c_over_b)?;
    let x = complex.delta_over_b();
    let mut notes = complex.notes.clone();
    let (spin_state, margin) = match cross.delta_over_b {
        None => {
            if x > cross.limit && complex.delta.origin != Origin::Nominal {
                notes.push(format!(
                    "Δ/B = {x:.1} lies above the searched range (Δ/B ≤ {}); no change of spin was found below it",
                    cross.limit
                ));
            }
            (SpinState::Fixed, None)
        }
        Some(xc) => {
            let u = complex.delta_over_b_uncertainty();
            let diff = x - xc;
            let state = if diff > 0.0 {
                SpinState::Low
            } else {
                SpinState::High
            };
            let margin = Margin {
                delta_over_b: diff,
                percent: 100.0 * diff / xc,
                uncertainty_percent: 100.0 * u,
                borderline: diff.abs() <= u * x,
            };
            if margin.borderline {
                notes.push(format!(
                    "borderline: Δ/B = {x:.1} is within the assumed ±{:.0} % of the crossover at {xc:.1}; both spin states are candidates (spin crossover possible for d4–d7)",
                    margin.uncertainty_percent
                ));
            }
            (state, Some(margin))
        }
    };
    let calc = complex.calculation()?;
    let spectrum = calc.levels()?;
    let ground = spectrum.ground().clone();
    let expected = match spin_state {
        SpinState::Low => cross.low_spin.as_ref().map(|g| g.two_s),
        _ => Some(cross.high_spin.two_s),
    };
    if expected.is_some_and(|s| s != ground.two_s) {
        notes.push(format!(
            "the ground level at these parameters ({}) has a spin other than the {} state's; the complex lies at the crossover",
            ground.label(),
            spin_state.name()
        ));
    }
    let l = term_l(&ground.parent).ok_or_else(|| {
        Error::Computation(format!(
            "parent term '{}' of the ground level has no L letter",
            ground.parent
        ))
    })?;
    let unpaired = ground.two_s as usize;
    let group = complex.point_group();
    let first_order_orbital = match group {
        PointGroup::Oh | PointGroup::Td => ground.irrep.starts_with('T'),
        PointGroup::D4h => ground.irrep.starts_with('E'),
        PointGroup::C1 => false,
    };
    let jahn_teller =
        matches!(group, PointGroup::Oh | PointGroup::Td) && ground.irrep.starts_with('E');
    if first_order_orbital {
        notes.push(format!(
            "the {} ground term carries first-order orbital angular momentum: expect a moment above spin-only that depends on temperature",
            ground.label()
        ));
    }
    if jahn_teller {
        notes.push(format!(
            "the {} ground term is an orbital doublet: Jahn–Teller active, so expect a distortion (for octahedra usually a tetragonal elongation) and split or broadened bands",
            ground.label()
        ));
    }
    let bands_high_spin = spin_bands(&spectrum, cross.high_spin.two_s).ok_or_else(|| {
        Error::Computation(format!(
            "no level with 2S = {} in the d{dn} spectrum",
            cross.high_spin.two_s
        ))
    })?;
    let bands_low_spin = match &cross.low_spin {
        Some(ls) => spin_bands(&spectrum, ls.two_s),
        None => None,
    };
    Ok(Prediction {
        complex: complex.clone(),
        crossover: cross,
        spin_state,
        margin,
        spin: ground.spin(),
        unpaired,
        spin_only_moment: spin_only_moment(unpaired),
        orbital_moment: spin_orbital_moment(ground.two_s, l),
        first_order_orbital,
        jahn_teller,
        ground,
        bands_high_spin,
        bands_low_spin,
        notes,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::complex::{ComplexSpec, Overrides};
    use crate::tables::Tables;
    use approx::assert_abs_diff_eq;

    fn run(metal: &str, ox: i32, geometry: &str, ligands: &[&str]) -> Prediction {
        let spec = ComplexSpec {
            metal: metal.into(),
            oxidation_state: ox,
            geometry: geometry.parse().unwrap(),
            ligands: ligands.iter().map(|l| l.parse().unwrap()).collect(),
            overrides: Overrides::default(),
        };
        predict(&spec.resolve(Tables::bundled().unwrap()).unwrap()).unwrap()
    }

    /// Spin-only moments √(n(n+2)) for n = 1…5: 1.732, 2.828, 3.873, 4.899, 5.916 μB
    /// (G. A. Bain, J. F. Berry, J. Chem. Educ. 2008, 85, 532, eq 3a).
    #[test]
    fn spin_only_moments() {
        for (n, mu) in [(1, 1.732), (2, 2.828), (3, 3.873), (4, 4.899), (5, 5.916)] {
            assert_abs_diff_eq!(spin_only_moment(n), mu, epsilon = 5e-4);
        }
        assert_eq!(spin_only_moment(0), 0.0);
    }

    /// μ(S+L) = √(4S(S+1) + L(L+1)): for Co2+ (4F, S = 3/2, L = 3) √27 = 5.20 μB and for Cr3+
    /// the same term; Fe2+ 5D gives √30 = 5.48 (common practice; the formula as in FACTS §3.1).
    #[test]
    fn spin_plus_orbital_moments() {
        assert_abs_diff_eq!(spin_orbital_moment(3, 3), 27f64.sqrt(), epsilon = 1e-12);
        assert_abs_diff_eq!(spin_orbital_moment(4, 2), 30f64.sqrt(), epsilon = 1e-12);
        assert_eq!(term_l("4F"), Some(3));
        assert_eq!(term_l("2I"), Some(6));
    }

    /// Ground terms on either side of the crossover (J. Pollock et al., J. Am. Chem. Soc. 2014,
    /// 136, 9453, Table 2): d6 5T2g / 1A1g.
    #[test]
    fn hexaaqua_iron_ii_is_high_spin_with_one_quintet_band() {
        let p = run("Fe", 2, "oct", &["H2O:6"]);
        assert_eq!(p.spin_state, SpinState::High);
        assert_eq!(p.ground.label(), "5T2g");
        assert_eq!(p.ground.parent, "5D");
        assert_eq!(p.unpaired, 4);
        assert!(p.first_order_orbital && !p.jahn_teller);
        // One spin-allowed band 5T2g → 5Eg at Δ (Lever 1984, from memory; d6 HS has one band).
        assert_eq!(p.bands_high_spin.bands.len(), 1);
        assert_abs_diff_eq!(p.bands_high_spin.bands[0].energy, 10400.0, epsilon = 1e-6);
        let ls = p.bands_low_spin.unwrap();
        assert_eq!(ls.from, "1A1g");
        assert!(!p.margin.unwrap().borderline);
    }

    /// The crossover Δ/B of d6 at C/B = 4.8 is 20.0 (full d^n diagonalisation, matching the
    /// commonly quoted Tanabe–Sugano value; Tanabe & Sugano 1954).
    #[test]
    fn margin_is_measured_from_the_crossover() {
        let p = run("Co", 3, "oct", &["NH3:6"]);
        assert_eq!(p.spin_state, SpinState::Low);
        let xc = p.crossover.delta_over_b.unwrap();
        assert_abs_diff_eq!(xc, 20.0, epsilon = 0.1);
        let m = p.margin.unwrap();
        assert_abs_diff_eq!(
            m.delta_over_b,
            p.complex.delta_over_b() - xc,
            epsilon = 1e-9
        );
        assert_abs_diff_eq!(m.percent, 100.0 * m.delta_over_b / xc, epsilon = 1e-9);
        assert_eq!(p.ground.label(), "1A1g");
        assert_eq!(p.unpaired, 0);
        // d6 LS: two singlet bands 1A1g → 1T1g, 1T2g (Lever 1984, from memory).
        let first: Vec<&str> = p.bands_low_spin.as_ref().unwrap().bands[..2]
            .iter()
            .map(|b| b.to.as_str())
            .collect();
        assert_eq!(first, ["1T1g", "1T2g"]);
    }

    /// d8 octahedral (3A2g) has one spin state only, and an E ground term (d9) is Jahn–Teller
    /// active (common textbook knowledge).
    #[test]
    fn fixed_states_and_jahn_teller() {
        let p = run("Ni", 2, "oct", &["H2O:6"]);
        assert_eq!(p.spin_state, SpinState::Fixed);
        assert!(p.margin.is_none() && p.bands_low_spin.is_none());
        assert_eq!(p.ground.label(), "3A2g");
        assert_eq!(p.bands_high_spin.bands.len(), 3);
        let p = run("Cu", 2, "oct", &["H2O:6"]);
        assert!(p.jahn_teller);
        assert_eq!(p.ground.label(), "2Eg");
    }

    #[test]
    fn wavelengths_are_reciprocal_energies() {
        let p = run("Cr", 3, "oct", &["H2O:6"]);
        for b in &p.bands_high_spin.bands {
            assert_abs_diff_eq!(b.wavelength_nm * b.energy, 1e7, epsilon = 1e-6);
        }
    }
}
