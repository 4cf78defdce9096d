//! Molecular formulas: parsing, element counts, molar mass and charge.
//!
//! Accepted syntax (whitespace is allowed only around separators and before a charge):
//! - element symbols with counts: `H2O`, `CuSO4`; Unicode subscripts too: `K₄[Fe(CN)₆]`;
//! - nested groups with counts, `( )` and `[ ]`, which must match: `[Co(NH3)6]Cl3`;
//! - parts joined by a middle dot, bullet, `*` or `.`, each with an optional leading multiplier,
//!   which may be a decimal: `CuSO4·5H2O`, `CuSO4.5H2O`, `[Fe(L)2](BF4)2·0.5MeCN` (the last only
//!   with `{…}` names for L and MeCN);
//! - an optional charge at the very end: `[Fe(H2O)6]2+`, `[Fe(CN)6]^4-`, `Fe2+`, `Cl-`, `NH4+`,
//!   `PF6-`, `SO4^2-`, `SO4 2-`, `[Fe(CN)6]³⁻`. Digits directly before the final sign are the
//!   charge after a closing bracket and in a one-element ion (`Fe2+`, `O2-`); after an element
//!   inside a larger formula they are its count (`NH4+` is NH₄⁺). Several such digits are
//!   ambiguous (`SO42-`) and rejected: write `SO4^2-` or `SO4 2-`;
//! - named groups in braces, `{py}`, expanded by a caller-supplied lookup (for instance the
//!   Pascal table's ligands); [`Formula::parse`] has no lookup and rejects them.
//!
//! Atomic weights are the IUPAC (CIAAW) standard atomic weights from the `mendeleev` crate
//! (conventional values for elements given as intervals; the mass number of the most stable
//! isotope for elements without a standard weight).

use crate::error::{closest_names, Error, Result};
use mendeleev::Element;
use std::collections::BTreeMap;
use std::fmt;

/// A parsed formula: element counts (named groups expanded), the part written as plain element
/// symbols, the named groups used, and the charge.
#[derive(Debug, Clone, PartialEq)]
pub struct Formula {
    text: String,
    elements: BTreeMap<Element, f64>,
    free_elements: BTreeMap<Element, f64>,
    groups: Vec<(String, f64)>,
    charge: i32,
}

/// The lookup used for `{name}` groups: the composition of the name, or the names that come
/// closest when it is unknown.
pub type GroupLookup<'a> = dyn Fn(&str) -> std::result::Result<Formula, Vec<String>> + 'a;

impl Formula {
    /// Parses a formula without named groups.
    pub fn parse(text: &str) -> Result<Formula> {
        Parser::new(text, None).run()
    }

    /// Parses a formula whose `{name}` groups are expanded by `lookup`.
    pub fn parse_with(text: &str, lookup: &GroupLookup<'_>) -> Result<Formula> {
        Parser::new(text, Some(lookup)).run()
    }

    /// A formula with no atoms and no charge (e.g. the composition of a bond correction).
    pub fn empty() -> Formula {
        Formula {
            text: String::new(),
            elements: BTreeMap::new(),
            free_elements: BTreeMap::new(),
            groups: Vec::new(),
            charge: 0,
        }
    }

    /// The text as given.
    pub fn text(&self) -> &str {
        &self.text
    }

    /// Count of every element, named groups expanded (counts may be fractional for solvates).
    pub fn elements(&self) -> &BTreeMap<Element, f64> {
        &self.elements
    }

    /// Count of every element written as a plain symbol, i.e. outside `{…}` groups.
    pub fn free_elements(&self) -> &BTreeMap<Element, f64> {
        &self.free_elements
    }

    /// Named groups with their total counts, in order of first appearance.
    pub fn groups(&self) -> &[(String, f64)] {
        &self.groups
    }

    /// Net charge (0 for a neutral formula).
    pub fn charge(&self) -> i32 {
        self.charge
    }

    /// Count of one element (0 when absent).
    pub fn count(&self, element: Element) -> f64 {
        self.elements.get(&element).copied().unwrap_or(0.0)
    }

