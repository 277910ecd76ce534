//! `lossledger review` through the binary, on an invented estate written by the generator the
//! `make_estate` example uses (`examples/support/synth.rs`, every file marked INVENTED DATA).
//!
//! The reference for every figure is each station's own `lossledger audit` (its JSON and its
//! annotated copy): a review must show exactly what auditing each station alone shows.

mod common;

use calamine::{Data, Reader};
use common::bin::{Ran, Runs, bin};
use common::dirs::{entries, temp_dir};
use common::readback::{open, read_json};
use common::tol::REL_TOL_SIX_FIGURES;
use serde_json::Value;
use std::path::{Path, PathBuf};

#[path = "../examples/support/synth.rs"]
#[allow(dead_code)] // the tests take a part of the shared generator
mod synth;

/// Stations in the test estate, and their lines (small enough for a quick debug run).
const STATIONS: usize = 20;
const LINES: (usize, usize) = (2, 5);
/// The station given a bad length cell (`Pipes!F4`).
const BAD: usize = 7;

/// Write the estate into `root/estate`, with station [`BAD`] bad when `bad`.
fn estate(root: &Path, bad: bool) -> Vec<PathBuf> {
    let d = root.join("estate");
    std::fs::create_dir_all(&d).unwrap();
    let bad: &[usize] = if bad { &[BAD] } else { &[] };
    synth::write_estate(&d, STATIONS, LINES, bad)
        .unwrap()
        .into_iter()
        .map(|(p, _)| p)
        .collect()
}

fn review(args: &[&str], cwd: &Path) -> Ran {
    bin().arg("review").args(args).current_dir(cwd).ran()
}

/// Audit one station alone: its JSON, and the bytes of its annotated copy.
fn audit_alone(station: &Path, cwd: &Path, out: &Path) -> (Value, Vec<u8>) {
    let j = out.with_extension("json");
    let o = bin()
        .args([
            "audit".as_ref(),
            station.as_os_str(),
            "-o".as_ref(),
            out.as_os_str(),
        ])
        .arg("--json")
        .arg(&j)
        .current_dir(cwd)
        .ran();
    assert_eq!(o.code, Some(0), "{}", &o.stderr);
    (read_json(&j), std::fs::read(out).unwrap())
}

fn count(findings: &[Value], severity: &str) -> u64 {
    findings
        .iter()
        .filter(|f| f["severity"] == severity)
        .count() as u64
}

/// Every station's totals, counts and worst fitting in the review are its own audit's; its
/// audited copy is byte for byte the workbook `audit` writes; the bad station is reported with
/// its file and cell, listed as not audited, and the others complete.
#[test]
fn every_station_in_the_review_is_its_own_audit() {
    let root = temp_dir("alone");
    let files = estate(&root, true);
    let o = review(
        &[
            "estate",
            "-o",
            "out/review.xlsx",
            "--json",
            "out/review.json",
            "--jobs",
            "2",
        ],
        &root,
    );
    assert_eq!(o.code, Some(0), "{}", &o.stderr);
    let stderr = &o.stderr;
    assert!(stderr.contains("station-007.xlsx: Pipes!F4"), "{stderr}");
    assert!(stderr.contains("not audited"), "{stderr}");
    let r = read_json(&root.join("out/review.json"));
    let rows = r["stations"].as_array().unwrap();
    assert_eq!(rows.len(), STATIONS);
    assert_eq!(r["totals"]["audited"], STATIONS as u64 - 1);
    let mut total = 0.0;
    let mut findings = 0;
    for (i, (row, file)) in rows.iter().zip(&files).enumerate() {
        let name = file.file_stem().unwrap().to_str().unwrap();
        assert_eq!(row["station"], name);
        if i + 1 == BAD {
            assert_eq!(row["audited"], false);
            assert!(row["figures"].is_null());
            assert_eq!(row["problems"][0]["cell"], "Pipes!F4");
            assert!(
                row["problems"][0]["file"]
                    .as_str()
                    .unwrap()
                    .ends_with("station-007.xlsx")
            );
            assert!(
                !root
                    .join(format!("out/review-stations/{name}.audit.xlsx"))
                    .exists()
            );
            continue;
        }
        let rel = Path::new("estate").join(file.file_name().unwrap());
        let (alone, copy) = audit_alone(&rel, &root, &root.join(format!("alone-{name}.xlsx")));
        let f = &row["figures"];
        assert_eq!(
            f["annual_cost"], alone["energy"]["total_annual_cost"],
            "{name}"
        );
        assert_eq!(
            f["annual_energy_kwh"], alone["energy"]["total_annual_energy_kwh"],
            "{name}"
        );
        assert_eq!(f["lines"], alone["lines"].as_array().unwrap().len() as u64);
        let fittings = alone["fittings"].as_array().unwrap();
        assert_eq!(f["fittings"], fittings.len() as u64);
        let af = alone["findings"].as_array().unwrap();
        for sev in ["error", "warning", "info"] {
            assert_eq!(f["findings"][sev], count(af, sev), "{name} {sev}");
        }
        let worst = fittings.iter().find(|x| x["rank"] == 1).unwrap();
        assert_eq!(f["worst_fitting"]["fitting"], worst["tag"]);
        // One metered system (PS-1): the station's measured figures are that system's own
        // (Σ ηᵢEᵢ / ΣEᵢ = η to rounding).
        let (m, sm) = (&alone["systems"][0]["measured"], &f["measured"]);
        assert_eq!(sm["energy_kwh"], m["energy_kwh"], "{name}");
        assert_eq!(
            sm["specific_energy_kwh_m3"], m["specific_energy_kwh_m3"],
            "{name}"
        );
        let (w, ws) = (m["wire_to_water"].as_f64(), sm["wire_to_water"].as_f64());
        assert!(
            (w.unwrap() - ws.unwrap()).abs() <= 1e-12,
            "{name}: {w:?} {ws:?}"
        );
        assert_eq!(sm["lowest_system"], "PS-1", "{name}");
        assert_eq!(row["sha256"], alone["input"]["sha256"]);
        let reviewed =
            std::fs::read(root.join(format!("out/review-stations/{name}.audit.xlsx"))).unwrap();
        assert!(
            reviewed == copy,
            "{name}: the review's copy differs from `audit`'s"
        );
        total += alone["energy"]["total_annual_cost"].as_f64().unwrap();
        findings += af.len();
    }
    let t = r["totals"]["annual_cost"].as_f64().unwrap();
    // Summed in another order than here: equal to rounding (1e-12 relative).
    assert!((t - total).abs() <= 1e-12 * total, "{t} {total}");
    assert_eq!(r["findings"].as_array().unwrap().len(), findings);
}

