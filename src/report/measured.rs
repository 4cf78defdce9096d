//! Reports of `spinstate evans` and `spinstate moment`: χ_M, χ_M·T, μ_eff and unpaired electrons
//! with uncertainties, the diamagnetic correction and the spin-state comparison.

use super::Render;
use super::{fmt_num, new_table};
use crate::measured::compare::{spin_text, Comparison, MomentVerdict, Orbital};
use crate::measured::evans::EvansResult;
use crate::measured::pascal::DiamagneticCorrection;
use crate::measured::MomentResult;
use crate::units::SusceptibilityUnits;
use serde::Serialize;

/// Caution shown by `evans --help` and in `evans` output.
pub const EVANS_SAFETY: &str = "Safety: superconducting magnets pull ferromagnetic objects and affect pacemakers and implants (respect the posted field lines); NMR tubes and capillary inserts break easily (check for cracks, never heat sealed tubes); deuterated solvents are volatile and toxic (use a fume hood); cyanide, nickel, cobalt, chromium and other heavy-metal compounds need your lab's usual handling and waste routes. Follow your institution's rules, the supplier's SDS and a local risk assessment; this output is not a safety approval.";

/// Caution shown in `moment` output.
pub const MOMENT_SAFETY: &str = "Safety: magnetometry at low temperature uses liquid nitrogen and helium (cold burns, asphyxiation in closed rooms); cyanide and heavy-metal compounds need your lab's usual handling. Follow your institution's rules and a local risk assessment; this output is not a safety approval.";

/// One line of a Pascal sum.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct DiaTermRow {
    pub name: String,
    pub kind: String,
    /// How many of this entry the formula holds (a count, may be fractional for solvates).
    pub count: f64,
    /// Increment per unit (`chi_unit`).
    pub each: f64,
    /// count × each (`chi_unit`).
    pub total: f64,
    pub source: String,
}

/// The diamagnetic correction.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct DiaReport {
    /// χ_D subtracted (`chi_unit`; negative or 0).
    pub value: f64,
    /// 1σ of χ_D (`chi_unit`).
    pub err: f64,
    /// "given", "pascal", "rough" or "none".
    pub method: String,
    pub terms: Vec<DiaTermRow>,
    pub notes: Vec<String>,
}

/// Evans-specific quantities.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct EvansDetails {
    /// "solenoid" (field along the tube) or "transverse".
    pub magnet: String,
    /// Δδ = 10⁶ Δf/f, solution line minus insert line (ppm).
    pub shift_ppm: f64,
    /// 1σ of the shift (ppm).
    pub shift_ppm_err: f64,
    /// Concentration of the paramagnet (mol/L).
    pub concentration: f64,
    /// 1σ of the concentration (mol/L).
    pub concentration_err: f64,
    /// The shift term of χ_M (`chi_unit`).
    pub chi_shift_term: f64,
    /// χ₀·MW solvent term (`chi_unit`; 0 when off).
    pub solvent_term: f64,
    /// Density term (`chi_unit`; 0 when off).
    pub density_term: f64,
}

/// One spin state's expectation.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct StateRow {
    /// "high spin", "low spin" or "only spin state".
    pub state: String,
    /// Total spin S.
    pub spin: f64,
    pub ground_term: String,
    pub parent: String,
    /// Spin-only μ (μB).
    pub mu_spin_only: f64,
    /// Spin plus unquenched orbital moment of the parent term (μB).
    pub mu_spin_orbital: Option<f64>,
    /// "first-order (T term)", "second-order (A/E term)" or "n/a".
    pub orbital: String,
    /// λ used (cm⁻¹).
    pub lambda: Option<f64>,
    /// μ_so(1 − αλ/10Dq) (μB).
    pub mu_spin_orbit_corrected: Option<f64>,
    /// T terms: μ_eff (μB) at the measurement temperature from the full ligand field with
    /// spin–orbit coupling, for κ = 0.7.
    pub mu_ligand_field_kappa_07: Option<f64>,
    /// μ_eff (μB) from the full ligand field at κ = 1.0 (T terms only).
    pub mu_ligand_field_kappa_10: Option<f64>,
    /// Lower end of the typical published range (μB).
    pub range_min: Option<f64>,
    /// Upper end of the typical published range (μB).
    pub range_max: Option<f64>,
    pub range_source: Option<String>,
    /// Lower end of the window counted as agreement (μB).
    pub window_min: f64,
    /// Upper end of the window counted as agreement (μB).
    pub window_max: f64,
    pub notes: Vec<String>,
}

