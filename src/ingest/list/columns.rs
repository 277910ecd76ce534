//! The columns of a mixed item list: the text, numbering, quantity and unit columns of a bill of
//! quantities, takeoff or register export, plus every Pipes and Fittings column (each applies
//! to the rows of its kind). Spellings are folded like all headers.

use crate::ingest::schema::{ColumnSpec, ColumnType, TableKind, TableSpec};
use crate::units::Quantity::{Flow, Fraction, Length};
use ColumnType::{Number, Plain, Size, Text};

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

/// Sheet names a mixed list is often kept under (it is also found by its headers anywhere).
pub const LIST_SHEETS: &[&str] = &[
    "Item list",
    "Bill of quantities",
    "BoQ",
    "Bill of materials",
    "BOM",
    "Material takeoff",
    "Material take-off",
    "MTO",
    "Mechanical takeoff",
    "Asset register",
    "Asset list",
    "Equipment list",
    "Register",
    "Register export",
];

/// Keys of columns that belong to pipe runs only.
pub const RUN_ONLY: &[&str] = &[
    "length",
    "inner_diameter",
    "roughness",
    "age",
    "c_factor",
    "flow",
];

/// Keys of columns that belong to fittings only.
pub const FITTING_ONLY: &[&str] = &[
    "size_out",
    "opening",
    "k",
    "kv",
    "cv",
    "le_d",
    "bend_radius_d",
    "angle",
    "fouling",
    "beta",
    "replacement_cost",
];

/// The mixed list.
pub static LIST: TableSpec = TableSpec {
    kind: TableKind::List,
    sheet: "Item list",
    sheet_aliases: LIST_SHEETS,
    required: &["description"],
    columns: &[
        col("item_no", "Item no", Text, &["Item number", "No", "Ref no", "Item ref", "Pos", "Pos no", "S/No", "Sr no", "Serial no", "Bill ref", "Clause", "Line item"], "Item numbering (1, 001, 3.4, (a), A.2.3): kept and shown, not read"),
        col("description", "Description", Text, &["Item", "Item description", "Particulars", "Material description", "Desc", "Item text", "Component", "Fitting", "Type", "Asset description", "Equipment description", "Short text", "Object description", "Details"], "What the row is, in free text: 'DN150 gate valve PN16', 'PIPE, DI, DN300'"),
        col("tag", "Tag", Text, &["Tag no", "Tag number", "Item tag", "Asset", "Asset id", "Asset no", "Asset number", "Equipment", "Equipment no", "Equipment number"], "Tag or asset number"),
        col("line", "Line", Text, &["Line No", "Line number", "Line ref", "Line id", "Pipe line", "Line tag", "Line code"], "Line id the row belongs to (or give lines by heading rows, tags or locations)"),
        col("status", "Status", Text, &["Asset status", "Equipment status", "System status", "Operational status", "User status", "State"], "In service, Duty, Standby / Decommissioned, Removed, Abandoned, Spare"),
        col("location", "Location", Text, &["Functional location", "FLOC", "Func loc", "Functional loc", "Parent", "Parent asset", "System", "Installed at", "Area"], "Where the asset sits: used as its line when it matches a line id (or through the map's [locations])"),
        col("size", "Size", Size, &["NB", "Nom size", "Nominal size", "DN", "Dia", "Diameter", "NPS", "Pipe size", "Bore size", "Size in", "Inlet size"], "Size; a reducer (150x100) or a schedule (4\" Sch 80) in the cell is read too"),
        col("size_out", "Size out", Size, &["Outlet size", "Size 2", "To size", "Reduced size"], "Outlet size of a reducer or expansion"),
        col("qty", "Qty", Plain, &["Quantity", "Quant", "Count", "Nos", "No off", "Number off", "Number"], "How many (fittings) or how long (runs); may carry its unit: 2 No, 12.5 m, 12'6\""),
        col("unit", "Unit", Text, &["Units", "UOM", "U/M", "Unit of measure", "Meas", "Measure", "Unit of measurement"], "m, lm, ft, LF (runs); No, nr, ea, pcs, off, set (fittings); Sum, Item, % (skipped)"),
        col("length", "Length", Number(Length), &["Len", "Run length", "Pipe length", "Straight length"], "Run length, when a separate column gives it"),
        col("schedule", "Schedule", Text, &["Sch", "Sched", "Wall", "SDR"], "Wall schedule: 40, STD, XS, 10S, SDR11"),
        col("material", "Material", Text, &["Matl", "Mat", "Pipe material", "Material spec", "Spec"], "Material: CS, SS316, DI, HDPE, uPVC, copper ..."),
        col("rating", "Rating", Text, &["Pressure rating", "PN", "Pressure class", "Class"], "PN16, Class 150: kept in the copy, not used in the hydraulics"),
        col("inner_diameter", "Inner diameter", Number(Length), &["ID", "Bore", "Internal diameter", "Inside diameter", "Actual ID"], "Bore of a run"),
        col("roughness", "Roughness", Number(Length), &["Epsilon", "Abs roughness", "Absolute roughness"], "Absolute roughness of a run"),
        col("age", "Age", Plain, &["Years in service", "Pipe age", "Service years", "Age years"], "Age of a run, years"),
        col("c_factor", "C factor", Plain, &["HW C", "Hazen Williams C", "HW factor", "C value"], "Hazen-Williams C of a run"),
        col("flow", "Flow", Number(Flow), &["Flow rate", "Design flow", "Flowrate"], "Flow of a run, when Lines has none"),
        col("opening", "Opening", Number(Fraction), &["Position", "Open", "% open", "Valve position", "Travel"], "How far a valve is open"),
        col("k", "K", Plain, &["K value", "K factor", "Loss coefficient", "Resistance coefficient"], "Loss coefficient of a fitting"),
        col("kv", "Kv", Plain, &["Kvs", "Kv value"], "Kv of a fitting"),
        col("cv", "Cv", Plain, &["Cv value", "Flow coefficient"], "Cv of a fitting"),
        col("le_d", "Le/D", Plain, &["L/D", "Equivalent length ratio", "Le over D"], "Equivalent length of a fitting in diameters"),
        col("bend_radius_d", "Bend radius/D", Plain, &["r/D", "R/D", "Radius ratio", "Bend ratio"], "Bend radius over bore"),
        col("angle", "Angle", Plain, &["Bend angle", "Deg", "Angle deg", "Cone angle"], "Bend or cone angle, degrees"),
        col("fouling", "Fouling", Plain, &["Fouling factor", "Blockage factor", "Dirt factor"], "Multiplier on a strainer's clean K"),
        col("beta", "Beta", Plain, &["Beta ratio", "d/D", "Orifice ratio"], "Orifice bore over pipe bore"),
        col("replacement_cost", "Replacement cost", Plain, &["Replace cost", "Upgrade cost", "Capex"], "Cost to replace a fitting"),
    ],
};
