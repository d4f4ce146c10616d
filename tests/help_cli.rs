//! The help text: verbs in the order of the job, and the global options under their own heading.

use assert_cmd::Command;

fn help(args: &[&str]) -> String {
    let out = Command::cargo_bin("lodestone").unwrap().args(args).output().unwrap();
    assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    String::from_utf8(out.stdout).unwrap()
}

/// The verbs listed under "Commands:", in order.
fn verbs(text: &str) -> Vec<String> {
    text.lines()
        .skip_while(|l| !l.starts_with("Commands:"))
        .skip(1)
        .take_while(|l| l.starts_with("  "))
        .filter_map(|l| l.split_whitespace().next().map(str::to_string))
        .collect()
}

#[test]
fn verbs_come_in_the_order_of_the_job() {
    let v = verbs(&help(&["--help"]));
    let job = [
        "components",
        "mean",
        "test",
        "poles",
        "column",
        "correlate",
        "intervals",
        "hazard",
        "rate",
        "simulate",
        "section",
        "demo",
    ];
    // The job's verbs come first and in this order; any other verb (and `help`) follows them.
    assert_eq!(&v[..job.len()], &job, "{v:?}");
}

#[test]
fn global_options_have_their_own_heading_in_every_help() {
    let top = help(&["--help"]);
    let mut all: Vec<String> = verbs(&top).into_iter().filter(|v| v != "help").collect();
    all.insert(0, String::new());
    for verb in &all {
        let args: Vec<&str> = if verb.is_empty() { vec!["--help"] } else { vec![verb.as_str(), "--help"] };
        let text = help(&args);
        let heading = text.find("\nGlobal options:").unwrap_or_else(|| panic!("{verb}: no heading\n{text}"));
        let (own, global) = text.split_at(heading);
        // An option is listed on a line of its own that starts (after blanks and a short form) with it.
        let listed = |part: &str, opt: &str| {
            part.lines().any(|l| {
                let t = l.trim_start();
                t.starts_with(opt) || (t.starts_with('-') && t.get(4..).is_some_and(|r| r.starts_with(opt)))
            })
        };
        for opt in ["--format", "--seed", "--threads", "--quiet"] {
            assert!(listed(global, opt), "{verb}: {opt} missing under the heading\n{text}");
            assert!(!listed(own, opt), "{verb}: {opt} listed among the verb's own options\n{text}");
        }
    }
}
