//! The annotated workbook as a spreadsheet: figures are number cells (they can be summed and
//! charted), and `--units us` converts every figure it labels in US units. Read back with
//! calamine from the invented demo station.
//!
//! Expected conversions use the exact definitions of NIST SP 811 (2008) B.8: 1 ft = 0.3048 m;
//! 1 US gallon = 3.785411784 L (so 1 m³/h = 1000 / 3.785411784 / 60 US gpm).

mod common;

use calamine::{Data, Range, Reader, Xlsx};
use common::bin::{Runs, bin, demo};
use common::dirs::temp_dir;
use common::readback::open;
use std::path::Path;

/// Relative tolerance on a converted figure written at full precision: both sides are f64
/// products of the same value.
const CONVERSION_TOL: f64 = 1e-12;
/// Relative tolerance on a figure written to six significant figures (`report::style::shown`):
/// each side is rounded once, by at most half a unit in the sixth figure.
const SHOWN_TOL: f64 = 1e-5;
/// Feet per metre, from 1 ft = 0.3048 m exactly (NIST SP 811 B.8).
const FT_PER_M: f64 = 1.0 / 0.3048;
/// US gpm per m³/h, from 1 US gal = 3.785411784 L exactly (NIST SP 811 B.8).
const GPM_PER_M3H: f64 = 1000.0 / 3.785411784 / 60.0;
/// Inches per millimetre, from 1 in = 25.4 mm exactly (NIST SP 811 B.8).
const IN_PER_MM: f64 = 1.0 / 25.4;
/// 1 psi = 6894.757 Pa (NIST SP 811, B.8).
const PSI_PER_KPA: f64 = 1000.0 / 6894.757;

/// The demo's input (written into `dir` on first use), and its audit written in `units`.
/// A workbook read back.
type Book = Xlsx<std::io::BufReader<std::fs::File>>;

fn demo_audited(dir: &Path, units: &str) -> Book {
    // The demo is written once per folder; each call audits it again in its own units.
    if !dir.join("kestrel-ridge.xlsx").exists() {
        demo(dir);
    }
    let target = dir.join(format!("audit-{units}.xlsx"));
    let out = bin()
        .arg("audit")
        .arg(dir.join("kestrel-ridge.xlsx"))
        .args(["--units", units, "-o"])
        .arg(&target)
        .ran();
    assert_eq!(out.code, Some(0), "{}", out.stderr);
    open(&target)
}

/// Each row's column-A label and the cell `col` beside it.
fn labelled(sheet: &Range<Data>, col: u32) -> Vec<(String, Data)> {
    let (r0, _) = sheet.start().unwrap();
    let (r1, _) = sheet.end().unwrap();
    (r0..=r1)
        .filter_map(|r| match sheet.get_value((r, 0)) {
            Some(Data::String(s)) => Some((
                s.clone(),
                sheet.get_value((r, col)).cloned().unwrap_or(Data::Empty),
            )),
            _ => None,
        })
        .collect()
}

fn number(rows: &[(String, Data)], label: &str) -> f64 {
    match rows.iter().find(|(l, _)| l == label) {
        Some((_, Data::Float(x))) => *x,
        Some((_, other)) => panic!("{label}: not a number cell: {other:?}"),
        None => panic!(
            "{label}: no such row in {:?}",
            rows.iter().map(|r| &r.0).collect::<Vec<_>>()
        ),
    }
}

fn close(a: f64, b: f64, tol: f64) -> bool {
    (a - b).abs() <= tol * a.abs().max(b.abs())
}

#[test]
fn summary_counts_and_totals_are_number_cells() {
    let dir = temp_dir("summary");
    let mut wb = demo_audited(&dir, "si");
    let rows = labelled(&wb.worksheet_range("Summary").unwrap(), 2);
    // The demo station's size (src/demo.rs): counted, not compared to a pinned value, except
    // that each count is a whole number and at least one.
    for label in ["Lines audited", "Pipe runs", "Fittings"] {
        let n = number(&rows, label);
        assert!(n >= 1.0 && n.fract() == 0.0, "{label} = {n}");
    }
    let findings: f64 = ["Findings: errors", "Findings: warnings", "Findings: info"]
        .iter()
        .map(|l| number(&rows, l))
        .sum();
    assert!(findings >= 1.0, "the demo raises findings");
    assert!(number(&rows, "Sum of line losses [m]") > 0.0);
}

#[test]
fn summary_has_a_legend_of_the_fills() {
    let dir = temp_dir("legend");
    let mut wb = demo_audited(&dir, "si");
    let summary = wb.worksheet_range("Summary").unwrap();
    let names: Vec<String> = summary
        .used_cells()
        .filter(|(_, c, _)| *c == 1)
        .filter_map(|(_, _, d)| match d {
            Data::String(s) => Some(s.clone()),
            _ => None,
        })
        .collect();
    for fill in [
        "error",
        "warning",
        "info",
        "assumed",
        "fails",
        "holds",
        "uncertain",
    ] {
        assert!(
            names.iter().any(|n| n == fill),
            "legend lacks {fill}: {names:?}"
        );
    }
}

