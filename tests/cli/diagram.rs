//! `spinstate diagram`: CSV, SVG, JSON and bad input.

use crate::common::*;

#[test]
fn csv_has_one_column_per_level_and_ground_at_zero() {
    let dir = tempfile::tempdir().unwrap();
    let csv_path = dir.path().join("d6.csv");
    let svg_path = dir.path().join("d6.svg");
    let (code, out, err) = run(&[
        "diagram",
        "--dn",
        "6",
        "--geometry",
        "oct",
        "--c-over-b",
        "4.8",
        "--points",
        "81",
        "--csv",
        csv_path.to_str().unwrap(),
        "--svg",
        svg_path.to_str().unwrap(),
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("spin crossover at Δ/B = 20.0"));
    let mut rdr = csv::Reader::from_path(&csv_path).unwrap();
    let header = rdr.headers().unwrap().clone();
    assert_eq!(&header[0], "delta_over_b");
    // d6 has 43 distinct Oh levels (16 free-ion terms split; common practice).
    assert_eq!(header.len(), 1 + 43);
    let rows: Vec<_> = rdr.records().map(|r| r.unwrap()).collect();
    assert_eq!(rows.len(), 81);
    for row in &rows {
        let min = row
            .iter()
            .skip(1)
            .map(|x| x.parse::<f64>().unwrap())
            .fold(f64::INFINITY, f64::min);
        assert!(min.abs() < 1e-9, "ground level must be at zero");
    }
    let svg = std::fs::read_to_string(&svg_path).unwrap();
    assert!(svg.starts_with("<svg"));
    assert!(svg.contains("Δ/B"));
    assert!(svg.contains("crossover"));
}

#[test]
fn json_series() {
    // Octahedral d3: 4A2g ground at every Δ and no spin change (Pollock et al., J. Am. Chem. Soc.
    // 2014, 136, 9453, Table 2; common practice).
    let v = run_json(&[
        "diagram",
        "--dn",
        "3",
        "--geometry",
        "oct",
        "--c-over-b",
        "4.5",
        "--points",
        "11",
        "--max",
        "30",
        "--json",
    ]);
    assert_eq!(v["delta_over_b"].as_array().unwrap().len(), 11);
    assert!(v["crossover_delta_over_b"].is_null());
    let first = &v["series"][0];
    assert_eq!(first["label"], "4A2g");
    assert_eq!(first["energies"].as_array().unwrap().len(), 11);
}

/// Bad input: (arguments after `diagram`, a fragment the one-line error must contain).
const BAD_INPUT: &[(&[&str], &str)] = &[
    (
        &["--dn", "6", "--geometry", "oct", "--c-over-b", "0"],
        "must be a ratio > 0",
    ),
    (
        &[
            "--dn",
            "6",
            "--geometry",
            "oct",
            "--c-over-b",
            "4.8",
            "--points",
            "1",
        ],
        "--points 1",
    ),
    (
        &[
            "--dn",
            "6",
            "--geometry",
            "oct",
            "--c-over-b",
            "4.8",
            "--max",
            "-3",
        ],
        "--max -3",
    ),
];

#[test]
fn bad_input() {
    for (args, needle) in BAD_INPUT {
        let mut full = vec!["diagram"];
        full.extend_from_slice(args);
        expect_usage_error(&full, needle);
    }
}

/// The eigenvalue-only diagram (projected blocks) against labelling every point from its own
/// eigenvectors: the same series, labels, parents and energies for every d^n and cubic or
/// square-planar geometry. H is block-diagonal over the irreps of its group at every field
/// strength (E. P. Wigner, Group Theory and its Application to the Quantum Mechanics of Atomic
/// Spectra, 1959), so the two routes must agree to round-off.
#[test]
fn projected_diagram_equals_the_full_one() {
    use spinstate::engine::diagram::{diagram, diagram_full};
    use spinstate::engine::Geometry;
    for dn in 1..=9 {
        for geometry in [
            Geometry::Octahedral,
            Geometry::Tetrahedral,
            Geometry::SquarePlanar,
        ] {
            // The projection must really be built (else both routes are the full one).
            assert!(
                spinstate::engine::projection::Projection::for_group(
                    dn,
                    geometry.point_group(0.0, 0.0)
                )
                .unwrap()
                .is_some(),
                "d{dn} {geometry:?}: no projection"
            );
            let fast = diagram(dn, geometry, 4.5, 45.0, 31).unwrap();
            let full = diagram_full(dn, geometry, 4.5, 45.0, 31).unwrap();
            assert_eq!(fast.series.len(), full.series.len(), "d{dn} {geometry:?}");
            // Series that stay degenerate (σ-only square planar) may be listed in either order.
            let sorted = |d: &spinstate::engine::diagram::Diagram| {
                let mut s = d.series.clone();
                s.sort_by(|a, b| (a.two_s, &a.irrep, a.index).cmp(&(b.two_s, &b.irrep, b.index)));
                s
            };
            for (a, b) in sorted(&fast).iter().zip(&sorted(&full)) {
                assert_eq!(
                    (a.two_s, &a.irrep, a.index, &a.parent, a.degeneracy),
                    (b.two_s, &b.irrep, b.index, &b.parent, b.degeneracy),
                    "d{dn} {geometry:?}"
                );
                for (x, y) in a.energies.iter().zip(&b.energies) {
                    assert!(
                        (x - y).abs() < 1e-7,
                        "d{dn} {geometry:?} {}: {x} vs {y}",
                        a.label()
                    );
                }
            }
        }
    }
}

/// `Calculation::levels` and `lowest_by_spin` take the projected blocks for fields with their
/// group's full symmetry; both must equal the spin-block route (E. P. Wigner, Group Theory and
/// its Application to the Quantum Mechanics of Atomic Spectra, 1959: H is block-diagonal over
/// the irreps of its group).
#[test]
fn projected_levels_and_spin_minima_equal_the_spin_blocks() {
    use spinstate::engine::{Calculation, LigandField, PointGroup};
    let fields = [
        (LigandField::octahedral(900.0), PointGroup::Oh),
        (LigandField::octahedral(2600.0), PointGroup::Oh),
        (LigandField::tetrahedral(500.0), PointGroup::Td),
        (
            LigandField::tetragonal(1500.0, 400.0, 150.0),
            PointGroup::D4h,
        ),
        (LigandField::square_planar(1800.0), PointGroup::D4h),
    ];
    for dn in 0..=10 {
        for (field, group) in &fields {
            let calc = Calculation::new(dn, 780.0, 3500.0, *field, *group).unwrap();
            assert!(field.is_invariant_under(*group));
            let mut fast = calc.lowest_by_spin().unwrap();
            let mut slow = calc.lowest_by_spin_in_spin_blocks().unwrap();
            fast.sort_by_key(|x| x.0);
            slow.sort_by_key(|x| x.0);
            assert_eq!(fast.len(), slow.len(), "d{dn} {group:?}");
            for (a, b) in fast.iter().zip(&slow) {
                assert_eq!(a.0, b.0, "d{dn} {group:?}");
                assert!((a.1 - b.1).abs() < 1e-8, "d{dn} {group:?}: {a:?} vs {b:?}");
            }
            let parents = calc.parent_table().unwrap();
            let projected = calc.levels().unwrap();
            let blocks = calc.levels_with(&parents, true).unwrap();
            let key =
                |l: &spinstate::engine::Level| (l.two_s, l.irrep, l.index, l.parent, l.degeneracy);
            let mut a: Vec<_> = projected.levels.iter().map(key).collect();
            let mut b: Vec<_> = blocks.levels.iter().map(key).collect();
            a.sort();
            b.sort();
            assert_eq!(a, b, "d{dn} {group:?}");
        }
    }
    // A field without the full symmetry is not projected.
    let bent = LigandField::tetragonal(1500.0, 400.0, 150.0);
    assert!(!bent.is_invariant_under(PointGroup::Oh));
}
