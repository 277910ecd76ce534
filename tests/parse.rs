//! Numbers and pipe sizes read from text cells.
//!
//! Expected values come from reading the notation itself (decimal arithmetic on the written
//! digits, e.g. "1-1/2" = 1.5) and from the inch definition 1 in = 25.4 mm exactly
//! (NIST SP 811 B.8) for sizes written in inches.

mod common;
use common::tol::REL_TOL_EXACT;

use approx::assert_relative_eq;
use lossledger::ingest::parse::{
    CellNumber, NumberError, SizeError, SizeSpec, SizeUnit, looks_decimal_comma, parse_number_text,
    parse_percent_or_fraction, parse_size,
};
use proptest::prelude::*;

fn value(text: &str, decimal_comma: bool) -> (f64, Option<String>, bool, bool) {
    match parse_number_text(text, decimal_comma) {
        Ok(CellNumber::Value {
            value,
            unit,
            percent,
            converted,
        }) => (value, unit, percent, converted),
        other => panic!("{text:?} (decimal_comma={decimal_comma}) gave {other:?}"),
    }
}

fn num(text: &str, decimal_comma: bool, expected: f64) {
    let (v, unit, percent, _) = value(text, decimal_comma);
    assert_relative_eq!(v, expected, max_relative = REL_TOL_EXACT);
    assert_eq!(unit, None, "{text:?}");
    assert!(!percent, "{text:?}");
}

fn with_unit(text: &str, expected: f64, unit: &str) {
    let (v, u, percent, converted) = value(text, false);
    assert_relative_eq!(v, expected, max_relative = REL_TOL_EXACT);
    assert_eq!(u.as_deref(), Some(unit), "{text:?}");
    assert!(!percent, "{text:?}");
    assert!(converted, "{text:?}");
}

#[test]
fn plain_numbers() {
    num("12.5", false, 12.5);
    num("0", false, 0.0);
    num(".5", false, 0.5);
    num("5.", false, 5.0);
    num("+3", false, 3.0);
    num("-3.25", false, -3.25);
    num("1e3", false, 1000.0);
    num("1.5E-3", false, 0.0015);
    num("  12.5  ", false, 12.5);
    assert!(!value("12.5", false).3, "nothing to clean");
}

#[test]
fn separators_and_spaces() {
    num("1 200", false, 1200.0);
    num("1,200", false, 1200.0);
    num("12,345,678.9", false, 12_345_678.9);
    num("1\u{00A0}200", false, 1200.0); // no-break space
    num("1\u{202F}200", false, 1200.0); // narrow no-break space
    num("1\u{2009}200,5", true, 1200.5); // thin space + decimal comma
    num("\u{00A0}42\u{00A0}", false, 42.0);
    num("12,5", true, 12.5);
    num("0,75", true, 0.75);
    num("1.200,5", true, 1200.5);
    num("1.200", true, 1200.0);
    num("1.5", true, 1.5); // lone dot that cannot be grouping, in a decimal-comma column
    num("1 000 000", false, 1_000_000.0);
    assert!(value("1,200", false).3, "thousands separator removed");
    assert!(value("12,5", true).3, "decimal comma");
    assert!(value("1\u{00A0}200", false).3, "nbsp removed");
}

#[test]
fn ambiguous_or_bad_grouping_is_an_error() {
    for (t, dc) in [
        ("12,5", false),
        ("1,20", false),
        ("1.200,5", false),
        ("1,200.5", true),
        ("12.5.3", false),
        ("1 20", false),
        ("- 5", false),
    ] {
        assert_eq!(
            parse_number_text(t, dc),
            Err(NumberError::NotANumber { text: t.into() }),
            "{t:?} dc={dc}"
        );
    }
}

#[test]
fn signs() {
    num("\u{2212}5", false, -5.0); // Unicode minus
    assert!(value("\u{2212}5", false).3);
    num("-0.5", false, -0.5);
    num("-1/2", false, -0.5);
}

#[test]
fn percent() {
    let (v, unit, p, c) = value("75%", false);
    assert_eq!((v, unit, p, c), (75.0, None, true, true));
    let (v, _, p, _) = value("75 %", false);
    assert_eq!((v, p), (75.0, true));
    let (v, _, p, _) = value("12,5 %", true);
    assert_eq!((v, p), (12.5, true));
    let (v, _, p, _) = value("40 percent", false);
    assert_eq!((v, p), (40.0, true));
}

