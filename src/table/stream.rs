//! A streaming table reader: the rules of [`super::Table`], one row at a time, in constant memory.
//!
//! The bytes pass through [`LineFilter`], which checks each physical line for UTF-8, strips a leading
//! BOM, blanks comment lines (keeping every byte offset, so line numbers stay true) and remembers where
//! the line breaks are until the CSV parser has moved past them. Rows come as `csv::ByteRecord`s (no
//! per-cell `String`), and the typed readers of [`Columns`] work on them as on a [`super::Row`].
//!
//! Errors carry the same `FILE:LINE: column 'X': message` text as the whole-table reader. Where a file
//! has several faults, [`TableStream`] reports the same one as [`super::Table::parse`] would: a UTF-8
//! fault anywhere outranks a fault of layout (header, cell count), which outranks a fault of a value.
//! Callers keep that order by handing a value fault to [`TableStream::finish_with`], which reads the
//! rest of the file for faults of higher rank.

use super::reader::{check_cell_count, check_header, Cells, Columns};
use crate::error::{TableError, TableFault};
use std::collections::VecDeque;
use std::io::{BufRead, Read};

/// Filters raw bytes: BOM, UTF-8 check per line, comment lines blanked to spaces, line-break offsets.
struct LineFilter<R> {
    inner: R,
    /// Current physical line (after filtering), served from `pos`.
    buf: Vec<u8>,
    pos: usize,
    /// Offset (in the filtered stream) of the start of `buf`.
    offset: u64,
    /// Offsets of line breaks not yet passed by the parser.
    breaks: VecDeque<u64>,
    /// Line breaks already passed (popped from `breaks`).
    passed: usize,
    /// Lines read so far.
    lines: usize,
    /// First line that is not valid UTF-8.
    bad_utf8: Option<usize>,
    /// An I/O error, kept for the message.
    io_error: Option<String>,
    first: bool,
}

impl<R: BufRead> LineFilter<R> {
    fn new(inner: R) -> Self {
        LineFilter {
            inner,
            buf: Vec::with_capacity(256),
            pos: 0,
            offset: 0,
            breaks: VecDeque::new(),
            passed: 0,
            lines: 0,
            bad_utf8: None,
            io_error: None,
            first: true,
        }
    }

    /// Load the next physical line into `buf`; false at the end of input (or after an I/O error).
    fn fill(&mut self) -> bool {
        self.offset += self.buf.len() as u64;
        self.buf.clear();
        self.pos = 0;
        match self.inner.read_until(b'\n', &mut self.buf) {
            Ok(0) => return false,
            Ok(_) => {}
            Err(e) => {
                self.io_error = Some(e.to_string());
                return false;
            }
        }
        if self.first {
            self.first = false;
            if self.buf.starts_with(b"\xEF\xBB\xBF") {
                self.buf.drain(..3);
            }
        }
        self.lines += 1;
        match std::str::from_utf8(&self.buf) {
            Ok(text) => {
                if text.trim_start().starts_with('#') {
                    let keep = if text.ends_with("\r\n") {
                        2
                    } else if text.ends_with('\n') {
                        1
                    } else {
                        0
                    };
                    let n = self.buf.len() - keep;
                    self.buf[..n].fill(b' ');
                }
            }
            Err(_) => {
                if self.bad_utf8.is_none() {
                    self.bad_utf8 = Some(self.lines);
                }
            }
        }
        if self.buf.last() == Some(&b'\n') {
            self.breaks.push_back(self.offset + self.buf.len() as u64 - 1);
        }
        true
    }

    /// 1-based line of the byte at `byte`; queries must not go backwards.
    fn line_of(&mut self, byte: u64) -> usize {
        while self.breaks.front().is_some_and(|&b| b < byte) {
            self.breaks.pop_front();
            self.passed += 1;
        }
        self.passed + 1
    }
}

impl<R: BufRead> Read for LineFilter<R> {
    fn read(&mut self, out: &mut [u8]) -> std::io::Result<usize> {
        if self.pos >= self.buf.len() && !self.fill() {
            return Ok(0);
        }
        let n = out.len().min(self.buf.len() - self.pos);
        out[..n].copy_from_slice(&self.buf[self.pos..self.pos + n]);
        self.pos += n;
        Ok(n)
    }
}

