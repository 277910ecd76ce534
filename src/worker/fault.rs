//! Fault injection, a test hook: `LOSSLEDGER_FAULT=PLACE:KIND` makes the process panic or fail an
//! allocation at one place, so tests can check through the binary that such a failure becomes
//! exit 3 with one line and nothing written (tests/no_abort.rs; DEVELOPERS.md).
//!
//! Places: `read` (the second reading thread, which parses the Fittings table), `audit` (the start
//! of the audit), `write` (the second writing thread, which copies the largest input sheet),
//! `save` (inside the staged temporary file, once it exists). Kinds: `panic`, `alloc` (calls
//! [`std::alloc::handle_alloc_error`], which aborts the process as a real allocation failure does).

use std::sync::OnceLock;

/// The environment variable naming the fault to inject.
pub const FAULT_ENV: &str = "LOSSLEDGER_FAULT";

/// Where a fault can be injected.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Place {
    /// The second reading thread (`ingest::rows::read_all`).
    Read,
    /// The start of `audit::run`.
    Audit,
    /// The second writing thread (`report::workbook::prepare`).
    Write,
    /// Inside a staged temporary file (`report::stage_with`), after it was created.
    Save,
}

impl Place {
    fn word(self) -> &'static str {
        match self {
            Place::Read => "read",
            Place::Audit => "audit",
            Place::Write => "write",
            Place::Save => "save",
        }
    }
}

/// The fault asked for: its place and whether it is an allocation failure (else a panic).
fn wanted() -> Option<(String, bool)> {
    static WANTED: OnceLock<Option<(String, bool)>> = OnceLock::new();
    WANTED
        .get_or_init(|| {
            let v = std::env::var(FAULT_ENV).ok()?;
            let (place, kind) = v.split_once(':')?;
            match kind {
                "panic" => Some((place.to_string(), false)),
                "alloc" => Some((place.to_string(), true)),
                _ => None,
            }
        })
        .clone()
}

/// Panic or fail an allocation here when `LOSSLEDGER_FAULT` names this place; otherwise nothing.
/// The panic is reported at the caller's line.
#[track_caller]
pub fn point(at: Place) {
    let Some((place, alloc)) = wanted() else {
        return;
    };
    if place != at.word() {
        return;
    }
    if alloc {
        std::alloc::handle_alloc_error(std::alloc::Layout::new::<[u8; 1 << 20]>());
    }
    panic!("fault injected by {FAULT_ENV} at {place}");
}
