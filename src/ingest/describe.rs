//! Free-text item descriptions, as estimators and asset registers write them, read into what
//! the hydraulics needs: pipe run or fitting (and which catalogue kind), sizes, schedule,
//! material and pressure rating, with the words that decided.
//!
//! House styles covered (all from the trade): bill-of-quantities prose (`Supply and install
//! DN150 PN16 flanged gate valve c/w handwheel`), material-takeoff shorthand (`ELL 90 LR BW
//! 6" SCH40 A234`), and register exports written noun first (`VALVE, GATE, DN150, PN16`).
//!
//! Reading order: sizes (reducers first, then single sizes), schedule, pressure rating, a
//! length written as its own comma-separated part (`PIPE, DI, DN300, 1450 M`), material, words
//! to ignore, pipe words; what is left is matched against the fitting catalogue
//! ([`crate::physics::fitting::match_item`]). Nothing here panics, whatever the text.

use regex::Regex;
use std::sync::OnceLock;

use super::parse::{self, SizeSpec};
use crate::physics::fitting::{self, Kind};
use crate::physics::pipe::{self, Material, Schedule};

/// What a description says the row is.
#[derive(Clone, Copy, Debug)]
pub enum Role {
    /// A pipe run (the text says pipe, tube, spool...).
    Run,
    /// A fitting of a catalogue kind.
    Fitting(&'static Kind),
    /// An item outside the flow path (pump, motor, tank, instrument, support...): the word
    /// that says so.
    NotHydraulic(&'static str),
    /// Preliminaries or an allowance, not an item (`Provisional sum`, `Allow for testing`).
    Allowance,
    /// Nothing decides: no pipe word, no fitting kind.
    Unknown,
}

impl PartialEq for Role {
    fn eq(&self, other: &Role) -> bool {
        match (self, other) {
            (Role::Fitting(a), Role::Fitting(b)) => a.id == b.id,
            (Role::NotHydraulic(a), Role::NotHydraulic(b)) => a == b,
            (a, b) => std::mem::discriminant(a) == std::mem::discriminant(b),
        }
    }
}

/// A pressure rating read from the text (`PN16`, `Class 150`, `#150`, `150 lb`). Kept and
/// shown; the hydraulics does not use it.
#[derive(Clone, Debug, PartialEq)]
pub struct Rating {
    /// As written.
    pub text: String,
    /// `PN` or `Class`.
    pub system: &'static str,
    /// The number (bar for PN, the class for Class).
    pub value: f64,
}

impl Rating {
    /// Short label: `PN16`, `Class 150`.
    pub fn label(&self) -> String {
        match self.system {
            "PN" => format!("PN{}", super::rows::format_number(self.value)),
            _ => format!("Class {}", super::rows::format_number(self.value)),
        }
    }
}

/// Everything read from one description.
#[derive(Clone, Debug, PartialEq)]
pub struct Description {
    /// Run, fitting, outside the flow path, allowance or unknown.
    pub role: Role,
    /// First (or only) size.
    pub size: Option<SizeSpec>,
    /// Second size of a reducer, expansion or reducing fitting (`150x100`).
    pub size_out: Option<SizeSpec>,
    /// Schedule or wall class.
    pub schedule: Option<Schedule>,
    /// Material.
    pub material: Option<Material>,
    /// Pressure rating (kept, not used).
    pub rating: Option<Rating>,
    /// A length written in the text as its own part (`1450 M`), m.
    pub length_m: Option<f64>,
    /// The text said `extra over`.
    pub extra_over: bool,
    /// The text says pipe/tube/spool.
    pub pipe_word: Option<String>,
    /// What was left for the catalogue match, when anything was.
    pub item_text: String,
    /// Nearest kinds when the catalogue match failed.
    pub near: Vec<&'static str>,
    /// Words that decided the role and attributes, as `what: words` entries.
    pub deciding: Vec<String>,
    /// Words ignored (`supply and install`, `flanged`, `c/w` ...).
    pub ignored: Vec<String>,
}

impl Description {
    /// The deciding words joined for display.
    pub fn reasons(&self) -> String {
        self.deciding.join("; ")
    }
}

fn re(pattern: &str) -> Regex {
    // The patterns are constants of this file; a bad one is a bug caught by the tests.
    Regex::new(pattern).unwrap_or_else(|e| panic!("bad pattern {pattern}: {e}"))
}

/// Compiled patterns, built once.
struct Patterns {
    dn_reducer: Regex,
    dn_schedule: Regex,
    inch_reducer: Regex,
    bare_reducer: Regex,
    sizes: Vec<Regex>,
    schedules: Vec<Regex>,
    ratings: Vec<(Regex, &'static str)>,
    length_part: Regex,
    materials: Regex,
}

const INCH: &str = r"(?:\d+[- ]\d+/\d+|\d+/\d+|\d+(?:\.\d+)?[½¼¾]?|[½¼¾])";
const INCH_MARK: &str = r#"(?:"|\binch(?:es)?\b|-inch\b|\bin\b)"#;

fn patterns() -> &'static Patterns {
    static P: OnceLock<Patterns> = OnceLock::new();
    P.get_or_init(|| Patterns {
        dn_reducer: re(r"\bdn\s*-?\s*(\d+)\s*(?:x|by)\s*(?:dn\s*)?(\d+)\b"),
        dn_schedule: re(r"\bdn\s*-?\s*(\d+)\s*/\s*(\d+s?|std|xs|xxs)\b"),
        inch_reducer: re(&format!(
            r"(?:^|[^\d./])({INCH})\s*{INCH_MARK}\s*(?:x|by)\s*({INCH})\s*(?:{INCH_MARK})?"
        )),
        bare_reducer: re(r"(?:^|[^\d.])(\d+)\s*(mm|nb)?\s*(?:x|by)\s*(\d+)\s*(mm|nb)?(?:$|[^\d.])"),
        sizes: [
            r"\bdn\s*-?\s*\d+\b".to_string(),
            r"\bnb\s*-?\s*\d+\b".to_string(),
            r"(?:^|[^\d.])(\d+\s*(?:mm\s*)?nb)\b".to_string(),
            format!(r"\bnps\s*-?\s*{INCH}"),
            format!(r"(?:^|[^\d./])({INCH}\s*{INCH_MARK})"),
            r"(?:^|[^\d.])(\d+(?:\.\d+)?\s*mm\s*od)\b".to_string(),
            r"(?:^|[^\d.])(\d+(?:\.\d+)?\s*od)\b".to_string(),
            r"\bod\s*\d+(?:\.\d+)?(?:\s*mm\b)?".to_string(),
            r"[ø⌀∅]\s*\d+(?:\.\d+)?(?:\s*x\s*\d+(?:\.\d+)?)?(?:\s*mm\b)?".to_string(),
            r"\bid\s*\d+(?:\.\d+)?(?:\s*mm\b)?".to_string(),
            r"(?:^|[^\d.])(\d+\s*mm)\b".to_string(),
        ]
        .iter()
        .map(|p| re(p))
        .collect(),
        schedules: [
            r"\bsch(?:edule|ed)?\.?\s*-?\s*(?:\d+s?|std|xs|xxs)\b",
            r"\bs?dr\s*-?\s*\d+(?:\.\d+)?\b",
            r"\b(?:std|xs|xxs|xh|xxh|5s|10s|40s|80s)\b",
            r"\b(?:class\s*)?k\s*-?\s*(?:7|8|9|10|12)\b",
            r"\btype\s*[klm]\b",
        ]
        .iter()
        .map(|p| re(p))
        .collect(),
        ratings: vec![
            (re(r"\bpn\s*-?\s*(\d+(?:\.\d+)?)\b"), "PN"),
            (re(r"\b(?:class|cl\.?|ansi|asme)\s*(\d+)\b"), "Class"),
            (re(r"#\s*(\d+)\b"), "Class"),
            (re(r"\b(\d+)\s*(?:#|lbs?\b)"), "Class"),
        ],
        length_part: re(r"^\s*(\d+(?:\.\d+)?)\s*(m|lm|rm|metres?|meters?|ft|lf|feet)\s*$"),
        materials: re(
            r"\b(?:carbon steel|mild steel|black steel|stainless steel|stainless|ductile iron|cast iron|grey iron|gray iron|galvani[sz]ed(?: steel)?|galv|pvc-[uo]|upvc|cpvc|pvc|hdpe|mdpe|pe\s?100|pe\s?80|pe-?x|pe|polyethylene|copper|cu|concrete|rcp|dicl|di|ci|cs|ms|gi|hdg|ss\s?(?:304|316)l?|ss|(?:304|316)l?|a106(?: gr\.? ?b)?|a53|api 5l|duplex|steel)\b",
        ),
    })
}

/// Phrases that say how an item is bought or connected, not what it is: ignored (longest first).
const IGNORED: &[&str] = &[
    "supply and install",
    "supply & install",
    "supply and fix",
    "supply and lay",
    "furnish and install",
    "supply only",
    "install only",
    "s&i",
    "supply",
    "install",
    "complete with",
    "c/w",
    "including",
    "incl.",
    "incl",
    "extra over",
    "e/o",
    "electrically actuated",
    "pneumatically actuated",
    "actuated",
    "motorised",
    "motorized",
    "raised face",
    "flanged",
    "flgd",
    "rf",
    "ff",
    "butt welded",
    "butt weld",
    "socket weld",
    "welded",
    "seamless",
    "smls",
    "plain end",
    "bevelled ends",
    "beveled ends",
    "grooved",
    "cement lined",
    "lined",
    "epoxy coated",
    "coated",
    "wrapped",
    "painted",
    "with handwheel",
    "handwheel",
    "lever operated",
    "gear operated",
    "gearbox",
    "operated",
    "as specified",
    "as spec",
    "to spec",
    "or equal",
    "or similar",
    "approved",
    "ditto",
    "nominal",
    "diameter",
    "dia",
    "new",
    "existing",
    "fittings",
    "in lengths",
    "lengths",
    "length",
    "each",
];

/// Words that make a row a pipe run.
const PIPE_WORDS: &[&str] = &[
    "pipework", "pipeline", "piping", "pipes", "pipe", "tubing", "tubes", "tube", "spools", "spool",
];

/// Words of items outside the flow path, and what they are.
const NOT_HYDRAULIC: &[(&str, &str)] = &[
    ("pumpset", "a pump"),
    ("pumps", "a pump"),
    ("pump", "a pump"),
    ("motors", "a motor"),
    ("motor", "a motor"),
    ("vsd", "a drive"),
    ("vfd", "a drive"),
    ("drive", "a drive"),
    ("starter", "a starter"),
    ("panel", "a panel"),
    ("cable", "a cable"),
    ("tanks", "a tank"),
    ("tank", "a tank"),
    ("reservoir", "a tank"),
    ("vessel", "a vessel"),
    ("sump", "a sump"),
    ("instrument", "an instrument"),
    ("transmitter", "an instrument"),
    ("transducer", "an instrument"),
    ("gauge", "an instrument"),
    ("gage", "an instrument"),
    ("thermometer", "an instrument"),
    ("thermowell", "an instrument"),
    ("sensor", "an instrument"),
    ("switch", "an instrument"),
    ("indicator", "an instrument"),
    ("analyser", "an instrument"),
    ("analyzer", "an instrument"),
    ("probe", "an instrument"),
    ("actuator", "an actuator"),
    ("supports", "a pipe support"),
    ("support", "a pipe support"),
    ("hangers", "a pipe support"),
    ("hanger", "a pipe support"),
    ("bracket", "a pipe support"),
    ("clamp", "a pipe support"),
    ("insulation", "insulation"),
    ("lagging", "insulation"),
    ("painting", "a coating"),
    ("chamber", "a chamber"),
    ("manhole", "a chamber"),
    ("thrust", "a thrust block"),
    ("excavation", "earthworks"),
    ("excavate", "earthworks"),
    ("backfill", "earthworks"),
    ("trench", "earthworks"),
    ("testing", "testing"),
    ("flushing", "testing"),
    ("commissioning", "testing"),
];

/// Words of preliminaries and allowances.
const ALLOWANCE: &[&str] = &[
    "preliminaries",
    "prelims",
    "provisional sum",
    "prime cost",
    "contingency",
    "mobilisation",
    "mobilization",
    "demobilisation",
    "allow for",
    "attendance",
    "daywork",
];

/// Kinds whose name includes a tank or vessel word (`tank outlet`, `vessel inlet`).
fn names_a_vessel(kind: &Kind) -> bool {
    kind.id.starts_with("entrance") || kind.id == "exit" || kind.id.starts_with("foot-valve")
}

/// The working copy of a description: lower case, quotes and `×` made plain, with spans blanked
/// as they are read.
struct Work {
    text: String,
}

impl Work {
    fn new(raw: &str) -> Work {
        let mut t = String::with_capacity(raw.len());
        for c in raw.chars() {
            match c {
                '”' | '“' | '″' | '〃' => t.push('"'),
                '’' | '′' | '‘' => t.push('\''),
                '×' => t.push('x'),
                '–' | '—' | '‐' => t.push('-'),
                '\u{a0}' | '\u{2009}' | '\u{202f}' | '\t' | '\n' | '\r' => t.push(' '),
                c if c.is_uppercase() => {
                    let lower: Vec<char> = c.to_lowercase().collect();
                    // Keep one character per character (positions stay meaningful).
                    t.push(if lower.len() == 1 { lower[0] } else { c });
                }
                c => t.push(c),
            }
        }
        let t = t.replace("''", "\"");
        Work { text: t }
    }

    /// Blank a byte span with spaces (same length, so later spans stay valid).
    fn blank(&mut self, start: usize, end: usize) -> String {
        let Some(taken) = self.text.get(start..end).map(str::to_string) else {
            return String::new();
        };
        self.text
            .replace_range(start..end, &" ".repeat(end - start));
        taken.trim().to_string()
    }
}

/// A standard DN (ISO 6708 series as used in ASME B36.10M Table 1) of at least 15.
fn plausible_dn(v: u32) -> bool {
    v >= 15 && u16::try_from(v).is_ok_and(|dn| pipe::dn_to_nps(dn).is_some())
}

/// Read a description. Never panics.
pub fn describe(raw: &str) -> Description {
    let p = patterns();
    let mut w = Work::new(raw);
    let mut d = Description {
        role: Role::Unknown,
        size: None,
        size_out: None,
        schedule: None,
        material: None,
        rating: None,
        length_m: None,
        extra_over: false,
        pipe_word: None,
        item_text: String::new(),
        near: Vec::new(),
        deciding: Vec::new(),
        ignored: Vec::new(),
    };
    read_sizes(p, &mut w, &mut d);
    read_schedule(p, &mut w, &mut d);
    read_rating(p, &mut w, &mut d);
    read_length_part(p, &mut w, &mut d);
    read_material(p, &mut w, &mut d);
    read_ignored(&mut w, &mut d);
    decide(&mut w, &mut d);
    d
}

fn read_sizes(p: &Patterns, w: &mut Work, d: &mut Description) {
    if let Some(c) = p.dn_schedule.captures(&w.text.clone()) {
        let m = c.get(0).map(|m| (m.start(), m.end()));
        let dn = c.get(1).and_then(|g| g.as_str().parse::<u16>().ok());
        let sch = c.get(2).and_then(|g| pipe::parse_schedule(g.as_str()));
        if let (Some((a, b)), Some(dn), Some(sch)) = (m, dn, sch) {
            let t = w.blank(a, b);
            d.size = Some(SizeSpec::Dn(dn));
            d.schedule = Some(sch);
            d.deciding.push(format!("size and schedule: '{t}'"));
        }
    }
    if d.size.is_none()
        && let Some(c) = p.dn_reducer.captures(&w.text.clone())
    {
        let a = c.get(1).and_then(|g| g.as_str().parse::<u16>().ok());
        let b = c.get(2).and_then(|g| g.as_str().parse::<u16>().ok());
        if let (Some(m), Some(a), Some(b)) = (c.get(0), a, b)
            && a > 0
            && b > 0
        {
            let t = w.blank(m.start(), m.end());
            d.size = Some(SizeSpec::Dn(a));
            d.size_out = Some(SizeSpec::Dn(b));
            d.deciding.push(format!("sizes: '{t}'"));
        }
    }
    if d.size.is_none()
        && let Some(c) = p.inch_reducer.captures(&w.text.clone())
    {
        let a = c.get(1).and_then(|g| inches(g.as_str()));
        let b = c.get(2).and_then(|g| inches(g.as_str()));
        if let (Some(g1), Some(m), Some(a), Some(b)) = (c.get(1), c.get(0), a, b) {
            let t = w.blank(g1.start(), m.end());
            d.size = Some(SizeSpec::Nps(a));
            d.size_out = Some(SizeSpec::Nps(b));
            d.deciding.push(format!("sizes: '{t}'"));
        }
    }
    if d.size.is_none()
        && let Some(c) = p.bare_reducer.captures(&w.text.clone())
    {
        let a = c.get(1).and_then(|g| g.as_str().parse::<u32>().ok());
        let b = c.get(3).and_then(|g| g.as_str().parse::<u32>().ok());
        if let (Some(g1), Some(g3), Some(a), Some(b)) = (c.get(1), c.get(3), a, b)
            && plausible_dn(a)
            && plausible_dn(b)
        {
            let end = c.get(4).map_or(g3.end(), |u| u.end());
            let t = w.blank(g1.start(), end);
            // Both are whole standard DNs: a reducer, not an outside diameter by wall.
            d.size = Some(SizeSpec::Dn(a as u16));
            d.size_out = Some(SizeSpec::Dn(b as u16));
            d.deciding.push(format!("sizes: '{t}'"));
        }
    }
    if d.size.is_some() {
        return;
    }
    for r in &p.sizes {
        let text = w.text.clone();
        for c in r.captures_iter(&text) {
            let Some(m) = c.get(1).or_else(|| c.get(0)) else {
                continue;
            };
            if let Ok(size) = parse::parse_size(m.as_str(), None) {
                let t = w.blank(m.start(), m.end());
                d.size = Some(size);
                d.deciding.push(format!("size: '{t}'"));
                return;
            }
        }
    }
}

/// Inches from `4`, `1-1/2`, `1 1/2`, `3/4`, `1.5`, `1½`, `¾`.
fn inches(t: &str) -> Option<f64> {
    match parse::parse_number_text(t, false) {
        Ok(parse::CellNumber::Value {
            value, unit: None, ..
        }) if value > 0.0 && value.is_finite() => Some(value),
        _ => None,
    }
}

fn read_schedule(p: &Patterns, w: &mut Work, d: &mut Description) {
    if d.schedule.is_some() {
        return;
    }
    for r in &p.schedules {
        let text = w.text.clone();
        if let Some(m) = r.find(&text)
            && let Some(s) = pipe::parse_schedule(m.as_str())
        {
            let t = w.blank(m.start(), m.end());
            d.schedule = Some(s);
            d.deciding.push(format!("schedule: '{t}'"));
            return;
        }
    }
}

fn read_rating(p: &Patterns, w: &mut Work, d: &mut Description) {
    for (r, system) in &p.ratings {
        let text = w.text.clone();
        if let Some(c) = r.captures(&text)
            && let (Some(m), Some(v)) = (c.get(0), c.get(1))
            && let Ok(value) = v.as_str().parse::<f64>()
        {
            let t = w.blank(m.start(), m.end());
            d.deciding.push(format!("rating: '{t}'"));
            d.rating = Some(Rating {
                text: t,
                system,
                value,
            });
            return;
        }
    }
}

fn read_length_part(p: &Patterns, w: &mut Work, d: &mut Description) {
    let text = w.text.clone();
    let mut start = 0;
    for part in text.split(',') {
        let end = start + part.len();
        if let Some(c) = p.length_part.captures(part)
            && let (Some(v), Some(u)) = (c.get(1), c.get(2))
            && let Ok(value) = v.as_str().parse::<f64>()
        {
            let factor = match u.as_str() {
                "ft" | "lf" | "feet" => crate::units::FT_M,
                _ => 1.0,
            };
            let t = w.blank(start, end);
            d.length_m = Some(value * factor);
            d.deciding.push(format!("length: '{t}'"));
            return;
        }
        start = end + 1;
    }
}

fn read_material(p: &Patterns, w: &mut Work, d: &mut Description) {
    let text = w.text.clone();
    for m in p.materials.find_iter(&text) {
        if let Some(mat) = pipe::material_from_text(m.as_str()) {
            let t = w.blank(m.start(), m.end());
            d.material = Some(mat);
            d.deciding.push(format!("material: '{t}'"));
            return;
        }
    }
}

/// Whether `word` occurs in `text` as a whole word (bounded by non-letters).
fn find_word(text: &str, word: &str) -> Option<usize> {
    let mut from = 0;
    while let Some(i) = text.get(from..).and_then(|t| t.find(word)) {
        let at = from + i;
        let before = text[..at].chars().next_back();
        let after = text[at + word.len()..].chars().next();
        let bounded = |c: Option<char>| c.is_none_or(|c| !c.is_alphanumeric());
        if bounded(before) && bounded(after) {
            return Some(at);
        }
        from = at + word.len();
    }
    None
}

/// Words after which an accessory follows (`c/w handwheel`, `including isolating cock`): the
/// rest of the text is not the item.
const ACCESSORY: &[&str] = &["c/w", "complete with", "including", "incl.", "incl"];

/// Filler words of prose descriptions, dropped before the catalogue match.
const FILLER: &[&str] = &["for", "at", "per"];

fn read_ignored(w: &mut Work, d: &mut Description) {
    let cut = ACCESSORY.iter().filter_map(|a| find_word(&w.text, a)).min();
    if let Some(at) = cut {
        let end = w.text.len();
        let t = w.blank(at, end);
        d.ignored.push(t);
    }
    for phrase in IGNORED {
        while let Some(at) = find_word(&w.text, phrase) {
            let t = w.blank(at, at + phrase.len());
            if matches!(*phrase, "extra over" | "e/o") {
                d.extra_over = true;
            }
            d.ignored.push(t);
        }
    }
}

/// Position of the first word of `words` in the text, with the word.
fn first_of<'a, T: Copy>(text: &str, words: &'a [(&'a str, T)]) -> Option<(usize, &'a str, T)> {
    words
        .iter()
        .filter_map(|(w, v)| find_word(text, w).map(|at| (at, *w, *v)))
        .min_by_key(|(at, _, _)| *at)
}

fn decide(w: &mut Work, d: &mut Description) {
    let text = w.text.clone();
    if let Some(a) = ALLOWANCE.iter().find(|a| find_word(&text, a).is_some()) {
        d.role = Role::Allowance;
        d.deciding.insert(0, format!("allowance: '{a}'"));
        return;
    }
    let pipes: Vec<(&str, ())> = PIPE_WORDS.iter().map(|p| (*p, ())).collect();
    let pipe_at = first_of(&text, &pipes);
    let not_hydraulic = first_of(&text, NOT_HYDRAULIC);
    // The catalogue match sees the text without its pipe words.
    let mut rest = text.clone();
    for (word, _) in &pipes {
        while let Some(at) = find_word(&rest, word) {
            rest.replace_range(at..at + word.len(), &" ".repeat(word.len()));
        }
    }
    let words: Vec<&str> = rest
        .split(|c: char| c.is_whitespace() || c == ',' || c == ';')
        .filter(|t| t.chars().any(char::is_alphanumeric))
        .filter(|t| !FILLER.contains(t))
        .collect();
    // A reducing tee is a tee (its flow path still has to be said), not a reducer.
    let tee = words.iter().any(|t| matches!(*t, "tee" | "tees"));
    let item: String = words
        .into_iter()
        .filter(|t| !(tee && matches!(*t, "reducing" | "red" | "reducer")))
        .collect::<Vec<_>>()
        .join(" ");
    d.item_text.clone_from(&item);
    let kind = if item.chars().any(char::is_alphabetic) {
        match fitting::match_item(&item) {
            Ok(k) if k.id != "given" => Some(k),
            Ok(_) => None,
            Err(near) => {
                d.near = near;
                None
            }
        }
    } else {
        None
    };
    // Register style names the thing first: `PUMP, CENTRIFUGAL, ...`.
    let head = text.split(',').next().unwrap_or_default();
    let head_not_hydraulic = first_of(head, NOT_HYDRAULIC)
        .filter(|(at, _, _)| head[..*at].trim().is_empty())
        .filter(|_| first_of(head, &pipes).is_none());
    if let Some((_, word, what)) = head_not_hydraulic
        && kind.is_none_or(|k| !names_a_vessel(k))
    {
        d.role = Role::NotHydraulic(what);
        d.deciding
            .insert(0, format!("not in the flow path: '{word}'"));
        return;
    }
    if let Some(k) = kind {
        d.role = Role::Fitting(k);
        d.deciding
            .insert(0, format!("fitting {}: '{}'", k.id, item.trim()));
        return;
    }
    if let Some((_, word, what)) = not_hydraulic {
        d.role = Role::NotHydraulic(what);
        d.deciding
            .insert(0, format!("not in the flow path: '{word}'"));
        return;
    }
    if let Some((_, word, ())) = pipe_at {
        d.role = Role::Run;
        d.pipe_word = Some(word.to_string());
        d.deciding.insert(0, format!("pipe run: '{word}'"));
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn patterns_compile() {
        let _ = patterns();
    }

    #[test]
    fn a_register_line_reads_noun_first() {
        let d = describe("VALVE, GATE, DN150, PN16");
        assert_eq!(
            d.role,
            Role::Fitting(fitting::find_kind("valve-gate").unwrap())
        );
        assert_eq!(d.size, Some(SizeSpec::Dn(150)));
        assert_eq!(d.rating.map(|r| r.label()), Some("PN16".into()));
    }

    proptest::proptest! {
        /// No text makes the reader panic (Unicode, digits, quotes, separators).
        #[test]
        fn never_panics(text in "\\PC{0,60}") {
            let _ = describe(&text);
        }

        /// Nor text built from the pieces the patterns look for.
        #[test]
        fn never_panics_on_near_misses(text in "[dnDNxX×\"'/ ,.0-9½¾#sSchHpPmMlL-]{0,40}") {
            let _ = describe(&text);
        }
    }
}
