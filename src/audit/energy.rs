//! Energy review: what each loss costs the pumps per year, the fittings ranked by that cost,
//! lower-loss alternatives with simple payback, and throttled valves.
//!
//! The arithmetic is in small pure functions ([`loss_energy`], [`payback_years`], [`rank`]) so
//! it can be checked against the hand-worked example in `docs/energy.md`; [`apply`] fills the
//! audit's lines and fittings with them.

use crate::sentence::fig;
use serde::Serialize;

use super::lines::{FittingModel, fitting_at};
use super::models::Models;
use super::{Audit, FittingResult, LineResult, Rules};
use crate::error::{CellRef, Severity};
use crate::ingest::{Input, Service, TableKind};
use crate::physics::G;
use crate::physics::fitting::{Group, find_kind};

/// The caution every saving and payback carries (workbook, JSON, console, docs).
pub const SAVINGS_CAUTION: &str = "Savings and paybacks are estimates from published loss coefficients and the \
tariff, efficiency and running hours in force: confirm each one by field test (flow, pressure and motor power \
measured before and after) before money is spent.";

/// The caution every suggestion that changes a pump's operating point carries (a lower loss on
/// a pumped line, a valve opened): JSON, ranking sheet, Summary, console, the throttled-valve
/// finding and docs.
pub const OPERATING_POINT_CAUTION: &str = "Lowering a loss on a pumped line moves the pump's operating point: \
opening a valve or removing a loss before speed control or impeller trimming is in place lets the pump run out \
along its curve (more flow, higher NPSH required, possible motor overload). Put the flow control in place first, \
then check NPSH and motor current against the maker's data.";

/// A rank that can move by more than this many places across the K bands is marked uncertain
/// ("a few places": common practice, no source).
pub const RANK_SHIFT_LIMIT: usize = 3;

/// Relative tolerance under which two ranking values are a tie.
pub const TIE_TOLERANCE: f64 = 1e-12;

/// What turns a loss into energy and money for one line.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct EnergyBasis {
    /// Wire-to-water efficiency of the pump set, fraction in (0, 1].
    pub efficiency: f64,
    /// Running hours per year.
    pub hours_per_year: f64,
    /// Price of one kWh.
    pub tariff_per_kwh: f64,
    /// Emission factor, kg CO₂ per kWh (0: none reported).
    pub kg_co2_per_kwh: f64,
}

/// The energy a steady loss costs.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct LossEnergy {
    /// Hydraulic power dissipated, W.
    pub power_loss_w: f64,
    /// Electrical power the pump set draws for it, W.
    pub electrical_power_w: f64,
    /// Electrical energy per year, kWh.
    pub annual_energy_kwh: f64,
    /// Cost per year.
    pub annual_cost: f64,
    /// Emissions per year, kg CO₂.
    pub annual_co2_kg: f64,
}

/// Energy cost of a steady pressure loss.
///
/// # Formula
/// `P = Δp·Q` (W); `P_el = P/η`; `E = P_el · t / 1000` (kWh per year, t hours per year);
/// `cost = E · tariff`; `CO₂ = E · factor`.
///
/// # Source
/// Hydraulic power of a flow through a pressure drop, e.g. Darby, Chemical Engineering Fluid
/// Mechanics, 2nd ed. 2001, ch. 8 (pump power = Q·Δp/η) (from memory); the rest is unit
/// arithmetic (1 kWh = 1000 W·h).
///
/// # Validity
/// Steady flow for the hours given, with the loss made good by a pump of wire-to-water
/// efficiency η at that duty. Returns None for non-finite inputs, a negative Δp, flow or hours,
/// or η outside (0, 1].
pub fn loss_energy(dp_pa: f64, flow_m3_s: f64, basis: &EnergyBasis) -> Option<LossEnergy> {
    let ok = |v: f64| v.is_finite() && v >= 0.0;
    if !(ok(dp_pa)
        && ok(flow_m3_s)
        && ok(basis.hours_per_year)
        && ok(basis.tariff_per_kwh)
        && ok(basis.kg_co2_per_kwh))
    {
        return None;
    }
    if !(basis.efficiency > 0.0 && basis.efficiency <= 1.0) {
        return None;
    }
    let power_loss_w = dp_pa * flow_m3_s;
    let electrical_power_w = power_loss_w / basis.efficiency;
    let annual_energy_kwh = electrical_power_w * basis.hours_per_year / 1000.0;
    Some(LossEnergy {
        power_loss_w,
        electrical_power_w,
        annual_energy_kwh,
        annual_cost: annual_energy_kwh * basis.tariff_per_kwh,
        annual_co2_kg: annual_energy_kwh * basis.kg_co2_per_kwh,
    })
}

