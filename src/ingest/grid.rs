//! Raw sheets as read by calamine: values, formulas, merged ranges and visibility, kept whole so the
//! annotated copy can reproduce every input cell.

use calamine::{Data, Dimensions, Range, Reader, SheetVisible, Xlsx, open_workbook};
use std::path::Path;

use crate::error::InputError;

/// One input sheet, every cell kept.
#[derive(Clone, Debug)]
pub struct SheetGrid {
    /// Sheet name.
    pub name: String,
    /// Hidden or very hidden in the input.
    pub hidden: bool,
    /// Cell values (formula cells hold their cached result).
    pub values: Range<Data>,
    /// Formula text per cell (empty string where the cell has no formula).
    pub formulas: Range<String>,
    /// Merged ranges.
    pub merged: Vec<Dimensions>,
}

impl SheetGrid {
    /// A sheet built from values only (CSV input, tests).
    pub fn from_values(name: impl Into<String>, values: Range<Data>) -> Self {
        SheetGrid {
            name: name.into(),
            hidden: false,
            values,
            formulas: Range::empty(),
            merged: Vec::new(),
        }
    }

    /// The value at an absolute zero-based position, `Empty` outside the used range.
    pub fn value(&self, row: u32, col: u32) -> &Data {
        static EMPTY: Data = Data::Empty;
        self.values.get_value((row, col)).unwrap_or(&EMPTY)
    }

    /// The formula at an absolute position, if any (without the leading `=`).
    pub fn formula(&self, row: u32, col: u32) -> Option<&str> {
        self.formulas
            .get_value((row, col))
            .map(String::as_str)
            .filter(|f| !f.is_empty())
    }

    /// One past the last used row (absolute).
    pub fn end_row(&self) -> u32 {
        let v = self.values.end().map(|(r, _)| r + 1).unwrap_or(0);
        let f = self.formulas.end().map(|(r, _)| r + 1).unwrap_or(0);
        v.max(f)
    }

    /// One past the last used column (absolute).
    pub fn end_col(&self) -> u32 {
        let v = self.values.end().map(|(_, c)| c + 1).unwrap_or(0);
        let f = self.formulas.end().map(|(_, c)| c + 1).unwrap_or(0);
        v.max(f)
    }

    /// The value shown for a cell, taking merged ranges into account (top-left value fills the range).
    pub fn merged_value(&self, row: u32, col: u32) -> &Data {
        for m in &self.merged {
            if row >= m.start.0 && row <= m.end.0 && col >= m.start.1 && col <= m.end.1 {
                return self.value(m.start.0, m.start.1);
            }
        }
        self.value(row, col)
    }
}

/// Read every sheet of an `.xlsx` workbook.
pub fn read_xlsx(path: &Path, file: &str) -> Result<Vec<SheetGrid>, InputError> {
    // calamine 0.38 can panic on some malformed files (an arithmetic overflow on an absurd cell
    // reference when overflow checks are on; found by fuzzing, tests/bad/fuzz-*.xlsx). Treat that
    // as an unreadable file, without the panic message. The CLI is single-threaded here.
    let hook = std::panic::take_hook();
    std::panic::set_hook(Box::new(|_| {}));
    let result = std::panic::catch_unwind(|| read_xlsx_inner(path, file));
    std::panic::set_hook(hook);
    result.unwrap_or_else(|_| {
        Err(InputError::Unreadable {
            file: file.to_string(),
            reason: "the workbook's XML is malformed (the reader stopped on it); re-save it from the spreadsheet application".into(),
        })
    })
}

fn read_xlsx_inner(path: &Path, file: &str) -> Result<Vec<SheetGrid>, InputError> {
    let unreadable = |reason: String| InputError::Unreadable {
        file: file.to_string(),
        reason,
    };
    let mut wb: Xlsx<_> = open_workbook(path).map_err(|e| unreadable(describe_xlsx_error(&e)))?;
    let metas: Vec<(String, bool)> = wb
        .sheets_metadata()
        .iter()
        .map(|s| (s.name.clone(), s.visible != SheetVisible::Visible))
        .collect();
    let mut sheets = Vec::with_capacity(metas.len());
    for (name, hidden) in metas {
        let values = match wb.worksheet_range(&name) {
            Ok(r) => r,
            // Chart sheets and dialog sheets have no cells: skip them.
            Err(calamine::XlsxError::WorksheetNotFound(_)) => continue,
            Err(e) => {
                return Err(unreadable(format!(
                    "sheet '{name}': {}",
                    describe_xlsx_error(&e)
                )));
            }
        };
        let formulas = wb
            .worksheet_formula(&name)
            .unwrap_or_else(|_| Range::empty());
        let merged = wb.merge_cells_by_sheet_name(&name).unwrap_or_default();
        sheets.push(SheetGrid {
            name,
            hidden,
            values,
            formulas,
            merged,
        });
    }
    Ok(sheets)
}

fn describe_xlsx_error(e: &calamine::XlsxError) -> String {
    match e {
        calamine::XlsxError::Zip(_) => {
            "not a valid .xlsx (zip) file; save it from the spreadsheet as Excel Workbook (.xlsx)"
                .to_string()
        }
        other => other.to_string(),
    }
}
