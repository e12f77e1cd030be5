//! Gauge blocks: the standard sets ([`catalogue`]), a shop's own set with its missing, damaged
//! and worn blocks ([`inventory`]), and the stack solver ([`solver`], built on [`table`]).
//! [`handbook`] is the hand method, kept as a baseline to compare the solver against.

pub mod catalogue;
pub mod handbook;
pub mod inventory;
mod search;
pub mod solve_error;
pub mod solver;
pub mod table;

pub use catalogue::{CatalogueSet, Grade, GradeError};
pub use inventory::{Block, BlockSet, Condition, InventoryError, Protectors};
pub use solver::{Nearest, SolveError, Solver, Stack, StackBlock};
