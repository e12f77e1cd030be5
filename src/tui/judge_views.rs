//! A compound angle judged in its second view, and the stack changes that level both views.
//!
//! The near plate sets its own view slope exactly; the other view's slope is
//! atan(tan l / cos u) for the near plate at u and the other at l (DOMAIN.md, "Compound
//! angles", read backwards). So the other view's residual and deviation are taken against the
//! slope the two plates level, and its uncertainty comes from the other plate's setting through
//! ∂(view)/∂l, from the near plate's through ∂(view)/∂u, and from the indicator of its own
//! sweep as it stands (the sweep measures the view's slope directly).

use super::judge::{
    JudgeInput, budget_lines, expanded, fit_record, indicator_contributions, setting_contributions,
};
use super::rank::geometry;
use crate::traveller::{BudgetLine, Compound, Correction, ViewJudgement};
use crate::uncertainty;
use crate::units::{Angle, Length};

/// ∂(other view)/∂l and ∂(other view)/∂u for the other view atan(tan l / cos u), with the near
/// plate at `u` and the other at `l` (direct differentiation).
pub fn view_sensitivities(u: Angle, l: Angle) -> (f64, f64) {
    let (cu, su) = (u.rad().cos(), u.rad().sin());
    let tl = l.rad().tan();
    let den = 1.0 + tl * tl / (cu * cu);
    let d_dl = (1.0 + tl * tl) / cu / den;
    let d_du = tl * su / (cu * cu) / den;
    (d_dl, d_du)
}

/// The other view of a compound attempt judged on its own (each view has its own sweep; the
/// near plate's setting enters this view's budget).
pub fn judge_other_view(i: &JudgeInput, c: &Compound) -> Result<ViewJudgement, String> {
    let a = i.attempt;
    let (near, other) = match (&a.stack, &a.stack_b) {
        (Some(n), Some(o)) => (n, o),
        _ => return Err("a compound angle needs both plates' stacks; build them first".into()),
    };
    let sw = a
        .sweep_b
        .as_ref()
        .ok_or("the other view has no readings yet; sweep it too")?;
    let w = sw.to_fit_input()?;
    let fit = w.fit().map_err(|e| e.to_string())?;
    let geo = geometry(i.fixture);
    let (_, levelled) = Compound::views_levelled(near.achieved, other.achieved);
    let (_, nominal) = c.views();
    let residual = fit.residual;
    let deviation = (levelled - nominal) - residual;
    let (d_dl, d_du) = view_sensitivities(near.achieved, other.achieved);
    let letter = c.letters().1;
    let sizes = |s: &crate::traveller::Stack| s.blocks.iter().map(|b| b.size).collect::<Vec<_>>();
    let mut budget: Vec<BudgetLine> = budget_lines(
        &geo,
        other.achieved,
        &setting_contributions(sizes(other), i),
        d_dl,
        &format!("other plate, × {d_dl:.3} from the plate to view {letter}"),
    )?
    .into_iter()
    .map(|l| BudgetLine {
        source: format!("other plate: {}", l.source),
        ..l
    })
    .collect();
    let near_lines = budget_lines(
        &geo,
        near.achieved,
        &setting_contributions(sizes(near), i),
        1.0,
        "",
    )?;
    let near_u = expanded(&near_lines).arcsec() / uncertainty::COVERAGE_K * d_du;
    if near_u > 0.0 {
        budget.push(BudgetLine {
            source: "near plate's setting".into(),
            u: Angle::from_arcsec(near_u),
            note: format!("its stack and centre distance, × {d_du:.3} through view {letter}"),
        });
    }
    budget.extend(budget_lines(
        &geo,
        other.achieved,
        &indicator_contributions(&w, sw, &fit, i.settings),
        1.0,
        "",
    )?);
    let u = expanded(&budget);
    let verdict: crate::traveller::Verdict =
        uncertainty::decide(deviation, &i.feature.tolerance, u, i.rule())
            .verdict
            .into();
    Ok(ViewJudgement {
        fit: fit_record(&fit),
        residual,
        deviation,
        u,
        budget,
        verdict,
        correction: None,
    })
}

/// The stack changes that level both views: the near plate to its view less its residual, the
/// other plate to atan(tan(other view less its residual) · cos(new near plate)), each height
/// rounded to the set's step. (near plate, other plate).
pub fn plate_corrections(
    i: &JudgeInput,
    near_residual: Angle,
    other_residual: Angle,
) -> Result<(Correction, Correction), String> {
    let a = i.attempt;
    let (near, other) = match (&a.stack, &a.stack_b) {
        (Some(n), Some(o)) => (n, o),
        _ => return Err("a compound angle needs both plates' stacks".into()),
    };
    let geo = geometry(i.fixture);
    let (nv, ov) = Compound::views_levelled(near.achieved, other.achieved);
    let u2 = nv - near_residual;
    let o2 = ov - other_residual;
    let l2 = Angle::from_rad((o2.rad().tan() * u2.rad().cos()).atan());
    let height = |angle: Angle| -> Result<Length, String> {
        geo.ideal_height(angle)
            .map(|h| h.round_to(i.step))
            .map_err(|e| {
                format!("levelling this surface needs a plate at {}: {e}; check the sign of the readings", angle.dms(0))
            })
    };
    let (hn, ho) = (height(u2)?, height(l2)?);
    Ok((
        Correction {
            delta: hn - near.height,
            height: hn,
        },
        Correction {
            delta: ho - other.height,
            height: ho,
        },
    ))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sensitivities_match_small_steps() {
        // central differences of atan(tan l / cos u) (views_for_plates) at the 30°/20° setting
        // (compound.csv row 30,20: l = 17.495240757°)
        let (u, l) = (Angle::from_deg(30.0), Angle::from_deg(17.495240757));
        let (d_dl, d_du) = view_sensitivities(u, l);
        let h = 1e-6;
        let v = |u: f64, l: f64| {
            Compound::views_levelled(Angle::from_deg(u), Angle::from_deg(l))
                .1
                .deg()
        };
        let num_l = (v(30.0, l.deg() + h) - v(30.0, l.deg() - h)) / (2.0 * h);
        let num_u = (v(30.0 + h, l.deg()) - v(30.0 - h, l.deg())) / (2.0 * h);
        assert!((d_dl - num_l).abs() < 1e-6, "{d_dl} {num_l}");
        assert!((d_du - num_u).abs() < 1e-6, "{d_du} {num_u}");
        // and the view is 20° there
        assert!((v(30.0, l.deg()) - 20.0).abs() < 1e-8);
    }
}
