//! Measured magnetism: from an Evans-method shift, a susceptibility, χ_M·T, a moment or a
//! magnetometer reading to χ_M (measured and diamagnetically corrected), χ_M·T, μ_eff and the
//! implied number of unpaired electrons, each with a propagated uncertainty; diamagnetic
//! corrections from Pascal's constants; comparison with the expectations of both spin states.
//!
//! Internally every susceptibility is cgs-emu (cm³ mol⁻¹); conversion to SI is done on output
//! with [`crate::units`]. Uncertainties are one standard deviation, propagated to first order
//! with independent inputs (common practice).

pub mod compare;
pub mod evans;
pub mod moment;
pub mod pascal;

use crate::error::{require_finite, Error, Result};
use crate::param::Param;
use crate::units::{self, SusceptibilityUnits};

/// A value with its standard uncertainty (≥ 0; 0 when not stated).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Measured {
    pub value: f64,
    pub err: f64,
}

impl Measured {
    /// A value with uncertainty; both must be finite and the uncertainty ≥ 0.
    pub fn new(param: Param, value: f64, err: f64) -> Result<Self> {
        require_finite(param.clone(), value)?;
        if !err.is_finite() || err < 0.0 {
            return Err(Error::invalid(
                Param::Uncertainty(Box::new(param)),
                err,
                "a finite value ≥ 0",
            ));
        }
        Ok(Measured { value, err })
    }

    /// An exact value (no uncertainty).
    pub fn exact(value: f64) -> Self {
        Measured { value, err: 0.0 }
    }

    /// Relative uncertainty err/|value| (0 for an exact zero).
    pub fn relative(&self) -> f64 {
        if self.value == 0.0 {
            0.0
        } else {
            self.err / self.value.abs()
        }
    }

    /// Checks value > 0.
    pub fn require_positive(self, param: Param, unit: &str) -> Result<Self> {
        if self.value > 0.0 {
            Ok(self)
        } else {
            Err(Error::invalid(
                param,
                format!("{} {unit}", self.value),
                format!("a value > 0 {unit}"),
            ))
        }
    }
}

/// Everything derived from a susceptibility at one temperature (cgs-emu throughout).
#[derive(Debug, Clone, PartialEq)]
pub struct MomentResult {
    /// Sample temperature (K).
    pub temperature: Measured,
    /// Molar susceptibility as measured, before the diamagnetic correction (cm³ mol⁻¹).
    pub chi_m: Measured,
    /// Diamagnetic correction χ_D that was subtracted (cm³ mol⁻¹, negative or 0).
    pub dia: Measured,
    /// Paramagnetic molar susceptibility χ_M − χ_D (cm³ mol⁻¹).
    pub chi_m_corrected: Measured,
    /// χ_M·T of the corrected susceptibility (cm³ K mol⁻¹).
    pub chi_m_t: Measured,
    /// Effective moment μ_eff = 2.828 √(χ_M T) (μB); 0 when the corrected χ_M·T ≤ 0.
    pub mu_eff: Measured,
    /// Unpaired electrons n from μ_eff = √(n(n+2)) (real value).
    pub unpaired: Measured,
    /// n rounded to the nearest integer.
    pub unpaired_nearest: u32,
    /// Remarks about the result (e.g. diamagnetic within the correction).
    pub notes: Vec<String>,
}

fn require_temperature(temperature: Measured) -> Result<Measured> {
    if temperature.value > 0.0 {
        Ok(temperature)
    } else {
        Err(Error::invalid(
            Param::Temperature,
            format!("{} K", temperature.value),
            "a temperature > 0 K (e.g. 298.15)",
        ))
    }
}

fn require_dia(dia: Measured) -> Result<Measured> {
    if dia.value > 0.0 {
        return Err(Error::invalid(
            Param::Dia,
            format!("{} cm³/mol", dia.value),
            "a value ≤ 0 cm³/mol (closed shells are diamagnetic, e.g. -2.5e-4)",
        ));
    }
    Ok(dia)
}

