//! Fit of Dq, B (and C) to observed d–d band maxima with the full d^n calculation.
//!
//! For each spin state tried, the observed bands are assigned to calculated spin-allowed
//! transitions by a grid search over Δ/B ([`super::assign`]); the best assignments are refined by
//! Levenberg–Marquardt least squares (crate `levenberg-marquardt`) on the full engine, with
//! parameters taken as logarithms so that Dq, B and C stay positive. Uncertainties come from the
//! covariance s²(JᵀJ)⁻¹, J the Jacobian in Dq, B, C at the optimum and s² the residual variance,
//! when there are more bands than free parameters.

use crate::engine::Geometry;
use crate::error::{require_finite, Error, Result};
use crate::param::Param;
use crate::spectra::assign::{BSeed, Seed, MAX_DELTA_OVER_B};
use crate::spectra::transitions::{
    band_manifold, calculation, default_c_over_b, select_spin, spin_states, Jump, SpinCandidate,
    SpinChoice, Transition,
};

mod derived;
mod minimise;
mod problem;
mod ranking;

pub use derived::*;
pub(crate) use minimise::*;
pub use problem::*;
pub use ranking::*;

/// How many bands there were for the free parameters.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Determination {
    /// As many bands as free parameters: the bands are reproduced exactly, no uncertainties.
    Exact,
    /// More bands than free parameters, with this many degrees of freedom.
    Over { dof: usize },
}

/// One observed band and the transition assigned to it.
#[derive(Debug, Clone, PartialEq)]
pub struct AssignedBand {
    /// Observed maximum (cm⁻¹).
    pub observed: f64,
    /// The transition at the fitted parameters.
    pub transition: Transition,
    /// Observed minus calculated (cm⁻¹).
    pub residual: f64,
    /// Strong-field configuration change.
    pub jump: Jump,
}

/// A calculated transition that no observed band was assigned to.
#[derive(Debug, Clone, PartialEq)]
pub struct PredictedBand {
    pub transition: Transition,
    pub jump: Jump,
}

/// Standard uncertainties (1σ) of the fitted parameters, when over-determined.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Uncertainties {
    pub dq: Option<f64>,
    pub b: Option<f64>,
    pub c: Option<f64>,
    pub delta_over_b: Option<f64>,
}

/// One fitted assignment.
#[derive(Debug, Clone, PartialEq)]
pub struct BandFit {
    pub dn: usize,
    pub geometry: Geometry,
    /// The spin state assumed: bands are transitions from its lowest level.
    pub spin_state: SpinCandidate,
    /// Label of the lowest level of that spin ("4A2g").
    pub reference: String,
    /// Dq (cm⁻¹); Δ = 10Dq.
    pub dq: f64,
    /// Racah B (cm⁻¹); None when B does not enter the spin-allowed bands.
    pub b: Option<f64>,
    /// Racah C (cm⁻¹); None when C does not enter the spin-allowed bands.
    pub c: Option<f64>,
    /// C/B used in the calculation: fitted, given, or the default (also when C does not enter
    /// the bands; it still sets the positions of levels of other spin).
    pub c_over_b: f64,
    pub uncertainties: Uncertainties,
    /// Free parameters, in fit order.
    pub free: Vec<FitParameter>,
    pub fixed: Vec<FixedParameter>,
    pub determination: Determination,
    /// Residual variance s² = Σr²/(n − p) (cm⁻²), when over-determined.
    pub residual_variance: Option<f64>,
    /// Bands in increasing energy with their assignment.
    pub assigned: Vec<AssignedBand>,
    /// The assigned spin-forbidden bands ([`FitRequest::forbidden`]), in input order.
    pub forbidden: Vec<AssignedBand>,
    /// Transitions not observed, lowest first (up to 50 000 cm⁻¹ or 5 000 above the highest band).
    pub predicted: Vec<PredictedBand>,
    /// Root-mean-square residual (cm⁻¹).
    pub rms: f64,
    /// 2S of the ground state at the fitted parameters.
    pub ground_two_s: i32,
    /// Energy of the lowest level of the nearest other ground-spin candidate minus that of the
    /// assumed spin (cm⁻¹; positive: the assumed spin is lower), when there is another.
    pub spin_gap: Option<f64>,
    pub converged: bool,
    /// Why the minimiser stopped.
    pub termination: String,
    /// Model evaluations used by the minimiser.
    pub evaluations: usize,
    /// Reasons this assignment is doubtful (each adds [`CONCERN_PENALTY`] to the score).
    pub concerns: Vec<String>,
    /// rms + penalties (cm⁻¹); lower is better.
    pub score: f64,
    /// Unassigned bands expected to be strong that lie below the highest observed band, at any
    /// energy (tie-breaker between near-equal assignments).
    pub skipped_below: usize,
    /// B above the free-ion B₀ (β > 1).
    pub unphysical: bool,
}

impl BandFit {
    /// Δ = 10Dq (cm⁻¹).
    pub fn delta(&self) -> f64 {
        10.0 * self.dq
    }

    /// Δ/B, when B is determined.
    pub fn delta_over_b(&self) -> Option<f64> {
        self.b.map(|b| 10.0 * self.dq / b)
    }

    /// Whether the fitted field makes the assumed spin state the ground state.
    pub fn consistent(&self) -> bool {
        self.ground_two_s == self.spin_state.two_s
    }

    /// Assignment text such as "4T2g, 4T1g(F)" in band order.
    pub fn assignment_text(&self) -> String {
        self.assigned
            .iter()
            .map(|a| a.transition.label.clone())
            .collect::<Vec<_>>()
            .join(", ")
    }
}

