//! A process that never aborts, through the built binary: a panic or an allocation failure
//! injected (`LOSSLEDGER_FAULT`, a test hook) into the reading thread, the audit, the writing
//! thread or a staged file becomes exit 3 with one line naming the phase and its file; no output
//! and no temporary file is left, and the input is unchanged. Normal exits pass through.

mod common;

use common::bin::{Ran, Runs, bin, run};
use common::book::{s, sheet, xlsx};
use common::dirs::{entries, temp_dir};
use common::stations::base_station;
use std::ffi::OsStr;
use std::path::Path;

/// Run the binary with a fault injected (no backtrace asked for, so the runtime prints only its
/// own allocation message).
fn run_with_fault(fault: &str, args: &[&OsStr]) -> Ran {
    bin()
        .args(args)
        .env("LOSSLEDGER_FAULT", fault)
        .env_remove("RUST_BACKTRACE")
        .env_remove("RUST_LIB_BACKTRACE")
        .ran()
}

/// Lines of stderr that are not from lossledger but from the Rust runtime as it aborts on an
/// allocation failure (`memory allocation of N bytes failed` and its note).
fn runtime_line(line: &str) -> bool {
    (line.starts_with("memory allocation of ") && line.ends_with(" bytes failed"))
        || line.starts_with("note: run with `RUST_BACKTRACE=1`")
}

/// Check one faulty run: exit 3, one line naming `phase` and `file`, nothing on stdout.
fn one_line(case: &str, out: &Ran, phase: &str, file: &Path) -> Result<(), String> {
    let stderr = &out.stderr;
    let ctx = format!("[{case}] exit {:?}, stderr:\n{stderr}", out.code);
    if out.code != Some(3) {
        return Err(format!("expected exit 3; {ctx}"));
    }
    let ours: Vec<&str> = stderr.lines().filter(|l| !runtime_line(l)).collect();
    let [line] = ours[..] else {
        return Err(format!("expected one line from lossledger; {ctx}"));
    };
    let names = format!("{} (phase: {phase};", file.display());
    if !line.starts_with("lossledger: internal failure while ") || !line.contains(&names) {
        return Err(format!("the line does not name {names:?}; {ctx}"));
    }
    if !line.contains("nothing was written") || !out.stdout.is_empty() {
        return Err(format!("output claimed or printed; {ctx}"));
    }
    Ok(())
}

/// Every fault of `audit`, with a workbook and a JSON asked for.
#[test]
fn faults_in_audit_become_exit_3_with_one_line_and_nothing_written() {
    let bytes = xlsx(&base_station());
    let mut failures = Vec::new();
    for (fault, phase, names_output) in [
        ("read:panic", "read", false),
        ("read:alloc", "read", false),
        ("audit:panic", "audit", false),
        ("audit:alloc", "audit", false),
        ("write:panic", "write", true),
        ("write:alloc", "write", true),
        // Inside the staged temporary file: the parent must remove what the aborted worker left.
        ("save:panic", "write", true),
        ("save:alloc", "write", true),
    ] {
        let dir = temp_dir(fault);
        let input = dir.join("station.xlsx");
        std::fs::write(&input, &bytes).expect("write input");
        let (out, json) = (dir.join("out.xlsx"), dir.join("out.json"));
        let run = run_with_fault(
            fault,
            &[
                OsStr::new("audit"),
                input.as_os_str(),
                OsStr::new("-o"),
                out.as_os_str(),
                OsStr::new("--json"),
                json.as_os_str(),
            ],
        );
        let file = if names_output { &out } else { &input };
        let mut result = one_line(fault, &run, phase, file);
        if result.is_ok() && entries(&dir) != ["station.xlsx"] {
            result = Err(format!("[{fault}] left {:?}", entries(&dir)));
        }
        if result.is_ok() && std::fs::read(&input).ok().as_ref() != Some(&bytes) {
            result = Err(format!("[{fault}] the input was changed"));
        }
        match result {
            Ok(()) => {
                let _ = std::fs::remove_dir_all(&dir);
            }
            Err(e) => failures.push(e),
        }
    }
    assert!(failures.is_empty(), "{}", failures.join("\n\n"));
}

/// `check` and `compare` run in the worker too.
#[test]
fn faults_in_check_and_compare_become_exit_3() {
    let dir = temp_dir("check-compare");
    let input = dir.join("station.xlsx");
    std::fs::write(&input, xlsx(&base_station())).expect("write input");
    let check = run_with_fault("read:alloc", &[OsStr::new("check"), input.as_os_str()]);
    // `check` prints its report only at the end: nothing reaches stdout either.
    one_line("check read:alloc", &check, "read", &input).unwrap();
    let out = dir.join("cmp.xlsx");
    let compare = run_with_fault(
        "save:alloc",
        &[
            OsStr::new("compare"),
            input.as_os_str(),
            input.as_os_str(),
            OsStr::new("-o"),
            out.as_os_str(),
        ],
    );
    one_line("compare save:alloc", &compare, "write", &out).unwrap();
    assert_eq!(entries(&dir), ["station.xlsx"]);
    let _ = std::fs::remove_dir_all(&dir);
}

/// Without a fault the worker's own exit codes and output pass through unchanged: 0 with the
/// summary on stdout, 1 for `--fail-on warning` when a warning is raised, 2 for a bad input.
#[test]
fn normal_exits_pass_through_the_worker() {
    let dir = temp_dir("pass-through");
    let input = dir.join("station.xlsx");
    std::fs::write(&input, xlsx(&base_station())).expect("write input");
    let ok = run(&[OsStr::new("audit"), input.as_os_str()]);
    assert_eq!(ok.code, Some(0));
    assert!(ok.stdout.contains("Wrote "));
    // A reducer with equal sizes raises the warning `same-size-reducer` (tests/bad_input.rs).
    let mut st = base_station();
    let fittings = sheet(&mut st, "Fittings");
    fittings.set(1, 2, s("reducer"));
    fittings.set(1, 4, s("DN100"));
    std::fs::write(&input, xlsx(&st)).expect("write input");
    let warned = run(&[
        OsStr::new("audit"),
        input.as_os_str(),
        OsStr::new("--fail-on"),
        OsStr::new("warning"),
    ]);
    assert_eq!(warned.code, Some(1));
    let missing = dir.join("missing.xlsx");
    let bad = run(&[OsStr::new("audit"), missing.as_os_str()]);
    assert_eq!(bad.code, Some(2));
    assert!(!bad.stderr.contains("internal failure"));
    let _ = std::fs::remove_dir_all(&dir);
}
