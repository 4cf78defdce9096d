//! The free-ion terms of d^n (which 2S+1L occur, and their energies at a given C/B) and the
//! parent table built from them: for each (2S, irrep) of a point group, the free-ion terms its
//! levels descend from, in order of energy.
//!
//! The terms are found from eigenvalues alone. The number of terms of each (S, L) follows from
//! counting determinants, n(S, L) = c(S, L) − c(S, L+1) − c(S+1, L) + c(S+1, L+1) with c(M_S, M_L)
//! the number of determinants with those quantum numbers (E. U. Condon, G. H. Shortley, The Theory
//! of Atomic Spectra, 1935, ch. 7). A term of L puts a known number of its 2L+1 states in each
//! block of M_L mod 4, so the degenerate eigenvalues of the zero-field blocks of one spin are
//! assigned their L from how they spread over the four blocks. Where that leaves a choice (terms
//! of one spin that are exactly degenerate and spread alike), ⟨L²⟩ of the eigenvectors decides.
//!
//! Both results depend only on d^n and C/B (and the group, for the table), so they are cached:
//! the field's direction does not enter. Levels of one spin and symmetry never cross as the field
//! is scaled down (the non-crossing rule), so the k-th level of a (2S, irrep) at any field
//! descends from the k-th in this table; terms of one spin that are exactly degenerate (²P and
//! ²H of d³ and d⁷) are taken in order of L (a convention: the field mixes them).

use super::basis::{total_ml, total_two_ms};
use super::labels::{Irrep, Term};
use super::levels::{degenerate_runs, Calculation, ParentTable};
use super::shell::{shell, two_s_values};
use super::symmetry::PointGroup;
use crate::error::Result;
use std::collections::HashMap;
use std::sync::{Arc, Mutex, OnceLock};

/// One free-ion term of d^n.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FreeTerm {
    /// Twice the total spin S.
    pub two_s: i32,
    /// Orbital angular momentum L.
    pub l: usize,
    /// Energy in units of Racah B (Racah A = 0).
    pub energy: f64,
}

impl FreeTerm {
    /// The term (2S, L), shown as "4F".
    pub fn term(&self) -> Term {
        Term::new(self.two_s, self.l)
    }
}

/// The free-ion terms of d^n at `c_over_b` (energies in units of B), lowest first; exactly
/// degenerate terms in order of L, then of falling spin. Cached per (d^n, C/B).
pub fn free_ion_terms(dn: usize, c_over_b: f64) -> Result<Arc<[FreeTerm]>> {
    type Key = (usize, u64);
    static CACHE: OnceLock<Mutex<HashMap<Key, Arc<[FreeTerm]>>>> = OnceLock::new();
    const KEEP: usize = 4096;
    let key = (dn, c_over_b.to_bits());
    let cache = CACHE.get_or_init(|| Mutex::new(HashMap::new()));
    if let Some(hit) = cache.lock().ok().and_then(|c| c.get(&key).cloned()) {
        return Ok(hit);
    }
    let calc = Calculation::free_ion_in_units_of_b(dn, c_over_b)?;
    let terms: Arc<[FreeTerm]> = match terms_by_counting(&calc)? {
        Some(t) => t,
        None => calc.free_ion_terms_by_l_squared()?,
    }
    .into();
    if let Ok(mut c) = cache.lock() {
        if c.len() >= KEEP {
            c.clear();
        }
        c.insert(key, terms.clone());
    }
    Ok(terms)
}

/// The parent table of d^n in `group` at `c_over_b`. With `by_term`, the free-ion labels
/// themselves are the keys (the L letter: a calculation at zero field labelled by terms);
/// otherwise each term is split into the irreps of the group.
pub fn parent_table(
    dn: usize,
    group: PointGroup,
    c_over_b: f64,
    by_term: bool,
) -> Result<ParentTable> {
    let terms = free_ion_terms(dn, c_over_b)?;
    let mut table: ParentTable = Vec::new();
    for t in terms.iter() {
        let symbol = t.term();
        let irreps: Vec<Irrep> = if by_term {
            vec![Irrep::FreeIon { l: t.l }]
        } else {
            group.term_irreps(t.l).into_iter().map(|p| p.0).collect()
        };
        for irrep in irreps {
            let key = (t.two_s, irrep);
            match table.iter_mut().find(|(k, _)| *k == key) {
                Some((_, v)) => v.push(symbol),
                None => table.push((key, vec![symbol])),
            }
        }
    }
    Ok(table)
}

/// How many of the 2L+1 states of a term of L fall in each class of M_L mod 4.
fn residue_counts(l: usize) -> [usize; 4] {
    let mut r = [0; 4];
    let l = l as i32;
    for m in -l..=l {
        r[m.rem_euclid(4) as usize] += 1;
    }
    r
}

