//! Rows of `Pump curve`: head-versus-flow points of a system's pump.

use super::Origin;
use super::cells::{Cells, Sink, for_each_row};
use crate::ingest::Input;
use crate::ingest::schema::TableKind;

/// A row of `Pump curve`: one head-versus-flow point of a system's pump.
#[derive(Clone, Debug, PartialEq)]
pub struct PumpCurveRow {
    /// Source row.
    pub origin: Origin,
    /// System id.
    pub system: String,
    /// Flow, m³/s.
    pub flow_m3_s: f64,
    /// Pump head at that flow, m.
    pub head_m: f64,
    /// NPSH required at that flow, m (None: not given).
    pub npsh_required_m: Option<f64>,
    /// Pump efficiency at that flow, fraction (None: not given).
    pub efficiency: Option<f64>,
    /// Pump shaft power at that flow, W (None: not given).
    pub power_w: Option<f64>,
}

pub(super) fn read_pump_curves(input: &Input, sink: &mut Sink) -> Vec<PumpCurveRow> {
    let mut pump_curves = Vec::new();
    for_each_row(input, sink, TableKind::PumpCurve, |c| {
        let Some(system) = c.text("system") else {
            c.error(
                "system",
                "system id is blank".into(),
                Some("every pump curve point needs the id of its system".into()),
            );
            return;
        };
        let flow = c.positive("flow", true);
        let head = c.positive("head", true);
        let npsh_required_m = c.positive("npsh_required", true);
        let efficiency = efficiency(c);
        let power_w = c.positive("power", false);
        match (flow, head) {
            (Some(flow_m3_s), Some(head_m)) => pump_curves.push(PumpCurveRow {
                origin: Origin {
                    sheet: c.layout.sheet.clone(),
                    row: c.row,
                },
                system,
                flow_m3_s,
                head_m,
                npsh_required_m,
                efficiency,
                power_w,
            }),
            _ if c.errors == 0 => c.error(
                "flow",
                "a pump curve point needs both flow and head".into(),
                None,
            ),
            _ => {}
        }
    });
    pump_curves
}

/// A curve point's pump efficiency: 0 (shut-off) to 1; above 100 % is impossible.
fn efficiency(c: &mut Cells<'_>) -> Option<f64> {
    let e = c.positive("efficiency", true)?;
    if e <= 1.0 {
        return Some(e);
    }
    c.error(
        "efficiency",
        format!("pump efficiency {:.1} % is above 100 %", e * 100.0),
        Some("give the efficiency from the maker's curve, e.g. 78 % or 0.78".into()),
    );
    None
}
