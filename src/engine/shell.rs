//! Per-configuration cache of everything that does not depend on B, C or the field: the
//! determinant blocks, the spin-adapted bases, and the unit matrices of electron repulsion,
//! one-electron excitations and rotations projected onto those bases. Built once per d^n on first
//! use and shared (it is exact, so caching it changes no result).

use super::basis::{all_determinants, m_of, total_ml, total_two_ms, two_ms_of, Determinant};
use super::operators::{l_dot_s, one_body, two_body_each, DetList, Slater};
use super::symmetry::{rotation_matrix, spin_orbit_rotation_matrix, Rotation};
use nalgebra::{Complex, DMatrix, SymmetricEigen};
use std::sync::OnceLock;

type C64 = Complex<f64>;

/// States of maximal projection M_S = S for one total spin S, in one M_L-mod-4 class (or all).
#[derive(Debug)]
pub struct SpinBlock {
    /// Number of d electrons of the shell the block belongs to.
    pub n: usize,
    /// Twice the total spin S.
    pub two_s: i32,
    /// M_L mod 4 of every determinant in the block, or None when the block holds all M_L.
    pub residue: Option<i32>,
    /// The determinants with M_S = S (and the residue).
    pub dets: DetList,
    /// Orthonormal basis of the S-eigenspace inside the block: columns over `dets`.
    pub basis: DMatrix<f64>,
    /// Electron repulsion per unit Racah B, projected.
    pub rep_b: DMatrix<f64>,
    /// Electron repulsion per unit Racah C, projected.
    pub rep_c: DMatrix<f64>,
    /// Spatial excitations Σ_σ a†_{mσ} a_{m′σ}, projected; index (m+2)·5 + (m′+2).
    pub excitations: Vec<Option<DMatrix<f64>>>,
    /// Diagonal blocks of the rotations of [`Rotation::ALL`], projected; built on first use
    /// (only labelling needs them).
    rotations: [OnceLock<DMatrix<C64>>; 3],
    /// Real parts of the rotations (enough for ⟨v|R|v⟩ with real v); built on first use.
    rotations_re: [OnceLock<DMatrix<f64>>; 3],
    /// Orbital angular momentum squared L², projected (L² conserves M_L); built on first use.
    l_squared: OnceLock<DMatrix<f64>>,
}

impl SpinBlock {
    /// Diagonal block of rotation `ri` of [`Rotation::ALL`] over the spin-adapted basis (each
    /// built on first use: the projections need one or two of the three).
    pub fn rotation(&self, ri: usize) -> &DMatrix<C64> {
        self.rotations[ri].get_or_init(|| {
            let cbasis = self.basis.map(|x| C64::new(x, 0.0));
            cbasis.adjoint() * rotation_matrix(Rotation::ALL[ri], &self.dets, &self.dets) * &cbasis
        })
    }

    /// Real part of [`SpinBlock::rotation`].
    pub fn rotation_re(&self, ri: usize) -> &DMatrix<f64> {
        self.rotations_re[ri].get_or_init(|| self.rotation(ri).map(|z| z.re))
    }

    /// L² over the spin-adapted basis.
    pub fn l_squared(&self) -> &DMatrix<f64> {
        self.l_squared.get_or_init(|| {
            let m = shell(self.n).l_squared_matrix(&self.dets);
            self.basis.transpose() * m * &self.basis
        })
    }

    /// Number of spin-adapted states.
    pub fn dim(&self) -> usize {
        self.basis.ncols()
    }
}

/// A block of determinants of one class of 2M_J mod 8 (or all determinants), for calculations
/// with spin–orbit coupling, with the unit matrices of every term of the Hamiltonian.
#[derive(Debug)]
pub struct SpinOrbitBlock {
    /// Number of d electrons of the shell the block belongs to.
    n: usize,
    /// (2M_L + 2M_S) mod 8 of the block, or None when it holds every determinant.
    pub class: Option<i32>,
    pub dets: DetList,
    /// The unit matrices of H, built on first use (a block whose eigenstates come from its
    /// time-reversal partner never needs them).
    matrices: OnceLock<SpinOrbitMatrices>,
    /// Total S², built on first use (only the spin of spin–orbit levels needs it).
    s_squared: OnceLock<DMatrix<f64>>,
}

