//! Integration tests of `spinstate evans`, running the real binary.

use crate::common::{command_json, number as f, spinstate};
use approx::assert_relative_eq;
use predicates::prelude::*;
use serde_json::Value;
use std::f64::consts::PI;

fn json(args: &[&str]) -> Value {
    command_json("evans", args)
}

// Worked example, computed here from the solenoid equation χ_M = 3Δf/(4π f c′) (Live & Chan, Anal. Chem.
// 1970, 42, 791; Schubert, J. Chem. Educ. 1992, 69, 62; from memory): 73.4 Hz at 400 MHz,
// 0.0125 mol/L, 298.15 K → χ_M = 3.5046×10⁻³ cm³ mol⁻¹, χT = 1.0449, μ_eff = 2.891 μB, n = 2.
#[test]
fn worked_example_json_fields() {
    let v = json(&[
        "--shift-hz",
        "73.4",
        "--freq-mhz",
        "400",
        "--conc",
        "0.0125",
        "--temp",
        "298.15",
    ]);
    let chi = 3000.0 * 73.4 / (4.0 * PI * 400e6 * 0.0125);
    assert_relative_eq!(f(&v, "chi_m"), chi, max_relative = 1e-12);
    assert_relative_eq!(f(&v, "chi_m_corrected"), chi, max_relative = 1e-12);
    assert_relative_eq!(f(&v, "chi_m_t"), 1.0449, max_relative = 1e-4);
    assert_relative_eq!(f(&v, "mu_eff"), 2.8907, epsilon = 2e-4);
    assert_eq!(f(&v, "mu_eff_err"), 0.0);
    assert_relative_eq!(f(&v, "unpaired"), 2.06, epsilon = 0.01);
    assert_eq!(v["unpaired_nearest"], 2);
    assert_eq!(v["units"], "cgs");
    assert_eq!(v["dia"]["method"], "none");
    assert!(v["safety"]
        .as_str()
        .unwrap()
        .contains("local risk assessment"));
}

// Same sample, field across the tube: the shift is half as large and of opposite sign
// (Δf/f = (4π/3 − α)κ, α = 0 or 2π; Evans, J. Chem. Soc. 1959, 2003, from memory).
#[test]
fn transverse_magnet_gives_the_same_chi_for_half_the_opposite_shift() {
    let a = json(&[
        "--shift-hz",
        "73.4",
        "--freq-mhz",
        "400",
        "--conc",
        "0.0125",
        "--temp",
        "298.15",
    ]);
    let b = json(&[
        "--shift-hz",
        "-36.7",
        "--freq-mhz",
        "400",
        "--conc",
        "0.0125",
        "--temp",
        "298.15",
        "--magnet",
        "transverse",
    ]);
    assert_relative_eq!(f(&a, "chi_m"), f(&b, "chi_m"), max_relative = 1e-12);
    assert_eq!(b["evans"]["magnet"], "transverse");
}

// SI output: χ_M(SI) = 4π×10⁻⁶ χ_M(cgs) (CRC Handbook note on units); μ_eff unchanged.
#[test]
fn si_units_on_request() {
    let a = json(&[
        "--shift-ppm",
        "0.1835",
        "--conc",
        "0.0125",
        "--temp",
        "298.15",
    ]);
    let b = json(&[
        "--shift-ppm",
        "0.1835",
        "--conc",
        "0.0125",
        "--temp",
        "298.15",
        "--units",
        "si",
    ]);
    assert_relative_eq!(
        f(&b, "chi_m"),
        f(&a, "chi_m") * 4.0 * PI * 1e-6,
        max_relative = 1e-12
    );
    assert_relative_eq!(f(&b, "mu_eff"), f(&a, "mu_eff"), max_relative = 1e-8);
    assert_eq!(b["chi_unit"], "m3/mol");
}

