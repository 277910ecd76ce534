//! The station-energy rows of a system (Systems sheet, console): control, measured performance,
//! best-efficiency point and preferred region, and what the savings are worth under the control.

use crate::audit::Rules;
use crate::audit::station::STATION_CAUTION;
use crate::audit::system::SystemResult;

fn m3h(q: f64) -> f64 {
    q * 3600.0
}

fn per_metre(x: Option<f64>) -> String {
    x.map_or("—".into(), |v| format!("{v:.6}"))
}

fn pct(x: f64) -> String {
    format!("{:.1} %", x * 100.0)
}

/// The rows shown for one system, as (label, text), in order; only those with figures.
pub fn station_rows(s: &SystemResult, rules: &Rules, cur: &str) -> Vec<(&'static str, String)> {
    let mut rows = vec![
        (
            "Control",
            format!("{} ({})", s.control.id(), s.control_basis),
        ),
        (
            "Minimum energy to lift [kWh/m3/m]",
            format!(
                "{:.6} (ρ g / 3.6e6 at the system's density)",
                s.minimum_specific_energy_kwh_m3_m
            ),
        ),
    ];
    if let Some(x) = s.loss_share {
        rows.push((
            "Piping share of the head",
            format!("{} (line losses over required head at duty)", pct(x)),
        ));
    }
    if let Some(m) = s.measured {
        rows.push(("Metered performance", format!(
            "{:.0} kWh for {:.0} m3 a year: {:.4} kWh/m3, {} kWh/m3/m of the computed {:.2} m; wire-to-water {}",
            m.energy_kwh, m.volume_m3, m.specific_energy_kwh_m3, per_metre(m.specific_energy_kwh_m3_m), m.head_m, pct(m.wire_to_water)
        )));
    }
    if let Some(t) = s.test {
        rows.push(("Test point (measured operating point)", format!(
            "{:.1} m3/h at {:.2} m drawing {:.2} kW: {:.4} kWh/m3, {} kWh/m3/m; wire-to-water {}; computed system head there {:.2} m ({:+.2} m)",
            m3h(t.point.flow_m3_s), t.point.head_m, t.power_w / 1e3, t.specific_energy_kwh_m3, per_metre(t.specific_energy_kwh_m3_m), pct(t.wire_to_water), t.computed_head_m, t.head_difference_m
        )));
    }
    pump_rows(s, rules, &mut rows);
    savings_rows(s, rules, cur, &mut rows);
    rows.push(("Caution on energy figures", STATION_CAUTION.to_string()));
    rows
}

fn pump_rows(s: &SystemResult, rules: &Rules, rows: &mut Vec<(&'static str, String)>) {
    let Some(p) = s.pump_efficiency else { return };
    let b = p.best;
    rows.push((
        "Best efficiency (pump curve)",
        format!(
            "{:.1} m3/h at {:.2} m, pump efficiency {}{}",
            m3h(b.flow_m3_s),
            b.head_m,
            pct(b.efficiency),
            if b.at_end_of_points {
                " (at the end of the points given: the best may lie beyond)"
            } else {
                ""
            }
        ),
    ));
    if let (Some(e), Some(w)) = (p.pump_efficiency, p.wire_to_water) {
        rows.push(("Efficiency where it runs", format!(
            "pump {} at {:.1} m3/h × motor {} = {} wire-to-water (used for the system's energy where Lines and Systems give none)",
            pct(e), m3h(p.flow_m3_s), pct(rules.station.motor_efficiency), pct(w)
        )));
    }
    rows.push(("Preferred operating region", format!(
        "{:.1}–{:.1} m3/h ({:.0}–{:.0} % of best-efficiency flow, ANSI/HI 9.6.3): duty at {:.0} %{}{}",
        m3h(p.preferred_min_m3_s), m3h(p.preferred_max_m3_s), rules.station.preferred_min * 100.0, rules.station.preferred_max * 100.0,
        p.duty_ratio * 100.0,
        p.operating_ratio.map(|r| format!(", operating point at {:.0} %", r * 100.0)).unwrap_or_default(),
        if p.outside_preferred { " — OUTSIDE" } else { " — inside" }
    )));
}

fn savings_rows(
    s: &SystemResult,
    rules: &Rules,
    cur: &str,
    rows: &mut Vec<(&'static str, String)>,
) {
    let Some(v) = &s.savings else { return };
    let lc = rules.life_cycle;
    rows.push(("Savings of the suggestions (estimate)", format!(
        "{:.2} m at duty ({:.2} m of it throttling), {:.0} kWh and {cur} {:.0} a year; present value {cur} {:.0} over {} years at {} % — {}",
        v.head_saving_m, v.throttling_head_m, v.annual_saving_kwh, v.annual_saving, v.present_value, lc.years, lc.discount_rate * 100.0, v.note
    )));
    if let Some(c) = v.speed {
        rows.push(("Speed control (affinity laws)", format!(
            "speed {} → {} holds {:.1} m3/h at {:.2} m instead of {:.2} m; wire-to-water {} → {} ({}); {:.2} kW → {:.2} kW",
            pct(c.speed_ratio_before), pct(c.speed_ratio_after), m3h(s.flow_m3_s), c.head_after_m, c.head_before_m,
            pct(c.efficiency_before), pct(c.efficiency_after), if c.efficiency_from_curve { "pump curve × motor" } else { "held" },
            c.power_before_w / 1e3, c.power_after_w / 1e3
        )));
    }
    if let Some(c) = v.fixed {
        rows.push(("Fixed speed with the losses removed", format!(
            "the operating point moves from {:.1} m3/h at {:.2} m ({:.2} kW) to {:.1} m3/h at {:.2} m ({:.2} kW): check NPSH and motor current there",
            m3h(c.before.flow_m3_s), c.before.head_m, c.power_before_w / 1e3, m3h(c.after.flow_m3_s), c.after.head_m, c.power_after_w / 1e3
        )));
    }
}

/// One sentence per system for the console: control, piping share, measured wire-to-water,
/// best-efficiency flow and the savings with their case.
pub fn console_line(s: &SystemResult, cur: &str) -> String {
    let mut parts = vec![format!("control {} ({})", s.control.id(), s.control_basis)];
    if let Some(x) = s.loss_share {
        parts.push(format!("piping {} of the head", pct(x)));
    }
    if let Some(m) = s.measured {
        parts.push(format!(
            "metered {:.4} kWh/m3, wire-to-water {}",
            m.specific_energy_kwh_m3,
            pct(m.wire_to_water)
        ));
    }
    if let Some(t) = s.test {
        parts.push(format!(
            "test {:.1} m3/h at {:.2} m, wire-to-water {}, computed head there {:.2} m",
            m3h(t.point.flow_m3_s),
            t.point.head_m,
            pct(t.wire_to_water),
            t.computed_head_m
        ));
    }
    if let Some(p) = s.pump_efficiency {
        parts.push(format!(
            "best efficiency {:.1} m3/h, duty at {:.0} %{}",
            m3h(p.best.flow_m3_s),
            p.duty_ratio * 100.0,
            if p.outside_preferred {
                " (outside 70–120 %)"
            } else {
                ""
            }
        ));
    }
    if let Some(v) = &s.savings {
        parts.push(format!(
            "savings {cur} {:.0}/yr, present value {cur} {:.0} ({})",
            v.annual_saving,
            v.present_value,
            v.case.label()
        ));
    }
    format!("System {} energy: {}.", s.system, parts.join("; "))
}
