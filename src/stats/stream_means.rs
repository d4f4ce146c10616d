//! Fisher means per group straight from a streamed directions table, in memory that does not grow
//! with the number of rows.

use super::fisher::FisherStats;
use super::group_sums::{GroupSums, LineRun};
use super::groups::{Frame, GroupMean};
use crate::error::{Error, Result, TableError};
use crate::model::DirectionKind;
use crate::table::{Columns, DirectionColumns, GroupBy, TableStream};
use std::io::BufRead;

/// The mean of one group from [`stream_group_means`].
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct StreamedGroup {
    /// Group name (`None` for rows without a group value, or the whole file).
    pub group: Option<String>,
    /// The group's file lines as runs of consecutive lines (one run per stretch of adjacent rows).
    pub line_runs: Vec<LineRun>,
    /// Fisher statistics, exactly as [`super::group_means`] gives them for a group of lines.
    pub stats: FisherStats,
}

impl StreamedGroup {
    /// Every file line of the group, in order (expands the runs).
    pub fn lines(&self) -> impl Iterator<Item = usize> + '_ {
        self.line_runs.iter().flat_map(|r| r.first..=r.last)
    }
}

/// What [`stream_group_means`] found.
#[derive(Debug, Clone, PartialEq)]
pub enum StreamedMeans {
    /// Per-group means of a table of lines, groups in order of first appearance.
    Means {
        /// The grouping column used, if any.
        group_column: Option<String>,
        /// Data rows read.
        rows: usize,
        /// The groups.
        groups: Vec<StreamedGroup>,
    },
    /// The table holds great circles (`kind = plane`); their combined mean needs every direction of
    /// the group at once, so read the whole table and use [`super::group_means`].
    NeedsWholeTable,
}

/// What [`stream_group_sums`] found.
#[derive(Debug, Clone)]
pub enum StreamedSums {
    /// Vector sums per group of a table of lines, groups in order of first appearance.
    Sums {
        /// The grouping column used, if any.
        group_column: Option<String>,
        /// Data rows read.
        rows: usize,
        /// The groups.
        groups: GroupSums,
    },
    /// The table holds great circles (`kind = plane`); see [`StreamedMeans::NeedsWholeTable`].
    NeedsWholeTable,
}

/// Fisher mean per group, reading a directions table one row at a time.
///
/// Memory holds one accumulator per group (vector sum, count, runs of adjacent lines), never the rows.
/// The vectors of a group are summed in file order, as [`super::group_means`] sums them, so the results
/// are bit-for-bit the same; so are the error messages, and where a file has several faults the one
/// reported is the one the whole-table path reports. With `keep_lines` false the groups' `line_runs`
/// stay empty (memory then holds one fixed-size accumulator per group, whatever the row order). Rows with `kind = plane` end the stream with
/// [`StreamedMeans::NeedsWholeTable`] (after the rest of the file has been checked).
///
/// This collects every group's statistics; [`stream_group_sums`] keeps only the sums (less memory
/// with very many groups) and gives the same statistics group by group.
///
/// # Units
/// Directions in degrees; `confidence` a probability in (0, 1).
///
/// # Formula
/// Per group R = |Σ uᵢ|, k = (N − 1)/(N − R), α from [`super::confidence_cone`] (Fisher 1953).
///
/// # References
/// Fisher, R. A. (1953), Dispersion on a sphere, *Proc. R. Soc. Lond. A* 217, 295–305.
pub fn stream_group_means<R: BufRead>(
    stream: &mut TableStream<R>,
    group_by: &GroupBy,
    frame: Frame,
    confidence: f64,
    keep_lines: bool,
) -> Result<StreamedMeans> {
    let (group_column, rows, sums) = match stream_group_sums(stream, group_by, frame, keep_lines)? {
        StreamedSums::Sums { group_column, rows, groups } => (group_column, rows, groups),
        StreamedSums::NeedsWholeTable => return Ok(StreamedMeans::NeedsWholeTable),
    };
    let mut groups = Vec::with_capacity(sums.len());
    for g in sums.iter() {
        groups.push(StreamedGroup {
            group: g.group.map(str::to_string),
            line_runs: g.line_runs().collect(),
            stats: g.stats(confidence)?,
        });
    }
    Ok(StreamedMeans::Means { group_column, rows, groups })
}

