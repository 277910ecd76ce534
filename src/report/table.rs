//! Report tables declared column by column: a header (`Name [unit]`, converted to the report's
//! units), a width and what each row shows, written with an autofilter over the rows. Used by the
//! comparison and review workbooks.

use rust_xlsxwriter::{Url, Worksheet, XlsxError};

use super::console::header_in;
use super::style::{MAX_CELL_CHARS, Styles, shown, truncate};
use crate::error::{CellRef, quote_sheet};

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
    /// A link to another file, or to a cell in it: (target, text). No target: the text alone.
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
    let mut factors = Vec::with_capacity(cols.len());
    for (c, column) in cols.iter().enumerate() {
        let (h, factor) = header_in(column.header, st.units);
        ws.write_string_with_format(top, c as u16, h, &st.header)?;
        ws.set_column_width(c as u16, column.width)?;
        factors.push(factor);
    }
    ws.set_freeze_panes(top + 1, 0)?;
    for (i, item) in rows.iter().enumerate() {
        let r = top + i as u32 + 1;
        for (c, column) in cols.iter().enumerate() {
            write_cell(ws, r, c as u16, (column.get)(item), factors[c], st, linked)?;
        }
    }
    if !rows.is_empty() {
        ws.autofilter(top, 0, top + rows.len() as u32, cols.len() as u16 - 1)?;
    }
    Ok(())
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
            ws.write_url_with_format(r, c, Url::new(target).set_text(text), &st.link)?;
        }
        Cell::External(None, text) => {
            ws.write_string(r, c, truncate(&text, MAX_CELL_CHARS))?;
        }
    }
    Ok(())
}
