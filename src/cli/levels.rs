//! `spinstate levels`: every level of one d^n calculation.

use super::common::{emit, FieldArgs, OutputArgs};
use super::{Failure, Output};
use spinstate::report::levels::{LevelRow, LevelsReport};

#[derive(Debug, clap::Args)]
pub struct Args {
    #[command(flatten)]
    pub field: FieldArgs,
    #[command(flatten)]
    pub output: OutputArgs,
}

pub fn run(args: &Args) -> Result<Output, Failure> {
    let r = args.field.resolve()?;
    let (levels, ground): (Vec<LevelRow>, String) = if r.zeta > 0.0 {
        let so = r.calc.spin_orbit_levels(r.zeta)?;
        let g = so[0].multiplicity();
        let rows = so
            .iter()
            .map(|l| LevelRow {
                energy: l.energy,
                multiplicity: l.multiplicity(),
                spin: (l.multiplicity() - 1) as f64 / 2.0,
                label: spinstate::engine::Irrep::sum_text(&l.irrep),
                degeneracy: l.degeneracy,
                parent: spinstate::engine::Term::text_of(l.parent_term),
                spin_allowed: l.multiplicity() == g,
                s_squared: Some(l.s_squared),
                from_level: Some(l.parent_level.to_string()),
                weight: Some(l.weight),
            })
            .collect();
        let ground = format!(
            "{} ({} states) from {} ({})",
            spinstate::engine::Irrep::sum_text(&so[0].irrep),
            so[0].degeneracy,
            so[0].parent_level,
            spinstate::engine::Term::text_of(so[0].parent_term)
        );
        (rows, ground)
    } else {
        let spectrum = r.calc.levels()?;
        let ground = spectrum.ground().clone();
        let rows = spectrum
            .levels
            .iter()
            .map(|l| LevelRow {
                energy: l.energy,
                multiplicity: l.multiplicity(),
                spin: l.spin(),
                label: l.label(),
                degeneracy: l.degeneracy,
                parent: spinstate::engine::Term::text_of(l.parent),
                spin_allowed: l.two_s == ground.two_s,
                s_squared: None,
                from_level: None,
                weight: None,
            })
            .collect();
        (
            rows,
            format!(
                "{} ({})",
                ground.label(),
                spinstate::engine::Term::text_of(ground.parent)
            ),
        )
    };
    let report = LevelsReport {
        dn: r.calc.dn,
        geometry: r.geometry.name().to_string(),
        point_group: format!("{:?}", r.calc.group),
        energy_unit: if r.ratio_mode { "B" } else { "cm-1" }.to_string(),
        b: r.calc.b,
        c: r.calc.c,
        dq: r.dq,
        delta: 10.0 * r.dq,
        ds: r.ds,
        dt: r.dt,
        zeta: r.zeta,
        c_over_b: r.calc.c / r.calc.b,
        delta_over_b: 10.0 * r.dq / r.calc.b,
        ground,
        levels,
    };
    emit(&report, &(), args.output.asked())
}
