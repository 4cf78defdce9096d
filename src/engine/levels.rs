//! The d^n ligand-field calculation: build each block's Hamiltonian from the cached unit matrices,
//! diagonalise it, group degenerate states into levels and label them.
//!
//! H = B·H_B + C·H_C + Σ_{mm′} V_{mm′} Σ_σ a†_{mσ} a_{m′σ} (+ ζ Σ l·s, see [`super::spin_orbit`]),
//! energies in cm⁻¹. Racah A only shifts every level of d^n equally and is left out.

use super::field::LigandField;
use super::hermitian::{add_field, add_scaled, eigen_unsorted, eigenvalues};
use super::labels::{Irrep, LevelLabel, Species, Term};
use super::shell::{shell, Shell, SpinBlock};
use super::symmetry::{Characters, PointGroup};
use crate::error::{num, require_finite, Error, Result};
use crate::param::Param;
use nalgebra::{Complex, DMatrix, SMatrix};
use std::collections::HashMap;
use std::ops::Range;
use std::sync::{Mutex, OnceLock};

type C64 = Complex<f64>;

/// Largest energy parameter accepted (B, C, the field, ζ). Energies beyond 10¹² cm⁻¹ are far
/// outside any ligand field (the strong-field limit and trial points of fits reach ≈ 10⁷–10¹¹);
/// rejecting them keeps every later sum finite.
pub const MAX_ENERGY: f64 = 1e12;

/// Smallest Racah B accepted (in whatever unit the energies use: cm⁻¹, or 1 when energies are in
/// units of B).
pub const MIN_B: f64 = 1e-100;

/// The runs of a sorted list that belong together: item i joins the run of item i − 1 when
/// `joins(i)` (e.g. eigenvalues closer than a tolerance, which form one degenerate level).
pub(crate) fn degenerate_runs(len: usize, joins: impl Fn(usize) -> bool) -> Vec<Range<usize>> {
    let mut out = Vec::new();
    let mut start = 0;
    while start < len {
        let mut end = start + 1;
        while end < len && joins(end) {
            end += 1;
        }
        out.push(start..end);
        start = end;
    }
    out
}

/// One ligand-field calculation: d^n, Racah B and C, the one-electron field and the group whose
/// labels are used. Spin–orbit coupling is handled by [`super::spin_orbit`].
#[derive(Debug, Clone)]
pub struct Calculation {
    pub dn: usize,
    /// Racah B (cm⁻¹).
    pub b: f64,
    /// Racah C (cm⁻¹).
    pub c: f64,
    pub field: LigandField,
    pub group: PointGroup,
    /// Coefficient η of an added η·L² term (cm⁻¹), used only internally to separate accidentally
    /// degenerate free-ion terms of different L; zero in every public result.
    l_squared_shift: f64,
}

/// One energy level (spin-free): a set of degenerate states of one total spin and one irrep.
#[derive(Debug, Clone, PartialEq)]
pub struct Level {
    /// Energy above the ground level (cm⁻¹).
    pub energy: f64,
    /// Energy without the ground-state shift (cm⁻¹, Racah A = 0).
    pub absolute_energy: f64,
    /// Twice the total spin S (from the exact S² eigenspace of the state).
    pub two_s: i32,
    /// Mulliken label of the orbital part (e.g. T1g), or the L of a free ion.
    pub irrep: Irrep,
    /// Orbital degeneracy (1, 2 or 3 in cubic groups; 2L+1 for a free ion).
    pub degeneracy: usize,
    /// Free-ion parent term (e.g. 4F) of the level, followed down to zero field; None when the
    /// level could not be labelled.
    pub parent: Option<Term>,
    /// Position of this level among levels of the same spin and irrep, lowest = 1.
    pub index: usize,
}

impl Level {
    /// Spin multiplicity 2S + 1.
    pub fn multiplicity(&self) -> i32 {
        self.two_s + 1
    }

    /// Full label such as "4T1g".
    pub fn label(&self) -> String {
        self.level_label().to_string()
    }

    /// The typed label: 2S and the irrep.
    pub fn level_label(&self) -> LevelLabel {
        LevelLabel::new(self.two_s, self.irrep)
    }

