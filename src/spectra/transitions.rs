//! Spin states of a d^n complex and the spin-allowed transitions of each, identified so that a
//! given transition can be followed as the field changes.
//!
//! A transition is named by its upper level's (2S, irrep, index) — index counting levels of the
//! same spin and irrep from the lowest. Levels of one spin and irrep never cross as the field is
//! scaled (non-crossing rule), so this key follows one physical level across field strengths
//! while the energy order of different keys may change.

use crate::engine::{Calculation, Geometry, Irrep, Level, LigandField, Spectrum, Term};
use crate::error::{Error, Result};
use crate::param::Param;

/// Source text for the Tanabe–Sugano C/B ratios of [`crate::engine::tanabe_sugano_c_over_b`]
/// (Y. Tanabe, S. Sugano, J. Phys. Soc. Jpn. 1954, from memory [M]).
pub const TANABE_SUGANO_SOURCE: &str =
    "Tanabe & Sugano, J. Phys. Soc. Jpn. 1954, 9, 753 and 766 (ratios of the original diagrams; from memory)";

/// The default C/B for d^n: the Tanabe–Sugano ratio for d²–d⁸ with its source, or 4.5 without a
/// source for d⁰, d¹, d⁹ and d¹⁰, whose levels do not depend on C (one free-ion term, or none).
pub fn default_c_over_b(dn: usize) -> (f64, Option<&'static str>) {
    let source = crate::engine::crossover::tanabe_sugano_ratio(dn).map(|_| TANABE_SUGANO_SOURCE);
    (crate::engine::tanabe_sugano_c_over_b(dn), source)
}

/// Where a spin state sits among the ground states the field can produce. A property of the
/// state, not a prediction: the predicted verdict (high, crossover, low, fixed) is
/// [`crate::estimate::SpinState`].
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SpinKind {
    /// The only spin of the ground state at any field strength (e.g. octahedral d³).
    Only,
    /// Ground state in a weak field (Hund's rule).
    High,
    /// Ground state between the weak- and strong-field ones.
    Intermediate,
    /// Ground state in a strong field.
    Low,
}

impl SpinKind {
    /// "high spin", "low spin", "intermediate spin" or "only spin state".
    pub fn phrase(self) -> &'static str {
        match self {
            SpinKind::Only => "only spin state",
            SpinKind::High => "high spin",
            SpinKind::Intermediate => "intermediate spin",
            SpinKind::Low => "low spin",
        }
    }

    /// "high-spin", "low-spin", "intermediate-spin" or "only", as in "the high-spin state".
    pub fn adjective(self) -> &'static str {
        match self {
            SpinKind::Only => "only",
            SpinKind::High => "high-spin",
            SpinKind::Intermediate => "intermediate-spin",
            SpinKind::Low => "low-spin",
        }
    }
}

/// A possible ground spin state of d^n in a geometry.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct SpinCandidate {
    /// Twice the total spin S.
    pub two_s: i32,
    pub kind: SpinKind,
}

impl SpinCandidate {
    /// Spin multiplicity 2S + 1.
    pub fn multiplicity(&self) -> i32 {
        self.two_s + 1
    }

    /// Short name: "high", "low", "intermediate" or "only".
    pub fn kind_name(&self) -> &'static str {
        match self.kind {
            SpinKind::Only => "only",
            SpinKind::High => "high",
            SpinKind::Intermediate => "intermediate",
            SpinKind::Low => "low",
        }
    }

    /// Text such as "high spin (S = 3/2)".
    pub fn describe(&self) -> String {
        let s = if self.two_s % 2 == 0 {
            format!("{}", self.two_s / 2)
        } else {
            format!("{}/2", self.two_s)
        };
        match self.kind {
            SpinKind::Only => format!("S = {s} (the only ground spin state)"),
            _ => format!("{} spin (S = {s})", self.kind_name()),
        }
    }
}

/// Which spin state(s) a band analysis should assume.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SpinChoice {
    High,
    Low,
    /// Try every possible ground spin state and let the fit decide.
    Auto,
}

impl std::str::FromStr for SpinChoice {
    type Err = Error;

    fn from_str(s: &str) -> Result<Self> {
        match s.trim().to_lowercase().as_str() {
            "high" | "hs" => Ok(SpinChoice::High),
            "low" | "ls" => Ok(SpinChoice::Low),
            "auto" => Ok(SpinChoice::Auto),
            _ => Err(Error::invalid(Param::Spin, s, "high, low or auto")),
        }
    }
}

