//! Writing a traveller as YAML, in pieces that can be written side by side: the job and its
//! equipment, each run of features, and the records after them. Each piece is what the YAML
//! writer makes of that part alone; the features are indented as items of the `features:` list,
//! which gives, byte for byte, what writing the whole traveller in one pass gives (tested).

use super::model::{
    BlockSetSnapshot, Event, Feature, FixtureSnapshot, Handover, Job, Note, Return, SignOff,
    Traveller,
};
use serde::Serialize;

/// Below this many features the whole job is written in one pass on one thread.
const SPLIT_FROM: usize = 40;

#[derive(Serialize)]
struct Head<'a> {
    schema: u32,
    job: &'a Job,
    #[serde(skip_serializing_if = "<[_]>::is_empty")]
    fixtures: &'a [FixtureSnapshot],
    #[serde(skip_serializing_if = "<[_]>::is_empty")]
    block_sets: &'a [BlockSetSnapshot],
}

#[derive(Serialize)]
struct Tail<'a> {
    #[serde(skip_serializing_if = "<[_]>::is_empty")]
    notes: &'a [Note],
    #[serde(skip_serializing_if = "<[_]>::is_empty")]
    handovers: &'a [Handover],
    #[serde(skip_serializing_if = "<[_]>::is_empty")]
    returns: &'a [Return],
    #[serde(skip_serializing_if = "<[_]>::is_empty")]
    signoffs: &'a [SignOff],
    #[serde(skip_serializing_if = "<[_]>::is_empty")]
    events: &'a [Event],
}

/// Characters the YAML writer also breaks lines at (YAML 1.2 §5.4 counts only `\n` and `\r` as
/// line breaks, but the writer treats these as breaks too): where one is written as it is, the
/// lines of a piece cannot be found by `\n` alone, and the job is written in one pass instead.
const OTHER_BREAKS: [char; 4] = ['\r', '\u{85}', '\u{2028}', '\u{2029}'];

/// `features` as the items of a block list at the top level: `- ` before each feature's first
/// line, two spaces before its other lines (empty lines, as in a block of text, stay empty).
/// `None` when a feature's text holds a line break other than `\n`.
fn items(features: &[Feature]) -> Result<Option<String>, serde_yaml::Error> {
    let mut out = String::new();
    for f in features {
        let one = serde_yaml::to_string(f)?;
        if one.contains(OTHER_BREAKS) {
            return Ok(None);
        }
        for (i, line) in one.lines().enumerate() {
            if i == 0 {
                out.push_str("- ");
            } else if !line.is_empty() {
                out.push_str("  ");
            }
            out.push_str(line);
            out.push('\n');
        }
    }
    Ok(Some(out))
}

/// The YAML of `t`, written as it stands (the caller sets the schema version).
pub(super) fn yaml(t: &Traveller) -> Result<String, serde_yaml::Error> {
    // every field is named here, so a field added to the traveller cannot be left out
    let Traveller {
        schema,
        job,
        fixtures,
        block_sets,
        features,
        notes,
        handovers,
        returns,
        signoffs,
        events,
    } = t;
    if features.len() < SPLIT_FROM {
        return serde_yaml::to_string(t);
    }
    let head = Head {
        schema: *schema,
        job,
        fixtures,
        block_sets,
    };
    let tail = Tail {
        notes,
        handovers,
        returns,
        signoffs,
        events,
    };
    let threads = std::thread::available_parallelism()
        .map_or(1, |n| n.get())
        .clamp(1, 4);
    let per = features.len().div_ceil(threads);
    let (parts, head, tail) = std::thread::scope(|s| {
        // a thread the system will not start leaves its run to this one
        let runs: Vec<_> = features
            .chunks(per)
            .map(|run| {
                std::thread::Builder::new()
                    .spawn_scoped(s, move || items(run))
                    .map_err(|_| run)
            })
            .collect();
        let head = serde_yaml::to_string(&head);
        let tail = serde_yaml::to_string(&tail);
        let parts: Vec<Result<Option<String>, serde_yaml::Error>> = runs
            .into_iter()
            .map(|r| match r {
                Ok(h) => h
                    .join()
                    .unwrap_or_else(|_| Err(serde::ser::Error::custom("a writing thread failed"))),
                Err(run) => items(run),
            })
            .collect();
        (parts, head, tail)
    });
    let mut out = head?;
    out.push_str("features:\n");
    for p in parts {
        match p? {
            Some(p) => out.push_str(&p),
            None => return serde_yaml::to_string(t),
        }
    }
    let tail = tail?;
    // a tail with nothing in it is written as an empty mapping, which the whole job leaves out
    if tail.trim() != "{}" {
        out.push_str(&tail);
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn sample(name: &str) -> Traveller {
        let p = std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
            .join("sample-jobs")
            .join(name);
        let text = std::fs::read_to_string(p).unwrap();
        super::super::parse(&text).unwrap().traveller
    }

    /// The finished sample (every kind of record), its features repeated past the split.
    fn big(copies: usize) -> Traveller {
        let mut t = sample("ds-204-finished.yaml");
        let base = t.features.clone();
        t.features = (0..copies)
            .flat_map(|k| {
                base.iter().cloned().map(move |mut f| {
                    f.id = format!("{}-{k}", f.id);
                    f
                })
            })
            .collect();
        t
    }

    #[test]
    fn pieces_give_the_same_bytes_as_one_pass() {
        let same = |t: &Traveller| {
            let y = yaml(t).unwrap();
            assert_eq!(y, serde_yaml::to_string(t).unwrap());
            assert_eq!(&super::super::parse(&y).unwrap().traveller, t);
        };
        for copies in [6, 7, 50] {
            let mut t = big(copies);
            // text with line breaks and blank lines, written as blocks of text
            t.features[0].description = "first line\n\n  indented after a blank\nlast".into();
            t.features[3].name = "x: y # z".into();
            same(&t);
            // and with nothing after the features
            let mut bare = t.clone();
            bare.notes.clear();
            bare.handovers.clear();
            bare.returns.clear();
            bare.signoffs.clear();
            bare.events.clear();
            same(&bare);
            // line breaks the writer knows besides \n: written in one pass
            t.features[5].description = "one\u{2028}two\nthree".into();
            t.features[6].description = "one\u{2029}two\u{85}three\r\nfour".into();
            same(&t);
        }
    }

    #[test]
    fn a_piece_with_another_line_break_is_given_up() {
        let mut t = big(1);
        assert!(items(&t.features).unwrap().is_some());
        t.features[0].description = "one\u{2028}two\nthree".into();
        assert!(items(&t.features).unwrap().is_none());
    }
}
