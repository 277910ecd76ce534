//! Reading numbers, percentages and pipe sizes out of text cells.
//!
//! Schedules arrive with numbers stored as text (`"12.5"`, `"12,5"`, `"1 200"`, non-breaking
//! spaces, `"75%"`, `"40 ft"`, `"1-1/2 in"`) and with pipe sizes in many notations (`DN100`,
//! `100NB`, `NPS 4`, `4"`, `1-1/2"`, `110 OD`, `Ø114.3x6.02`, `ID 102.3`). The functions here turn
//! such text into plain values and leave every judgement about plausibility (sign, range, whether a
//! DN exists in a table) to the caller. None of them panics, whatever the input.

use crate::units::IN_M;

/// Outcome of reading one text cell as a number.
#[derive(Clone, Debug, PartialEq)]
pub enum CellNumber {
    /// Nothing there: `""`, whitespace, `"-"`, `"–"`, `"—"`, `"n/a"`, `"na"`, `"nil"`, `"none"`.
    Blank,
    /// A number, possibly with a unit or percent sign after it.
    Value {
        /// The number as written (a percent is *not* divided by 100: `"75%"` gives 75).
        value: f64,
        /// Unit text after the number, trimmed but otherwise verbatim (`"12.5m3/h"` gives
        /// `Some("m3/h")`); parse it with [`crate::units::parse_unit`].
        unit: Option<String>,
        /// The text ended in `%` (or `percent`, `pct`).
        percent: bool,
        /// The text had to be cleaned: thousands separators, non-breaking or other non-ASCII
        /// spaces, decimal comma, Unicode minus, a fraction, or a unit/percent suffix.
        converted: bool,
    },
}

/// Why a cell's text is not a number.
#[derive(Clone, Debug, PartialEq, Eq, thiserror::Error)]
#[non_exhaustive]
pub enum NumberError {
    /// The text does not read as a number (e.g. `"tbc"`, `"12,5"` in a decimal-point column,
    /// `"5-10"`).
    #[error("'{text}' is not a number")]
    NotANumber {
        /// The offending cell text.
        text: String,
    },
    /// The text names a non-finite value (`"NaN"`, `"inf"`) or overflows f64 (`"1e999"`).
    #[error("'{text}' is not a finite number")]
    NotFinite {
        /// The offending cell text.
        text: String,
    },
}

/// A pipe size as written in a schedule.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum SizeSpec {
    /// Nominal diameter (metric): `DN100`, `100NB`, `NB100`, `100 mm NB`, `100mm`, or a bare
    /// `100` under a header in mm.
    Dn(u16),
    /// Nominal pipe size in inches: `NPS 4`, `4"`, `4 in`, `4-inch`, `1-1/2"`, `1 1/2"`, `1.5"`,
    /// `¾"`, or a bare `4` under a header in inches. The value is in inches (1.5).
    Nps(f64),
    /// Outside diameter only: `110 OD`, `OD 110`, `OD 110 mm`, `110mm OD` (mm unless inches are
    /// written, e.g. `4.5" OD`).
    OuterDiameter {
        /// Outside diameter, m.
        od_m: f64,
    },
    /// Outside diameter by wall thickness: `Ø114.3x6.02`, `114.3 × 6.02 mm` (mm unless inches are
    /// written).
    OdWall {
        /// Outside diameter, m.
        od_m: f64,
        /// Wall thickness, m.
        wall_m: f64,
    },
    /// Inside diameter: `ID 102.3`, `102.3 ID`, `ID102.3mm` (mm unless inches are written).
    InnerDiameter {
        /// Inside diameter, m.
        id_m: f64,
    },
}

/// What a header unit says about bare numbers in a size column.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum SizeUnit {
    /// `Size [mm]`: a bare whole number is a DN.
    Millimetre,
    /// `Size [in]`: a bare number is an NPS in inches.
    Inch,
}

