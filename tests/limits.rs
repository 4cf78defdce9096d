//! Hostile inputs that once crashed, wrapped or ran without bound: each is now refused with
//! one line that states the limit, and exit code 2. The limits themselves are design choices
//! (stated beside each); the chemistry behind them is common practice.

mod common;

use common::{expect_usage_error, run};

#[test]
fn ligand_counts_are_bounded_where_they_are_parsed() {
    // No coordination sphere holds more than 12 donor atoms (common practice).
    let base = ["predict", "--metal", "Fe", "--ox", "2", "--geometry", "oct"];
    let mut huge = base.to_vec();
    huge.extend(["--ligand", "H2O:18446744073709551617"]);
    expect_usage_error(&huge, "1 to 12");
    let mut wraps = base.to_vec();
    wraps.extend(["--ligand", "H2O:9223372036854775809"]);
    expect_usage_error(&wraps, "1 to 12");
}

#[test]
fn deep_or_huge_formulas_are_refused_not_overflowed() {
    let deep = format!("{}H{}", "(".repeat(1000), ")".repeat(1000));
    let args = [
        "moment",
        "--chi",
        "0.01",
        "--temp",
        "300",
        "--formula",
        &deep,
    ];
    expect_usage_error(&args, "nested deeper than 32");
}

#[test]
fn subnormal_b_and_huge_zeta_are_range_errors() {
    expect_usage_error(
        &[
            "levels",
            "--dn",
            "3",
            "--geometry",
            "oct",
            "--b",
            "1e-310",
            "--c",
            "3000",
            "--dq",
            "0",
        ],
        "B = 1e-310",
    );
    expect_usage_error(
        &[
            "magnetism",
            "--dn",
            "5",
            "--geometry",
            "oct",
            "--b",
            "800",
            "--c",
            "3000",
            "--dq",
            "1000",
            "--zeta",
            "1e300",
        ],
        "from 0 to 1e12",
    );
}

#[test]
fn curve_points_are_bounded() {
    expect_usage_error(
        &[
            "magnetism",
            "--dn",
            "5",
            "--geometry",
            "oct",
            "--b",
            "800",
            "--c",
            "3000",
            "--dq",
            "1000",
            "--points",
            "100000000",
        ],
        "2 to 100000",
    );
}

#[test]
fn one_rule_for_data_across_commands() {
    // Each command line runs without --data; with a --data directory that does not exist every
    // one is refused with a message that names --data.
    let missing = "/nonexistent/spinstate-data";
    let commands: [&[&str]; 4] = [
        &[
            "predict",
            "--metal",
            "Fe",
            "--ox",
            "2",
            "--geometry",
            "oct",
            "--ligand",
            "H2O:6",
        ],
        &[
            "moment",
            "--chi",
            "0.01",
            "--temp",
            "300",
            "--temp-err",
            "1",
        ],
        &[
            "evans",
            "--shift-hz",
            "73.4",
            "--freq-mhz",
            "400",
            "--conc",
            "0.0125",
            "--temp",
            "298.15",
        ],
        &[
            "levels",
            "--dn",
            "3",
            "--geometry",
            "oct",
            "--b",
            "700",
            "--c",
            "3000",
            "--dq",
            "1700",
        ],
    ];
    for args in commands {
        let (code, _, err) = run(args);
        assert_eq!(code, 0, "{args:?} runs without --data: {err}");
        let mut full = vec!["--data", missing];
        full.extend(args.iter().copied());
        expect_usage_error(&full, "--data");
    }
    // A real directory for a command that reads no table: it runs, and says --data is unused.
    let dir = tempfile::tempdir().unwrap();
    let (code, _, err) = run(&[
        "--data",
        dir.path().to_str().unwrap(),
        "levels",
        "--dn",
        "3",
        "--geometry",
        "oct",
        "--b",
        "700",
        "--c",
        "3000",
        "--dq",
        "1700",
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(err.contains("--data is not used"), "{err}");
}
