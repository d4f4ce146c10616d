//! Statistics of directions: Fisher means and cones, orientation matrices, Fisher sampling.

mod fisher;
mod groups;
mod orientation;
mod sampler;

pub use fisher::{confidence_cone, fisher_from_vectors, fisher_mean, FisherAccumulator, FisherStats, Precision};
pub use groups::{group_means, Frame, GroupMean};
pub use orientation::{orientation_matrix, principal_axes};
pub use sampler::FisherSampler;

#[cfg(test)]
mod tests;
