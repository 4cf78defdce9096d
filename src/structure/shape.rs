//! Continuous shape measures (H. Zabrodsky, S. Peleg, D. Avnir, *J. Am. Chem. Soc.* 1992,
//! 114, 7843; M. Pinsky, D. Avnir, *Inorg. Chem.* 1998, 37, 5575; S. Alvarez et al., *Coord.
//! Chem. Rev.* 2005, 249, 1693):
//!
//! S(Q, P) = 100 · min Σᵢ |qᵢ − pᵢ|² / Σᵢ |qᵢ − q₀|²
//!
//! over every rotation, scaling and translation of the ideal polyhedron P and every assignment
//! of its vertices to the real points Q (q₀ is the centroid of Q). S = 0 for the ideal shape,
//! 100 is the largest possible value. As in the published definition the central atom is one
//! of the points: it is matched to the centre of the ideal polyhedron, whose vertices all lie
//! at the same distance from it.
//!
//! For fixed assignment the minimum over scale and rotation is closed form: with both point
//! sets centred, S = 100·(1 − D²/(|Q|²|P|²)), D = max_R Σ qᵢ·R pᵢ = σ₁ + σ₂ ± σ₃ from the
//! singular values of M = Σ pᵢ qᵢᵀ (the sign that of det M, proper rotations only;
//! W. Kabsch, *Acta Cryst. A* 1976, 32, 922). The vertex assignment is searched exhaustively
//! (at most 6! = 720 for six donors).

use nalgebra::{Matrix3, Vector3};

/// The ideal polyhedra measured.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum IdealShape {
    Octahedron,
    TrigonalPrism,
    Tetrahedron,
    SquarePlane,
    SquarePyramid,
    TrigonalBipyramid,
}

impl IdealShape {
    pub const ALL: [IdealShape; 6] = [
        IdealShape::Octahedron,
        IdealShape::TrigonalPrism,
        IdealShape::Tetrahedron,
        IdealShape::SquarePlane,
        IdealShape::SquarePyramid,
        IdealShape::TrigonalBipyramid,
    ];

    /// Name used in reports and JSON.
    pub fn name(self) -> &'static str {
        match self {
            IdealShape::Octahedron => "octahedron",
            IdealShape::TrigonalPrism => "trigonal-prism",
            IdealShape::Tetrahedron => "tetrahedron",
            IdealShape::SquarePlane => "square-plane",
            IdealShape::SquarePyramid => "square-pyramid",
            IdealShape::TrigonalBipyramid => "trigonal-bipyramid",
        }
    }

    /// Number of vertices (donor atoms).
    pub fn vertex_count(self) -> usize {
        self.vertices().len()
    }

    /// Vertices at unit distance from the centre (the origin).
    /// - octahedron: ±x, ±y, ±z;
    /// - trigonal prism: two equilateral triangles, eclipsed, all nine edges equal
    ///   (triangle circumradius 2/√7, half-height √(3/7));
    /// - tetrahedron: alternate cube corners;
    /// - square plane: ±x, ±y;
    /// - square pyramid: +z and ±x, ±y (an octahedron less one vertex; the centre lies in the
    ///   base);
    /// - trigonal bipyramid: ±z and three equatorial vertices 120° apart.
    pub fn vertices(self) -> Vec<Vector3<f64>> {
        let s3 = 3f64.sqrt();
        match self {
            IdealShape::Octahedron => vec![
                Vector3::x(),
                -Vector3::x(),
                Vector3::y(),
                -Vector3::y(),
                Vector3::z(),
                -Vector3::z(),
            ],
            IdealShape::TrigonalPrism => {
                let rho = 2.0 / 7f64.sqrt();
                let h = (3.0 / 7.0f64).sqrt();
                let mut v = Vec::new();
                for z in [h, -h] {
                    for k in 0..3 {
                        let phi = (120.0 * k as f64).to_radians();
                        v.push(Vector3::new(rho * phi.cos(), rho * phi.sin(), z));
                    }
                }
                v
            }
            IdealShape::Tetrahedron => {
                [(1., 1., 1.), (1., -1., -1.), (-1., 1., -1.), (-1., -1., 1.)]
                    .iter()
                    .map(|&(x, y, z)| Vector3::new(x, y, z) / s3)
                    .collect()
            }
            IdealShape::SquarePlane => {
                vec![Vector3::x(), -Vector3::x(), Vector3::y(), -Vector3::y()]
            }
            IdealShape::SquarePyramid => vec![
                Vector3::z(),
                Vector3::x(),
                -Vector3::x(),
                Vector3::y(),
                -Vector3::y(),
            ],
            IdealShape::TrigonalBipyramid => vec![
                Vector3::z(),
                -Vector3::z(),
                Vector3::x(),
                Vector3::new(-0.5, s3 / 2.0, 0.0),
                Vector3::new(-0.5, -s3 / 2.0, 0.0),
            ],
        }
    }

    /// The shapes with `n` vertices.
    pub fn with_vertices(n: usize) -> Vec<IdealShape> {
        IdealShape::ALL
            .into_iter()
            .filter(|s| s.vertex_count() == n)
            .collect()
    }
}

