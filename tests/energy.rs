//! Energy review: arithmetic against the hand-worked example of docs/energy.md, energy basis
//! resolution, gravity lines, ranking (ties, no energy data, rank stability), payback,
//! suggestions, `throttled-valve`, partial rules files and the JSON names.

use lossledger::audit::Rules;
use lossledger::audit::energy::{
    EnergyBasis, OPERATING_POINT_CAUTION, RankBasis, RankItem, loss_energy, payback_years, rank,
};
use std::path::PathBuf;

mod common;
use common::book::{Cell, book, n, s};
use common::facts::G;
use common::library::audit;
use common::tol::{REL_TOL_EXACT, REL_TOL_SAME_ARITHMETIC, rel};

// Source: docs/energy.md, worked example 1 (hand-worked, step by step).
#[test]
fn energy_arithmetic_matches_the_hand_worked_example() {
    let basis = EnergyBasis {
        efficiency: 0.70,
        hours_per_year: 5000.0,
        tariff_per_kwh: 0.12,
        kg_co2_per_kwh: 0.4,
    };
    let dp = 998.2 * G * 4.0;
    assert!(rel(dp, 39_155.992_12) < REL_TOL_SAME_ARITHMETIC, "Δp {dp}");
    let e = loss_energy(39_155.992_12, 0.05, &basis).unwrap();
    for (got, want) in [
        (e.power_loss_w, 1_957.799_606),
        (e.electrical_power_w, 2_796.856_580),
        (e.annual_energy_kwh, 13_984.282_90),
        (e.annual_cost, 1_678.113_948),
        (e.annual_co2_kg, 5_593.713_160),
    ] {
        assert!(rel(got, want) < REL_TOL_SAME_ARITHMETIC, "{want}: {e:?}");
    }
}

#[test]
fn loss_energy_refuses_bad_inputs() {
    let b = EnergyBasis {
        efficiency: 0.0,
        hours_per_year: 100.0,
        tariff_per_kwh: 0.1,
        kg_co2_per_kwh: 0.0,
    };
    assert!(loss_energy(1000.0, 0.01, &b).is_none());
    let b = EnergyBasis {
        efficiency: 1.2,
        ..b
    };
    assert!(loss_energy(1000.0, 0.01, &b).is_none());
    let b = EnergyBasis {
        efficiency: 0.6,
        ..b
    };
    assert!(loss_energy(f64::NAN, 0.01, &b).is_none());
    assert!(loss_energy(-1.0, 0.01, &b).is_none());
}

// Three identical lines whose efficiency comes from Lines, Systems and the rules; hours from
// Lines or the rules. Expected ratios follow from the definitions E ∝ 1/η and E ∝ t.
#[test]
fn efficiency_and_hours_come_from_lines_then_systems_then_rules() {
    let path = book(
        "basis",
        &[
            (
                "Lines",
                &[
                    "Line",
                    "Service",
                    "Flow [m3/h]",
                    "Efficiency [%]",
                    "Hours per year",
                    "System",
                ],
                vec![
                    vec![
                        s("A"),
                        s("pump-discharge"),
                        n(60.0),
                        n(50.0),
                        n(1000.0),
                        Cell::E,
                    ],
                    vec![
                        s("B"),
                        s("pump-discharge"),
                        n(60.0),
                        Cell::E,
                        n(1000.0),
                        s("SB"),
                    ],
                    vec![
                        s("C"),
                        s("pump-discharge"),
                        n(60.0),
                        Cell::E,
                        Cell::E,
                        Cell::E,
                    ],
                ],
            ),
            (
                "Pipes",
                &["Line", "Size", "Schedule", "Length [m]"],
                vec![
                    vec![s("A"), s("DN100"), s("40"), n(50.0)],
                    vec![s("B"), s("DN100"), s("40"), n(50.0)],
                    vec![s("C"), s("DN100"), s("40"), n(50.0)],
                ],
            ),
            (
                "Systems",
                &["System", "Lines", "Efficiency [%]"],
                vec![vec![s("SB"), s("B"), n(80.0)]],
            ),
        ],
    );
    let a = audit(&path, &Rules::default());
    let cost = |id: &str| {
        a.lines
            .iter()
            .find(|l| l.line == id)
            .unwrap()
            .annual_cost
            .unwrap()
    };
    let (ca, cb, cc) = (cost("A"), cost("B"), cost("C"));
    assert!(
        rel(ca / cc, (0.65 / 0.50) * (1000.0 / 4000.0)) < REL_TOL_EXACT,
        "{ca} {cc}"
    );
    assert!(
        rel(cb / cc, (0.65 / 0.80) * (1000.0 / 4000.0)) < REL_TOL_EXACT,
        "{cb} {cc}"
    );
    assert!(rel(a.energy.total_annual_cost, ca + cb + cc) < REL_TOL_EXACT);
}

