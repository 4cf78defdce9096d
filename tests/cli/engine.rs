//! Reference checks of the d^n ligand-field engine against published closed forms and tables.
//! Each check names its source; "common practice" marks textbook facts without a single source.

use approx::assert_abs_diff_eq;
use proptest::prelude::*;
use spinstate::engine::shell::shell;
use spinstate::engine::{
    crossover, Calculation, Geometry, Irrep, LigandField, PointGroup, Species, Spectrum,
};

fn oct(dn: usize, b: f64, c: f64, dq: f64) -> Spectrum {
    Calculation::new(dn, b, c, LigandField::octahedral(dq), PointGroup::Oh)
        .unwrap()
        .levels()
        .unwrap()
}

fn energy_of(s: &Spectrum, label: &str, index: usize) -> f64 {
    s.levels
        .iter()
        .find(|l| l.label() == label && l.index == index)
        .unwrap_or_else(|| panic!("no level {label} #{index}"))
        .energy
}

#[test]
fn free_ion_terms_match_racah_closed_forms() {
    // tests/reference/free_ion_terms.csv: Racah (1942) and Griffith (1961) term energies.
    let mut rdr = csv::Reader::from_path("tests/reference/free_ion_terms.csv").unwrap();
    let (b, c) = (1030.0, 4400.0);
    let mut checked = 0;
    for row in rdr.records() {
        let row = row.unwrap();
        let dn: usize = row[0].parse().unwrap();
        let term = &row[1];
        let f = |i: usize| row[i].parse::<f64>().unwrap();
        let expected =
            f(2) * b + f(3) * c + f(7) * (f(4) * b * b + f(5) * b * c + f(6) * c * c).sqrt();
        let calc = Calculation::new(dn, b, c, LigandField::zero(), PointGroup::Oh).unwrap();
        let s = calc.levels().unwrap();
        let found = s
            .levels
            .iter()
            .filter(|l| l.label() == term)
            .any(|l| (l.absolute_energy - expected).abs() < 1e-6);
        assert!(found, "d{dn} {term}: no level at {expected} ({})", &row[8]);
        checked += 1;
    }
    assert!(checked >= 17);
}

#[test]
fn d3_and_d8_octahedral_bands_match_lever_closed_forms() {
    // ν1 = 10Dq; ν2, ν3 = 7.5B + 15Dq ∓ ½(225B² + 100Dq² − 180B·Dq)^½
    // (A. B. P. Lever, Inorganic Electronic Spectroscopy, 2nd ed., 1984; d3 and d8 A2g ground).
    for (dn, mult, b, c, dq) in [
        (3usize, 4, 728.6, 3278.7, 1740.0),
        (8, 3, 906.7, 4269.6, 850.0),
        (3, 4, 657.0, 2956.5, 2155.0),
    ] {
        let s = oct(dn, b, c, dq);
        let root = (225.0 * b * b + 100.0 * dq * dq - 180.0 * b * dq).sqrt();
        assert_eq!(s.ground().label(), format!("{mult}A2g"));
        assert_abs_diff_eq!(
            energy_of(&s, &format!("{mult}T2g"), 1),
            10.0 * dq,
            epsilon = 1e-6
        );
        assert_abs_diff_eq!(
            energy_of(&s, &format!("{mult}T1g"), 1),
            7.5 * b + 15.0 * dq - 0.5 * root,
            epsilon = 1e-6
        );
        assert_abs_diff_eq!(
            energy_of(&s, &format!("{mult}T1g"), 2),
            7.5 * b + 15.0 * dq + 0.5 * root,
            epsilon = 1e-6
        );
    }
}

