//! What changed in the input: lines, runs, fittings and systems added, removed or changed, one
//! [`Change`] per field.

use serde::Serialize;
use std::collections::HashMap;

use super::fields::{self as fd, Field, Value, num, size_label, text};
use super::matching::Matching;
use crate::audit::LineResult;
use crate::error::{CellRef, Severity};
use crate::ingest::{FittingRow, Input, PipeRow, SystemRow, TableKind};
use crate::pipeline::Audited;

/// What kind of change a row reports.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum ChangeKind {
    /// A line only in the new revision.
    LineAdded,
    /// A line only in the old revision.
    LineRemoved,
    /// A line field changed.
    LineChanged,
    /// A run only in the new revision.
    RunAdded,
    /// A run only in the old revision.
    RunRemoved,
    /// A run field changed.
    RunChanged,
    /// A fitting only in the new revision.
    FittingAdded,
    /// A fitting only in the old revision.
    FittingRemoved,
    /// A fitting field changed.
    FittingChanged,
    /// A system only in the new revision.
    SystemAdded,
    /// A system only in the old revision.
    SystemRemoved,
    /// A system field changed.
    SystemChanged,
    /// A finding raised on the new revision only.
    FindingAppeared,
    /// A finding raised on the old revision only.
    FindingDisappeared,
    /// A system's duty or NPSH verdict changed.
    VerdictChanged,
}

impl ChangeKind {
    /// How it reads in a report (`line added`).
    pub fn label(self) -> &'static str {
        use ChangeKind::*;
        match self {
            LineAdded => "line added",
            LineRemoved => "line removed",
            LineChanged => "line changed",
            RunAdded => "run added",
            RunRemoved => "run removed",
            RunChanged => "run changed",
            FittingAdded => "fitting added",
            FittingRemoved => "fitting removed",
            FittingChanged => "fitting changed",
            SystemAdded => "system added",
            SystemRemoved => "system removed",
            SystemChanged => "system changed",
            FindingAppeared => "finding appeared",
            FindingDisappeared => "finding disappeared",
            VerdictChanged => "verdict changed",
        }
    }
}

/// One change, old and new side by side.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Change {
    /// How much it matters: input changes are `info`; a finding keeps its own severity; a
    /// verdict that gets worse is an `error`.
    pub severity: Severity,
    /// What kind of change.
    pub kind: ChangeKind,
    /// Line concerned, when one is.
    pub line: Option<String>,
    /// The item: `run 3`, a fitting tag, a system id or a finding code.
    pub item: String,
    /// Field key (SI unit in the name) when one field changed.
    pub field: Option<&'static str>,
    /// Old value.
    pub old: Option<Value>,
    /// New value.
    pub new: Option<Value>,
    /// Cell in the old input.
    pub old_cell: Option<CellRef>,
    /// Cell in the new input (linked in the workbook's copy).
    pub new_cell: Option<CellRef>,
    /// How the item was matched, a hint, or a finding's message.
    pub note: String,
    /// The field's label and units, for display.
    #[serde(skip)]
    pub shown: Option<Field>,
}

/// Where an item sits: its table, sheet and row.
#[derive(Clone, Copy)]
struct At<'a> {
    input: &'a Input,
    table: TableKind,
    sheet: &'a str,
    row: u32,
}

impl At<'_> {
    fn cell(&self, column: &str) -> CellRef {
        CellRef::new(
            self.sheet,
            self.row,
            self.input.column_of(self.table, self.sheet, column),
        )
    }
}

/// The common parts of a change about one item.
struct Item<'a> {
    kind: ChangeKind,
    line: Option<String>,
    item: String,
    old: Option<At<'a>>,
    new: Option<At<'a>>,
    note: String,
}

impl Item<'_> {
    fn whole(&self, note: String) -> Change {
        let first = |a: &At<'_>| CellRef::new(a.sheet, a.row, first_col(a));
        Change {
            severity: Severity::Info,
            kind: self.kind,
            line: self.line.clone(),
            item: self.item.clone(),
            field: None,
            old: None,
            new: None,
            old_cell: self.old.as_ref().map(first),
            new_cell: self.new.as_ref().map(first),
            note,
            shown: None,
        }
    }

    /// One change per field whose old and new values differ.
    fn fields(&self, out: &mut Vec<Change>, pairs: Vec<(Field, Option<Value>, Option<Value>)>) {
        for (field, old, new) in pairs {
            if fd::same(&old, &new) {
                continue;
            }
            out.push(Change {
                severity: Severity::Info,
                kind: self.kind,
                line: self.line.clone(),
                item: self.item.clone(),
                field: Some(field.key),
                old,
                new,
                old_cell: self.old.as_ref().map(|a| a.cell(field.column)),
                new_cell: self.new.as_ref().map(|a| a.cell(field.column)),
                note: self.note.clone(),
                shown: Some(field),
            });
        }
    }
}

