//! Header rows: where a table's header is, which column is which, and the unit each column uses.

use calamine::Data;

use super::grid::SheetGrid;
use super::map::HeaderMap;
use super::schema::{self, ColumnSpec, ColumnType, TableKind};
use crate::units::{self, Unit};

/// How many rows from the top are searched for a header row.
pub const HEADER_SEARCH_ROWS: u32 = 30;

/// A header matched to a canonical column.
#[derive(Clone, Debug)]
pub struct MappedColumn {
    /// The canonical column.
    pub spec: &'static ColumnSpec,
    /// Zero-based column in the sheet.
    pub col: u32,
    /// The header text as written.
    pub header: String,
    /// The unit label as written, when one was given.
    pub unit_label: Option<String>,
    /// The unit parsed from the label (or the quantity's default).
    pub unit: Option<Unit>,
    /// Whether the unit was defaulted because none was written.
    pub unit_defaulted: bool,
    /// Whether the match came from the user's `--map` file rather than the alias table.
    pub by_map: bool,
}

/// Where a table sits in a sheet and how its columns map.
#[derive(Clone, Debug)]
pub struct Layout {
    /// The table.
    pub table: TableKind,
    /// Index of the sheet in the workbook.
    pub sheet_index: usize,
    /// Sheet name.
    pub sheet: String,
    /// Zero-based header row (the upper one when the header spans two rows).
    pub header_row: u32,
    /// Rows the header spans: 1, or 2 for a header written over two rows.
    pub header_rows: u32,
    /// Zero-based row of a units row under the header, when there is one.
    pub units_row: Option<u32>,
    /// First data row.
    pub data_start: u32,
    /// One past the last row of the table, when another table follows it on the same sheet
    /// (`None`: the table runs to the end of the sheet).
    pub data_end: Option<u32>,
    /// Matched columns.
    pub columns: Vec<MappedColumn>,
    /// Header texts that matched no column (kept untouched in the copy).
    pub unknown: Vec<(u32, String)>,
}

impl Layout {
    /// One past the table's last row on `grid`.
    pub fn end_row(&self, grid: &SheetGrid) -> u32 {
        self.data_end.unwrap_or_else(|| grid.end_row())
    }

    /// The mapped column with a key.
    pub fn column(&self, key: &str) -> Option<&MappedColumn> {
        self.columns.iter().find(|c| c.spec.key == key)
    }
}

/// Split a header into its name and unit: `Flow [m3/h]`, `Length (ft)`, `Flow, gpm`.
pub fn split_header(text: &str) -> (String, Option<String>) {
    let t = text.trim();
    for (open, close) in [('[', ']'), ('(', ')')] {
        if let (Some(a), Some(b)) = (t.rfind(open), t.rfind(close))
            && a < b
        {
            let name = format!("{}{}", &t[..a], &t[b + close.len_utf8()..]);
            let unit = t[a + open.len_utf8()..b].trim();
            return (
                name.trim().to_string(),
                (!unit.is_empty()).then(|| unit.to_string()),
            );
        }
    }
    if let Some((name, unit)) = t.rsplit_once(',') {
        let unit = unit.trim();
        if !unit.is_empty() {
            return (name.trim().to_string(), Some(unit.to_string()));
        }
    }
    (t.to_string(), None)
}

fn header_text(d: &Data) -> Option<String> {
    match d {
        Data::String(s) => {
            let s = s.trim();
            (!s.is_empty()).then(|| s.to_string())
        }
        _ => None,
    }
}

/// Header text of one cell (merged ranges give their top-left text to every cell).
fn cell_text(grid: &SheetGrid, row: u32, col: u32) -> Option<String> {
    header_text(grid.merged_value(row, col))
}

