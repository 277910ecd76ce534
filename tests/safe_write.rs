//! Safe writing: outputs go to a temporary file in the target folder and are renamed into place, so
//! a failure part-way leaves neither a partial output nor a changed input, and the message says why.

mod common;

use common::bin::{Ran, run};
use common::book::xlsx;
use common::dirs::{entries, temp_dir};
use common::stations::base_station;
use std::ffi::OsStr;
use std::path::Path;

fn station(dir: &Path) -> (std::path::PathBuf, Vec<u8>) {
    let bytes = xlsx(&base_station());
    let input = dir.join("station.xlsx");
    std::fs::write(&input, &bytes).unwrap();
    (input, bytes)
}

fn audit(input: &Path, extra: &[&OsStr]) -> Ran {
    let mut args = vec![OsStr::new("audit"), input.as_os_str()];
    args.extend_from_slice(extra);
    run(&args)
}

fn refused_with(o: &Ran, says: &str) {
    let e = &o.stderr;
    assert_eq!(o.code, Some(2), "{e}");
    assert!(!e.contains("panicked"), "{e}");
    assert!(
        e.to_lowercase().contains(&says.to_lowercase()),
        "expected {says:?} in: {e}"
    );
}

/// No file whose name holds `.tmp` anywhere under `dir`.
fn no_temp_files(dir: &Path) {
    for e in std::fs::read_dir(dir).unwrap().flatten() {
        let name = e.file_name().to_string_lossy().into_owned();
        assert!(!name.contains(".tmp"), "temporary file left behind: {name}");
        if e.path().is_dir() {
            no_temp_files(&e.path());
        }
    }
}

#[test]
fn output_path_that_is_a_directory_is_refused_and_nothing_changes() {
    let dir = temp_dir("out-is-dir");
    let (input, bytes) = station(&dir);
    let out = dir.join("result.xlsx");
    std::fs::create_dir(&out).unwrap();
    let o = audit(&input, &[OsStr::new("-o"), out.as_os_str()]);
    refused_with(&o, "result.xlsx");
    assert!(out.is_dir() && std::fs::read_dir(&out).unwrap().next().is_none());
    assert_eq!(std::fs::read(&input).unwrap(), bytes);
    assert_eq!(entries(&dir), ["result.xlsx", "station.xlsx"]);
}

#[test]
fn json_path_that_is_a_directory_leaves_no_workbook_either() {
    let dir = temp_dir("json-is-dir");
    let (input, bytes) = station(&dir);
    let json = dir.join("out.json");
    std::fs::create_dir(&json).unwrap();
    let o = audit(&input, &[OsStr::new("--json"), json.as_os_str()]);
    refused_with(&o, "out.json");
    assert_eq!(std::fs::read(&input).unwrap(), bytes);
    assert_eq!(
        entries(&dir),
        ["out.json", "station.xlsx"],
        "a partial set of outputs was left"
    );
}

#[test]
fn output_folder_missing_or_a_file_is_refused() {
    let dir = temp_dir("no-folder");
    let (input, bytes) = station(&dir);
    let out = dir.join("missing").join("out.xlsx");
    let o = audit(&input, &[OsStr::new("-o"), out.as_os_str()]);
    refused_with(&o, "out.xlsx");
    let file = dir.join("plain-file");
    std::fs::write(&file, b"x").unwrap();
    let out = file.join("out.xlsx");
    let o = audit(&input, &[OsStr::new("-o"), out.as_os_str()]);
    refused_with(&o, "out.xlsx");
    assert_eq!(std::fs::read(&input).unwrap(), bytes);
    assert_eq!(entries(&dir), ["plain-file", "station.xlsx"]);
}

