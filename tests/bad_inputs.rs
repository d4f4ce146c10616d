//! The bad-input catalogue: hand-edited tables as scientists send them, run through every verb that
//! reads tables.
//!
//! Each case gives the files it writes into an empty temporary folder, the command line (run inside
//! that folder, so messages carry the bare file names), and what must happen:
//! - `Refused`: exit code 1, and stderr names `FILE:LINE:` and, where the problem concerns a cell or a
//!   missing column, `column 'NAME'`;
//! - `Failed`: exit code 1 for a computation the data cannot support (the message says why);
//! - `Usage`: exit code 2 for a bad command line;
//! - `Accepted`: exit code 0; the JSON output holds the listed values, and neither the JSON nor the
//!   table output contains a NaN.
//!
//! Whatever the outcome, the folder must afterwards hold exactly the input files: verbs that draw are
//! given an output path (`--plot`) on refused runs, and no figure, temporary file or folder may be left.
//!
//! Decisions recorded here (see also README): a declination in [-360, 360] is accepted and wrapped to
//! [0, 360); beyond that it is refused. Inclinations and latitudes outside [-90, 90] are refused.
//!
//! Time-scale tables are checked through `correlate`, and also through the library validator directly
//! (`timescale_catalogue` below), with the same FILE:LINE: column rule on the message.

use assert_cmd::Command;
use std::collections::BTreeSet;
use std::path::Path;

#[derive(Debug, Clone, Copy)]
enum Jv {
    Null,
    Num(f64),
    Str(&'static str),
}

#[derive(Debug)]
enum Expect {
    Refused { file: &'static str, line: usize, column: Option<&'static str> },
    Failed { says: &'static str },
    Usage,
    Accepted { json: &'static [(&'static str, Jv)] },
}
use Expect::*;

struct Case {
    name: &'static str,
    files: &'static [(&'static str, &'static [u8])],
    args: &'static [&'static str],
    expect: Expect,
}

const STEPS: &[u8] =
    b"specimen,step,dec,inc,moment\nS1,0,10,40,5e-6\nS1,10,12,41,4e-6\nS1,20,11,39,3e-6\nS1,30,13,40,2e-6\n";
const SITES: &[u8] = b"site,lat,lon,dec,inc\nA,40,250,10,55\nB,40,250,350,60\nC,40,250,5,50\n";
const RANGE: &[&str] = &["components", "st.csv", "--from", "0", "--to", "30"];
const PICKED: &[&str] = &["components", "st.csv", "--picks", "pk.csv"];
const LEVELS: &[u8] = b"height,dec,inc,lat,lon\n1,0,60,40,10\n2,2,58,40,10\n3,1,61,40,10\n4,180,-60,40,10\n5,182,-59,40,10\n6,179,-62,40,10\n";
const CORRELATE: &[&str] = &["correlate", "lv.csv", "ts.csv"];
const EXPECTED: &[&str] = &["expected", "--pole-lat", "85", "--pole-lon", "0", "--sites", "s.csv"];

fn r(file: &'static str, line: usize, column: &'static str) -> Expect {
    Refused { file, line, column: Some(column) }
}
fn r_row(file: &'static str, line: usize) -> Expect {
    Refused { file, line, column: None }
}

