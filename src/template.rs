//! `lossledger template`: a blank input workbook laid out the way the reader expects — canonical
//! sheets and headers, a units row, drop-down lists for service, item kind and material, one
//! invented example row, and a `Read me` sheet explaining each column.

use rust_xlsxwriter::{
    Color, DataValidation, DataValidationErrorStyle, DocProperties, ExcelDateTime, Format,
    FormatBorder, Formula, Note, Workbook, Worksheet, XlsxError,
};
use std::path::Path;

use crate::ingest::rows::{Control, Service};
use crate::ingest::schema::{self, ColumnSpec, ColumnType, TableKind};
use crate::physics::{fitting, pipe};
use crate::units::Quantity;
use crate::units::UnitSystem;

/// Row (zero-based) of the headers in every table sheet of the template.
pub const HEADER_ROW: u32 = 0;
/// Row (zero-based) of the units row.
pub const UNITS_ROW: u32 = 1;
/// Row (zero-based) of the invented example row.
pub const EXAMPLE_ROW: u32 = 2;
/// Rows (zero-based, exclusive) the drop-down lists cover.
pub const LIST_ROWS: u32 = 2000;
/// Header of the free-text column after the canonical ones (kept as is by the reader).
pub const REMARKS: &str = "Remarks";
/// Text in the Remarks cell of the example rows.
pub const EXAMPLE_NOTE: &str = "INVENTED EXAMPLE ROW: replace or delete it";

/// The tables the template holds, in sheet order: every table, in reading order.
pub const TABLES: [TableKind; 6] = crate::ingest::schema::ALL_TABLES;

/// The unit label written in the units row for a column (None for text and size columns).
pub fn unit_label(spec: &ColumnSpec, units: UnitSystem) -> Option<&'static str> {
    let ColumnType::Number(q) = spec.ty else {
        return match (spec.ty, spec.key) {
            (ColumnType::Plain, "age") => Some("years"),
            (ColumnType::Plain, "angle") => Some("°"),
            (ColumnType::Plain, _) => Some("-"),
            _ => None,
        };
    };
    let fine = matches!(spec.key, "inner_diameter" | "roughness");
    Some(match (units, q) {
        (_, Quantity::Fraction) => "%",
        (_, Quantity::Duration) => "h",
        (_, Quantity::Energy) => "kWh/yr",
        (UnitSystem::Si, Quantity::Volume) => "m3/yr",
        (UnitSystem::Us, Quantity::Volume) => "gal/yr",
        (UnitSystem::Si, Quantity::Power) => "kW",
        (UnitSystem::Us, Quantity::Power) => "hp",
        (UnitSystem::Si, Quantity::Length) => {
            if fine {
                "mm"
            } else {
                "m"
            }
        }
        (UnitSystem::Us, Quantity::Length) => {
            if fine {
                "in"
            } else {
                "ft"
            }
        }
        (UnitSystem::Si, Quantity::Flow) => "m3/h",
        (UnitSystem::Us, Quantity::Flow) => "gpm",
        (UnitSystem::Si, Quantity::Pressure) => "kPa",
        (UnitSystem::Us, Quantity::Pressure) => "psi",
        (UnitSystem::Si, Quantity::Head) => "m",
        (UnitSystem::Us, Quantity::Head) => "ft",
        (UnitSystem::Si, Quantity::Temperature) => "°C",
        (UnitSystem::Us, Quantity::Temperature) => "°F",
        (UnitSystem::Si, Quantity::Velocity) => "m/s",
        (UnitSystem::Us, Quantity::Velocity) => "ft/s",
        (UnitSystem::Si, Quantity::Density) => "kg/m3",
        (UnitSystem::Us, Quantity::Density) => "lb/ft3",
        (_, Quantity::Viscosity) => "cP",
    })
}

