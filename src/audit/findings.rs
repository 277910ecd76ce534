//! Findings: what the rules flag, each with a stable code, the cell, the numbers and an action.

use serde::Serialize;

use super::lines::Placements;
use super::{Audit, LineResult, Rules, RunResult};
use crate::error::{CellRef, Severity};
use crate::ingest::{FittingRow, Input, Service, TableKind};
use crate::physics::friction::Regime;
use crate::sentence::{Sentence, fig};

/// One flagged item.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Finding {
    /// How serious.
    pub severity: Severity,
    /// Stable kebab-case code.
    pub code: &'static str,
    /// Line id, when the finding concerns a line.
    pub line: Option<String>,
    /// Fitting tag, when it concerns a fitting.
    pub tag: Option<String>,
    /// The input cell it is about.
    pub cell: Option<CellRef>,
    /// What was found, with the numbers (rendered in the reader's units).
    pub message: Sentence,
    /// What to do.
    pub action: String,
}

/// Every finding code the tool can raise, with its meaning (for docs and the Basis sheet).
pub const CODES: &[(&str, &str)] = &[
    (
        "velocity-high",
        "a run's mean velocity is above its service's band",
    ),
    (
        "velocity-low",
        "a run's mean velocity is below its service's band",
    ),
    (
        "steep-gradient",
        "a run loses more head per 100 m than the gradient rule allows",
    ),
    (
        "high-loss-fitting",
        "one item takes too large a share of its line's loss, or its K is high",
    ),
    (
        "transition-regime",
        "a run's Reynolds number lies between laminar and turbulent (2000–4000)",
    ),
    (
        "size-mismatch",
        "a fitting's size matches no run of its line",
    ),
    (
        "size-inferred",
        "a fitting with no size on a line of several bores was placed by its kind or the list order",
    ),
    (
        "valve-closed",
        "a valve is 0 % open on a line that carries flow",
    ),
    ("zero-flow", "a line's flow is zero, so it has no losses"),
    (
        "same-size-reducer",
        "a reducer, expansion or contraction has equal inlet and outlet sizes",
    ),
    (
        "throttled-valve",
        "a valve on a pumped line is open less than the valve rule allows: it burns pump energy",
    ),
    (
        "pump-head-short",
        "a system's pump head at duty flow is below the head the system requires",
    ),
    (
        "static-head-missing",
        "a system has no static head given (Static head, or Elevation change on its lines): taken as 0",
    ),
    (
        "npsh-margin",
        "NPSH available (suction losses at the high end of their K band) falls short of NPSH required plus the margin rule, at duty or at the operating point",
    ),
    (
        "suction-layout",
        "the schedule shows an elbow or reducer at the pump suction, or a suction bore smaller than the next run",
    ),
    (
        "low-wire-to-water",
        "a system's measured wire-to-water efficiency (meter readings or a test point) is below the station rule",
    ),
    (
        "loss-share-high",
        "a system's piping losses take more than the station rule's share of its required head",
    ),
    (
        "measured-vs-computed",
        "a system's test head and the computed system head at the test flow differ by more than the station rule's tolerance",
    ),
    (
        "outside-preferred-region",
        "a system's duty or operating flow is outside the preferred operating region of its pump curve (70–120 % of best-efficiency flow, ANSI/HI 9.6.3)",
    ),
];

/// Add a finding about a line (and optionally a fitting tag) at a cell.
#[allow(clippy::too_many_arguments)]
pub(crate) fn push(
    found: &mut Vec<Finding>,
    severity: Severity,
    code: &'static str,
    line: &str,
    tag: Option<&str>,
    cell: CellRef,
    message: impl Into<Sentence>,
    action: &str,
) {
    found.push(Finding {
        severity,
        code,
        line: Some(line.to_string()),
        tag: tag.filter(|t| !t.is_empty()).map(str::to_string),
        cell: Some(cell),
        message: message.into(),
        action: action.to_string(),
    });
}

/// Raise the rule findings and sort all findings (worst first, then by cell).
pub fn apply(input: &Input, rules: &Rules, audit: &mut Audit) {
    let mut found = Vec::new();
    for line in &audit.lines {
        if line.flow_m3_s == 0.0 {
            zero_flow(input, audit, line, &mut found);
            continue;
        }
        for &i in &line.runs {
            run_findings(input, rules, line, &audit.runs[i], &mut found);
        }
    }
    same_size_area_changes(input, &mut found);
    high_loss_fittings(rules, audit, &mut found);
    audit.findings.extend(found);
    sort(&mut audit.findings);
}

