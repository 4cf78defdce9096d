//! Magnetic susceptibility χ(T) from the full ligand-field Hamiltonian with spin–orbit coupling,
//! by the van Vleck equation (J. H. van Vleck, *The Theory of Electric and Magnetic
//! Susceptibilities*, 1932).
//!
//! The Zeeman operator is μ_B B·(κL + g_e S), κ the orbital reduction factor. For each direction
//! α and each zero-field level i (energy E_i, degenerate states a), with m = κL_α + g_e S_α:
//!
//! χ_α = (N_A μ_B² / Z) Σ_i e^{−E_i/kT} [ Σ_{a,b∈i} |m_ab|² / kT − 2 Σ_{a∈i} Σ_{j∉i} |m_aj|² / (E_i − E_j) ]
//!
//! (minus (N_A μ_B²/kT)⟨m⟩², which vanishes without a field). Summing |m_ab|² over the whole
//! degenerate level makes the result independent of the basis chosen inside it, which is what
//! degenerate perturbation theory requires. The second term is the temperature-independent
//! paramagnetism of each level. Units: cgs-emu, χ in cm³ mol⁻¹, χT in cm³ K mol⁻¹, μ_eff in μB.

use crate::engine::basis::all_determinants;
use crate::engine::operators::{angular_momentum, one_body_complex, Axis, DetList};
use crate::engine::{Calculation, SpinOrbitSolution};
use crate::error::{num, require_finite, Error, Result};
use crate::units;
use nalgebra::{Complex, DMatrix, SymmetricEigen};
use std::sync::OnceLock;

type C64 = Complex<f64>;

pub use crate::units::G_ELECTRON;

/// k_B in cm⁻¹ K⁻¹ (k/hc from the CODATA constants in [`crate::units`]): 0.695 035.
fn boltzmann_cm() -> f64 {
    units::kelvin_to_cm1(1.0)
}

/// N_A μ_B² / k (cgs), i.e. 3 × the Curie constant per g²S(S+1): 0.37515 cm³ K mol⁻¹.
pub fn curie_prefactor() -> f64 {
    3.0 * units::curie_constant_cgs()
}

/// μ_eff = √(3k/(N_A μ_B²)) √(χT) = 2.828 √(χT) (cgs).
pub fn mu_eff_from_chi_t(chi_t: f64) -> f64 {
    units::moment_factor_cgs() * chi_t.max(0.0).sqrt()
}

/// Options of the magnetic model.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MagneticModel {
    /// One-electron spin–orbit constant ζ (cm⁻¹) of the free ion.
    pub zeta: f64,
    /// Orbital reduction factor κ (0..=1) applied to L in the Zeeman term.
    pub kappa: f64,
    /// Also multiply ζ by κ (a common way to include covalency in the spin–orbit coupling).
    pub reduce_zeta: bool,
    /// Spin g value (default: free electron).
    pub g_spin: f64,
}

impl MagneticModel {
    /// ζ with κ = 1, g_e free-electron, ζ not reduced.
    pub fn new(zeta: f64) -> Self {
        MagneticModel {
            zeta,
            kappa: 1.0,
            reduce_zeta: false,
            g_spin: G_ELECTRON,
        }
    }

    fn check(&self) -> Result<()> {
        require_finite("ζ", self.zeta)?;
        require_finite("κ", self.kappa)?;
        require_finite("g", self.g_spin)?;
        if self.zeta < 0.0 {
            return Err(Error::invalid(
                "ζ",
                self.zeta,
                "a spin–orbit constant ≥ 0 cm⁻¹",
            ));
        }
        if !(0.0..=1.0).contains(&self.kappa) {
            return Err(Error::invalid(
                "κ",
                self.kappa,
                "an orbital reduction factor in 0..=1",
            ));
        }
        if self.g_spin <= 0.0 {
            return Err(Error::invalid("g", self.g_spin, "a spin g value > 0"));
        }
        Ok(())
    }

    /// The ζ actually used in the Hamiltonian.
    pub fn effective_zeta(&self) -> f64 {
        if self.reduce_zeta {
            self.zeta * self.kappa
        } else {
            self.zeta
        }
    }
}

