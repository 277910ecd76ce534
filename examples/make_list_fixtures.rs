//! Writes the mixed-list fixtures under `fixtures/lists/` and their canonical twins.
//!
//! Run: `cargo run --example make_list_fixtures`. The station (Marrow Creek booster station)
//! is INVENTED: it does not exist. Each list holds the same lines, runs and fittings as its
//! `*.canonical.xlsx` twin (Lines, Pipes and Fittings sheets), written the way estimators'
//! takeoffs and asset-register exports are kept; `tests/lists.rs` checks that both audit to the
//! same line totals.

use rust_xlsxwriter::{Workbook, Worksheet, XlsxError};
use std::path::Path;

const NOTE: &str = "INVENTED DATA for testing: the Marrow Creek booster station does not exist.";

struct Line {
    id: &'static str,
    service: &'static str,
    flow_m3h: f64,
}

const LINES: &[Line] = &[
    Line {
        id: "MC-01",
        service: "pump-suction",
        flow_m3h: 180.0,
    },
    Line {
        id: "MC-02",
        service: "pump-discharge",
        flow_m3h: 180.0,
    },
    Line {
        id: "MC-03",
        service: "distribution",
        flow_m3h: 90.0,
    },
    Line {
        id: "MC-04",
        service: "distribution",
        flow_m3h: 60.0,
    },
];

/// One item of the station, with its spellings in three house styles.
struct Item {
    line: &'static str,
    /// Canonical: a run (material, schedule) or a fitting (kind text).
    run: Option<(&'static str, &'static str)>,
    kind: &'static str,
    dn: u16,
    dn_out: Option<u16>,
    /// Length (m) of a run, count of a fitting.
    qty: f64,
    boq: &'static str,
    mto: &'static str,
    register: &'static str,
}

#[allow(clippy::too_many_arguments)]
const fn run(
    line: &'static str,
    material: &'static str,
    schedule: &'static str,
    dn: u16,
    m: f64,
    boq: &'static str,
    mto: &'static str,
    register: &'static str,
) -> Item {
    Item {
        line,
        run: Some((material, schedule)),
        kind: "",
        dn,
        dn_out: None,
        qty: m,
        boq,
        mto,
        register,
    }
}

#[allow(clippy::too_many_arguments)]
const fn fit(
    line: &'static str,
    kind: &'static str,
    dn: u16,
    dn_out: Option<u16>,
    n: f64,
    boq: &'static str,
    mto: &'static str,
    register: &'static str,
) -> Item {
    Item {
        line,
        run: None,
        kind,
        dn,
        dn_out,
        qty: n,
        boq,
        mto,
        register,
    }
}

