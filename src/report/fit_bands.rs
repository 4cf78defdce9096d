//! Report of `spinstate fit-bands`: fitted Dq, B, C with the band assignment.

use super::Render;
use super::{fmt_num, new_table};
use crate::spectra::fit::{
    relative_to_crossover, AssignedBand, BandFit, Determination, FitOutcome, FitParameter,
};
use crate::spectra::EnergyUnit;
use crate::Result;
use serde::Serialize;

/// One observed band with its assignment.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct AssignmentRow {
    /// Observed maximum (cm⁻¹).
    pub observed: f64,
    /// Observed maximum in the input unit.
    pub observed_in_unit: f64,
    /// Transition, e.g. "4A2g → 4T1g(F)".
    pub transition: String,
    /// Upper level's unique label ("4T1g(F)").
    pub label: String,
    /// Upper level's free-ion parent term.
    pub parent: String,
    /// Calculated position at the fitted parameters (cm⁻¹).
    pub calculated: f64,
    /// Observed − calculated (cm⁻¹).
    pub residual: f64,
    /// Electrons changing orbital set in the strong-field limit (1 = one-electron jump).
    pub electrons_moved: Option<u32>,
    /// Expected weak: a two-electron jump with no one-electron level of its symmetry to mix
    /// with, a jump of three or more electrons, or one within a configuration.
    pub weak: bool,
}

/// A calculated transition that was not observed.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct PredictedRow {
    pub transition: String,
    pub label: String,
    pub parent: String,
    /// Position (cm⁻¹).
    pub energy: f64,
    /// Position as a wavelength (nm).
    pub wavelength_nm: f64,
    /// Electrons that change orbital in the band's main strong-field jump (1 or 2); null when not determined.
    pub electrons_moved: Option<u32>,
    pub weak: bool,
}

/// A parameter held fixed.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct FixedRow {
    /// "B", "C" or "C/B".
    pub name: String,
    /// Value held (cm⁻¹, or the ratio), null when the parameter does not enter.
    pub value: Option<f64>,
    pub reason: String,
}

/// 1σ uncertainties (null when exactly determined or not fitted).
#[derive(Debug, Clone, Serialize, Default, schemars::JsonSchema)]
pub struct UncertaintyRow {
    /// σ(Dq), cm⁻¹.
    pub dq: Option<f64>,
    /// σ(Δ) = 10σ(Dq), cm⁻¹.
    pub delta: Option<f64>,
    /// σ(B), cm⁻¹.
    pub b: Option<f64>,
    /// σ(C), cm⁻¹.
    pub c: Option<f64>,
    /// σ(Δ/B) (dimensionless).
    pub delta_over_b: Option<f64>,
    /// σ(β) = σ(B)/B0.
    pub beta: Option<f64>,
}

/// The spin state the fitted field implies.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct SpinCheckRow {
    /// 2S+1 of the ground state at the fitted parameters.
    pub ground_multiplicity: i32,
    /// The fitted field makes the assumed spin state the ground state.
    pub consistent: bool,
    /// Lowest level of the nearest other spin state minus that of the assumed one (cm⁻¹);
    /// positive when the assumed state is lower. Null when there is no other spin state.
    pub gap: Option<f64>,
    /// Crossover Δ/B at `c_over_b_used`, when the ground spin changes for this d^n and geometry.
    pub crossover_delta_over_b: Option<f64>,
    /// Fitted Δ/B minus the crossover (positive: low-spin side).
    pub margin_delta_over_b: Option<f64>,
}

/// Another assignment that was fitted.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct AlternativeRow {
    pub spin_state: String,
    /// Upper-level labels in band order.
    pub assignment: Vec<String>,
    /// Dq of this assignment (cm⁻¹).
    pub dq: f64,
    /// Δ = 10Dq of this assignment (cm⁻¹).
    pub delta: f64,
    /// Racah B of this assignment (cm⁻¹); null when B does not enter the bands.
    pub b: Option<f64>,
    /// Racah C of this assignment (cm⁻¹); null when C does not enter the bands.
    pub c: Option<f64>,
    /// Δ/B of this assignment (dimensionless); null without B.
    pub delta_over_b: Option<f64>,
    /// rms residual (cm⁻¹).
    pub rms: f64,
    /// Within the near-equal tolerance of the best.
    pub near_equal: bool,
    pub concerns: Vec<String>,
}

