//! Reading and writing the YAML: the schema version, upgrades of older files, and errors that
//! name the line, the column and what to write instead.

use super::locate::{Locator, Pos};
use super::model::{SCHEMA_VERSION, Traveller};
use serde_yaml::Value;
use thiserror::Error;

#[path = "schema_guard.rs"]
mod guard;
pub(crate) use guard::too_large;
pub use guard::{MAX_BYTES, MAX_DEPTH, describe_size};

/// Why a traveller file could not be read into a job.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum LoadError {
    /// Not valid YAML.
    #[error("{line}:{col}: {message}")]
    Syntax {
        line: usize,
        col: usize,
        message: String,
    },
    /// Written by a newer tiltbook.
    #[error(
        "{line}:{col}: this file is schema version {found}, but this tiltbook reads versions up to {supported}; open it with a newer tiltbook"
    )]
    TooNew {
        found: u64,
        supported: u32,
        line: usize,
        col: usize,
    },
    /// Valid YAML but not a traveller: an unknown key, a missing field, a value of the wrong form.
    #[error("{line}:{col}: {message}")]
    Shape {
        line: usize,
        col: usize,
        message: String,
    },
}

impl LoadError {
    /// Line and column (from 1) the problem was found at.
    pub fn pos(&self) -> Pos {
        match self {
            LoadError::Syntax { line, col, .. }
            | LoadError::TooNew { line, col, .. }
            | LoadError::Shape { line, col, .. } => Pos {
                line: *line,
                col: *col,
            },
        }
    }
    /// The message without its position.
    pub fn message(&self) -> String {
        let s = self.to_string();
        match s.split_once(": ") {
            Some((_, m)) => m.to_string(),
            None => s,
        }
    }
}

/// A traveller read from text, with what is needed to point at its lines.
#[derive(Debug, Clone)]
pub struct Loaded {
    pub traveller: Traveller,
    /// The schema version the file was written in, when it was older and has been upgraded.
    pub upgraded_from: Option<u64>,
    pub locator: Locator,
}

/// Read a traveller (or plan file) from YAML text, upgrading an older schema.
pub fn parse(text: &str) -> Result<Loaded, LoadError> {
    guard::check(text)?;
    let locator = Locator::new(text);
    // the usual case, a current file that reads cleanly, is read once; anything else takes
    // the slower road below, which finds the version first and explains what is wrong
    if let Ok(traveller) = serde_yaml::from_str::<Traveller>(text)
        && traveller.schema == SCHEMA_VERSION
    {
        return Ok(Loaded {
            traveller,
            upgraded_from: None,
            locator,
        });
    }
    let value: Value = serde_yaml::from_str(text).map_err(|e| {
        let (line, col) = location(&e);
        LoadError::Syntax {
            line,
            col,
            message: guard::explain(&e).unwrap_or_else(|| {
                format!(
                    "the file is not valid YAML: {}; check the indentation and quoting near here",
                    e
                )
            }),
        }
    })?;
    let Value::Mapping(map) = &value else {
        let what = if value.is_null() {
            "the file is empty"
        } else {
            "the file is a single value or a list, not a traveller"
        };
        return Err(LoadError::Shape {
            line: 1,
            col: 1,
            message: format!(
                "{what}; a traveller is a mapping starting with `schema: 1` and `job:`: start one with `tiltbook new FILE --part TEXT`, or see docs/traveller-format.md"
            ),
        });
    };
    if !map.contains_key("job") && !map.contains_key("features") && !map.contains_key("schema") {
        return Err(LoadError::Shape {
            line: 1,
            col: 1,
            message: "this is not a traveller or plan file: it has no `schema:`, `job:` or `features:`; see docs/traveller-format.md for the layout".into(),
        });
    }
    let version = match map.get("schema") {
        None => 0,
        Some(Value::Number(n)) if n.as_u64().is_some() => n.as_u64().unwrap_or(0),
        Some(other) => {
            let p = locator.find("schema");
            return Err(LoadError::Shape {
                line: p.line,
                col: p.col,
                message: format!(
                    "schema should be a whole number; write `schema: {SCHEMA_VERSION}`, not {}",
                    short_value(other)
                ),
            });
        }
    };
    if version > u64::from(SCHEMA_VERSION) {
        let p = locator.find("schema");
        return Err(LoadError::TooNew {
            found: version,
            supported: SCHEMA_VERSION,
            line: p.line,
            col: p.col,
        });
    }
    if version == u64::from(SCHEMA_VERSION) {
        let traveller = serde_yaml::from_str::<Traveller>(text)
            .map_err(|e| shape_error(&e, text, &locator, true))?;
        return Ok(Loaded {
            traveller,
            upgraded_from: None,
            locator,
        });
    }
    // read the upgraded tree through text, so errors carry their key path; the positions in
    // that text are not the file's, so the path is looked up in the file instead
    let upgraded = upgrade(value, version);
    let retext = serde_yaml::to_string(&upgraded).map_err(|e| LoadError::Shape {
        line: 1,
        col: 1,
        message: format!("the file could not be upgraded from schema {version}: {e}; check it against docs/traveller-format.md"),
    })?;
    let traveller = serde_yaml::from_str::<Traveller>(&retext)
        .map_err(|e| shape_error(&e, text, &locator, false))?;
    Ok(Loaded {
        traveller,
        upgraded_from: Some(version),
        locator,
    })
}

