//! One [`Evidence`] line per kind of information: the ligand-field prediction, an Evans or
//! magnetometer moment, a band count and a bond length.

use super::{
    BandInput, BondLengthInput, CurveInput, Evidence, EvidenceKind, MomentInput, MomentQuantity,
    Strength, Support,
};
use crate::complex::{Origin, ResolvedComplex};
use crate::error::{Error, Result};
use crate::measured::compare::{self, MomentQuery, SpinOrbit, StateExpectation};
use crate::measured::evans::{self, EvansInput};
use crate::measured::{Measured, MomentResult};
use crate::param::Param;
use crate::predict::{Prediction, SpinState};
use crate::spectra::count::{count_bands, CountRequest};
use crate::spectra::fit::{fit_bands, FitRequest};
use crate::spectra::transitions::SpinChoice;
use crate::spectra::SpinKind;
use crate::tables::bond_lengths::{BondLengthTable, Reference};
use crate::tables::moment_ranges::MomentRangeTable;
use crate::units;

/// The ligand-field prediction as evidence. It is weak (moderate with Δ and B measured), takes
/// no side when borderline, and never decides against a measurement (see [`super::decide`]).
pub fn prediction(p: &Prediction) -> Evidence {
    let cx = &p.complex;
    let given = cx.delta.origin == Origin::Given && cx.b.origin == Origin::Given;
    let measured = if given {
        format!(
            "Δ {:.0}, B {:.0} cm⁻¹ given (measured)",
            cx.delta.value, cx.b.value
        )
    } else if cx.delta.origin == Origin::Given {
        format!(
            "Δ {:.0} cm⁻¹ given, B {:.0} cm⁻¹ estimated",
            cx.delta.value, cx.b.value
        )
    } else {
        format!(
            "Δ {:.0}, B {:.0} cm⁻¹ estimated (f·g, B₀β)",
            cx.delta.value, cx.b.value
        )
    };
    let (predicted, supports, strength, detail) = match (p.spin_state, p.margin) {
        (SpinState::Fixed, _) | (_, None) => (
            format!("one ground spin state only ({})", p.ground.label()),
            Support::Only,
            Strength::Weak,
            format!(
                "d{} {} has a single ground spin state: {} (S = {})",
                cx.ion.dn,
                cx.geometry.name(),
                p.ground.label(),
                p.spin
            ),
        ),
        (state, Some(m)) => {
            let xc = p.crossover.delta_over_b.unwrap_or(f64::NAN);
            let predicted = format!(
                "mean Δ̄/B {:.1} of the two spin states against the crossover at {xc:.1} ({:+.0} %)",
                xc + m.delta_over_b,
                m.percent
            );
            if state == SpinState::Crossover {
                (
                    predicted,
                    Support::Both,
                    Strength::None,
                    format!(
                        "spin crossover predicted: low spin at low temperature with the high-spin state {:.0} cm⁻¹ above, within thermal reach",
                        p.energy_gap.unwrap_or(f64::NAN)
                    ),
                )
            } else if m.borderline {
                (
                    predicted,
                    Support::Both,
                    Strength::None,
                    format!(
                        "within the assumed ±{:.0} % of the crossover: both spin states are candidates",
                        m.uncertainty_percent
                    ),
                )
            } else {
                let side = if state == SpinState::Low {
                    Support::Low
                } else {
                    Support::High
                };
                let mut detail = format!(
                    "{} side of the crossover, outside the assumed ±{:.0} %; each spin state at its own bond length",
                    if side == Support::Low { "low-spin" } else { "high-spin" },
                    m.uncertainty_percent
                );
                if cx.back_bonding {
                    detail.push_str("; back-bonding of the π acceptors included");
                }
                (
                    predicted,
                    side,
                    if given {
                        Strength::Moderate
                    } else {
                        Strength::Weak
                    },
                    detail,
                )
            }
        }
    };
    Evidence {
        kind: EvidenceKind::Prediction,
        predicted,
        measured,
        supports,
        strength,
        detail,
        temperature: None,
        high_spin_fraction: None,
    }
}

/// The expectations of both spin states for the complex at temperature `t` (K), filled from the
/// complex as `spinstate moment --metal …` does: Dq, B and ζ of the complex.
fn expectations(
    complex: &ResolvedComplex,
    t: f64,
    ranges: &MomentRangeTable,
) -> Result<Vec<StateExpectation>> {
    let dq = complex.delta_high_spin.value / 10.0;
    let dq_ls = complex.delta_low_spin.value / 10.0;
    let spec = MomentQuery {
        dq: (dq > 0.0).then_some(dq),
        dq_low_spin: (dq_ls > 0.0).then_some(dq_ls),
        spin_orbit: complex.ion.zeta.map(SpinOrbit::Zeta),
        b: Some(complex.b.value),
        temperature: Some(t),
        ..MomentQuery::new(complex.ion.dn, complex.geometry)
    };
    compare::expectations(&spec, ranges)
}

/// A moment between the windows whose two-state high-spin fraction is below this (or above one
/// minus this) is read as the nearer pure state with a residue, not as a mixture (a rule of this
/// tool).
pub const NEAR_PURE: f64 = 0.10;

