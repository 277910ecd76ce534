//! Physics: pure `f64` functions with no I/O. Every correlation documents its formula, source and
//! validity range.

pub mod fitting;
pub mod fluid;
pub mod friction;
pub mod pipe;

/// Standard acceleration of gravity, m/s² (3rd CGPM 1901; NIST SP 811).
pub const G: f64 = 9.80665;