const ITEMS: &[Item] = &[
    run(
        "MC-01",
        "carbon steel",
        "40",
        200,
        6.5,
        "Supply and install CS pipe, seamless, DN200 Sch 40",
        "PIPE SMLS DN200 SCH40 CS",
        "PIPE, CS, DN200, SCH 40",
    ),
    run(
        "MC-01",
        "carbon steel",
        "40",
        200,
        3.81,
        "Supply and install CS pipe DN200 Sch 40 (make-up piece)",
        "PIPE DN200 SCH40 CS",
        "PIPE, CS, DN200, SCH40",
    ),
    fit(
        "MC-01",
        "y strainer",
        200,
        None,
        1.0,
        "Supply and install DN200 PN16 Y-type strainer c/w 3 mm mesh",
        "STRAINER Y DN200 PN16",
        "STRAINER, Y-TYPE, DN200, PN16",
    ),
    fit(
        "MC-01",
        "gate valve",
        200,
        None,
        1.0,
        "DN200 PN16 flanged gate valve c/w handwheel",
        "GATE VLV DN200 PN16 RF",
        "VALVE, GATE, DN200, PN16",
    ),
    fit(
        "MC-01",
        "90 lr elbow",
        200,
        None,
        2.0,
        "90 degree long radius elbow DN200",
        "ELL 90 LR BW DN200",
        "ELBOW, 90DEG, LR, DN200",
    ),
    fit(
        "MC-01",
        "reducer",
        200,
        Some(150),
        1.0,
        "Concentric reducer 200 x 150",
        "RED CONC DN200XDN150",
        "REDUCER, CONCENTRIC, DN200XDN150",
    ),
    run(
        "MC-01",
        "carbon steel",
        "40",
        150,
        2.0,
        "Supply and install CS pipe DN150 Sch 40",
        "PIPE DN150 SCH40 CS",
        "PIPE, CS, DN150, SCH 40",
    ),
    run(
        "MC-02",
        "carbon steel",
        "",
        150,
        45.0,
        "Carbon steel pipework DN150",
        "PIPE DN150 CS",
        "PIPE, CS, DN150",
    ),
    fit(
        "MC-02",
        "swing check valve",
        150,
        None,
        1.0,
        "Swing check valve DN150 PN16 flanged",
        "CHK VLV SWING DN150 PN16",
        "VALVE, CHECK, SWING, DN150, PN16",
    ),
    fit(
        "MC-02",
        "gate valve",
        150,
        None,
        1.0,
        "Gate valve DN150 PN16",
        "GATE VLV DN150 PN16",
        "VALVE, GATE, DN150, PN16",
    ),
    fit(
        "MC-02",
        "90 lr elbow",
        150,
        None,
        4.0,
        "Extra over pipe for 90 degree long radius elbows DN150",
        "ELL 90 LR DN150",
        "ELBOW, 90DEG, LR, DN150",
    ),
    fit(
        "MC-02",
        "tee run",
        150,
        None,
        1.0,
        "Equal tee, flow through run, DN150",
        "TEE RUN DN150",
        "TEE, RUN, DN150",
    ),
    run(
        "MC-03",
        "ductile iron",
        "",
        100,
        120.0,
        "Supply and lay DI pipe, cement lined, DN100",
        "PIPE DI DN100",
        "PIPE, DI, DN100",
    ),
    fit(
        "MC-03",
        "gate valve",
        100,
        None,
        2.0,
        "Gate valve DN100 PN16",
        "GATE VLV DN100 PN16",
        "VALVE, GATE, DN100, PN16",
    ),
    fit(
        "MC-03",
        "45 elbow",
        100,
        None,
        2.0,
        "45 deg elbow DN100",
        "ELL 45 DN100",
        "ELBOW, 45DEG, DN100",
    ),
    fit(
        "MC-03",
        "butterfly valve",
        100,
        None,
        1.0,
        "Butterfly valve DN100 PN16, electrically actuated",
        "BFV DN100 PN16",
        "VALVE, BUTTERFLY, DN100, PN16",
    ),
    run(
        "MC-04",
        "SS316",
        "10S",
        80,
        60.0,
        "Stainless steel pipe SS316 DN80 Sch 10S",
        "PIPE DN80 10S SS316",
        "PIPE, SS316, DN80, SCH 10S",
    ),
    fit(
        "MC-04",
        "ball valve",
        80,
        None,
        1.0,
        "Ball valve full bore DN80 PN40",
        "BALL VLV FB DN80",
        "VALVE, BALL, DN80",
    ),
    fit(
        "MC-04",
        "90 lr elbow",
        80,
        None,
        3.0,
        "90 degree long radius elbow DN80",
        "ELL 90 LR DN80",
        "ELBOW, 90DEG, LR, DN80",
    ),
    fit(
        "MC-04",
        "exit",
        80,
        None,
        1.0,
        "Pipe exit into tank DN80",
        "EXIT DN80",
        "EXIT, DN80",
    ),
];

fn service(id: &str) -> &'static str {
    LINES.iter().find(|l| l.id == id).map_or("", |l| l.service)
}

fn title(ws: &mut Worksheet, text: &str) -> Result<(), XlsxError> {
    ws.write_string(0, 0, text)?;
    ws.write_string(1, 0, NOTE)?;
    Ok(())
}

fn lines_sheet(wb: &mut Workbook) -> Result<(), XlsxError> {
    let ws = wb.add_worksheet().set_name("Lines")?;
    for (c, h) in ["Line", "Service", "Flow [m3/h]", "Temperature [°C]"]
        .iter()
        .enumerate()
    {
        ws.write_string(0, c as u16, *h)?;
    }
    for (r, l) in LINES.iter().enumerate() {
        let r = r as u32 + 1;
        ws.write_string(r, 0, l.id)?;
        ws.write_string(r, 1, l.service)?;
        ws.write_number(r, 2, l.flow_m3h)?;
        ws.write_number(r, 3, 15.0)?;
    }
    ws.write_string(0, 5, NOTE)?;
    Ok(())
}