/// One calculation at B = `b` cm⁻¹, C = `c_over_b`·B and Δ/B = `delta_over_b`.
pub fn calculation_at(
    dn: usize,
    geometry: Geometry,
    b: f64,
    c_over_b: f64,
    delta_over_b: f64,
) -> Result<Calculation> {
    let dq = delta_over_b * b / 10.0;
    calculation(dn, geometry, dq, b, c_over_b * b)
}

/// One calculation for Dq, B, C in cm⁻¹ (no tetragonal distortion).
pub fn calculation(dn: usize, geometry: Geometry, dq: f64, b: f64, c: f64) -> Result<Calculation> {
    let field = geometry.field(dq, 0.0, 0.0)?;
    Calculation::new(dn, b, c, field, geometry.point_group(0.0, 0.0))
}

/// The spin states that are the ground state somewhere at the given C/B (every Δ/B up to the
/// engine's bound beyond which the spin cannot change), from weak to strong field. A single entry has kind [`SpinKind::Only`].
pub fn spin_states(dn: usize, geometry: Geometry, c_over_b: f64) -> Result<Vec<SpinCandidate>> {
    // The engine's map of ground spins over every Δ/B (cached, with no fixed ceiling).
    let mut spins: Vec<i32> = Vec::new();
    for (_, s) in crate::engine::crossover::ground_spin_map(dn, geometry, c_over_b)? {
        if !spins.contains(&s) {
            spins.push(s);
        }
    }
    let n = spins.len();
    Ok(spins
        .into_iter()
        .enumerate()
        .map(|(i, two_s)| SpinCandidate {
            two_s,
            kind: if n == 1 {
                SpinKind::Only
            } else if i == 0 {
                SpinKind::High
            } else if i == n - 1 {
                SpinKind::Low
            } else {
                SpinKind::Intermediate
            },
        })
        .collect())
}

/// The states a choice selects: high → the weak-field one, low → the strong-field one, auto →
/// all. With a single spin state every choice selects it.
pub fn select_spin(states: &[SpinCandidate], choice: SpinChoice) -> Vec<SpinCandidate> {
    match choice {
        SpinChoice::Auto => states.to_vec(),
        SpinChoice::High => states.first().copied().into_iter().collect(),
        SpinChoice::Low => states.last().copied().into_iter().collect(),
    }
}

/// Identity of a level that survives changes of field strength: (2S, irrep, index).
#[derive(Debug, Clone, PartialEq, Eq, Hash)]
pub struct TransitionKey {
    pub two_s: i32,
    pub irrep: Irrep,
    /// Position among levels of the same spin and irrep, lowest = 1.
    pub index: usize,
}

impl TransitionKey {
    /// The key of a level.
    pub fn of(level: &Level) -> Self {
        TransitionKey {
            two_s: level.two_s,
            irrep: level.irrep,
            index: level.index,
        }
    }

    /// The level with this key in a spectrum.
    pub fn find<'a>(&self, spectrum: &'a Spectrum) -> Option<&'a Level> {
        spectrum
            .levels
            .iter()
            .find(|l| l.two_s == self.two_s && l.index == self.index && l.irrep == self.irrep)
    }

    /// Label such as "4T1g".
    pub fn label(&self) -> String {
        format!("{}{}", self.two_s + 1, self.irrep)
    }
}

/// One spin-allowed transition from the lowest level of a spin to a higher level of that spin.
#[derive(Debug, Clone, PartialEq)]
pub struct Transition {
    pub key: TransitionKey,
    /// Label made unique within its manifold ("4T2g", "4T1g(F)", "4T1g(P)", "1T2g[2]"; see
    /// [`manifold`]).
    pub label: String,
    /// Free-ion parent term of the upper level (4P).
    pub parent: Option<Term>,
    /// Energy above the lower level of the transition (cm⁻¹).
    pub energy: f64,
    /// Orbital degeneracy of the upper level.
    pub degeneracy: usize,
}