/// Write a traveller as YAML (always the current schema).
pub fn to_yaml(t: &Traveller) -> Result<String, serde_yaml::Error> {
    if t.schema == SCHEMA_VERSION {
        return super::write::yaml(t);
    }
    let mut t = t.clone();
    t.schema = SCHEMA_VERSION;
    super::write::yaml(&t)
}

/// Bring an older file's tree up to the current schema, one version at a time.
///
/// Version 0 (files written before the `schema` key existed) named the job's unit `units` and
/// each feature's angle `angle`; version 1 names them `unit` and `nominal`.
pub fn upgrade(mut value: Value, from: u64) -> Value {
    if from == 0 {
        value = upgrade_v0_to_v1(value);
    }
    value
}

fn rename(map: &mut serde_yaml::Mapping, old: &str, new: &str) {
    if !map.contains_key(new)
        && let Some(v) = map.remove(old)
    {
        map.insert(Value::from(new), v);
    }
}

fn upgrade_v0_to_v1(mut value: Value) -> Value {
    if let Value::Mapping(map) = &mut value {
        if let Some(Value::Mapping(job)) = map.get_mut("job") {
            rename(job, "units", "unit");
        }
        if let Some(Value::Sequence(features)) = map.get_mut("features") {
            for f in features {
                if let Value::Mapping(f) = f {
                    rename(f, "angle", "nominal");
                }
            }
        }
        map.insert(Value::from("schema"), Value::from(1));
    }
    value
}

fn location(e: &serde_yaml::Error) -> (usize, usize) {
    e.location()
        .map(|l| (l.line(), l.column()))
        .unwrap_or((1, 1))
}

fn strip_location(msg: &str) -> String {
    match msg.rfind(" at line ") {
        Some(i) if msg[i..].contains(" column ") => msg[..i].to_string(),
        _ => msg.to_string(),
    }
}

fn short_value(v: &Value) -> String {
    match serde_yaml::to_string(v) {
        Ok(s) => format!("`{}`", s.trim()),
        Err(_) => "that value".into(),
    }
}

/// Turn a serde error into a message with a position and, for a misspelt key or word, a
/// suggestion.
fn shape_error(e: &serde_yaml::Error, text: &str, locator: &Locator, own_text: bool) -> LoadError {
    let raw = strip_location(&e.to_string());
    let (path, msg) = match raw.split_once(": ") {
        Some((p, m)) if !p.contains(' ') => (p.to_string(), m.to_string()),
        _ => (String::new(), raw.clone()),
    };
    let (mut line, mut col) = match e.location().filter(|_| own_text) {
        Some(l) => (l.line(), l.column()),
        None => {
            // no position (an upgraded file): an unknown key is found under its parent's path
            let key = msg
                .strip_prefix("unknown field `")
                .and_then(|r| r.split('`').next())
                .map(|k| {
                    if path.is_empty() {
                        k.to_string()
                    } else {
                        format!("{path}.{k}")
                    }
                });
            let p = key
                .and_then(|k| locator.exact(&k))
                .unwrap_or_else(|| locator.find(&path));
            (p.line, p.col)
        }
    };
    // a value refused by its own parser is reported at its parent; find the value itself
    if let Some(bad) = quoted(&msg)
        && let Some(p) = find_value(text, line, &bad)
    {
        line = p.line;
        col = p.col;
    }
    let message = improve(&msg);
    let message = if path.is_empty() {
        message
    } else {
        format!("{path}: {message}")
    };
    LoadError::Shape { line, col, message }
}