fn catalogue() -> Vec<Case> {
    let mean = &["mean", "d.csv"][..];
    vec![
        // ---- directions table (mean) ----
        Case {
            name: "missing required column",
            files: &[("d.csv", b"site,dec\nA,10\n")],
            args: mean,
            expect: r("d.csv", 1, "inc"),
        },
        Case {
            name: "duplicated column (case-insensitive)",
            files: &[("d.csv", b"dec,inc,DEC\n1,2,3\n")],
            args: mean,
            expect: r("d.csv", 1, "dec"),
        },
        Case {
            name: "non-numeric cell",
            files: &[("d.csv", b"dec,inc\n10,20\n10,abc\n")],
            args: mean,
            expect: r("d.csv", 3, "inc"),
        },
        Case {
            name: "NaN cell",
            files: &[("d.csv", b"dec,inc\n10,20\nNaN,5\n")],
            args: mean,
            expect: r("d.csv", 3, "dec"),
        },
        Case { name: "inf cell", files: &[("d.csv", b"dec,inc\n10,inf\n")], args: mean, expect: r("d.csv", 2, "inc") },
        Case {
            name: "-infinity cell",
            files: &[("d.csv", b"dec,inc\n-infinity,10\n")],
            args: mean,
            expect: r("d.csv", 2, "dec"),
        },
        Case {
            name: "overflowing number",
            files: &[("d.csv", b"dec,inc\n10,1e400\n")],
            args: mean,
            expect: r("d.csv", 2, "inc"),
        },
        Case {
            name: "empty required cell",
            files: &[("d.csv", b"dec,inc\n10,20\n,20\n")],
            args: mean,
            expect: r("d.csv", 3, "dec"),
        },
        Case {
            name: "inclination above 90",
            files: &[("d.csv", b"dec,inc\n10,90.5\n")],
            args: mean,
            expect: r("d.csv", 2, "inc"),
        },
        Case {
            name: "inclination below -90",
            files: &[("d.csv", b"dec,inc\n10,-91\n")],
            args: mean,
            expect: r("d.csv", 2, "inc"),
        },
        Case {
            name: "declination above 360",
            files: &[("d.csv", b"dec,inc\n361,10\n")],
            args: mean,
            expect: r("d.csv", 2, "dec"),
        },
        Case {
            name: "declination below -360",
            files: &[("d.csv", b"dec,inc\n-360.5,10\n")],
            args: mean,
            expect: r("d.csv", 2, "dec"),
        },
        Case {
            name: "latitude out of range",
            files: &[("d.csv", b"dec,inc,lat,lon\n10,20,95,3\n")],
            args: mean,
            expect: r("d.csv", 2, "lat"),
        },
        Case {
            name: "longitude out of range",
            files: &[("d.csv", b"dec,inc,lat,lon\n10,20,45,-200\n")],
            args: mean,
            expect: r("d.csv", 2, "lon"),
        },
        Case { name: "empty file", files: &[("d.csv", b"")], args: mean, expect: r_row("d.csv", 1) },
        Case {
            name: "only comments and blank lines",
            files: &[("d.csv", b"# nothing yet\n\n# still nothing\n")],
            args: mean,
            expect: r_row("d.csv", 1),
        },
        Case { name: "header with no rows", files: &[("d.csv", b"dec,inc\n")], args: mean, expect: r_row("d.csv", 1) },
        Case {
            name: "BOM and CRLF, bad cell on line 3",
            files: &[("d.csv", b"\xEF\xBB\xBFdec,inc\r\n10,20\r\n10,x\r\n")],
            args: mean,
            expect: r("d.csv", 3, "inc"),
        },
        Case {
            name: "comment lines keep line numbers true",
            files: &[("d.csv", b"# Lantern Fell, bench 4\n#\ndec,inc\n10,20\n\n10,x\n")],
            args: mean,
            expect: r("d.csv", 6, "inc"),
        },
        Case {
            name: "ragged row: too few cells",
            files: &[("d.csv", b"dec,inc,site\n10,20,A\n10,20\n")],
            args: mean,
            expect: r_row("d.csv", 3),
        },
        Case {
            name: "ragged row: extra filled cell",
            files: &[("d.csv", b"dec,inc\n10,20\n10,20,30\n")],
            args: mean,
            expect: r_row("d.csv", 3),
        },
        Case {
            name: "unterminated quote",
            files: &[("d.csv", b"dec,inc\n10,20\n\"10,20\n")],
            args: mean,
            expect: r_row("d.csv", 3),
        },
        Case {
            name: "invalid UTF-8",
            files: &[("d.csv", b"dec,inc\n10,20\n10,\xff\n")],
            args: mean,
            expect: r_row("d.csv", 3),
        },
        Case {
            name: "bedding dip above 90",
            files: &[("d.csv", b"dec,inc,bed_dip_dir,bed_dip\n10,20,30,95\n")],
            args: mean,
            expect: r("d.csv", 2, "bed_dip"),
        },
        Case {
            name: "bedding given twice",
            files: &[("d.csv", b"dec,inc,bed_dip_dir,bed_strike,bed_dip\n10,20,30,300,20\n")],
            args: mean,
            expect: r("d.csv", 2, "bed_strike"),
        },
        Case {
            name: "bedding dip without direction",
            files: &[("d.csv", b"dec,inc,bed_dip_dir,bed_dip\n10,20,,20\n")],
            args: mean,
            expect: r("d.csv", 2, "bed_dip_dir"),
        },
        Case {
            name: "tilt frame on a row without bedding",
            files: &[("d.csv", b"dec,inc,bed_dip_dir,bed_dip\n10,20,30,20\n12,22,,\n")],
            args: &["mean", "d.csv", "--frame", "tilt"],
            expect: r("d.csv", 3, "bed_dip"),
        },
        Case {
            name: "unknown kind word",
            files: &[("d.csv", b"dec,inc,kind\n10,20,circle\n")],
            args: mean,
            expect: r("d.csv", 2, "kind"),
        },
        Case {
            name: "both height and depth",
            files: &[("d.csv", b"dec,inc,height,depth\n10,20,1,2\n")],
            args: mean,
            expect: r("d.csv", 1, "depth"),
        },
        Case {
            name: "--by names a missing column",
            files: &[("d.csv", b"dec,inc\n10,20\n")],
            args: &["mean", "d.csv", "--by", "formation"],
            expect: r("d.csv", 1, "formation"),
        },
        Case {
            name: "unknown frame word",
            files: &[("d.csv", b"dec,inc\n10,20\n")],
            args: &["mean", "d.csv", "--frame", "sideways"],
            expect: Usage,
        },
        Case {
            name: "missing input file",
            files: &[],
            args: &["mean", "nowhere.csv"],
            expect: Failed { says: "nowhere.csv" },
        },
        // Edge data that is valid: reported, never a NaN.
        Case {
            name: "group of one direction",
            files: &[("d.csv", b"site,dec,inc\nQ,123,45\n")],
            args: mean,
            expect: Accepted {
                json: &[
                    ("/groups/0/n", Jv::Num(1.0)),
                    ("/groups/0/dec", Jv::Num(123.0)),
                    ("/groups/0/k", Jv::Null),
                    ("/groups/0/a95", Jv::Null),
                    ("/groups/0/theta63", Jv::Null),
                ],
            },
        },
        Case {
            name: "identical directions: k infinite, cone of zero width",
            files: &[("d.csv", b"dec,inc\n10,20\n10,20\n10,20\n")],
            args: mean,
            expect: Accepted {
                json: &[
                    ("/groups/0/n", Jv::Num(3.0)),
                    ("/groups/0/k", Jv::Str("inf")),
                    ("/groups/0/a95", Jv::Num(0.0)),
                    ("/groups/0/inc", Jv::Num(20.0)),
                ],
            },
        },
        Case {
            name: "exactly antipodal pair: no mean direction",
            files: &[("d.csv", b"dec,inc\n0,0\n180,0\n")],
            args: mean,
            expect: Accepted {
                json: &[
                    ("/groups/0/n", Jv::Num(2.0)),
                    ("/groups/0/dec", Jv::Null),
                    ("/groups/0/inc", Jv::Null),
                    ("/groups/0/a95", Jv::Null),
                ],
            },
        },
        Case {
            name: "antipodal steep pair",
            files: &[("d.csv", b"dec,inc\n40,90\n220,-90\n")],
            args: mean,
            expect: Accepted { json: &[("/groups/0/dec", Jv::Null), ("/groups/0/a95", Jv::Null)] },
        },
        Case {
            // -10 wraps to 350; 350 and 10 average to north (0), not to 180.
            name: "negative declination wraps; either side of north",
            files: &[("d.csv", b"dec,inc\n-10,30\n10,30\n")],
            args: mean,
            expect: Accepted { json: &[("/groups/0/dec", Jv::Num(0.0))] },
        },
        Case {
            name: "declination of exactly 360 is north",
            files: &[("d.csv", b"dec,inc\n360,30\n")],
            args: mean,
            expect: Accepted { json: &[("/groups/0/dec", Jv::Num(0.0)), ("/groups/0/inc", Jv::Num(30.0))] },
        },
        Case {
            name: "BOM, CRLF, upper-case padded headers, extra column",
            files: &[("d.csv", b"\xEF\xBB\xBF Dec , INC ,note\r\n10,20,first\r\n10,20,\r\n")],
            args: mean,
            expect: Accepted { json: &[("/groups/0/n", Jv::Num(2.0)), ("/groups/0/dec", Jv::Num(10.0))] },
        },
        // ---- steps table (components) ----
        Case {
            name: "steps: missing moment column",
            files: &[("st.csv", b"specimen,step,dec,inc\nS1,0,10,40\n")],
            args: RANGE,
            expect: r("st.csv", 1, "moment"),
        },
        Case {
            name: "steps: zero moment",
            files: &[("st.csv", b"specimen,step,dec,inc,moment\nS1,0,10,40,0\n")],
            args: RANGE,
            expect: r("st.csv", 2, "moment"),
        },
        Case {
            name: "steps: negative moment",
            files: &[("st.csv", b"specimen,step,dec,inc,moment\nS1,0,10,40,1e-6\nS1,10,10,40,-1e-6\n")],
            args: RANGE,
            expect: r("st.csv", 3, "moment"),
        },
        Case {
            name: "steps: repeated step",
            files: &[("st.csv", b"specimen,step,dec,inc,moment\nS1,0,10,40,2e-6\nS1,0,10,40,1e-6\n")],
            args: RANGE,
            expect: r("st.csv", 3, "step"),
        },
        Case {
            name: "steps: decreasing step",
            files: &[("st.csv", b"specimen,step,dec,inc,moment\nS1,20,10,40,2e-6\nS1,10,10,40,1e-6\n")],
            args: RANGE,
            expect: r("st.csv", 3, "step"),
        },
        Case {
            name: "steps: negative step",
            files: &[("st.csv", b"specimen,step,dec,inc,moment\nS1,-5,10,40,2e-6\n")],
            args: RANGE,
            expect: r("st.csv", 2, "step"),
        },
        Case {
            name: "steps: unknown treatment",
            files: &[("st.csv", b"specimen,step,dec,inc,moment,treatment\nS1,0,10,40,2e-6,microwave\n")],
            args: RANGE,
            expect: r("st.csv", 2, "treatment"),
        },
        Case {
            name: "steps: empty specimen name",
            files: &[("st.csv", b"specimen,step,dec,inc,moment\n,0,10,40,2e-6\n")],
            args: RANGE,
            expect: r("st.csv", 2, "specimen"),
        },
        Case {
            name: "steps: site changes within a specimen",
            files: &[("st.csv", b"specimen,site,step,dec,inc,moment\nS1,P,0,10,40,2e-6\nS1,Q,10,10,40,1e-6\n")],
            args: RANGE,
            expect: r("st.csv", 3, "site"),
        },
        Case {
            name: "steps: inclination out of range",
            files: &[("st.csv", b"specimen,step,dec,inc,moment\nS1,0,10,140,2e-6\n")],
            args: RANGE,
            expect: r("st.csv", 2, "inc"),
        },
        Case {
            name: "steps: NaN moment",
            files: &[("st.csv", b"specimen,step,dec,inc,moment\nS1,0,10,40,nan\n")],
            args: RANGE,
            expect: r("st.csv", 2, "moment"),
        },
        Case {
            name: "steps: header with no rows",
            files: &[("st.csv", b"specimen,step,dec,inc,moment\n")],
            args: RANGE,
            expect: r_row("st.csv", 1),
        },
        Case {
            name: "components: --from above --to",
            files: &[("st.csv", STEPS)],
            args: &["components", "st.csv", "--from", "30", "--to", "0"],
            expect: Failed { says: "--from" },
        },
        Case {
            name: "components: non-numeric --from",
            files: &[("st.csv", STEPS)],
            args: &["components", "st.csv", "--from", "low", "--to", "30"],
            expect: Usage,
        },
        // ---- picks table (components --picks) ----
        Case {
            name: "picks: unknown specimen",
            files: &[("st.csv", STEPS), ("pk.csv", b"specimen,from,to\nS9,0,30\n")],
            args: PICKED,
            expect: r("pk.csv", 2, "specimen"),
        },
        Case {
            name: "picks: from above to",
            files: &[("st.csv", STEPS), ("pk.csv", b"specimen,from,to\nS1,30,0\n")],
            args: PICKED,
            expect: r("pk.csv", 2, "to"),
        },
        Case {
            name: "picks: range too short for a plane",
            files: &[("st.csv", STEPS), ("pk.csv", b"specimen,from,to,kind\nS1,0,10,plane\n")],
            args: PICKED,
            expect: r("pk.csv", 2, "from"),
        },
        Case {
            name: "picks: unknown anchor word",
            files: &[("st.csv", STEPS), ("pk.csv", b"specimen,from,to,anchor\nS1,0,30,pinned\n")],
            args: PICKED,
            expect: r("pk.csv", 2, "anchor"),
        },
        Case {
            name: "picks: unknown kind word",
            files: &[("st.csv", STEPS), ("pk.csv", b"specimen,from,to,kind\nS1,0,30,arc\n")],
            args: PICKED,
            expect: r("pk.csv", 2, "kind"),
        },
        Case {
            name: "picks: missing to column",
            files: &[("st.csv", STEPS), ("pk.csv", b"specimen,from\nS1,0\n")],
            args: PICKED,
            expect: r("pk.csv", 1, "to"),
        },
        Case {
            name: "picks: inf bound",
            files: &[("st.csv", STEPS), ("pk.csv", b"specimen,from,to\nS1,0,inf\n")],
            args: PICKED,
            expect: r("pk.csv", 2, "to"),
        },
        // ---- sites table (poles, expected) ----
        Case {
            name: "sites: missing lon column",
            files: &[("s.csv", b"site,lat,dec,inc\nA,40,10,55\n")],
            args: &["poles", "s.csv"],
            expect: r("s.csv", 1, "lon"),
        },
        Case {
            name: "sites: longitude beyond 360",
            files: &[("s.csv", b"site,lat,lon,dec,inc\nA,40,250,10,55\nB,40,400,10,55\n")],
            args: &["poles", "s.csv"],
            expect: r("s.csv", 3, "lon"),
        },
        Case {
            name: "sites: latitude beyond 90",
            files: &[("s.csv", b"site,lat,lon,dec,inc\nA,-90.01,250,10,55\n")],
            args: &["poles", "s.csv"],
            expect: r("s.csv", 2, "lat"),
        },
        Case {
            name: "sites: fractional n",
            files: &[("s.csv", b"site,lat,lon,dec,inc,n\nA,40,250,10,55,2.5\n")],
            args: &["poles", "s.csv"],
            expect: r("s.csv", 2, "n"),
        },
        Case {
            name: "sites: zero k",
            files: &[("s.csv", b"site,lat,lon,dec,inc,k\nA,40,250,10,55,0\n")],
            args: &["poles", "s.csv"],
            expect: r("s.csv", 2, "k"),
        },
        Case {
            name: "sites: a95 above 180",
            files: &[("s.csv", b"site,lat,lon,dec,inc,a95\nA,40,250,10,55,181\n")],
            args: &["poles", "s.csv"],
            expect: r("s.csv", 2, "a95"),
        },
        Case {
            name: "sites: empty site name",
            files: &[("s.csv", b"site,lat,lon,dec,inc\n,40,250,10,55\n")],
            args: &["poles", "s.csv"],
            expect: r("s.csv", 2, "site"),
        },
        Case {
            name: "sites: unknown cutoff",
            files: &[("s.csv", SITES)],
            args: &["poles", "s.csv", "--cutoff", "wide"],
            expect: Failed { says: "cutoff" },
        },
        Case {
            name: "expected: bad latitude in sites table",
            files: &[("s.csv", b"site,lat,lon,dec,inc\nA,40,250,10,55\nB,x,250,10,55\n")],
            args: EXPECTED,
            expect: r("s.csv", 3, "lat"),
        },
        Case {
            name: "expected: pole latitude out of range",
            files: &[],
            args: &["expected", "--pole-lat", "95", "--pole-lon", "0", "--lat", "10", "--lon", "10"],
            expect: Failed { says: "95" },
        },
        Case {
            name: "poles: reversed and normal sites mapped through the pole",
            files: &[("s.csv", b"site,lat,lon,dec,inc\nA,40,250,0,59.2\nB,40,250,180,-59.2\n")],
            args: &["poles", "s.csv", "--northern"],
            expect: Accepted { json: &[("/pole/n", Jv::Num(2.0))] },
        },
        // ---- levels tables (column) and time scales (correlate) ----
        Case {
            name: "levels: non-numeric height",
            files: &[("lv.csv", b"height,dec,inc,lat,lon\n1,0,60,40,10\nx,2,58,40,10\n")],
            args: &["column", "lv.csv"],
            expect: r("lv.csv", 3, "height"),
        },
        Case {
            name: "levels: no height or depth column",
            files: &[("lv.csv", b"dec,inc,lat,lon\n0,60,40,10\n")],
            args: &["column", "lv.csv"],
            expect: r("lv.csv", 1, "height"),
        },
        Case {
            name: "levels: latitude out of range",
            files: &[("lv.csv", b"height,dec,inc,lat,lon\n1,0,60,140,10\n")],
            args: &["column", "lv.csv"],
            expect: r("lv.csv", 2, "lat"),
        },
        Case {
            // Decision of the column verb: rows at one height are one level (their directions averaged).
            name: "levels: duplicate heights form one level",
            files: &[("lv.csv", b"height,dec,inc,lat,lon\n1,0,60,40,10\n1,2,58,40,10\n")],
            args: &["column", "lv.csv"],
            expect: Accepted {
                json: &[
                    ("/levels/0/n", Jv::Num(2.0)),
                    ("/levels/0/height", Jv::Num(1.0)),
                    ("/levels/0/polarity", Jv::Str("N")),
                ],
            },
        },
        Case {
            name: "timescale: overlapping chrons",
            files: &[("lv.csv", LEVELS), ("ts.csv", b"young,old,polarity\n0,0.8,N\n0.7,1.0,R\n")],
            args: CORRELATE,
            expect: r("ts.csv", 3, "young"),
        },
        Case {
            name: "timescale: gap",
            files: &[("lv.csv", LEVELS), ("ts.csv", b"young,old,polarity\n0,0.8,N\n0.9,1.0,R\n")],
            args: CORRELATE,
            expect: r("ts.csv", 3, "young"),
        },
        Case {
            name: "timescale: zero-length chron",
            files: &[("lv.csv", LEVELS), ("ts.csv", b"young,old,polarity\n0,0.8,N\n0.8,0.8,R\n")],
            args: CORRELATE,
            expect: r("ts.csv", 3, "old"),
        },
        Case {
            name: "timescale: negative age",
            files: &[("lv.csv", LEVELS), ("ts.csv", b"young,old,polarity\n-0.2,0.8,N\n")],
            args: CORRELATE,
            expect: r("ts.csv", 2, "young"),
        },
        Case {
            name: "timescale: unknown polarity code",
            files: &[("lv.csv", LEVELS), ("ts.csv", b"young,old,polarity\n0,0.8,N\n0.8,1.0,T\n")],
            args: CORRELATE,
            expect: r("ts.csv", 3, "polarity"),
        },
        Case {
            name: "timescale: header only",
            files: &[("lv.csv", LEVELS), ("ts.csv", b"young,old,polarity\n")],
            args: CORRELATE,
            expect: r_row("ts.csv", 1),
        },
        // ---- field tests ----
        Case {
            name: "test reversal: one polarity only",
            files: &[("d.csv", b"dec,inc\n0,60\n3,58\n")],
            args: &["test", "reversal", "d.csv"],
            expect: Failed { says: "at least 2" },
        },
        Case {
            name: "test random: one direction",
            files: &[("d.csv", b"dec,inc\n0,60\n")],
            args: &["test", "random", "d.csv"],
            expect: Failed { says: "at least 2" },
        },
        // ---- reversal-record statistics (intervals, hazard, rate) ----
        Case {
            name: "intervals: unknown polarity code",
            files: &[("ts.csv", b"young,old,polarity\n0,0.8,N\n0.8,1.0,T\n")],
            args: &["intervals", "ts.csv"],
            expect: r("ts.csv", 3, "polarity"),
        },
        Case {
            name: "intervals: overlapping chrons",
            files: &[("ts.csv", b"young,old,polarity\n0,0.8,N\n0.7,1.0,R\n")],
            args: &["intervals", "ts.csv"],
            expect: r("ts.csv", 3, "young"),
        },
        Case {
            name: "intervals: too few complete intervals",
            files: &[("ts.csv", b"young,old,polarity\n0,0.8,N\n0.8,1.0,R\n")],
            args: &["intervals", "ts.csv"],
            expect: Failed { says: "at least 2 complete intervals" },
        },
        Case {
            name: "intervals: empty window",
            files: &[("ts.csv", b"young,old,polarity\n0,0.8,N\n0.8,1.0,R\n")],
            args: &["intervals", "ts.csv", "--from", "3", "--to", "1"],
            expect: Failed { says: "empty" },
        },
        Case {
            name: "rate: zero window",
            files: &[("ts.csv", b"young,old,polarity\n0,0.8,N\n0.8,1.0,R\n")],
            args: &["rate", "ts.csv", "--window", "0"],
            expect: Failed { says: "window" },
        },
        Case {
            name: "hazard: negative elapsed time",
            files: &[("ts.csv", b"young,old,polarity\n0,0.3,N\n0.3,0.5,R\n0.5,0.9,N\n0.9,1.0,R\n1.0,1.4,N\n")],
            args: &["hazard", "ts.csv", "--elapsed=-1"],
            expect: Failed { says: "elapsed" },
        },
        Case {
            name: "hazard: negative horizon",
            files: &[("ts.csv", b"young,old,polarity\n0,0.3,N\n0.3,0.5,R\n0.5,0.9,N\n0.9,1.0,R\n1.0,1.4,N\n")],
            args: &["hazard", "ts.csv", "--elapsed=0.5", "--horizon=-0.1"],
            expect: Failed { says: "horizon" },
        },
        Case {
            name: "test reversal: inclination out of range",
            files: &[("d.csv", b"dec,inc\n0,60\n180,-95\n")],
            args: &["test", "reversal", "d.csv"],
            expect: r("d.csv", 3, "inc"),
        },
    ]
}

