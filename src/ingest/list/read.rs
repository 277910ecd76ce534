//! Reading a mixed list row by row: headings, skipped rows, runs and fittings, each with the
//! words that decided, into the same typed rows as the Pipes and Fittings tables.

use calamine::Data;

use super::columns::{FITTING_ONLY, RUN_ONLY};
use super::lines::{Heading, KnownLines, LocationMap, heading_text, read_heading};
use super::{Became, Classified};
use crate::error::{CellRef, Diagnostic, Severity};
use crate::ingest::describe::{self, Description, Role};
use crate::ingest::grid::SheetGrid;
use crate::ingest::header::Layout;
use crate::ingest::parse::{self, SizeSpec, SizeUnit};
use crate::ingest::quantity::{self, UnitWord};
use crate::ingest::rows::{
    Assumed, Cells, FittingRow, Origin, PipeRow, data_text, erred_row, format_number,
    run_assumptions,
};
use crate::ingest::schema;
use crate::ingest::{Conversion, ErredRow, Skipped};
use crate::physics::fitting::Kind;
use crate::physics::pipe::{self, Material};

/// What reading one list gives.
#[derive(Default)]
pub struct ListOut {
    pub pipes: Vec<PipeRow>,
    pub fittings: Vec<FittingRow>,
    pub diagnostics: Vec<Diagnostic>,
    pub conversions: Vec<Conversion>,
    pub skipped: Vec<Skipped>,
    pub left_out: Vec<Skipped>,
    pub classified: Vec<Classified>,
    pub blank_rows: usize,
    pub erred: Vec<ErredRow>,
}

/// Words that open a totals or carried row of a bill (folded, prefix match).
const TOTALS: &[&str] = &[
    "tocollection",
    "carriedtocollection",
    "carriedtosummary",
    "carriedforward",
    "broughtforward",
    "carriedtopage",
    "tosummary",
    "pagetotal",
    "subtotal",
    "grandtotal",
    "total",
    "cf",
    "bf",
];

/// Status words: in the flow path or not (asset-register practice; from memory).
const IN_PATH: &[&str] = &[
    "inservice",
    "duty",
    "standby",
    "assist",
    "active",
    "operational",
    "operating",
    "running",
    "installed",
    "live",
    "commissioned",
    "inuse",
    "normal",
    "ok",
];
const OUT_OF_PATH: &[&str] = &[
    "decommissioned",
    "removed",
    "abandoned",
    "abandonedinplace",
    "spare",
    "scrapped",
    "disposed",
    "demolished",
    "retired",
    "instore",
    "stored",
    "notinstalled",
    "isolated",
    "outofservice",
    "inactive",
    "deleted",
    "proposed",
    "future",
];

/// Read one mixed list.
pub fn read_list(
    file: &str,
    grid: &SheetGrid,
    layout: &Layout,
    known: &KnownLines,
    locations: &LocationMap,
    out: &mut ListOut,
) {
    let dc = crate::ingest::rows::decimal_comma_columns(grid, layout);
    let folded: Vec<String> = layout
        .columns
        .iter()
        .map(|c| schema::fold(&c.header))
        .collect();
    let mut heading = HeadingState::default();
    for row in filled_rows(grid, layout, out) {
        let first = CellRef::new(
            &layout.sheet,
            row,
            text_col(grid, row).min(first_col(layout)),
        );
        if let Some(reason) = crate::ingest::rows::skip_reason(grid, layout, &folded, row) {
            skip(out, file, first, reason);
            continue;
        }
        if let Some(text) = heading_text(grid, layout, row) {
            let cell = CellRef::new(&layout.sheet, row, text_col(grid, row));
            heading.read(file, cell, &text, known, out);
            continue;
        }
        let first_diag = out.diagnostics.len();
        let mut c = Cells {
            file,
            grid,
            layout,
            decimal_comma: &dc,
            row,
            diags: &mut out.diagnostics,
            conversions: &mut out.conversions,
            errors: 0,
        };
        let ctx = RowContext {
            known,
            locations,
            heading: heading.line.as_ref(),
            poisoned: heading.poisoned,
        };
        let result = read_row(&mut c, &ctx);
        if matches!(result, RowResult::Refused) && c.errors > 0 {
            let diags = &out.diagnostics[first_diag..];
            if let Some(e) = erred_run(grid, layout, row, heading.line.as_ref(), diags) {
                out.erred.push(e);
            }
        }
        let text_cell = CellRef::new(&layout.sheet, row, text_col_of(layout));
        record(out, file, first, text_cell, result);
    }
}

