//! Markdown: pipe tables, headings, bullet lists.

use super::{Align, Block, Document, Table};

fn esc(s: &str) -> String {
    s.replace('|', "\\|")
}

pub fn table(t: &Table) -> String {
    let mut out = String::new();
    if !t.title.is_empty() {
        out.push_str(&format!("**{}**\n\n", esc(&t.title)));
    }
    out.push_str("| ");
    out.push_str(
        &t.headers
            .iter()
            .map(|h| esc(h))
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
        out.push_str(&r.iter().map(|c| esc(c)).collect::<Vec<_>>().join(" | "));
        out.push_str(" |\n");
    }
    out
}

pub fn render(doc: &Document) -> String {
    let mut out = String::new();
    if !doc.title.is_empty() {
        out.push_str(&format!("# {}\n\n", doc.title));
    }
    for b in &doc.blocks {
        match b {
            Block::Heading(h) => out.push_str(&format!("## {h}\n\n")),
            Block::Para(p) => out.push_str(&format!("{p}\n\n")),
            Block::Table(t) => {
                out.push_str(&table(t));
                out.push('\n');
            }
            Block::List(lead, items) => {
                out.push_str(&format!("{lead}\n\n"));
                for i in items {
                    out.push_str(&format!("- {i}\n"));
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
