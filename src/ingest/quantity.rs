//! Quantities as takeoffs write them: a number with a count word (`2 No`, `2 off`, `3 nr`,
//! `1 ea`, `2 pcs`, `1 set`), a length (`12.5 m`, `40 LM`, `120 LF`, `12'6"`, `12 ft 6 in`), or
//! the unit alone in a Unit column (`m`, `No`, `Sum`, `Item`, `%`).
//!
//! Unit words are the trade's (NRM, CESMM and common estimating practice; listed from memory):
//! counts `No`, `Nr`, `Nos`, `ea`, `each`, `pcs`, `pc`, `off`, `set`, `sets`, `unit(s)`; lengths
//! `m`, `lm` (linear metre), `rm` (running metre), `metre(s)`, `ft`, `LF` (linear foot), `feet`;
//! preliminaries `Sum`, `LS` (lump sum), `Item`, `%`.

use super::parse::{self, CellNumber};
use crate::units::{FT_M, IN_M};

/// What a unit word says a row is measured in.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum UnitWord {
    /// A count (`No`, `nr`, `ea`, `pcs`, `off`, `set`).
    Count,
    /// A length; the factor to metres.
    Length(f64),
    /// A sum, item or percentage: preliminaries, not a physical item.
    Allowance,
}

/// Read a unit word (`No`, `m`, `LM`, `Sum`...). `None` when it is not one of them.
pub fn unit_word(text: &str) -> Option<UnitWord> {
    let f: String = text
        .trim()
        .trim_end_matches('.')
        .chars()
        .filter(|c| !c.is_whitespace())
        .flat_map(char::to_lowercase)
        .collect();
    Some(match f.as_str() {
        "no" | "nr" | "nos" | "no's" | "ea" | "each" | "pcs" | "pc" | "pce" | "off" | "set"
        | "sets" | "unit" | "units" | "qty" | "count" => UnitWord::Count,
        "m" | "lm" | "l.m" | "rm" | "r.m" | "metre" | "metres" | "meter" | "meters" | "lin.m"
        | "linm" | "m.run" | "mrun" => UnitWord::Length(1.0),
        "ft" | "lf" | "l.f" | "lft" | "feet" | "foot" | "linft" | "'" => UnitWord::Length(FT_M),
        "sum" | "ls" | "l.s" | "lumpsum" | "item" | "items" | "%" | "ps" | "pcsum" => {
            UnitWord::Allowance
        }
        _ => return None,
    })
}

/// A quantity read from a cell.
#[derive(Clone, Debug, PartialEq)]
pub struct Quantity {
    /// The number (in metres when `unit` is a length).
    pub value: f64,
    /// The unit written in the cell, if any.
    pub unit: Option<UnitWord>,
    /// The unit text as written.
    pub unit_text: Option<String>,
}

/// Why a quantity cell could not be read, or cannot be a fitting's quantity.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
pub enum QuantityError {
    /// Not a number with a known unit word.
    #[error("'{text}' is not a quantity (write e.g. 2, 2 No, 12.5 m or 12'6\")")]
    NotAQuantity {
        /// The text.
        text: String,
    },
    /// A fitting's quantity that is not a whole number of at least 1.
    #[error(
        "a fitting's quantity must be a whole number of at least 1, not {}",
        super::rows::format_number(*value)
    )]
    NotACount {
        /// The value read.
        value: f64,
    },
}

/// How far a fitting count may sit from a whole number and still be that number, relative to it
/// (at least 1): a computed cell such as `=0.1*30` gives 3.0000000000000004 by float rounding.
pub const WHOLE_COUNT_TOLERANCE: f64 = 1e-9;

/// What to write instead of a fitting quantity that is not a count.
pub const COUNT_HINT: &str = "count fittings (1, 2, 3 ...): a length belongs to a pipe run, and a \
fitting that loses less than its catalogue K is written with its own K";

/// The one rule for a fitting's quantity, in the Fittings table and in mixed lists: a whole
/// number of at least 1. A fitting is there or it is not; no kind in the catalogue has a
/// meaning for half of one (a partial loss is a K of its own), so a fraction is an error, not
/// a warning. A value within [`WHOLE_COUNT_TOLERANCE`] of a whole number is that number.
///
/// # Errors
/// [`QuantityError::NotACount`] for a fraction, zero, a negative or a non-finite value.
pub fn fitting_count(value: f64) -> Result<f64, QuantityError> {
    let whole = value.round();
    if value.is_finite() && whole >= 1.0 && (value - whole).abs() <= WHOLE_COUNT_TOLERANCE * whole {
        Ok(whole)
    } else {
        Err(QuantityError::NotACount { value })
    }
}

