//! Units of measure: the labels people write in schedule headers and cells, and their SI factors.
//!
//! Every quantity inside lossledger is SI `f64` (metres, m³/s, pascals, kg/m³, Pa·s, seconds are
//! *not* used for durations: see [`Quantity::Duration`]), with one deliberate exception:
//! temperatures are kept in **degrees Celsius** (fields are named `_c`).
//!
//! A [`Unit`] converts a value with `si = v * scale + offset`.
//!
//! # Source
//! Conversion factors: NIST Special Publication 811 (2008 edition), *Guide for the Use of the
//! International System of Units*, Appendix B.8 and B.9. The exact definitions used are
//! 1 ft = 0.3048 m, 1 in = 0.0254 m, 1 US gallon = 3.785411784 L, 1 lb = 0.45359237 kg,
//! 1 lbf/in² = 6894.757293168361 Pa (from 1 lbf = 0.45359237 kg × 9.80665 m/s²), 1 bar = 10⁵ Pa,
//! 1 atm = 101 325 Pa, 1 kgf/cm² = 98 066.5 Pa, 1 cP = 10⁻³ Pa·s, 1 P = 0.1 Pa·s.
//!
//! # Spelling rules
//! Labels are compared after removing whitespace, `_`, `^`, brackets `[]`, `()`, `{}` and
//! product dots (`·`, `⋅`, `.`, `*`), and after mapping `℃`→`°C`, `℉`→`°F`, `³`→`3`, `²`→`2`, `º`/`˚`→`°`, `μ`→`µ`, and the quote-like
//! characters `″ ” “`→`"` and `′ ’ ‘`→`'`. Case is folded except where folding would be
//! ambiguous: `MPa` (megapascal, vs. millipascal) and `Ml/d` (megalitres per day, vs. millilitres)
//! must be written with a capital M.
//!
//! Gauge vs absolute pressure: `barg`, `bar(g)`, `psig`, `bara`, `psia`, ... parse as the plain
//! unit (same scale, no offset); the reference is *not* converted. Use [`pressure_reference`] to
//! learn which reference a label states, and decide at the call site.

/// What a number measures; selects which unit labels are accepted.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum Quantity {
    /// Lengths, diameters, wall thickness and roughness. SI: m.
    Length,
    /// Volumetric flow rate. SI: m³/s.
    Flow,
    /// Pressure (or pressure difference). SI: Pa.
    Pressure,
    /// Liquid head. SI: m of the liquid flowing (`m` here means head metres).
    Head,
    /// Temperature. Internal unit: °C (not kelvin).
    Temperature,
    /// Velocity. SI: m/s.
    Velocity,
    /// Mass density. SI: kg/m³.
    Density,
    /// Dynamic viscosity. SI: Pa·s.
    Viscosity,
    /// Dimensionless fraction: `%` (scale 0.01) or `fraction`/`-`/empty (scale 1).
    Fraction,
    /// Running time, in hours (`h`, `hours`, and per-year forms `h/yr`, `h/a`, which read as hours
    /// per year). The internal value is hours, not seconds.
    Duration,
    /// Electrical energy, in kWh (`kWh`, `MWh`, and per-year forms `kWh/yr`, `MWh/a`, which read
    /// as energy per year). The internal value is kWh, not joules.
    Energy,
    /// Volume of liquid, in m³ (`m3`, `Ml`, `US gal`, and per-year forms `m3/yr`, `Ml/a`).
    Volume,
    /// Power. SI: W (`W`, `kW`, `MW`, `hp`).
    Power,
}

/// A unit of one quantity: `si = v * scale + offset`.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Unit {
    /// The quantity this unit measures.
    pub quantity: Quantity,
    /// Canonical label of the unit (e.g. `"m3/h"`, `"°C"`), whatever spelling was parsed.
    pub label: &'static str,
    /// Multiplier to the internal SI unit.
    pub scale: f64,
    /// Offset added after scaling (non-zero only for temperatures).
    pub offset: f64,
}

impl Unit {
    /// Convert a value in this unit to the internal SI unit: `v * scale + offset`.
    #[must_use]
    pub fn to_si(&self, v: f64) -> f64 {
        v * self.scale + self.offset
    }

    /// Convert an internal SI value to this unit: `(si - offset) / scale`.
    #[must_use]
    pub fn from_si(&self, si: f64) -> f64 {
        (si - self.offset) / self.scale
    }
}

