//! Ranking: hits in a bounded heap, the multiply-only bound that rejects most candidates, and the
//! full candidate of a hit.

use super::*;
use crate::estimate::{self, SpinState};
use std::cmp::Ordering;
use std::collections::BinaryHeap;

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
pub(super) struct Ranking {
    pub(super) keep: Keep,
    pub(super) heap: BinaryHeap<Hit>,
    pub(super) all: Vec<Hit>,
}

impl Ranking {
    pub(super) fn new(keep: Keep) -> Ranking {
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
    pub(super) fn offer(&mut self, hit: Hit) {
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
    pub(super) fn bar(&self) -> Option<f64> {
        match self.keep {
            Keep::Top(n) if self.heap.len() >= n => self.heap.peek().map(|w| w.score),
            _ => None,
        }
    }

    pub(super) fn finish(self) -> Vec<Hit> {
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

/// One ion's constants for the multiply-only reject test. With the sums N = Σf + c·Σπ (c the
/// back-bonding weight of the ion) and b = B₀·β, β = max(1 − k·Σh/n, β_floor), the mean field
/// is Δ̄/B = K·N / b (K = ½(h + l)·g·(geometry factor)/n, as in [`estimate::reference_delta`]
/// and [`Screen::score`]); the crossover aim of [`estimate::crossover_target`] is α/b + γ. Every
/// test below is that algebra multiplied through by b > 0.
#[derive(Debug, Clone, Copy)]
pub(super) struct FastBound {
    pub(super) k_mean: f64,
    pub(super) pi_weight: f64,
    /// k/n (0 when the ion has no k: β = 1).
    pub(super) k_per_donor: f64,
    pub(super) b0: f64,
    pub(super) xc: f64,
    /// α and γ of the crossover aim (None: the aim is Δ/B at the crossover itself).
    pub(super) aim: Option<(f64, f64)>,
}

impl FastBound {
    pub(super) fn new(screen: &Screen, ion: &ScreenIon) -> Option<FastBound> {
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
    pub(super) fn rejects(&self, target: Target, s: &Sums, bar: f64) -> bool {
        self.rejects_terms(target, s.f, s.pi, s.h, bar)
    }

    /// [`FastBound::rejects`] from the three sums it reads: Σf, Σπ and Σh.
    #[inline]
    pub(super) fn rejects_terms(&self, target: Target, f: f64, pi: f64, h: f64, bar: f64) -> bool {
        let beta = if self.k_per_donor == 0.0 {
            1.0
        } else {
            (1.0 - self.k_per_donor * h).max(estimate::BETA_FLOOR)
        };
        let b = self.b0 * beta;
        let kn = self.k_mean * (f + self.pi_weight * pi);
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
pub(super) struct Parameters {
    pub(super) delta_high_spin: f64,
    pub(super) delta_low_spin: f64,
    pub(super) b: f64,
}
