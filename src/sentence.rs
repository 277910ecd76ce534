//! Sentences with computed figures in them (finding messages, system notes), kept with each
//! figure in SI and rendered in the reader's units: the workbook and the console in the units
//! asked for (`--units`), the JSON always in SI.
//!
//! A figure is written into the sentence with [`fig`] (or [`fig_signed`]), which stores the SI
//! value, its SI unit label and the decimals shown between private-use characters (U+E000 to
//! U+E002, which no input text reaches: sentences are built by the audit only).
//! [`Sentence::render`] replaces each figure with its value and unit.
//!
//! # Source
//! US customary factors: NIST SP 811 (2008) Appendix B.8, via [`crate::units::us_unit`];
//! °F = °C × 9/5 + 32 (NIST SP 811, B.9).

use std::borrow::Cow;
use std::fmt;

use crate::units::{UnitSystem, us_unit};

const OPEN: char = '\u{E000}';
const SEP: char = '\u{E001}';
const CLOSE: char = '\u{E002}';

/// A figure for a [`Sentence`]: `value` in the SI unit `si_label` (`m`, `m/s`, `m3/h`, `Pa`,
/// `kPa`, `m per 100 m`, `°C`, `m3`, `kWh/m3`, or any label that stays the same in US units),
/// shown with `decimals` decimals and its unit.
///
/// # Example
/// ```
/// use lossledger::sentence::{Sentence, fig};
/// use lossledger::units::UnitSystem;
/// let s = Sentence::new(format!("velocity {} is high", fig(3.0, "m/s", 2)));
/// assert_eq!(s.render(UnitSystem::Si), "velocity 3.00 m/s is high");
/// assert_eq!(s.render(UnitSystem::Us), "velocity 9.84 ft/s is high"); // 3 / 0.3048
/// ```
pub fn fig(value: f64, si_label: &'static str, decimals: usize) -> String {
    format!("{OPEN}{si_label}{SEP}{decimals}{SEP}{value}{CLOSE}")
}

/// As [`fig`], with the sign always shown (`+0.25 m`, `-1.10 m`).
pub fn fig_signed(value: f64, si_label: &'static str, decimals: usize) -> String {
    format!("{OPEN}{si_label}{SEP}+{decimals}{SEP}{value}{CLOSE}")
}

/// A sentence whose figures render in either unit system. Equality compares the SI figures.
#[derive(Clone, Debug, Default, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub struct Sentence(String);

impl Sentence {
    /// A sentence from text holding figures made with [`fig`] (or none).
    pub fn new(text: String) -> Sentence {
        Sentence(text)
    }

    /// The sentence with every figure in `units`, each with its unit label.
    pub fn render(&self, units: UnitSystem) -> Cow<'_, str> {
        if !self.0.contains(OPEN) {
            return Cow::Borrowed(&self.0);
        }
        let mut out = String::with_capacity(self.0.len());
        let mut rest = self.0.as_str();
        while let Some(start) = rest.find(OPEN) {
            out.push_str(&rest[..start]);
            let after = &rest[start + OPEN.len_utf8()..];
            let Some(end) = after.find(CLOSE) else {
                out.push_str(after);
                return Cow::Owned(out);
            };
            out.push_str(&render_figure(&after[..end], units));
            rest = &after[end + CLOSE.len_utf8()..];
        }
        out.push_str(rest);
        Cow::Owned(out)
    }

    /// Whether the sentence contains `needle` when rendered in SI.
    pub fn contains(&self, needle: &str) -> bool {
        self.render(UnitSystem::Si).contains(needle)
    }
}

/// Sentences rendered in `units`, joined with `sep`.
///
/// # Example
/// ```
/// use lossledger::sentence::{Sentence, fig, join};
/// use lossledger::units::UnitSystem;
/// let notes = [Sentence::new(format!("lift {}", fig(2.0, "m", 1))), Sentence::from("no curve")];
/// assert_eq!(join(&notes, "; ", UnitSystem::Us), "lift 6.6 ft; no curve");
/// ```
pub fn join(sentences: &[Sentence], sep: &str, units: UnitSystem) -> String {
    let rendered: Vec<Cow<'_, str>> = sentences.iter().map(|s| s.render(units)).collect();
    rendered.join(sep)
}

