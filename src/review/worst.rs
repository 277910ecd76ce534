//! The estate's worst fittings: every station's fittings ranked together, with rank ranges
//! across the K bands, kept in memory bounded by the rows asked for, not by the estate.
//!
//! The ranking is the station ranking's ([`crate::audit::energy::rank`]) applied to the union of
//! all stations: items whose line has pump energy by annual energy (one tariff for the whole
//! review, so by annual cost), then the rest by head loss; ties (within
//! [`TIE_TOLERANCE`](crate::audit::energy::TIE_TOLERANCE)) share a rank; the rank range puts this
//! item and every other at opposite ends of their K bands; more than
//! [`RANK_SHIFT_LIMIT`] places either way is "uncertain".
//!
//! # What is kept
//! To list the worst `n` items exactly, each station hands over only its own worst `n` (an item
//! outside its station's worst `n` has `n` worse items before it), and for each basis the `k =
//! n + RANK_SHIFT_LIMIT + 1` largest nominal values, band lows and band highs of the estate, plus
//! a count of items. The items greater than a listed one are among the `k` largest values (it has
//! fewer than `n` of them), and so are the lows above its high; the highs above its low may be
//! more than `k`, and then its worst rank is only known to be at least `k + 1` places down,
//! which is already uncertain ([`WorstFitting::rank_worst_at_least`]). With `--ranking-rows all`
//! everything is kept.

use serde::Serialize;

use crate::audit::energy::{RANK_SHIFT_LIMIT, RankBasis, Suggestion, greater};
use crate::audit::{Audit, FittingResult};
use crate::error::CellRef;
use crate::report::ranking::ranked_indices;

/// The two bases in ranking order: annual energy (cost) first, then head loss.
const BASES: usize = 2;

/// One fitting of the estate's ranking (the `Worst fittings` sheet, `worst_fittings` in JSON).
#[derive(Clone, Debug, Serialize)]
pub struct WorstFitting {
    /// Rank across the estate, 1 = worst; tied items share the rank.
    pub rank: usize,
    /// Best rank it could take across the K bands.
    pub rank_best: usize,
    /// Worst rank it could take across the K bands (a lower bound when
    /// [`WorstFitting::rank_worst_at_least`]).
    pub rank_worst: usize,
    /// True when the worst rank is only known to be at least [`WorstFitting::rank_worst`].
    pub rank_worst_at_least: bool,
    /// True when the rank can move by more than [`RANK_SHIFT_LIMIT`] places across the K bands.
    pub rank_uncertain: bool,
    /// Its rank within its own station's ranking.
    pub station_rank: usize,
    /// The station.
    pub station: String,
    /// Tag.
    pub tag: String,
    /// Line id (unique within its station only).
    pub line: String,
    /// Item text as written.
    pub item: String,
    /// Catalogue kind id.
    pub kind: &'static str,
    /// Quantity.
    pub qty: f64,
    /// K per item, and the low and high ends of its band.
    pub k: f64,
    /// Low end of K's band.
    pub k_low: f64,
    /// High end of K's band.
    pub k_high: f64,
    /// Head loss for the quantity, m.
    pub head_m: f64,
    /// Electrical energy per year its loss costs the pump, kWh (None on gravity lines).
    pub annual_energy_kwh: Option<f64>,
    /// Cost per year of that energy (None on gravity lines).
    pub annual_cost: Option<f64>,
    /// Its share of the estate's total on its basis (annual energy, or head loss).
    pub share: f64,
    /// Cumulative share down the estate's ranking, this item included.
    pub cumulative_share: f64,
    /// What it was ranked by.
    pub ranked_by: RankBasis,
    /// The lower-loss alternative, with its saving and payback, when one applies.
    pub suggestion: Option<Suggestion>,
    /// Replacement cost, when given.
    pub replacement_cost: Option<f64>,
    /// Its cell in the station's input (and in the station's audited copy).
    pub cell: CellRef,
    /// The station's audited copy, relative to the review workbook's folder.
    pub copy: String,
    /// What it is ranked by: (basis 0 or 1, value, low, high).
    #[serde(skip)]
    key: (usize, f64, f64, f64),
    /// (station index, fitting index): the tie order.
    #[serde(skip)]
    order: (usize, usize),
}

