//! The annotated workbook: Summary, Findings, every input sheet kept cell for cell with computed
//! columns appended, and Basis.

use calamine::Data;
use rust_xlsxwriter::{
    DocProperties, ExcelDateTime, Format, Formula, Note, Table, TableColumn, Workbook, Worksheet,
    XlsxError,
};
use std::collections::{BTreeMap, HashSet};

use super::style::{MAX_CELL_CHARS, Styles, shown, truncate};
use crate::audit::{Audit, FittingResult, LineResult, RunResult};
use crate::error::{Severity, quote_sheet};
use crate::ingest::list::Became;
use crate::ingest::{Input, Layout, SheetGrid, TableKind};
use crate::units::{UnitSystem, header_in};

/// Deflate level of the written workbook (1 fastest … 9 smallest).
const ZIP_LEVEL: u8 = 1;

/// Marks on input cells: worst severity and the note text.
#[derive(Default)]
struct Mark {
    severity: Option<Severity>,
    assumed: bool,
    note: Vec<String>,
}

fn unique_name(wanted: &str, taken: &HashSet<String>) -> String {
    if !taken.contains(&wanted.to_lowercase()) {
        return wanted.to_string();
    }
    (2..)
        .map(|i| format!("{wanted} ({i})"))
        .find(|n| !taken.contains(&n.to_lowercase()))
        .unwrap_or_default()
}

/// Choices that shape the annotated workbook.
#[derive(Clone, Copy, Debug)]
pub struct BookOptions {
    /// Units of the computed columns and the summary.
    pub units: UnitSystem,
    /// Rows of the `Fitting ranking` sheet: the worst N items (`None`: every item). Every item's
    /// rank and cost stay in the computed columns of its input sheet either way.
    pub ranking_rows: Option<usize>,
}

/// Rows listed in `Fitting ranking` unless asked otherwise.
pub const DEFAULT_RANKING_ROWS: usize = 1_000;

impl Default for BookOptions {
    fn default() -> Self {
        BookOptions {
            units: UnitSystem::Si,
            ranking_rows: Some(DEFAULT_RANKING_ROWS),
        }
    }
}

/// Build the annotated workbook in memory with the default options and return its bytes.
///
/// # Errors
/// As [`prepare`].
pub fn build(input: &Input, audit: &Audit) -> Result<Vec<u8>, XlsxError> {
    build_in(input, audit, &BookOptions::default())
}

/// Build the annotated workbook as `options` say and return its bytes.
///
/// # Errors
/// As [`prepare`], or the writer's error assembling the file.
pub fn build_in(input: &Input, audit: &Audit, options: &BookOptions) -> Result<Vec<u8>, XlsxError> {
    prepare(input, audit, options)?.save_to_buffer()
}

/// Write every sheet of the annotated workbook; what is left is to save it (the input copies
/// wait in temporary files until then).
///
/// # Errors
/// The workbook writer's error, or a sheet with no free columns for its computed columns.
pub fn prepare(input: &Input, audit: &Audit, options: &BookOptions) -> Result<Workbook, XlsxError> {
    let units = options.units;
    let mut wb = new_book()?;
    let mut st = Styles::new();
    st.units = units;
    let [
        summary_name,
        findings_name,
        basis_name,
        ranking_name,
        systems_name,
    ] = report_names(input);

    // Every sheet is built detached and pushed in order at the end, so the largest input copy
    // can be written on a second thread while this one writes the rest.
    let named = |mut ws: Worksheet, name: &str| -> Result<Worksheet, XlsxError> {
        ws.set_name(name)?;
        Ok(ws)
    };
    wb.register_format(&Format::new());
    for f in st.all() {
        wb.register_format(f);
    }
    let marks = collect_marks(input, audit, options.units);
    let biggest = input
        .sheets
        .iter()
        .enumerate()
        .max_by_key(|(_, s)| s.cell_count())
        .map(|(i, _)| i);
    let mut copies = Vec::with_capacity(input.sheets.len());
    for (i, sheet) in input.sheets.iter().enumerate() {
        // Input copies are the largest sheets: stream them row by row. Only the one written on
        // the second thread uses the shared string table; the sheets written meanwhile on this
        // thread keep their strings inline, so the table's order (and the file's bytes) do not
        // depend on how the threads interleave.
        let ws = if Some(i) == biggest {
            wb.new_worksheet_with_low_memory()?
        } else {
            wb.new_worksheet_with_constant_memory()?
        };
        let mut ws = named(ws, &sheet.name)?;
        if sheet.hidden {
            ws.set_hidden(true);
        }
        let blocks = computed_blocks(input, audit, i, st.units)?;
        copies.push((ws, sheet, blocks));
    }
    let mut ranking_ws = named(wb.new_worksheet_with_constant_memory()?, &ranking_name)?;
    let mut findings_ws = named(wb.new_worksheet_with_constant_memory()?, &findings_name)?;
    let (written, others) = std::thread::scope(|scope| {
        let st = &st;
        let marks = &marks;
        let mut worker = None;
        let mut rest = Vec::new();
        for (i, (mut ws, sheet, mut blocks)) in copies.into_iter().enumerate() {
            let job = move || {
                if Some(i) == biggest {
                    crate::worker::fault::point(crate::worker::fault::Place::Write);
                }
                copy_sheet(&mut ws, sheet, marks.get(&sheet.name), &mut blocks, st).map(|_| ws)
            };
            if Some(i) == biggest {
                worker = Some(scope.spawn(job));
            } else {
                rest.push(job);
            }
        }
        let others = (|| -> Result<Vec<Worksheet>, XlsxError> {
            // Summary and Basis are written top to bottom, so they stream as well: on a big
            // register each holds a row per line. A streamed sheet drops any write to a row above
            // the one being written, so both must stay in row order (the read-back tests of their
            // figures would fail otherwise).
            let mut summary = named(wb.new_worksheet_with_constant_memory()?, &summary_name)?;
            write_summary(&mut summary, input, audit, st)?;
            let invented = super::invented::marker(input).map(|c| super::invented::label(&c));
            write_findings(&mut findings_ws, audit, invented.as_deref(), st)?;
            let ranking_rows = options.ranking_rows;
            super::ranking::write_ranking(
                &mut ranking_ws,
                &ranking_name,
                audit,
                ranking_rows,
                invented.as_deref(),
                st,
            )?;
            let mut done = vec![summary, findings_ws, ranking_ws];
            if !audit.systems.is_empty() {
                let mut ws = named(Worksheet::new(), &systems_name)?;
                super::ranking::write_systems(&mut ws, &systems_name, audit, st)?;
                done.push(ws);
            }
            for job in rest {
                done.push(job()?);
            }
            let mut basis = named(wb.new_worksheet_with_constant_memory()?, &basis_name)?;
            write_basis(&mut basis, input, audit, st)?;
            done.push(basis);
            Ok(done)
        })();
        (worker.map(|h| h.join()), others)
    });
    let others = others?;
    // A panic on the second thread is a panic of this call (the worker process reports it).
    let big = match written {
        Some(Ok(ws)) => Some(ws?),
        Some(Err(panic)) => std::panic::resume_unwind(panic),
        None => None,
    };
    let report_sheets = 3 + usize::from(!audit.systems.is_empty());
    push_in_order(&mut wb, others, report_sheets, biggest.zip(big));
    Ok(wb)
}

