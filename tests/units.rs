//! Unit labels -> SI factors.
//!
//! Sources of the expected numbers:
//! - NIST SP 811 (2008), Appendix B.8 "Factors for units listed alphabetically" and B.9
//!   (temperature). The exact definitions used: 1 ft = 0.3048 m, 1 in = 0.0254 m,
//!   1 gal (US) = 3.785411784 E-03 m3, 1 lb = 0.45359237 kg, 1 psi = 6.894757 E+03 Pa
//!   (exactly 0.45359237 x 9.80665 / 0.0254^2), 1 bar = 1 E+05 Pa, 1 atm = 1.01325 E+05 Pa,
//!   1 kgf/cm2 = 9.80665 E+04 Pa, 1 cP = 1 E-03 Pa s, 1 P = 1 E-01 Pa s, 1 micron = 1 E-06 m,
//!   1 ft3/s = 2.831685 E-02 m3/s, 1 lb/ft3 = 1.601846 E+01 kg/m3, 1 gpm = 6.309020 E-05 m3/s.
//! - SI prefixes and the hour/day (SI Brochure, 9th ed., Tables 7 and 8): 1 h = 3600 s,
//!   1 d = 86 400 s, 1 L = 1 E-03 m3.
//!
//! The expected factors are written out as decimal literals (worked by hand from those
//! definitions), never computed from the constants under test.

mod common;
use common::tol::{REL_TOL_EXACT, REL_TOL_SAME_ARITHMETIC};

use approx::assert_relative_eq;
use lossledger::units::{
    FT_M, IN_M, PSI_PA, PressureReference, Quantity, US_GAL_M3, default_unit, parse_unit,
    pressure_reference,
};

/// Parse `label` as `q` and check scale (relative 1e-12), offset 0, and the canonical label.
fn check(label: &str, q: Quantity, scale: f64, canonical: &str) {
    let u = parse_unit(label, q).unwrap_or_else(|| panic!("{label:?} not parsed as {q:?}"));
    assert_eq!(u.quantity, q, "{label:?}");
    assert_eq!(u.label, canonical, "{label:?}");
    assert_relative_eq!(u.scale, scale, max_relative = REL_TOL_EXACT);
    assert_eq!(u.offset, 0.0, "{label:?}");
}

#[test]
fn exact_constants_match_nist_sp811() {
    // NIST SP 811 B.8, exact definitions.
    assert_eq!(FT_M, 0.3048);
    assert_eq!(IN_M, 0.0254);
    assert_eq!(US_GAL_M3, 3.785411784e-3);
    // NIST SP 811 B.8: psi = 6.894 757 E+03 Pa (printed to 7 digits).
    assert_relative_eq!(PSI_PA, 6.894757e3, max_relative = 1e-7);
    // The full value follows from lbf = 0.45359237 kg x 9.80665 m/s2 over (0.0254 m)^2.
    assert_relative_eq!(
        PSI_PA,
        0.45359237 * 9.80665 / (0.0254 * 0.0254),
        max_relative = 1e-15
    );
}

#[test]
fn length_spellings() {
    // SI prefixes (SI Brochure Table 7); inch/foot/micron NIST SP 811 B.8.
    check("m", Quantity::Length, 1.0, "m");
    check("mm", Quantity::Length, 1e-3, "mm");
    check("MM", Quantity::Length, 1e-3, "mm");
    check("[mm]", Quantity::Length, 1e-3, "mm");
    check("(mm)", Quantity::Length, 1e-3, "mm");
    check("cm", Quantity::Length, 1e-2, "cm");
    check("in", Quantity::Length, 0.0254, "in");
    check("inch", Quantity::Length, 0.0254, "in");
    check("Inches", Quantity::Length, 0.0254, "in");
    check("\"", Quantity::Length, 0.0254, "in");
    check("\u{2033}", Quantity::Length, 0.0254, "in"); // double prime
    check("ft", Quantity::Length, 0.3048, "ft");
    check("feet", Quantity::Length, 0.3048, "ft");
    check("foot", Quantity::Length, 0.3048, "ft");
    check("'", Quantity::Length, 0.3048, "ft");
    check("µm", Quantity::Length, 1e-6, "µm"); // U+00B5 micro sign
    check("μm", Quantity::Length, 1e-6, "µm"); // U+03BC Greek mu
    check("um", Quantity::Length, 1e-6, "µm");
    check("micron", Quantity::Length, 1e-6, "µm");
}

