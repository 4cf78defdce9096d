//! `spinstate bands`: which spin-allowed bands each spin state puts in a spectrometer window.

use super::common::{emit, ComplexArgs, OutputArgs};
use super::fit_bands::SAFETY;
use super::{Failure, Output};
use spinstate::report::bands::BandsReport;
use spinstate::spectra::count::{
    charge_transfer_limit, count_bands, ChargeTransferLimit, CountRequest, DEFAULT_RESOLUTION,
};
use spinstate::spectra::transitions::default_c_over_b;
use spinstate::tables::DataSet;

#[derive(Debug, clap::Args)]
#[command(after_help = SAFETY)]
pub struct Args {
    /// Number of d electrons, 1..=9 (or give --metal, --ox and --ligand).
    #[arg(long, value_name = "N", conflicts_with = "metal")]
    pub dn: Option<usize>,
    #[command(flatten)]
    pub complex: ComplexArgs,
    /// Geometry: oct, tet, sqpl or tetragonal.
    #[arg(long, value_name = "G", value_parser = super::common::parsed::<spinstate::engine::Geometry>)]
    pub geometry: spinstate::engine::Geometry,
    /// Racah B in cm⁻¹ (required without --metal).
    #[arg(long, value_name = "CM-1", allow_hyphen_values = true)]
    pub b: Option<f64>,
    /// Racah C in cm⁻¹ (default: C/B × B).
    #[arg(
        long,
        value_name = "CM-1",
        conflicts_with = "c_over_b",
        allow_hyphen_values = true
    )]
    pub c: Option<f64>,
    /// C/B ratio (default: the Tanabe–Sugano ratio for d2–d8).
    #[arg(long, value_name = "R", allow_hyphen_values = true)]
    pub c_over_b: Option<f64>,
    /// Dq in cm⁻¹ (for tet the positive Δt/10).
    #[arg(
        long,
        value_name = "CM-1",
        conflicts_with = "delta",
        allow_hyphen_values = true
    )]
    pub dq: Option<f64>,
    /// Δ = 10Dq in cm⁻¹.
    #[arg(long, value_name = "CM-1", allow_hyphen_values = true)]
    pub delta: Option<f64>,
    /// Spectrometer window in nm, shortest-longest (e.g. 200-1100).
    #[arg(long, value_name = "NM-NM", default_value = "200-1100")]
    pub window: String,
    /// Bands closer than this (cm⁻¹) count as one unresolved band.
    #[arg(long, value_name = "CM-1", default_value_t = DEFAULT_RESOLUTION, allow_hyphen_values = true)]
    pub resolution: f64,
    /// Charge-transfer onset in cm⁻¹: bands above it count as likely hidden (default: the
    /// lowest charge_transfer.csv row of the --ligand list, else about 25000).
    #[arg(long, value_name = "CM-1", allow_hyphen_values = true)]
    pub ct_onset: Option<f64>,
    /// Number of d–d bands observed: says whether it supports high spin, low spin, both or
    /// neither.
    #[arg(long, value_name = "N")]
    pub observed: Option<usize>,
    #[command(flatten)]
    pub output: OutputArgs,
}

/// Parses "200-1100" or "200,1100" (nm).
fn parse_window(s: &str) -> Result<(f64, f64), Failure> {
    let bad = || {
        Failure::usage(format!(
            "--window '{s}' is not a wavelength range: give two numbers in nm, shortest first, e.g. 200-1100"
        ))
    };
    let parts: Vec<&str> = s.split(['-', ',']).map(str::trim).collect();
    let [lo, hi] = parts.as_slice() else {
        return Err(bad());
    };
    let lo: f64 = lo.parse().map_err(|_| bad())?;
    let hi: f64 = hi.parse().map_err(|_| bad())?;
    if !(lo.is_finite() && hi.is_finite() && lo > 0.0 && hi > lo) {
        return Err(bad());
    }
    Ok((lo, hi))
}

pub fn run(args: &Args, data: &DataSet) -> Result<Output, Failure> {
    let geometry = args.geometry;
    // From a complex: d^n and estimates of Δ, B, C (each replaced by a value given here).
    let complex = args.complex.resolve(geometry, data)?;
    let dn = match (&complex, args.dn) {
        (Some(cx), _) => cx.ion.dn,
        (None, Some(n)) => n,
        (None, None) => {
            return Err(Failure::usage(
                "give --dn with --b and --dq (or --delta), or --metal, --ox and --ligand",
            ))
        }
    };
    if !(1..=9).contains(&dn) {
        return Err(Failure::usage(format!(
            "--dn {dn} is outside 1..=9 (d0 and d10 have no d–d bands)"
        )));
    }
    let b = match (args.b, &complex) {
        (Some(b), _) => b,
        (None, Some(cx)) => cx.b.value,
        (None, None) => return Err(Failure::usage("give --b (Racah B in cm⁻¹)")),
    };
    if !(b.is_finite() && b > 0.0) {
        return Err(Failure::usage(format!("--b {b} must be > 0 cm⁻¹")));
    }
    let c = match (args.c, args.c_over_b, &complex) {
        (Some(c), _, _) => c,
        (None, Some(r), _) => r * b,
        (None, None, Some(cx)) if args.b.is_none() => cx.c.value,
        (None, None, _) => default_c_over_b(dn).0 * b,
    };
    if !(c.is_finite() && c >= 0.0) {
        return Err(Failure::usage(format!(
            "C = {c} must be ≥ 0 cm⁻¹ (C/B is usually 3.5–5)"
        )));
    }
    let dq = match (args.dq, args.delta, &complex) {
        (Some(dq), _, _) => dq,
        (None, Some(d), _) => d / 10.0,
        (None, None, Some(cx)) => cx.dq(),
        (None, None, None) => {
            return Err(Failure::usage("give the field with --dq or --delta (cm⁻¹)"))
        }
    };
    if !(dq.is_finite() && dq >= 0.0) {
        return Err(Failure::usage(format!(
            "Dq {dq} must be ≥ 0 cm⁻¹ (for tet give the positive Δt/10)"
        )));
    }
    if !(args.resolution.is_finite() && args.resolution >= 0.0) {
        return Err(Failure::usage(format!(
            "--resolution {} must be ≥ 0 cm⁻¹",
            args.resolution
        )));
    }
    let charge_transfer = match (args.ct_onset, &complex) {
        (Some(x), _) => {
            if !(x.is_finite() && x > 0.0) {
                return Err(Failure::usage(format!(
                    "--ct-onset {x} must be a wavenumber > 0 cm⁻¹"
                )));
            }
            Some(ChargeTransferLimit {
                onset: x,
                kind: "charge-transfer".into(),
                ligand: "the sample".into(),
                source: "given with --ct-onset".into(),
            })
        }
        (None, Some(cx)) => charge_transfer_limit(data.charge_transfer()?, cx),
        (None, None) => None,
    };
    let req = CountRequest {
        dn,
        geometry,
        dq,
        b,
        c,
        window_nm: parse_window(&args.window)?,
        resolution: args.resolution,
        observed: args.observed,
        charge_transfer,
    };
    let report = BandsReport::new(&count_bands(&req)?);
    emit(&report, &(), args.output.asked())
}
