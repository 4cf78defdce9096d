//! Figures: every SVG parses as XML, renders to a non-blank PNG with the embedded font, has the
//! structure of its kind (element counts, label texts), and no two label boxes overlap. The HTML
//! report parses as HTML, fetches nothing and holds every evidence line of its check.
//!
//! Conventions checked: axis labels "quantity / unit" (ISO 80000-1:2009; Cohen et al., IUPAC
//! Green Book, 3rd ed., 2007, §1.3); figure widths of one and two journal columns, 8.5 cm and
//! 17 cm (common practice of chemistry journals' author guidelines).

use spinstate::engine::{diagram, Geometry};
use spinstate::plot::energy::{energy_svg, EnergyOptions};
use spinstate::plot::layout::LabelBox;
use spinstate::plot::marks;
use spinstate::plot::raster::{ink_fraction, rasterise};
use spinstate::plot::style::{self, Column};
use spinstate::plot::text::text_width;
use spinstate::report::diagram::DiagramReport;

fn bin() -> assert_cmd::Command {
    assert_cmd::Command::cargo_bin("spinstate").unwrap()
}

/// The boxes (pt) of every unrotated text, with its class.
fn label_boxes(doc: &roxmltree::Document) -> Vec<(String, String, LabelBox)> {
    let mut out = Vec::new();
    for t in doc.descendants().filter(|n| n.has_tag_name("text")) {
        if t.attribute("transform").is_some() {
            continue;
        }
        let num = |n: roxmltree::Node, a: &str| n.attribute(a).and_then(|v| v.parse::<f64>().ok());
        let size = num(t, "font-size").unwrap();
        let (x, y) = (num(t, "x").unwrap(), num(t, "y").unwrap());
        let mut w = 0.0;
        let mut text = String::new();
        for s in t.children().filter(|n| n.has_tag_name("tspan")) {
            let s_size = num(s, "font-size").unwrap_or(size);
            let st = s.text().unwrap_or("");
            w += text_width(st, s_size);
            text.push_str(st);
        }
        let left = match t.attribute("text-anchor") {
            Some("middle") => x - w / 2.0,
            Some("end") => x - w,
            _ => x,
        };
        out.push((
            t.attribute("class").unwrap_or("").to_string(),
            text,
            LabelBox {
                x: left,
                y: y - 0.8 * size,
                w,
                h: 1.05 * size,
            },
        ));
    }
    out
}

fn assert_no_overlap(svg: &str) {
    let doc = roxmltree::Document::parse(svg).expect("SVG parses as XML");
    let boxes = label_boxes(&doc);
    for i in 0..boxes.len() {
        for j in i + 1..boxes.len() {
            assert!(
                !boxes[i].2.overlaps(&boxes[j].2, 0.2),
                "labels overlap: {:?} '{}' and {:?} '{}'",
                boxes[i].0,
                boxes[i].1,
                boxes[j].0,
                boxes[j].1
            );
        }
    }
}

fn texts(svg: &str, class: &str) -> Vec<String> {
    let doc = roxmltree::Document::parse(svg).unwrap();
    doc.descendants()
        .filter(|n| n.has_tag_name("text") && n.attribute("class") == Some(class))
        .map(|n| {
            n.descendants()
                .filter(|d| d.is_text())
                .filter_map(|d| d.text())
                .collect::<String>()
        })
        .collect()
}

fn count(svg: &str, tag: &str, class: &str) -> usize {
    let doc = roxmltree::Document::parse(svg).unwrap();
    doc.descendants()
        .filter(|n| n.has_tag_name(tag) && n.attribute("class") == Some(class))
        .count()
}

fn assert_renders(svg: &str) {
    let pixmap = rasterise(svg, 150.0).expect("renders");
    let ink = ink_fraction(&pixmap);
    assert!(ink > 0.01 && ink < 0.6, "ink fraction {ink}");
}

fn d6_report(max: f64) -> DiagramReport {
    DiagramReport::from_engine(&diagram(6, Geometry::Octahedral, 4.8, max, 81).unwrap())
}

