//! A side view of the setup, drawn to scale on a Canvas: surface plate, the fixture's two rolls
//! and body at the angle, the stack of blocks under the raised roll (and under the pivot roll
//! when a small angle is set on two stacks), the work against the stop, and the angle.

use super::super::theme::Theme;
use crate::traveller::FixtureSnapshot;
use crate::units::{Angle, Length, Unit};
use ratatui::Frame;
use ratatui::layout::Rect;
use ratatui::style::Color;
use ratatui::symbols::Marker;
use ratatui::text::Line as TextLine;
use ratatui::widgets::Block;
use ratatui::widgets::canvas::{Canvas, Circle, Line};

/// What the drawing shows.
#[derive(Debug, Clone)]
pub struct SetupScene {
    pub centre: f64,
    pub pivot_roll: f64,
    pub raised_roll: f64,
    /// The angle the fixture makes.
    pub angle: Angle,
    /// Block heights from the bottom.
    pub blocks: Vec<f64>,
    /// Blocks under the pivot roll, from the bottom (two stacks for a small angle).
    pub pivot_blocks: Vec<f64>,
    pub unit: Unit,
    pub label_centre: String,
    pub label_height: String,
}

impl SetupScene {
    /// The scene for a fixture at `angle` on a stack of `blocks` (sizes, bottom first).
    pub fn new(fx: &FixtureSnapshot, angle: Angle, blocks: &[Length], unit: Unit) -> SetupScene {
        let v = |l: Length| l.to_f64(unit);
        let total: Length = blocks.iter().copied().sum();
        SetupScene {
            centre: v(fx.centre),
            pivot_roll: v(fx.roll_pivot),
            raised_roll: v(fx.roll_stack),
            angle,
            blocks: blocks.iter().map(|b| v(*b)).collect(),
            pivot_blocks: Vec::new(),
            unit,
            label_centre: format!("C {}", fx.centre.show(unit)),
            label_height: format!("H {}", total.show(unit)),
        }
    }
    /// The same with a stack under the pivot roll too (`pivot`, bottom first).
    pub fn with_pivot(mut self, pivot: &[Length]) -> SetupScene {
        let unit = self.unit;
        let total: Length = pivot.iter().copied().sum();
        self.pivot_blocks = pivot.iter().map(|b| b.to_f64(unit)).collect();
        let raised: f64 = self.blocks.iter().sum();
        self.label_height = format!(
            "H {} − {}",
            Length::from_f64(raised, unit).number(unit, unit.places()),
            total.show(unit)
        );
        self
    }
}

/// The corners of the fixture body and the rest, in scene units.
struct Shapes {
    lines: Vec<(f64, f64, f64, f64)>,
    stack: Vec<(f64, f64, f64, f64)>,
    rolls: [(f64, f64, f64); 2],
    bounds: ([f64; 2], [f64; 2]),
    pivot: (f64, f64),
    stack_top: (f64, f64),
}

