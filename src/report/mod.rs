//! Renderers: turn a result's [`Document`] into terminal text, Markdown or
//! CSV, and a result's `Serialize` into JSON. Renderers compute nothing;
//! each command builds its result, then its document, once.

pub mod analysis;
pub mod batch;
pub mod calc;
pub mod catalog;
pub mod chart;
pub mod csv_out;
pub mod data;
pub mod html;
pub mod markdown;
pub mod member;
pub mod optimise;
pub mod section;
pub mod select;
pub mod sheet;
pub mod sweep;
pub mod text;
pub mod xlsx;

use serde::Serialize;

/// The caution every human-readable result carries.
pub use crate::CAUTION;

/// Column alignment.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Align {
    Left,
    Right,
}

/// A table: headers carry their units (e.g. "Mass [kg/m]").
#[derive(Clone, Debug, Default, Serialize)]
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

/// How a labelled line reads: plain, or a verdict.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Tone {
    Plain,
    Pass,
    Fail,
    Unverified,
}

/// One piece of a document. Every renderer handles every block; text
/// from user files (names, titles) is escaped by each writer for its
/// format, in one place per format.
#[derive(Clone, Debug)]
pub enum Block {
    Heading(String),
    /// A top-level heading of a short section that, printed, follows the
    /// one before on the same page (a `Heading` starts a new page).
    HeadingRunOn(String),
    Para(String),
    /// A paragraph led by a bold label ("Section:", "Result:").
    Labelled(String, String, Tone),
    /// The caution, set apart.
    Caution(String),
    Table(Table),
    /// A bullet list with a lead-in line (none when empty).
    List(String, Vec<String>),
    /// A diagram (SVG) with its caption.
    Figure(calc::Figure),
    /// A check written out: its heading and its working.
    Check(String, calc::WrittenCheck),
    /// The title block of a sheet (project, job, member, date, revision;
    /// who prepared and who checked it, with fields to sign): its tables.
    TitleBlock(Vec<Table>),
    /// A closing line after a rule ("Prepared with …").
    Footer(String),
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
    /// The limit states the user excluded (listed on every output).
    pub fn excluded(&mut self, items: Vec<String>) {
        if !items.is_empty() {
            self.list(EXCLUDED_LEAD, items);
        }
    }
    /// The assumptions a checker needs.
    pub fn assumptions(&mut self, items: Vec<String>) {
        if !items.is_empty() {
            self.list(ASSUMPTIONS_LEAD, items);
        }
    }
    /// Append the caution and the list of what was not checked.
    pub fn caution(&mut self, not_checked: Vec<String>) {
        if !not_checked.is_empty() {
            self.list(NOT_CHECKED_LEAD, not_checked);
        }
        self.para(CAUTION);
    }
    /// The items of the list with this lead, if any.
    fn list_of(&self, lead: &str) -> Option<&[String]> {
        self.blocks.iter().find_map(|b| match b {
            Block::List(l, items) if l == lead => Some(items.as_slice()),
            _ => None,
        })
    }
}

/// The lead of the list of exclusions.
pub const EXCLUDED_LEAD: &str = "Excluded by the user (not checked, by choice):";
/// The lead of the list of assumptions.
pub const ASSUMPTIONS_LEAD: &str = "Assumptions:";
/// The lead of the list of what was not checked.
pub const NOT_CHECKED_LEAD: &str = "Not checked by beamsift in this run:";

/// The safety context every JSON result carries, whatever the command:
/// the caution, what was not checked, what the user excluded and the
/// assumptions (taken from the document where the result lacks them).
fn with_context(mut v: serde_json::Value, doc: &Document) -> serde_json::Value {
    if let serde_json::Value::Object(map) = &mut v {
        for (key, lead) in [
            ("excluded", EXCLUDED_LEAD),
            ("assumptions", ASSUMPTIONS_LEAD),
            ("not_checked", NOT_CHECKED_LEAD),
        ] {
            let missing = map.get(key).is_none_or(|x| x.is_null());
            if missing {
                let items = doc.list_of(lead).unwrap_or(&[]);
                map.insert(key.into(), serde_json::json!(items));
            }
        }
        map.entry("caution")
            .or_insert_with(|| serde_json::json!(CAUTION));
        // The one statement of units (a result's own short note in words
        // gives way to it).
        if map.get("units").is_none_or(|u| !u.is_object()) {
            map.insert("units".into(), json_units());
        }
    }
    v
}