/// One point of a χ(T) curve.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SusceptibilityPoint {
    /// Temperature (K).
    pub t: f64,
    /// Powder-averaged molar susceptibility (cm³ mol⁻¹).
    pub chi: f64,
    /// χ along x, y, z (cm³ mol⁻¹).
    pub chi_axes: [f64; 3],
    /// χT (cm³ K mol⁻¹).
    pub chi_t: f64,
    /// μ_eff = 2.828 √(χT) (μB).
    pub mu_eff: f64,
}

/// Zero-field levels with their first- and second-order Zeeman sums, computed once; every
/// temperature is then a Boltzmann sum.
#[derive(Debug, Clone)]
pub struct ZeemanLevels {
    /// Level energies above the lowest (cm⁻¹).
    pub energies: Vec<f64>,
    /// Number of states in each level.
    pub degeneracy: Vec<usize>,
    /// Σ_{a,b∈i} |m_ab|² per level and axis (μB²).
    pub first_order: Vec<[f64; 3]>,
    /// Σ_{a∈i} m_aa per level and axis (μB; zero at zero field by time reversal).
    pub trace: Vec<[f64; 3]>,
    /// Σ_{a∈i} Σ_{j∉i} |m_aj|²/(E_i − E_j) per level and axis (μB² per cm⁻¹).
    pub second_order: Vec<[f64; 3]>,
}

/// Full-space matrices of L and S components for d^n, cached (exact).
struct MomentMatrices {
    dets: DetList,
    l: [DMatrix<C64>; 3],
    s: [DMatrix<C64>; 3],
}

fn moment_matrices(n: usize) -> &'static MomentMatrices {
    static CACHE: [OnceLock<MomentMatrices>; 11] = [const { OnceLock::new() }; 11];
    CACHE[n].get_or_init(|| {
        let dets = DetList::new(all_determinants(n));
        let build = |orbital: bool, axis: Axis| {
            one_body_complex(&dets, &dets, &angular_momentum(orbital, axis))
        };
        let l = [
            build(true, Axis::X),
            build(true, Axis::Y),
            build(true, Axis::Z),
        ];
        let s = [
            build(false, Axis::X),
            build(false, Axis::Y),
            build(false, Axis::Z),
        ];
        MomentMatrices { dets, l, s }
    })
}

impl ZeemanLevels {
    /// Diagonalises H (repulsion + field + spin–orbit) once and accumulates the Zeeman sums.
    pub fn compute(calc: &Calculation, model: &MagneticModel) -> Result<Self> {
        model.check()?;
        let solution = calc.spin_orbit(model.effective_zeta())?;
        Self::from_solution(calc, &solution, model)
    }

