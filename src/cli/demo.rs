//! `spinstate demo`: the invented screening scenario of `data/demo/`, run end to end from the
//! copy embedded in the binary.

use super::check::run_batch;
use super::common::Format;
use super::{Failure, Output};
use spinstate::check::demo::{INTRO, SAMPLES};
use spinstate::report::check::SAFETY;
use spinstate::report::to_json;
use std::path::Path;

#[derive(Debug, clap::Args)]
#[command(after_help = SAFETY)]
pub struct Args {
    #[command(flatten)]
    pub format: Format,
}

pub fn run(args: &Args, data: Option<&Path>) -> Result<Output, Failure> {
    let (report, bad) = run_batch(SAMPLES, None, data)?;
    let stdout = if args.format.json {
        to_json(&report)
    } else {
        format!(
            "{INTRO}\n\n{}\nWhere each sample sits against the spin crossover (the mean Δ̄/B of its two spin states, \
each at its own bond length, estimated or measured, against the engine's crossover for its d^n and C/B; \
the estimate's uncertainty is wide, so near the crossover this is a guide):\n{}\n{SAFETY}\n",
            report.to_table(),
            report.crossover_table()
        )
    };
    Ok(Output {
        stdout,
        warnings: bad
            .iter()
            .map(|e| format!("error: demo sheet: {e}"))
            .collect(),
        code: if bad.is_empty() { 0 } else { 2 },
    })
}