/// Push the sheets in their order: the `report_sheets` report sheets, the input copies in input
/// order (the one written on the second thread, with its index, back in its place), Basis last.
fn push_in_order(
    wb: &mut Workbook,
    mut others: Vec<Worksheet>,
    report_sheets: usize,
    big: Option<(usize, Worksheet)>,
) {
    let basis = others.pop();
    let mut copies = others.split_off(report_sheets);
    if let Some((i, ws)) = big {
        copies.insert(i, ws);
    }
    for ws in others.into_iter().chain(copies).chain(basis) {
        wb.push_worksheet(ws);
    }
}

/// An empty workbook with fixed properties and the fastest deflate.
fn new_book() -> Result<Workbook, XlsxError> {
    let mut wb = Workbook::new();
    // Fixed creation time: the same input gives a byte-identical workbook.
    let created = ExcelDateTime::from_ymd(2000, 1, 1)?;
    wb.set_properties(
        &DocProperties::new()
            .set_creation_datetime(&created)
            .set_title("lossledger audit")
            .set_comment("Screening estimate; see the Basis sheet"),
    );
    // Fastest deflate: saving is single-threaded and the copy holds several times the input's
    // cells. On the 20,000-line benchmark station level 1 saves about 0.5 s faster than level 2
    // for a file about 35 % larger, and level 2 about 40 % faster than the default level
    // (measured, scripts/bench.sh; docs/reliability.md).
    wb.set_zip_compression_level(ZIP_LEVEL);
    Ok(wb)
}

/// Names of the report sheets, clear of the input's sheet names: Summary, Findings, Basis,
/// Fitting ranking, Systems.
fn report_names(input: &Input) -> [String; 5] {
    let taken: HashSet<String> = input.sheets.iter().map(|s| s.name.to_lowercase()).collect();
    let systems = if taken.contains("systems") {
        unique_name("System checks", &taken)
    } else {
        "Systems".to_string()
    };
    [
        unique_name("Summary", &taken),
        unique_name("Findings", &taken),
        unique_name("Basis", &taken),
        unique_name("Fitting ranking", &taken),
        systems,
    ]
}

/// The computed-column blocks of input sheet `i`. Several tables on one sheet (a mixed list's
/// runs and fittings) get their computed columns side by side, one gap column apart.
fn computed_blocks<'a>(
    input: &'a Input,
    audit: &'a Audit,
    i: usize,
    units: UnitSystem,
) -> Result<Vec<Box<dyn Block + Send + 'a>>, XlsxError> {
    let sheet = &input.sheets[i];
    let mut next_col = 0;
    let mut blocks = Vec::new();
    for l in input.layouts.iter().filter(|l| l.sheet_index == i) {
        let Some(width) = computed_width(l.table) else {
            continue;
        };
        let from = next_col.max(last_table_col(l) + 2);
        let first = free_columns(sheet, l, from, width).ok_or_else(|| {
            XlsxError::ParameterError(format!(
                "sheet '{}' has no {width} free columns right of its {} table for the computed columns",
                sheet.name,
                l.table.sheet_name()
            ))
        })?;
        if let Some(b) = computed_block(input, audit, l, units, first) {
            next_col = first + width + 1;
            blocks.push(b);
        }
    }
    Ok(blocks)
}

fn collect_marks(
    input: &Input,
    audit: &Audit,
    units: UnitSystem,
) -> BTreeMap<String, BTreeMap<(u32, u32), Mark>> {
    let mut marks: BTreeMap<String, BTreeMap<(u32, u32), Mark>> = BTreeMap::new();
    for f in &audit.findings {
        let Some(cell) = &f.cell else { continue };
        let m = marks
            .entry(cell.sheet.clone())
            .or_default()
            .entry((cell.row, cell.col))
            .or_default();
        m.severity = m.severity.max(Some(f.severity));
        m.note.push(format!(
            "{} [{}]: {}",
            f.severity,
            f.code,
            f.message.render(units)
        ));
    }
    let assumed = input
        .assumed()
        .map(|(_, a)| a)
        .chain(audit.systems.iter().flat_map(|s| &s.assumed));
    for a in assumed {
        let has_col = input.layouts.iter().any(|l| {
            l.sheet == a.cell.sheet
                && l.columns
                    .iter()
                    .any(|c| c.col == a.cell.col && c.spec.key == a.key)
        });
        if !has_col {
            continue;
        }
        let m = marks
            .entry(a.cell.sheet.clone())
            .or_default()
            .entry((a.cell.row, a.cell.col))
            .or_default();
        m.assumed = true;
        m.note.push(format!("assumed: {}", a.what.render(units)));
    }
    marks
}

fn data_result(d: &Data) -> String {
    match d {
        Data::Int(i) => i.to_string(),
        Data::Float(f) => f.to_string(),
        Data::String(s) => s.clone(),
        Data::Bool(b) => {
            if *b {
                "TRUE".into()
            } else {
                "FALSE".into()
            }
        }
        Data::DateTime(dt) => dt.as_f64().to_string(),
        Data::DateTimeIso(s) | Data::DurationIso(s) => s.clone(),
        Data::Error(e) => e.to_string(),
        Data::Empty => String::new(),
    }
}

