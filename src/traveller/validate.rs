//! Checks a traveller beyond its shape: unique ids, angles in range, sane tolerances, fixtures
//! and sets that exist in the file, readings that fit their mode, numbers that agree with each
//! other, states that can follow each other, events in time order, and signed values unchanged.

mod flow;
mod numbers;

pub use numbers::decide;
use numbers::{judgement, stack, sweep};

use super::locate::{Locator, Pos};
use super::model::*;
use super::schema;
use crate::units::Angle;
use std::collections::HashMap;

/// One problem found in a traveller file, with where it is.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Problem {
    pub line: usize,
    pub col: usize,
    /// The key path it concerns, e.g. `features[1].tolerance` (empty for the whole file).
    pub path: String,
    pub message: String,
}

impl std::fmt::Display for Problem {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "{}:{}: {}", self.line, self.col, self.message)
    }
}

/// Widest tolerance taken as sane, either side (common practice (no source): drawing angle
/// tolerances are minutes, a few degrees at most).
pub const MAX_TOLERANCE_DEG: f64 = 5.0;
/// How far a stored angle may differ from one recomputed from stored numbers (the YAML keeps
/// angles to 0.001"; this leaves room for that rounding).
pub const ANGLE_SLACK_ARCSEC: f64 = 0.05;

/// Read and check a traveller's text: every problem found, in file order.
pub fn check_text(text: &str) -> Vec<Problem> {
    match schema::parse(text) {
        Err(e) => {
            let p = e.pos();
            vec![Problem {
                line: p.line,
                col: p.col,
                path: String::new(),
                message: e.message(),
            }]
        }
        Ok(l) => validate(&l.traveller, &l.locator),
    }
}

/// Collects problems, placing each at its key path.
pub(crate) struct Out<'a> {
    loc: &'a Locator,
    pub(crate) list: Vec<Problem>,
}

impl Out<'_> {
    pub(crate) fn at(&mut self, path: &str, message: impl Into<String>) {
        let Pos { line, col } = self.loc.find(path);
        self.list.push(Problem {
            line,
            col,
            path: path.to_string(),
            message: message.into(),
        });
    }
    pub(crate) fn line_of(&self, path: &str) -> usize {
        self.loc.find(path).line
    }
}

/// Check a traveller read from a file whose positions `loc` knows.
pub fn validate(t: &Traveller, loc: &Locator) -> Vec<Problem> {
    let mut out = Out {
        loc,
        list: Vec::new(),
    };
    job(t, &mut out);
    equipment(t, &mut out);
    let mut seen: HashMap<&str, usize> = HashMap::new();
    for (i, f) in t.features.iter().enumerate() {
        let p = format!("features[{i}]");
        if f.id.trim().is_empty() {
            out.at(
                &format!("{p}.id"),
                "the feature id is empty; give a short id, e.g. `id: F1`",
            );
        } else if let Some(first) = seen.get(f.id.as_str()) {
            let line = out.line_of(&format!("features[{first}].id"));
            out.at(
                &format!("{p}.id"),
                format!("feature id `{}` is used twice (first on line {line}); give each feature its own id, e.g. F{}", f.id, t.features.len() + 1),
            );
        } else {
            seen.insert(&f.id, i);
        }
        feature(t, f, &p, &mut out);
    }
    if t.features.is_empty() {
        out.at(
            "features",
            "the job has no features; list at least one under `features:`",
        );
    }
    flow::log_and_signoffs(t, &mut out);
    out.list.sort_by_key(|p| (p.line, p.col));
    out.list
}

fn job(t: &Traveller, out: &mut Out) {
    if t.job.id.trim().is_empty() {
        out.at(
            "job.id",
            "the job id is empty; give the job number, e.g. `id: J-1042`",
        );
    }
    if t.job.part.trim().is_empty() {
        out.at(
            "job.part",
            "the part is empty; name the part, e.g. `part: DS-204 dovetail slide`",
        );
    }
    if t.job.quantity == 0 {
        out.at(
            "job.quantity",
            "quantity is 0; give how many parts the job makes, e.g. `quantity: 4`",
        );
    }
}

