//! Integration tests of `spinstate moment`, running the real binary.

use crate::common::{command_json, number as f, spinstate};
use approx::assert_relative_eq;
use predicates::prelude::*;
use serde_json::Value;
use std::f64::consts::PI;

fn json(args: &[&str]) -> Value {
    command_json("moment", args)
}

// χ_M = 1.4677×10⁻² cm³ mol⁻¹ at 298.15 K → μ_eff = 5.916 μB, n = 5; in SI the same χ is
// 1.8444×10⁻⁷ m³ mol⁻¹ and 797.7 √(χT) gives the same moment (μ_eff = 2.828 √(χT), Bain & Berry,
// J. Chem. Educ. 2008, 85, 532, eq 3a; χ_SI = 4π×10⁻⁶ χ_cgs, CRC Handbook of Chemistry and Physics,
// note on magnetic susceptibility units; the numbers computed here).
#[test]
fn chi_in_cgs_and_si() {
    let a = json(&["--chi", "1.4677e-2", "--temp", "298.15"]);
    assert_relative_eq!(f(&a, "mu_eff"), 5.916, epsilon = 1e-3);
    assert_eq!(a["unpaired_nearest"], 5);
    let b = json(&["--chi", "1.8444e-7", "--units", "si", "--temp", "298.15"]);
    assert_relative_eq!(f(&b, "mu_eff"), 5.916, epsilon = 1e-3);
    assert_relative_eq!(f(&b, "chi_m"), 1.8444e-7, max_relative = 1e-12);
    assert_relative_eq!(
        797.73 * (f(&b, "chi_m_t")).sqrt(),
        f(&b, "mu_eff"),
        max_relative = 1e-5
    );
    assert_relative_eq!(
        2.82787 * (f(&a, "chi_m_t")).sqrt(),
        f(&a, "mu_eff"),
        max_relative = 1e-5
    );
}

// Spin-only χT = n(n+2)/8 (Bain & Berry 2008, eq 3a): μ_eff of √(n(n+2)) gives χT within
// 0.04 % of n(n+2)/8 (the exact constant is 0.12505).
#[test]
fn spin_only_chi_t_from_mu_eff() {
    for n in 1..=5 {
        let n = n as f64;
        let mu = (n * (n + 2.0)).sqrt();
        let v = json(&["--mu-eff", &format!("{mu}"), "--temp", "300"]);
        assert_relative_eq!(f(&v, "chi_m_t"), n * (n + 2.0) / 8.0, max_relative = 5e-4);
        assert_relative_eq!(f(&v, "unpaired"), n, max_relative = 1e-9);
    }
}

#[test]
fn chi_t_input() {
    let v = json(&["--chi-t", "3.0", "--chi-t-err", "0.06", "--temp", "300"]);
    assert_relative_eq!(f(&v, "chi_m_corrected"), 0.01, max_relative = 1e-12);
    assert_relative_eq!(
        f(&v, "mu_eff_err") / f(&v, "mu_eff"),
        0.01,
        max_relative = 1e-9
    );
}

// Magnetometer: χ_M = M·MW/(mass·H) (common practice); the SI reading of the same sample
// (10⁻³ A m² per emu, 0.1 T for 1000 Oe) must give the same moment (computed).
#[test]
fn magnetometer_cgs_and_si() {
    let a = json(&[
        "--magnetisation",
        "2.45e-4",
        "--field",
        "1000",
        "--sample-mass",
        "20",
        "--molar-mass",
        "500",
        "--temp",
        "300",
    ]);
    assert_relative_eq!(f(&a, "chi_m"), 6.125e-3, max_relative = 1e-12);
    let b = json(&[
        "--magnetisation",
        "2.45e-7",
        "--field",
        "0.1",
        "--sample-mass",
        "20",
        "--molar-mass",
        "500",
        "--temp",
        "300",
        "--units",
        "si",
    ]);
    assert_relative_eq!(
        f(&b, "chi_m"),
        6.125e-3 * 4.0 * PI * 1e-6,
        max_relative = 1e-8
    );
    assert_relative_eq!(f(&b, "mu_eff"), f(&a, "mu_eff"), max_relative = 1e-8);
}

