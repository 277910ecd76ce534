//! Reading input workbooks into typed, SI rows with their source cells, plus diagnostics.
//!
//! Flow: [`grid`] reads the sheets whole (calamine), [`header`] finds each table's header row and
//! maps columns through [`schema`], and [`rows`] reads each cell with [`parse`], collecting every
//! problem as a [`Diagnostic`] so the user sees them all at once.

pub mod csv;
pub mod describe;
pub mod grid;
pub mod header;
pub mod legacy;
pub mod limits;
pub mod list;
pub mod map;
pub mod parse;
pub mod quantity;
pub mod rows;
pub mod schema;
pub mod sparse;
pub mod stray;

use sha2::{Digest, Sha256};
use std::collections::{HashMap, HashSet};
use std::path::{Path, PathBuf};

use crate::error::{CellRef, Diagnostic, InputError, Severity};
pub use grid::SheetGrid;
pub use header::Layout;
pub use limits::Limits;
pub use map::HeaderMap;
pub use rows::{FittingRow, FluidRow, LineRow, PipeRow, PumpCurveRow, Service, SystemRow};
pub use schema::TableKind;

/// One file an input was read from.
#[derive(Clone, Debug, PartialEq)]
pub struct Source {
    /// File name as given.
    pub file: String,
    /// Path of the file.
    pub path: PathBuf,
    /// SHA-256 of the file's bytes, hex.
    pub sha256: String,
    /// Sheets that came from this file (names as in [`Input::sheets`]).
    pub sheets: Vec<String>,
}

/// A text cell read as a number ("numbers stored as text"), for the Parse report.
#[derive(Clone, Debug, PartialEq)]
pub struct Conversion {
    /// The cell.
    pub cell: CellRef,
    /// The text as written.
    pub text: String,
    /// The number read (in the unit written, before conversion to SI).
    pub value: f64,
    /// Unit written in the cell, if any.
    pub unit: Option<String>,
}

/// A row inside a table that was not read as data, and why.
#[derive(Clone, Debug, PartialEq)]
pub struct Skipped {
    /// First cell of the row.
    pub cell: CellRef,
    /// Why the row was skipped.
    pub reason: String,
}

/// A data row on which reading found an error, with the line it names. Errors that only follow
/// from it (the fittings of a line whose every run had an error) are folded into its first error
/// instead of being repeated (`rows::cross_check`).
#[derive(Clone, Debug, PartialEq)]
pub struct ErredRow {
    /// The table the row is in.
    pub table: TableKind,
    /// The line id written on the row, when there is one.
    pub line: Option<String>,
    /// The cell of the row's first error.
    pub cell: CellRef,
}

/// What reading did to the cells, beyond diagnostics: conversions and skipped rows.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct ParseReport {
    /// Text cells read as numbers.
    pub conversions: Vec<Conversion>,
    /// Rows skipped (blank rows are only counted, in `blank_rows`).
    pub skipped: Vec<Skipped>,
    /// Blank rows inside tables, per sheet.
    pub blank_rows: Vec<(String, usize)>,
    /// Rows of mixed lists left out of the audit by their status (decommissioned, removed ...).
    pub left_out: Vec<Skipped>,
    /// How each row of a mixed list was read (run, fitting, heading, skipped, left out).
    pub classified: Vec<list::Classified>,
    /// Rows on which reading found an error.
    pub erred: Vec<ErredRow>,
}

/// How to read inputs.
#[derive(Clone, Debug, Default)]
pub struct ReadOptions {
    /// The user's header map (`--map`).
    pub map: Option<HeaderMap>,
    /// What one file may cost to read (`--max-cells`, `--max-unzipped-mb`, `--max-ratio`).
    pub limits: Limits,
}

/// One thing to read: a workbook, a CSV file, or a folder of them.
#[derive(Clone, Debug, PartialEq)]
pub enum InputSource {
    /// An `.xlsx`/`.xlsm` workbook, a `.csv` file (its table found from its name or headers), or a
    /// folder holding such files.
    Path(PathBuf),
    /// A CSV file holding one given table (`--pipes`, `--fittings`, `--lines`).
    Csv {
        /// The table the file holds.
        table: TableKind,
        /// The file.
        path: PathBuf,
    },
}

