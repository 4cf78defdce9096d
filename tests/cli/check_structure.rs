//! `check --structure` and the bad input of `predict --structure` / `check --structure`, running
//! the real binary on the invented demo structures of data/demo.
//!
//! The bond-length calls rest on the Fe(II)–N ranges of data/bond_lengths.csv (low spin about
//! 1.95–2.00 Å, high spin 2.15–2.20 Å for FeN6: P. Gütlich, H. A. Goodwin, *Top. Curr. Chem.*
//! 2004, 233, 1, from memory; [Fe(2-pic)3]Cl2·EtOH 2.032/2.199 Å: IUPAC Gold Book, "spin
//! crossover"). The demo's high-spin form has a mean Fe–N well inside the high-spin range and
//! the low-spin form one inside the low-spin range, so the calls are fixed by the table, not by
//! this code.

use crate::common::{run, run_json};
use serde_json::Value;
use std::io::Write;

const HS: &str = "data/demo/demo_fe_hs_250K.cif";
const LS: &str = "data/demo/demo_fe_ls_100K.cif";

fn check_json(file: &str, extra: &[&str]) -> Value {
    let mut args = vec![
        "check",
        "--structure",
        file,
        "--ox",
        "2",
        "--ligand",
        "bpy:3",
    ];
    args.extend_from_slice(extra);
    args.push("--json");
    run_json(&args)
}

fn lines<'a>(v: &'a Value, kind: &str) -> Vec<&'a Value> {
    v["evidence"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|e| e["kind"] == kind)
        .collect()
}

/// The mean distance `spinstate structure` reports for the file's only centre (Å).
fn structure_mean(file: &str) -> f64 {
    let v = run_json(&["structure", file, "--ox", "2", "--json"]);
    v["centres"][0]["mean_distance"].as_f64().unwrap()
}

fn temp_file(suffix: &str, text: &str) -> tempfile::NamedTempFile {
    let mut f = tempfile::Builder::new().suffix(suffix).tempfile().unwrap();
    f.write_all(text.as_bytes()).unwrap();
    f
}

/// Exit code 2, nothing on stdout, exactly one line on stderr starting with "error:" and
/// containing `needle`.
fn one_line_error(args: &[&str], needle: &str) {
    let (code, out, err) = run(args);
    assert_eq!(code, 2, "{args:?}: {err}");
    assert!(out.is_empty(), "{args:?}: stdout {out}");
    let err = err.trim_end();
    assert!(!err.contains('\n'), "{args:?}: more than one line: {err}");
    assert!(err.starts_with("error: "), "{err}");
    assert!(err.contains(needle), "{args:?}: {err:?} lacks {needle:?}");
}

#[test]
fn high_spin_form_gives_a_high_spin_bond_length_line() {
    let v = check_json(HS, &[]);
    let bonds = lines(&v, "bond-length");
    assert_eq!(bonds.len(), 1, "{v}");
    let b = bonds[0];
    assert_eq!(b["supports"], "high-spin", "{b}");
    assert_ne!(b["strength"], "none", "{b}");
    // The mean in Å, as `structure` measures it, and the CIF's temperature.
    let mean = structure_mean(HS);
    assert!(
        b["measured"]
            .as_str()
            .unwrap()
            .contains(&format!("{mean:.3} Å")),
        "{b}"
    );
    assert_eq!(b["temperature_k"], 250.0);
    let s = &v["structure"];
    assert_eq!(s["centre"], "Fe1");
    assert_eq!(s["file"], HS);
    assert!((s["mean_distance"].as_f64().unwrap() - mean).abs() < 1e-9);
    assert_eq!(s["spin_state_from_bonds"], "high-spin");
    assert_eq!(v["verdict"], "high-spin", "{v}");
}

#[test]
fn low_spin_form_gives_a_low_spin_bond_length_line() {
    let v = check_json(LS, &[]);
    let b = lines(&v, "bond-length")[0];
    assert_eq!(b["supports"], "low-spin", "{b}");
    let mean = structure_mean(LS);
    assert!(
        b["measured"]
            .as_str()
            .unwrap()
            .contains(&format!("{mean:.3} Å")),
        "{b}"
    );
    assert_eq!(b["temperature_k"], 100.0);
    assert_eq!(v["structure"]["spin_state_from_bonds"], "low-spin");
    assert_eq!(v["verdict"], "low-spin", "{v}");
    // --structure-temp replaces the CIF's temperature.
    let v = check_json(LS, &["--structure-temp", "90"]);
    assert_eq!(lines(&v, "bond-length")[0]["temperature_k"], 90.0);
}

