//! `spinstate fit-bands`: fit Dq, B (and C) to observed band maxima.

use super::common::{parse_geometry, Format};
use super::{Failure, Output};
use spinstate::report::fit_bands::{Context, FitBandsReport};
use spinstate::report::to_json;
use spinstate::spectra::fit::{crossover_position, fit_bands, FitRequest};
use spinstate::spectra::units::parse_bands;
use spinstate::spectra::{EnergyUnit, SpinChoice};

/// Caution shown in the help of the spectroscopy commands.
pub const SAFETY: &str = "Safety: nickel and cobalt salts are skin and respiratory sensitisers and (suspected) carcinogens, chromium work can form Cr(VI), and UV lamps need eye protection. Follow your institution's rules, the supplier's SDS and a local risk assessment; this output is no safety approval.";

#[derive(Debug, clap::Args)]
#[command(after_help = SAFETY)]
pub struct Args {
    /// Number of d electrons, 1..=9.
    #[arg(long, value_name = "N")]
    pub dn: usize,
    /// Geometry: oct, tet, sqpl or tetragonal (no distortion parameters here).
    #[arg(long, value_name = "G")]
    pub geometry: String,
    /// Observed d–d band maxima, comma-separated, in --units (e.g. 17400,24600,37800).
    #[arg(long, value_name = "LIST", allow_hyphen_values = true)]
    pub bands: String,
    /// Unit of --bands: cm-1, nm, kK or eV.
    #[arg(long, value_name = "UNIT", default_value = "cm-1")]
    pub units: String,
    /// Spin state to assume: high, low or auto (try each and keep the best consistent fit).
    #[arg(long, value_name = "S", default_value = "auto")]
    pub spin: String,
    /// Hold C/B at this ratio (default: the Tanabe–Sugano ratio for d2–d8).
    #[arg(
        long,
        value_name = "R",
        conflicts_with = "fit_c",
        allow_negative_numbers = true
    )]
    pub c_over_b: Option<f64>,
    /// Fit C as a third free parameter (needs as many bands as free parameters, and C must
    /// enter the spin-allowed bands).
    #[arg(long)]
    pub fit_c: bool,
    /// Hold Racah B at this value (cm⁻¹) and fit Dq only (e.g. with a single band).
    #[arg(long, value_name = "CM-1", allow_negative_numbers = true)]
    pub b: Option<f64>,
    /// Free-ion Racah B0 (cm⁻¹) for the nephelauxetic ratio β = B/B0.
    #[arg(long, value_name = "CM-1", allow_negative_numbers = true)]
    pub b0: Option<f64>,
    /// Cap on model evaluations per tried assignment, as a multiple of (free parameters + 1).
    #[arg(long, value_name = "K", default_value_t = spinstate::spectra::fit::DEFAULT_PATIENCE)]
    pub max_evaluations: usize,
    #[command(flatten)]
    pub format: Format,
}

pub fn run(args: &Args) -> Result<Output, Failure> {
    let geometry = parse_geometry(&args.geometry)?;
    if !(1..=9).contains(&args.dn) {
        return Err(Failure::usage(format!(
            "--dn {} is outside 1..=9 (d0 and d10 have no d–d bands)",
            args.dn
        )));
    }
    let unit: EnergyUnit = args
        .units
        .parse()
        .map_err(|e| Failure::usage(format!("--units: {e}")))?;
    let spin: SpinChoice = args
        .spin
        .parse()
        .map_err(|e| Failure::usage(format!("--spin: {e}")))?;
    let bands =
        parse_bands(&args.bands, unit).map_err(|e| Failure::usage(format!("--bands: {e}")))?;
    if let Some(b0) = args.b0 {
        if !(b0.is_finite() && b0 > 0.0) {
            return Err(Failure::usage(format!(
                "--b0 {b0} must be a free-ion Racah B > 0 cm⁻¹"
            )));
        }
    }
    let req = FitRequest {
        dn: args.dn,
        geometry,
        bands,
        spin,
        c_over_b: args.c_over_b,
        fit_c: args.fit_c,
        fixed_b: args.b,
        patience: Some(args.max_evaluations),
    };
    if args.max_evaluations == 0 {
        return Err(Failure::usage("--max-evaluations 0 must be at least 1"));
    }
    let out = fit_bands(&req).map_err(|e| {
        let mut f = Failure::from(e.clone());
        if f.code == 2 && f.message.contains("hold B fixed") {
            f.message.push_str(" (option --b)");
        } else if f.code == 2 && f.message.contains("hold C/B fixed") {
            f.message
                .push_str(" (drop --fit-c; --c-over-b sets the ratio)");
        }
        f
    })?;
    let ctx = Context {
        input_unit: Some(unit),
        b0: args.b0.map(|b0| (b0, "given with --b0".to_string())),
        crossover: crossover_position(&out.best)?.map(|p| p.crossover),
    };
    let report = FitBandsReport::new(&out, &ctx)?;
    Ok(Output::text(if args.format.json {
        to_json(&report)
    } else {
        report.to_table()
    }))
}
