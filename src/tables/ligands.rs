//! `data/ligands.csv`: ligands by abbreviation, with aliases, donor atoms and field factors.
//!
//! Columns: `name` (the abbreviation used on the command line), `aliases` (`|`-separated),
//! `donors` (space-separated element symbols of the bound atoms), `denticity` (must equal the
//! number of donors), `charge`, `f` (Jørgensen's ligand factor, Δo = f·g), `f_from` (how f was
//! obtained: `printed`, `derived` from a named published Δ, or placed in the spectrochemical
//! `series`), `h` (Jørgensen's
//! nephelauxetic ligand factor, β = 1 − h·k), `e_sigma` and `e_pi` (angular overlap parameters in
//! cm⁻¹, published for Cr(III) only; informative, not used by the estimate), `pi`
//! (`acceptor`, `weak-acceptor`, `donor` or `none`), `binds` (space-separated geometries the ligand can occupy:
//! `oct`, `tet`, `sqpl`), `caution` (may be empty) and `source`. Empty cells mean "no value".

use super::{Record, Table};
use crate::engine::Geometry;
use crate::error::{closest_names, Error, Result};
use mendeleev::Element;
use std::collections::HashMap;

const HEADER: [&str; 14] = [
    "name",
    "aliases",
    "donors",
    "denticity",
    "charge",
    "f",
    "f_from",
    "h",
    "e_sigma",
    "e_pi",
    "pi",
    "binds",
    "caution",
    "source",
];

/// π bonding character of a ligand.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum PiRole {
    /// π acceptor (CN⁻, CO, diimines, phosphines): raises Δ, strongest on low-valent metals.
    Acceptor,
    /// Weak π acceptor (pyridine, nitriles).
    WeakAcceptor,
    /// π donor (halides, O donors): lowers Δ.
    Donor,
    /// σ only (saturated amines).
    None,
}

impl PiRole {
    /// The CSV spelling.
    pub fn name(self) -> &'static str {
        match self {
            PiRole::Acceptor => "acceptor",
            PiRole::WeakAcceptor => "weak-acceptor",
            PiRole::Donor => "donor",
            PiRole::None => "none",
        }
    }
}

/// How a ligand's field factor f was obtained; it sets the uncertainty the estimate assumes.
/// Ordered from the most to the least reliable, so `max` gives the worst of several.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum FieldBasis {
    /// Printed in Jørgensen's table.
    Printed,
    /// Derived as Δo/g from a named published Δo of one complex.
    Derived,
    /// Placed between two ligands of known f by its position in the spectrochemical series.
    Series,
}

impl FieldBasis {
    /// The CSV spelling.
    pub fn name(self) -> &'static str {
        match self {
            FieldBasis::Printed => "printed",
            FieldBasis::Derived => "derived",
            FieldBasis::Series => "series",
        }
    }
}

/// One ligand.
#[derive(Debug, Clone, PartialEq)]
pub struct Ligand {
    /// Abbreviation, e.g. "NCS".
    pub name: String,
    /// Other accepted names, e.g. "isothiocyanate".
    pub aliases: Vec<String>,
    /// Element symbols of the donor atoms; their number is the denticity.
    pub donors: Vec<String>,
    /// Charge of the free ligand.
    pub charge: i32,
    /// Jørgensen's ligand factor f (Δo = f·g); every ligand has one (see [`FieldBasis`]).
    pub f: f64,
    /// How f was obtained.
    pub f_from: FieldBasis,
    /// Jørgensen's nephelauxetic ligand factor h (β = 1 − h·k).
    pub h: Option<f64>,
    /// Angular overlap e_σ for Cr(III) (cm⁻¹).
    pub e_sigma: Option<f64>,
    /// Angular overlap e_π for Cr(III) (cm⁻¹); negative for π acceptors.
    pub e_pi: Option<f64>,
    /// π bonding character.
    pub pi: PiRole,
    /// Geometries the ligand can occupy.
    pub binds: Vec<Geometry>,
    /// Handling caution (short; defer to local rules and the SDS).
    pub caution: Option<String>,
    /// Where the values come from, with their tags.
    pub source: String,
}

