//! The canonical tables and columns, with the header spellings each column answers to.
//!
//! Matching folds case and drops everything but letters and digits, so `Line No`, `line_no` and
//! `LINE-NO.` are one spelling. The full list is documented in `docs/input-format.md`.

use crate::units::Quantity;

/// The input tables.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum TableKind {
    /// One row per line: service, flow, fluid, temperature.
    Lines,
    /// One row per pipe run.
    Pipes,
    /// One row per fitting (or group of identical fittings).
    Fittings,
    /// Optional: ordered lines forming a pumped system.
    Systems,
    /// Optional: properties of liquids other than water.
    Fluids,
    /// Optional: pump head-versus-flow points per system.
    PumpCurve,
    /// A mixed item list (bill of quantities, takeoff, register export): runs and fittings in
    /// one table, read by [`crate::ingest::list`] into Pipes and Fittings rows.
    List,
}

impl TableKind {
    /// Canonical sheet name.
    pub fn sheet_name(self) -> &'static str {
        spec(self).sheet
    }
}

/// How a column's cells are read.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ColumnType {
    /// Free text (ids, names).
    Text,
    /// A physical quantity with a unit from the header, the units row or the cell.
    Number(Quantity),
    /// A pure number (Reynolds-free coefficients, counts, ratios).
    Plain,
    /// A pipe size in one of the size notations.
    Size,
}

/// One canonical column.
#[derive(Clone, Copy, Debug)]
pub struct ColumnSpec {
    /// Stable key used in code.
    pub key: &'static str,
    /// Canonical header as written in the template.
    pub header: &'static str,
    /// How cells are read.
    pub ty: ColumnType,
    /// Other spellings (folded on comparison).
    pub aliases: &'static [&'static str],
    /// What the column means, for the template's read-me and the docs.
    pub meaning: &'static str,
}

/// One canonical table.
#[derive(Clone, Copy, Debug)]
pub struct TableSpec {
    /// Which table.
    pub kind: TableKind,
    /// Canonical sheet name.
    pub sheet: &'static str,
    /// Other sheet names it is found under (folded on comparison).
    pub sheet_aliases: &'static [&'static str],
    /// Columns.
    pub columns: &'static [ColumnSpec],
    /// Keys of columns that must be present.
    pub required: &'static [&'static str],
}

use ColumnType::{Number, Plain, Size, Text};
use Quantity::*;

const fn col(
    key: &'static str,
    header: &'static str,
    ty: ColumnType,
    aliases: &'static [&'static str],
    meaning: &'static str,
) -> ColumnSpec {
    ColumnSpec {
        key,
        header,
        ty,
        aliases,
        meaning,
    }
}

const LINE_ALIASES: &[&str] = &[
    "Line No",
    "Line number",
    "Line ref",
    "Line id",
    "Pipe line",
    "Line tag",
    "Line code",
];

