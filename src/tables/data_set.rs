//! [`DataSet`]: every data table, bundled or from a `--data` directory, each parsed at most once
//! and only when first asked for (a `predict` never parses `pascal.csv`).

use super::{
    BondLengthTable, ChargeTransferTable, CovalentRadii, IonTable, LigandTable, MomentRangeTable,
    PascalTable, ReportedTable, Table,
};
use crate::error::{Error, Result};
use std::path::{Path, PathBuf};
use std::sync::OnceLock;

/// One table, parsed on first use; the result (table or error) is kept.
type Lazy<T> = OnceLock<Result<T>>;

/// The data tables of one run: the bundled copies, with the files of a `--data` directory (or
/// texts given in memory) replacing them file by file. A table is read and parsed on first use
/// and kept; a table that fails to parse fails every time it is asked for, with the same error.
/// `DataSet::default()` is an owned set of the bundled tables (to replace some with
/// [`DataSet::with_text`]).
#[derive(Debug, Default)]
pub struct DataSet {
    dir: Option<PathBuf>,
    /// Texts that replace tables, by file name (synthetic tables in tests and benchmarks).
    texts: Vec<(&'static str, String)>,
    ions: Lazy<IonTable>,
    ligands: Lazy<LigandTable>,
    reported: Lazy<ReportedTable>,
    charge_transfer: Lazy<ChargeTransferTable>,
    pascal: Lazy<PascalTable>,
    moment_ranges: Lazy<MomentRangeTable>,
    bond_lengths: Lazy<BondLengthTable>,
    covalent_radii: Lazy<CovalentRadii>,
}

impl DataSet {
    const fn empty(dir: Option<PathBuf>) -> Self {
        DataSet {
            dir,
            texts: Vec::new(),
            ions: OnceLock::new(),
            ligands: OnceLock::new(),
            reported: OnceLock::new(),
            charge_transfer: OnceLock::new(),
            pascal: OnceLock::new(),
            moment_ranges: OnceLock::new(),
            bond_lengths: OnceLock::new(),
            covalent_radii: OnceLock::new(),
        }
    }

    /// The tables bundled with the binary (shared by the whole process).
    pub fn bundled() -> &'static DataSet {
        static BUNDLED: DataSet = DataSet::empty(None);
        &BUNDLED
    }

    /// The tables with every file present in `dir` replacing the bundled copy; files absent
    /// from `dir` keep the bundled data. Nothing is read until a table is asked for.
    pub fn from_dir(dir: &Path) -> Result<DataSet> {
        if !dir.is_dir() {
            return Err(Error::invalid(
                crate::param::Param::DataDir,
                dir.display(),
                "an existing directory holding edited copies of ions.csv and/or ligands.csv",
            ));
        }
        Ok(DataSet::empty(Some(dir.to_path_buf())))
    }

    /// The bundled tables with the table `T` replaced by `text` (synthetic tables for tests and
    /// benchmarks).
    pub fn with_text<T: Table>(mut self, text: impl Into<String>) -> DataSet {
        self.texts.retain(|(f, _)| *f != T::FILE);
        self.texts.push((T::FILE, text.into()));
        self
    }

    /// The `--data` directory, if any.
    pub fn dir(&self) -> Option<&Path> {
        self.dir.as_deref()
    }

