//! `spinstate screen`: rank candidate coordination spheres by their distance to the crossover.

use super::common::{emit, parsed, CsvOutput, OutputArgs};
use super::{Failure, Output};
use indicatif::{ProgressBar, ProgressStyle};
use spinstate::report::screen::ScreenOutput;
use spinstate::screen::{DonorSet, Filters, IonSpec, Keep, Screen, SizeRange, Target};
use spinstate::tables::DataSet;
use std::io::IsTerminal;
use std::path::PathBuf;

/// Rows shown in the table when --top is not given.
const DEFAULT_TOP: usize = 20;

#[derive(Debug, clap::Args)]
#[command(mut_arg("csv", |a| a.help("Write the ranked list as CSV to FILE ('-' for stdout)")))]
pub struct Args {
    /// Metal ion(s), comma-separated: SYMBOL (with --ox) or SYMBOL:OX, e.g. Fe or Fe:2,Co:2,Fe:3.
    #[arg(long, value_name = "LIST", value_delimiter = ',', required = true)]
    pub metal: Vec<String>,
    /// Oxidation state for the metals given without :OX.
    #[arg(long, value_name = "N", allow_hyphen_values = true)]
    pub ox: Option<i32>,
    /// Geometry: oct, tet or sqpl.
    #[arg(long, value_name = "G", value_parser = super::common::parsed::<spinstate::engine::Geometry>)]
    pub geometry: spinstate::engine::Geometry,
    /// Ligands to combine, comma-separated (e.g. H2O,NH3,py,NCS,CN,en); `all` adds every ligand
    /// with a Jørgensen f that binds in the geometry. Every multiset whose donor atoms fill the
    /// geometry is screened.
    #[arg(long, value_name = "LIST", value_delimiter = ',')]
    pub pool: Vec<String>,
    /// CSV file of candidate spheres: a header row with a `ligands` column (NAME[:COUNT] items
    /// separated by spaces or ';', e.g. "NCS:2 py:4") and an optional `name` column; other
    /// columns are ignored, lines starting with # are comments.
    #[arg(long, value_name = "FILE")]
    pub candidates: Option<PathBuf>,
    /// What to rank for: crossover (closest to the crossover), high or low (safely high- or
    /// low-spin).
    #[arg(long, value_name = "T", default_value = "crossover", value_parser = parsed::<Target>)]
    pub target: Target,
    /// Keep the best N (default: 20 for the table; every candidate for --json and --csv).
    #[arg(long, value_name = "N")]
    pub top: Option<usize>,
    /// Ligands every candidate must contain (comma-separated).
    #[arg(long, value_name = "LIST", value_delimiter = ',')]
    pub require: Vec<String>,
    /// Ligands no candidate may contain (comma-separated).
    #[arg(long, value_name = "LIST", value_delimiter = ',')]
    pub forbid: Vec<String>,
    /// Largest |charge| of the complex (oxidation state plus ligand charges), e.g. 0 for
    /// neutral complexes only.
    #[arg(long, value_name = "Q", allow_hyphen_values = true)]
    pub max_charge: Option<i32>,
    /// Exact donor-atom set, e.g. N6 or N4O2.
    #[arg(long, value_name = "SET", value_parser = parsed::<DonorSet>)]
    pub donors: Option<DonorSet>,
    /// Number of ligands bound, N or MIN..MAX (a chelate counts once), e.g. 2..4.
    #[arg(long, value_name = "RANGE", value_parser = parsed::<SizeRange>)]
    pub size: Option<SizeRange>,
    /// Number of distinct ligands, N or MIN..MAX, e.g. 1..2.
    #[arg(long, value_name = "RANGE", value_parser = parsed::<SizeRange>)]
    pub kinds: Option<SizeRange>,
    #[command(flatten)]
    pub csv: CsvOutput,
    #[command(flatten)]
    pub output: OutputArgs,
}

