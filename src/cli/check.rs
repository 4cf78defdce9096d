//! `spinstate check`: one verdict on the spin state from all the evidence, for one complex given
//! by options or for every row of a CSV file (`--input`).

use super::common::{emit, CsvOutput, JsonlOutput, OutputArgs};
use super::figure::write_html;
use super::{Failure, Output};
use indicatif::{ProgressBar, ProgressStyle};
use spinstate::check::batch::{self, RowError, Sample};
use spinstate::check::{check, CurveInput};
use spinstate::report::check::{
    rows_table, BatchReport, BatchRow, CheckReport, RowErrorRow, SAFETY,
};
use spinstate::report::figures::sample_figures;
use spinstate::report::html::{self, parameter_rows, Section};
use spinstate::tables::DataSet;
use std::io::IsTerminal;
use std::path::{Path, PathBuf};

/// Batches at least this long show a progress bar (when stdout is a terminal).
const PROGRESS_FROM: usize = 20;

#[derive(Debug, clap::Args)]
#[command(
    after_help = SAFETY,
    mut_arg("csv", |a| a.help("Also write the verdicts as CSV to FILE ('-' for stdout, instead of the table or JSON)")),
    mut_arg("jsonl", |a| a.requires("input").help("With --input: print one JSON object per line as each row is checked (a sample's report under \"sample\", a bad row under \"error\", each with its \"row\")"))
)]
pub struct Args {
    /// CSV file with one sample per row (columns: see the manual, `cargo doc` → spinstate::manual, or `data/demo/samples.csv`).
    #[arg(long, value_name = "FILE", conflicts_with_all = ["metal", "ligands"])]
    pub input: Option<PathBuf>,
    /// Metal element symbol, e.g. Fe.
    #[arg(long, value_name = "SYMBOL", required_unless_present_any = ["input", "structure"], requires_all = ["ox", "ligands"])]
    pub metal: Option<String>,
    /// Oxidation state of the metal.
    #[arg(long, value_name = "N", allow_hyphen_values = true)]
    pub ox: Option<i32>,
    /// Geometry: oct, tet, sqpl, sqpy (square pyramid) or tbp (trigonal bipyramid). With
    /// --structure it may be left out: the structure's field is then the prediction (and the
    /// closest named shape is used for Δ/B); given, both predictions are listed.
    #[arg(long, value_name = "G", value_parser = super::common::parsed::<spinstate::engine::Geometry>)]
    pub geometry: Option<spinstate::engine::Geometry>,
    /// A crystal structure (.cif) or coordinates (.xyz) of the complex: its bond lengths become
    /// evidence and the field at its geometry a prediction. Needs --ox and --ligand; the metal
    /// is the structure's. Replaces --bond-length (give one of the two).
    #[arg(long, value_name = "FILE", conflicts_with = "input")]
    pub structure: Option<PathBuf>,
    #[command(flatten)]
    pub centre: super::structure::CentreArgs,
    /// A ligand, NAME[:COUNT] (repeatable), as in `predict`.
    #[arg(long = "ligand", value_name = "NAME[:COUNT]", value_parser = super::common::parsed::<spinstate::complex::LigandCount>)]
    pub ligands: Vec<spinstate::complex::LigandCount>,
    /// Measured Δ in cm⁻¹ (instead of the f·g estimate).
    #[arg(long, value_name = "CM-1", allow_hyphen_values = true)]
    pub delta: Option<f64>,
    /// Measured Racah B in cm⁻¹.
    #[arg(long, value_name = "CM-1", allow_hyphen_values = true)]
    pub b: Option<f64>,
    /// Measured Racah C in cm⁻¹.
    #[arg(long, value_name = "CM-1", allow_hyphen_values = true)]
    pub c: Option<f64>,
    /// Evans shift of the reference line, solution minus insert, in ppm.
    #[arg(long, value_name = "PPM", allow_hyphen_values = true)]
    pub evans_shift_ppm: Option<f64>,
    /// The same shift in Hz (with --evans-freq-mhz).
    #[arg(long, value_name = "HZ", allow_hyphen_values = true)]
    pub evans_shift_hz: Option<f64>,
    /// Spectrometer frequency in MHz.
    #[arg(long, value_name = "MHZ", allow_hyphen_values = true)]
    pub evans_freq_mhz: Option<f64>,
    /// Uncertainty of the Evans shift (ppm or Hz, as given).
    #[arg(long, value_name = "PPM|HZ")]
    pub evans_shift_err: Option<f64>,
    /// Concentration of the paramagnet in mol/L.
    #[arg(long, value_name = "MOL/L", allow_hyphen_values = true)]
    pub evans_conc: Option<f64>,
    /// Uncertainty of --evans-conc in mol/L.
    #[arg(long, value_name = "MOL/L")]
    pub evans_conc_err: Option<f64>,
    /// Probe temperature of the Evans measurement in K.
    #[arg(long, value_name = "K", allow_hyphen_values = true)]
    pub evans_temp: Option<f64>,
    /// Magnet geometry: solenoid (default) or transverse.
    #[arg(long, value_name = "GEOMETRY")]
    pub evans_magnet: Option<String>,
    /// Effective moment in μB (magnetometer, corrected).
    #[arg(
        long,
        value_name = "MUB",
        allow_hyphen_values = true,
        group = "magnetometer"
    )]
    pub mu_eff: Option<f64>,
    /// Molar susceptibility as measured, in cm³/mol (before the diamagnetic correction).
    #[arg(
        long,
        value_name = "CM3/MOL",
        allow_hyphen_values = true,
        group = "magnetometer"
    )]
    pub chi_m: Option<f64>,
    /// Corrected χ_M·T in cm³ K/mol.
    #[arg(
        long,
        value_name = "CM3 K/MOL",
        allow_hyphen_values = true,
        group = "magnetometer"
    )]
    pub chi_m_t: Option<f64>,
    /// Uncertainty of the magnetometer value (same unit).
    #[arg(long, value_name = "X")]
    pub moment_err: Option<f64>,
    /// Temperature of the magnetometer value in K.
    #[arg(long, value_name = "K", allow_hyphen_values = true)]
    pub moment_temp: Option<f64>,
    /// Diamagnetic correction χ_D in cm³/mol (≤ 0) for the Evans and magnetometer values.
    #[arg(long, value_name = "CM3/MOL", allow_hyphen_values = true)]
    pub dia: Option<f64>,
    /// Observed d–d band maxima in cm⁻¹, e.g. "9400 20100".
    #[arg(long, value_name = "CM-1 …")]
    pub bands: Option<String>,
    /// Spectrometer window in nm, shortest-longest (default 200-1100).
    #[arg(long, value_name = "NM-NM")]
    pub band_window: Option<String>,
    /// Bands closer than this (cm⁻¹) count as one (default 1500).
    #[arg(long, value_name = "CM-1", allow_hyphen_values = true)]
    pub band_resolution: Option<f64>,
    /// Temperature of the spectrum in K.
    #[arg(long, value_name = "K", allow_hyphen_values = true)]
    pub band_temp: Option<f64>,
    /// Mean metal–donor bond length of a crystal structure, in Å.
    #[arg(long, value_name = "ANGSTROM", allow_hyphen_values = true)]
    pub bond_length: Option<f64>,
    /// Uncertainty of --bond-length in Å.
    #[arg(long, value_name = "ANGSTROM")]
    pub bond_length_err: Option<f64>,
    /// Temperature of the structure in K (with --structure: instead of the one in the CIF).
    #[arg(long, value_name = "K", allow_hyphen_values = true)]
    pub structure_temp: Option<f64>,
    /// A χ_M·T(T) CSV file (the `sco-fit` layout: T and one of chiT, chi_m, mu_eff, optional
    /// direction), fitted and weighed as evidence.
    #[arg(long, value_name = "FILE")]
    pub chit_file: Option<PathBuf>,
    #[command(flatten)]
    pub csv: CsvOutput,
    #[command(flatten)]
    pub jsonl: JsonlOutput,
    /// Also write a self-contained HTML report (inline figures, printable) to FILE.
    #[arg(long, value_name = "FILE")]
    pub html: Option<PathBuf>,
    #[command(flatten)]
    pub output: OutputArgs,
}

