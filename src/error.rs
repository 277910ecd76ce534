//! Locations, diagnostics and the typed errors that stop a run.
//!
//! Every normalised row, finding and diagnostic carries a [`CellRef`] so a message can name the
//! exact input cell (`Pipes!D7`). Layers return their own error enums; the CLI maps them to exit
//! codes (as the README lists them: 0 written, 1 findings at or above `--fail-on`, 2 input/usage,
//! 3 internal).

use serde::Serialize;
use std::fmt;

/// A cell in an input sheet, stored zero-based, displayed one-based in A1 style (`Pipes!D7`).
#[derive(Clone, Debug, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub struct CellRef {
    /// Sheet name as written in the workbook.
    pub sheet: String,
    /// Zero-based row.
    pub row: u32,
    /// Zero-based column.
    pub col: u32,
}

impl CellRef {
    /// A new reference (zero-based row and column).
    pub fn new(sheet: impl Into<String>, row: u32, col: u32) -> Self {
        CellRef {
            sheet: sheet.into(),
            row,
            col,
        }
    }

    /// The sheet name quoted for use in a formula or link when it needs quoting.
    pub fn quoted_sheet(&self) -> String {
        quote_sheet(&self.sheet)
    }

    /// `D7` without the sheet.
    pub fn a1(&self) -> String {
        format!("{}{}", column_letters(self.col), self.row + 1)
    }
}

/// Quote a sheet name for A1 references when it contains anything but letters, digits and `_`.
pub fn quote_sheet(name: &str) -> String {
    if !name.is_empty() && name.chars().all(|c| c.is_ascii_alphanumeric() || c == '_') {
        name.to_string()
    } else {
        format!("'{}'", name.replace('\'', "''"))
    }
}

impl fmt::Display for CellRef {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}!{}", self.quoted_sheet(), self.a1())
    }
}

impl Serialize for CellRef {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.collect_str(self)
    }
}

/// Spreadsheet column letters of a zero-based column (0 → `A`, 27 → `AB`).
pub fn column_letters(col: u32) -> String {
    let mut n = col as u64 + 1;
    let mut out = Vec::new();
    while n > 0 {
        let rem = ((n - 1) % 26) as u8;
        out.push(b'A' + rem);
        n = (n - 1) / 26;
    }
    out.reverse();
    String::from_utf8(out).unwrap_or_default()
}

/// How serious a diagnostic or finding is.
#[derive(
    Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash, Serialize, serde::Deserialize,
)]
#[serde(rename_all = "kebab-case")]
pub enum Severity {
    /// Worth knowing; no action needed.
    Info,
    /// Should be looked at; does not block.
    Warning,
    /// Wrong: for diagnostics this blocks writing any output.
    Error,
}

impl Severity {
    /// Lower-case label.
    pub fn label(self) -> &'static str {
        match self {
            Severity::Info => "info",
            Severity::Warning => "warning",
            Severity::Error => "error",
        }
    }
}

impl fmt::Display for Severity {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.label())
    }
}

/// A problem found while reading input: where, what, and what to do about it.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Diagnostic {
    /// Severity; any `Error` stops the run before anything is written.
    pub severity: Severity,
    /// Input file name as given.
    pub file: String,
    /// The cell concerned, when there is one.
    pub cell: Option<CellRef>,
    /// What is wrong, with the offending value.
    pub message: String,
    /// How to fix it, when a hint helps.
    pub hint: Option<String>,
}

impl fmt::Display for Diagnostic {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}: {}: ", self.severity, self.file)?;
        if let Some(cell) = &self.cell {
            write!(f, "{cell}: ")?;
        }
        f.write_str(&self.message)?;
        if let Some(hint) = &self.hint {
            write!(f, "\n  hint: {hint}")?;
        }
        Ok(())
    }
}

/// Errors that stop reading an input file.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum InputError {
    /// The file could not be opened or is not a readable workbook (no underlying error: an empty
    /// folder, a reader that stopped on malformed XML, a CSV larger than a sheet).
    #[error("{file}: cannot read as a workbook: {reason}")]
    Unreadable {
        /// File name.
        file: String,
        /// What is wrong.
        reason: String,
    },
    /// The file or folder could not be read from the disk.
    #[error("{file}: cannot read as a workbook: {source}")]
    Io {
        /// File name.
        file: String,
        /// What the file system said.
        #[source]
        source: std::io::Error,
    },
    /// The workbook reader (calamine) refused the file or one of its sheets.
    #[error("{file}: cannot read as a workbook: {reason}")]
    Workbook {
        /// File name.
        file: String,
        /// What is wrong, in plain words (with the sheet when one is concerned).
        reason: String,
        /// What the reader said.
        #[source]
        source: WorkbookError,
    },
    /// Reading the file would pass a limit (cells, unzipped size, compression ratio); nothing
    /// was read further.
    #[error(
        "{file}: {what}, over the limit of {limit}; nothing was written (if the file is genuine, raise the limit with {flag})"
    )]
    OverLimit {
        /// File name.
        file: String,
        /// What was found, with its size.
        what: String,
        /// The limit passed.
        limit: String,
        /// The flag that raises it.
        flag: &'static str,
    },
    /// A file type the tool does not read.
    #[error("{file}: unsupported file type (expected .xlsx, .xlsm, .xls, .ods or .csv)")]
    UnsupportedType {
        /// File name.
        file: String,
    },
}

/// The workbook reader's own error, kept as the source of [`InputError::Workbook`].
#[derive(Debug, thiserror::Error)]
pub enum WorkbookError {
    /// From the `.xlsx` reader.
    #[error(transparent)]
    Xlsx(#[from] calamine::XlsxError),
    /// From the `.xls` / `.ods` reader.
    #[error(transparent)]
    Other(#[from] calamine::Error),
}

/// Errors while writing outputs.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum OutputError {
    /// The output would overwrite an input file.
    #[error("{path}: refusing to write over an input file; choose another path with -o")]
    WouldOverwriteInput {
        /// Output path.
        path: String,
    },
    /// File system failure.
    #[error("{path}: {source}")]
    Io {
        /// Path concerned.
        path: String,
        /// Underlying error.
        #[source]
        source: std::io::Error,
    },
    /// The workbook writer failed.
    #[error("{path}: writing the workbook failed: {source}")]
    Xlsx {
        /// Path concerned.
        path: String,
        /// Underlying error.
        #[source]
        source: rust_xlsxwriter::XlsxError,
    },
    /// JSON serialisation failed.
    #[error("{path}: writing JSON failed: {source}")]
    Json {
        /// Path concerned.
        path: String,
        /// Underlying error.
        #[source]
        source: serde_json::Error,
    },
}