/// Comparison with the spin states.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct ComparisonReport {
    /// Number of d electrons.
    pub dn: usize,
    pub geometry: String,
    /// "supports", "ambiguous", "between-states" or "outside-expectations".
    pub verdict: String,
    /// The supported state when the verdict is "supports".
    pub supported_state: Option<String>,
    pub message: String,
    pub states: Vec<StateRow>,
}

/// The whole report of `evans` or `moment`.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct MeasuredMomentReport {
    /// "evans" or "moment".
    pub command: String,
    /// "cgs" or "si": the unit system of every susceptibility field.
    pub units: String,
    /// Unit of chi_m, chi_m_corrected and dia ("cm3/mol" or "m3/mol").
    pub chi_unit: String,
    /// Unit of chi_m_t ("cm3 K/mol" or "m3 K/mol").
    pub chi_t_unit: String,
    /// Temperature (K).
    pub temperature: f64,
    /// 1σ of the temperature (K).
    pub temperature_err: f64,
    /// Molar susceptibility as measured (`chi_unit`).
    pub chi_m: f64,
    /// 1σ of χ_M (`chi_unit`).
    pub chi_m_err: f64,
    /// χ_M − χ_D (`chi_unit`).
    pub chi_m_corrected: f64,
    /// 1σ of χ_M − χ_D (`chi_unit`).
    pub chi_m_corrected_err: f64,
    /// χ_M·T of the corrected susceptibility (`chi_t_unit`).
    pub chi_m_t: f64,
    /// 1σ of χ_M·T (`chi_t_unit`).
    pub chi_m_t_err: f64,
    /// Effective moment (μB).
    pub mu_eff: f64,
    /// 1σ of μ_eff (μB).
    pub mu_eff_err: f64,
    /// Unpaired electrons from μ_eff = √(n(n+2)) (real).
    pub unpaired: f64,
    /// 1σ of the number of unpaired electrons.
    pub unpaired_err: f64,
    /// Nearest integer.
    pub unpaired_nearest: u32,
    /// Formula as given, and its molar mass (g/mol), when known.
    pub formula: Option<String>,
    /// Molar mass (g/mol), from the formula or given; null without either.
    pub molar_mass: Option<f64>,
    pub dia: DiaReport,
    pub evans: Option<EvansDetails>,
    pub comparison: Option<ComparisonReport>,
    pub notes: Vec<String>,
    pub safety: String,
}

