//! The one way a data table is read: [`Table`] names the file, its header and its row type, and
//! validates one row; [`Table::parse_with`] does the rest for every table (quotes checked, header
//! compared, rows numbered by their true line in the file, no rows refused).

use super::cell::Cell;
use crate::csv_input::{unclosed_message, unclosed_quote, LineIndex};
use crate::error::{Error, Result};

/// A data table of `data/*.csv`: its layout and its row validation.
pub trait Table: Sized {
    /// File name, in `data/` and in a `--data` directory.
    const FILE: &'static str;
    /// The header row: these names, in this order.
    const HEADER: &'static [&'static str];
    /// The copy embedded in the binary.
    const BUNDLED: &'static str;
    /// One validated row.
    type Row;
    /// The table the rows are checked against (the ligand table), or `()`.
    type Context: ?Sized;

    /// Reads and validates one row; `rows` are the rows before it (for uniqueness checks).
    fn row(record: &Record<'_>, context: &Self::Context, rows: &[Self::Row]) -> Result<Self::Row>;

    /// The table from its validated rows, in file order.
    fn from_rows(rows: Vec<Self::Row>) -> Self;

    /// Parses and validates CSV text, checking the rows against `context`.
    fn parse_with(text: &str, context: &Self::Context) -> Result<Self> {
        let mut rows = Vec::new();
        for_each_record(Self::FILE, Self::HEADER, text, |record| {
            let row = Self::row(&record, context, &rows)?;
            rows.push(row);
            Ok(())
        })?;
        Ok(Self::from_rows(rows))
    }

    /// Parses and validates the CSV text of a table that depends on no other table.
    fn parse(text: &str) -> Result<Self>
    where
        Self: Table<Context = ()>,
    {
        Self::parse_with(text, &())
    }
}

/// One record of a table, with its line in the file.
pub struct Record<'a> {
    table: &'static str,
    header: &'static [&'static str],
    line: usize,
    fields: &'a csv::StringRecord,
}

impl<'a> Record<'a> {
    /// The 1-based line of the record in the file.
    pub fn line(&self) -> usize {
        self.line
    }

    /// The cell in `column` (a name of the table's header).
    pub fn cell(&self, column: &'static str) -> Cell<'a> {
        let idx = self
            .header
            .iter()
            .position(|h| *h == column)
            .expect("column names come from the table's HEADER");
        Cell::new(
            self.table,
            self.line,
            column,
            self.fields.get(idx).unwrap_or(""),
        )
    }
}

fn table_error(table: &str, message: String) -> Error {
    Error::Data {
        table: table.to_string(),
        message,
    }
}

/// Calls `each` on every record of a CSV text whose header must be `header`; a quote never
/// closed, a bad header, a malformed record and a table without rows are errors.
fn for_each_record(
    table: &'static str,
    header: &'static [&'static str],
    text: &str,
    mut each: impl FnMut(Record<'_>) -> Result<()>,
) -> Result<()> {
    if let Some(line) = unclosed_quote(text, None) {
        return Err(table_error(table, unclosed_message(line)));
    }
    let mut reader = csv::ReaderBuilder::new()
        .has_headers(true)
        .trim(csv::Trim::All)
        .from_reader(text.as_bytes());
    let found = reader
        .headers()
        .map_err(|e| table_error(table, format!("bad header: {e}")))?
        .clone();
    let found: Vec<&str> = found.iter().collect();
    if found != header {
        return Err(table_error(
            table,
            format!(
                "header must be '{}', found '{}'",
                header.join(","),
                found.join(",")
            ),
        ));
    }
    let lines = LineIndex::new(text, None);
    let line_of = |p: Option<&csv::Position>| p.map_or(0, |p| lines.line_of(p.byte()));
    let mut count = 0;
    for fields in reader.records() {
        let fields = fields.map_err(|e| {
            let line = line_of(e.position());
            table_error(table, format!("line {line}: {e}"))
        })?;
        count += 1;
        each(Record {
            table,
            header,
            line: line_of(fields.position()),
            fields: &fields,
        })?;
    }
    if count == 0 {
        return Err(table_error(table, "has no rows".into()));
    }
    Ok(())
}
