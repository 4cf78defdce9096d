//! Property-based fuzzing of every parser and entry point that reads user text: each must
//! return a value or a one-line error for any input, never panic, and never hand out a
//! non-finite number.
//!
//! Inputs come from three generators per target: arbitrary Unicode text, text over the
//! parser's own alphabet, and random edits (insertions, deletions, replacements, truncation) of
//! a valid example. The number of cases per property is proptest's default (256) in the normal
//! suite; a long round is `PROPTEST_CASES=1000000 cargo test --release --test cli fuzz::` (see the
//! manual section on guarantees, src/manual.md).

use proptest::prelude::*;
use spinstate::engine::Geometry;
use spinstate::formula::Formula;
use spinstate::screen::{Filters, IonSpec, Screen, Target};
use spinstate::spectra::units::parse_bands;
use spinstate::spectra::EnergyUnit;
use spinstate::tables::{DataSet, Table};

/// An error's message is one line and says something.
fn one_line(e: &spinstate::Error) -> Result<(), TestCaseError> {
    let text = e.to_string();
    prop_assert!(!text.trim().is_empty(), "empty message");
    prop_assert!(!text.contains('\n'), "message on several lines: {text:?}");
    Ok(())
}

/// Random edits of a valid example: each (position, choice, character) inserts, deletes or
/// replaces one character; the text may also be cut short.
fn mutated(seed: &'static str) -> impl Strategy<Value = String> {
    let alphabet = prop_oneof![
        Just(','),
        Just('"'),
        Just('\n'),
        Just('\r'),
        Just(':'),
        Just('-'),
        Just('.'),
        Just('e'),
        Just('('),
        Just(')'),
        Just(' '),
        Just('#'),
        Just('\u{feff}'),
        Just('\u{ff11}'),
        any::<char>(),
        proptest::char::range('0', '9'),
    ];
    (
        proptest::collection::vec((any::<usize>(), 0u8..3, alphabet), 0..12),
        proptest::option::of(any::<usize>()),
    )
        .prop_map(move |(edits, cut)| {
            let mut chars: Vec<char> = seed.chars().collect();
            for (pos, kind, c) in edits {
                let n = chars.len();
                match kind {
                    0 => chars.insert(pos % (n + 1), c),
                    1 if n > 0 => {
                        chars.remove(pos % n);
                    }
                    _ if n > 0 => chars[pos % n] = c,
                    _ => chars.push(c),
                }
            }
            if let Some(cut) = cut {
                let n = chars.len();
                chars.truncate(cut % (n + 1));
            }
            chars.into_iter().collect()
        })
}

/// Arbitrary text, text over `alphabet` (a regex class), or edits of `seed`.
fn inputs(alphabet: &'static str, seed: &'static str) -> impl Strategy<Value = String> {
    prop_oneof![
        any::<String>(),
        proptest::string::string_regex(alphabet).expect("valid regex"),
        mutated(seed),
    ]
}

const SAMPLES: &str = include_str!("../../data/demo/samples.csv");
const CURVE: &str = include_str!("../../data/demo/sco_curve.csv");
const EVANS_SERIES: &str = include_str!("../../data/demo/sco_evans.csv");
const CIF: &str = include_str!("../structures/triclinic_co.cif");
const XYZ: &str = "7\nan invented FeN6 centre\nFe 0 0 0\nN 2.0 0 0\nN -2.0 0 0\nN 0 2.0 0\nN 0 -2.0 0\nN 0 0 2.0\nN 0 0 -2.0\n";
const LIGANDS: &str = include_str!("../../data/ligands.csv");
const IONS: &str = include_str!("../../data/ions.csv");
const BOND_LENGTHS: &str = include_str!("../../data/bond_lengths.csv");
const PASCAL: &str = include_str!("../../data/pascal.csv");
const MOMENT_RANGES: &str = include_str!("../../data/moment_ranges.csv");
const RADII: &str = include_str!("../../data/covalent_radii.csv");
const CANDIDATES: &str = "name,ligands\nA,NCS:2 py:4\nB,bpy:3\nC,H2O:6\n";

