//! Writers for `--format table|csv|json`, shared by every verb. Verbs build a [`Report`]; the writers
//! only format it.

use serde_json::Value;
use std::io::Write;

/// Output format (global option `--format`).
#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum, Default)]
pub enum Format {
    /// Aligned text for people (default).
    #[default]
    Table,
    /// Comma-separated values: the verb's main table.
    Csv,
    /// JSON: every field.
    Json,
}

/// One cell of a text or CSV table.
#[derive(Debug, Clone, PartialEq)]
pub enum Cell {
    /// Text.
    Text(String),
    /// A number shown with this many decimals in text tables (full precision in CSV).
    Num(f64, usize),
    /// An integer.
    Int(i64),
    /// No value (JSON null): printed as `-` in text and empty in CSV.
    Empty,
}

impl Cell {
    /// A number, or `Empty` for `None`; infinite values print as `inf`.
    pub fn opt(v: Option<f64>, decimals: usize) -> Cell {
        v.map_or(Cell::Empty, |x| Cell::Num(x, decimals))
    }
    /// Text, or `Empty` for `None`.
    pub fn opt_text(v: Option<&str>) -> Cell {
        v.map_or(Cell::Empty, |s| Cell::Text(s.to_string()))
    }
    fn text(&self) -> String {
        match self {
            Cell::Text(s) => s.clone(),
            Cell::Num(x, _) if x.is_infinite() => if *x > 0.0 { "inf".into() } else { "-inf".into() },
            Cell::Num(x, d) => format!("{x:.d$}", d = *d),
            Cell::Int(i) => i.to_string(),
            Cell::Empty => "-".into(),
        }
    }
    fn csv(&self) -> String {
        match self {
            Cell::Num(x, _) if x.is_finite() => {
                // Ten decimals: more than any measurement carries, without floating-point noise.
                let t = format!("{x:.10}");
                let t = t.trim_end_matches('0').trim_end_matches('.');
                if t == "-0" { "0".into() } else { t.to_string() }
            }
            Cell::Empty => String::new(),
            other => other.text(),
        }
    }
}

/// A titled table.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Section {
    /// Title shown above the table in text output.
    pub title: String,
    /// Column names.
    pub columns: Vec<String>,
    /// Rows of cells.
    pub rows: Vec<Vec<Cell>>,
}

impl Section {
    /// A section with the given title and columns.
    pub fn new(title: &str, columns: &[&str]) -> Self {
        Self { title: title.into(), columns: columns.iter().map(|s| s.to_string()).collect(), rows: vec![] }
    }
}

/// What a verb produced.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Report {
    /// The full result for `--format json`.
    pub json: Value,
    /// Tables for `--format table`.
    pub sections: Vec<Section>,
    /// Which section `--format csv` prints.
    pub csv_section: usize,
    /// Plain sentences (interpretation, cautions): printed after the tables, or on stderr for CSV.
    pub notes: Vec<String>,
}

/// Write a report in the chosen format.
pub fn write_report(r: &Report, format: Format, out: &mut dyn Write, err: &mut dyn Write) -> std::io::Result<()> {
    match format {
        Format::Json => {
            serde_json::to_writer_pretty(&mut *out, &r.json)?;
            writeln!(out)?;
        }
        Format::Csv => {
            if let Some(s) = r.sections.get(r.csv_section) {
                let mut w = csv::Writer::from_writer(&mut *out);
                w.write_record(&s.columns)?;
                for row in &s.rows {
                    w.write_record(row.iter().map(Cell::csv))?;
                }
                w.flush()?;
            }
            for n in &r.notes {
                writeln!(err, "note: {n}")?;
            }
        }
        Format::Table => {
            for (i, s) in r.sections.iter().enumerate() {
                if i > 0 {
                    writeln!(out)?;
                }
                write_text_table(s, out)?;
            }
            if !r.notes.is_empty() {
                writeln!(out)?;
                for n in &r.notes {
                    writeln!(out, "{n}")?;
                }
            }
        }
    }
    Ok(())
}

fn write_text_table(s: &Section, out: &mut dyn Write) -> std::io::Result<()> {
    if !s.title.is_empty() {
        writeln!(out, "{}", s.title)?;
    }
    let cells: Vec<Vec<String>> = s.rows.iter().map(|r| r.iter().map(Cell::text).collect()).collect();
    let mut width: Vec<usize> = s.columns.iter().map(|c| c.chars().count()).collect();
    for r in &cells {
        for (i, c) in r.iter().enumerate() {
            if i < width.len() {
                width[i] = width[i].max(c.chars().count());
            }
        }
    }
    let numeric: Vec<bool> = (0..s.columns.len())
        .map(|i| s.rows.iter().all(|r| matches!(r.get(i), Some(Cell::Num(..) | Cell::Int(_) | Cell::Empty))))
        .collect();
    let line = |vals: Vec<String>, out: &mut dyn Write| -> std::io::Result<()> {
        let parts: Vec<String> = vals
            .iter()
            .enumerate()
            .map(|(i, v)| {
                let pad = width[i].saturating_sub(v.chars().count());
                if numeric[i] {
                    format!("{}{}", " ".repeat(pad), v)
                } else {
                    format!("{}{}", v, " ".repeat(pad))
                }
            })
            .collect();
        writeln!(out, "  {}", parts.join("  ").trim_end())
    };
    line(s.columns.clone(), out)?;
    for r in cells {
        line(r, out)?;
    }
    Ok(())
}

/// A JSON number, or null for None / non-finite (use for optional statistics).
pub fn jnum(v: Option<f64>) -> Value {
    match v {
        Some(x) if x.is_finite() => serde_json::json!(x),
        Some(x) if x.is_infinite() => Value::String(if x > 0.0 { "inf".into() } else { "-inf".into() }),
        _ => Value::Null,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn sample() -> Report {
        let mut s = Section::new("t", &["name", "x"]);
        s.rows.push(vec![Cell::Text("a".into()), Cell::Num(1.23456, 2)]);
        s.rows.push(vec![Cell::Text("bb".into()), Cell::Empty]);
        Report { json: serde_json::json!({"a": 1}), sections: vec![s], csv_section: 0, notes: vec!["hello".into()] }
    }

    #[test]
    fn three_writers() {
        let (mut o, mut e) = (Vec::new(), Vec::new());
        write_report(&sample(), Format::Csv, &mut o, &mut e).unwrap();
        assert_eq!(String::from_utf8(o).unwrap(), "name,x\na,1.23456\nbb,\n");
        assert_eq!(String::from_utf8(e).unwrap(), "note: hello\n");
        let (mut o, mut e) = (Vec::new(), Vec::new());
        write_report(&sample(), Format::Table, &mut o, &mut e).unwrap();
        assert_eq!(String::from_utf8(o).unwrap(), "t\n  name     x\n  a     1.23\n  bb       -\n\nhello\n");
        let (mut o, mut e) = (Vec::new(), Vec::new());
        write_report(&sample(), Format::Json, &mut o, &mut e).unwrap();
        assert_eq!(String::from_utf8(o).unwrap(), "{\n  \"a\": 1\n}\n");
        assert_eq!(jnum(Some(f64::INFINITY)), Value::String("inf".into()));
        assert_eq!(jnum(Some(f64::NAN)), Value::Null);
    }
}