/// The levels of one spin: its lowest level and the transitions from it.
#[derive(Debug, Clone, PartialEq)]
pub struct Manifold {
    pub two_s: i32,
    /// The lowest level of this spin (the lower level of every transition).
    pub reference: TransitionKey,
    /// Label of the lowest level, unique within the manifold like the transition labels.
    pub reference_label: String,
    /// Free-ion parent of the lowest level.
    pub reference_parent: Option<Term>,
    /// Energy of the lowest level of this spin above the ground level (cm⁻¹; 0 when this spin
    /// is the ground state).
    pub offset: f64,
    /// 2S of the upper levels: `two_s` for spin-allowed bands, `two_s − 2` for the
    /// spin-forbidden bands of a state that has no spin-allowed ones ([`band_manifold`]).
    pub upper_two_s: i32,
    /// Transitions, lowest first.
    pub transitions: Vec<Transition>,
}

impl Manifold {
    /// The transition with a key.
    pub fn get(&self, key: &TransitionKey) -> Option<&Transition> {
        self.transitions.iter().find(|t| &t.key == key)
    }
}

/// Unique labels for a list of levels of one spin, in the same order: where all levels of one
/// irrep come from different free-ion terms, each carries its parent's letter ("4T1g(F)",
/// "4T1g(P)"); otherwise the lowest is bare and the others carry their index ("1T2g",
/// "1T2g[2]").
fn unique_labels(levels: &[&Level]) -> Vec<String> {
    levels
        .iter()
        .map(|l| {
            let same: Vec<&&Level> = levels
                .iter()
                .filter(|o| o.irrep == l.irrep && o.two_s == l.two_s)
                .collect();
            let base = l.label();
            if same.len() == 1 {
                return base;
            }
            let letter = |x: &Level| x.parent.map(Term::letter);
            let mut letters: Vec<Option<char>> = same.iter().map(|o| letter(o)).collect();
            let n = letters.len();
            letters.sort();
            letters.dedup();
            let distinct = letters.len() == n && letters.iter().all(Option::is_some);
            if let (true, Some(own)) = (distinct, letter(l)) {
                format!("{base}({own})")
            } else if l.index == 1 {
                base
            } else {
                format!("{base}[{}]", l.index)
            }
        })
        .collect()
}

/// The manifold of spin `two_s` in a spectrum, or None when there is no level of that spin.
/// Labels are made unique: where all levels of one irrep come from different free-ion terms,
/// each carries its parent's letter ("4T1g(F)", "4T1g(P)"); otherwise the lowest is bare and the
/// others carry their index ("1T2g", "1T2g[2]").
pub fn manifold(spectrum: &Spectrum, two_s: i32) -> Option<Manifold> {
    manifold_to(spectrum, two_s, two_s)
}

/// The bands a spin state shows: its spin-allowed transitions, or, for a state of spin S with
/// none (the ⁶A₁ of high-spin d⁵ in O_h and T_d), the spin-forbidden transitions from its lowest
/// level to the levels of spin S − 1 (the quartets), which are then all its spectrum has.
pub fn band_manifold(spectrum: &Spectrum, two_s: i32) -> Option<Manifold> {
    let allowed = manifold(spectrum, two_s)?;
    if !allowed.transitions.is_empty() || two_s < 2 {
        return Some(allowed);
    }
    manifold_to(spectrum, two_s, two_s - 2).filter(|m| !m.transitions.is_empty())
}

/// Transitions from the lowest level of spin `two_s` to every level of spin `upper` above it.
fn manifold_to(spectrum: &Spectrum, two_s: i32, upper: i32) -> Option<Manifold> {
    let own: Vec<&Level> = spectrum
        .levels
        .iter()
        .filter(|l| l.two_s == two_s)
        .collect();
    let lowest = *own.first()?;
    let own_labels = unique_labels(&own);
    let (levels, labels, skip): (Vec<&Level>, Vec<String>, usize) = if upper == two_s {
        (own.clone(), own_labels.clone(), 1)
    } else {
        let up: Vec<&Level> = spectrum
            .levels
            .iter()
            .filter(|l| l.two_s == upper)
            .collect();
        let labels = unique_labels(&up);
        (up, labels, 0)
    };
    let transitions = levels
        .iter()
        .zip(&labels)
        .skip(skip)
        .filter(|(l, _)| l.energy > lowest.energy)
        .map(|(l, label)| Transition {
            key: TransitionKey::of(l),
            label: label.clone(),
            parent: l.parent,
            energy: l.energy - lowest.energy,
            degeneracy: l.degeneracy,
        })
        .collect();
    Some(Manifold {
        two_s,
        reference: TransitionKey::of(lowest),
        reference_label: own_labels[0].clone(),
        reference_parent: lowest.parent,
        offset: lowest.energy,
        upper_two_s: upper,
        transitions,
    })
}

