//! Messy real-world layouts read to the same numbers as their clean canonical twins.
//!
//! The fixtures under `fixtures/messy/` are written by `examples/make_messy_fixtures.rs` (all
//! stations invented). Each messy input and its `*.canonical.xlsx` twin hold the same lines, runs
//! and fittings; the audit of both must give the same line totals to 1e-9 relative. The US-unit
//! takeoff (06) and its SI twin are one of the pairs. The size table checks notations against
//! ASME B36.10M (2018) Table 1 (outside diameter and schedule 40 wall) and ISO 4427-2:2019.

mod common;

use common::dirs::fixtures;
use common::library::{read_clean, same_totals, totals};
use std::path::PathBuf;

use lossledger::audit::{self, Rules};
use lossledger::ingest::parse::{SizeSpec, SizeUnit, parse_size};
use lossledger::ingest::{self, Input, InputSource, ReadOptions, TableKind};
use lossledger::physics::pipe::{self, Material, Schedule};

fn dir() -> PathBuf {
    fixtures("messy")
}

fn read(name: &str, map: Option<&str>) -> Input {
    read_clean(&dir(), name, map)
}

fn same(messy: &str, twin: &str, map: Option<&str>) -> Input {
    let m = read(messy, map);
    let lines = same_totals(messy, &m, &read(twin, None));
    assert!(lines >= 4, "{messy}: all lines audited");
    m
}

fn twin(stem: &str) -> String {
    format!("{stem}.canonical.xlsx")
}

#[test]
fn aliases_and_title_blocks() {
    let m = same("01_aliases_titles.xlsx", &twin("01_aliases_titles"), None);
    assert_eq!(
        m.layout(TableKind::Pipes)
            .map(|l| (l.sheet.as_str(), l.header_row)),
        Some(("Pipe takeoff", 4))
    );
    assert_eq!(
        m.layout(TableKind::Fittings).map(|l| l.sheet.as_str()),
        Some("Fitting schedule")
    );
}

#[test]
fn headers_over_two_rows() {
    let m = same("02_two_row_headers.xlsx", &twin("02_two_row_headers"), None);
    assert_eq!(m.layout(TableKind::Lines).map(|l| l.header_rows), Some(2));
    assert_eq!(
        m.layout(TableKind::Fittings)
            .map(|l| (l.header_rows, l.columns.len())),
        Some((2, 7))
    );
}

#[test]
fn units_row() {
    let m = same("03_units_row.xlsx", &twin("03_units_row"), None);
    assert_eq!(
        m.layout(TableKind::Pipes).and_then(|l| l.units_row),
        Some(3),
        "the units row under the header, which sits under the invented-data note and a blank row"
    );
    assert_eq!(
        m.layout(TableKind::Lines)
            .and_then(|l| l.column("flow"))
            .and_then(|c| c.unit)
            .map(|u| u.label),
        Some("l/s")
    );
}

#[test]
fn numbers_stored_as_text() {
    let m = same("04_numbers_as_text.xlsx", &twin("04_numbers_as_text"), None);
    assert!(
        m.report
            .conversions
            .iter()
            .any(|c| c.text == "1,310.5 m" && c.value == 1310.5)
    );
    assert!(
        m.report.conversions.len() >= 20,
        "{}",
        m.report.conversions.len()
    );
}

#[test]
fn decimal_comma() {
    let m = same("05_decimal_comma.xlsx", &twin("05_decimal_comma"), None);
    assert!(
        m.report
            .conversions
            .iter()
            .any(|c| c.text == "1310,5" && c.value == 1310.5)
    );
}

#[test]
fn us_units_give_the_same_si_results() {
    let m = same("06_us_units.xlsx", &twin("06_us_units"), None);
    assert_eq!(
        m.layout(TableKind::Pipes)
            .and_then(|l| l.column("length"))
            .and_then(|c| c.unit)
            .map(|u| u.label),
        Some("ft")
    );
    assert!(m.pipes.iter().any(|p| p.size == Some(SizeSpec::Nps(1.5))));
}

#[test]
fn merged_cells() {
    let m = same("07_merged_cells.xlsx", &twin("07_merged_cells"), None);
    assert_eq!(m.pipes.len(), 6);
    assert!(!m.sheets.iter().all(|s| s.merged.is_empty()));
}

#[test]
fn formula_cells_use_cached_values() {
    let m = same("08_formulas.xlsx", &twin("08_formulas"), None);
    // The first data row sits under the invented-data note, a blank row and the header.
    assert!(m.sheets.iter().any(|s| s.formula(3, 5).is_some()));
}

#[test]
fn size_notations() {
    same("09_size_notations.xlsx", &twin("09_size_notations"), None);
}

