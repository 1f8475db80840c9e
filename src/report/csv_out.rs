//! CSV: every table of the document, one after another, each preceded by
//! its title as a comment line (`# title`) and separated by a blank line.
//! Numbers keep the display formatting minus thousands separators, so a
//! spreadsheet reads them as numbers.

use super::{Block, Document};

fn cell(s: &str) -> String {
    // Plain numbers lose the grouping commas; anything else is quoted if needed.
    let stripped = s.replace(',', "");
    let is_number = !stripped.is_empty() && stripped.parse::<f64>().is_ok();
    let s = if is_number { stripped } else { s.to_string() };
    if s.contains([',', '"', '\n']) {
        format!("\"{}\"", s.replace('"', "\"\""))
    } else {
        s
    }
}

pub fn render(doc: &Document) -> String {
    let mut out = String::new();
    for b in &doc.blocks {
        if let Block::Table(t) = b {
            if !out.is_empty() {
                out.push('\n');
            }
            if !t.title.is_empty() {
                out.push_str(&format!("# {}\n", t.title));
            }
            out.push_str(
                &t.headers
                    .iter()
                    .map(|h| cell(h))
                    .collect::<Vec<_>>()
                    .join(","),
            );
            out.push('\n');
            for r in &t.rows {
                out.push_str(&r.iter().map(|c| cell(c)).collect::<Vec<_>>().join(","));
                out.push('\n');
            }
        }
    }
    // The caution travels with the numbers, as a comment line (beamsift's
    // own CSV reader skips lines starting with '#').
    if !out.is_empty() {
        out.push_str(&format!("# {}\n", super::CAUTION));
    }
    out
}
