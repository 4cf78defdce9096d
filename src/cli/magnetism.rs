//! `spinstate magnetism`: χ(T), χT and μ_eff from the full ligand field with spin–orbit coupling.

use super::common::{emit, ComplexArgs, CsvOutput, FieldArgs, OutputArgs, SvgOutput};
use super::{Failure, Output};
use spinstate::magnetism::{temperature_grid, MagneticModel, ZeemanLevels, G_ELECTRON};
use spinstate::plot::moment::{Point, Quantity};
use spinstate::report::magnetism::{MagnetismPoint, MagnetismReport, MomentPlot};
use spinstate::tables::DataSet;
use spinstate::units;
use std::path::{Path, PathBuf};

#[derive(Debug, clap::Args)]
#[command(
    mut_arg("csv", |a| a.help("Write every point as CSV to FILE ('-' for stdout)")),
    mut_arg("svg", |a| a.help("Write an SVG figure to FILE ('-' for stdout; μ_eff against T unless --plot chit)"))
)]
pub struct Args {
    #[command(flatten)]
    pub field: FieldArgs,
    #[command(flatten)]
    pub complex: ComplexArgs,
    /// Orbital reduction factor κ (0..=1) on L in the Zeeman term.
    #[arg(
        long,
        value_name = "K",
        default_value_t = 1.0,
        allow_hyphen_values = true
    )]
    pub kappa: f64,
    /// Multiply ζ by κ as well (covalency reduces spin–orbit coupling too).
    #[arg(long)]
    pub reduce_zeta: bool,
    /// Spin g value in the Zeeman term (default: free electron, 2.0023).
    #[arg(long, value_name = "G", default_value_t = G_ELECTRON, allow_hyphen_values = true)]
    pub g: f64,
    /// Lowest temperature (K).
    #[arg(
        long,
        value_name = "K",
        default_value_t = 2.0,
        allow_hyphen_values = true
    )]
    pub tmin: f64,
    /// Highest temperature (K).
    #[arg(
        long,
        value_name = "K",
        default_value_t = 300.0,
        allow_hyphen_values = true
    )]
    pub tmax: f64,
    /// Number of temperatures from tmin to tmax, both included.
    #[arg(long, value_name = "P", default_value_t = 150)]
    pub points: usize,
    /// Unit system of χ and χT: cgs (cm³/mol, default) or si (m³/mol).
    #[arg(long, value_name = "SYSTEM", default_value = "cgs", value_parser = ["cgs", "si"])]
    pub units: String,
    #[command(flatten)]
    pub csv: CsvOutput,
    #[command(flatten)]
    pub svg: SvgOutput,
    /// What the figure shows against T: chit (χ_M·T) or mu (μ_eff, the default).
    #[arg(long, value_name = "Q", value_parser = ["chit", "mu"])]
    pub plot: Option<String>,
    /// Measured points to overlay: CSV with a temperature column (T) and χ_M·T, χ_M (already
    /// corrected for diamagnetism) or μ_eff, optionally with an error column.
    #[arg(long, value_name = "FILE.csv")]
    pub measured: Option<PathBuf>,
    #[command(flatten)]
    pub figure: super::figure::FigureArgs,
    #[command(flatten)]
    pub output: OutputArgs,
}

