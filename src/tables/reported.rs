//! `data/reported_spin_states.csv`: complexes with their experimentally established spin state,
//! one published source per row. It calibrates the estimator's few constants
//! ([`crate::calibration`]), measures its leave-one-out accuracy, and lets `predict` say what
//! was reported for the complex asked for.
//!
//! Columns: `complex` (a formula label), `metal`, `oxidation_state`, `geometry` (`oct`, `tet`,
//! `sqpl`), `ligands` (space-separated `NAME:COUNT` items naming ligands.csv rows),
//! `spin_state` (`high`, `low`, `intermediate` or `crossover`), `unpaired` (unpaired electrons
//! of the low-temperature ground state), `t_half_k` (spin-crossover T½ in K, crossover rows
//! only), `category` (`3d-homoleptic`, `mixed`, `pi-acceptor`, `sco`, `4d5d`, `tetrahedral`,
//! `planar`) and `source`.

use super::{LigandTable, Record, Table};
use crate::engine::Geometry;
use crate::error::{Error, Result};
use crate::param::Param;

const HEADER: [&str; 10] = [
    "complex",
    "metal",
    "oxidation_state",
    "geometry",
    "ligands",
    "spin_state",
    "unpaired",
    "t_half_k",
    "category",
    "source",
];

/// A reported ground spin state.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum ReportedSpin {
    High,
    Low,
    /// Neither the highest nor the lowest spin (e.g. S = 1 planar Fe(II)).
    Intermediate,
    /// A thermal spin transition is established.
    Crossover,
}

impl ReportedSpin {
    /// The CSV spelling.
    pub fn name(self) -> &'static str {
        match self {
            ReportedSpin::High => "high",
            ReportedSpin::Low => "low",
            ReportedSpin::Intermediate => "intermediate",
            ReportedSpin::Crossover => "crossover",
        }
    }
}

/// The category a row is counted in for the accuracy figures.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum Category {
    ThreeDHomoleptic,
    Mixed,
    PiAcceptor,
    SpinCrossover,
    HeavyMetal,
    Tetrahedral,
    Planar,
}

impl Category {
    pub const ALL: [Category; 7] = [
        Category::ThreeDHomoleptic,
        Category::Mixed,
        Category::PiAcceptor,
        Category::SpinCrossover,
        Category::HeavyMetal,
        Category::Tetrahedral,
        Category::Planar,
    ];

    /// The CSV spelling.
    pub fn name(self) -> &'static str {
        match self {
            Category::ThreeDHomoleptic => "3d-homoleptic",
            Category::Mixed => "mixed",
            Category::PiAcceptor => "pi-acceptor",
            Category::SpinCrossover => "sco",
            Category::HeavyMetal => "4d5d",
            Category::Tetrahedral => "tetrahedral",
            Category::Planar => "planar",
        }
    }
}

/// One reported complex.
#[derive(Debug, Clone, PartialEq)]
pub struct ReportedComplex {
    /// Formula label, e.g. "[Fe(bpy)3]2+".
    pub complex: String,
    pub metal: String,
    pub oxidation_state: i32,
    pub geometry: Geometry,
    /// (canonical ligand name, count), as in ligands.csv.
    pub ligands: Vec<(String, usize)>,
    pub spin_state: ReportedSpin,
    /// Unpaired electrons of the low-temperature ground state.
    pub unpaired: usize,
    /// Spin-crossover T½ (K).
    pub t_half_k: Option<f64>,
    pub category: Category,
    pub source: String,
}

/// The reported-spin-state table.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct ReportedTable {
    pub rows: Vec<ReportedComplex>,
}

/// `NAME:COUNT` items (space- or `;`-separated) with canonical names from the ligand table.
pub fn parse_ligand_items(text: &str, ligands: &LigandTable) -> Result<Vec<(String, usize)>> {
    let mut out: Vec<(String, usize)> = Vec::new();
    for item in text.split([' ', ';']).filter(|s| !s.is_empty()) {
        let (name, count) = match item.rsplit_once(':') {
            Some((n, c)) => (
                n,
                c.parse::<usize>()
                    .ok()
                    .filter(|c| (1..=6).contains(c))
                    .ok_or_else(|| {
                        Error::invalid(Param::LigandCount, item, "NAME:COUNT with COUNT in 1..=6")
                    })?,
            ),
            None => (item, 1),
        };
        let canonical = ligands.find(name)?.name.clone();
        match out.iter_mut().find(|(n, _)| *n == canonical) {
            Some((_, c)) => *c += count,
            None => out.push((canonical, count)),
        }
    }
    out.sort();
    Ok(out)
}