fn equipment(t: &Traveller, out: &mut Out) {
    let mut ids: HashMap<&str, usize> = HashMap::new();
    for (i, f) in t.fixtures.iter().enumerate() {
        let p = format!("fixtures[{i}]");
        if ids.insert(&f.id, i).is_some() {
            out.at(
                &format!("{p}.id"),
                format!(
                    "fixture id `{}` is listed twice; keep one snapshot per fixture",
                    f.id
                ),
            );
        }
        if f.centre.nm() <= 0 {
            out.at(
                &format!("{p}.centre"),
                "the centre distance must be more than zero, e.g. `centre: 5.0000 in`",
            );
        }
        for (k, d) in [("roll_pivot", f.roll_pivot), ("roll_stack", f.roll_stack)] {
            if d.nm() <= 0 {
                out.at(
                    &format!("{p}.{k}"),
                    format!("{k} must be more than zero, e.g. `{k}: 0.7500 in`"),
                );
            }
        }
        if let (Some(c), Some(d)) = (f.calibrated, f.due)
            && d < c
        {
            out.at(
                &format!("{p}.due"),
                format!("calibration due {d} is before it was calibrated ({c}); check the dates"),
            );
        }
        if let Some(a) = f.max_angle
            && (a.deg() <= 0.0 || a.deg() >= 90.0)
        {
            out.at(
                &format!("{p}.max_angle"),
                "max_angle must be between 0° and 90°, e.g. `max_angle: 60`",
            );
        }
    }
    let mut ids: HashMap<&str, usize> = HashMap::new();
    for (i, s) in t.block_sets.iter().enumerate() {
        let p = format!("block_sets[{i}]");
        if ids.insert(&s.id, i).is_some() {
            out.at(
                &format!("{p}.id"),
                format!(
                    "block set id `{}` is listed twice; keep one snapshot per set",
                    s.id
                ),
            );
        }
        if s.grade.trim().is_empty() {
            out.at(
                &format!("{p}.grade"),
                "the set's grade is empty; give it as on its certificate, e.g. `grade: \"0\"`",
            );
        }
        if let (Some(c), Some(d)) = (s.calibrated, s.due)
            && d < c
        {
            out.at(
                &format!("{p}.due"),
                format!("calibration due {d} is before it was calibrated ({c}); check the dates"),
            );
        }
        for (k, list) in [("missing", &s.missing), ("worn", &s.worn)] {
            for (j, b) in list.iter().enumerate() {
                if b.nm() <= 0 {
                    out.at(
                        &format!("{p}.{k}[{j}]"),
                        "a block size must be more than zero, e.g. 0.1005 in",
                    );
                }
            }
        }
    }
}

/// 0 ≤ θ < 90.
fn angle_in_range(out: &mut Out, path: &str, a: Angle, what: &str) {
    if !(a.deg().is_finite() && a.deg() >= 0.0 && a.deg() < 90.0) {
        out.at(path, format!("{what} {} is outside 0° to under 90°; give the angle from the surface plate, e.g. 30°15'", a.dms(0)));
    }
}

