//! Band-fit benchmark: whole fits (assignment search and refinement) of the spectra a chemist
//! most often brings. Band positions: [Cr(H2O)6]3+ and [Mn(H2O)6]2+ (A. B. P. Lever, Inorganic
//! Electronic Spectroscopy, 1984, from memory); the tetragonal spectra are synthetic (D4h
//! closed forms for Cu(II), the engine for trans-Ni(II)).

use criterion::{criterion_group, criterion_main, Criterion};
use spinstate::engine::Geometry;
use spinstate::spectra::fit::{fit_bands, FitRequest};
use spinstate::spectra::tetragonal::{fit_tetragonal, TetragonalRequest};
use spinstate::spectra::SpinChoice;
use std::hint::black_box;

fn octahedral(dn: usize, bands: &[f64]) -> FitRequest {
    FitRequest {
        dn,
        geometry: Geometry::Octahedral,
        bands: bands.to_vec(),
        spin: SpinChoice::Auto,
        c_over_b: None,
        fit_c: false,
        fixed_b: None,
        patience: None,
        b0: None,
        forbidden: Vec::new(),
    }
}

fn tetragonal(dn: usize, bands: &[f64]) -> TetragonalRequest {
    TetragonalRequest {
        dn,
        bands: bands.to_vec(),
        spin: SpinChoice::Auto,
        c_over_b: None,
        fixed_b: None,
        b0: None,
        patience: None,
    }
}

fn bench(c: &mut Criterion) {
    let mut g = c.benchmark_group("fit");
    g.sample_size(10);
    let cr = octahedral(3, &[17_400.0, 24_600.0, 37_800.0]);
    g.bench_function("d3 oct, 3 bands", |b| {
        b.iter(|| fit_bands(black_box(&cr)).unwrap())
    });
    let mn = octahedral(5, &[18_900.0, 23_100.0, 24_900.0, 28_000.0]);
    g.bench_function("d5 high-spin oct, 4 quartet bands", |b| {
        b.iter(|| fit_bands(black_box(&mn)).unwrap())
    });
    let cu = tetragonal(9, &[8_000.0, 12_000.0, 14_500.0]);
    g.bench_function("d9 tetragonal, 3 bands", |b| {
        b.iter(|| fit_tetragonal(black_box(&cu)).unwrap())
    });
    let ni = tetragonal(8, &[8_612.3, 10_000.0, 14_439.1, 15_332.4]);
    g.bench_function("d8 tetragonal, 4 bands, B free", |b| {
        b.iter(|| fit_tetragonal(black_box(&ni)).unwrap())
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
