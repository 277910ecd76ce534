//! Figure rows of the Systems sheet: a label with its SI unit, the value as a number cell in the
//! report's units, and where the value came from beside it — so every figure can be summed,
//! charted or referenced, never a number inside a sentence.

use rust_xlsxwriter::{Worksheet, XlsxError};

use super::style::{MAX_CELL_CHARS, Styles, shown, truncate};
use crate::units::header_in;

/// What a figure row holds.
pub(crate) enum Value {
    /// A quantity in the SI unit of its label (`Name [m]`); a dash when missing or not finite.
    Num(Option<f64>),
    /// A fraction written as a percentage (efficiencies, shares).
    Share(Option<f64>),
    /// A word or phrase (a control mode, a result).
    Text(String),
}

/// One row: label, value, source.
pub(crate) struct Figure {
    label: String,
    value: Value,
    basis: String,
}

/// A quantity row: `label` carries the SI unit in brackets, `value` is in that unit.
pub(crate) fn figure(
    label: impl Into<String>,
    value: Option<f64>,
    basis: impl Into<String>,
) -> Figure {
    row(label, Value::Num(value), basis)
}

/// A percentage row: `value` is a fraction.
pub(crate) fn share(
    label: impl Into<String>,
    value: Option<f64>,
    basis: impl Into<String>,
) -> Figure {
    row(label, Value::Share(value), basis)
}

/// A text row.
pub(crate) fn text(
    label: impl Into<String>,
    value: impl Into<String>,
    basis: impl Into<String>,
) -> Figure {
    row(label, Value::Text(value.into()), basis)
}

fn row(label: impl Into<String>, value: Value, basis: impl Into<String>) -> Figure {
    Figure {
        label: label.into(),
        value,
        basis: basis.into(),
    }
}

/// Write `figures` from row `r`: label (column A), value (B) and source (C). Quantities are
/// converted to the report's units with their label; a missing value is a dash. Returns the next
/// free row.
pub(crate) fn write_figures(
    ws: &mut Worksheet,
    r: u32,
    figures: &[Figure],
    st: &Styles,
) -> Result<u32, XlsxError> {
    write_figures_at(ws, r, 1, figures, st)
}

/// [`write_figures`] with the values in column `col` and the sources beside them (the Summary
/// sheet keeps its values in column C). Returns the next free row.
pub(crate) fn write_figures_at(
    ws: &mut Worksheet,
    mut r: u32,
    col: u16,
    figures: &[Figure],
    st: &Styles,
) -> Result<u32, XlsxError> {
    for f in figures {
        let (label, factor) = header_in(&f.label, st.units);
        ws.write_string_with_format(r, 0, label, &st.bold)?;
        let finite = |v: &Option<f64>| v.filter(|x| x.is_finite());
        match &f.value {
            Value::Num(v) => match finite(v) {
                Some(x) => ws.write_number_with_format(r, col, shown(x * factor), &st.n3)?,
                None => ws.write_string(r, col, "—")?,
            },
            Value::Share(v) => match finite(v) {
                Some(x) => ws.write_number_with_format(r, col, shown(x), &st.pct)?,
                None => ws.write_string(r, col, "—")?,
            },
            Value::Text(t) => ws.write_string(r, col, truncate(t, MAX_CELL_CHARS))?,
        };
        if !f.basis.is_empty() {
            ws.write_string(r, col + 1, truncate(&f.basis, MAX_CELL_CHARS))?;
        }
        r += 1;
    }
    Ok(r)
}
