//! The one-electron ligand field: a real symmetric 5×5 matrix over the real d orbitals, built from
//! Dq (with Ds, Dt), or from angular-overlap parameters, or given directly.
//!
//! Real d orbitals are ordered [`REAL_ORBITALS`]: z², xz, yz, x²−y², xy. Energies are in cm⁻¹.

use nalgebra::{Complex, Matrix3, Matrix5, Vector3};

/// Names of the real d orbitals in the order used by every 5×5 matrix here.
pub const REAL_ORBITALS: [&str; 5] = ["z2", "xz", "yz", "x2-y2", "xy"];

/// Index of each real orbital in [`REAL_ORBITALS`].
pub const Z2: usize = 0;
pub const XZ: usize = 1;
pub const YZ: usize = 2;
pub const X2Y2: usize = 3;
pub const XY: usize = 4;

/// Traceless quadratic form r·Q·r of a real d orbital, normalised to unit Frobenius norm (the
/// Frobenius inner product of two traceless forms is proportional to the overlap of the
/// corresponding functions on the sphere).
pub fn real_orbital_form(a: usize) -> Matrix3<f64> {
    let h = std::f64::consts::FRAC_1_SQRT_2;
    match a {
        Z2 => Matrix3::new(-1.0, 0.0, 0.0, 0.0, -1.0, 0.0, 0.0, 0.0, 2.0) / 6f64.sqrt(),
        XZ => Matrix3::new(0.0, 0.0, h, 0.0, 0.0, 0.0, h, 0.0, 0.0),
        YZ => Matrix3::new(0.0, 0.0, 0.0, 0.0, 0.0, h, 0.0, h, 0.0),
        X2Y2 => Matrix3::new(h, 0.0, 0.0, 0.0, -h, 0.0, 0.0, 0.0, 0.0),
        XY => Matrix3::new(0.0, h, 0.0, h, 0.0, 0.0, 0.0, 0.0, 0.0),
        _ => panic!("real d orbital index {a} outside 0..5"),
    }
}

/// Quadratic form of the complex harmonic Y_{2m} (Condon–Shortley phases), unit Frobenius norm:
/// Y₂₂ ∝ (x+iy)², Y₂₁ ∝ −(x+iy)z, Y₂₀ ∝ 2z²−x²−y², Y₂,₋₁ ∝ (x−iy)z, Y₂,₋₂ ∝ (x−iy)².
pub fn complex_orbital_form(m: i32) -> Matrix3<Complex<f64>> {
    let c = |re: f64, im: f64| Complex::new(re, im);
    let z = c(0.0, 0.0);
    match m {
        2 => Matrix3::new(
            c(0.5, 0.0),
            c(0.0, 0.5),
            z,
            c(0.0, 0.5),
            c(-0.5, 0.0),
            z,
            z,
            z,
            z,
        ),
        1 => Matrix3::new(
            z,
            z,
            c(-0.5, 0.0),
            z,
            z,
            c(0.0, -0.5),
            c(-0.5, 0.0),
            c(0.0, -0.5),
            z,
        ),
        0 => {
            let s = 1.0 / 6f64.sqrt();
            Matrix3::new(c(-s, 0.0), z, z, z, c(-s, 0.0), z, z, z, c(2.0 * s, 0.0))
        }
        -1 => Matrix3::new(
            z,
            z,
            c(0.5, 0.0),
            z,
            z,
            c(0.0, -0.5),
            c(0.5, 0.0),
            c(0.0, -0.5),
            z,
        ),
        -2 => Matrix3::new(
            c(0.5, 0.0),
            c(0.0, -0.5),
            z,
            c(0.0, -0.5),
            c(-0.5, 0.0),
            z,
            z,
            z,
            z,
        ),
        _ => panic!("m = {m} outside -2..=2"),
    }
}

fn frobenius(a: &Matrix3<Complex<f64>>, b: &Matrix3<Complex<f64>>) -> Complex<f64> {
    a.iter().zip(b.iter()).map(|(x, y)| x.conj() * y).sum()
}

/// Overlap ⟨Y_{2m}|real orbital a⟩, rows m = −2..=2, columns in [`REAL_ORBITALS`] order.
pub fn complex_from_real() -> nalgebra::SMatrix<Complex<f64>, 5, 5> {
    static T: std::sync::OnceLock<nalgebra::SMatrix<Complex<f64>, 5, 5>> =
        std::sync::OnceLock::new();
    *T.get_or_init(build_complex_from_real)
}

