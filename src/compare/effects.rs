//! What the changes do: line heads, velocities and loss cost old → new, findings that appeared
//! or disappeared, and each system's required head and verdicts.

use serde::Serialize;
use std::collections::HashMap;

use super::changes::{Change, ChangeKind};
use super::fields::{self as fd, Value};
use super::matching::Matching;
use crate::audit::Finding;
use crate::audit::system::SystemResult;
use crate::error::{CellRef, Severity};
use crate::ingest::TableKind;
use crate::pipeline::Audited;

/// A figure on both sides.
#[derive(Clone, Copy, Debug, Default, PartialEq, Serialize)]
pub struct Pair {
    /// Old value (None when the item or figure is only on the new side).
    pub old: Option<f64>,
    /// New value.
    pub new: Option<f64>,
    /// `new − old`, a missing side counted as 0 (an added line adds its whole head); None when
    /// neither side has the figure.
    pub change: Option<f64>,
    /// `change / old`, when old is given and not 0.
    pub change_ratio: Option<f64>,
}

impl Pair {
    /// The pair of two optional figures.
    pub fn of(old: Option<f64>, new: Option<f64>) -> Pair {
        let change =
            (old.is_some() || new.is_some()).then(|| new.unwrap_or(0.0) - old.unwrap_or(0.0));
        let change_ratio = match (old, change) {
            (Some(o), Some(c)) if o != 0.0 => Some(c / o),
            _ => None,
        };
        Pair {
            old,
            new,
            change,
            change_ratio,
        }
    }

    /// True when the figure moved (beyond [`super::fields::SAME_VALUE_REL`]), appeared or
    /// disappeared.
    pub fn moved(&self) -> bool {
        match (self.old, self.new) {
            (Some(a), Some(b)) => !super::fields::same_number(a, b),
            (a, b) => a != b,
        }
    }
}

/// Whether an item is on both sides and differs.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Status {
    /// Only in the new revision.
    Added,
    /// Only in the old revision.
    Removed,
    /// On both, with a change in the input or a figure.
    Changed,
    /// On both, the same.
    Unchanged,
}

impl Status {
    /// Lower-case label.
    pub fn label(self) -> &'static str {
        match self {
            Status::Added => "added",
            Status::Removed => "removed",
            Status::Changed => "changed",
            Status::Unchanged => "unchanged",
        }
    }

    fn of(old: bool, new: bool, moved: bool) -> Status {
        match (old, new) {
            (false, _) => Status::Added,
            (_, false) => Status::Removed,
            _ if moved => Status::Changed,
            _ => Status::Unchanged,
        }
    }
}

/// One line's effect.
#[derive(Clone, Debug, Serialize)]
pub struct LineEffect {
    /// Line id.
    pub line: String,
    /// Added, removed, changed or unchanged.
    pub status: Status,
    /// Friction head, m.
    pub friction_head_m: Pair,
    /// Fittings head, m.
    pub fittings_head_m: Pair,
    /// Total head, m.
    pub total_head_m: Pair,
    /// This line's share of all lines' total-head changes (by size, `|Δ| / Σ|Δ|`).
    pub share_of_changes: Option<f64>,
    /// Highest run velocity, m/s.
    pub max_velocity_m_s: Pair,
    /// Annual loss cost in the rules' currency (None on gravity lines).
    pub annual_cost: Pair,
    /// Input changes on the line (the line's fields, its runs and fittings).
    pub input_changes: usize,
    /// Findings on the line that appeared.
    pub findings_appeared: usize,
    /// Findings on the line that disappeared.
    pub findings_disappeared: usize,
    /// The line's row in the new input (None for a removed line).
    #[serde(skip)]
    pub cell: Option<CellRef>,
}

/// A system check's outcome.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Verdict {
    /// The check holds.
    Holds,
    /// Not checked (a pump head or NPSH figure missing).
    NotChecked,
    /// The check fails.
    Fails,
}

impl Verdict {
    /// Lower-case label.
    pub fn label(self) -> &'static str {
        match self {
            Verdict::Holds => "holds",
            Verdict::NotChecked => "not checked",
            Verdict::Fails => "fails",
        }
    }

    /// The duty verdict: pump head at duty flow against required head.
    pub fn duty(s: &SystemResult) -> Verdict {
        match (s.pump_head_m, s.fails_duty) {
            (None, _) => Verdict::NotChecked,
            (_, true) => Verdict::Fails,
            _ => Verdict::Holds,
        }
    }

    /// The NPSH verdict: available against required plus the margin rule.
    pub fn npsh(s: &SystemResult) -> Verdict {
        match (s.npsh_available_m, s.npsh_required_m, s.fails_npsh) {
            (None, _, _) | (_, None, _) => Verdict::NotChecked,
            (_, _, true) => Verdict::Fails,
            _ => Verdict::Holds,
        }
    }
}

