//! `spinstate sco-fit`: fit a spin transition to χ_M·T(T) or variable-temperature Evans data.

use super::common::{emit, CsvOutput, OutputArgs, SvgOutput};
use super::{Failure, Output};
use spinstate::measured::evans::MagnetGeometry;
use spinstate::report::sco::{FitReport, TransitionPlot};
use spinstate::sco::data::{read_curve, read_evans_series, EvansSeries};
use spinstate::sco::fit::{fit, FitRequest, ModelKind, PureState};
use spinstate::sco::pure_state_ranges;
use spinstate::tables::DataSet;
use spinstate::units::spin_only_chi_t_cgs;
use std::path::PathBuf;

#[derive(Debug, clap::Args)]
#[command(
    mut_arg("csv", |a| a.help("Write the points with the fit as CSV to FILE ('-' for stdout)")),
    mut_arg("svg", |a| a.help("Write an SVG plot of the data, the fitted curve and the residuals to FILE ('-' for stdout)"))
)]
pub struct Args {
    /// CSV file: a temperature column and one of χ_M·T, χ_M or μ_eff (headers T, chiT, chi_m,
    /// mu_eff, each with an optional _unit), optional `direction` (cooling/heating) and `err`;
    /// with --evans: T, shift_ppm (or shift_hz and freq_mhz), conc (mol/L), optional
    /// density_solution and density_solvent (g/cm³).
    #[arg(long, value_name = "FILE")]
    pub input: PathBuf,
    /// The file is a variable-temperature Evans series.
    #[arg(long)]
    pub evans: bool,
    /// Model: ideal (two-state) or cooperative (Slichter–Drickamer, with hysteresis).
    #[arg(long, value_name = "MODEL", default_value = "ideal", value_parser = ["ideal", "cooperative"])]
    pub model: String,
    /// Fix χ_M·T of the high-spin state (cm³ K/mol) instead of fitting it.
    #[arg(long, value_name = "X", allow_hyphen_values = true)]
    pub chit_hs: Option<f64>,
    /// Fix χ_M·T of the low-spin state (cm³ K/mol) instead of fitting it.
    #[arg(long, value_name = "Y", allow_hyphen_values = true)]
    pub chit_ls: Option<f64>,
    /// Fit a trapped high-spin fraction (χ_M·T of the low-spin state is then fixed: at
    /// --chit-ls, or its spin-only value).
    #[arg(long)]
    pub residual: bool,
    /// Metal and oxidation state: set d^n, ζ and the physically possible χ_M·T of each state.
    #[arg(long, value_name = "SYMBOL", requires = "ox")]
    pub metal: Option<String>,
    #[arg(long, value_name = "N", allow_hyphen_values = true, requires = "metal")]
    pub ox: Option<i32>,
    /// d-electron count, instead of --metal/--ox (no ζ: spin-only and typical ranges).
    #[arg(long, value_name = "N", conflicts_with = "metal")]
    pub dn: Option<usize>,
    /// Geometry for the pure-state ranges.
    #[arg(long, value_name = "G", default_value = "oct", value_parser = super::common::parsed::<spinstate::engine::Geometry>)]
    pub geometry: spinstate::engine::Geometry,
    /// Diamagnetic correction χ_D (cm³/mol, ≤ 0) subtracted from χ_M (χ_M files and Evans).
    #[arg(
        long,
        value_name = "CM3/MOL",
        default_value_t = 0.0,
        allow_hyphen_values = true
    )]
    pub dia: f64,
    /// Evans: magnet geometry (solenoid, the default, or transverse).
    #[arg(long, value_name = "M", value_parser = super::common::parsed::<MagnetGeometry>)]
    pub magnet: Option<MagnetGeometry>,
    /// Evans: mass susceptibility of the solvent (cm³/g) for the solvent term.
    #[arg(long, value_name = "CM3/G", allow_hyphen_values = true)]
    pub chi0: Option<f64>,
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

