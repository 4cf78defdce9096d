//! `data/ions.csv`: free-ion parameters of d-block metal ions.
//!
//! Columns (units in cm⁻¹ unless said): `symbol`, `oxidation_state`, `b0` and `c0` (free-ion
//! Racah B and C), `zeta` (one-electron spin–orbit constant ζ), `g` (Jørgensen's metal factor,
//! Δo = f·g), `k` (Jørgensen's nephelauxetic metal factor, dimensionless, β = 1 − h·k),
//! `g_state` (`hs`, `ls` or `any`: the spin state of the complexes g was measured on),
//! `delta_r` (Å, the mean metal–donor bond lengthening from the low- to the high-spin state),
//! `provenance` (space-separated `key=kind` items saying how b0, c0, g, zeta and k were
//! obtained: `printed`, `derived`, `assumed`, `rule` or `none`), `caution` (a short handling
//! caution, may be empty) and `source`. Empty cells mean "no value".
//!
//! The d-electron count is not stored: it is the element's group number minus the oxidation
//! state (d block, groups 3–12), with the group taken from the `mendeleev` crate.

use super::{Record, Table};
use crate::error::{closest_names, Error, Result};
use crate::param::Param;
use mendeleev::Element;

const HEADER: [&str; 12] = [
    "symbol",
    "oxidation_state",
    "b0",
    "c0",
    "zeta",
    "g",
    "k",
    "g_state",
    "delta_r",
    "provenance",
    "caution",
    "source",
];

/// Transition series of a d-block element.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum TransitionSeries {
    /// 3d (period 4, Sc–Zn).
    ThreeD,
    /// 4d (period 5, Y–Cd).
    FourD,
    /// 5d (period 6, La/Lu–Hg).
    FiveD,
}

impl TransitionSeries {
    /// "3d", "4d" or "5d".
    pub fn name(self) -> &'static str {
        match self {
            TransitionSeries::ThreeD => "3d",
            TransitionSeries::FourD => "4d",
            TransitionSeries::FiveD => "5d",
        }
    }
}

/// The spin state of the complexes on which an ion's metal factor g was measured. The estimate
/// takes g·f as the Δ of that state's geometry and scales it to the other state's bond length.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum ReferenceState {
    /// g comes from high-spin complexes (e.g. Fe²⁺ from [Fe(H₂O)₆]²⁺).
    HighSpin,
    /// g comes from low-spin complexes (e.g. Co³⁺ from [Co(NH₃)₆]³⁺, 4d and 5d ions).
    LowSpin,
    /// The d^n has no spin choice in octahedra (d¹–d³, d⁸, d⁹), so the question does not arise.
    Any,
}

impl ReferenceState {
    /// The CSV spelling: "hs", "ls" or "any".
    pub fn name(self) -> &'static str {
        match self {
            ReferenceState::HighSpin => "hs",
            ReferenceState::LowSpin => "ls",
            ReferenceState::Any => "any",
        }
    }
}

/// How one of an ion's parameters was obtained (the `provenance` column).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Provenance {
    /// Printed in the named table.
    Printed,
    /// Derived from a named published Δ, band fit or β.
    Derived,
    /// An assumed typical value (no published value for this ion).
    Assumed,
    /// From a stated rule (e.g. the 4d/3d ratio of Δ).
    Rule,
    /// No value.
    None,
}

impl Provenance {
    /// The CSV spelling.
    pub fn name(self) -> &'static str {
        match self {
            Provenance::Printed => "printed",
            Provenance::Derived => "derived",
            Provenance::Assumed => "assumed",
            Provenance::Rule => "rule",
            Provenance::None => "none",
        }
    }

    fn parse(s: &str) -> Option<Provenance> {
        Some(match s {
            "printed" => Provenance::Printed,
            "derived" => Provenance::Derived,
            "assumed" => Provenance::Assumed,
            "rule" => Provenance::Rule,
            "none" => Provenance::None,
            _ => return None,
        })
    }
}

/// Keys of the `provenance` column.
pub const PROVENANCE_KEYS: [&str; 5] = ["b0", "c0", "g", "zeta", "k"];

