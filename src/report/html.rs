//! One self-contained HTML page for `check` and `demo`: inline CSS and SVG only (no scripts, no
//! fetches), readable offline and laid out for A4 printing. Per sample: the complex and its
//! parameters, the verdict with its reasons and what to re-check, the evidence table, and the
//! figures (energy diagram with the sample, moments against T, bands against transitions). A
//! batch gets a summary table linking to each sample's section. The cautions are on the page.

use super::check::{CheckReport, RowErrorRow};
use super::figures::SampleFigures;
use super::fmt_num;
use crate::check::CheckResult;
use crate::plot::svg::escape;
use std::fmt::Write;

/// One sample's part of the page.
#[derive(Debug, Clone)]
pub struct Section {
    pub report: CheckReport,
    /// (parameter, value) rows, e.g. ("Δ (cm⁻¹)", "10 400 ± 1 000, estimated").
    pub parameters: Vec<(String, String)>,
    pub figures: SampleFigures,
}

/// The parameter rows of a checked complex (cm⁻¹ and ratios, with origin and 1σ).
pub fn parameter_rows(r: &CheckResult) -> Vec<(String, String)> {
    let c = r.complex();
    let param = |p: &crate::complex::Parameter| {
        let u = p.value * p.relative_uncertainty;
        if u > 0.0 {
            format!(
                "{} ± {} ({})",
                fmt_num(p.value, 0),
                fmt_num(u, 0),
                p.origin.name()
            )
        } else {
            format!("{} ({})", fmt_num(p.value, 0), p.origin.name())
        }
    };
    let mut rows = vec![
        ("complex".to_string(), c.formula()),
        ("ion".into(), format!("{}, d{}", c.ion.name(), c.ion.dn)),
        (
            "geometry".into(),
            format!("{} ({:?})", c.geometry.name(), c.point_group()),
        ),
        ("Δ of the ground state / cm⁻¹".into(), param(&c.delta)),
    ];
    if c.delta_high_spin.value != c.delta_low_spin.value {
        rows.push(("Δ_HS / cm⁻¹".into(), param(&c.delta_high_spin)));
        rows.push(("Δ_LS / cm⁻¹".into(), param(&c.delta_low_spin)));
    }
    rows.push(("B / cm⁻¹".into(), param(&c.b)));
    rows.push(("C / cm⁻¹".into(), param(&c.c)));
    rows.push((
        "Δ/B".into(),
        format!(
            "{} ± {}",
            fmt_num(c.delta_over_b(), 2),
            fmt_num(c.delta_over_b() * c.delta_over_b_uncertainty(), 2)
        ),
    ));
    rows.push((
        "crossover Δ/B".into(),
        c.crossover
            .delta_over_b
            .map_or("none (the ground spin cannot change)".into(), |x| {
                fmt_num(x, 2)
            }),
    ));
    rows.push((
        "predicted ground level".into(),
        format!(
            "{} ({})",
            r.prediction.ground.label(),
            crate::engine::Term::text_of(r.prediction.ground.parent)
        ),
    ));
    rows
}

