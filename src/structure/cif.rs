//! A small reader for CIF, the crystallographers' open text format (S. R. Hall, F. H. Allen,
//! I. D. Brown, "The Crystallographic Information File (CIF)", *Acta Cryst. A* 1991, 47, 655):
//! data blocks, `_tag value` items, `loop_` tables, quoted values and `;` text fields.
//! Only what a coordination sphere needs is interpreted: the cell, the symmetry operators and
//! the atom sites (fractional coordinates, occupancies, disorder groups).

use super::lattice::{Cell, SymOp};
use super::{element_from_label, Atom, Lattice, Structure};
use crate::error::{Error, Result};
use nalgebra::Vector3;

/// One value with the line it starts on.
#[derive(Debug, Clone)]
struct Token {
    text: String,
    line: usize,
    /// Quoted or a text field: always a value, never a keyword or a tag.
    quoted: bool,
}

/// A `loop_` table.
#[derive(Debug, Clone)]
pub struct Loop {
    /// Tags, lower case.
    pub tags: Vec<String>,
    /// Rows of values with their line numbers.
    pub rows: Vec<Vec<(String, usize)>>,
}

/// One data block: its name, single items and loops.
#[derive(Debug, Clone, Default)]
pub struct Block {
    pub name: String,
    /// Single items: tag (lower case) → value, line.
    pub items: Vec<(String, String, usize)>,
    pub loops: Vec<Loop>,
}

impl Block {
    /// A single item by tag (case-insensitive).
    pub fn item(&self, tag: &str) -> Option<(&str, usize)> {
        self.items
            .iter()
            .find(|(t, _, _)| t == tag)
            .map(|(_, v, l)| (v.as_str(), *l))
    }

    /// The loop holding a tag, with the column of that tag.
    pub fn loop_with(&self, tag: &str) -> Option<(&Loop, usize)> {
        self.loops
            .iter()
            .find_map(|l| l.tags.iter().position(|t| t == tag).map(|c| (l, c)))
    }
}

fn malformed(line: usize, what: impl std::fmt::Display) -> Error {
    Error::Parse(format!("CIF line {line}: {what}"))
}

fn tokens(text: &str) -> Result<Vec<Token>> {
    let mut out = Vec::new();
    let mut lines = text.lines().enumerate().map(|(i, l)| (i + 1, l));
    while let Some((n, line)) = lines.next() {
        if let Some(first) = line.strip_prefix(';') {
            // A text field runs to the next line that starts with ';'.
            let mut body = first.to_string();
            let mut closed = false;
            for (_, l) in lines.by_ref() {
                if l.starts_with(';') {
                    closed = true;
                    break;
                }
                body.push('\n');
                body.push_str(l);
            }
            if !closed {
                return Err(malformed(
                    n,
                    "text field opened with ';' is never closed (a line starting with ';' ends it)",
                ));
            }
            out.push(Token {
                text: body.trim().to_string(),
                line: n,
                quoted: true,
            });
            continue;
        }
        let chars: Vec<char> = line.chars().collect();
        let mut i = 0;
        while i < chars.len() {
            let c = chars[i];
            if c.is_whitespace() {
                i += 1;
                continue;
            }
            if c == '#' {
                break;
            }
            if c == '\'' || c == '"' {
                // A quote ends at the same quote character followed by white space or the end.
                let mut j = i + 1;
                loop {
                    if j >= chars.len() {
                        return Err(malformed(
                            n,
                            format!("the value opened with {c} is not closed on this line"),
                        ));
                    }
                    if chars[j] == c && (j + 1 == chars.len() || chars[j + 1].is_whitespace()) {
                        break;
                    }
                    j += 1;
                }
                out.push(Token {
                    text: chars[i + 1..j].iter().collect(),
                    line: n,
                    quoted: true,
                });
                i = j + 1;
                continue;
            }
            let mut j = i;
            while j < chars.len() && !chars[j].is_whitespace() {
                j += 1;
            }
            out.push(Token {
                text: chars[i..j].iter().collect(),
                line: n,
                quoted: false,
            });
            i = j;
        }
    }
    Ok(out)
}

fn is_tag(t: &Token) -> bool {
    !t.quoted && t.text.starts_with('_')
}

fn is_keyword(t: &Token) -> bool {
    if t.quoted {
        return false;
    }
    let low = t.text.to_ascii_lowercase();
    low == "loop_" || low.starts_with("data_") || low.starts_with("save_") || low == "stop_"
}

