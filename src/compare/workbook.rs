//! The comparison workbook: `Changes`, `Line effects`, `Systems`, `Basis`, then a plain copy of
//! every sheet of the new input, so each change links to its cell.

use rust_xlsxwriter::{DocProperties, ExcelDateTime, Format, Workbook, Worksheet, XlsxError};
use std::collections::HashSet;

use super::effects::{LineEffect, Pair, SystemEffect, Verdict};
use super::{Change, Comparison, Value};
use crate::ingest::Input;
use crate::report::style::{MAX_CELL_CHARS, Styles, truncate};
use crate::report::table::{Cell, Col, col, write_table};
use crate::units::UnitSystem;

/// What the comparison workbook records about how it was made.
#[derive(Clone, Debug, Default)]
pub struct BasisNotes {
    /// The rules file, or None for the built-in rules.
    pub rules_file: Option<String>,
    /// The header map file, when one was used.
    pub map_file: Option<String>,
    /// Units of the computed figures.
    pub units: UnitSystem,
    /// The rules in force (the same for both sides).
    pub rules: crate::audit::Rules,
}

fn opt_text(s: &Option<String>) -> Cell<'_> {
    Cell::Text(s.as_deref().unwrap_or(""))
}

fn shown_value(c: &Change, v: &Option<Value>, units: UnitSystem) -> Cell<'static> {
    match (v, c.shown) {
        (None, _) => Cell::Text(""),
        (Some(Value::Number(x)), Some(f)) => Cell::Num(Some(x * f.unit_in(units).1)),
        (Some(Value::Number(x)), None) => Cell::Num(Some(*x)),
        (Some(Value::Text(t)), _) => Cell::Owned(t.clone()),
    }
}

/// A change with the units it is shown in.
struct Shown<'a> {
    change: &'a Change,
    units: UnitSystem,
}

fn change_cols<'a>() -> Vec<Col<Shown<'a>>> {
    vec![
        col("Severity", 10.0, |s| Cell::Severity(s.change.severity)),
        col("Change", 18.0, |s| Cell::Text(s.change.kind.label())),
        col("Line", 12.0, |s| opt_text(&s.change.line)),
        col("Item", 22.0, |s| Cell::Text(&s.change.item)),
        col("What", 22.0, |s| {
            Cell::Text(s.change.shown.map_or("", |f| f.label))
        }),
        col("Old", 16.0, |s| {
            shown_value(s.change, &s.change.old, s.units)
        }),
        col("New", 16.0, |s| {
            shown_value(s.change, &s.change.new, s.units)
        }),
        col("Unit", 9.0, |s| {
            Cell::Owned(
                s.change
                    .shown
                    .map_or(String::new(), |f| f.unit_in(s.units).0),
            )
        }),
        col("Cell (new input)", 18.0, |s| {
            Cell::Link(s.change.new_cell.as_ref(), String::new())
        }),
        col("Cell (old input)", 18.0, |s| {
            Cell::Owned(
                s.change
                    .old_cell
                    .as_ref()
                    .map_or(String::new(), |c| c.to_string()),
            )
        }),
        col("Note", 60.0, |s| Cell::Text(&s.change.note)),
    ]
}

fn old(p: &Pair) -> Cell<'static> {
    Cell::Num(p.old)
}
fn new(p: &Pair) -> Cell<'static> {
    Cell::Num(p.new)
}
fn change(p: &Pair) -> Cell<'static> {
    Cell::Num(p.change)
}

const LINE_COLS: &[Col<LineEffect>] = &[
    col("Line", 14.0, |l| {
        Cell::Link(l.cell.as_ref(), l.line.clone())
    }),
    col("Status", 11.0, |l| Cell::Text(l.status.label())),
    col("Total head old [m]", 13.0, |l| old(&l.total_head_m)),
    col("Total head new [m]", 13.0, |l| new(&l.total_head_m)),
    col("Total head change [m]", 13.0, |l| change(&l.total_head_m)),
    col("Change of old total", 12.0, |l| {
        Cell::Pct(l.total_head_m.change_ratio)
    }),
    col("Share of all changes", 12.0, |l| {
        Cell::Pct(l.share_of_changes)
    }),
    col("Friction old [m]", 12.0, |l| old(&l.friction_head_m)),
    col("Friction new [m]", 12.0, |l| new(&l.friction_head_m)),
    col("Friction change [m]", 12.0, |l| change(&l.friction_head_m)),
    col("Fittings old [m]", 12.0, |l| old(&l.fittings_head_m)),
    col("Fittings new [m]", 12.0, |l| new(&l.fittings_head_m)),
    col("Fittings change [m]", 12.0, |l| change(&l.fittings_head_m)),
    col("Max velocity old [m/s]", 12.0, |l| old(&l.max_velocity_m_s)),
    col("Max velocity new [m/s]", 12.0, |l| new(&l.max_velocity_m_s)),
    col("Annual loss cost old", 12.0, |l| old(&l.annual_cost)),
    col("Annual loss cost new", 12.0, |l| new(&l.annual_cost)),
    col("Annual loss cost change", 12.0, |l| change(&l.annual_cost)),
    col("Input changes", 10.0, |l| {
        Cell::Num(Some(l.input_changes as f64))
    }),
    col("Findings appeared", 10.0, |l| {
        Cell::Num(Some(l.findings_appeared as f64))
    }),
    col("Findings gone", 10.0, |l| {
        Cell::Num(Some(l.findings_disappeared as f64))
    }),
];

