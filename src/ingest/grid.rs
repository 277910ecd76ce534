//! Raw sheets as read by calamine: values, formulas, merged ranges and visibility, kept whole so the
//! annotated copy can reproduce every input cell. Cells are held sparsely ([`SparseCells`]), so a
//! stray value far from the tables costs one cell, not the rectangle up to it; reading stops with
//! an error past the [`Limits`] (cell count, unzipped size, compression ratio).

use calamine::{Cell, Data, DataRef, Dimensions, Range, Reader, SheetVisible, Xlsx};
use std::path::Path;

use super::limits::{self, Limits};
use super::sparse::{SparseBuilder, SparseCells};
use crate::error::InputError;

/// One input sheet, every cell kept.
#[derive(Clone, Debug)]
pub struct SheetGrid {
    /// Sheet name.
    pub name: String,
    /// Hidden or very hidden in the input.
    pub hidden: bool,
    /// Cell values (formula cells hold their cached result); empty cells are not held.
    values: SparseCells<Data>,
    /// Formula text per cell (only cells that have a formula).
    formulas: SparseCells<String>,
    /// Merged ranges.
    pub merged: Vec<Dimensions>,
}

impl SheetGrid {
    /// A sheet built from values held sparsely, with formulas (empty strings are left out).
    pub fn new(
        name: impl Into<String>,
        values: SparseCells<Data>,
        formulas: SparseCells<String>,
    ) -> Self {
        SheetGrid {
            name: name.into(),
            hidden: false,
            values,
            formulas,
            merged: Vec::new(),
        }
    }

    /// A sheet built from a dense range of values only (CSV input, tests); empty cells are
    /// dropped.
    pub fn from_values(name: impl Into<String>, values: Range<Data>) -> Self {
        SheetGrid::new(
            name,
            sparse_from_range(&values, |d| *d == Data::Empty),
            SparseCells::default(),
        )
    }

    /// The value at an absolute zero-based position, `Empty` where no cell is held.
    pub fn value(&self, row: u32, col: u32) -> &Data {
        static EMPTY: Data = Data::Empty;
        self.values.get(row, col).unwrap_or(&EMPTY)
    }

    /// Set the value of one cell (for sheets built in code; each call may move later cells).
    pub fn set_value(&mut self, row: u32, col: u32, value: Data) {
        self.values.set(row, col, value);
    }

    /// The formula at an absolute position, if any (without the leading `=`).
    pub fn formula(&self, row: u32, col: u32) -> Option<&str> {
        self.formulas.get(row, col).map(String::as_str)
    }

    /// Whether any cell has a formula.
    pub fn has_formulas(&self) -> bool {
        !self.formulas.is_empty()
    }

    /// The value cells held, as (row, column, value), row by row.
    pub fn cells(&self) -> impl Iterator<Item = (u32, u32, &Data)> {
        self.values.iter()
    }

    /// The formula cells, as (row, column, formula), row by row.
    pub fn formula_cells(&self) -> impl Iterator<Item = (u32, u32, &str)> {
        self.formulas.iter().map(|(r, c, f)| (r, c, f.as_str()))
    }

    /// The value cells of one row, in column order.
    pub fn row(&self, row: u32) -> impl Iterator<Item = (u32, &Data)> {
        self.values.row(row)
    }

    /// The formula cells of one row, in column order.
    pub fn row_formulas(&self, row: u32) -> impl Iterator<Item = (u32, &str)> {
        self.formulas.row(row).map(|(c, f)| (c, f.as_str()))
    }