fn listing(dir: &Path) -> BTreeSet<String> {
    std::fs::read_dir(dir).unwrap().map(|e| e.unwrap().file_name().to_string_lossy().into_owned()).collect()
}

/// Output arguments added to refused runs of verbs that draw, so that "nothing was written" is tested.
fn plot_args(verb: &str) -> &'static [&'static str] {
    match verb {
        "mean" | "poles" | "column" | "correlate" => &["--plot", "out.svg"],
        "components" => &["--plot", "figs"],
        _ => &[],
    }
}

fn check_json(v: &serde_json::Value, pointer: &str, want: Jv) -> Result<(), String> {
    let got = v.pointer(pointer).ok_or_else(|| format!("JSON has no {pointer}"))?;
    let ok = match want {
        Jv::Null => got.is_null(),
        Jv::Str(s) => got.as_str() == Some(s),
        // Angles may come back as 359.99999999999994 for 0: compare on the circle for that one case.
        Jv::Num(x) => got.as_f64().is_some_and(|g| (g - x).abs() < 1e-9 || ((g - x).abs() - 360.0).abs() < 1e-9),
    };
    if ok {
        Ok(())
    } else {
        Err(format!("{pointer}: expected {want:?}, got {got}"))
    }
}

fn run_case(c: &Case) -> Result<(), String> {
    let dir = tempfile::tempdir().unwrap();
    for (name, body) in c.files {
        std::fs::write(dir.path().join(name), body).unwrap();
    }
    let before = listing(dir.path());
    let mut args: Vec<&str> = c.args.to_vec();
    if matches!(c.expect, Refused { .. } | Failed { .. }) {
        args.extend_from_slice(plot_args(c.args[0]));
    }
    let json_run = matches!(c.expect, Accepted { .. });
    if json_run {
        args.extend_from_slice(&["--format", "json"]);
    }
    let out = Command::cargo_bin("lodestone").unwrap().current_dir(dir.path()).args(&args).output().unwrap();
    let err = String::from_utf8_lossy(&out.stderr).into_owned();
    let stdout = String::from_utf8_lossy(&out.stdout).into_owned();
    let code = out.status.code();
    if listing(dir.path()) != before {
        return Err(format!("the run left files behind: {:?} (was {:?})", listing(dir.path()), before));
    }
    if err.contains("panicked") {
        return Err(format!("panic: {err}"));
    }
    match &c.expect {
        Refused { file, line, column } => {
            if code != Some(1) {
                return Err(format!("exit {code:?}, expected 1; stderr: {err}"));
            }
            let at = format!("{file}:{line}: ");
            if !err.contains(&at) {
                return Err(format!("message does not name '{at}': {err}"));
            }
            if let Some(col) = column {
                let want = format!("{at}column '{col}'");
                if !err.contains(&want) {
                    return Err(format!("message does not name '{want}': {err}"));
                }
            }
            if !stdout.is_empty() {
                return Err(format!("a refused run printed data: {stdout}"));
            }
        }
        Failed { says } => {
            if code != Some(1) {
                return Err(format!("exit {code:?}, expected 1; stderr: {err}"));
            }
            if !err.contains(says) {
                return Err(format!("message does not say '{says}': {err}"));
            }
        }
        Usage => {
            if code != Some(2) {
                return Err(format!("exit {code:?}, expected 2; stderr: {err}"));
            }
        }
        Accepted { json } => {
            if code != Some(0) {
                return Err(format!("exit {code:?}, expected 0; stderr: {err}"));
            }
            let v: serde_json::Value =
                serde_json::from_str(&stdout).map_err(|e| format!("bad JSON ({e}): {stdout}"))?;
            for (p, want) in *json {
                check_json(&v, p, *want)?;
            }
            // The same run for people must not show a NaN either.
            let mut table_args: Vec<&str> = c.args.to_vec();
            table_args.extend_from_slice(&["--format", "table"]);
            let t =
                Command::cargo_bin("lodestone").unwrap().current_dir(dir.path()).args(&table_args).output().unwrap();
            let text = String::from_utf8_lossy(&t.stdout);
            if !t.status.success() || text.contains("NaN") || stdout.contains("NaN") {
                return Err(format!("table output failed or shows NaN: {text}"));
            }
        }
    }
    Ok(())
}

