//! The description reader over invented item descriptions in three house styles: bill of
//! quantities prose, material-takeoff shorthand and asset-register exports written noun first.
//! Every description here is invented for this test.
//!
//! What each notation means is a fact of the trade: sizes as DN (ISO 6708) or NPS (ASME
//! B36.10M Table 1), schedules and weights (ASME B36.10M, B36.19M for the `S` schedules), SDR
//! (ISO 4427-2), ductile iron wall class K (EN 545), pressure ratings PN (EN 1092-1) and Class
//! (ASME B16.5); `#150` and `150 lb` are the trade's shorthand for Class 150 (common practice).

use lossledger::ingest::describe::{Role, describe};
use lossledger::ingest::parse::SizeSpec::{self, Dn, Nps, OuterDiameter};
use lossledger::physics::pipe::Material::{self, *};
use lossledger::physics::pipe::Schedule::{self, *};

/// What a description must read as: role (`run`, a kind id, `skip`, `allow`), sizes, schedule,
/// material, rating label.
struct Case {
    text: &'static str,
    role: &'static str,
    size: Option<SizeSpec>,
    size_out: Option<SizeSpec>,
    schedule: Option<Schedule>,
    material: Option<Material>,
    rating: Option<&'static str>,
}

#[allow(clippy::too_many_arguments)]
const fn c(
    text: &'static str,
    role: &'static str,
    size: Option<SizeSpec>,
    size_out: Option<SizeSpec>,
    schedule: Option<Schedule>,
    material: Option<Material>,
    rating: Option<&'static str>,
) -> Case {
    Case {
        text,
        role,
        size,
        size_out,
        schedule,
        material,
        rating,
    }
}

const N: Option<SizeSpec> = None;
const NS: Option<Schedule> = None;
const NM: Option<Material> = None;
const NR: Option<&str> = None;

fn dn(v: u16) -> Option<SizeSpec> {
    Some(Dn(v))
}
fn nps(v: f64) -> Option<SizeSpec> {
    Some(Nps(v))
}

