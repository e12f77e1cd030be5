//! A report as a list of blocks, rendered to text, Markdown or HTML.

use unicode_width::UnicodeWidthStr;

/// One piece of a report.
#[derive(Debug, Clone, PartialEq)]
pub enum Block {
    Title(String),
    Heading(String),
    /// Label and value pairs.
    Fields(Vec<(String, String)>),
    Table {
        head: Vec<String>,
        rows: Vec<Vec<String>>,
    },
    List(Vec<String>),
    Para(String),
}

/// A report, format-neutral.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Doc {
    pub blocks: Vec<Block>,
}

fn w(s: &str) -> usize {
    UnicodeWidthStr::width(s)
}

fn pad(s: &str, width: usize) -> String {
    format!("{s}{}", " ".repeat(width.saturating_sub(w(s))))
}

/// Escape text for Markdown (inline and table cells).
pub fn md_escape(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        if matches!(
            c,
            '\\' | '|' | '*' | '_' | '`' | '<' | '>' | '[' | ']' | '#'
        ) {
            out.push('\\');
        }
        if c == '\n' {
            out.push(' ');
        } else {
            out.push(c);
        }
    }
    out
}

impl Doc {
    pub fn push(&mut self, b: Block) {
        self.blocks.push(b);
    }

    /// Plain text, aligned for a fixed-width font.
    pub fn text(&self) -> String {
        let mut o = String::new();
        for b in &self.blocks {
            match b {
                Block::Title(t) => {
                    o.push_str(&format!("{t}\n{}\n\n", "=".repeat(w(t))));
                }
                Block::Heading(h) => {
                    o.push_str(&format!("{h}\n{}\n", "-".repeat(w(h))));
                }
                Block::Fields(f) => {
                    let kw = f.iter().map(|(k, _)| w(k)).max().unwrap_or(0);
                    for (k, v) in f {
                        o.push_str(&format!("  {}  {v}\n", pad(&format!("{k}:"), kw + 1)));
                    }
                    o.push('\n');
                }
                Block::Table { head, rows } => {
                    let n = head.len();
                    let mut widths: Vec<usize> = head.iter().map(|h| w(h)).collect();
                    for r in rows {
                        for (i, c) in r.iter().enumerate().take(n) {
                            widths[i] = widths[i].max(w(c));
                        }
                    }
                    let line = |cells: &[String]| {
                        let s: Vec<String> = cells
                            .iter()
                            .enumerate()
                            .map(|(i, c)| pad(c, widths.get(i).copied().unwrap_or(0)))
                            .collect();
                        format!("  {}\n", s.join("  ").trim_end())
                    };
                    o.push_str(&line(head));
                    let rule: Vec<String> = widths.iter().map(|n| "-".repeat(*n)).collect();
                    o.push_str(&line(&rule));
                    for r in rows {
                        o.push_str(&line(r));
                    }
                    o.push('\n');
                }
                Block::List(items) => {
                    for i in items {
                        o.push_str(&format!("  - {i}\n"));
                    }
                    o.push('\n');
                }
                Block::Para(p) => o.push_str(&format!("{p}\n\n")),
            }
        }
        o
    }

    /// Markdown (GitHub-style tables).
    pub fn markdown(&self) -> String {
        let mut o = String::new();
        let row = |cells: &[String]| {
            let s: Vec<String> = cells.iter().map(|c| md_escape(c)).collect();
            format!("| {} |\n", s.join(" | "))
        };
        for b in &self.blocks {
            match b {
                Block::Title(t) => o.push_str(&format!("# {}\n\n", md_escape(t))),
                Block::Heading(h) => o.push_str(&format!("## {}\n\n", md_escape(h))),
                Block::Fields(f) => {
                    for (k, v) in f {
                        o.push_str(&format!("- **{}:** {}\n", md_escape(k), md_escape(v)));
                    }
                    o.push('\n');
                }
                Block::Table { head, rows } => {
                    o.push_str(&row(head));
                    o.push_str(&format!("|{}\n", "---|".repeat(head.len())));
                    for r in rows {
                        o.push_str(&row(r));
                    }
                    o.push('\n');
                }
                Block::List(items) => {
                    for i in items {
                        o.push_str(&format!("- {}\n", md_escape(i)));
                    }
                    o.push('\n');
                }
                Block::Para(p) => o.push_str(&format!("{}\n\n", md_escape(p))),
            }
        }
        o
    }
}