#[test]
fn d2_and_d7_octahedral_bands_match_closed_forms() {
    // T1g(F) ground: ν(T2g) = 5Dq − 7.5B + ½S, ν(A2g) = 15Dq − 7.5B + ½S, ν(T1g(P)) = S with
    // S = (225B² + 180B·Dq + 100Dq²)^½ (Lever 1984; Lever, J. Chem. Educ. 45, 711, 1968).
    for (dn, mult, b, c, dq) in [
        (2usize, 3, 613.5, 2711.7, 1910.2),
        (7, 4, 827.7, 3834.7, 921.5),
    ] {
        let s = oct(dn, b, c, dq);
        let root = (225.0 * b * b + 180.0 * b * dq + 100.0 * dq * dq).sqrt();
        assert_eq!(s.ground().label(), format!("{mult}T1g"));
        let t2 = energy_of(&s, &format!("{mult}T2g"), 1);
        let a2 = energy_of(&s, &format!("{mult}A2g"), 1);
        let t1p = energy_of(&s, &format!("{mult}T1g"), 2);
        assert_abs_diff_eq!(t2, 5.0 * dq - 7.5 * b + 0.5 * root, epsilon = 1e-6);
        assert_abs_diff_eq!(a2, 15.0 * dq - 7.5 * b + 0.5 * root, epsilon = 1e-6);
        assert_abs_diff_eq!(t1p, root, epsilon = 1e-6);
    }
}

#[test]
fn closed_form_band_predictions() {
    // Values computed from the Lever 1968 closed forms (A. B. P. Lever, J. Chem. Educ. 1968, 45,
    // 711) outside the engine:
    // [Cr(H2O)6]3+ Dq 1740, B 728.6 → ν3 = 38 529; [V(H2O)6]3+ 10Dq 19 102, B 613.5 → ν(A2g)
    // 36 902; [Co(H2O)6]2+ 10Dq 9 215, B 827.7 → ν(A2g) 17 315 (band positions: Lever 1984,
    // from memory).
    let cr = oct(3, 728.6, 4.5 * 728.6, 1740.0);
    assert!((energy_of(&cr, "4T1g", 2) - 38_529.0).abs() < 3.0);
    let v = oct(2, 613.5, 4.42 * 613.5, 1910.2);
    assert!((energy_of(&v, "3A2g", 1) - 36_902.0).abs() < 3.0);
    let co = oct(7, 827.7, 4.633 * 827.7, 921.5);
    assert!((energy_of(&co, "4A2g", 1) - 17_315.0).abs() < 3.0);
}

#[test]
fn d1_and_d9_have_one_transition_at_10dq() {
    // A single d–d transition at Δ = 10Dq (common practice).
    for (dn, ground, excited) in [(1usize, "2T2g", "2Eg"), (9, "2Eg", "2T2g")] {
        let s = oct(dn, 800.0, 3600.0, 2030.0);
        assert_eq!(s.levels.len(), 2);
        assert_eq!(s.ground().label(), ground);
        assert_eq!(s.levels[1].label(), excited);
        assert_abs_diff_eq!(s.levels[1].energy, 20_300.0, epsilon = 1e-8);
    }
}

#[test]
fn strong_field_limit_is_configuration_energy() {
    // t2g^x eg^y lies at (−4x + 6y)Dq when Dq ≫ B, C (common practice, crystal-field theory).
    for (dn, x, y) in [
        (6usize, 6, 0),
        (5, 5, 0),
        (4, 4, 0),
        (7, 6, 1),
        (8, 6, 2),
        (3, 3, 0),
    ] {
        let dq = 1.0e6;
        let s = oct(dn, 1.0, 4.0, dq);
        let per_dq = s.ground().absolute_energy / dq;
        assert_abs_diff_eq!(per_dq, -4.0 * x as f64 + 6.0 * y as f64, epsilon = 1e-3);
    }
}

#[test]
fn crossovers_match_reference_table() {
    // tests/reference/crossovers.csv (sources in its last column).
    let mut rdr = csv::Reader::from_path("tests/reference/crossovers.csv").unwrap();
    for row in rdr.records() {
        let row = row.unwrap();
        let dn: usize = row[0].parse().unwrap();
        let geometry: Geometry = row[1].parse().unwrap();
        let r: f64 = row[2].parse().unwrap();
        let expected: f64 = row[3].parse().unwrap();
        let tol: f64 = row[4].parse().unwrap();
        let x = crossover(dn, geometry, r).unwrap();
        let found = x.delta_over_b.expect("a crossover");
        assert!(
            (found - expected).abs() <= tol,
            "d{dn}: {found} vs {expected} ± {tol} ({})",
            &row[7]
        );
        assert_eq!(x.high_spin.term.to_string(), row[5]);
        assert_eq!(x.low_spin.unwrap().term.to_string(), row[6]);
    }
}