static LINES: TableSpec = TableSpec {
    kind: TableKind::Lines,
    sheet: "Lines",
    sheet_aliases: &[
        "Line list",
        "Line schedule",
        "Line register",
        "Flows",
        "Duty",
    ],
    required: &["line"],
    columns: &[
        col(
            "line",
            "Line",
            Text,
            LINE_ALIASES,
            "Line id, unique in the workbook",
        ),
        col(
            "service",
            "Service",
            Text,
            &["Duty type", "Line service", "Use"],
            "pump-suction, pump-discharge, distribution, gravity or general (default general)",
        ),
        col(
            "flow",
            "Flow",
            Number(Flow),
            &[
                "Flow rate",
                "Design flow",
                "Q",
                "Flowrate",
                "Duty flow",
                "Capacity",
            ],
            "Volume flow the line carries (default unit m3/h)",
        ),
        col(
            "fluid",
            "Fluid",
            Text,
            &["Medium", "Liquid", "Media"],
            "Fluid name (default water)",
        ),
        col(
            "temperature",
            "Temperature",
            Number(Temperature),
            &["Temp", "T", "Fluid temperature", "Operating temperature"],
            "Fluid temperature (default 20 °C)",
        ),
        col(
            "from",
            "From",
            Text,
            &["Start", "Origin", "From point"],
            "Where the line starts",
        ),
        col(
            "to",
            "To",
            Text,
            &["End", "Destination", "To point"],
            "Where the line ends",
        ),
        col(
            "elevation_change",
            "Elevation change",
            Number(Length),
            &[
                "Rise",
                "Static rise",
                "dZ",
                "Elevation diff",
                "Level change",
            ],
            "Outlet elevation minus inlet elevation",
        ),
        col(
            "hours_per_year",
            "Hours per year",
            Number(Duration),
            &[
                "Run hours",
                "Operating hours",
                "Hours/yr",
                "Annual hours",
                "Hrs per year",
            ],
            "Hours per year the line runs",
        ),
        col(
            "system",
            "System",
            Text,
            &["Pump system", "Circuit"],
            "System the line belongs to",
        ),
        col(
            "efficiency",
            "Efficiency",
            Number(Fraction),
            &["Pump efficiency", "Wire to water efficiency", "Eta"],
            "Wire-to-water efficiency of the pump driving the line",
        ),
    ],
};

static PIPES: TableSpec = TableSpec {
    kind: TableKind::Pipes,
    sheet: "Pipes",
    sheet_aliases: &[
        "Pipe takeoff",
        "Pipework",
        "Pipe runs",
        "Pipe schedule",
        "Piping",
        "Takeoff",
        "Pipe list",
    ],
    required: &["line", "length"],
    columns: &[
        col(
            "line",
            "Line",
            Text,
            LINE_ALIASES,
            "Line id the run belongs to",
        ),
        col(
            "seq",
            "Seq",
            Plain,
            &["Sequence", "Run", "Run no", "Order", "Item no"],
            "Order of the run along its line",
        ),
        col(
            "size",
            "Size",
            Size,
            &[
                "NB",
                "Nom size",
                "Nominal size",
                "DN",
                "Dia",
                "Diameter",
                "NPS",
                "Pipe size",
                "Bore size",
            ],
            "Nominal size: DN100, 100NB, NPS 4, 4\", 110 OD",
        ),
        col(
            "schedule",
            "Schedule",
            Text,
            &["Sch", "Sched", "Wall", "Class", "SDR", "Rating"],
            "Wall schedule: 40, STD, XS, 80, 10S, 40S, SDR11",
        ),
        col(
            "material",
            "Material",
            Text,
            &["Matl", "Mat", "Pipe material", "Spec", "Material spec"],
            "Pipe material: carbon steel, stainless, PE, PVC, ductile iron ...",
        ),
        col(
            "length",
            "Length",
            Number(Length),
            &[
                "Len",
                "L",
                "Run length",
                "Pipe length",
                "Qty length",
                "Straight length",
            ],
            "Run length along the pipe",
        ),
        col(
            "inner_diameter",
            "Inner diameter",
            Number(Length),
            &[
                "ID",
                "Bore",
                "Internal diameter",
                "Inside diameter",
                "Actual ID",
            ],
            "Measured or specified bore (overrides Size and Schedule)",
        ),
        col(
            "roughness",
            "Roughness",
            Number(Length),
            &["Epsilon", "Abs roughness", "Absolute roughness", "e"],
            "Absolute roughness (overrides the material's new-pipe value)",
        ),
        col(
            "age",
            "Age",
            Plain,
            &["Years in service", "Pipe age", "Service years", "Age years"],
            "Age in years (roughens unlined iron and steel)",
        ),
        col(
            "c_factor",
            "C factor",
            Plain,
            &["C", "HW C", "Hazen Williams C", "HW factor", "C value"],
            "Hazen-Williams C (water only; replaces Darcy friction for the run)",
        ),
        col(
            "flow",
            "Flow",
            Number(Flow),
            &["Flow rate", "Design flow", "Q", "Flowrate"],
            "Flow, when Lines has none",
        ),
    ],
};