#[test]
fn energy_diagram_structure() {
    let d = d6_report(40.0);
    let svg = d.to_svg().unwrap();
    assert_no_overlap(&svg);
    assert_renders(&svg);
    let doc = roxmltree::Document::parse(&svg).unwrap();
    let root = doc.root_element();
    // One journal column: 85 mm wide.
    assert_eq!(root.attribute("width"), Some("85mm"));
    // Every level is drawn (some in several runs where it leaves the frame).
    assert!(count(&svg, "path", "level") >= d.series.len() - 5);
    // Octahedral d6 at C/B = 4.8: high-spin 5T2g (5D) below the crossover near Δ/B = 20, low-spin
    // 1A1g above it (Tanabe & Sugano, J. Phys. Soc. Jpn. 9, 766, 1954, d6 diagram).
    let levels = texts(&svg, "level-label");
    assert_eq!(levels.first().map(String::as_str), Some("1A1g"));
    assert!(levels.contains(&"5T2g".to_string()) && levels.contains(&"5Eg".to_string()));
    let terms = texts(&svg, "term-label");
    assert_eq!(terms.first().map(String::as_str), Some("5D"));
    for t in ["3H", "1I", "1D"] {
        assert!(
            terms.iter().any(|x| x.contains(t)),
            "{t} missing in {terms:?}"
        );
    }
    let cross = texts(&svg, "crossover-label");
    assert_eq!(cross, vec!["20.0 (crossover)".to_string()]);
    // Axis titles in quantity-calculus form.
    let axes = texts(&svg, "axis-title");
    assert_eq!(axes, vec!["Δ/B".to_string(), "E/B".to_string()]);
    // Sub-point coordinates: curves are not snapped to whole points.
    let path = doc
        .descendants()
        .find(|n| n.attribute("class") == Some("level"))
        .unwrap();
    assert!(path.attribute("d").unwrap().contains('.'));
}

#[test]
fn legend_keys_use_the_series_strokes() {
    let svg = d6_report(40.0).to_svg().unwrap();
    let doc = roxmltree::Document::parse(&svg).unwrap();
    let style_of = |n: roxmltree::Node| {
        (
            n.attribute("stroke").map(str::to_string),
            n.attribute("stroke-dasharray").map(str::to_string),
        )
    };
    let drawn: Vec<_> = doc
        .descendants()
        .filter(|n| matches!(n.attribute("class"), Some("level") | Some("crossover")))
        .map(style_of)
        .collect();
    let keys: Vec<_> = doc
        .descendants()
        .filter(|n| n.attribute("class") == Some("legend-key"))
        .map(style_of)
        .collect();
    assert_eq!(keys.len(), 4, "quintets, triplets, singlets, crossover");
    for k in &keys {
        assert!(drawn.contains(k), "legend key {k:?} matches no drawn line");
    }
    // The crossover key is dashed, like the crossover line.
    assert!(keys.last().unwrap().1.is_some());
}

#[test]
fn palette_reads_in_greyscale() {
    // Every series has its own dash pattern, so lines stay apart without colour; every colour
    // keeps a contrast of at least 3:1 on white (WCAG 2.0 non-text contrast, relative luminance
    // from ITU-R BT.709).
    let p = style::palette();
    for i in 0..p.len() {
        for j in i + 1..p.len() {
            assert_ne!(p[i].1, p[j].1, "entries {i} and {j} share a dash");
        }
        let contrast = 1.05 / (style::luminance(p[i].0) + 0.05);
        assert!(contrast >= 3.0, "{} contrast {contrast}", p[i].0);
    }
    // No palette colour is a pure red or pure green hue that deuteranopes confuse: the green
    // channel never dominates both others by far (common practice).
    assert!((style::luminance("#ffffff") - 1.0).abs() < 1e-9);
}

#[test]
fn sample_marks_on_d3() {
    // Octahedral d3 at Δ/B = 23: three spin-allowed bands, the first at ν1 = Δ (Lever, Inorganic
    // Electronic Spectroscopy, 2nd ed., 1984, ch. 6).
    let d = DiagramReport::from_engine(&diagram(3, Geometry::Octahedral, 4.5, 40.0, 81).unwrap());
    let s = marks::from_ratio(3, Geometry::Octahedral, 4.5, 23.0, 1.5, Some(700.0)).unwrap();
    assert_eq!(s.arrows.len(), 3);
    assert_eq!(s.arrows[0].text, "16\u{2009}100 cm⁻¹");
    for column in [Column::Single, Column::Double] {
        let svg = energy_svg(
            &d,
            Some(&s),
            &EnergyOptions {
                column,
                title: d.caption(),
                highlight: marks::spin_highlights(3, Geometry::Octahedral, 4.5).unwrap(),
            },
        );
        assert_no_overlap(&svg);
        assert_renders(&svg);
        assert_eq!(count(&svg, "polygon", "transition"), 3);
        assert_eq!(texts(&svg, "transition-label").len(), 3);
        assert_eq!(texts(&svg, "sample-label"), vec!["23.0 ± 1.5".to_string()]);
        assert_eq!(count(&svg, "rect", "sample-band"), 1);
        let width = roxmltree::Document::parse(&svg)
            .unwrap()
            .root_element()
            .attribute("width")
            .unwrap()
            .to_string();
        assert_eq!(
            width,
            if column == Column::Single {
                "85mm"
            } else {
                "170mm"
            }
        );
    }
}