fn header(ws: &mut Worksheet, row: u32, heads: &[&str]) -> Result<(), XlsxError> {
    for (c, h) in heads.iter().enumerate() {
        ws.write_string(row, c as u16, *h)?;
    }
    Ok(())
}

/// The canonical twin: Lines, Pipes and Fittings.
fn canonical(path: &Path) -> Result<(), XlsxError> {
    let mut wb = Workbook::new();
    lines_sheet(&mut wb)?;
    let ws = wb.add_worksheet().set_name("Pipes")?;
    header(
        ws,
        0,
        &["Line", "Size", "Schedule", "Material", "Length [m]"],
    )?;
    for (r, i) in (1..).zip(ITEMS.iter().filter(|i| i.run.is_some())) {
        let (material, schedule) = i.run.unwrap_or_default();
        ws.write_string(r, 0, i.line)?;
        ws.write_string(r, 1, format!("DN{}", i.dn))?;
        if !schedule.is_empty() {
            ws.write_string(r, 2, schedule)?;
        }
        ws.write_string(r, 3, material)?;
        ws.write_number(r, 4, i.qty)?;
    }
    let ws = wb.add_worksheet().set_name("Fittings")?;
    header(ws, 0, &["Line", "Item", "Size", "Size out", "Qty"])?;
    for (r, i) in (1..).zip(ITEMS.iter().filter(|i| i.run.is_none())) {
        ws.write_string(r, 0, i.line)?;
        ws.write_string(r, 1, i.kind)?;
        ws.write_string(r, 2, format!("DN{}", i.dn))?;
        if let Some(o) = i.dn_out {
            ws.write_string(r, 3, format!("DN{o}"))?;
        }
        ws.write_number(r, 4, i.qty)?;
    }
    wb.save(path)
}

fn unit_of(i: &Item) -> &'static str {
    if i.run.is_some() { "m" } else { "No" }
}

/// 01: a bill of quantities with a Line column and a Unit column.
fn line_column(wb: &mut Workbook) -> Result<(), XlsxError> {
    let ws = wb.add_worksheet().set_name("BoQ")?;
    title(
        ws,
        "Marrow Creek booster station — mechanical bill of quantities",
    )?;
    header(
        ws,
        3,
        &[
            "Item",
            "Line",
            "Description",
            "Qty",
            "Unit",
            "Rate",
            "Amount",
        ],
    )?;
    for (n, i) in ITEMS.iter().enumerate() {
        let r = 4 + n as u32;
        ws.write_string(r, 0, format!("{}", n + 1))?;
        ws.write_string(r, 1, i.line)?;
        ws.write_string(r, 2, i.boq)?;
        ws.write_number(r, 3, i.qty)?;
        ws.write_string(r, 4, unit_of(i))?;
    }
    Ok(())
}

/// 02: section headings give the lines; subtotals, preliminaries, notes and extra-over rows.
fn headings(wb: &mut Workbook) -> Result<(), XlsxError> {
    let ws = wb.add_worksheet().set_name("Bill 3 Mechanical")?;
    title(ws, "Bill No. 3 — pipework and valves")?;
    header(
        ws,
        3,
        &["Ref", "Description", "Qty", "Unit", "Rate", "Amount"],
    )?;
    let mut r = 4;
    ws.write_string(r, 1, "Preliminaries for pipework")?;
    r += 1;
    ws.write_string(r, 0, "3.0")?;
    ws.write_string(r, 1, "Provisional sum for pressure testing")?;
    ws.write_number(r, 2, 1.0)?;
    ws.write_string(r, 3, "Sum")?;
    r += 1;
    let heads = [
        "Line MC-01",
        "LINE NO: MC-02",
        "MC-03 — distribution to east reservoir",
        "Line No. MC-04 (west main)",
    ];
    for (h, line) in heads.iter().zip(LINES) {
        r += 1;
        ws.write_string(r, 0, *h)?;
        r += 1;
        for (n, i) in ITEMS.iter().filter(|i| i.line == line.id).enumerate() {
            ws.write_string(r, 0, format!("3.{}", n + 1))?;
            ws.write_string(r, 1, i.boq)?;
            ws.write_number(r, 2, i.qty)?;
            ws.write_string(r, 3, unit_of(i))?;
            r += 1;
        }
        if line.id == "MC-02" {
            ws.write_string(r, 1, "Extra over pipe for cutting and jointing to existing")?;
            ws.write_number(r, 2, 2.0)?;
            ws.write_string(r, 3, "No")?;
            r += 1;
            ws.write_string(r, 1, "Pipe supports to DN150 pipework")?;
            ws.write_number(r, 2, 6.0)?;
            ws.write_string(r, 3, "No")?;
            r += 1;
        }
        ws.write_string(r, 1, "To collection")?;
        r += 1;
    }
    ws.write_string(r + 1, 1, "Carried to summary")?;
    ws.write_string(r + 2, 0, "Note: all flanges drilled to PN16")?;
    Ok(())
}

