//! The one output layer, for every command: `--json` is one JSON document (T. Bray, RFC 8259,
//! "The JavaScript Object Notation (JSON) Data Interchange Format", 2017), `--csv -` and
//! `--svg -` put that form on stdout instead of the table ('-' for standard output is common
//! practice), the same bytes as the file form, and a form a command does not have is refused
//! in one line. CSV is read as RFC 4180 describes it (Y. Shafranovich, "Common Format and MIME
//! Type for Comma-Separated Values (CSV) Files", 2005): a header, then records of its width.

use crate::common::run;
use serde_json::Value;

/// One quick run of every command (and of each way `data`, `check` and `predict` produce
/// their output); a command missing here fails `every_command_has_an_example`.
const EXAMPLES: &[&[&str]] = &[
    &[
        "levels",
        "--dn",
        "3",
        "--geometry",
        "oct",
        "--b",
        "728.6",
        "--c",
        "3278.7",
        "--dq",
        "1740",
    ],
    &[
        "levels",
        "--dn",
        "7",
        "--geometry",
        "oct",
        "--b",
        "800",
        "--c",
        "3700",
        "--dq",
        "920",
        "--zeta",
        "533",
    ],
    &[
        "diagram",
        "--dn",
        "6",
        "--geometry",
        "oct",
        "--c-over-b",
        "4.8",
        "--points",
        "21",
    ],
    &["crossover", "--dn", "6"],
    &[
        "evans",
        "--shift-ppm",
        "0.49",
        "--conc",
        "0.010",
        "--temp",
        "298",
        "--dia=-2.45e-4",
    ],
    &[
        "moment",
        "--chi-t",
        "3.35",
        "--temp",
        "300",
        "--dn",
        "6",
        "--geometry",
        "oct",
    ],
    &[
        "magnetism",
        "--metal",
        "Co",
        "--ox",
        "2",
        "--geometry",
        "oct",
        "--ligand",
        "H2O:6",
        "--tmin",
        "50",
        "--tmax",
        "300",
        "--points",
        "6",
    ],
    &[
        "predict",
        "--metal",
        "Fe",
        "--ox",
        "2",
        "--geometry",
        "oct",
        "--ligand",
        "NCS:2",
        "--ligand",
        "py:4",
    ],
    &[
        "predict",
        "--metal",
        "Fe",
        "--ox",
        "2",
        "--ligand",
        "bpy:3",
        "--structure",
        "data/demo/demo_fe_hs_250K.cif",
    ],
    &[
        "screen",
        "--metal",
        "Fe",
        "--ox",
        "2",
        "--geometry",
        "oct",
        "--pool",
        "H2O,NH3,py,NCS",
        "--top",
        "5",
    ],
    &["data", "ions"],
    &["data", "ligands"],
    &["data", "pascal"],
    &["data", "moment-ranges"],
    &["data", "bond-lengths"],
    &[
        "fit-bands",
        "--dn",
        "3",
        "--geometry",
        "oct",
        "--bands",
        "16800,23500,36900",
        "--b0",
        "918",
    ],
    &[
        "fit-bands",
        "--metal",
        "Cu",
        "--ox",
        "2",
        "--geometry",
        "tetragonal",
        "--bands",
        "8000,12000,14500",
    ],
    &[
        "bands",
        "--dn",
        "7",
        "--geometry",
        "oct",
        "--dq",
        "950",
        "--b",
        "800",
        "--observed",
        "1",
    ],
    &[
        "check",
        "--metal",
        "Fe",
        "--ox",
        "2",
        "--geometry",
        "oct",
        "--ligand",
        "NCS:2",
        "--ligand",
        "MeCN:4",
        "--mu-eff",
        "5.3",
        "--moment-temp",
        "300",
    ],
    &["check", "--input", "data/demo/samples.csv"],
    &[
        "check",
        "--structure",
        "data/demo/demo_fe_ls_100K.cif",
        "--ox",
        "2",
        "--ligand",
        "bpy:3",
    ],
    &["demo"],
    &[
        "sco-fit",
        "--input",
        "data/demo/sco_curve.csv",
        "--metal",
        "Fe",
        "--ox",
        "2",
    ],
    &[
        "sco-curve",
        "--dh",
        "12",
        "--ds",
        "80",
        "--gamma",
        "3.2",
        "--points",
        "11",
    ],
    &[
        "structure",
        "data/demo/demo_fe_hs_250K.cif",
        "data/demo/demo_fe_ls_100K.cif",
        "--ox",
        "2",
    ],
    &["schema", "levels"],
];