/// Why a size cell could not be read.
#[derive(Clone, Debug, PartialEq, Eq, thiserror::Error)]
#[non_exhaustive]
pub enum SizeError {
    /// The cell is empty or whitespace only.
    #[error("size is empty")]
    Empty,
    /// A number with no unit and no unit in the header, so DN and NPS cannot be told apart.
    #[error(
        "size '{text}' is a bare number: write DN100 or 4\" (or give the column a unit, \
         e.g. Size [mm] or Size [in])"
    )]
    BareNumber {
        /// The offending cell text.
        text: String,
    },
    /// A DN that is not a whole number (`DN 100.5`, `114.3mm`).
    #[error(
        "size '{text}': a DN must be a whole number (write an outside diameter as e.g. \
         '114.3 OD' or '114.3x6.02')"
    )]
    NotWholeDn {
        /// The offending cell text.
        text: String,
    },
    /// A size that reads but cannot be a pipe size (zero, too large for a DN, wall too thick).
    #[error("size '{text}': {reason}")]
    OutOfRange {
        /// The offending cell text.
        text: String,
        /// What is wrong with it.
        reason: &'static str,
    },
    /// The text is not a size notation this reader knows.
    #[error(
        "size '{text}' not recognised (examples: DN100, 100NB, NPS 4, 4\", 1-1/2\", 110 OD, \
         114.3x6.02, ID 102.3)"
    )]
    Unrecognised {
        /// The offending cell text.
        text: String,
    },
}

// ---------------------------------------------------------------------------------------------
// Shared scanning helpers (all bounds-checked through `get`, so no slicing can panic).

/// Whitespace as found in spreadsheets: Unicode `White_Space` (includes U+00A0 no-break space,
/// U+202F narrow no-break space, U+2009 thin space) plus zero-width characters.
fn is_space(c: char) -> bool {
    c.is_whitespace() || matches!(c, '\u{200B}' | '\u{2060}' | '\u{FEFF}')
}

fn is_digit(c: Option<&char>) -> bool {
    c.is_some_and(|c| c.is_ascii_digit())
}

fn trim_chars(text: &str) -> Vec<char> {
    let chars: Vec<char> = text.chars().collect();
    let start = chars
        .iter()
        .position(|c| !is_space(*c))
        .unwrap_or(chars.len());
    let end = chars
        .iter()
        .rposition(|c| !is_space(*c))
        .map_or(start, |p| p + 1);
    chars
        .get(start..end)
        .map(<[char]>::to_vec)
        .unwrap_or_default()
}

fn vulgar(c: char) -> Option<f64> {
    match c {
        '½' => Some(0.5),
        '¼' => Some(0.25),
        '¾' => Some(0.75),
        '⅛' => Some(0.125),
        '⅜' => Some(0.375),
        '⅝' => Some(0.625),
        '⅞' => Some(0.875),
        _ => None,
    }
}

fn is_slash(c: Option<&char>) -> bool {
    matches!(c, Some('/' | '⁄'))
}

/// Read a run of ASCII digits from `i`; returns (digits, end).
fn digits(chars: &[char], mut i: usize) -> (String, usize) {
    let mut s = String::new();
    while let Some(c) = chars.get(i) {
        if c.is_ascii_digit() {
            s.push(*c);
            i += 1;
        } else {
            break;
        }
    }
    (s, i)
}

fn to_f64(digits: &str) -> f64 {
    digits.parse::<f64>().unwrap_or(f64::NAN)
}

