//! Reports of `spinstate check` and `spinstate demo`: the evidence lines and the verdict of one
//! complex, or of every sample of a batch file with its bad rows.
//!
//! JSON contract (a top-level object; fields are only ever added): one complex
//! `{"name", "row", "complex", "ion", "dn", "geometry", "delta_over_b", "crossover_delta_over_b",
//! "margin_percent", "borderline", "predicted_spin_state", "verdict", "confidence", "reasons",
//! "recheck", "evidence": [{"kind", "predicted", "measured", "supports", "strength", "detail",
//! "temperature_k", "high_spin_fraction"}], "cautions", "structure", "safety"}` (`structure`: null unless
//! `--structure` was given); a batch
//! `{"samples": [<one complex without "safety">], "errors": [{"row", "name", "column",
//! "message"}], "safety"}`.

use super::Render;
use super::{fmt_num, new_table};
use crate::check::batch::{RowError, BATCH_KINDS};
use crate::check::{CheckResult, EvidenceKind};
use serde::Serialize;

/// Caution printed with every `check` and `demo` result.
pub const SAFETY: &str = "Safety: cyanide salts are very toxic and release HCN with acid; cobalt, nickel and other heavy-metal compounds are sensitisers or carcinogens and go to heavy-metal waste; perchlorate salts of complexes can explode; superconducting NMR magnets pull ferromagnetic objects and affect implants, and NMR tubes and capillary inserts break easily. Follow your institution's rules, the supplier's SDS and licensed practice; this output is not a safety approval.";

/// One line of evidence.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct EvidenceRow {
    /// "prediction", "structure-field", "evans", "moment", "bands", "bond-length" or
    /// "chit-curve".
    pub kind: String,
    /// What the model expects (μB, cm⁻¹ or Å as stated in the text).
    pub predicted: String,
    /// What was measured.
    pub measured: String,
    /// "high-spin", "low-spin", "mixture", "both", "neither", "only-state" or "none".
    pub supports: String,
    /// "strong", "moderate", "weak" or "none".
    pub strength: String,
    pub detail: String,
    /// Temperature of the measurement (K); null when not given or not a measurement.
    pub temperature_k: Option<f64>,
    /// Estimated high-spin fraction (0–1) for evidence between the states; else null.
    pub high_spin_fraction: Option<f64>,
}

/// What a structure (`check --structure`) gave: its centre, bonds and field.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct StructureRow {
    /// The structure file.
    pub file: String,
    /// Label of the metal centre used.
    pub centre: String,
    /// Mean metal–donor distance in Å.
    pub mean_distance: Option<f64>,
    /// Bond-length verdict of the centre against data/bond_lengths.csv: "high-spin",
    /// "low-spin", "mixture", "both", "neither", "conflicting" or "none".
    pub spin_state_from_bonds: String,
    /// Ground level of the field at the real geometry (angular overlap model).
    pub field_ground: String,
    /// Total spin S of that ground level.
    pub field_spin: f64,
    /// Factor by which that field must be scaled for the ground spin to change (null: not
    /// within 1/4..4); > 1 on the high-spin side.
    pub field_margin_scale: Option<f64>,
    /// Point group of the field's labels (Oh, Td, D4h or C1).
    pub field_point_group: String,
    /// What the field's line supports ("high-spin", "low-spin", "both", "only-state").
    pub field_supports: String,
    /// True when the field and the composition's estimate take opposite sides.
    pub field_disagrees_with_composition: bool,
}

/// The verdict on one complex.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct CheckReport {
    /// Sample name (batch input), null for a single check.
    pub name: Option<String>,
    /// Line of the batch file (header = 1), null for a single check.
    pub row: Option<usize>,
    /// Formula as built from the ligands, e.g. "[Fe(NCS)2(py)4]".
    pub complex: String,
    /// e.g. "Fe(II)".
    pub ion: String,
    /// Number of d electrons.
    pub dn: usize,
    /// oct, tet or sqpl.
    pub geometry: String,
    /// Δ/B of the complex's predicted ground state (dimensionless).
    pub delta_over_b: f64,
    /// Mean Δ̄/B of the two spin states, each at its own bond length (what the margin uses);
    /// null when the spin cannot change.
    pub mean_delta_over_b: Option<f64>,
    /// Δ/B of the crossover; null when the ground spin cannot change.
    pub crossover_delta_over_b: Option<f64>,
    /// (Δ/B − crossover)/crossover in percent; null when there is no crossover.
    pub margin_percent: Option<f64>,
    /// True when the margin lies within the assumed uncertainty of Δ/B.
    pub borderline: bool,
    /// "high", "low" or "fixed", from the ligand-field prediction.
    pub predicted_spin_state: String,
    /// "high-spin", "low-spin", "crossover-or-mixture" or "inconsistent".
    pub verdict: String,
    /// "strong", "moderate", "weak" or "none".
    pub confidence: String,
    pub reasons: Vec<String>,
    /// What to re-check (empty unless the evidence disagrees).
    pub recheck: Vec<String>,
    pub evidence: Vec<EvidenceRow>,
    /// Handling cautions for the metal and ligands.
    pub cautions: Vec<String>,
    /// The structure's centre and field; null unless a structure was given.
    pub structure: Option<StructureRow>,
    #[serde(skip_serializing_if = "Option::is_none")]
    pub safety: Option<String>,
}

