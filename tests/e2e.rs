//! End to end through the binary: the demo, the annotated workbook read back with calamine,
//! JSON against the workbook, the input left untouched, byte-identical reruns, and the basic
//! bad-input classes (exit 2, file and cell named, nothing written).

mod common;

use calamine::{Data, Reader};
use common::bin::{Runs, bin, demo};
use common::book::{Sheet, s, texts, xlsx};
use common::dirs::{entries, temp_dir};
use common::facts::G;
use common::readback::{open, read_json};
use common::tol::REL_TOL_SIX_FIGURES;
use std::path::PathBuf;

#[test]
fn demo_audit_keeps_every_input_cell_and_matches_json() {
    let dir = temp_dir("demo");
    demo(&dir);
    let input = dir.join("kestrel-ridge.xlsx");
    let audit = dir.join("kestrel-ridge.audit.xlsx");
    let json = dir.join("kestrel-ridge.audit.json");
    let input_bytes = std::fs::read(&input).unwrap();

    let mut src = open(&input);
    let mut out = open(&audit);
    let names = out.sheet_names();
    for required in ["Summary", "Findings", "Basis", "Lines", "Pipes", "Fittings"] {
        assert!(
            names.iter().any(|n| n == required),
            "sheet {required} missing: {names:?}"
        );
    }
    assert_eq!(names[0], "Summary", "Summary must be the first sheet");
    for sheet in src.sheet_names() {
        let a = src.worksheet_range(&sheet).unwrap();
        let b = out.worksheet_range(&sheet).unwrap();
        for (r, c, v) in a.used_cells() {
            let (r, c) = (
                a.start().unwrap().0 + r as u32,
                a.start().unwrap().1 + c as u32,
            );
            assert_eq!(
                b.get_value((r, c)),
                Some(v),
                "{sheet} cell ({r},{c}) changed"
            );
        }
        let fa = src.worksheet_formula(&sheet).unwrap();
        let fb = out.worksheet_formula(&sheet).unwrap();
        for (r, c, f) in fa.used_cells() {
            let (r, c) = (
                fa.start().unwrap().0 + r as u32,
                fa.start().unwrap().1 + c as u32,
            );
            assert_eq!(
                fb.get_value((r, c)).map(String::as_str),
                Some(f.as_str()),
                "{sheet} formula ({r},{c}) lost"
            );
        }
    }

    // JSON: valid, and its numbers are the workbook's numbers.
    let doc: serde_json::Value = read_json(&json);
    assert!(doc["lossledger"].is_string());
    assert_eq!(doc["input"]["sha256"].as_str().unwrap().len(), 64);
    let lines = doc["lines"].as_array().unwrap();
    assert_eq!(lines.len(), 5);
    for key in [
        "line",
        "service",
        "flow_m3_s",
        "fluid",
        "temperature_c",
        "density_kg_m3",
        "viscosity_pa_s",
        "length_m",
        "friction_head_m",
        "fittings_head_m",
        "total_head_m",
        "total_dp_pa",
        "max_velocity_m_s",
        "runs",
    ] {
        assert!(lines[0].get(key).is_some(), "JSON line lacks {key}");
    }
    for key in [
        "cell",
        "inner_diameter_m",
        "length_m",
        "roughness_m",
        "velocity_m_s",
        "reynolds",
        "friction_factor",
        "head_m",
        "dp_pa",
    ] {
        assert!(
            lines[0]["runs"][0].get(key).is_some(),
            "JSON run lacks {key}"
        );
    }
    for key in [
        "tag",
        "line",
        "item",
        "cell",
        "qty",
        "k",
        "velocity_m_s",
        "head_m",
        "dp_pa",
    ] {
        assert!(
            doc["fittings"][0].get(key).is_some(),
            "JSON fitting lacks {key}"
        );
    }
    for key in [
        "severity", "code", "line", "tag", "cell", "message", "action",
    ] {
        assert!(
            doc["findings"][0].get(key).is_some(),
            "JSON finding lacks {key}"
        );
    }
    let lines_sheet = out.worksheet_range("Lines").unwrap();
    let header_row = (0..10)
        .find(|&r| lines_sheet.get_value((r, 0)) == Some(&Data::String("Line".into())))
        .unwrap();
    let total_col = (0..40)
        .find(|&c| {
            lines_sheet.get_value((header_row, c)) == Some(&Data::String("Total head [m]".into()))
        })
        .expect("Total head column");
    for (i, l) in lines.iter().enumerate() {
        let cell = lines_sheet.get_value((header_row + 1 + i as u32, total_col));
        let Some(Data::Float(v)) = cell else {
            panic!("no total for line {i}: {cell:?}")
        };
        let j = l["total_head_m"].as_f64().unwrap();
        // The workbook shows six significant figures; the JSON keeps full precision.
        assert!(
            (v - j).abs() <= REL_TOL_SIX_FIGURES * j.abs(),
            "workbook {v} vs JSON {j}"
        );
        assert!(v.to_string().trim_start_matches(['-', '0', '.']).len() <= 7);
    }
    let codes: Vec<&str> = doc["findings"]
        .as_array()
        .unwrap()
        .iter()
        .map(|f| f["code"].as_str().unwrap())
        .collect();
    assert!(
        codes.contains(&"velocity-high"),
        "the demo has a line over its velocity limit: {codes:?}"
    );
    assert_eq!(
        std::fs::read(&input).unwrap(),
        input_bytes,
        "input modified"
    );
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn same_input_gives_a_byte_identical_workbook() {
    let dir = temp_dir("repeat");
    demo(&dir);
    let input = dir.join("kestrel-ridge.xlsx");
    let a = dir.join("a.xlsx");
    let b = dir.join("b.xlsx");
    for out in [&a, &b] {
        let o = bin().arg("audit").arg(&input).arg("-o").arg(out).ran();
        assert_eq!(o.code, Some(0));
    }
    assert_eq!(std::fs::read(&a).unwrap(), std::fs::read(&b).unwrap());
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn refuses_to_write_over_the_input() {
    let dir = temp_dir("over");
    demo(&dir);
    let input = dir.join("kestrel-ridge.xlsx");
    let before = std::fs::read(&input).unwrap();
    let o = bin().arg("audit").arg(&input).arg("-o").arg(&input).ran();
    assert_eq!(o.code, Some(2));
    assert!(o.stderr.contains("refusing"));
    assert_eq!(std::fs::read(&input).unwrap(), before);
    std::fs::remove_dir_all(&dir).ok();
}

/// Write a small workbook of `sheets`, audit it, and return (exit, stderr, its folder).
fn audit_with(name: &str, sheets: &[Sheet]) -> (Option<i32>, String, PathBuf) {
    let dir = temp_dir(name);
    let path = dir.join(format!("{name}.xlsx"));
    std::fs::write(&path, xlsx(sheets)).unwrap();
    let o = bin().arg("audit").arg(&path).ran();
    assert!(!o.stderr.contains("panicked"), "{}", o.stderr);
    (o.code, o.stderr, dir)
}

/// A sheet with headers in row 1 and one row of values (numbers where they parse).
fn sheet_row(name: &str, headers: &[&str], row: &[&str]) -> Sheet {
    Sheet::table(name, headers, vec![texts(row)])
}

/// A Pipes sheet with headers in row 1 and one row of values.
fn pipes(headers: &[&str], row: &[&str]) -> Vec<Sheet> {
    vec![sheet_row("Pipes", headers, row)]
}

const H: &[&str] = &["Line", "Size", "Material", "Length [m]", "Flow [m3/h]"];

fn assert_refused(name: &str, sheets: &[Sheet], cell: &str, words: &str) {
    let (code, stderr, dir) = audit_with(name, sheets);
    assert_eq!(code, Some(2), "{name}: {stderr}");
    assert!(
        stderr.contains(&format!("{name}.xlsx")),
        "{name}: file not named: {stderr}"
    );
    assert!(
        stderr.contains(cell),
        "{name}: cell {cell} not named: {stderr}"
    );
    assert!(
        stderr.to_lowercase().contains(words),
        "{name}: '{words}' not said: {stderr}"
    );
    let written = entries(&dir);
    assert_eq!(
        written.len(),
        1,
        "{name}: something was written: {written:?}"
    );
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn bad_input_is_refused_with_file_and_cell() {
    assert_refused(
        "missing-column",
        &pipes(&["Line", "Size", "Flow [m3/h]"], &["L1", "DN100", "10"]),
        "Pipes!A1",
        "length",
    );
    assert_refused(
        "text-number",
        &pipes(H, &["L1", "DN100", "steel", "twelve", "10"]),
        "Pipes!D2",
        "number",
    );
    assert_refused(
        "negative-length",
        &pipes(H, &["L1", "DN100", "steel", "-12", "10"]),
        "Pipes!D2",
        "greater than zero",
    );
    assert_refused(
        "unknown-size",
        &pipes(H, &["L1", "DN123", "steel", "12", "10"]),
        "Pipes!B2",
        "dn123",
    );
    assert_refused(
        "unknown-item",
        &[
            sheet_row("Pipes", H, &["L1", "DN100", "steel", "12", "10"]),
            sheet_row(
                "Fittings",
                &["Tag", "Line", "Item", "Size"],
                &["F1", "L1", "flexible coupling", "DN100"],
            ),
        ],
        "Fittings!C2",
        "did you mean",
    );
    assert_refused(
        "missing-sheet",
        &[Sheet::new("Notes", vec![vec![s("nothing here")]])],
        "missing-sheet.xlsx",
        "no pipes sheet",
    );
}

#[test]
fn a_file_that_is_not_a_workbook_is_refused() {
    let dir = temp_dir("notxlsx");
    let path = dir.join("fake.xlsx");
    std::fs::write(&path, b"Line,Size\nL1,DN100\n").unwrap();
    let o = bin().arg("audit").arg(&path).ran();
    assert_eq!(o.code, Some(2));
    let stderr = &o.stderr;
    assert!(
        stderr.contains("fake.xlsx") && stderr.contains("not a valid .xlsx"),
        "{stderr}"
    );
    assert!(!dir.join("fake.audit.xlsx").exists());
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn rules_prints_defaults_that_parse_back() {
    let o = bin().arg("rules").ran();
    assert_eq!(o.code, Some(0));
    let text = o.stdout;
    let rules = lossledger::audit::Rules::from_toml(&text, "stdout").unwrap();
    assert_eq!(rules, lossledger::audit::Rules::default());
}

/// `--ranking-rows N` lists the N worst fittings in rank order and says how many are left out;
/// `all` lists every one. (The tool's own contract, docs/workbook.md.)
#[test]
fn ranking_rows_caps_the_ranking_sheet_and_says_what_is_left_out() {
    let dir = temp_dir("ranking-rows");
    demo(&dir);
    let input = dir.join("kestrel-ridge.xlsx");
    let ranks = |rows: &str| -> (Vec<f64>, Option<String>) {
        let out = dir.join(format!("rows-{rows}.xlsx"));
        let o = bin()
            .args(["audit", "--ranking-rows", rows, "-o"])
            .arg(&out)
            .arg(&input)
            .ran();
        assert_eq!(o.code, Some(0), "{}", &o.stderr);
        let mut book = open(&out);
        let sheet = book.worksheet_range("Fitting ranking").unwrap();
        let header = (0..40)
            .find(|&r| sheet.get_value((r, 0)) == Some(&Data::String("Rank".into())))
            .expect("ranking header");
        let ranks: Vec<f64> = (header + 1..sheet.height() as u32)
            .map_while(|r| match sheet.get_value((r, 0)) {
                Some(Data::Float(x)) => Some(*x),
                _ => None,
            })
            .collect();
        let closing =
            (header + 1..sheet.height() as u32 + 1).find_map(|r| match sheet.get_value((r, 0)) {
                Some(Data::String(s)) if s.contains("not listed") => Some(s.clone()),
                _ => None,
            });
        (ranks, closing)
    };
    let (all, none_left) = ranks("all");
    assert_eq!(all.len(), 16, "the demo has 16 fittings");
    assert!(none_left.is_none());
    assert!(all.windows(2).all(|w| w[0] <= w[1]), "rank order: {all:?}");
    let (five, left) = ranks("5");
    assert_eq!(five, all[..5].to_vec());
    let left = left.expect("a closing line");
    assert!(left.starts_with("11 more fittings"), "{left}");
    let bad = bin()
        .args(["audit", "--ranking-rows", "many"])
        .arg(&input)
        .ran();
    assert_eq!(bad.code, Some(2));
    std::fs::remove_dir_all(&dir).ok();
}

fn longest_line(text: &str) -> usize {
    text.lines().map(|l| l.chars().count()).max().unwrap_or(0)
}

#[test]
fn demo_console_shows_each_check_with_the_failing_system_within_80_and_100_columns() {
    for width in [80usize, 100] {
        let dir = temp_dir(&format!("columns-{width}"));
        let out = bin()
            .arg("demo")
            .arg("--dir")
            .arg(&dir)
            .env("COLUMNS", width.to_string())
            .ran();
        assert_eq!(out.code, Some(0));
        let text = &out.stdout;
        assert!(
            longest_line(text) <= width,
            "a line is wider than {width}:\n{text}"
        );
        assert!(!text.contains('│') && !text.contains('┆'), "no box drawing");
        // Duty B: pump 22.50 m against 23.70 m required, NPSHa 3.99 m against 4.40 m.
        let fail_rows: Vec<&str> = text
            .lines()
            .filter(|l| l.starts_with("Duty B") && l.contains("FAIL"))
            .collect();
        assert_eq!(fail_rows.len(), 2, "{width}:\n{text}");
        assert!(
            text.contains("System Duty B: FAILS duty and NPSH margin"),
            "{text}"
        );
        assert!(text.contains("System Duty A: passes the checks made"));
        assert!(
            text.lines()
                .any(|l| l.starts_with("Duty A") && l.contains("operating") && l.contains("pass")),
            "the operating-point check is listed:\n{text}"
        );
        let flat = text.split_whitespace().collect::<Vec<_>>().join(" ");
        assert!(flat.contains("vacuum at high points and siphons are not checked"));
        assert!(flat.contains("before speed control or impeller trimming"));
        let kinds = bin().arg("kinds").env("COLUMNS", width.to_string()).ran();
        let kinds = &kinds.stdout;
        assert!(longest_line(kinds) <= width, "kinds at {width}:\n{kinds}");
    }
}

#[test]
fn a_system_with_no_static_head_raises_its_warning_through_the_binary() {
    let dir = temp_dir("no-static");
    let path = dir.join("no-static.xlsx");
    let sheets = [
        sheet_row(
            "Lines",
            &["Line", "Service", "Flow [m3/h]"],
            &["D1", "pump-discharge", "100"],
        ),
        sheet_row(
            "Pipes",
            &["Line", "Size", "Length [m]"],
            &["D1", "DN150", "50"],
        ),
        sheet_row(
            "Systems",
            &["System", "Lines", "Pump head [m]"],
            &["NoLift", "D1", "30"],
        ),
    ];
    std::fs::write(&path, xlsx(&sheets)).unwrap();
    let json = dir.join("out.json");
    let o = bin()
        .arg("audit")
        .arg(&path)
        .arg("--json")
        .arg(&json)
        .env("COLUMNS", "100")
        .ran();
    let stdout = &o.stdout;
    assert_eq!(o.code, Some(0), "{stdout}");
    assert!(
        stdout.contains("System NoLift: static head not given"),
        "{stdout}"
    );
    assert!(!stdout.contains("System NoLift: passes"));
    let v: serde_json::Value = read_json(&json);
    let finding = v["findings"]
        .as_array()
        .unwrap()
        .iter()
        .find(|f| f["code"] == "static-head-missing")
        .expect("static-head-missing in the JSON");
    assert_eq!(finding["severity"], "warning");
    assert_eq!(v["systems"][0]["verdict"], "static head not given");
    let o = bin()
        .arg("audit")
        .arg(&path)
        .arg("-o")
        .arg(dir.join("again.xlsx"))
        .arg("--fail-on")
        .arg("warning")
        .ran();
    assert_eq!(o.code, Some(1), "the warning counts for --fail-on");
}

#[test]
fn demo_summary_lists_every_system_check_with_its_result_and_the_cautions() {
    let dir = temp_dir("summary-checks");
    demo(&dir);
    let mut out = open(&dir.join("kestrel-ridge.audit.xlsx"));
    let summary = out.worksheet_range("Summary").unwrap();
    let text = |r: u32, c: u32| match summary.get_value((r, c)) {
        Some(Data::String(s)) => s.clone(),
        _ => String::new(),
    };
    let rows = summary.end().unwrap().0;
    let results = |system: &str| -> Vec<(String, String)> {
        (0..=rows)
            .filter(|&r| text(r, 0) == system)
            .map(|r| (text(r, 1), text(r, 6)))
            .collect()
    };
    // Duty A passes at duty and at its operating point; Duty B fails its head and NPSH margin.
    assert_eq!(
        results("Duty A"),
        vec![
            ("pump head at duty".into(), "pass".into()),
            ("NPSH at duty".into(), "pass".into()),
            ("NPSH at operating point".into(), "pass".into()),
        ]
    );
    assert_eq!(
        results("Duty B"),
        vec![
            ("pump head at duty".into(), "FAIL".into()),
            ("NPSH at duty".into(), "FAIL".into()),
        ]
    );
    let all: Vec<String> = (0..=rows).map(|r| text(r, 0)).collect();
    let joined = all.join("\n");
    assert!(joined.contains("System Duty B: FAILS duty and NPSH margin"));
    assert!(joined.contains("vacuum at high points and siphons are not checked"));
    assert!(joined.contains("site elevation 0 m assumed"), "{joined}");
    assert!(joined.contains("before speed control or impeller trimming"));
    let basis = out.worksheet_range("Basis").unwrap();
    let basis_text: String = basis
        .used_cells()
        .filter_map(|(_, _, v)| match v {
            Data::String(s) => Some(s.as_str()),
            _ => None,
        })
        .collect::<Vec<_>>()
        .join("\n");
    assert!(basis_text.contains("vacuum at high points and siphons are not checked"));
    assert!(basis_text.contains("before speed control or impeller trimming"));
}

#[test]
fn old_kind_spellings_still_match_through_the_binary() {
    // A schedule written with the kinds' former ids audits, each item on its new id.
    let dir = temp_dir("old-ids");
    let pipes = dir.join("Pipes.csv");
    let fittings = dir.join("Fittings.csv");
    std::fs::write(
        &pipes,
        "INVENTED DATA for testing: no such plant,,,,\n\
         Line,Size,Schedule,Length [m],Flow [m3/h]\n\
         A,DN100,40,10,40\n",
    )
    .unwrap();
    let old_new = [
        ("entrance-sharp", "entrance-square-edged"),
        ("entrance-rounded", "entrance-radiused"),
        ("entrance-beveled", "entrance-chamfered"),
        ("diffuser-conical", "expansion-tapered"),
        ("contraction-conical", "contraction-tapered"),
        ("contraction-rounded", "contraction-radiused"),
        ("check-tilting-disk", "check-tilting-disc"),
    ];
    let mut text = String::from("Tag,Line,Item,Size,Size out\n");
    for (i, (old, _)) in old_new.iter().enumerate() {
        let out = match *old {
            "diffuser-conical" => "DN150",
            "contraction-conical" | "contraction-rounded" => "DN80",
            _ => "",
        };
        text.push_str(&format!("T{i},A,{old},DN100,{out}\n"));
    }
    std::fs::write(&fittings, text).unwrap();
    let json = dir.join("out.json");
    let out = bin()
        .args(["audit", "--pipes"])
        .arg(&pipes)
        .arg("--fittings")
        .arg(&fittings)
        .arg("-o")
        .arg(dir.join("out.xlsx"))
        .arg("--json")
        .arg(&json)
        .ran();
    assert!(out.code.is_some_and(|c| c <= 1), "{}", &out.stderr);
    let doc: serde_json::Value = read_json(&json);
    let kinds: Vec<&str> = doc["fittings"]
        .as_array()
        .unwrap()
        .iter()
        .map(|f| f["kind"].as_str().unwrap())
        .collect();
    let expected: Vec<&str> = old_new.iter().map(|(_, new)| *new).collect();
    assert_eq!(kinds, expected);
    assert_eq!(doc["invented_data"], serde_json::Value::Bool(true));
}

#[test]
fn demo_outputs_say_the_data_is_invented() {
    let dir = temp_dir("demo-invented");
    let out = bin().arg("demo").arg("--dir").arg(&dir).ran();
    assert!(out.stdout.contains("INVENTED DATA"));
    let doc: serde_json::Value = read_json(&dir.join("kestrel-ridge.audit.json"));
    assert_eq!(doc["invented_data"], serde_json::Value::Bool(true));
    assert!(
        doc["invented_data_note"]
            .as_str()
            .unwrap()
            .starts_with("INVENTED DATA")
    );
    let mut wb = open(&dir.join("kestrel-ridge.audit.xlsx"));
    for sheet in ["Summary", "Findings", "Fitting ranking", "Basis"] {
        let r = wb.worksheet_range(sheet).unwrap();
        assert!(
            r.used_cells()
                .any(|(_, _, v)| matches!(v, Data::String(s) if s.starts_with("INVENTED DATA"))),
            "{sheet} has no invented-data label"
        );
    }
}

/// The demo's station figures through the binary: Duty A is throttled with a site test point,
/// Duty B at fixed speed with a year's meter readings (both invented). Expected values from the
/// definitions of docs/energy.md §8 (wire-to-water = ρ g Q H / P, and e_min × H / e with
/// e_min = ρ g / 3.6e6), ρ from the JSON's line density checked against the iapws fixture at 12 °C.
#[test]
fn demo_station_figures_follow_their_definitions_in_json_and_workbook() {
    let dir = temp_dir("demo-station");
    demo(&dir);
    let doc: serde_json::Value = read_json(&dir.join("kestrel-ridge.audit.json"));
    let rho = doc["lines"][0]["density_kg_m3"].as_f64().unwrap();
    // fixtures/reference/water_iapws.csv at 12 °C (iapws 1.5.5, IAPWS-IF97), to 1e-4.
    assert!((rho / 999.499_075_227_550_4 - 1.0).abs() < 1e-4, "{rho}");
    let g = G;
    let a = &doc["systems"][0];
    assert_eq!(a["control"], "throttled");
    let t = &a["test"];
    let (q, h) = (185.0 / 3600.0, 27.2);
    let w = t["wire_to_water"].as_f64().unwrap();
    assert!((w - rho * g * q * h / 22_000.0).abs() < 1e-12, "{w}");
    assert_eq!(a["savings"]["case"], "throttled");
    assert!(a["savings"]["throttling_head_m"].as_f64().unwrap() > 0.0);
    let b = &doc["systems"][1];
    assert_eq!(b["control"], "fixed");
    let m = &b["measured"];
    let expect = rho * g / 3.6e6 * b["required_head_m"].as_f64().unwrap() / (19_000.0 / 160_000.0);
    assert!((m["wire_to_water"].as_f64().unwrap() - expect).abs() < 1e-12);
    let low = doc["findings"]
        .as_array()
        .unwrap()
        .iter()
        .find(|f| f["code"] == "low-wire-to-water")
        .expect("Duty B's meter readings give 54 %");
    assert!(low["message"].as_str().unwrap().contains("Duty B"));
    let mut book = open(&dir.join("kestrel-ridge.audit.xlsx"));
    let ranking = book.worksheet_range("Fitting ranking").unwrap();
    let header = ranking
        .rows()
        .position(|r| r.first() == Some(&Data::String("Rank".into())))
        .unwrap();
    let col = |name: &str| {
        ranking
            .rows()
            .nth(header)
            .unwrap()
            .iter()
            .position(|c| c == &Data::String(name.into()))
            .unwrap()
    };
    let (case, tag) = (col("Saving case"), col("Tag"));
    let cv = ranking
        .rows()
        .find(|r| r[tag] == Data::String("KR-D1-CV".into()))
        .unwrap();
    assert!(matches!(&cv[case], Data::String(s) if s.starts_with("throttled")));
    let systems = book.worksheet_range("System checks").unwrap();
    let text: Vec<String> = systems
        .rows()
        .flat_map(|r| r.iter().map(|c| c.to_string()))
        .collect();
    // The invented test point of Duty A (src/demo.rs: 185 m3/h) as a number cell beside its label.
    let test_flow = systems
        .rows()
        .find(|r| r.first() == Some(&Data::String("Test flow [m3/h]".into())))
        .expect("a Test flow row");
    assert_eq!(test_flow.get(1), Some(&Data::Float(185.0)));
    assert!(
        text.iter()
            .any(|t| t.contains("Energy and operating-point figures are screening estimates"))
    );
}

/// Impossible meter readings stop the audit through the binary: exit 2, the cell named with a
/// hint, nothing written.
#[test]
fn impossible_meter_readings_exit_2_and_write_nothing() {
    let dir = temp_dir("bad-meter");
    let path = dir.join("meter.xlsx");
    let sheets = [
        sheet_row(
            "Pipes",
            &["Line", "Size", "Length [m]", "Flow [m3/h]"],
            &["P1", "DN100", "50", "40"],
        ),
        sheet_row(
            "Systems",
            &[
                "System",
                "Lines",
                "Static head [m]",
                "Metered energy [kWh/yr]",
                "Metered volume [m3/yr]",
            ],
            &["S", "P1", "30", "100", "160000"],
        ),
    ];
    std::fs::write(&path, xlsx(&sheets)).unwrap();
    let out = dir.join("meter.audit.xlsx");
    let o = bin().arg("audit").arg(&path).arg("-o").arg(&out).ran();
    let stderr = &o.stderr;
    assert_eq!(o.code, Some(2), "{stderr}");
    assert!(
        stderr.contains("Systems!D2") && stderr.contains("theoretical minimum"),
        "{stderr}"
    );
    assert!(!out.exists());
}
