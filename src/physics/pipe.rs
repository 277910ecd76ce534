//! Pipe materials, schedules, bores and wall roughness.
//!
//! Bore tables (data in the `pipe/` submodules):
//!
//! * carbon and galvanised steel: ASME B36.10M-2004, NPS 1/8–24 (DN 6–600), schedules 10–160,
//!   STD, XS, XXS;
//! * stainless steel: ASME B36.19M-2004, 5S, 10S, 40S, 80S;
//! * PE and PVC-U: outside diameter (ISO 161-1 series, 16–1000 mm) and SDR, wall after ISO 4065
//!   (ISO 4427-2 for PE, ISO 1452-2 for PVC-U);
//! * ductile iron: EN 545 / ISO 2531 outside diameters, class K9 wall, ISO 4179 cement-mortar lining;
//! * copper: EN 1057 (by outside diameter) and ASTM B88 types K, L, M (by nominal size).
//!
//! Cast iron and concrete have no table: [`bore`] returns [`BoreError::NoTable`] and the schedule
//! must give an `Inner diameter`. See `docs/pipes.md`.

#[path = "pipe/copper.rs"]
mod copper;
#[path = "pipe/iron.rs"]
mod iron;
#[path = "pipe/plastic.rs"]
mod plastic;
#[path = "pipe/steel.rs"]
mod steel;

use serde::Serialize;
use steel::SteelRow;

/// Millimetres per inch (exact, NIST SP 811).
const MM_PER_IN: f64 = 25.4;

/// Pipe material. Serialised as its kebab-case id (`"carbon-steel"`, `"ductile-iron"` ...).
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum Material {
    /// Carbon steel (ASTM A53, A106, API 5L ...), bare, to ASME B36.10M.
    CarbonSteel,
    /// Austenitic or duplex stainless steel pipe to ASME B36.19M.
    StainlessSteel,
    /// Hot-dip galvanised steel pipe to ASME B36.10M dimensions.
    GalvanisedSteel,
    /// Grey (cast) iron, unlined. No bore table.
    CastIron,
    /// Ductile iron with cement-mortar lining (EN 545 / ISO 2531, ISO 4179).
    DuctileIron,
    /// PVC-U (also PVC-O and CPVC, see [`material_from_text`]), by OD and SDR.
    Pvc,
    /// Polyethylene (PE100, PE80, HDPE, MDPE), by OD and SDR.
    Pe,
    /// Copper tube (EN 1057, ASTM B88).
    Copper,
    /// Concrete pipe. No bore table.
    Concrete,
}

impl Material {
    /// Every material, in declaration order.
    pub const ALL: [Material; 9] = [
        Material::CarbonSteel,
        Material::StainlessSteel,
        Material::GalvanisedSteel,
        Material::CastIron,
        Material::DuctileIron,
        Material::Pvc,
        Material::Pe,
        Material::Copper,
        Material::Concrete,
    ];

    /// Stable kebab-case identifier, the same as the serde form (`"carbon-steel"`).
    pub fn id(&self) -> &'static str {
        match self {
            Material::CarbonSteel => "carbon-steel",
            Material::StainlessSteel => "stainless-steel",
            Material::GalvanisedSteel => "galvanised-steel",
            Material::CastIron => "cast-iron",
            Material::DuctileIron => "ductile-iron",
            Material::Pvc => "pvc",
            Material::Pe => "pe",
            Material::Copper => "copper",
            Material::Concrete => "concrete",
        }
    }

    /// Plain English name for messages and reports.
    pub fn name(&self) -> &'static str {
        match self {
            Material::CarbonSteel => "carbon steel",
            Material::StainlessSteel => "stainless steel",
            Material::GalvanisedSteel => "galvanised steel",
            Material::CastIron => "cast iron",
            Material::DuctileIron => "ductile iron (cement-lined)",
            Material::Pvc => "PVC-U",
            Material::Pe => "PE",
            Material::Copper => "copper",
            Material::Concrete => "concrete",
        }
    }

    /// True for unlined iron and steel, the pipe the Colebrook-White ageing model applies to
    /// (carbon steel, galvanised steel, cast iron).
    pub fn is_unlined_ferrous(&self) -> bool {
        matches!(
            self,
            Material::CarbonSteel | Material::GalvanisedSteel | Material::CastIron
        )
    }
}

/// Fold a material text to lowercase ASCII letters and digits only ("SS-316L" -> "ss316l").
fn fold(text: &str) -> String {
    text.chars()
        .filter(|c| c.is_alphanumeric())
        .flat_map(char::to_lowercase)
        .collect()
}

