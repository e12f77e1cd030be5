//! Exact lengths and shop-floor angles: what people type, and how it is shown back.

mod angle;
mod length;

pub use angle::{Angle, AngleError, Tolerance};
pub use length::{Length, LengthError, NM_PER_INCH, NM_PER_MM, Unit};