// Diamagnetic correction from a formula with Pascal's constants (Bain & Berry, J. Chem. Educ.
// 2008, 85, 532, as reproduced): 4 K+ −14.9, Fe2+ −12.8, 6 CN− −13.0, 3 H2O −13 → −189.4×10⁻⁶;
// the corrected χ is larger by that amount. Concentration from mass, volume and the formula's
// molar mass.
#[test]
fn pascal_correction_and_concentration_from_mass() {
    let v = json(&[
        "--shift-ppm",
        "0.2",
        "--mass",
        "5.28",
        "--volume",
        "0.6",
        "--temp",
        "298",
        "--formula",
        "{K+}4[{Fe2+}({CN-})6]·3{H2O}",
    ]);
    assert_relative_eq!(f(&v["dia"], "value"), -189.4e-6, max_relative = 1e-9);
    assert_relative_eq!(
        f(&v, "chi_m_corrected") - f(&v, "chi_m"),
        189.4e-6,
        max_relative = 1e-6
    );
    let mw = f(&v, "molar_mass");
    assert_relative_eq!(mw, 422.39, epsilon = 0.03);
    assert_relative_eq!(
        f(&v["evans"], "concentration"),
        5.28 / (mw * 0.6),
        max_relative = 1e-12
    );
    assert_eq!(v["dia"]["terms"].as_array().unwrap().len(), 4);
}

#[test]
fn rough_rule_is_flagged() {
    spinstate()
        .args([
            "evans",
            "--shift-ppm",
            "0.2",
            "--conc",
            "0.01",
            "--temp",
            "298",
            "--molar-mass",
            "400",
            "--dia-rough",
        ])
        .assert()
        .success()
        .stdout(predicate::str::contains("rough estimate"))
        .stdout(predicate::str::contains("-2.0000e-4"));
}

#[test]
fn uncertainties_propagate() {
    let v = json(&[
        "--shift-hz",
        "73.4",
        "--shift-err",
        "0.734",
        "--freq-mhz",
        "400",
        "--conc",
        "0.0125",
        "--conc-err",
        "0.00025",
        "--temp",
        "298.15",
    ]);
    let rel = 0.01f64.hypot(0.02);
    assert_relative_eq!(
        f(&v, "chi_m_err") / f(&v, "chi_m"),
        rel,
        max_relative = 1e-9
    );
    assert_relative_eq!(
        f(&v, "mu_eff_err") / f(&v, "mu_eff"),
        rel / 2.0,
        max_relative = 1e-9
    );
}

// Comparison for a d4 octahedral complex: 4.85 μB in the high-spin window (4.7–5.0 typical,
// Figgis & Lewis 1960, from memory); spin-only 4.90 and 2.83 (computed, √(n(n+2))).
#[test]
fn comparison_with_spin_states() {
    // χT for μ = 4.85: (4.85/2.82787)² = 2.9415; χ = 2.9415/298.15 = 9.866e-3; Δδ = χ c/2.3873e-4.
    let chi = (4.85f64 / 2.82787).powi(2) / 298.15;
    let ppm = chi * 0.01 / (3e3 / (4.0 * PI) * 1e-6);
    let v = json(&[
        "--shift-ppm",
        &format!("{ppm}"),
        "--conc",
        "0.01",
        "--temp",
        "298.15",
        "--dn",
        "4",
        "--geometry",
        "oct",
    ]);
    assert_relative_eq!(f(&v, "mu_eff"), 4.85, epsilon = 1e-4);
    let c = &v["comparison"];
    assert_eq!(c["verdict"], "supports");
    assert_eq!(c["supported_state"], "high spin");
    assert_eq!(c["states"][0]["ground_term"], "5Eg");
    assert_eq!(c["states"][1]["ground_term"], "3T1g");
    assert_relative_eq!(f(&c["states"][0], "mu_spin_only"), 24f64.sqrt());
}

#[test]
fn help_carries_the_safety_note() {
    spinstate()
        .args(["evans", "--help"])
        .assert()
        .success()
        .stdout(predicate::str::contains("Safety:"))
        .stdout(predicate::str::contains("pacemakers"))
        .stdout(predicate::str::contains("cyanide"));
}

fn fails(args: &[&str], message: &str) {
    spinstate()
        .arg("evans")
        .args(args)
        .assert()
        .code(2)
        .stderr(predicate::str::contains(message));
}

/// The measured shift most bad-input cases start from.
const SHIFT: [&str; 4] = ["--freq-mhz", "400", "--shift-hz", "73.4"];

