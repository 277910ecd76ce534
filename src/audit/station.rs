//! Per-station additions to each system: measured performance (metered energy and volume, a
//! site test point), the pump curve's best-efficiency point, preferred operating region and
//! efficiency at the operating point, and what each saving is worth under the system's flow
//! control, with its present value. See `docs/energy.md` §8–§11.
//!
//! [`pump_curves`] runs before the energy review (its efficiency at the operating point replaces
//! the flat default there); [`apply`] runs after it (it reads the suggestions' head savings).

use crate::sentence::{fig, fig_signed};
use serde::Serialize;

use super::models::Models;
use super::pump::{self, BestEfficiency};
use super::system::{CurvePoint, SystemResult, interpolate, required_head_at};
use super::{Audit, Finding, Rules};
use crate::error::{CellRef, Diagnostic, Severity};
use crate::ingest::rows::{Assumed, Control, TestHead};
use crate::ingest::{Input, SystemRow, TableKind};
use crate::physics::G;

/// The caution beside every energy and operating-point figure of a station (Systems sheet,
/// console, Basis, docs).
pub const STATION_CAUTION: &str = "Energy and operating-point figures are screening estimates from the schedule, the meter readings and the curve points given: confirm them by site measurement and the pump maker's data, under local codes and licensed engineering practice.";

/// One year's metered performance.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Measured {
    /// Metered energy, kWh per year.
    pub energy_kwh: f64,
    /// Metered volume, m³ per year.
    pub volume_m3: f64,
    /// Specific energy, kWh/m³.
    pub specific_energy_kwh_m3: f64,
    /// Head it is referred to: the computed required head at duty, m.
    pub head_m: f64,
    /// Specific energy per metre of that head, kWh/(m³·m) (None when the head is 0).
    pub specific_energy_kwh_m3_m: Option<f64>,
    /// Wire-to-water efficiency: the theoretical minimum over the specific energy.
    pub wire_to_water: f64,
}

/// A site test point and what it shows.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct TestResult {
    /// The measured operating point: flow, m³/s, and head, m (given, or from the two pressures).
    pub point: CurvePoint,
    /// Electrical input power, W.
    pub power_w: f64,
    /// Specific energy, kWh/m³.
    pub specific_energy_kwh_m3: f64,
    /// Specific energy per metre of the test head, kWh/(m³·m) (None when the head is 0).
    pub specific_energy_kwh_m3_m: Option<f64>,
    /// Wire-to-water efficiency, `ρ g Q H / P`.
    pub wire_to_water: f64,
    /// The computed system head at the test flow, m.
    pub computed_head_m: f64,
    /// Test head minus computed head, m.
    pub head_difference_m: f64,
}

/// The pump curve's efficiency: best-efficiency point, efficiency where the pump runs, and the
/// preferred operating region.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct PumpEfficiency {
    /// Best-efficiency point.
    pub best: BestEfficiency,
    /// Flow the efficiency is read at: the operating point, else the duty flow, m³/s.
    pub flow_m3_s: f64,
    /// Pump efficiency there (curve, linear between points); None outside the points.
    pub pump_efficiency: Option<f64>,
    /// That times the rules' motor efficiency: the wire-to-water efficiency the energy review uses
    /// for the system's lines when neither Lines nor Systems give one.
    pub wire_to_water: Option<f64>,
    /// Preferred operating region, lower end, m³/s.
    pub preferred_min_m3_s: f64,
    /// Preferred operating region, upper end, m³/s.
    pub preferred_max_m3_s: f64,
    /// Duty flow over best-efficiency flow.
    pub duty_ratio: f64,
    /// Operating-point flow over best-efficiency flow.
    pub operating_ratio: Option<f64>,
    /// True when the duty or the operating flow is outside the preferred region.
    pub outside_preferred: bool,
}

