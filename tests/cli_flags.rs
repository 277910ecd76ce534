//! Every subcommand and flag of the command line, through the built binary: each has a named test
//! that checks its exit code and an effect on the output. Flags whose named test lives in another
//! file are listed here with that test, not tested twice.
//!
//! | command / flag | covered by |
//! | --- | --- |
//! | `--help`, each subcommand's `--help` | `help_lists_every_subcommand_and_each_subcommand_its_flags` |
//! | `--version` | `version_prints_the_package_version` |
//! | `audit INPUT` | `e2e::demo_audit_keeps_every_input_cell_and_matches_json` |
//! | `audit -o` | `safe_write::output_path_that_is_a_directory_is_refused_and_nothing_changes`, `nothing_lost` |
//! | `audit --json PATH` | `e2e::demo_audit_keeps_every_input_cell_and_matches_json` |
//! | `audit --json -` | `audit_json_dash_prints_the_json_on_standard_output` |
//! | `audit --fail-on warning\|error` | `audit_fail_on_exits_1_at_or_above_its_severity` |
//! | `audit --rules` | `audit_rules_file_tightens_a_velocity_band` |
//! | `audit --pipes/--fittings/--lines` | `audit_csv_tables_by_flag_read_as_the_same_sheets` |
//! | `audit --map`, `check --map` | `audit_and_check_map_read_a_sheet_with_other_headers`; a bad map: `ingest_bad::bad_map_file_exits_2` |
//! | `audit --units us` | `spreadsheet::units_us_converts_the_summary_and_ranking_heads` (workbook), `audit_units_us_converts_the_console_systems_and_ranking` (console) |
//! | `audit --ranking-rows` | `e2e::ranking_rows_caps_the_ranking_sheet_and_says_what_is_left_out` |
//! | `audit --max-cells`, `--max-unzipped-mb`, `--max-ratio` | `bad_input::too_many_cells`, `bad_input::cells_under_a_raised_limit`, `bad_input::inflated_sheet_part_over_size_limit`, `bad_input::inflated_sheet_part`, `bad_input::inflated_sheet_part_allowed` |
//! | `check` | `ingest_bad::each_problem_class_exits_2_with_cell_and_hint_and_writes_nothing` (exit 2), `bad_input::list_rows_skipped_with_their_reasons` (exit 0) |
//! | `check`, `compare` limits | `bad_input::limit_flags_apply_to_check_and_compare` |
//! | `template OUT`, `--units`, `--layout` | `template_writes_a_blank_workbook_once_in_the_units_and_layout_asked` |
//! | `rules` | `e2e::rules_prints_defaults_that_parse_back` |
//! | `kinds`, `kinds --json` | `kinds_json_lists_the_catalogue_with_its_sources` |
//! | `demo --dir` | `e2e::demo_outputs_say_the_data_is_invented` |
//! | `compare` and every flag | `compare::flag_*` (`-o`, `--json -`, `--fail-on`, `--rules`, `--map`, `--units`) |
//! | `review`, `-o`, `--json` | `review::default_output_json_on_stdout_and_basis` |
//! | `review --jobs` | `review::jobs_change_nothing_in_the_outputs` |
//! | `review --strict` | `review::strict_exits_2_and_writes_nothing` |
//! | `review --ranking-rows` | `review::worst_fittings_rank_all_stations_together` |
//! | `review --rules` | `review_rules_file_applies_to_every_station` |
//! | `review --map` | `review_map_reads_every_station_with_it` |
//! | `review --units us` | `review_units_us_labels_the_workbooks_in_feet` |
//! | `review` limits | `review_max_cells_leaves_a_station_over_the_limit_out` |

mod common;

use common::bin::{Ran, Runs, bin, run};
use common::book::{Cell, Sheet, n, s, sheet, xlsx};
use common::dirs::{entries, temp_dir};
use common::readback::{read_cells, read_json};
use common::stations::base_station;
use common::tol::{REL_TOL_SAME_ARITHMETIC, rel};
use std::path::{Path, PathBuf};