/// Exact spellings (after [`fold`]) and the material they mean.
const MATERIAL_WORDS: &[(&str, Material)] = &[
    // carbon steel
    ("cs", Material::CarbonSteel),
    ("ms", Material::CarbonSteel),
    ("steel", Material::CarbonSteel),
    ("carbonsteel", Material::CarbonSteel),
    ("mildsteel", Material::CarbonSteel),
    ("blacksteel", Material::CarbonSteel),
    ("blackiron", Material::CarbonSteel),
    ("wroughtiron", Material::CarbonSteel),
    ("erw", Material::CarbonSteel),
    ("csa", Material::CarbonSteel),
    // stainless
    ("ss", Material::StainlessSteel),
    ("sst", Material::StainlessSteel),
    ("inox", Material::StainlessSteel),
    ("duplex", Material::StainlessSteel),
    ("304", Material::StainlessSteel),
    ("304l", Material::StainlessSteel),
    ("316", Material::StainlessSteel),
    ("316l", Material::StainlessSteel),
    ("321", Material::StainlessSteel),
    ("2205", Material::StainlessSteel),
    ("14301", Material::StainlessSteel),
    ("14307", Material::StainlessSteel),
    ("14401", Material::StainlessSteel),
    ("14404", Material::StainlessSteel),
    // galvanised
    ("gi", Material::GalvanisedSteel),
    ("gs", Material::GalvanisedSteel),
    ("gms", Material::GalvanisedSteel),
    ("hdg", Material::GalvanisedSteel),
    ("galv", Material::GalvanisedSteel),
    // cast iron
    ("ci", Material::CastIron),
    ("cip", Material::CastIron),
    ("castiron", Material::CastIron),
    ("greyiron", Material::CastIron),
    ("grayiron", Material::CastIron),
    ("greycastiron", Material::CastIron),
    ("graycastiron", Material::CastIron),
    // ductile iron
    ("di", Material::DuctileIron),
    ("dip", Material::DuctileIron),
    ("dci", Material::DuctileIron),
    ("dicl", Material::DuctileIron),
    ("ductile", Material::DuctileIron),
    // PVC
    ("pvc", Material::Pvc),
    ("upvc", Material::Pvc),
    ("pvcu", Material::Pvc),
    ("pvco", Material::Pvc),
    ("mpvc", Material::Pvc),
    ("cpvc", Material::Pvc),
    ("pvcc", Material::Pvc),
    ("polyvinylchloride", Material::Pvc),
    // PE
    ("pe", Material::Pe),
    ("hdpe", Material::Pe),
    ("mdpe", Material::Pe),
    ("lldpe", Material::Pe),
    ("pe80", Material::Pe),
    ("pe100", Material::Pe),
    ("pe100rc", Material::Pe),
    ("pe4710", Material::Pe),
    ("pe3408", Material::Pe),
    ("pex", Material::Pe),
    ("pexa", Material::Pe),
    ("polyethylene", Material::Pe),
    ("polyethene", Material::Pe),
    ("polythene", Material::Pe),
    // copper
    ("cu", Material::Copper),
    ("copper", Material::Copper),
    // concrete
    ("rc", Material::Concrete),
    ("rcp", Material::Concrete),
    ("pcc", Material::Concrete),
    ("pccp", Material::Concrete),
    ("concrete", Material::Concrete),
];

/// Read a material from the words people write in a schedule.
///
/// Case, spaces and punctuation are ignored. Recognised, among others: carbon steel (`CS`,
/// `carbon steel`, `MS`, `A106`, `A106 Gr B`, `A53`, `API 5L`, `steel`, `black steel`),
/// stainless (`SS`, `SS316`, `316L`, `304`, `1.4404`, `stainless`, `A312 TP316L`, `duplex`),
/// galvanised (`galv`, `GI`, `galvanised`, `galvanized`, `HDG`), cast iron (`CI`, `cast iron`,
/// `grey iron`), ductile iron (`DI`, `DICL`, `DIP`, `ductile`, `ductile iron`), PVC (`PVC`, `uPVC`,
/// `PVC-U`, `PVC-O`, `CPVC`), PE (`PE`, `HDPE`, `MDPE`, `PE100`, `PE80`, `PE-X`, `polyethylene`),
/// copper (`Cu`, `copper`, `copper type L`), concrete (`concrete`, `RCP`, `RC`, `PCCP`).
///
/// CPVC and PVC-O are read as [`Material::Pvc`] (same roughness; PVC-O shares the ISO 161-1
/// OD series), PE-X as [`Material::Pe`]. `None` when the text is not recognised.
pub fn material_from_text(text: &str) -> Option<Material> {
    let f = fold(text);
    if f.is_empty() {
        return None;
    }
    if let Some((_, m)) = MATERIAL_WORDS.iter().find(|(w, _)| *w == f) {
        return Some(*m);
    }
    let has = |s: &str| f.contains(s);
    let starts = |s: &str| f.starts_with(s);
    if has("stainless")
        || starts("ss3")
        || starts("ss2")
        || starts("ss4")
        || starts("sus3")
        || starts("aisi3")
        || starts("a312")
        || starts("tp3")
        || starts("tp2")
        || has("duplex")
    {
        Some(Material::StainlessSteel)
    } else if has("galv") {
        Some(Material::GalvanisedSteel)
    } else if has("ductile") || starts("dicl") {
        Some(Material::DuctileIron)
    } else if has("castiron") || has("greyiron") || has("grayiron") {
        Some(Material::CastIron)
    } else if has("pvc") || has("polyvinyl") {
        Some(Material::Pvc)
    } else if starts("hdpe")
        || starts("mdpe")
        || starts("pe100")
        || starts("pe80")
        || starts("polyeth")
        || starts("polythene")
    {
        Some(Material::Pe)
    } else if has("copper") || (starts("cu") && f.len() <= 6) {
        Some(Material::Copper)
    } else if has("concrete") {
        Some(Material::Concrete)
    } else if has("carbonsteel")
        || has("mildsteel")
        || starts("a106")
        || starts("a53")
        || starts("api5l")
        || starts("astma106")
        || starts("astma53")
        || starts("steel")
        || f.ends_with("steel")
    {
        Some(Material::CarbonSteel)
    } else {
        None
    }
}

