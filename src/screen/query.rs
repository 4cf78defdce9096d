//! What a screen is asked: the aim, the size range, donor sets, ion specifications, filters and how
//! many hits to keep.

use crate::error::{Error, Result};
use crate::param::Param;
use mendeleev::Element;
use std::fmt;
use std::str::FromStr;

/// What a screen looks for.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Target {
    /// Δ/B as close to the crossover as possible (candidates for spin crossover).
    Crossover,
    /// Safely high-spin: Δ/B far below the crossover.
    High,
    /// Safely low-spin: Δ/B far above the crossover.
    Low,
}

impl Target {
    /// "crossover", "high" or "low".
    pub fn name(self) -> &'static str {
        match self {
            Target::Crossover => "crossover",
            Target::High => "high",
            Target::Low => "low",
        }
    }

    /// Score (larger is better) of a margin given in percent of the crossover Δ/B.
    #[inline]
    pub fn score(self, percent: f64) -> f64 {
        match self {
            Target::Crossover => -percent.abs(),
            Target::High => -percent,
            Target::Low => percent,
        }
    }
}

impl FromStr for Target {
    type Err = Error;
    fn from_str(s: &str) -> Result<Self> {
        match s.trim().to_ascii_lowercase().as_str() {
            "crossover" | "sco" => Ok(Target::Crossover),
            "high" | "hs" | "high-spin" => Ok(Target::High),
            "low" | "ls" | "low-spin" => Ok(Target::Low),
            _ => Err(Error::invalid(Param::Target, s, "crossover, high or low")),
        }
    }
}

/// An inclusive range of counts, written `N`, `A..B`, `A..=B` or `A-B` (both ends included).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct SizeRange {
    pub min: usize,
    pub max: usize,
}

impl SizeRange {
    pub fn contains(&self, n: usize) -> bool {
        (self.min..=self.max).contains(&n)
    }
}

impl fmt::Display for SizeRange {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if self.min == self.max {
            write!(f, "{}", self.min)
        } else {
            write!(f, "{}..{}", self.min, self.max)
        }
    }
}

impl FromStr for SizeRange {
    type Err = Error;
    fn from_str(s: &str) -> Result<Self> {
        let bad = || {
            Error::invalid(
                Param::SizeRange,
                format!("'{s}'"),
                "N or MIN..MAX with whole numbers, MIN ≤ MAX (both included), e.g. 1..2",
            )
        };
        let t = s.trim();
        let (a, b) = if let Some((a, b)) = t.split_once("..=") {
            (a, b)
        } else if let Some((a, b)) = t.split_once("..") {
            (a, b)
        } else if let Some((a, b)) = t.split_once('-') {
            (a, b)
        } else {
            (t, t)
        };
        let min: usize = a.trim().parse().map_err(|_| bad())?;
        let max: usize = b.trim().parse().map_err(|_| bad())?;
        if min > max {
            return Err(bad());
        }
        Ok(SizeRange { min, max })
    }
}

/// A donor-atom set such as `N6` or `N4O2` (element symbols with counts; a missing count is 1).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct DonorSet {
    /// (element symbol, count), sorted by symbol, counts ≥ 1.
    pub counts: Vec<(String, usize)>,
}

impl DonorSet {
    /// Total number of donor atoms.
    pub fn total(&self) -> usize {
        self.counts.iter().map(|(_, n)| n).sum()
    }

    /// The donor set of a list of donor atoms (with repeats), sorted by symbol.
    pub fn of_atoms<'a>(atoms: impl IntoIterator<Item = &'a str>) -> DonorSet {
        let mut counts: Vec<(String, usize)> = Vec::new();
        for a in atoms {
            match counts.iter_mut().find(|(e, _)| e == a) {
                Some((_, n)) => *n += 1,
                None => counts.push((a.to_string(), 1)),
            }
        }
        counts.sort();
        DonorSet { counts }
    }
}

impl fmt::Display for DonorSet {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        for (e, n) in &self.counts {
            if *n == 1 {
                write!(f, "{e}")?;
            } else {
                write!(f, "{e}{n}")?;
            }
        }
        Ok(())
    }
}

impl FromStr for DonorSet {
    type Err = Error;
    fn from_str(s: &str) -> Result<Self> {
        let accepted = "element symbols with counts, e.g. N6 or N4O2";
        let chars: Vec<char> = s.trim().chars().filter(|c| !c.is_whitespace()).collect();
        if chars.is_empty() {
            return Err(Error::invalid(Param::DonorSet, "''", accepted));
        }
        let mut counts: Vec<(String, usize)> = Vec::new();
        let mut i = 0;
        while i < chars.len() {
            if !chars[i].is_ascii_uppercase() {
                return Err(Error::invalid(Param::DonorSet, format!("'{s}'"), accepted));
            }
            let mut sym = chars[i].to_string();
            i += 1;
            while i < chars.len() && chars[i].is_ascii_lowercase() {
                sym.push(chars[i]);
                i += 1;
            }
            let start = i;
            while i < chars.len() && chars[i].is_ascii_digit() {
                i += 1;
            }
            let n: usize = if start == i {
                1
            } else {
                chars[start..i]
                    .iter()
                    .collect::<String>()
                    .parse()
                    .map_err(|_| Error::invalid(Param::DonorSet, format!("'{s}'"), accepted))?
            };
            if !Element::iter().any(|e| e.symbol() == sym) {
                return Err(Error::invalid(
                    Param::DonorSet,
                    format!("'{s}' ('{sym}' is not an element symbol)"),
                    accepted,
                ));
            }
            if n == 0 {
                return Err(Error::invalid(
                    Param::DonorSet,
                    format!("'{s}' (count 0 for {sym})"),
                    accepted,
                ));
            }
            match counts.iter_mut().find(|(e, _)| *e == sym) {
                Some((_, m)) => *m += n,
                None => counts.push((sym, n)),
            }
        }
        counts.sort();
        Ok(DonorSet { counts })
    }
}

/// A metal ion to screen, e.g. Fe(II).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct IonSpec {
    pub metal: String,
    pub oxidation_state: i32,
}

/// Which candidates to keep.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Filters {
    /// Ligands every candidate must contain (names or aliases).
    pub require: Vec<String>,
    /// Ligands no candidate may contain.
    pub forbid: Vec<String>,
    /// Largest |charge| of the complex (oxidation state plus ligand charges).
    pub max_abs_charge: Option<i32>,
    /// Exact donor-atom set, e.g. N6.
    pub donors: Option<DonorSet>,
    /// Number of ligands bound (a bidentate ligand counts once).
    pub size: Option<SizeRange>,
    /// Number of distinct ligands.
    pub kinds: Option<SizeRange>,
}

/// How many ranked candidates to keep.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Keep {
    /// The best N (bounded heap; nothing else is stored). N ≥ 1.
    Top(usize),
    /// Every candidate that passes the filters (24 bytes each).
    All,
}