impl CheckReport {
    pub fn new(r: &CheckResult, name: Option<String>, row: Option<usize>) -> Self {
        let p = &r.prediction;
        let cx = &p.complex;
        CheckReport {
            name,
            row,
            complex: cx.formula(),
            ion: cx.ion.name(),
            dn: cx.ion.dn,
            geometry: cx.geometry.name().to_string(),
            delta_over_b: cx.delta_over_b(),
            mean_delta_over_b: cx.spin_choice.map(|c| c.delta_over_b_mean),
            crossover_delta_over_b: p.crossover.delta_over_b,
            margin_percent: p.margin.map(|m| m.percent),
            borderline: p.margin.is_some_and(|m| m.borderline),
            predicted_spin_state: p.spin_state.name().to_string(),
            verdict: r.verdict.name().to_string(),
            confidence: r.confidence.name().to_string(),
            reasons: r.reasons.clone(),
            recheck: r.recheck.clone(),
            evidence: r
                .evidence
                .iter()
                .map(|e| EvidenceRow {
                    kind: e.kind.name().to_string(),
                    predicted: e.predicted.clone(),
                    measured: e.measured.clone(),
                    supports: e.supports.name().to_string(),
                    strength: e.strength.name().to_string(),
                    detail: e.detail.clone(),
                    temperature_k: e.temperature,
                    high_spin_fraction: e.high_spin_fraction,
                })
                .collect(),
            cautions: cx.cautions.clone(),
            structure: r.structure.as_ref().map(|s| StructureRow {
                file: s.source.clone(),
                centre: s.centre.clone(),
                mean_distance: s.mean_distance,
                spin_state_from_bonds: s.spin_state_from_bonds.to_string(),
                field_ground: s.ground.clone(),
                field_spin: s.two_s as f64 / 2.0,
                field_margin_scale: s.margin.map(|m| m.0),
                field_point_group: super::structure_spin::group_name(s.point_group).to_string(),
                field_supports: s.field_supports.name().to_string(),
                field_disagrees_with_composition: s.disagrees,
            }),
            safety: None,
        }
    }

    /// The same report with the safety note (single checks).
    pub fn with_safety(mut self) -> Self {
        self.safety = Some(SAFETY.to_string());
        self
    }

    fn title(&self) -> String {
        let name = self
            .name
            .as_ref()
            .map_or(String::new(), |n| format!("{n}: "));
        format!(
            "{name}{}  {}, d{}, {}",
            self.complex, self.ion, self.dn, self.geometry
        )
    }

    fn verdict_line(&self) -> String {
        format!("verdict: {} (confidence {})", self.verdict, self.confidence)
    }

    fn support_of(&self, kind: EvidenceKind) -> String {
        let cells: Vec<String> = self
            .evidence
            .iter()
            .filter(|e| e.kind == kind.name())
            .map(|e| {
                // A prediction that supports both states is the estimate's borderline, or a
                // predicted spin crossover: say which.
                if kind == EvidenceKind::Prediction && e.supports == "both" {
                    if self.predicted_spin_state == "crossover" {
                        "crossover".to_string()
                    } else {
                        "borderline".to_string()
                    }
                } else if e.strength == "none" {
                    e.supports.clone()
                } else {
                    format!("{} ({})", e.supports, e.strength)
                }
            })
            .collect();
        if cells.is_empty() {
            "—".into()
        } else {
            cells.join(", ")
        }
    }
}

impl Render for CheckReport {
    type Figure = ();

    /// The batch CSV with this one sample as its row.
    fn csv(&self) -> Option<String> {
        BatchReport::new(vec![self.clone()], Vec::new()).csv()
    }