    /// Molar mass in g mol⁻¹ from the standard atomic weights (electron mass of a charge ignored).
    pub fn molar_mass(&self) -> f64 {
        self.elements
            .iter()
            .map(|(e, n)| n * f64::from(e.atomic_weight()))
            .sum()
    }

    /// The composition in Hill order (C, H, then alphabetical; alphabetical without carbon),
    /// with the charge, e.g. "C5H5N" or "Fe+2".
    pub fn hill(&self) -> String {
        let mut symbols: Vec<(Element, f64)> =
            self.elements.iter().map(|(e, n)| (*e, *n)).collect();
        let has_carbon = self.elements.contains_key(&Element::C);
        symbols.sort_by(|(a, _), (b, _)| {
            let rank = |e: &Element| match (has_carbon, e) {
                (true, Element::C) => 0,
                (true, Element::H) => 1,
                _ => 2,
            };
            rank(a)
                .cmp(&rank(b))
                .then_with(|| a.symbol().cmp(b.symbol()))
        });
        let mut s = String::new();
        for (e, n) in symbols {
            s.push_str(e.symbol());
            if (n - 1.0).abs() > 1e-12 {
                s.push_str(&format_count(n));
            }
        }
        match self.charge {
            0 => {}
            q if q > 0 => s.push_str(&format!("+{q}")),
            q => s.push_str(&format!("{q}")),
        }
        s
    }
}

impl fmt::Display for Formula {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.text)
    }
}

fn format_count(n: f64) -> String {
    if (n - n.round()).abs() < 1e-9 {
        format!("{}", n.round() as i64)
    } else {
        let s = format!("{n:.4}");
        s.trim_end_matches('0').trim_end_matches('.').to_string()
    }
}

/// The element with this exact symbol (case-sensitive, as formulas are).
pub fn element_from_symbol(symbol: &str) -> Option<Element> {
    Element::iter().find(|e| e.symbol() == symbol)
}

/// Counts accumulated while parsing one group.
#[derive(Default, Clone)]
struct Counts {
    all: BTreeMap<Element, f64>,
    free: BTreeMap<Element, f64>,
    groups: Vec<(String, f64)>,
}

impl Counts {
    fn is_empty(&self) -> bool {
        self.all.is_empty() && self.groups.is_empty()
    }

    fn scale(mut self, k: f64) -> Self {
        self.all.values_mut().for_each(|v| *v *= k);
        self.free.values_mut().for_each(|v| *v *= k);
        self.groups.iter_mut().for_each(|(_, v)| *v *= k);
        self
    }

    fn add(&mut self, other: Counts) {
        for (e, n) in other.all {
            *self.all.entry(e).or_insert(0.0) += n;
        }
        for (e, n) in other.free {
            *self.free.entry(e).or_insert(0.0) += n;
        }
        for (name, n) in other.groups {
            match self.groups.iter_mut().find(|(g, _)| *g == name) {
                Some((_, m)) => *m += n,
                None => self.groups.push((name, n)),
            }
        }
    }
}

const SEPARATORS: [char; 6] = ['·', '•', '∙', '⋅', '*', '.'];
const PLUS: [char; 2] = ['+', '⁺'];
const MINUS: [char; 3] = ['-', '−', '⁻'];

fn subscript_digit(c: char) -> Option<u32> {
    ('₀'..='₉').contains(&c).then(|| c as u32 - '₀' as u32)
}

fn superscript_digit(c: char) -> Option<u32> {
    match c {
        '⁰' => Some(0),
        '¹' => Some(1),
        '²' => Some(2),
        '³' => Some(3),
        '⁴'..='⁹' => Some(c as u32 - '⁴' as u32 + 4),
        _ => None,
    }
}

fn is_sign(c: char) -> bool {
    PLUS.contains(&c) || MINUS.contains(&c)
}

/// Longest formula accepted, in characters (the largest coordination compounds need a few
/// hundred).
pub const MAX_FORMULA_CHARS: usize = 10_000;

