//! The fitting models an audit keeps while it runs (what re-evaluates an item at another flow or
//! as another kind), stored packed.
//!
//! A [`FittingModel`] holds twelve optional figures; as `Option<f64>` each takes 16 bytes, so a
//! model is 248 bytes. Packed, each optional figure is one `f64` with NaN for "none", and a model
//! is 144 bytes: about 31 MB less on a 300,000-fitting register (docs/reliability.md, memory).
//! No figure of a model is ever NaN (every input figure is validated finite and every bore comes
//! from a table or a finite cell), so nothing is lost.

use super::lines::FittingModel;
use crate::physics::fitting::{Characteristic, FittingInput, Kind};

/// The fitting models of an audit, in the order of [`super::Audit::fittings`].
///
/// # Example
/// ```
/// use lossledger::audit::lines::FittingModel;
/// use lossledger::audit::models::Models;
/// use lossledger::physics::fitting::{FittingInput, find_kind};
///
/// let model = FittingModel {
///     kind: find_kind("elbow-90-long").unwrap(),
///     input: FittingInput { d_in_m: 0.1023, angle_deg: Some(90.0), ..FittingInput::default() },
///     qty: 2.0,
/// };
/// let mut models = Models::default();
/// models.push(model);
/// let back = models.get(0).unwrap();
/// assert_eq!((back.input.angle_deg, back.input.opening, back.qty), (Some(90.0), None, 2.0));
/// assert!(models.get(1).is_none());
/// ```
#[derive(Clone, Debug, Default)]
pub struct Models(Vec<Packed>);

impl Models {
    /// An empty store with room for `n` models.
    pub fn with_capacity(n: usize) -> Models {
        Models(Vec::with_capacity(n))
    }

    /// Keep a model (the next fitting's).
    pub fn push(&mut self, model: FittingModel) {
        self.0.push(Packed::from(model));
    }

    /// The model of fitting `i`, when there is one.
    pub fn get(&self, i: usize) -> Option<FittingModel> {
        self.0.get(i).map(|p| p.unpack())
    }

    /// Number of models kept.
    pub fn len(&self) -> usize {
        self.0.len()
    }

    /// Whether no model is kept.
    pub fn is_empty(&self) -> bool {
        self.0.is_empty()
    }
}

/// A [`FittingModel`] with its optional figures as NaN-for-none `f64`s, in the order `From`
/// packs them and `unpack` reads them back. `re_in` is not kept: it is set per flow.
#[derive(Clone, Copy, Debug)]
struct Packed {
    kind: &'static Kind,
    qty: f64,
    d_in_m: f64,
    relative_roughness: f64,
    optional: [f64; 12],
    characteristic: Option<Characteristic>,
}

fn pack(x: Option<f64>) -> f64 {
    x.unwrap_or(f64::NAN)
}

fn unpack(x: f64) -> Option<f64> {
    (!x.is_nan()).then_some(x)
}

impl From<FittingModel> for Packed {
    fn from(m: FittingModel) -> Packed {
        // Destructured in full, so a field added to `FittingInput` fails to compile here.
        let FittingInput {
            nps_in,
            d_in_m,
            d_out_m,
            re_in: _,
            relative_roughness,
            opening,
            k_given,
            kv_given,
            cv_given,
            le_d,
            bend_radius_d,
            angle_deg,
            fouling,
            beta,
            length_ratio,
            characteristic,
        } = m.input;
        let optional = [
            nps_in,
            d_out_m,
            opening,
            k_given,
            kv_given,
            cv_given,
            le_d,
            bend_radius_d,
            angle_deg,
            fouling,
            beta,
            length_ratio,
        ]
        .map(pack);
        Packed {
            kind: m.kind,
            qty: m.qty,
            d_in_m,
            relative_roughness,
            optional,
            characteristic,
        }
    }
}

impl Packed {
    fn unpack(&self) -> FittingModel {
        let [
            nps_in,
            d_out_m,
            opening,
            k_given,
            kv_given,
            cv_given,
            le_d,
            bend_radius_d,
            angle_deg,
            fouling,
            beta,
            length_ratio,
        ] = self.optional.map(unpack);
        FittingModel {
            kind: self.kind,
            qty: self.qty,
            input: FittingInput {
                nps_in,
                d_in_m: self.d_in_m,
                d_out_m,
                re_in: 0.0,
                relative_roughness: self.relative_roughness,
                opening,
                k_given,
                kv_given,
                cv_given,
                le_d,
                bend_radius_d,
                angle_deg,
                fouling,
                beta,
                length_ratio,
                characteristic: self.characteristic,
            },
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::physics::fitting::find_kind;

    fn every_field_given() -> FittingModel {
        FittingModel {
            kind: find_kind("valve-globe").unwrap(),
            qty: 3.0,
            input: FittingInput {
                nps_in: Some(4.0),
                d_in_m: 0.1023,
                d_out_m: Some(0.0779),
                re_in: 0.0,
                relative_roughness: 4.5e-4,
                opening: Some(0.4),
                k_given: Some(6.5),
                kv_given: Some(120.0),
                cv_given: Some(140.0),
                le_d: Some(340.0),
                bend_radius_d: Some(1.5),
                angle_deg: Some(45.0),
                fouling: Some(1.2),
                beta: Some(0.6),
                length_ratio: Some(0.05),
                characteristic: Some(Characteristic::EqualPercentage { rangeability: 30.0 }),
            },
        }
    }

    /// Every figure comes back as it went in, given or not.
    #[test]
    fn packing_keeps_every_field() {
        let given = every_field_given();
        let none = FittingModel {
            input: FittingInput {
                d_in_m: 0.05,
                ..FittingInput::default()
            },
            ..given
        };
        let mut models = Models::with_capacity(2);
        models.push(given);
        models.push(none);
        assert_eq!(models.len(), 2);
        for (i, m) in [given, none].iter().enumerate() {
            let back = models.get(i).unwrap();
            assert_eq!(format!("{back:?}"), format!("{m:?}"));
        }
    }

    /// The point of packing: a model takes 104 bytes less than unpacked.
    #[test]
    fn a_packed_model_is_smaller() {
        assert!(
            std::mem::size_of::<Packed>() + 100 <= std::mem::size_of::<FittingModel>(),
            "{} vs {}",
            std::mem::size_of::<Packed>(),
            std::mem::size_of::<FittingModel>()
        );
    }
}