#[test]
fn tables_found_by_headers_with_skipped_rows() {
    let m = same(
        "10_found_by_headers.xlsx",
        &twin("10_found_by_headers"),
        None,
    );
    let reasons: Vec<&str> = m.report.skipped.iter().map(|s| s.reason.as_str()).collect();
    assert_eq!(reasons.len(), 3, "{reasons:?}");
    assert!(
        reasons[0].contains("header repeated")
            && reasons[1].contains("totals")
            && reasons[2].contains("note")
    );
    assert_eq!(
        m.layout(TableKind::Pipes).map(|l| l.sheet.as_str()),
        Some("Data")
    );
}

#[test]
fn flow_in_pipes_without_lines() {
    let m = same("11_flow_in_pipes.xlsx", &twin("11_flow_in_pipes"), None);
    assert!(m.layout(TableKind::Lines).is_none());
}

#[test]
fn map_file_reaches_headers_aliases_miss() {
    let m = same(
        "12_map_file.xlsx",
        &twin("12_map_file"),
        Some("12_map_file.map.toml"),
    );
    let l = m.layout(TableKind::Pipes).expect("pipes");
    assert!(
        l.column("length")
            .is_some_and(|c| c.by_map && c.unit.map(|u| u.label) == Some("ft"))
    );
    // Without the map the sheet does not read.
    let bare = ingest::read_path(&dir().join("12_map_file.xlsx")).expect("readable");
    assert!(bare.error_count() > 0);
}

#[test]
fn two_files_merged() {
    let m = same("13_two_files", &twin("13_two_files"), None);
    assert_eq!(m.sources.len(), 2);
}

#[test]
fn csv_folder() {
    let m = same("14_csv_folder", &twin("14_csv_folder"), None);
    assert_eq!(m.sources.len(), 3);
    assert!(m.report.conversions.iter().any(|c| c.text == "6,5"));
}

#[test]
fn csv_tables_by_flag() {
    let d = dir().join("14_csv_folder");
    let sources = [
        InputSource::Csv {
            table: TableKind::Lines,
            path: d.join("Line list.csv"),
        },
        InputSource::Csv {
            table: TableKind::Pipes,
            path: d.join("Pipes.csv"),
        },
        InputSource::Csv {
            table: TableKind::Fittings,
            path: d.join("Fitting schedule.csv"),
        },
    ];
    let m = ingest::read_inputs(&sources, &ReadOptions::default()).expect("readable");
    assert_eq!(m.error_count(), 0, "{:#?}", m.diagnostics);
    assert_eq!(totals(&m), totals(&read(&twin("14_csv_folder"), None)));
}

#[test]
fn duplicate_line_ids_across_files_are_an_error() {
    let a = dir().join("13_two_files/a_lines_pipes.xlsx");
    let sources = [
        InputSource::Path(a.clone()),
        InputSource::Path(dir().join(twin("13_two_files"))),
    ];
    let m = ingest::read_inputs(&sources, &ReadOptions::default()).expect("readable");
    assert!(
        m.diagnostics
            .iter()
            .any(|d| d.message.contains("also listed in") && d.cell.is_some()),
        "{:#?}",
        m.diagnostics
    );
}

#[test]
fn defaults_are_counted_per_sheet_and_line() {
    let m = read("11_flow_in_pipes.xlsx", None);
    let by_line = m.assumed_by_line();
    // Schedule 40 is written, so only roughness is assumed on the runs; fittings assume qty.
    assert_eq!(
        by_line.get("HF-B1").and_then(|k| k.get("roughness")),
        Some(&2)
    );
    assert!(
        m.assumed_by_sheet()
            .keys()
            .any(|(s, w)| s == "Pipes" && w.contains("roughness"))
    );
}

/// (notation, header unit, bore in mm). Steel bores are OD − 2 × wall of ASME B36.10M (2018)
/// Table 1, schedule 40 (the default schedule); PE 110 SDR 11 is 110 − 2 × 10.0 (ISO 4427-2:2019
/// Table 2); written bores and OD × wall are arithmetic on the written numbers.
const SIZES: &[(&str, Option<SizeUnit>, f64)] = &[
    ("DN15", None, 15.76),
    ("1/2\"", None, 15.76),
    ("NPS 1/2", None, 15.76),
    ("DN20", None, 20.96),
    ("3/4\"", None, 20.96),
    ("3/4 in", None, 20.96),
    ("¾\"", None, 20.96),
    ("DN25", None, 26.64),
    ("1\"", None, 26.64),
    ("25NB", None, 26.64),
    ("1-inch", None, 26.64),
    ("DN32", None, 35.08),
    ("1-1/4\"", None, 35.08),
    ("1 1/4\"", None, 35.08),
    ("DN40", None, 40.94),
    ("1-1/2\"", None, 40.94),
    ("1 1/2\"", None, 40.94),
    ("1.5\"", None, 40.94),
    ("1½\"", None, 40.94),
    ("40 mm NB", None, 40.94),
    ("DN50", None, 52.48),
    ("2\"", None, 52.48),
    ("NB50", None, 52.48),
    ("2 in", None, 52.48),
    ("DN65", None, 62.68),
    ("2-1/2\"", None, 62.68),
    ("DN80", None, 77.92),
    ("3\"", None, 77.92),
    ("80NB", None, 77.92),
    ("NPS 3", None, 77.92),
    ("DN100", None, 102.26),
    ("100NB", None, 102.26),
    ("NB100", None, 102.26),
    ("100 mm NB", None, 102.26),
    ("NPS 4", None, 102.26),
    ("4\"", None, 102.26),
    ("4 in", None, 102.26),
    ("4-inch", None, 102.26),
    ("4''", None, 102.26),
    ("dn 100", None, 102.26),
    ("100", Some(SizeUnit::Millimetre), 102.26),
    ("4", Some(SizeUnit::Inch), 102.26),
    ("Ø114.3x6.02", None, 102.26),
    ("114.3 × 6.02 mm", None, 102.26),
    ("ID 102.3", None, 102.3),
    ("102.3 ID", None, 102.3),
    ("DN150", None, 154.08),
    ("6\"", None, 154.08),
    ("150NB", None, 154.08),
    ("DN200", None, 202.74),
    ("8\"", None, 202.74),
    ("Ø219.1x8.18", None, 202.74),
    ("DN250", None, 254.46),
    ("10\"", None, 254.46),
    ("DN300", None, 303.18),
    ("12\"", None, 303.18),
];

