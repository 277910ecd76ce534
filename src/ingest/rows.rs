//! Typed rows read from the located tables, one cell at a time, with every problem collected.

use calamine::Data;
use std::collections::{HashMap, HashSet};

use super::grid::SheetGrid;
use super::header::{Layout, MappedColumn};
use super::parse::{self, CellNumber, SizeSpec, SizeUnit};
use super::schema::{ColumnType, TableKind};
use super::{Conversion, Input, Skipped};
use crate::error::{CellRef, Diagnostic, Severity};
use crate::physics::fitting::{self, Kind};
use crate::physics::pipe::{self, Material, Schedule};
use crate::units::{self, Quantity};

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
        let f = super::schema::fold(text);
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

/// Where a row came from.
#[derive(Clone, Debug, PartialEq)]
pub struct Origin {
    /// Sheet name.
    pub sheet: String,
    /// Zero-based row.
    pub row: u32,
}

/// A value the tool assumed because the cell was blank.
#[derive(Clone, Debug, PartialEq)]
pub struct Assumed {
    /// The (blank) cell, when the column exists; otherwise the row's first cell.
    pub cell: CellRef,
    /// Canonical column key.
    pub key: &'static str,
    /// What was assumed, in words.
    pub what: String,
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

/// A row of `Pipes`.
#[derive(Clone, Debug, PartialEq)]
pub struct PipeRow {
    /// Source row.
    pub origin: Origin,
    /// Line id.
    pub line: String,
    /// Order along the line.
    pub seq: Option<f64>,
    /// Nominal size as written.
    pub size: Option<SizeSpec>,
    /// Schedule as written.
    pub schedule: Option<Schedule>,
    /// Material.
    pub material: Material,
    /// Length, m.
    pub length_m: f64,
    /// Bore given, m.
    pub inner_diameter_m: Option<f64>,
    /// Roughness given, m.
    pub roughness_m: Option<f64>,
    /// Age, years.
    pub age_years: Option<f64>,
    /// Hazen–Williams C.
    pub c_factor: Option<f64>,
    /// Flow given on the run, m³/s.
    pub flow_m3_s: Option<f64>,
    /// Values assumed.
    pub assumed: Vec<Assumed>,
}

/// A row of `Fittings`.
#[derive(Clone, Debug)]
pub struct FittingRow {
    /// Source row.
    pub origin: Origin,
    /// Tag (may be blank).
    pub tag: String,
    /// Line id.
    pub line: String,
    /// Item text as written.
    pub item: String,
    /// Catalogue kind matched.
    pub kind: &'static Kind,
    /// Size.
    pub size: Option<SizeSpec>,
    /// Outlet size.
    pub size_out: Option<SizeSpec>,
    /// Quantity.
    pub qty: f64,
    /// Fraction open, when given.
    pub opening: Option<f64>,
    /// Given K.
    pub k: Option<f64>,
    /// Given Kv.
    pub kv: Option<f64>,
    /// Given Cv.
    pub cv: Option<f64>,
    /// Given Le/D.
    pub le_d: Option<f64>,
    /// Bend radius over bore.
    pub bend_radius_d: Option<f64>,
    /// Angle, degrees.
    pub angle_deg: Option<f64>,
    /// Fouling multiplier.
    pub fouling: Option<f64>,
    /// Orifice β.
    pub beta: Option<f64>,
    /// Replacement cost (currency of the rules).
    pub replacement_cost: Option<f64>,
    /// Values assumed.
    pub assumed: Vec<Assumed>,
}

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
}

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
}

/// A row of `Fluids`.
#[derive(Clone, Debug, PartialEq)]
pub struct FluidRow {
    /// Source row.
    pub origin: Origin,
    /// Fluid name (lower case).
    pub fluid: String,
    /// kg/m³.
    pub density_kg_m3: f64,
    /// Pa·s.
    pub viscosity_pa_s: f64,
    /// Pa, absolute.
    pub vapour_pressure_pa: Option<f64>,
}