/// The whole `fit-bands` report. Energies in cm⁻¹ unless a field says otherwise.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct FitBandsReport {
    /// Number of d electrons.
    pub dn: usize,
    pub geometry: String,
    /// Unit the bands were given in.
    pub input_unit: String,
    /// "high", "low", "intermediate" or "only".
    pub spin_state: String,
    /// 2S+1 of the assumed spin state.
    pub spin_multiplicity: i32,
    /// Lowest level of that spin (lower level of every band).
    pub reference: String,
    /// Dq (cm⁻¹).
    pub dq: f64,
    /// Δ = 10Dq (cm⁻¹).
    pub delta: f64,
    /// Racah B (cm⁻¹), null when B does not enter the bands.
    pub b: Option<f64>,
    /// Racah C (cm⁻¹), null when C does not enter the bands.
    pub c: Option<f64>,
    /// C/B of the fit, null when C does not enter the bands.
    pub c_over_b: Option<f64>,
    /// C/B used in the calculation (fitted, given or the default), also when C does not enter
    /// the bands; the crossover is placed at this ratio.
    pub c_over_b_used: f64,
    /// Δ/B of the fit (dimensionless); null when B does not enter the bands.
    pub delta_over_b: Option<f64>,
    /// Nephelauxetic ratio B/B0, when B0 is given.
    pub beta: Option<f64>,
    /// Free-ion B0 used for β (cm⁻¹).
    pub b0: Option<f64>,
    /// Where B0 came from.
    pub b0_source: Option<String>,
    pub uncertainties: UncertaintyRow,
    /// "exact" or "over-determined".
    pub determination: String,
    /// Bands minus fitted parameters (a count; 0 for an exact fit).
    pub degrees_of_freedom: usize,
    pub free_parameters: Vec<String>,
    pub fixed: Vec<FixedRow>,
    /// Residual variance s² (cm⁻²), when over-determined.
    pub residual_variance: Option<f64>,
    /// rms residual (cm⁻¹).
    pub rms: f64,
    /// Bands in increasing energy with their assignment.
    pub assignment: Vec<AssignmentRow>,
    /// Observed − calculated per band (cm⁻¹), same order as `assignment`.
    pub residuals: Vec<f64>,
    /// Spin-forbidden bands given with --forbidden, fitted to the lowest level of their
    /// multiplicity (cm⁻¹), in input order; empty without them.
    pub forbidden: Vec<AssignmentRow>,
    /// Transitions not observed (cm⁻¹).
    pub predicted: Vec<PredictedRow>,
    pub spin_check: SpinCheckRow,
    pub alternatives: Vec<AlternativeRow>,
    /// Doubts about the best assignment.
    pub concerns: Vec<String>,
    /// The usual published reading of octahedral d³ and d⁸ spectra: Δ = ν₁ and B from ν₂ or ν₃
    /// (cm⁻¹; Lever 1984); null for other cases.
    pub convention: Option<ConventionRow>,
    pub notes: Vec<String>,
    /// Evaluations of the model the fit took (a count).
    pub evaluations: usize,
}

/// Δ and B as published tables read them (cm⁻¹).
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct ConventionRow {
    /// Δ = ν₁.
    pub delta: f64,
    /// B from ν₁ and ν₂.
    pub b_from_nu2: Option<f64>,
    /// B from ν₁ and ν₃.
    pub b_from_nu3: Option<f64>,
}

/// Inputs of the report that are not part of the fit.
#[derive(Debug, Clone, Default)]
pub struct Context {
    pub input_unit: Option<EnergyUnit>,
    /// Free-ion B0 (cm⁻¹) and its source.
    pub b0: Option<(f64, String)>,
    /// Crossover Δ/B at the fit's C/B.
    pub crossover: Option<f64>,
}

fn arrow(from: &str, to: &str) -> String {
    format!("{from} → {to}")
}

fn alternative(f: &BandFit, near: bool) -> AlternativeRow {
    AlternativeRow {
        spin_state: f.spin_state.kind_name().to_string(),
        assignment: f
            .assigned
            .iter()
            .map(|a| a.transition.label.clone())
            .collect(),
        dq: f.dq,
        delta: f.delta(),
        b: f.b,
        c: f.c,
        delta_over_b: f.delta_over_b(),
        rms: f.rms,
        near_equal: near,
        concerns: f.concerns.clone(),
    }
}

