//! The Evans NMR method: the shift of an inert reference line between a paramagnetic solution
//! and the pure solvent gives the volume susceptibility of the solution.
//!
//! D. F. Evans, *J. Chem. Soc.* 1959, 2003 (field across the tube); D. H. Live, S. I. Chan,
//! *Anal. Chem.* 1970, 42, 791, and E. M. Schubert, *J. Chem. Educ.* 1992, 69, 62 (field along
//! the tube of a superconducting solenoid); references from memory. For a long cylinder the
//! fractional shift is
//!
//!   Δf/f = (4π/3 − α) κ        (cgs volume susceptibility κ)
//!
//! with the Lorentz-cavity term 4π/3 and the shape factor α = 0 (cylinder along the field,
//! solenoid) or α = 2π (across the field, electromagnet or permanent magnet). So
//!
//!   χ_M = 1000 κ / c = 1000 (Δf/f) / ((4π/3 − α) c)     (c in mol L⁻¹, χ_M in cm³ mol⁻¹),
//!
//! i.e. χ_M = 3000 Δf / (4π f c) for the solenoid and −3000 Δf / (2π f c) across the field.
//!
//! **Sign convention (explicit):** Δf = f(reference line of the solution) − f(reference line of
//! the pure-solvent insert), in Hz, on the frequency scale (downfield = higher δ = positive). A
//! paramagnetic solute gives Δf > 0 in a solenoid and Δf < 0 in a transverse magnet, half as
//! large for the same sample.
//!
//! Optional solvent terms (off by default, because their use is disputed: D. H. Grant,
//! *J. Chem. Educ.* 1995, 72, 39; C. Piguet, *J. Chem. Educ.* 1997, 74, 815, from memory), with
//! the mass susceptibility of the solvent χ₀ (cm³ g⁻¹) and the densities d₀ of the solvent and
//! d_s of the solution (g mL⁻¹), from χ_g = … + χ₀ + χ₀(d₀ − d_s)/m:
//!
//!   χ_M += χ₀·MW            (solvent term; needs the molar mass)
//!   χ_M += 1000 χ₀ (d₀ − d_s) / c     (density term)

use super::{Measured, MomentResult};
use crate::error::{Error, Result};
use crate::param::Param;
use std::f64::consts::PI;
use std::fmt;
use std::str::FromStr;

/// Orientation of the sample tube in the magnetic field.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum MagnetGeometry {
    /// Field along the tube (superconducting solenoid): shape factor α = 0.
    #[default]
    Solenoid,
    /// Field across the tube (electromagnet, permanent magnet): shape factor α = 2π.
    Transverse,
}

impl MagnetGeometry {
    pub fn name(self) -> &'static str {
        match self {
            MagnetGeometry::Solenoid => "solenoid",
            MagnetGeometry::Transverse => "transverse",
        }
    }

    /// Shape (demagnetising) factor α of a long cylinder in cgs.
    pub fn shape_factor(self) -> f64 {
        match self {
            MagnetGeometry::Solenoid => 0.0,
            MagnetGeometry::Transverse => 2.0 * PI,
        }
    }

    /// 4π/3 − α: Δf/f per unit of κ (positive for the solenoid, negative across the field).
    pub fn shift_per_kappa(self) -> f64 {
        4.0 * PI / 3.0 - self.shape_factor()
    }

    /// The sign a paramagnetic solute gives to Δf (+1 or −1).
    pub fn paramagnetic_sign(self) -> f64 {
        self.shift_per_kappa().signum()
    }
}

