//! Raw sheets as read by calamine: values, formulas, merged ranges and visibility, kept whole so the
//! annotated copy can reproduce every input cell.

use calamine::{Data, Dimensions, Range, Reader, SheetVisible, Xlsx};
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

/// Read every sheet of an `.xlsx` workbook file.
pub fn read_xlsx(path: &Path, file: &str) -> Result<Vec<SheetGrid>, InputError> {
    let bytes = std::fs::read(path).map_err(|e| InputError::Unreadable {
        file: file.to_string(),
        reason: e.to_string(),
    })?;
    read_xlsx_bytes(&bytes, file)
}

/// Read every sheet of an `.xlsx` workbook held in memory. The cell values are read on one
/// thread while the formulas and merged ranges (two more passes over each sheet's XML in
/// calamine) are read on another.
pub fn read_xlsx_bytes(bytes: &[u8], file: &str) -> Result<Vec<SheetGrid>, InputError> {
    // calamine 0.38 can panic on some malformed files (an arithmetic overflow on an absurd cell
    // reference when overflow checks are on; found by fuzzing, tests/bad/fuzz-*.xlsx). Treat that
    // as an unreadable file, without the panic message. Both reading threads run inside this
    // window and are joined before the hook is restored.
    let hook = std::panic::take_hook();
    std::panic::set_hook(Box::new(|_| {}));
    let result = std::thread::scope(|scope| {
        let extras = scope.spawn(|| read_formulas_and_merges(bytes, file));
        let values = read_values(bytes, file);
        match (values, extras.join()) {
            (Ok(Err(e)), _) => Some(Err(e)),
            (Ok(Ok(sheets)), Ok(extras)) => Some(Ok(join_sheets(sheets, extras))),
            _ => None,
        }
    });
    std::panic::set_hook(hook);
    result.unwrap_or_else(|| {
        Err(InputError::Unreadable {
            file: file.to_string(),
            reason: "the workbook's XML is malformed (the reader stopped on it); re-save it from the spreadsheet application".into(),
        })
    })
}

type Book<'a> = Xlsx<std::io::Cursor<&'a [u8]>>;

fn open<'a>(bytes: &'a [u8], file: &str) -> Result<Book<'a>, InputError> {
    Xlsx::new(std::io::Cursor::new(bytes)).map_err(|e| InputError::Unreadable {
        file: file.to_string(),
        reason: describe_xlsx_error(&e),
    })
}

/// Sheet names with their visibility, in workbook order.
fn sheet_list(wb: &Book<'_>) -> Vec<(String, bool)> {
    wb.sheets_metadata()
        .iter()
        .map(|s| (s.name.clone(), s.visible != SheetVisible::Visible))
        .collect()
}

/// The sheets with their values (formulas and merges still empty); chart and dialog sheets,
/// which have no cells, are skipped.
fn read_values(
    bytes: &[u8],
    file: &str,
) -> std::thread::Result<Result<Vec<SheetGrid>, InputError>> {
    std::panic::catch_unwind(|| {
        let mut wb = open(bytes, file)?;
        let mut sheets = Vec::new();
        for (name, hidden) in sheet_list(&wb) {
            let values = match wb.worksheet_range(&name) {
                Ok(r) => r,
                Err(calamine::XlsxError::WorksheetNotFound(_)) => continue,
                Err(e) => {
                    return Err(InputError::Unreadable {
                        file: file.to_string(),
                        reason: format!("sheet '{name}': {}", describe_xlsx_error(&e)),
                    });
                }
            };
            sheets.push(SheetGrid {
                name,
                hidden,
                values,
                formulas: Range::empty(),
                merged: Vec::new(),
            });
        }
        Ok(sheets)
    })
}

/// Formulas and merged ranges by sheet name. A file the values pass can read but these passes
/// cannot leaves them empty, as before.
type Extras = Vec<(String, Range<String>, Vec<Dimensions>)>;

fn read_formulas_and_merges(bytes: &[u8], file: &str) -> Extras {
    let Ok(mut wb) = open(bytes, file) else {
        return Vec::new();
    };
    let merges = may_have_merged_ranges(bytes);
    sheet_list(&wb)
        .into_iter()
        .map(|(name, _)| {
            let formulas = wb
                .worksheet_formula(&name)
                .unwrap_or_else(|_| Range::empty());
            let merged = if merges {
                wb.merge_cells_by_sheet_name(&name).unwrap_or_default()
            } else {
                Vec::new()
            };
            (name, formulas, merged)
        })
        .collect()
}

/// False only when no worksheet part of the package mentions `mergeCell` (the element that
/// holds merged ranges, with any namespace prefix): then no sheet has merged ranges. Reading them
/// through calamine is a full XML pass per sheet; most registers have none, and scanning the
/// inflated bytes for the word is several times cheaper. Anything unexpected answers true, so
/// the full pass runs.
fn may_have_merged_ranges(bytes: &[u8]) -> bool {
    use std::io::Read;
    const WORD: &[u8] = b"mergeCell";
    let Ok(mut zip) = zip::ZipArchive::new(std::io::Cursor::new(bytes)) else {
        return true;
    };
    let finder = memchr::memmem::Finder::new(WORD);
    let mut buf = vec![0u8; 1 << 16];
    for i in 0..zip.len() {
        let Ok(mut part) = zip.by_index(i) else {
            return true;
        };
        let Ok(name) = part.name().map(|n| n.to_ascii_lowercase()) else {
            return true;
        };
        if !name.starts_with("xl/worksheets/") || !name.ends_with(".xml") {
            continue;
        }
        // Keep the tail of each chunk so a word split across two reads is still found.
        let mut kept = 0;
        loop {
            match part.read(&mut buf[kept..]) {
                Ok(0) => break,
                Ok(n) => {
                    let end = kept + n;
                    if finder.find(&buf[..end]).is_some() {
                        return true;
                    }
                    kept = (WORD.len() - 1).min(end);
                    buf.copy_within(end - kept..end, 0);
                }
                Err(_) => return true,
            }
        }
    }
    false
}

fn join_sheets(mut sheets: Vec<SheetGrid>, extras: Extras) -> Vec<SheetGrid> {
    for (name, formulas, merged) in extras {
        if let Some(s) = sheets.iter_mut().find(|s| s.name == name) {
            s.formulas = formulas;
            s.merged = merged;
        }
    }
    sheets
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

#[cfg(test)]
mod tests {
    use super::*;

    fn book(merge: bool) -> Vec<u8> {
        let mut wb = rust_xlsxwriter::Workbook::new();
        let ws = wb.add_worksheet();
        ws.write_string(0, 0, "Line").unwrap();
        if merge {
            ws.merge_range(2, 0, 2, 3, "a note across four cells", &Default::default())
                .unwrap();
        }
        wb.save_to_buffer().unwrap()
    }

    #[test]
    fn merged_ranges_are_looked_for_only_where_a_sheet_has_them() {
        assert!(may_have_merged_ranges(&book(true)));
        assert!(!may_have_merged_ranges(&book(false)));
        // Not a zip: answer "maybe", so the full pass runs and reports the problem.
        assert!(may_have_merged_ranges(b"not a zip"));
        let sheets = read_xlsx_bytes(&book(true), "t.xlsx").unwrap();
        assert_eq!(sheets[0].merged.len(), 1);
    }
}
