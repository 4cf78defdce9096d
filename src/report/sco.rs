//! Reports of `spinstate sco-fit` and `spinstate sco-curve`: a spin transition fitted to or
//! simulated as χ_M·T(T), as a table, JSON, CSV and SVG.
//!
//! JSON contract (a top-level object; fields are only ever added): T in K, ΔH and Γ in
//! kJ mol⁻¹, ΔS in J mol⁻¹ K⁻¹, χ_M·T in cm³ K mol⁻¹; every fitted quantity `x` has `x_err`
//! (1σ; null when fixed or not determined).

use super::Render;
use super::{fmt_num, new_table};
use crate::plot::moment::Curve;
use crate::plot::style::Column;
use crate::plot::transition::{
    transition_svg, Direction, Marker, TransitionFigure, TransitionPoint, TransitionQuantity,
};
use crate::sco::fit::{Estimate, FitResult};
use crate::sco::model::{simulate, Branch, Transition, GAS_CONSTANT};
use serde::Serialize;

/// One data point with the fitted value.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct ResidualRow {
    /// K.
    pub t: f64,
    /// Observed χ_M·T (cm³ K mol⁻¹).
    pub observed: f64,
    /// Fitted χ_M·T (cm³ K mol⁻¹).
    pub calculated: f64,
    /// observed − calculated (cm³ K mol⁻¹).
    pub residual: f64,
    /// "cooling", "heating" or "equilibrium".
    pub branch: String,
}

/// The `sco-fit` report.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct FitReport {
    /// "ideal" or "cooperative".
    pub model: String,
    /// Where the values came from.
    pub source: String,
    /// Number of data points fitted.
    pub points: usize,
    /// T½ (K).
    pub t_half: f64,
    /// 1σ of T½ (K); null when not determined.
    pub t_half_err: Option<f64>,
    /// ΔH (kJ mol⁻¹).
    pub dh: f64,
    /// 1σ of ΔH (kJ mol⁻¹); null when not determined.
    pub dh_err: Option<f64>,
    /// ΔS (J mol⁻¹ K⁻¹).
    pub ds: f64,
    /// 1σ of ΔS (J mol⁻¹ K⁻¹); null when not determined.
    pub ds_err: Option<f64>,
    /// Γ (kJ mol⁻¹); 0 for the ideal model.
    pub gamma: f64,
    /// 1σ of Γ (kJ mol⁻¹); null when not fitted.
    pub gamma_err: Option<f64>,
    /// Γ/(2RT½): above 1 the transition is first order with hysteresis.
    pub gamma_over_2rt_half: f64,
    /// Lower turning point T↓ of the loop (K); null without hysteresis.
    pub t_down: Option<f64>,
    /// 1σ of T↓ (K); null without hysteresis.
    pub t_down_err: Option<f64>,
    /// Upper turning point T↑ of the loop (K); null without hysteresis.
    pub t_up: Option<f64>,
    /// 1σ of T↑ (K); null without hysteresis.
    pub t_up_err: Option<f64>,
    /// T↑ − T↓ (K); null without hysteresis.
    pub loop_width: Option<f64>,
    /// χ_M·T of the pure high-spin state (cm³ K mol⁻¹).
    pub chit_hs: f64,
    /// 1σ of the high-spin χ_M·T (cm³ K mol⁻¹); null when fixed.
    pub chit_hs_err: Option<f64>,
    /// χ_M·T of the pure low-spin state (cm³ K mol⁻¹).
    pub chit_ls: f64,
    /// 1σ of the low-spin χ_M·T (cm³ K mol⁻¹); null when fixed.
    pub chit_ls_err: Option<f64>,
    /// Trapped high-spin fraction r.
    pub residual_hs_fraction: f64,
    /// 1σ of the trapped high-spin fraction; null when not fitted.
    pub residual_hs_fraction_err: Option<f64>,
    /// R ln[(2S_HS+1)/(2S_LS+1)] (J mol⁻¹ K⁻¹) and ΔS minus it; null without the spins.
    pub ds_spin: Option<f64>,
    /// ΔS minus its spin part (J mol⁻¹ K⁻¹, mostly vibrational); null without the spins.
    pub ds_other: Option<f64>,
    /// RMS of the residuals (cm³ K mol⁻¹).
    pub rms: f64,
    /// Free parameters and their correlation matrix.
    pub parameters: Vec<String>,
    /// Quantities held fixed rather than fitted (names as in this object, e.g. "chit_ls").
    pub fixed: Vec<String>,
    pub correlations: Vec<Vec<f64>>,
    pub residuals: Vec<ResidualRow>,
    pub warnings: Vec<String>,
    pub notes: Vec<String>,
    #[serde(skip)]
    transition: Transition,
}

