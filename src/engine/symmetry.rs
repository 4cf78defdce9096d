//! Point-group symmetry of d^n states: rotations acting on determinants, character tables and the
//! Mulliken labels computed from characters.
//!
//! Every d^n state is gerade, so inversion acts as the identity and the labels of O_h and D_4h
//! follow from the rotation subgroups O and D_4. T_d is isomorphic to O with S₄ ↔ C₄ and
//! σ_d ↔ C₂′ acting on gerade functions, so tetrahedral labels are the O labels without "g".

use super::basis::{Determinant, SPIN_ORBITALS};
use super::field::complex_orbital_form;
use super::labels::{Irrep, Species};
use super::operators::DetList;
use nalgebra::{Complex, DMatrix, Matrix3, Vector3};
use std::sync::OnceLock;

type C64 = Complex<f64>;

/// The point group used for labels.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum PointGroup {
    /// O_h (labels with g).
    Oh,
    /// T_d (labels without g).
    Td,
    /// D_4h (labels with g), z the fourfold axis.
    D4h,
    /// No symmetry: every level is "A".
    C1,
}

/// A rotation used to compute characters: C₃ about [111], C₂ about [110] and C₂ about x.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Rotation {
    C3Diagonal,
    C2Face,
    C2X,
}

impl Rotation {
    pub const ALL: [Rotation; 3] = [Rotation::C3Diagonal, Rotation::C2Face, Rotation::C2X];

    /// The proper rotation as a 3×3 matrix acting on coordinates.
    pub fn matrix(self) -> Matrix3<f64> {
        match self {
            // x → y → z → x
            Rotation::C3Diagonal => Matrix3::new(0.0, 0.0, 1.0, 1.0, 0.0, 0.0, 0.0, 1.0, 0.0),
            // (x, y, z) → (y, x, −z)
            Rotation::C2Face => Matrix3::new(0.0, 1.0, 0.0, 1.0, 0.0, 0.0, 0.0, 0.0, -1.0),
            // (x, y, z) → (x, −y, −z)
            Rotation::C2X => Matrix3::new(1.0, 0.0, 0.0, 0.0, -1.0, 0.0, 0.0, 0.0, -1.0),
        }
    }

    /// Unit axis n and angle θ of the rotation (θ in (0, π]); `matrix()` is the active rotation
    /// by θ about n.
    pub fn axis_angle(self) -> (Vector3<f64>, f64) {
        use std::f64::consts::PI;
        match self {
            Rotation::C3Diagonal => (Vector3::new(1.0, 1.0, 1.0).normalize(), 2.0 * PI / 3.0),
            Rotation::C2Face => (Vector3::new(1.0, 1.0, 0.0).normalize(), PI),
            Rotation::C2X => (Vector3::x(), PI),
        }
    }

    /// The spinor rotation exp(−iθ n·σ/2) in the basis (m_s = +½, −½): the unbarred element of
    /// the double group (rotation by θ, not θ + 2π).
    pub fn spinor_matrix(self) -> [[C64; 2]; 2] {
        let (n, theta) = self.axis_angle();
        let (c, s) = ((theta / 2.0).cos(), (theta / 2.0).sin());
        [
            [C64::new(c, -s * n.z), C64::new(-s * n.y, -s * n.x)],
            [C64::new(s * n.y, -s * n.x), C64::new(c, s * n.z)],
        ]
    }

    /// Representation on the complex d orbitals: D[m′][m] = ⟨Y_{2m′}| O_R |Y_{2m}⟩ with
    /// (O_R f)(r) = f(R⁻¹ r), computed from the quadratic forms of the orbitals.
    pub fn orbital_matrix(self) -> [[C64; 5]; 5] {
        let r = self.matrix().map(|x| C64::new(x, 0.0));
        let mut d = [[C64::new(0.0, 0.0); 5]; 5];
        for m in -2..=2 {
            let rotated = r * complex_orbital_form(m) * r.transpose();
            for mp in -2..=2 {
                let q = complex_orbital_form(mp);
                d[(mp + 2) as usize][(m + 2) as usize] = q
                    .iter()
                    .zip(rotated.iter())
                    .map(|(a, b)| a.conj() * b)
                    .sum();
            }
        }
        d
    }
}