/// `zero-flow`: a line that carries no flow (at its Lines flow cell, else its first run).
fn zero_flow(input: &Input, audit: &Audit, line: &LineResult, found: &mut Vec<Finding>) {
    let cell = match (&line.sheet, line.row) {
        (Some(sheet), Some(r)) => {
            CellRef::new(sheet, r, input.column_of(TableKind::Lines, sheet, "flow"))
        }
        _ => audit.runs[line.runs[0]].cell.clone(),
    };
    push(
        found,
        Severity::Info,
        "zero-flow",
        &line.line,
        None,
        cell,
        format!("line {} carries no flow: no losses computed", line.line),
        "check the line's duty flow",
    );
}

/// The rule findings of one run of `line`, at the run's size cell: velocity above or below the
/// service's band, a friction gradient past the limit, a Reynolds number in the transition band.
fn run_findings(
    input: &Input,
    rules: &Rules,
    line: &LineResult,
    run: &RunResult,
    found: &mut Vec<Finding>,
) {
    let size_col = input
        .layout_on(TableKind::Pipes, &run.cell.sheet)
        .and_then(|l| l.column("size").or(l.column("inner_diameter")))
        .map_or(0, |c| c.col);
    let cell = CellRef::new(&run.cell.sheet, run.row, size_col);
    let band = rules.band(line.service);
    let v = run.velocity_m_s;
    if let Some(max) = band.max_m_s
        && v > max
    {
        push(
            found,
            Severity::Warning,
            "velocity-high",
            &line.line,
            None,
            cell.clone(),
            format!(
                "velocity {} is above the {} limit of {}",
                fig(v, "m/s", 2),
                line.service.id(),
                fig(max, "m/s", 2)
            ),
            "consider a larger bore or a lower flow; check erosion, noise and surge",
        );
    }
    if let Some(min) = band.min_m_s
        && v < min
    {
        push(
            found,
            Severity::Warning,
            "velocity-low",
            &line.line,
            None,
            cell.clone(),
            format!(
                "velocity {} is below the {} minimum of {}",
                fig(v, "m/s", 2),
                line.service.id(),
                fig(min, "m/s", 2)
            ),
            if line.service == Service::Gravity {
                "check self-cleansing: solids may settle"
            } else {
                "the line may be oversized; check air clearing and sediment"
            },
        );
    }
    let gradient = run.head_m / run.length_m * 100.0;
    if gradient > rules.gradient.max_m_per_100m {
        push(
            found,
            Severity::Warning,
            "steep-gradient",
            &line.line,
            None,
            cell.clone(),
            format!(
                "friction loss {} exceeds {}",
                fig(gradient, "m per 100 m", 2),
                fig(rules.gradient.max_m_per_100m, "m per 100 m", 2)
            ),
            "a larger bore or smoother pipe would cut the loss and the pumping energy",
        );
    }
    if run.regime == Regime::Transition {
        push(
            found,
            Severity::Info,
            "transition-regime",
            &line.line,
            None,
            cell,
            format!(
                "Reynolds number {:.0} is in the transition band 2000–4000: friction factor interpolated",
                run.reynolds
            ),
            "results here are less certain; confirm by measurement if the line matters",
        );
    }
}

/// `same-size-reducer`: an area change whose inlet and outlet sizes are equal changes nothing,
/// most likely a typo.
fn same_size_area_changes(input: &Input, found: &mut Vec<Finding>) {
    for f in input.fittings.iter().filter(|f| f.kind.changes_area()) {
        let key = |s: &Option<crate::ingest::parse::SizeSpec>| {
            s.as_ref().and_then(super::lines::size_key)
        };
        if key(&f.size).is_some() && key(&f.size) == key(&f.size_out) {
            let c = input.column_of(TableKind::Fittings, &f.origin.sheet, "size_out");
            push(
                found,
                Severity::Warning,
                "same-size-reducer",
                &f.line,
                Some(&f.tag),
                CellRef::new(&f.origin.sheet, f.origin.row, c),
                format!(
                    "{} ({}) has the same inlet and outlet size: no area change, K 0",
                    super::lines::fitting_label(f),
                    f.kind.id
                ),
                "correct Size or Size out, or remove the item",
            );
        }
    }
}

