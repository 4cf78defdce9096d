//! `spinstate crossover`: JSON contract, table and bad input.

use crate::common::*;

#[test]
fn all_octahedral_dn_in_json() {
    let v = run_json(&["crossover", "--json"]);
    let rows = v["crossovers"].as_array().unwrap();
    assert_eq!(rows.len(), 11);
    let d6 = &rows[6];
    assert_eq!(d6["dn"], 6);
    assert_eq!(d6["geometry"], "oct");
    assert_eq!(d6["c_over_b"], 4.8);
    // ≈ 20 at the Tanabe–Sugano C/B (commonly quoted; Tanabe & Sugano 1954, from memory).
    let x = d6["delta_over_b"].as_f64().unwrap();
    assert!((x - 20.0).abs() < 0.1, "{x}");
    assert_eq!(d6["high_spin_term"], "5T2g");
    assert_eq!(d6["low_spin_term"], "1A1g");
    assert!(rows[3]["delta_over_b"].is_null());
    assert!(rows[3]["low_spin_term"].is_null());
}

#[test]
fn one_dn_at_a_chosen_ratio() {
    // Tetrahedral d^n has the term types of octahedral d^(10−n) without g: d5 6A1 / 2T2
    // (common practice; octahedral terms from Pollock et al., J. Am. Chem. Soc. 2014, Table 2).
    let v = run_json(&[
        "crossover",
        "--dn",
        "5",
        "--geometry",
        "tet",
        "--c-over-b",
        "4.477",
        "--json",
    ]);
    let row = &v["crossovers"][0];
    assert_eq!(row["high_spin_term"], "6A1");
    assert_eq!(row["low_spin_term"], "2T2");
}

/// Bad input: (arguments after `crossover`, a fragment the one-line error must contain).
const BAD_INPUT: &[(&[&str], &str)] = &[
    (&["--dn", "12"], "outside 0..=10"),
    (&["--c-over-b", "-1"], "must be a ratio > 0"),
    (&["--geometry", "cube"], "unknown geometry"),
];

#[test]
fn bad_input() {
    for (args, needle) in BAD_INPUT {
        let mut full = vec!["crossover"];
        full.extend_from_slice(args);
        expect_usage_error(&full, needle);
    }
}