/// The formula as quoted in a message: at most 60 characters, then "…".
fn shortened(text: &str) -> String {
    match text.char_indices().nth(60) {
        Some((at, _)) => format!("{}…", &text[..at]),
        None => text.to_string(),
    }
}

/// Deepest nesting of brackets accepted; real formulas use three or four levels.
pub const MAX_BRACKET_DEPTH: usize = 32;

struct Parser<'a> {
    text: &'a str,
    chars: Vec<char>,
    pos: usize,
    lookup: Option<&'a GroupLookup<'a>>,
    parts_done: usize,
    /// Brackets open at the current position.
    depth: usize,
}

impl<'a> Parser<'a> {
    fn new(text: &'a str, lookup: Option<&'a GroupLookup<'a>>) -> Self {
        Parser {
            text,
            chars: text.chars().collect(),
            pos: 0,
            lookup,
            parts_done: 0,
            depth: 0,
        }
    }

    /// An error pointing at a 0-based character index (reported 1-based).
    fn error_at(&self, index: usize, what: impl fmt::Display) -> Error {
        Error::Parse(format!(
            "formula '{}': {what} at character {}",
            shortened(self.text),
            index + 1
        ))
    }

    fn peek(&self) -> Option<char> {
        self.chars.get(self.pos).copied()
    }

    fn skip_spaces(&mut self) {
        while self.peek().is_some_and(char::is_whitespace) {
            self.pos += 1;
        }
    }

    fn run(mut self) -> Result<Formula> {
        if self.chars.len() > MAX_FORMULA_CHARS {
            return Err(Error::Parse(format!(
                "formula '{}' has {} characters; at most {MAX_FORMULA_CHARS} are accepted",
                shortened(self.text),
                self.chars.len()
            )));
        }
        self.skip_spaces();
        if self.peek().is_none() {
            return Err(Error::Parse(
                "empty formula: give element symbols such as 'K4[Fe(CN)6]·3H2O'".into(),
            ));
        }
        let mut total = Counts::default();
        loop {
            self.skip_spaces();
            total.add(self.part()?);
            self.parts_done += 1;
            let save = self.pos;
            self.skip_spaces();
            match self.peek() {
                Some(c) if SEPARATORS.contains(&c) => {
                    self.pos += 1;
                    self.skip_spaces();
                    if self.peek().is_none() {
                        return Err(self.error_at(self.pos - 1, "nothing follows the separator"));
                    }
                }
                _ => {
                    self.pos = save;
                    break;
                }
            }
        }
        let charge = self.charge()?;
        self.skip_spaces();
        if let Some(c) = self.peek() {
            let what = match c {
                ')' | ']' => format!("unmatched '{c}'"),
                '}' => "unmatched '}'".to_string(),
                _ => format!(
                    "unexpected '{c}' (accepted: element symbols, ( ) [ ] {{ }}, counts, '·' or '.', a final charge)"
                ),
            };
            return Err(self.error_at(self.pos, what));
        }
        Ok(Formula {
            text: self.text.to_string(),
            elements: total.all,
            free_elements: total.free,
            groups: total.groups,
            charge,
        })
    }

    /// One part between separators: an optional leading multiplier and a sequence of units.
    fn part(&mut self) -> Result<Counts> {
        let start = self.pos;
        let multiplier = if self.peek().is_some_and(|c| c.is_ascii_digit()) {
            Some(self.multiplier()?)
        } else {
            None
        };
        if multiplier.is_some() {
            self.skip_spaces();
        }
        let counts = self.sequence(None)?;
        if counts.is_empty() {
            let what = match self.peek() {
                None if multiplier.is_some() => "a multiplier with nothing to multiply".to_string(),
                None => "expected an element symbol, '(', '[' or '{'".to_string(),
                Some(c) if c.is_lowercase() => format!(
                    "'{c}' cannot start an element symbol (symbols start with a capital letter; write ligand names in braces, e.g. {{py}})"
                ),
                Some(c) => format!("expected an element symbol, '(', '[' or '{{', found '{c}'"),
            };
            let at = if multiplier.is_some() && self.peek().is_none() {
                start
            } else {
                self.pos
            };
            return Err(self.error_at(at, what));
        }
        Ok(match multiplier {
            Some(k) => counts.scale(k),
            None => counts,
        })
    }

