//! Command-line layer: parse arguments, call the library, render. No science here.

pub mod bands;
pub mod check;
pub mod common;
pub mod crossover;
pub mod data;
pub mod demo;
pub mod diagram;
pub mod evans;
pub mod figure;
pub mod fit_bands;
pub mod levels;
pub mod magnetism;
pub mod measured;
pub mod moment;
pub mod predict;
pub mod schema;
pub mod sco_curve;
pub mod sco_fit;
pub mod screen;
pub mod structure;

use clap::{Parser, Subcommand};
use spinstate::tables::DataSet;
use std::path::PathBuf;

/// spinstate — spin states of d-block complexes from a full d^n ligand-field calculation.
#[derive(Debug, Parser)]
#[command(name = "spinstate", version, about, long_about = None)]
pub struct Cli {
    /// Directory with edited copies of the data tables (ions.csv, ligands.csv, …) that replace
    /// the bundled ones.
    #[arg(long, global = true, value_name = "DIR")]
    pub data: Option<PathBuf>,
    #[command(subcommand)]
    pub command: Command,
}

#[derive(Debug, Subcommand)]
pub enum Command {
    /// All d^n levels for given B, C and ligand field, labelled and sorted by energy.
    Levels(levels::Args),
    /// Tanabe–Sugano style diagram: E/B of every level against Δ/B (table, CSV, SVG).
    Diagram(diagram::Args),
    /// Δ/B at which the ground-state spin changes, for one d^n or every d^n of a geometry.
    Crossover(crossover::Args),
    /// Evans-method NMR shift → χ_M, χ_M·T, μ_eff and unpaired electrons, with uncertainties.
    Evans(evans::Args),
    /// Measured χ_M, χ_M·T, μ_eff or magnetometer reading → the same quantities.
    Moment(moment::Args),
    /// χ(T), χT and μ_eff from the full ligand field with spin–orbit coupling (van Vleck).
    Magnetism(magnetism::Args),
    /// Spin state, ground term, moments and bands of a complex from metal, oxidation state,
    /// geometry and ligands (Δ, B, C estimated or given).
    Predict(predict::Args),
    /// Rank candidate coordination spheres (from a ligand pool or a CSV file) by their distance
    /// to the spin crossover, for SCO design or to stay safely high- or low-spin.
    Screen(screen::Args),
    /// List the chemistry data tables (ions, ligands) with their sources.
    Data(data::Args),
    /// Fit 10Dq and Racah B (and C) to observed d–d band maxima, with band assignment.
    FitBands(fit_bands::Args),
    /// Band-count check: spin-allowed bands of each spin state inside a spectrometer window.
    Bands(bands::Args),
    /// One verdict on the spin state from all the evidence (Evans, magnetometer, bands, bond
    /// length or a whole structure) for one complex or every row of a CSV file.
    Check(Box<check::Args>),
    /// Run the invented screening scenario of data/demo end to end.
    Demo(demo::Args),
    /// Fit a spin transition (T½, ΔH, ΔS, Γ, hysteresis) to χ_M·T(T) or variable-temperature
    /// Evans data.
    ScoFit(sco_fit::Args),
    /// Simulate a spin transition: γ_HS(T) and χ_M·T(T) on both branches.
    ScoCurve(sco_curve::Args),
    /// Metal centres of crystal structures (CIF) or coordinates (XYZ): bonds, shape measures,
    /// Σ/Θ/ζ and the spin state the bond lengths support; several files compared.
    Structure(structure::Args),
    /// The JSON Schema of a command's --json output (field descriptions with units).
    Schema(schema::Args),
}

/// A failure with its exit code (1: computation did not finish, 2: bad usage or input).
#[derive(Debug)]
pub struct Failure {
    pub code: u8,
    pub message: String,
    /// The library error it came from, kept until [`run`] renders it with the options of the
    /// command ([`common::render_error`]).
    pub error: Option<Box<spinstate::Error>>,
}

impl Failure {
    pub fn usage(message: impl Into<String>) -> Self {
        Failure {
            code: 2,
            message: message.into(),
            error: None,
        }
    }