impl MeasuredMomentReport {
    /// Builds the report from library results, converting susceptibilities to `units`.
    #[allow(clippy::too_many_arguments)]
    pub fn new(
        command: &str,
        units: SusceptibilityUnits,
        result: &MomentResult,
        dia: &DiamagneticCorrection,
        formula: Option<String>,
        molar_mass: Option<f64>,
        evans: Option<(&EvansResult, &str, f64, f64)>,
        comparison: Option<(&Comparison, usize, &str)>,
        safety: &str,
    ) -> Self {
        let u = |x: f64| units.from_cgs(x);
        let ua = |x: f64| units.from_cgs(x).abs();
        let mut notes = result.notes.clone();
        let evans = evans.map(|(e, magnet, conc, conc_err)| {
            notes.extend(e.notes.iter().cloned());
            EvansDetails {
                magnet: magnet.to_string(),
                shift_ppm: e.fractional_shift.value * 1e6,
                shift_ppm_err: e.fractional_shift.err * 1e6,
                concentration: conc,
                concentration_err: conc_err,
                chi_shift_term: u(e.chi_shift_term.value),
                solvent_term: u(e.solvent_term),
                density_term: u(e.density_term),
            }
        });
        let comparison = comparison.map(|(c, dn, geometry)| ComparisonReport {
            dn,
            geometry: geometry.to_string(),
            verdict: c.verdict.name().to_string(),
            supported_state: match c.verdict {
                MomentVerdict::Supports(i) => Some(c.states[i].state.phrase().to_string()),
                _ => None,
            },
            message: c.message.clone(),
            states: c
                .states
                .iter()
                .map(|s| StateRow {
                    state: s.state.phrase().to_string(),
                    spin: f64::from(s.two_s) / 2.0,
                    ground_term: s.ground_term.clone(),
                    parent: crate::engine::Term::text_of(s.parent),
                    mu_spin_only: s.spin_only,
                    mu_spin_orbital: s.spin_orbital,
                    orbital: match s.orbital {
                        Orbital::FirstOrder => "first-order (T term)".into(),
                        Orbital::SecondOrder { .. } => "second-order (A/E term)".into(),
                        Orbital::NotApplicable => "n/a".into(),
                    },
                    lambda: s.lambda,
                    mu_spin_orbit_corrected: s.spin_orbit_corrected,
                    mu_ligand_field_kappa_07: s.computed.map(|c| c.0),
                    mu_ligand_field_kappa_10: s.computed.map(|c| c.1),
                    range_min: s.range.map(|r| r.0),
                    range_max: s.range.map(|r| r.1),
                    range_source: s.range_source.clone(),
                    window_min: s.window.0,
                    window_max: s.window.1,
                    notes: s.notes.clone(),
                })
                .collect(),
        });
        MeasuredMomentReport {
            command: command.to_string(),
            units: units.name().to_string(),
            chi_unit: units.chi_unit().to_string(),
            chi_t_unit: units.chi_t_unit().to_string(),
            temperature: result.temperature.value,
            temperature_err: result.temperature.err,
            chi_m: u(result.chi_m.value),
            chi_m_err: ua(result.chi_m.err),
            chi_m_corrected: u(result.chi_m_corrected.value),
            chi_m_corrected_err: ua(result.chi_m_corrected.err),
            chi_m_t: u(result.chi_m_t.value),
            chi_m_t_err: ua(result.chi_m_t.err),
            mu_eff: result.mu_eff.value,
            mu_eff_err: result.mu_eff.err,
            unpaired: result.unpaired.value,
            unpaired_err: result.unpaired.err,
            unpaired_nearest: result.unpaired_nearest,
            formula,
            molar_mass,
            dia: DiaReport {
                value: u(result.dia.value),
                err: ua(result.dia.err),
                method: dia.method.name().to_string(),
                terms: dia
                    .terms
                    .iter()
                    .map(|t| DiaTermRow {
                        name: t.name.clone(),
                        kind: t.kind.to_string(),
                        count: t.count,
                        each: u(t.each),
                        total: u(t.total),
                        source: t.source.clone(),
                    })
                    .collect(),
                notes: dia.notes.clone(),
            },
            evans,
            comparison,
            notes,
            safety: safety.to_string(),
        }
    }
}

impl Render for MeasuredMomentReport {
    type Figure = ();

