//! The one output layer: every report renders itself through [`Render`].
//!
//! A report is plain serialisable data; `Render` gives its forms. JSON comes from serde for
//! every report (field names are the interface), the table is each report's own, and CSV and
//! SVG exist only where a report has them (`None` otherwise). A new output format is one
//! method here (with a default: `None`, or one built from serde as JSON is), its option and
//! its arm in the command line's `emit`, and an implementation in each report that has that
//! form.

use serde::Serialize;

/// The forms of one report.
pub trait Render: Serialize {
    /// What a figure needs beyond the report's data (marks, highlighted states, column width);
    /// `()` for reports without a figure.
    type Figure;

    /// Human-readable text (tables with units in their headers; numbers rounded).
    fn table(&self) -> String;

    /// Pretty JSON (a top-level object) with a trailing newline, full precision.
    fn json(&self) -> String {
        to_json(self)
    }

    /// CSV with a header row, full precision; `None` when the report has no CSV form.
    fn csv(&self) -> Option<String> {
        None
    }

    /// A few words on what the CSV holds, for the note after writing it to a file
    /// ("12 ranked candidates"); `None`: the note names the file only.
    fn csv_summary(&self) -> Option<String> {
        None
    }

    /// An SVG figure drawn with `figure`; `None` when the report has no figure.
    fn svg(&self, _figure: &Self::Figure) -> Option<String> {
        None
    }
}

/// Pretty JSON of a serialisable value (top-level object), with a trailing newline.
pub fn to_json<T: Serialize + ?Sized>(report: &T) -> String {
    let mut s = serde_json::to_string_pretty(report).expect("reports serialise to JSON");
    s.push('\n');
    s
}

/// The JSON Schema (draft 2020-12, of the serialised form) of what a command prints with
/// `--json`: one report type, or one of several, each with the case it is printed in.
/// Descriptions are the fields' doc comments, which state units.
pub struct JsonSchema {
    generator: schemars::SchemaGenerator,
    cases: Vec<(String, schemars::Schema)>,
}

impl JsonSchema {
    pub fn new() -> Self {
        JsonSchema {
            generator: schemars::generate::SchemaSettings::draft2020_12()
                .for_serialize()
                .into_generator(),
            cases: Vec::new(),
        }
    }

    /// Adds a report type the command prints `when` (a few words, e.g. "one complex").
    pub fn case<T: schemars::JsonSchema>(mut self, when: &str) -> Self {
        let schema = self.generator.subschema_for::<T>();
        self.cases.push((when.to_string(), schema));
        self
    }

    /// The schema as a JSON value, titled `title`.
    pub fn finish(mut self, title: &str) -> serde_json::Value {
        use serde_json::{json, Value};
        let mut root = serde_json::Map::new();
        root.insert(
            "$schema".into(),
            json!("https://json-schema.org/draft/2020-12/schema"),
        );
        root.insert("title".into(), json!(title));
        let cases: Vec<Value> = self
            .cases
            .into_iter()
            .map(|(when, schema)| {
                let mut v = schema.to_value();
                if let Value::Object(m) = &mut v {
                    m.insert("description".into(), json!(when));
                }
                v
            })
            .collect();
        match <[Value; 1]>::try_from(cases) {
            Ok([one]) => {
                if let Value::Object(m) = one {
                    root.extend(m);
                }
            }
            Err(many) => {
                root.insert("oneOf".into(), Value::Array(many));
            }
        }
        let defs = self.generator.take_definitions(true);
        if !defs.is_empty() {
            root.insert("$defs".into(), Value::Object(defs));
        }
        Value::Object(root)
    }
}

impl Default for JsonSchema {
    fn default() -> Self {
        Self::new()
    }
}
