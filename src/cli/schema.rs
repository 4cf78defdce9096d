//! `spinstate schema COMMAND`: the JSON Schema of a command's `--json` output.

use super::common::{emit, Cmd, OutputArgs};
use super::{Failure, Output};
use spinstate::report::{self, Render};

#[derive(Debug, clap::Args)]
pub struct Args {
    /// The command whose --json output to describe.
    #[arg(value_enum, value_name = "COMMAND")]
    pub command: Cmd,
    #[command(flatten)]
    pub output: OutputArgs,
}

/// The schema of each command's `--json`, with the case each report type is printed in.
fn schema_of(cmd: Cmd) -> Result<serde_json::Value, Failure> {
    use report::*;
    let s = JsonSchema::new();
    let s = match cmd {
        Cmd::Levels => s.case::<levels::LevelsReport>("every level"),
        Cmd::Diagram => s.case::<diagram::DiagramReport>("every level against Δ/B"),
        Cmd::Crossover => s.case::<crossover::CrossoverReport>("one row per d^n"),
        Cmd::Evans | Cmd::Moment => s.case::<measured::MeasuredMomentReport>("one measurement"),
        Cmd::Magnetism => s.case::<magnetism::MagnetismReport>("one curve"),
        Cmd::Predict => s
            .case::<predict::PredictReport>("an idealised geometry")
            .case::<structure_spin::StructureSpinReport>("with --structure"),
        Cmd::Screen => s.case::<screen::ScreenReport>("the ranked candidates"),
        Cmd::Data => s
            .case::<data::IonsReport>("data ions")
            .case::<data::LigandsReport>("data ligands")
            .case::<data::PascalReport>("data pascal")
            .case::<data::MomentRangesReport>("data moment-ranges")
            .case::<data::BondLengthsReport>("data bond-lengths"),
        Cmd::FitBands => s
            .case::<fit_bands::FitBandsReport>("a cubic or square-planar fit")
            .case::<tetragonal_fit::TetragonalFitReport>("--geometry tetragonal"),
        Cmd::Bands => s.case::<bands::BandsReport>("the band count"),
        Cmd::Check => s
            .case::<check::CheckReport>("one complex")
            .case::<check::BatchReport>("with --input"),
        Cmd::Demo => s.case::<check::BatchReport>("the demo sheet"),
        Cmd::ScoFit => s.case::<sco::FitReport>("the fit"),
        Cmd::ScoCurve => s.case::<sco::CurveReport>("the simulated curve"),
        Cmd::Structure => s.case::<structure::StructureReport>("every centre"),
        Cmd::Schema => {
            return Err(Failure::usage(
                "schema prints JSON Schemas (draft 2020-12); give one of the other commands",
            ))
        }
    };
    Ok(s.finish(&format!("spinstate {} --json", cmd.name())))
}

/// A schema as output: JSON in both forms.
#[derive(serde::Serialize)]
#[serde(transparent)]
struct Schema(serde_json::Value);

impl Render for Schema {
    type Figure = ();

    fn table(&self) -> String {
        self.json()
    }
}

pub fn run(args: &Args) -> Result<Output, Failure> {
    emit(&Schema(schema_of(args.command)?), &(), args.output.asked())
}
