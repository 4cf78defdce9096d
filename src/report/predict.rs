//! Report of `spinstate predict`: the spin state of a complex from its composition.
//!
//! JSON contract (a top-level object; fields are only ever added): energies in cm⁻¹, moments in
//! μB, wavelengths in nm; `null` where a value does not apply (e.g. B of a d¹ ion, the crossover
//! of a geometry whose spin cannot change).

use super::Render;
use super::{fmt_num, new_table};
use crate::complex::{Origin, Parameter};
use crate::predict::{Prediction, SpinBands};
use serde::Serialize;

/// One ligand as used in the estimate.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct LigandRow {
    pub name: String,
    /// Number of ligands.
    pub count: usize,
    /// Donor atoms bound per ligand (a count).
    pub denticity: usize,
    /// Donor atoms (element symbols).
    pub donors: Vec<String>,
    /// Jørgensen f (dimensionless).
    pub f: f64,
    /// How f was obtained: "printed", "derived" or "series".
    pub f_from: String,
    /// π-acceptor term π = −4e_π/g(Cr³⁺) (dimensionless; 0 when not a π acceptor).
    pub pi: f64,
    /// Jørgensen h used (dimensionless): the published value or the donor-atom default.
    pub h: Option<f64>,
    /// True when `h` is a default, not the ligand's own published value.
    pub h_defaulted: bool,
}

/// One parameter, given vs estimated (cm⁻¹).
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct ParameterRow {
    /// Value used (cm⁻¹); null when nominal (no result depends on it).
    pub value: Option<f64>,
    /// Estimate from the tables (cm⁻¹), null when none could be made.
    pub estimate: Option<f64>,
    /// Value given on the command line (cm⁻¹), null when not given.
    pub given: Option<f64>,
    /// "estimated", "given" or "nominal".
    pub origin: String,
    /// Relative uncertainty assumed for the value, in percent.
    pub uncertainty_percent: f64,
}

impl From<&Parameter> for ParameterRow {
    fn from(p: &Parameter) -> Self {
        ParameterRow {
            value: used(p),
            estimate: p.estimate,
            given: p.given,
            origin: p.origin.name().to_string(),
            uncertainty_percent: 100.0 * p.relative_uncertainty,
        }
    }
}

fn used(p: &Parameter) -> Option<f64> {
    (p.origin != Origin::Nominal).then_some(p.value)
}

/// Δ, B and C, each given vs estimated.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct Parameters {
    pub delta: ParameterRow,
    pub b: ParameterRow,
    pub c: ParameterRow,
}

/// The ground state on one side of the crossover.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct StateRow {
    /// Total spin S.
    pub spin: f64,
    /// Label, e.g. "5T2g".
    pub term: String,
    /// Free-ion parent, e.g. "5D".
    pub parent: String,
}

/// Distance from the crossover.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct MarginRow {
    /// Δ/B − crossover Δ/B (dimensionless; negative on the high-spin side).
    pub delta_over_b: f64,
    /// The same in percent of the crossover Δ/B.
    pub percent: f64,
    /// Uncertainty assumed for Δ/B, in percent.
    pub uncertainty_percent: f64,
    /// True when the margin is within that uncertainty.
    pub borderline: bool,
}

/// One band.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct BandRow {
    /// Upper level, e.g. "4T1g".
    pub to: String,
    /// Free-ion parent of the upper level.
    pub to_parent: String,
    /// Transition energy (cm⁻¹).
    pub energy: f64,
    /// Wavelength (nm).
    pub wavelength_nm: f64,
    /// "spin-allowed, Laporte-forbidden" or "spin-allowed, no inversion centre".
    pub intensity: String,
    /// Typical molar absorptivity range ε (M⁻¹ cm⁻¹).
    pub epsilon_range: (f64, f64),
    /// Electrons changing orbital set between the strong-field parents (1 = one-electron
    /// jump); null when not determined.
    pub electrons_moved: Option<u32>,
    /// Share of the band that is a one-electron jump at this field (0–1); null when not
    /// computed.
    pub one_electron_fraction: Option<f64>,
    /// One-electron fraction below 0.1: expected weak.
    pub weak: bool,
    /// Above the charge-transfer onset (`charge_transfer_onset`): likely hidden.
    pub may_be_hidden: bool,
}

