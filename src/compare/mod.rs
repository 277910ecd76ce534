//! Compare two revisions of a takeoff: what changed in the input, and what it does to the losses,
//! the findings and the pumps.
//!
//! Both sides are read and audited exactly as `lossledger audit` does
//! ([`crate::pipeline::read_and_audit`]); [`compare`] then matches their items
//! ([`matching`]), lists the input changes ([`changes`]) and the effects on every line and system
//! ([`effects`]). [`workbook`], [`console`] and [`Comparison::to_json`] present the result.
//! How items are matched, and the choices made, are in `docs/compare.md`.
//!
//! # Example
//! ```no_run
//! use lossledger::{compare, pipeline};
//! use lossledger::ingest::{InputSource, ReadOptions};
//! use lossledger::audit::Rules;
//!
//! let read = |p: &str| {
//!     let sources = [InputSource::Path(p.into())];
//!     pipeline::read_and_audit(&sources, &ReadOptions::default(), &Rules::default())
//! };
//! let (old, new) = (read("rev-a.xlsx")?, read("rev-b.xlsx")?);
//! let c = compare::compare(&old, &new);
//! println!("{} change(s)", c.changes.len());
//! # Ok::<(), pipeline::AuditError>(())
//! ```

pub mod changes;
pub mod console;
pub mod effects;
pub mod fields;
pub mod files;
pub mod matching;
pub mod workbook;

use serde::Serialize;

use crate::error::Severity;
use crate::pipeline::Audited;
pub use changes::{Change, ChangeKind};
pub use effects::{LineEffect, Pair, Status, SystemEffect, Verdict, Verdicts};
pub use fields::Value;

/// Which revision a figure or a problem belongs to.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Side {
    /// The earlier revision (first argument).
    Old,
    /// The later revision (second argument).
    New,
}

impl Side {
    /// `old` or `new`.
    pub fn label(self) -> &'static str {
        match self {
            Side::Old => "old",
            Side::New => "new",
        }
    }
}

/// One side's file and hash.
#[derive(Clone, Debug, Serialize)]
pub struct SideRef {
    /// File name as given.
    pub file: String,
    /// SHA-256 of the input, hex.
    pub sha256: String,
}

/// Annual loss cost of the whole register on both sides (pumped lines only).
#[derive(Clone, Debug, Serialize)]
pub struct EnergyTotals {
    /// Currency label of the rules.
    pub currency: String,
    /// Annual loss cost, old → new, with the change.
    pub annual_cost: Pair,
    /// Annual loss energy, kWh, old → new.
    pub annual_energy_kwh: Pair,
}

/// The complete comparison of two revisions.
#[derive(Clone, Debug, Serialize)]
pub struct Comparison {
    /// Tool version.
    pub lossledger: &'static str,
    /// The earlier revision.
    pub old: SideRef,
    /// The later revision.
    pub new: SideRef,
    /// Every change, one per row: input changes, findings that appeared or disappeared, verdicts
    /// that changed.
    pub changes: Vec<Change>,
    /// Every line of either side, largest total-head change first.
    pub lines: Vec<LineEffect>,
    /// Every system of either side, in the new side's order, then removed ones.
    pub systems: Vec<SystemEffect>,
    /// Register totals of the annual loss cost.
    pub energy: EnergyTotals,
    /// How items were matched.
    pub matching: matching::Summary,
    /// When either side marks its data as invented, the label every output carries.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub invented_data_note: Option<String>,
    /// The caution that applies to every figure.
    pub caution: &'static str,
}

impl Comparison {
    /// True when nothing differs: no input change, no finding or verdict change, and no line or
    /// system figure moved.
    pub fn unchanged(&self) -> bool {
        self.changes.is_empty()
            && self
                .lines
                .iter()
                .all(|l| l.status == effects::Status::Unchanged)
            && self
                .systems
                .iter()
                .all(|s| s.status == effects::Status::Unchanged)
    }

    /// Number of changes of a severity.
    pub fn count(&self, severity: Severity) -> usize {
        self.changes
            .iter()
            .filter(|c| c.severity == severity)
            .count()
    }

    /// The worst severity among the changes.
    pub fn worst(&self) -> Option<Severity> {
        self.changes.iter().map(|c| c.severity).max()
    }

    /// The comparison as pretty JSON (SI field names, like the audit's JSON).
    ///
    /// # Errors
    /// Only if serialisation fails (it does not on finite figures).
    pub fn to_json(&self) -> serde_json::Result<String> {
        serde_json::to_string_pretty(self)
    }
}

/// Compare two audited revisions.
pub fn compare(old: &Audited, new: &Audited) -> Comparison {
    let m = matching::match_sides(old, new);
    let mut changes = changes::input_changes(old, new, &m);
    let systems = effects::systems(old, new, &m);
    changes.extend(effects::verdict_changes(&systems, old, new));
    changes.extend(effects::finding_changes(old, new, &m));
    // Worst first; within a severity in the order found: input changes line by line, then
    // system verdicts, then findings.
    changes.sort_by_key(|c| std::cmp::Reverse(c.severity));
    let lines = effects::lines(old, new, &m, &changes);
    Comparison {
        lossledger: env!("CARGO_PKG_VERSION"),
        old: side_ref(old),
        new: side_ref(new),
        energy: effects::energy_totals(old, new),
        changes,
        lines,
        systems,
        matching: m.summary(),
        invented_data_note: invented_note(old, new),
        caution: crate::report::CAUTION,
    }
}

/// The invented-data label of the first side that carries the mark, naming the side.
fn invented_note(old: &Audited, new: &Audited) -> Option<String> {
    use crate::report::invented::{label, marker};
    [(Side::Old, old), (Side::New, new)]
        .into_iter()
        .find_map(|(side, a)| {
            marker(&a.input).map(|c| format!("{} side: {}", side.label(), label(&c)))
        })
}

fn side_ref(a: &Audited) -> SideRef {
    SideRef {
        file: a.input.file.clone(),
        sha256: a.input.sha256.clone(),
    }
}
