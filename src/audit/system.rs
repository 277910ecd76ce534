//! Pumped systems: required head against the pump, the system curve, the operating point on a
//! pump curve, NPSH available, and suction-side layout checks.
//!
//! A system is an ordered series of lines from the suction source to the delivery point, taken
//! from the `Systems` sheet (its `Lines` cell) or, failing that, from the `System` column of
//! `Lines` (input order, pump-suction lines first). See `docs/energy.md`.

use crate::sentence::{Sentence, fig};
use serde::Serialize;

use super::lines::line_heads_at;
use super::models::Models;
use super::{Audit, Finding, LineResult, Rules};
use crate::error::{CellRef, Severity};
use std::collections::HashSet;

use crate::ingest::rows::Control;
use crate::ingest::rows::shares::{Membership, memberships, share_of, systems_of_lines};
use crate::ingest::{Input, PumpCurveRow, Service, SystemRow, TableKind};
use crate::physics::G;
use crate::physics::fitting::Group;
use crate::physics::fluid::atmospheric_pressure_pa;

/// Fractions of duty flow at which the system curve is computed: 0 to 130 % in 10 % steps.
pub const CURVE_FRACTIONS: [f64; 14] = [
    0.0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1.0, 1.1, 1.2, 1.3,
];

/// Straight run wanted before a pump suction, in diameters (common practice, no source).
pub const SUCTION_STRAIGHT_DIAMETERS: f64 = 5.0;

/// Bores closer than this are taken as equal in the suction-size check, m.
pub const BORE_TOLERANCE_M: f64 = 0.5e-3;

/// One point of a head-versus-flow curve.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct CurvePoint {
    /// Flow, m³/s.
    pub flow_m3_s: f64,
    /// Head, m.
    pub head_m: f64,
}

/// One system's results.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct SystemResult {
    /// System id.
    pub system: String,
    /// Line ids in order, suction side first.
    pub lines: Vec<String>,
    /// Duty flow through the pump, m³/s.
    pub flow_m3_s: f64,
    /// Static head, m.
    pub static_head_m: f64,
    /// Sum of the lines' losses, each line at its own flow, m.
    pub losses_head_m: f64,
    /// Static head plus losses, m.
    pub required_head_m: f64,
    /// Pump head at duty flow, m (Systems sheet, else the pump curve at duty flow).
    pub pump_head_m: Option<f64>,
    /// Pump head minus required head, m.
    pub margin_m: Option<f64>,
    /// NPSH available at the pump suction at duty flow with the nominal suction losses, m.
    pub npsh_available_m: Option<f64>,
    /// NPSH required by the pump at duty flow, m.
    pub npsh_required_m: Option<f64>,
    /// The NPSH check at duty flow (suction losses at the high end of their K band).
    pub npsh_at_duty: Option<NpshCheck>,
    /// The NPSH check at the operating point, when a pump curve gives one.
    pub npsh_at_operating_point: Option<NpshCheck>,
    /// Every check made on the system, with its result, in the order shown.
    pub checks: Vec<SystemCheck>,
    /// The system's verdict in words ("passes the checks made", "FAILS duty", …).
    pub verdict: String,
    /// Site elevation used for the standard atmosphere, m.
    pub site_elevation_m: f64,
    /// Where the site elevation came from (Systems sheet, rules, or assumed sea level).
    pub site_elevation_basis: String,
    /// False when no static head was given (Static head, or Elevation change on the lines).
    pub static_head_given: bool,
    /// Required head from 0 to 130 % of duty flow, friction recomputed at each flow.
    pub curve: Vec<CurvePoint>,
    /// Where the pump curve crosses the system curve, when a pump curve is given.
    pub operating_point: Option<CurvePoint>,
    /// The lines this system shares with other systems (a common header), with its share of
    /// each and what that share costs (docs/energy.md §4a).
    pub shared_lines: Vec<SharedLine>,
    /// Running hours of the line whose flow is the duty flow (its `Hours per year`), used for
    /// the system's share of a shared line.
    #[serde(skip)]
    pub duty_hours_per_year: Option<f64>,
    /// How the flow is set (Systems `Control`; fixed speed when not given, then assumed).
    pub control: Control,
    /// Where the control came from ("Systems sheet", or assumed).
    pub control_basis: String,
    /// Theoretical minimum energy to lift one m³ one metre at the system's density
    /// (`ρ g / 3.6e6`), kWh/(m³·m).
    pub minimum_specific_energy_kwh_m3_m: f64,
    /// Share of the required head at duty lost in the piping (losses over required head).
    pub loss_share: Option<f64>,
    /// Metered performance (Systems `Metered energy` and `Metered volume`).
    pub measured: Option<super::station::Measured>,
    /// A site test point and what it shows (Systems `Test …` columns).
    pub test: Option<super::station::TestResult>,
    /// Best-efficiency point, efficiency at the operating point and preferred region, when the
    /// pump curve gives efficiency or power points.
    pub pump_efficiency: Option<super::station::PumpEfficiency>,
    /// What the suggestions on the system's lines save under its control.
    pub savings: Option<super::savings::SystemSavings>,
    /// Pump efficiency points, by flow (`head_m` holds the efficiency).
    #[serde(skip)]
    pub efficiency_curve: Vec<CurvePoint>,
    /// Where the static head came from.
    #[serde(skip)]
    pub static_head_basis: String,
    /// Where the pump head came from.
    #[serde(skip)]
    pub pump_head_basis: String,
    /// Pump curve points, by flow.
    #[serde(skip)]
    pub pump_curve: Vec<CurvePoint>,
    /// NPSH the margin rule asks for, m.
    #[serde(skip)]
    pub npsh_needed_m: Option<f64>,
    /// NPSH terms: source pressure, vapour pressure (Pa), density, suction level, suction losses (m).
    #[serde(skip)]
    pub npsh_terms: Option<NpshTerms>,
    /// True when the pump head is below the required head.
    #[serde(skip)]
    pub fails_duty: bool,
    /// True when NPSH available is below what the margin rule asks for, at duty or at the
    /// operating point.
    #[serde(skip)]
    pub fails_npsh: bool,
    /// What could not be checked, and why.
    #[serde(skip)]
    pub notes: Vec<Sentence>,
    /// Defaults that fed the NPSH figures (site elevation, atmosphere, temperature), in words.
    #[serde(skip)]
    pub defaults: Vec<Sentence>,
    /// Cells assumed for the system (the blank Site elevation cell, or the system's id cell when
    /// there is no such column), marked in the copy.
    #[serde(skip)]
    pub assumed: Vec<crate::ingest::rows::Assumed>,
}

