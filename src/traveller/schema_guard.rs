//! Refusing hostile or runaway input before it is read into a job: a file too large to be a
//! traveller, YAML aliases (`*name`) that expand into far more values than the file holds (the
//! "billion laughs" kind), and nesting deep enough to threaten the stack.

use super::LoadError;
use serde::de::{self, DeserializeSeed, Visitor};
use std::cell::Cell;
use std::fmt;

/// The largest traveller file read, in bytes (16 MiB). A finished 300-feature job is well under
/// 2 MiB.
pub const MAX_BYTES: u64 = 16 * 1024 * 1024;

/// How deeply lists and mappings may nest on one line (indentation levels, `- ` items and
/// brackets counted together), checked in one pass before anything else reads the text. A
/// traveller is about eight levels deep.
pub const MAX_DEPTH: usize = 64;

/// The YAML reader's own limit (it never recurses past this; brackets spread over many lines
/// are stopped here).
const READER_DEPTH: usize = 128;

/// How many values aliases may add beyond what the text itself could hold. Hand-written files
/// may use an anchor (`&name`) and a few aliases; expansion past this is refused.
const ALIAS_ALLOWANCE: usize = 100_000;

/// A size in bytes as people read it: `52.4 MB` (10^6), `812 kB`, `90 bytes`.
pub fn describe_size(bytes: u64) -> String {
    if bytes >= 1_000_000 {
        format!("{:.1} MB", bytes as f64 / 1e6)
    } else if bytes >= 1_000 {
        format!("{} kB", bytes / 1_000)
    } else {
        format!("{bytes} bytes")
    }
}

/// The message for a file over [`MAX_BYTES`].
pub(crate) fn too_large(bytes: u64) -> String {
    format!(
        "the file is {} ({bytes} bytes), more than the {} ({MAX_BYTES} bytes) a traveller may be; check that this is the right file",
        describe_size(bytes),
        describe_size(MAX_BYTES)
    )
}

/// Refuse text that is too large, or whose aliases expand beyond what the text could hold.
pub(super) fn check(text: &str) -> Result<(), LoadError> {
    let bytes = text.len() as u64;
    if bytes > MAX_BYTES {
        return Err(refused(too_large(bytes)));
    }
    if let Some((line, depth)) = too_deep(text) {
        return Err(LoadError::Shape {
            line,
            col: 1,
            message: format!(
                "lists or mappings nest {depth} levels deep here, more than the {MAX_DEPTH} levels deep allowed; a traveller is only a few levels deep: check that this is the right file"
            ),
        });
    }
    // nothing to expand: a file with no alias cannot blow up
    if !might_have_alias(text) {
        return Ok(());
    }
    let budget = text.len() + ALIAS_ALLOWANCE;
    let count = Cell::new(0usize);
    let counted = Count {
        seen: &count,
        budget,
    }
    .deserialize(serde_yaml::Deserializer::from_str(text));
    if counted.is_err() && count.get() > budget {
        return Err(refused(format!(
            "the file's aliases (`*name`) expand to more than {budget} values from {} of text; write the values out instead of repeating an anchor, or check that this is the right file",
            describe_size(bytes)
        )));
    }
    // any other error is reported, with its place, by the ordinary reading
    Ok(())
}

/// Could `text` hold an alias (`*name`)? A `*` that starts a value (after a space, a line
/// break, `[`, `{`, `,` or `:`) and is followed by a name character. Erring towards yes is
/// safe: it only means the aliases are counted.
fn might_have_alias(text: &str) -> bool {
    let b = text.as_bytes();
    b.iter().enumerate().any(|(i, &c)| {
        c == b'*'
            && (i == 0
                || matches!(
                    b[i - 1],
                    b' ' | b'\t' | b'\n' | b'\r' | b'[' | b'{' | b',' | b':'
                ))
            && b.get(i + 1).is_some_and(|n| {
                !matches!(
                    n,
                    b' ' | b'\t' | b'\n' | b'\r' | b',' | b'[' | b']' | b'{' | b'}'
                )
            })
    })
}

/// A clearer message for the YAML reader's own limits, when one was hit.
pub(super) fn explain(e: &serde_yaml::Error) -> Option<String> {
    let m = e.to_string();
    if m.starts_with("recursion limit exceeded") {
        Some(format!(
            "the file nests lists or mappings more than {READER_DEPTH} levels deep; a traveller is only a few levels deep: check that this is the right file"
        ))
    } else if m.starts_with("repetition limit exceeded") {
        Some(
            "the file's aliases (`*name`) repeat an anchor far too many times; write the values out instead, or check that this is the right file"
                .into(),
        )
    } else {
        None
    }
}