impl Ligand {
    /// Whether the ligand can occupy `geometry`: as listed in its `binds` column, and the
    /// five-coordinate geometries (sqpy, tbp) wherever it binds in an octahedron (the column
    /// lists only oct, tet and sqpl; common practice).
    pub fn binds_in(&self, geometry: Geometry) -> bool {
        match geometry {
            Geometry::SquarePyramidal | Geometry::TrigonalBipyramidal => {
                self.binds.contains(&Geometry::Octahedral)
            }
            Geometry::Octahedral
            | Geometry::Tetrahedral
            | Geometry::SquarePlanar
            | Geometry::Tetragonal => self.binds.contains(&geometry),
        }
    }

    /// Number of donor atoms.
    pub fn denticity(&self) -> usize {
        self.donors.len()
    }

    /// Whether `name` is this ligand's abbreviation or one of its aliases (case-insensitive).
    pub fn is_called(&self, name: &str) -> bool {
        let n = name.trim();
        self.name.eq_ignore_ascii_case(n) || self.aliases.iter().any(|a| a.eq_ignore_ascii_case(n))
    }
}

/// The ligand table.
#[derive(Debug, Clone)]
pub struct LigandTable {
    pub rows: Vec<Ligand>,
    /// Row of each name and alias in ASCII lower case (checked on use, so edited rows are
    /// still found by the scan).
    index: HashMap<String, usize>,
}

impl PartialEq for LigandTable {
    fn eq(&self, other: &Self) -> bool {
        self.rows == other.rows
    }
}

impl Table for LigandTable {
    const FILE: &'static str = "ligands.csv";
    const HEADER: &'static [&'static str] = &HEADER;
    const BUNDLED: &'static str = include_str!("../../data/ligands.csv");
    type Row = Ligand;
    type Context = ();

    fn row(record: &Record<'_>, _: &(), rows: &[Ligand]) -> Result<Ligand> {
        let cell = |c| record.cell(c);
        let donors_cell = cell("donors");
        let donors: Vec<String> = donors_cell
            .required()?
            .split_whitespace()
            .map(str::to_string)
            .collect();
        for d in &donors {
            if !Element::iter().any(|e| e.symbol() == d) {
                return Err(donors_cell.error(format!("'{d}' is not an element symbol")));
            }
        }
        let denticity = cell("denticity").int(1..=6)?;
        if denticity as usize != donors.len() {
            return Err(cell("denticity").error(format!(
                "{denticity} does not match the {} donor atom(s) listed",
                donors.len()
            )));
        }
        let pi = cell("pi").one_of(&[
            ("acceptor", PiRole::Acceptor),
            ("weak-acceptor", PiRole::WeakAcceptor),
            ("donor", PiRole::Donor),
            ("none", PiRole::None),
        ])?;
        let f_from = cell("f_from").one_of(&[
            ("printed", FieldBasis::Printed),
            ("derived", FieldBasis::Derived),
            ("series", FieldBasis::Series),
        ])?;
        let binds_cell = cell("binds");
        let mut binds = Vec::new();
        for g in binds_cell.required()?.split_whitespace() {
            let geometry: Geometry = g.parse().map_err(|e| binds_cell.error(e))?;
            if !geometry.estimable() {
                return Err(binds_cell.error("use oct, tet or sqpl"));
            }
            binds.push(geometry);
        }
        let ligand = Ligand {
            name: cell("name").required()?,
            aliases: cell("aliases")
                .optional()
                .map(|a| a.split('|').map(|s| s.trim().to_string()).collect())
                .unwrap_or_default(),
            donors,
            charge: cell("charge").int(-4..=2)?,
            f: cell("f").number(0.3..=3.0, "")?,
            f_from,
            h: cell("h").optional_number(0.0..=5.0, "")?,
            e_sigma: cell("e_sigma").optional_number(0.0..=20000.0, " cm⁻¹")?,
            e_pi: cell("e_pi").optional_number(-5000.0..=5000.0, " cm⁻¹")?,
            pi,
            binds,
            caution: cell("caution").optional(),
            source: cell("source").source()?,
        };
        for n in std::iter::once(&ligand.name).chain(&ligand.aliases) {
            if let Some(other) = rows.iter().find(|r| r.is_called(n)) {
                return Err(cell("aliases").error(format!(
                    "the name '{n}' is already used by ligand {}",
                    other.name
                )));
            }
        }
        Ok(ligand)
    }

    fn from_rows(rows: Vec<Ligand>) -> Self {
        let mut index = HashMap::new();
        for (i, r) in rows.iter().enumerate() {
            for n in std::iter::once(&r.name).chain(&r.aliases) {
                index.entry(n.trim().to_ascii_lowercase()).or_insert(i);
            }
        }
        LigandTable { rows, index }
    }
}

