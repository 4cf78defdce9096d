//! Fit of Dq, Ds, Dt (and Racah B where the bands allow) to the split bands of a tetragonally
//! distorted six-coordinate complex (D₄h, z the unique axis): Jahn–Teller ions such as Cu(II),
//! Cr(II) and high-spin Mn(III), and trans-[MX₂L₄] complexes.
//!
//! The field is the usual D₄h one of [`crate::engine::LigandField::tetragonal`], in which Dq is
//! the equatorial Dq(xy) and the axial Dq(z) = Dq(xy) − (7/4)·Dt (A. B. P. Lever, *Inorganic
//! Electronic Spectroscopy*, 2nd ed., 1984, ch. 6; from memory). Positive Ds and Dt mean axial
//! donors weaker than the equatorial ones (elongation, or weaker axial ligands).
//!
//! Method. For each spin state tried, a grid of starting points over Dq, Ds/Dq and Dt/Dq is
//! computed with the full d^n engine. At each point the sorted observed bands are matched to the
//! sorted calculated transitions of that spin in the one order-preserving way that minimises the
//! squared residuals (dynamic programming). Each distinct assignment (the ground level and the
//! upper levels, named by spin, irrep and index, which follow a level through the field by the
//! non-crossing rule) keeps its best starting point, and the best few are refined by
//! Levenberg–Marquardt least squares on the engine (crate `levenberg-marquardt`). Uncertainties
//! come from s²(JᵀJ)⁻¹ when there are more bands than free parameters.
//!
//! What the data cannot fix is said, not guessed: fewer bands than free parameters is refused
//! with the parameter to hold, and a Jacobian of lower rank than the free parameters (bands that
//! depend on fewer combinations of Dq, Ds, Dt, B than are free) is reported as undetermined.

use super::fit::{
    converged, near_equal_tolerance, CONCERN_PENALTY, DEFAULT_PATIENCE, FAR_ABSOLUTE, FAR_FRACTION,
    PLAUSIBLE_B, POSSIBLE_B,
};
use super::transitions::{
    band_manifold, default_c_over_b, select_spin, spin_states, SpinCandidate, SpinChoice,
    TransitionKey,
};
use crate::engine::{Calculation, Geometry, LigandField, Spectrum, Term};
use crate::error::{require_finite, Error, Result};
use crate::least_squares::Residuals;
use crate::param::Param;
use levenberg_marquardt::LevenbergMarquardt;
use nalgebra::{DMatrix, DVector};

/// What to fit.
#[derive(Debug, Clone)]
pub struct TetragonalRequest {
    pub dn: usize,
    /// Observed band maxima (cm⁻¹), any order.
    pub bands: Vec<f64>,
    pub spin: SpinChoice,
    /// C/B held fixed; None uses the Tanabe–Sugano ratio of [`default_c_over_b`].
    pub c_over_b: Option<f64>,
    /// Hold B at this value (cm⁻¹).
    pub fixed_b: Option<f64>,
    /// Free-ion B₀ (cm⁻¹): a fit with B > B₀ (β > 1) is flagged as unphysical.
    pub b0: Option<f64>,
    /// Cap on model evaluations per refined assignment, × (free parameters + 1).
    pub patience: Option<usize>,
}

/// A free parameter of the tetragonal model.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum TetragonalParameter {
    Dq,
    Ds,
    Dt,
    B,
}

impl TetragonalParameter {
    pub fn name(self) -> &'static str {
        match self {
            TetragonalParameter::Dq => "Dq",
            TetragonalParameter::Ds => "Ds",
            TetragonalParameter::Dt => "Dt",
            TetragonalParameter::B => "B",
        }
    }
}

/// One observed band and the level it is assigned to.
#[derive(Debug, Clone, PartialEq)]
pub struct TetragonalBand {
    /// Observed maximum (cm⁻¹).
    pub observed: f64,
    /// Upper level ("3Eg", "2B2g"), with its index when the irrep repeats ("3Eg[2]").
    pub label: String,
    /// Free-ion parent term of the upper level (None when it could not be labelled).
    pub parent: Option<Term>,
    /// Calculated energy above the ground level of the spin (cm⁻¹).
    pub calculated: f64,
    /// Observed minus calculated (cm⁻¹).
    pub residual: f64,
}