/// The first `'...'` snippet of a message.
fn quoted(msg: &str) -> Option<String> {
    let start = msg.find('\'')? + 1;
    let len = msg[start..].find('\'')?;
    let s = &msg[start..start + len];
    (!s.trim().is_empty()).then(|| s.to_string())
}

/// The first place at or after `from_line` where `needle` is written as a value.
fn find_value(text: &str, from_line: usize, needle: &str) -> Option<Pos> {
    for (i, l) in text.lines().enumerate().skip(from_line.saturating_sub(1)) {
        if let Some(c) = l.find(needle) {
            let before = &l[..c];
            let quote = before.ends_with('"') || before.ends_with('\'');
            let col = l[..c].chars().count() + 1 - usize::from(quote);
            return Some(Pos { line: i + 1, col });
        }
    }
    None
}

/// Rewrite serde's wording into ours, with a "did you mean" for unknown keys and words.
fn improve(msg: &str) -> String {
    let ticked = |s: &str| -> Vec<String> {
        s.split('`')
            .enumerate()
            .filter(|(i, _)| i % 2 == 1)
            .map(|(_, w)| w.to_string())
            .collect()
    };
    if let Some(rest) = msg.strip_prefix("unknown field ") {
        let words = ticked(rest);
        if let Some((bad, allowed)) = words.split_first() {
            return unknown("key", bad, allowed);
        }
    }
    if let Some(rest) = msg.strip_prefix("unknown variant ") {
        let words = ticked(rest);
        if let Some((bad, allowed)) = words.split_first() {
            return unknown("value", bad, allowed);
        }
    }
    if let Some(rest) = msg.strip_prefix("missing field ") {
        let words = ticked(rest);
        if let Some(f) = words.first() {
            return format!("`{f}` is missing; add a line `{f}: ...`");
        }
    }
    msg.to_string()
}

fn unknown(what: &str, bad: &str, allowed: &[String]) -> String {
    let list = allowed.join(", ");
    match suggest(bad, allowed) {
        Some(s) => format!("unknown {what} `{bad}`; did you mean `{s}`? (allowed here: {list})"),
        None if allowed.is_empty() => format!("unknown {what} `{bad}`; remove it"),
        None => format!("unknown {what} `{bad}`; allowed here: {list}"),
    }
}

/// The closest of `choices` to `word`, when it is close enough to be a likely slip.
pub fn suggest<'a>(word: &str, choices: &'a [String]) -> Option<&'a str> {
    let w = word.to_lowercase();
    choices
        .iter()
        .map(|c| (strsim::damerau_levenshtein(&w, &c.to_lowercase()), c))
        .filter(|(d, c)| *d <= (c.chars().count().max(3) / 3).max(1) + usize::from(c.len() > 6))
        .min_by_key(|(d, _)| *d)
        .map(|(_, c)| c.as_str())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn v(s: &[&str]) -> Vec<String> {
        s.iter().map(|x| x.to_string()).collect()
    }

    #[test]
    fn suggests_near_misses_only() {
        let keys = v(&["nominal", "tolerance", "name", "id", "attempts"]);
        assert_eq!(suggest("nomnal", &keys), Some("nominal"));
        assert_eq!(suggest("tolerence", &keys), Some("tolerance"));
        assert_eq!(suggest("Name", &keys), Some("name"));
        assert_eq!(suggest("colour", &keys), None);
    }

    #[test]
    fn finds_a_quoted_value() {
        let text = "a:\n  b: 1\n  nominal: \"30x\"\n";
        assert_eq!(find_value(text, 1, "30x"), Some(Pos { line: 3, col: 12 }));
    }
}
