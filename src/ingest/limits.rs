//! What one input may cost to read: a number of cells, a total unzipped size and, for large
//! parts, a compression ratio. Past a limit reading stops with [`InputError::OverLimit`] naming
//! the file and the limit (exit 2, nothing written) instead of running out of memory.
//!
//! The zip directory is checked before anything is inflated: the sizes it declares bound what
//! the zip reader will inflate (zip 9.8 stops a part with an error as soon as it inflates past
//! its declared size, so a directory that understates a part makes the file unreadable rather
//! than large; `tests/bad_input.rs` checks both). Cells are counted as they are read.
//! The defaults and why they were chosen are in docs/reliability.md.

use std::io::Cursor;

use crate::error::InputError;

/// Cells (values and formulas) one input may hold by default: 25 million, about three and a half
/// times the 60,000-line synthetic station of `scripts/bench.sh` (7 million cells, 2.3 GB to audit).
pub const DEFAULT_MAX_CELLS: u64 = 25_000_000;

/// Total unzipped size of an input's parts by default, in MB (2^20 bytes): 2,048, about seven
/// times the 60,000-line synthetic station's.
pub const DEFAULT_MAX_UNZIPPED_MB: u64 = 2_048;

/// How many times larger than its compressed bytes a large part may unzip by default.
pub const DEFAULT_MAX_RATIO: u64 = 200;

/// Parts smaller than this unzipped (32 MB) are not ratio-checked: however well they compress,
/// they cannot cost much memory.
pub const RATIO_MIN_BYTES: u64 = 32 << 20;

/// Limits on reading one input (the `--max-cells`, `--max-unzipped-mb` and `--max-ratio` flags).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Limits {
    /// Cells (values and formulas, formula cells count twice) over all sheets of one file.
    pub max_cells: u64,
    /// Total unzipped size of a workbook's parts (an `.xls` file's own size), in MB.
    pub max_unzipped_mb: u64,
    /// Largest unzipped/compressed size ratio of a part of at least [`RATIO_MIN_BYTES`].
    pub max_ratio: u64,
}

impl Default for Limits {
    fn default() -> Self {
        Limits {
            max_cells: DEFAULT_MAX_CELLS,
            max_unzipped_mb: DEFAULT_MAX_UNZIPPED_MB,
            max_ratio: DEFAULT_MAX_RATIO,
        }
    }
}

impl Limits {
    /// The unzipped-size limit in bytes.
    pub fn max_unzipped_bytes(&self) -> u64 {
        self.max_unzipped_mb.saturating_mul(1 << 20)
    }
}

fn mb(bytes: u64) -> String {
    format!("{:.1} MB", bytes as f64 / f64::from(1 << 20))
}

/// Check a zip package's directory (`.xlsx`, `.ods`) against the size and ratio limits. A file
/// that is not a zip passes: the workbook reader then says what is wrong with it.
///
/// # Errors
/// [`InputError::OverLimit`] when the parts unzip to more than the limit in total, or a large
/// part unzips more than [`Limits::max_ratio`] times its compressed size.
pub fn check_zip(bytes: &[u8], file: &str, limits: &Limits) -> Result<(), InputError> {
    let Ok(mut zip) = zip::ZipArchive::new(Cursor::new(bytes)) else {
        return Ok(());
    };
    let mut total = 0u64;
    for i in 0..zip.len() {
        let Ok(part) = zip.by_index_raw(i) else {
            continue;
        };
        let (size, packed) = (part.size(), part.compressed_size());
        total = total.saturating_add(size);
        if size >= RATIO_MIN_BYTES && size / packed.max(1) > limits.max_ratio {
            return Err(InputError::OverLimit {
                file: file.to_string(),
                what: format!(
                    "part '{}' unzips from {} to {} ({}:1), suspiciously well compressed",
                    part.name().unwrap_or_default(),
                    mb(packed),
                    mb(size),
                    size / packed.max(1)
                ),
                limit: format!("{}:1", limits.max_ratio),
                flag: "--max-ratio",
            });
        }
    }
    check_size(file, total, "the workbook's parts unzip to", limits)
}

/// Check a size against the unzipped-size limit (`what` reads before the size).
///
/// # Errors
/// [`InputError::OverLimit`] past [`Limits::max_unzipped_mb`].
pub fn check_size(file: &str, bytes: u64, what: &str, limits: &Limits) -> Result<(), InputError> {
    if bytes <= limits.max_unzipped_bytes() {
        return Ok(());
    }
    Err(InputError::OverLimit {
        file: file.to_string(),
        what: format!("{what} {}", mb(bytes)),
        limit: format!("{} MB", limits.max_unzipped_mb),
        flag: "--max-unzipped-mb",
    })
}

/// The error for a file holding more cells than [`Limits::max_cells`], noticed on `sheet`.
pub fn too_many_cells(file: &str, sheet: &str, limits: &Limits) -> InputError {
    InputError::OverLimit {
        file: file.to_string(),
        what: format!(
            "more than {} cells (values and formulas) by sheet '{sheet}'",
            limits.max_cells
        ),
        limit: format!("{} cells", limits.max_cells),
        flag: "--max-cells",
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sizes_past_the_limit_name_the_flag() {
        let small = Limits {
            max_unzipped_mb: 1,
            ..Limits::default()
        };
        assert!(check_size("a.xlsx", 1 << 20, "x", &small).is_ok());
        let e = check_size("a.xlsx", (1 << 20) + 1, "x", &small).unwrap_err();
        let text = e.to_string();
        assert!(
            text.contains("a.xlsx") && text.contains("--max-unzipped-mb"),
            "{text}"
        );
        // Not a zip: left to the workbook reader.
        assert!(check_zip(b"plain text", "a.xlsx", &small).is_ok());
    }
}
