//! The small-angle remedies in the report: side by side, the chosen one's stacks, and the JSON.

use super::super::{CliError, usage};
use super::RemedyChoice;
use super::angle::Ctx;
use super::show::{blocks_json, closing, num, round_deg, round2, row, set_words, stack_json};
use super::show::{secs, stack_text, worn_note};
use crate::blocks::Stack;
use crate::blocks::small::{Remedy, Single, SmallAngle};
use crate::units::{Angle, Length, Unit};
use serde_json::{Value, json};

/// The word for a `--remedy` value, as typed.
pub fn choice_words(c: RemedyChoice) -> &'static str {
    match c {
        RemedyChoice::Best => "best",
        RemedyChoice::TwoStacks => "two-stacks",
        RemedyChoice::Longer => "longer",
        RemedyChoice::Single => "single",
    }
}

/// Apply `--remedy`: keep the best, or take the one asked for (exit 1 when it cannot be built).
pub fn pick(sa: &mut SmallAngle, choice: RemedyChoice, unit: Unit) -> Result<(), CliError> {
    let asked = |what: &str, e: Angle| {
        format!(
            "{what}, as asked with --remedy {} (error {})",
            choice_words(choice),
            secs(e)
        )
    };
    match choice {
        RemedyChoice::Best => {
            if sa.chosen_error().is_none() {
                return Err(CliError::Unmet(format!(
                    "{}; and no remedy could be built: two stacks: {}; no longer fixture in the shop builds it. Use another set or fixture",
                    sa.reason,
                    sa.two_stacks
                        .as_ref()
                        .err()
                        .map(|e| e.to_string())
                        .unwrap_or_default()
                )));
            }
        }
        RemedyChoice::TwoStacks => match &sa.two_stacks {
            Ok(t) => {
                sa.why = asked("two stacks on this fixture", t.error);
                sa.chosen = Remedy::TwoStacks;
            }
            Err(e) => return Err(CliError::Unmet(format!("--remedy two-stacks: {e}"))),
        },
        RemedyChoice::Longer => {
            let Some((i, id, e)) = sa.longer.iter().enumerate().find_map(|(i, l)| {
                l.result
                    .as_ref()
                    .ok()
                    .map(|s| (i, l.candidate.id.clone(), s.error))
            }) else {
                let tried: Vec<String> = sa
                    .longer
                    .iter()
                    .map(|l| {
                        format!(
                            "{}: {}",
                            l.candidate.id,
                            l.result.as_ref().err().cloned().unwrap_or_default()
                        )
                    })
                    .collect();
                return Err(CliError::Unmet(format!(
                    "--remedy longer: no fixture in the shop with a longer centre distance builds this angle from the set{}; add one to the shop file or use --remedy two-stacks",
                    if tried.is_empty() {
                        String::new()
                    } else {
                        format!(" ({})", tried.join("; "))
                    }
                )));
            };
            sa.why = asked(&format!("one stack on the longer fixture {id}"), e);
            sa.chosen = Remedy::Longer(i);
        }
        RemedyChoice::Single => match &sa.nearest {
            Some(s) => {
                sa.why = asked("the nearest single stack on this fixture", s.error);
                sa.chosen = Remedy::Nearest;
            }
            None => {
                return Err(usage(format!(
                    "--remedy single: the set makes no single stack near this height in {}; use --remedy best",
                    unit.symbol()
                )));
            }
        },
    }
    Ok(())
}

/// The chosen single stack (longer fixture or nearest), with the fixture's id when longer.
fn chosen_single(sa: &SmallAngle) -> Option<(&Single, Option<&str>, Option<Length>)> {
    match sa.chosen {
        Remedy::Longer(i) => sa.longer.get(i).and_then(|l| {
            l.result.as_ref().ok().map(|s| {
                (
                    s,
                    Some(l.candidate.id.as_str()),
                    Some(l.candidate.fixture.center),
                )
            })
        }),
        Remedy::Nearest => sa.nearest.as_ref().map(|s| (s, None, None)),
        Remedy::TwoStacks => None,
    }
}

