//! Options shared by several commands, declared once.

use super::Failure;
use spinstate::complex::LigandCount;
use spinstate::engine::{Calculation, Geometry};
use spinstate::report::Render;
use spinstate::spectra::SpinKind;
use spinstate::tables::DataSet;
use spinstate::Param;
use std::path::{Path, PathBuf};

/// The output options every command takes (`--json`; a form every report has, built from
/// serde like JSON, goes here too). The output options are declared in this file once: this
/// struct, and one struct per form only some reports have (CSV, SVG, JSON lines), which a
/// command flattens when its report has that form (clap then refuses the others in one line).
/// [`Asked`] gathers what was asked and [`emit`] renders it.
#[derive(Debug, Clone, Default, clap::Args)]
pub struct OutputArgs {
    /// Print machine-readable JSON (a top-level object) instead of a table.
    #[arg(long)]
    pub json: bool,
}

/// `--csv FILE` ('-' for stdout), for commands whose report has a CSV form.
#[derive(Debug, Clone, Default, clap::Args)]
pub struct CsvOutput {
    /// Also write the result as CSV (header row, full precision) to FILE ('-' for stdout,
    /// instead of the table or JSON).
    #[arg(long = "csv", id = "csv", value_name = "FILE")]
    pub file: Option<PathBuf>,
}

/// `--svg FILE` ('-' for stdout), for commands whose report has a figure.
#[derive(Debug, Clone, Default, clap::Args)]
pub struct SvgOutput {
    /// Write an SVG figure to FILE ('-' for stdout, instead of the table or JSON).
    #[arg(long = "svg", id = "svg", value_name = "FILE")]
    pub file: Option<PathBuf>,
}

/// `--jsonl`, for commands that stream rows.
#[derive(Debug, Clone, Default, clap::Args)]
pub struct JsonlOutput {
    /// Print one JSON object per line as each row is done.
    #[arg(long = "jsonl", id = "jsonl", conflicts_with = "json")]
    pub lines: bool,
}

/// What the output options of a command ask for.
#[derive(Debug, Clone, Copy, Default)]
pub struct Asked<'a> {
    pub json: bool,
    pub csv: Option<&'a Path>,
    pub svg: Option<&'a Path>,
    pub png: Option<&'a Path>,
}

/// `-` as a file name: standard output.
fn is_stdout(path: Option<&Path>) -> bool {
    path.is_some_and(|p| p.as_os_str() == "-")
}

impl OutputArgs {
    /// The output asked for by this option alone; add the others with [`Asked::csv`], … .
    pub fn asked(&self) -> Asked<'_> {
        Asked {
            json: self.json,
            ..Asked::default()
        }
    }
}

impl<'a> Asked<'a> {
    pub fn csv(self, o: &'a CsvOutput) -> Self {
        Asked {
            csv: o.file.as_deref(),
            ..self
        }
    }

    pub fn svg(self, o: &'a SvgOutput) -> Self {
        Asked {
            svg: o.file.as_deref(),
            ..self
        }
    }

    /// The PNG copy of the figure (`--png` of [`super::figure::FigureArgs`]).
    pub fn figure(self, f: &'a super::figure::FigureArgs) -> Self {
        Asked {
            png: f.png.as_deref(),
            ..self
        }
    }

    /// `--csv -`: the CSV is what goes to stdout.
    pub fn csv_to_stdout(&self) -> bool {
        is_stdout(self.csv)
    }

    /// True when stdout gets the human table (no JSON, no CSV or SVG to stdout).
    pub fn shows_table(&self) -> bool {
        !self.json && !self.csv_to_stdout() && !is_stdout(self.svg)
    }
}

/// Writes a rendered form to `path` for `option`, returning the note for stderr.
fn write_form(
    option: &str,
    path: &Path,
    text: &str,
    summary: Option<String>,
) -> Result<String, Failure> {
    std::fs::write(path, text)
        .map_err(|e| Failure::usage(format!("{option}: cannot write {}: {e}", path.display())))?;
    Ok(match summary {
        Some(s) => format!("wrote {} ({s})", path.display()),
        None => format!("wrote {}", path.display()),
    })
}

/// A form the command's report does not have (a command flattens only the options of the
/// forms it has, so this names a mistake in the command line layer, said in one line).
fn unavailable(option: &str) -> Failure {
    Failure::usage(format!(
        "{option} is not available for this result; accepted: --json and the options in --help"
    ))
}

