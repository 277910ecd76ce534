//! Mixed item lists (bills of quantities, takeoffs, asset-register exports) read to the same
//! numbers as their canonical twins.
//!
//! The fixtures under `fixtures/lists/` are written by `examples/make_list_fixtures.rs`; the
//! station is invented. Each list and its `*.canonical.xlsx` twin (Lines, Pipes, Fittings) hold
//! the same lines, runs and fittings; both must audit to the same line totals to 1e-9 relative.
//! 12 ft 6 in = 3.81 m exactly (NIST SP 811, 1 ft = 0.3048 m) is one of the lengths.

mod common;

use common::dirs::fixtures;
use common::library::{read_clean, same_totals};
use std::path::PathBuf;

use lossledger::error::Severity;
use lossledger::ingest::list::Became;
use lossledger::ingest::{self, Input, TableKind};

fn dir() -> PathBuf {
    fixtures("lists")
}

fn read(name: &str, map: Option<&str>) -> Input {
    read_clean(&dir(), name, map)
}

fn same(stem: &str, map: Option<&str>) -> Input {
    same_file(stem, "xlsx", map)
}

fn same_file(stem: &str, ext: &str, map: Option<&str>) -> Input {
    let list = read(&format!("{stem}.{ext}"), map);
    let twin = read(&format!("{stem}.canonical.xlsx"), None);
    assert_eq!(
        same_totals(stem, &list, &twin),
        4,
        "{stem}: every line audited"
    );
    assert_eq!(list.pipes.len(), twin.pipes.len(), "{stem}: runs");
    list
}

fn count(input: &Input, became: Became) -> usize {
    input
        .report
        .classified
        .iter()
        .filter(|c| c.became == became)
        .count()
}

#[test]
fn line_column_and_unit_column() {
    let l = same("01_line_column", None);
    assert_eq!(count(&l, Became::Run), 6);
    assert_eq!(count(&l, Became::Fitting), 14);
    assert!(
        l.layout(TableKind::List)
            .is_some_and(|x| x.column("item_no").is_some())
    );
}

#[test]
fn section_headings_and_skipped_rows() {
    let l = same("02_section_headings", None);
    assert_eq!(count(&l, Became::Heading), 4);
    let reasons: Vec<&str> = l.report.skipped.iter().map(|s| s.reason.as_str()).collect();
    for want in [
        "preliminaries or an allowance (unit 'Sum')",
        "extra over",
        "not in the flow path: a pipe support",
        "a totals or carried row ('To collection')",
        "a totals or carried row ('Carried to summary')",
        "a note",
        "a heading or note with no quantity ('Preliminaries",
    ] {
        assert!(
            reasons.iter().any(|r| r.starts_with(want)),
            "{want} in {reasons:#?}"
        );
    }
}

#[test]
fn tags_carry_the_line() {
    let l = same("03_tags", None);
    assert!(
        l.report
            .classified
            .iter()
            .any(|c| c.deciding.contains("line from tag 'MC-01-001'"))
    );
}

#[test]
fn units_in_the_quantity_cells() {
    let l = same("04_units_in_cells", None);
    assert!(l.pipes.iter().any(|p| (p.length_m - 3.81).abs() < 1e-12));
}

#[test]
fn item_numbers_and_particulars() {
    let l = same("05_item_numbers", None);
    let layout = l.layout(TableKind::List).expect("list");
    assert_eq!(layout.column("item_no").map(|c| c.col), Some(0));
    assert_eq!(layout.column("description").map(|c| c.col), Some(1));
}

#[test]
fn register_with_status_and_locations() {
    let l = same("06_register", None);
    assert_eq!(l.report.left_out.len(), 3, "{:#?}", l.report.left_out);
    let skipped: Vec<&str> = l.report.skipped.iter().map(|s| s.reason.as_str()).collect();
    for want in [
        "not in the flow path: a pump",
        "not in the flow path: a motor",
        "not in the flow path: an instrument",
    ] {
        assert!(
            skipped.iter().any(|r| r.starts_with(want)),
            "{want} in {skipped:#?}"
        );
    }
}