fn split(e: &Estimate) -> (f64, Option<f64>) {
    (e.value, e.err)
}

fn branch_name(b: Branch) -> String {
    b.name().to_string()
}

impl FitReport {
    pub fn new(r: &FitResult, source: &str, notes: &[String]) -> Self {
        let (t_half, t_half_err) = split(&r.t_half);
        let (dh, dh_err) = split(&r.dh);
        let (ds, ds_err) = split(&r.ds);
        let (gamma, gamma_err) = split(&r.gamma);
        let (chit_hs, chit_hs_err) = split(&r.chit_hs);
        let (chit_ls, chit_ls_err) = split(&r.chit_ls);
        let (res, res_err) = split(&r.residual_hs_fraction);
        let mut all_notes = notes.to_vec();
        all_notes.extend(r.notes.iter().cloned());
        FitReport {
            model: r.model.name().to_string(),
            source: source.to_string(),
            points: r.residuals.len(),
            t_half,
            t_half_err,
            dh,
            dh_err,
            ds,
            ds_err,
            gamma,
            gamma_err,
            gamma_over_2rt_half: r.gamma_over_2rt,
            t_down: r.t_down.map(|e| e.value),
            t_down_err: r.t_down.and_then(|e| e.err),
            t_up: r.t_up.map(|e| e.value),
            t_up_err: r.t_up.and_then(|e| e.err),
            loop_width: r.loop_width,
            chit_hs,
            chit_hs_err,
            chit_ls,
            chit_ls_err,
            residual_hs_fraction: res,
            residual_hs_fraction_err: res_err,
            ds_spin: r.spin_entropy,
            ds_other: r.other_entropy,
            rms: r.rms,
            parameters: r.parameter_names.iter().map(|s| s.to_string()).collect(),
            fixed: [
                ("gamma", &r.gamma),
                ("chit_hs", &r.chit_hs),
                ("chit_ls", &r.chit_ls),
                ("residual_hs_fraction", &r.residual_hs_fraction),
            ]
            .into_iter()
            .filter(|(_, e)| e.fixed)
            .map(|(n, _)| n.to_string())
            .collect(),
            correlations: r.correlations.clone(),
            residuals: r
                .residuals
                .iter()
                .map(|&(t, o, c, b)| ResidualRow {
                    t,
                    observed: o,
                    calculated: c,
                    residual: o - c,
                    branch: branch_name(b),
                })
                .collect(),
            warnings: r.warnings.clone(),
            notes: all_notes,
            transition: r.transition,
        }
    }

    /// SVG: the data (cooling ▼, heating △, other ○) with the fitted curve on both branches,
    /// a γ_HS axis on the right and a residual panel below; one journal column wide.
    pub fn to_svg(&self) -> Result<String, String> {
        Ok(self.to_svg_with(&TransitionPlot::default()))
    }