fn feature(t: &Traveller, f: &Feature, p: &str, out: &mut Out) {
    if f.name.trim().is_empty() {
        out.at(
            &format!("{p}.name"),
            "the feature name is empty; describe it, e.g. `name: dovetail flank`",
        );
    }
    if let Some(n) = f.nominal {
        angle_in_range(out, &format!("{p}.nominal"), n, "nominal");
    }
    match f.kind {
        FeatureKind::Plain => {
            if f.nominal.is_none() {
                out.at(p, format!("feature {} has no nominal angle; add e.g. `nominal: 30°15'`", f.id));
            }
            if f.taper.is_some() {
                out.at(&format!("{p}.taper"), "a taper is given but the kind is plain; add `kind: taper`");
            }
            if f.compound.is_some() {
                out.at(&format!("{p}.compound"), "a compound angle is given but the kind is plain; add `kind: compound`");
            }
        }
        FeatureKind::Taper => match &f.taper {
            None => out.at(p, "kind is taper but there is no `taper:`; add e.g. `taper: { ratio: \"1:20\" }`"),
            Some(tp) => match tp.half_angle() {
                Err(e) => out.at(&format!("{p}.taper"), e),
                Ok(h) => {
                    angle_in_range(out, &format!("{p}.taper"), h, "the taper's half angle");
                    if let Some(n) = f.nominal
                        && (n.arcsec() - h.arcsec()).abs() > 1.0
                    {
                        out.at(&format!("{p}.nominal"), format!("nominal {} differs from the taper's half angle {}; leave nominal out or correct it", n.dms(1), h.dms(1)));
                    }
                }
            },
        },
        FeatureKind::Compound => match &f.compound {
            None => out.at(p, "kind is compound but there is no `compound:`; add e.g. `compound: { a: 20, b: 15 }`"),
            Some(c) => {
                angle_in_range(out, &format!("{p}.compound.a"), c.a, "view angle A");
                angle_in_range(out, &format!("{p}.compound.b"), c.b, "view angle B");
            }
        },
    }
    tolerance(f, p, out);
    for (k, a) in f.attempts.iter().enumerate() {
        attempt(t, f, a, &format!("{p}.attempts[{k}]"), k, out);
    }
    flow::state_matches_content(t, f, p, out);
}

fn tolerance(f: &Feature, p: &str, out: &mut Out) {
    let tol = f.tolerance;
    let path = format!("{p}.tolerance");
    if tol.plus.deg() < 0.0
        || tol.minus.deg() < 0.0
        || !tol.plus.deg().is_finite()
        || !tol.minus.deg().is_finite()
    {
        out.at(
            &path,
            "tolerance sides must be amounts, e.g. `tolerance: \"+0°02'/-0°00'\"`",
        );
    } else if tol.plus.deg() + tol.minus.deg() == 0.0 {
        out.at(&path, "the tolerance is zero, so nothing can pass; give the drawing's tolerance, e.g. `tolerance: \"±0°05'\"`");
    } else if tol.plus.deg() > MAX_TOLERANCE_DEG || tol.minus.deg() > MAX_TOLERANCE_DEG {
        out.at(&path, format!("tolerance {tol} is wider than {MAX_TOLERANCE_DEG}°; angle tolerances are usually minutes, e.g. `tolerance: \"±0°05'\"`; check the drawing"));
    }
}

fn known_id<'a>(
    out: &mut Out,
    path: &str,
    what: &str,
    id: &str,
    known: impl Iterator<Item = &'a str>,
    under: &str,
) {
    let ids: Vec<String> = known.map(str::to_string).collect();
    if ids.iter().any(|k| k == id) {
        return;
    }
    let hint = match schema::suggest(id, &ids) {
        Some(s) => format!(" (did you mean `{s}`?)"),
        None => String::new(),
    };
    out.at(path, format!("{what} `{id}` is not among the {under} in this file{hint}; add its snapshot under `{under}:` or correct the id"));
}

