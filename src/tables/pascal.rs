//! The Pascal-constant table, `data/pascal.csv`: diamagnetic increments for atoms, constitutive
//! (bond) corrections, ions, ligands and solvents. This module alone knows the CSV layout.
//!
//! Columns: `kind` (atom, constitutive, cation, anion, ligand, solvent), `name` (the key used in
//! `{…}` groups of a formula), `formula` (composition of the entry; empty for constitutive
//! corrections), `value_1e-6_cm3_per_mol` (χ_D in 10⁻⁶ cm³ mol⁻¹, cgs-emu) and `source`.

use super::{Record, Table};
use crate::error::{closest_names, Error, Result};
use crate::formula::Formula;
use mendeleev::Element;

/// What a Pascal entry stands for.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PascalKind {
    /// An atom in a covalent molecule (possibly a bonding variant such as N(ring)).
    Atom,
    /// A bond or structural correction added to the atom sum (no atoms of its own).
    Constitutive,
    Cation,
    Anion,
    /// A whole ligand molecule or ion.
    Ligand,
    /// A whole solvent molecule.
    Solvent,
}

impl PascalKind {
    pub const ALL: [PascalKind; 6] = [
        PascalKind::Atom,
        PascalKind::Constitutive,
        PascalKind::Cation,
        PascalKind::Anion,
        PascalKind::Ligand,
        PascalKind::Solvent,
    ];

    /// The CSV spelling.
    pub fn name(self) -> &'static str {
        match self {
            PascalKind::Atom => "atom",
            PascalKind::Constitutive => "constitutive",
            PascalKind::Cation => "cation",
            PascalKind::Anion => "anion",
            PascalKind::Ligand => "ligand",
            PascalKind::Solvent => "solvent",
        }
    }
}

/// One validated row.
#[derive(Debug, Clone, PartialEq)]
pub struct PascalEntry {
    pub kind: PascalKind,
    pub name: String,
    /// Composition; `None` for constitutive corrections.
    pub composition: Option<Formula>,
    /// Diamagnetic susceptibility χ_D in cm³ mol⁻¹ (cgs-emu), i.e. the CSV value × 10⁻⁶.
    pub value: f64,
    pub source: String,
}

/// The whole table, rows in file order.
#[derive(Debug, Clone)]
pub struct PascalTable {
    entries: Vec<PascalEntry>,
}

impl Table for PascalTable {
    const FILE: &'static str = "pascal.csv";
    const HEADER: &'static [&'static str] = &[
        "kind",
        "name",
        "formula",
        "value_1e-6_cm3_per_mol",
        "source",
    ];
    const BUNDLED: &'static str = include_str!("../../data/pascal.csv");
    type Row = PascalEntry;
    type Context = ();

    fn row(record: &Record<'_>, _: &(), entries: &[PascalEntry]) -> Result<PascalEntry> {
        let kind = record
            .cell("kind")
            .one_of(&PascalKind::ALL.map(|k| (k.name(), k)))?;
        let name_cell = record.cell("name");
        let name = name_cell.text().to_string();
        if name.is_empty() || name.contains('{') || name.contains('}') {
            return Err(name_cell.error(format!("'{name}' must be non-empty and without braces")));
        }
        if entries.iter().any(|e| e.name == name) {
            return Err(name_cell.error(format!("duplicate name '{name}'")));
        }
        let formula_cell = record.cell("formula");
        let formula_text = formula_cell.text();
        let composition = match (kind, formula_text.is_empty()) {
            (PascalKind::Constitutive, true) => None,
            (PascalKind::Constitutive, false) => {
                return Err(formula_cell.error("must be empty for a constitutive correction"))
            }
            (_, true) => return Err(formula_cell.error("composition is required")),
            (_, false) => Some(Formula::parse(formula_text).map_err(|e| formula_cell.error(e))?),
        };
        if kind == PascalKind::Atom {
            let f = composition.as_ref().expect("checked above");
            if f.elements().len() != 1 || f.charge() != 0 {
                return Err(formula_cell.error(format!(
                    "an atom row holds one element, found '{formula_text}'"
                )));
            }
            if element_symbol_name(&name).is_some_and(|e| !f.elements().contains_key(&e)) {
                return Err(formula_cell
                    .error(format!("'{formula_text}' does not match the atom '{name}'")));
            }
        }
        let value_cell = record.cell("value_1e-6_cm3_per_mol");
        let raw = value_cell.finite()?;
        if matches!(
            kind,
            PascalKind::Cation | PascalKind::Anion | PascalKind::Ligand | PascalKind::Solvent
        ) && raw >= 0.0
        {
            return Err(value_cell.error(format!(
                "{raw}: a whole ion or molecule is diamagnetic (< 0)"
            )));
        }
        Ok(PascalEntry {
            kind,
            name,
            composition,
            value: raw * 1e-6,
            source: record.cell("source").source()?,
        })
    }

    fn from_rows(entries: Vec<PascalEntry>) -> Self {
        PascalTable { entries }
    }
}

impl PascalTable {
    /// All rows, in file order.
    pub fn entries(&self) -> &[PascalEntry] {
        &self.entries
    }