#[test]
fn catalogue_of_bad_inputs() {
    let cases = catalogue();
    assert!(cases.len() >= 30, "the catalogue should hold at least 30 cases");
    let failures: Vec<String> =
        cases.iter().filter_map(|c| run_case(c).err().map(|e| format!("[{}] {e}", c.name))).collect();
    assert!(failures.is_empty(), "{} of {} cases failed:\n{}", failures.len(), cases.len(), failures.join("\n"));
}

/// Time-scale tables: the validator itself.
#[test]
fn timescale_catalogue() {
    use lodestone::model::TimeScale;
    use lodestone::table::Table;
    let cases: &[(&str, &str, usize, Option<&str>)] = &[
        ("overlapping chrons", "young,old,polarity\n0,0.8,N\n0.7,1.0,R\n", 3, Some("young")),
        ("gap between chrons", "young,old,polarity\n0,0.8,N\n0.9,1.0,R\n", 3, Some("young")),
        ("zero-length chron", "young,old,polarity\n0,0.8,N\n0.8,0.8,R\n", 3, Some("old")),
        ("inverted chron", "young,old,polarity\n0,0.8,N\n1.2,0.8,R\n", 3, Some("old")),
        ("negative age", "young,old,polarity\n-0.1,0.8,N\n", 2, Some("young")),
        ("unknown polarity code", "young,old,polarity\n0,0.8,N\n0.8,1.0,X\n", 3, Some("polarity")),
        ("empty polarity cell", "young,old,polarity\n0,0.8,\n", 2, Some("polarity")),
        ("NaN age", "young,old,polarity\n0,NaN,N\n", 2, Some("old")),
        ("missing polarity column", "young,old\n0,0.8\n", 1, Some("polarity")),
        ("header without rows", "young,old,polarity\n", 1, None),
        ("duplicate chron rows", "young,old,polarity\n0,0.8,N\n0,0.8,N\n", 3, Some("young")),
        ("overlap found after sorting", "young,old,polarity\n0.8,1.0,R\n# moved\n0,0.9,N\n", 2, Some("young")),
    ];
    let mut failures = Vec::new();
    for (what, text, line, column) in cases {
        let res = Table::parse("ts.csv", text.as_bytes()).and_then(|t| TimeScale::from_table(&t));
        match res {
            Ok(_) => failures.push(format!("[{what}] accepted")),
            Err(e) => {
                let msg = e.to_string();
                let want = match column {
                    Some(c) => format!("ts.csv:{line}: column '{c}'"),
                    None => format!("ts.csv:{line}: "),
                };
                if !msg.starts_with(&want) {
                    failures.push(format!("[{what}] expected '{want}…', got '{msg}'"));
                }
            }
        }
    }
    // Unsorted but tiling rows are accepted and sorted young to old.
    let t = Table::parse("ts.csv", b"young,old,polarity,name\n0.78,0.99,R,b\n0,0.78,N,a\n").unwrap();
    let ts = TimeScale::from_table(&t).unwrap();
    assert_eq!(ts.chrons[0].name.as_deref(), Some("a"));
    assert_eq!(ts.chrons[1].line, 2);
    assert!(failures.is_empty(), "{}", failures.join("\n"));
}