    /// Human-readable table of one complex.
    fn table(&self) -> String {
        let mut out = format!("{}\n", self.title());
        if let Some(st) = &self.structure {
            out.push_str(&format!(
                "structure: {} centre {}: mean M–L {} Å, bonds: {}; field at this geometry: {} (S = {}, labels in {})\n",
                st.file,
                st.centre,
                st.mean_distance.map_or("—".into(), |d| format!("{d:.3}")),
                st.spin_state_from_bonds,
                st.field_ground,
                st.field_spin,
                st.field_point_group
            ));
        }
        let mut t = new_table(["evidence", "predicted", "measured", "supports", "strength"]);
        for e in &self.evidence {
            t.add_row(vec![
                e.kind.clone(),
                e.predicted.clone(),
                e.measured.clone(),
                e.supports.clone(),
                e.strength.clone(),
            ]);
        }
        out.push_str(&format!("{t}\n"));
        for e in &self.evidence {
            out.push_str(&format!("  {}: {}\n", e.kind, e.detail));
        }
        out.push_str(&format!("{}\n", self.verdict_line()));
        for r in &self.reasons {
            out.push_str(&format!("- {r}\n"));
        }
        if !self.recheck.is_empty() {
            out.push_str("re-check:\n");
            for r in &self.recheck {
                out.push_str(&format!("- {r}\n"));
            }
        }
        for c in &self.cautions {
            out.push_str(&format!("caution: {c}\n"));
        }
        if let Some(s) = &self.safety {
            out.push_str(&format!("{s}\n"));
        }
        out
    }
}

/// A bad row of a batch file.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct RowErrorRow {
    /// Line of the file (header = 1).
    pub row: usize,
    pub name: Option<String>,
    /// Column(s) at fault.
    pub column: String,
    pub message: String,
}

impl From<&RowError> for RowErrorRow {
    fn from(e: &RowError) -> Self {
        RowErrorRow {
            row: e.row,
            name: e.name.clone(),
            column: e.column.clone(),
            message: e.message.clone(),
        }
    }
}

/// Every sample of a batch file.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct BatchReport {
    pub samples: Vec<CheckReport>,
    pub errors: Vec<RowErrorRow>,
    pub safety: String,
}

impl BatchReport {
    pub fn new(samples: Vec<CheckReport>, errors: Vec<RowErrorRow>) -> Self {
        BatchReport {
            samples,
            errors,
            safety: SAFETY.to_string(),
        }
    }

    /// Rows in file order: samples and bad rows.
    fn rows(&self) -> Vec<BatchRow<'_>> {
        let mut rows: Vec<(usize, BatchRow<'_>)> = self
            .samples
            .iter()
            .map(|s| (s.row.unwrap_or(0), Ok(s)))
            .chain(self.errors.iter().map(|e| (e.row, Err(e))))
            .collect();
        rows.sort_by_key(|(r, _)| *r);
        rows.into_iter().map(|(_, x)| x).collect()
    }

    /// The verdict table with one line per sample (bad rows included), then the reasons.
    pub fn verdict_table(&self) -> String {
        rows_table(&self.rows())
    }

    /// Where each sample's mean Δ̄/B sits against its crossover.
    pub fn crossover_table(&self) -> String {
        let mut t = new_table([
            "sample",
            "Δ̄/B",
            "crossover Δ/B",
            "margin %",
            "high spin ◂ Δ/B ▸ low spin",
        ]);
        for s in &self.samples {
            let x = s.mean_delta_over_b.unwrap_or(s.delta_over_b);
            t.add_row(vec![
                s.name.clone().unwrap_or_default(),
                fmt_num(x, 1),
                s.crossover_delta_over_b
                    .map_or("none".to_string(), |x| fmt_num(x, 1)),
                s.margin_percent.map_or("—".to_string(), |m| {
                    format!(
                        "{}{}",
                        fmt_num(m, 0),
                        if s.borderline { " (borderline)" } else { "" }
                    )
                }),
                s.crossover_delta_over_b
                    .map_or(String::new(), |xc| strip(x, xc)),
            ]);
        }
        format!("{t}\n")
    }
}

impl Render for BatchReport {
    type Figure = ();

    /// The verdict table (as [`BatchReport::verdict_table`]), then the safety note.
    fn table(&self) -> String {
        format!("{}{SAFETY}\n", self.verdict_table())
    }

    /// CSV: one line per row of the input (bad rows with their error), full precision.
    fn csv(&self) -> Option<String> {
        Some({
            let mut w = csv::Writer::from_writer(Vec::new());
            w.write_record(csv_header()).expect("CSV to memory");
            for row in self.rows() {
                w.write_record(csv_record(row)).expect("CSV to memory");
            }
            String::from_utf8(w.into_inner().expect("CSV to memory")).expect("CSV is UTF-8")
        })
    }
}

/// One row of a batch result: a checked sample or a bad row.
pub type BatchRow<'a> = Result<&'a CheckReport, &'a RowErrorRow>;

/// The header of the batch CSV.
pub fn csv_header() -> Vec<String> {
    let mut header: Vec<String> = [
        "row",
        "name",
        "complex",
        "ion",
        "geometry",
        "delta_over_b",
        "crossover_delta_over_b",
        "margin_percent",
    ]
    .iter()
    .map(|s| s.to_string())
    .collect();
    header.extend(BATCH_KINDS.iter().map(|k| k.name().replace('-', "_")));
    header.extend(
        ["verdict", "confidence", "reasons", "recheck", "error"]
            .iter()
            .map(|s| s.to_string()),
    );
    header
}