/// One system's share of a line it shares with other systems (a common header).
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct SharedLine {
    /// Line id.
    pub line: String,
    /// Every system listing the line, in order of listing.
    pub systems: Vec<String>,
    /// This system's share of the line's flow, 0 to 1 (the shares of a line sum to 1).
    pub share: f64,
    /// Where the share came from: `Systems Share` or `duty flows` (`Q_i / ΣQ`).
    pub share_basis: &'static str,
    /// This system's part of the line's flow (share × the line's flow), m³/s.
    pub flow_m3_s: f64,
    /// Wire-to-water efficiency this share is costed at (None on a gravity line).
    pub efficiency: Option<f64>,
    /// Where that efficiency came from (Lines, Systems, pump curve, rules default).
    pub efficiency_basis: &'static str,
    /// Running hours this share is costed at (None on a gravity line).
    pub hours_per_year: Option<f64>,
    /// Energy of this share of the line's losses, kWh per year.
    pub annual_energy_kwh: Option<f64>,
    /// Cost of this share of the line's losses per year.
    pub annual_cost: Option<f64>,
}

/// Each system's share of the lines listed by two or more systems: the Systems `Share` cells
/// (scaled to sum to 1; `rows::shares` has checked them), else the systems' duty flows
/// (`share_i = Q_i / ΣQ`; equal shares when every duty flow is zero). The energy figures are
/// filled by the energy review.
fn split_shared_lines(
    ctx: &Ctx<'_>,
    members: &[Membership<'_>],
    by_line: &[(String, Vec<usize>)],
    results: &mut [SystemResult],
) {
    for (line, sys) in by_line.iter().filter(|(_, s)| s.len() > 1) {
        let Some(li) = ctx.audit.line_of(line) else {
            continue;
        };
        let given: Option<Vec<f64>> = sys
            .iter()
            .map(|&mi| share_of(members[mi].row, line, true))
            .collect();
        let (weights, share_basis) = match given {
            Some(g) => (g, "Systems Share"),
            None => (
                sys.iter().map(|&mi| results[mi].flow_m3_s).collect(),
                "duty flows",
            ),
        };
        let total: f64 = weights.iter().sum();
        let flow = ctx.audit.lines[li].flow_m3_s;
        for (&mi, w) in sys.iter().zip(&weights) {
            let share = if total > 0.0 {
                w / total
            } else {
                1.0 / sys.len() as f64
            };
            results[mi].shared_lines.push(SharedLine {
                line: line.clone(),
                systems: sys.iter().map(|&m| members[m].system.clone()).collect(),
                share,
                share_basis,
                flow_m3_s: share * flow,
                efficiency: None,
                efficiency_basis: "",
                hours_per_year: None,
                annual_energy_kwh: None,
                annual_cost: None,
            });
        }
    }
}

/// What a system check found.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Outcome {
    /// The check passed.
    Pass,
    /// The check failed.
    Fail,
    /// Data for the check is missing.
    NotChecked,
}

impl Outcome {
    /// The word shown in reports.
    pub fn label(self) -> &'static str {
        match self {
            Outcome::Pass => "pass",
            Outcome::Fail => "FAIL",
            Outcome::NotChecked => "not checked",
        }
    }
}

/// One check made on a system: what was compared, at which flow, and the result.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct SystemCheck {
    /// What was checked ("pump head at duty", "NPSH at duty", "NPSH at operating point",
    /// "static head").
    pub check: &'static str,
    /// Flow the check was made at, m³/s.
    pub flow_m3_s: f64,
    /// What the system has: pump head, or NPSH available with the suction losses at the high
    /// end of their band, m.
    pub available_m: Option<f64>,
    /// NPSH available with the nominal suction losses, m (NPSH checks only).
    pub nominal_m: Option<f64>,
    /// What it needs: required head, or the NPSH the margin rule asks for, m.
    pub needed_m: Option<f64>,
    /// The result.
    pub outcome: Outcome,
    /// Why a check was not made, or what it rests on.
    pub note: Sentence,
}

/// NPSH available against required at one flow.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct NpshCheck {
    /// Flow through the pump, m³/s.
    pub flow_m3_s: f64,
    /// Suction losses at this flow with nominal K, m.
    pub suction_losses_m: f64,
    /// Suction losses at this flow with every K at the high end of its band, m.
    pub suction_losses_high_m: f64,
    /// NPSH available with the nominal suction losses, m.
    pub available_nominal_m: f64,
    /// NPSH available with the high-band suction losses (what the margin rule is checked on), m.
    pub available_m: f64,
    /// NPSH required at this flow, m.
    pub required_m: Option<f64>,
    /// Where NPSH required came from.
    pub required_basis: String,
    /// What the margin rule asks for, m.
    pub needed_m: Option<f64>,
    /// True when `available_m` is below `needed_m`.
    pub fails: bool,
}

/// The terms of an NPSH-available calculation.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct NpshTerms {
    /// Absolute pressure on the source surface, Pa.
    pub source_pressure_pa: f64,
    /// Where it came from ("Systems sheet" or "standard atmosphere at site elevation").
    pub source_pressure_basis: &'static str,
    /// Vapour pressure at the suction temperature, Pa.
    pub vapour_pressure_pa: f64,
    /// Density, kg/m³.
    pub density_kg_m3: f64,
    /// Source liquid level above the pump centreline, m.
    pub suction_level_m: f64,
    /// Losses of the suction line(s) at duty flow, m.
    pub suction_losses_m: f64,
    /// The same with every fitting's K at the high end of its band, m.
    pub suction_losses_high_m: f64,
    /// Liquid temperature at the suction, °C.
    pub temperature_c: f64,
}