    /// Total spin S.
    pub fn spin(&self) -> f64 {
        self.two_s as f64 / 2.0
    }
}

/// All spin-free levels of one calculation, lowest first.
#[derive(Debug, Clone)]
pub struct Spectrum {
    pub levels: Vec<Level>,
}

impl Spectrum {
    /// The ground level.
    pub fn ground(&self) -> &Level {
        &self.levels[0]
    }

    /// Levels reached from the ground level without a change of spin.
    pub fn spin_allowed(&self) -> impl Iterator<Item = &Level> {
        let s = self.ground().two_s;
        self.levels.iter().skip(1).filter(move |l| l.two_s == s)
    }

    /// Lowest level with the given 2S, if any.
    pub fn lowest_of_spin(&self, two_s: i32) -> Option<&Level> {
        self.levels.iter().find(|l| l.two_s == two_s)
    }
}

/// Eigenstates of one block: energies and vectors over the block's spin-adapted basis.
struct BlockStates<'a> {
    block: &'a SpinBlock,
    values: Vec<f64>,
    /// Eigenvectors (columns), when they were computed.
    vectors: Option<DMatrix<C64>>,
}

impl Calculation {
    /// A checked calculation. `dn` must lie in 0..=10, B > 0, C ≥ 0, all finite.
    pub fn new(dn: usize, b: f64, c: f64, field: LigandField, group: PointGroup) -> Result<Self> {
        if dn > 10 {
            return Err(Error::invalid(Param::DElectronCount, dn, "0..=10"));
        }
        require_finite(Param::RacahB, b)?;
        require_finite(Param::RacahC, c)?;
        // B also sets the tolerances and the small shifts that separate terms: a subnormal or
        // vanishing B would make them underflow to zero.
        if b < MIN_B {
            return Err(Error::invalid(
                Param::RacahB,
                b,
                "a Racah B > 0 cm⁻¹ and at least 1e-100 (usually 100–1200)",
            ));
        }
        if c < 0.0 {
            return Err(Error::invalid(Param::RacahC, c, "a Racah C ≥ 0 cm⁻¹"));
        }
        const LIMIT: f64 = MAX_ENERGY;
        if b > LIMIT || c > LIMIT || field.magnitude() > LIMIT {
            return Err(Error::invalid(
                Param::EnergyScale,
                format!(
                    "B = {}, C = {}, largest field element {}",
                    num(b),
                    num(c),
                    num(field.magnitude())
                ),
                "values up to 10¹² cm⁻¹ (ligand-field energies are 10²–10⁵ cm⁻¹)",
            ));
        }
        if field.matrix.iter().any(|x| !x.is_finite()) {
            return Err(Error::invalid(
                Param::LigandField,
                "a non-finite matrix element",
                "finite values in cm⁻¹",
            ));
        }
        // Field elements far below the energy scale cannot change any sum with B or C in
        // double precision; they are set to zero so that subnormal values (which stall the
        // eigen-solver's convergence test) never reach it.
        let scale = b + c + field.magnitude();
        let mut matrix = (field.matrix + field.matrix.transpose()) * 0.5;
        matrix
            .iter_mut()
            .filter(|x| x.abs() < 1e-18 * scale)
            .for_each(|x| *x = 0.0);
        let field = LigandField { matrix };
        Ok(Calculation {
            dn,
            b,
            c,
            field,
            group,
            l_squared_shift: 0.0,
        })
    }