/// The spin-allowed bands of one spin state.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct BandSet {
    /// Total spin S of the state.
    pub spin: f64,
    /// Lowest level of this spin (the bands start there).
    pub from: String,
    /// Energy of that level above the ground level (cm⁻¹).
    pub from_energy: f64,
    /// Δ at which the bands were computed: this state's own Δ (cm⁻¹).
    pub delta: f64,
    /// Number of bands listed.
    pub count: usize,
    /// Bands above the window left out (0 with --all).
    pub omitted: usize,
    pub bands: Vec<BandRow>,
}

impl From<&SpinBands> for BandSet {
    fn from(s: &SpinBands) -> Self {
        BandSet {
            spin: s.two_s as f64 / 2.0,
            from: s.from.clone(),
            from_energy: s.from_energy,
            delta: s.delta,
            count: s.bands.len(),
            omitted: s.omitted,
            bands: s
                .bands
                .iter()
                .map(|b| BandRow {
                    to: b.to.clone(),
                    to_parent: crate::engine::Term::text_of(b.to_parent),
                    energy: b.energy,
                    wavelength_nm: b.wavelength_nm,
                    intensity: b.intensity.class.to_string(),
                    epsilon_range: b.intensity.epsilon,
                    electrons_moved: b.jump.and_then(|j| j.electrons),
                    one_electron_fraction: b.jump.and_then(|j| j.one_electron),
                    weak: b.jump.is_some_and(|j| j.weak),
                    may_be_hidden: b.may_be_hidden,
                })
                .collect(),
        }
    }
}

/// The literature spin state of the complex, when it is in `reported_spin_states.csv`.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct ReportedRow {
    /// Label as in the table, e.g. "[Fe(bpy)3]2+".
    pub complex: String,
    /// "high", "low", "intermediate" or "crossover".
    pub spin_state: String,
    /// Unpaired electrons of the low-temperature ground state.
    pub unpaired: usize,
    /// Spin-crossover T½ (K), when reported.
    pub t_half_k: Option<f64>,
    pub source: String,
}

impl From<&crate::tables::ReportedComplex> for ReportedRow {
    fn from(r: &crate::tables::ReportedComplex) -> Self {
        ReportedRow {
            complex: r.complex.clone(),
            spin_state: r.spin_state.name().to_string(),
            unpaired: r.unpaired,
            t_half_k: r.t_half_k,
            source: r.source.clone(),
        }
    }
}

/// The two spin states' own fields and the energy gap between them.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct SpinGeometryRow {
    /// Spin state whose geometry the ion's g refers to: "hs", "ls" or "any".
    pub reference_state: String,
    /// Bond lengthening r_HS − r_LS used (Å).
    pub delta_r_angstrom: f64,
    /// "table" (ions.csv) or "rule" (0.1 Å per e_g electron for M(I)/M(II), 0.075 Å above).
    pub delta_r_from: String,
    /// Δ_LS/Δ_HS = ((r + Δr)/r)ⁿ.
    pub ratio: f64,
    /// n in Δ ∝ r⁻ⁿ.
    pub distance_exponent: f64,
    /// Mean field Δ̄/B of the two states.
    pub mean_delta_over_b: Option<f64>,
    /// E_HS − E_LS (cm⁻¹), each state at its own geometry; > 0 when low spin is lower.
    pub energy_gap: Option<f64>,
    /// Upper end of E_HS − E_LS (cm⁻¹) for which `crossover` is predicted.
    pub crossover_window: f64,
}

