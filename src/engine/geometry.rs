//! Coordination geometries the engine knows by name, with their field conventions and the point
//! group used for labels.

use super::field::{LigandField, DS_MIXING};
use super::labels::{Irrep, Species};
use super::symmetry::PointGroup;
use crate::error::{closest_names, Error, Result};
use crate::param::Param;
use nalgebra::Vector3;
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
    /// Ideal square pyramid (C_4v), metal in the basal plane: donors on ±x, ±y and +z. Dq is
    /// the octahedral Dq of the same ligands (10Dq = 3e_σ); field from the angular overlap
    /// model ([`Geometry::ideal_directions`]). Labels in D_4h: the d-orbital field of a C_4v
    /// centre has D_4h symmetry (d functions are even), so C_4v labels are these without "g".
    SquarePyramidal,
    /// Ideal trigonal bipyramid (D_3h): donors on ±z and at 0°, 120°, 240° in the xy plane.
    /// Dq as for [`Geometry::SquarePyramidal`]. The engine has no D_3h labeller: levels are
    /// labelled in C1 ("A").
    TrigonalBipyramidal,
}

impl Geometry {
    pub const ALL: [Geometry; 6] = [
        Geometry::Octahedral,
        Geometry::Tetrahedral,
        Geometry::SquarePlanar,
        Geometry::Tetragonal,
        Geometry::SquarePyramidal,
        Geometry::TrigonalBipyramidal,
    ];