#[test]
fn output_over_the_input_is_refused() {
    let dir = temp_dir("over-input");
    let (input, bytes) = station(&dir);
    let o = audit(&input, &[OsStr::new("-o"), input.as_os_str()]);
    refused_with(&o, "input");
    let o = audit(&input, &[OsStr::new("--json"), input.as_os_str()]);
    refused_with(&o, "input");
    // The same file through another spelling of its path.
    let other = dir.join(".").join("station.xlsx");
    let o = audit(&input, &[OsStr::new("-o"), other.as_os_str()]);
    refused_with(&o, "input");
    assert_eq!(std::fs::read(&input).unwrap(), bytes);
    assert_eq!(entries(&dir), ["station.xlsx"]);
}

/// Make `dir` unwritable. As root, permission bits do not stop writes, so the folder is also made
/// immutable (`chattr +i`, ext2/3/4 and others); returns false when neither works here.
fn make_unwritable(dir: &Path) -> bool {
    use std::os::unix::fs::PermissionsExt;
    std::fs::set_permissions(dir, std::fs::Permissions::from_mode(0o555)).unwrap();
    let probe = dir.join("probe");
    if std::fs::write(&probe, b"x").is_err() {
        return true;
    }
    let _ = std::fs::remove_file(&probe);
    let ok = std::process::Command::new("chattr")
        .arg("+i")
        .arg(dir)
        .status()
        .map(|s| s.success())
        .unwrap_or(false);
    ok && std::fs::write(&probe, b"x").is_err()
}

fn make_writable(dir: &Path) {
    use std::os::unix::fs::PermissionsExt;
    let _ = std::process::Command::new("chattr")
        .arg("-i")
        .arg(dir)
        .status();
    let _ = std::fs::set_permissions(dir, std::fs::Permissions::from_mode(0o755));
}

#[test]
fn read_only_output_folder_fails_cleanly_and_says_why() {
    let dir = temp_dir("read-only");
    let (input, bytes) = station(&dir);
    let ro = dir.join("ro");
    std::fs::create_dir(&ro).unwrap();
    if !make_unwritable(&ro) {
        make_writable(&ro);
        eprintln!("skipped: cannot make a folder unwritable on this machine (root without chattr)");
        return;
    }
    let out = ro.join("out.xlsx");
    let json = ro.join("out.json");
    let o = audit(
        &input,
        &[
            OsStr::new("-o"),
            out.as_os_str(),
            OsStr::new("--json"),
            json.as_os_str(),
        ],
    );
    let listing = entries(&ro);
    make_writable(&ro);
    let e = &o.stderr;
    refused_with(&o, "out.xlsx");
    assert!(
        e.contains("ermission denied") || e.contains("ot permitted") || e.contains("ead-only"),
        "reason not given: {e}"
    );
    assert!(listing.is_empty(), "left in the folder: {listing:?}");
    assert_eq!(std::fs::read(&input).unwrap(), bytes);
}

#[test]
fn existing_output_is_replaced_whole_on_success_and_kept_on_failure() {
    let dir = temp_dir("replace");
    let (input, _) = station(&dir);
    let out = dir.join("out.xlsx");
    std::fs::write(&out, b"previous results").unwrap();
    // A failing run (bad input) must not touch the previous output.
    let bad = dir.join("bad.xlsx");
    std::fs::write(&bad, b"not a workbook").unwrap();
    let o = audit(&bad, &[OsStr::new("-o"), out.as_os_str()]);
    refused_with(&o, "bad.xlsx");
    assert_eq!(std::fs::read(&out).unwrap(), b"previous results");
    // A good run replaces it with a complete workbook.
    let o = audit(&input, &[OsStr::new("-o"), out.as_os_str()]);
    assert_eq!(o.code, Some(0), "{}", o.stderr);
    let new = std::fs::read(&out).unwrap();
    assert!(new.starts_with(b"PK\x03\x04"), "output is not a zip");
    let wb: Result<calamine::Xlsx<_>, _> = calamine::open_workbook(&out);
    assert!(wb.is_ok(), "output does not open");
    no_temp_files(&dir);
}
