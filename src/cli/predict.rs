//! `spinstate predict`: spin state, ground term, moments and bands of a complex from its
//! composition.

use super::common::{emit, OutputArgs};
use super::{Failure, Output};
use spinstate::complex::{ComplexSpec, LigandCount, Overrides};
use spinstate::engine::Geometry;
use spinstate::predict::{predict_with, PredictOptions};
use spinstate::report::predict::PredictReport;
use spinstate::report::structure_spin::StructureSpinReport;
use spinstate::spectra::count;
use spinstate::structure::spin::structure_spin;
use spinstate::tables::DataSet;
use std::path::Path;

#[derive(Debug, clap::Args)]
pub struct Args {
    /// Metal element symbol, e.g. Fe.
    #[arg(long, value_name = "SYMBOL")]
    pub metal: String,
    /// Oxidation state of the metal, e.g. 2.
    #[arg(long, value_name = "N", allow_hyphen_values = true)]
    pub ox: i32,
    /// Geometry: oct, tet, sqpl, sqpy (square pyramid) or tbp (trigonal bipyramid). With
    /// --structure it defaults to the centre's closest shape.
    #[arg(long, value_name = "G", required_unless_present = "structure", value_parser = super::common::parsed::<spinstate::engine::Geometry>)]
    pub geometry: Option<spinstate::engine::Geometry>,
    /// Use the field of a real centre: a crystal structure (.cif) or coordinates (.xyz). The
    /// ligands are still needed: each donor atom is assigned to a ligand by its element.
    #[arg(long, value_name = "FILE")]
    pub structure: Option<std::path::PathBuf>,
    #[command(flatten)]
    pub centre: super::structure::CentreArgs,
    /// A ligand and how many of it are bound, NAME[:COUNT] (repeatable; e.g. --ligand NCS:2
    /// --ligand py:4). The donor atoms must fill the geometry exactly.
    #[arg(long = "ligand", value_name = "NAME[:COUNT]", required = true, value_parser = super::common::parsed::<LigandCount>)]
    pub ligands: Vec<LigandCount>,
    /// Measured Δ in cm⁻¹ to use instead of the estimate (Δo for oct, Δt for tet, the
    /// octahedral 10Dq of the same ligands for sqpl).
    #[arg(long, value_name = "CM-1", allow_hyphen_values = true)]
    pub delta: Option<f64>,
    /// Measured Racah B in cm⁻¹ to use instead of the estimate.
    #[arg(long, value_name = "CM-1", allow_hyphen_values = true)]
    pub b: Option<f64>,
    /// Measured Racah C in cm⁻¹ to use instead of the estimate.
    #[arg(long, value_name = "CM-1", allow_hyphen_values = true)]
    pub c: Option<f64>,
    /// List every spin-allowed band, not only those below 50 000 cm⁻¹.
    #[arg(long)]
    pub all: bool,
    #[command(flatten)]
    pub output: OutputArgs,
}

impl Args {
    /// The complex described by the options; `default_geometry` is used when --geometry is
    /// not given.
    pub fn spec_in(&self, default_geometry: Option<Geometry>) -> Result<ComplexSpec, Failure> {
        let ligands = self.ligands.clone();
        Ok(ComplexSpec {
            metal: self.metal.clone(),
            oxidation_state: self.ox,
            geometry: match (&self.geometry, default_geometry) {
                (Some(g), _) => *g,
                (None, Some(g)) => g,
                (None, None) => {
                    return Err(Failure::usage(
                        "--geometry is needed (oct, tet, sqpl, sqpy or tbp)",
                    ))
                }
            },
            ligands,
            overrides: Overrides {
                delta: self.delta,
                b: self.b,
                c: self.c,
            },
        })
    }
}

impl Args {
    /// The complex described by the options.
    pub fn spec(&self) -> Result<ComplexSpec, Failure> {
        self.spec_in(None)
    }
}

fn run_structure(args: &Args, path: &Path, data: &DataSet) -> Result<Output, Failure> {
    let s = super::structure::read_structure(path)?;
    let centre = &super::structure::one_centre(&s, &args.centre, Some(args.ox), data)?;
    let complex = args.spec_in(centre.named_geometry())?.resolve(data)?;
    let spin = structure_spin(centre, &complex, &[])?;
    let mut notes = vec![
        format!(
            "each donor is assigned to a ligand of the composition by its element (assumed, not read from the structure); e_σ, e_π per donor from the {} estimate of Δ_LS at {} Å, scaled by (r₀/r)^{}",
            complex.geometry.name(),
            spinstate::estimate::REFERENCE_BOND_LENGTH,
            complex.calibration.distance_exponent
        ),
        "the margin scales the field at fixed geometry; a real spin change also moves the bonds".to_string(),
    ];
    notes.extend(centre.notes.iter().cloned());
    notes.extend(complex.notes.iter().cloned());
    notes.extend(complex.cautions.iter().map(|c| format!("caution: {c}")));
    let report = StructureSpinReport::new(
        &centre.label,
        complex.formula(),
        &spin,
        centre.spin_state_from_bonds,
        notes,
    );
    emit(&report, &(), args.output.asked())
}

pub fn run(args: &Args, data: &DataSet) -> Result<Output, Failure> {
    args.centre.check_used(args.structure.is_some())?;
    if let Some(path) = &args.structure {
        return run_structure(args, path, data);
    }
    let complex = args.spec()?.resolve(data)?;
    let charge_transfer = count::charge_transfer_limit(data.charge_transfer()?, &complex);
    let options = PredictOptions {
        band_limit: if args.all {
            f64::INFINITY
        } else {
            spinstate::predict::BAND_WINDOW
        },
        charge_transfer_onset: charge_transfer.as_ref().map(|c| c.onset),
        ..PredictOptions::default()
    };
    let prediction = predict_with(&complex, options)?;
    let mut report = PredictReport::new(&prediction).with_reported(complex.reported(data)?);
    report.charge_transfer_onset = Some(count::onset_or_generic(charge_transfer.as_ref()));
    report
        .notes
        .push(count::hidden_above_note(charge_transfer.as_ref()));
    let asked = args.output.asked();
    let mut out = emit(&report, &(), asked)?;
    let omitted = [
        Some(&report.bands_high_spin),
        report.bands_low_spin.as_ref(),
    ]
    .into_iter()
    .flatten()
    .any(|s| s.omitted > 0);
    if omitted && asked.shows_table() {
        out.stdout
            .push_str("note: --all lists the bands above the window too\n");
    }
    Ok(out)
}
