//! The committed reference CSVs (`fixtures/reference/`): comma-separated, a header line,
//! double-quoted fields where a field holds a comma (`""` escapes a quote).

use std::collections::HashMap;

/// Split one CSV line into fields.
pub fn split(line: &str) -> Vec<String> {
    let mut out = Vec::new();
    let mut cur = String::new();
    let mut quoted = false;
    let mut chars = line.chars().peekable();
    while let Some(c) = chars.next() {
        match c {
            '"' if quoted && chars.peek() == Some(&'"') => {
                cur.push('"');
                chars.next();
            }
            '"' => quoted = !quoted,
            ',' if !quoted => out.push(std::mem::take(&mut cur)),
            _ => cur.push(c),
        }
    }
    out.push(cur);
    out
}

/// The data rows of `text`, whose header line must be `header`; blank lines are skipped and
/// every row must have the header's field count.
pub fn rows(text: &str, header: &str) -> Vec<Vec<String>> {
    let mut lines = text.lines();
    assert_eq!(lines.next(), Some(header), "fixture header");
    let width = split(header).len();
    lines
        .filter(|l| !l.trim().is_empty())
        .map(|l| {
            let f = split(l);
            assert_eq!(f.len(), width, "bad fixture line {l}");
            f
        })
        .collect()
}

/// The data rows of an all-numeric CSV whose header line must be `header`.
pub fn numbers(text: &str, header: &str) -> Vec<Vec<f64>> {
    rows(text, header)
        .into_iter()
        .map(|r| {
            r.iter()
                .map(|s| s.parse().expect("fixture value is a number"))
                .collect()
        })
        .collect()
}

/// The data rows keyed by the header's column names.
pub fn keyed(text: &str) -> Vec<HashMap<String, String>> {
    let header = text.lines().next().expect("fixture has a header");
    let names = split(header);
    rows(text, header)
        .into_iter()
        .map(|r| names.iter().cloned().zip(r).collect())
        .collect()
}

/// A keyed row's number in `col`; `None` when blank.
pub fn num(row: &HashMap<String, String>, col: &str) -> Option<f64> {
    let v = row.get(col).map(String::as_str).unwrap_or("");
    if v.is_empty() {
        None
    } else {
        Some(v.parse().unwrap_or_else(|_| panic!("{col}={v}")))
    }
}
