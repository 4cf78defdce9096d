//! Integration tests of `spinstate structure`: the CIF and XYZ readers against an independent
//! crystallography library, the symmetry expansion, the shape and distortion measures on ideal
//! and analytically distorted polyhedra, the bond-length verdict, the comparison of two
//! structures and bad input.

use crate::common::{expect_usage_error, number, run, run_json};
use approx::assert_abs_diff_eq;
use nalgebra::Vector3;
use serde_json::Value;
use std::io::Write;

const HS: &str = "data/demo/demo_fe_hs_250K.cif";
const LS: &str = "data/demo/demo_fe_ls_100K.cif";
const TRICLINIC: &str = "tests/structures/triclinic_co.cif";

fn file(ext: &str, text: &str) -> tempfile::NamedTempFile {
    let mut f = tempfile::Builder::new().suffix(ext).tempfile().unwrap();
    f.write_all(text.as_bytes()).unwrap();
    f
}

fn xyz(atoms: &[(&str, Vector3<f64>)]) -> tempfile::NamedTempFile {
    let mut s = format!("{}\ntest\n", atoms.len());
    for (e, p) in atoms {
        s.push_str(&format!("{e} {:.10} {:.10} {:.10}\n", p.x, p.y, p.z));
    }
    file(".xyz", &s)
}

fn centre(v: &Value) -> &Value {
    &v["centres"][0]
}

fn distances(c: &Value) -> Vec<f64> {
    c["bonds"]
        .as_array()
        .unwrap()
        .iter()
        .map(|b| number(b, "distance"))
        .collect()
}

fn shape(c: &Value, name: &str) -> f64 {
    c["shapes"]
        .as_array()
        .unwrap()
        .iter()
        .find(|s| s["name"] == name)
        .map(|s| number(s, "measure"))
        .unwrap_or_else(|| panic!("no {name} in {c}"))
}

/// Metal–donor distances from the CIF reader against gemmi 0.7.5 (a general-purpose
/// crystallography library, `gemmi.read_small_structure`, all unit-cell sites and lattice
/// translations scanned, `Position.dist`), run once on these three CIFs of our own making; its
/// figures are stored here. Σ from gemmi's 15 L–M–L angles (the 12 smallest are the cis
/// angles, by the definition of McCusker et al., Inorg. Chem. 1996, 35, 2100): 24.15212°,
/// 79.99844°, 32.00056°.
#[test]
fn cif_distances_match_an_independent_library() {
    let cases: [(&str, [f64; 6], f64); 3] = [
        (
            TRICLINIC,
            [2.087774, 2.104918, 2.118010, 2.122954, 2.154814, 2.182841],
            24.15212,
        ),
        (
            HS,
            [2.170014, 2.170014, 2.190063, 2.190063, 2.210032, 2.210032],
            79.99844,
        ),
        (
            LS,
            [1.970016, 1.970016, 1.980058, 1.980058, 2.000041, 2.000041],
            32.00056,
        ),
    ];
    for (path, expected, sigma) in cases {
        let v = run_json(&["structure", path, "--json"]);
        let c = centre(&v);
        assert_eq!(c["coordination_number"], 6, "{path}");
        let d = distances(c);
        for (a, b) in d.iter().zip(expected) {
            assert_abs_diff_eq!(*a, b, epsilon = 2e-6);
        }
        assert_abs_diff_eq!(number(c, "sigma"), sigma, epsilon = 1e-4);
    }
}

/// A metal on an inversion centre (Wyckoff 2a of P2₁/c) with three donors in the asymmetric
/// unit: the operator −x,−y,−z generates the other three, so all six donors are found, in
/// trans pairs of equal length (common practice: the site symmetry −1 makes trans bonds equal).
#[test]
fn inversion_centre_gives_all_six_donors() {
    let v = run_json(&["structure", HS, "--json"]);
    let c = centre(&v);
    let bonds = c["bonds"].as_array().unwrap();
    assert_eq!(bonds.len(), 6);
    let images = bonds
        .iter()
        .filter(|b| b["donor"].as_str().unwrap().contains("-x,-y,-z"))
        .count();
    assert_eq!(images, 3);
    let d = distances(c);
    for pair in d.chunks(2) {
        assert_abs_diff_eq!(pair[0], pair[1], epsilon = 1e-9);
    }
}