/// What an item is ranked by, as [`crate::audit::energy::apply`] ranks it: annual energy with
/// its band when its line has pump energy, else head loss with its band.
fn key(f: &FittingResult) -> (usize, f64, f64, f64) {
    let scale = |x: f64| if f.head_m > 0.0 { x / f.head_m } else { 0.0 };
    match f.annual_energy_kwh {
        Some(e) => (0, e, e * scale(f.head_low_m), e * scale(f.head_high_m)),
        None => (1, f.head_m, f.head_low_m, f.head_high_m),
    }
}

/// What one station contributes to the estate ranking.
#[derive(Debug, Default)]
pub struct StationPart {
    items: Vec<WorstFitting>,
    values: [Vec<f64>; BASES],
    lows: [Vec<f64>; BASES],
    highs: [Vec<f64>; BASES],
    count: [usize; BASES],
    /// Sum of the station's values on each basis (for shares), in its fitting order.
    pub totals: [f64; BASES],
}

impl StationPart {
    /// Count one fitting's ranking key (basis, value, low, high).
    fn add(&mut self, (b, v, lo, hi): (usize, f64, f64, f64)) {
        self.values[b].push(v);
        self.lows[b].push(lo);
        self.highs[b].push(hi);
        self.count[b] += 1;
        self.totals[b] += v.max(0.0);
    }

    /// Keep only the band values that `n` listed rows can need.
    fn trim(&mut self, n: Option<usize>) {
        for b in 0..BASES {
            for v in [&mut self.values[b], &mut self.lows[b], &mut self.highs[b]] {
                keep_largest(v, kept(n));
            }
        }
    }
}

/// Keep the `k` largest of `v` (all for `None`), largest first.
fn keep_largest(v: &mut Vec<f64>, k: Option<usize>) {
    v.sort_unstable_by(|a, b| b.total_cmp(a));
    if let Some(k) = k {
        v.truncate(k);
    }
}

/// The band values kept per basis for `n` listed rows.
fn kept(n: Option<usize>) -> Option<usize> {
    n.map(|n| n + RANK_SHIFT_LIMIT + 1)
}

/// Reduce one station's audit to its part of the estate ranking: its worst `n` fittings (all
/// for `None`) and its largest band values.
pub fn station_part(
    audit: &Audit,
    station: (usize, &str),
    copy: &str,
    n: Option<usize>,
) -> StationPart {
    let mut part = StationPart::default();
    for f in &audit.fittings {
        part.add(key(f));
    }
    part.trim(n);
    part.items = ranked_indices(audit, n)
        .into_iter()
        .map(|i| item(&audit.fittings[i], station, copy, i))
        .collect();
    part
}

fn item(f: &FittingResult, station: (usize, &str), copy: &str, i: usize) -> WorstFitting {
    let key = key(f);
    WorstFitting {
        rank: 0,
        rank_best: 0,
        rank_worst: 0,
        rank_worst_at_least: false,
        rank_uncertain: false,
        station_rank: f.rank.unwrap_or(0),
        station: station.1.to_string(),
        tag: f.tag.to_string(),
        line: f.line.to_string(),
        item: f.item.to_string(),
        kind: f.kind,
        qty: f.qty,
        k: f.k,
        k_low: f.k_low,
        k_high: f.k_high,
        head_m: f.head_m,
        annual_energy_kwh: f.annual_energy_kwh,
        annual_cost: f.annual_cost,
        share: 0.0,
        cumulative_share: 0.0,
        ranked_by: if key.0 == 0 {
            RankBasis::AnnualCost
        } else {
            RankBasis::HeadLoss
        },
        suggestion: f.suggestion.as_deref().cloned(),
        replacement_cost: f.replacement_cost,
        cell: f.cell.clone(),
        copy: copy.to_string(),
        key,
        order: (station.0, i),
    }
}