/// Write `sheets` as `dir/name`; its path.
fn write(dir: &Path, name: &str, sheets: &[Sheet]) -> PathBuf {
    let path = dir.join(name);
    std::fs::write(&path, xlsx(sheets)).expect("write input");
    path
}

/// `lossledger audit INPUT --json out.json -o out.xlsx EXTRA…` in `INPUT`'s folder; the run and
/// the JSON (when written).
fn audit(input: &Path, extra: &[&str]) -> (Ran, Option<serde_json::Value>) {
    let dir = input.parent().unwrap();
    let json = dir.join("out.json");
    let _ = std::fs::remove_file(&json);
    let ran = bin()
        .arg("audit")
        .arg(input)
        .arg("--json")
        .arg(&json)
        .arg("-o")
        .arg(dir.join("out.xlsx"))
        .args(extra)
        .ran();
    let doc = json.exists().then(|| read_json(&json));
    (ran, doc)
}

/// Finding codes of an audit JSON.
fn codes(doc: &serde_json::Value) -> Vec<String> {
    doc["findings"]
        .as_array()
        .unwrap()
        .iter()
        .map(|f| f["code"].as_str().unwrap().to_string())
        .collect()
}

/// The base station with an equal-size reducer, which raises the warning `same-size-reducer`
/// (a reducer with two equal sizes reduces nothing).
fn with_a_warning() -> Vec<Sheet> {
    let mut st = base_station();
    let fittings = sheet(&mut st, "Fittings");
    fittings.set(1, 2, s("reducer"));
    fittings.set(1, 4, s("DN100"));
    st
}

#[test]
fn help_lists_every_subcommand_and_each_subcommand_its_flags() {
    let top = run(&["--help"]);
    assert_eq!(top.code, Some(0), "{}", top.stderr);
    let limits = ["--max-cells", "--max-unzipped-mb", "--max-ratio"];
    let inputs = ["--pipes", "--fittings", "--lines", "--map"];
    let table: [(&str, &[&str]); 8] = [
        (
            "audit",
            &[
                "--output",
                "--json",
                "--rules",
                "--fail-on",
                "--units",
                "--ranking-rows",
            ],
        ),
        (
            "compare",
            &[
                "--map",
                "--output",
                "--json",
                "--rules",
                "--fail-on",
                "--units",
            ],
        ),
        (
            "review",
            &[
                "--output",
                "--json",
                "--rules",
                "--map",
                "--units",
                "--ranking-rows",
                "--jobs",
                "--strict",
            ],
        ),
        ("check", &[]),
        ("template", &["--units", "--layout"]),
        ("rules", &[]),
        ("kinds", &["--json"]),
        ("demo", &["--dir"]),
    ];
    for (command, flags) in table {
        assert!(top.stdout.contains(command), "--help lacks {command}");
        let help = run(&[command, "--help"]);
        assert_eq!(help.code, Some(0), "{command} --help: {}", help.stderr);
        let reads = matches!(command, "audit" | "compare" | "review" | "check");
        let own_inputs: &[&str] = if matches!(command, "audit" | "check") {
            &inputs
        } else {
            &[]
        };
        let shared = if reads { &limits[..] } else { &[] };
        for flag in flags.iter().chain(own_inputs).chain(shared) {
            assert!(
                help.stdout.contains(flag),
                "{command} --help lacks {flag}:\n{}",
                help.stdout
            );
        }
    }
}

#[test]
fn version_prints_the_package_version() {
    let ran = run(&["--version"]);
    assert_eq!(ran.code, Some(0));
    assert_eq!(
        ran.stdout.trim(),
        format!("lossledger {}", env!("CARGO_PKG_VERSION"))
    );
}

