//! Text and JSON pieces every form of `tiltbook stack` prints.

use super::super::CliError;
use super::common::Chosen;
use crate::blocks::{BlockSet, SolveError, Stack};
use crate::geometry::SineFixture;
use crate::shop::SetOrigin;
use crate::units::{Angle, Length, Unit};
use serde_json::{Value, json};

/// The caution printed with every setup.
pub const CAUTION: &str = "Caution: clamp the work against the fixture's stop, never cut on an unsecured stack, and wear eye protection; the shop's own rules and local codes come first.";

/// A length as a decimal string in `unit` (at least the unit's usual places, exact).
pub fn num(l: Length, unit: Unit) -> String {
    l.exact_number(unit, unit.places())
}

pub fn round2(v: f64) -> f64 {
    (v * 100.0).round() / 100.0
}

pub fn round_deg(a: Angle) -> f64 {
    (a.deg() * 1e9).round() / 1e9
}

pub fn blocks_json(stack: &Stack, unit: Unit) -> Vec<String> {
    stack.sizes().iter().map(|b| num(*b, unit)).collect()
}

/// One entry of the JSON `stacks` array.
pub fn stack_json(
    role: &str,
    height: Length,
    stack: Option<&Stack>,
    setting: Option<Angle>,
    unit: Unit,
) -> Value {
    json!({
        "role": role,
        "height": num(height, unit),
        "blocks": stack.map(|s| blocks_json(s, unit)),
        "block_count": stack.map(|s| s.block_count()),
        "setting_deg": setting.map(round_deg),
    })
}

/// Where the blocks come from, in words.
pub fn set_words(chosen: &Chosen) -> String {
    match chosen.origin {
        SetOrigin::Shop => format!("set {}", chosen.set.describe()),
        SetOrigin::Catalogue => format!("set {} (complete standard set)", chosen.set.id),
    }
}

/// The text listing of a stack, bottom to top, under a heading that ends with a colon.
pub fn stack_text(stack: &Stack, unit: Unit, heading: &str) -> String {
    let mut t = format!("{heading}\n");
    let n = stack.blocks.len();
    for (i, b) in stack.blocks.iter().enumerate() {
        let mut tags = Vec::new();
        if i == 0 {
            tags.push("bottom");
        }
        if i + 1 == n && n > 1 {
            tags.push("top");
        }
        if b.protector {
            tags.push("protector");
        }
        if b.worn {
            tags.push("worn");
        }
        let tags = if tags.is_empty() {
            String::new()
        } else {
            format!("   ({})", tags.join(", "))
        };
        t.push_str(&format!(
            "  {:>2}. {:>10} {}{tags}\n",
            i + 1,
            num(b.size, unit),
            unit
        ));
    }
    t.push_str(&format!(
        "  total {} {unit}, {} block{}\n",
        num(stack.height, unit),
        n,
        if n == 1 { "" } else { "s" }
    ));
    t
}

/// The heading of a single stack: "Stack from set …, wring bottom to top:".
pub fn single_heading(chosen: &Chosen) -> String {
    format!("Stack from {}, wring bottom to top:", set_words(chosen))
}

/// A warning when stacks use worn blocks.
pub fn worn_note(stacks: &[&Stack], unit: Unit) -> Option<String> {
    let worn: Vec<Length> = stacks.iter().flat_map(|s| s.worn()).collect();
    let count: usize = stacks.iter().map(|s| s.block_count()).sum();
    (!worn.is_empty()).then(|| {
        format!(
            "the stack uses worn block(s) {}: no stack of {} blocks avoids them; check them before wringing",
            worn.iter()
                .map(|w| format!("{} {unit}", num(*w, unit)))
                .collect::<Vec<_>>()
                .join(", "),
            count
        )
    })
}

/// The exit-1 message for a height the set cannot make; with an angle, what each nearest gives.
pub fn unmet(e: &SolveError, set: &BlockSet, angle: Option<(Angle, &SineFixture)>) -> CliError {
    let unit = set.unit;
    let mut m = format!("cannot build the stack from set {}: {}", set.id, e.reason());
    if let Some(n) = e.nearest() {
        let mut lines = Vec::new();
        for (word, l) in [("below", n.below), ("above", n.above)] {
            let Some(l) = l else { continue };
            let mut line = format!("\n  nearest buildable {word}: {} {unit}", num(l, unit));
            if let Some((nominal, fx)) = angle
                && let Ok(a) = fx.angle_for_height(l)
            {
                line.push_str(&format!(
                    " (gives {}, error {})",
                    a.dms(1),
                    secs(a - nominal)
                ));
            }
            lines.push(line);
        }
        if lines.is_empty() {
            m.push_str("\n  no buildable height is near it");
        }
        for l in lines {
            m.push_str(&l);
        }
    }
    if matches!(e, SolveError::BelowSmallest { .. }) && angle.is_some() {
        m.push_str("\n  for a small angle: put a stack under each roll so that their difference is the height, or use a longer fixture");
    }
    CliError::Unmet(m)
}

/// A signed error in arc-seconds to two places, `+1.35"` (never `-0.00"`).
pub fn secs(a: Angle) -> String {
    let v = (a.arcsec() * 100.0).round() / 100.0;
    format!("{:+.2}\"", if v == 0.0 { 0.0 } else { v })
}

/// A labelled line of the text report.
pub fn row(label: &str, v: impl std::fmt::Display) -> String {
    format!("  {label:<16}{v}\n")
}

/// Warnings and the caution, at the end of every text report.
pub fn closing(warnings: &[String]) -> String {
    let mut t = String::new();
    for w in warnings {
        t.push_str(&format!("warning: {w}\n"));
    }
    t.push('\n');
    t.push_str(CAUTION);
    t.push('\n');
    t
}
