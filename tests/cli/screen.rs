//! Integration tests of `spinstate screen`, running the real binary.

use crate::common::{expect_usage_error, run, run_json};
use serde_json::Value;
use std::io::Write;

fn screen_args<'a>(extra: &[&'a str]) -> Vec<&'a str> {
    let mut a = vec!["screen", "--metal", "Fe", "--ox", "2", "--geometry", "oct"];
    a.extend_from_slice(extra);
    a
}

fn binomial(n: u64, k: u64) -> u64 {
    (0..k).fold(1u64, |acc, i| acc * (n - i) / (i + 1))
}

fn results(v: &Value) -> &Vec<Value> {
    v["results"].as_array().unwrap()
}

/// Multisets of 6 from n monodentate kinds: C(n + 5, 6) (common practice, "stars and bars").
#[test]
fn pool_json_counts_every_sphere() {
    let pool = "H2O,NH3,py,NCS,CN,Cl,F,MeCN";
    let v = run_json(&screen_args(&["--pool", pool, "--json"]));
    let n = binomial(8 + 5, 6);
    assert_eq!(v["candidates"], n);
    assert_eq!(v["evaluated"], n);
    assert_eq!(v["skipped"], 0);
    // --json without --top keeps the full list.
    assert_eq!(results(&v).len() as u64, n);
    assert_eq!(v["shown"], n);
    assert_eq!(v["source"], "pool");
    assert_eq!(v["target"], "crossover");
    let ion = &v["ions"][0];
    assert_eq!(ion["ion"], "Fe(II)");
    // d6 crossover at C/B 4.8 is Δ/B ≈ 20 (Tanabe & Sugano 1954, from memory; full d^n
    // diagonalisation gives 20.0).
    assert!((ion["crossover_delta_over_b"].as_f64().unwrap() - 20.0).abs() < 0.1);
    let mut last = f64::INFINITY;
    for (i, r) in results(&v).iter().enumerate() {
        assert_eq!(r["rank"], i + 1);
        let score = r["score"].as_f64().unwrap();
        assert!(score <= last);
        last = score;
        // The crossover target aims at the middle of the thermal window, just above the
        // crossover: never a positive score.
        assert!(score <= 0.0);
        let gap = r["energy_gap"].as_f64().unwrap();
        assert!(gap.is_finite());
    }
}

/// The screen's numbers for one sphere equal predict's for the same complex.
#[test]
fn rows_agree_with_predict() {
    let v = run_json(&screen_args(&["--pool", "NCS,py", "--json"]));
    let row = results(&v)
        .iter()
        .find(|r| r["sphere"] == "[Fe(py)4(NCS)2]")
        .unwrap()
        .clone();
    let p = run_json(&[
        "predict",
        "--metal",
        "Fe",
        "--ox",
        "2",
        "--geometry",
        "oct",
        "--ligand",
        "py:4",
        "--ligand",
        "NCS:2",
        "--json",
    ]);
    for (a, b) in [
        ("delta", "delta"),
        ("delta_high_spin", "delta_high_spin"),
        ("delta_low_spin", "delta_low_spin"),
        ("b", "b"),
        ("c", "c"),
        ("delta_over_b", "delta_over_b"),
    ] {
        assert_eq!(row[a].as_f64(), p[b].as_f64(), "{a}");
    }
    assert_eq!(
        row["mean_delta_over_b"].as_f64(),
        p["spin_geometry"]["mean_delta_over_b"].as_f64()
    );
    assert_eq!(
        row["energy_gap"].as_f64(),
        p["spin_geometry"]["energy_gap"].as_f64()
    );
    assert_eq!(row["spin_state"], p["spin_state"]);
    assert_eq!(row["borderline"], p["borderline"]);
    let m = p["margin"]["delta_over_b"].as_f64().unwrap();
    assert!((row["margin_delta_over_b"].as_f64().unwrap() - m).abs() < 1e-9);
    assert_eq!(row["charge"], 0);
    assert_eq!(row["donors"], "N6");
}

#[test]
fn table_shows_the_top_rows_and_a_caution() {
    let (code, out, err) = run(&screen_args(&["--pool", "H2O,NH3,CN", "--top", "3"]));
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("Fe(II) (d6, crossover Δ/B 20.02"), "{out}");
    assert!(out.contains("showing 3 of 28 ranked"), "{out}");
    assert!(out.contains("cyanide is very toxic") && out.contains("not a safety approval"));
}

/// Targets "low" and "high" put the strongest and the weakest field first (Tsuchida's
/// spectrochemical series as in Cotton & Wilkinson, Advanced Inorganic Chemistry, from memory:
/// Cl⁻ < H₂O < NH₃ < CN⁻).
#[test]
fn targets_order_by_field_strength() {
    let pool = ["--pool", "Cl,H2O,NH3,CN", "--top", "1", "--json"];
    let low = run_json(&screen_args(&[&pool[..], &["--target", "low"]].concat()));
    assert_eq!(results(&low)[0]["sphere"], "[Fe(CN)6]4-");
    assert_eq!(results(&low)[0]["spin_state"], "low");
    let high = run_json(&screen_args(&[&pool[..], &["--target", "high"]].concat()));
    assert_eq!(results(&high)[0]["sphere"], "[FeCl6]4-");
    assert_eq!(high["evaluated"], binomial(9, 6));
    assert_eq!(results(&high).len(), 1);
}