fn with(args: &[&str], extra: &[&str]) -> Vec<String> {
    args.iter().chain(extra).map(|s| s.to_string()).collect()
}

fn run_owned(args: &[String]) -> (i32, String, String) {
    let refs: Vec<&str> = args.iter().map(String::as_str).collect();
    run(&refs)
}

/// Whether `command --help` lists `option`.
fn takes(command: &str, option: &str) -> bool {
    let (code, help, _) = run(&[command, "--help"]);
    assert_eq!(code, 0);
    help.lines()
        .any(|l| l.trim_start().starts_with(&format!("{option} ")))
}

/// The subcommands `spinstate --help` lists.
fn commands() -> Vec<String> {
    let (code, help, _) = run(&["--help"]);
    assert_eq!(code, 0);
    help.lines()
        .skip_while(|l| !l.starts_with("Commands:"))
        .skip(1)
        .take_while(|l| l.starts_with("  "))
        .filter_map(|l| l.split_whitespace().next())
        .filter(|c| *c != "help")
        .map(str::to_string)
        .collect()
}

/// Records of a CSV text: the header and at least one record, all of the header's width.
fn csv_records(text: &str) -> usize {
    let mut r = csv::Reader::from_reader(text.as_bytes());
    let width = r.headers().expect("CSV header").len();
    assert!(width >= 2, "{text}");
    let mut n = 0;
    for rec in r.records() {
        assert_eq!(rec.expect("CSV record").len(), width, "{text}");
        n += 1;
    }
    n
}

#[test]
fn every_command_has_an_example() {
    let listed = commands();
    assert!(listed.len() >= 16, "{listed:?}");
    for c in &listed {
        assert!(
            EXAMPLES.iter().any(|e| e[0] == c.as_str()),
            "no example for `{c}` in EXAMPLES"
        );
    }
}

#[test]
fn json_of_every_command_is_one_object() {
    for e in EXAMPLES {
        let (code, out, err) = run_owned(&with(e, &["--json"]));
        assert_eq!(code, 0, "{e:?}: {err}");
        let v: serde_json::Value =
            serde_json::from_str(&out).unwrap_or_else(|x| panic!("{e:?}: bad JSON ({x}): {out}"));
        assert!(v.is_object(), "{e:?}: not an object");
        assert!(!err.contains("panicked"), "{err}");
    }
}

#[test]
fn csv_dash_goes_to_stdout_where_a_command_has_csv() {
    let dir = tempfile::tempdir().unwrap();
    let mut with_csv = 0;
    for e in EXAMPLES {
        let (code, out, err) = run_owned(&with(e, &["--csv", "-"]));
        if !takes(e[0], "--csv") {
            assert_eq!(code, 2, "{e:?} took --csv: {out}");
            assert!(out.is_empty() && err.trim().lines().count() == 1, "{err}");
            assert!(err.contains("--csv"), "{err}");
            continue;
        }
        with_csv += 1;
        assert_eq!(code, 0, "{e:?}: {err}");
        assert!(csv_records(&out) >= 1, "{e:?}");
        // The file form holds the same bytes, noted on stderr, with the table on stdout.
        let file = dir.path().join(format!("{}.csv", e[0]));
        let (code, table, err) = run_owned(&with(e, &["--csv", file.to_str().unwrap()]));
        assert_eq!(code, 0, "{e:?}: {err}");
        assert_eq!(std::fs::read_to_string(&file).unwrap(), out, "{e:?}");
        assert!(err.contains("wrote"), "{e:?}: {err}");
        assert!(!table.is_empty() && table != out, "{e:?}");
    }
    // diagram, magnetism, screen, check (one, batch, structure), sco-fit, sco-curve.
    assert!(with_csv >= 8, "{with_csv}");
}

