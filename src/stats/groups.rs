//! Fisher means of the groups of a directions table (sites, or any grouping column).

use super::fisher::{fisher_from_vectors, FisherStats};
use crate::error::{Error, Result};
use crate::model::DirectionSet;

/// Coordinate frame of a mean.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Frame {
    /// Geographic (in situ) coordinates.
    Geo,
    /// Tilt-corrected (stratigraphic) coordinates, from each row's bedding.
    Tilt,
}

impl Frame {
    /// The frame's name in sentences: `geographic` or `tilt-corrected`.
    pub fn label(self) -> &'static str {
        match self {
            Frame::Geo => "geographic",
            Frame::Tilt => "tilt-corrected",
        }
    }
}

/// The Fisher mean of one group.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct GroupMean {
    /// Group name (`None` for the whole file when there is no grouping column).
    pub group: Option<String>,
    /// File lines of the group's rows.
    pub lines: Vec<usize>,
    /// The statistics (for a group with planes: the combined mean of lines and great circles in
    /// Fisher's shape, see [`super::MixedStats::as_fisher`]).
    pub stats: FisherStats,
    /// Number of planes (great circles, `kind = plane`) in the group; 0 means a plain Fisher mean.
    pub planes: usize,
    /// Why a group with planes has no combined mean (e.g. a single great circle and no line), when it
    /// has none; its statistics are then empty (`mean`, `k`, `alpha`, `theta63` all `None`).
    pub undefined: Option<String>,
    /// For a group of great circles only: how the sense of its mean was chosen.
    pub sense: Option<super::CircleSense>,
}

/// Fisher mean per group, groups in order of first appearance.
///
/// Rows without a group value form their own group (`None`). In the tilt frame every row must carry
/// bedding; the error names the first row that does not. A group holding rows with `kind = plane`
/// uses the combined mean of lines and great circles ([`super::mixed_mean`], McFadden & McElhinny
/// 1988); a group without planes is exactly Fisher.
pub fn group_means(set: &DirectionSet, frame: Frame, confidence: f64) -> Result<Vec<GroupMean>> {
    let mut order: Vec<Option<String>> = Vec::new();
    let mut members: Vec<Vec<usize>> = Vec::new();
    for (i, r) in set.records.iter().enumerate() {
        match order.iter().position(|g| *g == r.group) {
            Some(j) => members[j].push(i),
            None => {
                order.push(r.group.clone());
                members.push(vec![i]);
            }
        }
    }
    let mut out = Vec::with_capacity(order.len());
    for (group, idx) in order.into_iter().zip(members) {
        let mut vectors = Vec::with_capacity(idx.len());
        let mut is_plane = Vec::with_capacity(idx.len());
        let mut ends = Vec::new();
        for &i in &idx {
            is_plane.push(set.records[i].kind == crate::model::DirectionKind::Plane);
            let r = &set.records[i];
            if r.kind == crate::model::DirectionKind::Plane {
                let end = r.path_end.map(|d| d.to_vector());
                ends.push(match (frame, r.bedding) {
                    (Frame::Tilt, Some(b)) => end.map(|e| b.untilt(e)),
                    _ => end,
                });
            }
            let v = r.direction.to_vector();
            vectors.push(match frame {
                Frame::Geo => v,
                Frame::Tilt => match r.bedding {
                    Some(b) => b.untilt(v),
                    None => {
                        return Err(Error::Table(crate::error::TableError::value(
                            set.source.as_str(),
                            r.line,
                            Some("bed_dip"),
                            "no bedding on this row; the tilt frame needs bed_dip_dir (or bed_strike) and bed_dip",
                        )))
                    }
                },
            });
        }
        let planes = is_plane.iter().filter(|p| **p).count();
        let mut undefined = None;
        let mut sense = None;
        let stats = if planes == 0 {
            fisher_from_vectors(vectors, confidence)?
        } else {
            let dir = |v: &crate::sphere::Vec3| crate::sphere::Direction::from_vector(*v).expect("unit vector");
            let lines: Vec<_> = vectors.iter().zip(&is_plane).filter(|(_, p)| !**p).map(|(v, _)| dir(v)).collect();
            let poles: Vec<_> = vectors.iter().zip(&is_plane).filter(|(_, p)| **p).map(|(v, _)| dir(v)).collect();
            let ends: Vec<_> = ends.iter().map(|e| e.and_then(crate::sphere::Direction::from_vector)).collect();
            match super::mixed_mean_with_paths(&lines, &poles, &ends, confidence) {
                Ok(m) => {
                    sense = m.sense;
                    m.as_fisher()
                }
                Err(Error::OutOfRange { .. }) => {
                    return Err(Error::OutOfRange { name: "confidence", value: confidence, range: "(0, 1)" })
                }
                Err(e) => {
                    undefined = Some(e.to_string());
                    let r = vectors.iter().fold(crate::sphere::Vec3::ZERO, |a, b| a + *b).norm();
                    FisherStats { n: vectors.len(), mean: None, r, k: None, alpha: None, confidence, theta63: None }
                }
            }
        };
        out.push(GroupMean {
            group,
            lines: idx.iter().map(|&i| set.records[i].line).collect(),
            stats,
            planes,
            undefined,
            sense,
        });
    }
    Ok(out)
}
