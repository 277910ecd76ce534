//! Which item of the old revision is which item of the new one.
//!
//! - Lines: by id.
//! - Pipe runs of a line on both sides: by `Seq` when every run of the line has a distinct one on
//!   both sides, else by position (input order).
//! - Fittings: by tag when the tag is written and unique on both sides; the rest by line, kind
//!   and size (the n-th such item on one side with the n-th on the other).
//! - Systems: by id.

use serde::Serialize;
use std::collections::HashMap;

use crate::ingest::{FittingRow, Input, PipeRow};
use crate::pipeline::Audited;

/// How a pair of fittings was matched.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum FittingKey {
    /// By tag.
    Tag,
    /// By line, kind and size (a tag missing or repeated).
    LineKindSize,
}

impl FittingKey {
    /// How it reads in a note.
    pub fn label(self) -> &'static str {
        match self {
            FittingKey::Tag => "matched by tag",
            FittingKey::LineKindSize => "no unique tag: matched by line, kind and size",
        }
    }
}

/// Old (sheet, row) → new (sheet, row).
pub type RowMap = HashMap<(String, u32), (String, u32)>;

/// A pair of indices (old, new); one side is `None` when the item is only on the other.
pub type Pair = (Option<usize>, Option<usize>);

/// Every match between the two sides.
#[derive(Clone, Debug, Default)]
pub struct Matching {
    /// Lines, indices into `Audit::lines`: the new side's order, then lines only in the old one.
    pub lines: Vec<Pair>,
    /// Pipe runs of lines on both sides, indices into `Input::pipes`.
    pub runs: Vec<Pair>,
    /// Where each line's pairs sit in `runs`.
    pub runs_of_line: HashMap<String, std::ops::Range<usize>>,
    /// Lines on both sides whose runs were matched by position.
    pub runs_by_position: Vec<String>,
    /// Fittings, indices into `Input::fittings`, with how they were matched (`None`: unmatched).
    pub fittings: Vec<(Option<usize>, Option<usize>, Option<FittingKey>)>,
    /// Systems, indices into `Audit::systems`.
    pub systems: Vec<Pair>,
    /// Old (sheet, row) → new (sheet, row) of every matched item, to follow findings across.
    pub rows: RowMap,
}

/// How items were matched, for the report.
#[derive(Clone, Debug, Serialize)]
pub struct Summary {
    /// Lines on both sides.
    pub lines_matched: usize,
    /// Lines on both sides whose runs were matched by position (no distinct `Seq`).
    pub runs_by_position: Vec<String>,
    /// Fitting pairs matched by tag.
    pub fittings_by_tag: usize,
    /// Fitting pairs matched by line, kind and size.
    pub fittings_by_line_kind_size: usize,
}

impl Matching {
    /// The summary for the report.
    pub fn summary(&self) -> Summary {
        let count = |k: FittingKey| self.fittings.iter().filter(|f| f.2 == Some(k)).count();
        Summary {
            lines_matched: self
                .lines
                .iter()
                .filter(|(o, n)| o.is_some() && n.is_some())
                .count(),
            runs_by_position: self.runs_by_position.clone(),
            fittings_by_tag: count(FittingKey::Tag),
            fittings_by_line_kind_size: count(FittingKey::LineKindSize),
        }
    }
}

/// Match every line, run, fitting and system of `old` to `new`.
pub fn match_sides(old: &Audited, new: &Audited) -> Matching {
    let mut m = Matching {
        lines: pair_by_key(&ids(&old.audit.lines), &ids(&new.audit.lines)),
        ..Matching::default()
    };
    match_runs(&old.input, &new.input, &mut m);
    match_fittings(&old.input, &new.input, &mut m);
    let systems =
        |a: &Audited| -> Vec<String> { a.audit.systems.iter().map(|s| s.system.clone()).collect() };
    m.systems = pair_by_key(&systems(old), &systems(new));
    map_rows(old, new, &mut m);
    m
}