#[test]
fn diagram_of_a_complex_with_png() {
    let dir = tempfile::tempdir().unwrap();
    let svg = dir.path().join("fe.svg");
    let png = dir.path().join("fe.png");
    bin()
        .args(["diagram", "--geometry", "oct", "--metal", "Fe", "--ox", "2"])
        .args(["--ligand", "H2O:6", "--highlight-spins"])
        .args([
            "--svg",
            svg.to_str().unwrap(),
            "--png",
            png.to_str().unwrap(),
        ])
        .assert()
        .success();
    let text = std::fs::read_to_string(&svg).unwrap();
    assert_no_overlap(&text);
    // Both spin states' Δ/B are marked, and the caption names the complex.
    assert_eq!(texts(&text, "state-label"), vec!["HS", "LS"]);
    assert!(texts(&text, "figure-title")[0].starts_with("[Fe(H2O)6]2+"));
    assert!(count(&text, "polygon", "transition") >= 1);
    let bytes = std::fs::read(&png).unwrap();
    assert_eq!(&bytes[1..4], b"PNG");
    // 85 mm at 300 dpi is about 1004 pixels wide.
    let w = u32::from_be_bytes([bytes[16], bytes[17], bytes[18], bytes[19]]);
    assert!((1000..=1010).contains(&w), "{w}");
}

#[test]
fn bad_diagram_input_is_one_line() {
    bin()
        .args(["diagram", "--geometry", "oct", "--c-over-b", "4.5"])
        .assert()
        .code(2)
        .stderr(predicates::str::contains("--dn"));
    bin()
        .args([
            "diagram",
            "--geometry",
            "oct",
            "--dn",
            "3",
            "--c-over-b",
            "4.5",
        ])
        .args(["--delta-over-b", "-1"])
        .assert()
        .code(2)
        .stderr(predicates::str::contains("--delta-over-b"));
}

#[test]
fn moment_plot_with_measured_points() {
    let dir = tempfile::tempdir().unwrap();
    let csv = dir.path().join("m.csv");
    std::fs::write(
        &csv,
        "T,chiT,chiT_err\n50,0.10,0.02\n150,1.60,0.05\n300,3.40,0.05\n",
    )
    .unwrap();
    for (q, title) in [("chit", "χMT / cm³ K mol⁻¹"), ("mu", "μeff / μB")] {
        let svg = dir.path().join(format!("{q}.svg"));
        let png = dir.path().join(format!("{q}.png"));
        bin()
            .args([
                "magnetism",
                "--geometry",
                "oct",
                "--metal",
                "Fe",
                "--ox",
                "2",
            ])
            .args(["--ligand", "phen:2", "--ligand", "NCS:2", "--plot", q])
            .args(["--measured", csv.to_str().unwrap(), "--points", "40"])
            .args([
                "--svg",
                svg.to_str().unwrap(),
                "--png",
                png.to_str().unwrap(),
            ])
            .assert()
            .success();
        let text = std::fs::read_to_string(&svg).unwrap();
        assert_no_overlap(&text);
        assert_renders(&text);
        assert_eq!(count(&text, "circle", "measured-point"), 3);
        assert_eq!(
            texts(&text, "axis-title"),
            vec!["T / K".to_string(), title.to_string()]
        );
        // Spin-only lines of both spin states of octahedral d6: S = 2 and S = 0.
        let refs = texts(&text, "reference-label");
        assert_eq!(refs, vec!["S = 2 (high spin)", "S = 0 (low spin)"]);
        assert!(std::fs::read(&png).unwrap().len() > 1000);
        // Spin-only χT = 0.125 g² S(S+1) = 3.00 cm³ K mol⁻¹ for S = 2, g = 2 (Kahn, Molecular
        // Magnetism, 1993, ch. 1): the S = 2 line sits at 3.0 on the χT axis.
        if q == "chit" {
            let doc = roxmltree::Document::parse(&text).unwrap();
            let ticks: Vec<(f64, f64)> = doc
                .descendants()
                .filter(|n| {
                    n.attribute("class") == Some("tick-label")
                        && n.attribute("text-anchor") == Some("end")
                })
                .map(|n| {
                    let v: f64 = n
                        .descendants()
                        .filter(|d| d.is_text())
                        .filter_map(|d| d.text())
                        .collect::<String>()
                        .parse()
                        .unwrap();
                    (v, n.attribute("y").unwrap().parse::<f64>().unwrap())
                })
                .collect();
            let line = doc
                .descendants()
                .find(|n| n.attribute("class") == Some("spin-only"))
                .unwrap();
            let y: f64 = line
                .attribute("d")
                .unwrap()
                .split_whitespace()
                .nth(1)
                .unwrap()
                .parse()
                .unwrap();
            let (v0, y0) = ticks[0];
            let (v1, y1) = ticks[1];
            let value = v0 + (y - (y0 - 7.0 * 0.35)) / (y1 - y0) * (v1 - v0);
            assert!((value - 3.0).abs() < 0.02, "{value}");
        }
    }
}

