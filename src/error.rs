//! Typed errors of the library. Every message says what is wrong and what is accepted, on one line.

use thiserror::Error;

pub use crate::param::Param;

/// Everything that can go wrong in spinstate's library code.
#[derive(Debug, Error, Clone, PartialEq)]
pub enum Error {
    /// A value given by the user is outside what the model accepts.
    #[error(
        "{} = {} is not accepted: {}",
        one_line(&param.label()),
        one_line(value),
        one_line(accepted)
    )]
    InvalidParameter {
        /// The quantity refused.
        param: Param,
        value: String,
        /// What is accepted instead, in words.
        accepted: String,
        /// Other quantities the user may give to fix it (a caller can name how to set them;
        /// the message already says it in words).
        needs: Vec<Param>,
    },
    /// A name (metal, ligand, geometry, element…) is not known.
    #[error("{}", one_line(&unknown_text(.kind, .name, .suggestions)))]
    Unknown {
        /// What kind of name it is (routes the error, e.g. to a batch column).
        kind: NameKind,
        name: String,
        suggestions: Vec<String>,
    },
    /// Malformed input text (a number, a formula, a CSV cell).
    #[error("{}", one_line(.0))]
    Parse(String),
    /// A data table could not be read or fails its checks.
    #[error("data table {}: {}", one_line(table), one_line(message))]
    Data { table: String, message: String },
    /// A numerical procedure did not finish (no convergence, singular matrix…).
    #[error("computation did not finish: {}", one_line(.0))]
    Computation(String),
}

/// The kind of name an [`Error::Unknown`] concerns. Display gives the words of the message
/// ("metal", "energy unit (accepted: cm-1, nm, kK, eV)"): the noun, then the hint in brackets.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum NameKind {
    /// A metal of the ion table.
    Metal,
    /// A ligand of the ligand table.
    Ligand,
    /// A coordination geometry.
    Geometry,
    /// An element symbol.
    Element,
    /// A row of the Pascal-constant table.
    PascalEntry,
    /// An energy unit of band positions.
    EnergyUnit,
    /// A susceptibility unit system.
    UnitSystem,
    /// The magnet geometry of an Evans measurement.
    MagnetGeometry,
    /// The atom label of a metal centre in a structure, with the structure's name and the
    /// labels of its metal atoms.
    MetalLabel { structure: String, labels: String },
    /// A batch CSV column header, with its position (from 1) and the accepted headers.
    Column { position: usize, accepted: String },
}

impl NameKind {
    /// The noun of the message ("metal label").
    pub fn noun(&self) -> &'static str {
        match self {
            NameKind::Metal => "metal",
            NameKind::Ligand => "ligand",
            NameKind::Geometry => "geometry",
            NameKind::Element => "element symbol",
            NameKind::PascalEntry => "Pascal-table entry",
            NameKind::EnergyUnit => "energy unit",
            NameKind::UnitSystem => "unit system",
            NameKind::MagnetGeometry => "magnet geometry",
            NameKind::MetalLabel { .. } => "metal label",
            NameKind::Column { .. } => "column",
        }
    }

    /// What the user can do instead, in brackets in the message; None when the suggestions say
    /// enough.
    pub fn hint(&self) -> Option<String> {
        Some(match self {
            NameKind::Metal => {
                "give an element symbol such as Fe; `spinstate data ions` lists them".into()
            }
            NameKind::Ligand => "`spinstate data ligands` lists them; to add one, copy data/ligands.csv, add a row with its f and source, and load the tables from that directory".into(),
            NameKind::Geometry => "accepted: oct, tet, sqpl, tetragonal, sqpy, tbp".into(),
            NameKind::EnergyUnit => "accepted: cm-1, nm, kK, eV".into(),
            NameKind::UnitSystem => "accepted: cgs, si".into(),
            NameKind::MagnetGeometry => "accepted: solenoid, transverse".into(),
            NameKind::MetalLabel { structure, labels } => {
                format!("metals in {structure}: {labels}")
            }
            NameKind::Column { position, accepted } => {
                format!("header position {position}; accepted: {accepted}")
            }
            NameKind::Element | NameKind::PascalEntry => return None,
        })
    }
}

