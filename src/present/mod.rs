//! Presentation: what people read of a result. A presenter turns a result into named sheets
//! (tables of cells), notes and cautions, and a JSON document made by `serde` from the result or a
//! view of it. Every front end (the verbs' text, CSV and JSON, the section's table files and HTML
//! report) writes the same presentation, so a table or a caution is written once.
//!
//! # Layout
//! - [`Cell`], [`Sheet`], [`Presentation`]: the presented form.
//! - [`write_text`], [`write_csv`], [`write_json`], [`write_sheet_csv`]: the writers, one number
//!   format each (text at the sheet's decimals, CSV at full precision).
//! - [`cautions`]: the cautions, each written once.
//! - One module per result type (e.g. [`mean_comparison`] for the reversal and common-mean tests,
//!   [`correlation`] for the ranking, ties and age model): the presenter the verb, the section's
//!   tables and report, and the Python package share.
//! - [`Streamed`]: a presentation whose rows are produced while they are written (constant memory).

mod cell;
mod keyed;
mod sheet;
mod write;

pub mod cautions;

// Presenters, one per result type, in the order of the job.
pub mod column;
pub mod components;
pub mod correlation;
pub mod dipole;
pub mod expected;
pub mod field;
pub mod field_tests;
pub mod fisher_means;
pub mod fold_test;
pub mod hazard;
pub mod intervals;
pub mod mean_comparison;
pub mod poles;
pub mod psv;
pub mod randomness_test;
pub mod rate;
pub mod section_run;
pub mod simulate;
pub mod site_means;
pub mod test_labels;
pub mod unflatten;

pub use cell::Cell;
pub use sheet::Sheet;
pub use write::{
    jnum, json_num, write_csv, write_json, write_sheet_csv, write_streamed_csv, write_streamed_text, write_text,
};

use serde_json::Value;

/// What a result looks like to people: its sheets, its notes and cautions, and its JSON.
#[derive(Debug, Clone, PartialEq, Default)]
pub struct Presentation {
    /// The full result for JSON output.
    pub json: Value,
    /// Tables, in reading order.
    pub sheets: Vec<Sheet>,
    /// Which sheet CSV output writes.
    pub main_sheet: usize,
    /// Plain sentences about the result (interpretation): printed after the tables, or on stderr
    /// for CSV.
    pub notes: Vec<String>,
    /// What the result is not (a statistical statement about a model, not a forecast…): printed
    /// after the notes.
    pub cautions: Vec<String>,
}

impl Presentation {
    /// Give every note, then every caution, in order, to `f`.
    pub fn each_note(&self, f: &mut dyn FnMut(&str) -> std::io::Result<()>) -> std::io::Result<()> {
        self.notes.iter().chain(&self.cautions).try_for_each(|n| f(n))
    }
}

/// A presentation whose rows, JSON and notes are produced while they are written, for results
/// whose row count can be very large: nothing per row is held. The writers are those of
/// [`Presentation`].
pub trait Streamed {
    /// Title and columns of the table (printed for text, and for CSV without the title); its
    /// `rows` are ignored.
    fn head(&self) -> &Sheet;
    /// Give every row of the table, in order, to `f`. Called twice for a text table (to measure the
    /// columns, then to write), so it must give the same rows each time.
    fn each_row(&self, f: &mut dyn FnMut(&[Cell]) -> std::io::Result<()>) -> std::io::Result<()>;
    /// Give every note, in order, to `f`.
    fn each_note(&self, f: &mut dyn FnMut(&str) -> std::io::Result<()>) -> std::io::Result<()>;
    /// Write the JSON document (with [`write_json`], for the same layout as a [`Presentation`]'s).
    fn write_json(&self, out: &mut dyn std::io::Write) -> std::io::Result<()>;
}

#[cfg(test)]
mod direction_tests;
#[cfg(test)]
mod tests;
