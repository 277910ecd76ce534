//! Which files are stations, what each is called and where its audited copy goes.
//!
//! Every file given is one station; a folder gives each input file directly inside it
//! ([`crate::ingest::folder_inputs`]: `.xlsx`, `.xlsm`, `.xls`, `.ods`, `.csv`, sorted by name,
//! lock files and earlier audits left out), not its subfolders. The review's own outputs are
//! never stations. A station is named by its file's stem; a stem met again gets ` (2)`, ` (3)`…
//! in input order. Its audited copy is `<stem>.audit.xlsx` in the copies folder (characters
//! other than letters, digits, `-`, `_` and `.` become `_`, so the link to it stays a plain
//! relative path), numbered like the name when two stems clash.

use std::collections::HashSet;
use std::path::{Path, PathBuf};

use crate::error::InputError;

/// One station to audit.
#[derive(Clone, Debug, PartialEq)]
pub struct Station {
    /// Position in the review (input order).
    pub index: usize,
    /// Name shown in the review (the file's stem, numbered when repeated).
    pub name: String,
    /// The workbook.
    pub path: PathBuf,
    /// File name of its audited copy inside the copies folder.
    pub copy_name: String,
}

/// The stations in `inputs` (files, or folders of them), leaving out `exclude` (the review's
/// own outputs).
///
/// # Errors
/// A folder that cannot be listed or holds no input files; no station at all.
pub fn discover(inputs: &[PathBuf], exclude: &[PathBuf]) -> Result<Vec<Station>, InputError> {
    let canon = |p: &Path| std::fs::canonicalize(p).unwrap_or_else(|_| p.to_path_buf());
    let excluded: HashSet<PathBuf> = exclude.iter().map(|p| canon(p)).collect();
    let mut files = Vec::new();
    for p in inputs {
        if p.is_dir() {
            files.extend(crate::ingest::folder_inputs(p)?);
        } else {
            files.push(p.clone());
        }
    }
    files.retain(|f| !excluded.contains(&canon(f)));
    if files.is_empty() {
        return Err(InputError::Unreadable {
            file: inputs
                .iter()
                .map(|p| p.display().to_string())
                .collect::<Vec<_>>()
                .join(", "),
            reason: "no station workbooks to review".into(),
        });
    }
    let mut names = HashSet::new();
    let mut copies = HashSet::new();
    Ok(files
        .into_iter()
        .enumerate()
        .map(|(index, path)| {
            let stem = path
                .file_stem()
                .and_then(|s| s.to_str())
                .unwrap_or("station")
                .to_string();
            let name = numbered(&stem, &mut names, |w, i| format!("{w} ({i})"));
            let safe = safe_file_stem(&stem);
            let copy_stem = numbered(&safe, &mut copies, |w, i| format!("{w}-{i}"));
            Station {
                index,
                name,
                path,
                copy_name: format!("{copy_stem}.audit.xlsx"),
            }
        })
        .collect())
}

/// `wanted`, else `nth(wanted, 2)`, `nth(wanted, 3)`… the first not yet in `taken` (compared
/// without case, as file systems and sheet names may); the name returned is added to `taken`.
fn numbered(wanted: &str, taken: &mut HashSet<String>, nth: fn(&str, usize) -> String) -> String {
    let name = (1..)
        .map(|i| {
            if i == 1 {
                wanted.to_string()
            } else {
                nth(wanted, i)
            }
        })
        .find(|n| !taken.contains(&n.to_lowercase()))
        .unwrap_or_default();
    taken.insert(name.to_lowercase());
    name
}

/// A file stem with every character but ASCII letters, digits, `-`, `_` and `.` turned to `_`.
fn safe_file_stem(stem: &str) -> String {
    let s: String = stem
        .chars()
        .map(|c| {
            if c.is_ascii_alphanumeric() || matches!(c, '-' | '_' | '.') {
                c
            } else {
                '_'
            }
        })
        .collect();
    if s.is_empty() { "station".into() } else { s }
}

/// The copies folder of a review written to `out`: `<stem>-stations` beside it.
pub fn copies_dir(out: &Path) -> PathBuf {
    let stem = out.file_stem().and_then(|s| s.to_str()).unwrap_or("review");
    out.with_file_name(format!("{stem}-stations"))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn repeated_stems_are_numbered_and_copy_names_are_plain() {
        let dir = std::env::temp_dir().join(format!("ll-stations-{}", std::process::id()));
        let _ = std::fs::remove_dir_all(&dir);
        for sub in ["north", "south"] {
            std::fs::create_dir_all(dir.join(sub)).unwrap();
            std::fs::write(dir.join(sub).join("Booster 1.xlsx"), b"x").unwrap();
        }
        std::fs::write(dir.join("north").join("review.xlsx"), b"x").unwrap();
        let s = discover(
            &[dir.join("north"), dir.join("south")],
            &[dir.join("north").join("review.xlsx")],
        )
        .unwrap();
        let names: Vec<(&str, &str)> = s
            .iter()
            .map(|s| (s.name.as_str(), s.copy_name.as_str()))
            .collect();
        assert_eq!(
            names,
            [
                ("Booster 1", "Booster_1.audit.xlsx"),
                ("Booster 1 (2)", "Booster_1-2.audit.xlsx")
            ]
        );
        assert_eq!(
            copies_dir(Path::new("out/estate.xlsx")),
            Path::new("out/estate-stations")
        );
        std::fs::remove_dir_all(&dir).unwrap();
    }
}
