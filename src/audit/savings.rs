//! What each saving is worth under its system's flow control (docs/energy.md §10): the case per
//! suggestion, the fixed-speed operating point with the loss removed, the speed-control figures
//! by the affinity laws, the system totals and the present value of each saving.

use serde::Serialize;
use std::collections::HashMap;

use super::models::Models;
use super::pump;
use super::station::density;
use super::system::{CurvePoint, SystemResult, interpolate, required_head_at};
use super::{Audit, Rules};
use crate::ingest::rows::Control;
use crate::physics::fitting::Group;
use crate::sentence::{Sentence, fig};

/// Fixed-speed suggestions re-solved per system, the largest head savings first; the rest report
/// no re-solved point (each re-solve recomputes the system curve some 250 times).
pub const RESOLVE_LIMIT: usize = 100;

/// What a saving on a system's lines is, by how its flow is set.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum SavingCase {
    /// Speed control: saved at once, the drive holds the flow at the lower head.
    Speed,
    /// Fixed speed: saved once the impeller is trimmed or a drive fitted; until then the pump
    /// runs out along its curve.
    Fixed,
    /// Throttled: saved once speed control or trimming replaces the throttling valve.
    Throttled,
    /// The line is in no system: its own flow and efficiency, pump control not known.
    NoSystem,
}

impl SavingCase {
    /// The words shown in the `Saving case` column and on the console.
    pub fn label(self) -> &'static str {
        match self {
            SavingCase::Speed => "speed control: saved at once",
            SavingCase::Fixed => "fixed speed: saved once trimmed or speed-controlled",
            SavingCase::Throttled => {
                "throttled: saved once speed control or trimming replaces the valve"
            }
            SavingCase::NoSystem => "no system: the line's flow and efficiency",
        }
    }
}

/// Speed control with the losses removed: the affinity laws against the system curve.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct SpeedCase {
    /// Speed ratio that holds the duty flow today (1 = the speed of the pump curve given).
    pub speed_ratio_before: f64,
    /// Speed ratio that holds it with the losses removed.
    pub speed_ratio_after: f64,
    /// Head at duty today and after, m.
    pub head_before_m: f64,
    /// Head at duty after, m.
    pub head_after_m: f64,
    /// Wire-to-water efficiency today and after (held, or from the curve at `Q/r`).
    pub efficiency_before: f64,
    /// Wire-to-water efficiency after.
    pub efficiency_after: f64,
    /// True when the efficiencies come from the curve, false when held.
    pub efficiency_from_curve: bool,
    /// Input power today and after, W.
    pub power_before_w: f64,
    /// Input power after, W.
    pub power_after_w: f64,
}

/// Fixed speed with the losses removed: the operating point re-solved.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct FixedCase {
    /// The operating point today.
    pub before: CurvePoint,
    /// The operating point with the losses removed.
    pub after: CurvePoint,
    /// Input power today, W.
    pub power_before_w: f64,
    /// Input power after (more flow: usually more power), W.
    pub power_after_w: f64,
}

/// The savings the system's suggestions add up to, by its flow control.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct SystemSavings {
    /// The case that applies.
    pub case: SavingCase,
    /// False when the saving is realised at once (speed control).
    pub conditional: bool,
    /// Head the suggestions on the system's lines save at duty, m.
    pub head_saving_m: f64,
    /// Of which the throttling valves' (part-open valves opened fully), m.
    pub throttling_head_m: f64,
    /// Energy saved per year, kWh (efficiency held, as each suggestion).
    pub annual_saving_kwh: f64,
    /// Cost saved per year.
    pub annual_saving: f64,
    /// Present value of that saving over the rules' years at their discount rate.
    pub present_value: f64,
    /// Speed control figures (speed-controlled systems with a pump curve).
    pub speed: Option<SpeedCase>,
    /// Fixed-speed figures (fixed and throttled systems with a pump curve and operating point).
    pub fixed: Option<FixedCase>,
    /// What the saving rests on, in words.
    pub note: Sentence,
}

impl SavingCase {
    /// The case of a system's control.
    pub fn of(control: Control) -> SavingCase {
        match control {
            Control::Speed => SavingCase::Speed,
            Control::Fixed => SavingCase::Fixed,
            Control::Throttled => SavingCase::Throttled,
        }
    }

    /// True when the saving needs speed control or trimming in place first.
    pub fn conditional(self) -> bool {
        matches!(self, SavingCase::Fixed | SavingCase::Throttled)
    }
}

/// The system each line's savings belong to: the first system listing it.
fn system_of_lines(audit: &Audit) -> HashMap<usize, usize> {
    let mut map = HashMap::new();
    for (si, s) in audit.systems.iter().enumerate() {
        for l in &s.lines {
            if let Some(li) = audit.line_of(l) {
                map.entry(li).or_insert(si);
            }
        }
    }
    map
}