    /// The Zeeman sums for eigenstates already computed with ζ = `model.effective_zeta()`
    /// (lets several κ or g values share one diagonalisation).
    pub fn from_solution(
        calc: &Calculation,
        solution: &SpinOrbitSolution,
        model: &MagneticModel,
    ) -> Result<Self> {
        model.check()?;
        if (solution.zeta - model.effective_zeta()).abs() > 1e-12 * (1.0 + solution.zeta.abs()) {
            return Err(Error::invalid(
                "ζ of the eigenstates",
                solution.zeta,
                format!("the model's ζ = {}", model.effective_zeta()),
            ));
        }
        let mm = moment_matrices(calc.dn);
        // Global state list: (energy, block, column), sorted.
        let mut states: Vec<(f64, usize, usize)> = Vec::new();
        for (bi, b) in solution.blocks.iter().enumerate() {
            for (k, &e) in b.energies.iter().enumerate() {
                states.push((e, bi, k));
            }
        }
        states.sort_by(|a, b| a.0.total_cmp(&b.0));
        let ground = states.first().map(|s| s.0).unwrap_or(0.0);
        let scale = (calc.b + calc.c + 10.0 * calc.field.magnitude() + model.zeta).max(1.0);
        let tol = 1e-9 * scale;
        // Level index of every state.
        let mut level_of = vec![0usize; states.len()];
        let mut energies = Vec::new();
        let mut degeneracy = Vec::new();
        let mut start = 0;
        while start < states.len() {
            let mut end = start + 1;
            while end < states.len() && states[end].0 - states[end - 1].0 < tol {
                end += 1;
            }
            let e = states[start..end].iter().map(|s| s.0).sum::<f64>() / (end - start) as f64;
            for l in &mut level_of[start..end] {
                *l = energies.len();
            }
            energies.push(e - ground);
            degeneracy.push(end - start);
            start = end;
        }
        // Position of (block, column) in the sorted list.
        let mut index = vec![Vec::new(); solution.blocks.len()];
        for (bi, b) in solution.blocks.iter().enumerate() {
            index[bi] = vec![0usize; b.energies.len()];
        }
        for (g, &(_, bi, k)) in states.iter().enumerate() {
            index[bi][k] = g;
        }
        // Positions of each block's determinants in the full list.
        let positions: Vec<Vec<usize>> = solution
            .blocks
            .iter()
            .map(|b| {
                b.block
                    .dets
                    .dets
                    .iter()
                    .map(|&d| mm.dets.position(d).expect("determinant in full list"))
                    .collect()
            })
            .collect();
        let nlev = energies.len();
        let mut first_order = vec![[0.0; 3]; nlev];
        let mut trace = vec![[0.0; 3]; nlev];
        let mut second_order = vec![[0.0; 3]; nlev];
        for axis in 0..3 {
            let m = &mm.l[axis] * C64::new(model.kappa, 0.0)
                + &mm.s[axis] * C64::new(model.g_spin, 0.0);
            for (b1, blk1) in solution.blocks.iter().enumerate() {
                for (b2, blk2) in solution.blocks.iter().enumerate() {
                    let sub = DMatrix::from_fn(positions[b2].len(), positions[b1].len(), |i, j| {
                        m[(positions[b2][i], positions[b1][j])]
                    });
                    if sub.iter().all(|z| z.norm_sqr() == 0.0) {
                        continue;
                    }
                    let x = blk2.vectors.adjoint() * sub * &blk1.vectors;
                    for a in 0..blk1.energies.len() {
                        let ga = index[b1][a];
                        let la = level_of[ga];
                        for j in 0..blk2.energies.len() {
                            let gj = index[b2][j];
                            let lj = level_of[gj];
                            let w = x[(j, a)].norm_sqr();
                            if la == lj {
                                first_order[la][axis] += w;
                                if ga == gj {
                                    trace[la][axis] += x[(j, a)].re;
                                }
                            } else {
                                second_order[la][axis] += w / (energies[la] - energies[lj]);
                            }
                        }
                    }
                }
            }
        }
        Ok(ZeemanLevels {
            energies,
            degeneracy,
            first_order,
            trace,
            second_order,
        })
    }

    /// χ, χT and μ_eff at temperature `t` (K > 0).
    pub fn at(&self, t: f64) -> Result<SusceptibilityPoint> {
        require_finite("temperature", t)?;
        if !(MIN_TEMPERATURE..=MAX_TEMPERATURE).contains(&t) {
            return Err(Error::invalid(
                "temperature",
                format!("{} K", num(t)),
                format!("{MIN_TEMPERATURE} K ≤ T ≤ {MAX_TEMPERATURE} K"),
            ));
        }
        let kt = boltzmann_cm() * t; // cm⁻¹
        let c0 = curie_prefactor(); // cm³ K mol⁻¹ per μB²
        let mut z = 0.0;
        let mut acc = [0.0; 3];
        let mut mean = [0.0; 3];
        for i in 0..self.energies.len() {
            let w = (-self.energies[i] / kt).exp();
            z += w * self.degeneracy[i] as f64;
            for ax in 0..3 {
                // Energies in the second-order term are converted to K: ΔE[K] = ΔE[cm⁻¹]/k.
                acc[ax] += w
                    * (self.first_order[i][ax] / t
                        - 2.0 * self.second_order[i][ax] * boltzmann_cm());
                mean[ax] += w * self.trace[i][ax];
            }
        }
        let mut chi_axes = [0.0; 3];
        for ax in 0..3 {
            let m = mean[ax] / z;
            chi_axes[ax] = c0 * (acc[ax] / z - m * m / t);
        }
        let chi = chi_axes.iter().sum::<f64>() / 3.0;
        if !chi.is_finite() {
            return Err(Error::Computation(format!("χ at {t} K is not finite")));
        }
        let chi_t = chi * t;
        Ok(SusceptibilityPoint {
            t,
            chi,
            chi_axes,
            chi_t,
            mu_eff: mu_eff_from_chi_t(chi_t),
        })
    }

    /// A curve at the given temperatures.
    pub fn curve(&self, temperatures: &[f64]) -> Result<Vec<SusceptibilityPoint>> {
        temperatures.iter().map(|&t| self.at(t)).collect()
    }
}