#[test]
fn size_cells_with_schedules_and_reducers() {
    let l = same("07_size_cells", None);
    assert!(
        l.fittings
            .iter()
            .any(|f| f.kind.id == "reducer" && f.size_out.is_some())
    );
}

#[test]
fn locations_through_the_map() {
    same("08_location_map", Some("08_location_map.map.toml"));
}

#[test]
fn opendocument_twin() {
    let l = same_file("09_ods", "ods", None);
    assert_eq!(count(&l, Became::Fitting), 14);
}

#[test]
fn legacy_xls_twin() {
    let l = same_file("10_xls", "xls", None);
    assert_eq!(count(&l, Became::Fitting), 14);
}

fn grid(name: &str, rows: &[&[&str]]) -> lossledger::ingest::SheetGrid {
    use calamine::{Data, Range};
    let width = rows.iter().map(|r| r.len()).max().unwrap_or(1) as u32;
    let mut r = Range::new((0, 0), (rows.len() as u32 - 1, width - 1));
    for (i, row) in rows.iter().enumerate() {
        for (j, v) in row.iter().enumerate() {
            if !v.is_empty() {
                let d = v
                    .parse::<f64>()
                    .map_or_else(|_| Data::String((*v).into()), Data::Float);
                r.set_value((i as u32, j as u32), d);
            }
        }
    }
    lossledger::ingest::SheetGrid::from_values(name, r)
}

/// A K on a run and a roughness on a fitting are warnings at those cells; a Size column that
/// disagrees with the description is a warning at both cells and the column wins. Invented rows.
#[test]
fn other_kind_columns_and_disagreements_are_warned() {
    let lines = grid("Lines", &[&["Line", "Flow [m3/h]"], &["L1", "40"]]);
    let list = grid(
        "BoQ",
        &[
            &[
                "Line",
                "Description",
                "Size",
                "Qty",
                "Unit",
                "K",
                "Roughness [mm]",
            ],
            &["L1", "Pipe, CS, DN100", "DN80", "20", "m", "0.5", ""],
            &["L1", "Gate valve", "DN80", "1", "No", "", "0.1"],
        ],
    );
    let input = ingest::from_sheets(
        "t.xlsx".into(),
        "t.xlsx".into(),
        String::new(),
        vec![lines, list],
    );
    assert_eq!(input.error_count(), 0, "{:#?}", input.diagnostics);
    let warned = |cell: &str, says: &str| {
        input.diagnostics.iter().any(|d| {
            d.severity == Severity::Warning
                && d.cell.as_ref().is_some_and(|c| c.to_string() == cell)
                && d.message.contains(says)
        })
    };
    assert!(warned(
        "BoQ!F2",
        "applies to the other kind of row; this row is a pipe run"
    ));
    assert!(warned(
        "BoQ!G3",
        "applies to the other kind of row; this row is a fitting"
    ));
    assert!(warned(
        "BoQ!C2",
        "the Size column says DN80 but the description says DN100"
    ));
    assert!(warned(
        "BoQ!B2",
        "the Size column says DN80 but the description says DN100"
    ));
    assert_eq!(
        input.pipes[0].size,
        Some(lossledger::ingest::parse::SizeSpec::Dn(80))
    );
}

/// A line list above a takeoff on one sheet, separated by a blank row and a new header.
#[test]
fn two_tables_on_one_sheet() {
    let l = same("11_two_tables", None);
    let lines = l.layout(TableKind::Lines).expect("lines");
    let list = l.layout(TableKind::List).expect("list");
    assert_eq!(
        (lines.sheet.as_str(), list.sheet.as_str()),
        ("Station", "Station")
    );
    assert_eq!(lines.data_end, Some(5));
    assert_eq!(list.header_row, 6);
    assert_eq!(l.lines.len(), 4);
}
