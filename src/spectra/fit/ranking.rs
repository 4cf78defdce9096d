//! Ranking assignments: plausible parameter ranges, the penalty for each concern, far-band limits
//! and the near-equal tolerance.

/// Range of Racah B (cm⁻¹) treated as plausible for a d-block complex; outside it an assignment
/// is flagged (common practice: 3d complexes have B ≈ 400–1100, 4d/5d lower).
pub const PLAUSIBLE_B: (f64, f64) = (100.0, 1500.0);

/// Range of fitted C/B treated as plausible (free-ion C is about 4–5 B, W. L. Jolly, Modern Inorganic Chemistry, 1989, and the Griffith 1961 / Lever 1984 B₀ tables, from memory;
/// the margins are this tool's choice).
pub const PLAUSIBLE_C_OVER_B: (f64, f64) = (3.0, 6.0);

/// Range of Racah B (cm⁻¹) outside which a fit is rejected as impossible: free 3d ions have
/// B₀ ≲ 1300 cm⁻¹ and complexes less (Jolly 1989 and Griffith/Lever B₀ tables, W. L. Jolly, Modern Inorganic Chemistry, 1989, and the Griffith 1961 / Lever 1984 B₀ tables, from memory;
/// the margins are this tool's choice).
pub const POSSIBLE_B: (f64, f64) = (50.0, 3000.0);

/// Penalty (cm⁻¹ added to the rms) for each concern when ranking assignments: a band expected to
/// be strong predicted where it could have been seen (above 1100 nm or the lowest observed band,
/// below the highest observed band) but not assigned,
/// a field that makes another spin state the ground state, an implausible B or fitted C/B. A ranking
/// heuristic of this tool, not a published rule.
pub const CONCERN_PENALTY: f64 = 1000.0;

/// A band misses its transition "by far" when the residual exceeds this many cm⁻¹ and
/// [`FAR_FRACTION`] of the band; such data are rejected as reaching no transition.
pub const FAR_ABSOLUTE: f64 = 2000.0;
/// See [`FAR_ABSOLUTE`].
pub const FAR_FRACTION: f64 = 0.10;

/// Scores (cm⁻¹) closer than this differ only by rounding.
pub(super) const SCORE_ROUNDING: f64 = 1e-6;

/// Tolerance (cm⁻¹) within which another assignment's score counts as near-equal.
pub fn near_equal_tolerance(best_rms: f64) -> f64 {
    (0.25 * best_rms).max(100.0)
}
