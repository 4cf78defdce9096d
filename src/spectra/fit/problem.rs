//! The fit problem: the request, forbidden bands, free and fixed parameters, and the model that
//! turns parameters into band energies and residuals.

use crate::engine::{Calculation, Geometry, Irrep};
use crate::error::{Error, Result};
use crate::param::Param;
use crate::spectra::transitions::{
    band_manifold, calculation, Manifold, SpinCandidate, SpinChoice, TransitionKey,
};
use nalgebra::DVector;

/// What to fit.
#[derive(Debug, Clone)]
pub struct FitRequest {
    pub dn: usize,
    pub geometry: Geometry,
    /// Observed band maxima (cm⁻¹), any order.
    pub bands: Vec<f64>,
    pub spin: SpinChoice,
    /// C/B held fixed; None uses the Tanabe–Sugano ratio of [`default_c_over_b`]. Ignored with
    /// `fit_c` except as the starting value.
    pub c_over_b: Option<f64>,
    /// Fit C as a free parameter.
    pub fit_c: bool,
    /// Hold B at this value (cm⁻¹) and fit Dq (and C) only.
    pub fixed_b: Option<f64>,
    /// Cap on model evaluations per assignment, as a multiple of (free parameters + 1);
    /// None uses [`DEFAULT_PATIENCE`].
    pub patience: Option<usize>,
    /// Free-ion B₀ (cm⁻¹), when known: a fit with B > B₀ (β > 1) is flagged as unphysical and is
    /// never a near-equal alternative.
    pub b0: Option<f64>,
    /// Assigned spin-forbidden bands (e.g. the sharp ²Eg of Cr(III)); each is fitted to the
    /// lowest level of its multiplicity (and irrep, when named), and with any of them C is
    /// fitted too.
    pub forbidden: Vec<ForbiddenBand>,
}

/// An observed spin-forbidden band with its assignment.
#[derive(Debug, Clone, PartialEq)]
pub struct ForbiddenBand {
    /// Observed maximum (cm⁻¹).
    pub position: f64,
    /// Multiplicity 2S+1 of the upper level; None: the spin next below the assumed one (next
    /// above when there is none below).
    pub multiplicity: Option<i32>,
    /// Irrep of the upper level (Eg); None: the lowest level of that multiplicity.
    pub irrep: Option<Irrep>,
}

impl std::str::FromStr for ForbiddenBand {
    type Err = Error;

    /// "14900" or "14900:2Eg" or "14900:2" (position in cm⁻¹, optional multiplicity and irrep).
    fn from_str(s: &str) -> Result<Self> {
        let accepted = "a position in cm⁻¹, optionally with the upper level, e.g. 14900 or 14900:2Eg or 14900:2";
        let (pos, label) = match s.split_once(':') {
            Some((p, l)) => (p.trim(), Some(l.trim())),
            None => (s.trim(), None),
        };
        let position: f64 = pos
            .parse()
            .ok()
            .filter(|x: &f64| x.is_finite() && *x > 0.0)
            .ok_or_else(|| Error::invalid(Param::SpinForbiddenBand, s, accepted))?;
        let (multiplicity, irrep) = match label {
            None => (None, None),
            Some(l) => {
                let digits: String = l.chars().take_while(|c| c.is_ascii_digit()).collect();
                let rest = &l[digits.len()..];
                let m: i32 = digits
                    .parse()
                    .ok()
                    .filter(|m| (1..=6).contains(m))
                    .ok_or_else(|| Error::invalid(Param::SpinForbiddenBand, s, accepted))?;
                // A Mulliken label of a single-valued irrep, or none.
                let irrep = match rest {
                    "" => None,
                    r => match r.parse::<Irrep>() {
                        Ok(i @ Irrep::Mulliken { .. }) => Some(i),
                        _ => return Err(Error::invalid(Param::SpinForbiddenBand, s, accepted)),
                    },
                };
                (Some(m), irrep)
            }
        };
        Ok(ForbiddenBand {
            position,
            multiplicity,
            irrep,
        })
    }
}

/// Default cap on model evaluations per assignment, × (free parameters + 1).
pub const DEFAULT_PATIENCE: usize = 60;