/// Wall schedule or class of a pipe.
///
/// `Sch(n)` carries the ASME B36.10M schedule number (5, 10, 20, 30, 40, 60, 80, 100, 120, 140,
/// 160; B36.10M itself defines no schedule 5). The variants after `Sdr` are additions for
/// ductile iron and copper.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub enum Schedule {
    /// ASME B36.10M schedule number.
    Sch(u16),
    /// Standard weight (B36.10M).
    Std,
    /// Extra strong, also written XH / extra heavy (B36.10M).
    Xs,
    /// Double extra strong, also XXH (B36.10M).
    Xxs,
    /// Stainless schedule 5S (B36.19M).
    S5,
    /// Stainless schedule 10S (B36.19M).
    S10,
    /// Stainless schedule 40S (B36.19M).
    S40,
    /// Stainless schedule 80S (B36.19M).
    S80,
    /// Standard dimension ratio OD / wall (PE, PVC-U).
    Sdr(f64),
    /// Ductile iron wall class K (ISO 2531 / EN 545), e.g. K9.
    DuctileK(u8),
    /// ASTM B88 copper tube type K (heaviest).
    CopperK,
    /// ASTM B88 copper tube type L.
    CopperL,
    /// ASTM B88 copper tube type M (lightest).
    CopperM,
}

/// Schedule numbers [`parse_schedule`] accepts as `Sch(n)`.
const SCH_NUMBERS: [u16; 11] = [5, 10, 20, 30, 40, 60, 80, 100, 120, 140, 160];

impl Schedule {
    /// Short label: `"40"`, `"STD"`, `"XS"`, `"XXS"`, `"10S"`, `"SDR11"`, `"SDR13.6"`, `"K9"`,
    /// `"Type L"`.
    pub fn label(&self) -> String {
        match self {
            Schedule::Sch(n) => n.to_string(),
            Schedule::Std => "STD".into(),
            Schedule::Xs => "XS".into(),
            Schedule::Xxs => "XXS".into(),
            Schedule::S5 => "5S".into(),
            Schedule::S10 => "10S".into(),
            Schedule::S40 => "40S".into(),
            Schedule::S80 => "80S".into(),
            Schedule::Sdr(s) => format!("SDR{s}"),
            Schedule::DuctileK(k) => format!("K{k}"),
            Schedule::CopperK => "Type K".into(),
            Schedule::CopperL => "Type L".into(),
            Schedule::CopperM => "Type M".into(),
        }
    }
}

/// Read a schedule from text.
///
/// Case, spaces, `-`, `_` and a leading `Sch`, `Sch.`, `Schedule` are ignored. Accepts schedule
/// numbers (`40`, `Sch 40`, `SCH40`, `sch.40`, `40.0`), `STD` / `std wt` / `standard`,
/// `XS` / `XH` / `extra strong` / `extra heavy`, `XXS` / `XXH`, stainless `5S`, `10S`, `40S`,
/// `80S` (also `Sch 40S`), `SDR11`, `SDR 17`, `SDR13.6`, `SDR 13,6`, `DR11`, ductile iron `K9`,
/// copper `K`, `L`, `M`, `Type L`. `None` when not recognised (pressure ratings such as `PN16`
/// are not schedules: they depend on the material).
pub fn parse_schedule(text: &str) -> Option<Schedule> {
    let mut s: String = text
        .trim()
        .chars()
        .filter(|c| !c.is_whitespace() && *c != '-' && *c != '_')
        .flat_map(char::to_uppercase)
        .collect();
    for prefix in ["SCHEDULE", "SCHED", "SCH"] {
        if let Some(rest) = s.strip_prefix(prefix) {
            s = rest.trim_start_matches(['.', ':']).to_string();
            break;
        }
    }
    for suffix in ["SCHEDULE", "SCH"] {
        if let Some(rest) = s.strip_suffix(suffix) {
            s = rest.to_string();
            break;
        }
    }
    if s.is_empty() {
        return None;
    }
    // SDR keeps its decimal point; accept a decimal comma too.
    for prefix in ["SDR", "DR"] {
        if let Some(rest) = s.strip_prefix(prefix) {
            let v: f64 = rest
                .trim_start_matches(['.', ':'])
                .replace(',', ".")
                .parse()
                .ok()?;
            return (v.is_finite() && v > 2.0).then_some(Schedule::Sdr(v));
        }
    }
    let words: String = s.chars().filter(|c| *c != '.').collect();
    match words.as_str() {
        "STD" | "STANDARD" | "STDWT" | "STDWALL" | "STANDARDWEIGHT" | "STANDARDWALL" => {
            return Some(Schedule::Std);
        }
        "XS" | "XH" | "EH" | "XSTRONG" | "EXTRASTRONG" | "EXTRAHEAVY" | "XSWT" => {
            return Some(Schedule::Xs);
        }
        "XXS" | "XXH" | "XXSTRONG" | "DOUBLEEXTRASTRONG" | "DOUBLEEXTRAHEAVY" => {
            return Some(Schedule::Xxs);
        }
        "K" | "TYPEK" | "COPPERK" => return Some(Schedule::CopperK),
        "L" | "TYPEL" | "COPPERL" => return Some(Schedule::CopperL),
        "M" | "TYPEM" | "COPPERM" => return Some(Schedule::CopperM),
        "5S" => return Some(Schedule::S5),
        "10S" => return Some(Schedule::S10),
        "40S" => return Some(Schedule::S40),
        "80S" => return Some(Schedule::S80),
        _ => {}
    }
    for prefix in ["CLASSK", "CLASS", "K"] {
        if let Some(rest) = words.strip_prefix(prefix)
            && let Ok(k) = rest.parse::<u8>()
        {
            return (7..=12).contains(&k).then_some(Schedule::DuctileK(k));
        }
    }
    let v: f64 = s.parse().ok()?;
    SCH_NUMBERS
        .iter()
        .find(|&&n| f64::from(n) == v)
        .map(|&n| Schedule::Sch(n))
}

/// Nominal pipe size (inches) of a DN, DN6..DN600 -> NPS 1/8..24 (ASME B36.10M Table 1,
/// ISO 6708). `None` for a DN outside that list.
pub fn dn_to_nps(dn: u16) -> Option<f64> {
    steel::B36_10M.iter().find(|r| r.dn == dn).map(|r| r.nps_in)
}

