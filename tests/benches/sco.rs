//! Spin-transition fit benchmark: a 300-point χ_M·T(T) curve (150 K cooling, 150 K heating)
//! simulated from the cooperative model with seeded noise, fitted with the ideal and the
//! cooperative model. Synthetic data made inside the benchmark.

use criterion::{criterion_group, criterion_main, Criterion};
use spinstate::sco::data::Point;
use spinstate::sco::fit::{fit, FitRequest, ModelKind, PureState};
use spinstate::sco::model::{Branch, Transition, GAS_CONSTANT};
use std::hint::black_box;

fn curve() -> Vec<Point> {
    let tr = Transition {
        dh: 12_000.0,
        ds: 80.0,
        gamma: 1.2 * 2.0 * GAS_CONSTANT * 150.0,
        residual: 0.0,
    };
    let mut state = 42u64;
    let mut noise = move || {
        state = state.wrapping_mul(6364136223846793005).wrapping_add(1);
        ((state >> 11) as f64 / (1u64 << 53) as f64 - 0.5) * 0.02
    };
    let mut pts = Vec::new();
    for (branch, temps) in [
        (Branch::Cooling, (0..150).rev().collect::<Vec<_>>()),
        (Branch::Heating, (0..150).collect()),
    ] {
        for i in temps {
            let t = 60.0 + 1.2 * i as f64;
            let g = tr.fraction(t, branch).unwrap();
            pts.push(Point {
                t,
                chi_t: 3.2 * g + 0.1 * (1.0 - g) + noise(),
                err: None,
                branch,
                line: pts.len() + 2,
            });
        }
    }
    pts
}

fn bench_fit(c: &mut Criterion) {
    let points = curve();
    let request = |model| FitRequest {
        points: points.clone(),
        model,
        chit_hs: PureState::Within {
            lo: 2.8,
            hi: 3.8,
            why: "benchmark".into(),
        },
        chit_ls: PureState::Within {
            lo: 0.0,
            hi: 0.3,
            why: "benchmark".into(),
        },
        residual: false,
        two_s: Some((4, 0)),
    };
    let ideal = request(ModelKind::Ideal);
    let coop = request(ModelKind::Cooperative);
    let mut g = c.benchmark_group("sco-fit");
    g.sample_size(10);
    g.bench_function("300 points, ideal", |b| {
        b.iter(|| fit(black_box(&ideal)).unwrap())
    });
    g.bench_function("300 points, cooperative", |b| {
        b.iter(|| fit(black_box(&coop)).unwrap())
    });
    g.finish();
}

criterion_group!(benches, bench_fit);
criterion_main!(benches);
