//! XYZ coordinates: an atom count, a comment line, then one `element x y z` line per atom
//! (Å; common practice). Extra columns after z are ignored.

use super::{element_from_label, Atom, Structure};
use crate::error::{Error, Result};
use nalgebra::Vector3;

/// Reads XYZ text. Errors name the line.
pub fn read(text: &str, name: &str) -> Result<Structure> {
    let mut lines = text.lines().enumerate().map(|(i, l)| (i + 1, l));
    let bad = |n: usize, what: String| Error::Parse(format!("XYZ line {n}: {what}"));
    let (n1, first) = lines
        .next()
        .ok_or_else(|| Error::Parse(format!("{name}: the XYZ file is empty")))?;
    let count: usize = first.trim().parse().map_err(|_| {
        bad(
            n1,
            format!(
                "'{}' is not an atom count (the first line of an XYZ file is the number of atoms)",
                first.trim()
            ),
        )
    })?;
    if count == 0 {
        return Err(bad(n1, "the atom count is 0".into()));
    }
    let _comment = lines.next();
    let mut atoms = Vec::with_capacity(count);
    let mut per_element: std::collections::HashMap<String, usize> = Default::default();
    for (n, line) in lines {
        if line.trim().is_empty() {
            continue;
        }
        if atoms.len() == count {
            return Err(bad(
                n,
                format!("more atom lines than the count {count} on line {n1}"),
            ));
        }
        let cols: Vec<&str> = line.split_whitespace().collect();
        if cols.len() < 4 {
            return Err(bad(
                n,
                format!("'{}' needs four columns: element x y z (Å)", line.trim()),
            ));
        }
        let element = element_from_label(cols[0])
            .ok_or_else(|| bad(n, format!("'{}' is not an element symbol", cols[0])))?;
        let mut xyz = [0.0; 3];
        for (k, axis) in ["x", "y", "z"].iter().enumerate() {
            xyz[k] = cols[k + 1]
                .parse::<f64>()
                .ok()
                .filter(|v| v.is_finite())
                .ok_or_else(|| bad(n, format!("{axis} '{}' is not a number", cols[k + 1])))?;
        }
        let k = per_element.entry(element.clone()).or_default();
        *k += 1;
        atoms.push(Atom {
            label: format!("{element}{k}"),
            element,
            position: Vector3::from(xyz),
            fract: None,
            occupancy: 1.0,
            disorder_group: None,
            line: n,
        });
    }
    if atoms.len() != count {
        return Err(Error::Parse(format!(
            "{name}: line {n1} announces {count} atoms but {} atom lines follow",
            atoms.len()
        )));
    }
    Ok(Structure {
        name: name.to_string(),
        atoms,
        lattice: None,
        notes: Vec::new(),
        temperature: None,
    })
}
