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

use crate::engine::levels::degenerate_runs;
use crate::engine::operators::{angular_momentum, one_body, one_body_complex, Axis};
use crate::engine::shell::shell;
use crate::engine::{Calculation, SpinOrbitSolution};
use crate::error::{num, require_finite, Error, Result};
use crate::param::Param;
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
        require_finite(Param::Zeta, self.zeta)?;
        require_finite(Param::Kappa, self.kappa)?;
        require_finite(Param::GFactor, self.g_spin)?;
        if self.zeta < 0.0 {
            return Err(Error::invalid(
                Param::Zeta,
                self.zeta,
                "a spin–orbit constant ≥ 0 cm⁻¹",
            ));
        }
        if !(0.0..=1.0).contains(&self.kappa) {
            return Err(Error::invalid(
                Param::Kappa,
                self.kappa,
                "an orbital reduction factor in 0..=1",
            ));
        }
        // Spin g values of d-block ions lie near 2; 10 bounds every effective g (common
        // practice) and keeps χ finite.
        if !(self.g_spin > 0.0 && self.g_spin <= 10.0) {
            return Err(Error::invalid(
                Param::GFactor,
                self.g_spin,
                "a spin g value in 0 < g ≤ 10",
            ));
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
    /// Highest temperature (K) at which [`ZeemanLevels::at`] may be used: the sums are complete
    /// for every level with a Boltzmann weight above e^−[`WEIGHT_CUTOFF`] there (the sums of
    /// higher levels are left at zero). [`MAX_TEMPERATURE`] when every level was summed.
    pub highest_temperature: f64,
}

/// Boltzmann exponent E/kT beyond which [`ZeemanLevels::compute_up_to`] leaves a level's
/// sums out: its weight e^−40 ≈ 4·10⁻¹⁸ is below double precision relative to the ground level.
pub const WEIGHT_CUTOFF: f64 = 40.0;

/// Sub-blocks of L and S between two spin–orbit blocks, for one axis: over the complex orbitals
/// with Condon–Shortley phases L_x, S_x, L_z and S_z are real and L_y, S_y purely imaginary, so
/// each is stored as one real matrix (the imaginary part for y).
struct AxisPair {
    l: DMatrix<f64>,
    s: DMatrix<f64>,
}

/// For every ordered pair of spin–orbit blocks of one shell and blocking, the non-zero
/// sub-blocks of L and S along x, y, z (cached: exact).
struct PairMoments {
    /// pairs[to][from][axis]
    pairs: Vec<Vec<[Option<AxisPair>; 3]>>,
}

fn pair_moments(n: usize, fourfold: bool) -> &'static PairMoments {
    static CACHE: [OnceLock<PairMoments>; 22] = [const { OnceLock::new() }; 22];
    CACHE[2 * n + fourfold as usize].get_or_init(|| {
        let blocks = shell(n).spin_orbit_blocks(fourfold);
        let axes = [Axis::X, Axis::Y, Axis::Z];
        // Spin-orbital elements of L and S along each axis: the real part, or for y the
        // imaginary part, whichever carries the operator.
        let part = |orbital: bool, axis: Axis| {
            let h = angular_momentum(orbital, axis);
            h.map(|row| row.map(|x| if axis == Axis::Y { x.im } else { x.re }))
        };
        let l = axes.map(|a| part(true, a));
        let s = axes.map(|a| part(false, a));
        // Each sub-block straight from the two blocks' determinant lists.
        let pairs = blocks
            .iter()
            .map(|to| {
                blocks
                    .iter()
                    .map(|from| {
                        std::array::from_fn(|ax| {
                            let l = one_body(&from.dets, &to.dets, |p, q| l[ax][p][q]);
                            let s = one_body(&from.dets, &to.dets, |p, q| s[ax][p][q]);
                            let zero = l.iter().chain(s.iter()).all(|&x| x == 0.0);
                            (!zero).then_some(AxisPair { l, s })
                        })
                    })
                    .collect()
            })
            .collect();
        PairMoments { pairs }
    })
}

/// ⟨j|L|a⟩ and ⟨j|S|a⟩ between the eigenstates of two blocks along one axis (the imaginary
/// unit of the y axis left out), in real arithmetic when both blocks' eigenvectors are real.
enum Transformed {
    Real(DMatrix<f64>, DMatrix<f64>),
    Complex(DMatrix<C64>, DMatrix<C64>),
}

