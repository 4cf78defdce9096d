//! Spin-state prediction for a resolved [`ResolvedComplex`]: which spin the ground state has, how far
//! the complex sits from the crossover, its ground term, moments and spin-allowed bands.
//!
//! The spin state is the estimator's ([`crate::estimate`]): each spin state has its own Δ at its
//! own bond length, and the energy gap E_HS − E_LS between them comes from the engine's exact
//! crossover and slope for the same d^n, geometry and C/B. The margin is the mean field Δ̄/B
//! minus the crossover Δ/B. The ground term and its parent come from a full d^n calculation at
//! the ground state's Δ; the bands of each spin state from a calculation at that state's Δ.

use crate::complex::ResolvedComplex;
use crate::engine::{Crossover, Level, PointGroup, Species, Spectrum, Term};
use crate::error::{Error, Result};
use crate::magnetism::{MagneticModel, ZeemanLevels};
use crate::units::{spin_only_moment, spin_orbital_moment};

pub use crate::estimate::SpinState;

/// Distance of the complex from the crossover.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Margin {
    /// Mean field Δ̄/B of the two spin states minus the crossover Δ/B (dimensionless; negative =
    /// high-spin side).
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
    /// Free-ion parent of the upper level, e.g. 4P (None when it could not be labelled).
    pub to_parent: Option<Term>,
    /// Transition energy (cm⁻¹).
    pub energy: f64,
    /// Wavelength (nm) = 10⁷ / energy.
    pub wavelength_nm: f64,
    /// Expected intensity class and typical ε ([`crate::spectra::transitions::intensity`]).
    pub intensity: crate::spectra::transitions::Intensity,
    /// One- or two-electron jump in the strong-field picture, its one-electron fraction at this
    /// field and whether that makes it weak ([`crate::spectra::transitions::jumps`]); None
    /// when the analysis was not asked for ([`PredictOptions::band_analysis`]).
    pub jump: Option<crate::spectra::transitions::Jump>,
    /// Above the charge-transfer onset ([`PredictOptions::charge_transfer_onset`]): likely
    /// hidden under charge-transfer absorption.
    pub may_be_hidden: bool,
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
    /// Δ at which these bands were computed (cm⁻¹): this spin state's own Δ.
    pub delta: f64,
    /// Bands above the window that were left out (0 with `all`).
    pub omitted: usize,
}

/// Default upper end of the band list (cm⁻¹): the usual UV-Vis-NIR range; `--all` lifts it.
pub const BAND_WINDOW: f64 = 50_000.0;

/// Options of a prediction.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PredictOptions {
    /// List bands up to this energy (cm⁻¹); `f64::INFINITY` for all.
    pub band_limit: f64,
    /// Compute the 300 K moment with spin–orbit coupling (one more diagonalisation; `check`
    /// does without, since it computes the moments of both states itself).
    pub moment_300k: bool,
    /// Label each band with its strong-field jump and one-electron fraction (a few more
    /// diagonalisations; `check` does without).
    pub band_analysis: bool,
    /// Charge-transfer onset (cm⁻¹) above which bands are flagged as likely hidden; None uses
    /// [`crate::spectra::count::CHARGE_TRANSFER_ONSET`].
    pub charge_transfer_onset: Option<f64>,
}