/// Pressure reference stated by a unit label.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum PressureReference {
    /// Gauge pressure (`barg`, `bar(g)`, `psig`, `kPag`, ...): relative to the local atmosphere.
    Gauge,
    /// Absolute pressure (`bara`, `bar(a)`, `psia`, `kPaa`, ...).
    Absolute,
    /// The label says neither (`bar`, `psi`, `kPa`), or is not a pressure label.
    Unstated,
}

/// International foot in metres, exact (NIST SP 811, B.8).
pub const FT_M: f64 = 0.3048;
/// Inch in metres, exact (NIST SP 811, B.8).
pub const IN_M: f64 = 0.0254;
/// US liquid gallon in cubic metres, exact (NIST SP 811, B.8: 3.785411784 L).
pub const US_GAL_M3: f64 = 3.785_411_784e-3;
/// Avoirdupois pound in kilograms, exact (NIST SP 811, B.8).
pub const LB_KG: f64 = 0.453_592_37;
/// Pound-force per square inch in pascals (NIST SP 811, B.8; exact from
/// 0.45359237 kg × 9.80665 m/s² / 0.0254² m²).
pub const PSI_PA: f64 = 6_894.757_293_168_361;
/// Bar in pascals, exact (NIST SP 811, B.8).
pub const BAR_PA: f64 = 1.0e5;
/// Standard atmosphere in pascals, exact (NIST SP 811, B.8).
pub const ATM_PA: f64 = 101_325.0;
/// Kilogram-force per square centimetre in pascals, exact (NIST SP 811, B.8).
pub const KGF_CM2_PA: f64 = 98_066.5;

const FT3_M3: f64 = FT_M * FT_M * FT_M;
const HOUR_S: f64 = 3600.0;
const DAY_S: f64 = 86_400.0;

/// One accepted unit: canonical label, factors, and the spellings that mean it.
struct Entry {
    label: &'static str,
    scale: f64,
    offset: f64,
    /// When true, spellings are compared with case kept (only where folding is ambiguous).
    case_sensitive: bool,
    spellings: &'static [&'static str],
}