impl LigandTable {
    /// All names and aliases, for suggestions.
    pub fn all_names(&self) -> impl Iterator<Item = &str> {
        self.rows.iter().flat_map(|r| {
            std::iter::once(r.name.as_str()).chain(r.aliases.iter().map(String::as_str))
        })
    }

    /// The ligand called `name` (abbreviation or alias, case-insensitive). An unknown name gets
    /// the closest known names.
    pub fn find(&self, name: &str) -> Result<&Ligand> {
        let indexed = self
            .index
            .get(&name.trim().to_ascii_lowercase())
            .and_then(|&i| self.rows.get(i))
            .filter(|r| r.is_called(name));
        indexed
            .or_else(|| self.rows.iter().find(|r| r.is_called(name)))
            .ok_or_else(|| Error::Unknown {
                kind: crate::error::NameKind::Ligand,
                name: name.trim().to_string(),
                suggestions: closest_names(name.trim(), self.all_names()),
            })
    }

    /// The mean published h over ligands whose first donor atom is `donor`, with their names;
    /// None when no such ligand has an h.
    pub fn mean_h_for_donor(&self, donor: &str) -> Option<(f64, Vec<String>)> {
        let with: Vec<&Ligand> = self
            .rows
            .iter()
            .filter(|r| r.h.is_some() && r.donors.first().map(String::as_str) == Some(donor))
            .collect();
        if with.is_empty() {
            return None;
        }
        let mean = with.iter().filter_map(|r| r.h).sum::<f64>() / with.len() as f64;
        Some((mean, with.iter().map(|r| r.name.clone()).collect()))
    }

