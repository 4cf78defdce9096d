//! Screening coordination spheres by their distance to the spin crossover.
//!
//! A screen ranks candidate spheres (sets of ligands that fill a geometry) for one or more metal
//! ions by how far the estimated Δ/B lies from the ion's crossover Δ/B, for one of three aims
//! ([`Target`]): as close to the crossover as possible (spin-crossover design), safely high-spin
//! or safely low-spin. Candidates come from a pool of ligands ([`Screen::from_pool`]: every
//! multiset of pool ligands whose donor atoms fill the geometry, a bidentate ligand taking two
//! sites and a tridentate three) or from a CSV file ([`Screen::from_candidates`], layout in
//! [`CANDIDATE_COLUMNS`]).
//!
//! # The numbers
//! Δ_HS, Δ_LS, B, C and the spin state are those of
//! [`ComplexSpec::resolve`](crate::complex::ComplexSpec::resolve) for the same sphere: the
//! screen calls the estimator's own functions ([`estimate::reference_delta`], the ion's
//! [`SpinGeometry`], [`estimate::choose_spin`], [`Reliability`]) on sums it accumulates, so the
//! numbers are the same by construction; the unit tests check them bit for bit against
//! `resolve` for random spheres. `borderline` is |Δ̄/B − X| ≤ u·Δ̄/B, with Δ̄ the mean of the
//! two states' fields and u the assumed relative uncertainty of Δ/B, as in `predict`.
//!
//! # Why it is fast
//! `resolve` sums nᵢdᵢfᵢ, nᵢdᵢπᵢ and nᵢdᵢhᵢ over the ligands; a screen precomputes these terms
//! for every pool ligand and count, and adds them while it walks the multisets depth first, so
//! one candidate costs a handful of additions, a few multiplications and divisions and a
//! comparison. The crossover Δ/B, its slope and the ion's spin geometry depend only on the ion
//! and geometry, so they are computed once per ion ([`crate::engine::crossover`], itself
//! cached) instead of once per candidate. When only the best N are wanted, a bounded heap keeps
//! them and nothing else is stored.
//!
//! # Scores
//! `score` is larger for a better candidate, in percent of the crossover Δ/B X:
//! - `crossover`: −|Δ̄/B − A|/X · 100 with A the Δ̄/B at which E_HS − E_LS is the middle of the
//!   thermal window ([`estimate::crossover_target`]): 0 is a sphere whose low-spin state lies
//!   just below a thermally reachable high-spin state;
//! - `high`: (X − Δ̄/B)/X · 100 (how far below the crossover);
//! - `low`: (Δ̄/B − X)/X · 100 (how far above it).
//!
//! Ties are broken by ion (in the order given), then by the sphere (ligands in table order),
//! then by candidate name, so the ranking never depends on the order of a candidates file.
//!
//! # Limits
//! The estimate is that of [`crate::estimate`]: each spin state at its own bond length, with
//! the calibrated constants. Its uncertainty (±15–25 % in Δ/B) is wide against the thermal
//! window, so a sphere ranked "at the crossover" is a starting point for synthesis, not a
//! prediction of a transition temperature.

use crate::engine::{crossover, Crossover, Geometry};
use crate::error::{Error, Result};
use crate::estimate::{self, Calibration, Reliability, SpinGeometry, SpinState, CALIBRATION};
use crate::param::Param;
use crate::tables::{DataSet, FieldBasis, Ion, Ligand, LigandTable, TransitionSeries};
use mendeleev::Element;
use std::cmp::Ordering;
use std::collections::BinaryHeap;
use std::fmt;
use std::str::FromStr;

/// Most donor sites of any geometry a screen can fill (octahedral).
pub const MAX_SITES: usize = 6;

/// Largest number of candidate spheres a pool may generate (a guard against runs of hours).
pub const MAX_CANDIDATES: u64 = 200_000_000;

/// Most distinct ligands in a pool or a candidates file (indices are stored in a byte).
pub const MAX_POOL: usize = 250;

/// Columns of a candidates file: `ligands` (required: `NAME[:COUNT]` items separated by spaces
/// or `;`, e.g. `NCS:2 py:4`) and `name` (optional label). Other columns are ignored, lines
/// starting with `#` are comments, and the header row is required.
pub const CANDIDATE_COLUMNS: [&str; 2] = ["name", "ligands"];

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

/// A pool ligand prepared for screening.
#[derive(Debug, Clone)]
pub struct PoolLigand {
    pub ligand: Ligand,
    /// Row of the ligand in the table (pools are ordered by it).
    pub table_index: usize,
    pub denticity: usize,
    /// Jørgensen f.
    pub f: f64,
    /// h used: the published h, or the donor-atom default that `resolve` uses.
    pub h: Option<f64>,
    /// True when `h` is a default.
    pub h_defaulted: bool,
    /// π-acceptor term π = −4e_π/g(Cr³⁺) ([`estimate::ligand_terms`]).
    pub pi: f64,
    /// (c·d)·f, (c·d)·π and (c·d)·h for c = 0..=MAX_SITES, as `resolve` forms them.
    f_terms: [f64; MAX_SITES + 1],
    pi_terms: [f64; MAX_SITES + 1],
    h_terms: [f64; MAX_SITES + 1],
    /// Donor atoms counted in 4-bit fields, one per element of the donor filter plus "other".
    donor_key: u32,
}

/// An ion prepared for screening, with its crossover computed once.
#[derive(Debug, Clone)]
pub struct ScreenIon {
    pub ion: Ion,
    /// Jørgensen g (cm⁻¹).
    pub g: f64,
    /// Free-ion B₀ (cm⁻¹).
    pub b0: f64,
    /// Jørgensen k (None: β = 1).
    pub k: Option<f64>,
    /// C/B used (C₀/B₀ or the Tanabe–Sugano ratio).
    pub c_over_b: f64,
    pub crossover: Crossover,
    /// Crossover Δ/B (the engine found one; ions without one are rejected).
    pub crossover_delta_over_b: f64,
    /// d(E_HS − E_LS)/dΔ at the crossover.
    pub slope: f64,
    /// How the two spin states' fields differ ([`SpinGeometry`]).
    pub spin_geometry: SpinGeometry,
}

/// A coordination sphere: pool indices in non-decreasing order (a multiset), padded with 255.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub struct Sphere {
    idx: [u8; MAX_SITES],
    len: u8,
}

impl Sphere {
    const EMPTY: Sphere = Sphere {
        idx: [u8::MAX; MAX_SITES],
        len: 0,
    };

    fn push(&mut self, i: usize) {
        self.idx[self.len as usize] = i as u8;
        self.len += 1;
    }

    /// Pool indices, one per ligand bound (repeats for counts > 1).
    pub fn indices(&self) -> &[u8] {
        &self.idx[..self.len as usize]
    }

    /// (pool index, count) runs in pool order.
    pub fn runs(&self) -> Vec<(usize, usize)> {
        let mut runs: Vec<(usize, usize)> = Vec::new();
        for &i in self.indices() {
            match runs.last_mut() {
                Some((j, c)) if *j == i as usize => *c += 1,
                _ => runs.push((i as usize, 1)),
            }
        }
        runs
    }

    fn contains(&self, i: u8) -> bool {
        self.indices().contains(&i)
    }
}

/// (table or pool index, count) pairs in index order.
type Runs = Vec<(usize, usize)>;

/// Sums over a sphere that the estimate needs, accumulated run by run in pool order.
#[derive(Debug, Clone, Copy)]
struct Sums {
    f: f64,
    pi: f64,
    h: f64,
    charge: i32,
    donor_key: u32,
    h_defaulted: bool,
    worst_f: FieldBasis,
    kinds: u8,
}

impl Sums {
    const ZERO: Sums = Sums {
        f: 0.0,
        pi: 0.0,
        h: 0.0,
        charge: 0,
        donor_key: 0,
        h_defaulted: false,
        worst_f: FieldBasis::Printed,
        kinds: 0,
    };

    #[inline]
    fn add_run(&self, l: &PoolLigand, count: usize) -> Sums {
        Sums {
            f: self.f + l.f_terms[count],
            pi: self.pi + l.pi_terms[count],
            h: self.h + l.h_terms[count],
            charge: self.charge + count as i32 * l.ligand.charge,
            donor_key: self.donor_key + count as u32 * l.donor_key,
            h_defaulted: self.h_defaulted || l.h_defaulted,
            worst_f: self.worst_f.max(l.ligand.f_from),
            kinds: self.kinds + 1,
        }
    }
}

/// One ranked entry: enough to rebuild the full [`Candidate`] with [`Screen::candidate`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Hit {
    /// Score for the target (larger is better; see the module docs).
    pub score: f64,
    /// Index into [`Screen::ions`].
    pub ion: u16,
    pub sphere: Sphere,
    /// Index into the sorted candidate rows of a file (0 for pools).
    pub row: u32,
}

impl Eq for Hit {}

impl Ord for Hit {
    /// Better hits sort first: higher score, then ion, sphere and row in order.
    fn cmp(&self, other: &Self) -> Ordering {
        other
            .score
            .total_cmp(&self.score)
            .then(self.ion.cmp(&other.ion))
            .then(self.sphere.cmp(&other.sphere))
            .then(self.row.cmp(&other.row))
    }
}

impl PartialOrd for Hit {
    fn partial_cmp(&self, other: &Self) -> Option<Ordering> {
        Some(self.cmp(other))
    }
}

/// Keeps either every hit or the best N in a heap whose top is the worst kept.
struct Ranking {
    keep: Keep,
    heap: BinaryHeap<Hit>,
    all: Vec<Hit>,
}