enum Cell {
    S(&'static str),
    N(f64),
}

/// The invented example row of a table, by column key.
fn example(table: TableKind, units: UnitSystem) -> Vec<(&'static str, Cell)> {
    use Cell::{N, S};
    let us = units == UnitSystem::Us;
    match table {
        TableKind::Lines => vec![
            ("line", S("EXAMPLE-1")),
            ("service", S("pump-discharge")),
            ("flow", N(if us { 220.0 } else { 50.0 })),
            ("fluid", S("water")),
            ("temperature", N(if us { 68.0 } else { 20.0 })),
            ("from", S("Pump P-1 (invented)")),
            ("to", S("Tank T-1 (invented)")),
            ("elevation_change", N(if us { 6.5 } else { 2.0 })),
            ("hours_per_year", N(4000.0)),
            ("efficiency", N(70.0)),
        ],
        TableKind::Pipes => vec![
            ("line", S("EXAMPLE-1")),
            ("seq", N(1.0)),
            ("size", S(if us { "4\"" } else { "DN100" })),
            ("schedule", S("40")),
            ("material", S("carbon steel")),
            ("length", N(if us { 82.0 } else { 25.0 })),
        ],
        TableKind::Fittings => vec![
            ("tag", S("EX-E1")),
            ("line", S("EXAMPLE-1")),
            ("item", S("elbow-90")),
            ("size", S(if us { "4\"" } else { "DN100" })),
            ("qty", N(2.0)),
        ],
        _ => Vec::new(),
    }
}

/// Build the template workbook in memory.
///
/// # Errors
/// The workbook writer's error (an internal error: the template is fixed data).
pub fn build(units: UnitSystem) -> Result<Vec<u8>, XlsxError> {
    let mut wb = Workbook::new();
    let created = ExcelDateTime::from_ymd(2000, 1, 1)?;
    wb.set_properties(
        &DocProperties::new()
            .set_creation_datetime(&created)
            .set_title("lossledger input template"),
    );
    let header = Format::new()
        .set_bold()
        .set_background_color(Color::RGB(0xD9E2EC))
        .set_border(FormatBorder::Thin);
    let unit_fmt = Format::new()
        .set_italic()
        .set_font_color(Color::RGB(0x555555))
        .set_background_color(Color::RGB(0xF2F2F2));
    let invented = Format::new()
        .set_italic()
        .set_font_color(Color::RGB(0x8A5A00))
        .set_background_color(Color::RGB(0xFFF4D6));

    // Lists for the drop-downs, on their own sheet (read by no table: its headers name none twice).
    let services: Vec<&str> = Service::ALL.iter().map(|s| s.id()).collect();
    let kinds: Vec<&str> = fitting::catalogue().iter().map(|k| k.id).collect();
    let materials: Vec<&str> = pipe::Material::ALL.iter().map(|m| m.name()).collect();
    let controls: Vec<&str> = [Control::Fixed, Control::Throttled, Control::Speed]
        .iter()
        .map(|c| c.id())
        .collect();
    let lists = [
        ("Service list", &services),
        ("Item kind list", &kinds),
        ("Material list", &materials),
        ("Control list", &controls),
    ];

    let formats = Formats {
        header: &header,
        unit: &unit_fmt,
        invented: &invented,
    };
    for table in TABLES {
        table_sheet(&mut wb, table, units, &formats, &lists)?;
    }

    let ws = wb.add_worksheet();
    ws.set_name("Lists")?;
    for (c, (title, items)) in lists.iter().enumerate() {
        ws.write_string_with_format(0, c as u16, *title, &header)?;
        for (r, item) in items.iter().enumerate() {
            ws.write_string(r as u32 + 1, c as u16, *item)?;
        }
        ws.set_column_width(c as u16, 24)?;
    }

    let ws = wb.add_worksheet();
    ws.set_name("Read me")?;
    write_readme(ws, units, &header)?;
    wb.save_to_buffer()
}

/// Columns of the single-sheet (mixed list) template, by key: what a takeoff usually holds.
pub const LIST_COLUMNS: [&str; 11] = [
    "item_no",
    "line",
    "description",
    "size",
    "qty",
    "unit",
    "tag",
    "status",
    "schedule",
    "material",
    "rating",
];

/// Unit words offered by the list template's drop-down.
pub const LIST_UNITS: [&str; 9] = ["m", "lm", "ft", "No", "nr", "ea", "pcs", "off", "set"];

/// The invented example rows of the list template: item, line, description, size, qty, unit.
const LIST_EXAMPLES: [[&str; 6]; 4] = [
    [
        "1",
        "EXAMPLE-1",
        "Pipe, carbon steel, Sch 40",
        "DN100",
        "25",
        "m",
    ],
    [
        "2",
        "EXAMPLE-1",
        "90 deg long radius elbow",
        "DN100",
        "2",
        "No",
    ],
    [
        "3",
        "EXAMPLE-1",
        "Gate valve PN16, flanged",
        "DN100",
        "1",
        "No",
    ],
    ["4", "EXAMPLE-1", "Concentric reducer", "100x80", "1", "No"],
];

/// Build the single-sheet template: Lines plus one `Item list` sheet holding runs and fittings
/// together, with a Unit drop-down (`m`, `No` ...), four invented example rows, and the Read me.
///
/// # Errors
/// As [`build`].
pub fn build_list(units: UnitSystem) -> Result<Vec<u8>, XlsxError> {
    let mut wb = Workbook::new();
    let created = ExcelDateTime::from_ymd(2000, 1, 1)?;
    wb.set_properties(
        &DocProperties::new()
            .set_creation_datetime(&created)
            .set_title("lossledger input template (item list)"),
    );
    let header = Format::new()
        .set_bold()
        .set_background_color(Color::RGB(0xD9E2EC))
        .set_border(FormatBorder::Thin);
    let invented = Format::new()
        .set_italic()
        .set_font_color(Color::RGB(0x8A5A00))
        .set_background_color(Color::RGB(0xFFF4D6));
    let unit_fmt = Format::new().set_italic();
    let services: Vec<&str> = Service::ALL.iter().map(|s| s.id()).collect();
    let unit_words: Vec<&str> = LIST_UNITS.to_vec();
    let lists = [("Service list", &services), ("Unit list", &unit_words)];
    let formats = Formats {
        header: &header,
        unit: &unit_fmt,
        invented: &invented,
    };
    table_sheet(&mut wb, TableKind::Lines, units, &formats, &lists)?;
    let spec = schema::spec(TableKind::List);
    let ws = wb.add_worksheet();
    ws.set_name(spec.sheet)?;
    let cols: Vec<&ColumnSpec> = LIST_COLUMNS
        .iter()
        .filter_map(|k| spec.columns.iter().find(|c| c.key == *k))
        .collect();
    for (c, col) in cols.iter().enumerate() {
        let c16 = c as u16;
        ws.write_string_with_format(HEADER_ROW, c16, col.header, &header)?;
        ws.insert_note(
            HEADER_ROW,
            c16,
            &Note::new(col.meaning)
                .set_author("lossledger")
                .add_author_prefix(false),
        )?;
        ws.set_column_width(c16, if col.key == "description" { 40.0 } else { 12.0 })?;
    }
    let rc = cols.len() as u16;
    ws.write_string_with_format(HEADER_ROW, rc, REMARKS, &header)?;
    ws.set_column_width(rc, 40)?;
    // One row per item from the row under the header (no units row: units go in the Unit
    // column or the quantity cell).
    for (r, row) in LIST_EXAMPLES.iter().enumerate() {
        let r = HEADER_ROW + 1 + r as u32;
        for (c, v) in row.iter().enumerate() {
            match v.parse::<f64>() {
                Ok(x) if c == 4 => ws.write_number_with_format(r, c as u16, x, &invented)?,
                _ => ws.write_string_with_format(r, c as u16, *v, &invented)?,
            };
        }
        ws.write_string_with_format(r, rc, EXAMPLE_NOTE, &invented)?;
    }
    ws.set_freeze_panes(HEADER_ROW + 1, 0)?;
    if let Some(c) = cols.iter().position(|col| col.key == "unit") {
        let dv = DataValidation::new()
            .allow_list_formula(Formula::new(format!(
                "=Lists!$B$2:$B${}",
                LIST_UNITS.len() + 1
            )))
            .set_error_style(DataValidationErrorStyle::Information)
            .set_input_message(
                "m, lm or ft for pipe runs; No, nr, ea, pcs, off or set for fittings.",
            )?;
        ws.add_data_validation(HEADER_ROW + 1, c as u16, LIST_ROWS - 1, c as u16, &dv)?;
    }
    let ws = wb.add_worksheet();
    ws.set_name("Lists")?;
    for (c, (title, items)) in lists.iter().enumerate() {
        ws.write_string_with_format(0, c as u16, *title, &header)?;
        for (r, item) in items.iter().enumerate() {
            ws.write_string(r as u32 + 1, c as u16, *item)?;
        }
        ws.set_column_width(c as u16, 24)?;
    }
    let ws = wb.add_worksheet();
    ws.set_name("Read me")?;
    ws.write_string(
        0,
        0,
        "How to fill this workbook (all example rows are INVENTED; replace or delete them).",
    )?;
    ws.write_string(1, 0, "Item list: one row per pipe run (measured in m, lm or ft) or fitting (counted in No, nr, ea, pcs, off or set). Sizes, schedules, materials and ratings may also be written in the description (DN150, 150x100, Sch 40, SS316, PN16).")?;
    ws.write_string(2, 0, "Lines may instead be given by heading rows ('Line EXAMPLE-1') above their items, or by tags that start with the line id. Check with: lossledger check FILE.xlsx")?;
    for (r, t) in CAUTIONS.iter().enumerate() {
        ws.write_string(3 + r as u32, 0, *t)?;
    }
    for (r, col) in cols.iter().enumerate() {
        let r = 6 + r as u32;
        ws.write_string(r, 0, col.header)?;
        ws.write_string(r, 1, col.meaning)?;
        ws.write_string(r, 2, col.aliases.join("; "))?;
    }
    ws.set_column_width(0, 18)?;
    ws.set_column_width(1, 80)?;
    wb.save_to_buffer()
}

/// The cell formats of the template's sheets.
struct Formats<'a> {
    header: &'a Format,
    unit: &'a Format,
    invented: &'a Format,
}