/// Splits CIF text into data blocks. Errors name the line.
pub fn parse_blocks(text: &str) -> Result<Vec<Block>> {
    let toks = tokens(text)?;
    let mut blocks: Vec<Block> = Vec::new();
    let mut i = 0;
    while i < toks.len() {
        let t = &toks[i];
        let low = t.text.to_ascii_lowercase();
        if !t.quoted && low.starts_with("data_") {
            blocks.push(Block {
                name: t.text[5..].to_string(),
                ..Block::default()
            });
            i += 1;
            continue;
        }
        let Some(block) = blocks.last_mut() else {
            return Err(malformed(
                t.line,
                format!("'{}' before the first data_ block header", t.text),
            ));
        };
        if !t.quoted && low == "loop_" {
            let start = t.line;
            i += 1;
            let mut tags = Vec::new();
            while i < toks.len() && is_tag(&toks[i]) {
                tags.push(toks[i].text.to_ascii_lowercase());
                i += 1;
            }
            if tags.is_empty() {
                return Err(malformed(start, "loop_ without tags"));
            }
            let mut values = Vec::new();
            while i < toks.len() && !is_tag(&toks[i]) && !is_keyword(&toks[i]) {
                values.push((toks[i].text.clone(), toks[i].line));
                i += 1;
            }
            if values.len() % tags.len() != 0 {
                let last = values.last().map_or(start, |v| v.1);
                return Err(malformed(
                    last,
                    format!(
                        "the loop opened on line {start} has {} values for {} tags ({}); each row needs one value per tag",
                        values.len(),
                        tags.len(),
                        tags.join(" ")
                    ),
                ));
            }
            let rows = values.chunks(tags.len()).map(|c| c.to_vec()).collect();
            block.loops.push(Loop { tags, rows });
            continue;
        }
        if is_tag(t) {
            let Some(v) = toks.get(i + 1).filter(|v| !is_tag(v) && !is_keyword(v)) else {
                return Err(malformed(t.line, format!("tag {} has no value", t.text)));
            };
            block
                .items
                .push((t.text.to_ascii_lowercase(), v.text.clone(), t.line));
            i += 2;
            continue;
        }
        if !t.quoted && low.starts_with("save_") {
            i += 1;
            continue;
        }
        return Err(malformed(
            t.line,
            format!(
                "value '{}' without a tag (expected _tag value or loop_)",
                t.text
            ),
        ));
    }
    if blocks.is_empty() {
        return Err(Error::Parse(
            "CIF has no data_ block (a CIF starts its data with a line data_NAME)".into(),
        ));
    }
    Ok(blocks)
}

/// A CIF number: "1.234(5)" → 1.234 (the standard uncertainty in brackets is dropped). None for
/// the CIF "unknown" (?) and "not applicable" (.) values.
pub fn number(text: &str) -> Option<f64> {
    let t = text.trim();
    if t == "?" || t == "." {
        return None;
    }
    let t = t.split('(').next().unwrap_or(t);
    t.parse::<f64>().ok().filter(|x| x.is_finite())
}

fn cell_value(block: &Block, tag: &str) -> Result<f64> {
    let (text, line) = block.item(tag).ok_or_else(|| {
        Error::Parse(format!(
            "CIF block {} has no cell: {tag} is missing (needed: _cell_length_a, _b, _c and _cell_angle_alpha, _beta, _gamma)",
            block.name
        ))
    })?;
    number(text).ok_or_else(|| malformed(line, format!("{tag} '{text}' is not a number")))
}

