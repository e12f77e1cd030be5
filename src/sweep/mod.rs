//! sweep