/// A model parameter.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum FitParameter {
    Dq,
    B,
    C,
}

impl FitParameter {
    pub fn name(self) -> &'static str {
        match self {
            FitParameter::Dq => "Dq",
            FitParameter::B => "B",
            FitParameter::C => "C",
        }
    }
}

/// A parameter that was not fitted, and why.
#[derive(Debug, Clone, PartialEq)]
pub struct FixedParameter {
    /// "B", "C" or "C/B".
    pub name: String,
    /// The value held (cm⁻¹, or the ratio), or None when the parameter does not enter.
    pub value: Option<f64>,
    pub reason: String,
}

/// How parameters map to Dq, B, C.
#[derive(Debug, Clone)]
pub(super) struct Spec {
    pub(super) free: Vec<FitParameter>,
    /// B when B is not free (cm⁻¹).
    pub(super) b_fixed: f64,
    /// C/B when C is not free.
    pub(super) c_over_b: f64,
}

impl Spec {
    pub(super) fn natural(&self, u: &DVector<f64>) -> (f64, f64, f64) {
        let mut dq = 0.0;
        let mut b = self.b_fixed;
        let mut c = None;
        for (p, v) in self.free.iter().zip(u.iter()) {
            match p {
                FitParameter::Dq => dq = v.exp(),
                FitParameter::B => b = v.exp(),
                FitParameter::C => c = Some(v.exp()),
            }
        }
        (dq, b, c.unwrap_or(self.c_over_b * b))
    }

    pub(super) fn log_params(&self, dq: f64, b: f64, c: f64) -> DVector<f64> {
        DVector::from_iterator(
            self.free.len(),
            self.free.iter().map(|p| match p {
                FitParameter::Dq => dq.ln(),
                FitParameter::B => b.ln(),
                FitParameter::C => c.ln(),
            }),
        )
    }
}

/// The energies of given transitions for one spin at Dq, B, C: the spin-allowed (or band
/// manifold) `keys`, then the `forbidden` levels, all measured from the lowest level of spin
/// `two_s`.
pub(super) struct Model<'a> {
    pub(super) dn: usize,
    pub(super) geometry: Geometry,
    pub(super) two_s: i32,
    pub(super) keys: &'a [TransitionKey],
    pub(super) forbidden: &'a [TransitionKey],
}

impl Model<'_> {
    pub(super) fn manifold(&self, dq: f64, b: f64, c: f64) -> Option<Manifold> {
        self.manifold_and_spectrum(dq, b, c).map(|(m, _)| m)
    }

    pub(super) fn energies(&self, dq: f64, b: f64, c: f64) -> Option<Vec<f64>> {
        if self.forbidden.is_empty() {
            let m = self.manifold(dq, b, c)?;
            return self
                .keys
                .iter()
                .map(|k| m.get(k).map(|t| t.energy))
                .collect();
        }
        let (m, spectrum) = self.manifold_and_spectrum(dq, b, c)?;
        let reference = m.reference.find(&spectrum)?.energy;
        self.keys
            .iter()
            .map(|k| m.get(k).map(|t| t.energy))
            .chain(
                self.forbidden
                    .iter()
                    .map(|k| k.find(&spectrum).map(|l| l.energy - reference)),
            )
            .collect()
    }

    /// The band manifold and the spectrum it came from (one calculation).
    pub(super) fn manifold_and_spectrum(
        &self,
        dq: f64,
        b: f64,
        c: f64,
    ) -> Option<(Manifold, crate::engine::Spectrum)> {
        self.solved(dq, b, c).map(|(m, s, _)| (m, s))
    }

    /// [`Self::manifold_and_spectrum`] with the calculation itself, for analyses that need
    /// its eigenvectors.
    pub(super) fn solved(
        &self,
        dq: f64,
        b: f64,
        c: f64,
    ) -> Option<(Manifold, crate::engine::Spectrum, Calculation)> {
        if !(dq.is_finite() && b.is_finite() && c.is_finite()) || dq <= 0.0 || b <= 0.0 {
            return None;
        }
        let calc = calculation(self.dn, self.geometry, dq, b, c).ok()?;
        let spectrum = calc.levels().ok()?;
        let m = band_manifold(&spectrum, self.two_s)?;
        Some((m, spectrum, calc))
    }
}