/// The rows of the list's data range that hold something; blank rows before the last filled
/// one are counted into `out.blank_rows`. Every cell of the row counts: a heading may sit in a
/// column with no header.
fn filled_rows(grid: &SheetGrid, layout: &Layout, out: &mut ListOut) -> Vec<u32> {
    let is_blank = |row: u32| {
        grid.shown_cols(row)
            .into_iter()
            .all(|col| match grid.merged_value(row, col) {
                Data::Empty => true,
                Data::String(s) => s.trim().is_empty(),
                _ => false,
            })
            && grid.row_formulas(row).next().is_none()
    };
    let end = layout.end_row(grid);
    let filled: Vec<u32> = grid
        .used_rows(layout.data_start..end)
        .filter(|&r| !is_blank(r))
        .collect();
    if let Some(&last) = filled.last() {
        out.blank_rows += (last - layout.data_start) as usize + 1 - filled.len();
    }
    filled
}

/// The heading in force while reading a list: the line it names (with its cell), or
/// `poisoned` after a heading naming an unknown line (its rows are refused, not guessed).
#[derive(Default)]
struct HeadingState {
    line: Option<(String, CellRef)>,
    poisoned: bool,
}

impl HeadingState {
    /// Read a heading row's `text` at `cell`: a totals row is skipped, a known line becomes the
    /// heading, an unknown one is an error that poisons the rows under it, anything else is
    /// skipped as a note.
    fn read(
        &mut self,
        file: &str,
        cell: CellRef,
        text: &str,
        known: &KnownLines,
        out: &mut ListOut,
    ) {
        if is_totals(text) {
            let reason = format!("a totals or carried row ('{}')", cut(text));
            return skip(out, file, cell, reason);
        }
        match read_heading(text, known) {
            Heading::Line(id) => {
                out.classified.push(Classified {
                    cell: cell.clone(),
                    became: Became::Heading,
                    what: format!("line {id}"),
                    deciding: format!("heading '{}'", cut(text)),
                });
                *self = HeadingState {
                    line: Some((id, cell)),
                    poisoned: false,
                };
            }
            Heading::Unknown(id) => {
                out.diagnostics.push(Diagnostic {
                    severity: Severity::Error,
                    file: file.to_string(),
                    cell: Some(cell),
                    message: format!(
                        "heading '{}' names line '{id}', which Lines does not list",
                        cut(text)
                    ),
                    hint: Some(format!(
                        "known lines: {}; add the line to Lines or correct the heading",
                        known.listing()
                    )),
                });
                *self = HeadingState {
                    line: None,
                    poisoned: true,
                };
            }
            Heading::Other(t) => {
                let reason = format!("a heading or note with no quantity ('{}')", cut(&t));
                skip(out, file, cell, reason);
            }
        }
    }
}