fn first_col(a: &At<'_>) -> u32 {
    a.input
        .layout_on(a.table, a.sheet)
        .and_then(|l| l.columns.iter().map(|c| c.col).min())
        .unwrap_or(0)
}

/// Every input change between the sides, lines first, each followed by its runs and fittings,
/// then systems.
pub fn input_changes(old: &Audited, new: &Audited, m: &Matching) -> Vec<Change> {
    let mut out = Vec::new();
    let ctx = LineCtx {
        old,
        new,
        rows: (line_rows(&old.input), line_rows(&new.input)),
        hints: rename_hints(old, new, m),
    };
    let bores = (bores(old), bores(new));
    for &(o, n) in &m.lines {
        let lo = o.map(|i| &old.audit.lines[i]);
        let ln = n.map(|i| &new.audit.lines[i]);
        line_changes(&mut out, &ctx, lo, ln);
        if let (Some(lo), Some(_)) = (lo, ln) {
            run_changes(&mut out, (old, new), m, &lo.line, &bores);
        }
    }
    fitting_changes(&mut out, old, new, m);
    for &(o, n) in &m.systems {
        fn row(a: &Audited, i: usize) -> Option<&SystemRow> {
            let id = &a.audit.systems[i].system;
            a.input.systems.iter().find(|s| &s.system == id)
        }
        system_changes(
            &mut out,
            old,
            new,
            o.and_then(|i| row(old, i)),
            n.and_then(|i| row(new, i)),
            o,
            n,
        );
    }
    out
}

/// Where a line is written: its Lines row, else its first run's row.
fn line_at<'a>(a: &'a Audited, l: &'a LineResult) -> Option<At<'a>> {
    let (table, sheet, row) = match (&l.sheet, l.row) {
        (Some(s), Some(r)) => (TableKind::Lines, s.as_str(), r),
        _ => {
            let run = &a.audit.runs[*l.runs.first()?];
            (TableKind::Pipes, run.cell.sheet.as_str(), run.row)
        }
    };
    Some(At {
        input: &a.input,
        table,
        sheet,
        row,
    })
}

/// Lines rows by line id.
type LineRows<'a> = HashMap<&'a str, &'a crate::ingest::LineRow>;

fn line_rows(input: &Input) -> LineRows<'_> {
    input.lines.iter().map(|r| (r.line.as_str(), r)).collect()
}

fn line_fields(rows: &LineRows<'_>, l: &LineResult) -> Vec<Option<Value>> {
    let row = rows.get(l.line.as_str());
    vec![
        num(Some(l.flow_m3_s)),
        text(l.service.id()),
        text(l.fluid.clone()),
        num(Some(l.temperature_c)),
        num(Some(l.elevation_change_m)),
        num(row.and_then(|r| r.hours_per_year)),
        num(row.and_then(|r| r.efficiency)),
        row.and_then(|r| r.system.clone()).and_then(text),
    ]
}

const LINE_FIELDS: [Field; 8] = [
    fd::FLOW,
    fd::SERVICE,
    fd::FLUID,
    fd::TEMPERATURE,
    fd::ELEVATION,
    fd::HOURS,
    fd::EFFICIENCY,
    fd::SYSTEM,
];

/// What the line changes need from both sides.
struct LineCtx<'a> {
    old: &'a Audited,
    new: &'a Audited,
    rows: (LineRows<'a>, LineRows<'a>),
    hints: HashMap<String, String>,
}

