//! The ligand field of a centre at its real geometry: the angular overlap model (C. E.
//! Schäffer, C. K. Jørgensen, *Mol. Phys.* 1965, 9, 401; E. Larsen, G. N. La Mar, *J. Chem.
//! Educ.* 1974, 51, 633) with e_σ and e_π for each donor at its actual direction and distance.
//!
//! **Parameters per donor.** The estimator ([`crate::estimate`]) gives the octahedral Δ of the
//! composition in its low-spin state, at the reference bond length r₀ =
//! [`REFERENCE_BOND_LENGTH`]. Each ligand's share follows its own effective factor (Jørgensen's
//! f plus the back-bonding term, as in the estimator), Δᵢ = Δ_LS,oct · f_eff,i / f̄_eff, so the
//! donor average is the estimate by construction (rule of average environment). The ligand
//! table's e_π/e_σ ratio (Cr(III) values, Lever 1984) splits Δᵢ = 3e_σ − 4e_π into
//! e_σ = Δᵢ/(3 − 4ε) and e_π = ε·e_σ (ε = 0 when the table has no e_π). **Distance.** Both
//! scale as (r₀/r)ⁿ with the estimator's exponent n (the same law that relates its Δ_HS and
//! Δ_LS; Hauser, *Top. Curr. Chem.* 2004, 233, 49: 10Dq ∝ r⁻⁵ to r⁻⁶).
//!
//! For a square-planar composition the calibrated planar factor of the estimator is kept (Δ
//! is divided by the shape ratio only), and every centre gets the d–s mixing term of
//! [`LigandField::angular_overlap_with_ds`] (zero for octahedra and tetrahedra), so an ideal
//! centre at r₀ reproduces the named geometry's field.
//!
//! **Frame and labels.** The field is built in a frame taken from the polyhedron: the three
//! trans axes of a six-coordinate centre, the three axes through opposite edge midpoints of a
//! tetrahedron, the donor axes and the normal of a square plane. Labels use the largest group
//! the engine supports (O_h, T_d, D_4h) whose form the field has to within
//! [`SYMMETRY_TOLERANCE`] of its largest splitting; the field is then averaged to that form
//! (and `symmetrised` says so). Otherwise C1.

use super::centre::Centre;
use super::shape::IdealShape;
use crate::complex::ResolvedComplex;
use crate::engine::field::DS_MIXING;
use crate::engine::{LigandField, PointGroup};
use crate::error::{Error, Result};
use crate::estimate::{back_bonding_steps, ligand_terms, REFERENCE_BOND_LENGTH};
use crate::param::Param;
use nalgebra::{Matrix3, Matrix5, SymmetricEigen, Vector3};

/// Largest deviation of a field matrix element from a group's form, as a fraction of the
/// field's largest orbital splitting, for the group's labels to be used (a model choice: 2 %
/// is below the spread of the AOM parameters themselves).
pub const SYMMETRY_TOLERANCE: f64 = 0.02;

/// One donor's angular-overlap parameters at its distance.
#[derive(Debug, Clone, PartialEq)]
pub struct DonorParameters {
    pub donor: String,
    pub element: String,
    /// The ligand the donor was assigned to.
    pub ligand: String,
    /// Å.
    pub distance: f64,
    /// Unit vector from the metal in the field's frame.
    pub direction: Vector3<f64>,
    /// cm⁻¹.
    pub e_sigma: f64,
    /// cm⁻¹.
    pub e_pi: f64,
}

/// The field of one centre.
#[derive(Debug, Clone)]
pub struct GeometryField {
    pub donors: Vec<DonorParameters>,
    /// Barycentred one-electron matrix in the frame (cm⁻¹).
    pub field: LigandField,
    /// The group whose labels are used.
    pub group: PointGroup,
    /// Largest deviation (cm⁻¹) of the field from the form of the nearest supported group
    /// tried (O_h/T_d or D_4h), and that group; None when no frame was found.
    pub nearest: Option<(PointGroup, f64)>,
    /// True when the field was averaged to the form of `group` (deviation within tolerance).
    pub symmetrised: bool,
    /// The d-orbital energies (cm⁻¹, barycentred) of the unaveraged field, ascending.
    pub orbital_energies: [f64; 5],
}