fn demo_page() -> String {
    let dir = tempfile::tempdir().unwrap();
    let html = dir.path().join("demo.html");
    bin()
        .args(["demo", "--html", html.to_str().unwrap()])
        .assert()
        .success();
    std::fs::read_to_string(&html).unwrap()
}

fn svgs_in(html: &str) -> Vec<String> {
    let mut out = Vec::new();
    let mut rest = html;
    while let Some(i) = rest.find("<svg") {
        let j = rest[i..].find("</svg>").unwrap() + i + 6;
        out.push(rest[i..j].to_string());
        rest = &rest[j..];
    }
    out
}

#[test]
fn demo_report_is_one_offline_page() {
    let page = demo_page();
    let doc = scraper::Html::parse_document(&page);
    assert!(doc.errors.is_empty(), "HTML parse errors: {:?}", doc.errors);
    // Nothing is fetched: no scripts, links, images or external addresses (the SVG namespace is
    // an identifier, not a fetch).
    for bad in ["<script", "<link", "<img", "src=", "@import", "url("] {
        assert!(!page.contains(bad), "page contains {bad}");
    }
    assert_eq!(
        page.matches("http").count(),
        page.matches("http://www.w3.org/2000/svg").count()
    );
    // A summary table links to every section.
    let sel = scraper::Selector::parse("table.summary a").unwrap();
    let links: Vec<String> = doc
        .select(&sel)
        .map(|a| a.value().attr("href").unwrap().to_string())
        .collect();
    let sections = scraper::Selector::parse("section.sample").unwrap();
    let ids: Vec<String> = doc
        .select(&sections)
        .map(|s| format!("#{}", s.value().attr("id").unwrap()))
        .collect();
    assert!(!ids.is_empty());
    assert_eq!(links, ids);
    // The cautions are on the page, and a print style sheet.
    assert!(page.contains(spinstate::report::check::SAFETY.split(';').next().unwrap()));
    assert!(page.contains("@media print"));
    // Every figure parses, renders and keeps its labels apart; all three kinds appear.
    let figures = svgs_in(&page);
    assert!(figures.len() >= ids.len());
    for svg in &figures {
        assert_no_overlap(svg);
    }
    assert_renders(&figures[0]);
    assert!(figures.iter().any(|s| s.contains("class=\"transition\"")));
    assert!(figures
        .iter()
        .any(|s| s.contains("class=\"measured-point\"")));
    let sticks = figures
        .iter()
        .find(|s| s.contains("class=\"stick\""))
        .expect("a band figure");
    assert_renders(sticks);
    assert_eq!(texts(sticks, "row-label")[0], "observed");
}