impl MomentResult {
    /// From a measured molar susceptibility (cm³ mol⁻¹), the diamagnetic correction χ_D
    /// (cm³ mol⁻¹, ≤ 0) and the temperature (K).
    pub fn from_chi(chi_m: Measured, dia: Measured, temperature: Measured) -> Result<Self> {
        let temperature = require_temperature(temperature)?;
        let dia = require_dia(dia)?;
        let corrected = Measured {
            value: chi_m.value - dia.value,
            err: chi_m.err.hypot(dia.err),
        };
        let chi_t = Measured {
            value: corrected.value * temperature.value,
            err: (temperature.value * corrected.err).hypot(corrected.value * temperature.err),
        };
        Self::finish(chi_m, dia, corrected, chi_t, temperature)
    }

    /// From a corrected (paramagnetic) χ_M·T (cm³ K mol⁻¹) at a temperature; `dia` is only
    /// added back to report the uncorrected χ_M.
    pub fn from_chi_t(chi_t: Measured, dia: Measured, temperature: Measured) -> Result<Self> {
        let temperature = require_temperature(temperature)?;
        let dia = require_dia(dia)?;
        let t = temperature.value;
        let corrected = Measured {
            value: chi_t.value / t,
            err: (chi_t.err / t).hypot(chi_t.value * temperature.err / (t * t)),
        };
        let chi_m = Measured {
            value: corrected.value + dia.value,
            err: corrected.err.hypot(dia.err),
        };
        Self::finish(chi_m, dia, corrected, chi_t, temperature)
    }

    /// From μ_eff (μB) at a temperature: χ_M·T = (μ_eff / 2.828)².
    pub fn from_mu_eff(mu_eff: Measured, dia: Measured, temperature: Measured) -> Result<Self> {
        if mu_eff.value < 0.0 {
            return Err(Error::invalid(
                Param::MuEff,
                format!("{} μB", mu_eff.value),
                "a moment ≥ 0 μB",
            ));
        }
        let chi_t = units::chi_t_from_mu_eff(mu_eff.value, SusceptibilityUnits::Cgs);
        let chi_t_err = 2.0 * mu_eff.err * mu_eff.value / units::moment_factor_cgs().powi(2);
        Self::from_chi_t(
            Measured::new(Param::ChiMT, chi_t, chi_t_err)?,
            dia,
            temperature,
        )
    }