/// Reads cells of one row, pushing diagnostics.
struct Cells<'a> {
    file: &'a str,
    grid: &'a SheetGrid,
    layout: &'a Layout,
    decimal_comma: &'a HashMap<u32, bool>,
    row: u32,
    diags: &'a mut Vec<Diagnostic>,
    conversions: &'a mut Vec<Conversion>,
    errors: usize,
}

impl Cells<'_> {
    fn col(&self, key: &str) -> Option<&MappedColumn> {
        self.layout.column(key)
    }

    fn cell(&self, key: &str) -> CellRef {
        let col = self.col(key).map(|c| c.col).unwrap_or(0);
        CellRef::new(&self.layout.sheet, self.row, col)
    }

    fn error(&mut self, key: &str, message: String, hint: Option<String>) {
        let cell = self.cell(key);
        self.errors += 1;
        self.diags.push(Diagnostic {
            severity: Severity::Error,
            file: self.file.to_string(),
            cell: Some(cell),
            message,
            hint,
        });
    }

    fn assumed(&self, key: &'static str, what: String) -> Assumed {
        Assumed {
            cell: self.cell(key),
            key,
            what,
        }
    }

    /// Raw value, or None for a blank; a formula without cached value or an error value is reported.
    fn raw(&mut self, key: &str) -> Option<Data> {
        let col = self.col(key)?.col;
        let value = self.grid.merged_value(self.row, col).clone();
        match value {
            Data::Empty => {
                if let Some(f) = self.grid.formula(self.row, col) {
                    let f = f.to_string();
                    self.error(
                        key,
                        format!("formula ={f} has no cached value"),
                        Some(
                            "open the file in a spreadsheet application, recalculate and save it"
                                .into(),
                        ),
                    );
                }
                None
            }
            Data::Error(e) => {
                self.error(
                    key,
                    format!("cell holds the error value {e}"),
                    Some("fix the formula or enter the value".into()),
                );
                None
            }
            Data::String(s) if s.trim().is_empty() => None,
            other => Some(other),
        }
    }

    fn text(&mut self, key: &str) -> Option<String> {
        Some(match self.raw(key)? {
            Data::String(s) => s.trim().to_string(),
            Data::Int(i) => i.to_string(),
            Data::Float(f) => format_number(f),
            Data::Bool(b) => b.to_string(),
            Data::DateTime(d) => d.as_f64().to_string(),
            Data::DateTimeIso(s) | Data::DurationIso(s) => s,
            Data::Empty | Data::Error(_) => return None,
        })
    }

    fn header(&self, key: &str) -> String {
        self.col(key)
            .map(|c| c.header.clone())
            .unwrap_or_else(|| key.to_string())
    }

    /// A number in SI units of the column's quantity (or plain), None for blank.
    fn number(&mut self, key: &str) -> Option<f64> {
        let mapped = self.col(key)?.clone();
        let raw = self.raw(key)?;
        let header = mapped.header.clone();
        let quantity = match mapped.spec.ty {
            ColumnType::Number(q) => Some(q),
            _ => None,
        };
        let column_unit = mapped.unit;
        if quantity.is_some() && column_unit.is_none() {
            self.error(
                key,
                format!(
                    "unit '{}' of column '{header}' is not understood",
                    mapped.unit_label.clone().unwrap_or_default()
                ),
                Some(format!(
                    "write the unit in brackets, e.g. '{} [{}]'",
                    mapped.spec.header,
                    quantity.map(|q| units::default_unit(q).label).unwrap_or("")
                )),
            );
            return None;
        }
        let (value, cell_unit, percent) = match raw {
            Data::Float(f) => (f, None, false),
            Data::Int(i) => (i as f64, None, false),
            Data::String(s) => {
                let dc = self
                    .decimal_comma
                    .get(&mapped.col)
                    .copied()
                    .unwrap_or(false);
                match parse::parse_number_text(&s, dc) {
                    Ok(CellNumber::Blank) => return None,
                    Ok(CellNumber::Value {
                        value,
                        unit,
                        percent,
                        ..
                    }) => {
                        self.conversions.push(Conversion {
                            cell: CellRef::new(&self.layout.sheet, self.row, mapped.col),
                            text: s.clone(),
                            value,
                            unit: if percent {
                                Some("%".into())
                            } else {
                                unit.clone()
                            },
                        });
                        (value, unit, percent)
                    }
                    Err(e) => {
                        self.error(
                            key,
                            format!("{header}: {e}"),
                            Some("enter a number, e.g. 12.5".into()),
                        );
                        return None;
                    }
                }
            }
            Data::DateTime(_) | Data::DateTimeIso(_) | Data::DurationIso(_) => {
                self.error(
                    key,
                    format!("{header}: a date or time where a number belongs"),
                    Some("format the cell as a number and re-enter the value".into()),
                );
                return None;
            }
            Data::Bool(b) => {
                self.error(
                    key,
                    format!("{header}: TRUE/FALSE ({b}) where a number belongs"),
                    None,
                );
                return None;
            }
            Data::Empty | Data::Error(_) => return None,
        };
        if !value.is_finite() {
            self.error(
                key,
                format!("{header}: value {value} is not a finite number"),
                None,
            );
            return None;
        }
        let Some(q) = quantity else {
            if let Some(u) = cell_unit {
                self.error(
                    key,
                    format!("{header}: unexpected unit '{u}' in a plain-number column"),
                    None,
                );
                return None;
            }
            return Some(if percent { value / 100.0 } else { value });
        };
        if q == Quantity::Fraction {
            let label = mapped
                .unit_label
                .as_deref()
                .map(super::schema::fold)
                .unwrap_or_default();
            let column_is_percent = label.contains("pct") || label.contains("percent");
            return Some(parse::parse_percent_or_fraction(
                value,
                percent,
                column_is_percent,
            ));
        }
        let unit = match cell_unit {
            Some(label) => match units::parse_unit(&label, q) {
                Some(u) => u,
                None => {
                    self.error(
                        key,
                        format!("{header}: unit '{label}' in the cell is not a unit of {q:?}"),
                        None,
                    );
                    return None;
                }
            },
            None => column_unit?,
        };
        let si = unit.to_si(value);
        si.is_finite().then_some(si).or_else(|| {
            self.error(
                key,
                format!("{header}: value {value} overflows in SI units"),
                None,
            );
            None
        })
    }

    fn positive(&mut self, key: &str, allow_zero: bool) -> Option<f64> {
        let v = self.number(key)?;
        if v < 0.0 || (!allow_zero && v == 0.0) {
            let header = self.header(key);
            let need = if allow_zero {
                "zero or more"
            } else {
                "greater than zero"
            };
            self.error(
                key,
                format!("{header} {} must be {need}", format_number(v)),
                None,
            );
            return None;
        }
        Some(v)
    }

    fn size(&mut self, key: &str) -> Option<SizeSpec> {
        let mapped = self.col(key)?.clone();
        let unit =
            mapped
                .unit_label
                .as_deref()
                .and_then(|l| match super::schema::fold(l).as_str() {
                    "mm" | "dn" => Some(SizeUnit::Millimetre),
                    "in" | "inch" | "inches" | "nps" => Some(SizeUnit::Inch),
                    _ => None,
                });
        let text = self.text(key)?;
        match parse::parse_size(&text, unit) {
            Ok(s) => Some(s),
            Err(e) => {
                let header = mapped.header.clone();
                self.error(
                    key,
                    format!("{header}: {e}"),
                    Some("write sizes like DN100, NPS 4, 4\", 110 OD or ID 102.3".into()),
                );
                None
            }
        }
    }
}

