//! Markdown: pipe tables, headings, bullet lists, figures as data-URI
//! images, checks as indented working. The one Markdown writer, for every
//! command's document and the calculation sheet.
//!
//! Escaping, in one place: text outside code is written with `&`, `<` and
//! `>` as entities (a Markdown viewer renders raw HTML, and names and
//! titles come from user files), the markup that could start a link, an
//! image, emphasis or code — `\`, `` ` ``, `*`, `_` between words' ends,
//! `[` and `(` after `]`, a leading `[` or `#` — backslash-escaped
//! (CommonMark 0.31.2 §2.4), line breaks folded into
//! spaces (a name cannot start a heading or a list), and `|` as `\|`
//! inside table cells. The working of a check is an indented code block,
//! where nothing is read as markup: it is written as it is, its line
//! breaks folded likewise.

use super::{Align, Block, Document, Table};

/// Text outside code blocks.
pub fn text(s: &str) -> String {
    let chars: Vec<char> = s.chars().collect();
    let mut out = String::with_capacity(s.len());
    for (i, &c) in chars.iter().enumerate() {
        let before = i.checked_sub(1).map(|j| chars[j]);
        let after = chars.get(i + 1).copied();
        let word = |x: Option<char>| x.is_some_and(char::is_alphanumeric);
        let escape = match c {
            '\\' | '`' | '*' => true,
            // Intraword underscores (y_c) make no emphasis (CommonMark §6.2).
            '_' => !(word(before) && word(after)),
            // A link or image needs "](" or "][" (§6.3, §6.4), a reference
            // definition a leading "[" (§4.7): "[kN]" alone stays as it is.
            '[' => i == 0 || matches!(before, Some(']' | '!')),
            '(' => before == Some(']'),
            _ => false,
        };
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '\r' | '\n' => out.push(' '),
            c => {
                if escape {
                    out.push('\\');
                }
                out.push(c);
            }
        }
    }
    if out.starts_with('#') {
        out.insert(0, '\\');
    }
    out
}

/// A line of code (the working of a check): one line, as it is.
fn code(s: &str) -> String {
    s.replace(['\r', '\n'], " ")
}

/// A table cell (or header).
fn cell(s: &str) -> String {
    text(s).replace('|', "\\|")
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
            Block::Heading(h) | Block::HeadingRunOn(h) => {
                out.push_str(&format!("## {}\n\n", text(h)))
            }
            Block::Para(p) => out.push_str(&format!("{}\n\n", text(p))),
            Block::Labelled(label, p, _) => {
                out.push_str(&format!("**{}** {}\n\n", text(label), text(p)))
            }
            Block::Caution(p) => out.push_str(&format!("> {}\n\n", text(p))),
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
                text(&f.caption),
                super::sheet::base64(f.svg.as_bytes())
            )),
            Block::Check(heading, c) => {
                out.push_str(&format!("### {}\n\n", text(heading)));
                // Names from the job: text (escaped), not code.
                out.push_str(&format!("Governing: {}.\n\n", text(&c.governs)));
                out.push_str(&format!("    {}\n", code(&c.formula)));
                for line in &c.substitution {
                    out.push_str(&format!("      {}\n", code(line)));
                }
                out.push_str(&format!("      {}\n", code(&c.result)));
                out.push_str(&format!("    allowable: {}\n", code(&c.allowable)));
                out.push_str(&format!(
                    "    utilisation: {} — {}\n\n",
                    code(&c.utilisation),
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