    fn shell(&self) -> &'static Shell {
        shell(self.dn)
    }

    /// Whether blocks may be split by M_L mod 4 (true for fields with a fourfold z axis).
    fn fourfold(&self) -> bool {
        self.group != PointGroup::C1 && self.field.has_fourfold_z_axis()
    }

    fn block_matrix(
        &self,
        block: &SpinBlock,
        v: &SMatrix<C64, 5, 5>,
    ) -> (DMatrix<f64>, Option<DMatrix<f64>>) {
        let mut re = &block.rep_b * self.b;
        add_scaled(&mut re, self.c, &block.rep_c);
        if self.l_squared_shift != 0.0 {
            add_scaled(&mut re, self.l_squared_shift, block.l_squared());
        }
        let mut im: Option<DMatrix<f64>> = None;
        add_field(&mut re, &mut im, &block.excitations, v);
        (re, im)
    }

    fn diagonalise<'a>(
        &self,
        block: &'a SpinBlock,
        v: &SMatrix<C64, 5, 5>,
        with_vectors: bool,
    ) -> Result<BlockStates<'a>> {
        let (re, im) = self.block_matrix(block, v);
        if !with_vectors {
            return Ok(BlockStates {
                block,
                values: eigenvalues(re, im)?,
                vectors: None,
            });
        }
        let (values, vectors) = eigen_unsorted(re, im)?;
        Ok(BlockStates {
            block,
            values,
            vectors: Some(vectors),
        })
    }

    /// True when the field is unchanged by the C₂ rotation about x, which maps M_L to −M_L, so
    /// the M_L ≡ 3 (mod 4) block has the same eigenvalues as the M_L ≡ 1 block.
    fn mirror_symmetric(&self) -> bool {
        // Under C₂(x): z², yz, x²−y² keep their sign; xz and xy change it.
        let sign = [1.0, -1.0, 1.0, 1.0, -1.0];
        let m = &self.field.matrix;
        let scale = m.amax().max(1e-300);
        (0..5)
            .all(|a| (0..5).all(|b| (m[(a, b)] * (1.0 - sign[a] * sign[b])).abs() <= 1e-12 * scale))
    }

    /// Lowest energy (cm⁻¹, A = 0) of each total spin, as (2S, energy); eigenvalues only.
    pub fn lowest_by_spin(&self) -> Result<Vec<(i32, f64)>> {
        match self.projection()? {
            Some(p) => p.lowest_by_spin(self),
            None => self.lowest_by_spin_in_spin_blocks(),
        }
    }

    /// The symmetry-projected blocks that solve this calculation: Some for a nonzero field with
    /// its group's full symmetry (O_h, T_d, D_4h), None otherwise.
    fn projection(&self) -> Result<Option<&'static super::projection::Projection>> {
        if self.field.magnitude() > 0.0 && self.field.is_invariant_under(self.group) {
            super::projection::Projection::for_group(self.dn, self.group)
        } else {
            Ok(None)
        }
    }

    /// [`Self::lowest_by_spin`] from the spin blocks, for any field (the reference for the
    /// projected path).
    pub fn lowest_by_spin_in_spin_blocks(&self) -> Result<Vec<(i32, f64)>> {
        let v = self.field.complex_matrix();
        let mut out: Vec<(i32, f64)> = Vec::new();
        let fourfold = self.fourfold();
        let skip_mirror = fourfold && self.mirror_symmetric();
        for block in self.shell().blocks(fourfold) {
            if skip_mirror && block.residue == Some(3) {
                continue;
            }
            let (re, im) = self.block_matrix(block, &v);
            let low = eigenvalues(re, im)?
                .into_iter()
                .fold(f64::INFINITY, f64::min);
            if !low.is_finite() {
                return Err(Error::Computation("eigenvalues are not finite".into()));
            }
            match out.iter_mut().find(|(s, _)| *s == block.two_s) {
                Some(entry) => entry.1 = entry.1.min(low),
                None => out.push((block.two_s, low)),
            }
        }
        Ok(out)
    }

    /// 2S of the ground state (the lowest spin wins an exact tie).
    pub fn ground_two_s(&self) -> Result<i32> {
        let lows = self.lowest_by_spin()?;
        let mut best = lows[0];
        for &(s, e) in &lows[1..] {
            if e < best.1 - 1e-9 * (1.0 + e.abs()) {
                best = (s, e);
            }
        }
        Ok(best.0)
    }

    /// The zero-field calculation of d^n in units of B (B = 1, C = `c_over_b`), for the
    /// free-ion terms. C/B only has to be finite and ≥ 0: the energy limits of [`Self::new`]
    /// concern cm⁻¹.
    pub(super) fn free_ion_in_units_of_b(dn: usize, c_over_b: f64) -> Result<Self> {
        if dn > 10 {
            return Err(Error::invalid(Param::DElectronCount, dn, "0..=10"));
        }
        require_finite(Param::COverB, c_over_b)?;
        if c_over_b < 0.0 {
            return Err(Error::invalid(Param::COverB, c_over_b, "a ratio ≥ 0"));
        }
        Ok(Calculation {
            dn,
            b: 1.0,
            c: c_over_b,
            field: LigandField::zero(),
            group: PointGroup::C1,
            l_squared_shift: 0.0,
        })
    }

    /// For each spin (as in the shell's blocks), the eigenvalues of its four M_L-mod-4 blocks
    /// at zero field, indexed by the residue.
    pub(super) fn zero_field_eigenvalues_by_residue(&self) -> Result<Vec<(i32, [Vec<f64>; 4])>> {
        let v = LigandField::zero().complex_matrix();
        let mut out: Vec<(i32, [Vec<f64>; 4])> = Vec::new();
        for block in self.shell().blocks(true) {
            let r = block.residue.unwrap_or(0).rem_euclid(4) as usize;
            let (re, im) = self.block_matrix(block, &v);
            let values = eigenvalues(re, im)?;
            match out.iter_mut().find(|(s, _)| *s == block.two_s) {
                Some((_, per)) => per[r].extend(values),
                None => {
                    let mut per: [Vec<f64>; 4] = Default::default();
                    per[r] = values;
                    out.push((block.two_s, per));
                }
            }
        }
        Ok(out)
    }

    /// The free-ion terms from ⟨L²⟩ of the zero-field eigenvectors, with a small η·L² term that
    /// separates exactly degenerate terms of different L (energies given without it).
    pub(super) fn free_ion_terms_by_l_squared(&self) -> Result<Vec<super::terms::FreeTerm>> {
        let mut c = self.clone();
        c.field = LigandField::zero();
        c.l_squared_shift = 1e-2 * self.b;
        let raw = c
            .grouped_impl(true, true, false)?
            .expect("every eigenvector is available when not in fast mode");
        Ok(raw
            .into_iter()
            .map(|r| {
                let l = l_from_l_squared(r.l_sq.unwrap_or(0.0));
                super::terms::FreeTerm {
                    two_s: r.two_s,
                    l,
                    energy: (r.energy - c.l_squared_shift * (l * (l + 1)) as f64) / self.b,
                }
            })
            .collect())
    }

    /// Tolerance (cm⁻¹) for treating two eigenvalues as one degenerate level.
    pub(crate) fn degeneracy_tolerance(&self) -> f64 {
        1e-7 * (self.b + self.c + 10.0 * self.field.magnitude()).max(1.0)
    }

    /// Raw grouped levels: (energy, 2S, irrep, dimension, ⟨L²⟩ per group) without parents.
    fn grouped(&self, want_l: bool, terms_at_zero_field: bool) -> Result<Vec<RawLevel>> {
        let free_ion = terms_at_zero_field && self.field.magnitude() == 0.0;
        if free_ion && self.l_squared_shift == 0.0 {
            // Free ion: the cached terms (in units of B) scaled by B.
            let terms = super::terms::free_ion_terms(self.dn, self.c / self.b)?;
            return Ok(terms
                .iter()
                .map(|t| RawLevel {
                    energy: t.energy * self.b,
                    two_s: t.two_s,
                    irrep: Irrep::FreeIon { l: t.l },
                    dim: 2 * t.l + 1,
                    l_sq: Some((t.l * (t.l + 1)) as f64),
                })
                .collect());
        }
        let fast = !want_l && !free_ion && self.fourfold() && self.mirror_symmetric();
        if fast {
            if let Some(raw) = self.grouped_impl(false, false, true)? {
                return Ok(raw);
            }
        }
        Ok(self
            .grouped_impl(want_l, free_ion, false)?
            .expect("every eigenvector is available when not in fast mode"))
    }

    /// Grouping and labelling. In `fast` mode the M_L ≡ 1 (mod 4) block is diagonalised without
    /// eigenvectors and the M_L ≡ 3 block is not diagonalised at all (its eigenvalues are those
    /// of the mirror block); Ok(None) is returned if a label then needed a missing eigenvector.
    fn grouped_impl(
        &self,
        want_l: bool,
        free_ion: bool,
        fast: bool,
    ) -> Result<Option<Vec<RawLevel>>> {
        let v = self.field.complex_matrix();
        let shell = self.shell();
        let blocks = shell.blocks(self.fourfold() || free_ion);
        let mut states: Vec<BlockStates> = Vec::with_capacity(blocks.len());
        for b in blocks {
            if fast && b.residue == Some(3) {
                let twin = states
                    .iter()
                    .find(|s| s.block.two_s == b.two_s && s.block.residue == Some(1));
                if let Some(t) = twin {
                    let values = t.values.clone();
                    states.push(BlockStates {
                        block: b,
                        values,
                        vectors: None,
                    });
                    continue;
                }
            }
            let vectors = !(fast && b.residue == Some(1));
            states.push(self.diagonalise(b, &v, vectors)?);
        }
        let tol = self.degeneracy_tolerance();
        let mut raw = Vec::new();
        let mut spins: Vec<i32> = states.iter().map(|s| s.block.two_s).collect();
        spins.dedup();
        for two_s in spins {
            // (energy, block index, column)
            let mut all: Vec<(f64, usize, usize)> = Vec::new();
            for (bi, st) in states
                .iter()
                .enumerate()
                .filter(|(_, s)| s.block.two_s == two_s)
            {
                for (k, &e) in st.values.iter().enumerate() {
                    all.push((e, bi, k));
                }
            }
            all.sort_by(|a, b| a.0.total_cmp(&b.0));
            for run in degenerate_runs(all.len(), |end| all[end].0 - all[end - 1].0 < tol) {
                let members = &all[run];
                let energy = members.iter().map(|m| m.0).sum::<f64>() / members.len() as f64;
                let l_sq = if want_l || free_ion {
                    let mut s = 0.0;
                    for &(_, bi, k) in members {
                        let st = &states[bi];
                        let Some(vecs) = &st.vectors else {
                            return Ok(None);
                        };
                        let col = vecs.column(k);
                        let det_vec: Vec<C64> = (st.block.basis.map(|x| C64::new(x, 0.0)) * col)
                            .iter()
                            .copied()
                            .collect();
                        s += shell.l_squared(st.block, &det_vec);
                    }
                    Some(s / members.len() as f64)
                } else {
                    None
                };
                if free_ion {
                    let l = l_from_l_squared(l_sq.unwrap_or(0.0));
                    raw.push(RawLevel {
                        energy,
                        two_s,
                        irrep: Irrep::FreeIon { l },
                        dim: members.len(),
                        l_sq,
                    });
                } else {
                    let parts = match self.group_labels(&states, members) {
                        Ok(p) => p,
                        Err(MissingVector) => return Ok(None),
                    };
                    match parts {
                        Some(parts) => {
                            for (name, dim) in parts {
                                raw.push(RawLevel {
                                    energy,
                                    two_s,
                                    irrep: name,
                                    dim,
                                    l_sq,
                                });
                            }
                        }
                        None => raw.push(RawLevel {
                            energy,
                            two_s,
                            irrep: Irrep::Unlabelled,
                            dim: members.len(),
                            l_sq,
                        }),
                    }
                }
            }
        }
        raw.sort_by(|a, b| a.energy.total_cmp(&b.energy).then(b.two_s.cmp(&a.two_s)));
        Ok(Some(raw))
    }

    /// Irreps of one degenerate group. The M_L-mod-4 classes of its states give the characters of
    /// C₄ and C₂ for free; when they already fix the irrep (T₁, T₂, A₁, A₂ of O; E of D₄) no
    /// further work is needed, otherwise the characters of the other rotations are computed
    /// from the eigenvectors.
    fn group_labels(
        &self,
        states: &[BlockStates],
        members: &[(f64, usize, usize)],
    ) -> std::result::Result<Option<Vec<(Irrep, usize)>>, MissingVector> {
        let mut residues: Vec<i32> = members
            .iter()
            .filter_map(|&(_, bi, _)| states[bi].block.residue)
            .collect();
        residues.sort_unstable();
        if residues.len() == members.len() {
            let label = |species: Species| (self.group.irrep(species), species.dimension());
            let direct = match (self.group, residues.as_slice()) {
                (PointGroup::Oh | PointGroup::Td, [0]) => Some(Species::A1),
                (PointGroup::Oh | PointGroup::Td, [2]) => Some(Species::A2),
                (PointGroup::Oh | PointGroup::Td, [0, 1, 3]) => Some(Species::T1),
                (PointGroup::Oh | PointGroup::Td, [1, 2, 3]) => Some(Species::T2),
                (PointGroup::D4h, [1, 3]) => Some(Species::E),
                _ => None,
            };
            if let Some(species) = direct {
                return Ok(Some(vec![label(species)]));
            }
            // E of O (χ(C₃) = −1) or one-dimensional irreps of D₄ (χ(C₂′) = ±1): one rotation
            // is enough; anything else falls through to the full set of characters.
            let rot_char = |ri: usize| -> std::result::Result<f64, MissingVector> {
                let mut sum = 0.0;
                for &(_, bi, k) in members {
                    let st = &states[bi];
                    let vecs = st.vectors.as_ref().ok_or(MissingVector)?;
                    sum += expectation(st.block, vecs, k, ri);
                }
                Ok(sum)
            };
            match (self.group, residues.as_slice()) {
                (PointGroup::Oh | PointGroup::Td, [0, 2]) if (rot_char(0)? + 1.0).abs() < 1e-4 => {
                    return Ok(Some(vec![label(Species::E)]));
                }
                (PointGroup::D4h, [r @ (0 | 2)]) => {
                    let c2x = rot_char(2)?;
                    let species = match (r, c2x > 0.0) {
                        (0, true) => Species::A1,
                        (0, false) => Species::A2,
                        (_, true) => Species::B1,
                        (_, false) => Species::B2,
                    };
                    if (c2x.abs() - 1.0).abs() < 1e-4 {
                        return Ok(Some(vec![label(species)]));
                    }
                }
                _ => {}
            }
        }
        Ok(self.group.decompose(&self.characters(states, members)?))
    }

    fn characters(
        &self,
        states: &[BlockStates],
        members: &[(f64, usize, usize)],
    ) -> std::result::Result<Characters, MissingVector> {
        let mut ch = Characters::default();
        let mut c4 = C64::new(0.0, 0.0);
        for &(_, bi, k) in members {
            let st = &states[bi];
            ch.e += 1.0;
            if let Some(r) = st.block.residue {
                let angle = -std::f64::consts::FRAC_PI_2 * r as f64;
                c4 += C64::new(angle.cos(), angle.sin());
                ch.c2z += if r % 2 == 0 { 1.0 } else { -1.0 };
            }
            let Some(vecs) = &st.vectors else {
                if self.group == PointGroup::C1 {
                    continue;
                }
                return Err(MissingVector);
            };
            for (ri, rot) in super::symmetry::Rotation::ALL.iter().enumerate() {
                if !self.group.needs(*rot) {
                    continue;
                }
                let val = expectation(st.block, vecs, k, ri);
                match rot {
                    super::symmetry::Rotation::C3Diagonal => ch.c3 += val,
                    super::symmetry::Rotation::C2Face => ch.c2_face += val,
                    super::symmetry::Rotation::C2X => ch.c2_x += val,
                }
            }
        }
        ch.c4z = c4.re;
        Ok(ch)
    }

    /// All spin-free levels, lowest first, labelled and with their free-ion parents.
    ///
    /// A field with the full symmetry of the group is solved in the symmetry-projected blocks
    /// of [`super::projection::Projection`] (eigenvalues only, labels from the block); any
    /// other field by diagonalising the spin blocks and labelling from the eigenvectors.
    pub fn levels(&self) -> Result<Spectrum> {
        let parents = self.parent_table()?;
        if let Some(p) = self.projection()? {
            return p.levels(self, &parents);
        }
        // d⁰ and d¹⁰ have one state, the totally symmetric one in any group: label it by the
        // group (¹A₁g, ¹A₁) rather than as a free-ion ¹S even when no field is given.
        let single_state = self.dn == 0 || self.dn == 10;
        self.levels_with(&parents, !(single_state && self.group != PointGroup::C1))
    }

    /// Levels with a parent table computed once elsewhere (e.g. once for a whole diagram along
    /// one field direction). With `terms_at_zero_field` false, a zero field still gets the
    /// point-group labels of the group (each free-ion term decomposed into its irreps), so that
    /// series of a diagram continue to Δ = 0.
    pub fn levels_with(
        &self,
        parents: &ParentTable,
        terms_at_zero_field: bool,
    ) -> Result<Spectrum> {
        let raw = self.grouped(false, terms_at_zero_field)?;
        Ok(assemble(raw, parents))
    }

    /// For each (2S, irrep), the parent terms of its levels in order of energy: the free-ion
    /// terms of the calculation's spin, lowest first, each split into the irreps of the group
    /// ([`super::terms::parent_table`]). Levels of the same spin and symmetry never cross as
    /// the field is scaled down (non-crossing rule), so the k-th such level at full field
    /// descends from the k-th term that holds its irrep. Where two free-ion terms of one spin
    /// are exactly degenerate (²P and ²H of d³ and d⁷), the lower of the two correlating levels
    /// is given the term of lower L (a convention: the field mixes such terms).
    ///
    /// The table depends only on d^n, the group and C/B (and on whether the field vanishes,
    /// when levels are labelled by terms), so it is cached under those (C/B rounded to 10⁻⁹).
    pub fn parent_table(&self) -> Result<ParentTable> {
        type Key = (usize, PointGroup, i64, bool);
        static CACHE: OnceLock<Mutex<HashMap<Key, ParentTable>>> = OnceLock::new();
        const KEEP: usize = 4096;
        let quantise = |x: f64| (x * 1e9).round() as i64;
        let key = (
            self.dn,
            self.group,
            quantise(self.c / self.b),
            self.field.magnitude() == 0.0,
        );
        let cache = CACHE.get_or_init(|| Mutex::new(HashMap::new()));
        if let Some(hit) = cache.lock().ok().and_then(|c| c.get(&key).cloned()) {
            return Ok(hit);
        }
        let table = self.compute_parent_table()?;
        if let Ok(mut c) = cache.lock() {
            if c.len() >= KEEP {
                c.clear();
            }
            c.insert(key, table.clone());
        }
        Ok(table)
    }

    fn compute_parent_table(&self) -> Result<ParentTable> {
        let single_state = self.dn == 0 || self.dn == 10;
        let by_term =
            self.field.magnitude() == 0.0 && !(single_state && self.group != PointGroup::C1);
        super::terms::parent_table(self.dn, self.group, self.c / self.b, by_term)
    }

    /// The parent table found numerically, at a field scaled down to 10⁻⁷ B with an η·L² term
    /// of 10⁻⁴ B (which separates exactly degenerate terms and reorders none that lie more than
    /// 0.005 B apart), labels from the eigenvectors: the reference for
    /// [`super::terms::parent_table`].
    #[cfg(test)]
    fn parent_table_at_small_field(&self) -> Result<ParentTable> {
        let mag = self.field.magnitude();
        let mut small = self.clone();
        if mag > 0.0 {
            small.field = self.field.scaled(1e-7 * self.b / mag);
            small.l_squared_shift = 1e-4 * self.b;
        }
        let single_state = self.dn == 0 || self.dn == 10;
        let raw = small.grouped(true, !(single_state && self.group != PointGroup::C1))?;
        let mut table: ParentTable = Vec::new();
        for r in raw {
            let l = l_from_l_squared(r.l_sq.unwrap_or(0.0));
            let term = Term::new(r.two_s, l);
            let key = (r.two_s, r.irrep);
            match table.iter_mut().find(|(k, _)| *k == key) {
                Some((_, v)) => v.push(term),
                None => table.push((key, vec![term])),
            }
        }
        Ok(table)
    }
}

