//! `spinstate structure`: metal centres of crystal structures (CIF) or coordinates (XYZ) —
//! bonds, shape, octahedral distortion and the spin state the bond lengths support; several
//! files are compared centre by centre.

use super::common::{emit, OutputArgs};
use super::{Failure, Output};
use spinstate::report::structure::{CentreRow, ChangeRow, StructureReport};
use spinstate::structure::centre::{analyse, compare, Centre};
use spinstate::structure::sphere::{sphere, Cutoff};
use spinstate::structure::{MetalChoice, Structure};
use spinstate::tables::DataSet;
use std::path::{Path, PathBuf};

/// Options that pick a centre and its donors, shared with `predict --structure` and
/// `check --structure`.
#[derive(Debug, Clone, clap::Args)]
pub struct CentreArgs {
    /// The metal to use: its 1-based position among the file's atoms.
    #[arg(long, value_name = "N", conflicts_with = "metal_label")]
    pub metal_index: Option<usize>,
    /// The metal to use: its atom label (CIF label, or element and running number for XYZ,
    /// e.g. Fe1).
    #[arg(long, value_name = "LABEL")]
    pub metal_label: Option<String>,
    /// Largest metal–donor distance in Å counted as a bond (default: sum of covalent radii
    /// + 0.35 Å).
    #[arg(long, value_name = "Å")]
    pub cutoff: Option<f64>,
}

impl CentreArgs {
    /// Refuses the centre options where no structure is read (`structure`: --structure given).
    pub fn check_used(&self, structure: bool) -> Result<(), Failure> {
        for (given, option) in [
            (self.metal_index.is_some(), "--metal-index"),
            (self.metal_label.is_some(), "--metal-label"),
            (self.cutoff.is_some(), "--cutoff"),
        ] {
            super::figure::only_with(given, option, structure, "--structure FILE")?;
        }
        Ok(())
    }

    pub fn choice(&self) -> MetalChoice {
        match (&self.metal_index, &self.metal_label) {
            (Some(n), _) => MetalChoice::Index(*n),
            (None, Some(l)) => MetalChoice::Label(l.clone()),
            (None, None) => MetalChoice::All,
        }
    }

    pub fn cutoff(&self) -> Result<Cutoff, Failure> {
        match self.cutoff {
            Some(r) => Cutoff::distance(r).map_err(|e| Failure::usage(format!("--cutoff: {e}"))),
            None => Ok(Cutoff::CovalentRadii),
        }
    }
}

#[derive(Debug, clap::Args)]
pub struct Args {
    /// Structure files (.cif or .xyz); several files (e.g. a variable-temperature series, in
    /// order) are compared centre by centre.
    #[arg(value_name = "FILE", required = true)]
    pub files: Vec<PathBuf>,
    #[command(flatten)]
    pub centre: CentreArgs,
    /// Oxidation state of the metal, for the bond-length verdict (the reference ranges are per
    /// oxidation state).
    #[arg(long, value_name = "N", allow_hyphen_values = true)]
    pub ox: Option<i32>,
    #[command(flatten)]
    pub output: OutputArgs,
}

/// Reads a structure file; errors name the file.
pub fn read_structure(path: &Path) -> Result<Structure, Failure> {
    let name = path.display().to_string();
    let text = spinstate::input_file::read_text(path)
        .map_err(|e| Failure::usage(format!("cannot read {name}: {e}")))?;
    spinstate::structure::read(&text, &name).map_err(|e| Failure::usage(format!("{name}: {e}")))
}

/// The centres chosen in one structure, analysed.
pub fn centres(
    s: &Structure,
    args: &CentreArgs,
    ox: Option<i32>,
    data: &DataSet,
) -> Result<Vec<Centre>, Failure> {
    let radii = data.covalent_radii()?;
    let table = data.bond_lengths()?;
    let cutoff = args.cutoff()?;
    let metals = s
        .select_metals(&args.choice())
        .map_err(|e| with_options(s, e))?;
    let mut out = Vec::new();
    for m in metals {
        let sp =
            sphere(s, m, radii, cutoff).map_err(|e| Failure::usage(format!("{}: {e}", s.name)))?;
        out.push(analyse(s, &sp, ox, table));
    }
    Ok(out)
}

/// The one centre a command that needs a single metal uses (an error when the options leave
/// several).
pub fn one_centre(
    s: &Structure,
    args: &CentreArgs,
    ox: Option<i32>,
    data: &DataSet,
) -> Result<Centre, Failure> {
    let mut found = centres(s, args, ox, data)?;
    if found.len() != 1 {
        return Err(Failure::usage(format!(
            "{}: {} metal centres; choose one with --metal-index N or --metal-label LABEL",
            s.name,
            found.len()
        )));
    }
    Ok(found.remove(0))
}

/// A metal-choice error of [`Structure::select_metals`] with the options that fix it, led by
/// the structure's name unless the error already names it (no metal atom at all, or an
/// unknown metal label, whose message lists the metals of that structure).
pub fn with_options(s: &Structure, e: spinstate::Error) -> Failure {
    use spinstate::{Error, NameKind};
    let hint = match &e {
        Error::InvalidParameter { .. } | Error::Unknown { .. } => {
            " (choose with --metal-index N or --metal-label LABEL)"
        }
        _ => "",
    };
    let names_structure = matches!(
        &e,
        Error::Parse(_)
            | Error::Unknown {
                kind: NameKind::MetalLabel { .. },
                ..
            }
    );
    Failure::usage(if names_structure {
        format!("{e}{hint}")
    } else {
        format!("{}: {e}{hint}", s.name)
    })
}

pub fn run(args: &Args, data: &DataSet) -> Result<Output, Failure> {
    let mut report = StructureReport {
        files: Vec::new(),
        notes: Vec::new(),
        centres: Vec::new(),
        changes: Vec::new(),
    };
    let mut all: Vec<(String, Vec<Centre>)> = Vec::new();
    for path in &args.files {
        let s = read_structure(path)?;
        let found = centres(&s, &args.centre, args.ox, data)?;
        report.files.push(s.name.clone());
        report
            .notes
            .extend(s.notes.iter().map(|n| format!("{}: {n}", s.name)));
        report
            .centres
            .extend(found.iter().map(|c| CentreRow::new(&s.name, c)));
        all.push((s.name.clone(), found));
    }
    for pair in all.windows(2) {
        let changes = compare((&pair[0].0, &pair[0].1), (&pair[1].0, &pair[1].1));
        report.changes.extend(changes.iter().map(ChangeRow::new));
    }
    let mut out = emit(&report, &(), args.output.asked())?;
    if args.output.json {
        out.warnings = report.notes.iter().map(|n| format!("note: {n}")).collect();
    }
    Ok(out)
}
