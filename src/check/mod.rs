//! One verdict on the spin state of a complex from all the evidence at hand.
//!
//! [`check`] takes a complex (composition, optionally with measured Δ, B, C) and any of an
//! Evans-method measurement, a magnetometer value (χ_M, χ_M·T or μ_eff at a temperature), the
//! observed d–d band maxima in a spectrometer window, and the mean metal–donor bond length of a
//! crystal structure, typed or read from the structure itself ([`StructureInput`]: its centre's
//! bonds against the reference table, and the field at its real geometry as a second model line
//! or as the prediction). Each piece becomes one [`Evidence`] line (what is predicted, what was
//! measured, which spin state it supports and how strongly); [`decide`] then weighs them into a
//! [`Verdict`] with its reasons and what to re-check.
//!
//! # How the verdict is reached (rules of this tool)
//! - The ligand-field prediction is a model, not a measurement: it never outweighs one. The same
//!   holds for the field at a structure's geometry (`structure-field`). It is used
//!   alone only when nothing was measured or no measurement takes a side.
//! - Measured evidence of at least moderate strength decides. If any measurement fits neither
//!   spin state, the verdict is `inconsistent` and names it.
//! - High-spin and low-spin measurements together are `inconsistent`, unless every low-spin one
//!   was taken at a lower temperature than every high-spin one: that is what a thermal spin
//!   crossover does (the high-spin state has the larger entropy, so its fraction rises with
//!   temperature; P. Gütlich, H. A. Goodwin, *Top. Curr. Chem.* 2004, 233, 1, from memory), and the
//!   verdict is `crossover-or-mixture`. The temperatures must differ by at least [`MIN_GAP_K`].
//! - A measurement between the two states (a moment between their windows, a bond length between
//!   their ranges) gives `crossover-or-mixture`.
//! - A complex whose d^n and geometry allow one ground spin only (always the high-spin, Hund
//!   ground state: the ground spin never changes with the field) gets `high-spin` when the
//!   measurements agree with it, with a reason saying it is the only spin state.
//! - When nothing decides: a borderline prediction with no measurement gives
//!   `crossover-or-mixture` with confidence `none` (the field is within the estimate's error of
//!   the crossover), and weak measurements pulling different ways give `inconsistent` with what
//!   to re-check. The verdict is always one of the four names above.

pub mod batch;
pub mod demo;
pub mod evidence;

use crate::complex::{ComplexSpec, ResolvedComplex};
use crate::error::Error;
use crate::measured::evans::EvansInput;
use crate::measured::Measured;
use crate::predict::{predict_with, PredictOptions, Prediction, SpinState};
use crate::tables::DataSet;

/// What a piece of evidence is.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum EvidenceKind {
    /// Ligand-field prediction from Δ/B against the crossover.
    Prediction,
    /// Evans-method NMR measurement (solution).
    Evans,
    /// Magnetometer value: χ_M, χ_M·T or μ_eff at a temperature.
    Moment,
    /// Observed d–d band maxima.
    Bands,
    /// Mean metal–donor bond length from a crystal structure.
    BondLength,
    /// A χ_M·T(T) curve (magnetometer sweep or variable-temperature Evans series).
    Curve,
    /// The field at a structure's real geometry (angular overlap model), beside the
    /// composition's prediction: a model, like [`EvidenceKind::Prediction`].
    StructureField,
}