// A/E-term correction on the command line: Ni2+ oct, λ = −324, 10Dq = 8500 → 3.26 μB
// (μ = μ_so(1 − 4λ/10Dq), Figgis & Lewis 1960, from memory; the 3.26 computed here); 3.2 μB measured (Ashcroft &
// Mermin, Solid State Physics, 1976: 3.2 for Ni2+) agrees with the only spin state.
#[test]
fn comparison_with_spin_orbit_correction() {
    let v = json(&[
        "--mu-eff",
        "3.2",
        "--temp",
        "298",
        "--dn",
        "8",
        "--geometry",
        "oct",
        "--dq",
        "850",
        "--lambda",
        "-324",
    ]);
    let c = &v["comparison"];
    assert_eq!(c["states"].as_array().unwrap().len(), 1);
    assert_relative_eq!(
        f(&c["states"][0], "mu_spin_orbit_corrected"),
        3.26,
        epsilon = 0.006
    );
    assert_eq!(c["verdict"], "supports");
    // Fe(II) octahedral, 3.5 μB: between the LS (0) and HS (5.1–5.7) expectations.
    let v = json(&[
        "--mu-eff",
        "3.5",
        "--temp",
        "298",
        "--dn",
        "6",
        "--geometry",
        "oct",
    ]);
    assert_eq!(v["comparison"]["verdict"], "between-states");
    assert!(v["comparison"]["message"]
        .as_str()
        .unwrap()
        .contains("crossover"));
    // 8 μB for d5 is above every expectation.
    let v = json(&[
        "--mu-eff",
        "8",
        "--temp",
        "298",
        "--dn",
        "5",
        "--geometry",
        "oct",
    ]);
    assert_eq!(v["comparison"]["verdict"], "outside-expectations");
    assert!(v["comparison"]["message"]
        .as_str()
        .unwrap()
        .contains("weighing"));
}

#[test]
fn table_output() {
    spinstate()
        .args([
            "moment",
            "--chi",
            "1.4677e-2",
            "--temp",
            "298.15",
            "--formula",
            "[{Fe3+}({H2O})6]({NO3-})3",
        ])
        .assert()
        .success()
        .stdout(predicate::str::contains("μ_eff"))
        .stdout(predicate::str::contains("Pascal entry"))
        .stdout(predicate::str::contains("Safety:"));
}

fn fails(args: &[&str], message: &str) {
    spinstate()
        .arg("moment")
        .args(args)
        .assert()
        .code(2)
        .stderr(predicate::str::contains(message));
}

#[test]
fn bad_input_exits_2() {
    fails(&["--chi", "0.01", "--temp", "0"], "--temp 0 must be > 0 K");
    fails(&["--chi", "0.01", "--temp", "-4"], "must be > 0 K");
    fails(
        &["--mu-eff", "-1", "--temp", "300"],
        "--mu-eff -1 must be ≥ 0",
    );
    fails(
        &["--chi", "0.01", "--temp", "300", "--formula", "Zz2O"],
        "unknown element 'Zz'",
    );
    fails(
        &["--chi", "0.01", "--temp", "300", "--formula", "K4[Fe(CN)6]"],
        "{Fe2+} or {Fe3+}",
    );
    fails(&["--chi", "0.01", "--temp", "300", "--units", "mks"], "mks");
    fails(&["--temp", "300"], "required");
    fails(
        &["--chi", "0.01", "--mu-eff", "3", "--temp", "300"],
        "cannot be used with",
    );
    fails(
        &[
            "--magnetisation",
            "1e-4",
            "--field",
            "0",
            "--sample-mass",
            "20",
            "--molar-mass",
            "500",
            "--temp",
            "300",
        ],
        "--field 0 must be > 0 Oe",
    );
    fails(
        &[
            "--magnetisation",
            "1e-4",
            "--field",
            "1000",
            "--sample-mass",
            "20",
            "--temp",
            "300",
        ],
        "--formula or --molar-mass",
    );
    fails(
        &[
            "--mu-eff",
            "3",
            "--temp",
            "300",
            "--dn",
            "8",
            "--geometry",
            "oct",
            "--dq",
            "850",
            "--lambda",
            "324",
        ],
        "negative λ",
    );
    fails(
        &[
            "--mu-eff",
            "3",
            "--temp",
            "300",
            "--dn",
            "8",
            "--geometry",
            "hexagonal",
        ],
        "--geometry",
    );
}

#[test]
fn t_term_comparison_uses_the_full_ligand_field_moment() {
    // 4.95 μB for octahedral Co(II) at 295 K: above spin-only 3.87 but typical of the 4T1g
    // ground term (4.7–5.2 μB, Figgis & Lewis 1960, from memory); the full ligand field with
    // spin–orbit coupling gives a κ-bracket that contains it.
    let v = json(&[
        "--mu-eff",
        "4.95",
        "--temp",
        "295",
        "--metal",
        "Co",
        "--ox",
        "2",
        "--geometry",
        "oct",
        "--ligand",
        "H2O:6",
    ]);
    let states = v["comparison"]["states"].as_array().unwrap();
    let hs = &states[0];
    let a = hs["mu_ligand_field_kappa_07"].as_f64().unwrap();
    let b = hs["mu_ligand_field_kappa_10"].as_f64().unwrap();
    assert!(a < 4.95 && 4.95 < b, "{a}–{b}");
    assert!(v["comparison"]["message"]
        .as_str()
        .unwrap()
        .contains("high-spin"));
}