#[test]
fn audit_json_dash_prints_the_json_on_standard_output() {
    let dir = temp_dir("json-dash");
    let input = write(&dir, "station.xlsx", &base_station());
    let ran = bin().arg("audit").arg(&input).args(["--json", "-"]).ran();
    assert_eq!(ran.code, Some(0), "{}", ran.stderr);
    let doc: serde_json::Value = serde_json::from_str(&ran.stdout).expect("stdout is the JSON");
    assert_eq!(doc["lines"][0]["line"], "L1");
    // The summary moves to standard error, and the workbook is still written beside the input.
    assert!(ran.stderr.contains("L1"), "{}", ran.stderr);
    assert_eq!(entries(&dir), ["station.audit.xlsx", "station.xlsx"]);
}

#[test]
fn audit_fail_on_exits_1_at_or_above_its_severity() {
    let dir = temp_dir("fail-on");
    let input = write(&dir, "station.xlsx", &with_a_warning());
    let (plain, doc) = audit(&input, &[]);
    assert_eq!(plain.code, Some(0), "{}", plain.stderr);
    let doc = doc.expect("json");
    let warning = doc["findings"]
        .as_array()
        .unwrap()
        .iter()
        .find(|f| f["code"] == "same-size-reducer")
        .expect("the reducer's finding");
    assert_eq!(warning["severity"], "warning");
    assert!(
        doc["findings"]
            .as_array()
            .unwrap()
            .iter()
            .all(|f| f["severity"] != "error")
    );
    assert_eq!(audit(&input, &["--fail-on", "warning"]).0.code, Some(1));
    // A warning is below the error threshold.
    assert_eq!(audit(&input, &["--fail-on", "error"]).0.code, Some(0));
    let clean = write(&dir, "clean.xlsx", &base_station());
    assert_eq!(audit(&clean, &["--fail-on", "warning"]).0.code, Some(0));
}

/// Mean velocity of the base station's run, from the flow and the bore: DN100 (NPS 4) schedule
/// 40 is 114.3 mm outside with a 6.02 mm wall (ASME B36.10M), so 102.26 mm inside.
fn base_velocity_m_s() -> f64 {
    let q = 50.0 / 3600.0;
    let d: f64 = 0.1143 - 2.0 * 0.00602;
    q / (std::f64::consts::PI / 4.0 * d * d)
}

#[test]
fn audit_rules_file_tightens_a_velocity_band() {
    let dir = temp_dir("rules");
    let input = write(&dir, "station.xlsx", &base_station());
    let v = base_velocity_m_s();
    // About 1.69 m/s: inside the default discharge band of 1.0–3.0 m/s (common practice,
    // src/audit/default_rules.toml), above a band capped at 1.5 m/s.
    assert!(v > 1.5 && v < 1.8, "{v}");
    let (plain, doc) = audit(&input, &[]);
    assert_eq!(plain.code, Some(0), "{}", plain.stderr);
    let doc = doc.expect("json");
    assert!(!codes(&doc).contains(&"velocity-high".to_string()));
    let speed = doc["lines"][0]["runs"][0]["velocity_m_s"]
        .as_f64()
        .expect("run velocity");
    // The audit's bore is the table's 102.26 mm: the same velocity by another route.
    assert!(rel(speed, v) <= REL_TOL_SAME_ARITHMETIC, "{speed} vs {v}");
    for (max, raised) in [(1.5, true), (1.8, false)] {
        let rules = dir.join("rules.toml");
        std::fs::write(
            &rules,
            format!("[velocity.pump-discharge]\nmax_m_s = {max}\n"),
        )
        .unwrap();
        let (ran, doc) = audit(&input, &["--rules", rules.to_str().unwrap()]);
        assert_eq!(ran.code, Some(0), "{}", ran.stderr);
        let doc = doc.expect("json");
        assert_eq!(
            codes(&doc).contains(&"velocity-high".to_string()),
            raised,
            "max {max}: {:?}",
            codes(&doc)
        );
    }
    let bad = dir.join("bad.toml");
    std::fs::write(&bad, "[velocity.pump-discharge]\nmax_m_s = \"fast\"\n").unwrap();
    let (ran, doc) = audit(&input, &["--rules", bad.to_str().unwrap()]);
    assert_eq!(ran.code, Some(2), "{}", ran.stderr);
    assert!(ran.stderr.contains("bad.toml"), "{}", ran.stderr);
    assert!(doc.is_none(), "nothing written for a bad rules file");
}

