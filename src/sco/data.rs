//! Variable-temperature magnetic data for a spin-crossover fit, read from CSV text.
//!
//! A magnetometer file has a temperature column and one of χ_M·T, χ_M or μ_eff; a
//! variable-temperature Evans file has the shift, the concentration and the temperature of each
//! spectrum. Headers are matched case-insensitively, with an optional unit suffix after an
//! underscore (`T`, `T_K`, `temperature`; `chiT`, `chiT_cm3Kmol`, `chi_m_t`; `chi_m`,
//! `chi_m_cm3mol`; `mu_eff`, `mu_eff_BM`). Optional columns: `direction` (cooling or heating)
//! and an uncertainty `err` (or `<quantity>_err`) in the unit of the quantity. Lines starting
//! with `#` are comments. A bad cell names its line and column.

use super::model::Branch;
use crate::error::{Error, Result};
use crate::measured::evans::{evans, EvansInput, MagnetGeometry, Shift, SolventTerms};
use crate::measured::Measured;
use crate::units::{chi_t_from_mu_eff, moment_factor_cgs, SusceptibilityUnits};

/// One point of a χ_M·T(T) curve.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Point {
    /// Temperature (K).
    pub t: f64,
    /// χ_M·T (cm³ K mol⁻¹).
    pub chi_t: f64,
    /// 1σ of χ_M·T (cm³ K mol⁻¹), when given.
    pub err: Option<f64>,
    pub branch: Branch,
    /// Line of the file (header = 1).
    pub line: usize,
}

/// What a file's value column holds.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Quantity {
    ChiT,
    ChiM,
    MuEff,
}

impl Quantity {
    pub fn name(self) -> &'static str {
        match self {
            Quantity::ChiT => "χ_M·T",
            Quantity::ChiM => "χ_M",
            Quantity::MuEff => "μ_eff",
        }
    }
}

/// A read curve: points in file order and what was read.
#[derive(Debug, Clone, PartialEq)]
pub struct Curve {
    pub points: Vec<Point>,
    /// The column the values came from (χ_M·T, χ_M, μ_eff, or the Evans shift).
    pub source: String,
    pub notes: Vec<String>,
}

fn normalise(h: &str) -> String {
    h.trim()
        .to_lowercase()
        .chars()
        .filter(|c| c.is_alphanumeric() || *c == '_')
        .collect()
}

/// Whether a header names `base` (an exact match or `base_unit`).
fn names(header: &str, base: &str) -> bool {
    let h = normalise(header);
    h == base
        || h.strip_prefix(base)
            .is_some_and(|rest| rest.starts_with('_'))
}

fn find(headers: &[String], bases: &[&str]) -> Option<usize> {
    headers.iter().position(|h| {
        bases
            .iter()
            .any(|b| names(h, b) && !normalise(h).ends_with("_err"))
    })
}

fn find_err(headers: &[String], bases: &[&str]) -> Option<usize> {
    headers.iter().position(|h| {
        let n = normalise(h);
        n == "err" || n == "sigma" || bases.iter().any(|b| n == format!("{b}_err"))
    })
}

const T_NAMES: [&str; 4] = ["t", "temperature", "temp", "t_k"];
const CHI_T_NAMES: [&str; 4] = ["chit", "chi_t", "chi_m_t", "chimt"];
const CHI_NAMES: [&str; 3] = ["chi_m", "chim", "chi"];
const MU_NAMES: [&str; 3] = ["mu_eff", "mueff", "mu"];

/// Numbered rows of a CSV text (line of the file, header = 1).
type Rows = Vec<(usize, csv::StringRecord)>;

fn records(text: &str) -> Result<(Vec<String>, Rows)> {
    if let Some(line) = crate::csv_input::unclosed_quote(text, Some(b'#')) {
        return Err(Error::Parse(format!(
            "curve file: {}",
            crate::csv_input::unclosed_message(line)
        )));
    }
    let mut reader = csv::ReaderBuilder::new()
        .has_headers(true)
        .trim(csv::Trim::All)
        .comment(Some(b'#'))
        .flexible(false)
        .from_reader(text.as_bytes());
    let headers: Vec<String> = reader
        .headers()
        .map_err(|e| Error::Parse(format!("curve file: {e}")))?
        .iter()
        .map(str::to_string)
        .collect();
    let lines = crate::csv_input::LineIndex::new(text, Some(b'#'));
    let mut rows = Vec::new();
    for rec in reader.records() {
        let rec = rec.map_err(|e| Error::Parse(format!("curve file: {e}")))?;
        let line = rec.position().map_or(0, |p| lines.line_of(p.byte()));
        rows.push((line, rec));
    }
    Ok((headers, rows))
}

