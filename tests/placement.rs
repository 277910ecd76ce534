//! Fittings on their runs: the projecting entrance from the pipe's own wall, fittings with no
//! size on lines of several bores, and fittings sized by bore on bore-given runs. Workbooks are
//! built in code and audited through the library.

use lossledger::audit::Rules;
use lossledger::error::Severity;

mod common;
use common::book::{Cell, book, n, s};
use common::csv::rows;
use common::library::audit;
use common::tol::rel;

const ENTRANCE_WALL: &str = include_str!(concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/fixtures/reference/fittings_entrance_wall.csv"
));

/// Bore tables (ours: ASME B36.10M; the library's `nearest_pipe`) agree to rounding, so K
/// agrees to rounding of t/d.
const WALL_TOL: f64 = 1e-6;

fn fixture_rows() -> Vec<Vec<String>> {
    rows(
        ENTRANCE_WALL,
        "nps_in,schedule,od_m,wall_m,d_in_m,k_ref,source",
    )
}

const LINES: [&str; 8] = ["L0", "L1", "L2", "L3", "L4", "L5", "L6", "L7"];
const SIZES: [&str; 8] = [
    "NPS 1", "NPS 2", "NPS 4", "NPS 4", "NPS 8", "NPS 12", "NPS 12", "NPS 24",
];
const SCHEDULES: [&str; 8] = ["40", "40", "40", "80", "40", "40", "10", "40"];

#[test]
fn projecting_entrance_uses_the_schedule_wall_like_fluids_entrance_distance() {
    let rows = fixture_rows();
    assert_eq!(rows.len(), LINES.len());
    let mut lines = Vec::new();
    let mut pipes = Vec::new();
    let mut fittings = Vec::new();
    for (i, r) in rows.iter().enumerate() {
        // The fixture's sizes and schedules in the order the constants list them.
        assert_eq!(format!("NPS {}", r[0].trim_end_matches(".0")), SIZES[i]);
        assert_eq!(r[1], SCHEDULES[i]);
        lines.push(vec![s(LINES[i]), n(50.0)]);
        pipes.push(vec![s(LINES[i]), s(SIZES[i]), s(SCHEDULES[i]), n(10.0)]);
        fittings.push(vec![s(LINES[i]), s("projecting entrance")]);
    }
    let path = book(
        "entrance-wall",
        &[
            ("Lines", &["Line", "Flow [m3/h]"], lines),
            ("Pipes", &["Line", "Size", "Schedule", "Length [m]"], pipes),
            ("Fittings", &["Line", "Item"], fittings),
        ],
    );
    let a = audit(&path, &Rules::default());
    for (i, r) in rows.iter().enumerate() {
        let k_ref: f64 = r[5].parse().unwrap();
        let f = a.fittings.iter().find(|f| &*f.line == LINES[i]).unwrap();
        // Source: fluids 1.3.1 piping.nearest_pipe + fittings.entrance_distance(method='Rennels').
        assert!(
            rel(f.k, k_ref) < WALL_TOL,
            "{} sch {}: {} vs {k_ref}",
            SIZES[i],
            SCHEDULES[i],
            f.k
        );
        assert!(f.model.contains("from the pipe's wall"), "{}", f.model);
    }
}

#[test]
fn projecting_entrance_without_a_wall_says_it_assumed_thin_wall() {
    // Rennels & Hudson Eq. 9.5 at t/d = 0: K = 1.12.
    let path = book(
        "entrance-no-wall",
        &[
            (
                "Lines",
                &["Line", "Flow [m3/h]"],
                vec![vec![s("L"), n(50.0)]],
            ),
            (
                "Pipes",
                &["Line", "Inner diameter [mm]", "Length [m]"],
                vec![vec![s("L"), n(102.3), n(10.0)]],
            ),
            (
                "Fittings",
                &["Line", "Item"],
                vec![vec![s("L"), s("projecting entrance")]],
            ),
        ],
    );
    let a = audit(&path, &Rules::default());
    assert_eq!(a.fittings[0].k, 1.12);
    assert!(
        a.fittings[0].model.contains("t/d 0 assumed"),
        "{}",
        a.fittings[0].model
    );
}

/// A two-bore line (DN150 then DN200, both schedule 40) with the given fittings.
fn two_bore(name: &str, fittings: Vec<Vec<Cell>>) -> std::path::PathBuf {
    book(
        name,
        &[
            (
                "Lines",
                &["Line", "Flow [m3/h]"],
                vec![vec![s("D"), n(120.0)]],
            ),
            (
                "Pipes",
                &["Line", "Run no", "Size", "Schedule", "Length [m]"],
                vec![
                    vec![s("D"), n(1.0), s("DN150"), s("40"), n(5.0)],
                    vec![s("D"), n(2.0), s("DN200"), s("40"), n(50.0)],
                ],
            ),
            (
                "Fittings",
                &["Tag", "Line", "Item", "Size", "Size out"],
                fittings,
            ),
        ],
    )
}