/// The unit matrices of H over one spin–orbit block's determinants.
#[derive(Debug)]
pub struct SpinOrbitMatrices {
    /// Electron repulsion per unit B and per unit C.
    pub rep_b: DMatrix<f64>,
    pub rep_c: DMatrix<f64>,
    /// Spatial excitations Σ_σ a†_{mσ} a_{m′σ}; index (m+2)·5 + (m′+2); None where they leave
    /// the block.
    pub excitations: Vec<Option<DMatrix<f64>>>,
    /// Σ_i l_i·s_i (multiply by ζ).
    pub spin_orbit: DMatrix<f64>,
}

impl SpinOrbitBlock {
    /// The block's unit matrices (repulsion, excitations, l·s), built on first use.
    pub fn matrices(&self) -> &SpinOrbitMatrices {
        self.matrices.get_or_init(|| {
            let dets = &self.dets;
            let mut excitations = Vec::with_capacity(25);
            for m in -2i32..=2 {
                for mp in -2i32..=2 {
                    if self.class.is_some() && (m - mp).rem_euclid(4) != 0 {
                        excitations.push(None);
                        continue;
                    }
                    excitations.push(Some(one_body(dets, dets, |p, q| {
                        if m_of(p) == m && m_of(q) == mp && two_ms_of(p) == two_ms_of(q) {
                            1.0
                        } else {
                            0.0
                        }
                    })));
                }
            }
            let (rep_b, rep_c) = racah_unit_repulsion(dets);
            SpinOrbitMatrices {
                rep_b,
                rep_c,
                spin_orbit: one_body(dets, dets, l_dot_s),
                excitations,
            }
        })
    }

    /// Total S² = S₋S₊ + S_z² + S_z over the block's determinants (S₊ leads out of the block,
    /// S₋S₊ back into it).
    pub fn s_squared(&self) -> &DMatrix<f64> {
        self.s_squared.get_or_init(|| {
            let all = DetList::new(shell(self.n).determinants.clone());
            let splus = one_body(&self.dets, &all, |p, q| {
                if two_ms_of(p) == 1 && two_ms_of(q) == -1 && m_of(p) == m_of(q) {
                    1.0
                } else {
                    0.0
                }
            });
            let mut s2 = splus.transpose() * &splus;
            for (i, &d) in self.dets.dets.iter().enumerate() {
                let sz = total_two_ms(d) as f64 / 2.0;
                s2[(i, i)] += sz * sz + sz;
            }
            s2
        })
    }
}

/// The electron repulsion per unit Racah B and per unit Racah C on a determinant list.
fn racah_unit_repulsion(dets: &DetList) -> (DMatrix<f64>, DMatrix<f64>) {
    let units = [
        Slater::from_racah(0.0, 1.0, 0.0),
        Slater::from_racah(0.0, 0.0, 1.0),
    ];
    let [per_b, per_c]: [DMatrix<f64>; 2] = two_body_each(dets, &units)
        .try_into()
        .expect("one matrix per set of integrals");
    (per_b, per_c)
}

/// Everything cached for one d^n configuration.
#[derive(Debug)]
pub struct Shell {
    pub n: usize,
    pub determinants: Vec<Determinant>,
    with_residues: OnceLock<Vec<SpinBlock>>,
    without_residues: OnceLock<Vec<SpinBlock>>,
    l_raise: OnceLock<Vec<(i32, DetList, DMatrix<f64>)>>,
    so_with_classes: OnceLock<Vec<SpinOrbitBlock>>,
    so_without_classes: OnceLock<Vec<SpinOrbitBlock>>,
    so_rotations: OnceLock<Vec<Vec<DMatrix<C64>>>>,
}

static SHELLS: [OnceLock<Shell>; 11] = [const { OnceLock::new() }; 11];

/// The cached shell of d^n (n ≤ 10; callers validate n).
pub fn shell(n: usize) -> &'static Shell {
    SHELLS[n].get_or_init(|| Shell {
        n,
        determinants: all_determinants(n),
        with_residues: OnceLock::new(),
        without_residues: OnceLock::new(),
        l_raise: OnceLock::new(),
        so_with_classes: OnceLock::new(),
        so_without_classes: OnceLock::new(),
        so_rotations: OnceLock::new(),
    })
}

