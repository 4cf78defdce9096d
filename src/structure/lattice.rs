//! The unit cell (metric and orthogonalisation) and crystallographic symmetry operators.

use crate::error::{Error, Result};
use crate::param::Param;
use nalgebra::{Matrix3, Vector3};

/// A unit cell: lengths a, b, c (Å) and angles α, β, γ (degrees), with the matrix that takes
/// fractional to Cartesian coordinates. Convention (common practice; e.g. International Tables
/// for Crystallography, Vol. B): a along x, b in the xy plane, c completing a right-handed set.
#[derive(Debug, Clone, PartialEq)]
pub struct Cell {
    pub lengths: [f64; 3],
    pub angles: [f64; 3],
    to_cartesian: Matrix3<f64>,
    to_fractional: Matrix3<f64>,
}

impl Cell {
    /// A cell from its lengths (Å) and angles (degrees), checked to span a volume.
    pub fn new(lengths: [f64; 3], angles: [f64; 3]) -> Result<Self> {
        for (l, n) in lengths.iter().zip(["a", "b", "c"]) {
            if !(l.is_finite() && *l > 0.1 && *l < 1000.0) {
                return Err(Error::invalid(
                    Param::CellLength(n),
                    format!("{l} Å"),
                    "a length in 0.1..1000 Å",
                ));
            }
        }
        for (a, n) in angles.iter().zip(["alpha", "beta", "gamma"]) {
            if !(a.is_finite() && *a > 0.0 && *a < 180.0) {
                return Err(Error::invalid(
                    Param::CellAngle(n),
                    format!("{a}°"),
                    "an angle strictly between 0 and 180°",
                ));
            }
        }
        let [a, b, c] = lengths;
        let [ca, cb, cg] = angles.map(|x| x.to_radians().cos());
        let sg = angles[2].to_radians().sin();
        let v2 = 1.0 - ca * ca - cb * cb - cg * cg + 2.0 * ca * cb * cg;
        if v2 <= 1e-8 {
            return Err(Error::invalid(
                Param::CellAngles,
                format!("{}°, {}°, {}°", angles[0], angles[1], angles[2]),
                "angles that span a volume (the cell is flat)",
            ));
        }
        let volume = a * b * c * v2.sqrt();
        let m = Matrix3::new(
            a,
            b * cg,
            c * cb,
            0.0,
            b * sg,
            c * (ca - cb * cg) / sg,
            0.0,
            0.0,
            volume / (a * b * sg),
        );
        let inv = m.try_inverse().ok_or_else(|| {
            Error::invalid(
                Param::Cell,
                format!("{lengths:?} {angles:?}"),
                "a cell with a volume",
            )
        })?;
        Ok(Cell {
            lengths,
            angles,
            to_cartesian: m,
            to_fractional: inv,
        })
    }

    /// Cartesian coordinates (Å) of a fractional position.
    pub fn to_cartesian(&self, f: &Vector3<f64>) -> Vector3<f64> {
        self.to_cartesian * f
    }

    /// Cell volume (Å³).
    pub fn volume(&self) -> f64 {
        self.to_cartesian.determinant()
    }

    /// How far (in fractional units along each axis) a sphere of radius r reaches: r·|row i of
    /// the fractional matrix|.
    pub fn fractional_reach(&self, r: f64) -> [f64; 3] {
        [0, 1, 2].map(|i| r * self.to_fractional.row(i).norm())
    }

    /// The metric tensor G = MᵀM (Å²): d² = Δfᵀ G Δf.
    pub fn metric(&self) -> Matrix3<f64> {
        self.to_cartesian.transpose() * self.to_cartesian
    }
}

/// A symmetry operator x' = R x + t on fractional coordinates, as written in a CIF
/// ("-x+1/2, y, -z").
#[derive(Debug, Clone, PartialEq)]
pub struct SymOp {
    pub rotation: Matrix3<f64>,
    pub translation: Vector3<f64>,
    /// The operator as written.
    pub text: String,
}

impl SymOp {
    pub fn identity() -> Self {
        SymOp {
            rotation: Matrix3::identity(),
            translation: Vector3::zeros(),
            text: "x,y,z".into(),
        }
    }

    pub fn is_identity(&self) -> bool {
        self.rotation == Matrix3::identity() && self.translation.iter().all(|t| t.fract() == 0.0)
    }