impl Default for PredictOptions {
    fn default() -> Self {
        PredictOptions {
            band_limit: BAND_WINDOW,
            moment_300k: true,
            band_analysis: true,
            charge_transfer_onset: None,
        }
    }
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
    /// Spin-plus-orbital moment of the free-ion parent term, √(4S(S+1) + L(L+1)) (μB): the
    /// upper limit of an unquenched orbital moment; only for ground terms with first-order
    /// orbital angular momentum (T terms in O_h/T_d, E in D_4h), None otherwise.
    pub orbital_moment: Option<f64>,
    /// μ_eff at 300 K (μB) from the full ligand field with spin–orbit coupling (van Vleck, κ = 1)
    /// at the ground state's Δ; None when ζ is unknown.
    pub moment_300k: Option<f64>,
    /// E_HS − E_LS (cm⁻¹), each state at its own geometry; None when the spin cannot change.
    pub energy_gap: Option<f64>,
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

fn spin_bands(
    calc: &crate::engine::Calculation,
    spectrum: &Spectrum,
    two_s: i32,
    delta: f64,
    options: &PredictOptions,
    geometry: crate::engine::Geometry,
) -> Result<Option<SpinBands>> {
    use crate::spectra::transitions::{jumps, manifold, TransitionKey};
    let Some(lowest) = spectrum.lowest_of_spin(two_s) else {
        return Ok(None);
    };
    let all: Vec<&Level> = spectrum
        .levels
        .iter()
        .filter(|l| l.two_s == two_s && l.energy > lowest.energy + 1e-6)
        .collect();
    let analysed: Vec<(TransitionKey, crate::spectra::transitions::Jump)> =
        match (options.band_analysis, manifold(spectrum, two_s)) {
            (true, Some(m)) => {
                let j = jumps(calc, geometry, spectrum, &m)?;
                m.transitions.iter().map(|t| t.key.clone()).zip(j).collect()
            }
            _ => Vec::new(),
        };
    let onset = options
        .charge_transfer_onset
        .unwrap_or(crate::spectra::count::CHARGE_TRANSFER_ONSET);
    let bands: Vec<Band> = all
        .iter()
        .filter(|l| l.energy - lowest.energy <= options.band_limit)
        .map(|l| {
            let energy = l.energy - lowest.energy;
            let key = TransitionKey::of(l);
            let jump = analysed.iter().find(|(k, _)| *k == key).map(|(_, j)| *j);
            let weak = jump.is_some_and(|j| j.weak);
            Band {
                to: l.label(),
                to_parent: l.parent,
                energy,
                wavelength_nm: 1e7 / energy,
                intensity: crate::spectra::transitions::intensity(geometry, true, weak),
                jump,
                may_be_hidden: energy > onset,
            }
        })
        .collect();
    Ok(Some(SpinBands {
        two_s,
        from: lowest.label(),
        from_energy: lowest.energy,
        omitted: all.len() - bands.len(),
        bands,
        delta,
    }))
}

/// Predicts the spin state of a resolved complex (bands up to [`BAND_WINDOW`]).
pub fn predict(complex: &ResolvedComplex) -> Result<Prediction> {
    predict_with(complex, PredictOptions::default())
}

/// Predicts the spin state of a resolved complex with options.
pub fn predict_with(complex: &ResolvedComplex, options: PredictOptions) -> Result<Prediction> {
    let dn = complex.ion.dn;
    let cross = complex.crossover.clone();
    let mut notes = complex.notes.clone();
    let (spin_state, margin, energy_gap) = match (&complex.spin_choice, cross.delta_over_b) {
        (Some(choice), Some(xc)) => {
            let x = choice.delta_over_b_mean;
            let u = complex.delta_over_b_uncertainty();
            let diff = x - xc;
            let margin = Margin {
                delta_over_b: diff,
                percent: 100.0 * diff / xc,
                uncertainty_percent: 100.0 * u,
                borderline: diff.abs() <= u * x,
            };
            notes.push(format!(
                "E_HS − E_LS = {:.0} cm⁻¹ with each state at its own Δ (high-spin below 0; spin crossover between 0 and the thermal window {:.0} cm⁻¹; low-spin above)",
                choice.energy_gap, choice.window
            ));
            if margin.borderline {
                notes.push(format!(
                    "borderline: Δ̄/B = {x:.1} is within the assumed ±{:.0} % of the crossover at {xc:.1}; both spin states are candidates",
                    margin.uncertainty_percent
                ));
            }
            (choice.state, Some(margin), Some(choice.energy_gap))
        }
        _ => {
            // No note for fields above `cross.limit`: the ground spin cannot change there.
            (SpinState::Fixed, None, None)
        }
    };
    if spin_state == SpinState::Crossover {
        notes.push(
            "spin crossover expected: the low-spin state is the ground state at low temperature and the high-spin state lies within thermal reach; where T½ falls cannot be told from a composition alone"
                .to_string(),
        );
    }
    let calc = complex.calculation()?;
    let spectrum = calc.levels()?;
    // The ground level: the high-spin state's lowest level when the verdict is high spin (the
    // verdict weighs each state at its own geometry, which a single field cannot show), the
    // engine's ground at the ground state's Δ otherwise.
    let engine_ground = spectrum.ground().clone();
    let decided = crate::estimate::verdict_two_s(spin_state, &cross, engine_ground.two_s);
    let ground = spectrum
        .lowest_of_spin(decided)
        .cloned()
        .unwrap_or_else(|| engine_ground.clone());
    if ground.two_s != engine_ground.two_s {
        notes.push(format!(
            "at this Δ a single-geometry calculation puts {} lowest: the {} verdict comes from comparing each state at its own bond length (with the Jahn–Teller term)",
            engine_ground.label(),
            spin_state.name()
        ));
    } else if let (SpinState::Low | SpinState::Crossover, Some(ls)) = (spin_state, &cross.low_spin)
    {
        if ls.two_s > ground.two_s {
            notes.push(format!(
                "the low-spin state's own field lies beyond a further change of spin: its ground level is {} (2S+1 = {}), not the {} found at the first crossover",
                ground.label(),
                ground.two_s + 1,
                ls.term
            ));
        }
    }
    let l = ground.parent.map(|t| t.l).ok_or_else(|| {
        Error::Computation(format!(
            "parent term '{}' of the ground level has no L letter",
            Term::text_of(ground.parent)
        ))
    })?;
    let unpaired = ground.two_s as usize;
    let group = complex.point_group();
    let first_order_orbital = match group {
        PointGroup::Oh | PointGroup::Td => ground.irrep.species().is_some_and(Species::is_triplet),
        PointGroup::D4h => ground.irrep.is(Species::E),
        PointGroup::C1 => false,
    };
    let jahn_teller =
        matches!(group, PointGroup::Oh | PointGroup::Td) && ground.irrep.is(Species::E);
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
    let moment_300k = match complex.ion.zeta {
        _ if !options.moment_300k => None,
        Some(zeta) if dn > 0 && dn < 10 => {
            let z = ZeemanLevels::compute_up_to(&calc, &MagneticModel::new(zeta), 300.0)?;
            Some(z.at(300.0)?.mu_eff)
        }
        _ if dn == 0 || dn == 10 => Some(0.0),
        _ => {
            notes.push(format!(
                "no ζ for {} in ions.csv: the 300 K moment with spin–orbit coupling is not computed",
                complex.ion.name()
            ));
            None
        }
    };
    let hs_delta = complex.delta_high_spin.value;
    let hs_calc = complex.calculation_at(hs_delta)?;
    let hs_spectrum = if (hs_delta - complex.delta.value).abs() < 1e-9 {
        spectrum.clone()
    } else {
        hs_calc.levels()?
    };
    let bands_high_spin = spin_bands(
        &hs_calc,
        &hs_spectrum,
        cross.high_spin.two_s,
        hs_delta,
        &options,
        complex.geometry,
    )?
    .ok_or_else(|| {
        Error::Computation(format!(
            "no level with 2S = {} in the d{dn} spectrum",
            cross.high_spin.two_s
        ))
    })?;
    let bands_low_spin = match &cross.low_spin {
        Some(ls) => {
            let ls_delta = complex.delta_low_spin.value;
            let ls_calc = complex.calculation_at(ls_delta)?;
            let ls_spectrum = if (ls_delta - complex.delta.value).abs() < 1e-9 {
                spectrum
            } else {
                ls_calc.levels()?
            };
            spin_bands(
                &ls_calc,
                &ls_spectrum,
                ls.two_s,
                ls_delta,
                &options,
                complex.geometry,
            )?
        }
        None => None,
    };
    Ok(Prediction {
        complex: complex.clone(),
        crossover: cross,
        spin_state,
        margin,
        spin: ground.spin(),
        unpaired,
        spin_only_moment: spin_only_moment(unpaired as f64),
        orbital_moment: first_order_orbital.then(|| spin_orbital_moment(ground.two_s, l)),
        moment_300k,
        energy_gap,
        first_order_orbital,
        jahn_teller,
        ground,
        bands_high_spin,
        bands_low_spin,
        notes,
    })
}

/// The computed moment of the predicted spin state over temperature.
#[derive(Debug, Clone, PartialEq)]
pub struct MomentCurve {
    /// Twice the spin of the state.
    pub two_s: i32,
    /// Δ of the calculation (cm⁻¹): that spin state's own Δ.
    pub delta: f64,
    /// ζ of the calculation (cm⁻¹): the ion table's free-ion value.
    pub zeta: f64,
    pub points: Vec<crate::magnetism::SusceptibilityPoint>,
}

/// χ_M·T and μ_eff of the predicted ground spin state at `temperatures` (K): the van Vleck sum
/// over the full d^n levels with spin–orbit coupling ([`ZeemanLevels`]) at that state's own Δ,
/// with the ion's free-ion ζ and κ = 1. None for d⁰ and d¹⁰, for an ion without ζ in the table,
/// and where a single field at that Δ puts another spin lowest (the curve would then describe
/// the other state).
pub fn moment_curve(p: &Prediction, temperatures: &[f64]) -> Result<Option<MomentCurve>> {
    let c = &p.complex;
    let dn = c.ion.dn;
    let Some(zeta) = c.ion.zeta.filter(|_| dn > 0 && dn < 10) else {
        return Ok(None);
    };
    let two_s = p.ground.two_s;
    let delta = match &p.crossover.low_spin {
        Some(ls) if ls.two_s == two_s => c.delta_low_spin.value,
        _ if p.crossover.high_spin.two_s == two_s => c.delta_high_spin.value,
        _ => c.delta.value,
    };
    let calc = c.calculation_at(delta)?;
    if calc.levels()?.ground().two_s != two_s {
        return Ok(None);
    }
    let z = ZeemanLevels::compute(&calc, &MagneticModel::new(zeta))?;
    Ok(Some(MomentCurve {
        two_s,
        delta,
        zeta,
        points: z.curve(temperatures)?,
    }))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::complex::{ComplexSpec, Overrides};
    use crate::tables::DataSet;
    use approx::assert_abs_diff_eq;

    fn run(metal: &str, ox: i32, geometry: &str, ligands: &[&str]) -> Prediction {
        let spec = ComplexSpec {
            metal: metal.into(),
            oxidation_state: ox,
            geometry: geometry.parse().unwrap(),
            ligands: ligands.iter().map(|l| l.parse().unwrap()).collect(),
            overrides: Overrides::default(),
        };
        predict(&spec.resolve(DataSet::bundled()).unwrap()).unwrap()
    }

    /// Ground terms on either side of the crossover (J. Pollock et al., J. Am. Chem. Soc. 2014,
    /// 136, 9453, Table 2): d6 5T2g / 1A1g.
    #[test]
    fn hexaaqua_iron_ii_is_high_spin_with_one_quintet_band() {
        let p = run("Fe", 2, "oct", &["H2O:6"]);
        assert_eq!(p.spin_state, SpinState::High);
        assert_eq!(p.ground.label(), "5T2g");
        assert_eq!(p.ground.parent, Some(Term::new(4, 2)));
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
        let mean = p.complex.spin_choice.unwrap().delta_over_b_mean;
        assert_abs_diff_eq!(m.delta_over_b, mean - xc, epsilon = 1e-9);
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
