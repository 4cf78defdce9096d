//! Integration tests of `spinstate demo`: the invented scenario of data/demo runs end to end from
//! the embedded copy and exercises every verdict.

use crate::common::{run, run_json};

#[test]
fn demo_runs_and_prints_the_verdicts_and_the_crossover_table() {
    let (code, out, err) = run(&["demo"]);
    assert_eq!(code, 0, "{err}");
    assert!(err.is_empty(), "{err}");
    assert!(out.contains("invented scenario"), "{out}");
    for name in ["TS-01", "TS-08"] {
        assert!(out.contains(name), "{name}");
    }
    for verdict in [
        "high-spin",
        "low-spin",
        "crossover-or-mixture",
        "inconsistent",
    ] {
        assert!(
            out.contains(&format!("verdict: {verdict}")),
            "{verdict} missing"
        );
    }
    assert!(out.contains("crossover Δ/B"), "{out}");
    assert!(out.contains("re-check"), "{out}");
    assert!(out.contains("Safety:") && out.contains("licensed practice"));
}

/// Each invented sample gets the verdict its made-up data were built for: TS-01 all high-spin
/// evidence; TS-02 a low-spin moment and Fe–N 1.968 Å (low-spin range 1.95–2.00 Å, Gütlich &
/// Goodwin 2004, from memory); TS-03 low spin at 100 K and high spin at 300 K (thermal
/// crossover); TS-04 a Co(II) moment of 3.0 μB, between the high- and low-spin ranges (Figgis &
/// Lewis 1960, from memory); TS-06 a high-spin Evans moment against a low-spin bond length at the
/// same temperature; TS-07 Fe–N 2.088 Å, midway between the ranges; TS-08 an Evans moment above
/// every Co(II) expectation.
#[test]
fn demo_json_verdicts() {
    let v = run_json(&["demo", "--json"]);
    assert!(v["errors"].as_array().unwrap().is_empty());
    let got: Vec<(String, String)> = v["samples"]
        .as_array()
        .unwrap()
        .iter()
        .map(|s| {
            (
                s["name"].as_str().unwrap().to_string(),
                s["verdict"].as_str().unwrap().to_string(),
            )
        })
        .collect();
    let want = [
        ("TS-01", "high-spin"),
        ("TS-02", "low-spin"),
        ("TS-03", "crossover-or-mixture"),
        ("TS-04", "crossover-or-mixture"),
        ("TS-05", "high-spin"),
        ("TS-06", "inconsistent"),
        ("TS-07", "crossover-or-mixture"),
        ("TS-08", "inconsistent"),
    ];
    let want: Vec<(String, String)> = want
        .iter()
        .map(|(a, b)| (a.to_string(), b.to_string()))
        .collect();
    assert_eq!(got, want);
    assert!(v["safety"].as_str().unwrap().contains("cyanide"));
}

/// The demo is the same as checking the sheet in data/demo with `check --input`.
#[test]
fn demo_matches_check_on_the_sheet() {
    let sheet = concat!(env!("CARGO_MANIFEST_DIR"), "/data/demo/samples.csv");
    let a = run_json(&["demo", "--json"]);
    let b = run_json(&["check", "--input", sheet, "--json"]);
    assert_eq!(a, b);
}