#[test]
fn gravity_lines_cost_no_pump_energy_and_rank_after_by_head() {
    let path = book(
        "gravity",
        &[
            (
                "Lines",
                &["Line", "Service", "Flow [m3/h]"],
                vec![
                    vec![s("P"), s("pump-discharge"), n(60.0)],
                    vec![s("G"), s("gravity"), n(200.0)],
                ],
            ),
            (
                "Pipes",
                &["Line", "Size", "Schedule", "Length [m]"],
                vec![
                    vec![s("P"), s("DN100"), s("40"), n(10.0)],
                    vec![s("G"), s("DN150"), s("40"), n(10.0)],
                ],
            ),
            (
                "Fittings",
                &["Tag", "Line", "Item", "Qty"],
                vec![
                    vec![s("P-E"), s("P"), s("elbow-90"), n(1.0)],
                    vec![s("G-V"), s("G"), s("valve-globe"), n(1.0)],
                ],
            ),
        ],
    );
    let a = audit(&path, &Rules::default());
    let g = a.lines.iter().find(|l| l.line == "G").unwrap();
    assert!(g.annual_cost.is_none() && g.annual_energy_kwh.is_none());
    assert!(g.power_loss_w.unwrap() > 0.0);
    let gv = a.fittings.iter().find(|f| &*f.tag == "G-V").unwrap();
    let pe = a.fittings.iter().find(|f| &*f.tag == "P-E").unwrap();
    assert!(gv.annual_cost.is_none());
    assert!(
        gv.head_m > pe.head_m,
        "the gravity valve loses more head than the pumped elbow"
    );
    assert_eq!(pe.rank, Some(1));
    assert_eq!(gv.rank, Some(2));
    assert_eq!(gv.ranking.unwrap().basis, RankBasis::HeadLoss);
    assert!(
        rel(
            a.energy.total_annual_cost,
            a.lines
                .iter()
                .find(|l| l.line == "P")
                .unwrap()
                .annual_cost
                .unwrap()
        ) < 1e-12
    );
}

fn item(e: Option<(f64, f64, f64)>, h: (f64, f64, f64)) -> RankItem {
    RankItem {
        energy_kwh: e,
        head_m: h,
    }
}

#[test]
fn ties_share_a_rank_and_shares_add_up() {
    let r = rank(&[
        item(Some((100.0, 90.0, 110.0)), (1.0, 0.9, 1.1)),
        item(Some((300.0, 290.0, 310.0)), (3.0, 2.9, 3.1)),
        item(Some((100.0, 90.0, 110.0)), (1.0, 0.9, 1.1)),
        item(Some((50.0, 45.0, 55.0)), (0.5, 0.45, 0.55)),
    ]);
    let ranks: Vec<usize> = r.iter().map(|x| x.rank).collect();
    assert_eq!(ranks, vec![2, 1, 2, 4]);
    assert!(rel(r[1].share, 300.0 / 550.0) < REL_TOL_EXACT);
    assert!(
        rel(r[3].cumulative_share, 1.0) < REL_TOL_EXACT,
        "the last item closes the cumulative share"
    );
    assert!(
        rel(r[2].cumulative_share, 500.0 / 550.0) < REL_TOL_EXACT,
        "ties are taken in input order"
    );
}

#[test]
fn items_without_energy_data_rank_after_by_head() {
    let r = rank(&[
        item(None, (5.0, 4.0, 6.0)),
        item(Some((10.0, 9.0, 11.0)), (0.1, 0.09, 0.11)),
        item(None, (7.0, 6.0, 8.0)),
    ]);
    assert_eq!(r.iter().map(|x| x.rank).collect::<Vec<_>>(), vec![3, 1, 2]);
    assert_eq!(r[0].basis, RankBasis::HeadLoss);
    assert_eq!(r[1].basis, RankBasis::AnnualCost);
    assert!(
        rel(r[2].share, 7.0 / 12.0) < REL_TOL_EXACT,
        "head items share their own total"
    );
}

