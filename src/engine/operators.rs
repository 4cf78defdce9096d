//! Many-electron matrices of one- and two-electron operators on lists of determinants.

use super::angular::d_shell_gaunt;
use super::basis::{annihilate, create, excite, m_of, two_ms_of, Determinant, SPIN_ORBITALS};
use nalgebra::DMatrix;

/// An ordered list of determinants with a fast index.
#[derive(Debug, Clone)]
pub struct DetList {
    pub dets: Vec<Determinant>,
    index: Vec<u32>,
}

impl DetList {
    pub fn new(dets: Vec<Determinant>) -> Self {
        let mut index = vec![u32::MAX; 1 << SPIN_ORBITALS];
        for (i, &d) in dets.iter().enumerate() {
            index[d as usize] = i as u32;
        }
        DetList { dets, index }
    }

    pub fn len(&self) -> usize {
        self.dets.len()
    }

    pub fn is_empty(&self) -> bool {
        self.dets.is_empty()
    }

    /// Position of a determinant in the list.
    pub fn position(&self, d: Determinant) -> Option<usize> {
        let i = self.index[d as usize];
        (i != u32::MAX).then_some(i as usize)
    }
}

/// Matrix ⟨to_i| Σ_pq h(p,q) a†_p a_q |from_j⟩ of a one-electron operator given by its
/// spin-orbital matrix elements `h(p, q)` (real).
pub fn one_body(from: &DetList, to: &DetList, h: impl Fn(usize, usize) -> f64) -> DMatrix<f64> {
    let mut m = DMatrix::zeros(to.len(), from.len());
    for (j, &d) in from.dets.iter().enumerate() {
        for q in 0..SPIN_ORBITALS {
            if d & (1 << q) == 0 {
                continue;
            }
            for p in 0..SPIN_ORBITALS {
                let v = h(p, q);
                if v == 0.0 {
                    continue;
                }
                if let Some((d2, s)) = excite(d, p, q) {
                    if let Some(i) = to.position(d2) {
                        m[(i, j)] += s * v;
                    }
                }
            }
        }
    }
    m
}

/// Radial Slater integrals F⁰, F², F⁴ of a d shell.
#[derive(Debug, Clone, Copy)]
pub struct Slater {
    pub f0: f64,
    pub f2: f64,
    pub f4: f64,
}

impl Slater {
    /// Slater integrals from Racah A, B, C: F⁰ = A + 7C/5, F² = 49B + 7C, F⁴ = 63C/5
    /// (G. Racah, *Phys. Rev.* 62, 438, 1942; with F₂ = F²/49, F₄ = F⁴/441, A = F₀ − 49F₄,
    /// B = F₂ − 5F₄, C = 35F₄).
    pub fn from_racah(a: f64, b: f64, c: f64) -> Self {
        Slater {
            f0: a + 7.0 * c / 5.0,
            f2: 49.0 * b + 7.0 * c,
            f4: 63.0 * c / 5.0,
        }
    }
}

/// Spatial two-electron integral ⟨m1 m2|1/r12|m3 m4⟩ for d electrons:
/// δ(m1+m2, m3+m4) Σ_k c^k(2m1, 2m3) c^k(2m4, 2m2) F^k (Condon & Shortley 1935, ch. 6).
pub fn coulomb_integral(m: [i32; 4], f: &Slater) -> f64 {
    if m[0] + m[1] != m[2] + m[3] || m.iter().any(|x| x.abs() > 2) {
        return 0.0;
    }
    let [a, b, c, d] = m;
    let mut s = 0.0;
    for (k, fk) in [(0, f.f0), (2, f.f2), (4, f.f4)] {
        if fk != 0.0 {
            s += d_shell_gaunt(k, a, c) * d_shell_gaunt(k, d, b) * fk;
        }
    }
    s
}

