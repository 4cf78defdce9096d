//! Thermal spin transitions: the ideal two-state model and the Slichter–Drickamer mean-field
//! model, with their metastable branches and turning points.
//!
//! Units: ΔH and Γ in J mol⁻¹, ΔS in J mol⁻¹ K⁻¹, T in K; γ is the high-spin fraction.
//!
//! - **Ideal two-state model** (e.g. P. Gütlich, H. A. Goodwin, *Top. Curr. Chem.* 2004, 233,
//!   1): γ = 1/(1 + exp[(ΔH − TΔS)/RT]), T½ = ΔH/ΔS.
//! - **Slichter–Drickamer** (C. P. Slichter, H. G. Drickamer, *J. Chem. Phys.* 1972, 56, 2142):
//!   G(γ) = γΔH − TγΔS + Γγ(1 − γ) + RT[γ ln γ + (1 − γ) ln(1 − γ)], stationary where
//!   ln[(1 − γ)/γ] = [ΔH + Γ(1 − 2γ)]/RT − ΔS/R. For Γ ≤ 2RT the root is unique; above it the
//!   equation has three roots at temperatures inside the hysteresis loop, two of them minima.
//!   Heating follows the low-γ minimum until it vanishes at T↑, cooling the high-γ one until
//!   T↓; the loop is bounded by the turning points of T(γ) = [ΔH + Γ(1 − 2γ)]/[R ln((1 − γ)/γ)
//!   + ΔS].
//! - **Residual fraction.** A high-spin fraction r that stays trapped at low temperature:
//!   γ_obs = r + (1 − r)γ.

use crate::error::{Error, Result};
use crate::param::Param;

/// Molar gas constant R (J mol⁻¹ K⁻¹; CODATA 2018, exact).
pub const GAS_CONSTANT: f64 = 8.314_462_618;

/// Which branch of a hysteretic transition a point lies on.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Branch {
    /// Measured on warming: the low-spin branch persists up to T↑.
    Heating,
    /// Measured on cooling: the high-spin branch persists down to T↓.
    Cooling,
    /// The global minimum of G (thermodynamic equilibrium; no memory).
    Equilibrium,
}

impl Branch {
    pub fn name(self) -> &'static str {
        match self {
            Branch::Heating => "heating",
            Branch::Cooling => "cooling",
            Branch::Equilibrium => "equilibrium",
        }
    }
}

/// The parameters of a transition.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Transition {
    /// ΔH = H_HS − H_LS (J mol⁻¹).
    pub dh: f64,
    /// ΔS = S_HS − S_LS (J mol⁻¹ K⁻¹).
    pub ds: f64,
    /// Interaction parameter Γ (J mol⁻¹); 0 for the ideal model.
    pub gamma: f64,
    /// Trapped high-spin fraction r (0..1).
    pub residual: f64,
}

/// Largest |Γ| accepted (J/mol).
pub const MAX_GAMMA: f64 = 100_000.0;

impl Transition {
    /// Checks the parameters: finite, ΔS > 0 (a transition needs an entropy gain), ΔH > 0,
    /// 0 ≤ r < 1.
    pub fn checked(self) -> Result<Self> {
        for (name, v) in [
            (Param::Enthalpy, self.dh),
            (Param::Entropy, self.ds),
            (Param::Cooperativity, self.gamma),
            (Param::ResidualFraction, self.residual),
        ] {
            if !v.is_finite() {
                return Err(Error::invalid(name, v, "a finite number"));
            }
        }
        if self.dh <= 0.0 {
            return Err(Error::invalid(
                Param::Enthalpy,
                format!("{} kJ/mol", self.dh / 1000.0),
                "ΔH > 0 (the high-spin state lies above the low-spin one)",
            ));
        }
        if self.ds <= 0.0 {
            return Err(Error::invalid(
                Param::Entropy,
                format!("{} J/mol/K", self.ds),
                "ΔS > 0 (the high-spin state has the larger entropy)",
            ));
        }
        // Interaction parameters of spin-crossover solids are a few kJ/mol; ±100 kJ/mol bounds
        // them generously (common practice) and keeps the equilibrium equation solvable.
        if self.gamma.abs() > MAX_GAMMA {
            return Err(Error::invalid(
                Param::Cooperativity,
                format!("{} kJ/mol", self.gamma / 1000.0),
                format!("|Γ| ≤ {} kJ/mol", MAX_GAMMA / 1000.0),
            ));
        }
        if !(0.0..1.0).contains(&self.residual) {
            return Err(Error::invalid(
                Param::ResidualFraction,
                self.residual,
                "a fraction in 0 ≤ r < 1",
            ));
        }
        Ok(self)
    }

