//! `spinstate evans`: an Evans-method NMR shift to χ_M, χ_M·T, μ_eff and unpaired electrons.

use super::common::{emit, OutputArgs};
use super::measured::{measured, positive, CompareArgs, DiaArgs, UnitArgs};
use super::{Failure, Output};
use spinstate::measured::evans::{self, EvansInput, MagnetGeometry, Shift, SolventTerms};
use spinstate::report::measured::{MeasuredMomentReport, EVANS_SAFETY};
use spinstate::tables::DataSet;

#[derive(Debug, clap::Args)]
#[command(
    group(clap::ArgGroup::new("shift").required(true).args(["shift_hz", "shift_ppm"])),
    group(clap::ArgGroup::new("amount").required(true).args(["conc", "mass"])),
    after_help = EVANS_SAFETY
)]
pub struct Args {
    /// Shift of the reference line, solution line minus pure-solvent (insert) line, in Hz;
    /// positive for a paramagnet in a solenoid, negative across the field.
    #[arg(long, value_name = "HZ", allow_hyphen_values = true)]
    pub shift_hz: Option<f64>,
    /// The same shift in ppm (no --freq-mhz needed).
    #[arg(long, value_name = "PPM", allow_hyphen_values = true)]
    pub shift_ppm: Option<f64>,
    /// Uncertainty of the shift, in the unit of the shift given.
    #[arg(long, value_name = "HZ|PPM", default_value_t = 0.0)]
    pub shift_err: f64,
    /// Spectrometer frequency of the observed nucleus in MHz (e.g. 400 for ¹H at 9.4 T).
    #[arg(long, value_name = "MHZ", allow_hyphen_values = true)]
    pub freq_mhz: Option<f64>,
    /// Concentration of the paramagnet in mol/L.
    #[arg(long, value_name = "MOL/L", allow_hyphen_values = true)]
    pub conc: Option<f64>,
    /// Uncertainty of --conc in mol/L.
    #[arg(long, value_name = "MOL/L", default_value_t = 0.0)]
    pub conc_err: f64,
    /// Mass of paramagnet dissolved, in mg (with --volume and --formula or --molar-mass).
    #[arg(
        long,
        value_name = "MG",
        requires = "volume",
        allow_hyphen_values = true
    )]
    pub mass: Option<f64>,
    /// Uncertainty of --mass in mg.
    #[arg(long, value_name = "MG", default_value_t = 0.0)]
    pub mass_err: f64,
    /// Volume of the solution in mL.
    #[arg(long, value_name = "ML", requires = "mass", allow_hyphen_values = true)]
    pub volume: Option<f64>,
    /// Uncertainty of --volume in mL.
    #[arg(long, value_name = "ML", default_value_t = 0.0)]
    pub volume_err: f64,
    /// Sample (probe) temperature in K.
    #[arg(long, value_name = "K", allow_hyphen_values = true)]
    pub temp: f64,
    /// Uncertainty of --temp in K.
    #[arg(long, value_name = "K", default_value_t = 0.0)]
    pub temp_err: f64,
    /// Magnet geometry: solenoid (field along the tube, superconducting magnets) or transverse
    /// (field across the tube, electromagnets and permanent magnets).
    #[arg(long, value_name = "GEOMETRY", default_value = "solenoid", value_parser = ["solenoid", "transverse"])]
    pub magnet: String,
    /// Add the solvent term χ₀·MW with this solvent mass susceptibility χ₀ in cm³/g (off by
    /// default; its use is disputed).
    #[arg(long, value_name = "CM3/G", allow_hyphen_values = true)]
    pub solvent_chi: Option<f64>,
    /// Density of the pure solvent in g/mL (with --solution-density and --solvent-chi: adds the
    /// density term).
    #[arg(long, value_name = "G/ML", requires_all = ["solution_density", "solvent_chi"])]
    pub solvent_density: Option<f64>,
    /// Density of the solution in g/mL.
    #[arg(long, value_name = "G/ML", requires = "solvent_density")]
    pub solution_density: Option<f64>,
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
    let temp = positive("--temp", args.temp, "K")?;
    let temperature = measured("--temp", temp, args.temp_err)?;
    let shift = match (args.shift_hz, args.shift_ppm) {
        (Some(hz), _) => {
            let freq = args.freq_mhz.ok_or_else(|| {
                Failure::usage("--shift-hz needs --freq-mhz (or give --shift-ppm)")
            })?;
            Shift::Hertz {
                shift: measured("--shift", hz, args.shift_err)?,
                freq_mhz: positive("--freq-mhz", freq, "MHz")?,
            }
        }
        (None, Some(ppm)) => Shift::Ppm(measured("--shift", ppm, args.shift_err)?),
        (None, None) => {
            return Err(Failure::usage(
                "give --shift-hz (with --freq-mhz) or --shift-ppm",
            ))
        }
    };
    let magnet: MagnetGeometry = args.magnet.parse()?;
    let resolved = args.dia.resolve(data)?;
    let concentration = match (args.conc, args.mass, args.volume) {
        (Some(c), _, _) => {
            positive("--conc", c, "mol/L")?;
            measured("--conc", c, args.conc_err)?
        }
        (None, Some(m), Some(v)) => {
            let mw = resolved.molar_mass.ok_or_else(|| {
                Failure::usage("--mass and --volume need --formula or --molar-mass")
            })?;
            let m = measured("--mass", positive("--mass", m, "mg")?, args.mass_err)?;
            let v = measured("--volume", positive("--volume", v, "mL")?, args.volume_err)?;
            evans::concentration_from_mass(m, v, mw)?
        }
        _ => {
            return Err(Failure::usage(
                "give --conc (mol/L), or --mass (mg) with --volume (mL)",
            ))
        }
    };
    let input = EvansInput {
        shift,
        magnet,
        concentration,
        molar_mass: resolved.molar_mass,
        solvent: SolventTerms {
            chi0: args.solvent_chi,
            densities: args.solvent_density.zip(args.solution_density),
        },
        temperature,
        dia: resolved.dia_measured,
    };
    let result = evans::evans(&input)?;
    let comparison = args
        .compare
        .run(result.moment.mu_eff, data, Some(args.temp))?;
    let report = MeasuredMomentReport::new(
        "evans",
        units,
        &result.moment,
        &resolved.dia,
        resolved.formula.as_ref().map(|f| f.text().to_string()),
        resolved.molar_mass,
        Some((
            &result,
            magnet.name(),
            concentration.value,
            concentration.err,
        )),
        comparison.as_ref().map(|(c, dn, g)| (c, *dn, g.as_str())),
        EVANS_SAFETY,
    );
    emit(&report, &(), args.output.asked())
}
