//! `lossledger compare`: invented revision pairs built in code (every station here is invented),
//! each change checked against the two audits and, where a published formula gives the effect
//! directly, against that formula; the comparison's JSON against the two `audit` JSONs; and every
//! flag through the binary.

use lossledger::audit::Rules;
use lossledger::compare::{self, ChangeKind, Comparison, Status, Value, Verdict};
use lossledger::error::Severity;
use lossledger::ingest::{InputSource, ReadOptions};
use lossledger::pipeline::{Audited, read_and_audit};
use std::path::{Path, PathBuf};

mod common;
use common::bin::{Ran, Runs, bin, os};
use common::book::{Cell, book, n, s};
use common::facts::G;
use common::readback::{open, read_json};
use common::tol::{REL_TOL_SAME_ARITHMETIC, rel};

const LINES_H: &[&str] = &["Line", "Service", "Flow [m3/h]", "Temperature [°C]"];
// Size last, so the other columns keep their letters; the bore given overrides the size's bore.
const PIPES_H: &[&str] = &[
    "Line",
    "Seq",
    "Inner diameter [mm]",
    "Length [m]",
    "C factor",
    "Size",
];
const FITTINGS_H: &[&str] = &["Tag", "Line", "Item", "K", "Size"];
const SYSTEMS_H: &[&str] = &["System", "Lines", "Static head [m]", "Pump head [m]"];

/// One invented revision: rows of each sheet (headers above).
struct Rev {
    lines: Vec<Vec<Cell>>,
    pipes: Vec<Vec<Cell>>,
    fittings: Vec<Vec<Cell>>,
    systems: Vec<Vec<Cell>>,
}

/// Revision A of an invented booster set: a suction line, a two-run discharge line and a
/// general line. Hazen–Williams runs with given bores and K, so effects follow closed formulas.
fn rev_a() -> Rev {
    Rev {
        lines: vec![
            vec![s("S1"), s("pump-suction"), n(144.0), n(20.0)],
            vec![s("D1"), s("pump-discharge"), n(144.0), n(20.0)],
            vec![s("G1"), s("general"), n(30.0), n(20.0)],
        ],
        pipes: vec![
            vec![s("S1"), n(1.0), n(200.0), n(10.0), n(120.0), s("DN200")],
            vec![s("D1"), n(1.0), n(150.0), n(200.0), n(120.0), s("DN150")],
            vec![s("D1"), n(2.0), n(150.0), n(50.0), n(120.0), s("DN150")],
            vec![s("G1"), n(1.0), n(80.0), n(40.0), n(120.0), s("DN80")],
        ],
        fittings: vec![
            vec![s("S1-V"), s("S1"), s("gate valve"), n(0.5), s("DN200")],
            vec![s("D1-V"), s("D1"), s("gate valve"), n(0.2), s("DN150")],
            vec![s("D1-E"), s("D1"), s("90 elbow"), n(0.9), s("DN150")],
            vec![s("G1-E"), s("G1"), s("90 elbow"), n(0.9), s("DN80")],
        ],
        systems: vec![vec![s("Booster"), s("S1, D1"), n(12.0), n(30.0)]],
    }
}

/// Give a run another bore and its nominal size.
fn resize(run: &mut [Cell], bore_mm: f64, size: &'static str) {
    run[2] = n(bore_mm);
    run[5] = s(size);
}

fn write(name: &str, r: Rev) -> PathBuf {
    book(
        name,
        &[
            ("Lines", LINES_H, r.lines),
            ("Pipes", PIPES_H, r.pipes),
            ("Fittings", FITTINGS_H, r.fittings),
            ("Systems", SYSTEMS_H, r.systems),
            ("Notes", &[INVENTED], vec![]),
        ],
    )
}

/// The mark that labels these revisions' outputs as invented (`report::invented`).
const INVENTED: &str = "INVENTED DATA: a booster set made up for the compare tests";

fn side(path: &Path) -> Audited {
    let sources = [InputSource::Path(path.to_path_buf())];
    read_and_audit(&sources, &ReadOptions::default(), &Rules::default()).unwrap()
}

/// Compare revision A with A changed by `edit`; returns both audits and the comparison.
fn pair(name: &str, edit: impl FnOnce(&mut Rev)) -> (Audited, Audited, Comparison) {
    let old = side(&write(&format!("{name}-a"), rev_a()));
    let mut b = rev_a();
    edit(&mut b);
    let new = side(&write(&format!("{name}-b"), b));
    let c = compare::compare(&old, &new);
    (old, new, c)
}

