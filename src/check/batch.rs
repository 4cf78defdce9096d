//! Batch input for `check`: one sample per CSV row. This module alone knows the layout.
//!
//! Required columns: `name`, `metal`, `ox`, `geometry`, `ligands` ("NCS:2 py:4": NAME[:COUNT]
//! separated by spaces or `;`). Optional columns (empty cell = not measured):
//! - `delta`, `b`, `c`: measured ligand-field parameters (cm⁻¹);
//! - Evans: `evans_shift_ppm`, or `evans_shift_hz` with `evans_freq_mhz`; `evans_shift_err` (same
//!   unit), `evans_conc` and `evans_conc_err` (mol/L), `evans_temp` (K), `evans_magnet`
//!   (`solenoid`, the default, or `transverse`);
//! - magnetometer: one of `mu_eff` (μB), `chi_m` (cm³/mol, before the diamagnetic correction),
//!   `chi_m_t` (cm³ K/mol, corrected); `moment_err` (same unit), `moment_temp` (K);
//! - `dia`: diamagnetic correction χ_D (cm³/mol, ≤ 0) for the Evans and magnetometer values;
//! - bands: `bands` (maxima in cm⁻¹ separated by spaces or `;`), `band_window` (nm, e.g.
//!   `350-1100`; default 200-1100), `band_resolution` (cm⁻¹, default 1500), `band_temp` (K);
//! - structure: `bond_length` (mean metal–donor distance, Å), `bond_length_err` (Å),
//!   `structure_temp` (K);
//! - `chit_file`: a χ_M·T(T) CSV file (the `sco-fit` layout), read by the caller relative to
//!   the batch file ([`Sample::chit_file`]);
//! - `note`: free text, not used.
//! - `source`: where the row's data come from (free text, not used).
//!
//! Any other column is an error (a misspelt column must not be dropped silently).

use super::{
    BandInput, BondLengthInput, CheckError, CheckInput, EvidenceKind, MomentInput, MomentQuantity,
    Part,
};
use crate::complex::{ComplexSpec, LigandCount, Overrides};
use crate::engine::Geometry;
use crate::error::{closest_names, Error, NameKind, Result};
use crate::measured::evans::{EvansInput, MagnetGeometry, Shift, SolventTerms};
use crate::measured::Measured;
use crate::param::Param;
use crate::spectra::count::{DEFAULT_RESOLUTION, DEFAULT_WINDOW_NM};

/// Columns every file needs.
pub const REQUIRED: &[&str] = &["name", "metal", "ox", "geometry", "ligands"];
/// Columns a file may have.
pub const OPTIONAL: &[&str] = &[
    "delta",
    "b",
    "c",
    "evans_shift_ppm",
    "evans_shift_hz",
    "evans_freq_mhz",
    "evans_shift_err",
    "evans_conc",
    "evans_conc_err",
    "evans_temp",
    "evans_magnet",
    "mu_eff",
    "chi_m",
    "chi_m_t",
    "moment_err",
    "moment_temp",
    "dia",
    "bands",
    "band_window",
    "band_resolution",
    "band_temp",
    "bond_length",
    "bond_length_err",
    "structure_temp",
    "chit_file",
    "note",
    "source",
];

/// The kinds of evidence a batch row can carry, in the order of the batch report's columns
/// (a row has no structure file, so no structure field). A new kind a row can carry is added
/// here beside its columns in [`OPTIONAL`].
pub const BATCH_KINDS: &[EvidenceKind] = &[
    EvidenceKind::Prediction,
    EvidenceKind::Evans,
    EvidenceKind::Moment,
    EvidenceKind::Bands,
    EvidenceKind::BondLength,
    EvidenceKind::Curve,
];

/// One good row.
#[derive(Debug, Clone, PartialEq)]
pub struct Sample {
    /// Line of the file (the header is line 1).
    pub row: usize,
    pub name: String,
    pub input: CheckInput,
    /// The `chit_file` cell: a χ_M·T(T) file for the caller to read into `input.curve` (this
    /// module does no IO).
    pub chit_file: Option<String>,
}

/// A bad row: where, and what is wrong.
#[derive(Debug, Clone, PartialEq)]
pub struct RowError {
    /// Line of the file (the header is line 1).
    pub row: usize,
    /// Sample name, when the row has one.
    pub name: Option<String>,
    /// Column(s) at fault.
    pub column: String,
    pub message: String,
}