/// The result of [`fit_bands`].
#[derive(Debug, Clone)]
pub struct FitOutcome {
    pub best: BandFit,
    /// Other refined assignments, best first; `near_equal` marks those within the tolerance.
    pub alternatives: Vec<(BandFit, bool)>,
    /// The possible ground spin states of this d^n and geometry, weak field first.
    pub spin_states: Vec<SpinCandidate>,
    /// Statements about the fit (fixed parameters, skipped spin states, …).
    pub notes: Vec<String>,
}

/// Fits Dq, B (and C) to the bands; see the module documentation.
///
/// Errors (all [`Error::InvalidParameter`], exit code 2, unless stated): no bands or bad values;
/// a spin state without spin-allowed transitions; more bands than transitions; fewer bands than
/// free parameters (the message says which parameter to hold); `fit_c` when C does not enter; a
/// band that no assignment reaches within [`FAR_ABSOLUTE`]/[`FAR_FRACTION`]. When the best
/// assignment's minimisation does not converge: [`Error::Computation`] (exit code 1) whose
/// message gives the best point reached.
pub fn fit_bands(req: &FitRequest) -> Result<FitOutcome> {
    if req.dn > 10 {
        return Err(Error::invalid(Param::DElectronCount, req.dn, "0..=10"));
    }
    if req.geometry == Geometry::Tetragonal {
        return Err(Error::invalid(
            Param::Geometry,
            "tetragonal",
            "oct, tet or sqpl here; split bands of a tetragonal centre are fitted by spectra::tetragonal::fit_tetragonal",
        ));
    }
    if req.bands.is_empty() {
        return Err(Error::invalid(
            Param::Bands,
            "none",
            "at least one band maximum",
        ));
    }
    if let Some(b0) = req.b0 {
        check_b0(b0)?;
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
    for f in &req.forbidden {
        require_finite(Param::SpinForbiddenBand, f.position)?;
        if f.position <= 0.0 {
            return Err(Error::invalid(
                Param::SpinForbiddenBand,
                f.position,
                "a positive position in cm⁻¹",
            ));
        }
    }
    if let Some(b) = req.fixed_b {
        require_finite(Param::FixedB, b)?;
        if b <= 0.0 {
            return Err(Error::invalid(Param::FixedB, b, "a Racah B > 0 cm⁻¹"));
        }
    }
    let (default_ratio, default_source) = default_c_over_b(req.dn);
    let (c_over_b, ratio_source) = match req.c_over_b {
        Some(r) => {
            require_finite(Param::COverB, r)?;
            if r <= 0.0 {
                return Err(Error::invalid(
                    Param::COverB,
                    r,
                    "a ratio > 0 (usually 3.5–5)",
                ));
            }
            (r, Some("given".to_string()))
        }
        None => (default_ratio, default_source.map(|s| s.to_string())),
    };
    let mut bands = req.bands.clone();
    bands.sort_by(|a, b| a.total_cmp(b));

    let states = spin_states(req.dn, req.geometry, c_over_b)?;
    if states.is_empty() {
        return Err(Error::invalid(
            Param::DElectronCount,
            req.dn,
            "1..=9 (d0 and d10 have no d–d bands)",
        ));
    }
    let chosen = select_spin(&states, req.spin);
    let explicit = req.spin != SpinChoice::Auto;
    let mut notes = Vec::new();
    if states.len() == 1 && explicit {
        notes.push(format!(
            "d{} {} has a single ground spin state, {}; the spin choice makes no difference",
            req.dn,
            req.geometry,
            states[0].describe()
        ));
    }

    let mut fits: Vec<BandFit> = Vec::new();
    let mut last_error: Option<Error> = None;
    for state in &chosen {
        let result = fit_one_spin(
            req,
            &bands,
            *state,
            &states,
            c_over_b,
            ratio_source.as_deref(),
        );
        match result {
            Ok((mut these, mut n)) => {
                fits.append(&mut these);
                notes.append(&mut n);
            }
            Err(e) if !explicit && chosen.len() > 1 && e.exit_code() == 2 => {
                notes.push(format!("not fitted: {e}"));
                last_error = Some(e);
            }
            Err(e) => return Err(e),
        }
    }
    if fits.is_empty() {
        return Err(last_error.unwrap_or_else(|| {
            Error::invalid(
                Param::Bands,
                "given",
                "bands that some spin state can explain",
            )
        }));
    }
    fits.sort_by(|a, b| a.score.total_cmp(&b.score));
    // Among near-equal fits prefer the one leaving the fewest strong bands unassigned below the
    // highest observed band (bands are usually assigned to the lowest transitions). Fits whose
    // scores differ only by rounding (exactly determined fits all reach rms ≈ 0) are told apart
    // by C/B: the one nearer the free-ion ratio of the Tanabe–Sugano diagrams is preferred (C/B
    // of complexes stays close to it; common practice).
    let tol = near_equal_tolerance(fits[0].rms);
    let top_score = fits[0].score;
    let typical_c_over_b = crate::engine::tanabe_sugano_c_over_b(req.dn);
    let c_distance = |f: &BandFit| (f.c_over_b - typical_c_over_b).abs();
    let pick = (0..fits.len())
        .filter(|&i| fits[i].score <= top_score + tol)
        .min_by(|&i, &j| {
            let (a, b) = (&fits[i], &fits[j]);
            a.skipped_below.cmp(&b.skipped_below).then_with(|| {
                if (a.score - b.score).abs() <= SCORE_ROUNDING {
                    c_distance(a).total_cmp(&c_distance(b))
                } else {
                    a.score.total_cmp(&b.score)
                }
            })
        })
        .unwrap_or(0);
    let best = fits.remove(pick);
    // A band far from every transition means the data fit no assignment.
    if let Some(a) = best
        .assigned
        .iter()
        .chain(&best.forbidden)
        .find(|a| a.residual.abs() > FAR_ABSOLUTE.max(FAR_FRACTION * a.observed))
    {
        return Err(Error::invalid(
            Param::Band,
            format!("{:.0} cm⁻¹", a.observed),
            format!(
                "a position reachable by a spin-allowed transition of d{} {} with B in {:.0}–{:.0} cm⁻¹ and Δ/B up to {MAX_DELTA_OVER_B}; the best assignment ({}) misses it by {:.0} cm⁻¹",
                req.dn,
                req.geometry,
                PLAUSIBLE_B.0,
                PLAUSIBLE_B.1,
                best.assignment_text(),
                a.residual.abs()
            ),
        ));
    }
    if let (true, Some(b)) = (best.free.contains(&FitParameter::B), best.b) {
        if !(POSSIBLE_B.0..=POSSIBLE_B.1).contains(&b) {
            return Err(Error::invalid(
                Param::Bands,
                bands
                    .iter()
                    .map(|x| format!("{x:.0}"))
                    .collect::<Vec<_>>()
                    .join(", "),
                format!(
                    "positions that spin-allowed transitions of d{} {} reach with B in {:.0}–{:.0} cm⁻¹; the best assignment ({}) needs B = {b:.0} cm⁻¹",
                    req.dn,
                    req.geometry,
                    POSSIBLE_B.0,
                    POSSIBLE_B.1,
                    best.assignment_text()
                ),
            ));
        }
    }
    if !best.converged {
        return Err(Error::Computation(format!(
            "the fit did not converge ({} after {} evaluations); best point reached: {}, rms {:.1} cm⁻¹",
            best.termination,
            best.evaluations,
            point_text(&best),
            best.rms
        )));
    }
    let alternatives = fits
        .into_iter()
        .map(|f| {
            let near = !f.unphysical && f.score <= best.score + near_equal_tolerance(best.rms);
            (f, near)
        })
        .collect();
    Ok(FitOutcome {
        best,
        alternatives,
        spin_states: states,
        notes,
    })
}

/// Fits every promising assignment for one spin state.
fn fit_one_spin(
    req: &FitRequest,
    bands: &[f64],
    state: SpinCandidate,
    states: &[SpinCandidate],
    c_over_b: f64,
    ratio_source: Option<&str>,
) -> Result<(Vec<BandFit>, Vec<String>)> {
    let n = bands.len();
    let probe = calculation(req.dn, req.geometry, 1600.0, 800.0, 800.0 * c_over_b)?.levels()?;
    let probe_manifold = band_manifold(&probe, state.two_s);
    let total = probe_manifold
        .as_ref()
        .map(|m| m.transitions.len())
        .unwrap_or(0);
    let forbidden = probe_manifold
        .as_ref()
        .is_some_and(|m| m.upper_two_s != m.two_s);
    let widened;
    let marked = !req.forbidden.is_empty();
    let req =
        if (forbidden && n >= 3 && !req.fit_c && req.fixed_b.is_none()) || (marked && !req.fit_c) {
            // The quartets of high-spin d⁵ pin B and C separately (⁴A₁g,⁴Eg(G) at 10B + 5C and
            // ⁴Eg(D) at 17B + 5C in the weak-field limit; A. B. P. Lever, Inorganic Electronic
            // Spectroscopy, 1984): fit C as well. Marked spin-forbidden bands of other d^n pin C
            // the same way (the ²Eg of d³ lies near 9B + 3C; Y. Tanabe, S. Sugano, J. Phys. Soc.
            // Jpn. 1954, 9, 753).
            widened = FitRequest {
                fit_c: true,
                ..req.clone()
            };
            &widened
        } else {
            req
        };
    if total == 0 {
        return Err(Error::invalid(
            Param::SpinState,
            format!("{} of d{} {}", state.describe(), req.dn, req.geometry),
            "one with spin-allowed d–d bands; this one has none (its bands are spin-forbidden and weak)",
        ));
    }
    if n > total {
        return Err(Error::invalid(
            Param::NumberOfBands,
            n,
            format!(
                "at most {total}: d{} {}, {} has {total} spin-allowed transition(s)",
                req.dn,
                req.geometry,
                state.describe()
            ),
        ));
    }
    // Levels of another spin depend on B and C, so marked spin-forbidden bands bring both in.
    let (b_enters, c_enters) = if marked {
        (true, true)
    } else {
        dependence(req.dn, req.geometry, state.two_s, c_over_b)?
    };
    let mut free = vec![FitParameter::Dq];
    let mut fixed = Vec::new();
    let mut notes = Vec::new();
    if forbidden {
        notes.push(format!(
            "{} of d{} {} has no spin-allowed d–d band: the bands are assigned to its spin-forbidden transitions to the {}-fold levels (weak, ε ≲ 1 M⁻¹ cm⁻¹){}",
            state.describe(),
            req.dn,
            req.geometry,
            state.two_s - 1,
            if req.fit_c { "; Dq, B and C are all fitted" } else { "" }
        ));
    }
    if marked {
        notes.push(format!(
            "{} spin-forbidden band(s) fitted to the lowest level of the named (or next) multiplicity, which fixes C: Dq, B and C are all fitted",
            req.forbidden.len()
        ));
    }
    if !b_enters {
        fixed.push(FixedParameter {
            name: "B".into(),
            value: None,
            reason: format!(
                "B and C do not enter the spin-allowed bands of d{} {}, {} (one free-ion term of this spin): only Δ is determined",
                req.dn, req.geometry, state.describe()
            ),
        });
        if req.fit_c {
            return Err(Error::invalid(
                Param::FitC,
                "requested",
                format!(
                    "only when C enters the spin-allowed bands; for d{} {}, {} neither B nor C does",
                    req.dn,
                    req.geometry,
                    state.describe()
                ),
            ));
        }
    } else {
        match req.fixed_b {
            Some(b) => fixed.push(FixedParameter {
                name: "B".into(),
                value: Some(b),
                reason: "held at the given value".into(),
            }),
            None => free.push(FitParameter::B),
        }
        if req.fit_c {
            if !c_enters {
                return Err(Error::invalid(
                    Param::FitC,
                    "requested",
                    format!(
                        "only when C enters the spin-allowed bands; for d{} {}, {} they depend on Dq and B alone — fix C/B instead",
                        req.dn,
                        req.geometry,
                        state.describe()
                    ),
                ));
            }
            free.push(FitParameter::C);
        } else if c_enters {
            fixed.push(FixedParameter {
                name: "C/B".into(),
                value: Some(c_over_b),
                reason: match ratio_source {
                    Some("given") => "held at the given ratio".into(),
                    Some(src) => format!("held at the default for d{}: {src}", req.dn),
                    None => "held at a nominal ratio".into(),
                },
            });
        } else {
            fixed.push(FixedParameter {
                name: "C".into(),
                value: None,
                reason: format!(
                    "the spin-allowed bands of d{} {}, {} depend on Dq and B only, so C is not determined",
                    req.dn,
                    req.geometry,
                    state.describe()
                ),
            });
        }
    }
    let p = free.len();
    let n = n + req.forbidden.len();
    if n < p {
        let names: Vec<&str> = free.iter().map(|f| f.name()).collect();
        let (hint, needs) = if free.contains(&FitParameter::C) {
            (
                "hold C/B fixed instead of fitting C, or add a band",
                vec![Param::FitC, Param::COverB],
            )
        } else {
            (
                "hold B fixed at a value in cm⁻¹ (e.g. β·B0), or add a band",
                vec![Param::FixedB],
            )
        };
        return Err(Error::invalid(
            Param::NumberOfBands,
            n,
            format!(
                "at least {p} for the free parameters {} of d{} {}, {}: {hint}",
                names.join(", "),
                req.dn,
                req.geometry,
                state.describe()
            ),
        )
        .needing(needs));
    }

    let spec_b_fixed = if b_enters {
        req.fixed_b.unwrap_or(800.0)
    } else {
        1000.0
    };
    let ratios: Vec<f64> = if req.fit_c {
        vec![0.85 * c_over_b, c_over_b, 1.15 * c_over_b]
    } else {
        vec![c_over_b]
    };
    let b_seed = match (b_enters, req.fixed_b) {
        (true, Some(b)) => BSeed::Fixed(b),
        _ => BSeed::Free {
            min: PLAUSIBLE_B.0,
            max: PLAUSIBLE_B.1,
        },
    };
    let mut seeds = seeds_for(req, bands, state, &ratios, b_seed)?;
    if seeds.is_empty() && matches!(b_seed, BSeed::Free { .. }) {
        // No assignment with a plausible B on the grid: widen B before giving up.
        seeds = seeds_for(
            req,
            bands,
            state,
            &ratios,
            BSeed::Free {
                min: POSSIBLE_B.0,
                max: POSSIBLE_B.1,
            },
        )?;
    }
    if seeds.is_empty() {
        return Err(Error::invalid(
            Param::Bands,
            bands
                .iter()
                .map(|b| format!("{b:.0}"))
                .collect::<Vec<_>>()
                .join(", "),
            format!(
                "positions that spin-allowed transitions of d{} {}, {} can reach for Δ/B up to {MAX_DELTA_OVER_B}",
                req.dn,
                req.geometry,
                state.describe()
            ),
        ));
    }
    // Refine the most promising assignments.
    let best_rss = seeds[0].rss;
    let limit = 4.0 * best_rss + n as f64 * 500.0_f64.powi(2);
    let chosen: Vec<Seed> = seeds
        .into_iter()
        .filter(|s| s.rss <= limit)
        .take(8)
        .collect();
    let mut fits = Vec::new();
    for seed in chosen {
        let spec = Spec {
            free: free.clone(),
            b_fixed: if b_enters { spec_b_fixed } else { 1000.0 },
            c_over_b: seed.c_over_b,
        };
        let deps = (b_enters, c_enters);
        if let Some(f) = refine(req, bands, state, states, &spec, &seed, &fixed, deps)? {
            fits.push(f);
        }
    }
    if fits.is_empty() {
        return Err(Error::invalid(
            Param::Bands,
            "given",
            format!(
                "positions that the spin-allowed transitions of d{} {}, {} reproduce",
                req.dn,
                req.geometry,
                state.describe()
            ),
        ));
    }
    if !free.contains(&FitParameter::C) && c_enters {
        notes.push(format!(
            "C/B = {c_over_b} was held fixed{}",
            match ratio_source {
                Some("given") => String::from(" at the given value"),
                Some(src) => format!(" ({src})"),
                None => String::new(),
            }
        ));
    }
    Ok((fits, notes))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::engine::{Irrep, Species};
    use approx::assert_relative_eq;

    fn request(dn: usize, geometry: Geometry, bands: Vec<f64>) -> FitRequest {
        FitRequest {
            dn,
            geometry,
            bands,
            spin: SpinChoice::Auto,
            c_over_b: None,
            fit_c: false,
            fixed_b: None,
            patience: None,
            b0: None,
            forbidden: Vec::new(),
        }
    }

    #[test]
    fn beta_and_crossover_position() {
        // β = B/B0 (Jørgensen's nephelauxetic ratio); [Cr(H2O)6]3+ B ≈ 725 with Jolly's
        // B0(Cr3+) = 918 gives β ≈ 0.79 (computed: C. K. Jørgensen's
        // ratio, 1962, with B0 read in W. L. Jolly, Modern Inorganic Chemistry, 1989).
        assert_relative_eq!(
            nephelauxetic_ratio(725.0, 918.0).unwrap(),
            0.7898,
            epsilon = 1e-4
        );
        assert!(nephelauxetic_ratio(725.0, 0.0).is_err());
        let pos = relative_to_crossover(36.3, 20.0).unwrap();
        assert!(pos.low_spin_side);
        assert_relative_eq!(pos.margin, 16.3, epsilon = 1e-12);
    }

    #[test]
    fn single_band_d1_gives_delta_only() {
        // d1 octahedral: one band, Δ = ν (closed forms of A. B. P. Lever, Inorganic Electronic Spectroscopy, 2nd ed., 1984, from memory); [Ti(H2O)6]3+ 20 300.
        let out = fit_bands(&request(1, Geometry::Octahedral, vec![20_300.0])).unwrap();
        assert_relative_eq!(out.best.delta(), 20_300.0, max_relative = 1e-6);
        assert_eq!(out.best.b, None);
        assert_eq!(out.best.free, vec![FitParameter::Dq]);
        assert_eq!(out.best.determination, Determination::Exact);
    }

    #[test]
    fn too_few_bands_names_the_parameter_to_hold() {
        let e = fit_bands(&request(3, Geometry::Octahedral, vec![17_400.0])).unwrap_err();
        assert_eq!(e.exit_code(), 2);
        assert!(e.to_string().contains("hold B fixed"), "{e}");
        let mut r = request(3, Geometry::Octahedral, vec![17_400.0]);
        r.fixed_b = Some(728.6);
        let out = fit_bands(&r).unwrap();
        assert_relative_eq!(out.best.dq, 1740.0, max_relative = 1e-6);
    }

    #[test]
    fn fit_c_is_refused_when_c_does_not_enter() {
        // d3 quartets span 4F and 4P only, 15B apart: C cannot be fitted (Y. Tanabe, S. Sugano, J. Phys. Soc. Jpn. 1954, from memory).
        let mut r = request(3, Geometry::Octahedral, vec![17_400.0, 24_600.0, 37_800.0]);
        r.fit_c = true;
        let e = fit_bands(&r).unwrap_err();
        assert!(e.to_string().contains("C/B"), "{e}");
    }

    #[test]
    fn band_out_of_reach_is_bad_input() {
        let e = fit_bands(&request(
            3,
            Geometry::Octahedral,
            vec![17_400.0, 24_600.0, 90_000.0],
        ))
        .unwrap_err();
        assert_eq!(e.exit_code(), 2, "{e}");
    }

    /// High-spin d⁵ has no spin-allowed band; its quartet bands are fitted instead, and one
    /// band cannot fix Dq and B.
    #[test]
    fn d5_high_spin_needs_more_than_one_quartet_band() {
        let mut r = request(5, Geometry::Octahedral, vec![18_000.0]);
        r.spin = SpinChoice::High;
        let e = fit_bands(&r).unwrap_err();
        assert!(e.to_string().contains("at least 2"), "{e}");
    }

    /// Round trip on the engine's own high-spin d⁵ quartet bands (⁶A₁g → ⁴T₁g(G), ⁴T₂g(G),
    /// ⁴A₁g, ⁴Eg(D)): Dq, B and C come back, C fitted on its own.
    #[test]
    fn round_trip_d5_high_spin_quartets() {
        let (dq, b, c) = (800.0, 700.0, 3300.0);
        let bands = engine_bands(
            5,
            Geometry::Octahedral,
            5,
            (dq, b, c),
            &["4T1g(G)", "4T2g(G)", "4A1g", "4Eg(D)"],
        );
        let mut req = request(5, Geometry::Octahedral, bands);
        req.spin = SpinChoice::High;
        let out = fit_bands(&req).unwrap();
        assert_eq!(out.best.spin_state.two_s, 5);
        assert_relative_eq!(out.best.dq, dq, max_relative = 1e-3);
        assert_relative_eq!(out.best.b.unwrap(), b, max_relative = 1e-3);
        assert_relative_eq!(out.best.c.unwrap(), c, max_relative = 1e-3);
    }

    /// Ruby (Cr³⁺ in Al₂O₃): ⁴T₂g 18 000, ⁴T₁g 24 400 and the sharp ²Eg R line at 14 400 cm⁻¹
    /// (S. Sugano, Y. Tanabe, J. Phys. Soc. Jpn. 1958, 13, 880; Lever 1984; from memory): with
    /// the ²Eg marked, C is fitted and lands at a usual C/B with B near the published ≈ 620–650.
    #[test]
    fn ruby_doublet_fixes_c() {
        let mut r = request(3, Geometry::Octahedral, vec![18_000.0, 24_400.0]);
        r.forbidden = vec!["14400:2Eg".parse().unwrap()];
        let f = fit_bands(&r).unwrap().best;
        assert!(f.free.contains(&FitParameter::C));
        assert_eq!(f.forbidden[0].transition.label, "2Eg");
        assert!(f.forbidden[0].residual.abs() < 1.0);
        let (b, c) = (f.b.unwrap(), f.c.unwrap());
        assert!((580.0..=700.0).contains(&b), "{b}");
        assert!((4.0..=5.5).contains(&(c / b)), "{}", c / b);
        // Round trip on the engine's own ²Eg: C comes back.
        let (dq, b, c) = (1740.0, 700.0, 3200.0);
        let spectrum = calculation(3, Geometry::Octahedral, dq, b, c)
            .unwrap()
            .levels()
            .unwrap();
        let e2 = spectrum
            .levels
            .iter()
            .find(|l| l.two_s == 1 && l.irrep == Irrep::mulliken(Species::E, true))
            .unwrap()
            .energy;
        let nu = engine_bands(
            3,
            Geometry::Octahedral,
            3,
            (dq, b, c),
            &["4T2g", "4T1g(F)", "4T1g(P)"],
        );
        let mut r = request(3, Geometry::Octahedral, nu);
        r.forbidden = vec![format!("{e2}").parse().unwrap()];
        let f = fit_bands(&r).unwrap().best;
        assert_relative_eq!(f.c.unwrap(), c, max_relative = 1e-4);
        assert!(f.uncertainties.c.is_some());
        assert!("15000:2Xg".parse::<ForbiddenBand>().is_err());
    }

    /// [Mn(H₂O)₆]²⁺: bands at 18 900, 23 100, 24 900 and 28 000 cm⁻¹ (A. B. P. Lever, Inorganic
    /// Electronic Spectroscopy, 2nd ed., 1984, from memory) are the quartets of a high-spin ion
    /// with Dq ≈ 800, B ≈ 700 and C/B ≈ 4.5–5 (Lever 1984's fit, from memory, lies in the same
    /// range), not a low-spin state with a field three times larger.
    #[test]
    fn aqua_manganese_ii_is_high_spin() {
        let out = fit_bands(&request(
            5,
            Geometry::Octahedral,
            vec![18_900.0, 23_100.0, 24_900.0, 28_000.0],
        ))
        .unwrap();
        let f = &out.best;
        assert_eq!(f.spin_state.two_s, 5, "{:?}", f.spin_state);
        assert!((650.0..=950.0).contains(&f.dq), "{}", f.dq);
        let b = f.b.unwrap();
        assert!((600.0..=850.0).contains(&b), "{b}");
        let r = f.c.unwrap() / b;
        assert!((4.0..=5.5).contains(&r), "{r}");
    }

    /// Band positions computed by the engine for the named upper levels.
    fn engine_bands(
        dn: usize,
        geometry: Geometry,
        two_s: i32,
        (dq, b, c): (f64, f64, f64),
        labels: &[&str],
    ) -> Vec<f64> {
        let spectrum = calculation(dn, geometry, dq, b, c)
            .unwrap()
            .levels()
            .unwrap();
        let m = band_manifold(&spectrum, two_s).unwrap();
        labels
            .iter()
            .map(|l| {
                m.transitions
                    .iter()
                    .find(|t| t.label == *l)
                    .unwrap_or_else(|| panic!("no {l} in d{dn}"))
                    .energy
            })
            .collect()
    }

    /// Fits engine-computed bands back and checks Dq, B (and C) to 1e-4 relative.
    fn round_trip(
        dn: usize,
        geometry: Geometry,
        spin: SpinChoice,
        two_s: i32,
        (dq, b, r): (f64, f64, f64),
        labels: &[&str],
        fit_c: bool,
    ) -> FitOutcome {
        let bands = engine_bands(dn, geometry, two_s, (dq, b, r * b), labels);
        let req = FitRequest {
            dn,
            geometry,
            bands,
            spin,
            c_over_b: Some(r),
            fit_c,
            fixed_b: None,
            patience: None,
            b0: None,
            forbidden: Vec::new(),
        };
        let out = fit_bands(&req).unwrap();
        let f = &out.best;
        assert_eq!(f.spin_state.two_s, two_s, "d{dn}: spin");
        let got: Vec<&str> = f
            .assigned
            .iter()
            .map(|a| a.transition.label.as_str())
            .collect();
        let mut want = labels.to_vec();
        let mut sorted = req.bands.clone();
        sorted.sort_by(|a, b| a.total_cmp(b));
        want.sort_by_key(|l| {
            let e = engine_bands(dn, geometry, two_s, (dq, b, r * b), &[l])[0];
            sorted.iter().position(|x| *x == e).unwrap()
        });
        assert_eq!(got, want, "d{dn}: assignment");
        assert_relative_eq!(f.dq, dq, max_relative = 1e-4);
        assert_relative_eq!(f.b.unwrap(), b, max_relative = 1e-4);
        if fit_c {
            assert_relative_eq!(f.c.unwrap(), r * b, max_relative = 1e-4);
        }
        assert!(f.converged);
        out
    }

    #[test]
    fn round_trip_d2_octahedral() {
        round_trip(
            2,
            Geometry::Octahedral,
            SpinChoice::Auto,
            2,
            (1910.0, 613.0, 4.42),
            &["3T2g", "3T1g(P)", "3A2g"],
            false,
        );
    }

    #[test]
    fn round_trip_d3_octahedral() {
        let out = round_trip(
            3,
            Geometry::Octahedral,
            SpinChoice::Auto,
            3,
            (1740.0, 700.0, 4.5),
            &["4T2g", "4T1g(F)", "4T1g(P)"],
            false,
        );
        // Three bands, two parameters, exact data: one degree of freedom, zero residual.
        assert_eq!(out.best.determination, Determination::Over { dof: 1 });
        assert!(out.best.rms < 1e-3);
    }

    #[test]
    fn round_trip_d6_low_spin() {
        round_trip(
            6,
            Geometry::Octahedral,
            SpinChoice::Low,
            0,
            (2300.0, 630.0, 4.8),
            &["1T1g", "1T2g"],
            false,
        );
        // Auto finds the low-spin state by itself.
        round_trip(
            6,
            Geometry::Octahedral,
            SpinChoice::Auto,
            0,
            (2300.0, 630.0, 4.8),
            &["1T1g", "1T2g"],
            false,
        );
    }

    #[test]
    fn round_trip_d6_low_spin_with_c_free() {
        // C enters the singlet bands of d6 LS, so three bands fix Dq, B and C.
        let out = round_trip(
            6,
            Geometry::Octahedral,
            SpinChoice::Low,
            0,
            (2300.0, 630.0, 4.3),
            &["1T1g", "1T2g", "1T2g[2]"],
            true,
        );
        assert_eq!(
            out.best.free,
            vec![FitParameter::Dq, FitParameter::B, FitParameter::C]
        );
    }

    #[test]
    fn round_trip_d7_high_spin() {
        round_trip(
            7,
            Geometry::Octahedral,
            SpinChoice::High,
            3,
            (920.0, 825.0, 4.633),
            &["4T2g", "4A2g", "4T1g(P)"],
            false,
        );
    }

    #[test]
    fn round_trip_d8_octahedral_and_tetrahedral_d7() {
        round_trip(
            8,
            Geometry::Octahedral,
            SpinChoice::Auto,
            2,
            (850.0, 900.0, 4.709),
            &["3T2g", "3T1g(F)", "3T1g(P)"],
            false,
        );
        round_trip(
            7,
            Geometry::Tetrahedral,
            SpinChoice::Auto,
            3,
            (320.0, 720.0, 4.633),
            &["4T2", "4T1(F)", "4T1(P)"],
            false,
        );
    }

    #[test]
    fn sum_rule_for_d3_and_d8() {
        // 15B = ν2 + ν3 − 3ν1 for octahedral d3 and d8 (Lever, J. Chem. Educ. 1968, 45, 711;
        // closed forms of A. B. P. Lever, Inorganic Electronic Spectroscopy, 2nd ed., 1984, from memory), checked on engine bands and on the fitted B.
        for (dn, labels, r) in [
            (3, ["4T2g", "4T1g(F)", "4T1g(P)"], 4.5),
            (8, ["3T2g", "3T1g(F)", "3T1g(P)"], 4.709),
        ] {
            for (dq, b) in [(1200.0, 800.0), (2000.0, 650.0)] {
                let nu = engine_bands(
                    dn,
                    Geometry::Octahedral,
                    (dn == 3) as i32 + 2,
                    (dq, b, r * b),
                    &labels,
                );
                assert_relative_eq!(nu[1] + nu[2] - 3.0 * nu[0], 15.0 * b, max_relative = 1e-9);
                assert_relative_eq!(nu[0], 10.0 * dq, max_relative = 1e-12);
            }
        }
        // A three-band fit of exact d3 data reproduces the sum-rule B.
        let nu = engine_bands(
            3,
            Geometry::Octahedral,
            3,
            (1500.0, 760.0, 3420.0),
            &["4T2g", "4T1g(F)", "4T1g(P)"],
        );
        let out = fit_bands(&request(3, Geometry::Octahedral, nu.clone())).unwrap();
        assert_relative_eq!(
            out.best.b.unwrap(),
            (nu[1] + nu[2] - 3.0 * nu[0]) / 15.0,
            max_relative = 1e-6
        );
    }

    /// The published convention (Lever 1984): Δ = ν₁, and B from ν₂ or from ν₃ with Δ held at
    /// ν₁, both exact on the engine's own cubic bands; [Cr(H₂O)₆]³⁺ (17 400, 24 600 cm⁻¹) and
    /// [Ni(H₂O)₆]²⁺ (8 500, 13 800, 25 300 cm⁻¹; Lever 1984, from memory) give Δ = ν₁.
    #[test]
    fn published_convention_for_d3_and_d8() {
        for (dn, two_s, labels, r) in [
            (3, 3, ["4T2g", "4T1g(F)", "4T1g(P)"], 4.5),
            (8, 2, ["3T2g", "3T1g(F)", "3T1g(P)"], 4.709),
        ] {
            let (dq, b) = (1300.0, 780.0);
            let nu = engine_bands(dn, Geometry::Octahedral, two_s, (dq, b, r * b), &labels);
            let mut req = request(dn, Geometry::Octahedral, nu.clone());
            req.c_over_b = Some(r);
            let out = fit_bands(&req).unwrap();
            let c = convention(&out.best).unwrap();
            assert_relative_eq!(c.delta, 10.0 * dq, max_relative = 1e-9);
            assert_relative_eq!(c.b_from_nu2.unwrap(), b, max_relative = 1e-9);
            assert_relative_eq!(c.b_from_nu3.unwrap(), b, max_relative = 1e-9);
        }
        let out = fit_bands(&request(3, Geometry::Octahedral, vec![17_400.0, 24_600.0])).unwrap();
        assert_eq!(convention(&out.best).unwrap().delta, 17_400.0);
        let out = fit_bands(&request(
            8,
            Geometry::Octahedral,
            vec![8_500.0, 13_800.0, 25_300.0],
        ))
        .unwrap();
        let c = convention(&out.best).unwrap();
        assert_eq!(c.delta, 8_500.0);
        assert!(c.b_from_nu2.is_some() && c.b_from_nu3.is_some());
        assert!(convention(
            &fit_bands(&request(2, Geometry::Octahedral, vec![17_800.0, 25_700.0]))
                .unwrap()
                .best
        )
        .is_none());
    }

    /// A fitted B above the free-ion B₀ (β > 1) is unphysical (Jørgensen 1962): flagged, and
    /// never offered as a near-equal alternative.
    #[test]
    fn beta_above_one_is_rejected() {
        let mut req = request(8, Geometry::Octahedral, vec![8_500.0, 13_800.0, 25_300.0]);
        // A B₀ below the fitted B of about 900 cm⁻¹.
        req.b0 = Some(700.0);
        let out = fit_bands(&req).unwrap();
        assert!(out.best.unphysical);
        assert!(out.best.concerns.iter().any(|c| c.contains("β")));
        assert!(out
            .alternatives
            .iter()
            .all(|(f, near)| !(*near && f.unphysical)));
        req.b0 = Some(1030.0);
        assert!(!fit_bands(&req).unwrap().best.unphysical);
    }

    #[test]
    fn two_band_closed_forms() {
        // d3 from ν1, ν2: B = (ν2 − ν1)(ν2 − 2ν1)/(15ν2 − 27ν1) (closed forms of A. B. P. Lever, Inorganic Electronic Spectroscopy, 2nd ed., 1984,
        // from memory; equivalent to Lever, J. Chem. Educ. 1968, 45, 711). [Cr(H2O)6]3+ 17 400, 24 600 → B = 728.6 (band data of A. B. P. Lever, Inorganic Electronic Spectroscopy, 1984, from memory).
        let (n1, n2) = (17_400.0, 24_600.0);
        let closed = (n2 - n1) * (n2 - 2.0 * n1) / (15.0 * n2 - 27.0 * n1);
        let out = fit_bands(&request(3, Geometry::Octahedral, vec![n1, n2])).unwrap();
        assert_relative_eq!(out.best.b.unwrap(), closed, max_relative = 1e-6);
        assert_relative_eq!(closed, 728.6, epsilon = 0.05);
        // d2/d7-HS from ν1 = ν(T2g), ν3 = ν(T1g(P)), a = 2ν1 − ν3:
        // B = [−48a + √(2880ν3² − 576a²)]/1440, 10Dq = a + 15B (closed forms of Lever 1984, from memory);
        // [V(H2O)6]3+ 17 800, 25 700 (band data of Lever 1984, from memory).
        let (n1, n3): (f64, f64) = (17_800.0, 25_700.0);
        let a = 2.0 * n1 - n3;
        let b = (-48.0 * a + (2880.0 * n3 * n3 - 576.0 * a * a).sqrt()) / 1440.0;
        let out = fit_bands(&request(2, Geometry::Octahedral, vec![n1, n3])).unwrap();
        assert_relative_eq!(out.best.b.unwrap(), b, max_relative = 1e-6);
        assert_relative_eq!(out.best.delta(), a + 15.0 * b, max_relative = 1e-6);
        // ν(A2g) − ν(T2g) = 10Dq exactly.
        let a2 = out
            .best
            .predicted
            .iter()
            .find(|p| p.transition.key.irrep == Irrep::mulliken(Species::A2, true))
            .unwrap();
        assert_relative_eq!(
            a2.transition.energy - n1,
            out.best.delta(),
            max_relative = 1e-9
        );
    }

    #[test]
    fn low_spin_d6_exceeds_first_order_b() {
        // First-order strong-field forms E(1T1g) = 10Dq − C, E(1T2g) = 10Dq + 16B − C give
        // B ≈ (ν2 − ν1)/16 and underestimate B by ≈15–20 % (forms of A. B. P. Lever, Inorganic Electronic Spectroscopy, 2nd ed., 1984,
        // from memory; the 15–20 % is computed from the two fits below). [Co(NH3)6]3+ 21 000, 29 500: first-order 531, full fit 634.8 at C = 4.8B.
        let mut r = request(6, Geometry::Octahedral, vec![21_000.0, 29_500.0]);
        r.c_over_b = Some(4.8);
        let out = fit_bands(&r).unwrap();
        let first_order = (29_500.0 - 21_000.0) / 16.0;
        let b = out.best.b.unwrap();
        assert!(b / first_order > 1.15 && b / first_order < 1.25, "B {b}");
    }

    #[test]
    fn iteration_cap_gives_a_computation_error_with_the_best_point() {
        let mut r = request(3, Geometry::Octahedral, vec![17_400.0, 24_600.0, 37_800.0]);
        r.patience = Some(1);
        let e = fit_bands(&r).unwrap_err();
        assert_eq!(e.exit_code(), 1);
        assert!(e.to_string().contains("best point reached: 10Dq ="), "{e}");
    }

    #[test]
    fn result_does_not_depend_on_band_order() {
        let a = fit_bands(&request(
            8,
            Geometry::Octahedral,
            vec![8_500.0, 13_800.0, 25_300.0],
        ))
        .unwrap();
        let b = fit_bands(&request(
            8,
            Geometry::Octahedral,
            vec![25_300.0, 8_500.0, 13_800.0],
        ))
        .unwrap();
        assert_eq!(a.best.dq, b.best.dq);
        assert_eq!(a.best.b, b.best.b);
        assert_eq!(a.best.assignment_text(), b.best.assignment_text());
    }
}
