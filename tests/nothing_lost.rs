//! Nothing lost: every non-empty input cell (value and formula) is in the annotated copy at the same
//! sheet and position, merged ranges and hidden sheets are kept, and text that looks like a formula
//! is written back as text. Inputs and outputs are both read back with calamine.

mod common;

use calamine::{Data, Dimensions, Reader, SheetVisible, Xlsx, open_workbook};
use common::bin::run;
use common::book::{Cell, Sheet, n, s, sheet, xlsx};
use common::dirs::temp_dir;
use common::stations::base_station;
use std::collections::HashMap;
use std::ffi::OsStr;
use std::path::Path;

/// Cells of one sheet by absolute (row, column).
type Cells<T> = Vec<((u32, u32), T)>;

struct Read {
    values: HashMap<String, Cells<Data>>,
    formulas: HashMap<String, Cells<String>>,
    merged: HashMap<String, Vec<Dimensions>>,
    hidden: HashMap<String, bool>,
}

fn read(path: &Path) -> Read {
    let mut wb: Xlsx<_> = open_workbook(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    let metas: Vec<(String, bool)> = wb
        .sheets_metadata()
        .iter()
        .map(|m| (m.name.clone(), m.visible != SheetVisible::Visible))
        .collect();
    let mut r = Read {
        values: HashMap::new(),
        formulas: HashMap::new(),
        merged: HashMap::new(),
        hidden: HashMap::new(),
    };
    for (name, hidden) in metas {
        let v = wb.worksheet_range(&name).unwrap();
        let (r0, c0) = v.start().unwrap_or((0, 0));
        r.values.insert(
            name.clone(),
            v.used_cells()
                .map(|(i, j, d)| ((r0 + i as u32, c0 + j as u32), d.clone()))
                .collect(),
        );
        let f = wb.worksheet_formula(&name).unwrap();
        let (f0, g0) = f.start().unwrap_or((0, 0));
        r.formulas.insert(
            name.clone(),
            f.used_cells()
                .filter(|(_, _, t)| !t.is_empty())
                .map(|(i, j, t)| ((f0 + i as u32, g0 + j as u32), t.clone()))
                .collect(),
        );
        r.merged.insert(
            name.clone(),
            wb.merge_cells_by_sheet_name(&name).unwrap_or_default(),
        );
        r.hidden.insert(name, hidden);
    }
    r
}

/// Numbers compare by value (an integer may come back as a float); everything else exactly.
fn same(a: &Data, b: &Data) -> bool {
    let num = |d: &Data| match d {
        Data::Int(i) => Some(*i as f64),
        Data::Float(f) => Some(*f),
        Data::DateTime(dt) => Some(dt.as_f64()),
        _ => None,
    };
    match (num(a), num(b)) {
        (Some(x), Some(y)) => x == y,
        _ => a == b,
    }
}

/// Audit `input_bytes` and check every input cell, formula, merge and hidden flag survives.
fn check_kept(label: &str, input_bytes: &[u8]) -> Read {
    check_kept_with(label, input_bytes, &[])
}

/// As [`check_kept`], with extra arguments for `lossledger audit` (e.g. `--map FILE`).
fn check_kept_with(label: &str, input_bytes: &[u8], extra: &[&OsStr]) -> Read {
    let dir = temp_dir(label);
    let input = dir.join("in.xlsx");
    std::fs::write(&input, input_bytes).unwrap();
    let out = dir.join("out.xlsx");
    let mut args = vec![
        OsStr::new("audit"),
        input.as_os_str(),
        OsStr::new("-o"),
        out.as_os_str(),
    ];
    args.extend_from_slice(extra);
    let res = run(&args);
    assert_eq!(res.code, Some(0), "{label}: audit failed: {}", res.stderr);
    assert_eq!(
        std::fs::read(&input).unwrap(),
        input_bytes,
        "{label}: input changed"
    );
    let a = read(&input);
    let b = read(&out);
    let mut checked = 0;
    for (name, cells) in &a.values {
        let got: HashMap<_, _> = b
            .values
            .get(name)
            .unwrap_or_else(|| panic!("{label}: sheet {name} lost"))
            .iter()
            .cloned()
            .collect();
        for (pos, d) in cells {
            let kept = got
                .get(pos)
                .unwrap_or_else(|| panic!("{label}: {name} {pos:?} ({d:?}) lost"));
            assert!(
                same(d, kept),
                "{label}: {name} {pos:?}: input {d:?}, copy {kept:?}"
            );
            checked += 1;
        }
    }
    for (name, fs) in &a.formulas {
        let got: HashMap<_, _> = b.formulas[name].iter().cloned().collect();
        for (pos, f) in fs {
            assert_eq!(
                got.get(pos),
                Some(f),
                "{label}: {name} {pos:?}: formula ={f} lost"
            );
            checked += 1;
        }
    }
    for (name, ms) in &a.merged {
        for m in ms {
            assert!(
                b.merged[name].contains(m),
                "{label}: {name}: merged range {m:?} lost"
            );
        }
    }
    for (name, hidden) in &a.hidden {
        assert_eq!(
            b.hidden.get(name),
            Some(hidden),
            "{label}: {name}: visibility changed"
        );
    }
    assert!(checked > 0, "{label}: nothing was compared");
    let _ = std::fs::remove_dir_all(&dir);
    b
}

#[test]
fn demo_workbook_keeps_every_cell() {
    let bytes = lossledger::demo::input_workbook().unwrap();
    check_kept("demo", &bytes);
}

#[test]
fn messy_workbook_keeps_every_cell_merge_and_hidden_sheet() {
    let mut st = base_station();
    // Title block with a merged title above the header, a units-free extra column, notes.
    let pipes = sheet(&mut st, "Pipes");
    pipes.rows.insert(0, vec![s("Station takeoff, rev B")]);
    pipes.rows.insert(1, vec![]);
    pipes.merged.push((0, 0, 0, 5));
    pipes.set(2, 6, s("Remarks"));
    pipes.set(3, 6, s("see drawing P-101 — ünïcödé ✓ שלום"));
    pipes.set(3, 7, Cell::B(true));
    pipes.set(3, 8, Cell::D("2021-06-30T12:00:00"));
    pipes.set(3, 5, Cell::F("=10+10".into(), "20".into()));
    pipes.set(5, 9, n(-0.0));
    pipes.set(6, 9, n(1e-300));
    pipes.set(7, 9, Cell::F("=1/0".into(), "#DIV/0!".into()));
    pipes.merged.push((8, 9, 9, 10));
    pipes.set(8, 9, s("merged note"));
    let fittings = sheet(&mut st, "Fittings");
    fittings.set(1, 9, s("kept"));
    let mut hidden = Sheet::new(
        "Workings",
        vec![
            vec![s("scratch"), n(1.0)],
            vec![Cell::F("=B1*2".into(), "2".into())],
        ],
    );
    hidden.hidden = true;
    st.push(hidden);
    st.push(Sheet::new(
        "Notes 'quoted' & more",
        vec![vec![s("free text"), s("=not a formula")]],
    ));
    let b = check_kept("messy", &xlsx(&st));
    assert_eq!(b.hidden.get("Workings"), Some(&true));
}

#[test]
fn formula_lookalike_text_is_written_back_as_text() {
    let mut st = base_station();
    let risky = [
        "=1+1",
        "+A1",
        "-2+3",
        "@SUM(A1:A2)",
        "=HYPERLINK(\"http://example.invalid\",\"x\")",
        "\t=1+1",
        "=cmd|' /C calc'!A0",
    ];
    let pipes = sheet(&mut st, "Pipes");
    pipes.set(0, 6, s("Remarks"));
    for (i, t) in risky.iter().enumerate() {
        pipes.set(1, 6 + i, s(t));
    }
    let mut notes = Sheet::new("Notes", vec![]);
    for (i, t) in risky.iter().enumerate() {
        notes.set(i, 0, s(t));
    }
    st.push(notes);
    let b = check_kept("injection", &xlsx(&st));
    for name in ["Pipes", "Notes"] {
        let fs = &b.formulas[name];
        let values: HashMap<_, _> = b.values[name].iter().cloned().collect();
        let positions: Vec<(u32, u32)> = if name == "Pipes" {
            (0..risky.len()).map(|i| (1, 6 + i as u32)).collect()
        } else {
            (0..risky.len()).map(|i| (i as u32, 0)).collect()
        };
        for (pos, t) in positions.iter().zip(risky) {
            assert!(
                !fs.iter().any(|(p, _)| p == pos),
                "{name} {pos:?}: text {t:?} became a formula"
            );
            assert_eq!(
                values.get(pos),
                Some(&Data::String(t.to_string())),
                "{name} {pos:?}"
            );
        }
    }
}

#[test]
fn every_fixture_workbook_keeps_every_cell() {
    // Workbooks directly in each fixtures/ folder; sub-folders hold parts of multi-file inputs,
    // which are not whole stations on their own.
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("fixtures");
    let mut found = Vec::new();
    for d in std::fs::read_dir(&dir)
        .into_iter()
        .flatten()
        .flatten()
        .map(|e| e.path())
        .filter(|p| p.is_dir())
    {
        for p in std::fs::read_dir(&d)
            .into_iter()
            .flatten()
            .flatten()
            .map(|e| e.path())
        {
            if p.is_file() && p.extension().is_some_and(|x| x == "xlsx") {
                found.push(p);
            }
        }
    }
    found.sort();
    assert!(
        !found.is_empty(),
        "no fixture workbooks found under fixtures/"
    );
    for p in &found {
        let bytes = std::fs::read(p).unwrap();
        // A fixture that needs a header map has it beside it as NAME.map.toml.
        let map = p.with_extension("map.toml");
        let extra: Vec<&OsStr> = if map.is_file() {
            vec![OsStr::new("--map"), map.as_os_str()]
        } else {
            Vec::new()
        };
        check_kept_with(&p.display().to_string(), &bytes, &extra);
    }
}

/// The demo station read from its own folder.
fn demo_input(name: &str) -> lossledger::ingest::Input {
    let path = temp_dir(name).join("demo.xlsx");
    std::fs::write(&path, lossledger::demo::input_workbook().unwrap()).unwrap();
    let sources = [lossledger::ingest::InputSource::Path(path)];
    lossledger::ingest::read_inputs(&sources, &Default::default()).expect("demo reads")
}

/// Releasing the parsed fitting rows before writing (as `lossledger audit` does, to save memory)
/// loses none of their assumed values: every one is still listed, with its line, in order.
#[test]
fn releasing_fitting_rows_keeps_every_assumed_value() {
    let mut input = demo_input("release-rows");
    let listed = |input: &lossledger::ingest::Input| -> Vec<(String, String, String)> {
        input
            .assumed()
            .map(|(l, a)| (l.to_string(), a.cell.to_string(), a.what.to_string()))
            .collect()
    };
    let before = listed(&input);
    assert!(
        input.fittings.iter().any(|f| !f.assumed.is_empty()),
        "the demo assumes nothing on its fittings: the test would prove nothing"
    );
    input.release_fitting_rows();
    assert!(input.fittings.is_empty());
    assert_eq!(listed(&input), before);
}

/// Freeing the fitting rows during the audit, once the fittings are placed and checked (what
/// `lossledger audit` does), leaves the audit as it is: the same JSON, and the same fittings,
/// findings and systems down to the fields the JSON leaves out.
#[test]
fn releasing_rows_during_the_audit_changes_nothing_in_it() {
    let mut input = demo_input("release-during");
    let rules = lossledger::audit::Rules::default();
    let kept = lossledger::audit::run(&input, &rules).expect("demo audits");
    let released = lossledger::audit::run_releasing_rows(&mut input, &rules).expect("audits");
    assert!(input.fittings.is_empty(), "the rows were not released");
    let json = |a| lossledger::report::json::to_string(&input, a).unwrap();
    assert_eq!(json(&kept), json(&released));
    let all =
        |a: &lossledger::audit::Audit| format!("{:?} {:?} {:?}", a.fittings, a.findings, a.systems);
    assert_eq!(all(&kept), all(&released));
}

/// On a huge register the notes on one sheet stop at `MAX_NOTES_PER_SHEET` (2,000: each note
/// costs the writer memory until the save), while every finding is still listed in Findings.
#[test]
fn notes_stop_at_the_cap_and_findings_keep_every_item() {
    const ITEMS: usize = 2_100;
    const { assert!(ITEMS > lossledger::report::workbook::MAX_NOTES_PER_SHEET) };
    let mut station = base_station();
    let fittings = sheet(&mut station, "Fittings");
    for i in 0..ITEMS {
        // A globe valve's K on DN100 (about 15 by Darby 3-K) is above the default limit of 5.
        let row = vec![s(&format!("G{i}")), s("L1"), s("valve-globe"), s("DN100")];
        fittings.rows.push(row);
    }
    let dir = temp_dir("notes-cap");
    let input = dir.join("many.xlsx");
    std::fs::write(&input, xlsx(&station)).unwrap();
    let out = dir.join("many.audit.xlsx");
    let ran = run(&[
        OsStr::new("audit"),
        input.as_os_str(),
        OsStr::new("-o"),
        out.as_os_str(),
    ]);
    assert_eq!(ran.code, Some(0), "{}", ran.stderr);
    let mut zip = zip::ZipArchive::new(std::fs::File::open(&out).unwrap()).unwrap();
    let mut notes_per_part = Vec::new();
    let mut findings_listed = 0;
    for i in 0..zip.len() {
        let mut part = zip.by_index(i).unwrap();
        let name = part.name().unwrap().to_string();
        let mut text = String::new();
        std::io::Read::read_to_string(&mut part, &mut text).unwrap();
        if name.starts_with("xl/comments") {
            notes_per_part.push(text.matches("<comment ").count());
        }
        if name.starts_with("xl/worksheets/sheet") {
            findings_listed = findings_listed.max(text.matches(">high-loss-fitting<").count());
        }
    }
    let capped = lossledger::report::workbook::MAX_NOTES_PER_SHEET;
    assert_eq!(
        notes_per_part.iter().max(),
        Some(&capped),
        "{notes_per_part:?}"
    );
    assert!(
        findings_listed >= ITEMS,
        "Findings lists {findings_listed} of {ITEMS}"
    );
}
