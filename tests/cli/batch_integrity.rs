//! Batch integrity: for every batch command, rows in = rows reported + rows rejected; each
//! rejection names its line (and the sample, where there is one); and the results do not
//! depend on row order, line endings (LF or CRLF), a byte-order mark or blank lines.

use crate::common;
use serde_json::Value;
use std::collections::BTreeMap;
use std::path::Path;

/// The demo samples plus two bad rows (an unknown metal, a malformed number).
fn samples() -> Vec<String> {
    let text = std::fs::read_to_string("data/demo/samples.csv").unwrap();
    let mut lines: Vec<String> = text.lines().map(str::to_string).collect();
    let width = lines[0].split(',').count();
    let bad = |name: &str, metal: &str, ox: &str| {
        let mut cells = vec![String::new(); width];
        cells[0] = name.into();
        cells[1] = metal.into();
        cells[2] = ox.into();
        cells[3] = "oct".into();
        cells[4] = "H2O:6".into();
        cells.join(",")
    };
    lines.insert(3, bad("BAD-METAL", "Xx", "2"));
    lines.push(bad("BAD-OX", "Fe", "two"));
    lines
}

/// The variants of one file: as is, CRLF, with a BOM, with blank lines, rows reversed, rows
/// rotated, each with its header first.
fn variants(lines: &[String]) -> Vec<(&'static str, String)> {
    let header = &lines[0];
    let rows = &lines[1..];
    let join = |rows: &[String], sep: &str| {
        let mut s = header.clone();
        for r in rows {
            s.push_str(sep);
            s.push_str(r);
        }
        s.push_str(sep);
        s
    };
    let mut reversed = rows.to_vec();
    reversed.reverse();
    let mut rotated = rows.to_vec();
    rotated.rotate_left(3);
    let blank: Vec<String> = rows
        .iter()
        .flat_map(|r| [String::new(), r.clone()])
        .collect();
    vec![
        ("LF", join(rows, "\n")),
        ("CRLF", join(rows, "\r\n")),
        ("BOM", format!("\u{feff}{}", join(rows, "\n"))),
        ("blank lines", join(&blank, "\n")),
        ("reversed", join(&reversed, "\r\n")),
        ("rotated", join(&rotated, "\n")),
    ]
}

/// The 1-based line of the row whose first cell is `name` in `text`.
fn line_of(text: &str, name: &str) -> usize {
    text.trim_start_matches('\u{feff}')
        .lines()
        .position(|l| l.split(',').next() == Some(name))
        .map(|i| i + 1)
        .unwrap_or_else(|| panic!("{name} not in the file"))
}

fn without_rows(mut v: Value) -> Value {
    if let Value::Object(map) = &mut v {
        map.remove("row");
        map.remove("line");
    }
    v
}

#[test]
fn check_batches_keep_every_row_whatever_the_layout() {
    let dir = tempfile::tempdir().unwrap();
    // Curve files named by the demo rows resolve next to the input file.
    for f in ["sco_curve.csv", "sco_evans.csv"] {
        std::fs::copy(Path::new("data/demo").join(f), dir.path().join(f)).unwrap();
    }
    let lines = samples();
    let rows_in = lines.len() - 1;
    let mut reference: Option<BTreeMap<String, Value>> = None;
    for (what, text) in variants(&lines) {
        let path = dir.path().join("samples.csv");
        std::fs::write(&path, &text).unwrap();
        let (code, out, err) = common::run(&["check", "--input", path.to_str().unwrap(), "--json"]);
        assert_eq!(code, 2, "{what}: bad rows give exit code 2; {err}");
        let v: Value = serde_json::from_str(&out).unwrap();
        let reported = v["samples"].as_array().unwrap();
        let rejected = v["errors"].as_array().unwrap();
        assert_eq!(
            reported.len() + rejected.len(),
            rows_in,
            "{what}: rows in = reported + rejected"
        );
        assert_eq!(
            err.lines().count(),
            rejected.len(),
            "{what}: one stderr line per bad row"
        );
        for e in rejected {
            let name = e["name"].as_str().expect("a rejection names its sample");
            assert_eq!(
                e["row"].as_u64().unwrap() as usize,
                line_of(&text, name),
                "{what}: {name} is named at its true line"
            );
            assert!(!e["column"].as_str().unwrap().is_empty());
        }
        let results: BTreeMap<String, Value> = reported
            .iter()
            .map(|s| {
                (
                    s["name"].as_str().unwrap().to_string(),
                    without_rows(s.clone()),
                )
            })
            .collect();
        match &reference {
            None => reference = Some(results),
            Some(r) => assert!(r == &results, "{what}: results differ from the LF file"),
        }
    }
}

#[test]
fn candidate_files_keep_every_row_whatever_the_layout() {
    let lines: Vec<String> = [
        "name,ligands",
        "A,NCS:2 py:4",
        "B,pyy:6",
        "C,bpy:2 NCS:2",
        "D,py:5",
        "E,H2O:6",
        "F,phen:2 NCS:2",
        "G,NH3:6",
    ]
    .iter()
    .map(|s| s.to_string())
    .collect();
    let rows_in = lines.len() - 1;
    let dir = tempfile::tempdir().unwrap();
    let mut reference: Option<Vec<(String, String)>> = None;
    for (what, text) in variants(&lines) {
        let path = dir.path().join("candidates.csv");
        std::fs::write(&path, &text).unwrap();
        let (code, out, err) = common::run(&[
            "screen",
            "--metal",
            "Fe",
            "--ox",
            "2",
            "--geometry",
            "oct",
            "--candidates",
            path.to_str().unwrap(),
            "--top",
            "100",
            "--json",
        ]);
        assert_eq!(code, 2, "{what}: {err}");
        let v: Value = serde_json::from_str(&out).unwrap();
        let bad = v["bad_rows"].as_u64().unwrap() as usize;
        let evaluated = v["evaluated"].as_u64().unwrap() as usize;
        assert_eq!(
            evaluated + bad,
            rows_in,
            "{what}: rows in = evaluated + rejected"
        );
        assert_eq!(err.lines().count(), bad, "{what}: one line per bad row");
        // The JSON names the rejected rows too, at their true lines.
        let rejected = v["rejected"].as_array().unwrap();
        assert_eq!(rejected.len(), bad, "{what}");
        let mut lines: Vec<usize> = rejected
            .iter()
            .map(|r| r["line"].as_u64().unwrap() as usize)
            .collect();
        lines.sort();
        let mut expected = vec![line_of(&text, "B"), line_of(&text, "D")];
        expected.sort();
        assert_eq!(lines, expected, "{what}: rejected rows at their lines");
        assert!(rejected.iter().all(|r| r["column"] == "ligands"));
        for (name, l) in [("B", line_of(&text, "B")), ("D", line_of(&text, "D"))] {
            assert!(
                err.contains(&format!("(line {l}), column ligands")),
                "{what}: row {name} at line {l}: {err}"
            );
        }
        let mut ranked: Vec<(String, String)> = v["results"]
            .as_array()
            .unwrap()
            .iter()
            .map(|r| (r["name"].as_str().unwrap().to_string(), r.to_string()))
            .collect();
        // Ties may come in file order; compare as a set of rows, and the order of names
        // separately where scores differ.
        ranked.sort();
        match &reference {
            None => reference = Some(ranked),
            Some(r) => assert!(r == &ranked, "{what}: results differ from the LF file"),
        }
    }
}
