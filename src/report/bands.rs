//! Report of `spinstate bands`: the band-count check.

use super::fit_bands::jump_text;
use super::Render;
use super::{fmt_num, new_table};
use crate::spectra::count::BandCount;
use serde::Serialize;

/// One spin-allowed transition.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct BandRow {
    /// "4A2g → 4T2g".
    pub transition: String,
    pub label: String,
    pub parent: String,
    /// Position (cm⁻¹).
    pub energy: f64,
    /// Position (nm).
    pub wavelength_nm: f64,
    pub in_window: bool,
    /// Electrons that change orbital in the band's main strong-field jump (1 or 2); null when not determined.
    pub electrons_moved: Option<u32>,
    /// One-electron fraction below 0.1 (or a spin-forbidden band): expected weak.
    pub weak: bool,
    /// Share of the band that is a one-electron jump at this field (0–1), null if not computed.
    pub one_electron_fraction: Option<f64>,
    /// "strong", "weak" or "faint" (faint bands are not counted).
    pub visibility: String,
    /// Above the charge-transfer onset (`charge_transfer_onset`): charge transfer may hide it.
    pub may_be_hidden: bool,
    /// The lower level is an E term, or the upper one is an E term reached by a change of
    /// orbital occupation: a Jahn–Teller shoulder is possible.
    pub jahn_teller: bool,
    /// Index into `merged` (bands inside the window).
    pub merged_into: Option<usize>,
    /// "spin-allowed, Laporte-forbidden", "spin-allowed, no inversion centre" or
    /// "spin-forbidden".
    pub intensity: String,
    /// Typical molar absorptivity range ε (M⁻¹ cm⁻¹).
    pub epsilon_range: (f64, f64),
}

/// Bands inside the window after merging.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct MergedRow {
    /// Mean position (cm⁻¹).
    pub position: f64,
    /// Mean position (nm).
    pub wavelength_nm: f64,
    pub members: Vec<String>,
    pub weak: bool,
    /// Visibility of the most visible member: "strong", "weak" or "faint".
    pub visibility: String,
    /// Largest one-electron fraction among the members (0–1).
    pub one_electron_fraction: f64,
    pub may_be_hidden: bool,
    pub jahn_teller: bool,
    /// Counted in `max_expected`.
    pub counted: bool,
}

/// The bands of one spin state.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct SpinRow {
    /// "high", "low", "intermediate" or "only".
    pub spin_state: String,
    /// Spin multiplicity 2S+1 of this spin state.
    pub multiplicity: i32,
    /// Lowest level of this spin.
    pub reference: String,
    /// Ground state at the given field.
    pub is_ground: bool,
    /// Lowest level of this spin above the ground level (cm⁻¹).
    pub offset: f64,
    pub bands: Vec<BandRow>,
    pub merged: Vec<MergedRow>,
    /// Fewest bands of this spin state one may see in the window (weak and hidden bands left out; a count).
    pub min_expected: usize,
    /// Most bands of this spin state one may see in the window (a count).
    pub max_expected: usize,
    /// Indices into `merged`, most visible first, weakest last.
    pub ranked: Vec<usize>,
    /// The observed count lies in min..=max (null without --observed).
    pub supports_observed: Option<bool>,
}

/// The whole `bands` report.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct BandsReport {
    /// Number of d electrons.
    pub dn: usize,
    pub geometry: String,
    /// Dq (cm⁻¹).
    pub dq: f64,
    /// Δ = 10Dq (cm⁻¹).
    pub delta: f64,
    /// Racah B (cm⁻¹).
    pub b: f64,
    /// Racah C (cm⁻¹).
    pub c: f64,
    /// Window, shortest and longest wavelength (nm).
    pub window_nm: [f64; 2],
    /// Window, low and high wavenumber (cm⁻¹).
    pub window_cm1: [f64; 2],
    /// Resolution (cm⁻¹).
    pub resolution: f64,
    pub spin_states: Vec<SpinRow>,
    /// Number of bands observed, when given (a count).
    pub observed: Option<usize>,
    /// "high spin", "low spin", "both", "neither", … (null without --observed).
    pub verdict: Option<String>,
    pub notes: Vec<String>,
    /// Charge-transfer onset used (cm⁻¹).
    pub charge_transfer_onset: f64,
    /// "LMCT" or "MLCT" and the ligand that sets the onset; null for the generic onset.
    pub charge_transfer_kind: Option<String>,
    pub charge_transfer_ligand: Option<String>,
}

