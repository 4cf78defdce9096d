//! Symmetry-projected blocks: each spin block of a field with a fourfold axis, restricted to one
//! row of each irrep, so that every further field point along the same field direction needs
//! eigenvalues only and its labels come from the block a level belongs to.
//!
//! The subspace of one irrep inside a block (its isotypic component) depends on the group alone,
//! not on Δ, B or C, and H commutes with the group, so H is block-diagonal over these subspaces
//! at every field strength (Wigner's theorem; E. P. Wigner, *Group Theory and its Application to
//! the Quantum Mechanics of Atomic Spectra*, 1959). The subspaces are the eigenspaces of a
//! class operator built from the cached rotation blocks ([`Projection::for_group`]). Within an M_L-mod-4 block each irrep of O, T_d and
//! D₄ has at most one row (the rows of T₁, T₂ and E differ in their C₄ eigenvalue), so keeping
//! the states of one block per irrep keeps exactly one row: each eigenvalue there is one level,
//! of the irrep's dimension.

use super::hermitian::{add_field, add_scaled};
use super::labels::{Irrep, Species};
use super::levels::{assemble, degenerate_runs, Calculation, ParentTable, RawLevel, Spectrum};
use super::shell::shell;
use super::symmetry::PointGroup;
use crate::error::{Error, Result};
use crate::param::Param;
use nalgebra::DMatrix;
use std::sync::OnceLock;

/// One row of one irrep of one spin: the unit matrices of H over an orthonormal basis of it.
#[derive(Debug, Clone)]
struct IrrepBlock {
    two_s: i32,
    irrep: Irrep,
    /// Dimension of the irrep (the degeneracy of each of its levels).
    dim: usize,
    rep_b: DMatrix<f64>,
    rep_c: DMatrix<f64>,
    excitations: Vec<Option<DMatrix<f64>>>,
}

/// The projected blocks of one d^n shell, point group and field direction.
#[derive(Debug, Clone)]
pub struct Projection {
    dn: usize,
    group: PointGroup,
    blocks: Vec<IrrepBlock>,
}

