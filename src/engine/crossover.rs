//! The spin crossover: the Δ/B at which the spin of the ground state changes, for one d^n,
//! geometry and C/B. Energies are in units of B (B = 1, C = C/B, 10Dq = Δ/B).

use super::field::LigandField;
use super::geometry::Geometry;
use super::labels::{Irrep, LevelLabel, Term};
use super::levels::Calculation;
use crate::error::{require_finite, Error, Result};
use crate::param::Param;
use std::collections::HashMap;
use std::sync::{Mutex, OnceLock};

/// Δ/B up to which the spin searches step by whole units of Δ/B; beyond it they step by 1 % of
/// Δ/B (at large fields every energy difference grows in proportion to Δ).
const UNIT_STEPS_UP_TO: f64 = 200.0;

/// Fallback search limit when the asymptotic ordering of the lowest configuration's spins cannot
/// be resolved numerically (an exact asymptotic tie); stated in the result.
const FALLBACK_LIMIT: f64 = 1.0e4;

/// The C/B ratios of the original diagrams for d² … d⁸ (Y. Tanabe, S. Sugano, J. Phys. Soc.
/// Jpn. 9, 753 and 766, 1954; values from memory as printed on the usual reproductions): d² 4.42,
/// d³ 4.50, d⁴ 4.61, d⁵ 4.477, d⁶ 4.8, d⁷ 4.633, d⁸ 4.709; None for d⁰, d¹, d⁹ and d¹⁰, where C
/// does not change the level order (a single free-ion term, or none).
pub fn tanabe_sugano_ratio(dn: usize) -> Option<f64> {
    Some(match dn {
        2 => 4.42,
        3 => 4.50,
        4 => 4.61,
        5 => 4.477,
        6 => 4.8,
        7 => 4.633,
        8 => 4.709,
        _ => return None,
    })
}

/// C/B for d^n: the Tanabe–Sugano ratio of [`tanabe_sugano_ratio`], or 4.5 (inside their
/// 4.42–4.8 range) for d⁰, d¹, d⁹ and d¹⁰, where C enters no energy difference.
pub fn tanabe_sugano_c_over_b(dn: usize) -> f64 {
    tanabe_sugano_ratio(dn).unwrap_or(4.5)
}

/// Δ/B at which the weak-field ground state is read (well below any crossover).
const WEAK_FIELD: f64 = 1.0;

/// The ground state on one side of the crossover.
#[derive(Debug, Clone, PartialEq)]
pub struct SpinGround {
    /// Twice the total spin S.
    pub two_s: i32,
    /// Label with multiplicity, e.g. 5T2g.
    pub term: LevelLabel,
    /// The irrep of that level (T2g).
    pub irrep: Irrep,
    /// Free-ion parent term, e.g. 5D (None when the level could not be labelled).
    pub parent: Option<Term>,
}

/// Where the ground-state spin changes for one d^n, geometry and C/B.
#[derive(Debug, Clone, PartialEq)]
pub struct Crossover {
    pub dn: usize,
    pub geometry: Geometry,
    pub c_over_b: f64,
    /// Δ/B (Δ = 10Dq) at which the ground spin first changes, refined to 1e-6 or better; None
    /// when it never changes (nothing below [`Crossover::limit`], and nothing can above it).
    pub delta_over_b: Option<f64>,
    /// Largest Δ/B searched: [`spin_change_bound`], beyond which the ground spin cannot change.
    pub limit: f64,
    /// Ground state below the crossover (weak field; the high-spin state).
    pub high_spin: SpinGround,
    /// Ground state above the crossover (the low-spin state), if the spin changes.
    pub low_spin: Option<SpinGround>,
    /// d(E_HS − E_LS)/dΔ at the crossover (dimensionless, > 0): how fast the low-spin state
    /// falls below the high-spin one as Δ grows (2 for d⁶ octahedral in the strong-field limit,
    /// the number of electrons moved times one Δ each). None when the spin does not change.
    pub slope: Option<f64>,
}

