//! The engine's vocabulary of labels: free-ion terms ([`Term`], "4F") and irreducible
//! representations ([`Irrep`], "T1g", "Γ8g", or the L letter of a free ion). Each is a value
//! type with one Display (the text every table, CSV and JSON shows) and one FromStr, so that
//! code compares labels as values, never as text.

use serde::{Serialize, Serializer};
use std::fmt;
use std::str::FromStr;

/// Letters of orbital angular momentum L = 0, 1, 2, … (J is skipped; common practice).
pub const L_LETTERS: [char; 13] = [
    'S', 'P', 'D', 'F', 'G', 'H', 'I', 'K', 'L', 'M', 'N', 'O', 'Q',
];

/// The letter of orbital angular momentum `l` ('?' beyond the table).
pub fn l_letter(l: usize) -> char {
    L_LETTERS.get(l).copied().unwrap_or('?')
}

/// L of an orbital-angular-momentum letter.
pub fn l_of_letter(letter: char) -> Option<usize> {
    L_LETTERS.iter().position(|&c| c == letter)
}

/// A free-ion term ^{2S+1}L: twice the total spin and the orbital angular momentum.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub struct Term {
    /// Twice the total spin S.
    pub two_s: i32,
    /// Orbital angular momentum L.
    pub l: usize,
}

impl Term {
    pub fn new(two_s: i32, l: usize) -> Self {
        Term { two_s, l }
    }

    /// Spin multiplicity 2S + 1.
    pub fn multiplicity(self) -> i32 {
        self.two_s + 1
    }

    /// The L letter ('F' of "4F").
    pub fn letter(self) -> char {
        l_letter(self.l)
    }

    /// "4F", or "?" for an unknown term: the text of a parent that may be missing.
    pub fn text_of(term: Option<Term>) -> String {
        term.map_or_else(|| "?".to_string(), |t| t.to_string())
    }
}

impl fmt::Display for Term {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}{}", self.multiplicity(), self.letter())
    }
}

/// A spin-free level label ^{2S+1}Γ in the ligand field: twice the total spin and the irrep,
/// shown "4T1g".
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct LevelLabel {
    /// Twice the total spin S.
    pub two_s: i32,
    /// Mulliken label of the orbital part (or the L of a free ion).
    pub irrep: Irrep,
}

impl LevelLabel {
    pub fn new(two_s: i32, irrep: Irrep) -> Self {
        LevelLabel { two_s, irrep }
    }

    /// Spin multiplicity 2S + 1.
    pub fn multiplicity(self) -> i32 {
        self.two_s + 1
    }
}

impl fmt::Display for LevelLabel {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}{}", self.multiplicity(), self.irrep)
    }
}

/// "4F" → 2S = 3, L = 3.
impl FromStr for Term {
    type Err = String;

    fn from_str(s: &str) -> Result<Self, Self::Err> {
        let digits = s.chars().take_while(|c| c.is_ascii_digit()).count();
        let multiplicity: i32 = s[..digits]
            .parse()
            .ok()
            .filter(|&m| m >= 1)
            .ok_or_else(|| format!("'{s}' is not a term symbol such as 4F"))?;
        let mut rest = s[digits..].chars();
        match (rest.next().and_then(l_of_letter), rest.next()) {
            (Some(l), None) => Ok(Term::new(multiplicity - 1, l)),
            _ => Err(format!("'{s}' is not a term symbol such as 4F")),
        }
    }
}

impl Serialize for Term {
    fn serialize<S: Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        serializer.collect_str(self)
    }
}

/// The species of a single-valued irrep, in the order of the character tables of O and D₄
/// (A of C₁ first).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum Species {
    A,
    A1,
    A2,
    B1,
    B2,
    E,
    T1,
    T2,
}

impl Species {
    pub const ALL: [Species; 8] = [
        Species::A,
        Species::A1,
        Species::A2,
        Species::B1,
        Species::B2,
        Species::E,
        Species::T1,
        Species::T2,
    ];

    pub fn name(self) -> &'static str {
        match self {
            Species::A => "A",
            Species::A1 => "A1",
            Species::A2 => "A2",
            Species::B1 => "B1",
            Species::B2 => "B2",
            Species::E => "E",
            Species::T1 => "T1",
            Species::T2 => "T2",
        }
    }

    /// Dimension of the irrep.
    pub fn dimension(self) -> usize {
        match self {
            Species::A | Species::A1 | Species::A2 | Species::B1 | Species::B2 => 1,
            Species::E => 2,
            Species::T1 | Species::T2 => 3,
        }
    }

    /// T₁ or T₂: an orbital triplet.
    pub fn is_triplet(self) -> bool {
        matches!(self, Species::T1 | Species::T2)
    }
}