/// Number of terms of each (2S, L) of d^n, from determinant counts.
fn term_counts(dn: usize) -> HashMap<(i32, i32), i32> {
    let mut c: HashMap<(i32, i32), i32> = HashMap::new();
    for &d in &shell(dn).determinants {
        *c.entry((total_two_ms(d), total_ml(d))).or_default() += 1;
    }
    let get = |s: i32, l: i32| c.get(&(s, l)).copied().unwrap_or(0);
    let mut out = HashMap::new();
    for two_s in two_s_values(dn) {
        for l in 0..=12 {
            let n = get(two_s, l) - get(two_s, l + 1) - get(two_s + 2, l) + get(two_s + 2, l + 1);
            if n > 0 {
                out.insert((two_s, l), n);
            }
        }
    }
    out
}

/// The terms from eigenvalues and determinant counts, or None when the degenerate sets of
/// eigenvalues can be split into terms in more than one way.
fn terms_by_counting(calc: &Calculation) -> Result<Option<Vec<FreeTerm>>> {
    let counts = term_counts(calc.dn);
    let tol = calc.degeneracy_tolerance();
    let mut terms = Vec::new();
    for (two_s, values) in calc.zero_field_eigenvalues_by_residue()? {
        let mut all: Vec<(f64, usize)> = values
            .iter()
            .enumerate()
            .flat_map(|(r, v)| v.iter().map(move |&e| (e, r)))
            .collect();
        all.sort_by(|a, b| a.0.total_cmp(&b.0));
        // Degenerate sets: (energy, how their states spread over M_L mod 4).
        let mut sets: Vec<(f64, [usize; 4])> = Vec::new();
        for run in degenerate_runs(all.len(), |end| all[end].0 - all[end - 1].0 < tol) {
            let members = &all[run];
            let energy = members.iter().map(|m| m.0).sum::<f64>() / members.len() as f64;
            let mut spread = [0usize; 4];
            for m in members {
                spread[m.1] += 1;
            }
            sets.push((energy, spread));
        }
        let available: Vec<(usize, i32)> = (0..=12usize)
            .filter_map(|l| {
                let n = counts.get(&(two_s, l as i32)).copied().unwrap_or(0);
                (n > 0).then_some((l, n))
            })
            .collect();
        // Each set's possible splits; then one choice per set that uses every term exactly
        // as often as it occurs, which must be unique.
        let options: Vec<Vec<Vec<usize>>> = sets
            .iter()
            .map(|(_, spread)| {
                let mut found = Vec::new();
                split_into_terms(*spread, &available, 0, &mut Vec::new(), &mut found);
                found
            })
            .collect();
        let mut left: HashMap<usize, i32> = available.iter().copied().collect();
        let mut solutions = Vec::new();
        let mut budget = SEARCH_BUDGET;
        choose_splits(
            &options,
            0,
            &mut left,
            &mut Vec::new(),
            &mut solutions,
            &mut budget,
        );
        if budget == 0 {
            return Ok(None);
        }
        let [choice] = solutions.as_slice() else {
            return Ok(None);
        };
        for (&(energy, _), ls) in sets.iter().zip(choice) {
            for &l in ls {
                terms.push(FreeTerm { two_s, l, energy });
            }
        }
    }
    sort_terms(&mut terms);
    Ok(Some(terms))
}

/// Most ways of splitting one degenerate set that are followed up.
const MAX_SPLITS: usize = 16;

/// Every multiset of L (within the available counts, taken from index `from` on) whose states
/// spread over the M_L-mod-4 classes as `spread` does, at most [`MAX_SPLITS`].
fn split_into_terms(
    spread: [usize; 4],
    available: &[(usize, i32)],
    from: usize,
    chosen: &mut Vec<usize>,
    found: &mut Vec<Vec<usize>>,
) {
    if found.len() >= MAX_SPLITS {
        return;
    }
    if spread == [0; 4] {
        if !chosen.is_empty() {
            found.push(chosen.clone());
        }
        return;
    }
    for i in from..available.len() {
        let (l, n) = available[i];
        let used = chosen.iter().filter(|&&x| x == l).count() as i32;
        if used >= n {
            continue;
        }
        let r = residue_counts(l);
        if (0..4).any(|j| r[j] > spread[j]) {
            continue;
        }
        let rest = [0, 1, 2, 3].map(|j| spread[j] - r[j]);
        chosen.push(l);
        split_into_terms(rest, available, i, chosen, found);
        chosen.pop();
    }
}

/// Most steps of the search for a consistent choice of splits (then ⟨L²⟩ decides instead).
const SEARCH_BUDGET: usize = 100_000;

