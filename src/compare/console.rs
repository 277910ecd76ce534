//! Console summary of a comparison: counts, the lines with the largest head change, the systems,
//! the changes that make things worse. Tables use the console's layout
//! ([`crate::report::text_table`]), fitted to the terminal's width.

use super::effects::{Pair, Status, Verdicts};
use super::{Comparison, fields};
use crate::error::Severity;
use crate::report::console::fitted_text;
use crate::report::text_table::{Align, TextTable, console_width};
use crate::units::UnitSystem;

/// Lines listed on the console at most (the largest total-head changes).
pub const CONSOLE_LINES: usize = 10;

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

/// A table from headers with their alignment and rows of text.
fn table(columns: &[(String, Align)], rows: Vec<Vec<String>>) -> TextTable {
    let cols: Vec<(&str, Align)> = columns.iter().map(|(h, a)| (h.as_str(), *a)).collect();
    let mut t = TextTable::new(&cols);
    for r in rows {
        t.row(r);
    }
    t
}

/// The lines with the largest total-head change (changed, added and removed lines only).
pub fn lines_table(c: &Comparison, units: UnitSystem) -> TextTable {
    use Align::{Left, Right};
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
    table(
        &[
            ("Line".into(), Left),
            ("Status".into(), Left),
            (format!("Total head [{m}]"), Right),
            (format!("Change [{m}]"), Right),
            ("Change".into(), Right),
            ("Share".into(), Right),
            (format!("Max v [{v}]"), Right),
            ("Input changes".into(), Right),
        ],
        rows,
    )
}

/// Every system: required head and margin old → new, the verdicts.
pub fn systems_table(c: &Comparison, units: UnitSystem) -> TextTable {
    use Align::{Left, Right};
    let (m, fm) = head_unit(units);
    let rows = c
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
        .collect();
    table(
        &[
            ("System".into(), Left),
            (format!("Required head [{m}]"), Right),
            (format!("Pump head [{m}]"), Right),
            (format!("Margin [{m}]"), Right),
            ("Duty".into(), Left),
            ("NPSH".into(), Left),
        ],
        rows,
    )
}

/// Changes listed on the console at most (warnings and errors only).
pub const CONSOLE_CHANGES: usize = 10;

/// The changes at warning or error: verdicts that got worse, findings that appeared.
pub fn worse_table(c: &Comparison, units: UnitSystem) -> TextTable {
    use Align::Left;
    let show = |ch: &super::Change, v: &Option<super::Value>| match (v, ch.shown) {
        (None, _) => "—".to_string(),
        (Some(v), Some(f)) => f.show(v, units),
        (Some(v), None) => fields::LINE.show(v, units),
    };
    let rows = c
        .changes
        .iter()
        .filter(|ch| ch.severity >= Severity::Warning)
        .take(CONSOLE_CHANGES)
        .map(|ch| {
            let cell = ch.new_cell.as_ref().or(ch.old_cell.as_ref());
            let item = match &ch.line {
                Some(l) => format!("{l}: {}", ch.item),
                None => ch.item.clone(),
            };
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
        .collect();
    table(
        &[
            ("Severity".into(), Left),
            ("Change".into(), Left),
            ("Item".into(), Left),
            ("Cell".into(), Left),
            ("Old → new".into(), Left),
        ],
        rows,
    )
    .keyed_by(2)
}

/// The whole console summary, fitted to the terminal's width.
pub fn summary(c: &Comparison, units: UnitSystem) -> String {
    summary_fitted(c, units, console_width())
}

/// The console summary with no line wider than `width` (`None`: tables at their natural width).
pub fn summary_fitted(c: &Comparison, units: UnitSystem, width: Option<usize>) -> String {
    let text = |t: &str| fitted_text(t, width);
    let mut out = text(&format!(
        "Compared {} (old) with {} (new)",
        c.old.file, c.new.file
    ));
    if let Some(note) = &c.invented_data_note {
        out.push_str(&text(note));
    }
    if c.unchanged() {
        out.push_str(&text(
            "No changes: the same lines, runs, fittings, findings and system results.",
        ));
        return out;
    }
    let lines = lines_table(c, units);
    if !lines.is_empty() {
        out.push_str(&lines.render(width));
        out.push('\n');
        let moved = c
            .lines
            .iter()
            .filter(|l| l.status != Status::Unchanged)
            .count();
        if moved > CONSOLE_LINES {
            out.push_str(&text(&format!(
                "The {CONSOLE_LINES} of {moved} changed lines with the largest head change; all are in the Line effects sheet."
            )));
        }
    }
    if !c.systems.is_empty() {
        out.push_str(&systems_table(c, units).render(width));
        out.push('\n');
    }
    let worse = worse_table(c, units);
    if !worse.is_empty() {
        out.push_str(&worse.render(width));
        out.push('\n');
    }
    let cost = &c.energy.annual_cost;
    if cost.moved() {
        out.push_str(&text(&format!(
            "Annual loss cost: {} → {} {} ({})",
            fig(cost.old, 1.0, 0),
            fig(cost.new, 1.0, 0),
            c.energy.currency,
            signed(cost.change, 1.0, 0)
        )));
    }
    if c.matching.fittings_by_line_kind_size > 0 {
        out.push_str(&text(&format!(
            "{} fitting pair(s) had no unique tag and were matched by line, kind and size.",
            c.matching.fittings_by_line_kind_size
        )));
    }
    out.push_str(&text(&format!(
        "Changes: {} error, {} warning, {} info",
        c.count(Severity::Error),
        c.count(Severity::Warning),
        c.count(Severity::Info)
    )));
    out.push_str(&text(CAUTION_LINE));
    out
}

/// The caution under every comparison summary (the full text is in the Basis sheet and JSON).
pub const CAUTION_LINE: &str = "Screening estimate: confirm pump, NPSH and pressure decisions against site measurement, manufacturer data, local codes and licensed engineering practice.";
