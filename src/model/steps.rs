//! Stepwise demagnetization data: the measurements of each specimen after each step.

use super::strat_axis::StratAxis;
use super::treatment::Treatment;
use crate::sphere::{Bedding, Direction, Vec3};

/// Relative tolerance when matching a step value against a range end (step values are read from
/// text, e.g. 12.5 mT, and compared with range ends typed by people).
const STEP_MATCH: f64 = 1e-9;

/// One measurement after one demagnetization step.
#[derive(Debug, Clone, PartialEq)]
pub struct StepRecord {
    /// Line in the file.
    pub line: usize,
    /// Demagnetization level (mT or °C; 0 for the natural remanence).
    pub step: f64,
    /// Direction of the remanence.
    pub direction: Direction,
    /// Intensity of the remanence, A·m² (> 0).
    pub moment: f64,
    /// Treatment, if given.
    pub treatment: Option<Treatment>,
}

impl StepRecord {
    /// The remanence vector, moment × unit vector (x north, y east, z down), A·m².
    pub fn vector(&self) -> Vec3 {
        self.direction.to_vector() * self.moment
    }
}

/// All steps of one specimen, in increasing step order.
#[derive(Debug, Clone, PartialEq)]
pub struct SpecimenSteps {
    /// Specimen name.
    pub specimen: String,
    /// Site name, if given.
    pub site: Option<String>,
    /// Height or depth (see [`StepSet::axis`]).
    pub position: Option<f64>,
    /// Bedding, if given.
    pub bedding: Option<Bedding>,
    /// The steps, step values strictly increasing.
    pub steps: Vec<StepRecord>,
}

impl SpecimenSteps {
    /// The remanence vectors of all steps.
    pub fn vectors(&self) -> Vec<Vec3> {
        self.steps.iter().map(StepRecord::vector).collect()
    }

    /// Indices of the steps whose value lies in `[from, to]` (inclusive, with a tiny tolerance).
    pub fn in_range(&self, from: f64, to: f64) -> Vec<usize> {
        let tol = STEP_MATCH * from.abs().max(to.abs()).max(1.0);
        self.steps
            .iter()
            .enumerate()
            .filter(|(_, s)| s.step >= from - tol && s.step <= to + tol)
            .map(|(i, _)| i)
            .collect()
    }
}

/// A whole steps table, specimens in order of first appearance.
#[derive(Debug, Clone, PartialEq)]
pub struct StepSet {
    /// File name for messages.
    pub source: String,
    /// Which position column the table has, if any.
    pub axis: Option<StratAxis>,
    /// Whether any row carries bedding.
    pub has_bedding: bool,
    /// The specimens.
    pub specimens: Vec<SpecimenSteps>,
}

impl StepSet {
    /// The specimen with this name.
    pub fn get(&self, name: &str) -> Option<&SpecimenSteps> {
        self.specimens.iter().find(|s| s.specimen == name)
    }
}