/// One data row lent by a [`TableStream`].
#[derive(Debug, Default)]
pub struct StreamRow {
    line: usize,
    record: csv::ByteRecord,
    /// The record's fields, concatenated, as text (checked once per row).
    text: String,
    /// Byte range in `text` of each field, trimmed of surrounding blanks.
    cells: Vec<(usize, usize)>,
}

impl StreamRow {
    /// Take the text of the record just read: one UTF-8 check per row, trimmed cell bounds.
    fn index(&mut self) -> bool {
        self.text.clear();
        self.cells.clear();
        // Lines were checked for UTF-8 before parsing; fields split at ASCII bytes stay valid.
        let Ok(t) = std::str::from_utf8(self.record.as_slice()) else { return false };
        self.text.push_str(t);
        for i in 0..self.record.len() {
            let r = self.record.range(i).unwrap_or(0..0);
            let field = &self.text[r.clone()];
            let lead = field.len() - field.trim_start().len();
            let trimmed = field.trim();
            self.cells.push((r.start + lead, r.start + lead + trimmed.len()));
        }
        true
    }

    fn len(&self) -> usize {
        self.cells.len()
    }
}

impl Cells for StreamRow {
    fn line(&self) -> usize {
        self.line
    }
    fn cell(&self, idx: usize) -> &str {
        self.cells.get(idx).map(|&(a, b)| &self.text[a..b]).unwrap_or_default()
    }
}

/// Reads a table one row at a time, holding only the current row.
///
/// ```no_run
/// use lodestone::table::{Cells, Columns, TableStream};
/// let mut s = TableStream::open(std::path::Path::new("records.csv")).unwrap();
/// let dec = s.require("dec").unwrap();
/// while s.next_row().unwrap() {
///     let v = s.number(s.row(), dec).unwrap();
///     let _ = v;
/// }
/// ```
pub struct TableStream<R: BufRead> {
    name: String,
    reader: csv::Reader<LineFilter<R>>,
    header_line: usize,
    headers: Vec<String>,
    row: StreamRow,
    rows: usize,
    done: bool,
}

impl TableStream<std::io::BufReader<std::fs::File>> {
    /// Open a file; the file name in messages is the path as given. The header is read at once.
    pub fn open(path: &std::path::Path) -> Result<Self, TableError> {
        let name = path.display().to_string();
        let f = std::fs::File::open(path)
            .map_err(|e| TableError::new(TableFault::Read, name.clone(), 0, None, format!("cannot read: {e}")))?;
        TableStream::new(&name, std::io::BufReader::with_capacity(1 << 16, f))
    }
}

impl<R: BufRead> TableStream<R> {
    /// Start reading `input`, named `name` in messages, and read the header row.
    pub fn new(name: &str, input: R) -> Result<Self, TableError> {
        let reader = csv::ReaderBuilder::new()
            .has_headers(false)
            .flexible(true)
            .buffer_capacity(1 << 16)
            .from_reader(LineFilter::new(input));
        let mut s = TableStream {
            name: name.to_string(),
            reader,
            header_line: 0,
            headers: Vec::new(),
            row: StreamRow::default(),
            rows: 0,
            done: false,
        };
        match s.read_record() {
            Err(e) => Err(s.finish_with(e)),
            Ok(false) => {
                Err(s.finish_with(s.error(1, None, "the file is empty: expected a header row naming the columns")))
            }
            Ok(true) => {
                let line = s.row.line;
                let cells: Vec<&str> = (0..s.row.len()).map(|i| s.row.cell(i)).collect();
                match check_header(&s.name, line, cells.into_iter()) {
                    Ok(h) => {
                        s.header_line = line;
                        s.headers = h;
                        Ok(s)
                    }
                    Err(e) => Err(s.finish_with(e)),
                }
            }
        }
    }

