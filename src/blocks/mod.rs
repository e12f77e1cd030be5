//! Gauge blocks: the standard sets ([`catalogue`]), a shop's own set with its missing, damaged
//! and worn blocks ([`inventory`]), and the stack solver ([`solver`], built on [`table`]).
//! [`handbook`] is the hand method, kept as a baseline to compare the solver against.
//! Several stacks at once: [`pair`] (a stack under each roll, the small-angle remedy),
//! [`plates`] (the two stacks of a compound sine plate) and [`small`] (the small-angle remedies
//! side by side and the choice).

pub mod catalogue;
pub mod handbook;
pub mod inventory;
pub mod pair;
pub mod plates;
mod search;
pub mod small;
pub mod solve_error;
pub mod solver;
pub mod table;

pub use catalogue::{CatalogueSet, Grade, GradeError};
pub use inventory::{Block, BlockSet, Condition, InventoryError, Protectors};
pub use solver::{Nearest, SolveError, Solver, Stack, StackBlock};