/// File a read row's result: a run or fitting (classified at the row's text cell), a skipped
/// or left-out row (at its first cell); a refused row leaves only its diagnostics.
fn record(out: &mut ListOut, file: &str, first: CellRef, text_cell: CellRef, result: RowResult) {
    match result {
        RowResult::Run(p, why) => {
            out.classified.push(Classified {
                cell: text_cell,
                became: Became::Run,
                what: format!("on {}", p.line),
                deciding: why,
            });
            out.pipes.push(p);
        }
        RowResult::Fitting(f, why) => {
            out.classified.push(Classified {
                cell: text_cell,
                became: Became::Fitting,
                what: format!("{} on {}", f.kind.id, f.line),
                deciding: why,
            });
            out.fittings.push(f);
        }
        RowResult::Skip(reason) => skip(out, file, first, reason),
        RowResult::LeftOut(reason) => {
            out.classified.push(Classified {
                cell: first.clone(),
                became: Became::LeftOut,
                what: String::new(),
                deciding: reason.clone(),
            });
            out.left_out.push(Skipped {
                cell: first,
                reason,
            });
        }
        RowResult::Refused => {}
    }
}

/// A refused row that describes a pipe run, with its line (the Line column, else the heading):
/// the fittings of a line left with no run are folded into its error (`rows::cross_check`).
fn erred_run(
    grid: &SheetGrid,
    layout: &Layout,
    row: u32,
    heading: Option<&(String, CellRef)>,
    diags: &[Diagnostic],
) -> Option<ErredRow> {
    let text = layout
        .column("description")
        .and_then(|c| data_text(grid.merged_value(row, c.col).clone()))?;
    if !matches!(describe::describe(&text).role, Role::Run) {
        return None;
    }
    let mut e = erred_row(schema::TableKind::Pipes, grid, layout, row, diags)?;
    if e.line.is_none() {
        e.line = heading.map(|(id, _)| id.clone());
    }
    Some(e)
}

/// Whether a text opens a totals or carried row (`To collection`, `Sub-total`, `C/F`).
fn is_totals(text: &str) -> bool {
    let folded = schema::fold_prefix(text, 24);
    TOTALS
        .iter()
        .any(|w| folded.starts_with(w) && (w.len() > 2 || folded.len() == 2))
}

fn skip(out: &mut ListOut, file: &str, cell: CellRef, reason: String) {
    out.diagnostics.push(Diagnostic {
        severity: Severity::Warning,
        file: file.to_string(),
        cell: Some(cell.clone()),
        message: format!("row skipped: {reason}"),
        hint: None,
    });
    out.classified.push(Classified {
        cell: cell.clone(),
        became: Became::Skipped,
        what: String::new(),
        deciding: reason.clone(),
    });
    out.skipped.push(Skipped { cell, reason });
}

fn cut(t: &str) -> String {
    crate::ingest::rows::truncate(t, 40)
}

fn first_col(layout: &Layout) -> u32 {
    layout.columns.iter().map(|c| c.col).min().unwrap_or(0)
}

fn text_col_of(layout: &Layout) -> u32 {
    layout.column("description").map_or(0, |c| c.col)
}

/// The first filled cell of a row (where a heading's text is).
fn text_col(grid: &SheetGrid, row: u32) -> u32 {
    grid.row(row)
        .find(|(_, d)| !matches!(d, Data::Empty))
        .map_or(0, |(c, _)| c)
}

struct RowContext<'a> {
    known: &'a KnownLines,
    locations: &'a LocationMap,
    heading: Option<&'a (String, CellRef)>,
    poisoned: bool,
}

enum RowResult {
    Run(PipeRow, String),
    Fitting(FittingRow, String),
    Skip(String),
    LeftOut(String),
    Refused,
}

/// Whether a status keeps the row in the flow path: `Some(true)` in service, duty, standby...,
/// `Some(false)` decommissioned, removed, abandoned, spare..., `None` not known.
pub fn status_in_path(text: &str) -> Option<bool> {
    let f = schema::fold(text);
    if OUT_OF_PATH.iter().any(|w| f == *w || f.starts_with(w)) {
        Some(false)
    } else if IN_PATH.iter().any(|w| f == *w || f.starts_with(w)) {
        Some(true)
    } else {
        None
    }
}

