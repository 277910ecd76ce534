//! Small valid stations, as sheets to edit before writing: the canonical tables and the same
//! station kept as one mixed item list. Invented.

use super::book::{Cell, Sheet, n, s};

/// The smallest valid station: one line, one run, an elbow and a gate valve.
///
/// The Lines sheet of both small stations: line `L1`, pump discharge, 50 m³/h. Invented.
fn lines_sheet() -> Sheet {
    Sheet::new(
        "Lines",
        vec![
            vec![s("Line"), s("Service"), s("Flow [m3/h]")],
            vec![s("L1"), s("pump-discharge"), n(50.0)],
        ],
    )
}

/// Lines: A Line, B Service, C Flow [m3/h]. Pipes: A Line, B Seq, C Size, D Schedule, E Material,
/// F Length [m]. Fittings: A Tag, B Line, C Item, D Size, E Size out, F Qty, G Opening [%], H K.
pub fn base_station() -> Vec<Sheet> {
    vec![
        lines_sheet(),
        Sheet::new(
            "Pipes",
            vec![
                vec![
                    s("Line"),
                    s("Seq"),
                    s("Size"),
                    s("Schedule"),
                    s("Material"),
                    s("Length [m]"),
                ],
                vec![
                    s("L1"),
                    n(1.0),
                    s("DN100"),
                    s("40"),
                    s("carbon steel"),
                    n(20.0),
                ],
            ],
        ),
        Sheet::new(
            "Fittings",
            vec![
                vec![
                    s("Tag"),
                    s("Line"),
                    s("Item"),
                    s("Size"),
                    s("Size out"),
                    s("Qty"),
                    s("Opening [%]"),
                    s("K"),
                ],
                vec![s("F1"), s("L1"), s("elbow-90"), s("DN100"), Cell::E, n(1.0)],
                vec![
                    s("V1"),
                    s("L1"),
                    s("valve-gate"),
                    s("DN100"),
                    Cell::E,
                    n(1.0),
                ],
            ],
        ),
    ]
}

/// A small valid station kept as one mixed item list (`BoQ`: Item, Line, Description, Size,
/// Qty, Unit) with its Lines sheet. Invented.
pub fn list_station() -> Vec<Sheet> {
    vec![
        lines_sheet(),
        Sheet::new(
            "BoQ",
            vec![
                vec![
                    s("Item"),
                    s("Line"),
                    s("Description"),
                    s("Size"),
                    s("Qty"),
                    s("Unit"),
                ],
                vec![
                    s("1"),
                    s("L1"),
                    s("Pipe, CS, Sch 40"),
                    s("DN100"),
                    n(20.0),
                    s("m"),
                ],
                vec![
                    s("2"),
                    s("L1"),
                    s("Gate valve PN16"),
                    s("DN100"),
                    n(1.0),
                    s("No"),
                ],
                vec![
                    s("3"),
                    s("L1"),
                    s("90 LR elbow"),
                    s("DN100"),
                    n(2.0),
                    s("No"),
                ],
            ],
        ),
    ]
}