/// Bad input: (arguments after `evans`, then more arguments, a fragment the error must contain).
const BAD_INPUT: &[(&[&str], &[&str], &str)] = &[
    (
        &SHIFT,
        &["--conc", "0", "--temp", "298"],
        "--conc 0 must be > 0",
    ),
    (
        &SHIFT,
        &["--conc", "-0.01", "--temp", "298"],
        "must be > 0 mol/L",
    ),
    (
        &SHIFT,
        &["--conc", "0.01", "--temp", "0"],
        "--temp 0 must be > 0 K",
    ),
    (
        &SHIFT,
        &["--conc", "0.01", "--temp", "-20"],
        "--temp -20 must be > 0 K",
    ),
    (
        &[
            "--shift-hz",
            "-73.4",
            "--freq-mhz",
            "400",
            "--conc",
            "0.01",
            "--temp",
            "298",
        ],
        &[],
        "change its sign",
    ),
    (
        &[
            "--shift-hz",
            "36.7",
            "--freq-mhz",
            "400",
            "--conc",
            "0.01",
            "--temp",
            "298",
            "--magnet",
            "transverse",
        ],
        &[],
        "use the solenoid magnet geometry (options: --magnet)",
    ),
    (
        &SHIFT,
        &["--conc", "0.01", "--temp", "298", "--formula", "FeXq2"],
        "unknown element 'Xq'",
    ),
    (
        &SHIFT,
        &["--conc", "0.01", "--temp", "298", "--formula", "Fe(CN6"],
        "character 3",
    ),
    (
        &SHIFT,
        &["--conc", "0.01", "--temp", "298", "--dia", "1e-4"],
        "must be ≤ 0",
    ),
    (
        &["--shift-hz", "73.4", "--conc", "0.01", "--temp", "298"],
        &[],
        "--freq-mhz",
    ),
    (
        &SHIFT,
        &["--mass", "5", "--volume", "0.6", "--temp", "298"],
        "--formula or --molar-mass",
    ),
    (
        &SHIFT,
        &["--conc", "0.01", "--temp", "298", "--magnet", "sideways"],
        "solenoid",
    ),
    (
        &SHIFT,
        &[
            "--conc",
            "0.01",
            "--temp",
            "298",
            "--dn",
            "11",
            "--geometry",
            "oct",
        ],
        "--dn 11",
    ),
];

#[test]
fn bad_input_exits_2() {
    for (args, more, needle) in BAD_INPUT {
        let full: Vec<&str> = args.iter().chain(more.iter()).copied().collect();
        fails(&full, needle);
    }
}

// `--data DIR` replaces the bundled Pascal table; a bad row is reported with row and column.
#[test]
fn data_directory_overrides_the_pascal_table() {
    let dir = tempfile::tempdir().unwrap();
    std::fs::write(
        dir.path().join("pascal.csv"),
        "kind,name,formula,value_1e-6_cm3_per_mol,source\natom,H,H,-3.00,test row (invented)\n",
    )
    .unwrap();
    let out = spinstate()
        .args(["--data", dir.path().to_str().unwrap()])
        .args([
            "evans",
            "--shift-ppm",
            "0.2",
            "--conc",
            "0.01",
            "--temp",
            "298",
            "--formula",
            "H2",
            "--json",
        ])
        .output()
        .unwrap();
    assert!(
        out.status.success(),
        "{}",
        String::from_utf8_lossy(&out.stderr)
    );
    let v: Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_relative_eq!(f(&v["dia"], "value"), -6.0e-6, max_relative = 1e-12);
    std::fs::write(
        dir.path().join("pascal.csv"),
        "kind,name,formula,value_1e-6_cm3_per_mol,source\natom,H,H,minus,x\n",
    )
    .unwrap();
    spinstate()
        .args(["--data", dir.path().to_str().unwrap()])
        .args([
            "evans",
            "--shift-ppm",
            "0.2",
            "--conc",
            "0.01",
            "--temp",
            "298",
            "--formula",
            "H2",
        ])
        .assert()
        .code(2)
        .stderr(predicate::str::contains(
            "line 2, column value_1e-6_cm3_per_mol",
        ));
}