/// Format a number without a trailing `.0` for integral values.
pub fn format_number(v: f64) -> String {
    if v.fract() == 0.0 && v.abs() < 1e15 {
        format!("{}", v as i64)
    } else {
        format!("{v}")
    }
}

fn decimal_comma_columns(grid: &SheetGrid, layout: &Layout) -> HashMap<u32, bool> {
    let mut out = HashMap::new();
    for c in &layout.columns {
        if !matches!(c.spec.ty, ColumnType::Number(_) | ColumnType::Plain) {
            continue;
        }
        let (mut decimal, mut other) = (0, 0);
        for row in layout.data_start..grid.end_row() {
            if let Data::String(s) = grid.value(row, c.col)
                && s.contains(',')
            {
                if parse::looks_decimal_comma(s) {
                    decimal += 1;
                } else {
                    other += 1;
                }
            }
        }
        out.insert(c.col, decimal > 0 && other == 0);
    }
    out
}

/// Why a row inside a table is not data, when it is not: a header repeated (page breaks), a
/// totals row, or a note written across the row.
/// Why a data row is not read, if it is not: a repeated header, a totals row or a note.
/// `folded_headers` are the layout's headers folded, in column order. Runs on every row, so the
/// common case (a plain data row) allocates nothing.
fn skip_reason(
    grid: &SheetGrid,
    layout: &Layout,
    folded_headers: &[String],
    row: u32,
) -> Option<String> {
    let text = |col: u32| match grid.value(row, col) {
        Data::String(s) => Some(s.trim()),
        _ => None,
    };
    let repeated = layout
        .columns
        .iter()
        .zip(folded_headers)
        .filter(|(c, h)| text(c.col).is_some_and(|t| super::schema::fold_eq(t, h)))
        .count();
    if repeated >= 2 {
        return Some("the header repeated".into());
    }
    let first = layout.columns.iter().map(|c| c.col).min()?;
    let mut filled = (0..grid.end_col()).filter(|&c| !matches!(grid.value(row, c), Data::Empty));
    let first_filled = filled.next();
    let only_one_filled = first_filled.is_some() && filled.next().is_none();
    let leading = first_filled.and_then(text).unwrap_or_default();
    // The words below are at most 14 characters: fold no more of the text than that.
    let folded = super::schema::fold_prefix(leading, 14);
    let line_text = layout
        .column("line")
        .and_then(|c| text(c.col))
        .unwrap_or_default();
    let line_folded = super::schema::fold_prefix(line_text, 14);
    for word in [
        "total",
        "subtotal",
        "grandtotal",
        "carriedforward",
        "broughtforward",
    ] {
        if folded.starts_with(word) || line_folded.starts_with(word) {
            let t = if line_folded.starts_with(word) {
                line_text
            } else {
                leading
            };
            return Some(format!("a totals row ('{t}')"));
        }
    }
    let is_note = ["note", "notes", "remark", "remarks", "comment"]
        .iter()
        .any(|w| {
            folded.starts_with(w)
                && leading
                    .trim_start()
                    .get(w.len()..w.len() + 1)
                    .is_none_or(|c| !c.chars().all(char::is_alphanumeric))
        });
    if is_note && only_one_filled && first_filled.is_some_and(|c| c <= first + 1) {
        return Some(format!("a note ('{}')", truncate(leading, 40)));
    }
    None
}

