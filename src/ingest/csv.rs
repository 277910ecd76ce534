//! CSV tables read into the same grid a workbook sheet gives, so the rest of the reading is shared.
//!
//! The bytes are decoded first ([`decode`]: UTF-8 with or without BOM, UTF-16 with BOM,
//! otherwise Windows-1252). The separator is found from the first line (`,`, `;` or tab, outside
//! quotes). Fields may be quoted with `"` (a doubled `""` inside is one quote) and may span
//! lines; the `csv` crate splits them. A field that Rust reads
//! as a plain decimal number becomes a number cell; every other non-empty field stays text and is
//! read like a text cell of a workbook (decimal comma, thousands, units...).

use calamine::Data;

use super::grid::SheetGrid;
use super::sparse::{SparseBuilder, SparseCells};

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

/// Split CSV text into records of fields (the `csv` crate: RFC 4180 quoting, a doubled `""`
/// inside quotes is one quote, fields may span lines; rows may have different lengths). A
/// leading byte-order mark is dropped.
pub fn records(text: &str, sep: char) -> Vec<Vec<String>> {
    let text = text.strip_prefix('\u{FEFF}').unwrap_or(text);
    let Ok(delimiter) = u8::try_from(sep) else {
        return Vec::new();
    };
    let mut reader = csv::ReaderBuilder::new()
        .delimiter(delimiter)
        .has_headers(false)
        .flexible(true)
        .from_reader(text.as_bytes());
    let mut out = Vec::new();
    for record in reader.byte_records() {
        // The text is valid UTF-8 and the separators are ASCII, so every field is too; a
        // malformed record (none are, with `flexible`) ends the table.
        let Ok(record) = record else { break };
        out.push(
            record
                .iter()
                .map(|f| String::from_utf8_lossy(f).into_owned())
                .collect(),
        );
    }
    out
}

/// The text encoding a CSV file was read in.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum TextEncoding {
    /// UTF-8, without a byte-order mark.
    Utf8,
    /// UTF-8 with a byte-order mark.
    Utf8Bom,
    /// UTF-16 (little or big endian) with a byte-order mark: a spreadsheet's "Unicode text"
    /// export, usually tab-separated.
    Utf16,
    /// Windows-1252 (any bytes that are not UTF-8 and carry no byte-order mark).
    Windows1252,
}

/// Decode a CSV file's bytes: a byte-order mark says UTF-8 or UTF-16; otherwise UTF-8 when the
/// bytes are valid UTF-8, else Windows-1252 (what spreadsheet applications write as "CSV" on
/// Western-European systems; decoded with `encoding_rs` per the WHATWG Encoding Standard).
pub fn decode(bytes: &[u8]) -> (String, TextEncoding) {
    if let Some((encoding, bom)) = encoding_rs::Encoding::for_bom(bytes) {
        let (text, _) = encoding.decode_without_bom_handling(&bytes[bom..]);
        let kind = if encoding == encoding_rs::UTF_8 {
            TextEncoding::Utf8Bom
        } else {
            TextEncoding::Utf16
        };
        return (text.into_owned(), kind);
    }
    match std::str::from_utf8(bytes) {
        Ok(t) => (t.to_string(), TextEncoding::Utf8),
        Err(_) => {
            let (text, _, _) = encoding_rs::WINDOWS_1252.decode(bytes);
            (text.into_owned(), TextEncoding::Windows1252)
        }
    }
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
    // Held sparsely: a line with a million separators costs its fields, not a million columns
    // on every line.
    let mut cells = SparseBuilder::default();
    for (r, rec) in recs.iter().enumerate() {
        for (c, f) in rec.iter().enumerate() {
            let d = cell(f);
            if d != Data::Empty {
                cells.push(r as u32, c as u32, d);
            }
        }
    }
    SheetGrid::new(name, cells.finish(), SparseCells::default())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn encodings_are_detected() {
        // "Ø110" and "°C" in each encoding (byte values per the Unicode and WHATWG
        // windows-1252 tables).
        let text = "Size;T [°C]\nØ110;15\n";
        let utf8 = text.as_bytes().to_vec();
        let mut bom = vec![0xEF, 0xBB, 0xBF];
        bom.extend_from_slice(text.as_bytes());
        let mut utf16 = vec![0xFF, 0xFE];
        for u in text.encode_utf16() {
            utf16.extend_from_slice(&u.to_le_bytes());
        }
        let cp1252: Vec<u8> = text
            .chars()
            .map(|c| match c {
                'Ø' => 0xD8,
                '°' => 0xB0,
                c => c as u8,
            })
            .collect();
        for (bytes, kind) in [
            (utf8, TextEncoding::Utf8),
            (bom, TextEncoding::Utf8Bom),
            (utf16, TextEncoding::Utf16),
            (cp1252, TextEncoding::Windows1252),
        ] {
            assert_eq!(decode(&bytes), (text.to_string(), kind));
        }
        // Windows-1252 is not Latin-1: 0x80 is the euro sign.
        assert_eq!(decode(&[0x80, b'5']).0, "€5");
    }

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
