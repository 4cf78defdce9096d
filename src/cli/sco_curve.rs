//! `spinstate sco-curve`: simulate a spin transition, γ_HS(T) and χ_M·T(T) on both branches.

use super::common::{emit, CsvOutput, OutputArgs, SvgOutput};
use super::{Failure, Output};
use spinstate::magnetism::temperature_grid;
use spinstate::report::sco::{CurveReport, TransitionPlot};
use spinstate::sco::model::Transition;

#[derive(Debug, clap::Args)]
#[command(
    mut_arg("csv", |a| a.help("Write every point as CSV to FILE ('-' for stdout)")),
    mut_arg("svg", |a| a.help("Write an SVG plot of χ_M·T (and γ_HS) against T to FILE ('-' for stdout)"))
)]
pub struct Args {
    /// ΔH = H_HS − H_LS (kJ/mol).
    #[arg(long, value_name = "KJ/MOL", allow_hyphen_values = true)]
    pub dh: f64,
    /// ΔS = S_HS − S_LS (J/mol/K).
    #[arg(long, value_name = "J/MOL/K", allow_hyphen_values = true)]
    pub ds: f64,
    /// Interaction parameter Γ (kJ/mol) of the Slichter–Drickamer model; 0 = ideal.
    #[arg(
        long,
        value_name = "KJ/MOL",
        default_value_t = 0.0,
        allow_hyphen_values = true
    )]
    pub gamma: f64,
    /// Trapped high-spin fraction (0 ≤ r < 1).
    #[arg(
        long,
        value_name = "R",
        default_value_t = 0.0,
        allow_hyphen_values = true
    )]
    pub residual: f64,
    /// χ_M·T of the pure high-spin state (cm³ K/mol; 3.0 is spin-only iron(II)).
    #[arg(
        long,
        value_name = "X",
        default_value_t = 3.0,
        allow_hyphen_values = true
    )]
    pub chit_hs: f64,
    /// χ_M·T of the pure low-spin state (cm³ K/mol).
    #[arg(
        long,
        value_name = "Y",
        default_value_t = 0.0,
        allow_hyphen_values = true
    )]
    pub chit_ls: f64,
    /// Lowest temperature (K).
    #[arg(
        long,
        value_name = "K",
        default_value_t = 50.0,
        allow_hyphen_values = true
    )]
    pub tmin: f64,
    /// Highest temperature (K).
    #[arg(
        long,
        value_name = "K",
        default_value_t = 350.0,
        allow_hyphen_values = true
    )]
    pub tmax: f64,
    /// Number of temperatures from tmin to tmax, both included.
    #[arg(long, value_name = "P", default_value_t = 61)]
    pub points: usize,
    #[command(flatten)]
    pub csv: CsvOutput,
    #[command(flatten)]
    pub svg: SvgOutput,
    /// What the figure shows against T: chit (χ_M·T, with γ_HS on a right-hand axis) or gamma
    /// (the high-spin fraction γ_HS).
    /// [default: chit]
    #[arg(long, value_name = "Q", value_parser = ["chit", "gamma"])]
    pub plot: Option<String>,
    #[command(flatten)]
    pub figure: super::figure::FigureArgs,
    #[command(flatten)]
    pub output: OutputArgs,
}

pub fn run(args: &Args) -> Result<Output, Failure> {
    args.figure
        .check_used(args.svg.file.is_some(), &[(args.plot.is_some(), "--plot")])?;
    let tr = Transition {
        dh: args.dh * 1000.0,
        ds: args.ds,
        gamma: args.gamma * 1000.0,
        residual: args.residual,
    }
    .checked()
    .map_err(|e| Failure::usage(format!("sco-curve: {e}")))?;
    for (name, v) in [("--chit-hs", args.chit_hs), ("--chit-ls", args.chit_ls)] {
        if !v.is_finite() || v < 0.0 {
            return Err(Failure::usage(format!("{name} {v}: a χ_M·T ≥ 0 cm³ K/mol")));
        }
    }
    let temps = temperature_grid(args.tmin, args.tmax, args.points)?;
    let report = CurveReport::new(&tr, &temps, args.chit_hs, args.chit_ls)?;
    let plot = TransitionPlot {
        column: args.figure.column(),
        fraction: args.plot.as_deref() == Some("gamma"),
    };
    let asked = args.output.asked().csv(&args.csv).svg(&args.svg);
    emit(&report, &plot, asked.figure(&args.figure))
}