fn line<'a>(a: &'a Audited, id: &str) -> &'a lossledger::audit::LineResult {
    &a.audit.lines[a.audit.line_of(id).unwrap()]
}

fn effect<'a>(c: &'a Comparison, id: &str) -> &'a compare::LineEffect {
    c.lines.iter().find(|l| l.line == id).unwrap()
}

fn of_kind(c: &Comparison, kind: ChangeKind) -> Vec<&compare::Change> {
    c.changes.iter().filter(|x| x.kind == kind).collect()
}

fn num(v: &Option<Value>) -> f64 {
    match v {
        Some(Value::Number(x)) => *x,
        other => panic!("not a number: {other:?}"),
    }
}

/// Run `lossledger compare` with `args`.
fn run(args: &[&std::ffi::OsStr]) -> Ran {
    bin().arg("compare").args(args).ran()
}

// Hazen–Williams: h = 10.67 L Q^1.852 / (C^1.852 D^4.8704) (SI form as tabulated in hydraulics
// texts, from memory), so at the same flow a run's head scales as (D_old/D_new)^4.8704.
#[test]
fn a_size_change_on_one_run_changes_head_by_the_two_audits_difference() {
    let (old, new, c) = pair("size", |b| resize(&mut b.pipes[2], 125.0, "DN125"));
    let runs = of_kind(&c, ChangeKind::RunChanged);
    let fields: Vec<_> = runs.iter().map(|r| r.field).collect();
    assert_eq!(
        fields,
        [Some("size"), Some("inner_diameter_m")],
        "{:?}",
        c.changes
    );
    assert_eq!(runs[0].old, Some(Value::Text("DN150".into())));
    assert_eq!(runs[0].new, Some(Value::Text("DN125".into())));
    assert_eq!(runs[0].new_cell.as_ref().unwrap().to_string(), "Pipes!F4");
    let r = runs[1];
    assert_eq!(r.line.as_deref(), Some("D1"));
    assert_eq!(r.item, "run 2");
    assert_eq!((num(&r.old), num(&r.new)), (0.150, 0.125));
    assert_eq!(r.new_cell.as_ref().unwrap().to_string(), "Pipes!C4");
    let e = effect(&c, "D1");
    let (lo, ln) = (line(&old, "D1"), line(&new, "D1"));
    assert_eq!(e.total_head_m.old, Some(lo.total_head_m));
    assert_eq!(e.total_head_m.new, Some(ln.total_head_m));
    assert_eq!(
        e.total_head_m.change,
        Some(ln.total_head_m - lo.total_head_m)
    );
    assert_eq!(
        e.friction_head_m.change,
        Some(ln.friction_head_m - lo.friction_head_m)
    );
    // Only run 2 changed: its old head times the Hazen–Williams ratio, less its old head.
    let run2_old = old
        .audit
        .runs
        .iter()
        .find(|r| r.cell.row == 3)
        .unwrap()
        .head_m;
    let expected = run2_old * ((150.0f64 / 125.0).powf(4.8704) - 1.0);
    assert!(rel(e.friction_head_m.change.unwrap(), expected) < REL_TOL_SAME_ARITHMETIC);
    // The largest head change is listed first; the other lines did not move.
    assert_eq!(c.lines[0].line, "D1");
    assert_eq!(effect(&c, "G1").status, Status::Unchanged);
    assert_eq!(effect(&c, "G1").total_head_m.change, Some(0.0));
    // The system's required head moves by the line's change (losses add along the system).
    let s = &c.systems[0];
    assert!(
        rel(
            s.required_head_m.change.unwrap(),
            e.total_head_m.change.unwrap()
        ) < REL_TOL_SAME_ARITHMETIC
    );
}

// Velocity head: h = K v²/(2g), v = Q/(π d²/4) (Bernoulli; any fluid mechanics text).
#[test]
fn a_fitting_added_and_one_removed_are_listed_and_priced_by_velocity_head() {
    let (old, new, c) = pair("fittings", |b| {
        b.fittings.remove(2);
        b.fittings.push(vec![
            s("D1-C"),
            s("D1"),
            s("swing check valve"),
            n(2.0),
            s("DN150"),
        ]);
    });
    let removed = of_kind(&c, ChangeKind::FittingRemoved);
    let added = of_kind(&c, ChangeKind::FittingAdded);
    assert_eq!(removed.len(), 1, "{:?}", c.changes);
    assert_eq!(added.len(), 1, "{:?}", c.changes);
    assert_eq!(removed[0].item, "D1-E");
    assert_eq!(
        removed[0].old_cell.as_ref().unwrap().to_string(),
        "Fittings!A4"
    );
    assert_eq!(added[0].item, "D1-C");
    assert_eq!(
        added[0].new_cell.as_ref().unwrap().to_string(),
        "Fittings!A5"
    );
    let e = effect(&c, "D1");
    let (lo, ln) = (line(&old, "D1"), line(&new, "D1"));
    assert_eq!(
        e.fittings_head_m.change,
        Some(ln.fittings_head_m - lo.fittings_head_m)
    );
    assert_eq!(e.friction_head_m.change, Some(0.0));
    let v = 144.0 / 3600.0 / (std::f64::consts::PI * 0.150 * 0.150 / 4.0);
    let expected = (2.0 - 0.9) * v * v / (2.0 * G);
    assert!(rel(e.fittings_head_m.change.unwrap(), expected) < REL_TOL_SAME_ARITHMETIC);
}