/// A verdict on both sides (None where the system is absent).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
pub struct Verdicts {
    /// Old verdict.
    pub old: Option<Verdict>,
    /// New verdict.
    pub new: Option<Verdict>,
}

/// One system's effect.
#[derive(Clone, Debug, Serialize)]
pub struct SystemEffect {
    /// System id.
    pub system: String,
    /// Added, removed, changed or unchanged.
    pub status: Status,
    /// Required head (static plus losses), m.
    pub required_head_m: Pair,
    /// Pump head at duty flow, m.
    pub pump_head_m: Pair,
    /// Pump head minus required head, m.
    pub margin_m: Pair,
    /// Duty verdict, old → new.
    pub duty: Verdicts,
    /// NPSH available, m.
    pub npsh_available_m: Pair,
    /// NPSH required, m.
    pub npsh_required_m: Pair,
    /// NPSH verdict, old → new.
    pub npsh: Verdicts,
    /// True when either verdict got worse (to `fails`, or from `holds` to `not checked`).
    pub worse: bool,
    /// The system's row in the new input (None for a removed system).
    #[serde(skip)]
    pub cell: Option<CellRef>,
}

type FindingKey = (
    &'static str,
    Option<(String, u32)>,
    Option<String>,
    Option<String>,
);

fn finding_key(f: &Finding, rows: Option<&super::matching::RowMap>) -> FindingKey {
    let at = f.cell.as_ref().map(|c| {
        let here = (c.sheet.clone(), c.row);
        match rows {
            None => here,
            // An old cell whose row matches no new row cannot meet a new finding.
            Some(rows) => rows
                .get(&here)
                .cloned()
                .unwrap_or_else(|| (format!("\u{0}{}", c.sheet), c.row)),
        }
    });
    (f.code, at, f.line.clone(), f.tag.clone())
}

/// Findings raised on one side only, matched by code, the item's row (followed across through
/// the matching), line and tag.
pub fn finding_changes(old: &Audited, new: &Audited, m: &Matching) -> Vec<Change> {
    let mut pool: HashMap<FindingKey, Vec<usize>> = HashMap::new();
    for (i, f) in old.audit.findings.iter().enumerate().rev() {
        pool.entry(finding_key(f, Some(&m.rows)))
            .or_default()
            .push(i);
    }
    let mut out = Vec::new();
    for f in &new.audit.findings {
        if pool
            .get_mut(&finding_key(f, None))
            .and_then(Vec::pop)
            .is_none()
        {
            out.push(finding_change(f, true));
        }
    }
    let mut gone: Vec<usize> = pool.into_values().flatten().collect();
    gone.sort_unstable();
    out.extend(
        gone.into_iter()
            .map(|i| finding_change(&old.audit.findings[i], false)),
    );
    out
}

fn finding_change(f: &Finding, appeared: bool) -> Change {
    // In SI whatever `--units` says: the text is compared between revisions (docs/compare.md).
    let message = Some(Value::Text(format!("{}: {}", f.severity, f.message)));
    let item = match &f.tag {
        Some(t) => format!("{} ({t})", f.code),
        None => f.code.to_string(),
    };
    Change {
        severity: if appeared { f.severity } else { Severity::Info },
        kind: if appeared {
            ChangeKind::FindingAppeared
        } else {
            ChangeKind::FindingDisappeared
        },
        line: f.line.clone(),
        item,
        field: None,
        old: if appeared { None } else { message.clone() },
        new: if appeared { message } else { None },
        old_cell: if appeared { None } else { f.cell.clone() },
        new_cell: if appeared { f.cell.clone() } else { None },
        note: f.action.clone(),
        shown: None,
    }
}

fn system_cell(a: &Audited, id: &str, column: &str) -> Option<CellRef> {
    let row = a.input.systems.iter().find(|s| s.system == id)?;
    let sheet = &row.origin.sheet;
    Some(CellRef::new(
        sheet,
        row.origin.row,
        a.input.column_of(TableKind::Systems, sheet, column),
    ))
}