/// The estate ranking as stations finish, in any order: the result depends only on the set of
/// stations merged, never on the order they arrive in.
#[derive(Debug)]
pub struct Leaderboard {
    n: Option<usize>,
    part: StationPart,
}

/// The estate order: basis, then larger value first, then station and input order.
fn before(a: &WorstFitting, b: &WorstFitting) -> std::cmp::Ordering {
    a.key
        .0
        .cmp(&b.key.0)
        .then(b.key.1.total_cmp(&a.key.1))
        .then(a.order.cmp(&b.order))
}

impl Leaderboard {
    /// An empty ranking listing the worst `n` items (all for `None`).
    pub fn new(n: Option<usize>) -> Self {
        Leaderboard {
            n,
            part: StationPart::default(),
        }
    }

    /// Merge one station's part (the part's totals are summed by the caller, in station order).
    pub fn merge(&mut self, part: StationPart) {
        let all = &mut self.part;
        all.items.extend(part.items);
        all.items.sort_unstable_by(before);
        if let Some(n) = self.n {
            all.items.truncate(n);
        }
        for b in 0..BASES {
            all.values[b].extend(&part.values[b]);
            all.lows[b].extend(&part.lows[b]);
            all.highs[b].extend(&part.highs[b]);
            for v in [&mut all.values[b], &mut all.lows[b], &mut all.highs[b]] {
                keep_largest(v, kept(self.n));
            }
            all.count[b] += part.count[b];
        }
    }

    /// Items of the estate on each basis.
    pub fn count(&self) -> usize {
        self.part.count.iter().sum()
    }

