//! Screening benchmark: every sphere of 6 monodentate ligands from a pool of 30
//! (C(35, 6) = 1 623 160 candidates) for Fe(II) octahedral, keeping the best 20, and the same
//! from the first 20 (177 100), whose difference gives the rate at the margin. Criterion
//! reports the throughput in candidates (elements) per second.
//!
//! Should the bundled ligand table hold fewer than 30 octahedral monodentate ligands, the
//! pool is filled up with SYNTHETIC test ligands (named SYNTH-n, marked as synthetic in their
//! source column) that exist only inside this benchmark; they are not chemistry data.

use criterion::{criterion_group, criterion_main, Criterion, Throughput};
use spinstate::engine::Geometry;
use spinstate::screen::{Filters, IonSpec, Keep, Screen, Target};
use spinstate::tables::{DataSet, LigandTable};
use std::hint::black_box;

const POOL_SIZE: usize = 30;

fn tables_with_synthetic_ligands() -> (DataSet, Vec<String>) {
    let bundled = DataSet::bundled();
    let usable = |l: &spinstate::tables::Ligand| {
        l.denticity() == 1 && l.binds.contains(&Geometry::Octahedral)
    };
    let mut pool: Vec<String> = bundled
        .ligands()
        .unwrap()
        .rows
        .iter()
        .filter(|l| usable(l))
        .map(|l| l.name.clone())
        .take(POOL_SIZE)
        .collect();
    let mut csv = include_str!("../../data/ligands.csv")
        .trim_end()
        .to_string();
    let mut n = 0;
    while pool.len() < POOL_SIZE {
        n += 1;
        let name = format!("SYNTH-{n}");
        // SYNTHETIC test ligand: an invented N donor with f between those of H2O and NH3.
        csv.push_str(&format!(
            "\n{name},,N,1,0,{:.3},printed,1.2,,,none,oct tet sqpl,,SYNTHETIC benchmark ligand (not real chemistry data)",
            1.0 + 0.02 * n as f64
        ));
        pool.push(name);
    }
    csv.push('\n');
    let tables = DataSet::default().with_text::<LigandTable>(csv);
    (tables, pool)
}

fn bench_screen(c: &mut Criterion) {
    let (tables, pool) = tables_with_synthetic_ligands();
    let ions = [IonSpec {
        metal: "Fe".into(),
        oxidation_state: 2,
    }];
    let screen = Screen::from_pool(
        &tables,
        &ions,
        Geometry::Octahedral,
        &pool,
        &Filters::default(),
        Target::Crossover,
    )
    .unwrap();
    let count = screen.candidate_count();
    assert_eq!(count, 1_623_160);
    let mut g = c.benchmark_group("screen");
    g.sample_size(10);
    g.throughput(Throughput::Elements(count));
    g.bench_function("30 monodentates, 6 sites, Fe(II) oct, top 20", |b| {
        b.iter(|| black_box(&screen).run(Keep::Top(20), &mut |_| {}))
    });
    g.bench_function(
        "30 monodentates, 6 sites, Fe(II) oct, top 20, exact path",
        |b| b.iter(|| black_box(&screen).run_exact(Keep::Top(20), &mut |_| {})),
    );
    g.finish();

    // The same query on the first 20 ligands (C(25, 6) = 177 100 candidates): the rate at the
    // margin is (1 623 160 − 177 100) / (t₃₀ − t₂₀), free of the per-query set-up.
    let small = Screen::from_pool(
        &tables,
        &ions,
        Geometry::Octahedral,
        &pool[..20],
        &Filters::default(),
        Target::Crossover,
    )
    .unwrap();
    assert_eq!(small.candidate_count(), 177_100);
    let mut g = c.benchmark_group("screen margin");
    g.sample_size(10);
    g.throughput(Throughput::Elements(small.candidate_count()));
    g.bench_function("20 monodentates, 6 sites, Fe(II) oct, top 20", |b| {
        b.iter(|| black_box(&small).run(Keep::Top(20), &mut |_| {}))
    });
    g.finish();
}

criterion_group!(benches, bench_screen);
criterion_main!(benches);
