//! Integration tests of `spinstate check`, running the real binary: single complexes, batch
//! files with good and bad rows, and a verdict for each kind of evidence disagreeing with the
//! others.

use crate::common::{expect_usage_error, run, run_json};
use serde_json::Value;
use std::io::Write;

const FE_PY: [&str; 9] = [
    "check",
    "--metal",
    "Fe",
    "--ox",
    "2",
    "--geometry",
    "oct",
    "--ligand",
    "py:6",
];

fn check(extra: &[&str]) -> Value {
    let mut args: Vec<&str> = FE_PY.to_vec();
    args.extend_from_slice(extra);
    args.push("--json");
    run_json(&args)
}

fn evidence<'a>(v: &'a Value, kind: &str) -> &'a Value {
    v["evidence"]
        .as_array()
        .unwrap()
        .iter()
        .find(|e| e["kind"] == kind)
        .unwrap_or_else(|| panic!("no {kind} evidence in {v}"))
}

fn file(text: &str) -> tempfile::NamedTempFile {
    let mut f = tempfile::NamedTempFile::new().unwrap();
    f.write_all(text.as_bytes()).unwrap();
    f
}

/// [Fe(2-pic)3]Cl2·EtOH: Fe–N 2.032 Å at 115 K (low spin) and 2.199 Å at 227 K (high spin)
/// (IUPAC Gold Book, "spin crossover"; Pure Appl. Chem. 1999, 71, 1963). An FeN6 complex of
/// pyridine-type donors stands in for it. Each length alone gives its spin state; the low-spin
/// length at 115 K with a high-spin moment at 227 K is a thermal crossover. The high-spin moment
/// 5.2 μB lies in the Fe(II) range 5.1–5.7 (Figgis & Lewis 1960, from memory).
#[test]
fn gold_book_bond_lengths_and_a_thermal_crossover() {
    let v = check(&["--bond-length", "2.199", "--structure-temp", "227"]);
    assert_eq!(v["verdict"], "high-spin");
    assert_eq!(evidence(&v, "bond-length")["supports"], "high-spin");
    let v = check(&["--bond-length", "2.032", "--structure-temp", "115"]);
    assert_eq!(v["verdict"], "low-spin");
    let v = check(&[
        "--bond-length",
        "2.032",
        "--structure-temp",
        "115",
        "--mu-eff",
        "5.2",
        "--moment-temp",
        "227",
    ]);
    assert_eq!(v["verdict"], "crossover-or-mixture");
    assert!(v["reasons"][0]
        .as_str()
        .unwrap()
        .contains("thermal spin crossover"));
    // The JSON contract.
    for key in [
        "verdict",
        "confidence",
        "evidence",
        "reasons",
        "recheck",
        "delta_over_b",
        "crossover_delta_over_b",
        "safety",
    ] {
        assert!(v.get(key).is_some(), "{key} missing");
    }
    for key in [
        "kind",
        "supports",
        "detail",
        "predicted",
        "measured",
        "strength",
    ] {
        assert!(evidence(&v, "moment").get(key).is_some(), "{key} missing");
    }
}