/// The first line (from 1) nesting deeper than [`MAX_DEPTH`], and how deep, by a linear scan:
/// open indentation levels, leading `- ` items and brackets on the line, counted together.
fn too_deep(text: &str) -> Option<(usize, usize)> {
    let mut open: Vec<usize> = Vec::new();
    let mut block_scalar: Option<usize> = None;
    for (i, raw) in text.lines().enumerate() {
        let indent = raw.len() - raw.trim_start_matches(' ').len();
        let body = raw[indent..].trim_end();
        if let Some(b) = block_scalar {
            if body.is_empty() || indent > b {
                continue;
            }
            block_scalar = None;
        }
        if body.is_empty() || body.starts_with('#') {
            continue;
        }
        while open.last().is_some_and(|&c| c >= indent) {
            open.pop();
        }
        let mut rest = body;
        let mut dashes = 0;
        while rest == "-" || rest.starts_with("- ") {
            dashes += 1;
            rest = rest[1..].trim_start_matches(' ');
        }
        let mut level = 0usize;
        let mut brackets = 0usize;
        for b in rest.bytes() {
            match b {
                b'[' | b'{' => {
                    level += 1;
                    brackets = brackets.max(level);
                }
                b']' | b'}' => level = level.saturating_sub(1),
                _ => {}
            }
        }
        let depth = open.len() + dashes + brackets;
        if depth > MAX_DEPTH {
            return Some((i + 1, depth));
        }
        open.push(indent);
        if rest
            .split_once(": ")
            .is_some_and(|(_, v)| v.trim_start().starts_with(['|', '>']))
        {
            block_scalar = Some(indent);
        }
    }
    None
}

fn refused(message: String) -> LoadError {
    LoadError::Shape {
        line: 1,
        col: 1,
        message,
    }
}

/// Walks a document, aliases expanded, counting values; stops once past `budget`.
#[derive(Clone, Copy)]
struct Count<'a> {
    seen: &'a Cell<usize>,
    budget: usize,
}

impl Count<'_> {
    fn tick<E: de::Error>(self) -> Result<(), E> {
        let n = self.seen.get() + 1;
        self.seen.set(n);
        if n > self.budget {
            Err(E::custom("alias expansion over budget"))
        } else {
            Ok(())
        }
    }
}

impl<'de> DeserializeSeed<'de> for Count<'_> {
    type Value = ();
    fn deserialize<D: de::Deserializer<'de>>(self, d: D) -> Result<(), D::Error> {
        d.deserialize_any(self)
    }
}

impl<'de> Visitor<'de> for Count<'_> {
    type Value = ();
    fn expecting(&self, f: &mut fmt::Formatter) -> fmt::Result {
        f.write_str("any YAML value")
    }
    fn visit_bool<E: de::Error>(self, _: bool) -> Result<(), E> {
        self.tick()
    }
    fn visit_i64<E: de::Error>(self, _: i64) -> Result<(), E> {
        self.tick()
    }
    fn visit_u64<E: de::Error>(self, _: u64) -> Result<(), E> {
        self.tick()
    }
    fn visit_i128<E: de::Error>(self, _: i128) -> Result<(), E> {
        self.tick()
    }
    fn visit_u128<E: de::Error>(self, _: u128) -> Result<(), E> {
        self.tick()
    }
    fn visit_f64<E: de::Error>(self, _: f64) -> Result<(), E> {
        self.tick()
    }
    fn visit_str<E: de::Error>(self, _: &str) -> Result<(), E> {
        self.tick()
    }
    fn visit_bytes<E: de::Error>(self, _: &[u8]) -> Result<(), E> {
        self.tick()
    }
    fn visit_unit<E: de::Error>(self) -> Result<(), E> {
        self.tick()
    }
    fn visit_none<E: de::Error>(self) -> Result<(), E> {
        self.tick()
    }
    fn visit_some<D: de::Deserializer<'de>>(self, d: D) -> Result<(), D::Error> {
        self.deserialize(d)
    }
    fn visit_newtype_struct<D: de::Deserializer<'de>>(self, d: D) -> Result<(), D::Error> {
        self.deserialize(d)
    }
    fn visit_seq<A: de::SeqAccess<'de>>(self, mut seq: A) -> Result<(), A::Error> {
        self.tick()?;
        while seq.next_element_seed(self)?.is_some() {}
        Ok(())
    }
    fn visit_map<A: de::MapAccess<'de>>(self, mut map: A) -> Result<(), A::Error> {
        self.tick()?;
        while map.next_key_seed(self)?.is_some() {
            map.next_value_seed(self)?;
        }
        Ok(())
    }
    fn visit_enum<A: de::EnumAccess<'de>>(self, data: A) -> Result<(), A::Error> {
        use de::VariantAccess;
        self.tick()?;
        let ((), variant) = data.variant_seed(self)?;
        variant.newtype_variant_seed(self)
    }
}

#[cfg(test)]
mod tests {
    use super::might_have_alias;

    // YAML 1.2 §6.9.2 / §7.1: an alias node is `*` followed by an anchor name, where a node may
    // begin (after white space or a flow indicator).
    #[test]
    fn sees_every_place_an_alias_can_start() {
        for yes in [
            "a: *x",
            "- *x",
            "[*x, *y]",
            "{a: *x}",
            "{\"a\":*x}",
            "*x: 1",
            "a:\n  *x",
        ] {
            assert!(might_have_alias(yes), "{yes}");
        }
    }

    #[test]
    fn ignores_stars_inside_words_and_alone() {
        for no in [
            "note: 2*3 blocks",
            "note: a * b",
            "note: R&D * end",
            "a: b",
            "note: *",
        ] {
            assert!(!might_have_alias(no), "{no}");
        }
    }
}
