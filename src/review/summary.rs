//! One station reduced to what the review needs: its row of `Stations`, its findings and its
//! part of the estate ranking. The station's full audit is dropped as soon as this is made.

use serde::Serialize;

use super::stations::Station;
use super::worst::{StationPart, station_part};
use crate::audit::Audit;
use crate::error::{CellRef, Diagnostic, Severity};
use crate::pipeline::Audited;

/// A station's row of the `Stations` sheet (`stations` in JSON).
#[derive(Clone, Debug, Serialize)]
pub struct StationRow {
    /// Name in the review.
    pub station: String,
    /// The workbook, as given.
    pub file: String,
    /// SHA-256 of its bytes, hex (None when it could not be read).
    pub sha256: Option<String>,
    /// True when it was audited and is in the review.
    pub audited: bool,
    /// Its audited copy relative to the review workbook's folder (None when not audited).
    pub copy: Option<String>,
    /// The invented-data label when the station marks its data as invented.
    pub invented_data_note: Option<String>,
    /// Its figures (None when not audited).
    pub figures: Option<StationFigures>,
    /// Why it was not audited: every error, with its file and cell (empty when audited).
    pub problems: Vec<Diagnostic>,
}

/// A station's figures. Further per-station figures (measured performance and the like) are
/// further fields here and further columns of `STATION_COLS` in `review::workbook`.
#[derive(Clone, Debug, Default, Serialize)]
pub struct StationFigures {
    /// Lines.
    pub lines: usize,
    /// Pipe runs.
    pub runs: usize,
    /// Fitting rows.
    pub fittings: usize,
    /// Annual energy of the losses, kWh (the station audit's total).
    pub annual_energy_kwh: f64,
    /// Annual cost of the losses (the station audit's total).
    pub annual_cost: f64,
    /// Findings by severity.
    pub findings: SeverityCounts,
    /// Its worst fitting (rank 1 of its own ranking).
    pub worst_fitting: Option<WorstOfStation>,
    /// Its measured performance, over the systems with meter readings or a test point (None
    /// when no system has either).
    pub measured: Option<StationMeasured>,
}

/// A station's measured performance, summed over its systems (docs/review.md).
///
/// # Formula
/// Specific energy `e = ΣE / ΣV` over the metered systems; wire-to-water
/// `η = Σ(ηᵢ Eᵢ) / ΣE`, the theoretical minimum energy of every metered system over their
/// metered energy (each `ηᵢ Eᵢ` is system i's minimum, docs/energy.md §8).
#[derive(Clone, Debug, Default, Serialize)]
pub struct StationMeasured {
    /// Systems with metered energy and volume.
    pub metered_systems: usize,
    /// Systems with a site test point.
    pub tested_systems: usize,
    /// Metered energy per year over the metered systems, kWh (None when none is metered).
    pub energy_kwh: Option<f64>,
    /// Metered volume per year over the metered systems, m³.
    pub volume_m3: Option<f64>,
    /// Specific energy of the metered systems together, kWh/m³.
    pub specific_energy_kwh_m3: Option<f64>,
    /// Wire-to-water efficiency of the metered systems together.
    pub wire_to_water: Option<f64>,
    /// The system with the lowest wire-to-water, metered or from its test point.
    pub lowest_system: Option<String>,
    /// That system's wire-to-water.
    pub lowest_wire_to_water: Option<f64>,
    /// Systems whose duty or operating flow lies outside the preferred operating region.
    pub outside_preferred: usize,
}

/// Findings counted by severity.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize)]
pub struct SeverityCounts {
    /// Errors.
    pub error: usize,
    /// Warnings.
    pub warning: usize,
    /// Info.
    pub info: usize,
}

/// A station's worst fitting.
#[derive(Clone, Debug, Serialize)]
pub struct WorstOfStation {
    /// Tag (or item and line when untagged).
    pub fitting: String,
    /// Line id.
    pub line: String,
    /// Annual cost of its loss (None on a gravity line, ranked by head).
    pub annual_cost: Option<f64>,
    /// Head loss, m.
    pub head_m: f64,
    /// Its cell.
    pub cell: CellRef,
}

/// One finding of one station (`findings` in JSON).
#[derive(Clone, Debug, Serialize)]
pub struct StationFinding {
    /// The station.
    pub station: String,
    /// How serious.
    pub severity: Severity,
    /// Stable code.
    pub code: String,
    /// Line id.
    pub line: Option<String>,
    /// Fitting tag.
    pub tag: Option<String>,
    /// Its cell in the station's input and audited copy.
    pub cell: Option<CellRef>,
    /// What was found.
    pub message: String,
    /// What to do.
    pub action: String,
    /// The station's audited copy, relative to the review workbook's folder.
    pub copy: String,
}