/// One table's sheet: headers with notes, the units row, the invented example row, drop-downs.
fn table_sheet(
    wb: &mut Workbook,
    table: TableKind,
    units: UnitSystem,
    formats: &Formats<'_>,
    lists: &[(&str, &Vec<&str>)],
) -> Result<(), XlsxError> {
    let (header, unit_fmt, invented) = (formats.header, formats.unit, formats.invented);
    let spec = schema::spec(table);
    let ws = wb.add_worksheet();
    ws.set_name(spec.sheet)?;
    let cols: Vec<&ColumnSpec> = spec.columns.iter().collect();
    let ex = example(table, units);
    for (c, col) in cols.iter().enumerate() {
        let c16 = c as u16;
        ws.write_string_with_format(HEADER_ROW, c16, col.header, header)?;
        ws.insert_note(
            HEADER_ROW,
            c16,
            &Note::new(col.meaning)
                .set_author("lossledger")
                .add_author_prefix(false),
        )?;
        match unit_label(col, units) {
            Some(u) => ws.write_string_with_format(UNITS_ROW, c16, u, unit_fmt)?,
            None => ws.write_blank(UNITS_ROW, c16, unit_fmt)?,
        };
        ws.set_column_width(c16, (col.header.len() as f64 + 4.0).max(12.0))?;
        match ex.iter().find(|(k, _)| *k == col.key).map(|(_, v)| v) {
            Some(Cell::S(s)) => ws
                .write_string_with_format(EXAMPLE_ROW, c16, *s, invented)
                .map(|_| ())?,
            Some(Cell::N(x)) => ws
                .write_number_with_format(EXAMPLE_ROW, c16, *x, invented)
                .map(|_| ())?,
            None if !ex.is_empty() => ws.write_blank(EXAMPLE_ROW, c16, invented).map(|_| ())?,
            None => {}
        }
    }
    let rc = cols.len() as u16;
    ws.write_string_with_format(HEADER_ROW, rc, REMARKS, header)?;
    ws.write_blank(UNITS_ROW, rc, unit_fmt)?;
    ws.set_column_width(rc, 40)?;
    if !ex.is_empty() {
        ws.write_string_with_format(EXAMPLE_ROW, rc, EXAMPLE_NOTE, invented)?;
    }
    ws.set_freeze_panes(UNITS_ROW + 1, 0)?;
    for (key, list) in [
        ("service", 0usize),
        ("item", 1),
        ("material", 2),
        ("control", 3),
    ] {
        let Some(c) = cols.iter().position(|col| col.key == key) else {
            continue;
        };
        let n = lists[list].1.len() as u32;
        let letter = crate::error::column_letters(list as u32);
        let dv = DataValidation::new()
            .allow_list_formula(Formula::new(format!("=Lists!${letter}$2:${letter}${}", n + 1)))
            .set_error_style(if matches!(key, "service" | "control") { DataValidationErrorStyle::Stop } else { DataValidationErrorStyle::Information })
            .set_input_message(match key {
                "service" => "Pick the line's service; it selects the velocity limits.",
                "item" => "Pick a fitting kind, or type your own words (they are matched to the catalogue).",
                "control" => "How the flow is set: fixed speed, throttled by a valve, or speed control; it decides what a lower loss saves.",
                _ => "Pick a material, or type your own words (e.g. HDPE, CS, SS316).",
            })?;
        write_validation(ws, c as u16, &dv)?;
    }
    Ok(())
}

