//! The spin crossover: the Δ/B at which the spin of the ground state changes, for one d^n,
//! geometry and C/B. Energies are in units of B (B = 1, C = C/B, 10Dq = Δ/B).

use super::geometry::Geometry;
use super::levels::Calculation;
use crate::error::{require_finite, Error, Result};
use std::collections::HashMap;
use std::sync::{Mutex, OnceLock};

/// Largest Δ/B searched. Beyond ≈ 50 no 3d complex is known; the limit is stated in every result.
pub const DELTA_OVER_B_LIMIT: f64 = 60.0;

/// The C/B ratios of the original diagrams (Y. Tanabe, S. Sugano, J. Phys. Soc. Jpn. 9, 753,
/// 1954; values from memory as printed on the usual reproductions): d² 4.42, d³ 4.50, d⁴ 4.61,
/// d⁵ 4.477, d⁶ 4.8, d⁷ 4.633, d⁸ 4.709. For d⁰, d¹, d⁹ and d¹⁰ C does not change the level
/// order (a single free-ion term); 4.5 is returned.
pub fn tanabe_sugano_c_over_b(dn: usize) -> f64 {
    match dn {
        2 => 4.42,
        3 => 4.50,
        4 => 4.61,
        5 => 4.477,
        6 => 4.8,
        7 => 4.633,
        8 => 4.709,
        _ => 4.5,
    }
}

/// Δ/B at which the weak-field ground state is read (well below any crossover).
const WEAK_FIELD: f64 = 1.0;

/// The ground state on one side of the crossover.
#[derive(Debug, Clone, PartialEq)]
pub struct SpinGround {
    /// Twice the total spin S.
    pub two_s: i32,
    /// Label with multiplicity, e.g. "5T2g".
    pub term: String,
    /// Free-ion parent term, e.g. "5D".
    pub parent: String,
}

/// Where the ground-state spin changes for one d^n, geometry and C/B.
#[derive(Debug, Clone, PartialEq)]
pub struct Crossover {
    pub dn: usize,
    pub geometry: Geometry,
    pub c_over_b: f64,
    /// Δ/B (Δ = 10Dq) at which the ground spin first changes, refined to 1e-6 or better; None
    /// when it does not change below [`Crossover::limit`].
    pub delta_over_b: Option<f64>,
    /// Largest Δ/B searched.
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
        term: g.label(),
        parent: g.parent.clone(),
    })
}

/// The crossover of d^n in `geometry` at the given C/B (cached: the result is exact for its
/// inputs). The search scans Δ/B up to [`DELTA_OVER_B_LIMIT`] in steps of 1, brackets the first
/// change of ground-state spin, and refines the root of E_HS − E_LS by bisection followed by
/// the Illinois variant of regula falsi to |ΔX| < 1e-9.
pub fn crossover(dn: usize, geometry: Geometry, c_over_b: f64) -> Result<Crossover> {
    require_finite("C/B", c_over_b)?;
    if c_over_b <= 0.0 {
        return Err(Error::invalid(
            "C/B",
            c_over_b,
            "a ratio > 0 (usually 3.5–5)",
        ));
    }
    if dn > 10 {
        return Err(Error::invalid("d-electron count", dn, "0..=10"));
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
    let weak = lowest(dn, geometry, c_over_b, WEAK_FIELD)?;
    let s_hs = ground_spin(&weak);
    let high_spin = ground_state(dn, geometry, c_over_b, WEAK_FIELD)?;
    // Scan for the first Δ/B with a different ground spin.
    let mut bracket = None;
    let mut prev = WEAK_FIELD;
    let mut x = 2.0;
    while x <= DELTA_OVER_B_LIMIT + 1e-12 {
        let s = ground_spin(&lowest(dn, geometry, c_over_b, x)?);
        if s != s_hs {
            bracket = Some((prev, x));
            break;
        }
        prev = x;
        x += 1.0;
    }
    let Some((mut a, mut b)) = bracket else {
        return Ok(Crossover {
            dn,
            geometry,
            c_over_b,
            delta_over_b: None,
            limit: DELTA_OVER_B_LIMIT,
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
        limit: DELTA_OVER_B_LIMIT,
        high_spin,
        low_spin: Some(low_spin),
        slope: Some(slope),
    })
}

/// Largest Δ/B of [`ground_spin_map`].
pub const SPIN_MAP_LIMIT: f64 = 200.0;

/// Every change of the ground-state spin of d^n in `geometry` at `c_over_b` for
/// 0 < Δ/B ≤ [`SPIN_MAP_LIMIT`]: (Δ/B where a spin starts, its 2S), ascending, the first entry at
/// Δ/B = 0. Scanned in steps of 1 and refined by bisection to 1e-4 (cached); a spin that is the
/// ground state over less than one unit of Δ/B can be missed. Unlike
/// [`crossover`], which finds the first change, this also finds later ones (square-planar d⁶
/// goes quintet → triplet → singlet).
pub fn ground_spin_map(dn: usize, geometry: Geometry, c_over_b: f64) -> Result<Vec<(f64, i32)>> {
    type SpinMap = Vec<(f64, i32)>;
    static MAPS: OnceLock<Mutex<HashMap<Key, SpinMap>>> = OnceLock::new();
    let key = (dn, geometry, c_over_b.to_bits());
    let maps = MAPS.get_or_init(|| Mutex::new(HashMap::new()));
    if let Some(hit) = maps.lock().ok().and_then(|m| m.get(&key).cloned()) {
        return Ok(hit);
    }
    let spin_at = |x: f64| -> Result<i32> { Ok(ground_spin(&lowest(dn, geometry, c_over_b, x)?)) };
    let mut out = vec![(0.0, spin_at(WEAK_FIELD)?)];
    let mut prev_x = WEAK_FIELD;
    let mut prev_s = out[0].1;
    let mut x = WEAK_FIELD + 1.0;
    while x <= SPIN_MAP_LIMIT + 1e-12 {
        let s = spin_at(x)?;
        if s != prev_s {
            let (mut a, mut b) = (prev_x, x);
            while b - a > 1e-4 {
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
        x += 1.0;
    }
    if let Ok(mut m) = maps.lock() {
        m.insert(key, out.clone());
    }
    Ok(out)
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