    /// The message, with the command's options named when it came from a library error.
    fn rendered(mut self, cmd: common::Cmd) -> Self {
        if let Some(e) = self.error.take() {
            self.message = common::render_error(&e, cmd);
        }
        self
    }
}

impl From<spinstate::Error> for Failure {
    fn from(e: spinstate::Error) -> Self {
        Failure {
            code: e.exit_code(),
            message: e.to_string(),
            error: Some(Box::new(e)),
        }
    }
}

/// What a command produced: text for stdout, plus an exit code (0 unless some rows failed).
#[derive(Debug, Default)]
pub struct Output {
    pub stdout: String,
    /// Messages for stderr that do not stop the command (e.g. bad rows in batch mode).
    pub warnings: Vec<String>,
    pub code: u8,
}

/// Runs the parsed command. One rule for the global `--data DIR` across commands: it must name
/// an existing directory (checked before any command runs), and a command that reads no table
/// says so instead of ignoring it silently.
pub fn run(cli: Cli) -> Result<Output, Failure> {
    if let Some(dir) = cli.data.as_deref() {
        if !dir.is_dir() {
            return Err(Failure::usage(format!(
                "--data: '{}' is not an existing directory (give a directory holding edited copies of the data tables, e.g. ions.csv, ligands.csv)",
                dir.display()
            )));
        }
    }
    let reads_no_table = matches!(
        cli.command,
        Command::Levels(_)
            | Command::Diagram(_)
            | Command::Crossover(_)
            | Command::ScoCurve(_)
            | Command::Schema(_)
    );
    let data_unused = cli.data.is_some() && reads_no_table;
    let cmd = Command::name_of(&cli.command);
    // One data set for the whole run: each table is read on first use, at most once.
    let from_dir;
    let data = match cli.data.as_deref() {
        Some(dir) => {
            from_dir = DataSet::from_dir(dir)?;
            &from_dir
        }
        None => DataSet::bundled(),
    };
    let mut out = dispatch(cli.command, data).map_err(|f| f.rendered(cmd))?;
    if data_unused {
        out.warnings
            .push("note: --data is not used by this command (it reads no data table)".into());
    }
    Ok(out)
}

impl Command {
    fn name_of(c: &Command) -> common::Cmd {
        use common::Cmd;
        match c {
            Command::Levels(_) => Cmd::Levels,
            Command::Diagram(_) => Cmd::Diagram,
            Command::Crossover(_) => Cmd::Crossover,
            Command::Evans(_) => Cmd::Evans,
            Command::Moment(_) => Cmd::Moment,
            Command::Magnetism(_) => Cmd::Magnetism,
            Command::Predict(_) => Cmd::Predict,
            Command::Screen(_) => Cmd::Screen,
            Command::Data(_) => Cmd::Data,
            Command::FitBands(_) => Cmd::FitBands,
            Command::Bands(_) => Cmd::Bands,
            Command::Check(_) => Cmd::Check,
            Command::Demo(_) => Cmd::Demo,
            Command::ScoFit(_) => Cmd::ScoFit,
            Command::ScoCurve(_) => Cmd::ScoCurve,
            Command::Structure(_) => Cmd::Structure,
            Command::Schema(_) => Cmd::Schema,
        }
    }
}

fn dispatch(command: Command, data: &DataSet) -> Result<Output, Failure> {
    match command {
        Command::Levels(a) => levels::run(&a),
        Command::Diagram(a) => diagram::run(&a, data),
        Command::Crossover(a) => crossover::run(&a),
        Command::Evans(a) => evans::run(&a, data),
        Command::Moment(a) => moment::run(&a, data),
        Command::Magnetism(a) => magnetism::run(&a, data),
        Command::Predict(a) => predict::run(&a, data),
        Command::Screen(a) => screen::run(&a, data),
        Command::Data(a) => data::run(&a, data),
        Command::FitBands(a) => fit_bands::run(&a, data),
        Command::Bands(a) => bands::run(&a, data),
        Command::Check(a) => check::run(&a, data),
        Command::Demo(a) => demo::run(&a, data),
        Command::ScoFit(a) => sco_fit::run(&a, data),
        Command::ScoCurve(a) => sco_curve::run(&a),
        Command::Structure(a) => structure::run(&a, data),
        Command::Schema(a) => schema::run(&a),
    }
}
