//! Output tables of a run: titled CSV tables that the report also shows.

use std::fmt::Write as _;

/// A titled table written as `tables/STEM.csv` and shown in the report.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct CsvTable {
    /// File stem (`site-means` → `tables/site-means.csv`).
    pub stem: String,
    /// Title shown in the report.
    pub title: String,
    /// Column names.
    pub columns: Vec<String>,
    /// Rows of already formatted cells (empty string for a missing value).
    pub rows: Vec<Vec<String>>,
}

impl CsvTable {
    /// An empty table.
    pub fn new(stem: &str, title: &str, columns: &[&str]) -> Self {
        Self {
            stem: stem.into(),
            title: title.into(),
            columns: columns.iter().map(|c| c.to_string()).collect(),
            rows: vec![],
        }
    }

    /// Append a row.
    pub fn push(&mut self, row: Vec<String>) {
        debug_assert_eq!(row.len(), self.columns.len(), "{}", self.stem);
        self.rows.push(row);
    }

    /// CSV text: header row, then rows; cells holding a comma or quote are quoted.
    pub fn to_csv(&self) -> String {
        let mut s = String::new();
        let line = |cells: &[String]| cells.iter().map(|c| quote(c)).collect::<Vec<_>>().join(",");
        let _ = writeln!(s, "{}", line(&self.columns));
        for r in &self.rows {
            let _ = writeln!(s, "{}", line(r));
        }
        s
    }
}

fn quote(c: &str) -> String {
    if c.contains([',', '"', '\n']) {
        format!("\"{}\"", c.replace('"', "\"\""))
    } else {
        c.to_string()
    }
}

impl CsvTable {
    /// Index of the column called `name`.
    pub fn column(&self, name: &str) -> Option<usize> {
        self.columns.iter().position(|c| c == name)
    }

    /// The cell of `row` in the column called `name` (`None` if either is missing).
    pub fn cell<'a>(&'a self, row: &'a [String], name: &str) -> Option<&'a str> {
        self.column(name).and_then(|i| row.get(i)).map(String::as_str)
    }

    /// The cell of `row` in the column called `name` as a number (`None` if missing or empty).
    pub fn number(&self, row: &[String], name: &str) -> Option<f64> {
        self.cell(row, name).and_then(|c| c.parse().ok())
    }
}