    /// A leading multiplier: digits, optionally with a decimal point followed by digits.
    fn multiplier(&mut self) -> Result<f64> {
        let start = self.pos;
        while self.peek().is_some_and(|c| c.is_ascii_digit()) {
            self.pos += 1;
        }
        if self.peek() == Some('.')
            && self
                .chars
                .get(self.pos + 1)
                .is_some_and(|c| c.is_ascii_digit())
        {
            self.pos += 1;
            while self.peek().is_some_and(|c| c.is_ascii_digit()) {
                self.pos += 1;
            }
        }
        let s: String = self.chars[start..self.pos].iter().collect();
        let k: f64 = s
            .parse()
            .map_err(|_| self.error_at(start, format!("bad multiplier '{s}'")))?;
        if k <= 0.0 {
            return Err(self.error_at(start, format!("multiplier {s} must be > 0")));
        }
        Ok(k)
    }

    /// Units up to a closing bracket (or the end of the part).
    fn sequence(&mut self, open: Option<(char, usize)>) -> Result<Counts> {
        let mut counts = Counts::default();
        loop {
            let Some(c) = self.peek() else {
                if let Some((o, at)) = open {
                    return Err(self.error_at(at, format!("unclosed '{o}'")));
                }
                return Ok(counts);
            };
            let unit_start = self.pos;
            // Digits before a final sign are a charge after a bracket or in a one-element ion.
            let tail_is_charge = match c {
                'A'..='Z' => open.is_none() && counts.is_empty() && self.parts_done == 0,
                _ => true,
            };
            let unit = match c {
                'A'..='Z' => self.element()?,
                '(' | '[' => {
                    if self.depth >= MAX_BRACKET_DEPTH {
                        return Err(self.error_at(
                            unit_start,
                            format!("brackets nested deeper than {MAX_BRACKET_DEPTH} levels"),
                        ));
                    }
                    self.pos += 1;
                    let close = if c == '(' { ')' } else { ']' };
                    self.depth += 1;
                    let inner = self.sequence(Some((c, unit_start)));
                    self.depth -= 1;
                    let inner = inner?;
                    if self.peek() != Some(close) {
                        // sequence() returns only at the matching bracket or with an error.
                        return Err(self.error_at(unit_start, format!("unclosed '{c}'")));
                    }
                    if inner.is_empty() {
                        return Err(self.error_at(unit_start, format!("empty '{c}{close}'")));
                    }
                    self.pos += 1;
                    inner
                }
                '{' => self.named_group()?,
                ')' | ']' => {
                    return match open {
                        Some((o, _)) if (o == '(' && c == ')') || (o == '[' && c == ']') => {
                            Ok(counts)
                        }
                        Some((o, at)) => Err(self.error_at(
                            self.pos,
                            format!("'{c}' does not match '{o}' opened at character {}", at + 1),
                        )),
                        None => Err(self.error_at(self.pos, format!("unmatched '{c}'"))),
                    };
                }
                _ => {
                    if let Some((o, at)) = open {
                        if !SEPARATORS.contains(&c) && !c.is_whitespace() && !is_sign(c) {
                            return Err(self.error_at(
                                self.pos,
                                format!(
                                    "unexpected '{c}' inside '{o}' opened at character {}",
                                    at + 1
                                ),
                            ));
                        }
                        return Err(self.error_at(at, format!("unclosed '{o}'")));
                    }
                    return Ok(counts);
                }
            };
            let n = self.count(tail_is_charge)?;
            counts.add(unit.scale(n));
        }
    }

