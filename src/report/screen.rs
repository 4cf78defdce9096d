//! Report of `spinstate screen`: candidate coordination spheres ranked by their distance to the
//! crossover.
//!
//! JSON contract (a top-level object; fields are only ever added): Δ, B and C in cm⁻¹, margins
//! in Δ/B and in percent of the crossover Δ/B, scores in percent (larger is better). The CSV has
//! one row per ranked candidate with the columns of [`CSV_HEADER`].

use super::predict::CAUTION_FOOTER;
use super::Render;
use super::{fmt_num, new_table};
use crate::screen::{Candidate, Hit, Outcome, Screen};
use serde::Serialize;
use std::io::Write;

/// One ion of the screen with its crossover.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct ScreenIonRow {
    /// e.g. "Fe(II)".
    pub ion: String,
    pub metal: String,
    /// Oxidation state of the metal (formal charge).
    pub oxidation_state: i32,
    /// Number of d electrons.
    pub dn: usize,
    /// C/B used (C₀/B₀ or the Tanabe–Sugano ratio).
    pub c_over_b: f64,
    /// Δ/B where the ground spin changes, for this d^n, geometry and C/B.
    pub crossover_delta_over_b: f64,
    /// Ground term below the crossover, e.g. "5T2g".
    pub high_spin_term: String,
    /// Ground term above the crossover, e.g. "1A1g".
    pub low_spin_term: Option<String>,
}

/// The filters as applied (null or empty when not used).
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct FilterRow {
    pub require: Vec<String>,
    pub forbid: Vec<String>,
    /// Largest |charge| of the complex.
    pub max_charge: Option<i32>,
    /// Exact donor-atom set, e.g. "N6".
    pub donors: Option<String>,
    /// Number of ligands bound, "MIN..MAX".
    pub size: Option<String>,
    /// Number of distinct ligands, "MIN..MAX".
    pub kinds: Option<String>,
}

/// A ligand of a candidate and how many are bound.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct LigandCountRow {
    pub name: String,
    /// How many of this ligand are bound.
    pub count: usize,
}

/// One ranked candidate.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct ScreenRow {
    /// 1 = best for the target.
    pub rank: usize,
    /// e.g. "Fe(II)".
    pub ion: String,
    /// Formula, e.g. "[Fe(NCS)2(py)4]".
    pub sphere: String,
    /// Label from the candidates file; null for pools or unlabelled rows.
    pub name: Option<String>,
    pub ligands: Vec<LigandCountRow>,
    /// Donor-atom set, e.g. "N6".
    pub donors: String,
    /// Overall charge of the complex.
    pub charge: i32,
    /// Δ of the predicted ground state (cm⁻¹): Δo for oct, Δt for tet, 3e_σ for sqpl.
    pub delta: f64,
    /// Δ of the high-spin state at its own bond length (cm⁻¹).
    pub delta_high_spin: f64,
    /// Δ of the low-spin state at its own bond length (cm⁻¹).
    pub delta_low_spin: f64,
    /// Racah B (cm⁻¹).
    pub b: f64,
    /// Racah C (cm⁻¹).
    pub c: f64,
    /// C/B of the candidate (dimensionless).
    pub c_over_b: f64,
    /// Δ/B of the predicted ground state.
    pub delta_over_b: f64,
    /// Mean field Δ̄/B of the two spin states (what the margin and score use).
    pub mean_delta_over_b: f64,
    /// Δ/B where the ground spin changes for this ion, geometry and C/B (dimensionless).
    pub crossover_delta_over_b: f64,
    /// E_HS − E_LS (cm⁻¹), each state at its own geometry (> 0: low spin lower).
    pub energy_gap: f64,
    /// Δ̄/B − crossover Δ/B (negative on the high-spin side).
    pub margin_delta_over_b: f64,
    /// The margin in percent of the crossover Δ/B.
    pub margin_percent: f64,
    /// Assumed uncertainty of Δ/B in percent (as in `predict`).
    pub uncertainty_percent: f64,
    /// "high", "crossover" or "low".
    pub spin_state: String,
    /// True when the margin is within the assumed uncertainty (as in `predict`).
    pub borderline: bool,
    /// Score for the target in percent of the crossover Δ/B (larger is better).
    pub score: f64,
}

