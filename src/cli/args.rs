//! Command-line argument types shared by several verbs.

use lodestone::poles::Cutoff;
use lodestone::stats::Frame;

/// The coordinate frame of directions, as `--frame geo|tilt`.
#[derive(Debug, Clone, Copy, clap::ValueEnum, PartialEq, Eq)]
pub enum FrameArg {
    /// In situ (geographic) directions.
    Geo,
    /// Bedding-corrected directions (needs bedding columns).
    Tilt,
}

impl From<FrameArg> for Frame {
    fn from(f: FrameArg) -> Frame {
        match f {
            FrameArg::Geo => Frame::Geo,
            FrameArg::Tilt => Frame::Tilt,
        }
    }
}

/// The `--cutoff` of `poles` and `psv`: none, vandamme, or an angle in (0, 180].
pub fn parse_cutoff(s: &str) -> anyhow::Result<Cutoff> {
    match Cutoff::parse(s) {
        Some(c) => Ok(c),
        None => anyhow::bail!("--cutoff must be none, vandamme or an angle in (0, 180] such as 45; got '{s}'"),
    }
}
