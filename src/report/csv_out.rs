//! CSV: every table of the document, one after another, each preceded by
//! its title as a comment line (`# title`) and separated by a blank line;
//! then the document's lists (what was excluded, assumed, not checked) and
//! the caution as comment lines, so they travel with the numbers
//! (beamsift's own CSV reader skips lines starting with '#').
//!
//! Cells are written by `csv::Writer` (quoted wherever a comma, quote,
//! carriage return or newline needs it). In a numeric (right-aligned)
//! column a number shown with thousands separators (`12,345.6`) loses
//! them so a spreadsheet reads a number; text columns (names, marks) are
//! written as they are, commas included (a cell that would start a
//! spreadsheet formula is prefixed with an apostrophe).

use super::{Block, Document};

/// `12,345` or `-1,234,567.89`: grouping commas every three digits.
fn grouped_number(s: &str) -> Option<String> {
    let body = s.strip_prefix('-').unwrap_or(s);
    let (int, frac) = match body.split_once('.') {
        Some((i, f)) => (i, Some(f)),
        None => (body, None),
    };
    let groups: Vec<&str> = int.split(',').collect();
    if groups.len() < 2
        || groups[0].is_empty()
        || groups[0].len() > 3
        || groups[1..].iter().any(|g| g.len() != 3)
        || !groups.iter().all(|g| g.bytes().all(|b| b.is_ascii_digit()))
        || frac.is_some_and(|f| f.is_empty() || !f.bytes().all(|b| b.is_ascii_digit()))
    {
        return None;
    }
    Some(s.replace(',', ""))
}

/// A cell. A text cell that a spreadsheet would run as a formula (it
/// starts with `=`, `+`, `-`, `@`, a tab or a carriage return: names come
/// from user files) is written with a leading apostrophe, as the OWASP
/// guidance on CSV injection advises.
fn cell(s: &str, numeric: bool) -> String {
    if numeric {
        grouped_number(s).unwrap_or_else(|| s.to_string())
    } else if s.starts_with(['=', '+', '-', '@', '\t', '\r']) {
        format!("'{s}")
    } else {
        s.to_string()
    }
}

/// One comment line (line breaks inside folded into spaces).
fn comment(out: &mut String, text: &str) {
    out.push_str("# ");
    out.push_str(&text.replace(['\r', '\n'], " "));
    out.push('\n');
}

pub fn render(doc: &Document) -> String {
    let mut out = String::new();
    for b in &doc.blocks {
        if let Block::Table(t) = b {
            if !out.is_empty() {
                out.push('\n');
            }
            if !t.title.is_empty() {
                comment(&mut out, &t.title);
            }
            let mut w = csv::WriterBuilder::new()
                .terminator(csv::Terminator::Any(b'\n'))
                .flexible(true)
                .from_writer(Vec::new());
            let numeric = |i: usize| t.align.get(i) == Some(&super::Align::Right);
            let _ = w.write_record(t.headers.iter());
            for r in &t.rows {
                let _ = w.write_record(r.iter().enumerate().map(|(i, c)| cell(c, numeric(i))));
            }
            if let Ok(bytes) = w.into_inner() {
                out.push_str(&String::from_utf8_lossy(&bytes));
            }
        }
    }
    let lists: Vec<(&String, &Vec<String>)> = doc
        .blocks
        .iter()
        .filter_map(|b| match b {
            Block::List(lead, items) => Some((lead, items)),
            _ => None,
        })
        .collect();
    if !lists.is_empty() {
        out.push('\n');
    }
    for (lead, items) in lists {
        comment(&mut out, lead);
        for i in items {
            comment(&mut out, &format!("  - {i}"));
        }
    }
    comment(&mut out, super::CAUTION);
    out
}
