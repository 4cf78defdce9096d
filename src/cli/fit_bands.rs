//! `spinstate fit-bands`: fit Dq, B (and C) to observed band maxima.

use super::common::{emit, parsed, OutputArgs};
use super::{Failure, Output};
use spinstate::engine::Geometry;
use spinstate::report::fit_bands::{Context, FitBandsReport};
use spinstate::report::tetragonal_fit::TetragonalFitReport;
use spinstate::spectra::fit::{crossover_position, fit_bands, FitRequest, ForbiddenBand};
use spinstate::spectra::tetragonal::{fit_tetragonal, TetragonalRequest};
use spinstate::spectra::units::parse_bands;
use spinstate::spectra::{EnergyUnit, SpinChoice};
use spinstate::tables::DataSet;

/// Caution shown in the help of the spectroscopy commands.
pub const SAFETY: &str = "Safety: nickel and cobalt salts are skin and respiratory sensitisers and (suspected) carcinogens, chromium work can form Cr(VI), and UV lamps need eye protection. Follow your institution's rules, the supplier's SDS and a local risk assessment; this output is no safety approval.";

#[derive(Debug, clap::Args)]
#[command(after_help = SAFETY)]
pub struct Args {
    /// Number of d electrons, 1..=9 (taken from --metal/--ox when given).
    #[arg(long, value_name = "N", required_unless_present = "metal")]
    pub dn: Option<usize>,
    /// Metal element symbol (with --ox): d^n and the free-ion B0 for β come from ions.csv.
    #[arg(long, value_name = "SYMBOL", requires = "ox")]
    pub metal: Option<String>,
    /// Oxidation state of --metal.
    #[arg(long, value_name = "N", requires = "metal", allow_hyphen_values = true)]
    pub ox: Option<i32>,
    /// Geometry: oct, tet or sqpl; tetragonal fits Dq, Ds and Dt (and B where the bands allow)
    /// to split bands of a tetragonally distorted or trans-[MX2L4] centre (at least three bands).
    #[arg(long, value_name = "G", value_parser = super::common::parsed::<spinstate::engine::Geometry>)]
    pub geometry: spinstate::engine::Geometry,
    /// Observed d–d band maxima, comma-separated, in --units (e.g. 17400,24600,37800).
    #[arg(long, value_name = "LIST", allow_hyphen_values = true)]
    pub bands: String,
    /// Assigned spin-forbidden bands, comma-separated, in --units, each optionally with its
    /// upper level after a colon (e.g. 14900:2Eg; a bare multiplicity such as 14900:2 takes
    /// the lowest level of that spin, no label the spin next below). Each is fitted to that
    /// level and C becomes a free parameter.
    #[arg(long, value_name = "LIST", allow_hyphen_values = true)]
    pub forbidden: Option<String>,
    /// Unit of --bands: cm-1, nm, kK or eV.
    #[arg(long, value_name = "UNIT", default_value = "cm-1", value_parser = parsed::<EnergyUnit>)]
    pub units: EnergyUnit,
    /// Spin state to assume: high, low or auto (try each and keep the best consistent fit).
    #[arg(long, value_name = "S", default_value = "auto", value_parser = parsed::<SpinChoice>)]
    pub spin: SpinChoice,
    /// Hold C/B at this ratio (default: the Tanabe–Sugano ratio for d2–d8).
    #[arg(
        long,
        value_name = "R",
        conflicts_with = "fit_c",
        allow_hyphen_values = true
    )]
    pub c_over_b: Option<f64>,
    /// Fit C as a third free parameter (needs as many bands as free parameters, and C must
    /// enter the spin-allowed bands).
    #[arg(long)]
    pub fit_c: bool,
    /// Hold Racah B at this value (cm⁻¹) and fit Dq only (e.g. with a single band).
    #[arg(long, value_name = "CM-1", allow_hyphen_values = true)]
    pub b: Option<f64>,
    /// Free-ion Racah B0 (cm⁻¹) for the nephelauxetic ratio β = B/B0 (overrides the ions.csv
    /// value of --metal/--ox).
    #[arg(long, value_name = "CM-1", allow_hyphen_values = true)]
    pub b0: Option<f64>,
    /// Cap on model evaluations per tried assignment, as a multiple of (free parameters + 1).
    #[arg(long, value_name = "K", default_value_t = spinstate::spectra::fit::DEFAULT_PATIENCE)]
    pub max_evaluations: usize,
    #[command(flatten)]
    pub output: OutputArgs,
}