impl std::fmt::Display for RowError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "row {}", self.row)?;
        if let Some(n) = &self.name {
            write!(f, " ({n})")?;
        }
        write!(f, ", column {}: {}", self.column, self.message)
    }
}

/// Longest line accepted in a batch file (bytes). A file without line breaks (a binary file,
/// `/dev/zero`) is refused at this point instead of being read into memory whole.
pub const MAX_LINE_BYTES: usize = 1 << 20;

/// Parses a batch file held in memory. File-level problems (empty, no header, missing or
/// unknown columns, no rows) are an `Err`; each row is then a [`Sample`] or a [`RowError`], in
/// file order. Large files are better read with [`BatchReader`], which holds one row at a time.
pub fn parse(text: &str) -> Result<Vec<std::result::Result<Sample, RowError>>> {
    let mut reader = BatchReader::new(text.as_bytes())?;
    let mut out = Vec::new();
    for row in reader.by_ref() {
        out.push(row);
    }
    reader.finish()?;
    Ok(out)
}

/// Reads `R` but fails once a line grows beyond [`MAX_LINE_BYTES`]; it also notes where each
/// non-empty line starts, so that rows get their true line numbers whatever the line ending and
/// however many blank lines come before them (the CSV reader's own count is one short after
/// CRLF line ends, and its record positions include the blank lines it skipped).
struct LineLimited<R> {
    inner: R,
    line_bytes: usize,
    /// Bytes read so far.
    read: u64,
    /// Line number of the byte being read (1-based).
    line: usize,
    /// The byte being read is the first of its line.
    at_line_start: bool,
    /// (offset, line) of non-empty line starts not yet passed by a row.
    starts: std::collections::VecDeque<(u64, usize)>,
    /// Quote state, so that a quote left open is an error rather than the end of the rows.
    quotes: crate::csv_input::QuoteScanner,
}

impl<R> LineLimited<R> {
    fn new(inner: R) -> Self {
        LineLimited {
            inner,
            line_bytes: 0,
            read: 0,
            line: 1,
            at_line_start: true,
            starts: std::collections::VecDeque::new(),
            quotes: crate::csv_input::QuoteScanner::new(None),
        }
    }

    /// Line number of the first non-empty line at or after byte `offset` (a record's start);
    /// offsets must be asked in increasing order.
    fn line_of(&mut self, offset: u64) -> usize {
        while self.starts.front().is_some_and(|&(o, _)| o < offset) {
            self.starts.pop_front();
        }
        self.starts.front().map_or(self.line, |&(_, l)| l)
    }
}

impl<R: std::io::Read> std::io::Read for LineLimited<R> {
    fn read(&mut self, buf: &mut [u8]) -> std::io::Result<usize> {
        let n = self.inner.read(buf)?;
        if n == 0 && !buf.is_empty() {
            if let Some(line) = self.quotes.unclosed() {
                return Err(std::io::Error::new(
                    std::io::ErrorKind::InvalidData,
                    crate::csv_input::unclosed_message(line),
                ));
            }
        }
        self.quotes.feed(&buf[..n]);
        for (i, &b) in buf[..n].iter().enumerate() {
            match b {
                b'\n' => {
                    self.line += 1;
                    self.at_line_start = true;
                    self.line_bytes = 0;
                    continue;
                }
                b'\r' => {}
                _ => {
                    if self.at_line_start {
                        self.starts.push_back((self.read + i as u64, self.line));
                    }
                    self.at_line_start = false;
                }
            }
            self.line_bytes += 1;
            if self.line_bytes > MAX_LINE_BYTES {
                return Err(std::io::Error::new(
                    std::io::ErrorKind::InvalidData,
                    format!("a line longer than {MAX_LINE_BYTES} bytes (not a CSV text file?)"),
                ));
            }
        }
        self.read += n as u64;
        Ok(n)
    }
}