    /// The figure at the width and in the quantity asked for.
    pub fn to_svg_with(&self, plot: &TransitionPlot) -> String {
        let (lo, hi) = self
            .residuals
            .iter()
            .map(|r| r.t)
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), t| {
                (a.min(t), b.max(t))
            });
        let title = if self.model == "cooperative" {
            format!(
                "Cooperative fit: Δ*H* = {:.1} kJ mol⁻¹, *Γ* = {:.2} kJ mol⁻¹",
                self.dh, self.gamma
            )
        } else {
            format!(
                "Ideal fit: Δ*H* = {:.1} kJ mol⁻¹, Δ*S* = {:.0} J K⁻¹ mol⁻¹",
                self.dh, self.ds
            )
        };
        let points: Vec<(f64, f64, Direction, Option<f64>)> = self
            .residuals
            .iter()
            .map(|r| (r.t, r.observed, direction(&r.branch), Some(r.residual)))
            .collect();
        figure(
            title,
            &self.transition,
            (self.chit_hs, self.chit_ls),
            (lo, hi),
            &points,
            (self.t_down.zip(self.t_up), self.t_half),
            plot,
        )
    }
}

impl Render for FitReport {
    type Figure = TransitionPlot;

    fn svg(&self, plot: &TransitionPlot) -> Option<String> {
        Some(self.to_svg_with(plot))
    }

    /// Human-readable table.
    fn table(&self) -> String {
        // A value without an uncertainty was either held fixed or is not determined by the data.
        let pm = |name: &str, v: f64, e: Option<f64>, d: usize| match e {
            Some(e) => format!("{} ± {}", fmt_num(v, d), fmt_num(e, d.max(1))),
            None if self.fixed.iter().any(|f| f == name) => format!("{} (fixed)", fmt_num(v, d)),
            None => format!("{} (not determined)", fmt_num(v, d)),
        };
        let mut out = format!(
            "spin-transition fit: {} model, {} points ({})\n",
            self.model, self.points, self.source
        );
        let mut t = new_table(["quantity", "value", "unit"]);
        t.add_row(vec![
            "T½".into(),
            pm("t_half", self.t_half, self.t_half_err, 1),
            "K".into(),
        ]);
        t.add_row(vec![
            "ΔH".into(),
            pm("dh", self.dh, self.dh_err, 2),
            "kJ/mol".into(),
        ]);
        t.add_row(vec![
            "ΔS".into(),
            pm("ds", self.ds, self.ds_err, 1),
            "J/mol/K".into(),
        ]);
        if self.model == "cooperative" {
            t.add_row(vec![
                "Γ".into(),
                pm("gamma", self.gamma, self.gamma_err, 2),
                "kJ/mol".into(),
            ]);
            t.add_row(vec![
                "Γ/(2RT½)".into(),
                fmt_num(self.gamma_over_2rt_half, 2),
                "".into(),
            ]);
        }
        if let (Some(d), Some(u)) = (self.t_down, self.t_up) {
            t.add_row(vec![
                "T↓".into(),
                pm("t_down", d, self.t_down_err, 1),
                "K".into(),
            ]);
            t.add_row(vec![
                "T↑".into(),
                pm("t_up", u, self.t_up_err, 1),
                "K".into(),
            ]);
            t.add_row(vec!["loop width".into(), fmt_num(u - d, 1), "K".into()]);
        }
        t.add_row(vec![
            "χ_M·T (high spin)".into(),
            pm("chit_hs", self.chit_hs, self.chit_hs_err, 3),
            "cm³ K/mol".into(),
        ]);
        t.add_row(vec![
            "χ_M·T (low spin)".into(),
            pm("chit_ls", self.chit_ls, self.chit_ls_err, 3),
            "cm³ K/mol".into(),
        ]);
        if self.residual_hs_fraction_err.is_some() || self.residual_hs_fraction > 0.0 {
            t.add_row(vec![
                "trapped high-spin fraction".into(),
                pm(
                    "residual_hs_fraction",
                    self.residual_hs_fraction,
                    self.residual_hs_fraction_err,
                    3,
                ),
                "".into(),
            ]);
        }
        if let (Some(s), Some(o)) = (self.ds_spin, self.ds_other) {
            t.add_row(vec![
                "ΔS: spin part R ln[(2S_HS+1)/(2S_LS+1)]".into(),
                fmt_num(s, 2),
                "J/mol/K".into(),
            ]);
            t.add_row(vec![
                "ΔS: the rest (mostly vibrational)".into(),
                fmt_num(o, 1),
                "J/mol/K".into(),
            ]);
        }
        t.add_row(vec![
            "rms residual".into(),
            fmt_num(self.rms, 4),
            "cm³ K/mol".into(),
        ]);
        out.push_str(&format!("{t}\n"));
        if !self.warnings.is_empty() {
            out.push_str("warnings:\n");
            for w in &self.warnings {
                out.push_str(&format!("- {w}\n"));
            }
        }
        if !self.notes.is_empty() {
            out.push_str("notes:\n");
            for n in &self.notes {
                out.push_str(&format!("- {n}\n"));
            }
        }
        out
    }