/// Warnings that come with the chosen remedy.
pub fn warnings(sa: &SmallAngle, unit: Unit) -> Vec<String> {
    let mut w = Vec::new();
    match sa.chosen {
        Remedy::TwoStacks => {
            if let Ok(t) = &sa.two_stacks {
                if t.protectors_left_off {
                    w.push("protector blocks are left off: a set has one pair, and two stacks are wrung".into());
                }
                w.extend(worn_note(&[&t.raised, &t.pivot], unit));
            }
        }
        Remedy::Longer(i) => {
            if let Some(l) = sa.longer.get(i) {
                if let Some(n) = &l.candidate.note {
                    w.push(format!("fixture {}: {n}", l.candidate.id));
                }
                if let Ok(s) = &l.result {
                    if s.nearest_only {
                        w.push(format!(
                            "on fixture {} the set makes only the nearest height, not the rounded one",
                            l.candidate.id
                        ));
                    }
                    w.extend(worn_note(&[&s.stack], unit));
                }
            }
        }
        Remedy::Nearest => {
            if let Some(s) = &sa.nearest {
                w.push(format!(
                    "the single stack is the nearest height the set makes: the angle is off by {}",
                    secs(s.error)
                ));
                w.extend(worn_note(&[&s.stack], unit));
            }
        }
    }
    w
}

fn remedy_word(r: Remedy) -> &'static str {
    match r {
        Remedy::TwoStacks => "two stacks",
        Remedy::Longer(_) => "longer fixture",
        Remedy::Nearest => "nearest stack",
    }
}

/// One remedy as a row of the side-by-side table.
struct Row {
    remedy: Remedy,
    /// The longer fixture: id, centre distance, the unit it is written in.
    fixture: Option<(String, Length, Unit)>,
    /// What it builds, if it can: height (the difference for two stacks), angle, error, blocks.
    built: Option<(Length, Angle, Angle, usize)>,
    note: Option<String>,
}

fn options(sa: &SmallAngle) -> Vec<Row> {
    let mut v = Vec::new();
    v.push(match &sa.two_stacks {
        Ok(t) => Row {
            remedy: Remedy::TwoStacks,
            fixture: None,
            built: Some((t.height, t.achieved, t.error, t.block_count())),
            note: None,
        },
        Err(e) => Row {
            remedy: Remedy::TwoStacks,
            fixture: None,
            built: None,
            note: Some(e.to_string()),
        },
    });
    for (i, l) in sa.longer.iter().enumerate() {
        let c = &l.candidate;
        let fixture = Some((c.id.clone(), c.fixture.center, c.unit));
        v.push(match &l.result {
            Ok(s) => Row {
                remedy: Remedy::Longer(i),
                fixture,
                built: Some((s.stack.height, s.achieved, s.error, s.stack.block_count())),
                note: s
                    .nearest_only
                    .then(|| "the nearest height the set makes".to_string())
                    .into_iter()
                    .chain(c.note.clone())
                    .reduce(|a, b| format!("{a}; {b}")),
            },
            Err(e) => Row {
                remedy: Remedy::Longer(i),
                fixture,
                built: None,
                note: Some(e.clone()),
            },
        });
    }
    v.push(match &sa.nearest {
        Some(s) => Row {
            remedy: Remedy::Nearest,
            fixture: None,
            built: Some((s.stack.height, s.achieved, s.error, s.stack.block_count())),
            note: None,
        },
        None => Row {
            remedy: Remedy::Nearest,
            fixture: None,
            built: None,
            note: Some("the set makes no stack near this height".into()),
        },
    });
    v
}

