//! The station copy of the invented demo station, read back: each system's chart on the checks
//! sheet (system curve, pump curve, duty and operating points, the pump efficiency on a
//! secondary axis) and the Summary's station-energy block, in SI and `--units us`.
//!
//! US conversions use the exact definition of NIST SP 811 (2008) B.8: 1 US gallon =
//! 3.785411784 L, so 1 m³/h = 1000 / 3.785411784 / 60 US gpm.

use calamine::{Data, Range, Reader, Xlsx, open_workbook};
use lossledger::audit::station::STATION_CAUTION;
use std::io::Read;
use std::path::{Path, PathBuf};
use std::process::Command;

/// Relative tolerance on a figure written to six significant figures (`report::style::shown`).
const SHOWN_TOL: f64 = 1e-5;
/// US gpm per m³/h (NIST SP 811 B.8).
const GPM_PER_M3H: f64 = 1000.0 / 3.785411784 / 60.0;

/// The demo's input in a fresh folder named after `name`, its audit in SI and in US units, and the SI JSON.
fn demo(name: &str) -> (PathBuf, PathBuf, PathBuf, serde_json::Value) {
    let dir = std::env::temp_dir().join(format!("lossledger-copy-{name}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    let bin = env!("CARGO_BIN_EXE_lossledger");
    let run = |args: &[&str]| {
        let out = Command::new(bin)
            .args(args)
            .current_dir(&dir)
            .output()
            .unwrap();
        assert!(
            out.status.success(),
            "{}",
            String::from_utf8_lossy(&out.stderr)
        );
    };
    run(&["demo", "--dir", "."]);
    run(&[
        "audit",
        "kestrel-ridge.xlsx",
        "-o",
        "si.xlsx",
        "--json",
        "si.json",
    ]);
    run(&[
        "audit",
        "kestrel-ridge.xlsx",
        "--units",
        "us",
        "-o",
        "us.xlsx",
    ]);
    let json =
        serde_json::from_str(&std::fs::read_to_string(dir.join("si.json")).unwrap()).unwrap();
    (
        dir.join("kestrel-ridge.xlsx"),
        dir.join("si.xlsx"),
        dir.join("us.xlsx"),
        json,
    )
}

/// The chart parts of a workbook, as text.
fn charts(path: &Path) -> Vec<String> {
    let mut zip = zip::ZipArchive::new(std::fs::File::open(path).unwrap()).unwrap();
    let names: Vec<String> = zip
        .file_names()
        .filter_map(|n| n.ok().map(|n| n.to_string()))
        .filter(|n| n.starts_with("xl/charts/chart"))
        .collect();
    names
        .iter()
        .map(|n| {
            let mut s = String::new();
            zip.by_name(n).unwrap().read_to_string(&mut s).unwrap();
            s
        })
        .collect()
}

/// Each series of a chart: its name and the cell ranges (`'Sheet'!$B$5:$B$9`) of its x and y
/// values.
fn series(xml: &str) -> Vec<(String, String, String)> {
    let between = |s: &str, a: &str, b: &str| -> Vec<String> {
        s.split(a)
            .skip(1)
            .map(|p| p[..p.find(b).unwrap()].replace("&apos;", "'"))
            .collect()
    };
    xml.split("<c:ser>")
        .skip(1)
        .map(|ser| {
            let name = between(ser, "<c:v>", "</c:v>").remove(0);
            let f = between(ser, "<c:f>", "</c:f>");
            (name, f[0].clone(), f[1].clone())
        })
        .collect()
}

/// Numbers of a `'Sheet'!$K$71:$K$75` range.
fn column(book: &mut Xlsx<std::io::BufReader<std::fs::File>>, range: &str) -> Vec<f64> {
    let (sheet, cells) = range.rsplit_once('!').unwrap();
    let sheet = sheet.trim_matches('\'');
    let parse = |c: &str| -> (u32, u32) {
        let c = c.replace('$', "");
        let split = c.find(|ch: char| ch.is_ascii_digit()).unwrap();
        let col = c[..split]
            .bytes()
            .fold(0, |a, b| a * 26 + (b - b'A' + 1) as u32)
            - 1;
        (c[split..].parse::<u32>().unwrap() - 1, col)
    };
    let (a, b) = cells.split_once(':').unwrap_or((cells, cells));
    let ((r0, c), (r1, _)) = (parse(a), parse(b));
    let ws = book.worksheet_range(sheet).unwrap();
    (r0..=r1)
        .map(|r| match ws.get_value((r, c)) {
            Some(Data::Float(x)) => *x,
            other => panic!("{range}: {other:?}"),
        })
        .collect()
}

// The chart of each system: its series, the efficiency on the secondary axis, and the cells
// they point at hold the input's pump efficiency points and the JSON's operating point.
#[test]
fn each_system_chart_has_its_curves_points_and_the_efficiency_on_a_second_axis() {
    let (input_path, si, _, json) = demo("chart");
    let input = lossledger::ingest::read_path(&input_path).unwrap();
    let mut book: Xlsx<_> = open_workbook(&si).unwrap();
    for s in json["systems"].as_array().unwrap() {
        let id = s["system"].as_str().unwrap();
        let all = charts(&si);
        let xml = all
            .iter()
            .find(|x| x.contains(&format!("System {id}: head against flow")))
            .unwrap_or_else(|| panic!("no chart for {id}"));
        let found = series(xml);
        let named = |name: &str| found.iter().find(|f| f.0 == name);
        let has_curve = input.pump_curves.iter().any(|p| p.system == id);
        assert!(named("System curve").is_some() && named("Duty point").is_some());
        assert_eq!(named("Pump curve").is_some(), has_curve, "{id}");
        let op = &s["operating_point"];
        assert_eq!(named("Operating point").is_some(), !op.is_null(), "{id}");
        if let Some((_, x, _)) = named("Operating point") {
            let q = column(&mut book, x)[0];
            assert!((q - op["flow_m3_s"].as_f64().unwrap() * 3600.0).abs() < 1e-9);
        }
        let mut eff: Vec<(f64, f64)> = input
            .pump_curves
            .iter()
            .filter(|p| p.system == id)
            .filter_map(|p| p.efficiency.map(|e| (p.flow_m3_s * 3600.0, e)))
            .collect();
        eff.sort_by(|a, b| a.0.total_cmp(&b.0));
        let Some((_, x, y)) = named("Pump efficiency") else {
            assert!(eff.is_empty(), "{id}: efficiency points but no series");
            assert_eq!(xml.matches("<c:scatterChart>").count(), 1, "{id}");
            continue;
        };
        // A second scatter group holds the efficiency series alone, on its own value axes.
        let second = xml
            .split("<c:scatterChart>")
            .nth(2)
            .expect("a secondary group");
        assert!(second.contains("<c:v>Pump efficiency</c:v>"), "{id}");
        assert_eq!(second.matches("<c:ser>").count(), 1, "{id}");
        assert_eq!(xml.matches("<c:valAx>").count(), 4, "{id}");
        let (flows, values) = (column(&mut book, x), column(&mut book, y));
        assert_eq!(flows.len(), eff.len(), "{id}");
        for ((q, e), (fq, fe)) in eff.iter().zip(flows.iter().zip(&values)) {
            assert!((q - fq).abs() < 1e-9 && (e - fe).abs() < 1e-12, "{id}");
        }
    }
}

/// Rows of the Summary's station block: (system, label) → column-C value.
fn station_block(sheet: &Range<Data>) -> Vec<(String, String, Data)> {
    let (r1, _) = sheet.end().unwrap();
    let mut out = Vec::new();
    let mut system = String::new();
    let mut inside = false;
    for r in 0..=r1 {
        let label = match sheet.get_value((r, 0)) {
            Some(Data::String(s)) => s.clone(),
            _ if inside => break,
            _ => continue,
        };
        if label.starts_with("Station energy") {
            inside = true;
            let caution = sheet.get_value((r, 2)).cloned().unwrap_or(Data::Empty);
            assert_eq!(caution, Data::String(STATION_CAUTION.into()));
        } else if let Some(id) = label.strip_prefix("System ").filter(|_| inside) {
            system = id.to_string();
        } else if inside {
            let v = sheet.get_value((r, 2)).cloned().unwrap_or(Data::Empty);
            out.push((system.clone(), label, v));
        }
    }
    out
}

fn num(rows: &[(String, String, Data)], system: &str, label: &str) -> f64 {
    match rows.iter().find(|(s, l, _)| s == system && l == label) {
        Some((_, _, Data::Float(x))) => *x,
        other => panic!("{system} {label}: {other:?}"),
    }
}

fn close(a: f64, b: f64) -> bool {
    ((a - b) / b).abs() < SHOWN_TOL
}

// The Summary's station block: number cells, metered specific energy from the input's own meter
// cells (E / V), the other figures as the JSON gives them, flows converted by NIST SP 811 in US
// units, and the screening caution.
#[test]
fn summary_station_block_has_number_cells_in_both_unit_systems() {
    let (input_path, si, us, json) = demo("summary");
    let input = lossledger::ingest::read_path(&input_path).unwrap();
    let rows = |p: &Path| {
        let mut b: Xlsx<_> = open_workbook(p).unwrap();
        station_block(&b.worksheet_range("Summary").unwrap())
    };
    let (si_rows, us_rows) = (rows(&si), rows(&us));
    for s in json["systems"].as_array().unwrap() {
        let id = s["system"].as_str().unwrap();
        let share = num(&si_rows, id, "Piping share of the head");
        assert!(close(share, s["loss_share"].as_f64().unwrap()), "{id}");
        let row = input.systems.iter().find(|r| r.system == id).unwrap();
        if let Some(m) = row.metered {
            let e = num(&si_rows, id, "Specific energy [kWh/m3]");
            assert!(close(e, m.energy_kwh / m.volume_m3), "{id}: {e}");
        }
        let w = num(&si_rows, id, "Wire-to-water");
        assert!((0.0..=1.0).contains(&w), "{id}");
        if let Some(p) = s["pump_efficiency"].as_object() {
            let bep = p["best"]["flow_m3_s"].as_f64().unwrap() * 3600.0;
            assert!(close(num(&si_rows, id, "Best-efficiency flow [m3/h]"), bep));
            let gpm = num(&us_rows, id, "Best-efficiency flow [US gpm]");
            assert!(close(gpm, bep * GPM_PER_M3H), "{id}: {gpm}");
        }
        let control = si_rows
            .iter()
            .find(|(sys, l, _)| sys == id && l == "Flow control the savings assume")
            .map(|r| r.2.clone());
        assert_eq!(
            control,
            Some(Data::String(s["control"].as_str().unwrap().into()))
        );
    }
}
