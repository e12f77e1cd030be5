//! tiltbook: sine-fixture setups, gauge-block stacks, indicator sweeps and the job traveller.
//!
//! Computation (`units`, `geometry`, `blocks`, `sweep`, `uncertainty`) knows nothing of files or
//! terminals; `traveller` and `store` handle the record on disk; `tui` draws the screens.

pub mod blocks;
pub mod cli;
pub mod geometry;
pub mod shop;
pub mod store;
pub mod sweep;
pub mod traveller;
pub mod tui;
pub mod uncertainty;
pub mod units;
