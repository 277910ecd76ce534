//! Bad-input corpus, generated in code and run through the built binary, one named test per case.
//!
//! Each case is an input file (raw bytes or a workbook built with rust_xlsxwriter) and what must
//! happen: either the run is refused (exit 2, the message names the file and, where there is one,
//! the cell, and no output of any kind is left in the folder), or the run completes with a named
//! finding and no infinite or NaN figure anywhere in the outputs. No case may panic.

mod common;

use common::archive::{padded, zip};
use common::bin::{Ran, run};
use common::book::{Cell, Sheet, n, s, sheet, xlsx};
use common::dirs::{entries, temp_dir};
use common::readback::read_cells;
use common::stations::{base_station, list_station};
use std::ffi::OsStr;

/// What a case must do.
enum Expect {
    /// Exit 2, stderr names the file, the cell (when given) and contains the text, and not the
    /// text of an error that only follows from it (when given); nothing written.
    Refused {
        cell: Option<&'static str>,
        says: &'static str,
        never: Option<&'static str>,
    },
    /// Exit 0, the finding code is raised (when given), the JSON holds the text (when given), and
    /// the outputs have no inf/NaN.
    Finding {
        code: Option<&'static str>,
        holds: Option<String>,
    },
}

struct Case {
    /// File name to write the input under (extension matters).
    file: &'static str,
    bytes: Vec<u8>,
    expect: Expect,
    /// Extra arguments for `lossledger audit` (the reading limits).
    args: Vec<&'static str>,
}