#[test]
fn a_rank_that_moves_more_than_a_few_places_is_uncertain() {
    // Ten well-separated items with ±5 % bands, plus one with a band wide enough to pass six of them.
    let mut items: Vec<RankItem> = (1..=10)
        .map(|i| {
            let v = 100.0 * i as f64;
            item(Some((v, 0.95 * v, 1.05 * v)), (v, v, v))
        })
        .collect();
    items.push(item(Some((550.0, 150.0, 1500.0)), (1.0, 1.0, 1.0)));
    let r = rank(&items);
    for x in &r[..10] {
        assert!(!x.uncertain || (x.rank as i64 - 6).abs() <= 4, "{x:?}");
    }
    assert_eq!(r[9].rank, 1);
    assert!(
        !r[9].uncertain,
        "the top item cannot be passed by more than one other: {:?}",
        r[9]
    );
    let wide = r[10];
    assert_eq!(wide.rank, 6);
    assert!(wide.uncertain, "{wide:?}");
    assert_eq!(wide.best, 1);
    assert_eq!(wide.worst, 10);
    // An item whose band overlaps only its neighbours holds.
    let r2 = rank(&items[..10]);
    assert!(
        r2.iter().all(|x| !x.uncertain && x.worst - x.best <= 2),
        "{r2:?}"
    );
}

#[test]
fn payback_is_none_without_a_cost_or_a_saving_and_never_negative() {
    assert_eq!(payback_years(None, Some(100.0)), None);
    assert_eq!(payback_years(Some(1000.0), None), None);
    assert_eq!(payback_years(Some(1000.0), Some(0.0)), None);
    assert_eq!(payback_years(Some(1000.0), Some(-5.0)), None);
    assert_eq!(payback_years(Some(-1000.0), Some(5.0)), None);
    assert_eq!(payback_years(Some(1000.0), Some(250.0)), Some(4.0));
    assert_eq!(payback_years(Some(0.0), Some(250.0)), Some(0.0));
}

fn valve_book(name: &str, service: &'static str, opening: f64) -> PathBuf {
    book(
        name,
        &[
            (
                "Lines",
                &["Line", "Service", "Flow [m3/h]"],
                vec![vec![s("L1"), s(service), n(80.0)]],
            ),
            (
                "Pipes",
                &["Line", "Size", "Schedule", "Length [m]"],
                vec![vec![s("L1"), s("DN100"), s("40"), n(30.0)]],
            ),
            (
                "Fittings",
                &[
                    "Tag",
                    "Line",
                    "Item",
                    "Qty",
                    "Opening [%]",
                    "Replacement cost",
                ],
                vec![
                    vec![
                        s("V1"),
                        s("L1"),
                        s("valve-gate"),
                        n(1.0),
                        n(opening),
                        Cell::E,
                    ],
                    vec![s("E1"), s("L1"), s("elbow-90"), n(2.0), Cell::E, n(400.0)],
                    vec![
                        s("E2"),
                        s("L1"),
                        s("elbow-90-long"),
                        n(1.0),
                        Cell::E,
                        n(400.0),
                    ],
                ],
            ),
        ],
    )
}