fn write_validation(ws: &mut Worksheet, col: u16, dv: &DataValidation) -> Result<(), XlsxError> {
    ws.add_data_validation(EXAMPLE_ROW, col, LIST_ROWS - 1, col, dv)?;
    Ok(())
}

/// The cautions every template's Read me carries.
const CAUTIONS: [&str; 3] = [
    crate::audit::station::STATION_CAUTION,
    "Caution: the audit is a screening estimate. No line pressures are computed, so vacuum at high points and siphons are not checked; NPSH and pump checks defer to the pump maker's curves, site measurement, local codes and licensed engineering practice.",
    "Caution on suggestions: opening a valve or removing a loss on a pumped line before speed control or impeller trimming is in place lets the pump run out along its curve (more flow, higher NPSH required, possible motor overload).",
];

fn write_readme(ws: &mut Worksheet, units: UnitSystem, header: &Format) -> Result<(), XlsxError> {
    let bold = Format::new().set_bold();
    let wrap = Format::new().set_text_wrap();
    let mut r = 0u32;
    let intro = [
        "How to fill this workbook (all example rows are INVENTED; replace or delete them).",
        "Row 1 holds the headers and row 2 the units; enter data from row 3. Keep the units row or write the unit in the header, e.g. 'Length [ft]'.",
        "Only Pipes is required. Flow may be given in Lines or in a Flow column of Pipes. Blank cells take the defaults below and are marked as assumed in the audit.",
        "Sizes: DN100, 100NB, NPS 4, 4\", 1-1/2\", 110 OD, 114.3x6.02 (OD x wall), ID 102.3. A bare number needs a unit in the units row (mm means DN, in means NPS).",
        "Other sheets, and columns not listed here, are kept unchanged in the annotated copy.",
        "Check a filled workbook with: lossledger check FILE.xlsx — then audit it with: lossledger audit FILE.xlsx",
        CAUTIONS[0],
        CAUTIONS[1],
        CAUTIONS[2],
    ];
    for t in intro {
        ws.write_string_with_format(r, 0, t, if r == 0 { &bold } else { &wrap })?;
        r += 1;
    }
    r += 1;
    for (c, h) in [
        "Sheet",
        "Column",
        "Unit in this template",
        "Meaning and default",
        "Also accepted as header",
    ]
    .iter()
    .enumerate()
    {
        ws.write_string_with_format(r, c as u16, *h, header)?;
    }
    for table in TABLES {
        let spec = schema::spec(table);
        for col in spec.columns {
            r += 1;
            ws.write_string(r, 0, spec.sheet)?;
            let required = if spec.required.contains(&col.key) {
                " (required)"
            } else {
                ""
            };
            ws.write_string(r, 1, format!("{}{required}", col.header))?;
            ws.write_string(
                r,
                2,
                unit_label(col, units).filter(|u| *u != "-").unwrap_or(""),
            )?;
            ws.write_string_with_format(r, 3, col.meaning, &wrap)?;
            ws.write_string_with_format(r, 4, col.aliases.join("; "), &wrap)?;
        }
    }
    for (c, w) in [12, 24, 18, 70, 60].into_iter().enumerate() {
        ws.set_column_width(c as u16, w)?;
    }
    Ok(())
}