/// The units of every number in JSON output: internal units, the same
/// whatever `--units` says (display units apply to documents only).
/// Field names with a unit suffix (`x_mm`, `force_n`, `moment_nmm`) say
/// it again.
pub fn json_units() -> serde_json::Value {
    serde_json::json!({
        "note": "JSON numbers are in these units whatever --units says",
        "length": "mm",
        "position": "mm from the left end of the beam",
        "deflection": "mm (downward positive)",
        "force": "N",
        "moment": "N·mm (sagging positive)",
        "stress": "MPa (N/mm²)",
        "line_load": "N/mm",
        "area": "mm²",
        "second_moment": "mm⁴",
        "section_modulus": "mm³",
        "torsion_constant": "mm⁴",
        "warping_constant": "mm⁶",
        "mass_per_length": "kg/m",
        "mass": "kg",
        "density": "kg/m³",
        "unit_cost": "currency per mm of length",
        "total_cost": "currency",
        "utilisation": "demand / capacity (1 = at capacity)"
    })
}

/// Output formats.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
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
    /// A workbook (.xlsx): one sheet per table, numbers as numbers (the
    /// commands with data tables: batch, select, shortlist, sweep).
    Xlsx,
    /// CSV of one table, numbers only in number cells, units in the header
    /// (the commands with data tables).
    CsvNumeric,
}

impl Format {
    /// Every choice with its name (the serde name where it has one) and
    /// a line of help, for front ends that list the choices.
    pub const CHOICES: &[(Self, &str, &str)] = &[
        (Self::Table, "table", "Aligned tables for the terminal"),
        (
            Self::Json,
            "json",
            "JSON from the result model (for scripts)",
        ),
        (Self::Csv, "csv", "CSV of the main table(s)"),
        (Self::Markdown, "markdown", "Markdown"),
        (
            Self::Xlsx,
            "xlsx",
            "Workbook: a sheet per table, numbers as numbers, header row frozen (needs -o FILE)",
        ),
        (
            Self::CsvNumeric,
            "csv-numeric",
            "CSV of one table (--table): a quantity per cell, units in the header",
        ),
    ];

    /// Written from a command's data tables ([`data::DataSet`]).
    pub fn needs_data(self) -> bool {
        matches!(self, Self::Xlsx | Self::CsvNumeric)
    }
}

/// Render a result in the chosen format. The spreadsheet formats need data
/// tables ([`render_data`]); commands without them refuse those formats
/// before any work, so reaching them here is an internal error.
pub fn render<T: Serialize>(format: Format, result: &T, doc: &Document) -> crate::Result<String> {
    Ok(match format {
        Format::Table => text::render(doc),
        Format::Markdown => markdown::render(doc),
        Format::Csv => csv_out::render(doc),
        Format::Xlsx | Format::CsvNumeric => {
            return Err(crate::Error::Internal(format!(
                "--format {}: this output has no data tables for a spreadsheet",
                if format == Format::Xlsx {
                    "xlsx"
                } else {
                    "csv-numeric"
                }
            )));
        }
        Format::Json => {
            let mut s = serde_json::to_value(result)
                .map(|v| with_context(v, doc))
                .and_then(|v| serde_json::to_string_pretty(&v))
                .unwrap_or_else(|e| format!("{{\"error\": \"cannot serialise result: {e}\"}}"));
            s.push('\n');
            s
        }
    })
}

/// Render a result that has data tables in the chosen format: the
/// spreadsheet formats from `data`, the others as [`render`].
pub fn render_data<T: Serialize>(
    format: Format,
    result: &T,
    doc: &Document,
    data: &data::DataSet,
    opts: &data::DataOptions,
) -> crate::Result<Vec<u8>> {
    match format {
        Format::Xlsx => xlsx::render(data)
            .map_err(|e| crate::Error::Internal(format!("cannot write the workbook: {e}"))),
        Format::CsvNumeric => csv_out::render_numeric(data, opts)
            .map(String::into_bytes)
            .map_err(crate::Error::msg),
        _ => render(format, result, doc).map(String::into_bytes),
    }
}
