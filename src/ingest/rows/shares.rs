//! Shared lines: which systems each line belongs to, and each system's `Share` of the flow of a
//! line it shares with other systems (a common header).
//!
//! A system's lines are its Systems row's `Lines` cell, else the lines whose `System` column
//! names it (input order, pump-suction lines first). A line listed by two or more systems is
//! shared. The `Share` cell of a Systems row gives the system's share of its shared lines'
//! flow: one fraction or percentage for all of them (`0.6`, `60 %`), or per line
//! (`H1: 60 %, H2: 0.5`). Without shares a line is split by the systems' duty flows
//! (`docs/energy.md` §4a).

use std::collections::HashSet;

use super::cells::{Cells, format_number};
use super::{Service, SystemRow};
use crate::error::{CellRef, Diagnostic, Severity};
use crate::ingest::Input;
use crate::ingest::schema::TableKind;

/// Shares of one line that sum to within this of 1 are accepted (and scaled to sum to 1), so
/// that whole percentages three ways (33 + 33 + 33 %) pass; a larger gap is an error.
pub const SHARE_SUM_TOLERANCE: f64 = 0.01;

/// One entry of a Systems `Share` cell.
#[derive(Clone, Debug, PartialEq)]
pub struct Share {
    /// The line it is for (None: every line the system shares with another system).
    pub line: Option<String>,
    /// The system's share of that line's flow, 0 to 1.
    pub share: f64,
}

/// A system as the audit takes it: its id, its ordered lines and its Systems row, if any.
#[derive(Clone, Debug)]
pub struct Membership<'a> {
    /// System id.
    pub system: String,
    /// Line ids in order, suction side first.
    pub lines: Vec<String>,
    /// The Systems row (None for a system named only in the `System` column of Lines).
    pub row: Option<&'a SystemRow>,
}

/// The systems of the input: Systems rows (the first row of an id), then the ids only the
/// `System` column of Lines names.
pub fn memberships(input: &Input) -> Vec<Membership<'_>> {
    let from_lines = |id: &str| -> Vec<String> {
        let mut ls: Vec<&super::LineRow> = input
            .lines
            .iter()
            .filter(|l| l.system.as_deref() == Some(id))
            .collect();
        ls.sort_by_key(|l| l.service != Service::PumpSuction);
        ls.into_iter().map(|l| l.line.clone()).collect()
    };
    let mut out: Vec<Membership<'_>> = Vec::new();
    for row in &input.systems {
        if out.iter().any(|m| m.system == row.system) {
            continue;
        }
        let lines = if row.lines.is_empty() {
            from_lines(&row.system)
        } else {
            row.lines.clone()
        };
        out.push(Membership {
            system: row.system.clone(),
            lines,
            row: Some(row),
        });
    }
    for l in &input.lines {
        if let Some(id) = &l.system
            && !out.iter().any(|m| m.system == *id)
        {
            out.push(Membership {
                system: id.clone(),
                lines: from_lines(id),
                row: None,
            });
        }
    }
    out
}

/// Each line listed by some system, with the indices (into `members`) of the systems listing
/// it, in order of first listing.
pub fn systems_of_lines(members: &[Membership<'_>]) -> Vec<(String, Vec<usize>)> {
    let mut out: Vec<(String, Vec<usize>)> = Vec::new();
    for (mi, m) in members.iter().enumerate() {
        for l in &m.lines {
            match out.iter_mut().find(|(id, _)| id == l) {
                Some((_, sys)) if !sys.contains(&mi) => sys.push(mi),
                Some(_) => {}
                None => out.push((l.clone(), vec![mi])),
            }
        }
    }
    out
}

/// The share a Systems row gives for `line`: its entry naming the line, else its entry for all
/// shared lines when the line is `shared`.
pub fn share_of(row: Option<&SystemRow>, line: &str, shared: bool) -> Option<f64> {
    let shares = &row?.shares;
    shares
        .iter()
        .find(|s| s.line.as_deref() == Some(line))
        .or_else(|| shares.iter().find(|s| s.line.is_none() && shared))
        .map(|s| s.share)
}

const HINT: &str = "write the system's share of its shared lines' flow as a fraction or percentage (0.6 or 60 %), or per line as LINE: share (H1: 60 %, H2: 0.5), with a point for decimals";

/// Read a Systems `Share` cell; a malformed entry or a share outside 0 to 1 is an error at the
/// cell (and no share of the row is kept).
pub(super) fn read(c: &mut Cells<'_>) -> Vec<Share> {
    let Some(text) = c.text("share") else {
        return Vec::new();
    };
    let items: Vec<&str> = text
        .split([',', ';', '\n'])
        .map(str::trim)
        .filter(|s| !s.is_empty())
        .collect();
    let mut out = Vec::new();
    for item in &items {
        let (line, value) = match item.split_once([':', '=']) {
            Some((l, v)) => (Some(l.trim().to_string()), v.trim()),
            None => (None, *item),
        };
        let fault = match (&line, value_of(value)) {
            (Some(l), _) if l.is_empty() => Some(format!("share '{item}' names no line")),
            (None, _) if items.len() > 1 => Some(format!(
                "share '{item}' has no line id, in a list of {} shares",
                items.len()
            )),
            (_, None) => Some(format!("share '{value}' is not a number")),
            (_, Some(v)) if !(0.0..=1.0).contains(&v) => Some(format!(
                "share {} is outside 0 to 1 (0 to 100 %)",
                format_number(v)
            )),
            (_, Some(share)) => {
                out.push(Share { line, share });
                None
            }
        };
        if let Some(message) = fault {
            c.error("share", message, Some(HINT.into()));
            return Vec::new();
        }
    }
    out
}

/// A share value: a number, or a percentage with `%`.
fn value_of(text: &str) -> Option<f64> {
    let (number, scale) = match text.strip_suffix('%') {
        Some(n) => (n.trim(), 0.01),
        None => (text, 1.0),
    };
    number
        .parse::<f64>()
        .ok()
        .filter(|v| v.is_finite())
        .map(|v| v * scale)
}

/// What the cross-table share checks read.
struct Check<'a> {
    input: &'a Input,
    members: Vec<Membership<'a>>,
}