/// A fraction at `i`: `3/4`, `1-1/2`, `1 1/2`, `¾`, `1¾`, `1 ¾`, `1-¾`. Returns (value, end).
/// The written fraction must be proper (0 < denominator, numerator < denominator), so `12/5` or a
/// date-like `12/05` is not a fraction. With `inch_only` the denominator must also be 2, 4, 8,
/// 16, 32 or 64 (the binary fractions of an inch), so `100/150` is not a fraction either.
fn scan_fraction(chars: &[char], i: usize, inch_only: bool) -> Option<(f64, usize)> {
    let proper = |num: &str, den: &str| -> Option<f64> {
        let (n, d) = (to_f64(num), to_f64(den));
        let binary = [2.0, 4.0, 8.0, 16.0, 32.0, 64.0].contains(&d);
        (!num.is_empty() && !den.is_empty() && d > 0.0 && n < d && (binary || !inch_only))
            .then_some(n / d)
    };
    if let Some(v) = chars.get(i).copied().and_then(vulgar) {
        return Some((v, i + 1));
    }
    let (whole, j) = digits(chars, i);
    if whole.is_empty() {
        return None;
    }
    // Simple fraction a/b.
    if is_slash(chars.get(j)) {
        let (den, k) = digits(chars, j + 1);
        return proper(&whole, &den).map(|f| (f, k));
    }
    // Mixed number: whole, separator(s), then a vulgar fraction or num/den.
    let mut k = j;
    let sep = chars.get(k).copied();
    let dash = matches!(sep, Some('-' | '‐'));
    if dash {
        k += 1;
    } else {
        while chars.get(k).is_some_and(|c| is_space(*c)) {
            k += 1;
        }
    }
    if let Some(v) = chars.get(k).copied().and_then(vulgar) {
        return Some((to_f64(&whole) + v, k + 1));
    }
    if k == j {
        return None;
    }
    let (num, m) = digits(chars, k);
    if num.is_empty() || !is_slash(chars.get(m)) {
        return None;
    }
    let (den, end) = digits(chars, m + 1);
    proper(&num, &den).map(|f| (to_f64(&whole) + f, end))
}

// ---------------------------------------------------------------------------------------------
// Numbers

const BLANKS: &[&str] = &[
    "", "-", "--", "‐", "–", "—", "―", "−", "n/a", "na", "n.a.", "n.a", "nil", "none",
];

fn unit_may_start_with(c: char) -> bool {
    c.is_alphabetic()
        || matches!(
            c,
            '%' | '"'
                | '\''
                | '°'
                | 'º'
                | '˚'
                | '″'
                | '′'
                | '”'
                | '’'
                | '“'
                | '‘'
                | '['
                | '('
                | '℃'
                | '℉'
        )
}

fn is_percent_word(s: &str) -> bool {
    let folded: String = s
        .chars()
        .filter(|c| !is_space(*c))
        .flat_map(char::to_lowercase)
        .collect();
    matches!(folded.as_str(), "%" | "percent" | "pct" | "percentage")
}

/// Read one text cell as a number.
///
/// `decimal_comma` says the column writes `12,5` for 12.5 (the caller decides per column, e.g.
/// with [`looks_decimal_comma`]).
///
/// Accepted: `"12.5"`; `"12,5"` (only with `decimal_comma`); thousands grouped by `,` (or `.` when
/// `decimal_comma`), by spaces, non-breaking or narrow no-break spaces (`"1 200"`, `"1,200"`,
/// `"1.200,5"`), where every group after the first has exactly three digits; a leading `+`, `-`
/// or Unicode minus `−`; exponents (`"1e3"`); fractions (`"3/4"`, `"1-1/2"`, `"1 1/2"`, `"1½"`);
/// and a suffix after the number, returned as the unit (`"12 m"`, `"12.5m3/h"`) or, for `%`,
/// `percent`, `pct`, as `percent: true`. With `decimal_comma` a lone dot that cannot be a
/// thousands separator is read as a decimal point (`"1.5"` is 1.5 but `"1.200"` is 1200).
///
/// Blank ([`CellNumber::Blank`]): `""`, whitespace, `-`, `–`, `—`, `n/a`, `N/A`, `na`, `nil`,
/// `none` (case-insensitive). `tbc` and the like are errors, not blanks.
///
/// Values may be negative or zero: the caller validates ranges.
///
/// # Errors
/// [`NumberError::NotANumber`] when the text does not read as a number (including a unit-like
/// suffix that starts with a digit, sign or separator, e.g. `"5-10"`); [`NumberError::NotFinite`]
/// for `NaN`/`inf` text or a value that overflows f64.
pub fn parse_number_text(text: &str, decimal_comma: bool) -> Result<CellNumber, NumberError> {
    let not_a_number = || NumberError::NotANumber {
        text: text.to_string(),
    };
    let not_finite = || NumberError::NotFinite {
        text: text.to_string(),
    };
    let chars = trim_chars(text);
    let trimmed: String = chars.iter().collect();
    // Trimming anything other than ASCII blanks (e.g. a trailing no-break space) is a clean-up.
    let mut converted = text.trim_matches([' ', '\t', '\r', '\n']) != trimmed;
    if BLANKS.contains(&trimmed.to_lowercase().as_str()) {
        return Ok(CellNumber::Blank);
    }
    let (negative, start, odd_minus) = sign(&chars);
    converted |= odd_minus;
    let rest: String = chars.get(start..).unwrap_or_default().iter().collect();
    if matches!(
        rest.to_lowercase().as_str(),
        "nan" | "inf" | "infinity" | "∞"
    ) {
        return Err(not_finite());
    }
    let (value, end, cleaned) = match scan_fraction(&chars, start, false) {
        Some((v, end)) => (v, end, true),
        None => scan_decimal(&chars, start, decimal_comma).ok_or_else(not_a_number)?,
    };
    converted |= cleaned;
    let value = if negative { -value } else { value };
    if !value.is_finite() {
        return Err(not_finite());
    }
    with_suffix(&chars, end, value, converted).ok_or_else(not_a_number)
}