/// Determinant of a small complex matrix by Gaussian elimination with partial pivoting.
fn small_det(mut a: Vec<Vec<C64>>) -> C64 {
    let n = a.len();
    let mut det = C64::new(1.0, 0.0);
    for col in 0..n {
        let piv = (col..n)
            .max_by(|&i, &j| a[i][col].norm().total_cmp(&a[j][col].norm()))
            .unwrap_or(col);
        if a[piv][col].norm() < 1e-300 {
            return C64::new(0.0, 0.0);
        }
        if piv != col {
            a.swap(piv, col);
            det = -det;
        }
        det *= a[col][col];
        for row in col + 1..n {
            let f = a[row][col] / a[col][col];
            let pivot_row = a[col].clone();
            for (x, v) in a[row].iter_mut().zip(pivot_row).skip(col) {
                *x -= f * v;
            }
        }
    }
    det
}

/// The minors of a rotation's 5×5 orbital matrix over every pair of equally populated 5-bit
/// orbital subsets, `[target][source]`: the matrix element between two one-spin strings (the
/// empty subset gives 1). Exact, so cached per rotation.
fn orbital_minors(rot: Rotation) -> &'static [[C64; 32]; 32] {
    static CACHE: [OnceLock<[[C64; 32]; 32]>; 3] = [const { OnceLock::new() }; 3];
    let index = Rotation::ALL
        .iter()
        .position(|&r| r == rot)
        .expect("Rotation::ALL lists every rotation");
    CACHE[index].get_or_init(|| {
        let d = rot.orbital_matrix();
        let mut minors = [[C64::new(0.0, 0.0); 32]; 32];
        for (tgt, row) in minors.iter_mut().enumerate() {
            for (src, entry) in row.iter_mut().enumerate() {
                if (src as u32).count_ones() != (tgt as u32).count_ones() {
                    continue;
                }
                let s: Vec<usize> = (0..5).filter(|b| src & (1 << b) != 0).collect();
                let t: Vec<usize> = (0..5).filter(|b| tgt & (1 << b) != 0).collect();
                let sub = t
                    .iter()
                    .map(|&i| s.iter().map(|&j| d[i][j]).collect())
                    .collect();
                *entry = if s.is_empty() {
                    C64::new(1.0, 0.0)
                } else {
                    small_det(sub)
                };
            }
        }
        minors
    })
}

/// The many-electron matrix ⟨to|O_R|from⟩ of a spatial rotation (spin untouched): the α and β
/// electrons transform separately, each set by the minor of the orbital matrix.
pub fn rotation_matrix(rot: Rotation, from: &DetList, to: &DetList) -> DMatrix<C64> {
    let minors = orbital_minors(rot);
    let mut m = DMatrix::from_element(to.len(), from.len(), C64::new(0.0, 0.0));
    let split = |d: Determinant| ((d & 0x1f) as usize, ((d >> 5) & 0x1f) as usize);
    debug_assert_eq!(SPIN_ORBITALS, 10);
    for (j, &df) in from.dets.iter().enumerate() {
        let (fa, fb) = split(df);
        for (i, &dt) in to.dets.iter().enumerate() {
            let (ta, tb) = split(dt);
            m[(i, j)] = minors[ta][fa] * minors[tb][fb];
        }
    }
    m
}

/// The many-electron matrix ⟨to|R|from⟩ of a rotation acting on space and spin together
/// (orbital matrix ⊗ spinor matrix on each spin-orbital): each element is the determinant of the
/// minor of the 10×10 spin-orbital matrix over the occupied spin-orbitals.
pub fn spin_orbit_rotation_matrix(rot: Rotation, from: &DetList, to: &DetList) -> DMatrix<C64> {
    let d = rot.orbital_matrix();
    let u = rot.spinor_matrix();
    let full = |p: usize, q: usize| d[p % 5][q % 5] * u[p / 5][q / 5];
    let occupied = |det: Determinant| -> Vec<usize> {
        (0..SPIN_ORBITALS)
            .filter(|&p| det & (1 << p) != 0)
            .collect()
    };
    let mut m = DMatrix::from_element(to.len(), from.len(), C64::new(0.0, 0.0));
    for (j, &df) in from.dets.iter().enumerate() {
        let src = occupied(df);
        for (i, &dt) in to.dets.iter().enumerate() {
            let tgt = occupied(dt);
            m[(i, j)] = if src.is_empty() {
                C64::new(1.0, 0.0)
            } else {
                small_det(
                    tgt.iter()
                        .map(|&a| src.iter().map(|&b| full(a, b)).collect())
                        .collect(),
                )
            };
        }
    }
    m
}