fn bill_of_quantities() -> Vec<Case> {
    vec![
        c(
            "Supply and install DN150 PN16 flanged gate valve c/w handwheel",
            "valve-gate",
            dn(150),
            N,
            NS,
            NM,
            Some("PN16"),
        ),
        c(
            "Supply and install DI flanged pipe DN200",
            "run",
            dn(200),
            N,
            NS,
            Some(DuctileIron),
            NR,
        ),
        c(
            "Pipe, CS seamless, 150mm, Sch 40",
            "run",
            dn(150),
            N,
            Some(Sch(40)),
            Some(CarbonSteel),
            NR,
        ),
        c(
            "HDPE PE100 SDR11 pipe 110 OD",
            "run",
            Some(OuterDiameter { od_m: 0.110 }),
            N,
            Some(Sdr(11.0)),
            Some(Pe),
            NR,
        ),
        c(
            "Extra over pipe for 90 degree long radius elbows DN150",
            "elbow-90-long",
            dn(150),
            N,
            NS,
            NM,
            NR,
        ),
        c(
            "Supply and install 150 x 100 concentric reducer",
            "reducer",
            dn(150),
            dn(100),
            NS,
            NM,
            NR,
        ),
        c(
            "Butterfly valve, wafer pattern, DN300 PN10, electrically actuated",
            "valve-butterfly",
            dn(300),
            N,
            NS,
            NM,
            Some("PN10"),
        ),
        c(
            "Swing check valve DN100 PN16 flanged",
            "check-swing",
            dn(100),
            N,
            NS,
            NM,
            Some("PN16"),
        ),
        c(
            "Y-type strainer DN80 PN16 c/w 1mm mesh",
            "strainer-y",
            dn(80),
            N,
            NS,
            NM,
            Some("PN16"),
        ),
        c(
            "Ductile iron pipe K9 DN250 cement lined",
            "run",
            dn(250),
            N,
            Some(DuctileK(9)),
            Some(DuctileIron),
            NR,
        ),
        c(
            "uPVC pipe 110mm OD PN12",
            "run",
            Some(OuterDiameter { od_m: 0.110 }),
            N,
            NS,
            Some(Pvc),
            Some("PN12"),
        ),
        c(
            "Copper tube 22mm OD Type L",
            "run",
            Some(OuterDiameter { od_m: 0.022 }),
            N,
            Some(CopperL),
            Some(Copper),
            NR,
        ),
        c(
            "Supply and fix 45 deg elbow DN100",
            "elbow-45",
            dn(100),
            N,
            NS,
            NM,
            NR,
        ),
        c(
            "Ball valve full bore DN50 PN40",
            "valve-ball",
            dn(50),
            N,
            NS,
            NM,
            Some("PN40"),
        ),
        c(
            "Globe valve DN65 PN25 flanged",
            "valve-globe",
            dn(65),
            N,
            NS,
            NM,
            Some("PN25"),
        ),
        c(
            "Stainless steel pipe SS316 DN80 Sch 10S",
            "run",
            dn(80),
            N,
            Some(S10),
            Some(StainlessSteel),
            NR,
        ),
        c(
            "Galvanised steel pipe 2\" medium",
            "run",
            nps(2.0),
            N,
            NS,
            Some(GalvanisedSteel),
            NR,
        ),
        c(
            "Reducing tee DN200 x DN150",
            "unknown",
            dn(200),
            dn(150),
            NS,
            NM,
            NR,
        ),
        c(
            "Supply and install eccentric reducer 200 × 150",
            "reducer",
            dn(200),
            dn(150),
            NS,
            NM,
            NR,
        ),
        c(
            "Expansion 100 x 150 sudden",
            "expansion",
            dn(100),
            dn(150),
            NS,
            NM,
            NR,
        ),
        c(
            "Pipework in carbon steel, DN400, STD wall",
            "run",
            dn(400),
            N,
            Some(Std),
            Some(CarbonSteel),
            NR,
        ),
        c(
            "Equal tee, flow through run, DN150",
            "tee-run",
            dn(150),
            N,
            NS,
            NM,
            NR,
        ),
        c(
            "Tee branch DN100 (flow into branch)",
            "tee-branch",
            dn(100),
            N,
            NS,
            NM,
            NR,
        ),
        c(
            "90 degree long radius bends DN150",
            "unknown",
            dn(150),
            N,
            NS,
            NM,
            NR,
        ),
        c(
            "Provisional sum for pressure testing",
            "allow",
            N,
            N,
            NS,
            NM,
            NR,
        ),
        c(
            "Allow for flushing and disinfection",
            "allow",
            N,
            N,
            NS,
            NM,
            NR,
        ),
        c(
            "Pipe supports to DN150 pipework",
            "skip",
            dn(150),
            N,
            NS,
            NM,
            NR,
        ),
        c(
            "Pressure gauge 0-10 bar c/w isolating cock",
            "skip",
            N,
            N,
            NS,
            NM,
            NR,
        ),
        c(
            "Foot valve with strainer DN150",
            "foot-valve",
            dn(150),
            N,
            NS,
            NM,
            NR,
        ),
        c(
            "Bellmouth entry DN300",
            "entrance-radiused",
            dn(300),
            N,
            NS,
            NM,
            NR,
        ),
        c("Outlet to tank DN200", "exit", dn(200), N, NS, NM, NR),
        c(
            "Tank outlet, sharp edged, DN200",
            "entrance-square-edged",
            dn(200),
            N,
            NS,
            NM,
            NR,
        ),
        c(
            "Electromagnetic flowmeter DN150 PN16",
            "flowmeter-full-bore",
            dn(150),
            N,
            NS,
            NM,
            Some("PN16"),
        ),
    ]
}

