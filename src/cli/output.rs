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
    /// An azimuth (declination, longitude) in degrees: as `Num`, but reduced into [0, 360) and never
    /// written as 360 after rounding.
    Azimuth(f64, usize),
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
    /// An azimuth, or `Empty` for `None`.
    pub fn opt_azimuth(v: Option<f64>, decimals: usize) -> Cell {
        v.map_or(Cell::Empty, |x| Cell::Azimuth(x, decimals))
    }
    /// Text, or `Empty` for `None`.
    pub fn opt_text(v: Option<&str>) -> Cell {
        v.map_or(Cell::Empty, |s| Cell::Text(s.to_string()))
    }
    /// Append the text form to `buf` (no allocation for numbers).
    fn push_text(&self, buf: &mut String) {
        use std::fmt::Write as _;
        match self {
            Cell::Text(s) => buf.push_str(s),
            Cell::Num(x, d) => lodestone::numbers::push_fixed(buf, *x, *d),
            Cell::Azimuth(x, d) => lodestone::numbers::push_azimuth(buf, *x, *d),
            Cell::Int(i) => {
                let _ = write!(buf, "{i}");
            }
            Cell::Empty => buf.push('-'),
        }
    }
    /// Append the CSV form to `buf`: numbers at full precision, empty for no value.
    fn push_csv(&self, buf: &mut String) {
        match self {
            Cell::Num(x, _) => lodestone::numbers::push_csv(buf, *x),
            Cell::Azimuth(x, _) => lodestone::numbers::push_csv_azimuth(buf, *x),
            Cell::Empty => {}
            other => other.push_text(buf),
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

/// A report whose rows, JSON and notes are produced while they are written, for verbs whose row
/// count can be very large: nothing per row is held. The writers are those of [`Report`].
pub trait StreamedReport {
    /// Title and columns of the table (printed for `table`, and for `csv` without the title); its
    /// `rows` are ignored.
    fn head(&self) -> &Section;
    /// Give every row of the table, in order, to `f`. Called twice for a text table (to measure the
    /// columns, then to write), so it must give the same rows each time.
    fn each_row(&self, f: &mut dyn FnMut(&[Cell]) -> std::io::Result<()>) -> std::io::Result<()>;
    /// Give every note, in order, to `f`.
    fn each_note(&self, f: &mut dyn FnMut(&str) -> std::io::Result<()>) -> std::io::Result<()>;
    /// Write the JSON document (with [`write_json`], for the same layout as a [`Report`]'s).
    fn write_json(&self, out: &mut dyn Write) -> std::io::Result<()>;
}

/// What a verb produced: a report held whole, or one written as it is produced.
pub enum Output {
    /// A report held in memory.
    Report(Report),
    /// A report produced while it is written.
    Streamed(Box<dyn StreamedReport + Send>),
}

impl From<Report> for Output {
    fn from(r: Report) -> Self {
        Output::Report(r)
    }
}

/// Write an output in the chosen format.
pub fn write_output(o: &Output, format: Format, out: &mut dyn Write, err: &mut dyn Write) -> std::io::Result<()> {
    match o {
        Output::Report(r) => write_report(r, format, out, err),
        Output::Streamed(s) => {
            let notes = |f: &mut dyn FnMut(&str) -> std::io::Result<()>| s.each_note(f);
            match format {
                Format::Json => s.write_json(out),
                Format::Csv => {
                    write_csv(&s.head().columns, &|f| s.each_row(f), out)?;
                    write_csv_notes(&notes, out, err)
                }
                Format::Table => {
                    write_text_table(s.head(), &|f| s.each_row(f), out)?;
                    write_table_notes(&notes, out)
                }
            }
        }
    }
}

/// Rows given one at a time to a callback.
type EachRow<'a> = &'a dyn Fn(&mut dyn FnMut(&[Cell]) -> std::io::Result<()>) -> std::io::Result<()>;
/// Notes given one at a time to a callback.
type EachNote<'a> = &'a dyn Fn(&mut dyn FnMut(&str) -> std::io::Result<()>) -> std::io::Result<()>;

/// Write a report in the chosen format.
pub fn write_report(r: &Report, format: Format, out: &mut dyn Write, err: &mut dyn Write) -> std::io::Result<()> {
    let notes = |f: &mut dyn FnMut(&str) -> std::io::Result<()>| r.notes.iter().try_for_each(|n| f(n));
    match format {
        Format::Json => write_json(&r.json, out)?,
        Format::Csv => {
            if let Some(s) = r.sections.get(r.csv_section) {
                write_csv(&s.columns, &|f| section_rows(s, f), out)?;
            }
            write_csv_notes(&notes, out, err)?;
        }
        Format::Table => {
            for (i, s) in r.sections.iter().enumerate() {
                if i > 0 {
                    writeln!(out)?;
                }
                write_text_table(s, &|f| section_rows(s, f), out)?;
            }
            write_table_notes(&notes, out)?;
        }
    }
    Ok(())
}

/// Pretty JSON (two-space indent) and a final newline: the one JSON layout of every verb.
pub fn write_json<T: serde::Serialize + ?Sized>(v: &T, out: &mut dyn Write) -> std::io::Result<()> {
    // serde_json writes many small pieces: buffer them here, where the writes are not dynamic calls.
    let mut w = std::io::BufWriter::with_capacity(1 << 16, out);
    serde_json::to_writer_pretty(&mut w, v)?;
    writeln!(w)?;
    w.flush()
}

fn section_rows(s: &Section, f: &mut dyn FnMut(&[Cell]) -> std::io::Result<()>) -> std::io::Result<()> {
    s.rows.iter().try_for_each(|r| f(r))
}

fn write_csv(columns: &[String], rows: EachRow, out: &mut dyn Write) -> std::io::Result<()> {
    let mut w = csv::Writer::from_writer(&mut *out);
    w.write_record(columns)?;
    let mut cells = Cells::default();
    rows(&mut |row| Ok(w.write_record(cells.fill(row, Cell::push_csv))?))?;
    w.flush()
}

/// Notes of a CSV output go to stderr (stdout is flushed first, so a terminal shows them after the table).
fn write_csv_notes(notes: EachNote, out: &mut dyn Write, err: &mut dyn Write) -> std::io::Result<()> {
    out.flush()?;
    notes(&mut |n| writeln!(err, "note: {n}"))
}

/// Notes of a text output follow the tables after a blank line.
fn write_table_notes(notes: EachNote, out: &mut dyn Write) -> std::io::Result<()> {
    let mut first = true;
    notes(&mut |n| {
        if std::mem::take(&mut first) {
            writeln!(out)?;
        }
        writeln!(out, "{n}")
    })
}

/// An aligned text table: numeric columns right-aligned, others left-aligned. The rows are produced
/// twice (to measure, then to write), so nothing per row is held.
fn write_text_table(s: &Section, rows: EachRow, out: &mut dyn Write) -> std::io::Result<()> {
    if !s.title.is_empty() {
        writeln!(out, "{}", s.title)?;
    }
    let mut width: Vec<usize> = s.columns.iter().map(|c| c.chars().count()).collect();
    let mut numeric = vec![true; s.columns.len()];
    let mut buf = String::new();
    rows(&mut |r| {
        for (i, c) in r.iter().enumerate() {
            if i < width.len() {
                buf.clear();
                c.push_text(&mut buf);
                width[i] = width[i].max(buf.chars().count());
            }
        }
        for (i, num) in numeric.iter_mut().enumerate() {
            *num &= matches!(r.get(i), Some(Cell::Num(..) | Cell::Azimuth(..) | Cell::Int(_) | Cell::Empty));
        }
        Ok(())
    })?;
    let mut line = String::new();
    let mut put = |vals: &mut dyn Iterator<Item = &str>, out: &mut dyn Write| -> std::io::Result<()> {
        line.clear();
        for (i, v) in vals.enumerate() {
            if i > 0 {
                line.push_str("  ");
            }
            let pad = width.get(i).copied().unwrap_or(0).saturating_sub(v.chars().count());
            if numeric.get(i).copied().unwrap_or(false) {
                line.extend(std::iter::repeat_n(' ', pad));
                line.push_str(v);
            } else {
                line.push_str(v);
                line.extend(std::iter::repeat_n(' ', pad));
            }
        }
        writeln!(out, "  {}", line.trim_end())
    };
    put(&mut s.columns.iter().map(String::as_str), out)?;
    let mut cells = Cells::default();
    rows(&mut |r| put(&mut cells.fill(r, Cell::push_text).iter().map(String::as_str), out))
}

/// Text buffers reused from row to row.
#[derive(Default)]
struct Cells(Vec<String>);

impl Cells {
    /// The cells of `row` formatted by `form`, one buffer each.
    fn fill(&mut self, row: &[Cell], form: fn(&Cell, &mut String)) -> &[String] {
        if self.0.len() < row.len() {
            self.0.resize_with(row.len(), String::new);
        }
        for (c, t) in row.iter().zip(self.0.iter_mut()) {
            t.clear();
            form(c, t);
        }
        &self.0[..row.len()]
    }
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

    /// A report produced row by row, holding the same content as `sample()`.
    struct Produced(Report);

    impl StreamedReport for Produced {
        fn head(&self) -> &Section {
            &self.0.sections[0]
        }
        fn each_row(&self, f: &mut dyn FnMut(&[Cell]) -> std::io::Result<()>) -> std::io::Result<()> {
            self.0.sections[0].rows.iter().try_for_each(|r| f(r))
        }
        fn each_note(&self, f: &mut dyn FnMut(&str) -> std::io::Result<()>) -> std::io::Result<()> {
            self.0.notes.iter().try_for_each(|n| f(n))
        }
        fn write_json(&self, out: &mut dyn Write) -> std::io::Result<()> {
            write_json(&self.0.json, out)
        }
    }

    #[test]
    fn streamed_reports_are_written_as_held_ones() {
        let mut r = sample();
        r.sections[0].rows.push(vec![Cell::Text("c".into()), Cell::Num(f64::INFINITY, 1)]);
        r.sections[0].rows.push(vec![Cell::Text("dd".into()), Cell::Num(-0.0, 3)]);
        r.sections[0].rows.push(vec![Cell::Text("e".into()), Cell::Int(7)]);
        for notes in [vec![], vec!["one".to_string(), "two".to_string()]] {
            r.notes = notes;
            let streamed = Output::Streamed(Box::new(Produced(r.clone())));
            for format in [Format::Table, Format::Csv, Format::Json] {
                let (mut o1, mut e1, mut o2, mut e2) = (Vec::new(), Vec::new(), Vec::new(), Vec::new());
                write_report(&r, format, &mut o1, &mut e1).unwrap();
                write_output(&streamed, format, &mut o2, &mut e2).unwrap();
                assert_eq!((o1, e1), (o2, e2), "{format:?}");
            }
        }
        // Width from every row (including the later `inf`), a negative zero written without its sign (0.000 in
        // text, 0 in CSV), no blank line
        // without notes.
        let (mut o, mut e) = (Vec::new(), Vec::new());
        write_output(&Output::Streamed(Box::new(Produced(r.clone()))), Format::Table, &mut o, &mut e).unwrap();
        assert_eq!(
            String::from_utf8(o).unwrap(),
            "t\n  name      x\n  a      1.23\n  bb        -\n  c       inf\n  dd    0.000\n  e         7\n\none\ntwo\n"
        );
        let (mut o, mut e) = (Vec::new(), Vec::new());
        write_output(&Output::Streamed(Box::new(Produced(r))), Format::Csv, &mut o, &mut e).unwrap();
        assert_eq!(String::from_utf8(o).unwrap(), "name,x\na,1.23456\nbb,\nc,inf\ndd,0\ne,7\n");
        assert_eq!(String::from_utf8(e).unwrap(), "note: one\nnote: two\n");
    }
}