impl Crossover {
    /// The ground-state spin (2S) expected at a given Δ/B.
    pub fn two_s_at(&self, delta_over_b: f64) -> i32 {
        match (&self.low_spin, self.delta_over_b) {
            (Some(ls), Some(x)) if delta_over_b > x => ls.two_s,
            _ => self.high_spin.two_s,
        }
    }
}

type Key = (usize, Geometry, u64);

fn cache() -> &'static Mutex<HashMap<Key, Crossover>> {
    static CACHE: OnceLock<Mutex<HashMap<Key, Crossover>>> = OnceLock::new();
    CACHE.get_or_init(|| Mutex::new(HashMap::new()))
}

fn calc_at(dn: usize, geometry: Geometry, c_over_b: f64, x: f64) -> Result<Calculation> {
    Calculation::new(
        dn,
        1.0,
        c_over_b,
        geometry.field(x / 10.0, 0.0, 0.0)?,
        geometry.point_group(0.0, 0.0),
    )
}

fn lowest(dn: usize, geometry: Geometry, c_over_b: f64, x: f64) -> Result<Vec<(i32, f64)>> {
    calc_at(dn, geometry, c_over_b, x)?.lowest_by_spin()
}

fn ground_spin(lows: &[(i32, f64)]) -> i32 {
    let mut best = lows[0];
    for &(s, e) in &lows[1..] {
        if e < best.1 - 1e-12 * (1.0 + e.abs()) {
            best = (s, e);
        }
    }
    best.0
}

fn energy_of(lows: &[(i32, f64)], two_s: i32) -> f64 {
    lows.iter()
        .find(|(s, _)| *s == two_s)
        .map(|(_, e)| *e)
        .unwrap_or(f64::INFINITY)
}

fn ground_state(dn: usize, geometry: Geometry, c_over_b: f64, x: f64) -> Result<SpinGround> {
    let spectrum = calc_at(dn, geometry, c_over_b, x)?.levels()?;
    let g = spectrum.ground();
    Ok(SpinGround {
        two_s: g.two_s,
        term: g.level_label(),
        irrep: g.irrep,
        parent: g.parent,
    })
}

/// The crossover of d^n in `geometry` at the given C/B (cached: the result is exact for its
/// inputs). The search scans Δ/B up to [`spin_change_bound`] on the grid of [`scan_points`], brackets the first
/// change of ground-state spin, and refines the root of E_HS − E_LS by bisection followed by
/// the Illinois variant of regula falsi to |ΔX| < 1e-9.
pub fn crossover(dn: usize, geometry: Geometry, c_over_b: f64) -> Result<Crossover> {
    require_finite(Param::COverB, c_over_b)?;
    if c_over_b <= 0.0 {
        return Err(Error::invalid(
            Param::COverB,
            c_over_b,
            "a ratio > 0 (usually 3.5–5)",
        ));
    }
    if dn > 10 {
        return Err(Error::invalid(Param::DElectronCount, dn, "0..=10"));
    }
    let key = (dn, geometry, c_over_b.to_bits());
    if let Some(hit) = cache().lock().ok().and_then(|c| c.get(&key).cloned()) {
        return Ok(hit);
    }
    let result = compute(dn, geometry, c_over_b)?;
    if let Ok(mut c) = cache().lock() {
        c.insert(key, result.clone());
    }
    Ok(result)
}