/// Bethe label of a level with spin–orbit coupling from its characters under the rotations of
/// the double group (unbarred elements): E, C₄(z), C₂(z), C₃[111], C₂[110], C₂(x). For an even
/// number of electrons the single-valued irreps Γ1–Γ5 (O: A1, A2, E, T1, T2; D4: A1, A2, B1, B2,
/// E); for an odd number Γ6, Γ7 (both groups) and Γ8 (O only) with characters at (E, C₃, C₄) of
/// (2, 1, √2), (2, 1, −√2), (4, −1, 0) in O′ and at (E, C₄) of (2, √2), (2, −√2) in D₄′
/// (H. A. Bethe, *Ann. Phys.* 3, 133, 1929; tables as in Koster et al., *Properties of the
/// Thirty-Two Point Groups*, 1963; from memory). Characters of barred elements are (−1)^n times
/// these, so sums over the unbarred classes suffice. Returns the labels with their dimensions.
pub fn double_group_labels(
    group: PointGroup,
    odd_electrons: bool,
    ch: &Characters,
) -> Option<Vec<(Irrep, usize)>> {
    let r2 = std::f64::consts::SQRT_2;
    type Row = (u8, usize, [f64; 5]);
    let gerade = group.gerade();
    let (sizes, chi, table): (&[f64], [f64; 5], Vec<Row>) = match group {
        PointGroup::Oh | PointGroup::Td => {
            let chi = [ch.e, ch.c3, ch.c4z, ch.c2z, ch.c2_face];
            let table = if odd_electrons {
                vec![
                    (6, 2, [2.0, 1.0, r2, 0.0, 0.0]),
                    (7, 2, [2.0, 1.0, -r2, 0.0, 0.0]),
                    (8, 4, [4.0, -1.0, 0.0, 0.0, 0.0]),
                ]
            } else {
                vec![
                    (1, 1, [1.0, 1.0, 1.0, 1.0, 1.0]),
                    (2, 1, [1.0, 1.0, -1.0, 1.0, -1.0]),
                    (3, 2, [2.0, -1.0, 0.0, 2.0, 0.0]),
                    (4, 3, [3.0, 0.0, 1.0, -1.0, -1.0]),
                    (5, 3, [3.0, 0.0, -1.0, -1.0, 1.0]),
                ]
            };
            (&[1.0, 8.0, 6.0, 3.0, 6.0], chi, table)
        }
        PointGroup::D4h => {
            let chi = [ch.e, ch.c4z, ch.c2z, ch.c2_x, ch.c2_face];
            let table = if odd_electrons {
                vec![
                    (6, 2, [2.0, r2, 0.0, 0.0, 0.0]),
                    (7, 2, [2.0, -r2, 0.0, 0.0, 0.0]),
                ]
            } else {
                vec![
                    (1, 1, [1.0, 1.0, 1.0, 1.0, 1.0]),
                    (2, 1, [1.0, 1.0, 1.0, -1.0, -1.0]),
                    (3, 1, [1.0, -1.0, 1.0, 1.0, -1.0]),
                    (4, 1, [1.0, -1.0, 1.0, -1.0, 1.0]),
                    (5, 2, [2.0, 0.0, -2.0, 0.0, 0.0]),
                ]
            };
            (&[1.0, 2.0, 1.0, 2.0, 2.0], chi, table)
        }
        PointGroup::C1 => return None,
    };
    let order: f64 = sizes.iter().sum();
    let mut out = Vec::new();
    let mut dim = 0.0;
    for (n_bethe, d, chars) in table {
        let n: f64 = (0..5).map(|k| sizes[k] * chars[k] * chi[k]).sum::<f64>() / order;
        let k = n.round();
        if (n - k).abs() > 1e-4 || k < 0.0 {
            return None;
        }
        for _ in 0..k as usize {
            out.push((Irrep::Bethe { n: n_bethe, gerade }, d));
            dim += d as f64;
        }
    }
    ((dim - ch.e).abs() < 1e-6 && !out.is_empty()).then_some(out)
}

/// Classes used for characters: identity, C₄(z), C₂(z), and the three rotations of [`Rotation`].
#[derive(Debug, Clone, Copy, Default)]
pub struct Characters {
    pub e: f64,
    pub c4z: f64,
    pub c2z: f64,
    pub c3: f64,
    pub c2_face: f64,
    pub c2_x: f64,
}

/// One row of a character table.
struct IrrepRow {
    species: Species,
    chars: &'static [f64],
}