/// 1σ uncertainties of the fitted parameters (cm⁻¹), when over-determined.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct TetragonalUncertainties {
    pub dq: Option<f64>,
    pub ds: Option<f64>,
    pub dt: Option<f64>,
    pub b: Option<f64>,
}

/// One refined assignment.
#[derive(Debug, Clone, PartialEq)]
pub struct TetragonalFit {
    pub dn: usize,
    pub spin_state: SpinCandidate,
    /// The ground level of that spin at the fit ("2B1g").
    pub reference: String,
    /// Equatorial Dq(xy) (cm⁻¹).
    pub dq: f64,
    pub ds: f64,
    pub dt: f64,
    /// Racah B (cm⁻¹); None when B does not enter the bands of this spin.
    pub b: Option<f64>,
    /// C/B held in the calculation.
    pub c_over_b: f64,
    /// B used in the calculation (fitted, held, or a nominal value when B does not enter).
    pub b_used: f64,
    pub uncertainties: TetragonalUncertainties,
    pub free: Vec<TetragonalParameter>,
    /// Degrees of freedom n − p (0: exactly determined).
    pub dof: usize,
    /// Parameter combinations the bands do not fix (empty when all free parameters are
    /// determined), each as text such as "Ds + 1.25·Dt".
    pub undetermined: Vec<String>,
    /// Bands in increasing energy with their assignment.
    pub assigned: Vec<TetragonalBand>,
    /// Calculated transitions of the spin that no band was assigned to, lowest first, up to
    /// 5000 cm⁻¹ above the highest band (at most 50 000 cm⁻¹): (label, energy in cm⁻¹).
    pub unassigned: Vec<(String, f64)>,
    pub rms: f64,
    pub converged: bool,
    pub evaluations: usize,
    pub concerns: Vec<String>,
    /// rms + penalties (cm⁻¹); lower is better.
    pub score: f64,
    /// B above the free-ion B₀.
    pub unphysical: bool,
    /// Unassigned transitions of the spin below the highest observed band (bands a
    /// spectrum would have shown).
    pub skipped_below: usize,
}

impl TetragonalFit {
    /// Axial Dq(z) = Dq(xy) − (7/4)·Dt (cm⁻¹; Lever 1984).
    pub fn dq_axial(&self) -> f64 {
        self.dq - 1.75 * self.dt
    }

    /// "axial field weaker (elongated)" for Dt > 0, "axial field stronger (compressed)" for
    /// Dt < 0, "no axial difference" for Dt = 0.
    pub fn distortion(&self) -> &'static str {
        if self.dt > 1e-9 * self.dq {
            "axial field weaker than equatorial (elongated or weaker axial donors)"
        } else if self.dt < -1e-9 * self.dq {
            "axial field stronger than equatorial (compressed or stronger axial donors)"
        } else {
            "no axial difference in Dq"
        }
    }

    /// Whether the exact number of bands was given (no uncertainties).
    pub fn exact(&self) -> bool {
        self.dof == 0
    }
}

/// The result of [`fit_tetragonal`].
#[derive(Debug, Clone)]
pub struct TetragonalOutcome {
    pub best: TetragonalFit,
    /// Other refined assignments, best first, with a near-equal flag.
    pub alternatives: Vec<(TetragonalFit, bool)>,
    pub notes: Vec<String>,
}

/// Penalty (cm⁻¹) per unassigned transition below the highest observed band (a ranking
/// heuristic of this tool: a missing component may be unresolved, so it weighs less than a
/// concern).
const SKIP_PENALTY: f64 = 150.0;

/// Starting ratios Ds/Dq and Dt/Dq of the assignment grid (zero is avoided: it is the
/// octahedral point, where D₄h levels are degenerate).
const DS_RATIOS: [f64; 14] = [
    -2.0, -1.4, -0.9, -0.55, -0.3, -0.15, -0.05, 0.05, 0.15, 0.3, 0.55, 0.9, 1.4, 2.0,
];
const DT_RATIOS: [f64; 8] = [-0.4, -0.25, -0.12, -0.04, 0.04, 0.12, 0.25, 0.4];
/// Number of Dq values of the grid, spread geometrically over the bands' range.
const DQ_POINTS: usize = 16;
/// Assignments refined per spin state.
const REFINED: usize = 8;
/// B used to seed a fit when neither B nor B₀ is given (cm⁻¹; a typical 3d complex, common
/// practice).
const NOMINAL_B: f64 = 750.0;

/// The model: energies of assigned upper levels above a reference level of one spin.
struct Model {
    dn: usize,
    c_over_b: f64,
}

