//! Report of `spinstate magnetism`: χ, χT and μ_eff against temperature.

use super::{fmt_num, new_table};
use plotters::prelude::*;
use serde::Serialize;

/// One temperature point (cgs-emu units unless the report's `units` is "si").
#[derive(Debug, Clone, Serialize)]
pub struct MagnetismPoint {
    /// Temperature (K).
    pub t: f64,
    /// Powder-averaged molar susceptibility χ_M (cm³ mol⁻¹; m³ mol⁻¹ in SI).
    pub chi: f64,
    /// χ_M·T (cm³ K mol⁻¹; m³ K mol⁻¹ in SI).
    pub chi_t: f64,
    /// Effective moment μ_eff = 2.828 √(χT) (μB).
    pub mu_eff: f64,
    /// χ along x, y, z (cm³ mol⁻¹; m³ mol⁻¹ in SI).
    pub chi_axes: [f64; 3],
}

/// The whole `magnetism` report.
#[derive(Debug, Clone, Serialize)]
pub struct MagnetismReport {
    /// Unit system of χ and χT: "cgs" (cm³ mol⁻¹, default) or "si" (m³ mol⁻¹).
    pub units: String,
    pub dn: usize,
    pub geometry: String,
    /// Racah B, C and Dq (cm⁻¹).
    pub b: f64,
    pub c: f64,
    pub dq: f64,
    /// Spin–orbit constant used in the Hamiltonian (cm⁻¹, after any reduction by κ).
    pub zeta: f64,
    /// Orbital reduction factor κ.
    pub kappa: f64,
    /// Spin-free ground level, e.g. "4T1g (4F)".
    pub ground_level: String,
    /// Whether the spin-free ground level is an orbital triplet (first-order orbital moment).
    pub orbital_triplet_ground: bool,
    /// Spin-only moment 2√(S(S+1)) of the spin-free ground level (μB), for reference.
    pub spin_only_moment: f64,
    /// Spin-only χT = 0.125049·g²·S(S+1) with g = 2 (cm³ K mol⁻¹; m³ K mol⁻¹ in SI), for
    /// reference.
    pub spin_only_chi_t: f64,
    /// χ(T) points, evenly spaced from tmin to tmax.
    pub points: Vec<MagnetismPoint>,
    /// Where the values come from (which inputs were given, which derived).
    pub notes: Vec<String>,
}

impl MagnetismReport {
    /// A human table of at most `rows` evenly spaced points.
    pub fn to_table(&self, rows: usize) -> String {
        let (chi_unit, chi_t_unit) = if self.units == "si" {
            ("m³/mol", "m³ K/mol")
        } else {
            ("cm³/mol", "cm³ K/mol")
        };
        let mut t = new_table([
            "T (K)".to_string(),
            format!("χ_M ({chi_unit})"),
            format!("χ_M·T ({chi_t_unit})"),
            "μ_eff (μB)".to_string(),
        ]);
        let n = self.points.len();
        let step = n.div_ceil(rows.max(1)).max(1);
        let mut idx: Vec<usize> = (0..n).step_by(step).collect();
        if idx.last() != Some(&(n - 1)) {
            idx.push(n - 1);
        }
        for i in idx {
            let p = &self.points[i];
            t.add_row(vec![
                fmt_num(p.t, 1),
                format!("{:.4e}", p.chi),
                if self.units == "si" {
                    format!("{:.4e}", p.chi_t)
                } else {
                    fmt_num(p.chi_t, 4)
                },
                fmt_num(p.mu_eff, 3),
            ]);
        }
        let mut s = format!(
            "d{} {}: B = {}, C = {}, Δ = 10Dq = {} cm⁻¹, ζ = {} cm⁻¹, κ = {}\n\
             spin-free ground level {}{}; spin-only reference {} μB (χT {} {})\n{}\n",
            self.dn,
            self.geometry,
            fmt_num(self.b, 1),
            fmt_num(self.c, 1),
            fmt_num(10.0 * self.dq, 1),
            fmt_num(self.zeta, 1),
            fmt_num(self.kappa, 3),
            self.ground_level,
            if self.orbital_triplet_ground {
                " (orbital triplet: first-order orbital moment, μ_eff depends on T)"
            } else {
                ""
            },
            fmt_num(self.spin_only_moment, 3),
            if self.units == "si" {
                format!("{:.4e}", self.spin_only_chi_t)
            } else {
                fmt_num(self.spin_only_chi_t, 3)
            },
            chi_t_unit,
            t
        );
        for n in &self.notes {
            s.push_str(&format!("note: {n}\n"));
        }
        s
    }

