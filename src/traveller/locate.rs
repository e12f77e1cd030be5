//! Where a key path (`features[1].attempts[0].stack.height`) sits in the YAML text.
//!
//! A small line scanner for the block style tiltbook writes and people hand-write: `key: value`,
//! `- ` sequence items, simple one-line flow mappings and lists (`{a: 1, b: 2}`, `[x, y]`),
//! comments and block scalars. Anything it cannot follow is located at its nearest parent.

use std::collections::HashMap;
use std::sync::{Arc, OnceLock};

/// A line and column, both counted from 1.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Default)]
pub struct Pos {
    pub line: usize,
    pub col: usize,
}

/// Positions of every key path found in one YAML text.
///
/// The text is scanned the first time a position is asked for, so a file with no problems
/// (the usual case) is never scanned.
#[derive(Debug, Clone, Default)]
pub struct Locator {
    text: Arc<str>,
    map: OnceLock<HashMap<String, Pos>>,
}

struct Frame {
    /// Column of the key or dash that opened this node (0-based); the root has none.
    col: Option<usize>,
    /// An item of a sequence (opened by `- `) rather than a key.
    item: bool,
    path: String,
    /// Items seen so far when this node holds a sequence.
    items: usize,
}

impl Frame {
    /// Does a line starting at `indent` (a dash when `dash`) sit inside this node?
    fn holds(&self, indent: usize, dash: bool) -> bool {
        match self.col {
            None => true,
            Some(c) => indent > c || (!self.item && dash && indent == c),
        }
    }
}

impl Locator {
    /// A locator for `text` (kept; scanned when first needed).
    pub fn new(text: &str) -> Self {
        Locator {
            text: Arc::from(text),
            map: OnceLock::new(),
        }
    }

    fn map(&self) -> &HashMap<String, Pos> {
        self.map.get_or_init(|| scan(&self.text))
    }
}

/// Every key path of `text` and where it is written.
fn scan(text: &str) -> HashMap<String, Pos> {
    let mut map = HashMap::new();
    let mut stack: Vec<Frame> = vec![Frame {
        col: None,
        item: false,
        path: String::new(),
        items: 0,
    }];
    let mut block_scalar: Option<usize> = None;
    for (ln, raw) in text.lines().enumerate() {
        let line_no = ln + 1;
        let indent = raw.len() - raw.trim_start_matches(' ').len();
        let body = raw[indent..].trim_end();
        if let Some(bi) = block_scalar {
            if body.is_empty() || indent > bi {
                continue;
            }
            block_scalar = None;
        }
        if body.is_empty() || body.starts_with('#') || body == "---" || body == "..." {
            continue;
        }
        let dash = body == "-" || body.starts_with("- ");
        while stack.len() > 1 && !stack.last().is_some_and(|f| f.holds(indent, dash)) {
            stack.pop();
        }
        let mut col = indent;
        let mut rest = body;
        while rest == "-" || rest.starts_with("- ") {
            let path = match stack.last_mut() {
                Some(f) => {
                    let i = f.items;
                    f.items += 1;
                    format!("{}[{i}]", f.path)
                }
                None => String::new(),
            };
            map.entry(path.clone()).or_insert(Pos {
                line: line_no,
                col: col + 1,
            });
            stack.push(Frame {
                col: Some(col),
                item: true,
                path,
                items: 0,
            });
            let after = rest[1..].trim_start_matches(' ');
            col += rest.len() - after.len();
            rest = after;
        }
        if rest.is_empty() {
            continue;
        }
        let parent = stack.last().map(|f| f.path.clone()).unwrap_or_default();
        if let Some((key, value, value_col)) = split_key(rest) {
            let path = join(&parent, &key);
            map.entry(path.clone()).or_insert(Pos {
                line: line_no,
                col: col + 1,
            });
            let lead = value.len() - value.trim_start().len();
            let v = value.trim();
            if v.starts_with('|') || v.starts_with('>') {
                block_scalar = Some(col);
            } else if v.starts_with('{') || v.starts_with('[') {
                flow(&mut map, &path, v, line_no, col + value_col + lead);
            }
            if v.is_empty() || (v.starts_with('&') && !v.contains(' ')) {
                stack.push(Frame {
                    col: Some(col),
                    item: false,
                    path,
                    items: 0,
                });
            }
        } else if rest.starts_with('{') || rest.starts_with('[') {
            flow(&mut map, &parent, rest, line_no, col);
        }
    }
    // columns were counted in bytes; people count characters (`±`, `°` are one each)
    let lines: Vec<&str> = text.lines().collect();
    for pos in map.values_mut() {
        if let Some(l) = lines.get(pos.line - 1)
            && let Some(before) = l.get(..pos.col - 1)
        {
            pos.col = before.chars().count() + 1;
        }
    }
    map
}

impl Locator {
    /// The position of `path`, or of its nearest parent that was found, or 1:1.
    pub fn find(&self, path: &str) -> Pos {
        let mut p = path.to_string();
        loop {
            if let Some(pos) = self.map().get(&p) {
                return *pos;
            }
            match p.rfind(['.', '[']) {
                Some(i) => p.truncate(i),
                None => return Pos { line: 1, col: 1 },
            }
        }
    }

    /// The position of `path` only when it is written in the file.
    pub fn exact(&self, path: &str) -> Option<Pos> {
        self.map().get(path).copied()
    }
}

fn join(parent: &str, key: &str) -> String {
    if parent.is_empty() {
        key.to_string()
    } else {
        format!("{parent}.{key}")
    }
}

