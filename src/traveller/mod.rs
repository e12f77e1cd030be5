//! The job record: model, versioned YAML schema, validation, audit events, sign-off digest,
//! reports.

pub mod digest;
pub mod events;
mod fit;
pub mod kinds;
pub mod locate;
pub mod model;
pub mod report;
pub mod schema;
mod stamp;
pub mod validate;
mod write;

pub use model::*;
pub use schema::{LoadError, Loaded, parse, to_yaml};
pub use stamp::StampError;
pub use validate::{Problem, check_text, validate};
