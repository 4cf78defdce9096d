//! `spinstate fit-bands`: published examples, output contract and bad input.

use crate::common::*;
use approx::assert_abs_diff_eq;

fn fit(dn: &str, bands: &str, extra: &[&str]) -> serde_json::Value {
    let mut args = vec![
        "fit-bands",
        "--dn",
        dn,
        "--geometry",
        "oct",
        "--bands",
        bands,
        "--json",
    ];
    args.extend_from_slice(extra);
    run_json(&args)
}

#[test]
fn published_examples_from_reference_table() {
    // tests/reference/band_fits.csv: band maxima and fitted parameters with their sources.
    let mut rdr = csv::Reader::from_path("tests/reference/band_fits.csv").unwrap();
    let mut checked = 0;
    for row in rdr.records() {
        let row = row.unwrap();
        let (case, dn, geometry, bands, options, quantity, expected, tol) = (
            &row[0], &row[1], &row[2], &row[3], &row[4], &row[5], &row[6], &row[7],
        );
        let mut args = vec![
            "fit-bands",
            "--dn",
            dn,
            "--geometry",
            geometry,
            "--bands",
            bands,
            "--json",
        ];
        args.extend(options.split_whitespace());
        let v = run_json(&args);
        let got = if quantity == "spin_state" {
            assert_eq!(v["spin_state"], expected, "{case}");
            checked += 1;
            continue;
        } else if let Some(label) = quantity.strip_prefix("predicted:") {
            v["predicted"]
                .as_array()
                .unwrap()
                .iter()
                .find(|p| p["label"] == label)
                .unwrap_or_else(|| panic!("{case}: no predicted {label}"))["energy"]
                .as_f64()
                .unwrap()
        } else {
            v[quantity]
                .as_f64()
                .unwrap_or_else(|| panic!("{case}: {quantity} missing"))
        };
        let expected: f64 = expected.parse().unwrap();
        let tol: f64 = tol.parse().unwrap();
        assert!(
            (got - expected).abs() <= tol,
            "{case}: {quantity} = {got}, expected {expected} ± {tol} ({})",
            &row[8]
        );
        checked += 1;
    }
    assert!(checked >= 25);
}

#[test]
fn json_has_the_contract_fields() {
    let v = fit("3", "17400,24600,37800", &["--b0", "918"]);
    for key in [
        "dq",
        "delta",
        "b",
        "c",
        "delta_over_b",
        "beta",
        "assignment",
        "residuals",
        "spin_state",
        "uncertainties",
        "determination",
        "fixed",
        "predicted",
        "alternatives",
        "spin_check",
    ] {
        assert!(v.get(key).is_some(), "missing {key}");
    }
    assert_eq!(v["determination"], "over-determined");
    assert_eq!(v["degrees_of_freedom"], 1);
    assert!(v["uncertainties"]["b"].as_f64().unwrap() > 0.0);
    // β = B/B0 with B0(Cr3+) = 918 cm⁻¹ (W. L. Jolly, Modern Inorganic Chemistry, 1989,
    // p. 411, as reproduced).
    let b = v["b"].as_f64().unwrap();
    assert_abs_diff_eq!(v["beta"].as_f64().unwrap(), b / 918.0, epsilon = 1e-12);
    // Residuals are observed − calculated and listed per band.
    let res = v["residuals"].as_array().unwrap();
    assert_eq!(res.len(), 3);
    let a0 = &v["assignment"][0];
    assert_abs_diff_eq!(
        res[0].as_f64().unwrap(),
        a0["observed"].as_f64().unwrap() - a0["calculated"].as_f64().unwrap(),
        epsilon = 1e-9
    );
    assert_eq!(a0["transition"], "4A2g → 4T2g");
    // C does not enter the quartet bands of d3: not reported as fitted.
    assert!(v["c"].is_null());
}

#[test]
fn units_give_the_same_fit() {
    // ν̃ = 10⁷/λ (nm); 1 kK = 1000 cm⁻¹; 1 eV = 8065.544 cm⁻¹ (CODATA, from memory).
    let reference = fit("3", "17400,24600", &[]);
    let b = reference["b"].as_f64().unwrap();
    let nm = format!("{},{}", 1e7 / 17_400.0, 1e7 / 24_600.0);
    let ev = format!("{},{}", 17_400.0 / 8_065.543_937, 24_600.0 / 8_065.543_937);
    for (bands, unit) in [
        (nm.as_str(), "nm"),
        ("17.4,24.6", "kK"),
        (ev.as_str(), "eV"),
    ] {
        let v = fit("3", bands, &["--units", unit]);
        assert_abs_diff_eq!(v["b"].as_f64().unwrap(), b, epsilon = 1e-6);
        assert_eq!(v["input_unit"], unit);
    }
}