/// The one way a command's result leaves the program: the files asked for (CSV, SVG, PNG;
/// each noted on stderr), and on stdout the CSV or SVG when its file is '-', else the JSON
/// with --json, else the table. `figure` is what the report's figure needs beyond its data
/// (`&()` for reports without one).
pub fn emit<R: Render>(
    report: &R,
    figure: &R::Figure,
    asked: Asked<'_>,
) -> Result<super::Output, Failure> {
    if asked.csv_to_stdout() && is_stdout(asked.svg) {
        return Err(Failure::usage(
            "--csv - and --svg - both ask for stdout: write one of them to a FILE",
        ));
    }
    let mut out = super::Output::default();
    let mut stdout = None;
    if let Some(path) = asked.csv {
        let text = report.csv().ok_or_else(|| unavailable("--csv"))?;
        if is_stdout(Some(path)) {
            stdout = Some(text);
        } else {
            out.warnings
                .push(write_form("--csv", path, &text, report.csv_summary())?);
        }
    }
    if asked.svg.is_some() || asked.png.is_some() {
        let svg = report.svg(figure).ok_or_else(|| {
            unavailable(if asked.svg.is_some() {
                "--svg"
            } else {
                "--png"
            })
        })?;
        if let Some(path) = asked.svg {
            if is_stdout(Some(path)) {
                stdout = Some(svg.clone());
            } else {
                out.warnings.push(write_form("--svg", path, &svg, None)?);
            }
        }
        if let Some(path) = asked.png {
            out.warnings.push(super::figure::write_png(&svg, path)?);
        }
    }
    out.stdout = match stdout {
        Some(text) => text,
        None if asked.json => report.json(),
        None => report.table(),
    };
    Ok(out)
}

/// The parameters of one ligand-field calculation: absolute (cm⁻¹) or as ratios to B.
#[derive(Debug, Clone, clap::Args)]
pub struct FieldArgs {
    /// Number of d electrons, 0..=10 (required unless the command takes --metal instead).
    #[arg(long, value_name = "N")]
    pub dn: Option<usize>,
    /// Geometry: oct, tet, sqpl or tetragonal.
    #[arg(long, value_name = "G", value_parser = parsed::<Geometry>)]
    pub geometry: Geometry,
    /// Racah B in cm⁻¹ (needs --c).
    #[arg(long, value_name = "CM-1", allow_hyphen_values = true)]
    pub b: Option<f64>,
    /// Racah C in cm⁻¹ (needs --b).
    #[arg(long, value_name = "CM-1", allow_hyphen_values = true)]
    pub c: Option<f64>,
    /// Dq in cm⁻¹ (Δ = 10Dq; for tet the positive Δt/10).
    #[arg(long, value_name = "CM-1", allow_hyphen_values = true)]
    pub dq: Option<f64>,
    /// C/B ratio (energies are then in units of B; use with --delta-over-b).
    #[arg(long, value_name = "R", allow_hyphen_values = true)]
    pub c_over_b: Option<f64>,
    /// Δ/B = 10Dq/B (ratio mode).
    #[arg(long, value_name = "X", allow_hyphen_values = true)]
    pub delta_over_b: Option<f64>,
    /// Tetragonal parameter Ds in cm⁻¹ (or units of B in ratio mode).
    #[arg(
        long,
        value_name = "CM-1",
        default_value_t = 0.0,
        allow_hyphen_values = true
    )]
    pub ds: f64,
    /// Tetragonal parameter Dt in cm⁻¹ (or units of B in ratio mode).
    #[arg(
        long,
        value_name = "CM-1",
        default_value_t = 0.0,
        allow_hyphen_values = true
    )]
    pub dt: f64,
    /// One-electron spin–orbit constant ζ in cm⁻¹ (or units of B in ratio mode); default off
    /// (with --metal, where a command takes it: the free-ion value of the ion table).
    #[arg(long, value_name = "CM-1", allow_hyphen_values = true)]
    pub zeta: Option<f64>,
}

/// Resolved parameters in the unit of the calculation.
#[derive(Debug, Clone)]
pub struct Resolved {
    pub geometry: Geometry,
    pub calc: Calculation,
    pub dq: f64,
    pub ds: f64,
    pub dt: f64,
    pub zeta: f64,
    /// True when the input was given as ratios (energies in units of B).
    pub ratio_mode: bool,
}