/// The command-line option that sets a batch column ("evans_conc" → "--evans-conc").
fn option_of(column: &str) -> String {
    match column {
        "ligands" => "--ligand".into(),
        "(whole row)" => "options".into(),
        c => c
            .split(", ")
            .map(|c| format!("--{}", c.replace('_', "-")))
            .collect::<Vec<_>>()
            .join(", "),
    }
}

/// " (options: …)" or " (columns: …)" naming how to set what a check error needs (batch columns or the options
/// named after them, by `name`); empty when it needs nothing.
fn needed(e: &spinstate::check::CheckError, word: &str, name: impl Fn(&str) -> String) -> String {
    let spinstate::Error::InvalidParameter { needs, .. } = &e.error else {
        return String::new();
    };
    let mut names: Vec<String> = Vec::new();
    for p in needs {
        if let Some(c) = batch::column_of(e.part, p) {
            let n = name(c);
            if !names.contains(&n) {
                names.push(n);
            }
        }
    }
    if names.is_empty() {
        String::new()
    } else {
        format!(" ({word}: {})", names.join(", "))
    }
}

impl Args {
    /// The options as (column, value) pairs of the batch layout.
    fn fields(&self) -> Vec<(&'static str, String)> {
        let mut f: Vec<(&'static str, String)> = vec![
            ("name", "command line".into()),
            ("metal", self.metal.clone().unwrap_or_default()),
            ("ox", self.ox.map(|o| o.to_string()).unwrap_or_default()),
            (
                "geometry",
                self.geometry
                    .map(|g| g.name().to_string())
                    .unwrap_or_default(),
            ),
            (
                "ligands",
                self.ligands
                    .iter()
                    .map(ToString::to_string)
                    .collect::<Vec<_>>()
                    .join(" "),
            ),
        ];
        let num = |x: Option<f64>| x.map(|v| v.to_string());
        let optional: Vec<(&'static str, Option<String>)> = vec![
            ("delta", num(self.delta)),
            ("b", num(self.b)),
            ("c", num(self.c)),
            ("evans_shift_ppm", num(self.evans_shift_ppm)),
            ("evans_shift_hz", num(self.evans_shift_hz)),
            ("evans_freq_mhz", num(self.evans_freq_mhz)),
            ("evans_shift_err", num(self.evans_shift_err)),
            ("evans_conc", num(self.evans_conc)),
            ("evans_conc_err", num(self.evans_conc_err)),
            ("evans_temp", num(self.evans_temp)),
            ("evans_magnet", self.evans_magnet.clone()),
            ("mu_eff", num(self.mu_eff)),
            ("chi_m", num(self.chi_m)),
            ("chi_m_t", num(self.chi_m_t)),
            ("moment_err", num(self.moment_err)),
            ("moment_temp", num(self.moment_temp)),
            ("dia", num(self.dia)),
            ("bands", self.bands.clone()),
            ("band_window", self.band_window.clone()),
            ("band_resolution", num(self.band_resolution)),
            ("band_temp", num(self.band_temp)),
            ("bond_length", num(self.bond_length)),
            ("bond_length_err", num(self.bond_length_err)),
            ("structure_temp", num(self.structure_temp)),
            (
                "chit_file",
                self.chit_file.as_ref().map(|p| p.display().to_string()),
            ),
            ("note", None),
        ];
        f.extend(optional.into_iter().filter_map(|(c, v)| v.map(|v| (c, v))));
        f
    }
}