/// Fill each suggestion's case and present value, each system's savings, and the fixed-speed
/// re-solved point of the largest suggestions. `models` are the fittings' models.
pub fn apply(rules: &Rules, audit: &mut Audit, models: &Models) {
    let system_of = system_of_lines(audit);
    let lc = rules.life_cycle;
    let mut per_system: Vec<Vec<usize>> = vec![Vec::new(); audit.systems.len()];
    for fi in 0..audit.fittings.len() {
        let si = audit
            .line_of(&audit.fittings[fi].line)
            .and_then(|li| system_of.get(&li).copied());
        let f = &mut audit.fittings[fi];
        let cost = f.replacement_cost;
        let Some(s) = f.suggestion.as_mut() else {
            continue;
        };
        let Some(saving) = s.annual_saving else {
            continue;
        };
        let case = si.map_or(SavingCase::NoSystem, |si| {
            SavingCase::of(audit.systems[si].control)
        });
        s.saving_case = Some(case);
        s.saving_conditional = case.conditional();
        let pv = pump::present_value(saving, lc.years, lc.discount_rate);
        s.present_value = Some(pv);
        s.net_present_value = cost.map(|c| pv - c);
        if let Some(si) = si {
            per_system[si].push(fi);
        }
    }
    for (si, fis) in per_system.iter().enumerate() {
        let totals = system_savings(rules, audit, models, si, fis);
        let resolved = resolve_each(audit, models, si, fis);
        for (fi, point, power) in resolved {
            if let Some(s) = audit.fittings[fi].suggestion.as_mut() {
                s.resolved_flow_m3_s = Some(point.flow_m3_s);
                s.resolved_power_w = power;
            }
        }
        audit.systems[si].savings = totals;
    }
}

/// The system's savings: totals of its suggestions and the case figures.
fn system_savings(
    rules: &Rules,
    audit: &Audit,
    models: &Models,
    si: usize,
    fis: &[usize],
) -> Option<SystemSavings> {
    if fis.is_empty() {
        return None;
    }
    let s = &audit.systems[si];
    let sugg = |fi: usize| audit.fittings[fi].suggestion.as_ref();
    let sum = |g: &dyn Fn(&super::energy::Suggestion) -> f64| -> f64 {
        fis.iter()
            .filter_map(|&fi| sugg(fi))
            .fold(0.0, |t, x| t + g(x))
    };
    let head = sum(&|x| x.head_saving_m);
    let throttling_head_m = fis
        .iter()
        .filter(|&&fi| {
            let f = &audit.fittings[fi];
            f.group == Group::Valve && f.opening.is_some_and(|o| o < 1.0)
        })
        .filter_map(|&fi| sugg(fi))
        .fold(0.0, |t, x| t + x.head_saving_m);
    let annual_saving = sum(&|x| x.annual_saving.unwrap_or(0.0));
    let case = SavingCase::of(s.control);
    let speed = (case == SavingCase::Speed)
        .then(|| speed_case(rules, audit, s, head))
        .flatten();
    let fixed = (case != SavingCase::Speed)
        .then(|| fixed_case(rules, audit, models, s, head))
        .flatten();
    let lc = rules.life_cycle;
    Some(SystemSavings {
        case,
        conditional: case.conditional(),
        head_saving_m: head,
        throttling_head_m,
        annual_saving_kwh: sum(&|x| x.annual_saving_kwh.unwrap_or(0.0)),
        annual_saving,
        present_value: pump::present_value(annual_saving, lc.years, lc.discount_rate),
        speed,
        fixed,
        note: note(case, s, throttling_head_m, fixed.as_ref()),
    })
}

fn note(
    case: SavingCase,
    s: &SystemResult,
    throttling_head_m: f64,
    fixed: Option<&FixedCase>,
) -> Sentence {
    let runs_out = fixed
        .map(|f| {
            format!(
                "; until then the pump runs out to {} at {}, drawing {:.1} kW instead of {:.1} kW",
                fig(f.after.flow_m3_s * 3600.0, "m3/h", 1),
                fig(f.after.head_m, "m", 2),
                f.power_after_w / 1e3,
                f.power_before_w / 1e3
            )
        })
        .unwrap_or_default();
    let curve = if s.pump_curve.len() < 2 {
        " (no pump curve: speed and operating point not computed)"
    } else {
        ""
    };
    let text = match case {
        SavingCase::Speed => {
            format!("speed control holds the duty flow at the lower head: saved at once{curve}")
        }
        SavingCase::Fixed => format!(
            "fixed speed: saved once the impeller is trimmed or a speed drive fitted{runs_out}{curve}"
        ),
        SavingCase::Throttled if throttling_head_m > 0.0 => format!(
            "throttled: the throttling valves' {} is saved once speed control or trimming replaces them; other savings likewise, the valve otherwise takes up the head{runs_out}",
            fig(throttling_head_m, "m", 2)
        ),
        SavingCase::Throttled => format!(
            "throttled, but no part-open valve is listed (Opening): the throttling loss is not known; savings are realised once speed control or trimming replaces the throttling{runs_out}"
        ),
        SavingCase::NoSystem => String::new(),
    };
    Sentence::new(text)
}

/// Wire-to-water efficiency at a flow: the pump curve's times the motor's, else the held value.
fn efficiency_at(rules: &Rules, s: &SystemResult, held: f64, flow_m3_s: f64) -> (f64, bool) {
    match interpolate(&s.efficiency_curve, flow_m3_s).filter(|e| *e > 0.0) {
        Some(e) => (e * rules.station.motor_efficiency, true),
        None => (held, false),
    }
}