impl Model {
    /// The levels at one point. Every Ds/Dt ratio is a new field direction, whose parent table
    /// (the levels followed down to zero field) is a calculation of its own; the grid and the
    /// minimiser need only energies and (2S, irrep, index) keys, so only the solution asks for
    /// `parents`.
    fn spectrum(&self, dq: f64, ds: f64, dt: f64, b: f64, parents: bool) -> Option<Spectrum> {
        if !(dq.is_finite() && ds.is_finite() && dt.is_finite() && b.is_finite())
            || dq <= 0.0
            || b <= 0.0
        {
            return None;
        }
        let field = LigandField::tetragonal(dq, ds, dt);
        let calc = Calculation::new(
            self.dn,
            b,
            self.c_over_b * b,
            field,
            Geometry::Tetragonal.point_group(ds, dt),
        )
        .ok()?;
        if parents {
            calc.levels().ok()
        } else {
            calc.levels_with(&Vec::new(), true).ok()
        }
    }

    /// Energies of `keys` above `reference` (cm⁻¹).
    fn energies(
        &self,
        p: [f64; 4],
        reference: &TransitionKey,
        keys: &[TransitionKey],
    ) -> Option<Vec<f64>> {
        let s = self.spectrum(p[0], p[1], p[2], p[3], false)?;
        let e0 = reference.find(&s)?.energy;
        keys.iter()
            .map(|k| k.find(&s).map(|l| l.energy - e0))
            .collect()
    }
}

/// Cost (cm⁻²) of leaving a calculated level below the highest observed band without a band in
/// the assignment search: as much as a band missed by 1500 cm⁻¹ (a heuristic of this tool, so
/// that the search prefers the lowest-lying assignment unless the bands say otherwise).
const SKIP_COST: f64 = 1500.0 * 1500.0;

/// The one order-preserving assignment of sorted `bands` to sorted `levels` (energies) with
/// the least Σ residual² plus [`SKIP_COST`] per level passed over below the highest band:
/// returns (cost, chosen level indices).
fn best_monotone(bands: &[f64], levels: &[f64]) -> Option<(f64, Vec<usize>)> {
    let (n, m) = (bands.len(), levels.len());
    if n == 0 || n > m {
        return None;
    }
    // cost[i][j]: best cost of the first i bands using levels among the first j.
    let inf = f64::INFINITY;
    let mut cost = vec![vec![inf; m + 1]; n + 1];
    let mut take = vec![vec![false; m + 1]; n + 1];
    cost[0][0] = 0.0;
    let top = bands.last().copied().unwrap_or(0.0);
    let pass = |j: usize| if levels[j - 1] < top { SKIP_COST } else { 0.0 };
    for j in 1..=m {
        cost[0][j] = cost[0][j - 1] + pass(j);
    }
    for i in 1..=n {
        for j in i..=m {
            let skip = cost[i][j - 1] + pass(j);
            let r = bands[i - 1] - levels[j - 1];
            let use_it = cost[i - 1][j - 1] + r * r;
            if use_it <= skip {
                cost[i][j] = use_it;
                take[i][j] = true;
            } else {
                cost[i][j] = skip;
            }
        }
    }
    let mut chosen = vec![0; n];
    let (mut i, mut j) = (n, m);
    while i > 0 {
        if take[i][j] {
            chosen[i - 1] = j - 1;
            i -= 1;
        }
        j -= 1;
    }
    Some((cost[n][m], chosen))
}

/// A starting point and the assignment it suggests.
#[derive(Debug, Clone)]
struct Seed {
    p: [f64; 4],
    reference: TransitionKey,
    keys: Vec<TransitionKey>,
    cost: f64,
}