impl FitBandsReport {
    /// Builds the report from a fit.
    pub fn new(out: &FitOutcome, ctx: &Context) -> Result<Self> {
        let f = &out.best;
        let unit = ctx.input_unit.unwrap_or(EnergyUnit::Wavenumber);
        let assignment_row = |a: &AssignedBand, spin_forbidden: bool| AssignmentRow {
            observed: a.observed,
            observed_in_unit: unit.from_wavenumber(a.observed),
            transition: arrow(&f.reference, &a.transition.label),
            label: a.transition.label.clone(),
            parent: crate::engine::Term::text_of(a.transition.parent),
            calculated: a.transition.energy,
            residual: a.residual,
            electrons_moved: if spin_forbidden {
                None
            } else {
                a.jump.electrons
            },
            weak: spin_forbidden || a.jump.weak,
        };
        let beta = match (&ctx.b0, f.b) {
            (Some((b0, _)), Some(b)) => Some(crate::spectra::fit::nephelauxetic_ratio(b, *b0)?),
            _ => None,
        };
        let position = match (ctx.crossover, f.delta_over_b()) {
            (Some(x), Some(d)) => Some(relative_to_crossover(d, x)?),
            _ => None,
        };
        let u = &f.uncertainties;
        let (determination, dof) = match f.determination {
            Determination::Exact => ("exact", 0),
            Determination::Over { dof } => ("over-determined", dof),
        };
        Ok(FitBandsReport {
            dn: f.dn,
            geometry: f.geometry.name().to_string(),
            input_unit: unit.name().to_string(),
            spin_state: f.spin_state.kind_name().to_string(),
            spin_multiplicity: f.spin_state.multiplicity(),
            reference: f.reference.clone(),
            dq: f.dq,
            delta: f.delta(),
            b: f.b,
            c: f.c,
            c_over_b: f.c.map(|_| f.c_over_b),
            c_over_b_used: f.c_over_b,
            delta_over_b: f.delta_over_b(),
            beta,
            b0: ctx.b0.as_ref().map(|b| b.0),
            b0_source: ctx.b0.as_ref().map(|b| b.1.clone()),
            uncertainties: UncertaintyRow {
                dq: u.dq,
                delta: u.dq.map(|s| 10.0 * s),
                b: u.b,
                c: u.c,
                delta_over_b: u.delta_over_b,
                beta: match (&ctx.b0, u.b) {
                    (Some((b0, _)), Some(s)) => Some(s / b0),
                    _ => None,
                },
            },
            determination: determination.to_string(),
            degrees_of_freedom: dof,
            free_parameters: f
                .free
                .iter()
                .map(|p| FitParameter::name(*p).to_string())
                .collect(),
            fixed: f
                .fixed
                .iter()
                .map(|x| FixedRow {
                    name: x.name.clone(),
                    value: x.value,
                    reason: x.reason.clone(),
                })
                .collect(),
            residual_variance: f.residual_variance,
            rms: f.rms,
            assignment: f
                .assigned
                .iter()
                .map(|a| assignment_row(a, false))
                .collect(),
            residuals: f.assigned.iter().map(|a| a.residual).collect(),
            // Spin-forbidden bands are weak by their nature; no jump is computed for them.
            forbidden: f
                .forbidden
                .iter()
                .map(|a| assignment_row(a, true))
                .collect(),
            predicted: f
                .predicted
                .iter()
                .map(|p| PredictedRow {
                    transition: arrow(&f.reference, &p.transition.label),
                    label: p.transition.label.clone(),
                    parent: crate::engine::Term::text_of(p.transition.parent),
                    energy: p.transition.energy,
                    wavelength_nm: 1e7 / p.transition.energy,
                    electrons_moved: p.jump.electrons,
                    weak: p.jump.weak,
                })
                .collect(),
            spin_check: SpinCheckRow {
                ground_multiplicity: f.ground_two_s + 1,
                consistent: f.consistent(),
                gap: f.spin_gap,
                crossover_delta_over_b: position.map(|p| p.crossover),
                margin_delta_over_b: position.map(|p| p.margin),
            },
            alternatives: out
                .alternatives
                .iter()
                .map(|(a, near)| alternative(a, *near))
                .collect(),
            concerns: f.concerns.clone(),
            convention: crate::spectra::fit::convention(f).map(|c| ConventionRow {
                delta: c.delta,
                b_from_nu2: c.b_from_nu2,
                b_from_nu3: c.b_from_nu3,
            }),
            notes: out.notes.clone(),
            evaluations: f.evaluations,
        })
    }
}