#[test]
fn no_crossover_for_d1_d2_d3_d8_d9_octahedral() {
    // Only d4–d7 have two possible ground-state spins in Oh (common practice).
    for dn in [0usize, 1, 2, 3, 8, 9, 10] {
        let x = crossover(dn, Geometry::Octahedral, 4.5).unwrap();
        assert!(x.delta_over_b.is_none(), "d{dn}");
        assert!(x.low_spin.is_none());
    }
}

#[test]
fn crossover_search_has_no_fixed_ceiling() {
    // In the strong-field limit the ground state of octahedral d⁶ is t2g⁶ ¹A1g for any C/B
    // (Y. Tanabe, S. Sugano, J. Phys. Soc. Jpn. 9, 766, 1954; common practice). A large C/B
    // pushes the crossover far out (≈ 77 B at C/B = 20), past the old fixed search limit of 60.
    let x = crossover(6, Geometry::Octahedral, 20.0).unwrap();
    let found = x.delta_over_b.expect("a crossover at large C/B");
    assert!(
        found > 60.0 && found < x.limit,
        "{found} vs bound {}",
        x.limit
    );
    assert_eq!(x.low_spin.unwrap().two_s, 0);
}

#[test]
fn nothing_changes_beyond_the_spin_change_bound() {
    // The bound (first- and second-order perturbation theory, A. Messiah, Quantum Mechanics
    // vol. 2, 1962; P.-O. Löwdin, J. Math. Phys. 3, 969, 1962): past it the ground spin equals
    // the spin of the strong-field limit, checked here at the bound and far beyond it.
    use spinstate::engine::crossover::{ground_spin_map, spin_change_bound};
    for geometry in [
        Geometry::Octahedral,
        Geometry::Tetrahedral,
        Geometry::SquarePlanar,
    ] {
        for dn in 2..=8usize {
            for c_over_b in [3.0, 4.5, 8.0] {
                let bound = spin_change_bound(dn, geometry, c_over_b).unwrap();
                assert!(
                    bound.is_finite() && bound < 1.0e4,
                    "d{dn} {geometry}: {bound}"
                );
                let map = ground_spin_map(dn, geometry, c_over_b).unwrap();
                let last = map.last().unwrap().1;
                for x in [bound * 1.001, 10.0 * bound, 1.0e3 * bound] {
                    let calc = Calculation::new(
                        dn,
                        1.0,
                        c_over_b,
                        geometry.field(x / 10.0, 0.0, 0.0).unwrap(),
                        geometry.point_group(0.0, 0.0),
                    )
                    .unwrap();
                    assert_eq!(
                        calc.ground_two_s().unwrap(),
                        last,
                        "d{dn} {geometry} C/B {c_over_b}: spin at Δ/B = {x} vs map {map:?}"
                    );
                }
            }
        }
    }
}

#[test]
fn tetrahedral_labels_carry_no_g() {
    // Td has no inversion centre, so no g/u labels (common practice).
    let calc = Calculation::new(
        7,
        780.0,
        3600.0,
        LigandField::tetrahedral(310.0),
        PointGroup::Td,
    )
    .unwrap();
    let s = calc.levels().unwrap();
    assert_eq!(s.ground().label(), "4A2");
    assert!(s
        .levels
        .iter()
        .all(|l| matches!(l.irrep, Irrep::Mulliken { gerade: false, .. })));
    // Td d7 ≡ Oh d3: first band at 10Dq (Lever 1984).
    assert_abs_diff_eq!(s.levels[1].energy, 3100.0, epsilon = 1e-6);
    assert_eq!(s.levels[1].label(), "4T2");
}