impl EvidenceKind {
    /// "prediction", "evans", "moment", "bands", "bond-length", "chit-curve" or
    /// "structure-field": the `kind` written in the reports.
    pub fn name(self) -> &'static str {
        match self {
            EvidenceKind::Prediction => "prediction",
            EvidenceKind::Evans => "evans",
            EvidenceKind::Moment => "moment",
            EvidenceKind::Bands => "bands",
            EvidenceKind::BondLength => "bond-length",
            EvidenceKind::Curve => "chit-curve",
            EvidenceKind::StructureField => "structure-field",
        }
    }

    /// The short column heading of this kind in the batch verdict table.
    pub fn heading(self) -> &'static str {
        match self {
            EvidenceKind::Prediction => "prediction",
            EvidenceKind::Evans => "evans",
            EvidenceKind::Moment => "moment",
            EvidenceKind::Bands => "bands",
            EvidenceKind::BondLength => "bond length",
            EvidenceKind::Curve => "χT(T) curve",
            EvidenceKind::StructureField => "structure field",
        }
    }

    /// True for the model lines (the prediction and the structure's field): they never
    /// decide against a measurement.
    pub fn is_model(self) -> bool {
        matches!(
            self,
            EvidenceKind::Prediction | EvidenceKind::StructureField
        )
    }

    /// What to re-check when this evidence disagrees with the rest.
    pub fn recheck(self) -> &'static str {
        match self {
            EvidenceKind::Prediction => {
                "the ligand-field parameters: the f·g estimate of Δ is rough; give Δ, B and C measured from a band fit"
            }
            EvidenceKind::Evans => {
                "the Evans data: concentration (weighing and volume), sign of the shift and the magnet geometry, the diamagnetic correction and the probe temperature; a complex can behave differently in solution than in the solid"
            }
            EvidenceKind::Moment => {
                "the magnetometer data: sample mass and molar mass (solvent of crystallisation), the diamagnetic correction, a paramagnetic impurity and the temperature"
            }
            EvidenceKind::Bands => {
                "the band list: charge-transfer or ligand bands counted as d–d bands, shoulders, and the spectrometer window"
            }
            EvidenceKind::BondLength => {
                "the structure: its temperature, which donor atoms were averaged, and disorder; a structure at another temperature may show the other spin state"
            }
            EvidenceKind::StructureField => {
                "the structure's field: the donors' assignment to ligands and their e_σ, e_π (from the f·g estimate); give Δ and B measured from a band fit"
            }
            EvidenceKind::Curve => {
                "the χ_M·T(T) file: its units (χ_M or χ_M·T), the molar mass, the diamagnetic correction, and the temperature sensor; a sample can change on cycling"
            }
        }
    }
}

/// Which spin state a piece of evidence supports.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Support {
    High,
    Low,
    /// Between the two states: a partial crossover or a mixture.
    Mixture,
    /// Fits both states: cannot decide.
    Both,
    /// Fits neither state: something is wrong.
    Neither,
    /// Agrees with the only ground spin state this d^n and geometry allow.
    Only,
    /// Takes no side (e.g. no reference range).
    Nothing,
}

impl Support {
    /// "high-spin", "low-spin", "mixture", "both", "neither", "only-state" or "none".
    pub fn name(self) -> &'static str {
        match self {
            Support::High => "high-spin",
            Support::Low => "low-spin",
            Support::Mixture => "mixture",
            Support::Both => "both",
            Support::Neither => "neither",
            Support::Only => "only-state",
            Support::Nothing => "none",
        }
    }
}

/// How strongly a piece of evidence supports its side.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
pub enum Strength {
    None,
    Weak,
    Moderate,
    Strong,
}

impl Strength {
    /// "none", "weak", "moderate" or "strong".
    pub fn name(self) -> &'static str {
        match self {
            Strength::None => "none",
            Strength::Weak => "weak",
            Strength::Moderate => "moderate",
            Strength::Strong => "strong",
        }
    }

    fn up(self) -> Strength {
        match self {
            Strength::None => Strength::Weak,
            Strength::Weak => Strength::Moderate,
            _ => Strength::Strong,
        }
    }
}

/// One line of evidence.
#[derive(Debug, Clone, PartialEq)]
pub struct Evidence {
    pub kind: EvidenceKind,
    /// What the model expects (for each spin state where that applies).
    pub predicted: String,
    /// What was measured.
    pub measured: String,
    pub supports: Support,
    pub strength: Strength,
    /// One or two sentences explaining the call.
    pub detail: String,
    /// Temperature of the measurement (K), when known.
    pub temperature: Option<f64>,
    /// Estimated high-spin fraction for evidence between the states (0..=1).
    pub high_spin_fraction: Option<f64>,
}

impl Evidence {
    fn decisive(&self) -> bool {
        !self.kind.is_model() && self.strength >= Strength::Moderate
    }
}

