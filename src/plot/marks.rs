//! Sample marks for the energy diagram, built from a prediction or from a bare Δ/B: the sample's
//! Δ/B with its uncertainty, both spin states' Δ/B, and the spin-allowed transitions from the
//! lowest level of the ground spin (the engine's levels, in units of B as the diagram).

use super::energy::{Arrow, SampleMark};
use crate::engine::geometry::Geometry;
use crate::engine::levels::Calculation;
use crate::error::Result;
use crate::predict::Prediction;
use crate::spectra::transitions::{spin_states, SpinKind};

/// A wavenumber as printed on figures: rounded to 10 cm⁻¹ with a thin space between thousands
/// (the digit grouping of ISO 80000-1 and the IUPAC Green Book).
pub fn wavenumber_text(e: f64) -> String {
    let r = ((e / 10.0).round() * 10.0) as i64;
    let digits = r.abs().to_string();
    let mut out = String::new();
    for (i, c) in digits.chars().enumerate() {
        if i > 0 && (digits.len() - i).is_multiple_of(3) && digits.len() > 4 {
            out.push('\u{2009}');
        }
        out.push(c);
    }
    if r < 0 {
        out.insert(0, '−');
    }
    format!("{out} cm⁻¹")
}

/// The sample marks of a prediction: the ground state's Δ/B with its 1σ, both states' own Δ/B
/// when the spin can change, and the ground spin's spin-allowed bands as arrows.
pub fn from_prediction(p: &Prediction) -> SampleMark {
    let c = &p.complex;
    let b = c.b.value;
    let x = c.delta_over_b();
    let mut states = Vec::new();
    if let Some(ls) = &p.bands_low_spin {
        states.push(("HS".to_string(), p.bands_high_spin.delta / b));
        states.push(("LS".to_string(), ls.delta / b));
    }
    let bands = match &p.bands_low_spin {
        Some(ls) if ls.two_s == p.ground.two_s => ls,
        _ => &p.bands_high_spin,
    };
    let arrows = bands
        .bands
        .iter()
        .map(|band| Arrow {
            from: bands.from_energy / b,
            to: (bands.from_energy + band.energy) / b,
            level: band.to.clone(),
            text: wavenumber_text(band.energy),
        })
        .collect();
    SampleMark {
        name: c.formula(),
        delta_over_b: x,
        uncertainty: x * c.delta_over_b_uncertainty(),
        states,
        arrows,
    }
}

/// The sample marks of a bare Δ/B (with 1σ `uncertainty`) for d^n in `geometry` at C/B: the
/// spin-allowed transitions from the lowest level of the ground spin, labelled in cm⁻¹ when B is
/// given and as E/B otherwise.
pub fn from_ratio(
    dn: usize,
    geometry: Geometry,
    c_over_b: f64,
    delta_over_b: f64,
    uncertainty: f64,
    b: Option<f64>,
) -> Result<SampleMark> {
    let calc = Calculation::new(
        dn,
        1.0,
        c_over_b,
        geometry.field(delta_over_b / 10.0, 0.0, 0.0)?,
        geometry.point_group(0.0, 0.0),
    )?;
    let spectrum = calc.levels()?;
    let ground = spectrum.ground().clone();
    let arrows = spectrum
        .levels
        .iter()
        .filter(|l| l.two_s == ground.two_s && l.energy > ground.energy + 1e-9)
        .map(|l| Arrow {
            from: 0.0,
            to: l.energy - ground.energy,
            level: l.label(),
            text: match b {
                Some(b) => wavenumber_text((l.energy - ground.energy) * b),
                None => format!("*E*/*B* = {:.1}", l.energy - ground.energy),
            },
        })
        .collect();
    Ok(SampleMark {
        name: format!("Δ/B = {delta_over_b}"),
        delta_over_b,
        uncertainty,
        states: Vec::new(),
        arrows,
    })
}

/// Multiplicities to highlight for each spin state of d^n (high and low spin, or the only one),
/// with a short name each.
pub fn spin_highlights(dn: usize, geometry: Geometry, c_over_b: f64) -> Result<Vec<(i32, String)>> {
    Ok(spin_states(dn, geometry, c_over_b)?
        .into_iter()
        .map(|s| {
            let name = match s.kind {
                SpinKind::Only => "ground spin",
                SpinKind::High => "high spin",
                SpinKind::Intermediate => "intermediate spin",
                SpinKind::Low => "low spin",
            };
            (s.multiplicity(), name.to_string())
        })
        .collect())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn wavenumbers_group_thousands() {
        assert_eq!(wavenumber_text(17_394.0), "17\u{2009}390 cm⁻¹");
        assert_eq!(wavenumber_text(8_004.0), "8000 cm⁻¹");
    }
}
