//! Magnetometer (SQUID, VSM) readings to a molar susceptibility.
//!
//! cgs: χ_M (cm³ mol⁻¹) = M (emu) · MW (g mol⁻¹) / (mass (g) · H (Oe)) after subtracting the
//! sample-holder signal (common practice). SI: χ_M (m³ mol⁻¹) = μ₀ · m (A m²) · MW (kg mol⁻¹) /
//! (mass (kg) · B (T)) [C, the same relation in SI units]. Valid in the linear (low-field,
//! not saturated) regime, where M is proportional to H.

use super::Measured;
use crate::error::{Error, Result};
use crate::param::Param;
use crate::units::{self, SusceptibilityUnits, VACUUM_PERMEABILITY};

/// A magnetometer reading.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MagnetometerReading {
    /// Sample moment: emu (cgs) or A m² (SI).
    pub moment: Measured,
    /// Sample-holder (background) moment to subtract, same unit.
    pub background: f64,
    /// Applied field: Oe (cgs) or T (SI, μ₀H).
    pub field: f64,
    /// Sample mass (mg).
    pub mass_mg: Measured,
    /// Molar mass (g mol⁻¹).
    pub molar_mass: f64,
    /// Unit system of `moment`, `background` and `field`.
    pub units: SusceptibilityUnits,
}

/// Molar susceptibility in cgs (cm³ mol⁻¹) from a magnetometer reading, with the uncertainty of
/// the moment and the mass propagated.
pub fn chi_from_magnetometer(r: &MagnetometerReading) -> Result<Measured> {
    if !r.field.is_finite() || r.field <= 0.0 {
        let unit = field_unit(r.units);
        return Err(Error::invalid(
            Param::Field,
            format!("{} {unit}", r.field),
            format!("a field > 0 {unit}"),
        ));
    }
    let mass = r.mass_mg.require_positive(Param::SampleMass, "mg")?;
    if !r.molar_mass.is_finite() || r.molar_mass <= 0.0 {
        return Err(Error::invalid(
            Param::MolarMass,
            format!("{} g/mol", r.molar_mass),
            "a molar mass > 0 g/mol",
        ));
    }
    if !r.background.is_finite() {
        return Err(Error::invalid(
            Param::Background,
            r.background,
            "a finite moment",
        ));
    }
    let net = r.moment.value - r.background;
    let (value, per_moment) = match r.units {
        SusceptibilityUnits::Cgs => {
            let k = r.molar_mass / (mass.value * 1e-3 * r.field);
            (net * k, k)
        }
        SusceptibilityUnits::Si => {
            let k = VACUUM_PERMEABILITY * (r.molar_mass * 1e-3) / (mass.value * 1e-6 * r.field);
            (units::molar_si_to_cgs(net * k), units::molar_si_to_cgs(k))
        }
    };
    let err = (per_moment * r.moment.err).hypot(value * mass.relative());
    Ok(Measured { value, err })
}

/// Unit of the applied field in a unit system.
pub fn field_unit(units: SusceptibilityUnits) -> &'static str {
    match units {
        SusceptibilityUnits::Cgs => "Oe",
        SusceptibilityUnits::Si => "T",
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    fn reading(units: SusceptibilityUnits, moment: f64, field: f64) -> MagnetometerReading {
        MagnetometerReading {
            moment: Measured::exact(moment),
            background: 0.0,
            field,
            mass_mg: Measured::exact(20.0),
            molar_mass: 500.0,
            units,
        }
    }

    // χ_M = M·MW/(mass·H) (common practice): 2.45×10⁻⁴ emu, 20 mg, MW 500, 1000 Oe →
    // 2.45e-4·500/(0.020·1000) = 6.125×10⁻³ cm³ mol⁻¹, an arithmetic check.
    #[test]
    fn cgs_formula() {
        let chi =
            chi_from_magnetometer(&reading(SusceptibilityUnits::Cgs, 2.45e-4, 1000.0)).unwrap();
        assert_relative_eq!(
            chi.value,
            2.45e-4 * 500.0 / (0.020 * 1000.0),
            max_relative = 1e-12
        );
        assert_relative_eq!(chi.value, 6.125e-3, max_relative = 1e-12);
    }

    // The same measurement in SI: 1 emu = 10⁻³ A m², 1000 Oe ↔ μ₀H = 0.1 T; the SI formula must
    // give χ_SI = 4π×10⁻⁶ χ_cgs (CRC Handbook of Chemistry and Physics, note on
    // magnetic susceptibility units; the factors computed here).
    #[test]
    fn si_formula_agrees_with_cgs() {
        let cgs =
            chi_from_magnetometer(&reading(SusceptibilityUnits::Cgs, 2.45e-4, 1000.0)).unwrap();
        let si = chi_from_magnetometer(&reading(SusceptibilityUnits::Si, 2.45e-7, 0.1)).unwrap();
        assert_relative_eq!(si.value, cgs.value, max_relative = 1e-8);
    }

    #[test]
    fn background_and_uncertainty() {
        let mut r = reading(SusceptibilityUnits::Cgs, 2.50e-4, 1000.0);
        r.background = 0.05e-4;
        r.moment.err = 2.5e-6; // 1 %
        r.mass_mg.err = 0.2; // 1 %
        let chi = chi_from_magnetometer(&r).unwrap();
        assert_relative_eq!(chi.value, 6.125e-3, max_relative = 1e-12);
        let expected = (500.0f64 / 20.0 * 2.5e-6).hypot(6.125e-3 * 0.01);
        assert_relative_eq!(chi.err, expected, max_relative = 1e-12);
    }

    #[test]
    fn bad_readings() {
        assert!(chi_from_magnetometer(&reading(SusceptibilityUnits::Cgs, 1e-4, 0.0)).is_err());
        let mut r = reading(SusceptibilityUnits::Cgs, 1e-4, 1000.0);
        r.mass_mg = Measured::exact(-1.0);
        assert!(chi_from_magnetometer(&r).is_err());
        r.mass_mg = Measured::exact(10.0);
        r.molar_mass = 0.0;
        assert!(chi_from_magnetometer(&r).is_err());
    }
}