fn verdict(v: Option<Verdict>) -> Cell<'static> {
    Cell::Text(v.map_or("—", Verdict::label))
}

const SYSTEM_COLS: &[Col<SystemEffect>] = &[
    col("System", 14.0, |s| {
        Cell::Link(s.cell.as_ref(), s.system.clone())
    }),
    col("Status", 11.0, |s| Cell::Text(s.status.label())),
    col("Required head old [m]", 13.0, |s| old(&s.required_head_m)),
    col("Required head new [m]", 13.0, |s| new(&s.required_head_m)),
    col("Required head change [m]", 13.0, |s| {
        change(&s.required_head_m)
    }),
    col("Pump head old [m]", 12.0, |s| old(&s.pump_head_m)),
    col("Pump head new [m]", 12.0, |s| new(&s.pump_head_m)),
    col("Margin old [m]", 12.0, |s| old(&s.margin_m)),
    col("Margin new [m]", 12.0, |s| new(&s.margin_m)),
    col("Duty old", 11.0, |s| verdict(s.duty.old)),
    col("Duty new", 11.0, |s| verdict(s.duty.new)),
    col("NPSH available old [m]", 12.0, |s| old(&s.npsh_available_m)),
    col("NPSH available new [m]", 12.0, |s| new(&s.npsh_available_m)),
    col("NPSH required old [m]", 12.0, |s| old(&s.npsh_required_m)),
    col("NPSH required new [m]", 12.0, |s| new(&s.npsh_required_m)),
    col("NPSH old", 11.0, |s| verdict(s.npsh.old)),
    col("NPSH new", 11.0, |s| verdict(s.npsh.new)),
    col("Worse", 8.0, |s| {
        Cell::Text(if s.worse { "yes" } else { "" })
    }),
];

fn unique_name(wanted: &str, taken: &HashSet<String>) -> String {
    (1..)
        .map(|i| {
            if i == 1 {
                wanted.to_string()
            } else {
                format!("{wanted} ({i})")
            }
        })
        .find(|n| !taken.contains(&n.to_lowercase()))
        .unwrap_or_default()
}

/// Build the comparison workbook: the report sheets, then every sheet of the new input copied
/// cell for cell (values, formulas, merged ranges) so the links land on the new input's cells.
///
/// # Errors
/// What the workbook writer reports.
pub fn build(c: &Comparison, new: &Input, notes: &BasisNotes) -> Result<Workbook, XlsxError> {
    let mut wb = Workbook::new();
    // Fixed creation time: the same inputs give a byte-identical workbook.
    let created = ExcelDateTime::from_ymd(2000, 1, 1)?;
    wb.set_properties(
        &DocProperties::new()
            .set_creation_datetime(&created)
            .set_title("lossledger comparison")
            .set_comment("Screening estimate; see the Basis sheet"),
    );
    let mut st = Styles::new();
    st.units = notes.units;
    wb.register_format(&Format::new());
    for f in st.all() {
        wb.register_format(f);
    }
    let taken: HashSet<String> = new.sheets.iter().map(|s| s.name.to_lowercase()).collect();
    let named = |name: &str| -> Result<Worksheet, XlsxError> {
        let mut ws = Worksheet::new();
        ws.set_name(unique_name(name, &taken))?;
        Ok(ws)
    };
    let mut changes = named("Changes")?;
    let shown: Vec<Shown<'_>> = c
        .changes
        .iter()
        .map(|change| Shown {
            change,
            units: notes.units,
        })
        .collect();
    write_table(&mut changes, &change_cols(), &shown, &st, true)?;
    if c.changes.is_empty() {
        changes.write_string(1, 0, "No changes")?;
    }
    if let Some(note) = &c.invented_data_note {
        // Below the table, so the filter range stays the changes.
        let r = c.changes.len().max(1) as u32 + 2;
        changes.write_string_with_format(r, 0, note, &st.bold)?;
    }
    let mut lines = named("Line effects")?;
    write_table(&mut lines, LINE_COLS, &c.lines, &st, true)?;
    // The input's own Systems sheet keeps its name (the links point into it).
    let mut systems = named(if taken.contains("systems") {
        "System effects"
    } else {
        "Systems"
    })?;
    write_table(&mut systems, SYSTEM_COLS, &c.systems, &st, true)?;
    if c.systems.is_empty() {
        systems.write_string(1, 0, "No systems on either side")?;
    }
    let mut basis = named("Basis")?;
    write_basis(&mut basis, c, notes, &st)?;
    for ws in [changes, lines, systems, basis] {
        wb.push_worksheet(ws);
    }
    for sheet in &new.sheets {
        let mut ws = wb.new_worksheet_with_constant_memory()?;
        ws.set_name(&sheet.name)?;
        if sheet.hidden {
            ws.set_hidden(true);
        }
        crate::report::workbook::copy_plain(&mut ws, sheet, &st)?;
        wb.push_worksheet(ws);
    }
    Ok(wb)
}