/// The overall verdict.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Verdict {
    HighSpin,
    LowSpin,
    CrossoverOrMixture,
    /// The evidence disagrees; see the re-check list.
    Inconsistent,
}

impl Verdict {
    /// "high-spin", "low-spin", "crossover-or-mixture" or "inconsistent".
    pub fn name(self) -> &'static str {
        match self {
            Verdict::HighSpin => "high-spin",
            Verdict::LowSpin => "low-spin",
            Verdict::CrossoverOrMixture => "crossover-or-mixture",
            Verdict::Inconsistent => "inconsistent",
        }
    }
}

/// A magnetometer quantity.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum MomentQuantity {
    /// χ_M as measured (cm³ mol⁻¹), before the diamagnetic correction.
    ChiM,
    /// χ_M·T of the corrected susceptibility (cm³ K mol⁻¹).
    ChiMT,
    /// μ_eff (μB).
    MuEff,
}

/// A magnetometer value at one temperature.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MomentInput {
    pub quantity: MomentQuantity,
    /// The value in the quantity's unit, with its uncertainty.
    pub value: Measured,
    /// Temperature (K).
    pub temperature: f64,
    /// Diamagnetic correction χ_D (cm³ mol⁻¹, ≤ 0).
    pub dia: Measured,
}

/// Observed d–d band maxima.
#[derive(Debug, Clone, PartialEq)]
pub struct BandInput {
    /// Band maxima (cm⁻¹).
    pub maxima: Vec<f64>,
    /// Spectrometer window, shortest and longest wavelength (nm).
    pub window_nm: (f64, f64),
    /// Bands closer than this (cm⁻¹) appear as one.
    pub resolution: f64,
    /// Temperature of the spectrum (K), when known.
    pub temperature: Option<f64>,
}

/// The mean metal–donor bond length of a crystal structure.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct BondLengthInput {
    /// Mean length (Å) with its uncertainty.
    pub mean: Measured,
    /// Temperature of the data collection (K), when known.
    pub temperature: Option<f64>,
}

/// A crystal structure's (or coordinate file's) metal centre as evidence: its bond lengths
/// against the reference table and the field at its real geometry.
#[derive(Debug, Clone, PartialEq)]
pub struct StructureInput {
    /// The file it came from, for the report.
    pub source: String,
    /// The centre, analysed with the complex's oxidation state.
    pub centre: crate::structure::centre::Centre,
    /// Temperature of the data collection (K), when known.
    pub temperature: Option<f64>,
    /// True when the structure's field stands for the prediction (no named geometry was
    /// given); false: it is listed beside the composition's prediction.
    pub field_is_prediction: bool,
}

/// A χ_M·T(T) curve.
#[derive(Debug, Clone, PartialEq)]
pub struct CurveInput {
    pub points: Vec<crate::sco::data::Point>,
    /// Where it came from (a file name), for the report.
    pub source: String,
}

/// Everything `check` can weigh.
#[derive(Debug, Clone, PartialEq)]
pub struct CheckInput {
    pub complex: ComplexSpec,
    pub evans: Option<EvansInput>,
    pub moment: Option<MomentInput>,
    pub bands: Option<BandInput>,
    pub bond_length: Option<BondLengthInput>,
    pub curve: Option<CurveInput>,
    pub structure: Option<StructureInput>,
}

/// Which part of the input an error comes from.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Part {
    Complex,
    Evans,
    Moment,
    Bands,
    BondLength,
    Curve,
    Structure,
}

/// An error of [`check`] with the part of the input it concerns.
#[derive(Debug, Clone, PartialEq)]
pub struct CheckError {
    pub part: Part,
    pub error: Error,
}

impl std::fmt::Display for CheckError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        self.error.fmt(f)
    }
}

/// The result of [`check`].
#[derive(Debug, Clone, PartialEq)]
pub struct CheckResult {
    pub prediction: Prediction,
    pub evidence: Vec<Evidence>,
    pub verdict: Verdict,
    /// How firm the verdict is.
    pub confidence: Strength,
    /// Why, one sentence each.
    pub reasons: Vec<String>,
    /// What to re-check (empty unless evidence disagrees).
    pub recheck: Vec<String>,
    /// The structure's field and centre, when a structure was given.
    pub structure: Option<StructureOutcome>,
}