/// The column a header text names: a `--map` entry first, then the whole text (`Le/D` has no
/// unit), then the name with its unit split off (`Length [m]`), then the name with a trailing unit
/// word dropped (`Flow gpm`). Returns the column and the unit label that goes with it.
fn match_header(
    table: TableKind,
    text: &str,
    map: Option<&HeaderMap>,
) -> Option<(&'static ColumnSpec, Option<String>, bool)> {
    let (name, unit_label) = split_header(text);
    if let Some(map) = map {
        for candidate in [text, name.as_str()] {
            if let Some((spec, unit)) = map.column(table, candidate) {
                let label =
                    unit.or_else(|| (candidate != text).then(|| unit_label.clone()).flatten());
                return Some((spec, label, true));
            }
        }
    }
    if let Some(s) = schema::match_column(table, &schema::fold(text)) {
        return Some((s, None, false));
    }
    if let Some(s) = schema::match_column(table, &schema::fold(&name)) {
        return Some((s, unit_label, false));
    }
    if unit_label.is_none()
        && let Some((head, last)) = text.trim().rsplit_once(char::is_whitespace)
        && let Some(s) = schema::match_column(table, &schema::fold(head))
        && let ColumnType::Number(q) = s.ty
        && units::parse_unit(last, q).is_some()
    {
        return Some((s, Some(last.to_string()), false));
    }
    None
}

/// Match header texts (one per column) to a table's columns; returns matches and unmatched headers.
fn map_texts(
    table: TableKind,
    texts: Vec<(u32, Vec<String>)>,
    map: Option<&HeaderMap>,
) -> (Vec<MappedColumn>, Vec<(u32, String)>) {
    let mut mapped: Vec<MappedColumn> = Vec::new();
    let mut unknown = Vec::new();
    for (col, candidates) in texts {
        let hit = candidates.iter().find_map(|t| {
            match_header(table, t, map)
                .filter(|(spec, _, _)| !mapped.iter().any(|m| m.spec.key == spec.key))
                .map(|(spec, unit, by_map)| (t.clone(), spec, unit, by_map))
        });
        match hit {
            Some((text, spec, unit_label, by_map)) => mapped.push(MappedColumn {
                spec,
                col,
                header: text,
                unit_label,
                unit: None,
                unit_defaulted: false,
                by_map,
            }),
            None => {
                if let Some(first) = candidates.into_iter().next() {
                    unknown.push((col, first));
                }
            }
        }
    }
    (mapped, unknown)
}

/// One header row's texts.
fn one_row(grid: &SheetGrid, row: u32) -> Vec<(u32, Vec<String>)> {
    grid.shown_cols(row)
        .into_iter()
        .filter_map(|col| cell_text(grid, row, col).map(|t| (col, vec![t])))
        .collect()
}

/// A header spread over two rows: per column the joined text (`Line` over `No.` is `Line No.`),
/// then the lower text, then the upper one.
fn two_rows(grid: &SheetGrid, row: u32) -> Vec<(u32, Vec<String>)> {
    let mut cols = grid.shown_cols(row);
    cols.extend(grid.shown_cols(row + 1));
    cols.sort_unstable();
    cols.dedup();
    cols.into_iter()
        .filter_map(|col| {
            let top = cell_text(grid, row, col);
            let bottom = cell_text(grid, row + 1, col);
            let mut c = Vec::new();
            if let (Some(t), Some(b)) = (&top, &bottom) {
                c.push(format!("{t} {b}"));
            }
            c.extend(bottom);
            c.extend(top);
            (!c.is_empty()).then_some((col, c))
        })
        .collect()
}

fn row_has_numbers(grid: &SheetGrid, row: u32) -> bool {
    grid.row(row)
        .any(|(_, d)| matches!(d, Data::Float(_) | Data::Int(_) | Data::DateTime(_)))
}

/// Find a table's header row in a sheet: the first row within [`HEADER_SEARCH_ROWS`] whose cells
/// name at least two of the table's columns, alone or together with the row under it (a header
/// written over two rows).
pub fn find_layout(grid: &SheetGrid, sheet_index: usize, table: TableKind) -> Option<Layout> {
    find_layout_with(grid, sheet_index, table, None)
}

