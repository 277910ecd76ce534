//! The console's table layout: a header, a rule of dashes under each column, text left-aligned,
//! numbers right-aligned, two spaces between columns and no vertical bars, fitted to a width.
//!
//! Fitting, in order: columns are shown at their natural width when the table fits; otherwise
//! the widest columns are narrowed one cell at a time, text first (text cells and headers wrap at
//! spaces; numbers never wrap, only their headers); when even the narrowest layout does not fit,
//! columns are moved out of the table, the widest text column first, into `key  Header: value`
//! lines below it, wrapped to the width. No line of the
//! result is wider than the width (measured in terminal cells).

use std::io::IsTerminal;

/// How a column's cells are aligned (and whether they may wrap).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Align {
    /// Text: left-aligned, wrapped when the table is too wide.
    Left,
    /// Numbers: right-aligned, never wrapped.
    Right,
}

/// Spaces between columns.
pub const GAP: usize = 2;

/// Narrowest a text column is made before columns are moved below the table.
pub const MIN_TEXT_WIDTH: usize = 10;

/// Words up to this wide are kept whole when a text column is narrowed.
pub const MAX_WORD_WIDTH: usize = 20;

/// Narrowest width tables and text are fitted to; a narrower request is raised to this.
pub const MIN_WIDTH: usize = 40;

/// A table of text cells, rendered by [`TextTable::render`].
#[derive(Clone, Debug, Default)]
pub struct TextTable {
    headers: Vec<String>,
    align: Vec<Align>,
    rows: Vec<Vec<String>>,
    key: usize,
}

/// Width of a text in terminal cells.
fn width(s: &str) -> usize {
    console::measure_text_width(s)
}

/// Wrap text at spaces to lines of at most `w` cells (`w` ≥ 1); words longer than `w` are broken.
/// Hard line breaks in the text are kept. An empty text gives one empty line.
pub fn wrap(text: &str, w: usize) -> Vec<String> {
    let w = w.max(1);
    let mut out = Vec::new();
    for para in text.split('\n') {
        let mut line = String::new();
        for word in para.split(' ').filter(|s| !s.is_empty()) {
            let mut word = word.to_string();
            loop {
                let sep = usize::from(!line.is_empty());
                if width(&line) + sep + width(&word) <= w {
                    if sep == 1 {
                        line.push(' ');
                    }
                    line.push_str(&word);
                    break;
                }
                if !line.is_empty() {
                    out.push(std::mem::take(&mut line));
                    continue;
                }
                // A word wider than the line: break it after its last hyphen that fits
                // (`pump-` / `discharge`), else at the width.
                let mut head = String::new();
                for c in word.chars() {
                    if !head.is_empty() && width(&head) + width(c.encode_utf8(&mut [0; 4])) > w {
                        break;
                    }
                    head.push(c);
                }
                if head.len() < word.len()
                    && let Some(i) = head.rfind('-').filter(|&i| i > 0)
                {
                    head.truncate(i + 1);
                }
                word = word.chars().skip(head.chars().count()).collect();
                out.push(head);
                if word.is_empty() {
                    break;
                }
            }
        }
        out.push(line);
    }
    out
}

/// Wrap prose to `width` with `indent` spaces before every line after the first.
pub fn wrap_hanging(text: &str, width: usize, indent: usize) -> String {
    let width = width.max(MIN_WIDTH);
    let first = wrap(text, width);
    let mut out = String::new();
    let mut rest = String::new();
    for (i, l) in first.iter().enumerate() {
        if i == 0 {
            out.push_str(l);
            out.push('\n');
        } else {
            if !rest.is_empty() {
                rest.push(' ');
            }
            rest.push_str(l);
        }
    }
    if !rest.is_empty() {
        for l in wrap(&rest, width - indent) {
            out.push_str(&" ".repeat(indent));
            out.push_str(&l);
            out.push('\n');
        }
    }
    out
}

