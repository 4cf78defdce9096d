//! Integration tests of `spinstate sco-fit`, `spinstate sco-curve` and the χ_M·T(T) evidence
//! of `check`, running the real binary.

use crate::common::{expect_usage_error, run, run_json};
use std::io::Write;

fn temp_file(text: &str) -> tempfile::NamedTempFile {
    let mut f = tempfile::NamedTempFile::new().unwrap();
    f.write_all(text.as_bytes()).unwrap();
    f
}

/// The JSON of a fit has every promised field with its uncertainty, and the invented demo curve
/// (data/demo/sco_curve.csv, made from ΔH = 10.5 kJ/mol, ΔS = 62 J/mol/K, Γ = 1.15 × 2RT½ with
/// noise) comes back within its uncertainties.
#[test]
fn demo_curve_fits_with_every_promised_field() {
    let v = run_json(&[
        "sco-fit",
        "--input",
        "data/demo/sco_curve.csv",
        "--model",
        "cooperative",
        "--metal",
        "Fe",
        "--ox",
        "2",
        "--json",
    ]);
    for f in [
        "t_half",
        "dh",
        "ds",
        "gamma",
        "t_down",
        "t_up",
        "chit_hs",
        "chit_ls",
        "residual_hs_fraction",
        "rms",
        "t_half_err",
        "dh_err",
        "ds_err",
        "gamma_err",
        "t_down_err",
        "t_up_err",
        "chit_hs_err",
        "chit_ls_err",
        "residual_hs_fraction_err",
        "correlations",
        "residuals",
        "ds_spin",
    ] {
        assert!(v.get(f).is_some(), "missing {f}");
    }
    let within = |key: &str, want: f64| {
        let x = v[key].as_f64().unwrap();
        let e = v[format!("{key}_err")].as_f64().unwrap();
        assert!(
            (x - want).abs() < 3.0 * e + 0.02 * want,
            "{key}: {x} ± {e} vs {want}"
        );
    };
    within("dh", 10.5);
    within("ds", 62.0);
    within("gamma", 1.15 * 2.0 * 8.314462618 * 10_500.0 / 62.0 / 1000.0);
    assert!(v["gamma_over_2rt_half"].as_f64().unwrap() > 1.0);
    assert!(v["t_down"].as_f64().unwrap() < v["t_up"].as_f64().unwrap());
    // R ln 5 for iron(II) S = 2 → S = 0 (common practice).
    assert!((v["ds_spin"].as_f64().unwrap() - 13.38).abs() < 0.01);
}

/// A variable-temperature Evans series (the invented data/demo/sco_evans.csv) is converted row
/// by row with the Evans equation and fitted.
#[test]
fn evans_series_is_converted_and_fitted() {
    let v = run_json(&[
        "sco-fit",
        "--input",
        "data/demo/sco_evans.csv",
        "--evans",
        "--dia",
        "-2.5e-4",
        "--metal",
        "Co",
        "--ox",
        "2",
        "--json",
    ]);
    assert_eq!(v["points"], 12);
    // The rows were made with χ_M = 2.3873e-4 Δδ/c (solenoid; D. F. Evans, J. Chem. Soc. 1959,
    // 2003, as in spinstate evans) from a two-state curve: converted back, they fit it closely.
    assert!(v["rms"].as_f64().unwrap() < 0.05, "{}", v["rms"]);
    let t = v["t_half"].as_f64().unwrap();
    assert!(t > 100.0 && t < 400.0, "{t}");
    // A gradual solution crossover seen over 110 K reaches neither plateau: the fit says so.
    let warnings = v["warnings"].to_string();
    assert!(warnings.contains("plateau"), "{warnings}");
}

/// `sco-curve`: no loop for the ideal model, a loop with its turning points above Γ = 2RT½
/// (Slichter & Drickamer, J. Chem. Phys. 1972, 56, 2142), and the SVG and CSV are written.
#[test]
fn curve_simulates_both_branches() {
    let v = run_json(&["sco-curve", "--dh", "12", "--ds", "80", "--json"]);
    assert!(v["t_down"].is_null());
    assert!((v["t_half"].as_f64().unwrap() - 150.0).abs() < 1e-9);
    // Γ = 1.3 × 2RT½.
    let gamma = format!("{}", 1.3 * 2.0 * 8.314462618 * 150.0 / 1000.0);
    let dir = tempfile::tempdir().unwrap();
    let svg = dir.path().join("c.svg");
    let csv = dir.path().join("c.csv");
    let v = run_json(&[
        "sco-curve",
        "--dh",
        "12",
        "--ds",
        "80",
        "--gamma",
        &gamma,
        "--svg",
        svg.to_str().unwrap(),
        "--csv",
        csv.to_str().unwrap(),
        "--json",
    ]);
    let (d, u) = (v["t_down"].as_f64().unwrap(), v["t_up"].as_f64().unwrap());
    assert!(d < 150.0 && u > 150.0);
    let p = v["points"]
        .as_array()
        .unwrap()
        .iter()
        .find(|p| p["t"].as_f64().unwrap() == 150.0)
        .unwrap();
    assert!(p["gamma_heating"].as_f64().unwrap() < 0.2);
    assert!(p["gamma_cooling"].as_f64().unwrap() > 0.8);
    assert!(std::fs::read_to_string(&svg).unwrap().contains("<svg"));
    assert!(std::fs::read_to_string(&csv)
        .unwrap()
        .starts_with("t_k,gamma_heating"));
}

