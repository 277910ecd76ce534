//! Cell formats shared by every sheet lossledger writes. The palette is our own: a deep slate
//! for computed headers and soft tints for severities.

use rust_xlsxwriter::{Color, Format, FormatAlign, FormatBorder, FormatUnderline};

use crate::error::Severity;
use crate::units::UnitSystem;

/// The formats in use, built once per workbook.
pub(crate) struct Styles {
    /// Sheet titles.
    pub title: Format,
    /// Labels.
    pub bold: Format,
    /// Headers of computed columns and result tables.
    pub header: Format,
    /// Whole numbers with thousands separators.
    pub n0: Format,
    /// Two decimals.
    pub n2: Format,
    /// Three decimals.
    pub n3: Format,
    /// Percentages.
    pub pct: Format,
    /// Wrapped text.
    pub wrap: Format,
    /// Fills for info, warning and error.
    severity: [Format; 3],
    /// Cells whose value the tool assumed.
    pub assumed: Format,
    /// Internal links.
    pub link: Format,
    /// Dates copied from the input.
    pub date: Format,
    /// A result that fails (duty not met, NPSH short).
    pub bad: Format,
    /// A result that holds.
    pub good: Format,
    /// A rank that may move across the K bands: a caution, not a failure, so a fill of its own.
    pub uncertain: Format,
    /// Units the report is written in.
    pub units: UnitSystem,
}

impl Styles {
    /// The formats, with the report in SI units.
    pub fn new() -> Self {
        let sev = |c: u32| {
            Format::new()
                .set_background_color(Color::RGB(c))
                .set_border(FormatBorder::Thin)
                .set_border_color(Color::RGB(0x7A7A7A))
        };
        Styles {
            title: Format::new().set_bold().set_font_size(14),
            bold: Format::new().set_bold(),
            header: Format::new()
                .set_bold()
                .set_font_color(Color::RGB(0xFFFFFF))
                .set_background_color(Color::RGB(0x34495E))
                .set_align(FormatAlign::Center),
            n0: Format::new().set_num_format("#,##0"),
            n2: Format::new().set_num_format("#,##0.00"),
            n3: Format::new().set_num_format("0.000"),
            pct: Format::new().set_num_format("0.0%"),
            wrap: Format::new().set_text_wrap().set_align(FormatAlign::Top),
            severity: [sev(0xDCE8F0), sev(0xF7E1A1), sev(0xEFB1AB)],
            assumed: Format::new()
                .set_italic()
                .set_background_color(Color::RGB(0xEDEDED))
                .set_font_color(Color::RGB(0x555555)),
            link: Format::new()
                .set_font_color(Color::RGB(0x1F4E79))
                .set_underline(FormatUnderline::Single),
            date: Format::new().set_num_format("yyyy-mm-dd hh:mm"),
            bad: Format::new()
                .set_bold()
                .set_background_color(Color::RGB(0xEFB1AB)),
            good: Format::new().set_background_color(Color::RGB(0xDCE8F0)),
            uncertain: Format::new()
                .set_italic()
                .set_background_color(Color::RGB(0xE4D7EE)),
            units: UnitSystem::Si,
        }
    }

    /// The fill of a severity.
    pub fn severity(&self, s: Severity) -> &Format {
        &self.severity[s as usize]
    }

    /// Every format, in a fixed order. Registering them with the workbook before sheets are
    /// written on several threads fixes their indices, so the file does not depend on which
    /// thread uses a format first.
    pub fn all(&self) -> Vec<&Format> {
        let mut v = vec![
            &self.title,
            &self.bold,
            &self.header,
            &self.n0,
            &self.n2,
            &self.n3,
            &self.pct,
            &self.wrap,
            &self.assumed,
            &self.link,
            &self.date,
            &self.bad,
            &self.good,
            &self.uncertain,
        ];
        v.extend(&self.severity);
        v
    }
}

impl Styles {
    /// The fills used across the workbook and what each means, in the order the legend lists
    /// them.
    pub fn legend(&self) -> [(&Format, &'static str, &'static str); 7] {
        [
            (
                self.severity(Severity::Error),
                "error",
                "input cell with an error finding (Findings)",
            ),
            (
                self.severity(Severity::Warning),
                "warning",
                "input cell with a warning finding",
            ),
            (
                self.severity(Severity::Info),
                "info",
                "input cell with an information finding",
            ),
            (
                &self.assumed,
                "assumed",
                "value the audit supplied (a default, see Basis)",
            ),
            (
                &self.bad,
                "fails",
                "a check that fails (duty not met, NPSH short)",
            ),
            (
                &self.good,
                "holds",
                "a check that passes, a rank that holds",
            ),
            (
                &self.uncertain,
                "uncertain",
                "a rank that can move across the K bands",
            ),
        ]
    }
}

/// Excel's limit on the characters in one cell; longer text (a message quoting a 32,767-character
/// id, a long list of line ids) is cut with an ellipsis rather than failing the whole workbook.
pub(crate) const MAX_CELL_CHARS: usize = 32_767;

/// `s` cut to at most `max` characters, the last one an ellipsis when cut.
pub(crate) fn truncate(s: &str, max: usize) -> String {
    if s.chars().count() <= max {
        s.to_string()
    } else {
        s.chars().take(max - 1).chain(['…']).collect()
    }
}

/// Significant figures of computed numbers in the workbook (the JSON keeps full precision).
/// Six is far finer than any input or method here, and it keeps float noise such as
/// `102.25999999999999` out of the cells.
pub(crate) const SIGNIFICANT_FIGURES: i32 = 6;

/// `x` rounded to [`SIGNIFICANT_FIGURES`]: the nearest double to the rounded decimal, so the
/// workbook stores (and shows in the formula bar) the short decimal. Values too small or large
/// for an exact power of ten, and non-finite values, pass unchanged.
pub(crate) fn shown(x: f64) -> f64 {
    if x == 0.0 || !x.is_finite() {
        return x;
    }
    // Powers of ten that a double holds exactly.
    const POW10: [f64; 23] = [
        1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16,
        1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
    ];
    let k = SIGNIFICANT_FIGURES - 1 - x.abs().log10().floor() as i32;
    match POW10.get(k.unsigned_abs() as usize) {
        Some(&p) if k >= 0 => (x * p).round() / p,
        Some(&p) => (x / p).round() * p,
        None => x,
    }
}

#[cfg(test)]
mod tests {
    use super::shown;

    #[test]
    fn six_significant_figures_print_short() {
        for (x, text) in [
            (102.25999999999999, "102.26"),
            (1.6855518972125698, "1.68555"),
            (0.0014629498974323488, "0.00146295"),
            (1096027.8446583124, "1096030"),
            (-23.95294081425862, "-23.9529"),
            (178104.52475697576, "178105"),
            (3.0, "3"),
        ] {
            assert_eq!(shown(x).to_string(), text, "{x}");
        }
        assert_eq!(shown(1e-300), 1e-300);
        assert!(shown(f64::NAN).is_nan());
        for x in [0.999_999_7, 9.999_995, 123_456.5e-9] {
            let r = shown(x);
            assert!((r - x).abs() <= 5e-6 * x.abs(), "{x} -> {r}");
        }
    }
}