    /// CSV of the points: T, observed, calculated, residual, branch (full precision).
    fn csv(&self) -> Option<String> {
        Some({
            let mut w = csv::Writer::from_writer(Vec::new());
            let _ = w.write_record([
                "t_k",
                "chit_observed_cm3kmol",
                "chit_calculated_cm3kmol",
                "residual_cm3kmol",
                "branch",
            ]);
            for r in &self.residuals {
                let _ = w.write_record([
                    r.t.to_string(),
                    r.observed.to_string(),
                    r.calculated.to_string(),
                    r.residual.to_string(),
                    r.branch.clone(),
                ]);
            }
            String::from_utf8(w.into_inner().unwrap_or_default()).unwrap_or_default()
        })
    }
}

/// How the spin-transition figure is drawn.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TransitionPlot {
    pub column: Column,
    /// Plot γ_HS instead of χ_M·T (χ_M·T is kept when the pure states' χ_M·T are equal).
    pub fraction: bool,
}

impl Default for TransitionPlot {
    fn default() -> Self {
        TransitionPlot {
            column: Column::Single,
            fraction: false,
        }
    }
}

fn direction(branch: &str) -> Direction {
    match branch {
        "cooling" => Direction::Cooling,
        "heating" => Direction::Heating,
        _ => Direction::Other,
    }
}

/// Points of the model curve across the plotted range (smooth at print size).
const CURVE_POINTS: usize = 400;

/// The figure of a transition with χ_M·T `hs`/`ls` of the pure states over `range` (K), with
/// measured (T, χ_M·T, direction, residual) points and the loop's turning points or T½.
fn figure(
    title: String,
    tr: &Transition,
    (hs, ls): (f64, f64),
    (tmin, tmax): (f64, f64),
    points: &[(f64, f64, Direction, Option<f64>)],
    (turning, t_half): (Option<(f64, f64)>, f64),
    plot: &TransitionPlot,
) -> String {
    let fraction = plot.fraction && hs - ls > 1e-9;
    let (tmin, tmax) = if tmin.is_finite() && tmax > tmin {
        (tmin, tmax)
    } else {
        (50.0, 350.0)
    };
    let span = tmax - tmin;
    let (a, b) = ((tmin - 0.03 * span).max(1.0), tmax + 0.03 * span);
    let grid: Vec<f64> = (0..=CURVE_POINTS)
        .map(|i| a + (b - a) * i as f64 / CURVE_POINTS as f64)
        .collect();
    // The model is only ever evaluated at checked parameters; a failure leaves the curve out.
    let sim = simulate(tr, &grid).unwrap_or_default();
    let y = |g: f64| if fraction { g } else { g * hs + (1.0 - g) * ls };
    let scale = if fraction { hs - ls } else { 1.0 };
    let of_chit = |v: f64| if fraction { (v - ls) / (hs - ls) } else { v };
    let mut curves = Vec::new();
    if !sim.is_empty() {
        let t: Vec<f64> = sim.iter().map(|p| p.t).collect();
        curves.push(Curve {
            name: if turning.is_some() {
                "model, heating branch".into()
            } else {
                "model".into()
            },
            t: t.clone(),
            y: sim.iter().map(|p| y(p.heating)).collect(),
        });
        if turning.is_some() {
            curves.push(Curve {
                name: "model, cooling branch".into(),
                t,
                y: sim.iter().map(|p| y(p.cooling)).collect(),
            });
        }
    }
    let markers = match turning {
        Some((d, u)) => vec![
            Marker {
                symbol: "*T*↓".into(),
                t: d,
            },
            Marker {
                symbol: "*T*↑".into(),
                t: u,
            },
        ],
        None => vec![Marker {
            symbol: "*T*_{½}".into(),
            t: t_half,
        }],
    };
    transition_svg(
        &TransitionFigure {
            title,
            quantity: if fraction {
                TransitionQuantity::Fraction
            } else {
                TransitionQuantity::ChiT { hs, ls }
            },
            curves,
            measured: points
                .iter()
                .map(|&(t, v, direction, residual)| TransitionPoint {
                    t,
                    y: of_chit(v),
                    direction,
                    residual: residual.map(|r| r / scale),
                })
                .collect(),
            markers,
            residual_panel: points.iter().any(|p| p.3.is_some()),
        },
        plot.column,
    )
}

