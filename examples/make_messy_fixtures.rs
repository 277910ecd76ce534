//! Writes the messy input fixtures under `fixtures/messy/` and their clean canonical twins.
//!
//! Run: `cargo run --example make_messy_fixtures`. Every station here is INVENTED. Each messy
//! workbook holds the same lines, runs and fittings as its `*.canonical.xlsx` twin, written the
//! way real schedules are kept (title blocks, aliases, two-row headers, units rows, numbers as
//! text, US units, merged cells, formulas, odd size notations, ...); `tests/messy.rs` checks
//! that both audit to the same line totals.

use rust_xlsxwriter::{Format, Workbook, Worksheet, XlsxError};

#[path = "support/cell.rs"]
#[allow(dead_code)] // the fixtures hold text, numbers and formulas only
mod cell;
use cell::{Cell, put};
use std::path::Path;

const FT: f64 = 0.3048;
const GPM_M3H: f64 = 3.785_411_784e-3 * 60.0;

struct Line {
    id: &'static str,
    service: &'static str,
    flow_m3h: f64,
    temp_c: f64,
}

struct Run {
    line: &'static str,
    seq: u32,
    dn: u16,
    material: &'static str,
    length_m: f64,
}

struct Fit {
    tag: &'static str,
    line: &'static str,
    item: &'static str,
    dn: u16,
    dn_out: Option<u16>,
    qty: f64,
    k: Option<f64>,
}

const LINES: &[Line] = &[
    Line {
        id: "HF-S1",
        service: "pump-suction",
        flow_m3h: 120.0,
        temp_c: 15.0,
    },
    Line {
        id: "HF-D1",
        service: "pump-discharge",
        flow_m3h: 120.0,
        temp_c: 15.0,
    },
    Line {
        id: "HF-M1",
        service: "distribution",
        flow_m3h: 200.0,
        temp_c: 15.0,
    },
    Line {
        id: "HF-B1",
        service: "general",
        flow_m3h: 8.0,
        temp_c: 15.0,
    },
];

const RUNS: &[Run] = &[
    Run {
        line: "HF-S1",
        seq: 1,
        dn: 150,
        material: "carbon steel",
        length_m: 6.5,
    },
    Run {
        line: "HF-D1",
        seq: 1,
        dn: 100,
        material: "carbon steel",
        length_m: 3.0,
    },
    Run {
        line: "HF-D1",
        seq: 2,
        dn: 150,
        material: "carbon steel",
        length_m: 42.0,
    },
    Run {
        line: "HF-M1",
        seq: 1,
        dn: 200,
        material: "carbon steel",
        length_m: 1310.5,
    },
    Run {
        line: "HF-B1",
        seq: 1,
        dn: 40,
        material: "carbon steel",
        length_m: 18.0,
    },
    Run {
        line: "HF-B1",
        seq: 2,
        dn: 40,
        material: "carbon steel",
        length_m: 7.25,
    },
];

const FITS: &[Fit] = &[
    Fit {
        tag: "HF-S1-EN",
        line: "HF-S1",
        item: "entrance-square-edged",
        dn: 150,
        dn_out: None,
        qty: 1.0,
        k: None,
    },
    Fit {
        tag: "HF-S1-V1",
        line: "HF-S1",
        item: "valve-gate",
        dn: 150,
        dn_out: None,
        qty: 1.0,
        k: None,
    },
    Fit {
        tag: "HF-S1-E1",
        line: "HF-S1",
        item: "elbow-90",
        dn: 150,
        dn_out: None,
        qty: 2.0,
        k: None,
    },
    Fit {
        tag: "HF-D1-NR",
        line: "HF-D1",
        item: "check-swing",
        dn: 100,
        dn_out: None,
        qty: 1.0,
        k: None,
    },
    Fit {
        tag: "HF-D1-X1",
        line: "HF-D1",
        item: "expansion",
        dn: 100,
        dn_out: Some(150),
        qty: 1.0,
        k: None,
    },
    Fit {
        tag: "HF-D1-CV",
        line: "HF-D1",
        item: "valve-globe",
        dn: 150,
        dn_out: None,
        qty: 1.0,
        k: Some(9.5),
    },
    Fit {
        tag: "HF-M1-E1",
        line: "HF-M1",
        item: "elbow-45",
        dn: 200,
        dn_out: None,
        qty: 4.0,
        k: None,
    },
    Fit {
        tag: "HF-M1-EX",
        line: "HF-M1",
        item: "exit",
        dn: 200,
        dn_out: None,
        qty: 1.0,
        k: None,
    },
    Fit {
        tag: "HF-B1-E1",
        line: "HF-B1",
        item: "elbow-90",
        dn: 40,
        dn_out: None,
        qty: 3.0,
        k: None,
    },
];