const fn e(label: &'static str, scale: f64, spellings: &'static [&'static str]) -> Entry {
    Entry {
        label,
        scale,
        offset: 0.0,
        case_sensitive: false,
        spellings,
    }
}

const fn cs(label: &'static str, scale: f64, spellings: &'static [&'static str]) -> Entry {
    Entry {
        label,
        scale,
        offset: 0.0,
        case_sensitive: true,
        spellings,
    }
}

const fn t(
    label: &'static str,
    scale: f64,
    offset: f64,
    spellings: &'static [&'static str],
) -> Entry {
    Entry {
        label,
        scale,
        offset,
        case_sensitive: false,
        spellings,
    }
}

const LENGTH: &[Entry] = &[
    e("m", 1.0, &["m", "metre", "metres", "meter", "meters"]),
    e(
        "mm",
        1.0e-3,
        &[
            "mm",
            "millimetre",
            "millimetres",
            "millimeter",
            "millimeters",
        ],
    ),
    e(
        "cm",
        1.0e-2,
        &[
            "cm",
            "centimetre",
            "centimetres",
            "centimeter",
            "centimeters",
        ],
    ),
    e(
        "µm",
        1.0e-6,
        &[
            "µm",
            "um",
            "micron",
            "microns",
            "micrometre",
            "micrometres",
            "micrometer",
            "micrometers",
        ],
    ),
    e("in", IN_M, &["in", "inch", "inches", "\"", "''"]),
    e("ft", FT_M, &["ft", "feet", "foot", "'"]),
];

const FLOW: &[Entry] = &[
    e("m3/s", 1.0, &["m3/s", "m3/sec", "cumec", "cumecs"]),
    e(
        "m3/h",
        1.0 / HOUR_S,
        &[
            "m3/h", "m3/hr", "m3/hour", "m3h", "m3ph", "cmh", "cbm/h", "cbm/hr",
        ],
    ),
    e("m3/min", 1.0 / 60.0, &["m3/min"]),
    e("m3/d", 1.0 / DAY_S, &["m3/d", "m3/day"]),
    e(
        "l/s",
        1.0e-3,
        &[
            "l/s", "l/sec", "lps", "litre/s", "liter/s", "litres/s", "liters/s",
        ],
    ),
    e(
        "l/min",
        1.0e-3 / 60.0,
        &[
            "l/min",
            "lpm",
            "l/m",
            "litre/min",
            "liter/min",
            "litres/min",
            "liters/min",
        ],
    ),
    e("l/h", 1.0e-3 / HOUR_S, &["l/h", "l/hr", "lph"]),
    cs(
        "Ml/d",
        1.0e3 / DAY_S,
        &["Ml/d", "ML/d", "ML/D", "Ml/day", "ML/day", "MLD", "MLd"],
    ),
    e(
        "US gpm",
        US_GAL_M3 / 60.0,
        &[
            "gpm",
            "usgpm",
            "usgal/min",
            "gal/min",
            "gpm(us)",
            "gpmus",
            "gallon/min",
            "gallons/min",
        ],
    ),
    e("ft3/s", FT3_M3, &["ft3/s", "ft3/sec", "cfs", "cuft/s"]),
    e("ft3/min", FT3_M3 / 60.0, &["ft3/min", "cfm", "cuft/min"]),
];

const PRESSURE: &[Entry] = &[
    e("Pa", 1.0, &["pa", "pag", "paa", "pascal", "pascals"]),
    e("hPa", 100.0, &["hpa"]),
    e(
        "kPa",
        1.0e3,
        &["kpa", "kpag", "kpaa", "kpa(g)", "kpa(a)", "kpagauge"],
    ),
    cs(
        "MPa",
        1.0e6,
        &["MPa", "MPA", "Mpa", "MPag", "MPaa", "MPa(g)", "MPa(a)"],
    ),
    e(
        "mbar",
        100.0,
        &["mbar", "mbarg", "mbara", "mbar(g)", "mbar(a)", "millibar"],
    ),
    e(
        "bar",
        BAR_PA,
        &["bar", "barg", "bara", "bar(g)", "bar(a)", "bars"],
    ),
    e(
        "psi",
        PSI_PA,
        &[
            "psi", "psig", "psia", "psi(g)", "psi(a)", "lbf/in2", "lb/in2",
        ],
    ),
    e("atm", ATM_PA, &["atm"]),
    e(
        "kgf/cm2",
        KGF_CM2_PA,
        &["kgf/cm2", "kg/cm2", "kgf/cm2g", "kg/cm2g"],
    ),
];

const HEAD: &[Entry] = &[
    e(
        "m",
        1.0,
        &[
            "m",
            "metre",
            "metres",
            "meter",
            "meters",
            "mwc",
            "mh2o",
            "mwg",
            "mhead",
            "mofhead",
            "metresofhead",
            "metershead",
            "metreshead",
            "metersofhead",
            "mlc",
        ],
    ),
    e("mm", 1.0e-3, &["mmh2o", "mmwc", "mmwg"]),
    e(
        "ft",
        FT_M,
        &[
            "ft",
            "feet",
            "foot",
            "fth2o",
            "ftwc",
            "ftwg",
            "fthead",
            "feetofhead",
            "feethead",
            "ftofhead",
            "'",
        ],
    ),
    e("in", IN_M, &["inh2o", "inwc", "inwg", "\"h2o"]),
];

const TEMPERATURE: &[Entry] = &[
    t(
        "°C",
        1.0,
        0.0,
        &[
            "°c",
            "c",
            "degc",
            "deg°c",
            "celsius",
            "degreesc",
            "degreec",
            "degcelsius",
            "degreescelsius",
            "°celsius",
        ],
    ),
    t("K", 1.0, -273.15, &["k", "kelvin", "°k", "degk"]),
    t(
        "°F",
        5.0 / 9.0,
        -32.0 * 5.0 / 9.0,
        &[
            "°f",
            "f",
            "degf",
            "deg°f",
            "fahrenheit",
            "degreesf",
            "degreef",
            "degfahrenheit",
            "°fahrenheit",
        ],
    ),
];

const VELOCITY: &[Entry] = &[
    e("m/s", 1.0, &["m/s", "m/sec", "mps", "ms-1", "m/s1"]),
    e("ft/s", FT_M, &["ft/s", "ft/sec", "fps", "fts-1"]),
];

const DENSITY: &[Entry] = &[
    e("kg/m3", 1.0, &["kg/m3", "kgm-3", "kgm3"]),
    e(
        "g/cm3",
        1.0e3,
        &["g/cm3", "g/cc", "g/ml", "kg/l", "kg/dm3", "t/m3"],
    ),
    e(
        "lb/ft3",
        LB_KG / FT3_M3,
        &["lb/ft3", "lbm/ft3", "lb/cuft", "pcf"],
    ),
];

const VISCOSITY: &[Entry] = &[
    e("Pa·s", 1.0, &["pas", "pasec", "kg/ms", "ns/m2"]),
    e(
        "mPa·s",
        1.0e-3,
        &["mpas", "mpasec", "cp", "centipoise", "cps"],
    ),
    e("P", 0.1, &["p", "poise"]),
];

const FRACTION: &[Entry] = &[
    e(
        "%",
        0.01,
        &["%", "percent", "pct", "percentage", "percentopen", "%open"],
    ),
    e(
        "fraction",
        1.0,
        &["", "-", "fraction", "frac", "1", "pu", "ratio"],
    ),
];

const DURATION: &[Entry] = &[e(
    "h",
    1.0,
    &[
        "h",
        "hr",
        "hrs",
        "hour",
        "hours",
        "h/yr",
        "h/y",
        "h/a",
        "h/year",
        "hr/yr",
        "hrs/yr",
        "hr/a",
        "hrs/a",
        "hours/yr",
        "hours/year",
        "hoursperyear",
        "hoursayear",
        "hpa",
        "hpy",
        "h/annum",
        "hrs/year",
        "hr/year",
    ],
)];

/// Per-year endings accepted after an energy or volume unit (`kWh/yr`, `m3/a`, `Ml/year`).
const PER_YEAR: [&str; 6] = ["", "/yr", "/y", "/a", "/year", "/annum"];

const ENERGY: &[Entry] = &[
    e(
        "kWh",
        1.0,
        &["kwh", "kw-h", "kilowatthour", "kilowatthours"],
    ),
    cs("MWh", 1.0e3, &["MWh", "MWH", "Mwh"]),
    e("Wh", 1.0e-3, &["wh"]),
    e("GJ", 1.0e6 / 3600.0, &["gj"]),
];

const VOLUME: &[Entry] = &[
    e(
        "m3",
        1.0,
        &[
            "m3",
            "cum",
            "cbm",
            "cubicmetre",
            "cubicmetres",
            "cubicmeter",
            "cubicmeters",
        ],
    ),
    cs(
        "Ml",
        1.0e3,
        &[
            "Ml",
            "ML",
            "megalitre",
            "megalitres",
            "megaliter",
            "megaliters",
        ],
    ),
    e("l", 1.0e-3, &["l", "litre", "litres", "liter", "liters"]),
    e("US gal", US_GAL_M3, &["gal", "usgal", "gallon", "gallons"]),
    e("ft3", FT3_M3, &["ft3", "cuft"]),
];

/// Mechanical horsepower (550 ft·lbf/s) in watts (NIST SP 811, B.8: 7.456 999 E+02 W; here
/// from its exact definition 550 × 0.3048 m × 0.45359237 kg × 9.80665 m/s²).
pub const HP_W: f64 = 550.0 * FT_M * LB_KG * 9.806_65;

const POWER: &[Entry] = &[
    e("W", 1.0, &["w", "watt", "watts"]),
    e("kW", 1.0e3, &["kw", "kilowatt", "kilowatts", "kwe"]),
    cs("MW", 1.0e6, &["MW", "MWe"]),
    e("hp", HP_W, &["hp", "bhp", "horsepower"]),
];

fn table(quantity: Quantity) -> &'static [Entry] {
    match quantity {
        Quantity::Length => LENGTH,
        Quantity::Flow => FLOW,
        Quantity::Pressure => PRESSURE,
        Quantity::Head => HEAD,
        Quantity::Temperature => TEMPERATURE,
        Quantity::Velocity => VELOCITY,
        Quantity::Density => DENSITY,
        Quantity::Viscosity => VISCOSITY,
        Quantity::Fraction => FRACTION,
        Quantity::Duration => DURATION,
        Quantity::Energy => ENERGY,
        Quantity::Volume => VOLUME,
        Quantity::Power => POWER,
    }
}

