//! Compact per-group vector sums: the state of a streamed mean per group, in a few dozen bytes per
//! group whatever the number of rows.

use super::fisher::{FisherAccumulator, FisherStats};
use crate::error::{Error, Result};
use crate::sphere::Vec3;
use std::collections::hash_map::RandomState;
use std::collections::HashMap;
use std::hash::BuildHasher;

/// A run of consecutive file lines `first..=last` (a group's rows, compactly).
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
pub struct LineRun {
    /// First line of the run.
    pub first: usize,
    /// Last line of the run (inclusive).
    pub last: usize,
}

/// "No entry" in the `u32` links below.
const NONE: u32 = u32::MAX;

/// One group: its vector sum and count, where its name lies in the name store, and its chain of
/// line runs (when lines are kept).
#[derive(Debug, Clone, Copy)]
struct Slot {
    fisher: FisherAccumulator,
    /// Start of the name in `GroupSums::names`, or `NONE` for the group of rows without a value.
    name_start: u32,
    name_len: u32,
    /// Next group whose name has the same 64-bit hash (collision chain), or `NONE`.
    next_same_hash: u32,
    /// First and last line run of the group in `GroupSums::runs`, or `NONE`.
    first_run: u32,
    last_run: u32,
}

/// A run of adjacent file lines, chained to the group's next run.
#[derive(Debug, Clone, Copy)]
struct RunLink {
    run: LineRun,
    next: u32,
}

/// Vector sums per group, in order of first appearance, with every group name stored once.
///
/// Memory per group: one 56-byte slot, the name's bytes, and one entry of a hash index (about 16 bytes
/// at its load factor), plus 24 bytes per run of adjacent lines when lines are kept. Nothing is held
/// per row.
///
/// # Units
/// The sums are sums of unit vectors (x north, y east, z down).
///
/// # Formula
/// Per group the sum S = Σ uᵢ in the order the rows were added; [`GroupSum::stats`] gives
/// R = |S|, k = (N − 1)/(N − R) and the cone of [`super::confidence_cone`] (Fisher 1953).
///
/// # References
/// Fisher, R. A. (1953), Dispersion on a sphere, *Proc. R. Soc. Lond. A* 217, 295–305.
#[derive(Debug, Clone)]
pub struct GroupSums {
    names: String,
    slots: Vec<Slot>,
    runs: Vec<RunLink>,
    /// Hash of a group name → first group with that hash.
    index: HashMap<u64, u32>,
    hasher: RandomState,
    /// All bits of the hash in normal use; 0 in tests, to force every name into one collision chain.
    hash_mask: u64,
    keep_lines: bool,
    /// The group of the last row added (most tables keep a group's rows together).
    last: u32,
}

/// One group of a [`GroupSums`], borrowed.
#[derive(Debug, Clone, Copy)]
pub struct GroupSum<'a> {
    /// Group name (`None` for rows without a group value, or the whole file).
    pub group: Option<&'a str>,
    /// Vector sum and count.
    pub fisher: FisherAccumulator,
    sums: &'a GroupSums,
    first_run: u32,
}

impl GroupSums {
    /// An empty store; with `keep_lines` each group also records its file lines as runs of adjacent
    /// lines.
    pub fn new(keep_lines: bool) -> Self {
        GroupSums {
            names: String::new(),
            slots: Vec::new(),
            runs: Vec::new(),
            index: HashMap::new(),
            hasher: RandomState::new(),
            hash_mask: u64::MAX,
            keep_lines,
            last: NONE,
        }
    }

    #[cfg(test)]
    fn colliding(keep_lines: bool) -> Self {
        GroupSums { hash_mask: 0, ..Self::new(keep_lines) }
    }

    /// Number of groups.
    pub fn len(&self) -> usize {
        self.slots.len()
    }

    /// True when no group has been added.
    pub fn is_empty(&self) -> bool {
        self.slots.is_empty()
    }

    /// True when the groups record their file lines.
    pub fn keeps_lines(&self) -> bool {
        self.keep_lines
    }

    fn name_of(&self, s: &Slot) -> Option<&str> {
        (s.name_start != NONE).then(|| &self.names[s.name_start as usize..(s.name_start + s.name_len) as usize])
    }

