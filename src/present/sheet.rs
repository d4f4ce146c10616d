//! A titled table of cells: what a presenter gives for each table of a result.

use super::Cell;

/// A titled table.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Sheet {
    /// Title shown above the table in text output.
    pub title: String,
    /// Column names.
    pub columns: Vec<String>,
    /// Rows of cells.
    pub rows: Vec<Vec<Cell>>,
}

impl Sheet {
    /// A sheet with the given title and columns.
    pub fn new(title: &str, columns: &[&str]) -> Self {
        Self { title: title.into(), columns: columns.iter().map(|s| s.to_string()).collect(), rows: vec![] }
    }

    /// Append a row.
    pub fn push(&mut self, row: Vec<Cell>) {
        debug_assert_eq!(row.len(), self.columns.len(), "{}", self.title);
        self.rows.push(row);
    }
}
