//! Rich text for figure labels: italic quantity symbols, subscripts and superscripts, and a
//! width measure from the embedded font's advance widths (used to keep label boxes apart).
//!
//! Markup (kept deliberately tiny): `*x*` italic, `_{..}` subscript, `^{..}` superscript.
//! Typography follows ISO 80000-1 and the IUPAC Green Book (Cohen et al., *Quantities, Units and
//! Symbols in Physical Chemistry*, 3rd ed., 2007): quantity symbols italic, units and Mulliken
//! labels upright, axis labels as "quantity / unit".

use skrifa::instance::{LocationRef, Size};
use skrifa::{FontRef, MetadataProvider};
use std::sync::OnceLock;

/// How one run of text is set.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Script {
    Normal,
    Italic,
    Sub,
    Sup,
}

/// One run of text.
#[derive(Debug, Clone, PartialEq)]
pub struct Span {
    pub text: String,
    pub script: Script,
}

/// A label made of runs.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Rich {
    pub spans: Vec<Span>,
}

/// Size of sub- and superscripts relative to the main text.
pub const SCRIPT_SCALE: f64 = 0.7;

impl Rich {
    /// Parses the markup described in the module docs. Unbalanced markup is kept as text.
    pub fn parse(markup: &str) -> Rich {
        let mut spans: Vec<Span> = Vec::new();
        let mut buf = String::new();
        let mut italic = false;
        let chars: Vec<char> = markup.chars().collect();
        let mut i = 0;
        let flush = |buf: &mut String, spans: &mut Vec<Span>, script: Script| {
            if !buf.is_empty() {
                spans.push(Span {
                    text: std::mem::take(buf),
                    script,
                });
            }
        };
        while i < chars.len() {
            let c = chars[i];
            let here = if italic {
                Script::Italic
            } else {
                Script::Normal
            };
            if c == '*' {
                flush(&mut buf, &mut spans, here);
                italic = !italic;
                i += 1;
            } else if (c == '_' || c == '^') && chars.get(i + 1) == Some(&'{') {
                if let Some(end) = chars[i + 2..].iter().position(|&x| x == '}') {
                    flush(&mut buf, &mut spans, here);
                    let inner: String = chars[i + 2..i + 2 + end].iter().collect();
                    spans.push(Span {
                        text: inner,
                        script: if c == '_' { Script::Sub } else { Script::Sup },
                    });
                    i += end + 3;
                } else {
                    buf.push(c);
                    i += 1;
                }
            } else {
                buf.push(c);
                i += 1;
            }
        }
        let last = if italic {
            Script::Italic
        } else {
            Script::Normal
        };
        flush(&mut buf, &mut spans, last);
        Rich { spans }
    }

    /// Plain text of all runs (what a reader or a search finds).
    pub fn plain(&self) -> String {
        self.spans.iter().map(|s| s.text.as_str()).collect()
    }

    /// Width (pt) at font size `size` (pt), measured with the embedded font.
    pub fn width(&self, size: f64) -> f64 {
        self.spans
            .iter()
            .map(|s| match s.script {
                Script::Sub | Script::Sup => text_width(&s.text, size * SCRIPT_SCALE),
                _ => text_width(&s.text, size),
            })
            .sum()
    }
}

/// A Mulliken or term label with its multiplicity as a left superscript: "4T1g" → ⁴T₁g, "2E" →
/// ²E, "3F" → ³F. The first letter after the digits stays on the line; what follows is set as a
/// subscript (irreducible representations) unless it is a term's extra text.
pub fn term_label(label: &str) -> Rich {
    let digits: String = label.chars().take_while(|c| c.is_ascii_digit()).collect();
    let rest = &label[digits.len()..];
    let mut spans = Vec::new();
    if !digits.is_empty() {
        spans.push(Span {
            text: digits,
            script: Script::Sup,
        });
    }
    let mut chars = rest.chars();
    if let Some(first) = chars.next() {
        spans.push(Span {
            text: first.to_string(),
            script: Script::Normal,
        });
        let tail: String = chars.collect();
        if !tail.is_empty() {
            spans.push(Span {
                text: tail,
                script: Script::Sub,
            });
        }
    }
    Rich { spans }
}

