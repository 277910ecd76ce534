//! Outputs: the annotated workbook, JSON, and the console summary.

pub mod console;
pub(crate) mod figures;
pub mod invented;
pub mod json;
pub mod ranking;
pub mod station;
pub(crate) mod style;
pub(crate) mod table;
pub mod text_table;
pub mod workbook;

use std::path::{Path, PathBuf};

use crate::error::OutputError;

/// The caution every output carries.
pub const CAUTION: &str = "Screening estimate only: steady, incompressible, single-phase flow from published correlations \
and the data in the input. It does not cover surge or water hammer, two-phase or compressible flow, slurries or \
non-Newtonian fluids, or structural and pressure-rating checks. No line pressures are computed, so vacuum at high \
points and siphons are not checked. Pump selection, cavitation (NPSH) and pressure decisions must rest on site \
measurement, manufacturer data, local codes and licensed engineering practice.";

/// Default output path: `INPUT.audit.xlsx` beside the input.
pub fn default_output(input: &Path) -> PathBuf {
    let stem = input
        .file_stem()
        .and_then(|s| s.to_str())
        .unwrap_or("input");
    input.with_file_name(format!("{stem}.audit.xlsx"))
}

/// Refuse an output path that is one of the inputs (compared after resolving links).
///
/// # Errors
/// [`OutputError::WouldOverwriteInput`].
pub fn check_not_input(out: &Path, inputs: &[PathBuf]) -> Result<(), OutputError> {
    let canon = |p: &Path| std::fs::canonicalize(p).ok();
    let out_c = canon(out);
    for i in inputs {
        if out == i || (out_c.is_some() && out_c == canon(i)) {
            return Err(OutputError::WouldOverwriteInput {
                path: out.display().to_string(),
            });
        }
    }
    Ok(())
}

/// Write bytes to `path` through a temporary file in the same folder, renamed into place, so a
/// failure never leaves a partial file under the final name.
///
/// # Errors
/// As [`stage`] and [`Staged::commit`].
pub fn write_atomic(path: &Path, bytes: &[u8]) -> Result<(), OutputError> {
    stage(path, bytes)?.commit()
}

/// An output written in full under a temporary name beside its target, not yet renamed into place.
/// Dropping it without [`Staged::commit`] removes the temporary file, so a run that fails after
/// staging some outputs leaves none of them.
#[derive(Debug)]
pub struct Staged {
    tmp: PathBuf,
    path: PathBuf,
    committed: bool,
}

impl Staged {
    /// Rename the temporary file onto the target path.
    ///
    /// # Errors
    /// [`OutputError::Io`] when the rename fails (the temporary file is then removed).
    pub fn commit(mut self) -> Result<(), OutputError> {
        std::fs::rename(&self.tmp, &self.path).map_err(|source| OutputError::Io {
            path: self.path.display().to_string(),
            source,
        })?;
        self.committed = true;
        crate::worker::committed(&self.path);
        Ok(())
    }
}

impl Drop for Staged {
    fn drop(&mut self) {
        if !self.committed {
            let _ = std::fs::remove_file(&self.tmp);
        }
    }
}

/// Write `bytes` to a temporary file in `path`'s folder (flushed to disk) without touching `path`.
/// A target that is a folder is refused before anything is written.
///
/// # Errors
/// As [`stage_with`].
pub fn stage(path: &Path, bytes: &[u8]) -> Result<Staged, OutputError> {
    use std::io::Write;
    stage_with(path, |f| f.write_all(bytes))
}

/// Like [`stage`], with `write` writing the content into the temporary file (so a large output
/// is never held in memory whole). Whatever `write` fails with is reported against `path`.
///
/// The temporary file is `.NAME.PID.tmp` beside the target; in a worker process its path is
/// reported to the parent first (`crate::worker::staged`), which removes it if the worker dies.
///
/// # Errors
/// [`OutputError::Io`] for a target that is a folder, a file that cannot be created, or a
/// failed write or flush.
pub fn stage_with(
    path: &Path,
    write: impl FnOnce(&mut std::io::BufWriter<std::fs::File>) -> std::io::Result<()>,
) -> Result<Staged, OutputError> {
    use std::io::Write;
    let io = |source| OutputError::Io {
        path: path.display().to_string(),
        source,
    };
    if path.is_dir() {
        return Err(io(std::io::Error::new(
            std::io::ErrorKind::IsADirectory,
            "is a folder, not a file",
        )));
    }
    let dir = path
        .parent()
        .filter(|p| !p.as_os_str().is_empty())
        .unwrap_or(Path::new("."));
    let name = path
        .file_name()
        .and_then(|n| n.to_str())
        .unwrap_or("output");
    let staged = Staged {
        tmp: dir.join(format!(".{name}.{}.tmp", std::process::id())),
        path: path.to_path_buf(),
        committed: false,
    };
    crate::worker::enter(crate::worker::Phase::Write, &path.display().to_string());
    crate::worker::staged(&staged.tmp);
    let file = std::fs::File::create(&staged.tmp).map_err(io)?;
    crate::worker::fault::point(crate::worker::fault::Place::Save);
    let mut f = std::io::BufWriter::with_capacity(1 << 20, file);
    write(&mut f).map_err(io)?;
    f.flush().map_err(io)?;
    f.get_ref().sync_all().map_err(io)?;
    Ok(staged)
}

/// Save `book` into a file staged beside `path` (see [`stage_with`]): written straight to disk,
/// never held whole in memory.
///
/// # Errors
/// [`OutputError::Xlsx`] when the workbook cannot be assembled (ours), [`OutputError::Io`] when
/// it cannot be written (the disk's); either way nothing is left behind.
pub fn stage_book(
    path: &Path,
    book: &mut rust_xlsxwriter::Workbook,
) -> Result<Staged, OutputError> {
    let mut internal = None;
    let staged = stage_with(path, |f| {
        book.save_to_writer(f).map_err(|e| match e {
            rust_xlsxwriter::XlsxError::IoError(io) => io,
            other => {
                internal = Some(other);
                std::io::Error::other("the workbook could not be assembled")
            }
        })
    });
    match internal {
        Some(source) => Err(OutputError::Xlsx {
            path: path.display().to_string(),
            source,
        }),
        None => staged,
    }
}

/// The rules in force as `section.key` and value pairs, in the order `lossledger rules` prints
/// them (for Basis sheets).
pub fn rules_in_force(rules: &crate::audit::Rules) -> Vec<(String, String)> {
    let toml = toml::to_string(rules).unwrap_or_default();
    let mut section = String::new();
    let mut out = Vec::new();
    for l in toml.lines().map(str::trim).filter(|l| !l.is_empty()) {
        if let Some(name) = l.strip_prefix('[') {
            section = name.trim_end_matches(']').to_string();
        } else if let Some((k, v)) = l.split_once('=') {
            out.push((format!("{section}.{}", k.trim()), v.trim().to_string()));
        }
    }
    out
}