/// A complex named by metal, oxidation state and ligands (all optional: commands that also take
/// d^n and field parameters directly flatten this in).
#[derive(Debug, Clone, clap::Args)]
pub struct ComplexArgs {
    /// Metal of the complex (with --ox and --ligand): d^n, Δ, B, C and ζ come from the data
    /// tables unless given, as in `predict`.
    #[arg(long, value_name = "SYMBOL", requires_all = ["ox", "ligands"])]
    pub metal: Option<String>,
    /// Oxidation state of the metal.
    #[arg(long, value_name = "N", allow_hyphen_values = true, requires = "metal")]
    pub ox: Option<i32>,
    /// A ligand, NAME[:COUNT] (repeatable; e.g. --ligand NCS:2 --ligand py:4).
    #[arg(long = "ligand", value_name = "NAME[:COUNT]", requires = "metal", value_parser = parsed::<LigandCount>)]
    pub ligands: Vec<LigandCount>,
}

impl ComplexArgs {
    /// The resolved complex when --metal was given.
    pub fn resolve(
        &self,
        geometry: Geometry,
        data: &DataSet,
    ) -> Result<Option<spinstate::complex::ResolvedComplex>, Failure> {
        match &self.metal {
            Some(metal) => Ok(Some(resolve_complex(
                metal,
                self.ox.unwrap_or_default(),
                geometry,
                &self.ligands,
                data,
            )?)),
            None => Ok(None),
        }
    }
}

/// Resolves a complex given as metal, oxidation state, geometry and NAME[:COUNT] ligands, with
/// Δ, B and C estimated from the tables.
pub fn resolve_complex(
    metal: &str,
    ox: i32,
    geometry: Geometry,
    ligands: &[LigandCount],
    data: &DataSet,
) -> Result<spinstate::complex::ResolvedComplex, Failure> {
    use spinstate::complex::{ComplexSpec, Overrides};
    let ligands = ligands.to_vec();
    let spec = ComplexSpec {
        metal: metal.to_string(),
        oxidation_state: ox,
        geometry,
        ligands,
        overrides: Overrides::default(),
    };
    Ok(spec.resolve(data)?)
}

/// A clap value parser through the library's `FromStr` (`value_parser = parsed::<Geometry>`):
/// a bad value fails while the arguments are parsed, with the library's one-line message.
pub fn parsed<T>(s: &str) -> Result<T, String>
where
    T: std::str::FromStr<Err = spinstate::Error>,
{
    s.parse::<T>().map_err(|e| e.to_string())
}

impl FieldArgs {
    /// These options with what they leave open filled from a complex resolved from the tables:
    /// d^n, and B, C, Dq and ζ where not given (estimates; ζ the free-ion value). Returns the
    /// options and a note saying which values were given and which estimated.
    pub fn completed_by(
        &self,
        complex: &spinstate::complex::ResolvedComplex,
    ) -> Result<(FieldArgs, Vec<String>), Failure> {
        if self.dn.is_some() {
            return Err(Failure::usage(
                "give either --dn or --metal/--ox/--ligand, not both (--metal fixes d^n)",
            ));
        }
        if self.c_over_b.is_some() || self.delta_over_b.is_some() {
            return Err(Failure::usage(
                "with --metal give --b, --c, --dq in cm⁻¹ (ratios need --dn)",
            ));
        }
        let ion = &complex.ion;
        let mut notes = Vec::new();
        let zeta = match (self.zeta, ion.zeta) {
            (Some(z), _) => z,
            (None, Some(z)) => {
                notes.push(format!(
                    "ζ = {z} cm⁻¹: free-ion value of {}({}) from the ion table",
                    ion.symbol, ion.oxidation_state
                ));
                z
            }
            (None, None) => {
                return Err(Failure::usage(format!(
                    "no ζ for {}({}) in the ion table: give --zeta in cm⁻¹",
                    ion.symbol, ion.oxidation_state
                )))
            }
        };
        let described: Vec<String> = [
            ("Δ", self.dq.map(|d| 10.0 * d), complex.delta.value),
            ("B", self.b, complex.b.value),
            ("C", self.c, complex.c.value),
        ]
        .iter()
        .map(|(n, given, est)| match given {
            Some(g) => format!("{n} {g:.0} given"),
            None => format!("{n} {est:.0} estimated"),
        })
        .collect();
        notes.push(format!(
            "Δ, B, C for {}: {} (see `spinstate predict` for how they were estimated)",
            complex.formula(),
            described.join(", ")
        ));
        let filled = FieldArgs {
            dn: Some(ion.dn),
            b: Some(self.b.unwrap_or(complex.b.value)),
            c: Some(self.c.unwrap_or(complex.c.value)),
            dq: Some(self.dq.unwrap_or(complex.dq())),
            zeta: Some(zeta),
            ..self.clone()
        };
        Ok((filled, notes))
    }