    /// The rows holding a value or a formula, ascending (a row with both may come twice).
    pub fn stored_rows(&self) -> impl Iterator<Item = u32> + '_ {
        self.values
            .rows()
            .iter()
            .chain(self.formulas.rows())
            .copied()
    }

    /// Number of cells held (values and formulas; a formula cell counts twice).
    pub fn cell_count(&self) -> usize {
        self.values.len() + self.formulas.len()
    }

    /// The columns of a row that show something, ascending: a value, a formula, or a place
    /// inside a merged range (which shows the range's top-left value).
    pub fn shown_cols(&self, row: u32) -> Vec<u32> {
        let mut cols: Vec<u32> = self.values.row(row).map(|(c, _)| c).collect();
        cols.extend(self.formulas.row(row).map(|(c, _)| c));
        for m in &self.merged {
            if row >= m.start.0 && row <= m.end.0 {
                cols.extend(m.start.1..=m.end.1.min(m.start.1.saturating_add(MERGE_COLS)));
            }
        }
        cols.sort_unstable();
        cols.dedup();
        cols
    }

    /// The rows in `rows` that hold a value or formula or lie in a merged range, ascending.
    /// Rows in between are not visited, so a gap of a million empty rows costs nothing.
    pub fn used_rows(&self, rows: std::ops::Range<u32>) -> impl Iterator<Item = u32> + '_ {
        let mut spans: Vec<(u32, u32)> = self.merged.iter().map(|m| (m.start.0, m.end.0)).collect();
        spans.sort_unstable();
        let mut next = rows.start;
        let mut span = 0;
        std::iter::from_fn(move || {
            while spans.get(span).is_some_and(|s| s.1 < next) {
                span += 1;
            }
            let m = spans.get(span).map(|s| s.0.max(next));
            let v = self.values.next_row(next);
            let f = self.formulas.next_row(next);
            let r = [v, f, m]
                .into_iter()
                .flatten()
                .min()
                .filter(|&r| r < rows.end)?;
            next = r.checked_add(1)?;
            Some(r)
        })
    }

    /// First used row (0 for an empty sheet).
    pub fn start_row(&self) -> u32 {
        let v = self.values.row_span().map(|s| s.0);
        let f = self.formulas.row_span().map(|s| s.0);
        v.into_iter().chain(f).min().unwrap_or(0)
    }

    /// One past the last used row (absolute).
    pub fn end_row(&self) -> u32 {
        let v = self.values.row_span().map_or(0, |s| s.1);
        let f = self.formulas.row_span().map_or(0, |s| s.1);
        v.max(f)
    }

    /// One past the last used column (absolute).
    pub fn end_col(&self) -> u32 {
        let v = self.values.col_span().map_or(0, |s| s.1);
        let f = self.formulas.col_span().map_or(0, |s| s.1);
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

/// Columns of a merged range listed by [`SheetGrid::shown_cols`] at most (a range across a whole
/// row only repeats its top-left text).
const MERGE_COLS: u32 = 256;

/// The used cells of a dense range, sparsely, leaving out those `skip` says are empty.
pub(crate) fn sparse_from_range<T: calamine::CellType + Clone>(
    range: &Range<T>,
    skip: impl Fn(&T) -> bool,
) -> SparseCells<T> {
    let (r0, c0) = range.start().unwrap_or((0, 0));
    let mut b = SparseBuilder::default();
    for (i, j, v) in range.used_cells() {
        if !skip(v) {
            b.push(r0 + i as u32, c0 + j as u32, v.clone());
        }
    }
    b.finish()
}

/// Read every sheet of an `.xlsx` workbook file, within the default [`Limits`].
///
/// # Errors
/// [`InputError::Unreadable`] when the file cannot be read or is not a workbook,
/// [`InputError::OverLimit`] past a limit.
pub fn read_xlsx(path: &Path, file: &str) -> Result<Vec<SheetGrid>, InputError> {
    let bytes = std::fs::read(path).map_err(|source| InputError::Io {
        file: file.to_string(),
        source,
    })?;
    read_xlsx_bytes(&bytes, file)
}

/// [`read_xlsx_with`] within the default [`Limits`].
///
/// # Errors
/// As [`read_xlsx_with`].
pub fn read_xlsx_bytes(bytes: &[u8], file: &str) -> Result<Vec<SheetGrid>, InputError> {
    read_xlsx_with(bytes, file, &Limits::default())
}

/// Read every sheet of an `.xlsx` workbook held in memory. The zip directory is checked against
/// the limits first (total unzipped size, compression ratio of large parts); then the cell values
/// are read on one thread while the formulas and merged ranges (two more passes over each sheet's
/// XML in calamine) are read on another, each counting its cells against the limit.
///
/// # Errors
/// [`InputError::Unreadable`] for a file that is not a readable workbook,
/// [`InputError::OverLimit`] past a limit.
pub fn read_xlsx_with(
    bytes: &[u8],
    file: &str,
    limits: &Limits,
) -> Result<Vec<SheetGrid>, InputError> {
    limits::check_zip(bytes, file, limits)?;
    // calamine 0.38 can panic on some malformed files (an arithmetic overflow on an absurd cell
    // reference when overflow checks are on; found by fuzzing, tests/bad/fuzz-*.xlsx). Treat that
    // as an unreadable file, without the panic message. Both reading threads run inside this
    // window and are joined before the hook is restored.
    let hook = std::panic::take_hook();
    std::panic::set_hook(Box::new(|_| {}));
    let result = std::thread::scope(|scope| {
        let extras = scope.spawn(|| read_formulas_and_merges(bytes, file, limits));
        let values = read_values(bytes, file, limits);
        match (values, extras.join()) {
            (Ok(Err(e)), _) | (Ok(Ok(_)), Ok(Err(e))) => Some(Err(e)),
            (Ok(Ok(sheets)), Ok(Ok(extras))) => Some(Ok(join_sheets(sheets, extras))),
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
    Xlsx::new(std::io::Cursor::new(bytes)).map_err(|e| InputError::Workbook {
        file: file.to_string(),
        reason: describe_xlsx_error(&e),
        source: e.into(),
    })
}

/// Sheet names with their visibility, in workbook order.
fn sheet_list(wb: &Book<'_>) -> Vec<(String, bool)> {
    wb.sheets_metadata()
        .iter()
        .map(|s| (s.name.clone(), s.visible != SheetVisible::Visible))
        .collect()
}

/// Counts cells read across a workbook against [`Limits::max_cells`].
struct Counter<'a> {
    file: &'a str,
    limits: &'a Limits,
    seen: u64,
}

impl Counter<'_> {
    fn one(&mut self, sheet: &str) -> Result<(), InputError> {
        self.seen += 1;
        if self.seen > self.limits.max_cells {
            return Err(limits::too_many_cells(self.file, sheet, self.limits));
        }
        Ok(())
    }
}

/// One sheet's cells through calamine's streaming reader: `take` turns each cell into what is
/// kept (`None`: an empty cell, not kept). A chart or dialog sheet has no cells.
fn stream_sheet<'w, 'd, T>(
    wb: &'w mut Book<'d>,
    name: &str,
    count: &mut Counter<'_>,
    mut next: impl FnMut(
        &mut calamine::XlsxCellReader<'w, std::io::Cursor<&'d [u8]>>,
    ) -> Result<Option<Option<(u32, u32, T)>>, calamine::XlsxError>,
) -> Result<Option<SparseCells<T>>, InputError> {
    let unreadable = |e: calamine::XlsxError| InputError::Workbook {
        file: count.file.to_string(),
        reason: format!("sheet '{name}': {}", describe_xlsx_error(&e)),
        source: e.into(),
    };
    let mut reader = match wb.worksheet_cells_reader(name) {
        Ok(r) => r,
        Err(calamine::XlsxError::WorksheetNotFound(_)) => return Ok(None),
        Err(calamine::XlsxError::NotAWorksheet(_)) => return Ok(Some(SparseCells::default())),
        Err(e) => return Err(unreadable(e)),
    };
    let mut cells = SparseBuilder::default();
    loop {
        match next(&mut reader) {
            Ok(None) => break,
            Ok(Some(None)) => {}
            Ok(Some(Some((r, c, v)))) => {
                count.one(name)?;
                cells.push(r, c, v);
            }
            Err(e) => return Err(unreadable(e)),
        }
    }
    Ok(Some(cells.finish()))
}

/// A cell value as kept (the reader lends shared strings).
fn owned(d: &DataRef<'_>) -> Data {
    match d {
        DataRef::Int(v) => Data::Int(*v),
        DataRef::Float(v) => Data::Float(*v),
        DataRef::String(v) => Data::String(v.clone()),
        DataRef::SharedString(v) => Data::String((*v).to_string()),
        DataRef::Bool(v) => Data::Bool(*v),
        DataRef::DateTime(v) => Data::DateTime(*v),
        DataRef::DateTimeIso(v) => Data::DateTimeIso(v.clone()),
        DataRef::DurationIso(v) => Data::DurationIso(v.clone()),
        DataRef::Error(v) => Data::Error(v.clone()),
        DataRef::Empty => Data::Empty,
    }
}

fn kept_value(cell: Option<Cell<DataRef<'_>>>) -> Option<Option<(u32, u32, Data)>> {
    let cell = cell?;
    let (r, c) = cell.get_position();
    Some(match cell.get_value() {
        DataRef::Empty => None,
        v => Some((r, c, owned(v))),
    })
}

/// The sheets with their values (formulas and merges still empty); sheets listed in the workbook
/// but missing from the package are skipped.
fn read_values(
    bytes: &[u8],
    file: &str,
    limits: &Limits,
) -> std::thread::Result<Result<Vec<SheetGrid>, InputError>> {
    std::panic::catch_unwind(|| {
        let mut wb = open(bytes, file)?;
        let mut count = Counter {
            file,
            limits,
            seen: 0,
        };
        let mut sheets = Vec::new();
        for (name, hidden) in sheet_list(&wb) {
            let values = stream_sheet(&mut wb, &name, &mut count, |r| {
                r.next_cell().map(kept_value)
            })?;
            let Some(values) = values else { continue };
            let mut grid = SheetGrid::new(name, values, SparseCells::default());
            grid.hidden = hidden;
            sheets.push(grid);
        }
        Ok(sheets)
    })
}

/// Formulas and merged ranges by sheet name. A file the values pass can read but these passes
/// cannot leaves them empty, as before; only a limit stops them with an error.
type Extras = Vec<(String, SparseCells<String>, Vec<Dimensions>)>;

fn read_formulas_and_merges(
    bytes: &[u8],
    file: &str,
    limits: &Limits,
) -> Result<Extras, InputError> {
    let Ok(mut wb) = open(bytes, file) else {
        return Ok(Vec::new());
    };
    let merges = may_have_merged_ranges(bytes);
    let mut count = Counter {
        file,
        limits,
        seen: 0,
    };
    let mut out = Vec::new();
    for (name, _) in sheet_list(&wb) {
        let formulas = stream_sheet(&mut wb, &name, &mut count, |r| {
            r.next_formula().map(|cell| {
                cell.map(|c| {
                    let (row, col) = c.get_position();
                    (!c.get_value().is_empty()).then(|| (row, col, c.get_value().clone()))
                })
            })
        });
        let formulas = match formulas {
            Ok(f) => f.unwrap_or_default(),
            Err(e @ InputError::OverLimit { .. }) => return Err(e),
            Err(_) => SparseCells::default(),
        };
        let merged = if merges {
            wb.merge_cells_by_sheet_name(&name).unwrap_or_default()
        } else {
            Vec::new()
        };
        out.push((name, formulas, merged));
    }
    Ok(out)
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
