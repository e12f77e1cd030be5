//! Reading a shop file: the YAML layout (unknown keys refused), then the checks that need a
//! whole fixture or set (duplicate ids, a size listed missing that the set does not have…),
//! each reported at the line and column of the key it is about.

use super::ShopError;
use super::model::{Fixture, FixtureKind, Settings};
use super::values::{YCatalogue, YDate, YGrade, YLen, YMaterial, YRange, YRolls, YSize};
use crate::blocks::{BlockSet, Condition, Protectors};
use crate::traveller::DecisionRule;
use crate::units::{Length, Unit};
use serde::Deserialize;

/// The schema version this build reads and writes.
pub const SCHEMA_VERSION: u32 = 1;

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawShop {
    #[serde(default)]
    version: Option<u32>,
    #[serde(default)]
    fixtures: Vec<RawFixture>,
    #[serde(default)]
    block_sets: Vec<RawSet>,
    #[serde(default)]
    settings: Option<RawSettings>,
}

#[derive(Debug, Default, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawSettings {
    #[serde(default)]
    decision_rule: Option<DecisionRule>,
    #[serde(default)]
    settle_minutes: Option<u32>,
    #[serde(default)]
    operator: Option<String>,
    #[serde(default)]
    rules: Vec<String>,
    #[serde(default)]
    indicator_division: Option<YLen>,
    #[serde(default)]
    indicator_repeatability: Option<YLen>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawFixture {
    id: String,
    kind: FixtureKind,
    center: YLen,
    rolls: YRolls,
    calibrated: YDate,
    #[serde(default)]
    calibration_due: Option<YDate>,
    center_uncertainty: YLen,
    largest_stack: YLen,
    angle_range: YRange,
    #[serde(default)]
    note: Option<String>,
}

#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct RawSet {
    id: String,
    #[serde(default)]
    catalogue: Option<YCatalogue>,
    #[serde(default)]
    sizes: Option<Vec<YSize>>,
    #[serde(default)]
    unit: Option<Unit>,
    #[serde(default)]
    grade: Option<YGrade>,
    #[serde(default)]
    calibration_due: Option<YDate>,
    #[serde(default)]
    missing: Vec<YLen>,
    #[serde(default)]
    damaged: Vec<YLen>,
    #[serde(default)]
    worn: Vec<YLen>,
    #[serde(default)]
    protectors: Option<YLen>,
    #[serde(default)]
    material: Option<YMaterial>,
    #[serde(default)]
    note: Option<String>,
}

/// Line and column (1-based) of the top-level `section:` key, and the line where it ends.
fn section(text: &str, name: &str) -> (usize, usize) {
    let lines: Vec<&str> = text.lines().collect();
    let start = lines
        .iter()
        .position(|l| l.starts_with(&format!("{name}:")))
        .unwrap_or(0);
    let end = lines
        .iter()
        .enumerate()
        .skip(start + 1)
        .find(|(_, l)| {
            l.chars()
                .next()
                .is_some_and(|c| !c.is_whitespace() && c != '#' && c != '-')
        })
        .map(|(i, _)| i)
        .unwrap_or(lines.len());
    (start, end)
}

fn unquote(v: &str) -> &str {
    let v = v.split(" #").next().unwrap_or(v).trim();
    v.trim_matches(|c| c == '"' || c == '\'')
}

/// Where the item with `id` in `section_name` is, and where `key` is inside it (the id line when
/// the key is not written). Returns (line, column), 1-based.
fn locate(
    text: &str,
    section_name: &str,
    id: &str,
    key: Option<&str>,
    nth: usize,
) -> Option<(usize, usize)> {
    let lines: Vec<&str> = text.lines().collect();
    let (start, end) = section(text, section_name);
    let mut found = None;
    let mut seen = 0;
    for (i, l) in lines.iter().enumerate().take(end).skip(start) {
        let t = l.trim_start().trim_start_matches('-').trim_start();
        if let Some(v) = t.strip_prefix("id:")
            && unquote(v).eq_ignore_ascii_case(id.trim())
        {
            if seen == nth {
                let col = l.len() - t.len() + 1;
                found = Some((i, col));
                break;
            }
            seen += 1;
        }
    }
    let (line, col) = found?;
    let Some(key) = key else {
        return Some((line + 1, col));
    };
    for (i, l) in lines.iter().enumerate().take(end).skip(line) {
        let indent = l.len() - l.trim_start().len();
        let t = l.trim_start().trim_start_matches('-').trim_start();
        let this_col = l.len() - t.len() + 1;
        if i > line && !t.is_empty() && !t.starts_with('#') && indent + 1 < col {
            break; // the next item, or the end of the list
        }
        if t.starts_with(&format!("{key}:")) {
            return Some((i + 1, this_col));
        }
    }
    Some((line + 1, col))
}