/// A high-spin Fe(II) base case: μ_eff 5.3 μB at 298 K (Fe(II) high spin 5.1–5.7 μB, Figgis &
/// Lewis 1960, from memory), an Evans shift giving the same moment, one d–d band in 350–1100 nm
/// (octahedral d6 high spin has one spin-allowed band, 5T2g → 5Eg; Lever 1984, from memory),
/// Fe–N 2.18 Å (high-spin range 2.15–2.20 Å, Gütlich & Goodwin 2004, from memory). Each kind in
/// turn is given a low-spin value: μ 0 or χT 0 (S = 0), four bands, Fe–N 1.97 Å (low-spin range
/// 1.95–2.00 Å). The verdict must be `inconsistent` with that kind re-checked first.
#[test]
fn each_kind_of_evidence_disagreeing_with_the_others() {
    // χ_M = 2.3873e-4 Δδ/c (Evans, solenoid): 0.49 ppm at 0.010 mol/L → 1.17e-2 cm³/mol,
    // μ_eff 5.28 μB at 298 K.
    let high: [(&str, &[&str]); 4] = [
        (
            "evans",
            &[
                "--evans-shift-ppm",
                "0.49",
                "--evans-conc",
                "0.010",
                "--evans-temp",
                "298",
            ],
        ),
        ("moment", &["--mu-eff", "5.3", "--moment-temp", "298"]),
        ("bands", &["--bands", "11000", "--band-window", "350-1100"]),
        (
            "bond-length",
            &["--bond-length", "2.18", "--structure-temp", "298"],
        ),
    ];
    let low: [(&str, &[&str]); 4] = [
        (
            "evans",
            &[
                "--evans-shift-ppm",
                "0",
                "--evans-conc",
                "0.010",
                "--evans-temp",
                "298",
            ],
        ),
        ("moment", &["--chi-m-t", "0", "--moment-temp", "298"]),
        (
            "bands",
            &[
                "--bands",
                "14000 17500 21000 24000",
                "--band-window",
                "350-1100",
            ],
        ),
        (
            "bond-length",
            &["--bond-length", "1.97", "--structure-temp", "298"],
        ),
    ];
    // All high: high-spin.
    let all: Vec<&str> = high.iter().flat_map(|(_, a)| a.iter().copied()).collect();
    let v = check(&all);
    assert_eq!(v["verdict"], "high-spin", "{v}");
    for (kind, _) in high {
        assert_eq!(evidence(&v, kind)["supports"], "high-spin", "{kind}");
    }
    // Each one low in turn.
    for (i, (kind, args)) in low.iter().enumerate() {
        let mut mixed: Vec<&str> = Vec::new();
        for (j, (_, h)) in high.iter().enumerate() {
            mixed.extend_from_slice(if i == j { args } else { h });
        }
        let v = check(&mixed);
        assert_eq!(evidence(&v, kind)["supports"], "low-spin", "{kind}: {v}");
        assert_eq!(v["verdict"], "inconsistent", "{kind}");
        let first = v["recheck"][0].as_str().unwrap();
        assert!(first.starts_with(kind), "{kind}: {first}");
    }
    // The prediction (high spin or borderline from the estimate: [Fe(py)6]2+ lies within the
    // estimate's uncertainty of the crossover) against low-spin measurements: the
    // measurements win.
    let all_low: Vec<&str> = low.iter().flat_map(|(_, a)| a.iter().copied()).collect();
    let v = check(&all_low);
    let said = evidence(&v, "prediction")["supports"].clone();
    assert!(said == "high-spin" || said == "both", "{said}");
    assert_eq!(v["verdict"], "low-spin");
    if said == "high-spin" {
        assert!(v["recheck"][0].as_str().unwrap().starts_with("prediction"));
    }
}

/// A moment between the spin states: Co(II) high spin 4.7–5.2 μB, low spin 1.8–2.1 μB (Figgis &
/// Lewis 1960, from memory); 3.0 μB is a mixture, and a moment above every window fits neither.
#[test]
fn moments_between_and_outside() {
    let co = |mu: &str| {
        run_json(&[
            "check",
            "--metal",
            "Co",
            "--ox",
            "2",
            "--geometry",
            "oct",
            "--ligand",
            "terpy:2",
            "--mu-eff",
            mu,
            "--moment-temp",
            "298",
            "--json",
        ])
    };
    let v = co("3.0");
    assert_eq!(v["verdict"], "crossover-or-mixture");
    let f = evidence(&v, "moment")["high_spin_fraction"]
        .as_f64()
        .unwrap();
    assert!(f > 0.1 && f < 0.9, "{f}");
    let v = co("7.5");
    assert_eq!(v["verdict"], "inconsistent");
    assert!(v["recheck"][0].as_str().unwrap().starts_with("moment"));
}

#[test]
fn table_output_has_the_verdict_and_the_safety_note() {
    let mut args: Vec<&str> = FE_PY.to_vec();
    args.extend(["--mu-eff", "5.3", "--moment-temp", "298"]);
    let (code, out, err) = run(&args);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("verdict: high-spin"), "{out}");
    assert!(out.contains("Safety:") && out.contains("licensed practice"));
    assert!(err.is_empty(), "{err}");
}

/// The sample of [`FE_PY`] as arguments after `check`.
const FE: [&str; 8] = [
    "--metal",
    "Fe",
    "--ox",
    "2",
    "--geometry",
    "oct",
    "--ligand",
    "py:6",
];