/// The whole `predict` report.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct PredictReport {
    /// Formula as built from the ligands, e.g. "[Fe(NCS)2(py)4]".
    pub complex: String,
    /// Metal ion, e.g. "Fe(II)".
    pub ion: String,
    pub metal: String,
    /// Oxidation state of the metal (formal charge).
    pub oxidation_state: i32,
    /// oct, tet or sqpl.
    pub geometry: String,
    /// Point group of the labels.
    pub point_group: String,
    /// Overall charge of the complex.
    pub charge: i32,
    /// Number of d electrons.
    pub dn: usize,
    pub ligands: Vec<LigandRow>,
    /// Donor-averaged Jørgensen f.
    pub mean_f: Option<f64>,
    /// Donor-averaged Jørgensen h.
    pub mean_h: Option<f64>,
    /// Nephelauxetic ratio β = 1 − h·k used in the estimate.
    pub beta: Option<f64>,
    /// Donor-averaged π-acceptor term π̄ (dimensionless).
    pub mean_pi: f64,
    /// Δ of the predicted ground state (cm⁻¹): Δo for oct, Δt for tet, 3e_σ for sqpl.
    pub delta: Option<f64>,
    /// Δ of the high-spin state at its own bond length (cm⁻¹).
    pub delta_high_spin: Option<f64>,
    /// Δ of the low-spin state at its own bond length (cm⁻¹); equals `delta_high_spin` when the
    /// spin cannot change or Δ was given.
    pub delta_low_spin: Option<f64>,
    /// How the two spin states differ in field.
    pub spin_geometry: SpinGeometryRow,
    /// Racah B used (cm⁻¹).
    pub b: Option<f64>,
    /// Racah C used (cm⁻¹).
    pub c: Option<f64>,
    /// C/B used.
    pub c_over_b: Option<f64>,
    /// Δ/B of the complex.
    pub delta_over_b: Option<f64>,
    /// Each parameter given vs estimated.
    pub parameters: Parameters,
    /// Δ/B where the ground spin changes, for this d^n, geometry and C/B; null if it does not.
    pub crossover_delta_over_b: Option<f64>,
    /// Largest Δ/B searched for a crossover: the bound beyond which the ground spin cannot change.
    pub crossover_limit: f64,
    /// "high", "crossover" (low spin at low temperature, high spin thermally reachable), "low"
    /// or "fixed".
    pub spin_state: String,
    /// Distance from the crossover; null for "fixed".
    pub margin: Option<MarginRow>,
    /// True when the margin is within the assumed uncertainty.
    pub borderline: bool,
    /// Ground level at the complex's parameters, e.g. "5T2g".
    pub ground_term: String,
    /// Its free-ion parent term, e.g. "5D".
    pub parent_term: String,
    /// Total spin S of the ground level.
    pub spin: f64,
    /// Unpaired electrons n = 2S.
    pub unpaired: usize,
    /// Spin-only moment √(n(n+2)) (μB).
    pub spin_only_moment: f64,
    /// Spin-plus-orbital moment of the parent term √(4S(S+1)+L(L+1)) (μB), the unquenched
    /// upper limit; null unless the ground term has first-order orbital angular momentum.
    pub orbital_moment: Option<f64>,
    /// μ_eff at 300 K (μB) from the ligand field with spin–orbit coupling (van Vleck, κ = 1) at
    /// the ground state's Δ; null when ζ is unknown.
    pub moment_300k: Option<f64>,
    /// Whether the ground term has first-order orbital angular momentum.
    pub first_order_orbital: bool,
    /// Whether the ground term is Jahn–Teller active (E in O_h or T_d).
    pub jahn_teller: bool,
    /// Ground state below the crossover.
    pub high_spin_state: StateRow,
    /// Ground state above the crossover; null when the spin cannot change.
    pub low_spin_state: Option<StateRow>,
    /// Spin-allowed bands of the high-spin state.
    pub bands_high_spin: BandSet,
    /// Spin-allowed bands of the low-spin state; null when the spin cannot change.
    pub bands_low_spin: Option<BandSet>,
    /// What the literature reports for this complex (null when it is not in
    /// reported_spin_states.csv); `spin_state` and `unpaired` above are always the model's own.
    pub reported: Option<ReportedRow>,
    pub notes: Vec<String>,
    /// Charge-transfer onset (cm⁻¹) above which bands are flagged `may_be_hidden`; null when
    /// the report was built without one.
    pub charge_transfer_onset: Option<f64>,
    /// Handling cautions; the tool's output is never a safety approval.
    pub cautions: Vec<String>,
}

