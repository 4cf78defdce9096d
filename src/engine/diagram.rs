//! Energy-level diagrams in the convention of Tanabe and Sugano (J. Phys. Soc. Jpn. 9, 753, 1954):
//! E/B of every level against Δ/B at fixed C/B, with the ground level drawn at zero.

use super::crossover::{crossover, Crossover};
use super::geometry::Geometry;
use super::labels::{Irrep, Term};
use super::levels::{Calculation, Spectrum};
use super::projection::Projection;
use crate::error::{require_finite, Error, Result};
use crate::param::Param;

/// One level followed across the diagram.
#[derive(Debug, Clone, PartialEq)]
pub struct Series {
    /// Twice the total spin.
    pub two_s: i32,
    /// Mulliken label without multiplicity, e.g. T1g.
    pub irrep: Irrep,
    /// Position among levels of the same spin and irrep (lowest = 1).
    pub index: usize,
    /// Free-ion parent term (None when the level could not be labelled).
    pub parent: Option<Term>,
    /// Orbital degeneracy.
    pub degeneracy: usize,
    /// E/B above the ground level at each Δ/B of the diagram.
    pub energies: Vec<f64>,
}

impl Series {
    /// Label with multiplicity, e.g. "4T1g".
    pub fn label(&self) -> String {
        format!("{}{}", self.two_s + 1, self.irrep)
    }

    /// A unique column name such as "4T1g(4P)" or, for repeated labels, "2T2g#3(2H)".
    pub fn key(&self, repeated: bool) -> String {
        if repeated {
            format!(
                "{}#{}({})",
                self.label(),
                self.index,
                Term::text_of(self.parent)
            )
        } else {
            format!("{}({})", self.label(), Term::text_of(self.parent))
        }
    }
}

/// A full diagram.
#[derive(Debug, Clone)]
pub struct Diagram {
    pub dn: usize,
    pub geometry: Geometry,
    pub c_over_b: f64,
    /// Δ/B values, evenly spaced from 0 to the maximum, both included.
    pub delta_over_b: Vec<f64>,
    pub series: Vec<Series>,
    pub crossover: Crossover,
}

impl Diagram {
    /// Whether several series share the same label and parent (so their keys need the index).
    pub fn needs_index(&self, s: &Series) -> bool {
        self.series
            .iter()
            .filter(|o| o.two_s == s.two_s && o.irrep == s.irrep && o.parent == s.parent)
            .count()
            > 1
    }
}

/// Computes the diagram of d^n in `geometry` at C/B for `points` values of Δ/B from 0 to `max`.
/// Every point after the first needs eigenvalues only ([`Projection`]); where the projection
/// cannot be built, every point is labelled from its eigenvectors.
pub fn diagram(
    dn: usize,
    geometry: Geometry,
    c_over_b: f64,
    max: f64,
    points: usize,
) -> Result<Diagram> {
    diagram_with(dn, geometry, c_over_b, max, points, true)
}

/// As [`diagram`], with every point labelled from its own eigenvectors (the reference the
/// projected path is tested against).
pub fn diagram_full(
    dn: usize,
    geometry: Geometry,
    c_over_b: f64,
    max: f64,
    points: usize,
) -> Result<Diagram> {
    diagram_with(dn, geometry, c_over_b, max, points, false)
}

fn diagram_with(
    dn: usize,
    geometry: Geometry,
    c_over_b: f64,
    max: f64,
    points: usize,
    project: bool,
) -> Result<Diagram> {
    require_finite(Param::MaxDeltaOverB, max)?;
    if max <= 0.0 {
        return Err(Error::invalid(
            Param::MaxDeltaOverB,
            max,
            "a value > 0 (e.g. 40)",
        ));
    }
    if points < 2 {
        return Err(Error::invalid(Param::Points, points, "at least 2"));
    }
    let group = geometry.point_group(0.0, 0.0);
    let at = |x: f64| -> Result<Calculation> {
        Calculation::new(
            dn,
            1.0,
            c_over_b,
            geometry.field(x / 10.0, 0.0, 0.0)?,
            group,
        )
    };
    let reference = at(max)?;
    let parents = reference.parent_table()?;
    let projection = if project {
        Projection::for_group(dn, group)?
    } else {
        None
    };
    let xs: Vec<f64> = (0..points)
        .map(|i| max * i as f64 / (points - 1) as f64)
        .collect();
    // The points are independent: they are solved on every core, then joined in order.
    use rayon::prelude::*;
    // The crossover search is independent of the points too, so it runs beside them.
    let (spectra, crossing) = rayon::join(
        || {
            xs.par_iter()
                .map(|&x| {
                    let calc = at(x)?;
                    match &projection {
                        // Δ = 0 is the free ion: its levels are degenerate across irreps,
                        // which the projection handles like any other point.
                        Some(p) => p.levels(&calc, &parents),
                        None => calc.levels_with(&parents, false),
                    }
                })
                .collect::<Result<Vec<Spectrum>>>()
        },
        || crossover(dn, geometry, c_over_b),
    );
    let spectra = spectra?;
    let mut series: Vec<Series> = Vec::new();
    for (pi, spectrum) in spectra.iter().enumerate() {
        for l in &spectrum.levels {
            let existing = series
                .iter_mut()
                .find(|s| s.two_s == l.two_s && s.irrep == l.irrep && s.index == l.index);
            match existing {
                Some(s) => s.energies[pi] = l.energy,
                None => {
                    let mut energies = vec![f64::NAN; points];
                    energies[pi] = l.energy;
                    series.push(Series {
                        two_s: l.two_s,
                        irrep: l.irrep,
                        index: l.index,
                        parent: l.parent,
                        degeneracy: l.degeneracy,
                        energies,
                    });
                }
            }
        }
    }
    // Order series by their energy at the largest field, lowest first.
    series.sort_by(|a, b| {
        let ea = a.energies.last().copied().unwrap_or(f64::NAN);
        let eb = b.energies.last().copied().unwrap_or(f64::NAN);
        ea.total_cmp(&eb)
    });
    Ok(Diagram {
        dn,
        geometry,
        c_over_b,
        delta_over_b: xs,
        series,
        crossover: crossing?,
    })
}