/// Simple payback in years: replacement cost over annual saving.
///
/// None without a cost, when the saving is unknown, zero or negative (it never pays back), or
/// for non-finite or negative inputs; never negative.
pub fn payback_years(replacement_cost: Option<f64>, annual_saving: Option<f64>) -> Option<f64> {
    match (replacement_cost, annual_saving) {
        (Some(c), Some(s)) if c.is_finite() && c >= 0.0 && s.is_finite() && s > 0.0 => Some(c / s),
        _ => None,
    }
}

/// One item to rank: its annual energy (when energy data applies) and its head loss, each as
/// (value, low end, high end) of its K band.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct RankItem {
    /// Annual energy, kWh (None on gravity lines): (value, low, high).
    pub energy_kwh: Option<(f64, f64, f64)>,
    /// Head loss, m: (value, low, high).
    pub head_m: (f64, f64, f64),
}

/// What an item was ranked by.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum RankBasis {
    /// Annual energy cost (energy × one tariff, so energy orders the same way).
    AnnualCost,
    /// Head loss (no pump energy applies).
    HeadLoss,
}

/// An item's place in the ranking.
#[derive(Clone, Copy, Debug, PartialEq, Serialize)]
pub struct Ranking {
    /// Rank, 1 = worst; tied items share the rank.
    pub rank: usize,
    /// Best rank it could take across the K bands (it at its high end, the others at their low).
    pub best: usize,
    /// Worst rank it could take (it at its low end, the others at their high).
    pub worst: usize,
    /// True when best or worst is more than [`RANK_SHIFT_LIMIT`] places from the rank.
    pub uncertain: bool,
    /// What it was ranked by.
    pub basis: RankBasis,
    /// Share of the total of its basis (cost items of the total cost, head items of their head).
    pub share: f64,
    /// Cumulative share down the ranking, this item included.
    pub cumulative_share: f64,
}

/// Whether `a` exceeds `b` by more than [`TIE_TOLERANCE`] (relative): the ranking's order.
pub(crate) fn greater(a: f64, b: f64) -> bool {
    a > b && (a - b) > TIE_TOLERANCE * a.abs().max(b.abs())
}

