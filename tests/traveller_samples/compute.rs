//! The numbers of the sample jobs, from the formulas: θ for a stack, the least-squares line,
//! and an uncertainty budget (GUM: standard uncertainties in quadrature, U = 2·u_c).

use tiltbook::traveller::*;
use tiltbook::units::{Angle, Length, Unit};

/// θ = asin((H − (d_p − d_r)/2)/C).
pub fn angle_for(fx: &FixtureSnapshot, h: Length) -> Angle {
    let corr = (fx.roll_pivot.nm() - fx.roll_stack.nm()) as f64 / 2.0;
    Angle::from_rad(((h.nm() as f64 - corr) / fx.centre.nm() as f64).asin())
}

/// Least squares r = a + m·x; straightness = max − min of r − (a + m·x).
pub fn fit(points: &[(Length, Length)]) -> Fit {
    let n = points.len() as f64;
    let xs: Vec<f64> = points.iter().map(|p| p.0.as_in()).collect();
    let rs: Vec<f64> = points.iter().map(|p| p.1.as_in()).collect();
    let mx = xs.iter().sum::<f64>() / n;
    let mr = rs.iter().sum::<f64>() / n;
    let sxx: f64 = xs.iter().map(|x| (x - mx).powi(2)).sum();
    let sxr: f64 = xs.iter().zip(&rs).map(|(x, r)| (x - mx) * (r - mr)).sum();
    let m = sxr / sxx;
    let a = mr - m * mx;
    let res: Vec<f64> = xs.iter().zip(&rs).map(|(x, r)| r - (a + m * x)).collect();
    let hi = res.iter().cloned().fold(f64::MIN, f64::max);
    let lo = res.iter().cloned().fold(f64::MAX, f64::min);
    Fit {
        slope: m,
        intercept: Length::from_f64(a, Unit::In),
        straightness: Length::from_f64(hi - lo, Unit::In),
    }
}

/// Limit deviation t_e in µm by nominal length for the set's grade (ISO 3650 grades 0 and 1 in
/// the reference data's standards.md; ASME AS-1 is stated there to be ISO grade 1).
pub fn te_um(grade: &str, size: Length) -> f64 {
    let rows: [f64; 6] = match grade {
        "0" | "ISO 0" | "ASME 0" => [0.12, 0.14, 0.20, 0.25, 0.30, 0.40],
        "1" | "ISO 1" | "ASME AS-1" => [0.20, 0.30, 0.40, 0.50, 0.60, 0.80],
        other => panic!("no t_e column for grade {other:?} in the samples' table"),
    };
    match size.as_mm() {
        x if x <= 10.0 => rows[0],
        x if x <= 25.0 => rows[1],
        x if x <= 50.0 => rows[2],
        x if x <= 75.0 => rows[3],
        x if x <= 100.0 => rows[4],
        _ => rows[5],
    }
}

pub fn budget(
    fx: &FixtureSnapshot,
    set: &BlockSetSnapshot,
    s: &Stack,
    sw: &Sweep,
) -> Vec<BudgetLine> {
    let c = fx.centre.as_in();
    let th = s.achieved.rad();
    let per_h = 1.0 / (c * th.cos()); // rad per inch of stack
    let um = 1.0 / 25_400.0; // inches per µm
    let blocks: f64 = s
        .blocks
        .iter()
        .map(|b| (te_um(&set.grade, b.size) * um / 3f64.sqrt()).powi(2))
        .sum::<f64>()
        + (s.blocks.len().saturating_sub(1) as f64) * (0.025 * um).powi(2);
    let u_c = fx.centre_u.map_or(0.0, |u| u.as_in()) * th.tan() / c;
    let temp = 11.5e-6 * s.height.as_in() * 1.0 / 3f64.sqrt() * per_h;
    let pts = sw.points_xy();
    let n = pts.len() as f64;
    let mx = pts.iter().map(|p| p.0.as_in()).sum::<f64>() / n;
    let sxx: f64 = pts.iter().map(|p| (p.0.as_in() - mx).powi(2)).sum();
    let u_r = ((0.0001f64 / 12f64.sqrt()).powi(2) + 0.00005f64.powi(2)).sqrt();
    let line = |source: &str, rad: f64, note: &str| BudgetLine {
        source: source.into(),
        u: Angle::from_arcsec((Angle::from_rad(rad).arcsec() * 1000.0).round() / 1000.0),
        note: note.into(),
    };
    vec![
        line(
            "gauge blocks",
            blocks.sqrt() * per_h,
            &format!(
                "grade {}, {} block{}, t_e/√3 each, 0.025 µm per joint",
                set.grade,
                s.blocks.len(),
                if s.blocks.len() == 1 { "" } else { "s" }
            ),
        ),
        line(
            "centre distance",
            u_c,
            "calibration u, sensitivity tan θ / C",
        ),
        line(
            "temperature",
            temp,
            "stack to fixture within 1 K, rectangular",
        ),
        line(
            "indicator",
            u_r / sxx.sqrt(),
            "0.0001 in division /√12 and 0.00005 in repeatability, over the travel",
        ),
    ]
}

pub fn expanded(b: &[BudgetLine]) -> Angle {
    Angle::from_arcsec(2.0 * b.iter().map(|l| l.u.arcsec().powi(2)).sum::<f64>().sqrt())
}