/// The efficiency the energy review used on the system's lines (the first that has one).
fn held_efficiency(rules: &Rules, audit: &Audit, s: &SystemResult) -> f64 {
    s.lines
        .iter()
        .filter_map(|l| audit.line_of(l))
        .find_map(|i| audit.lines[i].efficiency)
        .unwrap_or(rules.energy.efficiency)
}

/// Speed control: the speed ratios that hold the duty flow before and after, by the affinity
/// laws, with the efficiency held or read from the curve at `Q / r`.
fn speed_case(
    rules: &Rules,
    audit: &Audit,
    s: &SystemResult,
    head_saving_m: f64,
) -> Option<SpeedCase> {
    let q = s.flow_m3_s;
    let (h0, h1) = (s.required_head_m, s.required_head_m - head_saving_m);
    let r0 = pump::speed_ratio(&s.pump_curve, q, h0)?;
    let r1 = pump::speed_ratio(&s.pump_curve, q, h1)?;
    let held = held_efficiency(rules, audit, s);
    let (e0, c0) = efficiency_at(rules, s, held, q / r0);
    let (e1, c1) = efficiency_at(rules, s, held, q / r1);
    let (e0, e1, from_curve) = if c0 && c1 {
        (e0, e1, true)
    } else {
        (held, held, false)
    };
    let rho = density(audit, s);
    Some(SpeedCase {
        speed_ratio_before: r0,
        speed_ratio_after: r1,
        head_before_m: h0,
        head_after_m: h1,
        efficiency_before: e0,
        efficiency_after: e1,
        efficiency_from_curve: from_curve,
        power_before_w: pump::input_power_w(rho, q, h0, e0),
        power_after_w: pump::input_power_w(rho, q, h1, e1),
    })
}

/// Fixed speed: the operating point today and with `head_saving_m` (at duty) removed.
fn fixed_case(
    rules: &Rules,
    audit: &Audit,
    models: &Models,
    s: &SystemResult,
    head_saving_m: f64,
) -> Option<FixedCase> {
    let before = s.operating_point?;
    let after = resolve(audit, models, s, head_saving_m)?;
    let held = held_efficiency(rules, audit, s);
    let rho = density(audit, s);
    let power = |p: CurvePoint| {
        let (e, _) = efficiency_at(rules, s, held, p.flow_m3_s);
        pump::input_power_w(rho, p.flow_m3_s, p.head_m, e)
    };
    Some(FixedCase {
        before,
        after,
        power_before_w: power(before),
        power_after_w: power(after),
    })
}

/// The fixed-speed operating point with a head removed (at duty flow, scaling with Q²).
fn resolve(audit: &Audit, models: &Models, s: &SystemResult, head_m: f64) -> Option<CurvePoint> {
    if s.pump_curve.len() < 2 || s.flow_m3_s <= 0.0 {
        return None;
    }
    let idx: Vec<usize> = s.lines.iter().filter_map(|l| audit.line_of(l)).collect();
    let duty = s.flow_m3_s;
    pump::resolved_point(
        &s.pump_curve,
        |q| required_head_at(audit, models, &idx, s.static_head_m, q / duty),
        head_m,
        duty,
    )
}

/// Each of the system's largest suggestions re-solved alone at fixed speed (fixed and throttled
/// systems with an operating point): (fitting, new point, its input power). The system curve is
/// sampled once ([`pump::scan_grid`]) and each point bracketed on it.
fn resolve_each(
    audit: &Audit,
    models: &Models,
    si: usize,
    fis: &[usize],
) -> Vec<(usize, CurvePoint, Option<f64>)> {
    let s = &audit.systems[si];
    if s.control == Control::Speed || s.operating_point.is_none() || s.flow_m3_s <= 0.0 {
        return Vec::new();
    }
    let head = |fi: usize| {
        audit.fittings[fi]
            .suggestion
            .as_ref()
            .map_or(0.0, |x| x.head_saving_m)
    };
    let mut order: Vec<usize> = fis.to_vec();
    order.sort_by(|&a, &b| head(b).total_cmp(&head(a)).then(a.cmp(&b)));
    order.truncate(RESOLVE_LIMIT);
    let held = held_efficiency(&audit.rules, audit, s);
    let rho = density(audit, s);
    let idx: Vec<usize> = s.lines.iter().filter_map(|l| audit.line_of(l)).collect();
    let duty = s.flow_m3_s;
    let system = |q: f64| required_head_at(audit, models, &idx, s.static_head_m, q / duty);
    let grid = pump::scan_grid(&s.pump_curve, system);
    order
        .into_iter()
        .filter_map(|fi| {
            let p = pump::resolved_point_on(&s.pump_curve, &grid, system, head(fi), duty)?;
            let (e, _) = efficiency_at(&audit.rules, s, held, p.flow_m3_s);
            Some((
                fi,
                p,
                Some(pump::input_power_w(rho, p.flow_m3_s, p.head_m, e)),
            ))
        })
        .collect()
}
