//! Least-squares fit of a χ_M·T(T) curve to the ideal or the cooperative (Slichter–Drickamer)
//! spin-transition model, with the pure-state χ_M·T fitted inside their physical ranges or
//! fixed, and an optional trapped high-spin fraction.
//!
//! The parameters are fitted in unconstrained forms (ln T½; logistic maps of ΔH onto
//! [`DH_RANGE`], of Γ/2RT½ onto [`GAMMA_RANGE`], of each pure-state χ_M·T onto its range and of
//! r onto 0–0.6) with the
//! Levenberg–Marquardt minimiser of the `levenberg-marquardt` crate. Uncertainties are the
//! square roots of the diagonal of s²(JᵀJ)⁻¹ (s² = SSR/(n − p); with given 1σ errors the
//! residuals are weighted and s² = 1), carried to the physical parameters through the
//! Jacobian of the transforms; correlations come from the same matrix.

use super::data::Point;
use super::model::{spin_entropy, Branch, Transition, GAS_CONSTANT};
use crate::error::{Error, Result};
use crate::least_squares::Residuals;
use crate::param::Param;
use crate::spectra::SpinKind;
use levenberg_marquardt::LevenbergMarquardt;
use nalgebra::{DMatrix, DVector};

/// Which model to fit.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ModelKind {
    /// Ideal two-state (Γ = 0).
    Ideal,
    /// Slichter–Drickamer with interaction Γ.
    Cooperative,
}

impl ModelKind {
    pub fn name(self) -> &'static str {
        match self {
            ModelKind::Ideal => "ideal",
            ModelKind::Cooperative => "cooperative",
        }
    }
}

/// A pure-state χ_M·T: fixed, or fitted inside a range (cm³ K mol⁻¹).
#[derive(Debug, Clone, PartialEq)]
pub enum PureState {
    Fixed(f64),
    Within { lo: f64, hi: f64, why: String },
}

/// What to fit.
#[derive(Debug, Clone, PartialEq)]
pub struct FitRequest {
    pub points: Vec<Point>,
    pub model: ModelKind,
    pub chit_hs: PureState,
    pub chit_ls: PureState,
    /// Fit a trapped high-spin fraction r (needs χ_M·T of the low-spin state fixed).
    pub residual: bool,
    /// 2S of the high- and low-spin states, for the spin share of ΔS.
    pub two_s: Option<(i32, i32)>,
}

/// One fitted quantity with its 1σ uncertainty (None when fixed or not determined).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Estimate {
    pub value: f64,
    pub err: Option<f64>,
    pub fixed: bool,
}

/// The result of a fit.
#[derive(Debug, Clone, PartialEq)]
pub struct FitResult {
    pub model: ModelKind,
    pub transition: Transition,
    /// K.
    pub t_half: Estimate,
    /// kJ mol⁻¹.
    pub dh: Estimate,
    /// J mol⁻¹ K⁻¹.
    pub ds: Estimate,
    /// kJ mol⁻¹ (0, fixed, for the ideal model).
    pub gamma: Estimate,
    /// Γ/(2RT½): above 1 the transition is hysteretic.
    pub gamma_over_2rt: f64,
    /// Turning points T↓, T↑ (K) and the loop width, when hysteretic.
    pub t_down: Option<Estimate>,
    pub t_up: Option<Estimate>,
    pub loop_width: Option<f64>,
    /// cm³ K mol⁻¹.
    pub chit_hs: Estimate,
    pub chit_ls: Estimate,
    pub residual_hs_fraction: Estimate,
    /// R ln[(2S_HS+1)/(2S_LS+1)] (J mol⁻¹ K⁻¹) and ΔS minus it, when the spins are known.
    pub spin_entropy: Option<f64>,
    pub other_entropy: Option<f64>,
    /// RMS of the unweighted residuals (cm³ K mol⁻¹).
    pub rms: f64,
    /// (T, observed, calculated, branch) per point.
    pub residuals: Vec<(f64, f64, f64, Branch)>,
    /// Names of the free parameters and their correlation matrix.
    pub parameter_names: Vec<&'static str>,
    pub correlations: Vec<Vec<f64>>,
    /// Which bound a pure-state χ_M·T sits at, and other caveats.
    pub warnings: Vec<String>,
    pub notes: Vec<String>,
}

