//! Reading and auditing through the library, and the canonical-twin check of the messy and
//! list fixtures.

use super::tol::{REL_TOL_SAME_ARITHMETIC, rel};
use lossledger::audit::{Audit, Rules};
use lossledger::error::Severity;
use lossledger::ingest::{self, HeaderMap, Input, InputSource, ReadOptions};
use std::path::Path;

/// Read and audit a workbook that must have no input errors.
pub fn audit(path: &Path, rules: &Rules) -> Audit {
    let input = ingest::read_path(path).unwrap();
    assert_eq!(input.error_count(), 0, "{:?}", input.diagnostics);
    lossledger::audit::run(&input, rules).unwrap()
}

/// Read `dir/name` (with the header map `dir/map`, if any); it must have no input errors.
pub fn read_clean(dir: &Path, name: &str, map: Option<&str>) -> Input {
    let options = ReadOptions {
        map: map.map(|m| HeaderMap::from_file(&dir.join(m)).expect("map file")),
        ..ReadOptions::default()
    };
    let input =
        ingest::read_inputs(&[InputSource::Path(dir.join(name))], &options).expect("readable");
    let errors: Vec<String> = input
        .diagnostics
        .iter()
        .filter(|d| d.severity == Severity::Error)
        .map(|d| d.to_string())
        .collect();
    assert!(errors.is_empty(), "{name}: {errors:#?}");
    input
}

/// Each line's (line, friction head, fittings head, total head), sorted by line.
pub fn totals(input: &Input) -> Vec<(String, f64, f64, f64)> {
    let a = lossledger::audit::run(input, &Rules::default())
        .unwrap_or_else(|e| panic!("{}: {e:#?}", input.file));
    let mut v: Vec<_> = a
        .lines
        .iter()
        .map(|l| {
            (
                l.line.clone(),
                l.friction_head_m,
                l.fittings_head_m,
                l.total_head_m,
            )
        })
        .collect();
    v.sort_by(|a, b| a.0.cmp(&b.0));
    v
}

/// Assert that `input` audits to its canonical `twin`'s line totals (same lines; friction,
/// fittings and total head within [`REL_TOL_SAME_ARITHMETIC`]); the number of lines.
pub fn same_totals(label: &str, input: &Input, twin: &Input) -> usize {
    let (ti, tt) = (totals(input), totals(twin));
    assert_eq!(ti.len(), tt.len(), "{label}: line count");
    for (a, b) in ti.iter().zip(&tt) {
        assert_eq!(a.0, b.0);
        for (x, y, what) in [
            (a.1, b.1, "friction"),
            (a.2, b.2, "fittings"),
            (a.3, b.3, "total"),
        ] {
            let r = rel(x, y);
            assert!(
                r <= REL_TOL_SAME_ARITHMETIC,
                "{label}: line {} {what} {x} vs twin {y} (rel {r:e})",
                a.0
            );
        }
    }
    ti.len()
}