/// χ_M·T (cm³ K mol⁻¹) of a reference moment: the middle of the typical range, or spin-only.
fn reference_chi_t(s: &StateExpectation) -> f64 {
    let mu = s.range.map_or(s.spin_only, |(a, b)| 0.5 * (a + b));
    units::chi_t_from_mu_eff(mu, units::SusceptibilityUnits::Cgs)
}

/// Moment evidence from a [`MomentResult`] (Evans or magnetometer).
fn from_moment(
    kind: EvidenceKind,
    r: &MomentResult,
    complex: &ResolvedComplex,
    ranges: &MomentRangeTable,
) -> Result<Evidence> {
    let t = r.temperature.value;
    let states = expectations(complex, t, ranges)?;
    let predicted = states
        .iter()
        .map(|s| {
            format!(
                "{} {} {:.2}–{:.2} μB",
                s.state.phrase(),
                s.ground_term,
                s.window.0,
                s.window.1
            )
        })
        .collect::<Vec<_>>()
        .join("; ");
    let mu = r.mu_eff;
    let measured = if mu.err > 0.0 {
        format!(
            "μ_eff {:.2} ± {:.2} μB at {t:.0} K (χ_M·T {:.3} cm³ K/mol)",
            mu.value, mu.err, r.chi_m_t.value
        )
    } else {
        format!(
            "μ_eff {:.2} μB at {t:.0} K (χ_M·T {:.3} cm³ K/mol)",
            mu.value, r.chi_m_t.value
        )
    };
    let cmp = compare::compare(mu, states);
    let mut fraction = None;
    let (supports, strength) = match cmp.verdict {
        compare::MomentVerdict::Supports(i) => match cmp.states[i].state {
            SpinKind::High => (Support::High, Strength::Strong),
            SpinKind::Low => (Support::Low, Strength::Strong),
            _ => (Support::Only, Strength::Strong),
        },
        compare::MomentVerdict::Ambiguous => (Support::Both, Strength::None),
        compare::MomentVerdict::Between => {
            // Two-state mixture: χ_M·T is linear in the high-spin fraction (P. Gütlich,
            // H. A. Goodwin, Top. Curr. Chem. 2004, 233, 1; from memory).
            let hs = reference_chi_t(&cmp.states[0]);
            let ls = cmp.states.get(1).map_or(0.0, reference_chi_t);
            let g = (hs > ls).then(|| ((r.chi_m_t.value - ls) / (hs - ls)).clamp(0.0, 1.0));
            fraction = g;
            match g {
                Some(g) if g < NEAR_PURE => (Support::Low, Strength::Moderate),
                Some(g) if g > 1.0 - NEAR_PURE => (Support::High, Strength::Moderate),
                _ => (Support::Mixture, Strength::Moderate),
            }
        }
        compare::MomentVerdict::Outside => (Support::Neither, Strength::Moderate),
    };
    let mut detail = cmp.message.clone();
    if let Some(g) = fraction {
        detail.push_str(&format!(
            "; as a two-state mixture about {:.0} % high spin at {t:.0} K",
            100.0 * g
        ));
        if supports != Support::Mixture {
            detail.push_str(&format!(
                ", close enough to the {} state (within {:.0} %) to be read as that state with a residue (TIP, a trace of the other state or an impurity)",
                if supports == Support::Low { "low-spin" } else { "high-spin" },
                100.0 * NEAR_PURE
            ));
        }
    }
    if kind == EvidenceKind::Evans {
        detail.push_str(" (in solution)");
    }
    Ok(Evidence {
        kind,
        predicted,
        measured,
        supports,
        strength,
        detail,
        temperature: Some(t),
        high_spin_fraction: fraction,
    })
}

/// Evidence from an Evans-method measurement.
pub fn evans(
    input: &EvansInput,
    complex: &ResolvedComplex,
    ranges: &MomentRangeTable,
) -> Result<Evidence> {
    let r = evans::evans(input)?;
    from_moment(EvidenceKind::Evans, &r.moment, complex, ranges)
}

/// Evidence from χ_M, χ_M·T or μ_eff at a temperature.
pub fn moment(
    input: &MomentInput,
    complex: &ResolvedComplex,
    ranges: &MomentRangeTable,
) -> Result<Evidence> {
    let t = Measured::new(Param::Temperature, input.temperature, 0.0)?;
    let r = match input.quantity {
        MomentQuantity::ChiM => MomentResult::from_chi(input.value, input.dia, t)?,
        MomentQuantity::ChiMT => MomentResult::from_chi_t(input.value, input.dia, t)?,
        MomentQuantity::MuEff => MomentResult::from_mu_eff(input.value, input.dia, t)?,
    };
    from_moment(EvidenceKind::Moment, &r, complex, ranges)
}