/// DN of a nominal pipe size in inches (1.5 -> 40), within 1e-3 in. `None` when the size is not
/// one of NPS 1/8..24 of ASME B36.10M Table 1.
pub fn nps_to_dn(nps_in: f64) -> Option<u16> {
    steel::B36_10M
        .iter()
        .find(|r| (r.nps_in - nps_in).abs() < 1e-3)
        .map(|r| r.dn)
}

/// Outside diameter, wall and bore of a pipe, m, and the standard they come from.
///
/// Always `inner_diameter_m = outer_diameter_m - 2 * wall_m`; for cement-lined ductile iron
/// `wall_m` is the iron wall plus the lining.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Bore {
    /// Outside diameter, m.
    pub outer_diameter_m: f64,
    /// Wall thickness (including any lining), m.
    pub wall_m: f64,
    /// Bore, m.
    pub inner_diameter_m: f64,
    /// The standard (and table) the dimensions come from.
    pub standard: &'static str,
}

impl Bore {
    fn from_mm(od_mm: f64, wall_mm: f64, standard: &'static str) -> Bore {
        Bore {
            outer_diameter_m: od_mm / 1000.0,
            wall_m: wall_mm / 1000.0,
            inner_diameter_m: (od_mm - 2.0 * wall_mm) / 1000.0,
            standard,
        }
    }
}

/// Why a bore could not be found.
#[derive(Clone, Debug, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum BoreError {
    /// The DN is not a size of the table for that material.
    #[error(
        "DN{dn} is not a {material} size in {standard} (sizes: {sizes}); give the Inner diameter"
    )]
    UnknownSize {
        /// The DN asked for.
        dn: u16,
        /// Material name.
        material: &'static str,
        /// Standard searched.
        standard: &'static str,
        /// The sizes that exist.
        sizes: &'static str,
    },
    /// The schedule exists, but not for this size in this standard.
    #[error(
        "schedule {schedule} is not defined for DN{dn} in {standard}; that size has: {available}"
    )]
    ScheduleNotDefined {
        /// The DN asked for.
        dn: u16,
        /// Label of the schedule asked for.
        schedule: String,
        /// Standard searched.
        standard: &'static str,
        /// Labels of the schedules that exist for the size.
        available: String,
    },
    /// The kind of schedule does not apply to the material (e.g. an SDR on steel pipe).
    #[error("schedule {schedule} does not apply to {material}; {hint}")]
    ScheduleNotApplicable {
        /// Material name.
        material: &'static str,
        /// Label of the schedule given.
        schedule: String,
        /// What the material takes instead.
        hint: &'static str,
    },
    /// No schedule was given and the material (or size) has no default.
    #[error("no schedule given for {material} and there is no default; {hint}")]
    MissingSchedule {
        /// Material name.
        material: &'static str,
        /// What to write.
        hint: String,
    },
    /// The material has no bore table.
    #[error("there is no bore table for {material}; give the Inner diameter")]
    NoTable {
        /// Material name.
        material: &'static str,
    },
    /// An outside diameter that is not in the material's table.
    #[error(
        "outside diameter {od_mm} mm is not a {material} size in {standard}; nearest: {nearest}"
    )]
    UnknownOd {
        /// Material name.
        material: &'static str,
        /// The diameter given, mm.
        od_mm: f64,
        /// Standard searched.
        standard: &'static str,
        /// Nearest tabulated diameters, mm.
        nearest: String,
    },
    /// An SDR outside the accepted range.
    #[error("SDR {sdr} is outside the range {min}..{max} accepted for PE and PVC-U pipe")]
    InvalidSdr {
        /// The SDR given.
        sdr: f64,
        /// Smallest SDR accepted.
        min: f64,
        /// Largest SDR accepted.
        max: f64,
    },
    /// A diameter that is not a positive finite number.
    #[error("outside diameter {od_m} m must be a positive number")]
    InvalidDiameter {
        /// The value given, m.
        od_m: f64,
    },
}

const B36_10M_NAME: &str = "ASME B36.10M-2004";
const B36_19M_NAME: &str = "ASME B36.19M-2004";
const STEEL_SIZES: &str = "DN6-DN600 (NPS 1/8-24)";
const PE_NAME: &str = "ISO 4427-2 (OD ISO 161-1, wall ISO 4065)";
const PVC_NAME: &str = "ISO 1452-2 (OD ISO 161-1, wall ISO 4065)";
const PLASTIC_DN_SIZES: &str = "DN10-DN1000 (mapped to outside diameters 16-1000 mm)";
const DI_NAME: &str = "EN 545 / ISO 2531 class K9, ISO 4179 cement lining";
const DI_SIZES: &str = "DN40-DN600";
const EN_1057_NAME: &str = "EN 1057";
const B88_NAME: &str = "ASTM B88";
const B88_SIZES: &str = "DN8-DN300 (1/4-12 in nominal)";
const SDR_HINT: &str = "PE and PVC-U pipe takes an SDR, e.g. SDR11 or SDR17";
const STEEL_HINT: &str = "steel pipe takes an ASME schedule: 10-160, STD, XS, XXS";
const STAINLESS_HINT: &str = "stainless pipe takes an ASME B36.19M schedule: 5S, 10S, 40S, 80S";
const DI_HINT: &str = "ductile iron takes class K9 (or no schedule)";
const COPPER_HINT: &str = "copper tube takes Type K, L or M (ASTM B88), or no schedule with an outside diameter (EN 1057)";

