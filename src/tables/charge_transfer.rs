//! Where intense charge-transfer absorption begins for a ligand, `data/charge_transfer.csv`.
//! This module alone knows the CSV layout.
//!
//! Columns: `ligand` (a name of `ligands.csv`), `metal` (element symbol or `any`), `ox`
//! (oxidation state or `any`), `kind` (`LMCT` ligand-to-metal or `MLCT` metal-to-ligand),
//! `onset_cm1` (cm⁻¹: above this, charge-transfer bands with ε ≫ 100 M⁻¹ cm⁻¹ can cover d–d
//! bands), `source`. A specific metal and oxidation state beats `any`.

use super::ligands::LigandTable;
use super::{Record, Table};
use crate::error::Result;

/// Direction of the charge transfer.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ChargeTransferKind {
    /// Ligand to metal (reducing ligands, oxidising metals).
    LigandToMetal,
    /// Metal to ligand (π-acceptor ligands, reducing metals).
    MetalToLigand,
}

impl ChargeTransferKind {
    /// "LMCT" or "MLCT".
    pub fn name(self) -> &'static str {
        match self {
            ChargeTransferKind::LigandToMetal => "LMCT",
            ChargeTransferKind::MetalToLigand => "MLCT",
        }
    }
}

/// One row.
#[derive(Debug, Clone, PartialEq)]
pub struct ChargeTransferOnset {
    /// Canonical ligand name of `ligands.csv`.
    pub ligand: String,
    /// Element symbol, None for any metal.
    pub metal: Option<String>,
    /// Oxidation state, None for any.
    pub oxidation_state: Option<i32>,
    pub kind: ChargeTransferKind,
    /// Onset (cm⁻¹).
    pub onset: f64,
    pub source: String,
}

impl ChargeTransferOnset {
    /// How specifically the row names the metal: 2 metal and oxidation state, 1 metal, 0 any.
    fn specificity(&self) -> u8 {
        match (&self.metal, self.oxidation_state) {
            (Some(_), Some(_)) => 2,
            (Some(_), None) => 1,
            _ => 0,
        }
    }

    fn applies_to(&self, metal: &str, ox: i32) -> bool {
        self.metal
            .as_deref()
            .is_none_or(|m| m.eq_ignore_ascii_case(metal))
            && self.oxidation_state.is_none_or(|o| o == ox)
    }
}

/// The whole table.
#[derive(Debug, Clone, Default)]
pub struct ChargeTransferTable {
    rows: Vec<ChargeTransferOnset>,
}

impl Table for ChargeTransferTable {
    const FILE: &'static str = "charge_transfer.csv";
    const HEADER: &'static [&'static str] =
        &["ligand", "metal", "ox", "kind", "onset_cm1", "source"];
    const BUNDLED: &'static str = include_str!("../../data/charge_transfer.csv");
    type Row = ChargeTransferOnset;
    /// Every ligand must be a canonical name of the ligand table.
    type Context = LigandTable;

    fn row(
        record: &Record<'_>,
        ligands: &LigandTable,
        rows: &[ChargeTransferOnset],
    ) -> Result<ChargeTransferOnset> {
        let ligand_cell = record.cell("ligand");
        let ligand = ligand_cell.text().to_string();
        let known = ligands.find(&ligand).ok().map(|l| l.name.clone());
        if known.as_deref() != Some(ligand.as_str()) {
            return Err(ligand_cell.error(format!(
                "'{ligand}' is not a ligand name of ligands.csv (use the name column, not an alias)"
            )));
        }
        let metal_cell = record.cell("metal");
        let metal = match metal_cell.text() {
            "any" => None,
            m if !m.is_empty() && m.chars().all(|c| c.is_ascii_alphabetic()) && m.len() <= 2 => {
                Some(m.to_string())
            }
            m => return Err(metal_cell.error(format!("'{m}' is not an element symbol or 'any'"))),
        };
        let ox_cell = record.cell("ox");
        let oxidation_state = ox_cell.int_or_any(-2..=8)?;
        if metal.is_none() && oxidation_state.is_some() {
            return Err(ox_cell.error("an oxidation state needs a metal"));
        }
        let row = ChargeTransferOnset {
            ligand,
            metal,
            oxidation_state,
            kind: record.cell("kind").one_of(&[
                ("LMCT", ChargeTransferKind::LigandToMetal),
                ("MLCT", ChargeTransferKind::MetalToLigand),
            ])?,
            onset: record
                .cell("onset_cm1")
                .number(5_000.0..=100_000.0, " cm⁻¹")?,
            source: record.cell("source").source()?,
        };
        if rows.iter().any(|r| {
            r.ligand == row.ligand
                && r.metal == row.metal
                && r.oxidation_state == row.oxidation_state
                && r.kind == row.kind
        }) {
            return Err(ligand_cell.error("duplicate ligand, metal, ox and kind"));
        }
        Ok(row)
    }

    fn from_rows(rows: Vec<ChargeTransferOnset>) -> Self {
        ChargeTransferTable { rows }
    }
}