impl Projection {
    /// The projection of d^n for `group` (cached per shell and group: it is exact). None for C1.
    ///
    /// **O_h and T_d.** The C₃ class sum commutes with H and acts on each irrep Γ as
    /// |C₃|χ_Γ(C₃)/d_Γ. Inside an M_L-mod-4 block (an eigenspace of C₄, or S₄ in T_d, which acts
    /// on d orbitals like C₄) its conjugates by C₄ have the same diagonal block, so there the
    /// class sum is 4(R + R†) with R the block of one C₃ rotation: R + R† has the eigenvalue 2
    /// on A₁ and A₂, −1 on E and 0 on T₁ and T₂ (character tables: F. A. Cotton, *Chemical
    /// Applications of Group Theory*, 3rd ed., 1990). The C₄ eigenvalue then tells the rest: the
    /// block M_L ≡ 0 holds one row each of A₁, E, T₁, the block M_L ≡ 2 one row each of A₂, E,
    /// T₂. **D_4h.** Blocks M_L ≡ 0 and 2 hold A₁g/A₂g and B₁g/B₂g, told apart by C₂(x) (±1);
    /// M_L ≡ 1 holds one row of E_g.
    pub fn for_group(dn: usize, group: PointGroup) -> Result<Option<&'static Projection>> {
        static CACHE: [[OnceLock<Option<Projection>>; 3]; 11] =
            [const { [const { OnceLock::new() }; 3] }; 11];
        let gi = match group {
            PointGroup::Oh => 0,
            PointGroup::Td => 1,
            PointGroup::D4h => 2,
            PointGroup::C1 => return Ok(None),
        };
        if dn > 10 {
            return Err(Error::invalid(Param::DElectronCount, dn, "0..=10"));
        }
        Ok(CACHE[dn][gi]
            .get_or_init(|| Self::build(dn, group))
            .as_ref())
    }

    fn build(dn: usize, group: PointGroup) -> Option<Projection> {
        let mut out = Vec::new();
        let mut states = 0;
        let blocks = shell(dn).blocks(true);
        for block in blocks {
            let residue = block.residue?;
            // (operator, [(eigenvalue, irrep, dimension)]) for this block.
            let (op, wanted): (DMatrix<f64>, Vec<(f64, Species, usize)>) = match (group, residue) {
                (PointGroup::D4h, 1) => (
                    DMatrix::zeros(block.dim(), block.dim()),
                    vec![(0.0, Species::E, 2)],
                ),
                (PointGroup::D4h, 3) => continue,
                (PointGroup::D4h, r) => {
                    let c2x = block.rotation_re(2);
                    let names = if r == 0 {
                        (Species::A1, Species::A2)
                    } else {
                        (Species::B1, Species::B2)
                    };
                    (
                        0.5 * (c2x + c2x.transpose()),
                        vec![(1.0, names.0, 1), (-1.0, names.1, 1)],
                    )
                }
                (_, 0) => {
                    let c3 = block.rotation_re(0);
                    (
                        c3 + c3.transpose(),
                        vec![
                            (2.0, Species::A1, 1),
                            (-1.0, Species::E, 2),
                            (0.0, Species::T1, 3),
                        ],
                    )
                }
                (_, 2) => {
                    let c3 = block.rotation_re(0);
                    (
                        c3 + c3.transpose(),
                        vec![(2.0, Species::A2, 1), (0.0, Species::T2, 3)],
                    )
                }
                _ => continue, // rows of T₁ and T₂ already kept from the blocks above
            };
            let eig = op.symmetric_eigen();
            for (value, name, dim) in wanted {
                let cols: Vec<_> = (0..block.dim())
                    .filter(|&i| (eig.eigenvalues[i] - value).abs() < 1e-6)
                    .map(|i| eig.eigenvectors.column(i).into_owned())
                    .collect();
                if cols.is_empty() {
                    continue;
                }
                let q = DMatrix::from_columns(&cols);
                let qt = q.transpose();
                let project = |m: &DMatrix<f64>| &qt * (m * &q);
                states += q.ncols() * dim;
                let irrep = group.irrep(name);
                out.push(IrrepBlock {
                    two_s: block.two_s,
                    irrep,
                    dim,
                    rep_b: project(&block.rep_b),
                    rep_c: project(&block.rep_c),
                    excitations: block
                        .excitations
                        .iter()
                        .map(|e| e.as_ref().map(project))
                        .collect(),
                });
            }
        }
        // Every state of the M_S = S blocks must be accounted for (else the operator's
        // eigenvalues were not the expected ones: do not guess).
        let total: usize = blocks.iter().map(|b| b.dim()).sum();
        (states == total).then_some(Projection {
            dn,
            group,
            blocks: out,
        })
    }

    /// The field of `calc` over the complex orbitals, once `calc` is known to share the
    /// projection's shell and group.
    fn field_of(
        &self,
        calc: &Calculation,
    ) -> Result<nalgebra::SMatrix<nalgebra::Complex<f64>, 5, 5>> {
        if calc.dn != self.dn || calc.group != self.group {
            return Err(Error::Computation(
                "a projection is used only for its own shell and group".into(),
            ));
        }
        Ok(calc.field.complex_matrix())
    }

    /// The lowest energy of each total spin of `calc` (same d^n and group, a field with the
    /// group's full symmetry), as (2S, energy): the smallest eigenvalue over the projected blocks
    /// of that spin, the same numbers as [`Calculation::lowest_by_spin`] from smaller matrices.
    pub fn lowest_by_spin(&self, calc: &Calculation) -> Result<Vec<(i32, f64)>> {
        let v = self.field_of(calc)?;
        let mut out: Vec<(i32, f64)> = Vec::new();
        for blk in &self.blocks {
            // Blocks are never empty and their eigenvalues are checked finite.
            let low = block_eigenvalues(blk, calc, &v)?.min();
            match out.iter_mut().find(|(s, _)| *s == blk.two_s) {
                Some(entry) => entry.1 = entry.1.min(low),
                None => out.push((blk.two_s, low)),
            }
        }
        Ok(out)
    }

    /// The labelled levels of `calc` (same d^n, group and field direction as the reference)
    /// from eigenvalues alone, with parents from `parents`.
    pub fn levels(&self, calc: &Calculation, parents: &ParentTable) -> Result<Spectrum> {
        // A complex field is refused below, where its imaginary part first appears.
        let v = self.field_of(calc)?;
        let mut raw = Vec::new();
        for blk in &self.blocks {
            let values = block_eigenvalues(blk, calc, &v)?;
            for &energy in values.iter() {
                raw.push(RawLevel {
                    energy,
                    two_s: blk.two_s,
                    irrep: blk.irrep,
                    dim: blk.dim,
                    l_sq: None,
                });
            }
        }
        raw.sort_by(|a, b| a.energy.total_cmp(&b.energy).then(b.two_s.cmp(&a.two_s)));
        // Levels of one spin degenerate within the tolerance of the spin-block route (4A1g and
        // 4Eg of d⁵ stay exactly together at every Δ) get their mean energy and are listed as
        // that route lists them, in the order of the character table.
        let tol = calc.degeneracy_tolerance();
        for run in degenerate_runs(raw.len(), |end| raw[end].energy - raw[end - 1].energy < tol) {
            let run = &mut raw[run];
            let mut spins: Vec<i32> = run.iter().map(|r| r.two_s).collect();
            spins.sort_unstable();
            spins.dedup();
            for two_s in spins {
                let (sum, n) = run
                    .iter()
                    .filter(|r| r.two_s == two_s)
                    .fold((0.0, 0.0), |(s, n), r| (s + r.energy, n + 1.0));
                for r in run.iter_mut().filter(|r| r.two_s == two_s) {
                    r.energy = sum / n;
                }
            }
            run.sort_by(|a, b| {
                a.energy
                    .total_cmp(&b.energy)
                    .then(b.two_s.cmp(&a.two_s))
                    .then(table_order(a.irrep).cmp(&table_order(b.irrep)))
            });
        }
        Ok(assemble(raw, parents))
    }
}

/// Position of an irrep in the character tables of O and D₄ (A₁, A₂, B₁, B₂, E, T₁, T₂; the
/// order of [`Species`]), other labels last.
fn table_order(irrep: Irrep) -> (bool, Option<Species>) {
    (irrep.species().is_none(), irrep.species())
}

/// The eigenvalues of one projected block's Hamiltonian for `calc` (a complex field is refused:
/// the projection holds real matrices only).
fn block_eigenvalues(
    blk: &IrrepBlock,
    calc: &Calculation,
    v: &nalgebra::SMatrix<nalgebra::Complex<f64>, 5, 5>,
) -> Result<nalgebra::DVector<f64>> {
    let mut re = &blk.rep_b * calc.b;
    add_scaled(&mut re, calc.c, &blk.rep_c);
    let mut im = None;
    add_field(&mut re, &mut im, &blk.excitations, v);
    if im.is_some() {
        return Err(Error::Computation("the field is not real".into()));
    }
    let values = re.symmetric_eigenvalues();
    if values.iter().any(|x| !x.is_finite()) {
        return Err(Error::Computation("eigenvalues are not finite".into()));
    }
    Ok(values)
}
