//! Mixed item lists: one table whose rows are pipe runs and fittings together, as estimators'
//! takeoffs and bills of quantities and maintenance engineers' asset-register exports keep them.
//!
//! A list is recognised by its headers ([`detect::find_list`]); each row is split into a run or
//! a fitting by its description ([`describe`](mod@crate::ingest::describe)) and its unit
//! ([`crate::ingest::quantity`]); lines come from a Line column, section headings, tags or
//! locations ([`lines`](mod@lines)). The rows read are the same [`PipeRow`](crate::ingest::PipeRow)s and
//! [`FittingRow`](crate::ingest::FittingRow)s the Pipes and Fittings tables give, and the list
//! sheet gets a Pipes and a Fittings view layout so findings and the annotated copy point at
//! its cells.

pub mod columns;
pub mod detect;
pub mod lines;
mod read;

pub use detect::find_list;
pub use read::status_in_path;

use crate::error::CellRef;
use crate::ingest::header::{Layout, MappedColumn};
use crate::ingest::schema::{self, TableKind};
use crate::ingest::{Input, ReadOptions};
use lines::KnownLines;

/// What a row of a mixed list became.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Became {
    /// A pipe run.
    Run,
    /// A fitting.
    Fitting,
    /// A section heading naming a line.
    Heading,
    /// Skipped, with a reason (totals, allowances, notes, items outside the flow path).
    Skipped,
    /// Left out of the audit by its status (decommissioned, removed, spare ...).
    LeftOut,
}

impl Became {
    /// The word shown by `check`.
    pub fn word(self) -> &'static str {
        match self {
            Became::Run => "run",
            Became::Fitting => "fitting",
            Became::Heading => "heading",
            Became::Skipped => "skipped",
            Became::LeftOut => "left out",
        }
    }
}

/// How one row of a mixed list was read, for `check` and the Parse report.
#[derive(Clone, Debug, PartialEq)]
pub struct Classified {
    /// The row's text cell.
    pub cell: CellRef,
    /// What it became.
    pub became: Became,
    /// Kind and line, or the heading's line.
    pub what: String,
    /// The words that decided.
    pub deciding: String,
}

/// Read every mixed list of an input (one file's, after its Lines table is read): rows, report
/// entries and the Pipes and Fittings views of each list sheet.
pub fn read_lists(input: &mut Input, options: &ReadOptions) {
    let lists: Vec<Layout> = input
        .layouts
        .iter()
        .filter(|l| l.table == TableKind::List)
        .cloned()
        .collect();
    if lists.is_empty() {
        return;
    }
    let known = KnownLines::new(input.lines.iter().map(|l| l.line.clone()));
    let locations = options
        .map
        .as_ref()
        .map(|m| m.locations().clone())
        .unwrap_or_default();
    for layout in lists {
        let mut out = read::ListOut::default();
        read::read_list(
            &input.file,
            &input.sheets[layout.sheet_index],
            &layout,
            &known,
            &locations,
            &mut out,
        );
        input.pipes.append(&mut out.pipes);
        input.fittings.append(&mut out.fittings);
        input.diagnostics.append(&mut out.diagnostics);
        input.report.conversions.append(&mut out.conversions);
        input.report.skipped.append(&mut out.skipped);
        input.report.left_out.append(&mut out.left_out);
        input.report.classified.append(&mut out.classified);
        input.report.erred.append(&mut out.erred);
        if out.blank_rows > 0 {
            input
                .report
                .blank_rows
                .push((layout.sheet.clone(), out.blank_rows));
        }
        input.layouts.push(view(&layout, TableKind::Pipes));
        input.layouts.push(view(&layout, TableKind::Fittings));
    }
}

/// A list's columns seen as a Pipes or Fittings table (the quantity is the runs' length, the
/// description the fittings' item), so cell references into the list work as for the
/// canonical tables.
fn view(list: &Layout, table: TableKind) -> Layout {
    let spec = schema::spec(table);
    let mut columns: Vec<MappedColumn> = Vec::new();
    for c in &list.columns {
        let key = match (table, c.spec.key) {
            (TableKind::Pipes, "qty") if list.column("length").is_none() => "length",
            (TableKind::Fittings, "description") => "item",
            (_, k) => k,
        };
        if let Some(s) = spec.columns.iter().find(|s| s.key == key) {
            columns.push(MappedColumn {
                spec: s,
                ..c.clone()
            });
        }
    }
    Layout {
        table,
        columns,
        unknown: Vec::new(),
        ..list.clone()
    }
}

/// Whether a layout is a Pipes or Fittings view of a mixed list (not a table of its own).
pub fn is_view(input: &Input, layout: &Layout) -> bool {
    matches!(layout.table, TableKind::Pipes | TableKind::Fittings)
        && input.layouts.iter().any(|l| {
            l.table == TableKind::List
                && l.sheet == layout.sheet
                && l.header_row == layout.header_row
        })
}
