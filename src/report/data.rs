//! Data tables: a result's tables as numbers and text in the display
//! units, for spreadsheet outputs (`xlsx.rs`, the numeric CSV in
//! `csv_out.rs`). Each command's report module builds its [`DataSet`]
//! from the result it already computed; the context (what was excluded,
//! assumed, not checked, and the caution) is taken from the command's
//! [`Document`] so that every output carries the same words.
//!
//! Numbers are kept unrounded (in the display units named in the header);
//! a cell holds one quantity and no unit.

use super::{Block, CAUTION, Document};

/// One cell.
#[derive(Clone, Debug, PartialEq)]
pub enum Value {
    Num(f64),
    Text(String),
    Empty,
}

impl Value {
    /// A number, or an empty cell when there is none.
    pub fn opt(v: Option<f64>) -> Value {
        v.map_or(Value::Empty, Value::Num)
    }
    /// Text (empty text is an empty cell).
    pub fn text(s: impl Into<String>) -> Value {
        let s = s.into();
        if s.is_empty() {
            Value::Empty
        } else {
            Value::Text(s)
        }
    }
}

/// A table: one header row (units in brackets), then rows.
#[derive(Clone, Debug)]
pub struct DataTable {
    /// Short name, chosen with `--table` and used for the sheet name.
    pub key: &'static str,
    /// What the table holds, in words.
    pub title: String,
    pub headers: Vec<String>,
    pub rows: Vec<Vec<Value>>,
}

impl DataTable {
    pub fn new(key: &'static str, title: impl Into<String>, headers: Vec<String>) -> Self {
        DataTable {
            key,
            title: title.into(),
            headers,
            rows: Vec::new(),
        }
    }
    pub fn row(&mut self, cells: Vec<Value>) {
        debug_assert_eq!(cells.len(), self.headers.len());
        self.rows.push(cells);
    }
}

/// A result's tables and the context every copy of them carries.
#[derive(Clone, Debug)]
pub struct DataSet {
    pub title: String,
    pub tables: Vec<DataTable>,
    /// The document's lists, each with its lead: exclusions, assumptions,
    /// notes, what was not checked.
    pub lists: Vec<(String, Vec<String>)>,
    pub caution: &'static str,
}

impl DataSet {
    /// The tables, with the lists of the result's document.
    pub fn new(doc: &Document, tables: Vec<DataTable>) -> Self {
        let lists = doc
            .blocks
            .iter()
            .filter_map(|b| match b {
                Block::List(lead, items) => Some((lead.clone(), items.clone())),
                _ => None,
            })
            .collect();
        DataSet {
            title: doc.title.clone(),
            tables,
            lists,
            caution: CAUTION,
        }
    }

    /// The keys of the tables, in order.
    pub fn keys(&self) -> Vec<&'static str> {
        self.tables.iter().map(|t| t.key).collect()
    }

    /// The context as lines of text: each list's lead and its items, then
    /// the caution.
    pub fn context_lines(&self) -> Vec<String> {
        let mut out = Vec::new();
        for (lead, items) in &self.lists {
            out.push(lead.clone());
            for i in items {
                out.push(format!("  - {i}"));
            }
        }
        out.push(self.caution.to_string());
        out
    }
}

/// How the spreadsheet outputs are written.
#[derive(Clone, Debug, Default)]
pub struct DataOptions {
    /// Numeric CSV: start with a UTF-8 byte-order mark.
    pub bom: bool,
    /// Numeric CSV: decimal commas (`12,5`), fields separated by `;`.
    pub decimal_comma: bool,
    /// Numeric CSV: the table to write (its key); the first when none.
    pub table: Option<String>,
}