impl Case {
    /// The same case run with extra arguments.
    fn with_args(mut self, args: &[&'static str]) -> Case {
        self.args = args.to_vec();
        self
    }
}

fn refused(bytes: Vec<u8>, cell: Option<&'static str>, says: &'static str) -> Case {
    Case {
        file: "station.xlsx",
        bytes,
        expect: Expect::Refused {
            cell,
            says,
            never: None,
        },
        args: Vec::new(),
    }
}

/// Refused with one error, whose follow-on errors (`never`) are folded into it, not repeated.
fn refused_once(
    bytes: Vec<u8>,
    cell: &'static str,
    says: &'static str,
    never: &'static str,
) -> Case {
    Case {
        expect: Expect::Refused {
            cell: Some(cell),
            says,
            never: Some(never),
        },
        ..refused(bytes, None, says)
    }
}

fn finding(bytes: Vec<u8>, code: &'static str) -> Case {
    Case {
        file: "station.xlsx",
        bytes,
        expect: Expect::Finding {
            code: Some(code),
            holds: None,
        },
        args: Vec::new(),
    }
}

/// Legal but odd content: the run completes and the JSON holds `holds` (JSON-escaped).
fn completes(bytes: Vec<u8>, code: Option<&'static str>, holds: &str) -> Case {
    let holds = serde_json::to_string(holds).expect("json string");
    Case {
        file: "station.xlsx",
        bytes,
        expect: Expect::Finding {
            code,
            holds: Some(holds.trim_matches('"').to_string()),
        },
        args: Vec::new(),
    }
}

/// The base station with one cell changed.
fn with(sheet_name: &str, row: usize, col: usize, cell: Cell) -> Vec<u8> {
    let mut st = base_station();
    sheet(&mut st, sheet_name).set(row, col, cell);
    xlsx(&st)
}

/// The base station with several cells changed.
fn with_all(changes: &[(&str, usize, usize, Cell)]) -> Vec<u8> {
    let mut st = base_station();
    for (name, r, c, cell) in changes {
        sheet(&mut st, name).set(*r, *c, cell.clone());
    }
    xlsx(&st)
}

/// The mixed-list station with some cells of its `BoQ` sheet changed.
fn list_with(changes: &[(usize, usize, Cell)]) -> Vec<u8> {
    let mut st = list_station();
    for (r, c, cell) in changes {
        sheet(&mut st, "BoQ").set(*r, *c, cell.clone());
    }
    xlsx(&st)
}

/// The mixed-list station with its Line column emptied and a heading row naming `line` put
/// above the rows.
fn list_with_heading(line: &str) -> Vec<u8> {
    let mut st = list_station();
    let boq = sheet(&mut st, "BoQ");
    for r in 1..4 {
        boq.set(r, 1, Cell::E);
    }
    boq.rows.insert(1, vec![s(line)]);
    xlsx(&st)
}

fn without_sheet(name: &str) -> Vec<Sheet> {
    base_station()
        .into_iter()
        .filter(|s| s.name != name)
        .collect()
}

fn ods_bytes() -> Vec<u8> {
    let content = br#"<?xml version="1.0" encoding="UTF-8"?>
<office:document-content xmlns:office="urn:oasis:names:tc:opendocument:xmlns:office:1.0" xmlns:table="urn:oasis:names:tc:opendocument:xmlns:table:1.0" xmlns:text="urn:oasis:names:tc:opendocument:xmlns:text:1.0" office:version="1.2"><office:body><office:spreadsheet><table:table table:name="Pipes"><table:table-row><table:table-cell office:value-type="string"><text:p>Line</text:p></table:table-cell></table:table-row></table:table></office:spreadsheet></office:body></office:document-content>"#;
    let manifest = br#"<?xml version="1.0" encoding="UTF-8"?><manifest:manifest xmlns:manifest="urn:oasis:names:tc:opendocument:xmlns:manifest:1.0"><manifest:file-entry manifest:full-path="/" manifest:media-type="application/vnd.oasis.opendocument.spreadsheet"/><manifest:file-entry manifest:full-path="content.xml" manifest:media-type="text/xml"/></manifest:manifest>"#;
    zip(&[
        (
            "mimetype",
            b"application/vnd.oasis.opendocument.spreadsheet",
        ),
        ("content.xml", content),
        ("META-INF/manifest.xml", manifest),
    ])
}

/// An OLE2 compound file header (the container of .xls and of password-protected .xlsx), followed
/// by the stream names an encrypted workbook carries. Header layout per [MS-CFB] 2.2.
fn compound_file(streams: &[&str]) -> Vec<u8> {
    let mut b = vec![0xD0, 0xCF, 0x11, 0xE0, 0xA1, 0xB1, 0x1A, 0xE1];
    b.extend_from_slice(&[0u8; 16]);
    b.extend_from_slice(&[0x3E, 0x00, 0x03, 0x00, 0xFE, 0xFF, 0x09, 0x00]);
    b.resize(512, 0xFF);
    for name in streams {
        for u in name.encode_utf16() {
            b.extend_from_slice(&u.to_le_bytes());
        }
        b.resize(b.len() + 64, 0);
    }
    b.resize(4096, 0);
    b
}

/// The valid base station as bytes.
fn valid() -> Vec<u8> {
    xlsx(&base_station())
}

/// The first `keep(len)` bytes of `bytes`.
fn truncated(mut bytes: Vec<u8>, keep: impl Fn(usize) -> usize) -> Vec<u8> {
    bytes.truncate(keep(bytes.len()));
    bytes
}

/// An id of the longest text a cell holds (32,767 characters).
fn long_id() -> String {
    "L".repeat(32_767)
}

/// One `#[test]` per case, named by the case, and the list of names.
macro_rules! cases {
    ($($name:ident: $case:expr;)*) => {
        $(
            #[test]
            fn $name() {
                check(stringify!($name), &$case);
            }
        )*
        /// Every case's name.
        const CASES: &[&str] = &[$(stringify!($name)),*];
    };
}

cases! {
    // --- the file is not a readable workbook ---
    not_a_zip: refused(
        b"Line,Seq,Size\nL1,1,DN100\n".to_vec(),
        None,
        "cannot read",
    );
    empty_file: refused(Vec::new(), None, "cannot read");
    truncated_zip_half: refused(
        truncated(valid(), |n| n / 2),
        None,
        "cannot read",
    );
    truncated_zip_100_bytes: refused(
        truncated(valid(), |_| 100),
        None,
        "cannot read",
    );
    zip_not_a_workbook: refused(
        zip(&[("readme.txt", b"hello")]),
        None,
        "cannot read",
    );
    zip_with_garbage_workbook_xml: refused(
        zip(&[
            ("[Content_Types].xml", b"<Types/>"),
            (
                "xl/workbook.xml",
                b"<workbook><sheets><sheet name=\"Pipes\" r:id=\"rId1\"",
            ),
        ]),
        None,
        "cannot read",
    );
    xls_given_as_xlsx: refused(
        compound_file(&["Workbook"]),
        None,
        "cannot read",
    );
    ods_given_as_xlsx: refused(ods_bytes(), None, "cannot read");
    garbage_named_ods: Case {
        file: "station.ods",
        bytes: zip(&[(
            "mimetype",
            b"application/vnd.oasis.opendocument.spreadsheet",
        )]),
        expect: Expect::Refused {
            cell: None,
            says: "cannot read",
            never: None,
        },
        args: Vec::new(),
    };
    password_protected: refused(
        compound_file(&["EncryptionInfo", "EncryptedPackage"]),
        None,
        "cannot read",
    );
    // Found by fuzzing (fuzz/ ingest_bytes): calamine overflowed on an absurd cell reference.
    fuzz_calamine_ref_overflow: refused(
        include_bytes!("bad/fuzz-calamine-ref-overflow.xlsx").to_vec(),
        None,
        "cannot read",
    );
    random_bytes: refused(
        (0..5000u32)
            .map(|i| (i.wrapping_mul(2_654_435_761) >> 13) as u8)
            .collect(),
        None,
        "cannot read",
    );
    // .ods and .xls are read (through calamine): an .ods whose Pipes sheet has no header is
    // refused at its cell, an .xls container with no workbook stream cannot be read.
    ods_extension: Case {
        file: "station.ods",
        bytes: ods_bytes(),
        expect: Expect::Refused {
            cell: Some("Pipes!A1"),
            says: "has no header row",
            never: None,
        },
        args: Vec::new(),
    };
    xls_extension: Case {
        file: "station.xls",
        bytes: compound_file(&["Workbook"]),
        expect: Expect::Refused {
            cell: None,
            says: "cannot read",
            never: None,
        },
        args: Vec::new(),
    };
    // --- workbook without usable tables ---
    empty_workbook: refused(
        xlsx(&[Sheet::new("Sheet1", vec![])]),
        None,
        "no Pipes sheet",
    );
    no_pipes_sheet: refused(
        xlsx(&without_sheet("Pipes")),
        None,
        "no Pipes sheet",
    );
    pipes_sheet_without_header: refused(
        xlsx(&[Sheet::new("Pipes", vec![vec![s("hello")], vec![n(1.0)]])]),
        Some("Pipes!A1"),
        "no header row",
    );
    pipes_only_header: refused(
        xlsx(&[Sheet::new(
            "Pipes",
            vec![vec![
                s("Line"),
                s("Size"),
                s("Length [m]"),
                s("Flow [m3/h]"),
            ]],
        )]),
        Some("Pipes!A1"),
        "no pipe runs",
    );
    all_sheets_only_header: refused(
        {
            let mut st = base_station();
            for sh in &mut st {
                sh.rows.truncate(1);
            }
            xlsx(&st)
        },
        Some("Pipes!A1"),
        "no pipe runs",
    );
    required_column_missing: refused(
        with("Pipes", 0, 0, s("Remarks")),
        Some("Pipes!A1"),
        "required column",
    );
    duplicated_header: refused(
        with("Pipes", 0, 6, s("Length [m]")),
        Some("Pipes!G1"),
        "duplicate",
    );
    unknown_unit_in_header: refused(
        with("Pipes", 0, 5, s("Length [furlongs]")),
        Some("Pipes!F2"),
        "not understood",
    );
    // --- bad numbers ---
    every_numeric_column_text: refused(
        with_all(&[
            ("Lines", 1, 2, s("lots")),
            ("Pipes", 1, 1, s("first")),
            ("Pipes", 1, 5, s("long")),
            ("Fittings", 1, 5, s("some")),
        ]),
        Some("Pipes!F2"),
        "long",
    );
    nan_text: refused(
        with("Pipes", 1, 5, s("NaN")),
        Some("Pipes!F2"),
        "Length",
    );
    inf_text: refused(
        with("Pipes", 1, 5, s("inf")),
        Some("Pipes!F2"),
        "Length",
    );
    huge_length_1e308: refused(
        with("Pipes", 1, 5, n(1e308)),
        Some("Pipes!A2"),
        "not a finite",
    );
    // Both fittings of the line fail on the one flow: one error, the second counted in it.
    huge_flow_1e308: refused_once(
        with("Lines", 1, 2, n(1e308)),
        "Fittings!C2",
        "Reynolds number = inf is outside the accepted range finite and >= 0 …and 1 more \
         fitting on line 'L1' fails the same way",
        "Fittings!C3",
    );
    huge_k_1e308: refused(
        with("Fittings", 1, 7, n(1e308)),
        Some("Fittings!C2"),
        "not a finite",
    );
    negative_length: refused(
        with("Pipes", 1, 5, n(-12.0)),
        Some("Pipes!F2"),
        "greater than zero",
    );
    zero_length: refused(
        with("Pipes", 1, 5, n(0.0)),
        Some("Pipes!F2"),
        "greater than zero",
    );
    negative_qty: refused(
        with("Fittings", 1, 5, n(-1.0)),
        Some("Fittings!F2"),
        "greater than zero",
    );
    opening_above_100: refused(
        with("Fittings", 2, 6, n(150.0)),
        Some("Fittings!G3"),
        "above 100",
    );
    negative_k: refused(
        with("Fittings", 1, 7, n(-0.5)),
        Some("Fittings!H2"),
        "zero or more",
    );
    boolean_length: refused(
        with("Pipes", 1, 5, Cell::B(true)),
        Some("Pipes!F2"),
        "TRUE/FALSE",
    );
    date_where_number_belongs: refused(
        with("Pipes", 1, 5, Cell::D("2024-03-01")),
        Some("Pipes!F2"),
        "date",
    );
    div0_formula_length: refused(
        with("Pipes", 1, 5, Cell::F("=1/0".into(), "#DIV/0!".into())),
        Some("Pipes!F2"),
        "#DIV/0!",
    );
    ref_formula_flow: refused(
        with("Lines", 1, 2, Cell::F("=#REF!*2".into(), "#REF!".into())),
        Some("Lines!C2"),
        "#REF!",
    );
    // One bad cell, one message: the run is left out, so its line has no pipe run, and its
    // two fittings are counted in that message instead of raising an error each.
    div0_length_folds_the_line_fittings: refused_once(
        with("Pipes", 1, 5, Cell::F("=1/0".into(), "#DIV/0!".into())),
        "Pipes!F2",
        "…and 2 fittings on line 'L1' are not checked",
        "which has no pipe run",
    );
    ref_flow_is_not_also_blank: refused_once(
        with("Lines", 1, 2, Cell::F("=#REF!*2".into(), "#REF!".into())),
        "Lines!C2",
        "#REF!",
        "has no flow",
    );
    reverse_flow_is_not_also_blank: refused_once(
        with("Lines", 1, 2, n(-50.0)),
        "Lines!C2",
        "reverse (negative) flow",
        "has no flow",
    );
    bad_k_with_blank_item_is_one_error: refused_once(
        with_all(&[
            ("Fittings", 1, 2, Cell::E),
            ("Fittings", 1, 7, Cell::F("=1/0".into(), "#DIV/0!".into())),
        ]),
        "Fittings!H2",
        "#DIV/0!",
        "item is blank",
    );
    // A fitting quantity is a count: the Fittings table follows the mixed lists' rule.
    fitting_qty_fraction: refused(
        with("Fittings", 1, 5, n(1.5)),
        Some("Fittings!F2"),
        "must be a whole number of at least 1, not 1.5",
    );
    fitting_qty_fraction_as_text: refused(
        with("Fittings", 2, 5, s("0.5")),
        Some("Fittings!F3"),
        "must be a whole number of at least 1, not 0.5",
    );
    reverse_flow: refused(
        with("Lines", 1, 2, n(-50.0)),
        Some("Lines!C2"),
        "negative",
    );
    blank_flow: refused(
        with("Lines", 1, 2, s(" ")),
        Some("Lines!C2"),
        "no flow",
    );
    // --- bad text and references ---
    unknown_size: refused(
        with("Pipes", 1, 2, s("DN7")),
        Some("Pipes!C2"),
        "Size",
    );
    bare_number_size: refused(
        with("Pipes", 1, 2, n(100.0)),
        Some("Pipes!C2"),
        "Size",
    );
    unknown_material: refused(
        with("Pipes", 1, 4, s("unobtainium")),
        Some("Pipes!E2"),
        "unobtainium",
    );
    unknown_item: refused(
        with("Fittings", 1, 2, s("flux capacitor")),
        Some("Fittings!C2"),
        "flux capacitor",
    );
    fitting_line_absent_from_pipes: refused(
        with("Fittings", 1, 1, s("L9")),
        Some("Fittings!B2"),
        "L9",
    );
    duplicate_line_id: refused(
        {
            let mut st = base_station();
            sheet(&mut st, "Lines")
                .rows
                .push(vec![s("L1"), s("general"), n(10.0)]);
            xlsx(&st)
        },
        Some("Lines!A3"),
        "listed twice",
    );
    blank_line_id_in_pipes: refused(
        with("Pipes", 1, 0, s("   ")),
        Some("Pipes!A2"),
        "blank",
    );
    water_too_hot: refused(
        with_all(&[
            ("Lines", 0, 3, s("Temperature [°C]")),
            ("Lines", 1, 3, n(150.0)),
        ]),
        Some("Lines!D2"),
        "150",
    );
    // --- odd but legal content: the run completes with a clear finding ---
    zero_flow: finding(with("Lines", 1, 2, n(0.0)), "zero-flow");
    valve_zero_open: finding(
        with("Fittings", 2, 6, n(0.0)),
        "valve-closed",
    );
    reducer_equal_sizes: finding(
        with_all(&[
            ("Fittings", 1, 2, s("reducer")),
            ("Fittings", 1, 4, s("DN100")),
        ]),
        "same-size-reducer",
    );
    // Zero flow too, so a finding message carries the 32,767-character id.
    max_length_ids: completes(
        with_all(&[
            ("Lines", 1, 0, Cell::S(long_id())),
            ("Lines", 1, 2, n(0.0)),
            ("Pipes", 1, 0, Cell::S(long_id())),
            ("Fittings", 1, 1, Cell::S(long_id())),
            ("Fittings", 2, 1, Cell::S(long_id())),
        ]),
        Some("zero-flow"),
        &long_id(),
    );
    control_characters_in_ids: completes(
        with_all(&[
            ("Lines", 1, 0, s(CTRL)),
            ("Lines", 1, 2, n(0.0)),
            ("Pipes", 1, 0, s(CTRL)),
            ("Fittings", 1, 1, s(CTRL)),
            ("Fittings", 2, 1, s(CTRL)),
        ]),
        Some("zero-flow"),
        CTRL,
    );
    right_to_left_ids: completes(
        with_all(&[
            ("Lines", 1, 0, s(RTL)),
            ("Pipes", 1, 0, s(RTL)),
            ("Fittings", 1, 1, s(RTL)),
            ("Fittings", 2, 1, s(RTL)),
            ("Fittings", 1, 0, s("שסתום")),
        ]),
        None,
        RTL,
    );
    // --- mixed item lists: each new error class at its cell ---
    list_neither_run_nor_fitting: refused(
        list_with(&[(2, 2, s("Widget assembly"))]),
        Some("BoQ!C3"),
        "neither a pipe run nor a fitting",
    );
    list_pipe_counted: refused(
        list_with(&[(2, 2, s("Pipe, CS, DN100"))]),
        Some("BoQ!F3"),
        "is a pipe run but is counted in 'No'",
    );
    list_elbow_in_metres: refused(
        list_with(&[(3, 5, s("m"))]),
        Some("BoQ!F4"),
        "is a fitting (elbow-90-long) but is measured in 'm'",
    );
    list_reducer_equal_sizes: refused(
        list_with(&[(2, 2, s("Concentric reducer")), (2, 3, s("100x100"))]),
        Some("BoQ!D3"),
        "its two sizes are equal",
    );
    list_expansion_reversed: refused(
        list_with(&[(2, 2, s("Sudden expansion")), (2, 3, s("DN150xDN100"))]),
        Some("BoQ!D3"),
        "second size must be the larger",
    );
    list_fitting_not_whole: refused(
        list_with(&[(3, 4, n(1.5))]),
        Some("BoQ!E4"),
        "must be a whole number",
    );
    // The run's quantity is bad, so the run is left out: the two fittings of its line are
    // counted in that one error, not reported as "no pipe run" each.
    list_bad_run_folds_the_line_fittings: refused_once(
        list_with(&[(1, 4, s("twenty"))]),
        "BoQ!E2",
        "…and 2 fittings on line 'L1' are not checked",
        "which has no pipe run",
    );
    list_unit_unknown: refused(
        list_with(&[(3, 5, s("kg"))]),
        Some("BoQ!F4"),
        "unit 'kg' is not known",
    );
    list_unit_contradicts_cell: refused(
        list_with(&[(3, 4, s("2 No")), (3, 5, s("m"))]),
        Some("BoQ!E4"),
        "but the Unit column says 'm'",
    );
    list_no_line: refused(
        list_with(&[(1, 1, Cell::E), (2, 1, Cell::E), (3, 1, Cell::E)]),
        Some("BoQ!C2"),
        "no line for this row",
    );
    list_heading_unknown_line: refused(
        list_with_heading("Line ZZ-9"),
        Some("BoQ!A2"),
        "known lines: L1",
    );
    list_blank_description: refused(
        list_with(&[(2, 2, Cell::E)]),
        Some("BoQ!C3"),
        "the description is blank",
    );
    list_quantity_not_a_quantity: refused(
        list_with(&[(1, 4, s("twenty"))]),
        Some("BoQ!E2"),
        "is not a quantity",
    );
    // Item numbers in `Item` and the kind in `Description`: no duplicate-column error.
    fittings_item_numbers_and_description: completes(
        with_all(&[
            ("Fittings", 0, 8, s("Description")),
            ("Fittings", 1, 2, s("1.1")),
            ("Fittings", 2, 2, s("1.2")),
            ("Fittings", 1, 8, s("90 elbow")),
            ("Fittings", 2, 8, s("gate valve")),
        ]),
        None,
        "valve-gate",
    );
    list_heading_known_line: completes(
        list_with_heading("LINE NO: L1"),
        None,
        "L1",
    );
    // --- far cells and large files (sparse and bounded reading) ---
    stray_cells_far_on_every_sheet: completes(far_strays(), None, "L1");
    stray_cell_at_xfd1048576: completes(at_last_cell(), None, "L1");
    // 40 MB of spaces in the Pipes sheet compress about a thousandfold.
    inflated_sheet_part: refused(inflated(), None, "--max-ratio");
    inflated_sheet_part_allowed: completes(inflated(), None, "L1")
        .with_args(&["--max-ratio", "100000"]);
    inflated_sheet_part_over_size_limit: refused(
        inflated(),
        None,
        "--max-unzipped-mb",
    )
    .with_args(&["--max-ratio", "100000", "--max-unzipped-mb", "16"]);
    zip_directory_understates_a_part: refused(
        understated(),
        None,
        "cannot read",
    );
    too_many_cells: refused(valid(), None, "--max-cells")
        .with_args(&["--max-cells", "20"]);
    cells_under_a_raised_limit: completes(valid(), None, "L1")
        .with_args(&["--max-cells", "40"]);
}

#[test]
fn the_corpus_holds_at_least_40_cases() {
    // Names are unique: each is a test function.
    assert!(
        CASES.len() >= 40,
        "the corpus must hold at least 40 cases, has {}",
        CASES.len()
    );
}

/// Rows and columns of a worksheet (the `.xlsx` limits: `XFD1048576` is the last cell).
const LAST_ROW: u32 = 1_048_575;
const LAST_COL: u16 = 16_383;

/// The base station with, on every sheet, a value in the last column of its first data row and a
/// value in the last row.
fn far_strays() -> Vec<u8> {
    let mut st = base_station();
    for (i, sh) in st.iter_mut().enumerate() {
        sh.put(1, LAST_COL, n(100.0 + i as f64));
        sh.put(LAST_ROW, 2, s("stray at the bottom"));
    }
    xlsx(&st)
}

/// The base station with one value at `XFD1048576` of the Pipes sheet.
fn at_last_cell() -> Vec<u8> {
    let mut st = base_station();
    sheet(&mut st, "Pipes").put(LAST_ROW, LAST_COL, n(7.0));
    xlsx(&st)
}

/// The base station with 40 MB of spaces inside the Pipes sheet's XML (sheet2.xml).
fn inflated() -> Vec<u8> {
    padded(
        &xlsx(&base_station()),
        "xl/worksheets/sheet2.xml",
        "<sheetData>",
        40 << 20,
    )
}

/// A stored zip whose central directory says the Pipes sheet is 100 bytes, while it holds more:
/// the reader must stop at the declared size (an unreadable file), not inflate past it.
fn understated() -> Vec<u8> {
    use std::io::Read;
    let good = xlsx(&base_station());
    let mut z = zip::ZipArchive::new(std::io::Cursor::new(&good[..])).expect("zip");
    let mut parts: Vec<(String, Vec<u8>)> = Vec::new();
    for i in 0..z.len() {
        let mut f = z.by_index(i).expect("part");
        let mut data = Vec::new();
        f.read_to_end(&mut data).expect("read");
        parts.push((f.name().expect("part name").to_string(), data));
    }
    let entries: Vec<(&str, &[u8])> = parts
        .iter()
        .map(|(n, d)| (n.as_str(), d.as_slice()))
        .collect();
    let mut bytes = zip(&entries);
    // Central directory header of the sheet: signature PK\x01\x02, uncompressed size at +24
    // (PKWARE APPNOTE 4.3.12), file name at +46.
    let name = b"xl/worksheets/sheet2.xml";
    let at = (0..bytes.len() - 46 - name.len())
        .find(|&i| {
            bytes[i..i + 4] == [0x50, 0x4b, 0x01, 0x02]
                && &bytes[i + 46..i + 46 + name.len()] == name
        })
        .expect("central header of the sheet");
    bytes[at + 24..at + 28].copy_from_slice(&100u32.to_le_bytes());
    bytes
}

/// A line id with control characters (SOH, BEL, tab inside).
const CTRL: &str = "L\u{1}1\u{7}\tx";
/// A line id in Arabic script with a right-to-left override character.
const RTL: &str = "خط-١\u{202E}";

/// Run one case; panics with the case name and what went wrong.
fn check(name: &str, case: &Case) {
    if let Err(e) = outcome(name, case) {
        panic!("[{name}] {e}");
    }
}

/// With `LOSSLEDGER_CORPUS_DIR` set, each case's input and arguments are also written to
/// `DIR/NAME/` (the file, and `args`, one per line), for `scripts/bench.sh corpus` to measure
/// each case's peak memory with the release binary.
fn keep_for_bench(name: &str, case: &Case) -> Result<(), String> {
    let Some(root) = std::env::var_os("LOSSLEDGER_CORPUS_DIR") else {
        return Ok(());
    };
    let dir = std::path::Path::new(&root).join(name);
    std::fs::create_dir_all(&dir).map_err(|e| e.to_string())?;
    std::fs::write(dir.join(case.file), &case.bytes).map_err(|e| e.to_string())?;
    let args: String = case.args.iter().map(|a| format!("{a}\n")).collect();
    std::fs::write(dir.join("args"), args).map_err(|e| e.to_string())
}

fn outcome(name: &str, case: &Case) -> Result<(), String> {
    keep_for_bench(name, case)?;
    let dir = temp_dir(name);
    let input = dir.join(case.file);
    std::fs::write(&input, &case.bytes).map_err(|e| e.to_string())?;
    let json = dir.join("out.json");
    let mut args = vec![
        OsStr::new("audit"),
        input.as_os_str(),
        OsStr::new("--json"),
        json.as_os_str(),
    ];
    args.extend(case.args.iter().map(OsStr::new));
    let Ran {
        code,
        stdout,
        stderr,
    } = run(&args);
    let ctx = || {
        format!(
            "exit {code:?}\n--- stderr ---\n{}\n--- stdout ---\n{}",
            clip(&stderr),
            clip(&stdout)
        )
    };
    if stderr.contains("panicked") || code == Some(3) {
        return Err(format!("panicked or internal error; {}", ctx()));
    }
    if std::fs::read(&input).map_err(|e| e.to_string())? != case.bytes {
        return Err("the input file was changed".into());
    }
    match &case.expect {
        Expect::Refused { cell, says, never } => {
            if code != Some(2) {
                return Err(format!("expected exit 2; {}", ctx()));
            }
            if !stderr.contains(&input.display().to_string()) {
                return Err(format!("message does not name the file; {}", ctx()));
            }
            if let Some(cell) = cell
                && !stderr.contains(cell)
            {
                return Err(format!("message does not name cell {cell}; {}", ctx()));
            }
            if !stderr.to_lowercase().contains(&says.to_lowercase()) {
                return Err(format!("message does not say {says:?}; {}", ctx()));
            }
            if let Some(never) = never
                && stderr.to_lowercase().contains(&never.to_lowercase())
            {
                return Err(format!(
                    "a follow-on error {never:?} is repeated; {}",
                    ctx()
                ));
            }
            let left = entries(&dir);
            if left != [case.file.to_string()] {
                return Err(format!("files left in the folder: {left:?}"));
            }
        }
        Expect::Finding {
            code: finding,
            holds,
        } => {
            if code != Some(0) {
                return Err(format!("expected exit 0; {}", ctx()));
            }
            let text = std::fs::read_to_string(&json).map_err(|e| format!("no JSON: {e}"))?;
            if let Some(finding) = finding
                && !text.contains(&format!("\"code\": \"{finding}\""))
            {
                return Err(format!("finding {finding} not raised; {}", ctx()));
            }
            if let Some(h) = holds
                && !text.contains(h.as_str())
            {
                return Err("the JSON does not hold the id as written".into());
            }
            let doc: serde_json::Value = serde_json::from_str(&text).map_err(|e| e.to_string())?;
            if let Some(p) = non_finite(&doc, "$", baseline_nulls()) {
                return Err(format!("JSON has a missing (non-finite) number at {p}"));
            }
            let out = dir.join("station.audit.xlsx");
            check_workbook_finite(&out)?;
        }
    }
    let _ = std::fs::remove_dir_all(&dir);
    Ok(())
}

fn clip(s: &str) -> String {
    s.chars().take(1500).collect()
}

/// serde_json writes NaN and infinities as `null`, as it writes a value that is absent by
/// contract. A null is accepted only under a key that is also null in the audit of the valid base
/// station (an optional field); any other null means a non-finite figure escaped.
fn non_finite(
    v: &serde_json::Value,
    path: &str,
    optional: &std::collections::HashSet<String>,
) -> Option<String> {
    match v {
        serde_json::Value::Object(m) => m.iter().find_map(|(k, x)| {
            if x.is_null() && !optional.contains(k) {
                Some(format!("{path}.{k}"))
            } else {
                non_finite(x, &format!("{path}.{k}"), optional)
            }
        }),
        serde_json::Value::Array(a) => a
            .iter()
            .enumerate()
            .find_map(|(i, x)| non_finite(x, &format!("{path}[{i}]"), optional)),
        _ => None,
    }
}

fn null_keys(v: &serde_json::Value, out: &mut std::collections::HashSet<String>) {
    match v {
        serde_json::Value::Object(m) => {
            for (k, x) in m {
                if x.is_null() {
                    out.insert(k.clone());
                }
                null_keys(x, out);
            }
        }
        serde_json::Value::Array(a) => a.iter().for_each(|x| null_keys(x, out)),
        _ => {}
    }
}

/// Keys that are null in the JSON of the valid base station.
fn baseline_nulls() -> &'static std::collections::HashSet<String> {
    static NULLS: std::sync::OnceLock<std::collections::HashSet<String>> =
        std::sync::OnceLock::new();
    NULLS.get_or_init(|| {
        let dir = temp_dir("baseline");
        let input = dir.join("base.xlsx");
        std::fs::write(&input, xlsx(&base_station())).expect("write base");
        let json = dir.join("base.json");
        let out = run(&[
            OsStr::new("audit"),
            input.as_os_str(),
            OsStr::new("--json"),
            json.as_os_str(),
        ]);
        assert_eq!(out.code, Some(0), "base station must audit: {}", out.stderr);
        let doc: serde_json::Value =
            serde_json::from_str(&std::fs::read_to_string(&json).expect("json")).expect("parse");
        // Finding fields that are optional by contract (a finding need not name a line or tag).
        let mut keys: std::collections::HashSet<String> =
            ["line", "tag", "cell"].map(String::from).into();
        null_keys(&doc, &mut keys);
        let _ = std::fs::remove_dir_all(&dir);
        keys
    })
}