/// 03: takeoff shorthand with tags that carry the line (`MC-01-007`).
fn tags(wb: &mut Workbook) -> Result<(), XlsxError> {
    let ws = wb.add_worksheet().set_name("MTO")?;
    title(ws, "Material takeoff rev C")?;
    header(ws, 3, &["Tag", "Material description", "Quantity", "UOM"])?;
    for (n, i) in ITEMS.iter().enumerate() {
        let r = 4 + n as u32;
        ws.write_string(r, 0, format!("{}-{:03}", i.line, n + 1))?;
        ws.write_string(r, 1, i.mto)?;
        ws.write_number(r, 2, i.qty)?;
        ws.write_string(r, 3, if i.run.is_some() { "LM" } else { "EA" })?;
    }
    Ok(())
}

/// 04: units inside the quantity cells (no Unit column), one length in feet and inches.
fn units_in_cell(wb: &mut Workbook) -> Result<(), XlsxError> {
    let ws = wb.add_worksheet().set_name("Site list")?;
    header(ws, 0, &["Line", "Description", "Qty"])?;
    for (n, i) in ITEMS.iter().enumerate() {
        let r = 1 + n as u32;
        ws.write_string(r, 0, i.line)?;
        ws.write_string(r, 1, i.mto)?;
        let q = match (i.run.is_some(), i.qty) {
            // 3.81 m is exactly 12 ft 6 in (NIST SP 811: 1 ft = 0.3048 m).
            (true, q) if (q - 3.81).abs() < 1e-12 => "12'6\"".to_string(),
            (true, q) => format!("{q} m"),
            (false, 1.0) => "1 off".to_string(),
            (false, q) => format!("{q} No"),
        };
        ws.write_string(r, 2, q)?;
    }
    ws.write_string(ITEMS.len() as u32 + 2, 0, NOTE)?;
    Ok(())
}

/// 05: item numbering in the first column, the text in `Particulars`.
fn item_numbers(wb: &mut Workbook) -> Result<(), XlsxError> {
    let ws = wb.add_worksheet().set_name("Bill of quantities")?;
    title(ws, "Marrow Creek — works package 2")?;
    header(ws, 3, &["Item", "Particulars", "Line ref", "Qty", "Unit"])?;
    let numbers = [
        "A.1", "A.2", "(a)", "(b)", "A.3", "A.4", "A.5", "B.1", "B.2", "B.3", "B.4", "B.5", "C.1",
        "C.2", "C.3", "C.4", "D.1", "D.2", "D.3", "D.4",
    ];
    for (n, i) in ITEMS.iter().enumerate() {
        let r = 4 + n as u32;
        ws.write_string(r, 0, numbers[n % numbers.len()])?;
        ws.write_string(r, 1, i.boq)?;
        ws.write_string(r, 2, i.line)?;
        ws.write_number(r, 3, i.qty)?;
        ws.write_string(r, 4, if i.run.is_some() { "lm" } else { "nr" })?;
    }
    Ok(())
}