/// Vector sum per group, reading a directions table one row at a time: the state of
/// [`stream_group_means`] before the statistics, held compactly ([`GroupSums`]: a fixed-size slot
/// and the name per group, plus the runs of adjacent lines with `keep_lines`).
///
/// Every group has at least one vector, so [`super::GroupSum::stats`] fails only for a confidence
/// outside (0, 1). Faults and their messages are those of [`stream_group_means`].
///
/// # Units
/// Directions in degrees; the sums are of unit vectors (x north, y east, z down).
///
/// # Formula
/// Per group S = Σ uᵢ in file order; in the tilt frame uᵢ is the bedding-corrected vector.
///
/// # References
/// Fisher, R. A. (1953), Dispersion on a sphere, *Proc. R. Soc. Lond. A* 217, 295–305.
pub fn stream_group_sums<R: BufRead>(
    stream: &mut TableStream<R>,
    group_by: &GroupBy,
    frame: Frame,
    keep_lines: bool,
) -> Result<StreamedSums> {
    let cols = match DirectionColumns::locate(stream, group_by) {
        Ok(c) => c,
        Err(e) => {
            let e = stream.finish_with(e);
            // The whole-table path asks for data rows before it looks for columns.
            return Err(Error::Table(if stream.rows_read() == 0 && !crate::table::is_layout_fault(&e) {
                stream.require_rows().err().unwrap_or(e)
            } else {
                e
            }));
        }
    };
    let mut sums = GroupSums::new(keep_lines);
    // The first group (in order of appearance) with a row lacking bedding, and that row's line.
    let mut missing_bedding: Option<(usize, usize)> = None;
    let mut planes = false;
    loop {
        match stream.next_row() {
            Ok(true) => {}
            Ok(false) => break,
            Err(e) => return Err(Error::Table(stream.finish_with(e))),
        }
        let row = stream.row();
        let r = match cols.parse(stream, row) {
            Ok(r) => r,
            Err(e) => return Err(Error::Table(stream.finish_with(e))),
        };
        if r.kind == DirectionKind::Plane {
            planes = true;
        }
        if planes {
            continue; // only checking the rest of the file
        }
        let j = sums.group_index(r.group)?;
        let v = r.direction.to_vector();
        match frame {
            Frame::Geo => sums.push(j, r.line, v)?,
            Frame::Tilt => match r.bedding {
                Some(b) => sums.push(j, r.line, b.untilt(v))?,
                None => {
                    sums.note_line(j, r.line)?;
                    if missing_bedding.is_none_or(|(k, _)| j < k) {
                        missing_bedding = Some((j, r.line));
                    }
                }
            },
        }
    }
    stream.require_rows()?;
    if planes {
        return Ok(StreamedSums::NeedsWholeTable);
    }
    // As the whole-table path: the first group (in order of appearance) with a row lacking bedding.
    if let Some((_, line)) = missing_bedding {
        return Err(Error::Table(TableError::value(
            stream.file_name(),
            line,
            Some("bed_dip"),
            "no bedding on this row; the tilt frame needs bed_dip_dir (or bed_strike) and bed_dip",
        )));
    }
    Ok(StreamedSums::Sums { group_column: cols.group_column, rows: stream.rows_read(), groups: sums })
}