fn check_workbook_finite(path: &std::path::Path) -> Result<(), String> {
    use calamine::Data;
    // Read cell by cell: a copy keeping a stray value at XFD1048576 is no dense range.
    for (name, cells) in read_cells(path) {
        for (&(r, c), d) in &cells {
            let bad = match d {
                Data::Float(x) => !x.is_finite(),
                Data::String(t) => {
                    matches!(t.trim().to_lowercase().as_str(), "inf" | "-inf" | "nan")
                }
                _ => false,
            };
            if bad {
                return Err(format!("annotated copy {name} row {r} col {c} holds {d:?}"));
            }
        }
    }
    Ok(())
}

#[test]
fn missing_input_and_directory_input_are_refused() {
    let dir = temp_dir("missing");
    let missing = dir.join("nope.xlsx");
    let out = run(&[OsStr::new("audit"), missing.as_os_str()]);
    assert_eq!(out.code, Some(2));
    let err = &out.stderr;
    assert!(
        err.contains("nope.xlsx") && !err.contains("panicked"),
        "{err}"
    );
    let sub = dir.join("folder.xlsx");
    std::fs::create_dir(&sub).unwrap();
    let out = run(&[OsStr::new("audit"), sub.as_os_str()]);
    assert_eq!(out.code, Some(2));
    let err = &out.stderr;
    assert!(
        err.contains("folder.xlsx") && !err.contains("panicked"),
        "{err}"
    );
    assert_eq!(entries(&dir), ["folder.xlsx"]);
}

