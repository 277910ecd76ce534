//! Legacy and open spreadsheet formats, `.xls` (BIFF8) and `.ods` (OpenDocument), read through
//! calamine into the same sheets an `.xlsx` gives: values, formulas and (for `.xls`) merged
//! ranges. The annotated copy is always written as `.xlsx`.
//!
//! calamine reads these formats into dense ranges (every cell of the rectangle from the first to
//! the last used cell), which are turned into sparse sheets one by one. The limits are applied
//! before reading where the format allows: an `.ods` package's zip directory like an `.xlsx`'s,
//! an `.xls` file's own size against the unzipped-size limit. The dense range itself is bounded
//! by the formats: an `.xls` (BIFF8) sheet has at most 65,536 × 256 cells, and calamine refuses
//! an `.ods` sheet of more than 100 million cells. What remains is in docs/reliability.md.

use calamine::{Data, Reader, SheetVisible, Sheets};
use std::io::Cursor;

use super::grid::{SheetGrid, sparse_from_range};
use super::limits::{self, Limits};
use crate::error::InputError;

/// Read every sheet of an `.xls` or `.ods` workbook held in memory, within the default limits.
///
/// # Errors
/// As [`read_bytes_with`].
pub fn read_bytes(bytes: &[u8], file: &str) -> Result<Vec<SheetGrid>, InputError> {
    read_bytes_with(bytes, file, &Limits::default())
}

/// Read every sheet of an `.xls` or `.ods` workbook held in memory.
///
/// # Errors
/// [`InputError::Unreadable`] when the bytes are not a workbook of that format (or calamine
/// stops on them); [`InputError::OverLimit`] past a limit.
pub fn read_bytes_with(
    bytes: &[u8],
    file: &str,
    limits: &Limits,
) -> Result<Vec<SheetGrid>, InputError> {
    if bytes.starts_with(b"PK") {
        limits::check_zip(bytes, file, limits)?;
    } else {
        limits::check_size(file, bytes.len() as u64, "the file holds", limits)?;
    }
    // As for .xlsx: a panic inside calamine on a malformed file is an unreadable file.
    let hook = std::panic::take_hook();
    std::panic::set_hook(Box::new(|_| {}));
    let result = std::panic::catch_unwind(|| read_sheets(bytes, file, limits));
    std::panic::set_hook(hook);
    result.unwrap_or_else(|_| {
        Err(InputError::Unreadable {
            file: file.to_string(),
            reason: "the workbook is malformed (the reader stopped on it); re-save it from the spreadsheet application".into(),
        })
    })
}

fn read_sheets(bytes: &[u8], file: &str, limits: &Limits) -> Result<Vec<SheetGrid>, InputError> {
    let unreadable = |reason: String, e: calamine::Error| InputError::Workbook {
        file: file.to_string(),
        reason,
        source: e.into(),
    };
    let mut book = calamine::open_workbook_auto_from_rs(Cursor::new(bytes))
        .map_err(|e| unreadable(format!("not a readable .xls or .ods workbook ({e})"), e))?;
    let names: Vec<(String, bool)> = book
        .sheets_metadata()
        .iter()
        .map(|s| (s.name.clone(), s.visible != SheetVisible::Visible))
        .collect();
    let mut sheets = Vec::new();
    let mut cells = 0u64;
    for (name, hidden) in names {
        let values = match book.worksheet_range(&name) {
            Ok(r) => sparse_from_range(&r, |d| *d == Data::Empty),
            Err(e) => return Err(unreadable(format!("sheet '{name}': {e}"), e)),
        };
        let formulas = book
            .worksheet_formula(&name)
            .map(|f| sparse_from_range(&f, String::is_empty))
            .unwrap_or_default();
        let mut grid = SheetGrid::new(name.clone(), values, formulas);
        cells += grid.cell_count() as u64;
        if cells > limits.max_cells {
            return Err(limits::too_many_cells(file, &name, limits));
        }
        grid.hidden = hidden;
        if let Sheets::Xls(xls) = &book {
            grid.merged = xls.merge_cells_by_sheet_name(&name).unwrap_or_default();
        }
        sheets.push(grid);
    }
    Ok(sheets)
}