// O: classes E, 8C3, 6C2' (face diagonals, [110]), 6C4, 3C2 (= C4²).
const O_SIZES: [f64; 5] = [1.0, 8.0, 6.0, 6.0, 3.0];
const O_IRREPS: [IrrepRow; 5] = [
    IrrepRow {
        species: Species::A1,
        chars: &[1.0, 1.0, 1.0, 1.0, 1.0],
    },
    IrrepRow {
        species: Species::A2,
        chars: &[1.0, 1.0, -1.0, -1.0, 1.0],
    },
    IrrepRow {
        species: Species::E,
        chars: &[2.0, -1.0, 0.0, 0.0, 2.0],
    },
    IrrepRow {
        species: Species::T1,
        chars: &[3.0, 0.0, -1.0, 1.0, -1.0],
    },
    IrrepRow {
        species: Species::T2,
        chars: &[3.0, 0.0, 1.0, -1.0, -1.0],
    },
];

// D4: classes E, 2C4, C2 (= C4²), 2C2' (x, y axes), 2C2'' (diagonals).
const D4_SIZES: [f64; 5] = [1.0, 2.0, 1.0, 2.0, 2.0];
const D4_IRREPS: [IrrepRow; 5] = [
    IrrepRow {
        species: Species::A1,
        chars: &[1.0, 1.0, 1.0, 1.0, 1.0],
    },
    IrrepRow {
        species: Species::A2,
        chars: &[1.0, 1.0, 1.0, -1.0, -1.0],
    },
    IrrepRow {
        species: Species::B1,
        chars: &[1.0, -1.0, 1.0, 1.0, -1.0],
    },
    IrrepRow {
        species: Species::B2,
        chars: &[1.0, -1.0, 1.0, -1.0, 1.0],
    },
    IrrepRow {
        species: Species::E,
        chars: &[2.0, 0.0, -2.0, 0.0, 0.0],
    },
];

impl PointGroup {
    /// Rotations whose characters this group needs beyond C₄(z) and C₂(z).
    pub fn needs(self, r: Rotation) -> bool {
        match self {
            PointGroup::Oh | PointGroup::Td => matches!(r, Rotation::C3Diagonal | Rotation::C2Face),
            PointGroup::D4h => matches!(r, Rotation::C2X | Rotation::C2Face),
            PointGroup::C1 => false,
        }
    }

    /// Whether labels carry "g": the groups with inversion (every d^n state is gerade).
    pub fn gerade(self) -> bool {
        match self {
            PointGroup::Oh | PointGroup::D4h => true,
            PointGroup::Td | PointGroup::C1 => false,
        }
    }

    /// The Mulliken label of `species` in this group (T1g in O_h, T1 in T_d).
    pub fn irrep(self, species: Species) -> Irrep {
        Irrep::mulliken(species, self.gerade())
    }

    /// The irreps that a free-ion term of orbital angular momentum `l` splits into, with their
    /// dimensions (the branching rule, e.g. F → A2g + T1g + T2g in O_h), from the character
    /// χ_l(θ) = Σ_m cos mθ of the rotations by θ in the (2l+1)-dimensional representation. Every
    /// d^n state is even under inversion, so the g labels follow from the proper rotations alone
    /// (and T_d, isomorphic to O, takes the same characters). Standard group theory (e.g.
    /// F. A. Cotton, Chemical Applications of Group Theory, 3rd ed., 1990, ch. 9).
    pub fn term_irreps(self, l: usize) -> Vec<(Irrep, usize)> {
        let chi = |theta: f64| -> f64 {
            let sum: f64 = (-(l as i64)..=l as i64)
                .map(|m| (m as f64 * theta).cos())
                .sum();
            sum.round()
        };
        let two_fold = if l.is_multiple_of(2) { 1.0 } else { -1.0 };
        let ch = Characters {
            e: (2 * l + 1) as f64,
            c4z: chi(std::f64::consts::FRAC_PI_2),
            c2z: two_fold,
            c3: chi(2.0 * std::f64::consts::PI / 3.0),
            c2_face: two_fold,
            c2_x: two_fold,
        };
        self.decompose(&ch)
            .expect("the characters of a rotation representation decompose exactly")
    }