/// Copy every cell, row by row (the sheet streams in low- or constant-memory mode): values by
/// type, formulas as formulas with their cached result, strings always as strings (a text
/// starting with `=` stays text), merged ranges, the computed columns, and marks as fill and
/// note. Notes are capped at [`MAX_NOTES_PER_SHEET`] per sheet on huge registers; every finding
/// stays in Findings.
fn copy_sheet(
    ws: &mut Worksheet,
    sheet: &SheetGrid,
    marks: Option<&BTreeMap<(u32, u32), Mark>>,
    blocks: &mut [Box<dyn Block + Send + '_>],
    st: &Styles,
) -> Result<(), XlsxError> {
    let empty = BTreeMap::new();
    let marks = marks.unwrap_or(&empty);
    let mark_format = |m: &Mark| match m.severity {
        Some(s) => st.severity(s),
        None => &st.assumed,
    };
    // Computed headers by row; computed columns take a column format set once.
    let mut headers: BTreeMap<u32, Vec<(u16, String)>> = BTreeMap::new();
    for block in blocks.iter() {
        for (i, (h, three)) in block.headers().iter().enumerate() {
            let col = (block.first_col() + i as u32) as u16;
            ws.set_column_width(col, 13)?;
            ws.set_column_format(col, if *three { &st.n3 } else { &st.n2 })?;
            headers
                .entry(block.header_row())
                .or_default()
                .push((col, h.clone()));
        }
    }
    let mut merges: BTreeMap<u32, Vec<&calamine::Dimensions>> = BTreeMap::new();
    for m in &sheet.merged {
        if m.start != m.end {
            merges.entry(m.start.0).or_default().push(m);
        }
    }
    let mut notes_left = MAX_NOTES_PER_SHEET;
    let plain = Format::new();
    let mut marks_iter = marks.iter().peekable();
    let mut row_marks: Vec<(u32, &Mark)> = Vec::new();
    let mut cells: Vec<(u32, &Data, Option<&str>)> = Vec::new();
    // Only rows that hold something are visited: a stray cell a million rows down is one row.
    let mut rows: Vec<u32> = sheet.stored_rows().collect();
    rows.extend(merges.keys());
    rows.extend(headers.keys());
    rows.extend(marks.keys().map(|k| k.0));
    for b in blocks.iter() {
        rows.extend(b.rows());
    }
    rows.sort_unstable();
    rows.dedup();
    for row in rows {
        for m in merges.get(&row).into_iter().flatten() {
            ws.merge_range(
                m.start.0,
                m.start.1 as u16,
                m.end.0,
                m.end.1 as u16,
                "",
                &plain,
            )?;
        }
        // This row's marks, in column order (usually none).
        row_marks.clear();
        while let Some(&(&(r, c), m)) = marks_iter.peek() {
            if r != row {
                break;
            }
            row_marks.push((c, m));
            marks_iter.next();
        }
        row_cells(sheet, row, &mut cells);
        for &(col, d, formula) in &cells {
            let fmt = row_marks
                .iter()
                .find(|(c, _)| *c == col)
                .map(|(_, m)| mark_format(m));
            copy_cell(ws, (row, col as u16), d, formula, fmt, (st, &plain))?;
        }
        for (col, h) in headers.get(&row).into_iter().flatten() {
            ws.write_string_with_format(row, *col, h, &st.header)?;
        }
        for block in blocks.iter_mut() {
            block.write_row(ws, row)?;
        }
        for &(col, m) in &row_marks {
            if !cells.iter().any(|c| c.0 == col) {
                ws.write_blank(row, col as u16, mark_format(m))?;
            }
            if notes_left > 0 {
                notes_left -= 1;
                let text: String = m.note.join("\n");
                ws.insert_note(
                    row,
                    col as u16,
                    &Note::new(truncate(&text, 2000))
                        .set_author("lossledger")
                        .add_author_prefix(false),
                )?;
            }
        }
    }
    Ok(())
}

/// Copy one input cell: a formula with its cached result, else the value by type; `fmt` is the
/// cell's mark (unmarked cells are written without a format: no per-cell format lookup).
fn copy_cell(
    ws: &mut Worksheet,
    (row, c16): (u32, u16),
    d: &Data,
    formula: Option<&str>,
    fmt: Option<&Format>,
    (st, plain): (&Styles, &Format),
) -> Result<(), XlsxError> {
    if let Some(formula) = formula {
        let formula = Formula::new(formula).set_result(data_result(d));
        match fmt {
            Some(f) => ws.write_formula_with_format(row, c16, formula, f)?,
            None => ws.write_formula(row, c16, formula)?,
        };
        return Ok(());
    }
    match (d, fmt) {
        (Data::Empty, None) => return Ok(()),
        (Data::Empty, Some(f)) => ws.write_blank(row, c16, f)?,
        (Data::Int(i), None) => ws.write_number(row, c16, *i as f64)?,
        (Data::Float(x), None) => ws.write_number(row, c16, *x)?,
        (Data::String(s), None) => ws.write_string(row, c16, s)?,
        (Data::Bool(b), None) => ws.write_boolean(row, c16, *b)?,
        (Data::Int(i), Some(f)) => ws.write_number_with_format(row, c16, *i as f64, f)?,
        (Data::Float(x), Some(f)) => ws.write_number_with_format(row, c16, *x, f)?,
        (Data::String(s), Some(f)) => ws.write_string_with_format(row, c16, s, f)?,
        (Data::Bool(b), Some(f)) => ws.write_boolean_with_format(row, c16, *b, f)?,
        (Data::DateTime(dt), f) => {
            ws.write_number_with_format(row, c16, dt.as_f64(), f.unwrap_or(&st.date))?
        }
        (Data::DateTimeIso(s) | Data::DurationIso(s), f) => {
            ws.write_string_with_format(row, c16, s, f.unwrap_or(plain))?
        }
        (Data::Error(e), f) => ws.write_formula_with_format(
            row,
            c16,
            Formula::new(error_formula(e)).set_result(e.to_string()),
            f.unwrap_or(plain),
        )?,
    };
    Ok(())
}

/// The cells of one row of an input sheet in column order: value (`Empty` for a formula whose
/// cached result is empty) and formula, reusing `out`.
fn row_cells<'a>(sheet: &'a SheetGrid, row: u32, out: &mut Vec<(u32, &'a Data, Option<&'a str>)>) {
    static EMPTY: Data = Data::Empty;
    out.clear();
    out.extend(sheet.row(row).map(|(c, d)| (c, d, None)));
    if !sheet.has_formulas() {
        return;
    }
    for (c, f) in sheet.row_formulas(row) {
        match out.binary_search_by_key(&c, |x| x.0) {
            Ok(i) => out[i].2 = Some(f),
            Err(i) => out.insert(i, (c, &EMPTY, Some(f))),
        }
    }
}

/// Columns of the computed block of a table kind, when it has one.
fn computed_width(table: TableKind) -> Option<u32> {
    let n = match table {
        TableKind::Pipes => RUN_COLUMNS.len(),
        TableKind::Fittings => FITTING_COLUMNS.len(),
        TableKind::Lines => LINE_COLUMNS.len(),
        _ => return None,
    };
    Some(n as u32)
}