/// Evidence from observed band maxima: their number inside the window against the bands each
/// spin state puts there ([`crate::spectra::count`], at the complex's Δ, B and C). A count that
/// fits one state only is moderate evidence. When the count fits both states, Δ and B are fitted
/// to the positions under each spin assumption ([`crate::spectra::fit`]); a state that alone
/// reproduces them and stays the ground state at the fitted field gets weak support.
///
/// Bands above the charge-transfer onset of the complex's ligands (`charge_transfer`, the
/// lowest applicable row) count as possibly hidden.
pub fn bands(
    input: &BandInput,
    complex: &ResolvedComplex,
    charge_transfer: &crate::tables::ChargeTransferTable,
) -> Result<Evidence> {
    if input.maxima.is_empty() {
        return Err(Error::invalid(
            Param::Bands,
            "none",
            "one or more band maxima in cm⁻¹, e.g. \"11800 17200\"",
        ));
    }
    for &m in &input.maxima {
        if !m.is_finite() || m <= 0.0 {
            return Err(Error::invalid(
                Param::BandMaximum,
                m,
                "a wavenumber > 0 cm⁻¹",
            ));
        }
    }
    let window_cm = (1e7 / input.window_nm.1, 1e7 / input.window_nm.0);
    let inside = input
        .maxima
        .iter()
        .filter(|&&m| (window_cm.0..=window_cm.1).contains(&m))
        .count();
    let count = count_bands(&CountRequest {
        dn: complex.ion.dn,
        geometry: complex.geometry,
        dq: complex.dq(),
        b: complex.b.value,
        c: complex.c.value,
        window_nm: input.window_nm,
        resolution: input.resolution,
        observed: Some(inside),
        charge_transfer: crate::spectra::count::charge_transfer_limit(charge_transfer, complex),
    })?;
    let predicted = count
        .spin_states
        .iter()
        .map(|s| {
            let at: Vec<String> = s
                .merged
                .iter()
                .map(|g| format!("{:.0}", g.position))
                .collect();
            format!(
                "{}: {}–{} band(s) ({})",
                s.state.describe(),
                s.min_expected,
                s.max_expected,
                if at.is_empty() {
                    "none in the window".to_string()
                } else {
                    at.join(", ")
                }
            )
        })
        .collect::<Vec<_>>()
        .join("; ");
    let list: Vec<String> = input.maxima.iter().map(|m| format!("{m:.0}")).collect();
    let measured = format!(
        "{inside} band(s) in {:.0}–{:.0} nm: {} cm⁻¹",
        input.window_nm.0,
        input.window_nm.1,
        list.join(", ")
    );
    let supported = count
        .verdict
        .as_ref()
        .map(|v| v.supported.clone())
        .unwrap_or_default();
    let has = |k: SpinKind| supported.iter().any(|s| s.kind == k);
    let (supports, strength) = if supported.is_empty() {
        (Support::Neither, Strength::Moderate)
    } else if has(SpinKind::Only) {
        (Support::Only, Strength::Moderate)
    } else if supported.len() == 1 && has(SpinKind::High) {
        (Support::High, Strength::Moderate)
    } else if supported.len() == 1 && has(SpinKind::Low) {
        (Support::Low, Strength::Moderate)
    } else {
        (Support::Both, Strength::None)
    };
    // When the count fits both states, the positions may still tell: fit Δ and B to the bands
    // under each spin assumption and keep the states whose fit reproduces them and leaves that
    // state the ground state at the fitted field.
    let inside_bands: Vec<f64> = input
        .maxima
        .iter()
        .copied()
        .filter(|m| (window_cm.0..=window_cm.1).contains(m))
        .collect();
    let mut position_note =
        String::from("; positions are not weighed (too few bands to fit Δ and B)");
    let (supports, strength) = if supports == Support::Both && inside_bands.len() >= 2 {
        let verdicts: Vec<(SpinChoice, &str, std::result::Result<f64, String>)> = [
            (SpinChoice::High, "high-spin"),
            (SpinChoice::Low, "low-spin"),
        ]
        .into_iter()
        .map(|(choice, name)| (choice, name, position_fit(complex, &inside_bands, choice)))
        .collect();
        let ok: Vec<&str> = verdicts
            .iter()
            .filter(|v| v.2.is_ok())
            .map(|v| v.1)
            .collect();
        position_note = format!(
            "; positions fitted under each spin state: {}",
            verdicts
                .iter()
                .map(|(_, name, r)| match r {
                    Ok(rms) => format!("{name} reproduces them (rms {rms:.0} cm⁻¹)"),
                    Err(why) => format!("{name} does not ({why})"),
                })
                .collect::<Vec<_>>()
                .join("; ")
        );
        match ok.as_slice() {
            ["high-spin"] => (Support::High, Strength::Weak),
            ["low-spin"] => (Support::Low, Strength::Weak),
            _ => (supports, strength),
        }
    } else {
        if supports != Support::Both {
            position_note = String::from("; positions are not weighed (the count decides)");
        }
        (supports, strength)
    };
    let mut detail = match supports {
        Support::Neither => format!(
            "{inside} band(s) fit no spin state's expected count at Δ {:.0} cm⁻¹",
            complex.delta.value
        ),
        Support::Both => format!("{inside} band(s) fit more than one spin state's count"),
        Support::High | Support::Low if strength == Strength::Weak => format!(
            "{inside} band(s) fit the count of both spin states; their positions fit the {} state only",
            if supports == Support::High { "high-spin" } else { "low-spin" }
        ),
        _ => format!(
            "{inside} band(s) fit the count of {} only",
            supported[0].describe()
        ),
    };
    if inside < input.maxima.len() {
        detail.push_str(&format!(
            "; {} maximum/maxima outside the window not counted",
            input.maxima.len() - inside
        ));
    }
    detail.push_str(&position_note);
    Ok(Evidence {
        kind: EvidenceKind::Bands,
        predicted,
        measured,
        supports,
        strength,
        detail,
        temperature: input.temperature,
        high_spin_fraction: None,
    })
}