/// Every reason a mixed-list row is skipped or left out, through the binary: `check` lists each
/// with its cell and exits 0 (they are warnings), and the audit still runs.
#[test]
fn list_rows_skipped_with_their_reasons() {
    let mut st = list_station();
    let boq = sheet(&mut st, "BoQ");
    boq.set(0, 6, s("Status"));
    let rows: [(&str, &str, &str, &str); 8] = [
        ("To collection", "", "", ""),
        ("Provisional sum for testing", "1", "Sum", ""),
        ("Extra over for excavation in rock", "3", "m", ""),
        ("PUMP, CENTRIFUGAL, DN100", "1", "No", ""),
        ("Pipe supports", "4", "No", ""),
        ("Gate valve DN100", "1", "No", "Removed"),
        ("Valves and pipework", "", "", ""),
        ("Allow for flushing", "1", "Item", ""),
    ];
    for (i, (text, qty, unit, status)) in rows.iter().enumerate() {
        let r = 4 + i;
        boq.set(r, 1, if qty.is_empty() { Cell::E } else { s("L1") });
        boq.set(r, 2, s(text));
        if !qty.is_empty() {
            boq.set(r, 4, n(qty.parse().unwrap_or(1.0)));
            boq.set(r, 5, s(unit));
        }
        if !status.is_empty() {
            boq.set(r, 6, s(status));
        }
    }
    boq.set(13, 0, s("Note: rates exclude VAT"));
    let dir = temp_dir("list-skips");
    let input = dir.join("station.xlsx");
    std::fs::write(&input, xlsx(&st)).expect("write");
    let out = run(&[OsStr::new("check"), input.as_os_str()]);
    let stdout = &out.stdout;
    assert_eq!(out.code, Some(0), "{stdout}\n{}", out.stderr);
    for want in [
        "BoQ!C5: a totals or carried row ('To collection')",
        "BoQ!A6: preliminaries or an allowance (unit 'Sum')",
        "BoQ!A7: extra over: adds cost to an item measured elsewhere",
        "BoQ!A8: not in the flow path: a pump",
        "BoQ!A9: not in the flow path: a pipe support",
        "BoQ!A10: status 'Removed': not in the flow path",
        "BoQ!C11: a heading or note with no quantity ('Valves and pipework')",
        "BoQ!A12: preliminaries or an allowance (unit 'Item')",
        "BoQ!A14: a note ('Note: rates exclude VAT')",
        "BoQ!C3: fitting valve-gate on L1",
        "BoQ!C2: run on L1",
    ] {
        assert!(
            stdout.contains(want),
            "check does not list {want:?}:\n{stdout}"
        );
    }
    let audit = run(&[OsStr::new("audit"), input.as_os_str()]);
    assert_eq!(audit.code, Some(0), "{}", audit.stderr);
    let _ = std::fs::remove_dir_all(&dir);
}

