//! What the stack (or stacks) give, beside the list of blocks: the height, the achieved angle
//! and its error; for two stacks under the rolls their difference; for a compound angle each
//! plate, the view slopes they level and the true slope; a taper's half and included angles;
//! swaps, worn blocks and advice for steep angles.

use super::super::app::App;
use super::super::flow::stack::{parts, target_height};
use super::super::flow::{height_step, setting};
use super::super::rank::geometry;
use super::arcsec;
use crate::geometry::plan;
use crate::traveller::{Attempt, Compound, FeatureKind};
use crate::units::{Angle, Length, Unit};
use ratatui::text::{Line, Span};

fn row(app: &App, k: &str, v: String, rest: String) -> Line<'static> {
    let t = app.theme;
    Line::from(vec![
        Span::styled(format!("{k:<9}"), t.dim()),
        Span::styled(v, t.title()),
        Span::raw(rest),
    ])
}

/// The lines of the "What it gives" box.
pub fn figures(app: &App) -> Vec<Line<'static>> {
    let t = app.theme;
    let unit = app.unit();
    let mut d: Vec<Line> = Vec::new();
    let a = app.attempt();
    if let Some(a) = a.filter(|a| a.stack.is_some()) {
        if a.stack_b.is_some() {
            compound_lines(app, a, &mut d);
        } else if a.stack_pivot.is_some() {
            two_stack_lines(app, a, &mut d);
        } else {
            single_lines(app, a, &mut d);
        }
        if parts(a).iter().all(|(_, s)| s.built.is_some()) {
            d.push(Line::styled("✓ built and confirmed", t.good()));
        }
        for (_, s) in parts(a) {
            for w in &s.swaps {
                d.push(Line::styled(
                    format!("swapped {} for {}", w.planned.show(unit), w.used.show(unit)),
                    t.warn(),
                ));
            }
        }
        let worn: Vec<Length> = a
            .block_set
            .as_ref()
            .and_then(|c| app.shop.set(&c.id))
            .map(|s| s.worn().to_vec())
            .unwrap_or_default();
        if parts(a)
            .iter()
            .flat_map(|(_, s)| s.blocks.iter())
            .any(|b| !b.protector && worn.contains(&b.size))
        {
            d.push(Line::styled(
                "! a worn block is used: no stack of as many blocks avoids it",
                t.warn(),
            ));
        }
    }
    if let Some(a) = a {
        d.push(Line::styled(
            format!(
                "fixture {}  set {}",
                a.fixture.as_ref().map_or("?", |c| c.id.as_str()),
                a.block_set.as_ref().map_or("?", |c| c.id.as_str())
            ),
            t.dim(),
        ));
    }
    d.push(Line::styled(
        "Clean each face, wring with a sliding twist, bottom block first.",
        t.dim(),
    ));
    if let Some(n) = &app.ui.solve_note {
        d.push(Line::styled(format!("! {n}"), t.warn()));
    }
    if let Some(e) = &app.ui.solve_error {
        d.push(Line::styled(format!("✗ {e}"), t.bad()));
    }
    for w in advice(app) {
        d.push(Line::styled(format!("! {w}"), t.warn()));
    }
    d
}

fn single_lines(app: &App, a: &Attempt, d: &mut Vec<Line<'static>>) {
    let unit = app.unit();
    let Some(s) = a.stack.as_ref() else { return };
    let wrung = s.blocks.iter().filter(|b| b.wrung).count();
    d.push(row(
        app,
        "Height",
        s.height.show(unit),
        format!(
            "  {} block{}, {wrung} wrung",
            s.blocks.len(),
            if s.blocks.len() == 1 { "" } else { "s" }
        ),
    ));
    if let Ok(target) = target_height(app)
        && target != s.height
    {
        d.push(row(app, "Planned", target.show(unit), String::new()));
    }
    d.push(row(app, "Angle", s.achieved.dms(1), String::new()));
    aim_or_setting(app, s.achieved, d);
}

fn aim_or_setting(app: &App, achieved: Angle, d: &mut Vec<Line<'static>>) {
    let t = app.theme;
    match (aim(app), setting(app)) {
        (Some((aim, n, residual)), _) => {
            d.push(row(
                app,
                "Aim",
                aim.dms(1),
                format!("   error {}", arcsec(achieved - aim)),
            ));
            d.push(Line::styled(
                format!(
                    "corrected for attempt {n}: its setting less its residual {}",
                    arcsec(residual)
                ),
                t.dim(),
            ));
        }
        (None, Some(set)) => {
            d.push(row(
                app,
                "Setting",
                set.dms(0),
                format!("   error {}", arcsec(achieved - set)),
            ));
        }
        (None, None) => {}
    }
    if let Some(f) = app.feature().filter(|f| f.kind == FeatureKind::Taper)
        && let Some(Ok(half)) = f.taper.as_ref().map(|x| x.half_angle())
    {
        d.push(Line::styled(
            format!(
                "taper {}: the half angle {} is the setting; included {}",
                f.taper.as_ref().map(|x| x.given()).unwrap_or_default(),
                half.dms(0),
                Angle::from_deg(2.0 * half.deg()).dms(0)
            ),
            t.dim(),
        ));
    }
}