    /// The index of `group`, created (after the last group) when it is new.
    ///
    /// # Errors
    /// [`Error::TooMany`] beyond 4 294 967 294 groups, runs or bytes of group names.
    pub fn group_index(&mut self, group: Option<&str>) -> Result<usize> {
        if self.last != NONE && self.name_of(&self.slots[self.last as usize]) == group {
            return Ok(self.last as usize);
        }
        let h = self.hasher.hash_one(group) & self.hash_mask;
        let mut at = self.index.get(&h).copied().unwrap_or(NONE);
        let mut tail = NONE;
        while at != NONE {
            let s = &self.slots[at as usize];
            if self.name_of(s) == group {
                self.last = at;
                return Ok(at as usize);
            }
            tail = at;
            at = s.next_same_hash;
        }
        let j = small_index(self.slots.len(), "groups")?;
        let (name_start, name_len) = match group {
            Some(g) => {
                let start = small_index(self.names.len(), "bytes of group names")?;
                let len = small_index(g.len(), "bytes in a group name")?;
                small_index(self.names.len() + g.len(), "bytes of group names")?;
                self.names.push_str(g);
                (start, len)
            }
            None => (NONE, 0),
        };
        self.slots.push(Slot {
            fisher: FisherAccumulator::default(),
            name_start,
            name_len,
            next_same_hash: NONE,
            first_run: NONE,
            last_run: NONE,
        });
        if tail == NONE {
            self.index.insert(h, j);
        } else {
            self.slots[tail as usize].next_same_hash = j;
        }
        self.last = j;
        Ok(j as usize)
    }

    /// Add the unit vector `v` read on file line `line` to group `j` (from [`Self::group_index`]).
    ///
    /// # Errors
    /// [`Error::Invalid`] for an unknown group; [`Error::TooMany`] beyond 4 294 967 294 runs of lines.
    pub fn push(&mut self, j: usize, line: usize, v: Vec3) -> Result<()> {
        self.note_line(j, line)?;
        self.slots[j].fisher.push(v);
        Ok(())
    }

    /// Record file line `line` for group `j` without adding a vector (a row that is checked but not
    /// counted). Does nothing unless lines are kept.
    ///
    /// # Errors
    /// As [`Self::push`].
    pub fn note_line(&mut self, j: usize, line: usize) -> Result<()> {
        let Some(slot) = self.slots.get(j).copied() else {
            return Err(Error::invalid("group number", j, format!("no group number {j}")));
        };
        if !self.keep_lines {
            return Ok(());
        }
        if slot.last_run != NONE {
            let run = &mut self.runs[slot.last_run as usize].run;
            if run.last.checked_add(1) == Some(line) {
                run.last = line;
                return Ok(());
            }
        }
        let k = small_index(self.runs.len(), "runs of lines")?;
        self.runs.push(RunLink { run: LineRun { first: line, last: line }, next: NONE });
        let slot = &mut self.slots[j];
        if slot.last_run == NONE {
            slot.first_run = k;
        } else {
            self.runs[slot.last_run as usize].next = k;
        }
        self.slots[j].last_run = k;
        Ok(())
    }

    /// The group at index `j`.
    pub fn get(&self, j: usize) -> Option<GroupSum<'_>> {
        self.slots.get(j).map(|s| GroupSum {
            group: self.name_of(s),
            fisher: s.fisher,
            sums: self,
            first_run: s.first_run,
        })
    }

    /// The groups in order of first appearance.
    pub fn iter(&self) -> impl Iterator<Item = GroupSum<'_>> + '_ {
        (0..self.slots.len()).filter_map(move |j| self.get(j))
    }
}

/// `i` as a `u32` link, or an error past the last usable value.
fn small_index(i: usize, what: &'static str) -> Result<u32> {
    u32::try_from(i).ok().filter(|&k| k != NONE).ok_or_else(|| Error::TooMany {
        what,
        count: i as u64,
        limit: u64::from(NONE - 1),
    })
}

impl<'a> GroupSum<'a> {
    /// Fisher statistics of the group, as [`FisherAccumulator::finish`] gives them.
    ///
    /// # Errors
    /// As [`FisherAccumulator::finish`]: `confidence` outside (0, 1), or a group without a vector.
    pub fn stats(&self, confidence: f64) -> Result<FisherStats> {
        self.fisher.finish(confidence)
    }