/// Every system of either side, old → new.
pub fn systems(old: &Audited, new: &Audited, m: &Matching) -> Vec<SystemEffect> {
    m.systems
        .iter()
        .filter_map(|&(o, n)| {
            let so = o.map(|i| &old.audit.systems[i]);
            let sn = n.map(|i| &new.audit.systems[i]);
            let id = sn.or(so)?.system.clone();
            let pair =
                |f: fn(&SystemResult) -> Option<f64>| Pair::of(so.and_then(f), sn.and_then(f));
            let duty = Verdicts {
                old: so.map(Verdict::duty),
                new: sn.map(Verdict::duty),
            };
            let npsh = Verdicts {
                old: so.map(Verdict::npsh),
                new: sn.map(Verdict::npsh),
            };
            let required_head_m = pair(|s| Some(s.required_head_m));
            let pump_head_m = pair(|s| s.pump_head_m);
            let margin_m = pair(|s| s.margin_m);
            let npsh_available_m = pair(|s| s.npsh_available_m);
            let npsh_required_m = pair(|s| s.npsh_required_m);
            let moved = [
                required_head_m,
                pump_head_m,
                margin_m,
                npsh_available_m,
                npsh_required_m,
            ]
            .iter()
            .any(Pair::moved)
                || duty.old != duty.new
                || npsh.old != npsh.new;
            let cell = sn.and_then(|_| system_cell(new, &id, "system"));
            Some(SystemEffect {
                status: Status::of(so.is_some(), sn.is_some(), moved),
                worse: worse(duty).is_some() || worse(npsh).is_some(),
                system: id,
                required_head_m,
                pump_head_m,
                margin_m,
                duty,
                npsh_available_m,
                npsh_required_m,
                npsh,
                cell,
            })
        })
        .collect()
}

/// The severity of a verdict change that makes things worse: `error` to `fails`, `warning` from
/// `holds` to `not checked`. A system only on the new side counts as `not checked` before.
fn worse(v: Verdicts) -> Option<Severity> {
    let old = v.old.unwrap_or(Verdict::NotChecked);
    match v.new? {
        Verdict::Fails if old != Verdict::Fails => Some(Severity::Error),
        Verdict::NotChecked if old == Verdict::Holds => Some(Severity::Warning),
        _ => None,
    }
}

/// One change per verdict that changed (a system only on the new side: per verdict that fails).
pub fn verdict_changes(systems: &[SystemEffect], old: &Audited, new: &Audited) -> Vec<Change> {
    let mut out = Vec::new();
    for s in systems.iter().filter(|s| s.status != Status::Removed) {
        for (field, v) in [(fd::DUTY, s.duty), (fd::NPSH, s.npsh)] {
            let first = v.old.is_none();
            if v.old == v.new || (first && v.new != Some(Verdict::Fails)) {
                continue;
            }
            let text = |x: Option<Verdict>| x.map(|x| Value::Text(x.label().to_string()));
            out.push(Change {
                severity: worse(v).unwrap_or(Severity::Info),
                kind: ChangeKind::VerdictChanged,
                line: None,
                item: s.system.clone(),
                field: Some(field.key),
                old: text(v.old),
                new: text(v.new),
                old_cell: system_cell(old, &s.system, field.column),
                new_cell: system_cell(new, &s.system, field.column),
                note: verdict_note(s, field.key),
                shown: Some(field),
            });
        }
    }
    out
}

fn verdict_note(s: &SystemEffect, key: &str) -> String {
    let m = |x: Option<f64>| x.map_or("—".to_string(), |x| format!("{x:.3} m"));
    if key == fd::DUTY.key {
        format!(
            "required head {} → {}, pump head {} → {}, margin {} → {}",
            m(s.required_head_m.old),
            m(s.required_head_m.new),
            m(s.pump_head_m.old),
            m(s.pump_head_m.new),
            m(s.margin_m.old),
            m(s.margin_m.new)
        )
    } else {
        format!(
            "NPSH available {} → {}, required {} → {}",
            m(s.npsh_available_m.old),
            m(s.npsh_available_m.new),
            m(s.npsh_required_m.old),
            m(s.npsh_required_m.new)
        )
    }
}

fn line_cell(a: &Audited, i: usize) -> Option<CellRef> {
    let l = &a.audit.lines[i];
    match (&l.sheet, l.row) {
        (Some(s), Some(r)) => Some(CellRef::new(
            s,
            r,
            a.input.column_of(TableKind::Lines, s, "line"),
        )),
        _ => l.runs.first().map(|&r| a.audit.runs[r].cell.clone()),
    }
}

/// Per line: input changes (the line, its runs and fittings), findings appeared, disappeared.
fn per_line(changes: &[Change]) -> HashMap<&str, [usize; 3]> {
    use ChangeKind::*;
    let mut out: HashMap<&str, [usize; 3]> = HashMap::new();
    for c in changes {
        let slot = match c.kind {
            LineChanged | RunAdded | RunRemoved | RunChanged | FittingAdded | FittingRemoved
            | FittingChanged => 0,
            FindingAppeared => 1,
            FindingDisappeared => 2,
            _ => continue,
        };
        if let Some(line) = c.line.as_deref() {
            out.entry(line).or_default()[slot] += 1;
        }
    }
    out
}