/// Choices of one split per set (from set `at` on) that use up `left` exactly; stops after two
/// (only uniqueness matters) or when `budget` runs out.
fn choose_splits(
    options: &[Vec<Vec<usize>>],
    at: usize,
    left: &mut HashMap<usize, i32>,
    chosen: &mut Vec<Vec<usize>>,
    solutions: &mut Vec<Vec<Vec<usize>>>,
    budget: &mut usize,
) {
    if solutions.len() > 1 || *budget == 0 {
        return;
    }
    *budget -= 1;
    if at == options.len() {
        if left.values().all(|&n| n == 0) {
            solutions.push(chosen.clone());
        }
        return;
    }
    for split in &options[at] {
        let fits = split.iter().all(|l| {
            let need = split.iter().filter(|&x| x == l).count() as i32;
            left.get(l).copied().unwrap_or(0) >= need
        });
        if !fits {
            continue;
        }
        for l in split {
            *left.get_mut(l).expect("checked above") -= 1;
        }
        chosen.push(split.clone());
        choose_splits(options, at + 1, left, chosen, solutions, budget);
        chosen.pop();
        for l in split {
            *left.get_mut(l).expect("checked above") += 1;
        }
    }
}

/// Lowest first; terms within 10⁻⁹ B·(1 + |E|) of each other in order of L, then of falling spin.
pub(crate) fn sort_terms(terms: &mut [FreeTerm]) {
    terms.sort_by(|a, b| a.energy.total_cmp(&b.energy));
    // Stable reordering inside runs of (numerically) degenerate terms.
    for run in degenerate_runs(terms.len(), |end| {
        terms[end].energy - terms[end - 1].energy < 1e-9 * (1.0 + terms[end].energy.abs())
    }) {
        terms[run].sort_by(|a, b| a.l.cmp(&b.l).then(b.two_s.cmp(&a.two_s)));
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn d2_terms_have_the_racah_energies() {
        // d² terms with Racah A = 0 (G. Racah, Phys. Rev. 62, 438, 1942; as tabulated in
        // J. S. Griffith, The Theory of Transition-Metal Ions, 1961; values from memory):
        // ³F −8B, ³P 7B, ¹G 4B + 2C, ¹D −3B + 2C, ¹S 14B + 7C.
        let c = 4.0;
        let terms = free_ion_terms(2, c).unwrap();
        let want = [
            ("3F", -8.0),
            ("1D", -3.0 + 2.0 * c),
            ("3P", 7.0),
            ("1G", 4.0 + 2.0 * c),
            ("1S", 14.0 + 7.0 * c),
        ];
        assert_eq!(terms.len(), want.len());
        for (t, (sym, e)) in terms.iter().zip(want) {
            assert_eq!(t.term(), sym.parse().unwrap());
            assert_abs_diff_eq!(t.energy, e, epsilon = 1e-9);
        }
    }

    #[test]
    fn term_lists_match_the_standard_counts() {
        // Numbers of free-ion terms of d^n (Condon & Shortley 1935, ch. 7; common practice):
        // d¹ 1, d² 5, d³ 8, d⁴ 16, d⁵ 16.
        for (dn, n) in [
            (0, 1),
            (1, 1),
            (2, 5),
            (3, 8),
            (4, 16),
            (5, 16),
            (6, 16),
            (7, 8),
        ] {
            assert_eq!(free_ion_terms(dn, 4.5).unwrap().len(), n, "d{dn}");
        }
        // d³: ²P and ²H are exactly degenerate, and ²P comes first by convention.
        let d3 = free_ion_terms(3, 4.5).unwrap();
        let p = d3.iter().position(|t| t.term() == Term::new(1, 1)).unwrap();
        assert_eq!(d3[p + 1].term(), Term::new(1, 5));
        assert_abs_diff_eq!(d3[p].energy, d3[p + 1].energy, epsilon = 1e-9);
    }

    #[test]
    fn counting_agrees_with_l_squared() {
        // The eigenvalue-only assignment against ⟨L²⟩ of the eigenvectors, over every d^n and
        // a range of C/B (including values far from the usual 4–5): L² = L(L+1) on a term of L
        // (Condon & Shortley 1935, ch. 3; common practice).
        for dn in 0..=10 {
            for c in [0.5, 3.0, 3.7, 4.0, 4.477, 4.8, 6.0, 12.0] {
                let calc = Calculation::free_ion_in_units_of_b(dn, c).unwrap();
                let mut reference = calc.free_ion_terms_by_l_squared().unwrap();
                sort_terms(&mut reference);
                // Far from the usual range accidental degeneracies can leave a choice (d⁴ at
                // C/B = 0.5), which the ⟨L²⟩ route then settles; in the usual range it must not.
                let Some(fast) = terms_by_counting(&calc).unwrap() else {
                    assert!(
                        !(3.0..=6.0).contains(&c),
                        "d{dn} C/B {c}: counting left a choice"
                    );
                    continue;
                };
                assert_eq!(fast.len(), reference.len(), "d{dn} C/B {c}");
                for (a, b) in fast.iter().zip(&reference) {
                    assert_eq!((a.two_s, a.l), (b.two_s, b.l), "d{dn} C/B {c}");
                    assert_abs_diff_eq!(a.energy, b.energy, epsilon = 1e-8);
                }
            }
        }
    }
}