/// The estate's worst fittings are every station's fittings ordered together by annual energy
/// (one tariff: by annual cost), as each station's audit gives them; `--ranking-rows` lists that
/// many, and says how many are left.
#[test]
fn worst_fittings_rank_all_stations_together() {
    let root = temp_dir("ranking");
    let files = estate(&root, false);
    let o = review(
        &[
            "estate",
            "-o",
            "r.xlsx",
            "--json",
            "r.json",
            "--ranking-rows",
            "15",
        ],
        &root,
    );
    assert_eq!(o.code, Some(0), "{}", &o.stderr);
    let mut all: Vec<(String, String, f64)> = Vec::new();
    for file in &files {
        let name = file.file_stem().unwrap().to_str().unwrap().to_string();
        let rel = Path::new("estate").join(file.file_name().unwrap());
        let (alone, _) = audit_alone(&rel, &root, &root.join(format!("a-{name}.xlsx")));
        for f in alone["fittings"].as_array().unwrap() {
            let e = f["annual_energy_kwh"].as_f64().unwrap();
            all.push((name.clone(), f["tag"].as_str().unwrap().to_string(), e));
        }
    }
    let total: f64 = all.iter().map(|x| x.2).sum();
    // Stable: equal costs keep station order, then input order, as the review orders ties.
    all.sort_by(|a, b| b.2.total_cmp(&a.2));
    let r = read_json(&root.join("r.json"));
    let worst = r["worst_fittings"].as_array().unwrap();
    assert_eq!(worst.len(), 15);
    assert_eq!(r["fittings_not_listed"], (all.len() - 15) as u64);
    let stations: std::collections::HashSet<&str> = worst
        .iter()
        .map(|w| w["station"].as_str().unwrap())
        .collect();
    assert!(
        stations.len() > 1,
        "the worst 15 come from one station only: {stations:?}"
    );
    for (i, (w, (station, tag, e))) in worst.iter().zip(&all).enumerate() {
        assert_eq!(
            (w["station"].as_str().unwrap(), w["tag"].as_str().unwrap()),
            (station.as_str(), tag.as_str()),
            "rank {}",
            i + 1
        );
        // Equal within 1e-12 relative share a rank (audit::energy::TIE_TOLERANCE), "1, 2, 2, 4".
        let above = all
            .iter()
            .filter(|x| x.2 > *e && x.2 - e > 1e-12 * x.2.abs().max(e.abs()))
            .count();
        assert_eq!(w["rank"], above as u64 + 1, "{station} {tag}");
        assert!(above <= i);
        assert_eq!(w["annual_energy_kwh"].as_f64().unwrap(), *e);
        let share = w["share"].as_f64().unwrap();
        assert!((share - e / total).abs() <= 1e-12, "{share} {}", e / total);
        assert!(w["copy"].as_str().unwrap().starts_with("r-stations/"));
    }
    // The sheet lists the same 15, under the chart, linked to the copies.
    let mut book = open(&root.join("r.xlsx"));
    assert_eq!(
        book.sheet_names(),
        ["Stations", "Worst fittings", "Findings", "Basis"]
    );
    let sheet = book.worksheet_range("Worst fittings").unwrap();
    let header = 24;
    assert_eq!(sheet.get((header, 0)), Some(&Data::String("Rank".into())));
    let listed = (header + 1..header + 40)
        .take_while(|&r| matches!(sheet.get((r, 0)), Some(Data::Float(_))))
        .count();
    assert_eq!(listed, 15);
    assert_eq!(
        sheet.get((header + 1, 4)),
        Some(&Data::String(all[0].0.clone()))
    );
}

