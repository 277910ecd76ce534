//! CSV tables read into the same grid a workbook sheet gives, so the rest of the reading is shared.
//!
//! The separator is found from the first line (`,`, `;` or tab, outside quotes). Fields may be
//! quoted with `"` (a doubled `""` inside is one quote) and may span lines. A field that Rust reads
//! as a plain decimal number becomes a number cell; every other non-empty field stays text and is
//! read like a text cell of a workbook (decimal comma, thousands, units...).

use calamine::{Data, Range};

use super::grid::SheetGrid;

/// The separator of a CSV text: the most frequent of `,`, `;` and tab on its first line, outside
/// quotes (`,` when none appears).
pub fn detect_separator(text: &str) -> char {
    let first = text.lines().next().unwrap_or_default();
    let mut counts = [(',', 0usize), (';', 0), ('\t', 0)];
    let mut quoted = false;
    for c in first.chars() {
        if c == '"' {
            quoted = !quoted;
        } else if !quoted && let Some(slot) = counts.iter_mut().find(|(s, _)| *s == c) {
            slot.1 += 1;
        }
    }
    counts
        .iter()
        .copied()
        .max_by_key(|(s, n)| (*n, *s == ','))
        .filter(|(_, n)| *n > 0)
        .map_or(',', |(s, _)| s)
}

/// Split CSV text into records of fields.
pub fn records(text: &str, sep: char) -> Vec<Vec<String>> {
    let text = text.strip_prefix('\u{FEFF}').unwrap_or(text);
    let mut out = Vec::new();
    let mut record: Vec<String> = Vec::new();
    let mut field = String::new();
    let mut quoted = false;
    let mut chars = text.chars().peekable();
    while let Some(c) = chars.next() {
        if quoted {
            if c == '"' {
                if chars.peek() == Some(&'"') {
                    field.push('"');
                    chars.next();
                } else {
                    quoted = false;
                }
            } else {
                field.push(c);
            }
        } else if c == '"' && field.trim().is_empty() {
            field.clear();
            quoted = true;
        } else if c == sep {
            record.push(std::mem::take(&mut field));
        } else if c == '\n' || c == '\r' {
            if c == '\r' && chars.peek() == Some(&'\n') {
                chars.next();
            }
            record.push(std::mem::take(&mut field));
            out.push(std::mem::take(&mut record));
        } else {
            field.push(c);
        }
    }
    if !field.is_empty() || !record.is_empty() {
        record.push(field);
        out.push(record);
    }
    out
}

/// One CSV field as a cell value.
fn cell(field: &str) -> Data {
    let t = field.trim();
    if t.is_empty() {
        return Data::Empty;
    }
    let plain = t
        .chars()
        .all(|c| c.is_ascii_digit() || matches!(c, '.' | '-' | '+' | 'e' | 'E'))
        && t.chars().any(|c| c.is_ascii_digit());
    match t.parse::<f64>() {
        Ok(v) if plain && v.is_finite() => Data::Float(v),
        _ => Data::String(field.to_string()),
    }
}

/// A CSV text as a sheet named `name`.
pub fn sheet_from_text(name: &str, text: &str) -> SheetGrid {
    let recs = records(text, detect_separator(text));
    let rows = recs.len();
    let cols = recs.iter().map(Vec::len).max().unwrap_or(0);
    if rows == 0 || cols == 0 {
        return SheetGrid::from_values(name, Range::empty());
    }
    let mut range = Range::new((0, 0), (rows as u32 - 1, cols as u32 - 1));
    for (r, rec) in recs.iter().enumerate() {
        for (c, f) in rec.iter().enumerate() {
            let d = cell(f);
            if d != Data::Empty {
                range.set_value((r as u32, c as u32), d);
            }
        }
    }
    SheetGrid::from_values(name, range)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn quoted_fields_separators_and_numbers() {
        let text = "Line;Length [m];Size\r\nL-1;\"12,5\";\"4\"\"\"\nL-2;7.25;DN100\n";
        assert_eq!(detect_separator(text), ';');
        let g = sheet_from_text("Pipes", text);
        assert_eq!(g.value(1, 1), &Data::String("12,5".into()));
        assert_eq!(g.value(1, 2), &Data::String("4\"".into()));
        assert_eq!(g.value(2, 1), &Data::Float(7.25));
        assert_eq!(g.value(0, 0), &Data::String("Line".into()));
        assert_eq!(detect_separator("a,b,c\n"), ',');
        assert_eq!(detect_separator("a\tb\n"), '\t');
        assert_eq!(
            records("a,\"b\nc\",d", ','),
            vec![vec!["a".to_string(), "b\nc".into(), "d".into()]]
        );
    }
}
