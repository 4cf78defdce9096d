//! Engine benchmarks: a 1000-point d5 octahedral diagram (labels included), crossover queries
//! (cached and uncached), and one full d5 level calculation.

use criterion::{criterion_group, criterion_main, Criterion};
use spinstate::engine::{crossover, diagram, Calculation, Geometry, LigandField, PointGroup};
use std::hint::black_box;

fn bench_diagram(c: &mut Criterion) {
    // Warm the per-configuration cache once (built on first use, then shared).
    diagram(5, Geometry::Octahedral, 4.477, 40.0, 3).unwrap();
    let mut g = c.benchmark_group("diagram");
    g.sample_size(20);
    g.bench_function("d5 oct, 1000 points, labelled", |b| {
        b.iter(|| diagram(5, Geometry::Octahedral, black_box(4.477), 40.0, 1000).unwrap())
    });
    g.bench_function("d5 oct, 1000 points, every point from eigenvectors", |b| {
        b.iter(|| {
            spinstate::engine::diagram::diagram_full(
                5,
                Geometry::Octahedral,
                black_box(4.477),
                40.0,
                1000,
            )
            .unwrap()
        })
    });
    g.finish();
}

fn bench_levels(c: &mut Criterion) {
    let calc = Calculation::new(
        5,
        860.0,
        3850.0,
        LigandField::octahedral(1800.0),
        PointGroup::Oh,
    )
    .unwrap();
    calc.levels().unwrap();
    c.bench_function("levels d5 oct (with parents)", |b| {
        b.iter(|| black_box(&calc).levels().unwrap())
    });
    let so = Calculation::new(
        7,
        800.0,
        3700.0,
        LigandField::octahedral(920.0),
        PointGroup::Oh,
    )
    .unwrap();
    so.spin_orbit(533.0).unwrap();
    c.bench_function("spin-orbit d7 oct, 120 states", |b| {
        b.iter(|| black_box(&so).spin_orbit(533.0).unwrap())
    });
}

fn bench_crossover(c: &mut Criterion) {
    let geometries = [
        Geometry::Octahedral,
        Geometry::Tetrahedral,
        Geometry::SquarePlanar,
    ];
    for g in geometries {
        for dn in 0..=10 {
            crossover(dn, g, 4.5).unwrap();
        }
    }
    c.bench_function("10 000 crossover queries (cached)", |b| {
        b.iter(|| {
            let mut n = 0usize;
            for i in 0..10_000usize {
                let x = crossover(i % 11, geometries[i % 3], 4.5).unwrap();
                n += usize::from(x.delta_over_b.is_some());
            }
            black_box(n)
        })
    });
    let mut k = 0u64;
    let mut g = c.benchmark_group("crossover uncached");
    g.sample_size(30);
    g.bench_function("d6 oct, new C/B each time", |b| {
        b.iter(|| {
            k += 1;
            crossover(6, Geometry::Octahedral, 4.0 + (k as f64) * 1e-9).unwrap()
        })
    });
    g.finish();
}

fn bench_magnetism(c: &mut Criterion) {
    use spinstate::magnetism::{temperature_grid, MagneticModel, ZeemanLevels};
    let calc = Calculation::new(
        7,
        800.0,
        3700.0,
        LigandField::octahedral(920.0),
        PointGroup::Oh,
    )
    .unwrap();
    let model = MagneticModel::new(533.0);
    let temps = temperature_grid(2.0, 300.0, 300).unwrap();
    ZeemanLevels::compute(&calc, &model).unwrap();
    c.bench_function(
        "magnetism d7 oct HS, 300-point curve (levels + Zeeman + sums)",
        |b| {
            b.iter(|| {
                let z = ZeemanLevels::compute(black_box(&calc), &model).unwrap();
                z.curve(&temps).unwrap()
            })
        },
    );
    // d5 (252 states): the real-arithmetic sums against the complex reference path, both from
    // one diagonalisation.
    let d5 = Calculation::new(
        5,
        860.0,
        3850.0,
        LigandField::octahedral(1400.0),
        PointGroup::Oh,
    )
    .unwrap();
    let m5 = MagneticModel::new(400.0);
    let solution = d5.spin_orbit(400.0).unwrap();
    c.bench_function("magnetism d5 oct, 300-point curve (full)", |b| {
        b.iter(|| {
            let z = ZeemanLevels::compute(black_box(&d5), &m5).unwrap();
            z.curve(&temps).unwrap()
        })
    });
    c.bench_function("Zeeman sums d5 oct, real arithmetic", |b| {
        b.iter(|| ZeemanLevels::from_solution(black_box(&d5), &solution, &m5).unwrap())
    });
    c.bench_function("Zeeman sums d5 oct, complex reference path", |b| {
        b.iter(|| ZeemanLevels::from_solution_complex(black_box(&d5), &solution, &m5).unwrap())
    });
}

criterion_group!(
    benches,
    bench_diagram,
    bench_levels,
    bench_crossover,
    bench_magnetism
);
criterion_main!(benches);