#[test]
fn svg_dash_goes_to_stdout_where_a_command_draws() {
    let dir = tempfile::tempdir().unwrap();
    let mut drawn = 0;
    for e in EXAMPLES.iter().filter(|e| takes(e[0], "--svg")) {
        drawn += 1;
        let (code, out, err) = run_owned(&with(e, &["--svg", "-"]));
        assert_eq!(code, 0, "{e:?}: {err}");
        let doc = roxmltree::Document::parse(&out).unwrap_or_else(|x| panic!("{e:?}: {x}"));
        assert_eq!(doc.root_element().tag_name().name(), "svg");
        let file = dir.path().join(format!("{}.svg", e[0]));
        let (code, _, err) = run_owned(&with(e, &["--svg", file.to_str().unwrap()]));
        assert_eq!(code, 0, "{err}");
        assert_eq!(std::fs::read_to_string(&file).unwrap(), out, "{e:?}");
        // Only one form can have stdout.
        let (code, out, err) = run_owned(&with(e, &["--svg", "-", "--csv", "-"]));
        assert_eq!(code, 2, "{e:?}");
        assert!(out.is_empty() && err.trim().lines().count() == 1, "{err}");
        assert!(err.contains("--csv - and --svg -"), "{err}");
    }
    // diagram, magnetism, sco-fit, sco-curve.
    assert_eq!(drawn, 4);
    // A command without a figure refuses --svg in one line.
    let (code, out, err) = run_owned(&with(EXAMPLES[0], &["--svg", "-"]));
    assert_eq!(code, 2);
    assert!(out.is_empty() && err.trim().lines().count() == 1, "{err}");
    assert!(err.contains("--svg"), "{err}");
}

#[test]
fn jsonl_only_where_rows_stream() {
    for e in EXAMPLES {
        let (code, out, err) = run_owned(&with(e, &["--jsonl"]));
        let streams = e[0] == "check" && e.contains(&"--input");
        if !streams {
            assert_eq!(code, 2, "{e:?} took --jsonl: {out}");
            assert!(err.contains("--jsonl"), "{err}");
            continue;
        }
        assert_eq!(code, 0, "{err}");
        let lines: Vec<&str> = out.lines().collect();
        assert!(lines.len() >= 5, "{out}");
        for l in lines {
            let v: serde_json::Value = serde_json::from_str(l).unwrap();
            assert!(v["row"].is_u64(), "{l}");
        }
    }
}

/// Resolves a local `$ref` ("#/$defs/Name") against the root schema.
fn resolve<'a>(root: &'a Value, schema: &'a Value) -> &'a Value {
    match schema.get("$ref").and_then(Value::as_str) {
        Some(r) => root
            .pointer(r.trim_start_matches('#'))
            .unwrap_or_else(|| panic!("dangling $ref {r}")),
        None => schema,
    }
}

/// Whether `v` has the JSON type `t` (an integer is also a number).
fn has_type(v: &Value, t: &str) -> bool {
    match t {
        "null" => v.is_null(),
        "boolean" => v.is_boolean(),
        "integer" => v.is_i64() || v.is_u64(),
        "number" => v.is_number(),
        "string" => v.is_string(),
        "array" => v.is_array(),
        "object" => v.is_object(),
        _ => panic!("unknown type {t}"),
    }
}

/// Checks `v` against the part of JSON Schema (draft 2020-12) the report schemas use: `type`,
/// `properties` with `required` (and no key outside them), `items`, `oneOf`/`anyOf`, `$ref`,
/// `enum`/`const`. Returns what does not fit, with its path.
fn mismatch(root: &Value, schema: &Value, v: &Value, path: &str) -> Option<String> {
    let s = resolve(root, schema);
    if let Some(alts) = s
        .get("oneOf")
        .or_else(|| s.get("anyOf"))
        .and_then(Value::as_array)
    {
        let fits = alts
            .iter()
            .filter(|a| mismatch(root, a, v, path).is_none())
            .count();
        let ok = if s.get("oneOf").is_some() {
            fits == 1
        } else {
            fits >= 1
        };
        if !ok {
            return Some(format!("{path}: {fits} alternatives fit"));
        }
    }
    if let Some(t) = s.get("type") {
        let types: Vec<&str> = match t {
            Value::String(t) => vec![t.as_str()],
            Value::Array(ts) => ts.iter().filter_map(Value::as_str).collect(),
            _ => panic!("type {t}"),
        };
        if !types.iter().any(|t| has_type(v, t)) {
            return Some(format!("{path}: {v} is not {types:?}"));
        }
    }
    if let Some(options) = s.get("enum").and_then(Value::as_array) {
        if !options.contains(v) {
            return Some(format!("{path}: {v} not in {options:?}"));
        }
    }
    if let Some(c) = s.get("const") {
        if c != v {
            return Some(format!("{path}: {v} is not {c}"));
        }
    }
    if let (Some(props), Some(obj)) = (
        s.get("properties").and_then(Value::as_object),
        v.as_object(),
    ) {
        for key in s
            .get("required")
            .and_then(Value::as_array)
            .into_iter()
            .flatten()
        {
            if !obj.contains_key(key.as_str().unwrap()) {
                return Some(format!("{path}: required {key} missing"));
            }
        }
        for (k, x) in obj {
            let Some(p) = props.get(k) else {
                return Some(format!("{path}: {k} is not in the schema"));
            };
            if let Some(m) = mismatch(root, p, x, &format!("{path}.{k}")) {
                return Some(m);
            }
        }
    }
    if let (Some(items), Some(arr)) = (s.get("items"), v.as_array()) {
        for (i, x) in arr.iter().enumerate() {
            if let Some(m) = mismatch(root, items, x, &format!("{path}[{i}]")) {
                return Some(m);
            }
        }
    }
    None
}