/// A batch file read row by row: the header is checked by [`BatchReader::new`], then each
/// iteration yields one row as a [`Sample`] or a [`RowError`], in file order, holding only that
/// row in memory. Call [`BatchReader::finish`] after the last row: it reports a file without
/// rows or one that could not be read to its end.
pub struct BatchReader<R> {
    reader: csv::Reader<LineLimited<R>>,
    header: Vec<String>,
    record: csv::StringRecord,
    rows: usize,
    fatal: Option<Error>,
}

impl<R: std::io::Read> BatchReader<R> {
    /// Reads and checks the header.
    pub fn new(input: R) -> Result<Self> {
        let accepted = || {
            format!(
                "a CSV file whose first line names the columns; required: {}",
                REQUIRED.join(",")
            )
        };
        let mut reader = csv::ReaderBuilder::new()
            .has_headers(true)
            .flexible(true)
            .trim(csv::Trim::All)
            .from_reader(LineLimited::new(input));
        let header: Vec<String> = reader
            .headers()
            .map_err(|e| Error::Parse(format!("input file: the header cannot be read: {e}")))?
            .iter()
            .map(|h| h.to_lowercase())
            .collect();
        if header.iter().all(String::is_empty) {
            return Err(Error::invalid(Param::InputFile, "empty", accepted()));
        }
        let known: Vec<&str> = REQUIRED.iter().chain(OPTIONAL.iter()).copied().collect();
        for (i, h) in header.iter().enumerate() {
            if !known.contains(&h.as_str()) {
                let near = closest_names(h, known.iter().copied());
                return Err(Error::Unknown {
                    kind: NameKind::Column {
                        position: i + 1,
                        accepted: format!("{}, {}", REQUIRED.join(", "), OPTIONAL.join(", ")),
                    },
                    name: h.clone(),
                    suggestions: near,
                });
            }
            if header[..i].contains(h) {
                return Err(Error::invalid(
                    Param::Column,
                    format!("'{h}' twice"),
                    "each column once",
                ));
            }
        }
        let missing: Vec<&str> = REQUIRED
            .iter()
            .copied()
            .filter(|r| !header.iter().any(|h| h == r))
            .collect();
        if !missing.is_empty() {
            return Err(Error::invalid(
                Param::InputFile,
                format!("missing column(s) {}", missing.join(", ")),
                accepted(),
            ));
        }
        Ok(BatchReader {
            reader,
            header,
            record: csv::StringRecord::new(),
            rows: 0,
            fatal: None,
        })
    }

    /// File-level problems found while reading the rows: no rows at all, or a read that could
    /// not continue (the rows before it were yielded).
    pub fn finish(self) -> Result<()> {
        if let Some(e) = self.fatal {
            return Err(e);
        }
        if self.rows == 0 {
            return Err(Error::invalid(
                Param::InputFile,
                "a header without rows",
                "one sample per row below the header",
            ));
        }
        Ok(())
    }
}

impl<R: std::io::Read> BatchReader<R> {
    /// The true line number of a record starting at byte `offset` (0 when unknown).
    fn line_at(&mut self, offset: Option<u64>) -> usize {
        offset.map_or(0, |b| self.reader.get_mut().line_of(b))
    }
}

impl<R: std::io::Read> Iterator for BatchReader<R> {
    type Item = std::result::Result<Sample, RowError>;

    fn next(&mut self) -> Option<Self::Item> {
        if self.fatal.is_some() {
            return None;
        }
        loop {
            match self.reader.read_record(&mut self.record) {
                Ok(false) => return None,
                Ok(true) => {
                    let row = self.line_at(self.record.position().map(|p| p.byte()));
                    if self.record.iter().all(str::is_empty) {
                        continue; // a blank line
                    }
                    self.rows += 1;
                    // A message quotes cells, which a quoted field can fill with line breaks.
                    return Some(parse_row(row, &self.header, &self.record).map_err(|mut e| {
                        e.message = crate::error::one_line(&e.message).into_owned();
                        e
                    }));
                }
                Err(e) => {
                    let row = self.line_at(e.position().map(|p| p.byte()));
                    if let csv::ErrorKind::Io(io) = e.kind() {
                        // The reader cannot go on: stop and report it from `finish`.
                        self.fatal = Some(Error::Parse(format!(
                            "input file: reading stopped after {} row(s): {io}",
                            self.rows
                        )));
                        return None;
                    }
                    self.rows += 1;
                    return Some(Err(RowError {
                        row,
                        name: None,
                        column: "(whole row)".into(),
                        message: format!("cannot be read: {e}"),
                    }));
                }
            }
        }
    }
}

