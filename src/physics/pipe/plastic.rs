//! Thermoplastics pressure pipe sized by outside diameter and SDR: PE (ISO 4427-2) and PVC-U
//! (ISO 1452-2), both on the nominal outside-diameter series of ISO 161-1.
//!
//! # Formula
//! ISO 4065:1996: S = (SDR − 1)/2 taken as its ISO 3 preferred number (SDR 11 -> S 5.012),
//! e = d_n / (2S + 1) rounded **up** to the next 0.1 mm; for PE a wall below 2.0 mm is raised to
//! 2.0 mm (the smallest wall in the ISO 4427-2 dimension tables, from memory). Bore = d_n − 2e.
//! The code is `iso4065_wall_mm` in `pipe.rs`.
//!
//! # Source
//! ISO 161-1:2018 nominal outside diameters; ISO 4065:1996 (wall from d_n and S/SDR);
//! ISO 4427-2:2019 (PE), ISO 1452-2:2009 (PVC-U).
//!
//! # Validity
//! Reproduces the recalled ISO 4427-2 walls to within 0.1 mm; SDR 5 to 51.

/// Nominal outside diameters, mm (ISO 161-1, 16 to 1000 mm).
pub(super) const OD_SERIES_MM: &[f64] = &[
    16.0, 20.0, 25.0, 32.0, 40.0, 50.0, 63.0, 75.0, 90.0, 110.0, 125.0, 140.0, 160.0, 180.0, 200.0,
    225.0, 250.0, 280.0, 315.0, 355.0, 400.0, 450.0, 500.0, 560.0, 630.0, 710.0, 800.0, 900.0,
    1000.0,
];

/// DN -> nominal outside diameter (mm) for PE and PVC-U pipe when a schedule gives a DN.
///
/// # Source
/// Common practice (no source): the outside diameter whose bore is nearest the DN, as used in
/// European water-supply practice (DN100 -> 110 mm).
pub(super) const DN_TO_OD_MM: &[(u16, f64)] = &[
    (10, 16.0),
    (15, 20.0),
    (20, 25.0),
    (25, 32.0),
    (32, 40.0),
    (40, 50.0),
    (50, 63.0),
    (65, 75.0),
    (80, 90.0),
    (100, 110.0),
    (125, 140.0),
    (150, 160.0),
    (200, 225.0),
    (250, 280.0),
    (300, 315.0),
    (350, 355.0),
    (400, 400.0),
    (450, 450.0),
    (500, 500.0),
    (600, 630.0),
    (700, 710.0),
    (800, 800.0),
    (900, 900.0),
    (1000, 1000.0),
];

/// Smallest SDR accepted (thickest wall).
pub(super) const SDR_MIN: f64 = 5.0;
/// Largest SDR accepted (thinnest wall).
pub(super) const SDR_MAX: f64 = 51.0;
/// Smallest PE wall in the ISO 4427-2 tables, mm (from memory).
pub(super) const PE_MIN_WALL_MM: f64 = 2.0;