fn ids(lines: &[crate::audit::LineResult]) -> Vec<String> {
    lines.iter().map(|l| l.line.clone()).collect()
}

/// Pairs by equal key (keys unique on each side): new order, then old-only in old order.
fn pair_by_key<K: Eq + std::hash::Hash + Clone>(old: &[K], new: &[K]) -> Vec<Pair> {
    let index: HashMap<&K, usize> = old.iter().enumerate().map(|(i, k)| (k, i)).collect();
    let mut used = vec![false; old.len()];
    let mut out = Vec::with_capacity(new.len());
    for (j, k) in new.iter().enumerate() {
        let i = index.get(k).copied().filter(|&i| !used[i]);
        if let Some(i) = i {
            used[i] = true;
        }
        out.push((i, Some(j)));
    }
    out.extend(
        (0..old.len())
            .filter(|&i| !used[i])
            .map(|i| (Some(i), None)),
    );
    out
}

fn by_line<T>(rows: &[T], line: impl Fn(&T) -> &str) -> HashMap<&str, Vec<usize>> {
    let mut out: HashMap<&str, Vec<usize>> = HashMap::new();
    for (i, r) in rows.iter().enumerate() {
        out.entry(line(r)).or_default().push(i);
    }
    out
}

/// Seq numbers of the runs when all are given and distinct, as comparable keys.
fn seqs(pipes: &[PipeRow], idx: &[usize]) -> Option<Vec<u64>> {
    let keys: Option<Vec<u64>> = idx
        .iter()
        .map(|&i| pipes[i].seq.map(f64::to_bits))
        .collect();
    let keys = keys?;
    let distinct: std::collections::HashSet<&u64> = keys.iter().collect();
    (distinct.len() == keys.len()).then_some(keys)
}

fn match_runs(old: &Input, new: &Input, m: &mut Matching) {
    let old_runs = by_line(&old.pipes, |p| p.line.as_str());
    let new_runs = by_line(&new.pipes, |p| p.line.as_str());
    let mut lines: Vec<&str> = new.pipes.iter().map(|p| p.line.as_str()).collect();
    lines.dedup();
    let mut seen = std::collections::HashSet::new();
    for line in lines {
        if !seen.insert(line) {
            continue;
        }
        let (Some(o), Some(n)) = (old_runs.get(line), new_runs.get(line)) else {
            continue;
        };
        let pairs = match (seqs(&old.pipes, o), seqs(&new.pipes, n)) {
            (Some(ko), Some(kn)) => pair_by_key(&ko, &kn),
            _ => {
                m.runs_by_position.push(line.to_string());
                let len = o.len().max(n.len());
                (0..len).map(|k| (Some(k), Some(k))).collect()
            }
        };
        // Positions to row indices (a position past either end is an added or removed run).
        let start = m.runs.len();
        m.runs.extend(
            pairs
                .into_iter()
                .map(|(a, b)| {
                    (
                        a.and_then(|a| o.get(a).copied()),
                        b.and_then(|b| n.get(b).copied()),
                    )
                })
                .filter(|p| p.0.is_some() || p.1.is_some()),
        );
        m.runs_of_line.insert(line.to_string(), start..m.runs.len());
    }
}

/// Tags written once on their side.
fn unique_tags(fittings: &[FittingRow]) -> HashMap<&str, usize> {
    let mut count: HashMap<&str, (usize, usize)> = HashMap::new();
    for (i, f) in fittings.iter().enumerate() {
        if !f.tag.trim().is_empty() {
            count.entry(f.tag.trim()).or_insert((0, i)).0 += 1;
        }
    }
    count
        .into_iter()
        .filter(|(_, (n, _))| *n == 1)
        .map(|(t, (_, i))| (t, i))
        .collect()
}