/// For each (2S, irrep), the parent terms of its levels in order of energy.
pub type ParentTable = Vec<((i32, Irrep), Vec<Term>)>;

/// Re⟨v|R|v⟩ for eigenvector `k` of a block and rotation `ri` of [`super::symmetry::Rotation::ALL`].
fn expectation(block: &SpinBlock, vecs: &DMatrix<C64>, k: usize, ri: usize) -> f64 {
    let col = vecs.column(k);
    if col.iter().all(|z| z.im == 0.0) {
        let v: nalgebra::DVector<f64> = col.map(|z| z.re);
        v.dot(&(block.rotation_re(ri) * &v))
    } else {
        (col.adjoint() * block.rotation(ri) * col)[(0, 0)].re
    }
}

/// Signals that a label needed an eigenvector that fast mode did not compute.
struct MissingVector;

/// A grouped level before parents are attached.
#[derive(Debug, Clone)]
pub(crate) struct RawLevel {
    pub(crate) energy: f64,
    pub(crate) two_s: i32,
    pub(crate) irrep: Irrep,
    pub(crate) dim: usize,
    pub(crate) l_sq: Option<f64>,
}

fn l_from_l_squared(x: f64) -> usize {
    (((1.0 + 4.0 * x.max(0.0)).sqrt() - 1.0) / 2.0).round() as usize
}