    /// Checks the combination of options and builds the calculation.
    pub fn resolve(&self) -> Result<Resolved, Failure> {
        let geometry = self.geometry;
        let Some(dn) = self.dn else {
            return Err(Failure::usage(
                "give --dn N (0..=10), the number of d electrons",
            ));
        };
        if dn > 10 {
            return Err(Failure::usage(format!("--dn {dn} is outside 0..=10")));
        }
        let zeta = self.zeta.unwrap_or(0.0);
        let absolute = self.b.is_some() || self.c.is_some() || self.dq.is_some();
        let ratio = self.c_over_b.is_some() || self.delta_over_b.is_some();
        let (b, c, dq, ratio_mode) = match (absolute, ratio) {
            (true, true) => {
                return Err(Failure::usage(
                    "give either --b, --c, --dq (cm⁻¹) or --c-over-b, --delta-over-b (ratios), not both",
                ))
            }
            (false, false) => {
                return Err(Failure::usage(
                    "give the field: --b B --c C --dq DQ (cm⁻¹) or --c-over-b R --delta-over-b X",
                ))
            }
            (true, false) => {
                let (Some(b), Some(c)) = (self.b, self.c) else {
                    return Err(Failure::usage(
                        "--b and --c go together: give both Racah parameters in cm⁻¹",
                    ));
                };
                (b, c, self.dq.unwrap_or(0.0), false)
            }
            (false, true) => {
                let Some(r) = self.c_over_b else {
                    return Err(Failure::usage("--delta-over-b needs --c-over-b (e.g. 4.8)"));
                };
                (1.0, r, self.delta_over_b.unwrap_or(0.0) / 10.0, true)
            }
        };
        for (name, v) in [
            ("--b", b),
            ("--c (or --c-over-b)", c),
            ("--dq (or --delta-over-b)", dq),
            ("--ds", self.ds),
            ("--dt", self.dt),
            ("--zeta", zeta),
        ] {
            if !v.is_finite() {
                return Err(Failure::usage(format!("{name} {v} is not a finite number")));
            }
        }
        if b <= 0.0 {
            return Err(Failure::usage(format!("--b {b} must be > 0 cm⁻¹")));
        }
        if c < 0.0 {
            return Err(Failure::usage(format!(
                "--c {c} must be ≥ 0 (C/B is usually 3.5–5)"
            )));
        }
        if dq < 0.0 {
            return Err(Failure::usage(format!(
                "Dq {dq} must be ≥ 0 (for tet give the positive Δt/10; the sign convention is built in)"
            )));
        }
        if zeta < 0.0 {
            return Err(Failure::usage(format!(
                "--zeta {zeta} must be ≥ 0 cm⁻¹ (the one-electron constant ζ is positive)"
            )));
        }
        let field = geometry.field(dq, self.ds, self.dt)?;
        let group = geometry.point_group(self.ds, self.dt);
        let calc = Calculation::new(dn, b, c, field, group)?;
        Ok(Resolved {
            geometry,
            calc,
            dq,
            ds: self.ds,
            dt: self.dt,
            zeta,
            ratio_mode,
        })
    }
}

/// A command, as far as its option names are concerned (and as `schema COMMAND` names it).
#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub enum Cmd {
    Levels,
    Diagram,
    Crossover,
    Evans,
    Moment,
    Magnetism,
    Predict,
    Screen,
    Data,
    FitBands,
    Bands,
    Check,
    Demo,
    ScoFit,
    ScoCurve,
    Structure,
    #[value(skip)]
    Schema,
}

impl Cmd {
    /// The command's name on the command line.
    pub fn name(self) -> String {
        use clap::ValueEnum;
        self.to_possible_value()
            .map_or_else(String::new, |v| v.get_name().to_string())
    }
}