/// Largest trapped fraction the fit allows.
pub const MAX_RESIDUAL: f64 = 0.6;

/// Range of ΔH searched (kJ mol⁻¹): iron(II) transitions have 5–20 (P. Gütlich, H. A. Goodwin,
/// Top. Curr. Chem. 2004, 233, 1; from memory); the range leaves room on both sides.
pub const DH_RANGE: (f64, f64) = (0.5, 100.0);

/// Largest pure-state χ_M·T accepted (cm³ K mol⁻¹): a mononuclear 3d ion has at most about 5,
/// a dinuclear complex about 10 (common practice).
pub const MAX_PURE_CHI_T: f64 = 20.0;

/// Range of Γ/(2RT½) searched.
pub const GAMMA_RANGE: (f64, f64) = (-2.0, 6.0);

#[derive(Debug, Clone, Copy)]
enum Slot {
    LnTHalf,
    LnDh,
    GammaRel,
    ChiHs(f64, f64),
    ChiLs(f64, f64),
    Residual,
}

#[derive(Debug, Clone)]
struct Layout {
    slots: Vec<Slot>,
    chit_hs_fixed: Option<f64>,
    chit_ls_fixed: Option<f64>,
}

#[derive(Debug, Clone, Copy)]
struct Physical {
    t_half: f64,
    dh: f64,
    gamma_rel: f64,
    chit_hs: f64,
    chit_ls: f64,
    residual: f64,
}

fn sigmoid(x: f64) -> f64 {
    1.0 / (1.0 + (-x).exp())
}

fn logit(p: f64) -> f64 {
    let p = p.clamp(1e-6, 1.0 - 1e-6);
    (p / (1.0 - p)).ln()
}

impl Layout {
    fn physical(&self, u: &DVector<f64>) -> Physical {
        let mut p = Physical {
            t_half: 0.0,
            dh: 0.0,
            gamma_rel: 0.0,
            chit_hs: self.chit_hs_fixed.unwrap_or(0.0),
            chit_ls: self.chit_ls_fixed.unwrap_or(0.0),
            residual: 0.0,
        };
        for (k, slot) in self.slots.iter().enumerate() {
            let x = u[k];
            match *slot {
                Slot::LnTHalf => p.t_half = x.exp(),
                Slot::LnDh => p.dh = DH_RANGE.0 + (DH_RANGE.1 - DH_RANGE.0) * sigmoid(x),
                Slot::GammaRel => {
                    p.gamma_rel = GAMMA_RANGE.0 + (GAMMA_RANGE.1 - GAMMA_RANGE.0) * sigmoid(x)
                }
                Slot::ChiHs(lo, hi) => p.chit_hs = lo + (hi - lo) * sigmoid(x),
                Slot::ChiLs(lo, hi) => p.chit_ls = lo + (hi - lo) * sigmoid(x),
                Slot::Residual => p.residual = MAX_RESIDUAL * sigmoid(x),
            }
        }
        p
    }

    fn names(&self) -> Vec<&'static str> {
        self.slots
            .iter()
            .map(|s| match s {
                Slot::LnTHalf => "t_half",
                Slot::LnDh => "dh",
                Slot::GammaRel => "gamma",
                Slot::ChiHs(..) => "chit_hs",
                Slot::ChiLs(..) => "chit_ls",
                Slot::Residual => "residual_hs_fraction",
            })
            .collect()
    }
}

impl Physical {
    fn transition(&self) -> Transition {
        let dh = self.dh * 1000.0;
        Transition {
            dh,
            ds: dh / self.t_half,
            gamma: self.gamma_rel * 2.0 * GAS_CONSTANT * self.t_half,
            residual: self.residual,
        }
    }
}

fn calculated(p: &Physical, points: &[Point], model: ModelKind) -> Option<Vec<f64>> {
    let tr = p.transition();
    points
        .iter()
        .map(|pt| {
            let branch = match model {
                ModelKind::Ideal => Branch::Equilibrium,
                ModelKind::Cooperative => pt.branch,
            };
            let g = tr.fraction(pt.t, branch).ok()?;
            let v = g * p.chit_hs + (1.0 - g) * p.chit_ls;
            v.is_finite().then_some(v)
        })
        .collect()
}

