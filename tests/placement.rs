//! Fittings on their runs: the projecting entrance from the pipe's own wall, fittings with no
//! size on lines of several bores, and fittings sized by bore on bore-given runs. Workbooks are
//! built in code and audited through the library.

use lossledger::audit::Rules;
use lossledger::error::Severity;

mod common;
use common::{C, audit, book, rel};

const ENTRANCE_WALL: &str = include_str!(concat!(
    env!("CARGO_MANIFEST_DIR"),
    "/fixtures/reference/fittings_entrance_wall.csv"
));

/// Bore tables (ours: ASME B36.10M; the library's `nearest_pipe`) agree to rounding, so K
/// agrees to rounding of t/d.
const WALL_TOL: f64 = 1e-6;

fn fixture_rows() -> Vec<Vec<String>> {
    ENTRANCE_WALL
        .lines()
        .skip(1)
        .map(|l| l.split(',').map(str::to_string).collect())
        .collect()
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
        lines.push(vec![C::S(LINES[i]), C::N(50.0)]);
        pipes.push(vec![
            C::S(LINES[i]),
            C::S(SIZES[i]),
            C::S(SCHEDULES[i]),
            C::N(10.0),
        ]);
        fittings.push(vec![C::S(LINES[i]), C::S("projecting entrance")]);
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
        let f = a.fittings.iter().find(|f| f.line == LINES[i]).unwrap();
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
                vec![vec![C::S("L"), C::N(50.0)]],
            ),
            (
                "Pipes",
                &["Line", "Inner diameter [mm]", "Length [m]"],
                vec![vec![C::S("L"), C::N(102.3), C::N(10.0)]],
            ),
            (
                "Fittings",
                &["Line", "Item"],
                vec![vec![C::S("L"), C::S("projecting entrance")]],
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
fn two_bore(name: &str, fittings: Vec<Vec<C>>) -> std::path::PathBuf {
    book(
        name,
        &[
            (
                "Lines",
                &["Line", "Flow [m3/h]"],
                vec![vec![C::S("D"), C::N(120.0)]],
            ),
            (
                "Pipes",
                &["Line", "Run no", "Size", "Schedule", "Length [m]"],
                vec![
                    vec![C::S("D"), C::N(1.0), C::S("DN150"), C::S("40"), C::N(5.0)],
                    vec![C::S("D"), C::N(2.0), C::S("DN200"), C::S("40"), C::N(50.0)],
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
        vec![vec![C::S("D-E1"), C::S("D"), C::S("elbow-90"), C::E, C::E]],
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
        vec![vec![C::S("D-X"), C::S("D"), C::S("exit"), C::E, C::E]],
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
            vec![
                C::S("D-X1"),
                C::S("D"),
                C::S("expansion"),
                C::S("DN150"),
                C::S("DN200"),
            ],
            vec![C::S("D-E1"), C::S("D"), C::S("elbow-90"), C::E, C::E],
        ],
    );
    let a = audit(&path, &Rules::default());
    let e = a.fittings.iter().find(|f| f.tag == "D-E1").unwrap();
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
            vec![
                C::S("D-V"),
                C::S("D"),
                C::S("valve-gate"),
                C::S("DN150"),
                C::E,
            ],
            vec![C::S("D-E1"), C::S("D"), C::S("elbow-90"), C::E, C::E],
            vec![
                C::S("D-E2"),
                C::S("D"),
                C::S("elbow-90"),
                C::S("DN200"),
                C::E,
            ],
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
                vec![vec![C::S("M"), C::N(900.0)]],
            ),
            (
                "Pipes",
                &["Line", "Inner diameter [mm]", "Length [m]"],
                vec![
                    vec![C::S("M"), C::N(300.0), C::N(20.0)],
                    vec![C::S("M"), C::N(400.0), C::N(80.0)],
                ],
            ),
            (
                "Fittings",
                &["Tag", "Line", "Item", "Size"],
                vec![
                    vec![
                        C::S("M-V"),
                        C::S("M"),
                        C::S("valve-butterfly"),
                        C::S("ID 400"),
                    ],
                    vec![C::S("M-E"), C::S("M"), C::S("elbow-90"), C::S("ID 300")],
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
    let v = a.fittings.iter().find(|f| f.tag == "M-V").unwrap();
    assert_eq!(v.reference_diameter_m, 0.4);
    let e = a.fittings.iter().find(|f| f.tag == "M-E").unwrap();
    assert_eq!(e.reference_diameter_m, 0.3);
}