/// The last column of a table's header (matched or not).
fn last_table_col(layout: &Layout) -> u32 {
    let mapped = layout.columns.iter().map(|c| c.col);
    let unknown = layout.unknown.iter().map(|(c, _)| *c);
    mapped.chain(unknown).max().unwrap_or(0)
}

/// The first column at or right of `from` where `width` computed columns, with a free column
/// before them, meet no input cell in the table's rows (header to last row), within the sheet's
/// 16,384 columns. Cells elsewhere (a title above, a stray value far to the right) do not push
/// the computed columns away from the table.
fn free_columns(sheet: &SheetGrid, layout: &Layout, from: u32, width: u32) -> Option<u32> {
    let rows = layout.header_row..layout.end_row(sheet).max(layout.data_start);
    let mut taken: Vec<u32> = Vec::new();
    for r in sheet.used_rows(rows.clone()) {
        taken.extend(sheet.row(r).map(|(c, _)| c));
        taken.extend(sheet.row_formulas(r).map(|(c, _)| c));
    }
    for m in sheet
        .merged
        .iter()
        .filter(|m| m.start.0 < rows.end && m.end.0 >= rows.start)
    {
        taken.extend(m.start.1..=m.end.1);
    }
    taken.sort_unstable();
    taken.dedup();
    let mut c = from.max(1);
    while c + width <= crate::ingest::SHEET_COLS {
        let lo = taken.partition_point(|&t| t < c - 1);
        match taken.get(lo) {
            Some(&t) if t < c + width => c = t + 2,
            _ => return Some(c),
        }
    }
    None
}

/// Copy an input sheet cell for cell (values, formulas with their cached results, merged
/// ranges) without marks or computed columns: the comparison workbook's copy of the new input.
///
/// # Errors
/// What the workbook writer reports.
pub(crate) fn copy_plain(
    ws: &mut Worksheet,
    sheet: &SheetGrid,
    st: &Styles,
) -> Result<(), XlsxError> {
    copy_sheet(ws, sheet, None, &mut [], st)
}

/// Rows of mixed lists whose classification is listed in the Parse report at most (all are
/// shown by `lossledger check`).
const MAX_CLASSIFIED: usize = 5_000;

/// Cell notes written per sheet at most, in row order; beyond this the cells are still filled by
/// severity and every finding is listed in Findings with its cell. A note costs the writer about
/// 9 kB until the file is saved (measured, docs/reliability.md), and a sheet with thousands of
/// notes is slow to open and no easier to read than Findings.
pub const MAX_NOTES_PER_SHEET: usize = 2_000;

/// A formula that evaluates to an error value, for error cells that had no formula of their own.
fn error_formula(e: &calamine::CellErrorType) -> &'static str {
    use calamine::CellErrorType::*;
    match e {
        Div0 => "1/0",
        NA => "NA()",
        Name => "_xlfn.NONEXISTENT()",
        Null => "A1 A2",
        Num => "SQRT(-1)",
        Ref => "#REF!",
        Value => "\"a\"+1",
        GettingData => "NA()",
    }
}

/// A computed cell: a number (in SI; converted and rounded when written) or text borrowed from
/// the audit. Non-finite numbers and empty text leave the cell empty.
#[derive(Clone, Copy)]
enum Value<'a> {
    Num(f64),
    Text(&'a str),
}

/// One computed column over results of type `T`: SI header, three decimals (else two), value.
struct Column<T> {
    header: &'static str,
    three: bool,
    get: fn(&T) -> Value<'_>,
}

const fn col<T>(header: &'static str, three: bool, get: fn(&T) -> Value<'_>) -> Column<T> {
    Column { header, three, get }
}

fn opt(v: Option<f64>) -> Value<'static> {
    Value::Num(v.unwrap_or(f64::NAN))
}

const RUN_COLUMNS: &[Column<RunResult>] = &[
    col("Bore [mm]", false, |r| Value::Num(r.inner_diameter_m * 1e3)),
    col("Bore from", false, |r| Value::Text(&r.bore_basis)),
    col("Roughness [mm]", true, |r| Value::Num(r.roughness_m * 1e3)),
    col("Velocity [m/s]", false, |r| Value::Num(r.velocity_m_s)),
    col("Reynolds", false, |r| Value::Num(r.reynolds.round())),
    col("Friction factor", true, |r| Value::Num(r.friction_factor)),
    col("Regime", false, |r| Value::Text(r.regime.name())),
    col("Friction head [m]", true, |r| Value::Num(r.head_m)),
    col("Friction loss [kPa]", true, |r| Value::Num(r.dp_pa / 1e3)),
    col("Gradient [m/100 m]", false, |r| {
        Value::Num(r.head_m / r.length_m * 100.0)
    }),
];

/// Per fitting: what the item was read as, its K with the band, the bore and velocity K applies
/// to, the head, the rank and the annual cost. What follows from these is not repeated on every
/// row of a register that may hold a million fittings: the head band is K low/high times the same
/// velocity head, Δp = ρ·g·head (ρ in Lines), kWh = cost / tariff (Basis); the ranking sheet
/// shows all of them for the worst items, the JSON for every item, and Basis lists each model's
/// source once.
const FITTING_COLUMNS: &[Column<FittingResult>] = &[
    col("Kind", false, |f| Value::Text(f.kind)),
    col("Model", false, |f| Value::Text(f.model)),
    col("K", true, |f| Value::Num(f.k)),
    col("K low", true, |f| Value::Num(f.k_low)),
    col("K high", true, |f| Value::Num(f.k_high)),
    col("K refers to bore [mm]", false, |f| {
        Value::Num(f.reference_diameter_m * 1e3)
    }),
    col("Velocity [m/s]", false, |f| Value::Num(f.velocity_m_s)),
    col("Head [m]", true, |f| Value::Num(f.head_m)),
    col("Rank", false, |f| opt(f.rank.map(|r| r as f64))),
    col("Annual cost", false, |f| opt(f.annual_cost)),
    col("Suggestion (estimate; cautions in Basis)", false, |f| {
        Value::Text(
            f.suggestion
                .as_ref()
                .map_or("", |s| s.replace_with.as_str()),
        )
    }),
];