/// Best-efficiency point, efficiency at the operating point and the preferred region of each
/// system with efficiency or power points; raises `outside-preferred-region`.
///
/// # Errors
/// A curve point whose shaft power gives a pump efficiency above 1, at its Power cell.
pub fn pump_curves(input: &Input, rules: &Rules, audit: &mut Audit) -> Result<(), Vec<Diagnostic>> {
    let mut errors = Vec::new();
    let mut found = Vec::new();
    for si in 0..audit.systems.len() {
        let s = &audit.systems[si];
        let density = density(audit, s);
        let eff = efficiency_points(input, &s.system, density, &mut errors);
        let Some(best) = pump::best_efficiency(&eff, &s.pump_curve) else {
            continue;
        };
        let pe = pump_efficiency(rules, s, &eff, best);
        if pe.outside_preferred {
            found.push(outside_region(input, rules, s, &pe));
        }
        audit.systems[si].pump_efficiency = Some(pe);
        audit.systems[si].efficiency_curve = eff;
    }
    audit.findings.extend(found);
    if errors.is_empty() {
        Ok(())
    } else {
        Err(errors)
    }
}

/// The system's density: its first line's, kg/m³.
pub(super) fn density(audit: &Audit, s: &SystemResult) -> f64 {
    s.lines
        .first()
        .and_then(|l| audit.line_of(l))
        .map_or(998.2, |i| audit.lines[i].density_kg_m3)
}

/// Pump efficiency points of a system by flow: the Efficiency column, else `ρ g Q H / P` from the
/// Power column (an efficiency above 1 is an error at the Power cell).
fn efficiency_points(
    input: &Input,
    id: &str,
    density: f64,
    errors: &mut Vec<Diagnostic>,
) -> Vec<CurvePoint> {
    let mut points = Vec::new();
    for p in input.pump_curves.iter().filter(|p| p.system == id) {
        let eta = match (p.efficiency, p.power_w) {
            (Some(e), _) => e,
            (None, Some(w)) => {
                let e = density * G * p.flow_m3_s * p.head_m / w;
                if e > 1.0 {
                    let cell = CellRef::new(
                        &p.origin.sheet,
                        p.origin.row,
                        input.column_of(TableKind::PumpCurve, &p.origin.sheet, "power"),
                    );
                    errors.push(error(input, cell, format!("shaft power {:.3} kW at {:.1} m3/h and {:.2} m gives a pump efficiency of {:.1} %, above 100 %", w / 1e3, p.flow_m3_s * 3600.0, p.head_m, e * 100.0), "give the pump's shaft power from the maker's curve (kW), at the same point as the flow and head"));
                    continue;
                }
                e
            }
            (None, None) => continue,
        };
        points.push(CurvePoint {
            flow_m3_s: p.flow_m3_s,
            head_m: eta,
        });
    }
    points.sort_by(|a, b| a.flow_m3_s.total_cmp(&b.flow_m3_s));
    points
}

fn error(input: &Input, cell: CellRef, message: String, hint: &str) -> Diagnostic {
    Diagnostic {
        severity: Severity::Error,
        file: input.file_of(&cell.sheet).to_string(),
        cell: Some(cell),
        message,
        hint: Some(hint.into()),
    }
}

fn pump_efficiency(
    rules: &Rules,
    s: &SystemResult,
    eff: &[CurvePoint],
    best: BestEfficiency,
) -> PumpEfficiency {
    let st = &rules.station;
    let flow = s.operating_point.map_or(s.flow_m3_s, |p| p.flow_m3_s);
    let pump_efficiency = interpolate(eff, flow).filter(|e| *e > 0.0);
    let (lo, hi) = (
        st.preferred_min * best.flow_m3_s,
        st.preferred_max * best.flow_m3_s,
    );
    let inside = |q: f64| q >= lo && q <= hi;
    let operating_ratio = s.operating_point.map(|p| p.flow_m3_s / best.flow_m3_s);
    PumpEfficiency {
        best,
        flow_m3_s: flow,
        pump_efficiency,
        wire_to_water: pump_efficiency.map(|e| e * st.motor_efficiency),
        preferred_min_m3_s: lo,
        preferred_max_m3_s: hi,
        duty_ratio: s.flow_m3_s / best.flow_m3_s,
        operating_ratio,
        outside_preferred: !inside(s.flow_m3_s)
            || s.operating_point.is_some_and(|p| !inside(p.flow_m3_s)),
    }
}

