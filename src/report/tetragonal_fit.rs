//! Report of `spinstate fit-bands --geometry tetragonal`: fitted Dq, Ds, Dt (and B) with the
//! band assignment. Energies in cm⁻¹.

use super::Render;
use super::{fmt_num, new_table};
use crate::spectra::tetragonal::{aom_differences, TetragonalFit, TetragonalOutcome};
use crate::spectra::EnergyUnit;
use serde::Serialize;

/// One observed band with its assignment.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct TetragonalBandRow {
    /// Observed maximum (cm⁻¹).
    pub observed: f64,
    /// Observed maximum in the input unit.
    pub observed_in_unit: f64,
    /// Transition, e.g. "2B1g → 2Eg".
    pub transition: String,
    /// Upper level ("2Eg", "3Eg[2]" when the irrep repeats).
    pub label: String,
    /// Free-ion parent term of the upper level.
    pub parent: String,
    /// Calculated position (cm⁻¹).
    pub calculated: f64,
    /// Observed − calculated (cm⁻¹).
    pub residual: f64,
}

/// A calculated transition no band was assigned to.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct UnassignedRow {
    pub label: String,
    /// Position (cm⁻¹).
    pub energy: f64,
}

/// 1σ uncertainties (cm⁻¹), null when exactly determined or not fitted.
#[derive(Debug, Clone, Serialize, Default, schemars::JsonSchema)]
pub struct TetragonalUncertaintyRow {
    /// σ(Dq(xy)) (cm⁻¹).
    pub dq: Option<f64>,
    /// σ(Ds) (cm⁻¹).
    pub ds: Option<f64>,
    /// σ(Dt) (cm⁻¹).
    pub dt: Option<f64>,
    /// σ(B) (cm⁻¹).
    pub b: Option<f64>,
}

/// Another assignment that was fitted.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct TetragonalAlternativeRow {
    pub spin_state: String,
    /// Ground level of the spin at this fit.
    pub reference: String,
    /// Upper-level labels in band order.
    pub assignment: Vec<String>,
    /// Dq(xy) of this assignment (cm⁻¹).
    pub dq: f64,
    /// Ds of this assignment (cm⁻¹).
    pub ds: f64,
    /// Dt of this assignment (cm⁻¹).
    pub dt: f64,
    /// Racah B of this assignment (cm⁻¹); null when B does not enter the bands.
    pub b: Option<f64>,
    /// rms residual (cm⁻¹).
    pub rms: f64,
    pub near_equal: bool,
    pub concerns: Vec<String>,
}

/// The whole report.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct TetragonalFitReport {
    /// Number of d electrons.
    pub dn: usize,
    /// Always "tetragonal".
    pub geometry: String,
    /// Unit the bands were given in.
    pub input_unit: String,
    /// "high", "low", "intermediate" or "only".
    pub spin_state: String,
    /// 2S+1 of the assumed spin state.
    pub spin_multiplicity: i32,
    /// Ground level of that spin (lower level of every band).
    pub reference: String,
    /// Equatorial Dq(xy) (cm⁻¹).
    pub dq: f64,
    /// 10Dq(xy) (cm⁻¹).
    pub delta: f64,
    /// Tetragonal parameter Ds (cm⁻¹).
    pub ds: f64,
    /// Tetragonal parameter Dt (cm⁻¹).
    pub dt: f64,
    /// Axial Dq(z) = Dq(xy) − 7Dt/4 (cm⁻¹).
    pub dq_axial: f64,
    /// Equatorial minus axial e_σ and e_π in the angular overlap model: 2δσ = 4Ds + 5Dt,
    /// 2δπ = 3Ds − 5Dt (cm⁻¹).
    pub delta_e_sigma: f64,
    /// Equatorial minus axial e_π, δπ (cm⁻¹).
    pub delta_e_pi: f64,
    /// Racah B (cm⁻¹), null when B does not enter the bands of this spin.
    pub b: Option<f64>,
    /// True when B was held (given) rather than fitted.
    pub b_held: bool,
    /// C/B held in the calculation.
    pub c_over_b: f64,
    /// B/B0 when B and B0 are known.
    pub beta: Option<f64>,
    pub uncertainties: TetragonalUncertaintyRow,
    /// "exact" or "over-determined".
    pub determination: String,
    /// Bands minus fitted parameters (a count; 0 for an exact fit).
    pub degrees_of_freedom: usize,
    pub free_parameters: Vec<String>,
    /// Parameter combinations the bands leave free (empty when all are determined).
    pub undetermined: Vec<String>,
    /// Words for the sign of Dt.
    pub distortion: String,
    /// rms residual (cm⁻¹).
    pub rms: f64,
    pub assignment: Vec<TetragonalBandRow>,
    pub unassigned: Vec<UnassignedRow>,
    pub alternatives: Vec<TetragonalAlternativeRow>,
    pub concerns: Vec<String>,
    pub notes: Vec<String>,
    /// Evaluations of the model the fit took (a count).
    pub evaluations: usize,
}

