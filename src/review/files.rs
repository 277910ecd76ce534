//! Writing a review: the audited copies (staged while the stations run), the review workbook and
//! its JSON, all renamed into place only once every one of them is complete.

use std::path::{Path, PathBuf};

use super::Review;
use crate::error::OutputError;
use crate::report::{Staged, stage, stage_book};

/// The folder the audited copies go into, created for the run when it did not exist; a run that
/// writes nothing removes it again ([`CopiesDir::discard`]).
#[derive(Debug)]
pub struct CopiesDir {
    /// The folder.
    pub path: PathBuf,
    created: bool,
}

impl CopiesDir {
    /// Make sure the folder exists.
    ///
    /// # Errors
    /// [`OutputError::Io`] when it cannot be created, or the name is taken by a file.
    pub fn prepare(path: &Path) -> Result<CopiesDir, OutputError> {
        let io = |source| OutputError::Io {
            path: path.display().to_string(),
            source,
        };
        if path.is_dir() {
            return Ok(CopiesDir {
                path: path.to_path_buf(),
                created: false,
            });
        }
        std::fs::create_dir_all(path).map_err(io)?;
        Ok(CopiesDir {
            path: path.to_path_buf(),
            created: true,
        })
    }

    /// Remove the folder when this run created it and it is empty (nothing was written).
    pub fn discard(self) {
        if self.created {
            let _ = std::fs::remove_dir(&self.path);
        }
    }
}

/// Stage the review workbook at `out` and the JSON at `json` (when given), then rename the
/// audited copies, the workbook and the JSON into place. Before the renames, any failure leaves
/// nothing behind (the staged files are removed when dropped).
///
/// # Errors
/// [`OutputError::Xlsx`] when the workbook cannot be assembled, [`OutputError::Json`] likewise
/// for the JSON, [`OutputError::Io`] from the disk.
pub fn write(
    review: &Review,
    out: &Path,
    json: Option<&Path>,
    copies: Vec<Staged>,
) -> Result<(), OutputError> {
    let mut book = super::workbook::build(review).map_err(|source| OutputError::Xlsx {
        path: out.display().to_string(),
        source,
    })?;
    let staged = stage_book(out, &mut book)?;
    drop(book);
    let staged_json = match json {
        Some(path) => {
            let text = review.to_json().map_err(|source| OutputError::Json {
                path: path.display().to_string(),
                source,
            })?;
            Some(stage(path, text.as_bytes())?)
        }
        None => None,
    };
    for c in copies {
        c.commit()?;
    }
    staged.commit()?;
    if let Some(s) = staged_json {
        s.commit()?;
    }
    Ok(())
}
