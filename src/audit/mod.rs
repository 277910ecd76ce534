//! The audit: per-run and per-fitting hydraulics, line totals, rules and findings.
//!
//! [`run`] takes a parsed [`Input`] and the [`Rules`] and either returns an [`Audit`] or the
//! error-level diagnostics that stop it (problems that only show once physics is applied, such as
//! a size with no bore table or a temperature outside the water model).

pub mod energy;
pub mod findings;
pub mod lines;
pub mod models;
pub mod pump;
pub mod rules;
pub(crate) mod same_cause;
pub mod savings;
pub mod station;
pub mod system;

use serde::Serialize;
use std::sync::Arc;

use crate::error::{CellRef, Diagnostic, Severity};
use crate::ingest::{Input, Service};
use crate::physics::fluid::FluidProps;
pub use findings::Finding;
pub use rules::Rules;

/// One pipe run's results.
#[derive(Clone, Debug, Serialize)]
pub struct RunResult {
    /// Source cell (the run's Line cell).
    pub cell: CellRef,
    /// Line id.
    pub line: String,
    /// Zero-based source row.
    #[serde(skip)]
    pub row: u32,
    /// Nominal DN when known.
    pub dn: Option<u16>,
    /// Where the bore came from (standard, size, schedule; or "given").
    pub bore_basis: String,
    /// Bore, m.
    pub inner_diameter_m: f64,
    /// Length, m.
    pub length_m: f64,
    /// Absolute roughness, m.
    pub roughness_m: f64,
    /// Where the roughness came from.
    pub roughness_basis: String,
    /// Flow, m³/s.
    pub flow_m3_s: f64,
    /// Mean velocity, m/s.
    pub velocity_m_s: f64,
    /// Reynolds number.
    pub reynolds: f64,
    /// Darcy friction factor (0 for Hazen–Williams runs).
    pub friction_factor: f64,
    /// Flow regime.
    pub regime: crate::physics::friction::Regime,
    /// Friction method.
    pub method: &'static str,
    /// Friction head loss, m.
    pub head_m: f64,
    /// Friction pressure loss, Pa.
    pub dp_pa: f64,
    /// Hazen–Williams C when given (kept to re-run the run at other flows).
    #[serde(skip)]
    pub c_factor: Option<f64>,
}

/// One fitting row's results (head and Δp for the whole quantity).
#[derive(Clone, Debug, Serialize)]
pub struct FittingResult {
    /// Tag (shared with the fitting's row).
    pub tag: Arc<str>,
    /// Line id (one string for every fitting of the line).
    pub line: Arc<str>,
    /// Item text as written (one string for every fitting written alike).
    pub item: Arc<str>,
    /// Catalogue kind id.
    pub kind: &'static str,
    /// Source cell (the Item cell).
    pub cell: CellRef,
    /// Zero-based source row.
    #[serde(skip)]
    pub row: u32,
    /// Quantity.
    pub qty: f64,
    /// K per item.
    pub k: f64,
    /// Low end of K's band.
    pub k_low: f64,
    /// High end of K's band.
    pub k_high: f64,
    /// Bore whose velocity K refers to, m.
    pub reference_diameter_m: f64,
    /// Velocity in that bore, m/s.
    pub velocity_m_s: f64,
    /// Reynolds number in that bore.
    pub reynolds: f64,
    /// Head loss for the quantity, m.
    pub head_m: f64,
    /// Low end, m.
    pub head_low_m: f64,
    /// High end, m.
    pub head_high_m: f64,
    /// Pressure loss for the quantity, Pa.
    pub dp_pa: f64,
    /// Model used.
    pub model: &'static str,
    /// Published source of the model or value.
    pub source: &'static str,
    /// Fraction open, when the item is a valve.
    pub opening: Option<f64>,
    /// Replacement cost, when given.
    pub replacement_cost: Option<f64>,
    /// Hydraulic power dissipated, W (Δp·Q); filled by the energy review.
    pub power_loss_w: Option<f64>,
    /// Electrical energy per year the loss costs the pump, kWh (None on gravity lines).
    pub annual_energy_kwh: Option<f64>,
    /// Cost per year of that energy, in the rules' currency (None on gravity lines).
    pub annual_cost: Option<f64>,
    /// Emissions per year, kg CO₂ (None unless the rules give an emission factor).
    pub annual_co2_kg: Option<f64>,
    /// Rank among all fittings by annual cost (head loss where no energy applies); 1 is worst.
    pub rank: Option<usize>,
    /// True when the rank can move by more than a few places across the K band.
    pub rank_uncertain: Option<bool>,
    /// The lower-loss alternative, when one applies (boxed: most items have none, and an
    /// inline suggestion made every result about 170 bytes larger).
    pub suggestion: Option<Box<energy::Suggestion>>,
    /// Ranking details (share, rank range), filled by the energy review.
    #[serde(skip)]
    pub ranking: Option<energy::Ranking>,
    /// Group of the catalogue kind.
    #[serde(skip)]
    pub group: crate::physics::fitting::Group,
}

