//! Reports of `spinstate sco-fit` and `spinstate sco-curve`: a spin transition fitted to or
//! simulated as χ_M·T(T), as a table, JSON, CSV and SVG.
//!
//! JSON contract (a top-level object; fields are only ever added): T in K, ΔH and Γ in
//! kJ mol⁻¹, ΔS in J mol⁻¹ K⁻¹, χ_M·T in cm³ K mol⁻¹; every fitted quantity `x` has `x_err`
//! (1σ; null when fixed or not determined).

use super::{fmt_num, new_table};
use crate::sco::fit::{Estimate, FitResult};
use crate::sco::model::{simulate, Branch, Transition, GAS_CONSTANT};
use plotters::prelude::*;
use serde::Serialize;

/// One data point with the fitted value.
#[derive(Debug, Clone, Serialize)]
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
#[derive(Debug, Clone, Serialize)]
pub struct FitReport {
    /// "ideal" or "cooperative".
    pub model: String,
    /// Where the values came from.
    pub source: String,
    pub points: usize,
    /// T½ (K).
    pub t_half: f64,
    pub t_half_err: Option<f64>,
    /// ΔH (kJ mol⁻¹).
    pub dh: f64,
    pub dh_err: Option<f64>,
    /// ΔS (J mol⁻¹ K⁻¹).
    pub ds: f64,
    pub ds_err: Option<f64>,
    /// Γ (kJ mol⁻¹); 0 for the ideal model.
    pub gamma: f64,
    pub gamma_err: Option<f64>,
    /// Γ/(2RT½): above 1 the transition is first order with hysteresis.
    pub gamma_over_2rt_half: f64,
    /// Turning points of the loop (K); null without hysteresis.
    pub t_down: Option<f64>,
    pub t_down_err: Option<f64>,
    pub t_up: Option<f64>,
    pub t_up_err: Option<f64>,
    /// T↑ − T↓ (K); null without hysteresis.
    pub loop_width: Option<f64>,
    /// χ_M·T of the pure high- and low-spin states (cm³ K mol⁻¹).
    pub chit_hs: f64,
    pub chit_hs_err: Option<f64>,
    pub chit_ls: f64,
    pub chit_ls_err: Option<f64>,
    /// Trapped high-spin fraction r.
    pub residual_hs_fraction: f64,
    pub residual_hs_fraction_err: Option<f64>,
    /// R ln[(2S_HS+1)/(2S_LS+1)] (J mol⁻¹ K⁻¹) and ΔS minus it; null without the spins.
    pub ds_spin: Option<f64>,
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

    /// Human-readable table.
    pub fn to_table(&self) -> String {
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
    pub fn to_csv(&self) -> String {
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
    }

    /// SVG: the data (cooling ▼, heating ▲, other ●) with the fitted curve on both branches,
    /// a γ_HS axis on the right and a residual panel below.
    pub fn to_svg(&self) -> Result<String, String> {
        let tmin = self
            .residuals
            .iter()
            .map(|r| r.t)
            .fold(f64::INFINITY, f64::min);
        let tmax = self
            .residuals
            .iter()
            .map(|r| r.t)
            .fold(f64::NEG_INFINITY, f64::max);
        let points: Vec<(f64, f64, &str)> = self
            .residuals
            .iter()
            .map(|r| (r.t, r.observed, r.branch.as_str()))
            .collect();
        let resid: Vec<(f64, f64)> = self.residuals.iter().map(|r| (r.t, r.residual)).collect();
        draw(
            &format!(
                "χ_M·T fit ({} model), T½ = {:.1} K",
                self.model, self.t_half
            ),
            &self.transition,
            self.chit_hs,
            self.chit_ls,
            tmin,
            tmax,
            &points,
            Some(&resid),
        )
    }
}

/// One simulated point.
#[derive(Debug, Clone, Serialize)]
pub struct CurveRow {
    /// K.
    pub t: f64,
    /// High-spin fraction on the heating and cooling branches (equal outside a loop).
    pub gamma_heating: f64,
    pub gamma_cooling: f64,
    /// χ_M·T on each branch (cm³ K mol⁻¹).
    pub chit_heating: f64,
    pub chit_cooling: f64,
}

/// The `sco-curve` report.
#[derive(Debug, Clone, Serialize)]
pub struct CurveReport {
    /// kJ mol⁻¹, J mol⁻¹ K⁻¹, kJ mol⁻¹.
    pub dh: f64,
    pub ds: f64,
    pub gamma: f64,
    /// T½ = ΔH/ΔS (K).
    pub t_half: f64,
    pub gamma_over_2rt_half: f64,
    pub residual_hs_fraction: f64,
    /// Turning points (K); null without hysteresis.
    pub t_down: Option<f64>,
    pub t_up: Option<f64>,
    pub chit_hs: f64,
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