fn nps(dn: u16) -> &'static str {
    match dn {
        40 => "1-1/2\"",
        100 => "4\"",
        150 => "6\"",
        200 => "8\"",
        _ => "?",
    }
}

fn s(t: impl Into<String>) -> Cell {
    Cell::S(t.into())
}

/// A table as header texts (one or two rows), an optional units row, and rows.
struct Table {
    name: String,
    above: Vec<Vec<Cell>>,
    headers: Vec<Vec<String>>,
    units: Option<Vec<String>>,
    rows: Vec<Vec<Cell>>,
    merges: Vec<(u32, u16, u32, u16)>,
}

fn write_table(ws: &mut Worksheet, t: &Table) -> Result<(), XlsxError> {
    ws.set_name(&t.name)?;
    let bold = Format::new().set_bold();
    let mut r = 0u32;
    let date = Format::new();
    let write = |ws: &mut Worksheet, r: u32, c: u16, v: &Cell| put(ws, r, c, v, &date);
    for row in &t.above {
        for (c, v) in row.iter().enumerate() {
            write(ws, r, c as u16, v)?;
        }
        r += 1;
    }
    let data0 = r + t.headers.len() as u32 + u32::from(t.units.is_some());
    for (m, row) in t.merges.iter().enumerate() {
        let _ = (m, row);
    }
    for hrow in &t.headers {
        for (c, h) in hrow.iter().enumerate() {
            if !h.is_empty() {
                ws.write_string_with_format(r, c as u16, h, &bold)?;
            }
        }
        r += 1;
    }
    if let Some(u) = &t.units {
        for (c, h) in u.iter().enumerate() {
            if !h.is_empty() {
                ws.write_string(r, c as u16, h)?;
            }
        }
        r += 1;
    }
    for &(r0, c0, r1, c1) in &t.merges {
        // Merged data cells: the value goes in the top-left cell only (written below).
        ws.merge_range(data0 + r0, c0, data0 + r1, c1, "", &Format::new())?;
    }
    for row in &t.rows {
        for (c, v) in row.iter().enumerate() {
            write(ws, r, c as u16, v)?;
        }
        r += 1;
    }
    Ok(())
}

fn save(path: &Path, tables: &[Table]) -> Result<(), XlsxError> {
    let mut wb = Workbook::new();
    for t in tables {
        write_table(wb.add_worksheet(), t)?;
    }
    wb.save(path)
}

/// The label every fixture carries (the reader skips it as a note row above the header; the
/// audit carries it into its outputs).
const INVENTED: &str = "INVENTED DATA for testing: Heron Flats water works does not exist.";

/// A note row with the label, then a blank row, above a table.
fn invented_note() -> Vec<Vec<Cell>> {
    vec![vec![s(INVENTED)], vec![]]
}