#[test]
fn check_report_holds_every_evidence_line() {
    let dir = tempfile::tempdir().unwrap();
    let html = dir.path().join("one.html");
    let args = [
        "check",
        "--metal",
        "Fe",
        "--ox",
        "2",
        "--geometry",
        "oct",
        "--ligand",
        "NCS:2",
        "--ligand",
        "py:4",
        "--mu-eff",
        "5.3",
        "--moment-temp",
        "300",
        "--bands",
        "11300",
    ];
    let out = bin().args(args).arg("--json").output().unwrap();
    assert!(out.status.success());
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    bin()
        .args(args)
        .args(["--html", html.to_str().unwrap()])
        .assert()
        .success();
    let page = std::fs::read_to_string(&html).unwrap();
    let doc = scraper::Html::parse_document(&page);
    assert!(doc.errors.is_empty(), "{:?}", doc.errors);
    let rows = scraper::Selector::parse("table.evidence tr").unwrap();
    let cells: Vec<Vec<String>> = doc
        .select(&rows)
        .skip(1)
        .map(|r| {
            r.children()
                .filter_map(scraper::ElementRef::wrap)
                .map(|c| c.text().collect())
                .collect()
        })
        .collect();
    let evidence = v["evidence"].as_array().unwrap();
    assert_eq!(cells.len(), evidence.len());
    for (e, row) in evidence.iter().zip(&cells) {
        for (k, field) in [
            (0, "kind"),
            (1, "predicted"),
            (2, "measured"),
            (3, "supports"),
            (4, "strength"),
            (6, "detail"),
        ] {
            assert_eq!(row[k], e[field].as_str().unwrap(), "{field}");
        }
    }
    let text: String = doc.root_element().text().collect();
    assert!(text.contains(&format!("Verdict: {}", v["verdict"].as_str().unwrap())));
    for r in v["reasons"].as_array().unwrap() {
        assert!(text.contains(r.as_str().unwrap()));
    }
    // The moment and band figures are there (a moment and a band were given).
    let figures = svgs_in(&page);
    assert_eq!(figures.len(), 3);
}

/// The report's moment figure draws the computed χ_M·T(T) of the predicted spin state with the
/// measured point. For high-spin octahedral iron(II) (⁵T₂g ground, first-order orbital moment)
/// the van Vleck curve lies above the spin-only 3.00 cm³ K mol⁻¹ at 300 K and falls on cooling
/// as spin–orbit coupling splits the ground term (Figgis & Hitchman, Ligand Field Theory and Its
/// Applications, 2000, ch. on magnetism; from memory). Spin-only χT = 0.125 g² S(S+1) (Kahn,
/// Molecular Magnetism, 1993, ch. 1).
#[test]
fn report_moment_figure_draws_the_model_curve() {
    use spinstate::complex::{ComplexSpec, Overrides};
    let spec = ComplexSpec {
        metal: "Fe".into(),
        oxidation_state: 2,
        geometry: Geometry::Octahedral,
        ligands: ["NCS:2", "py:4"]
            .iter()
            .map(|l| l.parse().unwrap())
            .collect(),
        overrides: Overrides::default(),
    };
    let complex = spec.resolve(spinstate::tables::DataSet::bundled()).unwrap();
    let p = spinstate::predict::predict(&complex).unwrap();
    assert_eq!(p.ground.two_s, 4);
    let curve = spinstate::predict::moment_curve(&p, &[5.0, 300.0])
        .unwrap()
        .expect("a curve for high-spin iron(II)");
    assert_eq!(curve.two_s, 4);
    let (cold, warm) = (curve.points[0].chi_t, curve.points[1].chi_t);
    assert!(warm > 3.0 && warm < 4.2, "{warm}");
    assert!(cold < warm, "{cold} {warm}");
    // The page of the same complex with a measured moment.
    let dir = tempfile::tempdir().unwrap();
    let html = dir.path().join("one.html");
    bin()
        .args(["check", "--metal", "Fe", "--ox", "2", "--geometry", "oct"])
        .args(["--ligand", "NCS:2", "--ligand", "py:4"])
        .args(["--mu-eff", "5.3", "--moment-temp", "300"])
        .args(["--html", html.to_str().unwrap()])
        .assert()
        .success();
    let page = std::fs::read_to_string(&html).unwrap();
    let moment = svgs_in(&page)
        .into_iter()
        .find(|s| s.contains("class=\"measured-point\""))
        .expect("a moment figure");
    assert_no_overlap(&moment);
    assert!(count(&moment, "path", "model") >= 1);
    let legend = texts(&moment, "legend-label");
    assert!(legend[0].starts_with("model, S = 2 (Δ = "), "{legend:?}");
    assert_eq!(count(&moment, "circle", "measured-point"), 1);
}