/// The sign at the start of `chars`: (negative, index after it, whether the sign was a
/// typographic minus that had to be read as `-`).
fn sign(chars: &[char]) -> (bool, usize, bool) {
    match chars.first() {
        Some('+') => (false, 1, false),
        Some('-') => (true, 1, false),
        Some('−' | '﹣' | '－') => (true, 1, true),
        _ => (false, 0, false),
    }
}

/// A decimal number from `chars[i..]`: digit groups separated by single `.`, `,` or space-like
/// characters, then an optional exponent. Returns (value, index after it, whether grouping or
/// a decimal comma had to be cleaned up); None when the digits do not read as one number.
fn scan_decimal(chars: &[char], i: usize, decimal_comma: bool) -> Option<(f64, usize, bool)> {
    let (groups, seps, i, spaced) = digit_groups(chars, i);
    if groups.iter().all(String::is_empty) {
        return None;
    }
    let (int_digits, frac_digits, regrouped) = join_groups(&groups, &seps, decimal_comma)?;
    let (exponent, end) = scan_exponent(chars, i);
    let int_part = if int_digits.is_empty() {
        "0"
    } else {
        int_digits.as_str()
    };
    let literal = if frac_digits.is_empty() {
        format!("{int_part}{exponent}")
    } else {
        format!("{int_part}.{frac_digits}{exponent}")
    };
    let value = literal.parse::<f64>().ok()?;
    Some((value, end, spaced || regrouped))
}

/// Digit groups from `chars[i..]` and the separators between them (space-like separators as
/// `' '`); a trailing decimal mark (`"5."`) ends with an empty group. Returns (groups,
/// separators, index after them, whether a space-like separator other than a space was seen).
fn digit_groups(chars: &[char], mut i: usize) -> (Vec<String>, Vec<char>, usize, bool) {
    let mut groups: Vec<String> = Vec::new();
    let mut seps: Vec<char> = Vec::new();
    let mut odd_space = false;
    loop {
        let (g, j) = digits(chars, i);
        groups.push(g);
        i = j;
        let Some(&c) = chars.get(i) else { break };
        if !(c == '.' || c == ',' || is_space(c)) {
            break;
        }
        if is_digit(chars.get(i + 1)) {
            seps.push(if is_space(c) { ' ' } else { c });
            odd_space |= c != ' ' && is_space(c);
            i += 1;
        } else if (c == '.' || c == ',') && i + 1 == chars.len() {
            // Trailing decimal mark: "5." reads as 5.
            seps.push(c);
            groups.push(String::new());
            i += 1;
            break;
        } else {
            break;
        }
    }
    (groups, seps, i, odd_space)
}

