//! Command-line argument types shared by several verbs.

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