impl ScreenRow {
    /// The row of one evaluated candidate.
    pub fn new(screen: &Screen, rank: usize, c: &Candidate) -> ScreenRow {
        ScreenRow {
            rank,
            ion: screen.ions[c.ion].ion.name(),
            sphere: screen.formula(c),
            name: c.name.clone(),
            ligands: screen
                .ligand_counts(c)
                .into_iter()
                .map(|(name, count)| LigandCountRow { name, count })
                .collect(),
            donors: screen.donor_set(c).to_string(),
            charge: c.charge,
            delta: c.delta,
            delta_high_spin: c.delta_high_spin,
            delta_low_spin: c.delta_low_spin,
            b: c.b,
            c: c.c,
            c_over_b: c.c_over_b,
            delta_over_b: c.delta_over_b,
            mean_delta_over_b: c.mean_delta_over_b,
            crossover_delta_over_b: c.crossover_delta_over_b,
            energy_gap: c.energy_gap,
            margin_delta_over_b: c.margin,
            margin_percent: c.percent,
            uncertainty_percent: 100.0 * c.uncertainty,
            spin_state: c.spin_state.name().to_string(),
            borderline: c.borderline,
            score: c.score,
        }
    }

    fn csv_record(&self) -> Vec<String> {
        let ligands: Vec<String> = self
            .ligands
            .iter()
            .map(|l| format!("{}:{}", l.name, l.count))
            .collect();
        vec![
            self.rank.to_string(),
            self.ion.clone(),
            self.sphere.clone(),
            self.name.clone().unwrap_or_default(),
            ligands.join(" "),
            self.donors.clone(),
            self.charge.to_string(),
            self.delta.to_string(),
            self.b.to_string(),
            self.c.to_string(),
            self.c_over_b.to_string(),
            self.delta_over_b.to_string(),
            self.crossover_delta_over_b.to_string(),
            self.margin_delta_over_b.to_string(),
            self.margin_percent.to_string(),
            self.uncertainty_percent.to_string(),
            self.spin_state.clone(),
            self.borderline.to_string(),
            self.score.to_string(),
            self.delta_high_spin.to_string(),
            self.delta_low_spin.to_string(),
            self.mean_delta_over_b.to_string(),
            self.energy_gap.to_string(),
        ]
    }
}

/// Columns of the CSV output (energies in cm⁻¹; `ligands` as `NAME:COUNT` items).
pub const CSV_HEADER: [&str; 23] = [
    "rank",
    "ion",
    "sphere",
    "name",
    "ligands",
    "donors",
    "charge",
    "delta_cm-1",
    "b_cm-1",
    "c_cm-1",
    "c_over_b",
    "delta_over_b",
    "crossover_delta_over_b",
    "margin_delta_over_b",
    "margin_percent",
    "uncertainty_percent",
    "spin_state",
    "borderline",
    "score",
    "delta_high_spin_cm-1",
    "delta_low_spin_cm-1",
    "mean_delta_over_b",
    "energy_gap_cm-1",
];

/// Writes ranked hits as CSV, one candidate at a time (nothing but the hits is held).
pub fn write_csv<W: Write>(screen: &Screen, hits: &[Hit], out: W) -> std::io::Result<()> {
    let mut w = csv::Writer::from_writer(out);
    w.write_record(CSV_HEADER)?;
    for (i, h) in hits.iter().enumerate() {
        let row = ScreenRow::new(screen, i + 1, &screen.candidate(h));
        w.write_record(row.csv_record())?;
    }
    w.flush()
}

/// The whole `screen` report.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct ScreenReport {
    /// oct, tet or sqpl.
    pub geometry: String,
    /// "crossover", "high" or "low".
    pub target: String,
    /// "pool" or "candidates".
    pub source: String,
    /// Ligands of the pool (or of the good rows of a candidates file), in table order.
    pub pool: Vec<String>,
    pub ions: Vec<ScreenIonRow>,
    pub filters: FilterRow,
    /// Candidate spheres generated from the pool or read from the file (good rows), before
    /// filters.
    pub candidates: u64,
    /// (sphere, ion) pairs that passed the filters and whose Δ/B was computed.
    pub evaluated: u64,
    /// Pairs whose estimate failed (β = 1 − h̄k ≤ 0); not ranked.
    pub skipped: u64,
    /// Rows of the candidates file that could not be used (reported on stderr).
    pub bad_rows: usize,
    /// Those rows: data row number, line of the file, column and what is wrong.
    pub rejected: Vec<RejectedRow>,
    /// Number of entries in `results`.
    pub shown: usize,
    /// Ranked candidates, best first.
    pub results: Vec<ScreenRow>,
    pub notes: Vec<String>,
    /// Handling cautions for the metals and the ligands shown; the tool's output is never a
    /// safety approval.
    pub cautions: Vec<String>,
}