#[test]
fn units_in_cells() {
    with_unit("12 m", 12.0, "m");
    with_unit("40 ft", 40.0, "ft");
    with_unit("12.5m3/h", 12.5, "m3/h");
    with_unit("1 200 m3/h", 1200.0, "m3/h");
    with_unit("3/4 in", 0.75, "in");
    with_unit("1-1/2 in", 1.5, "in");
    with_unit("1 1/2 in", 1.5, "in");
    with_unit("2½\"", 2.5, "\"");
    with_unit("4\"", 4.0, "\"");
    with_unit("20 °C", 20.0, "°C");
    with_unit("3 bar g", 3.0, "bar g");
    with_unit("1e3 l/s", 1000.0, "l/s");
}

/// The unit text handed back is what `units::parse_unit` reads (NIST SP 811 B.8 for ft, gallon).
#[test]
fn cell_units_feed_parse_unit() {
    use lossledger::units::{Quantity, parse_unit};
    let cases: &[(&str, Quantity, f64)] = &[
        ("40 ft", Quantity::Length, 40.0 * 0.3048),
        ("12.5m3/h", Quantity::Flow, 12.5 / 3600.0),
        (
            "100 US gpm",
            Quantity::Flow,
            100.0 * 3.785_411_784e-3 / 60.0,
        ),
        ("3/4 in", Quantity::Length, 0.75 * 0.0254),
        ("68 °F", Quantity::Temperature, 20.0),
    ];
    for (text, q, si) in cases {
        let (v, unit, _, _) = value(text, false);
        let unit = unit.unwrap_or_else(|| panic!("{text:?}: no unit"));
        let u = parse_unit(&unit, *q).unwrap_or_else(|| panic!("{text:?}: unit {unit:?}"));
        assert_relative_eq!(u.to_si(v), *si, max_relative = REL_TOL_EXACT);
    }
}

#[test]
fn blanks() {
    for t in [
        "", "   ", "\u{00A0}", "-", "–", "—", "n/a", "N/A", "na", "NA", "nil", "None", "none",
    ] {
        assert_eq!(parse_number_text(t, false), Ok(CellNumber::Blank), "{t:?}");
    }
}

#[test]
fn garbage_is_not_a_number() {
    for t in [
        "tbc", "TBC", "abc", "#N/A", "5-10", "5–10", "(5)", "12/5", "3/0", "2/2", ".", "+", "e5",
    ] {
        assert_eq!(
            parse_number_text(t, false),
            Err(NumberError::NotANumber { text: t.into() }),
            "{t:?}"
        );
    }
}

#[test]
fn non_finite() {
    for t in [
        "NaN", "nan", "inf", "-inf", "Infinity", "∞", "1e999", "-1e400",
    ] {
        assert_eq!(
            parse_number_text(t, false),
            Err(NumberError::NotFinite { text: t.into() }),
            "{t:?}"
        );
    }
}

#[test]
fn decimal_comma_detection() {
    for t in [
        "12,5",
        "0,75",
        "1.234,5",
        "1 234,5",
        "0,750",
        "-3,25",
        "12,5 m",
        "1.234,567",
    ] {
        assert!(looks_decimal_comma(t), "{t:?} should look decimal-comma");
    }
    for t in [
        "1,200",
        "12,345,678",
        "1,234.5",
        "12.5",
        "1200",
        "",
        "abc",
        ",",
        "1,",
    ] {
        assert!(
            !looks_decimal_comma(t),
            "{t:?} should not look decimal-comma"
        );
    }
}

#[test]
fn percent_or_fraction_rule() {
    assert_relative_eq!(parse_percent_or_fraction(75.0, true, false), 0.75);
    assert_relative_eq!(parse_percent_or_fraction(75.0, false, true), 0.75);
    assert_relative_eq!(parse_percent_or_fraction(0.75, false, false), 0.75);
    assert_relative_eq!(parse_percent_or_fraction(0.5, false, true), 0.005);
    assert_relative_eq!(parse_percent_or_fraction(0.5, true, false), 0.005);
    // Heuristic (common practice, no source): bare values above 1 are percent, 1 is 100 %.
    assert_relative_eq!(parse_percent_or_fraction(75.0, false, false), 0.75);
    assert_relative_eq!(parse_percent_or_fraction(1.0, false, false), 1.0);
    assert_relative_eq!(parse_percent_or_fraction(100.0, false, false), 1.0);
}