fn truncate(s: &str, n: usize) -> String {
    if s.chars().count() <= n {
        s.to_string()
    } else {
        s.chars().take(n).chain(['…']).collect()
    }
}

/// Visit each non-blank data row of a table; skipped and blank rows go to the parse report.
fn for_each_row(
    input: &Input,
    sink: &mut Sink,
    table: TableKind,
    mut f: impl FnMut(&mut Cells<'_>),
) {
    let Some(layout) = input.layout(table).cloned() else {
        return;
    };
    let grid = &input.sheets[layout.sheet_index];
    let dc = decimal_comma_columns(grid, &layout);
    let folded_headers: Vec<String> = layout
        .columns
        .iter()
        .map(|c| super::schema::fold(&c.header))
        .collect();
    let mut blanks = 0;
    let end = grid.end_row();
    let is_blank = |row: u32| {
        layout
            .columns
            .iter()
            .all(|c| match grid.merged_value(row, c.col) {
                Data::Empty => true,
                Data::String(s) => s.trim().is_empty(),
                _ => false,
            })
            && layout
                .columns
                .iter()
                .all(|c| grid.formula(row, c.col).is_none())
    };
    let last_data = (layout.data_start..end)
        .rev()
        .find(|&r| !is_blank(r))
        .unwrap_or(0);
    for row in layout.data_start..end {
        if is_blank(row) {
            // Blank rows after the last data row are not worth counting.
            if row < last_data {
                blanks += 1;
            }
            continue;
        }
        if let Some(reason) = skip_reason(grid, &layout, &folded_headers, row) {
            let cell = CellRef::new(&layout.sheet, row, 0);
            sink.diagnostics.push(Diagnostic {
                severity: Severity::Warning,
                file: input.file.clone(),
                cell: Some(cell.clone()),
                message: format!("row skipped: {reason}"),
                hint: None,
            });
            sink.skipped.push(Skipped { cell, reason });
            continue;
        }
        let mut cells = Cells {
            file: &input.file,
            grid,
            layout: &layout,
            decimal_comma: &dc,
            row,
            diags: &mut sink.diagnostics,
            conversions: &mut sink.conversions,
            errors: 0,
        };
        f(&mut cells);
    }
    if blanks > 0 {
        sink.blank_rows.push((layout.sheet.clone(), blanks));
    }
}

/// What reading one table reports besides its rows; appended to the input in table order.
#[derive(Default)]
struct Sink {
    diagnostics: Vec<Diagnostic>,
    conversions: Vec<Conversion>,
    skipped: Vec<Skipped>,
    blank_rows: Vec<(String, usize)>,
}

impl Sink {
    fn append_to(self, input: &mut Input) {
        input.diagnostics.extend(self.diagnostics);
        input.report.conversions.extend(self.conversions);
        input.report.skipped.extend(self.skipped);
        input.report.blank_rows.extend(self.blank_rows);
    }
}

/// Read all tables of an input into its row vectors. Fittings, the longest table of a register,
/// are read on a second thread while this one reads the others; what the tables report is
/// appended in table order, so the result does not depend on the threads.
pub fn read_all(input: &mut Input) {
    let (sinks, (lines, pipes, fittings, systems, fluids, pump_curves)) = {
        let input = &*input;
        std::thread::scope(|scope| {
            let fittings = scope.spawn(|| {
                let mut sink = Sink::default();
                let rows = read_fittings(input, &mut sink);
                (sink, rows)
            });
            let mut sinks: [Sink; 6] = Default::default();
            let lines = read_lines(input, &mut sinks[0]);
            let pipes = read_pipes(input, &mut sinks[1]);
            let systems = read_systems(input, &mut sinks[3]);
            let fluids = read_fluids(input, &mut sinks[4]);
            let pump_curves = read_pump_curves(input, &mut sinks[5]);
            let (fitting_sink, fittings) = fittings
                .join()
                .unwrap_or_else(|panic| std::panic::resume_unwind(panic));
            sinks[2] = fitting_sink;
            (
                sinks,
                (lines, pipes, fittings, systems, fluids, pump_curves),
            )
        })
    };
    for sink in sinks {
        sink.append_to(input);
    }
    input.lines = lines;
    input.pipes = pipes;
    input.fittings = fittings;
    input.systems = systems;
    input.fluids = fluids;
    input.pump_curves = pump_curves;
}

fn read_lines(input: &Input, sink: &mut Sink) -> Vec<LineRow> {
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
                assumed.push(c.assumed("service", "service general".into()));
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
                assumed.push(c.assumed("fluid", "fluid water".into()));
                "water".into()
            });
        let temperature_c = c.number("temperature").unwrap_or_else(|| {
            assumed.push(c.assumed("temperature", "temperature 20 °C".into()));
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

fn read_pipes(input: &Input, sink: &mut Sink) -> Vec<PipeRow> {
    let mut pipes = Vec::new();
    for_each_row(input, sink, TableKind::Pipes, |c| {
        let Some(line) = c.text("line") else {
            c.error(
                "line",
                "line id is blank".into(),
                Some("every pipe run needs the id of its line".into()),
            );
            return;
        };
        let mut assumed = Vec::new();
        let size = c.size("size");
        let schedule = c.text("schedule").and_then(|t| {
            pipe::parse_schedule(&t).or_else(|| {
                c.error(
                    "schedule",
                    format!("schedule '{t}' is not known"),
                    Some("write e.g. 40, STD, XS, 80, 10S, 40S or SDR11".into()),
                );
                None
            })
        });
        let material = match c.text("material") {
            Some(t) => match pipe::material_from_text(&t) {
                Some(m) => m,
                None => {
                    c.error("material", format!("material '{t}' is not known"), Some("use e.g. carbon steel, stainless, galvanised, cast iron, ductile iron, PVC, PE, copper, concrete".into()));
                    return;
                }
            },
            None => {
                assumed.push(c.assumed("material", "material carbon steel".into()));
                Material::CarbonSteel
            }
        };
        let length = c.positive("length", false);
        if c.col("length").is_some() && length.is_none() && c.errors == 0 {
            c.error(
                "length",
                "length is blank".into(),
                Some("every pipe run needs a length".into()),
            );
        }
        let inner = c.positive("inner_diameter", false);
        let roughness = c.positive("roughness", true);
        if size.is_none() && inner.is_none() && c.errors == 0 {
            c.error(
                "size",
                "neither Size nor Inner diameter is given".into(),
                Some("give a nominal size (DN100, 4\") or the bore".into()),
            );
        }
        let flow = c.positive("flow", true);
        let c_factor = c.positive("c_factor", false);
        let age = c.positive("age", true);
        let seq = c.number("seq");
        if schedule.is_none() && inner.is_none() {
            let dn = match size {
                Some(SizeSpec::Dn(dn)) => Some(dn),
                Some(SizeSpec::Nps(n)) => pipe::nps_to_dn(n),
                _ => None,
            };
            if let Some(s) = dn.and_then(|dn| pipe::default_schedule(material, dn)) {
                assumed.push(c.assumed(
                    "schedule",
                    format!("schedule {} (default for {})", s.label(), material.name()),
                ));
            } else if matches!(size, Some(SizeSpec::OuterDiameter { .. })) {
                assumed.push(c.assumed(
                    "schedule",
                    format!("the usual wall of {} for that OD", material.name()),
                ));
            }
        }
        if roughness.is_none() && c_factor.is_none() {
            let r = pipe::roughness(material);
            let what = match age.and_then(|a| pipe::aged_roughness(material, a).map(|e| (a, e))) {
                Some((a, e)) => format!(
                    "roughness {:.4} mm ({} aged {a} years)",
                    e * 1e3,
                    material.name()
                ),
                None => format!(
                    "roughness {:.4} mm (new {})",
                    r.epsilon_m * 1e3,
                    material.name()
                ),
            };
            assumed.push(c.assumed("roughness", what));
        }
        if let Some(length_m) = length
            && c.errors == 0
        {
            pipes.push(PipeRow {
                origin: Origin {
                    sheet: c.layout.sheet.clone(),
                    row: c.row,
                },
                line,
                seq,
                size,
                schedule,
                material,
                length_m,
                inner_diameter_m: inner,
                roughness_m: roughness,
                age_years: age,
                c_factor,
                flow_m3_s: flow,
                assumed,
            });
        }
    });
    pipes.shrink_to_fit();
    pipes
}

fn read_fittings(input: &Input, sink: &mut Sink) -> Vec<FittingRow> {
    let mut fittings = Vec::new();
    for_each_row(input, sink, TableKind::Fittings, |c| {
        let Some(line) = c.text("line") else {
            c.error(
                "line",
                "line id is blank".into(),
                Some("every fitting needs the id of its line".into()),
            );
            return;
        };
        let tag = c.text("tag").unwrap_or_default();
        let k = c.positive("k", true);
        let kv = c.positive("kv", false);
        let cv = c.positive("cv", false);
        let item = c.text("item").unwrap_or_default();
        let kind = if item.is_empty() {
            if k.is_some() || kv.is_some() || cv.is_some() {
                fitting::find_kind("given")
            } else {
                c.error(
                    "item",
                    "item is blank and no K, Kv or Cv is given".into(),
                    Some("describe the fitting, e.g. '90 elbow', 'gate valve'".into()),
                );
                return;
            }
        } else {
            match fitting::match_item(&item) {
                Ok(kind) => Some(kind),
                Err(near) => {
                    let hint = (!near.is_empty()).then(|| {
                        format!(
                            "did you mean {}? (`lossledger kinds` lists them all)",
                            near.iter()
                                .map(|n| format!("\"{n}\""))
                                .collect::<Vec<_>>()
                                .join(", ")
                        )
                    });
                    c.error(
                        "item",
                        format!("item '{item}' matches no fitting kind"),
                        hint,
                    );
                    return;
                }
            }
        };
        let Some(kind) = kind else { return };
        let mut assumed = Vec::new();
        let qty = match c.positive("qty", false) {
            Some(q) => q,
            None => {
                if c.errors == 0 {
                    assumed.push(c.assumed("qty", "quantity 1".into()));
                }
                1.0
            }
        };
        let opening = c.positive("opening", true);
        if let Some(o) = opening
            && o > 1.0
        {
            c.error(
                "opening",
                format!("opening {} % is above 100 %", format_number(o * 100.0)),
                None,
            );
        }
        if opening.is_none() && kind.is_valve() {
            assumed.push(c.assumed("opening", "fully open".into()));
        }
        let fouling = c.positive("fouling", false);
        let beta = c.positive("beta", false);
        let row = FittingRow {
            origin: Origin {
                sheet: c.layout.sheet.clone(),
                row: c.row,
            },
            tag,
            line,
            item,
            kind,
            size: c.size("size"),
            size_out: c.size("size_out"),
            qty,
            opening,
            k,
            kv,
            cv,
            le_d: c.positive("le_d", false),
            bend_radius_d: c.positive("bend_radius_d", false),
            angle_deg: c.positive("angle", false),
            fouling,
            beta,
            replacement_cost: c.positive("replacement_cost", true),
            assumed,
        };
        if c.errors == 0 {
            fittings.push(row);
        }
    });
    fittings.shrink_to_fit();
    fittings
}

fn read_systems(input: &Input, sink: &mut Sink) -> Vec<SystemRow> {
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
            efficiency: c.positive("efficiency", false),
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

fn read_fluids(input: &Input, sink: &mut Sink) -> Vec<FluidRow> {
    let mut fluids = Vec::new();
    for_each_row(input, sink, TableKind::Fluids, |c| {
        let Some(fluid) = c.text("fluid") else { return };
        let density = c.positive("density", false);
        let viscosity = c.positive("viscosity", false);
        let vapour = c.positive("vapour_pressure", true);
        match (density, viscosity) {
            (Some(d), Some(v)) => fluids.push(FluidRow {
                origin: Origin {
                    sheet: c.layout.sheet.clone(),
                    row: c.row,
                },
                fluid: fluid.to_lowercase(),
                density_kg_m3: d,
                viscosity_pa_s: v,
                vapour_pressure_pa: vapour,
            }),
            _ if c.errors == 0 => c.error(
                "density",
                format!("fluid '{fluid}' needs both density and viscosity"),
                None,
            ),
            _ => {}
        }
    });
    fluids
}

fn read_pump_curves(input: &Input, sink: &mut Sink) -> Vec<PumpCurveRow> {
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

/// Checks across tables (after all files are read): every line referenced exists where it must,
/// and every line has a flow.
pub fn cross_check(input: &mut Input) {
    let pipe_lines: HashSet<&str> = input.pipes.iter().map(|p| p.line.as_str()).collect();
    let mut diags = Vec::new();
    let col_of = |input: &Input, table: TableKind, sheet: &str, key: &str| {
        input
            .layout_on(table, sheet)
            .and_then(|l| l.column(key))
            .map(|c| c.col)
            .unwrap_or(0)
    };
    for f in &input.fittings {
        if !pipe_lines.contains(f.line.as_str()) {
            diags.push(Diagnostic {
                severity: Severity::Error,
                file: input.file_of(&f.origin.sheet).to_string(),
                cell: Some(CellRef::new(
                    &f.origin.sheet,
                    f.origin.row,
                    col_of(input, TableKind::Fittings, &f.origin.sheet, "line"),
                )),
                message: format!(
                    "fitting on line '{}', which has no pipe run in Pipes",
                    f.line
                ),
                hint: Some("add the line's runs to Pipes or correct the line id".into()),
            });
        }
    }
    let pipe_flow: HashSet<&str> = input
        .pipes
        .iter()
        .filter(|p| p.flow_m3_s.is_some())
        .map(|p| p.line.as_str())
        .collect();
    let listed: HashSet<&str> = input.lines.iter().map(|l| l.line.as_str()).collect();
    for l in &input.lines {
        if l.flow_m3_s.is_none()
            && !pipe_flow.contains(l.line.as_str())
            && pipe_lines.contains(l.line.as_str())
        {
            diags.push(Diagnostic {
                severity: Severity::Error,
                file: input.file_of(&l.origin.sheet).to_string(),
                cell: Some(CellRef::new(
                    &l.origin.sheet,
                    l.origin.row,
                    col_of(input, TableKind::Lines, &l.origin.sheet, "flow"),
                )),
                message: format!("line '{}' has no flow", l.line),
                hint: Some("enter the line's design flow (a blank is not read as zero)".into()),
            });
        }
    }
    let mut reported = HashSet::new();
    for p in &input.pipes {
        if !listed.contains(p.line.as_str())
            && p.flow_m3_s.is_none()
            && reported.insert(p.line.clone())
        {
            diags.push(Diagnostic {
                severity: Severity::Error,
                file: input.file_of(&p.origin.sheet).to_string(),
                cell: Some(CellRef::new(
                    &p.origin.sheet,
                    p.origin.row,
                    col_of(input, TableKind::Pipes, &p.origin.sheet, "line"),
                )),
                message: format!(
                    "line '{}' has no flow: it is not in Lines and its runs give none",
                    p.line
                ),
                hint: Some(
                    "list the line in Lines with its flow, or add a Flow column to Pipes".into(),
                ),
            });
        }
    }
    // A Pipes table with a header and nothing under it would give an empty audit: say so instead.
    if input.pipes.is_empty()
        && input.error_count() == 0
        && diags.is_empty()
        && let Some(l) = input.layout(TableKind::Pipes)
    {
        diags.push(Diagnostic {
            severity: Severity::Error,
            file: input.file_of(&l.sheet).to_string(),
            cell: Some(CellRef::new(&l.sheet, l.header_row, 0)),
            message: format!(
                "sheet '{}' has a header row but no pipe runs under it",
                l.sheet
            ),
            hint: Some("enter at least one run (line, size, length) below the header".into()),
        });
    }
    input.diagnostics.extend(diags);
}
