//! Cells outside every table: values on a sheet that holds a table but that no table reads, such
//! as a number typed far to the right or at the very bottom of the sheet. They are kept in the
//! annotated copy at their place like every cell; reading reports them once per sheet (an info
//! diagnostic naming the first cells) so a value typed into the wrong place is seen.
//!
//! A table covers its header, units and data rows, from its first to its last header column. The
//! rows above a sheet's first table (a title block, the `INVENTED DATA` note) are not reported,
//! nor are sheets without a table (a read-me sheet), which are only copied.

use crate::error::{CellRef, Diagnostic, Severity};
use crate::ingest::{Input, Layout, SheetGrid};

/// Cells named in the message at most.
const NAMED: usize = 3;

/// The rectangle a table covers: rows `rows`, columns `first..=last`.
struct Area {
    rows: std::ops::Range<u32>,
    first: u32,
    last: u32,
}

fn area(grid: &SheetGrid, l: &Layout) -> Area {
    let cols = l
        .columns
        .iter()
        .map(|c| c.col)
        .chain(l.unknown.iter().map(|(c, _)| *c));
    let (first, last) = cols.fold((u32::MAX, 0), |(a, b), c| (a.min(c), b.max(c)));
    Area {
        rows: l.header_row..l.end_row(grid).max(l.data_start),
        first,
        last,
    }
}

/// Add one info diagnostic per sheet that holds cells outside every table.
pub fn report(input: &mut Input) {
    let mut found = Vec::new();
    for (i, grid) in input.sheets.iter().enumerate() {
        let areas: Vec<Area> = input
            .layouts
            .iter()
            .filter(|l| l.sheet_index == i)
            .map(|l| area(grid, l))
            .collect();
        let Some(top) = areas.iter().map(|a| a.rows.start).min() else {
            continue;
        };
        let inside = |r: u32, c: u32| {
            areas
                .iter()
                .any(|a| a.rows.contains(&r) && (a.first..=a.last).contains(&c))
        };
        let mut count = 0usize;
        let mut named = Vec::new();
        for (r, c, _) in grid.cells().filter(|&(r, c, _)| r >= top && !inside(r, c)) {
            count += 1;
            if named.len() < NAMED {
                named.push(CellRef::new(&grid.name, r, c));
            }
        }
        if let Some(first) = named.first().cloned() {
            let list: Vec<String> = named.iter().map(ToString::to_string).collect();
            let more = count.saturating_sub(named.len());
            let tail = if more > 0 {
                format!(" and {more} more")
            } else {
                String::new()
            };
            found.push(Diagnostic {
                severity: Severity::Info,
                file: input.file_of(&grid.name).to_string(),
                cell: Some(first),
                message: format!(
                    "{count} cell(s) outside every table, kept in the annotated copy but not read: {}{tail}",
                    list.join(", ")
                ),
                hint: Some(
                    "move a value that belongs to a table into its rows and columns, or leave it as a note"
                        .into(),
                ),
            });
        }
    }
    input.diagnostics.extend(found);
}
