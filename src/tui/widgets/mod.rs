//! Drawings used by more than one screen: the side view of the setup and the sweep chart.

pub mod setup_view;
pub mod sweep_chart;
