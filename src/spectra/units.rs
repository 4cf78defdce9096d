//! Units in which band maxima are given: wavenumber (cm⁻¹), wavelength (nm), kilokayser (kK,
//! 1000 cm⁻¹) and electronvolt (eV). Everything inside spinstate works in cm⁻¹; the conversions
//! are those of [`crate::units`] (CODATA constants).

use crate::error::{closest_names, require_finite, Error, Result};
use crate::param::Param;
use crate::units::{cm1_nm, cm1_to_ev, cm1_to_kk, ev_to_cm1, kk_to_cm1};
use std::fmt;
use std::str::FromStr;

/// A unit for band positions.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum EnergyUnit {
    /// Wavenumber, cm⁻¹.
    Wavenumber,
    /// Vacuum wavelength, nm: ν̃ (cm⁻¹) = 10⁷ / λ (nm).
    Nanometre,
    /// Kilokayser, 1 kK = 1000 cm⁻¹.
    KiloKayser,
    /// Electronvolt.
    ElectronVolt,
}

impl EnergyUnit {
    /// The names accepted on the command line.
    pub const NAMES: [&'static str; 4] = ["cm-1", "nm", "kK", "eV"];

    /// Short name ("cm-1", "nm", "kK", "eV").
    pub fn name(self) -> &'static str {
        match self {
            EnergyUnit::Wavenumber => "cm-1",
            EnergyUnit::Nanometre => "nm",
            EnergyUnit::KiloKayser => "kK",
            EnergyUnit::ElectronVolt => "eV",
        }
    }

    /// Converts a value in this unit to cm⁻¹. The value must be finite and positive (a
    /// wavelength of 0 nm has no wavenumber).
    pub fn to_wavenumber(self, x: f64) -> Result<f64> {
        require_finite(Param::BandPosition(self.name()), x)?;
        if x <= 0.0 {
            return Err(Error::invalid(
                Param::BandPosition(self.name()),
                x,
                "a positive number",
            ));
        }
        match self {
            EnergyUnit::Wavenumber => Ok(x),
            EnergyUnit::Nanometre => cm1_nm(x),
            EnergyUnit::KiloKayser => Ok(kk_to_cm1(x)),
            EnergyUnit::ElectronVolt => Ok(ev_to_cm1(x)),
        }
    }

    /// Converts a positive wavenumber (cm⁻¹) to this unit.
    pub fn from_wavenumber(self, nu: f64) -> f64 {
        match self {
            EnergyUnit::Wavenumber => nu,
            EnergyUnit::Nanometre => 1e7 / nu,
            EnergyUnit::KiloKayser => cm1_to_kk(nu),
            EnergyUnit::ElectronVolt => cm1_to_ev(nu),
        }
    }
}

impl fmt::Display for EnergyUnit {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

impl FromStr for EnergyUnit {
    type Err = Error;

    fn from_str(s: &str) -> Result<Self> {
        let key = s.trim();
        let unit = match key {
            "cm-1" | "cm^-1" | "cm⁻¹" | "1/cm" | "wavenumber" | "wavenumbers" => {
                EnergyUnit::Wavenumber
            }
            "nm" => EnergyUnit::Nanometre,
            "kK" | "kk" | "kilokayser" => EnergyUnit::KiloKayser,
            "eV" | "ev" => EnergyUnit::ElectronVolt,
            _ => {
                return Err(Error::Unknown {
                    kind: crate::error::NameKind::EnergyUnit,
                    name: s.to_string(),
                    suggestions: closest_names(key, EnergyUnit::NAMES),
                })
            }
        };
        Ok(unit)
    }
}

/// Parses a comma-separated list of band positions in `unit` and returns them in cm⁻¹.
pub fn parse_bands(text: &str, unit: EnergyUnit) -> Result<Vec<f64>> {
    let mut out = Vec::new();
    for (i, part) in text.split(',').enumerate() {
        let part = part.trim();
        if part.is_empty() {
            return Err(Error::Parse(format!(
                "band {} of '{text}' is empty: give numbers separated by commas, e.g. 17400,24600",
                i + 1
            )));
        }
        let x: f64 = part.parse().map_err(|_| {
            Error::Parse(format!(
                "band {} '{part}' is not a number: give numbers in {} separated by commas",
                i + 1,
                unit.name()
            ))
        })?;
        out.push(unit.to_wavenumber(x)?);
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn wavelength_and_wavenumber() {
        // ν̃ (cm⁻¹) = 10⁷ / λ (nm) (common practice, from memory): 470 nm ↔ 21 277 cm⁻¹, the
        // [Co(NH3)6]3+ band quoted at 470 nm and 21 280 cm⁻¹.
        let nu = EnergyUnit::Nanometre.to_wavenumber(470.0).unwrap();
        assert_relative_eq!(nu, 21_276.6, epsilon = 0.1);
    }

    #[test]
    fn electronvolt() {
        // 1 cm⁻¹ = 1.23984×10⁻⁴ eV (common practice, from memory).
        let nu = EnergyUnit::ElectronVolt.to_wavenumber(1.0).unwrap();
        assert_relative_eq!(1.0 / nu, 1.23984e-4, max_relative = 1e-5);
    }

    #[test]
    fn round_trips() {
        for u in [
            EnergyUnit::Wavenumber,
            EnergyUnit::Nanometre,
            EnergyUnit::KiloKayser,
            EnergyUnit::ElectronVolt,
        ] {
            let x = u.from_wavenumber(17_400.0);
            assert_relative_eq!(u.to_wavenumber(x).unwrap(), 17_400.0, max_relative = 1e-14);
            assert_eq!(u.name().parse::<EnergyUnit>().unwrap(), u);
        }
    }

    #[test]
    fn bad_units_and_values() {
        let e = "furlong".parse::<EnergyUnit>().unwrap_err();
        assert!(e.to_string().contains("accepted: cm-1, nm, kK, eV"));
        assert!(EnergyUnit::Nanometre.to_wavenumber(0.0).is_err());
        assert!(EnergyUnit::Wavenumber.to_wavenumber(f64::NAN).is_err());
        assert!(parse_bands("17400,,24600", EnergyUnit::Wavenumber).is_err());
        assert!(parse_bands("17400,abc", EnergyUnit::Wavenumber).is_err());
        let b = parse_bands("575, 407", EnergyUnit::Nanometre).unwrap();
        assert_relative_eq!(b[0], 17_391.3, epsilon = 0.1);
    }
}
