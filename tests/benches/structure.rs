//! Structure benchmark: read a generated 1000-atom CIF and analyse every metal centre
//! (coordination sphere from covalent radii, shape measures, Σ/Θ/ζ, bond-length verdict).
//!
//! The CIF is invented inside the benchmark: a P1 cell of 5 × 5 × 4 slightly distorted FeN6
//! octahedra (700 atoms) with three carbon filler atoms in each sub-cell (300 atoms), far from
//! every metal.

use criterion::{criterion_group, criterion_main, Criterion};
use spinstate::structure::centre::analyse;
use spinstate::structure::sphere::{sphere, Cutoff};
use spinstate::structure::{read, MetalChoice};
use spinstate::tables::DataSet;
use std::hint::black_box;

/// Sub-cell edge (Å) and the number of sub-cells along a, b, c.
const STEP: f64 = 7.0;
const GRID: [usize; 3] = [5, 5, 4];

fn generated_cif() -> String {
    let cell = GRID.map(|n| n as f64 * STEP);
    let mut s = format!(
        "data_bench\n_cell_length_a {}\n_cell_length_b {}\n_cell_length_c {}\n_cell_angle_alpha 90\n_cell_angle_beta 90\n_cell_angle_gamma 90\n_space_group_name_H-M_alt 'P 1'\nloop_\n_space_group_symop_operation_xyz\n'x, y, z'\nloop_\n_atom_site_label\n_atom_site_type_symbol\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n_atom_site_occupancy\n",
        cell[0], cell[1], cell[2]
    );
    let mut n = 0usize;
    let mut atom = |s: &mut String, label: String, el: &str, p: [f64; 3]| {
        n += 1;
        s.push_str(&format!(
            "{label} {el} {:.5} {:.5} {:.5} 1\n",
            p[0] / cell[0],
            p[1] / cell[1],
            p[2] / cell[2]
        ));
    };
    let mut k = 0usize;
    for i in 0..GRID[0] {
        for j in 0..GRID[1] {
            for l in 0..GRID[2] {
                k += 1;
                let o = [i as f64 * STEP, j as f64 * STEP, l as f64 * STEP];
                let add = |d: [f64; 3]| [o[0] + d[0], o[1] + d[1], o[2] + d[2]];
                atom(&mut s, format!("Fe{k}"), "Fe", o);
                // Bonds from 1.96 to 2.21 Å, varying with the site, and a small tilt.
                let r = 1.96 + 0.05 * (k % 6) as f64;
                let t = 0.02 * (k % 5) as f64;
                let donors = [
                    [r, t, 0.0],
                    [-r, 0.0, t],
                    [t, r, 0.0],
                    [0.0, -r, -t],
                    [0.0, t, r + 0.03],
                    [-t, 0.0, -r],
                ];
                for (m, d) in donors.iter().enumerate() {
                    atom(&mut s, format!("N{k}_{}", m + 1), "N", add(*d));
                }
                for (m, d) in [[3.5, 3.5, 3.5], [3.5, 3.5, 2.0], [3.5, 2.0, 3.5]]
                    .iter()
                    .enumerate()
                {
                    atom(&mut s, format!("C{k}_{}", m + 1), "C", add(*d));
                }
            }
        }
    }
    assert_eq!(n, 1000, "the generated CIF has 1000 atoms");
    s
}

fn bench(c: &mut Criterion) {
    let text = generated_cif();
    let radii = DataSet::bundled().covalent_radii().unwrap();
    let table = DataSet::bundled().bond_lengths().unwrap();
    let read_and_analyse = || {
        let s = read(&text, "bench.cif").unwrap();
        let metals = s.select_metals(&MetalChoice::All).unwrap();
        let centres: Vec<_> = metals
            .iter()
            .map(|&m| {
                let sp = sphere(&s, m, radii, Cutoff::CovalentRadii).unwrap();
                analyse(&s, &sp, Some(2), table)
            })
            .collect();
        centres
    };
    // The generated structure is what it should be: 100 six-coordinate iron centres.
    let centres = read_and_analyse();
    assert_eq!(centres.len(), 100);
    assert!(centres.iter().all(|c| c.coordination_number() == 6));
    let mut g = c.benchmark_group("structure");
    g.sample_size(10);
    g.bench_function("read_cif_1000_atoms", |b| {
        b.iter(|| read(black_box(&text), "bench.cif").unwrap())
    });
    g.bench_function("read_and_analyse_cif_1000_atoms_100_centres", |b| {
        b.iter(|| black_box(read_and_analyse()))
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
