//! Named tolerances shared by the tests, each with the reason for its size, and the relative
//! difference they are compared with.

/// A value that follows from exact definitions or a handful of operations on them (unit factors
/// of NIST SP 811, ratios and sums of given numbers, a formula restated in the test): only the
/// rounding of a few doubles separates the two sides.
pub const REL_TOL_EXACT: f64 = 1e-12;

/// The same doubles met by a different route (powers, products, summation order, an iteration
/// converged to its own tolerance): an audit against its own JSON, a list against its canonical
/// twin, a comparison against the difference of two audits, an expected value worked out
/// independently at full precision and written to ten or more significant figures. Rounding
/// stays orders of magnitude inside 1e-9.
pub const REL_TOL_SAME_ARITHMETIC: f64 = 1e-9;

/// A number read back from the annotated workbook against the JSON: the workbook writes computed
/// numbers to six significant figures, so they differ by at most half a unit in the sixth,
/// 5e-6 relative.
pub const REL_TOL_SIX_FIGURES: f64 = 5e-6;

/// A published table printed to three significant figures (Moody 1944 roughness values in
/// fluids' tables): half a unit in the third figure is up to 0.5 %, so 1 % relative.
pub const REL_TOL_THREE_FIGURES: f64 = 0.01;

/// A hand calculation (docs/worked-example.md and the worked examples of docs/energy.md): its
/// figures are rounded to five or six significant figures and its properties read from tables,
/// so 0.1 % is the agreement it can promise.
pub const REL_TOL_HAND_WORKED: f64 = 1e-3;

/// Relative difference of `a` from `b` (`|a − b| / |b|`; a zero `b` only matches a zero `a`).
pub fn rel(a: f64, b: f64) -> f64 {
    (a - b).abs() / b.abs().max(f64::MIN_POSITIVE)
}
