//! Console summary of a comparison: counts, the lines with the largest head change, the systems.
//!
//! Each table is built as plain header and rows of text and rendered by [`render`] in one place,
//! so the comparison can take up a shared table layout without touching the rows.

use comfy_table::{Table, presets::UTF8_FULL_CONDENSED};

use super::effects::{Pair, Status, Verdicts};
use super::{Comparison, fields};
use crate::error::Severity;
use crate::report::console::UnitSystem;

/// Lines listed on the console at most (the largest total-head changes).
pub const CONSOLE_LINES: usize = 10;

/// A table as header and rows of text.
pub struct TextTable {
    /// Column headers.
    pub header: Vec<String>,
    /// Rows, each as long as the header.
    pub rows: Vec<Vec<String>>,
}

/// Render a table for the terminal.
pub fn render(t: &TextTable) -> String {
    let mut out = Table::new();
    out.load_style(UTF8_FULL_CONDENSED);
    out.set_header(t.header.clone());
    for r in &t.rows {
        out.add_row(r.clone());
    }
    format!("{out}\n")
}

fn head_unit(units: UnitSystem) -> (String, f64) {
    fields::LENGTH.unit_in(units)
}

fn fig(x: Option<f64>, factor: f64, places: usize) -> String {
    x.map_or("—".to_string(), |x| format!("{:.*}", places, x * factor))
}

fn signed(x: Option<f64>, factor: f64, places: usize) -> String {
    x.map_or("—".to_string(), |x| format!("{:+.*}", places, x * factor))
}

fn arrow(p: &Pair, factor: f64, places: usize) -> String {
    format!(
        "{} → {}",
        fig(p.old, factor, places),
        fig(p.new, factor, places)
    )
}

fn verdicts(v: &Verdicts) -> String {
    let l = |x: Option<super::Verdict>| x.map_or("—", |x| x.label());
    if v.old == v.new {
        l(v.new).to_string()
    } else {
        format!("{} → {}", l(v.old), l(v.new))
    }
}

/// The lines with the largest total-head change (changed, added and removed lines only).
pub fn lines_table(c: &Comparison, units: UnitSystem) -> TextTable {
    let (m, fm) = head_unit(units);
    let (v, fv) = fields::Field {
        unit: "m/s",
        ..fields::LENGTH
    }
    .unit_in(units);
    let rows = c
        .lines
        .iter()
        .filter(|l| l.status != Status::Unchanged)
        .take(CONSOLE_LINES)
        .map(|l| {
            vec![
                l.line.clone(),
                l.status.label().to_string(),
                arrow(&l.total_head_m, fm, 3),
                signed(l.total_head_m.change, fm, 3),
                l.total_head_m
                    .change_ratio
                    .map_or("—".into(), |r| format!("{:+.1} %", r * 100.0)),
                l.share_of_changes
                    .map_or("—".into(), |s| format!("{:.1} %", s * 100.0)),
                arrow(&l.max_velocity_m_s, fv, 2),
                format!("{}", l.input_changes),
            ]
        })
        .collect();
    TextTable {
        header: vec![
            "Line".into(),
            "Status".into(),
            format!("Total head [{m}]"),
            format!("Change [{m}]"),
            "Change".into(),
            "Share".into(),
            format!("Max v [{v}]"),
            "Input changes".into(),
        ],
        rows,
    }
}

/// Every system: required head and margin old → new, the verdicts.
pub fn systems_table(c: &Comparison, units: UnitSystem) -> TextTable {
    let (m, fm) = head_unit(units);
    TextTable {
        header: vec![
            "System".into(),
            format!("Required head [{m}]"),
            format!("Pump head [{m}]"),
            format!("Margin [{m}]"),
            "Duty".into(),
            "NPSH".into(),
        ],
        rows: c
            .systems
            .iter()
            .map(|s| {
                vec![
                    s.system.clone(),
                    arrow(&s.required_head_m, fm, 3),
                    arrow(&s.pump_head_m, fm, 3),
                    arrow(&s.margin_m, fm, 3),
                    verdicts(&s.duty),
                    verdicts(&s.npsh),
                ]
            })
            .collect(),
    }
}