fn steel_table(material: Material) -> Option<(&'static [SteelRow], &'static str)> {
    match material {
        Material::CarbonSteel | Material::GalvanisedSteel => Some((steel::B36_10M, B36_10M_NAME)),
        Material::StainlessSteel => Some((steel::B36_19M, B36_19M_NAME)),
        _ => None,
    }
}

fn is_steel_schedule(s: Schedule) -> bool {
    matches!(
        s,
        Schedule::Sch(_) | Schedule::Std | Schedule::Xs | Schedule::Xxs
    )
}

fn is_stainless_schedule(s: Schedule) -> bool {
    matches!(
        s,
        Schedule::S5 | Schedule::S10 | Schedule::S40 | Schedule::S80
    )
}

fn labels(walls: &[(Schedule, f64)]) -> String {
    walls
        .iter()
        .map(|(s, _)| s.label())
        .collect::<Vec<_>>()
        .join(", ")
}

fn steel_bore(
    material: Material,
    standard: &'static str,
    row: &SteelRow,
    schedule: Option<Schedule>,
) -> Result<Bore, BoreError> {
    let schedule = match schedule.or_else(|| default_schedule(material, row.dn)) {
        Some(s) => s,
        None => {
            return Err(BoreError::MissingSchedule {
                material: material.name(),
                hint: format!(
                    "{standard} has no default wall (40S) at DN{}; write one of: {}",
                    row.dn,
                    labels(row.walls)
                ),
            });
        }
    };
    // A wall schedule of the other steel standard (40S on carbon steel, 40 on stainless) is
    // "not defined" and lists what exists; SDR, K9 or copper types do not apply at all.
    if !(is_steel_schedule(schedule) || is_stainless_schedule(schedule)) {
        return Err(BoreError::ScheduleNotApplicable {
            material: material.name(),
            schedule: schedule.label(),
            hint: if material == Material::StainlessSteel {
                STAINLESS_HINT
            } else {
                STEEL_HINT
            },
        });
    }
    row.walls
        .iter()
        .find(|(s, _)| *s == schedule)
        .map(|(_, wall)| Bore::from_mm(row.od_mm, *wall, standard))
        .ok_or_else(|| BoreError::ScheduleNotDefined {
            dn: row.dn,
            schedule: schedule.label(),
            standard,
            available: labels(row.walls),
        })
}

fn plastic_bore(
    material: Material,
    od_mm: f64,
    schedule: Option<Schedule>,
) -> Result<Bore, BoreError> {
    let standard = if material == Material::Pe {
        PE_NAME
    } else {
        PVC_NAME
    };
    let sdr = match schedule {
        Some(Schedule::Sdr(s)) => s,
        Some(other) => {
            return Err(BoreError::ScheduleNotApplicable {
                material: material.name(),
                schedule: other.label(),
                hint: SDR_HINT,
            });
        }
        None => {
            return Err(BoreError::MissingSchedule {
                material: material.name(),
                hint: "write the SDR, e.g. SDR11 or SDR17 (the wall depends on it)".into(),
            });
        }
    };
    if !(plastic::SDR_MIN..=plastic::SDR_MAX).contains(&sdr) {
        return Err(BoreError::InvalidSdr {
            sdr,
            min: plastic::SDR_MIN,
            max: plastic::SDR_MAX,
        });
    }
    let mut wall_mm = iso4065_wall_mm(od_mm, sdr);
    if material == Material::Pe {
        wall_mm = wall_mm.max(plastic::PE_MIN_WALL_MM);
    }
    Ok(Bore::from_mm(od_mm, wall_mm, standard))
}

/// Nominal wall (mm) of thermoplastics pipe of outside diameter `od_mm` and a given SDR.
///
/// # Formula
/// S = (SDR − 1)/2, replaced by the ISO 3 R20 preferred number 10^(k/20) nearest it when that is
/// within 1.5 % (SDR 11 -> S 5.012, SDR 17 -> S 7.943; SDR 21 -> S 10 exactly);
/// e = d / (2S + 1), taken to 0.01 mm, then rounded up to the next 0.1 mm.
///
/// # Source
/// ISO 4065:1996 (wall thickness from S series, rounding up); ISO 3 preferred numbers.
///
/// # Validity
/// SDR 5..=51. Reproduces the recalled ISO 4427-2 / ISO 1452-2 walls (e.g. 110 SDR17 = 6.6 mm,
/// 500 SDR11 = 45.4 mm, 75 SDR11 = 6.8 mm); 32 SDR11 gives 2.9 mm where the PE table has 3.0 mm.
fn iso4065_wall_mm(od_mm: f64, sdr: f64) -> f64 {
    let s = (sdr - 1.0) / 2.0;
    let preferred = 10f64.powf((20.0 * s.log10()).round() / 20.0);
    let s_used = if (preferred / s - 1.0).abs() < 0.015 {
        preferred
    } else {
        s
    };
    let e = od_mm / (2.0 * s_used + 1.0);
    let e_hundredths = (e * 100.0).round();
    // Round up to 0.1 mm on the hundredths (an integer count), so 10.00 stays 10.0.
    (e_hundredths / 10.0).ceil() / 10.0
}

fn ductile_bore(
    dn: u16,
    od_mm: f64,
    wall_mm: f64,
    lining_mm: f64,
    schedule: Option<Schedule>,
) -> Result<Bore, BoreError> {
    match schedule {
        None | Some(Schedule::DuctileK(9)) => {
            Ok(Bore::from_mm(od_mm, wall_mm + lining_mm, DI_NAME))
        }
        Some(k @ Schedule::DuctileK(_)) => Err(BoreError::ScheduleNotDefined {
            dn,
            schedule: k.label(),
            standard: DI_NAME,
            available: "K9".into(),
        }),
        Some(other) => Err(BoreError::ScheduleNotApplicable {
            material: Material::DuctileIron.name(),
            schedule: other.label(),
            hint: DI_HINT,
        }),
    }
}