/// Rank items: those with energy data by annual energy (worst first), then those without by head
/// loss. Equal values (within [`TIE_TOLERANCE`]) share a rank ("1, 2, 2, 4"). The rank range
/// compares each item's band with the others' bands (interval ranking).
pub fn rank(items: &[RankItem]) -> Vec<Ranking> {
    let key = |it: &RankItem| -> (u8, (f64, f64, f64)) {
        match it.energy_kwh {
            Some(e) => (0, e),
            None => (1, it.head_m),
        }
    };
    let keys: Vec<(u8, (f64, f64, f64))> = items.iter().map(key).collect();
    let group_total = |g: u8| -> f64 {
        keys.iter()
            .filter(|k| k.0 == g)
            .map(|k| k.1.0.max(0.0))
            .sum()
    };
    let totals = [group_total(0), group_total(1)];
    let mut order: Vec<usize> = (0..items.len()).collect();
    order.sort_by(|&a, &b| {
        keys[a]
            .0
            .cmp(&keys[b].0)
            .then(keys[b].1.0.total_cmp(&keys[a].1.0))
            .then(a.cmp(&b))
    });
    let mut out = vec![
        Ranking {
            rank: 0,
            best: 0,
            worst: 0,
            uncertain: false,
            basis: RankBasis::HeadLoss,
            share: 0.0,
            cumulative_share: 0.0
        };
        items.len()
    ];
    // Counting "how many others are greater" by sorted columns and binary search keeps this
    // O(n log n): `greater(o, x)` is monotone in `o` (false, then true), so the items greater
    // than `x` are a suffix of each sorted column.
    let column = |g: u8, f: fn(&(f64, f64, f64)) -> f64| -> Vec<f64> {
        let mut v: Vec<f64> = keys.iter().filter(|k| k.0 == g).map(|k| f(&k.1)).collect();
        v.sort_by(f64::total_cmp);
        v
    };
    let values = [column(0, |k| k.0), column(1, |k| k.0)];
    let lows = [column(0, |k| k.1), column(1, |k| k.1)];
    let highs = [column(0, |k| k.2), column(1, |k| k.2)];
    let count_greater =
        |sorted: &[f64], x: f64| sorted.len() - sorted.partition_point(|&o| !greater(o, x));
    let in_group0 = keys.iter().filter(|k| k.0 == 0).count();
    let mut cumulative = [0.0f64, 0.0];
    for &i in &order {
        let (g, (v, lo, hi)) = keys[i];
        let before = if g == 0 { 0 } else { in_group0 };
        let gi = g as usize;
        // The item itself is never greater than its own value; remove it from the band counts.
        let rank = 1 + before + count_greater(&values[gi], v);
        let best = 1 + before + count_greater(&lows[gi], hi) - usize::from(greater(lo, hi));
        let worst = 1 + before + count_greater(&highs[gi], lo) - usize::from(greater(hi, lo));
        let total = totals[g as usize];
        let share = if total > 0.0 { v.max(0.0) / total } else { 0.0 };
        cumulative[g as usize] += share;
        out[i] = Ranking {
            rank,
            best: best.min(rank),
            worst: worst.max(rank),
            uncertain: rank - best.min(rank) > RANK_SHIFT_LIMIT
                || worst.max(rank) - rank > RANK_SHIFT_LIMIT,
            basis: if g == 0 {
                RankBasis::AnnualCost
            } else {
                RankBasis::HeadLoss
            },
            share,
            cumulative_share: cumulative[g as usize].min(1.0),
        };
    }
    out
}

/// A lower-loss alternative for one item.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Suggestion {
    /// What to fit or do instead, in words with the catalogue kind.
    pub replace_with: String,
    /// K per item after the change.
    pub k_after: f64,
    /// Cost saved per year (None where no pump energy applies); an estimate to confirm by field test.
    pub annual_saving: Option<f64>,
    /// Replacement cost over annual saving (None without a cost or a positive saving).
    pub payback_years: Option<f64>,
    /// Head saved, m.
    #[serde(skip)]
    pub head_saving_m: f64,
    /// Energy saved per year, kWh.
    #[serde(skip)]
    pub annual_saving_kwh: Option<f64>,
    /// The caution when the change moves a pump's operating point
    /// ([`OPERATING_POINT_CAUTION`]); None on lines without a pump.
    pub caution: Option<&'static str>,
    /// How the saving is realised under the system's flow control (None where no pump energy
    /// applies); filled after the energy review by [`super::savings::apply`].
    pub saving_case: Option<super::savings::SavingCase>,
    /// True when the saving needs speed control or impeller trimming in place first.
    pub saving_conditional: bool,
    /// Present value of the annual saving over the rules' `[life_cycle]` years and discount rate.
    pub present_value: Option<f64>,
    /// Present value less the replacement cost (None without a cost).
    pub net_present_value: Option<f64>,
    /// Fixed-speed and throttled systems: the flow the pump runs out to with this loss removed
    /// and nothing else changed, m³/s (the largest suggestions of each system, see
    /// [`super::savings::RESOLVE_LIMIT`]).
    pub resolved_flow_m3_s: Option<f64>,
    /// The input power there, W.
    pub resolved_power_w: Option<f64>,
}

/// Station energy totals.
#[derive(Clone, Debug, Default, PartialEq, Serialize)]
pub struct EnergySummary {
    /// Currency label.
    pub currency: String,
    /// Tariff per kWh.
    pub tariff_per_kwh: f64,
    /// Sum of the lines' annual loss cost.
    pub total_annual_cost: f64,
    /// Sum of the lines' annual loss energy, kWh.
    pub total_annual_energy_kwh: f64,
    /// Sum of the lines' annual emissions, kg CO₂ (only when an emission factor is set).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub total_annual_co2_kg: Option<f64>,
}