// Hazen–Williams: at the same pipe, h scales as Q^1.852.
#[test]
fn a_flow_change_is_a_line_change_and_scales_friction_by_the_flow_exponent() {
    let (old, new, c) = pair("flow", |b| b.lines[2][2] = n(45.0));
    let changed = of_kind(&c, ChangeKind::LineChanged);
    assert_eq!(changed.len(), 1, "{:?}", c.changes);
    assert_eq!(changed[0].field, Some("flow_m3_s"));
    assert_eq!(num(&changed[0].old), 30.0 / 3600.0);
    assert_eq!(num(&changed[0].new), 45.0 / 3600.0);
    assert_eq!(
        changed[0].new_cell.as_ref().unwrap().to_string(),
        "Lines!C4"
    );
    let e = effect(&c, "G1");
    let (lo, ln) = (line(&old, "G1"), line(&new, "G1"));
    assert_eq!(
        e.total_head_m.change,
        Some(ln.total_head_m - lo.total_head_m)
    );
    let expected = lo.friction_head_m * (1.5f64.powf(1.852) - 1.0);
    assert!(rel(e.friction_head_m.change.unwrap(), expected) < REL_TOL_SAME_ARITHMETIC);
    // Fittings: K v²/2g scales as the square of the flow.
    assert!(
        rel(e.fittings_head_m.change.unwrap(), lo.fittings_head_m * 1.25) < REL_TOL_SAME_ARITHMETIC
    );
    assert!(e.max_velocity_m_s.change.unwrap() > 0.0);
}

#[test]
fn a_line_removed_and_another_added() {
    let (old, new, c) = pair("addremove", |b| {
        b.lines[2] = vec![s("G2"), s("general"), n(20.0), n(20.0)];
        b.pipes[3] = vec![s("G2"), n(1.0), n(65.0), n(12.0), n(130.0), s("DN65")];
        b.fittings.pop();
    });
    let removed = of_kind(&c, ChangeKind::LineRemoved);
    let added = of_kind(&c, ChangeKind::LineAdded);
    assert_eq!(removed.len(), 1, "{:?}", c.changes);
    assert_eq!(added.len(), 1, "{:?}", c.changes);
    assert_eq!(removed[0].line.as_deref(), Some("G1"));
    assert_eq!(added[0].line.as_deref(), Some("G2"));
    assert!(!added[0].note.contains("renamed"), "{}", added[0].note);
    // No run or fitting rows for lines that are added or removed whole.
    assert!(c.changes.iter().all(|x| !matches!(
        x.kind,
        ChangeKind::RunAdded | ChangeKind::FittingAdded | ChangeKind::FittingRemoved
    )));
    let g1 = effect(&c, "G1");
    assert_eq!(g1.status, Status::Removed);
    assert_eq!(g1.total_head_m.new, None);
    assert_eq!(g1.total_head_m.change, Some(-line(&old, "G1").total_head_m));
    let g2 = effect(&c, "G2");
    assert_eq!(g2.status, Status::Added);
    assert_eq!(g2.total_head_m.change, Some(line(&new, "G2").total_head_m));
}

#[test]
fn a_renamed_line_is_removed_and_added_with_a_hint() {
    let (_, _, c) = pair("rename", |b| {
        b.lines[2][0] = s("G1-R");
        b.pipes[3][0] = s("G1-R");
        b.fittings[3][1] = s("G1-R");
    });
    let added = of_kind(&c, ChangeKind::LineAdded);
    let removed = of_kind(&c, ChangeKind::LineRemoved);
    assert_eq!((added.len(), removed.len()), (1, 1), "{:?}", c.changes);
    assert!(
        added[0].note.contains("match removed line G1"),
        "{}",
        added[0].note
    );
    assert!(
        removed[0].note.contains("match added line G1-R"),
        "{}",
        removed[0].note
    );
}