/// Normalise a label for comparison (case kept; see the module docs for the rules).
fn normalise(label: &str) -> String {
    let mut out = String::with_capacity(label.len());
    for c in label.chars() {
        match c {
            c if c.is_whitespace() => {}
            '_' | '[' | ']' | '(' | ')' | '{' | '}' | '·' | '⋅' | '.' | '*' | '^' | '\u{200B}'
            | '\u{FEFF}' => {}
            '℃' => out.push_str("°C"),
            '℉' => out.push_str("°F"),
            '³' => out.push('3'),
            '²' => out.push('2'),
            '¹' => out.push('1'),
            '⁻' | '−' => out.push('-'),
            'º' | '˚' => out.push('°'),
            'μ' => out.push('µ'),
            '″' | '”' | '“' => out.push('"'),
            '′' | '’' | '‘' => out.push('\''),
            _ => out.push(c),
        }
    }
    out
}

fn unit_from(quantity: Quantity, entry: &Entry) -> Unit {
    Unit {
        quantity,
        label: entry.label,
        scale: entry.scale,
        offset: entry.offset,
    }
}

/// Parse a unit label for a quantity.
///
/// Accepts header and in-cell spellings such as `"m3/h"`, `"m³/h"`, `"l/s"`, `"L/min"`, `"gpm"`,
/// `"US gpm"`, `"bar"`, `"kPa"`, `"psi"`, `"°C"`, `"degC"`, `"C"`, `"K"`, `"°F"`, `"m/s"`,
/// `"ft/s"`, `"kg/m3"`, `"Pa.s"`, `"Pa·s"`, `"cP"`, `"mPa.s"`, `"mm"`, `"in"`, `"inch"`, `"\""`,
/// `"ft"`, `"'"`. Case-insensitive except `MPa` and `Ml/d` (see module docs). `"m"` is metres of
/// length for [`Quantity::Length`] and metres of head for [`Quantity::Head`]. `"gpm"` means US
/// gallons per minute. Returns `None` when the label is not recognised for that quantity
/// (e.g. `"mH2O"` for [`Quantity::Pressure`]: head units belong to [`Quantity::Head`]).
#[must_use]
pub fn parse_unit(label: &str, quantity: Quantity) -> Option<Unit> {
    if matches!(quantity, Quantity::Energy | Quantity::Volume) {
        let n = normalise(label);
        return PER_YEAR.iter().rev().find_map(|end| {
            let stem = strip_suffix_folded(&n, end)?;
            (!stem.is_empty())
                .then(|| parse_plain(stem, quantity))
                .flatten()
        });
    }
    parse_plain(label, quantity)
}