/// A sheet's rows as CSV text under an invented-data note (cells without commas).
fn csv(sheet: &Sheet) -> String {
    let width = sheet.rows[0].len();
    let mut text = format!(
        "INVENTED DATA for testing: no such plant{}\n",
        ",".repeat(width - 1)
    );
    for row in &sheet.rows {
        let cells: Vec<String> = (0..width)
            .map(|c| match row.get(c) {
                Some(Cell::S(t)) => t.clone(),
                Some(Cell::N(x)) => x.to_string(),
                _ => String::new(),
            })
            .collect();
        text.push_str(&cells.join(","));
        text.push('\n');
    }
    text
}

#[test]
fn audit_csv_tables_by_flag_read_as_the_same_sheets() {
    let dir = temp_dir("csv-flags");
    let st = base_station();
    let book = write(&dir, "station.xlsx", &st);
    let mut paths = Vec::new();
    for sh in &st {
        let path = dir.join(format!("{}.csv", sh.name));
        std::fs::write(&path, csv(sh)).unwrap();
        paths.push(path);
    }
    let [lines, pipes, fittings] = [&paths[0], &paths[1], &paths[2]].map(|p| p.to_str().unwrap());
    let (from_book, book_doc) = audit(&book, &[]);
    assert_eq!(from_book.code, Some(0), "{}", from_book.stderr);
    let ran = bin()
        .args([
            "audit",
            "--pipes",
            pipes,
            "--fittings",
            fittings,
            "--lines",
            lines,
        ])
        .arg("--json")
        .arg(dir.join("csv.json"))
        .arg("-o")
        .arg(dir.join("csv.xlsx"))
        .ran();
    assert_eq!(ran.code, Some(0), "{}", ran.stderr);
    let (a, b) = (book_doc.unwrap(), read_json(&dir.join("csv.json")));
    for key in ["friction_head_m", "fittings_head_m", "total_head_m"] {
        let (x, y) = (
            a["lines"][0][key].as_f64().unwrap(),
            b["lines"][0][key].as_f64().unwrap(),
        );
        assert!(rel(y, x) <= REL_TOL_SAME_ARITHMETIC, "{key}: {y} vs {x}");
    }
    assert_eq!(b["fittings"].as_array().unwrap().len(), 2);
    // Without the Lines table the run has no flow: refused, nothing written.
    let out = dir.join("no-lines.xlsx");
    let ran = bin()
        .args(["audit", "--pipes", pipes, "--fittings", fittings, "-o"])
        .arg(&out)
        .ran();
    assert_eq!(ran.code, Some(2), "{}", ran.stderr);
    assert!(ran.stderr.contains("Pipes.csv"), "{}", ran.stderr);
    assert!(!out.exists());
}

/// A station whose Pipes table is a sheet `Takeoff` with headers of its own, and the map that
/// names them (the Hazen–Williams C factor and bore given, so no size is needed).
fn takeoff(dir: &Path) -> (PathBuf, PathBuf) {
    let sheets = [
        Sheet::table(
            "Lines",
            &["Line", "Service", "Flow [m3/h]"],
            vec![vec![s("M1"), s("general"), n(30.0)]],
        ),
        Sheet::table(
            "Takeoff",
            &["Pipe ref", "Bore mm", "Run metres", "C factor"],
            vec![vec![s("M1"), n(80.0), n(40.0), n(120.0)]],
        ),
    ];
    let input = write(dir, "takeoff.xlsx", &sheets);
    let map = dir.join("map.toml");
    std::fs::write(
        &map,
        "[sheets]\n\"Takeoff\" = \"pipes\"\n[pipes]\n\"Pipe ref\" = \"line\"\n\"Bore mm\" = \"inner_diameter [mm]\"\n\"Run metres\" = \"length [m]\"\n",
    )
    .unwrap();
    (input, map)
}