fn alternative(f: &TetragonalFit, near: bool) -> TetragonalAlternativeRow {
    TetragonalAlternativeRow {
        spin_state: f.spin_state.kind_name().to_string(),
        reference: f.reference.clone(),
        assignment: f.assigned.iter().map(|a| a.label.clone()).collect(),
        dq: f.dq,
        ds: f.ds,
        dt: f.dt,
        b: f.b,
        rms: f.rms,
        near_equal: near,
        concerns: f.concerns.clone(),
    }
}

impl TetragonalFitReport {
    /// Builds the report; `b0` is the free-ion B₀ (cm⁻¹) for β, when known.
    pub fn new(
        out: &TetragonalOutcome,
        unit: EnergyUnit,
        b0: Option<f64>,
        b_held: bool,
    ) -> TetragonalFitReport {
        let f = &out.best;
        let (ds_sigma, ds_pi) = aom_differences(f.ds, f.dt);
        TetragonalFitReport {
            dn: f.dn,
            geometry: "tetragonal".into(),
            input_unit: unit.name().to_string(),
            spin_state: f.spin_state.kind_name().into(),
            spin_multiplicity: f.spin_state.multiplicity(),
            reference: f.reference.clone(),
            dq: f.dq,
            delta: 10.0 * f.dq,
            ds: f.ds,
            dt: f.dt,
            dq_axial: f.dq_axial(),
            delta_e_sigma: ds_sigma,
            delta_e_pi: ds_pi,
            b: f.b,
            b_held,
            c_over_b: f.c_over_b,
            beta: match (f.b, b0) {
                (Some(b), Some(b0)) if b0 > 0.0 => Some(b / b0),
                _ => None,
            },
            uncertainties: TetragonalUncertaintyRow {
                dq: f.uncertainties.dq,
                ds: f.uncertainties.ds,
                dt: f.uncertainties.dt,
                b: f.uncertainties.b,
            },
            determination: if f.exact() {
                "exact".into()
            } else {
                "over-determined".into()
            },
            degrees_of_freedom: f.dof,
            free_parameters: f.free.iter().map(|p| p.name().to_string()).collect(),
            undetermined: f.undetermined.clone(),
            distortion: f.distortion().into(),
            rms: f.rms,
            assignment: f
                .assigned
                .iter()
                .map(|a| TetragonalBandRow {
                    observed: a.observed,
                    observed_in_unit: unit.from_wavenumber(a.observed),
                    transition: format!("{} → {}", f.reference, a.label),
                    label: a.label.clone(),
                    parent: crate::engine::Term::text_of(a.parent),
                    calculated: a.calculated,
                    residual: a.residual,
                })
                .collect(),
            unassigned: f
                .unassigned
                .iter()
                .map(|(label, energy)| UnassignedRow {
                    label: label.clone(),
                    energy: *energy,
                })
                .collect(),
            alternatives: out
                .alternatives
                .iter()
                .map(|(a, near)| alternative(a, *near))
                .collect(),
            concerns: f.concerns.clone(),
            notes: out.notes.clone(),
            evaluations: f.evaluations,
        }
    }
}

impl Render for TetragonalFitReport {
    type Figure = ();

