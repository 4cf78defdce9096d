//! The fast Zeeman sums (real arithmetic, one transform for several κ) against the complex
//! reference path, and a low-symmetry field (complex eigenvectors) against the independent
//! finite-field route. Both checks are common practice for a change of arithmetic: the van Vleck
//! sums (J. H. van Vleck, *The Theory of Electric and Magnetic Susceptibilities*, 1932) do not
//! depend on the phase convention of the eigenvectors.

use nalgebra::Vector3;
use spinstate::engine::{Calculation, LigandField, PointGroup};
use spinstate::magnetism::{finite_field_chi, MagneticModel, ZeemanLevels};

fn model(zeta: f64, kappa: f64) -> MagneticModel {
    MagneticModel {
        zeta,
        kappa,
        reduce_zeta: false,
        g_spin: 2.0023,
    }
}

fn cases() -> Vec<(Calculation, f64)> {
    let mut out = Vec::new();
    for dn in 1..=9 {
        out.push((
            Calculation::new(
                dn,
                800.0,
                3600.0,
                LigandField::octahedral(1500.0),
                PointGroup::Oh,
            )
            .unwrap(),
            400.0,
        ));
        out.push((
            Calculation::new(
                dn,
                750.0,
                3300.0,
                LigandField::tetrahedral(450.0),
                PointGroup::Td,
            )
            .unwrap(),
            300.0,
        ));
    }
    for dn in [4, 6, 7] {
        out.push((
            Calculation::new(
                dn,
                850.0,
                3800.0,
                LigandField::tetragonal(1200.0, 250.0, 90.0),
                PointGroup::D4h,
            )
            .unwrap(),
            500.0,
        ));
    }
    out
}

fn assert_same(a: &ZeemanLevels, b: &ZeemanLevels, what: &str) {
    assert_eq!(a.energies, b.energies, "{what}");
    assert_eq!(a.degeneracy, b.degeneracy, "{what}");
    let scale = |x: &[[f64; 3]]| x.iter().flatten().fold(1.0_f64, |m, v| m.max(v.abs()));
    for (name, x, y) in [
        ("first order", &a.first_order, &b.first_order),
        ("trace", &a.trace, &b.trace),
        ("second order", &a.second_order, &b.second_order),
    ] {
        let s = scale(x).max(scale(y));
        for (u, v) in x.iter().flatten().zip(y.iter().flatten()) {
            assert!((u - v).abs() <= 1e-11 * s, "{what} {name}: {u} vs {v}");
        }
    }
}

#[test]
fn real_sums_equal_complex_sums() {
    for (calc, zeta) in cases() {
        let m = model(zeta, 0.8);
        let solution = calc.spin_orbit(zeta).unwrap();
        let fast = ZeemanLevels::from_solution(&calc, &solution, &m).unwrap();
        let reference = ZeemanLevels::from_solution_complex(&calc, &solution, &m).unwrap();
        assert_same(&fast, &reference, &format!("d{} {:?}", calc.dn, calc.group));
    }
}

#[test]
fn several_models_share_one_transform() {
    for (calc, zeta) in cases().into_iter().step_by(3) {
        let solution = calc.spin_orbit(zeta).unwrap();
        let models = [model(zeta, 0.7), model(zeta, 1.0), model(zeta, 0.85)];
        let together = ZeemanLevels::from_solution_models(&calc, &solution, &models).unwrap();
        assert_eq!(together.len(), models.len());
        for (m, t) in models.iter().zip(&together) {
            let single = ZeemanLevels::from_solution_complex(&calc, &solution, m).unwrap();
            assert_same(t, &single, &format!("d{} κ = {}", calc.dn, m.kappa));
        }
    }
}

#[test]
fn low_symmetry_field_agrees_with_finite_field() {
    // A distorted six-coordinate AOM field with no fourfold axis (one block, complex
    // eigenvectors in general).
    let donors = [
        (Vector3::new(1.0, 0.1, 0.05), 3800.0, 600.0),
        (Vector3::new(-1.0, 0.05, -0.1), 3500.0, 500.0),
        (Vector3::new(0.1, 1.0, 0.2), 4200.0, 700.0),
        (Vector3::new(-0.05, -1.0, 0.1), 3900.0, 650.0),
        (Vector3::new(0.2, 0.1, 1.0), 4600.0, 300.0),
        (Vector3::new(-0.1, 0.2, -1.0), 4100.0, 900.0),
    ];
    let field = LigandField::angular_overlap(&donors).barycentred();
    let calc = Calculation::new(7, 820.0, 3700.0, field, PointGroup::C1).unwrap();
    let m = model(500.0, 0.9);
    let z = ZeemanLevels::compute(&calc, &m).unwrap();
    for t in [5.0, 300.0] {
        let p = z.at(t).unwrap();
        for axis in 0..3 {
            let ff = finite_field_chi(&calc, &m, t, axis).unwrap();
            let rel = (p.chi_axes[axis] - ff).abs() / ff.abs();
            assert!(
                rel < 1e-5,
                "T = {t} axis {axis}: {} vs {ff}",
                p.chi_axes[axis]
            );
        }
    }
}

#[test]
fn sums_up_to_a_temperature_agree_with_complete_sums() {
    // Levels weighted by less than e^-40 at T_max are left out; every χ at or below T_max must
    // agree with the complete sums to 1e-10 (matrix products of other shapes round differently),
    // and a higher T must be refused. Boltzmann weights in the van Vleck sums (van Vleck 1932,
    // as in the module header; the cut-off itself is common practice).
    let mut checked_truncation = false;
    for (calc, zeta) in cases().into_iter().chain(std::iter::once((
        Calculation::new(
            6,
            844.0,
            4049.0,
            LigandField::octahedral(1040.0),
            PointGroup::Oh,
        )
        .unwrap(),
        400.0,
    ))) {
        let m = model(zeta, 0.9);
        let full = ZeemanLevels::compute(&calc, &m).unwrap();
        let partial = ZeemanLevels::compute_up_to(&calc, &m, 300.0).unwrap();
        assert_eq!(partial.highest_temperature, 300.0);
        checked_truncation |= partial
            .first_order
            .iter()
            .zip(&full.first_order)
            .any(|(p, f)| p != f);
        for t in [2.0, 77.0, 300.0] {
            let (a, b) = (full.at(t).unwrap(), partial.at(t).unwrap());
            assert!(
                (a.chi - b.chi).abs() <= 1e-10 * a.chi.abs(),
                "d{} {:?} at {t} K: {} vs {}",
                calc.dn,
                calc.group,
                a.chi,
                b.chi
            );
        }
        assert!(partial.at(301.0).is_err());
    }
    assert!(checked_truncation, "no case left a level out");
}
