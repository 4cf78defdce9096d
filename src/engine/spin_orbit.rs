//! Spin–orbit coupling ζ Σ l·s added to the ligand-field Hamiltonian. The matrices are complex
//! Hermitian in general (real for fields that are real over the complex orbitals); blocks are
//! classes of 2M_J mod 8 when the field has a fourfold axis along z (the field conserves M_L mod
//! 4, spin–orbit coupling conserves M_J), otherwise one block of all determinants.
//!
//! Levels carry double-group (Bethe) labels computed from the characters of their states under
//! rotations acting on space and spin together, and the name of the spin-free level that carries
//! the largest weight of their states (the spin-free eigenstates are computed in the same
//! blocks), with ⟨S²⟩ reported as computed.

use super::basis::time_reversed;
use super::hermitian::{add_field, add_scaled, eigen};
use super::labels::{Irrep, LevelLabel, Term};
use super::levels::Calculation;
use super::shell::{shell, SpinOrbitBlock};
use super::symmetry::{double_group_labels, Characters, PointGroup, Rotation};
use crate::error::{require_finite, Error, Result};
use crate::param::Param;
use nalgebra::{Complex, DMatrix};

type C64 = Complex<f64>;

/// Eigenstates of one spin–orbit block.
#[derive(Debug, Clone)]
pub struct SpinOrbitBlockStates {
    /// The cached block (determinants and unit matrices).
    pub block: &'static SpinOrbitBlock,
    /// Energies (cm⁻¹, Racah A = 0), ascending.
    pub energies: Vec<f64>,
    /// Eigenvectors as columns over `block.dets`.
    pub vectors: DMatrix<C64>,
}

/// All eigenstates of H = H_rep + V_LF + ζ Σ l·s.
#[derive(Debug, Clone)]
pub struct SpinOrbitSolution {
    pub zeta: f64,
    pub blocks: Vec<SpinOrbitBlockStates>,
}

impl SpinOrbitSolution {
    /// Total number of states.
    pub fn state_count(&self) -> usize {
        self.blocks.iter().map(|b| b.energies.len()).sum()
    }
}

/// One level with spin–orbit coupling: a set of degenerate states.
#[derive(Debug, Clone, PartialEq)]
pub struct SpinOrbitLevel {
    /// Energy above the lowest state (cm⁻¹).
    pub energy: f64,
    /// Number of degenerate states.
    pub degeneracy: usize,
    /// ⟨S²⟩ averaged over the states (spin is not a good quantum number with ζ ≠ 0).
    pub s_squared: f64,
    /// Double-group (Bethe) labels from the characters of the states, e.g. [Γ8g]; two for an
    /// accidental degeneracy (shown "Γ6g+Γ7g" by [`Irrep::sum_text`]), none when the group is
    /// C1 or the characters do not decompose (shown "?").
    pub irrep: Vec<Irrep>,
    /// Spin-free level with the largest weight, e.g. 4T1g.
    pub parent_level: LevelLabel,
    /// Free-ion term of that spin-free level, e.g. 4F (None when it could not be labelled).
    pub parent_term: Option<Term>,
    /// Weight (0..1) of that spin-free level in the states.
    pub weight: f64,
}

impl SpinOrbitLevel {
    /// 2S+1 of the nearest pure spin, from ⟨S²⟩ = S(S+1).
    pub fn multiplicity(&self) -> i32 {
        let s = ((1.0 + 4.0 * self.s_squared.max(0.0)).sqrt() - 1.0) / 2.0;
        (2.0 * s).round() as i32 + 1
    }
}

fn hamiltonian(
    calc: &Calculation,
    block: &SpinOrbitBlock,
    zeta: f64,
) -> (DMatrix<f64>, Option<DMatrix<f64>>) {
    let unit = block.matrices();
    let mut re = &unit.rep_b * calc.b;
    add_scaled(&mut re, calc.c, &unit.rep_c);
    if zeta != 0.0 {
        add_scaled(&mut re, zeta, &unit.spin_orbit);
    }
    let mut im = None;
    add_field(
        &mut re,
        &mut im,
        &unit.excitations,
        &calc.field.complex_matrix(),
    );
    (re, im)
}