/// One input workbook (or several merged), read and parsed.
#[derive(Clone, Debug)]
pub struct Input {
    /// File name as given (names joined with ` + ` when several files are merged).
    pub file: String,
    /// Path of the (first) file.
    pub path: PathBuf,
    /// SHA-256 of the file's bytes, hex (several files: SHA-256 of their `name<TAB>hash` lines).
    pub sha256: String,
    /// The files read, in order.
    pub sources: Vec<Source>,
    /// Every sheet, every cell.
    pub sheets: Vec<SheetGrid>,
    /// Where each table was found.
    pub layouts: Vec<Layout>,
    /// Parsed rows.
    pub lines: Vec<LineRow>,
    /// Parsed rows.
    pub pipes: Vec<PipeRow>,
    /// Parsed rows (empty after [`Input::release_fitting_rows`]).
    pub fittings: Vec<FittingRow>,
    /// The values assumed on fitting rows released by [`Input::release_fitting_rows`], each with
    /// its line.
    pub released_assumed: Vec<(std::sync::Arc<str>, rows::Assumed)>,
    /// Parsed rows.
    pub systems: Vec<SystemRow>,
    /// Parsed rows.
    pub fluids: Vec<FluidRow>,
    /// Parsed rows of `Pump curve`.
    pub pump_curves: Vec<PumpCurveRow>,
    /// Everything noticed while reading, in sheet order.
    pub diagnostics: Vec<Diagnostic>,
    /// Conversions and skipped rows.
    pub report: ParseReport,
}

impl Input {
    /// Number of error-level diagnostics.
    pub fn error_count(&self) -> usize {
        self.diagnostics
            .iter()
            .filter(|d| d.severity == Severity::Error)
            .count()
    }

    /// The layout of a table, when the table was found (the first one when several files each
    /// hold the table; see [`Input::layout_on`]).
    pub fn layout(&self, table: TableKind) -> Option<&Layout> {
        self.layouts.iter().find(|l| l.table == table)
    }

    /// The layout of a table on a given sheet (falls back to [`Input::layout`]).
    pub fn layout_on(&self, table: TableKind, sheet: &str) -> Option<&Layout> {
        self.layouts
            .iter()
            .find(|l| l.table == table && l.sheet == sheet)
            .or_else(|| self.layout(table))
    }

    /// The zero-based column of a canonical column in the table on `sheet` (the first table of
    /// that kind when the sheet has none); 0 when the column is absent.
    pub fn column_of(&self, table: TableKind, sheet: &str, key: &str) -> u32 {
        self.layout_on(table, sheet)
            .and_then(|l| l.column(key))
            .map_or(0, |c| c.col)
    }

    /// The file a sheet came from.
    pub fn file_of(&self, sheet: &str) -> &str {
        self.sources
            .iter()
            .find(|s| s.sheets.iter().any(|n| n == sheet))
            .map_or(self.file.as_str(), |s| s.file.as_str())
    }
}

/// Read an `.xlsx` workbook, a `.csv` file or a folder of them: open, hash, find tables, parse
/// rows. A file that cannot be read at all is an `Err`; problems inside it are diagnostics in the
/// returned [`Input`].
pub fn read_path(path: &Path) -> Result<Input, InputError> {
    read_path_with(path, &ReadOptions::default())
}

/// [`read_path`] with options (a header map).
pub fn read_path_with(path: &Path, options: &ReadOptions) -> Result<Input, InputError> {
    read_inputs(&[InputSource::Path(path.to_path_buf())], options)
}

/// Files in a folder that can be inputs (`.xlsx`, `.xlsm`, `.csv`), sorted by name; spreadsheet
/// lock files (`~$...`) and outputs of earlier audits (`*.audit.xlsx`) are left out.
pub fn folder_inputs(dir: &Path) -> Result<Vec<PathBuf>, InputError> {
    let entries = std::fs::read_dir(dir).map_err(|source| InputError::Io {
        file: dir.display().to_string(),
        source,
    })?;
    let mut files: Vec<PathBuf> = entries
        .filter_map(Result::ok)
        .map(|e| e.path())
        .filter(|p| p.is_file())
        .filter(|p| {
            let name = p
                .file_name()
                .and_then(|n| n.to_str())
                .unwrap_or_default()
                .to_lowercase();
            !name.starts_with("~$")
                && !name.starts_with('.')
                && !name.ends_with(".audit.xlsx")
                && [".xlsx", ".xlsm", ".xls", ".ods", ".csv"]
                    .iter()
                    .any(|e| name.ends_with(e))
        })
        .collect();
    files.sort();
    if files.is_empty() {
        return Err(InputError::Unreadable {
            file: dir.display().to_string(),
            reason: "the folder holds no .xlsx or .csv files".into(),
        });
    }
    Ok(files)
}

