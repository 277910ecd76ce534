//! Which line a row of a mixed list belongs to: its Line column, the section heading above it
//! (`Line TB-01`, `LINE NO: TB-01`, `TB-01 — pump suction`), the leading part of its tag
//! (`TB-01-V1` → `TB-01`) or its location, when those name lines listed in Lines.

use calamine::Data;
use std::collections::BTreeMap;

use crate::ingest::grid::SheetGrid;
use crate::ingest::header::Layout;

/// The line ids a file lists in Lines, longest first (so `TB-01A` wins over `TB-01`).
#[derive(Clone, Debug, Default)]
pub struct KnownLines {
    ids: Vec<String>,
}

impl KnownLines {
    /// From the ids of a Lines table.
    pub fn new(ids: impl IntoIterator<Item = String>) -> KnownLines {
        let mut ids: Vec<String> = ids.into_iter().collect();
        ids.sort_by(|a, b| b.len().cmp(&a.len()).then(a.cmp(b)));
        ids.dedup();
        KnownLines { ids }
    }

    /// Whether there is a Lines table at all.
    pub fn is_empty(&self) -> bool {
        self.ids.is_empty()
    }

    /// The id as listed, matched without regard to case.
    pub fn find(&self, text: &str) -> Option<&str> {
        let t = text.trim();
        self.ids
            .iter()
            .find(|id| id.eq_ignore_ascii_case(t))
            .map(String::as_str)
    }

    /// The listed id a tag or location starts with, followed by a separator or nothing.
    pub fn prefix_of(&self, text: &str) -> Option<&str> {
        let t = text.trim();
        self.ids
            .iter()
            .find(|id| {
                t.len() >= id.len()
                    && t.is_char_boundary(id.len())
                    && t[..id.len()].eq_ignore_ascii_case(id)
                    && t[id.len()..]
                        .chars()
                        .next()
                        .is_none_or(|c| matches!(c, '-' | '/' | '.' | '_' | ' ' | ':'))
            })
            .map(String::as_str)
    }

    /// The ids, sorted, for an error message (at most 20).
    pub fn listing(&self) -> String {
        let mut ids: Vec<&str> = self.ids.iter().map(String::as_str).collect();
        ids.sort_unstable();
        let more = ids.len().saturating_sub(20);
        let mut out = ids.into_iter().take(20).collect::<Vec<_>>().join(", ");
        if more > 0 {
            out.push_str(&format!(" and {more} more"));
        }
        out
    }
}

/// What a row with text only (no quantity, unit or size) is.
#[derive(Clone, Debug, PartialEq)]
pub enum Heading {
    /// A heading naming a line: the id (as listed when the Lines table has it).
    Line(String),
    /// A heading that looks like a line heading but names no listed line: the id written.
    Unknown(String),
    /// Any other text-only row (a section title such as `Valves`, a note).
    Other(String),
}

/// A row holding text only, in at most two cells, with nothing in the columns that carry
/// amounts: a heading or a note. Its text, else `None`.
pub fn heading_text(grid: &SheetGrid, layout: &Layout, row: u32) -> Option<String> {
    for key in ["qty", "unit", "size", "length", "status"] {
        if let Some(c) = layout.column(key)
            && !matches!(grid.value(row, c.col), Data::Empty)
        {
            return None;
        }
    }
    let mut texts = Vec::new();
    for (_, d) in grid.row(row) {
        match d {
            Data::Empty => {}
            Data::String(s) if s.trim().is_empty() => {}
            Data::String(s) => texts.push(s.trim().to_string()),
            _ => return None,
        }
        if texts.len() > 2 {
            return None;
        }
    }
    (!texts.is_empty()).then(|| texts.join(" "))
}

/// Read a heading's text: `Line TB-01`, `LINE NO: TB-01`, `Line No. TB-01 (suction)`,
/// `TB-01 — pump suction`, `TB-01`.
pub fn read_heading(text: &str, known: &KnownLines) -> Heading {
    let t = text.trim();
    let lower = t.to_lowercase();
    let mut rest = None;
    for prefix in [
        "line number",
        "line no.",
        "line no",
        "line ref.",
        "line ref",
        "line id",
        "line",
    ] {
        if let Some(r) = lower.strip_prefix(prefix)
            && r.chars().next().is_none_or(|c| !c.is_alphanumeric())
        {
            // Same byte length: the prefix is ASCII.
            rest = t.get(prefix.len()..);
            break;
        }
    }
    let prefixed = rest.is_some();
    let body = rest
        .unwrap_or(t)
        .trim_start_matches(|c: char| c.is_whitespace() || matches!(c, ':' | '.' | '#' | '-'));
    let id: String = body
        .split(|c: char| c.is_whitespace() || matches!(c, '—' | '–' | '(' | ',' | ';'))
        .next()
        .unwrap_or_default()
        .trim_end_matches([':', '.', ','])
        .to_string();
    if id.is_empty() {
        return Heading::Other(t.to_string());
    }
    if let Some(found) = known.find(&id) {
        return Heading::Line(found.to_string());
    }
    let after = body[id.len().min(body.len())..].trim_start();
    let separated =
        after.is_empty() || after.starts_with(['—', '–', ':', '(']) || after.starts_with("- ");
    let looks_like_id = id.chars().any(|c| c.is_ascii_digit())
        && id.chars().any(char::is_alphabetic)
        && id
            .chars()
            .all(|c| c.is_alphanumeric() || matches!(c, '-' | '/' | '_' | '.'));
    match (prefixed, known.is_empty()) {
        (true, true) => Heading::Line(id),
        (true, false) => Heading::Unknown(id),
        (false, _) if looks_like_id && separated && !known.is_empty() => Heading::Unknown(id),
        _ => Heading::Other(t.to_string()),
    }
}

/// Locations mapped to lines by the map file's `[locations]` table, folded for lookup.
pub type LocationMap = BTreeMap<String, String>;

#[cfg(test)]
mod tests {
    use super::*;

    fn known() -> KnownLines {
        KnownLines::new(["TB-01".to_string(), "TB-02".into(), "TB-01A".into()])
    }

    #[test]
    fn headings_name_lines() {
        let k = known();
        for t in [
            "Line TB-01",
            "LINE NO: TB-01",
            "Line No. TB-01 (suction)",
            "TB-01 — pump suction",
            "TB-01",
            "line tb-01",
        ] {
            assert_eq!(read_heading(t, &k), Heading::Line("TB-01".into()), "{t}");
        }
        assert_eq!(
            read_heading("Line TB-09", &k),
            Heading::Unknown("TB-09".into())
        );
        assert_eq!(
            read_heading("TB-09 — spare", &k),
            Heading::Unknown("TB-09".into())
        );
        assert_eq!(read_heading("Valves", &k), Heading::Other("Valves".into()));
        assert_eq!(
            read_heading("Lined pipework", &k),
            Heading::Other("Lined pipework".into())
        );
    }

    #[test]
    fn tags_carry_their_line() {
        let k = known();
        assert_eq!(k.prefix_of("TB-01-V1"), Some("TB-01"));
        assert_eq!(k.prefix_of("TB-01A-V1"), Some("TB-01A"));
        assert_eq!(k.prefix_of("TB-011"), None);
        assert_eq!(k.prefix_of("XX-1"), None);
    }
}
