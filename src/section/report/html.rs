//! Small HTML writers shared by the report's parts: escaping, ids, figures and folded tables.

use crate::present::Cell;
use crate::section::{CsvTable, FigureOutput};
use std::fmt::Write as _;

/// Tables with more rows than this are folded (closed `<details>`); shorter ones start open.
pub const FOLD_ROWS: usize = 12;

/// Escape text for HTML.
pub fn escape(s: &str) -> String {
    let mut o = String::with_capacity(s.len());
    for c in s.chars() {
        match c {
            '&' => o.push_str("&amp;"),
            '<' => o.push_str("&lt;"),
            '>' => o.push_str("&gt;"),
            '"' => o.push_str("&quot;"),
            _ => o.push(c),
        }
    }
    o
}

/// An id fragment from a name: ASCII letters and digits kept (lower-cased), anything else a `-`.
pub fn slug(s: &str) -> String {
    let mut o = String::new();
    for c in s.chars() {
        if c.is_ascii_alphanumeric() {
            o.push(c.to_ascii_lowercase());
        } else if !o.ends_with('-') {
            o.push('-');
        }
    }
    o.trim_matches('-').to_string()
}

/// The SVG text without an XML declaration or doctype, ready to sit inside HTML.
pub fn inline_svg(svg: &str) -> &str {
    let mut s = svg.trim_start();
    while s.starts_with("<?") || s.starts_with("<!") {
        match s.find('>') {
            Some(i) => s = s[i + 1..].trim_start(),
            None => break,
        }
    }
    s
}

/// A figure of the run, inline, with its caption and links to its SVG and PNG files. `id_prefix`
/// tells the summary's copy (`key-`) from the stage's (`fig-`).
pub fn figure(h: &mut String, f: &FigureOutput, id_prefix: &str) {
    let _ = writeln!(
        h,
        "<figure class=\"plot\" id=\"{id_prefix}{}\">\n{}\n<figcaption>{} <span class=\"files\">(<a href=\"figures/{}.svg\">SVG</a>, <a href=\"figures/{}.png\">PNG</a>)</span></figcaption>\n</figure>",
        f.stem,
        inline_svg(&f.svg),
        escape(&f.caption),
        f.stem,
        f.stem
    );
}

/// A table in a `<details>` block (open when short), its summary line naming the rows and
/// linking the CSV file.
pub fn folded_table(h: &mut String, t: &CsvTable) {
    let open = if t.rows.len() <= FOLD_ROWS { " open" } else { "" };
    let _ = writeln!(
        h,
        "<details class=\"table\" id=\"table-{}\"{open}><summary>{} <span class=\"files\">· {} row{} · <a href=\"tables/{}.csv\">tables/{}.csv</a></span></summary>",
        t.stem,
        escape(&t.title),
        t.rows.len(),
        if t.rows.len() == 1 { "" } else { "s" },
        t.stem,
        t.stem
    );
    table(h, t);
    let _ = writeln!(h, "</details>");
}

/// The bare `<table>` of a CSV table.
pub fn table(h: &mut String, t: &CsvTable) {
    let _ = write!(h, "<div class=\"scroll\"><table><thead><tr>");
    for c in &t.columns {
        let _ = write!(h, "<th>{}</th>", escape(c));
    }
    let _ = writeln!(h, "</tr></thead><tbody>");
    let mut text = String::new();
    for r in &t.rows {
        let _ = write!(h, "<tr>");
        for c in r {
            text.clear();
            c.push_text(&mut text);
            let numeric = match c {
                Cell::Text(t) => !t.is_empty() && t.parse::<f64>().is_ok(),
                Cell::Empty => false,
                _ => true,
            };
            let shown = if matches!(c, Cell::Empty) { "" } else { text.as_str() };
            let _ = write!(h, "<td{}>{}</td>", if numeric { " class=\"n\"" } else { "" }, escape(shown));
        }
        let _ = writeln!(h, "</tr>");
    }
    let _ = writeln!(h, "</tbody></table></div>");
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn escapes_slugs_and_strips_declarations() {
        assert_eq!(escape("a<b & \"c\""), "a&lt;b &amp; &quot;c&quot;");
        assert_eq!(slug("SG001-1"), "sg001-1");
        assert_eq!(slug("Field tests (95 %)"), "field-tests-95");
        assert_eq!(inline_svg("<?xml version=\"1.0\"?>\n<!DOCTYPE svg>\n<svg/>"), "<svg/>");
    }

    #[test]
    fn long_tables_are_folded_short_ones_open() {
        let mut t = CsvTable::new("x", "X", &["a"]);
        t.push(vec!["1".into()]);
        let mut h = String::new();
        folded_table(&mut h, &t);
        assert!(h.contains("<details class=\"table\" id=\"table-x\" open>") && h.contains("href=\"tables/x.csv\""));
        for _ in 0..FOLD_ROWS {
            t.push(vec!["2".into()]);
        }
        let mut h = String::new();
        folded_table(&mut h, &t);
        assert!(h.contains("id=\"table-x\">"), "{h}");
    }
}
