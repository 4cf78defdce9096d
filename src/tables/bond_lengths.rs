//! Metal–donor bond lengths of the low-spin and high-spin states, `data/bond_lengths.csv`.
//! This module alone knows the CSV layout.
//!
//! Columns: `metal` (element symbol), `oxidation_state`, `donor` (element symbol of the donor
//! atom), `donor_class` (`any`, or a kind of donor such as `imine`, `amine`, `phenolate` when the
//! published values are per donor type), `ls_min_a`, `ls_max_a`, `hs_min_a`, `hs_max_a` (Å; the
//! low-spin and high-spin ranges, a single published value as min = max, all four empty when the
//! source gives only the change), `delta_r_a` (Å, high spin minus low spin), `what`, `source`.
//!
//! Several rows may share metal, oxidation state, donor and class (a typical range and a
//! published example): [`BondLengthTable::reference`] then joins their ranges.

use super::{Record, Table};
use crate::error::Result;

const HEADER: [&str; 11] = [
    "metal",
    "oxidation_state",
    "donor",
    "donor_class",
    "ls_min_a",
    "ls_max_a",
    "hs_min_a",
    "hs_max_a",
    "delta_r_a",
    "what",
    "source",
];
/// Bond lengths outside this range (Å) are rejected as typing errors.
pub const SENSIBLE_A: (f64, f64) = (1.5, 3.0);

/// One row: a published range or example.
#[derive(Debug, Clone, PartialEq)]
pub struct BondLengthRow {
    pub metal: String,
    pub oxidation_state: i32,
    /// Donor element, e.g. "N".
    pub donor: String,
    /// "any" or a donor type such as "imine".
    pub donor_class: String,
    /// Low-spin range (Å), when given.
    pub low_spin: Option<(f64, f64)>,
    /// High-spin range (Å), when given.
    pub high_spin: Option<(f64, f64)>,
    /// Change of the bond length from low to high spin (Å), when given.
    pub delta_r: Option<f64>,
    pub what: String,
    pub source: String,
}

/// The joined reference ranges for one metal, oxidation state and donor element.
#[derive(Debug, Clone, PartialEq)]
pub struct Reference {
    /// Low-spin range (Å): the smallest range holding every row's low-spin range.
    pub low_spin: (f64, f64),
    /// High-spin range (Å).
    pub high_spin: (f64, f64),
    /// The rows joined.
    pub rows: Vec<BondLengthRow>,
}

/// The whole table.
#[derive(Debug, Clone)]
pub struct BondLengthTable {
    rows: Vec<BondLengthRow>,
}

impl Table for BondLengthTable {
    const FILE: &'static str = "bond_lengths.csv";
    const HEADER: &'static [&'static str] = &HEADER;
    const BUNDLED: &'static str = include_str!("../../data/bond_lengths.csv");
    type Row = BondLengthRow;
    type Context = ();

    fn row(record: &Record<'_>, _: &(), _: &[BondLengthRow]) -> Result<BondLengthRow> {
        let cell = |c| record.cell(c);
        let length = |c| cell(c).optional_number(SENSIBLE_A.0..=SENSIBLE_A.1, " Å");
        let range = |lo: &'static str, hi: &'static str| -> Result<Option<(f64, f64)>> {
            match (length(lo)?, length(hi)?) {
                (None, None) => Ok(None),
                (Some(a), Some(b)) if a <= b => Ok(Some((a, b))),
                (Some(a), Some(b)) => Err(cell(hi).error(format!("{b} is below {lo} {a}"))),
                _ => Err(cell(lo).error("give both ends of the range, or neither")),
            }
        };
        let metal = cell("metal").required()?;
        let oxidation_state = cell("oxidation_state").int(0..=8)?;
        let donor = cell("donor").required()?;
        let donor_class = cell("donor_class");
        if donor_class.text().is_empty() {
            return Err(donor_class.error("is empty; use 'any' or a donor type such as imine"));
        }
        let low_spin = range("ls_min_a", "ls_max_a")?;
        let high_spin = range("hs_min_a", "hs_max_a")?;
        if low_spin.is_some() != high_spin.is_some() {
            return Err(cell("ls_min_a")
                .error("give both the low-spin and the high-spin range, or neither"));
        }
        // Relations between columns: the two ranges may touch but not overlap, or a bond
        // length inside both would be read as either spin state.
        if let (Some((ls_min, ls_max)), Some((hs_min, hs_max))) = (low_spin, high_spin) {
            if ls_min.max(hs_min) < ls_max.min(hs_max) {
                return Err(cell("ls_max_a").error(format!(
                    "the low-spin range {ls_min}–{ls_max} Å overlaps the high-spin range {hs_min}–{hs_max} Å; the ranges may touch but not overlap"
                )));
            }
        }
        let delta_cell = cell("delta_r_a");
        let delta_r = delta_cell.optional_number(-0.5..=0.5, " Å")?;
        // The change must go the way the ranges go (high spin minus low spin).
        if let (Some((ls_min, ls_max)), Some((hs_min, hs_max)), Some(dr)) =
            (low_spin, high_spin, delta_r)
        {
            let mid = (hs_min + hs_max - ls_min - ls_max) / 2.0;
            if dr * mid < 0.0 {
                return Err(delta_cell.error(format!(
                    "{dr} Å has the opposite sign to the ranges (high-spin middle minus low-spin middle = {mid:.3} Å)"
                )));
            }
        }
        if low_spin.is_none() && delta_r.is_none() {
            return Err(delta_cell.error("a row needs the two ranges or the change delta_r_a"));
        }
        Ok(BondLengthRow {
            metal,
            oxidation_state,
            donor,
            donor_class: donor_class.text().to_string(),
            low_spin,
            high_spin,
            delta_r,
            what: cell("what").text().to_string(),
            source: cell("source").source()?,
        })
    }

    fn from_rows(rows: Vec<BondLengthRow>) -> Self {
        BondLengthTable { rows }
    }
}

