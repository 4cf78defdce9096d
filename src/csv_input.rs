//! Checks shared by every CSV reader: a quoted field that is never closed.
//!
//! The `csv` crate reads an unclosed quote to the end of the input as one field, so the rows
//! after it would vanish without a word. [`QuoteScanner`] follows the quoting of RFC 4180
//! (a field is quoted when its first character is `"`; inside it `""` is a literal quote)
//! byte by byte, so that a reader can say at which line the unclosed quote opens.

/// Follows the quote state of CSV bytes fed in order.
#[derive(Debug, Clone)]
pub struct QuoteScanner {
    comment: Option<u8>,
    line: usize,
    /// Inside a quoted field.
    quoted: bool,
    /// A `"` just ended a quoted field (or is the first of a `""` pair).
    closing: bool,
    /// The next byte starts a field.
    field_start: bool,
    /// Inside a comment line.
    in_comment: bool,
    /// Line at which the open quoted field started.
    opened_at: usize,
    /// The next byte is the first of its line.
    line_start: bool,
}

impl QuoteScanner {
    /// A scanner at the start of the input; `comment` is the comment byte of the reader (lines
    /// that start with it are skipped), if any.
    pub fn new(comment: Option<u8>) -> Self {
        QuoteScanner {
            comment,
            line: 1,
            quoted: false,
            closing: false,
            field_start: true,
            in_comment: false,
            opened_at: 0,
            line_start: true,
        }
    }

    /// Feeds the next bytes.
    pub fn feed(&mut self, bytes: &[u8]) {
        for &b in bytes {
            self.byte(b);
        }
    }

    fn byte(&mut self, b: u8) {
        let line_start = std::mem::replace(&mut self.line_start, b == b'\n');
        if self.in_comment {
            if b == b'\n' {
                self.in_comment = false;
                self.field_start = true;
                self.line += 1;
            }
            return;
        }
        if self.closing {
            self.closing = false;
            if b == b'"' {
                // `""` inside a quoted field: a literal quote, still quoted.
                self.quoted = true;
                return;
            }
        }
        if self.quoted {
            match b {
                b'"' => {
                    self.quoted = false;
                    self.closing = true;
                }
                b'\n' => self.line += 1,
                _ => {}
            }
            return;
        }
        match b {
            b'\n' => {
                self.line += 1;
                self.field_start = true;
            }
            b',' => self.field_start = true,
            b'"' if self.field_start => {
                self.quoted = true;
                self.opened_at = self.line;
                self.field_start = false;
            }
            b' ' | b'\t' | b'\r' if self.field_start => {}
            _ => {
                if line_start && Some(b) == self.comment {
                    self.in_comment = true;
                }
                self.field_start = false;
            }
        }
    }

    /// The line at which a quoted field opened that is still open, if any (call at the end).
    pub fn unclosed(&self) -> Option<usize> {
        self.quoted.then_some(self.opened_at)
    }
}

/// The line of an unclosed quote in a whole CSV text, if any.
pub fn unclosed_quote(text: &str, comment: Option<u8>) -> Option<usize> {
    if comment.is_none() {
        return unclosed_quote_uncommented(text.as_bytes());
    }
    let mut s = QuoteScanner::new(comment);
    s.feed(text.as_bytes());
    s.unclosed()
}

/// [`unclosed_quote`] without comment lines, jumping from one `"` to the next: the quote state
/// changes only at a `"`, and a `"` opens a field when the last byte before it other than blanks
/// (space, tab, CR) is a comma, a line end or the start of the text. Same answers as the
/// byte-by-byte [`QuoteScanner`], which the tests check on random texts.
fn unclosed_quote_uncommented(bytes: &[u8]) -> Option<usize> {
    let next_quote = |from: usize| {
        bytes[from..]
            .iter()
            .position(|&b| b == b'"')
            .map(|p| p + from)
    };
    let mut at = 0;
    while let Some(q) = next_quote(at) {
        let before = bytes[..q]
            .iter()
            .rev()
            .find(|&&b| !matches!(b, b' ' | b'\t' | b'\r'));
        if !matches!(before, None | Some(b',') | Some(b'\n')) {
            at = q + 1; // a literal quote inside an unquoted field
            continue;
        }
        // A quoted field opens at q: find its closing quote, stepping over "" pairs.
        let mut k = q + 1;
        loop {
            match next_quote(k) {
                None => {
                    let line = 1 + bytes[..q].iter().filter(|&&b| b == b'\n').count();
                    return Some(line);
                }
                Some(c) if bytes.get(c + 1) == Some(&b'"') => k = c + 2,
                Some(c) => {
                    at = c + 1;
                    break;
                }
            }
        }
    }
    None
}