/// The width console output is fitted to: the `COLUMNS` environment variable when it holds a
/// positive number, else the terminal's width when standard output is a terminal, else `None`
/// (not a terminal: tables at their full width, for files and pipes). Never below [`MIN_WIDTH`].
pub fn console_width() -> Option<usize> {
    if let Some(n) = std::env::var("COLUMNS")
        .ok()
        .and_then(|v| v.trim().parse::<usize>().ok())
        .filter(|&n| n > 0)
    {
        return Some(n.max(MIN_WIDTH));
    }
    if std::io::stdout().is_terminal() {
        return console::Term::stdout()
            .size_checked()
            .map(|(_, cols)| usize::from(cols).max(MIN_WIDTH));
    }
    None
}

impl TextTable {
    /// A table with these column headers and alignments.
    pub fn new(columns: &[(&str, Align)]) -> TextTable {
        TextTable {
            headers: columns.iter().map(|(h, _)| h.to_string()).collect(),
            align: columns.iter().map(|(_, a)| *a).collect(),
            rows: Vec::new(),
            key: 0,
        }
    }

    /// Name rows by column `c` in the lines below the table (default: the first column). The
    /// key column is never moved out of the table.
    pub fn keyed_by(mut self, c: usize) -> TextTable {
        self.key = c.min(self.headers.len().saturating_sub(1));
        self
    }

    /// Add a row; missing cells are blank, extra cells are dropped. Control characters other
    /// than line breaks (tabs, carriage returns) become spaces, so no cell is wider on the
    /// terminal than it is measured.
    pub fn row(&mut self, mut cells: Vec<String>) {
        cells.resize(self.headers.len(), String::new());
        for c in &mut cells {
            if c.chars().any(|ch| ch.is_control() && ch != '\n') {
                *c = c
                    .chars()
                    .map(|ch| {
                        if ch.is_control() && ch != '\n' {
                            ' '
                        } else {
                            ch
                        }
                    })
                    .collect();
            }
        }
        self.rows.push(cells);
    }

    /// True when the table has no rows.
    pub fn is_empty(&self) -> bool {
        self.rows.is_empty()
    }

    fn natural(&self, c: usize) -> usize {
        self.rows
            .iter()
            .map(|r| width(&r[c]))
            .chain(self.headers[c].split('\n').map(width))
            .max()
            .unwrap_or(0)
    }

    /// Widest word of a column's header and (for text) its cells.
    fn longest_word(&self, c: usize) -> usize {
        // Words break after hyphens when they must, so a hyphenated word's longest part counts.
        let part = |w: &str| w.split_inclusive('-').map(width).max().unwrap_or(0);
        let words = |t: &str| t.split([' ', '\n']).map(part).max().unwrap_or(0);
        let cells = match self.align[c] {
            Align::Right => 0,
            Align::Left => self.rows.iter().map(|r| words(&r[c])).max().unwrap_or(0),
        };
        words(&self.headers[c]).max(cells)
    }

    /// Narrowest a column can be: numbers as wide as their widest cell (their header may wrap at
    /// spaces); text as its longest word, between [`MIN_TEXT_WIDTH`] and [`MAX_WORD_WIDTH`] (or
    /// its natural width when narrower).
    fn minimum(&self, c: usize) -> usize {
        match self.align[c] {
            Align::Right => {
                let cells = self.rows.iter().map(|r| width(&r[c])).max().unwrap_or(0);
                cells.max(self.longest_word(c))
            }
            Align::Left => self
                .natural(c)
                .min(self.longest_word(c).clamp(MIN_TEXT_WIDTH, MAX_WORD_WIDTH)),
        }
    }