fn b88_wall_in(row: &(f64, f64, f64, f64, f64), schedule: Schedule) -> Option<f64> {
    let w = match schedule {
        Schedule::CopperK => row.2,
        Schedule::CopperL => row.3,
        Schedule::CopperM => row.4,
        _ => return None,
    };
    (w > 0.0).then_some(w)
}

fn b88_bore(
    dn: u16,
    row: &(f64, f64, f64, f64, f64),
    schedule: Option<Schedule>,
) -> Result<Bore, BoreError> {
    let schedule = match schedule {
        Some(s @ (Schedule::CopperK | Schedule::CopperL | Schedule::CopperM)) => s,
        Some(other) => {
            return Err(BoreError::ScheduleNotApplicable {
                material: Material::Copper.name(),
                schedule: other.label(),
                hint: COPPER_HINT,
            });
        }
        None => {
            return Err(BoreError::MissingSchedule {
                material: Material::Copper.name(),
                hint: "write Type K, L or M (ASTM B88), or give the size as an outside diameter \
                       such as \"22 OD\" (EN 1057)"
                    .into(),
            });
        }
    };
    match b88_wall_in(row, schedule) {
        Some(w) => Ok(Bore::from_mm(row.1 * MM_PER_IN, w * MM_PER_IN, B88_NAME)),
        None => Err(BoreError::ScheduleNotDefined {
            dn,
            schedule: schedule.label(),
            standard: B88_NAME,
            available: [Schedule::CopperK, Schedule::CopperL, Schedule::CopperM]
                .into_iter()
                .filter(|s| b88_wall_in(row, *s).is_some())
                .map(|s| s.label())
                .collect::<Vec<_>>()
                .join(", "),
        }),
    }
}

/// Bore of a pipe from material, nominal DN and schedule (`None` -> [`default_schedule`]).
///
/// * Carbon and galvanised steel: ASME B36.10M-2004 (no schedule 5). Stainless: ASME B36.19M-2004
///   (5S, 10S, 40S, 80S); a B36.10M schedule on stainless pipe (`40`, `STD`) is an error that lists
///   the B36.19M schedules of the size, never a silent fallback.
/// * PE, PVC-U: the DN is read as the conventional outside diameter ([`plastic_od_for_dn`],
///   DN100 -> 110 mm) and the wall comes from the SDR as in [`bore_from_od`]; an SDR is required.
/// * Ductile iron: EN 545 / ISO 2531 outside diameter, class K9 wall, ISO 4179 lining
///   (3 mm DN40-300, 5 mm DN350-600); `wall_m` includes the lining.
/// * Copper: ASTM B88 by nominal size, Type K, L or M required (EN 1057 tube: [`bore_from_od`]).
/// * Cast iron, concrete: [`BoreError::NoTable`].
///
/// # Source
/// The standards above; see the `pipe/` data modules and `docs/pipes.md`.
pub fn bore(material: Material, dn: u16, schedule: Option<Schedule>) -> Result<Bore, BoreError> {
    match material {
        Material::CarbonSteel | Material::GalvanisedSteel | Material::StainlessSteel => {
            let Some((table, standard)) = steel_table(material) else {
                return Err(BoreError::NoTable {
                    material: material.name(),
                });
            };
            let row = table
                .iter()
                .find(|r| r.dn == dn)
                .ok_or(BoreError::UnknownSize {
                    dn,
                    material: material.name(),
                    standard,
                    sizes: STEEL_SIZES,
                })?;
            steel_bore(material, standard, row, schedule)
        }
        Material::Pe | Material::Pvc => {
            let od_mm = plastic_od_for_dn(dn).ok_or(BoreError::UnknownSize {
                dn,
                material: material.name(),
                standard: if material == Material::Pe {
                    PE_NAME
                } else {
                    PVC_NAME
                },
                sizes: PLASTIC_DN_SIZES,
            })? * 1000.0;
            plastic_bore(material, od_mm, schedule)
        }
        Material::DuctileIron => {
            let &(_, od, wall, lining) =
                iron::DUCTILE_K9
                    .iter()
                    .find(|r| r.0 == dn)
                    .ok_or(BoreError::UnknownSize {
                        dn,
                        material: material.name(),
                        standard: DI_NAME,
                        sizes: DI_SIZES,
                    })?;
            ductile_bore(dn, od, wall, lining, schedule)
        }
        Material::Copper => {
            let unknown = BoreError::UnknownSize {
                dn,
                material: material.name(),
                standard: B88_NAME,
                sizes: B88_SIZES,
            };
            let nps = dn_to_nps(dn).ok_or_else(|| unknown.clone())?;
            let row = copper::B88
                .iter()
                .find(|r| (r.0 - nps).abs() < 1e-9)
                .ok_or(unknown)?;
            b88_bore(dn, row, schedule)
        }
        Material::CastIron | Material::Concrete => Err(BoreError::NoTable {
            material: material.name(),
        }),
    }
}

/// Up to three tabulated diameters nearest `od_mm`, as text ("110, 125, 90").
fn nearest_ods(od_mm: f64, ods: impl Iterator<Item = f64>) -> String {
    let mut v: Vec<f64> = ods.collect();
    v.sort_by(|a, b| (a - od_mm).abs().total_cmp(&(b - od_mm).abs()));
    v.dedup();
    v.iter()
        .take(3)
        .map(|d| format!("{d}"))
        .collect::<Vec<_>>()
        .join(", ")
}