/// The register rows: one row per asset (a fitting counted 2 is two assets), pipe lengths in
/// the description, plus rows outside the flow path and rows no longer in service.
fn register_rows(location: impl Fn(&str) -> String) -> Vec<[String; 4]> {
    let mut rows = Vec::new();
    let mut n = 0;
    for i in ITEMS {
        let copies = if i.run.is_some() { 1 } else { i.qty as usize };
        for _ in 0..copies {
            n += 1;
            let text = if i.run.is_some() {
                format!("{}, {} M", i.register, i.qty)
            } else {
                i.register.to_string()
            };
            rows.push([
                format!("A{:05}", 1000 + n),
                text,
                "In service".into(),
                location(i.line),
            ]);
        }
    }
    rows.insert(
        2,
        [
            "A00990".into(),
            "PUMP, CENTRIFUGAL, END SUCTION, DN200".into(),
            "Duty".into(),
            location("MC-01"),
        ],
    );
    rows.insert(
        3,
        [
            "A00991".into(),
            "MOTOR, ELECTRIC, 37 KW".into(),
            "Duty".into(),
            location("MC-01"),
        ],
    );
    rows.insert(
        9,
        [
            "A00992".into(),
            "VALVE, GATE, DN150, PN16".into(),
            "Removed".into(),
            location("MC-02"),
        ],
    );
    rows.insert(
        12,
        [
            "A00993".into(),
            "VALVE, CHECK, SWING, DN150".into(),
            "Spare".into(),
            location("MC-02"),
        ],
    );
    rows.push([
        "A00994".into(),
        "TRANSMITTER, PRESSURE, 0-16 BAR".into(),
        "In service".into(),
        location("MC-04"),
    ]);
    rows.push([
        "A00995".into(),
        "PIPE, CS, DN150, 12 M".into(),
        "Abandoned in place".into(),
        location("MC-02"),
    ]);
    rows
}

fn register_sheet(
    wb: &mut Workbook,
    loc_header: &str,
    location: impl Fn(&str) -> String,
) -> Result<(), XlsxError> {
    let ws = wb.add_worksheet().set_name("Asset register")?;
    header(
        ws,
        0,
        &[
            "Asset no",
            "Description",
            "Status",
            loc_header,
            "Criticality",
        ],
    )?;
    for (r, row) in register_rows(location).iter().enumerate() {
        for (c, v) in row.iter().enumerate() {
            ws.write_string(r as u32 + 1, c as u16, v)?;
        }
        ws.write_string(r as u32 + 1, 4, "B")?;
    }
    Ok(())
}

/// 06: an asset-register export; the functional location is the line id.
fn register(wb: &mut Workbook) -> Result<(), XlsxError> {
    register_sheet(wb, "Functional location", |l| l.to_string())
}

/// 07: sizes only in a Size column that also carries schedules and reducers.
fn size_cells(wb: &mut Workbook) -> Result<(), XlsxError> {
    let ws = wb.add_worksheet().set_name("Item list")?;
    header(ws, 0, &["Line", "Description", "Size", "Qty", "Unit"])?;
    for (n, i) in ITEMS.iter().enumerate() {
        let r = 1 + n as u32;
        ws.write_string(r, 0, i.line)?;
        let (text, size) = match (i.run, i.dn_out) {
            (Some((m, s)), _) if !s.is_empty() => (format!("Pipe, {m}"), format!("DN{}/{s}", i.dn)),
            (Some((m, _)), _) => (format!("Pipe, {m}"), format!("DN{}", i.dn)),
            (None, Some(o)) => ("Concentric reducer".to_string(), format!("{}x{o}", i.dn)),
            (None, None) => (i.kind.to_string(), format!("{} mm NB", i.dn)),
        };
        ws.write_string(r, 1, text)?;
        ws.write_string(r, 2, size)?;
        ws.write_number(r, 3, i.qty)?;
        ws.write_string(r, 4, unit_of(i))?;
    }
    ws.write_string(ITEMS.len() as u32 + 2, 0, NOTE)?;
    Ok(())
}

/// 08: a register whose locations are not line ids, mapped by `08_location_map.map.toml`.
fn location_map(wb: &mut Workbook) -> Result<(), XlsxError> {
    register_sheet(wb, "FLOC", |l| {
        format!("MCR-PS1-{}", service(l).to_uppercase()) + &l[3..]
    })
}