fn extension(path: &Path) -> String {
    path.extension()
        .and_then(|e| e.to_str())
        .map(str::to_ascii_lowercase)
        .unwrap_or_default()
}

/// Read one file into its sheets, with its hash.
fn read_file(
    path: &Path,
    table: Option<TableKind>,
    limits: &Limits,
) -> Result<(Source, Vec<SheetGrid>), InputError> {
    let file = path.display().to_string();
    let bytes = std::fs::read(path).map_err(|source| InputError::Io {
        file: file.clone(),
        source,
    })?;
    let sha256 = hex(&Sha256::digest(&bytes));
    let sheets = match extension(path).as_str() {
        "xlsx" | "xlsm" if table.is_none() => grid::read_xlsx_with(&bytes, &file, limits)?,
        "xls" | "ods" if table.is_none() => legacy::read_bytes_with(&bytes, &file, limits)?,
        "csv" | "txt" => {
            limits::check_size(&file, bytes.len() as u64, "the file holds", limits)?;
            let (text, _) = csv::decode(&bytes);
            let name = match table {
                Some(t) => t.sheet_name().to_string(),
                None => sheet_name_of(path),
            };
            let sheet = csv::sheet_from_text(&name, &text);
            if sheet.cell_count() as u64 > limits.max_cells {
                return Err(limits::too_many_cells(&file, &name, limits));
            }
            if sheet.end_row() > SHEET_ROWS || sheet.end_col() > SHEET_COLS {
                return Err(InputError::Unreadable {
                    file,
                    reason: format!(
                        "the file has {} lines and up to {} fields a line; a sheet holds at most {SHEET_ROWS} rows of {SHEET_COLS} cells",
                        sheet.end_row(),
                        sheet.end_col()
                    ),
                });
            }
            vec![sheet]
        }
        _ => return Err(InputError::UnsupportedType { file }),
    };
    let source = Source {
        file,
        path: path.to_path_buf(),
        sha256,
        sheets: sheets.iter().map(|s| s.name.clone()).collect(),
    };
    Ok((source, sheets))
}

/// Rows of a worksheet (the `.xlsx` format's limit, which the annotated copy must respect).
pub const SHEET_ROWS: u32 = 1_048_576;
/// Columns of a worksheet (`A` to `XFD`).
pub const SHEET_COLS: u32 = 16_384;

/// A sheet name for a CSV file: its stem, cut to the 31 characters a sheet name may have and
/// without the characters a sheet name may not hold.
fn sheet_name_of(path: &Path) -> String {
    let stem = path.file_stem().and_then(|s| s.to_str()).unwrap_or("CSV");
    let clean: String = stem
        .chars()
        .map(|c| {
            if matches!(c, '[' | ']' | ':' | '*' | '?' | '/' | '\\') {
                '_'
            } else {
                c
            }
        })
        .take(31)
        .collect();
    if clean.trim().is_empty() {
        "CSV".into()
    } else {
        clean
    }
}

/// A sheet name not yet taken (`Pipes`, then `Pipes (2)`, ...), at most 31 characters.
fn unique_sheet_name(wanted: &str, taken: &HashSet<String>) -> String {
    if !taken.contains(&wanted.to_lowercase()) {
        return wanted.to_string();
    }
    (2..)
        .map(|i| {
            let suffix = format!(" ({i})");
            let base: String = wanted.chars().take(31 - suffix.chars().count()).collect();
            format!("{base}{suffix}")
        })
        .find(|n| !taken.contains(&n.to_lowercase()))
        .unwrap_or_default()
}