/// Every line of either side, largest total-head change first (ties in the new side's order).
pub fn lines(old: &Audited, new: &Audited, m: &Matching, changes: &[Change]) -> Vec<LineEffect> {
    let counts = per_line(changes);
    let mut out: Vec<LineEffect> = m
        .lines
        .iter()
        .filter_map(|&(o, n)| {
            let lo = o.map(|i| &old.audit.lines[i]);
            let ln = n.map(|i| &new.audit.lines[i]);
            let id = ln.or(lo)?.line.clone();
            let pair = |f: fn(&crate::audit::LineResult) -> Option<f64>| {
                Pair::of(lo.and_then(f), ln.and_then(f))
            };
            let [input_changes, findings_appeared, findings_disappeared] =
                counts.get(id.as_str()).copied().unwrap_or_default();
            let e = LineEffect {
                friction_head_m: pair(|l| Some(l.friction_head_m)),
                fittings_head_m: pair(|l| Some(l.fittings_head_m)),
                total_head_m: pair(|l| Some(l.total_head_m)),
                share_of_changes: None,
                max_velocity_m_s: pair(|l| Some(l.max_velocity_m_s)),
                annual_cost: pair(|l| l.annual_cost),
                input_changes,
                findings_appeared,
                findings_disappeared,
                cell: n.and_then(|n| line_cell(new, n)),
                status: Status::Unchanged,
                line: id,
            };
            let moved = input_changes + findings_appeared + findings_disappeared > 0
                || [
                    e.friction_head_m,
                    e.fittings_head_m,
                    e.total_head_m,
                    e.max_velocity_m_s,
                    e.annual_cost,
                ]
                .iter()
                .any(Pair::moved);
            Some(LineEffect {
                status: Status::of(lo.is_some(), ln.is_some(), moved),
                ..e
            })
        })
        .collect();
    // Changes within rounding (the same value reached by another unit path) count as none.
    let size = |e: &LineEffect| match e.total_head_m.moved() {
        true => e.total_head_m.change.unwrap_or(0.0).abs(),
        false => 0.0,
    };
    let sum: f64 = out.iter().map(size).sum();
    for e in &mut out {
        e.share_of_changes = (sum > 0.0).then(|| size(e) / sum);
    }
    // Stable: ties keep the new side's order.
    out.sort_by(|a, b| size(b).total_cmp(&size(a)));
    out
}

/// Register totals of the annual loss cost and energy.
pub fn energy_totals(old: &Audited, new: &Audited) -> super::EnergyTotals {
    let (o, n) = (&old.audit.energy, &new.audit.energy);
    super::EnergyTotals {
        currency: n.currency.clone(),
        annual_cost: Pair::of(Some(o.total_annual_cost), Some(n.total_annual_cost)),
        annual_energy_kwh: Pair::of(
            Some(o.total_annual_energy_kwh),
            Some(n.total_annual_energy_kwh),
        ),
    }
}

#[cfg(test)]
mod tests {
    use super::{Pair, Verdict, Verdicts, worse};
    use crate::error::Severity;

    #[test]
    fn an_added_figure_changes_by_its_whole_value() {
        let p = Pair::of(None, Some(2.5));
        assert_eq!((p.change, p.change_ratio), (Some(2.5), None));
        let q = Pair::of(Some(2.0), Some(2.5));
        assert_eq!((q.change, q.change_ratio), (Some(0.5), Some(0.25)));
        assert_eq!(Pair::of(None, None).change, None);
    }

    #[test]
    fn only_verdicts_that_get_worse_have_a_severity() {
        use Verdict::*;
        let v = |old, new| Verdicts { old, new };
        assert_eq!(worse(v(Some(Holds), Some(Fails))), Some(Severity::Error));
        assert_eq!(
            worse(v(Some(NotChecked), Some(Fails))),
            Some(Severity::Error)
        );
        assert_eq!(worse(v(None, Some(Fails))), Some(Severity::Error));
        assert_eq!(
            worse(v(Some(Holds), Some(NotChecked))),
            Some(Severity::Warning)
        );
        assert_eq!(worse(v(Some(Fails), Some(Holds))), None);
        assert_eq!(worse(v(Some(Fails), Some(Fails))), None);
        assert_eq!(worse(v(Some(Holds), None)), None);
    }
}
