//! Report of `spinstate magnetism`: χ, χT and μ_eff against temperature.

use super::Render;
use super::{fmt_num, new_table};
use crate::plot::moment::{moment_svg, Curve, MomentFigure, Point, Quantity, Reference};
use crate::plot::style::Column;
use crate::units;
use serde::Serialize;

/// One temperature point (cgs-emu units unless the report's `units` is "si").
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
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
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct MagnetismReport {
    /// Unit system of χ and χT: "cgs" (cm³ mol⁻¹, default) or "si" (m³ mol⁻¹).
    pub units: String,
    /// Number of d electrons.
    pub dn: usize,
    pub geometry: String,
    /// Racah B (cm⁻¹).
    pub b: f64,
    /// Racah C (cm⁻¹).
    pub c: f64,
    /// Dq (cm⁻¹).
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

/// Points shown in the human table.
pub const TABLE_ROWS: usize = 16;

impl MagnetismReport {
    /// A human table of at most `rows` evenly spaced points.
    pub fn table_of(&self, rows: usize) -> String {
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

    /// The figure: μ_eff against T with the spin-only value of the ground level.
    pub fn to_svg(&self) -> Result<String, String> {
        Ok(self.to_svg_with(&MomentPlot {
            quantity: Quantity::Mu,
            spin_states: Vec::new(),
            measured: Vec::new(),
            measured_name: String::new(),
            column: Column::Single,
            title: None,
        }))
    }

    /// The figure of χ_M·T or μ_eff against T with the spin-only lines of the given spin states
    /// (2S, name) and measured points (in the figure's quantity).
    pub fn to_svg_with(&self, p: &MomentPlot) -> String {
        let si = self.units == "si";
        let value = |chi_t: f64, mu: f64| match p.quantity {
            Quantity::Mu => mu,
            Quantity::ChiT { .. } => chi_t,
        };
        let curve = Curve {
            name: format!(
                "model (*κ* = {}, *ζ* = {:.0} cm⁻¹)",
                fmt_num(self.kappa, 2),
                self.zeta
            ),
            t: self.points.iter().map(|q| q.t).collect(),
            y: self
                .points
                .iter()
                .map(|q| value(q.chi_t, q.mu_eff))
                .collect(),
        };
        let mut states = p.spin_states.clone();
        if states.is_empty() {
            states.push((
                units::unpaired_from_moment(self.spin_only_moment).round() as i32,
                "ground level".into(),
            ));
        }
        let units = if si {
            units::SusceptibilityUnits::Si
        } else {
            units::SusceptibilityUnits::Cgs
        };
        let references = states
            .iter()
            .map(|(two_s, name)| {
                let n = f64::from(*two_s);
                Reference {
                    name: format!("*S* = {} ({name})", spin_text(*two_s)),
                    value: value(
                        units.from_cgs(units::spin_only_chi_t_cgs(n)),
                        units::spin_only_moment(n),
                    ),
                }
            })
            .collect();
        let title = p.title.clone().unwrap_or_else(|| {
            format!(
                "d^{{{}}} {}, *B* = {:.0} cm⁻¹, *Dq* = {:.0} cm⁻¹",
                self.dn, self.geometry, self.b, self.dq
            )
        });
        moment_svg(
            &MomentFigure {
                title,
                quantity: match p.quantity {
                    Quantity::ChiT { .. } => Quantity::ChiT { si },
                    q => q,
                },
                curves: vec![curve],
                measured: p.measured.clone(),
                measured_name: p.measured_name.clone(),
                references,
            },
            p.column,
        )
    }
}

impl Render for MagnetismReport {
    type Figure = MomentPlot;

    /// At most [`TABLE_ROWS`] evenly spaced points (the CSV and JSON hold them all).
    fn table(&self) -> String {
        self.table_of(TABLE_ROWS)
    }

    /// CSV of every point (full precision).
    fn csv(&self) -> Option<String> {
        Some({
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
        })
    }

    fn svg(&self, plot: &MomentPlot) -> Option<String> {
        Some(self.to_svg_with(plot))
    }
}

/// What the moment figure shows besides the model curve.
#[derive(Debug, Clone, PartialEq)]
pub struct MomentPlot {
    pub quantity: Quantity,
    /// Spin states for spin-only lines: (2S, name such as "high spin").
    pub spin_states: Vec<(i32, String)>,
    /// Measured points in the figure's quantity (and the report's unit system).
    pub measured: Vec<Point>,
    pub measured_name: String,
    pub column: Column,
    /// Caption; None for d^n, geometry and parameters.
    pub title: Option<String>,
}

/// S as text from 2S: "2", "3/2".
pub fn spin_text(two_s: i32) -> String {
    if two_s % 2 == 0 {
        format!("{}", two_s / 2)
    } else {
        format!("{two_s}/2")
    }
}
