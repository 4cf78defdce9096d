//! `spinstate magnetism`: χ(T), χT and μ_eff from the full ligand field with spin–orbit coupling.

use super::common::{emit, ComplexArgs, FieldArgs, Format, Renderings};
use super::{Failure, Output};
use spinstate::report::magnetism::{MagnetismPoint, MagnetismReport};
use spinstate::report::to_json;
use spinstate::susceptibility::{temperature_grid, MagneticModel, ZeemanLevels, G_ELECTRON};
use spinstate::units;
use std::path::{Path, PathBuf};

#[derive(Debug, clap::Args)]
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
    /// Write every point as CSV to FILE ('-' for stdout).
    #[arg(long, value_name = "FILE")]
    pub csv: Option<PathBuf>,
    /// Write an SVG plot of μ_eff against T to FILE.
    #[arg(long, value_name = "FILE")]
    pub svg: Option<PathBuf>,
    #[command(flatten)]
    pub format: Format,
}

pub fn run(args: &Args, data: Option<&Path>) -> Result<Output, Failure> {
    let mut notes = Vec::new();
    let geometry = super::common::parse_geometry(&args.field.geometry)?;
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
        ground_level: format!("{} ({})", ground.label(), ground.parent),
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
    emit(
        args.csv.as_deref(),
        args.svg.as_deref(),
        args.format.json,
        Renderings {
            csv: || report.to_csv(),
            svg: || report.to_svg(),
            json: || to_json(&report),
            table: || report.to_table(16),
        },
    )
}
