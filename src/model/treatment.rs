//! Kind of demagnetization treatment (natural remanence, alternating field, thermal).

/// Kind of demagnetization treatment.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Treatment {
    /// Natural remanence, before any treatment.
    Nrm,
    /// Alternating field; the step is the peak field in mT.
    Af,
    /// Thermal; the step is the temperature in °C.
    Thermal,
}

impl Treatment {
    /// The contract's treatment code, as the steps table writes it (`nrm`, `af`, `thermal`).
    pub fn code(self) -> &'static str {
        match self {
            Treatment::Nrm => "nrm",
            Treatment::Af => "af",
            Treatment::Thermal => "thermal",
        }
    }
    /// Unit of the step value, for labels.
    pub fn unit(self) -> &'static str {
        match self {
            Treatment::Nrm => "",
            Treatment::Af => "mT",
            Treatment::Thermal => "°C",
        }
    }
}
