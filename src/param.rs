//! The quantities a user can set, named once. An [`Error::InvalidParameter`](crate::Error)
//! carries one of these, so that callers route an error by the quantity it concerns (a batch
//! column, a command-line option) instead of by the words of its message.

use std::fmt;

/// A user-settable quantity (or a piece of user input) that a value was refused for. Its
/// `Display` is the chemist-readable label used in messages ("Δ", "spectrometer frequency").
#[derive(Debug, Clone, PartialEq)]
pub enum Param {
    // Composition of a complex
    /// The metal (element symbol).
    Metal,
    /// One metal ion of a list, e.g. "Fe(II)".
    MetalIon(String),
    /// The list of metal ions of a screen.
    MetalList,
    /// Oxidation state of the metal named (element symbol).
    OxidationState(String),
    Geometry,
    /// One `NAME[:COUNT]` ligand item.
    Ligand,
    /// The ligand of that name.
    NamedLigand(String),
    /// The count of a `NAME:COUNT` item.
    LigandCount,
    /// The ligands of a complex, as a whole.
    Ligands,
    DonorAtomCount,
    /// A donor-atom set such as N4O2.
    DonorSet,
    /// The ligand a donor atom of a structure is assigned to.
    DonorAssignment,
    /// A `donor=ligand` site assignment of a structure.
    Site,

    // Ligand-field parameters (cm⁻¹)
    /// Δ = 10Dq.
    Delta,
    Dq,
    /// Racah B.
    RacahB,
    /// Racah C.
    RacahC,
    /// Racah B held fixed in a band fit.
    FixedB,
    /// Free-ion Racah B₀.
    FreeIonB,
    COverB,
    /// Tetragonal parameters Ds and Dt together.
    DsDt,
    DeltaOverB,
    /// Δ/B at the spin crossover.
    CrossoverDeltaOverB,
    /// Upper end of a diagram's Δ/B axis.
    MaxDeltaOverB,
    /// B, C and the field together (their magnitude).
    EnergyScale,
    /// The ligand-field matrix.
    LigandField,
    DElectronCount,
    /// One-electron spin–orbit constant ζ.
    Zeta,
    /// ζ the eigenstates were computed with.
    ZetaOfEigenstates,
    /// Many-electron spin–orbit constant λ.
    Lambda,
    /// Orbital reduction factor κ.
    Kappa,
    /// Spin g factor.
    GFactor,
    /// Spin multiplicity asked for (high, low, auto).
    Spin,
    SpinState,
    /// The orbital sets of a configuration analysis.
    OrbitalSets,

    // Temperatures and grids
    Temperature,
    TemperatureRange,
    LowestTemperature,
    HighestTemperature,
    /// Number of points of a curve or diagram.
    Points,