/// Possible values of 2S for d^n, lowest first.
pub fn two_s_values(n: usize) -> Vec<i32> {
    let max = n.min(10 - n) as i32;
    ((n % 2) as i32..=max).step_by(2).collect()
}

impl Shell {
    /// Spin blocks, split by M_L mod 4 when `fourfold` (fields with a C₄ axis along z).
    pub fn blocks(&self, fourfold: bool) -> &[SpinBlock] {
        if fourfold {
            self.with_residues.get_or_init(|| self.build_blocks(true))
        } else {
            self.without_residues
                .get_or_init(|| self.build_blocks(false))
        }
    }

    /// Blocks for spin–orbit calculations, split by 2M_J mod 8 when `fourfold`.
    pub fn spin_orbit_blocks(&self, fourfold: bool) -> &[SpinOrbitBlock] {
        if fourfold {
            self.so_with_classes
                .get_or_init(|| self.build_so_blocks(true))
        } else {
            self.so_without_classes
                .get_or_init(|| self.build_so_blocks(false))
        }
    }

    /// For each 2M_J-mod-8 block of [`Shell::spin_orbit_blocks`]`(true)`, the diagonal blocks of
    /// the rotations of [`Rotation::ALL`] acting on space and spin together (for double-group
    /// labels).
    pub fn spin_orbit_rotations(&self) -> &[Vec<DMatrix<C64>>] {
        self.so_rotations.get_or_init(|| {
            self.spin_orbit_blocks(true)
                .iter()
                .map(|b| {
                    Rotation::ALL
                        .iter()
                        .map(|&r| spin_orbit_rotation_matrix(r, &b.dets, &b.dets))
                        .collect()
                })
                .collect()
        })
    }

    fn build_so_blocks(&self, fourfold: bool) -> Vec<SpinOrbitBlock> {
        let class_of = |d: Determinant| (2 * total_ml(d) + total_two_ms(d)).rem_euclid(8);
        let classes: Vec<Option<i32>> = if fourfold {
            let mut c: Vec<i32> = self.determinants.iter().map(|&d| class_of(d)).collect();
            c.sort_unstable();
            c.dedup();
            c.into_iter().map(Some).collect()
        } else {
            vec![None]
        };
        classes
            .into_iter()
            .map(|class| {
                let dets = DetList::new(
                    self.determinants
                        .iter()
                        .copied()
                        .filter(|&d| class.is_none_or(|c| class_of(d) == c))
                        .collect(),
                );
                SpinOrbitBlock {
                    n: self.n,
                    class,
                    matrices: OnceLock::new(),
                    s_squared: OnceLock::new(),
                    dets,
                }
            })
            .collect()
    }

    fn build_blocks(&self, fourfold: bool) -> Vec<SpinBlock> {
        let mut out = Vec::new();
        for two_s in two_s_values(self.n) {
            let residues: Vec<Option<i32>> = if fourfold {
                (0..4).map(Some).collect()
            } else {
                vec![None]
            };
            for residue in residues {
                if let Some(b) = self.build_block(two_s, residue) {
                    out.push(b);
                }
            }
        }
        out
    }

    fn select(&self, two_ms: i32, residue: Option<i32>) -> DetList {
        DetList::new(
            self.determinants
                .iter()
                .copied()
                .filter(|&d| total_two_ms(d) == two_ms)
                .filter(|&d| residue.is_none_or(|r| total_ml(d).rem_euclid(4) == r))
                .collect(),
        )
    }

