//! Output tables of a run: titled tables written as `tables/STEM.csv` and shown in the report.
//! Their cells are the presenters' [`Cell`]s, so a CSV file holds full precision and the report
//! shows the display decimals, as the verbs do.

use crate::present::Cell;

/// A titled table written as `tables/STEM.csv` and shown in the report.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct CsvTable {
    /// File stem (`site-means` → `tables/site-means.csv`).
    pub stem: String,
    /// Title shown in the report.
    pub title: String,
    /// Column names.
    pub columns: Vec<String>,
    /// Rows of cells.
    pub rows: Vec<Vec<Cell>>,
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

    /// A presenter's sheet written under the file stem `stem`.
    pub fn from_sheet(stem: &str, sheet: crate::present::Sheet) -> Self {
        Self { stem: stem.into(), title: sheet.title, columns: sheet.columns, rows: sheet.rows }
    }

    /// Append a row of cells.
    pub fn push_cells(&mut self, row: Vec<Cell>) {
        debug_assert_eq!(row.len(), self.columns.len(), "{}", self.stem);
        self.rows.push(row);
    }

    /// Append a row of already formatted text (written as it is, in the CSV file and the report).
    pub fn push(&mut self, row: Vec<String>) {
        self.push_cells(row.into_iter().map(Cell::Text).collect());
    }

    /// CSV text: header row, then rows (numbers at full precision, empty for no value); cells
    /// holding a comma, quote or newline are quoted.
    pub fn to_csv(&self) -> String {
        let mut s = String::new();
        let mut buf = String::new();
        let line = |cells: &mut dyn Iterator<Item = &str>, s: &mut String| {
            for (i, c) in cells.enumerate() {
                if i > 0 {
                    s.push(',');
                }
                quote_into(s, c);
            }
            s.push('\n');
        };
        line(&mut self.columns.iter().map(String::as_str), &mut s);
        for r in &self.rows {
            let cells: Vec<String> = r
                .iter()
                .map(|c| {
                    buf.clear();
                    c.push_csv(&mut buf);
                    buf.clone()
                })
                .collect();
            line(&mut cells.iter().map(String::as_str), &mut s);
        }
        s
    }

    /// Index of the column called `name`.
    pub fn column(&self, name: &str) -> Option<usize> {
        self.columns.iter().position(|c| c == name)
    }

    /// `row`'s cell in the column called `name` as shown in the report (numbers at the sheet's
    /// decimals); `None` if either is missing or the cell is empty.
    pub fn cell(&self, row: &[Cell], name: &str) -> Option<String> {
        let c = self.column(name).and_then(|i| row.get(i))?;
        if matches!(c, Cell::Empty) {
            return None;
        }
        let mut s = String::new();
        c.push_text(&mut s);
        Some(s)
    }

    /// The cell of `row` in the column called `name` as a number (`None` if missing or empty).
    pub fn number(&self, row: &[Cell], name: &str) -> Option<f64> {
        match self.column(name).and_then(|i| row.get(i))? {
            Cell::Num(x, _) | Cell::Azimuth(x, _) => Some(*x),
            Cell::Int(i) => Some(*i as f64),
            Cell::Text(s) => s.parse().ok(),
            Cell::Empty => None,
        }
    }
}

fn quote_into(s: &mut String, c: &str) {
    if c.contains([',', '"', '\n']) {
        s.push('"');
        s.push_str(&c.replace('"', "\"\""));
        s.push('"');
    } else {
        s.push_str(c);
    }
}