/// `--strict` with a bad station: exit 2, the problem named by file and cell, and nothing
/// written (no review, no JSON, no copies folder, no temporary files).
#[test]
fn strict_exits_2_and_writes_nothing() {
    let root = temp_dir("strict");
    estate(&root, true);
    let o = review(
        &["estate", "--strict", "-o", "out.xlsx", "--json", "out.json"],
        &root,
    );
    assert_eq!(o.code, Some(2));
    let stderr = &o.stderr;
    assert!(stderr.contains("station-007.xlsx: Pipes!F4"), "{stderr}");
    assert!(stderr.contains("nothing was written"), "{stderr}");
    let left = entries(&root);
    assert_eq!(left, ["estate"], "left behind: {left:?}");
    assert_eq!(
        std::fs::read_dir(root.join("estate")).unwrap().count(),
        STATIONS
    );
}

/// The review does not depend on how many stations run at once: `--jobs 1` and `--jobs 3` give
/// byte-identical workbooks and JSON.
#[test]
fn jobs_change_nothing_in_the_outputs() {
    let root = temp_dir("jobs");
    estate(&root, true);
    for jobs in ["1", "3"] {
        let o = review(
            &[
                "estate",
                "-o",
                &format!("j{jobs}.xlsx"),
                "--json",
                &format!("j{jobs}.json"),
                "--jobs",
                jobs,
            ],
            &root,
        );
        assert_eq!(o.code, Some(0), "{}", &o.stderr);
    }
    let read = |p: &str| std::fs::read(root.join(p)).unwrap();
    let (j1, j3) = (
        String::from_utf8(read("j1.json")).unwrap(),
        String::from_utf8(read("j3.json")).unwrap(),
    );
    // The copies folder is named after the output; everything else must match.
    assert_eq!(
        j1.replace("j1-stations", "X"),
        j3.replace("j3-stations", "X")
    );
    assert_eq!(
        read("j1-stations/station-003.audit.xlsx"),
        read("j3-stations/station-003.audit.xlsx")
    );
    let o = review(&["estate", "--jobs", "0"], &root);
    assert_eq!(o.code, Some(2), "--jobs 0 is a usage error");
}

/// Without `-o` the review is `review.xlsx` with `review-stations/` in the working folder;
/// `--json -` puts the JSON on stdout. The workbook's Basis names every input's SHA-256 (as
/// `sha2` computes it here), the rules, the cautions and the invented-data label; both charts
/// are there.
#[test]
fn default_output_json_on_stdout_and_basis() {
    use sha2::{Digest, Sha256};
    let root = temp_dir("default");
    let files = estate(&root, false);
    let o = review(&["estate", "--json", "-"], &root);
    assert_eq!(o.code, Some(0), "{}", &o.stderr);
    let r: Value = serde_json::from_str(&o.stdout).unwrap();
    assert_eq!(r["invented_data"], true);
    assert!(
        r["invented_data_note"]
            .as_str()
            .unwrap()
            .starts_with("INVENTED DATA")
    );
    assert!(root.join("review.xlsx").is_file());
    assert_eq!(
        std::fs::read_dir(root.join("review-stations"))
            .unwrap()
            .count(),
        STATIONS
    );
    let mut book = open(&root.join("review.xlsx"));
    let basis = book.worksheet_range("Basis").unwrap();
    let text: Vec<String> = basis
        .rows()
        .flat_map(|r| r.iter().map(|c| c.to_string()))
        .collect();
    let all = text.join("\n");
    for f in &files {
        let sha: String = Sha256::digest(std::fs::read(f).unwrap())
            .iter()
            .map(|b| format!("{b:02x}"))
            .collect();
        assert!(all.contains(&sha), "Basis lacks {}'s SHA-256", f.display());
    }
    assert!(all.contains("INVENTED DATA"));
    assert!(all.contains("licensed engineering practice"));
    assert!(all.contains("energy.tariff_per_kwh"));
    let stations = book.worksheet_range("Stations").unwrap();
    let costs: Vec<f64> = (25..25 + STATIONS)
        .map(|r| match stations.get((r, 6)) {
            Some(Data::Float(x)) => *x,
            other => panic!("row {r}: {other:?}"),
        })
        .collect();
    for (c, row) in costs.iter().zip(r["stations"].as_array().unwrap()) {
        let j = row["figures"]["annual_cost"].as_f64().unwrap();
        // Six significant figures in the workbook (report::style::shown).
        assert!((c - j).abs() <= REL_TOL_SIX_FIGURES * j, "{c} {j}");
    }
    let zip = zip::ZipArchive::new(std::fs::File::open(root.join("review.xlsx")).unwrap()).unwrap();
    let charts = zip
        .file_names()
        .filter(|n| n.as_deref().is_ok_and(|n| n.starts_with("xl/charts/chart")))
        .count();
    assert_eq!(
        charts, 2,
        "a chart of cost by station and a Pareto chart of the worst fittings"
    );
}
