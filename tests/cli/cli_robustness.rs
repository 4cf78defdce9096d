//! Every command run with hostile arguments: huge, subnormal, negative and non-finite numbers,
//! empty and very long strings, non-UTF-8 bytes and look-alike characters, missing files,
//! directories given as files, /dev/null and /dev/zero. Each run must end with exit code 0 or
//! 2 within its time limit, with at most one line of diagnosis on stderr when it fails, and
//! never with a panic or an abort.
//!
//! The options of each command are read from its own `--help`, so a new option is covered
//! without editing this file. Runs happen in a temporary directory, so output files named by a
//! hostile value land there.

use rayon::prelude::*;
use std::ffi::OsString;
use std::os::unix::ffi::OsStringExt;
use std::path::{Path, PathBuf};
use std::time::Duration;

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

/// A valid invocation of each command.
fn bases() -> Vec<Vec<String>> {
    let r = root();
    let demo = |f: &str| r.join("data/demo").join(f).display().to_string();
    let s = |v: &[&str]| v.iter().map(|x| x.to_string()).collect::<Vec<_>>();
    vec![
        s(&[
            "levels",
            "--dn",
            "6",
            "--geometry",
            "oct",
            "--b",
            "600",
            "--c",
            "2800",
            "--dq",
            "2000",
        ]),
        s(&[
            "diagram",
            "--dn",
            "6",
            "--geometry",
            "oct",
            "--points",
            "20",
        ]),
        s(&["crossover", "--dn", "6", "--geometry", "oct"]),
        s(&[
            "evans",
            "--shift-hz",
            "73.4",
            "--freq-mhz",
            "400",
            "--conc",
            "0.0125",
            "--temp",
            "298.15",
        ]),
        s(&["moment", "--chi", "0.01", "--temp", "300"]),
        s(&[
            "magnetism",
            "--dn",
            "6",
            "--geometry",
            "oct",
            "--b",
            "600",
            "--c",
            "2800",
            "--dq",
            "1000",
            "--points",
            "5",
        ]),
        s(&[
            "predict",
            "--metal",
            "Fe",
            "--ox",
            "2",
            "--geometry",
            "oct",
            "--ligand",
            "H2O:6",
        ]),
        s(&[
            "screen",
            "--metal",
            "Fe",
            "--ox",
            "2",
            "--geometry",
            "oct",
            "--pool",
            "py,NCS,bpy",
            "--top",
            "3",
        ]),
        s(&["data"]),
        s(&[
            "fit-bands",
            "--dn",
            "3",
            "--geometry",
            "oct",
            "--bands",
            "17400,24600",
        ]),
        s(&[
            "bands",
            "--dn",
            "6",
            "--geometry",
            "oct",
            "--b",
            "600",
            "--dq",
            "2000",
        ]),
        vec![
            "check".into(),
            "--metal".into(),
            "Fe".into(),
            "--ox".into(),
            "2".into(),
            "--geometry".into(),
            "oct".into(),
            "--ligand".into(),
            "H2O:6".into(),
            "--mu-eff".into(),
            "5.2".into(),
        ],
        s(&["demo"]),
        vec!["sco-fit".into(), "--input".into(), demo("sco_curve.csv")],
        s(&["sco-curve", "--dh", "12", "--ds", "80", "--points", "20"]),
        vec!["structure".into(), demo("demo_fe_ls_100K.cif")],
    ]
}

/// The value-taking options of a command, from its help text.
fn options(command: &str) -> Vec<String> {
    let out = assert_cmd::Command::cargo_bin("spinstate")
        .unwrap()
        .args([command, "--help"])
        .output()
        .unwrap();
    let help = String::from_utf8_lossy(&out.stdout);
    help.lines()
        .filter_map(|l| {
            let l = l.trim_start();
            let l = l.strip_prefix("-h, ").unwrap_or(l);
            let (name, rest) = l.split_once(' ')?;
            (name.starts_with("--") && rest.trim_start().starts_with('<')).then(|| name.to_string())
        })
        .collect()
}

/// Hostile values, each tried on every option.
fn hostile(dir: &Path) -> Vec<OsString> {
    let mut v: Vec<OsString> = [
        "",
        " ",
        "0",
        "-1",
        "-0",
        "1e-320",
        "4.9e-324",
        "1e308",
        "-1e308",
        "1e400",
        "NaN",
        "inf",
        "-inf",
        "18446744073709551617",
        "0x10",
        "1,5",
        "１７４００",
        "Ｆｅ",
        "Fe\u{200b}",
        "H₂O:6",
        "\u{202e}evil",
        "a\nb",
        "--",
        "-",
        "/dev/null",
        "/dev/zero",
        "/nonexistent/spinstate/x.csv",
    ]
    .iter()
    .map(OsString::from)
    .collect();
    v.push(OsString::from("9".repeat(5000)));
    v.push(OsString::from("x".repeat(70_000)));
    v.push(OsString::from_vec(vec![0x66, 0xff, 0xfe, 0x65]));
    v.push(dir.as_os_str().to_owned());
    v
}

