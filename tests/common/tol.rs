//! Named tolerances shared by the tests, each with the reason for its size, and the relative
//! difference they are compared with.

/// The same doubles met by a different route (powers, products, summation order): an audit
/// against its own JSON, a list against its canonical twin, a comparison against the difference
/// of two audits. Rounding of a few operations stays many orders of magnitude inside 1e-9.
pub const REL_TOL_SAME_ARITHMETIC: f64 = 1e-9;

/// A hand calculation (docs/worked-example.md and the worked examples of docs/energy.md): its
/// figures are rounded to five or six significant figures and its properties read from tables,
/// so 0.1 % is the agreement it can promise.
pub const REL_TOL_HAND_WORKED: f64 = 1e-3;

/// Relative difference of `a` from `b` (`|a − b| / |b|`; a zero `b` only matches a zero `a`).
pub fn rel(a: f64, b: f64) -> f64 {
    (a - b).abs() / b.abs().max(f64::MIN_POSITIVE)
}
