//! Markdown: pipe tables, headings, bullet lists, figures as data-URI
//! images, checks as indented working. The one Markdown writer, for every
//! command's document and the calculation sheet.
//!
//! Escaping, in one place: text outside code is written with `&`, `<` and
//! `>` as entities (a Markdown viewer renders raw HTML, and names and
//! titles come from user files), and `|` as `\|` inside table cells. The
//! working of a check is an indented code block, where entities are not
//! read: it is written as it is.

use super::{Align, Block, Document, Table};

/// Text outside code blocks.
pub fn text(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
}

/// A table cell (or header).
fn cell(s: &str) -> String {
    text(s).replace('|', "\\|").replace(['\r', '\n'], " ")
}

pub fn table(t: &Table) -> String {
    let mut out = String::new();
    if !t.title.is_empty() {
        out.push_str(&format!("**{}**\n\n", text(&t.title)));
    }
    out.push_str("| ");
    out.push_str(
        &t.headers
            .iter()
            .map(|h| cell(h))
            .collect::<Vec<_>>()
            .join(" | "),
    );
    out.push_str(" |\n|");
    for i in 0..t.headers.len() {
        out.push_str(match t.align.get(i) {
            Some(Align::Right) => "---:|",
            _ => "---|",
        });
    }
    out.push('\n');
    for r in &t.rows {
        out.push_str("| ");
        out.push_str(&r.iter().map(|c| cell(c)).collect::<Vec<_>>().join(" | "));
        out.push_str(" |\n");
    }
    out
}

pub fn render(doc: &Document) -> String {
    let mut out = String::new();
    if !doc.title.is_empty() {
        out.push_str(&format!("# {}\n\n", text(&doc.title)));
    }
    for b in &doc.blocks {
        match b {
            Block::Heading(h) => out.push_str(&format!("## {}\n\n", text(h))),
            Block::Para(p) => out.push_str(&format!("{}\n\n", text(p))),
            Block::Labelled(label, p, _) => {
                out.push_str(&format!("**{}** {}\n\n", text(label), text(p)))
            }
            Block::Caution(p) => out.push_str(&format!("> {}\n\n", text(p))),
            Block::Table(t) => {
                out.push_str(&table(t));
                out.push('\n');
            }
            Block::List(lead, items) => {
                if !lead.is_empty() {
                    out.push_str(&format!("{}\n\n", text(lead)));
                }
                for i in items {
                    out.push_str(&format!("- {}\n", text(i)));
                }
                out.push('\n');
            }
            Block::Figure(f) => out.push_str(&format!(
                "![{}](data:image/svg+xml;base64,{})\n\n",
                text(&f.caption).replace(['[', ']'], ""),
                super::sheet::base64(f.svg.as_bytes())
            )),
            Block::Check(heading, c) => {
                out.push_str(&format!("### {}\n\n", text(heading)));
                out.push_str(&format!("    {}\n", c.formula));
                for line in &c.substitution {
                    out.push_str(&format!("      {line}\n"));
                }
                out.push_str(&format!("      {}\n", c.result));
                out.push_str(&format!("    allowable: {}\n", c.allowable));
                out.push_str(&format!(
                    "    utilisation: {} — {}\n\n",
                    c.utilisation,
                    if c.passes { "passes" } else { "FAILS" }
                ));
            }
            Block::Footer(p) => out.push_str(&format!("---\n\n*{}*\n\n", text(p))),
        }
    }
    while out.ends_with("\n\n") {
        out.pop();
    }
    out
}