fn at(
    origin: &str,
    text: &str,
    (section_name, id, nth): (&str, &str, usize),
    key: Option<&str>,
    message: String,
) -> ShopError {
    match locate(text, section_name, id, key, nth) {
        Some((line, column)) => ShopError::Syntax {
            origin: origin.to_string(),
            line,
            column,
            message,
        },
        None => ShopError::Invalid {
            origin: origin.to_string(),
            message,
        },
    }
}

/// A serde_yaml error as a located message with a hint on what to write.
fn yaml_error(e: &serde_yaml::Error, origin: &str) -> ShopError {
    let mut message = e.to_string();
    if let Some(loc) = e.location() {
        let tail = format!(" at line {} column {}", loc.line(), loc.column());
        if let Some(m) = message.strip_suffix(&tail) {
            message = m.to_string();
        } else {
            message = message.replacen(&tail, "", 1);
        }
    }
    if message.contains("unknown field") {
        message.push_str("; remove it or correct its spelling");
    } else if message.contains("missing field") {
        message.push_str(
            "; add it (`tiltbook shop --init --shop NEW.yaml` writes a starting file with every key explained)",
        );
    } else if message.contains("unknown variant") {
        message.push_str("; use one of those words exactly");
    } else if message.contains("while parsing")
        || message.contains("while scanning")
        || message.contains("did not find expected")
        || message.contains("found character that cannot start")
        || message.contains("mapping values are not allowed")
    {
        message.push_str(
            "; check the brackets, quotes, colons and indentation there and on the line before (indent with spaces, not tabs)",
        );
    }
    match e.location() {
        Some(loc) => ShopError::Syntax {
            origin: origin.to_string(),
            line: loc.line(),
            column: loc.column(),
            message,
        },
        None => ShopError::Invalid {
            origin: origin.to_string(),
            message,
        },
    }
}

/// Read a shop file's text. `origin` names it in messages (a path, or "built-in demo shop").
/// Where `key` is written in the `settings:` section (the section's line when it is not).
fn settings_at(origin: &str, text: &str, key: &str, message: String) -> ShopError {
    let (start, end) = section(text, "settings");
    let line = text
        .lines()
        .enumerate()
        .take(end)
        .skip(start)
        .find(|(_, l)| l.trim_start().starts_with(&format!("{key}:")))
        .map_or((start + 1, 1), |(i, l)| {
            (i + 1, l.len() - l.trim_start().len() + 1)
        });
    ShopError::Syntax {
        origin: origin.to_string(),
        line: line.0,
        column: line.1,
        message,
    }
}