/// Read and merge several inputs. Folders are expanded; CSV files of a folder are read like
/// sheets named after the files. Sheet names that repeat across files get a ` (2)` suffix.
/// Line ids listed in the Lines table of more than one file are an error.
pub fn read_inputs(sources: &[InputSource], options: &ReadOptions) -> Result<Input, InputError> {
    let mut files: Vec<(PathBuf, Option<TableKind>)> = Vec::new();
    for s in sources {
        match s {
            InputSource::Path(p) if p.is_dir() => {
                files.extend(folder_inputs(p)?.into_iter().map(|f| (f, None)))
            }
            InputSource::Path(p) => files.push((p.clone(), None)),
            InputSource::Csv { table, path } => files.push((path.clone(), Some(*table))),
        }
    }
    let mut taken: HashSet<String> = HashSet::new();
    let mut parts = Vec::new();
    for (path, table) in &files {
        crate::worker::enter(crate::worker::Phase::Read, &path.display().to_string());
        let (mut source, mut sheets) = read_file(path, *table, &options.limits)?;
        for (sheet, name) in sheets.iter_mut().zip(source.sheets.iter_mut()) {
            let unique = unique_sheet_name(&sheet.name, &taken);
            taken.insert(unique.to_lowercase());
            sheet.name.clone_from(&unique);
            *name = unique;
        }
        parts.push(parse_part(source, sheets, options));
    }
    let mut input = merge(parts);
    if files.len() > 1 {
        duplicate_lines(&mut input);
    }
    require_pipes(&mut input);
    rows::cross_check(&mut input);
    Ok(input)
}

/// Parse already-read sheets of one file (used by tests).
pub fn from_sheets(file: String, path: PathBuf, sha256: String, sheets: Vec<SheetGrid>) -> Input {
    let source = Source {
        file,
        path,
        sha256,
        sheets: sheets.iter().map(|s| s.name.clone()).collect(),
    };
    let mut input = parse_part(source, sheets, &ReadOptions::default());
    require_pipes(&mut input);
    rows::cross_check(&mut input);
    input
}

/// Locate and read the tables of one file (no checks across tables yet).
fn parse_part(source: Source, sheets: Vec<SheetGrid>, options: &ReadOptions) -> Input {
    let mut diagnostics = Vec::new();
    let layouts = locate_tables(
        &source.file,
        &sheets,
        options.map.as_ref(),
        &mut diagnostics,
    );
    let mut input = Input::unread(
        source.file.clone(),
        source.path.clone(),
        source.sha256.clone(),
    );
    input.sources = vec![source];
    input.sheets = sheets;
    input.layouts = layouts;
    input.diagnostics = diagnostics;
    rows::read_all(&mut input);
    list::read_lists(&mut input, options);
    stray::report(&mut input);
    input
}

impl Input {
    /// An input with its identity set and nothing read yet.
    fn unread(file: String, path: PathBuf, sha256: String) -> Input {
        Input {
            file,
            path,
            sha256,
            sources: Vec::new(),
            sheets: Vec::new(),
            layouts: Vec::new(),
            lines: Vec::new(),
            pipes: Vec::new(),
            fittings: Vec::new(),
            released_assumed: Vec::new(),
            systems: Vec::new(),
            fluids: Vec::new(),
            pump_curves: Vec::new(),
            diagnostics: Vec::new(),
            report: ParseReport::default(),
        }
    }
}

/// Concatenate parsed files into one input (sheet indices shifted; names are already unique).
fn merge(parts: Vec<Input>) -> Input {
    let mut iter = parts.into_iter();
    let Some(mut all) = iter.next() else {
        return Input::unread(String::new(), PathBuf::new(), String::new());
    };
    let mut merged = false;
    for mut part in iter {
        merged = true;
        let offset = all.sheets.len();
        for l in &mut part.layouts {
            l.sheet_index += offset;
        }
        all.sources.append(&mut part.sources);
        all.sheets.append(&mut part.sheets);
        all.layouts.append(&mut part.layouts);
        all.lines.append(&mut part.lines);
        all.pipes.append(&mut part.pipes);
        all.fittings.append(&mut part.fittings);
        all.systems.append(&mut part.systems);
        all.fluids.append(&mut part.fluids);
        all.pump_curves.append(&mut part.pump_curves);
        all.diagnostics.append(&mut part.diagnostics);
        all.report.conversions.append(&mut part.report.conversions);
        all.report.skipped.append(&mut part.report.skipped);
        all.report.blank_rows.append(&mut part.report.blank_rows);
        all.report.left_out.append(&mut part.report.left_out);
        all.report.classified.append(&mut part.report.classified);
        all.report.erred.append(&mut part.report.erred);
    }
    if merged {
        all.file = all
            .sources
            .iter()
            .map(|s| s.file.as_str())
            .collect::<Vec<_>>()
            .join(" + ");
        let listing: String = all
            .sources
            .iter()
            .map(|s| format!("{}\t{}\n", s.file, s.sha256))
            .collect();
        all.sha256 = hex(&Sha256::digest(listing.as_bytes()));
    }
    all
}