fn octahedron(r: f64) -> Vec<(&'static str, Vector3<f64>)> {
    let mut a = vec![("Fe", Vector3::zeros())];
    for v in [
        Vector3::x(),
        -Vector3::x(),
        Vector3::y(),
        -Vector3::y(),
        Vector3::z(),
        -Vector3::z(),
    ] {
        a.push(("N", v * r));
    }
    a
}

/// Ideal polyhedra: shape measure 0 against their own shape (Pinsky & Avnir, Inorg. Chem.
/// 1998, 37, 5575) and Σ = Θ = ζ = 0 for the regular octahedron (McCusker et al. 1996;
/// Marchivie et al., Acta Cryst. B 2005, 61, 25).
#[test]
fn ideal_polyhedra_measure_zero() {
    let f = xyz(&octahedron(2.0));
    let v = run_json(&["structure", f.path().to_str().unwrap(), "--json"]);
    let c = centre(&v);
    assert_abs_diff_eq!(shape(c, "octahedron"), 0.0, epsilon = 1e-9);
    assert!(shape(c, "trigonal-prism") > 10.0);
    assert_abs_diff_eq!(number(c, "sigma"), 0.0, epsilon = 1e-9);
    assert_abs_diff_eq!(number(c, "theta"), 0.0, epsilon = 1e-9);
    assert_abs_diff_eq!(number(c, "zeta"), 0.0, epsilon = 1e-12);
    assert_eq!(c["best_shape"], "octahedron");
    let s3 = 3f64.sqrt();
    let shapes: [(&str, Vec<Vector3<f64>>); 4] = [
        (
            "tetrahedron",
            vec![
                Vector3::new(1.0, 1.0, 1.0) / s3,
                Vector3::new(1.0, -1.0, -1.0) / s3,
                Vector3::new(-1.0, 1.0, -1.0) / s3,
                Vector3::new(-1.0, -1.0, 1.0) / s3,
            ],
        ),
        (
            "square-plane",
            vec![Vector3::x(), -Vector3::x(), Vector3::y(), -Vector3::y()],
        ),
        (
            "square-pyramid",
            vec![
                Vector3::z(),
                Vector3::x(),
                -Vector3::x(),
                Vector3::y(),
                -Vector3::y(),
            ],
        ),
        (
            "trigonal-bipyramid",
            vec![
                Vector3::z(),
                -Vector3::z(),
                Vector3::x(),
                Vector3::new(-0.5, s3 / 2.0, 0.0),
                Vector3::new(-0.5, -s3 / 2.0, 0.0),
            ],
        ),
    ];
    for (name, vertices) in shapes {
        let m = Vector3::new(0.3, -0.2, 0.1);
        let mut atoms = vec![("Ni", m)];
        atoms.extend(vertices.iter().map(|v| ("N", m + 1.95 * v)));
        let f = xyz(&atoms);
        let v = run_json(&["structure", f.path().to_str().unwrap(), "--json"]);
        let c = centre(&v);
        assert_abs_diff_eq!(shape(c, name), 0.0, epsilon = 1e-9);
        assert_eq!(c["best_shape"], name);
        assert!(c["sigma"].is_null(), "Σ is for six-coordinate centres only");
    }
}