/// What is matched how, in the words of the Basis sheet.
pub const MATCHING: &[(&str, &str)] = &[
    ("Lines", "by line id"),
    (
        "Pipe runs",
        "by line and Seq when every run of the line has a distinct Seq on both sides, else by position in input order",
    ),
    (
        "Fittings",
        "by tag when written once on each side; the rest by line, kind and size (the n-th such item with the n-th)",
    ),
    ("Systems", "by system id"),
    (
        "Findings",
        "by code, the row of the item they are about (followed across through the matching), line and tag",
    ),
];

fn write_basis(
    ws: &mut Worksheet,
    c: &Comparison,
    notes: &BasisNotes,
    st: &Styles,
) -> Result<(), XlsxError> {
    let mut rows: Vec<(String, String, bool)> = Vec::new();
    let mut push = |a: &str, b: &str| rows.push((a.to_string(), b.to_string(), false));
    if let Some(note) = &c.invented_data_note {
        push("Invented data", note);
    }
    push("Tool", &format!("lossledger {}", c.lossledger));
    push("Old input", &c.old.file);
    push("Old input SHA-256", &c.old.sha256);
    push("New input", &c.new.file);
    push("New input SHA-256", &c.new.sha256);
    push(
        "Rules",
        notes
            .rules_file
            .as_deref()
            .unwrap_or("built-in defaults (lossledger rules)"),
    );
    push("Header map", notes.map_file.as_deref().unwrap_or("none"));
    push(
        "Units",
        if notes.units == UnitSystem::Us {
            "US customary (JSON stays SI)"
        } else {
            "SI"
        },
    );
    push("Caution", crate::report::CAUTION);
    push("Caution on savings", crate::audit::energy::SAVINGS_CAUTION);
    push("", "");
    rows.push(("How items are matched".into(), String::new(), true));
    for (what, how) in MATCHING {
        rows.push((what.to_string(), how.to_string(), false));
    }
    let m = &c.matching;
    rows.push((
        "Lines on both sides".into(),
        m.lines_matched.to_string(),
        false,
    ));
    rows.push((
        "Fitting pairs matched by tag".into(),
        m.fittings_by_tag.to_string(),
        false,
    ));
    rows.push((
        "Fitting pairs matched by line, kind and size".into(),
        m.fittings_by_line_kind_size.to_string(),
        false,
    ));
    rows.push((
        "Lines whose runs were matched by position".into(),
        if m.runs_by_position.is_empty() {
            "none".into()
        } else {
            m.runs_by_position.join(", ")
        },
        false,
    ));
    rows.push((String::new(), String::new(), false));
    rows.push(("Rules in force (both sides)".into(), String::new(), true));
    for (k, v) in crate::report::rules_in_force(&notes.rules) {
        rows.push((k, v, false));
    }
    rows.push((String::new(), String::new(), false));
    rows.push((
        "Links".into(),
        "Cells in Changes link to the copy of the new input's sheets in this workbook; removed items name their cell in the old input.".into(),
        false,
    ));
    for (r, (a, b, bold)) in rows.iter().enumerate() {
        let r = r as u32;
        if *bold {
            ws.write_string_with_format(r, 0, a, &st.bold)?;
        } else {
            ws.write_string(r, 0, a)?;
        }
        if !b.is_empty() {
            ws.write_string(r, 1, truncate(b, MAX_CELL_CHARS))?;
        }
    }
    ws.set_column_width(0, 44)?;
    ws.set_column_width(1, 100)?;
    Ok(())
}