/// The line, kind and size of a fitting, for matching where tags fail.
fn line_kind_size(f: &FittingRow) -> (String, &'static str, String) {
    let size = f
        .size
        .as_ref()
        .map(super::fields::size_label)
        .unwrap_or_default();
    (f.line.to_string(), f.kind.id, size)
}

fn match_fittings(old: &Input, new: &Input, m: &mut Matching) {
    let (old_tags, new_tags) = (unique_tags(&old.fittings), unique_tags(&new.fittings));
    let mut old_used = vec![false; old.fittings.len()];
    let mut partner: Vec<Option<(usize, FittingKey)>> = vec![None; new.fittings.len()];
    for (tag, &j) in &new_tags {
        if let Some(&i) = old_tags.get(tag) {
            old_used[i] = true;
            partner[j] = Some((i, FittingKey::Tag));
        }
    }
    // The rest by line, kind and size, the n-th with the n-th.
    let mut pool: HashMap<(String, &'static str, String), std::collections::VecDeque<usize>> =
        HashMap::new();
    for (i, f) in old
        .fittings
        .iter()
        .enumerate()
        .filter(|(i, _)| !old_used[*i])
    {
        pool.entry(line_kind_size(f)).or_default().push_back(i);
    }
    for (j, f) in new.fittings.iter().enumerate() {
        if partner[j].is_some() {
            continue;
        }
        if let Some(i) = pool.get_mut(&line_kind_size(f)).and_then(|q| q.pop_front()) {
            old_used[i] = true;
            partner[j] = Some((i, FittingKey::LineKindSize));
        }
    }
    for (j, p) in partner.into_iter().enumerate() {
        m.fittings.push((p.map(|p| p.0), Some(j), p.map(|p| p.1)));
    }
    m.fittings.extend(
        (0..old.fittings.len())
            .filter(|&i| !old_used[i])
            .map(|i| (Some(i), None, None)),
    );
}

/// Record old row → new row for every matched item.
fn map_rows(old: &Audited, new: &Audited, m: &mut Matching) {
    let key = |o: &crate::ingest::rows::Origin| (o.sheet.clone(), o.row);
    let mut rows = HashMap::new();
    for &(o, n) in &m.lines {
        if let (Some(o), Some(n)) = (o, n) {
            let (lo, ln) = (&old.audit.lines[o], &new.audit.lines[n]);
            if let (Some(so), Some(ro), Some(sn), Some(rn)) = (&lo.sheet, lo.row, &ln.sheet, ln.row)
            {
                rows.insert((so.clone(), ro), (sn.clone(), rn));
            }
        }
    }
    for &(o, n) in &m.runs {
        if let (Some(o), Some(n)) = (o, n) {
            rows.insert(
                key(&old.input.pipes[o].origin),
                key(&new.input.pipes[n].origin),
            );
        }
    }
    for &(o, n, _) in &m.fittings {
        if let (Some(o), Some(n)) = (o, n) {
            rows.insert(
                key(&old.input.fittings[o].origin),
                key(&new.input.fittings[n].origin),
            );
        }
    }
    for &(o, n) in &m.systems {
        if let (Some(o), Some(n)) = (o, n) {
            let row = |a: &Audited, i: usize| {
                let id = &a.audit.systems[i].system;
                a.input
                    .systems
                    .iter()
                    .find(|s| &s.system == id)
                    .map(|s| key(&s.origin))
            };
            if let (Some(ro), Some(rn)) = (row(old, o), row(new, n)) {
                rows.insert(ro, rn);
            }
        }
    }
    m.rows = rows;
}

#[cfg(test)]
mod tests {
    use super::pair_by_key;

    #[test]
    fn pairs_follow_the_new_order_then_the_old_only_items() {
        let old = ["a", "b", "c"];
        let new = ["c", "d", "a"];
        assert_eq!(
            pair_by_key(&old, &new),
            vec![
                (Some(2), Some(0)),
                (None, Some(1)),
                (Some(0), Some(2)),
                (Some(1), None)
            ]
        );
    }
}