    /// Decomposes a (possibly reducible) character into irreducible labels with their
    /// dimensions, e.g. [("T1g", 3)]. Returns None when the character is not a sum of irreps
    /// (which signals a numerical grouping problem).
    pub fn decompose(self, ch: &Characters) -> Option<Vec<(Irrep, usize)>> {
        let (sizes, irreps, chi): (&[f64], &[IrrepRow], [f64; 5]) = match self {
            PointGroup::Oh | PointGroup::Td => (
                &O_SIZES,
                &O_IRREPS,
                [ch.e, ch.c3, ch.c2_face, ch.c4z, ch.c2z],
            ),
            PointGroup::D4h => (
                &D4_SIZES,
                &D4_IRREPS,
                [ch.e, ch.c4z, ch.c2z, ch.c2_x, ch.c2_face],
            ),
            PointGroup::C1 => {
                let n = ch.e.round();
                if (ch.e - n).abs() > 1e-6 || n < 1.0 {
                    return None;
                }
                return Some(vec![(self.irrep(Species::A), 1); n as usize]);
            }
        };
        let order: f64 = sizes.iter().sum();
        let mut out = Vec::new();
        let mut dim_total = 0.0;
        for irrep in irreps {
            let n: f64 = sizes
                .iter()
                .zip(irrep.chars)
                .zip(chi.iter())
                .map(|((s, a), b)| s * a * b)
                .sum::<f64>()
                / order;
            let k = n.round();
            if (n - k).abs() > 1e-4 || k < 0.0 {
                return None;
            }
            for _ in 0..k as usize {
                let dim = irrep.species.dimension();
                out.push((self.irrep(irrep.species), dim));
                dim_total += dim as f64;
            }
        }
        ((dim_total - ch.e).abs() < 1e-6 && !out.is_empty()).then_some(out)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn orbital_rotation_is_unitary_and_has_right_trace() {
        // Character of the d (l = 2) representation under a rotation by α is
        // sin(5α/2)/sin(α/2): −1 for C3 (α = 120°) and +1 for C2 (common practice).
        for (rot, expected) in [
            (Rotation::C3Diagonal, -1.0),
            (Rotation::C2Face, 1.0),
            (Rotation::C2X, 1.0),
        ] {
            let d = rot.orbital_matrix();
            let tr: C64 = (0..5).map(|i| d[i][i]).sum();
            assert_abs_diff_eq!(tr.re, expected, epsilon = 1e-12);
            assert_abs_diff_eq!(tr.im, 0.0, epsilon = 1e-12);
        }
    }

    #[test]
    fn free_ion_terms_branch_as_tabulated() {
        // Splitting of the free-ion terms S…I in O_h and of P, D in D_4h, as tabulated in
        // F. A. Cotton, Chemical Applications of Group Theory, 3rd ed. (1990), ch. 9 (the
        // table of terms in O_h; entries from memory).
        let names = |g: PointGroup, l: usize| -> Vec<String> {
            g.term_irreps(l)
                .into_iter()
                .map(|p| p.0.to_string())
                .collect()
        };
        assert_eq!(names(PointGroup::Oh, 0), ["A1g"]);
        assert_eq!(names(PointGroup::Oh, 1), ["T1g"]);
        assert_eq!(names(PointGroup::Oh, 2), ["Eg", "T2g"]);
        assert_eq!(names(PointGroup::Oh, 3), ["A2g", "T1g", "T2g"]);
        assert_eq!(names(PointGroup::Oh, 4), ["A1g", "Eg", "T1g", "T2g"]);
        assert_eq!(names(PointGroup::Oh, 5), ["Eg", "T1g", "T1g", "T2g"]);
        assert_eq!(
            names(PointGroup::Oh, 6),
            ["A1g", "A2g", "Eg", "T1g", "T2g", "T2g"]
        );
        assert_eq!(names(PointGroup::Td, 3), ["A2", "T1", "T2"]);
        assert_eq!(names(PointGroup::D4h, 1), ["A2g", "Eg"]);
        assert_eq!(names(PointGroup::D4h, 2), ["A1g", "B1g", "B2g", "Eg"]);
        assert_eq!(names(PointGroup::C1, 2).len(), 5);
        for g in [
            PointGroup::Oh,
            PointGroup::Td,
            PointGroup::D4h,
            PointGroup::C1,
        ] {
            for l in 0..=12 {
                let dim: usize = g.term_irreps(l).iter().map(|p| p.1).sum();
                assert_eq!(dim, 2 * l + 1, "{g:?} L = {l}");
            }
        }
    }

    #[test]
    fn d_orbitals_split_into_eg_and_t2g() {
        // The five d orbitals span E_g + T_2g in O_h (common practice).
        let ch = Characters {
            e: 5.0,
            c4z: -1.0,
            c2z: 1.0,
            c3: -1.0,
            c2_face: 1.0,
            c2_x: 1.0,
        };
        let parts = PointGroup::Oh.decompose(&ch).unwrap();
        let names: Vec<_> = parts.iter().map(|p| p.0.to_string()).collect();
        assert_eq!(names, ["Eg", "T2g"]);
    }
}
