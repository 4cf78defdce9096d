//! The spin state of a centre from its own field ([`super::field`]): levels, ground state and
//! how far the field is from a change of the ground spin.
//!
//! **Margin.** The field matrix is scaled by λ (B and C fixed) until the ground spin changes;
//! the margin is the λ nearest 1 at which it does, searched from 1/[`MARGIN_RANGE`] to
//! [`MARGIN_RANGE`] on a geometric grid and refined by bisection. λ > 1: the field would have to
//! grow by that factor (the centre is on the high-spin side); λ < 1: shrink (low-spin side).
//! A model measure of distance from crossover at fixed geometry: it ignores the bond-length
//! change that goes with a spin change (which the composition estimate includes).

use super::centre::Centre;
use super::field::{geometry_field, GeometryField};
use crate::complex::ResolvedComplex;
use crate::engine::{Calculation, Level};
use crate::error::Result;

/// Largest factor by which the field is scaled up or down in the margin search.
pub const MARGIN_RANGE: f64 = 4.0;

/// The spin state a centre's geometry field gives.
#[derive(Debug, Clone)]
pub struct StructureSpin {
    pub field: GeometryField,
    /// The lowest levels (energies above the ground level, cm⁻¹), at most 12.
    pub levels: Vec<Level>,
    /// Twice the ground spin.
    pub two_s: i32,
    /// λ nearest 1 at which the ground spin changes, with the new 2S; None within the range.
    pub margin: Option<(f64, i32)>,
}

fn ground(complex: &ResolvedComplex, field: &GeometryField, scale: f64) -> Result<i32> {
    Calculation::new(
        complex.ion.dn,
        complex.b.value,
        complex.c.value,
        field.field.scaled(scale),
        field.group,
    )?
    .ground_two_s()
}

/// The geometry field of `centre` for `complex` (donors assigned as [`geometry_field`]
/// does) and the spin state it gives.
pub fn structure_spin(
    centre: &Centre,
    complex: &ResolvedComplex,
    sites: &[(String, String)],
) -> Result<StructureSpin> {
    let field = geometry_field(centre, complex, sites)?;
    let calc = Calculation::new(
        complex.ion.dn,
        complex.b.value,
        complex.c.value,
        field.field,
        field.group,
    )?;
    let spectrum = calc.levels()?;
    let two_s = spectrum.ground().two_s;
    let levels: Vec<Level> = spectrum.levels.iter().take(12).cloned().collect();
    let step: f64 = 1.05;
    let steps = (MARGIN_RANGE.ln() / step.ln()).ceil() as i32;
    let mut margin = None;
    'search: for k in 1..=steps {
        for dir in [1.0, -1.0] {
            let hi = step.powf(dir * k as f64);
            let s = ground(complex, &field, hi)?;
            if s != two_s {
                // Bisect between the previous grid point and this one.
                let mut a = step.powf(dir * (k - 1) as f64);
                let mut b = hi;
                for _ in 0..30 {
                    let m = (a * b).sqrt();
                    if ground(complex, &field, m)? == two_s {
                        a = m;
                    } else {
                        b = m;
                    }
                }
                margin = Some(((a * b).sqrt(), s));
                break 'search;
            }
        }
    }
    Ok(StructureSpin {
        field,
        levels,
        two_s,
        margin,
    })
}