/// The message for an unclosed quote opened at `line`.
pub fn unclosed_message(line: usize) -> String {
    format!(
        "line {line} opens a quoted field (\") that is never closed, so the rows after it cannot be read; close the quote or remove it"
    )
}

/// True line numbers of CSV records held in memory. The `csv` crate's own line count is one
/// short after each CRLF line end, and a record's byte position can point at the blank lines
/// skipped before it; this index maps a record's byte position to the first non-blank line at
/// or after it.
#[derive(Debug, Clone)]
pub struct LineIndex {
    /// (byte offset, 1-based line) of every line that holds more than a line end.
    starts: Vec<(u64, usize)>,
    lines: usize,
}

impl LineIndex {
    /// The index of `text`; lines that start with `comment` (when given) are skipped like
    /// blank ones.
    pub fn new(text: &str, comment: Option<u8>) -> Self {
        let mut starts = Vec::new();
        let mut offset = 0u64;
        let mut lines = 0;
        for (i, line) in text.split('\n').enumerate() {
            lines = i + 1;
            let is_comment = comment.is_some_and(|c| line.as_bytes().first() == Some(&c));
            if !line.trim_end_matches('\r').is_empty() && !is_comment {
                starts.push((offset, i + 1));
            }
            offset += line.len() as u64 + 1;
        }
        LineIndex { starts, lines }
    }

    /// The line of a record that starts at byte `offset`.
    pub fn line_of(&self, offset: u64) -> usize {
        let i = self.starts.partition_point(|&(o, _)| o < offset);
        self.starts.get(i).map_or(self.lines, |&(_, l)| l)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn closed_quotes_and_escaped_quotes_pass() {
        assert_eq!(
            unclosed_quote("a,b\n\"x, y\",2\n\"say \"\"hi\"\"\",3\n", None),
            None
        );
        // A quote inside an unquoted field is literal (RFC 4180 leaves it to the reader; the
        // csv crate keeps it).
        assert_eq!(unclosed_quote("a,b\n5\" tall,2\n", None), None);
        // A multi-line quoted field is legal.
        assert_eq!(unclosed_quote("a,b\n\"one\ntwo\",2\n", None), None);
    }

    proptest::proptest! {
        /// The quote-to-quote scan agrees with the byte-by-byte scanner (RFC 4180 quoting,
        /// common practice) on random texts made of the bytes that matter.
        #[test]
        fn quote_jumps_agree_with_the_byte_scanner(
            text in proptest::collection::vec(
                proptest::sample::select(vec![b'a', b',', b'"', b'\n', b' ', b'\r', b'\t']),
                0..80,
            )
        ) {
            let mut s = QuoteScanner::new(None);
            s.feed(&text);
            proptest::prop_assert_eq!(unclosed_quote_uncommented(&text), s.unclosed());
        }
    }

    #[test]
    fn an_unclosed_quote_names_its_line() {
        assert_eq!(
            unclosed_quote("a,b\r\n1,2\r\n\"open,3\r\n4,5\r\n", None),
            Some(3)
        );
        assert_eq!(unclosed_quote("a,b\n1, \"x\n", None), Some(2));
    }

    #[test]
    fn line_index_counts_crlf_and_skips_blank_lines() {
        let text = "a,b\r\n1,2\r\n\r\n3,4\r\n";
        let idx = LineIndex::new(text, None);
        assert_eq!(idx.line_of(0), 1);
        assert_eq!(idx.line_of(5), 2);
        // A position at the blank line belongs to the record after it.
        assert_eq!(idx.line_of(10), 4);
    }

    #[test]
    fn comment_lines_are_skipped() {
        assert_eq!(unclosed_quote("a,b\n# a,\"note\n1,2\n", Some(b'#')), None);
        assert_eq!(unclosed_quote("a,b\n# a,\"note\n1,2\n", None), Some(2));
    }
}
