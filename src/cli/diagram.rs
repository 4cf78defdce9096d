//! `spinstate diagram`: E/B of every level against Δ/B, optionally with a sample marked on it.

use super::common::{emit, ComplexArgs, CsvOutput, OutputArgs, SvgOutput};
use super::figure::FigureArgs;
use super::{Failure, Output};
use spinstate::engine::diagram;
use spinstate::plot::energy::{EnergyOptions, SampleMark};
use spinstate::plot::marks;
use spinstate::predict::predict;
use spinstate::report::diagram::{DiagramFigure, DiagramReport};
use spinstate::tables::DataSet;

#[derive(Debug, clap::Args)]
#[command(mut_arg("csv", |a| a.help("Write the full diagram as CSV (one column per level) to FILE ('-' for stdout)")))]
pub struct Args {
    /// Number of d electrons, 0..=10 (not needed with --metal).
    #[arg(long, value_name = "N")]
    pub dn: Option<usize>,
    /// Geometry: oct, tet, sqpl or tetragonal.
    #[arg(long, value_name = "G", value_parser = super::common::parsed::<spinstate::engine::Geometry>)]
    pub geometry: spinstate::engine::Geometry,
    /// C/B ratio (e.g. 4.8 for d6 as in the original diagrams; with --metal the complex's own).
    #[arg(long, value_name = "R", allow_hyphen_values = true)]
    pub c_over_b: Option<f64>,
    /// Largest Δ/B.
    #[arg(
        long,
        value_name = "X",
        default_value_t = 40.0,
        allow_hyphen_values = true
    )]
    pub max: f64,
    /// Number of Δ/B values from 0 to --max, both included.
    #[arg(long, value_name = "P", default_value_t = 201)]
    pub points: usize,
    #[command(flatten)]
    pub complex: ComplexArgs,
    /// Mark a sample at this Δ/B on the figure (with --dn and --c-over-b).
    #[arg(
        long,
        value_name = "X",
        conflicts_with = "metal",
        allow_hyphen_values = true
    )]
    pub delta_over_b: Option<f64>,
    /// 1σ of --delta-over-b, drawn as a band.
    #[arg(
        long,
        value_name = "U",
        requires = "delta_over_b",
        default_value_t = 0.0
    )]
    pub delta_over_b_err: f64,
    /// Racah B (cm⁻¹) of the --delta-over-b sample, to label its transitions in cm⁻¹.
    #[arg(long, value_name = "B", requires = "delta_over_b")]
    pub b: Option<f64>,
    /// Highlight each spin state's spin-allowed levels (the others grey).
    #[arg(long)]
    pub highlight_spins: bool,
    #[command(flatten)]
    pub csv: CsvOutput,
    #[command(flatten)]
    pub svg: SvgOutput,
    #[command(flatten)]
    pub figure: FigureArgs,
    #[command(flatten)]
    pub output: OutputArgs,
}

pub fn run(args: &Args, data: &DataSet) -> Result<Output, Failure> {
    args.figure.check_used(
        args.svg.file.is_some(),
        &[(args.highlight_spins, "--highlight-spins")],
    )?;
    let geometry = args.geometry;
    let complex = args.complex.resolve(geometry, data)?;
    let prediction = match &complex {
        Some(c) => Some(predict(c)?),
        None => None,
    };
    let dn = match (&complex, args.dn) {
        (Some(c), _) => c.ion.dn,
        (None, Some(dn)) => dn,
        (None, None) => {
            return Err(Failure::usage(
                "give --dn N (0..=10) and --c-over-b R, or --metal, --ox and --ligand",
            ))
        }
    };
    let c_over_b = match (&complex, args.c_over_b) {
        (Some(c), _) => c.c_over_b(),
        (None, Some(r)) => r,
        (None, None) => {
            return Err(Failure::usage(
                "--c-over-b R is needed without --metal (usually 3.5–5, e.g. 4.8)",
            ))
        }
    };
    if dn > 10 {
        return Err(Failure::usage(format!("--dn {dn} is outside 0..=10")));
    }
    if !c_over_b.is_finite() || c_over_b <= 0.0 {
        return Err(Failure::usage(format!(
            "--c-over-b {c_over_b} must be a ratio > 0 (usually 3.5–5)"
        )));
    }
    if !args.max.is_finite() || args.max <= 0.0 {
        return Err(Failure::usage(format!(
            "--max {} must be a Δ/B > 0 (e.g. 40)",
            args.max
        )));
    }
    if !(2..=100_000).contains(&args.points) {
        return Err(Failure::usage(format!(
            "--points {} must lie in 2..=100000",
            args.points
        )));
    }
    if let Some(x) = args.delta_over_b {
        if !x.is_finite() || x < 0.0 {
            return Err(Failure::usage(format!(
                "--delta-over-b {x} must be a Δ/B ≥ 0 (e.g. 20)"
            )));
        }
    }
    if !args.delta_over_b_err.is_finite() || args.delta_over_b_err < 0.0 {
        return Err(Failure::usage(format!(
            "--delta-over-b-err {} must be ≥ 0",
            args.delta_over_b_err
        )));
    }
    if let Some(b) = args.b {
        if !b.is_finite() || b <= 0.0 {
            return Err(Failure::usage(format!(
                "--b {b} must be a Racah B > 0 in cm⁻¹ (e.g. 800)"
            )));
        }
    }
    let sample: Option<SampleMark> = match (&prediction, args.delta_over_b) {
        (Some(p), _) => Some(marks::from_prediction(p)),
        (None, Some(x)) => Some(marks::from_ratio(
            dn,
            geometry,
            c_over_b,
            x,
            args.delta_over_b_err,
            args.b,
        )?),
        _ => None,
    };
    // Keep the sample (and its band) on the figure.
    let max = match &sample {
        Some(s) => args
            .max
            .max(((s.delta_over_b + 1.5 * s.uncertainty) * 1.25 / 5.0).ceil() * 5.0),
        None => args.max,
    };
    let d = diagram(dn, geometry, c_over_b, max, args.points)?;
    let report = DiagramReport::from_engine(&d);
    let title = match &complex {
        Some(c) => format!(
            "{}: d^{{{}}}, *B* = {:.0} cm⁻¹, *C*/*B* = {:.2}",
            spinstate::plot::text::formula_markup(&c.formula()),
            dn,
            c.b.value,
            c_over_b
        ),
        None => report.caption(),
    };
    let highlight = if args.highlight_spins {
        marks::spin_highlights(dn, geometry, c_over_b)?
    } else {
        Vec::new()
    };
    let options = EnergyOptions {
        column: args.figure.column(),
        title,
        highlight,
    };
    let figure = DiagramFigure { options, sample };
    let asked = args.output.asked().csv(&args.csv).svg(&args.svg);
    emit(&report, &figure, asked.figure(&args.figure))
}