/// The unit a row is measured in, from the Unit column or the quantity cell, and where it came
/// from (the key of the column).
struct Measure {
    value: Option<f64>,
    unit: Option<(UnitWord, String, &'static str)>,
}

fn read_measure(c: &mut Cells<'_>) -> Option<Measure> {
    let column_unit = match c.text("unit") {
        Some(t) => match quantity::unit_word(&t) {
            Some(u) => Some((u, t, "unit")),
            None => {
                c.error(
                    "unit",
                    format!("unit '{t}' is not known"),
                    Some("use m, lm, ft or LF for runs; No, nr, ea, pcs, off or set for fittings; Sum, Item or % for allowances".into()),
                );
                return None;
            }
        },
        None => None,
    };
    let (value, cell_unit) = match c.raw("qty") {
        None => (None, None),
        Some(Data::Float(v)) => (Some(v), None),
        Some(Data::Int(v)) => (Some(v as f64), None),
        Some(Data::String(s)) => {
            let dc = c
                .col("qty")
                .and_then(|m| c.decimal_comma.get(&m.col).copied())
                .unwrap_or(false);
            match quantity::parse_quantity(&s, dc) {
                Ok(None) => (None, None),
                Ok(Some(q)) => {
                    let cell = c.cell("qty");
                    c.conversions.push(Conversion {
                        cell,
                        text: s.clone(),
                        value: q.value,
                        unit: q.unit_text.clone(),
                    });
                    (
                        Some(q.value),
                        q.unit.zip(q.unit_text).map(|(u, t)| (u, t, "qty")),
                    )
                }
                Err(e) => {
                    c.error("qty", e.to_string(), None);
                    return None;
                }
            }
        }
        Some(_) => {
            c.error(
                "qty",
                "the quantity is not a number".into(),
                Some("enter e.g. 2, 2 No or 12.5 m".into()),
            );
            return None;
        }
    };
    if let Some(v) = value
        && (!v.is_finite() || v < 0.0)
    {
        c.error(
            "qty",
            format!("quantity {} must be zero or more", format_number(v)),
            None,
        );
        return None;
    }
    let same_kind =
        |a: UnitWord, b: UnitWord| std::mem::discriminant(&a) == std::mem::discriminant(&b);
    let unit = match (column_unit, cell_unit) {
        (Some(a), Some(b)) if !same_kind(a.0, b.0) => {
            c.error(
                "qty",
                format!("the quantity says '{}' but the Unit column says '{}'", b.1, a.1),
                Some("make the unit in the cell agree with the Unit column, or leave one of them out".into()),
            );
            return None;
        }
        // A length written in the cell is already in metres.
        (_, Some(b)) => Some(b),
        (Some(a), None) => Some(a),
        (None, None) => None,
    };
    let value = match (value, &unit) {
        (Some(v), Some((UnitWord::Length(f), _, "unit"))) => Some(v * f),
        (v, _) => v,
    };
    Some(Measure { value, unit })
}

fn read_row(c: &mut Cells<'_>, ctx: &RowContext<'_>) -> RowResult {
    let Some(text) = c.text("description") else {
        c.error(
            "description",
            "the description is blank".into(),
            Some("say what the row is, e.g. 'DN150 gate valve' or 'Pipe, CS, DN150'".into()),
        );
        return RowResult::Refused;
    };
    if is_totals(&text) {
        return RowResult::Skip(format!("a totals or carried row ('{}')", cut(&text)));
    }
    if let Some(status) = c.text("status") {
        match status_in_path(&status) {
            Some(false) => {
                return RowResult::LeftOut(format!(
                    "status '{status}': not in the flow path ('{}')",
                    cut(&text)
                ));
            }
            Some(true) => {}
            None => {
                let cell = c.cell("status");
                c.diags.push(Diagnostic {
                    severity: Severity::Warning,
                    file: c.file.to_string(),
                    cell: Some(cell),
                    message: format!("status '{status}' is not known: the row is read as in service"),
                    hint: Some("statuses read: In service, Duty, Standby (kept); Decommissioned, Removed, Abandoned, Spare (left out)".into()),
                });
            }
        }
    }
    let d = describe::describe(&text);
    let Some(measure) = read_measure(c) else {
        return RowResult::Refused;
    };
    if let Some((UnitWord::Allowance, u, _)) = &measure.unit {
        return RowResult::Skip(format!("preliminaries or an allowance (unit '{u}')"));
    }
    match d.role {
        Role::Run | Role::Unknown | Role::NotHydraulic(_) if d.extra_over => {
            return RowResult::Skip(format!(
                "extra over: adds cost to an item measured elsewhere ('{}')",
                cut(&text)
            ));
        }
        Role::Allowance => {
            return RowResult::Skip(format!("preliminaries or an allowance ('{}')", cut(&text)));
        }
        Role::NotHydraulic(what) => {
            return RowResult::Skip(format!("not in the flow path: {what} ('{}')", cut(&text)));
        }
        _ => {}
    }
    let unit = measure.unit.as_ref().map(|(u, t, k)| (*u, t.as_str(), *k));
    match (d.role, unit) {
        (Role::Run, Some((UnitWord::Count, u, key))) => {
            c.error(
                key,
                format!("'{}' is a pipe run but is counted in '{u}'", cut(&text)),
                Some("measure pipe runs in m, lm or ft (or correct the description)".into()),
            );
            RowResult::Refused
        }
        (Role::Fitting(k), Some((UnitWord::Length(_), u, key))) => {
            c.error(
                key,
                format!(
                    "'{}' is a fitting ({}) but is measured in '{u}'",
                    cut(&text),
                    k.id
                ),
                Some("count fittings in No, nr, ea or pcs (or correct the description)".into()),
            );
            RowResult::Refused
        }
        (Role::Run, _) | (Role::Unknown, Some((UnitWord::Length(_), _, _))) => {
            let why = match d.role {
                Role::Run => d.reasons(),
                _ => format!("unit '{}'; {}", unit.map_or("", |u| u.1), d.reasons()),
            };
            run_row(c, ctx, &d, &measure, why)
        }
        (Role::Fitting(k), _) => fitting_row(c, ctx, &d, k, &measure),
        _ => {
            let near = (!d.near.is_empty()).then(|| {
                format!(
                    "did you mean {}? A run needs a pipe word or a length unit (m, ft); a fitting a kind from `lossledger kinds`",
                    d.near.iter().map(|n| format!("\"{n}\"")).collect::<Vec<_>>().join(", ")
                )
            });
            c.error(
                "description",
                format!("'{}' is neither a pipe run nor a fitting kind", cut(&text)),
                near.or_else(|| Some("write e.g. 'Pipe, CS, DN150' with a length in m, or a fitting such as 'DN150 gate valve' counted in No".into())),
            );
            RowResult::Refused
        }
    }
}

/// The row's line and how it was found.
fn line_of(c: &mut Cells<'_>, ctx: &RowContext<'_>) -> Option<(String, String)> {
    if let Some(l) = c.text("line") {
        return Some((l, "Line column".into()));
    }
    if let Some((id, cell)) = ctx.heading {
        return Some((id.clone(), format!("heading at {cell}")));
    }
    if let Some(tag) = c.text("tag")
        && let Some(id) = ctx.known.prefix_of(&tag)
    {
        return Some((id.to_string(), format!("tag '{tag}'")));
    }
    if let Some(loc) = c.text("location") {
        if let Some(id) = ctx.known.find(&loc).or_else(|| ctx.known.prefix_of(&loc)) {
            return Some((id.to_string(), format!("location '{loc}'")));
        }
        if let Some(id) = ctx.locations.get(&schema::fold(&loc)) {
            return Some((id.clone(), format!("location '{loc}' (map)")));
        }
    }
    if !ctx.poisoned {
        c.error(
            "description",
            "no line for this row".into(),
            Some("add a Line column, a heading row such as 'Line TB-01' above the rows, tags that start with the line id, or a Location column matching the ids in Lines".into()),
        );
    }
    None
}

/// Size, second size and schedule from the Size column (which may hold `4" Sch 80` or
/// `150x100`), falling back to the description; a disagreement is a warning at both cells.
fn sizes(
    c: &mut Cells<'_>,
    d: &Description,
) -> (Option<SizeSpec>, Option<SizeSpec>, Option<pipe::Schedule>) {
    let mut from_cell: Option<Description> = None;
    let unit = c
        .col("size")
        .and_then(|m| m.unit_label.as_deref())
        .and_then(|l| match schema::fold(l).as_str() {
            "mm" | "dn" => Some(SizeUnit::Millimetre),
            "in" | "inch" | "inches" | "nps" => Some(SizeUnit::Inch),
            _ => None,
        });
    let size_cell = match c.text("size") {
        None => None,
        Some(t) => match parse::parse_size(&t, unit) {
            Ok(s) => Some(s),
            Err(_) => {
                let e = describe::describe(&t);
                if e.size.is_some() {
                    let s = e.size;
                    from_cell = Some(e);
                    s
                } else {
                    // Report the cell's error in the usual words.
                    c.size("size")
                }
            }
        },
    };
    let size_out_col = c.size("size_out");
    if let (Some(a), Some(b)) = (size_cell, d.size)
        && a != b
    {
        warn_both(
            c,
            "size",
            format!(
                "the Size column says {} but the description says {}: the column is used",
                label(a),
                label(b)
            ),
        );
    }
    let size = size_cell.or(d.size);
    let size_out = size_out_col
        .or(from_cell.as_ref().and_then(|e| e.size_out))
        .or(if size_cell.is_none() || size_cell == d.size {
            d.size_out
        } else {
            None
        });
    let schedule = from_cell.as_ref().and_then(|e| e.schedule).or(d.schedule);
    (size, size_out, schedule)
}

fn label(s: SizeSpec) -> String {
    match s {
        SizeSpec::Dn(d) => format!("DN{d}"),
        SizeSpec::Nps(n) => format!("{}\"", format_number(n)),
        SizeSpec::OuterDiameter { od_m } => format!("{} OD", format_number(od_m * 1e3)),
        SizeSpec::OdWall { od_m, wall_m } => format!(
            "{}x{}",
            format_number(od_m * 1e3),
            format_number(wall_m * 1e3)
        ),
        SizeSpec::InnerDiameter { id_m } => format!("ID {}", format_number(id_m * 1e3)),
    }
}

/// A warning at a column's cell and at the description cell.
fn warn_both(c: &mut Cells<'_>, key: &str, message: String) {
    for k in [key, "description"] {
        let cell = c.cell(k);
        c.diags.push(Diagnostic {
            severity: Severity::Warning,
            file: c.file.to_string(),
            cell: Some(cell),
            message: message.clone(),
            hint: None,
        });
    }
}

/// A value in a column of the other kind's attributes is a warning at that cell.
fn other_kind_columns(c: &mut Cells<'_>, keys: &[&str], this: &str) {
    for key in keys {
        if let Some(m) = c.col(key).cloned()
            && !matches!(c.grid.value(c.row, m.col), Data::Empty)
        {
            let cell = c.cell(key);
            c.diags.push(Diagnostic {
                severity: Severity::Warning,
                file: c.file.to_string(),
                cell: Some(cell),
                message: format!("'{}' applies to the other kind of row; this row is {this}: the value is not used", m.header),
                hint: None,
            });
        }
    }
}

fn run_row(
    c: &mut Cells<'_>,
    ctx: &RowContext<'_>,
    d: &Description,
    m: &Measure,
    why: String,
) -> RowResult {
    let Some((line, line_why)) = line_of(c, ctx) else {
        return RowResult::Refused;
    };
    other_kind_columns(c, FITTING_ONLY, "a pipe run");
    let (size, _, schedule_text) = sizes(c, d);
    let schedule = run_schedule(c, schedule_text);
    let mut assumed = Vec::new();
    let Some(material) = run_material(c, d, &mut assumed) else {
        return RowResult::Refused;
    };
    let length = c.positive("length", false).or(m.value).or(d.length_m);
    let Some(length_m) = length.filter(|l| *l > 0.0) else {
        if c.errors == 0 {
            c.error(
                "qty",
                "the pipe run has no length".into(),
                Some("give the length in the quantity (12.5 m) or a Length column".into()),
            );
        }
        return RowResult::Refused;
    };
    let inner = c.positive("inner_diameter", false);
    if size.is_none() && inner.is_none() && c.errors == 0 {
        c.error(
            "size",
            "the pipe run has no size".into(),
            Some("give a size (DN150, 6\") in the Size column or the description".into()),
        );
        return RowResult::Refused;
    }
    let roughness = c.positive("roughness", true);
    let c_factor = c.positive("c_factor", false);
    let age = c.positive("age", true);
    let flow = c.positive("flow", true);
    assumed.extend(run_assumptions(
        c, material, size, schedule, inner, roughness, c_factor, age,
    ));
    if c.errors > 0 {
        return RowResult::Refused;
    }
    let row = PipeRow {
        origin: Origin {
            sheet: c.layout.sheet.clone(),
            row: c.row,
        },
        line,
        seq: None,
        size,
        schedule,
        material,
        length_m,
        inner_diameter_m: inner,
        roughness_m: roughness,
        age_years: age,
        c_factor,
        flow_m3_s: flow,
        assumed,
    };
    RowResult::Run(row, format!("{why}; line from {line_why}"))
}

/// A run's schedule: the Schedule column (warning when the description says another), else the
/// description's; an unknown schedule is an error at its cell.
fn run_schedule(
    c: &mut Cells<'_>,
    schedule_text: Option<pipe::Schedule>,
) -> Option<pipe::Schedule> {
    let Some(t) = c.text("schedule") else {
        return schedule_text;
    };
    let s = c.schedule_of(&t)?;
    if let Some(d) = schedule_text.filter(|d| *d != s) {
        warn_both(
            c,
            "schedule",
            format!(
                "the Schedule column says {} but the description says {}: the column is used",
                s.label(),
                d.label()
            ),
        );
    }
    Some(s)
}

/// A run's material: the Material column (warning when the description says another), else the
/// description's, else carbon steel (assumed, pushed onto `assumed`). None after an error at
/// the Material cell (a material that is not known).
fn run_material(
    c: &mut Cells<'_>,
    d: &Description,
    assumed: &mut Vec<Assumed>,
) -> Option<Material> {
    Some(match c.text("material") {
        Some(t) => match pipe::material_from_text(&t) {
            Some(m) => {
                if let Some(dm) = d.material.filter(|dm| *dm != m) {
                    warn_both(
                        c,
                        "material",
                        format!(
                            "the Material column says {} but the description says {}: the column is used",
                            m.name(),
                            dm.name()
                        ),
                    );
                }
                m
            }
            None => {
                c.error(
                    "material",
                    format!("material '{t}' is not known"),
                    Some("use e.g. CS, SS316, galvanised, DI, uPVC, HDPE, copper".into()),
                );
                return None;
            }
        },
        None => match d.material {
            Some(m) => m,
            None => {
                assumed.push(c.assumed("material", "material carbon steel"));
                Material::CarbonSteel
            }
        },
    })
}

/// A size in millimetres for comparing the two ends of a reducer.
fn size_mm(s: SizeSpec) -> Option<f64> {
    match s {
        SizeSpec::Dn(d) => Some(f64::from(d)),
        SizeSpec::Nps(n) => pipe::nps_to_dn(n).map(f64::from).or(Some(n * 25.4)),
        SizeSpec::OuterDiameter { od_m } => Some(od_m * 1e3),
        SizeSpec::OdWall { od_m, wall_m } => Some((od_m - 2.0 * wall_m) * 1e3),
        SizeSpec::InnerDiameter { id_m } => Some(id_m * 1e3),
    }
}

fn fitting_row(
    c: &mut Cells<'_>,
    ctx: &RowContext<'_>,
    d: &Description,
    kind: &'static Kind,
    m: &Measure,
) -> RowResult {
    let Some((line, line_why)) = line_of(c, ctx) else {
        return RowResult::Refused;
    };
    other_kind_columns(c, RUN_ONLY, "a fitting");
    let (size, second, _) = sizes(c, d);
    let mut assumed = Vec::new();
    let size_out = if kind.changes_area() { second } else { None };
    if let (Some(a), Some(b)) = (size.and_then(size_mm), size_out.and_then(size_mm)) {
        let wrong = if (a - b).abs() < 1e-9 {
            Some("its two sizes are equal")
        } else if kind.id.starts_with("expansion") || kind.id.starts_with("diffuser") {
            (b < a).then_some("an expansion's second size must be the larger")
        } else if kind.id.starts_with("contraction") {
            (b > a).then_some("a contraction's second size must be the smaller")
        } else {
            None
        };
        if let Some(w) = wrong {
            // The cell the sizes were read from.
            let filled = |c: &Cells<'_>, k: &str| {
                c.col(k)
                    .is_some_and(|m| !matches!(c.grid.value(c.row, m.col), Data::Empty))
            };
            let key = ["size_out", "size"]
                .into_iter()
                .find(|k| filled(c, k))
                .unwrap_or("description");
            c.error(
                key,
                format!("{} {}: {w}", kind.id, label_pair(size, size_out)),
                Some("write the inlet size first (150x100 reduces from DN150 to DN100)".into()),
            );
            return RowResult::Refused;
        }
    }
    let qty = match m.value.map(quantity::fitting_count) {
        Some(Err(e)) => {
            c.error("qty", e.to_string(), Some(quantity::COUNT_HINT.into()));
            return RowResult::Refused;
        }
        Some(Ok(q)) => q,
        None => {
            assumed.push(c.assumed("qty", "quantity 1"));
            1.0
        }
    };
    let opening = c.positive("opening", true);
    if let Some(o) = opening
        && o > 1.0
    {
        c.error(
            "opening",
            format!("opening {} % is above 100 %", format_number(o * 100.0)),
            None,
        );
    }
    if opening.is_none() && kind.is_valve() {
        assumed.push(c.assumed("opening", "fully open"));
    }
    let tag = c
        .text("tag")
        .or_else(|| c.text("item_no"))
        .unwrap_or_default();
    let row = FittingRow {
        origin: Origin {
            sheet: c.layout.sheet.clone(),
            row: c.row,
        },
        tag: tag.into(),
        line: line.into(),
        item: c.text("description").unwrap_or_default().into(),
        kind,
        size,
        size_out,
        qty,
        opening,
        k: c.positive("k", true),
        kv: c.positive("kv", false),
        cv: c.positive("cv", false),
        le_d: c.positive("le_d", false),
        bend_radius_d: c.positive("bend_radius_d", false),
        angle_deg: c.positive("angle", false),
        fouling: c.positive("fouling", false),
        beta: c.positive("beta", false),
        replacement_cost: c.positive("replacement_cost", true),
        assumed,
    };
    if c.errors > 0 {
        return RowResult::Refused;
    }
    RowResult::Fitting(row, format!("{}; line from {line_why}", d.reasons()))
}

fn label_pair(a: Option<SizeSpec>, b: Option<SizeSpec>) -> String {
    format!(
        "{} x {}",
        a.map(label).unwrap_or_default(),
        b.map(label).unwrap_or_default()
    )
}