impl Ranking {
    fn new(keep: Keep) -> Ranking {
        let cap = match keep {
            Keep::Top(n) => n.min(1 << 16) + 1,
            Keep::All => 0,
        };
        Ranking {
            keep,
            heap: BinaryHeap::with_capacity(cap),
            all: Vec::new(),
        }
    }

    #[inline]
    fn offer(&mut self, hit: Hit) {
        match self.keep {
            Keep::All => self.all.push(hit),
            Keep::Top(n) => {
                if self.heap.len() < n {
                    self.heap.push(hit);
                } else if let Some(mut worst) = self.heap.peek_mut() {
                    if hit < *worst {
                        *worst = hit;
                    }
                }
            }
        }
    }

    /// The score a new hit must reach to be kept, once the ranking is full (None before, and
    /// always None when every hit is kept).
    #[inline]
    fn bar(&self) -> Option<f64> {
        match self.keep {
            Keep::Top(n) if self.heap.len() >= n => self.heap.peek().map(|w| w.score),
            _ => None,
        }
    }

    fn finish(self) -> Vec<Hit> {
        match self.keep {
            Keep::All => {
                let mut all = self.all;
                all.sort_unstable();
                all
            }
            Keep::Top(_) => self.heap.into_sorted_vec(),
        }
    }
}

/// A candidate row of a file that could not be used.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct RejectedCandidate {
    /// Data row number (1 = first row after the header).
    pub row: usize,
    /// Line number in the file.
    pub line: usize,
    pub column: String,
    pub message: String,
}

impl fmt::Display for RejectedCandidate {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(
            f,
            "row {} (line {}), column {}: {}",
            self.row, self.line, self.column, self.message
        )
    }
}

/// Where the candidates of a screen come from.
#[derive(Debug, Clone)]
enum Source {
    /// Every multiset of the pool that fills the geometry.
    Pool,
    /// Rows of a candidates file, sorted by (sphere, name).
    Rows(Vec<(Sphere, Option<String>)>),
}

/// Compiled filters (pool indices and keys).
#[derive(Debug, Clone, Default)]
struct Compiled {
    require: Vec<u8>,
    forbid: Vec<u8>,
    max_abs_charge: Option<i32>,
    donor_key: Option<u32>,
    size: Option<SizeRange>,
    kinds: Option<SizeRange>,
}

/// A prepared screen: ions with their crossovers, the pool and the filters.
#[derive(Debug, Clone)]
pub struct Screen {
    pub geometry: Geometry,
    pub target: Target,
    pub ions: Vec<ScreenIon>,
    /// Pool ligands in table order.
    pub pool: Vec<PoolLigand>,
    pub filters: Filters,
    /// Model constants (those `resolve` uses).
    pub calibration: Calibration,
    source: Source,
    compiled: Compiled,
    notes: Vec<String>,
}

/// Counts of a finished screen and its ranked hits (best first).
#[derive(Debug, Clone)]
pub struct Outcome {
    pub hits: Vec<Hit>,
    /// Candidate spheres generated (pool) or read (file), before filters.
    pub candidates: u64,
    /// (sphere, ion) pairs that passed the filters and whose Δ/B was computed.
    pub evaluated: u64,
    /// Pairs whose estimate failed (β = 1 − h̄k ≤ 0); not ranked.
    pub skipped: u64,
}

/// Everything a screen says about one candidate.
#[derive(Debug, Clone, PartialEq)]
pub struct Candidate {
    /// Index into [`Screen::ions`].
    pub ion: usize,
    pub sphere: Sphere,
    /// (pool index, count) in pool order.
    pub ligands: Vec<(usize, usize)>,
    /// Label from the candidates file, if any.
    pub name: Option<String>,
    /// Overall charge.
    pub charge: i32,
    /// Δ of the predicted ground state in the geometry's convention (cm⁻¹).
    pub delta: f64,
    /// Δ of the high-spin state at its own bond length (cm⁻¹).
    pub delta_high_spin: f64,
    /// Δ of the low-spin state at its own bond length (cm⁻¹).
    pub delta_low_spin: f64,
    /// Racah B (cm⁻¹).
    pub b: f64,
    /// Racah C (cm⁻¹).
    pub c: f64,
    pub c_over_b: f64,
    /// Δ/B of the predicted ground state.
    pub delta_over_b: f64,
    /// Mean field Δ̄/B of the two spin states.
    pub mean_delta_over_b: f64,
    pub crossover_delta_over_b: f64,
    /// Δ̄/B − crossover Δ/B (negative on the high-spin side).
    pub margin: f64,
    /// Margin in percent of the crossover Δ/B.
    pub percent: f64,
    /// E_HS − E_LS (cm⁻¹), each state at its own geometry.
    pub energy_gap: f64,
    /// Assumed relative uncertainty of Δ/B (0.1 = 10 %), as in `predict`.
    pub uncertainty: f64,
    /// |margin| ≤ uncertainty · Δ/B, as in `predict`.
    pub borderline: bool,
    /// High, Crossover or Low (never Fixed: ions without a crossover are not screened).
    pub spin_state: SpinState,
    pub score: f64,
}

/// Relative slack of the fast test: a candidate is only rejected when its score is below the
/// ranking's bar by more than this (round-off of the two orders of arithmetic is ~1e-15), so the
/// exact path decides every close call and the ranking is identical to the exact screen's.
const FAST_SLACK: f64 = 1e-9;

/// One ion's constants for the multiply-only reject test. With the sums N = Σf + c·Σπ (c the
/// back-bonding weight of the ion) and b = B₀·β, β = max(1 − k·Σh/n, β_floor), the mean field
/// is Δ̄/B = K·N / b (K = ½(h + l)·g·(geometry factor)/n, as in [`estimate::reference_delta`]
/// and [`Screen::score`]); the crossover aim of [`estimate::crossover_target`] is α/b + γ. Every
/// test below is that algebra multiplied through by b > 0.
#[derive(Debug, Clone, Copy)]
struct FastBound {
    k_mean: f64,
    pi_weight: f64,
    /// k/n (0 when the ion has no k: β = 1).
    k_per_donor: f64,
    b0: f64,
    xc: f64,
    /// α and γ of the crossover aim (None: the aim is Δ/B at the crossover itself).
    aim: Option<(f64, f64)>,
}

impl FastBound {
    fn new(screen: &Screen, ion: &ScreenIon) -> Option<FastBound> {
        let donors = screen.geometry.coordination_number() as f64;
        let cal = &screen.calibration;
        let sg = &ion.spin_geometry;
        let g_geom = estimate::reference_delta(
            1.0,
            0.0,
            ion.g,
            ion.ion.oxidation_state,
            screen.geometry,
            cal,
        );
        let pi_weight = estimate::reference_delta(
            0.0,
            1.0,
            ion.g,
            ion.ion.oxidation_state,
            screen.geometry,
            cal,
        ) / g_geom;
        let k_mean = 0.5 * (sg.high_spin_factor + sg.low_spin_factor) * g_geom / donors;
        let xc = ion.crossover_delta_over_b;
        // crossover_target(b) = (W/2 + s·b·X)/(b·q), q = s + j(u_L − u_H): evaluated at two b
        // values it gives α and γ exactly (it is α/b + γ).
        let aim = match (
            estimate::crossover_target(&ion.crossover, sg, 1.0, cal),
            estimate::crossover_target(&ion.crossover, sg, 2.0, cal),
        ) {
            (Some(a1), Some(a2)) => {
                let alpha = 2.0 * (a1 - a2);
                let gamma = a1 - alpha;
                Some((alpha, gamma))
            }
            _ => None,
        };
        let fb = FastBound {
            k_mean,
            pi_weight,
            k_per_donor: ion.k.map_or(0.0, |k| k / donors),
            b0: ion.b0,
            xc,
            aim,
        };
        let finite = [fb.k_mean, fb.pi_weight, fb.k_per_donor, fb.b0, fb.xc]
            .iter()
            .chain(fb.aim.iter().flat_map(|(a, g)| [a, g]))
            .all(|x| x.is_finite());
        (finite && fb.b0 > 0.0 && xc > 0.0).then_some(fb)
    }

    /// True when the candidate's score is surely below `bar` (NaN never rejects).
    #[inline]
    fn rejects(&self, target: Target, s: &Sums, bar: f64) -> bool {
        let beta = if self.k_per_donor == 0.0 {
            1.0
        } else {
            (1.0 - self.k_per_donor * s.h).max(estimate::BETA_FLOOR)
        };
        let b = self.b0 * beta;
        let kn = self.k_mean * (s.f + self.pi_weight * s.pi);
        match target {
            // Low: 100(m − X)/X ≥ bar ⟺ m ≥ X(1 + bar/100).
            Target::Low => {
                let lhs = self.xc * (1.0 + 0.01 * bar) * b;
                kn < lhs - FAST_SLACK * (lhs.abs() + kn.abs())
            }
            // High: −100(m − X)/X ≥ bar ⟺ m ≤ X(1 − bar/100).
            Target::High => {
                let rhs = self.xc * (1.0 - 0.01 * bar) * b;
                kn > rhs + FAST_SLACK * (rhs.abs() + kn.abs())
            }
            // Crossover: −100|m − aim|/X ≥ bar ⟺ |K·N − α − γb| ≤ (−bar·X/100)·b.
            Target::Crossover => {
                let (alpha, gamma) = self.aim.unwrap_or((0.0, self.xc));
                let dev = (kn - alpha - gamma * b).abs();
                let allowed = -0.01 * bar * self.xc * b;
                dev > allowed + FAST_SLACK * (kn.abs() + alpha.abs() + (gamma * b).abs())
            }
        }
    }
}