/// A row of a candidates file that could not be used.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct RejectedRow {
    /// Data row number (1 = the first row after the header).
    pub row: usize,
    /// Line of the file.
    pub line: usize,
    pub column: String,
    pub message: String,
}

impl ScreenReport {
    /// Builds the report with the first `limit` hits of the outcome; `rejected` are the rows
    /// of a candidates file that could not be used.
    pub fn new(
        screen: &Screen,
        outcome: &Outcome,
        rejected: &[crate::screen::RejectedCandidate],
        limit: usize,
    ) -> Self {
        let bad_rows = rejected.len();
        let results: Vec<ScreenRow> = outcome
            .hits
            .iter()
            .take(limit)
            .enumerate()
            .map(|(i, h)| ScreenRow::new(screen, i + 1, &screen.candidate(h)))
            .collect();
        let mut cautions: Vec<String> = Vec::new();
        for i in &screen.ions {
            if let Some(c) = &i.ion.caution {
                let line = format!("{}: {c}", i.ion.symbol);
                if !cautions.contains(&line) {
                    cautions.push(line);
                }
            }
        }
        for p in &screen.pool {
            let shown = results
                .iter()
                .any(|r| r.ligands.iter().any(|l| l.name == p.ligand.name));
            if let (true, Some(c)) = (shown, &p.ligand.caution) {
                cautions.push(format!("{}: {c}", p.ligand.name));
            }
        }
        if !cautions.is_empty() {
            cautions.push(CAUTION_FOOTER.to_string());
        }
        let mut notes = screen.notes().to_vec();
        if outcome.skipped > 0 {
            notes.push(format!(
                "{} (sphere, ion) pairs were not ranked: β = 1 − h̄k ≤ 0, where the factor rule fails",
                outcome.skipped
            ));
        }
        if outcome.evaluated == 0 {
            notes.push("no candidate passed the filters".to_string());
        }
        let f = &screen.filters;
        ScreenReport {
            geometry: screen.geometry.name().to_string(),
            target: screen.target.name().to_string(),
            source: if screen.is_pool() {
                "pool"
            } else {
                "candidates"
            }
            .to_string(),
            pool: screen.pool.iter().map(|p| p.ligand.name.clone()).collect(),
            ions: screen
                .ions
                .iter()
                .map(|i| ScreenIonRow {
                    ion: i.ion.name(),
                    metal: i.ion.symbol.clone(),
                    oxidation_state: i.ion.oxidation_state,
                    dn: i.ion.dn,
                    c_over_b: i.c_over_b,
                    crossover_delta_over_b: i.crossover_delta_over_b,
                    high_spin_term: i.crossover.high_spin.term.to_string(),
                    low_spin_term: i.crossover.low_spin.as_ref().map(|g| g.term.to_string()),
                })
                .collect(),
            filters: FilterRow {
                require: f.require.clone(),
                forbid: f.forbid.clone(),
                max_charge: f.max_abs_charge,
                donors: f.donors.as_ref().map(|d| d.to_string()),
                size: f.size.map(|r| r.to_string()),
                kinds: f.kinds.map(|r| r.to_string()),
            },
            candidates: outcome.candidates,
            evaluated: outcome.evaluated,
            skipped: outcome.skipped,
            bad_rows,
            rejected: rejected
                .iter()
                .map(|e| RejectedRow {
                    row: e.row,
                    line: e.line,
                    column: e.column.clone(),
                    message: e.message.clone(),
                })
                .collect(),
            shown: results.len(),
            results,
            notes,
            cautions,
        }
    }
}

impl Render for ScreenReport {
    type Figure = ();