// ---------------------------------------------------------------------------------------------
// Sizes

fn size(text: &str, header: Option<SizeUnit>) -> SizeSpec {
    parse_size(text, header).unwrap_or_else(|e| panic!("{text:?}: {e}"))
}

#[test]
fn dn_notations() {
    for t in [
        "DN100",
        "DN 100",
        "dn100",
        "Dn-100",
        "100NB",
        "NB100",
        "100 NB",
        "100 mm NB",
        "100mm NB",
        "100mmNB",
        "100mm",
        "100 mm",
        "100 DN",
    ] {
        assert_eq!(size(t, None), SizeSpec::Dn(100), "{t:?}");
    }
    assert_eq!(size("100", Some(SizeUnit::Millimetre)), SizeSpec::Dn(100));
    assert_eq!(size("DN15", Some(SizeUnit::Inch)), SizeSpec::Dn(15)); // cell wins over header
    assert_eq!(size("DN 1200", None), SizeSpec::Dn(1200));
}

#[test]
fn nps_notations() {
    let cases: &[(&str, f64)] = &[
        ("NPS 4", 4.0),
        ("NPS4", 4.0),
        ("nps 4\"", 4.0),
        ("4\"", 4.0),
        ("4 in", 4.0),
        ("4in", 4.0),
        ("4 in.", 4.0),
        ("4-inch", 4.0),
        ("4 inch", 4.0),
        ("4 Inches", 4.0),
        ("4''", 4.0),
        ("4”", 4.0),
        ("1-1/2\"", 1.5),
        ("1 1/2\"", 1.5),
        ("1.5\"", 1.5),
        ("3/4\"", 0.75),
        ("¾\"", 0.75),
        ("½ in", 0.5),
        ("1¼\"", 1.25),
        ("1 ¼\"", 1.25),
        ("NPS 1-1/2", 1.5),
        ("2-1/2 in", 2.5),
        ("1/8\"", 0.125),
    ];
    for (t, nps) in cases {
        assert_eq!(size(t, None), SizeSpec::Nps(*nps), "{t:?}");
    }
    assert_eq!(size("4", Some(SizeUnit::Inch)), SizeSpec::Nps(4.0));
    assert_eq!(size("1-1/2", Some(SizeUnit::Inch)), SizeSpec::Nps(1.5));
    assert_eq!(size("4\"", Some(SizeUnit::Millimetre)), SizeSpec::Nps(4.0)); // cell wins
}

fn assert_od(spec: SizeSpec, od: f64, text: &str) {
    match spec {
        SizeSpec::OuterDiameter { od_m } => {
            assert_relative_eq!(od_m, od, max_relative = REL_TOL_EXACT)
        }
        other => panic!("{text:?} gave {other:?}"),
    }
}

#[test]
fn outer_diameter_notations() {
    for t in [
        "110 OD",
        "OD110",
        "OD 110 mm",
        "110mm OD",
        "110 mm OD",
        "od 110",
        "Ø110",
        "O.D. 110",
    ] {
        assert_od(size(t, None), 0.110, t);
    }
    // 4.5 in = 114.3 mm exactly (NIST SP 811 B.8 inch).
    assert_od(size("4.5\" OD", None), 0.1143, "4.5\" OD");
}

#[test]
fn od_by_wall_notations() {
    for t in [
        "Ø114.3x6.02",
        "ø114.3 x 6.02",
        "114.3x6.02",
        "114.3 × 6.02 mm",
        "OD 114.3 x 6.02",
        "114,3x6,02",
        "114.3 * 6.02",
        "114.3mm x 6.02mm",
    ] {
        match size(t, None) {
            SizeSpec::OdWall { od_m, wall_m } => {
                assert_relative_eq!(od_m, 0.1143, max_relative = REL_TOL_EXACT);
                assert_relative_eq!(wall_m, 0.00602, max_relative = REL_TOL_EXACT);
            }
            other => panic!("{t:?} gave {other:?}"),
        }
    }
}

#[test]
fn inner_diameter_notations() {
    for t in [
        "ID 102.3",
        "102.3 ID",
        "ID102.3mm",
        "102.3 mm ID",
        "i.d. 102.3",
    ] {
        match size(t, None) {
            SizeSpec::InnerDiameter { id_m } => {
                assert_relative_eq!(id_m, 0.1023, max_relative = REL_TOL_EXACT)
            }
            other => panic!("{t:?} gave {other:?}"),
        }
    }
}