/// Where a system's findings point: its Systems row cell of `key` (the System cell when the sheet
/// has no such column), else the first Pump curve row, else the first line's Lines row.
fn system_cell(input: &Input, id: &str, key: &str) -> Option<CellRef> {
    if let Some(r) = input.systems.iter().find(|r| r.system == id) {
        let layout = input.layout_on(TableKind::Systems, &r.origin.sheet);
        let col = layout
            .and_then(|l| l.column(key).or(l.column("system")))
            .map_or(0, |c| c.col);
        return Some(CellRef::new(&r.origin.sheet, r.origin.row, col));
    }
    if let Some(p) = input.pump_curves.iter().find(|p| p.system == id) {
        return Some(CellRef::new(
            &p.origin.sheet,
            p.origin.row,
            input.column_of(TableKind::PumpCurve, &p.origin.sheet, "system"),
        ));
    }
    let l = input
        .lines
        .iter()
        .find(|l| l.system.as_deref() == Some(id))?;
    Some(CellRef::new(
        &l.origin.sheet,
        l.origin.row,
        input.column_of(TableKind::Lines, &l.origin.sheet, "system"),
    ))
}

fn finding(
    severity: Severity,
    code: &'static str,
    cell: Option<CellRef>,
    message: String,
    action: &str,
) -> Finding {
    Finding {
        severity,
        code,
        line: None,
        tag: None,
        cell,
        message: message.into(),
        action: action.into(),
    }
}

fn outside_region(input: &Input, rules: &Rules, s: &SystemResult, pe: &PumpEfficiency) -> Finding {
    let st = &rules.station;
    let op = pe
        .operating_ratio
        .map(|r| {
            format!(
                ", the operating point {} is {:.0} %",
                fig(pe.flow_m3_s * 3600.0, "m3/h", 1),
                r * 100.0
            )
        })
        .unwrap_or_default();
    finding(
        Severity::Warning,
        "outside-preferred-region",
        system_cell(input, &s.system, "system"),
        format!(
            "system {}: duty {} is {:.0} % of the best-efficiency flow {}{op}; the preferred operating region is {:.0}–{:.0} % (ANSI/HI 9.6.3)",
            s.system,
            fig(s.flow_m3_s * 3600.0, "m3/h", 1),
            pe.duty_ratio * 100.0,
            fig(pe.best.flow_m3_s * 3600.0, "m3/h", 1),
            st.preferred_min * 100.0,
            st.preferred_max * 100.0
        ),
        "away from its best-efficiency flow a pump wastes energy and suffers recirculation, vibration and wear: consider trimming, speed control or a pump sized for the duty; screening estimate, confirm with the pump maker's curve and site measurement",
    )
}

/// Measured performance, loss share, control and savings of every system; the suggestions' saving
/// case and present value; raises `low-wire-to-water`, `loss-share-high` and
/// `measured-vs-computed`. `models` are the fittings' models, in the order of `audit.fittings`.
///
/// # Errors
/// Meter readings or a test point that give a wire-to-water efficiency above 1, at their cells.
pub fn apply(
    input: &Input,
    rules: &Rules,
    audit: &mut Audit,
    models: &Models,
) -> Result<(), Vec<Diagnostic>> {
    let mut errors = Vec::new();
    let mut found = Vec::new();
    for si in 0..audit.systems.len() {
        let s = &audit.systems[si];
        let row = input.systems.iter().find(|r| r.system == s.system);
        let mut m = Measure {
            input,
            rules,
            audit,
            models,
            s,
            rho: density(audit, s),
            errors: &mut errors,
            found: &mut found,
        };
        let loss_share = m.loss_share();
        let measured = row.and_then(|r| r.metered).and_then(|x| m.metered(x));
        let test = row.and_then(|r| r.test_point).and_then(|x| m.test(x));
        let minimum = pump::minimum_specific_energy(m.rho);
        let s = &mut audit.systems[si];
        s.minimum_specific_energy_kwh_m3_m = minimum;
        s.loss_share = loss_share;
        s.measured = measured;
        s.test = test;
        control(input, s, row);
    }
    if !errors.is_empty() {
        return Err(errors);
    }
    super::savings::apply(rules, audit, models);
    audit.findings.extend(found);
    Ok(())
}