fn shapes(s: &SetupScene) -> Shapes {
    let c = s.centre.max(1e-9);
    let th = s.angle.rad();
    let (u, n) = ((th.cos(), th.sin()), (-th.sin(), th.cos()));
    let rp = s.pivot_roll / 2.0;
    let rr = s.raised_roll / 2.0;
    let lift: f64 = s.pivot_blocks.iter().sum();
    let p = (0.0, lift + rp);
    let r = (c * th.cos(), lift + rp + c * th.sin());
    let e = 0.12 * c; // body beyond the rolls (drawn proportion, not a measured one)
    let t = 0.16 * c; // body thickness
    let at = |o: (f64, f64), along: f64, up: f64| {
        (o.0 + along * u.0 + up * n.0, o.1 + along * u.1 + up * n.1)
    };
    let a = at(p, -e, rp);
    let b = at(r, e, rp);
    let a2 = at(p, -e, rp + t);
    let b2 = at(r, e, rp + t);
    let mut lines = vec![
        (a.0, a.1, b.0, b.1),
        (a2.0, a2.1, b2.0, b2.1),
        (a.0, a.1, a2.0, a2.1),
        (b.0, b.1, b2.0, b2.1),
    ];
    // the stop at the low end and the work against it, on the working face
    let s0 = at(p, -e + 0.02 * c, rp + t);
    let s1 = at(p, -e + 0.02 * c, rp + t + 0.08 * c);
    lines.push((s0.0, s0.1, s1.0, s1.1));
    let w0 = at(p, -e + 0.03 * c, rp + t);
    let w1 = at(p, -e + 0.03 * c + 0.45 * c, rp + t);
    let w2 = at(p, -e + 0.03 * c + 0.45 * c, rp + t + 0.12 * c);
    let w3 = at(p, -e + 0.03 * c, rp + t + 0.12 * c);
    for (x, y) in [(w0, w1), (w1, w2), (w2, w3), (w3, w0)] {
        lines.push((x.0, x.1, y.0, y.1));
    }
    // the stack
    let half = 0.09 * c;
    let mut stack = Vec::new();
    let mut y = 0.0;
    for h in &s.pivot_blocks {
        stack.push((p.0 - half, y, p.0 + half, y + h));
        y += h;
    }
    let mut y = 0.0;
    for h in &s.blocks {
        stack.push((r.0 - half, y, r.0 + half, y + h));
        y += h;
    }
    let top = y.max(r.1 - rr);
    // room right of the stack for its height label
    let xs = [
        a.0,
        b.0,
        a2.0,
        b2.0,
        w2.0,
        w3.0,
        -rp,
        r.0 + half + 0.4 * c,
        r.0 + rr,
    ];
    let ys = [b2.1, w2.1, w3.1, top, r.1 + rr];
    let xmin = xs.iter().copied().fold(f64::MAX, f64::min) - 0.05 * c;
    let xmax = xs.iter().copied().fold(f64::MIN, f64::max) + 0.05 * c;
    let ymax = ys.iter().copied().fold(f64::MIN, f64::max) + 0.05 * c;
    Shapes {
        lines,
        stack,
        rolls: [(p.0, p.1, rp), (r.0, r.1, rr)],
        bounds: ([xmin, xmax], [-0.06 * c, ymax]),
        pivot: p,
        stack_top: (r.0 + half, top),
    }
}

/// Bounds widened so one unit is as long across as up: a cell is about twice as tall as wide.
fn to_scale(b: ([f64; 2], [f64; 2]), cols: u16, rows: u16) -> ([f64; 2], [f64; 2]) {
    let (cols, rows) = (f64::from(cols.max(1)), f64::from(rows.max(1)));
    let (w, h) = (b.0[1] - b.0[0], b.1[1] - b.1[0]);
    let per_col = (w / cols).max(h / (2.0 * rows));
    let (w2, h2) = (per_col * cols, per_col * 2.0 * rows);
    let x0 = b.0[0] - (w2 - w) / 2.0;
    let y0 = b.1[0];
    ([x0, x0 + w2], [y0, y0 + h2])
}