struct Row<'a> {
    row: usize,
    name: Option<String>,
    header: &'a [String],
    record: &'a csv::StringRecord,
}

impl Row<'_> {
    fn cell(&self, column: &str) -> Option<&str> {
        let i = self.header.iter().position(|h| h == column)?;
        self.record.get(i).filter(|s| !s.is_empty())
    }

    fn error(&self, column: &str, message: impl Into<String>) -> RowError {
        RowError {
            row: self.row,
            name: self.name.clone(),
            column: column.into(),
            message: message.into(),
        }
    }

    fn text(&self, column: &str) -> std::result::Result<&str, RowError> {
        self.cell(column)
            .ok_or_else(|| self.error(column, "is missing; a value is required"))
    }

    fn number(&self, column: &str, unit: &str) -> std::result::Result<Option<f64>, RowError> {
        match self.cell(column) {
            None => Ok(None),
            Some(t) => t
                .parse::<f64>()
                .ok()
                .filter(|x| x.is_finite())
                .map(Some)
                .ok_or_else(|| self.error(column, format!("'{t}' is not a number ({unit})"))),
        }
    }

    fn positive(&self, column: &str, unit: &str) -> std::result::Result<Option<f64>, RowError> {
        match self.number(column, unit)? {
            Some(x) if x <= 0.0 => Err(self.error(column, format!("{x} must be > 0 {unit}"))),
            v => Ok(v),
        }
    }

    fn err(&self, column: &str, unit: &str) -> std::result::Result<f64, RowError> {
        match self.number(column, unit)? {
            Some(x) if x < 0.0 => Err(self.error(column, format!("{x} must be ≥ 0 {unit}"))),
            v => Ok(v.unwrap_or(0.0)),
        }
    }

    fn needs(&self, column: &str, by: &str, unit: &str) -> std::result::Result<f64, RowError> {
        self.positive(column, unit)?
            .ok_or_else(|| self.error(column, format!("is missing; {by} needs it ({unit})")))
    }
}