    fn build_block(&self, two_s: i32, residue: Option<i32>) -> Option<SpinBlock> {
        let dets = self.select(two_s, residue);
        if dets.is_empty() {
            return None;
        }
        let upper = self.select(two_s + 2, residue);
        // S+ = Σ_m a†_{mα} a_{mβ}; states with S = M_S are its kernel.
        let basis = if upper.is_empty() {
            DMatrix::identity(dets.len(), dets.len())
        } else {
            let raise = one_body(&dets, &upper, |p, q| {
                if two_ms_of(p) == 1 && two_ms_of(q) == -1 && m_of(p) == m_of(q) {
                    1.0
                } else {
                    0.0
                }
            });
            let k = raise.transpose() * &raise;
            let eig = SymmetricEigen::new(k);
            let cols: Vec<_> = (0..dets.len())
                .filter(|&i| eig.eigenvalues[i].abs() < 1e-8)
                .map(|i| eig.eigenvectors.column(i).into_owned())
                .collect();
            if cols.is_empty() {
                return None;
            }
            DMatrix::from_columns(&cols)
        };
        let project = |m: DMatrix<f64>| basis.transpose() * m * &basis;
        let (rep_b, rep_c) = racah_unit_repulsion(&dets);
        let (rep_b, rep_c) = (project(rep_b), project(rep_c));
        let mut excitations = Vec::with_capacity(25);
        for m in -2i32..=2 {
            for mp in -2i32..=2 {
                if residue.is_some() && (m - mp).rem_euclid(4) != 0 {
                    excitations.push(None);
                    continue;
                }
                let e = one_body(&dets, &dets, |p, q| {
                    if m_of(p) == m && m_of(q) == mp && two_ms_of(p) == two_ms_of(q) {
                        1.0
                    } else {
                        0.0
                    }
                });
                excitations.push(Some(project(e)));
            }
        }
        Some(SpinBlock {
            n: self.n,
            l_squared: OnceLock::new(),
            two_s,
            residue,
            dets,
            basis,
            rep_b,
            rep_c,
            excitations,
            rotations: Default::default(),
            rotations_re: Default::default(),
        })
    }

    /// L² = L₋L₊ + L_z² + L_z over the determinants of one block (same M_S).
    fn l_squared_matrix(&self, dets: &DetList) -> DMatrix<f64> {
        let two_ms = total_two_ms(dets.dets[0]);
        let all = self.select(two_ms, None);
        let lplus = one_body(dets, &all, |p, q| {
            let (mp, mq) = (m_of(p), m_of(q));
            if two_ms_of(p) == two_ms_of(q) && mp == mq + 1 {
                ((6 - mq * (mq + 1)) as f64).sqrt()
            } else {
                0.0
            }
        });
        let mut l2 = lplus.transpose() * lplus;
        for (i, &d) in dets.dets.iter().enumerate() {
            let ml = total_ml(d) as f64;
            l2[(i, i)] += ml * ml + ml;
        }
        l2
    }

    /// ⟨L²⟩ of a state given over the determinants of `block` (any M_L), via
    /// L² = L₋L₊ + L_z² + L_z.
    pub fn l_squared(&self, block: &SpinBlock, det_vector: &[C64]) -> f64 {
        let lists = self.l_raise.get_or_init(|| {
            two_s_values(self.n)
                .into_iter()
                .map(|two_s| {
                    let list = self.select(two_s, None);
                    let lplus = one_body(&list, &list, |p, q| {
                        let (mp, mq) = (m_of(p), m_of(q));
                        if two_ms_of(p) == two_ms_of(q) && mp == mq + 1 {
                            ((6 - mq * (mq + 1)) as f64).sqrt()
                        } else {
                            0.0
                        }
                    });
                    (two_s, list, lplus)
                })
                .collect()
        });
        let (_, list, lplus) = lists
            .iter()
            .find(|(s, _, _)| *s == block.two_s)
            .expect("every spin of the shell has an L+ matrix");
        // L₊ is real: act on the real and imaginary parts separately (no complex copy of L₊).
        let mut re = nalgebra::DVector::zeros(list.len());
        let mut im = nalgebra::DVector::zeros(list.len());
        let mut lz = 0.0;
        for (i, &d) in block.dets.dets.iter().enumerate() {
            let pos = list
                .position(d)
                .expect("block determinants are in the M_S list");
            re[pos] = det_vector[i].re;
            im[pos] = det_vector[i].im;
            let ml = total_ml(d) as f64;
            lz += det_vector[i].norm_sqr() * (ml * ml + ml);
        }
        lz + (lplus * re).norm_squared() + (lplus * im).norm_squared()
    }
}