/// Changes listed on the console at most (warnings and errors only).
pub const CONSOLE_CHANGES: usize = 10;

/// The changes at warning or error: verdicts that got worse, findings that appeared.
pub fn worse_table(c: &Comparison, units: UnitSystem) -> TextTable {
    let show = |ch: &super::Change, v: &Option<super::Value>| match (v, ch.shown) {
        (None, _) => "—".to_string(),
        (Some(v), Some(f)) => f.show(v, units),
        (Some(v), None) => fields::LINE.show(v, units),
    };
    TextTable {
        header: vec![
            "Severity".into(),
            "Change".into(),
            "Item".into(),
            "Cell".into(),
            "Old → new".into(),
        ],
        rows: c
            .changes
            .iter()
            .filter(|ch| ch.severity >= Severity::Warning)
            .take(CONSOLE_CHANGES)
            .map(|ch| {
                let cell = ch.new_cell.as_ref().or(ch.old_cell.as_ref());
                let mut item = ch.item.clone();
                if let Some(l) = &ch.line {
                    item = format!("{l}: {item}");
                }
                let values = match ch.kind {
                    super::ChangeKind::FindingAppeared => "appeared".to_string(),
                    _ => format!("{} → {}", show(ch, &ch.old), show(ch, &ch.new)),
                };
                vec![
                    ch.severity.label().to_string(),
                    ch.kind.label().to_string(),
                    item,
                    cell.map_or(String::new(), |c| c.to_string()),
                    values,
                ]
            })
            .collect(),
    }
}

/// The whole console summary.
pub fn summary(c: &Comparison, units: UnitSystem) -> String {
    let mut out = format!("Compared {} (old) with {} (new)\n", c.old.file, c.new.file);
    if c.unchanged() {
        out.push_str("No changes: the same lines, runs, fittings, findings and system results.\n");
        return out;
    }
    let lines = lines_table(c, units);
    if !lines.rows.is_empty() {
        out.push_str(&render(&lines));
        let moved = c
            .lines
            .iter()
            .filter(|l| l.status != Status::Unchanged)
            .count();
        if moved > lines.rows.len() {
            out.push_str(&format!(
                "The {} of {moved} changed lines with the largest head change; all are in the Line effects sheet.\n",
                lines.rows.len()
            ));
        }
    }
    if !c.systems.is_empty() {
        out.push_str(&render(&systems_table(c, units)));
    }
    let worse = worse_table(c, units);
    if !worse.rows.is_empty() {
        out.push_str(&render(&worse));
    }
    let cost = &c.energy.annual_cost;
    if cost.moved() {
        out.push_str(&format!(
            "Annual loss cost: {} → {} {} ({})\n",
            fig(cost.old, 1.0, 0),
            fig(cost.new, 1.0, 0),
            c.energy.currency,
            signed(cost.change, 1.0, 0)
        ));
    }
    if c.matching.fittings_by_line_kind_size > 0 {
        out.push_str(&format!(
            "{} fitting pair(s) had no unique tag and were matched by line, kind and size.\n",
            c.matching.fittings_by_line_kind_size
        ));
    }
    out.push_str(&format!(
        "Changes: {} error, {} warning, {} info\n",
        c.count(Severity::Error),
        c.count(Severity::Warning),
        c.count(Severity::Info)
    ));
    out.push_str(CAUTION_LINE);
    out
}

/// The caution under every comparison summary (the full text is in the Basis sheet and JSON).
pub const CAUTION_LINE: &str = "Screening estimate: confirm pump, NPSH and pressure decisions against site measurement, manufacturer data, local codes and licensed engineering practice.\n";