    /// T½ = ΔH/ΔS (K), where γ = ½ at equilibrium.
    pub fn t_half(&self) -> f64 {
        self.dh / self.ds
    }

    /// Whether the transition is first order with hysteresis: Γ > 2RT½.
    pub fn hysteretic(&self) -> bool {
        self.gamma > 2.0 * GAS_CONSTANT * self.t_half()
    }

    /// dG/dγ at temperature `t` written in u = ln[γ/(1 − γ)]: h(u) = RTu + ΔH − TΔS + Γ(1 − 2γ).
    fn h(&self, t: f64, u: f64) -> f64 {
        let g = sigmoid(u);
        GAS_CONSTANT * t * u + self.dh - t * self.ds + self.gamma * (1.0 - 2.0 * g)
    }

    /// Free energy G(γ) relative to the low-spin state (J mol⁻¹).
    fn free_energy(&self, t: f64, g: f64) -> f64 {
        let mix = if g <= 0.0 || g >= 1.0 {
            0.0
        } else {
            g * g.ln() + (1.0 - g) * (1.0 - g).ln()
        };
        g * self.dh - t * g * self.ds + self.gamma * g * (1.0 - g) + GAS_CONSTANT * t * mix
    }

    /// The stable equilibrium fractions (minima of G) at `t`, ascending in γ; one or two.
    ///
    /// In u = ln[γ/(1 − γ)], dG/dγ = h(u) rises on the whole line when Γ ≤ 2RT (one root). For
    /// Γ > 2RT, h′(u) = RT − 2Γγ(1 − γ) vanishes at γ = ½[1 ± √(1 − 2RT/Γ)]: h rises, falls,
    /// and rises again, so a minimum of G lies on each rising piece where h changes sign there.
    /// Each root is found by bisection to machine precision.
    pub fn minima(&self, t: f64) -> Result<Vec<f64>> {
        if !t.is_finite() || t <= 0.0 {
            return Err(Error::invalid(
                Param::Temperature,
                format!("{t} K"),
                "T > 0 K",
            ));
        }
        let rt = GAS_CONSTANT * t;
        let span = (self.dh - t * self.ds).abs() / rt + self.gamma.abs() / rt + 5.0;
        if self.gamma == 0.0 {
            // The ideal model in closed form: u = −(ΔH − TΔS)/RT.
            return Ok(vec![sigmoid(-(self.dh - t * self.ds) / rt)]);
        }
        // Newton's method on h(u) kept inside the bracket [a, b] (h(a) < 0 ≤ h(b)), with a
        // bisection step whenever Newton would leave it.
        let root = |mut a: f64, mut b: f64| -> f64 {
            let mut u = 0.5 * (a + b);
            for _ in 0..100 {
                let hu = self.h(t, u);
                if hu < 0.0 {
                    a = u;
                } else {
                    b = u;
                }
                let g = sigmoid(u);
                let dh = rt - 2.0 * self.gamma * g * (1.0 - g);
                let next = if dh > 0.0 { u - hu / dh } else { f64::NAN };
                let next = if next > a && next < b {
                    next
                } else {
                    0.5 * (a + b)
                };
                if (next - u).abs() <= 1e-13 * (1.0 + u.abs()) || b - a <= 1e-13 * (1.0 + u.abs()) {
                    u = next;
                    break;
                }
                u = next;
            }
            sigmoid(u)
        };
        if self.gamma <= 2.0 * rt {
            return Ok(vec![root(-span, span)]);
        }
        let w = (1.0 - 2.0 * rt / self.gamma).sqrt();
        let (g1, g2) = (0.5 * (1.0 - w), 0.5 * (1.0 + w));
        let (u1, u2) = ((g1 / (1.0 - g1)).ln(), (g2 / (1.0 - g2)).ln());
        let mut out = Vec::new();
        if self.h(t, u1) >= 0.0 {
            out.push(root(-span, u1));
        }
        if self.h(t, u2) <= 0.0 {
            out.push(root(u2, span));
        }
        if out.is_empty() {
            return Err(Error::Computation(format!(
                "no equilibrium high-spin fraction found at {t} K"
            )));
        }
        Ok(out)
    }