#[test]
fn table_states_what_was_fixed() {
    let (code, out, _) = run(&[
        "fit-bands",
        "--dn",
        "6",
        "--geometry",
        "oct",
        "--bands",
        "21000,29500",
    ]);
    assert_eq!(code, 0);
    assert!(out.contains("exactly determined"), "{out}");
    assert!(out.contains("C/B = 4.800"), "{out}");
    assert!(out.contains("Tanabe & Sugano"), "{out}");
    assert!(out.contains("1A1g → 1T1g"), "{out}");
    assert!(out.contains("low-spin side"), "{out}");
}

#[test]
fn alternatives_are_reported_with_their_concerns() {
    // [V(H2O)6]3+: assigning 17 800/25 700 to 3T1g(P)/3A2g also reproduces both bands but leaves
    // the strong 3T2g band inside the observed range unassigned.
    let v = fit("2", "17800,25700", &[]);
    let alts = v["alternatives"].as_array().unwrap();
    assert!(!alts.is_empty());
    let odd = alts
        .iter()
        .find(|a| a["assignment"][0] == "3T1g(P)")
        .expect("3T1g(P) alternative");
    assert!(odd["rms"].as_f64().unwrap() < 1.0);
    assert_eq!(odd["near_equal"], false);
    assert!(odd["concerns"][0].as_str().unwrap().contains("3T2g"));
}

#[test]
fn fixed_b_allows_one_band() {
    let v = fit("3", "17400", &["--b", "728.6"]);
    assert_abs_diff_eq!(v["delta"].as_f64().unwrap(), 17_400.0, epsilon = 1e-3);
    assert_eq!(v["determination"], "exact");
    assert_eq!(v["fixed"][0]["name"], "B");
}

#[test]
fn metal_and_oxidation_state_give_dn_and_b0() {
    // B0(Cr3+) = 918 cm⁻¹ (Jolly, Modern Inorganic Chemistry 1989, p. 411, as reproduced;
    // data/ions.csv); [Cr(H2O)6]3+ β ≈ 0.79 (C. K. Jørgensen's h and k factors, 1962, from memory).
    let v = run_json(&[
        "fit-bands",
        "--metal",
        "Cr",
        "--ox",
        "3",
        "--geometry",
        "oct",
        "--bands",
        "17400,24600",
        "--json",
    ]);
    assert_eq!(v["dn"], 3);
    assert_abs_diff_eq!(v["b0"].as_f64().unwrap(), 918.0, epsilon = 1e-9);
    assert_abs_diff_eq!(v["beta"].as_f64().unwrap(), 0.79, epsilon = 0.01);
    assert!(v["b0_source"].as_str().unwrap().contains("Jolly"));
    let notes = v["notes"].as_array().unwrap();
    assert!(notes
        .iter()
        .any(|n| n.as_str().unwrap().starts_with("caution:")));
}

#[test]
fn help_carries_a_safety_note() {
    let (code, out, _) = run(&["fit-bands", "--help"]);
    assert_eq!(code, 0);
    assert!(out.contains("Safety"), "{out}");
}