impl BandsReport {
    pub fn new(r: &BandCount) -> Self {
        BandsReport {
            dn: r.dn,
            geometry: r.geometry.name().to_string(),
            dq: r.dq,
            delta: 10.0 * r.dq,
            b: r.b,
            c: r.c,
            window_nm: [r.window_nm.0, r.window_nm.1],
            window_cm1: [r.window_cm.0, r.window_cm.1],
            resolution: r.resolution,
            spin_states: r
                .spin_states
                .iter()
                .map(|s| SpinRow {
                    spin_state: s.state.kind_name().to_string(),
                    multiplicity: s.state.multiplicity(),
                    reference: s.reference.clone(),
                    is_ground: s.is_ground,
                    offset: s.offset,
                    bands: s
                        .bands
                        .iter()
                        .map(|b| BandRow {
                            transition: format!("{} → {}", s.reference, b.transition.label),
                            label: b.transition.label.clone(),
                            parent: crate::engine::Term::text_of(b.transition.parent),
                            energy: b.transition.energy,
                            wavelength_nm: 1e7 / b.transition.energy,
                            in_window: b.in_window,
                            electrons_moved: b.electrons_moved,
                            weak: b.weak,
                            one_electron_fraction: b.one_electron,
                            visibility: b.visibility.name().to_string(),
                            may_be_hidden: b.may_be_hidden,
                            jahn_teller: b.jahn_teller,
                            merged_into: b.merged_into,
                            intensity: b.intensity.class.to_string(),
                            epsilon_range: b.intensity.epsilon,
                        })
                        .collect(),
                    merged: s
                        .merged
                        .iter()
                        .map(|m| MergedRow {
                            position: m.position,
                            wavelength_nm: 1e7 / m.position,
                            members: m.members.clone(),
                            weak: m.weak,
                            visibility: m.visibility.name().to_string(),
                            one_electron_fraction: m.one_electron,
                            may_be_hidden: m.may_be_hidden,
                            jahn_teller: m.jahn_teller,
                            counted: m.counted,
                        })
                        .collect(),
                    min_expected: s.min_expected,
                    max_expected: s.max_expected,
                    ranked: s.ranked.clone(),
                    supports_observed: s.supports,
                })
                .collect(),
            observed: r.observed,
            verdict: r.verdict.as_ref().map(|v| v.text.clone()),
            notes: r.notes.clone(),
            charge_transfer_onset: r.charge_transfer_onset,
            charge_transfer_kind: r.charge_transfer.as_ref().map(|c| c.kind.clone()),
            charge_transfer_ligand: r.charge_transfer.as_ref().map(|c| c.ligand.clone()),
        }
    }
}

impl Render for BandsReport {
    type Figure = ();