/// Reads the first data block that has atom sites into a [`Structure`].
pub fn read(text: &str, name: &str) -> Result<Structure> {
    let blocks = parse_blocks(text)?;
    let with_sites: Vec<&Block> = blocks
        .iter()
        .filter(|b| {
            b.loop_with("_atom_site_fract_x").is_some()
                || b.loop_with("_atom_site_cartn_x").is_some()
        })
        .collect();
    let Some(block) = with_sites.first() else {
        return Err(Error::Parse(format!(
            "{name}: no data block has an _atom_site_fract_x loop (fractional atom coordinates)"
        )));
    };
    let mut notes = Vec::new();
    if with_sites.len() > 1 {
        notes.push(format!(
            "{} data blocks with atoms; the first, data_{}, is read",
            with_sites.len(),
            block.name
        ));
    }
    let cell = Cell::new(
        [
            cell_value(block, "_cell_length_a")?,
            cell_value(block, "_cell_length_b")?,
            cell_value(block, "_cell_length_c")?,
        ],
        [
            cell_value(block, "_cell_angle_alpha")?,
            cell_value(block, "_cell_angle_beta")?,
            cell_value(block, "_cell_angle_gamma")?,
        ],
    )?;
    let ops = symmetry_operators(block, &mut notes)?;
    let Some((sites, cx)) = block.loop_with("_atom_site_fract_x") else {
        return Err(Error::Parse(format!(
            "{name}: atom sites are given as Cartesian coordinates (_atom_site_Cartn_x); give fractional coordinates (_atom_site_fract_x, _y, _z)"
        )));
    };
    let col = |tag: &str| sites.tags.iter().position(|t| t == tag);
    let (Some(cy), Some(cz)) = (col("_atom_site_fract_y"), col("_atom_site_fract_z")) else {
        return Err(Error::Parse(format!(
            "{name}: the atom-site loop has _atom_site_fract_x but not _y and _z"
        )));
    };
    let c_label = col("_atom_site_label");
    let c_type = col("_atom_site_type_symbol");
    if c_label.is_none() && c_type.is_none() {
        return Err(Error::Parse(format!(
            "{name}: the atom-site loop has neither _atom_site_label nor _atom_site_type_symbol"
        )));
    }
    let c_occ = col("_atom_site_occupancy");
    let c_dis = col("_atom_site_disorder_group");
    let mut atoms = Vec::new();
    for (k, row) in sites.rows.iter().enumerate() {
        let line = row[cx].1;
        let label = c_label.map_or_else(
            || format!("{}{}", row[c_type.unwrap()].0, k + 1),
            |c| row[c].0.clone(),
        );
        let element_text = c_type.map_or(label.as_str(), |c| row[c].0.as_str());
        let element = element_from_label(element_text)
            .or_else(|| element_from_label(&label))
            .ok_or_else(|| {
                malformed(
                    line,
                    format!("atom {label}: '{element_text}' does not name an element"),
                )
            })?;
        let coord = |c: usize, axis: &str| {
            number(&row[c].0).ok_or_else(|| {
                malformed(
                    row[c].1,
                    format!(
                        "atom {label}: fractional {axis} '{}' is not a number",
                        row[c].0
                    ),
                )
            })
        };
        let fract = Vector3::new(coord(cx, "x")?, coord(cy, "y")?, coord(cz, "z")?);
        let occupancy = match c_occ {
            Some(c) => match number(&row[c].0) {
                Some(o) if o > 0.0 && o <= 1.0 + 1e-6 => o,
                None if row[c].0 == "?" || row[c].0 == "." => 1.0,
                _ => {
                    return Err(malformed(
                        row[c].1,
                        format!(
                            "atom {label}: occupancy '{}' is not a number in (0, 1]",
                            row[c].0
                        ),
                    ))
                }
            },
            None => 1.0,
        };
        let disorder_group = c_dis
            .map(|c| row[c].0.clone())
            .filter(|g| g != "." && g != "?" && g != "0");
        atoms.push(Atom {
            label,
            element,
            position: cell.to_cartesian(&fract),
            fract: Some(fract),
            occupancy,
            disorder_group,
            line,
        });
    }
    if atoms.is_empty() {
        return Err(Error::Parse(format!(
            "{name}: the atom-site loop has no rows"
        )));
    }
    let mut s = Structure {
        name: name.to_string(),
        atoms,
        lattice: Some(Lattice { cell, ops }),
        notes,
        temperature: temperature(block),
    };
    s.keep_major_disorder_part();
    s.note_partial_occupancies();
    Ok(s)
}

/// The data-collection temperature (K): `_diffrn_ambient_temperature`, else
/// `_cell_measurement_temperature`; a value with an uncertainty, e.g. "100(2)", is read as 100.
/// Not a positive number: None.
fn temperature(block: &Block) -> Option<f64> {
    [
        "_diffrn_ambient_temperature",
        "_cell_measurement_temperature",
    ]
    .iter()
    .filter_map(|tag| block.item(tag))
    .filter_map(|(text, _)| number(text))
    .find(|t| t.is_finite() && *t > 0.0)
}

fn symmetry_operators(block: &Block, notes: &mut Vec<String>) -> Result<Vec<SymOp>> {
    const TAGS: [&str; 2] = [
        "_space_group_symop_operation_xyz",
        "_symmetry_equiv_pos_as_xyz",
    ];
    for tag in TAGS {
        if let Some((l, c)) = block.loop_with(tag) {
            let mut ops = Vec::new();
            for row in &l.rows {
                ops.push(SymOp::parse(&row[c].0).map_err(|e| malformed(row[c].1, e))?);
            }
            if !ops.iter().any(SymOp::is_identity) {
                return Err(malformed(
                    l.rows[0][c].1,
                    "the symmetry operators do not include the identity x,y,z",
                ));
            }
            return Ok(ops);
        }
        if let Some((v, line)) = block.item(tag) {
            return Ok(vec![SymOp::parse(v).map_err(|e| malformed(line, e))?]);
        }
    }
    let group = [
        "_space_group_name_h-m_alt",
        "_symmetry_space_group_name_h-m",
    ]
    .iter()
    .find_map(|t| block.item(t))
    .map(|(v, _)| v.split_whitespace().collect::<String>());
    match group.as_deref() {
        None | Some("P1") | Some("?") => {
            notes.push("no symmetry operators in the CIF: P1 (x,y,z only) assumed".into());
            Ok(vec![SymOp::identity()])
        }
        Some(g) => Err(Error::Parse(format!(
            "the CIF names space group {g} but lists no symmetry operators; add the loop _space_group_symop_operation_xyz (or _symmetry_equiv_pos_as_xyz)"
        ))),
    }
}