fn parse_row(
    row: usize,
    header: &[String],
    record: &csv::StringRecord,
) -> std::result::Result<Sample, RowError> {
    let mut r = Row {
        row,
        name: None,
        header,
        record,
    };
    r.name = r.cell("name").map(str::to_string);
    if record.len() != header.len() {
        return Err(r.error(
            "(whole row)",
            format!(
                "has {} cells; the header has {}",
                record.len(),
                header.len()
            ),
        ));
    }
    let name = r.text("name")?.to_string();
    let metal = r.text("metal")?.to_string();
    let ox_text = r.text("ox")?;
    let oxidation_state: i32 = ox_text.parse().map_err(|_| {
        r.error(
            "ox",
            format!("'{ox_text}' is not an integer oxidation state"),
        )
    })?;
    let geometry: Geometry = r
        .text("geometry")?
        .parse()
        .map_err(|e: Error| r.error("geometry", e.to_string()))?;
    let ligands = r
        .text("ligands")?
        .split(|c: char| c.is_whitespace() || c == ';')
        .filter(|s| !s.is_empty())
        .map(|s| s.parse::<LigandCount>())
        .collect::<Result<Vec<_>>>()
        .map_err(|e| r.error("ligands", format!("{e} (write e.g. \"NCS:2 py:4\")")))?;
    let overrides = Overrides {
        delta: r.positive("delta", "cm⁻¹")?,
        b: r.positive("b", "cm⁻¹")?,
        c: r.positive("c", "cm⁻¹")?,
    };
    let dia_value = r.number("dia", "cm³/mol")?.unwrap_or(0.0);
    if dia_value > 0.0 {
        return Err(r.error(
            "dia",
            format!("{dia_value} must be ≤ 0 cm³/mol: diamagnetic corrections are negative"),
        ));
    }
    let dia = Measured::exact(dia_value);

    // Evans
    let ppm = r.number("evans_shift_ppm", "ppm")?;
    let hz = r.number("evans_shift_hz", "Hz")?;
    let shift_err = r.err("evans_shift_err", "in the unit of the shift")?;
    let shift = match (ppm, hz) {
        (None, None) => {
            for c in ["evans_freq_mhz", "evans_conc", "evans_temp", "evans_magnet"] {
                if r.cell(c).is_some() {
                    return Err(r.error(c, "is given without evans_shift_ppm or evans_shift_hz"));
                }
            }
            None
        }
        (Some(_), Some(_)) => {
            return Err(r.error(
                "evans_shift_ppm, evans_shift_hz",
                "give the shift in ppm or in Hz, not both",
            ))
        }
        (Some(p), None) => Some(Shift::Ppm(Measured {
            value: p,
            err: shift_err,
        })),
        (None, Some(h)) => Some(Shift::Hertz {
            shift: Measured {
                value: h,
                err: shift_err,
            },
            freq_mhz: r.needs("evans_freq_mhz", "evans_shift_hz", "MHz")?,
        }),
    };
    let evans = match shift {
        None => None,
        Some(shift) => {
            let magnet: MagnetGeometry = match r.cell("evans_magnet") {
                None => MagnetGeometry::Solenoid,
                Some(m) => m
                    .parse()
                    .map_err(|e: Error| r.error("evans_magnet", e.to_string()))?,
            };
            Some(EvansInput {
                shift,
                magnet,
                concentration: Measured {
                    value: r.needs("evans_conc", "an Evans shift", "mol/L")?,
                    err: r.err("evans_conc_err", "mol/L")?,
                },
                molar_mass: None,
                solvent: SolventTerms::default(),
                temperature: Measured::exact(r.needs("evans_temp", "an Evans shift", "K")?),
                dia,
            })
        }
    };

    // Magnetometer
    let given: Vec<(&str, MomentQuantity)> = [
        ("mu_eff", MomentQuantity::MuEff),
        ("chi_m", MomentQuantity::ChiM),
        ("chi_m_t", MomentQuantity::ChiMT),
    ]
    .into_iter()
    .filter(|(c, _)| r.cell(c).is_some())
    .collect();
    let moment = match given.as_slice() {
        [] => {
            if r.cell("moment_temp").is_some() {
                return Err(r.error("moment_temp", "is given without mu_eff, chi_m or chi_m_t"));
            }
            None
        }
        [(column, quantity)] => {
            let unit = match quantity {
                MomentQuantity::MuEff => "μB",
                MomentQuantity::ChiM => "cm³/mol",
                MomentQuantity::ChiMT => "cm³ K/mol",
            };
            let value = r.number(column, unit)?.unwrap_or_default();
            Some(MomentInput {
                quantity: *quantity,
                value: Measured {
                    value,
                    err: r.err("moment_err", unit)?,
                },
                temperature: r.needs("moment_temp", column, "K")?,
                dia,
            })
        }
        _ => {
            let cols: Vec<&str> = given.iter().map(|(c, _)| *c).collect();
            return Err(r.error(
                &cols.join(", "),
                "give one magnetometer quantity per row (mu_eff, chi_m or chi_m_t)",
            ));
        }
    };

    // Bands
    let bands = match r.cell("bands") {
        None => {
            for c in ["band_window", "band_resolution", "band_temp"] {
                if r.cell(c).is_some() {
                    return Err(r.error(c, "is given without bands"));
                }
            }
            None
        }
        Some(text) => {
            let maxima = text
                .split(|c: char| c.is_whitespace() || c == ';')
                .filter(|s| !s.is_empty())
                .map(|s| {
                    s.parse::<f64>()
                        .ok()
                        .filter(|x| x.is_finite() && *x > 0.0)
                        .ok_or_else(|| {
                            r.error(
                                "bands",
                                format!("'{s}' is not a band maximum in cm⁻¹ (write e.g. \"11800 17200\")"),
                            )
                        })
                })
                .collect::<std::result::Result<Vec<f64>, RowError>>()?;
            let window_nm = match r.cell("band_window") {
                None => DEFAULT_WINDOW_NM,
                Some(w) => parse_window(w).ok_or_else(|| {
                    r.error(
                        "band_window",
                        format!("'{w}' is not a wavelength range: two numbers in nm, shortest first, e.g. 350-1100"),
                    )
                })?,
            };
            let resolution = match r.number("band_resolution", "cm⁻¹")? {
                None => DEFAULT_RESOLUTION,
                Some(x) if x >= 0.0 => x,
                Some(x) => return Err(r.error("band_resolution", format!("{x} must be ≥ 0 cm⁻¹"))),
            };
            Some(BandInput {
                maxima,
                window_nm,
                resolution,
                temperature: r.positive("band_temp", "K")?,
            })
        }
    };

    // Structure
    let bond_length = match r.number("bond_length", "Å")? {
        None => {
            for c in ["bond_length_err", "structure_temp"] {
                if r.cell(c).is_some() {
                    return Err(r.error(c, "is given without bond_length"));
                }
            }
            None
        }
        Some(x) => Some(BondLengthInput {
            mean: Measured {
                value: x,
                err: r.err("bond_length_err", "Å")?,
            },
            temperature: r.positive("structure_temp", "K")?,
        }),
    };

    let chit_file = r.cell("chit_file").map(str::to_string);
    Ok(Sample {
        row,
        name,
        chit_file,
        input: CheckInput {
            complex: ComplexSpec {
                metal,
                oxidation_state,
                geometry,
                ligands,
                overrides,
            },
            evans,
            moment,
            bands,
            bond_length,
            curve: None,
            structure: None,
        },
    })
}