/// Read a quantity text: `2`, `2 No`, `2 off`, `3 nr`, `1 ea`, `2 pcs`, `12.5 m`, `40 LM`,
/// `12'6"`, `12' 6"`, `12 ft 6 in`. `Ok(None)` for a blank (`""`, `-`, `n/a`).
///
/// # Errors
/// [`QuantityError::NotAQuantity`] when the text is none of these.
pub fn parse_quantity(text: &str, decimal_comma: bool) -> Result<Option<Quantity>, QuantityError> {
    let err = || QuantityError::NotAQuantity {
        text: text.to_string(),
    };
    if let Some(q) = feet_and_inches(text) {
        return Ok(Some(q));
    }
    match parse::parse_number_text(text, decimal_comma).map_err(|_| err())? {
        CellNumber::Blank => Ok(None),
        CellNumber::Value {
            value,
            unit,
            percent,
            ..
        } => {
            if percent {
                return Ok(Some(Quantity {
                    value,
                    unit: Some(UnitWord::Allowance),
                    unit_text: Some("%".into()),
                }));
            }
            let Some(u) = unit else {
                return Ok(Some(Quantity {
                    value,
                    unit: None,
                    unit_text: None,
                }));
            };
            let word = unit_word(&u).ok_or_else(err)?;
            let value = match word {
                UnitWord::Length(f) => value * f,
                _ => value,
            };
            Ok(Some(Quantity {
                value,
                unit: Some(word),
                unit_text: Some(u),
            }))
        }
    }
}

/// `12'6"`, `12' 6"`, `12'-6"`, `12 ft 6 in`, `12'`: feet and inches, in metres.
fn feet_and_inches(text: &str) -> Option<Quantity> {
    let t: String = text
        .trim()
        .replace(['’', '′'], "'")
        .replace(['”', '″'], "\"")
        .replace("''", "\"")
        .to_lowercase();
    let (feet, rest) = if let Some((f, r)) = t.split_once('\'') {
        (f, r)
    } else if let Some((f, r)) = t.split_once("ft") {
        (f, r)
    } else {
        return None;
    };
    let feet: f64 = feet.trim().parse().ok()?;
    let rest = rest.trim().trim_start_matches('-').trim();
    let inches = if rest.is_empty() {
        0.0
    } else {
        let r = rest
            .strip_suffix('"')
            .or_else(|| rest.strip_suffix("in"))?
            .trim();
        match parse::parse_number_text(r, false).ok()? {
            CellNumber::Value {
                value, unit: None, ..
            } if (0.0..12.0).contains(&value) => value,
            _ => return None,
        }
    };
    if !feet.is_finite() || feet < 0.0 {
        return None;
    }
    Some(Quantity {
        value: feet * FT_M + inches * IN_M,
        unit: Some(UnitWord::Length(1.0)),
        unit_text: Some(text.trim().to_string()),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Exact factors: 1 ft = 0.3048 m, 1 in = 0.0254 m (NIST SP 811, Appendix B).
    const EXACT: f64 = 1e-12;

    fn q(t: &str) -> Quantity {
        parse_quantity(t, false).unwrap().unwrap()
    }

    #[test]
    fn counts_and_lengths_with_words() {
        for (t, v, u) in [
            ("2 No", 2.0, UnitWord::Count),
            ("2 off", 2.0, UnitWord::Count),
            ("3 nr", 3.0, UnitWord::Count),
            ("1 ea", 1.0, UnitWord::Count),
            ("2 pcs", 2.0, UnitWord::Count),
            ("4No.", 4.0, UnitWord::Count),
            ("12.5 m", 12.5, UnitWord::Length(1.0)),
            ("40 LM", 40.0, UnitWord::Length(1.0)),
            ("1 Sum", 1.0, UnitWord::Allowance),
            ("5%", 5.0, UnitWord::Allowance),
        ] {
            let got = q(t);
            assert!((got.value - v).abs() < EXACT, "{t}");
            assert_eq!(got.unit, Some(u), "{t}");
        }
        assert!((q("100 LF").value - 30.48).abs() < EXACT);
        assert_eq!(q("7").unit, None);
        assert_eq!(parse_quantity("", false), Ok(None));
        assert!(parse_quantity("two", false).is_err());
        assert!(parse_quantity("2 kg", false).is_err());
    }

    #[test]
    fn feet_and_inches_read_to_metres() {
        // 12 ft 6 in = 12.5 ft = 3.81 m exactly.
        for t in [
            "12'6\"",
            "12' 6\"",
            "12'-6\"",
            "12 ft 6 in",
            "12’6”",
            "12'6''",
        ] {
            assert!((q(t).value - 3.81).abs() < EXACT, "{t}");
        }
        assert!((q("10'").value - 3.048).abs() < EXACT);
        assert!(parse_quantity("12'13\"", false).is_err());
    }

    #[test]
    fn a_fitting_count_is_a_whole_number_of_at_least_one() {
        assert_eq!(fitting_count(1.0), Ok(1.0));
        assert_eq!(fitting_count(12.0), Ok(12.0));
        // 0.1 × 30 in binary floating point is 3.0000000000000004 (IEEE 754 double rounding).
        assert_eq!(fitting_count(0.1 * 30.0), Ok(3.0));
        for bad in [1.5, 0.5, 2.25, 0.0, -1.0, 1e-12, f64::INFINITY, f64::NAN] {
            assert!(fitting_count(bad).is_err(), "{bad}");
        }
        assert_eq!(
            fitting_count(1.5).unwrap_err().to_string(),
            "a fitting's quantity must be a whole number of at least 1, not 1.5"
        );
    }

    proptest::proptest! {
        #[test]
        fn never_panics(text in "\\PC{0,24}") {
            let _ = parse_quantity(&text, false);
            let _ = parse_quantity(&text, true);
            let _ = unit_word(&text);
        }
    }
}