/// The integer and fraction digits of digit groups: thousands groups (all the same separator,
/// a first group of 1–3 digits, then groups of 3) joined, the decimal mark (`,` with
/// `decimal_comma`, else `.`) at most once and last. With `decimal_comma`, a lone dot that
/// cannot be grouping is a decimal point. Returns (integer digits, fraction digits, whether
/// grouping or a decimal comma was cleaned up); None when the groups are not one number.
fn join_groups(
    groups: &[String],
    seps: &[char],
    decimal_comma: bool,
) -> Option<(String, String, bool)> {
    let dec = if decimal_comma { ',' } else { '.' };
    let dec_count = seps.iter().filter(|s| **s == dec).count();
    let (int_groups, frac, thousands): (&[String], &str, &[char]) = match dec_count {
        0 => (groups, "", seps),
        1 if seps.last() == Some(&dec) => (
            groups.get(..groups.len() - 1).unwrap_or_default(),
            groups.last().map_or("", String::as_str),
            seps.get(..seps.len() - 1).unwrap_or_default(),
        ),
        _ => return None,
    };
    let comma_decimal = dec_count == 1 && dec == ',';
    if thousands.is_empty() {
        return Some((int_groups.concat(), frac.to_string(), comma_decimal));
    }
    let same = thousands.windows(2).all(|w| w.first() == w.get(1));
    let first_ok = int_groups
        .first()
        .is_some_and(|g| (1..=3).contains(&g.len()));
    let rest_ok = int_groups.iter().skip(1).all(|g| g.len() == 3);
    if same && first_ok && rest_ok && !thousands.contains(&dec) {
        return Some((int_groups.concat(), frac.to_string(), true));
    }
    if decimal_comma && dec_count == 0 && thousands == ['.'] {
        // Decimal-comma column, but a lone dot that cannot be grouping: a decimal point.
        let int = groups.first().cloned().unwrap_or_default();
        let frac = groups.get(1).cloned().unwrap_or_default();
        return Some((int, frac, false));
    }
    None
}

/// An exponent (`e3`, `E-2`) at `chars[i]`, as text for the literal, and the index after it;
/// an empty text and `i` when there is none.
fn scan_exponent(chars: &[char], i: usize) -> (String, usize) {
    if !matches!(chars.get(i), Some('e' | 'E')) {
        return (String::new(), i);
    }
    let mut k = i + 1;
    let mut sign = String::new();
    if let Some(&s @ ('+' | '-')) = chars.get(k) {
        sign.push(s);
        k += 1;
    }
    let (digits, end) = digits(chars, k);
    if digits.is_empty() {
        (String::new(), i)
    } else {
        (format!("e{sign}{digits}"), end)
    }
}

/// The number `value` with what follows it in `chars[i..]`: nothing, a unit, or a percent word.
/// None when the suffix cannot be a unit (it starts with a digit, sign or separator).
fn with_suffix(chars: &[char], i: usize, value: f64, converted: bool) -> Option<CellNumber> {
    let suffix: String = trim_chars(
        &chars
            .get(i..)
            .unwrap_or_default()
            .iter()
            .collect::<String>(),
    )
    .into_iter()
    .collect();
    if suffix.is_empty() {
        return Some(CellNumber::Value {
            value,
            unit: None,
            percent: false,
            converted,
        });
    }
    if !suffix.chars().next().is_some_and(unit_may_start_with) {
        return None;
    }
    let percent = is_percent_word(&suffix);
    Some(CellNumber::Value {
        value,
        unit: if percent { None } else { Some(suffix) },
        percent,
        converted: true,
    })
}

/// True when the text looks like a decimal-comma number (`"12,5"`, `"0,75"`, `"1.234,5"`,
/// `"1 234,5"`) and not a thousands-grouped one (`"1,200"`, `"12,345,678"`, `"1,234.5"`).
///
/// Rule (on the numeric start of the text, a unit after it is ignored): exactly one comma with
/// digits after it, no dot after it, and one of: a dot before it; a digit count after it other
/// than three; a whole part of `0` or nothing (`"0,750"`, `",750"`); space grouping before it
/// (`"1 234,567"`). `"1,200"` alone is ambiguous and reads as thousands (false).
#[must_use]
pub fn looks_decimal_comma(text: &str) -> bool {
    let chars = trim_chars(text);
    let mut i = 0;
    if matches!(chars.first(), Some('+' | '-' | '−')) {
        i = 1;
    }
    let numeric: Vec<char> = chars
        .get(i..)
        .unwrap_or_default()
        .iter()
        .copied()
        .take_while(|c| c.is_ascii_digit() || *c == '.' || *c == ',' || is_space(*c))
        .collect();
    if numeric.iter().filter(|c| **c == ',').count() != 1 {
        return false;
    }
    let Some(pos) = numeric.iter().position(|c| *c == ',') else {
        return false;
    };
    let before = numeric.get(..pos).unwrap_or_default();
    let after = numeric.get(pos + 1..).unwrap_or_default();
    let after_digits = after.iter().take_while(|c| char::is_ascii_digit(c)).count();
    if after_digits == 0 || after.contains(&'.') {
        return false;
    }
    if !before.iter().any(|c| c.is_ascii_digit()) && !before.is_empty() {
        return false;
    }
    if before.contains(&'.') || after_digits != 3 {
        return true;
    }
    let whole: String = before.iter().filter(|c| c.is_ascii_digit()).collect();
    whole.is_empty() || whole == "0" || before.iter().any(|c| is_space(*c))
}

