//! `spinstate magnetism`: JSON contract, CSV/SVG files and bad input.

use crate::common::*;

#[test]
fn json_points_have_the_contract_names() {
    let v = run_json(&[
        "magnetism",
        "--dn",
        "7",
        "--geometry",
        "oct",
        "--b",
        "800",
        "--c",
        "3700",
        "--dq",
        "920",
        "--zeta",
        "533",
        "--kappa",
        "0.9",
        "--tmin",
        "2",
        "--tmax",
        "300",
        "--points",
        "300",
        "--json",
    ]);
    let pts = v["points"].as_array().unwrap();
    assert_eq!(pts.len(), 300);
    for key in ["t", "chi", "chi_t", "mu_eff"] {
        assert!(pts[0].get(key).is_some(), "{key}");
    }
    assert_eq!(pts[0]["t"], 2.0);
    assert_eq!(pts[299]["t"], 300.0);
    // χT = χ·T for every point.
    for p in pts {
        let (t, chi, chi_t) = (
            p["t"].as_f64().unwrap(),
            p["chi"].as_f64().unwrap(),
            p["chi_t"].as_f64().unwrap(),
        );
        assert!((chi * t - chi_t).abs() < 1e-12 * chi_t.abs().max(1.0));
    }
    // High-spin octahedral Co(II): 4.7–5.2 μB at room temperature (Figgis & Lewis 1960, from
    // memory), well above the spin-only 3.87.
    let mu = pts[299]["mu_eff"].as_f64().unwrap();
    assert!((4.7..=5.2).contains(&mu), "{mu}");
    assert_eq!(v["orbital_triplet_ground"], true);
}

#[test]
fn csv_and_svg_files() {
    let dir = tempfile::tempdir().unwrap();
    let csv = dir.path().join("m.csv");
    let svg = dir.path().join("m.svg");
    let (code, _, err) = run(&[
        "magnetism",
        "--dn",
        "1",
        "--geometry",
        "oct",
        "--b",
        "700",
        "--c",
        "3000",
        "--dq",
        "2000",
        "--zeta",
        "154",
        "--points",
        "20",
        "--csv",
        csv.to_str().unwrap(),
        "--svg",
        svg.to_str().unwrap(),
    ]);
    assert_eq!(code, 0, "{err}");
    let text = std::fs::read_to_string(&csv).unwrap();
    assert!(text.starts_with("t_k,chi_cm3_per_mol,chi_t_cm3_k_per_mol,mu_eff_bohr"));
    assert_eq!(text.lines().count(), 21);
    assert!(std::fs::read_to_string(&svg).unwrap().contains("μ_eff"));
}

/// The d⁷ field every bad-input case but the last two starts from.
const D7: [&str; 10] = [
    "--dn",
    "7",
    "--geometry",
    "oct",
    "--b",
    "800",
    "--c",
    "3700",
    "--dq",
    "920",
];

/// Bad input: (arguments after `magnetism`, then more arguments, a fragment the one-line error
/// must contain).
const BAD_INPUT: &[(&[&str], &[&str], &str)] = &[
    (&D7, &["--kappa", "1.4"], "κ = 1.4"),
    (&D7, &["--tmin", "0"], "0 < tmin"),
    (&D7, &["--tmin", "300", "--tmax", "10"], "0 < tmin ≤ tmax"),
    (&D7, &["--zeta", "-3"], "--zeta -3"),
    (&["--geometry", "oct"], &[], "give --dn"),
    (
        &[
            "--metal",
            "Qx",
            "--ox",
            "2",
            "--geometry",
            "oct",
            "--ligand",
            "H2O:6",
        ],
        &[],
        "unknown metal",
    ),
];

#[test]
fn bad_input() {
    for (args, more, needle) in BAD_INPUT {
        let mut full = vec!["magnetism"];
        full.extend_from_slice(args);
        full.extend_from_slice(more);
        expect_usage_error(&full, needle);
    }
}

#[test]
fn from_a_complex_uses_the_tables() {
    // [Co(H2O)6]2+: ζ from the ion table (Figgis 1966, from memory); high-spin d7 with a T
    // ground term, so μ_eff rises with T well above spin-only (Figgis & Lewis 1960, from memory).
    let v = run_json(&[
        "magnetism",
        "--metal",
        "Co",
        "--ox",
        "2",
        "--geometry",
        "oct",
        "--ligand",
        "H2O:6",
        "--points",
        "3",
        "--json",
    ]);
    assert_eq!(v["dn"], 7);
    assert_eq!(v["zeta"], 533.0);
    let pts = v["points"].as_array().unwrap();
    let (low, high) = (
        pts[0]["mu_eff"].as_f64().unwrap(),
        pts[2]["mu_eff"].as_f64().unwrap(),
    );
    assert!(high > low + 0.8, "{low} → {high}");
    assert!(high > v["spin_only_moment"].as_f64().unwrap() + 1.0);
}

#[test]
fn si_units_on_request() {
    // χ(SI, m³ mol⁻¹) = 4π×10⁻⁶ χ(cgs, cm³ mol⁻¹) (CRC Handbook of Chemistry and Physics,
    // "multiply by 4π for SI"); μ_eff does not depend on the unit system.
    let args = |units: &'static str| {
        vec![
            "magnetism",
            "--dn",
            "7",
            "--geometry",
            "oct",
            "--b",
            "800",
            "--c",
            "3700",
            "--dq",
            "920",
            "--zeta",
            "533",
            "--points",
            "2",
            "--units",
            units,
            "--json",
        ]
    };
    let cgs = run_json(&args("cgs"));
    let si = run_json(&args("si"));
    assert_eq!(si["units"], "si");
    let (a, b) = (
        cgs["points"][1]["chi"].as_f64().unwrap(),
        si["points"][1]["chi"].as_f64().unwrap(),
    );
    assert!((b / a - 4.0 * std::f64::consts::PI * 1e-6).abs() < 1e-15);
    assert_eq!(cgs["points"][1]["mu_eff"], si["points"][1]["mu_eff"]);
}