fn attempt(t: &Traveller, f: &Feature, a: &Attempt, p: &str, k: usize, out: &mut Out) {
    if a.number as usize != k + 1 {
        out.at(
            &format!("{p}.number"),
            format!(
                "attempt {} is listed as number {} ; number attempts 1, 2, 3… in order",
                k + 1,
                a.number
            ),
        );
    }
    let fixture = a.fixture.as_ref().and_then(|c| t.fixture(&c.id));
    if let Some(c) = &a.fixture {
        known_id(
            out,
            &format!("{p}.fixture.id"),
            "fixture",
            &c.id,
            t.fixtures.iter().map(|x| x.id.as_str()),
            "fixtures",
        );
        if let Some(fx) = fixture
            && let Some(due) = fx.due
            && c.at.date() > due
            && c.reason.trim().is_empty()
        {
            out.at(&format!("{p}.fixture"), format!("fixture {} was out of calibration (due {due}) when chosen on {}; record why it was used in `reason:`", fx.id, c.at.date()));
        }
    }
    if let Some(c) = &a.block_set {
        known_id(
            out,
            &format!("{p}.block_set.id"),
            "block set",
            &c.id,
            t.block_sets.iter().map(|x| x.id.as_str()),
            "block_sets",
        );
        if let Some(s) = t.block_set(&c.id)
            && let Some(due) = s.due
            && c.at.date() > due
            && c.reason.trim().is_empty()
        {
            out.at(&format!("{p}.block_set"), format!("block set {} was out of calibration (due {due}) when chosen on {}; record why it was used in `reason:`", s.id, c.at.date()));
        }
    }
    let under = a.stack_pivot.as_ref().map(|x| x.block_total());
    if let Some(s) = &a.stack {
        stack(s, fixture, under, &format!("{p}.stack"), out);
    }
    if let Some(s) = &a.stack_b {
        stack(s, fixture, None, &format!("{p}.stack_b"), out);
        if f.kind != FeatureKind::Compound {
            out.at(&format!("{p}.stack_b"), "a second stack is only for compound angles; remove `stack_b:` or set `kind: compound`");
        }
    }
    if let Some(s) = &a.stack_pivot {
        let path = format!("{p}.stack_pivot");
        if f.kind == FeatureKind::Compound {
            out.at(&path, "a compound angle's second stack is `stack_b:` (the other plate); remove `stack_pivot:`");
        }
        match &a.stack {
            None => out.at(&path, "a stack under the pivot roll needs the one under the raised roll in `stack:`; add it or remove `stack_pivot:`"),
            Some(r) if r.block_total() <= s.block_total() => out.at(&path, "the stack under the pivot roll must be lower than the one under the raised roll (their difference sets the angle); check which is which"),
            Some(r) => {
                stack(s, None, None, &path, out);
                // both record the angle their difference sets
                if (s.achieved.arcsec() - r.achieved.arcsec()).abs() > ANGLE_SLACK_ARCSEC {
                    out.at(&format!("{path}.achieved"), format!("the two stacks set one angle, but they record {} and {}; give both the angle of their difference", r.achieved.dms(2), s.achieved.dms(2)));
                }
            }
        }
    }
    if let Some(s) = &a.sweep {
        sweep(s, &format!("{p}.sweep"), out);
    }
    if let Some(s) = &a.sweep_b {
        sweep(s, &format!("{p}.sweep_b"), out);
        if f.kind != FeatureKind::Compound {
            out.at(&format!("{p}.sweep_b"), "a second sweep is only for compound angles (the other view); remove `sweep_b:` or set `kind: compound`");
        }
    }
    if let Some(j) = &a.judgement {
        judgement(f, a, j, &format!("{p}.judgement"), out);
    }
    let needs = |step: Step, what: &str, has: bool, out: &mut Out| {
        if a.step > step && !has {
            out.at(&format!("{p}.step"), format!("work stopped at step `{}` but this attempt has no {what}; set `step:` to where work really stopped", step_name(a.step)));
        }
    };
    needs(Step::Fixture, "fixture", a.fixture.is_some(), out);
    needs(Step::BlockSet, "block set", a.block_set.is_some(), out);
    needs(Step::Stack, "stack", a.stack.is_some(), out);
    needs(Step::Sweep, "sweep", a.sweep.is_some(), out);
    needs(Step::Verdict, "verdict", a.judgement.is_some(), out);
}

pub(crate) fn step_name(s: Step) -> String {
    serde_json::to_value(s)
        .ok()
        .and_then(|v| v.as_str().map(str::to_string))
        .unwrap_or_default()
}
