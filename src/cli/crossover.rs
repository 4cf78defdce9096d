//! `spinstate crossover`: the Δ/B where the ground-state spin changes.

use super::common::{emit, OutputArgs};
use super::{Failure, Output};
use spinstate::engine::{crossover, tanabe_sugano_c_over_b, Geometry};
use spinstate::report::crossover::{CrossoverReport, CrossoverRow};

#[derive(Debug, clap::Args)]
pub struct Args {
    /// Number of d electrons (0..=10); without it, every d^n of the geometry.
    #[arg(long, value_name = "N")]
    pub dn: Option<usize>,
    /// Geometry: oct, tet, sqpl or tetragonal.
    #[arg(long, value_name = "G", default_value = "oct", value_parser = super::common::parsed::<spinstate::engine::Geometry>)]
    pub geometry: spinstate::engine::Geometry,
    /// C/B ratio; default: the ratio of the original Tanabe–Sugano diagram for each d^n.
    #[arg(long, value_name = "R", allow_hyphen_values = true)]
    pub c_over_b: Option<f64>,
    #[command(flatten)]
    pub output: OutputArgs,
}

pub fn run(args: &Args) -> Result<Output, Failure> {
    let geometry: Geometry = args.geometry;
    let dns: Vec<usize> = match args.dn {
        Some(n) if n > 10 => return Err(Failure::usage(format!("--dn {n} is outside 0..=10"))),
        Some(n) => vec![n],
        None => (0..=10).collect(),
    };
    if let Some(r) = args.c_over_b {
        if !r.is_finite() || r <= 0.0 {
            return Err(Failure::usage(format!(
                "--c-over-b {r} must be a ratio > 0 (usually 3.5–5)"
            )));
        }
    }
    let mut rows = Vec::new();
    for dn in dns {
        let r = args.c_over_b.unwrap_or_else(|| tanabe_sugano_c_over_b(dn));
        let x = crossover(dn, geometry, r)?;
        rows.push(CrossoverRow {
            dn,
            geometry: geometry.name().into(),
            c_over_b: r,
            delta_over_b: x.delta_over_b,
            limit: x.limit,
            high_spin_term: x.high_spin.term.to_string(),
            low_spin_term: x.low_spin.as_ref().map(|l| l.term.to_string()),
            high_spin_s: x.high_spin.two_s as f64 / 2.0,
            low_spin_s: x.low_spin.as_ref().map(|l| l.two_s as f64 / 2.0),
        });
    }
    let report = CrossoverReport { crossovers: rows };
    emit(&report, &(), args.output.asked())
}