/// Bore of a pipe given by its outside diameter (m) rather than its DN.
///
/// * PE, PVC-U: `od_m` must be an ISO 161-1 nominal diameter (16..1000 mm, within 0.1 mm) and
///   `schedule` an SDR. Wall after ISO 4065: e = d/(2S+1) with S the preferred-number value of
///   (SDR−1)/2, rounded up to the next 0.1 mm; for PE at least 2.0 mm.
/// * Copper: no schedule -> EN 1057 (the usual wall of that OD); Type K/L/M -> ASTM B88 by its OD
///   (e.g. 28.575 mm = 1 1/8 in).
/// * Steel, stainless, ductile iron: the DN whose tabulated OD is within 0.5 mm, then as [`bore`].
/// * Cast iron, concrete: [`BoreError::NoTable`].
///
/// # Formula
/// PE/PVC-U: e = ⌈10·d/(2S+1)⌉/10 mm with S = (SDR−1)/2 snapped to the ISO 3 R20 series
/// (within 1.5 %); ID = d − 2e.
///
/// # Source
/// ISO 161-1:2018, ISO 4065:1996, ISO 4427-2:2019, ISO 1452-2:2009, EN 1057, ASTM B88,
/// ASME B36.10M/B36.19M, EN 545.
///
/// # Validity
/// SDR 5..=51; walls agree with ISO 4427-2 tables to within 0.1 mm.
pub fn bore_from_od(
    material: Material,
    od_m: f64,
    schedule: Option<Schedule>,
) -> Result<Bore, BoreError> {
    if !(od_m.is_finite() && od_m > 0.0) {
        return Err(BoreError::InvalidDiameter { od_m });
    }
    let od_mm = od_m * 1000.0;
    match material {
        Material::CarbonSteel | Material::GalvanisedSteel | Material::StainlessSteel => {
            let Some((table, standard)) = steel_table(material) else {
                return Err(BoreError::NoTable {
                    material: material.name(),
                });
            };
            match table.iter().find(|r| (r.od_mm - od_mm).abs() <= 0.5) {
                Some(row) => steel_bore(material, standard, row, schedule),
                None => Err(BoreError::UnknownOd {
                    material: material.name(),
                    od_mm,
                    standard,
                    nearest: nearest_ods(od_mm, table.iter().map(|r| r.od_mm)),
                }),
            }
        }
        Material::Pe | Material::Pvc => {
            match plastic::OD_SERIES_MM
                .iter()
                .find(|d| (*d - od_mm).abs() <= 0.1)
            {
                Some(d) => plastic_bore(material, *d, schedule),
                None => Err(BoreError::UnknownOd {
                    material: material.name(),
                    od_mm,
                    standard: "ISO 161-1",
                    nearest: nearest_ods(od_mm, plastic::OD_SERIES_MM.iter().copied()),
                }),
            }
        }
        Material::DuctileIron => {
            match iron::DUCTILE_K9.iter().find(|r| (r.1 - od_mm).abs() <= 0.5) {
                Some(&(dn, od, wall, lining)) => ductile_bore(dn, od, wall, lining, schedule),
                None => Err(BoreError::UnknownOd {
                    material: material.name(),
                    od_mm,
                    standard: DI_NAME,
                    nearest: nearest_ods(od_mm, iron::DUCTILE_K9.iter().map(|r| r.1)),
                }),
            }
        }
        Material::Copper => match schedule {
            None => match copper::EN_1057.iter().find(|r| (r.0 - od_mm).abs() <= 0.05) {
                Some(&(od, wall)) => Ok(Bore::from_mm(od, wall, EN_1057_NAME)),
                None => Err(BoreError::UnknownOd {
                    material: material.name(),
                    od_mm,
                    standard: EN_1057_NAME,
                    nearest: nearest_ods(od_mm, copper::EN_1057.iter().map(|r| r.0)),
                }),
            },
            Some(s) => {
                match copper::B88
                    .iter()
                    .find(|r| (r.1 * MM_PER_IN - od_mm).abs() <= 0.05)
                {
                    Some(row) => b88_bore(nps_to_dn(row.0).unwrap_or(0), row, Some(s)),
                    None => Err(BoreError::UnknownOd {
                        material: material.name(),
                        od_mm,
                        standard: B88_NAME,
                        nearest: nearest_ods(od_mm, copper::B88.iter().map(|r| r.1 * MM_PER_IN)),
                    }),
                }
            }
        },
        Material::CastIron | Material::Concrete => Err(BoreError::NoTable {
            material: material.name(),
        }),
    }
}

/// Conventional outside diameter (m) of PE or PVC-U pipe called by a DN (DN100 -> 0.110 m).
///
/// # Source
/// Common practice (no source): the ISO 161-1 diameter whose bore is nearest the DN, as
/// European water-supply schedules use it. DN10..DN1000; `None` for other DNs.
pub fn plastic_od_for_dn(dn: u16) -> Option<f64> {
    plastic::DN_TO_OD_MM
        .iter()
        .find(|(d, _)| *d == dn)
        .map(|(_, od)| od / 1000.0)
}

