//! Legacy and open spreadsheet formats, `.xls` (BIFF8) and `.ods` (OpenDocument), read through
//! calamine into the same sheets an `.xlsx` gives: values, formulas and (for `.xls`) merged
//! ranges. The annotated copy is always written as `.xlsx`.

use calamine::{Data, Range, Reader, SheetVisible, Sheets};
use std::io::Cursor;

use super::grid::SheetGrid;
use crate::error::InputError;

/// Read every sheet of an `.xls` or `.ods` workbook held in memory.
///
/// # Errors
/// [`InputError::Unreadable`] when the bytes are not a workbook of that format (or calamine
/// stops on them).
pub fn read_bytes(bytes: &[u8], file: &str) -> Result<Vec<SheetGrid>, InputError> {
    // As for .xlsx: a panic inside calamine on a malformed file is an unreadable file.
    let hook = std::panic::take_hook();
    std::panic::set_hook(Box::new(|_| {}));
    let result = std::panic::catch_unwind(|| read_sheets(bytes, file));
    std::panic::set_hook(hook);
    result.unwrap_or_else(|_| {
        Err(InputError::Unreadable {
            file: file.to_string(),
            reason: "the workbook is malformed (the reader stopped on it); re-save it from the spreadsheet application".into(),
        })
    })
}

fn read_sheets(bytes: &[u8], file: &str) -> Result<Vec<SheetGrid>, InputError> {
    let unreadable = |reason: String| InputError::Unreadable {
        file: file.to_string(),
        reason,
    };
    let mut book = calamine::open_workbook_auto_from_rs(Cursor::new(bytes))
        .map_err(|e| unreadable(format!("not a readable .xls or .ods workbook ({e})")))?;
    let names: Vec<(String, bool)> = book
        .sheets_metadata()
        .iter()
        .map(|s| (s.name.clone(), s.visible != SheetVisible::Visible))
        .collect();
    let mut sheets = Vec::new();
    for (name, hidden) in names {
        let values: Range<Data> = match book.worksheet_range(&name) {
            Ok(r) => r,
            Err(e) => return Err(unreadable(format!("sheet '{name}': {e}"))),
        };
        let mut grid = SheetGrid::from_values(name.clone(), values);
        grid.hidden = hidden;
        if let Ok(f) = book.worksheet_formula(&name) {
            grid.formulas = f;
        }
        if let Sheets::Xls(xls) = &book {
            grid.merged = xls.merge_cells_by_sheet_name(&name).unwrap_or_default();
        }
        sheets.push(grid);
    }
    Ok(sheets)
}