    fn element(&mut self) -> Result<Counts> {
        let start = self.pos;
        self.pos += 1;
        while self.peek().is_some_and(|c| c.is_ascii_lowercase()) {
            self.pos += 1;
        }
        let symbol: String = self.chars[start..self.pos].iter().collect();
        let Some(e) = element_from_symbol(&symbol) else {
            let known: Vec<&str> = Element::iter().map(|e| e.symbol()).collect();
            let mut hint = String::new();
            let near = closest_names(&symbol, known.iter().copied());
            let near: Vec<String> = near.into_iter().filter(|n| n != &symbol).collect();
            if symbol == "D" || symbol == "T" {
                hint.push_str("; isotopes are not supported, write H");
            } else if !near.is_empty() {
                hint = format!("; did you mean {}?", near.join(", "));
            }
            if symbol.chars().count() > 2 {
                hint.push_str(
                    " (symbols are one capital and at most one small letter; write ligand names in braces, e.g. {py})",
                );
            }
            return Err(self.error_at(start, format!("unknown element '{symbol}'{hint}")));
        };
        let mut c = Counts::default();
        c.all.insert(e, 1.0);
        c.free.insert(e, 1.0);
        Ok(c)
    }

    fn named_group(&mut self) -> Result<Counts> {
        let start = self.pos;
        self.pos += 1;
        let name_start = self.pos;
        while self.peek().is_some_and(|c| c != '}') {
            self.pos += 1;
        }
        if self.peek() != Some('}') {
            return Err(self.error_at(start, "unclosed '{'"));
        }
        let name: String = self.chars[name_start..self.pos].iter().collect();
        self.pos += 1;
        let name = name.trim().to_string();
        if name.is_empty() {
            return Err(self.error_at(start, "empty '{}'"));
        }
        let Some(lookup) = self.lookup else {
            return Err(self.error_at(
                start,
                format!("named group '{{{name}}}' needs a table of names (use plain element symbols here)"),
            ));
        };
        match lookup(&name) {
            Ok(f) => Ok(Counts {
                all: f.elements.clone(),
                free: BTreeMap::new(),
                groups: vec![(name, 1.0)],
            }),
            Err(near) => {
                let hint = if near.is_empty() {
                    String::new()
                } else {
                    format!("; did you mean {}?", near.join(", "))
                };
                Err(self.error_at(start, format!("unknown name '{{{name}}}'{hint}")))
            }
        }
    }

    /// An integer count after a unit (ASCII digits or Unicode subscripts); 1 when absent.
    /// When `tail_is_charge`, digits followed only by signs and the end are a charge, not a
    /// count; otherwise a single such digit is a count and several are rejected as ambiguous.
    fn count(&mut self, tail_is_charge: bool) -> Result<f64> {
        let start = self.pos;
        let mut end = self.pos;
        let mut value: u64 = 0;
        let mut subscript = false;
        while let Some(&c) = self.chars.get(end) {
            let d = if let Some(d) = c.to_digit(10).filter(|_| c.is_ascii_digit()) {
                d
            } else if let Some(d) = subscript_digit(c) {
                subscript = true;
                d
            } else {
                break;
            };
            value = value.saturating_mul(10).saturating_add(u64::from(d));
            end += 1;
        }
        if end == start {
            return Ok(1.0);
        }
        if !subscript && self.is_charge_tail(end) {
            if tail_is_charge {
                return Ok(1.0);
            }
            if end - start > 1 {
                let digits: String = self.chars[start..end].iter().collect();
                return Err(self.error_at(
                    start,
                    format!(
                        "'{digits}' before the charge is ambiguous (count or charge?): write the charge with '^' or a space, e.g. SO4^2- or SO4 2-"
                    ),
                ));
            }
        }
        if value == 0 {
            return Err(self.error_at(start, "a count of 0"));
        }
        if value > 1_000_000 {
            return Err(self.error_at(start, "a count above 1000000"));
        }
        self.pos = end;
        Ok(value as f64)
    }