/// The eigenstates of `block` as the time-reversal images of those of `partner`, the block of
/// the opposite 2M_J class: Θ Σ c_d |d⟩ = Σ c_d* sign_d |Θd⟩.
fn time_reversed_states(
    partner: &SpinOrbitBlockStates,
    block: &'static SpinOrbitBlock,
) -> SpinOrbitBlockStates {
    let columns = partner.vectors.ncols();
    let mut vectors = DMatrix::from_element(block.dets.len(), columns, C64::new(0.0, 0.0));
    for (r, &d) in partner.block.dets.dets.iter().enumerate() {
        let (image, sign) = time_reversed(d);
        let row = block
            .dets
            .position(image)
            .expect("time reversal maps the class −k onto the class k");
        for c in 0..columns {
            vectors[(row, c)] = partner.vectors[(r, c)].conj() * sign;
        }
    }
    SpinOrbitBlockStates {
        block,
        energies: partner.energies.clone(),
        vectors,
    }
}

impl Calculation {
    /// Bethe label of a group of degenerate states from their characters (C₄ and C₂ about z
    /// from the 2M_J class, the others from the cached rotation blocks).
    fn double_group_label(
        &self,
        solution: &SpinOrbitSolution,
        members: &[(f64, f64, usize, f64, usize, usize)],
    ) -> Vec<Irrep> {
        let fourfold = self.group != PointGroup::C1 && self.field.has_fourfold_z_axis();
        if !fourfold {
            return Vec::new();
        }
        let rotations = shell(self.dn).spin_orbit_rotations();
        let mut ch = Characters::default();
        let mut c4 = C64::new(0.0, 0.0);
        let mut c2 = C64::new(0.0, 0.0);
        for &(_, _, _, _, bi, k) in members {
            let st = &solution.blocks[bi];
            let Some(class) = st.block.class else {
                return Vec::new();
            };
            ch.e += 1.0;
            // exp(−iπ/2·M_J) with 2M_J ≡ class (mod 8).
            let a = -std::f64::consts::PI * class as f64 / 4.0;
            c4 += C64::new(a.cos(), a.sin());
            c2 += C64::new((2.0 * a).cos(), (2.0 * a).sin());
            let col = st.vectors.column(k);
            for (ri, rot) in Rotation::ALL.iter().enumerate() {
                let v = (col.adjoint() * &rotations[bi][ri] * col)[(0, 0)].re;
                match rot {
                    Rotation::C3Diagonal => ch.c3 += v,
                    Rotation::C2Face => ch.c2_face += v,
                    Rotation::C2X => ch.c2_x += v,
                }
            }
        }
        ch.c4z = c4.re;
        ch.c2z = c2.re;
        match double_group_labels(self.group, self.dn % 2 == 1, &ch) {
            Some(parts) => parts.into_iter().map(|(n, _)| n).collect(),
            None => Vec::new(),
        }
    }

