//! A least-squares problem given by a residual function, for the `levenberg-marquardt` crate,
//! with a central-difference Jacobian. Both fits of the library (band maxima in
//! [`crate::spectra::fit`], spin-transition curves in [`crate::sco::fit`]) minimise through it.

use levenberg_marquardt::{LeastSquaresProblem, LevenbergMarquardt, MinimizationReport};
use nalgebra::{storage::Owned, DMatrix, DVector, Dyn};

/// Residuals r(u) of parameters u; None where the model cannot be evaluated.
pub struct Residuals<F: Fn(&DVector<f64>) -> Option<DVector<f64>>> {
    f: F,
    /// Step of the central differences in u.
    step: f64,
    u: DVector<f64>,
    residuals: Option<DVector<f64>>,
}

impl<F: Fn(&DVector<f64>) -> Option<DVector<f64>>> Residuals<F> {
    /// The problem at the starting point `u0`.
    pub fn new(f: F, u0: DVector<f64>, step: f64) -> Self {
        let residuals = f(&u0);
        Residuals {
            f,
            step,
            u: u0,
            residuals,
        }
    }

    /// Whether the model can be evaluated at the current parameters.
    pub fn evaluates(&self) -> bool {
        self.residuals.is_some()
    }

    /// The residuals at `u`.
    pub fn at(&self, u: &DVector<f64>) -> Option<DVector<f64>> {
        (self.f)(u)
    }

    /// Central-difference Jacobian ∂r/∂u at `u`.
    pub fn jacobian_at(&self, u: &DVector<f64>) -> Option<DMatrix<f64>> {
        let r0 = self.at(u)?;
        let mut j = DMatrix::zeros(r0.len(), u.len());
        for k in 0..u.len() {
            let mut up = u.clone();
            let mut down = u.clone();
            up[k] += self.step;
            down[k] -= self.step;
            let col = (self.at(&up)? - self.at(&down)?) / (2.0 * self.step);
            j.set_column(k, &col);
        }
        Some(j)
    }

    /// Minimises ½|r|² with the given minimiser; returns the parameters and the report.
    pub fn minimize(self, lm: LevenbergMarquardt<f64>) -> (DVector<f64>, MinimizationReport<f64>) {
        let (solved, report) = lm.minimize(self);
        (solved.u, report)
    }
}

impl<F: Fn(&DVector<f64>) -> Option<DVector<f64>>> LeastSquaresProblem<f64, Dyn, Dyn>
    for Residuals<F>
{
    type ResidualStorage = Owned<f64, Dyn>;
    type JacobianStorage = Owned<f64, Dyn, Dyn>;
    type ParameterStorage = Owned<f64, Dyn>;

    fn set_params(&mut self, u: &DVector<f64>) {
        self.u.copy_from(u);
        self.residuals = (self.f)(u);
    }

    fn params(&self) -> DVector<f64> {
        self.u.clone()
    }

    fn residuals(&self) -> Option<DVector<f64>> {
        self.residuals.clone()
    }

    fn jacobian(&self) -> Option<DMatrix<f64>> {
        self.jacobian_at(&self.u)
    }
}
