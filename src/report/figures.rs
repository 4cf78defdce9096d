//! The figures of one checked sample, as SVG text: its energy diagram with its own position, its
//! measured moments against T with both spin states' spin-only lines, and its observed bands
//! against the computed transitions of each spin state.

use super::diagram::DiagramReport;
use crate::check::{CheckInput, CheckResult, MomentQuantity};
use crate::engine::diagram;
use crate::error::Result;
use crate::magnetism::temperature_grid;
use crate::measured::evans::evans;
use crate::plot::energy::{energy_svg, EnergyOptions};
use crate::plot::marks;
use crate::plot::moment::{moment_svg, Curve, MomentFigure, Point, Quantity, Reference};
use crate::plot::sticks::{sticks_svg, Row};
use crate::plot::style::Column;
use crate::plot::text::formula_markup;
use crate::predict::moment_curve;
use crate::units;

/// SVG figures of one sample; None where the input has nothing to show.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct SampleFigures {
    pub diagram: Option<String>,
    pub moment: Option<String>,
    pub bands: Option<String>,
}

/// Points of the diagram along Δ/B (enough for smooth curves at print size).
const DIAGRAM_POINTS: usize = 121;

/// Temperatures of the model moment curve, 2 K to the highest measured (at least 300 K).
const MOMENT_POINTS: usize = 100;

/// Measured χ_M·T points (cm³ K mol⁻¹) of a check input: the Evans value, the magnetometer
/// value and every point of a χ_M·T(T) curve.
pub fn measured_chi_t(input: &CheckInput) -> Vec<Point> {
    let mut out = Vec::new();
    if let Some(e) = &input.evans {
        if let Ok(r) = evans(e) {
            out.push(Point {
                t: r.moment.temperature.value,
                y: r.moment.chi_m_t.value,
                err: Some(r.moment.chi_m_t.err),
            });
        }
    }
    if let Some(m) = &input.moment {
        let t = m.temperature;
        let (y, err) = match m.quantity {
            MomentQuantity::ChiMT => (m.value.value, m.value.err),
            MomentQuantity::ChiM => (
                (m.value.value - m.dia.value) * t,
                m.value.err.hypot(m.dia.err) * t,
            ),
            MomentQuantity::MuEff => {
                let chi_t =
                    units::chi_t_from_mu_eff(m.value.value, units::SusceptibilityUnits::Cgs);
                let err = if m.value.value > 0.0 {
                    2.0 * chi_t * m.value.err / m.value.value
                } else {
                    0.0
                };
                (chi_t, err)
            }
        };
        out.push(Point {
            t,
            y,
            err: Some(err),
        });
    }
    if let Some(c) = &input.curve {
        out.extend(c.points.iter().map(|p| Point {
            t: p.t,
            y: p.chi_t,
            err: p.err,
        }));
    }
    out
}

/// The figures of one sample, one journal column wide each.
pub fn sample_figures(input: &CheckInput, result: &CheckResult) -> Result<SampleFigures> {
    let p = &result.prediction;
    let c = &p.complex;
    let dn = c.ion.dn;
    let cb = c.c_over_b();
    let sample = marks::from_prediction(p);
    let max =
        40f64.max(((sample.delta_over_b + 1.5 * sample.uncertainty) * 1.25 / 5.0).ceil() * 5.0);
    let d = DiagramReport::from_engine(&diagram(dn, c.geometry, cb, max, DIAGRAM_POINTS)?);
    let highlight = marks::spin_highlights(dn, c.geometry, cb)?;
    let name = formula_markup(&c.formula());
    let diagram_svg = energy_svg(
        &d,
        Some(&sample),
        &EnergyOptions {
            column: Column::Single,
            title: format!("{name}: *B* = {:.0} cm⁻¹, *C*/*B* = {:.2}", c.b.value, cb),
            highlight: highlight.clone(),
        },
    );
    let measured = measured_chi_t(input);
    let moment = if measured.is_empty() {
        None
    } else {
        let references = highlight
            .iter()
            .map(|(m, kind)| {
                let n = f64::from(m - 1);
                Reference {
                    name: format!("*S* = {} ({kind})", super::magnetism::spin_text(m - 1)),
                    value: units::spin_only_chi_t_cgs(n),
                }
            })
            .collect();
        let tmax = measured
            .iter()
            .map(|q| q.t)
            .filter(|t| t.is_finite())
            .fold(300.0f64, f64::max);
        // A measured temperature outside the model's range leaves the curve out.
        let curve = match temperature_grid(2.0, tmax, MOMENT_POINTS) {
            Ok(grid) => moment_curve(p, &grid)?,
            Err(_) => None,
        };
        let curves = curve
            .map(|m| Curve {
                name: format!(
                    "model, *S* = {} (Δ = {}, *ζ* = {} cm⁻¹)",
                    super::magnetism::spin_text(m.two_s),
                    marks::wavenumber_text(m.delta),
                    super::fmt_num(m.zeta, 0)
                ),
                t: m.points.iter().map(|q| q.t).collect(),
                y: m.points.iter().map(|q| q.chi_t).collect(),
            })
            .into_iter()
            .collect();
        Some(moment_svg(
            &MomentFigure {
                title: format!("{name}: measured *χ*_{{M}}*T*"),
                quantity: Quantity::ChiT { si: false },
                curves,
                measured,
                measured_name: "measured (diamagnetism corrected)".into(),
                references,
            },
            Column::Single,
        ))
    };
    let bands = input.bands.as_ref().map(|b| {
        let mut rows = vec![Row {
            name: "observed".into(),
            sticks: b
                .maxima
                .iter()
                .map(|x| (*x, marks::wavenumber_text(*x).replace(" cm⁻¹", "")))
                .collect(),
            term_labels: false,
        }];
        let mut push = |name: &str, sb: &crate::predict::SpinBands| {
            rows.push(Row {
                name: name.into(),
                sticks: sb.bands.iter().map(|x| (x.energy, x.to.clone())).collect(),
                term_labels: true,
            });
        };
        if let Some(ls) = &p.bands_low_spin {
            push("HS computed", &p.bands_high_spin);
            push("LS computed", ls);
        } else {
            push("computed", &p.bands_high_spin);
        }
        sticks_svg(
            &format!("{name}: observed bands and spin-allowed transitions"),
            &rows,
            Column::Single,
        )
    });
    Ok(SampleFigures {
        diagram: Some(diagram_svg),
        moment,
        bands,
    })
}
