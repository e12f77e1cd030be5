//! The readings as points along the travel and the fitted line through them, redrawn as each
//! reading arrives.

use super::super::judge::fit_so_far;
use super::super::theme::Theme;
use crate::traveller::Sweep;
use crate::units::Unit;
use ratatui::Frame;
use ratatui::layout::Rect;
use ratatui::style::{Color, Style};
use ratatui::symbols::Marker;
use ratatui::text::Span;
use ratatui::widgets::{Axis, Block, Chart, Dataset, GraphType};

/// Draw the chart of `sweep` in `area`.
pub fn draw(
    f: &mut Frame,
    area: Rect,
    sweep: Option<&Sweep>,
    unit: Unit,
    block: Block,
    theme: Theme,
) {
    let pts: Vec<(f64, f64)> = sweep
        .map(|s| {
            s.points_xy()
                .into_iter()
                .map(|(x, r)| (x.to_f64(unit), r.to_f64(unit)))
                .collect()
        })
        .unwrap_or_default();
    let fit = sweep.and_then(fit_so_far);
    let travel = sweep
        .and_then(|s| s.travel)
        .map(|t| t.to_f64(unit))
        .unwrap_or(0.0);
    let xmax = pts.iter().map(|p| p.0).fold(travel, f64::max).max(1e-9);
    let line: Vec<(f64, f64)> = match &fit {
        Some(fit) => {
            let at = |x: f64| fit.line.at(x * unit.nm() as f64) / unit.nm() as f64;
            (0..=40)
                .map(|i| {
                    let x = xmax * f64::from(i) / 40.0;
                    (x, at(x))
                })
                .collect()
        }
        None => Vec::new(),
    };
    let ys = pts.iter().chain(line.iter()).map(|p| p.1);
    let (mut ymin, mut ymax) = ys.fold((0.0f64, 0.0f64), |(a, b), y| (a.min(y), b.max(y)));
    // a little room, then out to whole steps of the unit's resolution
    let step = unit_step(unit);
    let pad = ((ymax - ymin) * 0.15).max(step);
    ymin = ((ymin - pad) / step).floor() * step;
    ymax = ((ymax + pad) / step).ceil() * step;
    let places = unit.fine_places();
    let ylabels = vec![
        Span::raw(format!("{ymin:+.places$}")),
        Span::raw(format!("{ymax:+.places$}")),
    ];
    let xlabels = vec![
        Span::raw("pivot 0"),
        Span::raw(format!("{xmax:.2} {}", unit.symbol())),
    ];
    let datasets = vec![
        Dataset::default()
            .name("fitted line")
            .marker(Marker::Braille)
            .graph_type(GraphType::Line)
            .style(Style::new().fg(theme.ink(Color::Cyan)))
            .data(&line),
        Dataset::default()
            .name("readings ●")
            .marker(Marker::Custom('●'))
            .graph_type(GraphType::Scatter)
            .style(Style::new().fg(theme.ink(Color::Yellow)))
            .data(&pts),
    ];
    let chart = Chart::new(datasets)
        .block(block)
        .x_axis(Axis::default().bounds([0.0, xmax]).labels(xlabels))
        .y_axis(Axis::default().bounds([ymin, ymax]).labels(ylabels));
    f.render_widget(chart, area);
}

fn unit_step(unit: Unit) -> f64 {
    match unit {
        Unit::In => 0.0001,
        Unit::Mm => 0.001,
    }
}