const CSS: &str = r#"
:root { --ink: #1a1a1a; --muted: #5a5a5a; --rule: #c8c8c8; --accent: #1f3b73; }
* { box-sizing: border-box; }
body { font-family: "DejaVu Sans", Verdana, Arial, sans-serif; color: var(--ink); margin: 0 auto; max-width: 190mm; padding: 8mm; font-size: 10pt; line-height: 1.4; }
h1 { font-size: 16pt; margin: 0 0 2mm; } h2 { font-size: 13pt; margin: 8mm 0 2mm; border-bottom: 0.6pt solid var(--ink); padding-bottom: 1mm; }
h3 { font-size: 10.5pt; margin: 4mm 0 1mm; }
table { border-collapse: collapse; width: 100%; margin: 2mm 0; font-size: 9pt; }
th, td { border: 0.5pt solid var(--rule); padding: 1mm 1.6mm; text-align: left; vertical-align: top; }
th { background: #eef1f6; }
table.params { width: auto; } table.params th { font-weight: normal; color: var(--muted); background: none; }
.verdict { border: 1pt solid var(--accent); border-left-width: 4pt; padding: 2mm 3mm; margin: 3mm 0; }
.verdict strong { font-size: 11.5pt; }
.caution { border: 0.8pt solid #8c5a00; background: #fff8e6; padding: 2mm 3mm; margin: 3mm 0; font-size: 9pt; }
.figures { display: flex; flex-wrap: wrap; gap: 4mm; }
figure { margin: 0; break-inside: avoid; page-break-inside: avoid; }
figure svg { width: 85mm; max-width: 100%; height: auto; display: block; }
figcaption { font-size: 8.5pt; color: var(--muted); max-width: 85mm; }
.note { color: var(--muted); font-size: 9pt; }
a { color: var(--accent); }
@page { size: A4; margin: 12mm; }
@media print {
  body { padding: 0; max-width: none; font-size: 9.5pt; }
  section.sample { break-before: page; page-break-before: always; }
  section.sample:first-of-type { break-before: auto; page-break-before: auto; }
  table, .verdict, .caution { break-inside: avoid; page-break-inside: avoid; }
  a { color: var(--ink); text-decoration: none; }
  th { background: none; }
}
"#;

fn list(out: &mut String, items: &[String]) {
    out.push_str("<ul>\n");
    for i in items {
        let _ = writeln!(out, "<li>{}</li>", escape(i));
    }
    out.push_str("</ul>\n");
}

fn anchor(i: usize) -> String {
    format!("sample-{}", i + 1)
}

fn section(out: &mut String, i: usize, s: &Section) {
    let r = &s.report;
    let title = match &r.name {
        Some(n) => format!("{n}: {}", r.complex),
        None => r.complex.clone(),
    };
    let _ = writeln!(out, "<section class=\"sample\" id=\"{}\">", anchor(i));
    let _ = writeln!(out, "<h2>{}</h2>", escape(&title));
    out.push_str("<table class=\"params\">\n");
    for (k, v) in &s.parameters {
        let _ = writeln!(out, "<tr><th>{}</th><td>{}</td></tr>", escape(k), escape(v));
    }
    out.push_str("</table>\n");
    let _ = writeln!(
        out,
        "<div class=\"verdict\"><strong>Verdict: {}</strong> (confidence {}; the ligand-field estimate alone says {})",
        escape(&r.verdict),
        escape(&r.confidence),
        escape(&r.predicted_spin_state)
    );
    list(out, &r.reasons);
    if !r.recheck.is_empty() {
        out.push_str("<h3>What to re-check</h3>\n");
        list(out, &r.recheck);
    }
    out.push_str("</div>\n<h3>Evidence</h3>\n<table class=\"evidence\">\n<tr><th>evidence</th><th>predicted</th><th>measured</th><th>supports</th><th>strength</th><th><i>T</i> / K</th><th>why</th></tr>\n");
    for e in &r.evidence {
        let _ = writeln!(
            out,
            "<tr><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td></tr>",
            escape(&e.kind),
            escape(&e.predicted),
            escape(&e.measured),
            escape(&e.supports),
            escape(&e.strength),
            e.temperature_k.map_or("—".into(), |t| fmt_num(t, 0)),
            escape(&e.detail)
        );
    }
    out.push_str("</table>\n");
    if !r.cautions.is_empty() {
        out.push_str("<div class=\"caution\"><strong>Caution for this complex</strong>");
        list(out, &r.cautions);
        out.push_str("</div>\n");
    }
    out.push_str("<div class=\"figures\">\n");
    let fig = |out: &mut String, svg: &Option<String>, caption: &str, missing: &str| match svg {
        Some(svg) => {
            let _ = writeln!(
                out,
                "<figure>\n{svg}<figcaption>{}</figcaption>\n</figure>",
                escape(caption)
            );
        }
        None => {
            let _ = writeln!(out, "<p class=\"note\">{}</p>", escape(missing));
        }
    };
    fig(out, &s.figures.diagram, "Energy levels (E/B against Δ/B at the complex's C/B). Vertical line and band: the sample's Δ/B ± 1σ; triangles: each spin state's own Δ/B; arrows: spin-allowed transitions of the ground spin.", "");
    fig(
        out,
        &s.figures.moment,
        "Measured χ_M·T against T with the computed χ_M·T of the predicted spin state (full d^n levels with spin–orbit coupling at that state's Δ and the free-ion ζ, κ = 1; left out where the ion has no ζ or where one field at that Δ puts the other spin lowest) and the spin-only values of each spin state (g = 2).",
        "No magnetic measurement given: no moment figure.",
    );
    fig(out, &s.figures.bands, "Observed band maxima (top row) against the computed spin-allowed transitions of each spin state at its own Δ.", "No band maxima given: no band figure.");
    out.push_str("</div>\n</section>\n");
}

/// The whole page. `intro` (optional) is shown under the title; `safety` is the general caution.
pub fn page(
    title: &str,
    intro: Option<&str>,
    sections: &[Section],
    errors: &[RowErrorRow],
    safety: &str,
) -> String {
    let mut out = String::new();
    let _ = write!(
        out,
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n<title>{}</title>\n<style>{CSS}</style>\n</head>\n<body>\n<h1>{}</h1>\n",
        escape(title),
        escape(title)
    );
    if let Some(i) = intro {
        let _ = writeln!(out, "<p class=\"note\">{}</p>", escape(i));
    }
    let _ = writeln!(out, "<div class=\"caution\">{}</div>", escape(safety));
    if sections.len() > 1 || !errors.is_empty() {
        out.push_str("<h2>Summary</h2>\n<table class=\"summary\">\n<tr><th>sample</th><th>complex</th><th>Δ/B</th><th>crossover Δ/B</th><th>predicted</th><th>verdict</th><th>confidence</th></tr>\n");
        for (i, s) in sections.iter().enumerate() {
            let r = &s.report;
            let _ = writeln!(
                out,
                "<tr><td><a href=\"#{}\">{}</a></td><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td></tr>",
                anchor(i),
                escape(r.name.as_deref().unwrap_or("sample")),
                escape(&format!("{} {}", r.complex, r.ion)),
                fmt_num(r.delta_over_b, 1),
                r.crossover_delta_over_b.map_or("—".into(), |x| fmt_num(x, 1)),
                escape(&r.predicted_spin_state),
                escape(&r.verdict),
                escape(&r.confidence)
            );
        }
        for e in errors {
            let _ = writeln!(
                out,
                "<tr><td>{}</td><td colspan=\"6\">not checked (line {}, column {}): {}</td></tr>",
                escape(e.name.as_deref().unwrap_or("—")),
                e.row,
                escape(&e.column),
                escape(&e.message)
            );
        }
        out.push_str("</table>\n");
    }
    for (i, s) in sections.iter().enumerate() {
        section(&mut out, i, s);
    }
    out.push_str("<p class=\"note\">Written by spinstate. Figures follow ISO 80000-1 and the IUPAC Green Book for axis labels (quantity / unit) and are sized for an 8.5 cm journal column.</p>\n</body>\n</html>\n");
    out
}
