//! Typed rows read from the located tables, one cell at a time, with every problem collected.
//!
//! One file per row type (`lines`, `pipes`, `fittings`, `systems`, `fluids`, `pump_curve`);
//! `cells` reads the cells of a row. Mixed item lists are read by [`super::list`] into the
//! same rows.

mod cells;
mod fittings;
mod fluids;
mod intern;
mod lines;
mod pipes;
mod pump_curve;
pub mod shares;
mod systems;

pub use cells::format_number;
pub(crate) use cells::{Cells, data_text, decimal_comma_columns, erred_row, skip_reason, truncate};
pub use fittings::FittingRow;
pub use fluids::FluidRow;
pub use lines::{LineRow, Service};
pub use pipes::PipeRow;
pub(crate) use pipes::run_assumptions;
pub use pump_curve::PumpCurveRow;
pub use systems::{Control, Metered, SITE_ELEVATION_RANGE_M, SystemRow, TestHead, TestPoint};

use std::collections::HashSet;

use super::Input;
use super::schema::TableKind;
use crate::error::{CellRef, Diagnostic, Severity};
use crate::sentence::Sentence;
use cells::Sink as TableSink;

/// Where a row came from.
#[derive(Clone, Debug, PartialEq)]
pub struct Origin {
    /// Sheet name.
    pub sheet: String,
    /// Zero-based row.
    pub row: u32,
}

/// A value the tool assumed because the cell was blank.
#[derive(Clone, Debug, PartialEq)]
pub struct Assumed {
    /// The (blank) cell, when the column exists; otherwise the row's first cell.
    pub cell: CellRef,
    /// Canonical column key.
    pub key: &'static str,
    /// What was assumed, in words (its figures in SI, rendered in the report's units).
    pub what: Sentence,
}

/// Read all tables of an input into its row vectors. Fittings, the longest table of a register,
/// are read on a second thread while this one reads the others; what the tables report is
/// appended in table order, so the result does not depend on the threads.
pub fn read_all(input: &mut Input) {
    let (sinks, (lines, pipes, fittings, systems, fluids, pump_curves)) = {
        let input = &*input;
        std::thread::scope(|scope| {
            let fittings = scope.spawn(|| {
                crate::worker::fault::point(crate::worker::fault::Place::Read);
                let mut sink = TableSink::default();
                let rows = fittings::read_fittings(input, &mut sink);
                (sink, rows)
            });
            let mut sinks: [TableSink; 6] = Default::default();
            let lines = lines::read_lines(input, &mut sinks[0]);
            let pipes = pipes::read_pipes(input, &mut sinks[1]);
            let systems = systems::read_systems(input, &mut sinks[3]);
            let fluids = fluids::read_fluids(input, &mut sinks[4]);
            let pump_curves = pump_curve::read_pump_curves(input, &mut sinks[5]);
            let (fitting_sink, fittings) = fittings
                .join()
                .unwrap_or_else(|panic| std::panic::resume_unwind(panic));
            sinks[2] = fitting_sink;
            (
                sinks,
                (lines, pipes, fittings, systems, fluids, pump_curves),
            )
        })
    };
    for sink in sinks {
        sink.append_to(input);
    }
    input.lines = lines;
    input.pipes = pipes;
    input.fittings = fittings;
    input.systems = systems;
    input.fluids = fluids;
    input.pump_curves = pump_curves;
}

/// Checks across tables (after all files are read): every line referenced exists where it must,
/// and every line has a flow.
pub fn cross_check(input: &mut Input) {
    let pipe_lines: HashSet<&str> = input.pipes.iter().map(|p| p.line.as_str()).collect();
    let (mut diags, erred_runs) = orphan_fittings(input, &pipe_lines);
    diags.extend(flowless_lines(input, &pipe_lines));
    diags.extend(flowless_runs(input));
    if diags.is_empty() {
        diags.extend(empty_pipes(input));
    }
    diags.extend(shares::check(input));
    fold_unchecked(&mut input.diagnostics, &erred_runs);
    input.diagnostics.extend(diags);
}

/// The column of `key` in the `table` laid out on `sheet` (0 when it has none).
fn col_of(input: &Input, table: TableKind, sheet: &str, key: &str) -> u32 {
    input
        .layout_on(table, sheet)
        .and_then(|l| l.column(key))
        .map_or(0, |c| c.col)
}

