//! Band-count check: which spin-allowed d–d bands each possible spin state puts inside a
//! spectrometer window, which of them are likely to merge or be weak, and whether an observed
//! number of bands fits high spin, low spin, both or neither.
//!
//! Rules used (documented here because they decide the verdict):
//! - Bands closer than the resolution merge into one likely unresolved band (single linkage).
//! - A band is weak when it is not a one-electron jump in the strong-field limit and cannot
//!   borrow intensity from a one-electron level of the same symmetry (rule of
//!   [`super::transitions::jumps`]).
//! - Charge-transfer absorption can hide d–d bands above about 25 000 cm⁻¹ (common practice), so
//!   bands there may be missing.
//! - Jahn–Teller splitting can add a shoulder to a band whose lower or upper level is an E term
//!   (cubic groups only).
//!
//! The fewest bands a spin state should show are its merged, not-weak bands inside the window
//! and below 25 000 cm⁻¹; the most are all its merged bands inside the window plus one shoulder
//! per band touching an E term.

use super::transitions::{
    band_manifold, calculation, intensity, jumps, spin_states, Intensity, SpinState, Transition,
};
use crate::engine::{Geometry, PointGroup};
use crate::error::{require_finite, Error, Result};

/// Default spectrometer window (nm).
pub const DEFAULT_WINDOW_NM: (f64, f64) = (200.0, 1100.0);
/// Default resolution (cm⁻¹) below which two bands are taken as one.
pub const DEFAULT_RESOLUTION: f64 = 1500.0;
/// Above about this wavenumber (cm⁻¹) charge-transfer bands can hide d–d bands (common practice).
pub const CHARGE_TRANSFER_ONSET: f64 = 25_000.0;

/// What to check.
#[derive(Debug, Clone)]
pub struct CountRequest {
    pub dn: usize,
    pub geometry: Geometry,
    /// Dq (cm⁻¹).
    pub dq: f64,
    /// Racah B (cm⁻¹).
    pub b: f64,
    /// Racah C (cm⁻¹).
    pub c: f64,
    /// Window as (shortest, longest) wavelength in nm.
    pub window_nm: (f64, f64),
    /// Resolution (cm⁻¹).
    pub resolution: f64,
    /// Number of d–d bands observed, if known.
    pub observed: Option<usize>,
}

/// One spin-allowed transition in the check.
#[derive(Debug, Clone, PartialEq)]
pub struct CountedBand {
    pub transition: Transition,
    /// Electrons changing orbital set (strong-field limit), if determined.
    pub electrons_moved: Option<u32>,
    pub in_window: bool,
    /// Expected weak (see [`super::transitions::jumps`]).
    pub weak: bool,
    /// Above [`CHARGE_TRANSFER_ONSET`]: may be hidden by charge transfer.
    pub may_be_hidden: bool,
    /// The lower or upper level is an E term: a Jahn–Teller shoulder is possible.
    pub jahn_teller: bool,
    /// Index into [`SpinBands::merged`] for bands inside the window.
    pub merged_into: Option<usize>,
    /// Expected intensity class and ε range ([`super::transitions::intensity`]).
    pub intensity: Intensity,
}

/// Bands inside the window after merging those closer than the resolution.
#[derive(Debug, Clone, PartialEq)]
pub struct MergedBand {
    /// Mean position of the members (cm⁻¹).
    pub position: f64,
    /// Labels of the transitions merged here.
    pub members: Vec<String>,
    /// Every member is weak.
    pub weak: bool,
    pub may_be_hidden: bool,
    pub jahn_teller: bool,
}

/// The bands of one spin state.
#[derive(Debug, Clone, PartialEq)]
pub struct SpinBands {
    pub state: SpinState,
    /// Lowest level of this spin ("4A2g").
    pub reference: String,
    /// Whether this spin state is the ground state at the given field.
    pub is_ground: bool,
    /// Energy of its lowest level above the ground level (cm⁻¹).
    pub offset: f64,
    pub bands: Vec<CountedBand>,
    pub merged: Vec<MergedBand>,
    /// Fewest bands expected (see the module documentation).
    pub min_expected: usize,
    /// Most bands expected.
    pub max_expected: usize,
    /// Whether the observed count lies in min..=max, when a count was given.
    pub supports: Option<bool>,
}

/// Which spin states an observed count supports.
#[derive(Debug, Clone, PartialEq)]
pub struct Verdict {
    pub supported: Vec<SpinState>,
    /// "high spin", "low spin", "both", "neither", or the single state's description.
    pub text: String,
}

/// Result of [`count_bands`].
#[derive(Debug, Clone, PartialEq)]
pub struct BandCount {
    pub dn: usize,
    pub geometry: Geometry,
    pub dq: f64,
    pub b: f64,
    pub c: f64,
    /// Window in cm⁻¹ (low, high).
    pub window_cm: (f64, f64),
    pub window_nm: (f64, f64),
    pub resolution: f64,
    pub spin_states: Vec<SpinBands>,
    pub observed: Option<usize>,
    pub verdict: Option<Verdict>,
    pub notes: Vec<String>,
}