/// Put the chosen remedy's values in the JSON object and add `small_angle`.
pub fn fill_json(v: &mut Value, sa: &SmallAngle, ctx: &Ctx) {
    let u = ctx.unit;
    let setting = ctx.advice.nominal;
    v["setup"] = json!(remedy_word(sa.chosen));
    v["complement"] = Value::Null;
    let all: Vec<Value> = options(sa)
        .into_iter()
        .map(|r| {
            let b = r.built;
            json!({
                "remedy": remedy_word(r.remedy),
                "chosen": r.remedy == sa.chosen,
                "fixture": r.fixture.as_ref().map(|f| f.0.clone()),
                "center": r.fixture.as_ref().map(|f| num(f.1, u)),
                "height": b.map(|b| num(b.0, u)),
                "achieved_deg": b.map(|b| round_deg(b.1)),
                "error_arcsec": b.map(|b| round2(b.2.arcsec())),
                "block_count": b.map(|b| b.3),
                "available": b.is_some(),
                "note": r.note,
            })
        })
        .collect();
    v["small_angle"] = json!({
        "reason": sa.reason,
        "half_step_arcsec": round2(sa.half_step.arcsec()),
        "chosen": remedy_word(sa.chosen),
        "why": sa.why,
        "options": all,
    });
    let set_stack = |v: &mut Value, s: &Single, role: String| {
        v["ideal_height"] = json!(s.ideal_height.exact_number(u, u.places()));
        v["height"] = json!(num(s.stack.height, u));
        v["achieved_deg"] = json!(round_deg(s.achieved));
        v["error_arcsec"] = json!(round2(s.error.arcsec()));
        v["blocks"] = json!(blocks_json(&s.stack, u));
        v["block_count"] = json!(s.stack.block_count());
        v["worn_blocks"] = json!(worn(&[&s.stack], u));
        v["stacks"] = json!([stack_json(
            &role,
            s.stack.height,
            Some(&s.stack),
            Some(setting),
            u
        )]);
    };
    match sa.chosen {
        Remedy::TwoStacks => {
            if let Ok(t) = &sa.two_stacks {
                v["ideal_height"] = json!(t.ideal_height.exact_number(u, u.places()));
                v["height"] = json!(num(t.height, u));
                v["achieved_deg"] = json!(round_deg(t.achieved));
                v["error_arcsec"] = json!(round2(t.error.arcsec()));
                v["blocks"] = Value::Null;
                v["block_count"] = json!(t.block_count());
                v["worn_blocks"] = json!(worn(&[&t.raised, &t.pivot], u));
                v["protect"] = json!(false);
                v["stacks"] = json!([
                    stack_json(
                        &format!("{} (the taller)", ctx.raised_role()),
                        t.raised.height,
                        Some(&t.raised),
                        Some(setting),
                        u
                    ),
                    stack_json(
                        &pivot_role(ctx),
                        t.pivot.height,
                        Some(&t.pivot),
                        Some(setting),
                        u
                    ),
                ]);
            }
        }
        Remedy::Longer(i) => {
            if let (Some(l), Some((s, _, _))) = (sa.longer.get(i), chosen_single(sa)) {
                let f = &l.candidate.fixture;
                set_stack(
                    v,
                    s,
                    format!("under the raised roll of fixture {}", l.candidate.id),
                );
                v["fixture"] = json!(l.candidate.id);
                v["center"] = json!(num(f.center, u));
                v["sensitivity_arcsec_per_step"] =
                    json!(round2(f.sensitivity(setting, ctx.step).arcsec()));
            }
        }
        Remedy::Nearest => {
            if let Some(s) = &sa.nearest {
                set_stack(v, s, ctx.raised_role().to_string());
            }
        }
    }
}

fn worn(stacks: &[&Stack], u: Unit) -> Vec<String> {
    stacks
        .iter()
        .flat_map(|s| s.worn())
        .map(|w| num(w, u))
        .collect()
}

fn pivot_role(ctx: &Ctx) -> String {
    if ctx.asked.taper.is_some() {
        "under the pivot roll of the sine centres (the lower)".into()
    } else {
        "under the pivot roll (the lower)".into()
    }
}