const LINE_COLUMNS: &[Column<LineResult>] = &[
    col("Length [m]", false, |l| Value::Num(l.length_m)),
    col("Friction head [m]", true, |l| Value::Num(l.friction_head_m)),
    col("Fittings head [m]", true, |l| Value::Num(l.fittings_head_m)),
    col("Total head [m]", true, |l| Value::Num(l.total_head_m)),
    col("Total low [m]", true, |l| Value::Num(l.total_head_low_m)),
    col("Total high [m]", true, |l| Value::Num(l.total_head_high_m)),
    col("Total loss [kPa]", true, |l| {
        Value::Num(l.total_dp_pa / 1e3)
    }),
    col("Max velocity [m/s]", false, |l| {
        Value::Num(l.max_velocity_m_s)
    }),
    col("Density [kg/m3]", false, |l| Value::Num(l.density_kg_m3)),
    col("Power lost [W]", false, |l| opt(l.power_loss_w)),
    col("Efficiency used", true, |l| opt(l.efficiency)),
    col("Hours per year used", false, |l| opt(l.hours_per_year)),
    col("Annual energy [kWh]", false, |l| opt(l.annual_energy_kwh)),
    col("Annual cost", false, |l| opt(l.annual_cost)),
];

/// The computed columns appended to one table's sheet, written row by row as the copy is
/// streamed: the results are visited in source-row order and nothing is materialised.
trait Block {
    /// Row of the table's header (the computed headers go there).
    fn header_row(&self) -> u32;
    /// First computed column (one past the sheet's last used column, plus a gap).
    fn first_col(&self) -> u32;
    /// Headers in the report's units, and whether each takes three decimals.
    fn headers(&self) -> &[(String, bool)];
    /// Write the computed cells of source row `row`, if a result comes from it. Rows must be
    /// asked for in increasing order.
    fn write_row(&mut self, ws: &mut Worksheet, row: u32) -> Result<(), XlsxError>;
    /// The source rows results come from.
    fn rows(&self) -> Vec<u32>;
}

struct Computed<'a, T: 'static> {
    header_row: u32,
    first_col: u32,
    headers: Vec<(String, bool)>,
    factors: Vec<f64>,
    columns: &'static [Column<T>],
    /// Results with their source rows, in row order.
    items: Vec<(u32, &'a T)>,
    next: usize,
}

impl<'a, T: 'static> Computed<'a, T> {
    fn new(
        layout: &Layout,
        first_col: u32,
        columns: &'static [Column<T>],
        mut items: Vec<(u32, &'a T)>,
        units: UnitSystem,
    ) -> Self {
        items.sort_by_key(|(r, _)| *r);
        let (headers, factors) = columns
            .iter()
            .map(|c| {
                let (h, f) = header_in(c.header, units);
                ((h, c.three), f)
            })
            .unzip();
        Computed {
            header_row: layout.header_row,
            first_col,
            headers,
            factors,
            columns,
            items,
            next: 0,
        }
    }
}

impl<T: 'static> Block for Computed<'_, T> {
    fn header_row(&self) -> u32 {
        self.header_row
    }
    fn first_col(&self) -> u32 {
        self.first_col
    }
    fn headers(&self) -> &[(String, bool)] {
        &self.headers
    }
    fn rows(&self) -> Vec<u32> {
        self.items.iter().map(|(r, _)| *r).collect()
    }
    fn write_row(&mut self, ws: &mut Worksheet, row: u32) -> Result<(), XlsxError> {
        while self.items.get(self.next).is_some_and(|(r, _)| *r < row) {
            self.next += 1;
        }
        let Some(&(r, item)) = self.items.get(self.next) else {
            return Ok(());
        };
        if r != row {
            return Ok(());
        }
        self.next += 1;
        for (i, (c, factor)) in self.columns.iter().zip(&self.factors).enumerate() {
            let col = (self.first_col + i as u32) as u16;
            match (c.get)(item) {
                Value::Num(x) if x.is_finite() => {
                    ws.write_number(row, col, shown(x * factor))?;
                }
                Value::Text(t) if !t.is_empty() => {
                    ws.write_string(row, col, t)?;
                }
                _ => {}
            }
        }
        Ok(())
    }
}

/// The computed block of one input table, if its kind has computed columns.
fn computed_block<'a>(
    _input: &Input,
    audit: &'a Audit,
    layout: &Layout,
    units: UnitSystem,
    first_col: u32,
) -> Option<Box<dyn Block + Send + 'a>> {
    let here = |sheet: &str| sheet == layout.sheet;
    Some(match layout.table {
        TableKind::Pipes => Box::new(Computed::new(
            layout,
            first_col,
            RUN_COLUMNS,
            audit
                .runs
                .iter()
                .filter(|r| here(&r.cell.sheet))
                .map(|r| (r.row, r))
                .collect(),
            units,
        )),
        TableKind::Fittings => Box::new(Computed::new(
            layout,
            first_col,
            FITTING_COLUMNS,
            audit
                .fittings
                .iter()
                .filter(|f| here(&f.cell.sheet))
                .map(|f| (f.row, f))
                .collect(),
            units,
        )),
        TableKind::Lines => Box::new(Computed::new(
            layout,
            first_col,
            LINE_COLUMNS,
            audit
                .lines
                .iter()
                .filter(|l| l.sheet.as_deref().is_some_and(here))
                .filter_map(|l| l.row.map(|r| (r, l)))
                .collect(),
            units,
        )),
        _ => return None,
    })
}