    /// The group's runs of adjacent file lines, in file order (empty unless lines are kept).
    pub fn line_runs(&self) -> impl Iterator<Item = LineRun> + 'a {
        let runs = &self.sums.runs;
        let mut at = self.first_run;
        std::iter::from_fn(move || {
            let link = runs.get(at as usize)?;
            at = link.next;
            Some(link.run)
        })
    }

    /// Every file line of the group, in order (expands the runs).
    pub fn lines(&self) -> impl Iterator<Item = usize> + 'a {
        self.line_runs().flat_map(|r| r.first..=r.last)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn unit(x: f64, y: f64, z: f64) -> Vec3 {
        let n = (x * x + y * y + z * z).sqrt();
        Vec3::new(x / n, y / n, z / n)
    }

    #[test]
    fn groups_keep_order_names_and_sums() {
        let mut s = GroupSums::new(true);
        let rows: [(Option<&str>, usize, Vec3); 6] = [
            (Some("A"), 2, unit(1.0, 0.0, 0.0)),
            (Some("B"), 3, unit(0.0, 1.0, 0.0)),
            (Some("A"), 4, unit(1.0, 0.1, 0.0)),
            (None, 5, unit(0.0, 0.0, 1.0)),
            (Some(""), 6, unit(0.0, 0.0, -1.0)),
            (Some("A"), 7, unit(1.0, -0.1, 0.0)),
        ];
        for (g, line, v) in rows {
            let j = s.group_index(g).unwrap();
            s.push(j, line, v).unwrap();
        }
        let names: Vec<Option<&str>> = s.iter().map(|g| g.group).collect();
        assert_eq!(names, vec![Some("A"), Some("B"), None, Some("")]);
        let a = s.get(0).unwrap();
        assert_eq!(a.fisher.n, 3);
        // Sum in row order, as a plain accumulator gives it (bit for bit).
        let mut plain = FisherAccumulator::default();
        for v in [rows[0].2, rows[2].2, rows[5].2] {
            plain.push(v);
        }
        assert_eq!(a.fisher, plain);
        assert_eq!(
            a.line_runs().collect::<Vec<_>>(),
            vec![LineRun { first: 2, last: 2 }, LineRun { first: 4, last: 4 }, LineRun { first: 7, last: 7 }]
        );
        assert_eq!(a.lines().collect::<Vec<_>>(), vec![2, 4, 7]);
        assert_eq!(s.get(2).unwrap().lines().collect::<Vec<_>>(), vec![5]);
        assert!(s.get(4).is_none());
        assert!(s.push(9, 10, unit(1.0, 0.0, 0.0)).is_err());
    }

    #[test]
    fn adjacent_lines_form_one_run_and_lines_can_be_dropped() {
        let mut s = GroupSums::new(true);
        for line in [2, 3, 4, 6, 7] {
            let j = s.group_index(Some("X")).unwrap();
            s.push(j, line, unit(0.0, 0.0, 1.0)).unwrap();
        }
        let x = s.get(0).unwrap();
        assert_eq!(
            x.line_runs().collect::<Vec<_>>(),
            vec![LineRun { first: 2, last: 4 }, LineRun { first: 6, last: 7 }]
        );
        let mut s = GroupSums::new(false);
        let j = s.group_index(Some("X")).unwrap();
        s.push(j, 2, unit(0.0, 0.0, 1.0)).unwrap();
        assert_eq!(s.get(0).unwrap().lines().count(), 0);
        assert!(!s.keeps_lines());
    }

    #[test]
    fn many_groups_are_found_again() {
        // Interleaved rows of 5000 groups: every lookup after the first finds the same slot.
        many_groups(GroupSums::new(false), 5000);
        // The same with every name on one hash value: the collision chain alone tells them apart.
        many_groups(GroupSums::colliding(false), 300);
    }

    fn many_groups(mut s: GroupSums, groups: usize) {
        for pass in 0..3 {
            for g in 0..groups {
                let name = format!("G{g}");
                let j = s.group_index(Some(&name)).unwrap();
                assert_eq!(j, g, "pass {pass}");
                s.push(j, 2 + pass * groups + g, unit(1.0, g as f64, 0.0)).unwrap();
            }
        }
        assert_eq!(s.len(), groups);
        assert!(s.iter().all(|g| g.fisher.n == 3));
        assert_eq!(s.get(groups - 7).unwrap().group, Some(format!("G{}", groups - 7).as_str()));
    }
}