pub fn run(args: &Args, data: &DataSet) -> Result<Output, Failure> {
    let geometry = args.geometry;
    // The ion, when named: d^n, B0 (with its table source) and a handling caution.
    let ion = match (&args.metal, args.ox) {
        (Some(metal), Some(ox)) => Some(data.ions()?.find(metal, ox)?),
        _ => None,
    };
    let dn = match (args.dn, ion) {
        (Some(dn), Some(ion)) if dn != ion.dn => {
            return Err(Failure::usage(format!(
                "--dn {dn} disagrees with {} (d{}); give one or the other",
                ion.name(),
                ion.dn
            )))
        }
        (_, Some(ion)) => ion.dn,
        (Some(dn), None) => dn,
        (None, None) => return Err(Failure::usage("give --dn N or --metal M --ox K")),
    };
    if !(1..=9).contains(&dn) {
        return Err(Failure::usage(format!(
            "--dn {dn} is outside 1..=9 (d0 and d10 have no d–d bands)"
        )));
    }
    let unit = args.units;
    let spin = args.spin;
    let bands =
        parse_bands(&args.bands, unit).map_err(|e| Failure::usage(format!("--bands: {e}")))?;
    let forbidden = match &args.forbidden {
        Some(list) => parse_forbidden(list, unit)?,
        None => Vec::new(),
    };
    if let Some(b0) = args.b0 {
        if !(b0.is_finite() && b0 > 0.0) {
            return Err(Failure::usage(format!(
                "--b0 {b0} must be a free-ion Racah B > 0 cm⁻¹"
            )));
        }
    }
    if geometry == Geometry::Tetragonal {
        if args.fit_c || !forbidden.is_empty() {
            return Err(Failure::usage(
                "--fit-c and --forbidden apply to oct, tet and sqpl; the tetragonal fit holds C/B (set it with --c-over-b)",
            ));
        }
        if args.max_evaluations == 0 {
            return Err(Failure::usage("--max-evaluations 0 must be at least 1"));
        }
        let b0 = args.b0.or(ion.and_then(|i| i.b0));
        let req = TetragonalRequest {
            dn,
            bands,
            spin,
            c_over_b: args.c_over_b,
            fixed_b: args.b,
            b0,
            patience: Some(args.max_evaluations),
        };
        let out = fit_tetragonal(&req)?;
        let mut report = TetragonalFitReport::new(&out, unit, b0, args.b.is_some());
        if let Some(c) = ion.and_then(|i| i.caution.as_ref()) {
            report.notes.push(format!(
                "caution: {c}; follow your institution's rules and the SDS"
            ));
        }
        return emit(&report, &(), args.output.asked());
    }
    let req = FitRequest {
        dn,
        geometry,
        bands,
        spin,
        c_over_b: args.c_over_b,
        fit_c: args.fit_c,
        fixed_b: args.b,
        patience: Some(args.max_evaluations),
        b0: args.b0.or(ion.and_then(|i| i.b0)),
        forbidden,
    };
    if args.max_evaluations == 0 {
        return Err(Failure::usage("--max-evaluations 0 must be at least 1"));
    }
    let out = fit_bands(&req)?;
    let b0 = match (args.b0, ion) {
        (Some(b0), _) => Some((b0, "given with --b0".to_string())),
        (None, Some(ion)) => ion.b0.map(|b0| {
            // The part of the row's source that names the B0 table.
            let table = ion
                .source
                .split(';')
                .map(str::trim)
                .find(|part| part.starts_with("B0"))
                .unwrap_or(ion.source.as_str());
            (b0, format!("{} in ions.csv, {table}", ion.name()))
        }),
        (None, None) => None,
    };
    let ctx = Context {
        input_unit: Some(unit),
        b0,
        crossover: crossover_position(&out.best)?.map(|p| p.crossover),
    };
    let mut report = FitBandsReport::new(&out, &ctx)?;
    if let Some(ion) = ion {
        if ion.b0.is_none() && args.b0.is_none() {
            report.notes.push(format!(
                "ions.csv has no free-ion B0 for {}: β not computed (give --b0)",
                ion.name()
            ));
        }
        if let Some(c) = &ion.caution {
            report.notes.push(format!(
                "caution: {c}; follow your institution's rules and the SDS"
            ));
        }
    }
    emit(&report, &(), args.output.asked())
}

/// Parses --forbidden: "14900:2Eg,15200" with positions in `unit`.
fn parse_forbidden(list: &str, unit: EnergyUnit) -> Result<Vec<ForbiddenBand>, Failure> {
    let bad = |item: &str, why: String| {
        Failure::usage(format!(
            "--forbidden '{item}': {why}; accepted: positions in --units, each optionally with its upper level, e.g. 14900:2Eg,15200:2 or 14900"
        ))
    };
    let mut out = Vec::new();
    for item in list.split(',').map(str::trim) {
        if item.is_empty() {
            return Err(bad(list, "an empty entry".into()));
        }
        let (pos, label) = match item.split_once(':') {
            Some((p, l)) => (p.trim(), Some(l.trim())),
            None => (item, None),
        };
        let cm = parse_bands(pos, unit).map_err(|e| bad(item, e.to_string()))?;
        let [position] = cm.as_slice() else {
            return Err(bad(item, "one position per entry".into()));
        };
        let text = match label {
            Some(l) => format!("{position}:{l}"),
            None => format!("{position}"),
        };
        out.push(
            text.parse::<ForbiddenBand>()
                .map_err(|e| bad(item, e.to_string()))?,
        );
    }
    Ok(out)
}