    pub fn to_table(&self) -> String {
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

    pub fn to_csv(&self) -> String {
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
    }

    pub fn to_svg(&self) -> Result<String, String> {
        let tmin = self.points.first().map_or(1.0, |p| p.t);
        let tmax = self.points.last().map_or(400.0, |p| p.t);
        draw(
            &format!(
                "simulated transition, T½ = {:.1} K, Γ/2RT½ = {:.2}",
                self.t_half, self.gamma_over_2rt_half
            ),
            &self.transition,
            self.chit_hs,
            self.chit_ls,
            tmin,
            tmax,
            &[],
            None,
        )
    }
}

const COOL: RGBColor = RGBColor(31, 96, 168);
const HEAT: RGBColor = RGBColor(196, 78, 38);
const GREY: RGBColor = RGBColor(90, 90, 90);

#[allow(clippy::too_many_arguments)]
fn draw(
    title: &str,
    tr: &Transition,
    hs: f64,
    ls: f64,
    tmin: f64,
    tmax: f64,
    points: &[(f64, f64, &str)],
    residuals: Option<&[(f64, f64)]>,
) -> Result<String, String> {
    let e = |e: &dyn std::fmt::Display| e.to_string();
    let mut out = String::new();
    {
        let height = if residuals.is_some() { 640 } else { 520 };
        let root = SVGBackend::with_string(&mut out, (820, height)).into_drawing_area();
        root.fill(&WHITE).map_err(|x| e(&x))?;
        let (top, bottom) = match residuals {
            Some(_) => root.split_vertically(470),
            None => (root.clone(), root.clone()),
        };
        let span = (tmax - tmin).max(1.0);
        let (x0, x1) = ((tmin - 0.03 * span).max(0.1), tmax + 0.03 * span);
        let obs_max = points.iter().map(|p| p.1).fold(hs.max(ls), f64::max);
        let y1 = obs_max * 1.08 + 0.05;
        let y0 = ls
            .min(0.0)
            .min(points.iter().map(|p| p.1).fold(0.0, f64::min))
            - 0.05;
        let mut chart = ChartBuilder::on(&top)
            .caption(title, ("sans-serif", 19))
            .margin(14)
            .x_label_area_size(40)
            .y_label_area_size(60)
            .right_y_label_area_size(56)
            .build_cartesian_2d(x0..x1, y0..y1)
            .map_err(|x| e(&x))?
            .set_secondary_coord(x0..x1, ((y0 - ls) / (hs - ls))..((y1 - ls) / (hs - ls)));
        chart
            .configure_mesh()
            .x_desc("T / K")
            .y_desc("χ_M·T / cm³ K mol⁻¹")
            .light_line_style(RGBColor(236, 236, 236))
            .draw()
            .map_err(|x| e(&x))?;
        chart
            .configure_secondary_axes()
            .y_desc("γ_HS")
            .draw()
            .map_err(|x| e(&x))?;
        let n = 400;
        let grid: Vec<f64> = (0..=n)
            .map(|i| x0 + (x1 - x0) * i as f64 / n as f64)
            .collect();
        let sim = simulate(tr, &grid).map_err(|x| e(&x))?;
        let line = |g: f64| g * hs + (1.0 - g) * ls;
        let looped = tr.turning_points().is_some();
        chart
            .draw_series(LineSeries::new(
                sim.iter().map(|p| (p.t, line(p.heating))),
                HEAT.stroke_width(2),
            ))
            .map_err(|x| e(&x))?
            .label(if looped {
                "model, heating branch"
            } else {
                "model"
            })
            .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], HEAT.stroke_width(2)));
        if looped {
            chart
                .draw_series(LineSeries::new(
                    sim.iter().map(|p| (p.t, line(p.cooling))),
                    COOL.stroke_width(2),
                ))
                .map_err(|x| e(&x))?
                .label("model, cooling branch")
                .legend(|(x, y)| PathElement::new(vec![(x, y), (x + 18, y)], COOL.stroke_width(2)));
        }
        for (kind, color, label) in [
            ("cooling", COOL, "measured, cooling"),
            ("heating", HEAT, "measured, heating"),
            ("equilibrium", GREY, "measured"),
        ] {
            let these: Vec<(f64, f64)> = points
                .iter()
                .filter(|p| p.2 == kind)
                .map(|p| (p.0, p.1))
                .collect();
            if these.is_empty() {
                continue;
            }
            let series = these.iter().map(move |&(x, y)| {
                EmptyElement::at((x, y))
                    + match kind {
                        "cooling" => TriangleMarker::new((0, 0), 5, color.filled()).into_dyn(),
                        "heating" => {
                            TriangleMarker::new((0, 0), 5, color.stroke_width(1)).into_dyn()
                        }
                        _ => Circle::new((0, 0), 3, color.filled()).into_dyn(),
                    }
            });
            chart
                .draw_series(series)
                .map_err(|x| e(&x))?
                .label(label)
                .legend(move |(x, y)| TriangleMarker::new((x + 9, y), 5, color.filled()));
        }
        chart
            .configure_series_labels()
            .background_style(WHITE.mix(0.85))
            .border_style(BLACK)
            .position(SeriesLabelPosition::UpperLeft)
            .draw()
            .map_err(|x| e(&x))?;
        if let Some(res) = residuals {
            let r = res.iter().map(|p| p.1.abs()).fold(0.0, f64::max).max(1e-3) * 1.2;
            let mut rc = ChartBuilder::on(&bottom)
                .margin(14)
                .x_label_area_size(36)
                .y_label_area_size(60)
                .right_y_label_area_size(56)
                .build_cartesian_2d(x0..x1, -r..r)
                .map_err(|x| e(&x))?;
            rc.configure_mesh()
                .x_desc("T / K")
                .y_desc("residual")
                .y_labels(5)
                .light_line_style(RGBColor(236, 236, 236))
                .draw()
                .map_err(|x| e(&x))?;
            rc.draw_series(LineSeries::new(vec![(x0, 0.0), (x1, 0.0)], GREY))
                .map_err(|x| e(&x))?;
            rc.draw_series(
                res.iter()
                    .map(|&(x, y)| Circle::new((x, y), 2, GREY.filled())),
            )
            .map_err(|x| e(&x))?;
        }
        root.present().map_err(|x| e(&x))?;
    }
    Ok(out)
}