/// Fits Dq, Ds, Dt (and B) to split bands; see the module documentation.
///
/// Errors ([`Error::InvalidParameter`], exit code 2): d^n outside 1..=9; no bands or bad
/// values; fewer bands than free parameters (the message says what to hold); more bands than
/// the spin state has transitions. [`Error::Computation`] (exit code 1) when no assignment
/// could be refined.
pub fn fit_tetragonal(req: &TetragonalRequest) -> Result<TetragonalOutcome> {
    if !(1..=9).contains(&req.dn) {
        return Err(Error::invalid(
            Param::DElectronCount,
            req.dn,
            "1..=9 (d0 and d10 have no d–d bands)",
        ));
    }
    if req.bands.is_empty() {
        return Err(Error::invalid(
            Param::Bands,
            "none",
            "at least three band maxima",
        ));
    }
    for &nu in &req.bands {
        require_finite(Param::Band, nu)?;
        if nu <= 0.0 {
            return Err(Error::invalid(
                Param::Band,
                nu,
                "a positive position in cm⁻¹",
            ));
        }
    }
    if let Some(b) = req.fixed_b {
        if !(b.is_finite() && POSSIBLE_B.0 <= b && b <= POSSIBLE_B.1) {
            return Err(Error::invalid(
                Param::FixedB,
                b,
                format!("{}..={} cm⁻¹", POSSIBLE_B.0, POSSIBLE_B.1),
            ));
        }
    }
    if let Some(b0) = req.b0 {
        super::fit::check_b0(b0)?;
    }
    let (default_ratio, _) = default_c_over_b(req.dn);
    let c_over_b = req.c_over_b.unwrap_or(default_ratio);
    if !(c_over_b.is_finite() && (1.0..=20.0).contains(&c_over_b)) {
        return Err(Error::invalid(Param::COverB, c_over_b, "1..=20"));
    }
    let mut bands = req.bands.clone();
    bands.sort_by(f64::total_cmp);
    let states = spin_states(req.dn, Geometry::Octahedral, c_over_b)?;
    let chosen = select_spin(&states, req.spin);
    let mut notes = Vec::new();
    let mut fits: Vec<TetragonalFit> = Vec::new();
    let mut first_error: Option<Error> = None;
    for state in chosen {
        match fit_spin(req, &bands, state, c_over_b) {
            Ok(mut f) => fits.append(&mut f),
            Err(e) => {
                if states.len() > 1 && req.spin == SpinChoice::Auto {
                    notes.push(format!("{}: {e}", state.describe()));
                }
                first_error.get_or_insert(e);
            }
        }
    }
    if fits.is_empty() {
        return Err(first_error.unwrap_or_else(|| {
            Error::Computation("no assignment of the bands could be refined".into())
        }));
    }
    fits.sort_by(|a, b| a.score.total_cmp(&b.score));
    // Among fits within the near-equal tolerance of the best score and without concerns, the
    // lead is chosen by stated preferences: a Jahn–Teller ion elongated rather than compressed
    // (elongation is by far the commoner, common practice), then the least distortion
    // (|Ds| + |Dt|)/Dq. An unphysical fit (β > 1) is never the lead while another exists.
    let tolerance = near_equal_tolerance(fits[0].rms);
    let top = fits[0].score;
    let jahn_teller = matches!((req.dn, fits[0].spin_state.two_s), (9, 1) | (4, 4) | (7, 1));
    let key = |f: &TetragonalFit| {
        let compressed = jahn_teller && f.dt < 0.0;
        (compressed, (f.ds.abs() + f.dt.abs()) / f.dq)
    };
    let lead = fits
        .iter()
        .enumerate()
        .filter(|(_, f)| !f.unphysical && f.concerns.is_empty() && f.score <= top + tolerance)
        .min_by(|(_, a), (_, b)| {
            let (ka, kb) = (key(a), key(b));
            ka.0.cmp(&kb.0).then(ka.1.total_cmp(&kb.1))
        })
        .map(|(i, _)| i)
        .or_else(|| fits.iter().position(|f| !f.unphysical))
        .unwrap_or(0);
    let best = fits.remove(lead);
    let alternatives: Vec<(TetragonalFit, bool)> = fits
        .into_iter()
        .map(|f| {
            let near = !f.unphysical && f.concerns.is_empty() && f.score <= top + tolerance;
            (f, near)
        })
        .collect();
    let near = alternatives.iter().filter(|(_, n)| *n).count();
    if near > 0 {
        notes.push(format!(
            "{} other assignment(s) reproduce the bands about as well; the one shown is preferred as {}. polarised single-crystal spectra decide between them",
            near,
            if jahn_teller {
                "an elongation (commoner for a Jahn–Teller ion), then the least distortion"
            } else {
                "the least distortion (|Ds| + |Dt|)/Dq"
            }
        ));
    }
    if !best.undetermined.is_empty() {
        notes.push(format!(
            "the bands do not determine every free parameter: {} stay free",
            best.undetermined.join("; ")
        ));
    }
    Ok(TetragonalOutcome {
        best,
        alternatives,
        notes,
    })
}

