//! `spinstate diagram`: E/B of every level against Δ/B.

use super::common::{emit, parse_geometry, Format, Renderings};
use super::{Failure, Output};
use spinstate::engine::diagram;
use spinstate::report::diagram::{DiagramReport, SeriesRow};
use spinstate::report::to_json;
use std::path::PathBuf;

#[derive(Debug, clap::Args)]
pub struct Args {
    /// Number of d electrons, 0..=10.
    #[arg(long, value_name = "N")]
    pub dn: usize,
    /// Geometry: oct, tet, sqpl or tetragonal.
    #[arg(long, value_name = "G")]
    pub geometry: String,
    /// C/B ratio (e.g. 4.8 for d6 as in the original diagrams).
    #[arg(long, value_name = "R", allow_hyphen_values = true)]
    pub c_over_b: f64,
    /// Largest Δ/B.
    #[arg(
        long,
        value_name = "X",
        default_value_t = 40.0,
        allow_hyphen_values = true
    )]
    pub max: f64,
    /// Number of Δ/B values from 0 to --max, both included.
    #[arg(long, value_name = "P", default_value_t = 201)]
    pub points: usize,
    /// Write the full diagram as CSV (one column per level) to FILE ('-' for stdout).
    #[arg(long, value_name = "FILE")]
    pub csv: Option<PathBuf>,
    /// Write an SVG picture to FILE.
    #[arg(long, value_name = "FILE")]
    pub svg: Option<PathBuf>,
    #[command(flatten)]
    pub format: Format,
}

pub fn run(args: &Args) -> Result<Output, Failure> {
    let geometry = parse_geometry(&args.geometry)?;
    if args.dn > 10 {
        return Err(Failure::usage(format!(
            "--dn {} is outside 0..=10",
            args.dn
        )));
    }
    if !args.c_over_b.is_finite() || args.c_over_b <= 0.0 {
        return Err(Failure::usage(format!(
            "--c-over-b {} must be a ratio > 0 (usually 3.5–5)",
            args.c_over_b
        )));
    }
    if !args.max.is_finite() || args.max <= 0.0 {
        return Err(Failure::usage(format!(
            "--max {} must be a Δ/B > 0 (e.g. 40)",
            args.max
        )));
    }
    if !(2..=100_000).contains(&args.points) {
        return Err(Failure::usage(format!(
            "--points {} must lie in 2..=100000",
            args.points
        )));
    }
    let d = diagram(args.dn, geometry, args.c_over_b, args.max, args.points)?;
    let series = d
        .series
        .iter()
        .map(|s| SeriesRow {
            key: s.key(d.needs_index(s)),
            label: s.label(),
            multiplicity: s.two_s + 1,
            parent: s.parent.clone(),
            degeneracy: s.degeneracy,
            energies: s.energies.clone(),
        })
        .collect();
    let report = DiagramReport {
        dn: d.dn,
        geometry: geometry.name().into(),
        c_over_b: d.c_over_b,
        delta_over_b: d.delta_over_b.clone(),
        crossover_delta_over_b: d.crossover.delta_over_b,
        series,
    };
    emit(
        args.csv.as_deref(),
        args.svg.as_deref(),
        args.format.json,
        Renderings {
            csv: || report.to_csv(),
            svg: || report.to_svg(),
            json: || to_json(&report),
            table: || report.to_table(),
        },
    )
}