    /// Human-readable tables.
    fn table(&self) -> String {
        let chi = |v: f64, e: f64| {
            if e > 0.0 {
                format!("{v:.4e} ± {e:.1e}")
            } else {
                format!("{v:.4e}")
            }
        };
        let pm = |v: f64, e: f64, d: usize| {
            if e > 0.0 {
                format!("{} ± {}", fmt_num(v, d), fmt_num(e, d))
            } else {
                fmt_num(v, d)
            }
        };
        let mut out = String::new();
        if let Some(f) = &self.formula {
            out.push_str(&format!("formula: {f}"));
            if let Some(mw) = self.molar_mass {
                out.push_str(&format!(" (M = {mw:.2} g/mol)"));
            }
            out.push('\n');
        }
        let mut t = new_table(["quantity", "value", "unit"]);
        if let Some(e) = &self.evans {
            t.add_row(vec![
                format!("shift Δδ ({} magnet)", e.magnet),
                pm(e.shift_ppm, e.shift_ppm_err, 4),
                "ppm".into(),
            ]);
            t.add_row(vec![
                "concentration".into(),
                if e.concentration_err > 0.0 {
                    format!("{:.5} ± {:.5}", e.concentration, e.concentration_err)
                } else {
                    format!("{:.5}", e.concentration)
                },
                "mol/L".into(),
            ]);
            if e.solvent_term != 0.0 {
                t.add_row(vec![
                    "solvent term χ₀·MW".into(),
                    format!("{:.3e}", e.solvent_term),
                    self.chi_unit.clone(),
                ]);
            }
            if e.density_term != 0.0 {
                t.add_row(vec![
                    "density term".into(),
                    format!("{:.3e}", e.density_term),
                    self.chi_unit.clone(),
                ]);
            }
        }
        t.add_row(vec![
            "temperature".into(),
            pm(self.temperature, self.temperature_err, 2),
            "K".into(),
        ]);
        t.add_row(vec![
            "χ_M measured".into(),
            chi(self.chi_m, self.chi_m_err),
            self.chi_unit.clone(),
        ]);
        t.add_row(vec![
            format!("χ_D ({})", self.dia.method),
            chi(self.dia.value, self.dia.err),
            self.chi_unit.clone(),
        ]);
        t.add_row(vec![
            "χ_M corrected".into(),
            chi(self.chi_m_corrected, self.chi_m_corrected_err),
            self.chi_unit.clone(),
        ]);
        t.add_row(vec![
            "χ_M·T".into(),
            if self.units == "cgs" {
                pm(self.chi_m_t, self.chi_m_t_err, 4)
            } else {
                chi(self.chi_m_t, self.chi_m_t_err)
            },
            self.chi_t_unit.clone(),
        ]);
        t.add_row(vec![
            "μ_eff".into(),
            pm(self.mu_eff, self.mu_eff_err, 3),
            "μB".into(),
        ]);
        t.add_row(vec![
            "unpaired electrons".into(),
            format!(
                "{} (nearest {})",
                pm(self.unpaired, self.unpaired_err, 2),
                self.unpaired_nearest
            ),
            String::new(),
        ]);
        out.push_str(&format!("{t}\n"));
        if !self.dia.terms.is_empty() {
            let scale = if self.units == "cgs" { 1e6 } else { 1e12 };
            let unit = if self.units == "cgs" {
                "10⁻⁶ cm³/mol"
            } else {
                "10⁻¹² m³/mol"
            };
            let mut d = new_table([
                "Pascal entry".to_string(),
                "kind".to_string(),
                "count".to_string(),
                format!("each ({unit})"),
                format!("total ({unit})"),
            ]);
            for term in &self.dia.terms {
                d.add_row(vec![
                    term.name.clone(),
                    term.kind.clone(),
                    fmt_num(term.count, 2),
                    fmt_num(term.each * scale, 2),
                    fmt_num(term.total * scale, 2),
                ]);
            }
            out.push_str(&format!(
                "diamagnetic correction (Pascal's constants, Bain & Berry 2008 unless a row's source says otherwise):\n{d}\n"
            ));
        }
        if let Some(c) = &self.comparison {
            let mut s = new_table([
                "state",
                "S",
                "ground term",
                "spin-only μB",
                "spin+orbital μB",
                "A/E corrected μB",
                "LF+SO μB (κ 0.7–1)",
                "typical μB",
                "window μB",
            ]);
            for st in &c.states {
                s.add_row(vec![
                    st.state.clone(),
                    spin_text((st.spin * 2.0).round() as i32),
                    format!("{} ({})", st.ground_term, st.parent),
                    fmt_num(st.mu_spin_only, 2),
                    st.mu_spin_orbital.map_or("—".into(), |v| fmt_num(v, 2)),
                    st.mu_spin_orbit_corrected
                        .map_or("—".into(), |v| fmt_num(v, 2)),
                    match (st.mu_ligand_field_kappa_07, st.mu_ligand_field_kappa_10) {
                        (Some(a), Some(b)) => format!("{:.2}–{:.2}", a.min(b), a.max(b)),
                        _ => "—".into(),
                    },
                    match (st.range_min, st.range_max) {
                        (Some(a), Some(b)) => format!("{a:.1}–{b:.1}"),
                        _ => "—".into(),
                    },
                    format!("{:.2}–{:.2}", st.window_min, st.window_max),
                ]);
            }
            out.push_str(&format!(
                "comparison for d{} {}:\n{s}\n{}\n",
                c.dn, c.geometry, c.message
            ));
            for st in &c.states {
                for n in &st.notes {
                    out.push_str(&format!("  {}: {n}\n", st.state));
                }
            }
        }
        for n in self.dia.notes.iter().chain(&self.notes) {
            out.push_str(&format!("note: {n}\n"));
        }
        out.push_str(&format!("{}\n", self.safety));
        out
    }
}
