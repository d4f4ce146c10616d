//! The writers of a presentation: aligned text for people, CSV (one sheet), pretty JSON. Every
//! front end that writes tables uses these, so a number is formatted by one rule.

use super::{Cell, Presentation, Sheet, Streamed};
use serde_json::Value;
use std::io::Write;

/// Rows given one at a time to a callback.
type EachRow<'a> = &'a dyn Fn(&mut dyn FnMut(&[Cell]) -> std::io::Result<()>) -> std::io::Result<()>;
/// Notes given one at a time to a callback.
type EachNote<'a> = &'a dyn Fn(&mut dyn FnMut(&str) -> std::io::Result<()>) -> std::io::Result<()>;

/// Pretty JSON (two-space indent) and a final newline: the one JSON layout of every verb.
pub fn write_json<T: serde::Serialize + ?Sized>(v: &T, out: &mut dyn Write) -> std::io::Result<()> {
    // serde_json writes many small pieces: buffer them here, where the writes are not dynamic calls.
    let mut w = std::io::BufWriter::with_capacity(1 << 16, out);
    serde_json::to_writer_pretty(&mut w, v)?;
    writeln!(w)?;
    w.flush()
}

/// Write a presentation as aligned text: every sheet, then the notes and the cautions.
pub fn write_text(p: &Presentation, out: &mut dyn Write) -> std::io::Result<()> {
    for (i, s) in p.sheets.iter().enumerate() {
        if i > 0 {
            writeln!(out)?;
        }
        write_text_table(s, &|f| sheet_rows(s, f), out)?;
    }
    write_table_notes(&|f| p.each_note(f), out)
}

/// Write a presentation's main sheet as CSV to `out`, and its notes and cautions to `err`.
pub fn write_csv(p: &Presentation, out: &mut dyn Write, err: &mut dyn Write) -> std::io::Result<()> {
    if let Some(s) = p.sheets.get(p.main_sheet) {
        write_csv_table(&s.columns, &|f| sheet_rows(s, f), out)?;
    }
    write_csv_notes(&|f| p.each_note(f), out, err)
}

/// Write one sheet as CSV (numbers at full precision), for the files a run writes.
pub fn write_sheet_csv(s: &Sheet, out: &mut dyn Write) -> std::io::Result<()> {
    write_csv_table(&s.columns, &|f| sheet_rows(s, f), out)
}

/// Write a streamed presentation as aligned text.
pub fn write_streamed_text(s: &dyn Streamed, out: &mut dyn Write) -> std::io::Result<()> {
    write_text_table(s.head(), &|f| s.each_row(f), out)?;
    write_table_notes(&|f| s.each_note(f), out)
}

/// Write a streamed presentation as CSV to `out`, notes to `err`.
pub fn write_streamed_csv(s: &dyn Streamed, out: &mut dyn Write, err: &mut dyn Write) -> std::io::Result<()> {
    write_csv_table(&s.head().columns, &|f| s.each_row(f), out)?;
    write_csv_notes(&|f| s.each_note(f), out, err)
}

fn sheet_rows(s: &Sheet, f: &mut dyn FnMut(&[Cell]) -> std::io::Result<()>) -> std::io::Result<()> {
    s.rows.iter().try_for_each(|r| f(r))
}

fn write_csv_table(columns: &[String], rows: EachRow, out: &mut dyn Write) -> std::io::Result<()> {
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
fn write_text_table(s: &Sheet, rows: EachRow, out: &mut dyn Write) -> std::io::Result<()> {
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

/// `serde` writers for numbers in JSON views, with the same rule as [`jnum`]: a finite number as
/// it is, an infinite one as the string `"inf"` or `"-inf"`, NaN and `None` as null. Use with
/// `#[serde(serialize_with = "present::json_num::one")]` (or `::opt`).
pub mod json_num {
    use serde::Serializer;

    /// A number (see the module).
    pub fn one<S: Serializer>(v: &f64, s: S) -> Result<S::Ok, S::Error> {
        match *v {
            x if x.is_finite() => s.serialize_f64(x),
            x if x == f64::INFINITY => s.serialize_str("inf"),
            x if x == f64::NEG_INFINITY => s.serialize_str("-inf"),
            _ => s.serialize_none(),
        }
    }

    /// An optional number (see the module).
    pub fn opt<S: Serializer>(v: &Option<f64>, s: S) -> Result<S::Ok, S::Error> {
        match v {
            Some(x) => one(x, s),
            None => s.serialize_none(),
        }
    }
}