/// A structure as `check` weighs it: the centre chosen (analysed with --ox), the metal and
/// geometry it implies, and the reader's notes.
struct StructureGiven {
    input: spinstate::check::StructureInput,
    metal: String,
    geometry: String,
    notes: Vec<String>,
}

fn read_structure_input(
    args: &Args,
    path: &Path,
    data: &DataSet,
) -> Result<StructureGiven, Failure> {
    if args.bond_length.is_some() || args.bond_length_err.is_some() {
        return Err(Failure::usage(
            "--bond-length and --structure both give the bond length: give one of them (with --structure the structure's own distances are used)",
        ));
    }
    let (Some(ox), false) = (args.ox, args.ligands.is_empty()) else {
        return Err(Failure::usage(
            "--structure needs --ox N and --ligand NAME[:COUNT] (the field and the reference bond lengths depend on them)",
        ));
    };
    let s = super::structure::read_structure(path)?;
    let centre = super::structure::one_centre(&s, &args.centre, Some(ox), data)?;
    if let Some(m) = &args.metal {
        if !m.eq_ignore_ascii_case(&centre.metal) {
            return Err(Failure::usage(format!(
                "--metal {m}: the chosen centre {} of {} is {}; leave --metal out or choose another centre with --metal-index or --metal-label",
                centre.label, s.name, centre.metal
            )));
        }
    }
    let geometry = match (&args.geometry, centre.named_geometry()) {
        (Some(g), _) => g.name().to_string(),
        (None, Some(g)) => g.name().to_string(),
        (None, None) => {
            return Err(Failure::usage(format!(
                "{}: centre {} has {} donors and no named shape; give --geometry (oct, tet, sqpl, sqpy or tbp)",
                s.name,
                centre.label,
                centre.coordination_number()
            )))
        }
    };
    let mut notes: Vec<String> = s
        .notes
        .iter()
        .map(|n| format!("note: {}: {n}", s.name))
        .collect();
    notes.extend(
        centre
            .notes
            .iter()
            .map(|n| format!("note: {}: {n}", centre.label)),
    );
    if args.geometry.is_none() {
        notes.push(format!(
            "note: the prediction is the field at the structure's geometry; Δ/B and the crossover are those of the closest named shape ({geometry})"
        ));
    }
    Ok(StructureGiven {
        metal: centre.metal.clone(),
        geometry,
        input: spinstate::check::StructureInput {
            source: s.name.clone(),
            temperature: args.structure_temp.or(s.temperature),
            field_is_prediction: args.geometry.is_none(),
            centre,
        },
        notes,
    })
}

