//! Writing a review: the audited copies (staged while the stations run), the review workbook and
//! its JSON, all renamed into place only once every one of them is complete.

use std::path::{Path, PathBuf};

use super::Review;
use crate::error::OutputError;
use crate::report::{Staged, stage_book, stage_with};

/// The folder the audited copies go into, created for the run (with any missing parents) when it
/// did not exist; a run that writes nothing removes what it created ([`CopiesDir::discard`]).
#[derive(Debug)]
pub struct CopiesDir {
    /// The folder.
    pub path: PathBuf,
    /// The folders this run created, innermost first.
    created: Vec<PathBuf>,
}

impl CopiesDir {
    /// Make sure the folder exists.
    ///
    /// # Errors
    /// [`OutputError::Io`] when it cannot be created, or the name is taken by a file.
    pub fn prepare(path: &Path) -> Result<CopiesDir, OutputError> {
        let created: Vec<PathBuf> = path
            .ancestors()
            .take_while(|p| !p.as_os_str().is_empty() && !p.exists())
            .map(Path::to_path_buf)
            .collect();
        std::fs::create_dir_all(path).map_err(|source| OutputError::Io {
            path: path.display().to_string(),
            source,
        })?;
        Ok(CopiesDir {
            path: path.to_path_buf(),
            created,
        })
    }

    /// Remove the folders this run created, when they are empty (nothing was written).
    pub fn discard(self) {
        for dir in &self.created {
            if std::fs::remove_dir(dir).is_err() {
                break;
            }
        }
    }
}

/// Stage the review workbook at `out` and the JSON at `json` (when given), then rename the
/// audited copies, the workbook and the JSON into place. Before the renames, any failure leaves
/// nothing behind (the staged files are removed when dropped).
///
/// # Errors
/// [`OutputError::Xlsx`] when the workbook cannot be assembled, [`OutputError::Io`] from the disk
/// (or the findings' temporary file).
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
        Some(path) => Some(stage_with(path, |f| {
            review.write_json(f).map_err(std::io::Error::other)
        })?),
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