/// Whether B enters the transitions of spin `two_s`, tested numerically at a typical
/// distorted point.
fn b_enters(dn: usize, two_s: i32, c_over_b: f64) -> Result<bool> {
    let energies = |b: f64| -> Result<Vec<f64>> {
        let field = LigandField::tetragonal(1500.0, 300.0, 100.0);
        let calc = Calculation::new(
            dn,
            b,
            c_over_b * b,
            field,
            Geometry::Tetragonal.point_group(300.0, 100.0),
        )?;
        Ok(band_manifold(&calc.levels()?, two_s)
            .map(|m| m.transitions.iter().map(|t| t.energy).collect())
            .unwrap_or_default())
    };
    let (a, b) = (energies(800.0)?, energies(880.0)?);
    Ok(a.len() != b.len()
        || a.iter()
            .zip(&b)
            .any(|(x, y)| (x - y).abs() > 1e-6 * (1.0 + x.abs())))
}

/// Grid search and refinement for one spin state.
fn fit_spin(
    req: &TetragonalRequest,
    bands: &[f64],
    state: SpinCandidate,
    c_over_b: f64,
) -> Result<Vec<TetragonalFit>> {
    use TetragonalParameter as P;
    let with_b = b_enters(req.dn, state.two_s, c_over_b)?;
    let mut free = vec![P::Dq, P::Ds, P::Dt];
    if with_b && req.fixed_b.is_none() {
        free.push(P::B);
    }
    let n = bands.len();
    if n < free.len() {
        let names: Vec<&str> = free.iter().map(|p| p.name()).collect();
        let (hint, needs) = if free.contains(&P::B) {
            (
                "; or hold B, e.g. at the octahedral parent's value",
                vec![Param::FixedB],
            )
        } else {
            (
                "; with fewer, fit the octahedral model to the band centroids",
                vec![],
            )
        };
        return Err(Error::invalid(
            Param::Bands,
            format!("{n} for {}", state.describe()),
            format!(
                "at least {} to determine {}{hint}",
                free.len(),
                names.join(", ")
            ),
        )
        .needing(needs));
    }
    let b_seed = req
        .fixed_b
        .or(req.b0.map(|b0| 0.75 * b0))
        .unwrap_or(NOMINAL_B);
    let model = Model {
        dn: req.dn,
        c_over_b,
    };
    // The grid: each distinct assignment keeps its best starting point.
    let (lo, hi) = (bands[0] / 25.0, bands[n - 1] / 5.0);
    let mut seeds: Vec<Seed> = Vec::new();
    let mut most_levels = 0;
    for k in 0..DQ_POINTS {
        let dq = lo * (hi / lo).powf(k as f64 / (DQ_POINTS - 1) as f64);
        for &rs in &DS_RATIOS {
            for &rt in &DT_RATIOS {
                let (ds, dt) = (rs * dq, rt * dq);
                let Some(s) = model.spectrum(dq, ds, dt, b_seed, false) else {
                    continue;
                };
                // Only points where the assumed spin is the ground state seed a fit.
                if s.ground().two_s != state.two_s {
                    continue;
                }
                let Some(m) = band_manifold(&s, state.two_s) else {
                    continue;
                };
                most_levels = most_levels.max(m.transitions.len());
                let levels: Vec<f64> = m.transitions.iter().map(|t| t.energy).collect();
                let Some((cost, idx)) = best_monotone(bands, &levels) else {
                    continue;
                };
                let keys: Vec<TransitionKey> =
                    idx.iter().map(|&i| m.transitions[i].key.clone()).collect();
                match seeds
                    .iter_mut()
                    .find(|x| x.reference == m.reference && x.keys == keys)
                {
                    Some(x) if x.cost <= cost => {}
                    Some(x) => {
                        x.cost = cost;
                        x.p = [dq, ds, dt, b_seed];
                    }
                    None => seeds.push(Seed {
                        p: [dq, ds, dt, b_seed],
                        reference: m.reference.clone(),
                        keys,
                        cost,
                    }),
                }
            }
        }
    }
    if seeds.is_empty() {
        return Err(Error::invalid(
            Param::Bands,
            format!("{n} for {}", state.describe()),
            format!(
                "at most {most_levels} (the spin-allowed transitions of this spin in a tetragonal field)"
            ),
        ));
    }
    seeds.sort_by(|a, b| a.cost.total_cmp(&b.cost));
    seeds.truncate(REFINED);
    let mut out = Vec::new();
    for seed in &seeds {
        if let Some(f) = refine(req, bands, state, &model, &free, seed, with_b)? {
            out.push(f);
        }
    }
    Ok(out)
}