pub fn run(args: &Args, data: &DataSet) -> Result<Output, Failure> {
    args.figure.check_used(
        args.svg.file.is_some(),
        &[
            (args.plot.is_some(), "--plot"),
            (args.measured.is_some(), "--measured"),
        ],
    )?;
    let mut notes = Vec::new();
    let geometry = args.field.geometry;
    let field = match args.complex.resolve(geometry, data)? {
        Some(complex) => {
            let (field, complex_notes) = args.field.completed_by(&complex)?;
            notes.extend(complex_notes);
            field
        }
        None if args.field.dn.is_none() => {
            return Err(Failure::usage(
                "give --dn with --b, --c, --dq and --zeta, or --metal, --ox and --ligand",
            ))
        }
        None => args.field.clone(),
    };
    let r = field.resolve()?;
    if r.ratio_mode {
        return Err(Failure::usage(
            "magnetism needs energies in cm⁻¹ (they are compared with kT): give --b, --c, --dq and --zeta",
        ));
    }
    let model = MagneticModel {
        zeta: r.zeta,
        kappa: args.kappa,
        reduce_zeta: args.reduce_zeta,
        g_spin: args.g,
    };
    let temps = temperature_grid(args.tmin, args.tmax, args.points)
        .map_err(|e| Failure::usage(format!("--tmin/--tmax/--points: {e}")))?;
    let levels = ZeemanLevels::compute(&r.calc, &model)?;
    let curve = levels.curve(&temps)?;
    let spin_free = r.calc.levels()?;
    let ground = spin_free.ground();
    let unpaired = f64::from(ground.two_s);
    if r.zeta == 0.0 {
        notes.push("ζ = 0: no spin–orbit coupling, so orbital contributions to the moment are missing (give --zeta, e.g. the free-ion value)".into());
    }
    let units: units::SusceptibilityUnits = args
        .units
        .parse()
        .map_err(|e| Failure::usage(format!("--units: {e}")))?;
    let report = MagnetismReport {
        units: units.name().to_string(),
        dn: r.calc.dn,
        geometry: r.geometry.name().into(),
        b: r.calc.b,
        c: r.calc.c,
        dq: r.dq,
        zeta: model.effective_zeta(),
        kappa: model.kappa,
        ground_level: format!(
            "{} ({})",
            ground.label(),
            spinstate::engine::Term::text_of(ground.parent)
        ),
        orbital_triplet_ground: ground.degeneracy == 3,
        spin_only_moment: units::spin_only_moment(unpaired),
        spin_only_chi_t: units.from_cgs(units::spin_only_chi_t_cgs(unpaired)),
        points: curve
            .iter()
            .map(|p| MagnetismPoint {
                t: p.t,
                chi: units.from_cgs(p.chi),
                chi_t: units.from_cgs(p.chi_t),
                mu_eff: p.mu_eff,
                chi_axes: p.chi_axes.map(|x| units.from_cgs(x)),
            })
            .collect(),
        notes,
    };
    let quantity = if args.plot.as_deref() == Some("chit") {
        Quantity::ChiT {
            si: units == units::SusceptibilityUnits::Si,
        }
    } else {
        Quantity::Mu
    };
    let measured = match &args.measured {
        Some(path) => read_measured(path, quantity, units)?,
        None => Vec::new(),
    };
    let spin_states =
        spinstate::plot::marks::spin_highlights(r.calc.dn, r.geometry, r.calc.c / r.calc.b)?
            .into_iter()
            .map(|(m, name)| (m - 1, name))
            .collect();
    let plot = MomentPlot {
        quantity,
        spin_states,
        measured,
        measured_name: args
            .measured
            .as_ref()
            .and_then(|p| p.file_name())
            .map(|n| format!("measured ({})", n.to_string_lossy()))
            .unwrap_or_default(),
        column: args.figure.column(),
        title: None,
    };
    let asked = args.output.asked().csv(&args.csv).svg(&args.svg);
    emit(&report, &plot, asked.figure(&args.figure))
}

/// Reads measured points for the figure, converted to its quantity and unit system.
fn read_measured(
    path: &Path,
    quantity: Quantity,
    units: units::SusceptibilityUnits,
) -> Result<Vec<Point>, Failure> {
    let text = spinstate::input_file::read_text(path)
        .map_err(|e| Failure::usage(format!("--measured: cannot read {}: {e}", path.display())))?;
    let curve = spinstate::sco::data::read_curve(&text, 0.0)
        .map_err(|e| Failure::usage(format!("--measured {}: {e}", path.display())))?;
    curve
        .points
        .iter()
        .map(|p| match quantity {
            Quantity::Mu => {
                let mu =
                    units::mu_eff_from_chi_t(p.chi_t.max(0.0), units::SusceptibilityUnits::Cgs)
                        .map_err(|e| Failure::usage(format!("--measured line {}: {e}", p.line)))?;
                let err = p.err.map(|e| {
                    if p.chi_t > 0.0 {
                        mu * e / (2.0 * p.chi_t)
                    } else {
                        0.0
                    }
                });
                Ok(Point { t: p.t, y: mu, err })
            }
            Quantity::ChiT { .. } => Ok(Point {
                t: p.t,
                y: units.from_cgs(p.chi_t),
                err: p.err.map(|e| units.from_cgs(e)),
            }),
        })
        .collect()
}
