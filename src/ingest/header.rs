//! Header rows: where a table's header is, which column is which, and the unit each column uses.

use calamine::Data;

use super::grid::SheetGrid;
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
    /// Zero-based header row.
    pub header_row: u32,
    /// Zero-based row of a units row under the header, when there is one.
    pub units_row: Option<u32>,
    /// First data row.
    pub data_start: u32,
    /// Matched columns.
    pub columns: Vec<MappedColumn>,
    /// Header texts that matched no column (kept untouched in the copy).
    pub unknown: Vec<(u32, String)>,
}

impl Layout {
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
            return (name.trim().to_string(), (!unit.is_empty()).then(|| unit.to_string()));
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

/// Match the texts of one row to a table's columns; returns matches and unmatched headers.
fn map_row(grid: &SheetGrid, table: TableKind, row: u32) -> (Vec<MappedColumn>, Vec<(u32, String)>) {
    let mut mapped: Vec<MappedColumn> = Vec::new();
    let mut unknown = Vec::new();
    for col in 0..grid.end_col() {
        let Some(text) = header_text(grid.merged_value(row, col)) else {
            continue;
        };
        let (name, unit_label) = split_header(&text);
        // A header whose whole text is a column name wins over a split one ("Le/D" has no unit).
        let whole = schema::match_column(table, &schema::fold(&text));
        let (spec, unit_label) = match whole {
            Some(s) => (Some(s), None),
            None => (schema::match_column(table, &schema::fold(&name)), unit_label),
        };
        match spec {
            Some(spec) if !mapped.iter().any(|m| m.spec.key == spec.key) => mapped.push(MappedColumn {
                spec,
                col,
                header: text,
                unit_label,
                unit: None,
                unit_defaulted: false,
            }),
            _ => unknown.push((col, text)),
        }
    }
    (mapped, unknown)
}

/// Find a table's header row in a sheet: the first row within [`HEADER_SEARCH_ROWS`] whose cells
/// name at least two of the table's columns.
pub fn find_layout(grid: &SheetGrid, sheet_index: usize, table: TableKind) -> Option<Layout> {
    let start = grid.values.start().map(|(r, _)| r).unwrap_or(0);
    let last = grid.end_row().min(start + HEADER_SEARCH_ROWS);
    for row in 0..last {
        let (mut columns, unknown) = map_row(grid, table, row);
        if columns.len() < 2 {
            continue;
        }
        let units_row = detect_units_row(grid, row + 1, &columns);
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
            units_row,
            data_start: row + 1 + u32::from(units_row.is_some()),
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
        assert_eq!(split_header("Flow [m3/h]"), ("Flow".into(), Some("m3/h".into())));
        assert_eq!(split_header("Length (ft)"), ("Length".into(), Some("ft".into())));
        assert_eq!(split_header("Flow, gpm"), ("Flow".into(), Some("gpm".into())));
        assert_eq!(split_header("Tag"), ("Tag".into(), None));
    }
}
