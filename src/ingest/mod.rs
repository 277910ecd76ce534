//! Reading input workbooks into typed, SI rows with their source cells, plus diagnostics.
//!
//! Flow: [`grid`] reads the sheets whole (calamine), [`header`] finds each table's header row and
//! maps columns through [`schema`], and [`rows`] reads each cell with [`parse`], collecting every
//! problem as a [`Diagnostic`] so the user sees them all at once.

pub mod grid;
pub mod header;
pub mod parse;
pub mod rows;
pub mod schema;

use sha2::{Digest, Sha256};
use std::path::{Path, PathBuf};

use crate::error::{Diagnostic, InputError, Severity};
pub use grid::SheetGrid;
pub use header::Layout;
pub use rows::{FittingRow, FluidRow, LineRow, PipeRow, Service, SystemRow};
pub use schema::TableKind;

/// One input workbook, read and parsed.
#[derive(Clone, Debug)]
pub struct Input {
    /// File name as given on the command line.
    pub file: String,
    /// Path of the file.
    pub path: PathBuf,
    /// SHA-256 of the file's bytes, hex.
    pub sha256: String,
    /// Every sheet, every cell.
    pub sheets: Vec<SheetGrid>,
    /// Where each table was found.
    pub layouts: Vec<Layout>,
    /// Parsed rows.
    pub lines: Vec<LineRow>,
    /// Parsed rows.
    pub pipes: Vec<PipeRow>,
    /// Parsed rows.
    pub fittings: Vec<FittingRow>,
    /// Parsed rows.
    pub systems: Vec<SystemRow>,
    /// Parsed rows.
    pub fluids: Vec<FluidRow>,
    /// Everything noticed while reading, in sheet order.
    pub diagnostics: Vec<Diagnostic>,
}

impl Input {
    /// Number of error-level diagnostics.
    pub fn error_count(&self) -> usize {
        self.diagnostics.iter().filter(|d| d.severity == Severity::Error).count()
    }

    /// The layout of a table, when the table was found.
    pub fn layout(&self, table: TableKind) -> Option<&Layout> {
        self.layouts.iter().find(|l| l.table == table)
    }
}

/// Read an `.xlsx` input: open, hash, find tables, parse rows. A file that cannot be read at all
/// is an `Err`; problems inside it are diagnostics in the returned [`Input`].
pub fn read_path(path: &Path) -> Result<Input, InputError> {
    let file = path.display().to_string();
    let bytes = std::fs::read(path).map_err(|e| InputError::Unreadable {
        file: file.clone(),
        reason: e.to_string(),
    })?;
    let ext = path
        .extension()
        .and_then(|e| e.to_str())
        .map(str::to_ascii_lowercase)
        .unwrap_or_default();
    if !matches!(ext.as_str(), "xlsx" | "xlsm") {
        return Err(InputError::UnsupportedType { file });
    }
    let sha256 = hex(&Sha256::digest(&bytes));
    let sheets = grid::read_xlsx(path, &file)?;
    Ok(from_sheets(file, path.to_path_buf(), sha256, sheets))
}

/// Parse already-read sheets (used by [`read_path`] and by tests).
pub fn from_sheets(file: String, path: PathBuf, sha256: String, sheets: Vec<SheetGrid>) -> Input {
    let mut diagnostics = Vec::new();
    let layouts = locate_tables(&file, &sheets, &mut diagnostics);
    let mut input = Input {
        file,
        path,
        sha256,
        sheets,
        layouts,
        lines: Vec::new(),
        pipes: Vec::new(),
        fittings: Vec::new(),
        systems: Vec::new(),
        fluids: Vec::new(),
        diagnostics,
    };
    rows::read_all(&mut input);
    input
}

fn hex(bytes: &[u8]) -> String {
    bytes.iter().map(|b| format!("{b:02x}")).collect()
}

/// Find each table: by sheet name first, then by headers; check required columns.
fn locate_tables(file: &str, sheets: &[SheetGrid], diags: &mut Vec<Diagnostic>) -> Vec<Layout> {
    let mut layouts = Vec::new();
    let mut used = vec![false; sheets.len()];
    for table in schema::ALL_TABLES {
        let spec = schema::spec(table);
        let by_name = sheets
            .iter()
            .enumerate()
            .find(|(i, s)| !used[*i] && schema::match_sheet(&s.name) == Some(table));
        let found = match by_name {
            Some((i, s)) => match header::find_layout(s, i, table) {
                Some(l) => Some(l),
                None => {
                    diags.push(Diagnostic {
                        severity: Severity::Error,
                        file: file.to_string(),
                        cell: Some(crate::error::CellRef::new(&s.name, 0, 0)),
                        message: format!(
                            "sheet '{}' has no header row naming at least two {} columns in its first {} rows",
                            s.name,
                            spec.sheet,
                            header::HEADER_SEARCH_ROWS
                        ),
                        hint: Some(format!("expected headers such as: {}", headers_of(table))),
                    });
                    used[i] = true;
                    continue;
                }
            },
            None => sheets.iter().enumerate().filter(|(i, s)| !used[*i] && schema::match_sheet(&s.name).is_none()).find_map(|(i, s)| {
                header::find_layout(s, i, table).filter(|l| spec.required.iter().all(|k| l.column(k).is_some()) && l.columns.len() >= 3)
            }),
        };
        let Some(layout) = found else {
            if table == TableKind::Pipes {
                diags.push(Diagnostic {
                    severity: Severity::Error,
                    file: file.to_string(),
                    cell: None,
                    message: "no Pipes sheet found (by name or by its headers)".to_string(),
                    hint: Some(format!(
                        "name a sheet 'Pipes' with headers such as: {}",
                        headers_of(TableKind::Pipes)
                    )),
                });
            }
            continue;
        };
        used[layout.sheet_index] = true;
        for key in spec.required {
            if layout.column(key).is_none() {
                let header = spec.columns.iter().find(|c| c.key == *key).map(|c| c.header).unwrap_or(key);
                diags.push(Diagnostic {
                    severity: Severity::Error,
                    file: file.to_string(),
                    cell: Some(crate::error::CellRef::new(&layout.sheet, layout.header_row, 0)),
                    message: format!("required column '{header}' is missing from the header row"),
                    hint: Some(format!("add a '{header}' column; headers found: {}", found_headers(&layout))),
                });
            }
        }
        layouts.push(layout);
    }
    layouts
}

fn headers_of(table: TableKind) -> String {
    schema::spec(table).columns.iter().map(|c| c.header).collect::<Vec<_>>().join(", ")
}

fn found_headers(layout: &Layout) -> String {
    let mut all: Vec<(u32, &str)> = layout.columns.iter().map(|c| (c.col, c.header.as_str())).collect();
    all.extend(layout.unknown.iter().map(|(c, h)| (*c, h.as_str())));
    all.sort();
    all.into_iter().map(|(_, h)| h).collect::<Vec<_>>().join(", ")
}
