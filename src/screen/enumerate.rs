//! The coordination spheres: multisets of pool ligands that fill the sites, walked depth first with
//! running sums.

use super::*;
use crate::tables::FieldBasis;

/// A coordination sphere: pool indices in non-decreasing order (a multiset), padded with 255.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub struct Sphere {
    pub(super) idx: [u8; MAX_SITES],
    pub(super) len: u8,
}

impl Sphere {
    pub(super) const EMPTY: Sphere = Sphere {
        idx: [u8::MAX; MAX_SITES],
        len: 0,
    };

    pub(super) fn push(&mut self, i: usize) {
        self.idx[self.len as usize] = i as u8;
        self.len += 1;
    }

    /// Pool indices, one per ligand bound (repeats for counts > 1).
    pub fn indices(&self) -> &[u8] {
        &self.idx[..self.len as usize]
    }

    /// (pool index, count) runs in pool order.
    pub fn runs(&self) -> Vec<(usize, usize)> {
        let mut runs: Vec<(usize, usize)> = Vec::new();
        for &i in self.indices() {
            match runs.last_mut() {
                Some((j, c)) if *j == i as usize => *c += 1,
                _ => runs.push((i as usize, 1)),
            }
        }
        runs
    }

    pub(super) fn contains(&self, i: u8) -> bool {
        self.indices().contains(&i)
    }
}

/// (table or pool index, count) pairs in index order.
pub(super) type Runs = Vec<(usize, usize)>;

/// Sums over a sphere that the estimate needs, accumulated run by run in pool order.
#[derive(Debug, Clone, Copy)]
pub(super) struct Sums {
    pub(super) f: f64,
    pub(super) pi: f64,
    pub(super) h: f64,
    pub(super) charge: i32,
    pub(super) donor_key: u32,
    pub(super) h_defaulted: bool,
    pub(super) worst_f: FieldBasis,
    pub(super) kinds: u8,
}

impl Sums {
    pub(super) const ZERO: Sums = Sums {
        f: 0.0,
        pi: 0.0,
        h: 0.0,
        charge: 0,
        donor_key: 0,
        h_defaulted: false,
        worst_f: FieldBasis::Printed,
        kinds: 0,
    };

    #[inline]
    pub(super) fn add_run(&self, l: &PoolLigand, count: usize) -> Sums {
        Sums {
            f: self.f + l.f_terms[count],
            pi: self.pi + l.pi_terms[count],
            h: self.h + l.h_terms[count],
            charge: self.charge + count as i32 * l.ligand.charge,
            donor_key: self.donor_key + count as u32 * l.donor_key,
            h_defaulted: self.h_defaulted || l.h_defaulted,
            worst_f: self.worst_f.max(l.ligand.f_from),
            kinds: self.kinds + 1,
        }
    }
}

/// Number of multisets of ligands with the given denticities whose sites sum to `sites`
/// (coin-change count). For n monodentates it is C(n + sites − 1, sites).
pub fn count_spheres(denticities: &[usize], sites: usize) -> u64 {
    let mut ways = vec![0u64; sites + 1];
    ways[0] = 1;
    for &d in denticities {
        if d == 0 {
            continue;
        }
        for r in d..=sites {
            ways[r] = ways[r].saturating_add(ways[r - d]);
        }
    }
    ways[sites]
}

#[derive(Clone, Copy)]
pub(super) struct Node {
    pub(super) sphere: Sphere,
    pub(super) done: Sums,
    pub(super) last: usize,
    pub(super) count: usize,
    pub(super) left: usize,
}

pub(super) struct RunState {
    /// Per ion: the multiply-only reject test (None: exact path only).
    pub(super) fast: Vec<Option<FastBound>>,
    /// One ion with a reject test, no filter and no charge cap: a leaf takes `fast[0]` from
    /// its Σf, Σπ and Σh before the rest of its sums are built.
    pub(super) light_leaves: bool,
    pub(super) ranking: Ranking,
    pub(super) spheres: u64,
    pub(super) evaluated: u64,
    pub(super) skipped: u64,
}