/// The data set with every table `check` may use already read, so that a broken table is one
/// error for the command before the first sample, not an error on every row.
fn loaded(data: &DataSet) -> Result<&DataSet, Failure> {
    data.ions()?;
    data.ligands()?;
    data.charge_transfer()?;
    data.moment_ranges()?;
    data.bond_lengths()?;
    Ok(data)
}

/// Reads a sample's `chit_file` (relative to `base`, the batch file's directory) into its
/// curve input, with the diamagnetic correction of the sample.
fn attach_curve(sample: &mut Sample, base: Option<&Path>) -> Result<(), String> {
    let Some(name) = &sample.chit_file else {
        return Ok(());
    };
    let path = match base {
        Some(dir) if Path::new(name).is_relative() => dir.join(name),
        _ => PathBuf::from(name),
    };
    let text = spinstate::input_file::read_text(&path)
        .map_err(|e| format!("cannot read {}: {e}", path.display()))?;
    let dia = sample.input.moment.map_or(0.0, |m| m.dia.value);
    let curve = spinstate::sco::data::read_curve(&text, dia).map_err(|e| e.to_string())?;
    sample.input.curve = Some(CurveInput {
        points: curve.points,
        source: path.display().to_string(),
    });
    Ok(())
}

/// Checks every row of a batch text: the report, and the bad rows (already in the report).
/// `base` is the directory `chit_file` cells are relative to.
/// Checks every row of a batch file, also building each sample's HTML section when `html` is
/// set.
pub fn run_batch_with(
    text: &str,
    base: Option<&Path>,
    data: &DataSet,
    html: bool,
) -> Result<(BatchReport, Vec<RowError>, Vec<Section>), Failure> {
    let mut sections = Vec::new();
    let rows = batch::parse(text).map_err(|e| Failure::usage(format!("--input: {e}")))?;
    let loaded = loaded(data)?;
    let bar = if rows.len() >= PROGRESS_FROM && std::io::stdout().is_terminal() {
        let bar = ProgressBar::new(rows.len() as u64);
        if let Ok(style) = ProgressStyle::with_template("checking {pos}/{len} samples {bar:30}") {
            bar.set_style(style);
        }
        bar
    } else {
        ProgressBar::hidden()
    };
    let mut samples = Vec::new();
    let mut bad: Vec<RowError> = Vec::new();
    for row in rows {
        match check_sample(row, base, loaded) {
            Ok((input, result)) => {
                let report = CheckReport::new(&result, Some(input.1), Some(input.0));
                if html {
                    sections.push(html_section(&input.2, &result, report.clone())?);
                }
                samples.push(report)
            }
            Err(e) => bad.push(e),
        }
        bar.inc(1);
    }
    bar.finish_and_clear();
    let errors = bad.iter().map(RowErrorRow::from).collect();
    Ok((BatchReport::new(samples, errors), bad, sections))
}

/// One sample's section of the HTML page (figures drawn here, from the library).
pub fn html_section(
    input: &spinstate::check::CheckInput,
    result: &spinstate::check::CheckResult,
    report: CheckReport,
) -> Result<Section, Failure> {
    Ok(Section {
        parameters: parameter_rows(result),
        figures: sample_figures(input, result)?,
        report,
    })
}

