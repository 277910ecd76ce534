//! The template round-trips: filled with invented rows programmatically, it reads without error
//! and audits; its units row is read as units; the Read me lists every column.

use calamine::Data;
use lossledger::audit::{self, Rules};
use lossledger::ingest::{self, TableKind, grid};
use lossledger::template;
use lossledger::units::UnitSystem;

mod common;
use common::dirs::temp_dir;

fn sheets(units: UnitSystem, name: &str) -> Vec<lossledger::ingest::SheetGrid> {
    let bytes = template::build(units).expect("template builds");
    let path = temp_dir(name).join("template.xlsx");
    std::fs::write(&path, bytes).expect("write");
    let s = grid::read_xlsx(&path, name).expect("readable");
    let _ = std::fs::remove_file(&path);
    s
}

fn set(
    sheets: &mut [lossledger::ingest::SheetGrid],
    sheet: &str,
    row: u32,
    values: &[(&str, Data)],
) {
    let g = sheets.iter_mut().find(|g| g.name == sheet).expect("sheet");
    for (header, v) in values {
        let col = (0..g.end_col())
            .find(|&c| g.value(0, c) == &Data::String((*header).to_string()))
            .unwrap_or_else(|| panic!("{header}"));
        g.set_value(row, col, v.clone());
    }
}

fn s(t: &str) -> Data {
    Data::String(t.into())
}

#[test]
fn filled_template_audits() {
    for (units, flow, length) in [(UnitSystem::Si, 36.0, 40.0), (UnitSystem::Us, 158.5, 131.2)] {
        let mut sh = sheets(units, "fill");
        assert!(sh.iter().any(|g| g.name == "Read me"));
        for r in 3..6u32 {
            let line = format!("TPL-{r}");
            set(
                &mut sh,
                "Lines",
                r,
                &[
                    ("Line", s(&line)),
                    ("Service", s("distribution")),
                    ("Flow", Data::Float(flow)),
                ],
            );
            set(
                &mut sh,
                "Pipes",
                r,
                &[
                    ("Line", s(&line)),
                    ("Size", s("DN80")),
                    ("Material", s("ductile iron")),
                    ("Length", Data::Float(length)),
                ],
            );
            set(
                &mut sh,
                "Fittings",
                r,
                &[
                    ("Line", s(&line)),
                    ("Item", s("valve-gate")),
                    ("Size", s("DN80")),
                ],
            );
        }
        let input = ingest::from_sheets(
            "template.xlsx".into(),
            "template.xlsx".into(),
            String::new(),
            sh,
        );
        assert_eq!(input.error_count(), 0, "{:#?}", input.diagnostics);
        let pipes = input.layout(TableKind::Pipes).expect("pipes");
        assert_eq!(
            (pipes.header_row, pipes.units_row, pipes.data_start),
            (0, Some(1), 2)
        );
        let unit = pipes.column("length").and_then(|c| c.unit).map(|u| u.label);
        assert_eq!(unit, Some(if units == UnitSystem::Us { "ft" } else { "m" }));
        // The invented example line and the three filled lines.
        let a = audit::run(&input, &Rules::default()).unwrap_or_else(|e| panic!("{e:#?}"));
        assert_eq!(a.lines.len(), 4);
        assert!(a.lines.iter().all(|l| l.total_head_m > 0.0));
        let example = input
            .lines
            .iter()
            .find(|l| l.line == "EXAMPLE-1")
            .expect("example row");
        assert!(example.flow_m3_s.is_some());
    }
}

#[test]
fn readme_lists_every_column() {
    let sh = sheets(UnitSystem::Si, "readme");
    let readme = sh.iter().find(|g| g.name == "Read me").expect("Read me");
    let text: Vec<String> = (0..readme.end_row())
        .map(|r| match readme.value(r, 1) {
            Data::String(t) => t.clone(),
            _ => String::new(),
        })
        .collect();
    for table in template::TABLES {
        for c in ingest::schema::spec(table).columns {
            assert!(text.iter().any(|t| t.starts_with(c.header)), "{}", c.header);
        }
    }
    let lists = sh.iter().find(|g| g.name == "Lists").expect("Lists");
    assert_eq!(lists.value(1, 0), &s("pump-suction"));
}

#[test]
fn readme_carries_the_cautions() {
    let sh = sheets(UnitSystem::Si, "readme-caution");
    let readme = sh.iter().find(|g| g.name == "Read me").expect("Read me");
    let intro: Vec<String> = (0..readme.end_row())
        .map(|r| match readme.value(r, 0) {
            Data::String(t) => t.clone(),
            _ => String::new(),
        })
        .collect();
    let all = intro.join("\n");
    assert!(all.contains("screening estimate"), "{all}");
    assert!(all.contains("vacuum at high points and siphons are not checked"));
    assert!(all.contains("before speed control or impeller trimming"));
    assert!(all.contains("Energy and operating-point figures are screening estimates"));
}

// The Systems sheet's Control column has a drop-down of the three controls the reader accepts.
#[test]
fn control_list_holds_the_three_controls() {
    let sh = sheets(UnitSystem::Si, "control-list");
    let lists = sh.iter().find(|g| g.name == "Lists").expect("Lists");
    let col = (0..10)
        .find(|&c| lists.value(0, c) == &s("Control list"))
        .expect("Control list");
    let ids: Vec<String> = (1..4)
        .map(|r| match lists.value(r, col) {
            Data::String(t) => t.clone(),
            _ => String::new(),
        })
        .collect();
    assert_eq!(ids, ["fixed", "throttled", "speed"]);
    for id in &ids {
        assert!(
            lossledger::ingest::rows::Control::parse(id).is_some(),
            "{id} reads back"
        );
    }
}

/// The single-sheet template (`--layout list`) reads as a mixed list with its invented example
/// rows (one run, three fittings on the example line) and audits.
#[test]
fn list_template_reads_and_audits() {
    let bytes = template::build_list(UnitSystem::Si).expect("template builds");
    let path = temp_dir("list").join("template.xlsx");
    std::fs::write(&path, bytes).expect("write");
    let sh = grid::read_xlsx(&path, "list").expect("readable");
    let _ = std::fs::remove_file(&path);
    let input = ingest::from_sheets("t.xlsx".into(), "t.xlsx".into(), String::new(), sh);
    assert_eq!(input.error_count(), 0, "{:#?}", input.diagnostics);
    assert!(
        input
            .layout(TableKind::List)
            .is_some_and(|l| l.column("unit").is_some())
    );
    assert_eq!((input.pipes.len(), input.fittings.len()), (1, 3));
    let a = audit::run(&input, &Rules::default()).expect("audits");
    assert_eq!(a.lines.len(), 1);
}