/// Δ of both spin states and B of one candidate (cm⁻¹).
#[derive(Debug, Clone, Copy, PartialEq)]
struct Parameters {
    delta_high_spin: f64,
    delta_low_spin: f64,
    b: f64,
}

/// Number of multisets of ligands with the given denticities whose sites sum to `sites`
/// (coin-change count). For n monodentates it is C(n + sites − 1, sites).
pub fn count_spheres(denticities: &[usize], sites: usize) -> u64 {
    let mut ways = vec![0u64; sites + 1];
    ways[0] = 1;
    for &d in denticities {
        if d == 0 {
            continue;
        }
        for r in d..=sites {
            ways[r] = ways[r].saturating_add(ways[r - d]);
        }
    }
    ways[sites]
}

fn prepare_ion(tables: &DataSet, spec: &IonSpec, geometry: Geometry) -> Result<ScreenIon> {
    let ions = tables.ions()?;
    let ion = ions.find(&spec.metal, spec.oxidation_state)?.clone();
    let c_over_b = match (ion.c0, ion.b0) {
        (Some(c0), Some(b0)) => c0 / b0,
        _ => crate::engine::tanabe_sugano_c_over_b(ion.dn),
    };
    let cross = crossover(ion.dn, geometry, c_over_b)?;
    let (Some(xc), Some(slope)) = (cross.delta_over_b, cross.slope) else {
        return Err(Error::invalid(
            Param::MetalIon(ion.name()),
            format!(
                "d{} in {} (one ground spin at every Δ/B)",
                ion.dn,
                geometry.name(),
            ),
            "an ion whose ground spin can change in this geometry (d4–d7 for oct); a screen ranks by distance to the crossover",
        ));
    };
    let g = ion.g.ok_or_else(|| {
        Error::invalid(
            Param::MetalIon(ion.name()),
            "no Jørgensen g in ions.csv",
            "an ion with g (`spinstate data ions` lists them), or an edited copy of ions.csv in a data directory that adds it",
        )
    })?;
    let b0 = ion.b0.ok_or_else(|| {
        Error::invalid(
            Param::MetalIon(ion.name()),
            "no free-ion B0 in ions.csv",
            "an ion with B0 (`spinstate data ions` lists them), or an edited copy of ions.csv in a data directory that adds it",
        )
    })?;
    let spin_geometry = SpinGeometry::new(&ion, geometry, &cross, &CALIBRATION);
    let k = ion
        .k
        .or_else(|| estimate::default_k(ions, ion.series).map(|(k, _)| k));
    Ok(ScreenIon {
        g,
        b0,
        k,
        c_over_b,
        crossover: cross,
        crossover_delta_over_b: xc,
        slope,
        spin_geometry,
        ion,
    })
}

/// Why a ligand cannot take part in a screen of `geometry`, if it cannot.
fn unusable(l: &Ligand, geometry: Geometry) -> Option<String> {
    if !l.binds_in(geometry) {
        let can: Vec<&str> = l.binds.iter().map(|g| g.name()).collect();
        return Some(format!(
            "{} does not bind in {} (it binds in: {})",
            l.name,
            geometry.name(),
            can.join(", ")
        ));
    }
    if l.denticity() > geometry.coordination_number() {
        return Some(format!(
            "{} has {} donor atoms, more than the {} sites of {}",
            l.name,
            l.denticity(),
            geometry.coordination_number(),
            geometry.name()
        ));
    }
    None
}

fn table_index(ligands: &LigandTable, l: &Ligand) -> usize {
    ligands
        .rows
        .iter()
        .position(|r| r.name == l.name)
        .unwrap_or(usize::MAX)
}

/// The h that `resolve` uses for a ligand: its own, or the mean of ligands with the same first
/// donor atom, or of all ligands.
fn h_used(ligands: &LigandTable, l: &Ligand) -> (Option<f64>, bool) {
    match l.h {
        Some(h) => (Some(h), false),
        None => {
            let donor = l.donors.first().map(String::as_str).unwrap_or("");
            match ligands.mean_h_for_donor(donor).or_else(|| ligands.mean_h()) {
                Some((h, _)) => (Some(h), true),
                None => (None, false),
            }
        }
    }
}

fn donor_slots(filter: Option<&DonorSet>) -> Vec<String> {
    filter
        .map(|d| d.counts.iter().map(|(e, _)| e.clone()).collect())
        .unwrap_or_default()
}

/// 4-bit field per filter element, the field after them counts all other donor atoms.
fn donor_key(atoms: &[String], slots: &[String]) -> u32 {
    atoms
        .iter()
        .map(|a| {
            let p = slots.iter().position(|s| s == a).unwrap_or(slots.len());
            1u32 << (4 * p)
        })
        .sum()
}

fn pool_ligand(
    ligands: &LigandTable,
    l: &Ligand,
    ion_needs_h: bool,
    slots: &[String],
) -> Result<PoolLigand> {
    let (h, h_defaulted) = h_used(ligands, l);
    if h.is_none() && ion_needs_h {
        return Err(Error::invalid(
            Param::NamedLigand(l.name.clone()),
            "no h and no ligand in the table with one to default from",
            "a ligands.csv with Jørgensen h for at least one ligand",
        ));
    }
    let d = l.denticity();
    let (f, pi) = estimate::ligand_terms(l);
    let mut f_terms = [0.0; MAX_SITES + 1];
    let mut pi_terms = [0.0; MAX_SITES + 1];
    let mut h_terms = [0.0; MAX_SITES + 1];
    for c in 0..=MAX_SITES {
        // Exactly the product `per_donor` in complex.rs forms: (count·denticity) as f64 × value.
        f_terms[c] = (c * d) as f64 * f;
        pi_terms[c] = (c * d) as f64 * pi;
        h_terms[c] = (c * d) as f64 * h.unwrap_or(0.0);
    }
    Ok(PoolLigand {
        ligand: l.clone(),
        table_index: table_index(ligands, l),
        denticity: d,
        f,
        h,
        h_defaulted,
        pi,
        f_terms,
        pi_terms,
        h_terms,
        donor_key: donor_key(&l.donors, slots),
    })
}

impl Screen {
    fn prepare_ions(
        tables: &DataSet,
        ions: &[IonSpec],
        geometry: Geometry,
    ) -> Result<Vec<ScreenIon>> {
        if ions.is_empty() {
            return Err(Error::invalid(
                Param::Metal,
                "none",
                "at least one metal ion, e.g. Fe with oxidation state 2",
            ));
        }
        if !geometry.estimable() {
            return Err(Error::invalid(
                Param::Geometry,
                "tetragonal",
                "oct, tet or sqpl",
            ));
        }
        let mut out: Vec<ScreenIon> = Vec::new();
        for spec in ions {
            let ion = prepare_ion(tables, spec, geometry)?;
            if !out.iter().any(|o| o.ion.name() == ion.ion.name()) {
                out.push(ion);
            }
        }
        if out.len() > u16::MAX as usize {
            return Err(Error::invalid(
                Param::MetalList,
                out.len(),
                "at most 65535 ions",
            ));
        }
        Ok(out)
    }

    fn check_filters(filters: &Filters, geometry: Geometry) -> Result<()> {
        if let Some(d) = &filters.donors {
            if d.total() != geometry.coordination_number() {
                return Err(Error::invalid(
                    Param::DonorSet,
                    format!("{d} ({} donor atoms)", d.total()),
                    format!(
                        "exactly {} donor atoms for {}, e.g. N{}",
                        geometry.coordination_number(),
                        geometry.name(),
                        geometry.coordination_number()
                    ),
                ));
            }
        }
        if let Some(q) = filters.max_abs_charge {
            if q < 0 {
                return Err(Error::invalid(
                    Param::MaxCharge,
                    q,
                    "a whole number ≥ 0 (a bound on |charge|)",
                ));
            }
        }
        Ok(())
    }