/// NPSH available at the pump suction.
///
/// # Formula
/// `NPSHa = (p_source − p_vapour)/(ρ g) + z_s − h_L,s` with z_s the source level above the pump
/// centreline (negative for a suction lift) and h_L,s the suction-side losses.
///
/// # Source
/// ISO 17769-1:2012, Liquid pumps and installation — Part 1, definition of NPSH (net positive
/// suction head) and of NPSH available (from memory); the energy balance of the Bernoulli
/// equation from the source surface to the pump inlet.
///
/// # Validity
/// Steady flow, source velocity negligible, absolute pressures, one liquid of density ρ.
pub fn npsh_available(
    source_pressure_pa: f64,
    vapour_pressure_pa: f64,
    density_kg_m3: f64,
    suction_level_m: f64,
    suction_losses_m: f64,
) -> f64 {
    (source_pressure_pa - vapour_pressure_pa) / (density_kg_m3 * G) + suction_level_m
        - suction_losses_m
}

/// NPSH the margin rule asks for: `max(ratio × NPSHr, NPSHr + minimum margin)`
/// (rules `[npsh]`; defaults 1.1 and 0.6 m are common practice, no source).
pub fn npsh_needed(npsh_required_m: f64, margin_ratio: f64, margin_min_m: f64) -> f64 {
    (margin_ratio * npsh_required_m).max(npsh_required_m + margin_min_m)
}

/// Linear interpolation on curve points sorted by flow; None outside their flow range.
pub fn interpolate(points: &[CurvePoint], flow_m3_s: f64) -> Option<f64> {
    let first = points.first()?;
    if points.len() == 1 {
        return ((flow_m3_s - first.flow_m3_s).abs() <= 1e-12 * first.flow_m3_s.abs().max(1e-12))
            .then_some(first.head_m);
    }
    points
        .windows(2)
        .find(|w| flow_m3_s >= w[0].flow_m3_s && flow_m3_s <= w[1].flow_m3_s)
        .map(|w| {
            let span = w[1].flow_m3_s - w[0].flow_m3_s;
            if span > 0.0 {
                w[0].head_m + (w[1].head_m - w[0].head_m) * (flow_m3_s - w[0].flow_m3_s) / span
            } else {
                w[0].head_m
            }
        })
}

/// The flow where the pump curve (linear between its points) meets a system head function,
/// solved by bisection to 1e-10 relative in flow; None when they do not cross in the pump
/// curve's flow range.
pub fn operating_point(
    pump: &[CurvePoint],
    system_head: impl Fn(f64) -> f64,
) -> Option<CurvePoint> {
    let (lo, hi) = (pump.first()?.flow_m3_s, pump.last()?.flow_m3_s);
    let gap = |q: f64| interpolate(pump, q).map(|h| h - system_head(q));
    const STEPS: usize = 200;
    let mut a = lo;
    let mut ga = gap(a)?;
    if ga == 0.0 {
        return Some(CurvePoint {
            flow_m3_s: a,
            head_m: system_head(a),
        });
    }
    for i in 1..=STEPS {
        let b = lo + (hi - lo) * i as f64 / STEPS as f64;
        let gb = gap(b)?;
        if gb == 0.0 || ga.signum() != gb.signum() {
            let (mut x0, mut x1, mut g0) = (a, b, ga);
            for _ in 0..200 {
                let m = 0.5 * (x0 + x1);
                let gm = gap(m)?;
                if gm == 0.0 || (x1 - x0) <= 1e-10 * x1.abs().max(1e-12) {
                    x0 = m;
                    x1 = m;
                    break;
                }
                if gm.signum() == g0.signum() {
                    x0 = m;
                    g0 = gm;
                } else {
                    x1 = m;
                }
            }
            let q = 0.5 * (x0 + x1);
            return Some(CurvePoint {
                flow_m3_s: q,
                head_m: system_head(q),
            });
        }
        a = b;
        ga = gb;
    }
    None
}

/// Required head of a system when every line carries `fraction` of its own duty flow:
/// static head plus each line's losses recomputed at that flow (friction factors and Re-dependent
/// K re-evaluated; not a Q² scaling).
/// `models` are the fittings' models from [`super::lines::compute`].
pub fn required_head_at(
    audit: &Audit,
    models: &Models,
    lines: &[usize],
    static_head_m: f64,
    fraction: f64,
) -> f64 {
    static_head_m
        + lines
            .iter()
            .map(|&i| {
                line_heads_at(
                    audit,
                    models,
                    &audit.lines[i],
                    audit.lines[i].flow_m3_s * fraction,
                )
                .total_head_m
            })
            .sum::<f64>()
}

/// Where a system's findings and assumed values point: its Systems row, else the first Lines row
/// naming it.
struct Place<'a> {
    input: &'a Input,
    row: Option<&'a SystemRow>,
    id: &'a str,
}

impl Place<'_> {
    /// The cell of column `key` on the Systems row, or the row's System cell when the sheet has no
    /// such column; None without a Systems row.
    fn system(&self, key: &str) -> Option<CellRef> {
        let r = self.row?;
        let layout = self.input.layout_on(TableKind::Systems, &r.origin.sheet);
        let col = layout
            .and_then(|l| l.column(key).or(l.column("system")))
            .map_or(0, |c| c.col);
        Some(CellRef::new(&r.origin.sheet, r.origin.row, col))
    }

    /// The System cell of the first Lines row naming the system.
    fn line(&self) -> Option<CellRef> {
        let first = self
            .input
            .lines
            .iter()
            .find(|l| l.system.as_deref() == Some(self.id))?;
        Some(CellRef::new(
            &first.origin.sheet,
            first.origin.row,
            self.input
                .column_of(TableKind::Lines, &first.origin.sheet, "system"),
        ))
    }

    fn at(&self, key: &str) -> Option<CellRef> {
        self.system(key).or_else(|| self.line())
    }

    /// True when the Systems sheet has column `key`.
    fn has_column(&self, key: &str) -> bool {
        self.row.is_some_and(|r| {
            self.input
                .layout_on(TableKind::Systems, &r.origin.sheet)
                .is_some_and(|l| l.column(key).is_some())
        })
    }
}

/// What the system computation reads.
struct Ctx<'a> {
    input: &'a Input,
    rules: &'a Rules,
    audit: &'a Audit,
    models: &'a Models,
}

