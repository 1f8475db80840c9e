//! Terminal text: aligned columns, a rule under the header, wrapped prose.

use super::{Align, Block, Document, Table};

/// Display width in terminal columns (every char counts as one; the
/// characters beamsift prints are all single-width).
fn width(s: &str) -> usize {
    s.chars().count()
}

fn pad(s: &str, w: usize, align: Align) -> String {
    let n = w.saturating_sub(width(s));
    match align {
        Align::Left => format!("{s}{}", " ".repeat(n)),
        Align::Right => format!("{}{s}", " ".repeat(n)),
    }
}

pub fn table(t: &Table) -> String {
    let ncol = t.headers.len();
    let mut w: Vec<usize> = t.headers.iter().map(|h| width(h)).collect();
    for r in &t.rows {
        for (i, c) in r.iter().enumerate().take(ncol) {
            w[i] = w[i].max(width(c));
        }
    }
    let mut out = String::new();
    if !t.title.is_empty() {
        out.push_str(&t.title);
        out.push('\n');
    }
    let line = |cells: &[String]| -> String {
        let mut s = String::new();
        for (i, wi) in w.iter().enumerate() {
            let c = cells.get(i).map(String::as_str).unwrap_or("");
            if i > 0 {
                s.push_str("  ");
            }
            s.push_str(&pad(c, *wi, t.align.get(i).copied().unwrap_or(Align::Left)));
        }
        s.trim_end().to_string()
    };
    out.push_str(&line(&t.headers));
    out.push('\n');
    let total: usize = w.iter().sum::<usize>() + 2 * ncol.saturating_sub(1);
    out.push_str(&"─".repeat(total));
    out.push('\n');
    for r in &t.rows {
        out.push_str(&line(r));
        out.push('\n');
    }
    out
}

/// Wrap prose at 78 columns.
pub fn wrap(s: &str, indent: &str) -> String {
    let mut out = String::new();
    let mut line = String::new();
    for word in s.split_whitespace() {
        if !line.is_empty() && width(&line) + 1 + width(word) > 78 - width(indent) {
            out.push_str(indent);
            out.push_str(&line);
            out.push('\n');
            line.clear();
        }
        if !line.is_empty() {
            line.push(' ');
        }
        line.push_str(word);
    }
    if !line.is_empty() {
        out.push_str(indent);
        out.push_str(&line);
        out.push('\n');
    }
    out
}

pub fn render(doc: &Document) -> String {
    let mut out = String::new();
    if !doc.title.is_empty() {
        out.push_str(&doc.title);
        out.push('\n');
        out.push_str(&"═".repeat(width(&doc.title)));
        out.push_str("\n\n");
    }
    for b in &doc.blocks {
        match b {
            Block::Heading(h) | Block::HeadingRunOn(h) => {
                out.push_str(h);
                out.push('\n');
            }
            Block::Para(p) => {
                out.push_str(&wrap(p, ""));
                out.push('\n');
            }
            Block::Table(t) => {
                out.push_str(&table(t));
                out.push('\n');
            }
            Block::TitleBlock(ts) => {
                for t in ts {
                    out.push_str(&table(t));
                    out.push('\n');
                }
            }
            Block::Labelled(label, p, _) => {
                out.push_str(&wrap(&format!("{label} {p}"), ""));
                out.push('\n');
            }
            Block::Caution(p) | Block::Footer(p) => {
                out.push_str(&wrap(p, ""));
                out.push('\n');
            }
            Block::Figure(f) => {
                out.push_str(&wrap(&format!("[Figure: {}]", f.caption), ""));
                out.push('\n');
            }
            Block::Check(heading, c) => {
                out.push_str(heading);
                out.push('\n');
                out.push_str(&format!("  governing: {}\n", c.governs));
                out.push_str(&format!("  {}\n", c.formula));
                for line in &c.substitution {
                    out.push_str(&format!("    {line}\n"));
                }
                out.push_str(&format!(
                    "    {}\n  allowable: {}\n  utilisation: {} — {}\n\n",
                    c.result,
                    c.allowable,
                    c.utilisation,
                    if c.passes { "passes" } else { "FAILS" }
                ));
            }
            Block::List(lead, items) => {
                if !lead.is_empty() {
                    out.push_str(&wrap(lead, ""));
                }
                for i in items {
                    let w = wrap(i, "    ");
                    out.push_str("  - ");
                    out.push_str(w.trim_start());
                }
                out.push('\n');
            }
        }
    }
    while out.ends_with("\n\n") {
        out.pop();
    }
    out
}