/// The best rotation-and-scale overlap D of two centred point sets already paired.
fn overlap(m: &Matrix3<f64>) -> f64 {
    let svd = m.svd(false, false);
    let mut s: Vec<f64> = svd.singular_values.iter().copied().collect();
    s.sort_by(|a, b| b.total_cmp(a));
    let sign = if m.determinant() < 0.0 { -1.0 } else { 1.0 };
    s[0] + s[1] + sign * s[2]
}

/// The continuous shape measure (0–100) of a centre and its donors against an ideal shape;
/// None when the number of donors is not the shape's vertex count.
pub fn shape_measure(
    centre: &Vector3<f64>,
    donors: &[Vector3<f64>],
    shape: IdealShape,
) -> Option<f64> {
    let ideal = shape.vertices();
    if donors.len() != ideal.len() || donors.is_empty() {
        return None;
    }
    let n = donors.len() + 1;
    // Real points: the centre first, then the donors; centred on their centroid.
    let mut q: Vec<Vector3<f64>> = std::iter::once(*centre)
        .chain(donors.iter().copied())
        .collect();
    let q0 = q.iter().sum::<Vector3<f64>>() / n as f64;
    q.iter_mut().for_each(|x| *x -= q0);
    let mut p: Vec<Vector3<f64>> = std::iter::once(Vector3::zeros()).chain(ideal).collect();
    let p0 = p.iter().sum::<Vector3<f64>>() / n as f64;
    p.iter_mut().for_each(|x| *x -= p0);
    let qq: f64 = q.iter().map(|x| x.norm_squared()).sum();
    let pp: f64 = p.iter().map(|x| x.norm_squared()).sum();
    if qq <= 0.0 {
        return None;
    }
    let fixed = p[0] * q[0].transpose();
    // Heap's algorithm over the donor assignments.
    let k = donors.len();
    let mut perm: Vec<usize> = (0..k).collect();
    let mut c = vec![0usize; k];
    let eval = |perm: &[usize]| {
        let mut m = fixed;
        for (i, &j) in perm.iter().enumerate() {
            m += p[1 + j] * q[1 + i].transpose();
        }
        overlap(&m)
    };
    let mut best = eval(&perm);
    let mut i = 0;
    while i < k {
        if c[i] < i {
            if i % 2 == 0 {
                perm.swap(0, i);
            } else {
                perm.swap(c[i], i);
            }
            best = best.max(eval(&perm));
            c[i] += 1;
            i = 0;
        } else {
            c[i] = 0;
            i += 1;
        }
    }
    Some((100.0 * (1.0 - best * best / (qq * pp))).max(0.0))
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;
    use nalgebra::Rotation3;

    /// By definition S = 0 for the ideal shape in any orientation, size and position (Pinsky &
    /// Avnir 1998), and S > 0 against every other shape with the same vertex count.
    #[test]
    fn ideal_shapes_measure_zero() {
        let rot = Rotation3::from_euler_angles(0.3, -1.1, 2.0);
        let centre = Vector3::new(1.0, -2.0, 0.5);
        for shape in IdealShape::ALL {
            let donors: Vec<Vector3<f64>> = shape
                .vertices()
                .iter()
                .rev()
                .map(|v| centre + rot * (2.1 * v))
                .collect();
            let s = shape_measure(&centre, &donors, shape).unwrap();
            assert_abs_diff_eq!(s, 0.0, epsilon = 1e-9);
            for other in IdealShape::with_vertices(donors.len()) {
                if other != shape {
                    assert!(shape_measure(&centre, &donors, other).unwrap() > 1.0);
                }
            }
        }
        assert!(shape_measure(&centre, &[Vector3::x()], IdealShape::Octahedron).is_none());
    }

    /// The measure is symmetric in this sense: an octahedron against the trigonal prism and the
    /// prism against the octahedron are both clearly non-zero, and the measure grows
    /// quadratically for small displacements (Zabrodsky, Peleg & Avnir 1992: S ∝ Σ|δ|²).
    #[test]
    fn small_distortions_grow_quadratically() {
        let c = Vector3::zeros();
        let distorted = |e: f64| {
            let mut v = IdealShape::Octahedron.vertices();
            v[4] += Vector3::new(e, 0.0, 0.0);
            v
        };
        let s1 = shape_measure(&c, &distorted(0.01), IdealShape::Octahedron).unwrap();
        let s2 = shape_measure(&c, &distorted(0.02), IdealShape::Octahedron).unwrap();
        assert!(s1 > 0.0);
        assert_abs_diff_eq!(s2 / s1, 4.0, epsilon = 0.05);
    }
}
