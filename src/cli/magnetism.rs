//! `spinstate magnetism`: χ(T), χT and μ_eff from the full ligand field with spin–orbit coupling.

use super::common::{FieldArgs, Format};
use super::{Failure, Output};
use spinstate::report::magnetism::{MagnetismPoint, MagnetismReport};
use spinstate::report::to_json;
use spinstate::susceptibility::{
    curie_prefactor, temperature_grid, MagneticModel, ZeemanLevels, G_ELECTRON,
};
use std::path::PathBuf;

#[derive(Debug, clap::Args)]
pub struct Args {
    #[command(flatten)]
    pub field: FieldArgs,
    /// Orbital reduction factor κ (0..=1) on L in the Zeeman term.
    #[arg(
        long,
        value_name = "K",
        default_value_t = 1.0,
        allow_negative_numbers = true
    )]
    pub kappa: f64,
    /// Multiply ζ by κ as well (covalency reduces spin–orbit coupling too).
    #[arg(long)]
    pub reduce_zeta: bool,
    /// Spin g value in the Zeeman term (default: free electron, 2.0023).
    #[arg(long, value_name = "G", default_value_t = G_ELECTRON, allow_negative_numbers = true)]
    pub g: f64,
    /// Lowest temperature (K).
    #[arg(
        long,
        value_name = "K",
        default_value_t = 2.0,
        allow_negative_numbers = true
    )]
    pub tmin: f64,
    /// Highest temperature (K).
    #[arg(
        long,
        value_name = "K",
        default_value_t = 300.0,
        allow_negative_numbers = true
    )]
    pub tmax: f64,
    /// Number of temperatures from tmin to tmax, both included.
    #[arg(long, value_name = "P", default_value_t = 150)]
    pub points: usize,
    /// Write every point as CSV to FILE ('-' for stdout).
    #[arg(long, value_name = "FILE")]
    pub csv: Option<PathBuf>,
    /// Write an SVG plot of μ_eff against T to FILE.
    #[arg(long, value_name = "FILE")]
    pub svg: Option<PathBuf>,
    #[command(flatten)]
    pub format: Format,
}

pub fn run(args: &Args) -> Result<Output, Failure> {
    let r = args.field.resolve()?;
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
    let s = ground.spin();
    let mut notes = Vec::new();
    if r.zeta == 0.0 {
        notes.push("ζ = 0: no spin–orbit coupling, so orbital contributions to the moment are missing (give --zeta, e.g. the free-ion value)".into());
    }
    let report = MagnetismReport {
        dn: r.calc.dn,
        geometry: r.geometry.name().into(),
        b: r.calc.b,
        c: r.calc.c,
        dq: r.dq,
        zeta: model.effective_zeta(),
        kappa: model.kappa,
        ground_level: format!("{} ({})", ground.label(), ground.parent),
        orbital_triplet_ground: ground.degeneracy == 3,
        spin_only_moment: 2.0 * (s * (s + 1.0)).sqrt(),
        spin_only_chi_t: curie_prefactor() / 3.0 * 4.0 * s * (s + 1.0),
        points: curve
            .iter()
            .map(|p| MagnetismPoint {
                t: p.t,
                chi: p.chi,
                chi_t: p.chi_t,
                mu_eff: p.mu_eff,
                chi_axes: p.chi_axes,
            })
            .collect(),
        notes,
    };
    let mut out = Output::default();
    let mut csv_stdout = false;
    if let Some(path) = &args.csv {
        if path.as_os_str() == "-" {
            csv_stdout = true;
        } else {
            std::fs::write(path, report.to_csv()).map_err(|e| {
                Failure::usage(format!("--csv: cannot write {}: {e}", path.display()))
            })?;
            out.warnings.push(format!("wrote {}", path.display()));
        }
    }
    if let Some(path) = &args.svg {
        let svg = report
            .to_svg()
            .map_err(|e| Failure::usage(format!("--svg: drawing failed: {e}")))?;
        std::fs::write(path, svg)
            .map_err(|e| Failure::usage(format!("--svg: cannot write {}: {e}", path.display())))?;
        out.warnings.push(format!("wrote {}", path.display()));
    }
    out.stdout = if csv_stdout {
        report.to_csv()
    } else if args.format.json {
        to_json(&report)
    } else {
        report.to_table(16)
    };
    Ok(out)
}
