//! The screen's multiply-only reject test against the exact path: on random pools, one or two
//! ions, geometries and targets the ranked hits, their scores and the counts are identical (an
//! agreement test of two orders of the same arithmetic; common practice).

use spinstate::engine::Geometry;
use spinstate::screen::{Filters, IonSpec, Keep, Screen, Target};
use spinstate::tables::DataSet;

struct Rng(u64);

impl Rng {
    fn below(&mut self, n: usize) -> usize {
        // 64-bit LCG (Knuth, The Art of Computer Programming vol. 2, MMIX constants).
        self.0 = self
            .0
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        ((self.0 >> 33) as usize) % n
    }
}

#[test]
fn fast_reject_keeps_the_exact_ranking() {
    let tables = DataSet::bundled();
    let ions = [
        ("Fe", 2),
        ("Fe", 3),
        ("Co", 2),
        ("Co", 3),
        ("Mn", 2),
        ("Mn", 3),
        ("Cr", 2),
        ("Ni", 2),
    ];
    let mut rng = Rng(20261202);
    let mut compared = 0;
    for round in 0..24 {
        let geometry = [Geometry::Octahedral, Geometry::Tetrahedral][round % 2];
        let usable: Vec<String> = tables
            .ligands()
            .unwrap()
            .rows
            .iter()
            .filter(|l| l.binds.contains(&geometry))
            .map(|l| l.name.clone())
            .collect();
        let mut pool: Vec<String> = Vec::new();
        while pool.len() < 9.min(usable.len()) {
            let name = usable[rng.below(usable.len())].clone();
            if !pool.contains(&name) {
                pool.push(name);
            }
        }
        let (metal, ox) = ions[rng.below(ions.len())];
        let (metal2, ox2) = ions[rng.below(ions.len())];
        let mut specs = vec![IonSpec {
            metal: metal.into(),
            oxidation_state: ox,
        }];
        // Half the rounds screen one ion: with no filter, its leaves take the reject test from
        // Σf, Σπ and Σh before the rest of their sums; the other half two ions (no such lane).
        if round % 4 >= 2 {
            specs.push(IonSpec {
                metal: metal2.into(),
                oxidation_state: ox2,
            });
        }
        let target = [Target::Crossover, Target::High, Target::Low][round % 3];
        let Ok(screen) =
            Screen::from_pool(tables, &specs, geometry, &pool, &Filters::default(), target)
        else {
            continue; // an ion without a crossover in this geometry is refused; try another
        };
        let keep = Keep::Top(1 + rng.below(40));
        let fast = screen.run(keep, &mut |_| {});
        let exact = screen.run_exact(keep, &mut |_| {});
        assert_eq!(fast.hits, exact.hits, "round {round}: {pool:?} {target:?}");
        assert_eq!(
            (fast.candidates, fast.evaluated, fast.skipped),
            (exact.candidates, exact.evaluated, exact.skipped)
        );
        compared += 1;
    }
    assert!(compared >= 12, "only {compared} screens could be built");
}