static FITTINGS: TableSpec = TableSpec {
    kind: TableKind::Fittings,
    sheet: "Fittings",
    sheet_aliases: &[
        "Fitting schedule",
        "Valves",
        "Valve schedule",
        "Fittings and valves",
        "Valves and fittings",
        "Fitting list",
        "Valve list",
    ],
    required: &["line", "item"],
    columns: &[
        col(
            "tag",
            "Tag",
            Text,
            &[
                "Tag no",
                "Tag number",
                "Item tag",
                "Ref",
                "Asset",
                "Asset id",
            ],
            "Fitting tag",
        ),
        col(
            "line",
            "Line",
            Text,
            LINE_ALIASES,
            "Line id the fitting sits on",
        ),
        col(
            "item",
            "Item",
            Text,
            &[
                "Type",
                "Fitting",
                "Fitting type",
                "Description",
                "Component",
                "Kind",
            ],
            "What the fitting is, in free text: '90 LR elbow', 'gate valve', 'Y strainer'",
        ),
        col(
            "size",
            "Size",
            Size,
            &[
                "NB",
                "Nom size",
                "Nominal size",
                "DN",
                "Dia",
                "Size in",
                "Inlet size",
            ],
            "Size (inlet for reducers)",
        ),
        col(
            "size_out",
            "Size out",
            Size,
            &["Outlet size", "Size 2", "To size", "Reduced size"],
            "Outlet size of a reducer, expansion or contraction",
        ),
        col(
            "qty",
            "Qty",
            Plain,
            &["Quantity", "No", "Number", "Count", "Nos"],
            "How many identical items (default 1)",
        ),
        col(
            "opening",
            "Opening",
            Number(Fraction),
            &["Position", "Open", "% open", "Valve position", "Travel"],
            "How far a valve is open (default 100 %)",
        ),
        col(
            "k",
            "K",
            Plain,
            &[
                "K value",
                "K factor",
                "Loss coefficient",
                "Resistance coefficient",
            ],
            "Loss coefficient from a datasheet",
        ),
        col(
            "kv",
            "Kv",
            Plain,
            &["Kvs", "Kv value"],
            "Flow coefficient Kv, m3/h at 1 bar",
        ),
        col(
            "cv",
            "Cv",
            Plain,
            &["Cv value", "Flow coefficient"],
            "Flow coefficient Cv, US gpm at 1 psi",
        ),
        col(
            "le_d",
            "Le/D",
            Plain,
            &["L/D", "Equivalent length ratio", "Le over D"],
            "Equivalent length in diameters",
        ),
        col(
            "bend_radius_d",
            "Bend radius/D",
            Plain,
            &["r/D", "R/D", "Radius ratio", "Bend ratio"],
            "Bend centreline radius over bore",
        ),
        col(
            "angle",
            "Angle",
            Plain,
            &["Bend angle", "Deg", "Angle deg", "Cone angle"],
            "Bend angle or cone angle, degrees",
        ),
        col(
            "fouling",
            "Fouling",
            Plain,
            &["Fouling factor", "Blockage factor", "Dirt factor"],
            "Multiplier on a strainer's clean K (default 1)",
        ),
        col(
            "replacement_cost",
            "Replacement cost",
            Plain,
            &["Cost", "Replace cost", "Upgrade cost", "Capex"],
            "Cost to replace with the suggested item",
        ),
        col(
            "beta",
            "Beta",
            Plain,
            &["Beta ratio", "d/D", "Orifice ratio"],
            "Orifice bore over pipe bore",
        ),
    ],
};

