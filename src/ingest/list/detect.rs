//! Whether a sheet holds a mixed item list, and which of its columns is the item numbering and
//! which the item text.

use calamine::Data;

use crate::ingest::describe::{self, Role};
use crate::ingest::grid::SheetGrid;
use crate::ingest::header::{self, Layout, MappedColumn};
use crate::ingest::map::HeaderMap;
use crate::ingest::quantity::{self, UnitWord};
use crate::ingest::schema::{self, TableKind};

/// Rows looked at when the headers alone do not say the table is a mixed list.
const EVIDENCE_ROWS: u32 = 500;

/// The mixed list on a sheet, if it holds one: a header row naming a text column
/// (`Description`, `Particulars`, `Item` ...) and a quantity, length, status or location column,
/// and either a Unit, Status or Location column, a sheet named as a list (`BoQ`, `MTO`,
/// `Asset register` ...), or, on a sheet not named for another table, rows that read as pipe
/// runs (a pipe word or a length in the quantity). A sheet named for a canonical table is read
/// as a list only when its headers say so.
pub fn find_list(
    grid: &SheetGrid,
    sheet_index: usize,
    named_table: Option<TableKind>,
    map: Option<&HeaderMap>,
) -> Option<Layout> {
    let layout = header::find_layout_with(grid, sheet_index, TableKind::List, map)?;
    accept(grid, layout, named_table)
}

/// The mixed list whose header is on `row` (a second table further down a sheet), judged as
/// [`find_list`] judges a sheet not named for another table.
pub fn find_list_at(
    grid: &SheetGrid,
    sheet_index: usize,
    row: u32,
    map: Option<&HeaderMap>,
) -> Option<Layout> {
    let layout = header::find_layout_in(grid, sheet_index, TableKind::List, map, row..row + 1)?;
    accept(grid, layout, None)
}

fn accept(grid: &SheetGrid, mut layout: Layout, named_table: Option<TableKind>) -> Option<Layout> {
    resolve_item_numbers(grid, &mut layout, "description", Some("item_no"));
    layout.column("description")?;
    let amount = ["qty", "length", "status", "location"]
        .iter()
        .any(|k| layout.column(k).is_some());
    if !amount {
        return None;
    }
    let by_headers = ["unit", "status", "location"]
        .iter()
        .any(|k| layout.column(k).is_some());
    let by_name = named_table == Some(TableKind::List);
    if by_headers || by_name || (named_table.is_none() && has_runs(grid, &layout)) {
        Some(layout)
    } else {
        None
    }
}

/// Whether some of the first rows read as pipe runs: a pipe word in the text, or a length in
/// the quantity cell.
fn has_runs(grid: &SheetGrid, layout: &Layout) -> bool {
    let text_col = layout.column("description").map(|c| c.col);
    let qty_col = layout.column("qty").map(|c| c.col);
    let end = layout.end_row(grid).min(layout.data_start + EVIDENCE_ROWS);
    (layout.data_start..end).any(|row| {
        let text = text_col.and_then(|c| text_of(grid.value(row, c)));
        let qty = qty_col.and_then(|c| text_of(grid.value(row, c)));
        text.is_some_and(|t| describe::describe(&t).role == Role::Run)
            || qty.is_some_and(|q| {
                matches!(
                    quantity::parse_quantity(&q, false),
                    Ok(Some(quantity::Quantity {
                        unit: Some(UnitWord::Length(_)),
                        ..
                    }))
                )
            })
    })
}

fn text_of(d: &Data) -> Option<String> {
    match d {
        Data::String(s) if !s.trim().is_empty() => Some(s.trim().to_string()),
        _ => None,
    }
}

/// Whether a cell reads as item numbering: `1`, `001`, `3.4`, `(a)`, `A.2.3`, `2b`, `iv`.
pub fn is_numbering(d: &Data) -> bool {
    match d {
        Data::Int(_) | Data::Float(_) => true,
        Data::String(s) => {
            let t = s
                .trim()
                .trim_start_matches('(')
                .trim_end_matches([')', '.']);
            !t.is_empty()
                && t.len() <= 12
                && t.split(['.', '-', '/']).all(|part| {
                    let letters = part.chars().filter(char::is_ascii_alphabetic).count();
                    let digits = part.chars().filter(char::is_ascii_digit).count();
                    !part.is_empty()
                        && letters + digits == part.len()
                        && (letters <= 1 || (digits == 0 && is_roman(part)))
                })
        }
        _ => false,
    }
}

fn is_roman(t: &str) -> bool {
    t.len() <= 5
        && t.chars()
            .all(|c| matches!(c.to_ascii_lowercase(), 'i' | 'v' | 'x'))
}

/// A column first taken for the item text (`Item`) whose values are numbering, with another
/// header that also names the text (`Description`): the first is the item number (the
/// `number_key` column, or kept as is when the table has none), the other the text. No
/// duplicate-column error for this pair. Used for mixed lists and for Fittings tables.
pub fn resolve_item_numbers(
    grid: &SheetGrid,
    layout: &mut Layout,
    text_key: &str,
    number_key: Option<&str>,
) {
    let table = layout.table;
    let Some(text) = layout.column(text_key).cloned() else {
        return;
    };
    let end = layout.end_row(grid).min(layout.data_start + EVIDENCE_ROWS);
    // Heading and note rows (one filled cell) say nothing about the column.
    let filled = |r: u32| {
        grid.row(r)
            .filter(|(_, d)| !matches!(d, Data::Empty))
            .take(2)
            .count()
    };
    let values: Vec<&Data> = (layout.data_start..end)
        .filter(|&r| filled(r) >= 2)
        .map(|r| grid.value(r, text.col))
        .filter(|d| !matches!(d, Data::Empty))
        .collect();
    let numbering = values.iter().filter(|d| is_numbering(d)).count();
    if values.is_empty() || numbering * 5 < values.len() * 4 {
        return;
    }
    let other = layout.unknown.iter().position(|(_, h)| {
        let (name, _) = header::split_header(h);
        schema::match_column(TableKind::List, &schema::fold(&name))
            .is_some_and(|s| s.key == "description")
    });
    let Some(i) = other else { return };
    let (col, header) = layout.unknown.remove(i);
    let number_spec =
        number_key.and_then(|k| schema::spec(table).columns.iter().find(|c| c.key == k));
    layout.columns.retain(|c| c.spec.key != text_key);
    if let Some(spec) = number_spec
        && layout.column(spec.key).is_none()
    {
        layout.columns.push(MappedColumn {
            spec,
            ..text.clone()
        });
    }
    // Without a numbering column the numbers stay in the copy untouched, outside the mapping
    // (not as an unknown header, which would read as a duplicate of the text column).
    layout.columns.push(MappedColumn {
        col,
        header,
        ..text
    });
    layout.columns.sort_by_key(|c| c.col);
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn numbering_is_told_from_text() {
        for t in ["1", "001", "3.4", "(a)", "A.2.3", "2b", "iv", "B/12"] {
            assert!(is_numbering(&Data::String(t.into())), "{t}");
        }
        for t in ["Gate valve", "DN150", "PIPE, DI", "Elbow 90"] {
            assert!(!is_numbering(&Data::String(t.into())), "{t}");
        }
        assert!(is_numbering(&Data::Float(3.0)));
    }
}