fn bore_mm(spec: SizeSpec, material: Material, schedule: Option<Schedule>) -> Option<f64> {
    Some(match spec {
        SizeSpec::Dn(dn) => pipe::bore(material, dn, schedule).ok()?.inner_diameter_m * 1e3,
        SizeSpec::Nps(n) => {
            pipe::bore(material, pipe::nps_to_dn(n)?, schedule)
                .ok()?
                .inner_diameter_m
                * 1e3
        }
        SizeSpec::OuterDiameter { od_m } => {
            pipe::bore_from_od(material, od_m, schedule)
                .ok()?
                .inner_diameter_m
                * 1e3
        }
        SizeSpec::OdWall { od_m, wall_m } => (od_m - 2.0 * wall_m) * 1e3,
        SizeSpec::InnerDiameter { id_m } => id_m * 1e3,
    })
}

#[test]
fn size_notation_table_gives_published_bores() {
    assert!(SIZES.len() >= 40);
    for &(text, unit, expected) in SIZES {
        let spec = parse_size(text, unit).unwrap_or_else(|e| panic!("{text}: {e}"));
        let got = bore_mm(spec, Material::CarbonSteel, Some(Schedule::Sch(40)))
            .unwrap_or_else(|| panic!("{text}: no bore"));
        assert!(
            (got - expected).abs() < 0.011,
            "{text}: bore {got} mm, expected {expected} mm"
        );
    }
    // PE 110 SDR 11: ISO 4427-2:2019 Table 2, wall 10.0 mm.
    let spec = parse_size("110 OD", None).expect("110 OD");
    let got = bore_mm(spec, Material::Pe, pipe::parse_schedule("SDR11")).expect("PE bore");
    assert!((got - 90.0).abs() < 1e-6, "PE 110 SDR11: {got}");
}

#[test]
fn every_fixture_is_labelled_invented_and_its_outputs_say_so() {
    // Rule of the project: fixtures are invented scenarios, labelled so in every file and in
    // every output they produce. Each workbook, each CSV and the map file carries the label.
    let mut seen = 0;
    let mut stack = vec![dir()];
    while let Some(d) = stack.pop() {
        for e in std::fs::read_dir(&d).unwrap() {
            let p = e.unwrap().path();
            if p.is_dir() {
                stack.push(p);
                continue;
            }
            seen += 1;
            let ext = p.extension().and_then(|x| x.to_str()).unwrap_or("");
            match ext {
                "toml" | "csv" => {
                    let text = std::fs::read_to_string(&p).unwrap();
                    assert!(text.contains("INVENTED DATA"), "{}", p.display());
                }
                "xlsx" => {
                    let input = ingest::read_inputs(
                        &[InputSource::Path(p.clone())],
                        &ReadOptions::default(),
                    )
                    .unwrap();
                    let cell = lossledger::report::invented::marker(&input);
                    assert!(cell.is_some(), "{} has no invented-data label", p.display());
                }
                other => panic!("unexpected fixture type {other}: {}", p.display()),
            }
        }
    }
    assert_eq!(
        seen, 32,
        "fixture files found (update when adding fixtures)"
    );
    // The outputs of an audit of one carry the label (JSON field and note).
    let input = read("14_csv_folder", None);
    let a = audit::run(&input, &Rules::default()).unwrap();
    let json = lossledger::report::json::to_string(&input, &a).unwrap();
    let v: serde_json::Value = serde_json::from_str(&json).unwrap();
    assert_eq!(v["invented_data"], serde_json::Value::Bool(true));
    assert!(
        v["invented_data_note"]
            .as_str()
            .unwrap()
            .contains("INVENTED DATA")
    );
}
