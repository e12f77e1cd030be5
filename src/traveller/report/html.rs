//! One standalone HTML page (inline CSS, no outside assets) that prints on A4 and Letter.

use super::doc::{Block, Doc};

/// Escape text for HTML element content and attribute values.
pub fn escape(s: &str) -> String {
    let mut o = String::with_capacity(s.len());
    for c in s.chars() {
        match c {
            '&' => o.push_str("&amp;"),
            '<' => o.push_str("&lt;"),
            '>' => o.push_str("&gt;"),
            '"' => o.push_str("&quot;"),
            '\'' => o.push_str("&#39;"),
            _ => o.push(c),
        }
    }
    o
}

/// Printing: no page size is forced, so the same file fits A4 (210 mm) and Letter (8.5 in);
/// margins of 15 mm leave 180 mm of width on A4 and 186 mm on Letter, and everything is laid
/// out in that width.
const CSS: &str = "\
@page { margin: 15mm; }
* { box-sizing: border-box; }
body { font-family: system-ui, -apple-system, 'Segoe UI', sans-serif; font-size: 10.5pt;
  color: #000; background: #fff; margin: 2em auto; max-width: 60em; padding: 0 1em; line-height: 1.35; }
h1 { font-size: 16pt; border-bottom: 2px solid #000; padding-bottom: 0.2em; }
h2 { font-size: 12.5pt; margin-top: 1.4em; border-bottom: 1px solid #888; }
table { border-collapse: collapse; width: 100%; margin: 0.4em 0 0.8em; }
th, td { border: 1px solid #999; padding: 0.2em 0.45em; text-align: left; vertical-align: top; }
th { background: #eee; }
table.fields th { width: 11em; background: #f6f6f6; font-weight: 600; }
td { overflow-wrap: anywhere; }
.pass { font-weight: 700; }
.fail, .doubt { font-weight: 700; text-decoration: underline; }
section { break-inside: avoid; page-break-inside: avoid; }
@media print {
  body { margin: 0; max-width: none; padding: 0; font-size: 9.5pt; }
  h2 { break-after: avoid; page-break-after: avoid; }
  tr { break-inside: avoid; page-break-inside: avoid; }
  thead { display: table-header-group; }
}
";

fn cell(s: &str) -> String {
    let e = escape(s);
    match s {
        "PASS" => format!("<span class=\"pass\">{e}</span>"),
        "FAIL" => format!("<span class=\"fail\">{e}</span>"),
        "DOUBT" => format!("<span class=\"doubt\">{e}</span>"),
        _ => e,
    }
}

/// The whole page.
pub fn page(d: &Doc, title: &str) -> String {
    let mut o = String::new();
    o.push_str("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n");
    o.push_str("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n");
    o.push_str(&format!(
        "<title>{}</title>\n<style>\n{CSS}</style>\n</head>\n<body>\n",
        escape(title)
    ));
    let mut open = false;
    for b in &d.blocks {
        match b {
            Block::Title(t) => o.push_str(&format!("<h1>{}</h1>\n", escape(t))),
            Block::Heading(h) => {
                if open {
                    o.push_str("</section>\n");
                }
                o.push_str(&format!("<section>\n<h2>{}</h2>\n", escape(h)));
                open = true;
            }
            Block::Fields(f) => {
                o.push_str("<table class=\"fields\">\n");
                for (k, v) in f {
                    let v = match v.split_once(' ') {
                        Some((w, rest)) if matches!(w, "PASS" | "FAIL" | "DOUBT") => {
                            format!("{} {}", cell(w), escape(rest))
                        }
                        _ => cell(v),
                    };
                    o.push_str(&format!(
                        "<tr><th scope=\"row\">{}</th><td>{v}</td></tr>\n",
                        escape(k)
                    ));
                }
                o.push_str("</table>\n");
            }
            Block::Table { head, rows } => {
                o.push_str("<table>\n<thead><tr>");
                for h in head {
                    o.push_str(&format!("<th scope=\"col\">{}</th>", escape(h)));
                }
                o.push_str("</tr></thead>\n<tbody>\n");
                for r in rows {
                    o.push_str("<tr>");
                    for c in r {
                        o.push_str(&format!("<td>{}</td>", cell(c)));
                    }
                    o.push_str("</tr>\n");
                }
                o.push_str("</tbody>\n</table>\n");
            }
            Block::List(items) => {
                o.push_str("<ul>\n");
                for i in items {
                    o.push_str(&format!("<li>{}</li>\n", escape(i)));
                }
                o.push_str("</ul>\n");
            }
            Block::Para(p) => o.push_str(&format!("<p>{}</p>\n", escape(p))),
        }
    }
    if open {
        o.push_str("</section>\n");
    }
    o.push_str("</body>\n</html>\n");
    o
}