fn write_summary(
    ws: &mut Worksheet,
    input: &Input,
    audit: &Audit,
    st: &Styles,
) -> Result<(), XlsxError> {
    // Printed on landscape pages one page wide, so the summary table is not cut at the margin.
    ws.set_landscape().set_print_fit_to_pages(1, 0);
    ws.write_string_with_format(
        0,
        0,
        "lossledger audit: friction and fitting losses",
        &st.title,
    )?;
    ws.write_string(
        1,
        0,
        format!("Input: {}  (SHA-256 {})", input.file, input.sha256),
    )?;
    ws.merge_range(2, 0, 4, 8, super::CAUTION, &st.wrap)?;
    ws.set_row_height(2, 30)?;
    let total: f64 = audit.lines.iter().map(|l| l.total_head_m).sum();
    let mut r = 6;
    if let Some(cell) = super::invented::marker(input) {
        ws.write_string_with_format(r, 0, super::invented::label(&cell), &st.bold)?;
        r += 2;
    }
    let (losses_label, fh) = header_in("Sum of line losses [m]", st.units);
    let count = |n: usize| (n as f64, &st.n0);
    for (label, (value, fmt)) in [
        ("Lines audited", count(audit.lines.len())),
        ("Pipe runs", count(audit.runs.len())),
        ("Fittings", count(audit.fittings.len())),
        (losses_label.as_str(), (total * fh, &st.n3)),
        ("Findings: errors", count(audit.count(Severity::Error))),
        ("Findings: warnings", count(audit.count(Severity::Warning))),
        ("Findings: info", count(audit.count(Severity::Info))),
    ] {
        ws.write_string_with_format(r, 0, label, &st.bold)?;
        ws.write_number_with_format(r, 2, value, fmt)?;
        r += 1;
    }
    if !input.report.left_out.is_empty() {
        ws.write_string_with_format(r, 0, "Rows left out by status", &st.bold)?;
        ws.write_number_with_format(r, 2, input.report.left_out.len() as f64, &st.n0)?;
        ws.write_string(r, 3, "decommissioned, removed, spare ...; listed in Basis")?;
        r += 1;
    }
    r = write_legend(ws, r + 1, st)? + 1;
    r = super::ranking::write_summary_block(ws, audit, r, st)?;
    r = super::station::write_summary_station(ws, audit, r, st)?;
    let headers = [
        "Line",
        "Service",
        "Flow [m3/h]",
        "Length [m]",
        "Friction head [m]",
        "Fittings head [m]",
        "Total head [m]",
        "Total low [m]",
        "Total high [m]",
        "Total loss [kPa]",
        "Max velocity [m/s]",
    ];
    let converted: Vec<(String, f64)> = headers.iter().map(|h| header_in(h, st.units)).collect();
    for (c, (h, _)) in converted.iter().enumerate() {
        ws.write_string_with_format(r, c as u16, h, &st.header)?;
    }
    for l in &audit.lines {
        r += 1;
        ws.write_string(r, 0, &l.line)?;
        ws.write_string(r, 1, l.service.id())?;
        for (c, v) in [
            l.flow_m3_s * 3600.0,
            l.length_m,
            l.friction_head_m,
            l.fittings_head_m,
            l.total_head_m,
            l.total_head_low_m,
            l.total_head_high_m,
            l.total_dp_pa / 1e3,
            l.max_velocity_m_s,
        ]
        .into_iter()
        .enumerate()
        {
            let factor = converted.get(c + 2).map_or(1.0, |(_, f)| *f);
            ws.write_number_with_format(r, c as u16 + 2, v * factor, &st.n3)?;
        }
    }
    ws.set_column_width(0, 18)?;
    for c in 1..headers.len() as u16 {
        ws.set_column_width(c, 17)?;
    }
    Ok(())
}

/// The legend of the workbook's fills: a sample cell in each fill, its name and meaning. Returns
/// the next free row.
fn write_legend(ws: &mut Worksheet, mut r: u32, st: &Styles) -> Result<u32, XlsxError> {
    ws.write_string_with_format(r, 0, "Fills used in this workbook", &st.bold)?;
    for (fill, name, meaning) in st.legend() {
        r += 1;
        ws.write_string_with_format(r, 1, name, fill)?;
        ws.write_string(r, 2, meaning)?;
    }
    Ok(r + 1)
}

/// The Findings sheet, an Excel table with a link to each finding's cell. Written row by row
/// (the sheet streams in constant-memory mode: a huge register has a finding on many rows).
fn write_findings(
    ws: &mut Worksheet,
    audit: &Audit,
    invented: Option<&str>,
    st: &Styles,
) -> Result<(), XlsxError> {
    ws.set_landscape().set_print_fit_to_pages(1, 0);
    let headers = [
        "Severity", "Code", "Line", "Tag", "Cell", "Message", "Action",
    ];
    for (c, w) in [10, 18, 12, 12, 14, 80, 60].into_iter().enumerate() {
        ws.set_column_width(c as u16, w)?;
    }
    ws.set_freeze_panes(1, 0)?;
    // The table first: it writes the header row, which must come before the data rows here.
    let n = audit.findings.len() as u32;
    let columns: Vec<TableColumn> = headers
        .iter()
        .map(|h| TableColumn::new().set_header(*h))
        .collect();
    let table = Table::new().set_columns(&columns).set_name("Findings");
    ws.add_table(0, 0, n.max(1), headers.len() as u16 - 1, &table)?;
    // The invented-data label beside the header row (the table starts at A1; rows stream in order).
    if let Some(label) = invented {
        ws.write_string_with_format(0, headers.len() as u16 + 1, label, &st.bold)?;
    }
    for (i, f) in audit.findings.iter().enumerate() {
        let r = i as u32 + 1;
        ws.write_string_with_format(r, 0, f.severity.label(), st.severity(f.severity))?;
        ws.write_string(r, 1, f.code)?;
        ws.write_string(r, 2, f.line.as_deref().unwrap_or(""))?;
        ws.write_string(r, 3, f.tag.as_deref().unwrap_or(""))?;
        match &f.cell {
            Some(c) => {
                let target = format!("internal:{}!{}", quote_sheet(&c.sheet), c.a1());
                let url = rust_xlsxwriter::Url::new(target).set_text(c.to_string());
                ws.write_url_with_format(r, 4, url, &st.link)?;
            }
            None => {
                ws.write_string(r, 4, "")?;
            }
        }
        ws.write_string(r, 5, truncate(&f.message.render(st.units), MAX_CELL_CHARS))?;
        ws.write_string(r, 6, truncate(&f.action, MAX_CELL_CHARS))?;
    }
    Ok(())
}

/// One Basis line per system whose pump curve gave the efficiency of some of its lines (in
/// place of the rules' flat default): where it was read and which lines used it.
fn curve_efficiency_lines(audit: &Audit) -> Vec<(String, String)> {
    let st = &audit.rules.station;
    audit
        .systems
        .iter()
        .filter_map(|s| {
            let p = s.pump_efficiency?;
            let (e, w) = (p.pump_efficiency?, p.wire_to_water?);
            let lines: Vec<&str> = s
                .lines
                .iter()
                .filter_map(|l| audit.line_of(l))
                .map(|i| &audit.lines[i])
                .filter(|l| l.efficiency_basis == crate::audit::energy::CURVE_BASIS && l.efficiency == Some(w))
                .map(|l| l.line.as_str())
                .collect();
            (!lines.is_empty()).then(|| {
                (
                    format!("Efficiency of system {}", s.system),
                    format!(
                        "pump curve {:.1} % at {:.1} m3/h × motor {:.1} % = {:.1} % wire-to-water, used instead of the flat {:.1} % for lines {}",
                        e * 100.0,
                        p.flow_m3_s * 3600.0,
                        st.motor_efficiency * 100.0,
                        w * 100.0,
                        audit.rules.energy.efficiency * 100.0,
                        lines.join(", ")
                    ),
                )
            })
        })
        .collect()
}

/// The cautions the Basis sheet opens with, as label and text.
const BASIS_CAUTIONS: [(&str, &str); 5] = [
    ("Caution", super::CAUTION),
    ("Caution on savings", crate::audit::energy::SAVINGS_CAUTION),
    (
        "Caution on suggestions (marked *)",
        crate::audit::energy::OPERATING_POINT_CAUTION,
    ),
    ("Caution on systems", super::ranking::SYSTEMS_CAUTION),
    (
        "Caution on energy figures",
        crate::audit::station::STATION_CAUTION,
    ),
];