/// The Pipes table is required: once all files are read, one of them must hold it.
fn require_pipes(input: &mut Input) {
    let named = input
        .sheets
        .iter()
        .any(|s| schema::match_sheet(&s.name) == Some(TableKind::Pipes));
    if input.layout(TableKind::Pipes).is_none() && !named {
        input.diagnostics.push(Diagnostic {
            severity: Severity::Error,
            file: input.file.clone(),
            cell: None,
            message: "no Pipes sheet found (by name or by its headers)".to_string(),
            hint: Some(format!(
                "name a sheet 'Pipes' with headers such as: {} (or map your headers with --map)",
                headers_of(TableKind::Pipes)
            )),
        });
    }
}

/// Line ids listed in Lines in more than one file.
fn duplicate_lines(input: &mut Input) {
    let mut first: HashMap<&str, (&str, CellRef)> = HashMap::new();
    let mut diags = Vec::new();
    for l in &input.lines {
        let col = input
            .layout_on(TableKind::Lines, &l.origin.sheet)
            .and_then(|x| x.column("line"))
            .map_or(0, |c| c.col);
        let cell = CellRef::new(&l.origin.sheet, l.origin.row, col);
        let file = input.file_of(&l.origin.sheet);
        match first.get(l.line.as_str()) {
            Some((f, c)) if *f != file => diags.push(Diagnostic {
                severity: Severity::Error,
                file: file.to_string(),
                cell: Some(cell),
                message: format!("line '{}' is also listed in {f} at {c}", l.line),
                hint: Some("line ids must be unique across the files audited together; rename one or audit the files apart".into()),
            }),
            Some(_) => {}
            None => {
                first.insert(&l.line, (file, cell));
            }
        }
    }
    input.diagnostics.extend(diags);
}

/// Bytes as lower-case hex (how SHA-256 digests are shown).
pub(crate) fn hex(bytes: &[u8]) -> String {
    bytes.iter().map(|b| format!("{b:02x}")).collect()
}

/// The table a sheet name stands for: the map's `[sheets]` first, then the aliases, then the
/// aliases after dropping a ` (2)`-style suffix.
fn sheet_table(name: &str, map: Option<&HeaderMap>) -> Option<TableKind> {
    map.and_then(|m| m.sheet(name))
        .or_else(|| schema::match_sheet(name))
        .or_else(|| {
            let t = name.trim_end();
            let base = t
                .strip_suffix(')')
                .and_then(|t| t.rsplit_once(" ("))
                .filter(|(_, n)| n.chars().all(|c| c.is_ascii_digit()));
            base.and_then(|(b, _)| schema::match_sheet(b))
        })
        .or_else(|| {
            let f = schema::fold(name);
            list::columns::LIST_SHEETS
                .iter()
                .any(|a| schema::fold(a) == f)
                .then_some(TableKind::List)
        })
}

