//! Reports of a traveller for a lead or a customer file: the job and its progress, then each
//! feature with its setup, result, who and when, and flags worth a second look. Written as
//! plain text, Markdown, or one standalone HTML file that prints on A4 and Letter.

mod doc;
mod flags;
mod html;
mod rows;

pub use doc::{Block, Doc};
pub use flags::{Flag, changed_fields, flags, sweep_travel};

use super::model::*;
use crate::units::{Length, Unit};
use rows::{attempt_stack_cell, judgement_rows, nominal_row, stack_rows};
use serde::Serialize;
use std::str::FromStr;

/// Output format of a report.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Format {
    #[default]
    Text,
    Markdown,
    Html,
}

impl FromStr for Format {
    type Err = String;
    fn from_str(s: &str) -> Result<Self, String> {
        match s.trim().to_ascii_lowercase().as_str() {
            "text" | "txt" => Ok(Format::Text),
            "markdown" | "md" => Ok(Format::Markdown),
            "html" | "htm" => Ok(Format::Html),
            other => Err(format!(
                "'{other}' is not a report format; use text, markdown or html"
            )),
        }
    }
}

fn written<T: Serialize>(v: &T) -> String {
    serde_json::to_value(v)
        .ok()
        .and_then(|v| v.as_str().map(str::to_string))
        .unwrap_or_default()
}

fn len(l: Length, u: Unit) -> String {
    l.show(u)
}

fn kind_text(f: &Feature) -> String {
    match f.kind {
        FeatureKind::Plain => "plain angle".into(),
        FeatureKind::Taper => {
            let given = f
                .taper
                .as_ref()
                .map_or(String::new(), |t| format!(" {}", t.given()));
            format!("taper{given}")
        }
        FeatureKind::Compound => f.compound.as_ref().map_or("compound".into(), |c| {
            let (n, far) = c.plate_angles();
            format!(
                "compound angle: near plate (view {}) set to {}, other plate to {}",
                c.letters().0,
                n.dms(0),
                far.dms(1)
            )
        }),
    }
}

/// The angle as the features table shows it.
fn angle_cell(f: &Feature) -> String {
    match f.kind {
        FeatureKind::Plain => f.setting_angle().map_or("—".into(), |a| a.dms(0)),
        _ => f.angle_words(),
    }
}

fn stack_text(s: &Stack, u: Unit) -> String {
    let blocks: Vec<String> = s
        .blocks
        .iter()
        .map(|b| {
            let n = b.size.number(u, u.places());
            if b.protector { format!("{n}(p)") } else { n }
        })
        .collect();
    format!("{} = {}", blocks.join(" + "), len(s.height, u))
}

fn who_when(by: &str, at: &Stamp) -> String {
    format!("{by}, {}", at.short())
}

/// Build the report as a format-neutral document.
pub fn document(t: &Traveller) -> Doc {
    let u = t.job.unit;
    let mut d = Doc::default();
    let j = &t.job;
    d.push(Block::Title(format!("Traveller {} — {}", j.id, j.part)));
    let (done, total) = t.progress();
    let mut fields = vec![
        ("Job".to_string(), j.id.clone()),
        ("Part".into(), j.part.clone()),
    ];
    if !j.drawing.is_empty() {
        let rev = if j.revision.is_empty() {
            String::new()
        } else {
            format!(" rev {}", j.revision)
        };
        fields.push(("Drawing".into(), format!("{}{rev}", j.drawing)));
    }
    if !j.material.is_empty() {
        fields.push(("Material".into(), j.material.clone()));
    }
    fields.push(("Quantity".into(), j.quantity.to_string()));
    fields.push(("Units".into(), u.symbol().to_string()));
    fields.push((
        "Progress".into(),
        format!("{done} of {total} features finished"),
    ));
    let flagged = t
        .features
        .iter()
        .filter(|f| !flags(t, f).is_empty())
        .count();
    fields.push(("Flagged".into(), format!("{flagged} feature(s)")));
    if !j.notes.is_empty() {
        fields.push(("Notes".into(), j.notes.clone()));
    }
    d.push(Block::Fields(fields));

    d.push(Block::Heading("Features".into()));
    let rows = t
        .features
        .iter()
        .map(|f| {
            let v = f
                .accepted_attempt()
                .and_then(|a| a.judgement.as_ref())
                .map_or("—".to_string(), |j| j.final_verdict().label().to_string());
            vec![
                f.id.clone(),
                f.name.clone(),
                angle_cell(f),
                f.tolerance.to_string(),
                f.state.label().to_string(),
                v,
                f.attempts.len().to_string(),
                flags(t, f).len().to_string(),
            ]
        })
        .collect();
    d.push(Block::Table {
        head: [
            "Id",
            "Feature",
            "Angle",
            "Tolerance",
            "State",
            "Verdict",
            "Attempts",
            "Flags",
        ]
        .map(String::from)
        .to_vec(),
        rows,
    });

    for f in &t.features {
        feature_section(t, f, u, &mut d);
    }
    equipment(t, u, &mut d);
    records(t, &mut d);
    d
}

