//! Assignment search: which calculated spin-allowed transition each observed band belongs to.
//!
//! At fixed C/B every transition energy is B·f(Δ/B) (the Tanabe–Sugano scaling). The energies
//! per unit B are tabulated once on a grid of Δ/B; for each injective assignment of the observed
//! bands to transitions and each grid point the best B follows in closed form (linear least
//! squares), which ranks all assignments cheaply and gives starting points for the full fit.

use super::transitions::{band_manifold, calculation_at, TransitionKey};
use crate::engine::Geometry;
use crate::error::Result;

/// B (cm⁻¹) used to tabulate energies; they are stored per unit B.
const GRID_B: f64 = 1000.0;

/// Δ/B values of the grid: steps of 0.25 up to 10, 0.5 up to 40, 1 up to 80.
pub fn grid_points() -> Vec<f64> {
    let mut xs: Vec<f64> = (1..=40).map(|k| 0.25 * k as f64).collect();
    xs.extend((21..=80).map(|k| 0.5 * k as f64));
    xs.extend((41..=80).map(|k| k as f64));
    xs
}

/// Largest Δ/B of the grid.
pub const MAX_DELTA_OVER_B: f64 = 80.0;

/// The spin-allowed transitions of one spin at one Δ/B, energies per unit B, lowest first.
#[derive(Debug, Clone)]
pub struct GridPoint {
    /// Δ/B.
    pub x: f64,
    /// Whether this spin is the ground state at this Δ/B.
    pub consistent: bool,
    pub transitions: Vec<(TransitionKey, f64)>,
}

/// Tabulates the transitions of spin `two_s` over [`grid_points`] at C/B = `c_over_b`.
pub fn grid(dn: usize, geometry: Geometry, two_s: i32, c_over_b: f64) -> Result<Vec<GridPoint>> {
    let mut out = Vec::new();
    for x in grid_points() {
        let spectrum = calculation_at(dn, geometry, GRID_B, c_over_b, x)?.levels()?;
        let Some(m) = band_manifold(&spectrum, two_s) else {
            continue;
        };
        out.push(GridPoint {
            x,
            consistent: spectrum.ground().two_s == two_s,
            transitions: m
                .transitions
                .iter()
                .map(|t| (t.key.clone(), t.energy / GRID_B))
                .collect(),
        });
    }
    Ok(out)
}

/// Transitions worth trying for `n` bands: those among the lowest n + 2 at some grid point where
/// the spin is the ground state (or at any point if it never is), at most `cap`, ordered by the
/// lowest rank they reach.
pub fn candidates(grid: &[GridPoint], n: usize, cap: usize) -> Vec<TransitionKey> {
    let any_consistent = grid.iter().any(|p| p.consistent);
    let mut best_rank: Vec<(TransitionKey, usize, f64)> = Vec::new();
    for p in grid.iter().filter(|p| p.consistent || !any_consistent) {
        for (rank, (key, e)) in p.transitions.iter().take(n + 2).enumerate() {
            match best_rank.iter_mut().find(|(k, _, _)| k == key) {
                Some(entry) => {
                    if (rank, *e) < (entry.1, entry.2) {
                        entry.1 = rank;
                        entry.2 = *e;
                    }
                }
                None => best_rank.push((key.clone(), rank, *e)),
            }
        }
    }
    best_rank.sort_by(|a, b| a.1.cmp(&b.1).then(a.2.total_cmp(&b.2)));
    best_rank.into_iter().take(cap).map(|(k, _, _)| k).collect()
}

/// Every injective map of `n` bands onto `k` candidates, as candidate indices per band.
pub fn assignments(k: usize, n: usize) -> Vec<Vec<usize>> {
    fn extend(k: usize, n: usize, current: &mut Vec<usize>, out: &mut Vec<Vec<usize>>) {
        if current.len() == n {
            out.push(current.clone());
            return;
        }
        for i in 0..k {
            if !current.contains(&i) {
                current.push(i);
                extend(k, n, current, out);
                current.pop();
            }
        }
    }
    let mut out = Vec::new();
    if n <= k {
        extend(k, n, &mut Vec::new(), &mut out);
    }
    out
}

/// How B is chosen at each grid point.
#[derive(Debug, Clone, Copy)]
pub enum BSeed {
    /// Least-squares B within [min, max] cm⁻¹.
    Free { min: f64, max: f64 },
    /// B held at this value (cm⁻¹).
    Fixed(f64),
}