    /// Short name used on the command line and in JSON.
    pub fn name(self) -> &'static str {
        match self {
            Geometry::Octahedral => "oct",
            Geometry::Tetrahedral => "tet",
            Geometry::SquarePlanar => "sqpl",
            Geometry::Tetragonal => "tetragonal",
            Geometry::SquarePyramidal => "sqpy",
            Geometry::TrigonalBipyramidal => "tbp",
        }
    }

    /// Number of donor atoms that fill the geometry.
    pub fn coordination_number(self) -> usize {
        match self {
            Geometry::Octahedral | Geometry::Tetragonal => 6,
            Geometry::Tetrahedral | Geometry::SquarePlanar => 4,
            Geometry::SquarePyramidal | Geometry::TrigonalBipyramidal => 5,
        }
    }

    /// The one-electron field for Dq, Ds, Dt (cm⁻¹). Ds and Dt are accepted for the geometries
    /// with a fourfold axis (oct, tetragonal, sqpl) and rejected for tet, sqpy and tbp.
    pub fn field(self, dq: f64, ds: f64, dt: f64) -> Result<LigandField> {
        let no_ds_dt = || {
            if ds != 0.0 || dt != 0.0 {
                return Err(Error::invalid(
                    Param::DsDt,
                    format!("{ds}/{dt}"),
                    format!(
                        "zero for {} (Ds and Dt apply to oct, tetragonal and sqpl)",
                        self.name()
                    ),
                ));
            }
            Ok(())
        };
        match self {
            Geometry::Octahedral | Geometry::Tetragonal => Ok(LigandField::tetragonal(dq, ds, dt)),
            Geometry::Tetrahedral => {
                no_ds_dt()?;
                Ok(LigandField::tetrahedral(dq))
            }
            Geometry::SquarePyramidal | Geometry::TrigonalBipyramidal => {
                no_ds_dt()?;
                let e_sigma = 10.0 * dq / 3.0;
                let donors: Vec<(Vector3<f64>, f64, f64)> = self
                    .ideal_directions()
                    .into_iter()
                    .map(|d| (d, e_sigma, 0.0))
                    .collect();
                let f = LigandField::angular_overlap_with_ds(&donors, DS_MIXING).barycentred();
                // The ideal polyhedra make the field diagonal over the real orbitals (by
                // symmetry); drop the rounding noise the rotations leave off the diagonal.
                Ok(LigandField::from_diagonal(std::array::from_fn(|i| {
                    f.matrix[(i, i)]
                })))
            }
            Geometry::SquarePlanar => {
                let mut f = LigandField::square_planar(dq);
                f.matrix += LigandField::tetragonal(0.0, ds, dt).matrix;
                Ok(f)
            }
        }
    }

    /// Unit vectors from the metal to the donors of the ideal polyhedron, in the frame the
    /// field and labels use (z the principal axis; for sqpy the metal lies in the basal plane,
    /// the usual angular-overlap idealisation, E. Larsen, G. N. La Mar, *J. Chem. Educ.* 1974,
    /// 51, 633).
    pub fn ideal_directions(self) -> Vec<Vector3<f64>> {
        let (x, y, z) = (Vector3::x(), Vector3::y(), Vector3::z());
        match self {
            Geometry::Octahedral | Geometry::Tetragonal => vec![x, -x, y, -y, z, -z],
            Geometry::Tetrahedral => [
                (1.0, 1.0, 1.0),
                (1.0, -1.0, -1.0),
                (-1.0, 1.0, -1.0),
                (-1.0, -1.0, 1.0),
            ]
            .iter()
            .map(|&(a, b, c)| Vector3::new(a, b, c).normalize())
            .collect(),
            Geometry::SquarePlanar => vec![x, -x, y, -y],
            Geometry::SquarePyramidal => vec![x, -x, y, -y, z],
            Geometry::TrigonalBipyramidal => {
                let eq = |deg: f64| {
                    let a = deg.to_radians();
                    Vector3::new(a.cos(), a.sin(), 0.0)
                };
                vec![z, -z, eq(0.0), eq(120.0), eq(240.0)]
            }
        }
    }

    /// Angular-overlap σ coefficients of the five d orbitals, lowest in energy first (units of
    /// e_σ summed over the donors; C. E. Schäffer, C. K. Jørgensen, *Mol. Phys.* 1965; E. Larsen,
    /// G. N. La Mar, *J. Chem. Educ.* 1974, 51, 633): octahedral t₂g 0 and e_g 3 each;
    /// tetrahedral e 0 and t₂ 4/3 each; square planar xz, yz, xy 0, z² 1, x²−y² 3; square
    /// pyramid xz, yz, xy 0, z² 2, x²−y² 3; trigonal bipyramid e″ 0, e′ 9/8 each, a₁′ 11/4.
    pub fn sigma_coefficients(self) -> [f64; 5] {
        match self {
            Geometry::Octahedral | Geometry::Tetragonal => [0.0, 0.0, 0.0, 3.0, 3.0],
            Geometry::Tetrahedral => [0.0, 0.0, 4.0 / 3.0, 4.0 / 3.0, 4.0 / 3.0],
            Geometry::SquarePlanar => [0.0, 0.0, 0.0, 1.0, 3.0],
            Geometry::SquarePyramidal => [0.0, 0.0, 0.0, 2.0, 3.0],
            Geometry::TrigonalBipyramidal => [0.0, 0.0, 9.0 / 8.0, 9.0 / 8.0, 11.0 / 4.0],
        }
    }

    /// σ-antibonding electrons per bond of the lowest configuration of d^n with 2S = `two_s`
    /// (pairs in the lowest orbitals, then the unpaired electrons), in octahedral e_g-electron
    /// equivalents: Σ nᵢ wᵢ · 6/(3N) with wᵢ the σ coefficients and N donors, so one e_g
    /// electron of an octahedron counts 1. High-spin d⁶ octahedral has 2, low-spin 0. None when
    /// d^n and 2S do not fit in five orbitals.
    pub fn sigma_antibonding_per_bond(self, dn: usize, two_s: i32) -> Option<f64> {
        let unpaired = usize::try_from(two_s).ok()?;
        if dn > 10 || unpaired > dn || !(dn - unpaired).is_multiple_of(2) {
            return None;
        }
        let pairs = (dn - unpaired) / 2;
        if pairs + unpaired > 5 {
            return None;
        }
        let w = self.sigma_coefficients();
        let occupied: f64 = w[..pairs].iter().map(|x| 2.0 * x).sum::<f64>()
            + w[pairs..pairs + unpaired].iter().sum::<f64>();
        Some(occupied * 6.0 / (3.0 * self.coordination_number() as f64))
    }

    /// Ratio of this geometry's Δ convention to the octahedral Δo of the same ligands at the same
    /// bond length (angular overlap model, Larsen & La Mar 1974): 1 for oct and tetragonal,
    /// 4/9 for tet (Δt = (4/9)(3e_σ − 4e_π)), 1 for sqpl, whose Δ is 3e_σ like Δo, and 1 for
    /// sqpy and tbp, whose Dq is the octahedral Dq of the same ligands.
    pub fn delta_ratio_to_octahedral(self) -> f64 {
        match self {
            Geometry::Octahedral
            | Geometry::Tetragonal
            | Geometry::SquarePlanar
            | Geometry::SquarePyramidal
            | Geometry::TrigonalBipyramidal => 1.0,
            Geometry::Tetrahedral => 4.0 / 9.0,
        }
    }

    /// Whether a state whose ground level has this irrep (Eg) is strongly Jahn–Teller
    /// active: an orbital doublet of an octahedron, where the σ-antibonding e_g set is unevenly
    /// filled (high-spin d⁴, low-spin d⁷, d⁹). Tetrahedral E terms couple weakly; planar and
    /// tetragonal fields have already lifted the degeneracy.
    pub fn jahn_teller_active(self, irrep: Irrep) -> bool {
        match self {
            Geometry::Octahedral => irrep == Irrep::mulliken(Species::E, true),
            Geometry::Tetrahedral
            | Geometry::SquarePlanar
            | Geometry::Tetragonal
            | Geometry::SquarePyramidal
            | Geometry::TrigonalBipyramidal => false,
        }
    }

    /// Whether a field can be estimated from a composition in this geometry (a ligand table's
    /// `binds` column and a reported complex name only these). A tetragonal field needs Ds and
    /// Dt, which no composition gives.
    pub fn estimable(self) -> bool {
        match self {
            Geometry::Octahedral
            | Geometry::Tetrahedral
            | Geometry::SquarePlanar
            | Geometry::SquarePyramidal
            | Geometry::TrigonalBipyramidal => true,
            Geometry::Tetragonal => false,
        }
    }

    /// The group whose Mulliken labels are used.
    pub fn point_group(self, ds: f64, dt: f64) -> PointGroup {
        match self {
            Geometry::Octahedral if ds == 0.0 && dt == 0.0 => PointGroup::Oh,
            Geometry::Octahedral
            | Geometry::Tetragonal
            | Geometry::SquarePlanar
            | Geometry::SquarePyramidal => PointGroup::D4h,
            Geometry::Tetrahedral => PointGroup::Td,
            Geometry::TrigonalBipyramidal => PointGroup::C1,
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
            "sqpy" | "square-pyramidal" | "squarepyramidal" | "c4v" => Geometry::SquarePyramidal,
            "tbp" | "trigonal-bipyramidal" | "trigonalbipyramidal" | "d3h" => {
                Geometry::TrigonalBipyramidal
            }
            _ => {
                return Err(Error::Unknown {
                    kind: crate::error::NameKind::Geometry,
                    name: s.to_string(),
                    suggestions: closest_names(s, Geometry::ALL.iter().map(|g| g.name())),
                })
            }
        };
        Ok(g)
    }
}