fn number(rec: &csv::StringRecord, idx: usize, line: usize, header: &str) -> Result<f64> {
    let s = rec.get(idx).unwrap_or("");
    let v: f64 = s.parse().map_err(|_| {
        Error::Parse(format!(
            "curve file line {line}, column {header}: '{s}' is not a number"
        ))
    })?;
    if !v.is_finite() {
        return Err(Error::Parse(format!(
            "curve file line {line}, column {header}: '{s}' is not finite"
        )));
    }
    Ok(v)
}

fn direction(s: &str, line: usize) -> Result<Branch> {
    match s.trim().to_lowercase().as_str() {
        "cooling" | "cool" | "down" | "c" => Ok(Branch::Cooling),
        "heating" | "heat" | "warming" | "up" | "h" => Ok(Branch::Heating),
        other => Err(Error::Parse(format!(
            "curve file line {line}, column direction: '{other}' is not cooling or heating"
        ))),
    }
}

/// Assigns branches from the order of the temperatures when no direction column was given:
/// one monotonic sweep is one branch; anything else needs a `direction` column.
fn infer_branches(points: &mut [Point]) -> Result<Option<&'static str>> {
    let up = points.windows(2).all(|w| w[1].t >= w[0].t);
    let down = points.windows(2).all(|w| w[1].t <= w[0].t);
    let (branch, said) = if up {
        (Branch::Heating, "heating (temperatures rise down the file)")
    } else if down {
        (Branch::Cooling, "cooling (temperatures fall down the file)")
    } else {
        return Err(Error::Parse(
            "curve file: the temperatures go up and down but there is no `direction` column; add one (cooling or heating per row) so each point can be put on its branch"
                .into(),
        ));
    };
    for p in points.iter_mut() {
        p.branch = branch;
    }
    Ok(Some(said))
}

/// Reads a magnetometer curve. `dia` (cm³ mol⁻¹, ≤ 0) is subtracted from χ_M before χ_M·T is
/// formed when the file gives χ_M.
pub fn read_curve(text: &str, dia: f64) -> Result<Curve> {
    let (headers, rows) = records(text)?;
    let t_idx = find(&headers, &T_NAMES).ok_or_else(|| {
        Error::Parse(format!(
            "curve file: no temperature column (accepted: T, T_K, temperature); found {}",
            headers.join(", ")
        ))
    })?;
    let (q, v_idx, bases): (Quantity, usize, &[&str]) = if let Some(i) =
        find(&headers, &CHI_T_NAMES)
    {
        (Quantity::ChiT, i, &CHI_T_NAMES)
    } else if let Some(i) = find(&headers, &CHI_NAMES) {
        (Quantity::ChiM, i, &CHI_NAMES)
    } else if let Some(i) = find(&headers, &MU_NAMES) {
        (Quantity::MuEff, i, &MU_NAMES)
    } else {
        return Err(Error::Parse(format!(
                "curve file: no χ_M·T, χ_M or μ_eff column (accepted: chiT, chi_m, mu_eff, each with an optional _unit); found {}",
                headers.join(", ")
            )));
    };
    let err_idx = find_err(&headers, bases);
    let dir_idx = headers.iter().position(|h| normalise(h) == "direction");
    let mut points = Vec::new();
    for (line, rec) in &rows {
        let t = number(rec, t_idx, *line, &headers[t_idx])?;
        if t <= 0.0 {
            return Err(Error::Parse(format!(
                "curve file line {line}: temperature {t} K is not above 0 K"
            )));
        }
        let v = number(rec, v_idx, *line, &headers[v_idx])?;
        let e = match err_idx {
            Some(i) => Some(number(rec, i, *line, &headers[i])?.abs()),
            None => None,
        };
        let (chi_t, err) = match q {
            Quantity::ChiT => (v, e),
            Quantity::ChiM => ((v - dia) * t, e.map(|e| e * t)),
            Quantity::MuEff => (
                chi_t_from_mu_eff(v, SusceptibilityUnits::Cgs),
                e.map(|e| 2.0 * v.abs() * e / moment_factor_cgs().powi(2)),
            ),
        };
        let branch = match dir_idx {
            Some(i) => direction(rec.get(i).unwrap_or(""), *line)?,
            None => Branch::Equilibrium,
        };
        points.push(Point {
            t,
            chi_t,
            err,
            branch,
            line: *line,
        });
    }
    let mut notes = vec![format!(
        "values from column {} ({})",
        headers[v_idx],
        q.name()
    )];
    if q == Quantity::ChiM && dia != 0.0 {
        notes.push(format!("χ_D = {dia:e} cm³/mol subtracted from χ_M"));
    }
    if dir_idx.is_none() {
        if let Some(said) = infer_branches(&mut points)? {
            notes.push(format!("no direction column: one sweep, read as {said}"));
        }
    }
    Ok(Curve {
        points,
        source: headers[v_idx].clone(),
        notes,
    })
}

