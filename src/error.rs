//! Typed errors of the library. Every message says what is wrong and what is accepted, on one line.

use thiserror::Error;

/// Everything that can go wrong in spinstate's library code.
#[derive(Debug, Error, Clone, PartialEq)]
pub enum Error {
    /// A value given by the user is outside what the model accepts.
    #[error(
        "{} = {} is not accepted: {}",
        one_line(name),
        one_line(value),
        one_line(accepted)
    )]
    InvalidParameter {
        name: String,
        value: String,
        accepted: String,
    },
    /// A name (metal, ligand, geometry, element…) is not known.
    #[error("{}", one_line(&unknown_text(.kind, .name, .suggestions)))]
    Unknown {
        kind: String,
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

/// "unknown KIND 'NAME'; did you mean A, B? (HINT)": a parenthetical hint at the end of `kind`
/// goes after the suggestions.
fn unknown_text(kind: &str, name: &str, suggestions: &[String]) -> String {
    let (head, hint) = match kind.find(" (") {
        Some(i) if kind.ends_with(')') => (&kind[..i], &kind[i + 1..]),
        _ => (kind, ""),
    };
    let mut s = format!("unknown {head} '{name}'{}", suggestion_text(suggestions));
    if !hint.is_empty() {
        s.push(' ');
        s.push_str(hint);
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
        name: impl Into<String>,
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
            name: name.into(),
            value,
            accepted: accepted.into(),
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
pub fn require_finite(name: &str, value: f64) -> Result<f64> {
    if value.is_finite() {
        Ok(value)
    } else {
        Err(Error::invalid(name, value, "a finite number"))
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
            kind: "geometry (accepted: oct, tet)".into(),
            name: "octt".into(),
            suggestions: vec!["oct".into()],
        };
        assert_eq!(
            e.to_string(),
            "unknown geometry 'octt'; did you mean oct? (accepted: oct, tet)"
        );
    }

    #[test]
    fn exit_codes() {
        assert_eq!(Error::Computation("x".into()).exit_code(), 1);
        assert_eq!(Error::invalid("dn", 11, "0..=10").exit_code(), 2);
    }
}
