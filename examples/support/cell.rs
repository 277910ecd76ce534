//! One spreadsheet cell to write, shared by the fixture generators (`make_messy_fixtures`) and
//! the test kit (`tests/common/book.rs`), so rows of cells are written to a sheet one way.

use rust_xlsxwriter::{ExcelDateTime, Format, Formula, Worksheet, XlsxError};

/// A cell to write.
#[derive(Clone, Debug)]
pub enum Cell {
    /// Text.
    S(String),
    /// Number.
    N(f64),
    /// Formula with its cached result.
    F(String, String),
    /// Date and time (ISO text, written as an Excel date in the `date` format given to [`put`]).
    D(&'static str),
    /// Boolean.
    B(bool),
    /// Nothing.
    E,
}

/// Write `cell` at zero-based `row` and `col` of `ws`.
///
/// # Errors
///
/// The writer's error for a cell outside the sheet, a text too long, or a date that does not
/// parse.
pub fn put(
    ws: &mut Worksheet,
    row: u32,
    col: u16,
    cell: &Cell,
    date: &Format,
) -> Result<(), XlsxError> {
    match cell {
        Cell::S(t) => ws.write_string(row, col, t).map(|_| ()),
        Cell::N(x) => ws.write_number(row, col, *x).map(|_| ()),
        Cell::F(f, cached) => ws
            .write_formula(row, col, Formula::new(f).set_result(cached))
            .map(|_| ()),
        Cell::D(iso) => {
            let dt = ExcelDateTime::parse_from_str(iso)?;
            ws.write_datetime_with_format(row, col, &dt, date)
                .map(|_| ())
        }
        Cell::B(b) => ws.write_boolean(row, col, *b).map(|_| ()),
        Cell::E => Ok(()),
    }
}
