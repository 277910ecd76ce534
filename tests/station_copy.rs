//! The station copy of the invented demo station, read back: each system's chart on the checks
//! sheet (system curve, pump curve, duty and operating points, the pump efficiency on a
//! secondary axis).

use calamine::{Data, Reader, Xlsx, open_workbook};
use std::io::Read;
use std::path::{Path, PathBuf};
use std::process::Command;


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