/// Compute every system and raise `pump-head-short`, `static-head-missing`, `npsh-margin` and
/// `suction-layout`. `models` are the fittings' models, in the order of `audit.fittings`.
pub fn apply(input: &Input, rules: &Rules, audit: &mut Audit, models: &Models) {
    let mut found: Vec<Finding> = Vec::new();
    let results: Vec<SystemResult> = {
        let ctx = Ctx {
            input,
            rules,
            audit,
            models,
        };
        let members = memberships(input);
        let by_line = systems_of_lines(&members);
        let shared: HashSet<&str> = by_line
            .iter()
            .filter(|(_, s)| s.len() > 1)
            .map(|(l, _)| l.as_str())
            .collect();
        let mut results: Vec<SystemResult> = members
            .iter()
            .map(|m| one_system(&ctx, m, &shared, &mut found))
            .collect();
        split_shared_lines(&ctx, &members, &by_line, &mut results);
        results
    };
    for f in found {
        if !audit
            .findings
            .iter()
            .any(|g| g.code == f.code && g.cell == f.cell && g.message == f.message)
        {
            audit.findings.push(f);
        }
    }
    audit.systems = results;
}

/// Static head, where it came from, and whether it was given at all.
fn static_head(input: &Input, names: &[String], row: Option<&SystemRow>) -> (f64, String, bool) {
    let given_dz: Vec<f64> = names
        .iter()
        .filter_map(|n| {
            input
                .lines
                .iter()
                .find(|l| l.line == *n)
                .and_then(|l| l.elevation_change_m)
        })
        .collect();
    match row.and_then(|r| r.static_head_m) {
        Some(h) => (h, "Systems sheet".to_string(), true),
        None if !given_dz.is_empty() => (
            given_dz.iter().sum(),
            "sum of the lines' Elevation change (pipe ends, not liquid levels)".to_string(),
            true,
        ),
        None => (0.0, "not given: taken as 0".to_string(), false),
    }
}

/// The line whose flow is the flow through the pump: the first pump-suction or pump-discharge
/// line, else the first line; a line the system shares with another (a header carrying several
/// pumps' flow) only when no line of its own qualifies.
fn duty_line(audit: &Audit, idx: &[usize], shared: &HashSet<&str>) -> Option<usize> {
    let pump_line = |i: &&usize| {
        matches!(
            audit.lines[**i].service,
            Service::PumpSuction | Service::PumpDischarge
        )
    };
    let own = |i: &&usize| !shared.contains(audit.lines[**i].line.as_str());
    idx.iter()
        .filter(own)
        .find(pump_line)
        .or_else(|| idx.iter().find(pump_line))
        .or_else(|| idx.iter().find(own))
        .or(idx.first())
        .copied()
}

/// `static-head-missing`: no static head anywhere, so 0 m was taken.
fn static_head_missing(place: &Place<'_>) -> Finding {
    Finding {
        severity: Severity::Warning,
        code: "static-head-missing",
        line: None,
        tag: None,
        cell: place.at("static_head"),
        message: format!(
            "system {}: no static head given (Static head in Systems, or Elevation change in Lines): taken as 0, so its required head and duty check leave out the lift",
            place.id
        )
        .into(),
        action: "give the static head (delivery liquid level minus source liquid level, plus any pressure difference as head) in the Systems sheet".into(),
    }
}

/// Points of one column of the system's pump curve, by flow.
fn pump_points(
    input: &Input,
    id: &str,
    value: impl Fn(&PumpCurveRow) -> Option<f64>,
) -> Vec<CurvePoint> {
    let mut points: Vec<CurvePoint> = input
        .pump_curves
        .iter()
        .filter(|p| p.system == id)
        .filter_map(|p| {
            value(p).map(|v| CurvePoint {
                flow_m3_s: p.flow_m3_s,
                head_m: v,
            })
        })
        .collect();
    points.sort_by(|a, b| a.flow_m3_s.total_cmp(&b.flow_m3_s));
    points
}

fn one_system(
    ctx: &Ctx<'_>,
    member: &Membership<'_>,
    shared: &HashSet<&str>,
    found: &mut Vec<Finding>,
) -> SystemResult {
    let (input, audit) = (ctx.input, ctx.audit);
    let (id, names, row) = (member.system.clone(), &member.lines, member.row);
    let place = Place {
        input,
        row,
        id: &id,
    };
    let mut notes = Vec::new();
    let idx = audited_lines(audit, names, &mut notes);
    let duty_line = duty_line(audit, &idx, shared);
    let duty = duty_line.map_or(0.0, |i| audit.lines[i].flow_m3_s);
    let duty_hours_per_year = duty_line.and_then(|i| {
        let name = &audit.lines[i].line;
        input.lines.iter().find(|l| l.line == *name)?.hours_per_year
    });
    let (static_head_m, static_head_basis, static_head_given) = static_head(input, names, row);
    if !static_head_given {
        notes.push("no static head given (Static head in Systems, or Elevation change in Lines): taken as 0, so the required head leaves out the lift".into());
        found.push(static_head_missing(&place));
    }
    let losses_head_m: f64 = idx.iter().map(|&i| audit.lines[i].total_head_m).sum();
    let required_head_m = static_head_m + losses_head_m;
    let head_at = |x: f64| required_head_at(audit, ctx.models, &idx, static_head_m, x);
    let curve: Vec<CurvePoint> = CURVE_FRACTIONS
        .iter()
        .map(|&x| CurvePoint {
            flow_m3_s: duty * x,
            head_m: head_at(x),
        })
        .collect();
    let pump_curve = pump_points(input, &id, |p| Some(p.head_m));
    let (pump_head_m, pump_head_basis) = pump_head(row, &pump_curve, duty, &mut notes);
    let operating_point = crossing(&pump_curve, duty, head_at, &mut notes);
    let margin_m = pump_head_m.map(|p| p - required_head_m);
    let fails_duty = margin_m.is_some_and(|m| m < 0.0);
    if let Some(p) = pump_head_m.filter(|_| fails_duty) {
        found.push(pump_head_short(
            &place,
            duty,
            p,
            (static_head_m, losses_head_m),
        ));
    }

    let suction: Vec<usize> = idx
        .iter()
        .copied()
        .take_while(|&i| audit.lines[i].service == Service::PumpSuction)
        .collect();
    let npsh = npsh(
        ctx,
        &place,
        &suction,
        duty,
        operating_point,
        &mut notes,
        found,
    );
    suction_layout(input, audit, &idx, &suction, found);

    let mut checks = vec![head_check(
        duty,
        pump_head_m,
        required_head_m,
        static_head_given,
    )];
    checks.extend(npsh.checks);
    let fails_npsh = checks
        .iter()
        .any(|c| c.check.starts_with("NPSH") && c.outcome == Outcome::Fail);
    let verdict = verdict(&checks, static_head_given);
    SystemResult {
        system: id,
        lines: idx.iter().map(|&i| audit.lines[i].line.clone()).collect(),
        flow_m3_s: duty,
        static_head_m,
        losses_head_m,
        required_head_m,
        pump_head_m,
        margin_m,
        npsh_available_m: npsh.at_duty.as_ref().map(|c| c.available_nominal_m),
        npsh_required_m: npsh.required_at_duty,
        npsh_at_duty: npsh.at_duty,
        npsh_at_operating_point: npsh.at_operating_point,
        checks,
        verdict,
        site_elevation_m: npsh.site_elevation_m,
        site_elevation_basis: npsh.site_elevation_basis,
        static_head_given,
        curve,
        operating_point,
        shared_lines: Vec::new(),
        duty_hours_per_year,
        control: Control::Fixed,
        control_basis: String::new(),
        minimum_specific_energy_kwh_m3_m: f64::NAN,
        loss_share: None,
        measured: None,
        test: None,
        pump_efficiency: None,
        savings: None,
        efficiency_curve: Vec::new(),
        static_head_basis,
        pump_head_basis,
        pump_curve,
        npsh_needed_m: npsh.needed_at_duty,
        npsh_terms: npsh.terms,
        fails_duty,
        fails_npsh,
        notes,
        defaults: npsh.defaults,
        assumed: npsh.assumed,
    }
}

