//! The fitting catalogue: one table of kinds (data). Aliases are matched after
//! [`super::normalise_item`], so they are written the way people write them.

use super::opening::{BUTTERFLY, DIAPHRAGM, GATE, GLOBE, PLUG_COCK};
use super::{Group, Kind, Model, OpeningCurve, VelocityRef};

const DARBY: &str = "Darby, Chemical Engineering 106(7) 1999, Table 1; Darby, Chemical Engineering \
                     Fluid Mechanics 2nd ed. 2001, Table 7-3 (3-K constants)";
const HOOPER: &str = "Hooper, Chemical Engineering 88(17) 1981, Table 1 (2-K constants)";
const RH_BEND: &str = "Rennels & Hudson, Pipe Flow, Wiley 2012, Sect. 15.1 Eq. 15.1 (after Ito 1960)";
const RH_MITRE: &str = "Rennels & Hudson, Pipe Flow, Wiley 2012, Sect. 15.2 Eq. 15.2";
const RH_EXP: &str = "Borda-Carnot; Rennels & Hudson, Pipe Flow, Wiley 2012, Sect. 11.1 Eq. 11.1";
const RH_DIFF: &str = "Rennels & Hudson, Pipe Flow, Wiley 2012, Sect. 11.2 Eqs. 11.3-11.6";
const RH_CON: &str = "Rennels & Hudson, Pipe Flow, Wiley 2012, Sect. 12.1 Eqs. 12.1-12.2";
const RH_CON_R: &str = "Rennels & Hudson, Pipe Flow, Wiley 2012, Sect. 12.2 Eqs. 12.3-12.4";
const RH_CON_C: &str = "Rennels & Hudson, Pipe Flow, Wiley 2012, Sect. 12.3 Eqs. 12.5-12.7";
const RH_REDUCER: &str = "Rennels & Hudson, Pipe Flow, Wiley 2012, Sects. 11.2/12.3; default 30 deg \
                          included cone: common practice (no source), ASME B16.9 concentric reducer \
                          lengths give about 15-30 deg (from memory)";
const RH_ENT: &str = "Rennels & Hudson, Pipe Flow, Wiley 2012, Sect. 9.1";
const RH_ENT_R: &str = "Rennels & Hudson, Pipe Flow, Wiley 2012, Sect. 9.2 Eqs. 9.1-9.2";
const RH_ENT_B: &str = "Rennels & Hudson, Pipe Flow, Wiley 2012, Sect. 9.3 Eqs. 9.3-9.4";
const RH_ENT_P: &str = "Rennels & Hudson, Pipe Flow, Wiley 2012, Sect. 9.4 Eq. 9.5";
const RH_EXIT: &str = "Rennels & Hudson, Pipe Flow, Wiley 2012, Sect. 10 (K = 1, turbulent)";
const ISO5167: &str = "ISO 5167-2:2003 Eq. 4 (Reader-Harris/Gallagher C, flange tappings) and \
                       Sect. 5.4.1 Eq. 7 (pressure loss); ISO 5167-1:2003 Eq. 1";
const NO_SOURCE: &str = "common practice (no source)";

// Bands (low, high multipliers). All common practice (no source) unless stated.
const B_FITTING: (f64, f64) = (0.8, 1.25);
const B_VALVE: (f64, f64) = (0.7, 1.4);
const B_HOOPER: (f64, f64) = (0.7, 1.4);
const B_CHECK: (f64, f64) = (0.2, 3.0);
const B_STRAINER: (f64, f64) = (0.5, 2.0);
const B_AREA: (f64, f64) = (0.8, 1.2);
const B_DIFF: (f64, f64) = (0.7, 1.4);
const B_TIGHT: (f64, f64) = (0.9, 1.1);

#[allow(clippy::too_many_arguments)]
const fn kind(
    id: &'static str,
    description: &'static str,
    aliases: &'static [&'static str],
    model: Model,
    reference: VelocityRef,
    source: &'static str,
    band: (f64, f64),
    group: Group,
    partial_opening: Option<&'static OpeningCurve>,
) -> Kind {
    Kind {
        id,
        description,
        aliases,
        model,
        reference,
        source,
        band_low: band.0,
        band_high: band.1,
        group,
        partial_opening,
    }
}

const fn darby(k1: f64, ki: f64, kd: f64) -> Model {
    Model::Darby3K { k1, ki, kd }
}

