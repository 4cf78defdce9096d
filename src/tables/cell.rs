//! One cell of a data-table row and the checks every table applies to its cells. A bad cell
//! becomes one line naming the table, the line of the file and the column:
//! `ions.csv: line 7, column b0: 5000 is outside the sensible range 200..=2000 cm⁻¹`.

use crate::error::{Error, Result};
use std::ops::RangeInclusive;

/// One cell, with the table, line and column it came from.
#[derive(Debug, Clone, Copy)]
pub struct Cell<'a> {
    table: &'static str,
    line: usize,
    column: &'static str,
    text: &'a str,
}

impl<'a> Cell<'a> {
    /// A cell of `table` at 1-based `line` in `column`, holding `text` (already trimmed).
    pub fn new(table: &'static str, line: usize, column: &'static str, text: &'a str) -> Self {
        Cell {
            table,
            line,
            column,
            text,
        }
    }

    /// The text as read (possibly empty).
    pub fn text(&self) -> &'a str {
        self.text
    }

    /// An error about this cell: "line N, column C: {what}".
    pub fn error(&self, what: impl std::fmt::Display) -> Error {
        Error::Data {
            table: self.table.to_string(),
            message: format!("line {}, column {}: {what}", self.line, self.column),
        }
    }

    /// A required, non-empty text.
    pub fn required(&self) -> Result<String> {
        if self.text.is_empty() {
            Err(self.error("is empty; a value is required"))
        } else {
            Ok(self.text.to_string())
        }
    }

    /// An optional text (empty → None).
    pub fn optional(&self) -> Option<String> {
        (!self.text.is_empty()).then(|| self.text.to_string())
    }

    /// The `source` cell every row needs.
    pub fn source(&self) -> Result<String> {
        if self.text.is_empty() {
            Err(self.error("is empty; every row needs a source"))
        } else {
            Ok(self.text.to_string())
        }
    }

    /// A required integer in `range`.
    pub fn int(&self, range: RangeInclusive<i32>) -> Result<i32> {
        let v: i32 = self
            .text
            .parse()
            .map_err(|_| self.error(format!("'{}' is not an integer", self.text)))?;
        if !range.contains(&v) {
            return Err(self.error(format!(
                "{v} is outside {}..={}",
                range.start(),
                range.end()
            )));
        }
        Ok(v)
    }

    /// `any` (→ None) or an integer in `range`.
    pub fn int_or_any(&self, range: RangeInclusive<i32>) -> Result<Option<i32>> {
        if self.text == "any" {
            return Ok(None);
        }
        self.int(range.clone()).map(Some).map_err(|_| {
            self.error(format!(
                "'{}' is not 'any' or an integer in {}..={}",
                self.text,
                range.start(),
                range.end()
            ))
        })
    }

    /// A required finite number (any sign or size).
    pub fn finite(&self) -> Result<f64> {
        let v = self.parse_number()?;
        if v.is_finite() {
            Ok(v)
        } else {
            Err(self.error(format!("{v} is not a finite number")))
        }
    }

    /// A required finite number ≥ 0.
    pub fn non_negative(&self) -> Result<f64> {
        let v = self.parse_number()?;
        if v.is_finite() && v >= 0.0 {
            Ok(v)
        } else {
            Err(self.error(format!("{v} is not a finite number ≥ 0")))
        }
    }

    /// A required number in `range` (`unit` follows the range in the message, e.g. " cm⁻¹").
    pub fn number(&self, range: RangeInclusive<f64>, unit: &str) -> Result<f64> {
        self.optional_number(range, unit)?
            .ok_or_else(|| self.error("is empty; a value is required"))
    }

    /// An optional number in `range` (empty → None).
    pub fn optional_number(&self, range: RangeInclusive<f64>, unit: &str) -> Result<Option<f64>> {
        if self.text.is_empty() {
            return Ok(None);
        }
        let v = self.parse_number()?;
        if !v.is_finite() || !range.contains(&v) {
            return Err(self.error(format!(
                "{v} is outside the sensible range {}..={}{unit}",
                range.start(),
                range.end()
            )));
        }
        Ok(Some(v))
    }

    /// One of the `accepted` spellings, with the value it stands for.
    pub fn one_of<T: Copy>(&self, accepted: &[(&str, T)]) -> Result<T> {
        accepted
            .iter()
            .find(|(name, _)| *name == self.text)
            .map(|(_, v)| *v)
            .ok_or_else(|| {
                let names: Vec<&str> = accepted.iter().map(|(n, _)| *n).collect();
                self.error(format!(
                    "unknown value '{}' (accepted: {})",
                    self.text,
                    names.join(", ")
                ))
            })
    }

    fn parse_number(&self) -> Result<f64> {
        if self.text.is_empty() {
            return Err(self.error("is empty; a value is required"));
        }
        self.text
            .parse()
            .map_err(|_| self.error(format!("'{}' is not a number", self.text)))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn cell(text: &str) -> Cell<'_> {
        Cell::new("t.csv", 4, "x", text)
    }

    /// One cell check, its error as text.
    type Check = fn(Cell<'_>) -> Option<String>;

    #[test]
    fn each_check_names_table_line_and_column() {
        fn text<T>(r: Result<T>) -> Option<String> {
            r.err().map(|e| e.to_string())
        }
        // (cell text, check, a fragment of the error)
        let cases: [(&str, Check, &str); 9] = [
            (
                "abc",
                |c| text(c.number(0.0..=1.0, "")),
                "'abc' is not a number",
            ),
            (
                "2",
                |c| text(c.number(0.0..=1.0, " Å")),
                "outside the sensible range 0..=1 Å",
            ),
            ("inf", |c| text(c.finite()), "not a finite number"),
            ("-1", |c| text(c.non_negative()), "not a finite number ≥ 0"),
            ("", |c| text(c.source()), "every row needs a source"),
            ("", |c| text(c.required()), "a value is required"),
            ("9", |c| text(c.int(0..=8)), "9 is outside 0..=8"),
            (
                "z",
                |c| text(c.one_of(&[("a", 1), ("b", 2)])),
                "unknown value 'z' (accepted: a, b)",
            ),
            (
                "nine",
                |c| text(c.int_or_any(0..=8)),
                "'any' or an integer in 0..=8",
            ),
        ];
        for (value, check, needle) in cases {
            let e = check(cell(value)).unwrap_or_else(|| panic!("{value:?} passed: {needle}"));
            assert!(e.contains("t.csv") && e.contains("line 4, column x"), "{e}");
            assert!(e.contains(needle), "{e}");
        }
    }

    #[test]
    fn good_cells_pass() {
        assert_eq!(cell("").optional_number(0.0..=1.0, "").unwrap(), None);
        assert_eq!(cell("0.5").number(0.0..=1.0, "").unwrap(), 0.5);
        assert_eq!(cell("-7.5").finite().unwrap(), -7.5);
        assert_eq!(cell("any").int_or_any(0..=8).unwrap(), None);
        assert_eq!(cell("3").int_or_any(0..=8).unwrap(), Some(3));
        assert_eq!(cell("b").one_of(&[("a", 1), ("b", 2)]).unwrap(), 2);
        assert_eq!(cell("").optional(), None);
    }
}
