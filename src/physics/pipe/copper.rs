//! Copper tube: EN 1057 (metric, by outside diameter) and ASTM B88 types K, L and M (by nominal
//! inch size; outside diameter = nominal + 1/8 in).
//!
//! # Source
//! EN 1057:2006+A1:2010, *Copper and copper alloys — Seamless, round copper tubes for water and
//! gas in sanitary and heating applications*, Table 3 (the common half-hard wall for each outside
//! diameter); ASTM B88-20, *Seamless Copper Water Tube*, Table 1 (in). Both transcribed from
//! memory (no document to hand); the tests mark them so.

/// EN 1057: (outside diameter mm, wall mm), the usual wall of each diameter.
#[rustfmt::skip]
pub(super) const EN_1057: &[(f64, f64)] = &[
    (6.0, 0.6), (8.0, 0.6), (10.0, 0.6), (12.0, 0.6), (15.0, 0.7), (18.0, 0.8), (22.0, 0.9),
    (28.0, 0.9), (35.0, 1.2), (42.0, 1.2), (54.0, 1.2), (66.7, 1.2), (76.1, 1.5), (88.9, 2.0),
    (108.0, 1.5), (133.0, 1.5), (159.0, 2.0),
];

/// ASTM B88: (nominal size in, outside diameter in, wall K in, wall L in, wall M in).
/// A wall of 0.0 means the type is not made in that size.
#[rustfmt::skip]
pub(super) const B88: &[(f64, f64, f64, f64, f64)] = &[
    (0.25, 0.375, 0.035, 0.030, 0.0),
    (0.375, 0.500, 0.049, 0.035, 0.025),
    (0.5, 0.625, 0.049, 0.040, 0.028),
    (0.625, 0.750, 0.049, 0.042, 0.0),
    (0.75, 0.875, 0.065, 0.045, 0.032),
    (1.0, 1.125, 0.065, 0.050, 0.035),
    (1.25, 1.375, 0.065, 0.055, 0.042),
    (1.5, 1.625, 0.072, 0.060, 0.049),
    (2.0, 2.125, 0.083, 0.070, 0.058),
    (2.5, 2.625, 0.095, 0.080, 0.065),
    (3.0, 3.125, 0.109, 0.090, 0.072),
    (3.5, 3.625, 0.120, 0.100, 0.083),
    (4.0, 4.125, 0.134, 0.110, 0.095),
    (5.0, 5.125, 0.160, 0.125, 0.109),
    (6.0, 6.125, 0.192, 0.140, 0.122),
    (8.0, 8.125, 0.271, 0.200, 0.170),
    (10.0, 10.125, 0.338, 0.250, 0.212),
    (12.0, 12.125, 0.405, 0.280, 0.254),
];