/// The schedule used when none is given.
///
/// Carbon and galvanised steel: `Sch(40)`, or `Std` where B36.10M defines no schedule 40
/// (DN550). Stainless: `S40`, `None` at DN550 where B36.19M defines no 40S. Ductile iron:
/// `DuctileK(9)`. PE, PVC-U and copper: `None` (the wall depends on an SDR or type the schedule
/// must give). Cast iron, concrete, and DNs without a table: `None`.
///
/// # Source
/// Project rule (docs/pipes.md): "40, STD where 40 is not defined" for steel; the rest is
/// documented in `docs/pipes.md` as the project's choice.
pub fn default_schedule(material: Material, dn: u16) -> Option<Schedule> {
    let has = |table: &[SteelRow], s: Schedule| {
        table
            .iter()
            .find(|r| r.dn == dn)
            .is_some_and(|r| r.walls.iter().any(|(w, _)| *w == s))
    };
    match material {
        Material::CarbonSteel | Material::GalvanisedSteel => [Schedule::Sch(40), Schedule::Std]
            .into_iter()
            .find(|s| has(steel::B36_10M, *s)),
        Material::StainlessSteel => has(steel::B36_19M, Schedule::S40).then_some(Schedule::S40),
        Material::DuctileIron => iron::DUCTILE_K9
            .iter()
            .any(|r| r.0 == dn)
            .then_some(Schedule::DuctileK(9)),
        Material::Pe
        | Material::Pvc
        | Material::Copper
        | Material::CastIron
        | Material::Concrete => None,
    }
}

/// Absolute roughness of a pipe wall and where the value comes from.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Roughness {
    /// Absolute (equivalent sand-grain) roughness, m.
    pub epsilon_m: f64,
    /// Source of the value, or "common practice (no source)".
    pub source: &'static str,
}

const FT_M: f64 = 0.3048;

/// Absolute roughness of new pipe of a material.
///
/// | material | ε | source |
/// | --- | --- | --- |
/// | carbon steel | 0.00015 ft = 0.04572 mm | Moody 1944, "commercial steel or wrought iron" |
/// | stainless steel | 0.015 mm | common practice; lower end of Idelchik's 0.015–0.04 mm for new clean seamless steel |
/// | galvanised steel | 0.0005 ft = 0.1524 mm | Moody 1944, "galvanized iron" |
/// | cast iron | 0.00085 ft = 0.2591 mm | Moody 1944, "cast iron" |
/// | ductile iron, cement-lined | 0.033 mm | Farshad & Rieke 2006, "cement lining" average |
/// | PVC-U, PE, copper | 0.000005 ft = 0.001524 mm | Moody 1944, "drawn tubing" |
/// | concrete | 0.001 ft = 0.3048 mm | Moody 1944, "concrete" 0.001–0.01 ft, smooth end |
///
/// # Source
/// Moody, L.F. (1944) "Friction factors for pipe flow", Trans. ASME 66(8), 671–684, Fig. 1;
/// Farshad, F.F. & Rieke, H.H. (2006) "Surface roughness design values for modern pipes",
/// SPE Drilling & Completion 21(3), 212–215; Idel'chik, I.E. (2007) Handbook of Hydraulic
/// Resistance, 4th ed., Begell House, diagram 2-5 (steel conduits).
///
/// # Validity
/// New, clean pipe. Service pipe is rougher; see [`aged_roughness`].
pub fn roughness(material: Material) -> Roughness {
    let (epsilon_m, source) = match material {
        Material::CarbonSteel => (
            0.00015 * FT_M,
            "Moody 1944, Trans. ASME 66, Fig. 1: commercial steel or wrought iron 0.00015 ft",
        ),
        Material::StainlessSteel => (
            0.015e-3,
            "common practice (no source): 0.015 mm, the lower end of Idel'chik 2007 \
             (Handbook of Hydraulic Resistance) 0.015-0.04 mm for new clean seamless steel",
        ),
        Material::GalvanisedSteel => (
            0.0005 * FT_M,
            "Moody 1944, Trans. ASME 66, Fig. 1: galvanized iron 0.0005 ft",
        ),
        Material::CastIron => (
            0.00085 * FT_M,
            "Moody 1944, Trans. ASME 66, Fig. 1: cast iron 0.00085 ft",
        ),
        Material::DuctileIron => (
            33e-6,
            "Farshad & Rieke 2006, SPE Drilling & Completion 21(3): cement lining, average 33 um",
        ),
        Material::Pvc | Material::Pe | Material::Copper => (
            0.000005 * FT_M,
            "Moody 1944, Trans. ASME 66, Fig. 1: drawn tubing 0.000005 ft",
        ),
        Material::Concrete => (
            0.001 * FT_M,
            "Moody 1944, Trans. ASME 66, Fig. 1: concrete 0.001-0.01 ft (smooth end)",
        ),
    };
    Roughness { epsilon_m, source }
}

/// Growth rate of roughness of unlined ferrous pipe in water service, m per year (0.025 mm/yr).
///
/// # Source
/// Common practice (no source); from memory it is the "slight attack" class of
/// Lamont, P.A. (1981) "Common pipe flow formulas compared with the theory of roughness",
/// J. AWWA 73(5), 274–280.
pub const AGEING_RATE_M_PER_YEAR: f64 = 0.025e-3;

/// Roughness of unlined ferrous pipe after `age_years` of water service.
///
/// # Formula
/// ε(t) = ε₀ + a·t, with ε₀ = [`roughness`] and a = [`AGEING_RATE_M_PER_YEAR`].
///
/// # Source
/// Colebrook, C.F. & White, C.M. (1937) "The reduction of carrying capacity of pipes with age",
/// J. Inst. Civil Eng. 7(1), 99–118 (linear growth of roughness with age). Growth rate: common
/// practice (see [`AGEING_RATE_M_PER_YEAR`]).
///
/// # Validity
/// Carbon steel, galvanised steel, cast iron (unlined ferrous pipe); age 0..=150 years.
/// `None` for other materials (lined or non-corroding: use the new value) or an age that is
/// negative, not finite or above 150 years.
pub fn aged_roughness(material: Material, age_years: f64) -> Option<f64> {
    if !material.is_unlined_ferrous() || !(0.0..=150.0).contains(&age_years) {
        return None;
    }
    Some(roughness(material).epsilon_m + AGEING_RATE_M_PER_YEAR * age_years)
}