/// Assigns each donor atom of the centre to a ligand of the composition: first by `sites`
/// (label = ligand name; a label covers all its symmetry images), then by element, in the
/// order the ligands were given. Errors when the counts or elements do not match, or when a
/// donor element could belong to two ligands with different field factors and `sites` does
/// not say which.
pub fn assign_donors(
    centre: &Centre,
    complex: &ResolvedComplex,
    sites: &[(String, String)],
) -> Result<Vec<String>> {
    let mut slots: Vec<(String, String)> = Vec::new();
    for b in &complex.ligands {
        for _ in 0..b.count {
            for d in &b.ligand.donors {
                slots.push((b.ligand.name.clone(), d.clone()));
            }
        }
    }
    if slots.len() != centre.bonds.len() {
        return Err(Error::invalid(
            Param::Ligands,
            format!("{} donor atoms", slots.len()),
            format!(
                "as many donor atoms as the structure's {} has bonds ({})",
                centre.label,
                centre.bonds.len()
            ),
        ));
    }
    let base = |donor: &str| donor.split(" [").next().unwrap_or(donor).to_string();
    let mut out: Vec<Option<String>> = vec![None; centre.bonds.len()];
    for (i, b) in centre.bonds.iter().enumerate() {
        if let Some((_, lig)) = sites
            .iter()
            .find(|(l, _)| l.eq_ignore_ascii_case(&base(&b.donor)))
        {
            let k = slots
                .iter()
                .position(|(n, e)| n.eq_ignore_ascii_case(lig) && *e == b.element)
                .ok_or_else(|| {
                    Error::invalid(
                        Param::Site,
                        format!("{}={lig}", base(&b.donor)),
                        format!(
                            "a ligand of the composition with a free {} donor",
                            b.element
                        ),
                    )
                })?;
            out[i] = Some(slots.remove(k).0);
        }
    }
    for (i, b) in centre.bonds.iter().enumerate() {
        if out[i].is_some() {
            continue;
        }
        let candidates: Vec<&str> = slots
            .iter()
            .filter(|(_, e)| *e == b.element)
            .map(|(n, _)| n.as_str())
            .collect();
        let Some(first) = candidates.first().map(|s| s.to_string()) else {
            return Err(Error::invalid(
                Param::Ligands,
                complex.formula(),
                format!(
                    "donor atoms that match the structure: {} ({}) has no free {} donor in the composition",
                    b.donor, b.element, b.element
                ),
            ));
        };
        if candidates.iter().any(|c| *c != first) {
            return Err(Error::invalid(
                Param::DonorAssignment,
                format!("{} ({})", b.donor, b.element),
                format!(
                    "one ligand per donor: it could belong to {}; say which with a site LABEL=LIGAND",
                    {
                        let mut c: Vec<&str> = candidates.clone();
                        c.dedup();
                        c.join(" or ")
                    }
                ),
            ));
        }
        let k = slots
            .iter()
            .position(|(n, e)| *n == first && *e == b.element)
            .expect("candidate exists");
        out[i] = Some(slots.remove(k).0);
    }
    Ok(out
        .into_iter()
        .map(|x| x.expect("every donor assigned"))
        .collect())
}

/// A right-handed orthonormal frame (rows are the new x, y, z) from three roughly orthogonal
/// axes.
fn frame(a: Vector3<f64>, b: Vector3<f64>) -> Option<Matrix3<f64>> {
    let x = a.try_normalize(1e-9)?;
    let y = (b - x * x.dot(&b)).try_normalize(1e-9)?;
    let z = x.cross(&y);
    Some(Matrix3::from_rows(&[
        x.transpose(),
        y.transpose(),
        z.transpose(),
    ]))
}