static SYSTEMS: TableSpec = TableSpec {
    kind: TableKind::Systems,
    sheet: "Systems",
    sheet_aliases: &["Pump systems", "Circuits", "Duty points"],
    required: &["system"],
    columns: &[
        col(
            "system",
            "System",
            Text,
            &["System id", "Pump system", "Circuit"],
            "System id",
        ),
        col(
            "lines",
            "Lines",
            Text,
            &["Line sequence", "Route", "Path"],
            "Line ids in order, suction side first, comma separated",
        ),
        col(
            "static_head",
            "Static head",
            Number(Head),
            &["Static lift", "Hstat", "Static"],
            "Static head from source level to delivery",
        ),
        col(
            "pump_head",
            "Pump head",
            Number(Head),
            &["Duty head", "Rated head", "Pump TDH", "TDH"],
            "Pump head at duty flow",
        ),
        col(
            "npsh_required",
            "NPSH required",
            Number(Head),
            &["NPSHr", "NPSH r", "Required NPSH"],
            "Pump NPSH required at duty flow",
        ),
        col(
            "source_pressure",
            "Source pressure",
            Number(Pressure),
            &["Suction pressure", "Tank pressure", "Surface pressure"],
            "Absolute pressure on the source liquid surface (default atmospheric)",
        ),
        col(
            "suction_level",
            "Suction level",
            Number(Length),
            &["Liquid level", "Suction head", "Level above pump"],
            "Source liquid level above the pump centreline",
        ),
        col(
            "site_elevation",
            "Site elevation",
            Number(Length),
            &[
                "Site altitude",
                "Altitude",
                "Elevation above sea level",
                "Height above sea level",
            ],
            "Site elevation above mean sea level, for the standard atmosphere (default 0 m, sea level)",
        ),
        col(
            "efficiency",
            "Efficiency",
            Number(Fraction),
            &["Pump efficiency", "Wire to water efficiency", "Eta"],
            "Wire-to-water efficiency",
        ),
        col(
            "control",
            "Control",
            Text,
            &["Flow control", "Control mode", "Duty control", "Regulation"],
            "How the flow is set: fixed (fixed speed, no throttling), throttled (a valve sets it) or speed (variable-speed drive); default fixed, assumed and marked",
        ),
        col(
            "metered_energy",
            "Metered energy",
            Number(Energy),
            &[
                "Annual energy",
                "Energy per year",
                "Metered kWh",
                "kWh per year",
                "Annual kWh",
                "Energy used",
            ],
            "Electrical energy the pump set used in a year, from the meter (default unit kWh per year)",
        ),
        col(
            "metered_volume",
            "Metered volume",
            Number(Volume),
            &[
                "Annual volume",
                "Volume per year",
                "Volume pumped",
                "Annual throughput",
                "Metered m3",
            ],
            "Volume pumped in the same year, from the flow meter (default unit m3 per year)",
        ),
        col(
            "test_flow",
            "Test flow",
            Number(Flow),
            &[
                "Measured flow",
                "Site test flow",
                "Tested flow",
                "Flow at test",
            ],
            "Flow measured at a site test of the pump set (default unit m3/h)",
        ),
        col(
            "test_suction_pressure",
            "Test suction pressure",
            Number(Pressure),
            &[
                "Measured suction pressure",
                "Suction gauge",
                "Suction gauge pressure",
                "Inlet pressure at test",
            ],
            "Gauge pressure at the pump inlet during the test (default unit kPa; same reference as the discharge)",
        ),
        col(
            "test_discharge_pressure",
            "Test discharge pressure",
            Number(Pressure),
            &[
                "Measured discharge pressure",
                "Discharge gauge",
                "Discharge gauge pressure",
                "Outlet pressure at test",
            ],
            "Gauge pressure at the pump outlet during the test (default unit kPa)",
        ),
        col(
            "test_head",
            "Test head",
            Number(Head),
            &[
                "Measured head",
                "Site test head",
                "Head at test",
                "Tested head",
            ],
            "Pump head measured at the test (instead of the two pressures)",
        ),
        col(
            "test_power",
            "Test power",
            Number(Power),
            &[
                "Motor input power",
                "Measured power",
                "Input power",
                "Power at test",
                "Electrical input",
            ],
            "Electrical power drawn by the pump set at the test (default unit kW)",
        ),
        col(
            "share",
            "Share",
            Text,
            &[
                "Flow share",
                "Share of flow",
                "Shared line share",
                "Header share",
                "Split",
            ],
            "This system's share of the flow of the lines it shares with other systems (a common header): a fraction or percentage for all of them (0.6, 60 %), or per line (H1: 60 %, H2: 0.5); default: by the systems' duty flows",
        ),
    ],
};