#[test]
fn system_figures_are_number_cells_converted_by_units_us() {
    let dir = temp_dir("systems");
    let mut si = demo_audited(&dir, "si");
    let mut us = demo_audited(&dir, "us");
    // The demo's input has a Systems sheet, so the checks sheet is named "System checks".
    let si_rows = labelled(&si.worksheet_range("System checks").unwrap(), 1);
    let us_rows = labelled(&us.worksheet_range("System checks").unwrap(), 1);
    for (si_label, us_label, factor) in [
        ("Required head [m]", "Required head [ft]", FT_PER_M),
        ("Line losses [m]", "Line losses [ft]", FT_PER_M),
        ("Duty flow [m3/h]", "Duty flow [US gpm]", GPM_PER_M3H),
        (
            "NPSH available at duty [m]",
            "NPSH available at duty [ft]",
            FT_PER_M,
        ),
    ] {
        let (a, b) = (number(&si_rows, si_label), number(&us_rows, us_label));
        assert!(
            close(a * factor, b, SHOWN_TOL),
            "{si_label}: {a} × {factor} ≠ {b}"
        );
    }
}

#[test]
fn units_us_converts_the_summary_and_ranking_heads() {
    let dir = temp_dir("ranking");
    let mut si = demo_audited(&dir, "si");
    let mut us = demo_audited(&dir, "us");
    let (a, b) = (
        number(
            &labelled(&si.worksheet_range("Summary").unwrap(), 2),
            "Sum of line losses [m]",
        ),
        number(
            &labelled(&us.worksheet_range("Summary").unwrap(), 2),
            "Sum of line losses [ft]",
        ),
    );
    assert!(close(a * FT_PER_M, b, CONVERSION_TOL), "{a} m vs {b} ft");
    // The ranking's head column: find it by header in each workbook, compare the first items.
    let head_col = |sheet: &Range<Data>, header: &str| -> (u32, u32) {
        sheet
            .used_cells()
            .find(|(_, _, d)| matches!(d, Data::String(s) if s == header))
            .map(|(r, c, _)| (r as u32, c as u32))
            .unwrap_or_else(|| panic!("no {header} header"))
    };
    let rs = si.worksheet_range("Fitting ranking").unwrap();
    let ru = us.worksheet_range("Fitting ranking").unwrap();
    let (hr, hc) = head_col(&rs, "Head [m]");
    let (ur, uc) = head_col(&ru, "Head [ft]");
    for i in 1..=5 {
        let cell = |s: &Range<Data>, r: u32, c: u32| match s.get((r as usize + i, c as usize)) {
            Some(Data::Float(x)) => *x,
            other => panic!("ranking row {i}: {other:?}"),
        };
        let (a, b) = (cell(&rs, hr, hc), cell(&ru, ur, uc));
        assert!(
            close(a * FT_PER_M, b, SHOWN_TOL),
            "row {i}: {a} m vs {b} ft"
        );
    }
}

/// `--units us` writes the figures of the System checks sheet's notes (the defaults applied to
/// NPSH, the notes, the savings' basis) in US units, each the SI figure converted.
#[test]
fn units_us_writes_the_system_notes_in_us_units() {
    const LABELS: [&str; 3] = [
        "Defaults applied",
        "Note",
        "Savings of the suggestions (estimate)",
    ];
    let notes = |book: &mut Book| labelled_texts(book, "System checks", |l| LABELS.contains(&l));
    assert_demo_sentences_converted("system-notes", notes, 2);
}

/// `--units us` writes the figures of the values assumed (the Basis sheet's "assumed on" rows:
/// roughness, site elevation, standard atmosphere) in US units, each the SI figure converted.
#[test]
fn units_us_writes_the_assumed_values_in_us_units() {
    let assumed = |book: &mut Book| labelled_texts(book, "Basis", |l| l.starts_with("assumed on"));
    assert_demo_sentences_converted("assumed-values", assumed, 2);
}

/// The demo audited in SI and in US units: the sentences `read` takes from each workbook hold at
/// least `at_least` figures, each converted ([`assert_converted`]). Returns the folder used.
fn assert_demo_sentences_converted(
    name: &str,
    read: impl Fn(&mut Book) -> Vec<String>,
    at_least: usize,
) -> std::path::PathBuf {
    let dir = temp_dir(name);
    let (si, us) = (
        read(&mut demo_audited(&dir, "si")),
        read(&mut demo_audited(&dir, "us")),
    );
    let converted = assert_converted(&si, &us);
    assert!(
        converted >= at_least,
        "{name}: the demo's sentences hold only {converted} figures: {si:?}"
    );
    dir
}