/// `text` without `suffix`, compared with case folded; None when it does not end so.
fn strip_suffix_folded<'a>(text: &'a str, suffix: &str) -> Option<&'a str> {
    let cut = text.len().checked_sub(suffix.len())?;
    (text.is_char_boundary(cut) && text[cut..].eq_ignore_ascii_case(suffix)).then(|| &text[..cut])
}

fn parse_plain(label: &str, quantity: Quantity) -> Option<Unit> {
    let exact = normalise(label);
    let folded = exact.to_lowercase();
    let entries = table(quantity);
    // Case-sensitive entries first, so "MPa" is never shadowed by a folded spelling.
    for entry in entries.iter().filter(|x| x.case_sensitive) {
        if entry.spellings.iter().any(|s| normalise(s) == exact) {
            return Some(unit_from(quantity, entry));
        }
    }
    for entry in entries.iter().filter(|x| !x.case_sensitive) {
        if entry
            .spellings
            .iter()
            .any(|s| normalise(s).to_lowercase() == folded)
        {
            return Some(unit_from(quantity, entry));
        }
    }
    None
}

/// The default unit of a quantity when a header gives none: Flow m3/h, Length m, Pressure kPa,
/// Head m, Temperature °C, Velocity m/s, Density kg/m3, Viscosity Pa·s, Fraction %, Duration h,
/// Energy kWh (per year), Volume m3 (per year), Power kW.
#[must_use]
pub fn default_unit(quantity: Quantity) -> Unit {
    let (entries, label) = match quantity {
        Quantity::Flow => (FLOW, "m3/h"),
        Quantity::Length => (LENGTH, "m"),
        Quantity::Pressure => (PRESSURE, "kPa"),
        Quantity::Head => (HEAD, "m"),
        Quantity::Temperature => (TEMPERATURE, "°C"),
        Quantity::Velocity => (VELOCITY, "m/s"),
        Quantity::Density => (DENSITY, "kg/m3"),
        Quantity::Viscosity => (VISCOSITY, "Pa·s"),
        Quantity::Fraction => (FRACTION, "%"),
        Quantity::Duration => (DURATION, "h"),
        Quantity::Energy => (ENERGY, "kWh"),
        Quantity::Volume => (VOLUME, "m3"),
        Quantity::Power => (POWER, "kW"),
    };
    entries
        .iter()
        .find(|x| x.label == label)
        // The fallback is unreachable with the tables above; an identity unit never panics.
        .map_or(
            Unit {
                quantity,
                label,
                scale: 1.0,
                offset: 0.0,
            },
            |x| unit_from(quantity, x),
        )
}