/// The methods the Basis sheet states, as label and text.
const BASIS_METHODS: [(&str, &str); 13] = [
    (
        "Friction",
        "Darcy–Weisbach h = f (L/D) v²/2g; f = 64/Re for Re ≤ 2000; Colebrook–White (1939) solved to 1e-12 relative for Re ≥ 4000; linear interpolation in Re between, flagged transition-regime.",
    ),
    (
        "Hazen–Williams",
        "Where a C factor is given (water only): h = 10.67 L Q^1.852 / (C^1.852 D^4.8704), SI form.",
    ),
    (
        "Fittings",
        "h = K v²/2g per item times quantity; v is the mean velocity in the bore K refers to (the smaller bore for area changes).",
    ),
    (
        "Pipe bores",
        "ASME B36.10M (carbon and galvanised steel; default schedule 40, STD where 40 is not defined), ASME B36.19M (stainless; default 40S), ISO 4427-2 / ISO 1452-2 (PE, PVC-U by OD and SDR; no default SDR), EN 545 class K9 with ISO 4179 cement lining (ductile iron), EN 1057 and ASTM B88 (copper). 'Inner diameter' overrides; the bore used is in each run's 'Bore from' column.",
    ),
    ("Gravity", "g = 9.80665 m/s²"),
    (
        "Energy",
        "P = Δp·Q (hydraulic power lost); electrical P/η with η the wire-to-water efficiency (Lines, else Systems, else rules); kWh per year = P/η × hours / 1000; cost = kWh × tariff. Gravity lines cost no pump energy: their loss is lost capacity, ranked by head. See docs/energy.md.",
    ),
    (
        "Ranking",
        "Fittings by annual cost (head where no pump energy applies); ties share a rank; rank range = best and worst rank with this item and the others at opposite ends of their K bands; more than 3 places either way is marked uncertain (common practice, no source).",
    ),
    (
        "Systems",
        "Required head = static head + sum of line losses, each line at its own flow; system curve 0–130 % of duty with friction factors and Re-dependent K recomputed at each flow; operating point where a given pump curve meets it.",
    ),
    (
        "Station energy",
        "Metered: specific energy e = kWh / m3; wire-to-water = (ρ g / 3.6e6) × H / e with H the computed required head at duty (ISO/ASME 14414, ASME EA-2). Test point: head given or (p_discharge − p_suction)/(ρ g); wire-to-water = ρ g Q H / P. Piping share = line losses / required head. Rules [station]: min_wire_to_water, max_loss_share, head_tolerance, motor_efficiency (common practice); preferred region preferred_min–preferred_max of best-efficiency flow (ANSI/HI 9.6.3). Screening estimates.",
    ),
    (
        "Pump curve efficiency",
        "Best-efficiency point: vertex of the parabola through the highest efficiency point and its neighbours (Efficiency, else ρ g Q H / shaft power). The pump efficiency at the operating point (else at duty) × [station] motor_efficiency replaces the rules' flat efficiency for the system's lines where Lines and Systems give none.",
    ),
    (
        "Savings by control",
        "Control (Systems; default fixed, assumed and marked): speed — saved at once, new speed by the affinity laws r² H(Q/r) against the system curve with its static head; fixed — the operating point re-solved with the loss removed (loss ∝ Q²), saving conditional on trimming or speed control; throttled — the throttling valve's loss is saved once speed control or trimming replaces it. Each saving at the line's flow with its efficiency held.",
    ),
    (
        "Life-cycle view",
        "Present value of each saving = S × (1 − (1 + i)^−n) / i over [life_cycle] years n at discount_rate i (HI/Europump pump life-cycle cost guide); net present value = present value − replacement cost.",
    ),
    (
        "NPSH",
        "NPSHa = (p_source − p_vapour)/(ρg) + suction level − suction losses; p_source defaults to the ISO 2533 standard atmosphere at the site elevation (Systems sheet, else the rules, else 0 m, sea level, assumed); checked at duty flow and, where a pump curve gives one, at the operating point (NPSH required from the Pump curve where given, else the duty value), with the suction losses at the high end of their K bands (nominal shown beside); margin rule max(ratio × NPSHr, NPSHr + minimum) (common practice, no source).",
    ),
];

/// One row of the Basis sheet: label (bold for a heading) and text.
struct BasisRow {
    label: String,
    text: String,
    bold: bool,
}

/// The rows of the Basis sheet, in order.
#[derive(Default)]
struct BasisRows(Vec<BasisRow>);

impl BasisRows {
    fn row(&mut self, label: impl Into<String>, text: impl Into<String>) {
        self.0.push(BasisRow {
            label: label.into(),
            text: text.into(),
            bold: false,
        });
    }

    fn heading(&mut self, label: &str) {
        self.0.push(BasisRow {
            label: label.into(),
            text: String::new(),
            bold: true,
        });
    }

    fn blank(&mut self) {
        self.row("", "");
    }
}

fn write_basis(
    ws: &mut Worksheet,
    input: &Input,
    audit: &Audit,
    st: &Styles,
) -> Result<(), XlsxError> {
    let mut rows = BasisRows::default();
    basis_header(&mut rows, input, audit);
    rows.blank();
    rows.heading("Methods");
    for (a, b) in BASIS_METHODS {
        rows.row(a, b);
    }
    for (a, b) in curve_efficiency_lines(audit) {
        rows.row(a, b);
    }
    rows.blank();
    basis_kinds_and_rules(&mut rows, audit);
    rows.blank();
    rows.heading("Parse report");
    if st.units == UnitSystem::Us {
        rows.row(
            "Units shown",
            "computed columns and Summary in US customary units (ft, in, US gpm, psi, ft/s, ft of head); JSON output stays SI",
        );
    }
    for src in &input.sources {
        rows.row(
            "file read",
            format!(
                "{} (SHA-256 {}): sheets {}",
                src.file,
                src.sha256,
                src.sheets.join(", ")
            ),
        );
    }
    basis_layouts(&mut rows, input);
    basis_assumed(&mut rows, input, audit, st.units);
    basis_reading(&mut rows, input);
    for d in &audit.notes {
        rows.row(d.severity.label(), d.to_string());
    }
    for (r, row) in rows.0.iter().enumerate() {
        let r = r as u32;
        let a = truncate(&row.label, MAX_CELL_CHARS);
        if row.bold {
            ws.write_string_with_format(r, 0, a, &st.bold)?;
        } else {
            ws.write_string(r, 0, a)?;
        }
        if !row.text.is_empty() {
            ws.write_string(r, 1, truncate(&row.text, MAX_CELL_CHARS))?;
        }
    }
    ws.set_column_width(0, 34)?;
    ws.set_column_width(1, 120)?;
    Ok(())
}