/// An error for each fitting on a line with no pipe run, except on a line whose runs were all
/// left out by their errors: those fittings are only counted (line, cell of the run's error,
/// fittings not checked), so that the run's error says so once ([`fold_unchecked`]).
fn orphan_fittings(
    input: &Input,
    pipe_lines: &HashSet<&str>,
) -> (Vec<Diagnostic>, Vec<(String, CellRef, usize)>) {
    let mut erred_runs: Vec<(String, CellRef, usize)> = Vec::new();
    for e in input
        .report
        .erred
        .iter()
        .filter(|e| e.table == TableKind::Pipes)
    {
        if let Some(line) = e.line.as_deref()
            && !pipe_lines.contains(line)
            && !erred_runs.iter().any(|(l, _, _)| l == line)
        {
            erred_runs.push((line.to_string(), e.cell.clone(), 0));
        }
    }
    let mut diags = Vec::new();
    for f in input
        .fittings
        .iter()
        .filter(|f| !pipe_lines.contains(&*f.line))
    {
        if let Some(e) = erred_runs.iter_mut().find(|(l, _, _)| *l == *f.line) {
            e.2 += 1;
            continue;
        }
        diags.push(Diagnostic {
            severity: Severity::Error,
            file: input.file_of(&f.origin.sheet).to_string(),
            cell: Some(CellRef::new(
                &f.origin.sheet,
                f.origin.row,
                col_of(input, TableKind::Fittings, &f.origin.sheet, "line"),
            )),
            message: format!(
                "fitting on line '{}', which has no pipe run in Pipes",
                f.line
            ),
            hint: Some("add the line's runs to Pipes or correct the line id".into()),
        });
    }
    (diags, erred_runs)
}

/// An error for each listed line with pipe runs but no flow: neither its Lines row nor its
/// runs give one. A flow cell with an error of its own (#REF!, a negative flow) is not blank
/// as well.
fn flowless_lines(input: &Input, pipe_lines: &HashSet<&str>) -> Vec<Diagnostic> {
    let pipe_flow: HashSet<&str> = input
        .pipes
        .iter()
        .filter(|p| p.flow_m3_s.is_some())
        .map(|p| p.line.as_str())
        .collect();
    let error_cells: HashSet<&CellRef> = input
        .diagnostics
        .iter()
        .filter(|d| d.severity == Severity::Error)
        .filter_map(|d| d.cell.as_ref())
        .collect();
    let mut diags = Vec::new();
    for l in &input.lines {
        let cell = CellRef::new(
            &l.origin.sheet,
            l.origin.row,
            col_of(input, TableKind::Lines, &l.origin.sheet, "flow"),
        );
        if l.flow_m3_s.is_none()
            && !error_cells.contains(&cell)
            && !pipe_flow.contains(l.line.as_str())
            && pipe_lines.contains(l.line.as_str())
        {
            diags.push(Diagnostic {
                severity: Severity::Error,
                file: input.file_of(&l.origin.sheet).to_string(),
                cell: Some(cell),
                message: format!("line '{}' has no flow", l.line),
                hint: Some("enter the line's design flow (a blank is not read as zero)".into()),
            });
        }
    }
    diags
}

/// An error (once per line) for runs of a line that Lines does not list and whose runs give
/// no flow.
fn flowless_runs(input: &Input) -> Vec<Diagnostic> {
    let listed: HashSet<&str> = input.lines.iter().map(|l| l.line.as_str()).collect();
    let mut reported = HashSet::new();
    let mut diags = Vec::new();
    for p in &input.pipes {
        if !listed.contains(p.line.as_str())
            && p.flow_m3_s.is_none()
            && reported.insert(p.line.as_str())
        {
            diags.push(Diagnostic {
                severity: Severity::Error,
                file: input.file_of(&p.origin.sheet).to_string(),
                cell: Some(CellRef::new(
                    &p.origin.sheet,
                    p.origin.row,
                    col_of(input, TableKind::Pipes, &p.origin.sheet, "line"),
                )),
                message: format!(
                    "line '{}' has no flow: it is not in Lines and its runs give none",
                    p.line
                ),
                hint: Some(
                    "list the line in Lines with its flow, or add a Flow column to Pipes".into(),
                ),
            });
        }
    }
    diags
}

/// A Pipes table with a header and nothing under it would give an empty audit: an error at its
/// header when the input has no other error.
fn empty_pipes(input: &Input) -> Option<Diagnostic> {
    let l = input.layout(TableKind::Pipes)?;
    if !input.pipes.is_empty() || input.error_count() > 0 {
        return None;
    }
    Some(Diagnostic {
        severity: Severity::Error,
        file: input.file_of(&l.sheet).to_string(),
        cell: Some(CellRef::new(&l.sheet, l.header_row, 0)),
        message: format!(
            "sheet '{}' has a header row but no pipe runs under it",
            l.sheet
        ),
        hint: Some("enter at least one run (line, size, length) below the header".into()),
    })
}

/// Append "…and N fittings on line 'L' are not checked" to the first error of each line whose
/// runs were all left out (`erred_runs`: line, cell of that error, fittings not checked).
fn fold_unchecked(diagnostics: &mut [Diagnostic], erred_runs: &[(String, CellRef, usize)]) {
    for (line, cell, n) in erred_runs.iter().filter(|e| e.2 > 0) {
        let first = diagnostics
            .iter_mut()
            .find(|d| d.severity == Severity::Error && d.cell.as_ref() == Some(cell));
        if let Some(d) = first {
            let (s, are) = if *n == 1 { ("", "is") } else { ("s", "are") };
            d.message.push_str(&format!(
                " …and {n} fitting{s} on line '{line}' {are} not checked (the line has no other pipe run)"
            ));
        }
    }
}
