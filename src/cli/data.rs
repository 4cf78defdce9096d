//! `spinstate data`: list the chemistry tables as loaded (bundled, or edited copies from
//! `--data DIR`).

use super::common::{emit, OutputArgs};
use super::{Failure, Output};
use spinstate::report::data::{
    BondLengthDataRow, BondLengthsReport, IonsReport, LigandsReport, MomentRangeRow,
    MomentRangesReport, PascalReport, PascalRow,
};
use spinstate::tables::DataSet;

/// Which table to list.
#[derive(Debug, Clone, Copy, clap::ValueEnum)]
pub enum Table {
    /// Metal ions: d^n, free-ion B0, C0, ζ, Jørgensen g and k.
    Ions,
    /// Ligands: aliases, donor atoms, charge, Jørgensen f and h, π character.
    Ligands,
    /// Pascal's increments for diamagnetic corrections (10⁻⁶ cm³/mol).
    Pascal,
    /// Typical room-temperature μ_eff ranges by d^n, geometry and spin.
    MomentRanges,
    /// Metal–donor bond lengths of low- and high-spin states (Å).
    BondLengths,
}

#[derive(Debug, clap::Args)]
pub struct Args {
    /// The table to list.
    #[arg(value_enum)]
    pub table: Table,
    #[command(flatten)]
    pub output: OutputArgs,
}

pub fn run(args: &Args, data: &DataSet) -> Result<Output, Failure> {
    let origin = data
        .dir()
        .map_or("bundled".to_string(), |d| d.display().to_string());
    let asked = args.output.asked();
    match args.table {
        Table::Ions => {
            let r = IonsReport {
                origin,
                ions: data.ions()?.rows.iter().map(Into::into).collect(),
            };
            emit(&r, &(), asked)
        }
        Table::Ligands => {
            let r = LigandsReport {
                origin,
                ligands: data.ligands()?.rows.iter().map(Into::into).collect(),
            };
            emit(&r, &(), asked)
        }
        Table::Pascal => {
            let table = data.pascal()?;
            let r = PascalReport {
                origin,
                entries: table
                    .entries()
                    .iter()
                    .map(|e| PascalRow {
                        kind: e.kind.name().to_string(),
                        name: e.name.clone(),
                        value_1e6_cm3_per_mol: e.value * 1e6,
                        source: e.source.clone(),
                    })
                    .collect(),
            };
            emit(&r, &(), asked)
        }
        Table::MomentRanges => {
            let table = data.moment_ranges()?;
            let r = MomentRangesReport {
                origin,
                ranges: table
                    .rows()
                    .iter()
                    .map(|m| MomentRangeRow {
                        dn: m.dn,
                        geometry: m.geometry.clone(),
                        multiplicity: m.multiplicity,
                        ground_term: m.ground_term.clone(),
                        mu_min: m.mu_min,
                        mu_max: m.mu_max,
                        examples: m.examples.clone(),
                        source: m.source.clone(),
                    })
                    .collect(),
            };
            emit(&r, &(), asked)
        }
        Table::BondLengths => {
            let table = data.bond_lengths()?;
            let r = BondLengthsReport {
                origin,
                rows: table
                    .rows()
                    .iter()
                    .map(|b| BondLengthDataRow {
                        metal: b.metal.clone(),
                        oxidation_state: b.oxidation_state,
                        donor: b.donor.clone(),
                        donor_class: b.donor_class.clone(),
                        low_spin: b.low_spin,
                        high_spin: b.high_spin,
                        delta_r: b.delta_r,
                        what: b.what.clone(),
                        source: b.source.clone(),
                    })
                    .collect(),
            };
            emit(&r, &(), asked)
        }
    }
}