/// Without --geometry the field at the real geometry is the prediction; with it, the
/// composition's prediction comes first and the field is listed beside it. Either way the
/// field's spin is the one `predict --structure` gives for the same centre and ligands.
#[test]
fn the_structure_field_is_the_prediction_or_beside_it() {
    for file in [HS, LS] {
        let p = run_json(&[
            "predict",
            "--structure",
            file,
            "--metal",
            "Fe",
            "--ox",
            "2",
            "--ligand",
            "bpy:3",
            "--json",
        ]);
        let alone = check_json(file, &[]);
        let pred = lines(&alone, "prediction");
        assert_eq!(pred.len(), 1, "{alone}");
        assert!(lines(&alone, "structure-field").is_empty(), "{alone}");
        let spin = p["spin"].as_f64().unwrap();
        assert!(
            pred[0]["predicted"]
                .as_str()
                .unwrap()
                .contains(&format!("(S = {spin})")),
            "{}",
            pred[0]
        );
        assert_eq!(alone["structure"]["field_spin"], p["spin"]);
        assert_eq!(
            alone["structure"]["field_margin_scale"],
            p["margin_field_scale"]
        );

        let both = check_json(file, &["--geometry", "oct"]);
        let kinds: Vec<&str> = both["evidence"]
            .as_array()
            .unwrap()
            .iter()
            .map(|e| e["kind"].as_str().unwrap())
            .collect();
        assert_eq!(kinds[..2], ["prediction", "structure-field"], "{kinds:?}");
        assert!(
            both["evidence"][0]["predicted"]
                .as_str()
                .unwrap()
                .contains("crossover"),
            "{}",
            both["evidence"][0]
        );
        assert_eq!(both["structure"]["field_spin"], p["spin"]);
        // The two models agree or one of them takes no side on these forms.
        assert_eq!(both["structure"]["field_disagrees_with_composition"], false);
    }
    // The low-spin form's field is on the low-spin side (S = 0), outside the estimate's error.
    let v = check_json(LS, &[]);
    assert_eq!(v["structure"]["field_spin"], 0.0);
    assert_eq!(v["structure"]["field_supports"], "low-spin");
}

#[test]
fn typed_bond_length_and_structure_are_refused_together() {
    one_line_error(
        &[
            "check",
            "--structure",
            HS,
            "--ox",
            "2",
            "--ligand",
            "bpy:3",
            "--bond-length",
            "2.18",
        ],
        "--bond-length and --structure",
    );
    // Without --structure the typed bond length still works.
    let v = run_json(&[
        "check",
        "--metal",
        "Fe",
        "--ox",
        "2",
        "--geometry",
        "oct",
        "--ligand",
        "bpy:3",
        "--bond-length",
        "2.18",
        "--structure-temp",
        "250",
        "--json",
    ]);
    let b = lines(&v, "bond-length")[0];
    assert_eq!(b["supports"], "high-spin");
    assert_eq!(b["temperature_k"], 250.0);
    assert!(v["structure"].is_null());
}

#[test]
fn metal_and_composition_must_fit_the_structure() {
    one_line_error(
        &[
            "check",
            "--structure",
            HS,
            "--metal",
            "Co",
            "--ox",
            "2",
            "--ligand",
            "bpy:3",
        ],
        "is Fe",
    );
    one_line_error(
        &["check", "--structure", HS, "--ligand", "bpy:3"],
        "--structure needs --ox",
    );
    // Six donors cannot take a ligand set with four.
    one_line_error(
        &["check", "--structure", HS, "--ox", "2", "--ligand", "bpy:2"],
        "donor-atom count",
    );
    one_line_error(
        &["check", "--metal", "Fe", "--ox", "2", "--ligand", "bpy:3"],
        "--geometry is needed",
    );
}

const CELL: &str = "_cell_length_a 10\n_cell_length_b 10\n_cell_length_c 10\n_cell_angle_alpha 90\n_cell_angle_beta 90\n_cell_angle_gamma 90\n";
const SITES: &str =
    "loop_\n_atom_site_label\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n";