/// A percentage or fraction as a fraction (0..1 for ordinary values).
///
/// # Rule
/// - `percent_flag` (the cell said `75%`) or `column_unit_is_percent` (header `[%]`): value / 100.
/// - Otherwise (a fraction column, or a column with no unit): values up to 1 are fractions
///   (0.75 → 0.75, 1 → 1.0); values above 1 are read as percent (75 → 0.75). This is a
///   heuristic, common practice (no source): a bare `1` means 100 %, not 1 %; the caller should
///   report each value it reinterpreted.
///
/// Negative and non-finite values pass through the same arithmetic; the caller validates them.
#[must_use]
pub fn parse_percent_or_fraction(
    value: f64,
    percent_flag: bool,
    column_unit_is_percent: bool,
) -> f64 {
    if percent_flag || column_unit_is_percent || value > 1.0 {
        value / 100.0
    } else {
        value
    }
}

// ---------------------------------------------------------------------------------------------
// Sizes

#[derive(Clone, Copy, Debug, PartialEq)]
enum LenUnit {
    Mm,
    In,
}

#[derive(Clone, Copy, Debug, PartialEq)]
enum Key {
    Dn,
    Nb,
    Nps,
    Od,
    Id,
}

#[derive(Clone, Debug, PartialEq)]
enum Tok {
    Num(f64),
    Word(String),
    Inch,
    Times,
    Diam,
    Dash,
    Other,
}

#[derive(Clone, Copy, Debug, PartialEq)]
enum Item {
    Key(Key),
    Num(f64, Option<LenUnit>),
    Times,
}

fn tokenise_size(chars: &[char]) -> Vec<Tok> {
    let mut toks = Vec::new();
    let mut i = 0;
    while let Some(&c) = chars.get(i) {
        if is_space(c) {
            i += 1;
        } else if c.is_ascii_digit()
            || vulgar(c).is_some()
            || (c == '.' && is_digit(chars.get(i + 1)))
        {
            if let Some((v, end)) = scan_fraction(chars, i, true) {
                toks.push(Tok::Num(v));
                i = end;
                continue;
            }
            let (int, j) = digits(chars, i);
            let mut k = j;
            let mut lit = if int.is_empty() { "0".to_string() } else { int };
            if matches!(chars.get(k), Some('.' | ',')) && is_digit(chars.get(k + 1)) {
                let (frac, end) = digits(chars, k + 1);
                lit.push('.');
                lit.push_str(&frac);
                k = end;
            }
            toks.push(Tok::Num(lit.parse::<f64>().unwrap_or(f64::NAN)));
            i = k;
        } else if c.is_alphabetic() {
            let mut w = String::new();
            while let Some(&d) = chars.get(i) {
                if d.is_alphabetic() {
                    w.push(d);
                } else if d != '.' {
                    break;
                }
                i += 1;
            }
            match w.as_str() {
                "x" => toks.push(Tok::Times),
                "mmnb" => {
                    toks.push(Tok::Word("mm".into()));
                    toks.push(Tok::Word("nb".into()));
                }
                "mmx" | "inx" => {
                    toks.push(Tok::Word(w.trim_end_matches('x').to_string()));
                    toks.push(Tok::Times);
                }
                "ø" => toks.push(Tok::Diam),
                _ => toks.push(Tok::Word(w)),
            }
        } else {
            i += 1;
            match c {
                '"' | '”' | '“' | '″' => toks.push(Tok::Inch),
                '\'' | '′' | '’' if matches!(chars.get(i), Some('\'' | '′' | '’')) => {
                    i += 1;
                    toks.push(Tok::Inch);
                }
                '×' | '*' => toks.push(Tok::Times),
                '⌀' | '∅' => toks.push(Tok::Diam),
                '-' | '‐' | '–' => toks.push(Tok::Dash),
                _ => toks.push(Tok::Other),
            }
        }
    }
    toks
}