/// Parameters in the minimiser's space: ln Dq, Ds/S, Dt/S, ln B with S the seed's Dq.
struct Space {
    free: Vec<TetragonalParameter>,
    scale: f64,
    fixed: [f64; 4],
}

impl Space {
    fn natural(&self, u: &DVector<f64>) -> [f64; 4] {
        let mut p = self.fixed;
        for (k, q) in self.free.iter().enumerate() {
            match q {
                TetragonalParameter::Dq => p[0] = u[k].exp(),
                TetragonalParameter::Ds => p[1] = u[k] * self.scale,
                TetragonalParameter::Dt => p[2] = u[k] * self.scale,
                TetragonalParameter::B => p[3] = u[k].exp(),
            }
        }
        p
    }

    fn internal(&self, p: [f64; 4]) -> DVector<f64> {
        DVector::from_iterator(
            self.free.len(),
            self.free.iter().map(|q| match q {
                TetragonalParameter::Dq => p[0].ln(),
                TetragonalParameter::Ds => p[1] / self.scale,
                TetragonalParameter::Dt => p[2] / self.scale,
                TetragonalParameter::B => p[3].ln(),
            }),
        )
    }
}

fn index_of(q: TetragonalParameter) -> usize {
    match q {
        TetragonalParameter::Dq => 0,
        TetragonalParameter::Ds => 1,
        TetragonalParameter::Dt => 2,
        TetragonalParameter::B => 3,
    }
}

