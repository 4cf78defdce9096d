//! Embedded data tables (`data/*.csv`) turned into typed, validated rows. Each table's CSV layout
//! is known only to its module here; `--data DIR` replaces a bundled table with DIR/<file>.

pub mod moment_ranges;
pub mod pascal;