fn two_stack_lines(app: &App, a: &Attempt, d: &mut Vec<Line<'static>>) {
    let unit = app.unit();
    let (Some(r), Some(p)) = (a.stack.as_ref(), a.stack_pivot.as_ref()) else {
        return;
    };
    let count = |s: &crate::traveller::Stack| {
        format!(
            "  {} block{}, {} wrung",
            s.blocks.len(),
            if s.blocks.len() == 1 { "" } else { "s" },
            s.blocks.iter().filter(|b| b.wrung).count()
        )
    };
    d.push(row(app, "Raised", r.height.show(unit), count(r)));
    d.push(row(app, "Pivot", p.height.show(unit), count(p)));
    d.push(row(
        app,
        "Differ.",
        (r.height - p.height).show(unit),
        "  sets the angle".into(),
    ));
    d.push(row(app, "Angle", r.achieved.dms(1), String::new()));
    aim_or_setting(app, r.achieved, d);
}

fn compound_lines(app: &App, a: &Attempt, d: &mut Vec<Line<'static>>) {
    let t = app.theme;
    let unit = app.unit();
    let (Some(n), Some(o)) = (a.stack.as_ref(), a.stack_b.as_ref()) else {
        return;
    };
    let Some(c) = app.feature().and_then(|f| f.compound_angles()) else {
        return;
    };
    let Ok(set) = c.setting() else { return };
    let plate = |s: &crate::traveller::Stack, want: Angle| {
        format!("  {}  {}", s.achieved.dms(1), arcsec(s.achieved - want))
    };
    let (ln, lo) = c.letters();
    d.push(row(app, "Near", n.height.show(unit), plate(n, set.near)));
    d.push(row(app, "Other", o.height.show(unit), plate(o, set.other)));
    d.push(row(
        app,
        "Set to",
        format!("{} / {}", set.near.dms(0), set.other.dms(0)),
        String::new(),
    ));
    // the view slopes the two plates level, against the drawing's
    let (vn, vo) = Compound::views_levelled(n.achieved, o.achieved);
    let (wn, wo) = c.views();
    d.push(row(
        app,
        &format!("View {ln}"),
        vn.dms(1),
        format!("  {}", arcsec(vn - wn)),
    ));
    d.push(row(
        app,
        &format!("View {lo}"),
        vo.dms(1),
        format!("  {}", arcsec(vo - wo)),
    ));
    let achieved = crate::geometry::true_slope(vn, vo);
    d.push(row(
        app,
        "True",
        achieved.dms(0),
        format!("  wanted {}", set.true_slope.dms(0)),
    ));
    let plane = crate::blocks::plates::angle_between_planes((vn, vo), (wn, wo));
    let blocks = n.blocks.len() + o.blocks.len();
    d.push(Line::styled(
        format!(
            "plane off by {:.1}\"; {blocks} blocks, none in both",
            plane.arcsec()
        ),
        t.dim(),
    ));
}

/// For an attempt that follows a judged one on the same fixture: the angle to aim at (that
/// attempt's setting less its residual), the attempt's number and its residual.
pub fn aim(app: &App) -> Option<(Angle, u32, Angle)> {
    let f = app.feature()?;
    if f.compound_angles().is_some() {
        return None;
    }
    let a = f.current_attempt()?;
    let prev = f.attempts.iter().rev().nth(1)?;
    let same = prev.fixture.as_ref()?.id == a.fixture.as_ref()?.id;
    let j = prev.judgement.as_ref()?;
    let built = prev.stack.as_ref()?;
    same.then(|| (built.achieved - j.residual, prev.number, j.residual))
}

/// Steep-angle advice (the complement side by side) for this feature's fixture; for a compound
/// angle, what each plate's angle needs.
pub fn advice(app: &App) -> Vec<String> {
    let (Some(a), Some(angle)) = (app.attempt(), setting(app)) else {
        return Vec::new();
    };
    let Some(fx) = a.fixture.as_ref().and_then(|c| app.doc.fixture(&c.id)) else {
        return Vec::new();
    };
    let unit: Unit = app.unit();
    let geo = geometry(fx);
    if let Some(c) = app.feature().and_then(|f| f.compound_angles()) {
        let mut out: Vec<String> = Vec::new();
        let Ok(set) = c.setting() else {
            return out;
        };
        for (word, angle) in [("near", set.near), ("other", set.other)] {
            match plan(&geo, angle, height_step(app), fx.max_stack, unit) {
                Ok(p) => {
                    for w in p.warnings {
                        let w = format!("{word} plate: {w}");
                        if !out.contains(&w) {
                            out.push(w);
                        }
                    }
                }
                Err(e) => out.push(format!("{word} plate: {e}")),
            }
        }
        return out;
    }
    match plan(&geo, angle, height_step(app), fx.max_stack, unit) {
        Ok(p) => {
            let mut v = p.warnings;
            if let Some(c) = p.complement {
                v.push(format!(
                    "complement {}: stack {}, error {} here against {} direct",
                    c.setting.dms(0),
                    c.height.show(unit),
                    arcsec(c.error),
                    arcsec(p.direct.error)
                ));
            }
            v
        }
        Err(e) => vec![e.to_string()],
    }
}