/// Whether a line's losses are made good by a pump (all services but gravity).
pub fn is_pumped(service: Service) -> bool {
    service != Service::Gravity
}

/// Efficiency of a line for one system, first match wins: the line's Lines row, the system's
/// Systems row, the system's pump curve, the rules.
fn efficiency_of(
    rules: &Rules,
    row: Option<&crate::ingest::LineRow>,
    system: Option<&crate::ingest::SystemRow>,
    curve: Option<f64>,
) -> (f64, &'static str) {
    match (
        row.and_then(|r| r.efficiency),
        system.and_then(|s| s.efficiency),
        curve,
    ) {
        (Some(e), _, _) => (e, "Lines"),
        (None, Some(e), _) => (e, "Systems"),
        (None, None, Some(e)) => (e, CURVE_BASIS),
        (None, None, None) => (rules.energy.efficiency, "rules default"),
    }
}

/// The rules' tariff and emission factor with an efficiency and hours.
fn basis_of(rules: &Rules, efficiency: f64, hours_per_year: f64) -> EnergyBasis {
    EnergyBasis {
        efficiency,
        hours_per_year,
        tariff_per_kwh: rules.energy.tariff_per_kwh,
        kg_co2_per_kwh: rules.energy.kg_co2_per_kwh,
    }
}

/// Energy basis of a line: efficiency from the Lines row, else its system's row, else the
/// system's pump curve, else the rules; hours from the Lines row, else the rules.
fn line_basis(
    input: &Input,
    rules: &Rules,
    line: &LineResult,
    row: Option<&crate::ingest::LineRow>,
    curve: Option<f64>,
) -> (EnergyBasis, &'static str) {
    let system = input.systems.iter().find(|s| {
        s.lines.contains(&line.line)
            || row.and_then(|r| r.system.as_deref()) == Some(s.system.as_str())
    });
    let (efficiency, basis) = efficiency_of(rules, row, system, curve);
    let hours = row
        .and_then(|r| r.hours_per_year)
        .unwrap_or(rules.energy.hours_per_year);
    (basis_of(rules, efficiency, hours), basis)
}

/// Where a shared line's efficiency and hours came from.
pub const SHARED_BASIS: &str = "shared line: each system's share at its own efficiency and hours";