    /// Column widths for the kept columns within `limit`, or None when they cannot fit.
    fn fit(&self, kept: &[usize], limit: usize) -> Option<Vec<usize>> {
        let gaps = GAP * kept.len().saturating_sub(1);
        let mut w: Vec<usize> = kept.iter().map(|&c| self.natural(c)).collect();
        let min: Vec<usize> = kept.iter().map(|&c| self.minimum(c)).collect();
        if min.iter().sum::<usize>() + gaps > limit {
            return None;
        }
        // Narrow the widest column one cell at a time (text before numbers' headers) until the
        // table fits.
        while w.iter().sum::<usize>() + gaps > limit {
            let widest = (0..kept.len())
                .filter(|&i| w[i] > min[i])
                .max_by_key(|&i| {
                    (
                        self.align[kept[i]] == Align::Left,
                        w[i],
                        std::cmp::Reverse(i),
                    )
                })?;
            w[widest] -= 1;
        }
        Some(w)
    }

    /// The column to move below the table next: the widest text column other than the key,
    /// else the last one.
    fn to_move(&self, kept: &[usize]) -> usize {
        let movable = || kept.iter().enumerate().filter(|(_, c)| **c != self.key);
        movable()
            .filter(|(_, c)| self.align[**c] == Align::Left)
            .max_by_key(|(i, c)| (self.natural(**c), std::cmp::Reverse(*i)))
            .or_else(|| movable().next_back())
            .map_or(kept.len() - 1, |(i, _)| i)
    }