/// Bad input to one sample: (arguments after `check`, with `FE` standing for the sample of
/// [`FE_PY`]; a fragment the one-line error must contain).
const BAD_INPUT: &[(&[&str], &[&str], &str)] = &[
    (&FE, &["--evans-shift-ppm", "0.4"], "--evans-conc"),
    (
        &FE,
        &["--bands", "11000 abc"],
        "'abc' is not a band maximum",
    ),
    (&FE, &["--bond-length", "21.8"], "--bond-length"),
    (&FE, &["--mu-eff", "5.2"], "--moment-temp"),
    (
        &[
            "--metal",
            "Fe",
            "--ox",
            "2",
            "--geometry",
            "oct",
            "--ligand",
            "pyy:6",
        ],
        &[],
        "--ligand: unknown ligand 'pyy'",
    ),
    (
        &FE,
        &[
            "--evans-shift-ppm",
            "-0.4",
            "--evans-conc",
            "0.01",
            "--evans-temp",
            "298",
        ],
        "use the transverse magnet geometry (options: --evans-magnet)",
    ),
    // The same sample as the batch row of `batch_errors_name_columns_and_options_name_options`:
    // from the command line the error names the options.
    (
        &FE,
        &[
            "--evans-shift-ppm",
            "-0.4",
            "--evans-conc",
            "0.01",
            "--evans-temp",
            "298",
        ],
        "error: --evans-shift-ppm, --evans-shift-hz: shift = -0.4 ppm",
    ),
    (
        &["--input", "/nonexistent/samples.csv"],
        &[],
        "--input: cannot read",
    ),
];

#[test]
fn bad_single_input() {
    assert_eq!(FE_PY[1..], FE);
    for (sample, extra, needle) in BAD_INPUT {
        let mut args = vec!["check"];
        args.extend_from_slice(sample);
        args.extend_from_slice(extra);
        expect_usage_error(&args, needle);
    }
}

const HEAD: &str = "name,metal,ox,geometry,ligands,mu_eff,moment_temp,bond_length,structure_temp";

#[test]
fn batch_reports_good_rows_and_names_bad_ones() {
    let f = file(&format!(
        "{HEAD}\nA,Fe,2,oct,NCS:2 py:4,5.3,298,2.18,298\nB,Fe,2,oct,py:6,five,298,,\nC,Co,2,oct,H2O:6,4.9,298,,\nD,Fe,2,oct,qq:6,,,,\n"
    ));
    let path = f.path().to_str().unwrap();
    let (code, out, err) = run(&["check", "--input", path]);
    assert_eq!(code, 2, "{err}");
    assert!(out.contains("A: verdict: high-spin"), "{out}");
    assert!(out.contains("C: verdict: high-spin"), "{out}");
    assert!(
        err.contains("row 3 (B), column mu_eff: 'five' is not a number"),
        "{err}"
    );
    assert!(
        err.contains("row 5 (D), column ligands: unknown ligand 'qq'"),
        "{err}"
    );
    assert_eq!(err.lines().count(), 2, "{err}");
    assert!(!err.contains("panicked"));
    // The bad rows are in the table too, not dropped.
    assert!(
        out.contains("bad row 3") && out.contains("bad row 5"),
        "{out}"
    );

    // JSON: samples and errors.
    let (code, out, _) = run(&["check", "--input", path, "--json"]);
    assert_eq!(code, 2);
    let v: Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["samples"].as_array().unwrap().len(), 2);
    let errors = v["errors"].as_array().unwrap();
    assert_eq!(errors.len(), 2);
    assert_eq!(errors[0]["row"], 3);
    assert_eq!(errors[0]["column"], "mu_eff");

    // CSV: one line per input row, in order.
    let dir = tempfile::tempdir().unwrap();
    let csv = dir.path().join("out.csv");
    let (code, _, _) = run(&["check", "--input", path, "--csv", csv.to_str().unwrap()]);
    assert_eq!(code, 2);
    let text = std::fs::read_to_string(&csv).unwrap();
    let lines: Vec<&str> = text.lines().collect();
    assert_eq!(lines.len(), 5, "{text}");
    assert!(lines[0].starts_with("row,name,complex"));
    assert!(lines[1].starts_with("2,A,"));
    assert!(lines[2].starts_with("3,B,") && lines[2].contains("error"));
}

#[test]
fn batch_file_level_errors() {
    let cases: [(&str, &str); 5] = [
        ("", "empty"),
        (&format!("{HEAD}\n"), "a header without rows"),
        (
            "name,metal,ox\nA,Fe,2\n",
            "missing column(s) geometry, ligands",
        ),
        (
            "name,metal,ox,geometry,ligands,mu_ef\nA,Fe,2,oct,py:6,5\n",
            "did you mean mu_eff",
        ),
        (
            "name,metal,ox,geometry,ligands,bond_length\n",
            "a header without rows",
        ),
    ];
    for (text, needle) in cases {
        let f = file(text);
        expect_usage_error(&["check", "--input", f.path().to_str().unwrap()], needle);
    }
}