/// Each bad structure gives exit code 2 and a one-line message, for both commands.
#[test]
fn bad_structures_are_one_line_errors_for_predict_and_check() {
    let malformed = temp_file(
        ".cif",
        &format!("data_t\n{CELL}{SITES}Fe1 0 0 0\nN1 0.2 0\n"),
    );
    let no_metal = temp_file(
        ".cif",
        &format!("data_t\n{CELL}{SITES}C1 0 0 0\nN1 0.14 0 0\n"),
    );
    // Two iron centres, each with six N donors along the axes, far apart.
    let mut two = format!("data_t\n{CELL}{SITES}");
    for (k, x0) in [0.25, 0.75].iter().enumerate() {
        two.push_str(&format!("Fe{} {x0} 0.5 0.5\n", k + 1));
        for (j, (dx, dy, dz)) in [
            (0.2, 0.0, 0.0),
            (-0.2, 0.0, 0.0),
            (0.0, 0.2, 0.0),
            (0.0, -0.2, 0.0),
            (0.0, 0.0, 0.2),
            (0.0, 0.0, -0.2),
        ]
        .iter()
        .enumerate()
        {
            two.push_str(&format!(
                "N{}{} {} {} {}\n",
                k + 1,
                j + 1,
                x0 + dx,
                0.5 + dy,
                0.5 + dz
            ));
        }
    }
    let two = temp_file(".cif", &two);
    let cases: [(&str, &str); 4] = [
        ("data/demo/no_such_file.cif", "cannot read"),
        (malformed.path().to_str().unwrap(), "CIF line 14"),
        (no_metal.path().to_str().unwrap(), "no d-block metal"),
        (two.path().to_str().unwrap(), "2 metal centres"),
    ];
    for (file, needle) in cases {
        one_line_error(
            &[
                "predict",
                "--structure",
                file,
                "--metal",
                "Fe",
                "--ox",
                "2",
                "--ligand",
                "bpy:3",
            ],
            needle,
        );
        one_line_error(
            &[
                "check",
                "--structure",
                file,
                "--ox",
                "2",
                "--ligand",
                "bpy:3",
            ],
            needle,
        );
    }
    // A choice among the two metals makes both commands work.
    let p = two.path().to_str().unwrap();
    let v = check_json(p, &["--metal-label", "Fe2"]);
    assert_eq!(v["structure"]["centre"], "Fe2");
}

/// With Δ and B given, the composition (each spin state at its own bond length) can sit on the
/// low-spin side while the field at the high-spin form's long bonds (e ∝ r⁻ⁿ) is on the
/// high-spin side: the report says they disagree, and the measured bonds decide.
#[test]
fn composition_and_field_disagreeing_is_said() {
    let given = ["--delta", "17000", "--b", "700"];
    let mut extra = vec!["--geometry", "oct"];
    extra.extend_from_slice(&given);
    let v = check_json(HS, &extra);
    assert_eq!(v["evidence"][0]["supports"], "low-spin", "{v}");
    assert_eq!(lines(&v, "structure-field")[0]["supports"], "high-spin");
    assert_eq!(v["structure"]["field_disagrees_with_composition"], true);
    let reasons = v["reasons"].to_string();
    assert!(
        reasons.contains("disagrees with the composition"),
        "{reasons}"
    );
    assert_eq!(v["verdict"], "high-spin");
    // Without --geometry the field is the prediction, and the note says the composition
    // differs.
    let v = check_json(HS, &given);
    assert_eq!(v["evidence"][0]["supports"], "high-spin", "{v}");
    assert!(
        v["reasons"]
            .to_string()
            .contains("the structure's field is used as the prediction"),
        "{v}"
    );
}

/// Co(II) has no absolute bond-length ranges in the table (only the change on going high spin,
/// [Co(tpy)2](CF3SO3)2: Crystals 2018, 8, 155): the bond line takes no side and says so, and
/// the per-element means are listed for the mixed N4O2 set.
#[test]
fn cobalt_bonds_take_no_side_without_absolute_ranges() {
    let v = run_json(&[
        "check",
        "--structure",
        "tests/structures/triclinic_co.cif",
        "--ox",
        "2",
        "--ligand",
        "py:4",
        "--ligand",
        "H2O:2",
        "--json",
    ]);
    let b = lines(&v, "bond-length")[0];
    assert_eq!(b["supports"], "none", "{b}");
    let detail = b["detail"].as_str().unwrap();
    assert!(detail.contains("only the change"), "{detail}");
    assert!(detail.contains("Crystals 2018"), "{detail}");
    let measured = b["measured"].as_str().unwrap();
    assert!(
        measured.contains("Co–N") && measured.contains("Co–O"),
        "{measured}"
    );
    assert_eq!(v["structure"]["spin_state_from_bonds"], "none");
}
