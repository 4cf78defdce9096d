//! Least squares: seeds from the assignment search, Levenberg-Marquardt refinement in logarithmic
//! parameters, the Jacobian and the covariance.

use super::*;
use crate::error::Result;
use crate::least_squares::Residuals;
use crate::spectra::assign::{self, BSeed, Seed};
use crate::spectra::count::DEFAULT_WINDOW_NM;
use crate::spectra::transitions::{
    calculation, jumps, Jump, SpinCandidate, Transition, TransitionKey,
};
use levenberg_marquardt::{LevenbergMarquardt, TerminationReason};
use nalgebra::{DMatrix, DVector};

/// Step of the central differences in log parameters.
pub(super) const LOG_STEP: f64 = 1e-6;

/// Whether the minimiser's stop counts as converged: its own success criteria, or tolerances
/// already at machine precision.
pub(crate) fn converged(t: &TerminationReason) -> bool {
    t.was_successful() || matches!(t, TerminationReason::NoImprovementPossible(_))
}

/// Jacobian of the energies of `keys` with respect to the natural free parameters (cm⁻¹ per
/// cm⁻¹), by central differences of relative step 10⁻⁵.
pub(super) fn natural_jacobian(
    model: &Model,
    spec: &Spec,
    dq: f64,
    b: f64,
    c: f64,
) -> Option<DMatrix<f64>> {
    let n = model.keys.len() + model.forbidden.len();
    let mut j = DMatrix::zeros(n, spec.free.len());
    for (k, p) in spec.free.iter().enumerate() {
        let value = match p {
            FitParameter::Dq => dq,
            FitParameter::B => b,
            FitParameter::C => c,
        };
        let h = 1e-5 * value;
        let at = |delta: f64| {
            let (mut d, mut bb, mut cc) = (dq, b, c);
            match p {
                FitParameter::Dq => d += delta,
                FitParameter::B => {
                    bb += delta;
                    if !spec.free.contains(&FitParameter::C) {
                        cc = spec.c_over_b * bb;
                    }
                }
                FitParameter::C => cc += delta,
            }
            model.energies(d, bb, cc)
        };
        let up = DVector::from_vec(at(h)?);
        let down = DVector::from_vec(at(-h)?);
        j.set_column(k, &((up - down) / (2.0 * h)));
    }
    Some(j)
}

/// Grid seeds for one spin state, with C/B values to try.
pub(super) fn seeds_for(
    req: &FitRequest,
    bands: &[f64],
    state: SpinCandidate,
    ratios: &[f64],
    b_seed: BSeed,
) -> Result<Vec<Seed>> {
    let mut all = Vec::new();
    for &r in ratios {
        let g = assign::grid(req.dn, req.geometry, state.two_s, r)?;
        let cands = assign::candidates(&g, bands.len(), 8);
        all.extend(assign::seeds(&g, &cands, bands, b_seed, r));
    }
    all.sort_by(|a, b| a.rss.total_cmp(&b.rss));
    // Keep the best seed of each assignment.
    let mut unique: Vec<Seed> = Vec::new();
    for s in all {
        if !unique.iter().any(|u| u.keys == s.keys) {
            unique.push(s);
        }
    }
    Ok(unique)
}