#[test]
fn flow_spellings() {
    // 1 h = 3600 s, 1 L = 1e-3 m3 (SI Brochure Table 8); gallon, ft3 NIST SP 811 B.8.
    let m3h = 2.777_777_777_777_778e-4; // 1/3600
    check("m3/h", Quantity::Flow, m3h, "m3/h");
    check("m³/h", Quantity::Flow, m3h, "m3/h");
    check("m^3/h", Quantity::Flow, m3h, "m3/h");
    check("M3/HR", Quantity::Flow, m3h, "m3/h");
    check("cmh", Quantity::Flow, m3h, "m3/h");
    check("m3/s", Quantity::Flow, 1.0, "m3/s");
    check("m³/s", Quantity::Flow, 1.0, "m3/s");
    check("l/s", Quantity::Flow, 1e-3, "l/s");
    check("L/s", Quantity::Flow, 1e-3, "l/s");
    check("lps", Quantity::Flow, 1e-3, "l/s");
    check("l/min", Quantity::Flow, 1.666_666_666_666_666_7e-5, "l/min");
    check("L/min", Quantity::Flow, 1.666_666_666_666_666_7e-5, "l/min");
    check("lpm", Quantity::Flow, 1.666_666_666_666_666_7e-5, "l/min");
    // NIST SP 811 B.8: gallon (U.S.) per minute = 6.309 020 E-05 m3/s; exact 3.785411784e-3/60.
    for gpm in ["US gpm", "gpm", "gal/min", "USgpm", "GPM"] {
        check(gpm, Quantity::Flow, 6.309_019_64e-5, "US gpm");
    }
    // NIST SP 811 B.8: cubic foot per second = 2.831 685 E-02 m3/s; exact 0.3048^3.
    check("ft3/s", Quantity::Flow, 0.028_316_846_592, "ft3/s");
    check("cfs", Quantity::Flow, 0.028_316_846_592, "ft3/s");
    check("ft³/s", Quantity::Flow, 0.028_316_846_592, "ft3/s");
    // Megalitre per day: 1e3 m3 / 86 400 s.
    check("Ml/d", Quantity::Flow, 1.157_407_407_407_407_4e-2, "Ml/d");
    check("ML/d", Quantity::Flow, 1.157_407_407_407_407_4e-2, "Ml/d");
    check("m3/d", Quantity::Flow, 1.157_407_407_407_407_4e-5, "m3/d");
}

#[test]
fn pressure_spellings() {
    // SI prefixes; bar, atm, psi, kgf/cm2 NIST SP 811 B.8.
    check("Pa", Quantity::Pressure, 1.0, "Pa");
    check("kPa", Quantity::Pressure, 1e3, "kPa");
    check("KPA", Quantity::Pressure, 1e3, "kPa");
    check("MPa", Quantity::Pressure, 1e6, "MPa");
    check("bar", Quantity::Pressure, 1e5, "bar");
    check("barg", Quantity::Pressure, 1e5, "bar");
    check("bar g", Quantity::Pressure, 1e5, "bar");
    check("bar(g)", Quantity::Pressure, 1e5, "bar");
    check("bar(a)", Quantity::Pressure, 1e5, "bar");
    check("mbar", Quantity::Pressure, 100.0, "mbar");
    check("psi", Quantity::Pressure, 6_894.757_293_168_361, "psi");
    check("psig", Quantity::Pressure, 6_894.757_293_168_361, "psi");
    check("PSIA", Quantity::Pressure, 6_894.757_293_168_361, "psi");
    check("atm", Quantity::Pressure, 101_325.0, "atm");
    check("kgf/cm²", Quantity::Pressure, 98_066.5, "kgf/cm2");
}

#[test]
fn pressure_case_that_would_be_ambiguous_is_refused() {
    // "mPa" would be millipascal: refused rather than read as MPa (a factor 1e9 apart).
    assert_eq!(parse_unit("mPa", Quantity::Pressure), None);
    assert_eq!(parse_unit("mpa", Quantity::Pressure), None);
    // "ml/d" would be millilitres per day: refused rather than read as Ml/d.
    assert_eq!(parse_unit("ml/d", Quantity::Flow), None);
    // Head units are not pressure units.
    assert_eq!(parse_unit("mH2O", Quantity::Pressure), None);
    assert_eq!(parse_unit("m", Quantity::Pressure), None);
}

#[test]
fn gauge_and_absolute_are_reported_not_converted() {
    assert_eq!(pressure_reference("barg"), PressureReference::Gauge);
    assert_eq!(pressure_reference("bar g"), PressureReference::Gauge);
    assert_eq!(pressure_reference("bar(g)"), PressureReference::Gauge);
    assert_eq!(pressure_reference("psig"), PressureReference::Gauge);
    assert_eq!(pressure_reference("kPag"), PressureReference::Gauge);
    assert_eq!(pressure_reference("bara"), PressureReference::Absolute);
    assert_eq!(pressure_reference("psia"), PressureReference::Absolute);
    assert_eq!(pressure_reference("bar"), PressureReference::Unstated);
    assert_eq!(pressure_reference("kPa"), PressureReference::Unstated);
}