/// Indices of the audited lines among a system's `names`; a note for each name that is not
/// audited (left out of the system's head).
fn audited_lines(audit: &Audit, names: &[String], notes: &mut Vec<Sentence>) -> Vec<usize> {
    let mut idx = Vec::new();
    for n in names {
        match audit.line_of(n) {
            Some(i) => idx.push(i),
            None => notes.push(
                format!("line {n} is not among the audited lines: left out of the system's head")
                    .into(),
            ),
        }
    }
    idx
}

/// Where the pump curve crosses the system curve (`head_at`: required head at a fraction of
/// the `duty` flow), when there is a duty flow and a curve of two points or more; a note when
/// they do not cross within the curve's flow range.
fn crossing(
    pump_curve: &[CurvePoint],
    duty: f64,
    head_at: impl Fn(f64) -> f64,
    notes: &mut Vec<Sentence>,
) -> Option<CurvePoint> {
    let usable = duty > 0.0 && pump_curve.len() >= 2;
    if !usable {
        return None;
    }
    let op = operating_point(pump_curve, |q| head_at(q / duty));
    if op.is_none() {
        notes.push("the pump curve does not cross the system curve within its flow range".into());
    }
    op
}

/// Pump head at duty and where it came from: the Systems sheet, else the pump curve at the duty
/// flow, else none (with a note).
fn pump_head(
    row: Option<&SystemRow>,
    pump_curve: &[CurvePoint],
    duty: f64,
    notes: &mut Vec<Sentence>,
) -> (Option<f64>, String) {
    if let Some(h) = row.and_then(|r| r.pump_head_m) {
        return (Some(h), "Systems sheet".to_string());
    }
    match interpolate(pump_curve, duty) {
        Some(h) => (Some(h), "Pump curve at duty flow".to_string()),
        None => {
            notes.push("no pump head at duty flow (Pump head in Systems, or a Pump curve spanning the duty flow): duty not checked".into());
            (None, String::new())
        }
    }
}

/// `pump-head-short`: the pump head `p` at duty is below static head plus losses (`heads`).
fn pump_head_short(place: &Place<'_>, duty: f64, p: f64, heads: (f64, f64)) -> Finding {
    let (static_head_m, losses_head_m) = heads;
    let required_head_m = static_head_m + losses_head_m;
    Finding {
        severity: Severity::Error,
        code: "pump-head-short",
        line: None,
        tag: None,
        cell: place.at("pump_head"),
        message: format!(
            "system {}: the pump gives {} at {} but the system needs {} (static {} + losses {}): short by {}",
            place.id,
            fig(p, "m", 2),
            fig(duty * 3600.0, "m3/h", 1),
            fig(required_head_m, "m", 2),
            fig(static_head_m, "m", 2),
            fig(losses_head_m, "m", 2),
            fig(required_head_m - p, "m", 2)
        )
        .into(),
        action: "the pump cannot deliver the duty flow: cut the losses (see Fitting ranking), check the static head, or re-rate the pump with its maker's curve".into(),
    }
}

/// The pump-head check: pass when the pump head reaches the required head, fail when it does
/// not; not checked without a pump head, or when it passes only because no static head was given.
fn head_check(
    duty: f64,
    pump_head_m: Option<f64>,
    required_head_m: f64,
    static_head_given: bool,
) -> SystemCheck {
    let fails = pump_head_m.is_some_and(|p| p < required_head_m);
    SystemCheck {
        check: "pump head at duty",
        flow_m3_s: duty,
        available_m: pump_head_m,
        nominal_m: None,
        needed_m: Some(required_head_m),
        outcome: match pump_head_m {
            _ if fails => Outcome::Fail,
            Some(_) if static_head_given => Outcome::Pass,
            _ => Outcome::NotChecked,
        },
        note: match (pump_head_m, static_head_given) {
            (None, _) => "no pump head at duty flow".into(),
            (Some(_), false) => Sentence::new(format!(
                "static head not given (taken as {})",
                fig(0.0, "m", 0)
            )),
            (Some(_), true) => Sentence::default(),
        },
    }
}

