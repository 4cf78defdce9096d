//! How much of each level lies in each strong-field configuration at the actual field.
//!
//! A configuration is a set of occupations of the field's orbital sets (t2g^a eg^b in O_h). The
//! number operator of each set is a one-electron operator, so its matrix in a spin block is
//! assembled from the engine's cached excitation matrices exactly like the ligand field; the
//! configurations are the joint eigenspaces of these commuting operators. A level's weight in a
//! configuration is the squared projection of its eigenvectors onto that eigenspace.
//!
//! The weights say how far the nominal strong-field label of a band is from the truth at the
//! actual field: the ⁴T₁g(P) band of Cr(III), nominally the two-electron jump t2g³ → t2g¹eg²,
//! carries about 10 % of t2g²eg¹ in [Cr(H₂O)₆]³⁺ through configuration interaction (the 6B
//! off-diagonal element of the ⁴T₁g matrix; Y. Tanabe, S. Sugano, J. Phys. Soc. Jpn. 1954,
//! 9, 753), and that is the part that lends it intensity.

use crate::engine::hermitian::{add_field, add_scaled, eigen_unsorted};
use crate::engine::shell::shell;
use crate::engine::{Calculation, Level, LigandField, PointGroup};
use crate::error::{Error, Result};
use crate::param::Param;
use nalgebra::{Complex, DMatrix};

type C64 = Complex<f64>;

/// Weights of the strong-field configurations in one level: (occupations per orbital set,
/// weight), weights summing to 1, largest first.
pub type ConfigurationWeights = Vec<(Vec<u32>, f64)>;

/// Irrational weights that make Σ αₛ nₛ different for every configuration of up to five sets.
const TAGS: [f64; 5] = [
    1.0,
    std::f64::consts::SQRT_2,
    1.732_050_807_568_877_2,
    2.236_067_977_499_79,
    2.645_751_311_064_590_7,
];

fn orbital_set_field(members: &[usize], scale: f64) -> LigandField {
    let mut d = [0.0; 5];
    for &i in members {
        d[i] = scale;
    }
    LigandField::from_diagonal(d)
}

/// The weights of each strong-field configuration in each given level (same order) of a
/// calculation. `sets` are the orbital sets (indices into the real d orbitals) that define a
/// configuration; each must be an invariant subspace of the calculation's field (the sets of
/// [`super::transitions::orbital_sets`] for the field's geometry are).
pub fn configuration_weights(
    calc: &Calculation,
    sets: &[Vec<usize>],
    levels: &[&Level],
) -> Result<Vec<ConfigurationWeights>> {
    if sets.is_empty() || sets.len() > TAGS.len() {
        return Err(Error::invalid(
            Param::OrbitalSets,
            sets.len(),
            "1..=5 sets of real d orbitals",
        ));
    }
    let fourfold = calc.group != PointGroup::C1 && calc.field.has_fourfold_z_axis();
    let blocks = shell(calc.dn).blocks(fourfold);
    let v = calc.field.complex_matrix();
    let set_fields: Vec<_> = sets
        .iter()
        .map(|s| orbital_set_field(s, 1.0).complex_matrix())
        .collect();
    let mut tagged = LigandField::zero();
    for (s, &a) in sets.iter().zip(&TAGS) {
        tagged.matrix += orbital_set_field(s, a).matrix;
    }
    let tagged = tagged.complex_matrix();
    let scale = (calc.b + calc.c + 10.0 * calc.field.magnitude()).max(1.0);
    let tol = 1e-6 * scale;
    // Per level: summed weights and the number of states added.
    let mut sums: Vec<(ConfigurationWeights, usize)> = vec![(Vec::new(), 0); levels.len()];
    for block in blocks {
        if !levels.iter().any(|l| l.two_s == block.two_s) || block.dim() == 0 {
            continue;
        }
        let mut re = &block.rep_b * calc.b;
        add_scaled(&mut re, calc.c, &block.rep_c);
        let mut im = None;
        add_field(&mut re, &mut im, &block.excitations, &v);
        let (values, states) = eigen_unsorted(re, im)?;
        // Joint eigenbasis of the set occupations: eigenvectors of Σ αₛ Nₛ.
        let n = block.dim();
        let mut t_re = DMatrix::zeros(n, n);
        let mut t_im = None;
        add_field(&mut t_re, &mut t_im, &block.excitations, &tagged);
        let (_, conf_vecs) = eigen_unsorted(t_re, t_im)?;
        let ops: Vec<DMatrix<C64>> = set_fields
            .iter()
            .map(|f| {
                let mut o_re = DMatrix::zeros(n, n);
                let mut o_im = None;
                add_field(&mut o_re, &mut o_im, &block.excitations, f);
                match o_im {
                    None => o_re.map(|x| C64::new(x, 0.0)),
                    Some(im) => DMatrix::from_fn(n, n, |a, b| C64::new(o_re[(a, b)], im[(a, b)])),
                }
            })
            .collect();
        let mut occupations: Vec<Vec<u32>> = Vec::with_capacity(n);
        for j in 0..n {
            let u = conf_vecs.column(j);
            let mut occ = Vec::with_capacity(sets.len());
            for op in &ops {
                let x = (u.adjoint() * op * u)[(0, 0)].re;
                if (x - x.round()).abs() > 1e-6 {
                    return Err(Error::Computation(format!(
                        "orbital-set occupation {x} is not a whole number: the sets are not invariant under the field"
                    )));
                }
                occ.push(x.round().max(0.0) as u32);
            }
            occupations.push(occ);
        }
        for (li, level) in levels.iter().enumerate() {
            if level.two_s != block.two_s {
                continue;
            }
            for (k, &e) in values.iter().enumerate() {
                if (e - level.absolute_energy).abs() > tol {
                    continue;
                }
                let psi = states.column(k);
                let entry = &mut sums[li];
                for (j, occ) in occupations.iter().enumerate() {
                    let w = conf_vecs.column(j).dotc(&psi).norm_sqr();
                    match entry.0.iter_mut().find(|(o, _)| o == occ) {
                        Some(slot) => slot.1 += w,
                        None => entry.0.push((occ.clone(), w)),
                    }
                }
                entry.1 += 1;
            }
        }
    }
    sums.into_iter()
        .zip(levels)
        .map(|((mut w, count), level)| {
            if count == 0 {
                return Err(Error::Computation(format!(
                    "no eigenstate found for the level {} at {:.3} cm⁻¹",
                    level.label(),
                    level.absolute_energy
                )));
            }
            for x in &mut w {
                x.1 /= count as f64;
            }
            w.retain(|x| x.1 > 1e-12);
            w.sort_by(|a, b| b.1.total_cmp(&a.1));
            Ok(w)
        })
        .collect()
}