/// The text report for a small angle.
pub fn text(sa: &SmallAngle, ctx: &Ctx) -> String {
    let u = ctx.unit;
    let d = &ctx.advice.direct;
    let setting = ctx.advice.nominal;
    let mut t = ctx.header();
    t.push_str(&row(
        "ideal height",
        format!("{} {u}", d.ideal_height.number(u, u.places() + 2)),
    ));
    t.push_str(&row(
        "sensitivity",
        format!(
            "{:.2}\" per {} {u} of stack",
            d.sensitivity.arcsec(),
            num(ctx.step, u)
        ),
    ));
    t.push_str(&format!("\nSmall angle: {}.\n", sa.reason));
    t.push_str("The remedies side by side:\n");
    let rows = options(sa);
    let label = |r: &Row| match (&r.remedy, &r.fixture) {
        (Remedy::TwoStacks, _) => "two stacks on this fixture".to_string(),
        (Remedy::Longer(_), Some((id, c, fu))) => {
            format!("one stack on fixture {id} ({})", c.show(*fu))
        }
        (Remedy::Longer(_), None) => "one stack on a longer fixture".to_string(),
        (Remedy::Nearest, _) => "nearest single stack on this fixture".to_string(),
    };
    let w = rows
        .iter()
        .map(|r| label(r).chars().count())
        .max()
        .unwrap_or(0)
        + 2;
    t.push_str(&format!(
        "  {:<w$}{:>12}{:>11}{:>8}\n",
        "", "height", "error", "blocks"
    ));
    for r in &rows {
        let mark = if r.remedy == sa.chosen { "*" } else { " " };
        let l = label(r);
        match r.built {
            Some((h, _, e, n)) => {
                t.push_str(&format!(
                    "{mark} {l:<w$}{:>12}{:>11}{n:>8}",
                    format!("{} {u}", num(h, u)),
                    secs(e)
                ));
                if let Some(note) = &r.note {
                    t.push_str(&format!("   ({note})"));
                }
                t.push('\n');
            }
            None => t.push_str(&format!(
                "{mark} {l:<w$}cannot: {}\n",
                r.note.clone().unwrap_or_default()
            )),
        }
    }
    t.push_str(&format!("Chosen (*): {}.\n", sa.why));
    let Some(c) = ctx.chosen else {
        t.push_str(&closing(ctx.warnings));
        return t;
    };
    t.push('\n');
    match sa.chosen {
        Remedy::TwoStacks => {
            if let Ok(two) = &sa.two_stacks {
                t.push_str(&format!("Two stacks from {}:\n", set_words(c)));
                t.push_str(&stack_text(
                    &two.raised,
                    u,
                    &format!(
                        "Stack {} (the taller), sets {}; wring bottom to top:",
                        ctx.raised_role(),
                        setting.dms(0)
                    ),
                ));
                t.push_str(&stack_text(
                    &two.pivot,
                    u,
                    &format!("Stack {}; wring bottom to top:", pivot_role(ctx)),
                ));
                t.push_str(&row(
                    "difference",
                    format!(
                        "{} {u} (taller − lower; the height for the angle)",
                        num(two.height, u)
                    ),
                ));
                t.push_str(&row("achieved angle", two.achieved));
                t.push_str(&row("error", secs(two.error)));
                t.push_str(
                    "Both stacks stand on the surface plate; no block is in both. Set the pivot roll \
on the lower stack and the raised roll on the taller one.\n",
                );
            }
        }
        Remedy::Longer(_) | Remedy::Nearest => {
            if let Some((s, id, center)) = chosen_single(sa) {
                let on = match (id, center) {
                    (Some(id), Some(c)) => {
                        format!("under the raised roll of fixture {id} ({} {u})", num(c, u))
                    }
                    _ => ctx.raised_role().to_string(),
                };
                t.push_str(&stack_text(
                    &s.stack,
                    u,
                    &format!(
                        "Stack {on}, sets {}, from {}; wring bottom to top:",
                        setting.dms(0),
                        set_words(c)
                    ),
                ));
                t.push_str(&row("achieved angle", s.achieved));
                t.push_str(&row("error", secs(s.error)));
            }
        }
    }
    t.push_str(&closing(ctx.warnings));
    t
}
