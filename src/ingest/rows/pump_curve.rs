//! Rows of `Pump curve`: head-versus-flow points of a system's pump.

use super::Origin;
use super::cells::{Sink, for_each_row};
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
        let efficiency = c.efficiency("efficiency", true);
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