    /// Human table.
    fn table(&self) -> String {
        let mut s = format!(
            "d{} {}: Δ = 10Dq = {} cm⁻¹, B = {} cm⁻¹, C = {} cm⁻¹ (C/B = {}); window {}–{} nm ({}–{} cm⁻¹), resolution {} cm⁻¹\n",
            self.dn,
            self.geometry,
            fmt_num(self.delta, 0),
            fmt_num(self.b, 1),
            fmt_num(self.c, 0),
            fmt_num(self.c / self.b, 3),
            fmt_num(self.window_nm[0], 0),
            fmt_num(self.window_nm[1], 0),
            fmt_num(self.window_cm1[0], 0),
            fmt_num(self.window_cm1[1], 0),
            fmt_num(self.resolution, 0),
        );
        for sp in &self.spin_states {
            s.push_str(&format!(
                "\n{} spin (2S+1 = {}), from {}: {}\n",
                sp.spin_state,
                sp.multiplicity,
                sp.reference,
                if sp.is_ground {
                    "the ground state at this field".to_string()
                } else {
                    format!(
                        "not the ground state at this field (its lowest level is {} cm⁻¹ up)",
                        fmt_num(sp.offset, 0)
                    )
                }
            ));
            if sp.bands.is_empty() {
                s.push_str("no spin-allowed d–d bands\n");
                continue;
            }
            let mut t = new_table([
                "transition",
                "E (cm⁻¹)",
                "λ (nm)",
                "in window",
                "jump",
                "1-electron share",
                "typical ε (M⁻¹ cm⁻¹)",
                "band #",
                "remarks",
            ]);
            for b in &sp.bands {
                let mut remarks = Vec::new();
                if b.may_be_hidden && b.in_window {
                    remarks.push("CT may hide");
                }
                if b.jahn_teller && b.in_window {
                    remarks.push("JT shoulder possible");
                }
                t.add_row(vec![
                    b.transition.clone(),
                    fmt_num(b.energy, 0),
                    fmt_num(b.wavelength_nm, 0),
                    if b.in_window { "yes" } else { "no" }.to_string(),
                    jump_text(b.electrons_moved, b.weak),
                    b.one_electron_fraction
                        .map(|f| format!("{:.0} % ({})", 100.0 * f, b.visibility))
                        .unwrap_or_else(|| "—".into()),
                    format!(
                        "{}–{}{}",
                        fmt_epsilon(b.epsilon_range.0),
                        fmt_epsilon(b.epsilon_range.1),
                        if b.intensity == "spin-forbidden" {
                            " (spin-forbidden)"
                        } else {
                            ""
                        }
                    ),
                    b.merged_into
                        .map(|g| (g + 1).to_string())
                        .unwrap_or_default(),
                    remarks.join(", "),
                ]);
            }
            s.push_str(&format!("{t}\n"));
            if !sp.ranked.is_empty() {
                let list: Vec<String> = sp
                    .ranked
                    .iter()
                    .map(|&g| {
                        let m = &sp.merged[g];
                        let mut tag = m.visibility.clone();
                        if m.may_be_hidden {
                            tag.push_str(", above CT onset");
                        }
                        if !m.counted {
                            tag.push_str(", not counted");
                        }
                        format!("{} cm⁻¹ ({tag})", fmt_num(m.position, 0))
                    })
                    .collect();
                s.push_str(&format!(
                    "what the window should show, most visible first: {}\n",
                    list.join("; ")
                ));
            }
            s.push_str(&format!(
                "expected: {} to {} band(s) in the window",
                sp.min_expected, sp.max_expected
            ));
            if let Some(ok) = sp.supports_observed {
                s.push_str(if ok {
                    " — fits the observed count"
                } else {
                    " — does not fit the observed count"
                });
            }
            s.push('\n');
        }
        if let (Some(n), Some(v)) = (self.observed, &self.verdict) {
            s.push_str(&format!("\n{n} observed band(s) support: {v}\n"));
        }
        for n in &self.notes {
            s.push_str(&format!("note: {n}\n"));
        }
        s
    }
}

/// A molar absorptivity (M⁻¹ cm⁻¹) with two significant figures at most: 0.001, 0.1, 10, 1000.
fn fmt_epsilon(x: f64) -> String {
    if !x.is_finite() || x <= 0.0 {
        return fmt_num(x, 0);
    }
    let decimals = (1.0 - x.log10().floor()).max(0.0) as usize;
    let s = format!("{x:.decimals$}");
    if s.contains('.') {
        s.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        s
    }
}