/// The option of `cmd` that sets `param`, when exactly one does. The one place that maps the
/// library's quantities to option names: library messages never name an option.
pub fn flag_of(param: &Param, cmd: Cmd) -> Option<&'static str> {
    use Cmd::*;
    // Commands that take a complex as --metal/--ox/--ligand (ComplexArgs or their own).
    let composition = matches!(
        cmd,
        Predict | Check | Screen | Magnetism | Diagram | Bands | FitBands | ScoFit | Evans | Moment
    );
    // Commands with the ligand-field options of FieldArgs or their own --b/--c.
    let field = matches!(cmd, Levels | Magnetism | Predict | Check | Bands | Diagram);
    let measured = matches!(cmd, Evans | Moment);
    Some(match param {
        Param::DataDir => "--data",
        Param::Metal | Param::MetalIon(_) | Param::MetalList if composition => "--metal",
        Param::OxidationState(_) if composition || cmd == Structure => "--ox",
        Param::Geometry if cmd != Structure && cmd != Data && cmd != Demo => "--geometry",
        Param::Ligand
        | Param::NamedLigand(_)
        | Param::LigandCount
        | Param::Ligands
        | Param::DonorAtomCount
            if composition && cmd != Screen =>
        {
            "--ligand"
        }
        Param::Delta if matches!(cmd, Predict | Check | Bands) => "--delta",
        Param::RacahB if field => "--b",
        Param::RacahC if field => "--c",
        Param::FixedB if cmd == FitBands => "--b",
        Param::FreeIonB if cmd == FitBands => "--b0",
        Param::COverB
            if matches!(
                cmd,
                Levels | Magnetism | Diagram | Crossover | Bands | FitBands
            ) =>
        {
            "--c-over-b"
        }
        Param::DeltaOverB if matches!(cmd, Levels | Magnetism | Diagram) => "--delta-over-b",
        Param::MaxDeltaOverB if cmd == Diagram => "--max",
        Param::Dq if matches!(cmd, Levels | Magnetism | Bands) || measured => "--dq",
        Param::DElectronCount
            if matches!(
                cmd,
                Levels | Diagram | Crossover | Magnetism | Bands | FitBands | ScoFit
            ) || measured =>
        {
            "--dn"
        }
        Param::Zeta if matches!(cmd, Levels | Magnetism) || measured => "--zeta",
        Param::Lambda if measured => "--lambda",
        Param::Kappa if cmd == Magnetism => "--kappa",
        Param::GFactor if cmd == Magnetism => "--g",
        Param::Points if matches!(cmd, Magnetism | Diagram | ScoCurve) => "--points",
        Param::LowestTemperature if matches!(cmd, Magnetism | ScoCurve) => "--tmin",
        Param::HighestTemperature if matches!(cmd, Magnetism | ScoCurve) => "--tmax",
        Param::Temperature if measured => "--temp",
        // Evans method
        Param::SpectrometerFrequency if cmd == Evans => "--freq-mhz",
        Param::SpectrometerFrequency if cmd == Check => "--evans-freq-mhz",
        Param::Concentration if cmd == Evans => "--conc",
        Param::Concentration if cmd == Check => "--evans-conc",
        Param::Magnet if matches!(cmd, Evans | ScoFit) => "--magnet",
        Param::Magnet if cmd == Check => "--evans-magnet",
        Param::SoluteMass if cmd == Evans => "--mass",
        Param::SolutionVolume if cmd == Evans => "--volume",
        Param::SolventChi if cmd == Evans => "--solvent-chi",
        Param::SolventChi if cmd == ScoFit => "--chi0",
        Param::SolventDensity if cmd == Evans => "--solvent-density",
        Param::SolutionDensity if cmd == Evans => "--solution-density",
        // Magnetometer and diamagnetic correction
        Param::Dia if measured || matches!(cmd, Check | ScoFit) => "--dia",
        Param::Formula | Param::PascalFormula if measured => "--formula",
        Param::MolarMass if measured => "--molar-mass",
        Param::Field if cmd == Moment => "--field",
        Param::Background if cmd == Moment => "--background",
        Param::SampleMass if cmd == Moment => "--sample-mass",
        Param::ChiM if cmd == Moment => "--chi",
        Param::ChiM if cmd == Check => "--chi-m",
        Param::ChiMT if cmd == Moment => "--chi-t",
        Param::ChiMT if cmd == Check => "--chi-m-t",
        Param::MuEff if matches!(cmd, Moment | Check) => "--mu-eff",
        // Spin transitions
        Param::Enthalpy if cmd == ScoCurve => "--dh",
        Param::Entropy if cmd == ScoCurve => "--ds",
        Param::Cooperativity if cmd == ScoCurve => "--gamma",
        Param::ResidualFraction if matches!(cmd, ScoCurve | ScoFit) => "--residual",
        Param::ChiMTOfState(SpinKind::High) if matches!(cmd, ScoCurve | ScoFit) => "--chit-hs",
        Param::ChiMTOfState(SpinKind::Low) if matches!(cmd, ScoCurve | ScoFit) => "--chit-ls",
        Param::Curve | Param::InputFile if matches!(cmd, ScoFit | Check) => "--input",
        // Bands
        Param::Bands | Param::Band | Param::BandPosition(_) | Param::NumberOfBands
            if cmd == FitBands =>
        {
            "--bands"
        }
        Param::Bands | Param::BandMaximum if cmd == Check => "--bands",
        Param::SpinForbiddenBand if cmd == FitBands => "--forbidden",
        Param::FitC if cmd == FitBands => "--fit-c",
        Param::Spin if cmd == FitBands => "--spin",
        Param::Window if cmd == Bands => "--window",
        Param::Resolution if cmd == Bands => "--resolution",
        Param::ChargeTransferOnset if cmd == Bands => "--ct-onset",
        Param::BondLength if cmd == Check => "--bond-length",
        // Structures
        Param::Cutoff if cmd == Structure => "--cutoff",
        Param::MetalIndex if cmd == Structure => "--metal-index",
        // Screening
        Param::Target if cmd == Screen => "--target",
        Param::DonorSet if cmd == Screen => "--donors",
        Param::MaxCharge if cmd == Screen => "--max-charge",
        Param::RequiredLigand if cmd == Screen => "--require",
        Param::Pool if cmd == Screen => "--pool",
        Param::CandidatesFile | Param::CandidatesHeader if cmd == Screen => "--candidates",
        _ => return None,
    })
}