impl Check<'_> {
    /// The Share cell of a Systems row.
    fn cell(&self, row: &SystemRow) -> CellRef {
        let col = self
            .input
            .layout_on(TableKind::Systems, &row.origin.sheet)
            .and_then(|l| l.column("share"))
            .map_or(0, |c| c.col);
        CellRef::new(&row.origin.sheet, row.origin.row, col)
    }

    fn error(&self, row: &SystemRow, message: String, hint: String) -> Diagnostic {
        Diagnostic {
            severity: Severity::Error,
            file: self.input.file_of(&row.origin.sheet).to_string(),
            cell: Some(self.cell(row)),
            message,
            hint: Some(hint),
        }
    }

    /// Shares for a line the system does not list, or on a system sharing no line; the systems
    /// with such an error are added to `misplaced`.
    fn misplaced(&self, shared: &HashSet<&str>, misplaced: &mut HashSet<usize>) -> Vec<Diagnostic> {
        let mut out = Vec::new();
        for (mi, m) in self.members.iter().enumerate() {
            let Some(row) = m.row else { continue };
            let before = out.len();
            for s in &row.shares {
                match &s.line {
                    Some(l) if !m.lines.contains(l) => out.push(self.error(
                        row,
                        format!("share given for line {l}, which system {} does not list", m.system),
                        format!("list {l} in the system's Lines, or correct the line id"),
                    )),
                    None if !m.lines.iter().any(|l| shared.contains(l.as_str())) => out.push(self.error(
                        row,
                        format!("a share of {} is given, but system {} shares no line with another system", format_number(s.share), m.system),
                        "give a share only to systems that list a common line (a header), or name the line (H1: 0.6)".into(),
                    )),
                    _ => {}
                }
            }
            if out.len() > before {
                misplaced.insert(mi);
            }
        }
        out
    }

    /// A line given shares by some of its systems but not all, or whose shares do not sum to 1;
    /// the error goes to the last Share cell given for it.
    fn line(&self, line: &str, sys: &[usize]) -> Option<Diagnostic> {
        let given: Vec<(usize, Option<f64>)> = sys
            .iter()
            .map(|&mi| (mi, share_of(self.members[mi].row, line, sys.len() > 1)))
            .collect();
        let row = given
            .iter()
            .rev()
            .find_map(|(mi, s)| s.and(self.members[*mi].row))?;
        let names = |with: Option<bool>| -> String {
            let listed: Vec<String> = given
                .iter()
                .filter(|g| with.is_none_or(|w| g.1.is_some() == w))
                .map(|(mi, s)| match s {
                    Some(v) => format!("{} {}", self.members[*mi].system, format_number(*v)),
                    None => self.members[*mi].system.clone(),
                })
                .collect();
            listed.join(", ")
        };
        let sum: f64 = given.iter().filter_map(|g| g.1).sum();
        if given.iter().any(|g| g.1.is_none()) {
            return Some(self.error(
                row,
                format!(
                    "line {line} is shared by systems {}: a share is given for {} but not for {}",
                    names(None),
                    names(Some(true)),
                    names(Some(false))
                ),
                format!("give every system sharing {line} its share (summing to 1), or none to split it by the systems' duty flows"),
            ));
        }
        ((sum - 1.0).abs() > SHARE_SUM_TOLERANCE).then(|| {
            self.error(
                row,
                format!("shares of line {line} sum to {} ({}), not 1", format_number(sum), names(None)),
                format!("the systems sharing a line carry all of its flow between them: make the shares sum to 1 (within {SHARE_SUM_TOLERANCE})"),
            )
        })
    }
}

/// Checks across Systems and Lines: a share for a line its system does not list, a share on a
/// system that shares no line, and, for each line given shares, a system sharing it without one
/// or shares not summing to 1 (within [`SHARE_SUM_TOLERANCE`]). Errors at the `Share` cells;
/// a system whose Share cell is already wrong is not checked again (one cause, one error).
pub(super) fn check(input: &Input) -> Vec<Diagnostic> {
    let check = Check {
        input,
        members: memberships(input),
    };
    let by_line = systems_of_lines(&check.members);
    let shared: HashSet<&str> = by_line
        .iter()
        .filter(|(_, s)| s.len() > 1)
        .map(|(l, _)| l.as_str())
        .collect();
    let erred: HashSet<&CellRef> = input
        .diagnostics
        .iter()
        .filter(|d| d.severity == Severity::Error)
        .filter_map(|d| d.cell.as_ref())
        .collect();
    let mut misplaced = HashSet::new();
    let mut out = check.misplaced(&shared, &mut misplaced);
    for (line, sys) in &by_line {
        let wrong = |mi: &usize| {
            misplaced.contains(mi)
                || check.members[*mi]
                    .row
                    .is_some_and(|r| erred.contains(&check.cell(r)))
        };
        if !sys.iter().any(wrong) {
            out.extend(check.line(line, sys));
        }
    }
    out
}