impl fmt::Display for MagnetGeometry {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

impl FromStr for MagnetGeometry {
    type Err = Error;
    fn from_str(s: &str) -> Result<Self> {
        match s.trim().to_lowercase().as_str() {
            "solenoid" | "superconducting" | "parallel" => Ok(MagnetGeometry::Solenoid),
            "transverse" | "electromagnet" | "perpendicular" => Ok(MagnetGeometry::Transverse),
            _ => Err(Error::Unknown {
                kind: crate::error::NameKind::MagnetGeometry,
                name: s.to_string(),
                suggestions: crate::error::closest_names(s, ["solenoid", "transverse"]),
            }),
        }
    }
}

/// The measured shift of the reference line (solution − insert).
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Shift {
    /// Δf in Hz with the spectrometer frequency of the observed nucleus in MHz.
    Hertz { shift: Measured, freq_mhz: f64 },
    /// Δδ in ppm.
    Ppm(Measured),
}

impl Shift {
    /// Δf/f, dimensionless, with its uncertainty.
    pub fn fractional(&self) -> Result<Measured> {
        match *self {
            Shift::Hertz { shift, freq_mhz } => {
                if !freq_mhz.is_finite() || freq_mhz <= 0.0 {
                    return Err(Error::invalid(
                        Param::SpectrometerFrequency,
                        format!("{freq_mhz} MHz"),
                        "a frequency > 0 MHz (e.g. 400)",
                    ));
                }
                let f = freq_mhz * 1e6;
                Ok(Measured {
                    value: shift.value / f,
                    err: shift.err / f,
                })
            }
            Shift::Ppm(s) => Ok(Measured {
                value: s.value * 1e-6,
                err: s.err * 1e-6,
            }),
        }
    }

    /// Δδ in ppm.
    pub fn ppm(&self) -> Result<Measured> {
        let f = self.fractional()?;
        Ok(Measured {
            value: f.value * 1e6,
            err: f.err * 1e6,
        })
    }

    fn describe(&self) -> String {
        match self {
            Shift::Hertz { shift, .. } => format!("{} Hz", shift.value),
            Shift::Ppm(s) => format!("{} ppm", s.value),
        }
    }
}

/// Optional solvent corrections (both off by default).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct SolventTerms {
    /// Mass susceptibility of the solvent χ₀ (cm³ g⁻¹, negative).
    pub chi0: Option<f64>,
    /// Densities (g mL⁻¹) of the pure solvent d₀ and of the solution d_s.
    pub densities: Option<(f64, f64)>,
}

/// Everything an Evans calculation needs.
#[derive(Debug, Clone, PartialEq)]
pub struct EvansInput {
    pub shift: Shift,
    pub magnet: MagnetGeometry,
    /// Concentration of the paramagnet (mol L⁻¹).
    pub concentration: Measured,
    /// Molar mass of the paramagnet (g mol⁻¹), needed only for the χ₀ term.
    pub molar_mass: Option<f64>,
    pub solvent: SolventTerms,
    /// Sample temperature (K).
    pub temperature: Measured,
    /// Diamagnetic correction χ_D (cm³ mol⁻¹, ≤ 0).
    pub dia: Measured,
}

/// Result of an Evans calculation (cgs-emu).
#[derive(Debug, Clone, PartialEq)]
pub struct EvansResult {
    /// Δf/f (dimensionless).
    pub fractional_shift: Measured,
    /// The leading term 1000 (Δf/f)/((4π/3 − α) c) (cm³ mol⁻¹).
    pub chi_shift_term: Measured,
    /// χ₀·MW (cm³ mol⁻¹), 0 when off.
    pub solvent_term: f64,
    /// 1000 χ₀ (d₀ − d_s)/c (cm³ mol⁻¹), 0 when off.
    pub density_term: f64,
    /// χ_M, moment and unpaired electrons.
    pub moment: MomentResult,
    pub notes: Vec<String>,
}

/// Concentration (mol L⁻¹) from the mass of solute (mg), the solution volume (mL) and the molar
/// mass (g mol⁻¹): c = m / (MW · V); relative uncertainties added in quadrature.
pub fn concentration_from_mass(
    mass_mg: Measured,
    volume_ml: Measured,
    molar_mass: f64,
) -> Result<Measured> {
    let mass_mg = mass_mg.require_positive(Param::SoluteMass, "mg")?;
    let volume_ml = volume_ml.require_positive(Param::SolutionVolume, "mL")?;
    if !molar_mass.is_finite() || molar_mass <= 0.0 {
        return Err(Error::invalid(
            Param::MolarMass,
            format!("{molar_mass} g/mol"),
            "a molar mass > 0 g/mol",
        ));
    }
    let c = mass_mg.value / (molar_mass * volume_ml.value);
    Ok(Measured {
        value: c,
        err: c * mass_mg.relative().hypot(volume_ml.relative()),
    })
}