/// Tool, input, invented-data mark, cautions and the fluid properties used.
fn basis_header(rows: &mut BasisRows, input: &Input, audit: &Audit) {
    rows.heading("Basis of this audit");
    rows.row("Tool", format!("lossledger {}", env!("CARGO_PKG_VERSION")));
    rows.row("Input file", input.file.as_str());
    rows.row("Input SHA-256", input.sha256.as_str());
    if let Some(cell) = super::invented::marker(input) {
        rows.row("Invented data", super::invented::label(&cell));
    }
    for (a, b) in BASIS_CAUTIONS {
        rows.row(a, b);
    }
    rows.blank();
    rows.heading("Fluid properties used");
    for f in &audit.fluids {
        rows.row(
            format!("{} at {:.2} °C", f.fluid, f.temperature_c),
            format!(
                "density {:.3} kg/m3, viscosity {:.4e} Pa·s, vapour pressure {} — {}",
                f.props.density_kg_m3,
                f.props.viscosity_pa_s,
                if f.props.vapour_pressure_pa.is_finite() {
                    format!("{:.1} Pa", f.props.vapour_pressure_pa)
                } else {
                    "not given".into()
                },
                f.basis
            ),
        );
    }
}

/// Each fitting kind, model and source in use once (the Fittings copy names kind and model per
/// row), then the rules in force.
fn basis_kinds_and_rules(rows: &mut BasisRows, audit: &Audit) {
    rows.heading("Fitting kinds, models and sources used");
    let mut used: BTreeMap<(&str, &str, &str), usize> = BTreeMap::new();
    for f in &audit.fittings {
        *used.entry((f.kind, f.model, f.source)).or_default() += 1;
    }
    for ((kind, model, source), n) in used {
        let items = if n == 1 { "item" } else { "items" };
        rows.row(kind, format!("{model} — {source} ({n} {items})"));
    }
    rows.blank();
    rows.heading(
        "Rules in force (common practice for water unless your rules file says otherwise)",
    );
    let rules = toml::to_string(&audit.rules).unwrap_or_default();
    for l in rules.lines().filter(|l| !l.trim().is_empty()) {
        rows.row("", l);
    }
}

/// Each table read: header rows, units row, title rows skipped, the header mapping, and the
/// columns kept as they are.
fn basis_layouts(rows: &mut BasisRows, input: &Input) {
    for l in input
        .layouts
        .iter()
        .filter(|l| !crate::ingest::list::is_view(input, l))
    {
        let mapping: Vec<String> = l
            .columns
            .iter()
            .map(|c| {
                let unit = match (c.unit, c.unit_defaulted) {
                    (Some(u), true) => format!(" [{}, no unit written]", u.label),
                    (Some(u), false) => format!(" [{}]", u.label),
                    (None, _) => String::new(),
                };
                format!(
                    "'{}' → {}{unit}{}",
                    c.header,
                    c.spec.key,
                    if c.by_map { " (from --map)" } else { "" }
                )
            })
            .collect();
        let header = if l.header_rows > 1 {
            format!(
                "header rows {}–{}",
                l.header_row + 1,
                l.header_row + l.header_rows
            )
        } else {
            format!("header row {}", l.header_row + 1)
        };
        let units_row = l
            .units_row
            .map(|u| format!("; units row {}", u + 1))
            .unwrap_or_default();
        let above = if l.header_row > 0 {
            format!(
                "; {} row(s) above the header skipped as title",
                l.header_row
            )
        } else {
            String::new()
        };
        rows.row(
            format!("{} (sheet '{}')", l.table.sheet_name(), l.sheet),
            format!("{header}{units_row}{above}; {}", mapping.join(", ")),
        );
        if !l.unknown.is_empty() {
            let kept: Vec<&str> = l.unknown.iter().map(|(_, h)| h.as_str()).collect();
            rows.row("", format!("kept as is: {}", kept.join(", ")));
        }
    }
}

/// Values assumed, by sheet, by system (with the NPSH defaults) and by line.
fn basis_assumed(rows: &mut BasisRows, input: &Input, audit: &Audit, units: UnitSystem) {
    for ((sheet, what), n) in input.assumed_by_sheet() {
        let what = what.render(units);
        rows.row(format!("assumed on {sheet}"), format!("{what}: {n} row(s)"));
    }
    for s in &audit.systems {
        for a in &s.assumed {
            rows.row(
                format!("assumed on {}", a.cell.sheet),
                format!("system {} ({}): {}", s.system, a.cell, a.what.render(units)),
            );
        }
        if !s.defaults.is_empty() {
            rows.row(
                format!("defaults applied to NPSH, system {}", s.system),
                crate::sentence::join(&s.defaults, "; ", units),
            );
        }
    }
    for (l, keys) in input.assumed_by_line() {
        let parts: Vec<String> = keys.iter().map(|(k, n)| format!("{k} ×{n}")).collect();
        rows.row(format!("assumed on line {l}"), parts.join(", "));
    }
}

/// What reading did to the cells: text read as numbers, rows skipped or left out, list rows
/// classified, blank rows.
fn basis_reading(rows: &mut BasisRows, input: &Input) {
    let conv = &input.report.conversions;
    if !conv.is_empty() {
        rows.row("text read as numbers", format!("{} cell(s)", conv.len()));
        for c in conv.iter().take(500) {
            let unit = c
                .unit
                .as_deref()
                .map(|u| format!(" {u}"))
                .unwrap_or_default();
            rows.row("", format!("{}: '{}' → {}{unit}", c.cell, c.text, c.value));
        }
    }
    for sk in &input.report.skipped {
        rows.row("row skipped", format!("{}: {}", sk.cell, sk.reason));
    }
    for sk in &input.report.left_out {
        rows.row("left out by status", format!("{}: {}", sk.cell, sk.reason));
    }
    for c in input.report.classified.iter().take(MAX_CLASSIFIED) {
        if matches!(c.became, Became::Run | Became::Fitting | Became::Heading) {
            rows.row(
                format!("list row read as {}", c.became.word()),
                format!("{}: {} — {}", c.cell, c.what, c.deciding),
            );
        }
    }
    for (sheet, n) in &input.report.blank_rows {
        rows.row(
            "blank rows",
            format!("{sheet}: {n} blank row(s) inside the table skipped"),
        );
    }
}
