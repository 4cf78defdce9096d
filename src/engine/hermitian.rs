//! Block Hamiltonians stored as a real part and an optional imaginary part, assembled from
//! cached unit matrices, and their eigen-decomposition (nalgebra, with an iteration cap).

use crate::error::{Error, Result};
use nalgebra::{Complex, DMatrix, SMatrix, SymmetricEigen};

type C64 = Complex<f64>;

/// dst += a · src, in place.
pub fn add_scaled(dst: &mut DMatrix<f64>, a: f64, src: &DMatrix<f64>) {
    for (d, s) in dst.as_mut_slice().iter_mut().zip(src.as_slice()) {
        *d += a * s;
    }
}

/// Adds the one-electron field Σ_{mm′} V_{mm′} E_{mm′} to a block, given the block's spatial
/// excitation matrices E (index (m+2)·5 + (m′+2); None where they leave the block) and the field
/// over the complex orbitals. Imaginary parts start a separate matrix only when present.
pub fn add_field(
    re: &mut DMatrix<f64>,
    im: &mut Option<DMatrix<f64>>,
    excitations: &[Option<DMatrix<f64>>],
    v: &SMatrix<C64, 5, 5>,
) {
    for i in 0..5 {
        for j in 0..5 {
            let Some(e) = &excitations[i * 5 + j] else {
                continue;
            };
            let h = v[(i, j)];
            if h.re != 0.0 {
                add_scaled(re, h.re, e);
            }
            if h.im.abs() > 1e-14 * (1.0 + h.re.abs()) {
                let m = im.get_or_insert_with(|| DMatrix::zeros(e.nrows(), e.ncols()));
                add_scaled(m, h.im, e);
            }
        }
    }
}

fn complex_of(re: &DMatrix<f64>, im: &DMatrix<f64>) -> DMatrix<C64> {
    DMatrix::from_fn(re.nrows(), re.ncols(), |i, j| {
        C64::new(re[(i, j)], im[(i, j)])
    })
}

/// Eigenvalues (ascending) and eigenvectors (columns) of re + i·im, real arithmetic when there
/// is no imaginary part. Fails with a computation error after 100 000 QR iterations or on a
/// non-finite result.
pub fn eigen(re: DMatrix<f64>, im: Option<DMatrix<f64>>) -> Result<(Vec<f64>, DMatrix<C64>)> {
    let (values, vectors) = eigen_unsorted(re, im)?;
    let mut order: Vec<usize> = (0..values.len()).collect();
    order.sort_by(|&a, &b| values[a].total_cmp(&values[b]));
    let sorted_values = order.iter().map(|&i| values[i]).collect();
    let sorted_vectors = DMatrix::from_columns(
        &order
            .iter()
            .map(|&i| vectors.column(i).into_owned())
            .collect::<Vec<_>>(),
    );
    Ok((sorted_values, sorted_vectors))
}

/// As [`eigen`] but in the solver's order (unsorted), for callers that sort states themselves.
pub fn eigen_unsorted(
    re: DMatrix<f64>,
    im: Option<DMatrix<f64>>,
) -> Result<(Vec<f64>, DMatrix<C64>)> {
    let n = re.nrows();
    let fail = || {
        Error::Computation(format!(
            "eigen-decomposition of a {n}×{n} block did not converge"
        ))
    };
    let (values, vectors): (Vec<f64>, DMatrix<C64>) = match im {
        None => {
            let e = SymmetricEigen::try_new(re, 1e-14, 100_000).ok_or_else(fail)?;
            (
                e.eigenvalues.iter().copied().collect(),
                e.eigenvectors.map(|x| C64::new(x, 0.0)),
            )
        }
        Some(im) => {
            let e =
                SymmetricEigen::try_new(complex_of(&re, &im), 1e-14, 100_000).ok_or_else(fail)?;
            (e.eigenvalues.iter().copied().collect(), e.eigenvectors)
        }
    };
    if values.iter().any(|x| !x.is_finite()) {
        return Err(fail());
    }
    Ok((values, vectors))
}

/// Eigenvalues only (unsorted) of re + i·im.
pub fn eigenvalues(re: DMatrix<f64>, im: Option<DMatrix<f64>>) -> Result<Vec<f64>> {
    let values: Vec<f64> = match im {
        None => re.symmetric_eigenvalues().iter().copied().collect(),
        Some(im) => complex_of(&re, &im)
            .symmetric_eigenvalues()
            .iter()
            .copied()
            .collect(),
    };
    if values.iter().any(|x| !x.is_finite()) {
        return Err(Error::Computation("eigenvalues are not finite".into()));
    }
    Ok(values)
}