/// The text cells of column B of `sheet` whose column-A label passes `keep`, in row order.
fn labelled_texts(book: &mut Book, sheet: &str, keep: impl Fn(&str) -> bool) -> Vec<String> {
    let sheet = book.worksheet_range(sheet).unwrap();
    labelled(&sheet, 1)
        .into_iter()
        .filter(|(label, _)| keep(label))
        .filter_map(|(_, d)| match d {
            Data::String(s) => Some(s),
            _ => None,
        })
        .collect()
}

/// SI units of the figures in sentences, and the US units they become ("mm" before "m", so a
/// figure in mm is not read as one in m).
const SI_UNITS: [&str; 5] = ["m/s", "m3/h", "kPa", "mm", "m"];
const US_UNITS: [&str; 5] = ["ft/s", "US gpm", "psi", "in", "ft"];

/// Each US sentence has the SI one's figures, each converted (NIST SP 811 B.8 factors) within
/// the rounding of both, and no SI figure is left in it. Returns the figures compared.
fn assert_converted(si: &[String], us: &[String]) -> usize {
    assert_eq!(si.len(), us.len());
    let mut converted = 0;
    for (a, b) in si.iter().zip(us) {
        let (fa, fb) = (figures(a, &SI_UNITS), figures(b, &US_UNITS));
        assert_eq!(fa.len(), fb.len(), "{a}\n{b}");
        assert!(figures(b, &SI_UNITS).is_empty(), "SI figure left in: {b}");
        for ((x, hx, ux), (y, hy, uy)) in fa.iter().zip(&fb) {
            let factor = match ux.as_str() {
                "m3/h" => GPM_PER_M3H,
                "kPa" => PSI_PER_KPA,
                "mm" => IN_PER_MM,
                _ => FT_PER_M,
            };
            assert_eq!(US_UNITS[SI_UNITS.iter().position(|u| u == ux).unwrap()], uy);
            // Each side is rounded once: half a unit in the SI figure's last decimal, scaled,
            // plus half a unit in the US figure's.
            let slack = hx * factor + hy;
            assert!((x * factor - y).abs() <= slack, "{x} {ux} vs {y} {uy}: {a}");
            converted += 1;
        }
    }
    converted
}

/// The figures in a message: (value, half a unit in its last decimal, unit) for each number
/// followed by one of `units`. Gradients (`m per 100 m`) are ratios and left out.
fn figures(message: &str, units: &[&str]) -> Vec<(f64, f64, String)> {
    let message = message
        .replace("m per 100 m", "m-per-100-m")
        .replace("ft per 100 ft", "ft-per-100-ft");
    let alternatives: Vec<String> = units.iter().map(|u| regex::escape(u)).collect();
    let re = regex::Regex::new(&format!(
        r"(-?\d+(?:\.\d+)?) ({})(?:[ ,;:)]|$)",
        alternatives.join("|")
    ))
    .unwrap();
    re.captures_iter(&message)
        .map(|c| {
            let decimals = c[1].split_once('.').map_or(0, |(_, d)| d.len());
            let half = 0.5 * 10f64.powi(-(decimals as i32));
            (c[1].parse().unwrap(), half, c[2].to_string())
        })
        .collect()
}

/// The Findings sheet's messages (column F), in row order.
fn messages(book: &mut Book) -> Vec<String> {
    let sheet = book.worksheet_range("Findings").unwrap();
    (1..sheet.height())
        .filter_map(|r| match sheet.get((r, 5)) {
            Some(Data::String(s)) => Some(s.clone()),
            _ => None,
        })
        .collect()
}

/// `--units us` writes the figures of the finding messages in ft, ft/s and US gpm (each the SI
/// figure converted, to the decimals shown), while the JSON's messages stay SI.
#[test]
fn units_us_writes_the_finding_messages_in_us_units() {
    let dir = assert_demo_sentences_converted("messages", messages, 3);
    let si = messages(&mut open(&dir.join("audit-si.xlsx")));
    let converted: usize = si.iter().map(|m| figures(m, &SI_UNITS).len()).sum();
    let json = dir.join("audit-us.json");
    let out = bin()
        .arg("audit")
        .arg(dir.join("kestrel-ridge.xlsx"))
        .args(["--units", "us", "-o"])
        .arg(dir.join("audit-us-json.xlsx"))
        .arg("--json")
        .arg(&json)
        .ran();
    assert_eq!(out.code, Some(0), "{}", out.stderr);
    let json = common::readback::read_json(&json);
    let json_messages: Vec<&str> = json["findings"]
        .as_array()
        .unwrap()
        .iter()
        .filter_map(|f| f["message"].as_str())
        .collect();
    assert_eq!(json_messages.len(), si.len());
    for m in &json_messages {
        assert!(
            figures(m, &US_UNITS).is_empty(),
            "JSON message not in SI: {m}"
        );
    }
    let si_figures: usize = json_messages
        .iter()
        .map(|m| figures(m, &SI_UNITS).len())
        .sum();
    assert_eq!(si_figures, converted, "the JSON's messages lost figures");
}