fn feature_section(t: &Traveller, f: &Feature, u: Unit, d: &mut Doc) {
    d.push(Block::Heading(format!("{} — {}", f.id, f.name)));
    let mut rows: Vec<(String, String)> = Vec::new();
    if !f.description.is_empty() {
        rows.push(("Description".into(), f.description.clone()));
    }
    rows.push((
        "Kind".into(),
        format!("{}; {}", kind_text(f), written(&f.work).replace('_', " ")),
    ));
    rows.push(("Nominal".into(), nominal_row(f)));
    rows.push(("Tolerance".into(), f.tolerance.to_string()));
    rows.push(("State".into(), f.state.label().into()));
    rows.push(("Attempts".into(), f.attempts.len().to_string()));
    let a = f.accepted_attempt().or(f.current_attempt());
    if let Some(a) = a {
        rows.push(("Attempt shown".into(), a.number.to_string()));
        if let Some(c) = &a.fixture {
            let fx = t.fixture(&c.id).map_or(String::new(), |x| {
                format!(" (C = {})", x.centre.show_fine(u))
            });
            rows.push(("Fixture".into(), format!("{}{fx}", c.id)));
        }
        if let Some(c) = &a.block_set {
            let g = t
                .block_set(&c.id)
                .map_or(String::new(), |x| format!(" (grade {})", x.grade));
            rows.push(("Block set".into(), format!("{}{g}", c.id)));
        }
        stack_rows(f, a, u, &mut rows);
        if let Some(j) = &a.judgement {
            judgement_rows(f, j, u, &mut rows);
            let rule = written(&j.rule);
            let over = if j.view_b.is_some() {
                " over both views"
            } else {
                ""
            };
            rows.push((
                "Verdict".into(),
                format!("{}{over} ({rule} rule)", j.verdict.label()),
            ));
            if let Some(dd) = &j.doubt_decision {
                rows.push((
                    "Lead's decision".into(),
                    format!(
                        "{} — {} ({})",
                        dd.verdict.label(),
                        dd.reason,
                        who_when(&dd.by, &dd.at)
                    ),
                ));
            }
            rows.push(("Judged by".into(), who_when(&j.by, &j.at)));
        }
        if !a.note.is_empty() {
            rows.push(("Note".into(), a.note.clone()));
        }
    }
    for s in t
        .signoffs
        .iter()
        .filter(|s| s.feature.as_deref() == Some(f.id.as_str()))
    {
        rows.push((
            "Signed".into(),
            format!("{} ({})", who_when(&s.by, &s.at), written(&s.role)),
        ));
    }
    let fl = flags(t, f);
    rows.push((
        "Flags".into(),
        if fl.is_empty() {
            "none".into()
        } else {
            fl.iter().map(Flag::describe).collect::<Vec<_>>().join("; ")
        },
    ));
    d.push(Block::Fields(rows));
    if f.attempts.len() > 1 {
        let rows = f
            .attempts
            .iter()
            .map(|a| {
                let j = a.judgement.as_ref();
                vec![
                    a.number.to_string(),
                    attempt_stack_cell(a, u),
                    j.map_or("—".into(), |j| match &j.view_b {
                        Some(v) => format!(
                            "{} / {}",
                            j.deviation.arcsec_signed(1),
                            v.deviation.arcsec_signed(1)
                        ),
                        None => j.deviation.arcsec_signed(1),
                    }),
                    j.map_or("—".into(), |j| j.verdict.label().to_string()),
                    j.map_or("—".into(), |j| {
                        let one = |c: &Correction| {
                            format!("{} → {}", c.delta.show_fine(u), len(c.height, u))
                        };
                        let other = j.view_b.as_ref().and_then(|v| v.correction.as_ref());
                        match (&j.correction, other) {
                            (Some(n), Some(o)) => format!("near {}; other {}", one(n), one(o)),
                            (Some(c), None) => one(c),
                            _ => "—".into(),
                        }
                    }),
                    a.note.clone(),
                ]
            })
            .collect();
        d.push(Block::Table {
            head: [
                "Attempt",
                "Stack",
                "Deviation",
                "Verdict",
                "Correction",
                "Note",
            ]
            .map(String::from)
            .to_vec(),
            rows,
        });
    }
}