/// Matrices of the electron repulsion ½ Σ ⟨pq|rs⟩ a†_p a†_q a_s a_r on a determinant list
/// (closed under the operator: it conserves M_L and M_S), one per set of Slater integrals
/// (e.g. per unit B and per unit C): one walk over the determinants fills every matrix.
pub fn two_body_each(list: &DetList, slaters: &[Slater]) -> Vec<DMatrix<f64>> {
    // Integral tables over spatial m's, indexed by (m+2).
    let tables: Vec<[[[[f64; 5]; 5]; 5]; 5]> = slaters
        .iter()
        .map(|f| {
            let mut g = [[[[0.0f64; 5]; 5]; 5]; 5];
            for (i1, g1) in g.iter_mut().enumerate() {
                for (i2, g2) in g1.iter_mut().enumerate() {
                    for (i3, g3) in g2.iter_mut().enumerate() {
                        for (i4, g4) in g3.iter_mut().enumerate() {
                            let m = [i1, i2, i3, i4].map(|i| i as i32 - 2);
                            *g4 = coulomb_integral(m, f);
                        }
                    }
                }
            }
            g
        })
        .collect();
    let n = list.len();
    let mut out = vec![DMatrix::zeros(n, n); slaters.len()];
    let bits = |d: Determinant| (0..SPIN_ORBITALS).filter(move |&p| d & (1 << p) != 0);
    let full: Determinant = (1 << SPIN_ORBITALS) - 1;
    // Only occupied r, s and empty p, q can contribute: the loops run over those alone, in the
    // same ascending order as a loop over every spin-orbital (so the sums are unchanged).
    for (j, &d) in list.dets.iter().enumerate() {
        for r in bits(d) {
            let Some((d1, s1)) = annihilate(d, r) else {
                continue;
            };
            for s in bits(d1) {
                let Some((d2, s2)) = annihilate(d1, s) else {
                    continue;
                };
                for q in bits(full & !d2) {
                    if two_ms_of(q) != two_ms_of(s) {
                        continue;
                    }
                    let Some((d3, s3)) = create(d2, q) else {
                        continue;
                    };
                    for p in bits(full & !d3) {
                        // Spin is conserved, and so is M_L (the integral vanishes otherwise).
                        if two_ms_of(p) != two_ms_of(r) || m_of(p) + m_of(q) != m_of(r) + m_of(s) {
                            continue;
                        }
                        let Some((d4, s4)) = create(d3, p) else {
                            continue;
                        };
                        let Some(i) = list.position(d4) else {
                            continue;
                        };
                        let sign = 0.5 * s1 * s2 * s3 * s4;
                        let idx = [p, q, r, s].map(|x| (m_of(x) + 2) as usize);
                        for (h, g) in out.iter_mut().zip(&tables) {
                            let v = g[idx[0]][idx[1]][idx[2]][idx[3]];
                            if v != 0.0 {
                                h[(i, j)] += v * sign;
                            }
                        }
                    }
                }
            }
        }
    }
    out
}

/// Matrix ⟨to_i| Σ_pq h[p][q] a†_p a_q |from_j⟩ of a one-electron operator with complex
/// spin-orbital matrix elements (e.g. L_x, S_y for Zeeman terms).
pub fn one_body_complex(
    from: &DetList,
    to: &DetList,
    h: &[[nalgebra::Complex<f64>; SPIN_ORBITALS]; SPIN_ORBITALS],
) -> DMatrix<nalgebra::Complex<f64>> {
    let re = one_body(from, to, |p, q| h[p][q].re);
    let im = one_body(from, to, |p, q| h[p][q].im);
    DMatrix::from_fn(re.nrows(), re.ncols(), |i, j| {
        nalgebra::Complex::new(re[(i, j)], im[(i, j)])
    })
}

/// Spin-orbital matrix elements ⟨p|l·s|q⟩ for a d shell (real with Condon–Shortley phases):
/// l_z s_z on the diagonal and ½(l₊s₋ + l₋s₊) off it.
pub fn l_dot_s(p: usize, q: usize) -> f64 {
    let (mp, mq) = (m_of(p), m_of(q));
    let (sp, sq) = (two_ms_of(p), two_ms_of(q));
    if p == q {
        return mp as f64 * sp as f64 / 2.0;
    }
    // l₊ s₋ : (m, α) → (m+1, β)
    if sq == 1 && sp == -1 && mp == mq + 1 {
        return 0.5 * ((6 - mq * (mq + 1)) as f64).sqrt();
    }
    // l₋ s₊ : (m, β) → (m−1, α)
    if sq == -1 && sp == 1 && mp == mq - 1 {
        return 0.5 * ((6 - mq * (mq - 1)) as f64).sqrt();
    }
    0.0
}

/// Cartesian component of an angular-momentum vector operator.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Axis {
    X,
    Y,
    Z,
}

/// Spin-orbital matrix of one component of l (orbital) or s (spin) for a d electron, in units
/// of ħ: l_x = (l₊ + l₋)/2, l_y = (l₊ − l₋)/2i, and likewise for s.
pub fn angular_momentum(orbital: bool, axis: Axis) -> [[nalgebra::Complex<f64>; 10]; 10] {
    use nalgebra::Complex;
    let mut h = [[Complex::new(0.0, 0.0); 10]; 10];
    for (p, row) in h.iter_mut().enumerate() {
        for (q, entry) in row.iter_mut().enumerate() {
            let (mp, mq) = (m_of(p), m_of(q));
            let (sp, sq) = (two_ms_of(p), two_ms_of(q));
            // raising and lowering elements of the chosen momentum
            let (same, up, down, diag) = if orbital {
                (
                    sp == sq,
                    mp == mq + 1,
                    mp == mq - 1,
                    if mp == mq { mq as f64 } else { 0.0 },
                )
            } else {
                (
                    mp == mq,
                    sp == sq + 2,
                    sp == sq - 2,
                    if sp == sq { sq as f64 / 2.0 } else { 0.0 },
                )
            };
            if !same {
                continue;
            }
            let plus = if up {
                if orbital {
                    ((6 - mq * (mq + 1)) as f64).sqrt()
                } else {
                    1.0
                }
            } else {
                0.0
            };
            let minus = if down {
                if orbital {
                    ((6 - mq * (mq - 1)) as f64).sqrt()
                } else {
                    1.0
                }
            } else {
                0.0
            };
            *entry = match axis {
                Axis::Z => Complex::new(diag, 0.0),
                Axis::X => Complex::new((plus + minus) / 2.0, 0.0),
                Axis::Y => Complex::new(0.0, -(plus - minus) / 2.0),
            };
        }
    }
    h
}
