//! Calibration of the estimator's few constants against `reported_spin_states.csv`, and its
//! leave-one-out accuracy by category.
//!
//! Each reported complex is resolved once ([`crate::complex::ComplexSpec::resolve`]), which
//! fixes everything that does not depend on the constants (f̄, π̄, g, B, the engine's
//! crossover and slope). A trial [`Calibration`] then costs a few flops per complex:
//! [`estimate::reference_delta`], [`SpinGeometry::new`] and [`estimate::choose_spin`], the very
//! functions `predict` and `screen` call. The fit is an exhaustive search over a grid of
//! physically sensible values ([`GRID`]); ties go to the values closest to the published
//! priors (n = 5.5 from Hauser 2004, c_π = 1, W = 2000 cm⁻¹ from Hauser 2004, γ_sqpl = 1).
//!
//! A prediction counts as right when its unpaired-electron count at low temperature equals the
//! reported one and, for a reported spin crossover, the model says `crossover`; a reported
//! high- or low-spin complex predicted as `crossover` counts as wrong. A row whose composition
//! cannot be resolved counts as wrong.

use crate::complex::{ComplexSpec, LigandCount, Overrides};
use crate::engine::{ground_spin_map, spin_from_map, Crossover, Geometry};
use crate::estimate::{self, Calibration, SpinGeometry, SpinState};
use crate::tables::{Category, DataSet, Ion, ReportedComplex, ReportedSpin};

/// The values searched for each constant of [`Calibration`].
#[derive(Debug, Clone, Copy)]
pub struct Grid {
    pub distance_exponent: &'static [f64],
    pub back_bonding: &'static [f64],
    /// cm⁻¹.
    pub crossover_window: &'static [f64],
    pub planar_factor: &'static [f64],
    pub jahn_teller: &'static [f64],
}

/// The grid searched.
pub const GRID: Grid = Grid {
    distance_exponent: &[3.0, 3.5, 4.0, 4.5, 5.0, 5.5, 6.0, 6.5, 7.0],
    back_bonding: &[0.0, 0.5, 1.0, 1.5, 2.0, 2.5, 3.0],
    crossover_window: &[
        500.0, 1000.0, 1500.0, 2000.0, 2500.0, 3000.0, 4000.0, 5000.0,
    ],
    planar_factor: &[1.0, 1.5, 2.0, 2.5, 3.0, 3.5, 4.0, 4.5, 5.0],
    jahn_teller: &[0.0, 0.05, 0.1, 0.15, 0.2, 0.25, 0.3],
};

/// One reported complex with the parts of its estimate that the constants do not change.
#[derive(Debug, Clone)]
pub struct Case {
    pub reported: ReportedComplex,
    /// None when the composition could not be resolved (the reason is in `error`).
    features: Option<Features>,
    pub error: Option<String>,
}

#[derive(Debug, Clone)]
struct Features {
    ion: Ion,
    geometry: Geometry,
    mean_f: f64,
    mean_pi: f64,
    g: f64,
    b: f64,
    cross: Crossover,
    /// The engine's ground 2S against Δ/B (all spin changes up to Δ/B = 200).
    spins: Vec<(f64, i32)>,
}

/// What the model says about one case under one calibration.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct CaseVerdict {
    pub state: SpinState,
    /// Unpaired electrons of the low-temperature ground state.
    pub unpaired: usize,
}