fn build_complex_from_real() -> nalgebra::SMatrix<Complex<f64>, 5, 5> {
    let mut t = nalgebra::SMatrix::<Complex<f64>, 5, 5>::zeros();
    for m in -2..=2 {
        let qm = complex_orbital_form(m);
        for a in 0..5 {
            let qa = real_orbital_form(a).map(|x| Complex::new(x, 0.0));
            t[((m + 2) as usize, a)] = frobenius(&qm, &qa);
        }
    }
    t
}

/// Coefficients of each real d orbital (in [`REAL_ORBITALS`] order) on the σ (local z²) and
/// the two π (local xz, yz) orbitals of a ligand along `dir`: the angular-overlap factors
/// F_σ, F_πx, F_πy.
fn angular_factors(dir: &Vector3<f64>) -> ([f64; 5], [f64; 5], [f64; 5]) {
    let n = dir.normalize();
    // Two unit vectors perpendicular to n form the local x', y' axes.
    let trial = if n.x.abs() < 0.9 {
        Vector3::x()
    } else {
        Vector3::y()
    };
    let u = (trial - n * n.dot(&trial)).normalize();
    let w = n.cross(&u);
    let r = Matrix3::from_rows(&[u.transpose(), w.transpose(), n.transpose()]);
    let mut fs = [0.0; 5];
    let mut fx = [0.0; 5];
    let mut fy = [0.0; 5];
    for a in 0..5 {
        let local = r * real_orbital_form(a) * r.transpose();
        let dot = |b: usize| real_orbital_form(b).component_mul(&local).sum();
        fs[a] = dot(Z2);
        fx[a] = dot(XZ);
        fy[a] = dot(YZ);
    }
    (fs, fx, fy)
}

/// The one-electron ligand-field matrix over the five real d orbitals (cm⁻¹).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LigandField {
    pub matrix: Matrix5<f64>,
}

/// e_ds/e_σ of [`LigandField::square_planar`]: 1, the limit in which d–s mixing brings z² down
/// to the level of xz, yz and xy. It reproduces the known ground states of planar complexes,
/// S = 2 for d⁴ (Cr(II)), 1 for d⁶ (Fe(II) porphyrins), ½ for d⁷ (Co(II)) and 0 for d⁸, which
/// the σ-only field gets wrong for d⁴ and d⁶ (F. A. Cotton, G. Wilkinson et al., Advanced
/// Inorganic Chemistry, 6th ed., 1999; from memory). A modelling choice, not a fitted value.
pub const DS_MIXING: f64 = 1.0;

impl LigandField {
    /// No field (free ion).
    pub fn zero() -> Self {
        LigandField {
            matrix: Matrix5::zeros(),
        }
    }

    /// Octahedral field: e_g (z², x²−y²) at +6Dq, t₂g at −4Dq, so Δo = 10Dq.
    pub fn octahedral(dq: f64) -> Self {
        Self::from_diagonal([6.0 * dq, -4.0 * dq, -4.0 * dq, 6.0 * dq, -4.0 * dq])
    }

    /// Tetrahedral field. Convention: `dq` is positive and Δt = 10Dq is the splitting of the
    /// tetrahedral complex itself; e lies at −6Dq and t₂ at +4Dq, i.e. the octahedral matrix with
    /// the sign of Dq reversed.
    pub fn tetrahedral(dq: f64) -> Self {
        Self::octahedral(-dq)
    }

    /// Tetragonally distorted octahedron (D4h, z the unique axis), in the usual Ds, Dt
    /// parametrisation (C. J. Ballhausen, *Introduction to Ligand Field Theory*, 1962):
    /// x²−y² = 6Dq + 2Ds − Dt, z² = 6Dq − 2Ds − 6Dt, xy = −4Dq + 2Ds − Dt,
    /// xz, yz = −4Dq − Ds + 4Dt. Positive Ds and Dt correspond to an elongation along z.
    pub fn tetragonal(dq: f64, ds: f64, dt: f64) -> Self {
        Self::from_diagonal([
            6.0 * dq - 2.0 * ds - 6.0 * dt,
            -4.0 * dq - ds + 4.0 * dt,
            -4.0 * dq - ds + 4.0 * dt,
            6.0 * dq + 2.0 * ds - dt,
            -4.0 * dq + 2.0 * ds - dt,
        ])
    }

