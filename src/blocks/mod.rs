//! blocks