/// Lowest temperature accepted (K): below it Boltzmann factors underflow for ordinary splittings.
pub const MIN_TEMPERATURE: f64 = 0.01;
/// Highest temperature accepted (K).
pub const MAX_TEMPERATURE: f64 = 1.0e5;

/// Most temperatures in one curve: far more than any plot or fit needs, and small enough that the
/// curve's memory and time stay bounded (each point costs a few µs to ms).
pub const MAX_POINTS: usize = 100_000;

/// `points` temperatures evenly spaced from `tmin` to `tmax`, both included.
pub fn temperature_grid(tmin: f64, tmax: f64, points: usize) -> Result<Vec<f64>> {
    require_finite("tmin", tmin)?;
    require_finite("tmax", tmax)?;
    if tmin < MIN_TEMPERATURE || tmax < tmin || tmax > MAX_TEMPERATURE {
        return Err(Error::invalid(
            "temperature range",
            format!("{}..{} K", num(tmin), num(tmax)),
            format!("0 < tmin ≤ tmax with {MIN_TEMPERATURE} K ≤ T ≤ {MAX_TEMPERATURE} K"),
        ));
    }
    if points == 0 || (points == 1 && tmax != tmin) || points > MAX_POINTS {
        return Err(Error::invalid(
            "points",
            points,
            format!("2 to {MAX_POINTS} (or 1 when tmin = tmax)"),
        ));
    }
    if points == 1 {
        return Ok(vec![tmin]);
    }
    Ok((0..points)
        .map(|i| tmin + (tmax - tmin) * i as f64 / (points - 1) as f64)
        .collect())
}

/// Independent check: χ_α = −N_A ∂²F/∂H² by diagonalising the whole Hamiltonian with a small
/// field along `axis` (0 = x, 1 = y, 2 = z) and differentiating the free energy numerically
/// (central differences). Slow (one full diagonalisation per field value); for tests.
pub fn finite_field_chi(
    calc: &Calculation,
    model: &MagneticModel,
    t: f64,
    axis: usize,
) -> Result<f64> {
    model.check()?;
    let mm = moment_matrices(calc.dn);
    let all = crate::engine::shell::shell(calc.dn).spin_orbit_blocks(false);
    let blk = &all[0];
    let v = calc.field.complex_matrix();
    let mut h: DMatrix<C64> =
        (&blk.rep_b * calc.b + &blk.rep_c * calc.c + &blk.spin_orbit * model.effective_zeta())
            .map(|x| C64::new(x, 0.0));
    for i in 0..5 {
        for j in 0..5 {
            if let Some(e) = &blk.excitations[i * 5 + j] {
                h += e.map(|x| C64::new(x, 0.0)) * v[(i, j)];
            }
        }
    }
    // The single block lists the determinants in the same order as the moment matrices.
    debug_assert_eq!(blk.dets.dets, mm.dets.dets);
    let m = &mm.l[axis] * C64::new(model.kappa, 0.0) + &mm.s[axis] * C64::new(model.g_spin, 0.0);
    let kt = boltzmann_cm() * t;
    let free_energy = |b_cm: f64| -> Result<f64> {
        let hb = &h + &m * C64::new(b_cm, 0.0);
        let e = SymmetricEigen::try_new(hb, 1e-15, 100_000)
            .ok_or_else(|| Error::Computation("finite-field diagonalisation failed".into()))?;
        let e0 = e.eigenvalues.min();
        let z: f64 = e.eigenvalues.iter().map(|x| (-(x - e0) / kt).exp()).sum();
        Ok(e0 - kt * z.ln())
    };
    // Central second differences at steps h and 2h, combined by Richardson extrapolation
    // (error O(h⁴)); a step of 1 % of kT keeps eigenvalue round-off negligible.
    let h = 1e-2 * kt;
    let f0 = free_energy(0.0)?;
    let second = |step: f64| -> Result<f64> {
        Ok((free_energy(step)? - 2.0 * f0 + free_energy(-step)?) / (step * step))
    };
    // −∂²F/∂b² with F, b in cm⁻¹ (b = μ_B B); convert to K⁻¹ and multiply by N_A μ_B²/k.
    let d2 = -(4.0 * second(h)? - second(2.0 * h)?) / 3.0; // per cm⁻¹
    Ok(curie_prefactor() * d2 * boltzmann_cm())
}