/// Weighted residuals (calculated − observed)/σ at `u`.
fn weighted_residuals(
    layout: &Layout,
    points: &[Point],
    model: ModelKind,
    weights: &[f64],
    u: &DVector<f64>,
) -> Option<DVector<f64>> {
    let p = layout.physical(u);
    if !(p.t_half.is_finite() && p.dh.is_finite() && p.t_half > 0.0) {
        return None;
    }
    let c = calculated(&p, points, model)?;
    Some(DVector::from_iterator(
        c.len(),
        c.iter()
            .zip(points)
            .zip(weights)
            .map(|((c, pt), w)| (c - pt.chi_t) * w),
    ))
}

/// Step of the central differences in the transformed parameters.
const STEP: f64 = 1e-6;

/// The temperature where the curve crosses the middle of its range, and the slope of the
/// normalised curve there (K⁻¹): starting values.
fn midpoint(points: &[Point], lo: f64, hi: f64) -> (f64, f64) {
    let mut sorted: Vec<&Point> = points.iter().collect();
    sorted.sort_by(|a, b| a.t.total_cmp(&b.t));
    let mid = 0.5 * (lo + hi);
    let mut crossings = Vec::new();
    for w in sorted.windows(2) {
        let (a, b) = (w[0], w[1]);
        if (a.chi_t - mid) * (b.chi_t - mid) <= 0.0 && b.t > a.t && a.chi_t != b.chi_t {
            let t = a.t + (mid - a.chi_t) * (b.t - a.t) / (b.chi_t - a.chi_t);
            let slope = (b.chi_t - a.chi_t) / (b.t - a.t) / (hi - lo).max(1e-9);
            crossings.push((t, slope));
        }
    }
    if crossings.is_empty() {
        let t = 0.5 * (sorted[0].t + sorted[sorted.len() - 1].t);
        return (t, 0.01);
    }
    let n = crossings.len() as f64;
    (
        crossings.iter().map(|c| c.0).sum::<f64>() / n,
        crossings.iter().map(|c| c.1.abs()).sum::<f64>() / n,
    )
}

/// Whether a curve moves far enough between the pure states to show a transition: its χ_M·T
/// spans at least a quarter of the gap between the lowest high-spin and the highest low-spin
/// value (and at least 0.1 cm³ K mol⁻¹). [`fit`] refuses curves that do not; a caller can test
/// first and read such a curve as a plateau instead.
pub fn crosses(points: &[Point], hs_lo: f64, ls_hi: f64) -> bool {
    let lo = points.iter().map(|p| p.chi_t).fold(f64::INFINITY, f64::min);
    let hi = points
        .iter()
        .map(|p| p.chi_t)
        .fold(f64::NEG_INFINITY, f64::max);
    hi - lo >= 0.25 * (hs_lo - ls_hi).max(0.4)
}

