//! Integration tests of `spinstate data`, running the real binary.

use assert_cmd::Command;
use predicates::str::contains;
use serde_json::Value;

fn json(args: &[&str]) -> Value {
    let out = Command::cargo_bin("spinstate")
        .unwrap()
        .args(args)
        .assert()
        .success()
        .get_output()
        .stdout
        .clone();
    serde_json::from_slice(&out).unwrap()
}

/// Every ion row has a source; d-electron counts follow group − oxidation state (common
/// practice: Fe(II) d6, Cu(II) d9, Pt(II) d8).
#[test]
fn ions_are_listed_with_sources() {
    let v = json(&["data", "ions", "--json"]);
    assert_eq!(v["origin"], "bundled");
    let ions = v["ions"].as_array().unwrap();
    assert!(ions.len() >= 40);
    for r in ions {
        assert!(!r["source"].as_str().unwrap().is_empty());
    }
    let find = |ion: &str| ions.iter().find(|r| r["ion"] == ion).unwrap().clone();
    assert_eq!(find("Fe(II)")["dn"], 6);
    assert_eq!(find("Cu(II)")["dn"], 9);
    assert_eq!(find("Pt(II)")["dn"], 8);
    assert_eq!(find("Pt(II)")["series"], "5d");
    Command::cargo_bin("spinstate")
        .unwrap()
        .args(["data", "ions"])
        .assert()
        .success()
        .stdout(contains("Fe(III)"))
        .stdout(contains("Jolly"));
}

#[test]
fn ligands_are_listed_with_sources() {
    let v = json(&["data", "ligands", "--json"]);
    let ligands = v["ligands"].as_array().unwrap();
    assert!(ligands.len() >= 30);
    for r in ligands {
        assert!(!r["source"].as_str().unwrap().is_empty());
        assert_eq!(
            r["denticity"].as_u64().unwrap() as usize,
            r["donors"].as_array().unwrap().len()
        );
    }
    Command::cargo_bin("spinstate")
        .unwrap()
        .args(["data", "ligands"])
        .assert()
        .success()
        .stdout(contains("phen"))
        .stdout(contains("Jørgensen"));
}

#[test]
fn data_directory_adds_a_ligand() {
    let dir = tempfile::tempdir().unwrap();
    let mut text = include_str!("../../data/ligands.csv").to_string();
    text.push_str(
        "Lx,invented-ligand,N,1,0,1.10,printed,,,,none,oct tet sqpl,,invented test row\n",
    );
    std::fs::write(dir.path().join("ligands.csv"), text).unwrap();
    let d = dir.path().to_str().unwrap();
    let v = json(&["--data", d, "data", "ligands", "--json"]);
    assert_eq!(v["origin"], d);
    assert!(v["ligands"]
        .as_array()
        .unwrap()
        .iter()
        .any(|r| r["name"] == "Lx"));
    // The ion table was not replaced and stays the bundled one.
    let v = json(&["--data", d, "data", "ions", "--json"]);
    assert!(v["ions"].as_array().unwrap().len() >= 40);
}

#[test]
fn bad_tables_and_options_fail_with_exit_code_2() {
    let dir = tempfile::tempdir().unwrap();
    let mut text = include_str!("../../data/ions.csv").to_string();
    text.push_str("Fe,7,5000,,,,,hs,,,,bad row\n");
    std::fs::write(dir.path().join("ions.csv"), text).unwrap();
    Command::cargo_bin("spinstate")
        .unwrap()
        .arg("--data")
        .arg(dir.path())
        .args(["data", "ions"])
        .assert()
        .code(2)
        .stderr(contains("column b0"))
        .stderr(contains("ions.csv"));
    Command::cargo_bin("spinstate")
        .unwrap()
        .args(["--data", "/no/such/dir", "data", "ions"])
        .assert()
        .code(2)
        .stderr(contains("--data"));
    Command::cargo_bin("spinstate")
        .unwrap()
        .args(["data", "metals"])
        .assert()
        .code(2);
}

/// A table is read only when a command needs it: a broken pascal.csv in `--data` does not stop
/// `predict` or `data ions`, and is reported (file, line, column, exit code 2) by the commands
/// that use it.
#[test]
fn a_broken_table_matters_only_to_the_commands_that_use_it() {
    let dir = tempfile::tempdir().unwrap();
    std::fs::write(
        dir.path().join("pascal.csv"),
        "kind,name,formula,value_1e-6_cm3_per_mol,source\natom,H,H,-2.93,test row\natom,C,C,lots,test row\n",
    )
    .unwrap();
    let d = dir.path().to_str().unwrap();
    let predict = [
        "--data",
        d,
        "predict",
        "--metal",
        "Fe",
        "--ox",
        "2",
        "--geometry",
        "oct",
        "--ligand",
        "H2O:6",
    ];
    Command::cargo_bin("spinstate")
        .unwrap()
        .args(predict)
        .assert()
        .success();
    let v = json(&["--data", d, "data", "ions", "--json"]);
    assert!(v["ions"].as_array().unwrap().len() >= 40);
    for args in [
        vec!["--data", d, "data", "pascal"],
        vec![
            "--data",
            d,
            "evans",
            "--shift-ppm",
            "0.2",
            "--conc",
            "0.01",
            "--temp",
            "298",
            "--formula",
            "CH4",
        ],
    ] {
        Command::cargo_bin("spinstate")
            .unwrap()
            .args(&args)
            .assert()
            .code(2)
            .stderr(contains(
                "pascal.csv: line 3, column value_1e-6_cm3_per_mol",
            ));
    }
}

#[test]
fn every_table_lists_with_a_source_on_every_row() {
    for (table, key) in [
        ("pascal", "entries"),
        ("moment-ranges", "ranges"),
        ("bond-lengths", "rows"),
    ] {
        let out = assert_cmd::Command::cargo_bin("spinstate")
            .unwrap()
            .args(["data", table, "--json"])
            .output()
            .unwrap();
        assert!(out.status.success(), "{table}");
        let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
        let rows = v[key].as_array().unwrap();
        assert!(!rows.is_empty(), "{table}");
        for r in rows {
            assert!(
                !r["source"].as_str().unwrap().trim().is_empty(),
                "{table}: {r}"
            );
        }
    }
}
