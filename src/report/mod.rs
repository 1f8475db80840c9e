//! Renderers: turn a result's [`Document`] into terminal text, Markdown or
//! CSV, and a result's `Serialize` into JSON. Renderers compute nothing;
//! each command builds its result, then its document, once.

pub mod calc;
pub mod chart;
pub mod csv_out;
pub mod markdown;
pub mod member;
pub mod sheet;
pub mod text;

use serde::Serialize;

/// The caution every human-readable result carries.
pub const CAUTION: &str = "CAUTION: beamsift is an aid for a competent person, not a substitute for one. \
Verify every result against the governing local code and licensed practice before it is used.";

/// Column alignment.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Align {
    Left,
    Right,
}

/// A table: headers carry their units (e.g. "Mass [kg/m]").
#[derive(Clone, Debug, Default)]
pub struct Table {
    pub title: String,
    pub headers: Vec<String>,
    pub align: Vec<Align>,
    pub rows: Vec<Vec<String>>,
}

impl Table {
    pub fn new(title: impl Into<String>, headers: &[(&str, Align)]) -> Self {
        Table {
            title: title.into(),
            headers: headers.iter().map(|h| h.0.to_string()).collect(),
            align: headers.iter().map(|h| h.1).collect(),
            rows: Vec::new(),
        }
    }
    pub fn row(&mut self, cells: Vec<String>) {
        self.rows.push(cells);
    }
}

/// One piece of a document.
#[derive(Clone, Debug)]
pub enum Block {
    Heading(String),
    Para(String),
    Table(Table),
    /// A bullet list with a lead-in line.
    List(String, Vec<String>),
}

/// What a command shows a person.
#[derive(Clone, Debug, Default)]
pub struct Document {
    pub title: String,
    pub blocks: Vec<Block>,
}

impl Document {
    pub fn new(title: impl Into<String>) -> Self {
        Document {
            title: title.into(),
            blocks: Vec::new(),
        }
    }
    pub fn heading(&mut self, s: impl Into<String>) {
        self.blocks.push(Block::Heading(s.into()));
    }
    pub fn para(&mut self, s: impl Into<String>) {
        self.blocks.push(Block::Para(s.into()));
    }
    pub fn table(&mut self, t: Table) {
        self.blocks.push(Block::Table(t));
    }
    pub fn list(&mut self, lead: impl Into<String>, items: Vec<String>) {
        self.blocks.push(Block::List(lead.into(), items));
    }
    /// Append the caution and the list of what was not checked.
    pub fn caution(&mut self, not_checked: Vec<String>) {
        if !not_checked.is_empty() {
            self.list("Not checked by beamsift in this run:", not_checked);
        }
        self.para(CAUTION);
    }
}

/// Output formats.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, clap::ValueEnum)]
pub enum Format {
    /// Aligned tables for the terminal.
    #[default]
    Table,
    /// JSON from the result model (for scripts).
    Json,
    /// CSV of the main table(s).
    Csv,
    /// Markdown.
    Markdown,
}

/// Render a result in the chosen format.
pub fn render<T: Serialize>(format: Format, result: &T, doc: &Document) -> String {
    match format {
        Format::Table => text::render(doc),
        Format::Markdown => markdown::render(doc),
        Format::Csv => csv_out::render(doc),
        Format::Json => {
            let mut s = serde_json::to_string_pretty(result)
                .unwrap_or_else(|e| format!("{{\"error\": \"cannot serialise result: {e}\"}}"));
            s.push('\n');
            s
        }
    }
}
