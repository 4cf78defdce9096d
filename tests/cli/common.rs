//! Helpers shared by the integration tests that run the real binary.
#![allow(dead_code)]

use assert_cmd::Command;

/// The built `spinstate` binary.
pub fn spinstate() -> Command {
    Command::cargo_bin("spinstate").expect("binary builds")
}

/// Runs the binary and returns (exit code, stdout, stderr).
pub fn run(args: &[&str]) -> (i32, String, String) {
    let out = spinstate().args(args).output().expect("binary runs");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

/// Runs the binary, expects success and parses stdout as JSON.
pub fn run_json(args: &[&str]) -> serde_json::Value {
    let (code, out, err) = run(args);
    assert_eq!(code, 0, "stderr: {err}");
    serde_json::from_str(&out).unwrap_or_else(|e| panic!("bad JSON ({e}): {out}"))
}

/// Expects a usage error: exit code 2, one line on stderr starting with "error:" and containing
/// `needle`, nothing on stdout.
pub fn expect_usage_error(args: &[&str], needle: &str) {
    let (code, out, err) = run(args);
    assert_eq!(code, 2, "args {args:?}: stderr {err}");
    assert!(out.is_empty(), "stdout should be empty: {out}");
    assert!(err.contains(needle), "stderr {err:?} lacks {needle:?}");
    assert!(!err.contains("panicked"), "{err}");
}

/// Runs `spinstate <command> <args> --json`, expects success and parses the JSON.
pub fn command_json(command: &str, args: &[&str]) -> serde_json::Value {
    let out = spinstate()
        .arg(command)
        .args(args)
        .arg("--json")
        .output()
        .expect("binary runs");
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    serde_json::from_slice(&out.stdout).expect("JSON output")
}

/// A number field of a JSON object, with a message naming it when missing.
pub fn number(v: &serde_json::Value, key: &str) -> f64 {
    v[key]
        .as_f64()
        .unwrap_or_else(|| panic!("{key} missing in {v}"))
}