fn compute(dn: usize, geometry: Geometry, c_over_b: f64) -> Result<Crossover> {
    let limit = spin_change_bound(dn, geometry, c_over_b)?;
    let weak = lowest(dn, geometry, c_over_b, WEAK_FIELD)?;
    let s_hs = ground_spin(&weak);
    let high_spin = ground_state(dn, geometry, c_over_b, WEAK_FIELD)?;
    // Scan for the first Δ/B with a different ground spin.
    let mut bracket = None;
    let mut prev = WEAK_FIELD;
    for x in scan_points(limit) {
        let s = ground_spin(&lowest(dn, geometry, c_over_b, x)?);
        if s != s_hs {
            bracket = Some((prev, x));
            break;
        }
        prev = x;
    }
    let Some((mut a, mut b)) = bracket else {
        return Ok(Crossover {
            dn,
            geometry,
            c_over_b,
            delta_over_b: None,
            limit,
            high_spin,
            low_spin: None,
            slope: None,
        });
    };
    // Bisection on the spin until the bracket is narrow, then a smooth root of E_HS − E_new.
    while b - a > 1e-3 {
        let m = 0.5 * (a + b);
        if ground_spin(&lowest(dn, geometry, c_over_b, m)?) == s_hs {
            a = m;
        } else {
            b = m;
        }
    }
    let s_new = ground_spin(&lowest(dn, geometry, c_over_b, b)?);
    let g = |x: f64| -> Result<f64> {
        let l = lowest(dn, geometry, c_over_b, x)?;
        Ok(energy_of(&l, s_hs) - energy_of(&l, s_new))
    };
    let root = illinois(g, a, b, 1e-9, 100)?;
    const H: f64 = 1e-3;
    let slope = (g(root + H)? - g(root - H)?) / (2.0 * H);
    let low_spin = ground_state(dn, geometry, c_over_b, (root + 0.05).min(b + 0.05))?;
    let high_spin = ground_state(dn, geometry, c_over_b, (root - 0.05).max(a - 0.05))
        .map(|g| {
            if g.two_s == s_hs {
                g
            } else {
                high_spin.clone()
            }
        })
        .unwrap_or(high_spin);
    Ok(Crossover {
        dn,
        geometry,
        c_over_b,
        delta_over_b: Some(root),
        limit,
        high_spin,
        low_spin: Some(low_spin),
        slope: Some(slope),
    })
}

/// Every change of the ground-state spin of d^n in `geometry` at `c_over_b` for
/// 0 < Δ/B ≤ [`spin_change_bound`] (beyond which the spin cannot change again): (Δ/B where a
/// spin starts, its 2S), ascending, the first entry at Δ/B = 0. Scanned on the grid of
/// [`scan_points`] and refined by bisection to 1e-4 (cached); a spin that is the ground state over
/// less than one step of the grid can be missed. Unlike [`crossover`], which finds the first
/// change, this also finds later ones (square-planar d⁶ goes quintet → triplet → singlet).
pub fn ground_spin_map(dn: usize, geometry: Geometry, c_over_b: f64) -> Result<Vec<(f64, i32)>> {
    type SpinMap = Vec<(f64, i32)>;
    static MAPS: OnceLock<Mutex<HashMap<Key, SpinMap>>> = OnceLock::new();
    let key = (dn, geometry, c_over_b.to_bits());
    let maps = MAPS.get_or_init(|| Mutex::new(HashMap::new()));
    if let Some(hit) = maps.lock().ok().and_then(|m| m.get(&key).cloned()) {
        return Ok(hit);
    }
    let limit = crossover(dn, geometry, c_over_b)?.limit;
    let spin_at = |x: f64| -> Result<i32> { Ok(ground_spin(&lowest(dn, geometry, c_over_b, x)?)) };
    let mut out = vec![(0.0, spin_at(WEAK_FIELD)?)];
    let mut prev_x = WEAK_FIELD;
    let mut prev_s = out[0].1;
    for x in scan_points(limit) {
        let s = spin_at(x)?;
        if s != prev_s {
            let (mut a, mut b) = (prev_x, x);
            while b - a > 1e-4 * (1.0 + a / UNIT_STEPS_UP_TO) {
                let m = 0.5 * (a + b);
                if spin_at(m)? == prev_s {
                    a = m;
                } else {
                    b = m;
                }
            }
            out.push((0.5 * (a + b), s));
            prev_s = s;
        }
        prev_x = x;
    }
    if let Ok(mut m) = maps.lock() {
        m.insert(key, out.clone());
    }
    Ok(out)
}

