//! Quantities derived from a fit: the Dq convention, the point on a Tanabe-Sugano diagram, the
//! nephelauxetic ratio and the position relative to the crossover.

use super::*;
use crate::engine::Geometry;
use crate::error::{require_finite, Error, Result};
use crate::param::Param;

/// The usual published reading of octahedral d³ and d⁸ spectra (A. B. P. Lever, Inorganic
/// Electronic Spectroscopy, 2nd ed., 1984; J. Chem. Educ. 1968, 45, 711): Δ = ν₁ (the ⁴T₂g or
/// ³T₂g band, exactly 10Dq in the cubic model) and B from ν₂ or ν₃ with Δ held at ν₁. Tables of
/// Δ and B are mostly built this way, so it is reported beside the least-squares fit.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Convention {
    /// Δ = ν₁ (cm⁻¹).
    pub delta: f64,
    /// B from ν₁ and ν₂: (ν₂ − ν₁)(ν₂ − 2ν₁)/(15ν₂ − 27ν₁) (cm⁻¹).
    pub b_from_nu2: Option<f64>,
    /// B from ν₁ and ν₃: (x² − ν₁²/4)/(15x − 4.5ν₁) with x = ν₃ − 1.5ν₁ (cm⁻¹).
    pub b_from_nu3: Option<f64>,
}

/// The published convention for a fit of octahedral d³ or d⁸ whose assignment includes ν₁;
/// None for other cases.
pub fn convention(f: &BandFit) -> Option<Convention> {
    if !matches!(f.dn, 3 | 8) || f.geometry != Geometry::Octahedral {
        return None;
    }
    let m = f.spin_state.multiplicity();
    let find = |label: String| {
        f.assigned
            .iter()
            .find(|a| a.transition.label == label)
            .map(|a| a.observed)
    };
    let nu1 = find(format!("{m}T2g"))?;
    let nu2 = find(format!("{m}T1g(F)"));
    let nu3 = find(format!("{m}T1g(P)"));
    let b2 = nu2
        .map(|n2| (n2 - nu1) * (n2 - 2.0 * nu1) / (15.0 * n2 - 27.0 * nu1))
        .filter(|b| b.is_finite() && *b > 0.0);
    let b3 = nu3
        .map(|n3| {
            let x = n3 - 1.5 * nu1;
            (x * x - 0.25 * nu1 * nu1) / (15.0 * x - 4.5 * nu1)
        })
        .filter(|b| b.is_finite() && *b > 0.0);
    Some(Convention {
        delta: nu1,
        b_from_nu2: b2,
        b_from_nu3: b3,
    })
}

/// "10Dq = 17400, B = 729, C = 3279 cm⁻¹" for messages.
pub fn point_text(f: &BandFit) -> String {
    let mut s = format!("10Dq = {:.0}", f.delta());
    if let Some(b) = f.b {
        s.push_str(&format!(", B = {b:.1}"));
    }
    if let Some(c) = f.c {
        s.push_str(&format!(", C = {c:.0}"));
    }
    s.push_str(" cm⁻¹");
    s
}

/// Nephelauxetic ratio β = B/B₀ (B₀ the free-ion value in cm⁻¹, > 0).
pub fn nephelauxetic_ratio(b: f64, b0: f64) -> Result<f64> {
    check_b0(b0)?;
    Ok(b / b0)
}

/// A free-ion B₀ (cm⁻¹) must be finite and inside [`POSSIBLE_B`].
pub fn check_b0(b0: f64) -> Result<()> {
    require_finite(Param::FreeIonB, b0)?;
    if !(POSSIBLE_B.0..=POSSIBLE_B.1).contains(&b0) {
        return Err(Error::invalid(
            Param::FreeIonB,
            b0,
            format!(
                "a free-ion Racah B in {}..={} cm⁻¹",
                POSSIBLE_B.0, POSSIBLE_B.1
            ),
        ));
    }
    Ok(())
}

/// Where a fitted Δ/B lies relative to the spin crossover.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CrossoverPosition {
    /// Crossover Δ/B (at the fit's C/B).
    pub crossover: f64,
    /// Fitted Δ/B minus the crossover (positive: on the strong-field, low-spin side).
    pub margin: f64,
    /// Relative margin, margin / crossover.
    pub relative: f64,
    /// True when the fitted field lies on the low-spin side.
    pub low_spin_side: bool,
}

/// Where a fit lies relative to the engine's spin crossover at the fit's C/B, or None when B is
/// not determined or the ground spin never changes for this d^n and geometry.
pub fn crossover_position(fit: &BandFit) -> Result<Option<CrossoverPosition>> {
    let Some(x) = fit.delta_over_b() else {
        return Ok(None);
    };
    let cross = crate::engine::crossover(fit.dn, fit.geometry, fit.c_over_b)?;
    match cross.delta_over_b {
        Some(xc) => relative_to_crossover(x, xc).map(Some),
        None => Ok(None),
    }
}

/// Places a fitted Δ/B relative to a crossover Δ/B (both at the same C/B).
pub fn relative_to_crossover(delta_over_b: f64, crossover: f64) -> Result<CrossoverPosition> {
    require_finite(Param::CrossoverDeltaOverB, crossover)?;
    require_finite(Param::DeltaOverB, delta_over_b)?;
    if crossover <= 0.0 {
        return Err(Error::invalid(
            Param::CrossoverDeltaOverB,
            crossover,
            "a value > 0",
        ));
    }
    let margin = delta_over_b - crossover;
    Ok(CrossoverPosition {
        crossover,
        margin,
        relative: margin / crossover,
        low_spin_side: margin > 0.0,
    })
}
