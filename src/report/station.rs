//! The station-energy rows of a system (Systems sheet, console): control, measured performance,
//! best-efficiency point and preferred region, and what the savings are worth under the control.

use crate::audit::Rules;
use crate::audit::station::STATION_CAUTION;
use crate::audit::station::TestResult;
use crate::audit::system::SystemResult;
use crate::units::{UnitSystem, console_unit};

use rust_xlsxwriter::{Worksheet, XlsxError};

use super::figures::{Figure, figure, share, text, write_figures_at};
use super::style::Styles;
use crate::audit::Audit;

fn m3h(q: f64) -> f64 {
    q * 3600.0
}

fn pct(x: f64) -> String {
    format!("{:.1} %", x * 100.0)
}

/// The station-energy figures of one system (Systems sheet), in order; only those with values.
pub(crate) fn station_figures(
    s: &SystemResult,
    rules: &Rules,
    cur: &str,
    units: UnitSystem,
) -> Vec<Figure> {
    let mut v = vec![
        text("Control", s.control.id(), &s.control_basis),
        figure(
            "Minimum energy to lift [kWh/m3/m]",
            Some(s.minimum_specific_energy_kwh_m3_m),
            "ρ g / 3.6e6 at the system's density",
        ),
    ];
    if s.loss_share.is_some() {
        v.push(share(
            "Piping share of the head",
            s.loss_share,
            "line losses over required head at duty",
        ));
    }
    for sh in &s.shared_lines {
        let with = format!("shared with {}", sh.systems.join(", "));
        v.extend([
            share(
                format!("Share of shared line {}", sh.line),
                Some(sh.share),
                format!("{with}; by {}", sh.share_basis),
            ),
            figure(
                format!("Line {} energy of this share [kWh/yr]", sh.line),
                sh.annual_energy_kwh,
                sh.efficiency.map_or(String::new(), |e| {
                    format!(
                        "at {} and {:.0} h ({})",
                        pct(e),
                        sh.hours_per_year.unwrap_or(0.0),
                        sh.efficiency_basis
                    )
                }),
            ),
            figure(
                format!("Line {} cost of this share [{cur}/yr]", sh.line),
                sh.annual_cost,
                "",
            ),
        ]);
    }
    if let Some(m) = s.measured {
        let basis = "metered (Systems sheet)";
        v.extend([
            figure("Metered energy [kWh/yr]", Some(m.energy_kwh), basis),
            figure("Metered volume [m3/yr]", Some(m.volume_m3), basis),
            figure(
                "Specific energy, metered [kWh/m3]",
                Some(m.specific_energy_kwh_m3),
                "",
            ),
            figure(
                "Head the metered figures are referred to [m]",
                Some(m.head_m),
                "computed required head at duty",
            ),
            figure(
                "Specific energy per metre, metered [kWh/m3/m]",
                m.specific_energy_kwh_m3_m,
                "",
            ),
            share(
                "Wire-to-water, metered",
                Some(m.wire_to_water),
                "minimum energy over the metered specific energy",
            ),
        ]);
    }
    if let Some(t) = s.test {
        test_figures(&t, &mut v);
    }
    pump_figures(s, rules, &mut v);
    savings_figures(s, rules, cur, units, &mut v);
    v.push(text("Caution on energy figures", STATION_CAUTION, ""));
    v
}

fn test_figures(t: &TestResult, v: &mut Vec<Figure>) {
    let basis = "test point (Systems sheet)";
    v.extend([
        figure("Test flow [m3/h]", Some(m3h(t.point.flow_m3_s)), basis),
        figure("Test head [m]", Some(t.point.head_m), basis),
        figure("Test motor input [kW]", Some(t.power_w / 1e3), basis),
        figure(
            "Specific energy, test [kWh/m3]",
            Some(t.specific_energy_kwh_m3),
            "",
        ),
        figure(
            "Specific energy per metre, test [kWh/m3/m]",
            t.specific_energy_kwh_m3_m,
            "",
        ),
        share("Wire-to-water, test", Some(t.wire_to_water), ""),
        figure(
            "Computed system head at the test flow [m]",
            Some(t.computed_head_m),
            "system curve",
        ),
        figure(
            "Test head minus computed [m]",
            Some(t.head_difference_m),
            "large: the register or the gauges are wrong",
        ),
    ]);
}