impl Table for ReportedTable {
    const FILE: &'static str = "reported_spin_states.csv";
    const HEADER: &'static [&'static str] = &HEADER;
    const BUNDLED: &'static str = include_str!("../../data/reported_spin_states.csv");
    type Row = ReportedComplex;
    /// Every ligand must exist and the donor atoms must fill the geometry.
    type Context = LigandTable;

    fn row(
        record: &Record<'_>,
        ligands: &LigandTable,
        rows: &[ReportedComplex],
    ) -> Result<ReportedComplex> {
        let cell = |c| record.cell(c);
        let geometry_cell = cell("geometry");
        let geometry: Geometry = geometry_cell
            .required()?
            .parse()
            .map_err(|e| geometry_cell.error(e))?;
        if !geometry.estimable() {
            return Err(geometry_cell.error("use oct, tet or sqpl"));
        }
        let ligand_cell = cell("ligands");
        let items = parse_ligand_items(&ligand_cell.required()?, ligands)
            .map_err(|e| ligand_cell.error(e))?;
        let donors: usize = items
            .iter()
            .map(|(n, c)| c * ligands.find(n).map_or(0, |l| l.denticity()))
            .sum();
        if donors != geometry.coordination_number() {
            return Err(ligand_cell.error(format!(
                "{donors} donor atoms do not fill {} ({} needed)",
                geometry.name(),
                geometry.coordination_number()
            )));
        }
        let spin_state = cell("spin_state").one_of(&[
            ("high", ReportedSpin::High),
            ("low", ReportedSpin::Low),
            ("intermediate", ReportedSpin::Intermediate),
            ("crossover", ReportedSpin::Crossover),
        ])?;
        let category = cell("category").one_of(&Category::ALL.map(|c| (c.name(), c)))?;
        let t_half_k = cell("t_half_k").optional_number(1.0..=1000.0, " K")?;
        if (spin_state == ReportedSpin::Crossover) != t_half_k.is_some() {
            return Err(cell("t_half_k").error("give T½ for crossover rows and only for them"));
        }
        let row = ReportedComplex {
            complex: cell("complex").required()?,
            metal: cell("metal").required()?,
            oxidation_state: cell("oxidation_state").int(-2..=8)?,
            geometry,
            ligands: items,
            spin_state,
            unpaired: cell("unpaired").int(0..=5)? as usize,
            t_half_k,
            category,
            source: cell("source").source()?,
        };
        if rows.iter().any(|r| r.same_complex(&row)) {
            return Err(ligand_cell.error(format!(
                "{} appears twice (same metal, oxidation state, geometry and ligands)",
                row.complex
            )));
        }
        Ok(row)
    }

    fn from_rows(rows: Vec<ReportedComplex>) -> Self {
        ReportedTable { rows }
    }
}

impl ReportedTable {
    /// The row for a complex, if reported (ligands as canonical (name, count), any order).
    pub fn find(
        &self,
        metal: &str,
        oxidation_state: i32,
        geometry: Geometry,
        ligands: &[(String, usize)],
    ) -> Option<&ReportedComplex> {
        let mut key = ligands.to_vec();
        key.sort();
        self.rows.iter().find(|r| {
            r.metal.eq_ignore_ascii_case(metal)
                && r.oxidation_state == oxidation_state
                && r.geometry == geometry
                && r.ligands == key
        })
    }
}

impl ReportedComplex {
    fn same_complex(&self, other: &ReportedComplex) -> bool {
        self.metal == other.metal
            && self.oxidation_state == other.oxidation_state
            && self.geometry == other.geometry
            && self.ligands == other.ligands
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::tables::DataSet;

    /// Table self-test: at least 150 rows, each with a source naming a publication, every
    /// category present, crossover rows with a T½ and the low-spin unpaired count, every d^n
    /// with a spin choice in octahedra (d⁴–d⁷) covered.
    #[test]
    fn reported_table_is_sourced_and_covers_the_cases() {
        let t = DataSet::bundled();
        let rows = &t.reported().unwrap().rows;
        assert!(rows.len() >= 150, "{}", rows.len());
        for r in rows {
            assert!(r.source.len() > 15, "{}: {}", r.complex, r.source);
            assert!(
                r.source.chars().any(|c| c.is_ascii_digit()),
                "{}: a source names its year",
                r.complex
            );
            if r.spin_state == ReportedSpin::Crossover {
                assert!(r.t_half_k.is_some_and(|t| (4.0..=600.0).contains(&t)));
            }
        }
        for cat in Category::ALL {
            assert!(
                rows.iter().filter(|r| r.category == cat).count() >= 10,
                "{}",
                cat.name()
            );
        }
        for dn in 4..=7 {
            let n = rows
                .iter()
                .filter(|r| {
                    r.geometry == Geometry::Octahedral
                        && t.ions()
                            .unwrap()
                            .find(&r.metal, r.oxidation_state)
                            .is_ok_and(|i| i.dn == dn)
                })
                .count();
            assert!(n >= 10, "d{dn}: {n}");
        }
        let found = t
            .reported()
            .unwrap()
            .find("Fe", 2, Geometry::Octahedral, &[("bpy".to_string(), 3)])
            .unwrap();
        assert_eq!(found.spin_state, ReportedSpin::Low);
    }

    #[test]
    fn bad_rows_are_rejected() {
        let t = DataSet::bundled();
        let head = HEADER.join(",");
        let ok = "X,Fe,2,oct,H2O:6,high,4,,3d-homoleptic,src 2000";
        assert!(
            ReportedTable::parse_with(&format!("{head}\n{ok}\n"), t.ligands().unwrap()).is_ok()
        );
        for (bad, what) in [
            ("X,Fe,2,oct,H2O:5,high,4,,mixed,src", "do not fill"),
            ("X,Fe,2,oct,HHO:6,high,4,,mixed,src", "unknown ligand"),
            ("X,Fe,2,oct,H2O:6,hot,4,,mixed,src", "spin_state"),
            ("X,Fe,2,oct,H2O:6,crossover,0,,sco,src", "T½"),
            ("X,Fe,2,oct,H2O:6,high,4,,other,src", "category"),
        ] {
            let e = ReportedTable::parse_with(&format!("{head}\n{bad}\n"), t.ligands().unwrap())
                .unwrap_err()
                .to_string();
            assert!(e.contains(what), "{bad}: {e}");
        }
        let e = ReportedTable::parse_with(&format!("{head}\n{ok}\n{ok}\n"), t.ligands().unwrap())
            .unwrap_err()
            .to_string();
        assert!(e.contains("twice"), "{e}");
    }
}
