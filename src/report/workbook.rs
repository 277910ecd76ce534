//! The annotated workbook: Summary, Findings, every input sheet kept cell for cell with computed
//! columns appended, and Basis.

use calamine::Data;
use rust_xlsxwriter::{
    DocProperties, ExcelDateTime, Format, Formula, Note, Table, TableColumn, Workbook, Worksheet,
    XlsxError,
};
use std::collections::{BTreeMap, HashSet};

use super::console::{UnitSystem, header_in};
use super::style::{MAX_CELL_CHARS, Styles, truncate};
use crate::audit::Audit;
use crate::error::{Severity, quote_sheet};
use crate::ingest::{Input, Layout, SheetGrid, TableKind};
use crate::physics::fitting;

/// Deflate level of the written workbook (1 fastest … 9 smallest).
const ZIP_LEVEL: u8 = 2;

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

/// Build the annotated workbook in memory and return its bytes.
pub fn build(input: &Input, audit: &Audit) -> Result<Vec<u8>, XlsxError> {
    build_in(input, audit, UnitSystem::Si)
}

/// Build the annotated workbook with the computed columns and the summary in `units`.
pub fn build_in(input: &Input, audit: &Audit, units: UnitSystem) -> Result<Vec<u8>, XlsxError> {
    let mut wb = Workbook::new();
    // Fixed creation time: the same input gives a byte-identical workbook.
    let created = ExcelDateTime::from_ymd(2000, 1, 1)?;
    wb.set_properties(
        &DocProperties::new()
            .set_creation_datetime(&created)
            .set_title("lossledger audit")
            .set_comment("Screening estimate; see the Basis sheet"),
    );
    // Fast deflate: the audit copy holds several times the input's cells; level 2 writes it about
    // 40 % faster than the default level for a file some 20 % larger (measured, scripts/bench.sh).
    wb.set_zip_compression_level(ZIP_LEVEL);
    let mut st = Styles::new();
    st.units = units;
    let taken: HashSet<String> = input.sheets.iter().map(|s| s.name.to_lowercase()).collect();
    let summary_name = unique_name("Summary", &taken);
    let findings_name = unique_name("Findings", &taken);
    let basis_name = unique_name("Basis", &taken);
    let ranking_name = unique_name("Fitting ranking", &taken);
    let systems_name = if taken.contains("systems") {
        unique_name("System checks", &taken)
    } else {
        "Systems".to_string()
    };

    let ws = wb.add_worksheet();
    ws.set_name(&summary_name)?;
    write_summary(ws, input, audit, &st)?;

    let ws = wb.add_worksheet();
    ws.set_name(&findings_name)?;
    write_findings(ws, audit, &st)?;

    let ws = wb.add_worksheet_with_constant_memory()?;
    ws.set_name(&ranking_name)?;
    super::ranking::write_ranking(ws, &ranking_name, audit)?;

    if !audit.systems.is_empty() {
        let ws = wb.add_worksheet();
        ws.set_name(&systems_name)?;
        super::ranking::write_systems(ws, &systems_name, audit)?;
    }

    let marks = collect_marks(input, audit);
    for (i, sheet) in input.sheets.iter().enumerate() {
        // Input copies are the largest sheets: stream them row by row in constant memory.
        let ws = wb.add_worksheet_with_constant_memory()?;
        ws.set_name(&sheet.name)?;
        let computed: Vec<ComputedBlock> = input
            .layouts
            .iter()
            .filter(|l| l.sheet_index == i)
            .map(|l| computed_columns(input, audit, l, st.units))
            .collect();
        copy_sheet(ws, sheet, marks.get(&sheet.name), &computed, &st)?;
        if sheet.hidden {
            ws.set_hidden(true);
        }
    }

    let ws = wb.add_worksheet();
    ws.set_name(&basis_name)?;
    write_basis(ws, input, audit, &st)?;
    wb.save_to_buffer()
}

