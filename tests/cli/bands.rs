//! `spinstate bands`: band counts per spin state, verdicts, notes and bad input.

use crate::common::*;

fn bands(args: &[&str]) -> serde_json::Value {
    let mut all = vec!["bands", "--json"];
    all.extend_from_slice(args);
    run_json(&all)
}

#[test]
fn cobalt_aqua_two_bands_support_high_spin() {
    // [Co(H2O)6]2+, Dq ≈ 920, B ≈ 825 (A. B. P. Lever, Inorganic Electronic Spectroscopy, 1984, from memory).
    // Octahedral d7 HS shows → 4T2g, → 4A2g (weak, two-electron) and → 4T1g(P) (Lever 1984,
    // from memory); the 4T2g band near 8 100 cm⁻¹ lies beyond 1100 nm.
    let v = bands(&[
        "--dn",
        "7",
        "--geometry",
        "oct",
        "--dq",
        "921.5",
        "--b",
        "827.7",
        "--observed",
        "2",
    ]);
    let hs = &v["spin_states"][0];
    assert_eq!(hs["spin_state"], "high");
    assert_eq!(hs["is_ground"], true);
    let a2 = hs["bands"]
        .as_array()
        .unwrap()
        .iter()
        .find(|b| b["label"] == "4A2g")
        .unwrap();
    assert_eq!(a2["electrons_moved"], 2);
    assert_eq!(a2["weak"], true);
    let t2 = &hs["bands"][0];
    assert_eq!(t2["label"], "4T2g");
    assert_eq!(t2["in_window"], false);
    assert_eq!(hs["supports_observed"], true);
    assert_eq!(v["verdict"], "high spin");
}

#[test]
fn chromium_aqua_three_bands_and_too_many() {
    // Octahedral d3: three spin-allowed bands (Lever 1984, from memory); [Cr(H2O)6]3+
    // Dq = 1740, B = 728.6 (Lever 1968 closed forms, computed here). ν3 lies above 25 000 cm⁻¹ and may be hidden by
    // charge transfer (common practice), so 2 or 3 bands are expected.
    let args = [
        "--dn",
        "3",
        "--geometry",
        "oct",
        "--dq",
        "1740",
        "--b",
        "728.6",
    ];
    let mut three = args.to_vec();
    three.extend(["--observed", "3"]);
    let v = bands(&three);
    let s = &v["spin_states"][0];
    assert_eq!(s["spin_state"], "only");
    assert_eq!(s["min_expected"], 2);
    assert_eq!(s["max_expected"], 3);
    assert!(v["verdict"]
        .as_str()
        .unwrap()
        .contains("only ground spin state"));
    let mut five = args.to_vec();
    five.extend(["--observed", "5"]);
    assert_eq!(bands(&five)["verdict"], "neither");
}

#[test]
fn cobalt_ammine_low_spin_shows_one_or_two_bands() {
    // [Co(NH3)6]3+ Dq = 2303, B = 634.8, C = 4.8B (a full d6 fit to the 21 000 and 29 500 cm⁻¹
    // bands of Lever, Inorganic Electronic Spectroscopy, 1984, from memory). Low-spin d6 has the
    // 1T1g and 1T2g bands (the higher singlets are nominal two-electron jumps with almost no
    // one-electron share, so they are not counted); high-spin d6 has one band (5T2g → 5Eg), at
    // most two with a Jahn–Teller shoulder (Lever, Inorganic Electronic Spectroscopy, 1984,
    // from memory). Without ligands the generic 25 000 cm⁻¹ charge-transfer onset applies, so
    // the 29 500 band may be hidden: 1–2 bands, and three observed bands fit neither state.
    let v = bands(&[
        "--dn",
        "6",
        "--geometry",
        "oct",
        "--dq",
        "2303",
        "--b",
        "634.8",
        "--c-over-b",
        "4.8",
        "--observed",
        "3",
    ]);
    let states = v["spin_states"].as_array().unwrap();
    let hs = states.iter().find(|s| s["spin_state"] == "high").unwrap();
    let ls = states.iter().find(|s| s["spin_state"] == "low").unwrap();
    assert_eq!(hs["bands"].as_array().unwrap().len(), 1);
    assert_eq!(hs["max_expected"], 2);
    assert_eq!(ls["is_ground"], true);
    assert_eq!(hs["is_ground"], false);
    assert_eq!(
        (ls["min_expected"].as_u64(), ls["max_expected"].as_u64()),
        (Some(1), Some(2))
    );
    assert_eq!(v["verdict"], "neither");
    // With the ammine charge-transfer onset (about 45 000 cm⁻¹) both bands are expected.
    let v = bands(&[
        "--metal",
        "Co",
        "--ox",
        "3",
        "--ligand",
        "NH3:6",
        "--geometry",
        "oct",
        "--dq",
        "2303",
        "--b",
        "634.8",
        "--c-over-b",
        "4.8",
        "--observed",
        "2",
    ]);
    let ls = v["spin_states"]
        .as_array()
        .unwrap()
        .iter()
        .find(|s| s["spin_state"] == "low")
        .unwrap()
        .clone();
    assert_eq!(
        (ls["min_expected"].as_u64(), ls["max_expected"].as_u64()),
        (Some(2), Some(2))
    );
    assert_eq!(v["charge_transfer_ligand"], "NH3");
}

