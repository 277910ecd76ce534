//! The input fields a comparison reports, their labels and units, and how values print.

use serde::Serialize;

use crate::ingest::parse::SizeSpec;
use crate::units::{UnitSystem, header_in};

/// An old or new value: a number in SI (the field's key names the unit) or text.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(untagged)]
pub enum Value {
    /// A number, SI.
    Number(f64),
    /// Text as the tool reads it (sizes, schedules, materials, kinds, verdicts, messages).
    Text(String),
}

/// Two numbers closer than this, relative to the larger, are the same value: a length written in
/// feet on one side and in metres on the other converts to doubles a few units in the last place
/// apart, and no schedule is written to ten significant figures.
pub const SAME_VALUE_REL: f64 = 1e-9;

/// True when two numbers are the same value within [`SAME_VALUE_REL`].
pub fn same_number(a: f64, b: f64) -> bool {
    a == b || (a - b).abs() <= SAME_VALUE_REL * a.abs().max(b.abs())
}

/// True when two optional values are the same (numbers within [`SAME_VALUE_REL`]).
pub fn same(a: &Option<Value>, b: &Option<Value>) -> bool {
    match (a, b) {
        (Some(Value::Number(x)), Some(Value::Number(y))) => same_number(*x, *y),
        _ => a == b,
    }
}

/// One reported field: its JSON key (SI unit in the name), label and display unit.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Field {
    /// Key, e.g. `flow_m3_s`.
    pub key: &'static str,
    /// Label, e.g. `Flow`.
    pub label: &'static str,
    /// Display unit in SI (`m3/h`), empty for text and pure numbers.
    pub unit: &'static str,
    /// Factor from the SI value to the display unit.
    pub factor: f64,
    /// Input column key (for the cell a change links to), when the field is an input column.
    pub column: &'static str,
}

const fn f(
    key: &'static str,
    label: &'static str,
    unit: &'static str,
    factor: f64,
    column: &'static str,
) -> Field {
    Field {
        key,
        label,
        unit,
        factor,
        column,
    }
}

/// Line fields.
pub const FLOW: Field = f("flow_m3_s", "Flow", "m3/h", 3600.0, "flow");
/// Line service.
pub const SERVICE: Field = f("service", "Service", "", 1.0, "service");
/// Line fluid.
pub const FLUID: Field = f("fluid", "Fluid", "", 1.0, "fluid");
/// Line temperature.
pub const TEMPERATURE: Field = f("temperature_c", "Temperature", "°C", 1.0, "temperature");
/// Line elevation change.
pub const ELEVATION: Field = f(
    "elevation_change_m",
    "Elevation change",
    "m",
    1.0,
    "elevation_change",
);
/// Line running hours.
pub const HOURS: Field = f(
    "hours_per_year",
    "Hours per year",
    "h",
    1.0,
    "hours_per_year",
);
/// Line or system efficiency (stored as a fraction).
pub const EFFICIENCY: Field = f("efficiency", "Efficiency", "%", 100.0, "efficiency");
/// Line's system.
pub const SYSTEM: Field = f("system", "System", "", 1.0, "system");
/// Run or fitting size.
pub const SIZE: Field = f("size", "Size", "", 1.0, "size");
/// Fitting outlet size.
pub const SIZE_OUT: Field = f("size_out", "Size out", "", 1.0, "size_out");
/// Run schedule.
pub const SCHEDULE: Field = f("schedule", "Schedule", "", 1.0, "schedule");
/// Run material.
pub const MATERIAL: Field = f("material", "Material", "", 1.0, "material");
/// Run length.
pub const LENGTH: Field = f("length_m", "Length", "m", 1.0, "length");
/// Run bore given.
pub const BORE: Field = f(
    "inner_diameter_m",
    "Inner diameter",
    "mm",
    1000.0,
    "inner_diameter",
);
/// Run roughness given.
pub const ROUGHNESS: Field = f("roughness_m", "Roughness", "mm", 1000.0, "roughness");
/// Run Hazen–Williams C.
pub const C_FACTOR: Field = f("c_factor", "C factor", "", 1.0, "c_factor");
/// Fitting line (moved to another line).
pub const LINE: Field = f("line", "Line", "", 1.0, "line");
/// Fitting kind.
pub const KIND: Field = f("kind", "Kind", "", 1.0, "item");
/// Fitting quantity.
pub const QTY: Field = f("qty", "Qty", "", 1.0, "qty");
/// Valve opening (stored as a fraction).
pub const OPENING: Field = f("opening", "Opening", "%", 100.0, "opening");
/// Given K.
pub const K: Field = f("k", "K", "", 1.0, "k");
/// Given Kv (m³/h at 1 bar; a coefficient, never converted).
pub const KV: Field = f("kv", "Kv", "", 1.0, "kv");
/// Given Cv (US gpm at 1 psi; a coefficient, never converted).
pub const CV: Field = f("cv", "Cv", "", 1.0, "cv");
/// Given Le/D.
pub const LE_D: Field = f("le_d", "Le/D", "", 1.0, "le_d");
/// System lines.
pub const LINES: Field = f("lines", "Lines", "", 1.0, "lines");
/// System static head.
pub const STATIC_HEAD: Field = f("static_head_m", "Static head", "m", 1.0, "static_head");
/// System pump head.
pub const PUMP_HEAD: Field = f("pump_head_m", "Pump head", "m", 1.0, "pump_head");
/// System NPSH required.
pub const NPSH_REQUIRED: Field = f(
    "npsh_required_m",
    "NPSH required",
    "m",
    1.0,
    "npsh_required",
);
/// System source pressure.
pub const SOURCE_PRESSURE: Field = f(
    "source_pressure_pa",
    "Source pressure",
    "kPa",
    1e-3,
    "source_pressure",
);
/// System suction level.
pub const SUCTION_LEVEL: Field = f(
    "suction_level_m",
    "Suction level",
    "m",
    1.0,
    "suction_level",
);
/// Duty verdict of a system.
pub const DUTY: Field = f(
    "duty",
    "Pump head against required head",
    "",
    1.0,
    "pump_head",
);
/// NPSH verdict of a system.
pub const NPSH: Field = f("npsh", "NPSH margin", "", 1.0, "npsh_required");

