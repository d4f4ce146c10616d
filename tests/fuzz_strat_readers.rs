//! Fuzzing and property tests of the levels and zones readers (the stratigraphic tables).
//!
//! As in `fuzz_readers.rs`: a small default case count; set `LODESTONE_FUZZ_CASES` for a long run.

use lodestone::strat::{read_levels, read_zones, LevelOptions};
use lodestone::table::Table;
use proptest::prelude::*;

fn cases() -> u32 {
    std::env::var("LODESTONE_FUZZ_CASES").ok().and_then(|s| s.parse().ok()).unwrap_or(2000)
}

/// Bytes that look like a levels or zones table: their header words, numbers, codes and junk.
fn stratish() -> impl Strategy<Value = Vec<u8>> {
    let words: Vec<&'static [u8]> = vec![
        b"height",
        b"depth",
        b"vgp_lat",
        b"dec",
        b"inc",
        b"lat",
        b"lon",
        b"site",
        b"a95",
        b"mad",
        b"polarity",
        b"n_levels",
        b"status",
        b"base",
        b"base_low",
        b"base_high",
        b"top",
        b"top_low",
        b"top_high",
        b"axis",
        b"zone",
        b"confirmed",
        b"single-level",
        b"N",
        b"R",
        b"I",
        b"bed_dip",
        b"bed_dip_dir",
        b",",
        b"\n",
        b"\r\n",
        b"\"",
        b"#",
        b"\xEF\xBB\xBF",
        b"NaN",
        b"inf",
        b"-0",
        b"1e400",
        b"90",
        b"-90",
        b"0",
    ];
    let token = prop_oneof![
        proptest::sample::select(words).prop_map(|w| w.to_vec()),
        (-200.0f64..200.0).prop_map(|x| format!("{x}").into_bytes()),
        proptest::collection::vec(any::<u8>(), 0..4),
    ];
    proptest::collection::vec(token, 0..70).prop_map(|v| v.concat())
}

proptest! {
    #![proptest_config(ProptestConfig { cases: cases(), failure_persistence: None, ..ProptestConfig::default() })]
    #[test]
    fn levels_and_zones_readers_never_panic(bytes in stratish()) {
        if let Ok(t) = Table::parse("fuzz.csv", &bytes) {
            for in_situ in [false, true] {
                if let Ok(l) = read_levels(&t, LevelOptions { in_situ }) {
                    for v in &l.levels {
                        prop_assert!(v.position.is_finite() && (-90.0..=90.0).contains(&v.vgp_lat), "{v:?}");
                    }
                }
            }
            let _ = read_zones(&t);
        }
    }

    #[test]
    fn arbitrary_bytes_never_panic(bytes in proptest::collection::vec(any::<u8>(), 0..300)) {
        if let Ok(t) = Table::parse("fuzz.csv", &bytes) {
            let _ = read_levels(&t, LevelOptions::default());
            let _ = read_zones(&t);
        }
    }

    /// A vgp_lat table with distinct heights in any order: every row becomes one level, the levels
    /// come out in increasing height with their own VGP latitude, and a note says so exactly when the
    /// rows were not already in increasing order.
    #[test]
    fn levels_are_sorted_and_kept(rows in proptest::collection::btree_map(-5000i32..5000, -90.0f64..=90.0, 1..30),
                                  order in proptest::collection::vec(any::<u32>(), 30)) {
        let mut list: Vec<(f64, f64)> = rows.iter().map(|(h, v)| (*h as f64 / 10.0, *v)).collect();
        let idx: Vec<u32> = order[..list.len()].to_vec();
        let mut keyed: Vec<((u32, usize), (f64, f64))> = list.drain(..).enumerate().map(|(i, r)| ((idx[i], i), r)).collect();
        keyed.sort_by_key(|k| k.0);
        let shuffled: Vec<(f64, f64)> = keyed.into_iter().map(|k| k.1).collect();
        let mut text = String::from("vgp_lat,height\n");
        for (h, v) in &shuffled {
            text.push_str(&format!("{v},{h}\n"));
        }
        let l = read_levels(&Table::parse("lv.csv", text.as_bytes()).unwrap(), LevelOptions::default());
        prop_assert!(l.is_ok(), "{:?}\n{text}", l.err());
        let l = l.unwrap();
        prop_assert_eq!(l.levels.len(), shuffled.len());
        prop_assert!(l.levels.windows(2).all(|w| w[0].position < w[1].position));
        for v in &l.levels {
            let want = shuffled.iter().find(|r| r.0 == v.position).unwrap().1;
            prop_assert_eq!(v.vgp_lat, want);
        }
        let ascending = shuffled.windows(2).all(|w| w[0].0 <= w[1].0);
        prop_assert_eq!(l.notes.iter().any(|n| n.contains("sorted")), !ascending, "{:?}", l.notes);
    }

    /// A well-formed zones table (alternating polarity, each base interval the top interval of the zone
    /// below) is read back with its zones, in any row order.
    #[test]
    fn well_formed_zones_are_read(widths in proptest::collection::vec((1u32..50, 0u32..5), 1..12), first_normal in any::<bool>(), reverse in any::<bool>()) {
        // Boundaries at cumulative heights; each boundary interval ± its half-width (below the zone size).
        let mut edges = vec![(0.0, 0.0)];
        let mut h = 0.0;
        for (w, u) in &widths {
            h += *w as f64 + 10.0;
            edges.push((h, (*u as f64).min(4.0)));
        }
        // The column's ends are known exactly (low = high).
        edges.last_mut().unwrap().1 = 0.0;
        let mut rows = Vec::new();
        for i in 0..widths.len() {
            let pol = if (i % 2 == 0) == first_normal { "N" } else { "R" };
            let (b, bu) = edges[i];
            let (t, tu) = edges[i + 1];
            rows.push(format!("{pol},2,{b},{},{},{t},{},{},height\n", b - bu, b + bu, t - tu, t + tu));
        }
        if reverse {
            rows.reverse();
        }
        let text = format!("polarity,n_levels,base,base_low,base_high,top,top_low,top_high,axis\n{}", rows.concat());
        let z = read_zones(&Table::parse("z.csv", text.as_bytes()).unwrap());
        prop_assert!(z.is_ok(), "{:?}\n{text}", z.err());
        prop_assert_eq!(z.unwrap().zones.len(), widths.len());
    }
}
