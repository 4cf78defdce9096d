//! Hostile inputs that once crashed, wrapped or ran without bound: each is now refused with
//! one line that states the limit, and exit code 2. The limits themselves are design choices
//! (stated beside each); the chemistry behind them is common practice.

use crate::common::{expect_usage_error, run};

/// Limits stated in one line: (arguments, a fragment the error must contain). `DEEP` stands for
/// a formula nested 1000 brackets deep.
const LIMITS: &[(&[&str], &str)] = &[
    // No coordination sphere holds more than 12 donor atoms (common practice).
    (
        &[
            "predict",
            "--metal",
            "Fe",
            "--ox",
            "2",
            "--geometry",
            "oct",
            "--ligand",
            "H2O:18446744073709551617",
        ],
        "1 to 12",
    ),
    (
        &[
            "predict",
            "--metal",
            "Fe",
            "--ox",
            "2",
            "--geometry",
            "oct",
            "--ligand",
            "H2O:9223372036854775809",
        ],
        "1 to 12",
    ),
    // Deep or huge formulas are refused, not overflowed.
    (
        &[
            "moment",
            "--chi",
            "0.01",
            "--temp",
            "300",
            "--formula",
            "DEEP",
        ],
        "nested deeper than 32",
    ),
    // A subnormal B and a huge ζ are range errors.
    (
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
    ),
    (
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
    ),
    // Curve points are bounded.
    (
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
    ),
];