#[test]
fn a_pump_head_cut_flips_the_duty_verdict_as_an_error() {
    let (old, new, c) = pair("verdict", |b| b.systems[0][3] = n(20.0));
    let s = &c.systems[0];
    assert_eq!(s.duty.old, Some(Verdict::Holds));
    assert_eq!(s.duty.new, Some(Verdict::Fails));
    assert!(s.worse);
    assert_eq!(s.required_head_m.change, Some(0.0));
    let new_sys = &new.audit.systems[0];
    assert_eq!(s.margin_m.new, new_sys.margin_m);
    assert_eq!(s.margin_m.old, old.audit.systems[0].margin_m);
    let flips = of_kind(&c, ChangeKind::VerdictChanged);
    assert_eq!(flips.len(), 1, "{:?}", c.changes);
    assert_eq!(flips[0].severity, Severity::Error);
    assert_eq!(flips[0].field, Some("duty"));
    // The audit's own finding appears as well, with its severity.
    let appeared = of_kind(&c, ChangeKind::FindingAppeared);
    assert!(
        appeared.iter().any(|f| f.item == "pump-head-short"),
        "{appeared:?}"
    );
    assert_eq!(c.worst(), Some(Severity::Error));
}

#[test]
fn untagged_fittings_are_matched_by_line_kind_and_size_and_say_so() {
    let untag = |r: &mut Rev| {
        for f in &mut r.fittings {
            f[0] = Cell::E;
        }
    };
    let old = side(&write("untagged-a", {
        let mut a = rev_a();
        untag(&mut a);
        a
    }));
    let mut b = rev_a();
    untag(&mut b);
    b.fittings[2][3] = n(1.2);
    let new = side(&write("untagged-b", b));
    let c = compare::compare(&old, &new);
    assert_eq!(c.matching.fittings_by_line_kind_size, 4);
    assert_eq!(c.matching.fittings_by_tag, 0);
    let changed = of_kind(&c, ChangeKind::FittingChanged);
    assert_eq!(changed.len(), 1, "{:?}", c.changes);
    assert_eq!(changed[0].field, Some("k"));
    assert!(
        changed[0].note.contains("line, kind and size"),
        "{}",
        changed[0].note
    );
}

#[test]
fn runs_without_seq_are_matched_by_position_and_say_so() {
    let drop_seq = |r: &mut Rev| {
        for p in &mut r.pipes {
            p[1] = Cell::E;
        }
    };
    let mut a = rev_a();
    drop_seq(&mut a);
    let mut b = rev_a();
    drop_seq(&mut b);
    b.pipes[2][3] = n(80.0);
    let c = compare::compare(&side(&write("noseq-a", a)), &side(&write("noseq-b", b)));
    let changed = of_kind(&c, ChangeKind::RunChanged);
    assert_eq!(changed.len(), 1, "{:?}", c.changes);
    assert_eq!(changed[0].field, Some("length_m"));
    assert!(changed[0].note.contains("position"), "{}", changed[0].note);
    assert!(c.matching.runs_by_position.contains(&"D1".to_string()));
}

#[test]
fn same_revision_twice_is_no_changes() {
    let path = write("same", rev_a());
    let c = compare::compare(&side(&path), &side(&path));
    assert!(c.unchanged(), "{:?}", c.changes);
    assert!(c.changes.is_empty());
}

// --- through the binary -------------------------------------------------------------------

fn dir_of(p: &Path) -> PathBuf {
    p.parent().unwrap().to_path_buf()
}

#[test]
fn binary_same_input_twice_prints_no_changes_and_exits_0() {
    let a = write("bin-same", rev_a());
    let out = run(&[os(&a), os(&a)]);
    let stdout = &out.stdout;
    assert_eq!(out.code, Some(0), "{}", &out.stderr);
    assert!(stdout.contains("No changes"), "{stdout}");
    assert!(stdout.contains("INVENTED DATA"), "{stdout}");
    assert!(dir_of(&a).join("bin-same.compare.xlsx").exists());
}

