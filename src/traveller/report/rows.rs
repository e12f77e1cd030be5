//! The rows of a feature's section that depend on its kind: a taper's half and included
//! angles, a compound angle's two plates and two views (each view's residual, deviation and U,
//! the verdict over both), a small angle's two stacks under the rolls.

use super::super::model::*;
use super::{len, stack_text};
use crate::units::{Angle, Unit};

/// The nominal: the setting angle, a taper's half (the setting) and included angles, or a
/// compound angle's views and true slope.
pub(super) fn nominal_row(f: &Feature) -> String {
    let exact = |a: Angle| format!("{} ({})", a.dms(1), a.decimal(4));
    match f.kind {
        FeatureKind::Taper => match f.taper.as_ref().map(|t| t.half_angle()) {
            Some(Ok(h)) => format!(
                "half angle {}, the setting ({}); included angle {}",
                h.dms(1),
                h.decimal(4),
                Angle::from_deg(2.0 * h.deg()).dms(1)
            ),
            _ => f.setting_angle().map_or("—".into(), exact),
        },
        FeatureKind::Compound => match &f.compound {
            Some(c) => c.words(),
            None => "—".into(),
        },
        FeatureKind::Plain => f.setting_angle().map_or("—".into(), exact),
    }
}

/// The stack rows: one stack; a compound angle's two plates; two stacks under the rolls.
pub(super) fn stack_rows(f: &Feature, a: &Attempt, u: Unit, rows: &mut Vec<(String, String)>) {
    let angle = |s: &Stack| format!("{} ({})", s.achieved.dms(1), s.achieved.decimal(4));
    match (&a.stack, &a.stack_b, &a.stack_pivot) {
        (Some(n), Some(o), _) => {
            let (ln, lo) = f.compound_angles().map_or(("A", "B"), |c| c.letters());
            rows.push((
                format!("Near plate (view {ln})"),
                format!("{} → {}", stack_text(n, u), angle(n)),
            ));
            rows.push((
                format!("Other plate (view {lo})"),
                format!("{} → {}", stack_text(o, u), angle(o)),
            ));
            let (vn, vo) = Compound::views_levelled(n.achieved, o.achieved);
            rows.push((
                "Views levelled".into(),
                format!(
                    "{ln} {}, {lo} {}; true slope {}",
                    vn.dms(1),
                    vo.dms(1),
                    crate::geometry::true_slope(vn, vo).dms(1)
                ),
            ));
        }
        (Some(r), None, Some(p)) => {
            rows.push(("Under the raised roll".into(), stack_text(r, u)));
            rows.push(("Under the pivot roll".into(), stack_text(p, u)));
            rows.push((
                "Achieved angle".into(),
                format!(
                    "{} from the difference {}",
                    angle(r),
                    len(r.height - p.height, u)
                ),
            ));
        }
        (Some(s), _, _) => {
            rows.push(("Stack".into(), stack_text(s, u)));
            rows.push(("Achieved angle".into(), angle(s)));
        }
        _ => {}
    }
}

/// Residual, deviation, U and straightness: of each view for a compound angle.
pub(super) fn judgement_rows(
    f: &Feature,
    j: &Judgement,
    u: Unit,
    rows: &mut Vec<(String, String)>,
) {
    match (&j.view_b, f.compound_angles()) {
        (Some(v), Some(c)) => {
            let (ln, lo) = c.letters();
            let near = crate::traveller::validate::decide(j.rule, j.deviation, j.u, f.tolerance);
            for (l, res, dev, uu, fit, verdict) in [
                (ln, j.residual, j.deviation, j.u, &j.fit, near),
                (lo, v.residual, v.deviation, v.u, &v.fit, v.verdict),
            ] {
                rows.push((
                    format!("View {l}"),
                    format!(
                        "{}: residual {}, deviation {}, U (k = 2) {:.1}\", straightness {}",
                        verdict.label(),
                        res.arcsec_signed(1),
                        dev.arcsec_signed(1),
                        uu.arcsec(),
                        fit.straightness.show_fine(u)
                    ),
                ));
            }
        }
        _ => {
            rows.push(("Residual".into(), j.residual.arcsec_signed(1)));
            let dev = j.deviation.arcsec_signed(1);
            let dev = if f.kind == FeatureKind::Taper {
                format!(
                    "{dev} on the half angle ({} on the included angle)",
                    Angle::from_deg(2.0 * j.deviation.deg()).arcsec_signed(1)
                )
            } else {
                dev
            };
            rows.push(("Deviation".into(), dev));
            rows.push(("U (k = 2)".into(), format!("{:.1}\"", j.u.arcsec())));
            rows.push(("Straightness".into(), j.fit.straightness.show_fine(u)));
        }
    }
}

/// The stack column of the attempts table: both heights when there are two.
pub(super) fn attempt_stack_cell(a: &Attempt, u: Unit) -> String {
    match (&a.stack, &a.stack_b, &a.stack_pivot) {
        (Some(n), Some(o), _) => format!("{} / {}", len(n.height, u), len(o.height, u)),
        (Some(r), None, Some(p)) => format!("{} − {}", len(r.height, u), len(p.height, u)),
        (Some(s), _, _) => len(s.height, u),
        _ => "—".into(),
    }
}
