//! What a principal-component fit of demagnetization steps is: a line or a plane, free or through
//! the origin.

/// What is fitted to a range of steps.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum FitKind {
    /// A line: one magnetization component.
    Line,
    /// A plane (great circle): two overlapping components whose remanence path is a great circle.
    Plane,
}

impl FitKind {
    /// The word used in tables (`line` / `plane`).
    pub fn as_str(self) -> &'static str {
        match self {
            FitKind::Line => "line",
            FitKind::Plane => "plane",
        }
    }
    /// Fewest steps the fit needs: 2 for a line, 3 for a plane.
    pub fn min_steps(self) -> usize {
        match self {
            FitKind::Line => 2,
            FitKind::Plane => 3,
        }
    }
}

/// Whether the fit is free or constrained through the origin of the vector-endpoint diagram.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Anchor {
    /// The fit passes through the centre of mass of the steps used.
    Free,
    /// The fit passes through the origin (the data are not centred).
    Origin,
}

impl Anchor {
    /// The word used in tables (`free` / `origin`).
    pub fn as_str(self) -> &'static str {
        match self {
            Anchor::Free => "free",
            Anchor::Origin => "origin",
        }
    }
}
