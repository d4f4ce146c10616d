//! The CSV table reader shared by every table kind.
//!
//! Rules (see the contract): UTF-8 with an optional BOM, one header row, lines starting with `#` are
//! comments, header names matched case-insensitively with surrounding blanks trimmed, CRLF accepted,
//! extra columns ignored. Every error names `FILE:LINE` and, where it concerns a cell, the column.

use crate::error::{TableError, TableFault};
use std::path::Path;

/// One data row with the line it came from.
#[derive(Debug, Clone, PartialEq)]
pub struct Row {
    /// 1-based line number in the file.
    pub line: usize,
    /// Cells, trimmed of surrounding blanks.
    pub cells: Vec<String>,
}

/// A parsed table: header names (lower-cased, trimmed) and rows.
#[derive(Debug, Clone, PartialEq)]
pub struct Table {
    /// File name for messages.
    pub name: String,
    /// Line of the header row.
    pub header_line: usize,
    /// Header names, lower-cased and trimmed.
    pub headers: Vec<String>,
    /// Data rows in file order.
    pub rows: Vec<Row>,
}

impl Table {
    /// Read and parse a file. The file name in messages is the path as given.
    pub fn read(path: &Path) -> Result<Table, TableError> {
        let name = path.display().to_string();
        let bytes = std::fs::read(path)
            .map_err(|e| TableError::new(TableFault::Read, name.clone(), 0, None, format!("cannot read: {e}")))?;
        Table::parse(&name, &bytes)
    }

    /// Parse table text.
    pub fn parse(name: &str, bytes: &[u8]) -> Result<Table, TableError> {
        let err = |kind: TableFault, line: usize, msg: String| TableError::new(kind, name, line, None, msg);
        let bytes = bytes.strip_prefix(b"\xEF\xBB\xBF").unwrap_or(bytes);
        let text = std::str::from_utf8(bytes).map_err(|e| {
            let line = bytes[..e.valid_up_to()].iter().filter(|&&b| b == b'\n').count() + 1;
            err(TableFault::Encoding, line, "the file is not valid UTF-8 text".into())
        })?;
        // Comment lines are blanked (keeping their line breaks) so that line numbers stay true, and the
        // csv crate's own comment handling (which loses count of lines) is not used.
        let blanked: String = if text.lines().any(|l| l.trim_start().starts_with('#')) {
            text.split_inclusive('\n')
                .map(|l| {
                    if l.trim_start().starts_with('#') {
                        if l.ends_with("\r\n") {
                            "\r\n"
                        } else if l.ends_with('\n') {
                            "\n"
                        } else {
                            ""
                        }
                    } else {
                        l
                    }
                })
                .collect()
        } else {
            String::new()
        };
        let text = if blanked.is_empty() { text } else { blanked.as_str() };
        let newlines: Vec<usize> = text.bytes().enumerate().filter(|(_, b)| *b == b'\n').map(|(i, _)| i).collect();
        let line_of = |byte: u64| newlines.partition_point(|&i| (i as u64) < byte) + 1;
        let mut rdr = csv::ReaderBuilder::new()
            .has_headers(false)
            .flexible(true)
            .trim(csv::Trim::All)
            .from_reader(text.as_bytes());
        let mut headers: Option<(usize, Vec<String>)> = None;
        let mut rows = Vec::new();
        let mut rec = csv::StringRecord::new();
        loop {
            let more = rdr.read_record(&mut rec).map_err(|e| {
                let line = e.position().map(|p| line_of(p.byte())).unwrap_or(0);
                err(TableFault::Syntax, line, format!("unreadable CSV: {e}"))
            })?;
            if !more {
                break;
            }
            // The record's own position points at the end of the previous one (before skipped blank
            // lines); the reader's position after the record is exact, so use the line it ends on.
            let line = line_of(rdr.position().byte().saturating_sub(1));
            if rec.iter().all(|c| c.is_empty()) {
                continue; // blank line
            }
            match &headers {
                None => {
                    let h = check_header(name, line, rec.iter())?;
                    headers = Some((line, h));
                }
                Some((_, h)) => {
                    let mut cells: Vec<String> = rec.iter().map(str::to_string).collect();
                    check_cell_count(name, line, h.len(), cells.iter().map(String::as_str))?;
                    cells.truncate(h.len());
                    rows.push(Row { line, cells });
                }
            }
        }
        let Some((header_line, headers)) = headers else {
            return Err(err(
                TableFault::Empty,
                1,
                "the file is empty: expected a header row naming the columns".into(),
            ));
        };
        Ok(Table { name: name.to_string(), header_line, headers, rows })
    }