fn line_changes(
    out: &mut Vec<Change>,
    ctx: &LineCtx<'_>,
    lo: Option<&LineResult>,
    ln: Option<&LineResult>,
) {
    let (old, new, hints) = (ctx.old, ctx.new, &ctx.hints);
    let (kind, l) = match (lo, ln) {
        (Some(_), Some(l)) => (ChangeKind::LineChanged, l),
        (None, Some(l)) => (ChangeKind::LineAdded, l),
        (Some(l), None) => (ChangeKind::LineRemoved, l),
        (None, None) => return,
    };
    let item = Item {
        kind,
        line: Some(l.line.clone()),
        item: "line".into(),
        old: lo.and_then(|l| line_at(old, l)),
        new: ln.and_then(|l| line_at(new, l)),
        note: String::new(),
    };
    if kind != ChangeKind::LineChanged {
        let mut note = format!("{} run(s), {} fitting(s)", l.runs.len(), l.fittings.len());
        if let Some(h) = hints.get(&l.line) {
            note.push_str("; ");
            note.push_str(h);
        }
        out.push(item.whole(note));
        return;
    }
    let (Some(lo), Some(ln)) = (lo, ln) else {
        return;
    };
    let pairs = LINE_FIELDS
        .into_iter()
        .zip(
            line_fields(&ctx.rows.0, lo)
                .into_iter()
                .zip(line_fields(&ctx.rows.1, ln)),
        )
        .map(|(f, (a, b))| (f, a, b))
        .collect();
    item.fields(out, pairs);
}

fn pipe_at<'a>(input: &'a Input, p: &'a PipeRow) -> At<'a> {
    At {
        input,
        table: TableKind::Pipes,
        sheet: &p.origin.sheet,
        row: p.origin.row,
    }
}

fn run_fields(p: &PipeRow) -> Vec<(Field, Option<Value>)> {
    vec![
        (fd::SIZE, p.size.as_ref().map(size_label).and_then(text)),
        (fd::SCHEDULE, p.schedule.map(|s| s.label()).and_then(text)),
        (fd::MATERIAL, text(p.material.id())),
        (fd::LENGTH, num(Some(p.length_m))),
        (fd::BORE, num(p.inner_diameter_m)),
        (fd::ROUGHNESS, num(p.roughness_m)),
        (fd::C_FACTOR, num(p.c_factor)),
    ]
}

fn run_name(p: &PipeRow, position: usize) -> String {
    match p.seq {
        Some(s) => format!("run {}", crate::ingest::rows::format_number(s)),
        None => format!("run at position {position}"),
    }
}

/// The bore each run was audited with, by its (sheet, row).
type Bores = HashMap<(String, u32), f64>;

fn bores(a: &Audited) -> Bores {
    a.audit
        .runs
        .iter()
        .map(|r| ((r.cell.sheet.clone(), r.row), r.inner_diameter_m))
        .collect()
}

/// The same bore on both sides: a size written another way (`Ø219.1×8.2` for `ID 202.7`) is no
/// change.
fn same_bore(a: &PipeRow, b: &PipeRow, bores: &(Bores, Bores)) -> bool {
    let bore = |m: &Bores, p: &PipeRow| m.get(&(p.origin.sheet.clone(), p.origin.row)).copied();
    match (bore(&bores.0, a), bore(&bores.1, b)) {
        (Some(x), Some(y)) => fd::same_number(x, y),
        _ => false,
    }
}

fn run_changes(
    out: &mut Vec<Change>,
    (old, new): (&Audited, &Audited),
    m: &Matching,
    line: &str,
    bores: &(Bores, Bores),
) {
    let by_position = m.runs_by_position.iter().any(|l| l == line);
    let note = if by_position {
        "runs matched by position (no distinct Seq)".to_string()
    } else {
        "runs matched by Seq".to_string()
    };
    let range = m.runs_of_line.get(line).cloned().unwrap_or_default();
    for (k, &(o, n)) in m.runs[range].iter().enumerate() {
        let po = o.map(|i| &old.input.pipes[i]);
        let pn = n.map(|i| &new.input.pipes[i]);
        let position = k + 1;
        let kind = match (po, pn) {
            (Some(_), Some(_)) => ChangeKind::RunChanged,
            (None, Some(_)) => ChangeKind::RunAdded,
            _ => ChangeKind::RunRemoved,
        };
        let named = pn.or(po).map_or(String::new(), |p| run_name(p, position));
        let item = Item {
            kind,
            line: Some(line.to_string()),
            item: named,
            old: po.map(|p| pipe_at(&old.input, p)),
            new: pn.map(|p| pipe_at(&new.input, p)),
            note: note.clone(),
        };
        match (po, pn) {
            (Some(a), Some(b)) => {
                let keep_size = !same_bore(a, b, bores);
                let pairs = run_fields(a)
                    .into_iter()
                    .zip(run_fields(b))
                    .filter(|((f, _), _)| keep_size || *f != fd::SIZE)
                    .map(|((f, x), (_, y))| (f, x, y))
                    .collect();
                item.fields(out, pairs);
            }
            (_, Some(p)) | (Some(p), None) => {
                let size = p.size.as_ref().map(size_label).unwrap_or_default();
                out.push(item.whole(format!(
                    "{size} {} m; {note}",
                    crate::ingest::rows::format_number(p.length_m)
                )));
            }
            (None, None) => {}
        }
    }
}