pub fn run(args: &Args, data: &DataSet) -> Result<Output, Failure> {
    args.figure
        .check_used(args.svg.file.is_some(), &[(args.plot.is_some(), "--plot")])?;
    for (given, option) in [
        (args.magnet.is_some(), "--magnet"),
        (args.chi0.is_some(), "--chi0"),
    ] {
        super::figure::only_with(given, option, args.evans, "--evans")?;
    }
    let text = spinstate::input_file::read_text(&args.input).map_err(|e| {
        Failure::usage(format!(
            "--input: cannot read {}: {e}",
            args.input.display()
        ))
    })?;
    if args.dia > 0.0 {
        return Err(Failure::usage(format!(
            "--dia {}: a diamagnetic correction is ≤ 0 cm³/mol",
            args.dia
        )));
    }
    let curve = if args.evans {
        let magnet = args.magnet.unwrap_or(MagnetGeometry::Solenoid);
        read_evans_series(
            &text,
            &EvansSeries {
                magnet,
                dia: args.dia,
                chi0: args.chi0,
            },
        )?
    } else {
        read_curve(&text, args.dia)?
    };
    let geometry = args.geometry;
    let (dn, zeta) = match (&args.metal, args.ox, args.dn) {
        (Some(m), Some(ox), _) => {
            let ion = data.ions()?.find(m, ox)?;
            (Some(ion.dn), ion.zeta)
        }
        (None, _, Some(dn)) => (Some(dn), None),
        _ => (None, None),
    };
    let mut notes = curve.notes.clone();
    if args.evans {
        notes.push("safety: variable-temperature NMR needs a tube rated for the vapour pressure at the highest temperature and the solvent's liquid range; superconducting magnets pull ferromagnetic objects; follow your institution's rules".into());
    }
    let ranges = match dn {
        Some(dn) => Some(pure_state_ranges(
            dn,
            geometry,
            zeta,
            data.moment_ranges()?,
        )?),
        None => {
            notes.push("no --metal/--ox or --dn: the pure-state χ_M·T are fitted within a wide generic range (0–4.5 high spin, 0–1 low spin cm³ K/mol); give the ion for its physical range".into());
            None
        }
    };
    let (hs_range, ls_range, why) = match &ranges {
        Some(r) => (r.high_spin, r.low_spin, r.why.clone()),
        None => ((0.5, 4.5), (0.0, 1.0), "generic range".to_string()),
    };
    let chit_hs = match args.chit_hs {
        Some(v) => PureState::Fixed(v),
        None => PureState::Within {
            lo: hs_range.0,
            hi: hs_range.1,
            why: why.clone(),
        },
    };
    let chit_ls = match (args.chit_ls, args.residual) {
        (Some(v), _) => PureState::Fixed(v),
        (None, true) => {
            let so = ranges
                .as_ref()
                .map_or(0.0, |r| spin_only_chi_t_cgs(r.two_s.1 as f64));
            notes.push(format!(
                "with --residual, χ_M·T of the low-spin state is fixed at its spin-only value {so:.3} cm³ K/mol"
            ));
            PureState::Fixed(so)
        }
        (None, false) => PureState::Within {
            lo: ls_range.0,
            hi: ls_range.1,
            why,
        },
    };
    let model = match args.model.as_str() {
        "cooperative" => ModelKind::Cooperative,
        _ => ModelKind::Ideal,
    };
    let result = fit(&FitRequest {
        points: curve.points,
        model,
        chit_hs,
        chit_ls,
        residual: args.residual,
        two_s: ranges.as_ref().map(|r| r.two_s),
    })?;
    let report = FitReport::new(&result, &curve.source, &notes);
    let plot = TransitionPlot {
        column: args.figure.column(),
        fraction: args.plot.as_deref() == Some("gamma"),
    };
    let asked = args.output.asked().csv(&args.csv).svg(&args.svg);
    emit(&report, &plot, asked.figure(&args.figure))
}