impl From<String> for Sentence {
    fn from(text: String) -> Sentence {
        Sentence(text)
    }
}

impl From<&str> for Sentence {
    fn from(text: &str) -> Sentence {
        Sentence(text.to_string())
    }
}

/// The sentence in SI.
impl fmt::Display for Sentence {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.render(UnitSystem::Si))
    }
}

/// Serialised in SI (the JSON is always SI).
impl serde::Serialize for Sentence {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.serialize_str(&self.render(UnitSystem::Si))
    }
}

/// One figure's body (`label SEP decimals SEP value`) as value and unit in `units`.
fn render_figure(body: &str, units: UnitSystem) -> String {
    let mut parts = body.split(SEP);
    let (Some(label), Some(decimals), Some(value)) = (parts.next(), parts.next(), parts.next())
    else {
        return body.to_string();
    };
    let (signed, decimals) = match decimals.strip_prefix('+') {
        Some(d) => (true, d),
        None => (false, decimals),
    };
    let decimals: usize = decimals.parse().unwrap_or(2);
    let si: f64 = value.parse().unwrap_or(f64::NAN);
    let (value, label) = match units {
        UnitSystem::Si => (si, label.to_string()),
        UnitSystem::Us => in_us(si, label),
    };
    if signed {
        format!("{value:+.decimals$} {label}")
    } else {
        format!("{value:.decimals$} {label}")
    }
}

/// An SI value and label in US customary units; labels with no US form stay.
fn in_us(si: f64, label: &str) -> (f64, String) {
    match label {
        "°C" => (si * 9.0 / 5.0 + 32.0, "°F".into()),
        "m per 100 m" => (si, "ft per 100 ft".into()),
        _ => match us_unit(label) {
            Some((us, factor)) => (si * factor, us.into()),
            None => (si, label.into()),
        },
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// NIST SP 811 (2008) B.8: 1 ft = 0.3048 m, 1 psi = 6894.757 Pa, 1 US gal = 3.785411784 L.
    #[test]
    fn renders_each_label_in_us_units() {
        let s = Sentence::new(format!(
            "{} {} {} {} {}",
            fig(10.0, "m", 3),
            fig(100.0, "m3/h", 1),
            fig(6894.757, "Pa", 2),
            fig(20.0, "°C", 1),
            fig(1.5, "m per 100 m", 2)
        ));
        assert_eq!(
            s.render(UnitSystem::Si),
            "10.000 m 100.0 m3/h 6894.76 Pa 20.0 °C 1.50 m per 100 m"
        );
        assert_eq!(
            s.render(UnitSystem::Us),
            "32.808 ft 440.3 US gpm 1.00 psi 68.0 °F 1.50 ft per 100 ft"
        );
    }

    #[test]
    fn keeps_the_sign_and_full_precision() {
        let s = Sentence::new(format!("off by {}", fig_signed(0.25, "m", 2)));
        assert_eq!(s.render(UnitSystem::Si), "off by +0.25 m");
        let v = 1.0 / 3.0;
        let body = fig(v, "m", 1);
        let stored: f64 = body
            .split(SEP)
            .nth(2)
            .unwrap()
            .trim_end_matches(CLOSE)
            .parse()
            .unwrap();
        assert_relative_eq!(stored, v);
    }

    #[test]
    fn plain_text_and_serialisation_are_si() {
        let plain = Sentence::from("no figures here");
        assert!(matches!(plain.render(UnitSystem::Us), Cow::Borrowed(_)));
        let s = Sentence::new(format!("head {}", fig(2.0, "m", 1)));
        assert_eq!(serde_json::to_string(&s).unwrap(), "\"head 2.0 m\"");
        assert_eq!(s.to_string(), "head 2.0 m");
        assert!(s.contains("2.0 m"));
    }
}