const fn hooper(k1: f64, kinf: f64) -> Model {
    Model::Hooper2K { k1, kinf }
}

use Group as G;
use VelocityRef::{OwnBore as OWN, SmallerBore as SMALL};

static CATALOGUE: &[Kind] = &[
    // ---------------- elbows (Darby 3-K) ----------------
    kind("elbow-90", "90 deg standard elbow, flanged or welded (r/D = 1)",
        &["90 elbow", "elbow", "90 deg elbow", "elbow 90", "ell 90", "90 ell", "standard elbow",
          "short radius 90 elbow", "sr elbow", "90 sr elbow", "bw elbow 90", "flanged elbow", "welded elbow",
          "elbow x90", "90° elbow"],
        darby(800.0, 0.091, 4.0), OWN, DARBY, B_FITTING, G::Elbow, None),
    kind("elbow-90-long", "90 deg long-radius elbow (r/D = 1.5)",
        &["90 lr elbow", "long radius 90", "lr 90", "lr elbow", "long radius elbow", "90 long elbow",
          "elbow 90 lr", "1.5d elbow", "90 1.5d elbow", "long sweep elbow", "lr ell"],
        darby(800.0, 0.071, 4.2), OWN, DARBY, B_FITTING, G::Elbow, None),
    kind("elbow-90-threaded", "90 deg standard elbow, threaded (r/D = 1)",
        &["90 threaded elbow", "threaded elbow", "screwed elbow", "elbow 90 thd", "90 screwed ell",
          "threaded 90"],
        darby(800.0, 0.14, 4.0), OWN, DARBY, B_FITTING, G::Elbow, None),
    kind("elbow-45", "45 deg elbow, flanged or welded (butt-weld 45s are r/D = 1.5)",
        &["45 elbow", "45 deg elbow", "elbow 45", "45 ell", "45 lr elbow", "lr 45", "long radius 45",
          "45° elbow", "elbow x45"],
        darby(500.0, 0.052, 4.0), OWN, DARBY, B_FITTING, G::Elbow, None),
    kind("elbow-45-threaded", "45 deg standard elbow, threaded (r/D = 1)",
        &["45 threaded elbow", "45 screwed elbow", "threaded 45", "elbow 45 thd"],
        darby(500.0, 0.071, 4.2), OWN, DARBY, B_FITTING, G::Elbow, None),
    kind("elbow-180", "180 deg return bend, flanged (r/D = 1)",
        &["180 return", "return bend", "180 elbow", "180 bend", "u bend", "close return",
          "180 deg return", "return elbow", "180 return bend"],
        darby(1000.0, 0.12, 4.0), OWN, DARBY, B_FITTING, G::Elbow, None),
    kind("elbow-180-long", "180 deg long-radius return (r/D = 1.5)",
        &["180 lr return", "long radius return", "180 lr elbow", "lr return bend", "180 long return"],
        darby(1000.0, 0.10, 4.0), OWN, DARBY, B_FITTING, G::Elbow, None),
    kind("elbow-180-threaded", "180 deg close-return bend, threaded (r/D = 1)",
        &["180 threaded return", "threaded return bend", "screwed return bend", "close return threaded"],
        darby(1000.0, 0.23, 4.0), OWN, DARBY, B_FITTING, G::Elbow, None),
    kind("bend-90-2d", "90 deg pipe bend r/D = 2",
        &["2d bend 90", "90 bend 2d", "bend r/d 2"],
        darby(800.0, 0.056, 3.9), OWN, DARBY, B_FITTING, G::Bend, None),
    kind("bend-90-4d", "90 deg pipe bend r/D = 4",
        &["4d bend 90", "90 bend 4d", "bend r/d 4"],
        darby(800.0, 0.066, 3.9), OWN, DARBY, B_FITTING, G::Bend, None),
    kind("bend-90-6d", "90 deg pipe bend r/D = 6",
        &["6d bend 90", "90 bend 6d", "bend r/d 6"],
        darby(800.0, 0.075, 4.2), OWN, DARBY, B_FITTING, G::Bend, None),
    // ---------------- mitres ----------------
    kind("mitre-90-1weld", "90 deg mitre elbow, one weld (one 90 deg cut)",
        &["90 mitre", "mitre 90", "90 miter", "mitred elbow", "90 mitre 1 weld", "square elbow",
          "mitre elbow 1 weld"],
        darby(1000.0, 0.27, 4.0), OWN, DARBY, (0.75, 1.35), G::Bend, None),
    kind("mitre-90-2weld", "90 deg mitre elbow, two welds (45 deg cuts)",
        &["90 mitre 2 weld", "mitre 90 2 weld", "2 weld mitre", "3 piece mitre"],
        darby(800.0, 0.068, 4.1), OWN, DARBY, (0.75, 1.35), G::Bend, None),
    kind("mitre-90-3weld", "90 deg mitre elbow, three welds (30 deg cuts)",
        &["90 mitre 3 weld", "mitre 90 3 weld", "3 weld mitre", "4 piece mitre"],
        darby(800.0, 0.035, 4.2), OWN, DARBY, (0.75, 1.35), G::Bend, None),
    kind("mitre-90-4weld", "90 deg mitre elbow, four welds (22.5 deg cuts)",
        &["90 mitre 4 weld", "mitre 90 4 weld", "4 weld mitre", "5 piece mitre"],
        hooper(800.0, 0.27), OWN, HOOPER, B_HOOPER, G::Bend, None),
    kind("mitre-90-5weld", "90 deg mitre elbow, five welds (18 deg cuts)",
        &["90 mitre 5 weld", "mitre 90 5 weld", "5 weld mitre", "6 piece mitre"],
        hooper(800.0, 0.25), OWN, HOOPER, B_HOOPER, G::Bend, None),
    kind("mitre-45-1weld", "45 deg mitre, one weld",
        &["45 mitre", "mitre 45", "45 miter", "45 mitre 1 weld"],
        darby(500.0, 0.086, 4.0), OWN, DARBY, (0.75, 1.35), G::Bend, None),
    kind("mitre-45-2weld", "45 deg mitre, two welds (22.5 deg cuts)",
        &["45 mitre 2 weld", "mitre 45 2 weld"],
        darby(500.0, 0.052, 4.0), OWN, DARBY, (0.75, 1.35), G::Bend, None),
    kind("mitre-bend", "single-joint mitre bend of any angle (angle_deg, default 90)",
        &["mitre bend", "miter bend", "mitre", "mitred bend", "segmented bend", "mitre joint"],
        Model::Mitre { default_angle_deg: 90.0 }, OWN, RH_MITRE, (0.75, 1.35), G::Bend, None),
    kind("bend", "smooth pipe bend of any r/D (default 1.5) and angle (default 90)",
        &["bend", "pipe bend", "long bend", "hot bend", "radius bend", "sweep bend", "5d bend",
          "3d bend", "elbow bend", "90 bend", "45 bend"],
        Model::Bend { default_r_d: 1.5, default_angle_deg: 90.0 }, OWN, RH_BEND, B_FITTING, G::Bend, None),
    // ---------------- tees ----------------
    kind("tee-run", "tee, flow through the run, flanged or welded",
        &["tee run", "tee through", "tee straight", "run tee", "tee thru", "straight tee",
          "tee flow through run", "tee line flow", "tee run through"],
        darby(150.0, 0.05, 4.0), OWN, DARBY, B_FITTING, G::Tee, None),
    kind("tee-run-threaded", "tee, flow through the run, threaded",
        &["threaded tee run", "tee run threaded", "screwed tee run", "tee through threaded"],
        darby(200.0, 0.091, 4.0), OWN, DARBY, B_FITTING, G::Tee, None),
    kind("tee-run-stub-in", "stub-in (set-on) branch connection, flow through the run",
        &["stub in run", "stub in tee run", "set on branch run", "weldolet run", "olet run"],
        darby(100.0, 0.0, 0.0), OWN, DARBY, B_FITTING, G::Tee, None),
    kind("tee-branch", "tee, flow through the branch (used as elbow), flanged or welded",
        &["tee branch", "branch tee", "tee side", "tee as elbow", "tee side outlet", "tee branch flow",
          "tee through branch", "bullhead tee", "side tee"],
        darby(800.0, 0.28, 4.0), OWN, DARBY, B_FITTING, G::Tee, None),
    kind("tee-branch-threaded", "tee, flow through the branch, threaded",
        &["threaded tee branch", "tee branch threaded", "screwed tee branch", "tee side threaded"],
        darby(500.0, 0.274, 4.0), OWN, DARBY, B_FITTING, G::Tee, None),
    kind("tee-branch-swept", "swept (long-radius, r/D = 1.5) tee, flow through the branch",
        &["swept tee", "swept tee branch", "long radius tee", "lr tee branch"],
        darby(800.0, 0.14, 4.0), OWN, DARBY, B_FITTING, G::Tee, None),
    kind("tee-branch-stub-in", "stub-in (set-on) branch connection, flow through the branch",
        &["stub in branch", "stub in tee branch", "set on branch", "weldolet", "olet branch", "stub in"],
        darby(1000.0, 0.34, 4.0), OWN, DARBY, B_FITTING, G::Tee, None),
    // ---------------- valves ----------------
    kind("valve-gate", "gate valve, full bore (opening = h/D)",
        &["gate valve", "gate vlv", "gv", "gate", "sluice valve", "wedge gate valve", "gate v",
          "isolating gate valve", "knife gate valve"],
        darby(300.0, 0.037, 3.9), OWN, DARBY, B_VALVE, G::Valve, Some(&GATE)),
    kind("valve-globe", "globe valve, standard pattern, full size (opening = lift fraction)",
        &["globe valve", "globe vlv", "globe", "glv", "stop valve", "regulating valve"],
        darby(1500.0, 1.7, 3.6), OWN, DARBY, B_VALVE, G::Valve, Some(&GLOBE)),
    kind("valve-globe-y", "Y-pattern (oblique) globe valve, i.e. 45 deg angle valve",
        &["y globe valve", "y pattern globe", "oblique globe valve", "y valve", "angle valve 45",
          "45 angle valve", "y type globe"],
        darby(950.0, 0.25, 4.0), OWN, DARBY, B_VALVE, G::Valve, Some(&GLOBE)),
    kind("valve-angle", "90 deg angle valve, full size",
        &["angle valve", "angle vlv", "90 angle valve", "angle globe valve", "angle pattern valve"],
        darby(1000.0, 0.69, 4.0), OWN, DARBY, B_VALVE, G::Valve, Some(&GLOBE)),
    kind("valve-ball", "ball valve, full bore (opening = 1 - rotation/90 deg)",
        &["ball valve", "ball vlv", "ball valve fb", "full bore ball valve", "fb ball valve",
          "full port ball valve", "bv", "ball", "ball v"],
        darby(300.0, 0.017, 3.5), OWN, DARBY, B_VALVE, G::Valve, Some(&PLUG_COCK)),
    kind("valve-ball-reduced", "ball valve, reduced bore (beta about 0.9)",
        &["reduced bore ball valve", "ball valve rb", "rb ball valve", "reduced port ball valve",
          "standard port ball valve"],
        hooper(500.0, 0.15), OWN, HOOPER, B_HOOPER, G::Valve, Some(&PLUG_COCK)),
    kind("valve-plug", "plug valve (cock), straight through (opening = 1 - rotation/90 deg)",
        &["plug valve", "plug vlv", "plug cock", "cock", "plug", "lubricated plug valve"],
        darby(300.0, 0.084, 3.9), OWN, DARBY, B_VALVE, G::Valve, Some(&PLUG_COCK)),
    kind("valve-plug-reduced", "plug valve, reduced trim (beta about 0.8)",
        &["reduced bore plug valve", "plug valve rb", "reduced port plug valve"],
        hooper(1000.0, 0.25), OWN, HOOPER, B_HOOPER, G::Valve, Some(&PLUG_COCK)),
    kind("valve-plug-branch", "three-way plug valve, flow through the branch",
        &["3 way plug valve branch", "three way plug branch", "3 way valve branch"],
        darby(500.0, 0.41, 4.0), OWN, DARBY, B_VALVE, G::Valve, None),
    kind("valve-plug-3way-run", "three-way plug valve, flow straight through",
        &["3 way plug valve", "three way plug valve", "3 way valve", "3 way plug valve run", "3 way valve run"],
        darby(300.0, 0.14, 4.0), OWN, DARBY, B_VALVE, G::Valve, None),
    kind("valve-butterfly", "butterfly valve (opening = 1 - disc angle/90 deg)",
        &["butterfly valve", "butterfly vlv", "bfv", "butterfly", "bfly valve", "wafer butterfly valve",
          "lug butterfly valve", "butterfly v"],
        hooper(800.0, 0.25), OWN, HOOPER, B_HOOPER, G::Valve, Some(&BUTTERFLY)),
    kind("valve-diaphragm", "diaphragm valve, dam (weir) type",
        &["diaphragm valve", "diaphragm vlv", "weir valve", "diaphragm", "saunders valve"],
        darby(1000.0, 0.69, 4.9), OWN, DARBY, B_VALVE, G::Valve, Some(&DIAPHRAGM)),
    // ---------------- check valves ----------------
    kind("check-swing", "swing check valve",
        &["swing check", "swing check valve", "check valve", "nrv", "non return valve", "swing nrv",
          "flap valve", "check vlv", "chk valve", "reflux valve"],
        darby(1500.0, 0.46, 4.0), OWN, DARBY, B_CHECK, G::CheckValve, None),
    kind("check-lift", "lift (piston/disc) check valve",
        &["lift check", "lift check valve", "piston check valve", "disc check valve", "lift nrv",
          "globe check valve", "disk check"],
        darby(2000.0, 2.85, 3.8), OWN, DARBY, B_CHECK, G::CheckValve, None),
    kind("check-tilting-disk", "tilting-disc check valve",
        &["tilting disk check", "tilting disc check valve", "tilting check", "tilting disk nrv",
          "tilting disc nrv"],
        hooper(1000.0, 0.5), OWN, HOOPER, B_CHECK, G::CheckValve, None),
    // ---------------- strainers ----------------
    kind("strainer-y", "Y-type strainer, clean K 2.5 times fouling",
        &["y strainer", "y type strainer", "wye strainer", "strainer y", "y strnr", "strainer"],
        Model::Strainer { k_clean: 2.5 }, OWN, NO_SOURCE, B_STRAINER, G::Strainer, None),
    kind("strainer-basket", "basket (pot) strainer, clean K 1.5 times fouling",
        &["basket strainer", "pot strainer", "strainer basket", "simplex strainer", "bucket strainer"],
        Model::Strainer { k_clean: 1.5 }, OWN, NO_SOURCE, B_STRAINER, G::Strainer, None),
    kind("foot-valve", "foot valve with strainer (suction inlet), clean K 15 times fouling",
        &["foot valve", "foot valve with strainer", "foot vlv", "foot valve strainer", "suction foot valve"],
        Model::Strainer { k_clean: 15.0 }, OWN,
        "Hydraulic Institute, Pipe Friction Manual, 3rd ed. 1961, foot valve K = 15; value from memory",
        B_CHECK, G::Strainer, None),
    // ---------------- entrances / exit ----------------
    kind("entrance-sharp", "sharp-edged flush entrance from a vessel",
        &["entrance", "sharp entrance", "square edged entrance", "flush entrance", "pipe entrance",
          "tank outlet", "vessel outlet", "inlet from tank", "entry", "sharp entry", "pipe inlet"],
        Model::EntranceSharp, OWN, RH_ENT, B_AREA, G::Entrance, None),
    kind("entrance-rounded", "rounded flush entrance, r/d by bend_radius_d (default 0.1)",
        &["rounded entrance", "bellmouth", "bell mouth entrance", "radiused entrance", "rounded inlet",
          "bellmouth inlet", "rounded entry"],
        Model::EntranceRounded { default_r_d: 0.1 }, OWN, RH_ENT_R, B_AREA, G::Entrance, None),
    kind("entrance-projecting", "inward-projecting (re-entrant) entrance, t/d by length_ratio (default 0)",
        &["projecting entrance", "re entrant entrance", "reentrant inlet", "inward projecting entrance",
          "protruding entrance", "projecting inlet", "borda entrance"],
        Model::EntranceProjecting { default_t_d: 0.0 }, OWN, RH_ENT_P, B_AREA, G::Entrance, None),
    kind("entrance-beveled", "beveled (chamfered) flush entrance, l/d default 0.1, angle default 45",
        &["beveled entrance", "bevelled entrance", "chamfered entrance", "beveled inlet", "chamfered inlet"],
        Model::EntranceBeveled { default_l_d: 0.1, default_angle_deg: 45.0 }, OWN, RH_ENT_B, B_AREA,
        G::Entrance, None),
    kind("exit", "pipe exit into a vessel or reservoir (K = 1)",
        &["exit", "pipe exit", "outlet to tank", "tank inlet", "vessel inlet", "discharge to tank",
          "exit loss", "outlet into tank", "discharge into tank", "free discharge"],
        Model::Fixed { k: 1.0 }, OWN, RH_EXIT, B_TIGHT, G::Exit, None),
    // ---------------- area changes ----------------
    kind("expansion", "sudden expansion (Borda-Carnot), K on the smaller (inlet) bore",
        &["expansion", "sudden expansion", "enlargement", "sudden enlargement", "abrupt expansion"],
        Model::SuddenExpansion, SMALL, RH_EXP, B_TIGHT, G::AreaChange, None),
    kind("contraction", "sudden (sharp-edged) contraction, K on the smaller (outlet) bore",
        &["contraction", "sudden contraction", "abrupt contraction", "sharp contraction", "reduction"],
        Model::SuddenContraction, SMALL, RH_CON, B_AREA, G::AreaChange, None),
    kind("contraction-rounded", "rounded contraction, r/d2 by bend_radius_d (default 0.1)",
        &["rounded contraction", "radiused contraction"],
        Model::RoundedContraction { default_r_d: 0.1 }, SMALL, RH_CON_R, B_AREA, G::AreaChange, None),
    kind("contraction-conical", "conical contraction, included angle by angle_deg (default 30)",
        &["conical contraction", "tapered contraction", "cone contraction", "gradual contraction"],
        Model::ConicalContraction { default_angle_deg: 30.0 }, SMALL, RH_CON_C, B_AREA, G::AreaChange, None),
    kind("diffuser-conical", "conical diffuser (gradual expansion), included angle by angle_deg (default 30)",
        &["diffuser", "conical diffuser", "expansion conical", "conical expansion", "gradual expansion",
          "taper expansion", "cone expansion", "diffuser conical"],
        Model::ConicalDiffuser { default_angle_deg: 30.0 }, SMALL, RH_DIFF, B_DIFF, G::AreaChange, None),
    kind("reducer", "concentric/eccentric reducer or expander; direction from d_in/d_out, cone default 30 deg",
        &["reducer", "concentric reducer", "eccentric reducer", "conc reducer", "ecc reducer", "expander",
          "increaser", "reducing", "conc red", "ecc red", "swage", "reducer expander"],
        Model::Reducer { default_angle_deg: 30.0 }, SMALL, RH_REDUCER, B_DIFF, G::AreaChange, None),
    // ---------------- meters / other ----------------
    kind("orifice-plate", "square-edged orifice plate by beta, permanent loss on the pipe bore",
        &["orifice plate", "orifice", "restriction orifice", "ro", "flow orifice", "orifice meter",
          "orifice flange"],
        Model::OrificePlate, OWN, ISO5167, B_TIGHT, G::Meter, None),
    kind("flowmeter-full-bore", "full-bore flow meter (electromagnetic, ultrasonic): K = 0",
        &["magflow meter", "mag meter", "magmeter", "electromagnetic flowmeter", "flowmeter", "flow meter",
          "ultrasonic flowmeter", "emf", "full bore meter", "meter"],
        Model::Fixed { k: 0.0 }, OWN, NO_SOURCE, B_TIGHT, G::Meter, None),
    kind("equivalent-length", "equivalent length Le/D: K = f_T Le/D",
        &["le/d", "equivalent length", "l/d", "leq"],
        Model::EquivalentLength, OWN,
        "fully turbulent Colebrook limit f_T of the pipe's eps/D times Le/D", (0.7, 1.5), G::Other, None),
    kind("given", "K, Kv or Cv given in the schedule (blank item)",
        &["given", "k", "kv", "cv", "other", "misc", "special", "k given", "kv given", "cv given"],
        Model::Given, OWN, "given in schedule", GIVEN_PLACEHOLDER, G::Other, None),
];

/// Band placeholder of the `given` kind (the real bands are applied per given value, see
/// `GIVEN_K_BAND` and `GIVEN_KV_BAND`).
const GIVEN_PLACEHOLDER: (f64, f64) = (0.9, 1.1);

/// The whole catalogue, in a stable order.
pub fn catalogue() -> &'static [Kind] {
    CATALOGUE
}

/// Kind by exact id.
pub fn find_kind(id: &str) -> Option<&'static Kind> {
    CATALOGUE.iter().find(|k| k.id == id)
}