    /// Square planar field of four σ-donors on ±x, ±y, from the angular overlap model with
    /// e_π = 0 (Larsen & La Mar, *J. Chem. Educ.* 1974): x²−y² = 3e_σ, z² = e_σ − e_ds, xz, yz,
    /// xy = 0, shifted to zero mean, with the d–s mixing e_ds = [`DS_MIXING`]·e_σ that lowers z²
    /// in planar complexes (D. W. Smith, *Inorg. Chim. Acta* 1977, 22, 107; from memory). `dq`
    /// is the octahedral Dq of the same ligands (10Dq = 3e_σ), so x²−y² lies 10Dq above the xy,
    /// xz, yz set.
    pub fn square_planar(dq: f64) -> Self {
        let e_sigma = 10.0 * dq / 3.0;
        let raw = [(1.0 - DS_MIXING) * e_sigma, 0.0, 0.0, 3.0 * e_sigma, 0.0];
        let mean = raw.iter().sum::<f64>() / 5.0;
        Self::from_diagonal(raw.map(|x| x - mean))
    }

    /// Diagonal field from the five real-orbital energies (in [`REAL_ORBITALS`] order).
    pub fn from_diagonal(e: [f64; 5]) -> Self {
        LigandField {
            matrix: Matrix5::from_diagonal(&nalgebra::Vector5::from(e)),
        }
    }

    /// Angular overlap model: Σ over ligands of e_σ F_σ² + e_π (F_πx² + F_πy²) contributions
    /// (C. E. Schäffer, C. K. Jørgensen, *Mol. Phys.* 9, 401, 1965). Each ligand is a direction
    /// (any length) with its e_σ and e_π in cm⁻¹. The result is not barycentred.
    pub fn angular_overlap(ligands: &[(Vector3<f64>, f64, f64)]) -> Self {
        let mut v = Matrix5::zeros();
        for (dir, e_sigma, e_pi) in ligands {
            let (fs, fx, fy) = angular_factors(dir);
            for a in 0..5 {
                for b in 0..5 {
                    v[(a, b)] += e_sigma * fs[a] * fs[b] + e_pi * (fx[a] * fx[b] + fy[a] * fy[b]);
                }
            }
        }
        LigandField { matrix: v }
    }

    /// [`LigandField::angular_overlap`] plus d–s mixing: the metal s orbital, reached through
    /// the ligands' σ orbitals, lowers the d combination Σ_L √e_ds,L F_σ(L) by its squared
    /// norm, V_ab −= (Σ_L √e_ds,L F_σ,a(L))(Σ_L √e_ds,L F_σ,b(L)), with e_ds,L =
    /// `mixing`·e_σ,L/4 (the second-order d–s term of D. W. Smith, *Inorg. Chim. Acta* 1977,
    /// 22, 107; from memory). It vanishes for the octahedron and the tetrahedron (no d orbital
    /// transforms as the s orbital there) and lowers z² of the ideal square plane by
    /// `mixing`·e_σ, so the planar set reproduces [`LigandField::square_planar`]. Not
    /// barycentred.
    pub fn angular_overlap_with_ds(ligands: &[(Vector3<f64>, f64, f64)], mixing: f64) -> Self {
        let mut field = Self::angular_overlap(ligands);
        let mut s = [0.0; 5];
        for (dir, e_sigma, _) in ligands {
            let (fs, _, _) = angular_factors(dir);
            let w = (mixing * e_sigma.max(0.0) / 4.0).sqrt();
            for a in 0..5 {
                s[a] += w * fs[a];
            }
        }
        for a in 0..5 {
            for b in 0..5 {
                field.matrix[(a, b)] -= s[a] * s[b];
            }
        }
        field
    }

    /// The same field with its mean orbital energy removed (barycentred).
    pub fn barycentred(&self) -> Self {
        let mean = self.matrix.trace() / 5.0;
        LigandField {
            matrix: self.matrix - Matrix5::identity() * mean,
        }
    }

    /// The field multiplied by a factor.
    pub fn scaled(&self, f: f64) -> Self {
        LigandField {
            matrix: self.matrix * f,
        }
    }

    /// Largest absolute matrix element (cm⁻¹).
    pub fn magnitude(&self) -> f64 {
        self.matrix.amax()
    }

    /// The matrix over the complex orbitals m = −2..=2 (row and column index m + 2).
    pub fn complex_matrix(&self) -> nalgebra::SMatrix<Complex<f64>, 5, 5> {
        let t = complex_from_real();
        let v = self.matrix.map(|x| Complex::new(x, 0.0));
        t * v * t.adjoint()
    }

    /// True when the field only couples m to m and m ± 4, i.e. it has a fourfold axis along z
    /// and M_L mod 4 is conserved.
    pub fn has_fourfold_z_axis(&self) -> bool {
        let v = self.complex_matrix();
        let scale = v.iter().map(|z| z.norm()).fold(1e-300, f64::max);
        for i in 0..5 {
            for j in 0..5 {
                let dm = (i as i32 - j as i32).rem_euclid(4);
                if dm != 0 && v[(i, j)].norm() > 1e-12 * scale {
                    return false;
                }
            }
        }
        true
    }

