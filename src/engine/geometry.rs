//! Coordination geometries the engine knows by name, with their field conventions and the point
//! group used for labels.

use super::field::LigandField;
use super::symmetry::PointGroup;
use crate::error::{closest_names, Error, Result};
use std::fmt;
use std::str::FromStr;

/// A named coordination geometry.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Geometry {
    /// Octahedral, O_h (with Ds or Dt non-zero: tetragonally distorted, D_4h).
    Octahedral,
    /// Tetrahedral, T_d; Dq is the positive Δt/10 of the tetrahedron itself.
    Tetrahedral,
    /// Square planar, D_4h; Dq is the octahedral Dq of the same ligands (see
    /// [`LigandField::square_planar`]).
    SquarePlanar,
    /// Tetragonally distorted octahedron, D_4h, with Ds and Dt.
    Tetragonal,
}

impl Geometry {
    pub const ALL: [Geometry; 4] = [
        Geometry::Octahedral,
        Geometry::Tetrahedral,
        Geometry::SquarePlanar,
        Geometry::Tetragonal,
    ];

    /// Short name used on the command line and in JSON.
    pub fn name(self) -> &'static str {
        match self {
            Geometry::Octahedral => "oct",
            Geometry::Tetrahedral => "tet",
            Geometry::SquarePlanar => "sqpl",
            Geometry::Tetragonal => "tetragonal",
        }
    }

    /// Number of donor atoms that fill the geometry.
    pub fn coordination_number(self) -> usize {
        match self {
            Geometry::Octahedral | Geometry::Tetragonal => 6,
            Geometry::Tetrahedral | Geometry::SquarePlanar => 4,
        }
    }

    /// The one-electron field for Dq, Ds, Dt (cm⁻¹). Ds and Dt are accepted for the geometries
    /// with a fourfold axis (oct, tetragonal, sqpl) and rejected for tet.
    pub fn field(self, dq: f64, ds: f64, dt: f64) -> Result<LigandField> {
        match self {
            Geometry::Octahedral | Geometry::Tetragonal => Ok(LigandField::tetragonal(dq, ds, dt)),
            Geometry::Tetrahedral => {
                if ds != 0.0 || dt != 0.0 {
                    return Err(Error::invalid(
                        "Ds/Dt",
                        format!("{ds}/{dt}"),
                        "zero for tet (Ds and Dt apply to oct, tetragonal and sqpl)",
                    ));
                }
                Ok(LigandField::tetrahedral(dq))
            }
            Geometry::SquarePlanar => {
                let mut f = LigandField::square_planar(dq);
                f.matrix += LigandField::tetragonal(0.0, ds, dt).matrix;
                Ok(f)
            }
        }
    }

    /// The group whose Mulliken labels are used.
    pub fn point_group(self, ds: f64, dt: f64) -> PointGroup {
        match self {
            Geometry::Octahedral if ds == 0.0 && dt == 0.0 => PointGroup::Oh,
            Geometry::Tetrahedral => PointGroup::Td,
            _ => PointGroup::D4h,
        }
    }
}

impl fmt::Display for Geometry {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

impl FromStr for Geometry {
    type Err = Error;

    fn from_str(s: &str) -> Result<Self> {
        let key = s.trim().to_lowercase();
        let g = match key.as_str() {
            "oct" | "octahedral" | "oh" => Geometry::Octahedral,
            "tet" | "tetrahedral" | "td" => Geometry::Tetrahedral,
            "sqpl" | "square-planar" | "squareplanar" | "sq" | "d4h-planar" => {
                Geometry::SquarePlanar
            }
            "tetragonal" | "tetr" | "d4h" => Geometry::Tetragonal,
            _ => {
                return Err(Error::Unknown {
                    kind: "geometry (accepted: oct, tet, sqpl, tetragonal)".into(),
                    name: s.to_string(),
                    suggestions: closest_names(s, Geometry::ALL.iter().map(|g| g.name())),
                })
            }
        };
        Ok(g)
    }
}