/// Closing sentence printed after any caution.
pub const CAUTION_FOOTER: &str = "Follow your institution's rules, the supplier's SDS and a local risk assessment; this output is not a safety approval.";

impl PredictReport {
    /// Builds the report from a prediction.
    pub fn new(p: &Prediction) -> Self {
        let c = &p.complex;
        let both = |a: &Parameter, b: &Parameter| used(a).zip(used(b)).map(|(x, y)| x / y);
        let state = |s: &crate::engine::SpinGround| StateRow {
            spin: s.two_s as f64 / 2.0,
            term: s.term.to_string(),
            parent: crate::engine::Term::text_of(s.parent),
        };
        let mut cautions = c.cautions.clone();
        if !cautions.is_empty() {
            cautions.push(CAUTION_FOOTER.to_string());
        }
        PredictReport {
            complex: c.formula(),
            ion: c.ion.name(),
            metal: c.ion.symbol.clone(),
            oxidation_state: c.ion.oxidation_state,
            geometry: c.geometry.name().to_string(),
            point_group: format!("{:?}", c.point_group()),
            charge: c.charge,
            dn: c.ion.dn,
            ligands: c
                .ligands
                .iter()
                .map(|b| LigandRow {
                    name: b.ligand.name.clone(),
                    count: b.count,
                    denticity: b.ligand.denticity(),
                    donors: b.ligand.donors.clone(),
                    f: b.ligand.f,
                    f_from: b.ligand.f_from.name().to_string(),
                    pi: crate::estimate::ligand_terms(&b.ligand).1,
                    h: b.h_used,
                    h_defaulted: b.h_defaulted,
                })
                .collect(),
            mean_f: c.mean_f,
            mean_h: c.mean_h,
            beta: c.beta,
            mean_pi: c.mean_pi,
            delta: used(&c.delta),
            delta_high_spin: used(&c.delta_high_spin),
            delta_low_spin: used(&c.delta_low_spin),
            spin_geometry: SpinGeometryRow {
                reference_state: c.spin_geometry.reference.name().to_string(),
                delta_r_angstrom: c.spin_geometry.delta_r,
                delta_r_from: match c.spin_geometry.delta_r_from {
                    crate::estimate::BondChange::Table => "table",
                    crate::estimate::BondChange::Rule => "rule",
                    crate::estimate::BondChange::None => "none",
                }
                .to_string(),
                ratio: c.spin_geometry.ratio,
                distance_exponent: c.calibration.distance_exponent,
                mean_delta_over_b: c.spin_choice.map(|s| s.delta_over_b_mean),
                energy_gap: p.energy_gap,
                crossover_window: c.calibration.crossover_window,
            },
            b: used(&c.b),
            c: used(&c.c),
            c_over_b: both(&c.c, &c.b),
            delta_over_b: both(&c.delta, &c.b),
            parameters: Parameters {
                delta: (&c.delta).into(),
                b: (&c.b).into(),
                c: (&c.c).into(),
            },
            crossover_delta_over_b: p.crossover.delta_over_b,
            crossover_limit: p.crossover.limit,
            spin_state: p.spin_state.name().to_string(),
            margin: p.margin.map(|m| MarginRow {
                delta_over_b: m.delta_over_b,
                percent: m.percent,
                uncertainty_percent: m.uncertainty_percent,
                borderline: m.borderline,
            }),
            borderline: p.margin.is_some_and(|m| m.borderline),
            ground_term: p.ground.label(),
            parent_term: crate::engine::Term::text_of(p.ground.parent),
            spin: p.spin,
            unpaired: p.unpaired,
            spin_only_moment: p.spin_only_moment,
            orbital_moment: p.orbital_moment,
            moment_300k: p.moment_300k,
            first_order_orbital: p.first_order_orbital,
            jahn_teller: p.jahn_teller,
            high_spin_state: state(&p.crossover.high_spin),
            low_spin_state: p.crossover.low_spin.as_ref().map(state),
            bands_high_spin: (&p.bands_high_spin).into(),
            bands_low_spin: p.bands_low_spin.as_ref().map(Into::into),
            reported: None,
            notes: p.notes.clone(),
            charge_transfer_onset: None,
            cautions,
        }
    }