    /// Index of a column, if present.
    pub fn col(&self, name: &str) -> Option<usize> {
        Columns::col(self, name)
    }

    /// Index of a required column, or an error naming the header line and the column.
    pub fn require(&self, name: &str) -> Result<usize, TableError> {
        Columns::require(self, name)
    }

    /// An error at `line`, optionally naming a column.
    pub fn error(&self, line: usize, column: Option<&str>, message: impl Into<String>) -> TableError {
        Columns::error(self, line, column, message)
    }

    /// Error unless the table has at least one data row.
    pub fn require_rows(&self) -> Result<(), TableError> {
        if self.rows.is_empty() {
            Err(Columns::fault(
                self,
                TableFault::Empty,
                self.header_line,
                None,
                "the table has a header but no data rows",
            ))
        } else {
            Ok(())
        }
    }

    /// A cell as text (`""` when empty).
    pub fn text<'a>(&'a self, row: &'a Row, idx: usize) -> &'a str {
        row.cells[idx].as_str()
    }

    /// An optional text cell: `None` when the column is absent or the cell empty.
    pub fn opt_text(&self, row: &Row, idx: Option<usize>) -> Option<String> {
        idx.map(|i| row.cells[i].as_str()).filter(|s| !s.is_empty()).map(str::to_string)
    }

    /// A required finite number.
    pub fn number(&self, row: &Row, idx: usize) -> Result<f64, TableError> {
        Columns::number(self, row, idx)
    }

    /// A required number within `[lo, hi]`.
    pub fn number_in(&self, row: &Row, idx: usize, lo: f64, hi: f64) -> Result<f64, TableError> {
        Columns::number_in(self, row, idx, lo, hi)
    }

    /// An optional number: `None` when the column is absent or the cell empty.
    pub fn opt_number(&self, row: &Row, idx: Option<usize>) -> Result<Option<f64>, TableError> {
        Columns::opt_number(self, row, idx)
    }

    /// An optional number within `[lo, hi]`.
    pub fn opt_number_in(&self, row: &Row, idx: Option<usize>, lo: f64, hi: f64) -> Result<Option<f64>, TableError> {
        Columns::opt_number_in(self, row, idx, lo, hi)
    }

    /// An optional yes/no cell (`true/false`, `yes/no`, `y/n`, `1/0`, any case); empty means `false`.
    pub fn flag(&self, row: &Row, idx: Option<usize>) -> Result<bool, TableError> {
        Columns::flag(self, row, idx)
    }
}

/// Validate a header row: names lower-cased and trimmed, none empty, none twice.
pub(crate) fn check_header<'a>(
    file: &str,
    line: usize,
    cells: impl Iterator<Item = &'a str>,
) -> Result<Vec<String>, TableError> {
    let h: Vec<String> = cells.map(|c| c.trim().to_lowercase()).collect();
    for (i, a) in h.iter().enumerate() {
        if a.is_empty() {
            return Err(TableError::new(
                TableFault::Header,
                file,
                line,
                None,
                format!("header cell {} is empty", i + 1),
            ));
        }
        if h[..i].contains(a) {
            return Err(TableError::new(
                TableFault::Header,
                file,
                line,
                Some(a),
                "the column appears twice in the header",
            ));
        }
    }
    Ok(h)
}

/// A data row must have as many cells as the header (trailing empty cells are tolerated).
pub(crate) fn check_cell_count<'a>(
    file: &str,
    line: usize,
    expected: usize,
    cells: impl ExactSizeIterator<Item = &'a str>,
) -> Result<(), TableError> {
    let found = cells.len();
    let mut extra = false;
    for (i, c) in cells.enumerate() {
        if i >= expected && !c.is_empty() {
            extra = true;
            break;
        }
    }
    if found < expected || extra {
        return Err(TableError::new(
            TableFault::CellCount,
            file,
            line,
            None,
            format!("expected {expected} cells as in the header, found {found}"),
        ));
    }
    Ok(())
}

/// Read access to one data row, whether held by a [`Table`] or lent by a [`super::TableStream`].
pub trait Cells {
    /// 1-based line number in the file.
    fn line(&self) -> usize;
    /// The cell at `idx`, trimmed of surrounding blanks (`""` when empty).
    fn cell(&self, idx: usize) -> &str;
}

impl Cells for Row {
    fn line(&self) -> usize {
        self.line
    }
    fn cell(&self, idx: usize) -> &str {
        self.cells[idx].as_str()
    }
}