/// What a structure gave `check`.
#[derive(Debug, Clone, PartialEq)]
pub struct StructureOutcome {
    pub source: String,
    pub centre: String,
    /// Mean metal–donor distance (Å).
    pub mean_distance: Option<f64>,
    /// The bond-length verdict of the centre (see
    /// [`crate::structure::centre::spin_state_from_bonds`]).
    pub spin_state_from_bonds: crate::structure::centre::BondVerdict,
    /// Label of the ground level of the field at the real geometry.
    pub ground: String,
    /// Twice the ground spin of that field.
    pub two_s: i32,
    /// Field scale λ at which the ground spin changes, with the new 2S (see
    /// [`crate::structure::spin`]); None within 1/4..4.
    pub margin: Option<(f64, i32)>,
    /// Point group of the labels.
    pub point_group: crate::engine::PointGroup,
    /// What the field's line supports.
    pub field_supports: Support,
    /// True when the field's side (high or low) is the opposite of the composition's.
    pub disagrees: bool,
}

impl CheckResult {
    /// The resolved complex.
    pub fn complex(&self) -> &ResolvedComplex {
        &self.prediction.complex
    }
}

/// Weighs every piece of evidence given in `input` (see the module docs).
pub fn check(input: &CheckInput, tables: &DataSet) -> std::result::Result<CheckResult, CheckError> {
    let at = |part: Part| move |error: Error| CheckError { part, error };
    let complex = input.complex.resolve(tables).map_err(at(Part::Complex))?;
    let prediction = predict_with(
        &complex,
        PredictOptions {
            moment_300k: false,
            band_analysis: false,
            ..PredictOptions::default()
        },
    )
    .map_err(at(Part::Complex))?;
    let mut evidence = vec![evidence::prediction(&prediction)];
    if let Some(e) = &input.evans {
        let ranges = tables.moment_ranges().map_err(at(Part::Evans))?;
        evidence.push(evidence::evans(e, &complex, ranges).map_err(at(Part::Evans))?);
    }
    if let Some(m) = &input.moment {
        let ranges = tables.moment_ranges().map_err(at(Part::Moment))?;
        evidence.push(evidence::moment(m, &complex, ranges).map_err(at(Part::Moment))?);
    }
    if let Some(b) = &input.bands {
        evidence.push(
            evidence::bands(
                b,
                &complex,
                tables.charge_transfer().map_err(at(Part::Bands))?,
            )
            .map_err(at(Part::Bands))?,
        );
    }
    if let Some(b) = &input.bond_length {
        evidence.push(
            evidence::bond_length(
                b,
                &complex,
                tables.bond_lengths().map_err(at(Part::BondLength))?,
            )
            .map_err(at(Part::BondLength))?,
        );
    }
    let mut outcome = None;
    if let Some(s) = &input.structure {
        let spin = crate::structure::spin::structure_spin(&s.centre, &complex, &[])
            .map_err(at(Part::Structure))?;
        let composition = evidence[0].clone();
        let kind = if s.field_is_prediction {
            EvidenceKind::Prediction
        } else {
            EvidenceKind::StructureField
        };
        let line = evidence::structure_field(&spin, &prediction, &s.centre.label, kind);
        let disagrees = matches!(
            (composition.supports, line.supports),
            (Support::High, Support::Low) | (Support::Low, Support::High)
        );
        outcome = Some(StructureOutcome {
            source: s.source.clone(),
            centre: s.centre.label.clone(),
            mean_distance: s.centre.mean_distance,
            spin_state_from_bonds: s.centre.spin_state_from_bonds,
            ground: spin.levels.first().map(|l| l.label()).unwrap_or_default(),
            two_s: spin.two_s,
            margin: spin.margin,
            point_group: spin.field.group,
            field_supports: line.supports,
            disagrees,
        });
        if s.field_is_prediction {
            evidence[0] = line;
        } else {
            evidence.insert(1, line);
        }
        let bonds = tables.bond_lengths().map_err(at(Part::Structure))?;
        evidence.push(evidence::structure_bonds(s, &complex, bonds));
    }
    if let Some(c) = &input.curve {
        let ranges = tables.moment_ranges().map_err(at(Part::Curve))?;
        evidence.push(evidence::curve(c, &complex, ranges).map_err(at(Part::Curve))?);
    }
    let single = prediction.spin_state == SpinState::Fixed;
    let mut decision = decide(&evidence, single);
    if let Some(o) = outcome.as_ref().filter(|o| o.disagrees) {
        let field_side = o.field_supports.name();
        decision.reasons.push(if input.structure.as_ref().is_some_and(|s| s.field_is_prediction) {
            format!(
                "the field at the structure's geometry ({}) supports {field_side}, but the composition's estimate at the idealised {} geometry supports the other state; the structure's field is used as the prediction",
                o.centre,
                complex.geometry.name()
            )
        } else {
            format!(
                "the field at the structure's geometry ({}) supports {field_side} and disagrees with the composition's prediction for the idealised {} geometry; both are models and neither outweighs a measurement",
                o.centre,
                complex.geometry.name()
            )
        });
    }
    Ok(CheckResult {
        prediction,
        evidence,
        verdict: decision.verdict,
        confidence: decision.confidence,
        reasons: decision.reasons,
        recheck: decision.recheck,
        structure: outcome,
    })
}