/// Find each table: by sheet name first, then by headers; check required columns.
fn locate_tables(
    file: &str,
    sheets: &[SheetGrid],
    map: Option<&HeaderMap>,
    diags: &mut Vec<Diagnostic>,
) -> Vec<Layout> {
    let mut layouts = Vec::new();
    let mut used = vec![false; sheets.len()];
    for (i, s) in sheets.iter().enumerate() {
        let named = sheet_table(&s.name, map);
        if let Some(l) = list::find_list(s, i, named, map) {
            used[i] = true;
            layouts.push(l);
        }
    }
    for table in schema::ALL_TABLES {
        let spec = schema::spec(table);
        let by_name = sheets
            .iter()
            .enumerate()
            .find(|(i, s)| !used[*i] && sheet_table(&s.name, map) == Some(table));
        let found = match by_name {
            Some((i, s)) => match header::find_layout_with(s, i, table, map) {
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
                        hint: Some(format!("expected headers such as: {} (or map your headers with --map)", headers_of(table))),
                    });
                    used[i] = true;
                    continue;
                }
            },
            None => sheets
                .iter()
                .enumerate()
                .filter(|(i, s)| !used[*i] && sheet_table(&s.name, map).is_none())
                .find_map(|(i, s)| {
                    header::find_layout_with(s, i, table, map).filter(|l| {
                        spec.required.iter().all(|k| l.column(k).is_some()) && l.columns.len() >= 3
                    })
                }),
        };
        let Some(layout) = found else {
            continue;
        };
        used[layout.sheet_index] = true;
        let mut layout = layout;
        if table == TableKind::Fittings {
            // `Item` holding numbering next to a `Description`: the text is in Description.
            let grid = &sheets[layout.sheet_index];
            list::detect::resolve_item_numbers(grid, &mut layout, "item", None);
        }
        for key in spec.required {
            if layout.column(key).is_none() {
                let header = spec
                    .columns
                    .iter()
                    .find(|c| c.key == *key)
                    .map(|c| c.header)
                    .unwrap_or(key);
                diags.push(Diagnostic {
                    severity: Severity::Error,
                    file: file.to_string(),
                    cell: Some(crate::error::CellRef::new(&layout.sheet, layout.header_row, 0)),
                    message: format!("required column '{header}' is missing from the header row"),
                    hint: Some(format!(
                        "add a '{header}' column, or map one of yours with --map ([{}] \"Your header\" = \"{key}\"); headers found: {}",
                        schema::fold(spec.sheet),
                        found_headers(&layout)
                    )),
                });
            }
        }
        duplicate_columns(file, table, &layout, diags);
        layouts.push(layout);
    }
    stacked_tables(sheets, map, &mut layouts);
    layouts
}

/// More blank rows than this in a row end a table: what lies further down (a value typed at the
/// bottom of the sheet) is outside it. Our choice; registers break pages with a few blank rows.
pub const TABLE_GAP_ROWS: u32 = 1_000;

/// Several tables on one sheet: under a table, after a blank row, a header row of another table
/// (a line list above a takeoff) starts a second table; the first ends at the blank row. Only
/// tables not found elsewhere in the file are looked for, so a repeated header (page break)
/// stays part of its table. A run of more than [`TABLE_GAP_ROWS`] blank rows ends a table too.
fn stacked_tables(sheets: &[SheetGrid], map: Option<&HeaderMap>, layouts: &mut Vec<Layout>) {
    let mut i = 0;
    while i < layouts.len() {
        let l = &layouts[i];
        let grid = &sheets[l.sheet_index];
        let blank = |r: u32| {
            grid.row(r).all(|(_, d)| match d {
                calamine::Data::Empty => true,
                calamine::Data::String(s) => s.trim().is_empty(),
                _ => false,
            })
        };
        let taken: Vec<TableKind> = layouts.iter().map(|x| x.table).collect();
        let mut found = None;
        // The first row of each run of blank rows, and the filled row after it.
        let mut gap = l.data_start;
        for h in grid.used_rows(l.data_start..grid.end_row()) {
            if blank(h) {
                continue;
            }
            if h > gap
                && let Some(t) = another_table_at(grid, l, h, map, &taken)
            {
                found = Some((gap, Some(t)));
                break;
            }
            if h - gap > TABLE_GAP_ROWS {
                found = Some((gap, None));
                break;
            }
            gap = h + 1;
        }
        if let Some((gap, next)) = found {
            if layouts[i].data_end.is_none_or(|e| e > gap) {
                layouts[i].data_end = Some(gap);
            }
            layouts.extend(next);
        }
        i += 1;
    }
}

/// A table of another kind (not yet found in the file) whose header is on `row`.
fn another_table_at(
    grid: &SheetGrid,
    above: &Layout,
    row: u32,
    map: Option<&HeaderMap>,
    taken: &[TableKind],
) -> Option<Layout> {
    if above.table != TableKind::List
        && let Some(l) = list::detect::find_list_at(grid, above.sheet_index, row, map)
    {
        return Some(l);
    }
    schema::ALL_TABLES
        .into_iter()
        .filter(|t| *t != above.table && !taken.contains(t))
        .find_map(|t| {
            header::find_layout_in(grid, above.sheet_index, t, map, row..row + 1).filter(|l| {
                schema::spec(t)
                    .required
                    .iter()
                    .all(|k| l.column(k).is_some())
                    && l.columns.len() >= 2
            })
        })
}

