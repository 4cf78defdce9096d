//! The tetragonal (Dq, Ds, Dt, B) band fit: published closed forms of the D₄h field, round
//! trips on engine spectra for the Jahn–Teller and trans-[MX₂L₄] cases, and what the fit
//! refuses.

use approx::assert_abs_diff_eq;
use spinstate::engine::{Calculation, Geometry, Irrep, LigandField, Species};
use spinstate::spectra::tetragonal::{fit_tetragonal, TetragonalRequest};
use spinstate::spectra::transitions::band_manifold;
use spinstate::spectra::SpinChoice;
use std::time::Instant;

/// Transition energies of spin `two_s` from its lowest level, lowest first (cm⁻¹).
fn transitions(dn: usize, two_s: i32, dq: f64, ds: f64, dt: f64, b: f64, c: f64) -> Vec<f64> {
    let calc = Calculation::new(
        dn,
        b,
        c,
        LigandField::tetragonal(dq, ds, dt),
        Geometry::Tetragonal.point_group(ds, dt),
    )
    .unwrap();
    band_manifold(&calc.levels().unwrap(), two_s)
        .unwrap()
        .transitions
        .iter()
        .map(|t| t.energy)
        .collect()
}

fn request(dn: usize, bands: &[f64]) -> TetragonalRequest {
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

#[test]
fn d9_one_hole_closed_forms() {
    // One hole in the D4h field, elongated (hole in x²−y²): 2B1g → 2A1g = 4Ds + 5Dt,
    // → 2B2g = 10Dq, → 2Eg = 10Dq + 3Ds − 5Dt (A. B. P. Lever, Inorganic Electronic
    // Spectroscopy, 2nd ed., 1984, ch. 6; from memory).
    let (dq, ds, dt) = (1200.0, 1500.0, 400.0);
    let t = transitions(9, 1, dq, ds, dt, 800.0, 3200.0);
    assert_eq!(t.len(), 3);
    assert_abs_diff_eq!(t[0], 4.0 * ds + 5.0 * dt, epsilon = 1e-6);
    assert_abs_diff_eq!(t[1], 10.0 * dq, epsilon = 1e-6);
    assert_abs_diff_eq!(t[2], 10.0 * dq + 3.0 * ds - 5.0 * dt, epsilon = 1e-6);
}

#[test]
fn d8_b2g_component_is_ten_dq_exactly() {
    // trans-NiA4B2: 3B1g → 3B2g (from 3T2g) = 10Dq(xy) exactly, whatever Ds, Dt and B; the
    // 3Eg partner lies 35Dt/4 lower to first order (Lever 1984, ch. 6; from memory).
    for &(ds, dt) in &[(300.0, 150.0), (-200.0, -80.0), (600.0, 50.0)] {
        let calc = Calculation::new(
            8,
            900.0,
            3600.0,
            LigandField::tetragonal(1000.0, ds, dt),
            Geometry::Tetragonal.point_group(ds, dt),
        )
        .unwrap();
        let s = calc.levels().unwrap();
        let b2g = s
            .levels
            .iter()
            .find(|l| l.two_s == 2 && l.irrep == Irrep::mulliken(Species::B2, true))
            .unwrap();
        assert_abs_diff_eq!(b2g.energy - s.ground().energy, 10_000.0, epsilon = 1e-6);
    }
    // First order in Dt with Ds = 0: the 3Eg component of 3T2g at 10Dq − 35Dt/4.
    let dt = 10.0;
    let calc = Calculation::new(
        8,
        900.0,
        3600.0,
        LigandField::tetragonal(1000.0, 0.0, dt),
        Geometry::Tetragonal.point_group(0.0, dt),
    )
    .unwrap();
    let s = calc.levels().unwrap();
    let eg = s
        .levels
        .iter()
        .find(|l| l.two_s == 2 && l.irrep == Irrep::mulliken(Species::E, true))
        .unwrap();
    assert_abs_diff_eq!(eg.energy, 10_000.0 - 35.0 * dt / 4.0, epsilon = 2.0);
}

#[test]
fn copper_ii_three_bands_recover_dq_ds_dt() {
    // Synthetic elongated Cu(II) (round trip on the closed forms above).
    let (dq, ds, dt) = (1200.0, 1500.0, 400.0);
    let bands = [
        4.0 * ds + 5.0 * dt,
        10.0 * dq,
        10.0 * dq + 3.0 * ds - 5.0 * dt,
    ];
    let start = Instant::now();
    let out = fit_tetragonal(&request(9, &bands)).unwrap();
    eprintln!("d9 fit: {:?}", start.elapsed());
    let f = &out.best;
    assert_eq!(f.reference, "2B1g");
    assert!(f.exact());
    assert!(f.b.is_none());
    assert_abs_diff_eq!(f.dq, dq, epsilon = 0.5);
    assert_abs_diff_eq!(f.ds, ds, epsilon = 0.5);
    assert_abs_diff_eq!(f.dt, dt, epsilon = 0.5);
    assert!(f.rms < 0.1, "rms {}", f.rms);
    assert!(f.distortion().contains("weaker"));
    assert_abs_diff_eq!(f.dq_axial(), dq - 1.75 * dt, epsilon = 1.0);
}

#[test]
fn high_spin_d4_jahn_teller_round_trip() {
    // Synthetic high-spin Mn(III): the 5Eg ground term split by an elongation; the quintet
    // bands depend on Dq, Ds, Dt only (one quintet free-ion term, 5D: common practice).
    let (dq, ds, dt) = (2100.0, 1100.0, 250.0);
    let t = transitions(4, 4, dq, ds, dt, 900.0, 3600.0);
    assert_eq!(t.len(), 3);
    let out = fit_tetragonal(&request(4, &t)).unwrap();
    let f = &out.best;
    assert_eq!(f.spin_state.two_s, 4);
    assert!(f.b.is_none());
    assert_abs_diff_eq!(f.dq, dq, epsilon = 1.0);
    assert_abs_diff_eq!(f.ds, ds, epsilon = 1.0);
    assert_abs_diff_eq!(f.dt, dt, epsilon = 1.0);
}

#[test]
fn trans_nickel_ii_four_bands_free_b() {
    // Synthetic trans-[NiX2L4]: the four lowest triplet transitions fix Dq, Ds, Dt and B.
    let (dq, ds, dt, b) = (1000.0, 300.0, 150.0, 900.0);
    let t = transitions(8, 2, dq, ds, dt, b, 4.71 * b);
    let bands = &t[..4];
    let start = Instant::now();
    let out = fit_tetragonal(&request(8, bands)).unwrap();
    eprintln!("d8 fit: {:?}", start.elapsed());
    let f = &out.best;
    assert_eq!(f.spin_state.two_s, 2);
    assert!(f.rms < 1.0, "rms {} ({:?})", f.rms, f.assigned);
    assert_abs_diff_eq!(f.dq, dq, epsilon = 2.0);
    assert_abs_diff_eq!(f.ds, ds, epsilon = 2.0);
    assert_abs_diff_eq!(f.dt, dt, epsilon = 2.0);
    assert_abs_diff_eq!(f.b.unwrap(), b, epsilon = 2.0);
}

#[test]
fn trans_cobalt_iii_needs_b_held_with_three_bands() {
    // Low-spin d6 trans-[CoX2(N)4]+: three singlet bands cannot fix Dq, Ds, Dt and B.
    let (dq, ds, dt, b) = (2300.0, 400.0, 300.0, 600.0);
    let t = transitions(6, 0, dq, ds, dt, b, 4.81 * b);
    let mut req = request(6, &t[..3]);
    req.spin = SpinChoice::Low;
    let e = fit_tetragonal(&req).unwrap_err().to_string();
    assert!(e.contains("hold B"), "{e}");
    req.fixed_b = Some(b);
    let f = fit_tetragonal(&req).unwrap().best;
    assert_eq!(f.spin_state.two_s, 0);
    assert_abs_diff_eq!(f.dq, dq, epsilon = 2.0);
    assert_abs_diff_eq!(f.ds, ds, epsilon = 2.0);
    assert_abs_diff_eq!(f.dt, dt, epsilon = 2.0);
}

#[test]
fn too_few_bands_are_refused_with_the_parameters_named() {
    let e = fit_tetragonal(&request(9, &[12_000.0, 15_000.0]))
        .unwrap_err()
        .to_string();
    assert!(e.contains("Dq, Ds, Dt"), "{e}");
}

#[test]
fn beta_above_one_is_never_the_lead() {
    // A free-ion B0 below the true B makes the exact solution unphysical (β > 1): it is
    // flagged, and a physical assignment leads when there is one.
    let (dq, ds, dt, b) = (1000.0, 300.0, 150.0, 900.0);
    let t = transitions(8, 2, dq, ds, dt, b, 4.71 * b);
    let mut req = request(8, &t[..4]);
    req.b0 = Some(850.0);
    let out = fit_tetragonal(&req).unwrap();
    for (alt, near) in &out.alternatives {
        if alt.unphysical {
            assert!(!near);
        }
    }
    if out.best.unphysical {
        assert!(out.alternatives.iter().all(|(a, _)| a.unphysical));
    }
}

#[test]
fn over_determined_nickel_ii_gives_uncertainties_that_cover_the_truth() {
    // All six triplet transitions of a synthetic trans-[NiX2L4], each moved by ±60 cm⁻¹ (a
    // typical error of a band maximum, common practice): the fit returns 1σ uncertainties and
    // the true values lie within 4σ.
    let (dq, ds, dt, b) = (1000.0, 300.0, 150.0, 900.0);
    let t = transitions(8, 2, dq, ds, dt, b, 4.71 * b);
    assert_eq!(t.len(), 6);
    let noisy: Vec<f64> = t
        .iter()
        .enumerate()
        .map(|(i, e)| e + if i % 2 == 0 { 60.0 } else { -60.0 })
        .collect();
    let f = fit_tetragonal(&request(8, &noisy)).unwrap().best;
    assert_eq!(f.dof, 2);
    let u = f.uncertainties;
    for (value, truth, sd) in [
        (f.dq, dq, u.dq),
        (f.ds, ds, u.ds),
        (f.dt, dt, u.dt),
        (f.b.unwrap(), b, u.b),
    ] {
        let sd = sd.expect("uncertainty when over-determined");
        assert!(
            sd > 0.0 && (value - truth).abs() < 4.0 * sd + 1.0,
            "{value} vs {truth} ± {sd}"
        );
    }
}