/// Bad input: (arguments after `fit-bands`, a fragment the one-line error must contain).
const BAD_INPUT: &[(&[&str], &str)] = &[
    (
        &["--dn", "3", "--geometry", "oct", "--bands", "17400"],
        "--b",
    ),
    (
        &[
            "--dn",
            "3",
            "--geometry",
            "oct",
            "--bands",
            "17400,24600",
            "--units",
            "furlong",
        ],
        "--units",
    ),
    (
        &["--dn", "3", "--geometry", "oct", "--bands", "17400,abc"],
        "not a number",
    ),
    (
        &["--dn", "3", "--geometry", "oct", "--bands", "17400,-24600"],
        "positive",
    ),
    (
        &[
            "--dn",
            "3",
            "--geometry",
            "oct",
            "--bands",
            "17400,24600,90000",
        ],
        "misses it by",
    ),
    (
        &[
            "--dn",
            "3",
            "--geometry",
            "oct",
            "--bands",
            "17400,24600,37800",
            "--fit-c",
        ],
        "C/B",
    ),
    (
        &["--dn", "3", "--geometry", "oct", "--bands", "500,900"],
        "needs B =",
    ),
    (
        &[
            "--dn",
            "3",
            "--geometry",
            "tetragonal",
            "--bands",
            "17400,24600",
        ],
        "at least 4 to determine Dq, Ds, Dt, B",
    ),
    (
        &["--dn", "3", "--geometry", "oct", "--bands", "1,2,3,4"],
        "at most 3",
    ),
    (
        &[
            "--dn",
            "3",
            "--geometry",
            "oct",
            "--bands",
            "17400,24600",
            "--spin",
            "medium",
        ],
        "--spin",
    ),
    (
        &[
            "--dn",
            "3",
            "--geometry",
            "oct",
            "--bands",
            "17400,24600",
            "--b0",
            "-5",
        ],
        "--b0",
    ),
    // High-spin d5 is fitted on its quartet bands: one band cannot fix Dq and B.
    (
        &[
            "--dn",
            "5",
            "--geometry",
            "oct",
            "--bands",
            "18000",
            "--spin",
            "high",
        ],
        "at least 2",
    ),
    (
        &["--dn", "0", "--geometry", "oct", "--bands", "18000"],
        "--dn",
    ),
    (
        &["--dn", "3", "--geometry", "hexagonal", "--bands", "18000"],
        "--geometry",
    ),
    // A metal and oxidation state instead of d^n.
    (
        &[
            "--metal",
            "Xx",
            "--ox",
            "3",
            "--geometry",
            "oct",
            "--bands",
            "17400,24600",
        ],
        "unknown metal",
    ),
    (
        &[
            "--metal",
            "Cr",
            "--ox",
            "3",
            "--dn",
            "4",
            "--geometry",
            "oct",
            "--bands",
            "17400,24600",
        ],
        "disagrees",
    ),
    // Two bands cannot fix Dq, Ds and Dt; three singlet bands of low-spin d6 cannot fix B too.
    (
        &[
            "--dn",
            "9",
            "--geometry",
            "tetragonal",
            "--bands",
            "12000,15000",
        ],
        "Dq, Ds, Dt",
    ),
    (
        &[
            "--dn",
            "6",
            "--geometry",
            "tetragonal",
            "--spin",
            "low",
            "--bands",
            "16000,22000,26000",
        ],
        "--b",
    ),
    (
        &[
            "--dn",
            "8",
            "--geometry",
            "tetragonal",
            "--bands",
            "8000,12000,14000,16000",
            "--fit-c",
        ],
        "--c-over-b",
    ),
];

#[test]
fn bad_input_is_rejected_with_exit_code_2() {
    for (args, needle) in BAD_INPUT {
        let mut full = vec!["fit-bands"];
        full.extend_from_slice(args);
        expect_usage_error(&full, needle);
    }
    // Conflicting options are a usage error from the parser (exit code 2).
    let (code, _, _) = run(&[
        "fit-bands",
        "--dn",
        "3",
        "--geometry",
        "oct",
        "--bands",
        "1,2,3",
        "--fit-c",
        "--c-over-b",
        "4",
    ]);
    assert_eq!(code, 2);
}

#[test]
fn a_fit_that_does_not_converge_exits_1_with_the_best_point() {
    let (code, out, err) = run(&[
        "fit-bands",
        "--dn",
        "3",
        "--geometry",
        "oct",
        "--bands",
        "17400,24600,37800",
        "--max-evaluations",
        "1",
    ]);
    assert_eq!(code, 1, "{err}");
    assert!(out.is_empty());
    assert!(err.contains("best point reached: 10Dq ="), "{err}");
    assert_eq!(err.trim().lines().count(), 1, "{err}");
}

#[test]
fn tetragonal_geometry_fits_ds_and_dt() {
    // Elongated Cu(II) built from the one-hole D4h closed forms with Dq = 1200, Ds = 1500,
    // Dt = 400 cm⁻¹ (2A1g = 4Ds + 5Dt, 2B2g = 10Dq, 2Eg = 10Dq + 3Ds − 5Dt; A. B. P. Lever,
    // Inorganic Electronic Spectroscopy, 1984, ch. 6; from memory).
    let v = run_json(&[
        "fit-bands",
        "--metal",
        "Cu",
        "--ox",
        "2",
        "--geometry",
        "tetragonal",
        "--bands",
        "8000,12000,14500",
        "--json",
    ]);
    assert_eq!(v["geometry"], "tetragonal");
    assert_eq!(v["reference"], "2B1g");
    assert_abs_diff_eq!(v["dq"].as_f64().unwrap(), 1200.0, epsilon = 0.5);
    assert_abs_diff_eq!(v["ds"].as_f64().unwrap(), 1500.0, epsilon = 0.5);
    assert_abs_diff_eq!(v["dt"].as_f64().unwrap(), 400.0, epsilon = 0.5);
    assert_abs_diff_eq!(v["dq_axial"].as_f64().unwrap(), 500.0, epsilon = 1.0);
    assert_eq!(v["determination"], "exact");
    assert!(v["b"].is_null());
    // The compressed reading fits as well and is listed, not hidden.
    assert!(v["alternatives"]
        .as_array()
        .unwrap()
        .iter()
        .any(|a| a["near_equal"] == true && a["dt"].as_f64().unwrap() < 0.0));
}
