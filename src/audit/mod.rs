//! The audit: per-run and per-fitting hydraulics, line totals, rules and findings.
//!
//! [`run`] takes a parsed [`Input`] and the [`Rules`] and either returns an [`Audit`] or the
//! error-level diagnostics that stop it (problems that only show once physics is applied, such as
//! a size with no bore table or a temperature outside the water model).

pub mod findings;
pub mod lines;
pub mod rules;

use serde::Serialize;

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
}

/// One fitting row's results (head and Δp for the whole quantity).
#[derive(Clone, Debug, Serialize)]
pub struct FittingResult {
    /// Tag.
    pub tag: String,
    /// Line id.
    pub line: String,
    /// Item text as written.
    pub item: String,
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
}

impl Audit {
    /// Count of findings of a severity.
    pub fn count(&self, severity: Severity) -> usize {
        self.findings.iter().filter(|f| f.severity == severity).count()
    }
}

/// Run the audit on a parsed input. Returns the error diagnostics instead when the input has any,
/// or when applying the physics reveals them.
pub fn run(input: &Input, rules: &Rules) -> Result<Audit, Vec<Diagnostic>> {
    if input.error_count() > 0 {
        return Err(input.diagnostics.iter().filter(|d| d.severity == Severity::Error).cloned().collect());
    }
    let mut audit = lines::compute(input, rules)?;
    findings::apply(input, rules, &mut audit);
    audit.notes = input.diagnostics.clone();
    Ok(audit)
}