/// `high-loss-fitting`: an item taking more than the rules' share of its line's loss, or with a
/// K above the rules' limit.
fn high_loss_fittings(rules: &Rules, audit: &Audit, found: &mut Vec<Finding>) {
    let lines = &audit.lines;
    for f in &audit.fittings {
        let Some(line) = audit.line_of(&f.line).map(|i| &lines[i]) else {
            continue;
        };
        let share = if line.total_head_m > 0.0 {
            f.head_m / line.total_head_m
        } else {
            0.0
        };
        let share_hit = share > rules.fitting.max_share;
        let k_hit = f.k > rules.fitting.max_k;
        if share_hit || k_hit {
            let mut why = Vec::new();
            if share_hit {
                why.push(format!(
                    "takes {:.0} % of line {}'s loss (limit {:.0} %)",
                    share * 100.0,
                    f.line,
                    rules.fitting.max_share * 100.0
                ));
            }
            if k_hit {
                why.push(format!("K {:.2} is above {:.2}", f.k, rules.fitting.max_k));
            }
            push(
                found,
                Severity::Warning,
                "high-loss-fitting",
                &f.line,
                Some(&f.tag),
                f.cell.clone(),
                format!(
                    "{} ({}): head {}; {}",
                    f.item,
                    f.kind,
                    fig(f.head_m, "m", 3),
                    why.join("; ")
                ),
                "check the item's type and position; a lower-loss alternative may pay back",
            );
        }
    }
}

/// Order findings worst first, then by cell, then by code.
pub fn sort(findings: &mut [Finding]) {
    findings.sort_by(|a, b| {
        b.severity
            .cmp(&a.severity)
            .then_with(|| a.cell.cmp(&b.cell))
            .then(a.code.cmp(b.code))
    });
}

/// Raise the placement findings the line computation gathered: fittings whose size matches no
/// run ([`size_mismatch`]), fittings placed by their kind or the list order
/// ([`size_inferred`]), closed valves ([`closed_valve`]), in that order.
pub fn placement(input: &Input, audit: &mut Audit, placements: &Placements) {
    for &(fi, run) in &placements.mismatched {
        size_mismatch(input, audit, &input.fittings[fi], run);
    }
    for (fi, run, why) in &placements.inferred {
        size_inferred(input, audit, &input.fittings[*fi], *run, why);
    }
    for &fi in &placements.closed {
        closed_valve(input, audit, &input.fittings[fi]);
    }
}

/// A fitting whose size matches no run of its line.
pub fn size_mismatch(input: &Input, audit: &mut Audit, f: &FittingRow, run: usize) {
    let c = input.column_of(TableKind::Fittings, &f.origin.sheet, "size");
    let cell = CellRef::new(&f.origin.sheet, f.origin.row, c);
    let run_cell = audit.runs[run].cell.clone();
    push(
        &mut audit.findings,
        Severity::Warning,
        "size-mismatch",
        &f.line,
        Some(&f.tag),
        cell,
        format!(
            "{}: its size matches no run of line {}; its bore is looked up for its own size with \
             the material and schedule of the run at {run_cell} (that run's bore when none is found)",
            super::lines::fitting_label(f),
            f.line
        ),
        "correct the fitting's size or the line's runs",
    );
}

/// A fitting with no size on a line of several bores, placed by its kind or the list order.
pub fn size_inferred(input: &Input, audit: &mut Audit, f: &FittingRow, run: usize, why: &str) {
    let c = input.column_of(TableKind::Fittings, &f.origin.sheet, "size");
    let cell = CellRef::new(&f.origin.sheet, f.origin.row, c);
    let r = &audit.runs[run];
    push(
        &mut audit.findings,
        Severity::Warning,
        "size-inferred",
        &f.line,
        Some(&f.tag),
        cell,
        format!(
            "{} has no size and line {} has runs of several bores; computed on the run at {} \
             (bore {:.1} mm): {why}",
            super::lines::fitting_label(f),
            f.line,
            r.cell,
            r.inner_diameter_m * 1e3
        ),
        "write the fitting's size to confirm",
    );
}

/// A closed valve on a line that carries flow.
pub fn closed_valve(input: &Input, audit: &mut Audit, f: &FittingRow) {
    let c = input.column_of(TableKind::Fittings, &f.origin.sheet, "opening");
    let cell = CellRef::new(&f.origin.sheet, f.origin.row, c);
    push(
        &mut audit.findings,
        Severity::Error,
        "valve-closed",
        &f.line,
        Some(&f.tag),
        cell,
        format!(
            "{} is 0 % open but line {} is given a flow: its loss is unbounded and is left out of the totals",
            super::lines::fitting_label(f),
            f.line
        ),
        "correct the valve position or the line's flow",
    );
}
