//! The estate's findings, kept on disk while the stations run: an estate has many more findings
//! than any one station, so holding them all would make the review's memory grow with the
//! estate. Each station's findings are appended to a temporary file beside the review as it is
//! merged (one JSON object a line) and read back, station by station in input order, when the
//! `Findings` sheet and the JSON are written. The file is removed when the spill is dropped.

use std::fs::File;
use std::io::{BufRead, BufReader, BufWriter, Read, Seek, SeekFrom, Write};
use std::path::{Path, PathBuf};

use serde::{Deserialize, Serialize};

use super::summary::StationFinding;
use crate::error::{CellRef, OutputError};

/// One finding as spilled (the station's name and copy are the spill's, per station).
#[derive(Serialize, Deserialize)]
struct Spilled {
    severity: crate::error::Severity,
    code: String,
    line: Option<String>,
    tag: Option<String>,
    /// (sheet, zero-based row, zero-based column).
    cell: Option<(String, u32, u32)>,
    message: String,
    action: String,
}

/// One station's findings on disk: (station name, copy link, byte offset, bytes, findings).
type Chunk = (String, String, u64, u64, usize);

/// The findings of the estate, on disk.
#[derive(Debug)]
pub struct FindingSpill {
    path: PathBuf,
    writer: Option<BufWriter<File>>,
    /// Per station: (station name, copy link, byte offset, bytes, findings).
    chunks: Vec<Option<Chunk>>,
    end: u64,
}

impl FindingSpill {
    /// A new, empty spill for `stations` stations in a temporary file beside `beside`.
    ///
    /// # Errors
    /// [`OutputError::Io`] when the file cannot be created.
    pub fn create(beside: &Path, stations: usize) -> Result<FindingSpill, OutputError> {
        let dir = beside
            .parent()
            .filter(|p| !p.as_os_str().is_empty())
            .unwrap_or(Path::new("."));
        let name = beside
            .file_name()
            .and_then(|n| n.to_str())
            .unwrap_or("review");
        let path = dir.join(format!(".{name}.findings.{}.tmp", std::process::id()));
        let file = File::create(&path).map_err(|source| io_error(&path, source))?;
        Ok(FindingSpill {
            path,
            writer: Some(BufWriter::new(file)),
            chunks: vec![None; stations],
            end: 0,
        })
    }

    /// Append station `index`'s findings.
    ///
    /// # Errors
    /// [`OutputError::Io`] from the disk.
    pub fn append(&mut self, index: usize, findings: &[StationFinding]) -> Result<(), OutputError> {
        let Some(w) = self.writer.as_mut() else {
            return Ok(());
        };
        let mut bytes = Vec::new();
        for f in findings {
            let row = Spilled {
                severity: f.severity,
                code: f.code.clone(),
                line: f.line.clone(),
                tag: f.tag.clone(),
                cell: f.cell.as_ref().map(|c| (c.sheet.clone(), c.row, c.col)),
                message: f.message.clone(),
                action: f.action.clone(),
            };
            serde_json::to_writer(&mut bytes, &row)
                .map_err(std::io::Error::other)
                .map_err(|e| io_error(&self.path, e))?;
            bytes.push(b'\n');
        }
        w.write_all(&bytes).map_err(|e| io_error(&self.path, e))?;
        if let (Some(slot), Some(first)) = (self.chunks.get_mut(index), findings.first()) {
            *slot = Some((
                first.station.clone(),
                first.copy.clone(),
                self.end,
                bytes.len() as u64,
                findings.len(),
            ));
        }
        self.end += bytes.len() as u64;
        Ok(())
    }

    /// Finish writing; the spill can be read from then on.
    ///
    /// # Errors
    /// [`OutputError::Io`] from the disk.
    pub fn close(&mut self) -> Result<(), OutputError> {
        if let Some(mut w) = self.writer.take() {
            w.flush().map_err(|e| io_error(&self.path, e))?;
        }
        Ok(())
    }

    /// Findings of the estate.
    pub fn len(&self) -> usize {
        self.chunks.iter().flatten().map(|c| c.4).sum()
    }

    /// True when no station has a finding.
    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// Every finding, station by station in input order (each station's in its audit's order).
    /// Reads the file as it goes; each item is a finding or the error reading it.
    pub fn iter(&self) -> impl Iterator<Item = std::io::Result<StationFinding>> + '_ {
        let mut file = None;
        self.chunks
            .iter()
            .flatten()
            .flat_map(move |(station, copy, at, len, _)| {
                let lines = read_chunk(&self.path, &mut file, *at, *len);
                let lines: Vec<std::io::Result<StationFinding>> = match lines {
                    Ok(lines) => lines
                        .into_iter()
                        .map(|l| parse(&l, station, copy))
                        .collect(),
                    Err(e) => vec![Err(e)],
                };
                lines
            })
    }
}

impl Drop for FindingSpill {
    fn drop(&mut self) {
        self.writer = None;
        let _ = std::fs::remove_file(&self.path);
    }
}

/// The lines of one station's chunk (one station's findings: bounded by the largest station).
fn read_chunk(
    path: &Path,
    file: &mut Option<File>,
    at: u64,
    len: u64,
) -> std::io::Result<Vec<String>> {
    if file.is_none() {
        *file = Some(File::open(path)?);
    }
    let Some(f) = file.as_mut() else {
        return Ok(Vec::new());
    };
    f.seek(SeekFrom::Start(at))?;
    BufReader::new(f.take(len)).lines().collect()
}

fn parse(line: &str, station: &str, copy: &str) -> std::io::Result<StationFinding> {
    let s: Spilled = serde_json::from_str(line).map_err(std::io::Error::other)?;
    Ok(StationFinding {
        station: station.to_string(),
        severity: s.severity,
        code: s.code,
        line: s.line,
        tag: s.tag,
        cell: s
            .cell
            .map(|(sheet, row, col)| CellRef::new(sheet, row, col)),
        message: s.message,
        action: s.action,
        copy: copy.to_string(),
    })
}

fn io_error(path: &Path, source: std::io::Error) -> OutputError {
    OutputError::Io {
        path: path.display().to_string(),
        source,
    }
}

/// The findings serialise as a JSON array read from the spill as it is written out.
impl Serialize for FindingSpill {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        use serde::ser::{Error, SerializeSeq};
        let mut seq = s.serialize_seq(Some(self.len()))?;
        for f in self.iter() {
            seq.serialize_element(&f.map_err(S::Error::custom)?)?;
        }
        seq.end()
    }
}
