//! Rows of `Systems`: ordered lines forming a pumped system.

use super::Origin;
use super::cells::{Cells, Sink, for_each_row, format_number};
use crate::ingest::Input;
use crate::ingest::schema::TableKind;

/// A row of `Systems`.
#[derive(Clone, Debug, PartialEq)]
pub struct SystemRow {
    /// Source row.
    pub origin: Origin,
    /// System id.
    pub system: String,
    /// Ordered line ids (empty: taken from the `System` column of Lines).
    pub lines: Vec<String>,
    /// Static head, m.
    pub static_head_m: Option<f64>,
    /// Pump head at duty, m.
    pub pump_head_m: Option<f64>,
    /// NPSH required, m.
    pub npsh_required_m: Option<f64>,
    /// Absolute source pressure, Pa.
    pub source_pressure_pa: Option<f64>,
    /// Source level above the pump centreline, m.
    pub suction_level_m: Option<f64>,
    /// Site elevation above mean sea level, m (None: not given).
    pub site_elevation_m: Option<f64>,
    /// Wire-to-water efficiency.
    pub efficiency: Option<f64>,
    /// How the flow is set (None: not given, taken as fixed speed and marked assumed).
    pub control: Option<Control>,
    /// Metered energy and volume of one year, when both are given.
    pub metered: Option<Metered>,
    /// A site test point, when one is given.
    pub test_point: Option<TestPoint>,
    /// The system's shares of the lines it shares with other systems (Systems `Share`; empty:
    /// split by the systems' duty flows).
    pub shares: Vec<super::shares::Share>,
}

/// How a system's flow is set, which decides what a lower loss saves (docs/energy.md §10).
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Control {
    /// Fixed speed, no throttling: a lower loss moves the pump out along its curve.
    Fixed,
    /// A valve sets the flow: its loss is what speed control or trimming would save.
    Throttled,
    /// A variable-speed drive holds the flow: a lower loss is saved at once.
    Speed,
}

impl Control {
    /// The id written in the `Control` column and in reports.
    pub fn id(self) -> &'static str {
        match self {
            Control::Fixed => "fixed",
            Control::Throttled => "throttled",
            Control::Speed => "speed",
        }
    }

    /// Read a `Control` cell: the three ids and the trade's words for them (folded).
    pub fn parse(text: &str) -> Option<Control> {
        match crate::ingest::schema::fold(text).as_str() {
            "fixed" | "fixedspeed" | "constantspeed" | "dol" | "directonline" | "none" => {
                Some(Control::Fixed)
            }
            "throttled" | "throttle" | "throttling" | "valve" | "valvecontrol"
            | "throttlevalve" => Some(Control::Throttled),
            "speed" | "variablespeed" | "speedcontrol" | "vsd" | "vfd" | "vvvf" | "inverter"
            | "drive" => Some(Control::Speed),
            _ => None,
        }
    }
}

/// One year's metered energy and volume of a system's pump set.
#[derive(Clone, Copy, Debug, PartialEq, serde::Serialize)]
pub struct Metered {
    /// Electrical energy, kWh per year.
    pub energy_kwh: f64,
    /// Volume pumped, m³ per year.
    pub volume_m3: f64,
}

/// How the head of a test point was given.
#[derive(Clone, Copy, Debug, PartialEq, serde::Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum TestHead {
    /// The head itself, m.
    Head(f64),
    /// Gauge pressures at the pump inlet and outlet, Pa (same reference).
    Pressures {
        /// Inlet pressure, Pa.
        suction_pa: f64,
        /// Outlet pressure, Pa.
        discharge_pa: f64,
    },
}

/// A site test point of a system's pump set.
#[derive(Clone, Copy, Debug, PartialEq, serde::Serialize)]
pub struct TestPoint {
    /// Flow, m³/s.
    pub flow_m3_s: f64,
    /// Head, or the two pressures.
    pub head: TestHead,
    /// Electrical input power, W.
    pub power_w: f64,
}

pub(super) fn read_systems(input: &Input, sink: &mut Sink) -> Vec<SystemRow> {
    let mut systems = Vec::new();
    for_each_row(input, sink, TableKind::Systems, |c| {
        let Some(system) = c.text("system") else {
            c.error("system", "system id is blank".into(), None);
            return;
        };
        let lines = c
            .text("lines")
            .map(|t| {
                t.split([',', ';', '\n'])
                    .map(|s| s.trim().to_string())
                    .filter(|s| !s.is_empty())
                    .collect()
            })
            .unwrap_or_default();
        systems.push(SystemRow {
            origin: Origin {
                sheet: c.layout.sheet.clone(),
                row: c.row,
            },
            system,
            lines,
            static_head_m: c.number("static_head"),
            pump_head_m: c.positive("pump_head", true),
            npsh_required_m: c.positive("npsh_required", true),
            source_pressure_pa: c.positive("source_pressure", false),
            suction_level_m: c.number("suction_level"),
            site_elevation_m: site_elevation(c),
            efficiency: c.efficiency("efficiency", false),
            control: control(c),
            metered: metered(c),
            test_point: test_point(c),
            shares: super::shares::read(c),
        });
    });
    systems
}