/// Runs the Evans calculation. Rejects a non-positive concentration or temperature and a shift
/// whose sign contradicts the magnet geometry (unless it is zero within its uncertainty).
pub fn evans(input: &EvansInput) -> Result<EvansResult> {
    let c = input
        .concentration
        .require_positive(Param::Concentration, "mol/L")?;
    if input.temperature.value <= 0.0 {
        return Err(Error::invalid(
            Param::Temperature,
            format!("{} K", input.temperature.value),
            "a temperature > 0 K (e.g. 298.15)",
        ));
    }
    let frac = input.shift.fractional()?;
    let mut notes = Vec::new();
    let sign = input.magnet.paramagnetic_sign();
    if frac.value * sign < 0.0 {
        if frac.value.abs() > frac.err {
            let (expected, other) = match input.magnet {
                MagnetGeometry::Solenoid => ("positive", "transverse"),
                MagnetGeometry::Transverse => ("negative", "solenoid"),
            };
            return Err(Error::invalid(
                Param::Shift,
                input.shift.describe(),
                format!(
                    "a {expected} shift for the {} magnet geometry: a paramagnet moves the solution's reference line to {} frequency. Give the shift as (solution line − insert line); if you subtracted the other way, change its sign; if the field runs {} the tube, use the {other} magnet geometry",
                    input.magnet,
                    if expected == "positive" { "higher" } else { "lower" },
                    if other == "transverse" { "across" } else { "along" },
                ),
            )
            .needing([Param::Magnet]));
        }
        notes.push("the shift has the diamagnetic sign but is zero within its uncertainty".into());
    }
    let k = 1000.0 / input.magnet.shift_per_kappa();
    let chi_shift = Measured {
        value: k * frac.value / c.value,
        err: (k * frac.err / c.value).hypot(k * frac.value * c.err / (c.value * c.value)),
    };
    let mut solvent_term = 0.0;
    let mut density_term = 0.0;
    if let Some(chi0) = input.solvent.chi0 {
        if !chi0.is_finite() {
            return Err(Error::invalid(
                Param::SolventChi,
                chi0,
                "a finite mass susceptibility in cm³/g",
            ));
        }
        if chi0 > 0.0 {
            notes.push(
                "the solvent χ₀ is positive; common solvents are diamagnetic (χ₀ < 0)".into(),
            );
        }
        let mw = input.molar_mass.ok_or_else(|| {
            Error::invalid(
                Param::SolventChiTerm,
                "no molar mass",
                "a molar mass of the paramagnet (given, or from its formula)",
            )
            .needing([Param::MolarMass, Param::Formula])
        })?;
        solvent_term = chi0 * mw;
        if let Some((d0, ds)) = input.solvent.densities {
            for (name, d) in [(Param::SolventDensity, d0), (Param::SolutionDensity, ds)] {
                if !d.is_finite() || d <= 0.0 {
                    return Err(Error::invalid(
                        name,
                        format!("{d} g/mL"),
                        "a density > 0 g/mL",
                    ));
                }
            }
            density_term = 1000.0 * chi0 * (d0 - ds) / c.value;
        }
        notes.push(
            "solvent χ₀ term included; whether it belongs is disputed (Grant 1995 vs Piguet 1997)"
                .into(),
        );
    } else if input.solvent.densities.is_some() {
        return Err(Error::invalid(
            Param::DensityTerm,
            "densities without χ₀",
            "the solvent mass susceptibility χ₀ as well",
        )
        .needing([Param::SolventChi]));
    }
    let chi_m = Measured {
        value: chi_shift.value + solvent_term + density_term,
        err: chi_shift.err,
    };
    let moment = MomentResult::from_chi(chi_m, input.dia, input.temperature)?;
    Ok(EvansResult {
        fractional_shift: frac,
        chi_shift_term: chi_shift,
        solvent_term,
        density_term,
        moment,
        notes,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    fn input(shift: Shift, magnet: MagnetGeometry) -> EvansInput {
        EvansInput {
            shift,
            magnet,
            concentration: Measured::exact(0.0125),
            molar_mass: Some(400.0),
            solvent: SolventTerms::default(),
            temperature: Measured::exact(298.15),
            dia: Measured::exact(0.0),
        }
    }

    fn hz(v: f64, err: f64) -> Shift {
        Shift::Hertz {
            shift: Measured::new(Param::Shift, v, err).unwrap(),
            freq_mhz: 400.0,
        }
    }

    // Worked example, computed here from the solenoid equation χ_M = 3Δf/(4π f c′) (Live & Chan, Anal. Chem.
    // 1970, 42, 791; Schubert, J. Chem. Educ. 1992, 69, 62; from memory): Δf = 73.4 Hz at
    // 400 MHz, c = 0.0125 mol/L → χ_M = 3000·73.4/(4π·400e6·0.0125) = 3.5046×10⁻³ cm³ mol⁻¹
    // (= 238.73 Δf/(f c)); χT at 298.15 K = 1.04490, μ_eff = 2.82787·√1.0449 = 2.8907 μB.
    #[test]
    fn worked_solenoid_example() {
        let r = evans(&input(hz(73.4, 0.0), MagnetGeometry::Solenoid)).unwrap();
        let expected = 3000.0 * 73.4 / (4.0 * PI * 400e6 * 0.0125);
        assert_relative_eq!(expected, 3.5046e-3, max_relative = 1e-4);
        assert_relative_eq!(r.moment.chi_m.value, expected, max_relative = 1e-12);
        assert_relative_eq!(
            r.moment.chi_m.value,
            238.73 * 73.4 / (400e6 * 0.0125),
            max_relative = 2e-5
        );
        assert_relative_eq!(r.moment.chi_m_t.value, 1.04490, max_relative = 1e-4);
        assert_relative_eq!(r.moment.mu_eff.value, 2.8907, epsilon = 2e-4);
        assert_eq!(r.moment.unpaired_nearest, 2);
    }

    // Ppm form: χ_M = 2.3873×10⁻⁴ Δδ/c (cgs), computed from the same equation.
    #[test]
    fn ppm_form_matches_hz_form() {
        let a = evans(&input(hz(73.4, 0.0), MagnetGeometry::Solenoid)).unwrap();
        let b = evans(&input(
            Shift::Ppm(Measured::exact(73.4 / 400.0)),
            MagnetGeometry::Solenoid,
        ))
        .unwrap();
        assert_relative_eq!(
            a.moment.chi_m.value,
            b.moment.chi_m.value,
            max_relative = 1e-12
        );
        assert_relative_eq!(
            b.moment.chi_m.value,
            2.3873e-4 * (73.4 / 400.0) / 0.0125,
            max_relative = 1e-4
        );
    }

    // Same sample in the two geometries: Δf/f = (4π/3 − α)κ gives a transverse shift half as
    // large and of opposite sign (D. F. Evans, J. Chem. Soc. 1959, 2003, vs Live & Chan 1970, from memory); both must
    // return the same χ_M.
    #[test]
    fn geometries_agree_for_the_same_sample() {
        let solenoid = evans(&input(hz(73.4, 0.0), MagnetGeometry::Solenoid)).unwrap();
        let transverse = evans(&input(hz(-36.7, 0.0), MagnetGeometry::Transverse)).unwrap();
        assert_relative_eq!(
            solenoid.moment.chi_m.value,
            transverse.moment.chi_m.value,
            max_relative = 1e-12
        );
        assert_relative_eq!(
            MagnetGeometry::Transverse.shift_per_kappa()
                / MagnetGeometry::Solenoid.shift_per_kappa(),
            -0.5,
            max_relative = 1e-15
        );
        // The transverse equation in its printed form −3Δf/(2π f c′).
        assert_relative_eq!(
            transverse.moment.chi_m.value,
            -3000.0 * -36.7 / (2.0 * PI * 400e6 * 0.0125),
            max_relative = 1e-12
        );
    }

    #[test]
    fn wrong_sign_is_rejected_with_a_fix() {
        let err = evans(&input(hz(-73.4, 0.5), MagnetGeometry::Solenoid)).unwrap_err();
        let e = err.to_string();
        assert!(
            e.contains("change its sign") && e.contains("use the transverse magnet geometry"),
            "{e}"
        );
        assert!(
            matches!(&err, Error::InvalidParameter { needs, .. } if needs == &[Param::Magnet]),
            "{err:?}"
        );
        let e = evans(&input(hz(36.7, 0.5), MagnetGeometry::Transverse))
            .unwrap_err()
            .to_string();
        assert!(
            e.contains("negative shift") && e.contains("use the solenoid magnet geometry"),
            "{e}"
        );
        // Zero within its uncertainty is accepted with a note.
        let r = evans(&input(hz(-0.2, 0.5), MagnetGeometry::Solenoid)).unwrap();
        assert!(r.notes[0].contains("zero within"));
    }

    #[test]
    fn bad_concentration_and_temperature() {
        let mut i = input(hz(73.4, 0.0), MagnetGeometry::Solenoid);
        i.concentration = Measured::exact(0.0);
        assert!(evans(&i).unwrap_err().to_string().contains("concentration"));
        i.concentration = Measured::exact(-0.01);
        assert!(evans(&i).unwrap_err().to_string().contains("concentration"));
        let mut i = input(hz(73.4, 0.0), MagnetGeometry::Solenoid);
        i.temperature = Measured::exact(0.0);
        assert!(evans(&i).unwrap_err().to_string().contains("temperature"));
        assert!(
            concentration_from_mass(Measured::exact(5.0), Measured::exact(0.0), 400.0).is_err()
        );
    }

    // Uncertainty: χ ∝ Δf/c, so relative errors add in quadrature (first-order propagation,
    // common practice): 1 % on Δf and 2 % on c give √5 % on χ and half that on μ_eff.
    #[test]
    fn uncertainty_propagation() {
        let mut i = input(hz(73.4, 0.734), MagnetGeometry::Solenoid);
        i.concentration = Measured::new(Param::Concentration, 0.0125, 0.00025).unwrap();
        let r = evans(&i).unwrap();
        let rel = 0.01f64.hypot(0.02);
        assert_relative_eq!(
            r.moment.chi_m.err / r.moment.chi_m.value,
            rel,
            max_relative = 1e-9
        );
        assert_relative_eq!(
            r.moment.mu_eff.err / r.moment.mu_eff.value,
            rel / 2.0,
            max_relative = 1e-9
        );
        // Concentration from weighing: 5.00 ± 0.05 mg in 0.600 ± 0.006 mL of MW 400 → 0.02083 M ± 1.41 %.
        let c = concentration_from_mass(
            Measured::new(Param::SoluteMass, 5.0, 0.05).unwrap(),
            Measured::new(Param::SolutionVolume, 0.6, 0.006).unwrap(),
            400.0,
        )
        .unwrap();
        assert_relative_eq!(c.value, 5.0 / (400.0 * 0.6), max_relative = 1e-12);
        assert_relative_eq!(c.relative(), 0.01f64.hypot(0.01), max_relative = 1e-9);
    }

    // Solvent terms (computed here): χ₀ for CH₂Cl₂ = −46.6/84.93 = −0.549×10⁻⁶ cm³ g⁻¹ (CRC Handbook molar
    // value, from memory); with MW 400 the χ₀·MW term is −2.2×10⁻⁴ cm³ mol⁻¹.
    #[test]
    fn solvent_terms_are_optional() {
        let mut i = input(hz(73.4, 0.0), MagnetGeometry::Solenoid);
        let base = evans(&i).unwrap();
        assert_eq!(base.solvent_term, 0.0);
        i.solvent.chi0 = Some(-46.6e-6 / 84.93);
        let with = evans(&i).unwrap();
        assert_relative_eq!(with.solvent_term, -2.195e-4, max_relative = 1e-3);
        assert_relative_eq!(
            with.moment.chi_m.value,
            base.moment.chi_m.value + with.solvent_term,
            max_relative = 1e-12
        );
        i.solvent.densities = Some((1.33, 1.32));
        let dens = evans(&i).unwrap();
        assert_relative_eq!(
            dens.density_term,
            1000.0 * i.solvent.chi0.unwrap() * 0.01 / 0.0125,
            max_relative = 1e-12
        );
        i.molar_mass = None;
        assert!(evans(&i).is_err());
    }
}