/// Largest rms residual (cm⁻¹) for a position fit to count as reproducing the bands: the usual
/// spread of band maxima read from broad d–d bands (common practice).
pub const POSITION_RMS_LIMIT: f64 = 500.0;

/// Fits Δ and B (C/B fixed) to the bands assuming one spin state; Ok(rms) when the fit
/// converges within [`POSITION_RMS_LIMIT`] and leaves that state the ground state.
fn position_fit(
    complex: &ResolvedComplex,
    bands: &[f64],
    spin: SpinChoice,
) -> std::result::Result<f64, String> {
    let req = FitRequest {
        dn: complex.ion.dn,
        geometry: complex.geometry,
        bands: bands.to_vec(),
        spin,
        c_over_b: None,
        fit_c: false,
        fixed_b: None,
        patience: None,
        b0: complex.ion.b0,
        forbidden: Vec::new(),
    };
    match fit_bands(&req) {
        Ok(outcome) => {
            let best = outcome.best;
            if !best.consistent() {
                Err("the fitted field makes the other spin state the ground state".into())
            } else if best.rms > POSITION_RMS_LIMIT {
                Err(format!("rms {:.0} cm⁻¹", best.rms))
            } else {
                Ok(best.rms)
            }
        }
        Err(_) => Err("no field reproduces them".into()),
    }
}

/// Tolerance (Å) added around the reference ranges for their rounding (common practice).
pub const BOND_TOLERANCE: f64 = 0.01;
/// Beyond this distance (Å) outside every reference range a bond length fits neither state.
pub const BOND_FAR: f64 = 0.10;

/// Evidence from a χ_M·T(T) curve: fitted with the ideal two-state model (the cooperative one
/// when both branches are given) inside the ion's physical χ_M·T ranges. A curve that crosses
/// between the pure states supports a crossover at its T½; a curve without a transition is read
/// as a plateau against each state's range.
pub fn curve(
    input: &CurveInput,
    complex: &ResolvedComplex,
    ranges: &MomentRangeTable,
) -> Result<Evidence> {
    use crate::sco::fit::{fit, FitRequest, ModelKind, PureState};
    use crate::sco::model::Branch;
    let pts = &input.points;
    if pts.len() < 2 {
        return Err(Error::invalid(
            Param::ChiMTCurve,
            format!("{} point(s) in {}", pts.len(), input.source),
            "at least two temperatures (for one, give χ_M·T with its temperature as a magnetometer value)",
        ));
    }
    let t_lo = pts.iter().map(|p| p.t).fold(f64::INFINITY, f64::min);
    let t_hi = pts.iter().map(|p| p.t).fold(f64::NEG_INFINITY, f64::max);
    let measured = format!(
        "{} points, {t_lo:.0}–{t_hi:.0} K ({})",
        pts.len(),
        input.source
    );
    let base = |predicted: String, supports, strength, detail, temperature| Evidence {
        kind: EvidenceKind::Curve,
        predicted,
        measured: measured.clone(),
        supports,
        strength,
        detail,
        temperature,
        high_spin_fraction: None,
    };
    let r = match crate::sco::pure_state_ranges(
        complex.ion.dn,
        complex.geometry,
        complex.ion.zeta,
        ranges,
    ) {
        Ok(r) => r,
        Err(_) => {
            return Ok(base(
                "one spin state only".into(),
                Support::Nothing,
                Strength::None,
                format!(
                    "d{} {} has one ground spin state: a χ_M·T curve cannot show a spin crossover",
                    complex.ion.dn,
                    complex.geometry.name()
                ),
                None,
            ))
        }
    };
    let predicted = format!(
        "high spin {:.2}–{:.2}, low spin {:.2}–{:.2} cm³ K/mol",
        r.high_spin.0, r.high_spin.1, r.low_spin.0, r.low_spin.1
    );
    let branches = pts.iter().any(|p| p.branch == Branch::Cooling)
        && pts.iter().any(|p| p.branch == Branch::Heating);
    let request = FitRequest {
        points: pts.clone(),
        model: if branches {
            ModelKind::Cooperative
        } else {
            ModelKind::Ideal
        },
        chit_hs: PureState::Within {
            lo: r.high_spin.0,
            hi: r.high_spin.1,
            why: r.why.clone(),
        },
        chit_ls: PureState::Within {
            lo: r.low_spin.0,
            hi: r.low_spin.1,
            why: r.why.clone(),
        },
        residual: false,
        two_s: Some(r.two_s),
    };
    if !crate::sco::fit::crosses(pts, r.high_spin.0, r.low_spin.1) {
        let mean = pts.iter().map(|p| p.chi_t).sum::<f64>() / pts.len() as f64;
        let within = |(lo, hi): (f64, f64)| (lo - 0.05..=hi + 0.05).contains(&mean);
        let (supports, temp, what) = if within(r.high_spin) {
            (Support::High, t_lo, "the high-spin range")
        } else if within(r.low_spin) {
            (Support::Low, t_hi, "the low-spin range")
        } else {
            (Support::Neither, t_lo, "neither state's range")
        };
        return Ok(base(
            predicted,
            supports,
            if supports == Support::Neither {
                Strength::Moderate
            } else {
                Strength::Strong
            },
            format!(
                "χ_M·T stays on one plateau (mean {mean:.2} cm³ K/mol over {t_lo:.0}–{t_hi:.0} K) inside {what}"
            ),
            Some(temp),
        ));
    }
    let f = fit(&request)?;
    let tr = f.transition;
    let g_lo = tr.intrinsic_fraction(t_lo, Branch::Heating)?;
    let g_hi = tr.intrinsic_fraction(t_hi, Branch::Cooling)?;
    let span = g_hi - g_lo;
    let inside = (t_lo..=t_hi).contains(&f.t_half.value);
    let loop_text = match (f.t_down, f.t_up) {
        (Some(d), Some(u)) => {
            format!(", hysteresis T↓ {:.0} K, T↑ {:.0} K", d.value, u.value)
        }
        _ => String::new(),
    };
    let detail = format!(
        "χ_M·T(T) crosses between the spin states: T½ = {:.0} K, ΔH = {:.1} kJ/mol, ΔS = {:.0} J/mol/K ({} fit, rms {:.3} cm³ K/mol{loop_text}); high-spin fraction {:.0} % at {t_lo:.0} K and {:.0} % at {t_hi:.0} K",
        f.t_half.value,
        f.dh.value,
        f.ds.value,
        f.model.name(),
        f.rms,
        100.0 * g_lo,
        100.0 * g_hi
    );
    let strength = if span >= 0.6 && inside {
        Strength::Strong
    } else {
        Strength::Moderate
    };
    Ok(base(
        predicted,
        Support::Mixture,
        strength,
        detail,
        Some(f.t_half.value),
    ))
}