fn material_takeoff() -> Vec<Case> {
    vec![
        c(
            "ELL 90 LR BW 6\" SCH40 A234",
            "elbow-90-long",
            nps(6.0),
            N,
            Some(Sch(40)),
            NM,
            NR,
        ),
        c(
            "PIPE SMLS 6\" SCH40 A106 GR B",
            "run",
            nps(6.0),
            N,
            Some(Sch(40)),
            Some(CarbonSteel),
            NR,
        ),
        c(
            "RED CONC 6\" x 4\" SCH40",
            "reducer",
            nps(6.0),
            nps(4.0),
            Some(Sch(40)),
            NM,
            NR,
        ),
        c(
            "RED ECC 8\"x6\" BW",
            "reducer",
            nps(8.0),
            nps(6.0),
            NS,
            NM,
            NR,
        ),
        c(
            "TEE RED 6\" x 4\" STD",
            "unknown",
            nps(6.0),
            nps(4.0),
            Some(Std),
            NM,
            NR,
        ),
        c(
            "GATE VLV 4\" #150 RF",
            "valve-gate",
            nps(4.0),
            N,
            NS,
            NM,
            Some("Class 150"),
        ),
        c(
            "GLOBE VLV 2\" 300#",
            "valve-globe",
            nps(2.0),
            N,
            NS,
            NM,
            Some("Class 300"),
        ),
        c(
            "CHK VLV SWING 3\" CL150",
            "check-swing",
            nps(3.0),
            N,
            NS,
            NM,
            Some("Class 150"),
        ),
        c(
            "BALL VLV FB 1-1/2\" 800 LB",
            "valve-ball",
            nps(1.5),
            N,
            NS,
            NM,
            Some("Class 800"),
        ),
        c(
            "ELL 45 LR 4\" XS",
            "elbow-45",
            nps(4.0),
            N,
            Some(Xs),
            NM,
            NR,
        ),
        c(
            "PIPE 4\" SCH80 CS",
            "run",
            nps(4.0),
            N,
            Some(Sch(80)),
            Some(CarbonSteel),
            NR,
        ),
        c(
            "PIPE 3/4\" SCH 80 SS316L",
            "run",
            nps(0.75),
            N,
            Some(Sch(80)),
            Some(StainlessSteel),
            NR,
        ),
        c(
            "PIPE 2\" 10S SS304",
            "run",
            nps(2.0),
            N,
            Some(S10),
            Some(StainlessSteel),
            NR,
        ),
        c(
            "ELL 90 SR 2\" XXS",
            "elbow-90",
            nps(2.0),
            N,
            Some(Xxs),
            NM,
            NR,
        ),
        c(
            "BFV LUG 12\" CL150",
            "valve-butterfly",
            nps(12.0),
            N,
            NS,
            NM,
            Some("Class 150"),
        ),
        c(
            "STRAINER Y 2\" #300",
            "strainer-y",
            nps(2.0),
            N,
            NS,
            NM,
            Some("Class 300"),
        ),
        c(
            "PIPE DN100/40 CS",
            "run",
            dn(100),
            N,
            Some(Sch(40)),
            Some(CarbonSteel),
            NR,
        ),
        c(
            "ELBOW 90 LR DN150/STD",
            "elbow-90-long",
            dn(150),
            N,
            Some(Std),
            NM,
            NR,
        ),
        c(
            "CONC RED DN150XDN100 SCH40",
            "reducer",
            dn(150),
            dn(100),
            Some(Sch(40)),
            NM,
            NR,
        ),
        c(
            "HDPE PIPE PE100 SDR17 DN200",
            "run",
            dn(200),
            N,
            Some(Sdr(17.0)),
            Some(Pe),
            NR,
        ),
        c(
            "PIPE HDPE SDR 11 Ø160",
            "run",
            Some(OuterDiameter { od_m: 0.160 }),
            N,
            Some(Sdr(11.0)),
            Some(Pe),
            NR,
        ),
        c(
            "3D BEND 90 DEG 8\" SCH40",
            "bend",
            nps(8.0),
            N,
            Some(Sch(40)),
            NM,
            NR,
        ),
        c(
            "MITRE 90 2 WELD 24\" STD",
            "mitre-90-2weld",
            nps(24.0),
            N,
            Some(Std),
            NM,
            NR,
        ),
        c(
            "ELL 90 THD 1\" 3000#",
            "elbow-90-threaded",
            nps(1.0),
            N,
            NS,
            NM,
            Some("Class 3000"),
        ),
        c(
            "SPOOL 6\" SCH40 CS",
            "run",
            nps(6.0),
            N,
            Some(Sch(40)),
            Some(CarbonSteel),
            NR,
        ),
        c(
            "TUBE CU 15MM OD TYPE K",
            "run",
            Some(OuterDiameter { od_m: 0.015 }),
            N,
            Some(CopperK),
            Some(Copper),
            NR,
        ),
        c(
            "PLUG VLV 4\" CL300",
            "valve-plug",
            nps(4.0),
            N,
            NS,
            NM,
            Some("Class 300"),
        ),
        c(
            "DIAPHRAGM VLV DN25 PN10",
            "valve-diaphragm",
            dn(25),
            N,
            NS,
            NM,
            Some("PN10"),
        ),
        c(
            "ORIFICE PLATE 6\" #300",
            "orifice-plate",
            nps(6.0),
            N,
            NS,
            NM,
            Some("Class 300"),
        ),
        c(
            "RO 2\" CL600",
            "orifice-plate",
            nps(2.0),
            N,
            NS,
            NM,
            Some("Class 600"),
        ),
    ]
}