impl ChargeTransferTable {
    /// All rows in file order.
    pub fn rows(&self) -> &[ChargeTransferOnset] {
        &self.rows
    }

    /// The rows that apply to one ligand on a metal in an oxidation state: the most specific
    /// rows of each kind.
    pub fn for_ligand(&self, ligand: &str, metal: &str, ox: i32) -> Vec<&ChargeTransferOnset> {
        let mut out: Vec<&ChargeTransferOnset> = Vec::new();
        for r in self
            .rows
            .iter()
            .filter(|r| r.ligand == ligand && r.applies_to(metal, ox))
        {
            match out.iter_mut().find(|o| o.kind == r.kind) {
                Some(o) if r.specificity() > o.specificity() => *o = r,
                Some(_) => {}
                None => out.push(r),
            }
        }
        out
    }

    /// The lowest onset among the given ligands on a metal, with its row; None when no row
    /// applies.
    pub fn onset<'a, I>(&self, ligands: I, metal: &str, ox: i32) -> Option<&ChargeTransferOnset>
    where
        I: IntoIterator<Item = &'a str>,
    {
        ligands
            .into_iter()
            .flat_map(|l| self.for_ligand(l, metal, ox))
            .min_by(|a, b| a.onset.total_cmp(&b.onset))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn ligands() -> LigandTable {
        LigandTable::parse(LigandTable::BUNDLED).unwrap()
    }

    #[test]
    fn bundled_table_loads_and_specific_rows_win() {
        let t = ChargeTransferTable::parse_with(ChargeTransferTable::BUNDLED, &ligands()).unwrap();
        assert!(t.rows().len() >= 20);
        // The red Fe(III)–thiocyanate colour is charge transfer (Lever 1984, from memory): the
        // Fe(III) row beats the generic one.
        let r = t.onset(["NCS"], "Fe", 3).unwrap();
        assert_eq!(r.onset, 18_000.0);
        assert_eq!(t.onset(["NCS"], "Ni", 2).unwrap().onset, 30_000.0);
        // The lowest onset of a mixed sphere: iodide before ammonia.
        let r = t.onset(["NH3", "I"], "Co", 3).unwrap();
        assert_eq!(r.ligand, "I");
        assert!(t.onset(["py"], "Ni", 2).is_none());
        for r in t.rows() {
            assert!(r.source.starts_with("[M]") || r.source.starts_with("[S]"));
        }
    }

    #[test]
    fn bad_rows_are_reported() {
        let head = "ligand,metal,ox,kind,onset_cm1,source\n";
        let l = ligands();
        let e =
            ChargeTransferTable::parse_with(&format!("{head}iodide,any,any,LMCT,20000,x\n"), &l)
                .unwrap_err();
        assert!(e.to_string().contains("name column"), "{e}");
        let e = ChargeTransferTable::parse_with(&format!("{head}I,any,any,XCT,20000,x\n"), &l)
            .unwrap_err();
        assert!(e.to_string().contains("accepted: LMCT"), "{e}");
        let e = ChargeTransferTable::parse_with(&format!("{head}I,any,any,LMCT,20,x\n"), &l)
            .unwrap_err();
        assert!(e.to_string().contains("onset_cm1"), "{e}");
        let e = ChargeTransferTable::parse_with(&format!("{head}I,any,any,LMCT,20000,\n"), &l)
            .unwrap_err();
        assert!(e.to_string().contains("source"), "{e}");
        let e = ChargeTransferTable::parse_with(&format!("{head}I,any,3,LMCT,20000,x\n"), &l)
            .unwrap_err();
        assert!(e.to_string().contains("needs a metal"), "{e}");
    }
}
