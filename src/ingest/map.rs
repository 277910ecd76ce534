//! A user's header map (`--map FILE`): their own header spellings mapped to canonical columns
//! when the alias table does not reach, and their own sheet names mapped to tables.
//!
//! ```toml
//! [sheets]
//! "Site takeoff" = "pipes"
//!
//! [pipes]
//! "Run length ft" = "length [ft]"   # column key, optionally with the unit in brackets
//! "Pipe ref" = "line"
//! ```
//!
//! Table names are `lines`, `pipes`, `fittings`, `systems`, `fluids`, `pump curve` (or the sheet
//! name they are found under); column names are the keys of `docs/input-format.md` (`length`,
//! `inner_diameter`, ...) or the canonical headers (`Inner diameter`). Headers and names are
//! compared after folding case, spaces and punctuation, like the aliases.

use std::collections::BTreeMap;
use std::path::Path;

use super::header::{Layout, split_header};
use super::schema::{self, ALL_TABLES, ColumnSpec, ColumnType, TableKind};
use crate::units;

/// Why a map file could not be used.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[error("{path}: {message}")]
pub struct MapError {
    /// Map file.
    pub path: String,
    /// What is wrong.
    pub message: String,
}

/// One header mapped to a column.
#[derive(Clone, Debug)]
struct Entry {
    folded: String,
    spec: &'static ColumnSpec,
    unit: Option<String>,
}

/// A parsed header map.
#[derive(Clone, Debug, Default)]
pub struct HeaderMap {
    sheets: Vec<(String, TableKind)>,
    columns: Vec<(TableKind, Entry)>,
    locations: BTreeMap<String, String>,
}

/// The table a map section or value names (`pipes`, `Pipe takeoff`, `pump curve`...).
pub fn table_named(name: &str) -> Option<TableKind> {
    let f = schema::fold(name);
    ALL_TABLES
        .into_iter()
        .chain([TableKind::List])
        .find(|&k| schema::fold(k.sheet_name()) == f || schema::fold(&format!("{k:?}")) == f)
        .or_else(|| schema::match_sheet(name))
}

/// The column of a table a map value names: its key or its canonical header, case-insensitively.
pub fn column_named(table: TableKind, name: &str) -> Option<&'static ColumnSpec> {
    let f = schema::fold(name);
    schema::spec(table)
        .columns
        .iter()
        .find(|c| schema::fold(c.key) == f || schema::fold(c.header) == f)
}

impl HeaderMap {
    /// Read a map file.
    ///
    /// # Errors
    /// The file cannot be read, is not TOML, or names a table, column or unit that does not exist.
    pub fn from_file(path: &Path) -> Result<HeaderMap, MapError> {
        let p = path.display().to_string();
        let text = std::fs::read_to_string(path).map_err(|e| MapError {
            path: p.clone(),
            message: e.to_string(),
        })?;
        HeaderMap::from_toml(&text, &p)
    }

    /// Parse map text (`path` is used in messages).
    ///
    /// # Errors
    /// As [`HeaderMap::from_file`].
    pub fn from_toml(text: &str, path: &str) -> Result<HeaderMap, MapError> {
        let err = |message: String| MapError {
            path: path.to_string(),
            message,
        };
        let doc: BTreeMap<String, toml::Value> =
            toml::from_str(text).map_err(|e| err(format!("not a valid map file: {e}")))?;
        let mut map = HeaderMap::default();
        let tables = ALL_TABLES
            .iter()
            .map(|k| format!("[{}]", schema::fold(k.sheet_name())))
            .collect::<Vec<_>>()
            .join(", ");
        for (section, value) in doc {
            let toml::Value::Table(entries) = value else {
                return Err(err(format!(
                    "'{section}' must be a section such as [pipes] holding \"Your header\" = \"column\" lines"
                )));
            };
            if schema::fold(&section) == "locations" {
                for (location, v) in entries {
                    let Some(line) = v.as_str().filter(|l| !l.trim().is_empty()) else {
                        return Err(err(format!(
                            "[locations] \"{location}\": the value must be a line id in quotes"
                        )));
                    };
                    map.locations
                        .insert(schema::fold(&location), line.trim().to_string());
                }
                continue;
            }
            if schema::fold(&section) == "sheets" {
                for (sheet, v) in entries {
                    let name = v.as_str().unwrap_or_default();
                    let kind = table_named(name).ok_or_else(|| {
                        err(format!(
                            "[sheets] \"{sheet}\" = \"{name}\": no such table (use one of {tables})"
                        ))
                    })?;
                    map.sheets.push((schema::fold(&sheet), kind));
                }
                continue;
            }
            let kind = table_named(&section).ok_or_else(|| {
                err(format!(
                    "[{section}]: no such table (use one of {tables}, or [sheets])"
                ))
            })?;
            for (header, v) in entries {
                let Some(target) = v.as_str() else {
                    return Err(err(format!(
                        "[{section}] \"{header}\": the value must be a column name in quotes"
                    )));
                };
                let (name, unit) = split_header(target);
                let spec = column_named(kind, &name).ok_or_else(|| {
                    let keys: Vec<&str> = schema::spec(kind).columns.iter().map(|c| c.key).collect();
                    err(format!(
                        "[{section}] \"{header}\" = \"{target}\": '{name}' is not a column of {} (columns: {})",
                        kind.sheet_name(),
                        keys.join(", ")
                    ))
                })?;
                if let (Some(u), ColumnType::Number(q)) = (&unit, spec.ty)
                    && units::parse_unit(u, q).is_none()
                {
                    return Err(err(format!(
                        "[{section}] \"{header}\" = \"{target}\": unit '{u}' is not a unit of {q:?}"
                    )));
                }
                map.columns.push((
                    kind,
                    Entry {
                        folded: schema::fold(&header),
                        spec,
                        unit,
                    },
                ));
            }
        }
        Ok(map)
    }