    /// The intrinsic high-spin fraction γ (without the residual) on a branch at `t`.
    pub fn intrinsic_fraction(&self, t: f64, branch: Branch) -> Result<f64> {
        let m = self.minima(t)?;
        Ok(match branch {
            Branch::Heating => m[0],
            Branch::Cooling => m[m.len() - 1],
            Branch::Equilibrium => {
                let mut best = m[0];
                for &g in &m[1..] {
                    if self.free_energy(t, g) < self.free_energy(t, best) {
                        best = g;
                    }
                }
                best
            }
        })
    }

    /// The observed high-spin fraction γ_obs = r + (1 − r)γ on a branch at `t`.
    pub fn fraction(&self, t: f64, branch: Branch) -> Result<f64> {
        let g = self.intrinsic_fraction(t, branch)?;
        Ok(self.residual + (1.0 - self.residual) * g)
    }

    /// The hysteresis loop (T↓, T↑) in K from the turning points of T(γ); None without
    /// hysteresis.
    pub fn turning_points(&self) -> Option<(f64, f64)> {
        if !self.hysteretic() {
            return None;
        }
        let temp = |g: f64| -> Option<f64> {
            let den = GAS_CONSTANT * ((1.0 - g) / g).ln() + self.ds;
            let t = (self.dh + self.gamma * (1.0 - 2.0 * g)) / den;
            (den > 0.0 && t > 0.0).then_some(t)
        };
        // T(γ) on a fine logit grid: a local maximum (T↑, lower branch) then a local minimum
        // (T↓, upper branch).
        const N: usize = 4000;
        let pts: Vec<(f64, Option<f64>)> = (1..N)
            .map(|i| {
                let u = -12.0 + 24.0 * i as f64 / N as f64;
                let g = sigmoid(u);
                (u, temp(g))
            })
            .collect();
        let mut up = None;
        let mut down = None;
        for w in pts.windows(3) {
            if let (Some(a), Some(b), Some(c)) = (w[0].1, w[1].1, w[2].1) {
                if b > a && b >= c && up.is_none() {
                    up = Some(refine_extremum(&temp, w[0].0, w[2].0, true));
                } else if b < a && b <= c && up.is_some() && down.is_none() {
                    down = Some(refine_extremum(&temp, w[0].0, w[2].0, false));
                }
            }
        }
        match (down, up) {
            (Some(d), Some(u)) => Some((d, u)),
            _ => None,
        }
    }
}

/// Golden-section search for the extremum of T(σ(u)) in [a, b]; returns T there.
fn refine_extremum(temp: &dyn Fn(f64) -> Option<f64>, a: f64, b: f64, maximum: bool) -> f64 {
    let f = |u: f64| {
        let t = temp(sigmoid(u)).unwrap_or(if maximum { f64::MIN } else { f64::MAX });
        if maximum {
            -t
        } else {
            t
        }
    };
    let phi = 0.5 * (5f64.sqrt() - 1.0);
    let (mut a, mut b) = (a, b);
    for _ in 0..200 {
        let c = b - phi * (b - a);
        let d = a + phi * (b - a);
        if f(c) < f(d) {
            b = d;
        } else {
            a = c;
        }
    }
    let t = f(0.5 * (a + b));
    if maximum {
        -t
    } else {
        t
    }
}

/// σ(u) = 1/(1 + e^−u).
pub fn sigmoid(u: f64) -> f64 {
    1.0 / (1.0 + (-u).exp())
}

/// The spin-only entropy share R ln[(2S_HS + 1)/(2S_LS + 1)] (J mol⁻¹ K⁻¹) for 2S values.
pub fn spin_entropy(two_s_high: i32, two_s_low: i32) -> f64 {
    GAS_CONSTANT * ((two_s_high as f64 + 1.0) / (two_s_low as f64 + 1.0)).ln()
}

/// One simulated point.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CurvePoint {
    pub t: f64,
    /// Observed high-spin fraction on the heating branch.
    pub heating: f64,
    /// On the cooling branch (equal to `heating` outside a loop).
    pub cooling: f64,
}