#[test]
fn audit_and_check_map_read_a_sheet_with_other_headers() {
    let dir = temp_dir("map");
    let (input, map) = takeoff(&dir);
    let (bare, doc) = audit(&input, &[]);
    assert_eq!(bare.code, Some(2), "{}", bare.stderr);
    assert!(doc.is_none());
    let (mapped, doc) = audit(&input, &["--map", map.to_str().unwrap()]);
    assert_eq!(mapped.code, Some(0), "{}", mapped.stderr);
    let doc = doc.expect("json");
    assert_eq!(doc["lines"][0]["runs"][0]["length_m"], 40.0);
    assert_eq!(doc["lines"][0]["runs"][0]["inner_diameter_m"], 0.08);
    let check = bin().arg("check").arg(&input).arg("--map").arg(&map).ran();
    assert_eq!(check.code, Some(0), "{}", check.stderr);
    // `check` prints the mapping it used, as a map file.
    assert!(check.stdout.contains("\"Run metres\""), "{}", check.stdout);
    assert_eq!(bin().arg("check").arg(&input).ran().code, Some(2));
}

#[test]
fn kinds_json_lists_the_catalogue_with_its_sources() {
    let ran = run(&["kinds", "--json"]);
    assert_eq!(ran.code, Some(0), "{}", ran.stderr);
    let doc: serde_json::Value = serde_json::from_str(&ran.stdout).expect("JSON");
    let kinds = doc["kinds"].as_array().expect("kinds");
    // Items every fitting schedule carries (facts of the trade): both used by the base station.
    for id in ["elbow-90", "valve-gate"] {
        assert!(kinds.iter().any(|k| k["kind"] == id), "{id} missing");
    }
    for k in kinds {
        assert!(!k["source"].as_str().unwrap_or("").is_empty(), "{k}");
        let (lo, hi) = (k["band_low"].as_f64(), k["band_high"].as_f64());
        if let (Some(lo), Some(hi)) = (lo, hi) {
            assert!(lo <= hi, "{k}");
        }
    }
    // The table lists the same kinds, one a line.
    let table = run(&["kinds"]);
    for k in kinds {
        assert!(table.stdout.contains(k["kind"].as_str().unwrap()), "{k}");
    }
}

#[test]
fn template_writes_a_blank_workbook_once_in_the_units_and_layout_asked() {
    let dir = temp_dir("template");
    let mut units_row = Vec::new();
    for units in ["si", "us"] {
        let out = dir.join(format!("{units}.xlsx"));
        let ran = bin()
            .arg("template")
            .arg(&out)
            .args(["--units", units])
            .ran();
        assert_eq!(ran.code, Some(0), "{}", ran.stderr);
        assert!(ran.stdout.contains("invented"), "{}", ran.stdout);
        let cells = read_cells(&out);
        for name in ["Lines", "Pipes", "Fittings"] {
            assert!(cells.contains_key(name), "{units}: no {name} sheet");
        }
        // The Length column's unit in the units row (row 2).
        let pipes = &cells["Pipes"];
        let col = (0..64)
            .find(|&c| {
                matches!(pipes.get(&(0, c)), Some(calamine::Data::String(h)) if h.starts_with("Length"))
            })
            .expect("a Length column");
        units_row.push(pipes.get(&(1, col)).cloned());
    }
    // 1 ft = 0.3048 m (NIST SP 811): lengths in metres in SI, in feet in US units.
    assert_eq!(
        units_row,
        [
            Some(calamine::Data::String("m".into())),
            Some(calamine::Data::String("ft".into()))
        ]
    );
    // Never over an existing file: refused, the file unchanged.
    let si = dir.join("si.xlsx");
    let before = std::fs::read(&si).unwrap();
    let again = bin().arg("template").arg(&si).ran();
    assert_eq!(again.code, Some(2));
    assert!(again.stderr.contains("already exists"), "{}", again.stderr);
    assert_eq!(std::fs::read(&si).unwrap(), before);
    // The list layout: Lines plus one item list, no Pipes or Fittings sheet.
    let list = dir.join("list.xlsx");
    let ran = bin()
        .arg("template")
        .arg(&list)
        .args(["--layout", "list"])
        .ran();
    assert_eq!(ran.code, Some(0), "{}", ran.stderr);
    let cells = read_cells(&list);
    assert!(cells.contains_key("Lines"));
    assert!(!cells.contains_key("Pipes") && !cells.contains_key("Fittings"));
    assert!(bin().arg("check").arg(&list).ran().code == Some(0));
}