/// The Δ/B grid of the spin searches, from 2 to `limit` (inclusive): whole units up to
/// [`UNIT_STEPS_UP_TO`], then steps of 1 % of Δ/B, ending exactly at `limit`.
fn scan_points(limit: f64) -> impl Iterator<Item = f64> {
    let mut x = WEAK_FIELD;
    let mut done = false;
    std::iter::from_fn(move || {
        if done {
            return None;
        }
        let next = if x < UNIT_STEPS_UP_TO {
            x + 1.0
        } else {
            x * 1.01
        };
        if next >= limit {
            done = true;
            return (x < limit).then_some(limit);
        }
        x = next;
        Some(x)
    })
}

/// Δ/B beyond which the ground-state spin of d^n in `geometry` at `c_over_b` cannot change any
/// more: a bound from first- and second-order perturbation theory in the strong-field limit,
/// so that the searches need no fixed ceiling. With B = 1, H(Δ) = Δ·T + V, where T is the
/// one-electron field per unit Δ (its eigenvalues t are the strong-field configuration energies)
/// and V the electron repulsion, whose eigenvalues (the free-ion terms) span R.
///
/// - A spin S whose best configuration t₀(S) lies above the lowest configuration t∞ cannot be the
///   ground state once Δ·(t₀(S) − t∞) > R: every state of spin S lies at or above
///   Δ·t₀(S) + min V, and a state of the lowest configuration at or below Δ·t∞ + max V.
/// - Spins S that the lowest configuration holds tend to Δ·t∞ + a_S, a_S the lowest eigenvalue of
///   V inside that configuration; the coupling to configurations at least g·Δ higher shifts them
///   by at most (R/2)²/(gΔ − R) (Feshbach partitioning, ‖PVQ‖ ≤ R/2). The order is fixed once
///   that shift is below the gap δ between the lowest a_S and the next.
///
/// So the bound is max(R/(t₀(S) − t∞), (R + R²/(4δ))/g), at least 2. The a_S are read from the
/// engine at a field where the shift is below 1 % of δ. If they tie exactly (δ cannot be
/// resolved), the search stops at a stated fallback of 10⁴. Standard perturbation theory
/// (e.g. A. Messiah, Quantum Mechanics, vol. 2, 1962, ch. XVI); the partitioning bound is P.-O.
/// Löwdin, J. Math. Phys. 3, 969 (1962).
pub fn spin_change_bound(dn: usize, geometry: Geometry, c_over_b: f64) -> Result<f64> {
    const FLOOR: f64 = 2.0;
    if dn <= 1 || dn >= 9 {
        // One spin only (d⁰, d¹, d⁹, d¹⁰): nothing can change.
        return Ok(FLOOR);
    }
    // Spread of the free-ion terms, in units of B.
    let free = Calculation::new(
        dn,
        1.0,
        c_over_b,
        LigandField::zero(),
        geometry.point_group(0.0, 0.0),
    )?
    .levels()?;
    let spread = free.levels.iter().map(|l| l.energy).fold(0.0_f64, f64::max);
    // One-electron energies per unit Δ/B, and the configurations they give.
    let unit = geometry
        .field(0.1, 0.0, 0.0)?
        .matrix
        .symmetric_eigenvalues();
    let mut eps: Vec<f64> = unit.iter().copied().collect();
    eps.sort_by(f64::total_cmp);
    let scale = eps[4] - eps[0];
    let tie = 1e-9 * scale.max(1e-300);
    let mut configs: Vec<(f64, usize)> = Vec::new(); // (energy per unit Δ, singly occupied)
    for code in 0..243usize {
        let mut occ = [0usize; 5];
        let mut c = code;
        for o in occ.iter_mut() {
            *o = c % 3;
            c /= 3;
        }
        if occ.iter().sum::<usize>() != dn {
            continue;
        }
        let t: f64 = occ.iter().zip(&eps).map(|(&o, e)| o as f64 * e).sum();
        configs.push((t, occ.iter().filter(|&&o| o == 1).count()));
    }
    let t_inf = configs.iter().map(|c| c.0).fold(f64::INFINITY, f64::min);
    let gap = configs
        .iter()
        .map(|c| c.0 - t_inf)
        .filter(|d| *d > tie)
        .fold(f64::INFINITY, f64::min);
    let max_two_s = dn.min(10 - dn) as i32;
    let mut bound = FLOOR;
    let mut asymptotic: Vec<i32> = Vec::new();
    for two_s in (max_two_s % 2..=max_two_s).step_by(2) {
        let t0 = configs
            .iter()
            .filter(|c| c.1 as i32 >= two_s)
            .map(|c| c.0)
            .fold(f64::INFINITY, f64::min);
        if t0 - t_inf > tie {
            bound = bound.max(spread / (t0 - t_inf));
        } else {
            asymptotic.push(two_s);
        }
    }
    if asymptotic.len() > 1 && spread > 0.0 {
        if !gap.is_finite() {
            return Ok(FALLBACK_LIMIT);
        }
        // Read a_S where the second-order shift is small, tightening until δ is resolved.
        let mut x = 100.0 * (spread + 1.0) / gap;
        let mut resolved = None;
        for _ in 0..4 {
            let lows = lowest(dn, geometry, c_over_b, x)?;
            let mut a: Vec<f64> = asymptotic
                .iter()
                .map(|&s| energy_of(&lows, s) - x * t_inf)
                .collect();
            a.sort_by(f64::total_cmp);
            let shift = (spread / 2.0).powi(2) / (gap * x - spread);
            let delta = a[1] - a[0] - 2.0 * shift;
            if delta > 100.0 * shift {
                resolved = Some(delta);
                break;
            }
            x *= 100.0;
        }
        let Some(delta) = resolved else {
            return Ok(FALLBACK_LIMIT);
        };
        bound = bound.max((spread + spread * spread / (4.0 * delta)) / gap);
    }
    Ok(bound.max(FLOOR))
}