/// Evidence from the mean metal–donor bond length, against the published ranges of
/// data/bond_lengths.csv for the complex's metal, oxidation state and (single) donor element.
pub fn bond_length(
    input: &BondLengthInput,
    complex: &ResolvedComplex,
    table: &BondLengthTable,
) -> Result<Evidence> {
    let x = input.mean.value;
    let u = input.mean.err;
    let (lo, hi) = crate::tables::bond_lengths::SENSIBLE_A;
    if !x.is_finite() || !(lo..=hi).contains(&x) {
        return Err(Error::invalid(
            Param::BondLength,
            format!("{x} Å"),
            format!("a mean metal–donor distance in {lo}..={hi} Å"),
        ));
    }
    if !u.is_finite() || u < 0.0 {
        return Err(Error::invalid(
            Param::Uncertainty(Box::new(Param::BondLength)),
            format!("{u} Å"),
            "a value ≥ 0 Å",
        ));
    }
    let ion = &complex.ion;
    let mut donors: Vec<String> = Vec::new();
    for b in &complex.ligands {
        for d in &b.ligand.donors {
            if !donors.contains(d) {
                donors.push(d.clone());
            }
        }
    }
    let measured = match input.temperature {
        Some(t) => format!("mean M–L {x:.3} Å at {t:.0} K"),
        None => format!("mean M–L {x:.3} Å"),
    };
    let none = |predicted: String, detail: String| Evidence {
        kind: EvidenceKind::BondLength,
        predicted,
        measured: measured.clone(),
        supports: Support::Nothing,
        strength: Strength::None,
        detail,
        temperature: input.temperature,
        high_spin_fraction: None,
    };
    let [donor] = donors.as_slice() else {
        return Ok(none(
            "no reference range".into(),
            format!(
                "the donor set is mixed ({}); the table has ranges for one donor element at a time",
                donors.join(", ")
            ),
        ));
    };
    let Some(reference) = table.reference(&ion.symbol, ion.oxidation_state, donor) else {
        let others = table.rows_for(&ion.symbol, ion.oxidation_state, donor);
        let detail = if others.is_empty() {
            format!(
                "data/bond_lengths.csv has no row for {}–{donor}",
                ion.name()
            )
        } else {
            let what: Vec<String> = others
                .iter()
                .map(|r| match (r.low_spin, r.delta_r) {
                    (Some(ls), _) => format!(
                        "{}–{donor}({}) {:.2}–{:.2} Å LS",
                        ion.name(),
                        r.donor_class,
                        ls.0,
                        ls.1
                    ),
                    (None, Some(d)) => format!(
                        "only the change on going high spin, {d:+.2} Å ({})",
                        r.source
                    ),
                    (None, None) => r.what.clone(),
                })
                .collect();
            format!(
                "no range for a mean over {donor} donors of {}: {}",
                ion.name(),
                what.join("; ")
            )
        };
        return Ok(none("no reference range".into(), detail));
    };
    Ok(classify(
        x,
        u,
        &reference,
        input,
        measured,
        ion.name(),
        donor,
    ))
}

/// The bond-length verdict for a mean over the donors of one element against a joined
/// reference, by the same rules as [`bond_length`] (used by the structure report).
pub fn classify_mean(mean: Measured, reference: &Reference, ion: String, donor: &str) -> Evidence {
    let input = BondLengthInput {
        mean,
        temperature: None,
    };
    let measured = format!("mean M–{donor} {:.3} Å", mean.value);
    classify(
        mean.value, mean.err, reference, &input, measured, ion, donor,
    )
}