fn check_inputs(req: &CountRequest) -> Result<()> {
    for (name, v) in [
        ("Dq", req.dq),
        ("B", req.b),
        ("C", req.c),
        ("window", req.window_nm.0),
        ("window", req.window_nm.1),
        ("resolution", req.resolution),
    ] {
        require_finite(name, v)?;
    }
    if req.dq < 0.0 {
        return Err(Error::invalid("Dq", req.dq, "≥ 0 cm⁻¹"));
    }
    let (lo, hi) = req.window_nm;
    if lo <= 0.0 || hi <= lo {
        return Err(Error::invalid(
            "window",
            format!("{lo}–{hi} nm"),
            "two wavelengths in nm, shortest first, both > 0 (e.g. 200-1100)",
        ));
    }
    if req.resolution < 0.0 {
        return Err(Error::invalid("resolution", req.resolution, "≥ 0 cm⁻¹"));
    }
    Ok(())
}

/// Runs the band-count check.
pub fn count_bands(req: &CountRequest) -> Result<BandCount> {
    check_inputs(req)?;
    let calc = calculation(req.dn, req.geometry, req.dq, req.b, req.c)?;
    let spectrum = calc.levels()?;
    let c_over_b = req.c / req.b;
    let states = spin_states(req.dn, req.geometry, c_over_b)?;
    if states.is_empty() {
        return Err(Error::invalid(
            "d-electron count",
            req.dn,
            "1..=9 (d0 and d10 have no d–d bands)",
        ));
    }
    let window_cm = (1e7 / req.window_nm.1, 1e7 / req.window_nm.0);
    let cubic = matches!(calc.group, PointGroup::Oh | PointGroup::Td);
    let ground_two_s = spectrum.ground().two_s;
    let mut out = Vec::new();
    let mut any_jt = false;
    let mut notes = Vec::new();
    for state in &states {
        let Some(m) = band_manifold(&spectrum, state.two_s) else {
            continue;
        };
        let forbidden = m.upper_two_s != m.two_s;
        let band_jumps = jumps(req.dn, req.geometry, req.b, req.c, &m)?;
        let ground_e = cubic && m.reference.irrep.starts_with('E');
        let mut bands: Vec<CountedBand> = m
            .transitions
            .iter()
            .enumerate()
            .map(|(i, t)| CountedBand {
                transition: t.clone(),
                electrons_moved: band_jumps[i].electrons,
                in_window: (window_cm.0..=window_cm.1).contains(&t.energy),
                weak: band_jumps[i].weak || forbidden,
                may_be_hidden: t.energy > CHARGE_TRANSFER_ONSET,
                jahn_teller: ground_e || (cubic && t.key.irrep.starts_with('E')),
                merged_into: None,
                intensity: intensity(req.geometry, !forbidden, band_jumps[i].weak),
            })
            .collect();
        // Merge neighbours inside the window (bands are sorted by energy).
        let mut merged: Vec<MergedBand> = Vec::new();
        let mut last_energy = f64::NEG_INFINITY;
        let mut sums: Vec<(f64, usize)> = Vec::new();
        for band in bands.iter_mut().filter(|b| b.in_window) {
            let e = band.transition.energy;
            if merged.is_empty() || e - last_energy >= req.resolution {
                merged.push(MergedBand {
                    position: e,
                    members: Vec::new(),
                    weak: true,
                    may_be_hidden: true,
                    jahn_teller: false,
                });
                sums.push((0.0, 0));
            }
            let g = merged.len() - 1;
            let group = &mut merged[g];
            group.members.push(band.transition.label.clone());
            group.weak &= band.weak;
            group.jahn_teller |= band.jahn_teller;
            sums[g].0 += e;
            sums[g].1 += 1;
            band.merged_into = Some(g);
            last_energy = e;
        }
        for (g, (sum, count)) in merged.iter_mut().zip(&sums) {
            g.position = sum / *count as f64;
            g.may_be_hidden = g.position > CHARGE_TRANSFER_ONSET;
        }
        let min_expected = merged
            .iter()
            .filter(|g| !g.weak && !g.may_be_hidden)
            .count();
        let max_expected = merged.len() + merged.iter().filter(|g| g.jahn_teller).count();
        any_jt |= merged.iter().any(|g| g.jahn_teller);
        if forbidden {
            notes.push(format!(
                "{} has no spin-allowed d–d bands: its bands are the very weak spin-forbidden transitions to the {}-fold levels (ε < 1), counted as weak (Lever, Inorganic Electronic Spectroscopy, 1984; from memory)",
                state.describe(),
                m.upper_two_s + 1
            ));
        }
        out.push(SpinBands {
            state: *state,
            reference: m.reference_label.clone(),
            is_ground: state.two_s == ground_two_s,
            offset: m.offset,
            supports: req
                .observed
                .map(|n| (min_expected..=max_expected).contains(&n)),
            bands,
            merged,
            min_expected,
            max_expected,
        });
    }
    notes.push(format!(
        "charge-transfer bands can hide d–d bands above about {CHARGE_TRANSFER_ONSET:.0} cm⁻¹ ({:.0} nm) (common practice); such bands are counted as possibly missing",
        1e7 / CHARGE_TRANSFER_ONSET
    ));
    if any_jt {
        notes.push(
            "Jahn–Teller splitting can add a shoulder to a band whose lower or upper level is an E term; each such band may count twice".into(),
        );
    }
    let verdict = req.observed.map(|_| {
        let supported: Vec<SpinState> = out
            .iter()
            .filter(|s| s.supports == Some(true))
            .map(|s| s.state)
            .collect();
        let text = if supported.is_empty() {
            "neither".to_string()
        } else if out.len() == 1 {
            out[0].state.describe()
        } else if supported.len() == out.len() {
            if out.len() == 2 {
                "both".to_string()
            } else {
                "all".to_string()
            }
        } else {
            supported
                .iter()
                .map(|s| format!("{} spin", s.kind_name()))
                .collect::<Vec<_>>()
                .join(" and ")
        };
        Verdict { supported, text }
    });
    Ok(BandCount {
        dn: req.dn,
        geometry: req.geometry,
        dq: req.dq,
        b: req.b,
        c: req.c,
        window_cm,
        window_nm: req.window_nm,
        resolution: req.resolution,
        spin_states: out,
        observed: req.observed,
        verdict,
        notes,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn request(dn: usize, dq: f64, b: f64, c_over_b: f64, observed: Option<usize>) -> CountRequest {
        CountRequest {
            dn,
            geometry: Geometry::Octahedral,
            dq,
            b,
            c: c_over_b * b,
            window_nm: DEFAULT_WINDOW_NM,
            resolution: DEFAULT_RESOLUTION,
            observed,
        }
    }

    #[test]
    fn cobalt_aqua_high_spin_shows_two_strong_and_one_weak_band() {
        // Octahedral d7 HS 4T1g: → 4T2g, → 4A2g (weak, two-electron), → 4T1g(P) (Lever 1984;
        // A. B. P. Lever, Inorganic Electronic Spectroscopy, 2nd ed., 1984, from memory [M]); [Co(H2O)6]2+ Dq ≈ 920, B ≈ 825 (band data of A. B. P. Lever, Inorganic Electronic Spectroscopy, 1984, from memory [M]).
        let r = count_bands(&request(7, 921.5, 827.7, 4.633, Some(2))).unwrap();
        let hs = &r.spin_states[0];
        assert_eq!(hs.state.two_s, 3);
        assert!(hs.is_ground);
        let a2 = hs
            .bands
            .iter()
            .find(|b| b.transition.key.irrep == "A2g")
            .unwrap();
        assert_eq!(a2.electrons_moved, Some(2));
        assert!(a2.weak);
        let strong = hs.bands.iter().filter(|b| !b.weak).count();
        assert_eq!(strong, 2);
        assert_eq!(hs.supports, Some(true));
    }

    #[test]
    fn cobalt_ammine_low_spin_two_bands() {
        // Octahedral d6 LS 1A1g: two spin-allowed bands → 1T1g, → 1T2g (A. B. P. Lever, Inorganic Electronic Spectroscopy, 2nd ed., 1984, from memory [M]);
        // [Co(NH3)6]3+ 21 000 and 29 500 cm⁻¹ at Dq = 2303, B = 634.8, C = 4.8B (§5.6 [C]).
        let r = count_bands(&request(6, 2303.0, 634.8, 4.8, Some(2))).unwrap();
        let ls = r.spin_states.iter().find(|s| s.state.two_s == 0).unwrap();
        assert!(ls.is_ground);
        let strong: Vec<&str> = ls
            .bands
            .iter()
            .filter(|b| b.in_window && !b.weak)
            .map(|b| b.transition.label.as_str())
            .collect();
        assert_eq!(&strong[..2], ["1T1g", "1T2g"]);
        assert_eq!(ls.supports, Some(true));
        // The 29 500 band is above 25 000 cm⁻¹, so one observed band is also consistent.
        assert_eq!(ls.min_expected, 1);
    }

    #[test]
    fn close_bands_merge() {
        let mut r = request(3, 1740.0, 728.6, 4.5, None);
        r.resolution = 8000.0;
        let out = count_bands(&r).unwrap();
        // 17 400 and 24 600 merge at 8 000 cm⁻¹ resolution; 38 500 stays apart.
        assert_eq!(out.spin_states[0].merged.len(), 2);
    }

    #[test]
    fn bad_window_is_rejected() {
        let mut r = request(3, 1740.0, 728.6, 4.5, None);
        r.window_nm = (900.0, 300.0);
        assert_eq!(count_bands(&r).unwrap_err().exit_code(), 2);
    }
}
