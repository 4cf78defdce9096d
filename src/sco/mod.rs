//! Spin-crossover curves: the transition models ([`model`]), reading χ_M·T(T) and
//! variable-temperature Evans data ([`data`]), fitting them ([`fit`]), and the physically
//! possible χ_M·T of each pure spin state ([`pure_state_ranges`]).

pub mod data;
pub mod fit;
pub mod model;

use crate::engine::{crossover, tanabe_sugano_c_over_b, Geometry};
use crate::error::{Error, Result};
use crate::measured::compare::{self, MomentQuery, SpinOrbit};
use crate::param::Param;
use crate::spectra::SpinKind;
use crate::tables::moment_ranges::MomentRangeTable;
use crate::units::{moment_factor_cgs, spin_only_chi_t_cgs};

/// Allowance (cm³ K mol⁻¹) above the spin-only χ_M·T of the low-spin state: temperature-
/// independent paramagnetism and the few per cent of high-spin sites a real low-spin solid
/// keeps (iron(II) low-spin χ_M·T ≈ 0–0.2; P. Gütlich, H. A. Goodwin, Top. Curr. Chem. 2004,
/// 233, 1; from memory).
pub const LOW_SPIN_ALLOWANCE: f64 = 0.25;

/// The χ_M·T range (cm³ K mol⁻¹) each pure state may have, with where it comes from.
#[derive(Debug, Clone, PartialEq)]
pub struct PureStateRanges {
    /// 2S of the high- and low-spin states.
    pub two_s: (i32, i32),
    pub high_spin: (f64, f64),
    pub low_spin: (f64, f64),
    pub why: String,
}

/// The physically possible χ_M·T of the two states of d^n in `geometry` at room temperature:
/// the moment windows of `spinstate moment` (spin-only, the spin–orbit corrected or full
/// ligand-field + spin–orbit moment with ζ, and the typical published ranges of
/// data/moment_ranges.csv), converted with χ_M·T = (μ_eff/2.828)².
pub fn pure_state_ranges(
    dn: usize,
    geometry: Geometry,
    zeta: Option<f64>,
    ranges: &MomentRangeTable,
) -> Result<PureStateRanges> {
    let cross = crossover(dn, geometry, tanabe_sugano_c_over_b(dn))?;
    if cross.low_spin.is_none() {
        return Err(Error::invalid(
            Param::DElectronCount,
            format!("d{dn} {}", geometry.name()),
            "an ion with two spin states in this geometry (d4–d7 octahedral)",
        ));
    }
    let spec = MomentQuery {
        spin_orbit: zeta.map(SpinOrbit::Zeta),
        temperature: Some(300.0),
        ..MomentQuery::new(dn, geometry)
    };
    let states = compare::expectations(&spec, ranges)?;
    let f = moment_factor_cgs();
    let to_chi_t = |(lo, hi): (f64, f64)| ((lo / f).powi(2), (hi / f).powi(2));
    let hs = states
        .iter()
        .find(|s| s.state == SpinKind::High)
        .ok_or_else(|| Error::Computation("no high-spin expectation".into()))?;
    let ls = states
        .iter()
        .find(|s| s.state == SpinKind::Low)
        .ok_or_else(|| Error::Computation("no low-spin expectation".into()))?;
    let (ls_lo, ls_hi) = to_chi_t(ls.window);
    Ok(PureStateRanges {
        two_s: (hs.two_s, ls.two_s),
        high_spin: to_chi_t(hs.window),
        low_spin: (ls_lo, ls_hi.max(spin_only_chi_t_cgs(f64::from(ls.two_s)) + LOW_SPIN_ALLOWANCE)),
        why: format!(
            "d{dn} {}: the 300 K moment windows of the two states (spin-only, spin–orbit and typical ranges, as in `spinstate moment`), the low-spin one widened by {LOW_SPIN_ALLOWANCE} cm³ K/mol",
            geometry.name()
        ),
    })
}