fn collect_marks(input: &Input, audit: &Audit) -> BTreeMap<String, BTreeMap<(u32, u32), Mark>> {
    let mut marks: BTreeMap<String, BTreeMap<(u32, u32), Mark>> = BTreeMap::new();
    for f in &audit.findings {
        let Some(cell) = &f.cell else { continue };
        let m = marks
            .entry(cell.sheet.clone())
            .or_default()
            .entry((cell.row, cell.col))
            .or_default();
        m.severity = m.severity.max(Some(f.severity));
        m.note
            .push(format!("{} [{}]: {}", f.severity, f.code, f.message));
    }
    let assumed = input
        .lines
        .iter()
        .flat_map(|l| &l.assumed)
        .chain(input.pipes.iter().flat_map(|p| &p.assumed))
        .chain(input.fittings.iter().flat_map(|f| &f.assumed));
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
        m.note.push(format!("assumed: {}", a.what));
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

/// Copy every cell, row by row (the sheet is in constant-memory mode): values by type, formulas
/// as formulas with their cached result, strings always as strings (a text starting with `=`
/// stays text), merged ranges, the computed columns, and marks as fill and note. Notes are capped
/// at [`MAX_NOTES_PER_SHEET`] per sheet on huge registers; every finding stays in Findings.
fn copy_sheet(
    ws: &mut Worksheet,
    sheet: &SheetGrid,
    marks: Option<&BTreeMap<(u32, u32), Mark>>,
    computed: &[ComputedBlock],
    st: &Styles,
) -> Result<(), XlsxError> {
    let empty = BTreeMap::new();
    let marks = marks.unwrap_or(&empty);
    let fmt_of = |pos: &(u32, u32)| -> Option<&Format> {
        marks.get(pos).map(|m| match m.severity {
            Some(s) => st.severity(s),
            None => &st.assumed,
        })
    };
    // Computed cells by row, headers first.
    let mut extra: BTreeMap<u32, Vec<ComputedCell<'_>>> = BTreeMap::new();
    for block in computed {
        for (i, c) in block.columns.iter().enumerate() {
            let col = (block.first_col + i as u32) as u16;
            ws.set_column_width(col, 13)?;
            let three = c
                .values
                .iter()
                .any(|(_, v)| matches!(v, Value::Num(_, true, _)));
            ws.set_column_format(col, if three { &st.n3 } else { &st.n2 })?;
            extra
                .entry(block.header_row)
                .or_default()
                .push((col, &c.header, Some(&st.header)));
            for (row, v) in &c.values {
                extra.entry(*row).or_default().push((col, v, None));
            }
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
    let last_row = sheet
        .end_row()
        .max(extra.keys().next_back().map_or(0, |r| r + 1))
        .max(marks.keys().next_back().map_or(0, |k| k.0 + 1));
    let first_col = sheet
        .values
        .start()
        .map_or(0, |s| s.1)
        .min(sheet.formulas.start().map_or(u32::MAX, |s| s.1));
    let end_col = sheet.end_col();
    for row in 0..last_row {
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
        for col in first_col..end_col {
            let c16 = col as u16;
            let fmt = fmt_of(&(row, col));
            let d = sheet.value(row, col);
            if let Some(formula) = sheet.formula(row, col) {
                let formula = Formula::new(formula).set_result(data_result(d));
                match fmt {
                    Some(f) => ws.write_formula_with_format(row, c16, formula, f)?,
                    None => ws.write_formula(row, c16, formula)?,
                };
                continue;
            }
            // Unmarked cells are written without a format: no per-cell format lookup.
            match (d, fmt) {
                (Data::Empty, None) => continue,
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
                    ws.write_string_with_format(row, c16, s, f.unwrap_or(&plain))?
                }
                (Data::Error(e), f) => ws.write_formula_with_format(
                    row,
                    c16,
                    Formula::new(error_formula(e)).set_result(e.to_string()),
                    f.unwrap_or(&plain),
                )?,
            };
        }
        for (col, v, header_fmt) in extra.get(&row).into_iter().flatten() {
            write_value(ws, row, *col, v, *header_fmt)?;
        }
        while let Some(&(&(r, col), m)) = marks_iter.peek() {
            if r != row {
                break;
            }
            if col >= end_col || col < first_col {
                ws.write_blank(r, col as u16, fmt_of(&(r, col)).unwrap_or(&st.assumed))?;
            }
            if notes_left > 0 {
                notes_left -= 1;
                let text: String = m.note.join("\n");
                ws.insert_note(
                    r,
                    col as u16,
                    &Note::new(truncate(&text, 2000))
                        .set_author("lossledger")
                        .add_author_prefix(false),
                )?;
            }
            marks_iter.next();
        }
    }
    Ok(())
}

/// Cell notes written per sheet at most; beyond this the cells are still filled by severity and
/// every finding is listed in Findings (a note per cell makes huge registers slow to open).
pub const MAX_NOTES_PER_SHEET: usize = 10_000;

/// A computed cell: numbers take their column's format (set once per column), headers theirs.
fn write_value(
    ws: &mut Worksheet,
    row: u32,
    col: u16,
    v: &Value,
    header: Option<&Format>,
) -> Result<(), XlsxError> {
    match (v, header) {
        (Value::Num(x, _, factor), _) if x.is_finite() => {
            ws.write_number(row, col, x * factor)?;
        }
        (Value::Num(..), _) => {}
        (Value::Text(t), Some(f)) => {
            ws.write_string_with_format(row, col, t, f)?;
        }
        (Value::Text(t), None) => {
            ws.write_string(row, col, t)?;
        }
    }
    Ok(())
}

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

/// One computed column: header and a value per source row.
struct Computed {
    header: &'static str,
    values: Vec<(u32, Value)>,
}

/// A computed cell placed in a row: column, value, and the header format for header cells.
type ComputedCell<'a> = (u16, &'a Value, Option<&'a Format>);

/// One computed column ready to write: header text (in the report's units) and values.
struct ComputedColumn {
    header: Value,
    values: Vec<(u32, Value)>,
}

/// The computed columns appended to one table's sheet.
struct ComputedBlock {
    header_row: u32,
    first_col: u32,
    columns: Vec<ComputedColumn>,
}

/// A computed cell: a number (with "three decimals" flag and the unit factor) or text.
enum Value {
    Num(f64, bool, f64),
    Text(String),
}

fn computed_columns(
    input: &Input,
    audit: &Audit,
    layout: &Layout,
    units: UnitSystem,
) -> ComputedBlock {
    let table = layout.table;
    let grid = &input.sheets[layout.sheet_index];
    let first = grid.end_col() + 1;
    let num = |v: f64| Value::Num(v, false, 1.0);
    let num3 = |v: f64| Value::Num(v, true, 1.0);
    let cols: Vec<Computed> = match table {
        TableKind::Pipes => {
            let runs: Vec<_> = audit
                .runs
                .iter()
                .filter(|r| r.cell.sheet == layout.sheet)
                .collect();
            let c = |header, f: &dyn Fn(&crate::audit::RunResult) -> Value| Computed {
                header,
                values: runs.iter().map(|r| (r.row, f(r))).collect(),
            };
            vec![
                c("Bore [mm]", &|r| num(r.inner_diameter_m * 1e3)),
                c("Bore from", &|r| Value::Text(r.bore_basis.clone())),
                c("Roughness [mm]", &|r| num3(r.roughness_m * 1e3)),
                c("Velocity [m/s]", &|r| num(r.velocity_m_s)),
                c("Reynolds", &|r| Value::Num(r.reynolds.round(), false, 1.0)),
                c("Friction factor", &|r| {
                    Value::Num(r.friction_factor, true, 1.0)
                }),
                c("Regime", &|r| {
                    Value::Text(format!("{:?}", r.regime).to_lowercase())
                }),
                c("Friction head [m]", &|r| num3(r.head_m)),
                c("Friction loss [kPa]", &|r| num3(r.dp_pa / 1e3)),
                c(
                    "Gradient [m/100 m]",
                    &|r| num(r.head_m / r.length_m * 100.0),
                ),
            ]
        }
        TableKind::Fittings => {
            let fs: Vec<_> = audit
                .fittings
                .iter()
                .filter(|f| f.cell.sheet == layout.sheet)
                .collect();
            let c = |header, f: &dyn Fn(&crate::audit::FittingResult) -> Value| Computed {
                header,
                values: fs.iter().map(|x| (x.row, f(x))).collect(),
            };
            vec![
                c("Kind", &|f| Value::Text(f.kind.to_string())),
                c("Model", &|f| Value::Text(f.model.to_string())),
                c("K", &|f| num3(f.k)),
                c("K low", &|f| num3(f.k_low)),
                c("K high", &|f| num3(f.k_high)),
                c("K refers to bore [mm]", &|f| {
                    num(f.reference_diameter_m * 1e3)
                }),
                c("Velocity [m/s]", &|f| num(f.velocity_m_s)),
                c("Head [m]", &|f| num3(f.head_m)),
                c("Head low [m]", &|f| num3(f.head_low_m)),
                c("Head high [m]", &|f| num3(f.head_high_m)),
                c("Loss [kPa]", &|f| num3(f.dp_pa / 1e3)),
                c("Source", &|f| Value::Text(f.source.to_string())),
                c("Rank", &|f| {
                    Value::Num(f.rank.map_or(f64::NAN, |r| r as f64), false, 1.0)
                }),
                c("Annual energy [kWh]", &|f| {
                    num(f.annual_energy_kwh.unwrap_or(f64::NAN))
                }),
                c("Annual cost", &|f| num(f.annual_cost.unwrap_or(f64::NAN))),
                c("Suggestion (estimate)", &|f| {
                    Value::Text(
                        f.suggestion
                            .as_ref()
                            .map(|s| s.replace_with.clone())
                            .unwrap_or_default(),
                    )
                }),
            ]
        }
        TableKind::Lines => {
            let here =
                |l: &crate::audit::LineResult| l.sheet.as_deref() == Some(layout.sheet.as_str());
            let ls: Vec<_> = audit
                .lines
                .iter()
                .filter(|l| here(l))
                .filter_map(|l| l.row.map(|r| (r, l)))
                .collect();
            let c = |header, f: &dyn Fn(&crate::audit::LineResult) -> Value| Computed {
                header,
                values: ls.iter().map(|(r, l)| (*r, f(l))).collect(),
            };
            vec![
                c("Length [m]", &|l| num(l.length_m)),
                c("Friction head [m]", &|l| num3(l.friction_head_m)),
                c("Fittings head [m]", &|l| num3(l.fittings_head_m)),
                c("Total head [m]", &|l| num3(l.total_head_m)),
                c("Total low [m]", &|l| num3(l.total_head_low_m)),
                c("Total high [m]", &|l| num3(l.total_head_high_m)),
                c("Total loss [kPa]", &|l| num3(l.total_dp_pa / 1e3)),
                c("Max velocity [m/s]", &|l| num(l.max_velocity_m_s)),
                c("Density [kg/m3]", &|l| num(l.density_kg_m3)),
                c("Power lost [W]", &|l| {
                    num(l.power_loss_w.unwrap_or(f64::NAN))
                }),
                c("Efficiency used", &|l| {
                    num3(l.efficiency.unwrap_or(f64::NAN))
                }),
                c("Hours per year used", &|l| {
                    num(l.hours_per_year.unwrap_or(f64::NAN))
                }),
                c("Annual energy [kWh]", &|l| {
                    num(l.annual_energy_kwh.unwrap_or(f64::NAN))
                }),
                c("Annual cost", &|l| num(l.annual_cost.unwrap_or(f64::NAN))),
            ]
        }
        _ => Vec::new(),
    };
    let columns = cols
        .into_iter()
        .map(|c| {
            let (header, factor) = header_in(c.header, units);
            let values = c
                .values
                .into_iter()
                .map(|(r, v)| match v {
                    Value::Num(x, three, f) => (r, Value::Num(x, three, f * factor)),
                    text => (r, text),
                })
                .collect();
            ComputedColumn {
                header: Value::Text(header),
                values,
            }
        })
        .collect();
    ComputedBlock {
        header_row: layout.header_row,
        first_col: first,
        columns,
    }
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
    for (label, value) in [
        ("Lines audited", audit.lines.len().to_string()),
        ("Pipe runs", audit.runs.len().to_string()),
        ("Fittings", audit.fittings.len().to_string()),
        ("Sum of line losses [m]", format!("{total:.3}")),
        (
            "Findings (error / warning / info)",
            format!(
                "{} / {} / {}",
                audit.count(Severity::Error),
                audit.count(Severity::Warning),
                audit.count(Severity::Info)
            ),
        ),
    ] {
        ws.write_string_with_format(r, 0, label, &st.bold)?;
        ws.write_string(r, 2, value)?;
        r += 1;
    }
    r = super::ranking::write_summary_block(ws, audit, r)?;
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

fn write_findings(ws: &mut Worksheet, audit: &Audit, st: &Styles) -> Result<(), XlsxError> {
    ws.set_landscape().set_print_fit_to_pages(1, 0);
    let headers = [
        "Severity", "Code", "Line", "Tag", "Cell", "Message", "Action",
    ];
    let n = audit.findings.len() as u32;
    for (i, f) in audit.findings.iter().enumerate() {
        let r = i as u32 + 1;
        ws.write_string_with_format(r, 0, f.severity.label(), st.severity(f.severity))?;
        ws.write_string(r, 1, f.code)?;
        ws.write_string(r, 2, f.line.as_deref().unwrap_or(""))?;
        ws.write_string(r, 3, f.tag.as_deref().unwrap_or(""))?;
        match &f.cell {
            Some(c) => {
                let target = format!("internal:{}!{}", quote_sheet(&c.sheet), c.a1());
                ws.write_url_with_text(r, 4, rust_xlsxwriter::Url::new(target), c.to_string())?;
                ws.set_cell_format(r, 4, &st.link)?;
            }
            None => {
                ws.write_string(r, 4, "")?;
            }
        }
        ws.write_string(r, 5, truncate(&f.message, MAX_CELL_CHARS))?;
        ws.write_string(r, 6, truncate(&f.action, MAX_CELL_CHARS))?;
    }
    let columns: Vec<TableColumn> = headers
        .iter()
        .map(|h| TableColumn::new().set_header(*h))
        .collect();
    let table = Table::new().set_columns(&columns).set_name("Findings");
    ws.add_table(0, 0, n.max(1), headers.len() as u16 - 1, &table)?;
    for (c, w) in [10, 18, 12, 12, 14, 80, 60].into_iter().enumerate() {
        ws.set_column_width(c as u16, w)?;
    }
    ws.set_freeze_panes(1, 0)?;
    Ok(())
}

fn write_basis(
    ws: &mut Worksheet,
    input: &Input,
    audit: &Audit,
    st: &Styles,
) -> Result<(), XlsxError> {
    let mut r = 0u32;
    let mut line = |ws: &mut Worksheet, a: &str, b: &str, bold: bool| -> Result<(), XlsxError> {
        let a = truncate(a, MAX_CELL_CHARS);
        if bold {
            ws.write_string_with_format(r, 0, a, &st.bold)?;
        } else {
            ws.write_string(r, 0, a)?;
        }
        if !b.is_empty() {
            ws.write_string(r, 1, truncate(b, MAX_CELL_CHARS))?;
        }
        r += 1;
        Ok(())
    };
    line(ws, "Basis of this audit", "", true)?;
    line(
        ws,
        "Tool",
        &format!("lossledger {}", env!("CARGO_PKG_VERSION")),
        false,
    )?;
    line(ws, "Input file", &input.file, false)?;
    line(ws, "Input SHA-256", &input.sha256, false)?;
    line(ws, "Caution", super::CAUTION, false)?;
    line(
        ws,
        "Caution on savings",
        crate::audit::energy::SAVINGS_CAUTION,
        false,
    )?;
    line(ws, "", "", false)?;
    line(ws, "Fluid properties used", "", true)?;
    for f in &audit.fluids {
        line(
            ws,
            &format!("{} at {:.2} °C", f.fluid, f.temperature_c),
            &format!(
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
            false,
        )?;
    }
    line(ws, "", "", false)?;
    line(ws, "Methods", "", true)?;
    for (a, b) in [
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
            "NPSH",
            "NPSHa = (p_source − p_vapour)/(ρg) + suction level − suction losses; p_source defaults to the ISO 2533 standard atmosphere at the rules' site elevation; margin rule max(ratio × NPSHr, NPSHr + minimum) (common practice, no source).",
        ),
    ] {
        line(ws, a, b, false)?;
    }
    line(ws, "", "", false)?;
    line(ws, "Fitting kinds used", "", true)?;
    for id in &audit.kinds_used {
        if let Some(k) = fitting::find_kind(id) {
            line(ws, id, &format!("{} — {}", k.model_name(), k.source), false)?;
        }
    }
    line(ws, "", "", false)?;
    line(
        ws,
        "Rules in force (common practice for water unless your rules file says otherwise)",
        "",
        true,
    )?;
    let rules = toml::to_string(&audit.rules).unwrap_or_default();
    for l in rules.lines().filter(|l| !l.trim().is_empty()) {
        line(ws, "", l, false)?;
    }
    line(ws, "", "", false)?;
    line(ws, "Parse report", "", true)?;
    if st.units == UnitSystem::Us {
        line(
            ws,
            "Units shown",
            "computed columns and Summary in US customary units (ft, in, US gpm, psi, ft/s, ft of head); JSON output stays SI",
            false,
        )?;
    }
    for src in &input.sources {
        line(
            ws,
            "file read",
            &format!(
                "{} (SHA-256 {}): sheets {}",
                src.file,
                src.sha256,
                src.sheets.join(", ")
            ),
            false,
        )?;
    }
    for l in &input.layouts {
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
        let rows = if l.header_rows > 1 {
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
        line(
            ws,
            &format!("{} (sheet '{}')", l.table.sheet_name(), l.sheet),
            &format!("{rows}{units_row}{above}; {}", mapping.join(", ")),
            false,
        )?;
        if !l.unknown.is_empty() {
            let kept: Vec<&str> = l.unknown.iter().map(|(_, h)| h.as_str()).collect();
            line(ws, "", &format!("kept as is: {}", kept.join(", ")), false)?;
        }
    }
    for ((sheet, what), n) in input.assumed_by_sheet() {
        line(
            ws,
            &format!("assumed on {sheet}"),
            &format!("{what}: {n} row(s)"),
            false,
        )?;
    }
    for (l, keys) in input.assumed_by_line() {
        let parts: Vec<String> = keys.iter().map(|(k, n)| format!("{k} ×{n}")).collect();
        line(
            ws,
            &format!("assumed on line {l}"),
            &parts.join(", "),
            false,
        )?;
    }
    let conv = &input.report.conversions;
    if !conv.is_empty() {
        line(
            ws,
            "text read as numbers",
            &format!("{} cell(s)", conv.len()),
            false,
        )?;
        for c in conv.iter().take(500) {
            let unit = c
                .unit
                .as_deref()
                .map(|u| format!(" {u}"))
                .unwrap_or_default();
            line(
                ws,
                "",
                &format!("{}: '{}' → {}{unit}", c.cell, c.text, c.value),
                false,
            )?;
        }
    }
    for sk in &input.report.skipped {
        line(
            ws,
            "row skipped",
            &format!("{}: {}", sk.cell, sk.reason),
            false,
        )?;
    }
    for (sheet, n) in &input.report.blank_rows {
        line(
            ws,
            "blank rows",
            &format!("{sheet}: {n} blank row(s) inside the table skipped"),
            false,
        )?;
    }
    for d in &audit.notes {
        line(ws, d.severity.label(), &d.to_string(), false)?;
    }
    ws.set_column_width(0, 34)?;
    ws.set_column_width(1, 120)?;
    Ok(())
}
