//! Report tables declared column by column: a header (`Name [unit]`, converted to the report's
//! units), a width and what each row shows, written with an autofilter over the rows. Used by the
//! comparison and review workbooks.

use rust_xlsxwriter::{Formula, Url, Worksheet, XlsxError};

use super::style::{MAX_CELL_CHARS, Styles, shown, truncate};
use crate::error::{CellRef, quote_sheet};
use crate::units::header_in;

/// One cell of a report row.
pub(crate) enum Cell<'a> {
    /// A severity, filled with its colour.
    Severity(crate::error::Severity),
    /// A number in the column's unit (converted to the report's units), three decimals.
    Num(Option<f64>),
    /// A sum of money, two decimals with thousands separators.
    Money(Option<f64>),
    /// A count, with thousands separators.
    Count(Option<usize>),
    /// A fraction shown as a percentage.
    Pct(Option<f64>),
    /// Text.
    Text(&'a str),
    /// Text made for the row.
    Owned(String),
    /// A link to a cell of this workbook (its name as text when the sheet is not linked).
    Link(Option<&'a CellRef>, String),
    /// A link to another file, or to a cell in it (`path#Sheet!A1`, the path relative to this
    /// workbook): (target, text), written as a `HYPERLINK` formula. No target: the text alone.
    External(Option<String>, String),
}

/// A column of a report sheet.
pub(crate) struct Col<T> {
    /// Header, with the unit in brackets (converted for US units).
    pub header: &'static str,
    /// Width in characters.
    pub width: f64,
    /// What each row shows.
    pub get: fn(&T) -> Cell<'_>,
}

/// A column (for `const` tables of columns).
pub(crate) const fn col<T>(header: &'static str, width: f64, get: fn(&T) -> Cell<'_>) -> Col<T> {
    Col { header, width, get }
}

/// A link to a cell of this workbook, showing the cell's name.
pub(crate) fn link_to(c: &CellRef) -> Url {
    Url::new(format!("internal:{}!{}", quote_sheet(&c.sheet), c.a1())).set_text(c.to_string())
}

/// Write a header row at row 0 and one row per item (see [`write_table_at`]).
pub(crate) fn write_table<T>(
    ws: &mut Worksheet,
    cols: &[Col<T>],
    rows: &[T],
    st: &Styles,
    linked: bool,
) -> Result<(), XlsxError> {
    write_table_at(ws, 0, cols, rows, st, linked)
}

/// Write a header row at `top` and one row per item below it, numbers converted to the report's
/// units, the panes frozen under the header and an autofilter over the rows. `linked`: whether
/// [`Cell::Link`] cells become links (the sheets they point to are in the workbook).
pub(crate) fn write_table_at<T>(
    ws: &mut Worksheet,
    top: u32,
    cols: &[Col<T>],
    rows: &[T],
    st: &Styles,
    linked: bool,
) -> Result<(), XlsxError> {
    write_rows(ws, top, cols, rows.iter().map(Ok), st, linked).map(|_| ())
}

/// [`write_table_at`] with the rows from an iterator, written in order (so the sheet may be a
/// constant-memory one); the first error a row brings stops the writing. Returns the rows
/// written.
pub(crate) fn write_rows<T, R: std::borrow::Borrow<T>>(
    ws: &mut Worksheet,
    top: u32,
    cols: &[Col<T>],
    rows: impl IntoIterator<Item = Result<R, XlsxError>>,
    st: &Styles,
    linked: bool,
) -> Result<u32, XlsxError> {
    let mut factors = Vec::with_capacity(cols.len());
    for (c, column) in cols.iter().enumerate() {
        let (h, factor) = header_in(column.header, st.units);
        ws.write_string_with_format(top, c as u16, h, &st.header)?;
        ws.set_column_width(c as u16, column.width)?;
        factors.push(factor);
    }
    ws.set_freeze_panes(top + 1, 0)?;
    let mut n = 0u32;
    for item in rows {
        let item = item?;
        n += 1;
        for (c, column) in cols.iter().enumerate() {
            let cell = (column.get)(item.borrow());
            write_cell(ws, top + n, c as u16, cell, factors[c], st, linked)?;
        }
    }
    if n > 0 {
        ws.autofilter(top, 0, top + n, cols.len() as u16 - 1)?;
    }
    Ok(n)
}

fn write_cell(
    ws: &mut Worksheet,
    r: u32,
    c: u16,
    cell: Cell<'_>,
    factor: f64,
    st: &Styles,
    linked: bool,
) -> Result<(), XlsxError> {
    match cell {
        Cell::Num(Some(x)) if x.is_finite() => {
            ws.write_number_with_format(r, c, shown(x * factor), &st.n3)?;
        }
        Cell::Money(Some(x)) if x.is_finite() => {
            ws.write_number_with_format(r, c, shown(x), &st.n2)?;
        }
        Cell::Count(Some(n)) => {
            ws.write_number_with_format(r, c, n as f64, &st.n0)?;
        }
        Cell::Pct(Some(x)) if x.is_finite() => {
            ws.write_number_with_format(r, c, shown(x), &st.pct)?;
        }
        Cell::Num(_) | Cell::Money(_) | Cell::Count(None) | Cell::Pct(_) => {}
        Cell::Severity(sev) => {
            ws.write_string_with_format(r, c, sev.label(), st.severity(sev))?;
        }
        Cell::Text(t) => {
            ws.write_string(r, c, truncate(t, MAX_CELL_CHARS))?;
        }
        Cell::Owned(t) => {
            ws.write_string(r, c, truncate(&t, MAX_CELL_CHARS))?;
        }
        Cell::Link(Some(cell), _) if linked => {
            ws.write_url_with_format(r, c, link_to(cell), &st.link)?;
        }
        Cell::Link(cell, text) => {
            let t = cell.map_or(text, |c| c.to_string());
            ws.write_string(r, c, t)?;
        }
        Cell::External(Some(target), text) => {
            // A HYPERLINK formula, not a hyperlink object: it streams with its row, where a
            // hyperlink object (one relationship each) stays in memory until the sheet is saved.
            let quoted = |t: &str| t.replace('"', "\"\"");
            let formula = Formula::new(format!(
                "=HYPERLINK(\"{}\",\"{}\")",
                quoted(&target),
                quoted(&text)
            ))
            .set_result(&text);
            ws.write_formula_with_format(r, c, formula, &st.link)?;
        }
        Cell::External(None, text) => {
            ws.write_string(r, c, truncate(&text, MAX_CELL_CHARS))?;
        }
    }
    Ok(())
}
