//! `spinstate levels`: output contract and bad input.

use crate::common::*;
use approx::assert_abs_diff_eq;

#[test]
fn json_has_the_contract_fields() {
    let v = run_json(&[
        "levels",
        "--dn",
        "3",
        "--geometry",
        "oct",
        "--b",
        "728.6",
        "--c",
        "3278.7",
        "--dq",
        "1740",
        "--json",
    ]);
    let levels = v["levels"].as_array().unwrap();
    let first = &levels[0];
    for key in [
        "energy",
        "multiplicity",
        "label",
        "degeneracy",
        "parent",
        "spin_allowed",
    ] {
        assert!(first.get(key).is_some(), "missing {key}");
    }
    assert_eq!(first["label"], "4A2g");
    assert_eq!(first["multiplicity"], 4);
    assert_eq!(first["parent"], "4F");
    // ν1 = 10Dq for d3 (Lever 1984).
    let t2 = levels.iter().find(|l| l["label"] == "4T2g").unwrap();
    assert_abs_diff_eq!(t2["energy"].as_f64().unwrap(), 17_400.0, epsilon = 1e-6);
    assert_eq!(t2["spin_allowed"], true);
    let doublet = levels.iter().find(|l| l["multiplicity"] == 2).unwrap();
    assert_eq!(doublet["spin_allowed"], false);
}

#[test]
fn ratio_mode_reports_energies_in_units_of_b() {
    // Δ/B = 25 lies above the d6 crossover (≈ 20 at C/B 4.8; Tanabe & Sugano 1954, from memory):
    // 1A1g ground.
    let v = run_json(&[
        "levels",
        "--dn",
        "6",
        "--geometry",
        "oct",
        "--c-over-b",
        "4.8",
        "--delta-over-b",
        "25",
        "--json",
    ]);
    assert_eq!(v["energy_unit"], "B");
    assert_eq!(v["levels"][0]["label"], "1A1g");
}

#[test]
fn table_output_names_the_unit() {
    // Tetrahedral d2: 3A2 ground (the octahedral d8 term type without g; common practice).
    let (code, out, _) = run(&[
        "levels",
        "--dn",
        "2",
        "--geometry",
        "tet",
        "--b",
        "600",
        "--c",
        "2700",
        "--dq",
        "450",
    ]);
    assert_eq!(code, 0);
    assert!(out.contains("E (cm⁻¹)"));
    assert!(out.contains("3A2"));
}

#[test]
fn spin_orbit_levels_are_reported() {
    let v = run_json(&[
        "levels",
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
        "--json",
    ]);
    let levels = v["levels"].as_array().unwrap();
    // 4T1g of octahedral Co(II) splits into Γ6 + Γ8 + Γ8 + Γ7 with the Kramers doublet Γ6
    // lowest (Abragam & Bleaney, Electron Paramagnetic Resonance of Transition Ions, 1970;
    // from memory).
    assert_eq!(levels[0]["label"], "Γ6g");
    assert_eq!(levels[0]["from_level"], "4T1g");
    assert_eq!(levels[0]["degeneracy"], 2);
    let firsts: Vec<&str> = levels[..4]
        .iter()
        .map(|l| l["label"].as_str().unwrap())
        .collect();
    assert_eq!(firsts, ["Γ6g", "Γ8g", "Γ8g", "Γ7g"]);
    assert!(levels[0]["s_squared"].as_f64().unwrap() > 3.5);
}

#[test]
fn tetragonal_field_uses_d4h_labels() {
    let v = run_json(&[
        "levels",
        "--dn",
        "9",
        "--geometry",
        "oct",
        "--b",
        "1000",
        "--c",
        "4000",
        "--dq",
        "1250",
        "--ds",
        "600",
        "--dt",
        "150",
        "--json",
    ]);
    assert_eq!(v["point_group"], "D4h");
    // Elongated d9: hole in x²−y², ground 2B1g (common practice).
    assert_eq!(v["levels"][0]["label"], "2B1g");
}

/// Bad input: (arguments after `levels`, a fragment the one-line error must contain).
const BAD_INPUT: &[(&[&str], &str)] = &[
    (
        &[
            "--dn",
            "11",
            "--geometry",
            "oct",
            "--b",
            "1",
            "--c",
            "4",
            "--dq",
            "1",
        ],
        "--dn 11 is outside 0..=10",
    ),
    (
        &[
            "--dn",
            "3",
            "--geometry",
            "oct",
            "--b",
            "-5",
            "--c",
            "4",
            "--dq",
            "1",
        ],
        "--b -5 must be > 0",
    ),
    (
        &[
            "--dn",
            "3",
            "--geometry",
            "hex",
            "--b",
            "1",
            "--c",
            "4",
            "--dq",
            "1",
        ],
        "unknown geometry",
    ),
    (
        &[
            "--dn",
            "3",
            "--geometry",
            "oct",
            "--b",
            "NaN",
            "--c",
            "4",
            "--dq",
            "1",
        ],
        "not a finite number",
    ),
    (
        &["--dn", "3", "--geometry", "oct", "--b", "700", "--dq", "1"],
        "--b and --c go together",
    ),
    (
        &[
            "--dn",
            "3",
            "--geometry",
            "oct",
            "--b",
            "700",
            "--c",
            "3000",
            "--delta-over-b",
            "20",
        ],
        "not both",
    ),
    (
        &[
            "--dn",
            "3",
            "--geometry",
            "tet",
            "--b",
            "1",
            "--c",
            "4",
            "--dq",
            "1",
            "--ds",
            "1",
        ],
        "Ds and Dt apply to",
    ),
    (&["--dn", "3", "--geometry", "oct"], "give the field"),
];

#[test]
fn bad_input_is_rejected_with_exit_code_2() {
    for (args, needle) in BAD_INPUT {
        let mut full = vec!["levels"];
        full.extend_from_slice(args);
        expect_usage_error(&full, needle);
    }
}