/// What the review keeps of one station.
#[derive(Debug)]
pub struct Reduced {
    /// Its row.
    pub row: StationRow,
    /// Its findings.
    pub findings: Vec<StationFinding>,
    /// Its part of the estate ranking.
    pub ranking: StationPart,
}

/// The copy's path as the review links to it: `<copies folder name>/<copy name>`.
pub fn copy_link(copies_folder: &str, station: &Station) -> String {
    format!("{copies_folder}/{}", station.copy_name)
}

/// Reduce an audited station; `ranking_rows` as in the review (its worst N fittings kept).
pub fn reduce(
    station: &Station,
    audited: &Audited,
    copy: String,
    book: &crate::report::workbook::BookOptions,
) -> Reduced {
    let ranking_rows = book.ranking_rows;
    let (input, audit) = (&audited.input, &audited.audit);
    let ranking = station_part(audit, (station.index, &station.name), &copy, ranking_rows);
    let findings = audit
        .findings
        .iter()
        .map(|f| StationFinding {
            station: station.name.clone(),
            severity: f.severity,
            code: f.code.to_string(),
            line: f.line.clone(),
            tag: f.tag.clone(),
            cell: f.cell.clone(),
            message: f.message.render(book.units).into_owned(),
            action: f.action.clone(),
            copy: copy.clone(),
        })
        .collect();
    let row = StationRow {
        station: station.name.clone(),
        file: station.path.display().to_string(),
        sha256: Some(input.sha256.clone()),
        audited: true,
        copy: Some(copy),
        invented_data_note: crate::report::invented::marker(input)
            .as_ref()
            .map(crate::report::invented::label),
        figures: Some(figures(audit)),
        problems: Vec::new(),
    };
    Reduced {
        row,
        findings,
        ranking,
    }
}

fn figures(audit: &Audit) -> StationFigures {
    let worst_fitting = crate::report::ranking::ranked(audit, Some(1))
        .first()
        .map(|f| WorstOfStation {
            fitting: crate::report::ranking::label(f),
            line: f.line.to_string(),
            annual_cost: f.annual_cost,
            head_m: f.head_m,
            cell: f.cell.clone(),
        });
    StationFigures {
        lines: audit.lines.len(),
        runs: audit.runs.len(),
        fittings: audit.fittings.len(),
        annual_energy_kwh: audit.energy.total_annual_energy_kwh,
        annual_cost: audit.energy.total_annual_cost,
        findings: SeverityCounts {
            error: audit.count(Severity::Error),
            warning: audit.count(Severity::Warning),
            info: audit.count(Severity::Info),
        },
        worst_fitting,
        measured: measured(audit),
    }
}

/// The station's measured performance (None when no system has meter readings or a test point).
fn measured(audit: &Audit) -> Option<StationMeasured> {
    let metered: Vec<_> = audit.systems.iter().filter_map(|s| s.measured).collect();
    let tested = audit.systems.iter().filter(|s| s.test.is_some()).count();
    if metered.is_empty() && tested == 0 {
        return None;
    }
    let energy: f64 = metered.iter().map(|m| m.energy_kwh).sum();
    let volume: f64 = metered.iter().map(|m| m.volume_m3).sum();
    let minimum: f64 = metered.iter().map(|m| m.wire_to_water * m.energy_kwh).sum();
    let some = |x: f64| (!metered.is_empty()).then_some(x);
    let lowest = audit
        .systems
        .iter()
        .flat_map(|s| {
            let metered = s.measured.map(|m| m.wire_to_water);
            let test = s.test.as_ref().map(|t| t.wire_to_water);
            metered.into_iter().chain(test).map(|w| (&s.system, w))
        })
        .min_by(|a, b| a.1.total_cmp(&b.1));
    Some(StationMeasured {
        metered_systems: metered.len(),
        tested_systems: tested,
        energy_kwh: some(energy),
        volume_m3: some(volume),
        specific_energy_kwh_m3: some(energy / volume),
        wire_to_water: some(minimum / energy),
        lowest_system: lowest.map(|l| l.0.clone()),
        lowest_wire_to_water: lowest.map(|l| l.1),
        outside_preferred: audit
            .systems
            .iter()
            .filter(|s| {
                s.pump_efficiency
                    .as_ref()
                    .is_some_and(|p| p.outside_preferred)
            })
            .count(),
    })
}

/// The row of a station that could not be audited: its problems, each with file and cell.
pub fn not_audited(
    station: &Station,
    sha256: Option<String>,
    problems: Vec<Diagnostic>,
) -> StationRow {
    StationRow {
        station: station.name.clone(),
        file: station.path.display().to_string(),
        sha256,
        audited: false,
        copy: None,
        invented_data_note: None,
        figures: None,
        problems,
    }
}