/// Refines one seed with Levenberg–Marquardt and evaluates the result. None when the model
/// cannot be evaluated at the seed (a transition of the assignment is missing there).
#[allow(clippy::too_many_arguments)]
pub(super) fn refine(
    req: &FitRequest,
    bands: &[f64],
    state: SpinCandidate,
    states: &[SpinCandidate],
    spec: &Spec,
    seed: &Seed,
    fixed: &[FixedParameter],
    (b_enters, c_enters): (bool, bool),
) -> Result<Option<BandFit>> {
    let b0 = if spec.free.contains(&FitParameter::B) {
        seed.b
    } else {
        spec.b_fixed
    };
    let dq0 = seed.x * seed.b / 10.0;
    // The upper level of each spin-forbidden band, chosen at the seed's field.
    let forbidden_keys = if req.forbidden.is_empty() {
        Vec::new()
    } else {
        let spectrum = calculation(req.dn, req.geometry, dq0, b0, seed.c_over_b * b0)?.levels()?;
        req.forbidden
            .iter()
            .map(|f| forbidden_target(&spectrum, state, f, req))
            .collect::<Result<Vec<_>>>()?
    };
    let model = Model {
        dn: req.dn,
        geometry: req.geometry,
        two_s: state.two_s,
        keys: &seed.keys,
        forbidden: &forbidden_keys,
    };
    let observed: Vec<f64> = bands
        .iter()
        .copied()
        .chain(req.forbidden.iter().map(|f| f.position))
        .collect();
    let bands = &observed[..seed.keys.len()];
    let mut spec = spec.clone();
    if !spec.free.contains(&FitParameter::B) && !b_enters {
        // B does not enter: express the seed's Δ with the nominal B.
        spec.b_fixed = 1000.0;
    }
    let u0 = spec.log_params(dq0, b0, seed.c_over_b * b0);
    let problem = Residuals::new(
        |u: &DVector<f64>| band_residuals(&model, &spec, &observed, u),
        u0,
        LOG_STEP,
    );
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
    let ok = converged(&report.termination) && report.objective_function.is_finite();
    let (dq, b, c) = spec.natural(&solved);
    // One calculation at the solution serves the assignment, the spin-forbidden bands and the
    // one-/two-electron analysis.
    let Some((m, spectrum, solution_calc)) = model.solved(dq, b, c) else {
        return Ok(None);
    };
    // Assigned bands, in band order (bands are sorted).
    let mut assigned = Vec::new();
    for (key, &obs) in seed.keys.iter().zip(bands) {
        let Some(t) = m.get(key) else {
            return Ok(None);
        };
        assigned.push(AssignedBand {
            observed: obs,
            transition: t.clone(),
            residual: obs - t.energy,
            jump: Jump::unknown(),
        });
    }
    // Spin-forbidden bands, in input order.
    let mut forbidden_assigned = Vec::new();
    if !forbidden_keys.is_empty() {
        let Some(reference) = m.reference.find(&spectrum).map(|l| l.energy) else {
            return Ok(None);
        };
        for (key, f) in forbidden_keys.iter().zip(&req.forbidden) {
            let Some(level) = key.find(&spectrum) else {
                return Ok(None);
            };
            let energy = level.energy - reference;
            forbidden_assigned.push(AssignedBand {
                observed: f.position,
                transition: Transition {
                    key: key.clone(),
                    label: level.label(),
                    parent: level.parent,
                    energy,
                    degeneracy: level.degeneracy,
                },
                residual: f.position - energy,
                jump: Jump::unknown(),
            });
        }
    }
    let n = bands.len() + forbidden_assigned.len();
    let rss: f64 = assigned
        .iter()
        .chain(&forbidden_assigned)
        .map(|a| a.residual.powi(2))
        .sum();
    let rms = (rss / n as f64).sqrt();

    // Strong-field configurations: one-electron vs two-electron jumps.
    let all_jumps = jumps(&solution_calc, req.geometry, &spectrum, &m)?;
    let jump_of = |key: &TransitionKey| -> Jump {
        m.transitions
            .iter()
            .position(|t| &t.key == key)
            .map(|i| all_jumps[i])
            .unwrap_or(Jump::unknown())
    };
    for a in &mut assigned {
        a.jump = jump_of(&a.transition.key);
    }
    let top = bands.iter().cloned().fold(0.0, f64::max);
    // A strong band counts as missing only where it could have been seen: inside the default
    // window (from 1100 nm) or above the lowest observed band, and below the highest.
    let low_edge = (1e7 / DEFAULT_WINDOW_NM.1).min(bands[0]);
    let ceiling = (top + 5000.0).max(50_000.0);
    let predicted: Vec<PredictedBand> = m
        .transitions
        .iter()
        .filter(|t| !seed.keys.contains(&t.key) && t.energy <= ceiling)
        .map(|t| PredictedBand {
            transition: t.clone(),
            jump: jump_of(&t.key),
        })
        .collect();

    // Uncertainties.
    let p = spec.free.len();
    let (determination, variance, unc) = if n > p {
        let s2 = rss / (n - p) as f64;
        let unc = natural_jacobian(&model, &spec, dq, b, c)
            .and_then(|j| (j.transpose() * &j).try_inverse())
            .map(|inv| covariance_to_sigmas(&spec.free, &(inv * s2), dq, b));
        (Determination::Over { dof: n - p }, Some(s2), unc)
    } else {
        (Determination::Exact, None, None)
    };
    let mut concerns = Vec::new();
    if n > p && unc.is_none() {
        concerns.push("JᵀJ is singular: the parameters are not separately determined".into());
    }
    let skipped: Vec<&PredictedBand> = predicted
        .iter()
        .filter(|pb| {
            !pb.jump.weak && pb.transition.energy >= low_edge && pb.transition.energy < top
        })
        .collect();
    for s in &skipped {
        concerns.push(format!(
            "a band expected to be strong, {}, is predicted at {:.0} cm⁻¹, inside the observed range, but not assigned",
            s.transition.label, s.transition.energy
        ));
    }
    if b_enters && !(PLAUSIBLE_B.0..=PLAUSIBLE_B.1).contains(&b) {
        concerns.push(format!(
            "B = {b:.0} cm⁻¹ is outside the plausible {:.0}–{:.0} cm⁻¹",
            PLAUSIBLE_B.0, PLAUSIBLE_B.1
        ));
    }
    let unphysical = b_enters && req.b0.is_some_and(|b0| b > b0);
    if unphysical {
        concerns.push(format!(
            "B = {b:.0} cm⁻¹ is above the free-ion B₀ = {:.0} cm⁻¹ (β = {:.2} > 1): unphysical, since bonding only lowers B (the nephelauxetic effect; C. K. Jørgensen 1962)",
            req.b0.unwrap_or(f64::NAN),
            b / req.b0.unwrap_or(f64::NAN)
        ));
    }
    if spec.free.contains(&FitParameter::C)
        && !(PLAUSIBLE_C_OVER_B.0..=PLAUSIBLE_C_OVER_B.1).contains(&(c / b))
    {
        concerns.push(format!(
            "C/B = {:.2} is outside the usual {:.0}–{:.0}",
            c / b,
            PLAUSIBLE_C_OVER_B.0,
            PLAUSIBLE_C_OVER_B.1
        ));
    }
    let calc = calculation(req.dn, req.geometry, dq, b, c)?;
    let lows = calc.lowest_by_spin()?;
    let ground_two_s = calc.ground_two_s()?;
    let own = lows.iter().find(|(s, _)| *s == state.two_s).map(|l| l.1);
    let spin_gap = own.and_then(|own| {
        states
            .iter()
            .filter(|s| s.two_s != state.two_s)
            .filter_map(|s| lows.iter().find(|(t, _)| *t == s.two_s).map(|l| l.1 - own))
            .min_by(|a, b| a.abs().total_cmp(&b.abs()))
    });
    if ground_two_s != state.two_s {
        concerns.push(format!(
            "at the fitted field the ground state has 2S+1 = {}, not the assumed {}",
            ground_two_s + 1,
            state.multiplicity()
        ));
    }
    let score = rms + CONCERN_PENALTY * concerns.len() as f64;
    let skipped_below = predicted
        .iter()
        .filter(|pb| !pb.jump.weak && pb.transition.energy < top)
        .count();
    Ok(Some(BandFit {
        dn: req.dn,
        geometry: req.geometry,
        spin_state: state,
        reference: m.reference_label.clone(),
        dq,
        b: b_enters.then_some(b),
        c: (c_enters || spec.free.contains(&FitParameter::C)).then_some(c),
        c_over_b: c / b,
        uncertainties: unc.unwrap_or_default(),
        free: spec.free.clone(),
        fixed: fixed.to_vec(),
        determination,
        residual_variance: variance,
        assigned,
        forbidden: forbidden_assigned,
        predicted,
        rms,
        ground_two_s,
        spin_gap,
        converged: ok,
        termination: format!("{:?}", report.termination),
        evaluations: report.number_of_evaluations,
        concerns,
        score,
        skipped_below,
        unphysical,
    }))
}