#[test]
fn head_spellings() {
    // Head in metres of the flowing liquid; ft NIST SP 811 B.8.
    check("m", Quantity::Head, 1.0, "m");
    check("mwc", Quantity::Head, 1.0, "m");
    check("m H2O", Quantity::Head, 1.0, "m");
    check("mH2O", Quantity::Head, 1.0, "m");
    check("m WC", Quantity::Head, 1.0, "m");
    check("ft", Quantity::Head, 0.3048, "ft");
    check("ft H2O", Quantity::Head, 0.3048, "ft");
    check("ft wc", Quantity::Head, 0.3048, "ft");
    check("feet of head", Quantity::Head, 0.3048, "ft");
    assert_eq!(parse_unit("psi", Quantity::Head), None);
}

/// Check a temperature unit by converting two points to °C.
fn check_temp(label: &str, x1: f64, c1: f64, x2: f64, c2: f64) {
    let u = parse_unit(label, Quantity::Temperature)
        .unwrap_or_else(|| panic!("{label:?} not a temperature unit"));
    assert_relative_eq!(
        u.to_si(x1),
        c1,
        epsilon = REL_TOL_EXACT,
        max_relative = REL_TOL_EXACT
    );
    assert_relative_eq!(
        u.to_si(x2),
        c2,
        epsilon = REL_TOL_EXACT,
        max_relative = REL_TOL_EXACT
    );
    assert_relative_eq!(
        u.from_si(c2),
        x2,
        epsilon = REL_TOL_EXACT,
        max_relative = REL_TOL_EXACT
    );
}

#[test]
fn temperature_spellings() {
    // NIST SP 811 B.9: t/°C = T/K - 273.15; t/°C = (t/°F - 32)/1.8.
    for c in ["°C", "ºC", "C", "degC", "deg C", "℃", "celsius"] {
        check_temp(c, 0.0, 0.0, 20.0, 20.0);
    }
    for k in ["K", "kelvin"] {
        check_temp(k, 273.15, 0.0, 293.15, 20.0);
    }
    for f in ["°F", "F", "degF", "deg F"] {
        check_temp(f, 32.0, 0.0, 212.0, 100.0);
    }
    // 68 °F = 20 °C (NIST SP 811 B.9 formula).
    let f = parse_unit("°F", Quantity::Temperature).expect("°F");
    assert_relative_eq!(f.to_si(68.0), 20.0, max_relative = REL_TOL_EXACT);
}

#[test]
fn velocity_density_viscosity_spellings() {
    // ft NIST SP 811 B.8.
    check("m/s", Quantity::Velocity, 1.0, "m/s");
    check("ft/s", Quantity::Velocity, 0.3048, "ft/s");
    check("fps", Quantity::Velocity, 0.3048, "ft/s");
    check("kg/m3", Quantity::Density, 1.0, "kg/m3");
    check("kg/m³", Quantity::Density, 1.0, "kg/m3");
    // NIST SP 811 B.8: gram per cubic centimeter = 1.0 E+03 kg/m3.
    check("g/cm3", Quantity::Density, 1000.0, "g/cm3");
    // NIST SP 811 B.8: pound per cubic foot = 1.601 846 E+01 kg/m3; exact 0.45359237/0.3048^3.
    check(
        "lb/ft3",
        Quantity::Density,
        16.018_463_373_960_138,
        "lb/ft3",
    );
    check("Pa·s", Quantity::Viscosity, 1.0, "Pa·s");
    check("Pa.s", Quantity::Viscosity, 1.0, "Pa·s");
    check("Pas", Quantity::Viscosity, 1.0, "Pa·s");
    check("Pa s", Quantity::Viscosity, 1.0, "Pa·s");
    // NIST SP 811 B.8: centipoise = 1.0 E-03 Pa s; poise = 1.0 E-01 Pa s.
    check("mPa·s", Quantity::Viscosity, 1e-3, "mPa·s");
    check("mPa.s", Quantity::Viscosity, 1e-3, "mPa·s");
    check("mPa*s", Quantity::Viscosity, 1e-3, "mPa·s");
    check("cP", Quantity::Viscosity, 1e-3, "mPa·s");
    check("cp", Quantity::Viscosity, 1e-3, "mPa·s");
    check("centipoise", Quantity::Viscosity, 1e-3, "mPa·s");
    check("P", Quantity::Viscosity, 0.1, "P");
    assert_eq!(parse_unit("cSt", Quantity::Viscosity), None); // kinematic, not dynamic
}