    // Bands and spectra
    Bands,
    /// One band maximum.
    Band,
    /// A band maximum given as evidence.
    BandMaximum,
    /// A band position in the unit named.
    BandPosition(&'static str),
    NumberOfBands,
    SpinForbiddenBand,
    /// The request to fit C.
    FitC,
    /// Spectrometer window (nm).
    Window,
    /// Spectral resolution (cm⁻¹).
    Resolution,
    ChargeTransferOnset,
    /// An energy given as a wavenumber or wavelength.
    Wavenumber,

    // Susceptibilities and moments
    ChiM,
    ChiMCorrected,
    ChiMT,
    /// χ_M·T of a pure spin state (High or Low).
    ChiMTOfState(crate::spectra::SpinKind),
    /// One point of a χ_M·T curve: temperature (K) and line of its file.
    ChiMTAt {
        temperature: f64,
        line: usize,
    },
    /// A χ_M·T(T) curve given as evidence.
    ChiMTCurve,
    /// A spin-transition curve to fit.
    Curve,
    MuEff,
    /// Diamagnetic correction χ_D (cm³/mol).
    Dia,
    MolarMass,
    /// A molecular formula.
    Formula,
    /// A formula whose Pascal sum is asked for.
    PascalFormula,
    /// Magnetometer field.
    Field,
    /// Magnetometer background.
    Background,
    SampleMass,
    /// The standard uncertainty of another quantity.
    Uncertainty(Box<Param>),

    // Evans method
    Shift,
    SpectrometerFrequency,
    Concentration,
    /// Orientation of the tube in the magnet.
    Magnet,
    SoluteMass,
    SolutionVolume,
    /// Solvent mass susceptibility χ₀.
    SolventChi,
    /// The χ₀ term as a whole.
    SolventChiTerm,
    SolventDensity,
    SolutionDensity,
    /// The density term as a whole.
    DensityTerm,

    // Spin transitions
    /// ΔH of a spin transition.
    Enthalpy,
    /// ΔS of a spin transition.
    Entropy,
    /// Cooperativity Γ.
    Cooperativity,
    /// Trapped (residual) fraction.
    ResidualFraction,

    // Structures
    BondLength,
    /// Cut-off radius of a coordination sphere (Å).
    Cutoff,
    StructureFile,
    MetalIndex,
    MetalCentre,
    /// A unit-cell length (a, b or c).
    CellLength(&'static str),
    /// A unit-cell angle (α, β or γ).
    CellAngle(&'static str),
    CellAngles,
    Cell,

    // Screening
    /// What a screen ranks for.
    Target,
    /// A count range (number of ligands or of distinct ligands).
    SizeRange,
    MaxCharge,
    RequiredLigand,
    LigandFilter,
    /// The ligand pool of a screen.
    Pool,
    CandidatesFile,
    CandidatesHeader,

    // Files and tables
    /// A batch input file.
    InputFile,
    /// A column of a batch file.
    Column,
    /// A directory of edited data tables.
    DataDir,
}

impl Param {
    /// The label used in messages.
    pub fn label(&self) -> String {
        let s: &str = match self {
            Param::Metal => "metal",
            Param::MetalIon(name) => return format!("metal {name}"),
            Param::MetalList => "metal list",
            Param::OxidationState(symbol) => return format!("oxidation state of {symbol}"),
            Param::Geometry => "geometry",
            Param::Ligand => "ligand",
            Param::NamedLigand(name) => return format!("ligand {name}"),
            Param::LigandCount => "ligand count",
            Param::Ligands => "ligands",
            Param::DonorAtomCount => "donor-atom count",
            Param::DonorSet => "donor set",
            Param::DonorAssignment => "donor assignment",
            Param::Site => "site",
            Param::Delta => "Δ",
            Param::Dq => "Dq",
            Param::RacahB => "B",
            Param::RacahC => "C",
            Param::FixedB => "fixed B",
            Param::FreeIonB => "B0",
            Param::COverB => "C/B",
            Param::DsDt => "Ds/Dt",
            Param::DeltaOverB => "Δ/B",
            Param::CrossoverDeltaOverB => "crossover Δ/B",
            Param::MaxDeltaOverB => "maximum Δ/B",
            Param::EnergyScale => "B, C or field",
            Param::LigandField => "ligand field",
            Param::DElectronCount => "d-electron count",
            Param::Zeta => "ζ",
            Param::ZetaOfEigenstates => "ζ of the eigenstates",
            Param::Lambda => "λ",
            Param::Kappa => "κ",
            Param::GFactor => "g",
            Param::Spin => "spin",
            Param::SpinState => "spin state",
            Param::OrbitalSets => "orbital sets",
            Param::Temperature => "temperature",
            Param::TemperatureRange => "temperature range",
            Param::LowestTemperature => "lowest temperature",
            Param::HighestTemperature => "highest temperature",
            Param::Points => "points",
            Param::Bands => "bands",
            Param::Band => "band",
            Param::BandMaximum => "band maximum",
            Param::BandPosition(unit) => return format!("band position ({unit})"),
            Param::NumberOfBands => "number of bands",
            Param::SpinForbiddenBand => "spin-forbidden band",
            Param::FitC => "fit C",
            Param::Window => "window",
            Param::Resolution => "resolution",
            Param::ChargeTransferOnset => "charge-transfer onset",
            Param::Wavenumber => "wavenumber or wavelength",
            Param::ChiM => "χ_M",
            Param::ChiMCorrected => "χ_M corrected",
            Param::ChiMT => "χ_M·T",
            Param::ChiMTOfState(state) => {
                return format!("χ_M·T of the {} state", state.adjective())
            }
            Param::ChiMTAt { temperature, line } => {
                return format!("χ_M·T at {temperature} K (line {line})")
            }
            Param::ChiMTCurve => "χ_M·T curve",
            Param::Curve => "curve",
            Param::MuEff => "μ_eff",
            Param::Dia => "diamagnetic correction",
            Param::MolarMass => "molar mass",
            Param::Formula => "formula",
            Param::PascalFormula => "formula for the Pascal sum",
            Param::Field => "field",
            Param::Background => "background",
            Param::SampleMass => "sample mass",
            Param::Uncertainty(of) => {
                let of = of.label();
                // "the" before a word, not before a symbol: "of the shift", "of χ_M·T".
                let article = if of.starts_with(|c: char| c.is_ascii_lowercase()) {
                    "the "
                } else {
                    ""
                };
                return format!("uncertainty of {article}{of}");
            }
            Param::Shift => "shift",
            Param::SpectrometerFrequency => "spectrometer frequency",
            Param::Concentration => "concentration",
            Param::Magnet => "magnet geometry",
            Param::SoluteMass => "mass of solute",
            Param::SolutionVolume => "solution volume",
            Param::SolventChi => "solvent χ₀",
            Param::SolventChiTerm => "solvent χ₀ term",
            Param::SolventDensity => "solvent density",
            Param::SolutionDensity => "solution density",
            Param::DensityTerm => "density term",
            Param::Enthalpy => "ΔH",
            Param::Entropy => "ΔS",
            Param::Cooperativity => "Γ",
            Param::ResidualFraction => "residual fraction",
            Param::BondLength => "bond length",
            Param::Cutoff => "cutoff",
            Param::StructureFile => "structure file",
            Param::MetalIndex => "metal index",
            Param::MetalCentre => "metal centre",
            Param::CellLength(n) => return format!("cell length {n}"),
            Param::CellAngle(n) => return format!("cell angle {n}"),
            Param::CellAngles => "cell angles",
            Param::Cell => "cell",
            Param::Target => "target",
            Param::SizeRange => "range",
            Param::MaxCharge => "maximum charge",
            Param::RequiredLigand => "required ligand",
            Param::LigandFilter => "ligand filter",
            Param::Pool => "pool",
            Param::CandidatesFile => "candidates file",
            Param::CandidatesHeader => "candidates file header",
            Param::InputFile => "input file",
            Param::Column => "column",
            Param::DataDir => "data directory",
        };
        s.to_string()
    }
}

impl fmt::Display for Param {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.label())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn labels_read_as_chemists_write_them() {
        assert_eq!(Param::Delta.to_string(), "Δ");
        assert_eq!(
            Param::OxidationState("Fe".into()).to_string(),
            "oxidation state of Fe"
        );
        assert_eq!(
            Param::Uncertainty(Box::new(Param::BondLength)).to_string(),
            "uncertainty of the bond length"
        );
        assert_eq!(
            Param::Uncertainty(Box::new(Param::ChiMT)).to_string(),
            "uncertainty of χ_M·T"
        );
    }
}