    fn resolve_names<'t>(tables: &'t DataSet, names: &[String]) -> Result<Vec<&'t Ligand>> {
        let ligands = tables.ligands()?;
        names.iter().map(|n| ligands.find(n)).collect()
    }

    fn compile(&mut self, tables: &DataSet) -> Result<()> {
        let index_of = |l: &Ligand| self.pool.iter().position(|p| p.ligand.name == l.name);
        let mut require = Vec::new();
        for l in Self::resolve_names(tables, &self.filters.require)? {
            match index_of(l) {
                Some(i) => require.push(i as u8),
                None => {
                    if matches!(self.source, Source::Pool) {
                        return Err(Error::invalid(
                            Param::RequiredLigand,
                            &l.name,
                            "a ligand of the pool (and not forbidden)",
                        ));
                    }
                    // No candidate row contains it: nothing passes.
                    require.push(u8::MAX);
                }
            }
        }
        let mut forbid = Vec::new();
        for l in Self::resolve_names(tables, &self.filters.forbid)? {
            if self.filters.require.iter().any(|r| l.is_called(r)) {
                return Err(Error::invalid(
                    Param::LigandFilter,
                    format!("{} both required and forbidden", l.name),
                    "each ligand in at most one of the two lists",
                ));
            }
            if let Some(i) = index_of(l) {
                forbid.push(i as u8);
            }
        }
        let donor_key = self.filters.donors.as_ref().map(|d| {
            d.counts
                .iter()
                .enumerate()
                .map(|(p, (_, n))| (*n as u32) << (4 * p))
                .sum()
        });
        self.compiled = Compiled {
            require,
            forbid,
            max_abs_charge: self.filters.max_abs_charge,
            donor_key,
            size: self.filters.size,
            kinds: self.filters.kinds,
        };
        Ok(())
    }

    fn base_notes(&mut self) {
        let defaulted: Vec<&str> = self
            .pool
            .iter()
            .filter(|p| p.h_defaulted)
            .map(|p| p.ligand.name.as_str())
            .collect();
        if !defaulted.is_empty() {
            self.notes.push(format!(
                "no published h for {}: the mean h of ligands with the same donor atom is used, as in predict",
                defaulted.join(", ")
            ));
        }
        let acceptors: Vec<&str> = self
            .pool
            .iter()
            .filter(|p| p.pi > 0.0)
            .map(|p| p.ligand.name.as_str())
            .collect();
        if !acceptors.is_empty() && self.ions.iter().any(|i| i.ion.oxidation_state <= 2) {
            self.notes.push(format!(
                "back-bonding of the π acceptors ({}) on ions below +3 is added to f̄, as in predict",
                acceptors.join(", ")
            ));
        }
        self.notes.push(format!(
            "each spin state at its own bond length (Δ ∝ r^-{}), as in predict: spheres are ranked by the mean field Δ̄/B of the two states; the crossover target aims at E_HS − E_LS = {:.0} cm⁻¹, the middle of the thermal window",
            self.calibration.distance_exponent,
            0.5 * self.calibration.crossover_window
        ));
    }

    /// A screen of every multiset of `pool` ligands that fills `geometry`.
    ///
    /// The pool is a list of ligand names or aliases (`all` stands for every ligand in the
    /// table with an f that binds in the geometry). Forbidden ligands are removed from the pool.
    /// Errors: an unknown ion or ligand (with the closest names), a ligand without f or that
    /// cannot bind in the geometry, an ion without crossover, g or B₀, a pool that cannot fill
    /// the geometry, or more than [`MAX_CANDIDATES`] spheres.
    pub fn from_pool(
        tables: &DataSet,
        ions: &[IonSpec],
        geometry: Geometry,
        pool: &[String],
        filters: &Filters,
        target: Target,
    ) -> Result<Screen> {
        let ligands = tables.ligands()?;
        let screen_ions = Self::prepare_ions(tables, ions, geometry)?;
        Self::check_filters(filters, geometry)?;
        let forbidden = Self::resolve_names(tables, &filters.forbid)?;
        let mut chosen: Vec<&Ligand> = Vec::new();
        let mut problems: Vec<String> = Vec::new();
        for name in pool {
            if name.trim().eq_ignore_ascii_case("all") {
                for l in &ligands.rows {
                    if unusable(l, geometry).is_none() && !chosen.iter().any(|c| c.name == l.name) {
                        chosen.push(l);
                    }
                }
                continue;
            }
            let l = ligands.find(name)?;
            if let Some(why) = unusable(l, geometry) {
                problems.push(why);
            } else if !chosen.iter().any(|c| c.name == l.name) {
                chosen.push(l);
            }
        }
        if !problems.is_empty() {
            return Err(Error::invalid(
                Param::Pool,
                problems.join("; "),
                "ligands with a Jørgensen f that bind in the geometry (`spinstate data ligands` lists them)",
            ));
        }
        chosen.retain(|l| !forbidden.iter().any(|f| f.name == l.name));
        if chosen.is_empty() {
            return Err(Error::invalid(
                Param::Pool,
                "empty (after removing forbidden ligands)",
                "at least one ligand name, e.g. H2O,NH3,py,NCS",
            ));
        }
        if chosen.len() > MAX_POOL {
            return Err(Error::invalid(
                Param::Pool,
                format!("{} ligands", chosen.len()),
                format!("at most {MAX_POOL} ligands"),
            ));
        }
        chosen.sort_by_key(|l| table_index(ligands, l));
        let slots = donor_slots(filters.donors.as_ref());
        let needs_h = screen_ions.iter().any(|i| i.k.is_some());
        let prepared = chosen
            .iter()
            .map(|l| pool_ligand(ligands, l, needs_h, &slots))
            .collect::<Result<Vec<_>>>()?;
        let mut screen = Screen {
            calibration: CALIBRATION,
            geometry,
            target,
            ions: screen_ions,
            pool: prepared,
            filters: filters.clone(),
            source: Source::Pool,
            compiled: Compiled::default(),
            notes: Vec::new(),
        };
        let count = screen.candidate_count();
        if count == 0 {
            let parts: Vec<String> = screen
                .pool
                .iter()
                .map(|p| format!("{} ({} sites)", p.ligand.name, p.denticity))
                .collect();
            return Err(Error::invalid(
                Param::Pool,
                format!(
                    "{} cannot fill the {} donor sites of {}",
                    parts.join(", "),
                    geometry.coordination_number(),
                    geometry.name()
                ),
                "a pool whose denticities add up to the coordination number, e.g. with a monodentate ligand",
            ));
        }
        if count > MAX_CANDIDATES {
            return Err(Error::invalid(
                Param::Pool,
                format!("{} ligands give {count} spheres", screen.pool.len()),
                format!("at most {MAX_CANDIDATES} spheres: use a smaller pool"),
            ));
        }
        screen.compile(tables)?;
        screen.base_notes();
        Ok(screen)
    }

    /// A screen of the candidates in a CSV text (columns in [`CANDIDATE_COLUMNS`]). Rows that
    /// cannot be used are returned as [`RejectedCandidate`]s; the others are screened. Errors (the whole
    /// file): no `ligands` column, no row at all, malformed CSV, or a bad ion or filter.
    pub fn from_candidates(
        tables: &DataSet,
        ions: &[IonSpec],
        geometry: Geometry,
        csv_text: &str,
        filters: &Filters,
        target: Target,
    ) -> Result<(Screen, Vec<RejectedCandidate>)> {
        let ligands = tables.ligands()?;
        let screen_ions = Self::prepare_ions(tables, ions, geometry)?;
        Self::check_filters(filters, geometry)?;
        if let Some(line) = crate::csv_input::unclosed_quote(csv_text, Some(b'#')) {
            return Err(Error::Parse(format!(
                "candidates file: {}",
                crate::csv_input::unclosed_message(line)
            )));
        }
        let mut reader = csv::ReaderBuilder::new()
            .has_headers(true)
            .flexible(true)
            .trim(csv::Trim::All)
            .comment(Some(b'#'))
            .from_reader(csv_text.as_bytes());
        let header = reader
            .headers()
            .map_err(|e| Error::Parse(format!("candidates file: {e}")))?
            .clone();
        let col = |name: &str| header.iter().position(|h| h.eq_ignore_ascii_case(name));
        let Some(lig_col) = col("ligands") else {
            return Err(Error::invalid(
                Param::CandidatesHeader,
                format!("'{}'", header.iter().collect::<Vec<_>>().join(",")),
                "a header row with a 'ligands' column (NAME[:COUNT] items separated by spaces or ';') and optionally 'name'",
            ));
        };
        let name_col = col("name");
        let mut errors: Vec<RejectedCandidate> = Vec::new();
        let mut rows: Vec<(Runs, Option<String>)> = Vec::new();
        let cn = geometry.coordination_number();
        let lines = crate::csv_input::LineIndex::new(csv_text, Some(b'#'));
        for (i, rec) in reader.records().enumerate() {
            let row = i + 1;
            let rec = match rec {
                Ok(r) => r,
                Err(e) => {
                    let line = e.position().map_or(0, |p| lines.line_of(p.byte()));
                    errors.push(RejectedCandidate {
                        row,
                        line,
                        column: "(row)".into(),
                        message: format!("not readable as CSV: {e}"),
                    });
                    continue;
                }
            };
            let line = rec.position().map_or(0, |p| lines.line_of(p.byte()));
            let err = |message: String| RejectedCandidate {
                row,
                line,
                column: "ligands".into(),
                // Messages quote cells, which a quoted field can fill with line breaks.
                message: crate::error::one_line(&message).into_owned(),
            };
            let text = rec.get(lig_col).unwrap_or("");
            if text.is_empty() {
                errors.push(err(
                    "is empty; give NAME[:COUNT] items such as 'NCS:2 py:4'".into(),
                ));
                continue;
            }
            let mut parsed: Vec<(usize, usize)> = Vec::new();
            let mut bad: Option<String> = None;
            for item in text
                .split(|c: char| c.is_whitespace() || c == ';')
                .filter(|s| !s.is_empty())
            {
                let lc = match item.parse::<crate::complex::LigandCount>() {
                    Ok(lc) => lc,
                    Err(e) => {
                        bad = Some(e.to_string());
                        break;
                    }
                };
                let l = match ligands.find(&lc.name) {
                    Ok(l) => l,
                    Err(e) => {
                        bad = Some(e.to_string());
                        break;
                    }
                };
                if let Some(why) = unusable(l, geometry) {
                    bad = Some(why);
                    break;
                }
                let ti = table_index(ligands, l);
                match parsed.iter_mut().find(|(t, _)| *t == ti) {
                    Some((_, c)) => *c = c.saturating_add(lc.count),
                    None => parsed.push((ti, lc.count)),
                }
            }
            if let Some(message) = bad {
                errors.push(err(message));
                continue;
            }
            let donors: usize = parsed.iter().fold(0, |n, (t, c)| {
                n.saturating_add(c.saturating_mul(ligands.rows[*t].denticity()))
            });
            if donors != cn {
                errors.push(err(format!(
                    "'{text}' has {donors} donor atoms; {} needs exactly {cn}",
                    geometry.name()
                )));
                continue;
            }
            parsed.sort();
            let name = name_col
                .and_then(|c| rec.get(c))
                .filter(|s| !s.is_empty())
                .map(str::to_string);
            rows.push((parsed, name));
        }
        if rows.is_empty() && errors.is_empty() {
            return Err(Error::invalid(
                Param::CandidatesFile,
                "no rows",
                "a header row and one row per candidate sphere",
            ));
        }
        // The pool is every ligand of a good row, in table order: the same for any row order.
        let mut used: Vec<usize> = rows
            .iter()
            .flat_map(|(p, _)| p.iter().map(|(t, _)| *t))
            .collect();
        used.sort_unstable();
        used.dedup();
        if used.len() > MAX_POOL {
            return Err(Error::invalid(
                Param::CandidatesFile,
                format!("{} distinct ligands", used.len()),
                format!("at most {MAX_POOL}"),
            ));
        }
        let slots = donor_slots(filters.donors.as_ref());
        let needs_h = screen_ions.iter().any(|i| i.k.is_some());
        let pool = used
            .iter()
            .map(|&t| pool_ligand(ligands, &ligands.rows[t], needs_h, &slots))
            .collect::<Result<Vec<_>>>()?;
        let mut spheres: Vec<(Sphere, Option<String>)> = rows
            .into_iter()
            .map(|(parsed, name)| {
                let mut s = Sphere::EMPTY;
                for (t, c) in parsed {
                    let p = used.binary_search(&t).unwrap_or(0);
                    for _ in 0..c {
                        s.push(p);
                    }
                }
                (s, name)
            })
            .collect();
        spheres.sort();
        let mut screen = Screen {
            calibration: CALIBRATION,
            geometry,
            target,
            ions: screen_ions,
            pool,
            filters: filters.clone(),
            source: Source::Rows(spheres),
            compiled: Compiled::default(),
            notes: Vec::new(),
        };
        screen.compile(tables)?;
        screen.base_notes();
        Ok((screen, errors))
    }

    /// Number of candidate spheres before filters.
    pub fn candidate_count(&self) -> u64 {
        match &self.source {
            Source::Pool => {
                let d: Vec<usize> = self.pool.iter().map(|p| p.denticity).collect();
                count_spheres(&d, self.geometry.coordination_number())
            }
            Source::Rows(rows) => rows.len() as u64,
        }
    }

    /// Notes on the estimate and its limits, one sentence each.
    pub fn notes(&self) -> &[String] {
        &self.notes
    }

    /// True for a screen of a pool, false for a candidates file.
    pub fn is_pool(&self) -> bool {
        matches!(self.source, Source::Pool)
    }

    /// Δ_ref, B, Δ_HS/B and Δ_LS/B of a sphere for one ion, with the functions `resolve`
    /// calls ([`estimate::reference_delta`] and the ion's [`SpinGeometry`]); None when
    /// β = 1 − h̄k ≤ 0 (the factor rule fails).
    #[inline]
    fn parameters(&self, ion: &ScreenIon, s: &Sums) -> Option<Parameters> {
        let donors = self.geometry.coordination_number() as f64;
        let delta_ref = estimate::reference_delta(
            s.f / donors,
            s.pi / donors,
            ion.g,
            ion.ion.oxidation_state,
            self.geometry,
            &self.calibration,
        );
        let beta = match ion.k {
            Some(k) => estimate::nephelauxetic_ratio(s.h / donors, k).0,
            None => 1.0,
        };
        if !beta.is_finite() {
            return None;
        }
        let b = ion.b0 * beta;
        let sg = &ion.spin_geometry;
        Some(Parameters {
            delta_high_spin: delta_ref * sg.high_spin_factor,
            delta_low_spin: delta_ref * sg.low_spin_factor,
            b,
        })
    }

    #[inline]
    fn passes(&self, sphere: &Sphere, s: &Sums) -> bool {
        let c = &self.compiled;
        c.require.iter().all(|&i| sphere.contains(i))
            && !c.forbid.iter().any(|&i| sphere.contains(i))
            && c.donor_key.is_none_or(|k| k == s.donor_key)
            && c.size.is_none_or(|r| r.contains(sphere.len as usize))
            && c.kinds.is_none_or(|r| r.contains(s.kinds as usize))
    }

    fn sums(&self, sphere: &Sphere) -> Sums {
        sphere
            .runs()
            .iter()
            .fold(Sums::ZERO, |acc, &(i, c)| acc.add_run(&self.pool[i], c))
    }

    /// Runs the screen. `progress` is called with the number of spheres done, every 65 536
    /// spheres and once at the end (the library draws nothing itself).
    pub fn run(&self, keep: Keep, progress: &mut dyn FnMut(u64)) -> Outcome {
        self.run_with(keep, false, progress)
    }

    /// As [`Screen::run`] with every candidate taken through the exact path (no fast reject):
    /// the reference the fast path is tested against.
    pub fn run_exact(&self, keep: Keep, progress: &mut dyn FnMut(u64)) -> Outcome {
        self.run_with(keep, true, progress)
    }

    fn run_with(&self, keep: Keep, exact: bool, progress: &mut dyn FnMut(u64)) -> Outcome {
        let fast = if exact {
            vec![None; self.ions.len()]
        } else {
            self.ions
                .iter()
                .map(|ion| FastBound::new(self, ion))
                .collect()
        };
        let mut state = RunState {
            fast,
            ranking: Ranking::new(match keep {
                Keep::Top(n) => Keep::Top(n.max(1)),
                k => k,
            }),
            spheres: 0,
            evaluated: 0,
            skipped: 0,
        };
        match &self.source {
            Source::Pool => {
                let fill = self.fillable();
                let max_len = self
                    .compiled
                    .size
                    .map_or(MAX_SITES, |r| r.max.min(MAX_SITES));
                let node = Node {
                    sphere: Sphere::EMPTY,
                    done: Sums::ZERO,
                    last: usize::MAX,
                    count: 0,
                    left: self.geometry.coordination_number(),
                };
                self.walk(&node, 0, &fill, max_len, &mut state, progress);
            }
            Source::Rows(rows) => {
                for (r, (sphere, _)) in rows.iter().enumerate() {
                    let sums = self.sums(sphere);
                    self.visit(sphere, &sums, r as u32, &mut state, progress);
                }
            }
        }
        progress(state.spheres);
        Outcome {
            hits: state.ranking.finish(),
            candidates: state.spheres,
            evaluated: state.evaluated,
            skipped: state.skipped,
        }
    }

    /// fill[k][r]: r sites can be filled with pool ligands k, k+1, … (repeats allowed).
    fn fillable(&self) -> Vec<[bool; MAX_SITES + 1]> {
        let m = self.pool.len();
        let mut fill = vec![[false; MAX_SITES + 1]; m + 1];
        fill[m][0] = true;
        for k in (0..m).rev() {
            let d = self.pool[k].denticity;
            for r in 0..=MAX_SITES {
                fill[k][r] = fill[k + 1][r] || (d <= r && fill[k][r - d]);
            }
        }
        fill
    }

    /// Depth-first walk over multisets as non-decreasing index sequences. `done` holds the sums
    /// of the finished runs; the current run (`last`, `count`) is added when it ends, so the
    /// terms are added in pool order exactly as `resolve` adds them.
    fn walk(
        &self,
        node: &Node,
        start: usize,
        fill: &[[bool; MAX_SITES + 1]],
        max_len: usize,
        state: &mut RunState,
        progress: &mut dyn FnMut(u64),
    ) {
        for k in start..self.pool.len() {
            let d = self.pool[k].denticity;
            if d > node.left || !fill[k][node.left - d] {
                continue;
            }
            let mut n = *node;
            n.sphere.push(k);
            if k == n.last {
                n.count += 1;
            } else {
                if n.count > 0 {
                    n.done = n.done.add_run(&self.pool[n.last], n.count);
                }
                n.last = k;
                n.count = 1;
            }
            n.left -= d;
            if n.left == 0 {
                let sums = n.done.add_run(&self.pool[k], n.count);
                self.visit(&n.sphere, &sums, 0, state, progress);
            } else if (n.sphere.len as usize) < max_len {
                self.walk(&n, k, fill, max_len, state, progress);
            }
        }
    }

    #[inline]
    fn visit(
        &self,
        sphere: &Sphere,
        sums: &Sums,
        row: u32,
        state: &mut RunState,
        progress: &mut dyn FnMut(u64),
    ) {
        state.spheres += 1;
        if state.spheres & 0xFFFF == 0 {
            progress(state.spheres);
        }
        if !self.passes(sphere, sums) {
            return;
        }
        for (i, ion) in self.ions.iter().enumerate() {
            if let Some(q) = self.compiled.max_abs_charge {
                if (ion.ion.oxidation_state + sums.charge).abs() > q {
                    continue;
                }
            }
            state.evaluated += 1;
            if let (Some(fast), Some(bar)) = (&state.fast[i], state.ranking.bar()) {
                if fast.rejects(self.target, sums, bar) {
                    continue;
                }
            }
            let Some(p) = self.parameters(ion, sums) else {
                state.skipped += 1;
                continue;
            };
            state.ranking.offer(Hit {
                score: self.score(ion, &p),
                ion: i as u16,
                sphere: *sphere,
                row,
            });
        }
    }

    /// Score of one candidate for the target (see the module docs), from the mean field Δ̄/B
    /// of the two spin states.
    #[inline]
    fn score(&self, ion: &ScreenIon, p: &Parameters) -> f64 {
        let xc = ion.crossover_delta_over_b;
        let mean = 0.5 * (p.delta_high_spin + p.delta_low_spin) / p.b;
        match self.target {
            Target::Crossover => {
                let aim = estimate::crossover_target(
                    &ion.crossover,
                    &ion.spin_geometry,
                    p.b,
                    &self.calibration,
                )
                .unwrap_or(xc);
                -100.0 * (mean - aim).abs() / xc
            }
            Target::High | Target::Low => self.target.score(100.0 * (mean - xc) / xc),
        }
    }

    /// The full evaluation of a ranked hit.
    pub fn candidate(&self, hit: &Hit) -> Candidate {
        let ion = &self.ions[hit.ion as usize];
        let sums = self.sums(&hit.sphere);
        let p = self.parameters(ion, &sums).unwrap_or(Parameters {
            delta_high_spin: f64::NAN,
            delta_low_spin: f64::NAN,
            b: f64::NAN,
        });
        let choice = estimate::choose_spin(
            p.delta_high_spin / p.b,
            p.delta_low_spin / p.b,
            p.b,
            &ion.crossover,
            &self.calibration,
        );
        let xc = ion.crossover_delta_over_b;
        let x = choice.map_or(f64::NAN, |c| c.delta_over_b_mean);
        let margin = x - xc;
        let percent = 100.0 * margin / xc;
        let reliability = Reliability {
            worst_f: sums.worst_f,
            g: ion.ion.provenance_of("g"),
            b0: ion.ion.provenance_of("b0"),
            back_bonding: sums.pi > 0.0
                && estimate::back_bonding_steps(ion.ion.oxidation_state) > 0.0,
            b_defaulted: sums.h_defaulted || ion.ion.k.is_none(),
            heavy: ion.ion.series != TransitionSeries::ThreeD,
            geometry: self.geometry,
        };
        let u = reliability.delta().hypot(reliability.b());
        let name = match &self.source {
            Source::Rows(rows) => rows.get(hit.row as usize).and_then(|(_, n)| n.clone()),
            Source::Pool => None,
        };
        let state = choice.map_or(SpinState::High, |c| c.state);
        let delta = if state.low_spin_ground() {
            p.delta_low_spin
        } else {
            p.delta_high_spin
        };
        Candidate {
            ion: hit.ion as usize,
            sphere: hit.sphere,
            ligands: hit.sphere.runs(),
            name,
            charge: ion.ion.oxidation_state + sums.charge,
            delta,
            delta_high_spin: p.delta_high_spin,
            delta_low_spin: p.delta_low_spin,
            b: p.b,
            c: ion.c_over_b * p.b,
            c_over_b: ion.c_over_b,
            delta_over_b: delta / p.b,
            mean_delta_over_b: x,
            crossover_delta_over_b: xc,
            margin,
            percent,
            energy_gap: choice.map_or(f64::NAN, |c| c.energy_gap),
            uncertainty: u,
            borderline: margin.abs() <= u * x,
            spin_state: state,
            score: self.score(ion, &p),
        }
    }

    /// A formula such as "[Fe(NCS)2(py)4]" (ligands in table order; the same convention as
    /// `ResolvedComplex::formula`).
    pub fn formula(&self, c: &Candidate) -> String {
        let ion = &self.ions[c.ion].ion;
        let mut s = format!("[{}", ion.symbol);
        for &(i, n) in &c.ligands {
            let l = &self.pool[i].ligand;
            if l.donors == [l.name.clone()] {
                s.push_str(&l.name);
            } else {
                s.push_str(&format!("({})", l.name));
            }
            if n > 1 {
                s.push_str(&n.to_string());
            }
        }
        s.push(']');
        match c.charge {
            0 => {}
            1 => s.push('+'),
            -1 => s.push('-'),
            q if q > 0 => s.push_str(&format!("{q}+")),
            q => s.push_str(&format!("{}-", -q)),
        }
        s
    }

    /// The donor-atom set of a candidate, e.g. "N4O2".
    pub fn donor_set(&self, c: &Candidate) -> DonorSet {
        DonorSet::of_atoms(c.ligands.iter().flat_map(|&(i, n)| {
            std::iter::repeat_n(&self.pool[i].ligand.donors, n)
                .flatten()
                .map(String::as_str)
        }))
    }

    /// Ligand names and counts of a candidate, in table order.
    pub fn ligand_counts(&self, c: &Candidate) -> Vec<(String, usize)> {
        c.ligands
            .iter()
            .map(|&(i, n)| (self.pool[i].ligand.name.clone(), n))
            .collect()
    }
}