/// Refines one assignment; None when the model cannot be evaluated along the way.
fn refine(
    req: &TetragonalRequest,
    bands: &[f64],
    state: SpinCandidate,
    model: &Model,
    free: &[TetragonalParameter],
    seed: &Seed,
    with_b: bool,
) -> Result<Option<TetragonalFit>> {
    let space = Space {
        free: free.to_vec(),
        scale: seed.p[0],
        fixed: seed.p,
    };
    let residual = |u: &DVector<f64>| -> Option<DVector<f64>> {
        let e = model.energies(space.natural(u), &seed.reference, &seed.keys)?;
        Some(DVector::from_iterator(
            e.len(),
            e.iter().zip(bands).map(|(c, o)| c - o),
        ))
    };
    let problem = Residuals::new(residual, space.internal(seed.p), 1e-6);
    if !problem.evaluates() {
        return Ok(None);
    }
    let (solved, report) = problem.minimize(
        LevenbergMarquardt::new()
            .with_ftol(1e-12)
            .with_xtol(1e-12)
            .with_gtol(1e-12)
            .with_patience(req.patience.unwrap_or(DEFAULT_PATIENCE).max(1)),
    );
    let converged = converged(&report.termination);
    let p = space.natural(&solved);
    let Some(spectrum) = model.spectrum(p[0], p[1], p[2], p[3], true) else {
        return Ok(None);
    };
    let Some(manifold) = band_manifold(&spectrum, state.two_s) else {
        return Ok(None);
    };
    let Some(e0) = seed.reference.find(&spectrum).map(|l| l.energy) else {
        return Ok(None);
    };
    let mut assigned = Vec::new();
    for (key, &obs) in seed.keys.iter().zip(bands) {
        let Some(level) = key.find(&spectrum) else {
            return Ok(None);
        };
        let calculated = level.energy - e0;
        let label = manifold
            .get(key)
            .map(|t| t.label.clone())
            .unwrap_or_else(|| key.label());
        assigned.push(TetragonalBand {
            observed: obs,
            label,
            parent: level.parent,
            calculated,
            residual: obs - calculated,
        });
    }
    // Unassigned transitions up to 5000 cm⁻¹ above the highest band (at most 50 000 cm⁻¹).
    let ceiling = (bands[bands.len() - 1] + 5000.0).min(50_000.0);
    let unassigned = manifold
        .transitions
        .iter()
        .filter(|t| !seed.keys.contains(&t.key) && t.energy <= ceiling)
        .map(|t| (t.label.clone(), t.energy))
        .collect();
    let n = bands.len();
    let rss: f64 = assigned.iter().map(|a| a.residual * a.residual).sum();
    let rms = (rss / n as f64).sqrt();
    let dof = n - free.len();

    // Natural-parameter Jacobian for the rank test and the covariance.
    let jac = natural_jacobian(model, seed, p, free);
    let mut undetermined = Vec::new();
    let mut unc = TetragonalUncertainties::default();
    if let Some(j) = &jac {
        undetermined = null_combinations(j, free);
        if dof > 0 && undetermined.is_empty() {
            let s2 = rss / dof as f64;
            if let Some(inv) = (j.transpose() * j).try_inverse() {
                for (k, q) in free.iter().enumerate() {
                    let sd = (s2 * inv[(k, k)]).max(0.0).sqrt();
                    let v = Some(sd);
                    match q {
                        TetragonalParameter::Dq => unc.dq = v,
                        TetragonalParameter::Ds => unc.ds = v,
                        TetragonalParameter::Dt => unc.dt = v,
                        TetragonalParameter::B => unc.b = v,
                    }
                }
            }
        }
    } else {
        undetermined.push("the Jacobian could not be evaluated at the solution".into());
    }

    let mut concerns = Vec::new();
    let ground_two_s = spectrum.ground().two_s;
    if ground_two_s != state.two_s {
        concerns.push(format!(
            "the fitted field makes the S = {} state the ground state",
            spin_text(ground_two_s)
        ));
    }
    if manifold.reference != seed.reference {
        concerns.push(format!(
            "the fitted field makes {} the lowest level of this spin, not {}",
            manifold.reference_label,
            seed.reference.label()
        ));
    }
    let b_fit = (with_b && req.fixed_b.is_none()).then_some(p[3]);
    if let Some(b) = b_fit {
        if !(PLAUSIBLE_B.0..=PLAUSIBLE_B.1).contains(&b) {
            concerns.push(format!(
                "B = {b:.0} cm⁻¹ lies outside the usual {:.0}–{:.0} cm⁻¹",
                PLAUSIBLE_B.0, PLAUSIBLE_B.1
            ));
        }
    }
    let unphysical = matches!((b_fit, req.b0), (Some(b), Some(b0)) if b > b0);
    if unphysical {
        concerns.push("B exceeds the free-ion B₀ (β > 1): unphysical".into());
    }
    let dq_axial = p[0] - 1.75 * p[2];
    if dq_axial <= 0.0 {
        concerns.push(format!(
            "axial Dq(z) = Dq − 7Dt/4 = {dq_axial:.0} cm⁻¹ is not positive: unphysical"
        ));
    }
    // Axial−equatorial differences in the angular overlap model (trans-MA4B2, A on x and y, B on
    // z): 4Ds + 5Dt = 2δσ and 3Ds − 5Dt = 2δπ with δ = e(A) − e(B) (Larsen & La Mar 1974;
    // derived here from the D4h orbital energies). One weaker (or stronger) axial donor makes
    // δσ and δπ of one sign, with |δπ| ≤ |δσ| since eπ < eσ (common practice).
    let (d_sigma, d_pi) = aom_differences(p[1], p[2]);
    let slack = 0.02 * 10.0 * p[0];
    let opposite = d_sigma * d_pi < 0.0 && d_pi.abs().min(d_sigma.abs()) > slack;
    if opposite || d_pi.abs() > d_sigma.abs() + slack {
        concerns.push(format!(
            "δσ = {d_sigma:.0} and δπ = {d_pi:.0} cm⁻¹ (axial minus equatorial, angular overlap model) are not those of one weaker or stronger axial donor"
        ));
    }
    let far = assigned
        .iter()
        .any(|a| a.residual.abs() > FAR_ABSOLUTE.max(FAR_FRACTION * a.observed));
    if far {
        concerns.push(format!(
            "a band is more than {FAR_ABSOLUTE:.0} cm⁻¹ and {:.0} % from its transition",
            100.0 * FAR_FRACTION
        ));
    }
    if !converged {
        concerns.push(format!("the minimiser stopped: {:?}", report.termination));
    }
    let top = bands[n - 1];
    let skipped_below = manifold
        .transitions
        .iter()
        .filter(|t| !seed.keys.contains(&t.key) && t.energy < top)
        .count();
    let score = rms + CONCERN_PENALTY * concerns.len() as f64 + SKIP_PENALTY * skipped_below as f64;
    Ok(Some(TetragonalFit {
        dn: req.dn,
        spin_state: state,
        reference: seed.reference.label(),
        dq: p[0],
        ds: p[1],
        dt: p[2],
        b: with_b.then_some(p[3]),
        c_over_b: model.c_over_b,
        b_used: p[3],
        uncertainties: unc,
        free: free.to_vec(),
        dof,
        undetermined,
        assigned,
        unassigned,
        rms,
        converged,
        evaluations: report.number_of_evaluations,
        concerns,
        score,
        unphysical,
        skipped_below,
    }))
}