proptest! {
    #[test]
    fn molecular_formula(text in inputs("[A-Za-z0-9()\\[\\]{}·.*+ -]{0,40}", "[Fe(NCS)2(C5H5N)4]·2H2O")) {
        match Formula::parse(&text) {
            Ok(f) => prop_assert!(f.molar_mass().is_finite()),
            Err(e) => one_line(&e)?,
        }
    }

    #[test]
    fn ligand_spec(text in inputs("[A-Za-z0-9:() -]{0,20}", "NCS:2")) {
        if let Err(e) = text.parse::<spinstate::complex::LigandCount>() {
            one_line(&e)?;
        }
    }

    #[test]
    fn band_list_with_units(
        text in inputs("[0-9., eE+-]{0,40}", "17400, 24600,37800"),
        unit in prop_oneof![Just("cm-1"), Just("nm"), Just("kK"), Just("eV"), Just("ev"), Just("µm"), Just("")],
    ) {
        match unit.parse::<EnergyUnit>() {
            Ok(u) => match parse_bands(&text, u) {
                Ok(bands) => prop_assert!(bands.iter().all(|b| b.is_finite() && *b > 0.0)),
                Err(e) => one_line(&e)?,
            },
            Err(e) => one_line(&e)?,
        }
    }

    #[test]
    fn susceptibility_units(text in inputs("[a-zA-Z -]{0,12}", "cgs")) {
        if let Err(e) = text.parse::<spinstate::units::SusceptibilityUnits>() {
            one_line(&e)?;
        }
    }

    #[test]
    fn batch_check_rows(text in inputs("[A-Za-z0-9,.:\" \n-]{0,200}", SAMPLES)) {
        match spinstate::check::batch::parse(&text) {
            Ok(rows) => {
                for row in rows {
                    if let Err(e) = row {
                        prop_assert!(!e.message.contains('\n'), "{:?}", e.message);
                    }
                }
            }
            Err(e) => one_line(&e)?,
        }
    }

    #[test]
    fn screen_candidate_rows(text in inputs("[A-Za-z0-9,:\" \n#-]{0,120}", CANDIDATES)) {
        let tables = DataSet::bundled();
        let ions = [IonSpec { metal: "Fe".into(), oxidation_state: 2 }];
        match Screen::from_candidates(tables, &ions, Geometry::Octahedral, &text, &Filters::default(), Target::Crossover) {
            Ok((screen, errors)) => {
                for e in errors {
                    prop_assert!(!e.message.contains('\n'), "{:?}", e.message);
                }
                drop(screen);
            }
            Err(e) => one_line(&e)?,
        }
    }

    #[test]
    fn magnetometer_curve(text in inputs("[A-Za-z0-9,._\n#-]{0,200}", CURVE)) {
        match spinstate::sco::data::read_curve(&text, -2.5e-4) {
            Ok(c) => prop_assert!(c.points.iter().all(|p| p.t.is_finite() && p.chi_t.is_finite())),
            Err(e) => one_line(&e)?,
        }
    }

    #[test]
    fn evans_series(text in inputs("[A-Za-z0-9,._\n#-]{0,200}", EVANS_SERIES)) {
        let opts = spinstate::sco::data::EvansSeries {
            magnet: spinstate::measured::evans::MagnetGeometry::Solenoid,
            dia: -2.5e-4,
            chi0: None,
        };
        match spinstate::sco::data::read_evans_series(&text, &opts) {
            Ok(c) => prop_assert!(c.points.iter().all(|p| p.t.is_finite() && p.chi_t.is_finite())),
            Err(e) => one_line(&e)?,
        }
    }

    #[test]
    fn cif_structures(text in inputs("[A-Za-z0-9_.,'() \n-]{0,300}", CIF)) {
        structure(&text, "fuzz.cif")?;
    }

    #[test]
    fn xyz_structures(text in inputs("[A-Za-z0-9. \n-]{0,200}", XYZ)) {
        structure(&text, "fuzz.xyz")?;
    }

    #[test]
    fn ligand_and_ion_tables(
        ligands in mutated(LIGANDS),
        ions in mutated(IONS),
    ) {
        match spinstate::tables::ligands::LigandTable::parse(&ligands) {
            Ok(t) => {
                if let Err(e) = spinstate::tables::reported::ReportedTable::parse_with(
                    include_str!("../../data/reported_spin_states.csv"),
                    &t,
                ) {
                    one_line(&e)?;
                }
            }
            Err(e) => one_line(&e)?,
        }
        if let Err(e) = spinstate::tables::ions::IonTable::parse(&ions) {
            one_line(&e)?;
        }
    }

    #[test]
    fn other_data_tables(
        bonds in mutated(BOND_LENGTHS),
        pascal in mutated(PASCAL),
        ranges in mutated(MOMENT_RANGES),
        radii in mutated(RADII),
    ) {
        if let Err(e) = spinstate::tables::bond_lengths::BondLengthTable::parse(&bonds) {
            one_line(&e)?;
        }
        if let Err(e) = spinstate::tables::pascal::PascalTable::parse(&pascal) {
            one_line(&e)?;
        }
        if let Err(e) = spinstate::tables::moment_ranges::MomentRangeTable::parse(&ranges) {
            one_line(&e)?;
        }
        if let Err(e) = spinstate::tables::covalent_radii::CovalentRadii::parse(&radii) {
            one_line(&e)?;
        }
    }
}

/// Reads a structure and analyses every metal centre it finds, as `spinstate structure` does.
fn structure(text: &str, name: &str) -> Result<(), TestCaseError> {
    use spinstate::structure::centre::analyse;
    use spinstate::structure::sphere::{sphere, Cutoff};
    use spinstate::structure::MetalChoice;
    let s = match spinstate::structure::read(text, name) {
        Ok(s) => s,
        Err(e) => return one_line(&e),
    };
    let radii = DataSet::bundled().covalent_radii().unwrap();
    let table = DataSet::bundled().bond_lengths().unwrap();
    let metals = match s.select_metals(&MetalChoice::All) {
        Ok(m) => m,
        Err(e) => return one_line(&e),
    };
    for m in metals {
        match sphere(&s, m, radii, Cutoff::CovalentRadii) {
            Ok(sp) => {
                let c = analyse(&s, &sp, None, table);
                drop(c);
            }
            Err(e) => one_line(&e)?,
        }
    }
    Ok(())
}