/// The orbital sets of a geometry's field (orbitals of equal energy), with a name each, lowest
/// first: t2g/eg for oct, e/t2 for tet, and the real orbitals' names otherwise.
pub fn orbital_sets(geometry: Geometry) -> Result<Vec<(String, Vec<usize>)>> {
    let f = geometry.field(1.0, 0.0, 0.0)?;
    let diag: Vec<f64> = (0..5).map(|i| f.matrix[(i, i)]).collect();
    let mut sets: Vec<(f64, Vec<usize>)> = Vec::new();
    for (i, &e) in diag.iter().enumerate() {
        match sets.iter_mut().find(|(v, _)| (v - e).abs() < 1e-9) {
            Some((_, members)) => members.push(i),
            None => sets.push((e, vec![i])),
        }
    }
    sets.sort_by(|a, b| a.0.total_cmp(&b.0));
    Ok(sets
        .into_iter()
        .map(|(_, members)| {
            let name = match (geometry, members.as_slice()) {
                (Geometry::Octahedral | Geometry::Tetragonal, [1, 2, 4]) => "t2g".to_string(),
                (Geometry::Octahedral | Geometry::Tetragonal, [0, 3]) => "eg".to_string(),
                (Geometry::Tetrahedral, [0, 3]) => "e".to_string(),
                (Geometry::Tetrahedral, [1, 2, 4]) => "t2".to_string(),
                _ => members
                    .iter()
                    .map(|&i| crate::engine::field::REAL_ORBITALS[i])
                    .collect::<Vec<_>>()
                    .join(","),
            };
            (name, members)
        })
        .collect())
}

/// Strong-field configurations (electrons per orbital set of [`orbital_sets`]) of the levels
/// with the given keys, or None for a key whose occupations are not close to whole numbers.
///
/// Rule: the field is scaled up (at fixed B and C) until Dq = 2000 (B + C); by the non-crossing
/// rule the level with a given key there is the one followed from the actual field. In that
/// limit each level belongs to one configuration, whose occupations are the derivatives of the
/// level's energy with respect to each set's orbital energy (Hellmann–Feynman), taken by central
/// differences.
pub fn strong_field_configurations(
    dn: usize,
    geometry: Geometry,
    b: f64,
    c: f64,
    keys: &[TransitionKey],
) -> Result<Vec<Option<Vec<u32>>>> {
    let sets = orbital_sets(geometry)?;
    let dq = 2000.0 * (b + c);
    let base = geometry.field(dq, 0.0, 0.0)?;
    if (0..5).any(|i| (0..5).any(|j| i != j && base.matrix[(i, j)] != 0.0)) {
        return Err(Error::invalid(
            Param::Geometry,
            geometry,
            "a field diagonal over the real d orbitals",
        ));
    }
    let step = 1e-3 * dq;
    let group = geometry.point_group(0.0, 0.0);
    let mut occupations: Vec<Vec<f64>> = vec![Vec::new(); keys.len()];
    for (_, members) in &sets {
        let mut energies = [vec![f64::NAN; keys.len()], vec![f64::NAN; keys.len()]];
        for (side, sign) in [1.0, -1.0].iter().enumerate() {
            let mut diag = [0.0; 5];
            for (i, d) in diag.iter_mut().enumerate() {
                *d = base.matrix[(i, i)]
                    + if members.contains(&i) {
                        sign * step
                    } else {
                        0.0
                    };
            }
            let calc = Calculation::new(dn, b, c, LigandField::from_diagonal(diag), group)?;
            let spectrum = calc.levels()?;
            for (k, key) in keys.iter().enumerate() {
                if let Some(l) = key.find(&spectrum) {
                    energies[side][k] = l.absolute_energy;
                }
            }
        }
        for k in 0..keys.len() {
            occupations[k].push((energies[0][k] - energies[1][k]) / (2.0 * step));
        }
    }
    Ok(occupations
        .into_iter()
        .map(|occ| {
            let whole: Vec<u32> = occ.iter().map(|x| x.round().max(0.0) as u32).collect();
            let ok = occ
                .iter()
                .all(|x| x.is_finite() && (x - x.round()).abs() < 0.05)
                && whole.iter().sum::<u32>() as usize == dn;
            ok.then_some(whole)
        })
        .collect())
}