/// Analytic Σ for two distortions, from the definition Σ = Σ|90° − φ| over the 12 cis angles
/// (McCusker et al. 1996):
/// - the ±z donors tilted together by α in the xz plane: four cis angles become 90° ± α, so
///   Σ = 4α;
/// - a trigonal (D3d) elongation, donors at polar angle β from the threefold axis: the six
///   angles within the two faces are φ with cos φ = cos²β − ½ sin²β (spherical law of cosines
///   for azimuths 120° apart), the six between faces 180° − φ, so Σ = 12|90° − φ|.
#[test]
fn known_distortions_give_the_analytic_sigma() {
    for alpha in [3.0f64, 7.5, 12.0] {
        let mut atoms = octahedron(2.0);
        let a = alpha.to_radians();
        atoms[5].1 = Vector3::new(a.sin(), 0.0, a.cos()) * 2.0;
        atoms[6].1 = -atoms[5].1;
        let f = xyz(&atoms);
        let v = run_json(&["structure", f.path().to_str().unwrap(), "--json"]);
        assert_abs_diff_eq!(number(centre(&v), "sigma"), 4.0 * alpha, epsilon = 1e-7);
    }
    for beta in [50.0f64, 54.7356, 60.0] {
        let b = beta.to_radians();
        let mut atoms = vec![("Co", Vector3::zeros())];
        for k in 0..3 {
            let phi = (120.0 * k as f64).to_radians();
            let up = Vector3::new(b.sin() * phi.cos(), b.sin() * phi.sin(), b.cos()) * 2.1;
            atoms.push(("O", up));
            atoms.push(("O", -up));
        }
        let f = xyz(&atoms);
        let v = run_json(&["structure", f.path().to_str().unwrap(), "--json"]);
        let cos_phi = b.cos().powi(2) - 0.5 * b.sin().powi(2);
        let expected = 12.0 * (90.0 - cos_phi.acos().to_degrees()).abs();
        assert_abs_diff_eq!(number(centre(&v), "sigma"), expected, epsilon = 1e-6);
    }
}

/// The demo's two forms: Fe(II)–N 2.19 Å reads high-spin and 1.98 Å low-spin against the
/// ranges of data/bond_lengths.csv (Gütlich & Goodwin 2004; IUPAC Gold Book, "spin
/// crossover"); the comparison reports Δr ≈ −0.21 Å, ΔΣ = −48° and the switch.
#[test]
fn variable_temperature_pair_is_compared() {
    let v = run_json(&["structure", HS, LS, "--ox", "2", "--json"]);
    let c = v["centres"].as_array().unwrap();
    assert_eq!(c.len(), 2);
    assert_eq!(c[0]["spin_state_from_bonds"], "high-spin");
    assert_eq!(c[1]["spin_state_from_bonds"], "low-spin");
    let ch = &v["changes"][0];
    assert_eq!(ch["switched"], true);
    assert_abs_diff_eq!(number(ch, "delta_r"), 1.98337 - 2.19004, epsilon = 1e-4);
    assert_abs_diff_eq!(number(ch, "delta_sigma"), 32.0006 - 79.9984, epsilon = 1e-3);
    // Without --ox no reference range applies.
    let v = run_json(&["structure", HS, "--json"]);
    assert_eq!(centre(&v)["spin_state_from_bonds"], "none");
    for key in [
        "metal",
        "index",
        "coordination_number",
        "bonds",
        "mean_distance",
        "sigma",
        "theta",
        "zeta",
        "shapes",
        "best_shape",
        "spin_state_from_bonds",
    ] {
        assert!(centre(&v).get(key).is_some(), "JSON field {key} missing");
    }
}

#[test]
fn table_output_names_the_centre() {
    let (code, out, err) = run(&["structure", TRICLINIC]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("Co1 (atom 1), 6-coordinate"), "{out}");
    assert!(out.contains("Σ 24.2°"), "{out}");
}

const CELL: &str = "_cell_length_a 10\n_cell_length_b 10\n_cell_length_c 10\n_cell_angle_alpha 90\n_cell_angle_beta 90\n_cell_angle_gamma 90\n";

fn cif(body: &str) -> tempfile::NamedTempFile {
    file(".cif", &format!("data_t\n{body}"))
}