    fn finish(
        chi_m: Measured,
        dia: Measured,
        corrected: Measured,
        chi_t: Measured,
        temperature: Measured,
    ) -> Result<Self> {
        for (name, m) in [
            (Param::ChiM, chi_m),
            (Param::ChiMCorrected, corrected),
            (Param::ChiMT, chi_t),
        ] {
            if !(m.value.is_finite() && m.err.is_finite()) {
                return Err(Error::invalid(
                    name,
                    m.value,
                    "a finite value: check the magnitudes and units of the inputs",
                ));
            }
        }
        let f = units::moment_factor_cgs();
        let mut notes = Vec::new();
        let (mu, mu_err) = if chi_t.value > 0.0 {
            let mu = f * chi_t.value.sqrt();
            (mu, mu * chi_t.err / (2.0 * chi_t.value))
        } else {
            notes.push(
                "the corrected χ_M·T is ≤ 0: the sample is diamagnetic within the diamagnetic correction; μ_eff is reported as 0 and its uncertainty as the moment of one standard deviation of χ_M·T".to_string(),
            );
            (0.0, f * chi_t.err.sqrt())
        };
        let n = units::unpaired_from_moment(mu);
        let n_err = if mu > 0.0 {
            mu * mu_err / (1.0 + mu * mu).sqrt()
        } else {
            units::unpaired_from_moment(mu_err)
        };
        Ok(MomentResult {
            temperature,
            chi_m,
            dia,
            chi_m_corrected: corrected,
            chi_m_t: chi_t,
            mu_eff: Measured {
                value: mu,
                err: mu_err,
            },
            unpaired: Measured {
                value: n,
                err: n_err,
            },
            unpaired_nearest: n.round().max(0.0) as u32,
            notes,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    // Spin-only S = 5/2 at 298.15 K: χ_M = 4.375/298.15 = 1.4674×10⁻² cm³ mol⁻¹ gives
    // μ_eff = 5.916 and n = 5 (Bain & Berry, J. Chem. Educ. 2008, 85, 532, eq 3a: χT = n(n+2)/8;
    // the exact constant 0.12505 instead of 1/8 moves μ by 0.02 %; the numbers computed here).
    #[test]
    fn spin_only_sextet_round_trip() {
        let chi = 4.375 / 298.15;
        let r = MomentResult::from_chi(
            Measured::exact(chi),
            Measured::exact(0.0),
            Measured::exact(298.15),
        )
        .unwrap();
        assert_relative_eq!(r.chi_m_t.value, 4.375, max_relative = 1e-12);
        assert_relative_eq!(r.mu_eff.value, 5.916, epsilon = 2e-3);
        assert_eq!(r.unpaired_nearest, 5);
        assert_relative_eq!(r.unpaired.value, 5.0, epsilon = 3e-3);
    }

    // Uncertainty: χT with 2 % relative error gives μ with 1 % (μ ∝ √χT), first-order
    // propagation (common practice).
    #[test]
    fn uncertainty_halves_under_the_square_root() {
        let r = MomentResult::from_chi_t(
            Measured::exact(3.0),
            Measured::exact(0.0),
            Measured::exact(300.0),
        )
        .unwrap();
        assert_eq!(r.mu_eff.err, 0.0);
        let r = MomentResult::from_chi_t(
            Measured::new(Param::ChiM, 3.0, 0.06).unwrap(),
            Measured::exact(0.0),
            Measured::exact(300.0),
        )
        .unwrap();
        assert_relative_eq!(r.mu_eff.err / r.mu_eff.value, 0.01, max_relative = 1e-12);
        // Corrected χ carries both the measurement and the correction uncertainty.
        let r = MomentResult::from_chi(
            Measured::new(Param::ChiM, 1e-2, 3e-5).unwrap(),
            Measured::new(Param::Dia, -2e-4, 4e-5).unwrap(),
            Measured::exact(300.0),
        )
        .unwrap();
        assert_relative_eq!(r.chi_m_corrected.value, 1.02e-2, max_relative = 1e-12);
        assert_relative_eq!(r.chi_m_corrected.err, 5e-5, max_relative = 1e-12);
    }

    #[test]
    fn inputs_agree_with_each_other() {
        let t = Measured::new(Param::Temperature, 295.0, 0.5).unwrap();
        let dia = Measured::exact(-1.5e-4);
        let a = MomentResult::from_chi(Measured::exact(1.2e-2), dia, t).unwrap();
        let b = MomentResult::from_chi_t(Measured::exact(a.chi_m_t.value), dia, t).unwrap();
        let c = MomentResult::from_mu_eff(Measured::exact(a.mu_eff.value), dia, t).unwrap();
        for r in [&b, &c] {
            assert_relative_eq!(r.chi_m.value, a.chi_m.value, max_relative = 1e-12);
            assert_relative_eq!(r.mu_eff.value, a.mu_eff.value, max_relative = 1e-12);
        }
    }

    #[test]
    fn diamagnetic_sample_gives_zero_moment_with_a_note() {
        let r = MomentResult::from_chi(
            Measured::new(Param::ChiM, -1e-4, 5e-5).unwrap(),
            Measured::exact(-5e-5),
            Measured::exact(300.0),
        )
        .unwrap();
        assert_eq!(r.mu_eff.value, 0.0);
        assert!(r.mu_eff.err > 0.0);
        assert_eq!(r.unpaired_nearest, 0);
        assert!(r.notes[0].contains("diamagnetic"));
    }

    #[test]
    fn bad_temperature_and_correction_are_rejected() {
        let chi = Measured::exact(1e-2);
        for t in [0.0, -5.0] {
            let e =
                MomentResult::from_chi(chi, Measured::exact(0.0), Measured::exact(t)).unwrap_err();
            assert!(e.to_string().contains("temperature"), "{e}");
        }
        let e =
            MomentResult::from_chi(chi, Measured::exact(2e-4), Measured::exact(300.0)).unwrap_err();
        assert!(e.to_string().contains("≤ 0"), "{e}");
        assert!(Measured::new(Param::ChiM, 1.0, -0.1).is_err());
        assert!(Measured::new(Param::ChiM, f64::NAN, 0.1).is_err());
    }
}