/// An estate of two copies of the base station in `root/estate`.
fn estate(root: &Path, stations: &[Vec<Sheet>]) -> PathBuf {
    let dir = root.join("estate");
    std::fs::create_dir_all(&dir).unwrap();
    for (i, st) in stations.iter().enumerate() {
        write(&dir, &format!("station-{i}.xlsx"), st);
    }
    dir
}

/// `lossledger review estate --json r.json -o r.xlsx EXTRA…` in `root`.
fn review(root: &Path, extra: &[&str]) -> (Ran, Option<serde_json::Value>) {
    let json = root.join("r.json");
    let ran = bin()
        .args(["review", "estate", "--json", "r.json", "-o", "r.xlsx"])
        .args(extra)
        .current_dir(root)
        .ran();
    let doc = json.exists().then(|| read_json(&json));
    (ran, doc)
}

/// Warning counts of each station of a review JSON.
fn station_warnings(doc: &serde_json::Value) -> Vec<u64> {
    doc["stations"]
        .as_array()
        .unwrap()
        .iter()
        .map(|s| s["figures"]["findings"]["warning"].as_u64().unwrap())
        .collect()
}

#[test]
fn review_rules_file_applies_to_every_station() {
    let root = temp_dir("review-rules");
    estate(&root, &[base_station(), base_station()]);
    let (plain, doc) = review(&root, &[]);
    assert_eq!(plain.code, Some(0), "{}", plain.stderr);
    let before = station_warnings(&doc.unwrap());
    // The band of audit_rules_file_tightens_a_velocity_band: each station's run is above it.
    let rules = root.join("rules.toml");
    std::fs::write(&rules, "[velocity.pump-discharge]\nmax_m_s = 1.5\n").unwrap();
    let (ran, doc) = review(&root, &["--rules", "rules.toml"]);
    assert_eq!(ran.code, Some(0), "{}", ran.stderr);
    let doc = doc.unwrap();
    let after = station_warnings(&doc);
    assert_eq!(after, before.iter().map(|w| w + 1).collect::<Vec<_>>());
    let raised = doc["findings"]
        .as_array()
        .unwrap()
        .iter()
        .filter(|f| f["code"] == "velocity-high")
        .count();
    assert_eq!(raised, 2);
}

#[test]
fn review_map_reads_every_station_with_it() {
    let root = temp_dir("review-map");
    let (input, map) = takeoff(&root);
    let dir = root.join("estate");
    std::fs::create_dir_all(&dir).unwrap();
    std::fs::rename(&input, dir.join("takeoff.xlsx")).unwrap();
    let (bare, doc) = review(&root, &[]);
    // Without the map the station cannot be read: reported and left out.
    assert!(bare.stderr.contains("takeoff.xlsx"), "{}", bare.stderr);
    if let Some(doc) = doc {
        assert_eq!(doc["totals"]["audited"], 0);
    }
    let (ran, doc) = review(&root, &["--map", map.to_str().unwrap()]);
    assert_eq!(ran.code, Some(0), "{}", ran.stderr);
    assert_eq!(doc.unwrap()["totals"]["audited"], 1);
}

