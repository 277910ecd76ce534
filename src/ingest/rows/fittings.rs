//! Rows of `Fittings`: one per fitting or group of identical fittings.

use super::cells::{Sink, for_each_row, format_number};
use super::intern::Interner;
use super::{Assumed, Origin};
use crate::ingest::Input;
use crate::ingest::parse::SizeSpec;
use crate::ingest::quantity;
use crate::ingest::schema::TableKind;
use crate::physics::fitting::{self, Kind};
use std::sync::Arc;

/// A row of `Fittings`.
#[derive(Clone, Debug)]
pub struct FittingRow {
    /// Source row.
    pub origin: Origin,
    /// Tag (may be blank).
    pub tag: Arc<str>,
    /// Line id (one string for every row of the line).
    pub line: Arc<str>,
    /// Item text as written (one string for every row written alike).
    pub item: Arc<str>,
    /// Catalogue kind matched.
    pub kind: &'static Kind,
    /// Size.
    pub size: Option<SizeSpec>,
    /// Outlet size.
    pub size_out: Option<SizeSpec>,
    /// Quantity.
    pub qty: f64,
    /// Fraction open, when given.
    pub opening: Option<f64>,
    /// Given K.
    pub k: Option<f64>,
    /// Given Kv.
    pub kv: Option<f64>,
    /// Given Cv.
    pub cv: Option<f64>,
    /// Given Le/D.
    pub le_d: Option<f64>,
    /// Bend radius over bore.
    pub bend_radius_d: Option<f64>,
    /// Angle, degrees.
    pub angle_deg: Option<f64>,
    /// Fouling multiplier.
    pub fouling: Option<f64>,
    /// Orifice β.
    pub beta: Option<f64>,
    /// Replacement cost (currency of the rules).
    pub replacement_cost: Option<f64>,
    /// Values assumed.
    pub assumed: Vec<Assumed>,
}

pub(super) fn read_fittings(input: &Input, sink: &mut Sink) -> Vec<FittingRow> {
    let mut fittings = Vec::new();
    let mut texts = Interner::default();
    for_each_row(input, sink, TableKind::Fittings, |c| {
        let Some(line) = c.text("line") else {
            c.error(
                "line",
                "line id is blank".into(),
                Some("every fitting needs the id of its line".into()),
            );
            return;
        };
        let tag = c.text("tag").unwrap_or_default();
        let k = c.positive("k", true);
        let kv = c.positive("kv", false);
        let cv = c.positive("cv", false);
        let item = c.text("item").unwrap_or_default();
        let kind = if item.is_empty() {
            if k.is_some() || kv.is_some() || cv.is_some() {
                fitting::find_kind("given")
            } else if c.errors > 0 {
                // The K, Kv or Cv (or the item cell itself) holds an error already: that is why
                // nothing describes the fitting, and saying so again adds nothing.
                return;
            } else {
                c.error(
                    "item",
                    "item is blank and no K, Kv or Cv is given".into(),
                    Some("describe the fitting, e.g. '90 elbow', 'gate valve'".into()),
                );
                return;
            }
        } else {
            match fitting::match_item(&item) {
                Ok(kind) => Some(kind),
                Err(near) => {
                    let hint = (!near.is_empty()).then(|| {
                        format!(
                            "did you mean {}? (`lossledger kinds` lists them all)",
                            near.iter()
                                .map(|n| format!("\"{n}\""))
                                .collect::<Vec<_>>()
                                .join(", ")
                        )
                    });
                    c.error(
                        "item",
                        format!("item '{item}' matches no fitting kind"),
                        hint,
                    );
                    return;
                }
            }
        };
        let Some(kind) = kind else { return };
        let mut assumed = Vec::new();
        let qty = match c.positive("qty", false).map(quantity::fitting_count) {
            Some(Ok(q)) => q,
            Some(Err(e)) => {
                c.error("qty", e.to_string(), Some(quantity::COUNT_HINT.into()));
                1.0
            }
            None => {
                if c.errors == 0 {
                    assumed.push(c.assumed("qty", "quantity 1"));
                }
                1.0
            }
        };
        let opening = c.positive("opening", true);
        if let Some(o) = opening
            && o > 1.0
        {
            c.error(
                "opening",
                format!("opening {} % is above 100 %", format_number(o * 100.0)),
                None,
            );
        }
        if opening.is_none() && kind.is_valve() {
            assumed.push(c.assumed("opening", "fully open"));
        }
        let fouling = c.positive("fouling", false);
        let beta = c.positive("beta", false);
        let row = FittingRow {
            origin: Origin {
                sheet: c.layout.sheet.clone(),
                row: c.row,
            },
            tag: tag.into(),
            line: texts.get(line),
            item: texts.get(item),
            kind,
            size: c.size("size"),
            size_out: c.size("size_out"),
            qty,
            opening,
            k,
            kv,
            cv,
            le_d: c.positive("le_d", false),
            bend_radius_d: c.positive("bend_radius_d", false),
            angle_deg: c.positive("angle", false),
            fouling,
            beta,
            replacement_cost: c.positive("replacement_cost", true),
            assumed,
        };
        if c.errors == 0 {
            fittings.push(row);
        }
    });
    fittings.shrink_to_fit();
    fittings
}