#[derive(Clone, Copy)]
struct Node {
    sphere: Sphere,
    done: Sums,
    last: usize,
    count: usize,
    left: usize,
}

struct RunState {
    /// Per ion: the multiply-only reject test (None: exact path only).
    fast: Vec<Option<FastBound>>,
    ranking: Ranking,
    spheres: u64,
    evaluated: u64,
    skipped: u64,
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::complex::{ComplexSpec, LigandCount, Overrides};
    use crate::predict::predict;

    const LIGAND_HEADER: &str =
        "name,aliases,donors,denticity,charge,f,f_from,h,e_sigma,e_pi,pi,binds,caution,source";

    fn bundled() -> &'static DataSet {
        DataSet::bundled()
    }

    fn fe2() -> Vec<IonSpec> {
        vec![IonSpec {
            metal: "Fe".into(),
            oxidation_state: 2,
        }]
    }

    fn names(list: &[&str]) -> Vec<String> {
        list.iter().map(|s| s.to_string()).collect()
    }

    /// A table of `n` synthetic monodentate N-donor ligands (test-only; not real ligands).
    fn synthetic_monodentates(n: usize) -> DataSet {
        let mut csv = String::from(LIGAND_HEADER);
        csv.push('\n');
        for i in 0..n {
            csv.push_str(&format!(
                "SYN{i:02},,N,1,0,{:.3},printed,1.0,,,none,oct tet sqpl,,synthetic test ligand (not a real ligand)\n",
                0.7 + 0.03 * i as f64
            ));
        }
        DataSet::default().with_text::<LigandTable>(csv)
    }

    fn binomial(n: u64, k: u64) -> u64 {
        (0..k).fold(1u64, |acc, i| acc * (n - i) / (i + 1))
    }

    /// Seeded xorshift64*: reproducible random numbers without a dependency.
    struct Rng(u64);
    impl Rng {
        fn next(&mut self) -> u64 {
            self.0 ^= self.0 >> 12;
            self.0 ^= self.0 << 25;
            self.0 ^= self.0 >> 27;
            self.0.wrapping_mul(0x2545_F491_4F6C_DD1D)
        }
        fn below(&mut self, n: usize) -> usize {
            (self.next() % n as u64) as usize
        }
    }

    /// A random multiset of `pool` filling `sites`, as (pool index, count) in pool order.
    fn random_sphere(rng: &mut Rng, pool: &[PoolLigand], sites: usize) -> Vec<(usize, usize)> {
        loop {
            let mut left = sites;
            let mut counts = vec![0usize; pool.len()];
            let mut tries = 0;
            while left > 0 && tries < 50 {
                let i = rng.below(pool.len());
                if pool[i].denticity <= left {
                    counts[i] += 1;
                    left -= pool[i].denticity;
                }
                tries += 1;
            }
            if left == 0 {
                return counts
                    .into_iter()
                    .enumerate()
                    .filter(|(_, c)| *c > 0)
                    .collect();
            }
        }
    }

    fn hit_for(ion: usize, runs: &[(usize, usize)]) -> Hit {
        let mut s = Sphere::EMPTY;
        for &(i, c) in runs {
            for _ in 0..c {
                s.push(i);
            }
        }
        Hit {
            score: 0.0,
            ion: ion as u16,
            sphere: s,
            row: 0,
        }
    }

    /// Multisets of k items from n kinds: C(n + k − 1, k) (common practice, the "stars and
    /// bars" count); 30 monodentates filling 6 sites give C(35, 6) = 1 623 160.
    #[test]
    fn monodentate_counts_follow_the_multiset_formula() {
        for n in 1..=30u64 {
            for k in [4u64, 6] {
                assert_eq!(
                    count_spheres(&vec![1; n as usize], k as usize),
                    binomial(n + k - 1, k)
                );
            }
        }
        assert_eq!(binomial(35, 6), 1_623_160);
        let t = synthetic_monodentates(30);
        let pool: Vec<String> = t
            .ligands()
            .unwrap()
            .rows
            .iter()
            .map(|l| l.name.clone())
            .collect();
        let s = Screen::from_pool(
            &t,
            &fe2(),
            Geometry::Octahedral,
            &pool,
            &Filters::default(),
            Target::Crossover,
        )
        .unwrap();
        assert_eq!(s.candidate_count(), 1_623_160);
        let out = s.run(Keep::Top(5), &mut |_| {});
        assert_eq!(out.candidates, 1_623_160);
        assert_eq!(out.evaluated, 1_623_160);
        assert_eq!(out.hits.len(), 5);
    }

    /// Mixed denticities: with a monodentates, b bidentates and c tridentates, the spheres of an
    /// octahedron number Σ C(b+j−1, j)·C(c+t−1, t)·C(a+r−1, r) over 2j + 3t ≤ 6, r = 6 − 2j − 3t
    /// (common practice: a product of multiset counts per denticity).
    #[test]
    fn mixed_denticity_counts_and_walk_agree() {
        let pool = names(&["H2O", "NH3", "py", "NCS", "Cl", "en", "bpy", "ox", "terpy"]);
        let (a, b, c) = (5u64, 3u64, 1u64);
        let multiset = |n: u64, k: u64| if k == 0 { 1 } else { binomial(n + k - 1, k) };
        let mut expected = 0;
        for j in 0..=3u64 {
            for t in 0..=2u64 {
                if 2 * j + 3 * t <= 6 {
                    let r = 6 - 2 * j - 3 * t;
                    expected += multiset(b, j) * multiset(c, t) * multiset(a, r);
                }
            }
        }
        let s = Screen::from_pool(
            bundled(),
            &fe2(),
            Geometry::Octahedral,
            &pool,
            &Filters::default(),
            Target::Crossover,
        )
        .unwrap();
        assert_eq!(s.candidate_count(), expected);
        let out = s.run(Keep::All, &mut |_| {});
        assert_eq!(out.candidates, expected);
        assert_eq!(out.hits.len() as u64, expected);
        // Every sphere fills the octahedron, and no sphere appears twice.
        let mut seen = std::collections::HashSet::new();
        for h in &out.hits {
            let sites: usize = h
                .sphere
                .indices()
                .iter()
                .map(|&i| s.pool[i as usize].denticity)
                .sum();
            assert_eq!(sites, 6);
            assert!(seen.insert(h.sphere));
        }
    }

    /// The screen's Δ, B, C and Δ/B are those of ComplexSpec::resolve bit for bit, and its spin
    /// state, margin and borderline flag those of predict (same estimate, same rule), for
    /// random spheres of several ions and all three geometries.
    #[test]
    fn numbers_agree_with_resolve_and_predict() {
        let t = bundled();
        let ions: Vec<IonSpec> = [
            ("Fe", 2),
            ("Fe", 3),
            ("Co", 2),
            ("Co", 3),
            ("Mn", 2),
            ("Mn", 3),
            ("Cr", 2),
        ]
        .iter()
        .map(|(m, o)| IonSpec {
            metal: m.to_string(),
            oxidation_state: *o,
        })
        .collect();
        let mut rng = Rng(0x5EED_2024_0007);
        for geometry in [
            Geometry::Octahedral,
            Geometry::Tetrahedral,
            Geometry::SquarePlanar,
        ] {
            let usable: Vec<IonSpec> = ions
                .iter()
                .filter(|i| prepare_ion(t, i, geometry).is_ok())
                .cloned()
                .collect();
            if usable.is_empty() {
                continue;
            }
            let s = Screen::from_pool(
                t,
                &usable,
                geometry,
                &names(&["all"]),
                &Filters::default(),
                Target::Crossover,
            )
            .unwrap();
            let sites = geometry.coordination_number();
            let mut compared = 0;
            for n in 0..1500 {
                let runs = random_sphere(&mut rng, &s.pool, sites);
                let ion_i = rng.below(s.ions.len());
                let c = s.candidate(&hit_for(ion_i, &runs));
                let ion = &s.ions[ion_i].ion;
                let spec = ComplexSpec {
                    metal: ion.symbol.clone(),
                    oxidation_state: ion.oxidation_state,
                    geometry,
                    ligands: runs
                        .iter()
                        .map(|&(i, k)| LigandCount {
                            name: s.pool[i].ligand.name.clone(),
                            count: k,
                        })
                        .collect(),
                    overrides: Overrides::default(),
                };
                let r = match spec.resolve(t) {
                    Ok(r) => r,
                    Err(e) => {
                        assert!(
                            c.delta_over_b.is_nan(),
                            "resolve failed ({e}) but screen did not"
                        );
                        continue;
                    }
                };
                assert_eq!(c.delta, r.delta.value, "{spec:?}");
                assert_eq!(c.delta_high_spin, r.delta_high_spin.value, "{spec:?}");
                assert_eq!(c.delta_low_spin, r.delta_low_spin.value, "{spec:?}");
                assert_eq!(c.b, r.b.value, "{spec:?}");
                assert_eq!(c.c, r.c.value, "{spec:?}");
                let choice = r.spin_choice.unwrap();
                assert_eq!(c.mean_delta_over_b, choice.delta_over_b_mean, "{spec:?}");
                assert_eq!(c.delta_over_b, r.delta_over_b(), "{spec:?}");
                assert_eq!(c.energy_gap, choice.energy_gap, "{spec:?}");
                assert_eq!(c.spin_state, choice.state, "{spec:?}");
                assert_eq!(c.uncertainty, r.delta_over_b_uncertainty(), "{spec:?}");
                assert_eq!(c.charge, r.charge);
                assert_eq!(s.formula(&c), r.formula());
                compared += 1;
                // predict diagonalises per complex: check a subset.
                if n % 25 == 0 {
                    let p = predict(&r).unwrap();
                    let m = p.margin.unwrap();
                    approx::assert_abs_diff_eq!(c.margin, m.delta_over_b, epsilon = 1e-9);
                    approx::assert_abs_diff_eq!(c.percent, m.percent, epsilon = 1e-7);
                    if (c.margin.abs() - c.uncertainty * c.mean_delta_over_b).abs() > 1e-9 {
                        assert_eq!(c.borderline, m.borderline, "{spec:?}");
                    }
                    assert_eq!(c.spin_state, p.spin_state, "{spec:?}");
                }
            }
            assert!(compared > 1400, "{geometry:?}: {compared}");
        }
    }

    /// Tsuchida's spectrochemical series (as given in F. A. Cotton, G. Wilkinson, Advanced
    /// Inorganic Chemistry, and J. E. Huheey, Inorganic Chemistry; from memory), restricted to
    /// ligands of the table: Br⁻ < SCN⁻ < Cl⁻ < N₃⁻ < F⁻ < H₂O < NCS⁻ < CH₃CN < py < NH₃ < NO₂⁻ <
    /// CN⁻, and for chelates C₂O₄²⁻ < en < bipy. Swapping one ligand for the next in the series
    /// never lowers Δ, whatever the rest of the sphere.
    #[test]
    fn swapping_up_the_series_never_lowers_delta() {
        let mono = [
            "Br", "SCN", "Cl", "N3", "F", "H2O", "NCS", "MeCN", "py", "NH3", "NO2", "CN",
        ];
        let chel = ["ox", "en", "bpy"];
        let pool: Vec<String> = mono
            .iter()
            .chain(chel.iter())
            .map(|s| s.to_string())
            .collect();
        let t = bundled();
        for geometry in [Geometry::Octahedral, Geometry::Tetrahedral] {
            let s = Screen::from_pool(
                t,
                &fe2(),
                geometry,
                &pool,
                &Filters::default(),
                Target::Crossover,
            )
            .unwrap();
            let idx = |n: &str| s.pool.iter().position(|p| p.ligand.name == n).unwrap();
            let mut rng = Rng(0xA11CE);
            for _ in 0..400 {
                let runs = random_sphere(&mut rng, &s.pool, geometry.coordination_number());
                let base = s.candidate(&hit_for(0, &runs));
                for series in [&mono[..], &chel[..]] {
                    for w in series.windows(2) {
                        let (lo, hi) = (idx(w[0]), idx(w[1]));
                        let Some(pos) = runs.iter().position(|&(i, _)| i == lo) else {
                            continue;
                        };
                        let mut swapped = runs.clone();
                        swapped[pos].1 -= 1;
                        match swapped.iter_mut().find(|(i, _)| *i == hi) {
                            Some((_, c)) => *c += 1,
                            None => swapped.push((hi, 1)),
                        }
                        swapped.retain(|(_, c)| *c > 0);
                        swapped.sort();
                        let up = s.candidate(&hit_for(0, &swapped));
                        assert!(
                            up.delta_high_spin >= base.delta_high_spin,
                            "{} → {}: {} < {}",
                            w[0],
                            w[1],
                            up.delta_high_spin,
                            base.delta_high_spin
                        );
                    }
                }
            }
        }
    }

    /// Homoleptic Fe(II) spheres follow the spectrochemical series in Δ (Tsuchida; Cotton &
    /// Wilkinson, Huheey, from memory): Br⁻ < Cl⁻ < F⁻ < H₂O < NCS⁻ < py < NH₃ < CN⁻. The
    /// ranking is by Δ/B, which B also moves (py and NCS⁻ have no published h and take the
    /// N-donor mean); for the ligands with a published h (Jørgensen's f and h) target "low"
    /// ranks them from CN⁻ down and target "high" from Br⁻ up. [Fe(H2O)6]2+ is high-spin and
    /// [Fe(CN)6]4− low-spin (common practice).
    #[test]
    fn homoleptic_spheres_follow_the_series() {
        let homoleptic = Filters {
            kinds: Some(SizeRange { min: 1, max: 1 }),
            ..Filters::default()
        };
        let first = |s: &Screen, h: &Hit| s.ligand_counts(&s.candidate(h))[0].0.clone();
        let series = ["Br", "Cl", "F", "H2O", "NCS", "py", "NH3", "CN"];
        let s = Screen::from_pool(
            bundled(),
            &fe2(),
            Geometry::Octahedral,
            &names(&series),
            &homoleptic,
            Target::Low,
        )
        .unwrap();
        let mut by_delta: Vec<(f64, String)> = s
            .run(Keep::All, &mut |_| {})
            .hits
            .iter()
            .map(|h| (s.candidate(h).delta, first(&s, h)))
            .collect();
        by_delta.sort_by(|a, b| a.0.total_cmp(&b.0));
        let got: Vec<&str> = by_delta.iter().map(|(_, n)| n.as_str()).collect();
        assert_eq!(got, series);

        let with_h = ["Br", "Cl", "F", "H2O", "NH3", "CN"];
        for (target, expected) in [
            (Target::High, with_h.to_vec()),
            (Target::Low, with_h.iter().rev().copied().collect()),
        ] {
            let s = Screen::from_pool(
                bundled(),
                &fe2(),
                Geometry::Octahedral,
                &names(&with_h),
                &homoleptic,
                target,
            )
            .unwrap();
            let out = s.run(Keep::All, &mut |_| {});
            let got: Vec<String> = out.hits.iter().map(|h| first(&s, h)).collect();
            assert_eq!(got, expected);
            let state = |n: &str| {
                let h = out.hits.iter().find(|h| first(&s, h) == n).unwrap();
                s.candidate(h).spin_state
            };
            assert_eq!(state("H2O"), SpinState::High);
            assert_eq!(state("CN"), SpinState::Low);
        }
    }

    /// The bounded heap keeps exactly the first N of the full ranking.
    #[test]
    fn top_n_is_the_head_of_the_full_ranking() {
        let pool = names(&[
            "H2O", "NH3", "py", "NCS", "Cl", "F", "CN", "en", "bpy", "ox",
        ]);
        for target in [Target::Crossover, Target::High, Target::Low] {
            let s = Screen::from_pool(
                bundled(),
                &fe2(),
                Geometry::Octahedral,
                &pool,
                &Filters::default(),
                target,
            )
            .unwrap();
            let all = s.run(Keep::All, &mut |_| {}).hits;
            for n in [1, 7, 50] {
                let top = s.run(Keep::Top(n), &mut |_| {}).hits;
                assert_eq!(top, all[..n].to_vec());
            }
            for w in all.windows(2) {
                assert!(w[0].score >= w[1].score);
            }
        }
    }

    #[test]
    fn filters_restrict_the_candidates() {
        let pool = names(&["H2O", "NH3", "py", "NCS", "Cl", "CN", "en", "bpy", "ox"]);
        let t = bundled();
        let run = |f: Filters| {
            let s = Screen::from_pool(
                t,
                &fe2(),
                Geometry::Octahedral,
                &pool,
                &f,
                Target::Crossover,
            )
            .unwrap();
            let hits = s.run(Keep::All, &mut |_| {}).hits;
            let cands: Vec<Candidate> = hits.iter().map(|h| s.candidate(h)).collect();
            (s, cands)
        };
        let (s, c) = run(Filters {
            donors: Some("N6".parse().unwrap()),
            ..Filters::default()
        });
        assert!(!c.is_empty());
        for x in &c {
            assert_eq!(s.donor_set(x).to_string(), "N6");
        }
        let (s, c) = run(Filters {
            donors: Some("O2N4".parse().unwrap()),
            ..Filters::default()
        });
        assert!(c.iter().all(|x| s.donor_set(x).to_string() == "N4O2") && !c.is_empty());
        let (_, c) = run(Filters {
            max_abs_charge: Some(0),
            ..Filters::default()
        });
        assert!(c.iter().all(|x| x.charge == 0) && !c.is_empty());
        let (s, c) = run(Filters {
            require: names(&["NCS"]),
            forbid: names(&["CN", "Cl"]),
            size: Some("3..4".parse().unwrap()),
            ..Filters::default()
        });
        assert!(!c.is_empty());
        for x in &c {
            let l = s.ligand_counts(x);
            assert!(l.iter().any(|(n, _)| n == "NCS"));
            assert!(!l.iter().any(|(n, _)| n == "CN" || n == "Cl"));
            let bound: usize = l.iter().map(|(_, k)| k).sum();
            assert!((3..=4).contains(&bound));
        }
        let (s, c) = run(Filters {
            kinds: Some("2".parse().unwrap()),
            ..Filters::default()
        });
        assert!(c.iter().all(|x| s.ligand_counts(x).len() == 2) && !c.is_empty());
    }

    #[test]
    fn bad_pools_and_ions_are_explained() {
        let t = bundled();
        let err = |ions: &[IonSpec], g: Geometry, pool: &[&str], f: Filters| {
            Screen::from_pool(t, ions, g, &names(pool), &f, Target::Crossover)
                .unwrap_err()
                .to_string()
        };
        let e = err(
            &fe2(),
            Geometry::Octahedral,
            &["H2O", "pyy"],
            Filters::default(),
        );
        assert!(
            e.contains("pyy") && e.contains("did you mean") && e.contains("py"),
            "{e}"
        );
        let e = err(
            &fe2(),
            Geometry::SquarePlanar,
            &["terpy"],
            Filters::default(),
        );
        assert!(e.contains("cannot fill the 4 donor sites"), "{e}");
        // Every ligand in the table has an f, so a π acceptor such as CO is screened.
        assert!(Screen::from_pool(
            t,
            &fe2(),
            Geometry::Octahedral,
            &names(&["CO", "H2O"]),
            &Filters::default(),
            Target::Crossover
        )
        .is_ok());
        let e = err(
            &fe2(),
            Geometry::Tetrahedral,
            &["terpy", "H2O"],
            Filters::default(),
        );
        assert!(e.contains("does not bind in tet"), "{e}");
        let ni = [IonSpec {
            metal: "Ni".into(),
            oxidation_state: 2,
        }];
        let e = err(&ni, Geometry::Octahedral, &["H2O"], Filters::default());
        assert!(e.contains("one ground spin"), "{e}");
        let e = err(
            &fe2(),
            Geometry::Octahedral,
            &["H2O"],
            Filters {
                donors: Some("N4".parse().unwrap()),
                ..Filters::default()
            },
        );
        assert!(e.contains("exactly 6 donor atoms"), "{e}");
        let e = err(
            &fe2(),
            Geometry::Octahedral,
            &["H2O", "NH3"],
            Filters {
                require: names(&["py"]),
                ..Filters::default()
            },
        );
        assert!(e.contains("required ligand"), "{e}");
        assert!("Q6".parse::<DonorSet>().is_err());
        assert!("n6".parse::<DonorSet>().is_err());
        assert_eq!("N4O2".parse::<DonorSet>().unwrap().total(), 6);
        assert!("3..1".parse::<SizeRange>().is_err());
        assert_eq!(
            "2..=3".parse::<SizeRange>().unwrap(),
            SizeRange { min: 2, max: 3 }
        );
        assert!("medium".parse::<Target>().is_err());
    }

    const CANDIDATES: &str = "name,ligands,comment