/// Every field, for looking one up by key.
pub const ALL: &[Field] = &[
    FLOW,
    SERVICE,
    FLUID,
    TEMPERATURE,
    ELEVATION,
    HOURS,
    EFFICIENCY,
    SYSTEM,
    SIZE,
    SIZE_OUT,
    SCHEDULE,
    MATERIAL,
    LENGTH,
    BORE,
    ROUGHNESS,
    C_FACTOR,
    LINE,
    KIND,
    QTY,
    OPENING,
    K,
    KV,
    CV,
    LE_D,
    LINES,
    STATIC_HEAD,
    PUMP_HEAD,
    NPSH_REQUIRED,
    SOURCE_PRESSURE,
    SUCTION_LEVEL,
    DUTY,
    NPSH,
];

impl Field {
    /// The display unit and the factor from SI in the given units (`m3/h` → `US gpm` …).
    pub fn unit_in(&self, units: UnitSystem) -> (String, f64) {
        if self.unit.is_empty() {
            return (String::new(), 1.0);
        }
        let (h, factor) = header_in(&format!("[{}]", self.unit), units);
        (h.trim_matches(['[', ']']).to_string(), self.factor * factor)
    }

    /// A value as shown: numbers in the display unit to six significant figures.
    pub fn show(&self, v: &Value, units: UnitSystem) -> String {
        match v {
            Value::Text(t) => t.clone(),
            Value::Number(x) => {
                let (unit, factor) = self.unit_in(units);
                let n = crate::ingest::rows::format_number(crate::report::style::shown(x * factor));
                if unit.is_empty() {
                    n
                } else {
                    format!("{n} {unit}")
                }
            }
        }
    }
}

/// A number value, when given.
pub fn num(x: Option<f64>) -> Option<Value> {
    x.map(Value::Number)
}

/// A text value, when not empty.
pub fn text(s: impl Into<String>) -> Option<Value> {
    let s = s.into();
    (!s.is_empty()).then_some(Value::Text(s))
}

/// A size in one notation, whatever way it was written, so `NPS 6`, `6"` and `DN150` are one
/// size: the nominal DN (NPS converted to its DN), else `OD 110 mm`, `Ø114.3×6.02 mm`,
/// `ID 102.3 mm`.
pub fn size_label(size: &SizeSpec) -> String {
    let mm = |m: f64| crate::ingest::rows::format_number((m * 1e4).round() / 10.0);
    match *size {
        SizeSpec::Dn(dn) => format!("DN{dn}"),
        SizeSpec::Nps(n) => match crate::physics::pipe::nps_to_dn(n) {
            Some(dn) => format!("DN{dn}"),
            None => format!("NPS {n}"),
        },
        SizeSpec::OuterDiameter { od_m } => format!("OD {} mm", mm(od_m)),
        SizeSpec::OdWall { od_m, wall_m } => format!("Ø{}×{} mm", mm(od_m), mm(wall_m)),
        SizeSpec::InnerDiameter { id_m } => format!("ID {} mm", mm(id_m)),
    }
}