impl Args {
    fn ions(&self) -> Result<Vec<IonSpec>, Failure> {
        self.metal
            .iter()
            .filter(|m| !m.trim().is_empty())
            .map(|m| {
                let (metal, ox) = match m.split_once(':') {
                    Some((metal, ox)) => (
                        metal.trim(),
                        ox.trim().parse::<i32>().map_err(|_| {
                            Failure::usage(format!(
                                "--metal: '{m}' has oxidation state '{ox}'; give a whole number, e.g. Fe:2"
                            ))
                        })?,
                    ),
                    None => (
                        m.trim(),
                        self.ox.ok_or_else(|| {
                            Failure::usage(format!(
                                "--metal {m} needs an oxidation state: give --ox N or write {m}:N"
                            ))
                        })?,
                    ),
                };
                Ok(IonSpec {
                    metal: metal.to_string(),
                    oxidation_state: ox,
                })
            })
            .collect()
    }

    fn filters(&self) -> Result<Filters, Failure> {
        Ok(Filters {
            require: clean(&self.require),
            forbid: clean(&self.forbid),
            max_abs_charge: self.max_charge,
            donors: self.donors.clone(),
            size: self.size,
            kinds: self.kinds,
        })
    }
}

fn clean(list: &[String]) -> Vec<String> {
    list.iter()
        .map(|s| s.trim().to_string())
        .filter(|s| !s.is_empty())
        .collect()
}

fn progress_bar(total: u64) -> ProgressBar {
    if !std::io::stderr().is_terminal() {
        return ProgressBar::hidden();
    }
    let bar = ProgressBar::new(total);
    if let Ok(style) =
        ProgressStyle::with_template("{bar:40} {human_pos}/{human_len} spheres ({per_sec}, {eta})")
    {
        bar.set_style(style);
    }
    bar
}

pub fn run(args: &Args, data: &DataSet) -> Result<Output, Failure> {
    let geometry = args.geometry;
    let target = args.target;
    if args.top == Some(0) {
        return Err(Failure::usage("--top 0: give N ≥ 1"));
    }
    let ions = args.ions()?;
    let filters = args.filters()?;
    let pool = clean(&args.pool);
    let mut out = Output::default();
    let (screen, rejected) = match (&args.candidates, pool.is_empty()) {
        (Some(_), false) => {
            return Err(Failure::usage(
                "give either --pool or --candidates FILE, not both",
            ))
        }
        (None, true) => {
            return Err(Failure::usage(
                "give the candidates: --pool LIST (e.g. H2O,NH3,py,NCS) or --candidates FILE.csv",
            ))
        }
        (None, false) => (
            Screen::from_pool(data, &ions, geometry, &pool, &filters, target)?,
            Vec::new(),
        ),
        (Some(path), true) => {
            let text = spinstate::input_file::read_text(path).map_err(|e| {
                Failure::usage(format!("--candidates: cannot read {}: {e}", path.display()))
            })?;
            let (screen, errors) =
                Screen::from_candidates(data, &ions, geometry, &text, &filters, target)
                    .map_err(|e| Failure::usage(format!("--candidates {}: {e}", path.display())))?;
            for e in &errors {
                out.warnings.push(format!("error: {}: {e}", path.display()));
            }
            if !errors.is_empty() {
                out.code = 2;
            }
            (screen, errors)
        }
    };
    let full_list = args.output.json || args.csv.file.is_some();
    let keep = match args.top {
        Some(n) => Keep::Top(n),
        None if full_list => Keep::All,
        None => Keep::Top(DEFAULT_TOP),
    };
    let bar = progress_bar(screen.candidate_count());
    let outcome = screen.run(keep, &mut |done| bar.set_position(done));
    bar.finish_and_clear();

    let mut shown = emit(
        &ScreenOutput {
            screen: &screen,
            outcome: &outcome,
            rejected: &rejected,
            table_rows: args.top.unwrap_or(DEFAULT_TOP),
        },
        &(),
        args.output.asked().csv(&args.csv),
    )?;
    out.stdout = shown.stdout;
    out.warnings.append(&mut shown.warnings);
    Ok(out)
}
