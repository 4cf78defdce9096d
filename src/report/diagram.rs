//! Report of `spinstate diagram` and its renderers: table, JSON, CSV and SVG.

use super::{fmt_num, new_table};
use plotters::prelude::*;
use serde::Serialize;

/// One level followed across the diagram.
#[derive(Debug, Clone, Serialize)]
pub struct SeriesRow {
    /// Unique column name, e.g. "4T1g(4P)" or "2T2g#3(2H)".
    pub key: String,
    /// Label with multiplicity, e.g. "4T1g".
    pub label: String,
    pub multiplicity: i32,
    /// Free-ion parent term.
    pub parent: String,
    /// Orbital degeneracy.
    pub degeneracy: usize,
    /// E/B above the ground level at each Δ/B of `delta_over_b`.
    pub energies: Vec<f64>,
}

/// The whole diagram (energies in units of Racah B).
#[derive(Debug, Clone, Serialize)]
pub struct DiagramReport {
    pub dn: usize,
    pub geometry: String,
    pub c_over_b: f64,
    /// Δ/B values (Δ = 10Dq), evenly spaced from 0 to the maximum, both included.
    pub delta_over_b: Vec<f64>,
    /// Δ/B of the spin crossover, or null.
    pub crossover_delta_over_b: Option<f64>,
    pub series: Vec<SeriesRow>,
}

impl DiagramReport {
    /// A short table: E/B of every level at Δ/B = 0, the middle and the maximum.
    pub fn to_table(&self) -> String {
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
    pub fn to_csv(&self) -> String {
        let mut w = csv::Writer::from_writer(Vec::new());
        let mut header = vec!["delta_over_b".to_string()];
        header.extend(self.series.iter().map(|s| s.key.clone()));
        w.write_record(&header).expect("CSV to memory");
        for (i, x) in self.delta_over_b.iter().enumerate() {
            let mut row = vec![x.to_string()];
            row.extend(self.series.iter().map(|s| {
                let e = s.energies[i];
                if e.is_finite() {
                    e.to_string()
                } else {
                    String::new()
                }
            }));
            w.write_record(&row).expect("CSV to memory");
        }
        String::from_utf8(w.into_inner().expect("CSV to memory")).expect("CSV is UTF-8")
    }

    /// An SVG picture: levels coloured by spin multiplicity, the crossover as a dashed line.
    pub fn to_svg(&self) -> Result<String, String> {
        let mut out = String::new();
        {
            let root = SVGBackend::with_string(&mut out, (900, 680)).into_drawing_area();
            root.fill(&WHITE).map_err(|e| e.to_string())?;
            let xmax = self.delta_over_b.last().copied().unwrap_or(1.0).max(1e-9);
            let top = self
                .series
                .iter()
                .filter_map(|s| s.energies.last().copied())
                .filter(|e| e.is_finite())
                .fold(0.0f64, f64::max);
            let ymax = top.min(2.0 * xmax + 30.0).max(10.0);
            let mut chart = ChartBuilder::on(&root)
                .caption(
                    format!(
                        "d{} {}   C/B = {}",
                        self.dn,
                        self.geometry,
                        fmt_num(self.c_over_b, 3)
                    ),
                    ("sans-serif", 22),
                )
                .margin(16)
                .margin_right(64)
                .x_label_area_size(44)
                .y_label_area_size(56)
                .build_cartesian_2d(0.0..xmax, 0.0..ymax)
                .map_err(|e| e.to_string())?;
            chart
                .configure_mesh()
                .x_desc("Δ/B")
                .y_desc("E/B (ground level at 0)")
                .light_line_style(RGBColor(236, 236, 236))
                .draw()
                .map_err(|e| e.to_string())?;
            let mut seen: Vec<i32> = Vec::new();
            for s in &self.series {
                let color = spin_colour(s.multiplicity);
                // Contiguous runs of points inside the plotted range.
                let mut runs: Vec<Vec<(f64, f64)>> = vec![Vec::new()];
                for (x, e) in self.delta_over_b.iter().zip(&s.energies) {
                    if e.is_finite() && *e <= ymax {
                        runs.last_mut().expect("one run").push((*x, *e));
                    } else if !runs.last().expect("one run").is_empty() {
                        runs.push(Vec::new());
                    }
                }
                runs.retain(|r| r.len() > 1);
                if runs.is_empty() {
                    continue;
                }
                let mut last = None;
                for run in runs {
                    last = Some(
                        chart
                            .draw_series(LineSeries::new(run, color.stroke_width(2)))
                            .map_err(|e| e.to_string())?,
                    );
                }
                let series = last.expect("at least one run");
                if !seen.contains(&s.multiplicity) {
                    seen.push(s.multiplicity);
                    let name = match s.multiplicity {
                        1 => "singlets".to_string(),
                        2 => "doublets".into(),
                        3 => "triplets".into(),
                        4 => "quartets".into(),
                        5 => "quintets".into(),
                        6 => "sextets".into(),
                        m => format!("2S+1 = {m}"),
                    };
                    series.label(name).legend(move |(x, y)| {
                        PathElement::new(vec![(x, y), (x + 18, y)], color.stroke_width(3))
                    });
                }
                // Label the right end of levels that stay in view.
                if let Some(&e) = s.energies.last() {
                    if e.is_finite() && e <= ymax {
                        chart
                            .draw_series(std::iter::once(Text::new(
                                s.label.clone(),
                                (xmax, e),
                                ("sans-serif", 11).into_font().color(&color),
                            )))
                            .map_err(|e| e.to_string())?;
                    }
                }
            }
            if let Some(x) = self.crossover_delta_over_b {
                if x <= xmax {
                    chart
                        .draw_series(DashedLineSeries::new(
                            vec![(x, 0.0), (x, ymax)],
                            6,
                            4,
                            BLACK.stroke_width(1),
                        ))
                        .map_err(|e| e.to_string())?
                        .label(format!("crossover Δ/B = {}", fmt_num(x, 2)))
                        .legend(|(x, y)| {
                            PathElement::new(vec![(x, y), (x + 18, y)], BLACK.stroke_width(1))
                        });
                }
            }
            chart
                .configure_series_labels()
                .position(SeriesLabelPosition::UpperLeft)
                .background_style(WHITE.mix(0.85))
                .border_style(RGBColor(180, 180, 180))
                .draw()
                .map_err(|e| e.to_string())?;
            root.present().map_err(|e| e.to_string())?;
        }
        Ok(out)
    }
}

/// Colours by spin multiplicity (project palette).
fn spin_colour(multiplicity: i32) -> RGBColor {
    match multiplicity {
        1 => RGBColor(47, 72, 88),
        2 => RGBColor(27, 153, 139),
        3 => RGBColor(228, 87, 46),
        4 => RGBColor(123, 75, 148),
        5 => RGBColor(197, 157, 0),
        6 => RGBColor(176, 0, 58),
        _ => RGBColor(90, 90, 90),
    }
}