/// Bad input: (the text of a curve file that `FILE` in the arguments stands for, or none; the
/// arguments; a fragment the one-line error must contain).
const BAD_INPUT: &[(Option<&str>, &[&str], &str)] = &[
    (
        Some("T,chiT\n100,0.1\n200,3.0\n"),
        &["sco-fit", "--input", "FILE"],
        "points for",
    ),
    (
        Some("T,chiT\n100,0.1\n200,3.0\n150,1.5\n250,3.1\n120,0.3\n300,3.2\n"),
        &["sco-fit", "--input", "FILE"],
        "direction",
    ),
    (
        Some("T,chiT\n100,3.1\n150,3.12\n200,3.15\n250,3.16\n300,3.18\n350,3.2\n400,3.2\n"),
        &["sco-fit", "--input", "FILE", "--metal", "Fe", "--ox", "2"],
        "moment",
    ),
    (
        Some("T,chiT\n100,0.1\n150,0.2\n200,9.5\n250,3.0\n300,3.1\n350,3.2\n"),
        &["sco-fit", "--input", "FILE", "--metal", "Fe", "--ox", "2"],
        "physically possible range",
    ),
    (
        Some("T,x\n100,1\n"),
        &["sco-fit", "--input", "FILE"],
        "no χ_M·T, χ_M or μ_eff column",
    ),
    (None, &["sco-curve", "--dh", "12", "--ds", "-3"], "ΔS"),
    (
        None,
        &[
            "sco-fit",
            "--input",
            "data/demo/sco_curve.csv",
            "--chit-hs",
            "nan",
        ],
        "high-spin state",
    ),
];

#[test]
fn bad_input_is_explained() {
    for (text, args, needle) in BAD_INPUT {
        let file = text.map(temp_file);
        let path = file.as_ref().map(|f| f.path().to_str().unwrap());
        let args: Vec<&str> = args
            .iter()
            .map(|&a| if a == "FILE" { path.unwrap() } else { a })
            .collect();
        expect_usage_error(&args, needle);
    }
    let demo = "data/demo/sco_curve.csv";
    let (code, _, err) = run(&["sco-fit", "--input", demo, "--ox", "2"]);
    assert_eq!(
        code, 2,
        "an oxidation state without a metal is refused: {err}"
    );
    let (code, _, err) = run(&["sco-fit", "--input", "/no/such/file.csv"]);
    assert_eq!(code, 2, "{err}");
}

/// `check --chit-file`: a curve that crosses gives crossover-or-mixture with its T½; a curve on
/// the high-spin plateau is strong high-spin evidence.
#[test]
fn check_weighs_a_curve() {
    let v = run_json(&[
        "check",
        "--metal",
        "Fe",
        "--ox",
        "2",
        "--geometry",
        "oct",
        "--ligand",
        "phen:2",
        "--ligand",
        "NCS:2",
        "--chit-file",
        "data/demo/sco_curve.csv",
        "--json",
    ]);
    assert_eq!(v["verdict"], "crossover-or-mixture");
    let e = v["evidence"]
        .as_array()
        .unwrap()
        .iter()
        .find(|e| e["kind"] == "chit-curve")
        .unwrap()
        .clone();
    assert_eq!(e["supports"], "mixture");
    assert!(e["detail"].as_str().unwrap().contains("T½ = 169 K"));
    let plateau = temp_file("T,chiT\n100,3.25\n150,3.27\n200,3.28\n250,3.3\n300,3.31\n350,3.32\n");
    let v = run_json(&[
        "check",
        "--metal",
        "Fe",
        "--ox",
        "2",
        "--geometry",
        "oct",
        "--ligand",
        "py:6",
        "--chit-file",
        plateau.path().to_str().unwrap(),
        "--json",
    ]);
    assert_eq!(v["verdict"], "high-spin");
}

/// A batch row's `chit_file` is read relative to the batch file.
#[test]
fn batch_rows_take_a_curve_file() {
    let dir = tempfile::tempdir().unwrap();
    std::fs::copy("data/demo/sco_curve.csv", dir.path().join("curve.csv")).unwrap();
    let batch = dir.path().join("batch.csv");
    std::fs::write(
        &batch,
        "name,metal,ox,geometry,ligands,chit_file\nA,Fe,2,oct,phen:2 NCS:2,curve.csv\nB,Fe,2,oct,phen:2 NCS:2,missing.csv\n",
    )
    .unwrap();
    let (code, out, err) = run(&["check", "--input", batch.to_str().unwrap(), "--json"]);
    assert_eq!(code, 2, "{err}");
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["samples"][0]["verdict"], "crossover-or-mixture");
    assert_eq!(v["errors"][0]["column"], "chit_file");
    assert!(err.contains("missing.csv"), "{err}");
}
