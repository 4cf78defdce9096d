//! `spinstate demo`: the invented screening scenario of `data/demo/`, run end to end from the
//! copy embedded in the binary.

use super::check::run_batch_with;
use super::common::{emit, OutputArgs};
use super::figure::write_html;
use super::{Failure, Output};
use spinstate::check::demo::{INTRO, SAMPLES};
use spinstate::report::check::BatchReport;
use spinstate::report::check::SAFETY;
use spinstate::report::html;
use spinstate::report::Render;
use spinstate::tables::DataSet;
use std::path::PathBuf;

#[derive(Debug, clap::Args)]
#[command(after_help = SAFETY)]
pub struct Args {
    /// Also write the scenario as one self-contained HTML report (inline figures) to FILE.
    #[arg(long, value_name = "FILE")]
    pub html: Option<PathBuf>,
    #[command(flatten)]
    pub output: OutputArgs,
}

/// The scenario's introduction with how to run the same sheet by hand.
fn intro() -> String {
    format!("{INTRO} `spinstate check --input data/demo/samples.csv` gives the same table.")
}

pub fn run(args: &Args, data: &DataSet) -> Result<Output, Failure> {
    let (report, bad, sections) = run_batch_with(SAMPLES, None, data, args.html.is_some())?;
    let mut notes = Vec::new();
    if let Some(file) = &args.html {
        let page = html::page(
            "Spin-state demo: the invented Tallowmere screening set",
            Some(&intro()),
            &sections,
            &report.errors,
            SAFETY,
        );
        notes.push(write_html(&page, file)?);
    }
    let mut out = emit(&DemoPage(&report), &(), args.output.asked())?;
    out.warnings = notes
        .into_iter()
        .chain(bad.iter().map(|e| format!("error: demo sheet: {e}")))
        .collect();
    out.code = if bad.is_empty() { 0 } else { 2 };
    Ok(out)
}

/// The demo's result: the batch report, whose table form is the scenario's page (its
/// introduction, the verdicts, where each sample sits against the crossover, the safety note);
/// its JSON is the batch report's.
#[derive(serde::Serialize)]
#[serde(transparent)]
struct DemoPage<'a>(&'a BatchReport);

impl Render for DemoPage<'_> {
    type Figure = ();

    fn table(&self) -> String {
        format!(
            "{}\n\n{}\nWhere each sample sits against the spin crossover (the mean Δ̄/B of its two spin states, \
each at its own bond length, estimated or measured, against the engine's crossover for its d^n and C/B; \
the estimate's uncertainty is wide, so near the crossover this is a guide):\n{}\n{SAFETY}\n",
            intro(),
            self.0.verdict_table(),
            self.0.crossover_table()
        )
    }
}