    /// Render within `limit` terminal cells per line (`None`: no limit).
    pub fn render(&self, limit: Option<usize>) -> String {
        let n = self.headers.len();
        let mut kept: Vec<usize> = (0..n).collect();
        let widths = match limit {
            None => kept.iter().map(|&c| self.natural(c)).collect(),
            Some(limit) => loop {
                if let Some(w) = self.fit(&kept, limit) {
                    break w;
                }
                if kept.len() == 1 {
                    // Only one column is left: wrap it to the width, text or not.
                    break vec![limit];
                }
                kept.remove(self.to_move(&kept));
            },
        };
        let moved: Vec<usize> = (0..n).filter(|c| !kept.contains(c)).collect();
        let mut out = String::new();
        let cells = |texts: Vec<&str>| -> Vec<Vec<String>> {
            texts
                .iter()
                .zip(&widths)
                .map(|(t, &w)| {
                    if !t.contains('\n') && width(t) <= w {
                        vec![t.to_string()]
                    } else {
                        wrap(t, w)
                    }
                })
                .collect()
        };
        let emit = |out: &mut String, wrapped: Vec<Vec<String>>| {
            let height = wrapped.iter().map(Vec::len).max().unwrap_or(1);
            for line in 0..height {
                let mut text = String::new();
                for (i, (&c, w)) in kept.iter().zip(&widths).enumerate() {
                    let cell = wrapped[i].get(line).map_or("", String::as_str);
                    let pad = w.saturating_sub(width(cell));
                    if i > 0 {
                        text.push_str(&" ".repeat(GAP));
                    }
                    if self.align[c] == Align::Right {
                        text.push_str(&" ".repeat(pad));
                        text.push_str(cell);
                    } else {
                        text.push_str(cell);
                        text.push_str(&" ".repeat(pad));
                    }
                }
                out.push_str(text.trim_end());
                out.push('\n');
            }
        };
        emit(
            &mut out,
            cells(kept.iter().map(|&c| self.headers[c].as_str()).collect()),
        );
        let rule: Vec<String> = widths.iter().map(|&w| "-".repeat(w)).collect();
        out.push_str(&rule.join(&" ".repeat(GAP)));
        out.push('\n');
        for r in &self.rows {
            emit(
                &mut out,
                cells(kept.iter().map(|&c| r[c].as_str()).collect()),
            );
        }
        if !moved.is_empty() {
            let limit = limit.unwrap_or(usize::MAX);
            for r in &self.rows {
                let key = &r[self.key];
                for &c in &moved {
                    if r[c].is_empty() {
                        continue;
                    }
                    let header = self.headers[c].replace('\n', " ").to_lowercase();
                    let text = format!("{key}, {header}: {}", r[c]);
                    out.push_str(&wrap_hanging(&text, limit, 4));
                }
            }
        }
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn longest(s: &str) -> usize {
        s.lines().map(width).max().unwrap_or(0)
    }

    fn sample() -> TextTable {
        let mut t = TextTable::new(&[
            ("Item", Align::Left),
            ("Head m", Align::Right),
            ("Suggestion", Align::Left),
        ]);
        t.row(vec![
            "KR-D1-CV".into(),
            "2.691".into(),
            "open valve-globe fully and set the flow by pump speed control or impeller trimming"
                .into(),
        ]);
        t.row(vec!["E1".into(), "0.086".into(), String::new()]);
        t
    }

    #[test]
    fn numbers_are_right_aligned_under_a_rule() {
        let s = sample().render(None);
        let lines: Vec<&str> = s.lines().collect();
        assert!(lines[0].starts_with("Item"));
        assert!(lines[1].chars().all(|c| c == '-' || c == ' '));
        assert!(!s.contains('|') && !s.contains('│'));
        // "0.086" ends where "Head m" ends.
        let end = |l: &str, pat: &str| l.find(pat).unwrap() + pat.len();
        assert_eq!(end(lines[0], "Head m"), end(lines[3], "0.086"));
    }

    #[test]
    fn long_text_wraps_inside_its_column_within_the_width() {
        for w in [40, 60, 80] {
            let s = sample().render(Some(w));
            assert!(longest(&s) <= w, "{w}:\n{s}");
            assert!(s.contains("trimming"), "no text lost:\n{s}");
        }
    }

    #[test]
    fn columns_that_cannot_fit_move_below_the_table() {
        let mut t = TextTable::new(&[
            ("Key", Align::Left),
            ("A", Align::Right),
            ("B", Align::Right),
        ]);
        t.row(vec!["k".into(), "1".repeat(30), "2".repeat(30)]);
        let s = t.render(Some(40));
        assert!(longest(&s) <= 40, "{s}");
        assert!(s.contains(&format!("k, b: {}", "2".repeat(30))), "{s}");
    }

    proptest::proptest! {
        // Any cells (wide characters, long words, hyphens, newlines) at any width from the
        // minimum up: no panic, no line wider than the width, no non-space character lost.
        #[test]
        fn no_line_is_wider_than_the_width(
            cells in proptest::collection::vec("[a-z0-9 ./–³\t-]{0,40}|[\\PC]{0,12}", 1..24),
            numbers in proptest::collection::vec(-1e7f64..1e7, 1..4),
            w in MIN_WIDTH..130usize,
        ) {
            let cols = [("Key", Align::Left), ("Text", Align::Left), ("Value\nm", Align::Right)];
            let mut t = TextTable::new(&cols);
            for (i, c) in cells.chunks(2).enumerate() {
                let n = numbers[i % numbers.len()];
                t.row(vec![c[0].clone(), c.get(1).cloned().unwrap_or_default(), format!("{n:.3}")]);
            }
            let s = t.render(Some(w));
            proptest::prop_assert!(longest(&s) <= w, "{}:\n{}", w, s);
            let kept = |x: &str| x.chars().filter(|c| !c.is_whitespace()).count();
            for c in &cells {
                proptest::prop_assert!(kept(&s) >= kept(c));
            }
        }
    }

    #[test]
    fn wrap_breaks_after_a_hyphen_first() {
        assert_eq!(wrap("pump-discharge", 10), vec!["pump-", "discharge"]);
    }

    #[test]
    fn wrap_breaks_long_words_and_keeps_every_character() {
        let lines = wrap("abcdefghij klm", 4);
        assert!(lines.iter().all(|l| width(l) <= 4), "{lines:?}");
        assert_eq!(lines.concat().replace(' ', ""), "abcdefghijklm");
    }
}