/// The ground-state 2S at Δ/B from a [`ground_spin_map`].
pub fn spin_from_map(map: &[(f64, i32)], delta_over_b: f64) -> i32 {
    map.iter()
        .take_while(|(x, _)| *x <= delta_over_b)
        .last()
        .map_or(map[0].1, |e| e.1)
}

/// Root of f in [a, b] (f(a)·f(b) ≤ 0) by the Illinois method.
fn illinois(
    f: impl Fn(f64) -> Result<f64>,
    mut a: f64,
    mut b: f64,
    tol: f64,
    max_iter: usize,
) -> Result<f64> {
    let mut fa = f(a)?;
    let mut fb = f(b)?;
    if fa == 0.0 {
        return Ok(a);
    }
    if fb == 0.0 {
        return Ok(b);
    }
    if fa.signum() == fb.signum() {
        return Err(Error::Computation(format!(
            "crossover bracket [{a}, {b}] does not change sign"
        )));
    }
    let mut side = 0;
    for _ in 0..max_iter {
        let c = (a * fb - b * fa) / (fb - fa);
        let fc = f(c)?;
        if fc == 0.0 || (b - a).abs() < tol {
            return Ok(c);
        }
        if fc.signum() == fb.signum() {
            b = c;
            fb = fc;
            if side == -1 {
                fa *= 0.5;
            }
            side = -1;
        } else {
            a = c;
            fa = fc;
            if side == 1 {
                fb *= 0.5;
            }
            side = 1;
        }
        if (b - a).abs() < tol {
            return Ok(0.5 * (a + b));
        }
    }
    Err(Error::Computation(
        "crossover refinement did not converge in 100 steps".into(),
    ))
}