impl From<StreamedGroup> for GroupMean {
    fn from(g: StreamedGroup) -> GroupMean {
        let lines = g.lines().collect();
        GroupMean { group: g.group, lines, stats: g.stats, planes: 0, undefined: None, sense: None }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::stats::group_means;
    use crate::table::{read_directions, Table};

    /// Both paths on the same bytes: the whole-table reader + `group_means`, and the stream.
    fn both(
        text: &str,
        by: &GroupBy,
        frame: Frame,
    ) -> (std::result::Result<Vec<GroupMean>, String>, std::result::Result<StreamedMeans, String>) {
        let whole = Table::parse("t.csv", text.as_bytes())
            .map_err(Error::Table)
            .and_then(|t| read_directions(&t, by).map_err(Error::Table))
            .and_then(|s| group_means(&s, frame, 0.95))
            .map_err(|e| e.to_string());
        let streamed = TableStream::new("t.csv", text.as_bytes())
            .map_err(Error::Table)
            .and_then(|mut s| stream_group_means(&mut s, by, frame, 0.95, true))
            .map_err(|e| e.to_string());
        (whole, streamed)
    }

    fn same(text: &str, by: &GroupBy, frame: Frame) {
        match both(text, by, frame) {
            (Ok(w), Ok(StreamedMeans::Means { groups, .. })) => {
                let s: Vec<GroupMean> = groups.into_iter().map(GroupMean::from).collect();
                assert_eq!(w, s, "results differ for {text:?}");
            }
            (Err(w), Err(s)) => assert_eq!(w, s, "messages differ for {text:?}"),
            (w, s) => panic!("paths disagree for {text:?}: whole {w:?}, streamed {s:?}"),
        }
    }

    #[test]
    fn streamed_means_equal_the_whole_table_path() {
        let by = GroupBy::Default;
        // Interleaved groups, a row without a group value, a comment, CRLF, a BOM, blank lines.
        same("\u{feff}site,dec,inc\r\nA,10,0\r\n# note, with \"quote\r\nB,200,-30\r\n\r\nA,350,5\r\n,5,5\r\nA,0,10\r\nB,190,-35\r\n", &by, Frame::Geo);
        same("Site , DEC,Inc\nA,10,20\n", &by, Frame::Geo);
        same("dec,inc,site\n10,20,X\n10,20,X\n", &GroupBy::Column("Site".into()), Frame::Geo);
        same("site,dec,inc\nA,10,20\nB,30,40\n", &GroupBy::None, Frame::Geo);
        same("site,dec,inc,bed_dip_dir,bed_dip\nA,10,20,90,30\nA,15,25,90,30\nB,200,-20,270,10\n", &by, Frame::Tilt);
    }

    #[test]
    fn streamed_faults_match_the_whole_table_path() {
        let by = GroupBy::Default;
        for text in [
            "",
            "# only a comment\n",
            "site,dec,inc\n",
            "site,dec\nA,10\n",
            "site,dec\n",
            "site,,inc\nA,1,2\n",
            "site,dec,dec\nA,1,2\n",
            "site,dec,inc\nA,10,95\n",
            "site,dec,inc\nA,x,5\nB,1\n", // a value fault before a layout fault: the layout fault wins
            "site,dec,inc\nA,1,2\nB,1,2,3\n",
            "site,dec,inc\nA,1,2,,\nB,1,2\n", // trailing empty cells are tolerated
            "site,dec,inc\nA,x,5\nB,\u{00e9},1\n",
            "site,dec,inc,kind\nA,1,2,arc\n",
            "site,dec,inc,height,depth\nA,1,2,3,4\n",
            "site,dec,inc,lat\nA,1,2,91\n",
            "site,dec,inc,bed_dip\nA,1,2,10\n",
        ] {
            same(text, &by, Frame::Geo);
        }
        same("site,dec,inc,bed_dip_dir,bed_dip\nA,10,20,90,30\nB,1,2,,\nA,15,25,,\n", &by, Frame::Tilt);
        same("site,dec,inc\nA,1,2\n", &GroupBy::Column("zone".into()), Frame::Geo);
    }

    #[test]
    fn invalid_utf8_outranks_other_faults_as_in_the_whole_table_path() {
        let mut bytes = b"site,dec,inc\nA,x,5\nB,1\nC,1,2\n".to_vec();
        bytes.extend_from_slice(b"D,1,\xff\n");
        let w = Table::parse("t.csv", &bytes).unwrap_err().to_string();
        let s = TableStream::new("t.csv", &bytes[..])
            .map_err(Error::Table)
            .and_then(|mut s| stream_group_means(&mut s, &GroupBy::Default, Frame::Geo, 0.95, true))
            .unwrap_err()
            .to_string();
        assert_eq!(w, s);
        assert!(s.contains("t.csv:5"), "{s}");
    }

    #[test]
    fn planes_ask_for_the_whole_table_and_runs_compress_lines() {
        let (_, s) = both("dec,inc,kind\n1,2,line\n3,4,plane\n", &GroupBy::Default, Frame::Geo);
        assert_eq!(s.unwrap(), StreamedMeans::NeedsWholeTable);
        let (_, s) = both("site,dec,inc\nA,1,2\nA,1,3\nB,1,2\nA,4,5\n", &GroupBy::Default, Frame::Geo);
        let StreamedMeans::Means { groups, rows, .. } = s.unwrap() else { panic!("expected means") };
        assert_eq!(rows, 4);
        assert_eq!(groups[0].line_runs, vec![LineRun { first: 2, last: 3 }, LineRun { first: 5, last: 5 }]);
        assert_eq!(groups[0].lines().collect::<Vec<_>>(), vec![2, 3, 5]);
    }
}