impl Transformed {
    /// |m_ja|² and the diagonal value Re m_aa for m = κL + gS.
    fn element(&self, y_axis: bool, kappa: f64, g: f64, j: usize, a: usize) -> (f64, f64) {
        match self {
            Transformed::Real(l, s) => {
                let v = kappa * l[(j, a)] + g * s[(j, a)];
                // Along y the element is i·v: real part zero.
                (v * v, if y_axis { 0.0 } else { v })
            }
            Transformed::Complex(l, s) => {
                let v = l[(j, a)] * kappa + s[(j, a)] * g;
                let v = if y_axis { v * C64::new(0.0, 1.0) } else { v };
                (v.norm_sqr(), v.re)
            }
        }
    }
}

impl ZeemanLevels {
    /// Diagonalises H (repulsion + field + spin–orbit) once and accumulates the Zeeman sums.
    pub fn compute(calc: &Calculation, model: &MagneticModel) -> Result<Self> {
        model.check()?;
        let solution = calc.spin_orbit(model.effective_zeta())?;
        Self::from_solution(calc, &solution, model)
    }

    /// As [`ZeemanLevels::compute`], for temperatures up to `t_max` (K) only: levels more than
    /// [`WEIGHT_CUTOFF`]·k·t_max above the ground level are populated by less than e^−40 and
    /// their sums are skipped, which makes a room-temperature moment several times cheaper.
    /// The matrix elements from the summed levels to every other state are still all taken.
    pub fn compute_up_to(calc: &Calculation, model: &MagneticModel, t_max: f64) -> Result<Self> {
        model.check()?;
        check_temperature(t_max)?;
        let solution = calc.spin_orbit(model.effective_zeta())?;
        let mut all = Self::sums(
            calc,
            &solution,
            std::slice::from_ref(model),
            false,
            Some(t_max),
        )?;
        Ok(all.remove(0))
    }

    /// The Zeeman sums for eigenstates already computed with ζ = `model.effective_zeta()`
    /// (lets several κ or g values share one diagonalisation).
    pub fn from_solution(
        calc: &Calculation,
        solution: &SpinOrbitSolution,
        model: &MagneticModel,
    ) -> Result<Self> {
        let mut all = Self::from_solution_models(calc, solution, std::slice::from_ref(model))?;
        Ok(all.remove(0))
    }

    /// The Zeeman sums of several models (κ, g) that share ζ and so one diagonalisation: each
    /// transform of L and S to the eigenstates is done once for all of them. Real arithmetic is
    /// used when every block's eigenvectors are real (cubic and tetragonal fields over the complex
    /// orbitals), complex arithmetic otherwise; [`ZeemanLevels::from_solution_complex`] forces
    /// the latter.
    pub fn from_solution_models(
        calc: &Calculation,
        solution: &SpinOrbitSolution,
        models: &[MagneticModel],
    ) -> Result<Vec<Self>> {
        Self::sums(calc, solution, models, false, None)
    }

    /// As [`ZeemanLevels::from_solution`], always in complex arithmetic (the reference for the
    /// real path).
    pub fn from_solution_complex(
        calc: &Calculation,
        solution: &SpinOrbitSolution,
        model: &MagneticModel,
    ) -> Result<Self> {
        let mut all = Self::sums(calc, solution, std::slice::from_ref(model), true, None)?;
        Ok(all.remove(0))
    }