    fn spin_orbit_blocks(&self) -> &'static [SpinOrbitBlock] {
        let fourfold = self.group != PointGroup::C1 && self.field.has_fourfold_z_axis();
        shell(self.dn).spin_orbit_blocks(fourfold)
    }

    /// Every eigenstate with spin–orbit coupling ζ Σ l·s (ζ in cm⁻¹, ≥ 0).
    pub fn spin_orbit(&self, zeta: f64) -> Result<SpinOrbitSolution> {
        self.spin_orbit_with(zeta, true)
    }

    /// As [`Calculation::spin_orbit`], with every block diagonalised (the reference the
    /// time-reversal shortcut is tested against).
    pub fn spin_orbit_direct(&self, zeta: f64) -> Result<SpinOrbitSolution> {
        self.spin_orbit_with(zeta, false)
    }

    /// H commutes with time reversal Θ (the field and ζ l·s are time-even), and Θ maps the
    /// 2M_J-mod-8 class k onto −k. So the eigenstates of a block whose partner class was
    /// solved already are the Θ images of the partner's (same energies), with no
    /// diagonalisation: that halves the work for odd electron counts (Kramers pairs, classes
    /// 1↔7 and 3↔5) and saves one block in four for even counts (2↔6).
    fn spin_orbit_with(&self, zeta: f64, use_time_reversal: bool) -> Result<SpinOrbitSolution> {
        require_finite(Param::Zeta, zeta)?;
        if !(0.0..=super::levels::MAX_ENERGY).contains(&zeta) {
            return Err(Error::invalid(
                Param::Zeta,
                zeta,
                "a one-electron spin–orbit constant from 0 to 1e12 cm⁻¹ (free ions: ≈ 100–5000)",
            ));
        }
        let blocks = self.spin_orbit_blocks();
        let mut solved: Vec<SpinOrbitBlockStates> = Vec::with_capacity(blocks.len());
        for block in blocks {
            let partner = block.class.and_then(|k| {
                let mirror = (-k).rem_euclid(8);
                (use_time_reversal && mirror != k)
                    .then(|| solved.iter().find(|s| s.block.class == Some(mirror)))
                    .flatten()
            });
            let states = match partner {
                Some(p) => time_reversed_states(p, block),
                None => {
                    let (re, im) = hamiltonian(self, block, zeta);
                    let (energies, vectors) = eigen(re, im)?;
                    SpinOrbitBlockStates {
                        block,
                        energies,
                        vectors,
                    }
                }
            };
            solved.push(states);
        }
        Ok(SpinOrbitSolution {
            zeta,
            blocks: solved,
        })
    }

    /// Levels with spin–orbit coupling, lowest first, each named after its dominant spin-free
    /// level.
    pub fn spin_orbit_levels(&self, zeta: f64) -> Result<Vec<SpinOrbitLevel>> {
        let solution = self.spin_orbit(zeta)?;
        let spin_free = self.levels()?;
        let tol = 1e-6 * (self.b + self.c + 10.0 * self.field.magnitude()).max(1.0);
        // (energy, s², parent index, weight, block, column)
        let mut states: Vec<(f64, f64, usize, f64, usize, usize)> = Vec::new();
        for (bi, st) in solution.blocks.iter().enumerate() {
            let (re0, im0) = hamiltonian(self, st.block, 0.0);
            let (e0, v0) = eigen(re0, im0)?;
            // Spin-free level of each zero-ζ eigenvector, matched by energy.
            let owner: Vec<usize> = e0
                .iter()
                .map(|&e| {
                    spin_free
                        .levels
                        .iter()
                        .enumerate()
                        .min_by(|a, b| {
                            (a.1.absolute_energy - e)
                                .abs()
                                .total_cmp(&(b.1.absolute_energy - e).abs())
                        })
                        .map(|(i, _)| i)
                        .unwrap_or(0)
                })
                .collect();
            let overlaps = v0.adjoint() * &st.vectors;
            let s2 = st.block.s_squared().map(|x| C64::new(x, 0.0));
            for (k, &e) in st.energies.iter().enumerate() {
                let mut weights = vec![0.0; spin_free.levels.len()];
                for (j, &o) in owner.iter().enumerate() {
                    weights[o] += overlaps[(j, k)].norm_sqr();
                }
                let (best, w) = weights
                    .iter()
                    .enumerate()
                    .max_by(|a, b| a.1.total_cmp(b.1))
                    .map(|(i, w)| (i, *w))
                    .unwrap_or((0, 0.0));
                let col = st.vectors.column(k);
                let s_sq = (col.adjoint() * &s2 * col)[(0, 0)].re;
                states.push((e, s_sq, best, w, bi, k));
            }
        }
        states.sort_by(|a, b| a.0.total_cmp(&b.0));
        let ground = states.first().map(|s| s.0).unwrap_or(0.0);
        let mut levels: Vec<SpinOrbitLevel> = Vec::new();
        let mut i = 0;
        while i < states.len() {
            let mut j = i + 1;
            while j < states.len() && states[j].0 - states[j - 1].0 < tol {
                j += 1;
            }
            let group = &states[i..j];
            let n = group.len() as f64;
            // Parent: the spin-free level with the largest total weight in the group.
            let mut totals: Vec<(usize, f64)> = Vec::new();
            for s in group {
                match totals.iter_mut().find(|t| t.0 == s.2) {
                    Some(t) => t.1 += s.3,
                    None => totals.push((s.2, s.3)),
                }
            }
            let (parent, wsum) = totals
                .into_iter()
                .max_by(|a, b| a.1.total_cmp(&b.1))
                .unwrap_or((0, 0.0));
            let pl = &spin_free.levels[parent];
            let irrep = self.double_group_label(&solution, group);
            levels.push(SpinOrbitLevel {
                energy: group.iter().map(|s| s.0).sum::<f64>() / n - ground,
                degeneracy: group.len(),
                irrep,
                s_squared: group.iter().map(|s| s.1).sum::<f64>() / n,
                parent_level: pl.level_label(),
                parent_term: pl.parent,
                weight: wsum / n,
            });
            i = j;
        }
        Ok(levels)
    }
}

