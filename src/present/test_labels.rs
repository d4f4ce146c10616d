//! What every field-test presenter shares: the labels of a run, the pass/fail word, and the JSON
//! notes (the notes followed by the cautions).

/// What a field test was run on: the source's name, the frame, the confidence level and the
/// Monte Carlo settings.
pub struct TestLabels<'a> {
    /// The directions table's name (two names joined by a space for a common-mean test).
    pub file: &'a str,
    /// Coordinate frame label (`geographic`, `tilt-corrected`).
    pub frame: &'a str,
    /// Confidence level of the tests.
    pub confidence: f64,
    /// Seed of the resampling.
    pub seed: u64,
    /// Resamples drawn.
    pub resamples: usize,
}

/// `pass` or `fail`.
pub(super) fn pass_fail(b: bool) -> &'static str {
    if b {
        "pass"
    } else {
        "fail"
    }
}

/// The notes followed by the cautions: the `notes` array of a presenter's JSON (field tests, poles,
/// psv, unflatten, rate).
pub(super) fn json_notes(notes: &[String], cautions: &[String]) -> Vec<String> {
    notes.iter().chain(cautions).cloned().collect()
}