    /// Read the next non-blank record into `self.row` (no layout checks).
    fn read_record(&mut self) -> Result<bool, TableError> {
        loop {
            let more = self.reader.read_byte_record(&mut self.row.record);
            if let Some(line) = self.reader.get_ref().bad_utf8 {
                return Err(self.fault(TableFault::Encoding, line, None, "the file is not valid UTF-8 text"));
            }
            if let Some(e) = &self.reader.get_ref().io_error {
                return Err(self.fault(TableFault::Read, 0, None, format!("cannot read: {e}")));
            }
            let more = match more {
                Ok(m) => m,
                Err(e) => {
                    let pos = e.position().map(|p| p.byte()).unwrap_or(0);
                    let line = self.reader.get_mut().line_of(pos);
                    return Err(self.fault(TableFault::Syntax, line, None, format!("unreadable CSV: {e}")));
                }
            };
            if !more {
                self.done = true;
                return Ok(false);
            }
            let end = self.reader.position().byte().saturating_sub(1);
            self.row.line = self.reader.get_mut().line_of(end);
            if !self.row.index() {
                return Err(self.fault(TableFault::Encoding, self.row.line, None, "the file is not valid UTF-8 text"));
            }
            if self.row.cells.iter().all(|&(a, b)| a == b) {
                continue;
            }
            return Ok(true);
        }
    }

    /// Advance to the next data row; false at the end of the table. Checks the row's cell count.
    pub fn next_row(&mut self) -> Result<bool, TableError> {
        if self.done || !self.read_record()? {
            return Ok(false);
        }
        self.rows += 1;
        let n = self.headers.len();
        let cells = (0..self.row.len()).map(|i| self.row.cell(i));
        check_cell_count(&self.name, self.row.line, n, cells).map(|_| true)
    }

    /// The current row (after [`TableStream::next_row`] returned true).
    pub fn row(&self) -> &StreamRow {
        &self.row
    }

    /// Data rows read so far.
    pub fn rows_read(&self) -> usize {
        self.rows
    }

    /// Error unless at least one data row has been read (call at the end).
    pub fn require_rows(&self) -> Result<(), TableError> {
        if self.rows == 0 {
            Err(self.fault(TableFault::Empty, self.header_line, None, "the table has a header but no data rows"))
        } else {
            Ok(())
        }
    }

    /// Given a fault found at the current row, read the rest of the input and return the fault that the
    /// whole-table reader would report: a UTF-8 fault anywhere, else the first layout fault, else the
    /// fault given. Value faults (`fault` itself) never come from layout checks, so a later layout
    /// fault outranks it; a layout `fault` is kept unless a UTF-8 fault follows.
    pub fn finish_with(&mut self, fault: TableError) -> TableError {
        let mut first_layout: Option<TableError> = if is_layout_fault(&fault) { Some(fault.clone()) } else { None };
        loop {
            match self.next_row() {
                Ok(true) => {}
                Ok(false) => break,
                Err(e) if matches!(e.kind, TableFault::Encoding | TableFault::Read) => return e,
                Err(e) if e.kind == TableFault::Syntax => {
                    // The parser cannot go on; only a UTF-8 fault further on could still outrank it.
                    first_layout.get_or_insert(e);
                    return self.utf8_in_rest().unwrap_or_else(|| first_layout.expect("set"));
                }
                Err(e) => {
                    first_layout.get_or_insert(e);
                }
            }
        }
        first_layout.unwrap_or(fault)
    }

    fn utf8_in_rest(&mut self) -> Option<TableError> {
        let mut sink = [0u8; 4096];
        let f = self.reader.get_mut();
        while f.bad_utf8.is_none() && f.read(&mut sink).map(|n| n > 0).unwrap_or(false) {}
        f.bad_utf8.map(|l| self.fault(TableFault::Encoding, l, None, "the file is not valid UTF-8 text"))
    }
}

/// True for a fault of the file's text or layout (UTF-8, CSV, header, cell count), which the
/// whole-table reader finds before any fault of a value.
pub fn is_layout_fault(e: &TableError) -> bool {
    e.kind.is_layout()
}

impl<R: BufRead> Columns for TableStream<R> {
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