#[cfg(test)]
mod time_reversal_tests {
    use super::*;
    use crate::engine::field::LigandField;

    /// The Θ images are eigenvectors of their own block with the partner's energies, and the
    /// energies equal those of a direct diagonalisation (Kramers' theorem for odd n; Wigner's
    /// time-reversal symmetry for even n; A. Messiah, Quantum Mechanics, vol. 2, 1962, ch. XV).
    #[test]
    fn time_reversed_blocks_agree_with_direct_diagonalisation() {
        let fields = [
            (PointGroup::Oh, LigandField::octahedral(1500.0)),
            (
                PointGroup::D4h,
                LigandField::tetragonal(1400.0, 350.0, 120.0),
            ),
        ];
        let mut mapped = 0;
        for dn in 1..=9 {
            for (group, field) in &fields {
                let calc = Calculation::new(dn, 800.0, 3200.0, *field, *group).unwrap();
                let fast = calc.spin_orbit(450.0).unwrap();
                let direct = calc.spin_orbit_direct(450.0).unwrap();
                assert_eq!(fast.blocks.len(), direct.blocks.len());
                for (f, d) in fast.blocks.iter().zip(&direct.blocks) {
                    assert_eq!(f.block.class, d.block.class);
                    for (a, b) in f.energies.iter().zip(&d.energies) {
                        assert!(
                            (a - b).abs() < 1e-8,
                            "d{dn} {:?}: {a} vs {b}",
                            f.block.class
                        );
                    }
                    let (re, im) = hamiltonian(&calc, f.block, 450.0);
                    let h = match im {
                        Some(im) => re.map(|x| C64::new(x, 0.0)) + im.map(|x| C64::new(0.0, x)),
                        None => re.map(|x| C64::new(x, 0.0)),
                    };
                    let residual = &h * &f.vectors
                        - &f.vectors
                            * DMatrix::from_diagonal(&nalgebra::DVector::from_iterator(
                                f.energies.len(),
                                f.energies.iter().map(|&e| C64::new(e, 0.0)),
                            ));
                    assert!(
                        residual.norm() < 1e-7,
                        "d{dn} {:?}: {}",
                        f.block.class,
                        residual.norm()
                    );
                    let gram = f.vectors.adjoint() * &f.vectors;
                    let identity = DMatrix::<C64>::identity(gram.nrows(), gram.ncols());
                    assert!((gram - identity).norm() < 1e-9);
                    if !std::ptr::eq(f.block, d.block) || f.vectors != d.vectors {
                        mapped += 1;
                    }
                }
            }
        }
        assert!(mapped > 0, "no block took the time-reversal path");
    }
}