/// γ_obs(T) on both branches at the given temperatures.
pub fn simulate(tr: &Transition, temperatures: &[f64]) -> Result<Vec<CurvePoint>> {
    temperatures
        .iter()
        .map(|&t| {
            Ok(CurvePoint {
                t,
                heating: tr.fraction(t, Branch::Heating)?,
                cooling: tr.fraction(t, Branch::Cooling)?,
            })
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    fn ideal(dh_kj: f64, ds: f64) -> Transition {
        Transition {
            dh: dh_kj * 1000.0,
            ds,
            gamma: 0.0,
            residual: 0.0,
        }
    }

    /// The ideal model is the Boltzmann formula (Gütlich & Goodwin 2004): γ(T½) = ½ and
    /// γ = 1/(1 + exp[(ΔH − TΔS)/RT]) elsewhere.
    #[test]
    fn ideal_model_is_the_boltzmann_formula() {
        let tr = ideal(8.88, 59.5);
        assert_abs_diff_eq!(
            tr.fraction(tr.t_half(), Branch::Equilibrium).unwrap(),
            0.5,
            epsilon = 1e-9
        );
        for t in [80.0, 120.0, 150.0, 200.0, 250.0] {
            let exact = 1.0 / (1.0 + ((tr.dh - t * tr.ds) / (GAS_CONSTANT * t)).exp());
            assert_abs_diff_eq!(
                tr.fraction(t, Branch::Heating).unwrap(),
                exact,
                epsilon = 1e-9
            );
            assert_abs_diff_eq!(
                tr.fraction(t, Branch::Cooling).unwrap(),
                exact,
                epsilon = 1e-9
            );
        }
    }

    /// R ln 5 = 13.38 J mol⁻¹ K⁻¹ for iron(II) S = 2 → 0, R ln 3 = 9.13 for iron(III) 5/2 → 1/2,
    /// R ln 2 = 5.76 for cobalt(II) 3/2 → 1/2 (common practice: the spin degeneracy ratio).
    #[test]
    fn spin_entropy_shares() {
        assert_abs_diff_eq!(spin_entropy(4, 0), 13.38, epsilon = 0.005);
        assert_abs_diff_eq!(spin_entropy(5, 1), 9.13, epsilon = 0.005);
        assert_abs_diff_eq!(spin_entropy(3, 1), 5.76, epsilon = 0.005);
    }

    /// Slichter & Drickamer 1972: no hysteresis for Γ ≤ 2RT½, a loop above it, and the loop
    /// from the turning points of T(γ) agrees with the jumps of the branches found by tracking
    /// the roots of the equilibrium equation on a fine temperature grid.
    #[test]
    fn critical_interaction_and_loop_width() {
        let base = ideal(12.0, 80.0); // T½ = 150 K
        let crit = 2.0 * GAS_CONSTANT * base.t_half();
        let below = Transition {
            gamma: 0.95 * crit,
            ..base
        };
        assert!(below.turning_points().is_none());
        for t in [140.0, 150.0, 160.0] {
            assert_eq!(below.minima(t).unwrap().len(), 1);
        }
        let above = Transition {
            gamma: 1.3 * crit,
            ..base
        };
        let (down, up) = above.turning_points().unwrap();
        assert!(down < base.t_half() && up > base.t_half(), "{down} {up}");
        // Independent: step the branches in 0.01 K and find where each jumps.
        let jump = |branch: Branch| -> f64 {
            let mut last = above.fraction(100.0, branch).unwrap();
            let mut t = 100.0;
            while t < 200.0 {
                t += 0.01;
                let g = above.fraction(t, branch).unwrap();
                if (g - last).abs() > 0.2 {
                    return t;
                }
                last = g;
            }
            f64::NAN
        };
        assert_abs_diff_eq!(jump(Branch::Heating), up, epsilon = 0.02);
        assert_abs_diff_eq!(jump(Branch::Cooling), down, epsilon = 0.02);
        // Symmetric about T½ for this model.
        assert_abs_diff_eq!(0.5 * (up + down), base.t_half(), epsilon = 0.5);
    }

    #[test]
    fn residual_fraction_lifts_the_low_temperature_plateau() {
        let tr = Transition {
            residual: 0.1,
            ..ideal(10.0, 70.0)
        };
        assert_abs_diff_eq!(
            tr.fraction(20.0, Branch::Heating).unwrap(),
            0.1,
            epsilon = 1e-6
        );
        assert!(tr.checked().is_ok());
        assert!(Transition { ds: -1.0, ..tr }.checked().is_err());
        assert!(Transition {
            residual: 1.0,
            ..tr
        }
        .checked()
        .is_err());
    }
}