impl Case {
    /// The model's verdict under `cal`; None when the case could not be resolved.
    pub fn verdict(&self, cal: &Calibration) -> Option<CaseVerdict> {
        let f = self.features.as_ref()?;
        let delta_ref = estimate::reference_delta(
            f.mean_f,
            f.mean_pi,
            f.g,
            f.ion.oxidation_state,
            f.geometry,
            cal,
        );
        let sg = SpinGeometry::new(&f.ion, f.geometry, &f.cross, cal);
        let choice = estimate::choose_spin(
            delta_ref * sg.high_spin_factor / f.b,
            delta_ref * sg.low_spin_factor / f.b,
            f.b,
            &f.cross,
            cal,
        );
        let state = choice.map_or(SpinState::Fixed, |c| c.state);
        // The ground spin at the field of the state the verdict names, as `predict` counts it.
        let x = match (choice, state.low_spin_ground()) {
            (Some(c), true) => c.delta_over_b_low_spin,
            (Some(c), false) => c.delta_over_b_high_spin,
            (None, _) => delta_ref * sg.high_spin_factor / f.b,
        };
        let two_s = estimate::verdict_two_s(state, &f.cross, spin_from_map(&f.spins, x));
        Some(CaseVerdict {
            state,
            unpaired: two_s as usize,
        })
    }

    /// Whether the verdict under `cal` agrees with the reported spin state (module docs).
    pub fn is_right(&self, cal: &Calibration) -> bool {
        let Some(v) = self.verdict(cal) else {
            return false;
        };
        let crossover_said = v.state == SpinState::Crossover;
        let crossover_reported = self.reported.spin_state == ReportedSpin::Crossover;
        v.unpaired == self.reported.unpaired && crossover_said == crossover_reported
    }
}

/// Resolves every reported complex once (an error when the reported table cannot be read).
pub fn cases(tables: &DataSet) -> crate::error::Result<Vec<Case>> {
    Ok(tables
        .reported()?
        .rows
        .iter()
        .map(|r| {
            let spec = ComplexSpec {
                metal: r.metal.clone(),
                oxidation_state: r.oxidation_state,
                geometry: r.geometry,
                ligands: r
                    .ligands
                    .iter()
                    .map(|(name, count)| LigandCount {
                        name: name.clone(),
                        count: *count,
                    })
                    .collect(),
                overrides: Overrides::default(),
            };
            let resolved = spec.resolve(tables).and_then(|c| {
                let spins = ground_spin_map(c.ion.dn, c.geometry, c.crossover.c_over_b)?;
                Ok((c, spins))
            });
            match resolved {
                Ok((c, spins)) => Case {
                    features: c.ion.g.map(|g| Features {
                        spins,
                        mean_f: c.mean_f.unwrap_or(0.0),
                        mean_pi: c.mean_pi,
                        g,
                        b: c.b.value,
                        cross: c.crossover.clone(),
                        geometry: c.geometry,
                        ion: c.ion.clone(),
                    }),
                    error: c
                        .ion
                        .g
                        .is_none()
                        .then(|| format!("no g for {}", c.ion.name())),
                    reported: r.clone(),
                },
                Err(e) => Case {
                    reported: r.clone(),
                    features: None,
                    error: Some(e.to_string()),
                },
            }
        })
        .collect())
}

/// Every calibration of the grid, in a fixed order.
pub fn grid() -> Vec<Calibration> {
    let g = GRID;
    let mut out = Vec::new();
    for &distance_exponent in g.distance_exponent {
        for &back_bonding in g.back_bonding {
            for &crossover_window in g.crossover_window {
                for &planar_factor in g.planar_factor {
                    for &jahn_teller in g.jahn_teller {
                        out.push(Calibration {
                            distance_exponent,
                            back_bonding,
                            crossover_window,
                            planar_factor,
                            jahn_teller,
                        });
                    }
                }
            }
        }
    }
    out
}

/// Distance of a calibration from the published priors, for breaking ties.
fn prior_distance(c: &Calibration) -> f64 {
    ((c.distance_exponent - 5.5) / 1.0).powi(2)
        + (c.back_bonding - 1.0).powi(2)
        + ((c.crossover_window - 2000.0) / 1000.0).powi(2)
        + ((c.planar_factor - 1.0) / 0.5).powi(2)
        + (c.jahn_teller / 0.1).powi(2)
}

/// The results of the fit and of leave-one-out.
#[derive(Debug, Clone)]
pub struct Assessment {
    /// The calibration fitted to every case.
    pub fitted: Calibration,
    /// Cases right with the fitted calibration (in-sample).
    pub in_sample_right: usize,
    /// Per case: right when predicted by a calibration fitted to all the other cases.
    pub leave_one_out: Vec<bool>,
    pub cases: Vec<Case>,
}