/// CSV records as text, without a header row of their own.
fn csv_text(records: &[Vec<String>]) -> Result<String, Failure> {
    let mut w = csv::WriterBuilder::new()
        .has_headers(false)
        .from_writer(Vec::new());
    for r in records {
        w.write_record(r)
            .map_err(|e| Failure::usage(format!("--csv: {e}")))?;
    }
    let bytes = w
        .into_inner()
        .map_err(|e| Failure::usage(format!("--csv: {e}")))?;
    String::from_utf8(bytes).map_err(|e| Failure::usage(format!("--csv: {e}")))
}

/// Rows checked together (in parallel) before their results are written: memory stays bounded
/// by one chunk whatever the file's length.
const CHUNK_ROWS: usize = 512;

/// How a streamed batch is printed.
#[derive(Clone, Copy, PartialEq)]
enum Stream {
    Table,
    Json,
    JsonLines,
    /// `--csv -`: the CSV rows are the output.
    Csv,
}

impl Stream {
    /// The form the shared output options ask for on stdout.
    fn of(asked: &super::common::Asked<'_>, jsonl: &JsonlOutput) -> Stream {
        if asked.csv_to_stdout() {
            Stream::Csv
        } else if jsonl.lines {
            Stream::JsonLines
        } else if asked.json {
            Stream::Json
        } else {
            Stream::Table
        }
    }
}

fn write_failed(e: std::io::Error) -> Failure {
    Failure::usage(format!("cannot write the output: {e}"))
}

/// A row's line, name and input, as checked.
type Checked = (usize, String, spinstate::check::CheckInput);

/// One row checked (its `chit_file` read first): the row and its result, or the row's error.
fn check_sample(
    row: Result<Sample, RowError>,
    base: Option<&Path>,
    loaded: &DataSet,
) -> Result<(Checked, spinstate::check::CheckResult), RowError> {
    let mut sample = row?;
    if let Err(message) = attach_curve(&mut sample, base) {
        return Err(RowError {
            row: sample.row,
            name: Some(sample.name),
            column: "chit_file".into(),
            message,
        });
    }
    let Sample {
        row, name, input, ..
    } = sample;
    match check(&input, loaded) {
        Ok(result) => Ok(((row, name, input), result)),
        Err(e) => Err(RowError {
            row,
            name: Some(name),
            column: batch::columns_of(&e),
            message: format!("{}{}", e.error, needed(&e, "columns", str::to_string)),
        }),
    }
}

/// One row checked, as its report or its error.
fn check_row(
    row: Result<Sample, RowError>,
    base: Option<&Path>,
    loaded: &DataSet,
) -> Result<CheckReport, RowError> {
    check_sample(row, base, loaded)
        .map(|((row, name, _), result)| CheckReport::new(&result, Some(name), Some(row)))
}