#[test]
fn bare_number_needs_a_unit() {
    for t in ["100", "4", " 1.5 ", "1-1/2"] {
        let err = parse_size(t, None).expect_err(t);
        assert_eq!(err, SizeError::BareNumber { text: t.into() });
        let msg = err.to_string();
        assert!(
            msg.contains("DN100") && msg.contains("4\""),
            "hint missing: {msg}"
        );
    }
}

#[test]
fn size_errors() {
    for t in [
        "abc", "Sch 40", "-100", "DN", "4'", "4 ft", "100/150", "DN100 x", "mm 100", "4 in mm",
    ] {
        assert_eq!(
            parse_size(t, None),
            Err(SizeError::Unrecognised { text: t.into() }),
            "{t:?}"
        );
    }
    assert_eq!(parse_size("   ", None), Err(SizeError::Empty));
    assert_eq!(
        parse_size("DN 100.5", None),
        Err(SizeError::NotWholeDn {
            text: "DN 100.5".into()
        })
    );
    assert_eq!(
        parse_size("114.3", Some(SizeUnit::Millimetre)),
        Err(SizeError::NotWholeDn {
            text: "114.3".into()
        })
    );
    assert!(matches!(
        parse_size("DN0", None),
        Err(SizeError::OutOfRange { .. })
    ));
    assert!(matches!(
        parse_size("DN 70000", None),
        Err(SizeError::OutOfRange { .. })
    ));
    for t in ["10x5", "150x100", "4\" x 3\""] {
        assert!(
            matches!(parse_size(t, None), Err(SizeError::OutOfRange { .. })),
            "{t:?}"
        );
    }
}

proptest! {
    #[test]
    fn never_panics_on_any_string(s in any::<String>()) {
        for dc in [false, true] {
            if let Ok(CellNumber::Value { value, .. }) = parse_number_text(&s, dc) {
                prop_assert!(value.is_finite());
            }
        }
        let _ = looks_decimal_comma(&s);
        for h in [None, Some(SizeUnit::Millimetre), Some(SizeUnit::Inch)] {
            match parse_size(&s, h) {
                Ok(SizeSpec::Nps(v)) => prop_assert!(v.is_finite() && v > 0.0),
                Ok(SizeSpec::Dn(d)) => prop_assert!(d > 0),
                Ok(SizeSpec::OuterDiameter { od_m }) => prop_assert!(od_m.is_finite() && od_m > 0.0),
                Ok(SizeSpec::InnerDiameter { id_m }) => prop_assert!(id_m.is_finite() && id_m > 0.0),
                Ok(SizeSpec::OdWall { od_m, wall_m }) => prop_assert!(2.0 * wall_m < od_m),
                Err(_) => {}
            }
        }
    }

    #[test]
    fn never_panics_on_number_like_strings(s in "[-+−0-9.,eE /½¾%\u{00A0}\u{202F}a-z\"']{0,16}") {
        for dc in [false, true] {
            let _ = parse_number_text(&s, dc);
        }
        let _ = looks_decimal_comma(&s);
        let _ = parse_size(&s, Some(SizeUnit::Inch));
    }

    /// Rust's own `{}` formatting of an f64 (shortest round-trip form) reads back exactly.
    #[test]
    fn formatted_floats_read_back(x in -1.0e12f64..1.0e12) {
        let text = format!("{x}");
        let (v, unit, percent, _) = value(&text, false);
        prop_assert_eq!(v, x);
        prop_assert_eq!(unit, None);
        prop_assert!(!percent);
        let comma = text.replace('.', ",");
        prop_assert_eq!(value(&comma, true).0, x);
    }

    /// Integers grouped in thousands by comma, space or no-break space read back exactly.
    #[test]
    fn grouped_integers_read_back(n in 0u64..1_000_000_000_000, sep in prop::sample::select(vec![",", " ", "\u{00A0}", "\u{202F}"])) {
        let digits = n.to_string();
        let mut grouped = String::new();
        for (i, c) in digits.chars().enumerate() {
            if i > 0 && (digits.len() - i) % 3 == 0 {
                grouped.push_str(sep);
            }
            grouped.push(c);
        }
        prop_assert_eq!(value(&grouped, false).0, n as f64);
    }
}