/// Site elevations the standard atmosphere is used for, m (the Dead Sea shore to high mountain
/// sites).
pub const SITE_ELEVATION_RANGE_M: std::ops::RangeInclusive<f64> = -500.0..=6000.0;

fn site_elevation(c: &mut Cells<'_>) -> Option<f64> {
    let z = c.number("site_elevation")?;
    if SITE_ELEVATION_RANGE_M.contains(&z) {
        return Some(z);
    }
    c.error(
        "site_elevation",
        format!("site elevation {z} m is outside -500 to 6000 m"),
        Some("give the height of the site above mean sea level in m (or ft with a unit)".into()),
    );
    None
}

fn control(c: &mut Cells<'_>) -> Option<Control> {
    let text = c.text("control")?;
    let found = Control::parse(&text);
    if found.is_none() {
        c.error(
            "control",
            format!("control '{text}' is not known"),
            Some("write fixed (fixed speed), throttled (a valve sets the flow) or speed (variable-speed drive)".into()),
        );
    }
    found
}

/// Metered energy and volume: both or neither; energy zero or more, volume above zero.
fn metered(c: &mut Cells<'_>) -> Option<Metered> {
    const HINT: &str =
        "give the metered energy (kWh) and the metered volume (m3) of the same year, or neither";
    let energy = measured(c, "metered_energy", true, HINT);
    let volume = measured(c, "metered_volume", false, HINT);
    let hint = || Some(HINT.to_string());
    match (energy, volume) {
        (Some(energy_kwh), Some(volume_m3)) => Some(Metered {
            energy_kwh,
            volume_m3,
        }),
        (None, Some(_)) if c.errors == 0 => {
            c.error(
                "metered_energy",
                "a metered volume with no metered energy".into(),
                hint(),
            );
            None
        }
        (Some(_), None) if c.errors == 0 => {
            c.error(
                "metered_volume",
                "a metered energy with no metered volume".into(),
                hint(),
            );
            None
        }
        _ => None,
    }
}

/// A test point: flow, the head or both pressures, and the input power; all or nothing.
fn test_point(c: &mut Cells<'_>) -> Option<TestPoint> {
    const HINT: &str = "a test point needs the flow, the head (or both gauge pressures) and the motor input power, measured together";
    let before = c.errors;
    let flow = measured(c, "test_flow", false, HINT);
    let head = measured(c, "test_head", true, HINT);
    let suction = c.number("test_suction_pressure");
    let discharge = c.number("test_discharge_pressure");
    let power = measured(c, "test_power", false, HINT);
    if c.errors > before {
        return None;
    }
    let any = flow.is_some()
        || head.is_some()
        || suction.is_some()
        || discharge.is_some()
        || power.is_some();
    if !any {
        return None;
    }
    let hint = || Some(HINT.to_string());
    let head = match (head, suction, discharge) {
        (Some(h), None, None) => TestHead::Head(h),
        (None, Some(s), Some(d)) if d >= s => TestHead::Pressures {
            suction_pa: s,
            discharge_pa: d,
        },
        (None, Some(s), Some(d)) => {
            c.error(
                "test_discharge_pressure",
                format!(
                    "discharge pressure {} kPa is below the suction pressure {} kPa",
                    format_number(d / 1e3),
                    format_number(s / 1e3)
                ),
                Some(
                    "check the gauges: the pump adds pressure, so discharge is above suction"
                        .into(),
                ),
            );
            return None;
        }
        (Some(_), _, _) => {
            c.error(
                "test_head",
                "both a test head and test pressures are given".into(),
                Some("give either the test head or the two gauge pressures".into()),
            );
            return None;
        }
        (None, None, _) => {
            c.error(
                "test_suction_pressure",
                "the test point has no head and no suction pressure".into(),
                hint(),
            );
            return None;
        }
        (None, Some(_), None) => {
            c.error(
                "test_discharge_pressure",
                "the test point has no discharge pressure".into(),
                hint(),
            );
            return None;
        }
    };
    let Some(flow_m3_s) = flow else {
        c.error("test_flow", "the test point has no flow".into(), hint());
        return None;
    };
    let Some(power_w) = power else {
        c.error(
            "test_power",
            "the test point has no motor input power".into(),
            hint(),
        );
        return None;
    };
    Some(TestPoint {
        flow_m3_s,
        head,
        power_w,
    })
}

/// A measured value that must be above zero (or zero or more): an error with `hint` otherwise.
fn measured(c: &mut Cells<'_>, key: &str, allow_zero: bool, hint: &str) -> Option<f64> {
    let v = c.number(key)?;
    if v > 0.0 || (allow_zero && v == 0.0) {
        return Some(v);
    }
    let need = if allow_zero {
        "zero or more"
    } else {
        "greater than zero"
    };
    let header = c.header(key);
    c.error(
        key,
        format!("{header} {} must be {need}", format_number(v)),
        Some(hint.into()),
    );
    None
}