pub(crate) fn assemble(raw: Vec<RawLevel>, parents: &ParentTable) -> Spectrum {
    let ground = raw.first().map(|r| r.energy).unwrap_or(0.0);
    // (position in `parents` or None, 2S, irrep, levels seen so far) per key met: looked up by
    // reference, so that no label is copied but the parent each level keeps.
    let mut counters: Vec<(Option<usize>, i32, Irrep, usize)> = Vec::new();
    let mut levels = Vec::with_capacity(raw.len());
    for r in raw {
        let slot = match counters
            .iter()
            .position(|(_, s, i, _)| *s == r.two_s && *i == r.irrep)
        {
            Some(k) => k,
            None => {
                let table = parents
                    .iter()
                    .position(|((s, i), _)| *s == r.two_s && *i == r.irrep);
                counters.push((table, r.two_s, r.irrep, 0));
                counters.len() - 1
            }
        };
        let entry = &mut counters[slot];
        entry.3 += 1;
        let idx = entry.3;
        let parent = entry.0.and_then(|t| parents[t].1.get(idx - 1).copied());
        levels.push(Level {
            energy: r.energy - ground,
            absolute_energy: r.energy,
            two_s: r.two_s,
            irrep: r.irrep,
            degeneracy: r.dim,
            parent,
            index: idx,
        });
    }
    Spectrum { levels }
}

