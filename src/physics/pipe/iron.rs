//! Ductile iron pipe with cement-mortar lining: EN 545 / ISO 2531 outside diameters, class K9
//! iron wall, ISO 4179 lining.
//!
//! # Formula
//! Class K9 nominal iron wall e = 9 (0.5 + 0.001 DN) mm, at least 6.0 mm, rounded to 0.1 mm
//! (ISO 2531:1998 / EN 545:2006 clause on K classes); the walls below are that formula evaluated.
//! Bore = OD − 2 e − 2 t_lining, with the nominal cement-mortar lining t_lining of ISO 4179:
//! 3 mm for DN 40–300, 5 mm for DN 350–600.
//!
//! # Source
//! ISO 2531:1998 and EN 545:2006 table of outside diameters (DE) and K9 walls; ISO 4179:2005
//! Table 1 nominal lining thickness. Transcribed from memory (no document to hand).
//!
//! # Validity
//! DN 40 to 600. Pressure classes (C25, C40 ...) of EN 545:2010 are not tabulated.

/// (DN, outside diameter mm, K9 iron wall mm, cement-mortar lining mm).
#[rustfmt::skip]
pub(super) const DUCTILE_K9: &[(u16, f64, f64, f64)] = &[
    (40, 56.0, 6.0, 3.0),
    (50, 66.0, 6.0, 3.0),
    (60, 77.0, 6.0, 3.0),
    (65, 82.0, 6.0, 3.0),
    (80, 98.0, 6.0, 3.0),
    (100, 118.0, 6.0, 3.0),
    (125, 144.0, 6.0, 3.0),
    (150, 170.0, 6.0, 3.0),
    (200, 222.0, 6.3, 3.0),
    (250, 274.0, 6.8, 3.0),
    (300, 326.0, 7.2, 3.0),
    (350, 378.0, 7.7, 5.0),
    (400, 429.0, 8.1, 5.0),
    (450, 480.0, 8.6, 5.0),
    (500, 532.0, 9.0, 5.0),
    (600, 635.0, 9.9, 5.0),
];