fn polyhedron_frame(centre: &Centre) -> Option<Matrix3<f64>> {
    let v: Vec<Vector3<f64>> = centre
        .donor_positions
        .iter()
        .map(|p| p - centre.position)
        .collect();
    match (centre.best_shape?, v.len()) {
        (IdealShape::Octahedron, 6) => {
            let t = centre.distortion?.trans;
            let axis = |(a, b): (usize, usize)| v[a].normalize() - v[b].normalize();
            frame(axis(t[0]), axis(t[1]))
        }
        (IdealShape::Tetrahedron, 4) => {
            let mid = |a: usize, b: usize, c: usize, d: usize| {
                (v[a].normalize() + v[b].normalize()) - (v[c].normalize() + v[d].normalize())
            };
            frame(mid(0, 1, 2, 3), mid(0, 2, 1, 3))
        }
        (IdealShape::SquarePlane, 4) => {
            // x along the first donor, y along the cis donor nearest 90° to it.
            let x = v[0];
            let cis = (1..4)
                .min_by(|&a, &b| {
                    x.normalize()
                        .dot(&v[a].normalize())
                        .abs()
                        .total_cmp(&x.normalize().dot(&v[b].normalize()).abs())
                })
                .unwrap_or(1);
            frame(x, v[cis])
        }
        _ => None,
    }
}

/// Largest off-diagonal element of a field matrix over the real orbitals.
fn off_diagonal(m: &Matrix5<f64>) -> f64 {
    let mut dev: f64 = 0.0;
    for a in 0..5 {
        for b in 0..5 {
            if a != b {
                dev = dev.max(m[(a, b)].abs());
            }
        }
    }
    dev
}

fn cubic_deviation(m: &Matrix5<f64>) -> f64 {
    off_diagonal(m)
        .max((m[(0, 0)] - m[(3, 3)]).abs())
        .max((m[(1, 1)] - m[(2, 2)]).abs())
        .max((m[(1, 1)] - m[(4, 4)]).abs())
}

fn tetragonal_deviation(m: &Matrix5<f64>) -> f64 {
    off_diagonal(m).max((m[(1, 1)] - m[(2, 2)]).abs())
}