fn classify(
    x: f64,
    u: f64,
    r: &Reference,
    input: &BondLengthInput,
    measured: String,
    ion: String,
    donor: &str,
) -> Evidence {
    let ls = r.low_spin;
    let hs = r.high_spin;
    let predicted = format!(
        "{ion}–{donor}: low spin {:.3}–{:.3} Å, high spin {:.3}–{:.3} Å",
        ls.0, ls.1, hs.0, hs.1
    );
    let sources: Vec<&str> = r.rows.iter().map(|r| r.source.as_str()).collect();
    let reach = u + BOND_TOLERANCE;
    let touches = |range: (f64, f64)| x + reach >= range.0 && x - reach <= range.1;
    let (in_ls, in_hs) = (touches(ls), touches(hs));
    let mid = |r: (f64, f64)| 0.5 * (r.0 + r.1);
    let (m_ls, m_hs) = (mid(ls), mid(hs));
    // The range with the shorter bonds comes first (low spin for every row in the table).
    let (short, long, short_side, long_side) = if m_ls <= m_hs {
        (ls, hs, Support::Low, Support::High)
    } else {
        (hs, ls, Support::High, Support::Low)
    };
    let mut fraction = None;
    let (supports, strength, why) = if in_ls && in_hs {
        (
            Support::Both,
            Strength::None,
            "the length with its uncertainty reaches both ranges".to_string(),
        )
    } else if in_ls || in_hs {
        let side = if in_ls { Support::Low } else { Support::High };
        (
            side,
            Strength::Strong,
            "inside the reference range".to_string(),
        )
    } else if x < short.0 - BOND_FAR || x > long.1 + BOND_FAR {
        (
            Support::Neither,
            Strength::Moderate,
            format!("more than {BOND_FAR} Å outside every reference range"),
        )
    } else if x < short.0 {
        (
            short_side,
            Strength::Moderate,
            "shorter than the reference ranges, nearest the short-bond state".to_string(),
        )
    } else if x > long.1 {
        (
            long_side,
            Strength::Moderate,
            "longer than the reference ranges, nearest the long-bond state".to_string(),
        )
    } else {
        let p = (x - short.1) / (long.0 - short.1);
        if p < 1.0 / 3.0 {
            (
                short_side,
                Strength::Moderate,
                "between the ranges, nearer the short-bond state".to_string(),
            )
        } else if p > 2.0 / 3.0 {
            (
                long_side,
                Strength::Moderate,
                "between the ranges, nearer the long-bond state".to_string(),
            )
        } else {
            // The mean length of a two-state mixture is linear in the fractions.
            let g = ((x - m_ls) / (m_hs - m_ls)).clamp(0.0, 1.0);
            fraction = Some(g);
            (
                Support::Mixture,
                Strength::Moderate,
                format!(
                    "midway between the ranges: both states in the crystal (about {:.0} % high spin) or a disordered structure",
                    100.0 * g
                ),
            )
        }
    };
    Evidence {
        kind: EvidenceKind::BondLength,
        predicted,
        measured,
        supports,
        strength,
        detail: format!("{why} (sources: {})", sources.join("; ")),
        temperature: input.temperature,
        high_spin_fraction: fraction,
    }
}

/// The spin state of the field at a structure's real geometry ([`crate::structure::spin`]) as
/// a model line of evidence, like [`prediction`]: weak (moderate with Δ and B measured), no side
/// within the complex's Δ/B uncertainty of the spin change, never decisive. `kind` is
/// [`EvidenceKind::Prediction`] when it stands for the prediction, else
/// [`EvidenceKind::StructureField`].
///
/// The side comes from the margin search: the ground spin is on the high-spin side when the
/// field must grow (scale λ > 1) to change it to a lower spin. Scaling the field by λ moves
/// Δ/B by the same factor, so 1/λ − 1 is the margin in the units of the composition's
/// `margin_percent`.
pub fn structure_field(
    spin: &crate::structure::spin::StructureSpin,
    p: &Prediction,
    centre: &str,
    kind: EvidenceKind,
) -> Evidence {
    let cx = &p.complex;
    let given = cx.delta.origin == Origin::Given && cx.b.origin == Origin::Given;
    let ground = spin.levels.first().map(|l| l.label()).unwrap_or_default();
    let s = spin.two_s as f64 / 2.0;
    let measured = format!(
        "geometry of {centre}; e_σ, e_π per donor from Δ {:.0} cm⁻¹ ({}), B {:.0} cm⁻¹",
        cx.delta.value,
        if cx.delta.origin == Origin::Given {
            "given"
        } else {
            "estimated"
        },
        cx.b.value
    );
    let uncertainty = 100.0 * cx.delta_over_b_uncertainty();
    let (predicted, supports, strength, detail) = match spin.margin {
        _ if p.spin_state == SpinState::Fixed => (
            format!("{ground} (S = {s}), one ground spin state only"),
            Support::Only,
            Strength::Weak,
            format!(
                "d{} {} has a single ground spin state; the structure's field gives {ground}",
                cx.ion.dn,
                cx.geometry.name()
            ),
        ),
        None => {
            let max_two_s = cx.ion.dn.min(10 - cx.ion.dn) as i32;
            let side = if spin.two_s == max_two_s {
                Support::High
            } else {
                Support::Low
            };
            (
                format!("{ground} (S = {s}); the ground spin does not change between ×1/4 and ×4 of the field"),
                side,
                if given { Strength::Moderate } else { Strength::Weak },
                format!(
                    "{} far from any spin change at this geometry (the field scaled by 1/4 to 4 keeps S = {s})",
                    side.name()
                ),
            )
        }
        Some((lambda, other)) => {
            let percent = (1.0 / lambda - 1.0) * 100.0;
            let side = if spin.two_s > other {
                Support::High
            } else {
                Support::Low
            };
            let predicted = format!(
                "{ground} (S = {s}); the ground spin changes to S = {} at ×{lambda:.3} of the field ({percent:+.0} %)",
                other as f64 / 2.0
            );
            if percent.abs() <= uncertainty {
                (
                    predicted,
                    Support::Both,
                    Strength::None,
                    format!(
                        "within the assumed ±{uncertainty:.0} % of the spin change at this geometry: both spin states are candidates"
                    ),
                )
            } else {
                (
                    predicted,
                    side,
                    if given { Strength::Moderate } else { Strength::Weak },
                    format!(
                        "{} side of the spin change at this geometry, outside the assumed ±{uncertainty:.0} % (field scaled at fixed bond lengths)",
                        side.name()
                    ),
                )
            }
        }
    };
    Evidence {
        kind,
        predicted,
        measured,
        supports,
        strength,
        detail,
        temperature: None,
        high_spin_fraction: None,
    }
}