#[test]
fn fraction_and_duration_spellings() {
    check("%", Quantity::Fraction, 0.01, "%");
    check("percent", Quantity::Fraction, 0.01, "%");
    check("fraction", Quantity::Fraction, 1.0, "fraction");
    check("-", Quantity::Fraction, 1.0, "fraction");
    check("", Quantity::Fraction, 1.0, "fraction");
    for h in [
        "h",
        "hr",
        "hours",
        "h/yr",
        "h/a",
        "hrs/yr",
        "Hours per year",
    ] {
        check(h, Quantity::Duration, 1.0, "h");
    }
}

// Energy in kWh, volume in m³, power in W, with per-year endings; factors by definition
// (1 MWh = 1000 kWh, 1 GJ = 10⁹/3.6e6 kWh, 1 Ml = 1000 m³) and NIST SP 811 B.8 (US gallon,
// horsepower 550 ft·lbf/s = 745.699 871 582 270 2 W).
#[test]
fn energy_volume_and_power_spellings() {
    for l in ["kWh", "kWh/yr", "kwh/a", "kWh/year", "kWh / annum"] {
        check(l, Quantity::Energy, 1.0, "kWh");
    }
    check("MWh/yr", Quantity::Energy, 1e3, "MWh");
    check("GJ/a", Quantity::Energy, 1e9 / 3.6e6, "GJ");
    for l in ["m3", "m³/yr", "m3/a", "cbm"] {
        check(l, Quantity::Volume, 1.0, "m3");
    }
    check("Ml/yr", Quantity::Volume, 1e3, "Ml");
    check("gal/yr", Quantity::Volume, 3.785_411_784e-3, "US gal");
    check("kW", Quantity::Power, 1e3, "kW");
    check("hp", Quantity::Power, 745.699_871_582_270_2, "hp");
    check("W", Quantity::Power, 1.0, "W");
    assert_eq!(
        parse_unit("ml/yr", Quantity::Volume),
        None,
        "millilitres are not megalitres"
    );
    assert_eq!(parse_unit("/yr", Quantity::Energy), None);
    assert_eq!(parse_unit("kWh/h", Quantity::Energy), None);
}

#[test]
fn unknown_labels_are_none() {
    assert_eq!(parse_unit("furlong", Quantity::Length), None);
    assert_eq!(parse_unit("km", Quantity::Length), None);
    assert_eq!(parse_unit("m3/h", Quantity::Length), None);
    assert_eq!(parse_unit("kg", Quantity::Density), None);
    assert_eq!(parse_unit("tbc", Quantity::Flow), None);
}

#[test]
fn defaults_per_quantity() {
    let cases = [
        (Quantity::Flow, "m3/h", 2.777_777_777_777_778e-4),
        (Quantity::Length, "m", 1.0),
        (Quantity::Pressure, "kPa", 1e3),
        (Quantity::Head, "m", 1.0),
        (Quantity::Temperature, "°C", 1.0),
        (Quantity::Velocity, "m/s", 1.0),
        (Quantity::Density, "kg/m3", 1.0),
        (Quantity::Viscosity, "Pa·s", 1.0),
        (Quantity::Fraction, "%", 0.01),
        (Quantity::Duration, "h", 1.0),
        (Quantity::Energy, "kWh", 1.0),
        (Quantity::Volume, "m3", 1.0),
        (Quantity::Power, "kW", 1e3),
    ];
    for (q, label, scale) in cases {
        let u = default_unit(q);
        assert_eq!(u.quantity, q);
        assert_eq!(u.label, label);
        assert_relative_eq!(u.scale, scale, max_relative = REL_TOL_EXACT);
        assert_eq!(u.offset, 0.0);
    }
}

#[test]
fn conversions_round_trip() {
    // 100 US gpm = 22.712470704 m3/h (NIST SP 811 B.8 gallon, exact; x60/1000... worked by hand:
    // 100 x 3.785411784e-3 m3 x 60 /h = 22.71247070 m3/h).
    let gpm = parse_unit("gpm", Quantity::Flow).expect("gpm");
    let m3h = parse_unit("m3/h", Quantity::Flow).expect("m3/h");
    assert_relative_eq!(
        m3h.from_si(gpm.to_si(100.0)),
        22.712_470_704,
        max_relative = REL_TOL_EXACT
    );
    // 14.5037738 psi = 1 bar (NIST SP 811 B.8: 1 bar / 6.894757e3 Pa).
    let psi = parse_unit("psi", Quantity::Pressure).expect("psi");
    assert_relative_eq!(
        psi.from_si(1e5),
        14.503_773_773,
        max_relative = REL_TOL_SAME_ARITHMETIC
    );
}