/// One metal ion.
#[derive(Debug, Clone, PartialEq)]
pub struct Ion {
    /// Element symbol, e.g. "Fe".
    pub symbol: String,
    /// Formal oxidation state.
    pub oxidation_state: i32,
    /// Number of d electrons (group − oxidation state), 0..=10.
    pub dn: usize,
    /// Transition series.
    pub series: TransitionSeries,
    /// Free-ion Racah B₀ (cm⁻¹).
    pub b0: Option<f64>,
    /// Free-ion Racah C₀ (cm⁻¹).
    pub c0: Option<f64>,
    /// One-electron spin–orbit coupling constant ζ (cm⁻¹).
    pub zeta: Option<f64>,
    /// Jørgensen's metal factor g (cm⁻¹): Δo = f(ligand)·g(metal).
    pub g: Option<f64>,
    /// Jørgensen's nephelauxetic metal factor k: β = 1 − h(ligand)·k(metal).
    pub k: Option<f64>,
    /// Spin state of the complexes g was measured on.
    pub g_state: ReferenceState,
    /// Published mean M–L lengthening from the low- to the high-spin state (Å), if known.
    pub delta_r: Option<f64>,
    /// How each of b0, c0, g, zeta, k was obtained (keys of [`PROVENANCE_KEYS`]).
    pub provenance: Vec<(String, Provenance)>,
    /// Handling caution for this metal (short; defer to local rules and the SDS).
    pub caution: Option<String>,
    /// Where the values come from, with their tags.
    pub source: String,
}

impl Ion {
    /// How the parameter `key` (one of [`PROVENANCE_KEYS`]) was obtained; `Printed` when the
    /// row says nothing about a value it has, `None` when it has no value.
    pub fn provenance_of(&self, key: &str) -> Provenance {
        if let Some((_, p)) = self.provenance.iter().find(|(k, _)| k == key) {
            return *p;
        }
        let present = match key {
            "b0" => self.b0.is_some(),
            "c0" => self.c0.is_some(),
            "g" => self.g.is_some(),
            "zeta" => self.zeta.is_some(),
            "k" => self.k.is_some(),
            _ => false,
        };
        if present {
            Provenance::Printed
        } else {
            Provenance::None
        }
    }

    /// Name with the oxidation state in Roman numerals, e.g. "Fe(II)".
    pub fn name(&self) -> String {
        format!("{}({})", self.symbol, roman(self.oxidation_state))
    }
}

/// Roman numeral of an oxidation state (0 → "0", negative → "−I" …).
pub fn roman(n: i32) -> String {
    if n == 0 {
        return "0".into();
    }
    const DIGITS: [(i32, &str); 5] = [(10, "X"), (9, "IX"), (5, "V"), (4, "IV"), (1, "I")];
    let mut rest = n.abs();
    let mut s = String::from(if n < 0 { "−" } else { "" });
    for (v, d) in DIGITS {
        while rest >= v {
            s.push_str(d);
            rest -= v;
        }
    }
    s
}

/// The ion table.
#[derive(Debug, Clone, PartialEq)]
pub struct IonTable {
    pub rows: Vec<Ion>,
}

/// The d-block element with this symbol (exact case, e.g. "Fe").
fn element(symbol: &str) -> Option<Element> {
    Element::iter().find(|e| e.symbol() == symbol)
}

/// Number of d electrons of a d-block element in an oxidation state: group − oxidation state.
pub fn d_electron_count(symbol: &str, oxidation_state: i32) -> Result<(usize, TransitionSeries)> {
    let el = element(symbol).ok_or_else(|| Error::Unknown {
        kind: crate::error::NameKind::Element,
        name: symbol.into(),
        suggestions: closest_names(symbol, Element::iter().map(|e| e.symbol())),
    })?;
    let group = el.group().map(|g| g.group_number() as i32);
    let series = match el.period() {
        4 => Some(TransitionSeries::ThreeD),
        5 => Some(TransitionSeries::FourD),
        6 => Some(TransitionSeries::FiveD),
        _ => None,
    };
    match (group, series) {
        (Some(g @ 3..=12), Some(series)) => {
            let dn = g - oxidation_state;
            if (0..=10).contains(&dn) {
                Ok((dn as usize, series))
            } else {
                Err(Error::invalid(
                    Param::OxidationState(symbol.to_string()),
                    oxidation_state,
                    format!("{}..={} (0 to 10 d electrons for group {g})", g - 10, g),
                ))
            }
        }
        _ => Err(Error::invalid(
            Param::Metal,
            symbol,
            "a d-block element of groups 3–12 in periods 4–6 (Sc–Zn, Y–Cd, La/Hf–Hg)",
        )),
    }
}

