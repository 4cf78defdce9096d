//! Octahedral distortion parameters of a six-coordinate centre:
//!
//! - Σ = Σ |90° − φᵢ| over the 12 cis L–M–L angles (J. K. McCusker, A. L. Rheingold,
//!   D. N. Hendrickson, *Inorg. Chem.* 1996, 35, 2100; P. Guionneau et al., *Top. Curr. Chem.*
//!   2004, 234, 97);
//! - Θ = Σ |60° − θⱼ| over the 24 trigonal twist angles: for each of the four pairs of opposite
//!   faces, the angles between each donor of one face and its two cis neighbours on the other
//!   face, projected on the plane normal to the line through the two face centroids
//!   (M. Marchivie, P. Guionneau, J.-F. Létard, D. Chasseau, *Acta Cryst. B* 2005, 61, 25);
//! - ζ = Σ |dᵢ − d̄| over the six bonds (McCusker et al. 1996).
//!
//! All are 0 for a regular octahedron. The three trans pairs are the pairing of the six donors
//! with the largest summed L–M–L angle.

use nalgebra::Vector3;

/// Σ, Θ (degrees) and ζ (Å) of one six-coordinate centre.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct OctahedralDistortion {
    pub sigma: f64,
    pub theta: f64,
    pub zeta: f64,
    /// Donor index pairs taken as trans.
    pub trans: [(usize, usize); 3],
}

fn angle(a: &Vector3<f64>, b: &Vector3<f64>) -> f64 {
    let c = a.dot(b) / (a.norm() * b.norm());
    c.clamp(-1.0, 1.0).acos().to_degrees()
}

/// The 15 ways to split six donors into three pairs.
fn pairings() -> Vec<[(usize, usize); 3]> {
    let mut out = Vec::new();
    for b in 1..6 {
        let rest: Vec<usize> = (1..6).filter(|&x| x != b).collect();
        for k in 1..4 {
            let (c, d) = (rest[0], rest[k]);
            let ef: Vec<usize> = rest[1..].iter().copied().filter(|&x| x != d).collect();
            out.push([(0, b), (c, d), (ef[0], ef[1])]);
        }
    }
    out
}

/// Σ, Θ and ζ of a centre with exactly six donors (positions in Å); None otherwise.
pub fn octahedral_distortion(
    centre: &Vector3<f64>,
    donors: &[Vector3<f64>],
) -> Option<OctahedralDistortion> {
    if donors.len() != 6 {
        return None;
    }
    let v: Vec<Vector3<f64>> = donors.iter().map(|d| d - centre).collect();
    if v.iter().any(|x| x.norm() == 0.0) {
        return None;
    }
    let trans = pairings()
        .into_iter()
        .map(|p| (p.iter().map(|&(a, b)| angle(&v[a], &v[b])).sum::<f64>(), p))
        .fold((f64::NEG_INFINITY, [(0, 0); 3]), |best, x| {
            if x.0 > best.0 + 1e-9 {
                x
            } else {
                best
            }
        })
        .1;
    let partner = |i: usize| {
        trans
            .iter()
            .find_map(|&(a, b)| {
                if a == i {
                    Some(b)
                } else if b == i {
                    Some(a)
                } else {
                    None
                }
            })
            .unwrap_or(i)
    };
    let mut sigma = 0.0;
    for i in 0..6 {
        for j in i + 1..6 {
            if partner(i) != j {
                sigma += (90.0 - angle(&v[i], &v[j])).abs();
            }
        }
    }
    // Faces: one donor from each trans pair; the opposite face takes the partners. The four
    // face pairs are the choices with the first pair's first donor in the face.
    let mut theta = 0.0;
    for bits in 0..4u8 {
        let face = [
            trans[0].0,
            if bits & 1 == 0 {
                trans[1].0
            } else {
                trans[1].1
            },
            if bits & 2 == 0 {
                trans[2].0
            } else {
                trans[2].1
            },
        ];
        let opposite = face.map(partner);
        let centroid = |f: &[usize; 3]| f.iter().map(|&i| v[i]).sum::<Vector3<f64>>() / 3.0;
        let axis = centroid(&face) - centroid(&opposite);
        if axis.norm() == 0.0 {
            return None;
        }
        let axis = axis.normalize();
        let project = |x: &Vector3<f64>| x - axis * axis.dot(x);
        for &i in &face {
            for &j in &opposite {
                if partner(i) != j {
                    theta += (60.0 - angle(&project(&v[i]), &project(&v[j]))).abs();
                }
            }
        }
    }
    let d: Vec<f64> = v.iter().map(|x| x.norm()).collect();
    let mean = d.iter().sum::<f64>() / 6.0;
    let zeta = d.iter().map(|x| (x - mean).abs()).sum();
    Some(OctahedralDistortion {
        sigma,
        theta,
        zeta,
        trans,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    fn octahedron(r: [f64; 6]) -> Vec<Vector3<f64>> {
        vec![
            Vector3::x() * r[0],
            -Vector3::x() * r[1],
            Vector3::y() * r[2],
            -Vector3::y() * r[3],
            Vector3::z() * r[4],
            -Vector3::z() * r[5],
        ]
    }

    /// A regular octahedron: Σ = Θ = ζ = 0 (McCusker et al. 1996; Marchivie et al. 2005).
    #[test]
    fn regular_octahedron_is_undistorted() {
        let d = octahedral_distortion(&Vector3::zeros(), &octahedron([2.0; 6])).unwrap();
        assert_abs_diff_eq!(d.sigma, 0.0, epsilon = 1e-9);
        assert_abs_diff_eq!(d.theta, 0.0, epsilon = 1e-9);
        assert_abs_diff_eq!(d.zeta, 0.0, epsilon = 1e-12);
    }

    /// ζ of an elongated octahedron (four bonds 2.0 Å, two 2.3 Å): d̄ = 2.1, ζ = 4·0.1 + 2·0.2
    /// = 0.8 Å, by the definition (McCusker et al. 1996); angles stay 90°, so Σ = 0. Θ is not
    /// 0: the faces are no longer equilateral, so their projections do not sit 60° apart.
    #[test]
    fn elongation_gives_zeta_only() {
        let d = octahedral_distortion(
            &Vector3::zeros(),
            &octahedron([2.0, 2.0, 2.0, 2.0, 2.3, 2.3]),
        )
        .unwrap();
        assert_abs_diff_eq!(d.zeta, 0.8, epsilon = 1e-12);
        assert_abs_diff_eq!(d.sigma, 0.0, epsilon = 1e-9);
        assert!(d.theta > 1.0);
    }
}