fn register_export() -> Vec<Case> {
    vec![
        c(
            "VALVE, GATE, DN150, PN16",
            "valve-gate",
            dn(150),
            N,
            NS,
            NM,
            Some("PN16"),
        ),
        c(
            "STRAINER, Y-TYPE, DN200",
            "strainer-y",
            dn(200),
            N,
            NS,
            NM,
            NR,
        ),
        c(
            "PIPE, DI, DN300, 1450 M",
            "run",
            dn(300),
            N,
            NS,
            Some(DuctileIron),
            NR,
        ),
        c(
            "VALVE, BUTTERFLY, DN400, PN10, ACTUATED",
            "valve-butterfly",
            dn(400),
            N,
            NS,
            NM,
            Some("PN10"),
        ),
        c(
            "VALVE, CHECK, SWING, DN250, PN16",
            "check-swing",
            dn(250),
            N,
            NS,
            NM,
            Some("PN16"),
        ),
        c("VALVE, BALL, DN25", "valve-ball", dn(25), N, NS, NM, NR),
        c(
            "VALVE, GLOBE, DN50, PN40",
            "valve-globe",
            dn(50),
            N,
            NS,
            NM,
            Some("PN40"),
        ),
        c(
            "REDUCER, CONCENTRIC, DN300XDN200",
            "reducer",
            dn(300),
            dn(200),
            NS,
            NM,
            NR,
        ),
        c(
            "ELBOW, 90DEG, LR, DN150",
            "elbow-90-long",
            dn(150),
            N,
            NS,
            NM,
            NR,
        ),
        c("ELBOW, 45DEG, DN150", "elbow-45", dn(150), N, NS, NM, NR),
        c(
            "PUMP, CENTRIFUGAL, END SUCTION, DN150",
            "skip",
            dn(150),
            N,
            NS,
            NM,
            NR,
        ),
        c("MOTOR, ELECTRIC, 30 KW", "skip", N, N, NS, NM, NR),
        c("TANK, GRP, 50 M3", "skip", N, N, NS, NM, NR),
        c("TRANSMITTER, PRESSURE, 0-16 BAR", "skip", N, N, NS, NM, NR),
        c("INSTRUMENT, LEVEL, ULTRASONIC", "skip", N, N, NS, NM, NR),
        c(
            "METER, FLOW, ELECTROMAGNETIC, DN200",
            "flowmeter-full-bore",
            dn(200),
            N,
            NS,
            NM,
            NR,
        ),
        c(
            "PIPE, CS, DN200, SCH 40",
            "run",
            dn(200),
            N,
            Some(Sch(40)),
            Some(CarbonSteel),
            NR,
        ),
        c(
            "PIPE, HDPE, PE100, SDR11, DN250",
            "run",
            dn(250),
            N,
            Some(Sdr(11.0)),
            Some(Pe),
            NR,
        ),
        c(
            "PIPE, UPVC, DN100, PN12",
            "run",
            dn(100),
            N,
            NS,
            Some(Pvc),
            Some("PN12"),
        ),
        c(
            "PIPE, SS316, DN50, SCH 10S",
            "run",
            dn(50),
            N,
            Some(S10),
            Some(StainlessSteel),
            NR,
        ),
        c(
            "VALVE, PLUG, DN80, CLASS 150",
            "valve-plug",
            dn(80),
            N,
            NS,
            NM,
            Some("Class 150"),
        ),
        c("VALVE, FOOT, DN200", "foot-valve", dn(200), N, NS, NM, NR),
        c(
            "STRAINER, BASKET, DN300, PN16",
            "strainer-basket",
            dn(300),
            N,
            NS,
            NM,
            Some("PN16"),
        ),
        c(
            "VALVE, DIAPHRAGM, DN40",
            "valve-diaphragm",
            dn(40),
            N,
            NS,
            NM,
            NR,
        ),
        c(
            "PIPE, COPPER, 28MM OD",
            "run",
            Some(OuterDiameter { od_m: 0.028 }),
            N,
            NS,
            Some(Copper),
            NR,
        ),
        c("GAUGE, PRESSURE, 0-10 BAR", "skip", N, N, NS, NM, NR),
        c("VSD, 45 KW", "skip", N, N, NS, NM, NR),
        c(
            "EXPANSION, SUDDEN, DN100XDN200",
            "expansion",
            dn(100),
            dn(200),
            NS,
            NM,
            NR,
        ),
        c("PIPE, CI, DN150", "run", dn(150), N, NS, Some(CastIron), NR),
        c(
            "PIPE, GALV, 1-1/2\"",
            "run",
            nps(1.5),
            N,
            NS,
            Some(GalvanisedSteel),
            NR,
        ),
    ]
}