#[test]
fn json_numbers_equal_the_difference_of_the_two_audit_jsons_exactly() {
    let a = write("json-a", rev_a());
    let mut rb = rev_a();
    resize(&mut rb.pipes[2], 125.0, "DN125");
    rb.lines[2][2] = n(45.0);
    rb.systems[0][3] = n(24.0);
    let b = write("json-b", rb);
    let d = dir_of(&b);
    let (ja, jb, jc) = (d.join("a.json"), d.join("b.json"), d.join("c.json"));
    for (input, json) in [(&a, &ja), (&b, &jb)] {
        let o = d.join("audit.xlsx");
        let out = common::bin::run(&[
            os("audit"),
            os(input),
            os("-o"),
            os(&o),
            os("--json"),
            os(json),
        ]);
        assert_eq!(out.code, Some(0));
    }
    let out = run(&[os(&a), os(&b), os("--json"), os(&jc)]);
    assert_eq!(out.code, Some(0), "{}", &out.stderr);
    let (ja, jb, jc) = (read_json(&ja), read_json(&jb), read_json(&jc));
    let audit_line = |j: &serde_json::Value, id: &str, key: &str| {
        j["lines"]
            .as_array()
            .unwrap()
            .iter()
            .find(|l| l["line"] == id)
            .unwrap()[key]
            .as_f64()
            .unwrap()
    };
    let lines = jc["lines"].as_array().unwrap();
    assert_eq!(lines.len(), 3);
    for l in lines {
        let id = l["line"].as_str().unwrap();
        for (ours, theirs) in [
            ("total_head_m", "total_head_m"),
            ("friction_head_m", "friction_head_m"),
            ("fittings_head_m", "fittings_head_m"),
            ("max_velocity_m_s", "max_velocity_m_s"),
            ("annual_cost", "annual_cost"),
        ] {
            let (o, n) = (audit_line(&ja, id, theirs), audit_line(&jb, id, theirs));
            assert_eq!(l[ours]["old"].as_f64(), Some(o), "{id} {ours}");
            assert_eq!(l[ours]["new"].as_f64(), Some(n), "{id} {ours}");
            assert_eq!(l[ours]["change"].as_f64(), Some(n - o), "{id} {ours}");
        }
    }
    let sys = |j: &serde_json::Value, key: &str| j["systems"][0][key].as_f64().unwrap();
    let s = &jc["systems"][0];
    for key in ["required_head_m", "pump_head_m", "margin_m"] {
        assert_eq!(s[key]["old"].as_f64(), Some(sys(&ja, key)), "{key}");
        assert_eq!(s[key]["new"].as_f64(), Some(sys(&jb, key)), "{key}");
        assert_eq!(
            s[key]["change"].as_f64(),
            Some(sys(&jb, key) - sys(&ja, key)),
            "{key}"
        );
    }
    let cost = |j: &serde_json::Value| j["energy"]["total_annual_cost"].as_f64().unwrap();
    assert_eq!(
        jc["energy"]["annual_cost"]["change"].as_f64(),
        Some(cost(&jb) - cost(&ja))
    );
    assert_eq!(jc["new"]["sha256"], jb["input"]["sha256"]);
    assert_eq!(jc["old"]["sha256"], ja["input"]["sha256"]);
    let note = jc["invented_data_note"].as_str().unwrap();
    assert!(note.starts_with("old side: INVENTED DATA"), "{note}");
}

#[test]
fn flag_output_writes_the_workbook_where_asked_with_its_sheets_and_links() {
    use calamine::{Data, Reader};
    let a = write("out-a", rev_a());
    let mut rb = rev_a();
    resize(&mut rb.pipes[2], 125.0, "DN125");
    let b = write("out-b", rb);
    let target = dir_of(&b).join("elsewhere.xlsx");
    let out = run(&[os(&a), os(&b), os("-o"), os(&target)]);
    assert_eq!(out.code, Some(0), "{}", &out.stderr);
    assert!(!dir_of(&b).join("out-b.compare.xlsx").exists());
    let mut wb = open(&target);
    let names = wb.sheet_names();
    // The input has its own Systems sheet, so the report's is named System effects.
    let expected = [
        "Changes",
        "Line effects",
        "System effects",
        "Basis",
        "Lines",
        "Pipes",
        "Fittings",
        "Systems",
        "Notes",
    ];
    assert_eq!(names, expected.map(String::from).to_vec());
    let changes = wb.worksheet_range("Changes").unwrap();
    let row = (1..changes.height() as u32)
        .find(|&r| changes.get_value((r, 4)) == Some(&Data::String("Inner diameter".into())))
        .expect("a row for the changed bore");
    assert_eq!(
        changes.get_value((row, 1)),
        Some(&Data::String("run changed".into()))
    );
    assert_eq!(
        changes.get_value((row, 8)),
        Some(&Data::String("Pipes!C4".into()))
    );
    assert_eq!(changes.get_value((row, 5)), Some(&Data::Float(150.0)));
    assert_eq!(changes.get_value((row, 6)), Some(&Data::Float(125.0)));
    // The copy of the new input keeps its cells: the changed bore is at Pipes!C4.
    let pipes = wb.worksheet_range("Pipes").unwrap();
    assert_eq!(pipes.get_value((3, 2)), Some(&Data::Float(125.0)));
    let basis = wb.worksheet_range("Basis").unwrap();
    let text: Vec<String> = basis
        .rows()
        .flat_map(|r| r.iter().map(|c| c.to_string()))
        .collect();
    let sha = |p: &Path| lossledger::ingest::read_path(p).unwrap().sha256;
    assert!(
        text.contains(&sha(&a)) && text.contains(&sha(&b)),
        "both SHA-256 in Basis"
    );
    assert!(text.iter().any(|t| t.contains("Screening estimate")));
}

