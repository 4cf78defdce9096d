//! Screening coordination spheres by their distance to the spin crossover.
//!
//! A screen ranks candidate spheres (sets of ligands that fill a geometry) for one or more metal
//! ions by how far the estimated Δ/B lies from the ion's crossover Δ/B, for one of three aims
//! ([`Target`]): as close to the crossover as possible (spin-crossover design), safely high-spin
//! or safely low-spin. Candidates come from a pool of ligands ([`Screen::from_pool`]: every
//! multiset of pool ligands whose donor atoms fill the geometry, a bidentate ligand taking two
//! sites and a tridentate three) or from a CSV file ([`Screen::from_candidates`], layout in
//! [`CANDIDATE_COLUMNS`]).
//!
//! # The numbers
//! Δ_HS, Δ_LS, B, C and the spin state are those of
//! [`ComplexSpec::resolve`](crate::complex::ComplexSpec::resolve) for the same sphere: the
//! screen calls the estimator's own functions ([`estimate::reference_delta`], the ion's
//! [`SpinGeometry`], [`estimate::choose_spin`], [`Reliability`]) on sums it accumulates, so the
//! numbers are the same by construction; the unit tests check them bit for bit against
//! `resolve` for random spheres. `borderline` is |Δ̄/B − X| ≤ u·Δ̄/B, with Δ̄ the mean of the
//! two states' fields and u the assumed relative uncertainty of Δ/B, as in `predict`.
//!
//! # Why it is fast
//! `resolve` sums nᵢdᵢfᵢ, nᵢdᵢπᵢ and nᵢdᵢhᵢ over the ligands; a screen precomputes these terms
//! for every pool ligand and count, and adds them while it walks the multisets depth first, so
//! one candidate costs a handful of additions, a few multiplications and divisions and a
//! comparison. The crossover Δ/B, its slope and the ion's spin geometry depend only on the ion
//! and geometry, so they are computed once per ion ([`crate::engine::crossover`], itself
//! cached) instead of once per candidate. When only the best N are wanted, a bounded heap keeps
//! them and nothing else is stored.
//!
//! # Scores
//! `score` is larger for a better candidate, in percent of the crossover Δ/B X:
//! - `crossover`: −|Δ̄/B − A|/X · 100 with A the Δ̄/B at which E_HS − E_LS is the middle of the
//!   thermal window ([`estimate::crossover_target`]): 0 is a sphere whose low-spin state lies
//!   just below a thermally reachable high-spin state;
//! - `high`: (X − Δ̄/B)/X · 100 (how far below the crossover);
//! - `low`: (Δ̄/B − X)/X · 100 (how far above it).
//!
//! Ties are broken by ion (in the order given), then by the sphere (ligands in table order),
//! then by candidate name, so the ranking never depends on the order of a candidates file.
//!
//! # Limits
//! The estimate is that of [`crate::estimate`]: each spin state at its own bond length, with
//! the calibrated constants. Its uncertainty (±15–25 % in Δ/B) is wide against the thermal
//! window, so a sphere ranked "at the crossover" is a starting point for synthesis, not a
//! prediction of a transition temperature.

use crate::engine::Geometry;
use crate::error::{Error, Result};
use crate::estimate::{self, Calibration, Reliability, SpinState, CALIBRATION};
use crate::param::Param;
use crate::tables::{DataSet, Ligand, TransitionSeries};

mod enumerate;
mod query;
mod rank;
mod source;

pub use enumerate::*;
pub use query::*;
pub use rank::*;
pub use source::*;

/// Most donor sites of any geometry a screen can fill (octahedral).
pub const MAX_SITES: usize = 6;

/// Largest number of candidate spheres a pool may generate (a guard against runs of hours).
pub const MAX_CANDIDATES: u64 = 200_000_000;

/// Most distinct ligands in a pool or a candidates file (indices are stored in a byte).
pub const MAX_POOL: usize = 250;

/// Columns of a candidates file: `ligands` (required: `NAME[:COUNT]` items separated by spaces
/// or `;`, e.g. `NCS:2 py:4`) and `name` (optional label). Other columns are ignored, lines
/// starting with `#` are comments, and the header row is required.
pub const CANDIDATE_COLUMNS: [&str; 2] = ["name", "ligands"];

/// A prepared screen: ions with their crossovers, the pool and the filters.
#[derive(Debug, Clone)]
pub struct Screen {
    pub geometry: Geometry,
    pub target: Target,
    pub ions: Vec<ScreenIon>,
    /// Pool ligands in table order.
    pub pool: Vec<PoolLigand>,
    pub filters: Filters,
    /// Model constants (those `resolve` uses).
    pub calibration: Calibration,
    source: Source,
    compiled: Compiled,
    notes: Vec<String>,
}

/// Counts of a finished screen and its ranked hits (best first).
#[derive(Debug, Clone)]
pub struct Outcome {
    pub hits: Vec<Hit>,
    /// Candidate spheres generated (pool) or read (file), before filters.
    pub candidates: u64,
    /// (sphere, ion) pairs that passed the filters and whose Δ/B was computed.
    pub evaluated: u64,
    /// Pairs whose estimate failed (β = 1 − h̄k ≤ 0); not ranked.
    pub skipped: u64,
}

/// Relative slack of the fast test: a candidate is only rejected when its score is below the
/// ranking's bar by more than this (round-off of the two orders of arithmetic is ~1e-15), so the
/// exact path decides every close call and the ranking is identical to the exact screen's.
const FAST_SLACK: f64 = 1e-9;

impl Screen {
    fn prepare_ions(
        tables: &DataSet,
        ions: &[IonSpec],
        geometry: Geometry,
    ) -> Result<Vec<ScreenIon>> {
        if ions.is_empty() {
            return Err(Error::invalid(
                Param::Metal,
                "none",
                "at least one metal ion, e.g. Fe with oxidation state 2",
            ));
        }
        if !geometry.estimable() {
            return Err(Error::invalid(
                Param::Geometry,
                "tetragonal",
                "oct, tet or sqpl",
            ));
        }
        let mut out: Vec<ScreenIon> = Vec::new();
        for spec in ions {
            let ion = prepare_ion(tables, spec, geometry)?;
            if !out.iter().any(|o| o.ion.name() == ion.ion.name()) {
                out.push(ion);
            }
        }
        if out.len() > u16::MAX as usize {
            return Err(Error::invalid(
                Param::MetalList,
                out.len(),
                "at most 65535 ions",
            ));
        }
        Ok(out)
    }

    fn check_filters(filters: &Filters, geometry: Geometry) -> Result<()> {
        if let Some(d) = &filters.donors {
            if d.total() != geometry.coordination_number() {
                return Err(Error::invalid(
                    Param::DonorSet,
                    format!("{d} ({} donor atoms)", d.total()),
                    format!(
                        "exactly {} donor atoms for {}, e.g. N{}",
                        geometry.coordination_number(),
                        geometry.name(),
                        geometry.coordination_number()
                    ),
                ));
            }
        }
        if let Some(q) = filters.max_abs_charge {
            if q < 0 {
                return Err(Error::invalid(
                    Param::MaxCharge,
                    q,
                    "a whole number ≥ 0 (a bound on |charge|)",
                ));
            }
        }
        Ok(())
    }

