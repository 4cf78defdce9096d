//! Report of `spinstate diagram` and its renderers: table, JSON, CSV and SVG.

use super::Render;
use super::{fmt_num, new_table};
use crate::plot::energy::{energy_svg, EnergyOptions, SampleMark};
use crate::plot::style::Column;
use serde::Serialize;

/// One level followed across the diagram.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct SeriesRow {
    /// Unique column name, e.g. "4T1g(4P)" or "2T2g#3(2H)".
    pub key: String,
    /// Label with multiplicity, e.g. "4T1g".
    pub label: String,
    /// Spin multiplicity 2S+1.
    pub multiplicity: i32,
    /// Free-ion parent term.
    pub parent: String,
    /// Orbital degeneracy.
    pub degeneracy: usize,
    /// E/B above the ground level at each Δ/B of `delta_over_b`.
    pub energies: Vec<f64>,
}

/// The whole diagram (energies in units of Racah B).
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct DiagramReport {
    /// Number of d electrons.
    pub dn: usize,
    pub geometry: String,
    /// Racah C/B of the diagram (dimensionless).
    pub c_over_b: f64,
    /// Δ/B values (Δ = 10Dq), evenly spaced from 0 to the maximum, both included.
    pub delta_over_b: Vec<f64>,
    /// Δ/B of the spin crossover, or null.
    pub crossover_delta_over_b: Option<f64>,
    pub series: Vec<SeriesRow>,
}

impl DiagramReport {
    /// The report of an engine diagram.
    pub fn from_engine(d: &crate::engine::Diagram) -> Self {
        DiagramReport {
            dn: d.dn,
            geometry: d.geometry.name().into(),
            c_over_b: d.c_over_b,
            delta_over_b: d.delta_over_b.clone(),
            crossover_delta_over_b: d.crossover.delta_over_b,
            series: d
                .series
                .iter()
                .map(|s| SeriesRow {
                    key: s.key(d.needs_index(s)),
                    label: s.label(),
                    multiplicity: s.two_s + 1,
                    parent: crate::engine::Term::text_of(s.parent),
                    degeneracy: s.degeneracy,
                    energies: s.energies.clone(),
                })
                .collect(),
        }
    }

    /// The default caption: d^n, geometry and C/B.
    pub fn caption(&self) -> String {
        format!(
            "d^{{{}}}, {}, *C*/*B* = {}",
            self.dn,
            self.geometry,
            fmt_num(self.c_over_b, 2)
        )
    }

    /// An SVG figure one journal column wide: levels coloured and dashed by spin multiplicity,
    /// free-ion terms on the left, level labels on the right, the crossover with its value.
    pub fn to_svg(&self) -> Result<String, String> {
        Ok(self.to_svg_with(
            None,
            &EnergyOptions {
                column: Column::Single,
                title: self.caption(),
                highlight: Vec::new(),
            },
        ))
    }

    /// The SVG figure with an optional sample and the given options.
    pub fn to_svg_with(&self, sample: Option<&SampleMark>, options: &EnergyOptions) -> String {
        energy_svg(self, sample, options)
    }
}

/// What the diagram's figure shows beyond the report: its options and an optional sample.
#[derive(Debug, Clone)]
pub struct DiagramFigure {
    pub options: EnergyOptions,
    pub sample: Option<SampleMark>,
}

impl Render for DiagramReport {
    type Figure = DiagramFigure;

    fn svg(&self, figure: &DiagramFigure) -> Option<String> {
        Some(self.to_svg_with(figure.sample.as_ref(), &figure.options))
    }

    /// A short table: E/B of every level at Δ/B = 0, the middle and the maximum.
    fn table(&self) -> String {
        let n = self.delta_over_b.len();
        let cols = [0, n / 2, n - 1];
        let heads: Vec<String> = cols
            .iter()
            .map(|&i| format!("E/B at Δ/B = {}", fmt_num(self.delta_over_b[i], 1)))
            .collect();
        let mut header = vec!["level".to_string(), "parent".into(), "deg.".into()];
        header.extend(heads);
        let mut t = new_table(header);
        for s in &self.series {
            let mut row = vec![s.label.clone(), s.parent.clone(), s.degeneracy.to_string()];
            row.extend(cols.iter().map(|&i| fmt_num(s.energies[i], 2)));
            t.add_row(row);
        }
        let cross = match self.crossover_delta_over_b {
            Some(x) => format!("spin crossover at Δ/B = {}", fmt_num(x, 3)),
            None => "no spin crossover in range".to_string(),
        };
        format!(
            "d{} {} at C/B = {}: {} levels, {} points; {}\n{}\n",
            self.dn,
            self.geometry,
            fmt_num(self.c_over_b, 3),
            self.series.len(),
            n,
            cross,
            t
        )
    }

    /// CSV: first column Δ/B, then one column of E/B per level (full precision).
    fn csv(&self) -> Option<String> {
        Some({
            use super::decimal::push_f64;
            // The header goes through the CSV writer (level keys are quoted if they ever need it);
            // the numbers never need quoting and are written straight into one buffer, which keeps
            // a 1000-point d⁵ diagram's CSV from dominating the command's time.
            let mut w = csv::Writer::from_writer(Vec::new());
            let mut header = vec!["delta_over_b".to_string()];
            header.extend(self.series.iter().map(|s| s.key.clone()));
            w.write_record(&header).expect("CSV to memory");
            let mut out =
                String::from_utf8(w.into_inner().expect("CSV to memory")).expect("CSV is UTF-8");
            // Rows are formatted in parallel chunks and joined in order.
            use rayon::prelude::*;
            let row_len = (self.series.len() + 1) * 20;
            let chunks: Vec<String> = (0..self.delta_over_b.len())
                .collect::<Vec<_>>()
                .par_chunks(64)
                .map(|rows| {
                    let mut text = String::with_capacity(rows.len() * row_len);
                    for &i in rows {
                        push_f64(&mut text, self.delta_over_b[i]);
                        for s in &self.series {
                            text.push(',');
                            let e = s.energies[i];
                            if e.is_finite() {
                                push_f64(&mut text, e);
                            }
                        }
                        text.push('\n');
                    }
                    text
                })
                .collect();
            out.reserve(chunks.iter().map(String::len).sum());
            for chunk in &chunks {
                out.push_str(chunk);
            }
            out
        })
    }
}