#[test]
fn flag_json_dash_prints_the_comparison_on_standard_output() {
    let a = write("jsondash", rev_a());
    let out = run(&[os(&a), os(&a), os("--json"), os("-")]);
    assert_eq!(out.code, Some(0));
    let j: serde_json::Value = serde_json::from_str(&out.stdout).unwrap();
    assert_eq!(j["changes"].as_array().unwrap().len(), 0);
    assert!(out.stderr.contains("No changes"));
}

#[test]
fn flag_fail_on_error_exits_1_when_a_verdict_gets_worse() {
    let a = write("failon-a", rev_a());
    let mut rb = rev_a();
    rb.systems[0][3] = n(20.0);
    let b = write("failon-b", rb);
    let plain = run(&[os(&a), os(&b)]);
    assert_eq!(plain.code, Some(0));
    let strict = run(&[os(&a), os(&b), os("--fail-on"), os("error")]);
    assert_eq!(strict.code, Some(1));
    // Back again: the verdict improves, nothing gets worse.
    let back = run(&[os(&b), os(&a), os("--fail-on"), os("error")]);
    assert_eq!(back.code, Some(0), "{}", &back.stdout);
}

#[test]
fn flag_fail_on_warning_exits_1_on_a_new_warning_finding() {
    // Common practice: the default discharge band tops out at 3 m/s (lossledger rules); a
    // 100 mm bore at 144 m3/h runs at about 5.1 m/s, a velocity-high warning.
    let a = write("failwarn-a", rev_a());
    let mut rb = rev_a();
    resize(&mut rb.pipes[2], 100.0, "DN100");
    let b = write("failwarn-b", rb);
    assert_eq!(
        run(&[os(&a), os(&b), os("--fail-on"), os("warning")]).code,
        Some(1)
    );
    assert_eq!(
        run(&[os(&a), os(&a), os("--fail-on"), os("warning")]).code,
        Some(0)
    );
}

#[test]
fn flag_rules_applies_to_both_sides() {
    let a = write("rules-a", rev_a());
    let mut rb = rev_a();
    rb.lines[2][2] = n(45.0);
    let b = write("rules-b", rb);
    let d = dir_of(&b);
    let rules = d.join("tariff.toml");
    std::fs::write(
        &rules,
        "[energy]\ntariff_per_kwh = 0.30\ncurrency = \"XYZ\"\n",
    )
    .unwrap();
    let j = d.join("c.json");
    let out = run(&[
        os(&a),
        os(&b),
        os("--rules"),
        os(&rules),
        os("--json"),
        os(&j),
    ]);
    assert_eq!(out.code, Some(0), "{}", &out.stderr);
    let jc = read_json(&j);
    assert_eq!(jc["energy"]["currency"], "XYZ");
    let r = Rules::from_file(&rules).unwrap();
    let audited = |p: &Path| {
        read_and_audit(
            &[InputSource::Path(p.to_path_buf())],
            &ReadOptions::default(),
            &r,
        )
        .unwrap()
    };
    let (oa, ob) = (audited(&a), audited(&b));
    assert_eq!(
        jc["energy"]["annual_cost"]["old"].as_f64(),
        Some(oa.audit.energy.total_annual_cost)
    );
    assert_eq!(
        jc["energy"]["annual_cost"]["new"].as_f64(),
        Some(ob.audit.energy.total_annual_cost)
    );
}

