//! `check --input` as a stream: every row comes back once, in input order, across chunk
//! boundaries, in the table, JSON, JSON-lines and CSV outputs; a file that is not line-based
//! text is refused instead of being read into memory. (Row accounting — rows in = reported +
//! rejected — is common practice for batch tools.)

use crate::common::*;

/// The demo rows repeated past two chunks, every 97th row made bad (an unknown metal).
fn big_batch(rows: usize) -> (tempfile::TempDir, std::path::PathBuf, Vec<bool>) {
    let demo = include_str!("../../data/demo/samples.csv");
    let mut lines = demo.lines();
    let header = lines.next().unwrap();
    let body: Vec<&str> = lines.filter(|l| !l.trim().is_empty()).collect();
    let mut text = format!("{header}\n");
    let mut good = Vec::new();
    for i in 0..rows {
        let line = body[i % body.len()];
        if i % 97 == 5 {
            text.push_str(&line.replacen(",Fe,", ",Xq,", 1).replacen(",Co,", ",Xq,", 1));
            good.push(!line.contains(",Fe,") && !line.contains(",Co,"));
        } else {
            text.push_str(line);
            good.push(true);
        }
        text.push('\n');
    }
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("batch.csv");
    std::fs::write(&path, text).unwrap();
    (dir, path, good)
}

#[test]
fn every_row_comes_back_once_in_order() {
    let rows = 1200;
    let (_dir, path, good) = big_batch(rows);
    let bad = good.iter().filter(|g| !**g).count();
    assert!(bad >= 10);
    let p = path.to_str().unwrap();

    let (code, out, _) = run(&["check", "--input", p, "--jsonl"]);
    assert_eq!(code, 2, "bad rows give exit code 2");
    let lines: Vec<serde_json::Value> = out
        .lines()
        .map(|l| serde_json::from_str(l).unwrap())
        .collect();
    assert_eq!(lines.len(), rows);
    for (i, v) in lines.iter().enumerate() {
        // Line 1 is the header, so row i sits on line i + 2.
        assert_eq!(v["row"], i + 2, "line {i}");
        assert_eq!(v.get("sample").is_some(), good[i], "row {}", i + 2);
        assert_eq!(v.get("error").is_some(), !good[i], "row {}", i + 2);
    }

    let (_, out, _) = run(&["check", "--input", p, "--json"]);
    let v: serde_json::Value = serde_json::from_str(&out).unwrap();
    let samples = v["samples"].as_array().unwrap();
    let errors = v["errors"].as_array().unwrap();
    assert_eq!(samples.len() + errors.len(), rows);
    assert_eq!(errors.len(), bad);
    let order: Vec<u64> = samples.iter().map(|s| s["row"].as_u64().unwrap()).collect();
    assert!(order.windows(2).all(|w| w[0] < w[1]));
    assert!(v["safety"].as_str().unwrap().contains("cyanide"));

    let dir = tempfile::tempdir().unwrap();
    let csv = dir.path().join("out.csv");
    let (_, table, _) = run(&["check", "--input", p, "--csv", csv.to_str().unwrap()]);
    assert!(table.contains("Safety:"));
    let mut reader = csv::Reader::from_path(&csv).unwrap();
    let got: Vec<String> = reader
        .records()
        .map(|r| r.unwrap().get(0).unwrap().to_string())
        .collect();
    let want: Vec<String> = (0..rows).map(|i| (i + 2).to_string()).collect();
    assert_eq!(got, want);
}

#[test]
fn a_file_without_line_breaks_is_refused() {
    let dir = tempfile::tempdir().unwrap();
    let path = dir.path().join("blob.csv");
    std::fs::write(&path, vec![b'a'; 2 << 20]).unwrap();
    let (code, _, err) = run(&["check", "--input", path.to_str().unwrap()]);
    assert_eq!(code, 2);
    assert!(err.contains("longer than"), "{err}");
    assert_eq!(err.lines().count(), 1, "{err}");
}

#[test]
fn rows_keep_their_line_numbers_after_crlf_and_blank_lines() {
    // A spreadsheet export with CRLF line ends, blank lines and a stray line: every row is
    // named by its true line in the file (header = line 1).
    let dir = tempfile::tempdir().unwrap();
    for (name, eol) in [("crlf.csv", "\r\n"), ("lf.csv", "\n")] {
        let text = [
            "name,metal,ox,geometry,ligands",
            "A,Fe,2,oct,H2O:6",
            "B,Xq,2,oct,H2O:6",
            "",
            "",
            "stray",
            "C,Fe,9,oct,H2O:6",
            "",
        ]
        .join(eol);
        let path = dir.path().join(name);
        std::fs::write(&path, text).unwrap();
        let (_, out, err) = run(&["check", "--input", path.to_str().unwrap(), "--jsonl"]);
        let rows: Vec<u64> = out
            .lines()
            .map(|l| {
                serde_json::from_str::<serde_json::Value>(l).unwrap()["row"]
                    .as_u64()
                    .unwrap()
            })
            .collect();
        assert_eq!(rows, [2, 3, 6, 7], "{name}");
        assert!(
            err.contains("row 3 (B)") && err.contains("row 7 (C)"),
            "{name}: {err}"
        );
    }
}
