//! The demo scenario, embedded so that `spinstate demo` runs with no set-up: an invented
//! materials lab screening new iron(II) and cobalt(II) complexes for a thermochromic sensor.
//! All names and numbers in `data/demo/` are made up (plausible, not published data).

/// The scenario in a few lines, printed before the results.
pub const INTRO: &str =
    "Demo (an invented scenario; every name and number is made up): the small materials group \
of the fictional Tallowmere Institute screens new iron(II) and cobalt(II) complexes for a \
thermochromic sensor, which needs a complex that changes spin state near room temperature. \
For each candidate the group has some of: an Evans-method shift in solution, a magnetometer value \
on the solid, the d–d band maxima, and the mean metal–donor bond length of a crystal structure.";

/// The sample sheet (the layout of `spinstate check --input`).
pub const SAMPLES: &str = include_str!("../../data/demo/samples.csv");

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_demo_sheet_parses_without_bad_rows() {
        let rows = super::super::batch::parse(SAMPLES).unwrap();
        assert!(rows.len() >= 6);
        for r in &rows {
            assert!(r.is_ok(), "{r:?}");
        }
    }
}