    /// Parses "x,y,z"-style operators: three comma-separated linear expressions in x, y, z with
    /// integer coefficients and rational or decimal constants.
    pub fn parse(text: &str) -> std::result::Result<SymOp, String> {
        let t = text.trim().trim_matches(|c| c == '\'' || c == '"');
        let parts: Vec<&str> = t.split(',').collect();
        if parts.len() != 3 {
            return Err(format!(
                "symmetry operator '{text}' needs three comma-separated parts, like -x,y+1/2,-z"
            ));
        }
        let mut rotation: Matrix3<f64> = Matrix3::zeros();
        let mut translation: Vector3<f64> = Vector3::zeros();
        for (row, part) in parts.iter().enumerate() {
            let s: String = part.chars().filter(|c| !c.is_whitespace()).collect();
            let s = s.to_ascii_lowercase();
            if s.is_empty() {
                return Err(format!("symmetry operator '{text}' has an empty part"));
            }
            // Split into signed terms.
            let mut terms = Vec::new();
            let mut cur = String::new();
            for c in s.chars() {
                if (c == '+' || c == '-') && !cur.is_empty() {
                    terms.push(std::mem::take(&mut cur));
                }
                cur.push(c);
            }
            terms.push(cur);
            for term in terms {
                let (sign, body) = match term.strip_prefix('-') {
                    Some(b) => (-1.0, b),
                    None => (1.0, term.strip_prefix('+').unwrap_or(&term)),
                };
                let bad = || format!("symmetry operator '{text}': cannot read the term '{term}'");
                if let Some(axis) = ["x", "y", "z"].iter().position(|a| body.ends_with(a)) {
                    let coef = &body[..body.len() - 1];
                    let coef = coef.strip_suffix('*').unwrap_or(coef);
                    let k = if coef.is_empty() {
                        1.0
                    } else {
                        coef.parse::<f64>().map_err(|_| bad())?
                    };
                    rotation[(row, axis)] += sign * k;
                } else if let Some((n, d)) = body.split_once('/') {
                    let n: f64 = n.parse().map_err(|_| bad())?;
                    let d: f64 = d.parse().map_err(|_| bad())?;
                    if d == 0.0 {
                        return Err(bad());
                    }
                    translation[row] += sign * n / d;
                } else {
                    translation[row] += sign * body.parse::<f64>().map_err(|_| bad())?;
                }
            }
        }
        let det = rotation.determinant();
        if (det.abs() - 1.0).abs() > 1e-9 {
            return Err(format!(
                "symmetry operator '{text}' is not a rotation or rotoinversion (determinant {det})"
            ));
        }
        Ok(SymOp {
            rotation,
            translation,
            text: t.chars().filter(|c| !c.is_whitespace()).collect(),
        })
    }

    pub fn apply(&self, f: &Vector3<f64>) -> Vector3<f64> {
        self.rotation * f + self.translation
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn operators_parse() {
        let op = SymOp::parse("-x+1/2, y, 1/2-z").unwrap();
        let p = op.apply(&Vector3::new(0.1, 0.2, 0.3));
        assert_abs_diff_eq!(p, Vector3::new(0.4, 0.2, 0.2), epsilon = 1e-12);
        assert!(SymOp::parse("x,y").is_err());
        assert!(SymOp::parse("x,x,z").is_err());
        assert!(SymOp::parse("x,y,z").unwrap().is_identity());
        let op = SymOp::parse("x-y,x,z+0.5").unwrap();
        assert_abs_diff_eq!(
            op.apply(&Vector3::new(0.3, 0.1, 0.0)),
            Vector3::new(0.2, 0.3, 0.5),
            epsilon = 1e-12
        );
    }

    /// The cell volume V = abc·√(1 − cos²α − cos²β − cos²γ + 2 cosα cosβ cosγ) (International
    /// Tables for Crystallography, Vol. B) and the distance d² = Δfᵀ G Δf with the metric
    /// tensor G (G_ij = a_i·a_j).
    #[test]
    fn metric_of_a_triclinic_cell() {
        let c = Cell::new([7.0, 8.0, 9.0], [80.0, 95.0, 100.0]).unwrap();
        let (ca, cb, cg) = (
            80f64.to_radians().cos(),
            95f64.to_radians().cos(),
            100f64.to_radians().cos(),
        );
        let v = 7.0 * 8.0 * 9.0 * (1.0 - ca * ca - cb * cb - cg * cg + 2.0 * ca * cb * cg).sqrt();
        assert_abs_diff_eq!(c.volume(), v, epsilon = 1e-9);
        let g = Matrix3::new(
            49.0,
            56.0 * cg,
            63.0 * cb,
            56.0 * cg,
            64.0,
            72.0 * ca,
            63.0 * cb,
            72.0 * ca,
            81.0,
        );
        assert_abs_diff_eq!(c.metric(), g, epsilon = 1e-9);
        assert!(Cell::new([7.0, 8.0, 9.0], [90.0, 90.0, 180.0]).is_err());
        assert!(Cell::new([0.0, 8.0, 9.0], [90.0, 90.0, 90.0]).is_err());
    }
}