impl Assessment {
    /// (category, right, total) of the leave-one-out predictions, for every category present.
    pub fn by_category(&self) -> Vec<(Category, usize, usize)> {
        Category::ALL
            .into_iter()
            .filter_map(|cat| {
                let idx: Vec<usize> = (0..self.cases.len())
                    .filter(|&i| self.cases[i].reported.category == cat)
                    .collect();
                (!idx.is_empty()).then(|| {
                    let right = idx.iter().filter(|&&i| self.leave_one_out[i]).count();
                    (cat, right, idx.len())
                })
            })
            .collect()
    }

    /// Overall leave-one-out accuracy (0..=1).
    pub fn accuracy(&self) -> f64 {
        self.leave_one_out.iter().filter(|&&r| r).count() as f64
            / self.leave_one_out.len().max(1) as f64
    }
}

/// Fits the constants to all cases and measures leave-one-out accuracy.
pub fn assess(tables: &DataSet) -> crate::error::Result<Assessment> {
    let cases = cases(tables)?;
    let grid = grid();
    let right: Vec<Vec<bool>> = grid
        .iter()
        .map(|cal| cases.iter().map(|c| c.is_right(cal)).collect())
        .collect();
    let totals: Vec<usize> = right
        .iter()
        .map(|r| r.iter().filter(|&&x| x).count())
        .collect();
    let best = |leave_out: Option<usize>| -> usize {
        let mut best = 0;
        let mut best_key = (usize::MAX, f64::INFINITY);
        for (k, cal) in grid.iter().enumerate() {
            let n = totals[k] - leave_out.map_or(0, |i| usize::from(right[k][i]));
            // Larger n first, then closer to the priors.
            let key = (cases.len() - n, prior_distance(cal));
            if key.0 < best_key.0 || (key.0 == best_key.0 && key.1 < best_key.1) {
                best = k;
                best_key = key;
            }
        }
        best
    };
    let fitted_index = best(None);
    let leave_one_out = (0..cases.len()).map(|i| right[best(Some(i))][i]).collect();
    Ok(Assessment {
        fitted: grid[fitted_index],
        in_sample_right: totals[fitted_index],
        leave_one_out,
        cases,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::estimate::CALIBRATION;

    /// Leave-one-out accuracy of the spin state against the literature table (each row names
    /// its published source in data/reported_spin_states.csv); fails below 90 % overall.
    #[test]
    fn leave_one_out_accuracy() {
        let t = DataSet::bundled();
        let a = assess(t).unwrap();
        assert!(a.cases.len() >= 150, "{} reported complexes", a.cases.len());
        for (cat, right, total) in a.by_category() {
            println!(
                "{:14} {right:3}/{total:3} = {:5.1} %",
                cat.name(),
                100.0 * right as f64 / total as f64
            );
        }
        println!(
            "overall {:.1} % leave-one-out, {}/{} in sample; fitted {:?}",
            100.0 * a.accuracy(),
            a.in_sample_right,
            a.cases.len(),
            a.fitted
        );
        for (i, c) in a.cases.iter().enumerate() {
            if !a.leave_one_out[i] {
                println!(
                    "  wrong: {} reported {} ({}), model {:?} {}",
                    c.reported.complex,
                    c.reported.spin_state.name(),
                    c.reported.unpaired,
                    c.verdict(&a.fitted),
                    c.error.clone().unwrap_or_default()
                );
            }
        }
        assert!(a.accuracy() >= 0.90, "{:.3}", a.accuracy());
    }

    /// The constants shipped in `estimate::CALIBRATION` are the fit to the bundled table.
    #[test]
    fn shipped_constants_are_the_fit() {
        let a = assess(DataSet::bundled()).unwrap();
        assert_eq!(a.fitted, CALIBRATION);
    }
}