/// One record of the batch CSV (full precision), matching [`csv_header`].
pub fn csv_record(row: BatchRow<'_>) -> Vec<String> {
    let opt = |x: Option<f64>| x.map_or(String::new(), |v| v.to_string());
    match row {
        Ok(s) => {
            let mut r = vec![
                opt(s.row.map(|r| r as f64)),
                s.name.clone().unwrap_or_default(),
                s.complex.clone(),
                s.ion.clone(),
                s.geometry.clone(),
                s.delta_over_b.to_string(),
                opt(s.crossover_delta_over_b),
                opt(s.margin_percent),
            ];
            r.extend(BATCH_KINDS.iter().map(|k| {
                let c = s.support_of(*k);
                if c == "—" {
                    String::new()
                } else {
                    c
                }
            }));
            r.extend([
                s.verdict.clone(),
                s.confidence.clone(),
                s.reasons.join(" | "),
                s.recheck.join(" | "),
                String::new(),
            ]);
            r
        }
        Err(e) => {
            let mut r = vec![e.row.to_string(), e.name.clone().unwrap_or_default()];
            r.extend(std::iter::repeat_n(String::new(), 6 + BATCH_KINDS.len()));
            r.extend([
                "error".to_string(),
                String::new(),
                String::new(),
                String::new(),
                format!("column {}: {}", e.column, e.message),
            ]);
            r
        }
    }
}

/// The verdict table of some rows of a batch (one line per sample or bad row), then their
/// reasons; a streamed batch prints one such table per chunk of rows.
pub fn rows_table(rows: &[BatchRow<'_>]) -> String {
    let mut t = new_table(
        ["sample", "complex"]
            .into_iter()
            .chain(BATCH_KINDS.iter().map(|k| k.heading()))
            .chain(["verdict"]),
    );
    for row in rows.iter().copied() {
        match row {
            Ok(s) => {
                let mut cells = vec![
                    s.name.clone().unwrap_or_default(),
                    format!("{} {}", s.complex, s.ion),
                ];
                cells.extend(BATCH_KINDS.iter().map(|k| s.support_of(*k)));
                cells.push(format!("{} ({})", s.verdict, s.confidence));
                t.add_row(cells);
            }
            Err(e) => {
                let mut cells = vec![
                    e.name.clone().unwrap_or_else(|| format!("row {}", e.row)),
                    format!("bad row {}", e.row),
                ];
                cells.extend(BATCH_KINDS.iter().map(|_| "—".to_string()));
                cells.push(format!("error in {}", e.column));
                t.add_row(cells);
            }
        }
    }
    let mut out = format!("{t}\n");
    for row in rows.iter().copied() {
        match row {
            Ok(s) => {
                out.push_str(&format!(
                    "{}: {}\n",
                    s.name.as_deref().unwrap_or(""),
                    s.verdict_line()
                ));
                for r in &s.reasons {
                    out.push_str(&format!("  - {r}\n"));
                }
                for r in &s.recheck {
                    out.push_str(&format!("  re-check {r}\n"));
                }
            }
            Err(e) => out.push_str(&format!(
                "row {}: not checked: column {}: {}\n",
                e.row, e.column, e.message
            )),
        }
    }
    out
}

/// A one-line picture of Δ/B against the crossover: the scale runs from half to one and a half
/// times the crossover, `|` marks the crossover and `●` the complex (`◂`/`▸` when off scale).
pub fn strip(delta_over_b: f64, crossover: f64) -> String {
    const WIDTH: usize = 25;
    let mid = WIDTH / 2;
    let mut cells = vec!['·'; WIDTH];
    cells[mid] = '|';
    let f = (delta_over_b / crossover - 0.5).clamp(-0.01, 1.01);
    if f < 0.0 {
        cells[0] = '◂';
    } else if f > 1.0 {
        cells[WIDTH - 1] = '▸';
    } else {
        let i = ((f * (WIDTH - 1) as f64).round() as usize).min(WIDTH - 1);
        cells[i] = '●';
    }
    format!("HS {} LS", cells.into_iter().collect::<String>())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn strip_marks_the_side() {
        let s = strip(15.0, 20.0);
        let dot = s.chars().position(|c| c == '●').unwrap();
        let bar = s.chars().position(|c| c == '|').unwrap();
        assert!(dot < bar, "{s}");
        let s = strip(24.0, 20.0);
        let dot = s.chars().position(|c| c == '●').unwrap();
        assert!(dot > bar, "{s}");
        assert!(strip(5.0, 20.0).contains('◂'));
        assert!(strip(50.0, 20.0).contains('▸'));
    }
}