#[test]
fn flag_map_reads_both_sides_with_the_header_map() {
    let odd = |name: &str, len: f64| {
        book(
            name,
            &[
                (
                    "Lines",
                    LINES_H,
                    vec![vec![s("M1"), s("general"), n(30.0), n(20.0)]],
                ),
                (
                    "Takeoff",
                    &["Pipe ref", "Bore mm", "Run metres", "C factor"],
                    vec![vec![s("M1"), n(80.0), n(len), n(120.0)]],
                ),
            ],
        )
    };
    let (a, b) = (odd("map-a", 40.0), odd("map-b", 60.0));
    let map = dir_of(&b).join("map.toml");
    std::fs::write(
        &map,
        "[sheets]\n\"Takeoff\" = \"pipes\"\n[pipes]\n\"Pipe ref\" = \"line\"\n\"Bore mm\" = \"inner_diameter [mm]\"\n\"Run metres\" = \"length [m]\"\n",
    )
    .unwrap();
    let j = dir_of(&b).join("c.json");
    let out = run(&[os(&a), os(&b), os("--map"), os(&map), os("--json"), os(&j)]);
    assert_eq!(out.code, Some(0), "{}", &out.stderr);
    let jc = read_json(&j);
    let ch = &jc["changes"][0];
    assert_eq!(ch["field"], "length_m");
    assert_eq!(
        (ch["old"].as_f64(), ch["new"].as_f64()),
        (Some(40.0), Some(60.0))
    );
    assert_eq!(ch["new_cell"], "Takeoff!C2");
    // Without the map the Takeoff sheet is not a pipes table: the old side is reported bad.
    let bare = run(&[os(&a), os(&b)]);
    assert_eq!(bare.code, Some(2));
}

// NIST SP 811 (2008): 1 ft = 0.3048 m exactly.
#[test]
fn flag_units_us_reports_heads_in_feet() {
    use calamine::{Data, Reader};
    let a = write("units-a", rev_a());
    let mut rb = rev_a();
    resize(&mut rb.pipes[2], 125.0, "DN125");
    let b = write("units-b", rb);
    let o = dir_of(&b).join("us.xlsx");
    let out = run(&[os(&a), os(&b), os("--units"), os("us"), os("-o"), os(&o)]);
    assert_eq!(out.code, Some(0));
    let stdout = &out.stdout;
    assert!(stdout.contains("[ft]"), "{stdout}");
    let mut wb = open(&o);
    let sheet = wb.worksheet_range("Line effects").unwrap();
    assert_eq!(
        sheet.get_value((0, 3)),
        Some(&Data::String("Total head new [ft]".into()))
    );
    let new_total = line(&side(&b), "D1").total_head_m;
    let Some(Data::Float(ft)) = sheet.get_value((1, 3)) else {
        panic!("no number")
    };
    // Six significant figures in the workbook.
    assert!(rel(*ft, new_total / 0.3048) < 1e-5, "{ft}");
}

#[test]
fn a_bad_new_side_is_named_and_nothing_is_written() {
    let a = write("bad-a", rev_a());
    let mut rb = rev_a();
    rb.pipes[1][3] = n(-5.0);
    let b = write("bad-b", rb);
    let j = dir_of(&b).join("bad.json");
    let out = run(&[os(&a), os(&b), os("--json"), os(&j)]);
    let stderr = &out.stderr;
    assert_eq!(out.code, Some(2), "{stderr}");
    assert!(stderr.contains("new: error"), "{stderr}");
    assert!(stderr.contains("Pipes!D3"), "{stderr}");
    assert!(!stderr.contains("old: error"), "{stderr}");
    assert!(!dir_of(&b).join("bad-b.compare.xlsx").exists());
    assert!(!j.exists());
}

#[test]
fn an_unreadable_old_side_is_named_and_nothing_is_written() {
    let b = write("unreadable-b", rev_a());
    let a = dir_of(&b).join("not-a-workbook.xlsx");
    std::fs::write(&a, b"this is not a zip file").unwrap();
    let out = run(&[os(&a), os(&b)]);
    let stderr = &out.stderr;
    assert_eq!(out.code, Some(2), "{stderr}");
    assert!(stderr.contains("old revision"), "{stderr}");
    assert!(!dir_of(&b).join("unreadable-b.compare.xlsx").exists());
}

#[test]
fn the_output_never_overwrites_an_input() {
    let a = write("overwrite-a", rev_a());
    let out = run(&[os(&a), os(&a), os("-o"), os(&a)]);
    assert_eq!(out.code, Some(2));
    assert!(lossledger::ingest::read_path(&a).unwrap().error_count() == 0);
}