/// A header that names a column already matched earlier in the row is ambiguous: which of the two
/// holds the data? Report it rather than silently using the first.
fn duplicate_columns(file: &str, table: TableKind, layout: &Layout, diags: &mut Vec<Diagnostic>) {
    for (col, text) in &layout.unknown {
        let (name, _) = header::split_header(text);
        let spec = schema::match_column(table, &schema::fold(text))
            .or_else(|| schema::match_column(table, &schema::fold(&name)));
        let Some(first) = spec.and_then(|s| layout.column(s.key)) else {
            continue;
        };
        diags.push(Diagnostic {
            severity: Severity::Error,
            file: file.to_string(),
            cell: Some(crate::error::CellRef::new(
                &layout.sheet,
                layout.header_row,
                *col,
            )),
            message: format!(
                "duplicate column: '{text}' names the same column as '{}' at {}",
                first.header,
                crate::error::CellRef::new(&layout.sheet, layout.header_row, first.col)
            ),
            hint: Some("keep one of the two columns, or rename the other (e.g. 'Remarks')".into()),
        });
    }
}

fn headers_of(table: TableKind) -> String {
    schema::spec(table)
        .columns
        .iter()
        .map(|c| c.header)
        .collect::<Vec<_>>()
        .join(", ")
}

fn found_headers(layout: &Layout) -> String {
    let mut all: Vec<(u32, &str)> = layout
        .columns
        .iter()
        .map(|c| (c.col, c.header.as_str()))
        .collect();
    all.extend(layout.unknown.iter().map(|(c, h)| (*c, h.as_str())));
    all.sort();
    all.into_iter()
        .map(|(_, h)| h)
        .collect::<Vec<_>>()
        .join(", ")
}

impl Input {
    /// Every value assumed, with the line it belongs to.
    pub fn assumed(&self) -> impl Iterator<Item = (&str, &rows::Assumed)> {
        let lines = self
            .lines
            .iter()
            .flat_map(|l| l.assumed.iter().map(move |a| (l.line.as_str(), a)));
        let pipes = self
            .pipes
            .iter()
            .flat_map(|p| p.assumed.iter().map(move |a| (p.line.as_str(), a)));
        let fittings = self
            .fittings
            .iter()
            .flat_map(|f| f.assumed.iter().map(move |a| (&*f.line, a)));
        let released = self.released_assumed.iter().map(|(l, a)| (&**l, a));
        lines.chain(pipes).chain(fittings).chain(released)
    }

    /// Free the parsed fitting rows once the audit has used them, keeping what the annotated
    /// workbook still needs of them: the values assumed ([`Input::assumed`] is unchanged). The
    /// rows are the largest part of a big register's input after its cells (about 350 bytes a
    /// fitting); `lossledger audit` releases them once the fittings are placed and checked
    /// ([`crate::audit::run_releasing_rows`], docs/reliability.md). The assumed values keep the
    /// row's shared line id.
    pub fn release_fitting_rows(&mut self) {
        let rows = std::mem::take(&mut self.fittings);
        for f in rows {
            let line = f.line;
            self.released_assumed
                .extend(f.assumed.into_iter().map(|a| (line.clone(), a)));
        }
    }

    /// Assumed values counted per sheet and what was assumed.
    pub fn assumed_by_sheet(
        &self,
    ) -> std::collections::BTreeMap<(String, crate::sentence::Sentence), usize> {
        let mut out = std::collections::BTreeMap::new();
        for (_, a) in self.assumed() {
            *out.entry((a.cell.sheet.clone(), a.what.clone()))
                .or_insert(0) += 1;
        }
        out
    }

    /// Assumed values counted per line and column key.
    pub fn assumed_by_line(
        &self,
    ) -> std::collections::BTreeMap<String, std::collections::BTreeMap<&'static str, usize>> {
        let mut out: std::collections::BTreeMap<
            String,
            std::collections::BTreeMap<&'static str, usize>,
        > = Default::default();
        for (line, a) in self.assumed() {
            *out.entry(line.to_string())
                .or_default()
                .entry(a.key)
                .or_insert(0) += 1;
        }
        out
    }
}