    /// The listed items with their estate ranks, ranges and shares; `totals` are the estate's
    /// sums on each basis.
    pub fn finish(self, totals: [f64; BASES]) -> Vec<WorstFitting> {
        let StationPart {
            mut items,
            values,
            lows,
            highs,
            count,
            ..
        } = self.part;
        // Counting in columns sorted largest first: the items greater than x are a prefix.
        let greater_than = |sorted: &[f64], x: f64| sorted.partition_point(|&o| greater(o, x));
        let mut cumulative = [0.0f64; BASES];
        for it in &mut items {
            let (b, v, lo, hi) = it.key;
            let offset = if b == 0 { 0 } else { count[0] };
            let rank = 1 + offset + greater_than(&values[b], v);
            let best = 1 + offset + greater_than(&lows[b], hi) - usize::from(greater(lo, hi));
            let above_low = greater_than(&highs[b], lo);
            let worst = 1 + offset + above_low - usize::from(greater(hi, lo));
            it.rank_worst_at_least =
                kept(self.n).is_some_and(|k| above_low >= k) && highs[b].len() < count[b];
            it.rank = rank;
            it.rank_best = best.min(rank);
            it.rank_worst = worst.max(rank);
            it.rank_uncertain =
                rank - it.rank_best > RANK_SHIFT_LIMIT || it.rank_worst - rank > RANK_SHIFT_LIMIT;
            it.share = if totals[b] > 0.0 {
                v.max(0.0) / totals[b]
            } else {
                0.0
            };
            cumulative[b] += it.share;
            it.cumulative_share = cumulative[b].min(1.0);
        }
        items
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::audit::energy::{RankItem, rank};

    /// An invented item: (annual energy band when pumped, head band).
    type Item = (Option<(f64, f64, f64)>, (f64, f64, f64));

    fn fitting(e: Option<(f64, f64, f64)>, head: (f64, f64, f64)) -> WorstFitting {
        let (b, v, lo, hi) = match e {
            Some((v, lo, hi)) => (0, v, lo, hi),
            None => (1, head.0, head.1, head.2),
        };
        WorstFitting {
            rank: 0,
            rank_best: 0,
            rank_worst: 0,
            rank_worst_at_least: false,
            rank_uncertain: false,
            station_rank: 0,
            station: String::new(),
            tag: String::new(),
            line: String::new(),
            item: String::new(),
            kind: "elbow-90",
            qty: 1.0,
            k: 0.0,
            k_low: 0.0,
            k_high: 0.0,
            head_m: head.0,
            annual_energy_kwh: e.map(|e| e.0),
            annual_cost: None,
            share: 0.0,
            cumulative_share: 0.0,
            ranked_by: RankBasis::AnnualCost,
            suggestion: None,
            replacement_cost: None,
            cell: CellRef::new("Fittings", 0, 0),
            copy: String::new(),
            key: (b, v, lo, hi),
            order: (0, 0),
        }
    }

    /// A station's part built from items directly (as `station_part` does from an audit).
    fn part(station: usize, items: &[Item], n: Option<usize>) -> StationPart {
        let mut p = StationPart::default();
        let mut all: Vec<WorstFitting> = items
            .iter()
            .enumerate()
            .map(|(i, &(e, h))| {
                let mut f = fitting(e, h);
                f.order = (station, i);
                f
            })
            .collect();
        for f in &all {
            p.add(f.key);
        }
        p.trim(n);
        all.sort_by(before);
        if let Some(n) = n {
            all.truncate(n);
        }
        p.items = all;
        p
    }

    /// Invented items with bands of ±30 % and a few wide ones, on two bases.
    fn estate() -> Vec<Vec<Item>> {
        let mut x = 0x2545_F491_4F6C_DD1Du64;
        let mut next = || {
            x ^= x >> 12;
            x ^= x << 25;
            x ^= x >> 27;
            (x.wrapping_mul(0x2545_F491_4F6C_DD1D) >> 11) as f64 / (1u64 << 53) as f64
        };
        (0..7)
            .map(|_| {
                (0..40)
                    .map(|_| {
                        let v = 1.0 + 99.0 * next();
                        let w = if next() < 0.1 { 0.9 } else { 0.3 };
                        let band = (v, v * (1.0 - w), v * (1.0 + w));
                        if next() < 0.2 {
                            (None, band)
                        } else {
                            (Some(band), band)
                        }
                    })
                    .collect()
            })
            .collect()
    }

    /// The merged, bounded ranking gives what ranking the whole estate at once gives
    /// (`audit::energy::rank`, the station ranking's own function) for every listed item.
    #[test]
    fn bounded_merge_matches_ranking_everything_at_once() {
        let estate = estate();
        let flat: Vec<RankItem> = estate
            .iter()
            .flatten()
            .map(|&(e, h)| RankItem {
                energy_kwh: e,
                head_m: h,
            })
            .collect();
        let whole = rank(&flat);
        for n in [Some(1), Some(10), Some(50), Some(250), None] {
            let mut board = Leaderboard::new(n);
            let mut totals = [0.0; BASES];
            // Merged out of order: the result must not depend on arrival order.
            for s in [3, 0, 6, 1, 5, 2, 4] {
                let p = part(s, &estate[s], n);
                totals[0] += p.totals[0];
                totals[1] += p.totals[1];
                board.merge(p);
            }
            let listed = board.finish(totals);
            assert_eq!(listed.len(), n.unwrap_or(flat.len()).min(flat.len()));
            for it in &listed {
                let flat_index =
                    estate[..it.order.0].iter().map(Vec::len).sum::<usize>() + it.order.1;
                let w = whole[flat_index];
                assert_eq!(it.rank, w.rank, "{n:?} {:?}", it.order);
                assert_eq!(it.rank_best, w.best, "{n:?} {:?}", it.order);
                if it.rank_worst_at_least {
                    assert!(w.worst >= it.rank_worst && w.uncertain);
                } else {
                    assert_eq!(it.rank_worst, w.worst, "{n:?} {:?}", it.order);
                }
                assert_eq!(it.rank_uncertain, w.uncertain);
                assert!((it.share - w.share).abs() < 1e-12);
                assert!((it.cumulative_share - w.cumulative_share).abs() < 1e-9);
            }
            let ranks: Vec<usize> = listed.iter().map(|i| i.rank).collect();
            assert!(ranks.windows(2).all(|w| w[0] <= w[1]), "{ranks:?}");
        }
    }
}