    /// CSV of every point (full precision).
    pub fn to_csv(&self) -> String {
        let mut w = csv::Writer::from_writer(Vec::new());
        let si = self.units == "si";
        w.write_record([
            "t_k",
            if si {
                "chi_m3_per_mol"
            } else {
                "chi_cm3_per_mol"
            },
            if si {
                "chi_t_m3_k_per_mol"
            } else {
                "chi_t_cm3_k_per_mol"
            },
            "mu_eff_bohr",
            "chi_x",
            "chi_y",
            "chi_z",
        ])
        .expect("CSV to memory");
        for p in &self.points {
            w.write_record([
                p.t.to_string(),
                p.chi.to_string(),
                p.chi_t.to_string(),
                p.mu_eff.to_string(),
                p.chi_axes[0].to_string(),
                p.chi_axes[1].to_string(),
                p.chi_axes[2].to_string(),
            ])
            .expect("CSV to memory");
        }
        String::from_utf8(w.into_inner().expect("CSV to memory")).expect("UTF-8")
    }

    /// SVG of μ_eff against T with the spin-only value dashed.
    pub fn to_svg(&self) -> Result<String, String> {
        let mut out = String::new();
        {
            let root = SVGBackend::with_string(&mut out, (820, 560)).into_drawing_area();
            root.fill(&WHITE).map_err(|e| e.to_string())?;
            let tmin = self.points.first().map(|p| p.t).unwrap_or(0.0);
            let tmax = self
                .points
                .last()
                .map(|p| p.t)
                .unwrap_or(1.0)
                .max(tmin + 1e-9);
            let ymax = self
                .points
                .iter()
                .map(|p| p.mu_eff)
                .fold(self.spin_only_moment, f64::max)
                * 1.15
                + 0.1;
            let mut chart = ChartBuilder::on(&root)
                .caption(
                    format!("d{} {}: μ_eff against T", self.dn, self.geometry),
                    ("sans-serif", 20),
                )
                .margin(16)
                .x_label_area_size(44)
                .y_label_area_size(56)
                .build_cartesian_2d(0.0..tmax, 0.0..ymax)
                .map_err(|e| e.to_string())?;
            chart
                .configure_mesh()
                .x_desc("T (K)")
                .y_desc("μ_eff (μB)")
                .light_line_style(RGBColor(236, 236, 236))
                .draw()
                .map_err(|e| e.to_string())?;
            let line = RGBColor(123, 75, 148);
            chart
                .draw_series(LineSeries::new(
                    self.points.iter().map(|p| (p.t, p.mu_eff)),
                    line.stroke_width(2),
                ))
                .map_err(|e| e.to_string())?
                .label("ligand field + spin–orbit")
                .legend(move |(x, y)| {
                    PathElement::new(vec![(x, y), (x + 18, y)], line.stroke_width(2))
                });
            let so = self.spin_only_moment;
            chart
                .draw_series(DashedLineSeries::new(
                    vec![(0.0, so), (tmax, so)],
                    6,
                    4,
                    BLACK.stroke_width(1),
                ))
                .map_err(|e| e.to_string())?
                .label(format!("spin-only {:.2} μB", so))
                .legend(|(x, y)| {
                    PathElement::new(vec![(x, y), (x + 18, y)], BLACK.stroke_width(1))
                });
            chart
                .configure_series_labels()
                .position(SeriesLabelPosition::LowerRight)
                .background_style(WHITE.mix(0.85))
                .border_style(RGBColor(180, 180, 180))
                .draw()
                .map_err(|e| e.to_string())?;
            root.present().map_err(|e| e.to_string())?;
        }
        Ok(out)
    }
}