#[test]
fn filters_apply() {
    let v = run_json(&screen_args(&[
        "--pool",
        "H2O,NH3,py,NCS,CN,en,bpy,ox",
        "--donors",
        "N6",
        "--max-charge",
        "0",
        "--require",
        "NCS",
        "--forbid",
        "en",
        "--json",
    ]));
    assert!(!results(&v).is_empty());
    for r in results(&v) {
        assert_eq!(r["donors"], "N6");
        assert_eq!(r["charge"], 0);
        let names: Vec<&str> = r["ligands"]
            .as_array()
            .unwrap()
            .iter()
            .map(|l| l["name"].as_str().unwrap())
            .collect();
        assert!(
            names.contains(&"NCS") && !names.contains(&"en"),
            "{names:?}"
        );
    }
    // [Fe(NCS)2(py)4], [Fe(bpy)(NCS)2(py)2], [Fe(bpy)2(NCS)2], … all neutral N6 with NCS.
    assert!(results(&v)
        .iter()
        .any(|r| r["sphere"] == "[Fe(bpy)2(NCS)2]"));
    assert_eq!(v["filters"]["donors"], "N6");
}

#[test]
fn several_metals_are_ranked_together() {
    let v = run_json(&[
        "screen",
        "--metal",
        "Fe:2,Co:2,Fe:3",
        "--geometry",
        "oct",
        "--pool",
        "H2O,NH3",
        "--json",
    ]);
    assert_eq!(v["ions"].as_array().unwrap().len(), 3);
    assert_eq!(v["candidates"], 7);
    assert_eq!(v["evaluated"], 21);
    let ions: std::collections::BTreeSet<&str> = results(&v)
        .iter()
        .map(|r| r["ion"].as_str().unwrap())
        .collect();
    assert_eq!(ions.len(), 3);
}

#[test]
fn csv_output_has_one_row_per_candidate() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("ranked.csv");
    let p = path.to_str().unwrap();
    let (code, _, err) = run(&screen_args(&["--pool", "H2O,NH3,py", "--csv", p]));
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("wrote"), "{err}");
    let text = std::fs::read_to_string(&path).unwrap();
    let mut lines = text.lines();
    assert!(lines
        .next()
        .unwrap()
        .starts_with("rank,ion,sphere,name,ligands,donors,charge,delta_cm-1"));
    assert_eq!(lines.count() as u64, binomial(8, 6));
}

/// Bad input: (arguments after `screen`, a fragment the one-line error must contain).
const BAD_INPUT: &[(&[&str], &str)] = &[
    (&FE_OCT_POOL_PYY, " py,"),
    (
        &[
            "--metal",
            "Fe",
            "--ox",
            "2",
            "--geometry",
            "sqpl",
            "--pool",
            "terpy",
        ],
        "cannot fill the 4 donor sites of sqpl",
    ),
    (
        &[
            "--metal",
            "Ni",
            "--ox",
            "2",
            "--geometry",
            "oct",
            "--pool",
            "H2O",
        ],
        "one ground spin",
    ),
    (
        &["--metal", "Fe", "--geometry", "oct", "--pool", "H2O"],
        "needs an oxidation state",
    ),
    (
        &["--metal", "Fe", "--ox", "2", "--geometry", "oct"],
        "--pool LIST",
    ),
    (
        &[
            "--metal",
            "Fe",
            "--ox",
            "2",
            "--geometry",
            "oct",
            "--pool",
            "H2O",
            "--target",
            "middle",
        ],
        "crossover, high or low",
    ),
    // Refused while the arguments are parsed, naming the option.
    (
        &[
            "--metal",
            "Fe",
            "--ox",
            "2",
            "--geometry",
            "oct",
            "--pool",
            "H2O",
            "--target",
            "middle",
        ],
        "invalid value 'middle' for '--target",
    ),
    (
        &[
            "--metal",
            "Fe",
            "--ox",
            "2",
            "--geometry",
            "oct",
            "--pool",
            "H2O",
            "--donors",
            "N4",
        ],
        "exactly 6 donor atoms",
    ),
    (
        &[
            "--metal",
            "Fe",
            "--ox",
            "2",
            "--geometry",
            "oct",
            "--pool",
            "H2O",
            "--size",
            "4..2",
        ],
        "MIN..MAX",
    ),
    (
        &[
            "--metal",
            "Fe",
            "--ox",
            "2",
            "--geometry",
            "oct",
            "--pool",
            "H2O",
            "--top",
            "0",
        ],
        "--top 0",
    ),
    (
        &[
            "--metal",
            "Fe",
            "--ox",
            "2",
            "--geometry",
            "oct",
            "--candidates",
            "/nonexistent/x.csv",
        ],
        "cannot read",
    ),
];

const FE_OCT_POOL_PYY: [&str; 8] = [
    "--metal",
    "Fe",
    "--ox",
    "2",
    "--geometry",
    "oct",
    "--pool",
    "H2O,pyy",
];