fn key_of(word: &str) -> Option<Key> {
    match word {
        "dn" => Some(Key::Dn),
        "nb" | "ns" => Some(Key::Nb),
        "nps" => Some(Key::Nps),
        "od" => Some(Key::Od),
        "id" => Some(Key::Id),
        _ => None,
    }
}

fn unit_of(tok: &Tok) -> Option<LenUnit> {
    match tok {
        Tok::Inch => Some(LenUnit::In),
        Tok::Word(w) => match w.as_str() {
            "mm" => Some(LenUnit::Mm),
            "in" | "inch" | "inches" | "ins" => Some(LenUnit::In),
            _ => None,
        },
        _ => None,
    }
}

/// Turn tokens into items: keywords, numbers carrying an optional unit, and `x`. A dash is allowed
/// only between a keyword and a number (`DN-100`) or a number and its unit (`4-inch`).
fn items_of(toks: &[Tok]) -> Option<Vec<Item>> {
    let mut items: Vec<Item> = Vec::new();
    for (n, tok) in toks.iter().enumerate() {
        match tok {
            Tok::Num(v) => items.push(Item::Num(*v, None)),
            Tok::Times => items.push(Item::Times),
            Tok::Diam => items.push(Item::Key(Key::Od)),
            Tok::Dash => {
                let prev_ok = matches!(items.last(), Some(Item::Key(_) | Item::Num(_, None)));
                let next_ok = match (items.last(), toks.get(n + 1)) {
                    (Some(Item::Key(_)), Some(Tok::Num(_))) => true,
                    (Some(Item::Num(_, None)), Some(t)) => unit_of(t).is_some(),
                    _ => false,
                };
                if !(prev_ok && next_ok) {
                    return None;
                }
            }
            Tok::Inch | Tok::Word(_) => {
                if let Some(u) = unit_of(tok) {
                    match items.last_mut() {
                        Some(Item::Num(_, slot @ None)) => *slot = Some(u),
                        _ => return None,
                    }
                } else if let Tok::Word(w) = tok {
                    items.push(Item::Key(key_of(w)?));
                } else {
                    return None;
                }
            }
            Tok::Other => return None,
        }
    }
    Some(items)
}

fn length_m(v: f64, unit: Option<LenUnit>) -> f64 {
    match unit {
        Some(LenUnit::In) => v * IN_M,
        Some(LenUnit::Mm) | None => v * 1.0e-3,
    }
}