    fn resolve_names<'t>(tables: &'t DataSet, names: &[String]) -> Result<Vec<&'t Ligand>> {
        let ligands = tables.ligands()?;
        names.iter().map(|n| ligands.find(n)).collect()
    }

    fn compile(&mut self, tables: &DataSet) -> Result<()> {
        let index_of = |l: &Ligand| self.pool.iter().position(|p| p.ligand.name == l.name);
        let mut require = Vec::new();
        for l in Self::resolve_names(tables, &self.filters.require)? {
            match index_of(l) {
                Some(i) => require.push(i as u8),
                None => {
                    if matches!(self.source, Source::Pool) {
                        return Err(Error::invalid(
                            Param::RequiredLigand,
                            &l.name,
                            "a ligand of the pool (and not forbidden)",
                        ));
                    }
                    // No candidate row contains it: nothing passes.
                    require.push(u8::MAX);
                }
            }
        }
        let mut forbid = Vec::new();
        for l in Self::resolve_names(tables, &self.filters.forbid)? {
            if self.filters.require.iter().any(|r| l.is_called(r)) {
                return Err(Error::invalid(
                    Param::LigandFilter,
                    format!("{} both required and forbidden", l.name),
                    "each ligand in at most one of the two lists",
                ));
            }
            if let Some(i) = index_of(l) {
                forbid.push(i as u8);
            }
        }
        let donor_key = self.filters.donors.as_ref().map(|d| {
            d.counts
                .iter()
                .enumerate()
                .map(|(p, (_, n))| (*n as u32) << (4 * p))
                .sum()
        });
        self.compiled = Compiled {
            require,
            forbid,
            max_abs_charge: self.filters.max_abs_charge,
            donor_key,
            size: self.filters.size,
            kinds: self.filters.kinds,
        };
        Ok(())
    }

    fn base_notes(&mut self) {
        let defaulted: Vec<&str> = self
            .pool
            .iter()
            .filter(|p| p.h_defaulted)
            .map(|p| p.ligand.name.as_str())
            .collect();
        if !defaulted.is_empty() {
            self.notes.push(format!(
                "no published h for {}: the mean h of ligands with the same donor atom is used, as in predict",
                defaulted.join(", ")
            ));
        }
        let acceptors: Vec<&str> = self
            .pool
            .iter()
            .filter(|p| p.pi > 0.0)
            .map(|p| p.ligand.name.as_str())
            .collect();
        if !acceptors.is_empty() && self.ions.iter().any(|i| i.ion.oxidation_state <= 2) {
            self.notes.push(format!(
                "back-bonding of the π acceptors ({}) on ions below +3 is added to f̄, as in predict",
                acceptors.join(", ")
            ));
        }
        self.notes.push(format!(
            "each spin state at its own bond length (Δ ∝ r^-{}), as in predict: spheres are ranked by the mean field Δ̄/B of the two states; the crossover target aims at E_HS − E_LS = {:.0} cm⁻¹, the middle of the thermal window",
            self.calibration.distance_exponent,
            0.5 * self.calibration.crossover_window
        ));
    }

    /// A screen of every multiset of `pool` ligands that fills `geometry`.
    ///
    /// The pool is a list of ligand names or aliases (`all` stands for every ligand in the
    /// table with an f that binds in the geometry). Forbidden ligands are removed from the pool.
    /// Errors: an unknown ion or ligand (with the closest names), a ligand without f or that
    /// cannot bind in the geometry, an ion without crossover, g or B₀, a pool that cannot fill
    /// the geometry, or more than [`MAX_CANDIDATES`] spheres.
    pub fn from_pool(
        tables: &DataSet,
        ions: &[IonSpec],
        geometry: Geometry,
        pool: &[String],
        filters: &Filters,
        target: Target,
    ) -> Result<Screen> {
        let ligands = tables.ligands()?;
        let screen_ions = Self::prepare_ions(tables, ions, geometry)?;
        Self::check_filters(filters, geometry)?;
        let forbidden = Self::resolve_names(tables, &filters.forbid)?;
        let mut chosen: Vec<&Ligand> = Vec::new();
        let mut problems: Vec<String> = Vec::new();
        for name in pool {
            if name.trim().eq_ignore_ascii_case("all") {
                for l in &ligands.rows {
                    if unusable(l, geometry).is_none() && !chosen.iter().any(|c| c.name == l.name) {
                        chosen.push(l);
                    }
                }
                continue;
            }
            let l = ligands.find(name)?;
            if let Some(why) = unusable(l, geometry) {
                problems.push(why);
            } else if !chosen.iter().any(|c| c.name == l.name) {
                chosen.push(l);
            }
        }
        if !problems.is_empty() {
            return Err(Error::invalid(
                Param::Pool,
                problems.join("; "),
                "ligands with a Jørgensen f that bind in the geometry (`spinstate data ligands` lists them)",
            ));
        }
        chosen.retain(|l| !forbidden.iter().any(|f| f.name == l.name));
        if chosen.is_empty() {
            return Err(Error::invalid(
                Param::Pool,
                "empty (after removing forbidden ligands)",
                "at least one ligand name, e.g. H2O,NH3,py,NCS",
            ));
        }
        if chosen.len() > MAX_POOL {
            return Err(Error::invalid(
                Param::Pool,
                format!("{} ligands", chosen.len()),
                format!("at most {MAX_POOL} ligands"),
            ));
        }
        chosen.sort_by_key(|l| table_index(ligands, l));
        let slots = donor_slots(filters.donors.as_ref());
        let needs_h = screen_ions.iter().any(|i| i.k.is_some());
        let prepared = chosen
            .iter()
            .map(|l| pool_ligand(ligands, l, needs_h, &slots))
            .collect::<Result<Vec<_>>>()?;
        let mut screen = Screen {
            calibration: CALIBRATION,
            geometry,
            target,
            ions: screen_ions,
            pool: prepared,
            filters: filters.clone(),
            source: Source::Pool,
            compiled: Compiled::default(),
            notes: Vec::new(),
        };
        let count = screen.candidate_count();
        if count == 0 {
            let parts: Vec<String> = screen
                .pool
                .iter()
                .map(|p| format!("{} ({} sites)", p.ligand.name, p.denticity))
                .collect();
            return Err(Error::invalid(
                Param::Pool,
                format!(
                    "{} cannot fill the {} donor sites of {}",
                    parts.join(", "),
                    geometry.coordination_number(),
                    geometry.name()
                ),
                "a pool whose denticities add up to the coordination number, e.g. with a monodentate ligand",
            ));
        }
        if count > MAX_CANDIDATES {
            return Err(Error::invalid(
                Param::Pool,
                format!("{} ligands give {count} spheres", screen.pool.len()),
                format!("at most {MAX_CANDIDATES} spheres: use a smaller pool"),
            ));
        }
        screen.compile(tables)?;
        screen.base_notes();
        Ok(screen)
    }

    /// A screen of the candidates in a CSV text (columns in [`CANDIDATE_COLUMNS`]). Rows that
    /// cannot be used are returned as [`RejectedCandidate`]s; the others are screened. Errors (the whole
    /// file): no `ligands` column, no row at all, malformed CSV, or a bad ion or filter.
    pub fn from_candidates(
        tables: &DataSet,
        ions: &[IonSpec],
        geometry: Geometry,
        csv_text: &str,
        filters: &Filters,
        target: Target,
    ) -> Result<(Screen, Vec<RejectedCandidate>)> {
        let ligands = tables.ligands()?;
        let screen_ions = Self::prepare_ions(tables, ions, geometry)?;
        Self::check_filters(filters, geometry)?;
        if let Some(line) = crate::csv_input::unclosed_quote(csv_text, Some(b'#')) {
            return Err(Error::Parse(format!(
                "candidates file: {}",
                crate::csv_input::unclosed_message(line)
            )));
        }
        let mut reader = csv::ReaderBuilder::new()
            .has_headers(true)
            .flexible(true)
            .trim(csv::Trim::All)
            .comment(Some(b'#'))
            .from_reader(csv_text.as_bytes());
        let header = reader
            .headers()
            .map_err(|e| Error::Parse(format!("candidates file: {e}")))?
            .clone();
        let col = |name: &str| header.iter().position(|h| h.eq_ignore_ascii_case(name));
        let Some(lig_col) = col("ligands") else {
            return Err(Error::invalid(
                Param::CandidatesHeader,
                format!("'{}'", header.iter().collect::<Vec<_>>().join(",")),
                "a header row with a 'ligands' column (NAME[:COUNT] items separated by spaces or ';') and optionally 'name'",
            ));
        };
        let name_col = col("name");
        let mut errors: Vec<RejectedCandidate> = Vec::new();
        let mut rows: Vec<(Runs, Option<String>)> = Vec::new();
        let cn = geometry.coordination_number();
        let lines = crate::csv_input::LineIndex::new(csv_text, Some(b'#'));
        for (i, rec) in reader.records().enumerate() {
            let row = i + 1;
            let rec = match rec {
                Ok(r) => r,
                Err(e) => {
                    let line = e.position().map_or(0, |p| lines.line_of(p.byte()));
                    errors.push(RejectedCandidate {
                        row,
                        line,
                        column: "(row)".into(),
                        message: format!("not readable as CSV: {e}"),
                    });
                    continue;
                }
            };
            let line = rec.position().map_or(0, |p| lines.line_of(p.byte()));
            let err = |message: String| RejectedCandidate {
                row,
                line,
                column: "ligands".into(),
                // Messages quote cells, which a quoted field can fill with line breaks.
                message: crate::error::one_line(&message).into_owned(),
            };
            let text = rec.get(lig_col).unwrap_or("");
            if text.is_empty() {
                errors.push(err(
                    "is empty; give NAME[:COUNT] items such as 'NCS:2 py:4'".into(),
                ));
                continue;
            }
            let mut parsed: Vec<(usize, usize)> = Vec::new();
            let mut bad: Option<String> = None;
            for item in text
                .split(|c: char| c.is_whitespace() || c == ';')
                .filter(|s| !s.is_empty())
            {
                let lc = match item.parse::<crate::complex::LigandCount>() {
                    Ok(lc) => lc,
                    Err(e) => {
                        bad = Some(e.to_string());
                        break;
                    }
                };
                let l = match ligands.find(&lc.name) {
                    Ok(l) => l,
                    Err(e) => {
                        bad = Some(e.to_string());
                        break;
                    }
                };
                if let Some(why) = unusable(l, geometry) {
                    bad = Some(why);
                    break;
                }
                let ti = table_index(ligands, l);
                match parsed.iter_mut().find(|(t, _)| *t == ti) {
                    Some((_, c)) => *c = c.saturating_add(lc.count),
                    None => parsed.push((ti, lc.count)),
                }
            }
            if let Some(message) = bad {
                errors.push(err(message));
                continue;
            }
            let donors: usize = parsed.iter().fold(0, |n, (t, c)| {
                n.saturating_add(c.saturating_mul(ligands.rows[*t].denticity()))
            });
            if donors != cn {
                errors.push(err(format!(
                    "'{text}' has {donors} donor atoms; {} needs exactly {cn}",
                    geometry.name()
                )));
                continue;
            }
            parsed.sort();
            let name = name_col
                .and_then(|c| rec.get(c))
                .filter(|s| !s.is_empty())
                .map(str::to_string);
            rows.push((parsed, name));
        }
        if rows.is_empty() && errors.is_empty() {
            return Err(Error::invalid(
                Param::CandidatesFile,
                "no rows",
                "a header row and one row per candidate sphere",
            ));
        }
        // The pool is every ligand of a good row, in table order: the same for any row order.
        let mut used: Vec<usize> = rows
            .iter()
            .flat_map(|(p, _)| p.iter().map(|(t, _)| *t))
            .collect();
        used.sort_unstable();
        used.dedup();
        if used.len() > MAX_POOL {
            return Err(Error::invalid(
                Param::CandidatesFile,
                format!("{} distinct ligands", used.len()),
                format!("at most {MAX_POOL}"),
            ));
        }
        let slots = donor_slots(filters.donors.as_ref());
        let needs_h = screen_ions.iter().any(|i| i.k.is_some());
        let pool = used
            .iter()
            .map(|&t| pool_ligand(ligands, &ligands.rows[t], needs_h, &slots))
            .collect::<Result<Vec<_>>>()?;
        let mut spheres: Vec<(Sphere, Option<String>)> = rows
            .into_iter()
            .map(|(parsed, name)| {
                let mut s = Sphere::EMPTY;
                for (t, c) in parsed {
                    let p = used.binary_search(&t).unwrap_or(0);
                    for _ in 0..c {
                        s.push(p);
                    }
                }
                (s, name)
            })
            .collect();
        spheres.sort();
        let mut screen = Screen {
            calibration: CALIBRATION,
            geometry,
            target,
            ions: screen_ions,
            pool,
            filters: filters.clone(),
            source: Source::Rows(spheres),
            compiled: Compiled::default(),
            notes: Vec::new(),
        };
        screen.compile(tables)?;
        screen.base_notes();
        Ok((screen, errors))
    }

    /// Number of candidate spheres before filters.
    pub fn candidate_count(&self) -> u64 {
        match &self.source {
            Source::Pool => {
                let d: Vec<usize> = self.pool.iter().map(|p| p.denticity).collect();
                count_spheres(&d, self.geometry.coordination_number())
            }
            Source::Rows(rows) => rows.len() as u64,
        }
    }

    /// Notes on the estimate and its limits, one sentence each.
    pub fn notes(&self) -> &[String] {
        &self.notes
    }

    /// True for a screen of a pool, false for a candidates file.
    pub fn is_pool(&self) -> bool {
        matches!(self.source, Source::Pool)
    }

    /// Δ_ref, B, Δ_HS/B and Δ_LS/B of a sphere for one ion, with the functions `resolve`
    /// calls ([`estimate::reference_delta`] and the ion's [`SpinGeometry`]); None when
    /// β = 1 − h̄k ≤ 0 (the factor rule fails).
    #[inline]
    fn parameters(&self, ion: &ScreenIon, s: &Sums) -> Option<Parameters> {
        let donors = self.geometry.coordination_number() as f64;
        let delta_ref = estimate::reference_delta(
            s.f / donors,
            s.pi / donors,
            ion.g,
            ion.ion.oxidation_state,
            self.geometry,
            &self.calibration,
        );
        let beta = match ion.k {
            Some(k) => estimate::nephelauxetic_ratio(s.h / donors, k).0,
            None => 1.0,
        };
        if !beta.is_finite() {
            return None;
        }
        let b = ion.b0 * beta;
        let sg = &ion.spin_geometry;
        Some(Parameters {
            delta_high_spin: delta_ref * sg.high_spin_factor,
            delta_low_spin: delta_ref * sg.low_spin_factor,
            b,
        })
    }

    #[inline]
    fn passes(&self, sphere: &Sphere, s: &Sums) -> bool {
        let c = &self.compiled;
        c.require.iter().all(|&i| sphere.contains(i))
            && !c.forbid.iter().any(|&i| sphere.contains(i))
            && c.donor_key.is_none_or(|k| k == s.donor_key)
            && c.size.is_none_or(|r| r.contains(sphere.len as usize))
            && c.kinds.is_none_or(|r| r.contains(s.kinds as usize))
    }

    fn sums(&self, sphere: &Sphere) -> Sums {
        sphere
            .runs()
            .iter()
            .fold(Sums::ZERO, |acc, &(i, c)| acc.add_run(&self.pool[i], c))
    }

    /// Runs the screen. `progress` is called with the number of spheres done, every 65 536
    /// spheres and once at the end (the library draws nothing itself).
    pub fn run(&self, keep: Keep, progress: &mut dyn FnMut(u64)) -> Outcome {
        self.run_with(keep, false, progress)
    }

    /// As [`Screen::run`] with every candidate taken through the exact path (no fast reject):
    /// the reference the fast path is tested against.
    pub fn run_exact(&self, keep: Keep, progress: &mut dyn FnMut(u64)) -> Outcome {
        self.run_with(keep, true, progress)
    }

    fn run_with(&self, keep: Keep, exact: bool, progress: &mut dyn FnMut(u64)) -> Outcome {
        let fast = if exact {
            vec![None; self.ions.len()]
        } else {
            self.ions
                .iter()
                .map(|ion| FastBound::new(self, ion))
                .collect()
        };
        // One ion, no filter and no charge cap: a leaf can be rejected from its sums of f, π
        // and h before the rest of its sums are built.
        let light_leaves = matches!(fast[..], [Some(_)])
            && self.compiled.is_open()
            && self.compiled.max_abs_charge.is_none();
        let mut state = RunState {
            light_leaves,
            fast,
            ranking: Ranking::new(match keep {
                Keep::Top(n) => Keep::Top(n.max(1)),
                k => k,
            }),
            spheres: 0,
            evaluated: 0,
            skipped: 0,
        };
        match &self.source {
            Source::Pool => {
                let fill = self.fillable();
                let max_len = self
                    .compiled
                    .size
                    .map_or(MAX_SITES, |r| r.max.min(MAX_SITES));
                let node = Node {
                    sphere: Sphere::EMPTY,
                    done: Sums::ZERO,
                    last: usize::MAX,
                    count: 0,
                    left: self.geometry.coordination_number(),
                };
                self.walk(&node, 0, &fill, max_len, &mut state, progress);
            }
            Source::Rows(rows) => {
                for (r, (sphere, _)) in rows.iter().enumerate() {
                    let sums = self.sums(sphere);
                    self.visit(sphere, &sums, r as u32, &mut state, progress);
                }
            }
        }
        progress(state.spheres);
        Outcome {
            hits: state.ranking.finish(),
            candidates: state.spheres,
            evaluated: state.evaluated,
            skipped: state.skipped,
        }
    }

    /// fill[k][r]: r sites can be filled with pool ligands k, k+1, … (repeats allowed).
    fn fillable(&self) -> Vec<[bool; MAX_SITES + 1]> {
        let m = self.pool.len();
        let mut fill = vec![[false; MAX_SITES + 1]; m + 1];
        fill[m][0] = true;
        for k in (0..m).rev() {
            let d = self.pool[k].denticity;
            for r in 0..=MAX_SITES {
                fill[k][r] = fill[k + 1][r] || (d <= r && fill[k][r - d]);
            }
        }
        fill
    }

    /// Depth-first walk over multisets as non-decreasing index sequences. `done` holds the sums
    /// of the finished runs; the current run (`last`, `count`) is added when it ends, so the
    /// terms are added in pool order exactly as `resolve` adds them.
    fn walk(
        &self,
        node: &Node,
        start: usize,
        fill: &[[bool; MAX_SITES + 1]],
        max_len: usize,
        state: &mut RunState,
        progress: &mut dyn FnMut(u64),
    ) {
        // The finished runs plus the current one closed: every k after `last` starts a new
        // run on top of it, so it is added once here instead of once per k (the same terms in
        // the same order, so the same sums).
        let closed = if node.count > 0 {
            node.done.add_run(&self.pool[node.last], node.count)
        } else {
            node.done
        };
        for k in start..self.pool.len() {
            let d = self.pool[k].denticity;
            if d > node.left || !fill[k][node.left - d] {
                continue;
            }
            let left = node.left - d;
            let same = k == node.last;
            if left == 0 {
                let (base, count) = if same {
                    (&node.done, node.count + 1)
                } else {
                    (&closed, 1)
                };
                let l = &self.pool[k];
                if let (true, Some(fast), Some(bar)) =
                    (state.light_leaves, &state.fast[0], state.ranking.bar())
                {
                    // Only Σf, Σπ and Σh enter the reject test; the same additions as
                    // `add_run`, so the same values.
                    let f = base.f + l.f_terms[count];
                    let pi = base.pi + l.pi_terms[count];
                    let h = base.h + l.h_terms[count];
                    if fast.rejects_terms(self.target, f, pi, h, bar) {
                        count_sphere(state, progress);
                        state.evaluated += 1;
                        continue;
                    }
                }
                let sums = base.add_run(l, count);
                let mut sphere = node.sphere;
                sphere.push(k);
                self.visit(&sphere, &sums, 0, state, progress);
            } else if (node.sphere.len as usize) + 1 < max_len {
                let mut n = *node;
                n.sphere.push(k);
                if same {
                    n.count += 1;
                } else {
                    n.done = closed;
                    n.last = k;
                    n.count = 1;
                }
                n.left = left;
                self.walk(&n, k, fill, max_len, state, progress);
            }
        }
    }

    #[inline]
    fn visit(
        &self,
        sphere: &Sphere,
        sums: &Sums,
        row: u32,
        state: &mut RunState,
        progress: &mut dyn FnMut(u64),
    ) {
        count_sphere(state, progress);
        if !self.passes(sphere, sums) {
            return;
        }
        for (i, ion) in self.ions.iter().enumerate() {
            if let Some(q) = self.compiled.max_abs_charge {
                if (ion.ion.oxidation_state + sums.charge).abs() > q {
                    continue;
                }
            }
            state.evaluated += 1;
            if let (Some(fast), Some(bar)) = (&state.fast[i], state.ranking.bar()) {
                if fast.rejects(self.target, sums, bar) {
                    continue;
                }
            }
            let Some(p) = self.parameters(ion, sums) else {
                state.skipped += 1;
                continue;
            };
            state.ranking.offer(Hit {
                score: self.score(ion, &p),
                ion: i as u16,
                sphere: *sphere,
                row,
            });
        }
    }

    /// Score of one candidate for the target (see the module docs), from the mean field Δ̄/B
    /// of the two spin states.
    #[inline]
    fn score(&self, ion: &ScreenIon, p: &Parameters) -> f64 {
        let xc = ion.crossover_delta_over_b;
        let mean = 0.5 * (p.delta_high_spin + p.delta_low_spin) / p.b;
        match self.target {
            Target::Crossover => {
                let aim = estimate::crossover_target(
                    &ion.crossover,
                    &ion.spin_geometry,
                    p.b,
                    &self.calibration,
                )
                .unwrap_or(xc);
                -100.0 * (mean - aim).abs() / xc
            }
            Target::High | Target::Low => self.target.score(100.0 * (mean - xc) / xc),
        }
    }

    /// The full evaluation of a ranked hit.
    pub fn candidate(&self, hit: &Hit) -> Candidate {
        let ion = &self.ions[hit.ion as usize];
        let sums = self.sums(&hit.sphere);
        let p = self.parameters(ion, &sums).unwrap_or(Parameters {
            delta_high_spin: f64::NAN,
            delta_low_spin: f64::NAN,
            b: f64::NAN,
        });
        let choice = estimate::choose_spin(
            p.delta_high_spin / p.b,
            p.delta_low_spin / p.b,
            p.b,
            &ion.crossover,
            &self.calibration,
        );
        let xc = ion.crossover_delta_over_b;
        let x = choice.map_or(f64::NAN, |c| c.delta_over_b_mean);
        let margin = x - xc;
        let percent = 100.0 * margin / xc;
        let reliability = Reliability {
            worst_f: sums.worst_f,
            g: ion.ion.provenance_of("g"),
            b0: ion.ion.provenance_of("b0"),
            back_bonding: sums.pi > 0.0
                && estimate::back_bonding_steps(ion.ion.oxidation_state) > 0.0,
            b_defaulted: sums.h_defaulted || ion.ion.k.is_none(),
            heavy: ion.ion.series != TransitionSeries::ThreeD,
            geometry: self.geometry,
        };
        let u = reliability.delta().hypot(reliability.b());
        let name = match &self.source {
            Source::Rows(rows) => rows.get(hit.row as usize).and_then(|(_, n)| n.clone()),
            Source::Pool => None,
        };
        let state = choice.map_or(SpinState::High, |c| c.state);
        let delta = if state.low_spin_ground() {
            p.delta_low_spin
        } else {
            p.delta_high_spin
        };
        Candidate {
            ion: hit.ion as usize,
            sphere: hit.sphere,
            ligands: hit.sphere.runs(),
            name,
            charge: ion.ion.oxidation_state + sums.charge,
            delta,
            delta_high_spin: p.delta_high_spin,
            delta_low_spin: p.delta_low_spin,
            b: p.b,
            c: ion.c_over_b * p.b,
            c_over_b: ion.c_over_b,
            delta_over_b: delta / p.b,
            mean_delta_over_b: x,
            crossover_delta_over_b: xc,
            margin,
            percent,
            energy_gap: choice.map_or(f64::NAN, |c| c.energy_gap),
            uncertainty: u,
            borderline: margin.abs() <= u * x,
            spin_state: state,
            score: self.score(ion, &p),
        }
    }

    /// A formula such as "[Fe(NCS)2(py)4]" (ligands in table order; the same convention as
    /// `ResolvedComplex::formula`).
    pub fn formula(&self, c: &Candidate) -> String {
        let ion = &self.ions[c.ion].ion;
        let mut s = format!("[{}", ion.symbol);
        for &(i, n) in &c.ligands {
            let l = &self.pool[i].ligand;
            if l.donors == [l.name.clone()] {
                s.push_str(&l.name);
            } else {
                s.push_str(&format!("({})", l.name));
            }
            if n > 1 {
                s.push_str(&n.to_string());
            }
        }
        s.push(']');
        match c.charge {
            0 => {}
            1 => s.push('+'),
            -1 => s.push('-'),
            q if q > 0 => s.push_str(&format!("{q}+")),
            q => s.push_str(&format!("{}-", -q)),
        }
        s
    }

    /// The donor-atom set of a candidate, e.g. "N4O2".
    pub fn donor_set(&self, c: &Candidate) -> DonorSet {
        DonorSet::of_atoms(c.ligands.iter().flat_map(|&(i, n)| {
            std::iter::repeat_n(&self.pool[i].ligand.donors, n)
                .flatten()
                .map(String::as_str)
        }))
    }

    /// Ligand names and counts of a candidate, in table order.
    pub fn ligand_counts(&self, c: &Candidate) -> Vec<(String, usize)> {
        c.ligands
            .iter()
            .map(|&(i, n)| (self.pool[i].ligand.name.clone(), n))
            .collect()
    }
}