impl Render for FitBandsReport {
    type Figure = ();

    /// Human table.
    fn table(&self) -> String {
        let mut s = String::new();
        let pm = |x: Option<f64>, d: usize| {
            x.map(|v| format!(" ± {}", fmt_num(v, d)))
                .unwrap_or_default()
        };
        s.push_str(&format!(
            "d{} {}, {} spin state (2S+1 = {}), bands from {}\n",
            self.dn, self.geometry, self.spin_state, self.spin_multiplicity, self.reference
        ));
        s.push_str(&format!(
            "Δ = 10Dq = {}{} cm⁻¹",
            fmt_num(self.delta, 0),
            pm(self.uncertainties.delta, 0)
        ));
        match self.b {
            Some(b) => s.push_str(&format!(
                ", B = {}{} cm⁻¹",
                fmt_num(b, 1),
                pm(self.uncertainties.b, 1)
            )),
            None => s.push_str(", B not determined"),
        }
        if let Some(c) = self.c {
            s.push_str(&format!(
                ", C = {}{} cm⁻¹",
                fmt_num(c, 0),
                pm(self.uncertainties.c, 0)
            ));
        }
        if let Some(r) = self.c_over_b {
            s.push_str(&format!(" (C/B = {})", fmt_num(r, 3)));
        }
        s.push('\n');
        if let Some(c) = &self.convention {
            let mut parts = vec![format!("Δ = ν₁ = {} cm⁻¹", fmt_num(c.delta, 0))];
            if let Some(b) = c.b_from_nu2 {
                parts.push(format!("B from ν₂ = {} cm⁻¹", fmt_num(b, 1)));
            }
            if let Some(b) = c.b_from_nu3 {
                parts.push(format!("B from ν₃ = {} cm⁻¹", fmt_num(b, 1)));
            }
            s.push_str(&format!(
                "as published tables read it (Lever 1984): {}\n",
                parts.join(", ")
            ));
        }
        if let Some(x) = self.delta_over_b {
            s.push_str(&format!(
                "Δ/B = {}{}",
                fmt_num(x, 2),
                pm(self.uncertainties.delta_over_b, 2)
            ));
            if let (Some(beta), Some(b0)) = (self.beta, self.b0) {
                s.push_str(&format!(
                    ", β = B/B0 = {}{} (B0 = {} cm⁻¹, {})",
                    fmt_num(beta, 3),
                    pm(self.uncertainties.beta, 3),
                    fmt_num(b0, 0),
                    self.b0_source.clone().unwrap_or_default()
                ));
            }
            s.push('\n');
        }
        let free = self.free_parameters.join(", ");
        // Spin-allowed bands, and the assigned spin-forbidden ones that count as data too.
        let data = match self.forbidden.len() {
            0 => format!("{} band(s)", self.assignment.len()),
            k => format!(
                "{} band(s) and {k} spin-forbidden band(s)",
                self.assignment.len()
            ),
        };
        match self.determination.as_str() {
            "exact" => s.push_str(&format!(
                "exactly determined: {data} for {} free parameter(s) ({free}); no uncertainties\n",
                self.free_parameters.len()
            )),
            _ => s.push_str(&format!(
                "over-determined: {data}, free parameters {free}, {} degree(s) of freedom; rms residual {} cm⁻¹; ± are 1σ from s²(JᵀJ)⁻¹\n",
                self.degrees_of_freedom,
                fmt_num(self.rms, 0)
            )),
        }
        for f in &self.fixed {
            let v = f
                .value
                .map(|v| format!(" = {}", fmt_num(v, 3)))
                .unwrap_or_default();
            s.push_str(&format!("fixed: {}{v}: {}\n", f.name, f.reason));
        }
        let mut t = new_table([
            "observed (cm⁻¹)",
            "transition",
            "calculated (cm⁻¹)",
            "obs − calc (cm⁻¹)",
            "jump",
        ]);
        for a in &self.assignment {
            t.add_row(vec![
                fmt_num(a.observed, 0),
                a.transition.clone(),
                fmt_num(a.calculated, 0),
                fmt_residual(a.residual),
                jump_text(a.electrons_moved, a.weak),
            ]);
        }
        for a in &self.forbidden {
            t.add_row(vec![
                fmt_num(a.observed, 0),
                a.transition.clone(),
                fmt_num(a.calculated, 0),
                fmt_residual(a.residual),
                "spin-forbidden (marked)".to_string(),
            ]);
        }
        s.push_str(&format!("{t}\n"));
        if !self.predicted.is_empty() {
            s.push_str("not observed (predicted):\n");
            let mut t = new_table(["transition", "calculated (cm⁻¹)", "λ (nm)", "jump"]);
            for p in &self.predicted {
                t.add_row(vec![
                    p.transition.clone(),
                    fmt_num(p.energy, 0),
                    fmt_num(p.wavelength_nm, 0),
                    jump_text(p.electrons_moved, p.weak),
                ]);
            }
            s.push_str(&format!("{t}\n"));
        }
        let sc = &self.spin_check;
        s.push_str(&format!(
            "spin check: at the fitted field the ground state has 2S+1 = {}{}",
            sc.ground_multiplicity,
            if sc.consistent {
                " (consistent with the assumed spin)"
            } else {
                " (NOT the assumed spin)"
            }
        ));
        if let Some(g) = sc.gap {
            s.push_str(&format!(
                "; the other spin state's lowest level lies {} cm⁻¹ {}",
                fmt_num(g.abs(), 0),
                if g >= 0.0 { "higher" } else { "lower" }
            ));
        }
        if let (Some(x), Some(m)) = (sc.crossover_delta_over_b, sc.margin_delta_over_b) {
            s.push_str(&format!(
                "; crossover Δ/B = {} at C/B = {}, margin {} ({} side)",
                fmt_num(x, 2),
                fmt_num(self.c_over_b_used, 3),
                fmt_num(m, 2),
                if m > 0.0 { "low-spin" } else { "high-spin" }
            ));
        }
        s.push('\n');
        for c in &self.concerns {
            s.push_str(&format!("concern: {c}\n"));
        }
        let near: Vec<&AlternativeRow> =
            self.alternatives.iter().filter(|a| a.near_equal).collect();
        if !near.is_empty() {
            s.push_str("near-equal alternative assignments:\n");
            let mut t = new_table(["spin", "assignment", "Δ (cm⁻¹)", "B (cm⁻¹)", "rms (cm⁻¹)"]);
            for a in near {
                t.add_row(vec![
                    a.spin_state.clone(),
                    a.assignment.join(", "),
                    fmt_num(a.delta, 0),
                    a.b.map(|b| fmt_num(b, 1)).unwrap_or_else(|| "—".into()),
                    fmt_num(a.rms, 0),
                ]);
            }
            s.push_str(&format!("{t}\n"));
        }
        let others = self.alternatives.iter().filter(|a| !a.near_equal).count();
        if others > 0 {
            s.push_str(&format!(
                "{others} other assignment(s) fit worse or raise concerns (the JSON report lists them)\n"
            ));
        }
        for n in &self.notes {
            s.push_str(&format!("note: {n}\n"));
        }
        s
    }
}

/// "1-electron", "2-electron, mixes", "2-electron (weak)", "same configuration (weak)" or "?".
pub fn jump_text(moved: Option<u32>, weak: bool) -> String {
    match (moved, weak) {
        (Some(1), _) => "1-electron".into(),
        (Some(0), _) => "same configuration (weak)".into(),
        (Some(k), true) => format!("{k}-electron (weak)"),
        (Some(k), false) => format!("{k}-electron, mixes with a 1-electron level"),
        (None, _) => "?".into(),
    }
}

/// A residual rounded to whole cm⁻¹, without a "-0".
fn fmt_residual(x: f64) -> String {
    let r = x.round();
    fmt_num(if r == 0.0 { 0.0 } else { r }, 0)
}