/// A library error as one line for `cmd`: the option that sets the refused quantity first,
/// and the options of the quantities that would fix it last.
pub fn render_error(e: &spinstate::Error, cmd: Cmd) -> String {
    let text = e.to_string();
    let spinstate::Error::InvalidParameter { param, needs, .. } = e else {
        return text;
    };
    let mut line = match flag_of(param, cmd) {
        Some(flag) => format!("{flag}: {text}"),
        None => text,
    };
    let mut flags: Vec<&str> = Vec::new();
    for p in needs {
        if let Some(f) = flag_of(p, cmd) {
            if !flags.contains(&f) {
                flags.push(f);
            }
        }
    }
    if !flags.is_empty() {
        line.push_str(&format!(" (options: {})", flags.join(", ")));
    }
    line
}

#[cfg(test)]
mod tests {
    use super::*;
    use spinstate::Error;

    #[test]
    fn errors_name_the_option_of_the_command() {
        let e = Error::invalid(Param::Delta, -5, "a value in cm⁻¹ above 0");
        assert_eq!(
            render_error(&e, Cmd::Predict),
            "--delta: Δ = -5 is not accepted: a value in cm⁻¹ above 0"
        );
        // A command without such an option keeps the library's words.
        assert_eq!(
            render_error(&e, Cmd::Levels),
            "Δ = -5 is not accepted: a value in cm⁻¹ above 0"
        );
        let e = Error::invalid(Param::Shift, "-0.4 ppm", "a positive shift")
            .needing([Param::Magnet, Param::Magnet]);
        assert_eq!(
            render_error(&e, Cmd::Evans),
            "shift = -0.4 ppm is not accepted: a positive shift (options: --magnet)"
        );
        assert!(render_error(&e, Cmd::Check).ends_with("(options: --evans-magnet)"));
    }

    #[test]
    fn the_same_quantity_has_each_commands_own_option() {
        assert_eq!(flag_of(&Param::Magnet, Cmd::Evans), Some("--magnet"));
        assert_eq!(flag_of(&Param::Magnet, Cmd::Check), Some("--evans-magnet"));
        assert_eq!(flag_of(&Param::FixedB, Cmd::FitBands), Some("--b"));
        assert_eq!(flag_of(&Param::RacahB, Cmd::Crossover), None);
        assert_eq!(
            flag_of(&Param::OxidationState("Fe".into()), Cmd::Screen),
            Some("--ox")
        );
    }
}