/// A word of the output that shows a non-finite number ("inf", "NaN", "∞"), with its
/// surroundings, if any.
/// A needle that one of the arguments carries (a formula "NaN" is sodium nitride, echoed) is
/// not a finding.
fn non_finite(text: &str, args: &[OsString]) -> Option<String> {
    let bytes = text.as_bytes();
    for needle in ["inf", "NaN", "nan", "∞"] {
        if args.iter().any(|a| a.to_string_lossy().contains(needle)) {
            continue;
        }
        let mut from = 0;
        while let Some(i) = text[from..].find(needle) {
            let at = from + i;
            let end = at + needle.len();
            let letter = |b: Option<&u8>| b.is_some_and(|b| b.is_ascii_alphabetic());
            let before = at.checked_sub(1).and_then(|j| bytes.get(j));
            if !letter(before) && !letter(bytes.get(end)) {
                let lo = text[..at]
                    .char_indices()
                    .rev()
                    .nth(30)
                    .map_or(0, |(j, _)| j);
                let hi = text[end..]
                    .char_indices()
                    .nth(30)
                    .map_or(text.len(), |(j, _)| end + j);
                return Some(text[lo..hi].to_string());
            }
            from = end;
        }
    }
    None
}

/// Runs one argument list and checks the contract; returns a description of a breach.
fn breach(args: &[OsString], dir: &Path) -> Option<String> {
    let out = assert_cmd::Command::cargo_bin("spinstate")
        .unwrap()
        .args(args)
        .current_dir(dir)
        .timeout(Duration::from_secs(60))
        .output()
        .unwrap();
    let err = String::from_utf8_lossy(&out.stderr);
    let shown: Vec<String> = args
        .iter()
        .map(|a| {
            let s = a.to_string_lossy();
            if s.len() > 40 {
                format!(
                    "{}…({} bytes)",
                    &s[..s.char_indices().nth(20).map_or(s.len(), |(i, _)| i)],
                    s.len()
                )
            } else {
                s.into_owned()
            }
        })
        .collect();
    let Some(code) = out.status.code() else {
        return Some(format!("{shown:?}: killed or timed out; stderr {err}"));
    };
    if err.contains("panicked") || err.contains("RUST_BACKTRACE") {
        return Some(format!("{shown:?}: panic: {err}"));
    }
    let stdout = String::from_utf8_lossy(&out.stdout);
    match code {
        0 => non_finite(&stdout, args)
            .map(|w| format!("{shown:?}: a non-finite number in the output: …{w}…")),
        2 => {
            let lines = err.lines().filter(|l| !l.trim().is_empty()).count();
            if lines == 1 && err.starts_with("error: ") {
                None
            } else {
                Some(format!(
                    "{shown:?}: exit 2 with {lines} stderr lines: {err}"
                ))
            }
        }
        c => Some(format!("{shown:?}: exit code {c}: {err}")),
    }
}

#[test]
fn every_option_of_every_command_survives_hostile_values() {
    let dir = tempfile::tempdir().unwrap();
    let values = hostile(dir.path());
    let mut runs: Vec<Vec<OsString>> = Vec::new();
    for base in bases() {
        let command = base[0].clone();
        for opt in options(&command) {
            for value in &values {
                let mut args: Vec<OsString> = base.iter().map(OsString::from).collect();
                match args.iter().position(|a| a.to_str() == Some(opt.as_str())) {
                    Some(i) if i + 1 < args.len() => args[i + 1] = value.clone(),
                    _ => {
                        args.push(OsString::from(&opt));
                        args.push(value.clone());
                    }
                }
                runs.push(args);
            }
        }
        // A hostile positional value where the command takes files.
        if command == "structure" || command == "sco-fit" {
            for value in &values {
                let mut args: Vec<OsString> = base.iter().map(OsString::from).collect();
                let last = args.len() - 1;
                args[last] = value.clone();
                runs.push(args);
            }
        }
    }
    let breaches: Vec<String> = runs
        .par_iter()
        .filter_map(|args| breach(args, dir.path()))
        .collect();
    eprintln!("{} runs, {} breaches", runs.len(), breaches.len());
    assert!(
        breaches.is_empty(),
        "{} of {} runs broke the contract:\n{}",
        breaches.len(),
        runs.len(),
        breaches
            .iter()
            .take(40)
            .cloned()
            .collect::<Vec<_>>()
            .join("\n")
    );
}

#[test]
fn random_argument_lists_survive() {
    // Seeded pseudo-random lists: a command, then up to five of its options with values drawn
    // from the hostile list and from random printable text.
    let dir = tempfile::tempdir().unwrap();
    let values = hostile(dir.path());
    let commands: Vec<(String, Vec<String>)> = bases()
        .into_iter()
        .map(|b| (b[0].clone(), options(&b[0])))
        .collect();
    let mut state = 0x5eed_u64;
    let mut next = move || {
        state = state
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (state >> 33) as usize
    };
    let mut runs = Vec::new();
    for _ in 0..400 {
        let (command, opts) = &commands[next() % commands.len()];
        let mut args = vec![OsString::from(command)];
        for _ in 0..(next() % 6) {
            if opts.is_empty() {
                break;
            }
            args.push(OsString::from(&opts[next() % opts.len()]));
            let value = if next() % 3 == 0 {
                let n = next() % 12;
                OsString::from(
                    (0..n)
                        .map(|_| char::from(b' ' + (next() % 95) as u8))
                        .collect::<String>(),
                )
            } else {
                values[next() % values.len()].clone()
            };
            args.push(value);
        }
        runs.push(args);
    }
    let breaches: Vec<String> = runs
        .par_iter()
        .filter_map(|args| breach(args, dir.path()))
        .collect();
    assert!(
        breaches.is_empty(),
        "{} of {} runs broke the contract:\n{}",
        breaches.len(),
        runs.len(),
        breaches
            .iter()
            .take(40)
            .cloned()
            .collect::<Vec<_>>()
            .join("\n")
    );
}