fn pump_figures(s: &SystemResult, rules: &Rules, v: &mut Vec<Figure>) {
    let Some(p) = s.pump_efficiency else { return };
    let b = p.best;
    let basis = if b.at_end_of_points {
        "pump curve; at the end of the points given: the best may lie beyond"
    } else {
        "pump curve"
    };
    v.extend([
        figure("Best-efficiency flow [m3/h]", Some(m3h(b.flow_m3_s)), basis),
        figure("Best-efficiency head [m]", Some(b.head_m), basis),
        share("Best pump efficiency", Some(b.efficiency), basis),
    ]);
    if p.pump_efficiency.is_some() {
        v.extend([
            figure("Flow where it runs [m3/h]", Some(m3h(p.flow_m3_s)), ""),
            share(
                "Pump efficiency where it runs",
                p.pump_efficiency,
                "pump curve",
            ),
            share(
                "Motor efficiency",
                Some(rules.station.motor_efficiency),
                "rule [station] motor_efficiency",
            ),
            share(
                "Wire-to-water where it runs",
                p.wire_to_water,
                "used for the system's energy where Lines and Systems give none",
            ),
        ]);
    }
    let region = format!(
        "{:.0}–{:.0} % of best-efficiency flow (ANSI/HI 9.6.3)",
        rules.station.preferred_min * 100.0,
        rules.station.preferred_max * 100.0
    );
    v.extend([
        figure(
            "Preferred region from [m3/h]",
            Some(m3h(p.preferred_min_m3_s)),
            &region,
        ),
        figure(
            "Preferred region to [m3/h]",
            Some(m3h(p.preferred_max_m3_s)),
            &region,
        ),
        share(
            "Duty flow over best-efficiency flow",
            Some(p.duty_ratio),
            "",
        ),
    ]);
    if p.operating_ratio.is_some() {
        v.push(share(
            "Operating flow over best-efficiency flow",
            p.operating_ratio,
            "",
        ));
    }
    let inside = if p.outside_preferred {
        "OUTSIDE"
    } else {
        "inside"
    };
    v.push(text("Preferred region check", inside, &region));
}

fn savings_figures(
    s: &SystemResult,
    rules: &Rules,
    cur: &str,
    units: UnitSystem,
    v: &mut Vec<Figure>,
) {
    let Some(x) = &s.savings else { return };
    let lc = rules.life_cycle;
    let pv = format!("over {} years at {} %", lc.years, lc.discount_rate * 100.0);
    v.extend([
        text(
            "Savings of the suggestions (estimate)",
            x.note.render(units),
            "",
        ),
        figure("Head saved at duty [m]", Some(x.head_saving_m), ""),
        figure("Of it throttling [m]", Some(x.throttling_head_m), ""),
        figure("Energy saved [kWh/yr]", Some(x.annual_saving_kwh), ""),
        figure(format!("Annual saving [{cur}]"), Some(x.annual_saving), ""),
        figure(
            format!("Present value of the saving [{cur}]"),
            Some(x.present_value),
            pv,
        ),
    ]);
    if let Some(c) = x.speed {
        let eff = if c.efficiency_from_curve {
            "pump curve × motor"
        } else {
            "held"
        };
        v.extend([
            share(
                "Speed before (speed control)",
                Some(c.speed_ratio_before),
                "affinity laws",
            ),
            share("Speed after", Some(c.speed_ratio_after), "affinity laws"),
            figure("Head at duty before [m]", Some(c.head_before_m), ""),
            figure("Head at duty after [m]", Some(c.head_after_m), ""),
            share("Wire-to-water before", Some(c.efficiency_before), ""),
            share("Wire-to-water after", Some(c.efficiency_after), eff),
            figure("Power before [kW]", Some(c.power_before_w / 1e3), ""),
            figure("Power after [kW]", Some(c.power_after_w / 1e3), ""),
        ]);
    }
    if let Some(c) = x.fixed {
        let basis = "fixed speed, losses removed: check NPSH and motor current there";
        v.extend([
            figure(
                "Operating flow before [m3/h]",
                Some(m3h(c.before.flow_m3_s)),
                "",
            ),
            figure("Operating head before [m]", Some(c.before.head_m), ""),
            figure("Power before [kW]", Some(c.power_before_w / 1e3), ""),
            figure(
                "Operating flow after [m3/h]",
                Some(m3h(c.after.flow_m3_s)),
                basis,
            ),
            figure("Operating head after [m]", Some(c.after.head_m), basis),
            figure("Power after [kW]", Some(c.power_after_w / 1e3), basis),
        ]);
    }
}