/// 09 and 10: fixture 01 saved as `.ods` and as `.xls` by LibreOffice (headless), when it is
/// installed (Debian: `apt-get install libreoffice-calc-nogui`); the committed files were made
/// that way. Without it the existing files are left as they are.
fn legacy_twins(dir: &Path) -> Result<(), Box<dyn std::error::Error>> {
    let tmp = std::env::temp_dir().join(format!("lossledger-lists-{}", std::process::id()));
    std::fs::create_dir_all(&tmp)?;
    for (stem, ext) in [("09_ods", "ods"), ("10_xls", "xls")] {
        let source = tmp.join(format!("{stem}.xlsx"));
        std::fs::copy(dir.join("01_line_column.xlsx"), &source)?;
        let status = std::process::Command::new("soffice")
            .args(["--headless", "--calc", "--convert-to", ext, "--outdir"])
            .arg(&tmp)
            .arg(&source)
            .stdout(std::process::Stdio::null())
            .stderr(std::process::Stdio::null())
            .status();
        match status {
            Ok(s) if s.success() => {
                std::fs::copy(
                    tmp.join(format!("{stem}.{ext}")),
                    dir.join(format!("{stem}.{ext}")),
                )?;
                canonical(&dir.join(format!("{stem}.canonical.xlsx")))?;
            }
            _ => println!("soffice not found or failed: {stem}.{ext} not regenerated"),
        }
    }
    let _ = std::fs::remove_dir_all(&tmp);
    Ok(())
}

/// 11: two tables on one sheet: the line list on top, a blank row, then the takeoff.
fn two_tables(dir: &Path) -> Result<(), XlsxError> {
    let mut wb = Workbook::new();
    let ws = wb.add_worksheet().set_name("Station")?;
    header(
        ws,
        0,
        &["Line", "Service", "Flow [m3/h]", "Temperature [°C]"],
    )?;
    for (r, l) in LINES.iter().enumerate() {
        let r = r as u32 + 1;
        ws.write_string(r, 0, l.id)?;
        ws.write_string(r, 1, l.service)?;
        ws.write_number(r, 2, l.flow_m3h)?;
        ws.write_number(r, 3, 15.0)?;
    }
    ws.write_string(0, 6, NOTE)?;
    let top = LINES.len() as u32 + 2;
    header(ws, top, &["Item", "Line", "Description", "Qty", "Unit"])?;
    for (n, i) in ITEMS.iter().enumerate() {
        let r = top + 1 + n as u32;
        ws.write_string(r, 0, format!("{}", n + 1))?;
        ws.write_string(r, 1, i.line)?;
        ws.write_string(r, 2, i.mto)?;
        ws.write_number(r, 3, i.qty)?;
        ws.write_string(r, 4, unit_of(i))?;
    }
    wb.save(dir.join("11_two_tables.xlsx"))?;
    canonical(&dir.join("11_two_tables.canonical.xlsx"))
}

fn main() -> Result<(), Box<dyn std::error::Error>> {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("fixtures/lists");
    std::fs::create_dir_all(&dir)?;
    type Writer = fn(&mut Workbook) -> Result<(), XlsxError>;
    let fixtures: [(&str, Writer); 8] = [
        ("01_line_column", line_column),
        ("02_section_headings", headings),
        ("03_tags", tags),
        ("04_units_in_cells", units_in_cell),
        ("05_item_numbers", item_numbers),
        ("06_register", register),
        ("07_size_cells", size_cells),
        ("08_location_map", location_map),
    ];
    for (name, write) in fixtures {
        let mut wb = Workbook::new();
        lines_sheet(&mut wb)?;
        write(&mut wb)?;
        wb.save(dir.join(format!("{name}.xlsx")))?;
        canonical(&dir.join(format!("{name}.canonical.xlsx")))?;
    }
    two_tables(&dir)?;
    legacy_twins(&dir)?;
    let mut map = String::from(
        "# Invented locations of the invented Marrow Creek station, mapped to its lines.\n[locations]\n",
    );
    for l in LINES {
        map.push_str(&format!(
            "\"MCR-PS1-{}{}\" = \"{}\"\n",
            l.service.to_uppercase(),
            &l.id[3..],
            l.id
        ));
    }
    std::fs::write(dir.join("08_location_map.map.toml"), map)?;
    println!(
        "wrote {} fixtures and their twins to {}",
        fixtures.len() + 3,
        dir.display()
    );
    Ok(())
}