/// One simulated point.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct CurveRow {
    /// K.
    pub t: f64,
    /// High-spin fraction on the heating branch (0..1; equal to cooling outside a loop).
    pub gamma_heating: f64,
    /// High-spin fraction on the cooling branch (0..1).
    pub gamma_cooling: f64,
    /// χ_M·T on the heating branch (cm³ K mol⁻¹).
    pub chit_heating: f64,
    /// χ_M·T on the cooling branch (cm³ K mol⁻¹).
    pub chit_cooling: f64,
}

/// The `sco-curve` report.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct CurveReport {
    /// ΔH = H_HS − H_LS (kJ mol⁻¹).
    pub dh: f64,
    /// ΔS = S_HS − S_LS (J mol⁻¹ K⁻¹).
    pub ds: f64,
    /// Interaction parameter Γ (kJ mol⁻¹); 0 for the ideal model.
    pub gamma: f64,
    /// T½ = ΔH/ΔS (K).
    pub t_half: f64,
    /// Γ/(2RT½) (dimensionless): above 1 the transition is first order with hysteresis.
    pub gamma_over_2rt_half: f64,
    /// Trapped high-spin fraction r (0 ≤ r < 1).
    pub residual_hs_fraction: f64,
    /// Lower turning point T↓ (K); null without hysteresis.
    pub t_down: Option<f64>,
    /// Upper turning point T↑ (K); null without hysteresis.
    pub t_up: Option<f64>,
    /// χ_M·T of the pure high-spin state (cm³ K mol⁻¹).
    pub chit_hs: f64,
    /// χ_M·T of the pure low-spin state (cm³ K mol⁻¹).
    pub chit_ls: f64,
    pub points: Vec<CurveRow>,
    #[serde(skip)]
    transition: Transition,
}

impl CurveReport {
    pub fn new(tr: &Transition, temps: &[f64], chit_hs: f64, chit_ls: f64) -> crate::Result<Self> {
        let sim = simulate(tr, temps)?;
        let turning = tr.turning_points();
        Ok(CurveReport {
            dh: tr.dh / 1000.0,
            ds: tr.ds,
            gamma: tr.gamma / 1000.0,
            t_half: tr.t_half(),
            gamma_over_2rt_half: tr.gamma / (2.0 * GAS_CONSTANT * tr.t_half()),
            residual_hs_fraction: tr.residual,
            t_down: turning.map(|t| t.0),
            t_up: turning.map(|t| t.1),
            chit_hs,
            chit_ls,
            points: sim
                .iter()
                .map(|p| CurveRow {
                    t: p.t,
                    gamma_heating: p.heating,
                    gamma_cooling: p.cooling,
                    chit_heating: p.heating * chit_hs + (1.0 - p.heating) * chit_ls,
                    chit_cooling: p.cooling * chit_hs + (1.0 - p.cooling) * chit_ls,
                })
                .collect(),
            transition: *tr,
        })
    }