/// Checks a batch file row by row, on every core, writing each chunk's results in input order
/// as soon as it is ready (stdout and `--csv`), so that memory does not grow with the file.
fn stream_batch(args: &Args, path: &Path, data: &DataSet) -> Result<Output, Failure> {
    use rayon::prelude::*;
    use std::io::Write;
    let file = std::fs::File::open(path)
        .map_err(|e| Failure::usage(format!("--input: cannot read {}: {e}", path.display())))?;
    let input_error = |e: spinstate::Error| Failure::usage(format!("--input: {e}"));
    let mut reader = batch::BatchReader::new(std::io::BufReader::new(file)).map_err(input_error)?;
    let loaded = loaded(data)?;
    let base = path.parent();
    let asked = args.output.asked().csv(&args.csv);
    let mode = Stream::of(&asked, &args.jsonl);
    let csv_file = asked.csv.filter(|_| mode != Stream::Csv);
    let mut csv_out = match csv_file {
        Some(file) => {
            let mut w = csv::Writer::from_path(file).map_err(|e| {
                Failure::usage(format!("--csv: cannot write {}: {e}", file.display()))
            })?;
            w.write_record(spinstate::report::check::csv_header())
                .map_err(|e| Failure::usage(format!("--csv: {e}")))?;
            Some(w)
        }
        _ => None,
    };
    let bar = if std::io::stdout().is_terminal() {
        let bar = ProgressBar::no_length();
        if let Ok(style) = ProgressStyle::with_template("checking: {pos} samples, {per_sec}") {
            bar.set_style(style);
        }
        bar
    } else {
        ProgressBar::hidden()
    };
    let stdout = std::io::stdout();
    let mut out = std::io::BufWriter::new(stdout.lock());
    let mut errors: Vec<RowError> = Vec::new();
    let mut first_sample = true;
    let mut started = false;
    loop {
        let chunk: Vec<_> = reader.by_ref().take(CHUNK_ROWS).collect();
        if chunk.is_empty() {
            break;
        }
        let n = chunk.len() as u64;
        let results: Vec<Result<CheckReport, RowError>> = chunk
            .into_par_iter()
            .map(|row| check_row(row, base, loaded))
            .collect();
        if !started && mode == Stream::Json {
            out.write_all(b"{\"samples\":[").map_err(write_failed)?;
        }
        if !started && mode == Stream::Csv {
            out.write_all(csv_text(&[spinstate::report::check::csv_header()])?.as_bytes())
                .map_err(write_failed)?;
        }
        started = true;
        let rows: Vec<Result<CheckReport, RowErrorRow>> = results
            .into_iter()
            .map(|r| {
                r.map_err(|e| {
                    let row = RowErrorRow::from(&e);
                    errors.push(e);
                    row
                })
            })
            .collect();
        let refs: Vec<BatchRow<'_>> = rows.iter().map(|r| r.as_ref()).collect();
        if let Some(w) = csv_out.as_mut() {
            for &row in &refs {
                w.write_record(spinstate::report::check::csv_record(row))
                    .map_err(|e| Failure::usage(format!("--csv: {e}")))?;
            }
        }
        match mode {
            Stream::Csv => {
                let records: Vec<_> = refs
                    .iter()
                    .map(|&row| spinstate::report::check::csv_record(row))
                    .collect();
                out.write_all(csv_text(&records)?.as_bytes())
                    .map_err(write_failed)?;
            }
            Stream::Table => {
                out.write_all(rows_table(&refs).as_bytes())
                    .map_err(write_failed)?;
            }
            Stream::JsonLines => {
                for row in &refs {
                    let line = match row {
                        Ok(s) => serde_json::json!({ "row": s.row, "sample": s }),
                        Err(e) => serde_json::json!({ "row": e.row, "error": e }),
                    };
                    writeln!(out, "{line}").map_err(write_failed)?;
                }
            }
            Stream::Json => {
                for s in refs.iter().filter_map(|r| r.ok()) {
                    if !first_sample {
                        out.write_all(b",").map_err(write_failed)?;
                    }
                    first_sample = false;
                    serde_json::to_writer(&mut out, s)
                        .map_err(|e| Failure::usage(format!("cannot write the output: {e}")))?;
                }
            }
        }
        out.flush().map_err(write_failed)?;
        bar.inc(n);
    }
    bar.finish_and_clear();
    let finished = reader.finish();
    if !started {
        // Nothing was written: a file without rows is an input error.
        return Err(input_error(finished.err().unwrap_or_else(|| {
            spinstate::Error::Computation("no rows were read".into())
        })));
    }
    match mode {
        Stream::Table => {
            writeln!(out, "{SAFETY}").map_err(write_failed)?;
        }
        Stream::Json => {
            let rows: Vec<RowErrorRow> = errors.iter().map(RowErrorRow::from).collect();
            let text =
                |e: serde_json::Error| Failure::usage(format!("cannot write the output: {e}"));
            let (rows, safety) = (
                serde_json::to_string(&rows).map_err(text)?,
                serde_json::to_string(SAFETY).map_err(text)?,
            );
            writeln!(out, "],\"errors\":{rows},\"safety\":{safety}}}").map_err(write_failed)?;
        }
        Stream::JsonLines | Stream::Csv => {}
    }
    out.flush().map_err(write_failed)?;
    if let Some(mut w) = csv_out {
        w.flush()
            .map_err(|e| Failure::usage(format!("--csv: {e}")))?;
    }
    if let Err(e) = finished {
        // Rows before the failure were reported; the rest of the file was not read.
        return Err(Failure::usage(format!("--input {}: {e}", path.display())));
    }
    Ok(Output {
        stdout: String::new(),
        warnings: csv_file
            .map(|f| format!("wrote {}", f.display()))
            .into_iter()
            .chain(
                errors
                    .iter()
                    .map(|e| format!("error: {}: {e}", path.display())),
            )
            .collect(),
        code: if errors.is_empty() { 0 } else { 2 },
    })
}

