//! `spinstate predict`: spin state, ground term, moments and bands of a complex from its
//! composition.

use super::common::{load_tables, parse_geometry, Format};
use super::{Failure, Output};
use spinstate::complex::{ComplexSpec, LigandCount, Overrides};
use spinstate::predict::{predict_with, PredictOptions};
use spinstate::report::predict::PredictReport;
use spinstate::report::to_json;
use spinstate::spectra::count;
use std::path::Path;

#[derive(Debug, clap::Args)]
pub struct Args {
    /// Metal element symbol, e.g. Fe.
    #[arg(long, value_name = "SYMBOL")]
    pub metal: String,
    /// Oxidation state of the metal, e.g. 2.
    #[arg(long, value_name = "N", allow_hyphen_values = true)]
    pub ox: i32,
    /// Geometry: oct, tet, sqpl, sqpy (square pyramid) or tbp (trigonal bipyramid).
    #[arg(long, value_name = "G")]
    pub geometry: String,
    /// A ligand and how many of it are bound, NAME[:COUNT] (repeatable; e.g. --ligand NCS:2
    /// --ligand py:4). The donor atoms must fill the geometry exactly.
    #[arg(long = "ligand", value_name = "NAME[:COUNT]", required = true)]
    pub ligands: Vec<String>,
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
    pub format: Format,
}

impl Args {
    /// The complex described by the options.
    pub fn spec(&self) -> Result<ComplexSpec, Failure> {
        let ligands = self
            .ligands
            .iter()
            .map(|l| {
                l.parse::<LigandCount>()
                    .map_err(|e| Failure::usage(format!("--ligand: {e}")))
            })
            .collect::<Result<Vec<_>, _>>()?;
        Ok(ComplexSpec {
            metal: self.metal.clone(),
            oxidation_state: self.ox,
            geometry: parse_geometry(&self.geometry)?,
            ligands,
            overrides: Overrides {
                delta: self.delta,
                b: self.b,
                c: self.c,
            },
        })
    }
}

pub fn run(args: &Args, data: Option<&Path>) -> Result<Output, Failure> {
    let tables = load_tables(data)?;
    let complex = args.spec()?.resolve(&tables)?;
    let charge_transfer = count::charge_transfer_limit(&tables.charge_transfer, &complex);
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
    let mut report = PredictReport::new(&prediction).with_reported(complex.reported(&tables));
    report.charge_transfer_onset = Some(count::onset_or_generic(charge_transfer.as_ref()));
    report
        .notes
        .push(count::hidden_above_note(charge_transfer.as_ref()));
    Ok(Output::text(if args.format.json {
        to_json(&report)
    } else {
        report.to_table()
    }))
}