/// The verdict in words: what fails, else whether everything checked passed.
pub fn verdict(checks: &[SystemCheck], static_head_given: bool) -> String {
    let failed = |name: &str| {
        checks
            .iter()
            .any(|c| c.check == name && c.outcome == Outcome::Fail)
    };
    let mut fails = Vec::new();
    if failed("pump head at duty") {
        fails.push("duty");
    }
    match (failed("NPSH at duty"), failed("NPSH at operating point")) {
        (true, true) => fails.push("NPSH margin at duty and operating point"),
        (true, false) => fails.push("NPSH margin"),
        (false, true) => fails.push("NPSH margin at the operating point"),
        (false, false) => {}
    }
    let missing = if static_head_given {
        ""
    } else {
        "static head not given"
    };
    if !fails.is_empty() {
        let v = format!("FAILS {}", fails.join(" and "));
        return if missing.is_empty() {
            v
        } else {
            format!("{v}; {missing}")
        };
    }
    if !missing.is_empty() {
        return missing.to_string();
    }
    if checks.iter().any(|c| c.outcome == Outcome::Pass) {
        "passes the checks made".into()
    } else {
        "not checked (data missing)".into()
    }
}

/// The NPSH side of a system.
struct NpshOutcome {
    terms: Option<NpshTerms>,
    at_duty: Option<NpshCheck>,
    at_operating_point: Option<NpshCheck>,
    required_at_duty: Option<f64>,
    needed_at_duty: Option<f64>,
    checks: Vec<SystemCheck>,
    site_elevation_m: f64,
    site_elevation_basis: String,
    defaults: Vec<Sentence>,
    assumed: Vec<crate::ingest::rows::Assumed>,
}

/// Site elevation: the Systems cell, else the rules' value when set, else sea level (assumed).
fn site_elevation(rules: &Rules, row: Option<&SystemRow>) -> (f64, String, bool) {
    match row.and_then(|r| r.site_elevation_m) {
        Some(z) => (z, "Systems sheet".into(), false),
        None if rules.npsh.site_elevation_m != 0.0 => (
            rules.npsh.site_elevation_m,
            "rules [npsh] site_elevation_m".into(),
            false,
        ),
        None => (
            0.0,
            "assumed: sea level, no Site elevation given".into(),
            true,
        ),
    }
}

/// NPSH available at duty and at the operating point against NPSH required with the margin rule;
/// raises `npsh-margin` for each check that fails.
fn npsh(
    ctx: &Ctx<'_>,
    place: &Place<'_>,
    suction: &[usize],
    duty: f64,
    op: Option<CurvePoint>,
    notes: &mut Vec<Sentence>,
    found: &mut Vec<Finding>,
) -> NpshOutcome {
    let (input, rules, audit, row) = (ctx.input, ctx.rules, ctx.audit, place.row);
    let id = place.id;
    let (site_elevation_m, site_elevation_basis, elevation_assumed) = site_elevation(rules, row);
    let mut out = NpshOutcome {
        terms: None,
        at_duty: None,
        at_operating_point: None,
        required_at_duty: None,
        needed_at_duty: None,
        checks: Vec::new(),
        site_elevation_m,
        site_elevation_basis,
        defaults: Vec::new(),
        assumed: Vec::new(),
    };
    let npshr_curve = pump_points(input, id, |p| p.npsh_required_m);
    let (required_at_duty, duty_basis) = npshr_at_duty(row, &npshr_curve, duty);
    out.required_at_duty = required_at_duty;
    let needed = |r: f64| npsh_needed(r, rules.npsh.margin_ratio, rules.npsh.margin_min_m);
    out.needed_at_duty = required_at_duty.map(needed);
    let not_checked = |check: &'static str, flow: f64, note: &Sentence| SystemCheck {
        check,
        flow_m3_s: flow,
        available_m: None,
        nominal_m: None,
        needed_m: None,
        outcome: Outcome::NotChecked,
        note: note.clone(),
    };
    if suction.is_empty() {
        if required_at_duty.is_some() {
            let why = Sentence::from(
                "no pump-suction line leads the system: NPSH available not computed",
            );
            out.checks.push(not_checked("NPSH at duty", duty, &why));
            notes.push(why);
        }
        return out;
    }
    let first = &audit.lines[suction[0]];
    let (level, pv) = match suction_inputs(row, first) {
        Ok(inputs) => inputs,
        Err(why) => {
            out.checks.push(not_checked("NPSH at duty", duty, &why));
            notes.push(why);
            return out;
        }
    };
    let (ps, basis) = source_pressure(place, &mut out, elevation_assumed);
    if let Some(d) = assumed_temperature(input, first) {
        out.defaults.push(d);
    }
    let terms = NpshTerms {
        source_pressure_pa: ps,
        source_pressure_basis: basis,
        vapour_pressure_pa: pv,
        density_kg_m3: first.density_kg_m3,
        suction_level_m: level,
        suction_losses_m: suction.iter().map(|&i| audit.lines[i].total_head_m).sum(),
        suction_losses_high_m: suction
            .iter()
            .map(|&i| audit.lines[i].total_head_high_m)
            .sum(),
        temperature_c: first.temperature_c,
    };
    out.terms = Some(terms);
    let check_at =
        |flow: f64, losses: f64, losses_high: f64, required: Option<f64>, basis: String| {
            let head = |h: f64| npsh_available(ps, pv, terms.density_kg_m3, level, h);
            let available_m = head(losses_high);
            let needed_m = required.map(needed);
            NpshCheck {
                flow_m3_s: flow,
                suction_losses_m: losses,
                suction_losses_high_m: losses_high,
                available_nominal_m: head(losses),
                available_m,
                required_m: required,
                required_basis: basis,
                needed_m,
                fails: needed_m.is_some_and(|n| available_m < n),
            }
        };
    let duty_check = check_at(
        duty,
        terms.suction_losses_m,
        terms.suction_losses_high_m,
        required_at_duty,
        duty_basis,
    );
    out.checks.push(npsh_check_row("NPSH at duty", &duty_check));
    npsh_finding(ctx, place, first, &duty_check, "at duty", found);
    out.at_duty = Some(duty_check);
    if let Some(op) = op.filter(|_| duty > 0.0) {
        let (losses, high) = suction_losses_at(ctx, suction, op.flow_m3_s / duty);
        let (required, basis) = npshr_at_operating(&npshr_curve, op.flow_m3_s, required_at_duty);
        let c = check_at(op.flow_m3_s, losses, high, required, basis);
        out.checks
            .push(npsh_check_row("NPSH at operating point", &c));
        npsh_finding(ctx, place, first, &c, "at the operating point", found);
        out.at_operating_point = Some(c);
    }
    out
}