/// Options of a variable-temperature Evans series.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct EvansSeries {
    pub magnet: MagnetGeometry,
    /// Diamagnetic correction χ_D (cm³ mol⁻¹, ≤ 0).
    pub dia: f64,
    /// Mass susceptibility of the solvent (cm³ g⁻¹) for the solvent term, if wanted.
    pub chi0: Option<f64>,
}

/// Reads a variable-temperature Evans series: columns `T`, `shift_ppm` (or `shift_hz` with
/// `freq_mhz`), `conc` (mol L⁻¹, the concentration at that temperature), and optionally
/// `density_solution` and `density_solvent` (g cm⁻³ at that temperature) for the density term.
/// Each row is converted with [`evans`] and becomes a χ_M·T point.
pub fn read_evans_series(text: &str, opts: &EvansSeries) -> Result<Curve> {
    let (headers, rows) = records(text)?;
    let col = |bases: &[&str]| find(&headers, bases);
    let t_idx = col(&T_NAMES).ok_or_else(|| {
        Error::Parse("Evans series: no temperature column (accepted: T, T_K, temperature)".into())
    })?;
    let ppm = col(&["shift_ppm", "ppm", "shift"]);
    let hz = col(&["shift_hz", "hz"]);
    let freq = col(&["freq_mhz", "frequency_mhz", "freq"]);
    let conc = col(&["conc", "concentration", "conc_mol_l"]).ok_or_else(|| {
        Error::Parse(
            "Evans series: no concentration column (accepted: conc, concentration; mol/L)".into(),
        )
    })?;
    let rho_sol = col(&["density_solution"]);
    let rho_solv = col(&["density_solvent"]);
    let dir_idx = headers.iter().position(|h| normalise(h) == "direction");
    if ppm.is_none() && (hz.is_none() || freq.is_none()) {
        return Err(Error::Parse(
            "Evans series: no shift column (accepted: shift_ppm, or shift_hz with freq_mhz)".into(),
        ));
    }
    let mut points = Vec::new();
    for (line, rec) in &rows {
        let t = number(rec, t_idx, *line, &headers[t_idx])?;
        let shift = match (ppm, hz, freq) {
            (Some(i), _, _) => Shift::Ppm(Measured::exact(number(rec, i, *line, &headers[i])?)),
            (None, Some(i), Some(f)) => Shift::Hertz {
                shift: Measured::exact(number(rec, i, *line, &headers[i])?),
                freq_mhz: number(rec, f, *line, &headers[f])?,
            },
            _ => unreachable!("checked above"),
        };
        let densities = match (rho_sol, rho_solv) {
            (Some(a), Some(b)) => Some((
                number(rec, a, *line, &headers[a])?,
                number(rec, b, *line, &headers[b])?,
            )),
            _ => None,
        };
        let input = EvansInput {
            shift,
            magnet: opts.magnet,
            concentration: Measured::exact(number(rec, conc, *line, &headers[conc])?),
            molar_mass: None,
            solvent: SolventTerms {
                chi0: opts.chi0,
                densities,
            },
            temperature: Measured::exact(t),
            dia: Measured::exact(opts.dia),
        };
        let r =
            evans(&input).map_err(|e| Error::Parse(format!("Evans series line {line}: {e}")))?;
        let branch = match dir_idx {
            Some(i) => direction(rec.get(i).unwrap_or(""), *line)?,
            None => Branch::Equilibrium,
        };
        points.push(Point {
            t,
            chi_t: r.moment.chi_m_t.value,
            err: None,
            branch,
            line: *line,
        });
    }
    let mut notes = vec![format!(
        "χ_M·T from {} Evans spectra ({} magnet, χ_D = {:e} cm³/mol{}{})",
        points.len(),
        opts.magnet.name(),
        opts.dia,
        if opts.chi0.is_some() {
            ", solvent term"
        } else {
            ""
        },
        if rho_sol.is_some() && rho_solv.is_some() {
            ", density term per row"
        } else {
            ""
        }
    )];
    if dir_idx.is_none() {
        if let Some(said) = infer_branches(&mut points)? {
            notes.push(format!("no direction column: one sweep, read as {said}"));
        }
    }
    Ok(Curve {
        points,
        source: "Evans shift".into(),
        notes,
    })
}