/// [`find_layout`] with a user's header map (`--map`), whose entries win over the aliases.
pub fn find_layout_with(
    grid: &SheetGrid,
    sheet_index: usize,
    table: TableKind,
    map: Option<&HeaderMap>,
) -> Option<Layout> {
    let start = grid.start_row();
    let last = grid.end_row().min(start + HEADER_SEARCH_ROWS);
    find_layout_in(grid, sheet_index, table, map, 0..last)
}

/// [`find_layout_with`] over given header rows only (a second table further down a sheet).
pub fn find_layout_in(
    grid: &SheetGrid,
    sheet_index: usize,
    table: TableKind,
    map: Option<&HeaderMap>,
    rows: std::ops::Range<u32>,
) -> Option<Layout> {
    for row in rows {
        let (single, single_unknown) = map_texts(table, one_row(grid, row), map);
        let units_under = (single.len() >= 2)
            .then(|| detect_units_row(grid, row + 1, &single))
            .flatten();
        let (mut columns, unknown, header_rows) =
            if units_under.is_none() && row + 1 < grid.end_row() && !row_has_numbers(grid, row + 1)
            {
                let (double, double_unknown) = map_texts(table, two_rows(grid, row), map);
                // A title line above a one-row header is not a two-row header: the lower row alone
                // must not do as well.
                let next = map_texts(table, one_row(grid, row + 1), map).0.len();
                if double.len() > single.len().max(next) && double.len() >= 2 {
                    (double, double_unknown, 2)
                } else if next > single.len() && next >= 2 {
                    // The row under names more columns on its own: it is the header (this row is a
                    // group label or a title).
                    continue;
                } else {
                    (single, single_unknown, 1)
                }
            } else {
                (single, single_unknown, 1)
            };
        if columns.len() < 2 {
            continue;
        }
        let units_row = match header_rows {
            1 => units_under,
            _ => detect_units_row(grid, row + 2, &columns),
        };
        for c in &mut columns {
            if c.unit_label.is_none()
                && let Some(ur) = units_row
                && let Some(t) = header_text(grid.value(ur, c.col))
            {
                c.unit_label = Some(t);
            }
            if let ColumnType::Number(q) = c.spec.ty {
                match &c.unit_label {
                    Some(label) => c.unit = units::parse_unit(label, q),
                    None => {
                        c.unit = Some(units::default_unit(q));
                        c.unit_defaulted = true;
                    }
                }
            }
        }
        return Some(Layout {
            table,
            sheet_index,
            sheet: grid.name.clone(),
            header_row: row,
            header_rows,
            units_row,
            data_start: row + header_rows + u32::from(units_row.is_some()),
            data_end: None,
            columns,
            unknown,
        });
    }
    None
}

/// A row right under the header is a units row when it holds no numbers and at least one of its
/// texts is a unit of its column's quantity.
fn detect_units_row(grid: &SheetGrid, row: u32, columns: &[MappedColumn]) -> Option<u32> {
    let mut units_seen = 0;
    for c in columns {
        match grid.value(row, c.col) {
            Data::Float(_) | Data::Int(_) => return None,
            Data::String(s) => {
                if let ColumnType::Number(q) = c.spec.ty
                    && units::parse_unit(s.trim(), q).is_some()
                {
                    units_seen += 1;
                } else if c.spec.ty == ColumnType::Size {
                    let f = schema::fold(s);
                    if matches!(f.as_str(), "mm" | "in" | "inch" | "dn" | "nps") {
                        units_seen += 1;
                    }
                } else if !s.trim().is_empty() && c.spec.ty == ColumnType::Text {
                    return None;
                }
            }
            _ => {}
        }
    }
    (units_seen > 0).then_some(row)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn units_come_from_brackets_parentheses_or_a_comma() {
        assert_eq!(
            split_header("Flow [m3/h]"),
            ("Flow".into(), Some("m3/h".into()))
        );
        assert_eq!(
            split_header("Length (ft)"),
            ("Length".into(), Some("ft".into()))
        );
        assert_eq!(
            split_header("Flow, gpm"),
            ("Flow".into(), Some("gpm".into()))
        );
        assert_eq!(split_header("Tag"), ("Tag".into(), None));
    }
}