    /// The mean published h over all ligands, with their names.
    pub fn mean_h(&self) -> Option<(f64, Vec<String>)> {
        let with: Vec<&Ligand> = self.rows.iter().filter(|r| r.h.is_some()).collect();
        if with.is_empty() {
            return None;
        }
        let mean = with.iter().filter_map(|r| r.h).sum::<f64>() / with.len() as f64;
        Some((mean, with.iter().map(|r| r.name.clone()).collect()))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    fn bundled() -> LigandTable {
        LigandTable::parse(LigandTable::BUNDLED).unwrap()
    }

    /// Table self-test: at least 30 ligands, each with a source, and the ligands the project
    /// promises are present under their usual abbreviations.
    #[test]
    fn every_row_is_sourced_and_the_usual_ligands_are_there() {
        let t = bundled();
        assert!(t.rows.len() >= 100, "{}", t.rows.len());
        for r in &t.rows {
            assert!(r.source.len() > 10, "{}", r.name);
            assert!(!r.binds.is_empty(), "{}", r.name);
            assert!(r.source.contains("f"), "{}", r.name);
        }
        for n in [
            "H2O", "aqua", "water", "NH3", "ammine", "en", "bpy", "phen", "terpy", "ox", "acac",
            "py", "CN", "CO", "F", "Cl", "Br", "I", "OH", "NCS", "SCN", "NO2", "ONO", "N3", "dmso",
            "MeCN", "PPh3", "tacn", "gly",
        ] {
            assert!(t.find(n).is_ok(), "{n} missing");
        }
    }

    /// Jørgensen's f and h (C. K. Jørgensen, Absorption Spectra and Chemical Bonding in
    /// Complexes, 1962, and Modern Aspects of Ligand Field Theory, 1971, as reproduced).
    #[test]
    fn jorgensen_factors() {
        let t = bundled();
        for (n, f, h) in [
            ("H2O", 1.00, Some(1.0)),
            ("NH3", 1.25, Some(1.4)),
            ("en", 1.28, Some(1.5)),
            ("CN", 1.7, Some(2.0)),
            ("Cl", 0.78, Some(2.0)),
            ("F", 0.90, Some(0.8)),
            ("py", 1.23, None),
            ("NCS", 1.02, None),
        ] {
            let l = t.find(n).unwrap();
            assert_eq!(l.f, f, "{n}");
            assert_eq!(l.f_from, FieldBasis::Printed, "{n}");
            assert_eq!(l.h, h, "{n}");
        }
    }

    /// The f values follow the spectrochemical series (Tsuchida; as in Cotton & Wilkinson,
    /// Advanced Inorganic Chemistry) where both are known.
    #[test]
    fn f_follows_the_spectrochemical_series() {
        let t = bundled();
        let series = [
            "Br", "SCN", "Cl", "N3", "F", "ox", "H2O", "NCS", "MeCN", "py", "NH3", "en", "bpy",
            "NO2", "CN",
        ];
        let f: Vec<f64> = series.iter().map(|n| t.find(n).unwrap().f).collect();
        for w in f.windows(2) {
            assert!(w[0] <= w[1], "{f:?}");
        }
    }

    #[test]
    fn aliases_and_denticity() {
        let t = bundled();
        assert_eq!(t.find("aqua").unwrap().name, "H2O");
        assert_eq!(t.find("ETHYLENEDIAMINE").unwrap().name, "en");
        assert_eq!(t.find("terpy").unwrap().denticity(), 3);
        assert_eq!(t.find("ox").unwrap().charge, -2);
        assert!(!t
            .find("tacn")
            .unwrap()
            .binds
            .contains(&Geometry::SquarePlanar));
        let e = t.find("bpyy").unwrap_err().to_string();
        assert!(e.contains("bpy"), "{e}");
    }

    #[test]
    fn donor_means() {
        let t = bundled();
        // N donors with a published h: NH3 (1.4), en (1.5), N3 (2.4; from memory), gly (2.0).
        let (h, names) = t.mean_h_for_donor("N").unwrap();
        let expected: f64 = names
            .iter()
            .map(|n| t.find(n).unwrap().h.unwrap())
            .sum::<f64>()
            / names.len() as f64;
        assert_abs_diff_eq!(h, expected, epsilon = 1e-12);
        assert!(names.contains(&"NH3".to_string()));
        assert!(t.mean_h_for_donor("P").is_none());
    }

    #[test]
    fn bad_rows_are_rejected() {
        let head = HEADER.join(",");
        let ok = "X1,,N,1,0,1.0,printed,,,,none,oct,,src";
        assert!(LigandTable::parse(&format!("{head}\n{ok}\n")).is_ok());
        let e = LigandTable::parse(&format!(
            "{head}\nX1,,N N,1,0,1.0,printed,,,,none,oct,,src\n"
        ))
        .unwrap_err();
        assert!(e.to_string().contains("denticity"), "{e}");
        let e = LigandTable::parse(&format!("{head}\nX1,,Q,1,0,1.0,printed,,,,none,oct,,src\n"))
            .unwrap_err();
        assert!(e.to_string().contains("not an element"), "{e}");
        let e = LigandTable::parse(&format!("{head}\nX1,,N,1,0,9.0,printed,,,,none,oct,,src\n"))
            .unwrap_err();
        assert!(e.to_string().contains("column f"), "{e}");
        let e = LigandTable::parse(&format!(
            "{head}\n{ok}\nX2,x1,N,1,0,1.0,printed,,,,none,oct,,src\n"
        ))
        .unwrap_err();
        assert!(e.to_string().contains("already used"), "{e}");
        let e = LigandTable::parse(&format!(
            "{head}\nX1,,N,1,0,1.0,printed,,,,weird,oct,,src\n"
        ))
        .unwrap_err();
        assert!(e.to_string().contains("acceptor"), "{e}");
    }
}
