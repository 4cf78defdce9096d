//! Batch and start-up benchmarks: `check` on the demo rows (library, one core; the CLI spreads
//! rows over every core), and whole `spinstate predict` / `check --input` processes (start-up
//! included), which need the release binary: build it first with `cargo build --release`.

use criterion::{criterion_group, criterion_main, Criterion, Throughput};
use spinstate::check::batch;
use spinstate::check::check;
use spinstate::tables::DataSet;
use std::hint::black_box;
use std::path::Path;
use std::process::Command;

const DEMO: &str = include_str!("../../data/demo/samples.csv");

fn bench_rows(c: &mut Criterion) {
    let tables = DataSet::bundled();
    let samples: Vec<_> = batch::parse(DEMO)
        .unwrap()
        .into_iter()
        .filter_map(Result::ok)
        .collect();
    let mut g = c.benchmark_group("check rows");
    g.sample_size(10);
    g.throughput(Throughput::Elements(samples.len() as u64));
    g.bench_function("demo rows, one core", |b| {
        b.iter(|| {
            for s in &samples {
                black_box(check(&s.input, tables).unwrap());
            }
        })
    });
    g.finish();
}

fn binary() -> Option<&'static Path> {
    let p = Path::new(env!("CARGO_MANIFEST_DIR")).join("target/release/spinstate");
    p.exists().then(|| &*Box::leak(p.into_boxed_path()))
}

fn bench_processes(c: &mut Criterion) {
    let Some(bin) = binary() else {
        eprintln!("skipping process benchmarks: build target/release/spinstate first");
        return;
    };
    let mut g = c.benchmark_group("whole process");
    g.sample_size(20);
    g.bench_function("predict Fe(II) (H2O)6", |b| {
        b.iter(|| {
            let out = Command::new(bin)
                .args(["predict", "--metal", "Fe", "--ox", "2", "--geometry", "oct"])
                .args(["--ligand", "H2O:6"])
                .output()
                .unwrap();
            assert!(out.status.success());
        })
    });
    g.bench_function("diagram d5 oct, 1000 points with labels", |b| {
        b.iter(|| {
            let out = Command::new(bin)
                .args([
                    "diagram",
                    "--dn",
                    "5",
                    "--geometry",
                    "oct",
                    "--c-over-b",
                    "4.477",
                ])
                .args(["--points", "1000"])
                .output()
                .unwrap();
            assert!(out.status.success());
        })
    });
    let dir = tempfile::tempdir().unwrap();
    let file = dir.path().join("rows.csv");
    let mut lines = DEMO.lines();
    let header = lines.next().unwrap();
    let body: Vec<&str> = lines.filter(|l| !l.trim().is_empty()).collect();
    let rows = 6000;
    let mut text = format!("{header}\n");
    for i in 0..rows {
        text.push_str(body[i % body.len()]);
        text.push('\n');
    }
    std::fs::write(&file, text).unwrap();
    g.sample_size(10);
    g.throughput(Throughput::Elements(rows as u64));
    g.bench_function(
        "check --input, 6000 demo rows, all cores, JSON lines",
        |b| {
            b.iter(|| {
                let out = Command::new(bin)
                    .args(["check", "--input", file.to_str().unwrap(), "--jsonl"])
                    .output()
                    .unwrap();
                assert!(out.status.success());
            })
        },
    );
    g.finish();
}

criterion_group!(benches, bench_rows, bench_processes);
criterion_main!(benches);