/// The short station-energy figures of one system for the Summary sheet: specific energy and
/// wire-to-water (metered, else the test, else the pump curve's where it runs), the piping share
/// of the head, the best-efficiency flow and the preferred-region verdict, and the control.
pub(crate) fn summary_figures(s: &SystemResult, rules: &Rules) -> Vec<Figure> {
    let measured = s
        .measured
        .map(|m| (m.specific_energy_kwh_m3, m.wire_to_water, "metered"))
        .or(s
            .test
            .map(|t| (t.specific_energy_kwh_m3, t.wire_to_water, "test point")));
    let curve = s.pump_efficiency.and_then(|p| p.wire_to_water);
    let (energy, wire, basis) = match (measured, curve) {
        (Some((e, w, b)), _) => (Some(e), Some(w), b.to_string()),
        // e = ρ g H / (η 3.6e6): the minimum over the wire-to-water where the pump runs.
        (None, Some(w)) => (
            Some(s.minimum_specific_energy_kwh_m3_m * s.required_head_m / w),
            Some(w),
            "computed: required head at duty over the pump curve's wire-to-water".into(),
        ),
        (None, None) => (None, None, "no meter, test or pump efficiency given".into()),
    };
    let mut v = vec![
        figure("Specific energy [kWh/m3]", energy, &basis),
        share("Wire-to-water", wire, &basis),
        share(
            "Piping share of the head",
            s.loss_share,
            "line losses over required head at duty",
        ),
    ];
    match s.pump_efficiency {
        Some(p) => v.extend([
            figure(
                "Best-efficiency flow [m3/h]",
                Some(m3h(p.best.flow_m3_s)),
                "pump curve",
            ),
            text(
                format!(
                    "Preferred region ({:.0}–{:.0} % of best-efficiency flow)",
                    rules.station.preferred_min * 100.0,
                    rules.station.preferred_max * 100.0
                ),
                if p.outside_preferred {
                    "OUTSIDE"
                } else {
                    "inside"
                },
                format!(
                    "duty at {:.0} % of best-efficiency flow",
                    p.duty_ratio * 100.0
                ),
            ),
        ]),
        None => v.push(text(
            "Best-efficiency flow",
            "not known",
            "no efficiency or power points on the pump curve",
        )),
    }
    v.push(text(
        "Flow control the savings assume",
        s.control.id(),
        &s.control_basis,
    ));
    v
}

/// Write the Summary's station-energy block from row `start`: one short block per system
/// ([`summary_figures`], values in column C in the report's units) under the screening caution.
/// Returns the next free row (`start` when there are no systems).
pub(crate) fn write_summary_station(
    ws: &mut Worksheet,
    audit: &Audit,
    start: u32,
    st: &Styles,
) -> Result<u32, XlsxError> {
    if audit.systems.is_empty() {
        return Ok(start);
    }
    let mut r = start;
    ws.set_row_height(r, 45)?;
    ws.write_string_with_format(r, 0, "Station energy (screening estimate)", &st.bold)?;
    ws.write_string_with_format(r, 2, STATION_CAUTION, &st.wrap)?;
    r += 1;
    for s in &audit.systems {
        ws.write_string_with_format(r, 0, format!("System {}", s.system), &st.bold)?;
        r = write_figures_at(ws, r + 1, 2, &summary_figures(s, &audit.rules), st)?;
    }
    Ok(r + 1)
}

/// One sentence per system for the console: control, piping share, measured wire-to-water,
/// best-efficiency flow and the savings with their case, in `units`.
pub fn console_line(s: &SystemResult, cur: &str, units: UnitSystem) -> String {
    let (qu, fq) = console_unit("m3/s", "m3/h", 3600.0, units);
    let (hu, fh) = console_unit("m", "m", 1.0, units);
    let (eu, fe) = console_unit("kWh/m3", "kWh/m3", 1.0, units);
    let mut parts = vec![format!("control {} ({})", s.control.id(), s.control_basis)];
    if let Some(x) = s.loss_share {
        parts.push(format!("piping {} of the head", pct(x)));
    }
    if let Some(m) = s.measured {
        parts.push(format!(
            "metered {:.4} {eu}, wire-to-water {}",
            m.specific_energy_kwh_m3 * fe,
            pct(m.wire_to_water)
        ));
    }
    if let Some(t) = s.test {
        parts.push(format!(
            "test {:.1} {qu} at {:.2} {hu}, wire-to-water {}, computed head there {:.2} {hu}",
            t.point.flow_m3_s * fq,
            t.point.head_m * fh,
            pct(t.wire_to_water),
            t.computed_head_m * fh
        ));
    }
    if let Some(p) = s.pump_efficiency {
        parts.push(format!(
            "best efficiency {:.1} {qu}, duty at {:.0} %{}",
            p.best.flow_m3_s * fq,
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