/// The shop's settings, checked; defaults for what is not written.
fn settings(raw: RawSettings, origin: &str, text: &str) -> Result<Settings, ShopError> {
    let mut s = Settings::default();
    if let Some(r) = raw.decision_rule {
        s.rule = r;
    }
    if let Some(m) = raw.settle_minutes {
        if m > 240 {
            return Err(settings_at(
                origin,
                text,
                "settle_minutes",
                format!(
                    "settle_minutes {m} is more than 240 (four hours); give the minutes a stack rests, e.g. `settle_minutes: 10`"
                ),
            ));
        }
        s.settle_minutes = m;
    }
    if let Some(o) = raw.operator {
        if o.trim().is_empty() {
            return Err(settings_at(
                origin,
                text,
                "operator",
                "operator is empty; give a name or initials, or remove the line".into(),
            ));
        }
        s.operator = Some(o.trim().to_string());
    }
    s.rules = raw
        .rules
        .into_iter()
        .map(|r| r.trim().to_string())
        .filter(|r| !r.is_empty())
        .collect();
    // a dial test indicator reads to 0.001 in or finer: common practice (no source)
    let finest = Length::from_nm(crate::units::NM_PER_INCH / 1_000);
    if let Some(d) = raw.indicator_division {
        if d.len > finest {
            return Err(settings_at(
                origin,
                text,
                "indicator_division",
                format!(
                    "indicator_division {} is coarser than 0.001in; give one division of the dial test indicator, e.g. 0.0001in or 0.001mm",
                    d.len.show(d.unit)
                ),
            ));
        }
        s.indicator_resolution = d.len;
    }
    if let Some(r) = raw.indicator_repeatability {
        if r.len > finest {
            return Err(settings_at(
                origin,
                text,
                "indicator_repeatability",
                format!(
                    "indicator_repeatability {} is more than 0.001in; give one reading's standard deviation as measured, e.g. 0.00005in or 0.001mm",
                    r.len.show(r.unit)
                ),
            ));
        }
        s.indicator_repeatability = Some(r.len);
    }
    Ok(s)
}