#[test]
fn limits_are_refused_in_one_line() {
    let deep = format!("{}H{}", "(".repeat(1000), ")".repeat(1000));
    for (args, needle) in LIMITS {
        let args: Vec<&str> = args
            .iter()
            .map(|&a| if a == "DEEP" { deep.as_str() } else { a })
            .collect();
        expect_usage_error(&args, needle);
    }
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

#[test]
fn an_unclosed_quote_is_an_error_that_names_its_line() {
    // A quote opened at the start of a field and never closed (RFC 4180 quoting) would make the
    // CSV reader swallow every row after it; each reader refuses it instead.
    let dir = tempfile::tempdir().unwrap();
    let samples = dir.path().join("samples.csv");
    std::fs::write(
        &samples,
        "name,metal,ox,geometry,ligands\r\nA,Fe,2,oct,H2O:6\r\n\"B,Fe,2,oct,H2O:6\r\nC,Fe,2,oct,H2O:6\r\n",
    )
    .unwrap();
    let (code, out, err) = run(&["check", "--input", samples.to_str().unwrap()]);
    assert_eq!(code, 2, "{err}");
    assert!(err.contains("line 3 opens a quoted field"), "{err}");
    assert_eq!(err.lines().count(), 1, "{err}");
    // The row before the quote is still reported.
    assert!(out.contains("A:"), "{out}");

    let candidates = dir.path().join("candidates.csv");
    std::fs::write(&candidates, "name,ligands\nA,H2O:6\n\"B,py:6\n").unwrap();
    expect_usage_error(
        &[
            "screen",
            "--metal",
            "Fe",
            "--ox",
            "2",
            "--geometry",
            "oct",
            "--candidates",
            candidates.to_str().unwrap(),
        ],
        "line 3 opens a quoted field",
    );

    // A data table with an unclosed quote is refused with the table's name.
    let data = dir.path().join("data");
    std::fs::create_dir(&data).unwrap();
    let ligands = std::fs::read_to_string("data/ligands.csv").unwrap();
    let open_line = ligands.lines().count() + 1;
    std::fs::write(
        data.join("ligands.csv"),
        format!(
            "{}\n\"XX,a ligand whose row opens a quote\n",
            ligands.trim_end()
        ),
    )
    .unwrap();
    let (code, _, err) = run(&[
        "predict",
        "--data",
        data.to_str().unwrap(),
        "--metal",
        "Fe",
        "--ox",
        "2",
        "--geometry",
        "oct",
        "--ligand",
        "H2O:6",
    ]);
    assert_eq!(code, 2, "{err}");
    assert!(
        err.contains("ligands.csv")
            && err.contains(&format!("line {open_line} opens a quoted field")),
        "{err}"
    );
}

#[test]
fn bond_length_table_rows_must_keep_the_two_ranges_apart() {
    // A row whose low-spin range overlaps its high-spin range would read a bond length inside
    // both as either state and give confident wrong verdicts; it is refused with its row and
    // column. Ranges may touch, and either may be the shorter (Mn(III)–O phenolate shortens on
    // going high spin in the bundled table's source), but the change delta_r_a must go the way
    // the ranges go.
    use spinstate::tables::bond_lengths::BondLengthTable;
    use spinstate::tables::Table;
    let header = "metal,oxidation_state,donor,donor_class,ls_min_a,ls_max_a,hs_min_a,hs_max_a,delta_r_a,what,source";
    let row =
        |cells: &str| format!("{header}\nFe,2,N,any,{cells},typical,invented for this test\n");
    assert!(BondLengthTable::parse(&row("1.95,2.00,2.15,2.20,0.20")).is_ok());
    assert!(BondLengthTable::parse(&row("1.85,1.89,1.89,1.93,0.04")).is_ok());
    let e = BondLengthTable::parse(&row("1.95,2.16,2.15,2.20,0.20"))
        .unwrap_err()
        .to_string();
    assert!(
        e.contains("line 2, column ls_max_a") && e.contains("overlaps"),
        "{e}"
    );
    let e = BondLengthTable::parse(&row("1.95,2.00,2.15,2.20,-0.20"))
        .unwrap_err()
        .to_string();
    assert!(
        e.contains("delta_r_a") && e.contains("opposite sign"),
        "{e}"
    );
    // The row is named by its true line after CRLF line ends and a blank line.
    let crlf = format!(
        "{header}\r\nFe,2,N,any,1.95,2.00,2.15,2.20,0.20,typical,invented for this test\r\n\r\nFe,3,N,any,1.95,2.16,2.15,2.20,0.20,typical,invented for this test\r\n"
    );
    let e = BondLengthTable::parse(&crlf).unwrap_err().to_string();
    assert!(e.contains("line 4, column ls_max_a"), "{e}");
}

#[test]
fn options_that_do_not_apply_are_refused() {
    // Each option below only means something with another one; given alone it is refused,
    // naming both, instead of being accepted without a word.
    let fe = [
        "--metal",
        "Fe",
        "--ox",
        "2",
        "--geometry",
        "oct",
        "--ligand",
        "H2O:6",
    ];
    let with = |head: &[&str], tail: &[&str]| -> Vec<String> {
        head.iter().chain(tail).map(|s| s.to_string()).collect()
    };
    let magnetism = [
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
    ];
    let cases: Vec<(Vec<String>, &str)> = vec![
        (
            with(&["check"], &[&fe[..], &["--jsonl"]].concat()),
            "--jsonl",
        ),
        (
            with(&["predict"], &[&fe[..], &["--cutoff", "2.5"]].concat()),
            "--cutoff",
        ),
        (
            with(&["predict"], &[&fe[..], &["--metal-index", "2"]].concat()),
            "--metal-index",
        ),
        (with(&magnetism, &["--plot", "chit"]), "--plot"),
        (with(&magnetism, &["--column", "double"]), "--column"),
        (
            with(&magnetism, &["--measured", "data/demo/sco_curve.csv"]),
            "--measured",
        ),
        (
            with(
                &["sco-curve", "--dh", "12", "--ds", "80"],
                &["--plot", "gamma"],
            ),
            "--plot",
        ),
        (
            with(
                &["sco-fit", "--input", "data/demo/sco_curve.csv"],
                &["--magnet", "transverse"],
            ),
            "--magnet",
        ),
        (
            with(
                &[
                    "diagram",
                    "--dn",
                    "6",
                    "--geometry",
                    "oct",
                    "--c-over-b",
                    "4.8",
                ],
                &["--highlight-spins"],
            ),
            "--highlight-spins",
        ),
    ];
    for (args, option) in cases {
        let args: Vec<&str> = args.iter().map(String::as_str).collect();
        expect_usage_error(&args, &format!("{option} applies only with"));
    }
}
