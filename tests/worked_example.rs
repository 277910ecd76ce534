//! Reproduces docs/worked-example.md (a hand calculation; properties from `iapws` 1.5.5 and
//! friction factors checked with `fluids` 1.3.1) through the library, to 0.1 %.

mod common;

use common::book::{Cell, book, n, s, texts};
use common::tol::{REL_TOL_HAND_WORKED, rel};
use lossledger::audit::{self, Rules};
use lossledger::ingest;
use std::path::PathBuf;

/// The worked example's line WX-1: a DN100 and a DN150 run with a sudden expansion between.
fn build() -> PathBuf {
    let run = |seq: f64, size: &str, length_m: f64| -> Vec<Cell> {
        vec![
            s("WX-1"),
            n(seq),
            s(size),
            s("40"),
            s("carbon steel"),
            n(length_m),
            n(0.045),
        ]
    };
    book(
        "wx1",
        &[
            (
                "Lines",
                &["Line", "Service", "Flow [m3/h]", "Temperature [°C]"],
                vec![vec![s("WX-1"), s("general"), n(60.0), n(15.0)]],
            ),
            (
                "Pipes",
                &[
                    "Line",
                    "Seq",
                    "Size",
                    "Schedule",
                    "Material",
                    "Length [m]",
                    "Roughness [mm]",
                ],
                vec![run(1.0, "DN100", 12.0), run(2.0, "DN150", 30.0)],
            ),
            (
                "Fittings",
                &["Tag", "Line", "Item", "Size", "Size out"],
                vec![texts(&[
                    "WX-1-X",
                    "WX-1",
                    "sudden expansion",
                    "DN100",
                    "DN150",
                ])],
            ),
        ],
    )
}

fn close(actual: f64, expected: f64, what: &str) {
    let r = rel(actual, expected);
    assert!(
        r < REL_TOL_HAND_WORKED,
        "{what}: {actual} vs hand-worked {expected} (rel {r:.2e})"
    );
}

#[test]
fn two_section_line_with_expansion_matches_the_hand_calculation() {
    let path = build();
    let input = ingest::read_path(&path).unwrap();
    let a = audit::run(&input, &Rules::default()).unwrap();
    let line = &a.lines[0];
    let runs: Vec<_> = line.runs.iter().map(|&i| &a.runs[i]).collect();
    // Step 2: bores, ASME B36.10M.
    close(runs[0].inner_diameter_m, 0.10226, "DN100 bore");
    close(runs[1].inner_diameter_m, 0.15405, "DN150 bore");
    // Step 3 and 4.
    close(runs[0].velocity_m_s, 2.02930, "v1");
    close(runs[0].reynolds, 182_257.0, "Re1");
    close(runs[1].reynolds, 120_984.0, "Re2");
    close(runs[0].friction_factor, 0.018681, "f1");
    close(runs[1].friction_factor, 0.018885, "f2");
    // Step 5.
    close(runs[0].head_m, 0.460287, "h1");
    close(runs[1].head_m, 0.149931, "h2");
    // Step 6: expansion on the smaller bore.
    let x = &a.fittings[0];
    close(x.k, 0.312879, "K expansion");
    close(x.reference_diameter_m, 0.10226, "K reference bore");
    close(x.head_m, 0.065693, "h expansion");
    // Step 7.
    close(line.friction_head_m, 0.610218, "friction total");
    close(line.total_head_m, 0.675911, "line total");
    close(line.total_dp_pa, 6622.47, "line dp");
    std::fs::remove_dir_all(path.parent().unwrap()).ok();
}