/// Which template `lossledger template` writes.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, clap::ValueEnum)]
pub enum Layout {
    /// Lines, Pipes, Fittings and the optional tables, one sheet each.
    #[default]
    Canonical,
    /// Lines plus one item list holding runs and fittings together.
    List,
}

/// Why the template could not be written.
#[derive(Debug, thiserror::Error)]
pub enum TemplateError {
    /// The target exists: the template never overwrites a file.
    #[error(
        "{}: already exists; choose another path (the template never overwrites a file)",
        path.display()
    )]
    Exists {
        /// The target.
        path: std::path::PathBuf,
    },
    /// The workbook could not be built (an internal error).
    #[error("building the template failed: {0}")]
    Build(#[source] XlsxError),
    /// The file could not be written.
    #[error(transparent)]
    Write(#[from] crate::error::OutputError),
}

/// `lossledger template OUT.xlsx`: write the template of `layout` with a units row in `units`
/// to `out`, through a temporary file renamed into place.
///
/// # Errors
/// [`TemplateError::Exists`] when `out` exists (nothing written), [`TemplateError::Build`] when
/// the workbook cannot be built, [`TemplateError::Write`] when it cannot be written.
///
/// # Example
/// ```
/// use lossledger::template::{Layout, write};
/// use lossledger::units::UnitSystem;
///
/// let dir = std::env::temp_dir().join(format!("lossledger-doc-template-{}", std::process::id()));
/// std::fs::create_dir_all(&dir)?;
/// let out = dir.join("input.xlsx");
/// write(&out, UnitSystem::Si, Layout::List)?;
/// // A second write refuses: the template never overwrites a file.
/// assert!(write(&out, UnitSystem::Si, Layout::List).is_err());
/// std::fs::remove_dir_all(&dir)?;
/// # Ok::<(), Box<dyn std::error::Error>>(())
/// ```
pub fn write(out: &Path, units: UnitSystem, layout: Layout) -> Result<(), TemplateError> {
    if out.exists() {
        return Err(TemplateError::Exists {
            path: out.to_path_buf(),
        });
    }
    let built = match layout {
        Layout::Canonical => build(units),
        Layout::List => build_list(units),
    };
    let bytes = built.map_err(TemplateError::Build)?;
    crate::report::write_atomic(out, &bytes)?;
    Ok(())
}