/// Every text cell of the review workbook and of the station copies beside it.
fn review_texts(root: &Path) -> Vec<String> {
    let mut books = vec![root.join("r.xlsx")];
    let copies = root.join("r-stations");
    books.extend(entries(&copies).iter().map(|e| copies.join(e)));
    let mut out = Vec::new();
    for book in books {
        for cells in read_cells(&book).into_values() {
            out.extend(cells.into_values().filter_map(|d| match d {
                calamine::Data::String(t) => Some(t),
                _ => None,
            }));
        }
    }
    out
}

#[test]
fn review_units_us_labels_the_workbooks_in_feet() {
    let root = temp_dir("review-units");
    estate(&root, &[base_station()]);
    let (si, doc_si) = review(&root, &[]);
    assert_eq!(si.code, Some(0), "{}", si.stderr);
    let in_feet = |texts: &[String]| texts.iter().any(|t| t.contains("[ft]"));
    assert!(!in_feet(&review_texts(&root)));
    let (us, doc_us) = review(&root, &["--units", "us"]);
    assert_eq!(us.code, Some(0), "{}", us.stderr);
    assert!(in_feet(&review_texts(&root)));
    // The JSON stays SI.
    let (a, b) = (doc_si.unwrap(), doc_us.unwrap());
    assert_eq!(a["totals"], b["totals"]);
}

#[test]
fn review_max_cells_leaves_a_station_over_the_limit_out() {
    let root = temp_dir("review-limits");
    // A second station of twelve more fittings, so well over the first's cell count.
    let mut big = base_station();
    for i in 0..12 {
        sheet(&mut big, "Fittings").rows.push(vec![
            s(&format!("E{i}")),
            s("L1"),
            s("elbow-90"),
            s("DN100"),
            Cell::E,
            n(1.0),
        ]);
    }
    estate(&root, &[base_station(), big]);
    let (all, doc) = review(&root, &[]);
    assert_eq!(all.code, Some(0), "{}", all.stderr);
    assert_eq!(doc.unwrap()["totals"]["audited"], 2);
    // bad_input::cells_under_a_raised_limit: the base station reads under 40 cells.
    let (ran, doc) = review(&root, &["--max-cells", "40"]);
    assert_eq!(ran.code, Some(0), "{}", ran.stderr);
    assert!(
        ran.stderr.contains("station-1.xlsx") && ran.stderr.contains("--max-cells"),
        "{}",
        ran.stderr
    );
    assert_eq!(doc.unwrap()["totals"]["audited"], 1);
}

/// `audit --units us` prints the systems tables and the ranking's heads in US gpm and ft: each
/// system's duty flow and required head from the JSON (SI) converted with the exact factors of
/// NIST SP 811 (1 US gal = 3.785411784e-3 m³, 1 ft = 0.3048 m).
#[test]
fn audit_units_us_converts_the_console_systems_and_ranking() {
    let dir = temp_dir("units-us-console");
    common::bin::demo(&dir);
    let (ran, doc) = audit(&dir.join("kestrel-ridge.xlsx"), &["--units", "us"]);
    assert_eq!(ran.code, Some(0), "{}", ran.stderr);
    let doc = doc.expect("JSON written");
    let gpm = 60.0 / 3.785_411_784e-3;
    for system in doc["systems"].as_array().unwrap() {
        let name = system["system"].as_str().unwrap();
        let row = ran
            .stdout
            .lines()
            .find(|l| l.starts_with(name) && l.contains(", "))
            .unwrap_or_else(|| panic!("no systems row for {name}:\n{}", ran.stdout));
        let flow = format!("{:.1}", system["flow_m3_s"].as_f64().unwrap() * gpm);
        let head = format!(
            "{:.2}",
            system["required_head_m"].as_f64().unwrap() / 0.3048
        );
        assert!(
            row.contains(&flow) && row.contains(&head),
            "{row}: {flow} {head}"
        );
    }
    assert!(ran.stdout.contains("US gpm"), "{}", ran.stdout);
    assert!(!ran.stdout.contains("m³/h"), "{}", ran.stdout);
}