/// The header side of a table (file name, header line and names) and the typed cell readers built on
/// it. Implemented by [`Table`] (all rows in memory) and [`super::TableStream`] (one row at a time),
/// so both give the same values and the same `FILE:LINE: column 'X'` messages.
pub trait Columns {
    /// File name for messages.
    fn file_name(&self) -> &str;
    /// Line of the header row.
    fn header_line(&self) -> usize;
    /// Header names, lower-cased and trimmed.
    fn header_names(&self) -> &[String];

    /// Index of a column, if present.
    fn col(&self, name: &str) -> Option<usize> {
        self.header_names().iter().position(|h| h == name)
    }

    /// Index of a required column, or an error naming the header line and the column.
    fn require(&self, name: &str) -> Result<usize, TableError> {
        self.col(name).ok_or_else(|| {
            self.fault(
                TableFault::MissingColumn,
                self.header_line(),
                Some(name),
                format!("required column is missing (header has: {})", self.header_names().join(", ")),
            )
        })
    }

    /// An error at `line`, optionally naming a column.
    fn error(&self, line: usize, column: Option<&str>, message: impl Into<String>) -> TableError {
        self.fault(TableFault::Value, line, column, message)
    }

    /// A fault of `kind` at `line`, optionally naming a column.
    fn fault(&self, kind: TableFault, line: usize, column: Option<&str>, message: impl Into<String>) -> TableError {
        TableError::new(kind, self.file_name(), line, column, message)
    }

    /// An optional text cell: `None` when the column is absent or the cell empty.
    fn opt_str<'r, R: Cells + ?Sized>(&self, row: &'r R, idx: Option<usize>) -> Option<&'r str> {
        idx.map(|i| row.cell(i)).filter(|s| !s.is_empty())
    }

    /// A required finite number.
    fn number<R: Cells + ?Sized>(&self, row: &R, idx: usize) -> Result<f64, TableError> {
        let name = &self.header_names()[idx];
        let s = row.cell(idx);
        if s.is_empty() {
            return Err(self.error(row.line(), Some(name), "is empty; expected a number"));
        }
        let v: f64 = s.parse().map_err(|_| self.error(row.line(), Some(name), format!("'{s}' is not a number")))?;
        if !v.is_finite() {
            return Err(self.error(row.line(), Some(name), format!("'{s}' is not a finite number")));
        }
        Ok(v)
    }

    /// A required number within `[lo, hi]`.
    fn number_in<R: Cells + ?Sized>(&self, row: &R, idx: usize, lo: f64, hi: f64) -> Result<f64, TableError> {
        let v = self.number(row, idx)?;
        if v < lo || v > hi {
            return Err(self.error(
                row.line(),
                Some(&self.header_names()[idx]),
                format!("{v} is outside [{lo}, {hi}]"),
            ));
        }
        Ok(v)
    }

    /// An optional number: `None` when the column is absent or the cell empty.
    fn opt_number<R: Cells + ?Sized>(&self, row: &R, idx: Option<usize>) -> Result<Option<f64>, TableError> {
        match idx {
            Some(i) if !row.cell(i).is_empty() => self.number(row, i).map(Some),
            _ => Ok(None),
        }
    }

    /// An optional number within `[lo, hi]`.
    fn opt_number_in<R: Cells + ?Sized>(
        &self,
        row: &R,
        idx: Option<usize>,
        lo: f64,
        hi: f64,
    ) -> Result<Option<f64>, TableError> {
        match idx {
            Some(i) if !row.cell(i).is_empty() => self.number_in(row, i, lo, hi).map(Some),
            _ => Ok(None),
        }
    }

    /// An optional yes/no cell (`true/false`, `yes/no`, `y/n`, `1/0`, any case); empty means `false`.
    fn flag<R: Cells + ?Sized>(&self, row: &R, idx: Option<usize>) -> Result<bool, TableError> {
        let Some(i) = idx else { return Ok(false) };
        match row.cell(i).to_lowercase().as_str() {
            "" | "false" | "no" | "n" | "0" => Ok(false),
            "true" | "yes" | "y" | "1" => Ok(true),
            s => Err(self.error(
                row.line(),
                Some(&self.header_names()[i]),
                format!("'{s}' is not yes/no (true/false, y/n, 1/0)"),
            )),
        }
    }
}

impl Columns for Table {
    fn file_name(&self) -> &str {
        &self.name
    }
    fn header_line(&self) -> usize {
        self.header_line
    }
    fn header_names(&self) -> &[String] {
        &self.headers
    }
}
