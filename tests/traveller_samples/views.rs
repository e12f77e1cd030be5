//! A compound angle's other view (B, the near plate being A), judged from the formulas: the
//! view the plates level, B = atan(tan l / cos u) for the near plate at u and the other at l
//! (DOMAIN.md, "Compound angles", read backwards); its residual from its own sweep; its
//! uncertainty from the other plate's setting times ∂B/∂l, the near plate's times ∂B/∂u (both
//! by central differences here), and the indicator over its own sweep.

use super::compute::{budget, expanded, fit};
use tiltbook::traveller::validate::decide;
use tiltbook::traveller::*;
use tiltbook::units::{Angle, Tolerance};

fn view_b(u: f64, l: f64) -> f64 {
    (l.tan() / u.cos()).atan()
}

fn round3(arcsec: f64) -> Angle {
    Angle::from_arcsec((arcsec * 1000.0).round() / 1000.0)
}

pub fn judge_view_b(
    fx: &FixtureSnapshot,
    set: &BlockSetSnapshot,
    c: &Compound,
    a: &Attempt,
    tol: Tolerance,
) -> ViewJudgement {
    let near = a.stack.as_ref().unwrap();
    let other = a.stack_b.as_ref().unwrap();
    let sw = a.sweep_b.as_ref().unwrap();
    let fit = fit(&sw.points_xy());
    let residual = Angle::from_rad(fit.slope.atan());
    let (u, l) = (near.achieved.rad(), other.achieved.rad());
    let levelled = Angle::from_rad(view_b(u, l));
    let deviation = (levelled - c.b) - residual;
    let h = 1e-7;
    let d_dl = (view_b(u, l + h) - view_b(u, l - h)) / (2.0 * h);
    let d_du = (view_b(u + h, l) - view_b(u - h, l)) / (2.0 * h);
    // [blocks, centre, temperature, indicator] of the other plate, its sweep
    let plate = budget(fx, set, other, sw);
    let mut lines: Vec<BudgetLine> = plate[..3]
        .iter()
        .map(|x| BudgetLine {
            source: format!("other plate: {}", x.source),
            u: round3(x.u.arcsec() * d_dl),
            note: format!("{}; × ∂B/∂l = {d_dl:.3}", x.note),
        })
        .collect();
    let near_setting = &budget(fx, set, near, sw)[..3];
    let near_u = near_setting
        .iter()
        .map(|x| x.u.arcsec().powi(2))
        .sum::<f64>()
        .sqrt();
    lines.push(BudgetLine {
        source: "near plate's setting".into(),
        u: round3(near_u * d_du),
        note: format!("its blocks, centre and temperature; × ∂B/∂u = {d_du:.3}"),
    });
    lines.push(plate[3].clone());
    let u_exp = expanded(&lines);
    let verdict = decide(DecisionRule::Guarded, deviation, u_exp, tol);
    ViewJudgement {
        fit,
        residual,
        deviation,
        u: u_exp,
        budget: lines,
        verdict,
        correction: None,
    }
}