/// Number of electrons that change orbital set between two strong-field configurations
/// (half the summed absolute changes of occupation): 1 for a one-electron jump such as
/// t2g³ → t2g²eg¹, 2 for a two-electron jump such as t2g² → eg², 0 within one configuration.
pub fn electrons_moved(from: &[u32], to: &[u32]) -> u32 {
    from.iter()
        .zip(to)
        .map(|(a, b)| a.abs_diff(*b))
        .sum::<u32>()
        / 2
}

/// Below this one-electron fraction ([`super::configuration::one_electron_fraction`]) a band is
/// expected weak. Intensity scales roughly with the fraction (a one-electron band has ≈ 1), so
/// a band under 10 % is at least ten times weaker than its neighbours. The cut is this tool's
/// choice, set from the engine's fractions for the published band sets (counts of A. B. P.
/// Lever, Inorganic Electronic Spectroscopy, 2nd ed., 1984, from memory): ⁴T₁g(P) of
/// [Cr(H₂O)₆]³⁺ (≈ 11 %) and ³T₁g(P) of [Ni(H₂O)₆]²⁺ (≈ 48 %) are counted as strong; the ⁴A₂g
/// of [Co(H₂O)₆]²⁺ (≈ 7 %), the ³A₂g of [V(H₂O)₆]³⁺ (≈ 2 %) and the higher singlets of low-spin
/// d⁶ (≤ 3.5 % in [Co(NH₃)₆]³⁺), which those counts call weak or leave out, are not.
pub const WEAK_FRACTION: f64 = 0.1;

/// How a transition changes the strong-field configuration.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Jump {
    /// Electrons changing orbital set between the strong-field parents of the two levels (see
    /// [`electrons_moved`]), None if not determined: the nominal label.
    pub electrons: Option<u32>,
    /// Share of the transition that is a one-electron jump at the actual field
    /// ([`super::configuration::one_electron_fraction`]), None if not computed.
    pub one_electron: Option<f64>,
    /// Expected weak: one-electron fraction below [`WEAK_FRACTION`].
    pub weak: bool,
}

impl Jump {
    /// A jump that was not analysed (never weak).
    pub fn unknown() -> Self {
        Jump {
            electrons: None,
            one_electron: None,
            weak: false,
        }
    }
}

/// The jump of every transition of a manifold (same order as `m.transitions`), for the
/// calculation `calc` whose spectrum `spectrum` holds the manifold's levels.
///
/// Rule: the nominal label is the number of electrons that change orbital set between the
/// strong-field parents (at fixed B and C, field scaled up; [`strong_field_configurations`]).
/// Whether the band is weak follows from the actual field instead: the configuration weights of
/// both levels ([`super::configuration::configuration_weights`]) give the share of the
/// transition that is a one-electron jump, and a band is weak when that share is below
/// [`WEAK_FRACTION`]. So a nominal two-electron jump that mixes strongly with a one-electron
/// level of its symmetry (⁴T₁g(P) of d³ and ³T₁g(P) of d⁸) is not weak, while one with no such
/// partner (³A₂g of d², ⁴A₂g of d⁷, A. B. P. Lever, Inorganic Electronic Spectroscopy, 2nd ed.,
/// 1984, from memory) and the higher singlets of low-spin d⁶ are.
pub fn jumps(
    calc: &Calculation,
    geometry: Geometry,
    spectrum: &Spectrum,
    m: &Manifold,
) -> Result<Vec<Jump>> {
    let mut keys = vec![m.reference.clone()];
    keys.extend(m.transitions.iter().map(|t| t.key.clone()));
    let confs = strong_field_configurations(calc.dn, geometry, calc.b, calc.c, &keys)?;
    let moved: Vec<Option<u32>> = (1..keys.len())
        .map(|i| match (&confs[0], &confs[i]) {
            (Some(a), Some(b)) => Some(electrons_moved(a, b)),
            _ => None,
        })
        .collect();
    let levels: Option<Vec<&Level>> = keys.iter().map(|k| k.find(spectrum)).collect();
    let levels = levels.ok_or_else(|| {
        Error::Computation("a level of the manifold is missing from its spectrum".into())
    })?;
    let sets: Vec<Vec<usize>> = orbital_sets(geometry)?
        .into_iter()
        .map(|(_, members)| members)
        .collect();
    let weights = super::configuration::configuration_weights(calc, &sets, &levels)?;
    Ok(moved
        .iter()
        .enumerate()
        .map(|(i, &electrons)| {
            let f = super::configuration::one_electron_fraction(&weights[0], &weights[i + 1]);
            Jump {
                electrons,
                one_electron: Some(f),
                weak: f < WEAK_FRACTION,
            }
        })
        .collect())
}