impl std::fmt::Display for NameKind {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(self.noun())?;
        match self.hint() {
            Some(h) => write!(f, " ({h})"),
            None => Ok(()),
        }
    }
}

/// "unknown KIND 'NAME'; did you mean A, B? (HINT)": the hint goes after the suggestions.
fn unknown_text(kind: &NameKind, name: &str, suggestions: &[String]) -> String {
    let mut s = format!(
        "unknown {} '{name}'{}",
        kind.noun(),
        suggestion_text(suggestions)
    );
    if let Some(hint) = kind.hint() {
        s.push_str(&format!(" ({hint})"));
    }
    s
}

fn suggestion_text(s: &[String]) -> String {
    if s.is_empty() {
        String::new()
    } else {
        format!("; did you mean {}?", s.join(", "))
    }
}

impl Error {
    /// Shorthand for [`Error::InvalidParameter`].
    pub fn invalid(
        param: Param,
        value: impl std::fmt::Display,
        accepted: impl Into<String>,
    ) -> Self {
        // A float's Display writes every digit (1e-310 as 310 zeros): extreme magnitudes are
        // shown in scientific notation instead.
        let value = value.to_string();
        let value = match value.parse::<f64>() {
            Ok(x) if value.len() > 20 => num(x),
            _ => value,
        };
        Error::InvalidParameter {
            param,
            value,
            accepted: accepted.into(),
            needs: Vec::new(),
        }
    }

    /// The same error, naming other quantities that would fix it (see
    /// [`Error::InvalidParameter`]'s `needs`); other kinds of error are returned unchanged.
    pub fn needing(mut self, params: impl IntoIterator<Item = Param>) -> Self {
        if let Error::InvalidParameter { needs, .. } = &mut self {
            needs.extend(params);
        }
        self
    }

    /// The quantity an [`Error::InvalidParameter`] concerns.
    pub fn param(&self) -> Option<&Param> {
        match self {
            Error::InvalidParameter { param, .. } => Some(param),
            _ => None,
        }
    }

    /// Process exit code for this error: 1 when a computation could not finish, 2 for bad input.
    pub fn exit_code(&self) -> u8 {
        match self {
            Error::Computation(_) => 1,
            _ => 2,
        }
    }
}

/// Text for a one-line message: line breaks and other control characters (which a quoted input
/// can carry) are shown escaped, as `\n`, `\r`, `\t` or `\u{…}`.
pub fn one_line(text: &str) -> std::borrow::Cow<'_, str> {
    let unsafe_char = |c: char| c.is_control() || c == '\u{2028}' || c == '\u{2029}';
    if !text.chars().any(unsafe_char) {
        return std::borrow::Cow::Borrowed(text);
    }
    let mut out = String::with_capacity(text.len() + 8);
    for c in text.chars() {
        if unsafe_char(c) {
            out.extend(c.escape_default());
        } else {
            out.push(c);
        }
    }
    std::borrow::Cow::Owned(out)
}

/// Result with the library's error type.
pub type Result<T> = std::result::Result<T, Error>;

/// A number for a message: plain for ordinary magnitudes, scientific notation for extreme ones.
pub fn num(x: f64) -> String {
    if x == 0.0 || !x.is_finite() || (1e-4..1e7).contains(&x.abs()) {
        format!("{x}")
    } else {
        format!("{x:e}")
    }
}

/// Rejects NaN and infinities with a one-line message naming the parameter.
pub fn require_finite(param: Param, value: f64) -> Result<f64> {
    if value.is_finite() {
        Ok(value)
    } else {
        Err(Error::invalid(param, value, "a finite number"))
    }
}