/// Read a pipe size.
///
/// Notations (case-insensitive, any spaces, `-` between a keyword and its number):
/// - DN: `DN100`, `DN 100`, `dn100`, `100NB`, `NB100`, `100 NB`, `100 mm NB`, `100mm`, and a bare
///   whole number when `header_unit` is [`SizeUnit::Millimetre`].
/// - NPS (inches): `NPS 4`, `NPS4`, `4"`, `4''`, `4 in`, `4in`, `4-inch`, `4 inch`, `1-1/2"`,
///   `1 1/2"`, `1.5"`, `3/4"`, `¾"`, `1½"`, and a bare number (or fraction) when `header_unit` is
///   [`SizeUnit::Inch`].
/// - Outside diameter (mm unless inches written): `110 OD`, `OD110`, `OD 110 mm`, `110mm OD`,
///   `Ø110`.
/// - Outside diameter × wall: `Ø114.3x6.02`, `ø114.3 x 6.02`, `114.3x6.02`, `114.3 × 6.02 mm`
///   (a unit written on one number applies to both).
/// - Inside diameter: `ID 102.3`, `102.3 ID`, `ID102.3mm`.
///
/// A unit written in the cell wins over `header_unit`. A decimal comma is accepted in sizes
/// (`114,3x6,02`). Whether a DN or NPS exists in a pipe table is not checked here.
///
/// # Errors
/// [`SizeError::BareNumber`] for a number with no unit in cell or header; [`SizeError::NotWholeDn`]
/// for a fractional DN; [`SizeError::OutOfRange`] for zero sizes, a DN above 65535, or a wall of
/// at least half the outside diameter; [`SizeError::Empty`]; otherwise [`SizeError::Unrecognised`].
pub fn parse_size(text: &str, header_unit: Option<SizeUnit>) -> Result<SizeSpec, SizeError> {
    use Item::{Key as K, Num as N};
    use LenUnit::{In, Mm};
    let owned = || text.to_string();
    let lowered = text.to_lowercase();
    let chars = trim_chars(&lowered);
    if chars.is_empty() {
        return Err(SizeError::Empty);
    }
    let toks = tokenise_size(&chars);
    let items = items_of(&toks).ok_or_else(|| SizeError::Unrecognised { text: owned() })?;

    let positive = |v: f64| -> Result<f64, SizeError> {
        if v.is_finite() && v > 0.0 {
            Ok(v)
        } else {
            Err(SizeError::OutOfRange {
                text: owned(),
                reason: "a size must be a positive number",
            })
        }
    };
    let dn = |v: f64| -> Result<SizeSpec, SizeError> {
        let v = positive(v)?;
        if v.fract() != 0.0 {
            return Err(SizeError::NotWholeDn { text: owned() });
        }
        if v > f64::from(u16::MAX) {
            return Err(SizeError::OutOfRange {
                text: owned(),
                reason: "a DN above 65535 is not a pipe size",
            });
        }
        // In range 1..=65535 and whole, so the cast is exact.
        Ok(SizeSpec::Dn(v as u16))
    };
    let od = |v: f64, u: Option<LenUnit>| -> Result<SizeSpec, SizeError> {
        Ok(SizeSpec::OuterDiameter {
            od_m: length_m(positive(v)?, u),
        })
    };
    let id = |v: f64, u: Option<LenUnit>| -> Result<SizeSpec, SizeError> {
        Ok(SizeSpec::InnerDiameter {
            id_m: length_m(positive(v)?, u),
        })
    };
    let od_wall = |a: f64,
                   ua: Option<LenUnit>,
                   b: f64,
                   ub: Option<LenUnit>|
     -> Result<SizeSpec, SizeError> {
        let od_m = length_m(positive(a)?, ua.or(ub));
        let wall_m = length_m(positive(b)?, ub.or(ua));
        if 2.0 * wall_m >= od_m {
            return Err(SizeError::OutOfRange {
                text: owned(),
                reason: "the wall must be less than half the outside diameter (a reducer such as 150x100 \
                         goes in the Size and Size out columns)",
            });
        }
        Ok(SizeSpec::OdWall { od_m, wall_m })
    };

    match items.as_slice() {
        [K(Key::Dn), N(v, None | Some(Mm))] | [N(v, None), K(Key::Dn)] => dn(*v),
        [K(Key::Nb), N(v, None | Some(Mm))] | [N(v, None | Some(Mm)), K(Key::Nb)] => dn(*v),
        [N(v, Some(Mm))] => dn(*v),
        [K(Key::Nps), N(v, None | Some(In))] | [N(v, Some(In))] => Ok(SizeSpec::Nps(positive(*v)?)),
        [K(Key::Od), N(v, u)] | [N(v, u), K(Key::Od)] => od(*v, *u),
        [K(Key::Od), N(a, ua), Item::Times, N(b, ub)] | [N(a, ua), Item::Times, N(b, ub)] => {
            od_wall(*a, *ua, *b, *ub)
        }
        [K(Key::Id), N(v, u)] | [N(v, u), K(Key::Id)] => id(*v, *u),
        [N(v, None)] => match header_unit {
            Some(SizeUnit::Millimetre) => dn(*v),
            Some(SizeUnit::Inch) => Ok(SizeSpec::Nps(positive(*v)?)),
            None => Err(SizeError::BareNumber { text: owned() }),
        },
        _ => Err(SizeError::Unrecognised { text: owned() }),
    }
}