#[test]
fn descriptions_in_three_house_styles() {
    let cases: Vec<Case> = bill_of_quantities()
        .into_iter()
        .chain(material_takeoff())
        .chain(register_export())
        .collect();
    assert!(cases.len() >= 80, "{} cases", cases.len());
    let mut wrong = Vec::new();
    for case in &cases {
        let d = describe(case.text);
        let role = match d.role {
            Role::Run => "run".to_string(),
            Role::Fitting(k) => k.id.to_string(),
            Role::NotHydraulic(_) => "skip".to_string(),
            Role::Allowance => "allow".to_string(),
            Role::Unknown => "unknown".to_string(),
        };
        let rating = d.rating.as_ref().map(|r| r.label());
        let got = (
            role.as_str(),
            d.size,
            d.size_out,
            d.schedule,
            d.material,
            rating.as_deref(),
        );
        let want = (
            case.role,
            case.size,
            case.size_out,
            case.schedule,
            case.material,
            case.rating,
        );
        if format!("{got:?}") != format!("{want:?}") {
            wrong.push(format!(
                "{}\n   got  {got:?}\n   want {want:?}\n   [{}]",
                case.text,
                d.reasons()
            ));
        }
    }
    assert!(
        wrong.is_empty(),
        "{} of {} wrong:\n{}",
        wrong.len(),
        cases.len(),
        wrong.join("\n")
    );
}

/// A tee names no flow path (run or branch) and a long radius bend could be a 1.5D elbow or a
/// bend: the reader says so with the candidates instead of guessing.
#[test]
fn ambiguous_items_give_their_candidates() {
    let d = describe("Reducing tee DN200 x DN150");
    assert_eq!(d.near[..2], ["tee-run", "tee-branch"]);
    assert_eq!(d.size_out, Some(Dn(150)));
    let b = describe("90 degree long radius bends DN150");
    assert!(
        b.near.contains(&"elbow-90-long") && b.near.contains(&"bend"),
        "{:?}",
        b.near
    );
}

#[test]
fn a_length_inside_a_register_line_is_read() {
    let d = describe("PIPE, DI, DN300, 1450 M");
    assert_eq!(d.length_m, Some(1450.0));
    assert!(d.reasons().contains("pipe run: 'pipe'"), "{}", d.reasons());
}

#[test]
fn ignored_words_are_listed() {
    let d = describe("Supply and install DN150 PN16 flanged gate valve c/w handwheel");
    assert_eq!(
        d.ignored,
        ["c/w handwheel", "supply and install", "flanged"]
    );
    let e = describe("Extra over pipe for bends DN100");
    assert!(e.extra_over);
}