fn fitting_at<'a>(input: &'a Input, f: &'a FittingRow) -> At<'a> {
    At {
        input,
        table: TableKind::Fittings,
        sheet: &f.origin.sheet,
        row: f.origin.row,
    }
}

fn fitting_fields(f: &FittingRow) -> Vec<(Field, Option<Value>)> {
    vec![
        (fd::LINE, text(&*f.line)),
        (fd::KIND, text(f.kind.id)),
        (fd::SIZE, f.size.as_ref().map(size_label).and_then(text)),
        (
            fd::SIZE_OUT,
            f.size_out.as_ref().map(size_label).and_then(text),
        ),
        (fd::QTY, num(Some(f.qty))),
        (fd::OPENING, num(f.opening)),
        (fd::K, num(f.k)),
        (fd::KV, num(f.kv)),
        (fd::CV, num(f.cv)),
        (fd::LE_D, num(f.le_d)),
    ]
}

fn fitting_name(f: &FittingRow) -> String {
    if f.tag.trim().is_empty() {
        format!("{} (untagged)", f.kind.id)
    } else {
        f.tag.to_string()
    }
}

/// Fittings added, removed or changed, on lines present on both sides (a fitting on an added or
/// removed line is part of that line's change).
fn fitting_changes(out: &mut Vec<Change>, old: &Audited, new: &Audited, m: &Matching) {
    let on_both =
        |line: &str| old.audit.line_of(line).is_some() && new.audit.line_of(line).is_some();
    for &(o, n, key) in &m.fittings {
        let fo = o.map(|i| &old.input.fittings[i]);
        let fn_ = n.map(|i| &new.input.fittings[i]);
        let (kind, f) = match (fo, fn_) {
            (Some(_), Some(f)) => (ChangeKind::FittingChanged, f),
            (None, Some(f)) => (ChangeKind::FittingAdded, f),
            (Some(f), None) => (ChangeKind::FittingRemoved, f),
            (None, None) => continue,
        };
        if kind != ChangeKind::FittingChanged && !on_both(&f.line) {
            continue;
        }
        let item = Item {
            kind,
            line: Some(f.line.to_string()),
            item: fitting_name(f),
            old: fo.map(|f| fitting_at(&old.input, f)),
            new: fn_.map(|f| fitting_at(&new.input, f)),
            note: key.map_or(String::new(), |k| k.label().to_string()),
        };
        match (fo, fn_) {
            (Some(a), Some(b)) => {
                let pairs = fitting_fields(a)
                    .into_iter()
                    .zip(fitting_fields(b))
                    .map(|((fl, x), (_, y))| (fl, x, y))
                    .collect();
                item.fields(out, pairs);
            }
            _ => {
                let size = f.size.as_ref().map(size_label).unwrap_or_default();
                let untagged = if f.tag.trim().is_empty() {
                    "; untagged: looked for by line, kind and size"
                } else {
                    ""
                };
                out.push(item.whole(format!(
                    "{} × {} {size} ({}){untagged}",
                    crate::ingest::rows::format_number(f.qty),
                    f.kind.id,
                    f.item
                )));
            }
        }
    }
}

fn system_fields(s: &SystemRow) -> Vec<(Field, Option<Value>)> {
    vec![
        (fd::LINES, text(s.lines.join(", "))),
        (fd::STATIC_HEAD, num(s.static_head_m)),
        (fd::PUMP_HEAD, num(s.pump_head_m)),
        (fd::NPSH_REQUIRED, num(s.npsh_required_m)),
        (fd::SOURCE_PRESSURE, num(s.source_pressure_pa)),
        (fd::SUCTION_LEVEL, num(s.suction_level_m)),
        (fd::EFFICIENCY, num(s.efficiency)),
    ]
}