/// Counts one sphere walked, and reports progress every 65 536 spheres.
#[inline]
fn count_sphere(state: &mut RunState, progress: &mut dyn FnMut(u64)) {
    state.spheres += 1;
    if state.spheres & 0xFFFF == 0 {
        progress(state.spheres);
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::complex::{ComplexSpec, LigandCount, Overrides};
    use crate::predict::predict;
    use crate::tables::LigandTable;

    const LIGAND_HEADER: &str =
        "name,aliases,donors,denticity,charge,f,f_from,h,e_sigma,e_pi,pi,binds,caution,source";

    fn bundled() -> &'static DataSet {
        DataSet::bundled()
    }

    fn fe2() -> Vec<IonSpec> {
        vec![IonSpec {
            metal: "Fe".into(),
            oxidation_state: 2,
        }]
    }

    fn names(list: &[&str]) -> Vec<String> {
        list.iter().map(|s| s.to_string()).collect()
    }

    /// A table of `n` synthetic monodentate N-donor ligands (test-only; not real ligands).
    fn synthetic_monodentates(n: usize) -> DataSet {
        let mut csv = String::from(LIGAND_HEADER);
        csv.push('\n');
        for i in 0..n {
            csv.push_str(&format!(
                "SYN{i:02},,N,1,0,{:.3},printed,1.0,,,none,oct tet sqpl,,synthetic test ligand (not a real ligand)\n",
                0.7 + 0.03 * i as f64
            ));
        }
        DataSet::default().with_text::<LigandTable>(csv)
    }

    fn binomial(n: u64, k: u64) -> u64 {
        (0..k).fold(1u64, |acc, i| acc * (n - i) / (i + 1))
    }

    /// Seeded xorshift64*: reproducible random numbers without a dependency.
    struct Rng(u64);
    impl Rng {
        fn next(&mut self) -> u64 {
            self.0 ^= self.0 >> 12;
            self.0 ^= self.0 << 25;
            self.0 ^= self.0 >> 27;
            self.0.wrapping_mul(0x2545_F491_4F6C_DD1D)
        }
        fn below(&mut self, n: usize) -> usize {
            (self.next() % n as u64) as usize
        }
    }

    /// A random multiset of `pool` filling `sites`, as (pool index, count) in pool order.
    fn random_sphere(rng: &mut Rng, pool: &[PoolLigand], sites: usize) -> Vec<(usize, usize)> {
        loop {
            let mut left = sites;
            let mut counts = vec![0usize; pool.len()];
            let mut tries = 0;
            while left > 0 && tries < 50 {
                let i = rng.below(pool.len());
                if pool[i].denticity <= left {
                    counts[i] += 1;
                    left -= pool[i].denticity;
                }
                tries += 1;
            }
            if left == 0 {
                return counts
                    .into_iter()
                    .enumerate()
                    .filter(|(_, c)| *c > 0)
                    .collect();
            }
        }
    }

    fn hit_for(ion: usize, runs: &[(usize, usize)]) -> Hit {
        let mut s = Sphere::EMPTY;
        for &(i, c) in runs {
            for _ in 0..c {
                s.push(i);
            }
        }
        Hit {
            score: 0.0,
            ion: ion as u16,
            sphere: s,
            row: 0,
        }
    }

    /// Multisets of k items from n kinds: C(n + k − 1, k) (common practice, the "stars and
    /// bars" count); 30 monodentates filling 6 sites give C(35, 6) = 1 623 160.
    #[test]
    fn monodentate_counts_follow_the_multiset_formula() {
        for n in 1..=30u64 {
            for k in [4u64, 6] {
                assert_eq!(
                    count_spheres(&vec![1; n as usize], k as usize),
                    binomial(n + k - 1, k)
                );
            }
        }
        assert_eq!(binomial(35, 6), 1_623_160);
        let t = synthetic_monodentates(30);
        let pool: Vec<String> = t
            .ligands()
            .unwrap()
            .rows
            .iter()
            .map(|l| l.name.clone())
            .collect();
        let s = Screen::from_pool(
            &t,
            &fe2(),
            Geometry::Octahedral,
            &pool,
            &Filters::default(),
            Target::Crossover,
        )
        .unwrap();
        assert_eq!(s.candidate_count(), 1_623_160);
        let out = s.run(Keep::Top(5), &mut |_| {});
        assert_eq!(out.candidates, 1_623_160);
        assert_eq!(out.evaluated, 1_623_160);
        assert_eq!(out.hits.len(), 5);
    }

    /// Mixed denticities: with a monodentates, b bidentates and c tridentates, the spheres of an
    /// octahedron number Σ C(b+j−1, j)·C(c+t−1, t)·C(a+r−1, r) over 2j + 3t ≤ 6, r = 6 − 2j − 3t
    /// (common practice: a product of multiset counts per denticity).
    #[test]
    fn mixed_denticity_counts_and_walk_agree() {
        let pool = names(&["H2O", "NH3", "py", "NCS", "Cl", "en", "bpy", "ox", "terpy"]);
        let (a, b, c) = (5u64, 3u64, 1u64);
        let multiset = |n: u64, k: u64| if k == 0 { 1 } else { binomial(n + k - 1, k) };
        let mut expected = 0;
        for j in 0..=3u64 {
            for t in 0..=2u64 {
                if 2 * j + 3 * t <= 6 {
                    let r = 6 - 2 * j - 3 * t;
                    expected += multiset(b, j) * multiset(c, t) * multiset(a, r);
                }
            }
        }
        let s = Screen::from_pool(
            bundled(),
            &fe2(),
            Geometry::Octahedral,
            &pool,
            &Filters::default(),
            Target::Crossover,
        )
        .unwrap();
        assert_eq!(s.candidate_count(), expected);
        let out = s.run(Keep::All, &mut |_| {});
        assert_eq!(out.candidates, expected);
        assert_eq!(out.hits.len() as u64, expected);
        // Every sphere fills the octahedron, and no sphere appears twice.
        let mut seen = std::collections::HashSet::new();
        for h in &out.hits {
            let sites: usize = h
                .sphere
                .indices()
                .iter()
                .map(|&i| s.pool[i as usize].denticity)
                .sum();
            assert_eq!(sites, 6);
            assert!(seen.insert(h.sphere));
        }
    }

    /// The screen's Δ, B, C and Δ/B are those of ComplexSpec::resolve bit for bit, and its spin
    /// state, margin and borderline flag those of predict (same estimate, same rule), for
    /// random spheres of several ions and all three geometries.
    #[test]
    fn numbers_agree_with_resolve_and_predict() {
        let t = bundled();
        let ions: Vec<IonSpec> = [
            ("Fe", 2),
            ("Fe", 3),
            ("Co", 2),
            ("Co", 3),
            ("Mn", 2),
            ("Mn", 3),
            ("Cr", 2),
        ]
        .iter()
        .map(|(m, o)| IonSpec {
            metal: m.to_string(),
            oxidation_state: *o,
        })
        .collect();
        let mut rng = Rng(0x5EED_2024_0007);
        for geometry in [
            Geometry::Octahedral,
            Geometry::Tetrahedral,
            Geometry::SquarePlanar,
        ] {
            let usable: Vec<IonSpec> = ions
                .iter()
                .filter(|i| prepare_ion(t, i, geometry).is_ok())
                .cloned()
                .collect();
            if usable.is_empty() {
                continue;
            }
            let s = Screen::from_pool(
                t,
                &usable,
                geometry,
                &names(&["all"]),
                &Filters::default(),
                Target::Crossover,
            )
            .unwrap();
            let sites = geometry.coordination_number();
            let mut compared = 0;
            for n in 0..1500 {
                let runs = random_sphere(&mut rng, &s.pool, sites);
                let ion_i = rng.below(s.ions.len());
                let c = s.candidate(&hit_for(ion_i, &runs));
                let ion = &s.ions[ion_i].ion;
                let spec = ComplexSpec {
                    metal: ion.symbol.clone(),
                    oxidation_state: ion.oxidation_state,
                    geometry,
                    ligands: runs
                        .iter()
                        .map(|&(i, k)| LigandCount {
                            name: s.pool[i].ligand.name.clone(),
                            count: k,
                        })
                        .collect(),
                    overrides: Overrides::default(),
                };
                let r = match spec.resolve(t) {
                    Ok(r) => r,
                    Err(e) => {
                        assert!(
                            c.delta_over_b.is_nan(),
                            "resolve failed ({e}) but screen did not"
                        );
                        continue;
                    }
                };
                assert_eq!(c.delta, r.delta.value, "{spec:?}");
                assert_eq!(c.delta_high_spin, r.delta_high_spin.value, "{spec:?}");
                assert_eq!(c.delta_low_spin, r.delta_low_spin.value, "{spec:?}");
                assert_eq!(c.b, r.b.value, "{spec:?}");
                assert_eq!(c.c, r.c.value, "{spec:?}");
                let choice = r.spin_choice.unwrap();
                assert_eq!(c.mean_delta_over_b, choice.delta_over_b_mean, "{spec:?}");
                assert_eq!(c.delta_over_b, r.delta_over_b(), "{spec:?}");
                assert_eq!(c.energy_gap, choice.energy_gap, "{spec:?}");
                assert_eq!(c.spin_state, choice.state, "{spec:?}");
                assert_eq!(c.uncertainty, r.delta_over_b_uncertainty(), "{spec:?}");
                assert_eq!(c.charge, r.charge);
                assert_eq!(s.formula(&c), r.formula());
                compared += 1;
                // predict diagonalises per complex: check a subset.
                if n % 25 == 0 {
                    let p = predict(&r).unwrap();
                    let m = p.margin.unwrap();
                    approx::assert_abs_diff_eq!(c.margin, m.delta_over_b, epsilon = 1e-9);
                    approx::assert_abs_diff_eq!(c.percent, m.percent, epsilon = 1e-7);
                    if (c.margin.abs() - c.uncertainty * c.mean_delta_over_b).abs() > 1e-9 {
                        assert_eq!(c.borderline, m.borderline, "{spec:?}");
                    }
                    assert_eq!(c.spin_state, p.spin_state, "{spec:?}");
                }
            }
            assert!(compared > 1400, "{geometry:?}: {compared}");
        }
    }

    /// Tsuchida's spectrochemical series (as given in F. A. Cotton, G. Wilkinson, Advanced
    /// Inorganic Chemistry, and J. E. Huheey, Inorganic Chemistry; from memory), restricted to
    /// ligands of the table: Br⁻ < SCN⁻ < Cl⁻ < N₃⁻ < F⁻ < H₂O < NCS⁻ < CH₃CN < py < NH₃ < NO₂⁻ <
    /// CN⁻, and for chelates C₂O₄²⁻ < en < bipy. Swapping one ligand for the next in the series
    /// never lowers Δ, whatever the rest of the sphere.
    #[test]
    fn swapping_up_the_series_never_lowers_delta() {
        let mono = [
            "Br", "SCN", "Cl", "N3", "F", "H2O", "NCS", "MeCN", "py", "NH3", "NO2", "CN",
        ];
        let chel = ["ox", "en", "bpy"];
        let pool: Vec<String> = mono
            .iter()
            .chain(chel.iter())
            .map(|s| s.to_string())
            .collect();
        let t = bundled();
        for geometry in [Geometry::Octahedral, Geometry::Tetrahedral] {
            let s = Screen::from_pool(
                t,
                &fe2(),
                geometry,
                &pool,
                &Filters::default(),
                Target::Crossover,
            )
            .unwrap();
            let idx = |n: &str| s.pool.iter().position(|p| p.ligand.name == n).unwrap();
            let mut rng = Rng(0xA11CE);
            for _ in 0..400 {
                let runs = random_sphere(&mut rng, &s.pool, geometry.coordination_number());
                let base = s.candidate(&hit_for(0, &runs));
                for series in [&mono[..], &chel[..]] {
                    for w in series.windows(2) {
                        let (lo, hi) = (idx(w[0]), idx(w[1]));
                        let Some(pos) = runs.iter().position(|&(i, _)| i == lo) else {
                            continue;
                        };
                        let mut swapped = runs.clone();
                        swapped[pos].1 -= 1;
                        match swapped.iter_mut().find(|(i, _)| *i == hi) {
                            Some((_, c)) => *c += 1,
                            None => swapped.push((hi, 1)),
                        }
                        swapped.retain(|(_, c)| *c > 0);
                        swapped.sort();
                        let up = s.candidate(&hit_for(0, &swapped));
                        assert!(
                            up.delta_high_spin >= base.delta_high_spin,
                            "{} → {}: {} < {}",
                            w[0],
                            w[1],
                            up.delta_high_spin,
                            base.delta_high_spin
                        );
                    }
                }
            }
        }
    }

    /// Homoleptic Fe(II) spheres follow the spectrochemical series in Δ (Tsuchida; Cotton &
    /// Wilkinson, Huheey, from memory): Br⁻ < Cl⁻ < F⁻ < H₂O < NCS⁻ < py < NH₃ < CN⁻. The
    /// ranking is by Δ/B, which B also moves (py and NCS⁻ have no published h and take the
    /// N-donor mean); for the ligands with a published h (Jørgensen's f and h) target "low"
    /// ranks them from CN⁻ down and target "high" from Br⁻ up. [Fe(H2O)6]2+ is high-spin and
    /// [Fe(CN)6]4− low-spin (common practice).
    #[test]
    fn homoleptic_spheres_follow_the_series() {
        let homoleptic = Filters {
            kinds: Some(SizeRange { min: 1, max: 1 }),
            ..Filters::default()
        };
        let first = |s: &Screen, h: &Hit| s.ligand_counts(&s.candidate(h))[0].0.clone();
        let series = ["Br", "Cl", "F", "H2O", "NCS", "py", "NH3", "CN"];
        let s = Screen::from_pool(
            bundled(),
            &fe2(),
            Geometry::Octahedral,
            &names(&series),
            &homoleptic,
            Target::Low,
        )
        .unwrap();
        let mut by_delta: Vec<(f64, String)> = s
            .run(Keep::All, &mut |_| {})
            .hits
            .iter()
            .map(|h| (s.candidate(h).delta, first(&s, h)))
            .collect();
        by_delta.sort_by(|a, b| a.0.total_cmp(&b.0));
        let got: Vec<&str> = by_delta.iter().map(|(_, n)| n.as_str()).collect();
        assert_eq!(got, series);

        let with_h = ["Br", "Cl", "F", "H2O", "NH3", "CN"];
        for (target, expected) in [
            (Target::High, with_h.to_vec()),
            (Target::Low, with_h.iter().rev().copied().collect()),
        ] {
            let s = Screen::from_pool(
                bundled(),
                &fe2(),
                Geometry::Octahedral,
                &names(&with_h),
                &homoleptic,
                target,
            )
            .unwrap();
            let out = s.run(Keep::All, &mut |_| {});
            let got: Vec<String> = out.hits.iter().map(|h| first(&s, h)).collect();
            assert_eq!(got, expected);
            let state = |n: &str| {
                let h = out.hits.iter().find(|h| first(&s, h) == n).unwrap();
                s.candidate(h).spin_state
            };
            assert_eq!(state("H2O"), SpinState::High);
            assert_eq!(state("CN"), SpinState::Low);
        }
    }

    /// The bounded heap keeps exactly the first N of the full ranking.
    #[test]
    fn top_n_is_the_head_of_the_full_ranking() {
        let pool = names(&[
            "H2O", "NH3", "py", "NCS", "Cl", "F", "CN", "en", "bpy", "ox",
        ]);
        for target in [Target::Crossover, Target::High, Target::Low] {
            let s = Screen::from_pool(
                bundled(),
                &fe2(),
                Geometry::Octahedral,
                &pool,
                &Filters::default(),
                target,
            )
            .unwrap();
            let all = s.run(Keep::All, &mut |_| {}).hits;
            for n in [1, 7, 50] {
                let top = s.run(Keep::Top(n), &mut |_| {}).hits;
                assert_eq!(top, all[..n].to_vec());
            }
            for w in all.windows(2) {
                assert!(w[0].score >= w[1].score);
            }
        }
    }

    #[test]
    fn filters_restrict_the_candidates() {
        let pool = names(&["H2O", "NH3", "py", "NCS", "Cl", "CN", "en", "bpy", "ox"]);
        let t = bundled();
        let run = |f: Filters| {
            let s = Screen::from_pool(
                t,
                &fe2(),
                Geometry::Octahedral,
                &pool,
                &f,
                Target::Crossover,
            )
            .unwrap();
            let hits = s.run(Keep::All, &mut |_| {}).hits;
            let cands: Vec<Candidate> = hits.iter().map(|h| s.candidate(h)).collect();
            (s, cands)
        };
        let (s, c) = run(Filters {
            donors: Some("N6".parse().unwrap()),
            ..Filters::default()
        });
        assert!(!c.is_empty());
        for x in &c {
            assert_eq!(s.donor_set(x).to_string(), "N6");
        }
        let (s, c) = run(Filters {
            donors: Some("O2N4".parse().unwrap()),
            ..Filters::default()
        });
        assert!(c.iter().all(|x| s.donor_set(x).to_string() == "N4O2") && !c.is_empty());
        let (_, c) = run(Filters {
            max_abs_charge: Some(0),
            ..Filters::default()
        });
        assert!(c.iter().all(|x| x.charge == 0) && !c.is_empty());
        let (s, c) = run(Filters {
            require: names(&["NCS"]),
            forbid: names(&["CN", "Cl"]),
            size: Some("3..4".parse().unwrap()),
            ..Filters::default()
        });
        assert!(!c.is_empty());
        for x in &c {
            let l = s.ligand_counts(x);
            assert!(l.iter().any(|(n, _)| n == "NCS"));
            assert!(!l.iter().any(|(n, _)| n == "CN" || n == "Cl"));
            let bound: usize = l.iter().map(|(_, k)| k).sum();
            assert!((3..=4).contains(&bound));
        }
        let (s, c) = run(Filters {
            kinds: Some("2".parse().unwrap()),
            ..Filters::default()
        });
        assert!(c.iter().all(|x| s.ligand_counts(x).len() == 2) && !c.is_empty());
    }

    #[test]
    fn bad_pools_and_ions_are_explained() {
        let t = bundled();
        let err = |ions: &[IonSpec], g: Geometry, pool: &[&str], f: Filters| {
            Screen::from_pool(t, ions, g, &names(pool), &f, Target::Crossover)
                .unwrap_err()
                .to_string()
        };
        let e = err(
            &fe2(),
            Geometry::Octahedral,
            &["H2O", "pyy"],
            Filters::default(),
        );
        assert!(
            e.contains("pyy") && e.contains("did you mean") && e.contains("py"),
            "{e}"
        );
        let e = err(
            &fe2(),
            Geometry::SquarePlanar,
            &["terpy"],
            Filters::default(),
        );
        assert!(e.contains("cannot fill the 4 donor sites"), "{e}");
        // Every ligand in the table has an f, so a π acceptor such as CO is screened.
        assert!(Screen::from_pool(
            t,
            &fe2(),
            Geometry::Octahedral,
            &names(&["CO", "H2O"]),
            &Filters::default(),
            Target::Crossover
        )
        .is_ok());
        let e = err(
            &fe2(),
            Geometry::Tetrahedral,
            &["terpy", "H2O"],
            Filters::default(),
        );
        assert!(e.contains("does not bind in tet"), "{e}");
        let ni = [IonSpec {
            metal: "Ni".into(),
            oxidation_state: 2,
        }];
        let e = err(&ni, Geometry::Octahedral, &["H2O"], Filters::default());
        assert!(e.contains("one ground spin"), "{e}");
        let e = err(
            &fe2(),
            Geometry::Octahedral,
            &["H2O"],
            Filters {
                donors: Some("N4".parse().unwrap()),
                ..Filters::default()
            },
        );
        assert!(e.contains("exactly 6 donor atoms"), "{e}");
        let e = err(
            &fe2(),
            Geometry::Octahedral,
            &["H2O", "NH3"],
            Filters {
                require: names(&["py"]),
                ..Filters::default()
            },
        );
        assert!(e.contains("required ligand"), "{e}");
        assert!("Q6".parse::<DonorSet>().is_err());
        assert!("n6".parse::<DonorSet>().is_err());
        assert_eq!("N4O2".parse::<DonorSet>().unwrap().total(), 6);
        assert!("3..1".parse::<SizeRange>().is_err());
        assert_eq!(
            "2..=3".parse::<SizeRange>().unwrap(),
            SizeRange { min: 2, max: 3 }
        );
        assert!("medium".parse::<Target>().is_err());
    }

    const CANDIDATES: &str = "name,ligands,comment
A,NCS:2 py:4,trans isomer wanted
B,H2O:6,
C,en:3,
D,bpy:2 NCS:2,
E,NH3:6,
F,CN:6,
G,py:4 Cl:2,
H,phen:2 NCS:2,
";

    #[test]
    fn candidate_files_report_bad_rows_and_rank_the_rest() {
        let text = format!("{CANDIDATES}X1,pyy:6,\nX2,py:5,\nX3,,\nX4,tacn:3,\n");
        let (s, errors) = Screen::from_candidates(
            bundled(),
            &fe2(),
            Geometry::Octahedral,
            &text,
            &Filters::default(),
            Target::Crossover,
        )
        .unwrap();
        assert_eq!(errors.len(), 4);
        assert_eq!((errors[0].row, errors[0].line), (9, 10));
        assert!(
            errors[0].to_string().contains("column ligands") && errors[0].message.contains("py")
        );
        assert!(errors[1].message.contains("5 donor atoms"), "{}", errors[1]);
        assert!(errors[2].message.contains("empty"));
        assert!(errors[3].message.contains("9 donor atoms"), "{}", errors[3]);
        let out = s.run(Keep::All, &mut |_| {});
        assert_eq!(out.candidates, 8);
        assert_eq!(out.hits.len(), 8);
        let e = Screen::from_candidates(
            bundled(),
            &fe2(),
            Geometry::Octahedral,
            "name,sphere\nA,py:6\n",
            &Filters::default(),
            Target::Crossover,
        )
        .unwrap_err()
        .to_string();
        assert!(e.contains("'ligands' column"), "{e}");
    }

    /// Results do not depend on the order of the rows of a candidates file (property test,
    /// deterministic runner).
    #[test]
    fn results_do_not_depend_on_row_order() {
        use proptest::prelude::*;
        use proptest::test_runner::{Config, TestRunner};
        let lines: Vec<&str> = CANDIDATES.lines().skip(1).collect();
        let reference = |text: &str| {
            let (s, _) = Screen::from_candidates(
                bundled(),
                &fe2(),
                Geometry::Octahedral,
                text,
                &Filters::default(),
                Target::Crossover,
            )
            .unwrap();
            let hits = s.run(Keep::All, &mut |_| {}).hits;
            hits.iter()
                .map(|h| {
                    let c = s.candidate(h);
                    (
                        s.formula(&c),
                        c.name.clone(),
                        c.delta.to_bits(),
                        c.score.to_bits(),
                    )
                })
                .collect::<Vec<_>>()
        };
        let expected = reference(CANDIDATES);
        let mut runner = TestRunner::new_with_rng(
            Config::with_cases(64),
            proptest::test_runner::TestRng::deterministic_rng(
                proptest::test_runner::RngAlgorithm::ChaCha,
            ),
        );
        runner
            .run(&Just(lines.clone()).prop_shuffle(), |shuffled| {
                let text = format!("name,ligands,comment\n{}\n", shuffled.join("\n"));
                prop_assert_eq!(reference(&text), expected.clone());
                Ok(())
            })
            .unwrap();
    }
}
