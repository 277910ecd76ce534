//! Cell formats shared by every sheet lossledger writes. The palette is our own: a deep slate
//! for computed headers and soft tints for severities.

use rust_xlsxwriter::{Color, Format, FormatAlign, FormatBorder, FormatUnderline};

use super::console::UnitSystem;
use crate::error::Severity;

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
    /// A result that fails (rank uncertain, duty not met).
    pub bad: Format,
    /// A result that holds.
    pub good: Format,
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
            units: UnitSystem::Si,
        }
    }

    /// The fill of a severity.
    pub fn severity(&self, s: Severity) -> &Format {
        &self.severity[s as usize]
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