/// The control of a system, where it came from, and the assumed mark when it was not given.
fn control(input: &Input, s: &mut SystemResult, row: Option<&SystemRow>) {
    if let Some(c) = row.and_then(|r| r.control) {
        s.control = c;
        s.control_basis = "Systems sheet".into();
        return;
    }
    s.control = Control::Fixed;
    s.control_basis = "assumed: fixed speed, no Control given".into();
    let has_column = row.is_some_and(|r| {
        input
            .layout_on(TableKind::Systems, &r.origin.sheet)
            .is_some_and(|l| l.column("control").is_some())
    });
    let key = if has_column { "control" } else { "system" };
    if let Some(cell) = row.and_then(|_| system_cell(input, &s.system, key)) {
        s.assumed.push(Assumed {
            cell,
            key,
            what: "control fixed (fixed speed, no throttling): decides what a lower loss saves"
                .into(),
        });
    }
}

/// What one system's measured figures are computed with, and where their findings and errors go.
struct Measure<'a> {
    input: &'a Input,
    rules: &'a Rules,
    audit: &'a Audit,
    models: &'a Models,
    s: &'a SystemResult,
    rho: f64,
    errors: &'a mut Vec<Diagnostic>,
    found: &'a mut Vec<Finding>,
}

impl Measure<'_> {
    fn cell(&self, key: &str) -> Option<CellRef> {
        system_cell(self.input, &self.s.system, key)
    }

    /// Losses over required head; `loss-share-high` above the rule.
    fn loss_share(&mut self) -> Option<f64> {
        let s = self.s;
        let share = (s.required_head_m > 0.0).then(|| s.losses_head_m / s.required_head_m)?;
        let max = self.rules.station.max_loss_share;
        if share > max {
            let f = finding(
                Severity::Warning,
                "loss-share-high",
                self.cell("system"),
                format!(
                    "system {}: the piping takes {} of the {} required at duty, {:.0} % of the head (rule: at most {:.0} %, common practice)",
                    s.system,
                    fig(s.losses_head_m, "m", 2),
                    fig(s.required_head_m, "m", 2),
                    share * 100.0,
                    max * 100.0
                ),
                "the pump spends a large share of its energy on pipe and fitting losses: see the Fitting ranking for what to cut first; screening estimate, confirm by site measurement",
            );
            self.found.push(f);
        }
        Some(share)
    }

    /// Metered figures against the computed required head; an error when they beat the
    /// theoretical minimum, `low-wire-to-water` below the rule.
    fn metered(&mut self, m: crate::ingest::rows::Metered) -> Option<Measured> {
        let s = self.s;
        let se = pump::specific_energy(m.energy_kwh, m.volume_m3)?;
        let w2w = pump::wire_to_water(self.rho, s.required_head_m, se).filter(|w| *w <= 1.0);
        let Some(w2w) = w2w else {
            let minimum = pump::minimum_specific_energy(self.rho) * s.required_head_m;
            let would = if se > 0.0 {
                format!("{:.0} %", minimum / se * 100.0)
            } else {
                "infinite".into()
            };
            let e = error(
                self.input,
                self.cell("metered_energy")?,
                format!(
                    "metered energy {:.0} kWh for {:.0} m3 is {se:.5} kWh/m3, below the theoretical minimum {minimum:.5} kWh/m3 to lift it the computed {:.2} m (wire-to-water would be {would})",
                    m.energy_kwh, m.volume_m3, s.required_head_m,
                ),
                "check that energy and volume are of the same period and in the units of their headers (kWh, m3), and the system's static head",
            );
            self.errors.push(e);
            return None;
        };
        self.low_w2w(w2w, "metered energy and volume", "metered_energy");
        Some(Measured {
            energy_kwh: m.energy_kwh,
            volume_m3: m.volume_m3,
            specific_energy_kwh_m3: se,
            head_m: s.required_head_m,
            specific_energy_kwh_m3_m: (s.required_head_m > 0.0).then(|| se / s.required_head_m),
            wire_to_water: w2w,
        })
    }

    /// A test point against the computed system head at its flow; an error when the power is
    /// below the hydraulic power.
    fn test(&mut self, t: crate::ingest::rows::TestPoint) -> Option<TestResult> {
        let (s, rho) = (self.s, self.rho);
        let (head, key) = match t.head {
            TestHead::Head(h) => (h, "test_head"),
            TestHead::Pressures {
                suction_pa,
                discharge_pa,
            } => (
                (discharge_pa - suction_pa) / (rho * G),
                "test_discharge_pressure",
            ),
        };
        let se = pump::test_specific_energy(t.power_w, t.flow_m3_s)?;
        let w2w = pump::wire_to_water(rho, head, se)?;
        if w2w > 1.0 {
            let e = error(
                self.input,
                self.cell("test_power")?,
                format!(
                    "test power {:.2} kW is below the hydraulic power {:.2} kW of {:.1} m3/h at {:.2} m (wire-to-water would be {:.0} %)",
                    t.power_w / 1e3,
                    rho * G * t.flow_m3_s * head / 1e3,
                    t.flow_m3_s * 3600.0,
                    head,
                    w2w * 100.0
                ),
                "check the units (kW, m3/h, kPa or m) and that flow, head and power were read at the same time",
            );
            self.errors.push(e);
            return None;
        }
        self.low_w2w(w2w, "the test point", "test_power");
        let fraction = if s.flow_m3_s > 0.0 {
            t.flow_m3_s / s.flow_m3_s
        } else {
            0.0
        };
        let idx: Vec<usize> = s
            .lines
            .iter()
            .filter_map(|l| self.audit.line_of(l))
            .collect();
        let computed = required_head_at(self.audit, self.models, &idx, s.static_head_m, fraction);
        let r = TestResult {
            point: CurvePoint {
                flow_m3_s: t.flow_m3_s,
                head_m: head,
            },
            power_w: t.power_w,
            specific_energy_kwh_m3: se,
            specific_energy_kwh_m3_m: (head > 0.0).then(|| se / head),
            wire_to_water: w2w,
            computed_head_m: computed,
            head_difference_m: head - computed,
        };
        self.measured_vs_computed(&r, key);
        Some(r)
    }

    /// `measured-vs-computed` when the test head and the computed head differ beyond the rule.
    fn measured_vs_computed(&mut self, t: &TestResult, key: &str) {
        let tol = self.rules.station.head_tolerance;
        if t.head_difference_m.abs() <= tol * t.computed_head_m.abs() {
            return;
        }
        let f = finding(
            Severity::Warning,
            "measured-vs-computed",
            self.cell(key),
            format!(
                "system {}: the test head {} at {} differs from the computed system head {} there by {} (rule: {:.0} %, common practice)",
                self.s.system,
                fig(t.point.head_m, "m", 2),
                fig(t.point.flow_m3_s * 3600.0, "m3/h", 1),
                fig(t.computed_head_m, "m", 2),
                fig_signed(t.head_difference_m, "m", 2),
                tol * 100.0
            ),
            "the register or the gauges are wrong: check the static head, the line lengths, sizes and fittings, valve positions, and the gauges' calibration and elevations",
        );
        self.found.push(f);
    }

    /// `low-wire-to-water` when a measured efficiency is below the rule.
    fn low_w2w(&mut self, w2w: f64, from: &str, key: &str) {
        let min = self.rules.station.min_wire_to_water;
        if w2w >= min {
            return;
        }
        let f = finding(
            Severity::Warning,
            "low-wire-to-water",
            self.cell(key),
            format!(
                "system {}: wire-to-water efficiency from {from} is {:.0} % (rule: at least {:.0} %, common practice)",
                self.s.system,
                w2w * 100.0,
                min * 100.0
            ),
            "the pump set turns little of its electrical input into head: check the pump's wear and clearances, its duty against its best-efficiency flow, the motor and drive; screening estimate, confirm by a site test",
        );
        self.found.push(f);
    }
}