impl Table for IonTable {
    const FILE: &'static str = "ions.csv";
    const HEADER: &'static [&'static str] = &HEADER;
    const BUNDLED: &'static str = include_str!("../../data/ions.csv");
    type Row = Ion;
    type Context = ();

    fn row(record: &Record<'_>, _: &(), rows: &[Ion]) -> Result<Ion> {
        let cell = |c| record.cell(c);
        let symbol = cell("symbol").required()?;
        let ox_cell = cell("oxidation_state");
        let oxidation_state = ox_cell.int(-4..=9)?;
        let (dn, series) =
            d_electron_count(&symbol, oxidation_state).map_err(|e| cell("symbol").error(e))?;
        let ion = Ion {
            dn,
            series,
            b0: cell("b0").optional_number(200.0..=2000.0, " cm⁻¹")?,
            c0: cell("c0").optional_number(500.0..=10000.0, " cm⁻¹")?,
            zeta: cell("zeta").optional_number(10.0..=10000.0, " cm⁻¹")?,
            g: cell("g").optional_number(1000.0..=60000.0, " cm⁻¹")?,
            k: cell("k").optional_number(0.0..=1.0, "")?,
            g_state: cell("g_state").one_of(&[
                ("hs", ReferenceState::HighSpin),
                ("ls", ReferenceState::LowSpin),
                ("any", ReferenceState::Any),
            ])?,
            delta_r: cell("delta_r").optional_number(0.0..=0.4, " Å")?,
            provenance: {
                let c = cell("provenance");
                let mut items = Vec::new();
                for item in c.text().split_whitespace() {
                    let parsed = item.split_once('=').and_then(|(k, v)| {
                        PROVENANCE_KEYS
                            .contains(&k)
                            .then_some(k)
                            .zip(Provenance::parse(v))
                    });
                    match parsed {
                        Some((k, p)) => items.push((k.to_string(), p)),
                        None => {
                            return Err(c.error(format!(
                                "'{item}' is not KEY=KIND with KEY one of {} and KIND one of printed, derived, assumed, rule, none",
                                PROVENANCE_KEYS.join(", ")
                            )))
                        }
                    }
                }
                items
            },
            caution: cell("caution").optional(),
            source: cell("source").source()?,
            symbol,
            oxidation_state,
        };
        if let (Some(b0), Some(c0)) = (ion.b0, ion.c0) {
            if !(2.0..=8.0).contains(&(c0 / b0)) {
                return Err(cell("c0").error(format!(
                    "C0/B0 = {:.2} is outside the sensible range 2..=8",
                    c0 / b0
                )));
            }
        }
        if rows
            .iter()
            .any(|r| r.symbol == ion.symbol && r.oxidation_state == ion.oxidation_state)
        {
            return Err(ox_cell.error(format!("{} appears twice", ion.name())));
        }
        Ok(ion)
    }

    fn from_rows(rows: Vec<Ion>) -> Self {
        IonTable { rows }
    }
}

impl IonTable {
    /// Metal symbols in table order, each once.
    pub fn metals(&self) -> Vec<&str> {
        let mut out: Vec<&str> = Vec::new();
        for r in &self.rows {
            if !out.contains(&r.symbol.as_str()) {
                out.push(&r.symbol);
            }
        }
        out
    }

    /// The oxidation states listed for a metal (exact symbol), in table order.
    pub fn oxidation_states(&self, symbol: &str) -> Vec<i32> {
        self.rows
            .iter()
            .filter(|r| r.symbol == symbol)
            .map(|r| r.oxidation_state)
            .collect()
    }

