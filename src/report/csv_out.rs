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

/// A number as a spreadsheet reads it: rounded to 12 significant digits
/// (so a sum's last-bit noise, 669.0600000000001, reads 669.06; within
/// 5e-12 relative of the value), then the shortest text that reads back as
/// that (never an exponent), with a decimal comma if asked.
fn number_text(x: f64, decimal_comma: bool) -> String {
    let r: f64 = format!("{x:.11e}").parse().unwrap_or(x);
    let s = format!("{r}");
    if decimal_comma {
        s.replace('.', ",")
    } else {
        s
    }
}

/// The numeric CSV of one data table: a leading comment line with its
/// title (and the other tables of the result, each chosen with
/// `--table`), the header row (units in brackets), one row per line
/// (numbers unrounded, in the display units, no unit in a cell; an empty
/// field where there is no value), then the document's lists and the
/// caution as comment lines, as in [`render`]. With `decimal_comma` the
/// fields are separated by `;`; with `bom` the text starts with a UTF-8
/// byte-order mark. `Err` names the tables there are when `opts.table`
/// names none of them.
pub fn render_numeric(
    set: &super::data::DataSet,
    opts: &super::data::DataOptions,
) -> std::result::Result<String, String> {
    use super::data::Value;
    let keys = set.keys();
    let t = match &opts.table {
        Some(k) => set.tables.iter().find(|t| t.key == k.as_str()),
        None => set.tables.first(),
    };
    let Some(t) = t else {
        return Err(format!(
            "--table '{}': this result's tables are {}",
            opts.table.as_deref().unwrap_or(""),
            keys.join(", ")
        ));
    };
    let mut out = String::new();
    if opts.bom {
        out.push('\u{feff}');
    }
    comment(&mut out, &format!("{} — {}", t.title, set.title));
    if keys.len() > 1 {
        comment(
            &mut out,
            &format!(
                "Table '{}' of {} (choose one with --table)",
                t.key,
                keys.join(", ")
            ),
        );
    }
    let mut w = csv::WriterBuilder::new()
        .terminator(csv::Terminator::Any(b'\n'))
        .delimiter(if opts.decimal_comma { b';' } else { b',' })
        .from_writer(Vec::new());
    let _ = w.write_record(t.headers.iter());
    for r in &t.rows {
        let _ = w.write_record(r.iter().map(|v| match v {
            Value::Num(x) => number_text(*x, opts.decimal_comma),
            Value::Text(s) => cell(s, false),
            Value::Empty => String::new(),
        }));
    }
    if let Ok(bytes) = w.into_inner() {
        out.push_str(&String::from_utf8_lossy(&bytes));
    }
    for line in set.context_lines() {
        comment(&mut out, &line);
    }
    Ok(out)
}
