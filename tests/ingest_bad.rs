//! Bad input: each problem class exits 2, names the cell and gives a hint, and writes nothing;
//! warnings (defaults, skipped rows) never block the audit. Runs the built binary.

mod common;

use common::book::{Cell, Sheet, n, s, xlsx};
use common::dirs::{entries, temp_dir};
use std::path::Path;

/// A workbook with a Lines sheet (line BX-1 at 30 m³/h) and a Pipes sheet of one row.
fn book(path: &Path, pipe_headers: &[&str], pipe_row: &[Cell]) {
    let sheets = [
        Sheet::table(
            "Lines",
            &["Line", "Flow [m3/h]"],
            vec![vec![s("BX-1"), n(30.0)]],
        ),
        Sheet::table("Pipes", pipe_headers, vec![pipe_row.to_vec()]),
    ];
    std::fs::write(path, xlsx(&sheets)).unwrap();
}

/// Run the binary: its exit code (-1 when killed) and standard error then output.
fn run(args: &[&std::ffi::OsStr]) -> (i32, String) {
    let out = common::bin::run(args);
    (out.code.unwrap_or(-1), out.both())
}

const H: &[&str] = &["Line", "Size", "Material", "Length [m]"];

#[test]
fn each_problem_class_exits_2_with_cell_and_hint_and_writes_nothing() {
    let cases: Vec<(&str, Vec<&str>, Vec<Cell>, &str)> = vec![
        (
            "bare_size",
            H.to_vec(),
            vec![s("BX-1"), s("100"), s("carbon steel"), n(10.0)],
            "Pipes!B2",
        ),
        (
            "unknown_material",
            H.to_vec(),
            vec![s("BX-1"), s("DN100"), s("unobtainium"), n(10.0)],
            "Pipes!C2",
        ),
        (
            "date_in_number",
            H.to_vec(),
            vec![
                s("BX-1"),
                s("DN100"),
                s("carbon steel"),
                Cell::D("2024-03-01"),
            ],
            "Pipes!D2",
        ),
        (
            "text_not_number",
            H.to_vec(),
            vec![s("BX-1"), s("DN100"), s("carbon steel"), s("tbc")],
            "Pipes!D2",
        ),
        (
            "bad_header_unit",
            vec!["Line", "Size", "Material", "Length [furlong]"],
            vec![s("BX-1"), s("DN100"), s("carbon steel"), n(10.0)],
            "Pipes!D2",
        ),
        (
            "missing_length",
            vec!["Line", "Size", "Material"],
            vec![s("BX-1"), s("DN100"), s("carbon steel")],
            "Pipes!A1",
        ),
        (
            "no_flow",
            H.to_vec(),
            vec![s("BX-2"), s("DN100"), s("carbon steel"), n(10.0)],
            "Pipes!A2",
        ),
        (
            "bad_size",
            H.to_vec(),
            vec![s("BX-1"), s("DN 10x"), s("carbon steel"), n(10.0)],
            "Pipes!B2",
        ),
    ];
    for (name, headers, row, cell) in cases {
        let d = temp_dir(name);
        let input = d.join("in.xlsx");
        book(&input, &headers, &row);
        for sub in ["audit", "check"] {
            let (code, text) = run(&[sub.as_ref(), input.as_os_str()]);
            assert_eq!(code, 2, "{name} {sub}: {text}");
            assert!(
                text.contains(cell),
                "{name} {sub}: expected {cell} in\n{text}"
            );
            assert!(text.contains("hint:"), "{name} {sub}: no hint in\n{text}");
        }
        let written = entries(&d);
        assert_eq!(written.len(), 1, "{name}: wrote {written:?}");
    }
}

#[test]
fn bad_map_file_exits_2() {
    let d = temp_dir("bad_map");
    let input = d.join("in.xlsx");
    book(
        &input,
        H,
        &[s("BX-1"), s("DN100"), s("carbon steel"), n(10.0)],
    );
    let map = d.join("map.toml");
    std::fs::write(&map, "[pipes]\n\"Run\" = \"lenght\"\n").unwrap();
    let (code, text) = run(&[
        "audit".as_ref(),
        input.as_os_str(),
        "--map".as_ref(),
        map.as_os_str(),
    ]);
    assert_eq!(code, 2, "{text}");
    assert!(
        text.contains("lenght") && text.contains("columns:"),
        "{text}"
    );
    assert!(!d.join("in.audit.xlsx").exists());
}

#[test]
fn warnings_never_block_the_audit() {
    let d = temp_dir("warnings");
    let input = d.join("in.xlsx");
    // Blank material (assumed), a totals row below the data (skipped).
    let pipes = Sheet::table(
        "Pipes",
        &["Line", "Size", "Material", "Length [m]", "Flow [m3/h]"],
        vec![
            vec![s("BW-1"), s("DN80"), Cell::E, n(12.0), n(20.0)],
            vec![s("Total"), Cell::E, Cell::E, n(12.0)],
        ],
    );
    std::fs::write(&input, xlsx(&[pipes])).unwrap();
    let (code, text) = run(&["check".as_ref(), input.as_os_str()]);
    assert_eq!(code, 0, "{text}");
    assert!(
        text.contains("row skipped") && text.contains("material carbon steel"),
        "{text}"
    );
    let (code, text) = run(&[
        "audit".as_ref(),
        input.as_os_str(),
        "--units".as_ref(),
        "us".as_ref(),
    ]);
    assert_eq!(code, 0, "{text}");
    // Console headers carry their units on a second header line.
    assert!(
        text.lines()
            .any(|l| l.contains("US gpm") && l.contains("ft") && l.contains("ft/s")),
        "{text}"
    );
    assert!(d.join("in.audit.xlsx").exists());
}