    /// Whether only signs (and trailing whitespace) follow `from`. Stops at the first other
    /// character, so that parsing stays linear in the length of the formula.
    fn is_charge_tail(&self, from: usize) -> bool {
        let mut signs = 0usize;
        let mut rest = self.chars[from..].iter();
        for &c in rest.by_ref() {
            if is_sign(c) {
                signs += 1;
            } else if c.is_whitespace() {
                break;
            } else {
                return false;
            }
        }
        signs > 0 && rest.all(|c| c.is_whitespace())
    }

    /// An optional final charge: `2+`, `+2`, `+`, `++`, `^3-`, `³⁻`.
    fn charge(&mut self) -> Result<i32> {
        self.skip_spaces();
        let start = self.pos;
        let Some(first) = self.peek() else {
            return Ok(0);
        };
        let caret = first == '^';
        if caret {
            self.pos += 1;
        }
        let digits_start = self.pos;
        let mut magnitude: Option<u64> = None;
        let read_digits = |p: &mut Self| {
            let mut v: Option<u64> = None;
            while let Some(c) = p.peek() {
                let d = if c.is_ascii_digit() {
                    c.to_digit(10)
                } else {
                    superscript_digit(c)
                };
                let Some(d) = d else { break };
                v = Some(
                    v.unwrap_or(0)
                        .saturating_mul(10)
                        .saturating_add(u64::from(d)),
                );
                p.pos += 1;
            }
            v
        };
        if let Some(v) = read_digits(self) {
            magnitude = Some(v);
        }
        let sign_start = self.pos;
        let mut signs = Vec::new();
        while let Some(c) = self.peek().filter(|c| is_sign(*c)) {
            signs.push(c);
            self.pos += 1;
        }
        if signs.is_empty() {
            if caret || magnitude.is_some() {
                return Err(self.error_at(
                    digits_start.min(self.chars.len().saturating_sub(1)),
                    "a charge needs a sign, e.g. 2+ or 3-",
                ));
            }
            self.pos = start;
            return Ok(0);
        }
        let negative = MINUS.contains(&signs[0]);
        if signs.iter().any(|c| MINUS.contains(c) != negative) {
            return Err(self.error_at(sign_start, "mixed '+' and '-' in the charge"));
        }
        if magnitude.is_none() {
            // "+2" style, or repeated signs "++".
            if signs.len() == 1 {
                magnitude = read_digits(self);
            }
        } else if signs.len() > 1 {
            return Err(self.error_at(sign_start, "write a charge as 2+ or ++, not both"));
        }
        let m = magnitude.unwrap_or(signs.len() as u64);
        if m == 0 {
            return Err(self.error_at(start, "a charge of 0 (leave the charge out)"));
        }
        if m > 12 {
            return Err(self.error_at(
                start,
                format!(
                    "implausible charge {m}{}: write a count that precedes a charge with '^', e.g. SO4^2-",
                    if negative { '-' } else { '+' }
                ),
            ));
        }
        let q = m as i32;
        Ok(if negative { -q } else { q })
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    fn counts(f: &Formula) -> Vec<(&'static str, f64)> {
        f.elements().iter().map(|(e, n)| (e.symbol(), *n)).collect()
    }

    #[test]
    fn deep_nesting_and_long_formulas_are_refused_with_their_limit() {
        let deep = format!("{}H{}", "(".repeat(40), ")".repeat(40));
        let e = Formula::parse(&deep).unwrap_err().to_string();
        assert!(e.contains("nested deeper than 32"), "{e}");
        assert!(e.len() < 200, "the message quotes a shortened formula: {e}");
        let ok = format!("{}H{}", "(".repeat(32), ")".repeat(32));
        assert_eq!(Formula::parse(&ok).unwrap().count(Element::H), 1.0);
        let long = "CH2".repeat(4000);
        let e = Formula::parse(&long).unwrap_err().to_string();
        assert!(e.contains("at most 10000"), "{e}");
        // Just under the limit parses (and in linear time: the charge look-ahead stops early).
        let f = Formula::parse(&"CH2".repeat(3300)).unwrap();
        assert_eq!(f.count(Element::C), 3300.0);
    }

    #[test]
    fn simple_and_nested() {
        let f = Formula::parse("H2O").unwrap();
        assert_eq!(counts(&f), vec![("H", 2.0), ("O", 1.0)]);
        let f = Formula::parse("[Co(NH3)6]Cl3").unwrap();
        assert_eq!(f.count(Element::N), 6.0);
        assert_eq!(f.count(Element::H), 18.0);
        assert_eq!(f.count(Element::Cl), 3.0);
        assert_eq!(f.count(Element::Co), 1.0);
        assert_eq!(f.charge(), 0);
        let f = Formula::parse("Ca3(PO4)2").unwrap();
        assert_eq!(f.count(Element::O), 8.0);
        assert_eq!(f.count(Element::P), 2.0);
    }

    #[test]
    fn hydrates_multipliers_and_charge() {
        let f = Formula::parse("K4[Fe(CN)6]·3H2O").unwrap();
        assert_eq!(f.count(Element::K), 4.0);
        assert_eq!(f.count(Element::C), 6.0);
        assert_eq!(f.count(Element::N), 6.0);
        assert_eq!(f.count(Element::H), 6.0);
        assert_eq!(f.count(Element::O), 3.0);
        for text in ["CuSO4·5H2O", "CuSO4.5H2O", "CuSO4 · 5 H2O", "CuSO4*5H2O"] {
            let f = Formula::parse(text).unwrap_or_else(|e| panic!("{text}: {e}"));
            assert_eq!(f.count(Element::O), 9.0, "{text}");
            assert_eq!(f.count(Element::H), 10.0, "{text}");
        }
        let f = Formula::parse("[Fe(H2O)6]2+").unwrap();
        assert_eq!(f.charge(), 2);
        assert_eq!(f.count(Element::H), 12.0);
        assert_eq!(Formula::parse("[Fe(CN)6]^4-").unwrap().charge(), -4);
        assert_eq!(Formula::parse("[Fe(CN)6]3-").unwrap().charge(), -3);
        assert_eq!(Formula::parse("[Fe(CN)6]³⁻").unwrap().charge(), -3);
        assert_eq!(Formula::parse("NH4+").unwrap().charge(), 1);
        assert_eq!(Formula::parse("NH4+").unwrap().count(Element::H), 4.0);
        assert_eq!(Formula::parse("Cl-").unwrap().charge(), -1);
        assert_eq!(Formula::parse("SO4^2-").unwrap().charge(), -2);
        assert_eq!(Formula::parse("SO4 2-").unwrap().charge(), -2);
        assert_eq!(Formula::parse("PF6-").unwrap().charge(), -1);
        assert_eq!(Formula::parse("PF6-").unwrap().count(Element::F), 6.0);
        assert_eq!(Formula::parse("Fe2+").unwrap().charge(), 2);
        assert_eq!(Formula::parse("Fe2+").unwrap().count(Element::Fe), 1.0);
        assert_eq!(Formula::parse("O2-").unwrap().charge(), -2);
        assert_eq!(Formula::parse("SO4^2-").unwrap().count(Element::O), 4.0);
        assert_eq!(Formula::parse("Fe++").unwrap().charge(), 2);
        assert_eq!(Formula::parse("Fe+3").unwrap().charge(), 3);
        let f = Formula::parse("NiCl2·0.5H2O").unwrap();
        assert_relative_eq!(f.count(Element::H), 1.0);
        assert_relative_eq!(f.count(Element::O), 0.5);
        let f = Formula::parse("K₄[Fe(CN)₆]·3H₂O").unwrap();
        assert_eq!(f.count(Element::K), 4.0);
        assert_eq!(f.count(Element::O), 3.0);
    }

    // Molar masses from IUPAC standard atomic weights (conventional values), compared with the
    // sums of the 2021 IUPAC values by hand (common practice): H2O 18.015, CuSO4·5H2O 249.68,
    // K4[Fe(CN)6]·3H2O 422.39.
    #[test]
    fn molar_masses() {
        assert_relative_eq!(
            Formula::parse("H2O").unwrap().molar_mass(),
            18.015,
            epsilon = 2e-3
        );
        assert_relative_eq!(
            Formula::parse("CuSO4·5H2O").unwrap().molar_mass(),
            249.68,
            epsilon = 0.02
        );
        assert_relative_eq!(
            Formula::parse("K4[Fe(CN)6]·3H2O").unwrap().molar_mass(),
            422.39,
            epsilon = 0.03
        );
    }

    #[test]
    fn hill_order() {
        assert_eq!(Formula::parse("NC5H5").unwrap().hill(), "C5H5N");
        assert_eq!(Formula::parse("[Fe(H2O)6]2+").unwrap().hill(), "FeH12O6+2");
        assert_eq!(Formula::parse("NiCl2·0.5H2O").unwrap().hill(), "Cl2HNiO0.5");
    }

    fn err(text: &str) -> String {
        Formula::parse(text).unwrap_err().to_string()
    }

    #[test]
    fn errors_point_at_the_character() {
        let e = err("Fe(CN6");
        assert!(
            e.contains("unclosed '('") && e.contains("character 3"),
            "{e}"
        );
        let e = err("K4[Fe(CN)6)");
        assert!(
            e.contains("')' does not match '['") && e.contains("character 11"),
            "{e}"
        );
        let e = err("FeXx3");
        assert!(
            e.contains("unknown element 'Xx'") && e.contains("character 3"),
            "{e}"
        );
        let e = err("CuSO4·");
        assert!(e.contains("nothing follows"), "{e}");
        let e = err("H2O)");
        assert!(
            e.contains("unmatched ')'") && e.contains("character 4"),
            "{e}"
        );
        let e = err("Fe0");
        assert!(e.contains("count of 0"), "{e}");
        let e = err("SO42-");
        assert!(
            e.contains("ambiguous") && e.contains("SO4^2-") && e.contains("character 3"),
            "{e}"
        );
        let e = err("[Fe(CN)6]42-");
        assert!(e.contains("implausible charge 42-"), "{e}");
        let e = err("py");
        assert!(e.contains("capital letter") && e.contains("{py}"), "{e}");
        let e = err("Fe()");
        assert!(e.contains("empty '()'"), "{e}");
        let e = err("D2O");
        assert!(e.contains("isotopes are not supported"), "{e}");
        let e = err("{py}4");
        assert!(e.contains("needs a table"), "{e}");
        let e = err("Fe%");
        assert!(
            e.contains("unexpected '%'") && e.contains("character 3"),
            "{e}"
        );
        let e = err("5");
        assert!(e.contains("nothing to multiply"), "{e}");
        assert!(err("").contains("empty formula"));
        let e = err("Fe2+ Cl");
        assert!(
            e.contains("unexpected 'C'") && e.contains("character 6"),
            "{e}"
        );
        let e = err("[Fe(H2O)6]+-");
        assert!(e.contains("mixed"), "{e}");
    }

    #[test]
    fn named_groups_expand_through_the_lookup() {
        let lookup = |name: &str| match name {
            "py" => Ok(Formula::parse("C5H5N").unwrap()),
            _ => Err(vec!["py".to_string()]),
        };
        let f = Formula::parse_with("[Fe{py}4(NCS)2]", &lookup).unwrap();
        assert_eq!(f.count(Element::C), 22.0);
        assert_eq!(f.count(Element::N), 6.0);
        assert_eq!(f.groups(), &[("py".to_string(), 4.0)]);
        // Atoms inside braces are not "free".
        assert_eq!(f.free_elements().get(&Element::C), Some(&2.0));
        assert_eq!(f.free_elements().get(&Element::N), Some(&2.0));
        let e = Formula::parse_with("Fe{pyy}2", &lookup)
            .unwrap_err()
            .to_string();
        assert!(
            e.contains("unknown name '{pyy}'") && e.contains("did you mean py"),
            "{e}"
        );
        assert!(e.contains("character 3"), "{e}");
        let f = Formula::parse_with("2{py}·{py}", &lookup).unwrap();
        assert_eq!(f.groups(), &[("py".to_string(), 3.0)]);
    }
}