const SITES: &str =
    "loop_\n_atom_site_label\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n";

/// Two iron centres, each with one nitrogen donor.
const TWO_METALS: &str = "4\ntest\nFe 0 0 0\nN 2 0 0\nFe 6 0 0\nN 8 0 0\n";

#[test]
fn bad_input_is_explained() {
    // (file extension, file text, options after the file, a fragment the one-line error must
    // contain).
    let cases: [(&str, String, &[&str], &str); 9] = [
        (
            ".xyz",
            "2\nc\nFe 0 0 0\nN 2.0 zero 0\n".into(),
            &[],
            "XYZ line 4",
        ),
        (
            ".xyz",
            "2\nc\nC 0 0 0\nN 1.4 0 0\n".into(),
            &[],
            "no d-block metal",
        ),
        (
            ".xyz",
            "3\nc\nFe 0 0 0\nN 2.0 0 0\nN 2.1 0 0\n".into(),
            &[],
            "on top of each other",
        ),
        (
            ".cif",
            format!("data_t\n{SITES}Fe1 0 0 0\nN1 0.2 0 0\n"),
            &[],
            "has no cell",
        ),
        (
            ".cif",
            format!("data_t\n{CELL}{SITES}Fe1 0 0 0\nN1 0.2 0\n"),
            &[],
            "CIF line 14",
        ),
        (".pdb", "x".into(), &[], ".cif"),
        // Two metals: a label that is not a metal is refused.
        (".xyz", TWO_METALS.into(), &["--metal-label", "Fe9"], "Fe1"),
        (
            ".xyz",
            TWO_METALS.into(),
            &["--metal-index", "2"],
            "--metal-index",
        ),
        (".xyz", TWO_METALS.into(), &["--cutoff", "9"], "--cutoff"),
    ];
    for (ext, text, options, needle) in &cases {
        let f = file(ext, text);
        let mut args = vec!["structure", f.path().to_str().unwrap()];
        args.extend_from_slice(options);
        expect_usage_error(&args, needle);
    }
    // Both metals of the two-metal file are reported.
    let f = file(".xyz", TWO_METALS);
    let v = run_json(&["structure", f.path().to_str().unwrap(), "--json"]);
    assert_eq!(v["centres"].as_array().unwrap().len(), 2);
}

#[test]
fn disorder_keeps_the_major_part_and_partial_occupancy_is_noted() {
    let body = format!(
        "{CELL}loop_\n_atom_site_label\n_atom_site_fract_x\n_atom_site_fract_y\n_atom_site_fract_z\n_atom_site_occupancy\n_atom_site_disorder_group\n\
Fe1 0.5 0.5 0.5 1 .\nN1 0.7 0.5 0.5 1 .\nN2 0.3 0.5 0.5 1 .\nO1A 0.5 0.7 0.5 0.7 1\nO1B 0.5 0.71 0.52 0.3 2\nCl1 0.5 0.5 0.9 0.5 .\n"
    );
    let f = cif(&body);
    let (code, out, err) = run(&["structure", f.path().to_str().unwrap(), "--json"]);
    assert_eq!(code, 0, "{err}");
    let v: Value = serde_json::from_str(&out).unwrap();
    let notes = v["notes"].to_string();
    assert!(notes.contains("major part (group 1"), "{notes}");
    assert!(notes.contains("O1B"), "{notes}");
    assert!(
        notes.contains("partial occupancies") && notes.contains("Cl1 (0.50)"),
        "{notes}"
    );
    let donors: Vec<&str> = centre(&v)["bonds"]
        .as_array()
        .unwrap()
        .iter()
        .map(|b| b["donor"].as_str().unwrap())
        .collect();
    assert!(
        donors.contains(&"O1A") && !donors.contains(&"O1B"),
        "{donors:?}"
    );
    assert!(err.contains("note:"), "{err}");
}