/// Draw the side view in `area` with a titled border.
pub fn draw(f: &mut Frame, area: Rect, scene: &SetupScene, block: Block, theme: Theme) {
    let inner = block.inner(area);
    let sh = shapes(scene);
    let (xb, yb) = to_scale(sh.bounds, inner.width, inner.height);
    let ink = theme.ink(Color::White);
    let steel = theme.ink(Color::Cyan);
    let blocks = theme.ink(Color::Yellow);
    let angle_text = format!("θ {}", scene.angle.dm());
    let c = scene.centre;
    let canvas = Canvas::default()
        .block(block)
        .marker(Marker::Braille)
        .x_bounds(xb)
        .y_bounds(yb)
        .paint(move |ctx| {
            ctx.draw(&Line::new(xb[0], 0.0, xb[1], 0.0, ink));
            for (x1, y1, x2, y2) in &sh.lines {
                ctx.draw(&Line::new(*x1, *y1, *x2, *y2, steel));
            }
            for (x, y, r) in sh.rolls {
                ctx.draw(&Circle {
                    x,
                    y,
                    radius: r,
                    color: steel,
                });
            }
            for (x1, y1, x2, y2) in &sh.stack {
                for (a, b, cc, d) in [
                    (*x1, *y1, *x2, *y1),
                    (*x2, *y1, *x2, *y2),
                    (*x2, *y2, *x1, *y2),
                    (*x1, *y2, *x1, *y1),
                ] {
                    ctx.draw(&Line::new(a, b, cc, d, blocks));
                }
            }
            // the angle, as an arc about the pivot roll's centre
            let rad = 0.32 * c;
            let th = scene.angle.rad();
            let steps = 12;
            for i in 0..steps {
                let a0 = th * i as f64 / steps as f64;
                let a1 = th * (i + 1) as f64 / steps as f64;
                ctx.draw(&Line::new(
                    sh.pivot.0 + rad * a0.cos(),
                    sh.pivot.1 + rad * a0.sin(),
                    sh.pivot.0 + rad * a1.cos(),
                    sh.pivot.1 + rad * a1.sin(),
                    ink,
                ));
            }
            ctx.print(
                sh.pivot.0 + rad * 1.05,
                sh.pivot.1 + 0.02 * c,
                TextLine::raw(angle_text.clone()),
            );
            ctx.print(
                sh.stack_top.0 + 0.02 * c,
                sh.stack_top.1 / 2.0,
                TextLine::raw(scene.label_height.clone()),
            );
            ctx.print(
                xb[0],
                yb[1] - (yb[1] - yb[0]) * 0.02,
                TextLine::raw(scene.label_centre.clone()),
            );
        });
    f.render_widget(canvas, area);
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn raised_roll_sits_on_the_stack() {
        // H = C·sin θ + (d_p − d_r)/2 (DOMAIN geometry); the drawing must put the raised roll's
        // bottom on top of the stack
        let scene = SetupScene {
            centre: 5.0,
            pivot_roll: 0.75,
            raised_roll: 0.75,
            angle: Angle::from_deg(30.0),
            blocks: vec![2.0, 0.5],
            pivot_blocks: Vec::new(),
            unit: Unit::In,
            label_centre: String::new(),
            label_height: String::new(),
        };
        let sh = shapes(&scene);
        let (_, ry, rr) = sh.rolls[1];
        assert!((ry - rr - 2.5).abs() < 1e-9, "{}", ry - rr);
        // scaling keeps one unit the same length across and up (cells are 1:2)
        let (xb, yb) = to_scale(sh.bounds, 40, 10);
        let per_col = (xb[1] - xb[0]) / 40.0;
        let per_row = (yb[1] - yb[0]) / 10.0;
        assert!((per_row - 2.0 * per_col).abs() < 1e-9);
    }

    #[test]
    fn two_stacks_tilt_by_their_difference() {
        // a stack under each roll: sin θ = (R − P)/C with equal rolls (DOMAIN, small angles);
        // 0.1436 − 0.1000 = 0.0436 in on 5 in is asin(0.00872) = 0.4996°
        let theta = Angle::from_rad((0.0436f64 / 5.0).asin());
        let scene = SetupScene {
            centre: 5.0,
            pivot_roll: 0.75,
            raised_roll: 0.75,
            angle: theta,
            blocks: vec![0.1436],
            pivot_blocks: vec![0.1],
            unit: Unit::In,
            label_centre: String::new(),
            label_height: String::new(),
        };
        let sh = shapes(&scene);
        let (_, py, pr) = sh.rolls[0];
        let (_, ry, rr) = sh.rolls[1];
        assert!(
            (py - pr - 0.1).abs() < 1e-9,
            "the pivot roll sits on its stack"
        );
        assert!(
            (ry - rr - 0.1436).abs() < 1e-9,
            "the raised roll sits on its stack"
        );
    }
}