/// An irreducible representation labelling a level.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum Irrep {
    /// Mulliken label of a single-valued irrep ("T1g"; "g" in O_h and D_4h, none in T_d, C₁).
    Mulliken { species: Species, gerade: bool },
    /// Bethe label Γn of a double group ("Γ8g").
    Bethe { n: u8, gerade: bool },
    /// A free-ion level, labelled by its L (the letter, "F").
    FreeIon { l: usize },
    /// A level the characters could not label ("?").
    Unlabelled,
}

impl Irrep {
    /// The Mulliken label of `species` in a group: gerade in O_h and D_4h.
    pub fn mulliken(species: Species, gerade: bool) -> Self {
        Irrep::Mulliken { species, gerade }
    }

    /// The species of a Mulliken label; None for Bethe, free-ion and unlabelled levels.
    pub fn species(self) -> Option<Species> {
        match self {
            Irrep::Mulliken { species, .. } => Some(species),
            _ => None,
        }
    }

    /// Whether this is a Mulliken label of `species` (with or without g).
    pub fn is(self, species: Species) -> bool {
        self.species() == Some(species)
    }

    /// "Γ6g+Γ7g" for the labels of one degenerate set, "?" when there are none.
    pub fn sum_text(parts: &[Irrep]) -> String {
        if parts.is_empty() {
            return "?".to_string();
        }
        let names: Vec<String> = parts.iter().map(Irrep::to_string).collect();
        names.join("+")
    }
}

impl fmt::Display for Irrep {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let g = |gerade: bool| if gerade { "g" } else { "" };
        match *self {
            Irrep::Mulliken { species, gerade } => write!(f, "{}{}", species.name(), g(gerade)),
            Irrep::Bethe { n, gerade } => write!(f, "Γ{n}{}", g(gerade)),
            Irrep::FreeIon { l } => write!(f, "{}", l_letter(l)),
            Irrep::Unlabelled => f.write_str("?"),
        }
    }
}

/// "T1g", "E", "A", "Γ8g", an L letter ("F") or "?".
impl FromStr for Irrep {
    type Err = String;

    fn from_str(s: &str) -> Result<Self, Self::Err> {
        let bad = || format!("'{s}' is not an irrep label such as T1g, Eg, A1 or Γ8g");
        if s == "?" {
            return Ok(Irrep::Unlabelled);
        }
        let (body, gerade) = match s.strip_suffix('g') {
            Some(b) => (b, true),
            None => (s, false),
        };
        if let Some(n) = body.strip_prefix('Γ') {
            return n
                .parse()
                .ok()
                .filter(|n| (1..=8).contains(n))
                .map(|n| Irrep::Bethe { n, gerade })
                .ok_or_else(bad);
        }
        if let Some(species) = Species::ALL.into_iter().find(|sp| sp.name() == body) {
            return Ok(Irrep::mulliken(species, gerade));
        }
        let mut chars = s.chars();
        match (chars.next().and_then(l_of_letter), chars.next()) {
            (Some(l), None) => Ok(Irrep::FreeIon { l }),
            _ => Err(bad()),
        }
    }
}

impl Serialize for Irrep {
    fn serialize<S: Serializer>(&self, serializer: S) -> Result<S::Ok, S::Error> {
        serializer.collect_str(self)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// L letters S, P, D, F, G, H, I (common practice).
    #[test]
    fn term_l_reads_the_letter() {
        let l = |s: &str| s.parse::<Term>().ok().map(|t| t.l);
        assert_eq!(l("4F"), Some(3));
        assert_eq!(l("2I"), Some(6));
        assert_eq!(l(&Term::new(4, 2).to_string()), Some(2));
        assert_eq!(l("5"), None);
    }

    #[test]
    fn labels_read_back_what_they_print() {
        for t in ["1S", "4F", "2H", "6S", "3P", "2D"] {
            assert_eq!(t.parse::<Term>().unwrap().to_string(), t);
        }
        for i in [
            "A", "A1", "A2g", "B1g", "B2g", "E", "Eg", "T1", "T1g", "T2g", "Γ6", "Γ8g", "F", "?",
        ] {
            assert_eq!(i.parse::<Irrep>().unwrap().to_string(), i);
        }
        for bad in ["", "4", "4X", "0F", "T3g", "Γ9", "Xg", "FF"] {
            assert!(
                bad.parse::<Term>().is_err() || bad.parse::<Irrep>().is_err(),
                "{bad}"
            );
        }
        assert!("T3g".parse::<Irrep>().is_err());
        assert!("0F".parse::<Term>().is_err());
        assert_eq!(
            serde_json::to_string(&Irrep::mulliken(Species::T1, true)).unwrap(),
            "\"T1g\""
        );
        assert_eq!(serde_json::to_string(&Term::new(3, 3)).unwrap(), "\"4F\"");
    }
}