pub fn run(args: &Args, data: &DataSet) -> Result<Output, Failure> {
    super::figure::only_with(
        args.jsonl.lines,
        "--jsonl",
        args.input.is_some(),
        "--input FILE",
    )?;
    args.centre.check_used(args.structure.is_some())?;
    if let (Some(path), None) = (&args.input, &args.html) {
        return stream_batch(args, path, data);
    }
    if let Some(path) = &args.input {
        let text = spinstate::input_file::read_text(path)
            .map_err(|e| Failure::usage(format!("--input: cannot read {}: {e}", path.display())))?;
        let (report, bad, sections) =
            run_batch_with(&text, path.parent(), data, args.html.is_some())?;
        let mut out = emit(&report, &(), args.output.asked().csv(&args.csv))?;
        if let Some(file) = &args.html {
            let title = format!("Spin-state check of {}", path.display());
            let page = html::page(&title, None, &sections, &report.errors, SAFETY);
            out.warnings.push(write_html(&page, file)?);
        }
        out.warnings.extend(
            bad.iter()
                .map(|e| format!("error: {}: {e}", path.display())),
        );
        out.code = if bad.is_empty() { 0 } else { 2 };
        return Ok(out);
    }
    let given = match &args.structure {
        Some(path) => Some(read_structure_input(args, path, data)?),
        None => None,
    };
    if given.is_none() && args.geometry.is_none() {
        return Err(Failure::usage(
            "--geometry is needed (oct, tet, sqpl, sqpy or tbp), or --structure FILE",
        ));
    }
    let mut fields = args.fields();
    if let Some(g) = &given {
        // The metal and geometry come from the structure; its temperature goes with it.
        fields.retain(|(c, _)| *c != "structure_temp");
        for (c, v) in fields.iter_mut() {
            match *c {
                "metal" => *v = g.metal.clone(),
                "geometry" => *v = g.geometry.clone(),
                _ => {}
            }
        }
    }
    let mut sample = batch::from_fields(&fields)
        .map_err(|e| Failure::usage(format!("{}: {}", option_of(&e.column), e.message)))?;
    let mut structure_notes = Vec::new();
    if let Some(g) = given {
        sample.input.structure = Some(g.input);
        structure_notes = g.notes;
    }
    attach_curve(&mut sample, None).map_err(|m| Failure::usage(format!("--chit-file: {m}")))?;
    let loaded = loaded(data)?;
    let result = check(&sample.input, loaded).map_err(|e| Failure {
        code: e.error.exit_code(),
        message: format!(
            "{}: {}{}",
            option_of(&batch::columns_of(&e)),
            e.error,
            needed(&e, "options", option_of)
        ),
        error: None,
    })?;
    let report = CheckReport::new(&result, None, None).with_safety();
    let mut out = emit(&report, &(), args.output.asked().csv(&args.csv))?;
    out.warnings.extend(structure_notes);
    if let Some(file) = &args.html {
        let section = html_section(&sample.input, &result, report.clone())?;
        let title = format!("Spin-state check of {}", report.complex);
        let page = html::page(&title, None, &[section], &[], SAFETY);
        out.warnings.push(write_html(&page, file)?);
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use spinstate::check::Part;
    use spinstate::Param;

    /// The options of `check` are named after the batch columns: a quantity's column and its
    /// option agree wherever both exist.
    #[test]
    fn flags_of_check_follow_the_batch_columns() {
        let mut compared = 0;
        for part in [Part::Complex, Part::Evans, Part::Moment, Part::Bands] {
            for p in [
                Param::Delta,
                Param::RacahB,
                Param::RacahC,
                Param::Dia,
                Param::Magnet,
                Param::SpectrometerFrequency,
                Param::Concentration,
                Param::ChiMT,
                Param::ChiM,
                Param::MuEff,
                Param::BondLength,
            ] {
                if let (Some(column), Some(flag)) = (
                    batch::column_of(part, &p),
                    super::super::common::flag_of(&p, super::super::common::Cmd::Check),
                ) {
                    assert_eq!(option_of(column), flag, "{p:?}");
                    compared += 1;
                }
            }
        }
        assert!(compared >= 40, "{compared}");
    }
}