#[test]
fn batch_rows_with_malformed_cells_and_wrong_cell_counts() {
    let f = file(&format!(
        "{HEAD}\nA,Fe,two,oct,py:6,,,,\nB,Fe,2,oct\nC,Fe,2,oct,py:6,,,2.1x,\nD,Fe,2,hex,py:6,,,,\n"
    ));
    let (code, out, err) = run(&["check", "--input", f.path().to_str().unwrap()]);
    assert_eq!(code, 2);
    assert!(
        err.contains("row 2 (A), column ox: 'two' is not an integer"),
        "{err}"
    );
    assert!(
        err.contains("row 3 (B), column (whole row): has 4 cells; the header has 9"),
        "{err}"
    );
    assert!(
        err.contains("row 4 (C), column bond_length: '2.1x' is not a number"),
        "{err}"
    );
    assert!(err.contains("row 5 (D), column geometry"), "{err}");
    assert_eq!(err.lines().count(), 4, "{err}");
    assert!(out.contains("bad row 2"));
}

/// Editing the bond-length table with --data DIR changes the reference ranges used.
#[test]
fn data_override_of_the_bond_length_table() {
    let dir = tempfile::tempdir().unwrap();
    std::fs::write(
        dir.path().join("bond_lengths.csv"),
        "metal,oxidation_state,donor,donor_class,ls_min_a,ls_max_a,hs_min_a,hs_max_a,delta_r_a,what,source\n\
         Fe,2,N,any,2.10,2.12,2.30,2.35,0.2,edited for the test,test row\n",
    )
    .unwrap();
    let d = dir.path().to_str().unwrap();
    let mut args: Vec<&str> = vec!["--data", d];
    args.extend_from_slice(&FE_PY);
    args.extend(["--bond-length", "2.11", "--json"]);
    let v = run_json(&args);
    assert_eq!(evidence(&v, "bond-length")["supports"], "low-spin");
    assert!(evidence(&v, "bond-length")["detail"]
        .as_str()
        .unwrap()
        .contains("test row"));
    // A broken edited table is a usage error naming the file.
    std::fs::write(dir.path().join("bond_lengths.csv"), "metal\nFe\n").unwrap();
    let mut args: Vec<&str> = vec!["--data", d];
    args.extend_from_slice(&FE_PY);
    args.extend(["--bond-length", "2.11"]);
    expect_usage_error(&args, "bond_lengths.csv");
}

#[test]
fn band_positions_decide_when_the_count_fits_both_states() {
    // [Co(NH3)6]3+: 21 000 and 29 500 cm⁻¹ (Lever 1984, from memory). Two bands fit the count of
    // both spin states of d6, but only a low-spin field reproduces their positions (¹T1g, ¹T2g).
    let out = assert_cmd::Command::cargo_bin("spinstate")
        .unwrap()
        .args([
            "check",
            "--metal",
            "Co",
            "--ox",
            "3",
            "--geometry",
            "oct",
            "--ligand",
            "NH3:6",
            "--bands",
            "21000 29500",
            "--json",
        ])
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let bands = v["evidence"]
        .as_array()
        .unwrap()
        .iter()
        .find(|e| e["kind"] == "bands")
        .unwrap();
    assert_eq!(bands["supports"], "low-spin");
    assert!(bands["detail"]
        .as_str()
        .unwrap()
        .contains("positions fit the low-spin state only"));
    assert_eq!(v["verdict"], "low-spin");
}

/// A row's Evans shift with the wrong sign for its magnet geometry: the row names the shift
/// columns and the column that fixes it (`evans_magnet`), never a command-line option; the same
/// sample from the command line names the options instead.
#[test]
fn batch_errors_name_columns_and_options_name_options() {
    let f = file(
        "name,metal,ox,geometry,ligands,evans_shift_ppm,evans_conc,evans_temp\nA,Fe,2,oct,py:6,-0.4,0.01,298\n",
    );
    let (code, _, err) = run(&["check", "--input", f.path().to_str().unwrap()]);
    assert_eq!(code, 2, "{err}");
    assert!(
        err.contains("column evans_shift_ppm, evans_shift_hz: shift = -0.4 ppm")
            && err.contains("use the transverse magnet geometry (columns: evans_magnet)"),
        "{err}"
    );
    assert!(!err.contains("--"), "{err}");
    // The same sample from the command line: a case of `BAD_INPUT`.
}
