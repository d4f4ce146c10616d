//! The `--format table|csv|json` choice, shared by every verb. Verbs return a presentation (from
//! the library's presenters); the library's writers format it.

use lodestone::present::{self, Presentation, Streamed};
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

/// What a verb produced: a presentation held whole, or one written as it is produced.
pub enum Output {
    /// A presentation held in memory.
    Held(Presentation),
    /// A presentation produced while it is written.
    Streamed(Box<dyn Streamed + Send>),
}

impl From<Presentation> for Output {
    fn from(p: Presentation) -> Self {
        Output::Held(p)
    }
}

/// Write an output in the chosen format.
pub fn write_output(o: &Output, format: Format, out: &mut dyn Write, err: &mut dyn Write) -> std::io::Result<()> {
    match (o, format) {
        (Output::Held(p), Format::Json) => present::write_json(&p.json, out),
        (Output::Held(p), Format::Csv) => present::write_csv(p, out, err),
        (Output::Held(p), Format::Table) => present::write_text(p, out),
        (Output::Streamed(s), Format::Json) => s.write_json(out),
        (Output::Streamed(s), Format::Csv) => present::write_streamed_csv(s.as_ref(), out, err),
        (Output::Streamed(s), Format::Table) => present::write_streamed_text(s.as_ref(), out),
    }
}