/// The pressure reference a label states: `barg`, `bar g`, `bar(g)`, `psig`, `kPag` → Gauge;
/// `bara`, `bar(a)`, `psia` → Absolute; anything else → Unstated. [`parse_unit`] converts all
/// of them with the same factor and no offset; this tells the caller which reference was meant.
#[must_use]
pub fn pressure_reference(label: &str) -> PressureReference {
    let folded = normalise(label).to_lowercase();
    let base = [
        "mbar", "bar", "psi", "kpa", "mpa", "pa", "kgf/cm2", "kg/cm2",
    ];
    for b in base {
        if let Some(rest) = folded.strip_prefix(b) {
            return match rest {
                "g" | "gauge" => PressureReference::Gauge,
                "a" | "abs" | "absolute" => PressureReference::Absolute,
                _ => PressureReference::Unstated,
            };
        }
    }
    PressureReference::Unstated
}

// ---------------------------------------------------------------------------------------------
// Units of reported figures.

/// Units of reported figures (console and the workbook's computed columns; JSON is always SI).
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, clap::ValueEnum)]
pub enum UnitSystem {
    /// m, mm, m³/h, kPa, m/s, m of head.
    #[default]
    Si,
    /// US customary: ft, in, US gpm, psi, ft/s, ft of head, kgal (thousand US gallons).
    Us,
}

/// An SI unit label of a report column and its US customary replacement with the factor from
/// the SI value in that label: `si_value * factor = us_value`. None when the label stays.
///
/// # Source
/// NIST SP 811 (2008) B.8 via the constants in this module.
pub fn us_unit(si_label: &str) -> Option<(&'static str, f64)> {
    Some(match si_label {
        "m" => ("ft", 1.0 / FT_M),
        "mm" => ("in", 1e-3 / IN_M),
        "m/s" => ("ft/s", 1.0 / FT_M),
        "kPa" => ("psi", 1e3 / PSI_PA),
        "Pa" => ("psi", 1.0 / PSI_PA),
        "m3/h" => ("US gpm", 1.0 / 3600.0 / (US_GAL_M3 / 60.0)),
        "m3/s" => ("US gpm", 1.0 / (US_GAL_M3 / 60.0)),
        "kg/m3" => ("lb/ft3", FT_M * FT_M * FT_M / LB_KG),
        "m/100 m" => ("ft/100 ft", 1.0),
        // Water utilities in US customary units count volume in thousands of gallons (kgal).
        "m3" => ("kgal", 1.0 / (1e3 * US_GAL_M3)),
        "kWh/m3" => ("kWh/kgal", 1e3 * US_GAL_M3),
        "kWh/m3/m" => ("kWh/kgal/ft", 1e3 * US_GAL_M3 * FT_M),
        _ => return None,
    })
}

/// A console unit: `shown` (the SI unit as the console prints it) and `si_factor` on SI values
/// for SI, else the US replacement of `si_label` ([`us_unit`]) and its factor.
///
/// # Example
/// ```
/// use lossledger::units::{UnitSystem, console_unit};
/// assert_eq!(console_unit("m3/s", "m³/h", 3600.0, UnitSystem::Si), ("m³/h", 3600.0));
/// let (gpm, f) = console_unit("m3/s", "m³/h", 3600.0, UnitSystem::Us);
/// assert_eq!(gpm, "US gpm");
/// assert!((0.01 * f - 158.503_230_8).abs() < 1e-6); // 0.01 m³/s in US gpm (NIST SP 811)
/// ```
pub fn console_unit(
    si_label: &str,
    shown: &'static str,
    si_factor: f64,
    units: UnitSystem,
) -> (&'static str, f64) {
    match (units, us_unit(si_label)) {
        (UnitSystem::Us, Some(us)) => us,
        _ => (shown, si_factor),
    }
}

/// A header `Name [unit]` in the given units: the new header and the factor on its values.
pub fn header_in(header: &str, units: UnitSystem) -> (String, f64) {
    if units == UnitSystem::Si {
        return (header.to_string(), 1.0);
    }
    if let Some((name, rest)) = header.split_once('[')
        && let Some(label) = rest.strip_suffix(']')
        && let Some((us, factor)) = us_unit(label)
    {
        return (format!("{name}[{us}]"), factor);
    }
    (header.to_string(), 1.0)
}