impl BondLengthTable {
    /// All rows in file order.
    pub fn rows(&self) -> &[BondLengthRow] {
        &self.rows
    }

    /// Every row for a metal (any case), oxidation state and donor element.
    pub fn rows_for(&self, metal: &str, oxidation_state: i32, donor: &str) -> Vec<&BondLengthRow> {
        self.rows
            .iter()
            .filter(|r| {
                r.metal.eq_ignore_ascii_case(metal)
                    && r.oxidation_state == oxidation_state
                    && r.donor.eq_ignore_ascii_case(donor)
            })
            .collect()
    }

    /// The joined ranges of the rows with donor class `any` and both ranges given; None when
    /// there are none (the table then has no reference range for this donor set).
    pub fn reference(&self, metal: &str, oxidation_state: i32, donor: &str) -> Option<Reference> {
        let rows: Vec<BondLengthRow> = self
            .rows_for(metal, oxidation_state, donor)
            .into_iter()
            .filter(|r| r.donor_class == "any" && r.low_spin.is_some())
            .cloned()
            .collect();
        let join = |pick: fn(&BondLengthRow) -> Option<(f64, f64)>| {
            rows.iter()
                .filter_map(pick)
                .fold(None, |acc: Option<(f64, f64)>, (a, b)| {
                    Some(acc.map_or((a, b), |(x, y)| (x.min(a), y.max(b))))
                })
        };
        let low_spin = join(|r| r.low_spin)?;
        let high_spin = join(|r| r.high_spin)?;
        Some(Reference {
            low_spin,
            high_spin,
            rows,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn bundled_table_loads_with_sources() {
        let t = BondLengthTable::parse(BondLengthTable::BUNDLED).unwrap();
        assert!(t.rows().iter().all(|r| !r.source.is_empty()));
        // Fe(II)–N: the typical ranges 1.95–2.00 / 2.15–2.20 Å (Gütlich & Goodwin 2004; Guionneau
        // 2004; from memory) joined with [Fe(2-pic)3]Cl2·EtOH, 2.032 Å LS and 2.199 Å HS (IUPAC
        // Gold Book, "spin crossover").
        let r = t.reference("fe", 2, "N").unwrap();
        assert_eq!(r.low_spin, (1.95, 2.032));
        assert_eq!(r.high_spin, (2.15, 2.20));
        assert_eq!(r.rows.len(), 2);
        // Co(II)–N has only the change (Crystals 2018, 8, 155): no reference range.
        assert!(t.reference("Co", 2, "N").is_none());
        assert_eq!(t.rows_for("Co", 2, "N")[0].delta_r, Some(0.10));
        // Fe(III)–N is given per donor type, and as their union for a mean over N donors.
        assert_eq!(t.rows_for("Fe", 3, "N").len(), 3);
        let r = t.reference("Fe", 3, "N").unwrap();
        assert_eq!((r.low_spin, r.high_spin), ((1.92, 2.08), (2.09, 2.26)));
    }

    #[test]
    fn bad_rows_are_reported() {
        let head = HEADER.join(",");
        let e = BondLengthTable::parse(&format!("{head}\nFe,2,N,any,2.0,1.9,2.1,2.2,,x,src\n"))
            .unwrap_err();
        assert!(e.to_string().contains("line 2, column ls_max_a"), "{e}");
        let e = BondLengthTable::parse(&format!("{head}\nFe,2,N,any,1.9,2.0,2.1,2.2,,x,\n"))
            .unwrap_err();
        assert!(e.to_string().contains("source"), "{e}");
        let e = BondLengthTable::parse(&format!("{head}\nFe,2,N,any,19,20,2.1,2.2,,x,s\n"))
            .unwrap_err();
        assert!(e.to_string().contains("1.5..=3"), "{e}");
        let e = BondLengthTable::parse(&format!("{head}\nFe,2,N,any,,,,,,x,s\n")).unwrap_err();
        assert!(e.to_string().contains("delta_r_a"), "{e}");
        let e = BondLengthTable::parse(&format!("{head}\n")).unwrap_err();
        assert!(e.to_string().contains("no rows"), "{e}");
        let e = BondLengthTable::parse("metal,ox\nFe,2\n").unwrap_err();
        assert!(e.to_string().contains("header must be"), "{e}");
    }
}
