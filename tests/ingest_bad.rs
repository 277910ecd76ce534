//! Bad input: each problem class exits 2, names the cell and gives a hint, and writes nothing;
//! warnings (defaults, skipped rows) never block the audit. Runs the built binary.

use rust_xlsxwriter::{ExcelDateTime, Format, Workbook};
use std::path::{Path, PathBuf};
use std::process::Command;

fn tmp(name: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!(
        "lossledger-ingest-bad-{}-{name}",
        std::process::id()
    ));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).expect("temp dir");
    d
}

/// A workbook with a Lines and a Pipes sheet; `pipe_cells` overrides cells of the first data row.
fn book(path: &Path, pipe_headers: &[&str], pipe_row: &[Cell]) {
    let mut wb = Workbook::new();
    let ws = wb.add_worksheet();
    ws.set_name("Lines").unwrap();
    for (c, h) in ["Line", "Flow [m3/h]"].iter().enumerate() {
        ws.write_string(0, c as u16, *h).unwrap();
    }
    ws.write_string(1, 0, "BX-1").unwrap();
    ws.write_number(1, 1, 30.0).unwrap();
    let ws = wb.add_worksheet();
    ws.set_name("Pipes").unwrap();
    for (c, h) in pipe_headers.iter().enumerate() {
        ws.write_string(0, c as u16, *h).unwrap();
    }
    for (c, v) in pipe_row.iter().enumerate() {
        let c = c as u16;
        match v {
            Cell::S(s) => {
                ws.write_string(1, c, *s).unwrap();
            }
            Cell::N(x) => {
                ws.write_number(1, c, *x).unwrap();
            }
            Cell::Date => {
                let d = ExcelDateTime::from_ymd(2024, 3, 1).unwrap();
                ws.write_datetime_with_format(
                    1,
                    c,
                    &d,
                    &Format::new().set_num_format("yyyy-mm-dd"),
                )
                .unwrap();
            }
        }
    }
    wb.save(path).unwrap();
}

enum Cell {
    S(&'static str),
    N(f64),
    Date,
}

fn run(args: &[&std::ffi::OsStr]) -> (i32, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_lossledger"))
        .args(args)
        .output()
        .expect("runs");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stderr).into_owned() + &String::from_utf8_lossy(&out.stdout),
    )
}

const H: &[&str] = &["Line", "Size", "Material", "Length [m]"];

#[test]
fn each_problem_class_exits_2_with_cell_and_hint_and_writes_nothing() {
    use Cell::{Date, N, S};
    let cases: Vec<(&str, Vec<&str>, Vec<Cell>, &str)> = vec![
        (
            "bare_size",
            H.to_vec(),
            vec![S("BX-1"), S("100"), S("carbon steel"), N(10.0)],
            "Pipes!B2",
        ),
        (
            "unknown_material",
            H.to_vec(),
            vec![S("BX-1"), S("DN100"), S("unobtainium"), N(10.0)],
            "Pipes!C2",
        ),
        (
            "date_in_number",
            H.to_vec(),
            vec![S("BX-1"), S("DN100"), S("carbon steel"), Date],
            "Pipes!D2",
        ),
        (
            "text_not_number",
            H.to_vec(),
            vec![S("BX-1"), S("DN100"), S("carbon steel"), S("tbc")],
            "Pipes!D2",
        ),
        (
            "bad_header_unit",
            vec!["Line", "Size", "Material", "Length [furlong]"],
            vec![S("BX-1"), S("DN100"), S("carbon steel"), N(10.0)],
            "Pipes!D2",
        ),
        (
            "missing_length",
            vec!["Line", "Size", "Material"],
            vec![S("BX-1"), S("DN100"), S("carbon steel")],
            "Pipes!A1",
        ),
        (
            "no_flow",
            H.to_vec(),
            vec![S("BX-2"), S("DN100"), S("carbon steel"), N(10.0)],
            "Pipes!A2",
        ),
        (
            "bad_size",
            H.to_vec(),
            vec![S("BX-1"), S("DN 10x"), S("carbon steel"), N(10.0)],
            "Pipes!B2",
        ),
    ];
    for (name, headers, row, cell) in cases {
        let d = tmp(name);
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
        let written: Vec<_> = std::fs::read_dir(&d)
            .unwrap()
            .filter_map(Result::ok)
            .map(|e| e.file_name())
            .collect();
        assert_eq!(written.len(), 1, "{name}: wrote {written:?}");
    }
}

#[test]
fn bad_map_file_exits_2() {
    let d = tmp("bad_map");
    let input = d.join("in.xlsx");
    book(
        &input,
        H,
        &[
            Cell::S("BX-1"),
            Cell::S("DN100"),
            Cell::S("carbon steel"),
            Cell::N(10.0),
        ],
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
    let d = tmp("warnings");
    let input = d.join("in.xlsx");
    // Blank material (assumed), a totals row below the data (skipped).
    let mut wb = Workbook::new();
    let ws = wb.add_worksheet();
    ws.set_name("Pipes").unwrap();
    for (c, h) in ["Line", "Size", "Material", "Length [m]", "Flow [m3/h]"]
        .iter()
        .enumerate()
    {
        ws.write_string(0, c as u16, *h).unwrap();
    }
    ws.write_string(1, 0, "BW-1").unwrap();
    ws.write_string(1, 1, "DN80").unwrap();
    ws.write_number(1, 3, 12.0).unwrap();
    ws.write_number(1, 4, 20.0).unwrap();
    ws.write_string(2, 0, "Total").unwrap();
    ws.write_number(2, 3, 12.0).unwrap();
    wb.save(&input).unwrap();
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