#[test]
fn parents_follow_levels_to_zero_field() {
    // [Cr(H2O)6]3+-like d3: 4T1g(F) and 4T1g(P) (common practice).
    let s = oct(3, 730.0, 3300.0, 1740.0);
    let t1: Vec<_> = s.levels.iter().filter(|l| l.label() == "4T1g").collect();
    assert_eq!(t1[0].parent, Some("4F".parse().unwrap()));
    assert_eq!(t1[1].parent, Some("4P".parse().unwrap()));
    // LS d6 ground 1A1g comes from 1I (Tanabe & Sugano 1954, from memory).
    let s = oct(6, 600.0, 2880.0, 2300.0);
    assert_eq!(s.ground().label(), "1A1g");
    assert_eq!(s.ground().parent, Some("1I".parse().unwrap()));
}

#[test]
fn spin_orbit_free_ion_follows_lande_interval_rule() {
    // E(J) − E(J−1) = λJ with λ = ζ/2S for less than half-filled shells (Landé interval rule;
    // Condon & Shortley, The Theory of Atomic Spectra, 1935). d2 3F: J = 2, 3, 4; λ = ζ/2.
    let zeta = 5.0;
    let calc = Calculation::new(2, 1000.0, 4000.0, LigandField::zero(), PointGroup::Oh).unwrap();
    let lv = calc.spin_orbit_levels(zeta).unwrap();
    assert_eq!(lv[0].degeneracy, 5);
    assert_eq!(lv[1].degeneracy, 7);
    assert_eq!(lv[2].degeneracy, 9);
    let lambda = zeta / 2.0;
    assert!((lv[1].energy - 3.0 * lambda).abs() < 0.01 * 3.0 * lambda);
    assert!((lv[2].energy - lv[1].energy - 4.0 * lambda).abs() < 0.01 * 4.0 * lambda);
}

#[test]
fn spin_orbit_levels_of_odd_dn_are_kramers_degenerate() {
    // Kramers' theorem: an odd number of electrons gives even degeneracy (common practice).
    let calc = Calculation::new(
        7,
        800.0,
        3700.0,
        LigandField::octahedral(920.0),
        PointGroup::Oh,
    )
    .unwrap();
    let lv = calc.spin_orbit_levels(533.0).unwrap();
    assert!(lv.iter().all(|l| l.degeneracy % 2 == 0));
    assert_eq!(lv.iter().map(|l| l.degeneracy).sum::<usize>(), 120);
    // The 4T1g ground term splits into 2 + 4 + 4 + 2 states (common practice).
    let low: Vec<usize> = lv.iter().take(4).map(|l| l.degeneracy).collect();
    assert_eq!(low.iter().sum::<usize>(), 12);
    assert!(lv
        .iter()
        .take(4)
        .all(|l| l.parent_level.to_string() == "4T1g"));
}

#[test]
fn spin_orbit_labels_of_the_d1_t2g_term() {
    // ²T₂g of t₂g¹ splits into Γ8 (four states) below Γ7 (two) by 3ζ/2 in the strong-field
    // limit (effective l = 1 with λ = −ζ; Figgis & Hitchman, Ligand Field Theory, 2000; from
    // memory).
    let zeta = 154.0;
    let calc = Calculation::new(
        1,
        700.0,
        3000.0,
        LigandField::octahedral(1.0e5),
        PointGroup::Oh,
    )
    .unwrap();
    let lv = calc.spin_orbit_levels(zeta).unwrap();
    assert_eq!(
        (Irrep::sum_text(&lv[0].irrep).as_str(), lv[0].degeneracy),
        ("Γ8g", 4)
    );
    assert_eq!(
        (Irrep::sum_text(&lv[1].irrep).as_str(), lv[1].degeneracy),
        ("Γ7g", 2)
    );
    assert!((lv[1].energy - 1.5 * zeta).abs() < 0.01 * zeta);
}

fn state_count(s: &Spectrum) -> usize {
    s.levels
        .iter()
        .map(|l| l.degeneracy * (l.two_s as usize + 1))
        .sum()
}