    /// Locations of a register mapped to line ids (`[locations]`), keys folded.
    pub fn locations(&self) -> &BTreeMap<String, String> {
        &self.locations
    }

    /// The table a sheet name is mapped to.
    pub fn sheet(&self, name: &str) -> Option<TableKind> {
        let f = schema::fold(name);
        self.sheets.iter().find(|(s, _)| *s == f).map(|(_, k)| *k)
    }

    /// The column (and unit, when the map gives one) a header is mapped to in a table.
    pub fn column(
        &self,
        table: TableKind,
        header: &str,
    ) -> Option<(&'static ColumnSpec, Option<String>)> {
        let f = schema::fold(header);
        if f.is_empty() {
            return None;
        }
        self.columns
            .iter()
            .find(|(k, e)| *k == table && e.folded == f)
            .map(|(_, e)| (e.spec, e.unit.clone()))
    }

    /// Whether the map has no entries.
    pub fn is_empty(&self) -> bool {
        self.sheets.is_empty() && self.columns.is_empty()
    }
}

fn quote(s: &str) -> String {
    format!("\"{}\"", s.replace('\\', "\\\\").replace('"', "\\\""))
}

/// The mapping used for some layouts, written as a map file a user can copy and edit.
pub fn mapping_toml(layouts: &[&Layout]) -> String {
    let mut out = String::from(
        "# Header mapping used (a --map file: \"header as written\" = \"column [unit]\")\n",
    );
    let mut sheets = String::new();
    for l in layouts {
        if schema::match_sheet(&l.sheet) != Some(l.table) {
            sheets.push_str(&format!(
                "{} = {}\n",
                quote(&l.sheet),
                quote(&schema::fold(l.table.sheet_name()))
            ));
        }
    }
    if !sheets.is_empty() {
        out.push_str("\n[sheets]\n");
        out.push_str(&sheets);
    }
    for l in layouts {
        out.push_str(&format!(
            "\n# sheet '{}', header row {}{}\n[{}]\n",
            l.sheet,
            l.header_row + 1,
            if l.header_rows > 1 {
                format!("-{}", l.header_row + l.header_rows)
            } else {
                String::new()
            },
            schema::fold(l.table.sheet_name())
        ));
        let mut cols: Vec<_> = l.columns.iter().collect();
        cols.sort_by_key(|c| c.col);
        for c in cols {
            let unit = match (&c.unit, c.unit_defaulted) {
                (Some(u), false) => format!(" [{}]", u.label),
                _ => String::new(),
            };
            out.push_str(&format!(
                "{} = {}\n",
                quote(&c.header),
                quote(&format!("{}{unit}", c.spec.key))
            ));
        }
        for (_, h) in &l.unknown {
            out.push_str(&format!("# {} is not mapped (kept as is)\n", quote(h)));
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn entries_name_tables_columns_and_units() {
        let m = HeaderMap::from_toml(
            "[sheets]\n\"Site list\" = \"pipes\"\n[pipes]\n\"Run length ft\" = \"length [ft]\"\n\"Pipe ref\" = \"Line\"\n",
            "t.toml",
        )
        .unwrap();
        assert_eq!(m.sheet("site LIST"), Some(TableKind::Pipes));
        let (spec, unit) = m.column(TableKind::Pipes, "run length (ft)").unwrap();
        assert_eq!((spec.key, unit.as_deref()), ("length", Some("ft")));
        assert_eq!(
            m.column(TableKind::Pipes, "Pipe ref").map(|c| c.0.key),
            Some("line")
        );
        assert!(m.column(TableKind::Fittings, "Pipe ref").is_none());
    }

    #[test]
    fn bad_entries_are_refused_with_a_reason() {
        for bad in [
            "[pipez]\n\"a\" = \"line\"\n",
            "[pipes]\n\"a\" = \"lenght\"\n",
            "[pipes]\n\"a\" = \"length [parsec]\"\n",
            "[pipes]\n\"a\" = 3\n",
            "not toml",
        ] {
            assert!(HeaderMap::from_toml(bad, "t.toml").is_err(), "{bad}");
        }
    }
}
