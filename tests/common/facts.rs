//! Facts of the trade the tests compute expected values with.

/// Standard acceleration of gravity, m/s² (3rd CGPM 1901; exact in NIST SP 811 B.8).
pub const G: f64 = 9.80665;