    /// Human-readable text with the ranked table.
    fn table(&self) -> String {
        let ions: Vec<String> = self
            .ions
            .iter()
            .map(|i| {
                format!(
                    "{} (d{}, crossover Δ/B {} at C/B {}: {} below, {} above)",
                    i.ion,
                    i.dn,
                    fmt_num(i.crossover_delta_over_b, 2),
                    fmt_num(i.c_over_b, 3),
                    i.high_spin_term,
                    i.low_spin_term.as_deref().unwrap_or("—")
                )
            })
            .collect();
        let mut out = format!(
            "screen: {} candidate spheres from {} ({} ligands), {} evaluated; {}, target {}\n{}\n",
            self.candidates,
            if self.source == "pool" {
                "a pool"
            } else {
                "a candidates file"
            },
            self.pool.len(),
            self.evaluated,
            self.geometry,
            self.target,
            ions.join("\n")
        );
        let named = self.results.iter().any(|r| r.name.is_some());
        let mut header = vec!["#", "ion"];
        if named {
            header.push("name");
        }
        header.extend([
            "sphere",
            "donors",
            "Δ_HS (cm⁻¹)",
            "Δ_LS (cm⁻¹)",
            "B (cm⁻¹)",
            "Δ̄/B",
            "E_HS − E_LS (cm⁻¹)",
            "margin (Δ̄/B)",
            "margin (%)",
            "spin",
            "score (%)",
        ]);
        let mut t = new_table(header);
        for r in &self.results {
            let mut row = vec![r.rank.to_string(), r.ion.clone()];
            if named {
                row.push(r.name.clone().unwrap_or_default());
            }
            row.extend([
                r.sphere.clone(),
                r.donors.clone(),
                fmt_num(r.delta_high_spin, 0),
                fmt_num(r.delta_low_spin, 0),
                fmt_num(r.b, 0),
                fmt_num(r.mean_delta_over_b, 2),
                fmt_num(r.energy_gap, 0),
                fmt_num(r.margin_delta_over_b, 2),
                fmt_num(r.margin_percent, 1),
                format!(
                    "{}{}",
                    r.spin_state,
                    if r.borderline { " (borderline)" } else { "" }
                ),
                fmt_num(r.score, 1),
            ]);
            t.add_row(row);
        }
        out.push_str(&format!("{t}\n"));
        out.push_str(&format!(
            "showing {} of {} ranked; Δ̄ = mean of the two spin states' fields; margin = Δ̄/B − crossover Δ/B; borderline = within the assumed uncertainty of Δ/B (as in predict)\n",
            self.shown,
            self.evaluated - self.skipped
        ));
        if !self.notes.is_empty() {
            out.push_str("notes:\n");
            for n in &self.notes {
                out.push_str(&format!("- {n}\n"));
            }
        }
        if !self.cautions.is_empty() {
            out.push_str("caution:\n");
            for c in &self.cautions {
                out.push_str(&format!("- {c}\n"));
            }
        }
        out
    }
}

/// A finished screen as the command prints it: the JSON holds every hit kept, the table the
/// first `table_rows`, the CSV every hit kept (rows built one candidate at a time).
pub struct ScreenOutput<'a> {
    pub screen: &'a Screen,
    pub outcome: &'a Outcome,
    /// Rows of a candidates file that could not be used.
    pub rejected: &'a [crate::screen::RejectedCandidate],
    pub table_rows: usize,
}

impl Serialize for ScreenOutput<'_> {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        ScreenReport::new(
            self.screen,
            self.outcome,
            self.rejected,
            self.outcome.hits.len(),
        )
        .serialize(s)
    }
}

impl Render for ScreenOutput<'_> {
    type Figure = ();

    fn table(&self) -> String {
        ScreenReport::new(self.screen, self.outcome, self.rejected, self.table_rows).table()
    }

    fn csv(&self) -> Option<String> {
        let mut buf = Vec::new();
        write_csv(self.screen, &self.outcome.hits, &mut buf).expect("CSV to memory");
        Some(String::from_utf8(buf).expect("CSV is UTF-8"))
    }

    fn csv_summary(&self) -> Option<String> {
        Some(format!("{} ranked candidates", self.outcome.hits.len()))
    }
}