/// The bond lengths of a structure's centre as one line of evidence: each donor element's mean
/// distance against its reference ranges (as [`classify_mean`] does for a typed mean), combined
/// as [`crate::structure::centre::spin_state_from_bonds`] combines them. Elements without a
/// reference take no side; elements that disagree make the line take no side either (and say
/// so). The strength is the weakest of the elements that decide.
pub fn structure_bonds(
    input: &super::StructureInput,
    complex: &ResolvedComplex,
    table: &BondLengthTable,
) -> Evidence {
    let c = &input.centre;
    let ion = &complex.ion;
    let mean = c.mean_distance.unwrap_or(f64::NAN);
    let per_element: Vec<String> = c
        .means
        .iter()
        .map(|m| {
            format!(
                "{}–{} {:.3} Å ({})",
                c.metal, m.element, m.mean_distance, m.count
            )
        })
        .collect();
    let mut measured = format!(
        "{} in {}: mean {mean:.3} Å over {} bonds",
        c.label,
        input.source,
        c.bonds.len()
    );
    if c.means.len() > 1 || c.means.first().is_some_and(|m| m.count != c.bonds.len()) {
        measured.push_str(&format!(" ({})", per_element.join(", ")));
    } else if let Some(m) = c.means.first() {
        measured = format!(
            "{} in {}: mean {}–{} {mean:.3} Å over {} bonds",
            c.label,
            input.source,
            c.metal,
            m.element,
            c.bonds.len()
        );
    }
    if let Some(t) = input.temperature {
        measured.push_str(&format!(" at {t:.0} K"));
    }
    let lines: Vec<(String, Evidence)> = c
        .means
        .iter()
        .filter_map(|m| {
            let r = table.reference(&ion.symbol, ion.oxidation_state, &m.element)?;
            Some((
                m.element.clone(),
                classify_mean(
                    Measured {
                        value: m.mean_distance,
                        err: 0.0,
                    },
                    &r,
                    ion.name(),
                    &m.element,
                ),
            ))
        })
        .collect();
    let without: Vec<&str> = c
        .means
        .iter()
        .filter(|m| !lines.iter().any(|(e, _)| *e == m.element))
        .map(|m| m.element.as_str())
        .collect();
    let mut ev = Evidence {
        kind: EvidenceKind::BondLength,
        predicted: "no reference range".into(),
        measured,
        supports: Support::Nothing,
        strength: Strength::None,
        detail: String::new(),
        temperature: input.temperature,
        high_spin_fraction: None,
    };
    let no_row = if without.is_empty() {
        String::new()
    } else {
        // Rows with only the change on going high spin say so (they cannot classify a mean).
        let changes: Vec<String> = without
            .iter()
            .flat_map(|e| table.rows_for(&ion.symbol, ion.oxidation_state, e))
            .filter_map(|r| {
                r.delta_r.filter(|_| r.low_spin.is_none()).map(|d| {
                    format!(
                        "{}–{} changes by {d:+.2} Å on going high spin ({})",
                        ion.name(),
                        r.donor,
                        r.source
                    )
                })
            })
            .collect();
        let mut t = format!(
            "data/bond_lengths.csv has no low- and high-spin range for {}–{}",
            ion.name(),
            without.join(", ")
        );
        if !changes.is_empty() {
            t.push_str(&format!(
                " (only the change: {}; compare structures at two temperatures with `structure`)",
                changes.join("; ")
            ));
        }
        t
    };
    let decided: Vec<&(String, Evidence)> = lines
        .iter()
        .filter(|(_, e)| e.supports != Support::Nothing)
        .collect();
    if lines.is_empty() {
        ev.detail = no_row;
        return ev;
    }
    ev.predicted = lines
        .iter()
        .map(|(_, e)| e.predicted.clone())
        .collect::<Vec<_>>()
        .join("; ");
    let agree = decided
        .first()
        .is_some_and(|(_, f)| decided.iter().all(|(_, e)| e.supports == f.supports));
    if agree {
        let first = &decided[0].1;
        ev.supports = first.supports;
        ev.strength = decided
            .iter()
            .map(|(_, e)| e.strength)
            .min()
            .unwrap_or(Strength::None);
        ev.high_spin_fraction = if decided.len() == 1 {
            first.high_spin_fraction
        } else {
            None
        };
        ev.detail = decided
            .iter()
            .map(|(el, e)| {
                if decided.len() > 1 {
                    format!("{el}: {}", e.detail)
                } else {
                    e.detail.clone()
                }
            })
            .collect::<Vec<_>>()
            .join("; ");
    } else if decided.is_empty() {
        ev.detail = lines
            .iter()
            .map(|(_, e)| e.detail.clone())
            .collect::<Vec<_>>()
            .join("; ");
    } else {
        ev.detail = format!(
            "the donor elements disagree ({}); the bonds take no side",
            decided
                .iter()
                .map(|(el, e)| format!("{el}: {}", e.supports.name()))
                .collect::<Vec<_>>()
                .join(", ")
        );
    }
    if !no_row.is_empty() {
        ev.detail.push_str(&format!("; {no_row}"));
    }
    ev
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::complex::{ComplexSpec, Overrides};
    use crate::tables::DataSet;

    fn complex(metal: &str, ox: i32, ligands: &[&str]) -> ResolvedComplex {
        ComplexSpec {
            metal: metal.into(),
            oxidation_state: ox,
            geometry: "oct".parse().unwrap(),
            ligands: ligands.iter().map(|l| l.parse().unwrap()).collect(),
            overrides: Overrides::default(),
        }
        .resolve(DataSet::bundled())
        .unwrap()
    }

    fn bond(x: f64, err: f64) -> BondLengthInput {
        BondLengthInput {
            mean: Measured { value: x, err },
            temperature: None,
        }
    }

    /// Fe–N 2.032 Å is low spin and 2.199 Å high spin: [Fe(2-pic)3]Cl2·EtOH at 115 K and 227 K
    /// (IUPAC Gold Book, "spin crossover"; Pure Appl. Chem. 1999, 71, 1963). 1.97 and 2.18 Å lie
    /// in the typical FeN6 ranges (Gütlich & Goodwin 2004; Guionneau 2004; from memory).
    #[test]
    fn iron_ii_nitrogen_bond_lengths() {
        let t = DataSet::bundled().bond_lengths().unwrap();
        let cx = complex("Fe", 2, &["py:4", "NCS:2"]);
        for (x, s) in [
            (2.032, Support::Low),
            (2.199, Support::High),
            (1.97, Support::Low),
            (2.18, Support::High),
        ] {
            let e = bond_length(&bond(x, 0.003), &cx, t).unwrap();
            assert_eq!((e.supports, e.strength), (s, Strength::Strong), "{x}");
        }
        // Midway (2.09 Å): a mixture, with the high-spin fraction from the range midpoints
        // (1.991, 2.175): (2.09 − 1.991)/(2.175 − 1.991) = 0.54.
        let e = bond_length(&bond(2.09, 0.003), &cx, t).unwrap();
        assert_eq!(e.supports, Support::Mixture);
        approx::assert_abs_diff_eq!(e.high_spin_fraction.unwrap(), 0.538, epsilon = 0.01);
        // Far outside: neither.
        let e = bond_length(&bond(2.45, 0.003), &cx, t).unwrap();
        assert_eq!(e.supports, Support::Neither);
        // A large uncertainty reaches both ranges.
        let e = bond_length(&bond(2.08, 0.09), &cx, t).unwrap();
        assert_eq!(e.supports, Support::Both);
    }

    #[test]
    fn no_reference_range() {
        let t = DataSet::bundled().bond_lengths().unwrap();
        // Co(II)–N: only the change (Crystals 2018, 8, 155).
        let e = bond_length(&bond(2.05, 0.0), &complex("Co", 2, &["terpy:2"]), t).unwrap();
        assert_eq!(e.supports, Support::Nothing);
        assert!(e.detail.contains("only the change"), "{}", e.detail);
        // Mixed donors.
        let e = bond_length(&bond(2.05, 0.0), &complex("Fe", 2, &["H2O:2", "py:4"]), t).unwrap();
        assert!(e.detail.contains("mixed"), "{}", e.detail);
        // Bad input.
        assert!(bond_length(&bond(20.5, 0.0), &complex("Fe", 2, &["py:6"]), t).is_err());
    }

    /// Spin-only μ_eff: S = 2 gives 4.90 μB, S = 0 gives 0 (Bain & Berry 2008, eq 3a); the
    /// d6 windows come from data/moment_ranges.csv.
    #[test]
    fn moments_support_the_matching_state() {
        let ranges = DataSet::bundled().moment_ranges().unwrap();
        let cx = complex("Fe", 2, &["py:4", "NCS:2"]);
        let m = |mu: f64| MomentInput {
            quantity: MomentQuantity::MuEff,
            value: Measured {
                value: mu,
                err: 0.05,
            },
            temperature: 298.0,
            dia: Measured::exact(0.0),
        };
        assert_eq!(
            moment(&m(5.3), &cx, ranges).unwrap().supports,
            Support::High
        );
        assert_eq!(
            moment(&m(0.05), &cx, ranges).unwrap().supports,
            Support::Low
        );
        let e = moment(&m(3.5), &cx, ranges).unwrap();
        assert_eq!(e.supports, Support::Mixture);
        // χT = 3.5²/8 ≈ 1.53 against (5.4²/8 = 3.65) and 0: about 42 % high spin.
        approx::assert_abs_diff_eq!(e.high_spin_fraction.unwrap(), 0.42, epsilon = 0.01);
        assert_eq!(
            moment(&m(7.5), &cx, ranges).unwrap().supports,
            Support::Neither
        );
    }
}