static FLUIDS: TableSpec = TableSpec {
    kind: TableKind::Fluids,
    sheet: "Fluids",
    sheet_aliases: &["Fluid properties", "Liquids", "Media"],
    required: &["fluid", "density", "viscosity"],
    columns: &[
        col(
            "fluid",
            "Fluid",
            Text,
            &["Name", "Medium", "Liquid"],
            "Fluid name as used in Lines",
        ),
        col(
            "density",
            "Density",
            Number(Density),
            &["Rho", "Specific mass"],
            "Density at operating temperature",
        ),
        col(
            "viscosity",
            "Viscosity",
            Number(Viscosity),
            &["Dynamic viscosity", "Mu", "Visc"],
            "Dynamic viscosity",
        ),
        col(
            "vapour_pressure",
            "Vapour pressure",
            Number(Pressure),
            &["Vapor pressure", "Pv", "Psat"],
            "Vapour pressure (absolute)",
        ),
    ],
};

static PUMP_CURVE: TableSpec = TableSpec {
    kind: TableKind::PumpCurve,
    sheet: "Pump curve",
    sheet_aliases: &[
        "Pump curves",
        "Pump characteristic",
        "Pump characteristics",
        "Head flow",
    ],
    required: &["system", "flow", "head"],
    columns: &[
        col(
            "system",
            "System",
            Text,
            &["System id", "Pump system", "Circuit"],
            "System id the point belongs to",
        ),
        col(
            "flow",
            "Flow",
            Number(Flow),
            &["Flow rate", "Q", "Capacity"],
            "Pump flow at the point (default unit m3/h)",
        ),
        col(
            "head",
            "Head",
            Number(Head),
            &["Pump head", "Total head", "H", "TDH"],
            "Pump head at that flow",
        ),
        col(
            "npsh_required",
            "NPSH required",
            Number(Head),
            &["NPSHr", "NPSH r", "Required NPSH", "NPSH3"],
            "Pump NPSH required at that flow (optional; from the maker's curve)",
        ),
        col(
            "efficiency",
            "Efficiency",
            Number(Fraction),
            &["Pump efficiency", "Eta", "Eff", "Hydraulic efficiency"],
            "Pump efficiency at that flow (optional; from the maker's curve)",
        ),
        col(
            "power",
            "Power",
            Number(Power),
            &[
                "Shaft power",
                "Pump power",
                "Absorbed power",
                "Power input",
                "P2",
            ],
            "Pump shaft power at that flow (optional; gives the efficiency when none is given)",
        ),
    ],
};

/// The spec of a table.
pub fn spec(kind: TableKind) -> &'static TableSpec {
    match kind {
        TableKind::Lines => &LINES,
        TableKind::Pipes => &PIPES,
        TableKind::Fittings => &FITTINGS,
        TableKind::Systems => &SYSTEMS,
        TableKind::Fluids => &FLUIDS,
        TableKind::PumpCurve => &PUMP_CURVE,
        TableKind::List => &super::list::columns::LIST,
    }
}

/// All tables in reading order.
pub const ALL_TABLES: [TableKind; 6] = [
    TableKind::Lines,
    TableKind::Pipes,
    TableKind::Fittings,
    TableKind::Systems,
    TableKind::Fluids,
    TableKind::PumpCurve,
];