// The messy fixtures and their canonical twins hold the same station (tests/messy.rs): written
// another way (US units, decimal commas, NPS for DN, flow on the runs, CSV folder…) is no change.
#[test]
fn each_messy_fixture_compares_to_no_changes_against_its_canonical_twin() {
    let dir = Path::new(env!("CARGO_MANIFEST_DIR")).join("fixtures/messy");
    let mut compared = 0;
    for entry in std::fs::read_dir(&dir).unwrap() {
        let twin = entry.unwrap().path();
        let name = twin.file_name().unwrap().to_str().unwrap().to_string();
        let Some(stem) = name.strip_suffix(".canonical.xlsx") else {
            continue;
        };
        let messy = [dir.join(format!("{stem}.xlsx")), dir.join(stem)]
            .into_iter()
            .find(|p| p.exists())
            .unwrap();
        let map_file = dir.join(format!("{stem}.map.toml"));
        let options = ReadOptions {
            map: map_file
                .exists()
                .then(|| lossledger::ingest::HeaderMap::from_file(&map_file).unwrap()),
            ..ReadOptions::default()
        };
        let read = |p: &Path| {
            read_and_audit(
                &[InputSource::Path(p.to_path_buf())],
                &options,
                &Rules::default(),
            )
            .unwrap()
        };
        let c = compare::compare(&read(&messy), &read(&twin));
        assert!(c.unchanged(), "{stem}: {:?}", c.changes);
        compared += 1;
    }
    assert_eq!(compared, 14);
}

#[test]
fn the_same_pair_gives_a_byte_identical_workbook() {
    let a = write("bytes-a", rev_a());
    let mut rb = rev_a();
    rb.fittings[1][3] = n(0.4);
    let b = write("bytes-b", rb);
    let d = dir_of(&b);
    let (x, y) = (d.join("x.xlsx"), d.join("y.xlsx"));
    for o in [&x, &y] {
        assert_eq!(run(&[os(&a), os(&b), os("-o"), os(o)]).code, Some(0));
    }
    assert_eq!(std::fs::read(&x).unwrap(), std::fs::read(&y).unwrap());
}

#[test]
fn worse_changes_come_first() {
    let (_, _, c) = pair("order", |b| {
        b.systems[0][3] = n(20.0);
        b.lines[2][2] = n(45.0);
    });
    let sev: Vec<Severity> = c.changes.iter().map(|x| x.severity).collect();
    let mut sorted = sev.clone();
    sorted.sort_by(|a, b| b.cmp(a));
    assert_eq!(sev, sorted);
    assert_eq!(c.changes[0].kind, ChangeKind::VerdictChanged);
}

// NPSH margin rule (lossledger rules, common practice): NPSHa must reach
// max(1.1 × NPSHr, NPSHr + 0.6 m). At 20 °C with 2 m of submergence NPSHa is about 12 m
// (standard atmosphere 101.325 kPa, vapour pressure 2.34 kPa: IAPWS-IF97), so an NPSHr of 3 m
// holds and one of 12 m fails.
#[test]
fn an_npsh_required_raise_flips_the_npsh_verdict_as_an_error() {
    let headers: &[&str] = &[
        "System",
        "Lines",
        "Static head [m]",
        "Pump head [m]",
        "NPSH required [m]",
        "Suction level [m]",
    ];
    let rev = |name: &str, npshr: f64| {
        let r = rev_a();
        let systems = vec![vec![
            s("Booster"),
            s("S1, D1"),
            n(12.0),
            n(30.0),
            n(npshr),
            n(2.0),
        ]];
        side(&book(
            name,
            &[
                ("Lines", LINES_H, r.lines),
                ("Pipes", PIPES_H, r.pipes),
                ("Fittings", FITTINGS_H, r.fittings),
                ("Systems", headers, systems),
            ],
        ))
    };
    let (old, new) = (rev("npsh-a", 3.0), rev("npsh-b", 12.0));
    let c = compare::compare(&old, &new);
    let s = &c.systems[0];
    assert_eq!(
        (s.npsh.old, s.npsh.new),
        (Some(Verdict::Holds), Some(Verdict::Fails))
    );
    assert_eq!(
        (s.duty.old, s.duty.new),
        (Some(Verdict::Holds), Some(Verdict::Holds))
    );
    let a = s.npsh_available_m.new.unwrap();
    assert!((11.0..13.0).contains(&a), "NPSHa {a}");
    assert_eq!(s.npsh_available_m.old, s.npsh_available_m.new);
    let flip = of_kind(&c, ChangeKind::VerdictChanged);
    assert_eq!(flip.len(), 1, "{:?}", c.changes);
    assert_eq!(
        (flip[0].field, flip[0].severity),
        (Some("npsh"), Severity::Error)
    );
    assert_eq!(flip[0].new_cell.as_ref().unwrap().to_string(), "Systems!E2");
    let input = of_kind(&c, ChangeKind::SystemChanged);
    assert_eq!(input.len(), 1);
    assert_eq!((num(&input[0].old), num(&input[0].new)), (3.0, 12.0));
}