/// NPSH required at the duty flow and where it came from: the Systems sheet, else the pump
/// curve's NPSH required interpolated at the duty flow, else none.
fn npshr_at_duty(
    row: Option<&SystemRow>,
    npshr_curve: &[CurvePoint],
    duty: f64,
) -> (Option<f64>, String) {
    match row.and_then(|r| r.npsh_required_m) {
        Some(r) => (Some(r), "Systems sheet".to_string()),
        None => match interpolate(npshr_curve, duty) {
            Some(r) => (Some(r), "Pump curve at duty flow".to_string()),
            None => (None, String::new()),
        },
    }
}

/// The suction level (Systems sheet) and the vapour pressure of the first suction line's fluid;
/// the reason NPSH available cannot be computed when one is missing.
fn suction_inputs(row: Option<&SystemRow>, first: &LineResult) -> Result<(f64, f64), Sentence> {
    let Some(level) = row.and_then(|r| r.suction_level_m) else {
        return Err("no Suction level given: NPSH available not computed".into());
    };
    let Some(pv) = first.vapour_pressure_pa else {
        return Err(format!(
            "fluid of line {} has no vapour pressure: NPSH available not computed",
            first.line
        )
        .into());
    };
    Ok((level, pv))
}

/// A default to list when the first suction line's temperature was assumed (it sets the
/// vapour pressure).
fn assumed_temperature(input: &Input, first: &LineResult) -> Option<Sentence> {
    let line = input.lines.iter().find(|l| l.line == first.line)?;
    line.assumed
        .iter()
        .any(|a| a.key == "temperature")
        .then(|| {
            Sentence::new(format!(
                "temperature {} on suction line {} (Temperature blank: assumed)",
                fig(first.temperature_c, "°C", 1),
                first.line
            ))
        })
}

/// Absolute pressure on the source surface and where it came from: `Source pressure`, else the
/// standard atmosphere at the site elevation, listed among the defaults (and the elevation
/// marked assumed when it was).
fn source_pressure(
    place: &Place<'_>,
    out: &mut NpshOutcome,
    elevation_assumed: bool,
) -> (f64, &'static str) {
    if let Some(p) = place.row.and_then(|r| r.source_pressure_pa) {
        return (p, "Systems sheet");
    }
    let z = out.site_elevation_m;
    let p = atmospheric_pressure_pa(z);
    if elevation_assumed {
        out.defaults.push(Sentence::new(format!(
            "site elevation {} assumed (sea level; no Site elevation given)",
            fig(0.0, "m", 0)
        )));
        let key = if place.has_column("site_elevation") {
            "site_elevation"
        } else {
            "system"
        };
        if let Some(cell) = place.system(key) {
            out.assumed.push(crate::ingest::rows::Assumed {
                cell,
                key,
                what: Sentence::new(format!(
                    "site elevation {} (sea level): standard atmosphere {} in NPSH available",
                    fig(0.0, "m", 0),
                    fig(p / 1e3, "kPa", 3)
                )),
            });
        }
    }
    out.defaults.push(Sentence::new(format!(
        "source pressure {}, the ISO 2533 standard atmosphere at {} (no Source pressure given)",
        fig(p / 1e3, "kPa", 3),
        fig(z, "m", 0)
    )));
    (p, "standard atmosphere at site elevation")
}

/// Suction losses (nominal, high end of the K bands) with every suction line at `fraction` of its
/// duty flow, friction and Re-dependent K recomputed.
fn suction_losses_at(ctx: &Ctx<'_>, suction: &[usize], fraction: f64) -> (f64, f64) {
    suction.iter().fold((0.0, 0.0), |(n, h), &i| {
        let l = &ctx.audit.lines[i];
        let at = line_heads_at(ctx.audit, ctx.models, l, l.flow_m3_s * fraction);
        (n + at.total_head_m, h + at.total_head_high_m)
    })
}

/// NPSH required at the operating point: the Pump curve's value there, else the duty value (said
/// so), else none.
fn npshr_at_operating(
    npshr_curve: &[CurvePoint],
    flow_m3_s: f64,
    at_duty: Option<f64>,
) -> (Option<f64>, String) {
    match (interpolate(npshr_curve, flow_m3_s), at_duty) {
        (Some(r), _) => (Some(r), "Pump curve at the operating point".into()),
        (None, Some(r)) => (
            Some(r),
            "the duty value (no NPSH required on the Pump curve at this flow; NPSH required usually rises with flow, so this may understate it)".into(),
        ),
        (None, None) => (None, String::new()),
    }
}

/// The checks-table row of one NPSH check.
fn npsh_check_row(check: &'static str, c: &NpshCheck) -> SystemCheck {
    SystemCheck {
        check,
        flow_m3_s: c.flow_m3_s,
        available_m: Some(c.available_m),
        nominal_m: Some(c.available_nominal_m),
        needed_m: c.needed_m,
        outcome: match (c.fails, c.needed_m) {
            (true, _) => Outcome::Fail,
            (false, Some(_)) => Outcome::Pass,
            (false, None) => Outcome::NotChecked,
        },
        note: if c.required_m.is_none() {
            "no NPSH required given".into()
        } else if c.required_basis.starts_with("the duty value") {
            "NPSH required: duty value".into()
        } else {
            Sentence::default()
        },
    }
}