#[cfg(test)]
mod intensity_tests {
    use super::*;

    /// Selection rules (Lever 1984; Cotton & Wilkinson 1999; common practice): tetrahedral
    /// spin-allowed bands are stronger than octahedral ones, spin-forbidden bands weaker than
    /// both, and a two-electron jump weaker again.
    #[test]
    fn intensity_follows_the_selection_rules() {
        let oct = intensity(Geometry::Octahedral, true, false);
        let tet = intensity(Geometry::Tetrahedral, true, false);
        let forbidden = intensity(Geometry::Octahedral, false, false);
        let two = intensity(Geometry::Octahedral, true, true);
        assert!(tet.epsilon.0 > oct.epsilon.0 && tet.epsilon.1 > oct.epsilon.1);
        assert!(forbidden.epsilon.1 <= oct.epsilon.0);
        assert!(two.epsilon.1 < oct.epsilon.1);
        assert_eq!(forbidden.class, "spin-forbidden");
        assert!(oct.class.contains("Laporte"));
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::engine::{Irrep, Species};
    use approx::assert_abs_diff_eq;

    fn oct() -> Geometry {
        Geometry::Octahedral
    }

    #[test]
    fn octahedral_spin_states_match_the_textbook_ground_terms() {
        // HS/LS ground spins of octahedral d4–d7 (Pollock et al., J. Am. Chem. Soc. 2014, 136,
        // 9453, Table 2: d4 5Eg/3T1g, d5 6A1g/2T2g, d6 5T2g/1A1g, d7 4T1g/2Eg).
        for (dn, hs, ls) in [(4, 4, 2), (5, 5, 1), (6, 4, 0), (7, 3, 1)] {
            let (r, _) = default_c_over_b(dn);
            let s = spin_states(dn, oct(), r).unwrap();
            assert_eq!(s.len(), 2, "d{dn}");
            assert_eq!((s[0].two_s, s[0].kind), (hs, SpinKind::High));
            assert_eq!((s[1].two_s, s[1].kind), (ls, SpinKind::Low));
        }
        // d3 and d8 have one ground spin in Oh (same table: 4A2g, 3A2g).
        for (dn, two_s) in [(3, 3), (8, 2)] {
            let s = spin_states(dn, oct(), 4.5).unwrap();
            assert_eq!(
                s,
                vec![SpinCandidate {
                    two_s,
                    kind: SpinKind::Only
                }]
            );
        }
    }

    #[test]
    fn d3_manifold_has_three_spin_allowed_bands() {
        // Octahedral d3 4A2g has three spin-allowed bands → 4T2g, 4T1g(F), 4T1g(P) (Lever,
        // Inorganic Electronic Spectroscopy, 2nd ed., 1984; A. B. P. Lever, Inorganic Electronic Spectroscopy, 2nd ed., 1984, from memory [M]).
        let calc = calculation(3, oct(), 1740.0, 728.6, 4.5 * 728.6).unwrap();
        let m = manifold(&calc.levels().unwrap(), 3).unwrap();
        let labels: Vec<&str> = m.transitions.iter().map(|t| t.label.as_str()).collect();
        assert_eq!(labels, ["4T2g", "4T1g(F)", "4T1g(P)"]);
        assert_eq!(m.reference_label, "4A2g");
        // ν1 = 10Dq (Lever, J. Chem. Educ. 1968, 45, 711).
        assert_abs_diff_eq!(m.transitions[0].energy, 17_400.0, epsilon = 1e-6);
    }

    #[test]
    fn configurations_of_octahedral_d3_and_d7() {
        // Strong-field parents (common practice): d3 4A2g t2g³, 4T2g and 4T1g(F) t2g²eg¹,
        // 4T1g(P) t2g¹eg²; d7 4T1g(F) t2g⁵eg², 4A2g t2g³eg⁴ — so d7 4T1g → 4A2g is a
        // two-electron jump (Lever 1984; A. B. P. Lever, Inorganic Electronic Spectroscopy, 2nd ed., 1984, from memory [M]).
        let calc = calculation(3, oct(), 1740.0, 700.0, 3150.0).unwrap();
        let m = manifold(&calc.levels().unwrap(), 3).unwrap();
        let mut keys = vec![m.reference.clone()];
        keys.extend(m.transitions.iter().map(|t| t.key.clone()));
        let conf = strong_field_configurations(3, oct(), 700.0, 3150.0, &keys).unwrap();
        let conf: Vec<Vec<u32>> = conf.into_iter().map(|c| c.unwrap()).collect();
        assert_eq!(conf, vec![vec![3, 0], vec![2, 1], vec![2, 1], vec![1, 2]]);
        assert_eq!(electrons_moved(&conf[0], &conf[3]), 2);

        let calc = calculation(7, oct(), 920.0, 825.0, 3822.0).unwrap();
        let m = manifold(&calc.levels().unwrap(), 3).unwrap();
        let a2 = m
            .transitions
            .iter()
            .find(|t| t.key.irrep == Irrep::mulliken(Species::A2, true))
            .unwrap();
        let keys = vec![m.reference.clone(), a2.key.clone()];
        let conf = strong_field_configurations(7, oct(), 825.0, 3822.0, &keys).unwrap();
        assert_eq!(conf[0].as_deref(), Some(&[5, 2][..]));
        assert_eq!(conf[1].as_deref(), Some(&[3, 4][..]));
    }

    #[test]
    fn tetrahedral_sets_are_e_below_t2() {
        let sets = orbital_sets(Geometry::Tetrahedral).unwrap();
        assert_eq!(sets[0].0, "e");
        assert_eq!(sets[1].0, "t2");
        let sets = orbital_sets(oct()).unwrap();
        // Octahedral sets in order t2g, eg (a t2g^6 eg^0 configuration reads in this order).
        assert_eq!(sets.len(), 2);
        assert_eq!(sets[0].0, "t2g");
        assert_eq!(sets[1].0, "eg");
    }

    #[test]
    fn spin_choice_parses() {
        assert_eq!("HS".parse::<SpinChoice>().unwrap(), SpinChoice::High);
        assert!("medium".parse::<SpinChoice>().is_err());
    }
}

/// How intense a d–d band is expected to be, by the selection rules it breaks.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Intensity {
    /// "spin-allowed, Laporte-forbidden", "spin-allowed, no inversion centre" or
    /// "spin-forbidden".
    pub class: &'static str,
    /// Typical molar absorptivity ε (M⁻¹ cm⁻¹), lowest and highest.
    pub epsilon: (f64, f64),
}