    /// The ion of `metal` (symbol, any case: "fe", "FE") in `oxidation_state`. Errors name the
    /// closest metals, or list the oxidation states known for the metal.
    pub fn find(&self, metal: &str, oxidation_state: i32) -> Result<&Ion> {
        let key = metal.trim();
        let symbol = self
            .metals()
            .into_iter()
            .find(|s| s.eq_ignore_ascii_case(key))
            .ok_or_else(|| Error::Unknown {
                kind: crate::error::NameKind::Metal,
                name: key.to_string(),
                suggestions: closest_names(key, self.metals()),
            })?;
        self.rows
            .iter()
            .find(|r| r.symbol == symbol && r.oxidation_state == oxidation_state)
            .ok_or_else(|| {
                let known: Vec<String> = self
                    .oxidation_states(symbol)
                    .iter()
                    .map(|o| o.to_string())
                    .collect();
                Error::invalid(
                    Param::OxidationState(symbol.to_string()),
                    oxidation_state,
                    format!("one of {} (the states in ions.csv)", known.join(", ")),
                )
            })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn bundled() -> IonTable {
        IonTable::parse(IonTable::BUNDLED).unwrap()
    }

    /// d-electron counts from group − oxidation state; the expected values are common practice
    /// (e.g. Fe(II) d6, Co(III) d6, Cu(II) d9, Pt(II) d8).
    #[test]
    fn d_counts_follow_the_group() {
        let t = bundled();
        for (m, ox, dn) in [
            ("Fe", 2, 6),
            ("Fe", 3, 5),
            ("Co", 3, 6),
            ("Cu", 2, 9),
            ("Cr", 3, 3),
            ("Zn", 2, 10),
            ("Sc", 3, 0),
            ("Pt", 2, 8),
            ("Rh", 3, 6),
            ("Au", 3, 8),
        ] {
            assert_eq!(t.find(m, ox).unwrap().dn, dn, "{m}({ox})");
        }
        assert_eq!(t.find("Pt", 2).unwrap().series, TransitionSeries::FiveD);
        assert_eq!(t.find("Ru", 2).unwrap().series, TransitionSeries::FourD);
    }

    /// Table self-test: every row has a source, 3d B0 come from one table (Jolly 1989), and
    /// every ion with B0 lies in the 3d range of that table or the assumed 4d/5d value.
    #[test]
    fn every_row_is_sourced_and_sensible() {
        let t = bundled();
        assert!(t.rows.len() >= 40);
        for r in &t.rows {
            assert!(r.source.len() > 10, "{}: source too short", r.name());
            if let Some(b0) = r.b0 {
                if r.series == TransitionSeries::ThreeD {
                    assert!(
                        r.source.contains("Jolly"),
                        "{}: B0 not from Jolly",
                        r.name()
                    );
                    match r.provenance_of("b0") {
                        // Printed: inside Jolly's table.
                        Provenance::Printed => {
                            assert!((690.0..=1120.0).contains(&b0), "{}: B0 {b0}", r.name())
                        }
                        // Extrapolated in charge from it: a wider range, said so.
                        _ => {
                            assert!((400.0..=1350.0).contains(&b0), "{}: B0 {b0}", r.name());
                            assert!(r.source.contains("rule"), "{}", r.name());
                        }
                    }
                } else {
                    assert!(r.source.contains("assumed"), "{}", r.name());
                }
            }
            assert!(r.g.is_none() || r.source.contains("g"));
            // d0 and d10 ions have no d–d parameters.
            if r.dn == 0 || r.dn == 10 {
                assert!(r.b0.is_none() && r.g.is_none(), "{}", r.name());
            }
        }
        // The 3d metals Sc–Zn and the 4d/5d metals asked for are all present.
        let metals = t.metals();
        for m in [
            "Sc", "Ti", "V", "Cr", "Mn", "Fe", "Co", "Ni", "Cu", "Zn", "Mo", "Ru", "Rh", "Pd",
            "Ag", "W", "Re", "Os", "Ir", "Pt", "Au",
        ] {
            assert!(metals.contains(&m), "{m} missing");
        }
    }

    /// Jolly 1989 free-ion B0 values (W. L. Jolly, Modern Inorganic Chemistry, 1989, p. 411, as
    /// reproduced): Ni2+ 1030, Co2+ 971, Fe2+ 917, Mn2+ 860, Cr3+ 918.
    #[test]
    fn b0_values_are_the_jolly_set() {
        let t = bundled();
        for (m, ox, b0) in [
            ("Ni", 2, 1030.0),
            ("Co", 2, 971.0),
            ("Fe", 2, 917.0),
            ("Mn", 2, 860.0),
            ("Cr", 3, 918.0),
        ] {
            assert_eq!(t.find(m, ox).unwrap().b0, Some(b0));
        }
    }

    #[test]
    fn unknown_metal_and_state_are_explained() {
        let t = bundled();
        let e = t.find("Fx", 2).unwrap_err().to_string();
        assert!(e.contains("unknown metal") && e.contains("Fe"), "{e}");
        let e = t.find("Fe", 5).unwrap_err().to_string();
        assert!(e.contains("2, 3"), "{e}");
        assert_eq!(t.find("fe", 2).unwrap().symbol, "Fe");
    }

    #[test]
    fn bad_rows_name_line_and_column() {
        let head = HEADER.join(",");
        // (the rows after the header, or a whole text with "!" first; a fragment of the error)
        let cases = [
            ("Fe,2,5000,,,,,hs,,,,x", "line 2, column b0"),
            ("Fe,2,917,,,,,hs,,,,", "column source"),
            ("Fe,9,917,,,,,hs,,,,x", "oxidation state of Fe"),
            ("Na,1,,,,,,any,,,,x", "d-block"),
            ("Fe,2,917,,,,,high,,,,x", "column g_state"),
            ("Fe,2,917,,,,,hs,,g=guessed,,x", "column provenance"),
            ("!symbol,ox\nFe,2", "header"),
        ];
        for (rows, needle) in cases {
            let text = match rows.strip_prefix('!') {
                Some(whole) => format!("{whole}\n"),
                None => format!("{head}\n{rows}\n"),
            };
            let e = IonTable::parse(&text).unwrap_err();
            assert!(e.to_string().contains(needle), "{e}");
        }
    }

    #[test]
    fn roman_numerals() {
        assert_eq!(roman(2), "II");
        assert_eq!(roman(4), "IV");
        assert_eq!(roman(7), "VII");
        assert_eq!(roman(8), "VIII");
        assert_eq!(roman(0), "0");
    }
}