/// Fold a header or sheet name for comparison: lower case, letters and digits only
/// (`%` is kept as the word `pct` so `% open` stays distinct).
pub fn fold(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for c in text.chars() {
        if c == '%' {
            out.push_str("pct");
        } else if c.is_alphanumeric() {
            out.extend(c.to_lowercase());
        }
    }
    out
}

/// Whether [`fold`]`(text)` equals `folded`, stopping at the first difference (no allocation).
pub fn fold_eq(text: &str, folded: &str) -> bool {
    let mut want = folded.chars();
    for c in text.chars() {
        if c == '%' {
            if !"pct".chars().all(|p| want.next() == Some(p)) {
                return false;
            }
        } else if c.is_alphanumeric() && !c.to_lowercase().all(|l| want.next() == Some(l)) {
            return false;
        }
    }
    want.next().is_none()
}

/// The first `n` characters of [`fold`]`(text)`, folding no more of the text than needed.
pub fn fold_prefix(text: &str, n: usize) -> String {
    let mut out = String::new();
    for c in text.chars() {
        if out.len() >= n {
            break;
        }
        if c == '%' {
            out.push_str("pct");
        } else if c.is_alphanumeric() {
            out.extend(c.to_lowercase());
        }
    }
    out
}

/// The column of a table a folded header names, if any.
pub fn match_column(kind: TableKind, folded: &str) -> Option<&'static ColumnSpec> {
    if folded.is_empty() {
        return None;
    }
    spec(kind)
        .columns
        .iter()
        .find(|c| fold(c.header) == folded || c.aliases.iter().any(|a| fold(a) == folded))
}

/// The table a sheet name belongs to, if any.
pub fn match_sheet(name: &str) -> Option<TableKind> {
    let folded = fold(name);
    ALL_TABLES.into_iter().find(|&k| {
        let s = spec(k);
        fold(s.sheet) == folded || s.sheet_aliases.iter().any(|a| fold(a) == folded)
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn headers_fold_to_their_columns() {
        assert_eq!(
            match_column(TableKind::Pipes, &fold("Line No.")).map(|c| c.key),
            Some("line")
        );
        assert_eq!(
            match_column(TableKind::Pipes, &fold("Nom. size")).map(|c| c.key),
            Some("size")
        );
        assert_eq!(
            match_column(TableKind::Fittings, &fold("Size out")).map(|c| c.key),
            Some("size_out")
        );
        assert_eq!(
            match_column(TableKind::Fittings, &fold("% open")).map(|c| c.key),
            Some("opening")
        );
        assert_eq!(
            match_column(TableKind::Fittings, &fold("Le/D")).map(|c| c.key),
            Some("le_d")
        );
        assert_eq!(match_sheet("Pipe takeoff"), Some(TableKind::Pipes));
        assert_eq!(match_sheet("FITTINGS"), Some(TableKind::Fittings));
        assert_eq!(match_sheet("Notes"), None);
    }

    #[test]
    fn no_alias_is_shared_within_a_table() {
        for kind in ALL_TABLES {
            let mut seen = std::collections::HashMap::new();
            for c in spec(kind).columns {
                for name in std::iter::once(&c.header).chain(c.aliases) {
                    if let Some(other) = seen.insert(fold(name), c.key)
                        && other != c.key
                    {
                        panic!("{kind:?}: '{name}' names both {other} and {}", c.key);
                    }
                }
            }
        }
    }

    proptest::proptest! {
        /// The allocation-free helpers agree with `fold` on any text (including `%`, case
        /// changes that expand, and non-ASCII letters).
        #[test]
        fn fold_helpers_agree_with_fold(text in "[a-zA-Z0-9 %İßÉé_./-]{0,24}", other in "[a-z0-9%]{0,8}") {
            let f = fold(&text);
            proptest::prop_assert!(fold_eq(&text, &f));
            proptest::prop_assert_eq!(fold_eq(&text, &other), f == other);
            let p = fold_prefix(&text, 5);
            proptest::prop_assert!(f.starts_with(&p));
            proptest::prop_assert!(p.len() >= f.len().min(5));
        }
    }
}
