//! Statistics of directions: Fisher means and cones, orientation matrices, Fisher sampling, and the
//! combined mean of lines and great circles.

mod fisher;
mod fisher_lanes;
mod group_sums;
mod groups;
mod mixed;
mod orientation;
mod sampler;
mod stream_means;

pub use fisher::{confidence_cone, fisher_from_vectors, fisher_mean, FisherAccumulator, FisherStats, Precision};
pub(crate) use fisher_lanes::FisherLanes;
pub use group_sums::{GroupSum, GroupSums, LineRun};
pub use groups::{group_means, Frame, GroupMean};
pub use mixed::{mixed_cone, mixed_mean, mixed_mean_with_paths, CircleSense, MixedStats};
pub use orientation::{orientation_matrix, principal_axes, principal_axis_signed};
pub use sampler::FisherSampler;
pub use stream_means::{stream_group_means, stream_group_sums, StreamedGroup, StreamedMeans, StreamedSums};

#[cfg(test)]
mod tests;