/// One sample from (column, value) pairs in the batch layout, e.g. from command-line options
/// named after the columns. The same checks as a file row; `row` of errors is 0.
pub fn from_fields(fields: &[(&str, String)]) -> std::result::Result<Sample, RowError> {
    let known: Vec<&str> = REQUIRED.iter().chain(OPTIONAL.iter()).copied().collect();
    let header: Vec<String> = fields.iter().map(|(c, _)| c.to_string()).collect();
    for c in &header {
        if !known.contains(&c.as_str()) {
            return Err(RowError {
                row: 0,
                name: None,
                column: c.clone(),
                message: "is not a column of the batch layout".into(),
            });
        }
    }
    let record = csv::StringRecord::from(fields.iter().map(|(_, v)| v.trim()).collect::<Vec<_>>());
    parse_row(0, &header, &record)
}

/// "350-1100" or "350,1100" (nm) → (350, 1100).
pub fn parse_window(s: &str) -> Option<(f64, f64)> {
    let parts: Vec<&str> = s.split(['-', ',']).map(str::trim).collect();
    let [lo, hi] = parts.as_slice() else {
        return None;
    };
    let lo: f64 = lo.parse().ok()?;
    let hi: f64 = hi.parse().ok()?;
    (lo.is_finite() && hi.is_finite() && lo > 0.0 && hi > lo).then_some((lo, hi))
}

/// The batch column(s) a [`CheckError`] concerns.
pub fn columns_of(e: &CheckError) -> String {
    match e.part {
        Part::Complex => complex_column(&e.error).to_string(),
        Part::Evans => match e.error.param() {
            Some(Param::Shift) => "evans_shift_ppm, evans_shift_hz".into(),
            Some(Param::SpectrometerFrequency) => "evans_freq_mhz".into(),
            Some(Param::Concentration) => "evans_conc".into(),
            Some(Param::Temperature) => "evans_temp".into(),
            _ => "evans_shift_ppm, evans_shift_hz, evans_conc, evans_temp".into(),
        },
        Part::Moment => match e.error.param() {
            Some(Param::Temperature) => "moment_temp".into(),
            _ => "mu_eff, chi_m, chi_m_t".into(),
        },
        Part::Bands => "bands".into(),
        Part::BondLength => "bond_length".into(),
        Part::Curve => "chit_file".into(),
        Part::Structure => "structure".into(),
    }
}

/// The batch column that sets `param` in `part` of a sample, when one does: how a caller names
/// what an error [`needs`](Error::InvalidParameter).
pub fn column_of(part: Part, param: &Param) -> Option<&'static str> {
    Some(match (part, param) {
        (_, Param::Delta) => "delta",
        (_, Param::RacahB) => "b",
        (_, Param::RacahC) => "c",
        (_, Param::Dia) => "dia",
        (_, Param::Magnet) => "evans_magnet",
        (_, Param::SpectrometerFrequency) => "evans_freq_mhz",
        (_, Param::Concentration) => "evans_conc",
        (_, Param::ChiMT) => "chi_m_t",
        (_, Param::MuEff) => "mu_eff",
        (_, Param::ChiM) => "chi_m",
        (_, Param::BondLength) => "bond_length",
        (Part::Evans, Param::Temperature) => "evans_temp",
        (Part::Moment, Param::Temperature) => "moment_temp",
        (Part::Bands, Param::Temperature) => "band_temp",
        (Part::BondLength | Part::Structure, Param::Temperature) => "structure_temp",
        _ => return None,
    })
}