    fn sums(
        calc: &Calculation,
        solution: &SpinOrbitSolution,
        models: &[MagneticModel],
        force_complex: bool,
        t_max: Option<f64>,
    ) -> Result<Vec<Self>> {
        for model in models {
            model.check()?;
            if (solution.zeta - model.effective_zeta()).abs() > 1e-12 * (1.0 + solution.zeta.abs())
            {
                return Err(Error::invalid(
                    Param::ZetaOfEigenstates,
                    solution.zeta,
                    format!("the model's ζ = {}", model.effective_zeta()),
                ));
            }
        }
        let Some(first) = solution.blocks.first() else {
            return Err(Error::Computation("no eigenstates to sum over".into()));
        };
        let fourfold = first.block.class.is_some();
        let shell_blocks = shell(calc.dn).spin_orbit_blocks(fourfold);
        let same_blocks = shell_blocks.len() == solution.blocks.len()
            && solution
                .blocks
                .iter()
                .zip(shell_blocks)
                .all(|(b, s)| std::ptr::eq(b.block, s));
        if !same_blocks {
            return Err(Error::Computation(
                "eigenstates do not come from this shell's spin–orbit blocks".into(),
            ));
        }
        let moments = pair_moments(calc.dn, fourfold);
        // Global state list: (energy, block, column), sorted.
        let mut states: Vec<(f64, usize, usize)> = Vec::new();
        for (bi, b) in solution.blocks.iter().enumerate() {
            for (k, &e) in b.energies.iter().enumerate() {
                states.push((e, bi, k));
            }
        }
        states.sort_by(|a, b| a.0.total_cmp(&b.0));
        let ground = states.first().map(|s| s.0).unwrap_or(0.0);
        let zeta_max = models.iter().map(|m| m.zeta).fold(0.0, f64::max);
        let scale = (calc.b + calc.c + 10.0 * calc.field.magnitude() + zeta_max).max(1.0);
        let tol = 1e-9 * scale;
        // Level index of every state.
        let mut level_of = vec![0usize; states.len()];
        let mut energies = Vec::new();
        let mut degeneracy = Vec::new();
        for run in degenerate_runs(states.len(), |end| states[end].0 - states[end - 1].0 < tol) {
            let e = states[run.clone()].iter().map(|s| s.0).sum::<f64>() / run.len() as f64;
            for l in &mut level_of[run.clone()] {
                *l = energies.len();
            }
            energies.push(e - ground);
            degeneracy.push(run.len());
        }
        // Position of (block, column) in the sorted list.
        let mut index: Vec<Vec<usize>> = solution
            .blocks
            .iter()
            .map(|b| vec![0usize; b.energies.len()])
            .collect();
        for (g, &(_, bi, k)) in states.iter().enumerate() {
            index[bi][k] = g;
        }
        let real = !force_complex
            && solution
                .blocks
                .iter()
                .all(|b| b.vectors.iter().all(|z| z.im == 0.0));
        // Eigenvectors and their transposes, real (products below go through the blocked
        // matrix kernel; `tr_mul` would take dot products element by element).
        let (real_vectors, real_transposed): (Vec<DMatrix<f64>>, Vec<DMatrix<f64>>) = if real {
            solution
                .blocks
                .iter()
                .map(|b| {
                    let v = b.vectors.map(|z| z.re);
                    let t = v.transpose();
                    (v, t)
                })
                .unzip()
        } else {
            (Vec::new(), Vec::new())
        };
        // The columns (states a) whose sums are needed: every state, or those of levels within
        // WEIGHT_CUTOFF·kT_max of the ground level.
        let e_max = t_max.map_or(f64::INFINITY, |t| WEIGHT_CUTOFF * boltzmann_cm() * t);
        let kept: Vec<Vec<usize>> = solution
            .blocks
            .iter()
            .enumerate()
            .map(|(bi, b)| {
                (0..b.energies.len())
                    .filter(|&a| energies[level_of[index[bi][a]]] <= e_max)
                    .collect()
            })
            .collect();
        // Column subsets are copied only for blocks that lose columns (None: every column).
        let all_kept = |bi: usize| kept[bi].len() == solution.blocks[bi].energies.len();
        let kept_real: Vec<Option<DMatrix<f64>>> = real_vectors
            .iter()
            .enumerate()
            .map(|(bi, v)| (!all_kept(bi)).then(|| v.select_columns(&kept[bi])))
            .collect();
        let kept_complex: Vec<Option<DMatrix<C64>>> = if real {
            Vec::new()
        } else {
            solution
                .blocks
                .iter()
                .enumerate()
                .map(|(bi, b)| (!all_kept(bi)).then(|| b.vectors.select_columns(&kept[bi])))
                .collect()
        };
        let nlev = energies.len();
        let mut first_order = vec![vec![[0.0; 3]; nlev]; models.len()];
        let mut trace = vec![vec![[0.0; 3]; nlev]; models.len()];
        let mut second_order = vec![vec![[0.0; 3]; nlev]; models.len()];
        for (b2, blk2) in solution.blocks.iter().enumerate() {
            for b1 in 0..solution.blocks.len() {
                for (axis, pair) in moments.pairs[b2][b1].iter().enumerate() {
                    let Some(pair) = pair else {
                        continue;
                    };
                    if kept[b1].is_empty() {
                        continue;
                    }
                    let x = if real {
                        let v1 = kept_real[b1].as_ref().unwrap_or(&real_vectors[b1]);
                        let v2t = &real_transposed[b2];
                        Transformed::Real(v2t * (&pair.l * v1), v2t * (&pair.s * v1))
                    } else {
                        let to_c = |m: &DMatrix<f64>| m.map(|x| C64::new(x, 0.0));
                        let v1 = kept_complex[b1]
                            .as_ref()
                            .unwrap_or(&solution.blocks[b1].vectors);
                        let v2 = &blk2.vectors;
                        Transformed::Complex(
                            v2.adjoint() * (to_c(&pair.l) * v1),
                            v2.adjoint() * (to_c(&pair.s) * v1),
                        )
                    };
                    let y_axis = axis == 1;
                    for (col, &a) in kept[b1].iter().enumerate() {
                        let ga = index[b1][a];
                        let la = level_of[ga];
                        for (j, &gj) in index[b2].iter().enumerate() {
                            let lj = level_of[gj];
                            let gap = energies[la] - energies[lj];
                            for (mi, model) in models.iter().enumerate() {
                                let (w, diag) =
                                    x.element(y_axis, model.kappa, model.g_spin, j, col);
                                if la == lj {
                                    first_order[mi][la][axis] += w;
                                    if ga == gj {
                                        trace[mi][la][axis] += diag;
                                    }
                                } else {
                                    second_order[mi][la][axis] += w / gap;
                                }
                            }
                        }
                    }
                }
            }
        }
        Ok((0..models.len())
            .map(|mi| ZeemanLevels {
                energies: energies.clone(),
                degeneracy: degeneracy.clone(),
                first_order: std::mem::take(&mut first_order[mi]),
                trace: std::mem::take(&mut trace[mi]),
                second_order: std::mem::take(&mut second_order[mi]),
                highest_temperature: t_max.unwrap_or(MAX_TEMPERATURE),
            })
            .collect())
    }