fn binomial(n: usize, k: usize) -> usize {
    (0..k).fold(1, |acc, i| acc * (n - i) / (i + 1))
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 24, .. ProptestConfig::default() })]

    #[test]
    fn hole_equivalence_oct_and_tet(dn in 0usize..=10, b in 300.0f64..1200.0,
                                    r in 3.5f64..5.5, dq in 0.0f64..3000.0) {
        // d^n in Oh ≡ d^(10−n) in Td with the same Dq, up to a constant shift (hole formalism;
        // Griffith 1961).
        let c = r * b;
        let a = Calculation::new(dn, b, c, LigandField::octahedral(dq), PointGroup::Oh)
            .unwrap().levels().unwrap();
        let h = Calculation::new(10 - dn, b, c, LigandField::tetrahedral(dq), PointGroup::Td)
            .unwrap().levels().unwrap();
        prop_assert_eq!(a.levels.len(), h.levels.len());
        for (x, y) in a.levels.iter().zip(&h.levels) {
            prop_assert!((x.energy - y.energy).abs() < 1e-6 * (1.0 + x.energy.abs()));
            prop_assert_eq!(x.two_s, y.two_s);
            // The O_h label is the T_d one with g.
            let with_g = match y.irrep {
                Irrep::Mulliken { species, gerade: false } => Irrep::mulliken(species, true),
                other => other,
            };
            prop_assert_eq!(x.irrep, with_g);
        }
    }

    #[test]
    fn level_count_equals_basis_size(dn in 0usize..=10, b in 300.0f64..1200.0,
                                     r in 3.5f64..5.5, dq in 0.0f64..3000.0,
                                     ds in -300.0f64..300.0, dt in -100.0f64..100.0) {
        // Σ (orbital degeneracy × (2S+1)) = C(10, n) (common practice).
        let c = r * b;
        for (field, group) in [
            (LigandField::octahedral(dq), PointGroup::Oh),
            (LigandField::tetragonal(dq, ds, dt), PointGroup::D4h),
            (LigandField::square_planar(dq), PointGroup::D4h),
        ] {
            let s = Calculation::new(dn, b, c, field, group).unwrap().levels().unwrap();
            prop_assert_eq!(state_count(&s), binomial(10, dn));
            prop_assert!(s.levels.iter().all(|l| l.irrep != Irrep::Unlabelled));
            prop_assert!(s.levels.windows(2).all(|w| w[0].energy <= w[1].energy));
        }
    }

    #[test]
    fn spin_orbit_levels_carry_double_group_labels(dn in 1usize..=9, b in 500.0f64..1100.0,
                                                   dq in 100.0f64..2500.0, zeta in 50.0f64..800.0,
                                                   which in 0usize..3) {
        // Every level decomposes into irreps of O′ or D₄′ whose dimensions add up to its
        // degeneracy (Bethe 1929; common practice): checks the spinor and orbital conventions.
        let (field, group) = match which {
            0 => (LigandField::octahedral(dq), PointGroup::Oh),
            1 => (LigandField::tetrahedral(dq / 2.0), PointGroup::Td),
            _ => (LigandField::tetragonal(dq, 0.2 * dq, 0.05 * dq), PointGroup::D4h),
        };
        let calc = Calculation::new(dn, b, 4.5 * b, field, group).unwrap();
        let lv = calc.spin_orbit_levels(zeta).unwrap();
        for l in &lv {
            prop_assert!(!l.irrep.is_empty(), "d{} {}: {:?}", dn, l.energy, l.irrep);
            let dims: usize = l.irrep.iter().map(|i| match i {
                Irrep::Bethe { n: 1 | 2, .. } => 1,
                Irrep::Bethe { n: 3, .. } if group != PointGroup::D4h => 2,
                Irrep::Bethe { n: 3 | 4, .. } if group == PointGroup::D4h => 1,
                Irrep::Bethe { n: 4 | 5, .. } if group != PointGroup::D4h => 3,
                Irrep::Bethe { n: 5..=7, .. } => 2,
                Irrep::Bethe { n: 8, .. } => 4,
                other => panic!("unexpected label {other}"),
            }).sum();
            prop_assert_eq!(dims, l.degeneracy);
        }
    }

    #[test]
    fn spin_orbit_trace_equals_sum_of_eigenvalues(dn in 1usize..=9, b in 400.0f64..1100.0,
                                                  dq in 0.0f64..2500.0, zeta in 0.0f64..900.0) {
        // Tr H = Σ eigenvalues, and ζ Σ l·s is traceless (common practice).
        let calc = Calculation::new(dn, b, 4.5 * b, LigandField::octahedral(dq), PointGroup::Oh)
            .unwrap();
        let with = calc.spin_orbit(zeta).unwrap();
        let without = calc.spin_orbit(0.0).unwrap();
        let sum = |s: &spinstate::engine::SpinOrbitSolution| -> f64 {
            s.blocks.iter().flat_map(|b| b.energies.iter()).sum()
        };
        let trace: f64 = with.blocks.iter().map(|blk| {
            (&blk.block.matrices().rep_b * b + &blk.block.matrices().rep_c * (4.5 * b)).trace()
        }).sum();
        prop_assert!((sum(&with) - sum(&without)).abs() < 1e-6 * (1.0 + trace.abs()));
        prop_assert_eq!(with.state_count(), binomial(10, dn));
    }
}