    /// SVG of χ_M·T (and γ_HS) against T on both branches, one journal column wide.
    pub fn to_svg(&self) -> Result<String, String> {
        Ok(self.to_svg_with(&TransitionPlot::default()))
    }

    /// The figure at the width and in the quantity asked for.
    pub fn to_svg_with(&self, plot: &TransitionPlot) -> String {
        let tmin = self.points.first().map_or(50.0, |p| p.t);
        let tmax = self.points.last().map_or(350.0, |p| p.t);
        let title = if self.gamma > 0.0 {
            format!(
                "Simulated: Δ*H* = {:.1} kJ mol⁻¹, *Γ* = {:.2} kJ mol⁻¹",
                self.dh, self.gamma
            )
        } else {
            format!(
                "Simulated: Δ*H* = {:.1} kJ mol⁻¹, Δ*S* = {:.0} J K⁻¹ mol⁻¹",
                self.dh, self.ds
            )
        };
        figure(
            title,
            &self.transition,
            (self.chit_hs, self.chit_ls),
            (tmin, tmax),
            &[],
            (self.t_down.zip(self.t_up), self.t_half),
            plot,
        )
    }
}

impl Render for CurveReport {
    type Figure = TransitionPlot;

    fn svg(&self, plot: &TransitionPlot) -> Option<String> {
        Some(self.to_svg_with(plot))
    }

    fn table(&self) -> String {
        let mut out = format!(
            "spin transition: ΔH = {} kJ/mol, ΔS = {} J/mol/K, Γ = {} kJ/mol (Γ/2RT½ = {}), T½ = {} K\n",
            fmt_num(self.dh, 2),
            fmt_num(self.ds, 1),
            fmt_num(self.gamma, 2),
            fmt_num(self.gamma_over_2rt_half, 2),
            fmt_num(self.t_half, 1)
        );
        match (self.t_down, self.t_up) {
            (Some(d), Some(u)) => out.push_str(&format!(
                "hysteresis: T↓ = {} K, T↑ = {} K, loop width {} K\n",
                fmt_num(d, 1),
                fmt_num(u, 1),
                fmt_num(u - d, 1)
            )),
            _ => out.push_str("no hysteresis (Γ ≤ 2RT½)\n"),
        }
        let mut t = new_table([
            "T (K)",
            "γ_HS heating",
            "γ_HS cooling",
            "χ_M·T heating (cm³ K/mol)",
            "χ_M·T cooling (cm³ K/mol)",
        ]);
        for p in &self.points {
            t.add_row(vec![
                fmt_num(p.t, 1),
                fmt_num(p.gamma_heating, 4),
                fmt_num(p.gamma_cooling, 4),
                fmt_num(p.chit_heating, 4),
                fmt_num(p.chit_cooling, 4),
            ]);
        }
        out.push_str(&format!("{t}\n"));
        out
    }

    fn csv(&self) -> Option<String> {
        Some({
            let mut w = csv::Writer::from_writer(Vec::new());
            let _ = w.write_record([
                "t_k",
                "gamma_heating",
                "gamma_cooling",
                "chit_heating_cm3kmol",
                "chit_cooling_cm3kmol",
            ]);
            for p in &self.points {
                let _ = w.write_record([
                    p.t.to_string(),
                    p.gamma_heating.to_string(),
                    p.gamma_cooling.to_string(),
                    p.chit_heating.to_string(),
                    p.chit_cooling.to_string(),
                ]);
            }
            String::from_utf8(w.into_inner().unwrap_or_default()).unwrap_or_default()
        })
    }
}