/// 1σ of Dq, B, C and Δ/B from the covariance of the free parameters.
pub(super) fn covariance_to_sigmas(
    free: &[FitParameter],
    cov: &DMatrix<f64>,
    dq: f64,
    b: f64,
) -> Uncertainties {
    let idx = |p: FitParameter| free.iter().position(|f| *f == p);
    let sd = |i: Option<usize>| i.map(|i| cov[(i, i)].max(0.0).sqrt());
    let (i_dq, i_b, i_c) = (
        idx(FitParameter::Dq),
        idx(FitParameter::B),
        idx(FitParameter::C),
    );
    // Δ/B = 10Dq/B: gradient (10/B, −10Dq/B²).
    let delta_over_b = i_dq.map(|a| {
        let g_dq = 10.0 / b;
        match i_b {
            Some(bi) => {
                let g_b = -10.0 * dq / (b * b);
                (g_dq * g_dq * cov[(a, a)]
                    + g_b * g_b * cov[(bi, bi)]
                    + 2.0 * g_dq * g_b * cov[(a, bi)])
                    .max(0.0)
                    .sqrt()
            }
            None => g_dq * cov[(a, a)].max(0.0).sqrt(),
        }
    });
    Uncertainties {
        dq: sd(i_dq),
        b: sd(i_b),
        c: sd(i_c),
        delta_over_b,
    }
}