/// Fits the curve.
///
/// Errors: fewer points than free parameters plus one; a curve that does not cross between
/// the pure states (no transition: read one temperature with `moment`); a point outside the
/// physically possible χ_M·T range; a fit that does not converge (exit 1).
pub fn fit(req: &FitRequest) -> Result<FitResult> {
    let pts = &req.points;
    let (hs_lo, hs_hi) = match &req.chit_hs {
        PureState::Fixed(v) => (*v, *v),
        PureState::Within { lo, hi, .. } => (*lo, *hi),
    };
    let (ls_lo, ls_hi) = match &req.chit_ls {
        PureState::Fixed(v) => (*v, *v),
        PureState::Within { lo, hi, .. } => (*lo, *hi),
    };
    for (what, state) in [
        (SpinKind::High, &req.chit_hs),
        (SpinKind::Low, &req.chit_ls),
    ] {
        let possible = |v: f64| (0.0..=MAX_PURE_CHI_T).contains(&v);
        let ok = match state {
            PureState::Fixed(v) => possible(*v),
            PureState::Within { lo, hi, .. } => possible(*lo) && possible(*hi) && lo <= hi,
        };
        if !ok {
            return Err(Error::invalid(
                Param::ChiMTOfState(what),
                format!("{state:?}"),
                format!(
                    "a value in 0..={MAX_PURE_CHI_T} cm³ K mol⁻¹ (or a range lo ≤ hi within it)"
                ),
            ));
        }
    }
    if req.residual && !matches!(req.chit_ls, PureState::Fixed(_)) {
        return Err(Error::invalid(
            Param::ResidualFraction,
            "with χ_M·T of the low-spin state free",
            "a fixed low-spin χ_M·T (a trapped high-spin fraction and the low-spin plateau cannot both be fitted)",
        ));
    }
    let mut slots = vec![Slot::LnTHalf, Slot::LnDh];
    if req.model == ModelKind::Cooperative {
        slots.push(Slot::GammaRel);
    }
    if let PureState::Within { lo, hi, .. } = req.chit_hs {
        slots.push(Slot::ChiHs(lo, hi));
    }
    if let PureState::Within { lo, hi, .. } = req.chit_ls {
        slots.push(Slot::ChiLs(lo, hi));
    }
    if req.residual {
        slots.push(Slot::Residual);
    }
    let layout = Layout {
        chit_hs_fixed: match req.chit_hs {
            PureState::Fixed(v) => Some(v),
            PureState::Within { .. } => None,
        },
        chit_ls_fixed: match req.chit_ls {
            PureState::Fixed(v) => Some(v),
            PureState::Within { .. } => None,
        },
        slots,
    };
    let p = layout.slots.len();
    if pts.len() <= p {
        return Err(Error::invalid(
            Param::Curve,
            format!("{} points for {p} free parameters", pts.len()),
            format!(
                "at least {} points (more points than free parameters)",
                p + 1
            ),
        ));
    }
    // Physical range of every point.
    let (all_lo, all_hi) = (ls_lo.min(hs_lo), hs_hi.max(ls_hi));
    let slack = 0.15 * (all_hi - all_lo).max(0.2);
    for pt in pts {
        if pt.chi_t < all_lo - slack || pt.chi_t > all_hi + slack {
            return Err(Error::invalid(
                Param::ChiMTAt {
                    temperature: pt.t,
                    line: pt.line,
                },
                format!("{:.3} cm³ K mol⁻¹", pt.chi_t),
                format!(
                    "a value inside the physically possible range {:.2}–{:.2} cm³ K mol⁻¹ of the two spin states (check the units, the molar mass and the diamagnetic correction)",
                    all_lo, all_hi
                ),
            ));
        }
    }
    let obs_lo = pts.iter().map(|p| p.chi_t).fold(f64::INFINITY, f64::min);
    let obs_hi = pts
        .iter()
        .map(|p| p.chi_t)
        .fold(f64::NEG_INFINITY, f64::max);
    if !crosses(pts, hs_lo, ls_hi) {
        return Err(Error::invalid(
            Param::Curve,
            format!(
                "χ_M·T between {obs_lo:.3} and {obs_hi:.3} cm³ K mol⁻¹: no transition between the pure states"
            ),
            "a curve that crosses from one spin state towards the other; for a single spin state read one temperature with `spinstate moment`",
        ));
    }
    let weights: Vec<f64> = pts
        .iter()
        .map(|p| p.err.filter(|e| *e > 0.0).map_or(1.0, |e| 1.0 / e))
        .collect();
    let weighted = pts.iter().all(|p| p.err.is_some_and(|e| e > 0.0));
    // Starting values.
    let (t0, slope) = midpoint(pts, obs_lo, obs_hi);
    let dh0 = (4.0 * GAS_CONSTANT * t0 * t0 * slope / 1000.0).clamp(2.0, 60.0);
    let start = |gamma_rel: f64| -> DVector<f64> {
        DVector::from_iterator(
            layout.slots.len(),
            layout.slots.iter().map(|s| match *s {
                Slot::LnTHalf => t0.ln(),
                Slot::LnDh => logit((dh0 - DH_RANGE.0) / (DH_RANGE.1 - DH_RANGE.0)),
                Slot::GammaRel => {
                    logit((gamma_rel - GAMMA_RANGE.0) / (GAMMA_RANGE.1 - GAMMA_RANGE.0))
                }
                Slot::ChiHs(lo, hi) => logit((obs_hi - lo) / (hi - lo).max(1e-12)),
                Slot::ChiLs(lo, hi) => logit((obs_lo - lo) / (hi - lo).max(1e-12)),
                Slot::Residual => logit(0.02 / MAX_RESIDUAL),
            }),
        )
    };
    // Starting points: the best few of a coarse grid in ΔH (and Γ/2RT½) at the midpoint T½
    // and the plateaus (a transition with hysteresis is a step on each branch, so the slope at
    // the midpoint says little about ΔH).
    let dh_grid = [3.0, 5.0, 8.0, 12.0, 18.0, 25.0, 35.0, 50.0];
    let g_grid: &[f64] = match req.model {
        ModelKind::Ideal => &[0.0],
        ModelKind::Cooperative => &[0.0, 0.5, 0.8, 1.0, 1.15, 1.3, 1.6, 2.0, 2.6],
    };
    let ssr_at = |u: &DVector<f64>| -> f64 {
        let q = layout.physical(u);
        calculated(&q, pts, req.model).map_or(f64::INFINITY, |c| {
            c.iter()
                .zip(pts)
                .zip(&weights)
                .map(|((c, p), w)| ((c - p.chi_t) * w).powi(2))
                .sum()
        })
    };
    let mut seeds: Vec<(f64, DVector<f64>)> = Vec::new();
    for &dh in dh_grid.iter().chain(std::iter::once(&dh0)) {
        for &g in g_grid {
            let mut u0 = start(g);
            u0[1] = logit((dh - DH_RANGE.0) / (DH_RANGE.1 - DH_RANGE.0));
            seeds.push((ssr_at(&u0), u0));
        }
    }
    seeds.sort_by(|a, b| a.0.total_cmp(&b.0));
    seeds.truncate(3);
    let mut best: Option<(f64, DVector<f64>)> = None;
    for (_, u0) in seeds {
        let problem = Residuals::new(
            |u: &DVector<f64>| weighted_residuals(&layout, pts, req.model, &weights, u),
            u0,
            STEP,
        );
        if !problem.evaluates() {
            continue;
        }
        let (solved, report) = problem.minimize(
            LevenbergMarquardt::new()
                .with_ftol(1e-12)
                .with_xtol(1e-12)
                .with_gtol(1e-12)
                .with_patience(200),
        );
        let ssr = 2.0 * report.objective_function;
        if ssr.is_finite() && best.as_ref().is_none_or(|(b, _)| ssr < *b) {
            best = Some((ssr, solved));
        }
    }
    let Some((ssr, u)) = best else {
        return Err(Error::Computation(
            "the spin-transition fit did not converge from any starting point".into(),
        ));
    };
    let phys = layout.physical(&u);
    let problem = Residuals::new(
        |u: &DVector<f64>| weighted_residuals(&layout, pts, req.model, &weights, u),
        u.clone(),
        STEP,
    );
    let j = problem
        .jacobian_at(&u)
        .ok_or_else(|| Error::Computation("Jacobian of the fit not finite".into()))?;
    let dof = (pts.len() - p) as f64;
    let s2 = if weighted { 1.0 } else { ssr / dof };
    // A parameter pinned at the edge of its range has a (near) zero Jacobian column: it is
    // treated as fixed there and the covariance is formed for the others.
    let norms: Vec<f64> = (0..p).map(|k| j.column(k).norm()).collect();
    let top = norms.iter().cloned().fold(0.0, f64::max);
    let live: Vec<usize> = (0..p)
        .filter(|&k| norms[k] > 1e-7 * top.max(1e-300))
        .collect();
    let cov_u = {
        let js = j.select_columns(&live);
        (js.transpose() * &js).try_inverse().map(|m| {
            let mut full = DMatrix::zeros(p, p);
            for (a, &ka) in live.iter().enumerate() {
                for (b, &kb) in live.iter().enumerate() {
                    full[(ka, kb)] = m[(a, b)] * s2;
                }
            }
            full
        })
    };
    // Physical parameters as functions of u, for the delta method.
    // (T½, ΔH, ΔS, Γ, χT_HS, χT_LS, r, loop width, T↓, T↑): the turning points are found once
    // per evaluation.
    let phys_vec = |u: &DVector<f64>| -> [f64; 10] {
        let q = layout.physical(u);
        let tr = q.transition();
        let (down, up) = tr.turning_points().unwrap_or((f64::NAN, f64::NAN));
        [
            q.t_half,
            q.dh,
            tr.ds,
            tr.gamma / 1000.0,
            q.chit_hs,
            q.chit_ls,
            q.residual,
            up - down,
            down,
            up,
        ]
    };
    let errs: Option<Vec<f64>> = cov_u.as_ref().map(|cov| {
        let mut g = DMatrix::zeros(10, p);
        for k in 0..p {
            let mut a = u.clone();
            let mut b = u.clone();
            let h = 1e-5;
            a[k] += h;
            b[k] -= h;
            let (fa, fb) = (phys_vec(&a), phys_vec(&b));
            for i in 0..10 {
                g[(i, k)] = (fa[i] - fb[i]) / (2.0 * h);
            }
        }
        let c = &g * cov * g.transpose();
        (0..10).map(|i| c[(i, i)].max(0.0).sqrt()).collect()
    });
    let err = |i: usize| errs.as_ref().map(|e| e[i]).filter(|e| e.is_finite());
    let tr = phys.transition();
    let est = |value: f64, i: usize, free: bool| Estimate {
        value,
        err: if free { err(i) } else { None },
        fixed: !free,
    };
    let hs_free = matches!(req.chit_hs, PureState::Within { .. });
    let ls_free = matches!(req.chit_ls, PureState::Within { .. });
    let coop = req.model == ModelKind::Cooperative;
    let turning_points = tr.turning_points();
    let calc = calculated(&phys, pts, req.model)
        .ok_or_else(|| Error::Computation("the fitted curve is not finite".into()))?;
    let residuals: Vec<(f64, f64, f64, Branch)> = pts
        .iter()
        .zip(&calc)
        .map(|(p, c)| (p.t, p.chi_t, *c, p.branch))
        .collect();
    let rms =
        (residuals.iter().map(|r| (r.2 - r.1).powi(2)).sum::<f64>() / pts.len() as f64).sqrt();
    let correlations: Vec<Vec<f64>> = match &cov_u {
        Some(c) => (0..p)
            .map(|a| {
                (0..p)
                    .map(|b| {
                        let d = (c[(a, a)] * c[(b, b)]).sqrt();
                        if d > 0.0 {
                            c[(a, b)] / d
                        } else {
                            0.0
                        }
                    })
                    .collect()
            })
            .collect(),
        None => Vec::new(),
    };
    let mut warnings = Vec::new();
    if cov_u.is_none() {
        warnings.push(
            "the parameters are not all determined by these data (singular normal matrix): no uncertainties".to_string(),
        );
    }
    let t_min = pts.iter().map(|p| p.t).fold(f64::INFINITY, f64::min);
    let t_max = pts.iter().map(|p| p.t).fold(f64::NEG_INFINITY, f64::max);
    let g_lo = tr.intrinsic_fraction(t_min, Branch::Heating).unwrap_or(0.0);
    let g_hi = tr.intrinsic_fraction(t_max, Branch::Cooling).unwrap_or(1.0);
    if g_lo > 0.1 {
        warnings.push(format!(
            "no low-temperature plateau: the fitted high-spin fraction is still {:.0} % at {t_min} K, so χ_M·T of the low-spin state{} rests on the model",
            100.0 * g_lo,
            if ls_free { " and T½" } else { "" }
        ));
    }
    if g_hi < 0.9 {
        warnings.push(format!(
            "no high-temperature plateau: the fitted high-spin fraction is only {:.0} % at {t_max} K, so χ_M·T of the high-spin state{} rests on the model",
            100.0 * g_hi,
            if hs_free { " and T½" } else { "" }
        ));
    }
    let names = layout.names();
    for (name, value, i) in [
        ("T½", phys.t_half, 0),
        ("ΔH", phys.dh, 1),
        ("Γ", tr.gamma / 1000.0, 3),
    ] {
        if name == "Γ" && !coop {
            continue;
        }
        if let Some(e) = err(i) {
            if e > 0.5 * value.abs().max(1e-9) {
                warnings.push(format!(
                    "{name} is not pinned down by these data (±{:.0} %)",
                    100.0 * e / value.abs().max(1e-9)
                ));
            }
        }
    }
    for (what, state, value) in [
        ("high-spin", &req.chit_hs, phys.chit_hs),
        ("low-spin", &req.chit_ls, phys.chit_ls),
    ] {
        if let PureState::Within { lo, hi, why } = state {
            let near = 0.01 * (hi - lo).max(1e-9);
            if value - lo < near {
                warnings.push(format!(
                    "χ_M·T of the {what} state sits at the lower bound {lo:.3} cm³ K mol⁻¹ of its range ({why})"
                ));
            } else if hi - value < near {
                warnings.push(format!(
                    "χ_M·T of the {what} state sits at the upper bound {hi:.3} cm³ K mol⁻¹ of its range ({why})"
                ));
            }
        }
    }
    let mut notes = Vec::new();
    for (what, state) in [
        (SpinKind::High, &req.chit_hs),
        (SpinKind::Low, &req.chit_ls),
    ] {
        match state {
            PureState::Fixed(v) => notes.push(format!(
                "χ_M·T of the {} state fixed at {v} cm³ K mol⁻¹",
                what.adjective()
            )),
            PureState::Within { lo, hi, why } => notes.push(format!(
                "χ_M·T of the {} state fitted within {lo:.3}–{hi:.3} cm³ K mol⁻¹ ({why})",
                what.adjective()
            )),
        }
    }
    notes.push(if weighted {
        "residuals weighted by the given 1σ errors".to_string()
    } else {
        "unweighted fit; uncertainties scaled by the residual variance".to_string()
    });
    if coop && !pts.iter().any(|p| p.branch != Branch::Equilibrium) {
        notes.push("no branch information: points are read as equilibrium values".into());
    }
    let spin = req.two_s.map(|(h, l)| spin_entropy(h, l));
    Ok(FitResult {
        model: req.model,
        transition: tr,
        t_half: est(phys.t_half, 0, true),
        dh: est(phys.dh, 1, true),
        ds: est(tr.ds, 2, true),
        gamma: est(tr.gamma / 1000.0, 3, coop),
        gamma_over_2rt: phys.gamma_rel,
        t_down: turning_points.map(|(d, _)| Estimate {
            value: d,
            err: err(8),
            fixed: false,
        }),
        t_up: turning_points.map(|(_, up)| Estimate {
            value: up,
            err: err(9),
            fixed: false,
        }),
        loop_width: turning_points.map(|(d, up)| up - d),
        chit_hs: est(phys.chit_hs, 4, hs_free),
        chit_ls: est(phys.chit_ls, 5, ls_free),
        residual_hs_fraction: est(phys.residual, 6, req.residual),
        spin_entropy: spin,
        other_entropy: spin.map(|s| tr.ds - s),
        rms,
        residuals,
        parameter_names: names,
        correlations,
        warnings,
        notes,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::sco::model::simulate;

    /// A seeded normal generator (LCG + Box–Muller) for synthetic noise.
    struct Noise(u64);
    impl Noise {
        fn uniform(&mut self) -> f64 {
            self.0 = self
                .0
                .wrapping_mul(6364136223846793005)
                .wrapping_add(1442695040888963407);
            ((self.0 >> 11) as f64 + 0.5) / (1u64 << 53) as f64
        }
        fn normal(&mut self) -> f64 {
            let (a, b) = (self.uniform(), self.uniform());
            (-2.0 * a.ln()).sqrt() * (2.0 * std::f64::consts::PI * b).cos()
        }
    }

    fn curve(tr: &Transition, hs: f64, ls: f64, sigma: f64, seed: u64) -> Vec<Point> {
        let mut noise = Noise(seed);
        let temps: Vec<f64> = (0..60).map(|i| 60.0 + 4.0 * i as f64).collect();
        let sim = simulate(tr, &temps).unwrap();
        let mut pts = Vec::new();
        for (branch, order) in [(Branch::Cooling, true), (Branch::Heating, false)] {
            let mut rows: Vec<_> = sim.iter().collect();
            if order {
                rows.reverse();
            }
            for s in rows {
                let g = match branch {
                    Branch::Cooling => s.cooling,
                    _ => s.heating,
                };
                pts.push(Point {
                    t: s.t,
                    chi_t: g * hs + (1.0 - g) * ls + sigma * noise.normal(),
                    err: None,
                    branch,
                    line: pts.len() + 2,
                });
            }
        }
        pts
    }

    fn within(lo: f64, hi: f64) -> PureState {
        PureState::Within {
            lo,
            hi,
            why: "test range".into(),
        }
    }

    /// [Fe(2-pic)3]Cl2·MeOH: ΔH = 8.88 kJ/mol, ΔS = 59.5 J/mol/K, a gradual crossover peaking
    /// near 150 K (Inorg. Chem. 2001, 40, 3805). The ideal model gives T½ = ΔH/ΔS = 149 K, and
    /// a fit of its simulated curve with seeded noise recovers ΔH and ΔS within 2σ.
    #[test]
    fn ideal_round_trip_on_the_picolylamine_compound() {
        let tr = Transition {
            dh: 8880.0,
            ds: 59.5,
            gamma: 0.0,
            residual: 0.0,
        };
        assert!((tr.t_half() - 150.0).abs() < 2.0);
        let pts = curve(&tr, 3.3, 0.05, 0.02, 7);
        let r = fit(&FitRequest {
            points: pts,
            model: ModelKind::Ideal,
            chit_hs: within(2.8, 3.8),
            chit_ls: within(0.0, 0.5),
            residual: false,
            two_s: Some((4, 0)),
        })
        .unwrap();
        let (dh, ds) = (r.dh.err.unwrap(), r.ds.err.unwrap());
        assert!(dh < 1.0 && ds < 6.0, "{dh} {ds}");
        assert!((r.dh.value - 8.88).abs() < 2.0 * dh + 0.05, "{:?}", r.dh);
        assert!((r.ds.value - 59.5).abs() < 2.0 * ds + 0.3, "{:?}", r.ds);
        assert!((r.t_half.value - tr.t_half()).abs() < 1.0);
        assert!(r.rms < 0.03);
        // R ln 5 of the spin share (13.38 J/mol/K, common practice).
        assert!((r.spin_entropy.unwrap() - 13.38).abs() < 0.01);
    }

    /// A cooperative curve with a 12 K loop, cooling and heating branches: ΔH, ΔS and Γ come
    /// back within their reported 2σ, and the loop width within 1 K.
    #[test]
    fn cooperative_round_trip_with_hysteresis() {
        let base = Transition {
            dh: 12_000.0,
            ds: 80.0,
            gamma: 0.0,
            residual: 0.0,
        };
        let tr = Transition {
            gamma: 1.25 * 2.0 * GAS_CONSTANT * base.t_half(),
            ..base
        };
        let (down, up) = tr.turning_points().unwrap();
        let pts = curve(&tr, 3.2, 0.1, 0.01, 11);
        let r = fit(&FitRequest {
            points: pts,
            model: ModelKind::Cooperative,
            chit_hs: within(2.8, 3.8),
            chit_ls: within(0.0, 0.5),
            residual: false,
            two_s: Some((4, 0)),
        })
        .unwrap();
        for (got, want) in [(r.dh, 12.0), (r.ds, 80.0), (r.gamma, tr.gamma / 1000.0)] {
            let e = got.err.unwrap();
            assert!(e < 0.2 * want, "{got:?}");
            assert!(
                (got.value - want).abs() < 2.0 * e + 1e-3 * want,
                "{got:?} vs {want}"
            );
        }
        assert!(r.gamma_over_2rt > 1.0, "{r:?}");
        assert!(
            (r.loop_width.unwrap() - (up - down)).abs() < 1.0,
            "{:?}",
            r.loop_width
        );
    }

    #[test]
    fn bad_curves_are_explained() {
        let tr = Transition {
            dh: 10_000.0,
            ds: 70.0,
            gamma: 0.0,
            residual: 0.0,
        };
        let pts = curve(&tr, 3.2, 0.1, 0.0, 1);
        let req = |points: Vec<Point>| FitRequest {
            points,
            model: ModelKind::Ideal,
            chit_hs: within(2.8, 3.8),
            chit_ls: within(0.0, 0.5),
            residual: false,
            two_s: None,
        };
        let e = fit(&req(pts[..3].to_vec())).unwrap_err().to_string();
        assert!(e.contains("at least 5 points"), "{e}");
        let flat: Vec<Point> = pts.iter().map(|p| Point { chi_t: 3.2, ..*p }).collect();
        let e = fit(&req(flat)).unwrap_err().to_string();
        assert!(e.contains("no transition") && e.contains("moment"), "{e}");
        let mut wild = pts.clone();
        wild[4].chi_t = 9.0;
        let e = fit(&req(wild)).unwrap_err().to_string();
        assert!(e.contains("physically possible range"), "{e}");
    }
}