/// The best grid point of one assignment.
#[derive(Debug, Clone)]
pub struct Seed {
    /// Transition of each band, in band order.
    pub keys: Vec<TransitionKey>,
    /// Δ/B.
    pub x: f64,
    /// B (cm⁻¹).
    pub b: f64,
    /// Residual sum of squares (cm⁻²).
    pub rss: f64,
    /// C/B of the grid.
    pub c_over_b: f64,
}

/// The best grid point of every assignment that has one, lowest residual first. Points where
/// the spin is not the ground state are used only if there are no others.
pub fn seeds(
    grid: &[GridPoint],
    candidates: &[TransitionKey],
    bands: &[f64],
    b_seed: BSeed,
    c_over_b: f64,
) -> Vec<Seed> {
    let any_consistent = grid.iter().any(|p| p.consistent);
    let points: Vec<&GridPoint> = grid
        .iter()
        .filter(|p| p.consistent || !any_consistent)
        .collect();
    // Energy per unit B of each candidate at each point (None where absent).
    let table: Vec<Vec<Option<f64>>> = points
        .iter()
        .map(|p| {
            candidates
                .iter()
                .map(|k| p.transitions.iter().find(|(t, _)| t == k).map(|(_, e)| *e))
                .collect()
        })
        .collect();
    let mut out = Vec::new();
    for assignment in assignments(candidates.len(), bands.len()) {
        let mut best: Option<(f64, f64, f64)> = None;
        for (p, row) in points.iter().zip(&table) {
            let f: Option<Vec<f64>> = assignment.iter().map(|&i| row[i]).collect();
            let Some(f) = f else { continue };
            let b = match b_seed {
                BSeed::Fixed(b) => b,
                BSeed::Free { min, max } => {
                    let num: f64 = f.iter().zip(bands).map(|(fi, nu)| fi * nu).sum();
                    let den: f64 = f.iter().map(|fi| fi * fi).sum();
                    if den <= 0.0 {
                        continue;
                    }
                    let b = num / den;
                    if !(min..=max).contains(&b) {
                        continue;
                    }
                    b
                }
            };
            let rss: f64 = f
                .iter()
                .zip(bands)
                .map(|(fi, nu)| (b * fi - nu).powi(2))
                .sum();
            if best.is_none_or(|(r, _, _)| rss < r) {
                best = Some((rss, p.x, b));
            }
        }
        if let Some((rss, x, b)) = best {
            out.push(Seed {
                keys: assignment.iter().map(|&i| candidates[i].clone()).collect(),
                x,
                b,
                rss,
                c_over_b,
            });
        }
    }
    out.sort_by(|a, b| a.rss.total_cmp(&b.rss));
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::engine::{Irrep, Species};

    #[test]
    fn assignment_count_is_k_falling_n() {
        assert_eq!(assignments(3, 3).len(), 6);
        assert_eq!(assignments(5, 2).len(), 20);
        assert!(assignments(1, 2).is_empty());
    }

    #[test]
    fn grid_seed_finds_chromium_aqua_region() {
        // [Cr(H2O)6]3+ ν1 = 17 400, ν2 = 24 600 cm⁻¹ (band data of A. B. P. Lever, Inorganic Electronic Spectroscopy, 2nd ed., 1984, from memory) lie near
        // Δ/B ≈ 24 and B ≈ 729 (computed with the closed forms of Lever, J. Chem. Educ. 1968, 45, 711).
        let g = grid(3, Geometry::Octahedral, 3, 4.5).unwrap();
        let c = candidates(&g, 2, 8);
        assert_eq!(c.len(), 3);
        let s = seeds(
            &g,
            &c,
            &[17_400.0, 24_600.0],
            BSeed::Free {
                min: 100.0,
                max: 1500.0,
            },
            4.5,
        );
        let best = &s[0];
        assert_eq!(best.keys[0].irrep, Irrep::mulliken(Species::T2, true));
        assert_eq!(
            (best.keys[1].irrep, best.keys[1].index),
            (Irrep::mulliken(Species::T1, true), 1)
        );
        assert!((best.x - 23.9).abs() < 1.0, "Δ/B {}", best.x);
        assert!((best.b - 729.0).abs() < 40.0, "B {}", best.b);
    }
}