#[test]
fn bad_pools_and_options_are_explained() {
    for (args, needle) in BAD_INPUT {
        let mut full = vec!["screen"];
        full.extend_from_slice(args);
        expect_usage_error(&full, needle);
    }
    // Every table ligand can be pooled, π acceptors such as CO included.
    let v = run_json(&screen_args(&["--pool", "CO,H2O", "--json"]));
    assert!(!results(&v).is_empty());
}

/// A file with bad rows: each bad row reported with row and column, the good rows ranked, and
/// exit code 2.
#[test]
fn bad_candidate_rows_are_reported_and_good_rows_ranked() {
    let mut f = tempfile::NamedTempFile::new().unwrap();
    write!(
        f,
        "name,ligands\nA,NCS:2 py:4\nB,pyy:6\nC,bpy:2 NCS:2\nD,py:5\nE,H2O:6\n"
    )
    .unwrap();
    let p = f.path().to_str().unwrap().to_string();
    let (code, out, err) = run(&screen_args(&["--candidates", &p, "--json"]));
    assert_eq!(code, 2, "{err}");
    let errors: Vec<&str> = err.lines().collect();
    assert_eq!(errors.len(), 2, "{err}");
    assert!(
        errors[0].contains("row 2 (line 3), column ligands")
            && errors[0].contains("did you mean")
            && errors[0].contains(" py,")
    );
    assert!(
        errors[1].contains("row 4 (line 5), column ligands") && errors[1].contains("5 donor atoms")
    );
    let v: Value = serde_json::from_str(&out).unwrap();
    assert_eq!(v["bad_rows"], 2);
    assert_eq!(v["evaluated"], 3);
    let names: Vec<&str> = results(&v)
        .iter()
        .map(|r| r["name"].as_str().unwrap())
        .collect();
    assert_eq!(names.len(), 3);
    assert!(names.contains(&"A") && names.contains(&"C") && names.contains(&"E"));
}

/// The ranking of a candidates file is the same for any order of its rows.
#[test]
fn candidate_row_order_does_not_matter() {
    let rows = [
        "A,NCS:2 py:4",
        "B,H2O:6",
        "C,bpy:2 NCS:2",
        "D,NH3:6",
        "E,en:3",
        "F,phen:2 NCS:2",
        "G,CN:6",
    ];
    let ranking = |order: &[usize]| {
        let mut f = tempfile::NamedTempFile::new().unwrap();
        writeln!(f, "name,ligands").unwrap();
        for &i in order {
            writeln!(f, "{}", rows[i]).unwrap();
        }
        let p = f.path().to_str().unwrap().to_string();
        let v = run_json(&screen_args(&["--candidates", &p, "--json"]));
        v["results"].clone()
    };
    let reference = ranking(&[0, 1, 2, 3, 4, 5, 6]);
    for order in [
        [6, 5, 4, 3, 2, 1, 0],
        [3, 0, 6, 2, 5, 1, 4],
        [1, 3, 5, 0, 2, 4, 6],
    ] {
        assert_eq!(ranking(&order), reference);
    }
}

#[test]
fn candidate_file_without_ligands_column_is_rejected() {
    let mut f = tempfile::NamedTempFile::new().unwrap();
    write!(f, "name,sphere\nA,py:6\n").unwrap();
    let p = f.path().to_str().unwrap().to_string();
    expect_usage_error(&screen_args(&["--candidates", &p]), "'ligands' column");
}

/// `--target crossover` on an Fe(II) N6 pool ranks a known spin-crossover family above the
/// low-spin tris-diimines and the high-spin hexaamines: [Fe(phen)2(NCS)2] (T½ ≈ 176 K; M. Sorai,
/// S. Seki, J. Phys. Chem. Solids 1974, 35, 555) above [Fe(bpy)3]2+ and [Fe(phen)3]2+ (low-spin)
/// and [Fe(NH3)6]2+ (high-spin) (F. A. Cotton, G. Wilkinson et al., Advanced Inorganic
/// Chemistry, 1999; from memory).
#[test]
fn crossover_target_prefers_a_spin_crossover_family() {
    let v = run_json(&screen_args(&[
        "--pool",
        "bpy,phen,NCS,NH3,en,py",
        "--donors",
        "N6",
        "--json",
    ]));
    let rank = |want: &[(&str, u64)]| -> u64 {
        results(&v)
            .iter()
            .find(|r| {
                let l = r["ligands"].as_array().unwrap();
                l.len() == want.len()
                    && want.iter().all(|(n, c)| {
                        l.iter()
                            .any(|x| x["name"] == *n && x["count"].as_u64() == Some(*c))
                    })
            })
            .unwrap_or_else(|| panic!("{want:?} not ranked"))["rank"]
            .as_u64()
            .unwrap()
    };
    let sco = rank(&[("phen", 2), ("NCS", 2)]);
    for other in [&[("bpy", 3)][..], &[("phen", 3)][..], &[("NH3", 6)][..]] {
        assert!(sco < rank(other), "{other:?}: {sco} vs {}", rank(other));
    }
}