/// `npsh-margin` for a failing NPSH check: an error below NPSH required, a warning inside the
/// margin.
fn npsh_finding(
    ctx: &Ctx<'_>,
    place: &Place<'_>,
    first: &super::LineResult,
    c: &NpshCheck,
    when: &str,
    found: &mut Vec<Finding>,
) {
    let (Some(r), Some(n), true) = (c.required_m, c.needed_m, c.fails) else {
        return;
    };
    let a = c.available_m;
    let npsh = &ctx.rules.npsh;
    found.push(Finding {
        severity: if a < r { Severity::Error } else { Severity::Warning },
        code: "npsh-margin",
        line: Some(first.line.clone()),
        tag: None,
        cell: place.at("npsh_required"),
        message: format!(
            "system {}: {when} ({}) NPSH available is {} with the suction losses at the high end of their K band ({} nominal) against NPSH required {} ({}); the margin rule asks for {} (max of {:.2} × NPSHr and NPSHr + {})",
            place.id,
            fig(c.flow_m3_s * 3600.0, "m3/h", 1),
            fig(a, "m", 2),
            fig(c.available_nominal_m, "m", 2),
            fig(r, "m", 2),
            c.required_basis,
            fig(n, "m", 2),
            npsh.margin_ratio,
            fig(npsh.margin_min_m, "m", 2)
        )
        .into(),
        action: if a < r {
            "the pump will cavitate here: raise the suction level, cut the suction losses or choose a pump with lower NPSH required; confirm with the pump maker's NPSH curve and site measurement"
        } else {
            "cavitation margin is thin: cut the suction losses or raise the suction level; confirm NPSHr with the pump maker's test curve"
        }
        .into(),
    });
}

/// `suction-layout`: an elbow or reducer listed last on the suction side (at the pump inlet), and
/// a suction bore smaller than the run after it.
fn suction_layout(
    input: &Input,
    audit: &Audit,
    idx: &[usize],
    suction: &[usize],
    found: &mut Vec<Finding>,
) {
    let Some(&last) = suction.last() else { return };
    let line = &audit.lines[last];
    let at_pump = line
        .fittings
        .iter()
        .map(|&i| &audit.fittings[i])
        .max_by_key(|f| (f.cell.sheet.clone(), f.row));
    if let Some(f) = at_pump {
        let group = f.group;
        let what = match group {
            Group::Elbow | Group::Bend => Some(("an elbow or bend at the pump inlet gives the impeller uneven flow", format!(
                "provide about {SUCTION_STRAIGHT_DIAMETERS:.0} pipe diameters of straight pipe before the pump (common practice, no source), or confirm the layout on the drawings"
            ))),
            Group::Tee => Some(("a tee at the pump inlet gives the impeller uneven flow", format!("provide about {SUCTION_STRAIGHT_DIAMETERS:.0} pipe diameters of straight pipe before the pump (common practice, no source)"))),
            Group::AreaChange => Some(("a reducer at the pump inlet can trap air if it is concentric", "use an eccentric reducer, flat side up (common practice, no source); confirm on the drawings".to_string())),
            _ => None,
        };
        if let Some((why, action)) = what {
            found.push(Finding {
                severity: Severity::Warning,
                code: "suction-layout",
                line: Some(line.line.clone()),
                tag: (!f.tag.is_empty()).then(|| f.tag.to_string()),
                cell: Some(f.cell.clone()),
                message: format!("{} ({}) is the last item listed on suction line {}, i.e. at the pump inlet: {why}", if f.tag.is_empty() { &f.item } else { &f.tag }, f.kind, line.line).into(),
                action,
            });
        }
    }
    // Bores along the suction side, then the first run after it.
    let mut runs: Vec<usize> = suction
        .iter()
        .flat_map(|&i| audit.lines[i].runs.iter().copied())
        .collect();
    if let Some(next) = idx
        .iter()
        .skip_while(|i| !suction.contains(i))
        .find(|i| !suction.contains(i))
        .and_then(|&i| audit.lines[i].runs.first().copied())
    {
        runs.push(next);
    }
    for w in runs.windows(2) {
        let (a, b) = (&audit.runs[w[0]], &audit.runs[w[1]]);
        let a_is_suction = suction.iter().any(|&i| audit.lines[i].line == a.line);
        if a_is_suction && a.inner_diameter_m + BORE_TOLERANCE_M < b.inner_diameter_m {
            found.push(Finding {
                severity: Severity::Warning,
                code: "suction-layout",
                line: Some(a.line.clone()),
                tag: None,
                cell: Some(CellRef::new(&a.cell.sheet, a.row, input.column_of(TableKind::Pipes, &a.cell.sheet, "size"))),
                message: format!(
                    "suction run of line {} has a bore of {}, smaller than the {} of the run after it (line {})",
                    a.line,
                    fig(a.inner_diameter_m * 1e3, "mm", 1),
                    fig(b.inner_diameter_m * 1e3, "mm", 1),
                    b.line
                )
                .into(),
                action: "a suction line is normally at least the size of what follows it: check the size, the suction velocity and NPSH".into(),
            });
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn check(check: &'static str, outcome: Outcome) -> SystemCheck {
        SystemCheck {
            check,
            flow_m3_s: 0.01,
            available_m: None,
            nominal_m: None,
            needed_m: None,
            outcome,
            note: Sentence::default(),
        }
    }

    #[test]
    fn verdict_names_what_fails_and_never_passes_without_a_static_head() {
        use Outcome::*;
        let v = |c: &[SystemCheck], given| verdict(c, given);
        let head = |o| check("pump head at duty", o);
        let duty = |o| check("NPSH at duty", o);
        let op = |o| check("NPSH at operating point", o);
        assert_eq!(
            v(&[head(Pass), duty(Pass), op(Pass)], true),
            "passes the checks made"
        );
        assert_eq!(
            v(&[head(NotChecked), duty(Pass)], false),
            "static head not given"
        );
        assert_eq!(
            v(&[head(Fail), duty(Fail)], true),
            "FAILS duty and NPSH margin"
        );
        assert_eq!(
            v(&[head(Pass), duty(Pass), op(Fail)], true),
            "FAILS NPSH margin at the operating point"
        );
        assert_eq!(
            v(&[head(Fail), duty(Pass)], false),
            "FAILS duty; static head not given"
        );
        assert_eq!(
            v(&[head(Pass), duty(Fail), op(Fail)], true),
            "FAILS NPSH margin at duty and operating point"
        );
        assert_eq!(v(&[head(NotChecked)], true), "not checked (data missing)");
    }
}