#[test]
fn a_throttled_valve_on_a_pumped_line_is_flagged_with_its_energy() {
    let a = audit(
        &valve_book("throttle", "pump-discharge", 50.0),
        &Rules::default(),
    );
    let f = a
        .findings
        .iter()
        .find(|f| f.code == "throttled-valve")
        .expect("throttled-valve raised");
    assert_eq!(f.tag.as_deref(), Some("V1"));
    assert!(
        f.message.contains("kWh") && f.message.contains("50 %"),
        "{}",
        f.message
    );
    let v = a.fittings.iter().find(|x| &*x.tag == "V1").unwrap();
    let s = v.suggestion.as_ref().expect("open fully is suggested");
    assert!(s.replace_with.contains("speed control"));
    assert!(s.k_after < v.k && s.annual_saving.unwrap() > 0.0);
    assert_eq!(s.payback_years, None, "no replacement cost given");
    // Opening the valve moves the operating point: the suggestion and the finding carry the
    // caution about doing it before speed control or trimming (pump runs out along its curve).
    assert_eq!(s.caution, Some(OPERATING_POINT_CAUTION));
    for text in [OPERATING_POINT_CAUTION, f.action.as_str()] {
        for words in [
            "speed control or impeller trimming",
            "more flow",
            "NPSH required",
        ] {
            assert!(text.contains(words), "{words}: {text}");
        }
        assert!(text.contains("overload"), "{text}");
    }
    let e1 = a.fittings.iter().find(|x| &*x.tag == "E1").unwrap();
    assert_eq!(
        e1.suggestion.as_ref().unwrap().caution,
        Some(OPERATING_POINT_CAUTION),
        "every suggestion on a pumped line moves the operating point"
    );

    let open = audit(
        &valve_book("open", "pump-discharge", 90.0),
        &Rules::default(),
    );
    assert!(
        !open.findings.iter().any(|f| f.code == "throttled-valve"),
        "90 % is above the 80 % rule"
    );
    let gravity = audit(
        &valve_book("gravity-valve", "gravity", 50.0),
        &Rules::default(),
    );
    assert!(
        !gravity.findings.iter().any(|f| f.code == "throttled-valve"),
        "gravity lines burn no pump energy"
    );
    let g1 = gravity.fittings.iter().find(|x| &*x.tag == "E1").unwrap();
    assert_eq!(
        g1.suggestion.as_ref().unwrap().caution,
        None,
        "no pump on a gravity line"
    );
    let strict = Rules::from_toml("[valve]\nmin_opening = 0.95\n", "t").unwrap();
    assert!(
        audit(&valve_book("strict", "pump-discharge", 90.0), &strict)
            .findings
            .iter()
            .any(|f| f.code == "throttled-valve")
    );
}

#[test]
fn standard_elbows_get_long_radius_with_payback_and_long_radius_gets_nothing() {
    let a = audit(
        &valve_book("elbows", "pump-discharge", 100.0),
        &Rules::default(),
    );
    let e1 = a.fittings.iter().find(|x| &*x.tag == "E1").unwrap();
    let s = e1
        .suggestion
        .as_ref()
        .expect("standard elbow has a suggestion");
    assert!(
        s.replace_with.contains("elbow-90-long"),
        "{}",
        s.replace_with
    );
    assert!(s.k_after < e1.k);
    let saving = s.annual_saving.unwrap();
    assert!(saving > 0.0 && saving < e1.annual_cost.unwrap());
    assert!(rel(s.payback_years.unwrap(), 400.0 / saving) < REL_TOL_EXACT);
    let e2 = a.fittings.iter().find(|x| &*x.tag == "E2").unwrap();
    assert!(e2.suggestion.is_none());
}

#[test]
fn a_partial_rules_file_keeps_the_other_defaults() {
    let r = Rules::from_toml(
        "[energy]\ntariff_per_kwh = 0.3\n[npsh]\nsite_elevation_m = 250.0\n",
        "t",
    )
    .unwrap();
    assert_eq!(r.energy.tariff_per_kwh, 0.3);
    assert_eq!(r.energy.efficiency, 0.65);
    assert_eq!(r.energy.currency, "EUR");
    assert_eq!(r.npsh.margin_ratio, 1.1);
    assert_eq!(r.npsh.site_elevation_m, 250.0);
    assert_eq!(r.valve.min_opening, 0.8);
}

#[test]
fn json_carries_the_energy_names() {
    let path = valve_book("json", "pump-discharge", 50.0);
    let input = lossledger::ingest::read_path(&path).unwrap();
    let a = lossledger::audit::run(&input, &Rules::default()).unwrap();
    let doc: serde_json::Value =
        serde_json::from_str(&lossledger::report::json::to_string(&input, &a).unwrap()).unwrap();
    for k in [
        "currency",
        "tariff_per_kwh",
        "total_annual_cost",
        "total_annual_energy_kwh",
    ] {
        assert!(doc["energy"].get(k).is_some(), "energy.{k}");
    }
    assert!(doc["systems"].is_array());
    let line = &doc["lines"][0];
    for k in ["power_loss_w", "annual_energy_kwh", "annual_cost"] {
        assert!(line[k].is_number(), "line {k}");
    }
    let f = &doc["fittings"][0];
    for k in ["power_loss_w", "annual_energy_kwh", "annual_cost", "rank"] {
        assert!(f[k].is_number(), "fitting {k}");
    }
    let s = &f["suggestion"];
    for k in ["replace_with", "k_after", "annual_saving", "payback_years"] {
        assert!(s.get(k).is_some(), "suggestion.{k}");
    }
    assert!(
        doc["fittings"]
            .as_array()
            .unwrap()
            .iter()
            .all(|f| f.get("suggestion").is_some())
    );
}