    /// The row with this exact name.
    pub fn get(&self, name: &str) -> Option<&PascalEntry> {
        self.entries.iter().find(|e| e.name == name)
    }

    /// The row with this name, or an error naming the closest known names.
    pub fn require(&self, name: &str) -> Result<&PascalEntry> {
        self.get(name).ok_or_else(|| Error::Unknown {
            kind: crate::error::NameKind::PascalEntry,
            name: name.to_string(),
            suggestions: self.closest(name),
        })
    }

    /// The default atom row for an element: the atom row named by its bare symbol.
    pub fn atom(&self, element: Element) -> Option<&PascalEntry> {
        self.entries
            .iter()
            .find(|e| e.kind == PascalKind::Atom && e.name == element.symbol())
    }

    /// Every row for an element: cations and anions made of that one element (e.g. Fe2+, Fe3+),
    /// and atom variants (e.g. N(ring)).
    pub fn rows_of(&self, element: Element) -> Vec<&PascalEntry> {
        self.entries
            .iter()
            .filter(|e| {
                e.composition
                    .as_ref()
                    .is_some_and(|f| f.elements().len() == 1 && f.elements().contains_key(&element))
            })
            .collect()
    }

    /// The cation rows made of one atom of `element` (e.g. K+ for K; Fe2+ and Fe3+ for Fe).
    pub fn cations_of(&self, element: Element) -> Vec<&PascalEntry> {
        self.rows_of(element)
            .into_iter()
            .filter(|e| e.kind == PascalKind::Cation)
            .collect()
    }

    /// The known names closest to `name`.
    pub fn closest(&self, name: &str) -> Vec<String> {
        closest_names(name, self.entries.iter().map(|e| e.name.as_str()))
    }

    /// Parses a formula whose `{name}` groups are rows of this table (constitutive rows add no
    /// atoms).
    pub fn parse_formula(&self, text: &str) -> Result<Formula> {
        let lookup = |name: &str| match self.get(name) {
            Some(e) => Ok(e.composition.clone().unwrap_or_else(Formula::empty)),
            None => Err(self.closest(name)),
        };
        Formula::parse_with(text, &lookup)
    }
}

fn element_symbol_name(name: &str) -> Option<Element> {
    crate::formula::element_from_symbol(name)
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn bundled_table_loads_and_every_row_has_a_tagged_source() {
        let t = PascalTable::parse(PascalTable::BUNDLED).unwrap();
        assert!(t.entries().len() > 80);
        for e in t.entries() {
            assert!(
                e.source.starts_with("[S]") || e.source.starts_with("[M]"),
                "{}: {}",
                e.name,
                e.source
            );
        }
        // Spot values, Bain & Berry, J. Chem. Educ. 2008, 85, 532 (as reproduced).
        assert_relative_eq!(t.get("H").unwrap().value, -2.93e-6);
        assert_relative_eq!(t.get("py").unwrap().value, -49e-6);
        assert_relative_eq!(t.atom(Element::Cl).unwrap().value, -20.1e-6);
        assert_eq!(t.cations_of(Element::K).len(), 1);
        assert_eq!(t.cations_of(Element::Fe).len(), 2);
    }

    #[test]
    fn bad_rows_are_reported_with_row_and_column() {
        let head = "kind,name,formula,value_1e-6_cm3_per_mol,source\n";
        // (the rows after the header, or a whole text with "!" first; fragments of the error)
        let cases: [(&str, &[&str]); 7] = [
            (
                "atom,H,H,abc,src\n",
                &["line 2, column value_1e-6_cm3_per_mol"],
            ),
            ("ligand,py,C5H5N,-49,\n", &["needs a source"]),
            ("ligand,py,C5H5N,49,x\n", &["diamagnetic"]),
            (
                "atom,H,H,-2.93,x\natom,H,H,-2.93,x\n",
                &["line 3", "duplicate"],
            ),
            ("atom,N,O,-5,x\n", &["does not match"]),
            ("ligand,py,C5H5Q,-49,x\n", &["column formula"]),
            ("!a,b\n1,2\n", &["header"]),
        ];
        for (rows, needles) in cases {
            let text = match rows.strip_prefix('!') {
                Some(whole) => whole.to_string(),
                None => format!("{head}{rows}"),
            };
            let e = PascalTable::parse(&text).unwrap_err();
            assert!(needles.iter().all(|n| e.to_string().contains(n)), "{e}");
        }
    }

    #[test]
    fn braces_expand_to_compositions() {
        let t = PascalTable::parse(PascalTable::BUNDLED).unwrap();
        let f = t.parse_formula("[{Fe2+}{py}4({NCS-})2]").unwrap();
        assert_eq!(f.count(Element::C), 22.0);
        assert_eq!(f.count(Element::Fe), 1.0);
        assert!(f.free_elements().is_empty());
        let f = t.parse_formula("C5H5{N(ring)}{C-in-ring}5").unwrap();
        assert_eq!(f.count(Element::N), 1.0);
        assert_eq!(f.count(Element::C), 5.0);
        let e = t.parse_formula("{pyy}").unwrap_err().to_string();
        assert!(e.contains("did you mean py"), "{e}");
    }
}