    /// The file names of the tables parsed so far (successfully or not), in a fixed order.
    pub fn parsed(&self) -> Vec<&'static str> {
        [
            (IonTable::FILE, self.ions.get().is_some()),
            (LigandTable::FILE, self.ligands.get().is_some()),
            (ReportedTable::FILE, self.reported.get().is_some()),
            (
                ChargeTransferTable::FILE,
                self.charge_transfer.get().is_some(),
            ),
            (PascalTable::FILE, self.pascal.get().is_some()),
            (MomentRangeTable::FILE, self.moment_ranges.get().is_some()),
            (BondLengthTable::FILE, self.bond_lengths.get().is_some()),
            (CovalentRadii::FILE, self.covalent_radii.get().is_some()),
        ]
        .into_iter()
        .filter_map(|(file, parsed)| parsed.then_some(file))
        .collect()
    }

    /// `ions.csv`.
    pub fn ions(&self) -> Result<&IonTable> {
        self.get(&self.ions, || Ok(&()))
    }

    /// `ligands.csv`.
    pub fn ligands(&self) -> Result<&LigandTable> {
        self.get(&self.ligands, || Ok(&()))
    }

    /// `reported_spin_states.csv`, validated against the ligand table.
    pub fn reported(&self) -> Result<&ReportedTable> {
        self.get(&self.reported, || self.ligands())
    }

    /// `charge_transfer.csv`, validated against the ligand table.
    pub fn charge_transfer(&self) -> Result<&ChargeTransferTable> {
        self.get(&self.charge_transfer, || self.ligands())
    }

    /// `pascal.csv`.
    pub fn pascal(&self) -> Result<&PascalTable> {
        self.get(&self.pascal, || Ok(&()))
    }

    /// `moment_ranges.csv`.
    pub fn moment_ranges(&self) -> Result<&MomentRangeTable> {
        self.get(&self.moment_ranges, || Ok(&()))
    }

    /// `bond_lengths.csv`.
    pub fn bond_lengths(&self) -> Result<&BondLengthTable> {
        self.get(&self.bond_lengths, || Ok(&()))
    }

    /// `covalent_radii.csv`.
    pub fn covalent_radii(&self) -> Result<&CovalentRadii> {
        self.get(&self.covalent_radii, || Ok(&()))
    }

    fn get<'s, T: Table>(
        &'s self,
        slot: &'s Lazy<T>,
        context: impl FnOnce() -> Result<&'s T::Context>,
    ) -> Result<&'s T> {
        slot.get_or_init(|| self.read(context()?))
            .as_ref()
            .map_err(Clone::clone)
    }

    /// The table from its replacing text, its file in the directory, or the bundled copy.
    fn read<T: Table>(&self, context: &T::Context) -> Result<T> {
        if let Some((_, text)) = self.texts.iter().find(|(f, _)| *f == T::FILE) {
            return T::parse_with(text, context);
        }
        if let Some(dir) = &self.dir {
            let path = dir.join(T::FILE);
            if path.exists() {
                let named = |message: String| Error::Data {
                    table: path.display().to_string(),
                    message,
                };
                let text = crate::input_file::read_text(&path)
                    .map_err(|e| named(format!("cannot be read: {e}")))?;
                return T::parse_with(&text, context).map_err(|e| match e {
                    Error::Data { message, .. } => named(message),
                    other => other,
                });
            }
        }
        T::parse_with(T::BUNDLED, context)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// `text` with the cell of `column` in the second data row (line 3) replaced by `value`.
    fn with_bad_cell<T: Table>(column: &str, value: &str) -> String {
        let mut reader = csv::Reader::from_reader(T::BUNDLED.as_bytes());
        let header = reader.headers().unwrap().clone();
        let idx = header.iter().position(|h| h == column).unwrap();
        let mut writer = csv::Writer::from_writer(Vec::new());
        writer.write_record(&header).unwrap();
        for (i, rec) in reader.records().enumerate() {
            let rec = rec.unwrap();
            let cells: Vec<&str> = rec
                .iter()
                .enumerate()
                .map(|(j, c)| if i == 1 && j == idx { value } else { c })
                .collect();
            writer.write_record(&cells).unwrap();
        }
        String::from_utf8(writer.into_inner().unwrap()).unwrap()
    }

    fn dir_with(files: &[(&str, &str)]) -> tempfile::TempDir {
        let dir = tempfile::tempdir().unwrap();
        for (name, text) in files {
            std::fs::write(dir.path().join(name), text).unwrap();
        }
        dir
    }

    #[test]
    fn nothing_is_parsed_until_asked_and_then_only_what_is_needed() {
        let dir = dir_with(&[]);
        let data = DataSet::from_dir(dir.path()).unwrap();
        assert!(data.parsed().is_empty());
        data.ions().unwrap();
        assert_eq!(data.parsed(), ["ions.csv"]);
        // The reported table is checked against the ligand table, which it parses first.
        data.reported().unwrap();
        assert_eq!(
            data.parsed(),
            ["ions.csv", "ligands.csv", "reported_spin_states.csv"]
        );
        data.pascal().unwrap();
        assert_eq!(data.parsed().len(), 4);
        assert!(!data.parsed().contains(&"moment_ranges.csv"));
    }

    #[test]
    fn a_broken_file_is_reported_only_when_its_table_is_used() {
        let dir = dir_with(&[
            ("pascal.csv", "kind,name\natom\n"),
            ("moment_ranges.csv", "not a table"),
        ]);
        let data = DataSet::from_dir(dir.path()).unwrap();
        // What a prediction needs parses; the broken tables are never read.
        assert!(data.ions().is_ok() && data.ligands().is_ok());
        assert!(data.reported().is_ok() && data.charge_transfer().is_ok());
        assert!(!data.parsed().contains(&"pascal.csv"));
        let e = data.pascal().unwrap_err().to_string();
        assert!(e.contains("pascal.csv") && e.contains("header"), "{e}");
        assert!(e.contains(&dir.path().display().to_string()), "{e}");
        // A failed table fails again with the same error.
        assert_eq!(data.pascal().unwrap_err().to_string(), e);
        assert!(data.moment_ranges().is_err());
    }

    #[test]
    fn each_table_is_read_once() {
        let ligands = format!(
            "{}\nTESTL,,N,1,0,1.1,printed,,,,none,oct,,invented for this test\n",
            LigandTable::BUNDLED.trim_end()
        );
        let dir = dir_with(&[("ligands.csv", &ligands)]);
        let data = DataSet::from_dir(dir.path()).unwrap();
        let first = data.ligands().unwrap();
        assert!(first.find("TESTL").is_ok());
        // The file is not read again: a broken copy written now is never seen.
        std::fs::write(dir.path().join("ligands.csv"), "broken").unwrap();
        let again = data.ligands().unwrap();
        assert!(std::ptr::eq(first, again));
        // A table absent from the directory keeps the bundled copy.
        assert_eq!(
            data.ions().unwrap(),
            DataSet::bundled().ions().unwrap(),
            "ions.csv is not in the directory"
        );
    }

    #[test]
    fn a_dependent_table_is_checked_against_the_replaced_ligand_table() {
        let mut ligands = LigandTable::HEADER.join(",");
        ligands.push_str("\nH2O,aqua,O,1,0,1.0,printed,1.0,,,donor,oct tet,,test row\n");
        let data = DataSet::default().with_text::<LigandTable>(ligands);
        // The bundled reported table names ligands this table lacks.
        let e = data.reported().unwrap_err().to_string();
        assert!(e.contains("reported_spin_states.csv"), "{e}");
        assert!(data.ions().is_ok());
    }

    /// Every table names the line and the column of a bad cell, read from a `--data` directory.
    #[test]
    fn every_table_names_the_line_and_column_of_a_bad_cell() {
        fn check<T: Table>(column: &str, value: &str, get: fn(&DataSet) -> Result<()>) {
            let dir = dir_with(&[(T::FILE, &with_bad_cell::<T>(column, value))]);
            let data = DataSet::from_dir(dir.path()).unwrap();
            let e = get(&data).unwrap_err().to_string();
            let path = dir.path().join(T::FILE).display().to_string();
            assert!(
                e.contains(&format!("data table {path}: line 3, column {column}:")),
                "{}: {e}",
                T::FILE
            );
            assert_eq!(e.lines().count(), 1, "{e}");
        }
        check::<IonTable>("b0", "abc", |d| d.ions().map(|_| ()));
        check::<LigandTable>("f", "9.5", |d| d.ligands().map(|_| ()));
        check::<ReportedTable>("unpaired", "x", |d| d.reported().map(|_| ()));
        check::<ChargeTransferTable>("onset_cm1", "12", |d| d.charge_transfer().map(|_| ()));
        check::<PascalTable>("value_1e-6_cm3_per_mol", "inf", |d| d.pascal().map(|_| ()));
        check::<MomentRangeTable>("mu_min_bm", "-1", |d| d.moment_ranges().map(|_| ()));
        check::<BondLengthTable>("oxidation_state", "two", |d| d.bond_lengths().map(|_| ()));
        check::<CovalentRadii>("radius_a", "", |d| d.covalent_radii().map(|_| ()));
    }
}
