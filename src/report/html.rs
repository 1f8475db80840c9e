//! HTML: one self-contained, well-formed page (inline style, inline SVG,
//! no external assets) for any document; the calculation sheet is one.
//! Every piece of text goes through [`esc`], the one escaping path; the
//! SVG of a figure is inserted as drawn (plotters escapes its own text).

use super::{Align, Block, Document, Table, Tone};

/// Escape text for HTML/XML.
pub fn esc(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('"', "&quot;")
}

fn num_class(t: &Table, i: usize) -> &'static str {
    if t.align.get(i) == Some(&Align::Right) {
        " class=\"num\""
    } else {
        ""
    }
}

pub fn table(t: &Table) -> String {
    let mut s = String::from("<table>\n");
    if !t.title.is_empty() {
        s.push_str(&format!("<caption>{}</caption>\n", esc(&t.title)));
    }
    s.push_str("<thead><tr>");
    for (i, h) in t.headers.iter().enumerate() {
        s.push_str(&format!("<th{}>{}</th>", num_class(t, i), esc(h)));
    }
    s.push_str("</tr></thead>\n<tbody>\n");
    for row in &t.rows {
        s.push_str("<tr>");
        for (i, c) in row.iter().enumerate() {
            s.push_str(&format!("<td{}>{}</td>", num_class(t, i), esc(c)));
        }
        s.push_str("</tr>\n");
    }
    s.push_str("</tbody>\n</table>\n");
    s
}

/// Strip the XML prologue plotters may emit, so SVG can sit inline.
fn inline_svg(svg: &str) -> &str {
    match svg.find("<svg") {
        Some(i) => &svg[i..],
        None => svg,
    }
}

const STYLE: &str = "body{font-family:sans-serif;max-width:60em;margin:2em auto;padding:0 1em;color:#111;line-height:1.4}\
h1{font-size:1.5em;border-bottom:2px solid #333}h2{font-size:1.2em;margin-top:2em;border-bottom:1px solid #999}\
h3{font-size:1em;margin:1.2em 0 .3em}table{border-collapse:collapse;margin:.8em 0;font-size:.9em}\
caption{text-align:left;font-weight:bold;padding:.3em 0}th,td{border:1px solid #bbb;padding:.2em .5em;vertical-align:top}\
th{background:#eee}td.num,th.num{text-align:right}.calc{font-family:monospace;white-space:pre-wrap;background:#f7f7f7;\
border-left:3px solid #666;padding:.4em .8em;margin:.3em 0}.fail{color:#b00;font-weight:bold}.unverified{color:#840;font-weight:bold}.pass{color:#060}\
.caution{border:2px solid #b60;background:#fff6e8;padding:.6em 1em}figure{margin:1em 0}svg{max-width:100%;height:auto}\
.titleblock{border:2px solid #333;padding:.3em .8em;margin:1em 0}.titleblock table{width:100%;margin:.4em 0}.titleblock td{height:1.8em}\
@page{size:auto;margin:15mm 12mm}\
@media print{body{max-width:none;margin:0;padding:0;font-size:10pt}th{background:none}.calc{background:none}.caution{background:none}\
h2{break-before:page;page-break-before:always;break-after:avoid;page-break-after:avoid}\
h2.run-on{break-before:auto;page-break-before:auto;margin-top:1.2em}\
h3,caption{break-after:avoid;page-break-after:avoid}\
table,figure,.check,.titleblock{break-inside:avoid;page-break-inside:avoid}\
*{-webkit-print-color-adjust:economy;print-color-adjust:economy}}";

pub fn render(doc: &Document) -> String {
    let mut o = String::new();
    o.push_str("<!DOCTYPE html>\n<html xmlns=\"http://www.w3.org/1999/xhtml\" lang=\"en\">\n<head>\n<meta charset=\"utf-8\"/>\n");
    o.push_str(&format!(
        "<title>{}</title>\n<style>{STYLE}</style>\n</head>\n<body>\n",
        esc(&doc.title)
    ));
    if !doc.title.is_empty() {
        o.push_str(&format!("<h1>{}</h1>\n", esc(&doc.title)));
    }
    for b in &doc.blocks {
        match b {
            Block::Heading(h) => o.push_str(&format!("<h2>{}</h2>\n", esc(h))),
            Block::HeadingRunOn(h) => {
                o.push_str(&format!("<h2 class=\"run-on\">{}</h2>\n", esc(h)))
            }
            Block::Para(p) => o.push_str(&format!("<p>{}</p>\n", esc(p))),
            Block::Labelled(label, p, tone) => {
                let text = match tone {
                    Tone::Plain => esc(p),
                    Tone::Pass => format!("<span class=\"pass\">{}</span>", esc(p)),
                    Tone::Fail => format!("<span class=\"fail\">{}</span>", esc(p)),
                    Tone::Unverified => format!("<span class=\"unverified\">{}</span>", esc(p)),
                };
                o.push_str(&format!("<p><strong>{}</strong> {text}</p>\n", esc(label)));
            }
            Block::Caution(p) => o.push_str(&format!("<p class=\"caution\">{}</p>\n", esc(p))),
            Block::Table(t) => o.push_str(&table(t)),
            Block::TitleBlock(ts) => {
                o.push_str("<div class=\"titleblock\">\n");
                for t in ts {
                    o.push_str(&table(t));
                }
                o.push_str("</div>\n");
            }
            Block::List(lead, items) => {
                if !lead.is_empty() {
                    o.push_str(&format!("<p>{}</p>\n", esc(lead)));
                }
                o.push_str("<ul>\n");
                for i in items {
                    o.push_str(&format!("<li>{}</li>\n", esc(i)));
                }
                o.push_str("</ul>\n");
            }
            Block::Figure(f) => o.push_str(&format!(
                "<figure>\n{}\n<figcaption>{}</figcaption>\n</figure>\n",
                inline_svg(&f.svg),
                esc(&f.caption)
            )),
            Block::Check(heading, c) => {
                o.push_str(&format!(
                    "<div class=\"check\">\n<h3>{}</h3>\n<div class=\"calc\">",
                    esc(heading)
                ));
                o.push_str(&format!("governing: {}\n", esc(&c.governs)));
                o.push_str(&esc(&c.formula));
                for line in &c.substitution {
                    o.push_str(&format!("\n  {}", esc(line)));
                }
                o.push_str(&format!(
                    "\n  {}\nallowable: {}\nutilisation: {} — ",
                    esc(&c.result),
                    esc(&c.allowable),
                    esc(&c.utilisation)
                ));
                o.push_str(if c.passes {
                    "<span class=\"pass\">passes</span>"
                } else {
                    "<span class=\"fail\">FAILS</span>"
                });
                o.push_str("</div>\n</div>\n");
            }
            Block::Footer(p) => o.push_str(&format!("<p><em>{}</em></p>\n", esc(p))),
        }
    }
    o.push_str("</body>\n</html>\n");
    o
}