/// A verdict with its reasons.
#[derive(Debug, Clone, PartialEq)]
pub struct Decision {
    pub verdict: Verdict,
    pub confidence: Strength,
    pub reasons: Vec<String>,
    pub recheck: Vec<String>,
}

fn list(items: &[&Evidence]) -> String {
    let names: Vec<String> = items
        .iter()
        .map(|e| match e.temperature {
            Some(t) => format!("{} ({t:.0} K)", e.kind.name()),
            None => e.kind.name().to_string(),
        })
        .collect();
    names.join(", ")
}

fn recheck_of(items: &[&Evidence]) -> Vec<String> {
    let mut out: Vec<String> = Vec::new();
    for e in items {
        let line = format!("{}: {}", e.kind.name(), e.kind.recheck());
        if !out.contains(&line) {
            out.push(line);
        }
    }
    out
}

/// Low-spin and high-spin measurements must be at least this far apart in temperature (K) to be
/// read as a thermal crossover; closer, they contradict each other (a rule of this tool).
pub const MIN_GAP_K: f64 = 10.0;

/// Temperatures of all items, or None when any is unknown.
fn temperatures(items: &[&Evidence]) -> Option<Vec<f64>> {
    items.iter().map(|e| e.temperature).collect()
}

/// Weighs the evidence into a verdict (the rules are in the module docs). `single` says that the
/// d^n and geometry allow one ground spin only.
pub fn decide(evidence: &[Evidence], single: bool) -> Decision {
    let prediction = evidence.iter().find(|e| e.kind == EvidenceKind::Prediction);
    let measured: Vec<&Evidence> = evidence.iter().filter(|e| !e.kind.is_model()).collect();
    let models: Vec<&Evidence> = evidence.iter().filter(|e| e.kind.is_model()).collect();
    let with = |s: Support| -> Vec<&Evidence> {
        measured
            .iter()
            .copied()
            .filter(|e| e.supports == s && e.decisive())
            .collect()
    };
    let strongest = |items: &[&Evidence]| {
        items
            .iter()
            .map(|e| e.strength)
            .max()
            .unwrap_or(Strength::None)
    };
    let mut reasons = Vec::new();
    let mut recheck = Vec::new();

    let neither: Vec<&Evidence> = measured
        .iter()
        .copied()
        .filter(|e| e.supports == Support::Neither)
        .collect();
    if !neither.is_empty() {
        for e in &neither {
            reasons.push(format!(
                "{} fits neither spin state: {}",
                e.kind.name(),
                e.detail
            ));
        }
        recheck.extend(recheck_of(&neither));
        return Decision {
            verdict: Verdict::Inconsistent,
            confidence: strongest(&neither),
            reasons,
            recheck,
        };
    }

    if single {
        let agreeing: Vec<&Evidence> = with(Support::Only);
        if agreeing.is_empty() {
            reasons.push(
                "this d^n and geometry allow one ground spin state only (the high-spin one); no measurement was given to confirm it".into(),
            );
        } else {
            reasons.push(format!(
                "this d^n and geometry allow one ground spin state only (the high-spin one), and {} agree with it",
                list(&agreeing)
            ));
        }
        return Decision {
            verdict: Verdict::HighSpin,
            confidence: if agreeing.is_empty() {
                Strength::Weak
            } else {
                strongest(&agreeing)
            },
            reasons,
            recheck,
        };
    }

    let high = with(Support::High);
    let low = with(Support::Low);
    let mixed = with(Support::Mixture);
    let verdict;
    let confidence;
    if !high.is_empty() && !low.is_empty() {
        let th = temperatures(&high);
        let tl = temperatures(&low);
        match (th, tl) {
            (Some(th), Some(tl))
                if tl.iter().copied().fold(f64::MIN, f64::max) + MIN_GAP_K
                    <= th.iter().copied().fold(f64::MAX, f64::min) =>
            {
                verdict = Verdict::CrossoverOrMixture;
                confidence = strongest(&high).min(strongest(&low));
                reasons.push(format!(
                    "low-spin evidence at the lower temperature ({}) and high-spin evidence at the higher ({}): a thermal spin crossover lies between them (the high-spin state is favoured by entropy on warming)",
                    list(&low),
                    list(&high)
                ));
                reasons.extend(
                    mixed
                        .iter()
                        .map(|e| format!("{}: {}", e.kind.name(), e.detail)),
                );
            }
            (th, tl) => {
                verdict = Verdict::Inconsistent;
                confidence = strongest(&high).max(strongest(&low));
                reasons.push(format!(
                    "high-spin evidence ({}) disagrees with low-spin evidence ({})",
                    list(&high),
                    list(&low)
                ));
                match (th, tl) {
                    (Some(_), Some(_)) => reasons.push(format!(
                        "the temperatures do not explain it: a thermal crossover would give low spin at a temperature at least {MIN_GAP_K:.0} K below the high-spin one"
                    )),
                    _ => reasons.push(
                        "give the temperature of every measurement: low spin at a lower temperature than high spin would be a thermal crossover".into(),
                    ),
                }
                let solution = measured.iter().any(|e| e.kind == EvidenceKind::Evans);
                let solid = measured
                    .iter()
                    .any(|e| matches!(e.kind, EvidenceKind::BondLength | EvidenceKind::Moment));
                if solution && solid {
                    reasons.push(
                        "the Evans value is measured in solution and the others on the solid; spin equilibria often differ between the two (common practice)".into(),
                    );
                }
                // The smaller side first: it is the likelier outlier.
                let (first, second) = if high.len() <= low.len() {
                    (&high, &low)
                } else {
                    (&low, &high)
                };
                recheck.extend(recheck_of(first));
                recheck.extend(recheck_of(second));
            }
        }
    } else if !mixed.is_empty() {
        verdict = Verdict::CrossoverOrMixture;
        confidence = strongest(&mixed);
        for e in &mixed {
            reasons.push(format!("{}: {}", e.kind.name(), e.detail));
        }
        for e in high.iter().chain(low.iter()) {
            reasons.push(format!(
                "{} supports {} ({}); with the evidence between the states this points to a partial crossover",
                e.kind.name(),
                e.supports.name(),
                e.temperature.map_or("temperature not given".to_string(), |t| format!("{t:.0} K"))
            ));
        }
    } else if !high.is_empty() || !low.is_empty() {
        let (side, items) = if high.is_empty() {
            (Verdict::LowSpin, &low)
        } else {
            (Verdict::HighSpin, &high)
        };
        verdict = side;
        let kinds: Vec<EvidenceKind> = items.iter().map(|e| e.kind).collect();
        let distinct = kinds
            .iter()
            .enumerate()
            .filter(|(i, k)| !kinds[..*i].contains(k))
            .count();
        confidence = if distinct >= 2 {
            strongest(items).up()
        } else {
            strongest(items)
        };
        reasons.push(format!("{} support {}", list(items), side.name()));
    } else {
        // No measurement decides: weak measurements and the prediction.
        let weak: Vec<&Evidence> = measured
            .iter()
            .copied()
            .filter(|e| e.strength == Strength::Weak)
            .filter(|e| matches!(e.supports, Support::High | Support::Low))
            .chain(
                models
                    .iter()
                    .copied()
                    .filter(|p| p.strength >= Strength::Weak)
                    .filter(|p| matches!(p.supports, Support::High | Support::Low)),
            )
            .collect();
        let sides: Vec<Support> = weak.iter().map(|e| e.supports).collect();
        let agree = !sides.is_empty() && sides.iter().all(|s| *s == sides[0]);
        if agree {
            verdict = if sides[0] == Support::High {
                Verdict::HighSpin
            } else {
                Verdict::LowSpin
            };
            confidence = Strength::Weak;
            reasons.push(format!(
                "no measurement decides; {} point to {}",
                list(&weak),
                verdict.name()
            ));
        } else if measured.is_empty() {
            verdict = Verdict::CrossoverOrMixture;
            confidence = Strength::None;
            reasons.push(
                "nothing was measured and the predicted field lies within the estimate's error of the crossover: either spin state or a crossover is possible; measure the moment (Evans or magnetometer), the bands or a structure".into(),
            );
        } else {
            verdict = Verdict::Inconsistent;
            confidence = Strength::Weak;
            reasons.push(format!(
                "no evidence decides and the weak evidence pulls different ways ({}); measure the moment over temperature or add a structure",
                list(&measured)
            ));
            recheck.extend(recheck_of(&measured));
        }
    }

    // The prediction against the verdict.
    if let Some(p) = prediction {
        let opposite = matches!(
            (verdict, p.supports),
            (Verdict::HighSpin, Support::Low) | (Verdict::LowSpin, Support::High)
        );
        if opposite && p.strength >= Strength::Weak {
            reasons.push(format!(
                "the ligand-field prediction ({}) points the other way; measurements outweigh it",
                p.predicted
            ));
            recheck.push(format!(
                "prediction: {}",
                EvidenceKind::Prediction.recheck()
            ));
        } else if p.supports == Support::Both && matches!(verdict, Verdict::CrossoverOrMixture) {
            reasons.push(format!(
                "the prediction puts the complex near the crossover ({}), as a crossover needs",
                p.predicted
            ));
        }
    }
    Decision {
        verdict,
        confidence,
        reasons,
        recheck,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn ev(kind: EvidenceKind, supports: Support, strength: Strength, t: Option<f64>) -> Evidence {
        Evidence {
            kind,
            predicted: String::new(),
            measured: String::new(),
            supports,
            strength,
            detail: "d".into(),
            temperature: t,
            high_spin_fraction: None,
        }
    }

    use EvidenceKind as K;
    use Strength as St;
    use Support as S;

    #[test]
    fn agreeing_measurements_decide_and_raise_confidence() {
        let e = [
            ev(K::Prediction, S::High, St::Weak, None),
            ev(K::Evans, S::High, St::Moderate, Some(298.0)),
            ev(K::BondLength, S::High, St::Moderate, Some(298.0)),
        ];
        let d = decide(&e, false);
        assert_eq!(d.verdict, Verdict::HighSpin);
        assert_eq!(d.confidence, St::Strong);
        assert!(d.recheck.is_empty());
    }

    #[test]
    fn measurements_outweigh_the_prediction() {
        let e = [
            ev(K::Prediction, S::High, St::Weak, None),
            ev(K::Moment, S::Low, St::Strong, Some(298.0)),
        ];
        let d = decide(&e, false);
        assert_eq!(d.verdict, Verdict::LowSpin);
        assert!(d.reasons.iter().any(|r| r.contains("points the other way")));
        assert!(d.recheck[0].starts_with("prediction"));
    }

    #[test]
    fn low_spin_cold_and_high_spin_warm_is_a_crossover() {
        let e = [
            ev(K::BondLength, S::Low, St::Strong, Some(100.0)),
            ev(K::Moment, S::High, St::Strong, Some(300.0)),
        ];
        assert_eq!(decide(&e, false).verdict, Verdict::CrossoverOrMixture);
        // The reverse order of temperatures is not a crossover.
        let e = [
            ev(K::BondLength, S::High, St::Strong, Some(100.0)),
            ev(K::Moment, S::Low, St::Strong, Some(300.0)),
        ];
        let d = decide(&e, false);
        assert_eq!(d.verdict, Verdict::Inconsistent);
        assert!(d.reasons.iter().any(|r| r.contains("do not explain")));
        // Unknown temperatures: inconsistent, asking for them.
        let e = [
            ev(K::BondLength, S::High, St::Strong, None),
            ev(K::Moment, S::Low, St::Strong, Some(300.0)),
        ];
        let d = decide(&e, false);
        assert_eq!(d.verdict, Verdict::Inconsistent);
        assert!(d.reasons.iter().any(|r| r.contains("give the temperature")));
    }

    /// Each measured kind disagreeing with the two others makes the verdict inconsistent and
    /// puts that kind first in the re-check list.
    #[test]
    fn each_kind_can_be_the_outlier() {
        let kinds = [K::Evans, K::Moment, K::Bands, K::BondLength];
        for odd in kinds {
            let e: Vec<Evidence> = kinds
                .iter()
                .map(|&k| {
                    let s = if k == odd { S::Low } else { S::High };
                    ev(k, s, St::Moderate, Some(298.0))
                })
                .collect();
            let d = decide(&e, false);
            assert_eq!(d.verdict, Verdict::Inconsistent, "{odd:?}");
            assert!(
                d.recheck[0].starts_with(odd.name()),
                "{odd:?}: {:?}",
                d.recheck
            );
        }
    }

    #[test]
    fn evidence_between_states_is_a_mixture() {
        let e = [
            ev(K::Prediction, S::Both, St::None, None),
            ev(K::Evans, S::Mixture, St::Moderate, Some(298.0)),
        ];
        let d = decide(&e, false);
        assert_eq!(d.verdict, Verdict::CrossoverOrMixture);
        assert!(d.reasons.iter().any(|r| r.contains("near the crossover")));
    }

    #[test]
    fn neither_is_inconsistent_and_names_the_measurement() {
        let e = [
            ev(K::Evans, S::High, St::Strong, Some(298.0)),
            ev(K::BondLength, S::Neither, St::Moderate, None),
        ];
        let d = decide(&e, false);
        assert_eq!(d.verdict, Verdict::Inconsistent);
        assert!(d.recheck[0].starts_with("bond-length"));
    }

    #[test]
    fn prediction_alone_is_weak_or_undecided() {
        let d = decide(&[ev(K::Prediction, S::High, St::Weak, None)], false);
        assert_eq!((d.verdict, d.confidence), (Verdict::HighSpin, St::Weak));
        let d = decide(&[ev(K::Prediction, S::Both, St::None, None)], false);
        assert_eq!(
            (d.verdict, d.confidence),
            (Verdict::CrossoverOrMixture, St::None)
        );
        // A weak measurement against the prediction: inconsistent, with what to re-check.
        let d = decide(
            &[
                ev(K::Prediction, S::High, St::Weak, None),
                ev(K::Bands, S::Low, St::Weak, None),
            ],
            false,
        );
        assert_eq!(d.verdict, Verdict::Inconsistent);
        assert!(!d.recheck.is_empty());
    }

    #[test]
    fn single_spin_state() {
        let d = decide(
            &[
                ev(K::Prediction, S::Only, St::Weak, None),
                ev(K::Moment, S::Only, St::Strong, Some(298.0)),
            ],
            true,
        );
        assert_eq!(d.verdict, Verdict::HighSpin);
        assert_eq!(d.confidence, St::Strong);
        assert!(d.reasons[0].contains("one ground spin state only"));
        let d = decide(
            &[ev(K::Moment, S::Neither, St::Moderate, Some(298.0))],
            true,
        );
        assert_eq!(d.verdict, Verdict::Inconsistent);
    }
}