#[test]
fn high_spin_d5_has_no_spin_allowed_bands() {
    // d5 HS 6A1g: no spin-allowed d–d bands (A. B. P. Lever, Inorganic Electronic Spectroscopy,
    // 1984, from memory): the bands listed are its weak spin-forbidden quartets, none of which
    // need be seen, so 0 observed bands fit too. Field and B of an invented Mn(II) complex.
    let v = bands(&[
        "--dn",
        "5",
        "--geometry",
        "oct",
        "--dq",
        "850",
        "--b",
        "860",
        "--observed",
        "0",
    ]);
    let hs = &v["spin_states"][0];
    let listed = hs["bands"].as_array().unwrap();
    assert!(!listed.is_empty());
    assert!(listed.iter().all(|b| b["weak"] == true), "{listed:?}");
    assert!(listed
        .iter()
        .all(|b| b["label"].as_str().unwrap().starts_with('4')));
    assert_eq!(hs["min_expected"], 0);
    assert_eq!(hs["supports_observed"], true);
    let notes: Vec<&str> = v["notes"]
        .as_array()
        .unwrap()
        .iter()
        .map(|n| n.as_str().unwrap())
        .collect();
    assert!(notes.iter().any(|n| n.contains("no spin-allowed")));
    // The 4A1g,4Eg(G) pair belongs to the ground configuration t2g3 eg2 and gives the sharp,
    // field-independent band of Mn(II) (Lever 1984, from memory): no Jahn–Teller shoulder.
    let eg_g = listed
        .iter()
        .find(|b| b["label"] == "4Eg(G)")
        .expect("4Eg(G) listed");
    assert_eq!(eg_g["jahn_teller"], false);
}

#[test]
fn notes_mention_charge_transfer_and_jahn_teller() {
    // d9 2Eg ground term: Jahn–Teller broadened or split (Lever 1984, from memory).
    let (code, out, _) = run(&[
        "bands",
        "--dn",
        "9",
        "--geometry",
        "oct",
        "--delta",
        "12500",
        "--b",
        "1000",
    ]);
    assert_eq!(code, 0);
    assert!(out.contains("charge-transfer"), "{out}");
    assert!(out.contains("Jahn–Teller"), "{out}");
    assert!(out.contains("2Eg → 2T2g"), "{out}");
}

#[test]
fn window_and_resolution_change_the_count() {
    let base = [
        "--dn",
        "3",
        "--geometry",
        "oct",
        "--dq",
        "1740",
        "--b",
        "728.6",
    ];
    let mut narrow = base.to_vec();
    narrow.extend(["--window", "350-500"]);
    let v = bands(&narrow);
    // Only ν2 (24 600 cm⁻¹, 407 nm) lies between 350 and 500 nm.
    assert_eq!(v["spin_states"][0]["merged"].as_array().unwrap().len(), 1);
    let mut coarse = base.to_vec();
    coarse.extend(["--resolution", "8000"]);
    let v = bands(&coarse);
    let merged = v["spin_states"][0]["merged"].as_array().unwrap();
    assert_eq!(merged.len(), 2);
    assert_eq!(merged[0]["members"].as_array().unwrap().len(), 2);
}

/// Bad input: (arguments after `bands`, a fragment the one-line error must contain).
const BAD_INPUT: &[(&[&str], &str)] = &[
    (
        &[
            "--dn",
            "3",
            "--geometry",
            "oct",
            "--dq",
            "1740",
            "--b",
            "728.6",
            "--window",
            "900-300",
        ],
        "--window",
    ),
    (
        &[
            "--dn",
            "3",
            "--geometry",
            "oct",
            "--dq",
            "1740",
            "--b",
            "728.6",
            "--window",
            "abc",
        ],
        "--window",
    ),
    (
        &[
            "--dn",
            "3",
            "--geometry",
            "oct",
            "--dq",
            "1740",
            "--b",
            "728.6",
            "--resolution",
            "-5",
        ],
        "--resolution",
    ),
    (
        &[
            "--dn",
            "3",
            "--geometry",
            "oct",
            "--dq",
            "1740",
            "--b",
            "-1",
        ],
        "--b",
    ),
    (
        &[
            "--dn",
            "11",
            "--geometry",
            "oct",
            "--dq",
            "1740",
            "--b",
            "700",
        ],
        "--dn",
    ),
    (
        &[
            "--dn",
            "3",
            "--geometry",
            "oct",
            "--dq",
            "-10",
            "--b",
            "700",
        ],
        "Dq",
    ),
];

#[test]
fn bad_input_is_rejected_with_exit_code_2() {
    for (args, needle) in BAD_INPUT {
        let mut full = vec!["bands"];
        full.extend_from_slice(args);
        expect_usage_error(&full, needle);
    }
    // No field given: a parser error, exit code 2.
    let (code, _, _) = run(&["bands", "--dn", "3", "--geometry", "oct", "--b", "700"]);
    assert_eq!(code, 2);
}

#[test]
fn complex_from_the_tables() {
    // [Co(NH3)6]3+: low-spin d6 with two spin-allowed bands (1T1g, 1T2g) in the visible
    // (Lever 1984, from memory); the estimate comes from Jørgensen's f and g.
    let out = assert_cmd::Command::cargo_bin("spinstate")
        .unwrap()
        .args([
            "bands",
            "--metal",
            "Co",
            "--ox",
            "3",
            "--geometry",
            "oct",
            "--ligand",
            "NH3:6",
            "--observed",
            "2",
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
    assert_eq!(v["dn"], 6);
    let text = v.to_string();
    assert!(text.contains("1T1g"), "{text}");
}
