//! The JSON contract: SI field names, stable.

use serde::Serialize;

use crate::audit::{Audit, Finding, FittingResult, LineResult, RunResult};
use crate::ingest::Input;

/// Top-level JSON document.
#[derive(Serialize)]
pub struct Document<'a> {
    /// Tool version.
    pub lossledger: &'static str,
    /// True when the input marks its data as invented (demo, fixtures, synthetic stations).
    pub invented_data: bool,
    /// The invented-data label, with the cell that marks it (absent for real data).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub invented_data_note: Option<String>,
    /// Input file and hash.
    pub input: InputRef<'a>,
    /// Lines with their runs.
    pub lines: Vec<JsonLine<'a>>,
    /// Fittings.
    pub fittings: &'a [FittingResult],
    /// Findings.
    pub findings: &'a [Finding],
    /// Pumped systems.
    pub systems: &'a [crate::audit::system::SystemResult],
    /// Station energy totals.
    pub energy: &'a crate::audit::energy::EnergySummary,
    /// The caution on every saving and payback.
    pub savings_caution: &'static str,
    /// The caution that applies to every figure.
    pub caution: &'static str,
}

/// Input identification.
#[derive(Serialize)]
pub struct InputRef<'a> {
    /// File name as given.
    pub file: &'a str,
    /// SHA-256, hex.
    pub sha256: &'a str,
}

/// A line with its runs.
#[derive(Serialize)]
pub struct JsonLine<'a> {
    /// Line fields.
    #[serde(flatten)]
    pub line: &'a LineResult,
    /// Runs of the line.
    pub runs: Vec<&'a RunResult>,
}

/// Build the JSON document.
pub fn document<'a>(input: &'a Input, audit: &'a Audit) -> Document<'a> {
    let invented = super::invented::marker(input);
    Document {
        lossledger: env!("CARGO_PKG_VERSION"),
        invented_data: invented.is_some(),
        invented_data_note: invented.as_ref().map(super::invented::label),
        input: InputRef {
            file: &input.file,
            sha256: &input.sha256,
        },
        lines: audit
            .lines
            .iter()
            .map(|l| JsonLine {
                line: l,
                runs: l.runs.iter().map(|&i| &audit.runs[i]).collect(),
            })
            .collect(),
        fittings: &audit.fittings,
        findings: &audit.findings,
        systems: &audit.systems,
        energy: &audit.energy,
        savings_caution: crate::audit::energy::SAVINGS_CAUTION,
        caution: super::CAUTION,
    }
}

/// Serialise to pretty JSON.
pub fn to_string(input: &Input, audit: &Audit) -> serde_json::Result<String> {
    serde_json::to_string_pretty(&document(input, audit))
}