fn system_changes(
    out: &mut Vec<Change>,
    old: &Audited,
    new: &Audited,
    so: Option<&SystemRow>,
    sn: Option<&SystemRow>,
    o: Option<usize>,
    n: Option<usize>,
) {
    fn at<'a>(input: &'a Input, s: &'a SystemRow) -> At<'a> {
        At {
            input,
            table: TableKind::Systems,
            sheet: &s.origin.sheet,
            row: s.origin.row,
        }
    }
    let id = match (o, n) {
        (_, Some(n)) => new.audit.systems[n].system.clone(),
        (Some(o), None) => old.audit.systems[o].system.clone(),
        _ => return,
    };
    let kind = match (o, n) {
        (Some(_), Some(_)) => ChangeKind::SystemChanged,
        (None, Some(_)) => ChangeKind::SystemAdded,
        _ => ChangeKind::SystemRemoved,
    };
    let item = Item {
        kind,
        line: None,
        item: id,
        old: so.map(|s| at(&old.input, s)),
        new: sn.map(|s| at(&new.input, s)),
        note: String::new(),
    };
    match (so, sn, kind) {
        (Some(a), Some(b), _) => {
            let pairs = system_fields(a)
                .into_iter()
                .zip(system_fields(b))
                .map(|((f, x), (_, y))| (f, x, y))
                .collect();
            item.fields(out, pairs);
        }
        (_, _, ChangeKind::SystemChanged) => {}
        _ => out.push(item.whole(String::new())),
    }
}

/// The runs and fittings of the given lines as comparable text, to spot a renamed line (one
/// pass over the input); lines without runs have none.
fn signatures(input: &Input, lines: &std::collections::HashSet<&str>) -> HashMap<String, String> {
    let mut parts: HashMap<&str, (Vec<String>, Vec<String>)> = HashMap::new();
    for p in input
        .pipes
        .iter()
        .filter(|p| lines.contains(p.line.as_str()))
    {
        let e = parts.entry(p.line.as_str()).or_default();
        e.0.push(format!("{:?}", run_fields(p)));
    }
    for f in input.fittings.iter().filter(|f| lines.contains(&*f.line)) {
        if let Some(e) = parts.get_mut(&*f.line) {
            e.1.push(format!("{:?}", &fitting_fields(f)[1..]));
        }
    }
    parts
        .into_iter()
        .map(|(line, (mut runs, mut fittings))| {
            runs.sort();
            fittings.sort();
            (line.to_string(), format!("{runs:?}|{fittings:?}"))
        })
        .collect()
}

/// Hints for removed and added lines whose runs and fittings match: line id → hint.
fn rename_hints(old: &Audited, new: &Audited, m: &Matching) -> HashMap<String, String> {
    let only = |a: &Audited, pick: fn(&super::matching::Pair) -> Option<usize>| {
        let ids: std::collections::HashSet<String> = m
            .lines
            .iter()
            .filter(|p| p.0.is_none() || p.1.is_none())
            .filter_map(pick)
            .map(|i| a.audit.lines[i].line.clone())
            .collect();
        ids
    };
    let removed_ids = only(old, |p| p.0.filter(|_| p.1.is_none()));
    let added_ids = only(new, |p| p.1.filter(|_| p.0.is_none()));
    let mut out = HashMap::new();
    if removed_ids.is_empty() || added_ids.is_empty() {
        return out;
    }
    fn as_str(ids: &std::collections::HashSet<String>) -> std::collections::HashSet<&str> {
        ids.iter().map(String::as_str).collect()
    }
    let removed: HashMap<String, String> = signatures(&old.input, &as_str(&removed_ids))
        .into_iter()
        .map(|(id, sig)| (sig, id))
        .collect();
    let added = signatures(&new.input, &as_str(&added_ids));
    // In the new side's order, so the hints do not depend on hashing.
    for &(o, n) in &m.lines {
        let (None, Some(j)) = (o, n) else { continue };
        let id = &new.audit.lines[j].line;
        let Some(was) = added.get(id).and_then(|sig| removed.get(sig)) else {
            continue;
        };
        out.insert(
            id.clone(),
            format!("runs and fittings match removed line {was}: renamed?"),
        );
        out.insert(
            was.clone(),
            format!("runs and fittings match added line {id}: renamed?"),
        );
    }
    out
}
