//! Options shared by `evans` and `moment`: the diamagnetic correction, the formula and molar
//! mass, units, uncertainties and the spin-state comparison.

use super::Failure;
use spinstate::engine::Geometry;
use spinstate::formula::Formula;
use spinstate::measured::compare::{self, Comparison, MomentQuery, SpinOrbit};
use spinstate::measured::pascal::{self, DiamagneticCorrection};
use spinstate::measured::Measured;
use spinstate::tables::DataSet;
use spinstate::units::SusceptibilityUnits;

/// Diamagnetic correction, formula and molar mass.
#[derive(Debug, Clone, clap::Args)]
pub struct DiaArgs {
    /// Diamagnetic correction χ_D in cm³/mol, always cgs (the unit of Pascal's tables), ≤ 0,
    /// e.g. -2.5e-4. Without it, --formula gives a Pascal sum.
    #[arg(long, value_name = "CM3/MOL", allow_hyphen_values = true)]
    pub dia: Option<f64>,
    /// Uncertainty of χ_D in cm³/mol.
    #[arg(long, value_name = "CM3/MOL", default_value_t = 0.0)]
    pub dia_err: f64,
    /// Use the rough rule χ_D ≈ −(MW/2)×10⁻⁶ cm³/mol (an order of magnitude only).
    #[arg(long, conflicts_with = "dia")]
    pub dia_rough: bool,
    /// Molecular formula, e.g. "K4[Fe(CN)6]·3H2O" or "[Fe2+]{py}4({NCS-})2" with {name} entries
    /// of the Pascal table (ions, ligands, solvents, N(ring), C=O …); gives the molar mass and
    /// the Pascal sum.
    #[arg(long, value_name = "FORMULA")]
    pub formula: Option<String>,
    /// Molar mass in g/mol (overrides the one from --formula).
    #[arg(long, value_name = "G/MOL", allow_hyphen_values = true)]
    pub molar_mass: Option<f64>,
}

/// The resolved correction, formula and molar mass.
pub struct Resolved {
    pub dia: DiamagneticCorrection,
    pub dia_measured: Measured,
    pub formula: Option<Formula>,
    pub molar_mass: Option<f64>,
}

impl DiaArgs {
    pub fn resolve(&self, data: &DataSet) -> Result<Resolved, Failure> {
        let formula = match &self.formula {
            Some(text) => {
                let table = data.pascal()?;
                Some(
                    table
                        .parse_formula(text)
                        .map_err(|e| Failure::usage(format!("--formula: {e}")))?,
                )
            }
            None => None,
        };
        if let Some(mw) = self.molar_mass {
            if !mw.is_finite() || mw <= 0.0 {
                return Err(Failure::usage(format!(
                    "--molar-mass {mw} must be > 0 g/mol"
                )));
            }
        }
        let molar_mass = self
            .molar_mass
            .or(formula.as_ref().map(Formula::molar_mass));
        if !self.dia_err.is_finite() || self.dia_err < 0.0 {
            return Err(Failure::usage(format!(
                "--dia-err {} must be ≥ 0 cm³/mol",
                self.dia_err
            )));
        }
        let dia = if let Some(v) = self.dia {
            DiamagneticCorrection::given(v).map_err(|_| {
                Failure::usage(format!(
                    "--dia {v} must be ≤ 0 cm³/mol: diamagnetic corrections are negative (e.g. -2.5e-4)"
                ))
            })?
        } else if self.dia_rough {
            let mw = molar_mass
                .ok_or_else(|| Failure::usage("--dia-rough needs --formula or --molar-mass"))?;
            pascal::rough_correction(mw)?
        } else if let Some(f) = &formula {
            let table = data.pascal()?;
            pascal::pascal_sum(f, table).map_err(|e| match e {
                e @ spinstate::Error::InvalidParameter { .. } => Failure::from(e),
                e => Failure::usage(format!("--formula: {e}")),
            })?
        } else {
            DiamagneticCorrection::none()
        };
        let dia_measured = Measured::new(spinstate::Param::Dia, dia.value, self.dia_err)?;
        Ok(Resolved {
            dia,
            dia_measured,
            formula,
            molar_mass,
        })
    }
}

/// Unit system of the susceptibilities.
#[derive(Debug, Clone, clap::Args)]
pub struct UnitArgs {
    /// Unit system for susceptibility input and output: cgs (cm³/mol) or si (m³/mol).
    #[arg(long, value_name = "SYSTEM", default_value = "cgs", value_parser = ["cgs", "si"])]
    pub units: String,
}

impl UnitArgs {
    pub fn units(&self) -> Result<SusceptibilityUnits, Failure> {
        self.units
            .parse::<SusceptibilityUnits>()
            .map_err(|e| Failure::usage(format!("--units: {e}")))
    }
}