fn complex_column(e: &Error) -> &'static str {
    match e {
        Error::Unknown {
            kind: NameKind::Metal | NameKind::MetalLabel { .. },
            ..
        } => "metal",
        Error::Unknown {
            kind: NameKind::Ligand,
            ..
        } => "ligands",
        Error::InvalidParameter { param, .. } => match param {
            Param::OxidationState(_) => "ox",
            Param::Delta => "delta",
            Param::RacahB => "b",
            Param::RacahC => "c",
            Param::Ligand
            | Param::NamedLigand(_)
            | Param::LigandCount
            | Param::Ligands
            | Param::DonorAtomCount
            | Param::DonorSet
            | Param::DonorAssignment
            | Param::RequiredLigand
            | Param::LigandFilter => "ligands",
            Param::Geometry => "geometry",
            _ => "metal, ox, geometry, ligands",
        },
        _ => "metal, ox, geometry, ligands",
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const HEAD: &str = "name,metal,ox,geometry,ligands";

    #[test]
    fn good_and_bad_rows_are_kept_in_order() {
        let text = format!(
            "{HEAD},mu_eff,moment_temp,bond_length\nA,Fe,2,oct,NCS:2 py:4,5.3,298,2.18\nB,Fe,2,oct,py:6,abc,298,\nC,Co,2,oct,H2O:6,,,\n"
        );
        let rows = parse(&text).unwrap();
        assert_eq!(rows.len(), 3);
        let a = rows[0].as_ref().unwrap();
        assert_eq!((a.row, a.name.as_str()), (2, "A"));
        assert_eq!(a.input.complex.ligands.len(), 2);
        assert!(a.input.moment.is_some() && a.input.bond_length.is_some());
        let b = rows[1].as_ref().unwrap_err();
        assert_eq!((b.row, b.column.as_str()), (3, "mu_eff"));
        assert!(b.to_string().contains("row 3 (B), column mu_eff"), "{b}");
        assert!(rows[2].is_ok());
    }

    #[test]
    fn file_level_errors() {
        assert!(parse("").unwrap_err().to_string().contains("empty"));
        assert!(parse(&format!("{HEAD}\n"))
            .unwrap_err()
            .to_string()
            .contains("without rows"));
        let e = parse("name,metal,ox\nA,Fe,2\n").unwrap_err().to_string();
        assert!(e.contains("missing column(s) geometry, ligands"), "{e}");
        let e = parse(&format!("{HEAD},mu_ef\nA,Fe,2,oct,py:6,5\n"))
            .unwrap_err()
            .to_string();
        assert!(e.contains("'mu_ef'") && e.contains("mu_eff"), "{e}");
    }

    #[test]
    fn incomplete_measurements_name_the_missing_column() {
        let e = |extra_head: &str, extra: &str| {
            parse(&format!("{HEAD},{extra_head}\nA,Fe,2,oct,py:6,{extra}\n")).unwrap()[0]
                .clone()
                .unwrap_err()
        };
        assert_eq!(e("evans_shift_ppm", "0.4").column, "evans_conc");
        assert_eq!(e("mu_eff", "5.2").column, "moment_temp");
        assert_eq!(e("mu_eff,chi_m_t", "5.2,3.3").column, "mu_eff, chi_m_t");
        assert_eq!(
            e("bands,band_window", "11000,1100-350").column,
            "band_window"
        );
        assert_eq!(e("structure_temp", "100").column, "structure_temp");
        assert_eq!(e("dia", "0.001").column, "dia");
        let short = parse(&format!("{HEAD}\nA,Fe,2,oct\n")).unwrap()[0]
            .clone()
            .unwrap_err();
        assert!(short.message.contains("4 cells"), "{}", short.message);
    }
}