/// The schema of a command's --json.
fn schema(command: &str) -> Value {
    let (code, out, err) = run(&["schema", command]);
    assert_eq!(code, 0, "{err}");
    serde_json::from_str(&out).unwrap()
}

/// `schema COMMAND` describes what `COMMAND --json` prints: every example's output fits its
/// command's schema, with no field the schema lacks (the schema is derived from the report
/// types, so a new field shows up in both).
#[test]
fn schema_of_every_command_fits_its_json() {
    let mut checked = 0;
    for e in EXAMPLES.iter().filter(|e| e[0] != "schema") {
        let s = schema(e[0]);
        assert_eq!(
            s["$schema"], "https://json-schema.org/draft/2020-12/schema",
            "{e:?}"
        );
        let (code, out, err) = run_owned(&with(e, &["--json"]));
        assert_eq!(code, 0, "{err}");
        let v: Value = serde_json::from_str(&out).unwrap();
        if let Some(m) = mismatch(&s, &s, &v, e[0]) {
            panic!("{e:?}: {m}");
        }
        checked += 1;
    }
    assert!(checked >= 25, "{checked}");
    // The checker itself refuses what does not fit.
    let s = schema("crossover");
    let (_, out, _) = run(&["crossover", "--dn", "6", "--json"]);
    let mut v: Value = serde_json::from_str(&out).unwrap();
    v["crossovers"][0]["dn"] = Value::from("six");
    assert!(mismatch(&s, &s, &v, "crossover").is_some());
    v["crossovers"][0]["dn"] = Value::from(6);
    v["extra"] = Value::from(1);
    assert!(mismatch(&s, &s, &v, "crossover").is_some());
    let (code, _, err) = run(&["schema", "nonsense"]);
    assert_eq!(code, 2);
    assert_eq!(err.trim().lines().count(), 1, "{err}");
}

/// Every number in every command's JSON has a description (which states its unit, or that it
/// is a count or dimensionless: units in JSON field docs are the project's rule).
#[test]
fn every_number_in_a_schema_is_described() {
    fn walk(s: &Value, at: &str, missing: &mut Vec<String>) {
        if let Some(props) = s.get("properties").and_then(Value::as_object) {
            for (k, p) in props {
                let types = match p.get("type") {
                    Some(Value::String(t)) => vec![t.clone()],
                    Some(Value::Array(ts)) => ts
                        .iter()
                        .filter_map(|t| t.as_str().map(String::from))
                        .collect(),
                    _ => Vec::new(),
                };
                let item_number = p["items"]["type"] == "number";
                let numeric = types.iter().any(|t| t == "number" || t == "integer") || item_number;
                if numeric && p.get("description").is_none() {
                    missing.push(format!("{at}.{k}"));
                }
            }
        }
        if let Some(defs) = s.get("$defs").and_then(Value::as_object) {
            for (name, d) in defs {
                walk(d, name, missing);
            }
        }
        for kw in ["oneOf", "anyOf"] {
            for a in s.get(kw).and_then(Value::as_array).into_iter().flatten() {
                walk(a, at, missing);
            }
        }
    }
    let mut missing = Vec::new();
    for c in commands().iter().filter(|c| *c != "schema") {
        walk(&schema(c), c, &mut missing);
    }
    missing.sort();
    missing.dedup();
    assert!(
        missing.is_empty(),
        "numbers without a description: {missing:?}"
    );
}