#[cfg(test)]
mod parent_tests {
    use super::*;
    use nalgebra::Vector3;

    /// The cached parent table (terms split by the branching rules) against the levels followed
    /// numerically to a field of 10⁻⁷ B, for every d^n, group and several field directions.
    /// Levels of one symmetry and spin do not cross as the field is scaled (J. von Neumann,
    /// E. P. Wigner, Phys. Z. 30, 467, 1929; from memory), so both routes must agree. (The
    /// earlier numerical table used η = 0.01 B, which swapped ³P and ³F of d⁴ at C/B = 4.8: they
    /// lie 0.095 B apart, less than the 0.1 B that η·L² moves them.)
    #[test]
    fn parent_tables_from_terms_match_the_small_field_limit() {
        let bent = LigandField::angular_overlap(&[
            (Vector3::new(1.0, 0.1, 0.0), 6000.0, 1000.0),
            (Vector3::new(-1.0, 0.0, 0.2), 5000.0, 800.0),
            (Vector3::new(0.0, 1.0, 0.0), 7000.0, 500.0),
            (Vector3::new(0.1, -1.0, 0.0), 4000.0, 0.0),
            (Vector3::new(0.0, 0.0, 1.0), 6500.0, 900.0),
        ]);
        let fields = [
            (LigandField::octahedral(1500.0), PointGroup::Oh),
            (LigandField::tetrahedral(800.0), PointGroup::Td),
            (
                LigandField::tetragonal(1500.0, 400.0, 150.0),
                PointGroup::D4h,
            ),
            (LigandField::square_planar(1500.0), PointGroup::D4h),
            (bent, PointGroup::C1),
            (LigandField::zero(), PointGroup::Oh),
            (LigandField::zero(), PointGroup::C1),
        ];
        for dn in 0..=10 {
            for c_over_b in [3.5, 4.477, 4.8, 6.0] {
                for (field, group) in &fields {
                    let calc =
                        Calculation::new(dn, 800.0, 800.0 * c_over_b, *field, *group).unwrap();
                    let mut fast = calc.compute_parent_table().unwrap();
                    let mut slow = calc.parent_table_at_small_field().unwrap();
                    fast.sort();
                    slow.sort();
                    assert_eq!(fast, slow, "d{dn} C/B {c_over_b} {group:?}");
                }
            }
        }
    }
}