/// The known names closest to `name` (edit distance, case-insensitive), at most three.
pub fn closest_names<'a>(name: &str, known: impl IntoIterator<Item = &'a str>) -> Vec<String> {
    let target = name.to_lowercase();
    let mut scored: Vec<(usize, String)> = known
        .into_iter()
        .map(|k| (edit_distance(&target, &k.to_lowercase()), k.to_string()))
        .collect();
    scored.sort();
    scored.dedup_by(|a, b| a.1 == b.1);
    let limit = (target.chars().count() / 2).max(2);
    scored
        .into_iter()
        .filter(|(d, _)| *d <= limit)
        .take(3)
        .map(|(_, k)| k)
        .collect()
}

fn edit_distance(a: &str, b: &str) -> usize {
    let a: Vec<char> = a.chars().collect();
    let b: Vec<char> = b.chars().collect();
    let mut prev: Vec<usize> = (0..=b.len()).collect();
    for (i, ca) in a.iter().enumerate() {
        let mut cur = vec![i + 1; b.len() + 1];
        for (j, cb) in b.iter().enumerate() {
            let cost = usize::from(ca != cb);
            cur[j + 1] = (prev[j] + cost).min(prev[j + 1] + 1).min(cur[j] + 1);
        }
        prev = cur;
    }
    prev[b.len()]
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn suggestions_find_near_names() {
        let s = closest_names("bpyy", ["bpy", "phen", "py", "en"]);
        assert_eq!(s[0], "bpy");
    }

    #[test]
    fn unknown_names_put_the_hint_last() {
        let e = Error::Unknown {
            kind: NameKind::Geometry,
            name: "octt".into(),
            suggestions: vec!["oct".into()],
        };
        assert_eq!(
            e.to_string(),
            "unknown geometry 'octt'; did you mean oct? (accepted: oct, tet, sqpl, tetragonal, sqpy, tbp)"
        );
    }

    /// The string literals of Rust source `text`, with the line each starts on (comments,
    /// char literals and lifetimes skipped; raw and byte strings included).
    fn string_literals(text: &str) -> Vec<(usize, String)> {
        let c: Vec<char> = text.chars().collect();
        let (mut i, mut line, mut out) = (0, 1, Vec::new());
        let count_lines = |s: &[char]| s.iter().filter(|&&x| x == '\n').count();
        while i < c.len() {
            let rest = &c[i..];
            if rest.starts_with(&['/', '/']) {
                while i < c.len() && c[i] != '\n' {
                    i += 1;
                }
            } else if rest.starts_with(&['/', '*']) {
                let end = (i + 2..c.len().saturating_sub(1))
                    .find(|&j| c[j] == '*' && c[j + 1] == '/')
                    .map_or(c.len(), |j| j + 2);
                line += count_lines(&c[i..end]);
                i = end;
            } else if c[i] == '\'' {
                // A char literal ('x', '\n', '\u{..}') or a lifetime ('a).
                let close = if c.get(i + 1) == Some(&'\\') {
                    (i + 2..c.len()).find(|&j| c[j] == '\'')
                } else {
                    (c.get(i + 2) == Some(&'\'')).then_some(i + 2)
                };
                i = close.map_or(i + 1, |j| j + 1);
            } else if c[i] == '"' || (c[i] == 'r' && matches!(c.get(i + 1), Some('"' | '#'))) {
                let ident_before = i > 0 && (c[i - 1].is_alphanumeric() || c[i - 1] == '_');
                if c[i] == 'r' && ident_before {
                    i += 1;
                    continue;
                }
                let start_line = line;
                let (body_start, end, hashes) = if c[i] == 'r' {
                    let hashes = c[i + 1..].iter().take_while(|&&x| x == '#').count();
                    let open = i + 1 + hashes;
                    if c.get(open) != Some(&'"') {
                        i += 1;
                        continue;
                    }
                    let closing: Vec<char> = std::iter::once('"')
                        .chain(std::iter::repeat_n('#', hashes))
                        .collect();
                    let end = (open + 1..c.len())
                        .find(|&j| c[j..].starts_with(&closing))
                        .unwrap_or(c.len());
                    (open + 1, end, hashes)
                } else {
                    let mut j = i + 1;
                    while j < c.len() && c[j] != '"' {
                        j += if c[j] == '\\' { 2 } else { 1 };
                    }
                    (i + 1, j.min(c.len()), 0)
                };
                let body: String = c[body_start..end].iter().collect();
                line += count_lines(&c[i..end.min(c.len())]);
                out.push((start_line, body));
                i = end + 1 + hashes;
            } else {
                if c[i] == '\n' {
                    line += 1;
                }
                i += 1;
            }
        }
        out
    }

    /// The command-line flags (`--name`) a string literal names. CSS custom properties of the
    /// HTML report (`var(--ink)`, `{ --ink: …; }`) are not flags.
    fn flags_in(literal: &str) -> Vec<String> {
        let c: Vec<char> = literal.chars().collect();
        let mut found = Vec::new();
        for i in 0..c.len().saturating_sub(2) {
            if !(c[i] == '-' && c[i + 1] == '-' && c[i + 2].is_ascii_lowercase()) {
                continue;
            }
            if i > 0 && (c[i - 1].is_alphanumeric() || c[i - 1] == '-') {
                continue;
            }
            let before: String = c[..i].iter().collect();
            let end = (i + 2..c.len())
                .find(|&j| !(c[j].is_ascii_alphanumeric() || c[j] == '-'))
                .unwrap_or(c.len());
            let declaration = c.get(end) == Some(&':')
                && matches!(before.trim_end().chars().last(), Some('{' | ';'));
            if before.ends_with("var(") || declaration {
                continue;
            }
            found.push(c[i..end].iter().collect());
        }
        found
    }

    #[test]
    fn the_flag_scanner_finds_flags_in_literals_only() {
        let dashes = "-".repeat(2);
        let source = format!(
            "// give {d}dia in a comment\nlet a = \"give {d}dia\";\nlet b = r#\"a {d}molar-mass\"#;\nlet c = '\"'; let d: &'static str = \"x\";\nlet css = \":root {{ {d}ink: #000; }} p {{ color: var({d}ink); }}\";\nlet e = \"{d}formula: bad\";",
            d = dashes
        );
        let flags: Vec<(usize, String)> = string_literals(&source)
            .into_iter()
            .flat_map(|(l, s)| flags_in(&s).into_iter().map(move |f| (l, f)))
            .collect();
        let want = |l: usize, f: &str| (l, format!("{dashes}{f}"));
        assert_eq!(
            flags,
            vec![want(2, "dia"), want(3, "molar-mass"), want(6, "formula")]
        );
    }

    /// Library messages name quantities, never command-line options: the CLI alone maps a
    /// [`Param`] to its option. Scans every library source file's string literals.
    #[test]
    fn library_strings_name_no_command_line_flag() {
        fn walk(dir: &std::path::Path, files: &mut Vec<std::path::PathBuf>) {
            for entry in std::fs::read_dir(dir).unwrap() {
                let path = entry.unwrap().path();
                if path.is_dir() {
                    walk(&path, files);
                } else if path.extension().is_some_and(|e| e == "rs") {
                    files.push(path);
                }
            }
        }
        let src = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("src");
        let mut files = Vec::new();
        walk(&src, &mut files);
        let library: Vec<_> = files
            .into_iter()
            .filter(|p| !p.starts_with(src.join("cli")) && *p != src.join("main.rs"))
            .collect();
        assert!(
            library.len() > 50,
            "only {} library files found",
            library.len()
        );
        let mut offending = Vec::new();
        for path in &library {
            let text = std::fs::read_to_string(path).unwrap();
            for (line, literal) in string_literals(&text) {
                for flag in flags_in(&literal) {
                    offending.push(format!("{}:{line}: {flag}", path.display()));
                }
            }
        }
        assert!(offending.is_empty(), "{}", offending.join("\n"));
    }

    #[test]
    fn exit_codes() {
        assert_eq!(Error::Computation("x".into()).exit_code(), 1);
        assert_eq!(
            Error::invalid(Param::DElectronCount, 11, "0..=10").exit_code(),
            2
        );
    }
}
