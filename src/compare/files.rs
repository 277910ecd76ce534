//! Writing a comparison: the workbook and the JSON staged beside their targets and renamed into
//! place only when both are complete, as `audit` does.

use std::path::{Path, PathBuf};

use super::Comparison;
use super::workbook::{BasisNotes, build};
use crate::error::OutputError;
use crate::ingest::Input;
use crate::report::{Staged, check_not_input, stage, stage_book};

/// Default output path: `NEW.compare.xlsx` beside the new input.
pub fn default_output(new: &Path) -> PathBuf {
    let stem = new.file_stem().and_then(|s| s.to_str()).unwrap_or("input");
    new.with_file_name(format!("{stem}.compare.xlsx"))
}

/// The files a comparison must never write over: both sides' paths and every file read.
pub fn input_paths(given: &[&Path], sides: &[&Input]) -> Vec<PathBuf> {
    let mut out: Vec<PathBuf> = given.iter().map(|p| p.to_path_buf()).collect();
    for s in sides {
        out.extend(s.sources.iter().map(|s| s.path.clone()));
    }
    out
}

/// Write the workbook to `out` and the JSON to `json` (when given): both are staged first, and
/// neither appears unless both were written in full. Refuses to write over an input.
///
/// # Errors
/// [`OutputError::WouldOverwriteInput`] before anything is written; [`OutputError::Xlsx`] when
/// the workbook cannot be assembled; [`OutputError::Io`] from the disk.
pub fn write(
    c: &Comparison,
    new: &Input,
    notes: &BasisNotes,
    out: &Path,
    json: Option<&Path>,
    inputs: &[PathBuf],
) -> Result<(), OutputError> {
    let mut taken = inputs.to_vec();
    if let Some(j) = json {
        check_not_input(j, &taken)?;
        taken.push(j.to_path_buf());
    }
    check_not_input(out, &taken)?;
    let xlsx = |source| OutputError::Xlsx {
        path: out.display().to_string(),
        source,
    };
    crate::worker::enter(crate::worker::Phase::Write, &out.display().to_string());
    let mut book = build(c, new, notes).map_err(xlsx)?;
    let staged = stage_book(out, &mut book)?;
    let staged_json: Option<Staged> = match json {
        Some(path) => {
            let text = c.to_json().map_err(|source| OutputError::Json {
                path: path.display().to_string(),
                source,
            })?;
            Some(stage(path, text.as_bytes())?)
        }
        None => None,
    };
    staged.commit()?;
    if let Some(s) = staged_json {
        s.commit()?;
    }
    Ok(())
}