/// (δσ, δπ) = equatorial minus axial e_σ and e_π (cm⁻¹) of a trans-MA4B2 centre with Ds, Dt:
/// 4Ds + 5Dt = 2δσ, 3Ds − 5Dt = 2δπ (angular overlap model).
pub fn aom_differences(ds: f64, dt: f64) -> (f64, f64) {
    ((4.0 * ds + 5.0 * dt) / 2.0, (3.0 * ds - 5.0 * dt) / 2.0)
}

fn spin_text(two_s: i32) -> String {
    if two_s % 2 == 0 {
        format!("{}", two_s / 2)
    } else {
        format!("{two_s}/2")
    }
}

/// ∂E/∂p of the assigned bands in natural parameters (cm⁻¹ per cm⁻¹), central differences.
fn natural_jacobian(
    model: &Model,
    seed: &Seed,
    p: [f64; 4],
    free: &[TetragonalParameter],
) -> Option<DMatrix<f64>> {
    let n = seed.keys.len();
    let mut j = DMatrix::zeros(n, free.len());
    for (k, &q) in free.iter().enumerate() {
        let i = index_of(q);
        let h = 1e-5 * p[0].max(p[3]);
        let mut up = p;
        let mut down = p;
        up[i] += h;
        down[i] -= h;
        let eu = DVector::from_vec(model.energies(up, &seed.reference, &seed.keys)?);
        let ed = DVector::from_vec(model.energies(down, &seed.reference, &seed.keys)?);
        j.set_column(k, &((eu - ed) / (2.0 * h)));
    }
    Some(j)
}

/// Combinations of free parameters along which the bands do not change (right singular
/// vectors of J with a singular value below 10⁻⁶ of the largest), as text.
fn null_combinations(j: &DMatrix<f64>, free: &[TetragonalParameter]) -> Vec<String> {
    let p = free.len();
    // Pad to a square system when there are fewer rows than columns.
    let mut m = DMatrix::zeros(j.nrows().max(p), p);
    m.view_mut((0, 0), (j.nrows(), p)).copy_from(j);
    let svd = m.svd(false, true);
    let Some(vt) = svd.v_t else {
        return vec!["the singular-value decomposition failed".into()];
    };
    let largest = svd.singular_values.max();
    let mut out = Vec::new();
    for (k, &s) in svd.singular_values.iter().enumerate() {
        if s > 1e-6 * largest.max(1e-300) {
            continue;
        }
        let v = vt.row(k);
        let lead = (0..p)
            .max_by(|&a, &b| v[a].abs().total_cmp(&v[b].abs()))
            .unwrap_or(0);
        let terms: Vec<String> = (0..p)
            .filter(|&i| v[i].abs() > 1e-3 * v[lead].abs())
            .map(|i| {
                let c = v[i] / v[lead];
                if (c - 1.0).abs() < 1e-9 {
                    free[i].name().to_string()
                } else {
                    format!("{:+.3}·{}", c, free[i].name())
                }
            })
            .collect();
        out.push(terms.join(" "));
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn monotone_assignment_picks_nearest_in_order() {
        let (cost, idx) = best_monotone(&[10.0, 30.0], &[9.0, 31.0, 40.0]).unwrap();
        assert_eq!(idx, vec![0, 1]);
        assert!((cost - 2.0).abs() < 1e-12);
        // Passing over a level below the highest band costs SKIP_COST: a 10 cm⁻¹ miss is
        // preferred to a skip.
        let (cost, idx) = best_monotone(&[10.0, 30.0], &[9.0, 20.0, 31.0]).unwrap();
        assert_eq!(idx, vec![0, 1]);
        assert!((cost - 101.0).abs() < 1e-9);
        let (_, idx) = best_monotone(&[10.0, 3000.0], &[9.0, 1000.0, 3001.0]).unwrap();
        assert_eq!(idx, vec![0, 2]);
        assert!(best_monotone(&[1.0, 2.0, 3.0], &[1.0, 2.0]).is_none());
    }
}
