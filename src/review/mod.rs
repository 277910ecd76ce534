//! `lossledger review`: many station workbooks audited each as its own station, then one review
//! of the estate.
//!
//! [`stations::discover`] lists the stations (one per file; line ids need only be unique within
//! a file), [`run::run`] audits them in parallel, stages each audited copy and reduces each
//! station to its [`summary::Reduced`] as soon as it is done; [`Review::new`] assembles what the
//! review workbook ([`workbook::build`]) and its JSON ([`Review::write_json`]) show, and
//! [`files::write`] writes it all, renamed into place only when everything is complete.
//! docs/review.md describes the outputs and the choices behind them.

pub mod files;
pub mod run;
pub mod spill;
pub mod stations;
pub mod summary;
pub mod workbook;
pub mod worst;

use serde::Serialize;

use crate::audit::Rules;
use crate::units::UnitSystem;
use spill::FindingSpill;
use summary::StationRow;
use worst::WorstFitting;

/// The review of an estate: the content of the review workbook, and its JSON.
#[derive(Debug, Serialize)]
pub struct Review {
    /// Tool version.
    pub lossledger: &'static str,
    /// True when any station marks its data as invented.
    pub invented_data: bool,
    /// The invented-data label of the review (absent when no station is invented).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub invented_data_note: Option<String>,
    /// Estate totals.
    pub totals: Totals,
    /// One row per station, in input order (stations not audited included).
    pub stations: Vec<StationRow>,
    /// The estate's worst fittings, worst first.
    pub worst_fittings: Vec<WorstFitting>,
    /// Fittings of the estate not listed in `worst_fittings`.
    pub fittings_not_listed: usize,
    /// Every audited station's findings, station by station (each station's worst first), kept
    /// on disk until written.
    pub findings: FindingSpill,
    /// The rules and cautions in force.
    pub basis: Basis,
}

/// Estate totals over the audited stations.
#[derive(Clone, Debug, Serialize)]
pub struct Totals {
    /// Stations given.
    pub stations: usize,
    /// Stations audited.
    pub audited: usize,
    /// Stations not audited (left out of every total).
    pub not_audited: usize,
    /// Annual energy of the losses, kWh.
    pub annual_energy_kwh: f64,
    /// Annual cost of the losses.
    pub annual_cost: f64,
    /// Currency of the costs.
    pub currency: String,
    /// Tariff per kWh.
    pub tariff_per_kwh: f64,
}

/// What the review rests on.
#[derive(Debug, Serialize)]
pub struct Basis {
    /// The rules file, or None for the built-in rules.
    pub rules_file: Option<String>,
    /// The header map file, when one was used.
    pub map_file: Option<String>,
    /// Units of the workbook (`si` or `us`; JSON stays SI).
    pub units: &'static str,
    /// The rules in force for every station.
    pub rules: Rules,
    /// Where the audited copies are, relative to the review workbook.
    pub copies: String,
    /// The caution on every figure.
    pub caution: &'static str,
    /// The caution on savings and paybacks.
    pub savings_caution: &'static str,
    /// The caution on suggestions that move a pump's operating point.
    pub operating_point_caution: &'static str,
    /// The caution on system checks.
    pub systems_caution: &'static str,
}

/// How the review was asked for (recorded in `Basis`).
#[derive(Clone, Debug, Default)]
pub struct Asked {
    /// The rules file.
    pub rules_file: Option<String>,
    /// The header map file.
    pub map_file: Option<String>,
    /// Units of the workbook.
    pub units: UnitSystem,
    /// The rules in force.
    pub rules: Rules,
    /// The copies folder as linked.
    pub copies: String,
}

impl Review {
    /// Assemble the review from what the stations gave.
    pub fn new(merged: run::Merged, asked: Asked) -> Review {
        let audited: Vec<&summary::StationFigures> = merged
            .rows
            .iter()
            .filter_map(|r| r.figures.as_ref())
            .collect();
        let invented = merged
            .rows
            .iter()
            .filter(|r| r.invented_data_note.is_some())
            .count();
        let totals = Totals {
            stations: merged.rows.len(),
            audited: audited.len(),
            not_audited: merged.rows.len() - audited.len(),
            annual_energy_kwh: audited.iter().map(|f| f.annual_energy_kwh).sum(),
            annual_cost: audited.iter().map(|f| f.annual_cost).sum(),
            currency: asked.rules.energy.currency.clone(),
            tariff_per_kwh: asked.rules.energy.tariff_per_kwh,
        };
        Review {
            lossledger: env!("CARGO_PKG_VERSION"),
            invented_data: invented > 0,
            invented_data_note: invented_note(invented, merged.rows.len()),
            totals,
            stations: merged.rows,
            worst_fittings: merged.worst,
            fittings_not_listed: merged.not_listed,
            findings: merged.findings,
            basis: Basis {
                rules_file: asked.rules_file,
                map_file: asked.map_file,
                units: if asked.units == UnitSystem::Us {
                    "us"
                } else {
                    "si"
                },
                rules: asked.rules,
                copies: asked.copies,
                caution: crate::report::CAUTION,
                savings_caution: crate::audit::energy::SAVINGS_CAUTION,
                operating_point_caution: crate::audit::energy::OPERATING_POINT_CAUTION,
                systems_caution: crate::report::ranking::SYSTEMS_CAUTION,
            },
        }
    }

    /// Write the review as pretty JSON (SI field names, as `audit --json`) to `out`, the
    /// findings streamed from disk.
    ///
    /// # Errors
    /// What serde_json reports: writing to `out` failed, or reading the findings back did.
    pub fn write_json(&self, out: impl std::io::Write) -> serde_json::Result<()> {
        serde_json::to_writer_pretty(out, self)
    }
}

/// The review's invented-data label, when `invented` of the `of` stations mark their data so.
fn invented_note(invented: usize, of: usize) -> Option<String> {
    use crate::report::invented::MARK;
    match invented {
        0 => None,
        n if n == of => Some(format!(
            "{MARK}: every station reviewed marks its data as invented; these results describe no real plant and must not be used for one."
        )),
        n => Some(format!(
            "{MARK}: {n} of the {of} stations reviewed mark their data as invented (column Invented data of Stations); their results describe no real plant and must not be used for one."
        )),
    }
}