/// The canonical workbook of the dataset: canonical sheets, one header row with units, numbers,
/// each under the invented-data note.
fn canonical() -> Vec<Table> {
    let lines = Table {
        name: "Lines".into(),
        above: invented_note(),
        headers: vec![vec![
            "Line".into(),
            "Service".into(),
            "Flow [m3/h]".into(),
            "Temperature [°C]".into(),
        ]],
        units: None,
        rows: LINES
            .iter()
            .map(|l| {
                vec![
                    s(l.id),
                    s(l.service),
                    Cell::N(l.flow_m3h),
                    Cell::N(l.temp_c),
                ]
            })
            .collect(),
        merges: vec![],
    };
    let pipes = Table {
        name: "Pipes".into(),
        above: invented_note(),
        headers: vec![
            ["Line", "Seq", "Size", "Schedule", "Material", "Length [m]"]
                .map(String::from)
                .to_vec(),
        ],
        units: None,
        rows: RUNS
            .iter()
            .map(|p| {
                vec![
                    s(p.line),
                    Cell::N(f64::from(p.seq)),
                    s(format!("DN{}", p.dn)),
                    s("40"),
                    s(p.material),
                    Cell::N(p.length_m),
                ]
            })
            .collect(),
        merges: vec![],
    };
    let fittings = Table {
        name: "Fittings".into(),
        above: invented_note(),
        headers: vec![
            ["Tag", "Line", "Item", "Size", "Size out", "Qty", "K"]
                .map(String::from)
                .to_vec(),
        ],
        units: None,
        rows: FITS
            .iter()
            .map(|f| {
                vec![
                    s(f.tag),
                    s(f.line),
                    s(f.item),
                    s(format!("DN{}", f.dn)),
                    f.dn_out.map_or(Cell::E, |d| s(format!("DN{d}"))),
                    Cell::N(f.qty),
                    f.k.map_or(Cell::E, Cell::N),
                ]
            })
            .collect(),
        merges: vec![],
    };
    vec![lines, pipes, fittings]
}

fn title(text: &str) -> Vec<Vec<Cell>> {
    vec![
        vec![s(text)],
        vec![s(INVENTED)],
        vec![s("Rev B"), Cell::E, s("Checked: —")],
        vec![],
    ]
}