/// A value far from every table (the last column of a data row, the last row, `XFD1048576`) is
/// read sparsely: the audit completes, the annotated copy holds each stray value at its place,
/// the run reports it as outside every table, and the computed columns stay beside their table.
#[test]
fn far_stray_cells_are_kept_and_reported() {
    let dir = temp_dir("far-strays");
    let input = dir.join("station.xlsx");
    let mut st = base_station();
    for (i, sh) in st.iter_mut().enumerate() {
        sh.put(1, LAST_COL, n(100.0 + i as f64));
        sh.put(LAST_ROW, 2, s("stray at the bottom"));
    }
    sheet(&mut st, "Pipes").put(LAST_ROW, LAST_COL, n(7.0));
    std::fs::write(&input, xlsx(&st)).expect("write");
    let out = dir.join("out.xlsx");
    let res = run(&[
        OsStr::new("audit"),
        input.as_os_str(),
        OsStr::new("-o"),
        out.as_os_str(),
    ]);
    let stderr = &res.stderr;
    assert_eq!(res.code, Some(0), "{stderr}");
    for name in ["Lines", "Pipes", "Fittings"] {
        // One line per sheet, naming its first stray cell (the last column of row 2).
        assert!(
            stderr.contains(&format!("{name}!XFD2: ")) && stderr.contains("outside every table"),
            "{name}: {stderr}"
        );
    }
    assert!(stderr.contains("Pipes!XFD1048576"), "{stderr}");
    let copy = read_cells(&out);
    for (i, name) in ["Lines", "Pipes", "Fittings"].iter().enumerate() {
        let cells = &copy[*name];
        assert_eq!(
            cells.get(&(1, u32::from(LAST_COL))),
            Some(&calamine::Data::Float(100.0 + i as f64)),
            "{name}: the value in the last column is kept"
        );
        assert_eq!(
            cells.get(&(LAST_ROW, 2)),
            Some(&calamine::Data::String("stray at the bottom".into())),
            "{name}: the value in the last row is kept"
        );
    }
    assert_eq!(
        copy["Pipes"].get(&(LAST_ROW, u32::from(LAST_COL))),
        Some(&calamine::Data::Float(7.0))
    );
    // Pipes holds columns A–F: the computed columns start at H, one free column after the table
    // (docs/workbook.md), not beyond the stray value in column XFD.
    assert_eq!(
        copy["Pipes"].get(&(0, 7)),
        Some(&calamine::Data::String("Bore [mm]".into()))
    );
    let _ = std::fs::remove_dir_all(&dir);
}