/// `key: value` → (key, value text, column offset of the value). Quoted keys are unquoted.
fn split_key(s: &str) -> Option<(String, &str, usize)> {
    let bytes = s.as_bytes();
    let (key, end) = match bytes.first()? {
        q @ (b'"' | b'\'') => {
            let close = s[1..].find(*q as char)? + 1;
            (s[1..close].to_string(), close + 1)
        }
        _ => {
            let mut i = 0;
            loop {
                let c = *bytes.get(i)?;
                if c == b':' && matches!(bytes.get(i + 1), None | Some(b' ')) {
                    break;
                }
                if c == b'#' || c == b'{' || c == b'[' {
                    return None;
                }
                i += 1;
            }
            (s[..i].trim_end().to_string(), i)
        }
    };
    let after = s.get(end..)?;
    let after = after.strip_prefix(':')?;
    if !(after.is_empty() || after.starts_with(' ')) {
        return None;
    }
    let value = strip_comment(after);
    Some((key, value, end + 1))
}

fn strip_comment(v: &str) -> &str {
    let mut quote: Option<char> = None;
    let mut prev = ' ';
    for (i, c) in v.char_indices() {
        match quote {
            Some(q) if c == q => quote = None,
            Some(_) => {}
            None if c == '"' || c == '\'' => quote = Some(c),
            None if c == '#' && prev == ' ' => return &v[..i],
            None => {}
        }
        prev = c;
    }
    v
}

/// One-line flow mapping or list: record the top-level entries (and nested ones) by column.
fn flow(map: &mut HashMap<String, Pos>, path: &str, text: &str, line: usize, col0: usize) {
    let Some(open) = text.chars().next() else {
        return;
    };
    let is_map = open == '{';
    let mut depth = 0usize;
    let mut quote: Option<char> = None;
    let mut start = 1usize;
    let mut index = 0usize;
    let mut entries: Vec<(usize, usize)> = Vec::new();
    for (i, c) in text.char_indices().skip(1) {
        match quote {
            Some(q) => {
                if c == q {
                    quote = None;
                }
                continue;
            }
            None if c == '"' || c == '\'' => quote = Some(c),
            None if c == '{' || c == '[' => depth += 1,
            None if (c == '}' || c == ']') && depth > 0 => depth -= 1,
            None if depth == 0 && (c == ',' || c == '}' || c == ']') => {
                entries.push((start, i));
                start = i + 1;
                if c != ',' {
                    break;
                }
            }
            _ => {}
        }
    }
    for (a, b) in entries {
        let piece = &text[a..b];
        let lead = piece.len() - piece.trim_start().len();
        let piece_t = piece.trim();
        if piece_t.is_empty() {
            continue;
        }
        let pcol = col0 + a + lead;
        if is_map {
            if let Some((key, value, vc)) = split_key(piece_t) {
                let p = join(path, &key);
                map.entry(p.clone()).or_insert(Pos {
                    line,
                    col: pcol + 1,
                });
                let v = value.trim_start();
                let vlead = value.len() - v.len();
                if v.starts_with('{') || v.starts_with('[') {
                    flow(map, &p, v.trim_end(), line, pcol + vc + vlead);
                }
            }
        } else {
            let p = format!("{path}[{index}]");
            index += 1;
            map.entry(p.clone()).or_insert(Pos {
                line,
                col: pcol + 1,
            });
            if piece_t.starts_with('{') || piece_t.starts_with('[') {
                flow(map, &p, piece_t, line, pcol);
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const TEXT: &str = "\
schema: 1
job:
  id: J-1   # a comment
  notes: |
    id: not a key
    - not an item
  part: DS-204
features:
  - id: F1
    nominal: 30
    attempts:
      - number: 1
        stack: {blocks: [{size: 1 in}, {size: \"0.5 in\"}], height: 1.5 in}
  -
    id: F2
    tags: [a, b]
";

    #[test]
    fn finds_block_and_flow_keys() {
        let l = Locator::new(TEXT);
        let at = |p: &str| l.exact(p).map(|p| (p.line, p.col));
        assert_eq!(at("schema"), Some((1, 1)));
        assert_eq!(at("job.id"), Some((3, 3)));
        assert_eq!(at("job.part"), Some((7, 3)));
        assert_eq!(at("job.notes.id"), None);
        assert_eq!(at("features[0]"), Some((9, 3)));
        assert_eq!(at("features[0].id"), Some((9, 5)));
        assert_eq!(at("features[0].nominal"), Some((10, 5)));
        assert_eq!(at("features[0].attempts[0].number"), Some((12, 9)));
        assert_eq!(at("features[0].attempts[0].stack"), Some((13, 9)));
        assert_eq!(at("features[0].attempts[0].stack.blocks"), Some((13, 17)));
        assert_eq!(
            at("features[0].attempts[0].stack.blocks[1].size"),
            Some((13, 41))
        );
        assert_eq!(at("features[0].attempts[0].stack.height"), Some((13, 59)));
        assert_eq!(at("features[1].id"), Some((15, 5)));
        assert_eq!(at("features[1].tags[1]"), Some((16, 15)));
        // columns count characters, not bytes
        let l = Locator::new("a: { t: \"±0°05'\", b: 1 }\n");
        assert_eq!(l.exact("a.b").map(|p| p.col), Some(19));
    }

    #[test]
    fn falls_back_to_the_nearest_parent() {
        let l = Locator::new(TEXT);
        let p = l.find("features[0].attempts[0].judgement.verdict");
        assert_eq!((p.line, p.col), (12, 7));
        assert_eq!(l.find("nothing.here"), Pos { line: 1, col: 1 });
    }
}