/// The complex, for comparing the moment with both spin states.
#[derive(Debug, Clone, clap::Args)]
pub struct CompareArgs {
    /// Number of d electrons (0..=10): compare μ_eff with the spin states of d^N.
    #[arg(
        long,
        value_name = "N",
        requires = "geometry",
        conflicts_with = "metal"
    )]
    pub dn: Option<usize>,
    /// Geometry for the comparison: oct, tet, sqpl or tetragonal.
    #[arg(long, value_name = "G", value_parser = super::common::parsed::<spinstate::engine::Geometry>)]
    pub geometry: Option<spinstate::engine::Geometry>,
    /// Dq in cm⁻¹ (Δ = 10Dq; Δt/10 for tet), for the A/E-term spin–orbit correction.
    #[arg(
        long,
        value_name = "CM-1",
        requires = "geometry",
        allow_hyphen_values = true
    )]
    pub dq: Option<f64>,
    /// One-electron spin–orbit constant ζ in cm⁻¹ (> 0).
    #[arg(
        long,
        value_name = "CM-1",
        requires = "geometry",
        conflicts_with = "lambda",
        allow_hyphen_values = true
    )]
    pub zeta: Option<f64>,
    /// Many-electron λ of the high-spin ground term in cm⁻¹ (e.g. -324 for Ni²⁺, 91 for Cr³⁺).
    #[arg(
        long,
        value_name = "CM-1",
        requires = "geometry",
        allow_hyphen_values = true
    )]
    pub lambda: Option<f64>,
    #[command(flatten)]
    pub complex: super::common::ComplexArgs,
}

impl CompareArgs {
    /// The comparison, when --dn and --geometry (or --metal, --ox, --geometry, --ligand) were
    /// given. `temperature` (K) lets T ground terms use the full ligand-field moment.
    pub fn run(
        &self,
        mu: Measured,
        data: &DataSet,
        temperature: Option<f64>,
    ) -> Result<Option<(Comparison, usize, String)>, Failure> {
        let Some(g) = &self.geometry else {
            if self.complex.metal.is_some() {
                return Err(Failure::usage(
                    "--metal needs --geometry (oct, tet or sqpl) for the comparison",
                ));
            }
            return Ok(None);
        };
        let geometry: Geometry = *g;
        let mut zeta = self.zeta;
        let mut dq = self.dq;
        let mut dq_low_spin = None;
        let mut b = None;
        let dn = match (self.complex.resolve(geometry, data)?, self.dn) {
            (Some(complex), _) => {
                if zeta.is_none() && self.lambda.is_none() {
                    zeta = complex.ion.zeta;
                }
                if dq.is_none() {
                    // Each spin state at its own bond length, as the estimator has them.
                    dq = Some(complex.delta_high_spin.value / 10.0);
                    dq_low_spin = Some(complex.delta_low_spin.value / 10.0);
                }
                b = Some(complex.b.value);
                complex.ion.dn
            }
            (None, Some(dn)) => dn,
            (None, None) => {
                return Err(Failure::usage(
                    "--geometry for the comparison needs --dn N or --metal/--ox/--ligand",
                ))
            }
        };
        if dn > 10 {
            return Err(Failure::usage(format!("--dn {dn} is outside 0..=10")));
        }
        let spin_orbit = match (zeta, self.lambda) {
            (Some(z), _) => Some(SpinOrbit::Zeta(z)),
            (None, Some(l)) => Some(SpinOrbit::Lambda(l)),
            _ => None,
        };
        let spec = MomentQuery {
            dq,
            dq_low_spin,
            spin_orbit,
            b,
            temperature,
            ..MomentQuery::new(dn, geometry)
        };
        let ranges = data.moment_ranges()?;
        let states = compare::expectations(&spec, ranges)?;
        Ok(Some((
            compare::compare(mu, states),
            dn,
            geometry.name().to_string(),
        )))
    }
}

/// A positive value of an option, or a usage failure naming it.
pub fn positive(option: &str, value: f64, unit: &str) -> Result<f64, Failure> {
    if value.is_finite() && value > 0.0 {
        Ok(value)
    } else {
        Err(Failure::usage(format!(
            "{option} {value} must be > 0 {unit}"
        )))
    }
}

/// A value with its uncertainty from two options.
pub fn measured(option: &str, value: f64, err: f64) -> Result<Measured, Failure> {
    if !err.is_finite() || err < 0.0 {
        return Err(Failure::usage(format!("{option}-err {err} must be ≥ 0")));
    }
    if !value.is_finite() {
        return Err(Failure::usage(format!(
            "{option} {value} is not a finite number"
        )));
    }
    Ok(Measured { value, err })
}
