//! `spinstate data`: list the chemistry tables as loaded (bundled, or edited copies from
//! `--data DIR`).

use super::common::{load_tables, Format};
use super::{Failure, Output};
use spinstate::report::data::{IonsReport, LigandsReport};
use spinstate::report::to_json;
use std::path::Path;

/// Which table to list.
#[derive(Debug, Clone, Copy, clap::ValueEnum)]
pub enum Table {
    /// Metal ions: d^n, free-ion B0, C0, ζ, Jørgensen g and k.
    Ions,
    /// Ligands: aliases, donor atoms, charge, Jørgensen f and h, π character.
    Ligands,
}

#[derive(Debug, clap::Args)]
pub struct Args {
    /// The table to list.
    #[arg(value_enum)]
    pub table: Table,
    #[command(flatten)]
    pub format: Format,
}

pub fn run(args: &Args, data: Option<&Path>) -> Result<Output, Failure> {
    let tables = load_tables(data)?;
    let origin = data.map_or("bundled".to_string(), |d| d.display().to_string());
    let text = match args.table {
        Table::Ions => {
            let r = IonsReport {
                origin,
                ions: tables.ions.rows.iter().map(Into::into).collect(),
            };
            if args.format.json {
                to_json(&r)
            } else {
                r.to_table()
            }
        }
        Table::Ligands => {
            let r = LigandsReport {
                origin,
                ligands: tables.ligands.rows.iter().map(Into::into).collect(),
            };
            if args.format.json {
                to_json(&r)
            } else {
                r.to_table()
            }
        }
    };
    Ok(Output::text(text))
}