    /// χ, χT and μ_eff at temperature `t` (K > 0).
    pub fn at(&self, t: f64) -> Result<SusceptibilityPoint> {
        check_temperature(t)?;
        if t > self.highest_temperature {
            return Err(Error::invalid(
                Param::Temperature,
                format!("{} K", num(t)),
                format!(
                    "T ≤ {} K, the highest temperature these Zeeman sums were computed for",
                    num(self.highest_temperature)
                ),
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

/// A temperature (K) within [`MIN_TEMPERATURE`]..=[`MAX_TEMPERATURE`].
fn check_temperature(t: f64) -> Result<()> {
    require_finite(Param::Temperature, t)?;
    if !(MIN_TEMPERATURE..=MAX_TEMPERATURE).contains(&t) {
        return Err(Error::invalid(
            Param::Temperature,
            format!("{} K", num(t)),
            format!("{MIN_TEMPERATURE} K ≤ T ≤ {MAX_TEMPERATURE} K"),
        ));
    }
    Ok(())
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
    require_finite(Param::LowestTemperature, tmin)?;
    require_finite(Param::HighestTemperature, tmax)?;
    if tmin < MIN_TEMPERATURE || tmax < tmin || tmax > MAX_TEMPERATURE {
        return Err(Error::invalid(
            Param::TemperatureRange,
            format!("{}..{} K", num(tmin), num(tmax)),
            format!("0 < tmin ≤ tmax with {MIN_TEMPERATURE} K ≤ T ≤ {MAX_TEMPERATURE} K"),
        ));
    }
    if points == 0 || (points == 1 && tmax != tmin) || points > MAX_POINTS {
        return Err(Error::invalid(
            Param::Points,
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
    let all = crate::engine::shell::shell(calc.dn).spin_orbit_blocks(false);
    let block = &all[0];
    let blk = block.matrices();
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
    // The Zeeman operator over the single block's determinants, built here in complex
    // arithmetic independently of the sums' cached sub-blocks.
    let direction = [Axis::X, Axis::Y, Axis::Z][axis.min(2)];
    let momentum = |orbital| {
        one_body_complex(
            &block.dets,
            &block.dets,
            &angular_momentum(orbital, direction),
        )
    };
    let m =
        momentum(true) * C64::new(model.kappa, 0.0) + momentum(false) * C64::new(model.g_spin, 0.0);
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