#[test]
fn a_fitting_with_no_size_on_a_two_bore_line_is_an_error_listing_the_sizes() {
    let path = two_bore(
        "no-size-error",
        vec![vec![s("D-E1"), s("D"), s("elbow-90"), Cell::E, Cell::E]],
    );
    let input = lossledger::ingest::read_path(&path).unwrap();
    let errs = lossledger::audit::run(&input, &Rules::default()).unwrap_err();
    assert_eq!(errs.len(), 1, "{errs:?}");
    let e = &errs[0];
    assert_eq!(e.severity, Severity::Error);
    assert_eq!(e.cell.as_ref().unwrap().to_string(), "Fittings!D2");
    assert!(
        e.message.contains("DN150") && e.message.contains("DN200"),
        "{}",
        e.message
    );
}

#[test]
fn an_exit_with_no_size_takes_the_last_run_with_a_warning() {
    // Exit K = 1 on the DN200 schedule 40 bore (202.7 mm, ASME B36.10M), not the DN150 one.
    let path = two_bore(
        "no-size-exit",
        vec![vec![s("D-X"), s("D"), s("exit"), Cell::E, Cell::E]],
    );
    let a = audit(&path, &Rules::default());
    let f = &a.fittings[0];
    assert!(
        (f.reference_diameter_m - 0.2027).abs() < 1e-4,
        "{}",
        f.reference_diameter_m
    );
    let w = a
        .findings
        .iter()
        .find(|w| w.code == "size-inferred")
        .unwrap();
    assert_eq!(w.severity, Severity::Warning);
    assert!(w.message.contains("last run"), "{}", w.message);
    assert!(!a.findings.iter().any(|w| w.code == "size-mismatch"));
}

#[test]
fn list_order_places_a_fitting_after_an_expansion() {
    // An expansion DN150 → DN200, then an elbow with no size: it is on the DN200 run.
    let path = two_bore(
        "no-size-order",
        vec![
            vec![s("D-X1"), s("D"), s("expansion"), s("DN150"), s("DN200")],
            vec![s("D-E1"), s("D"), s("elbow-90"), Cell::E, Cell::E],
        ],
    );
    let a = audit(&path, &Rules::default());
    let e = a.fittings.iter().find(|f| &*f.tag == "D-E1").unwrap();
    assert!(
        (e.reference_diameter_m - 0.2027).abs() < 1e-4,
        "{}",
        e.reference_diameter_m
    );
    let w = a
        .findings
        .iter()
        .find(|w| w.code == "size-inferred")
        .unwrap();
    assert!(w.message.contains("D-X1"), "{}", w.message);
}

#[test]
fn disagreeing_neighbours_leave_a_fitting_unplaced() {
    // Listed between a DN150 item and a DN200 item with no size change between: ambiguous.
    let path = two_bore(
        "no-size-between",
        vec![
            vec![s("D-V"), s("D"), s("valve-gate"), s("DN150"), Cell::E],
            vec![s("D-E1"), s("D"), s("elbow-90"), Cell::E, Cell::E],
            vec![s("D-E2"), s("D"), s("elbow-90"), s("DN200"), Cell::E],
        ],
    );
    let input = lossledger::ingest::read_path(&path).unwrap();
    let errs = lossledger::audit::run(&input, &Rules::default()).unwrap_err();
    assert_eq!(errs[0].cell.as_ref().unwrap().to_string(), "Fittings!D3");
}

#[test]
fn bore_sized_fittings_match_bore_given_runs_without_a_warning() {
    let path = book(
        "bore-sized",
        &[
            (
                "Lines",
                &["Line", "Flow [m3/h]"],
                vec![vec![s("M"), n(900.0)]],
            ),
            (
                "Pipes",
                &["Line", "Inner diameter [mm]", "Length [m]"],
                vec![
                    vec![s("M"), n(300.0), n(20.0)],
                    vec![s("M"), n(400.0), n(80.0)],
                ],
            ),
            (
                "Fittings",
                &["Tag", "Line", "Item", "Size"],
                vec![
                    vec![s("M-V"), s("M"), s("valve-butterfly"), s("ID 400")],
                    vec![s("M-E"), s("M"), s("elbow-90"), s("ID 300")],
                ],
            ),
        ],
    );
    let a = audit(&path, &Rules::default());
    assert!(
        !a.findings.iter().any(|w| w.code.starts_with("size-")),
        "{:?}",
        a.findings
    );
    let v = a.fittings.iter().find(|f| &*f.tag == "M-V").unwrap();
    assert_eq!(v.reference_diameter_m, 0.4);
    let e = a.fittings.iter().find(|f| &*f.tag == "M-E").unwrap();
    assert_eq!(e.reference_diameter_m, 0.3);
}
