//! Report of `spinstate crossover`.

use super::Render;
use super::{fmt_num, new_table};
use serde::Serialize;

/// One crossover row.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct CrossoverRow {
    /// Number of d electrons.
    pub dn: usize,
    pub geometry: String,
    /// Racah C/B used (dimensionless).
    pub c_over_b: f64,
    /// Δ/B (Δ = 10Dq) where the ground-state spin changes; null when it never changes.
    pub delta_over_b: Option<f64>,
    /// Largest Δ/B searched: a perturbation-theory bound beyond which the ground spin cannot
    /// change any more.
    pub limit: f64,
    /// Ground term below the crossover (weak field), e.g. "5T2g".
    pub high_spin_term: String,
    /// Ground term above the crossover, e.g. "1A1g"; null without a crossover.
    pub low_spin_term: Option<String>,
    /// Spin S below the crossover.
    pub high_spin_s: f64,
    /// Spin S above the crossover.
    pub low_spin_s: Option<f64>,
}

/// The `crossover` report.
#[derive(Debug, Clone, Serialize, schemars::JsonSchema)]
pub struct CrossoverReport {
    pub crossovers: Vec<CrossoverRow>,
}

impl Render for CrossoverReport {
    type Figure = ();

    fn table(&self) -> String {
        let mut t = new_table([
            "d^n",
            "geometry",
            "C/B",
            "crossover Δ/B",
            "high-spin ground (S)",
            "low-spin ground (S)",
        ]);
        for r in &self.crossovers {
            t.add_row(vec![
                format!("d{}", r.dn),
                r.geometry.clone(),
                fmt_num(r.c_over_b, 3),
                match r.delta_over_b {
                    Some(x) => fmt_num(x, 3),
                    None => "none at any Δ/B".into(),
                },
                format!("{} ({})", r.high_spin_term, r.high_spin_s),
                match (&r.low_spin_term, r.low_spin_s) {
                    (Some(t), Some(s)) => format!("{t} ({s})"),
                    _ => "—".into(),
                },
            ]);
        }
        format!(
            "{t}\nΔ = 10Dq; energies in units of Racah B. For tet, Δ is the tetrahedral splitting; for sqpl, the octahedral Δ of the same ligands.\n"
        )
    }
}