/// Outputs: an input is never overwritten; an output folder that already holds files is used only
/// with `--force`, which replaces figures of the same names and leaves every other file alone; a
/// folder holding an input is refused even then.
#[test]
fn output_rules() {
    let d = tempfile::tempdir().unwrap();
    let p = d.path();
    std::fs::write(p.join("st.csv"), STEPS).unwrap();
    // A directions table that happens to carry a figure's extension.
    std::fs::write(p.join("d.svg"), b"dec,inc\n10,20\n12,25\n").unwrap();
    let run = |args: &[&str]| Command::cargo_bin("lodestone").unwrap().current_dir(p).args(args).output().unwrap();
    let args = ["components", "st.csv", "--from", "0", "--to", "30", "--plot", "figs"];

    // A figure path that is the input file: refused, input intact.
    let o = run(&["mean", "d.svg", "--plot", "d.svg"]);
    assert_eq!(o.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&o.stderr).contains("input"));
    assert_eq!(std::fs::read(p.join("d.svg")).unwrap(), b"dec,inc\n10,20\n12,25\n");

    // A new folder is created and filled.
    assert!(run(&args).status.success());
    assert!(p.join("figs/S1.svg").exists());
    // Again, without --force: refused, the folder is untouched.
    std::fs::write(p.join("figs/notes.txt"), "field notes").unwrap();
    let first = std::fs::read(p.join("figs/S1.svg")).unwrap();
    let o = run(&args);
    assert_eq!(o.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&o.stderr).contains("--force"));
    // With --force: the figure is replaced (in PNG this time), other files stay.
    let mut forced = args.to_vec();
    forced.extend(["--force", "--plot-format", "png"]);
    assert!(run(&forced).status.success());
    assert_eq!(&std::fs::read(p.join("figs/S1.png")).unwrap()[1..4], b"PNG");
    assert_eq!(std::fs::read(p.join("figs/S1.svg")).unwrap(), first);
    assert_eq!(std::fs::read_to_string(p.join("figs/notes.txt")).unwrap(), "field notes");
    // No temporary files are left in the folder.
    let names = listing(&p.join("figs"));
    assert_eq!(names, ["S1.png", "S1.svg", "notes.txt"].iter().map(|s| s.to_string()).collect());

    // A folder holding the input: refused, with or without --force.
    std::fs::create_dir(p.join("proj")).unwrap();
    std::fs::write(p.join("proj/st.csv"), STEPS).unwrap();
    for extra in [&[][..], &["--force"][..]] {
        let mut a = vec!["components", "proj/st.csv", "--from", "0", "--to", "30", "--plot", "proj"];
        a.extend_from_slice(extra);
        let o = run(&a);
        assert_eq!(o.status.code(), Some(1));
        assert!(String::from_utf8_lossy(&o.stderr).contains("input"));
        assert_eq!(listing(&p.join("proj")), ["st.csv".to_string()].into_iter().collect());
    }
}