    /// Adds what the literature reports for this complex.
    pub fn with_reported(mut self, r: Option<&crate::tables::ReportedComplex>) -> Self {
        self.reported = r.map(Into::into);
        self
    }
}

impl Render for PredictReport {
    type Figure = ();

    /// Human-readable text with tables.
    fn table(&self) -> String {
        let opt = |x: Option<f64>, d: usize| x.map_or("—".to_string(), |v| fmt_num(v, d));
        let mut out = format!(
            "{}  {}, d{}, {} ({}), charge {}\n",
            self.complex, self.ion, self.dn, self.geometry, self.point_group, self.charge
        );
        let mut t = new_table([
            "parameter",
            "used (cm⁻¹)",
            "estimated (cm⁻¹)",
            "given (cm⁻¹)",
            "origin",
            "± %",
        ]);
        for (name, p) in [
            ("Δ", &self.parameters.delta),
            ("B", &self.parameters.b),
            ("C", &self.parameters.c),
        ] {
            t.add_row(vec![
                name.to_string(),
                opt(p.value, 0),
                opt(p.estimate, 0),
                opt(p.given, 0),
                p.origin.clone(),
                if p.origin == "nominal" {
                    "—".to_string()
                } else {
                    fmt_num(p.uncertainty_percent, 0)
                },
            ]);
        }
        out.push_str(&format!("{t}\n"));
        out.push_str(&format!(
            "Δ/B = {}, C/B = {}; f̄ = {}, π̄ = {}, h̄ = {}, β = {}\n",
            opt(self.delta_over_b, 2),
            opt(self.c_over_b, 3),
            opt(self.mean_f, 3),
            fmt_num(self.mean_pi, 3),
            opt(self.mean_h, 3),
            opt(self.beta, 3)
        ));
        if self.low_spin_state.is_some() {
            let g = &self.spin_geometry;
            out.push_str(&format!(
                "each spin state at its own bond length: Δ_HS = {} cm⁻¹, Δ_LS = {} cm⁻¹ (Δr = {} Å, Δ_LS/Δ_HS = {}); mean Δ̄/B = {}; E_HS − E_LS = {} cm⁻¹ (crossover window 0–{} cm⁻¹)\n",
                opt(self.delta_high_spin, 0),
                opt(self.delta_low_spin, 0),
                fmt_num(g.delta_r_angstrom, 3),
                fmt_num(g.ratio, 2),
                opt(g.mean_delta_over_b, 2),
                opt(g.energy_gap, 0),
                fmt_num(g.crossover_window, 0)
            ));
        }
        match (&self.crossover_delta_over_b, &self.low_spin_state) {
            (Some(x), Some(ls)) => out.push_str(&format!(
                "crossover Δ/B = {} (d{}, {}, C/B {}): {} (S = {}) below, {} (S = {}) above\n",
                fmt_num(*x, 2),
                self.dn,
                self.geometry,
                opt(self.c_over_b, 3),
                self.high_spin_state.term,
                self.high_spin_state.spin,
                ls.term,
                ls.spin
            )),
            _ => out.push_str(&format!(
                "no crossover: the ground spin of d{} {} does not change at any Δ/B\n",
                self.dn, self.geometry
            )),
        }
        let state_words = match self.spin_state.as_str() {
            "crossover" => {
                "spin crossover (low-spin ground state, high-spin thermally reachable)".to_string()
            }
            s => format!("{s}-spin"),
        };
        match &self.margin {
            Some(m) => out.push_str(&format!(
                "spin state: {}, margin {} in Δ̄/B ({} % of the crossover; assumed uncertainty of Δ/B ±{} %, from the ± % column: the typical error of the factor rules against spectra, or of a measured band){}\n",
                state_words,
                fmt_num(m.delta_over_b, 2),
                fmt_num(m.percent, 1),
                fmt_num(m.uncertainty_percent, 0),
                if m.borderline { " — borderline" } else { "" }
            )),
            None => out.push_str("spin state: fixed (only one spin state for this d-electron count and geometry)\n"),
        }
        out.push_str(&format!(
            "ground term: {} (free-ion parent {}), S = {}, unpaired electrons: {}\n",
            self.ground_term, self.parent_term, self.spin, self.unpaired
        ));
        out.push_str(&format!(
            "moments: spin-only {} μB; ligand field + spin–orbit at 300 K (κ = 1) {}; first-order orbital momentum: {}{}\n",
            fmt_num(self.spin_only_moment, 2),
            self.moment_300k
                .map_or("not computed (no ζ)".to_string(), |m| format!("{} μB", fmt_num(m, 2))),
            if self.first_order_orbital { "yes" } else { "no" },
            self.orbital_moment.map_or(String::new(), |m| format!(
                " (unquenched limit of {}: {} μB)",
                self.parent_term,
                fmt_num(m, 2)
            ))
        ));
        if let Some(r) = &self.reported {
            out.push_str(&format!(
                "reported: {} is {}{} with {} unpaired electron(s) ({}); the prediction above is the model's own\n",
                r.complex,
                r.spin_state,
                r.t_half_k.map_or(String::new(), |t| format!(" (T½ ≈ {} K)", fmt_num(t, 0))),
                r.unpaired,
                r.source
            ));
        }
        for (title, set) in [
            ("high-spin", Some(&self.bands_high_spin)),
            ("low-spin", self.bands_low_spin.as_ref()),
        ] {
            let Some(set) = set else { continue };
            out.push_str(&format!(
                "spin-allowed bands of the {title} state (from {}, S = {}, at Δ = {} cm⁻¹; {}, typical ε {}–{} M⁻¹ cm⁻¹): {}{}\n",
                set.from,
                set.spin,
                fmt_num(set.delta, 0),
                set.bands.first().map_or("", |b| b.intensity.as_str()),
                set.bands.first().map_or("—".to_string(), |b| fmt_num(b.epsilon_range.0, 0)),
                set.bands.first().map_or("—".to_string(), |b| fmt_num(b.epsilon_range.1, 0)),
                set.count,
                if set.omitted > 0 {
                    format!(
                        " below {} cm⁻¹ ({} more above, not listed)",
                        fmt_num(crate::predict::BAND_WINDOW, 0),
                        set.omitted
                    )
                } else {
                    String::new()
                }
            ));
            if set.count > 0 {
                let mut t = new_table([
                    "to",
                    "parent",
                    "energy (cm⁻¹)",
                    "λ (nm)",
                    "jump",
                    "1-electron share",
                    "remarks",
                ]);
                for b in &set.bands {
                    t.add_row(vec![
                        b.to.clone(),
                        b.to_parent.clone(),
                        fmt_num(b.energy, 0),
                        fmt_num(b.wavelength_nm, 0),
                        b.electrons_moved
                            .map(|k| format!("{k}-electron"))
                            .unwrap_or_else(|| "?".into()),
                        b.one_electron_fraction
                            .map(|f| format!("{:.0} %", 100.0 * f))
                            .unwrap_or_else(|| "—".into()),
                        match (b.weak, b.may_be_hidden) {
                            (true, true) => "weak; CT likely hides it",
                            (true, false) => "weak",
                            (false, true) => "CT likely hides it",
                            (false, false) => "",
                        }
                        .to_string(),
                    ]);
                }
                out.push_str(&format!("{t}\n"));
            }
        }
        if !self.notes.is_empty() {
            out.push_str("notes:\n");
            for n in &self.notes {
                out.push_str(&format!("- {n}\n"));
            }
        }
        if !self.cautions.is_empty() {
            out.push_str("caution:\n");
            for c in &self.cautions {
                out.push_str(&format!("- {c}\n"));
            }
        }
        out
    }
}