fn main() -> Result<(), Box<dyn std::error::Error>> {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("fixtures/messy");
    std::fs::create_dir_all(&dir)?;
    let mut made = Vec::new();
    let mut both = |name: &str, tables: Vec<Table>| -> Result<(), XlsxError> {
        save(&dir.join(format!("{name}.xlsx")), &tables)?;
        save(&dir.join(format!("{name}.canonical.xlsx")), &canonical())?;
        made.push(name.to_string());
        Ok(())
    };

    // 01: sheet-name aliases, title blocks above the header, header aliases, units in parentheses.
    {
        let mut t = canonical();
        t[0].name = "Line list".into();
        t[0].above = title("Heron Flats water works — line list");
        t[0].headers = vec![
            ["Line No.", "Duty type", "Design flow (m3/h)", "Temp (°C)"]
                .map(String::from)
                .to_vec(),
        ];
        t[1].name = "Pipe takeoff".into();
        t[1].above = title("Heron Flats — pipe takeoff");
        t[1].headers = vec![
            ["Line ref", "Run no", "Nom. size", "Sch", "Matl", "Len (m)"]
                .map(String::from)
                .to_vec(),
        ];
        t[2].name = "Fitting schedule".into();
        t[2].above = title("Heron Flats — valves and fittings");
        t[2].headers = vec![
            [
                "Tag no",
                "Pipe line",
                "Fitting type",
                "NB",
                "Outlet size",
                "Nos",
                "K value",
            ]
            .map(String::from)
            .to_vec(),
        ];
        both("01_aliases_titles", t)?;
    }
    // 02: headers over two rows (group label merged above), units after a comma.
    {
        let mut t = canonical();
        t[0].headers = vec![
            ["Line", "Line", "Flow,", "Fluid"]
                .map(String::from)
                .to_vec(),
            ["No.", "service", "m3/h", "temperature, °C"]
                .map(String::from)
                .to_vec(),
        ];
        t[1].name = "Pipework".into();
        t[1].headers = vec![
            ["Pipe", "Run", "Nominal", "Wall", "Pipe", "Run"]
                .map(String::from)
                .to_vec(),
            [
                "line",
                "order",
                "size",
                "schedule",
                "material",
                "length [m]",
            ]
            .map(String::from)
            .to_vec(),
        ];
        t[2].name = "Valves".into();
        t[2].headers = vec![
            [
                "Item", "Line", "Fitting", "Nominal", "Reduced", "Quantity", "Loss",
            ]
            .map(String::from)
            .to_vec(),
            ["tag", "ref", "type", "size", "size", "", "coefficient"]
                .map(String::from)
                .to_vec(),
        ];
        both("02_two_row_headers", t)?;
    }
    // 03: units in a units row under the header; lengths in mm of the runs written in cm.
    {
        let mut t = canonical();
        t[0].headers = vec![
            ["Line", "Service", "Flow", "Temperature"]
                .map(String::from)
                .to_vec(),
        ];
        t[0].units = Some(["", "", "l/s", "°C"].map(String::from).to_vec());
        for (row, l) in t[0].rows.iter_mut().zip(LINES) {
            row[2] = Cell::N(l.flow_m3h / 3.6);
        }
        t[1].headers = vec![
            ["Line", "Seq", "Size", "Schedule", "Material", "Length"]
                .map(String::from)
                .to_vec(),
        ];
        t[1].units = Some(["", "", "", "", "", "cm"].map(String::from).to_vec());
        for (row, p) in t[1].rows.iter_mut().zip(RUNS) {
            row[5] = Cell::N(p.length_m * 100.0);
        }
        both("03_units_row", t)?;
    }
    // 04: numbers stored as text: plain, thousands with comma/space/no-break space, unit in the cell.
    {
        let mut t = canonical();
        for (row, l) in t[0].rows.iter_mut().zip(LINES) {
            row[2] = s(format!("{} m3/h", l.flow_m3h));
            row[3] = s(format!("{}\u{a0}°C", l.temp_c));
        }
        t[1].headers[0][5] = "Length".into();
        for (i, (row, p)) in t[1].rows.iter_mut().zip(RUNS).enumerate() {
            row[1] = s(format!("{}", p.seq));
            row[5] = match (p.length_m >= 1000.0, i % 3) {
                (true, _) => s("1,310.5 m"),
                (false, 0) => s(format!("{} m", p.length_m)),
                (false, 1) => s(format!(" {}\u{a0}", p.length_m)),
                _ => s(format!("{}m", p.length_m)),
            };
        }
        for (row, f) in t[2].rows.iter_mut().zip(FITS) {
            row[5] = s(format!("{}", f.qty));
            if f.k.is_none() {
                row[6] = s(if f.qty > 1.0 { "n/a" } else { "-" });
            }
        }
        both("04_numbers_as_text", t)?;
    }
    // 05: decimal comma written consistently in text cells.
    {
        let mut t = canonical();
        for (row, p) in t[1].rows.iter_mut().zip(RUNS) {
            row[5] = s(format!("{}", p.length_m).replace('.', ","));
        }
        // 1310,5 has no thousands separator; all cells in the column use a comma.
        for (row, f) in t[2].rows.iter_mut().zip(FITS) {
            if let Some(k) = f.k {
                row[6] = s(format!("{k}").replace('.', ","));
            }
        }
        both("05_decimal_comma", t)?;
    }
    // 06: US customary takeoff: ft, US gpm, °F, sizes in inches; twin is the SI canonical book.
    {
        let mut t = canonical();
        t[0].headers = vec![
            ["Line", "Service", "Flow, gpm", "Temperature (°F)"]
                .map(String::from)
                .to_vec(),
        ];
        for (row, l) in t[0].rows.iter_mut().zip(LINES) {
            row[2] = Cell::N(l.flow_m3h / GPM_M3H);
            row[3] = Cell::N(l.temp_c * 9.0 / 5.0 + 32.0);
        }
        t[1].headers[0][5] = "Length (ft)".into();
        for (row, p) in t[1].rows.iter_mut().zip(RUNS) {
            row[2] = s(if p.dn == 150 {
                "NPS 6".to_string()
            } else {
                nps(p.dn).to_string()
            });
            row[5] = Cell::N(p.length_m / FT);
        }
        for (row, f) in t[2].rows.iter_mut().zip(FITS) {
            row[3] = s(nps(f.dn).replace('"', " in"));
            row[4] = f.dn_out.map_or(Cell::E, |d| s(nps(d)));
        }
        both("06_us_units", t)?;
    }
    // 07: merged cells: a line id merged down its runs, and a material merged down the sheet.
    {
        let mut t = canonical();
        // HF-D1 runs are rows 1-2 and HF-B1 rows 4-5 of the data: merge their Line cells.
        t[1].rows[2][0] = Cell::E;
        t[1].rows[5][0] = Cell::E;
        for row in t[1].rows.iter_mut().skip(1) {
            row[4] = Cell::E;
        }
        t[1].merges = vec![(1, 0, 2, 0), (4, 0, 5, 0), (0, 4, 5, 4)];
        both("07_merged_cells", t)?;
    }
    // 08: formula cells with cached values (lengths summed from spools, flows from l/s).
    {
        let mut t = canonical();
        for (row, p) in t[1].rows.iter_mut().zip(RUNS) {
            let half = p.length_m / 2.0;
            row[5] = Cell::F(format!("={half}*2"), p.length_m.to_string());
        }
        for (row, l) in t[0].rows.iter_mut().zip(LINES) {
            row[2] = Cell::F(format!("={}*3.6", l.flow_m3h / 3.6), l.flow_m3h.to_string());
        }
        both("08_formulas", t)?;
    }
    // 09: size notations: DN, NB, mm NB, NPS, inch, OD x wall, bore; a Size [mm] column of bare DNs.
    {
        let mut t = canonical();
        let notations = [
            "150NB",
            "NB100",
            "150 mm NB",
            "Ø219.1x8.18",
            "1.5\"",
            "1 1/2 in",
        ];
        for (row, n) in t[1].rows.iter_mut().zip(notations) {
            row[2] = s(n);
        }
        t[2].headers[0][3] = "Size [mm]".into();
        for (row, f) in t[2].rows.iter_mut().zip(FITS) {
            row[3] = Cell::N(f64::from(f.dn));
        }
        both("09_size_notations", t)?;
        // The twin gives the bore of Ø219.1x8.18 (219.1 - 2 x 8.18 = 202.74 mm) as ID.
        let mut c = canonical();
        c[1].rows[3][2] = s("ID 202.74");
        save(&dir.join("09_size_notations.canonical.xlsx"), &c)?;
    }
    // 10: tables found by their headers (odd sheet names), extra sheets, unknown columns, a
    // repeated header at a page break, a totals row, a note row and blank rows.
    {
        let mut t = canonical();
        t[0].name = "Sheet1".into();
        t[1].name = "Data".into();
        t[2].name = "Sheet3".into();
        for h in &mut t[1].headers {
            h.push("Remarks".into());
        }
        let header_again: Vec<Cell> = t[1].headers[0].iter().map(|h| s(h.clone())).collect();
        let mut rows = Vec::new();
        for (i, r) in t[1].rows.iter().enumerate() {
            let mut r = r.clone();
            r.push(s("as-built"));
            rows.push(r);
            if i == 2 {
                rows.push(vec![]);
                rows.push(header_again.clone());
            }
        }
        rows.push(vec![]);
        rows.push(vec![
            s("Total"),
            Cell::E,
            Cell::E,
            Cell::E,
            Cell::E,
            Cell::N(RUNS.iter().map(|p| p.length_m).sum()),
        ]);
        rows.push(vec![s("Note: lengths from the invented as-built survey")]);
        t[1].rows = rows;
        let cover = Table {
            name: "Cover".into(),
            above: vec![vec![s(INVENTED)]],
            headers: vec![vec!["Heron Flats (invented) — issue for audit".into()]],
            units: None,
            rows: vec![],
            merges: vec![],
        };
        let mut all = vec![cover];
        all.extend(t);
        both("10_found_by_headers", all)?;
    }
    // 11: no Lines sheet: the flow is in the pipe takeoff (service and temperature default).
    {
        let mut t = canonical();
        t.remove(0);
        t[0].headers[0].push("Flow [m3/h]".into());
        for (row, p) in t[0].rows.iter_mut().zip(RUNS) {
            let l = LINES
                .iter()
                .find(|l| l.id == p.line)
                .map_or(0.0, |l| l.flow_m3h);
            row.push(Cell::N(l));
        }
        save(&dir.join("11_flow_in_pipes.xlsx"), &t)?;
        let mut c = canonical();
        c[0].headers = vec![vec!["Line".into(), "Flow [m3/h]".into()]];
        c[0].rows = LINES
            .iter()
            .map(|l| vec![s(l.id), Cell::N(l.flow_m3h)])
            .collect();
        save(&dir.join("11_flow_in_pipes.canonical.xlsx"), &c)?;
    }
    // 12: headers no alias reaches, mapped by a --map file.
    {
        let mut t = canonical();
        t[1].name = "Site takeoff".into();
        t[1].headers = vec![
            [
                "Pipe ref",
                "Piece",
                "Bore class",
                "Wall",
                "Pipe stuff",
                "Run length ft",
            ]
            .map(String::from)
            .to_vec(),
        ];
        for (row, p) in t[1].rows.iter_mut().zip(RUNS) {
            row[5] = Cell::N(p.length_m / FT);
        }
        both("12_map_file", t)?;
        std::fs::write(
            dir.join("12_map_file.map.toml"),
            "# INVENTED DATA: header map for 12_map_file.xlsx (Heron Flats is an invented station)\n[sheets]\n\"Site takeoff\" = \"pipes\"\n\n[pipes]\n\"Pipe ref\" = \"line\"\n\"Piece\" = \"seq\"\n\"Bore class\" = \"size\"\n\"Pipe stuff\" = \"material\"\n\"Run length ft\" = \"length [ft]\"\n",
        )?;
    }
    // 13: two files merged: lines and pipes in one, fittings in the other.
    {
        let sub = dir.join("13_two_files");
        std::fs::create_dir_all(&sub)?;
        let mut t = canonical();
        let fittings = t.pop().into_iter().collect::<Vec<_>>();
        save(&sub.join("a_lines_pipes.xlsx"), &t)?;
        save(&sub.join("b_fittings.xlsx"), &fittings)?;
        save(&dir.join("13_two_files.canonical.xlsx"), &canonical())?;
    }
    // 14: a folder of CSV files, semicolon separated with decimal commas.
    {
        let sub = dir.join("14_csv_folder");
        std::fs::create_dir_all(&sub)?;
        // The label as a first line with the separators of the table (the reader skips it as a
        // title row and finds the separator from it).
        let note = |cols: usize| format!("{INVENTED}{}\n", ";".repeat(cols - 1));
        let mut lines = note(4);
        lines.push_str("Line No;Service;Flow (m3/h);Temp (°C)\n");
        for l in LINES {
            lines.push_str(&format!(
                "{};{};{};{}\n",
                l.id,
                l.service,
                format!("{}", l.flow_m3h).replace('.', ","),
                l.temp_c
            ));
        }
        let mut pipes = note(6);
        pipes.push_str("Line;Seq;Size;Schedule;Material;Length [m]\n");
        for p in RUNS {
            pipes.push_str(&format!(
                "{};{};DN{};40;{};{}\n",
                p.line,
                p.seq,
                p.dn,
                p.material,
                format!("{}", p.length_m).replace('.', ",")
            ));
        }
        let mut fits = note(7);
        fits.push_str("Tag;Line;Item;Size;Size out;Qty;K\n");
        for f in FITS {
            fits.push_str(&format!(
                "{};{};\"{}\";DN{};{};{};{}\n",
                f.tag,
                f.line,
                f.item,
                f.dn,
                f.dn_out.map(|d| format!("DN{d}")).unwrap_or_default(),
                f.qty,
                f.k.map(|k| format!("{k}").replace('.', ","))
                    .unwrap_or_default()
            ));
        }
        std::fs::write(sub.join("Line list.csv"), lines)?;
        std::fs::write(sub.join("Pipes.csv"), pipes)?;
        std::fs::write(sub.join("Fitting schedule.csv"), fits)?;
        save(&dir.join("14_csv_folder.canonical.xlsx"), &canonical())?;
    }
    println!(
        "wrote {} messy workbooks with twins, plus 11-14, into {}",
        made.len(),
        dir.display()
    );
    Ok(())
}
