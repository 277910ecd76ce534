//! Invented data: an input that says its data is invented (the demo, the fixtures, synthetic
//! stations) carries that label into every output.
//!
//! The mark is a text cell beginning `INVENTED DATA` (any case) in the first [`MARK_ROWS`] rows
//! and [`MARK_COLS`] columns of any sheet, such as a title or note row above a table.

use calamine::Data;

use crate::error::CellRef;
use crate::ingest::Input;

/// The words that mark an input as invented.
pub const MARK: &str = "INVENTED DATA";
/// Rows of each sheet searched for the mark.
pub const MARK_ROWS: u32 = 10;
/// Columns of each sheet searched for the mark.
pub const MARK_COLS: u32 = 10;

/// The first cell that marks the input as invented, if any.
///
/// # Example
/// A sheet whose cell A2 reads `INVENTED DATA for demonstration: …` gives `Some(Lines!A2)`.
pub fn marker(input: &Input) -> Option<CellRef> {
    input.sheets.iter().find_map(|s| {
        (0..MARK_ROWS.min(s.end_row())).find_map(|r| {
            (0..MARK_COLS).find_map(|c| match s.value(r, c) {
                Data::String(t) if starts_with_mark(t) => Some(CellRef::new(&s.name, r, c)),
                _ => None,
            })
        })
    })
}

fn starts_with_mark(text: &str) -> bool {
    text.trim_start()
        .get(..MARK.len())
        .is_some_and(|head| head.eq_ignore_ascii_case(MARK))
}

/// The line every output of an invented input carries.
pub fn label(cell: &CellRef) -> String {
    format!(
        "{MARK}: the input marks its data as invented ({cell}); these results describe no real \
         plant and must not be used for one."
    )
}

#[cfg(test)]
mod tests {
    use super::starts_with_mark;

    #[test]
    fn the_mark_is_matched_at_the_start_in_any_case() {
        assert!(starts_with_mark("INVENTED DATA for demonstration"));
        assert!(starts_with_mark(
            "  Invented data: Heron Flats is fictional"
        ));
        assert!(!starts_with_mark("Data invented by nobody"));
        assert!(!starts_with_mark("INVENTED"));
        assert!(!starts_with_mark("é"));
    }
}