/// A chemical formula in the markup: counts after an element or a bracket as subscripts, the
/// charge after the closing bracket as a superscript ("[Fe(H2O)6]2+" → [Fe(H₂O)₆]²⁺).
pub fn formula_markup(formula: &str) -> String {
    let (body, charge) = match formula.rfind(']') {
        Some(i) if i + 1 < formula.len() => (&formula[..=i], &formula[i + 1..]),
        _ => (formula, ""),
    };
    let mut out = String::new();
    let mut prev_alnum = false;
    let mut in_sub = false;
    for c in body.chars() {
        if c.is_ascii_digit() && prev_alnum {
            if !in_sub {
                out.push_str("_{");
                in_sub = true;
            }
            out.push(c);
            continue;
        }
        if in_sub {
            out.push('}');
            in_sub = false;
        }
        prev_alnum = c.is_ascii_alphabetic() || c == ')';
        out.push(c);
    }
    if in_sub {
        out.push('}');
    }
    if !charge.is_empty() {
        out.push_str(&format!("^{{{}}}", charge.replace('-', "−")));
    }
    out
}

/// The embedded font (DejaVu Sans, Bitstream Vera licence), used for measuring and rasterising.
pub fn font_regular() -> &'static [u8] {
    dejavu::sans::regular()
}

/// Family name written into every SVG, with generic fall-backs for viewers without it.
pub const FONT_FAMILY: &str = "DejaVu Sans, Verdana, Arial, sans-serif";

struct Widths {
    per_char: std::collections::HashMap<char, f64>,
    fallback: f64,
}

fn widths() -> &'static Widths {
    static W: OnceLock<Widths> = OnceLock::new();
    W.get_or_init(|| {
        let mut per_char = std::collections::HashMap::new();
        let mut fallback = 0.6;
        if let Ok(font) = FontRef::new(font_regular()) {
            let upem = f64::from(
                font.metrics(Size::unscaled(), LocationRef::default())
                    .units_per_em,
            );
            let charmap = font.charmap();
            let gm = font.glyph_metrics(Size::unscaled(), LocationRef::default());
            let mut sum = 0.0;
            let mut n = 0.0;
            for (cp, gid) in charmap.mappings() {
                if let (Some(c), Some(adv)) = (char::from_u32(cp), gm.advance_width(gid)) {
                    let w = f64::from(adv) / upem;
                    per_char.insert(c, w);
                    if c.is_ascii_alphanumeric() {
                        sum += w;
                        n += 1.0;
                    }
                }
            }
            if n > 0.0 {
                fallback = sum / n;
            }
        }
        Widths { per_char, fallback }
    })
}

/// Advance width (pt) of plain text at font size `size` (pt) in the embedded font. DejaVu Sans is
/// wider than most sans-serif faces, so boxes measured with it are generous in other viewers.
pub fn text_width(text: &str, size: f64) -> f64 {
    let w = widths();
    text.chars()
        .map(|c| w.per_char.get(&c).copied().unwrap_or(w.fallback))
        .sum::<f64>()
        * size
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn markup_runs() {
        let r = Rich::parse("*χ*_{M}·*T* / cm³ K mol⁻¹");
        // χ (italic), M (subscript), · (upright), T (italic), the unit (upright).
        assert_eq!(r.spans.len(), 5);
        assert_eq!(r.spans[0].script, Script::Italic);
        assert_eq!(r.spans[1].script, Script::Sub);
        assert_eq!(r.spans[2].script, Script::Normal);
        assert_eq!(r.spans[3].script, Script::Italic);
        assert_eq!(r.plain(), "χM·T / cm³ K mol⁻¹");
    }

    #[test]
    fn formulas() {
        assert_eq!(formula_markup("[Fe(H2O)6]2+"), "[Fe(H_{2}O)_{6}]^{2+}");
        assert_eq!(formula_markup("[CoCl4]2-"), "[CoCl_{4}]^{2−}");
        assert_eq!(formula_markup("[Fe(NCS)2(py)4]"), "[Fe(NCS)_{2}(py)_{4}]");
    }

    #[test]
    fn term_labels() {
        let r = term_label("4T1g");
        assert_eq!(r.plain(), "4T1g");
        assert_eq!(r.spans[0].script, Script::Sup);
        assert_eq!(r.spans[2].script, Script::Sub);
        assert_eq!(term_label("3F").spans.len(), 2);
    }

    #[test]
    fn widths_scale_with_size_and_length() {
        let a = text_width("E/B", 10.0);
        assert!(a > 10.0 && a < 30.0, "{a}");
        assert!((text_width("E/B", 20.0) - 2.0 * a).abs() < 1e-9);
        assert!(text_width("WWW", 10.0) > text_width("iii", 10.0));
    }
}
