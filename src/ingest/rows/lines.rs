//! Rows of `Lines`: one per line, with its service, flow and fluid.

use std::collections::HashMap;

use super::cells::{Sink, for_each_row};
use super::{Assumed, Origin};
use crate::error::CellRef;
use crate::ingest::Input;
use crate::ingest::schema::TableKind;
use crate::sentence::fig;

/// What a line is for; selects its velocity limits.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Service {
    /// Suction side of a pump.
    PumpSuction,
    /// Discharge side of a pump.
    PumpDischarge,
    /// Distribution main or branch.
    Distribution,
    /// Gravity-fed line (no pump energy).
    Gravity,
    /// Anything else.
    General,
}

impl Service {
    /// All services.
    pub const ALL: [Service; 5] = [
        Service::PumpSuction,
        Service::PumpDischarge,
        Service::Distribution,
        Service::Gravity,
        Service::General,
    ];

    /// Kebab-case id as written in sheets and rules.
    pub fn id(self) -> &'static str {
        match self {
            Service::PumpSuction => "pump-suction",
            Service::PumpDischarge => "pump-discharge",
            Service::Distribution => "distribution",
            Service::Gravity => "gravity",
            Service::General => "general",
        }
    }

    /// Read a service from free text (`Pump suction`, `suction`, `PS`, `discharge`...).
    pub fn from_text(text: &str) -> Option<Service> {
        let f = crate::ingest::schema::fold(text);
        Some(match f.as_str() {
            "pumpsuction" | "suction" | "ps" | "inlet" => Service::PumpSuction,
            "pumpdischarge" | "discharge" | "pd" | "delivery" | "rising" | "risingmain" => {
                Service::PumpDischarge
            }
            "distribution" | "dist" | "main" | "branch" => Service::Distribution,
            "gravity" | "gravityfed" | "gravitymain" => Service::Gravity,
            "general" | "" | "other" | "process" => Service::General,
            _ => return None,
        })
    }
}

/// A row of `Lines`.
#[derive(Clone, Debug, PartialEq)]
pub struct LineRow {
    /// Source row.
    pub origin: Origin,
    /// Line id.
    pub line: String,
    /// Service.
    pub service: Service,
    /// Flow, m³/s.
    pub flow_m3_s: Option<f64>,
    /// Fluid name (lower case).
    pub fluid: String,
    /// Temperature, °C.
    pub temperature_c: f64,
    /// Outlet minus inlet elevation, m.
    pub elevation_change_m: Option<f64>,
    /// Running hours per year.
    pub hours_per_year: Option<f64>,
    /// System id.
    pub system: Option<String>,
    /// Wire-to-water efficiency, fraction.
    pub efficiency: Option<f64>,
    /// Values assumed.
    pub assumed: Vec<Assumed>,
}

pub(super) fn read_lines(input: &Input, sink: &mut Sink) -> Vec<LineRow> {
    let mut lines = Vec::new();
    let mut seen_lines: HashMap<String, CellRef> = HashMap::new();
    for_each_row(input, sink, TableKind::Lines, |c| {
        let Some(line) = c.text("line") else {
            c.error(
                "line",
                "line id is blank".into(),
                Some("every row of Lines needs a line id".into()),
            );
            return;
        };
        let here = c.cell("line");
        if let Some(first) = seen_lines.get(&line) {
            c.error(
                "line",
                format!("line '{line}' is listed twice (first at {first})"),
                Some("line ids must be unique".into()),
            );
            return;
        }
        seen_lines.insert(line.clone(), here);
        let mut assumed = Vec::new();
        let service = match c.text("service") {
            Some(t) => Service::from_text(&t).unwrap_or_else(|| {
                let list = Service::ALL.map(Service::id).join(", ");
                c.error(
                    "service",
                    format!("service '{t}' is not known"),
                    Some(format!("use one of: {list}")),
                );
                Service::General
            }),
            None => {
                assumed.push(c.assumed("service", "service general"));
                Service::General
            }
        };
        let flow = c.number("flow");
        if let Some(q) = flow
            && q < 0.0
        {
            c.error(
                "flow",
                "reverse (negative) flow is not supported".into(),
                Some(
                    "enter the flow as a positive number and list the line in its flow direction"
                        .into(),
                ),
            );
        }
        let fluid = c
            .text("fluid")
            .map(|s| s.to_lowercase())
            .unwrap_or_else(|| {
                assumed.push(c.assumed("fluid", "fluid water"));
                "water".into()
            });
        let temperature_c = c.number("temperature").unwrap_or_else(|| {
            assumed.push(c.assumed("temperature", format!("temperature {}", fig(20.0, "°C", 0))));
            20.0
        });
        let efficiency = c.positive("efficiency", false);
        if let Some(e) = efficiency
            && e > 1.0
        {
            c.error("efficiency", format!("efficiency {e} is above 100 %"), None);
        }
        lines.push(LineRow {
            origin: Origin {
                sheet: c.layout.sheet.clone(),
                row: c.row,
            },
            line,
            service,
            flow_m3_s: flow.filter(|q| *q >= 0.0),
            fluid,
            temperature_c,
            elevation_change_m: c.number("elevation_change"),
            hours_per_year: c.positive("hours_per_year", true),
            system: c.text("system"),
            efficiency,
            assumed,
        });
    });
    lines.shrink_to_fit();
    lines
}