A,NCS:2 py:4,trans isomer wanted
B,H2O:6,
C,en:3,
D,bpy:2 NCS:2,
E,NH3:6,
F,CN:6,
G,py:4 Cl:2,
H,phen:2 NCS:2,
";

    #[test]
    fn candidate_files_report_bad_rows_and_rank_the_rest() {
        let text = format!("{CANDIDATES}X1,pyy:6,\nX2,py:5,\nX3,,\nX4,tacn:3,\n");
        let (s, errors) = Screen::from_candidates(
            bundled(),
            &fe2(),
            Geometry::Octahedral,
            &text,
            &Filters::default(),
            Target::Crossover,
        )
        .unwrap();
        assert_eq!(errors.len(), 4);
        assert_eq!((errors[0].row, errors[0].line), (9, 10));
        assert!(
            errors[0].to_string().contains("column ligands") && errors[0].message.contains("py")
        );
        assert!(errors[1].message.contains("5 donor atoms"), "{}", errors[1]);
        assert!(errors[2].message.contains("empty"));
        assert!(errors[3].message.contains("9 donor atoms"), "{}", errors[3]);
        let out = s.run(Keep::All, &mut |_| {});
        assert_eq!(out.candidates, 8);
        assert_eq!(out.hits.len(), 8);
        let e = Screen::from_candidates(
            bundled(),
            &fe2(),
            Geometry::Octahedral,
            "name,sphere\nA,py:6\n",
            &Filters::default(),
            Target::Crossover,
        )
        .unwrap_err()
        .to_string();
        assert!(e.contains("'ligands' column"), "{e}");
    }

    /// Results do not depend on the order of the rows of a candidates file (property test,
    /// deterministic runner).
    #[test]
    fn results_do_not_depend_on_row_order() {
        use proptest::prelude::*;
        use proptest::test_runner::{Config, TestRunner};
        let lines: Vec<&str> = CANDIDATES.lines().skip(1).collect();
        let reference = |text: &str| {
            let (s, _) = Screen::from_candidates(
                bundled(),
                &fe2(),
                Geometry::Octahedral,
                text,
                &Filters::default(),
                Target::Crossover,
            )
            .unwrap();
            let hits = s.run(Keep::All, &mut |_| {}).hits;
            hits.iter()
                .map(|h| {
                    let c = s.candidate(h);
                    (
                        s.formula(&c),
                        c.name.clone(),
                        c.delta.to_bits(),
                        c.score.to_bits(),
                    )
                })
                .collect::<Vec<_>>()
        };
        let expected = reference(CANDIDATES);
        let mut runner = TestRunner::new_with_rng(
            Config::with_cases(64),
            proptest::test_runner::TestRng::deterministic_rng(
                proptest::test_runner::RngAlgorithm::ChaCha,
            ),
        );
        runner
            .run(&Just(lines.clone()).prop_shuffle(), |shuffled| {
                let text = format!("name,ligands,comment\n{}\n", shuffled.join("\n"));
                prop_assert_eq!(reference(&text), expected.clone());
                Ok(())
            })
            .unwrap();
    }
}