/// Probability that the configurations of two levels differ by exactly one electron changing
/// orbital set: Σ w_a(c) w_b(c′) over pairs one electron apart. For a lower level in a single
/// configuration it is the upper level's weight in the configurations one jump away; it is the
/// part of a d–d band that a one-electron transition operator reaches, so a band's intensity
/// scales roughly with it.
pub fn one_electron_fraction(lower: &ConfigurationWeights, upper: &ConfigurationWeights) -> f64 {
    let mut f = 0.0;
    for (a, wa) in lower {
        for (b, wb) in upper {
            if super::transitions::electrons_moved(a, b) == 1 {
                f += wa * wb;
            }
        }
    }
    f
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::engine::Geometry;
    use crate::spectra::transitions::{band_manifold, calculation, jumps};
    use approx::assert_abs_diff_eq;

    /// Octahedral d³ ⁴T₁g: in the strong-field basis t2g²eg¹, t2g¹eg² the matrix is
    /// [[10Dq + 12B, 6B], [6B, 20Dq + 3B]] (its eigenvalues are the ν₂, ν₃ of A. B. P. Lever,
    /// J. Chem. Educ. 1968, 45, 711: 7.5B + 15Dq ∓ ½√(225B² − 180B·Dq + 100Dq²)), so the
    /// upper ⁴T₁g(P) holds sin²θ of t2g²eg¹ with tan 2θ = 12B/(10Dq − 9B).
    #[test]
    fn d3_t1g_mixing_matches_the_two_by_two_matrix() {
        for (dq, b) in [(1740.0, 728.6), (2155.0, 657.0), (1200.0, 800.0)] {
            let calc = calculation(3, Geometry::Octahedral, dq, b, 4.5 * b).unwrap();
            let s = calc.levels().unwrap();
            let m = band_manifold(&s, 3).unwrap();
            let j = jumps(&calc, Geometry::Octahedral, &s, &m).unwrap();
            let p = m
                .transitions
                .iter()
                .position(|t| t.label == "4T1g(P)")
                .unwrap();
            let theta = 0.5 * (12.0 * b).atan2(10.0 * dq - 9.0 * b);
            assert_abs_diff_eq!(
                j[p].one_electron.unwrap(),
                theta.sin().powi(2),
                epsilon = 1e-9
            );
            // ⁴T₂g is pure t2g²eg¹: a one-electron jump from the pure t2g³ ground state.
            assert_abs_diff_eq!(j[0].one_electron.unwrap(), 1.0, epsilon = 1e-9);
        }
    }

    #[test]
    fn weights_sum_to_one_and_name_the_configuration() {
        let calc = calculation(6, Geometry::Octahedral, 2303.0, 634.8, 4.8 * 634.8).unwrap();
        let s = calc.levels().unwrap();
        let ground = s.ground();
        let sets = vec![vec![1, 2, 4], vec![0, 3]];
        let w = configuration_weights(&calc, &sets, &[ground]).unwrap();
        let total: f64 = w[0].iter().map(|x| x.1).sum();
        assert_abs_diff_eq!(total, 1.0, epsilon = 1e-9);
        // Low-spin d⁶ ¹A₁g is mostly t2g⁶ (common practice).
        assert_eq!(w[0][0].0, vec![6, 0]);
        assert!(w[0][0].1 > 0.95);
    }
}