/// A plain-text account of how an input was read: per table the sheet, header row, units row
/// and column mapping (as a map file), then defaults, text-to-number conversions and skipped rows.
pub fn describe(input: &Input) -> String {
    use std::fmt::Write;
    let mut out = String::new();
    for s in &input.sources {
        let _ = writeln!(
            out,
            "Read {} ({} sheet(s), SHA-256 {})",
            s.file,
            s.sheets.len(),
            s.sha256
        );
    }
    describe_tables(input, &mut out);
    let layouts: Vec<&Layout> = input
        .layouts
        .iter()
        .filter(|l| !list::is_view(input, l))
        .collect();
    out.push('\n');
    out.push_str(&map::mapping_toml(&layouts));
    let by_sheet = input.assumed_by_sheet();
    if !by_sheet.is_empty() {
        out.push_str("\nDefaults that apply:\n");
        for ((sheet, what), n) in &by_sheet {
            let _ = writeln!(out, "  {sheet}: {what} — {n} row(s)");
        }
    }
    describe_conversions(input, &mut out);
    describe_rows(input, &mut out);
    out
}

/// [`describe()`]: per table its sheet, file, header and units rows, and unit defaults.
fn describe_tables(input: &Input, out: &mut String) {
    use std::fmt::Write;
    for l in input.layouts.iter().filter(|l| !list::is_view(input, l)) {
        let rows = if l.header_rows > 1 {
            format!("rows {}-{}", l.header_row + 1, l.header_row + l.header_rows)
        } else {
            format!("row {}", l.header_row + 1)
        };
        let units = l
            .units_row
            .map(|r| format!(", units row {}", r + 1))
            .unwrap_or_default();
        let _ = writeln!(
            out,
            "{}: sheet '{}' ({}), header {rows}{units}, data from row {}",
            l.table.sheet_name(),
            l.sheet,
            input.file_of(&l.sheet),
            l.data_start + 1
        );
        for c in &l.columns {
            if c.unit_defaulted {
                let _ = writeln!(
                    out,
                    "  '{}': no unit written, read as {}",
                    c.header,
                    c.unit.map(|u| u.label).unwrap_or("")
                );
            }
        }
    }
}

/// [`describe()`]: the text-to-number conversions (the first 20).
fn describe_conversions(input: &Input, out: &mut String) {
    use std::fmt::Write;
    if !input.report.conversions.is_empty() {
        let _ = writeln!(
            out,
            "\nText read as numbers: {} cell(s)",
            input.report.conversions.len()
        );
        for c in input.report.conversions.iter().take(20) {
            let _ = writeln!(
                out,
                "  {}: '{}' -> {}{}",
                c.cell,
                c.text,
                rows::format_number(c.value),
                c.unit
                    .as_deref()
                    .map(|u| format!(" {u}"))
                    .unwrap_or_default()
            );
        }
        if input.report.conversions.len() > 20 {
            let _ = writeln!(
                out,
                "  ... and {} more (all listed in the Basis sheet of the audit)",
                input.report.conversions.len() - 20
            );
        }
    }
}

/// [`describe()`]: what each list row became, rows left out by status, rows skipped.
fn describe_rows(input: &Input, out: &mut String) {
    use std::fmt::Write;
    if !input.report.classified.is_empty() {
        out.push_str("\nList rows (what each became and the words that decided):\n");
        for c in &input.report.classified {
            let what = if c.what.is_empty() {
                String::new()
            } else {
                format!(" {}", c.what)
            };
            let _ = writeln!(
                out,
                "  {}: {}{what} — {}",
                c.cell,
                c.became.word(),
                c.deciding
            );
        }
    }
    if !input.report.left_out.is_empty() {
        let _ = writeln!(
            out,
            "\nLeft out by status: {} row(s)",
            input.report.left_out.len()
        );
        for s in &input.report.left_out {
            let _ = writeln!(out, "  {}: {}", s.cell, s.reason);
        }
    }
    if !input.report.skipped.is_empty() || !input.report.blank_rows.is_empty() {
        out.push_str("\nRows skipped:\n");
        for s in &input.report.skipped {
            let _ = writeln!(out, "  {}: {}", s.cell, s.reason);
        }
        for (sheet, n) in &input.report.blank_rows {
            let _ = writeln!(out, "  {sheet}: {n} blank row(s) inside the table");
        }
    }
}
