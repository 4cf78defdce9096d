//! `spinstate moment`: a measured χ_M, χ_M·T, μ_eff or magnetometer reading to χ_M, χ_M·T,
//! μ_eff and unpaired electrons.

use super::common::{emit, OutputArgs};
use super::measured::{measured, positive, CompareArgs, DiaArgs, UnitArgs};
use super::{Failure, Output};
use spinstate::measured::moment::{chi_from_magnetometer, MagnetometerReading};
use spinstate::measured::{Measured, MomentResult};
use spinstate::report::measured::{MeasuredMomentReport, MOMENT_SAFETY};
use spinstate::tables::DataSet;
use spinstate::units::SusceptibilityUnits;

#[derive(Debug, clap::Args)]
#[command(
    group(clap::ArgGroup::new("input").required(true).args(["chi", "chi_t", "mu_eff", "magnetisation"])),
    after_help = MOMENT_SAFETY
)]
pub struct Args {
    /// Measured molar susceptibility χ_M (before the diamagnetic correction), in cm³/mol, or
    /// m³/mol with --units si.
    #[arg(long, value_name = "CHI", allow_hyphen_values = true)]
    pub chi: Option<f64>,
    /// Uncertainty of --chi (same unit).
    #[arg(long, value_name = "CHI", default_value_t = 0.0)]
    pub chi_err: f64,
    /// Corrected χ_M·T in cm³ K/mol (m³ K/mol with --units si).
    #[arg(long, value_name = "CHI-T", allow_hyphen_values = true)]
    pub chi_t: Option<f64>,
    /// Uncertainty of --chi-t (same unit).
    #[arg(long, value_name = "CHI-T", default_value_t = 0.0)]
    pub chi_t_err: f64,
    /// Effective moment in μB (already corrected).
    #[arg(long, value_name = "MUB", allow_hyphen_values = true)]
    pub mu_eff: Option<f64>,
    /// Uncertainty of --mu-eff in μB.
    #[arg(long, value_name = "MUB", default_value_t = 0.0)]
    pub mu_eff_err: f64,
    /// Magnetometer (SQUID/VSM) sample moment: emu (cgs) or A·m² (--units si). Needs --field,
    /// --sample-mass and --formula or --molar-mass.
    #[arg(long, value_name = "M", allow_hyphen_values = true, requires_all = ["field", "sample_mass"])]
    pub magnetisation: Option<f64>,
    /// Uncertainty of --magnetisation (same unit).
    #[arg(long, value_name = "M", default_value_t = 0.0)]
    pub magnetisation_err: f64,
    /// Sample-holder (background) moment to subtract, same unit as --magnetisation.
    #[arg(
        long,
        value_name = "M",
        default_value_t = 0.0,
        allow_hyphen_values = true
    )]
    pub background: f64,
    /// Applied field: Oe (cgs) or T (--units si).
    #[arg(long, value_name = "H", allow_hyphen_values = true)]
    pub field: Option<f64>,
    /// Sample mass in mg.
    #[arg(long, value_name = "MG", allow_hyphen_values = true)]
    pub sample_mass: Option<f64>,
    /// Uncertainty of --sample-mass in mg.
    #[arg(long, value_name = "MG", default_value_t = 0.0)]
    pub sample_mass_err: f64,
    /// Temperature of the measurement in K.
    #[arg(long, value_name = "K", allow_hyphen_values = true)]
    pub temp: f64,
    /// Uncertainty of --temp in K.
    #[arg(long, value_name = "K", default_value_t = 0.0)]
    pub temp_err: f64,
    #[command(flatten)]
    pub dia: DiaArgs,
    #[command(flatten)]
    pub units: UnitArgs,
    #[command(flatten)]
    pub compare: CompareArgs,
    #[command(flatten)]
    pub output: OutputArgs,
}

pub fn run(args: &Args, data: &DataSet) -> Result<Output, Failure> {
    let units = args.units.units()?;
    let temperature = measured("--temp", positive("--temp", args.temp, "K")?, args.temp_err)?;
    let resolved = args.dia.resolve(data)?;
    let dia = resolved.dia_measured;
    let to_cgs = |m: Measured| Measured {
        value: units.to_cgs(m.value),
        err: units.to_cgs(m.err).abs(),
    };
    let result = if let Some(chi) = args.chi {
        MomentResult::from_chi(
            to_cgs(measured("--chi", chi, args.chi_err)?),
            dia,
            temperature,
        )?
    } else if let Some(chi_t) = args.chi_t {
        MomentResult::from_chi_t(
            to_cgs(measured("--chi-t", chi_t, args.chi_t_err)?),
            dia,
            temperature,
        )?
    } else if let Some(mu) = args.mu_eff {
        if mu < 0.0 {
            return Err(Failure::usage(format!("--mu-eff {mu} must be ≥ 0 μB")));
        }
        MomentResult::from_mu_eff(measured("--mu-eff", mu, args.mu_eff_err)?, dia, temperature)?
    } else if let Some(m) = args.magnetisation {
        let field = args
            .field
            .ok_or_else(|| Failure::usage("--magnetisation needs --field"))?;
        let unit = if units == SusceptibilityUnits::Cgs {
            "Oe"
        } else {
            "T"
        };
        let mass = args
            .sample_mass
            .ok_or_else(|| Failure::usage("--magnetisation needs --sample-mass (mg)"))?;
        let molar_mass = resolved
            .molar_mass
            .ok_or_else(|| Failure::usage("--magnetisation needs --formula or --molar-mass"))?;
        let reading = MagnetometerReading {
            moment: measured("--magnetisation", m, args.magnetisation_err)?,
            background: args.background,
            field: positive("--field", field, unit)?,
            mass_mg: measured(
                "--sample-mass",
                positive("--sample-mass", mass, "mg")?,
                args.sample_mass_err,
            )?,
            molar_mass,
            units,
        };
        MomentResult::from_chi(chi_from_magnetometer(&reading)?, dia, temperature)?
    } else {
        return Err(Failure::usage(
            "give one of --chi, --chi-t, --mu-eff or --magnetisation",
        ));
    };
    let comparison = args.compare.run(result.mu_eff, data, Some(args.temp))?;
    let report = MeasuredMomentReport::new(
        "moment",
        units,
        &result,
        &resolved.dia,
        resolved.formula.as_ref().map(|f| f.text().to_string()),
        resolved.molar_mass,
        None,
        comparison.as_ref().map(|(c, dn, g)| (c, *dn, g.as_str())),
        MOMENT_SAFETY,
    );
    emit(&report, &(), args.output.asked())
}