    /// Terminal rendering.
    fn table(&self) -> String {
        let pm = |x: Option<f64>| {
            x.map(|v| format!(" ± {}", fmt_num(v, 0)))
                .unwrap_or_default()
        };
        let mut s = format!(
            "d{} tetragonal (D4h), {} spin state (2S+1 = {}), bands from {}\n",
            self.dn, self.spin_state, self.spin_multiplicity, self.reference
        );
        s.push_str(&format!(
            "Dq(xy) = {}{} cm⁻¹, Ds = {}{} cm⁻¹, Dt = {}{} cm⁻¹",
            fmt_num(self.dq, 0),
            pm(self.uncertainties.dq),
            fmt_num(self.ds, 0),
            pm(self.uncertainties.ds),
            fmt_num(self.dt, 0),
            pm(self.uncertainties.dt),
        ));
        match (self.b, self.b_held) {
            (Some(b), true) => s.push_str(&format!(", B = {} cm⁻¹ (held)", fmt_num(b, 0))),
            (Some(b), false) => s.push_str(&format!(
                ", B = {}{} cm⁻¹",
                fmt_num(b, 0),
                pm(self.uncertainties.b)
            )),
            (None, _) => s.push_str(", B does not enter these bands"),
        }
        if let Some(beta) = self.beta {
            s.push_str(&format!(" (β = {})", fmt_num(beta, 2)));
        }
        s.push('\n');
        s.push_str(&format!(
            "axial Dq(z) = {} cm⁻¹; {}; δσ = {} cm⁻¹, δπ = {} cm⁻¹ (equatorial − axial, angular overlap model)\n",
            fmt_num(self.dq_axial, 0),
            self.distortion,
            fmt_num(self.delta_e_sigma, 0),
            fmt_num(self.delta_e_pi, 0)
        ));
        s.push_str(&format!(
            "{} bands for {} free parameters ({}): {}, rms {} cm⁻¹; C/B held at {} (C is not fitted)\n",
            self.assignment.len(),
            self.free_parameters.len(),
            self.free_parameters.join(", "),
            if self.determination == "exact" {
                "exactly determined, no uncertainties".to_string()
            } else {
                format!("{} degrees of freedom", self.degrees_of_freedom)
            },
            fmt_num(self.rms, 1),
            fmt_num(self.c_over_b, 3)
        ));
        let mut t = new_table([
            "observed (cm⁻¹)",
            "transition",
            "parent",
            "calculated (cm⁻¹)",
            "obs − calc (cm⁻¹)",
        ]);
        for a in &self.assignment {
            t.add_row(vec![
                fmt_num(a.observed, 0),
                a.transition.clone(),
                a.parent.clone(),
                fmt_num(a.calculated, 0),
                fmt_num(
                    if a.residual.abs() < 0.05 {
                        0.0
                    } else {
                        a.residual
                    },
                    1,
                ),
            ]);
        }
        s.push_str(&format!("{t}\n"));
        if !self.unassigned.is_empty() {
            let list: Vec<String> = self
                .unassigned
                .iter()
                .map(|u| format!("{} {}", u.label, fmt_num(u.energy, 0)))
                .collect();
            s.push_str(&format!("not assigned (cm⁻¹): {}\n", list.join(", ")));
        }
        let near: Vec<&TetragonalAlternativeRow> =
            self.alternatives.iter().filter(|a| a.near_equal).collect();
        if !near.is_empty() {
            s.push_str("near-equal assignments:\n");
            for a in near {
                s.push_str(&format!(
                    "  from {}: {} — Dq = {}, Ds = {}, Dt = {}{} cm⁻¹, rms {}\n",
                    a.reference,
                    a.assignment.join(", "),
                    fmt_num(a.dq, 0),
                    fmt_num(a.ds, 0),
                    fmt_num(a.dt, 0),
                    a.b.map(|b| format!(", B = {}", fmt_num(b, 0)))
                        .unwrap_or_default(),
                    fmt_num(a.rms, 1)
                ));
            }
        }
        for c in &self.concerns {
            s.push_str(&format!("concern: {c}\n"));
        }
        for u in &self.undetermined {
            s.push_str(&format!("not determined by these bands: {u}\n"));
        }
        for n in &self.notes {
            s.push_str(&format!("note: {n}\n"));
        }
        s
    }
}