#[test]
fn cached_unit_matrices_are_symmetric() {
    // Every term of the Hamiltonian is Hermitian (here real symmetric in the cached bases).
    for dn in 0..=10 {
        for blk in shell(dn).blocks(true) {
            for m in [&blk.rep_b, &blk.rep_c, blk.l_squared()] {
                assert_abs_diff_eq!((m - m.transpose()).amax(), 0.0, epsilon = 1e-10);
            }
            let n = blk.basis.ncols();
            let overlap = blk.basis.transpose() * &blk.basis;
            assert_abs_diff_eq!(
                (overlap - nalgebra::DMatrix::<f64>::identity(n, n)).amax(),
                0.0,
                epsilon = 1e-10
            );
        }
    }
}

#[test]
fn angular_overlap_octahedron_matches_the_cubic_field() {
    // Six ligands on ±x, ±y, ±z with e_σ, e_π give Δo = 3e_σ − 4e_π (Schäffer & Jørgensen 1965;
    // Larsen & La Mar, J. Chem. Educ. 1974). Computed without symmetry (C1, one block per M_S)
    // the energies must equal the Oh calculation with the same Δ: checks the unblocked path.
    use nalgebra::Vector3;
    let (es, ep) = (7000.0, 900.0);
    let dirs = [
        Vector3::x(),
        -Vector3::x(),
        Vector3::y(),
        -Vector3::y(),
        Vector3::z(),
        -Vector3::z(),
    ];
    let ligs: Vec<_> = dirs.iter().map(|d| (*d, es, ep)).collect();
    let aom = LigandField::angular_overlap(&ligs).barycentred();
    let dq = (3.0 * es - 4.0 * ep) / 10.0;
    for dn in [2usize, 5, 6, 7] {
        let general = Calculation::new(dn, 800.0, 3600.0, aom, PointGroup::C1)
            .unwrap()
            .levels()
            .unwrap();
        let cubic = oct(dn, 800.0, 3600.0, dq);
        let expand = |s: &Spectrum| -> Vec<f64> {
            let mut v: Vec<f64> = s
                .levels
                .iter()
                .flat_map(|l| std::iter::repeat_n(l.energy, l.degeneracy))
                .collect();
            v.sort_by(f64::total_cmp);
            v
        };
        let (a, b) = (expand(&general), expand(&cubic));
        assert_eq!(a.len(), b.len());
        for (x, y) in a.iter().zip(&b) {
            assert!((x - y).abs() < 1e-6, "d{dn}: {x} vs {y}");
        }
        assert!(general
            .levels
            .iter()
            .all(|l| l.irrep == Irrep::mulliken(Species::A, false)));
    }
}