    /// True when the field has the full symmetry of `group` in the engine's axes (to 10⁻¹²
    /// of its largest element): diagonal over the real d orbitals with e (z², x²−y²) and t₂
    /// (xz, yz, xy) each degenerate for O_h and T_d, or with xz and yz degenerate for D_4h
    /// (z the fourfold axis). Always true for C1.
    pub fn is_invariant_under(&self, group: super::symmetry::PointGroup) -> bool {
        use super::symmetry::PointGroup;
        let m = &self.matrix;
        let tol = 1e-12 * m.amax();
        let diagonal = (0..5).all(|i| (0..5).all(|j| i == j || m[(i, j)].abs() <= tol));
        let same = |a: usize, b: usize| (m[(a, a)] - m[(b, b)]).abs() <= tol;
        // Real orbitals in the order z², xz, yz, x²−y², xy.
        match group {
            PointGroup::Oh | PointGroup::Td => diagonal && same(0, 3) && same(1, 2) && same(1, 4),
            PointGroup::D4h => diagonal && same(1, 2),
            PointGroup::C1 => true,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn transformation_is_unitary() {
        let t = complex_from_real();
        let id = t * t.adjoint();
        for i in 0..5 {
            for j in 0..5 {
                let e = if i == j { 1.0 } else { 0.0 };
                assert_abs_diff_eq!(id[(i, j)].re, e, epsilon = 1e-12);
                assert_abs_diff_eq!(id[(i, j)].im, 0.0, epsilon = 1e-12);
            }
        }
    }

    #[test]
    fn octahedral_in_complex_basis() {
        // ⟨±2|V|±2⟩ = Dq, ⟨±1|V|±1⟩ = −4Dq, ⟨0|V|0⟩ = 6Dq, ⟨2|V|−2⟩ = 5Dq: the standard cubic
        // potential in the |m⟩ basis (Figgis & Hitchman, Ligand Field Theory, 2000; from memory).
        let v = LigandField::octahedral(1.0).complex_matrix();
        assert_abs_diff_eq!(v[(4, 4)].re, 1.0, epsilon = 1e-12);
        assert_abs_diff_eq!(v[(3, 3)].re, -4.0, epsilon = 1e-12);
        assert_abs_diff_eq!(v[(2, 2)].re, 6.0, epsilon = 1e-12);
        assert_abs_diff_eq!(v[(4, 0)].re, 5.0, epsilon = 1e-12);
        assert!(LigandField::octahedral(1.0).has_fourfold_z_axis());
    }

    #[test]
    fn aom_octahedron_gives_3esigma_minus_4epi() {
        // Δo = 3e_σ − 4e_π (Schäffer & Jørgensen 1965; Larsen & La Mar 1974).
        let dirs = [
            Vector3::x(),
            -Vector3::x(),
            Vector3::y(),
            -Vector3::y(),
            Vector3::z(),
            -Vector3::z(),
        ];
        let ligs: Vec<_> = dirs.iter().map(|d| (*d, 7000.0, 1000.0)).collect();
        let f = LigandField::angular_overlap(&ligs);
        assert_abs_diff_eq!(f.matrix[(X2Y2, X2Y2)], 21000.0, epsilon = 1e-8);
        assert_abs_diff_eq!(f.matrix[(Z2, Z2)], 21000.0, epsilon = 1e-8);
        assert_abs_diff_eq!(f.matrix[(XY, XY)], 4000.0, epsilon = 1e-8);
        assert_abs_diff_eq!(f.matrix[(XZ, XZ)], 4000.0, epsilon = 1e-8);
    }

    #[test]
    fn aom_tetrahedron_is_four_ninths() {
        // Δt = (4/9)(3e_σ − 4e_π) (Larsen & La Mar 1974).
        let dirs = [
            Vector3::new(1.0, 1.0, 1.0),
            Vector3::new(1.0, -1.0, -1.0),
            Vector3::new(-1.0, 1.0, -1.0),
            Vector3::new(-1.0, -1.0, 1.0),
        ];
        let ligs: Vec<_> = dirs.iter().map(|d| (*d, 6000.0, 800.0)).collect();
        let f = LigandField::angular_overlap(&ligs);
        let dt = f.matrix[(XY, XY)] - f.matrix[(Z2, Z2)];
        assert_abs_diff_eq!(dt, 4.0 / 9.0 * (18000.0 - 3200.0), epsilon = 1e-8);
    }
}