/// The expected intensity of a d–d band (A. B. P. Lever, Inorganic Electronic Spectroscopy,
/// 2nd ed., 1984; F. A. Cotton, G. Wilkinson et al., Advanced Inorganic Chemistry, 1999; usual
/// ranges, from memory): spin-allowed bands of centrosymmetric complexes (oct, sqpl,
/// tetragonal) are Laporte-forbidden, ε ≈ 1–100; without an inversion centre (tet, sqpy, tbp) d–p mixing
/// lends intensity, ε ≈ 50–1000; spin-forbidden bands have ε ≲ 1. A two-electron jump
/// (`weak`) is a further factor of ten weaker.
pub fn intensity(geometry: Geometry, spin_allowed: bool, weak: bool) -> Intensity {
    let (class, (lo, hi)) = if !spin_allowed {
        ("spin-forbidden", (0.01, 1.0))
    } else {
        match geometry {
            Geometry::Tetrahedral | Geometry::SquarePyramidal | Geometry::TrigonalBipyramidal => {
                ("spin-allowed, no inversion centre", (50.0, 1000.0))
            }
            Geometry::Octahedral | Geometry::SquarePlanar | Geometry::Tetragonal => {
                ("spin-allowed, Laporte-forbidden", (1.0, 100.0))
            }
        }
    };
    let f = if weak { 0.1 } else { 1.0 };
    Intensity {
        class,
        epsilon: (lo * f, hi * f),
    }
}