/// One system's part of a shared line: (system index, index in its `shared_lines`), its share,
/// efficiency and where it came from, and hours.
type SharePart = ((usize, usize), f64, f64, &'static str, f64);

/// The parts of every shared line, by line index: each system's share at its own efficiency
/// ([`efficiency_of`] with that system's row and pump curve) and hours (the Lines row's, else
/// the system's duty line's, else the rules').
fn shared_parts(
    input: &Input,
    rules: &Rules,
    audit: &Audit,
) -> std::collections::HashMap<usize, Vec<SharePart>> {
    let mut out: std::collections::HashMap<usize, Vec<SharePart>> = Default::default();
    for (si, s) in audit.systems.iter().enumerate() {
        let system = input.systems.iter().find(|r| r.system == s.system);
        let curve = s.pump_efficiency.and_then(|p| p.wire_to_water);
        for (k, sh) in s.shared_lines.iter().enumerate() {
            let Some(li) = audit.line_of(&sh.line) else {
                continue;
            };
            let row = input.lines.iter().find(|l| l.line == sh.line);
            let (eta, from) = efficiency_of(rules, row, system, curve);
            let hours = row
                .and_then(|r| r.hours_per_year)
                .or(s.duty_hours_per_year)
                .unwrap_or(rules.energy.hours_per_year);
            out.entry(li)
                .or_default()
                .push(((si, k), sh.share, eta, from, hours));
        }
    }
    out
}

/// The single basis that costs a shared line's losses as the sum of its parts:
/// hours `t̄ = Σ s_i t_i` and efficiency `η = t̄ / Σ (s_i t_i / η_i)`, so that
/// `Δp Q t̄ / η = Σ s_i Δp Q t_i / η_i` (equal to each part's own figure when all agree).
fn shared_basis(rules: &Rules, parts: &[SharePart]) -> EnergyBasis {
    let hours: f64 = parts.iter().map(|p| p.1 * p.4).sum();
    let per_efficiency: f64 = parts.iter().map(|p| p.1 * p.4 / p.2).sum();
    let efficiency = if per_efficiency > 0.0 {
        hours / per_efficiency
    } else {
        parts.iter().map(|p| p.1 * p.2).sum()
    };
    basis_of(rules, efficiency, hours)
}

/// Candidate replacements of one item: (model after, words).
fn alternatives(m: FittingModel, pumped: bool) -> Vec<(FittingModel, String)> {
    let kind = m.kind;
    let swap = |id: &str| -> Option<FittingModel> {
        let k = find_kind(id)?;
        let input = crate::physics::fitting::FittingInput {
            k_given: None,
            kv_given: None,
            cv_given: None,
            le_d: None,
            opening: None,
            fouling: None,
            bend_radius_d: None,
            angle_deg: None,
            length_ratio: None,
            ..m.input
        };
        Some(FittingModel {
            kind: k,
            input,
            qty: m.qty,
        })
    };
    let many = |ids: &[&str], words: &str| -> Vec<(FittingModel, String)> {
        ids.iter()
            .filter(|id| **id != kind.id)
            .filter_map(|id| swap(id).map(|s| (s, format!("{words} ({id})"))))
            .collect()
    };
    let opening = m.input.opening.unwrap_or(1.0);
    if kind.group == Group::Valve && opening < 1.0 {
        if !pumped {
            return Vec::new();
        }
        // A K given for the part-open state no longer applies; a given Kv/Cv is the rated (open) one.
        let k_given = if m.input.opening.is_some_and(|o| o < 1.0) {
            None
        } else {
            m.input.k_given
        };
        let open = FittingModel {
            input: crate::physics::fitting::FittingInput {
                opening: None,
                k_given,
                ..m.input
            },
            ..m
        };
        return vec![(
            open,
            format!(
                "open {} fully and set the flow by pump speed control or impeller trimming",
                kind.id
            ),
        )];
    }
    if let Some(r) = kind.replacement() {
        return many(r.kinds, r.words);
    }
    match kind.group {
        Group::Strainer if m.input.fouling.is_some_and(|x| x > 1.0) => {
            vec![(
                FittingModel {
                    input: crate::physics::fitting::FittingInput {
                        fouling: None,
                        ..m.input
                    },
                    ..m
                },
                format!("clean the {} (fouling factor back to 1)", kind.id),
            )]
        }
        _ => Vec::new(),
    }
}

/// The best alternative of an item (lowest head at the line's flow), when it lowers the loss.
fn suggest(
    f: &FittingResult,
    model: FittingModel,
    line: &LineResult,
    basis: Option<&EnergyBasis>,
    pumped: bool,
) -> Option<Suggestion> {
    if f.head_m.is_nan() || f.head_m <= 0.0 {
        return None;
    }
    let (rho, mu, q) = (line.density_kg_m3, line.viscosity_pa_s, line.flow_m3_s);
    let best = alternatives(model, pumped)
        .into_iter()
        .filter_map(|(m, words)| fitting_at(&m, q, rho, mu).ok().map(|h| (h, words)))
        .min_by(|a, b| a.0.head_m.total_cmp(&b.0.head_m))?;
    let (after, words) = best;
    if !greater(f.head_m, after.head_m) {
        return None;
    }
    let saved_head = f.head_m - after.head_m;
    let saved = basis.and_then(|b| loss_energy(saved_head * rho * G, q, b));
    let annual_saving = saved.map(|e| e.annual_cost);
    Some(Suggestion {
        replace_with: words,
        k_after: after.k.k,
        annual_saving,
        payback_years: payback_years(f.replacement_cost, annual_saving),
        head_saving_m: saved_head,
        annual_saving_kwh: saved.map(|e| e.annual_energy_kwh),
        caution: pumped.then_some(OPERATING_POINT_CAUTION),
        saving_case: None,
        saving_conditional: false,
        present_value: None,
        net_present_value: None,
        resolved_flow_m3_s: None,
        resolved_power_w: None,
    })
}

/// Where a line's efficiency came from when its system's pump curve gave it.
pub const CURVE_BASIS: &str = "pump curve at the operating point × motor efficiency";

/// The wire-to-water efficiency from the pump curve of each line's system (the first system
/// listing the line), by line index: the curve's pump efficiency where the pump runs times the
/// rules' motor efficiency ([`super::station::pump_curves`]).
fn curve_efficiencies(audit: &Audit) -> std::collections::HashMap<usize, Option<f64>> {
    let mut out = std::collections::HashMap::new();
    for s in &audit.systems {
        let e = s.pump_efficiency.and_then(|p| p.wire_to_water);
        for li in s.lines.iter().filter_map(|l| audit.line_of(l)) {
            out.entry(li).or_insert(e);
        }
    }
    out
}

/// Fill energy, cost, rank and suggestion on every line and fitting; raise `throttled-valve`.
/// `models` are the fittings' models, in the order of `audit.fittings`.
pub fn apply(input: &Input, rules: &Rules, audit: &mut Audit, models: &Models) {
    let mut summary = EnergySummary {
        currency: rules.energy.currency.clone(),
        tariff_per_kwh: rules.energy.tariff_per_kwh,
        ..Default::default()
    };
    let co2 = rules.energy.kg_co2_per_kwh > 0.0;
    let mut co2_total = 0.0;
    let mut bases: Vec<Option<EnergyBasis>> = Vec::with_capacity(audit.lines.len());
    let rows: std::collections::HashMap<&str, &crate::ingest::LineRow> =
        input.lines.iter().map(|l| (l.line.as_str(), l)).collect();
    let curves = curve_efficiencies(audit);
    let shared = shared_parts(input, rules, audit);
    for (li, line) in audit.lines.iter_mut().enumerate() {
        let pumped = is_pumped(line.service);
        let row = rows.get(line.line.as_str()).copied();
        let (basis, from) = match shared.get(&li) {
            Some(parts) => (shared_basis(rules, parts), SHARED_BASIS),
            None => line_basis(input, rules, line, row, curves.get(&li).copied().flatten()),
        };
        line.hours_per_year = Some(basis.hours_per_year);
        line.power_loss_w = Some(line.total_dp_pa * line.flow_m3_s);
        if pumped && let Some(e) = loss_energy(line.total_dp_pa, line.flow_m3_s, &basis) {
            line.efficiency = Some(basis.efficiency);
            line.efficiency_basis = from;
            line.annual_energy_kwh = Some(e.annual_energy_kwh);
            line.annual_cost = Some(e.annual_cost);
            line.annual_co2_kg = co2.then_some(e.annual_co2_kg);
            summary.total_annual_cost += e.annual_cost;
            summary.total_annual_energy_kwh += e.annual_energy_kwh;
            co2_total += e.annual_co2_kg;
            bases.push(Some(basis));
        } else {
            line.efficiency_basis = "gravity: no pump energy";
            bases.push(None);
        }
    }
    summary.total_annual_co2_kg = co2.then_some(co2_total);
    cost_shares(rules, audit, &shared, &bases);

    let mut items = Vec::with_capacity(audit.fittings.len());
    for fi in 0..audit.fittings.len() {
        let Some(li) = audit.line_of(&audit.fittings[fi].line) else {
            items.push(RankItem {
                energy_kwh: None,
                head_m: (0.0, 0.0, 0.0),
            });
            continue;
        };
        let line = &audit.lines[li];
        let basis = bases[li];
        let f = &audit.fittings[fi];
        let energy = basis.and_then(|b| loss_energy(f.dp_pa, line.flow_m3_s, &b));
        let suggestion = models
            .get(fi)
            .and_then(|m| suggest(f, m, line, basis.as_ref(), is_pumped(line.service)));
        let scale = |x: f64| if f.head_m > 0.0 { x / f.head_m } else { 0.0 };
        items.push(RankItem {
            energy_kwh: energy.map(|e| {
                (
                    e.annual_energy_kwh,
                    e.annual_energy_kwh * scale(f.head_low_m),
                    e.annual_energy_kwh * scale(f.head_high_m),
                )
            }),
            head_m: (f.head_m, f.head_low_m, f.head_high_m),
        });
        let flow = line.flow_m3_s;
        let f = &mut audit.fittings[fi];
        f.power_loss_w = Some(f.dp_pa * flow);
        f.annual_energy_kwh = energy.map(|e| e.annual_energy_kwh);
        f.annual_cost = energy.map(|e| e.annual_cost);
        f.annual_co2_kg = energy.filter(|_| co2).map(|e| e.annual_co2_kg);
        f.suggestion = suggestion.map(Box::new);
    }
    for (f, r) in audit.fittings.iter_mut().zip(rank(&items)) {
        f.rank = Some(r.rank);
        f.rank_uncertain = Some(r.uncertain);
        f.ranking = Some(r);
    }
    audit.energy = summary;
    throttled_valves(input, rules, audit, &bases);
}

/// Fill each system's shared-line figures: its share of the line's losses at its own
/// efficiency and hours (pumped lines only).
fn cost_shares(
    rules: &Rules,
    audit: &mut Audit,
    shared: &std::collections::HashMap<usize, Vec<SharePart>>,
    bases: &[Option<EnergyBasis>],
) {
    for (&li, parts) in shared {
        let dp = audit.lines[li].total_dp_pa;
        let flow = audit.lines[li].flow_m3_s;
        for &((si, k), share, eta, from, hours) in parts {
            let e =
                bases[li].and_then(|_| loss_energy(dp, share * flow, &basis_of(rules, eta, hours)));
            let sh = &mut audit.systems[si].shared_lines[k];
            sh.efficiency = e.map(|_| eta);
            sh.efficiency_basis = if e.is_some() {
                from
            } else {
                "gravity: no pump energy"
            };
            sh.hours_per_year = e.map(|_| hours);
            sh.annual_energy_kwh = e.map(|e| e.annual_energy_kwh);
            sh.annual_cost = e.map(|e| e.annual_cost);
        }
    }
}

/// `throttled-valve`: a valve on a pumped line open less than the rule allows.
fn throttled_valves(
    input: &Input,
    rules: &Rules,
    audit: &mut Audit,
    bases: &[Option<EnergyBasis>],
) {
    let opening_col = input
        .layout(TableKind::Fittings)
        .and_then(|l| l.column("opening"))
        .map(|c| c.col)
        .unwrap_or(0);
    let currency = rules.energy.currency.clone();
    let mut found = Vec::new();
    for f in &audit.fittings {
        let Some(opening) = f.opening else { continue };
        if f.group != Group::Valve || opening >= rules.valve.min_opening {
            continue;
        }
        let Some(li) = audit.line_of(&f.line) else {
            continue;
        };
        let line = &audit.lines[li];
        let Some(basis) = bases[li].filter(|_| is_pumped(line.service)) else {
            continue;
        };
        let Some(e) = loss_energy(f.dp_pa, line.flow_m3_s, &basis) else {
            continue;
        };
        let open = f
            .suggestion
            .as_ref()
            .map(|s| {
                format!(
                    "; fully open it would take about {} less",
                    fig(s.head_saving_m, "m", 2)
                )
            })
            .unwrap_or_default();
        let cell = CellRef::new(&f.cell.sheet, f.row, opening_col);
        found.push((
            f.line.clone(),
            f.tag.clone(),
            cell,
            format!(
                "{} is {:.0} % open (rule: at least {:.0} %): it takes {} of head, burning {:.2} kW at the motor, {:.0} kWh and {currency} {:.0} a year{open}",
                if f.tag.is_empty() { &f.item } else { &f.tag },
                opening * 100.0,
                rules.valve.min_opening * 100.0,
                fig(f.head_m, "m", 2),
                e.electrical_power_w / 1000.0,
                e.annual_energy_kwh,
                e.annual_cost
            ),
        ));
    }
    for (line, tag, cell, message) in found {
        super::findings::push(
            &mut audit.findings,
            Severity::Warning,
            "throttled-valve",
            &line,
            Some(&tag),
            cell,
            message,
            "put pump speed control or impeller trimming in place first, then open the valve fully and set the flow by speed or trim: opened before that, the pump runs out along its curve (more flow, higher NPSH required, possible motor overload); confirm the saving by field test",
        );
    }
}