/// The limit flags work on `check` and `compare` too: the same file is refused under a low limit
/// (exit 2, the file and the flag named, nothing written) and read under the default.
#[test]
fn limit_flags_apply_to_check_and_compare() {
    let dir = temp_dir("limit-flags");
    let input = dir.join("station.xlsx");
    std::fs::write(&input, xlsx(&base_station())).expect("write");
    let low = [OsStr::new("--max-cells"), OsStr::new("20")];
    let check = |extra: &[&OsStr]| {
        let mut args = vec![OsStr::new("check"), input.as_os_str()];
        args.extend_from_slice(extra);
        run(&args)
    };
    let refused = check(&low);
    let err = &refused.stderr;
    assert_eq!(refused.code, Some(2), "{err}");
    assert!(
        err.contains("station.xlsx") && err.contains("--max-cells") && err.contains("20 cells"),
        "{err}"
    );
    assert_eq!(check(&[]).code, Some(0));
    let out = dir.join("cmp.xlsx");
    let mut args = vec![
        OsStr::new("compare"),
        input.as_os_str(),
        input.as_os_str(),
        OsStr::new("-o"),
        out.as_os_str(),
    ];
    args.extend_from_slice(&low);
    let cmp = run(&args);
    let err = &cmp.stderr;
    assert_eq!(cmp.code, Some(2), "{err}");
    assert!(err.contains("--max-cells"), "{err}");
    assert_eq!(entries(&dir), ["station.xlsx"]);
    let _ = std::fs::remove_dir_all(&dir);
}