/// The AOM field of a centre with the donors assigned to the composition's ligands.
pub fn geometry_field(
    centre: &Centre,
    complex: &ResolvedComplex,
    sites: &[(String, String)],
) -> Result<GeometryField> {
    let assigned = assign_donors(centre, complex, sites)?;
    let cal = &complex.calibration;
    let steps = back_bonding_steps(complex.ion.oxidation_state);
    let f_eff = |name: &str| {
        complex
            .ligands
            .iter()
            .find(|b| b.ligand.name == name)
            .map(|b| {
                let (f, pi) = ligand_terms(&b.ligand);
                (f + cal.back_bonding * steps * pi, &b.ligand)
            })
    };
    let mean_f = assigned
        .iter()
        .map(|n| f_eff(n).map_or(0.0, |x| x.0))
        .sum::<f64>()
        / assigned.len() as f64;
    if mean_f <= 0.0 {
        return Err(Error::Computation(
            "the donors' mean ligand factor is not positive".into(),
        ));
    }
    let delta_oct = complex.delta_low_spin.value / complex.geometry.delta_ratio_to_octahedral();
    let frame_matrix = polyhedron_frame(centre);
    let rot = frame_matrix.unwrap_or_else(Matrix3::identity);
    let mut donors = Vec::new();
    for ((b, pos), name) in centre
        .bonds
        .iter()
        .zip(&centre.donor_positions)
        .zip(&assigned)
    {
        let (f, lig) = f_eff(name).expect("assigned to a bound ligand");
        let delta_i = delta_oct * f / mean_f;
        let eps = match (lig.e_sigma, lig.e_pi) {
            (Some(s), Some(p)) if s > 0.0 => p / s,
            _ => 0.0,
        };
        let scale = (REFERENCE_BOND_LENGTH / b.distance).powf(cal.distance_exponent);
        let e_sigma = delta_i / (3.0 - 4.0 * eps) * scale;
        donors.push(DonorParameters {
            donor: b.donor.clone(),
            element: b.element.clone(),
            ligand: name.clone(),
            distance: b.distance,
            direction: rot * (pos - centre.position).normalize(),
            e_sigma,
            e_pi: eps * e_sigma,
        });
    }
    let spec: Vec<(Vector3<f64>, f64, f64)> = donors
        .iter()
        .map(|d| (d.direction, d.e_sigma, d.e_pi))
        .collect();
    let mut field = LigandField::angular_overlap_with_ds(&spec, DS_MIXING).barycentred();
    let orbital_energies = sorted_eigenvalues(&field.matrix)?;
    let tolerance = SYMMETRY_TOLERANCE * (orbital_energies[4] - orbital_energies[0]);
    let mut group = PointGroup::C1;
    let mut nearest = None;
    if frame_matrix.is_some() {
        let cubic = cubic_deviation(&field.matrix);
        let cubic_group = if donors.len() == 4 {
            PointGroup::Td
        } else {
            PointGroup::Oh
        };
        let four = donors.len() == 4;
        let tetrahedral = centre.best_shape == Some(IdealShape::Tetrahedron);
        if cubic <= tolerance && (!four || tetrahedral) {
            group = cubic_group;
            nearest = Some((cubic_group, cubic));
        } else if !four || centre.best_shape == Some(IdealShape::SquarePlane) {
            // Try each frame axis as the fourfold axis (cyclic permutations keep the frame
            // right-handed).
            let mut best: Option<(f64, Matrix3<f64>)> = None;
            for k in 0..3 {
                let perm = Matrix3::from_fn(|i, j| if (i + k) % 3 == j { 1.0 } else { 0.0 });
                let spec_k: Vec<(Vector3<f64>, f64, f64)> =
                    spec.iter().map(|(d, s, p)| (perm * d, *s, *p)).collect();
                let f_k = LigandField::angular_overlap_with_ds(&spec_k, DS_MIXING).barycentred();
                let dev = tetragonal_deviation(&f_k.matrix);
                if best.as_ref().is_none_or(|b| dev < b.0) {
                    best = Some((dev, perm));
                }
            }
            if let Some((dev, perm)) = best {
                nearest = Some((PointGroup::D4h, dev));
                if dev <= tolerance {
                    group = PointGroup::D4h;
                    for d in &mut donors {
                        d.direction = perm * d.direction;
                    }
                    let spec_k: Vec<(Vector3<f64>, f64, f64)> = donors
                        .iter()
                        .map(|d| (d.direction, d.e_sigma, d.e_pi))
                        .collect();
                    field = LigandField::angular_overlap_with_ds(&spec_k, DS_MIXING).barycentred();
                }
            }
        } else {
            nearest = Some((cubic_group, cubic));
        }
    }
    let symmetrised = group != PointGroup::C1;
    let field = match group {
        PointGroup::Oh | PointGroup::Td => {
            let m = &field.matrix;
            let eg = (m[(0, 0)] + m[(3, 3)]) / 2.0;
            let t2 = (m[(1, 1)] + m[(2, 2)] + m[(4, 4)]) / 3.0;
            LigandField::from_diagonal([eg, t2, t2, eg, t2]).barycentred()
        }
        PointGroup::D4h => {
            let m = &field.matrix;
            let e = (m[(1, 1)] + m[(2, 2)]) / 2.0;
            LigandField::from_diagonal([m[(0, 0)], e, e, m[(3, 3)], m[(4, 4)]]).barycentred()
        }
        PointGroup::C1 => field,
    };
    Ok(GeometryField {
        donors,
        field,
        group,
        nearest,
        symmetrised,
        orbital_energies,
    })
}

/// Eigenvalues of a real symmetric 5×5 matrix, ascending (explicit tolerance and cap).
fn sorted_eigenvalues(m: &Matrix5<f64>) -> Result<[f64; 5]> {
    let eig = SymmetricEigen::try_new(*m, 1e-14, 10_000)
        .ok_or_else(|| Error::Computation("the field's eigenvalues did not converge".into()))?;
    let mut e: Vec<f64> = eig.eigenvalues.iter().copied().collect();
    if e.iter().any(|x| !x.is_finite()) {
        return Err(Error::Computation(
            "the field has non-finite eigenvalues".into(),
        ));
    }
    e.sort_by(f64::total_cmp);
    Ok([e[0], e[1], e[2], e[3], e[4]])
}