fn equipment(t: &Traveller, u: Unit, d: &mut Doc) {
    if t.fixtures.is_empty() && t.block_sets.is_empty() {
        return;
    }
    d.push(Block::Heading("Equipment".into()));
    let mut rows: Vec<Vec<String>> = t
        .fixtures
        .iter()
        .map(|f| {
            vec![
                f.id.clone(),
                written(&f.kind).replace('_', " "),
                format!("C = {}", f.centre.show_fine(u)),
                f.due.map_or("—".into(), |d| d.to_string()),
            ]
        })
        .collect();
    rows.extend(t.block_sets.iter().map(|s| {
        let mut w = format!("grade {}", s.grade);
        if !s.missing.is_empty() {
            w.push_str(&format!(", {} missing", s.missing.len()));
        }
        if !s.worn.is_empty() {
            w.push_str(&format!(", {} worn", s.worn.len()));
        }
        vec![
            s.id.clone(),
            "block set".into(),
            w,
            s.due.map_or("—".into(), |d| d.to_string()),
        ]
    }));
    d.push(Block::Table {
        head: ["Id", "Kind", "Values", "Calibration due"]
            .map(String::from)
            .to_vec(),
        rows,
    });
}

fn records(t: &Traveller, d: &mut Doc) {
    if !t.handovers.is_empty() {
        d.push(Block::Heading("Handover notes".into()));
        d.push(Block::List(
            t.handovers
                .iter()
                .map(|h| {
                    let read: Vec<String> = h.read_by.iter().map(|m| m.by.clone()).collect();
                    let read = if read.is_empty() {
                        "not yet read".into()
                    } else {
                        format!("read by {}", read.join(", "))
                    };
                    format!("{} — {} ({read})", who_when(&h.by, &h.at), h.text)
                })
                .collect(),
        ));
    }
    if !t.notes.is_empty() {
        d.push(Block::Heading("Notes".into()));
        d.push(Block::List(
            t.notes
                .iter()
                .map(|n| {
                    let on = n
                        .feature
                        .as_ref()
                        .map_or(String::new(), |f| format!("[{f}] "));
                    format!("{on}{} — {}", who_when(&n.by, &n.at), n.text)
                })
                .collect(),
        ));
    }
    if !t.returns.is_empty() {
        d.push(Block::Heading("Returned by the lead".into()));
        d.push(Block::List(
            t.returns
                .iter()
                .map(|r| {
                    let on = r.feature.as_ref().map_or("job".to_string(), |f| f.clone());
                    format!("{on}: {} — {}", who_when(&r.by, &r.at), r.comment)
                })
                .collect(),
        ));
    }
    if !t.signoffs.is_empty() {
        d.push(Block::Heading("Sign-offs".into()));
        d.push(Block::Table {
            head: ["Scope", "By", "Role", "When", "Digest"]
                .map(String::from)
                .to_vec(),
            rows: t
                .signoffs
                .iter()
                .map(|s| {
                    vec![
                        s.feature.clone().unwrap_or_else(|| "job".into()),
                        s.by.clone(),
                        written(&s.role),
                        s.at.short(),
                        s.digest.chars().take(16).collect(),
                    ]
                })
                .collect(),
        });
    }
    d.push(Block::Para(format!(
        "{} events in the log.",
        t.events.len()
    )));
}

/// Render the report in `format`.
pub fn render(t: &Traveller, format: Format) -> String {
    let d = document(t);
    match format {
        Format::Text => d.text(),
        Format::Markdown => d.markdown(),
        Format::Html => html::page(&d, &format!("Traveller {} — {}", t.job.id, t.job.part)),
    }
}