/// Residuals calculated − observed of the assigned bands at log parameters `u`.
pub(super) fn band_residuals(
    model: &Model,
    spec: &Spec,
    bands: &[f64],
    u: &DVector<f64>,
) -> Option<DVector<f64>> {
    let (dq, b, c) = spec.natural(u);
    let e = model.energies(dq, b, c)?;
    Some(DVector::from_iterator(
        e.len(),
        e.iter().zip(bands).map(|(calc, obs)| calc - obs),
    ))
}

/// Which parameters the spin-allowed bands of one spin depend on, tested numerically at a
/// typical point (Δ/B = 20, B = 800 cm⁻¹): (B enters with C = ratio·B, C enters on its own).
pub(super) fn dependence(
    dn: usize,
    geometry: Geometry,
    two_s: i32,
    c_over_b: f64,
) -> Result<(bool, bool)> {
    let energies = |dq: f64, b: f64, c: f64| -> Result<Vec<(TransitionKey, f64)>> {
        let s = calculation(dn, geometry, dq, b, c)?.levels()?;
        Ok(band_manifold(&s, two_s)
            .map(|m| {
                m.transitions
                    .into_iter()
                    .map(|t| (t.key, t.energy))
                    .collect()
            })
            .unwrap_or_default())
    };
    let base = energies(1600.0, 800.0, 800.0 * c_over_b)?;
    let differs = |other: Vec<(TransitionKey, f64)>| {
        base.len() != other.len()
            || base
                .iter()
                .zip(&other)
                .any(|(a, b)| a.0 != b.0 || (a.1 - b.1).abs() > 1e-6 * (1.0 + a.1.abs()))
    };
    let b_enters = differs(energies(1600.0, 880.0, 880.0 * c_over_b)?);
    let c_enters = differs(energies(1600.0, 800.0, 880.0 * c_over_b)?);
    Ok((b_enters, c_enters))
}

/// The upper level of a spin-forbidden band: the lowest level of the named multiplicity (the
/// spin next below the assumed one when none is named, next above if there is none below), of
/// the named irrep when one is given.
pub(super) fn forbidden_target(
    spectrum: &crate::engine::Spectrum,
    state: SpinCandidate,
    band: &ForbiddenBand,
    req: &FitRequest,
) -> Result<TransitionKey> {
    let has = |two_s: i32| spectrum.levels.iter().any(|l| l.two_s == two_s);
    let two_s = match band.multiplicity {
        Some(m) => m - 1,
        None if has(state.two_s - 2) => state.two_s - 2,
        None => state.two_s + 2,
    };
    let what = || {
        format!(
            "{}{}",
            two_s + 1,
            band.irrep
                .map_or_else(|| String::from(" (any irrep)"), |i| i.to_string())
        )
    };
    if two_s == state.two_s {
        return Err(Error::invalid(
            Param::SpinForbiddenBand,
            format!("{:.0} cm⁻¹ → {}", band.position, what()),
            format!(
                "a level of another multiplicity than the assumed {} ({}): list spin-allowed bands with the other bands",
                state.multiplicity(),
                state.describe()
            ),
        ));
    }
    spectrum
        .levels
        .iter()
        .find(|l| l.two_s == two_s && band.irrep.is_none_or(|i| i == l.irrep))
        .map(TransitionKey::of)
        .ok_or_else(|| {
            let have: Vec<String> = {
                let mut v: Vec<String> = spectrum
                    .levels
                    .iter()
                    .filter(|l| l.two_s != state.two_s)
                    .map(|l| l.label())
                    .collect();
                v.dedup();
                v.truncate(8);
                v
            };
            Error::invalid(
                Param::SpinForbiddenBand,
                format!("{:.0} cm⁻¹ → {}", band.position, what()),
                format!(
                    "a level that d{} {} has; other-spin levels include {}",
                    req.dn,
                    req.geometry,
                    if have.is_empty() {
                        "none (this d^n has a single spin)".to_string()
                    } else {
                        have.join(", ")
                    }
                ),
            )
        })
}