/// One line's totals.
#[derive(Clone, Debug, Serialize)]
pub struct LineResult {
    /// Line id.
    pub line: String,
    /// Service.
    pub service: Service,
    /// The Lines row the line came from (None when only Pipes names it).
    #[serde(skip)]
    pub row: Option<u32>,
    /// The Lines sheet that row is on.
    #[serde(skip)]
    pub sheet: Option<String>,
    /// Flow, m³/s.
    pub flow_m3_s: f64,
    /// Fluid name.
    pub fluid: String,
    /// Temperature, °C.
    pub temperature_c: f64,
    /// Density, kg/m³.
    pub density_kg_m3: f64,
    /// Viscosity, Pa·s.
    pub viscosity_pa_s: f64,
    /// Vapour pressure, Pa (absolute).
    #[serde(skip)]
    pub vapour_pressure_pa: Option<f64>,
    /// Elevation change, m (outlet minus inlet).
    #[serde(skip)]
    pub elevation_change_m: f64,
    /// Total pipe length, m.
    pub length_m: f64,
    /// Friction head, m.
    pub friction_head_m: f64,
    /// Fittings head, m.
    pub fittings_head_m: f64,
    /// Friction plus fittings, m.
    pub total_head_m: f64,
    /// Total with fittings at the low end of their bands, m.
    pub total_head_low_m: f64,
    /// Total with fittings at the high end of their bands, m.
    pub total_head_high_m: f64,
    /// Total pressure loss, Pa.
    pub total_dp_pa: f64,
    /// Highest run velocity, m/s.
    pub max_velocity_m_s: f64,
    /// Runs of the line, in order (indices into [`Audit::runs`]).
    #[serde(skip)]
    pub runs: Vec<usize>,
    /// Fittings of the line, in input order (indices into [`Audit::fittings`]).
    #[serde(skip)]
    pub fittings: Vec<usize>,
    /// Hydraulic power dissipated by the line's losses, W (Δp·Q); filled by the energy review.
    pub power_loss_w: Option<f64>,
    /// Electrical energy per year the losses cost the pump, kWh (None on gravity lines).
    pub annual_energy_kwh: Option<f64>,
    /// Cost per year of that energy, in the rules' currency (None on gravity lines).
    pub annual_cost: Option<f64>,
    /// Emissions per year, kg CO₂ (None unless the rules give an emission factor).
    pub annual_co2_kg: Option<f64>,
    /// Wire-to-water efficiency used (None on gravity lines).
    #[serde(skip)]
    pub efficiency: Option<f64>,
    /// Where the efficiency came from.
    #[serde(skip)]
    pub efficiency_basis: &'static str,
    /// Running hours per year used.
    #[serde(skip)]
    pub hours_per_year: Option<f64>,
}

/// Fluid properties used, for the Basis sheet.
#[derive(Clone, Debug, Serialize)]
pub struct FluidUsed {
    /// Fluid name.
    pub fluid: String,
    /// Temperature, °C.
    pub temperature_c: f64,
    /// Properties.
    pub props: FluidProps,
    /// Where they came from.
    pub basis: String,
}

