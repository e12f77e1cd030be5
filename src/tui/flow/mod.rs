//! A feature's flow, one module per part: choosing the fixture and set, the stack, the setup
//! (safety and settle), the readings, the verdict and the sign-off. Each handles its screen's
//! keys and changes the model; the effects it asks for run outside.

pub mod choose;
pub mod readings;
pub mod remedy;
pub mod review;
pub mod settle;
pub mod shift;
pub mod stack;
pub mod verdict;
pub mod wring;

use super::app::App;
use super::keymap::{Action, Input};
use crate::sweep::default_step;
use crate::units::{Angle, Length};

pub fn move_sel(sel: &mut usize, len: usize, input: Input) {
    let last = len.saturating_sub(1);
    match input {
        Input::Act(Action::Up) => *sel = sel.saturating_sub(1),
        Input::Act(Action::Down) => *sel = (*sel + 1).min(last),
        Input::Act(Action::PageUp) => *sel = 0,
        Input::Act(Action::PageDown) => *sel = last,
        _ => {}
    }
}

/// The step heights are rounded to: the chosen set's resolution, else the job unit's usual one.
pub fn height_step(app: &App) -> Length {
    app.attempt()
        .and_then(|a| a.block_set.as_ref())
        .and_then(|c| app.shop.set(&c.id))
        .map_or_else(|| default_step(app.unit()), |s| s.resolution())
}

/// The setting angle of the feature being worked.
pub fn setting(app: &App) -> Option<Angle> {
    app.feature().and_then(|f| f.setting_angle())
}

/// The index of the feature being worked.
pub fn here(app: &App) -> usize {
    app.flow().map_or(0, |(i, _)| i)
}