pub(super) fn parse(
    text: &str,
    origin: &str,
) -> Result<(Vec<Fixture>, Vec<BlockSet>, Settings), ShopError> {
    let has_content = text
        .lines()
        .any(|l| !l.trim().is_empty() && !l.trim_start().starts_with('#'));
    if !has_content {
        return Err(ShopError::Invalid {
            origin: origin.to_string(),
            message: "the shop file is empty; give it `fixtures:` and `block_sets:` lists (`tiltbook shop --init --shop NEW.yaml` writes a starting file)".into(),
        });
    }
    let raw: RawShop = serde_yaml::from_str(text).map_err(|e| yaml_error(&e, origin))?;
    if let Some(v) = raw.version
        && v != SCHEMA_VERSION
    {
        return Err(ShopError::Invalid {
            origin: origin.to_string(),
            message: format!(
                "this shop file is version {v}, but this tiltbook reads version {SCHEMA_VERSION}; write `version: {SCHEMA_VERSION}` and check the keys against `tiltbook shop --init --shop NEW.yaml`, or use a newer tiltbook"
            ),
        });
    }
    let mut fixtures: Vec<Fixture> = Vec::new();
    for f in raw.fixtures {
        let nth = usize::from(
            fixtures
                .iter()
                .any(|g| g.id.eq_ignore_ascii_case(f.id.trim())),
        );
        let err = |key: Option<&str>, m: String| at(origin, text, ("fixtures", &f.id, nth), key, m);
        if f.id.trim().is_empty() {
            return Err(ShopError::Invalid {
                origin: origin.into(),
                message: "a fixture has an empty id; give each fixture a name, e.g. `id: SB5-01`"
                    .into(),
            });
        }
        if nth > 0 {
            return Err(err(
                None,
                format!(
                    "fixture id '{}' is used twice (ids are compared ignoring case); give each fixture its own id",
                    f.id
                ),
            ));
        }
        if let Some(d) = f.calibration_due
            && d.0 < f.calibrated.0
        {
            return Err(err(
                Some("calibration_due"),
                format!(
                    "calibration_due {} is before calibrated {}; check the dates (YYYY-MM-DD)",
                    d.0, f.calibrated.0
                ),
            ));
        }
        fixtures.push(Fixture {
            id: f.id.trim().to_string(),
            kind: f.kind,
            unit: f.center.unit,
            center: f.center.len,
            pivot_roll: f.rolls.0.len,
            raised_roll: f.rolls.1.len,
            calibrated: f.calibrated.0,
            calibration_due: f.calibration_due.map(|d| d.0),
            center_uncertainty: f.center_uncertainty.len,
            largest_stack: f.largest_stack.len,
            angle_range: (f.angle_range.0, f.angle_range.1),
            note: f.note,
        });
    }
    let mut sets: Vec<BlockSet> = Vec::new();
    for s in raw.block_sets {
        let nth = usize::from(sets.iter().any(|g| g.id.eq_ignore_ascii_case(s.id.trim())));
        let err =
            |key: Option<&str>, m: String| at(origin, text, ("block_sets", &s.id, nth), key, m);
        if s.id.trim().is_empty() {
            return Err(ShopError::Invalid {
                origin: origin.into(),
                message: "a block set has an empty id; give each set a name, e.g. `id: BX81-A`"
                    .into(),
            });
        }
        if nth > 0 {
            return Err(err(
                None,
                format!(
                    "block set id '{}' is used twice (ids are compared ignoring case); give each set its own id",
                    s.id
                ),
            ));
        }
        let mut set = match (&s.catalogue, &s.sizes) {
            (Some(c), None) => {
                let set = BlockSet::from_catalogue(&c.0)
                    .map_err(|e| err(Some("catalogue"), e.to_string()))?;
                if let Some(u) = s.unit
                    && u != set.unit
                {
                    return Err(err(
                        Some("unit"),
                        format!(
                            "set {} is in {}, not {u}; leave `unit:` out for a standard set",
                            c.0, set.unit
                        ),
                    ));
                }
                set
            }
            (None, Some(sizes)) => {
                let unit = match s.unit {
                    Some(u) => u,
                    None => {
                        let first = sizes.first().map(|z| z.size.unit).unwrap_or_default();
                        if sizes.iter().any(|z| z.size.unit != first) {
                            return Err(err(
                                Some("sizes"),
                                "the sizes mix inches and millimetres; add `unit: in` or `unit: mm` to say which the set is marked in".into(),
                            ));
                        }
                        first
                    }
                };
                let list: Vec<(Length, u32)> =
                    sizes.iter().map(|z| (z.size.len, z.count)).collect();
                BlockSet::from_sizes(&s.id, unit, &list)
                    .map_err(|e| err(Some("sizes"), e.to_string()))?
            }
            (Some(_), Some(_)) => {
                return Err(err(
                    Some("sizes"),
                    "give either `catalogue:` (a standard set) or `sizes:` (your own list), not both".into(),
                ));
            }
            (None, None) => {
                return Err(err(
                    None,
                    "say what the set holds: `catalogue: inch-81` (or metric-88, metric-112), or `sizes: [0.1001in, 0.050in x2, …]`".into(),
                ));
            }
        };
        set.id = s.id.trim().to_string();
        for (key, list, cond) in [
            ("missing", &s.missing, Condition::Missing),
            ("damaged", &s.damaged, Condition::Damaged),
            ("worn", &s.worn, Condition::Worn),
        ] {
            let sizes: Vec<Length> = list.iter().map(|l| l.len).collect();
            set.mark_all(&sizes, cond)
                .map_err(|e| err(Some(key), e.to_string()))?;
        }
        set.protectors = s.protectors.map(|p| Protectors { size: p.len });
        set.grade = s.grade.map(|g| g.0);
        set.calibration_due = s.calibration_due.map(|d| d.0);
        set.material = s.material.map(|m| m.0);
        set.note = s.note;
        sets.push(set);
    }
    let settings = settings(raw.settings.unwrap_or_default(), origin, text)?;
    Ok((fixtures, sets, settings))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn finds_the_key_of_an_item() {
        let text = "fixtures:\n  - id: A\n    kind: sine bar\n  - id: B\n    kind: x\nblock_sets:\n  - id: A\n    worn: []\n";
        assert_eq!(locate(text, "fixtures", "B", Some("kind"), 0), Some((5, 5)));
        assert_eq!(locate(text, "fixtures", "A", None, 0), Some((2, 5)));
        assert_eq!(
            locate(text, "block_sets", "A", Some("worn"), 0),
            Some((8, 5))
        );
        // a key the item does not have: the id line
        assert_eq!(locate(text, "fixtures", "A", Some("note"), 0), Some((2, 5)));
        assert_eq!(locate(text, "fixtures", "A", None, 1), None);
    }
}