/// The complete audit of one input.
#[derive(Clone, Debug)]
pub struct Audit {
    /// Lines in input order.
    pub lines: Vec<LineResult>,
    /// Runs in line order, then sequence.
    pub runs: Vec<RunResult>,
    /// Fittings in input order.
    pub fittings: Vec<FittingResult>,
    /// Findings, ordered by severity (worst first), then location.
    pub findings: Vec<Finding>,
    /// Fluid states used.
    pub fluids: Vec<FluidUsed>,
    /// Catalogue kinds used, by id.
    pub kinds_used: Vec<&'static str>,
    /// Rules in force.
    pub rules: Rules,
    /// Non-error diagnostics from reading (warnings, assumed values), carried into the report.
    pub notes: Vec<Diagnostic>,
    /// Station energy totals.
    pub energy: energy::EnergySummary,
    /// Pumped systems: required head, pump head, NPSH, system curve.
    pub systems: Vec<system::SystemResult>,
    /// Line id → index into [`Audit::lines`].
    pub line_index: std::collections::HashMap<String, usize>,
}

impl Audit {
    /// The index of a line in [`Audit::lines`].
    pub fn line_of(&self, id: &str) -> Option<usize> {
        self.line_index.get(id).copied()
    }

    /// Count of findings of a severity.
    pub fn count(&self, severity: Severity) -> usize {
        self.findings
            .iter()
            .filter(|f| f.severity == severity)
            .count()
    }
}

/// Run the audit on a parsed input. Returns the error diagnostics instead when the input has any,
/// or when applying the physics reveals them.
pub fn run(input: &Input, rules: &Rules) -> Result<Audit, Vec<Diagnostic>> {
    let placed = place(input, rules)?;
    finish(input, rules, placed)
}

/// [`run`], freeing the parsed fitting rows ([`Input::release_fitting_rows`]) as soon as the
/// fittings are placed and checked: the later stages (systems, energy, station) work from the
/// results and the fitting models. The audit is the same as [`run`]'s; on a big register the
/// rows are about a sixth of the audit's peak memory (docs/reliability.md).
///
/// # Errors
/// As [`run`]; the rows are kept when the input has errors.
pub fn run_releasing_rows(input: &mut Input, rules: &Rules) -> Result<Audit, Vec<Diagnostic>> {
    let placed = place(input, rules)?;
    input.release_fitting_rows();
    finish(input, rules, placed)
}

/// The audit up to the fitting findings: what still needs the parsed fitting rows.
struct Placed {
    audit: Audit,
    // The fitting models (what re-evaluates an item at another flow or as another kind) live
    // only while the audit runs: on huge registers they are a good share of the memory.
    models: models::Models,
}

fn place(input: &Input, rules: &Rules) -> Result<Placed, Vec<Diagnostic>> {
    if input.error_count() > 0 {
        return Err(input
            .diagnostics
            .iter()
            .filter(|d| d.severity == Severity::Error)
            .cloned()
            .collect());
    }
    crate::worker::enter(crate::worker::Phase::Audit, &input.file);
    crate::worker::fault::point(crate::worker::fault::Place::Audit);
    let lines::Computed {
        mut audit,
        models,
        placements,
    } = lines::compute(input, rules)?;
    findings::placement(input, &mut audit, &placements);
    findings::apply(input, rules, &mut audit);
    Ok(Placed { audit, models })
}

fn finish(input: &Input, rules: &Rules, placed: Placed) -> Result<Audit, Vec<Diagnostic>> {
    let Placed { mut audit, models } = placed;
    system::apply(input, rules, &mut audit, &models);
    station::pump_curves(input, rules, &mut audit)?;
    energy::apply(input, rules, &mut audit, &models);
    station::apply(input, rules, &mut audit, &models)?;
    findings::sort(&mut audit.findings);
    audit.notes = input.diagnostics.clone();
    Ok(audit)
}
